//! `glowgap yield`: the detailed-balance electric energy of a cell or stack over a clear day
//! or year at a place (or over a measured series of spectra), the energy-weighted
//! efficiency, and the band gap(s) that give the most energy beside the AM1.5G optimum.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::read_series_file;
use crate::cli::shared::options::{apply_common, connection};
use crate::cli::shared::output::{connection_words, print_json};
use crate::cli::shared::place::{place_from_args, place_keys_with, PLACE_KEYS};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::constants::{ev, to_ev};
use crate::physics::energy_yield::{best_stack_gaps, device_energy, gap_curve, Device, Series};
use crate::physics::junction::{best_gap, sweep, Cell, Illumination};
use crate::physics::sources::Source;
use crate::physics::stack::optimize::{optimize, Problem};
use crate::physics::stack::Connection as PhysConnection;
use crate::report::day::iso_time;
use crate::scenario::energy::{read_measured_series, Period, YieldSetup, YieldSpec};
use crate::scenario::stack::check_gaps;
use crate::scenario::{check_gap_ev, check_gap_range, CellScenario, Connection};
use serde::Serialize;

/// The place's options, then the period, the series file, the device and the cell.
const VALUED: [&str; PLACE_KEYS.len() + 14] = place_keys_with([
    "date",
    "year",
    "step",
    "spectra",
    "gap",
    "gaps",
    "junctions",
    "connection",
    "from",
    "to",
    "cell-temp",
    "ere",
    "emission",
    "approx",
]);

pub const COMMAND: Command = Command {
    spec: Spec { command: "yield", valued: &VALUED, flags: &["best", "json"], max_positional: 0 },
    about: "electric energy over a clear day or year at a place, and the gaps that give the most",
    usage: "yield --lat DEG --lon DEG (--date YYYY-MM-DD | --year YYYY) [--tilt DEG --azimuth DEG]\n\
            [--gap EV | --gaps EV,EV,... | --best [--junctions N]] [ATMOSPHERE OPTIONS] [--json]\n\
            yield --spectra FILE [--gap EV | --gaps EV,EV,... | --best [--junctions N]] [--json]",
    docs: &[
        OptionDoc {
            name: "date",
            arg: "YYYY-MM-DD",
            text: "one day, from local mean-time midnight (UTC offset round(lon/15) h);\n\
                   this or --year is required with --lat/--lon",
        },
        OptionDoc { name: "year", arg: "YYYY", text: "every day of a year, 1900 to 2200; this or --date is required" },
        OptionDoc {
            name: "step",
            arg: "MIN",
            text: "time step in minutes, default 5 for a day (at most 5) and 15 for a year (1 to 60)",
        },
        OptionDoc {
            name: "spectra",
            arg: "FILE",
            text: "a measured series instead of the clear sky: CSV, header time,WL_NM,WL_NM,...,\n\
                   one row per ISO 8601 time with offset, W/m2/nm on the plane (default: none)",
        },
        OptionDoc { name: "gap", arg: "EV", text: "one cell of this band gap in eV (default: --best)" },
        OptionDoc { name: "gaps", arg: "EV,...", text: "a stack, band gaps in eV, top cell first (default: --best)" },
        OptionDoc {
            name: "best",
            arg: "",
            text: "search the gap(s) that give the most energy, beside the AM1.5G optimum (default\n\
                   when neither --gap nor --gaps is given)",
        },
        OptionDoc { name: "junctions", arg: "N", text: "with --best: number of junctions, 1 to 6, default 1" },
        OptionDoc { name: "from", arg: "EV", text: "with --best: lowest band gap searched, default 0.5" },
        OptionDoc { name: "to", arg: "EV", text: "with --best: highest band gap searched, default 2.5" },
    ],
    run,
};

/// Grid step of the single-gap search [eV]; the parabola through the best grid point and its
/// neighbours places the optimum between grid points.
const GAP_GRID_EV: f64 = 0.01;

#[derive(Serialize)]
struct StepRow {
    time: String,
    plane_w_m2: f64,
    electric_w_m2: f64,
}

#[derive(Serialize)]
struct Am15gOptimum {
    /// the AM1.5G optimum's gap(s) [eV], top first
    gaps_ev: Vec<f64>,
    /// its AM1.5G efficiency
    efficiency: f64,
    /// the electric energy those gaps give over this period [kWh m^-2]
    electric_kwh_m2: f64,
}

#[derive(Serialize)]
struct YieldReport {
    note: String,
    period: String,
    step_min: Option<f64>,
    connection: Option<&'static str>,
    gaps_ev: Vec<f64>,
    incident_kwh_m2: f64,
    electric_kwh_m2: f64,
    energy_efficiency: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    best_gap_ev: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    best_gaps_ev: Option<Vec<f64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    am15g_optimum: Option<Am15gOptimum>,
    /// per step for a day or a measured series: time, plane and electric power
    #[serde(skip_serializing_if = "Vec::is_empty")]
    steps: Vec<StepRow>,
}

const J_PER_KWH: f64 = 3.6e6;

enum What {
    Fixed(Vec<f64>),
    Best { junctions: usize, from_ev: f64, to_ev: f64 },
}

fn what(p: &Parsed) -> Result<What, String> {
    let given = [p.text("gap").is_some(), p.text("gaps").is_some(), p.flag("best")];
    if given.iter().filter(|g| **g).count() > 1 {
        return Err("give one of --gap, --gaps and --best".into());
    }
    if let Some(g) = p.number("gap", "band gap", "eV")? {
        check_gap_ev(g).map_err(|e| format!("--gap: {e}"))?;
        return Ok(What::Fixed(vec![g]));
    }
    if let Some(t) = p.text("gaps") {
        let gaps: Vec<f64> = t
            .split(',')
            .map(|x| {
                x.trim()
                    .parse::<f64>()
                    .map_err(|_| format!("--gaps: '{x}' is not a band gap in eV; write e.g. --gaps 1.8,1.1"))
            })
            .collect::<Result<_, _>>()?;
        return Ok(What::Fixed(check_gaps(&gaps).map_err(|e| format!("--gaps: {e}"))?));
    }
    for o in ["junctions", "from", "to"] {
        if p.text(o).is_some() && given[0..2].iter().any(|g| *g) {
            return Err(format!("--{o} applies only with --best"));
        }
    }
    let n = p.number("junctions", "number of junctions", "1 to 6")?.unwrap_or(1.0);
    if !((1.0..=6.0).contains(&n) && n.fract() == 0.0) {
        return Err(format!("--junctions {n} is not usable; give a whole number from 1 to 6"));
    }
    let from_ev = p.number("from", "lowest gap searched", "eV")?.unwrap_or(0.5);
    let to_ev = p.number("to", "highest gap searched", "eV")?.unwrap_or(2.5);
    check_gap_range("search range --from/--to", from_ev, to_ev)?;
    Ok(What::Best { junctions: n as usize, from_ev, to_ev })
}

/// The clear-sky period of the options.
fn clear_sky(p: &Parsed) -> Result<(YieldSpec, YieldSetup), String> {
    let place = place_from_args(p, "yield")?;
    let period = match (p.text("date"), p.text("year")) {
        (Some(_), Some(_)) => return Err("give --date or --year, not both".into()),
        (Some(d), None) => Period::Day { date: d.trim().to_string() },
        (None, Some(y)) => Period::Year {
            year: y.trim().parse().map_err(|_| format!("--year '{y}' is not a year; write e.g. --year 2025"))?,
        },
        (None, None) => {
            return Err("'glowgap yield' needs --date YYYY-MM-DD (one day) or --year YYYY (every day of it)".into())
        }
    };
    let step_min = p.number("step", "time step", "minutes")?;
    let spec = YieldSpec { place, period, step_min };
    let setup = spec.setup().map_err(|e| {
        if e.contains("date") {
            format!("--date: {e}")
        } else if e.contains("year") {
            format!("--year: {e}")
        } else if e.contains("step") {
            format!("--step: {e}")
        } else {
            e
        }
    })?;
    Ok((spec, setup))
}

fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let what = what(&p)?;
    let mut sc = CellScenario::default();
    apply_common(&p, &mut sc)?;
    let cell_setup = sc.to_physics()?;
    let template: Cell = cell_setup.cell;
    let conn = connection(&p)?;
    let pconn: PhysConnection = conn.into();

    let mut measured = None;
    let mut clear = None;
    let (period, step_min) = match p.text("spectra") {
        Some(path) => {
            for o in ["lat", "lon", "date", "year", "step"] {
                if p.text(o).is_some() {
                    return Err(Failure::Usage(format!(
                        "--{o} does not apply with --spectra (the file gives the times)"
                    )));
                }
            }
            let text = read_series_file(path)?;
            measured = Some(read_measured_series(path, &text).map_err(|e| format!("--spectra: {e}"))?);
            (format!("measured series {path}"), None)
        }
        None => {
            let (spec, setup) = clear_sky(&p)?;
            clear = Some(setup);
            let period = match &spec.period {
                Period::Day { date } => date.clone(),
                Period::Year { year } => year.to_string(),
            };
            (period, Some(spec.step_now_min()))
        }
    };
    let clear_series = clear.as_ref().map(YieldSetup::series);
    let thinned = clear.as_ref().map(|c| c.thinned(7, 1800.0));
    let thinned_series = thinned.as_ref().map(YieldSetup::series);
    // a year of steps is printed per step only for a day or a measured series
    let per_step = measured.is_some() || clear.as_ref().is_some_and(|c| c.days.len() == 1);
    let (series, search): (&dyn Series, &dyn Series) = match (&measured, &clear_series, &thinned_series) {
        (Some(m), _, _) => (m, m),
        (None, Some(c), Some(t)) => (c, if per_step { c } else { t }),
        _ => return Err(Failure::Usage("give --lat/--lon with --date or --year, or --spectra FILE".into())),
    };
    let am15g = Illumination::one_sun(Source::am15g());
    let mut none = |_: usize, _: usize| {};
    let (gaps_j, best_gap_ev, best_gaps_ev, am) = match what {
        What::Fixed(g) => (g.iter().map(|&x| ev(x)).collect::<Vec<f64>>(), None, None, None),
        What::Best { junctions: 1, from_ev, to_ev: hi_ev } => {
            let n = ((hi_ev - from_ev) / GAP_GRID_EV).round().max(2.0) as usize;
            let grid: Vec<f64> = (0..=n).map(|i| ev(from_ev + (hi_ev - from_ev) * i as f64 / n as f64)).collect();
            let curve = gap_curve(series, &template, &grid, &mut none)?;
            let (g, _) =
                curve.best().ok_or_else(|| Failure::Usage("no band gap to search; widen --from/--to".into()))?;
            let std = sweep(&am15g, &template, &grid);
            let std_best = best_gap(&am15g, &template, &std)
                .ok_or_else(|| Failure::Usage("no band gap to search; widen --from/--to".into()))?;
            let am = (vec![std_best.gap_j], std_best.efficiency);
            (vec![g], Some(to_ev(g)), None, Some(am))
        }
        What::Best { junctions, from_ev, to_ev: hi_ev } => {
            let problem = Problem {
                light: &am15g,
                cell: template,
                connection: pconn,
                junctions,
                fixed: None,
                range_j: (ev(from_ev), ev(hi_ev)),
                seeds: Vec::new(),
                extras: Default::default(),
            };
            let std_best = optimize(&problem);
            let g = best_stack_gaps(search, &template, pconn, &std_best.gaps_j, (ev(from_ev), ev(hi_ev)), &mut none)?;
            let gev: Vec<f64> = g.iter().map(|&x| to_ev(x)).collect();
            (g, None, Some(gev), Some((std_best.gaps_j.clone(), std_best.efficiency)))
        }
    };
    let device = Device { template, gaps_j: gaps_j.clone(), connection: pconn };
    let mut steps = Vec::new();
    let energy = device_energy(series, &device, &mut none, &mut |s, inc, el| {
        if per_step {
            steps.push(StepRow { time: iso_time(&s.when), plane_w_m2: inc, electric_w_m2: el });
        }
    })?;
    let am15g_optimum = match am {
        Some((g, eff)) => {
            let d = Device { template, gaps_j: g.clone(), connection: pconn };
            let e = device_energy(series, &d, &mut none, &mut |_, _, _| {})?;
            Some(Am15gOptimum {
                gaps_ev: g.iter().map(|&x| to_ev(x)).collect(),
                efficiency: eff,
                electric_kwh_m2: e.electric_j_m2 / J_PER_KWH,
            })
        }
        None => None,
    };
    let report = YieldReport {
        note: format!(
            "{}; cell temperature constant at {} K; no clouds, soiling or reflection losses: an upper limit",
            if p.text("spectra").is_some() { "measured spectra" } else { "clear sky" },
            template.temp_k
        ),
        period,
        step_min,
        connection: (gaps_j.len() > 1).then(|| connection_words(conn)),
        gaps_ev: gaps_j.iter().map(|&x| to_ev(x)).collect(),
        incident_kwh_m2: energy.incident_j_m2 / J_PER_KWH,
        electric_kwh_m2: energy.electric_j_m2 / J_PER_KWH,
        energy_efficiency: energy.efficiency(),
        best_gap_ev,
        best_gaps_ev,
        am15g_optimum,
        steps,
    };
    if p.flag("json") {
        return print_json(out, &report);
    }
    write_text(out, &report, conn)
}

fn write_text(out: Out, r: &YieldReport, conn: Connection) -> Result<(), Failure> {
    let gaps: Vec<String> = r.gaps_ev.iter().map(|g| format!("{g:.3}")).collect();
    writeln!(out, "{:<28} {}", "Period", r.period)?;
    if let Some(s) = r.step_min {
        writeln!(out, "{:<28} {s} min", "Time step")?;
    }
    let kind = if r.gaps_ev.len() > 1 { format!(" ({})", connection_words(conn)) } else { String::new() };
    let label =
        if r.best_gap_ev.is_some() || r.best_gaps_ev.is_some() { "Best gap(s) for this period" } else { "Gap(s)" };
    writeln!(out, "{:<28} {} eV{kind}", label, gaps.join(", "))?;
    writeln!(out, "{:<28} {:.2} kWh/m²", "Incident energy", r.incident_kwh_m2)?;
    writeln!(out, "{:<28} {:.2} kWh/m²", "Electric energy", r.electric_kwh_m2)?;
    writeln!(out, "{:<28} {:.2} %", "Energy efficiency", r.energy_efficiency * 100.0)?;
    if let Some(a) = &r.am15g_optimum {
        let g: Vec<String> = a.gaps_ev.iter().map(|g| format!("{g:.3}")).collect();
        writeln!(
            out,
            "{:<28} {} eV ({:.2} % under AM1.5G; {:.2} kWh/m² here)",
            "AM1.5G optimum",
            g.join(", "),
            a.efficiency * 100.0,
            a.electric_kwh_m2
        )?;
    }
    writeln!(out, "Note: {}.", r.note)?;
    Ok(())
}
