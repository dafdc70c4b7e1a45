//! The scenario: everything a user chose, and nothing computed. It is the single source of
//! truth that the command line builds from its options, the browser app keeps in its
//! address bar and local storage, and scenario files hold. Everything is in the units a
//! practitioner types (eV, K, suns); conversion to SI happens in [`CellScenario::to_physics`],
//! which also checks every value and says what to do about a bad one.
//!
//! Architecture invariant: every accepted range lives here, in the parts' `check` and
//! `to_physics` functions and the per-field checks ([`check_gap_ev`], [`check_gap_range`],
//! [`stack::check_gaps`]); [`Scenario::check`] checks every part at once. Front ends call
//! these and never keep their own copy of a range.

use crate::physics::constants::{ev, MAX_CONCENTRATION};
use crate::physics::junction::{Cell, Illumination};
use crate::physics::sources::Source;
use crate::physics::spectrum::Spectrum;
use crate::physics::varshni::{gap_material, GapMaterial, GAP_MATERIALS};
use serde::{Deserialize, Serialize};

mod choices;
pub mod energy;
pub mod film;
pub mod hot;
pub mod place;
pub mod radiator;
pub mod real;
pub mod stack;

pub use choices::{Axis, Connection, Emission, FixAt, JvModel, Quantity};

/// Where the light comes from.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum SourceSpec {
    /// ASTM G173-03 global tilt (AM1.5G). Default.
    #[default]
    #[serde(rename = "am1.5g")]
    Am15g,
    /// ASTM G173-03 direct + circumsolar (AM1.5D).
    #[serde(rename = "am1.5d")]
    Am15d,
    /// ASTM G173-03 extraterrestrial column (AM0, cut at 4000 nm).
    #[serde(rename = "am0")]
    Am0,
    /// A blackbody sun of the given temperature seen from 1 au.
    Blackbody { temp_k: f64 },
    /// A spectrum file on disk (command line only); read by the front end.
    File { path: String },
    /// A user spectrum carried inside the scenario, in SI, on its native axis.
    Table(TableSpec),
    /// The clear-sky plane-of-array global spectrum at a place and moment.
    ClearSky(place::ClearSkySpec),
}

/// A user spectrum stored inside a scenario (SI units, native axis and quantity).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TableSpec {
    pub name: String,
    pub axis: Axis,
    pub quantity: Quantity,
    pub x: Vec<f64>,
    pub y: Vec<f64>,
}

impl SourceSpec {
    /// Parse the short text form used on the command line:
    /// `am1.5g | am1.5d | am0 | blackbody:K | file:PATH | clearsky:lat=..,lon=..,time=..`.
    pub fn parse(text: &str) -> Result<SourceSpec, String> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        match lower.as_str() {
            "am1.5g" | "am15g" => return Ok(SourceSpec::Am15g),
            "am1.5d" | "am15d" => return Ok(SourceSpec::Am15d),
            "am0" => return Ok(SourceSpec::Am0),
            _ => {}
        }
        if let Some(rest) = lower.strip_prefix("blackbody:") {
            let k: f64 = rest.trim().trim_end_matches('k').trim().parse().map_err(|_| {
                format!("'{text}': the blackbody temperature '{rest}' is not a number; write e.g. blackbody:5772")
            })?;
            return Ok(SourceSpec::Blackbody { temp_k: k });
        }
        if let (Some(prefix), Some(rest)) = (t.get(..9), t.get(9..)) {
            if prefix.eq_ignore_ascii_case("clearsky:") {
                return place::ClearSkySpec::parse(rest).map(SourceSpec::ClearSky);
            }
        }
        if let (Some(prefix), Some(path)) = (t.get(..5), t.get(5..)) {
            if prefix.eq_ignore_ascii_case("file:") && !path.is_empty() {
                return Ok(SourceSpec::File { path: path.to_string() });
            }
        }
        Err(format!(
            "unknown spectrum '{text}'; use am1.5g, am1.5d, am0, blackbody:K (e.g. blackbody:5772), file:PATH or clearsky:lat=DEG,lon=DEG,time=ISO8601"
        ))
    }

    /// The short text form (inverse of [`SourceSpec::parse`] for the named sources).
    pub fn label(&self) -> String {
        match self {
            SourceSpec::Am15g => "am1.5g".into(),
            SourceSpec::Am15d => "am1.5d".into(),
            SourceSpec::Am0 => "am0".into(),
            SourceSpec::Blackbody { temp_k } => format!("blackbody:{temp_k}"),
            SourceSpec::File { path } => format!("file:{path}"),
            SourceSpec::Table(t) => format!("table:{}", t.name),
            SourceSpec::ClearSky(c) => format!("clearsky:{}", c.label()),
        }
    }

    /// Build the physics source. `File` must have been replaced by `Table` by the front end.
    pub fn to_source(&self) -> Result<Source, String> {
        match self {
            SourceSpec::Am15g => Ok(Source::am15g()),
            SourceSpec::Am15d => Ok(Source::am15d()),
            SourceSpec::Am0 => Ok(Source::am0()),
            SourceSpec::Blackbody { temp_k } => {
                check_range("blackbody sun temperature", *temp_k, 1.0, 1.0e5, "K", "e.g. 5772 for the Sun")?;
                Ok(Source::BlackbodySun { temp_k: *temp_k })
            }
            SourceSpec::File { path } => Err(format!("the spectrum file '{path}' has not been read yet")),
            SourceSpec::Table(t) => {
                let s = Spectrum::new(
                    t.name.clone(),
                    format!("user table '{}'", t.name),
                    t.axis.into(),
                    t.quantity.into(),
                    t.x.clone(),
                    t.y.clone(),
                )
                .map_err(|e| format!("the spectrum '{}' is not usable: {e}", t.name))?;
                Ok(Source::user(s))
            }
            SourceSpec::ClearSky(c) => c.to_source(),
        }
    }
}

/// One single-junction cell under one light source.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct CellScenario {
    /// band gap [eV]
    pub gap_ev: f64,
    pub spectrum: SourceSpec,
    /// concentration [suns], 1 up to the sun-disc limit
    pub concentration: f64,
    /// cell temperature [K]
    pub cell_temp_k: f64,
    /// external radiative efficiency, (0, 1]
    pub ere: f64,
    pub emission: Emission,
    pub approx: JvModel,
    /// a material whose gap follows the cell temperature (`physics::varshni`, e.g. "gaas");
    /// when set, `gap_ev` is that material's gap at `cell_temp_k` ([`CellScenario::sync_gap`])
    pub gap_material: Option<String>,
}

impl Default for CellScenario {
    fn default() -> Self {
        CellScenario {
            gap_ev: 1.34,
            spectrum: SourceSpec::Am15g,
            concentration: 1.0,
            cell_temp_k: 300.0,
            ere: 1.0,
            emission: Emission::Front,
            approx: JvModel::Exact,
            gap_material: None,
        }
    }
}

/// Physics inputs built from a scenario, with any warnings worth showing.
#[derive(Debug, Clone)]
pub struct CellSetup {
    pub light: Illumination,
    pub cell: Cell,
    pub warnings: Vec<String>,
}

/// Accepted band-gap range [eV].
pub const GAP_RANGE_EV: (f64, f64) = (0.01, 20.0);
/// Accepted cell-temperature range [K].
pub const CELL_TEMP_RANGE_K: (f64, f64) = (1.0, 10_000.0);

pub(crate) fn check_range(what: &str, v: f64, lo: f64, hi: f64, unit: &str, hint: &str) -> Result<(), String> {
    if v.is_nan() {
        return Err(format!("the {what} is not a number; give a value from {lo} to {hi} {unit} ({hint})"));
    }
    if !(v >= lo && v <= hi) {
        return Err(format!("the {what} {v} {unit} is out of range; give a value from {lo} to {hi} {unit} ({hint})"));
    }
    Ok(())
}

/// Check a band gap [eV] against [`GAP_RANGE_EV`]. The one gap check: the cell, the stack,
/// the optimizer's fixed gap, the page's fast gap edits and the command line's gap options
/// all use it.
pub fn check_gap_ev(gap_ev: f64) -> Result<(), String> {
    check_gap_setting("band gap", gap_ev, "e.g. 1.34")
}

/// Check the band gap [eV] of the setting `what` (e.g. "fixed gap") against
/// [`GAP_RANGE_EV`]; `hint` is an example for the message.
pub fn check_gap_setting(what: &str, gap_ev: f64, hint: &str) -> Result<(), String> {
    let (lo, hi) = GAP_RANGE_EV;
    if gap_ev.is_nan() {
        return Err(format!("the {what} is not a number; give a band gap from {lo} to {hi} eV ({hint})"));
    }
    if !(lo..=hi).contains(&gap_ev) {
        return Err(format!("the {what} {gap_ev} eV is out of range; give a band gap from {lo} to {hi} eV ({hint})"));
    }
    Ok(())
}

/// Check a range of band gaps `from_ev`-`to_ev` [eV] (the efficiency curve, the optimizer's
/// search, a map axis): both finite, inside [`GAP_RANGE_EV`], the lower first. `what` names
/// the setting, e.g. "search range".
pub fn check_gap_range(what: &str, from_ev: f64, to_ev: f64) -> Result<(), String> {
    let (lo, hi) = GAP_RANGE_EV;
    if !(from_ev.is_finite() && to_ev.is_finite() && from_ev >= lo && to_ev <= hi && from_ev < to_ev) {
        return Err(format!(
            "the {what} {from_ev}-{to_ev} eV is not usable; give two band gaps from {lo} to {hi} eV, the lower first"
        ));
    }
    Ok(())
}

/// The built-in material of a gap-material key, or a message listing the known ones.
pub fn check_gap_material(key: &str) -> Result<&'static GapMaterial, String> {
    gap_material(key).ok_or_else(|| {
        let known: Vec<&str> = GAP_MATERIALS.iter().map(|m| m.key).collect();
        format!("the material '{key}' has no built-in band gap; use one of {} or type a gap in eV", known.join(", "))
    })
}

impl CellScenario {
    /// The band gap [eV] in force: the material's at the cell temperature when one is
    /// chosen (an unknown material keeps `gap_ev`; `to_physics` refuses it), else `gap_ev`.
    pub fn gap_now(&self) -> f64 {
        match self.gap_material.as_deref().and_then(gap_material) {
            Some(m) => m.gap_ev(self.cell_temp_k),
            None => self.gap_ev,
        }
    }

    /// Set `gap_ev` to [`CellScenario::gap_now`]: every front end calls this after an edit
    /// (or an opened link) so that a material's gap follows the cell temperature.
    pub fn sync_gap(&mut self) {
        self.gap_ev = self.gap_now();
    }

    /// Check the band gap [eV] alone, for edits that change nothing else.
    pub fn check_gap(gap_ev: f64) -> Result<(), String> {
        check_gap_ev(gap_ev)
    }

    /// Check every value and convert to SI physics inputs.
    pub fn to_physics(&self) -> Result<CellSetup, String> {
        if let Some(m) = &self.gap_material {
            check_gap_material(m)?;
        }
        let gap_ev = self.gap_now();
        check_gap_ev(gap_ev)?;
        check_range("cell temperature", self.cell_temp_k, CELL_TEMP_RANGE_K.0, CELL_TEMP_RANGE_K.1, "K", "e.g. 300")?;
        if self.ere.is_nan() || !(self.ere > 0.0 && self.ere <= 1.0) {
            return Err(format!(
                "the external radiative efficiency {} is out of range; give a fraction above 0 and at most 1 (1 is the radiative limit, e.g. 0.01)",
                self.ere
            ));
        }
        let source = self.spectrum.to_source()?;
        let mut warnings = Vec::new();
        check_concentration(self.concentration, &source, &mut warnings)?;
        Ok(CellSetup {
            light: Illumination { source, concentration: self.concentration },
            cell: Cell {
                gap_j: ev(gap_ev),
                temp_k: self.cell_temp_k,
                ere: self.ere,
                emission: self.emission.into(),
                model: self.approx.into(),
            },
            warnings,
        })
    }
}

/// Concentration rules: at least 1; at most the etendue limit of the sun's disc (about
/// 46,200) for sunlight; beyond it only a warning for a user spectrum, which need not be
/// sunlight.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn check_concentration(x: f64, source: &Source, warnings: &mut Vec<String>) -> Result<(), String> {
    if x.is_nan() || !(x >= 1.0) || x == f64::INFINITY {
        return Err(format!(
            "the concentration {x} is out of range; give a number of suns of at least 1 (1 is unconcentrated light)"
        ));
    }
    // allow the limit as printed to 6 significant figures
    if x > MAX_CONCENTRATION * (1.0 + 1e-6) {
        let msg = format!(
            "the concentration {x} exceeds the limit for the sun's disc, {:.0} suns (etendue conservation)",
            MAX_CONCENTRATION
        );
        if source.is_solar_disc() {
            return Err(format!("{msg}; give at most {:.0}", MAX_CONCENTRATION));
        }
        warnings.push(format!("{msg}; accepted because a user spectrum need not be sunlight"));
    }
    Ok(())
}

/// How the spectrum plot is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum PlotAxis {
    #[default]
    Wavelength,
    PhotonEnergy,
}

/// What the spectrum plot shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum PlotQuantity {
    #[default]
    Irradiance,
    PhotonFlux,
}

/// Which panel of the browser app is in front.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum Panel {
    /// the single-junction solar cell
    #[default]
    Cell,
    /// the radiator facing the sky
    Radiator,
    /// the multi-junction stack
    Stack,
    /// hot emitters: the blackbody, TPV pairs, solar-thermal absorbers
    Hot,
}

/// View choices that are part of what a link reproduces.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct ViewSettings {
    /// the app's panel in front
    pub panel: Panel,
    pub spectrum_axis: PlotAxis,
    pub spectrum_quantity: PlotQuantity,
    /// band-gap range of the efficiency curve [eV]
    pub curve_from_ev: f64,
    pub curve_to_ev: f64,
}

impl Default for ViewSettings {
    fn default() -> Self {
        ViewSettings {
            panel: Panel::Cell,
            spectrum_axis: PlotAxis::Wavelength,
            spectrum_quantity: PlotQuantity::Irradiance,
            curve_from_ev: 0.5,
            curve_to_ev: 3.0,
        }
    }
}

impl ViewSettings {
    /// Check the efficiency curve's band-gap range.
    pub fn check(&self) -> Result<(), String> {
        check_gap_range("efficiency-curve range", self.curve_from_ev, self.curve_to_ev)
    }
}

/// Everything a share link, a scenario file or the saved state holds.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct Scenario {
    pub cell: CellScenario,
    pub view: ViewSettings,
    pub radiator: radiator::RadiatorScenario,
    pub stack: stack::StackScenario,
    pub hot: hot::HotScenario,
}

impl Scenario {
    /// Check every part (view, cell, radiator, stack with its optimizer, map, absorber and
    /// mismatch inputs), as computing each panel would, so that a link or file one panel
    /// could not compute is refused as a whole. The message names the setting and says what
    /// is accepted.
    pub fn check(&self) -> Result<(), String> {
        self.check_with_warnings().map(drop)
    }

    /// [`Scenario::check`], returning the warnings worth showing when every part is usable
    /// (e.g. a concentration beyond the sun-disc limit for a user spectrum, a sky outside the
    /// clear-sky model's calibration, an Urbach tail wider than kT).
    pub fn check_with_warnings(&self) -> Result<Vec<String>, String> {
        self.view.check()?;
        let mut warnings = self.cell.to_physics()?.warnings;
        warnings.extend(self.radiator.to_physics()?.warnings);
        warnings.extend(self.stack.check(&self.cell)?);
        warnings.extend(self.hot.check()?);
        Ok(warnings)
    }
}
