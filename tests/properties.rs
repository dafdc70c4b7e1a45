//! Properties that detailed balance guarantees, checked over wide random inputs (proptest).

use glowgap::physics::constants::*;
use glowgap::physics::junction::*;
use glowgap::physics::planck::*;
use glowgap::physics::sources::Source;
use glowgap::physics::spectrum::{Axis, Quantity, Spectrum};
use proptest::prelude::*;

fn model() -> impl Strategy<Value = JvModel> {
    prop_oneof![Just(JvModel::Exact), Just(JvModel::Boltzmann)]
}
fn emission() -> impl Strategy<Value = Emission> {
    prop_oneof![Just(Emission::Front), Just(Emission::Both)]
}
fn source() -> impl Strategy<Value = Source> {
    prop_oneof![
        Just(Source::am15g()),
        Just(Source::am15d()),
        Just(Source::am0()),
        (1000.0f64..20000.0).prop_map(|t| Source::BlackbodySun { temp_k: t }),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn no_nan_anywhere(gap in 0.01f64..20.0, t in 1.0f64..10000.0, x in 1.0f64..46238.0,
                       ere_exp in -12.0f64..0.0, m in model(), e in emission(), s in source()) {
        let light = Illumination { source: s, concentration: x };
        let cell = Cell { gap_j: ev(gap), temp_k: t, ere: 10f64.powf(ere_exp), emission: e, model: m };
        let r = solve_cell(&light, &cell);
        for v in [r.jsc, r.voc, r.ff, r.vmp, r.jmp, r.pmax, r.input, r.efficiency] {
            prop_assert!(v.is_finite() && v >= 0.0, "{r:?}");
        }
        prop_assert!(r.vmp <= r.voc * (1.0 + 1e-12) && r.jmp <= r.jsc * (1.0 + 1e-12));
        prop_assert!(r.ff <= 1.0);
    }

    #[test]
    fn efficiency_below_carnot_and_ultimate(gap in 0.3f64..4.0, ts in 3000.0f64..8000.0,
                                            tc in 250.0f64..400.0, x in 1.0f64..46238.0) {
        // Carnot: a heat engine between the sun at Ts and the cell at Tc converts at most
        // 1 - Tc/Ts of the absorbed heat (second law; common practice).
        let light = Illumination { source: Source::BlackbodySun { temp_k: ts }, concentration: x };
        let r = solve_cell(&light, &Cell { temp_k: tc, ..Cell::ideal(ev(gap)) });
        prop_assert!(r.efficiency < 1.0 - tc / ts);
        // the ultimate efficiency (every absorbed photon delivers Eg) bounds the real one
        prop_assert!(r.efficiency < ultimate_efficiency(&light, ev(gap)));
        // Voc stays below the gap (the generalized Planck law has its pole at qV = Eg). Near
        // the sun-disc limit the gap and Voc can differ by less than the resolution of a
        // double (a = (Eg - qVoc)/kT below 1e-14), so allow rounding of one part in 1e12.
        prop_assert!(r.voc < gap * (1.0 + 1e-12), "Voc {} vs gap {}", r.voc, gap);
    }

    #[test]
    fn efficiency_rises_with_concentration(gap in 0.6f64..3.0, x1 in 1.0f64..1000.0, k in 1.5f64..40.0) {
        // at fixed gap and cell temperature, Voc grows by (kT/q) ln(X2/X1) and Jsc scales
        // with X, so the efficiency rises (common practice)
        let a = solve_cell(&Illumination { source: Source::am15d(), concentration: x1 }, &Cell::ideal(ev(gap)));
        let b = solve_cell(&Illumination { source: Source::am15d(), concentration: x1 * k }, &Cell::ideal(ev(gap)));
        prop_assert!(b.efficiency > a.efficiency);
    }

    #[test]
    fn current_strictly_decreases_with_voltage(gap in 0.3f64..4.0, t in 200.0f64..500.0, m in model()) {
        let light = Illumination::one_sun(Source::am15g());
        let cell = Cell { temp_k: t, model: m, ..Cell::ideal(ev(gap)) };
        // J(V) = Jsc - (R(V) - R(0))/ERE with R increasing: non-increasing everywhere, and
        // strictly decreasing wherever the change exceeds rounding (near V = 0 the dark
        // current can be e^-100 of Jsc, too small to change a double)
        let curve = jv_curve(&light, &cell, 200);
        let voc = curve.last().unwrap().0;
        for w in curve.windows(2) {
            prop_assert!(w[1].1 <= w[0].1, "{:?}", w);
            // within 20 kT/q of Voc the dark current exceeds e^-20 Jsc, far above rounding
            if w[0].0 >= voc - 20.0 * BOLTZMANN * t / CHARGE {
                prop_assert!(w[1].1 < w[0].1, "{:?}", w);
            }
        }
    }

    #[test]
    fn planck_finite_for_any_lambda_t(l_exp in -300.0f64..300.0, t_exp in -300.0f64..300.0) {
        let (l, t) = (10f64.powf(l_exp), 10f64.powf(t_exp));
        let b = radiance_per_wavelength(l, t);
        prop_assert!(b.is_finite() && b >= 0.0);
        let f = band_fraction_below(l * t);
        prop_assert!((0.0..=1.0).contains(&f));
        let p = band_power_wavelength(l, 2.0 * l, t);
        prop_assert!(p.is_finite() && p >= 0.0);
    }

    #[test]
    fn spectrum_axis_changes_round_trip(values in proptest::collection::vec(0.0f64..10.0, 3..40)) {
        // any table: wavelength -> energy -> wavenumber -> wavelength returns the same points
        let x: Vec<f64> = (0..values.len()).map(|i| (300.0 + 7.0 * i as f64) * 1e-9).collect();
        let y: Vec<f64> = values.iter().map(|v| v * 1e9).collect();
        let s = Spectrum::new("t", "test", Axis::Wavelength, Quantity::Irradiance, x.clone(), y.clone()).unwrap();
        let back = s
            .converted(Axis::PhotonEnergy, Quantity::PhotonFlux)
            .converted(Axis::Wavenumber, Quantity::Irradiance)
            .converted(Axis::Wavelength, Quantity::Irradiance);
        for i in 0..x.len() {
            prop_assert!((back.coordinates()[i] - x[i]).abs() <= 1e-15 * x[i]);
            prop_assert!((back.values()[i] - y[i]).abs() <= 1e-12 * y[i].max(1e-300) + 1e-300);
        }
    }
}

#[test]
fn change_of_axis_keeps_the_integral_of_a_smooth_spectrum() {
    // A 5772 K Planck curve tabulated every 7 nm from 300 to 2000 nm: the trapezoid rules on
    // the wavelength and on the energy grid differ by O(h^2 f'') (about 1e-5 here), so the
    // integral must survive the change of variable to 1e-3 relative. (Random tables are
    // not used here: for spiky data the two trapezoid rules can differ by any amount.)
    let x: Vec<f64> = (0..=242).map(|i| (300.0 + 7.0 * i as f64) * 1e-9).collect();
    let y: Vec<f64> = x.iter().map(|&l| radiance_per_wavelength(l, 5772.0)).collect();
    let s = Spectrum::new("bb", "test", Axis::Wavelength, Quantity::Irradiance, x, y).unwrap();
    for axis in [Axis::PhotonEnergy, Axis::Wavenumber] {
        let c = s.converted(axis, Quantity::Irradiance);
        assert!((c.total_power() / s.total_power() - 1.0).abs() < 1e-3, "{axis:?}");
        let p = s.converted(axis, Quantity::PhotonFlux);
        assert!((p.total_photon_flux() / s.total_photon_flux() - 1.0).abs() < 1e-3, "{axis:?}");
    }
}
