//! What the browser's stack panel relies on beyond the stack physics: the optimizer's
//! progress reports (the panel's search runs `optimize_observed` in a background worker and
//! must find what `glowgap optimize` finds), and the display of the stack's headline figures,
//! which the panel and `glowgap stack` / `glowgap eval --stack` share.

use glowgap::physics::constants::ev;
use glowgap::physics::junction::{Cell, Emission, Illumination, JvModel};
use glowgap::physics::sources::Source;
use glowgap::physics::stack::optimize::{optimize, optimize_observed, Problem, PROGRESS_EVERY};
use glowgap::physics::stack::{solve_stack, Connection};
use glowgap::report::stack::{StackReport, STACK_METRICS};

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
        assert!(seen.len() as u64 <= plain.evaluations / PROGRESS_EVERY, "{} reports for {} evaluations", seen.len(), plain.evaluations);
        // the search starts from the seed, so it cannot end below it
        let seed = solve_stack(&light, &cell(), &p.seeds[0], connection).efficiency;
        assert!(plain.efficiency >= seed);
    }
}

#[test]
fn stack_figures_display_with_their_units_and_connection_labels() {
    let light = Illumination { source: Source::am15g(), concentration: 1.0 };
    let series = StackReport::from(&solve_stack(&light, &cell(), &[ev(1.7), ev(1.1)], Connection::Series));
    // 1.7/1.1 eV two-terminal tandem under AM1.5G, as glowgap stack --gaps 1.7,1.1 prints it
    assert_eq!(series.display("stack-efficiency"), "44.36 %");
    assert!(series.display("stack-voc").ends_with(" V") && series.display("stack-voc").split('.').nth(1).unwrap().len() == 6);
    assert!(series.display("stack-jsc").ends_with(" mA/cm²"));
    assert_eq!(series.label("stack-jsc"), "Short-circuit current Jsc");
    let independent = StackReport::from(&solve_stack(&light, &cell(), &[ev(1.7), ev(1.1)], Connection::Independent));
    assert_eq!(independent.label("stack-jsc"), "Sum of subcell Jsc");
    for (hook, _, unit) in STACK_METRICS {
        assert!(independent.display(hook).ends_with(unit), "{hook}");
        assert!(independent.metric(hook).is_finite(), "{hook}");
    }
}
