//! `glowgap eval`: the figures of a share link or a scenario file, as the page shows them:
//! the cell (step or measured absorptance), or with `--radiator` / `--stack` that part.
//!
//! The input is opened by `cli::shared::files::open_scenario` (decoded, the radiator's data
//! files read, the whole scenario checked), so a link or file that opens here is one every
//! panel of the page can compute, and its warnings are printed once.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the
//! scenario is evaluated by the same printers as `cell`, `cool` and `stack`.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::files::open_scenario;
use crate::cli::shared::output::{
    print_cell, print_json, print_radiator, warn, with_gaps_as_given, write_absorber_cell, write_stack_extras,
    write_stack_table,
};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::tpv::Tpv;
use crate::report::blackbody::BlackbodyReport;
use crate::report::hot::{AbsorberReport, TpvReport};
use crate::report::stack::StackReport;

/// A report as JSON, or as its rows of label and value.
fn print_rows<T: serde::Serialize>(
    out: Out,
    report: &T,
    json: bool,
    rows: impl Fn(&T) -> Vec<(&'static str, String)>,
) -> Result<(), Failure> {
    if json {
        return print_json(out, report);
    }
    for (label, value) in rows(report) {
        writeln!(out, "{label:<32} {value}")?;
    }
    Ok(())
}

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "eval",
        valued: &[],
        flags: &["json", "radiator", "stack", "tpv", "absorber", "blackbody"],
        max_positional: 1,
    },
    about: "the figures of a share link or scenario file (- = standard input), as the page shows them",
    usage: "eval LINK|FILE|- [--json] [--radiator | --stack | --tpv | --absorber | --blackbody]",
    docs: &[
        OptionDoc {
            name: "radiator",
            arg: "",
            text: "the scenario's radiator (Radiator tab) instead of its cell (default: the cell)",
        },
        OptionDoc {
            name: "stack",
            arg: "",
            text: "the scenario's stack (Stack tab) instead of its cell (default: the cell)",
        },
        OptionDoc {
            name: "tpv",
            arg: "",
            text: "the scenario's thermophotovoltaic pair (Hot emitters tab) instead of its cell\n\
                   (default: the cell)",
        },
        OptionDoc {
            name: "absorber",
            arg: "",
            text: "the scenario's solar-thermal absorber (Hot emitters tab) instead of its cell\n\
                   (default: the cell)",
        },
        OptionDoc {
            name: "blackbody",
            arg: "",
            text: "the scenario's blackbody card (Hot emitters tab) instead of its cell\n\
                   (default: the cell)",
        },
    ],
    run,
};

/// Read a share link, a scenario file or standard input, and print what the page shows.
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let Some(what) = p.positional.first() else {
        return Err(Failure::Usage(
            "'glowgap eval' needs a share link, a scenario file or - for standard input, e.g. glowgap eval 'http://127.0.0.1:8080/#g1.…'".into(),
        ));
    };
    let parts = ["radiator", "stack", "tpv", "absorber", "blackbody"];
    if parts.iter().filter(|f| p.flag(f)).count() > 1 {
        return Err(Failure::Usage(
            "'glowgap eval': choose one of --radiator, --stack, --tpv, --absorber and --blackbody".into(),
        ));
    }
    let (scenario, warnings) = open_scenario(what)?;
    warn(&warnings);
    let json = p.flag("json");
    if p.flag("radiator") {
        return print_radiator(&scenario.radiator, json, None, out);
    }
    if p.flag("stack") {
        let setup = scenario.stack.to_physics(&scenario.cell)?;
        let r = setup.solve();
        let report = with_gaps_as_given(StackReport::from(&r), &scenario.stack.gaps_ev).with_extras(&scenario.stack);
        if json {
            return print_json(out, &report);
        }
        write_stack_table(out, &report, &setup.light.source.name(), &scenario.cell)?;
        write_stack_extras(out, &report)?;
        return Ok(());
    }
    if p.flag("tpv") {
        let inputs = scenario.hot.tpv.to_physics()?;
        let r = Tpv::new(&inputs.setup).solve(&inputs.gaps_j, inputs.connection);
        return print_rows(out, &TpvReport::new(&r), json, |r| r.rows());
    }
    if p.flag("absorber") {
        let (setup, surface, temp_k, _) = scenario.hot.absorber.to_physics()?;
        return print_rows(out, &AbsorberReport::at(&setup, &surface, temp_k), json, |r| r.rows());
    }
    if p.flag("blackbody") {
        let b = &scenario.hot.blackbody;
        let report = BlackbodyReport::new(b.temp_k, b.band_um.map(|[a, c]| (a, c)));
        if json {
            return print_json(out, &report);
        }
        writeln!(out, "{:<32} {} K", "Temperature", report.temp_k)?;
        writeln!(out, "{:<32} {:.4} um", "Peak per unit wavelength", report.peak_wavelength_um)?;
        writeln!(out, "{:<32} {:.4} eV", "Peak per unit energy", report.peak_energy_ev)?;
        writeln!(out, "{:<32} {:.6e} W/m2", "Exitance (sigma T^4)", report.exitance_w_m2)?;
        writeln!(out, "{:<32} {:.6e} photons/(m2 s)", "Photon exitance", report.photon_exitance_m2_s)?;
        if let (Some([a, c]), Some(w), Some(f)) = (b.band_um, report.band_exitance_w_m2, report.band_fraction) {
            writeln!(out, "{:<32} {w:.6e} W/m2, {:.4} % of the total", format!("Band {a}-{c} um"), f * 100.0)?;
        }
        return Ok(());
    }
    if !scenario.stack.absorber.is_step() {
        return write_absorber_cell(&scenario, None, json, out);
    }
    print_cell(&scenario.cell, json, out)
}
