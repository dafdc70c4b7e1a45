//! What the browser's stack panel relies on beyond the stack physics: the optimizer's
//! progress reports (the panel's search runs `optimize_observed` in a background worker and
//! must find what `glowgap optimize` finds), the display of the stack's headline figures,
//! which the panel and `glowgap stack` / `glowgap eval --stack` share, the refinement of the
//! map's best grid point, and the checks of the search's settings (fixed gap included) that
//! the panel shows next to its controls.

mod common;

use common::fixture_rows;
use glowgap::physics::constants::{ev, to_ev};
use glowgap::physics::junction::{Cell, Emission, Illumination, JvModel};
use glowgap::physics::sources::Source;
use glowgap::physics::stack::map::tandem_map;
use glowgap::physics::stack::optimize::{
    grid_maxima, optimize, optimize_observed, refine, FixAt, FixedGap, Problem, POLISHED_STARTS, PROGRESS_EVERY,
};
use glowgap::physics::stack::{solve_stack, stack_efficiency, Connection};
use glowgap::report::stack::{StackMetric, StackReport};
use glowgap::scenario::stack::{AbsorberSpec, MapSettings, OptimizeSettings};

fn cell() -> Cell {
    Cell { gap_j: 0.0, temp_k: 300.0, ere: 1.0, emission: Emission::Front, model: JvModel::Exact }
}

#[test]
fn observed_search_finds_the_same_optimum_and_reports_progress() {
    let light = Illumination { source: Source::am15g(), concentration: 1.0 };
    for (n, connection) in [(2, Connection::Series), (3, Connection::Independent)] {
        let p = Problem {
            light: &light,
            cell: cell(),
            connection,
            junctions: n,
            fixed: None,
            range_j: (ev(0.5), ev(2.5)),
            seeds: vec![vec![ev(1.7), ev(1.1), ev(0.7)][..n].to_vec()],
            extras: Default::default(),
        };
        let plain = optimize(&p);
        let mut seen = Vec::new();
        let observed = optimize_observed(&p, &mut |k| seen.push(k));
        // the observer only watches: the search is deterministic and must not change
        assert_eq!(plain, observed, "{n} junctions");
        assert!(!seen.is_empty(), "{n} junctions: no progress reported in {} evaluations", plain.evaluations);
        assert!(seen.windows(2).all(|w| w[0] < w[1]), "counts rise: {seen:?}");
        assert!(*seen.last().unwrap() <= plain.evaluations);
        // one report per PROGRESS_EVERY evaluations passed (the 2-junction grid is counted at once)
        assert!(
            seen.len() as u64 <= plain.evaluations / PROGRESS_EVERY,
            "{} reports for {} evaluations",
            seen.len(),
            plain.evaluations
        );
        // the search starts from the seed, so it cannot end below it
        let seed = solve_stack(&light, &cell(), &p.seeds[0], connection).efficiency;
        assert!(plain.efficiency >= seed);
    }
}

#[test]
fn stack_figures_display_with_their_units_and_connection_labels() {
    let light = Illumination { source: Source::am15g(), concentration: 1.0 };
    let series = StackReport::from(&solve_stack(&light, &cell(), &[ev(1.7), ev(1.1)], Connection::Series));
    // a 1.7/1.1 eV two-terminal tandem under AM1.5G: the efficiency as a percentage with two
    // decimals, and within the commonly cited ceiling of about 46 % for two-terminal tandems
    assert_eq!(series.display(StackMetric::Efficiency), format!("{:.2} %", series.efficiency * 100.0));
    assert!(series.efficiency > 0.40 && series.efficiency < 0.46, "{}", series.efficiency);
    assert!(
        series.display(StackMetric::Voc).ends_with(" V")
            && series.display(StackMetric::Voc).split('.').nth(1).unwrap().len() == 6
    );
    assert!(series.display(StackMetric::Jsc).ends_with(" mA/cm²"));
    assert_eq!(series.label(StackMetric::Jsc), "Short-circuit current Jsc");
    let independent = StackReport::from(&solve_stack(&light, &cell(), &[ev(1.7), ev(1.1)], Connection::Independent));
    assert_eq!(independent.label(StackMetric::Jsc), "Sum of subcell Jsc");
    for m in StackMetric::ALL {
        assert!(independent.display(m).ends_with(m.unit()), "{m:?}");
        assert!(independent.metric(m).is_finite(), "{m:?}");
    }
    // the page's data-metric hooks, which the browser tests select on
    let hooks: Vec<&str> = StackMetric::ALL.iter().map(|m| m.as_str()).collect();
    assert_eq!(hooks, ["stack-efficiency", "stack-voc", "stack-jsc", "stack-pmax", "stack-input"]);
    assert_eq!(StackMetric::HEADLINE, StackMetric::ALL[..4]);
}

#[test]
fn refining_the_best_points_of_the_map_finds_the_scipy_optimum() {
    // tests/fixtures/stack_optimum.csv: scipy Nelder-Mead (xatol 1e-7 eV, fatol 1e-13) on the
    // same model. The panel computes the default map (121 x 121 points, top 1.2-2.4 eV, bottom
    // 0.5-1.5 eV), takes its best few local maxima and refines each with the search's simplex
    // from a first step of one grid step, keeping the best. Tolerances as for the full search
    // (tests/stack.rs): 1e-9 relative in efficiency (both stop within ~1e-7 eV of a flat
    // maximum), 1e-3 eV in the gaps (kinks of the AM1.5G table blunt the location).
    let settings = MapSettings::default();
    let (tops, bottoms) = settings.grid().unwrap();
    let step = (tops[1] - tops[0]).max(bottoms[1] - bottoms[0]);
    let rows = fixture_rows(include_str!("fixtures/stack_optimum.csv"));
    assert!(rows.len() >= 3);
    for r in rows {
        let source = match r[0].as_str() {
            "am1.5g" => Source::am15g(),
            s => Source::BlackbodySun { temp_k: s.trim_start_matches("blackbody:").parse().unwrap() },
        };
        let light = Illumination { source, concentration: 1.0 };
        let connection = if r[1] == "series" { Connection::Series } else { Connection::Independent };
        let map = tandem_map(&light, &cell(), connection, &tops, &bottoms);
        let maxima = grid_maxima(&tops, &bottoms, &map.efficiency);
        assert!(!maxima.is_empty());
        // the first is the grid's best stack
        let nb = bottoms.len();
        let grid_best = (0..map.efficiency.len())
            .filter(|i| bottoms[i % nb] < tops[i / nb])
            .map(|i| map.efficiency[i])
            .fold(0.0, f64::max);
        assert_eq!(maxima[0].1, grid_best);
        let p = Problem {
            light: &light,
            cell: cell(),
            connection,
            junctions: 2,
            fixed: None,
            range_j: (bottoms[0], tops[tops.len() - 1]),
            seeds: vec![],
            extras: Default::default(),
        };
        let polished: Vec<_> = maxima.iter().take(POLISHED_STARTS).map(|(x, _)| refine(&p, x, step)).collect();
        for (o, (_, e)) in polished.iter().zip(&maxima) {
            // each is never worse than its start (the map and the search evaluate the same stack)
            assert!(o.efficiency >= e - 1e-12, "{r:?}");
            assert!((stack_efficiency(&light, &cell(), &o.gaps_j, connection) - o.efficiency).abs() < 1e-15);
            // a polish, not a search: a few hundred stacks, so each fits in one turn of the page
            assert!(o.evaluations < 600, "{r:?}: {} evaluations", o.evaluations);
        }
        let best = polished.iter().max_by(|a, b| a.efficiency.total_cmp(&b.efficiency)).unwrap();
        let (top, bottom, eff): (f64, f64, f64) = (r[2].parse().unwrap(), r[3].parse().unwrap(), r[4].parse().unwrap());
        assert!((best.efficiency - eff).abs() / eff < 1e-9, "{r:?}: {}", best.efficiency);
        assert!(
            (to_ev(best.gaps_j[0]) - top).abs() < 1e-3 && (to_ev(best.gaps_j[1]) - bottom).abs() < 1e-3,
            "{r:?}: {:?}",
            best.gaps_j
        );
    }
}

#[test]
fn grid_maxima_skip_what_is_not_a_stack() {
    // a 3 x 3 grid with its only peak in the middle; a larger value where the bottom gap is
    // not below the top gap, and a NaN, are no stacks and do not count
    let tops = [ev(1.5), ev(1.6), ev(1.7)];
    let bottoms = [ev(0.9), ev(1.0), ev(1.6)];
    let eff = [0.1, 0.2, 0.9, 0.2, 0.4, 0.99, 0.1, f64::NAN, 0.2];
    let m = grid_maxima(&tops, &bottoms, &eff);
    assert_eq!(m[0], (vec![ev(1.6), ev(1.0)], 0.4));
    assert!(m.iter().all(|(x, _)| x[1] < x[0]));
    assert!(grid_maxima(&tops, &bottoms, &eff[..8]).is_empty(), "a grid of the wrong size");
}

#[test]
fn refine_refuses_what_it_cannot_use() {
    let light = Illumination { source: Source::am15g(), concentration: 1.0 };
    let p = Problem {
        light: &light,
        cell: cell(),
        connection: Connection::Series,
        junctions: 2,
        fixed: None,
        range_j: (ev(0.5), ev(2.5)),
        seeds: vec![],
        extras: Default::default(),
    };
    // the wrong number of free gaps, a non-finite start, an empty range: an empty answer
    assert!(refine(&p, &[ev(1.7)], ev(0.01)).gaps_j.is_empty());
    assert!(refine(&p, &[ev(1.7), f64::NAN], ev(0.01)).gaps_j.is_empty());
    assert!(refine(&Problem { range_j: (ev(1.0), ev(1.0)), ..p.clone() }, &[ev(1.7), ev(1.1)], ev(0.01))
        .gaps_j
        .is_empty());
    // with a fixed gap, only the other is refined and the fixed one is kept exactly
    let fixed = Problem { fixed: Some(FixedGap { gap_j: ev(1.12), at: FixAt::Bottom }), ..p.clone() };
    let best = refine(&fixed, &[ev(1.7)], ev(0.01));
    assert_eq!(best.gaps_j.len(), 2);
    assert_eq!(best.gaps_j[1], ev(1.12));
    // commonly cited for a 1.12 eV silicon bottom cell under AM1.5G (series, radiative
    // limit): best top gap about 1.73 eV (tolerance 0.03 eV, the figure is quoted to 3 digits)
    assert!((to_ev(best.gaps_j[0]) - 1.73).abs() < 0.03, "{:?}", best.gaps_j);
}

#[test]
fn search_settings_are_checked_once_and_say_how_to_fix_them() {
    let two = |fix_ev: Option<f64>, fix_at: FixAt| OptimizeSettings {
        junctions: 2,
        fix_ev,
        fix_at: fix_at.into(),
        ..Default::default()
    };
    // off, or a usable fixed gap: the fixed gap in J, where it was asked
    assert_eq!(two(None, FixAt::Bottom).check().unwrap(), None);
    assert_eq!(two(Some(1.12), FixAt::Bottom).check().unwrap(), Some(FixedGap { gap_j: ev(1.12), at: FixAt::Bottom }));
    // to_problem checks the same way and carries the same fixed gap
    let light = Illumination { source: Source::am15g(), concentration: 1.0 };
    assert_eq!(
        two(Some(1.12), FixAt::Top).to_problem(&light, &cell(), Connection::Series).unwrap().fixed,
        two(Some(1.12), FixAt::Top).check().unwrap()
    );
    // a gap out of range: what is accepted, with an example
    for bad in [f64::NAN, -1.0, 0.0, 25.0] {
        let e = two(Some(bad), FixAt::Any).check().unwrap_err();
        assert!(e.contains("fixed gap") && e.contains("give a band gap from") && e.contains("e.g. 1.12"), "{e}");
        assert!(two(Some(bad), FixAt::Any).to_problem(&light, &cell(), Connection::Series).is_err());
    }
    // no room for the other gaps: how to fix it
    let e = two(Some(4.6), FixAt::Bottom).check().unwrap_err();
    assert!(e.contains("leaves no room") && e.contains("widen the range or move the fixed gap"), "{e}");
    let e = two(Some(0.2), FixAt::Top).check().unwrap_err();
    assert!(e.contains("at the top"), "{e}");
    // a search range the wrong way round: the lower first
    let e = OptimizeSettings { from_ev: 2.0, to_ev: 1.0, ..two(None, FixAt::Any) }.check().unwrap_err();
    assert!(e.contains("search range") && e.contains("the lower first"), "{e}");
}

#[test]
fn the_fixed_gap_and_the_urbach_tail_go_through_the_link() {
    use glowgap::codec::{decode_link, encode_fragment};
    use glowgap::scenario::Scenario;
    let mut s = Scenario::default();
    s.stack.optimize.fix_ev = Some(1.12);
    s.stack.optimize.fix_at = glowgap::scenario::FixAt::Bottom;
    s.stack.absorber = AbsorberSpec::Urbach { urbach_mev: 15.0 };
    let back = decode_link(&encode_fragment(&s)).unwrap();
    assert_eq!(back, s);
    assert_eq!(back.stack.optimize.fix_at, glowgap::scenario::FixAt::Bottom);
    // the Urbach energy's range and its message come from the scenario
    let e = AbsorberSpec::Urbach { urbach_mev: 500.0 }.to_physics(1.34, 300.0, &mut Vec::new()).unwrap_err();
    assert!(e.contains("meV") && e.contains("give a value from"), "{e}");
}
