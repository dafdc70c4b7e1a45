//! `glowgap losses`: where the incident power of a single cell goes (below-gap,
//! thermalization, emission, Carnot, Boltzmann, delivered), at one gap or against the gap.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Spec};
use crate::cli::shared::options::{apply_common, check_gap_grid, with_light_and_cell_options};
use crate::cli::shared::output::{cell_line, print_json, suns, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::constants::ev;
use crate::physics::losses::{loss_breakdown, loss_sweep};
use crate::report::stack::LossReport;
use crate::scenario::CellScenario;
use std::io::Write;

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "losses",
        valued: with_light_and_cell_options!("gap", "from", "to", "step"),
        flags: &["json", "csv"],
        max_positional: 0,
    },
    about: "where a single cell's incident power goes, at one gap or against the gap",
    usage: "losses --gap EV | --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--json | --csv]",
    docs: &[
        OptionDoc { name: "gap", arg: "EV", text: "one band gap in eV; or give --from, --to and --step" },
        OptionDoc { name: "from", arg: "EV", text: "first band gap of a table against the gap, in eV" },
        OptionDoc { name: "to", arg: "EV", text: "last band gap of the table, in eV (included)" },
        OptionDoc { name: "step", arg: "EV", text: "step of the table in eV; at most 100,000 points" },
    ],
    run,
};

/// `glowgap losses --gap EV | --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--json | --csv]`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap losses': choose one of --json and --csv".into()));
    }
    let range = [
        p.number("from", "first band gap", "eV")?,
        p.number("to", "last band gap", "eV")?,
        p.number("step", "band-gap step", "eV")?,
    ];
    let gap = p.number("gap", "band gap", "eV")?;
    let gaps_ev: Vec<f64> = match (gap, range) {
        (Some(g), [None, None, None]) => vec![g],
        (None, [Some(a), Some(b), Some(s)]) => {
            let n = check_gap_grid(a, b, s)?;
            (0..=n as usize).map(|i| if i == n as usize { b } else { a + s * i as f64 }).collect()
        }
        _ => {
            return Err(Failure::Usage(
                "'glowgap losses' needs --gap EV, or --from EV --to EV --step EV for a table against the gap".into(),
            ))
        }
    };
    let mut sc = CellScenario { gap_ev: gaps_ev[0], ..Default::default() };
    apply_common(&p, &mut sc)?;
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    if gap.is_some() {
        let report = LossReport::from(&loss_breakdown(&setup.light, &setup.cell));
        if p.flag("json") {
            return print_json(out, &report);
        }
        if p.flag("csv") {
            return write_loss_csv(out, &[report]);
        }
        writeln!(
            out,
            "Band gap {:.4} eV, {} at {}, {}",
            report.gap_ev,
            setup.light.source.name(),
            suns(sc.concentration),
            cell_line(&sc)
        )?;
        writeln!(out, "{:<32} {:>12} {:>8}", "", "W/m²", "%")?;
        let pct = |v: f64| if report.input_w_m2 > 0.0 { 100.0 * v / report.input_w_m2 } else { 0.0 };
        for (label, v) in report.parts() {
            writeln!(out, "{label:<32} {v:>12.3} {:>8.2}", pct(v))?;
            if v.to_bits() == report.emission_w_m2.to_bits() && report.nonradiative_w_m2 > 0.0 {
                let nr = report.nonradiative_w_m2;
                writeln!(out, "{:<32} {nr:>12.3} {:>8.2}", "  of which non-radiative", pct(nr))?;
            }
        }
        writeln!(out, "{:<32} {:>12.3} {:>8.2}", "Sum", report.sum_w_m2, pct(report.sum_w_m2))?;
        writeln!(out, "{:<32} {:>12.3}", "Incident power", report.input_w_m2)?;
        writeln!(
            out,
            "Carnot factor with a {} K source; etendue ratio {:.6e}",
            report.source_temp_k, report.etendue_ratio
        )?;
        return Ok(());
    }
    let gaps_j: Vec<f64> = gaps_ev.iter().map(|&g| ev(g)).collect();
    let rows: Vec<LossReport> = loss_sweep(&setup.light, &setup.cell, &gaps_j).iter().map(LossReport::from).collect();
    if p.flag("json") {
        return print_json(out, &serde_json::json!({ "points": rows }));
    }
    write_loss_csv(out, &rows)
}

fn write_loss_csv(out: Out, rows: &[LossReport]) -> Result<(), Failure> {
    let mut buf = std::io::BufWriter::new(out);
    writeln!(buf, "gap_ev,input_w_m2,below_gap_w_m2,thermalization_w_m2,emission_w_m2,carnot_w_m2,boltzmann_w_m2,delivered_w_m2,sum_w_m2,efficiency,nonradiative_w_m2")?;
    for r in rows {
        writeln!(
            buf,
            "{},{},{},{},{},{},{},{},{},{},{}",
            r.gap_ev,
            r.input_w_m2,
            r.below_gap_w_m2,
            r.thermalization_w_m2,
            r.emission_w_m2,
            r.carnot_w_m2,
            r.boltzmann_w_m2,
            r.delivered_w_m2,
            r.sum_w_m2,
            r.efficiency,
            r.nonradiative_w_m2
        )?;
    }
    buf.flush()?;
    Ok(())
}
