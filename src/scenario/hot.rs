//! `HotScenario` (the `hot` field of `Scenario`): the hot-emitter panel's choices: the
//! blackbody card, the thermophotovoltaic (TPV) pair and the solar-thermal absorber, with
//! serde defaults so that links made before the panel existed still open, and the checks
//! that turn each into SI physics inputs.
//!
//! Architecture invariant: holds what the user chose and nothing computed; every accepted
//! range of these settings lives here.
#![allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose here: it also refuses NaN

use super::radiator::EmitterSpec;
use super::stack::check_gaps;
use super::{
    check_concentration, check_gap_ev, check_gap_range, check_range, Connection, SourceSpec, CELL_TEMP_RANGE_K,
};
use crate::physics::constants::ev;
use crate::physics::radiator::emissivity::Profile;
use crate::physics::solar_thermal::{AbsorberSetup, Surface};
use crate::physics::stack::Connection as PhysicsConnection;
use crate::physics::tpv::TpvSetup;
use serde::{Deserialize, Serialize};

/// Blackbody temperatures taken [K] (the card, the TPV emitter's spectrum).
pub const BLACKBODY_TEMP_RANGE_K: (f64, f64) = (1.0, 1e6);
/// Emitter temperatures taken [K] (above the cell's, checked too).
pub const EMITTER_TEMP_RANGE_K: (f64, f64) = (1.0, 10_000.0);
/// Absorber and ambient temperatures taken [K].
pub const ABSORBER_TEMP_RANGE_K: (f64, f64) = (1.0, 100_000.0);
/// Convection coefficients taken [W m^-2 K^-1].
pub const HC_RANGE: (f64, f64) = (0.0, 10_000.0);
/// Cutoff wavelengths taken [um].
pub const CUTOFF_RANGE_UM: (f64, f64) = (0.1, 1000.0);

/// The whole panel.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct HotScenario {
    pub blackbody: BlackbodyScenario,
    pub tpv: TpvScenario,
    pub absorber: AbsorberScenario,
}

/// The blackbody card.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct BlackbodyScenario {
    /// [K]
    pub temp_k: f64,
    /// a band of wavelengths [um], shorter first
    pub band_um: Option<[f64; 2]>,
    /// draw Wien's approximation beside Planck's law
    pub wien: bool,
    /// draw the Rayleigh-Jeans approximation beside Planck's law
    pub rayleigh_jeans: bool,
    /// logarithmic axes (else linear)
    pub log_axes: bool,
}

impl Default for BlackbodyScenario {
    fn default() -> Self {
        BlackbodyScenario {
            temp_k: 1500.0,
            band_um: Some([1.0, 3.0]),
            wien: true,
            rayleigh_jeans: true,
            log_axes: true,
        }
    }
}

impl BlackbodyScenario {
    pub fn check(&self) -> Result<(), String> {
        check_range(
            "blackbody temperature",
            self.temp_k,
            BLACKBODY_TEMP_RANGE_K.0,
            BLACKBODY_TEMP_RANGE_K.1,
            "K",
            "e.g. 1500",
        )?;
        if let Some(b) = self.band_um {
            check_band_um(b)?;
        }
        Ok(())
    }
}

/// A band of wavelengths [um]: both positive and finite, the shorter first.
pub fn check_band_um([a, b]: [f64; 2]) -> Result<(), String> {
    if !(a.is_finite() && b.is_finite() && a > 0.0 && b > a) {
        return Err(format!(
            "the band {a}-{b} um is not usable; give two wavelengths in um, the shorter first, e.g. 1-3"
        ));
    }
    Ok(())
}

/// The cell's reflectance below its gap.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum ReflectanceSpec {
    /// the same at every wavelength below the gap (fraction)
    Constant { value: f64 },
    /// a reflectance file on disk (command line); the front end replaces it by a table
    File { path: String },
    /// a measured reflectance inside the scenario (SI wavelengths, ascending; fractions)
    Table { name: String, wavelength_m: Vec<f64>, reflectance: Vec<f64> },
}

impl Default for ReflectanceSpec {
    fn default() -> Self {
        ReflectanceSpec::Constant { value: 1.0 }
    }
}

impl ReflectanceSpec {
    /// The command-line form: a number (fraction) or `file:PATH`.
    pub fn parse(text: &str) -> Result<ReflectanceSpec, String> {
        let t = text.trim();
        if let (Some(prefix), Some(path)) = (t.get(..5), t.get(5..)) {
            if prefix.eq_ignore_ascii_case("file:") && !path.is_empty() {
                return Ok(ReflectanceSpec::File { path: path.to_string() });
            }
        }
        t.parse::<f64>()
            .map(|value| ReflectanceSpec::Constant { value })
            .map_err(|_| format!("'{text}' is neither a reflectance (a fraction from 0 to 1, e.g. 0.95) nor file:PATH"))
    }

    /// A short description.
    pub fn label(&self) -> String {
        match self {
            ReflectanceSpec::Constant { value } => format!("{value}"),
            ReflectanceSpec::File { path } => format!("file {path}"),
            ReflectanceSpec::Table { name, wavelength_m, .. } => {
                format!("measured '{name}' ({} points)", wavelength_m.len())
            }
        }
    }

    /// The cell's sub-gap absorptance 1 - R as a profile.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn to_absorptance(&self) -> Result<Profile, String> {
        match self {
            ReflectanceSpec::Constant { value } => {
                if value.is_nan() || !(0.0..=1.0).contains(value) {
                    return Err(format!(
                        "the sub-gap reflectance {value} is not a fraction; give a value from 0 to 1, e.g. 0.95"
                    ));
                }
                Ok(Profile::Grey { emissivity: 1.0 - value })
            }
            ReflectanceSpec::File { path } => Err(format!("the reflectance file '{path}' has not been read yet")),
            ReflectanceSpec::Table { name, wavelength_m, reflectance } => {
                if wavelength_m.len() != reflectance.len() || wavelength_m.len() < 2 {
                    return Err(format!("the reflectance table '{name}' needs at least two points"));
                }
                for (i, (l, r)) in wavelength_m.iter().zip(reflectance).enumerate() {
                    if !(l.is_finite() && *l > 0.0) || (i > 0 && !(*l > wavelength_m[i - 1])) {
                        return Err(format!(
                            "the reflectance table '{name}': point {} has a wavelength that is not positive and \
                             ascending; sort the table and remove duplicates",
                            i + 1
                        ));
                    }
                    if !(r.is_finite() && (0.0..=1.0).contains(r)) {
                        return Err(format!(
                            "the reflectance table '{name}': point {} is not a fraction from 0 to 1",
                            i + 1
                        ));
                    }
                }
                Ok(Profile::Table {
                    wavelength_m: wavelength_m.clone(),
                    emissivity: reflectance.iter().map(|r| 1.0 - r).collect(),
                })
            }
        }
    }
}

/// The thermophotovoltaic pair.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct TpvScenario {
    /// the emitter's spectral emissivity (the radiator's profiles)
    pub emitter: EmitterSpec,
    /// [K]
    pub emitter_temp_k: f64,
    /// between emitter and cell, above 0 and at most 1
    pub view_factor: f64,
    pub subgap_reflectance: ReflectanceSpec,
    /// [K]
    pub cell_temp_k: f64,
    /// external radiative efficiency, above 0 and at most 1
    pub ere: f64,
    /// one gap, or a stack's gaps top first [eV]
    pub gaps_ev: Vec<f64>,
    pub connection: Connection,
    /// the efficiency-power trade-off's range of gaps [eV]
    pub sweep_from_ev: f64,
    pub sweep_to_ev: f64,
}

impl Default for TpvScenario {
    fn default() -> Self {
        TpvScenario {
            emitter: EmitterSpec::Blackbody,
            emitter_temp_k: 2000.0,
            view_factor: 1.0,
            subgap_reflectance: ReflectanceSpec::default(),
            cell_temp_k: 300.0,
            ere: 1.0,
            gaps_ev: vec![0.75],
            connection: Connection::Series,
            sweep_from_ev: 0.3,
            sweep_to_ev: 2.0,
        }
    }
}

/// A TPV pair in SI: the setup, the gaps [J] top first and the connection.
#[derive(Debug, Clone)]
pub struct TpvInputs {
    pub setup: TpvSetup,
    pub gaps_j: Vec<f64>,
    pub connection: PhysicsConnection,
}

impl TpvScenario {
    /// Check every value and convert to SI.
    pub fn to_physics(&self) -> Result<TpvInputs, String> {
        check_range("cell temperature", self.cell_temp_k, CELL_TEMP_RANGE_K.0, CELL_TEMP_RANGE_K.1, "K", "e.g. 300")?;
        check_range(
            "emitter temperature",
            self.emitter_temp_k,
            EMITTER_TEMP_RANGE_K.0,
            EMITTER_TEMP_RANGE_K.1,
            "K",
            "e.g. 2000",
        )?;
        if !(self.emitter_temp_k > self.cell_temp_k) {
            return Err(format!(
                "the emitter ({} K) is not hotter than the cell ({} K); a TPV converter needs the emitter above the cell's temperature",
                self.emitter_temp_k, self.cell_temp_k
            ));
        }
        if self.view_factor.is_nan() || !(self.view_factor > 0.0 && self.view_factor <= 1.0) {
            return Err(format!(
                "the view factor {} is out of range; give a fraction above 0 and at most 1 (1: parallel plates facing each other)",
                self.view_factor
            ));
        }
        if self.ere.is_nan() || !(self.ere > 0.0 && self.ere <= 1.0) {
            return Err(format!(
                "the external radiative efficiency {} is out of range; give a fraction above 0 and at most 1 (1 is the radiative limit, e.g. 0.01)",
                self.ere
            ));
        }
        let gaps_j = match self.gaps_ev.as_slice() {
            [] => return Err("the TPV cell has no band gap; give one, e.g. 0.75".into()),
            [g] => {
                check_gap_ev(*g)?;
                vec![ev(*g)]
            }
            many => check_gaps(many)?,
        };
        check_gap_range("trade-off range", self.sweep_from_ev, self.sweep_to_ev)?;
        let emitter = self.emitter.to_profile()?;
        let subgap_absorptance = self.subgap_reflectance.to_absorptance()?;
        Ok(TpvInputs {
            setup: TpvSetup {
                emitter,
                emitter_temp_k: self.emitter_temp_k,
                view_factor: self.view_factor,
                subgap_absorptance,
                cell_temp_k: self.cell_temp_k,
                ere: self.ere,
            },
            gaps_j,
            connection: self.connection.to_physics(),
        })
    }
}

/// The absorber's surface as a scenario holds it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum SurfaceSpec {
    /// absorptance 1 everywhere
    Black,
    /// 1 below the cutoff wavelength, 0 above
    Step { cutoff_um: f64 },
    /// any emissivity profile (the radiator's forms)
    Profile { profile: EmitterSpec },
}

impl SurfaceSpec {
    /// A short description.
    pub fn label(&self) -> String {
        match self {
            SurfaceSpec::Black => "black".into(),
            SurfaceSpec::Step { cutoff_um } => format!("step, cutoff {cutoff_um} um"),
            SurfaceSpec::Profile { profile } => profile.label(),
        }
    }
}

/// The solar-thermal absorber.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct AbsorberScenario {
    pub surface: SurfaceSpec,
    /// the absorber's temperature [K]
    pub temp_k: f64,
    /// suns
    pub concentration: f64,
    pub source: SourceSpec,
    /// [K]
    pub ambient_k: f64,
    /// convective loss coefficient [W m^-2 K^-1]
    pub hc_w_m2k: f64,
}

impl Default for AbsorberScenario {
    fn default() -> Self {
        AbsorberScenario {
            surface: SurfaceSpec::Step { cutoff_um: 2.0 },
            temp_k: 700.0,
            concentration: 100.0,
            source: SourceSpec::Am15d,
            ambient_k: 300.0,
            hc_w_m2k: 0.0,
        }
    }
}

impl AbsorberScenario {
    /// The command line's defaults: a black absorber under AM1.5D at one sun, 300 K
    /// ambient, no convection.
    pub fn command_line() -> AbsorberScenario {
        AbsorberScenario { surface: SurfaceSpec::Black, concentration: 1.0, ..AbsorberScenario::default() }
    }

    /// Check the light and surroundings and convert to SI (the absorber's own temperature
    /// and surface are checked by [`AbsorberScenario::to_physics`]).
    pub fn setup(&self) -> Result<(AbsorberSetup, Vec<String>), String> {
        let (lo, hi) = ABSORBER_TEMP_RANGE_K;
        check_range("ambient temperature", self.ambient_k, lo, hi, "K", "e.g. 300")?;
        check_range("convection coefficient", self.hc_w_m2k, HC_RANGE.0, HC_RANGE.1, "W/m2K", "e.g. 10")?;
        let source = self.source.to_source()?;
        let mut warnings = Vec::new();
        check_concentration(self.concentration, &source, &mut warnings)?;
        Ok((
            AbsorberSetup {
                source,
                concentration: self.concentration,
                ambient_k: self.ambient_k,
                hc_w_m2k: self.hc_w_m2k,
            },
            warnings,
        ))
    }

    /// Check every value and convert to SI: the setup, the surface and the temperature [K].
    pub fn to_physics(&self) -> Result<(AbsorberSetup, Surface, f64, Vec<String>), String> {
        let (setup, warnings) = self.setup()?;
        let (lo, hi) = ABSORBER_TEMP_RANGE_K;
        check_range("absorber temperature", self.temp_k, lo, hi, "K", "e.g. 700")?;
        let surface = match &self.surface {
            SurfaceSpec::Black => Surface::Black,
            SurfaceSpec::Step { cutoff_um } => {
                check_range("cutoff wavelength", *cutoff_um, CUTOFF_RANGE_UM.0, CUTOFF_RANGE_UM.1, "um", "e.g. 2")?;
                Surface::Step { cutoff_m: cutoff_um * 1e-6 }
            }
            SurfaceSpec::Profile { profile } => Surface::Profile(profile.to_profile()?),
        };
        Ok((setup, surface, self.temp_k, warnings))
    }
}

impl HotScenario {
    /// Check every part; returns the warnings worth showing.
    pub fn check(&self) -> Result<Vec<String>, String> {
        self.blackbody.check()?;
        self.tpv.to_physics()?;
        Ok(self.absorber.to_physics()?.3)
    }
}
