//! Options several commands share: the light source and the cell (applied onto a
//! `CellScenario`), the connection and gap list of stacks, a grid of band gaps
//! (`--from`/`--to`/`--step`), and the help of each.
//!
//! Architecture invariant: options become scenario values here and are checked by the
//! scenario (`to_physics`, `check_gap_ev`, `check_gap_range`), never by range checks of their
//! own; the messages put the option's name in front of the scenario's words.

use super::files::{read_spectrum_file, resolve_material};
use super::Failure;
use crate::cli::args::{OptionDoc, Parsed};
use crate::scenario::film::{LayerSpec, MaterialSpec};
use crate::scenario::radiator::{AngularSpec, EmitterSpec, RadiatorScenario, SkySpec, SolarBandSpec};
use crate::scenario::real::{DopingType, RealAbsorberSpec, RealMaterial, TrappingSpec};
use crate::scenario::{check_gap_ev, check_gap_range, CellScenario, SourceSpec};
use crate::scenario::{Connection, Emission, JvModel};

/// The valued options of a command followed by the light-source and cell options that
/// [`apply_common`] reads, so that every command accepts exactly the options it applies.
macro_rules! with_light_and_cell_options {
    ($($own:expr),* $(,)?) => {
        &[$($own,)* "spectrum", "spectrum-axis", "spectrum-values", "spectrum-column",
          "concentration", "cell-temp", "ere", "emission", "approx"]
    };
}
pub(crate) use with_light_and_cell_options;

/// Help of the options more than one command accepts, in one place.
pub const SHARED_DOCS: &[OptionDoc] = &[
    OptionDoc {
        name: "spectrum",
        arg: "SPEC",
        text: "am1.5g (default) | am1.5d | am0 | blackbody:K | file:PATH\n\
               | clearsky:lat=DEG,lon=DEG,time=ISO8601[,tilt=DEG,azimuth=DEG,pwv=CM,...]\n\
               (the keys are the options of glowgap sun: the clear-sky plane-of-array spectrum\n\
               at that place and moment)",
    },
    OptionDoc {
        name: "spectrum-axis",
        arg: "UNIT",
        text: "axis unit of a spectrum file without one in its header: nm | um | eV | cm-1\n\
               (default: the unit the header names)",
    },
    OptionDoc {
        name: "spectrum-values",
        arg: "UNIT",
        text: "value unit of a spectrum file, e.g. W/m2/nm or photons/m2/s/eV\n\
               (default: the unit the header names)",
    },
    OptionDoc {
        name: "spectrum-column",
        arg: "N",
        text: "which value column of a multi-column file, 1 (default) = the first after the axis",
    },
    OptionDoc {
        name: "concentration",
        arg: "X",
        text: "suns, 1 (default) up to the sun-disc limit (about 46,239); max for that limit",
    },
    OptionDoc { name: "cell-temp", arg: "K", text: "cell temperature in K, default 300" },
    OptionDoc { name: "ere", arg: "F", text: "external radiative efficiency, a fraction in (0, 1], default 1" },
    OptionDoc { name: "emission", arg: "SIDE", text: "front (default, perfect back mirror) | both" },
    OptionDoc { name: "approx", arg: "MODEL", text: "exact (default, generalized Planck) | boltzmann" },
    OptionDoc {
        name: "connection",
        arg: "C",
        text: "series (default, two-terminal, one current) | independent (multi-terminal)",
    },
    OptionDoc { name: "json", arg: "", text: "print JSON instead of the table (default: a table)" },
    OptionDoc {
        name: "link",
        arg: "",
        text: "print the scenario's share-link fragment (#g1.…) to append to the app's address,\n\
               instead of the figures",
    },
    OptionDoc { name: "csv", arg: "", text: "print CSV with a header line instead of the table" },
    OptionDoc {
        name: "light-trapping",
        arg: "MODEL",
        text: "with a real absorber: lambertian (default, 4n² with a rear mirror) | single-pass |\n\
               double-pass",
    },
    OptionDoc { name: "doping-type", arg: "n|p", text: "with a real absorber: the doping type, default n" },
    OptionDoc {
        name: "doping",
        arg: "CM3",
        text: "with a real absorber: the doping density in cm^-3, default 0 (undoped)",
    },
    OptionDoc {
        name: "luminescent-coupling",
        arg: "F",
        text: "fraction of each subcell's radiative emission absorbed by the subcell below, 0 to 1,\n\
               default 0 (none)",
    },
];

/// Options shared by the cell commands, applied onto a scenario.
pub fn apply_common(p: &Parsed, sc: &mut CellScenario) -> Result<(), String> {
    if let Some(s) = p.text("spectrum") {
        sc.spectrum = SourceSpec::parse(s)?;
    }
    if let Some(x) = concentration(p)? {
        sc.concentration = x;
    }
    if let Some(t) = p.number("cell-temp", "cell temperature", "K")? {
        sc.cell_temp_k = t;
    }
    // a material's gap follows the cell temperature
    sc.sync_gap();
    if let Some(e) = p.number("ere", "external radiative efficiency", "a fraction above 0, at most 1")? {
        sc.ere = e;
    }
    if let Some(e) = p.text("emission") {
        sc.emission = match e.to_ascii_lowercase().as_str() {
            "front" => Emission::Front,
            "both" => Emission::Both,
            _ => return Err(format!("--emission '{e}' is not known; use front (perfect back mirror) or both")),
        };
    }
    if let Some(a) = p.text("approx") {
        sc.approx = match a.to_ascii_lowercase().as_str() {
            "exact" => JvModel::Exact,
            "boltzmann" => JvModel::Boltzmann,
            _ => return Err(format!("--approx '{a}' is not known; use exact or boltzmann")),
        };
    }
    let has_hints =
        p.text("spectrum-axis").is_some() || p.text("spectrum-values").is_some() || p.text("spectrum-column").is_some();
    if let SourceSpec::File { path } = &sc.spectrum {
        sc.spectrum = read_spectrum_file(path, p)?;
    } else if has_hints {
        return Err(
            "--spectrum-axis, --spectrum-values and --spectrum-column apply only to --spectrum file:PATH".into()
        );
    }
    Ok(())
}

/// The options that describe an `--emitter file:PATH` (for `tpv` and `absorber`).
pub const EMITTER_FILE_DOCS: [OptionDoc; 3] = [
    OptionDoc {
        name: "emitter-axis",
        arg: "U",
        text: "with --emitter file:PATH: the file's wavelength unit, nm, um or cm-1\n\
               (default: from the header)",
    },
    OptionDoc {
        name: "emitter-values",
        arg: "KIND",
        text: "with --emitter file:PATH: emissivity, absorptance or reflectance, % for percent\n\
               (default: from the header)",
    },
    OptionDoc {
        name: "emitter-column",
        arg: "N",
        text: "with --emitter file:PATH: the value column, the axis being 0 (default 1)",
    },
];

/// `--concentration X|max`: suns, or `max` for the sun-disc limit
/// (`constants::MAX_CONCENTRATION`, about 46,239).
pub fn concentration(p: &Parsed) -> Result<Option<f64>, String> {
    match p.text("concentration") {
        Some(t) if t.trim().eq_ignore_ascii_case("max") => Ok(Some(crate::physics::constants::MAX_CONCENTRATION)),
        _ => p.number("concentration", "concentration", "suns (or max)"),
    }
}

/// `--connection series|independent`.
pub fn connection(p: &Parsed) -> Result<Connection, String> {
    match p.text("connection").map(|c| c.trim().to_ascii_lowercase()) {
        None => Ok(Connection::Series),
        Some(c) => match c.as_str() {
            "series" | "two-terminal" | "2t" => Ok(Connection::Series),
            "independent" | "multi-terminal" | "4t" => Ok(Connection::Independent),
            _ => Err(format!(
                "--connection '{c}' is not known; use series (two-terminal, one current) or independent (multi-terminal)"
            )),
        },
    }
}

/// The most gaps a `--from --to --step` grid may have: each gap is solved and printed, and at
/// this size a grid takes a few seconds and a few tens of MB.
pub const MAX_GRID_POINTS: usize = 100_000;

/// Check the grid of band gaps `--from FROM --to TO --step STEP` [eV] (TO included): both
/// ends in the accepted range ([`check_gap_ev`]), the lower first ([`check_gap_range`]; equal
/// ends make a grid of one gap), a positive step, and at most [`MAX_GRID_POINTS`] gaps,
/// refused before anything is allocated. Returns the number of steps (a whole number; the
/// grid has one gap more). The messages name the options.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(step > 0.0)` on purpose: it also refuses NaN
pub fn check_gap_grid(from_ev: f64, to_ev: f64, step_ev: f64) -> Result<f64, String> {
    check_gap_ev(from_ev).map_err(|e| format!("--from: {e}"))?;
    check_gap_ev(to_ev).map_err(|e| format!("--to: {e}"))?;
    if from_ev != to_ev {
        check_gap_range("band-gap range", from_ev, to_ev).map_err(|e| format!("--from {from_ev} --to {to_ev}: {e}"))?;
    }
    if !(step_ev > 0.0) {
        return Err(format!("--step {step_ev} must be positive, e.g. --step 0.01 (eV)"));
    }
    let steps = ((to_ev - from_ev) / step_ev).round();
    if steps + 1.0 > MAX_GRID_POINTS as f64 {
        let smallest = (to_ev - from_ev) / (MAX_GRID_POINTS - 1) as f64;
        return Err(format!(
            "--step {step_ev} gives {:.0} band gaps from {from_ev} to {to_ev} eV, more than the {MAX_GRID_POINTS} \
             accepted; use a larger --step, at least {}",
            steps + 1.0,
            round_up_2(smallest)
        ));
    }
    Ok(steps)
}

/// `x` > 0 rounded up to two significant digits, for a suggested value.
fn round_up_2(x: f64) -> f64 {
    let scale = 10f64.powf(x.log10().floor() - 1.0);
    (x / scale).ceil() * scale
}

/// The radiator options of `glowgap cool` (emitter, film, sky, air, sun, cut-off) onto a
/// radiator scenario; a command without some of them simply never sees them.
pub fn radiator_options(p: &Parsed, sc: &mut RadiatorScenario) -> Result<(), String> {
    if let Some(e) = p.text("emitter") {
        sc.emitter = EmitterSpec::parse(e)?;
    }
    let film_options = p.text("layers").is_some() || p.text("substrate").is_some();
    if let EmitterSpec::Film { layers, substrate } = &mut sc.emitter {
        if let Some(list) = p.text("layers") {
            for l in list.split(',').filter(|l| !l.trim().is_empty()) {
                layers.push(LayerSpec::parse(l).map_err(|e| format!("--layers: {e}"))?);
            }
        }
        if let Some(m) = p.text("substrate") {
            *substrate = MaterialSpec::parse(m).map_err(|e| format!("--substrate: {e}"))?;
        }
        if p.text("cutoff").is_some() {
            return Err("--cutoff does not apply to a film, whose emission by direction comes from its layers; \
                        remove --cutoff"
                .into());
        }
        if p.text("solar").is_some() {
            return Err("--solar does not apply to a film, which sets the solar band itself; remove --solar".into());
        }
    } else if film_options {
        return Err("--layers and --substrate describe a film and need --emitter film".into());
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

/// A real absorber from the text `text` of `--OPTION` (`silicon:UM` or `file:PATH:UM`) with
/// `--light-trapping`, `--doping-type` and `--doping` applied; a `file:` table is read here.
pub fn real_absorber(p: &Parsed, option: &str, text: &str) -> Result<RealAbsorberSpec, Failure> {
    let mut spec = RealAbsorberSpec::parse(text).map_err(|e| format!("--{option}: {e}"))?;
    if let Some(t) = p.text("light-trapping") {
        spec.trapping = TrappingSpec::parse(t).map_err(|e| format!("--light-trapping: {e}"))?;
    }
    if let Some(t) = p.text("doping-type") {
        spec.doping_type = match t.trim().to_ascii_lowercase().as_str() {
            "n" => DopingType::N,
            "p" => DopingType::P,
            other => return Err(Failure::Usage(format!("--doping-type '{other}' is not known; use n or p"))),
        };
    }
    if let Some(d) = p.number("doping", "doping density", "cm^-3")? {
        spec.doping_cm3 = d;
    }
    if let RealMaterial::File { path } = &spec.material {
        let MaterialSpec::Table { name, wavelength_m, n, k } =
            resolve_material(MaterialSpec::File { path: path.clone() }).map_err(|e| format!("--{option}: {e}"))?
        else {
            return Err(Failure::Output);
        };
        spec.material = RealMaterial::Table { name, wavelength_m, n, k };
    }
    spec.to_physics().map_err(|e| format!("--{option}: {e}"))?;
    Ok(spec)
}
