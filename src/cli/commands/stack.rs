//! `glowgap stack`: a multi-junction stack of given band gaps, series or independent.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::options::{apply_common, connection, with_light_and_cell_options};
use crate::cli::shared::output::{print_json, warn, with_gaps_as_given, write_stack_table};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::stack::solve_stack;
use crate::report::stack::StackReport;
use crate::scenario::stack::StackScenario;
use crate::scenario::{CellScenario, Scenario, GAP_RANGE_EV};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "stack",
        valued: with_light_and_cell_options!("gaps", "connection"),
        flags: &["json", "link"],
        max_positional: 0,
    },
    about: "a multi-junction stack: efficiency and each subcell's currents and voltages",
    usage: "stack --gaps EV,EV[,...] [--connection C] [SOURCE AND CELL OPTIONS] [--json | --link]",
    docs: &[OptionDoc {
        name: "gaps",
        arg: "EV,EV,...",
        text: "2 to 6 band gaps in eV, top cell first (strictly descending), required",
    }],
    run,
};

/// `--gaps 1.8,1.1`: band gaps in eV, top first.
fn gap_list(p: &Parsed, command: &str) -> Result<Vec<f64>, String> {
    let Some(text) = p.text("gaps") else {
        return Err(format!(
            "'glowgap {command}' needs --gaps: the band gaps in eV, top cell first, separated by commas, e.g. --gaps 1.8,1.1"
        ));
    };
    text.split(',')
        .map(|t| {
            let t = t.trim();
            t.parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(|| {
                format!("--gaps '{text}': '{t}' is not a number; give band gaps in eV separated by commas, top first, e.g. --gaps 1.8,1.1")
            })
        })
        .collect()
}

/// `glowgap stack --gaps EV,EV[,...] [--connection ...] [SOURCE AND CELL OPTIONS] [--json | --link]`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let st = StackScenario { gaps_ev: gap_list(&p, "stack")?, connection: connection(&p)?, ..Default::default() };
    let mut sc = CellScenario {
        gap_ev: st.gaps_ev.first().copied().unwrap_or(1.34).clamp(GAP_RANGE_EV.0, GAP_RANGE_EV.1),
        ..Default::default()
    };
    apply_common(&p, &mut sc)?;
    let setup = st.to_physics(&sc)?;
    warn(&setup.warnings);
    if p.flag("link") {
        let scenario = Scenario { cell: sc, stack: st, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let r = solve_stack(&setup.light, &setup.cell, &setup.gaps_j, setup.connection);
    let report = with_gaps_as_given(StackReport::from(&r), &st.gaps_ev);
    if p.flag("json") {
        print_json(out, &report)
    } else {
        write_stack_table(out, &report, &setup.light.source.name(), &sc)?;
        Ok(())
    }
}
