//! The commands themselves. Each builds a scenario from its options, lets the scenario
//! check itself, runs the physics and prints.

use super::args::{Parsed, Spec};
use crate::formats::spectrum_csv::{parse_spectrum_csv, AxisUnit, ColumnHints, ValueUnit};
use crate::physics::constants::ev;
use crate::physics::junction::{best_of, solve_cell, sweep, Cell, CellResult};
use crate::report::CellReport;
use crate::scenario::{CellScenario, Emission, JvModel, SourceSpec, TableSpec, GAP_RANGE_EV};
use std::io::Write;

pub enum Failure {
    /// bad input: one line for stderr
    Usage(String),
    /// stdout went away
    Output,
}

impl From<String> for Failure {
    fn from(s: String) -> Self {
        Failure::Usage(s)
    }
}

impl From<std::io::Error> for Failure {
    fn from(_: std::io::Error) -> Self {
        Failure::Output
    }
}

type Out<'a> = &'a mut dyn Write;

/// The valued options of a command followed by the light-source and cell options that
/// [`apply_common`] reads, so that every command accepts exactly the options it applies.
macro_rules! with_light_and_cell_options {
    ($($own:expr),* $(,)?) => {
        &[$($own,)* "spectrum", "spectrum-axis", "spectrum-values", "spectrum-column",
          "concentration", "cell-temp", "ere", "emission", "approx"]
    };
}
pub(super) use with_light_and_cell_options;

// measured or modelled absorptance options (eqe, urbach, measured-voc) are read in stack.rs
const CELL_VALUED: &[&str] = with_light_and_cell_options!("gap", "eqe", "urbach", "measured-voc");
const SWEEP_VALUED: &[&str] = with_light_and_cell_options!("from", "to", "step");

pub fn dispatch(args: &[String], out: Out) -> Result<(), Failure> {
    let Some(cmd) = args.first() else {
        write!(out, "{}", super::USAGE)?;
        return Err(Failure::Usage("no command given; try 'glowgap cell --gap 1.34' or 'glowgap help'".into()));
    };
    let rest = &args[1..];
    match cmd.as_str() {
        "cell" => cell(rest, out),
        "sweep" => sweep_cmd(rest, out),
        "eval" => eval_cmd(rest, out),
        "cool" => super::cool::cool(rest, out),
        // multi-junction stacks, measured cells, mismatch and losses (stack.rs)
        "stack" => super::stack::stack(rest, out),
        "optimize" => super::stack::optimize(rest, out),
        "mismatch" => super::stack::mismatch(rest, out),
        "losses" => super::stack::losses(rest, out),
        "help" | "--help" | "-h" => {
            write!(out, "{}", super::USAGE)?;
            Ok(())
        }
        "version" | "--version" | "-V" => {
            writeln!(out, "glowgap {}", env!("CARGO_PKG_VERSION"))?;
            Ok(())
        }
        other => Err(Failure::Usage(format!(
            "unknown command '{other}'; commands are: cell, sweep, eval, cool, stack, optimize, mismatch, losses, help, version"
        ))),
    }
}

/// Options shared by `cell` and `sweep`, applied onto a scenario.
pub(super) fn apply_common(p: &Parsed, sc: &mut CellScenario) -> Result<(), String> {
    if let Some(s) = p.text("spectrum") {
        sc.spectrum = SourceSpec::parse(s)?;
    }
    if let Some(x) = p.number("concentration", "concentration", "suns")? {
        sc.concentration = x;
    }
    if let Some(t) = p.number("cell-temp", "cell temperature", "K")? {
        sc.cell_temp_k = t;
    }
    if let Some(e) = p.number("ere", "external radiative efficiency", "a fraction above 0, at most 1")? {
        sc.ere = e;
    }
    if let Some(e) = p.text("emission") {
        sc.emission = match e.to_ascii_lowercase().as_str() {
            "front" => Emission::Front,
            "both" => Emission::Both,
            _ => return Err(format!("--emission '{e}' is not known; use front (perfect back mirror) or both")),
        };
    }
    if let Some(a) = p.text("approx") {
        sc.approx = match a.to_ascii_lowercase().as_str() {
            "exact" => JvModel::Exact,
            "boltzmann" => JvModel::Boltzmann,
            _ => return Err(format!("--approx '{a}' is not known; use exact or boltzmann")),
        };
    }
    let has_hints =
        p.text("spectrum-axis").is_some() || p.text("spectrum-values").is_some() || p.text("spectrum-column").is_some();
    if let SourceSpec::File { path } = &sc.spectrum {
        sc.spectrum = read_spectrum_file(path, p)?;
    } else if has_hints {
        return Err(
            "--spectrum-axis, --spectrum-values and --spectrum-column apply only to --spectrum file:PATH".into()
        );
    }
    Ok(())
}

/// Read and parse a spectrum file into a table carried by the scenario.
pub fn read_spectrum_file(path: &str, p: &Parsed) -> Result<SourceSpec, String> {
    let mut hints = ColumnHints::default();
    if let Some(a) = p.text("spectrum-axis") {
        hints.axis = Some(
            AxisUnit::parse(a).ok_or_else(|| format!("--spectrum-axis '{a}' is not known; use nm, um, eV or cm-1"))?,
        );
    }
    if let Some(v) = p.text("spectrum-values") {
        hints.value = Some(ValueUnit::parse(v).ok_or_else(|| {
            format!("--spectrum-values '{v}' is not known; use e.g. W/m2/nm, W/m2/um, W/m2/eV, W/m2/cm-1 or photons/m2/s/nm")
        })?);
    }
    if let Some(c) = p.text("spectrum-column") {
        let n: usize = c.trim().parse().ok().filter(|n| *n >= 1).ok_or_else(|| {
            format!("--spectrum-column '{c}' is not a column number; give 1 for the first value column after the axis")
        })?;
        hints.column = Some(n);
    }
    let bytes = std::fs::read(path).map_err(|e| format!("cannot read spectrum file '{path}': {}", io_reason(&e)))?;
    let text = String::from_utf8_lossy(&bytes);
    let name = std::path::Path::new(path)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| path.to_string());
    let s = parse_spectrum_csv(&text, &hints, &name).map_err(|e| format!("spectrum file '{path}': {e}"))?;
    Ok(SourceSpec::Table(TableSpec {
        name,
        axis: s.axis().into(),
        quantity: s.quantity().into(),
        x: s.coordinates().to_vec(),
        y: s.values().to_vec(),
    }))
}

pub(super) fn io_reason(e: &std::io::Error) -> String {
    match e.kind() {
        std::io::ErrorKind::NotFound => "no such file; check the path".into(),
        std::io::ErrorKind::PermissionDenied => "permission denied".into(),
        _ => e.to_string(),
    }
}

pub(super) fn warn(warnings: &[String]) {
    for w in warnings {
        eprintln!("glowgap: warning: {w}");
    }
}

fn cell(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "cell", valued: CELL_VALUED, flags: &["json", "link"], max_positional: 0 };
    let p = spec.parse(args)?;
    let mut sc = CellScenario { gap_ev: super::stack::cell_gap(&p)?, ..Default::default() };
    apply_common(&p, &mut sc)?;
    if super::stack::wants_absorber(&p) {
        return super::stack::cell_with_absorber(&p, sc, out); // measured or modelled absorptance
    }
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    if p.flag("link") {
        // the share-link fragment of this scenario, to append to the app's address
        let scenario = crate::scenario::Scenario { cell: sc, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let r = solve_cell(&setup.light, &setup.cell);
    let report = CellReport::from(&r);
    if p.flag("json") {
        serde_json::to_writer(&mut *out, &report).map_err(|_| Failure::Output)?;
        writeln!(out)?;
    } else {
        write_cell_table(out, &report, &setup.light.source.name(), &sc)?;
    }
    Ok(())
}

pub fn write_cell_table(out: Out, r: &CellReport, source: &str, sc: &CellScenario) -> std::io::Result<()> {
    writeln!(out, "{:<28} {:.4} eV", "Band gap", r.gap_ev)?;
    let suns = if sc.concentration == 1.0 { "1 sun".to_string() } else { format!("{} suns", sc.concentration) };
    writeln!(out, "{:<28} {} at {}", "Source", source, suns)?;
    writeln!(
        out,
        "{:<28} {} K, ERE {}, {} emission, {} J-V",
        "Cell",
        sc.cell_temp_k,
        sc.ere,
        match sc.emission {
            Emission::Front => "front",
            Emission::Both => "two-face",
        },
        match sc.approx {
            JvModel::Exact => "exact",
            JvModel::Boltzmann => "Boltzmann",
        }
    )?;
    for (hook, label, _) in crate::report::CELL_METRICS {
        writeln!(out, "{:<28} {}", label, r.display(hook))?;
    }
    writeln!(out, "{:<28} {:.2} W/m²", "Maximum power", r.pmax_w_m2)?;
    Ok(())
}

/// The most points one sweep may have.
const MAX_SWEEP_POINTS: usize = 2_000_000;

fn sweep_cmd(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "sweep", valued: SWEEP_VALUED, flags: &["json", "csv", "best"], max_positional: 0 };
    let p = spec.parse(args)?;
    let from = p.required_number("from", "first band gap", "eV", "sweep")?;
    let to = p.required_number("to", "last band gap", "eV", "sweep")?;
    let step = p.required_number("step", "band-gap step", "eV", "sweep")?;
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap sweep': choose one of --json and --csv".into()));
    }
    if !(step > 0.0) {
        return Err(Failure::Usage(format!("--step {step} must be positive, e.g. --step 0.01 (eV)")));
    }
    if from > to {
        return Err(Failure::Usage(format!("--from {from} is above --to {to}; give the lower gap first")));
    }
    for (name, v) in [("from", from), ("to", to)] {
        if v < GAP_RANGE_EV.0 || v > GAP_RANGE_EV.1 {
            return Err(Failure::Usage(format!(
                "--{name} {v} eV is out of range; band gaps go from {} to {} eV",
                GAP_RANGE_EV.0, GAP_RANGE_EV.1
            )));
        }
    }
    let intervals = ((to - from) / step).round();
    if intervals + 1.0 > MAX_SWEEP_POINTS as f64 {
        return Err(Failure::Usage(format!(
            "that sweep has {} points; the most is {MAX_SWEEP_POINTS}: use a larger --step",
            intervals + 1.0
        )));
    }
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
    let best = best_of(&results).unwrap_or_default();
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
                serde_json::to_writer(&mut buf, &CellReport::from(r)).map_err(std::io::Error::other)?;
            }
            write!(buf, "],\"best\":")?;
        }
        serde_json::to_writer(&mut buf, &best_r).map_err(std::io::Error::other)?;
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

/// Read a share link, a scenario file or standard input, and print what the page shows.
fn eval_cmd(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "eval", valued: &[], flags: &["json", "radiator", "stack"], max_positional: 1 };
    let p = spec.parse(args)?;
    let Some(what) = p.positional.first() else {
        return Err(Failure::Usage(
            "'glowgap eval' needs a share link, a scenario file or - for standard input, e.g. glowgap eval 'http://127.0.0.1:8080/#g1.…'".into(),
        ));
    };
    // the radiator part of the scenario instead of the cell (see cool.rs)
    if p.flag("radiator") {
        return super::cool::eval_radiator(what, p.flag("json"), out);
    }
    // the stack part of the scenario instead of the cell (see stack.rs)
    if p.flag("stack") {
        return super::stack::eval_stack(what, p.flag("json"), out);
    }
    let scenario = load_scenario(what)?;
    if !scenario.stack.absorber.is_step() {
        return super::stack::eval_absorber(&scenario, p.flag("json"), out); // see stack.rs
    }
    let setup = scenario.cell.to_physics().map_err(|e| format!("the scenario cannot be computed: {e}"))?;
    warn(&setup.warnings);
    let r = solve_cell(&setup.light, &setup.cell);
    let report = CellReport::from(&r);
    if p.flag("json") {
        serde_json::to_writer(&mut *out, &report).map_err(|_| Failure::Output)?;
        writeln!(out)?;
    } else {
        write_cell_table(out, &report, &setup.light.source.name(), &scenario.cell)?;
    }
    Ok(())
}

pub(super) fn load_scenario(what: &str) -> Result<crate::scenario::Scenario, String> {
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
