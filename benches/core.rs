//! Benchmarks of the physics core. Numbers are printed, never asserted: run
//! `cargo bench` and read them. Goals:
//! * one exact cell evaluation under 5 us,
//! * the efficiency-vs-gap curve, 0.30-4.00 eV at 1 meV (3,701 gaps) on AM1.5G, under 1 ms,
//!   and ahead of the vectorized numpy script benches/sweep_numpy.py (import time excluded),
//! * the command line's peak memory for a 37,001-gap sweep under 30 MB,
//! * the whole `glowgap sweep --step 0.0001 --best --json` process (37,001 gaps) at least 3x
//!   faster than the numpy script's compute alone for the same gaps, and the whole
//!   `glowgap map` process for the 500 x 500 series map at least 10x faster than
//!   benches/map_numpy.py's compute, with the same best point, in under 64 MB.
//!
//! * one clear-sky spectrum (122 wavelengths) under 0.2 ms with the solar position.
//!
//! * hot emitters: one TPV evaluation with a profile emitter under 2 ms, a 1,000-gap TPV
//!   sweep under 50 ms and one best step absorber under 20 ms, each printed beside the
//!   vectorized numpy script benches/tpv_numpy.py for the same work.
//!
//! * films: a 10-layer stack's hemispherical emissivity on 3000 wavelengths (24 directions
//!   plus the normal, both polarizations) under 10 ms, beside benches/film_numpy.py for the
//!   same work; the same stack's radiator table on its own fringe-resolving grid; one full
//!   film evaluation in the balance; a 5-layer thickness search for net cooling power
//!   (goal: under 2 s in the page, where it runs single-threaded in a worker).
//!
//! * place and time: one solar position (zenith, azimuth, incidence, equation of time) well
//!   inside the 0.2 ms that one moment's position and spectrum may take together.
//!
//! * energy over a clear day or year at an example place (38 N, 15 W, plane tilted 30 deg
//!   facing south): one moment's position and spectrum under 0.2 ms; a 2025 year at
//!   15-minute steps (35,040) for one 1.34 eV cell under 1 s and its best single gap
//!   (201 gaps, 0.50-2.50 eV) under 3 s; the same two for one day of 288 five-minute steps
//!   (what the page recomputes when the date changes; goals scaled from the year's: 10 ms
//!   and 30 ms); the year beside benches/yield_numpy.py for the same work in this same run,
//!   with the ratio and both years' electric energy (expected within 2 % of each other).
//!
//! Whole-process figures are the median of 5 runs of target/release/glowgap; the machine
//! may be shared, so read medians and ratios of one run, not single numbers.

use glowgap::physics::constants::ev;
use glowgap::physics::junction::{best_of, solve_cell, sweep, Cell, Illumination};
use glowgap::physics::planck::band_power_energy;
use glowgap::physics::sources::Source;
use std::hint::black_box;
use std::process::Command;
use std::time::Instant;

/// Median wall time of `f` over `rounds` rounds of `inner` calls, per call, in seconds.
fn median_per_call(rounds: usize, inner: usize, mut f: impl FnMut()) -> f64 {
    for _ in 0..inner.min(1000) {
        f(); // warm up caches and the lazily parsed tables
    }
    let mut t: Vec<f64> = (0..rounds)
        .map(|_| {
            let start = Instant::now();
            for _ in 0..inner {
                f();
            }
            start.elapsed().as_secs_f64() / inner as f64
        })
        .collect();
    t.sort_by(f64::total_cmp);
    t[rounds / 2]
}

fn main() {
    // `cargo bench -- <filter>` passes arguments; `cargo test --benches` passes --bench. Run
    // everything in both cases, quickly when not benchmarking for real.
    let quick = !std::env::args().any(|a| a == "--bench");
    let rounds = if quick { 3 } else { 31 };
    let light = Illumination::one_sun(Source::am15g());

    let one = median_per_call(rounds, 20_000, || {
        black_box(solve_cell(black_box(&light), black_box(&Cell::ideal(ev(1.34)))));
    });
    println!("bench one_exact_cell_am15g          {:>10.3} us   (goal < 5 us)", one * 1e6);

    let gaps: Vec<f64> = (0..3701).map(|i| ev(0.3 + 0.001 * i as f64)).collect();
    let template = Cell::ideal(1.0);
    let curve = median_per_call(rounds, 20, || {
        black_box(sweep(black_box(&light), &template, black_box(&gaps)));
    });
    let best = best_of(&sweep(&light, &template, &gaps)).unwrap();
    println!(
        "bench curve_3701_gaps_am15g         {:>10.3} ms   (goal < 1 ms; best {:.3} eV, {:.4} %)",
        curve * 1e3,
        best.gap_j / glowgap::physics::constants::CHARGE,
        best.efficiency * 100.0
    );

    let band = median_per_call(rounds, 100_000, || {
        black_box(band_power_energy(black_box(ev(0.1)), black_box(ev(0.155)), black_box(300.0)));
    });
    println!("bench planck_band_integral          {:>10.3} ns", band * 1e9);
    sun_position(rounds);

    clear_sky(rounds);

    numpy_comparison(curve, quick);
    cli_peak_memory();
    sweep_37001(rounds, quick);
    radiator_balance(rounds);
    stack_map(rounds);
    hot_emitters(rounds, quick);
    films(rounds, quick);
    silicon(rounds, quick);
    energy_yield(rounds, quick);
}

/// One clear-sky spectrum (122 wavelengths, Hay-Davies plane of array) and its source.
/// Goal, with the solar position: under 0.2 ms for a moment. Printed only.
fn clear_sky(rounds: usize) {
    use glowgap::physics::clear_sky::{clear_sky_source, clear_sky_spectra, ClearSkyInput};
    let input = ClearSkyInput {
        apparent_zenith_rad: 48.19f64.to_radians(),
        incidence_rad: 11.19f64.to_radians(),
        tilt_rad: 37f64.to_radians(),
        ..Default::default()
    };
    let one = median_per_call(rounds, 2_000, || {
        black_box(clear_sky_spectra(black_box(&input)));
    });
    let s = clear_sky_spectra(&input);
    let with_source = median_per_call(rounds, 2_000, || {
        black_box(clear_sky_source(&clear_sky_spectra(black_box(&input)), "clear sky").ok());
    });
    println!(
        "bench clear_sky_spectrum            {:>10.3} us   (goal with the solar position < 200 us; {:.1} W/m2 on the plane; {:.3} us with the source)",
        one * 1e6,
        s.plane_global_total(),
        with_source * 1e6
    );
}

/// Hot emitters: one TPV evaluation with a profile emitter from scratch (goal < 2 ms), a
/// 1,000-gap TPV sweep (goal < 50 ms) and one best step absorber under AM1.5D at 100 suns
/// (goal < 20 ms), the last two next to the vectorized numpy script benches/tpv_numpy.py
/// for the same work in this same run. Printed only.
fn hot_emitters(rounds: usize, quick: bool) {
    use glowgap::physics::radiator::emissivity::Profile;
    use glowgap::physics::solar_thermal::{best_cutoff, AbsorberSetup};
    use glowgap::physics::stack::Connection;
    use glowgap::physics::tpv::{Tpv, TpvSetup};
    let profile = TpvSetup {
        emitter: Profile::Points { points: vec![(0.5e-6, 0.9), (2.0e-6, 0.8), (4.0e-6, 0.2), (10e-6, 0.1)] },
        emitter_temp_k: 2000.0,
        view_factor: 1.0,
        subgap_absorptance: Profile::Grey { emissivity: 0.05 },
        cell_temp_k: 300.0,
        ere: 1.0,
    };
    let eval = median_per_call(rounds, 20, || {
        black_box(Tpv::new(black_box(&profile)).solve(&[ev(0.74)], Connection::Series));
    });
    println!("bench tpv_eval_profile_emitter      {:>10.3} ms   (goal < 2 ms; setup and solve)", eval * 1e3);
    let black = TpvSetup { emitter: Profile::blackbody(), ..profile };
    let tpv = Tpv::new(&black);
    let gaps: Vec<f64> = (0..1000).map(|i| ev(0.4 + 1.2 * i as f64 / 999.0)).collect();
    let sweep = median_per_call(rounds, 1, || {
        black_box(tpv.sweep(black_box(&gaps)));
    });
    let pts = tpv.sweep(&gaps);
    let best = pts.iter().max_by(|a, b| a.efficiency.total_cmp(&b.efficiency)).copied().unwrap_or_default();
    println!(
        "bench tpv_sweep_1000_gaps           {:>10.3} ms   (goal < 50 ms; best {:.6} eV, {:.9} %)",
        sweep * 1e3,
        best.gap_j / glowgap::physics::constants::CHARGE,
        best.efficiency * 100.0
    );
    let setup = AbsorberSetup { source: Source::am15d(), concentration: 100.0, ambient_k: 300.0, hc_w_m2k: 0.0 };
    let abs = median_per_call(rounds.min(11), 1, || {
        black_box(best_cutoff(black_box(&setup)));
    });
    let b = best_cutoff(&setup);
    println!(
        "bench absorber_best_am15d_100x      {:>10.3} ms   (goal < 20 ms; {:.6} um, {:.4} K, {:.9} %)",
        abs * 1e3,
        b.cutoff_m.unwrap_or(f64::NAN) * 1e6,
        b.temp_k,
        b.work_efficiency * 100.0
    );
    let Some(out) = run_numpy_script("tpv_numpy.py", "numpy_hot_emitters", Some(if quick { "1" } else { "5" })) else {
        return;
    };
    if let Some(np) = number_after(&out, "numpy_tpv_sweep_seconds=") {
        println!(
            "bench numpy_tpv_sweep_1000_gaps     {:>10.3} ms   (ratio numpy/glowgap {:.2}x; numpy best {:.6} eV, {:.9} %)",
            np * 1e3,
            np / sweep,
            number_after(&out, "best_eff_gap_ev=").unwrap_or(f64::NAN),
            number_after(&out, "best_efficiency=").unwrap_or(f64::NAN) * 100.0
        );
    }
    if let Some(np) = number_after(&out, "numpy_absorber_best_seconds=") {
        println!(
            "bench numpy_absorber_best           {:>10.3} ms   (ratio numpy/glowgap {:.2}x; numpy {:.6} um, {:.4} K, {:.9} %)",
            np * 1e3,
            np / abs,
            number_after(&out, "best_cutoff_um=").unwrap_or(f64::NAN),
            number_after(&out, "best_temp_k=").unwrap_or(f64::NAN),
            number_after(&out, "best_work_efficiency=").unwrap_or(f64::NAN) * 100.0
        );
    }
}

/// The 200 x 200 two-junction series map on AM1.5G (goal < 30 ms), the same map at
/// 500 x 500 next to the vectorized numpy script benches/map_numpy.py for it (goal: numpy
/// at least 10x slower; both best points printed), and a 3-junction series optimization.
/// Printed only.
fn stack_map(rounds: usize) {
    use glowgap::physics::stack::map::tandem_map;
    use glowgap::physics::stack::optimize::{optimize, Problem, SEARCH_RANGE_EV};
    use glowgap::physics::stack::Connection;
    let light = Illumination::one_sun(Source::am15g());
    let tops: Vec<f64> = (0..200).map(|i| ev(1.2 + 1.2 * i as f64 / 199.0)).collect();
    let bottoms: Vec<f64> = (0..200).map(|i| ev(0.5 + 1.0 * i as f64 / 199.0)).collect();
    let cell = Cell::ideal(1.0);
    let map = median_per_call(rounds, 3, || {
        black_box(tandem_map(black_box(&light), &cell, Connection::Series, &tops, &bottoms));
    });
    let p = Problem {
        light: &light,
        cell,
        connection: Connection::Series,
        junctions: 3,
        fixed: None,
        range_j: (ev(SEARCH_RANGE_EV.0), ev(SEARCH_RANGE_EV.1)),
        seeds: vec![],
        extras: Default::default(),
    };
    let best = optimize(&p);
    let opt = median_per_call(rounds.min(5), 1, || {
        black_box(optimize(black_box(&p)));
    });
    println!("bench stack_map_200x200_series      {:>10.3} ms   (goal < 30 ms)", map * 1e3);
    println!(
        "bench stack_optimize_3j_series      {:>10.3} ms   ({} evaluations, {:.3} %)",
        opt * 1e3,
        best.evaluations,
        best.efficiency * 100.0
    );

    // 500 x 500 on the same axes (start + width * i / 499, both ends), as map_numpy.py builds them
    let tops: Vec<f64> = (0..500).map(|i| ev(1.2 + 1.2 * i as f64 / 499.0)).collect();
    let bottoms: Vec<f64> = (0..500).map(|i| ev(0.5 + 1.0 * i as f64 / 499.0)).collect();
    let big = median_per_call(rounds, 1, || {
        black_box(tandem_map(black_box(&light), &cell, Connection::Series, &tops, &bottoms));
    });
    let q = glowgap::physics::constants::CHARGE;
    let ours = tandem_map(&light, &cell, Connection::Series, &tops, &bottoms).best().map(|(t, b, e)| (t / q, b / q, e));
    match ours {
        Some((t, b, e)) => println!(
            "bench stack_map_500x500_series      {:>10.3} ms   (best {t:.6} / {b:.6} eV, {:.9} %)",
            big * 1e3,
            e * 100.0
        ),
        None => println!("bench stack_map_500x500_series      {:>10.3} ms   (empty map)", big * 1e3),
    }
    let scalar = median_per_call(rounds.min(5), 1, || {
        black_box(glowgap::physics::stack::map::tandem_map_scalar(
            black_box(&light),
            &cell,
            Connection::Series,
            &tops,
            &bottoms,
        ));
    });
    println!("bench stack_map_500x500_scalar_path {:>10.3} ms   (one point at a time, one thread)", scalar * 1e3);
    let args = ["map", "--top", "1.2:2.4:500", "--bottom", "0.5:1.5:500", "--best", "--json"];
    let process = process_median(&args);
    println!(
        "bench cli_map_500x500_process       {:>10.3} ms   (whole process, median of 5: glowgap {})",
        process * 1e3,
        args.join(" ")
    );
    println!("bench cli_map_500x500_peak_memory   {:>10}      (goal < 64 MB)", peak_memory(&args));
    numpy_map_comparison(big, process, ours);
}

/// Median wall time [s] of 5 runs of the glowgap binary with `args` (output discarded).
fn process_median(args: &[&str]) -> f64 {
    let exe = env!("CARGO_BIN_EXE_glowgap");
    let mut t: Vec<f64> = (0..5)
        .map(|_| {
            let start = Instant::now();
            let ok =
                Command::new(exe).args(args).stdout(std::process::Stdio::null()).status().is_ok_and(|s| s.success());
            if ok {
                start.elapsed().as_secs_f64()
            } else {
                f64::NAN
            }
        })
        .collect();
    t.sort_by(f64::total_cmp);
    t[2]
}

/// The peak resident memory the binary reports for `args` (GLOWGAP_REPORT_PEAK_MEMORY=1).
fn peak_memory(args: &[&str]) -> String {
    let out = Command::new(env!("CARGO_BIN_EXE_glowgap"))
        .args(args)
        .env("GLOWGAP_REPORT_PEAK_MEMORY", "1")
        .stdout(std::process::Stdio::null())
        .output();
    match out {
        Ok(o) => String::from_utf8_lossy(&o.stderr)
            .lines()
            .find_map(|l| l.strip_prefix("glowgap: peak memory ").map(str::to_string))
            .unwrap_or_else(|| "unknown".into()),
        Err(e) => format!("skipped ({e})"),
    }
}

/// The 37,001-gap sweep of `glowgap sweep --from 0.3 --to 4.0 --step 0.0001 --best --json`:
/// in process (batch engine on every core, and the scalar path), the whole process, and
/// benches/sweep_numpy.py for the same 37,001 gaps in this same run (goal: numpy's compute
/// at least 3x the whole process).
fn sweep_37001(rounds: usize, quick: bool) {
    let light = Illumination::one_sun(Source::am15g());
    let gaps: Vec<f64> = (0..37_001).map(|i| ev(0.3 + 1e-4 * i as f64)).collect();
    let template = Cell::ideal(1.0);
    let fast = median_per_call(rounds, 3, || {
        black_box(sweep(black_box(&light), &template, black_box(&gaps)));
    });
    let scalar = median_per_call(rounds.min(9), 1, || {
        black_box(glowgap::physics::junction::sweep_scalar(black_box(&light), &template, black_box(&gaps)));
    });
    println!("bench sweep_37001_gaps_in_process   {:>10.3} ms   (batch engine, every core; scalar path {:.3} ms, one thread)", fast * 1e3, scalar * 1e3);
    let args = ["sweep", "--from", "0.3", "--to", "4.0", "--step", "0.0001", "--best", "--json"];
    let process = process_median(&args);
    println!(
        "bench cli_sweep_37001_process       {:>10.3} ms   (whole process, median of 5: glowgap {})",
        process * 1e3,
        args.join(" ")
    );
    let Some(out) =
        run_numpy_script_with("sweep_numpy.py", "numpy_sweep_37001", Some(if quick { "1" } else { "5" }), Some("0.1"))
    else {
        return;
    };
    match number_after(&out, "numpy_sweep_seconds=") {
        Some(np_s) => {
            println!("bench numpy_sweep_37001_gaps        {:>10.3} ms   (compute only, median of 5; import and table load not counted)", np_s * 1e3);
            println!(
                "bench ratio numpy/glowgap sweep     {:>10.1} x    (goal >= 3x, numpy compute / glowgap whole process; {:.1}x against glowgap in process)",
                np_s / process,
                np_s / fast
            );
        }
        None => println!("bench numpy_sweep_37001             skipped (no timing line in the script's output)"),
    }
}

/// Run benches/map_numpy.py (the same 500 x 500 series map, vectorized numpy) in this same
/// run; print its time, the ratio numpy/glowgap and both best points. A missing python or
/// numpy prints "skipped". When not benchmarking for real it times one repeat only.
fn numpy_map_comparison(ours_s: f64, process_s: f64, ours_best: Option<(f64, f64, f64)>) {
    let quick = !std::env::args().any(|a| a == "--bench");
    let Some(out) = run_numpy_script("map_numpy.py", "numpy_map_comparison", Some(if quick { "1" } else { "5" }))
    else {
        return;
    };
    let field = |key: &str| number_after(&out, key);
    let Some(np_s) = field("numpy_map_seconds=") else {
        println!("bench numpy_map_comparison          skipped (no timing line in the script's output)");
        return;
    };
    let check = match (field("selfcheck_rows="), field("max_abs_efficiency_diff=")) {
        (Some(n), Some(d)) => format!("; self-check against the scipy fixture: {n} rows, max |diff| {d:.1e}"),
        _ => String::new(),
    };
    println!(
        "bench numpy_map_500x500_series      {:>10.3} ms   (numpy import {:.1} ms, not counted{check})",
        np_s * 1e3,
        field("numpy_import_seconds=").unwrap_or(f64::NAN) * 1e3
    );
    println!(
        "bench ratio numpy/glowgap map       {:>10.1} x    (goal >= 10x, numpy compute / glowgap whole process; {:.1}x against glowgap in process)",
        np_s / process_s,
        np_s / ours_s
    );
    let theirs = match (field("best_top_ev="), field("best_bottom_ev="), field("best_efficiency=")) {
        (Some(t), Some(b), Some(e)) => Some((t, b, e)),
        _ => None,
    };
    match (ours_best, theirs) {
        (Some((t, b, e)), Some((nt, nb, ne))) => {
            // the grid steps are 2.4 and 2.0 meV; the script prints gaps to 1 ueV
            let same = (t - nt).abs() < 1e-5 && (b - nb).abs() < 1e-5;
            println!(
                "bench map_best_points               {}  (glowgap {t:.6} / {b:.6} eV {:.9} %; numpy {nt:.6} / {nb:.6} eV {:.9} %; efficiency diff {:.1e})",
                if same { "agree " } else { "DIFFER" },
                e * 100.0,
                ne * 100.0,
                (e - ne).abs()
            );
        }
        _ => println!("bench map_best_points               not compared (a best point is missing)"),
    }
}

/// The radiator balance (goals: one full balance with an angle-dependent profile and
/// the clear sky on the default grid under 2 ms; the steady temperature under 5 ms). The
/// closed-form case (window emitter, box sky) for scale. Printed only.
fn radiator_balance(rounds: usize) {
    use glowgap::physics::radiator::{evaluate, AngularModel, Balance, Emitter, Profile, Sky, Sun, Surroundings};
    let window = Emitter::new(Profile::ideal_window(8e-6, 13e-6));
    let boxed = Surroundings { sky: Sky::textbook_box(), ambient_k: 300.0, sun: None, h_c: 0.0 };
    let exact = median_per_call(rounds, 200, || {
        black_box(evaluate(black_box(&window), &boxed, 300.0));
    });
    // control points on the log axis, an angular cut-off at 70 deg (0.1 beyond), under the
    // clear sky with 1.5 cm of water and the AM1.5G sun, h_c = 5 W/m2K
    let mut points = Emitter::new(Profile::Points {
        points: vec![(0.3e-6, 0.05), (4e-6, 0.05), (8e-6, 0.95), (13e-6, 0.95), (14e-6, 0.2)],
    });
    points.angular = AngularModel::CutOff { angle_rad: 70f64.to_radians(), beyond: 0.1 };
    let clear = Surroundings {
        sky: Sky::Clear { pwv_m: 0.015 },
        ambient_k: 300.0,
        sun: Some(Sun { source: Source::am15g(), zenith_rad: 0.0, scale: 1.0 }),
        h_c: 5.0,
    };
    let balance = median_per_call(rounds, 20, || {
        black_box(Balance::new(black_box(&points), &clear).parts(300.0));
    });
    let prepared = Balance::new(&points, &clear);
    let steady = median_per_call(rounds, 20, || {
        black_box(black_box(&prepared).steady());
    });
    let from_scratch = median_per_call(rounds, 20, || {
        black_box(Balance::new(black_box(&points), &clear).steady());
    });
    let full = median_per_call(rounds, 20, || {
        black_box(evaluate(black_box(&points), &clear, 300.0));
    });
    let nodes = glowgap::physics::radiator::spectral::Grid::fine(&{
        let mut k = points.knots();
        k.extend(clear.sky.knots());
        k
    })
    .nodes
    .len();
    println!(
        "bench radiator_closed_form          {:>10.3} ms   (window emitter, box sky: balance, steady T, figures)",
        exact * 1e3
    );
    println!("bench radiator_balance_clear_sky    {:>10.3} ms   (goal < 2 ms; cut-off points emitter, clear sky, AM1.5G, {nodes} grid nodes)", balance * 1e3);
    println!(
        "bench radiator_steady_temperature   {:>10.3} ms   (goal < 5 ms; {:.3} ms with the balance prepared)",
        from_scratch * 1e3,
        steady * 1e3
    );
    println!("bench radiator_evaluate_clear_sky   {:>10.3} ms   (balance, steady T and figures of merit)", full * 1e3);
}

/// Run `benches/<script>` with python (`$PYTHON`, default python3) in this same run, with
/// GLOWGAP_BENCH_REPEATS = `repeats` when given; its standard output, or None after printing
/// why the comparison `label` is skipped (no python, no numpy, a failing script).
fn run_numpy_script(script: &str, label: &str, repeats: Option<&str>) -> Option<String> {
    run_numpy_script_with(script, label, repeats, None)
}

/// As [`run_numpy_script`], with GLOWGAP_BENCH_STEP_MEV = `step_mev` when given.
fn run_numpy_script_with(script: &str, label: &str, repeats: Option<&str>, step_mev: Option<&str>) -> Option<String> {
    let path = format!("{}/benches/{script}", env!("CARGO_MANIFEST_DIR"));
    let python = std::env::var("PYTHON").unwrap_or_else(|_| "python3".into());
    let mut cmd = Command::new(&python);
    cmd.arg(path);
    if let Some(r) = repeats {
        cmd.env("GLOWGAP_BENCH_REPEATS", r);
    }
    if let Some(s) = step_mev {
        cmd.env("GLOWGAP_BENCH_STEP_MEV", s);
    }
    match cmd.output() {
        Ok(o) if o.status.success() => Some(String::from_utf8_lossy(&o.stdout).into_owned()),
        Ok(o) => {
            let why = String::from_utf8_lossy(&o.stderr).lines().last().unwrap_or("").to_string();
            println!("bench {label:<30} skipped ({python} failed: {why})");
            None
        }
        Err(e) => {
            println!("bench {label:<30} skipped ({python} not runnable: {e})");
            None
        }
    }
}

/// The number after `key` (e.g. "numpy_sweep_seconds=") in a script's key=value output.
fn number_after(out: &str, key: &str) -> Option<f64> {
    out.split_whitespace().find_map(|tok| tok.strip_prefix(key).and_then(|v| v.parse().ok()))
}

/// Run the vectorized numpy script for the same curve in this same run and print the ratio.
fn numpy_comparison(ours_s: f64, quick: bool) {
    let Some(out) = run_numpy_script("sweep_numpy.py", "numpy_comparison", quick.then_some("3")) else { return };
    let field = |key: &str| number_after(&out, key);
    match (field("numpy_sweep_seconds="), field("numpy_import_seconds=")) {
        (Some(np_s), imp) => {
            println!(
                "bench numpy_curve_3701_gaps         {:>10.3} ms   (numpy import {:.1} ms, not counted)",
                np_s * 1e3,
                imp.unwrap_or(f64::NAN) * 1e3
            );
            println!("bench ratio numpy/glowgap           {:>10.1} x    (goal > 1)", np_s / ours_s);
        }
        _ => println!("bench numpy_comparison              skipped (no timing line in the script's output)"),
    }
}

/// Peak resident memory of `glowgap sweep` over 37,001 gaps with JSON output.
fn cli_peak_memory() {
    let exe = env!("CARGO_BIN_EXE_glowgap");
    let out = Command::new(exe)
        .args(["sweep", "--from", "0.3", "--to", "4.0", "--step", "0.0001", "--json"])
        .env("GLOWGAP_REPORT_PEAK_MEMORY", "1")
        .stdout(std::process::Stdio::null())
        .output();
    match out {
        Ok(o) => {
            let err = String::from_utf8_lossy(&o.stderr);
            let peak = err.lines().find_map(|l| l.strip_prefix("glowgap: peak memory ")).unwrap_or("unknown");
            println!("bench cli_sweep_37001_peak_memory   {:>10}      (goal < 30 MB)", peak);
        }
        Err(e) => println!("bench cli_sweep_37001_peak_memory   skipped ({e})"),
    }
}

/// Silicon (real absorber): one cell from scratch (goal < 1 ms), one re-solve at a new
/// thickness with the model kept (what a drag of the thickness costs), a 100-point
/// thickness sweep from scratch (goal < 50 ms) beside benches/silicon_numpy.py in the same
/// run, the best top gap over 300 um silicon, and a 121 x 121 top-gap by thickness map.
fn silicon(rounds: usize, quick: bool) {
    use glowgap::physics::real_cell::RealCellModel;
    use glowgap::physics::silicon::{Doping, RealAbsorber, Trapping};
    use glowgap::physics::stack::mixed::{thickness_map, RealBottom, StackExtras};
    use glowgap::physics::stack::optimize::{optimize, Problem, SEARCH_RANGE_EV};
    use glowgap::physics::stack::Connection;
    use std::sync::Arc;
    let light = Illumination::one_sun(Source::am15g());
    let si = RealAbsorber::silicon(110e-6, Trapping::Lambertian).unwrap();
    let one = median_per_call(rounds, 20, || {
        let m = RealCellModel::new(black_box(&si), &light, 300.0, Doping::Undoped, true);
        black_box(m.solve(110e-6, Trapping::Lambertian));
    });
    let model = RealCellModel::new(&si, &light, 300.0, Doping::Undoped, true);
    let again = median_per_call(rounds, 200, || {
        black_box(model.solve(black_box(123e-6), Trapping::Lambertian));
    });
    let ws: Vec<f64> = (0..100).map(|i| 1e-6 * 1000f64.powf(i as f64 / 99.0)).collect();
    let mut best = (0.0, 0.0);
    let sweep100 = median_per_call(rounds, 3, || {
        let m = RealCellModel::new(&si, &light, 300.0, Doping::Undoped, true);
        let rs = m.sweep(black_box(&ws), Trapping::Lambertian);
        let i = (0..rs.len()).max_by(|&a, &b| rs[a].efficiency.total_cmp(&rs[b].efficiency)).unwrap_or(0);
        best = (ws[i], rs[i].efficiency);
    });
    println!("bench silicon_cell_from_scratch     {:>10.3} ms   (goal < 1 ms)", one * 1e3);
    println!("bench silicon_cell_new_thickness    {:>10.3} us   (model kept: a thickness drag)", again * 1e6);
    println!(
        "bench silicon_sweep_100_points      {:>10.3} ms   (goal < 50 ms; best {:.1} um, {:.4} %)",
        sweep100 * 1e3,
        best.0 * 1e6,
        best.1 * 100.0
    );
    if let Some(out) = run_numpy_script("silicon_numpy.py", "numpy_silicon_sweep", Some(if quick { "1" } else { "20" }))
    {
        match number_after(&out, "numpy_silicon_sweep_seconds=") {
            Some(np_s) => {
                println!(
                    "bench numpy_silicon_sweep_100       {:>10.3} ms   (best {} um, {})",
                    np_s * 1e3,
                    number_after(&out, "best_thickness_um=").unwrap_or(f64::NAN),
                    number_after(&out, "best_efficiency=").unwrap_or(f64::NAN)
                );
                println!("bench ratio numpy/glowgap silicon   {:>10.1} x", np_s / sweep100);
            }
            None => println!("bench numpy_silicon_sweep_100       skipped (no timing line in the script's output)"),
        }
    }
    let si300 = RealAbsorber::silicon(300e-6, Trapping::Lambertian).unwrap();
    let bottom = RealBottom {
        model: Arc::new(RealCellModel::new(&si300, &light, 298.15, Doping::Undoped, true)),
        thickness_m: 300e-6,
        trapping: Trapping::Lambertian,
    };
    let p = Problem {
        light: &light,
        cell: Cell { temp_k: 298.15, ..Cell::ideal(1.0) },
        connection: Connection::Series,
        junctions: 1,
        fixed: None,
        range_j: (ev(SEARCH_RANGE_EV.0), ev(SEARCH_RANGE_EV.1)),
        seeds: vec![],
        extras: StackExtras { bottom: Some(bottom.clone()), coupling: 0.0 },
    };
    let found = optimize(&p);
    let opt = median_per_call(rounds.min(5), 1, || {
        black_box(optimize(black_box(&p)));
    });
    println!(
        "bench tandem_on_silicon_best_top    {:>10.3} ms   ({:.4} eV, {:.3} %, {} evaluations)",
        opt * 1e3,
        found.gaps_j.first().copied().unwrap_or(0.0) / glowgap::physics::constants::CHARGE,
        found.efficiency * 100.0,
        found.evaluations
    );
    let tops: Vec<f64> = (0..121).map(|i| ev(1.2 + 1.2 * i as f64 / 120.0)).collect();
    let thick: Vec<f64> = (0..121).map(|i| 10e-6 * 100f64.powf(i as f64 / 120.0)).collect();
    let cell = Cell { temp_k: 298.15, ..Cell::ideal(1.0) };
    let map = median_per_call(rounds.min(5), 1, || {
        black_box(thickness_map(&light, &cell, &bottom, &tops, &thick, Connection::Series, 0.0));
    });
    println!("bench silicon_map_121x121_series    {:>10.3} ms", map * 1e3);
}

/// Film emitters: the 10-layer table of benches/film_numpy.py, the radiator's own table of
/// the same stack, and a 5-layer thickness search.
fn films(rounds: usize, quick: bool) {
    use glowgap::physics::film::{emissivity, Complex, Layer};
    use glowgap::physics::radiator::design::{Design, Target};
    use glowgap::physics::radiator::layered::{film_table, Directional, FILM_SPAN_M};
    use glowgap::physics::radiator::{Sky, Sun};
    let ten: Vec<Layer> = (0..10)
        .map(|i| {
            if i % 2 == 0 {
                Layer::new(Complex::new(2.1, 0.002), 150e-9)
            } else {
                Layer::new(Complex::new(1.45, 0.01), 250e-9)
            }
        })
        .collect();
    let sub = Complex::new(0.1, 60.0);
    let grid: Vec<f64> = (0..3000).map(|i| 0.25e-6 * (200f64).powf(i as f64 / 2999.0)).collect();
    let build = || {
        Directional::build(grid.clone(), &[1.0], |l, mus| {
            mus.iter().map(|mu| emissivity(1.0, &ten, sub, l, mu.acos())).collect()
        })
    };
    let t = median_per_call(rounds.min(11), 1, || {
        black_box(build());
    });
    let table = build();
    let mean = grid.iter().map(|l| table.hemispherical(*l)).sum::<f64>() / grid.len() as f64;
    println!(
        "bench film_10_layers_3000_wavelengths {:>8.3} ms   (goal < 10 ms; 13 directions x 2 polarizations; mean hemispherical {:.12})",
        t * 1e3,
        mean
    );
    let stack = |_: f64| (1.0, ten.clone(), sub);
    let own = median_per_call(rounds.min(11), 1, || {
        black_box(film_table(stack, FILM_SPAN_M, &[1.0]));
    });
    let n_own = film_table(stack, FILM_SPAN_M, &[1.0]).wavelength_m.len();
    println!(
        "bench film_10_layers_radiator_table {:>9.3} ms   ({n_own} fringe-resolving wavelengths, 0.25-200 um)",
        own * 1e3
    );
    if let Some(out) = run_numpy_script("film_numpy.py", "numpy_film", Some(if quick { "1" } else { "5" })) {
        if let Some(np) = number_after(&out, "numpy_film_seconds=") {
            println!(
                "bench numpy_film_10_layers_3000      {:>10.3} ms   (ratio numpy/glowgap {:.2}x; numpy mean hemispherical {})",
                np * 1e3,
                np / t,
                out.split_whitespace()
                    .find_map(|t| t.strip_prefix("mean_hemispherical="))
                    .unwrap_or("?")
            );
        }
    }
    // a 5-layer search for net cooling power under AM1.5G and a clear sky
    let five = |_: f64| {
        (
            1.0,
            vec![
                Layer::new(Complex::new(1.95, 0.001), 100e-9),
                Layer::new(Complex::new(1.4, 0.02), 500e-9),
                Layer::new(Complex::new(1.95, 0.001), 100e-9),
                Layer::new(Complex::new(1.4, 0.02), 300e-9),
                Layer::new(Complex::new(2.3, 0.05), 50e-9),
            ],
            sub,
        )
    };
    let sky = Sky::Clear { pwv_m: 0.015 };
    let sun = Sun { source: Source::am15g(), zenith_rad: 0.0, scale: 1.0 };
    let design = Design::new(five, &[true; 5], 1e-6, Target::NetPower, &sky, Some(&sun), 300.0, 0.0);
    let start = [100e-9, 500e-9, 100e-9, 300e-9, 50e-9];
    let clock = Instant::now();
    let found = design.run(&start, 1e-6, None);
    let s = clock.elapsed().as_secs_f64();
    println!(
        "bench film_search_5_layers_net_power {:>7.1} ms   (goal < 2 s in the page; {} evaluations on {} wavelengths, {:.3} W/m2)",
        s * 1e3,
        found.evaluations,
        design.wavelengths(),
        found.value
    );
}

/// One solar position: a summer afternoon at mid-latitude on a south-facing 35 deg plane (the
/// periodic terms are parsed once, in the warm-up).
fn sun_position(rounds: usize) {
    use glowgap::physics::solar_position::{delta_t_estimate, sun_at, CivilTime, Observer, Surface};
    let when = CivilTime::utc(2026, 6, 21, 14, 15, 0.0);
    let place = Observer {
        latitude_deg: 40.4,
        longitude_deg: -3.7,
        elevation_m: 650.0,
        pressure_hpa: 940.0,
        temperature_c: 25.0,
    };
    let surface = Surface { tilt_deg: 35.0, azimuth_deg: 180.0 };
    let dt = delta_t_estimate(when.decimal_year());
    let t = median_per_call(rounds, 2_000, || {
        black_box(sun_at(black_box(&when), black_box(&place), black_box(&surface), black_box(dt)).ok());
    });
    println!("bench solar_position_one_moment    {:>10.3} us   (goal: with the spectrum < 200 us)", t * 1e6);
}

/// Median wall time [s] of `rounds` runs of `f` (at least one), with the last run's result;
/// no warm-up: for runs long enough to be their own warm-up, after a bench that has loaded
/// the tables they use.
fn median_of_runs<T>(rounds: usize, mut f: impl FnMut() -> T) -> (f64, T) {
    let start = Instant::now();
    let mut out = black_box(f());
    let mut t = vec![start.elapsed().as_secs_f64()];
    for _ in 1..rounds {
        let start = Instant::now();
        out = black_box(f());
        t.push(start.elapsed().as_secs_f64());
    }
    t.sort_by(f64::total_cmp);
    (t[t.len() / 2], out)
}

/// The example place of the energy benches: 38 N, 15 W at sea level, a plane tilted 30 deg
/// facing south, the clear-sky air of benches/yield_numpy.py (1.4 cm water, 0.3 atm-cm
/// ozone, aerosol depth 0.1 at 500 nm, Angstrom exponent 1.14, albedo 0.2), and a fixed
/// TT - UT1 of 69 s so that both sides place the sun with the same clock.
fn example_site() -> glowgap::physics::site::Site {
    use glowgap::physics::clear_sky::SkyModel;
    use glowgap::physics::site::{Atmosphere, Site};
    use glowgap::physics::solar_position::{Observer, Surface};
    Site {
        observer: Observer {
            latitude_deg: 38.0,
            longitude_deg: -15.0,
            elevation_m: 0.0,
            pressure_hpa: 1013.25,
            temperature_c: 12.0,
        },
        surface: Surface { tilt_deg: 30.0, azimuth_deg: 180.0 },
        atmosphere: Atmosphere {
            precipitable_water_cm: 1.4,
            ozone_atm_cm: 0.3,
            aod_500nm: 0.1,
            angstrom_exponent: 1.14,
            ground_albedo: 0.2,
            sky: SkyModel::HayDavies,
        },
        delta_t_s: Some(69.0),
    }
}

/// Energy over a clear day or year at [`example_site`]: one moment's position and spectrum
/// (goal < 0.2 ms); a day of 288 five-minute steps (what the page recomputes when the date
/// changes) and a year of 365 x 96 fifteen-minute steps (2025), each for one 1.34 eV ideal
/// cell (goals: year < 1 s, day < 10 ms) and for the best single gap of the 201-gap grid
/// 0.50-2.50 eV (goals: year < 3 s, day < 30 ms); the year beside benches/yield_numpy.py
/// (the same year in vectorized numpy) in this same run, with both energies. Printed only.
fn energy_yield(rounds: usize, quick: bool) {
    use glowgap::physics::constants::CHARGE;
    use glowgap::physics::energy_yield::{device_energy, gap_curve, year_days, ClearSkySeries, Device, Energy};
    use glowgap::physics::site::moment;
    use glowgap::physics::solar_position::CivilTime;
    use glowgap::physics::stack::Connection;
    const KWH: f64 = 3.6e6; // J per kWh
    let site = example_site();
    let when = CivilTime { year: 2025, month: 6, day: 21, hour: 14, minute: 15, second: 0.0, utc_offset_h: -1.0 };
    let one = median_per_call(rounds, 500, || {
        black_box(moment(black_box(&site), black_box(&when)).ok());
    });
    println!(
        "bench yield_moment                   {:>10.3} ms   (goal < 0.2 ms; position and 122-wavelength spectra)",
        one * 1e3
    );

    let device = Device { template: Cell::ideal(ev(1.34)), gaps_j: vec![ev(1.34)], connection: Connection::Series };
    let gaps: Vec<f64> = (0..201).map(|i| ev(0.5 + 0.01 * i as f64)).collect();
    let year = year_days(2025);
    let summer = [(2025, 6, 21)];
    let long_rounds = if quick { 1 } else { 3 };
    let none = &mut |_: usize, _: usize| {};
    let mut year_one_cell = (f64::NAN, Energy::default());
    for (name, days, step_s, runs, goals) in [
        ("day", &summer[..], 300.0, rounds, ("10 ms", "30 ms")),
        ("year", &year[..], 900.0, long_rounds, ("1 s", "3 s")),
    ] {
        let series = ClearSkySeries { site: &site, days, step_s };
        let (cell_s, energy) = median_of_runs(runs, || device_energy(&series, &device, none, &mut |_, _, _| {}));
        let (best_s, curve) = median_of_runs(runs, || gap_curve(&series, &device.template, &gaps, none));
        let (energy, curve) = match (energy, curve) {
            (Ok(e), Ok(c)) => (e, c),
            (Err(e), _) | (_, Err(e)) => {
                println!("bench yield_{name:<25} failed: {e}");
                continue;
            }
        };
        let steps = days.len() * (86_400.0 / step_s) as usize;
        let unit = |s: f64| if name == "day" { format!("{:>10.3} ms", s * 1e3) } else { format!("{s:>10.3} s ") };
        println!(
            "bench {:<31}{}   (goal < {}; {steps} steps, 1.34 eV: {:.4} kWh/m2 of {:.4} incident, {:.4} %)",
            format!("yield_{name}_one_cell"),
            unit(cell_s),
            goals.0,
            energy.electric_j_m2 / KWH,
            energy.incident_j_m2 / KWH,
            energy.efficiency() * 100.0,
        );
        let (g, e) = curve.best().unwrap_or((f64::NAN, f64::NAN));
        println!(
            "bench {:<31}{}   (goal < {}; 201 gaps 0.50-2.50 eV: best {:.4} eV, {:.4} kWh/m2)",
            format!("yield_{name}_best_gap"),
            unit(best_s),
            goals.1,
            g / CHARGE,
            e / KWH,
        );
        if name == "year" {
            year_one_cell = (cell_s, energy);
        }
    }
    let Some(out) = run_numpy_script("yield_numpy.py", "numpy_yield_year", Some(if quick { "1" } else { "3" })) else {
        return;
    };
    let (ours_s, ours) = year_one_cell;
    match (number_after(&out, "numpy_yield_seconds="), number_after(&out, "numpy_yield_kwh_m2=")) {
        (Some(np_s), Some(np_kwh)) => {
            let ours_kwh = ours.electric_j_m2 / KWH;
            println!(
                "bench numpy_yield_year_one_cell      {:>10.3} s    ({np_kwh:.4} kWh/m2 against ours {ours_kwh:.4}: relative difference {:+.1e}, goal < 2e-2: same algorithms coded twice)",
                np_s,
                np_kwh / ours_kwh - 1.0
            );
            println!("bench ratio numpy/glowgap yield_year {:>10.2} x    (compute only on both sides)", np_s / ours_s);
        }
        _ => println!("bench numpy_yield_year_one_cell      skipped (no timing line in the script's output)"),
    }
}
