//! `glowgap blackbody`: a black surface at one temperature: its peaks, total and photon
//! exitance and the power in a band of wavelengths, or its spectrum by Planck's law beside
//! Wien's and Rayleigh-Jeans' approximations as CSV.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; every
//! figure comes from `report::blackbody` (hence `physics::planck`).

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::output::print_json;
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::constants::{ev, wavelength_of_energy};
use crate::report::blackbody::{spectrum_row, BlackbodyReport};
use std::io::Write;

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "blackbody",
        valued: &["temp", "band", "from", "to", "step"],
        flags: &["json", "csv"],
        max_positional: 0,
    },
    about: "a black surface at one temperature: peaks, exitance, a band's power, or its spectrum",
    usage: "blackbody --temp K [--band UM-UM] [--json]\n\
            or: glowgap blackbody --temp K --from UM --to UM --step UM --csv",
    docs: &[
        OptionDoc {
            name: "temp",
            arg: "K",
            text: "the surface's temperature in kelvin, 1 to 1000000, required, e.g. --temp 1500",
        },
        OptionDoc {
            name: "band",
            arg: "UM-UM",
            text: "a band of wavelengths in micrometres, shorter first, e.g. --band 0.3-2.5: its\n\
                   exitance and its share of the total (default: no band)",
        },
        OptionDoc {
            name: "from",
            arg: "UM",
            text: "with --csv: the first wavelength of the table in micrometres, required there,\n\
                   e.g. --from 0.2",
        },
        OptionDoc {
            name: "to",
            arg: "UM",
            text: "with --csv: the last wavelength of the table in micrometres, required there,\n\
                   e.g. --to 20",
        },
        OptionDoc {
            name: "step",
            arg: "UM",
            text: "with --csv: the wavelength step in micrometres, required there, e.g. --step 0.01\n\
                   (both ends are included; at most 1000000 rows)",
        },
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON {\"temp_k\", \"peak_wavelength_um\", \"peak_energy_ev\", \"exitance_w_m2\",\n\
                   \"photon_exitance_m2_s\", and with --band \"band_exitance_w_m2\", \"band_fraction\"}",
        },
        OptionDoc {
            name: "csv",
            arg: "",
            text: "print the spectrum: wavelength_um and the hemispherical spectral exitance by\n\
                   Planck's law, Wien's and Rayleigh-Jeans' approximations (W/m2/um),\n\
                   a header line first",
        },
    ],
    run,
};

/// Temperatures taken [K]: from 1 K (below it the exitance underflows in every unit shown)
/// to 1e6 K (far beyond any emitter or star surface this is for).
const TEMP_RANGE_K: (f64, f64) = (1.0, 1e6);

/// The most rows of the spectrum table.
const MAX_ROWS: f64 = 1e6;

/// `glowgap blackbody --temp K [--band UM-UM] [--json]` or `... --from UM --to UM --step UM --csv`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let temp_k = p.required_number("temp", "surface temperature", "K", "blackbody")?;
    if !(TEMP_RANGE_K.0..=TEMP_RANGE_K.1).contains(&temp_k) {
        return Err(Failure::Usage(format!(
            "--temp {temp_k} K is out of range; give a temperature from {} to {} K, e.g. --temp 1500",
            TEMP_RANGE_K.0, TEMP_RANGE_K.1
        )));
    }
    let table = ["from", "to", "step"].iter().any(|k| p.text(k).is_some());
    if p.flag("csv") || table {
        return spectrum_csv(&p, temp_k, out);
    }
    let band = p.text("band").map(band_um).transpose()?;
    let report = BlackbodyReport::new(temp_k, band);
    if p.flag("json") {
        return print_json(out, &report);
    }
    let r = &report;
    writeln!(out, "{:<34} {} K", "Temperature", r.temp_k)?;
    writeln!(out, "{:<34} {:.4} um", "Peak per unit wavelength", r.peak_wavelength_um)?;
    writeln!(
        out,
        "{:<34} {:.4} eV ({:.4} um)",
        "Peak per unit energy",
        r.peak_energy_ev,
        wavelength_of_energy(ev(r.peak_energy_ev)) * 1e6
    )?;
    writeln!(out, "{:<34} {:.6e} W/m2", "Exitance (sigma T^4)", r.exitance_w_m2)?;
    writeln!(out, "{:<34} {:.6e} photons/(m2 s)", "Photon exitance", r.photon_exitance_m2_s)?;
    if let (Some((a, b)), Some(w), Some(f)) = (band, r.band_exitance_w_m2, r.band_fraction) {
        writeln!(out, "{:<34} {:.6e} W/m2, {:.4} % of the total", format!("Band {a}-{b} um"), w, f * 100.0)?;
    }
    // a surface hot enough to burn (above about 330 K, 57 C) or to glow
    if temp_k > 330.0 {
        writeln!(
            out,
            "Caution: a surface at {temp_k} K burns on contact, and a glowing one's radiation harms eyes and \
             skin; follow local codes and licensed practice when working near one."
        )?;
    }
    Ok(())
}

/// `--band A-B` [um]: two wavelengths, the shorter first.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a < b) on purpose: it also refuses NaN
fn band_um(text: &str) -> Result<(f64, f64), Failure> {
    let how = "give two wavelengths in micrometres, the shorter first, e.g. --band 0.3-2.5";
    // the dash between the numbers, not one of an exponent (2e-1)
    let bytes = text.as_bytes();
    let split = (1..bytes.len()).find(|&i| bytes[i] == b'-' && !matches!(bytes[i - 1], b'e' | b'E'));
    let Some(i) = split else {
        return Err(Failure::Usage(format!("--band '{text}' is not UM-UM; {how}")));
    };
    let number = |t: &str| t.trim().parse::<f64>().ok().filter(|v| v.is_finite());
    match (number(&text[..i]), number(&text[i + 1..])) {
        (Some(a), Some(b)) if a >= 0.0 && a < b => Ok((a, b)),
        (Some(a), Some(b)) if !(a < b) => {
            Err(Failure::Usage(format!("--band '{text}': {a} um is not shorter than {b} um; {how}")))
        }
        _ => Err(Failure::Usage(format!("--band '{text}' is not two wavelengths of 0 um or more; {how}"))),
    }
}

/// The spectrum table: `--from`, `--to`, `--step` [um] with `--csv`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn spectrum_csv(p: &Parsed, temp_k: f64, out: Out) -> Result<(), Failure> {
    if !p.flag("csv") {
        return Err(Failure::Usage(
            "--from, --to and --step make the spectrum table: add --csv (or drop them for the figures)".into(),
        ));
    }
    if p.flag("json") || p.text("band").is_some() {
        return Err(Failure::Usage(
            "--csv prints the spectrum alone: drop --json and --band, or drop --csv for the figures".into(),
        ));
    }
    let from = p.required_number("from", "first wavelength", "um", "blackbody --csv")?;
    let to = p.required_number("to", "last wavelength", "um", "blackbody --csv")?;
    let step = p.required_number("step", "wavelength step", "um", "blackbody --csv")?;
    if !(from > 0.0 && to >= from) {
        return Err(Failure::Usage(format!(
            "--from {from} --to {to}: give wavelengths above 0 um, the first not after the last, e.g. --from 0.2 --to 20"
        )));
    }
    if !(step > 0.0) {
        return Err(Failure::Usage(format!("--step {step} um is not usable; give a step above 0, e.g. --step 0.01")));
    }
    let intervals = ((to - from) / step * (1.0 + 1e-12)).floor();
    if !(intervals + 1.0 <= MAX_ROWS) {
        return Err(Failure::Usage(format!(
            "--from {from} --to {to} --step {step} would give {:.0} rows, more than {MAX_ROWS:.0}; give a larger --step",
            intervals + 1.0
        )));
    }
    let mut w = std::io::BufWriter::with_capacity(1 << 16, out);
    writeln!(w, "wavelength_um,planck_w_m2_um,wien_w_m2_um,rayleigh_jeans_w_m2_um")?;
    let mut row = |lambda: f64| -> std::io::Result<()> {
        let [l, planck, wien, rj] = spectrum_row(lambda, temp_k);
        writeln!(w, "{l},{planck},{wien},{rj}")
    };
    let n = intervals as u64;
    for i in 0..=n {
        row(from + step * i as f64)?;
    }
    // the last wavelength as given, when the steps do not land on it
    if from + step * (n as f64) < to * (1.0 - 1e-12) {
        row(to)?;
    }
    w.flush()?;
    Ok(())
}
