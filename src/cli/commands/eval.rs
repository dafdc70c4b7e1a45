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
    print_cell, print_json, print_radiator, warn, with_gaps_as_given, write_absorber_cell, write_stack_table,
};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::stack::solve_stack;
use crate::report::stack::StackReport;

pub const COMMAND: Command = Command {
    spec: Spec { command: "eval", valued: &[], flags: &["json", "radiator", "stack"], max_positional: 1 },
    about: "the figures of a share link or scenario file (- = standard input), as the page shows them",
    usage: "eval LINK|FILE|- [--json] [--radiator | --stack]",
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
    if p.flag("radiator") && p.flag("stack") {
        return Err(Failure::Usage("'glowgap eval': choose one of --radiator and --stack".into()));
    }
    let (scenario, warnings) = open_scenario(what)?;
    warn(&warnings);
    let json = p.flag("json");
    if p.flag("radiator") {
        return print_radiator(&scenario.radiator, json, None, out);
    }
    if p.flag("stack") {
        let setup = scenario.stack.to_physics(&scenario.cell)?;
        let r = solve_stack(&setup.light, &setup.cell, &setup.gaps_j, setup.connection);
        let report = with_gaps_as_given(StackReport::from(&r), &scenario.stack.gaps_ev);
        if json {
            return print_json(out, &report);
        }
        write_stack_table(out, &report, &setup.light.source.name(), &scenario.cell)?;
        return Ok(());
    }
    if !scenario.stack.absorber.is_step() {
        return write_absorber_cell(&scenario, None, json, out);
    }
    print_cell(&scenario.cell, json, out)
}
