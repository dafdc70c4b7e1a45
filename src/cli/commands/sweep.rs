//! `glowgap sweep`: one cell at every band gap of an even grid, with the best gap refined
//! between grid points.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the best
//! gap is `physics::junction::best_gap`, the search the page uses too.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::options::{apply_common, check_gap_grid, with_light_and_cell_options};
use crate::cli::shared::output::{json_text, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::constants::ev;
use crate::physics::junction::{best_gap, sweep, Cell, CellResult};
use crate::report::CellReport;
use crate::scenario::{CellScenario, GAP_RANGE_EV};
use std::io::Write;

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "sweep",
        valued: with_light_and_cell_options!("from", "to", "step"),
        flags: &["json", "csv", "best"],
        max_positional: 0,
    },
    about: "one cell at every band gap of a grid, and the best gap",
    usage: "sweep --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--best] [--json | --csv]",
    docs: &[
        OptionDoc { name: "from", arg: "EV", text: "first band gap of the grid in eV (0.01 to 20), required" },
        OptionDoc { name: "to", arg: "EV", text: "last band gap of the grid in eV (included), required" },
        OptionDoc { name: "step", arg: "EV", text: "grid step in eV, required; at most 100,000 points" },
        OptionDoc {
            name: "best",
            arg: "",
            text: "print only the best gap: the grid's best refined between its neighbours to\n\
                   1e-7 eV (default: every grid point, then the best)",
        },
        OptionDoc { name: "json", arg: "", text: "print JSON {\"points\": [...], \"best\": {...}} (default: a table)" },
        OptionDoc { name: "csv", arg: "", text: "print CSV, one line per gap, with a header line (default: a table)" },
    ],
    run,
};

fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let from = p.required_number("from", "first band gap", "eV", "sweep")?;
    let to = p.required_number("to", "last band gap", "eV", "sweep")?;
    let step = p.required_number("step", "band-gap step", "eV", "sweep")?;
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap sweep': choose one of --json and --csv".into()));
    }
    let intervals = check_gap_grid(from, to, step)?;
    let n = intervals as usize + 1;
    let mut sc = CellScenario { gap_ev: from, ..Default::default() };
    apply_common(&p, &mut sc)?;
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let gaps: Vec<f64> = (0..n)
        .map(|i| {
            let g = if i + 1 == n && n > 1 { from + intervals * step } else { from + i as f64 * step };
            ev(g.min(GAP_RANGE_EV.1))
        })
        .collect();
    let template = Cell { gap_j: gaps[0], ..setup.cell };
    let results = sweep(&setup.light, &template, &gaps);
    // the grid's best, refined between its neighbours (the rows stay the grid points)
    let best = best_gap(&setup.light, &template, &results).unwrap_or_default();
    write_sweep(out, &results, &best, p.flag("best"), p.flag("json"), p.flag("csv"))?;
    Ok(())
}

fn write_sweep(
    out: Out,
    results: &[CellResult],
    best: &CellResult,
    only_best: bool,
    json: bool,
    csv: bool,
) -> std::io::Result<()> {
    let best_r = CellReport::from(best);
    if json {
        let mut buf = std::io::BufWriter::new(out);
        if only_best {
            write!(buf, "{{\"best\":")?;
        } else {
            write!(buf, "{{\"points\":[")?;
            for (i, r) in results.iter().enumerate() {
                if i > 0 {
                    write!(buf, ",")?;
                }
                write!(buf, "{}", json_text(&CellReport::from(r)))?;
            }
            write!(buf, "],\"best\":")?;
        }
        write!(buf, "{}", json_text(&best_r))?;
        writeln!(buf, "}}")?;
        return buf.flush();
    }
    let mut buf = std::io::BufWriter::new(out);
    let rows: Box<dyn Iterator<Item = CellReport>> =
        if only_best { Box::new(std::iter::once(best_r)) } else { Box::new(results.iter().map(CellReport::from)) };
    if csv {
        writeln!(buf, "gap_ev,efficiency,jsc_ma_cm2,voc_v,ff,vmp_v,jmp_ma_cm2,pmax_w_m2,input_w_m2")?;
        for r in rows {
            writeln!(
                buf,
                "{},{},{},{},{},{},{},{},{}",
                r.gap_ev, r.efficiency, r.jsc_ma_cm2, r.voc_v, r.ff, r.vmp_v, r.jmp_ma_cm2, r.pmax_w_m2, r.input_w_m2
            )?;
        }
    } else {
        writeln!(
            buf,
            "{:>9} {:>9} {:>11} {:>8} {:>7} {:>8} {:>11} {:>10} {:>10}",
            "gap (eV)",
            "eff (%)",
            "Jsc (mA/cm²)",
            "Voc (V)",
            "FF",
            "Vmp (V)",
            "Jmp (mA/cm²)",
            "Pmax (W/m²)",
            "Pin (W/m²)"
        )?;
        for r in rows {
            writeln!(
                buf,
                "{:>9.4} {:>9.3} {:>12.4} {:>8.4} {:>7.4} {:>8.4} {:>12.4} {:>11.3} {:>10.2}",
                r.gap_ev,
                r.efficiency * 100.0,
                r.jsc_ma_cm2,
                r.voc_v,
                r.ff,
                r.vmp_v,
                r.jmp_ma_cm2,
                r.pmax_w_m2,
                r.input_w_m2
            )?;
        }
        if !only_best {
            writeln!(buf, "best: {:.4} eV, {:.3} %", best_r.gap_ev, best_r.efficiency * 100.0)?;
        }
    }
    buf.flush()
}
