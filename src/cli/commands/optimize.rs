//! `glowgap optimize`: the best band gaps of a stack of 1 to 6 junctions, optionally with
//! one gap held fixed.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::options::{apply_common, connection, real_absorber, with_light_and_cell_options};
use crate::cli::shared::output::{connection_words, print_json, warn, write_stack_extras, write_stack_table};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::stack::mixed::solve_mixed;
use crate::physics::stack::optimize::optimize as run_optimizer;
use crate::physics::stack::{solve_stack, StackResult};
use crate::report::stack::OptimumReport;
use crate::scenario::stack::{OptimizeSettings, StackScenario};
use crate::scenario::CellScenario;
use crate::scenario::{Connection, FixAt};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "optimize",
        valued: with_light_and_cell_options!(
            "junctions",
            "connection",
            "fix",
            "fix-at",
            "from",
            "to",
            "bottom",
            "light-trapping",
            "doping-type",
            "doping",
            "luminescent-coupling"
        ),
        flags: &["json"],
        max_positional: 0,
    },
    about: "the best band gaps of a stack of 1 to 6 junctions",
    usage: "optimize --junctions N [--connection C] [--fix EV [--fix-at any|top|bottom]]\n\
            [--from EV --to EV] [--bottom silicon:UM [--light-trapping MODEL]\n\
            [--doping-type n|p --doping CM3]] [--luminescent-coupling F] [SOURCE AND CELL OPTIONS] [--json]",
    docs: &[
        OptionDoc { name: "junctions", arg: "N", text: "number of junctions, 1 to 6, required" },
        OptionDoc {
            name: "fix",
            arg: "EV",
            text: "hold one band gap fixed, in eV, e.g. 1.12 for Si (default: every gap free)",
        },
        OptionDoc {
            name: "fix-at",
            arg: "WHERE",
            text: "with --fix: which subcell has the fixed gap, any (default) | top | bottom",
        },
        OptionDoc { name: "from", arg: "EV", text: "lowest band gap searched, in eV, default 0.2" },
        OptionDoc { name: "to", arg: "EV", text: "highest band gap searched, in eV, default 4.5" },
        OptionDoc {
            name: "bottom",
            arg: "MAT:UM",
            text: "a real bottom cell under the searched gaps, silicon:THICKNESS_UM or\n\
                   file:PATH:THICKNESS_UM; it counts in --junctions (default: none, every cell a step)",
        },
    ],
    run,
};

/// `glowgap optimize --junctions N [--connection ...] [--fix EV [--fix-at any|top|bottom]]
/// [--from EV --to EV] [SOURCE AND CELL OPTIONS] [--json]`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let n = p.required_number("junctions", "number of junctions", "1 to 6", "optimize")?;
    if !((1.0..=6.0).contains(&n) && n.fract() == 0.0) {
        return Err(Failure::Usage(format!("--junctions {n} is not usable; give a whole number from 1 to 6")));
    }
    let mut settings = OptimizeSettings {
        junctions: n as usize,
        fix_ev: p.number("fix", "fixed band gap", "eV")?,
        ..Default::default()
    };
    if let Some(a) = p.text("fix-at") {
        if settings.fix_ev.is_none() {
            return Err(Failure::Usage("--fix-at applies only with --fix EV (the gap held fixed)".into()));
        }
        settings.fix_at = match a.trim().to_ascii_lowercase().as_str() {
            "any" => FixAt::Any,
            "top" => FixAt::Top,
            "bottom" => FixAt::Bottom,
            _ => return Err(Failure::Usage(format!("--fix-at '{a}' is not known; use any (default), top or bottom"))),
        };
    }
    if let Some(a) = p.number("from", "lowest gap searched", "eV")? {
        settings.from_ev = a;
    }
    if let Some(b) = p.number("to", "highest gap searched", "eV")? {
        settings.to_ev = b;
    }
    let conn = connection(&p)?;
    let mut sc = CellScenario::default();
    apply_common(&p, &mut sc)?;
    let bottom = match p.text("bottom") {
        Some(t) => Some(real_absorber(&p, "bottom", t)?),
        None => {
            for o in ["light-trapping", "doping-type", "doping"] {
                if p.text(o).is_some() {
                    return Err(Failure::Usage(format!(
                        "--{o} applies to a real bottom cell; add one, e.g. --bottom silicon:300"
                    )));
                }
            }
            None
        }
    };
    let luminescent_coupling =
        p.number("luminescent-coupling", "luminescent coupling", "a fraction, 0 to 1")?.unwrap_or(0.0);
    if bottom.is_some() && settings.junctions < 2 {
        return Err(Failure::Usage(
            "--bottom is a junction too: give --junctions 2 or more (the bottom cell and one above it)".into(),
        ));
    }
    if bottom.is_some() && settings.fix_ev.is_some() {
        return Err(Failure::Usage("--bottom fixes the bottom cell already; leave out --fix".into()));
    }
    let st = StackScenario { bottom, luminescent_coupling, connection: conn, ..Default::default() };
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let extras = st.extras(&setup.light, setup.cell.temp_k)?;
    let problem = settings.to_problem_with(&setup.light, &setup.cell, conn, extras.clone())?;
    let best = run_optimizer(&problem);
    let stack_r = if !extras.is_plain() {
        solve_mixed(&setup.light, &setup.cell, &best.gaps_j, &extras, conn.into())
    } else if best.gaps_j.len() >= 2 {
        solve_stack(&setup.light, &setup.cell, &best.gaps_j, conn.into())
    } else {
        one_cell_stack(&setup, &best.gaps_j, conn)
    };
    let mut report = OptimumReport::new(&best, conn, settings.fix_ev, &stack_r);
    report.stack = report.stack.with_extras(&st);
    if p.flag("json") {
        return print_json(out, &report);
    }
    let gaps: Vec<String> = report.gaps_ev.iter().map(|g| format!("{g:.4}")).collect();
    writeln!(out, "{:<28} {} junction(s), {}", "Best stack", report.junctions, connection_words(conn))?;
    if let Some(f) = settings.fix_ev {
        writeln!(
            out,
            "{:<28} {f} eV ({})",
            "Fixed gap",
            match settings.fix_at {
                FixAt::Any => "anywhere",
                FixAt::Top => "top cell",
                FixAt::Bottom => "bottom cell",
            }
        )?;
    }
    writeln!(out, "{:<28} {} eV", "Gaps (top first)", gaps.join(", "))?;
    writeln!(out, "{:<28} {:.3} %", "Efficiency", report.efficiency * 100.0)?;
    writeln!(out, "{:<28} {}", "Evaluations", report.evaluations)?;
    writeln!(out)?;
    write_stack_table(out, &report.stack, &setup.light.source.name(), &sc)?;
    write_stack_extras(out, &report.stack)?;
    Ok(())
}

/// A one-junction "stack" (the single-junction optimum) in the stack result shape.
fn one_cell_stack(setup: &crate::scenario::CellSetup, gaps_j: &[f64], connection: Connection) -> StackResult {
    let Some(&g) = gaps_j.first() else {
        return StackResult { connection: connection.into(), input: setup.light.input_power(), ..Default::default() };
    };
    let mut r = solve_stack(&setup.light, &setup.cell, &[g], Connection::Independent.into());
    r.connection = connection.into();
    r
}
