//! The blackbody's figures in display units (um, eV, W/m2): the JSON of `glowgap blackbody`
//! and the rows of its spectrum table.
//!
//! Architecture invariant: numbers come from `physics::planck`; this module only converts
//! units and names the keys.

use crate::physics::constants::to_ev;
use crate::physics::planck::{
    band_power_wavelength, exitance_per_wavelength, peak_energy, peak_wavelength, photon_exitance,
    rayleigh_jeans_exitance_per_wavelength, stefan_boltzmann, wien_exitance_per_wavelength,
};
use serde::Serialize;

/// 1 um in m.
const UM: f64 = 1e-6;

/// A black surface at one temperature. Field names are the command line's JSON keys.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct BlackbodyReport {
    pub temp_k: f64,
    /// the peak of the distribution per unit wavelength (Wien's displacement law) [um]
    pub peak_wavelength_um: f64,
    /// the peak of the distribution per unit energy (or frequency) [eV]: not hc over the
    /// wavelength peak
    pub peak_energy_ev: f64,
    /// sigma T^4 [W/m2]
    pub exitance_w_m2: f64,
    /// photons per second and square metre, all energies [m-2 s-1]
    pub photon_exitance_m2_s: f64,
    /// with a band: the exitance between its wavelengths [W/m2]
    #[serde(skip_serializing_if = "Option::is_none")]
    pub band_exitance_w_m2: Option<f64>,
    /// with a band: its share of sigma T^4 (fraction)
    #[serde(skip_serializing_if = "Option::is_none")]
    pub band_fraction: Option<f64>,
}

impl BlackbodyReport {
    /// The figures at `temp_k` [K], with the band `band_um` = (from, to) [um] if given.
    pub fn new(temp_k: f64, band_um: Option<(f64, f64)>) -> BlackbodyReport {
        let total = stefan_boltzmann(temp_k);
        let band = band_um.map(|(a, b)| band_power_wavelength(a * UM, b * UM, temp_k));
        BlackbodyReport {
            temp_k,
            peak_wavelength_um: peak_wavelength(temp_k) / UM,
            peak_energy_ev: to_ev(peak_energy(temp_k)),
            exitance_w_m2: total,
            photon_exitance_m2_s: photon_exitance(temp_k),
            band_exitance_w_m2: band,
            band_fraction: band.map(|p| if total > 0.0 { p / total } else { 0.0 }),
        }
    }
}

/// One row of the spectrum table: the wavelength [um] and the hemispherical spectral
/// exitance by Planck's law, Wien's and Rayleigh-Jeans' approximations [W/m2/um].
pub fn spectrum_row(lambda_um: f64, temp_k: f64) -> [f64; 4] {
    let l = lambda_um * UM;
    [
        lambda_um,
        exitance_per_wavelength(l, temp_k) * UM,
        wien_exitance_per_wavelength(l, temp_k) * UM,
        rayleigh_jeans_exitance_per_wavelength(l, temp_k) * UM,
    ]
}
