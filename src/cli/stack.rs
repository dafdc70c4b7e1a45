//! The stack commands: `stack`, `optimize`, `mismatch` and `losses`, the measured or
//! modelled absorptance of `cell --eqe/--urbach`, and `eval --stack`. Each builds the
//! scenario from its options, lets the scenario check itself, runs the physics and prints a
//! table or JSON (keys from `report::stack`).

use super::args::{Parsed, Spec};
use super::commands::{apply_common, io_reason, load_scenario, read_spectrum_file, warn, write_cell_table, Failure};
use crate::formats::eqe_csv::parse_eqe_csv;
use crate::physics::absorber::{ere_from_voc, solve_absorber, AbsorptanceTable};
use crate::physics::constants::ev;
use crate::physics::losses::{loss_breakdown, loss_sweep};
use crate::physics::mismatch::mismatch_factor;
use crate::physics::stack::optimize::optimize as run_optimizer;
use crate::physics::stack::{solve_stack, Connection, StackResult};
use crate::report::stack::{AbsorberReport, LossReport, MismatchReport, OptimumReport, StackReport};
use crate::scenario::stack::{AbsorberSpec, EqeTableSpec, MismatchSettings, OptimizeSettings, StackScenario};
use crate::scenario::{CellScenario, Emission, FixAt, JvModel, Scenario, SourceSpec, GAP_RANGE_EV};
use std::io::Write;

type Out<'a> = &'a mut dyn Write;

/// Options of each command: its own, then the source and cell options of `cell` and `sweep`.
const STACK_VALUED: &[&str] = super::commands::with_light_and_cell_options!("gaps", "connection");
const OPTIMIZE_VALUED: &[&str] =
    super::commands::with_light_and_cell_options!("junctions", "connection", "fix", "fix-at", "from", "to");
const LOSSES_VALUED: &[&str] = super::commands::with_light_and_cell_options!("gap", "from", "to", "step");

fn print_json<T: serde::Serialize>(out: Out, v: &T) -> Result<(), Failure> {
    serde_json::to_writer(&mut *out, v).map_err(|_| Failure::Output)?;
    writeln!(out)?;
    Ok(())
}

/// `--connection series|independent`.
fn connection(p: &Parsed) -> Result<Connection, String> {
    match p.text("connection").map(|c| c.trim().to_ascii_lowercase()) {
        None => Ok(Connection::Series),
        Some(c) => match c.as_str() {
            "series" | "two-terminal" | "2t" => Ok(Connection::Series),
            "independent" | "multi-terminal" | "4t" => Ok(Connection::Independent),
            _ => Err(format!(
                "--connection '{c}' is not known; use series (two-terminal, one current) or independent (multi-terminal)"
            )),
        },
    }
}

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

fn suns(x: f64) -> String {
    if x == 1.0 {
        "1 sun".into()
    } else {
        format!("{x} suns")
    }
}

fn cell_line(sc: &CellScenario) -> String {
    format!(
        "{} K, ERE {}, {} emission, {} J-V",
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
    )
}

fn connection_words(c: Connection) -> &'static str {
    match c {
        Connection::Series => "series (two-terminal)",
        Connection::Independent => "independent (multi-terminal)",
    }
}

/// The report with the gaps as the user typed them (eV to J and back may change the last
/// digit).
fn with_gaps_as_given(mut r: StackReport, gaps_ev: &[f64]) -> StackReport {
    for (i, s) in r.subcells.iter_mut().enumerate() {
        s.gap_ev = gaps_ev.get(i).copied().unwrap_or(s.gap_ev);
        s.upper_gap_ev = if i == 0 { None } else { gaps_ev.get(i - 1).copied().or(s.upper_gap_ev) };
    }
    r
}

/// The stack as a table.
fn write_stack_table(out: Out, r: &StackReport, source: &str, sc: &CellScenario) -> std::io::Result<()> {
    writeln!(out, "{:<28} {} junctions, {}", "Stack", r.subcells.len(), connection_words(r.connection.into()))?;
    writeln!(out, "{:<28} {} at {}", "Source", source, suns(sc.concentration))?;
    writeln!(out, "{:<28} {}", "Cells", cell_line(sc))?;
    // the headline figures as the stack panel shows them (report::stack::STACK_METRICS)
    writeln!(out, "{:<28} {}", "Efficiency", r.display("stack-efficiency"))?;
    writeln!(out, "{:<28} {}", "Open-circuit voltage Voc", r.display("stack-voc"))?;
    writeln!(out, "{:<28} {}", r.label("stack-jsc"), r.display("stack-jsc"))?;
    writeln!(out, "{:<28} {}", "Maximum power", r.display("stack-pmax"))?;
    writeln!(out, "{:<28} {}", "Incident power", r.display("stack-input"))?;
    writeln!(out)?;
    writeln!(
        out,
        "{:>9} {:>9} {:>12} {:>13} {:>8} {:>12} {:>8} {:>10} {:>13}",
        "subcell",
        "gap (eV)",
        "band to (eV)",
        "Jsc (mA/cm²)",
        "Voc (V)",
        "J (mA/cm²)",
        "V (V)",
        "P (W/m²)",
        "excess Jsc"
    )?;
    for (i, s) in r.subcells.iter().enumerate() {
        let name = if i == 0 { format!("{} top", i + 1) } else { format!("{}", i + 1) };
        let upper = s.upper_gap_ev.map(|u| format!("{u:.4}")).unwrap_or_else(|| "-".into());
        writeln!(
            out,
            "{:>9} {:>9.4} {:>12} {:>13.4} {:>8.4} {:>12.4} {:>8.4} {:>10.3} {:>13.4}",
            name, s.gap_ev, upper, s.jsc_ma_cm2, s.voc_v, s.j_ma_cm2, s.v_v, s.pmax_w_m2, s.excess_jsc_ma_cm2
        )?;
    }
    if let Some(l) = r.limiting_subcell {
        writeln!(out, "limiting subcell (smallest Jsc): {l}{}", if l == 1 { " (top)" } else { "" })?;
    }
    Ok(())
}

/// `glowgap stack --gaps EV,EV[,...] [--connection ...] [SOURCE AND CELL OPTIONS] [--json | --link]`
pub fn stack(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "stack", valued: STACK_VALUED, flags: &["json", "link"], max_positional: 0 };
    let p = spec.parse(args)?;
    let st =
        StackScenario { gaps_ev: gap_list(&p, "stack")?, connection: connection(&p)?.into(), ..Default::default() };
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

/// `glowgap optimize --junctions N [--connection ...] [--fix EV [--fix-at any|top|bottom]]
/// [--from EV --to EV] [SOURCE AND CELL OPTIONS] [--json]`
pub fn optimize(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "optimize", valued: OPTIMIZE_VALUED, flags: &["json"], max_positional: 0 };
    let p = spec.parse(args)?;
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
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let problem = settings.to_problem(&setup.light, &setup.cell, conn)?;
    let best = run_optimizer(&problem);
    let stack_r = if best.gaps_j.len() >= 2 {
        solve_stack(&setup.light, &setup.cell, &best.gaps_j, conn)
    } else {
        one_cell_stack(&setup, &best.gaps_j, conn)
    };
    let report = OptimumReport::new(&best, conn, settings.fix_ev, &stack_r);
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
    Ok(())
}

/// A one-junction "stack" (the single-junction optimum) in the stack result shape.
fn one_cell_stack(setup: &crate::scenario::CellSetup, gaps_j: &[f64], connection: Connection) -> StackResult {
    let Some(&g) = gaps_j.first() else {
        return StackResult { connection, input: setup.light.input_power(), ..Default::default() };
    };
    let mut r = solve_stack(&setup.light, &setup.cell, &[g], Connection::Independent);
    r.connection = connection;
    r
}

/// An EQE file given as `file:PATH` (or a bare path).
fn read_eqe_file(spec: &str, option: &str) -> Result<AbsorptanceTable, String> {
    let path = match (spec.get(..5), spec.get(5..)) {
        (Some(prefix), Some(rest)) if prefix.eq_ignore_ascii_case("file:") => rest,
        _ => spec,
    };
    if path.trim().is_empty() {
        return Err(format!("{option} needs a file, e.g. {option} file:eqe.csv"));
    }
    let bytes =
        std::fs::read(path).map_err(|e| format!("cannot read quantum-efficiency file '{path}': {}", io_reason(&e)))?;
    let text = String::from_utf8_lossy(&bytes);
    let name = std::path::Path::new(path)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| path.to_string());
    parse_eqe_csv(&text, &name).map_err(|e| format!("quantum-efficiency file '{path}': {e}"))
}

/// `glowgap mismatch --test-eqe file:PATH --ref-eqe file:PATH --spectrum SPEC [--reference SPEC] [--json]`
pub fn mismatch(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec {
        command: "mismatch",
        valued: &[
            "test-eqe",
            "ref-eqe",
            "spectrum",
            "reference",
            "spectrum-axis",
            "spectrum-values",
            "spectrum-column",
        ],
        flags: &["json"],
        max_positional: 0,
    };
    let p = spec.parse(args)?;
    let need = |name: &str, what: &str| -> Result<String, Failure> {
        p.text(name).map(str::to_string).ok_or_else(|| {
            Failure::Usage(format!("'glowgap mismatch' needs --{name}: {what}, e.g. --{name} file:eqe.csv"))
        })
    };
    let test = read_eqe_file(
        &need("test-eqe", "the quantum efficiency (or A/W response) of the device under test")?,
        "--test-eqe",
    )?;
    let reference = read_eqe_file(
        &need("ref-eqe", "the quantum efficiency (or A/W response) of the reference device")?,
        "--ref-eqe",
    )?;
    let Some(test_spec) = p.text("spectrum") else {
        return Err(Failure::Usage(
            "'glowgap mismatch' needs --spectrum: the spectrum the measurement is made under (e.g. a simulator's, --spectrum file:simulator.csv)".into(),
        ));
    };
    // the test spectrum reads like every --spectrum; a reference file needs a header
    let mut sc = CellScenario { spectrum: SourceSpec::parse(test_spec)?, ..Default::default() };
    apply_common(&p, &mut sc)?;
    let mut settings = MismatchSettings {
        test_eqe: Some(EqeTableSpec::from_table(&test)),
        reference_eqe: Some(EqeTableSpec::from_table(&reference)),
        ..Default::default()
    };
    if let Some(r) = p.text("reference") {
        settings.reference_spectrum = match SourceSpec::parse(r)? {
            SourceSpec::File { path } => {
                read_spectrum_file(&path, &Parsed::default()).map_err(|e| format!("--reference: {e}"))?
            }
            other => other,
        };
    }
    let setup = settings.to_physics(&sc.spectrum)?;
    let m =
        mismatch_factor(&setup.test_device, &setup.reference_device, &setup.test_spectrum, &setup.reference_spectrum)?;
    let report = MismatchReport::new(&m, setup.test_spectrum.name(), setup.reference_spectrum.name());
    if p.flag("json") {
        return print_json(out, &report);
    }
    writeln!(out, "{:<44} {:.6}", "Spectral mismatch factor M", report.mismatch_factor)?;
    writeln!(out, "{:<44} {}", "Test spectrum", report.test_spectrum)?;
    writeln!(out, "{:<44} {}", "Reference spectrum", report.reference_spectrum)?;
    for (label, v) in [
        ("Device under test, test spectrum", report.test_device_test_spectrum_ma_cm2),
        ("Device under test, reference spectrum", report.test_device_reference_spectrum_ma_cm2),
        ("Reference device, test spectrum", report.reference_device_test_spectrum_ma_cm2),
        ("Reference device, reference spectrum", report.reference_device_reference_spectrum_ma_cm2),
    ] {
        writeln!(out, "{label:<44} {v:.4} mA/cm²")?;
    }
    writeln!(out, "calibrated current = measured current / M")?;
    Ok(())
}

/// `glowgap losses --gap EV | --from EV --to EV --step EV [SOURCE AND CELL OPTIONS] [--json | --csv]`
pub fn losses(args: &[String], out: Out) -> Result<(), Failure> {
    let spec = Spec { command: "losses", valued: LOSSES_VALUED, flags: &["json", "csv"], max_positional: 0 };
    let p = spec.parse(args)?;
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
            if !(s > 0.0) || a > b {
                return Err(Failure::Usage(format!(
                    "--from {a} --to {b} --step {s} is not a range; give the lower gap first and a positive step, e.g. --from 0.5 --to 3 --step 0.01"
                )));
            }
            let n = ((b - a) / s).round();
            if n + 1.0 > 100_000.0 {
                return Err(Failure::Usage(format!(
                    "that range has {} points; the most is 100000: use a larger --step",
                    n + 1.0
                )));
            }
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
    for &g in &gaps_ev {
        CellScenario { gap_ev: g, ..sc.clone() }.to_physics()?;
    }
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
    writeln!(buf, "gap_ev,input_w_m2,below_gap_w_m2,thermalization_w_m2,emission_w_m2,carnot_w_m2,boltzmann_w_m2,delivered_w_m2,sum_w_m2,efficiency")?;
    for r in rows {
        writeln!(
            buf,
            "{},{},{},{},{},{},{},{},{},{}",
            r.gap_ev,
            r.input_w_m2,
            r.below_gap_w_m2,
            r.thermalization_w_m2,
            r.emission_w_m2,
            r.carnot_w_m2,
            r.boltzmann_w_m2,
            r.delivered_w_m2,
            r.sum_w_m2,
            r.efficiency
        )?;
    }
    buf.flush()?;
    Ok(())
}

/// The `--gap` of `cell`: required, except with `--eqe`, whose table sets the edge (the
/// scenario then keeps its default gap, which a measured absorptance does not use).
pub fn cell_gap(p: &Parsed) -> Result<f64, String> {
    match p.number("gap", "band gap", "eV")? {
        Some(g) => Ok(g),
        None if p.text("eqe").is_some() => Ok(CellScenario::default().gap_ev),
        None => p.required_number("gap", "band gap", "eV", "cell"),
    }
}

/// Whether `cell` was asked for a measured or modelled absorptance.
pub fn wants_absorber(p: &Parsed) -> bool {
    p.text("eqe").is_some() || p.text("urbach").is_some() || p.text("measured-voc").is_some()
}

/// `glowgap cell ... --eqe file:PATH | --urbach MEV [--measured-voc V]`: `sc` holds the
/// cell options already applied.
pub fn cell_with_absorber(p: &Parsed, sc: CellScenario, out: Out) -> Result<(), Failure> {
    let absorber = match (p.text("eqe"), p.number("urbach", "Urbach energy", "meV")?) {
        (Some(_), Some(_)) => {
            return Err(Failure::Usage(
                "give one of --eqe (a measured absorptance) and --urbach (a modelled tail), not both".into(),
            ))
        }
        (Some(f), None) => AbsorberSpec::Measured(EqeTableSpec::from_table(&read_eqe_file(f, "--eqe")?)),
        (None, Some(u)) => AbsorberSpec::Urbach { urbach_mev: u },
        (None, None) => AbsorberSpec::Step,
    };
    if !absorber.is_step() && p.text("approx").is_some_and(|a| a.eq_ignore_ascii_case("exact")) {
        return Err(Failure::Usage(
            "--approx exact applies to step cells; with --eqe or --urbach the J-V follows reciprocity, J0 (e^(qV/kT) - 1), so leave --approx out"
                .into(),
        ));
    }
    let measured = p.number("measured-voc", "measured open-circuit voltage", "V")?;
    if let Some(v) = measured {
        if !(v > 0.0) {
            return Err(Failure::Usage(format!(
                "--measured-voc {v} must be a positive voltage in V, e.g. --measured-voc 1.1"
            )));
        }
    }
    if p.flag("link") {
        let scenario =
            Scenario { cell: sc, stack: StackScenario { absorber, ..Default::default() }, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let scenario = Scenario { cell: sc, stack: StackScenario { absorber, ..Default::default() }, ..Default::default() };
    write_absorber_cell(&scenario, measured, p.flag("json"), out)
}

/// The cell of `scenario` with the scenario's absorptance.
fn write_absorber_cell(scenario: &Scenario, measured_voc: Option<f64>, json: bool, out: Out) -> Result<(), Failure> {
    let sc = &scenario.cell;
    let mut setup = sc.to_physics()?;
    let a = scenario.stack.absorber.to_physics(sc.gap_ev, sc.cell_temp_k, &mut setup.warnings)?;
    warn(&setup.warnings);
    let r = solve_absorber(&setup.light, &a, &setup.cell);
    let kind = match &scenario.stack.absorber {
        AbsorberSpec::Step => "step",
        AbsorberSpec::Urbach { .. } => "urbach",
        AbsorberSpec::Measured(_) => "measured",
    };
    let mut report = AbsorberReport::new(&r, kind);
    if let Some(v) = measured_voc {
        report.measured_voc_v = Some(v);
        report.ere_from_voc = ere_from_voc(r.cell.jsc, r.ln_j0, sc.cell_temp_k, v);
        report.measured_nonrad_voc_loss_v = Some(r.voc_rad - v);
        if v > r.voc_rad {
            warn(&[format!(
                "the measured Voc {v} V is above the radiative limit {:.4} V of this absorptance; check the EQE, the spectrum and the cell temperature",
                r.voc_rad
            )]);
        }
    }
    if json {
        return print_json(out, &report);
    }
    // a non-step absorptance follows the reciprocity law J0 (e^(qV/kT) - 1), the Boltzmann form
    let shown = if scenario.stack.absorber.is_step() {
        sc.clone()
    } else {
        CellScenario { approx: JvModel::Boltzmann, ..sc.clone() }
    };
    write_cell_table(out, &report.cell, &setup.light.source.name(), &shown)?;
    let what = match &scenario.stack.absorber {
        AbsorberSpec::Step => "step at the band gap".to_string(),
        AbsorberSpec::Urbach { urbach_mev } => {
            format!("step with an Urbach tail of {urbach_mev} meV (reciprocity J-V)")
        }
        AbsorberSpec::Measured(t) => {
            format!("measured EQE '{}' (reciprocity J-V; gap shown: half-maximum edge)", t.name)
        }
    };
    writeln!(out, "{:<28} {}", "Absorptance", what)?;
    match report.log10_j0_rad_ma_cm2 {
        Some(l) => writeln!(out, "{:<28} 10^{:.3} mA/cm²", "Radiative dark current J0", l)?,
        None => writeln!(out, "{:<28} 0 mA/cm²", "Radiative dark current J0")?,
    }
    writeln!(out, "{:<28} {:.4} V", "Radiative-limit Voc", report.voc_rad_v)?;
    writeln!(out, "{:<28} {:.4} V", "Non-radiative Voc loss", report.nonrad_voc_loss_v)?;
    if let (Some(v), Some(loss)) = (report.measured_voc_v, report.measured_nonrad_voc_loss_v) {
        writeln!(
            out,
            "{:<28} {v:.4} V: loss {loss:.4} V, ERE {}",
            "Measured Voc",
            report.ere_from_voc.map(|e| format!("{e:.3e}")).unwrap_or_else(|| "-".into())
        )?;
    }
    Ok(())
}

/// `glowgap eval LINK --stack`: the stack figures of a scenario.
pub fn eval_stack(what: &str, json: bool, out: Out) -> Result<(), Failure> {
    let scenario = load_scenario(what)?;
    let setup = scenario
        .stack
        .to_physics(&scenario.cell)
        .map_err(|e| format!("the scenario's stack cannot be computed: {e}"))?;
    warn(&setup.warnings);
    let r = solve_stack(&setup.light, &setup.cell, &setup.gaps_j, setup.connection);
    let report = with_gaps_as_given(StackReport::from(&r), &scenario.stack.gaps_ev);
    if json {
        print_json(out, &report)
    } else {
        write_stack_table(out, &report, &setup.light.source.name(), &scenario.cell)?;
        Ok(())
    }
}

/// `glowgap eval LINK` for a scenario whose cell has a measured or modelled absorptance.
pub fn eval_absorber(scenario: &Scenario, json: bool, out: Out) -> Result<(), Failure> {
    write_absorber_cell(scenario, None, json, out).map_err(|f| match f {
        Failure::Usage(m) => Failure::Usage(format!("the scenario cannot be computed: {m}")),
        other => other,
    })
}
