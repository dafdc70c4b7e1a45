//! Stacks on a real silicon bottom cell and luminescent coupling, against published limits
//! and against the plain step-cell stack solver.

use glowgap::physics::constants::ev;
use glowgap::physics::junction::{Cell, Illumination};
use glowgap::physics::real_cell::RealCellModel;
use glowgap::physics::silicon::{Doping, RealAbsorber, Trapping};
use glowgap::physics::sources::Source;
use glowgap::physics::stack::mixed::{mixed_efficiency, solve_mixed, RealBottom, StackExtras};
use glowgap::physics::stack::{solve_stack, Connection};
use std::sync::Arc;

fn silicon_bottom(light: &Illumination, thickness_m: f64) -> RealBottom {
    let si = RealAbsorber::silicon(thickness_m, Trapping::Lambertian).unwrap();
    let model = RealCellModel::new(&si, light, 298.15, Doping::Undoped, true);
    RealBottom { model: Arc::new(model), thickness_m, trapping: Trapping::Lambertian }
}

#[test]
fn step_stacks_agree_with_the_plain_solver() {
    // the same equations (De Vos 1980) solved two ways: the plain solver's Newton on the
    // limiting subcell's voltage and this module's golden section on the current; they
    // agree to 1e-9 relative (the golden section stops at 1e-12 in the current)
    let light = Illumination::one_sun(Source::am15g());
    let cell = Cell { temp_k: 300.0, ..Cell::ideal(1.0) };
    for gaps in [vec![1.8, 1.1], vec![1.9, 1.4, 0.95], vec![2.2, 1.7, 1.3, 0.9]] {
        let g: Vec<f64> = gaps.iter().map(|&x| ev(x)).collect();
        for c in [Connection::Series, Connection::Independent] {
            let want = solve_stack(&light, &cell, &g, c);
            let got = solve_mixed(&light, &cell, &g, &StackExtras::default(), c);
            assert!((got.efficiency / want.efficiency - 1.0).abs() < 1e-9, "{gaps:?} {c:?}: {got:?} vs {want:?}");
            let e = mixed_efficiency(&light, &cell, &g, &StackExtras::default(), c);
            assert!((e / want.efficiency - 1.0).abs() < 1e-9);
            for (a, b) in got.subcells.iter().zip(&want.subcells) {
                assert!((a.voc - b.voc).abs() < 1e-9 && (a.jsc / b.jsc - 1.0).abs() < 1e-12);
            }
        }
    }
}

#[test]
fn perovskite_on_silicon_near_fell_2025() {
    let light = Illumination::one_sun(Source::am15g());
    let cell = Cell { temp_k: 298.15, ..Cell::ideal(1.0) };
    let extras = StackExtras { bottom: Some(silicon_bottom(&light, 300e-6)), coupling: 0.0 };
    let r = solve_mixed(&light, &cell, &[ev(1.71)], &extras, Connection::Series);
    eprintln!("{r:#?}");
    for lc in [0.1, 0.3, 1.0] {
        let e = StackExtras { coupling: lc, ..extras.clone() };
        eprintln!("lc {lc}: {}", mixed_efficiency(&light, &cell, &[ev(1.71)], &e, Connection::Series));
    }
    let ind = solve_mixed(&light, &cell, &[ev(1.71)], &extras, Connection::Independent);
    eprintln!("independent {}", ind.efficiency);
}
