//! Solar-thermal absorbers in the detailed-balance picture: a surface at temperature T under
//! C suns absorbs the sunlight and the ambient radiation its absorptance takes, emits as its
//! emissivity allows (Kirchhoff: absorptance = emissivity at every photon energy), loses
//! h_c (T - Ta) to the air, and hands the rest to a Carnot engine working down to Ta
//! (Harder & Würfel, Semicond. Sci. Technol. 18, S151 (2003)).
//!
//! This module covers the step absorber (absorptance 1 above a cutoff energy, 0 below; a
//! cutoff of 0 is the black absorber) under a blackbody sun, in closed form through
//! `planck::band_power_energy`. Balance per unit area [W m^-2]:
//!
//!   absorbed = C f sigma_band(E > Ec, Ts) + (1 - C f) sigma_band(E > Ec, Ta)
//!   emitted  = sigma_band(E > Ec, T),   convection = h_c (T - Ta)
//!   thermal efficiency = (absorbed - emitted - convection) / (C f sigma Ts^4)
//!   work efficiency = thermal efficiency x (1 - Ta / T)
//!
//! with f the sun's dilution ([`SUN_DILUTION`]): the sun fills the fraction C f of the
//! hemisphere's view, the ambient the rest.
//!
//! Architecture invariant: pure functions of SI numbers, no NaN for any finite input.
#![allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose here: it also refuses NaN

use super::constants::{HC, SUN_DILUTION};
use super::planck::{band_power_energy, stefan_boltzmann};
use super::radiator::emissivity::Profile;
use super::radiator::solar::weighted_irradiance;
use super::radiator::spectral::{Grid, Weights};
use super::sources::Source;
use super::special::golden_max;

/// The surroundings and the light of a step absorber.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThermalSetup {
    /// the blackbody sun's temperature [K]
    pub sun_temp_k: f64,
    /// suns, 1 to `constants::MAX_CONCENTRATION`
    pub concentration: f64,
    /// the ambient's (and the sky's) temperature [K]
    pub ambient_k: f64,
    /// convective loss coefficient [W m^-2 K^-1]
    pub hc_w_m2k: f64,
}

/// A step absorber's balance at one temperature [W m^-2 unless said].
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct ThermalBalance {
    pub incident: f64,
    pub absorbed: f64,
    pub emitted: f64,
    pub convection: f64,
    /// (absorbed - emitted - convection) / incident (fraction; negative below stagnation)
    pub thermal_efficiency: f64,
    /// 1 - Ta / T (fraction)
    pub carnot_factor: f64,
    /// thermal efficiency x Carnot factor (fraction)
    pub work_efficiency: f64,
}

/// The balance of the step absorber with cutoff `cutoff_j` [J] (0: black) at `temp_k` [K].
pub fn balance(s: &ThermalSetup, cutoff_j: f64, temp_k: f64) -> ThermalBalance {
    let cf = (s.concentration * SUN_DILUTION).clamp(0.0, 1.0);
    let incident = cf * stefan_boltzmann(s.sun_temp_k);
    let ec = cutoff_j.max(0.0);
    let absorbed = cf * band_power_energy(ec, f64::INFINITY, s.sun_temp_k)
        + (1.0 - cf) * band_power_energy(ec, f64::INFINITY, s.ambient_k);
    let emitted = band_power_energy(ec, f64::INFINITY, temp_k);
    let convection = s.hc_w_m2k * (temp_k - s.ambient_k);
    let thermal = if incident > 0.0 { (absorbed - emitted - convection) / incident } else { 0.0 };
    let carnot = if temp_k > 0.0 { 1.0 - s.ambient_k / temp_k } else { 0.0 };
    ThermalBalance {
        incident,
        absorbed,
        emitted,
        convection,
        thermal_efficiency: thermal,
        carnot_factor: carnot,
        work_efficiency: thermal * carnot,
    }
}

/// The best temperature [K] of the step absorber with cutoff `cutoff_j` [J] for work, and
/// the work efficiency there: golden-section search between the ambient and the sun's
/// temperature (the work efficiency is zero at both ends and, for a step absorber, has one
/// maximum between), to 1e-9 relative in temperature.
pub fn best_temperature(s: &ThermalSetup, cutoff_j: f64) -> (f64, f64) {
    let work = |t: f64| balance(s, cutoff_j, t).work_efficiency;
    golden_max(work, |w| *w, s.ambient_k, s.sun_temp_k, 1e-9 * s.sun_temp_k)
}

/// The best cutoff [J] and temperature [K] of a step absorber for work, and the work
/// efficiency there: golden-section search over the cutoff from 0 to 10 kTs (the sun's
/// photons above it carry under 0.01 % of its power), each cutoff at its best temperature.
pub fn best_step(s: &ThermalSetup) -> (f64, f64, f64) {
    let kts = super::constants::thermal_energy(s.sun_temp_k);
    let (ec, (t, w)) = golden_max(|ec| best_temperature(s, ec), |best| best.1, 0.0, 10.0 * kts, 1e-9 * kts);
    (ec, t, w)
}

/// What the absorber's absorptance (= emissivity, Kirchhoff) is.
#[derive(Debug, Clone, PartialEq)]
pub enum Surface {
    /// absorptance 1 everywhere
    Black,
    /// 1 below the cutoff wavelength [m], 0 above
    Step { cutoff_m: f64 },
    /// any emissivity profile
    Profile(Profile),
}

/// The light and surroundings of an absorber under any source.
#[derive(Debug, Clone)]
pub struct AbsorberSetup {
    /// the sun's spectrum at one sun
    pub source: Source,
    /// suns, 1 to `constants::MAX_CONCENTRATION`
    pub concentration: f64,
    /// the ambient's (and the sky's) temperature [K]
    pub ambient_k: f64,
    /// convective loss coefficient [W m^-2 K^-1]
    pub hc_w_m2k: f64,
}

/// An absorber prepared for repeated balances: what it takes from the sun and the ambient
/// is fixed, its emission is one closed form (step, black) or one grid sum (profile) per
/// temperature.
#[derive(Debug, Clone)]
pub struct Absorber {
    incident: f64,
    absorbed: f64,
    ambient_k: f64,
    hc: f64,
    emission: Emission,
}

#[derive(Debug, Clone)]
enum Emission {
    /// photons above this energy [J] (0: black)
    Above(f64),
    Grid(Grid, Weights),
}

impl Emission {
    fn at(&self, temp_k: f64) -> f64 {
        match self {
            Emission::Above(e) => band_power_energy(*e, f64::INFINITY, temp_k),
            Emission::Grid(g, w) => g.against_blackbody(w, temp_k),
        }
    }
}

impl Absorber {
    /// Prepare `surface` under `setup`. The sun fills the fraction C f of the hemisphere's
    /// view (f the sun's dilution, for any source spectrum: the direct beam comes from the
    /// disc), the ambient at Ta the rest, 1 - C f.
    pub fn new(setup: &AbsorberSetup, surface: &Surface) -> Absorber {
        let c = if setup.concentration.is_finite() { setup.concentration.max(0.0) } else { 0.0 };
        let sky = (1.0 - c * SUN_DILUTION).clamp(0.0, 1.0);
        let incident = c * setup.source.total_power();
        let (sun, emission) = match surface {
            Surface::Black => (setup.source.total_power(), Emission::Above(0.0)),
            Surface::Step { cutoff_m } => {
                let ec = if *cutoff_m > 0.0 { HC / cutoff_m } else { f64::INFINITY };
                (setup.source.power_above(ec), Emission::Above(ec))
            }
            Surface::Profile(p) => {
                let knots = p.knots();
                let sun = weighted_irradiance(&setup.source, |l| p.at(l), &knots);
                let grid = Grid::fine(&knots);
                let w = grid.weights(|l| p.at(l));
                (sun, Emission::Grid(grid, w))
            }
        };
        let absorbed = c * sun + sky * emission.at(setup.ambient_k);
        Absorber {
            incident: finite(incident),
            absorbed: finite(absorbed),
            ambient_k: setup.ambient_k,
            hc: setup.hc_w_m2k,
            emission,
        }
    }

    /// The balance at `temp_k` [K].
    pub fn balance(&self, temp_k: f64) -> ThermalBalance {
        let emitted = self.emission.at(temp_k);
        let convection = self.hc * (temp_k - self.ambient_k);
        let net = self.absorbed - emitted - convection;
        let thermal = if self.incident > 0.0 { net / self.incident } else { 0.0 };
        let carnot = if temp_k > 0.0 { 1.0 - self.ambient_k / temp_k } else { 0.0 };
        ThermalBalance {
            incident: self.incident,
            absorbed: self.absorbed,
            emitted: finite(emitted),
            convection: finite(convection),
            thermal_efficiency: finite(thermal),
            carnot_factor: finite(carnot),
            work_efficiency: finite(thermal * carnot),
        }
    }

    fn net(&self, temp_k: f64) -> f64 {
        self.absorbed - self.emission.at(temp_k) - self.hc * (temp_k - self.ambient_k)
    }

    /// The stagnation temperature [K]: where absorbed = emitted + convection (no heat
    /// drawn). The ambient's when the absorber gains nothing there; None when it never
    /// loses as much as it gains below [`STAGNATION_CAP_K`].
    pub fn stagnation(&self) -> Option<f64> {
        let ta = self.ambient_k;
        if !(self.net(ta) > 0.0) {
            return Some(ta);
        }
        let mut hi = ta.max(1.0) * 2.0;
        while self.net(hi) > 0.0 {
            hi *= 2.0;
            if hi > STAGNATION_CAP_K {
                return None;
            }
        }
        let (mut lo, mut up) = (ta, hi);
        for _ in 0..200 {
            let mid = 0.5 * (lo + up);
            if self.net(mid) > 0.0 {
                lo = mid;
            } else {
                up = mid;
            }
            if up - lo <= 1e-13 * up {
                break;
            }
        }
        Some(0.5 * (lo + up))
    }

    /// The temperature [K] of the largest work efficiency, between the ambient and the
    /// stagnation temperature, and that efficiency (golden section to 1e-10 of the range;
    /// the work efficiency is flat there, so the temperature is good to about 1e-6 K).
    pub fn best_temperature(&self) -> (f64, f64) {
        let ta = self.ambient_k;
        let top = self.stagnation().unwrap_or(STAGNATION_CAP_K);
        if !(top > ta) {
            return (ta, 0.0);
        }
        golden_max(|t| self.balance(t).work_efficiency, |w| *w, ta, top, 1e-10 * top)
    }
}

/// Above this temperature [K] an absorber is taken never to stagnate.
pub const STAGNATION_CAP_K: f64 = 1e7;

/// The best step absorber for work under `setup`: its cutoff (None when black does at least
/// as well), temperature and work efficiency, and the black absorber's best for comparison.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BestStep {
    pub cutoff_m: Option<f64>,
    pub temp_k: f64,
    pub work_efficiency: f64,
    pub black_temp_k: f64,
    pub black_work_efficiency: f64,
}

/// Cutoffs scanned by [`best_cutoff`]: log-spaced from [`CUTOFF_SCAN_UM`].0 to .1.
pub const CUTOFF_SCAN_UM: (f64, f64) = (0.2, 50.0);
const CUTOFF_SCAN_POINTS: usize = 240;

/// The best step cutoff under any source: each cutoff at its best temperature, a scan of
/// [`CUTOFF_SCAN_POINTS`] log-spaced cutoffs, then golden section between the neighbours of
/// each of the three best local maxima of the scan (a tabulated sun has absorption bands,
/// so the work efficiency against cutoff can have several maxima). A cutoff at the top of
/// the scan, or one that does no better than black, counts as black.
pub fn best_cutoff(setup: &AbsorberSetup) -> BestStep {
    let (black_t, black_w) = Absorber::new(setup, &Surface::Black).best_temperature();
    let at = |l_um: f64| Absorber::new(setup, &Surface::Step { cutoff_m: l_um * 1e-6 }).best_temperature();
    let (a, b) = (CUTOFF_SCAN_UM.0.ln(), CUTOFF_SCAN_UM.1.ln());
    let n = CUTOFF_SCAN_POINTS;
    let xs: Vec<f64> = (0..n).map(|i| a + (b - a) * i as f64 / (n - 1) as f64).collect();
    let mut ws = vec![0.0; n];
    super::batch::fill_chunks(&mut ws, 16, |start, chunk| {
        for (k, w) in chunk.iter_mut().enumerate() {
            *w = at(xs[start + k].exp()).1;
        }
    });
    let mut peaks: Vec<usize> =
        (0..n).filter(|&i| (i == 0 || ws[i] >= ws[i - 1]) && (i + 1 == n || ws[i] >= ws[i + 1])).collect();
    super::order::sort_descending_by(&mut peaks, |&i| ws[i]);
    peaks.truncate(3);
    let mut best = (f64::NAN, black_t, black_w, true);
    for &i in &peaks {
        if i + 1 == n {
            continue; // the top of the scan: black-like
        }
        let lo = xs[i.saturating_sub(1)];
        let hi = xs[(i + 1).min(n - 1)];
        let (x, (t, w)) = golden_max(|x| at(x.exp()), |r| r.1, lo, hi, 1e-9);
        if w > best.2 {
            best = (x.exp() * 1e-6, t, w, false);
        }
    }
    BestStep {
        cutoff_m: if best.3 { None } else { Some(best.0) },
        temp_k: best.1,
        work_efficiency: best.2,
        black_temp_k: black_t,
        black_work_efficiency: black_w,
    }
}

fn finite(x: f64) -> f64 {
    if x.is_nan() {
        0.0
    } else {
        x.clamp(-f64::MAX, f64::MAX)
    }
}
