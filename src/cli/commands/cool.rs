//! `glowgap cool`: the radiative balance of a surface facing the sky, by day or by night.
//! Builds a radiator scenario from the options, reads any data files into it, lets it check
//! itself, evaluates the balance and prints the parts, the steady temperature and the
//! figures of merit; or, with `--day`, the radiator through a clear day at a place
//! (`scenario::day`: each 5-minute step's clear-sky sun, air temperature and balance).
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{film_error, read_small_text, resolve_radiator_files};
use crate::cli::shared::options::radiator_options;
use crate::cli::shared::output::{print_json, print_radiator, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::report::day::{DayReport, DAY_COLUMNS, DAY_NOTE};
use crate::scenario::day::DaySpec;
use crate::scenario::film::{film_inputs, MaterialSpec};
use crate::scenario::radiator::{EmitterSpec, RadiatorScenario, SkySpec};
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
            "day",
            "day-ambient",
        ],
        flags: &["json", "link", "csv"],
        max_positional: 0,
    },
    about: "radiative cooling balance of a surface facing the sky: net power, steady temperature",
    usage: "cool [RADIATOR OPTIONS] [--json | --link]\n\
            or: glowgap cool --day lat=DEG,lon=DEG,date=YYYY-MM-DD[,tmin=C,tmax=C] [RADIATOR OPTIONS]\n\
            [--json | --csv]",
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
            name: "day",
            arg: "KEY=VALUE,...",
            text: "the radiator through a clear day, every 5 min from local mean-time midnight (UTC\n\
                   offset round(lon/15) h): lat=DEG,lon=DEG,date=YYYY-MM-DD required; tmin=C,tmax=C\n\
                   the air's daily extremes, default 15 and 25 (a two-piece cosine: tmin at sunrise,\n\
                   tmax at 14:00 solar time; solar noon -6 h stands in for sunrise on polar day or\n\
                   night); any key of 'glowgap sun' (tilt=, azimuth=, pwv=, aod500=, elevation= ...),\n\
                   tilt default 0 (facing up). The sun is the clear-sky global light on the plane; the\n\
                   sky defaults to clear:pwv= of the place. Prints each step's sun_w_m2, net_w_m2 (at\n\
                   the air temperature), steady_temp_k, ambient_k; cooling_kwh_m2 integrates net_w_m2\n\
                   (heating steps count negative), hours_below_ambient counts steady < air.\n\
                   (default: no day, one moment)",
        },
        OptionDoc {
            name: "day-ambient",
            arg: "PATH",
            text: "with --day: the air temperature from a file instead of tmin/tmax, one line per\n\
                   value, hour,temperature in C: the hour 0 to below 24 on the day's clock (local mean\n\
                   time) or an ISO 8601 time with its offset; straight lines between the values,\n\
                   round the clock (default: the two-piece cosine)",
        },
        OptionDoc {
            name: "csv",
            arg: "",
            text: "with --day: print time,sun_w_m2,net_w_m2,steady_temp_k,ambient_k, one line per step",
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
    if let Some(day) = p.text("day") {
        return run_day(&p, day, out);
    }
    if p.text("day-ambient").is_some() {
        return Err(Failure::Usage(
            "--day-ambient gives the air of a day: add --day lat=DEG,lon=DEG,date=YYYY-MM-DD, or drop it".into(),
        ));
    }
    if p.flag("csv") {
        return Err(Failure::Usage(
            "--csv prints the steps of a day: add --day lat=DEG,lon=DEG,date=YYYY-MM-DD, or drop --csv".into(),
        ));
    }
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
    read_files(&mut sc, &p)?;
    if p.flag("link") {
        sc.to_physics()?; // refuse to link a scenario that cannot be computed
        let scenario = Scenario { radiator: sc, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    print_radiator(&sc, p.flag("json"), curve, out)
}

/// Read the radiator's data files into `sc` and check a film's layers.
fn read_files(sc: &mut RadiatorScenario, p: &Parsed) -> Result<(), Failure> {
    resolve_radiator_files(sc, p)?;
    if let EmitterSpec::Film { layers, substrate } = &sc.emitter {
        film_inputs(&MaterialSpec::Index { n: 1.0, k: 0.0 }, layers, substrate).map_err(film_error)?;
    }
    Ok(())
}

/// `glowgap cool --day ... [radiator options] [--json | --csv]`: the radiator through a
/// clear day (`scenario::day`).
fn run_day(p: &Parsed, day: &str, out: Out) -> Result<(), Failure> {
    for (flag, why) in [
        ("sun", "the day's sun comes from the place and time"),
        ("sun-zenith", "the day's sun comes from the place and time"),
        ("ambient", "the day's air follows tmin= and tmax= in --day"),
        ("surface", "the day gives the balance at the air temperature and the steady temperature"),
        ("curve", "a day prints its steps, not a curve"),
    ] {
        if p.text(flag).is_some() {
            return Err(Failure::Usage(format!("--{flag} does not go with --day: {why}; remove --{flag}")));
        }
    }
    if p.flag("link") {
        return Err(Failure::Usage(
            "--link does not go with --day: a share link holds one moment; remove --link".into(),
        ));
    }
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap cool --day': choose one of --json and --csv".into()));
    }
    let mut spec = DaySpec::parse(day).map_err(|e| format!("--day: {e}"))?;
    if let Some(path) = p.text("day-ambient") {
        let text = read_small_text(path, "the air temperature file").map_err(|e| format!("--day-ambient: {e}"))?;
        spec.set_hourly_air(&text).map_err(|e| format!("--day-ambient '{path}': {e}"))?;
    }
    let mut sc = RadiatorScenario::default();
    radiator_options(p, &mut sc)?;
    read_files(&mut sc, p)?;
    if p.text("sky").is_none() {
        sc.sky = SkySpec::Clear { pwv_cm: spec.place.pwv_cm };
    }
    let run = spec.run(&sc).map_err(|e| match e.contains("ambient") {
        true => format!("--day tmin/tmax: {e}"),
        false => e,
    })?;
    warn(&run.warnings);
    let report = DayReport::new(&spec, &run);
    if p.flag("json") {
        return print_json(out, &report);
    }
    if p.flag("csv") {
        writeln!(
            out,
            "# Glowgap: radiator through {} at {} deg N, {} deg E (UTC{:+})",
            report.date, report.lat_deg, report.lon_deg, report.utc_offset_h
        )?;
        writeln!(out, "# {DAY_NOTE}")?;
        writeln!(out, "# sun and net in W/m2, temperatures in K; {DAY_CAUTION}")?;
        writeln!(out, "{DAY_COLUMNS}")?;
        for s in &report.steps {
            let steady = s.steady_temp_k.map(|t| t.to_string()).unwrap_or_default();
            writeln!(out, "{},{},{},{},{}", s.time, s.sun_w_m2, s.net_w_m2, steady, s.ambient_k)?;
        }
        return Ok(());
    }
    let r = &report;
    writeln!(
        out,
        "{} at {} deg N, {} deg E, plane tilt {} deg facing {} deg; sky: {}",
        r.date,
        r.lat_deg,
        r.lon_deg,
        r.tilt_deg,
        r.azimuth_deg,
        sc.sky.label()
    )?;
    writeln!(out, "Emitter: {}", sc.emitter.label())?;
    let events = match (&r.sunrise, &r.sunset) {
        (Some(a), Some(b)) => format!("sunrise {a}, solar noon {}, sunset {b}", r.solar_noon),
        _ => format!("{} all day, solar noon {}", r.daylight, r.solar_noon),
    };
    writeln!(
        out,
        "Clock UTC{:+} (local mean time); {events}; air ({}) {} C at {} to {} C at {}",
        r.utc_offset_h, r.air_model, r.tmin_c, r.air_min_at, r.tmax_c, r.air_max_at
    )?;
    writeln!(out)?;
    writeln!(
        out,
        "{:>6} {:>11} {:>9} {:>14} {:>12} {:>14}",
        "time", "sun (W/m²)", "air (K)", "net (W/m²)", "steady (K)", "steady-air (K)"
    )?;
    for s in r.steps.iter().step_by((30.0 / r.step_minutes).round().max(1.0) as usize) {
        let (steady, below) = match s.steady_temp_k {
            Some(t) => (format!("{t:.2}"), format!("{:+.2}", t - s.ambient_k)),
            None => ("-".into(), "-".into()),
        };
        writeln!(
            out,
            "{:>6} {:>11.1} {:>9.2} {:>14.2} {:>12} {:>14}",
            &s.time[11..16],
            s.sun_w_m2,
            s.ambient_k,
            s.net_w_m2,
            steady,
            below
        )?;
    }
    writeln!(out)?;
    writeln!(
        out,
        "{:<40} {:.4} kWh/m² (heating steps count negative)",
        "Net cooling at air temperature, day", r.cooling_kwh_m2
    )?;
    writeln!(out, "{:<40} {:.2} h", "Hours with steady temperature below air", r.hours_below_ambient)?;
    writeln!(out, "{DAY_NOTE}.")?;
    writeln!(out, "Caution: {DAY_CAUTION}")?;
    Ok(())
}

/// The caution printed with a day.
const DAY_CAUTION: &str = "a surface in sun can get hot enough to burn; roof work follows local codes and licensed \
                           practice.";

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
