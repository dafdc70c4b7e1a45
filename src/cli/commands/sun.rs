//! `glowgap sun`: where the sun is at one place and moment and what light a cloudless sky
//! brings there: zenith, azimuth, incidence on a plane, air mass, the direct normal, diffuse
//! horizontal, global horizontal and plane-of-array irradiance (or their spectra as CSV),
//! and the day's sunrise, solar noon and sunset.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the place
//! is read by `shared::place` (the `clearsky:` keys' parser and checks), every figure comes
//! from `report::sun`.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::output::print_json;
use crate::cli::shared::place::{option_message, place_from_args, place_keys_with, PLACE_KEYS};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::site::moment;
use crate::physics::solar_position::{delta_t_estimate, sun_day};
use crate::report::sun::{spectrum_rows, SunReport, CLOUDLESS_NOTE, SPECTRUM_COLUMNS};
use crate::scenario::place::parse_time;

/// The place's options with `--time` after `--lon`.
const VALUED: [&str; PLACE_KEYS.len() + 1] = place_keys_with(["time"]);

pub const COMMAND: Command = Command {
    spec: Spec { command: "sun", valued: &VALUED, flags: &["json", "csv"], max_positional: 0 },
    about: "the sun's position and the clear-sky light at a place and moment, on a tilted plane",
    usage: "sun --lat DEG --lon DEG --time ISO8601 [--elevation M] [--pressure HPA]\n\
            [--air-temp C] [--delta-t S] [--tilt DEG] [--azimuth DEG] [--pwv CM]\n\
            [--ozone ATM_CM] [--aod500 TAU] [--angstrom ALPHA] [--albedo A]\n\
            [--sky-model isotropic|hay-davies] [--json | --csv]",
    docs: &[
        OptionDoc {
            name: "time",
            arg: "ISO8601",
            text: "the moment with its UTC offset, required, e.g. 2024-06-21T12:30+02:00 or ...Z",
        },
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON: zenith_deg, azimuth_deg, incidence_deg, air_mass (null with the sun\n\
                   down), direct_normal_w_m2, diffuse_horizontal_w_m2, global_horizontal_w_m2,\n\
                   plane_of_array_w_m2, sunrise, solar_noon, sunset, pressure_hpa, note, ...",
        },
        OptionDoc {
            name: "csv",
            arg: "",
            text: "print the spectra at the model's 122 wavelengths (300-4000 nm): wavelength_nm,\n\
                   direct_normal_w_m2_nm, diffuse_horizontal_w_m2_nm, plane_of_array_w_m2_nm,\n\
                   after # comment lines",
        },
    ],
    run,
};

/// `glowgap sun --lat DEG --lon DEG --time ISO8601 [place options] [--json | --csv]`.
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap sun': choose one of --json and --csv".into()));
    }
    let place = place_from_args(&p, "sun")?;
    let Some(time) = p.text("time") else {
        return Err(Failure::Usage(
            "'glowgap sun' needs --time: the moment with its UTC offset, e.g. --time 2024-06-21T12:30+02:00".into(),
        ));
    };
    let when = parse_time(time).map_err(|e| format!("--time: {e}"))?;
    let site = place.to_site()?;
    let delta_t = site.delta_t_s.unwrap_or_else(|| delta_t_estimate(when.decimal_year()));
    let worded = |e: String| match option_message(&e, "--", "") {
        same if same == e => format!("--time: {e}"),
        named => named,
    };
    let now = moment(&site, &when).map_err(worded)?;
    let day = sun_day(&when, &site.observer, delta_t).map_err(worded)?;
    let report = SunReport::new(&place, time, &now, &day, delta_t);
    if p.flag("json") {
        return print_json(out, &report);
    }
    if p.flag("csv") {
        writeln!(out, "# Glowgap: clear-sky spectra at {} deg N, {} deg E, {}", place.lat_deg, place.lon_deg, time)?;
        writeln!(
            out,
            "# plane tilt {} deg, azimuth {} deg from north, {} sky; zenith {:.5} deg",
            place.tilt_deg,
            place.azimuth_deg,
            place.sky_model.label(),
            report.zenith_deg
        )?;
        writeln!(out, "# wavelength in nm, spectral irradiance in W m^-2 nm^-1")?;
        writeln!(out, "# {CLOUDLESS_NOTE}")?;
        writeln!(out, "{SPECTRUM_COLUMNS}")?;
        for [l, dni, dhi, poa] in spectrum_rows(&now) {
            writeln!(out, "{l},{dni},{dhi},{poa}")?;
        }
        return Ok(());
    }
    for (label, value) in report.rows() {
        writeln!(out, "{label:<32} {value}")?;
    }
    writeln!(out, "{CLOUDLESS_NOTE}.")?;
    writeln!(
        out,
        "Caution: never look at the sun; sunlit surfaces get hot, and concentrated sunlight burns. Roof work \
         follows local codes and licensed practice."
    )?;
    Ok(())
}
