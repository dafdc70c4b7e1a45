//! Silicon cells against an independent scipy solution of the same model
//! (tests/fixtures/silicon_reference.csv, written by tests/reference/gen_silicon.py: quad on
//! the continuous absorptance, brentq and a bounded scalar minimum for the J-V).
//!
//! The program samples the absorptance at 32 points per table interval and integrates the
//! piecewise-linear curve through them exactly; the reference integrates the continuous
//! absorptance (ln alpha and n linear in photon energy). The sampling error, falling as the
//! square of the spacing, is what the tolerances allow for: 5e-7 relative in Jsc and 5e-5 in
//! J0 (measured 1.1e-7 and 1.3e-5; the emission weights the band edge, where the absorptance
//! bends most), so 2 uV in Voc (kT/q times the J0 tolerance) and 3e-7 relative in efficiency
//! (measured 1.1e-8 V and 6.7e-8). The parts the scipy script implements on its own:
//! Green 2008 table interpolation, the trapping formulas of Tiedje et al. (1984), the
//! reciprocity integral and the Richter et al. (2012) Auger rate.

mod common;
use common::{fixture_rows, num};
use glowgap::physics::junction::Illumination;
use glowgap::physics::real_cell::RealCellModel;
use glowgap::physics::silicon::{Doping, RealAbsorber, Trapping};
use glowgap::physics::sources::Source;

#[test]
fn silicon_cells_match_the_scipy_reference() {
    let text = std::fs::read_to_string("tests/fixtures/silicon_reference.csv").unwrap();
    let rows = fixture_rows(&text);
    assert!(rows.len() >= 8, "{} rows", rows.len());
    let light = Illumination::one_sun(Source::am15g());
    let (mut worst_jsc, mut worst_j0, mut worst_eff, mut worst_voc) = (0.0f64, 0.0f64, 0.0f64, 0.0f64);
    for r in rows {
        let w = num(&r[0]) * 1e-6;
        let trapping = match r[1].as_str() {
            "lambertian" => Trapping::Lambertian,
            "single-pass" => Trapping::SinglePass,
            _ => Trapping::DoublePass,
        };
        let d = num(&r[3]) * 1e6;
        let doping = if d == 0.0 {
            Doping::Undoped
        } else if r[2] == "n" {
            Doping::NType(d)
        } else {
            Doping::PType(d)
        };
        let t = num(&r[4]);
        let si = RealAbsorber::silicon(w, trapping).unwrap();
        let model = RealCellModel::new(&si, &light, t, doping, true);
        let diode = model.diode(w, trapping, f64::INFINITY);
        let got = model.solve(w, trapping);
        let (jsc, ln_j0, voc, eff) = (num(&r[5]), num(&r[6]), num(&r[7]), num(&r[9]));
        worst_jsc = worst_jsc.max((diode.jsc / jsc - 1.0).abs());
        worst_j0 = worst_j0.max((diode.ln_j0 - ln_j0).abs());
        worst_voc = worst_voc.max((got.voc - voc).abs());
        worst_eff = worst_eff.max((got.efficiency / eff - 1.0).abs());
        assert!((diode.jsc / jsc - 1.0).abs() < 5e-7, "{r:?}: Jsc {}", diode.jsc);
        assert!((diode.ln_j0 - ln_j0).abs() < 5e-5, "{r:?}: ln J0 {}", diode.ln_j0);
        assert!((got.voc - voc).abs() < 2e-6, "{r:?}: Voc {}", got.voc);
        assert!((got.efficiency / eff - 1.0).abs() < 3e-7, "{r:?}: efficiency {}", got.efficiency);
    }
    eprintln!(
        "worst: Jsc {worst_jsc:.1e} rel, ln J0 {worst_j0:.1e}, Voc {worst_voc:.1e} V, efficiency {worst_eff:.1e} rel"
    );
}
