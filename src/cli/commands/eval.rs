//! `glowgap eval`: the figures of a share link or a scenario file, as the page shows them:
//! the cell (step or measured absorptance), or with `--radiator` / `--stack` that part.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the
//! scenario is evaluated by the same printers as `cell`, `cool` and `stack`.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{io_reason, resolve_radiator_files};
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
    let scenario = load_scenario(what)?;
    let json = p.flag("json");
    if p.flag("radiator") {
        let mut sc = scenario.radiator;
        resolve_radiator_files(&mut sc, &Parsed::default())
            .map_err(|e| format!("the scenario's radiator cannot be read: {e}"))?;
        sc.to_physics().map_err(|e| format!("the scenario's radiator cannot be computed: {e}"))?;
        return print_radiator(&sc, json, None, out);
    }
    if p.flag("stack") {
        let setup = scenario
            .stack
            .to_physics(&scenario.cell)
            .map_err(|e| format!("the scenario's stack cannot be computed: {e}"))?;
        warn(&setup.warnings);
        let r = solve_stack(&setup.light, &setup.cell, &setup.gaps_j, setup.connection);
        let report = with_gaps_as_given(StackReport::from(&r), &scenario.stack.gaps_ev);
        if json {
            return print_json(out, &report);
        }
        write_stack_table(out, &report, &setup.light.source.name(), &scenario.cell)?;
        return Ok(());
    }
    let cannot = |f: Failure| match f {
        Failure::Usage(m) => Failure::Usage(format!("the scenario cannot be computed: {m}")),
        other => other,
    };
    if !scenario.stack.absorber.is_step() {
        return write_absorber_cell(&scenario, None, json, out).map_err(cannot);
    }
    print_cell(&scenario.cell, json, out).map_err(cannot)
}

fn load_scenario(what: &str) -> Result<crate::scenario::Scenario, String> {
    use crate::codec::{decode_link, from_json};
    let looks_like_link = |t: &str| {
        let t = t.trim();
        let versioned = t
            .strip_prefix('g')
            .and_then(|r| r.split_once('.'))
            .is_some_and(|(v, _)| !v.is_empty() && v.bytes().all(|b| b.is_ascii_digit()));
        t.contains('#') || versioned || t.starts_with("http://") || t.starts_with("https://")
    };
    let text = if what == "-" {
        let mut buf = String::new();
        std::io::Read::read_to_string(&mut std::io::stdin(), &mut buf)
            .map_err(|e| format!("cannot read standard input: {e}"))?;
        buf
    } else if looks_like_link(what) && !std::path::Path::new(what).exists() {
        return decode_link(what).map_err(|e| e.to_string());
    } else {
        let bytes = std::fs::read(what).map_err(|e| {
            format!(
                "cannot read scenario file '{what}': {}; give a share link, a scenario file or - for standard input",
                io_reason(&e)
            )
        })?;
        String::from_utf8_lossy(&bytes).into_owned()
    };
    let t = text.trim_start_matches('\u{feff}').trim();
    if t.starts_with('{') {
        from_json(t).map_err(|e| e.to_string())
    } else if t.is_empty() {
        Err("the input is empty; give a share link or a scenario file".into())
    } else {
        decode_link(t).map_err(|e| e.to_string())
    }
}
