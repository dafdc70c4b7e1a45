//! `glowgap cool`: the radiative balance of a surface facing the sky, by day or by night.
//! Builds a radiator scenario from the options, reads any data files into it, lets it check
//! itself, evaluates the balance and prints the parts, the steady temperature and the
//! figures of merit.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::files::{film_error, resolve_radiator_files};
use crate::cli::shared::options::radiator_options;
use crate::cli::shared::output::print_radiator;
use crate::cli::shared::{Command, Failure, Out};
use crate::scenario::film::{film_inputs, MaterialSpec};
use crate::scenario::radiator::{EmitterSpec, RadiatorScenario};
use crate::scenario::Scenario;

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "cool",
        valued: &[
            "emitter",
            "layers",
            "substrate",
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
        ],
        flags: &["json", "link"],
        max_positional: 0,
    },
    about: "radiative cooling balance of a surface facing the sky: net power, steady temperature",
    usage: "cool [RADIATOR OPTIONS] [--json | --link]",
    docs: &[
        OptionDoc {
            name: "emitter",
            arg: "EMIT",
            text: "blackbody (default) | grey:EPS | window:L1-L2[,in=EPS,out=EPS,edge=UM]\n\
                   | points:UM=EPS,UM=EPS,... (linear on a log axis) | file:PATH | film\n\
                   (wavelengths in um; files: emissivity, absorptance or reflectance; film: the\n\
                   layer stack of --layers on --substrate, its own angular behaviour)",
        },
        OptionDoc { name: "layers", arg: "LAYER,...", text: super::film::LAYERS_DOC },
        OptionDoc {
            name: "substrate",
            arg: "MAT",
            text: "what the film lies on, default n=1; over a lossless one the emissivity is\n\
                   1 - R - T, over an absorbing one (k > 0) 1 - R",
        },
        OptionDoc {
            name: "solar",
            arg: "EPS|EMIT",
            text: "a separate profile for the solar band, below --solar-below (default: none)",
        },
        OptionDoc { name: "solar-below", arg: "UM", text: "where the solar band ends, in um, default 4" },
        OptionDoc {
            name: "cutoff",
            arg: "DEG[:EPS]",
            text: "angular cut-off: emissivity EPS (default 0) beyond DEG degrees from the normal\n\
                   (default: no cut-off, Lambertian)",
        },
        OptionDoc {
            name: "sky",
            arg: "SKY",
            text: "box (default, open 8-13 um) | space (3 K) | clear:pwv=CM | clear:dew=C | file:PATH\n\
                   (file: zenith transmittance; slant paths follow t^(1/cos theta))",
        },
        OptionDoc { name: "ambient", arg: "K", text: "ambient air temperature in K, default 300" },
        OptionDoc { name: "surface", arg: "K", text: "surface temperature in K, default the ambient" },
        OptionDoc {
            name: "sun",
            arg: "SPEC|none",
            text: "none (default, night) | am1.5g | am1.5d | am0 | blackbody:K | file:PATH",
        },
        OptionDoc {
            name: "sun-zenith",
            arg: "DEG",
            text: "sun's zenith angle in degrees, default 0 (sets the absorptance's direction)",
        },
        OptionDoc { name: "sun-scale", arg: "X", text: "factor on the sun's irradiance, default 1" },
        OptionDoc {
            name: "hc",
            arg: "W_PER_M2K",
            text: "convection/conduction coefficient from the air in W/m²K, default 0",
        },
        OptionDoc {
            name: "curve",
            arg: "FROM:TO:STEP",
            text: "also print P_net(T) over that range, in K (default: no curve)",
        },
        OptionDoc {
            name: "emitter-axis",
            arg: "UNIT",
            text: "axis unit of an emitter file without one in its header: nm | um | cm-1\n\
                   (default: the unit the header names)",
        },
        OptionDoc {
            name: "emitter-values",
            arg: "KIND",
            text: "what an emitter file holds: emissivity | absorptance | reflectance, with % for\n\
                   percent (default: what the header names)",
        },
        OptionDoc {
            name: "emitter-column",
            arg: "N",
            text: "value column of an emitter file, 1 (default) = the first after the axis",
        },
        OptionDoc {
            name: "sky-axis",
            arg: "UNIT",
            text: "axis unit of a sky file without one in its header: nm | um | cm-1\n\
                   (default: the unit the header names)",
        },
        OptionDoc {
            name: "sky-values",
            arg: "KIND",
            text: "what a sky file holds: transmittance, or transmittance% for percent\n\
                   (default: what the header names)",
        },
        OptionDoc {
            name: "sky-column",
            arg: "N",
            text: "value column of a sky file, 1 (default) = the first after the axis",
        },
        OptionDoc {
            name: "spectrum-axis",
            arg: "UNIT",
            text: "axis unit of a --sun file without one in its header: nm | um | eV | cm-1\n\
                   (default: the unit the header names)",
        },
        OptionDoc {
            name: "spectrum-values",
            arg: "UNIT",
            text: "value unit of a --sun file, e.g. W/m2/nm (default: the unit the header names)",
        },
        OptionDoc {
            name: "spectrum-column",
            arg: "N",
            text: "value column of a --sun file, 1 (default) = the first after the axis",
        },
    ],
    run,
};

/// The most points of one P_net(T) curve.
const MAX_CURVE_POINTS: usize = 100_001;

/// `glowgap cool [options]`.
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("json") && p.flag("link") {
        return Err(Failure::Usage("'glowgap cool': choose one of --json and --link".into()));
    }
    let mut sc = RadiatorScenario::default();
    radiator_options(&p, &mut sc)?;
    let curve = match p.text("curve") {
        Some(c) => {
            let (from, to, step) = parse_curve(c)?;
            sc.curve_from_k = from;
            sc.curve_to_k = to;
            Some(step)
        }
        None => None,
    };
    resolve_radiator_files(&mut sc, &p)?;
    if let EmitterSpec::Film { layers, substrate } = &sc.emitter {
        film_inputs(&MaterialSpec::Index { n: 1.0, k: 0.0 }, layers, substrate).map_err(film_error)?;
    }
    if p.flag("link") {
        sc.to_physics()?; // refuse to link a scenario that cannot be computed
        let scenario = Scenario { radiator: sc, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    print_radiator(&sc, p.flag("json"), curve, out)
}

/// `--curve FROM:TO:STEP` in K.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting checks: `!(x > 0.0)` also refuses NaN
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
