//! The page's view layer against the command line: both front ends must show the same
//! figures for the same scenario, because both call the same physics.

mod common;

use glowgap::physics::constants::to_ev;
use glowgap::scenario::Scenario;
use glowgap::view::cell::CellCache;
use glowgap::view::format::fixed;

#[test]
fn page_and_sweep_best_agree_on_the_am15g_best_gap() {
    // the page's efficiency curve (0.5-3.0 eV by default, 1001 gaps) and `sweep --best` on
    // a different grid both refine the grid's best to 1e-7 eV, so they agree to the page's
    // display precision (the legend's "best in range: 1.336 eV", 3 decimals). Ruhle, Solar Energy 130, 139 (2016):
    // AM1.5G optimum 33.7 % at 1.34 eV.
    let page = CellCache::default().compute(&Scenario::default()).unwrap();
    let page_best = page.curve.best.unwrap();
    let cli = common::json(&["sweep", "--from", "0.3", "--to", "4.0", "--step", "0.001", "--best", "--json"]);
    let cli_gap = cli["best"]["gap_ev"].as_f64().or_else(|| cli["gap_ev"].as_f64()).expect("best gap in JSON");
    let cli_eff = cli["best"]["efficiency"].as_f64().or_else(|| cli["efficiency"].as_f64()).unwrap();
    assert_eq!(fixed(to_ev(page_best.gap_j), 3), fixed(cli_gap, 3), "page {} vs cli {cli_gap}", to_ev(page_best.gap_j));
    assert!((to_ev(page_best.gap_j) - cli_gap).abs() < 1e-4);
    // the efficiency is flat at the optimum: 1e-4 eV apart changes it by far less than 1e-9
    assert!((page_best.efficiency - cli_eff).abs() < 1e-9);
    assert!((cli_eff - 0.337).abs() < 0.0006 && (1.33..=1.345).contains(&cli_gap));
}
