//! Light sources: the ASTM G173-03 reference spectra, a blackbody sun, and user tables.
//!
//! The built-in table is ASTM G173-03 "Standard Tables for Reference Solar Spectral
//! Irradiances: Direct Normal and Hemispherical on 37 deg Tilted Surface" (ASTM
//! International, 2003; reapproved 2012), 280-4000 nm, 2002 rows, W m^-2 nm^-1. Its three
//! columns are offered as:
//! * `AM1.5G`: "Global tilt" (hemispherical on a 37 deg tilted surface, air mass 1.5),
//! * `AM1.5D`: "Direct + circumsolar",
//! * `AM0`: the table's extraterrestrial column. It stops at 4000 nm, so it carries about
//!   1348 W m^-2 rather than the full solar constant (about 1361 W m^-2).

use super::constants::{BOLTZMANN, PHOTON_FLUX_PREFACTOR, SUN_DILUTION};
use super::planck::{band_photon_flux_energy, band_power_energy, stefan_boltzmann};
use super::spectrum::{Axis, Quantity, Spectrum};
use std::sync::{Arc, OnceLock};

const G173_PROVENANCE: &str = "ASTM G173-03 reference spectra (SMARTS v2.9.2), 280-4000 nm";

/// Which column of the G173 table.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum G173Column {
    /// the extraterrestrial column: AM0, about 1348 W m^-2 over 280-4000 nm
    Extraterrestrial,
    /// the global tilt column: AM1.5G, about 1000 W m^-2
    Global,
    /// the direct + circumsolar column: AM1.5D, about 900 W m^-2
    Direct,
}

/// The column of the shipped table (nm, W m^-2 nm^-1) as a spectrum in SI ([m], [W m^-2 m^-1]).
fn parse_g173(column: G173Column) -> Spectrum {
    let col = match column {
        G173Column::Extraterrestrial => 1,
        G173Column::Global => 2,
        G173Column::Direct => 3,
    };
    let cols = super::data::unpack(super::data::G173_PACKED).expect("the shipped G173 table unpacks");
    let x: Vec<f64> = cols[0].iter().map(|l| l * 1e-9).collect(); // nm -> m
    let y: Vec<f64> = cols[col].iter().map(|v| v * 1e9).collect(); // W m^-2 nm^-1 -> W m^-2 m^-1
    let name = match column {
        G173Column::Extraterrestrial => "AM0",
        G173Column::Global => "AM1.5G",
        G173Column::Direct => "AM1.5D",
    };
    let prov = match column {
        G173Column::Extraterrestrial => format!("{G173_PROVENANCE}, extraterrestrial column"),
        G173Column::Global => format!("{G173_PROVENANCE}, global tilt 37 deg column"),
        G173Column::Direct => format!("{G173_PROVENANCE}, direct + circumsolar column"),
    };
    Spectrum::new(name, prov, Axis::Wavelength, Quantity::Irradiance, x, y).expect("the shipped G173 table is valid")
}

/// The G173 column as a shared, parsed-once spectrum: spectral irradiance per wavelength
/// [W m^-2 m^-1] on a wavelength axis [m] (the table's nm converted to SI).
pub fn g173(column: G173Column) -> Arc<Spectrum> {
    static CELLS: [OnceLock<Arc<Spectrum>>; 3] = [OnceLock::new(), OnceLock::new(), OnceLock::new()];
    let idx = match column {
        G173Column::Extraterrestrial => 0,
        G173Column::Global => 1,
        G173Column::Direct => 2,
    };
    CELLS[idx].get_or_init(|| Arc::new(parse_g173(column))).clone()
}

/// Incident light, as seen by a flat receiver at normal incidence, before concentration.
#[derive(Debug, Clone)]
pub enum Source {
    /// A tabulated spectrum. `solar_disc` tells whether it stands for sunlight from the
    /// sun's disc (the built-in tables), which caps the concentration.
    Table { spectrum: Arc<Spectrum>, solar_disc: bool },
    /// A blackbody disc of temperature `temp_k` [K] seen from 1 au: irradiance
    /// f sigma T^4 [W m^-2] with f = (R_sun / au)^2 (the blackbody sun of Shockley &
    /// Queisser 1961).
    BlackbodySun { temp_k: f64 },
}

impl Source {
    /// ASTM G173-03 global tilt (AM1.5G).
    pub fn am15g() -> Source {
        Source::Table { spectrum: g173(G173Column::Global), solar_disc: true }
    }
    /// ASTM G173-03 direct + circumsolar (AM1.5D).
    pub fn am15d() -> Source {
        Source::Table { spectrum: g173(G173Column::Direct), solar_disc: true }
    }
    /// ASTM G173-03 extraterrestrial (AM0, 280-4000 nm only).
    pub fn am0() -> Source {
        Source::Table { spectrum: g173(G173Column::Extraterrestrial), solar_disc: true }
    }
    /// A user table (SI, see [`Spectrum::new`]); no concentration cap.
    pub fn user(spectrum: Spectrum) -> Source {
        Source::Table { spectrum: Arc::new(spectrum), solar_disc: false }
    }

    /// Short display name.
    pub fn name(&self) -> String {
        match self {
            Source::Table { spectrum, .. } => spectrum.name.clone(),
            Source::BlackbodySun { temp_k } => format!("{temp_k} K blackbody sun"),
        }
    }

    /// Whether the concentration limit of the sun's disc applies.
    pub fn is_solar_disc(&self) -> bool {
        match self {
            Source::Table { solar_disc, .. } => *solar_disc,
            Source::BlackbodySun { .. } => true,
        }
    }

    /// Incident irradiance at one sun [W m^-2]: the table's trapezoid integral, or f sigma T^4.
    pub fn total_power(&self) -> f64 {
        match self {
            Source::Table { spectrum, .. } => spectrum.total_power(),
            Source::BlackbodySun { temp_k } => SUN_DILUTION * stefan_boltzmann(*temp_k),
        }
    }

    /// Photon flux with photon energy above `e_j` [J] at one sun [photons s^-1 m^-2].
    pub fn photon_flux_above(&self, e_j: f64) -> f64 {
        match self {
            Source::Table { spectrum, .. } => spectrum.photon_flux_above(e_j),
            Source::BlackbodySun { temp_k } => SUN_DILUTION * band_photon_flux_energy(e_j, f64::INFINITY, *temp_k),
        }
    }

    /// Photon flux between photon energies `e1_j` and `e2_j` [J] [photons s^-1 m^-2].
    pub fn photon_flux_between(&self, e1_j: f64, e2_j: f64) -> f64 {
        match self {
            Source::Table { spectrum, .. } => spectrum.photon_flux_between(e1_j, e2_j),
            Source::BlackbodySun { temp_k } => SUN_DILUTION * band_photon_flux_energy(e1_j, e2_j, *temp_k),
        }
    }

    /// Irradiance carried by photons above `e_j` [J] [W m^-2].
    pub fn power_above(&self, e_j: f64) -> f64 {
        match self {
            Source::Table { spectrum, .. } => spectrum.power_above(e_j),
            Source::BlackbodySun { temp_k } => SUN_DILUTION * band_power_energy(e_j, f64::INFINITY, *temp_k),
        }
    }

    /// Spectral irradiance per unit photon energy at `e_j` [W m^-2 J^-1], for plots.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn irradiance_per_energy(&self, e_j: f64) -> f64 {
        match self {
            Source::Table { spectrum, .. } => {
                let axis = spectrum.axis();
                let u = axis.coordinate_of_energy(e_j);
                let v = spectrum.value_at(u);
                let per_u = match spectrum.quantity() {
                    Quantity::Irradiance => v,
                    Quantity::PhotonFlux => v * e_j,
                };
                per_u * super::spectrum::jacobian_per_energy(axis, u)
            }
            Source::BlackbodySun { temp_k } => {
                // f pi B_E = f 2 pi E^3 / (h^3 c^2) / (e^(E/kT) - 1) [W m^-2 J^-1] (Planck 1901)
                let kt = BOLTZMANN * temp_k;
                let x = e_j / kt;
                if !(x > 0.0) || x > 700.0 {
                    return 0.0;
                }
                SUN_DILUTION * PHOTON_FLUX_PREFACTOR * e_j * e_j * e_j / x.exp_m1()
            }
        }
    }

    /// Photon-energy range where the source has light [J]; the blackbody has no bounds.
    pub fn energy_range(&self) -> (f64, f64) {
        match self {
            Source::Table { spectrum, .. } => spectrum.energy_range(),
            Source::BlackbodySun { .. } => (0.0, f64::INFINITY),
        }
    }
}
