//! Real absorbers: a layer of thickness W whose absorption coefficient alpha(E) and index
//! n(E) come from a table, with its absorptance by the light-trapping model chosen, its
//! radiative recombination from that same absorptance by reciprocity, and, for silicon, the
//! intrinsic Auger recombination.
//!
//! * Absorptance (Tiedje, Yablonovitch, Abrams & Brown, IEEE Trans. Electron Devices 31,
//!   711 (1984); Yablonovitch, J. Opt. Soc. Am. 72, 899 (1982)): Lambertian light trapping
//!   with a perfect rear mirror a = alpha / (alpha + 1/(4 n^2 W)); a single pass
//!   1 - e^(-alpha W); a double pass with a back mirror 1 - e^(-2 alpha W).
//! * Radiative recombination by reciprocity with the same a(E) (the emission of a cell of
//!   absorptance a is a phi_bb e^(qV/kT) beyond the dark level; Rau, Phys. Rev. B 76, 085303
//!   (2007)), so photon recycling is consistent: `absorber::ln_dark_current`.
//! * Auger recombination in silicon (Richter, Glunz, Werner, Schmidt & Cuevas, Phys. Rev. B
//!   86, 165202 (2012), their parametrization of the intrinsic lifetime, Auger part; the
//!   radiative part is the reciprocity term above, not their B_rel B_low):
//!   R_A = (n p - n_i^2)(2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 dn^0.92) [cm^-3 s^-1],
//!   g_eeh = 1 + 13 (1 - tanh((n0 / 3.3e17)^0.66)), g_ehh = 1 + 7.5 (1 - tanh((p0 / 7e17)^0.63)),
//!   with densities in cm^-3, equilibrium densities n0, p0 and excess density dn.
//! * Flat quasi-Fermi levels across the wafer (the intrinsic limit's usual assumption):
//!   n p = n_i^2 e^(qV/kT), n = n0 + dn, p = p0 + dn; J(V) = Jsc - J0_rad (e^(qV/kT) - 1) -
//!   q W R_A(V).
//! * n_i = 9.65e9 cm^-3 at 300 K (Altermatt et al., J. Appl. Phys. 93, 1598 (2003); recalled),
//!   scaled to other temperatures as T^1.5 e^(-Eg / 2kT) with Eg = 1.12 eV (a recalled, common
//!   approximation; band-gap narrowing is not modelled).
//!
//! Architecture invariant: pure functions of SI numbers; no NaN for any finite input.

use super::absorber::{Absorptance, AbsorptanceTable};
use super::constants::{thermal_energy, CHARGE, HC};
use super::junction::Illumination;
use super::real_cell::RealCellModel;
use super::spectrum::Axis;
use std::sync::Arc;

/// How light is kept in the absorber.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Trapping {
    /// ideal Lambertian trapping with a perfect rear mirror (the 4 n^2 limit)
    #[default]
    Lambertian,
    /// one pass, nothing reflected back
    SinglePass,
    /// two passes, a flat back mirror
    DoublePass,
}

/// Doping of the absorber.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum Doping {
    #[default]
    Undoped,
    /// donors [m^-3]
    NType(f64),
    /// acceptors [m^-3]
    PType(f64),
}

/// An absorbing layer: its table (photon energy [J] ascending, alpha [m^-1], n) and
/// thickness [m], with the trapping model.
#[derive(Debug, Clone, PartialEq)]
pub struct RealAbsorber {
    pub energies_j: Vec<f64>,
    pub alpha_per_m: Vec<f64>,
    pub index: Vec<f64>,
    pub thickness_m: f64,
    pub trapping: Trapping,
}

/// Sub-points per table interval where the absorptance is sampled (ln alpha linear in E
/// between the table's points, which follows an absorption edge closely).
const REFINE: usize = 32;

impl RealAbsorber {
    /// From a table of n and k by vacuum wavelength [m] (any order): alpha = 4 pi k / lambda.
    pub fn from_nk(wavelength_m: &[f64], n: &[f64], k: &[f64], thickness_m: f64, trapping: Trapping) -> RealAbsorber {
        let mut rows: Vec<(f64, f64, f64)> = wavelength_m
            .iter()
            .zip(n)
            .zip(k)
            .filter(|((l, _), _)| **l > 0.0 && l.is_finite())
            .map(|((l, n), k)| (HC / l, 4.0 * std::f64::consts::PI * k.max(0.0) / l, *n))
            .collect();
        rows.sort_by(|a, b| a.0.total_cmp(&b.0));
        RealAbsorber {
            energies_j: rows.iter().map(|r| r.0).collect(),
            alpha_per_m: rows.iter().map(|r| r.1).collect(),
            index: rows.iter().map(|r| r.2).collect(),
            thickness_m,
            trapping,
        }
    }

    /// Crystalline silicon at 300 K from Green 2008 (the built-in material `si`).
    pub fn silicon(thickness_m: f64, trapping: Trapping) -> Option<RealAbsorber> {
        let m = super::materials::builtin("si")?;
        let super::materials::Dispersion::Table { wavelength_m, n, k } = &m.dispersion else { return None };
        Some(RealAbsorber::from_nk(wavelength_m, n, k, thickness_m, trapping))
    }

    /// The absorptance (dimensionless) for absorption coefficient `alpha` [m^-1] and index
    /// `n` at this absorber's thickness and trapping ([`trapped_absorptance`]).
    pub fn absorptance_of(&self, alpha: f64, n: f64) -> f64 {
        trapped_absorptance(alpha, n, self.thickness_m, self.trapping)
    }

    /// The table refined to [`REFINE`] points per interval: (photon energies [J] ascending,
    /// alpha [m^-1], n), with ln alpha and n linear in E between table points.
    pub fn refined(&self) -> (Vec<f64>, Vec<f64>, Vec<f64>) {
        let e = &self.energies_j;
        let m = e.len().min(self.alpha_per_m.len()).min(self.index.len());
        if m < 2 {
            return (Vec::new(), Vec::new(), Vec::new());
        }
        let (mut x, mut al, mut nn) = (Vec::new(), Vec::new(), Vec::new());
        for i in 0..m - 1 {
            for s in 0..REFINE {
                let t = s as f64 / REFINE as f64;
                let (a0, a1) = (self.alpha_per_m[i], self.alpha_per_m[i + 1]);
                al.push(if a0 > 0.0 && a1 > 0.0 { a0 * (a1 / a0).powf(t) } else { a0 + t * (a1 - a0) });
                nn.push(self.index[i] + t * (self.index[i + 1] - self.index[i]));
                x.push(e[i] + t * (e[i + 1] - e[i]));
            }
        }
        x.push(e[m - 1]);
        al.push(self.alpha_per_m[m - 1]);
        nn.push(self.index[m - 1]);
        (x, al, nn)
    }

    /// The absorptance as a table on the photon-energy axis at the [`RealAbsorber::refined`]
    /// points, linear in E between them (the scalar path; `real_cell` is the fast one).
    pub fn absorptance(&self) -> Option<Absorptance> {
        let (x, al, nn) = self.refined();
        if x.len() < 2 {
            return None;
        }
        let a = al.iter().zip(&nn).map(|(&alpha, &n)| self.absorptance_of(alpha, n)).collect();
        let t = AbsorptanceTable::new("absorber", Axis::PhotonEnergy, x, a).ok()?;
        Some(Absorptance::Table(Arc::new(t)))
    }
}

/// The absorptance (dimensionless) of a layer of absorption coefficient `alpha` [m^-1],
/// index `n` and thickness `thickness_m` [m] with `trapping` (module docs); 0 to 1, never NaN.
pub fn trapped_absorptance(alpha: f64, n: f64, thickness_m: f64, trapping: Trapping) -> f64 {
    let w = thickness_m.max(0.0);
    let a = match trapping {
        Trapping::Lambertian => {
            let escape = 1.0 / (4.0 * n.max(1.0).powi(2) * w);
            if alpha > 0.0 {
                alpha / (alpha + escape)
            } else {
                0.0
            }
        }
        Trapping::SinglePass => -(-alpha.max(0.0) * w).exp_m1(),
        Trapping::DoublePass => -(-2.0 * alpha.max(0.0) * w).exp_m1(),
    };
    if a.is_finite() {
        a.clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// The intrinsic carrier density of silicon [m^-3] at `temp_k` [K] (module docs).
pub fn silicon_ni(temp_k: f64) -> f64 {
    let t = temp_k.max(1.0);
    let eg = 1.12 * CHARGE;
    9.65e15 * (t / 300.0).powf(1.5) * (-(eg / (2.0 * thermal_energy(t)) - eg / (2.0 * thermal_energy(300.0)))).exp()
}

/// The Auger recombination of silicon (Richter et al. 2012, module docs) at fixed
/// equilibrium densities, with the part that depends only on them worked out once.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RichterAuger {
    /// n0 + p0 [cm^-3]
    sum_cm: f64,
    /// 2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 [cm^3 s^-1 ... in their units: cm^-3 x cm^6 s^-1]
    equilibrium: f64,
}

impl RichterAuger {
    /// At equilibrium electron and hole densities `n0`, `p0` [m^-3] (n0 p0 = ni^2).
    pub fn new(n0: f64, p0: f64) -> RichterAuger {
        let cm = 1e-6; // m^-3 -> cm^-3
        let (n0, p0) = (n0 * cm, p0 * cm);
        let g_eeh = 1.0 + 13.0 * (1.0 - (n0 / 3.3e17).powf(0.66).tanh());
        let g_ehh = 1.0 + 7.5 * (1.0 - (p0 / 7e17).powf(0.63).tanh());
        RichterAuger { sum_cm: n0 + p0, equilibrium: 2.5e-31 * g_eeh * n0 + 8.5e-32 * g_ehh * p0 }
    }

    /// The rate [m^-3 s^-1] at excess density `dn` [m^-3]: n p - ni^2 = dn (n0 + p0 + dn)
    /// (exact for n0 p0 = ni^2, and free of cancellation).
    pub fn rate(&self, dn: f64) -> f64 {
        let cm = 1e-6;
        let dn = (dn * cm).max(0.0);
        let r = dn * (self.sum_cm + dn) * (self.equilibrium + 3.0e-29 * dn.powf(0.92)) / cm;
        if r.is_finite() {
            r
        } else {
            0.0
        }
    }
}

/// The Auger recombination rate of silicon [m^-3 s^-1] at electron and hole densities `n`,
/// `p` [m^-3] with equilibrium densities `n0`, `p0` [m^-3] (n0 p0 = ni^2; Richter et al.
/// 2012, module docs; evaluated in their cm units).
pub fn richter_auger(n: f64, p: f64, n0: f64, p0: f64) -> f64 {
    let dn = ((n - n0) + (p - p0)).max(0.0) * 0.5;
    RichterAuger::new(n0, p0).rate(dn)
}

/// A silicon-like cell's figures.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct RealCellResult {
    /// [A m^-2]
    pub jsc: f64,
    /// [V]
    pub voc: f64,
    pub vmp: f64,
    /// [A m^-2]
    pub jmp: f64,
    /// fraction
    pub efficiency: f64,
    /// radiative and Auger recombination currents at the maximum power point [A m^-2]
    pub j_radiative_mpp: f64,
    pub j_auger_mpp: f64,
}

/// The cell of absorber `abs` under `light` at `temp_k` [K] with `doping`; Auger
/// recombination of silicon when `auger`. The maximum power point of J(V) (module docs):
/// Voc by bisection, then golden section on V J(V) (`special::golden_max`), both to 1e-12 V.
/// One evaluation; for many thicknesses build a [`RealCellModel`] once.
pub fn solve_real(
    light: &Illumination,
    abs: &RealAbsorber,
    temp_k: f64,
    doping: Doping,
    auger: bool,
) -> RealCellResult {
    RealCellModel::new(abs, light, temp_k, doping, auger).solve(abs.thickness_m, abs.trapping)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::sources::Source;

    #[test]
    fn silicon_absorption_matches_green_2008() {
        // Green, Sol. Energy Mater. Sol. Cells 92, 1305 (2008), Table 1, alpha at 300 K
        // (recalled): 850 cm^-1 at 800 nm, 64 cm^-1 at 1000 nm, 3.5 cm^-1 at 1100 nm;
        // 1 % (the recalled values carry two or three digits)
        let si = RealAbsorber::silicon(100e-6, Trapping::Lambertian).unwrap();
        for (nm, want_cm) in [(800.0, 850.0), (1000.0, 64.0), (1100.0, 3.5)] {
            let e = HC / (nm * 1e-9);
            let i = si.energies_j.iter().position(|x| (x / e - 1.0).abs() < 1e-9).unwrap();
            let got_cm = si.alpha_per_m[i] / 100.0;
            assert!((got_cm / want_cm - 1.0).abs() < 0.01, "{nm} nm: {got_cm} cm^-1");
        }
        // the Lambertian absorptance of a weak absorber approaches 4 n^2 alpha W
        // (Tiedje et al. 1984), and a strong one approaches 1
        let a = si.absorptance_of(1.0, 3.5);
        assert!((a / (4.0 * 3.5 * 3.5 * 1.0 * 100e-6) - 1.0).abs() < 0.01, "{a}");
        assert!(si.absorptance_of(1e7, 3.5) > 0.999);
    }

    #[test]
    fn intrinsic_limit_of_silicon_near_richter_2013() {
        // Richter, Hermle & Glunz, IEEE J. Photovolt. 3, 1184 (2013): 29.43 % at 110 um,
        // undoped, Lambertian, AM1.5G, 25 C, with Jsc about 43.3 mA/cm2 and Voc about 761 mV
        // (values recalled). Tolerance 0.3 % absolute, 0.5 mA/cm2 and 8 mV: their model adds
        // band-gap narrowing and a slightly different n_i, which this one leaves out.
        let light = Illumination::one_sun(Source::am15g());
        let si = RealAbsorber::silicon(110e-6, Trapping::Lambertian).unwrap();
        let r = solve_real(&light, &si, 298.15, Doping::Undoped, true);
        eprintln!("{r:?}");
        assert!((r.efficiency - 0.2943).abs() < 0.003, "{r:?}");
        assert!((r.jsc * 0.1 - 43.3).abs() < 0.5, "{r:?}");
        assert!((r.voc - 0.761).abs() < 0.008, "{r:?}");
        assert!(r.j_auger_mpp > r.j_radiative_mpp, "Auger dominates: {r:?}");
    }

    #[test]
    fn fast_model_matches_the_scalar_table_path() {
        // the model's per-interval weights integrate the same piecewise-linear a(E) as the
        // table path (absorber::photocurrent, absorber::ln_dark_current); they differ only
        // in quadrature order, so Jsc agrees to 1e-9 relative and ln J0 to 1e-6
        use crate::physics::absorber::{ln_dark_current, photocurrent};
        use crate::physics::junction::Emission;
        let light = Illumination::one_sun(Source::am15g());
        for (w, trap) in [(110e-6, Trapping::Lambertian), (20e-6, Trapping::SinglePass), (300e-6, Trapping::DoublePass)]
        {
            let si = RealAbsorber::silicon(w, trap).unwrap();
            let a = si.absorptance().unwrap();
            let model = RealCellModel::new(&si, &light, 298.15, Doping::Undoped, true);
            let d = model.diode(w, trap, f64::INFINITY);
            let jsc = photocurrent(&light, &a);
            let ln_j0 = ln_dark_current(&a, 298.15, Emission::Front);
            assert!((d.jsc / jsc - 1.0).abs() < 1e-9, "{w} {trap:?}: {} vs {jsc}", d.jsc);
            assert!((d.ln_j0 - ln_j0).abs() < 1e-6, "{w} {trap:?}: {} vs {ln_j0}", d.ln_j0);
        }
    }
}
