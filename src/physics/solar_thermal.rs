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

use super::constants::SUN_DILUTION;
use super::planck::{band_power_energy, stefan_boltzmann};
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
