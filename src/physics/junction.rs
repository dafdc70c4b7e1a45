//! Single-junction detailed balance (Shockley & Queisser, J. Appl. Phys. 32, 510, 1961).
//!
//! A cell with a step absorptance at its band gap Eg absorbs every incident photon above Eg
//! and, by detailed balance, emits as a black body above Eg at the cell temperature Tc with
//! photon chemical potential qV (Wurfel, J. Phys. C 15, 3967, 1982):
//!
//! * short-circuit current  Jsc = q X integral_{Eg}^inf Phi_src(E) dE          [A m^-2]
//! * radiative current      R(V) = q g integral_{Eg}^inf phi(E; Tc, qV) dE     [A m^-2]
//!   with phi the hemispherical generalized Planck photon flux per unit energy and g the
//!   number of emitting faces (1: perfect back mirror; 2: both faces emit),
//! * J(V) = Jsc - (R(V) - R(0)) / ERE, ERE in (0, 1] the external radiative efficiency
//!   (non-radiative recombination scales the dark current by 1/ERE; Green, Prog.
//!   Photovolt. 20, 472, 2012, eq. 3).
//!
//! R(V) has the closed form q g 2 pi (kTc)^3 / (h^3 c^2) * G_2(x0, m) with x0 = Eg/kTc and
//! m = qV/kTc (see `special::scaled_bose2`), evaluated in logarithms. The Boltzmann
//! approximation keeps the first term of its series, R_B(V) = R_B(0) e^m, whose maximum
//! power point is closed-form through the Lambert W function:
//! V_mp = (kTc/q) (W(e (1 + Jsc/J0)) - 1), J0 = R_B(0)/ERE.
//!
//! The exact open-circuit voltage and maximum power point come from Newton's method on
//! monotone functions of m, started from the Boltzmann closed forms, kept inside a bracket
//! that always holds the root, and falling back to bisection whenever a step would leave it.

use super::constants::{thermal_energy, CHARGE};
use super::planck::ln_photon_flux_above;
use super::sources::Source;
use super::special::lambert_w_of_exp;
use serde::{Deserialize, Serialize};

/// Which faces of the cell emit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum Emission {
    /// The front face only (a perfect mirror behind the cell). Default.
    #[default]
    Front,
    /// Both faces (no back mirror): twice the radiative current.
    Both,
}

impl Emission {
    pub fn faces(self) -> f64 {
        match self {
            Emission::Front => 1.0,
            Emission::Both => 2.0,
        }
    }
}

/// How the J-V curve is computed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum JvModel {
    /// The generalized Planck law with chemical potential qV. Default.
    #[default]
    Exact,
    /// The Boltzmann approximation exp((E - qV)/kT) >> 1.
    Boltzmann,
}

/// An ideal single-junction cell.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Cell {
    /// band gap [J]
    pub gap_j: f64,
    /// cell temperature [K]
    pub temp_k: f64,
    /// external radiative efficiency, in (0, 1]
    pub ere: f64,
    pub emission: Emission,
    pub model: JvModel,
}

impl Cell {
    /// A cell at 300 K in the radiative limit, front emission, exact J-V.
    pub fn ideal(gap_j: f64) -> Cell {
        Cell { gap_j, temp_k: 300.0, ere: 1.0, emission: Emission::Front, model: JvModel::Exact }
    }
}

/// The figures of merit of one cell under one illumination. SI units.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct CellResult {
    /// band gap [J]
    pub gap_j: f64,
    /// short-circuit current density [A m^-2]
    pub jsc: f64,
    /// open-circuit voltage [V]
    pub voc: f64,
    /// fill factor Pmax / (Voc Jsc)
    pub ff: f64,
    /// voltage at the maximum power point [V]
    pub vmp: f64,
    /// current density at the maximum power point [A m^-2]
    pub jmp: f64,
    /// maximum power density [W m^-2]
    pub pmax: f64,
    /// incident power density (concentration included) [W m^-2]
    pub input: f64,
    /// Pmax / input
    pub efficiency: f64,
}

/// The radiative diode of a cell: everything needed to evaluate J(V) quickly.
#[derive(Debug, Clone, Copy)]
pub struct Diode {
    kt: f64,
    x0: f64,
    /// ln of q g 2 pi (kT)^3 / (h^3 c^2) is folded into the exact call; for the Boltzmann
    /// model, ln R_B(0)
    ln_faces_q: f64,
    ln_rb0: f64,
    ere: f64,
    jsc: f64,
    /// ln(ERE Jsc + R(0)): the level R(V) reaches at open circuit
    ln_target: f64,
    ln_r0: f64,
    model: JvModel,
}

impl Diode {
    /// `jsc` [A m^-2] is the photocurrent the cell collects.
    pub fn new(cell: &Cell, jsc: f64) -> Diode {
        let kt = thermal_energy(cell.temp_k);
        let x0 = cell.gap_j / kt;
        let ln_faces_q = (cell.emission.faces() * CHARGE).ln();
        // Boltzmann R_B(0): first series term, e^-x0 (x0^2 + 2 x0 + 2) times the prefactor
        let (ln_flux0, _, _) = ln_photon_flux_above(cell.gap_j, cell.temp_k, 0.0);
        let ln_r0_exact = ln_faces_q + ln_flux0;
        let ln_scale = (super::constants::PHOTON_FLUX_PREFACTOR * kt * kt * kt).ln();
        let ln_rb0 = ln_faces_q + ln_scale - x0 + (x0 * x0 + 2.0 * x0 + 2.0).ln();
        let ln_r0 = match cell.model {
            JvModel::Exact => ln_r0_exact,
            JvModel::Boltzmann => ln_rb0,
        };
        let ere = cell.ere;
        let ln_target = log_add((ere * jsc).ln(), ln_r0);
        Diode { kt, x0, ln_faces_q, ln_rb0, ere, jsc, ln_target, ln_r0, model: cell.model }
    }

    /// ln R at reduced voltage m = qV/kT, with d lnR/dm and d^2 lnR/dm^2.
    #[inline]
    fn ln_r(&self, m: f64) -> (f64, f64, f64) {
        match self.model {
            JvModel::Exact => {
                let (l, d1, d2) = ln_photon_flux_above(self.x0 * self.kt, self.kt / super::constants::BOLTZMANN, m * self.kt);
                (self.ln_faces_q + l, d1, d2)
            }
            JvModel::Boltzmann => (self.ln_rb0 + m, 1.0, 0.0),
        }
    }

    fn volts(&self, m: f64) -> f64 {
        m * self.kt / CHARGE
    }

    /// Current density J(V) [A m^-2] at voltage `v` [V]. For V at or beyond the band gap
    /// (where the exact law has its pole) it returns -infinity, never NaN.
    pub fn current(&self, v: f64) -> f64 {
        let m = v * CHARGE / self.kt;
        if self.model == JvModel::Exact && m >= self.x0 {
            return f64::NEG_INFINITY;
        }
        let (lr, _, _) = self.ln_r(m);
        // (R - R0)/ERE computed as R0 (e^(lnR - lnR0) - 1)/ERE, accurate near V = 0
        let excess = self.ln_r0.exp() * (lr - self.ln_r0).exp_m1();
        self.jsc - excess / self.ere
    }

    /// Reduced open-circuit voltage m_oc = qVoc/kT.
    fn open_circuit_m(&self) -> f64 {
        if !(self.jsc > 0.0) {
            return 0.0;
        }
        let boltzmann = self.ln_target - self.ln_rb0;
        match self.model {
            JvModel::Boltzmann => boltzmann.max(0.0),
            JvModel::Exact => {
                // G(m) = lnR(m) - ln_target is increasing; the root lies in (0, x0)
                let g = |m: f64| {
                    let (lr, d1, _) = self.ln_r(m);
                    (lr - self.ln_target, d1)
                };
                safeguarded_newton(g, 0.0, self.x0, boltzmann, 1e-14)
            }
        }
    }

    /// Reduced maximum-power voltage, given the reduced open-circuit voltage.
    fn max_power_m(&self, m_oc: f64) -> f64 {
        if !(self.jsc > 0.0) || !(m_oc > 0.0) {
            return 0.0;
        }
        // Boltzmann closed form: e^m (1 + m) = 1 + Jsc/J0 = target / R_B(0)
        let l = self.ln_target - self.ln_rb0;
        let boltzmann = (lambert_w_of_exp(1.0 + l) - 1.0).max(0.0);
        match self.model {
            JvModel::Boltzmann => boltzmann.min(m_oc),
            JvModel::Exact => {
                // d(V J)/dV = 0  <=>  R(m) (1 + m rho(m)) = ERE Jsc + R(0); in logarithms
                // F(m) = lnR + ln(1 + m rho) - ln_target, increasing in m.
                let f = |m: f64| {
                    let (lr, rho, drho) = self.ln_r(m);
                    let s = 1.0 + m * rho;
                    (lr + s.ln() - self.ln_target, rho + (rho + m * drho) / s)
                };
                safeguarded_newton(f, 0.0, m_oc, boltzmann, 1e-14)
            }
        }
    }

    /// Solve for the figures of merit. `input` [W m^-2] is the incident power.
    pub fn solve(&self, gap_j: f64, input: f64) -> CellResult {
        if !(self.jsc > 0.0) {
            return CellResult { gap_j, input, ..Default::default() };
        }
        let m_oc = self.open_circuit_m();
        let m_mp = self.max_power_m(m_oc);
        let voc = self.volts(m_oc);
        let vmp = self.volts(m_mp);
        let jmp = match self.model {
            // closed form, free of cancellation: Jmp = (Jsc + J0) m / (1 + m)
            JvModel::Boltzmann => (self.ln_target.exp() / self.ere) * m_mp / (1.0 + m_mp),
            JvModel::Exact => self.current(vmp).max(0.0),
        };
        let pmax = vmp * jmp;
        let ff = if voc > 0.0 { pmax / (voc * self.jsc) } else { 0.0 };
        let efficiency = if input > 0.0 { pmax / input } else { 0.0 };
        CellResult { gap_j, jsc: self.jsc, voc, ff, vmp, jmp, pmax, input, efficiency }
    }

    /// The J-V curve from 0 to Voc in `points` steps: (V [V], J [A m^-2]).
    pub fn curve(&self, voc: f64, points: usize) -> Vec<(f64, f64)> {
        let n = points.max(2);
        (0..n)
            .map(|i| {
                let v = voc * i as f64 / (n - 1) as f64;
                (v, if i == n - 1 { 0.0 } else { self.current(v) })
            })
            .collect()
    }
}

/// ln(e^a + e^b) without overflow; -inf arguments allowed.
#[inline]
fn log_add(a: f64, b: f64) -> f64 {
    let (hi, lo) = if a >= b { (a, b) } else { (b, a) };
    if hi == f64::NEG_INFINITY {
        return hi;
    }
    hi + (lo - hi).exp().ln_1p()
}

/// Root of an increasing function on (lo, hi) by Newton's method from `start`, keeping a
/// bracket and bisecting whenever a step leaves it or the function is not finite.
/// `f` returns (value, derivative). `tol` is relative to max(1, |x|).
fn safeguarded_newton(f: impl Fn(f64) -> (f64, f64), lo: f64, hi: f64, start: f64, tol: f64) -> f64 {
    let (mut lo, mut hi) = (lo, hi);
    let mut x = if start > lo && start < hi { start } else { 0.5 * (lo + hi) };
    for _ in 0..200 {
        let (fx, dfx) = f(x);
        if fx.is_nan() || fx > 0.0 {
            hi = x;
        } else if fx < 0.0 {
            lo = x;
        } else {
            return x;
        }
        let mut next = if fx.is_finite() && dfx.is_finite() && dfx > 0.0 { x - fx / dfx } else { f64::NAN };
        if !(next > lo && next < hi) {
            next = 0.5 * (lo + hi);
        }
        if (next - x).abs() <= tol * x.abs().max(1.0) || hi - lo <= tol * hi.abs().max(1.0) {
            return next;
        }
        x = next;
    }
    x
}

/// Everything the sources and the cell say about one operating condition.
#[derive(Debug, Clone)]
pub struct Illumination {
    pub source: Source,
    /// concentration factor X >= 1 (1 = one sun)
    pub concentration: f64,
}

impl Illumination {
    pub fn one_sun(source: Source) -> Illumination {
        Illumination { source, concentration: 1.0 }
    }

    /// Incident power [W m^-2].
    pub fn input_power(&self) -> f64 {
        self.concentration * self.source.total_power()
    }

    /// Photocurrent of a step absorber with gap `gap_j` [J]: Jsc [A m^-2].
    pub fn step_jsc(&self, gap_j: f64) -> f64 {
        CHARGE * self.concentration * self.source.photon_flux_above(gap_j)
    }
}

/// Solve one cell with a step absorptance.
pub fn solve_cell(light: &Illumination, cell: &Cell) -> CellResult {
    if !(cell.gap_j > 0.0) || !(cell.temp_k > 0.0) || !(cell.ere > 0.0) || !cell.gap_j.is_finite() {
        return CellResult { gap_j: cell.gap_j, input: light.input_power(), ..Default::default() };
    }
    let cell = Cell { ere: cell.ere.min(1.0), ..*cell };
    let diode = Diode::new(&cell, light.step_jsc(cell.gap_j));
    diode.solve(cell.gap_j, light.input_power())
}

/// The cell's J-V curve from 0 to Voc, `points` samples: (V [V], J [A m^-2]).
pub fn jv_curve(light: &Illumination, cell: &Cell, points: usize) -> Vec<(f64, f64)> {
    let r = solve_cell(light, cell);
    if !(r.jsc > 0.0) {
        return vec![(0.0, 0.0), (0.0, 0.0)];
    }
    Diode::new(cell, r.jsc).curve(r.voc, points)
}

/// Solve the same cell at every band gap in `gaps_j` [J].
pub fn sweep(light: &Illumination, template: &Cell, gaps_j: &[f64]) -> Vec<CellResult> {
    let input = light.input_power();
    gaps_j
        .iter()
        .map(|&g| {
            let cell = Cell { gap_j: g, ..*template };
            if !(g > 0.0) {
                return CellResult { gap_j: g, input, ..Default::default() };
            }
            Diode::new(&cell, light.step_jsc(g)).solve(g, input)
        })
        .collect()
}

/// The best point of a sweep (highest efficiency); `None` for an empty sweep.
pub fn best_of(results: &[CellResult]) -> Option<CellResult> {
    results.iter().copied().fold(None, |best, r| match best {
        Some(b) if b.efficiency >= r.efficiency => Some(b),
        _ => Some(r),
    })
}

/// Shockley and Queisser's "ultimate efficiency" u(Eg) (1961, section IV): every photon above
/// the gap delivers exactly Eg, u = Eg * Phi(>Eg) / P_in.
pub fn ultimate_efficiency(light: &Illumination, gap_j: f64) -> f64 {
    let p = light.input_power();
    if p > 0.0 {
        gap_j * light.concentration * light.source.photon_flux_above(gap_j) / p
    } else {
        0.0
    }
}
