//! The radiator part of a scenario: an emitter facing a sky, with or without sun, in the
//! units people type (um, K, deg, cm of precipitable water, W/m²K). [`RadiatorScenario::to_physics`]
//! checks every value, says how to fix a bad one, and builds the SI physics inputs of
//! [`crate::physics::radiator`].

use super::film::{film_inputs, LayerSpec, MaterialSpec};
use super::{check_range, SourceSpec};
use crate::physics::radiator::design::{Design, Target};
use crate::physics::radiator::layered::{film_table, FILM_SPAN_M};
use crate::physics::radiator::{
    AngularModel, Emitter, Profile, Sky, SolarBand, Sun, Surroundings, Transmittance, STEADY_SEARCH_K,
};
use serde::{Deserialize, Serialize};

/// A water column [cm] as people read it: to 0.01 cm (a dew point gives 16 digits), with no
/// trailing zeros, e.g. "2.33", "1.5".
pub fn water_cm(pwv_cm: f64) -> String {
    let text = format!("{:.2}", pwv_cm + 0.0);
    let text = text.trim_end_matches('0').trim_end_matches('.');
    if text == "-0" {
        "0".into()
    } else {
        text.into()
    }
}

/// Accepted wavelengths for profile edges and control points [um].
pub const WAVELENGTH_RANGE_UM: (f64, f64) = (0.1, 1000.0);
/// Accepted ambient air temperatures [K].
pub const AMBIENT_RANGE_K: (f64, f64) = (100.0, 400.0);
/// Ambient temperatures the clear-sky model accepts [K] (its calibration spans about
/// 263-310 K; beyond that it warns).
pub const CLEAR_SKY_AMBIENT_K: (f64, f64) = (200.0, 330.0);
/// Ambient temperatures inside the clear-sky calibration [K].
pub const CLEAR_SKY_CALIBRATED_K: (f64, f64) = (263.0, 310.0);
/// Accepted precipitable water [cm].
pub const PWV_RANGE_CM: (f64, f64) = (0.0, 10.0);
/// Precipitable water inside the clear-sky calibration [cm].
pub const PWV_CALIBRATED_CM: (f64, f64) = (0.5, 6.0);
/// Dew-point depressions [K] beyond which the clear-sky model warns: it was calibrated for
/// air 0-12 K above the dew point and drifts by about 0.002 in emissivity per K beyond.
pub const DEW_POINT_DEPRESSION_WARN_K: (f64, f64) = (-5.0, 25.0);

/// The dew point [deg C] that Reitan's relation ties to `pwv_cm` of precipitable water:
/// ln(w / cm) = 0.1102 + 0.0614 Tdp (Reitan, J. Appl. Meteor. 2, 776, 1963; from memory).
pub fn reitan_dew_point_c(pwv_cm: f64) -> f64 {
    (pwv_cm.ln() - 0.1102) / 0.0614
}

/// The precipitable water [cm] that Reitan's relation gives for a dew point `dew_c`
/// [deg C] (the inverse of [`reitan_dew_point_c`]).
pub fn reitan_pwv_cm(dew_c: f64) -> f64 {
    (0.1102 + 0.0614 * dew_c).exp()
}

/// Dew points accepted in place of precipitable water [deg C]: the upper end gives the
/// largest accepted precipitable water, 10 cm; the lower end is far below any surface dew
/// point.
pub const DEW_POINT_RANGE_C: (f64, f64) = (-60.0, 35.7);

/// The precipitable water [cm] for a dew point `dew_c` [deg C] (Reitan's relation), or a
/// message for a dew point out of [`DEW_POINT_RANGE_C`].
pub fn pwv_from_dew_point(dew_c: f64) -> Result<f64, String> {
    if (DEW_POINT_RANGE_C.0..=DEW_POINT_RANGE_C.1).contains(&dew_c) {
        Ok(reitan_pwv_cm(dew_c))
    } else {
        Err(format!(
            "a dew point of {dew_c} °C is outside {} to {} °C; give the dew point in °C (e.g. 12), not in K",
            DEW_POINT_RANGE_C.0, DEW_POINT_RANGE_C.1
        ))
    }
}
/// Accepted combined convection/conduction coefficients [W m^-2 K^-1].
pub const HC_RANGE: (f64, f64) = (0.0, 1000.0);
/// Accepted irradiance scale factors.
pub const SUN_SCALE_RANGE: (f64, f64) = (0.0, 100.0);
/// Most control points of a profile.
pub const MAX_POINTS: usize = 1000;
/// Default solar/thermal split of a solar-band profile [um]: the end of the AM1.5G table.
pub const DEFAULT_SOLAR_BELOW_UM: f64 = 4.0;

/// A spectral emissivity profile as a scenario holds it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum EmitterSpec {
    /// emissivity 1 everywhere
    #[default]
    Blackbody,
    /// one emissivity everywhere
    Grey { emissivity: f64 },
    /// a band of emissivity `inside` from `from_um` to `to_um`, `outside` elsewhere;
    /// `edge_um` = 0 for sharp edges, else the 10-90 % width of logistic edges
    Window {
        from_um: f64,
        to_um: f64,
        #[serde(default = "one")]
        inside: f64,
        #[serde(default)]
        outside: f64,
        #[serde(default)]
        edge_um: f64,
    },
    /// control points [wavelength um, emissivity], joined on a log wavelength axis
    Points { points: Vec<[f64; 2]> },
    /// an emissivity file on disk (command line); the front end replaces it by a table
    File { path: String },
    /// a measured emissivity carried inside the scenario
    Table(EmissivityTable),
    /// a layer stack in air on a substrate, the first layer facing out; its emissivity by
    /// wavelength and direction comes from the transfer-matrix method
    Film {
        #[serde(default)]
        layers: Vec<LayerSpec>,
        #[serde(default = "air")]
        substrate: MaterialSpec,
    },
}

fn air() -> MaterialSpec {
    MaterialSpec::Index { n: 1.0, k: 0.0 }
}

/// The key of a film's table: its layers, substrate and exact directions.
type FilmKey = (Vec<LayerSpec>, MaterialSpec, Vec<f64>);

thread_local! {
    /// The last film table built on this thread: a scenario is checked and then evaluated,
    /// and a page redraws with the same film, so the table is built once for both.
    static LAST_FILM: std::cell::RefCell<Option<(FilmKey, std::sync::Arc<crate::physics::radiator::layered::Directional>)>> =
        const { std::cell::RefCell::new(None) };
}

/// Most layers of a film emitter.
pub const MAX_FILM_LAYERS: usize = 100;

/// Wavelengths [m] a film's materials should cover for the balance: the solar band from
/// 0.3 um and the thermal band of a surface near ambient to 30 um.
pub const FILM_NEEDED_M: (f64, f64) = (0.3e-6, 30e-6);

fn one() -> f64 {
    1.0
}

/// A measured emissivity inside a scenario (SI wavelengths, ascending).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EmissivityTable {
    pub name: String,
    pub wavelength_m: Vec<f64>,
    pub emissivity: Vec<f64>,
}

/// A separate profile for the solar band, below `below_um`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SolarBandSpec {
    #[serde(default = "default_below")]
    pub below_um: f64,
    pub profile: EmitterSpec,
}

fn default_below() -> f64 {
    DEFAULT_SOLAR_BELOW_UM
}

/// The emitter's angular behaviour.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum AngularSpec {
    #[default]
    Lambertian,
    /// the normal emissivity up to `angle_deg` from the normal, `beyond` from there to grazing
    CutOff {
        angle_deg: f64,
        #[serde(default)]
        beyond: f64,
    },
}

/// The sky.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum SkySpec {
    /// transparent 8-13 um, a blackbody at ambient elsewhere
    #[default]
    Box,
    /// a 3 K background and no atmosphere
    Space,
    /// the spectral clear-sky model with `pwv_cm` of precipitable water
    Clear { pwv_cm: f64 },
    /// a zenith transmittance file on disk (command line); replaced by a table
    File { path: String },
    /// a zenith transmittance carried inside the scenario
    Table(TransmittanceTable),
}

/// A zenith transmittance inside a scenario (SI wavelengths, ascending).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TransmittanceTable {
    pub name: String,
    pub wavelength_m: Vec<f64>,
    pub transmittance: Vec<f64>,
}

/// One radiator under one sky.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct RadiatorScenario {
    pub emitter: EmitterSpec,
    /// `None`: the emitter's profile holds in the solar band too
    pub solar_band: Option<SolarBandSpec>,
    pub angular: AngularSpec,
    pub sky: SkySpec,
    /// ambient air temperature [K]
    pub ambient_k: f64,
    /// surface temperature [K]; `None` = ambient
    pub surface_k: Option<f64>,
    /// the sun's spectrum; `None` = night
    pub sun: Option<SourceSpec>,
    /// solar zenith angle [deg]
    pub sun_zenith_deg: f64,
    /// factor on the sun's irradiance
    pub sun_scale: f64,
    /// combined convection/conduction coefficient [W m^-2 K^-1]
    pub h_c_w_m2k: f64,
    /// temperature range of the P_net(T) curve [K]
    pub curve_from_k: f64,
    pub curve_to_k: f64,
}

impl Default for RadiatorScenario {
    fn default() -> Self {
        RadiatorScenario {
            emitter: EmitterSpec::Blackbody,
            solar_band: None,
            angular: AngularSpec::Lambertian,
            sky: SkySpec::Box,
            ambient_k: 300.0,
            surface_k: None,
            sun: None,
            sun_zenith_deg: 0.0,
            sun_scale: 1.0,
            h_c_w_m2k: 0.0,
            curve_from_k: 250.0,
            curve_to_k: 350.0,
        }
    }
}

/// Physics inputs built from a radiator scenario.
#[derive(Debug, Clone)]
pub struct RadiatorSetup {
    pub emitter: Emitter,
    pub surroundings: Surroundings,
    /// surface temperature [K]
    pub surface_k: f64,
    pub warnings: Vec<String>,
}

fn check_fraction(what: &str, v: f64) -> Result<(), String> {
    if v.is_nan() || !(0.0..=1.0).contains(&v) {
        return Err(format!("the {what} {v} is not a fraction; give a value from 0 to 1, e.g. 0.95"));
    }
    Ok(())
}

fn check_wavelength(what: &str, v: f64) -> Result<(), String> {
    check_range(what, v, WAVELENGTH_RANGE_UM.0, WAVELENGTH_RANGE_UM.1, "um", "e.g. 8")
}

/// Checks shared by measured tables: at least two points, finite, ascending, fractions.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn check_table(kind: &str, name: &str, wavelength_m: &[f64], values: &[f64]) -> Result<(), String> {
    if wavelength_m.len() != values.len() || wavelength_m.len() < 2 {
        return Err(format!("the {kind} table '{name}' needs at least two points, each with a wavelength and a value"));
    }
    for (i, (l, v)) in wavelength_m.iter().zip(values).enumerate() {
        if !(l.is_finite() && *l > 0.0) || (i > 0 && !(*l > wavelength_m[i - 1])) {
            return Err(format!(
                "the {kind} table '{name}': point {} has a wavelength that is not positive and ascending; \
                 sort the table and remove duplicates",
                i + 1
            ));
        }
        if !(v.is_finite() && (0.0..=1.0).contains(v)) {
            return Err(format!("the {kind} table '{name}': point {} is not a fraction from 0 to 1", i + 1));
        }
    }
    Ok(())
}

/// The path of a `file:PATH` form (prefix in any case), if that is the form.
fn file_path(t: &str) -> Option<String> {
    let prefix = t.get(..5)?;
    let path = t.get(5..)?;
    (prefix.eq_ignore_ascii_case("file:") && !path.is_empty()).then(|| path.to_string())
}

impl EmitterSpec {
    /// Parse the command-line form: `blackbody | grey:EPS | window:L1-L2[,in=EPS][,out=EPS][,edge=UM]
    /// | points:UM=EPS,UM=EPS,... | file:PATH` (wavelengths in um).
    pub fn parse(text: &str) -> Result<EmitterSpec, String> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        let number = |s: &str, what: &str| -> Result<f64, String> {
            s.trim().parse::<f64>().map_err(|_| format!("'{text}': the {what} '{}' is not a number", s.trim()))
        };
        if lower == "blackbody" || lower == "black" {
            return Ok(EmitterSpec::Blackbody);
        }
        if lower == "film" {
            return Ok(EmitterSpec::Film { layers: Vec::new(), substrate: air() });
        }
        if let Some(rest) = lower.strip_prefix("grey:").or_else(|| lower.strip_prefix("gray:")) {
            return Ok(EmitterSpec::Grey { emissivity: number(rest, "emissivity")? });
        }
        if let Some(rest) = lower.strip_prefix("window:") {
            let mut parts = rest.split(',');
            let band = parts.next().unwrap_or("");
            let Some((a, b)) = band.split_once('-') else {
                return Err(format!("'{text}': give the window as L1-L2 in um, e.g. window:8-13"));
            };
            let (mut inside, mut outside, mut edge) = (1.0, 0.0, 0.0);
            for p in parts {
                let Some((k, v)) = p.split_once('=') else {
                    return Err(format!("'{text}': '{p}' is not KEY=VALUE; use in=EPS, out=EPS or edge=UM"));
                };
                match k.trim() {
                    "in" => inside = number(v, "inside emissivity")?,
                    "out" => outside = number(v, "outside emissivity")?,
                    "edge" => edge = number(v, "edge width")?,
                    other => {
                        return Err(format!(
                            "'{text}': unknown window setting '{other}'; use in=EPS, out=EPS or edge=UM"
                        ))
                    }
                }
            }
            return Ok(EmitterSpec::Window {
                from_um: number(a, "window start")?,
                to_um: number(b, "window end")?,
                inside,
                outside,
                edge_um: edge,
            });
        }
        if let Some(rest) = lower.strip_prefix("points:") {
            let mut points = Vec::new();
            for p in rest.split(',').filter(|p| !p.trim().is_empty()) {
                let Some((l, e)) = p.split_once('=') else {
                    return Err(format!(
                        "'{text}': the control point '{p}' is not UM=EPS, e.g. points:0.3=0.05,8=0.95"
                    ));
                };
                points.push([number(l, "control-point wavelength")?, number(e, "control-point emissivity")?]);
            }
            return Ok(EmitterSpec::Points { points });
        }
        if let Some(path) = file_path(t) {
            return Ok(EmitterSpec::File { path });
        }
        Err(format!(
            "unknown emitter '{text}'; use blackbody, grey:EPS (e.g. grey:0.9), window:L1-L2 in um \
             (e.g. window:8-13, optionally ,in=EPS,out=EPS,edge=UM), points:UM=EPS,..., file:PATH or film"
        ))
    }

    /// A short description for tables.
    pub fn label(&self) -> String {
        match self {
            EmitterSpec::Blackbody => "blackbody".into(),
            EmitterSpec::Grey { emissivity } => format!("grey, emissivity {emissivity}"),
            EmitterSpec::Window { from_um, to_um, inside, outside, edge_um } => {
                let edges = if *edge_um > 0.0 { format!(", {edge_um} um edges") } else { String::new() };
                format!("window {from_um}-{to_um} um ({inside} inside, {outside} outside{edges})")
            }
            EmitterSpec::Points { points } => format!("{} control points", points.len()),
            EmitterSpec::File { path } => format!("file {path}"),
            EmitterSpec::Table(t) => format!("measured '{}' ({} points)", t.name, t.wavelength_m.len()),
            EmitterSpec::Film { layers, substrate } => {
                let list: Vec<String> = layers.iter().map(|l| l.text()).collect();
                if list.is_empty() {
                    format!("bare substrate {}", substrate.text())
                } else {
                    format!("film {} on {}", list.join(", "), substrate.text())
                }
            }
        }
    }

    /// What a film's materials leave uncovered of [`FILM_NEEDED_M`] (nothing for the other
    /// profiles, or when the film does not check out).
    pub fn film_warnings(&self) -> Vec<String> {
        match self {
            EmitterSpec::Film { layers, substrate } => {
                film_inputs(&air(), layers, substrate).map(|f| f.held_warnings(FILM_NEEDED_M)).unwrap_or_default()
            }
            _ => Vec::new(),
        }
    }

    /// Check the values and build the physics profile.
    pub fn to_profile(&self) -> Result<Profile, String> {
        self.to_profile_facing(&[])
    }

    /// [`EmitterSpec::to_profile`], with a film's emissivity kept exactly toward each
    /// direction of `exact_mu` (cos theta; the normal always is).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn to_profile_facing(&self, exact_mu: &[f64]) -> Result<Profile, String> {
        match self {
            EmitterSpec::Film { layers, substrate } => {
                if layers.len() > MAX_FILM_LAYERS {
                    return Err(format!("a film takes at most {MAX_FILM_LAYERS} layers; it has {}", layers.len()));
                }
                let inputs = film_inputs(&air(), layers, substrate)?;
                let mut mu = vec![1.0];
                mu.extend_from_slice(exact_mu);
                let key = (layers.clone(), substrate.clone(), mu.clone());
                if let Some(hit) =
                    LAST_FILM.with(|c| c.borrow().as_ref().filter(|(k, _)| *k == key).map(|(_, t)| t.clone()))
                {
                    return Ok(Profile::Directional(hit));
                }
                let table = std::sync::Arc::new(film_table(|l| inputs.at_held(l), FILM_SPAN_M, &mu));
                LAST_FILM.with(|c| *c.borrow_mut() = Some((key, table.clone())));
                Ok(Profile::Directional(table))
            }
            EmitterSpec::Blackbody => Ok(Profile::blackbody()),
            EmitterSpec::Grey { emissivity } => {
                check_fraction("grey emissivity", *emissivity)?;
                Ok(Profile::Grey { emissivity: *emissivity })
            }
            EmitterSpec::Window { from_um, to_um, inside, outside, edge_um } => {
                check_wavelength("window start", *from_um)?;
                check_wavelength("window end", *to_um)?;
                if !(to_um > from_um) {
                    return Err(format!(
                        "the window {from_um}-{to_um} um is empty; give the shorter wavelength first, e.g. window:8-13"
                    ));
                }
                check_fraction("emissivity inside the window", *inside)?;
                check_fraction("emissivity outside the window", *outside)?;
                check_range("window edge width", *edge_um, 0.0, 100.0, "um", "0 for sharp edges, e.g. 0.2")?;
                Ok(Profile::Window {
                    from_m: from_um * 1e-6,
                    to_m: to_um * 1e-6,
                    inside: *inside,
                    outside: *outside,
                    edge_m: edge_um * 1e-6,
                })
            }
            EmitterSpec::Points { points } => {
                if points.is_empty() || points.len() > MAX_POINTS {
                    return Err(format!(
                        "a control-point profile needs 1 to {MAX_POINTS} points UM=EPS, e.g. points:0.3=0.05,8=0.95; it has {}",
                        points.len()
                    ));
                }
                for (i, [l, e]) in points.iter().enumerate() {
                    check_wavelength(&format!("wavelength of control point {}", i + 1), *l)?;
                    check_fraction(&format!("emissivity of control point {}", i + 1), *e)?;
                    if i > 0 && !(*l > points[i - 1][0]) {
                        return Err(format!(
                            "control point {} ({l} um) does not follow the one before ({} um); give the points in order of increasing wavelength",
                            i + 1,
                            points[i - 1][0]
                        ));
                    }
                }
                Ok(Profile::Points { points: points.iter().map(|[l, e]| (l * 1e-6, *e)).collect() })
            }
            EmitterSpec::File { path } => Err(format!("the emissivity file '{path}' has not been read yet")),
            EmitterSpec::Table(t) => {
                check_table("emissivity", &t.name, &t.wavelength_m, &t.emissivity)?;
                Ok(Profile::Table { wavelength_m: t.wavelength_m.clone(), emissivity: t.emissivity.clone() })
            }
        }
    }
}

impl SkySpec {
    /// Parse the command-line form: `box | space | clear:pwv=CM | clear:dew=C | file:PATH`.
    /// A dew point becomes precipitable water by Reitan's relation ([`reitan_pwv_cm`]).
    pub fn parse(text: &str) -> Result<SkySpec, String> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        match lower.as_str() {
            "box" => return Ok(SkySpec::Box),
            "space" => return Ok(SkySpec::Space),
            _ => {}
        }
        if let Some(rest) = lower.strip_prefix("clear:") {
            let rest = rest.trim();
            if let Some(v) = rest.strip_prefix("dew=") {
                let number = v.trim().trim_end_matches('c').trim_end_matches('°').trim();
                let dew: f64 = number.parse().ok().filter(|d: &f64| d.is_finite()).ok_or_else(|| {
                    format!("'{text}': the dew point '{v}' is not a number; write e.g. clear:dew=12 (deg C)")
                })?;
                let pwv_cm = pwv_from_dew_point(dew).map_err(|e| format!("'{text}': {e}"))?;
                return Ok(SkySpec::Clear { pwv_cm });
            }
            let v = rest.strip_prefix("pwv=").ok_or_else(|| {
                format!("'{text}': give the precipitable water as clear:pwv=CM (e.g. clear:pwv=1.5) or the dew point as clear:dew=C (e.g. clear:dew=12)")
            })?;
            let pwv: f64 = v.trim().trim_end_matches("cm").trim().parse().map_err(|_| {
                format!("'{text}': the precipitable water '{v}' is not a number; write e.g. clear:pwv=1.5 (cm)")
            })?;
            return Ok(SkySpec::Clear { pwv_cm: pwv });
        }
        if let Some(path) = file_path(t) {
            return Ok(SkySpec::File { path });
        }
        Err(format!("unknown sky '{text}'; use box, space, clear:pwv=CM (e.g. clear:pwv=1.5), clear:dew=C (e.g. clear:dew=12) or file:PATH"))
    }

    /// A short description for tables.
    pub fn label(&self) -> String {
        match self {
            SkySpec::Box => "box (open 8-13 um, black elsewhere)".into(),
            SkySpec::Space => "space (3 K, no atmosphere)".into(),
            SkySpec::Clear { pwv_cm } => format!("clear, {} cm precipitable water", water_cm(*pwv_cm)),
            SkySpec::File { path } => format!("file {path}"),
            SkySpec::Table(t) => format!("measured '{}' ({} points)", t.name, t.wavelength_m.len()),
        }
    }
}

impl RadiatorScenario {
    /// The surface temperature [K]: the one given, or ambient.
    pub fn surface_temperature(&self) -> f64 {
        self.surface_k.unwrap_or(self.ambient_k)
    }

    /// Check every value and convert to SI physics inputs.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn to_physics(&self) -> Result<RadiatorSetup, String> {
        let mut warnings = Vec::new();
        check_range("ambient temperature", self.ambient_k, AMBIENT_RANGE_K.0, AMBIENT_RANGE_K.1, "K", "e.g. 300")?;
        let surface_k = self.surface_temperature();
        check_range("surface temperature", surface_k, STEADY_SEARCH_K.0, STEADY_SEARCH_K.1, "K", "e.g. 300")?;
        check_range(
            "convection coefficient h_c",
            self.h_c_w_m2k,
            HC_RANGE.0,
            HC_RANGE.1,
            "W/m²K",
            "0 for none, 3-10 for still to light wind",
        )?;
        check_range("curve start", self.curve_from_k, STEADY_SEARCH_K.0, STEADY_SEARCH_K.1, "K", "e.g. 250")?;
        check_range("curve end", self.curve_to_k, STEADY_SEARCH_K.0, STEADY_SEARCH_K.1, "K", "e.g. 350")?;
        if !(self.curve_to_k > self.curve_from_k) {
            return Err(format!(
                "the curve range {}-{} K is empty; give the lower temperature first",
                self.curve_from_k, self.curve_to_k
            ));
        }

        let is_film = matches!(self.emitter, EmitterSpec::Film { .. });
        if is_film {
            if self.solar_band.is_some() {
                return Err("a separate solar-band profile does not apply to a layer stack, which sets the solar \
                            band itself; remove the solar-band profile"
                    .into());
            }
            if matches!(self.angular, AngularSpec::CutOff { .. }) {
                return Err("the angular cut-off does not apply to a layer stack, whose emission by direction \
                            comes from its layers; choose the Lambertian (no cut-off) model"
                    .into());
            }
            warnings.extend(self.emitter.film_warnings());
        }
        let sun_mu: Vec<f64> = match (&self.sun, self.sun_zenith_deg.is_finite()) {
            (Some(_), true) => vec![self.sun_zenith_deg.to_radians().cos().clamp(0.0, 1.0)],
            _ => Vec::new(),
        };
        let profile = self.emitter.to_profile_facing(&sun_mu)?;
        let solar = match &self.solar_band {
            None => None,
            Some(s) => {
                check_range("solar-band limit", s.below_um, 0.2, 100.0, "um", "e.g. 4 (the end of the AM1.5G table)")?;
                let p = s.profile.to_profile().map_err(|e| format!("solar band: {e}"))?;
                Some(SolarBand { below_m: s.below_um * 1e-6, profile: p })
            }
        };
        let angular = match self.angular {
            AngularSpec::Lambertian => AngularModel::Lambertian,
            AngularSpec::CutOff { angle_deg, beyond } => {
                if angle_deg.is_nan() || !(angle_deg > 0.0 && angle_deg <= 90.0) {
                    return Err(format!(
                        "the cut-off angle {angle_deg} deg is out of range; give an angle above 0 and at most 90 deg from the normal, e.g. 60"
                    ));
                }
                check_fraction("emissivity beyond the cut-off angle", beyond)?;
                AngularModel::CutOff { angle_rad: angle_deg.to_radians(), beyond }
            }
        };

        let sky = match &self.sky {
            SkySpec::Box => Sky::textbook_box(),
            SkySpec::Space => Sky::Space,
            SkySpec::Clear { pwv_cm } => {
                check_range(
                    "precipitable water",
                    *pwv_cm,
                    PWV_RANGE_CM.0,
                    PWV_RANGE_CM.1,
                    "cm",
                    "e.g. 1.5; 0.5 is a dry, 4 a humid sky",
                )?;
                check_range(
                    "ambient temperature for the clear-sky model",
                    self.ambient_k,
                    CLEAR_SKY_AMBIENT_K.0,
                    CLEAR_SKY_AMBIENT_K.1,
                    "K",
                    "the model is calibrated for ordinary surface air",
                )?;
                if *pwv_cm < PWV_CALIBRATED_CM.0 || *pwv_cm > PWV_CALIBRATED_CM.1 {
                    warnings.push(format!(
                        "{} cm of precipitable water is outside the clear-sky model's calibration ({}-{} cm); treat the sky figures as rough",
                        water_cm(*pwv_cm), PWV_CALIBRATED_CM.0, PWV_CALIBRATED_CM.1
                    ));
                }
                let depression = self.ambient_k - 273.15 - reitan_dew_point_c(*pwv_cm);
                if *pwv_cm > 0.0
                    && (depression < DEW_POINT_DEPRESSION_WARN_K.0 || depression > DEW_POINT_DEPRESSION_WARN_K.1)
                {
                    warnings.push(format!(
                        "{} cm of water at {} K implies a dew point {:.0} K below the air (Reitan's relation), \
                         far from the clear-sky model's calibration (0-12 K); treat the sky figures as rough",
                        water_cm(*pwv_cm),
                        (self.ambient_k * 10.0).round() / 10.0,
                        depression
                    ));
                }
                if self.ambient_k < CLEAR_SKY_CALIBRATED_K.0 || self.ambient_k > CLEAR_SKY_CALIBRATED_K.1 {
                    warnings.push(format!(
                        "an ambient of {} K is outside the clear-sky model's calibration ({}-{} K); treat the sky figures as rough",
                        self.ambient_k, CLEAR_SKY_CALIBRATED_K.0, CLEAR_SKY_CALIBRATED_K.1
                    ));
                }
                Sky::Clear { pwv_m: pwv_cm * 0.01 }
            }
            SkySpec::File { path } => return Err(format!("the sky transmittance file '{path}' has not been read yet")),
            SkySpec::Table(t) => {
                check_table("transmittance", &t.name, &t.wavelength_m, &t.transmittance)?;
                let (lo, hi) = (t.wavelength_m[0], t.wavelength_m[t.wavelength_m.len() - 1]);
                if lo > 8e-6 || hi < 13e-6 {
                    warnings.push(format!(
                        "the sky table '{}' covers {:.3}-{:.3} um, not all of 8-13 um; outside its range the sky is taken as opaque",
                        t.name,
                        lo * 1e6,
                        hi * 1e6
                    ));
                }
                Sky::Table(Transmittance {
                    wavelength_m: t.wavelength_m.clone(),
                    transmittance: t.transmittance.clone(),
                })
            }
        };

        let sun = match &self.sun {
            None => None,
            Some(spec) => {
                let source = spec.to_source().map_err(|e| format!("sun: {e}"))?;
                if self.sun_zenith_deg.is_nan() || !(self.sun_zenith_deg >= 0.0 && self.sun_zenith_deg < 90.0) {
                    return Err(format!(
                        "the sun's zenith angle {} deg is out of range; give 0 (overhead) up to below 90 deg",
                        self.sun_zenith_deg
                    ));
                }
                check_range(
                    "sun irradiance scale",
                    self.sun_scale,
                    SUN_SCALE_RANGE.0,
                    SUN_SCALE_RANGE.1,
                    "times the table",
                    "1 for the spectrum as tabulated",
                )?;
                Some(Sun { source, zenith_rad: self.sun_zenith_deg.to_radians(), scale: self.sun_scale })
            }
        };

        if let (Some(_), EmitterSpec::Table(t)) = (&sun, &self.emitter) {
            let covered_by_solar_band = self.solar_band.is_some();
            if !covered_by_solar_band && t.wavelength_m.first().is_some_and(|l| *l > 0.3e-6) {
                warnings.push(format!(
                    "the emissivity table '{}' starts at {:.3} um, above the start of the solar spectrum (0.28 um); its first value is used below that",
                    t.name,
                    t.wavelength_m[0] * 1e6
                ));
            }
        }

        Ok(RadiatorSetup {
            emitter: Emitter { profile, solar, angular },
            surroundings: Surroundings { sky, ambient_k: self.ambient_k, sun, h_c: self.h_c_w_m2k },
            surface_k,
            warnings,
        })
    }
}

/// What a film's thickness search aims for.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum FilmGoal {
    /// the largest net cooling power at ambient
    NetPower,
    /// the lowest steady temperature
    Steady,
    /// the normal emissivity closest to a profile (least squares)
    Spectrum { profile: EmitterSpec },
}

impl FilmGoal {
    /// Parse `net-power | steady | spectrum:EMIT` (EMIT as for an emitter, e.g.
    /// spectrum:window:8-13).
    pub fn parse(text: &str) -> Result<FilmGoal, String> {
        let t = text.trim();
        match t.to_ascii_lowercase().as_str() {
            "net-power" | "power" => return Ok(FilmGoal::NetPower),
            "steady" | "steady-temperature" => return Ok(FilmGoal::Steady),
            _ => {}
        }
        if let Some(rest) = t.get(..9).filter(|p| p.eq_ignore_ascii_case("spectrum:")).and(t.get(9..)) {
            let profile = EmitterSpec::parse(rest)?;
            if matches!(profile, EmitterSpec::Film { .. }) {
                return Err("a target spectrum must be a profile, e.g. spectrum:window:8-13".into());
            }
            return Ok(FilmGoal::Spectrum { profile });
        }
        Err(format!("unknown target '{t}'; use net-power, steady or spectrum:EMIT (e.g. spectrum:window:8-13,in=0.95)"))
    }
}

/// Largest thickness a search may give a layer [nm], accepted range.
pub const SEARCH_MAX_THICKNESS_NM: (f64, f64) = (1.0, 20_000.0);

impl RadiatorScenario {
    /// The thickness search of this scenario's film emitter toward `goal`, each searched
    /// layer (every coherent one) at most `max_nm` [nm] thick, and the starting thicknesses
    /// [m] of the searched layers.
    pub fn film_design(&self, goal: &FilmGoal, max_nm: f64) -> Result<(Design, Vec<f64>), String> {
        let EmitterSpec::Film { layers, substrate } = &self.emitter else {
            return Err("the thickness search needs a film emitter (layers on a substrate)".into());
        };
        check_range(
            "largest thickness of the search",
            max_nm,
            SEARCH_MAX_THICKNESS_NM.0,
            SEARCH_MAX_THICKNESS_NM.1,
            "nm",
            "e.g. 2000",
        )?;
        let setup = self.to_physics()?;
        let inputs = film_inputs(&air(), layers, substrate)?;
        let (_, start, _) = inputs.at_held(1e-6);
        let vary: Vec<bool> = start.iter().map(|l| !l.incoherent).collect();
        if !vary.iter().any(|v| *v) {
            return Err(
                "the film has no layer whose thickness can be searched (thick incoherent layers are kept)".into()
            );
        }
        let target = match goal {
            FilmGoal::NetPower => Target::NetPower,
            FilmGoal::Steady => Target::SteadyTemperature,
            FilmGoal::Spectrum { profile } => {
                Target::Spectrum(profile.to_profile().map_err(|e| format!("target: {e}"))?)
            }
        };
        let s = &setup.surroundings;
        let design = Design::new(
            |l| inputs.at_held(l),
            &vary,
            max_nm * 1e-9,
            target,
            &s.sky,
            s.sun.as_ref(),
            s.ambient_k,
            s.h_c,
        );
        let first: Vec<f64> =
            start.iter().filter(|l| !l.incoherent).map(|l| l.thickness_m.min(max_nm * 1e-9)).collect();
        Ok((design, first))
    }

    /// This scenario with its film's layers at thicknesses `thickness_m` [m] (rounded to 0.01
    /// nm); other emitters unchanged.
    pub fn with_film_thicknesses(&self, thickness_m: &[f64]) -> RadiatorScenario {
        let mut sc = self.clone();
        if let EmitterSpec::Film { layers, .. } = &mut sc.emitter {
            for (l, d) in layers.iter_mut().zip(thickness_m) {
                l.thickness_nm = (d * 1e11).round() / 100.0;
            }
        }
        sc
    }
}
