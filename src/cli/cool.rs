//! `glowgap cool`: the radiative balance of a surface facing the sky, by day or by night.
//! Builds a radiator scenario from the options, reads any data files into it, lets it check
//! itself, evaluates the balance and prints the parts, the steady temperature and the
//! figures of merit.

use super::args::{Parsed, Spec};
use super::commands::{io_reason, load_scenario, read_spectrum_file, warn, Failure};
use crate::formats::emissivity_csv::{
    parse_emissivity_csv, parse_transmittance_csv, OpticalHints, OpticalTable, ValueKind,
};
use crate::formats::spectrum_csv::AxisUnit;
use crate::physics::radiator::evaluate;
use crate::report::radiator::RadiatorReport;
use crate::scenario::radiator::{
    AngularSpec, EmissivityTable, EmitterSpec, RadiatorScenario, SkySpec, SolarBandSpec, TransmittanceTable,
};
use crate::scenario::{Scenario, SourceSpec};
use std::io::Write;

const VALUED: &[&str] = &[
    "emitter",
    "sky",
    "ambient",
    "surface",
    "sun",
    "sun-zenith",
    "sun-scale",
    "hc",
    "solar",
    "solar-below",
    "cutoff",
    "curve",
    "emitter-axis",
    "emitter-values",
    "emitter-column",
    "sky-axis",
    "sky-values",
    "sky-column",
    "spectrum-axis",
    "spectrum-values",
    "spectrum-column",
];

/// The most points of one P_net(T) curve.
const MAX_CURVE_POINTS: usize = 100_001;

/// `glowgap cool [options]`.
pub fn cool(args: &[String], out: &mut dyn Write) -> Result<(), Failure> {
    let spec = Spec { command: "cool", valued: VALUED, flags: &["json", "link"], max_positional: 0 };
    let p = spec.parse(args)?;
    if p.flag("json") && p.flag("link") {
        return Err(Failure::Usage("'glowgap cool': choose one of --json and --link".into()));
    }
    let mut sc = RadiatorScenario::default();
    apply_options(&p, &mut sc)?;
    let curve = match p.text("curve") {
        Some(c) => {
            let (from, to, step) = parse_curve(c)?;
            sc.curve_from_k = from;
            sc.curve_to_k = to;
            Some(step)
        }
        None => None,
    };
    resolve_files(&mut sc, &p)?;
    if p.flag("link") {
        sc.to_physics()?; // refuse to link a scenario that cannot be computed
        let scenario = Scenario { radiator: sc, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    print_radiator(&sc, p.flag("json"), curve, out)
}

/// Evaluate a radiator scenario and print it: JSON with `json`, else a table; with a curve
/// step [K], also P_net(T) over the scenario's curve range.
pub fn print_radiator(
    sc: &RadiatorScenario,
    json: bool,
    curve_step: Option<f64>,
    out: &mut dyn Write,
) -> Result<(), Failure> {
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let ev = evaluate(&setup.emitter, &setup.surroundings, setup.surface_k);
    let report = RadiatorReport::from(&ev);
    let curve = match curve_step {
        Some(step) => {
            let n = ((sc.curve_to_k - sc.curve_from_k) / step).round() as usize + 1;
            let temps: Vec<f64> = (0..n).map(|i| (sc.curve_from_k + step * i as f64).min(sc.curve_to_k)).collect();
            ev.balance.curve(&temps)
        }
        None => Vec::new(),
    };
    if json && curve_step.is_none() {
        serde_json::to_writer(&mut *out, &report).map_err(|_| Failure::Output)?;
        writeln!(out)?;
        return Ok(());
    }
    if json {
        let mut v = serde_json::to_value(&report).map_err(|_| Failure::Output)?;
        {
            let pts: Vec<serde_json::Value> = curve
                .iter()
                .map(|c| serde_json::json!({"temp_k": c.temp_k, "net_w_m2": c.net, "emitted_w_m2": c.emitted}))
                .collect();
            v["curve"] = serde_json::Value::Array(pts);
        }
        serde_json::to_writer(&mut *out, &v).map_err(|_| Failure::Output)?;
        writeln!(out)?;
        return Ok(());
    }
    let sun = match &sc.sun {
        None => "none (night)".to_string(),
        Some(s) => {
            let name = s.to_source().map(|src| src.name()).unwrap_or_else(|_| s.label());
            let scale = if sc.sun_scale == 1.0 { String::new() } else { format!(" x {}", sc.sun_scale) };
            format!("{name}{scale} at {} deg from zenith", sc.sun_zenith_deg)
        }
    };
    let mut emitter = sc.emitter.label();
    if let Some(s) = &sc.solar_band {
        emitter.push_str(&format!("; below {} um: {}", s.below_um, s.profile.label()));
    }
    if let AngularSpec::CutOff { angle_deg, beyond } = sc.angular {
        emitter.push_str(&format!("; {beyond} beyond {angle_deg} deg"));
    }
    let mut rows: Vec<(String, String)> = vec![
        ("Emitter".into(), emitter),
        ("Sky".into(), sc.sky.label()),
        ("Sun".into(), sun),
        ("Convection h_c".into(), format!("{} W/m²K", sc.h_c_w_m2k)),
    ];
    rows.extend(report.rows());
    for (label, value) in rows {
        writeln!(out, "{label:<32} {value}")?;
    }
    if !curve.is_empty() {
        writeln!(out)?;
        writeln!(out, "{:>10} {:>14} {:>14}", "T (K)", "P_net (W/m²)", "emitted (W/m²)")?;
        for c in &curve {
            writeln!(out, "{:>10.2} {:>14.3} {:>14.3}", c.temp_k, c.net, c.emitted)?;
        }
    }
    Ok(())
}

/// `--curve FROM:TO:STEP` in K.
fn parse_curve(text: &str) -> Result<(f64, f64, f64), String> {
    let bad = || format!("--curve '{text}' is not FROM:TO:STEP in K, e.g. --curve 250:350:5");
    let parts: Vec<&str> = text.split(':').collect();
    let [a, b, c] = parts.as_slice() else { return Err(bad()) };
    let num = |s: &str| s.trim().parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(bad);
    let (from, to, step) = (num(a)?, num(b)?, num(c)?);
    if !(step > 0.0) || !(to > from) {
        return Err(format!("--curve '{text}': give FROM below TO and a positive STEP, e.g. --curve 250:350:5"));
    }
    if (to - from) / step + 1.0 > MAX_CURVE_POINTS as f64 {
        return Err(format!("--curve '{text}' asks for more than {MAX_CURVE_POINTS} points; use a larger STEP"));
    }
    Ok((from, to, step))
}

/// Options onto a radiator scenario.
fn apply_options(p: &Parsed, sc: &mut RadiatorScenario) -> Result<(), String> {
    if let Some(e) = p.text("emitter") {
        sc.emitter = EmitterSpec::parse(e)?;
    }
    if let Some(s) = p.text("sky") {
        sc.sky = SkySpec::parse(s)?;
    }
    if let Some(t) = p.number("ambient", "ambient air temperature", "K")? {
        sc.ambient_k = t;
    }
    if let Some(t) = p.number("surface", "surface temperature", "K")? {
        sc.surface_k = Some(t);
    }
    if let Some(h) = p.number("hc", "convection coefficient", "W/m²K")? {
        sc.h_c_w_m2k = h;
    }
    if let Some(s) = p.text("sun") {
        sc.sun = if s.trim().eq_ignore_ascii_case("none") {
            None
        } else {
            Some(SourceSpec::parse(s).map_err(|e| format!("--sun: {e}, or none"))?)
        };
    }
    for (name, what) in [("sun-zenith", "sun's zenith angle"), ("sun-scale", "irradiance scale")] {
        if p.text(name).is_some() && sc.sun.is_none() {
            return Err(format!("--{name} sets the {what} and needs the sun on, e.g. --sun am1.5g"));
        }
    }
    if let Some(z) = p.number("sun-zenith", "sun's zenith angle", "deg")? {
        sc.sun_zenith_deg = z;
    }
    if let Some(s) = p.number("sun-scale", "irradiance scale", "a factor, 1 = as tabulated")? {
        sc.sun_scale = s;
    }
    if let Some(s) = p.text("solar") {
        let profile = match s.trim().parse::<f64>() {
            Ok(v) => EmitterSpec::Grey { emissivity: v },
            Err(_) => EmitterSpec::parse(s).map_err(|e| format!("--solar: {e}"))?,
        };
        let below = p
            .number("solar-below", "solar-band limit", "um")?
            .unwrap_or(crate::scenario::radiator::DEFAULT_SOLAR_BELOW_UM);
        sc.solar_band = Some(SolarBandSpec { below_um: below, profile });
    } else if p.text("solar-below").is_some() {
        return Err("--solar-below sets where the solar-band profile ends and needs --solar, e.g. --solar 0.03".into());
    }
    if let Some(c) = p.text("cutoff") {
        let (angle, beyond) = match c.split_once(':') {
            Some((a, b)) => (a, Some(b)),
            None => (c, None),
        };
        let num = |s: &str, what: &str| {
            s.trim().parse::<f64>().map_err(|_| {
                format!(
                    "--cutoff '{c}': the {what} '{}' is not a number; write DEG[:EPS], e.g. --cutoff 60:0",
                    s.trim()
                )
            })
        };
        sc.angular = AngularSpec::CutOff {
            angle_deg: num(angle, "angle")?,
            beyond: match beyond {
                Some(b) => num(b, "emissivity beyond")?,
                None => 0.0,
            },
        };
    }
    Ok(())
}

/// Which optical file: an emitter's (emissivity) or the sky's (transmittance).
#[derive(Clone, Copy, PartialEq)]
enum FileKind {
    Emitter,
    Sky,
}

/// Read every `file:` part of the scenario into a table it carries.
pub fn resolve_files(sc: &mut RadiatorScenario, p: &Parsed) -> Result<(), String> {
    let emitter_hints = ["emitter-axis", "emitter-values", "emitter-column"].iter().any(|o| p.text(o).is_some());
    let sky_hints = ["sky-axis", "sky-values", "sky-column"].iter().any(|o| p.text(o).is_some());
    let emitter_file = matches!(sc.emitter, EmitterSpec::File { .. })
        || matches!(sc.solar_band.as_ref().map(|s| &s.profile), Some(EmitterSpec::File { .. }));
    if emitter_hints && !emitter_file {
        return Err("--emitter-axis, --emitter-values and --emitter-column apply only to --emitter file:PATH or --solar file:PATH".into());
    }
    if sky_hints && !matches!(sc.sky, SkySpec::File { .. }) {
        return Err("--sky-axis, --sky-values and --sky-column apply only to --sky file:PATH".into());
    }
    let sun_hints = ["spectrum-axis", "spectrum-values", "spectrum-column"].iter().any(|o| p.text(o).is_some());
    if sun_hints && !matches!(sc.sun, Some(SourceSpec::File { .. })) {
        return Err("--spectrum-axis, --spectrum-values and --spectrum-column apply only to --sun file:PATH".into());
    }
    if let EmitterSpec::File { path } = &sc.emitter {
        sc.emitter = emissivity_table(read_optical_file(path, FileKind::Emitter, p)?);
    }
    if let Some(s) = &mut sc.solar_band {
        if let EmitterSpec::File { path } = &s.profile {
            s.profile = emissivity_table(read_optical_file(path, FileKind::Emitter, p)?);
        }
    }
    if let SkySpec::File { path } = &sc.sky {
        let t = read_optical_file(path, FileKind::Sky, p)?;
        sc.sky =
            SkySpec::Table(TransmittanceTable { name: t.name, wavelength_m: t.wavelength_m, transmittance: t.values });
    }
    if let Some(SourceSpec::File { path }) = &sc.sun {
        sc.sun = Some(read_spectrum_file(path, p)?);
    }
    Ok(())
}

fn emissivity_table(t: OpticalTable) -> EmitterSpec {
    EmitterSpec::Table(EmissivityTable { name: t.name, wavelength_m: t.wavelength_m, emissivity: t.values })
}

fn read_optical_file(path: &str, kind: FileKind, p: &Parsed) -> Result<OpticalTable, String> {
    let (prefix, what) = match kind {
        FileKind::Emitter => ("emitter", "emissivity file"),
        FileKind::Sky => ("sky", "sky transmittance file"),
    };
    let mut hints = OpticalHints::default();
    if let Some(a) = p.text(&format!("{prefix}-axis")) {
        hints.axis =
            Some(AxisUnit::parse(a).ok_or_else(|| format!("--{prefix}-axis '{a}' is not known; use nm, um or cm-1"))?);
    }
    if let Some(v) = p.text(&format!("{prefix}-values")) {
        let kinds = if kind == FileKind::Sky {
            "transmittance or transmittance%"
        } else {
            "emissivity, absorptance or reflectance, with % for percent"
        };
        hints.value =
            Some(ValueKind::parse(v).ok_or_else(|| format!("--{prefix}-values '{v}' is not known; use {kinds}"))?);
    }
    if let Some(c) = p.text(&format!("{prefix}-column")) {
        let n = c.trim().parse::<usize>().ok().filter(|n| *n >= 1).ok_or_else(|| {
            format!("--{prefix}-column '{c}' is not a column number; give 1 for the first value column after the axis")
        })?;
        hints.column = Some(n);
    }
    let bytes = std::fs::read(path).map_err(|e| format!("cannot read {what} '{path}': {}", io_reason(&e)))?;
    let name =
        std::path::Path::new(path).file_name().map_or_else(|| path.to_string(), |n| n.to_string_lossy().into_owned());
    let text = String::from_utf8_lossy(&bytes);
    let parsed = match kind {
        FileKind::Emitter => parse_emissivity_csv(&text, &hints, &name),
        FileKind::Sky => parse_transmittance_csv(&text, &hints, &name),
    };
    parsed.map_err(|e| format!("{what} '{path}': {e}"))
}

/// `glowgap eval --radiator`: the radiator figures of a link or scenario file.
pub fn eval_radiator(what: &str, json: bool, out: &mut dyn Write) -> Result<(), Failure> {
    let scenario = load_scenario(what)?;
    let mut sc = scenario.radiator;
    resolve_files(&mut sc, &Parsed::default()).map_err(|e| format!("the scenario's radiator cannot be read: {e}"))?;
    sc.to_physics().map_err(|e| format!("the scenario's radiator cannot be computed: {e}"))?;
    print_radiator(&sc, json, None, out)
}
