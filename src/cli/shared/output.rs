//! The writers of results: cell, stack, measured-cell and radiator figures as the aligned
//! tables the commands print (labels and display text from `report`, as the page shows
//! them), JSON lines, and warnings on stderr.
//!
//! Architecture invariant: every figure printed here comes from a `report` type, so the
//! table, the JSON and the page cannot disagree; evaluation goes through the scenario's own
//! `to_physics`.

use super::{Failure, Out};
use crate::physics::absorber::{ere_from_voc, solve_absorber};
use crate::physics::junction::solve_cell;
use crate::physics::radiator::evaluate;
use crate::report::radiator::RadiatorReport;
use crate::report::real::{RealCellReport, ThicknessPoint};
use crate::report::stack::{AbsorberKind, AbsorberReport, StackMetric, StackReport};
use crate::report::CellReport;
use crate::scenario::radiator::{AngularSpec, RadiatorScenario};
use crate::scenario::stack::AbsorberSpec;
use crate::scenario::{CellScenario, Scenario};
use crate::scenario::{Connection, Emission, JvModel};

/// Warnings on stderr, one line each, each at most once per run: opening a scenario checks
/// every part and printing a part checks it again, and the same warning is not worth two
/// lines.
pub fn warn(warnings: &[String]) {
    static SHOWN: std::sync::Mutex<Vec<String>> = std::sync::Mutex::new(Vec::new());
    let mut shown = SHOWN.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
    for w in warnings {
        if !shown.contains(w) {
            eprintln!("glowgap: warning: {w}");
            shown.push(w.clone());
        }
    }
}

/// A value as one line of JSON.
pub fn print_json<T: serde::Serialize>(out: Out, v: &T) -> Result<(), Failure> {
    writeln!(out, "{}", json_text(v))?;
    Ok(())
}

/// A value as JSON text on one line, the one way the command line writes JSON: a negative
/// zero (e.g. 0 times a negative number) is written 0.0, as people expect of a zero.
pub fn json_text<T: serde::Serialize>(v: &T) -> String {
    let text = serde_json::to_string(v).unwrap_or_default();
    if !text.contains("-0.0") {
        return text;
    }
    // drop the sign of every number token that is exactly -0.0 (never inside a string)
    let bytes = text.as_bytes();
    let mut out = String::with_capacity(text.len());
    let (mut in_string, mut escaped) = (false, false);
    for (i, c) in text.char_indices() {
        if in_string {
            if escaped {
                escaped = false;
            } else if c == '\\' {
                escaped = true;
            } else if c == '"' {
                in_string = false;
            }
        } else if c == '"' {
            in_string = true;
        } else if c == '-'
            && text.get(i..i + 4) == Some("-0.0")
            && matches!(bytes.get(i + 4), None | Some(b',' | b'}' | b']'))
            && matches!(i.checked_sub(1).and_then(|j| bytes.get(j)), None | Some(b':' | b',' | b'['))
        {
            continue;
        }
        out.push(c);
    }
    out
}

/// Solve the cell of `sc` (a step absorptance) and print it: JSON with `json`, else a table.
pub fn print_cell(sc: &CellScenario, json: bool, out: Out) -> Result<(), Failure> {
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let report = CellReport::from(&solve_cell(&setup.light, &setup.cell));
    if json {
        return print_json(out, &report);
    }
    write_cell_table(out, &report, &setup.light.source.name(), sc)?;
    Ok(())
}

/// The cell's figures as a table.
pub fn write_cell_table(out: Out, r: &CellReport, source: &str, sc: &CellScenario) -> std::io::Result<()> {
    writeln!(out, "{:<28} {:.4} eV", "Band gap", r.gap_ev)?;
    writeln!(out, "{:<28} {} at {}", "Source", source, suns(sc.concentration))?;
    writeln!(out, "{:<28} {}", "Cell", cell_line(sc))?;
    for m in crate::report::CellMetric::HEADLINE {
        writeln!(out, "{:<28} {}", m.label(), r.display(m))?;
    }
    writeln!(out, "{:<28} {:.2} W/m²", "Maximum power", r.pmax_w_m2)?;
    Ok(())
}

pub fn suns(x: f64) -> String {
    if x == 1.0 {
        "1 sun".into()
    } else {
        format!("{x} suns")
    }
}

pub fn cell_line(sc: &CellScenario) -> String {
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

pub fn connection_words(c: Connection) -> &'static str {
    match c {
        Connection::Series => "series (two-terminal)",
        Connection::Independent => "independent (multi-terminal)",
    }
}

/// The report with the gaps as the user typed them (eV to J and back may change the last
/// digit).
pub fn with_gaps_as_given(mut r: StackReport, gaps_ev: &[f64]) -> StackReport {
    for (i, s) in r.subcells.iter_mut().enumerate() {
        s.gap_ev = gaps_ev.get(i).copied().unwrap_or(s.gap_ev);
        s.upper_gap_ev = if i == 0 { None } else { gaps_ev.get(i - 1).copied().or(s.upper_gap_ev) };
    }
    r
}

/// The real bottom cell and the luminescent coupling of a stack, when it has them.
pub fn write_stack_extras(out: Out, r: &StackReport) -> std::io::Result<()> {
    if let Some(b) = &r.bottom {
        writeln!(
            out,
            "bottom cell: {}, {} um, {} light trapping{} (its gap column is the absorption edge at half maximum)",
            b.absorber,
            b.thickness_um,
            b.light_trapping,
            if b.auger_limited { ", Auger limited" } else { ", radiative limit" }
        )?;
    }
    if r.luminescent_coupling > 0.0 {
        writeln!(
            out,
            "luminescent coupling: {} of each subcell's emission reaches the one below (Jsc column as coupled at the \
             operating point)",
            r.luminescent_coupling
        )?;
    }
    Ok(())
}

/// The stack as a table.
pub fn write_stack_table(out: Out, r: &StackReport, source: &str, sc: &CellScenario) -> std::io::Result<()> {
    writeln!(out, "{:<28} {} junctions, {}", "Stack", r.subcells.len(), connection_words(r.connection))?;
    writeln!(out, "{:<28} {} at {}", "Source", source, suns(sc.concentration))?;
    writeln!(out, "{:<28} {}", "Cells", cell_line(sc))?;
    // the headline figures as the stack panel shows them; the Voc row keeps its label in
    // every connection, the Jsc row says when it is a sum
    for m in StackMetric::ALL {
        let label = if m == StackMetric::Voc { m.label() } else { r.label(m) };
        writeln!(out, "{:<28} {}", label, r.display(m))?;
    }
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

/// The cell of `scenario`, whose absorber is a real one, at its thickness; or with
/// `sweep` (thicknesses [um]) every point of the sweep and the best thickness.
pub fn write_real_cell(scenario: &Scenario, sweep: Option<&[f64]>, json: bool, out: Out) -> Result<(), Failure> {
    let AbsorberSpec::Real(spec) = &scenario.stack.absorber else {
        return Err(Failure::Usage("the scenario's absorber is not a real absorber".into()));
    };
    let setup = scenario.cell.to_physics()?;
    warn(&setup.warnings);
    let real = spec.setup(&setup.light, scenario.cell.cell_temp_k)?;
    let label = spec.trapping.label();
    let report = |r: &crate::physics::silicon::RealCellResult, w_m: f64, w_um: f64| {
        let edge = real.model.edge_j(w_m, real.trapping);
        RealCellReport::new(r, edge, w_um, real.auger, label, real.model.input_power())
    };
    if let Some(ts) = sweep {
        let ws: Vec<f64> = ts.iter().map(|t| t * 1e-6).collect();
        let rs = real.model.sweep(&ws, real.trapping);
        let points: Vec<ThicknessPoint> = ts.iter().zip(&rs).map(|(&t, r)| ThicknessPoint::new(t, r)).collect();
        let (best_m, best_r) = real.model.best_thickness(ws[0], ws[ws.len() - 1], real.trapping);
        let best = report(&best_r, best_m, best_m * 1e6);
        if json {
            let v = serde_json::json!({"points": points, "best_thickness_um": best_m * 1e6, "best": best});
            return print_json(out, &v);
        }
        writeln!(out, "{:>14} {:>12} {:>14} {:>10}", "thickness um", "efficiency %", "Jsc mA/cm²", "Voc V")?;
        for pt in &points {
            writeln!(
                out,
                "{:>14.4} {:>12.4} {:>14.4} {:>10.5}",
                pt.thickness_um,
                pt.efficiency * 100.0,
                pt.jsc_ma_cm2,
                pt.voc_v
            )?;
        }
        writeln!(out, "best: {:.2} um, {:.4} %", best_m * 1e6, best.cell.efficiency * 100.0)?;
        return Ok(());
    }
    let r = report(&real.model.solve(real.thickness_m, real.trapping), real.thickness_m, spec.thickness_um);
    if json {
        return print_json(out, &r);
    }
    let c = &r.cell;
    let rows = [
        ("Absorber", spec.label()),
        ("Source", setup.light.source.name()),
        ("Efficiency", format!("{:.2} %", c.efficiency * 100.0)),
        ("Short-circuit current Jsc", format!("{:.3} mA/cm²", c.jsc_ma_cm2)),
        ("Open-circuit voltage Voc", format!("{:.4} V", c.voc_v)),
        ("Fill factor", format!("{:.4}", c.ff)),
        ("Voltage at max power Vmp", format!("{:.4} V", c.vmp_v)),
        ("Current at max power Jmp", format!("{:.3} mA/cm²", c.jmp_ma_cm2)),
        ("Radiative loss at Vmp", format!("{:.4} mA/cm²", r.radiative_mpp_ma_cm2)),
        ("Auger loss at Vmp", format!("{:.4} mA/cm²", r.auger_mpp_ma_cm2)),
        ("Absorption edge (half maximum)", format!("{:.4} eV", c.gap_ev)),
    ];
    for (k, v) in rows {
        writeln!(out, "{k:<32} {v}")?;
    }
    Ok(())
}

/// The cell of `scenario` with the scenario's absorptance.
pub fn write_absorber_cell(
    scenario: &Scenario,
    measured_voc: Option<f64>,
    json: bool,
    out: Out,
) -> Result<(), Failure> {
    if let AbsorberSpec::Real(_) = &scenario.stack.absorber {
        return write_real_cell(scenario, None, json, out);
    }
    let sc = &scenario.cell;
    let mut setup = sc.to_physics()?;
    let a = scenario.stack.absorber.to_physics(sc.gap_ev, sc.cell_temp_k, &mut setup.warnings)?;
    warn(&setup.warnings);
    let r = solve_absorber(&setup.light, &a, &setup.cell);
    let mut report = AbsorberReport::new(&r, AbsorberKind::of(&scenario.stack.absorber));
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
        AbsorberSpec::Real(r) => r.label(),
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

/// Evaluate a radiator scenario and print it: JSON with `json`, else a table; with a curve
/// step [K], also P_net(T) over the scenario's curve range.
pub fn print_radiator(sc: &RadiatorScenario, json: bool, curve_step: Option<f64>, out: Out) -> Result<(), Failure> {
    let setup = sc.to_physics()?;
    warn(&setup.warnings);
    let ev = evaluate(&setup.emitter, &setup.surroundings, setup.surface_k);
    let report = RadiatorReport::from(&ev);
    let curve = match curve_step {
        Some(step) => {
            let n = ((sc.curve_to_k - sc.curve_from_k) / step).round() as usize + 1;
            let temps: Vec<f64> = (0..n).map(|i| (sc.curve_from_k + step * i as f64).min(sc.curve_to_k)).collect();
            ev.balance.curve(&temps)
        }
        None => Vec::new(),
    };
    if json && curve_step.is_none() {
        return print_json(out, &report);
    }
    if json {
        let mut v = serde_json::to_value(&report).map_err(|_| Failure::Output)?;
        {
            let pts: Vec<serde_json::Value> = curve
                .iter()
                .map(|c| serde_json::json!({"temp_k": c.temp_k, "net_w_m2": c.net, "emitted_w_m2": c.emitted}))
                .collect();
            v["curve"] = serde_json::Value::Array(pts);
        }
        return print_json(out, &v);
    }
    let sun = match &sc.sun {
        None => "none (night)".to_string(),
        Some(s) => {
            let name = s.to_source().map(|src| src.name()).unwrap_or_else(|_| s.label());
            let scale = if sc.sun_scale == 1.0 { String::new() } else { format!(" x {}", sc.sun_scale) };
            format!("{name}{scale} at {} deg from zenith", sc.sun_zenith_deg)
        }
    };
    let mut emitter = sc.emitter.label();
    if let Some(s) = &sc.solar_band {
        emitter.push_str(&format!("; below {} um: {}", s.below_um, s.profile.label()));
    }
    if let AngularSpec::CutOff { angle_deg, beyond } = sc.angular {
        emitter.push_str(&format!("; {beyond} beyond {angle_deg} deg"));
    }
    let mut rows: Vec<(String, String)> = vec![
        ("Emitter".into(), emitter),
        ("Sky".into(), sc.sky.label()),
        ("Sun".into(), sun),
        ("Convection h_c".into(), format!("{} W/m²K", sc.h_c_w_m2k)),
    ];
    rows.extend(report.rows());
    for (label, value) in rows {
        writeln!(out, "{label:<32} {value}")?;
    }
    if !curve.is_empty() {
        writeln!(out)?;
        writeln!(out, "{:>10} {:>14} {:>14}", "T (K)", "P_net (W/m²)", "emitted (W/m²)")?;
        for c in &curve {
            writeln!(out, "{:>10.2} {:>14.3} {:>14.3}", c.temp_k, c.net, c.emitted)?;
        }
    }
    Ok(())
}
