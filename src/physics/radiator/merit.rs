//! The figures of merit the trade quotes for a cooling surface, all from the emitter's
//! normal spectral emissivity (near-normal incidence, as such figures are measured):
//!
//! * solar reflectance R_sol = 1 - integral eps(lambda) I(lambda) dlambda / integral I dlambda,
//!   weighted by the ASTM G173-03 AM1.5G spectrum over its 280-4000 nm range (the practice
//!   of ASTM E903 and ISO 9050: a solar-spectrum-weighted mean of 1 - eps for an opaque
//!   sample);
//! * thermal emittance at T: integral eps E_b(lambda, T) dlambda / (sigma T^4), the
//!   blackbody-weighted mean (E_b = pi B_lambda);
//! * window emissivity: the mean over 8-13 um, weighted by E_b(lambda, T) at the same T.
//!
//! The hemispherical emittance, which sets the emitted power, is also given: the same
//! blackbody-weighted mean of the hemispherical emissivity.

use super::balance::{grid_for, Method};
use super::emissivity::Emitter;
use super::sky::WINDOW_M;
use super::solar::weighted_irradiance;
use super::spectral::Grid;
use crate::physics::planck::{band_power_wavelength, stefan_boltzmann};
use crate::physics::sources::Source;

/// The figures of one emitter at one temperature (all fractions 0-1).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Figures {
    pub solar_reflectance: f64,
    pub thermal_emittance: f64,
    pub hemispherical_emittance: f64,
    pub window_emissivity: f64,
    /// the temperature of the blackbody weighting [K]
    pub temp_k: f64,
}

/// num / den clamped to [0, 1] (dimensionless; both in one unit), 0 when undefined.
fn ratio(num: f64, den: f64) -> f64 {
    if den > 0.0 && num.is_finite() {
        (num / den).clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// Solar reflectance (dimensionless) of an opaque emitter, AM1.5G-weighted (ASTM G173-03) at
/// normal incidence: R_sol = 1 - absorbed / incident, as in the module docs.
pub fn solar_reflectance(emitter: &Emitter) -> f64 {
    let sun = Source::am15g();
    let absorbed = weighted_irradiance(&sun, |l| emitter.normal(l), &emitter.knots());
    1.0 - ratio(absorbed, sun.total_power())
}

/// The grid suited to the emitter alone.
fn emitter_grid(emitter: &Emitter) -> Grid {
    grid_for(emitter.constant_pieces(), Some(vec![]), &emitter.knots()).0
}

/// Normal thermal emittance (dimensionless) at `temp_k` [K]: integral eps E_b dlambda /
/// (sigma T^4).
pub fn thermal_emittance(emitter: &Emitter, temp_k: f64) -> f64 {
    let g = emitter_grid(emitter);
    ratio(g.against_blackbody(&g.weights(|l| emitter.normal(l)), temp_k), stefan_boltzmann(temp_k))
}

/// Hemispherical thermal emittance (dimensionless) at `temp_k` [K]: integral eps_h E_b
/// dlambda / (sigma T^4).
pub fn hemispherical_emittance(emitter: &Emitter, temp_k: f64) -> f64 {
    let g = emitter_grid(emitter);
    ratio(g.against_blackbody(&g.weights(|l| emitter.hemispherical(l)), temp_k), stefan_boltzmann(temp_k))
}

/// Mean normal emissivity (dimensionless) over 8-13 um, weighted by the blackbody at
/// `temp_k` [K].
pub fn window_emissivity(emitter: &Emitter, temp_k: f64) -> f64 {
    let (lo, hi) = WINDOW_M;
    let in_window = |l: f64| l >= lo && l <= hi;
    let grid = match grid_for(emitter.constant_pieces(), Some(vec![(0.0, lo, 0.0), (lo, hi, 1.0)]), &[]) {
        (g, Method::ClosedForm) => g,
        _ => Grid::fine_between(lo, hi, &emitter.knots()),
    };
    let w = grid.weights(|l| if in_window(l) { emitter.normal(l) } else { 0.0 });
    ratio(grid.against_blackbody(&w, temp_k), band_power_wavelength(lo, hi, temp_k))
}

/// All figures (dimensionless) at `temp_k` [K].
pub fn figures(emitter: &Emitter, temp_k: f64) -> Figures {
    Figures {
        solar_reflectance: solar_reflectance(emitter),
        thermal_emittance: thermal_emittance(emitter, temp_k),
        hemispherical_emittance: hemispherical_emittance(emitter, temp_k),
        window_emissivity: window_emissivity(emitter, temp_k),
        temp_k,
    }
}
