//! `glowgap tpv`: a thermophotovoltaic pair, a hot emitter facing a cell (one junction or a
//! stack), at the maximum power point: power density, heat drawn from the emitter, its
//! sub-gap part, efficiency, the efficiency at its own optimum voltage and the Carnot bound;
//! or the efficiency-power trade-off over band gap (`--sweep`), or the J-V curve as CSV.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the pair
//! is a `TpvScenario` checked by its own `to_physics`, every figure comes from
//! `report::hot`.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{resolve_emitter_file, resolve_reflectance_file};
use crate::cli::shared::options::EMITTER_FILE_DOCS;
use crate::cli::shared::options::{connection, MAX_GRID_POINTS};
use crate::cli::shared::output::print_json;
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::tpv::Tpv;
use crate::report::hot::{connection_words, TpvReport, TradeoffReport};
use crate::scenario::hot::{ReflectanceSpec, TpvScenario};
use crate::scenario::radiator::EmitterSpec;
use crate::scenario::{check_gap_ev, Panel, Scenario};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "tpv",
        valued: &[
            "emitter-temp",
            "gap",
            "gaps",
            "connection",
            "emitter",
            "view-factor",
            "subgap-reflectance",
            "cell-temp",
            "ere",
            "sweep",
            "emitter-axis",
            "emitter-values",
            "emitter-column",
        ],
        flags: &["json", "csv", "link"],
        max_positional: 0,
    },
    about: "a hot emitter facing a cell (thermophotovoltaics): power, heat, efficiency, trade-off",
    usage: "tpv --emitter-temp K [--gap EV | --gaps EV,EV,... [--connection series|independent]]\n\
            [--emitter EMIT] [--view-factor F] [--subgap-reflectance R | file:PATH]\n\
            [--cell-temp K] [--ere F] [--sweep FROM:TO:STEP] [--json | --csv | --link]",
    docs: &[
        OptionDoc {
            name: "emitter-temp",
            arg: "K",
            text: "the emitter's temperature in kelvin, above the cell's, up to 10000, required,\n\
                   e.g. --emitter-temp 2173 (1900 C)",
        },
        OptionDoc { name: "gap", arg: "EV", text: "the cell's band gap in eV, default 0.75" },
        OptionDoc {
            name: "gaps",
            arg: "EV,EV,...",
            text: "a stack's band gaps in eV, top first, 2 to 6 (default: one gap, --gap)",
        },
        OptionDoc {
            name: "connection",
            arg: "C",
            text: "series (default: one current, the voltages add) | independent (each subcell at\n\
                   its own maximum power point)",
        },
        OptionDoc {
            name: "emitter",
            arg: "EMIT",
            text: "the emitter's emissivity: blackbody (default) | grey:EPS |\n\
                   window:L1-L2[,in=EPS,out=EPS,edge=UM] | points:UM=EPS,... | file:PATH (um)",
        },
        OptionDoc {
            name: "view-factor",
            arg: "F",
            text: "the share of the cell's view filled by the emitter, above 0 to 1 (default 1:\n\
                   parallel plates); the rest sees surroundings at the cell's temperature",
        },
        OptionDoc {
            name: "subgap-reflectance",
            arg: "R",
            text: "the cell's reflectance below its gap, 0 to 1 (default 1: every sub-gap photon\n\
                   returns to the emitter), or file:PATH, a table whose header names the\n\
                   reflectance against wavelength",
        },
        OptionDoc { name: "cell-temp", arg: "K", text: "the cell's temperature in kelvin, default 300" },
        OptionDoc {
            name: "ere",
            arg: "F",
            text: "external radiative efficiency, above 0 to 1 (default 1: the radiative limit)",
        },
        OptionDoc {
            name: "sweep",
            arg: "FROM:TO:STEP",
            text: "one junction's gap from FROM to TO eV in steps of STEP (both ends included):\n\
                   efficiency and power density at each, and the two optima (default: no sweep)",
        },
        EMITTER_FILE_DOCS[0],
        EMITTER_FILE_DOCS[1],
        EMITTER_FILE_DOCS[2],
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON {\"efficiency\", \"pmax_w_cm2\", \"heat_in_w_cm2\", \"subgap_heat_w_cm2\",\n\
                   \"jsc_a_cm2\", \"voc_v\", \"vmp_v\" (null when independent), \"max_efficiency\",\n\
                   \"carnot_efficiency\", \"subcells\"}; with --sweep {\"points\": [{\"gap_ev\",\n\
                   \"efficiency\", \"pmax_w_cm2\"}...], \"best_efficiency\", \"best_power\"}",
        },
        OptionDoc {
            name: "csv",
            arg: "",
            text: "print CSV with a header line: the J-V curve, or with --sweep the trade-off",
        },
        OptionDoc {
            name: "link",
            arg: "",
            text: "print the scenario's share-link fragment (#g1.…) to append to the app's address,\n\
                   instead of the figures",
        },
    ],
    run,
};

/// Points of the J-V curve printed by `--csv`.
const JV_POINTS: usize = 201;

/// `glowgap tpv --emitter-temp K [...]`.
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let outputs = ["json", "csv", "link"].iter().filter(|f| p.flag(f)).count();
    if outputs > 1 {
        return Err(Failure::Usage("'glowgap tpv': choose one of --json, --csv and --link".into()));
    }
    let sc = scenario(&p)?;
    let inputs = sc.to_physics()?;
    if p.flag("link") {
        let mut scenario = Scenario::default();
        scenario.hot.tpv = sc;
        scenario.view.panel = Panel::Hot;
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let tpv = Tpv::new(&inputs.setup);
    if let Some(text) = p.text("sweep") {
        if p.text("gaps").is_some() {
            return Err(Failure::Usage(
                "--sweep varies one junction's gap; drop --gaps (or give --gap, which --sweep replaces)".into(),
            ));
        }
        let gaps = sweep_gaps(text)?;
        let report = TradeoffReport::new(&tpv, &gaps);
        if p.flag("json") {
            return print_json(out, &report);
        }
        if p.flag("csv") {
            writeln!(out, "gap_ev,efficiency,pmax_w_cm2")?;
            for pt in &report.points {
                writeln!(out, "{}", csv_line(&[pt.gap_ev, pt.efficiency, pt.pmax_w_cm2]))?;
            }
            return Ok(());
        }
        writeln!(out, "{:>10} {:>12} {:>14}", "gap (eV)", "efficiency", "power (W/cm2)")?;
        for pt in &report.points {
            writeln!(out, "{:>10.4} {:>11.3} % {:>14.5}", pt.gap_ev, pt.efficiency * 100.0, pt.pmax_w_cm2)?;
        }
        let (e, w) = (&report.best_efficiency, &report.best_power);
        writeln!(
            out,
            "Best efficiency   {:.3} % at {:.4} eV ({:.5} W/cm2)",
            e.efficiency * 100.0,
            e.gap_ev,
            e.pmax_w_cm2
        )?;
        writeln!(
            out,
            "Best power        {:.5} W/cm2 at {:.4} eV ({:.3} %)",
            w.pmax_w_cm2,
            w.gap_ev,
            w.efficiency * 100.0
        )?;
        return caution(out, sc.emitter_temp_k);
    }
    if p.flag("csv") {
        writeln!(out, "voltage_v,current_a_cm2,power_w_cm2")?;
        for (v, j) in tpv.jv_curve(&inputs.gaps_j, JV_POINTS) {
            let j = j * 1e-4;
            writeln!(out, "{}", csv_line(&[v, j, v * j]))?;
        }
        return Ok(());
    }
    let report = TpvReport::new(&tpv.solve(&inputs.gaps_j, inputs.connection));
    if p.flag("json") {
        return print_json(out, &report);
    }
    let gaps: Vec<String> = sc.gaps_ev.iter().map(|g| format!("{g}")).collect();
    let cell = if sc.gaps_ev.len() > 1 {
        format!("stack {} eV, {}", gaps.join(", "), connection_words(inputs.connection))
    } else {
        format!("{} eV", gaps[0])
    };
    writeln!(
        out,
        "Emitter {} at {} K, view factor {}; cell {cell} at {} K, ERE {}, sub-gap reflectance {}",
        sc.emitter.label(),
        sc.emitter_temp_k,
        sc.view_factor,
        sc.cell_temp_k,
        sc.ere,
        sc.subgap_reflectance.label()
    )?;
    for (label, value) in report.rows() {
        writeln!(out, "{label:<32} {value}")?;
    }
    if report.subcells.len() > 1 {
        for (i, s) in report.subcells.iter().enumerate() {
            writeln!(
                out,
                "  subcell {} ({:.4} eV): Jsc {:.4} A/cm2, Voc {:.4} V, at maximum power {:.4} V",
                i + 1,
                s.gap_ev,
                s.jsc_a_cm2,
                s.voc_v,
                s.vmp_v
            )?;
        }
    }
    caution(out, sc.emitter_temp_k)
}

fn caution(out: Out, temp_k: f64) -> Result<(), Failure> {
    writeln!(
        out,
        "Caution: an emitter at {temp_k} K burns on contact and its glow harms eyes and skin; \
         follow local codes and licensed practice."
    )?;
    Ok(())
}

/// The pair from the options, on the scenario's defaults; data files read.
fn scenario(p: &Parsed) -> Result<TpvScenario, String> {
    let mut sc = TpvScenario {
        emitter_temp_k: p.required_number("emitter-temp", "emitter temperature", "K", "tpv")?,
        ..TpvScenario::default()
    };
    if p.text("gap").is_some() && p.text("gaps").is_some() {
        return Err("give one of --gap (one junction) and --gaps (a stack)".into());
    }
    if let Some(g) = p.number("gap", "band gap", "eV")? {
        sc.gaps_ev = vec![g];
    }
    if let Some(list) = p.text("gaps") {
        sc.gaps_ev = list
            .split(',')
            .map(|g| {
                g.trim().parse::<f64>().map_err(|_| {
                    format!(
                        "--gaps '{list}': '{}' is not a band gap in eV; give them top first, e.g. --gaps 1.4,1.2",
                        g.trim()
                    )
                })
            })
            .collect::<Result<_, _>>()?;
        if sc.gaps_ev.len() < 2 {
            return Err(format!(
                "--gaps '{list}' has one gap; give --gap for one junction or two to six gaps top first"
            ));
        }
    }
    if p.text("connection").is_some() {
        sc.connection = connection(p)?;
    }
    if let Some(e) = p.text("emitter") {
        sc.emitter = EmitterSpec::parse(e).map_err(|m| format!("--emitter: {m}"))?;
    }
    resolve_emitter_file(&mut sc.emitter, p)?;
    if let Some(f) = p.number("view-factor", "view factor", "a fraction above 0, at most 1")? {
        sc.view_factor = f;
    }
    if let Some(r) = p.text("subgap-reflectance") {
        sc.subgap_reflectance = ReflectanceSpec::parse(r).map_err(|m| format!("--subgap-reflectance: {m}"))?;
    }
    resolve_reflectance_file(&mut sc.subgap_reflectance)?;
    if let Some(t) = p.number("cell-temp", "cell temperature", "K")? {
        sc.cell_temp_k = t;
    }
    if let Some(e) = p.number("ere", "external radiative efficiency", "a fraction above 0, at most 1")? {
        sc.ere = e;
    }
    sc.to_physics().map_err(|e| option_words(&e))?;
    Ok(sc)
}

/// The scenario's message with the option that sets the value named in it.
fn option_words(message: &str) -> String {
    let pairs = [
        ("emitter temperature", "--emitter-temp"),
        ("is not hotter than the cell", "--emitter-temp or --cell-temp"),
        ("cell temperature", "--cell-temp"),
        ("view factor", "--view-factor"),
        ("external radiative efficiency", "--ere"),
        ("sub-gap reflectance", "--subgap-reflectance"),
        ("reflectance table", "--subgap-reflectance"),
        ("band gap", "--gap/--gaps"),
        ("subcell", "--gaps"),
        ("stack needs", "--gaps"),
        ("emissivity", "--emitter"),
        ("window", "--emitter"),
        ("control point", "--emitter"),
    ];
    match pairs.iter().find(|(k, _)| message.contains(k)) {
        Some((_, opt)) => format!("{opt}: {message}"),
        None => message.to_string(),
    }
}

/// Numbers as CSV fields (shortest text that reads back to the same number).
fn csv_line(v: &[f64]) -> String {
    v.iter().map(|x| format!("{x}")).collect::<Vec<_>>().join(",")
}

/// `--sweep FROM:TO:STEP` [eV] as the list of gaps, both ends included.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(step > 0.0)` on purpose: it also refuses NaN
fn sweep_gaps(text: &str) -> Result<Vec<f64>, String> {
    let bad = || format!("--sweep '{text}' is not FROM:TO:STEP in eV, e.g. --sweep 0.4:1.6:0.01");
    let parts: Vec<&str> = text.split(':').collect();
    let [a, b, c] = parts.as_slice() else { return Err(bad()) };
    let num = |s: &str| s.trim().parse::<f64>().ok().ok_or_else(bad);
    let (from, to, step) = (num(a)?, num(b)?, num(c)?);
    check_gap_ev(from).map_err(|e| format!("--sweep FROM: {e}"))?;
    check_gap_ev(to).map_err(|e| format!("--sweep TO: {e}"))?;
    if !(to >= from) {
        return Err(format!("--sweep '{text}': give the lower gap first, e.g. --sweep 0.4:1.6:0.01"));
    }
    if !(step > 0.0) {
        return Err(format!("--sweep '{text}': the step must be positive, e.g. 0.01 (eV)"));
    }
    let steps = ((to - from) / step).floor();
    if steps + 1.0 > MAX_GRID_POINTS as f64 {
        return Err(format!(
            "--sweep '{text}' makes {} gaps, more than {MAX_GRID_POINTS}; give a larger STEP",
            steps + 1.0
        ));
    }
    let n = steps as usize;
    let mut gaps: Vec<f64> = (0..=n).map(|i| from + step * i as f64).collect();
    if to - gaps[n] > 1e-9 * step {
        gaps.push(to);
    } else {
        gaps[n] = to;
    }
    Ok(gaps)
}
