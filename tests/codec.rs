//! Share links and scenario files: random round trips and hostile inputs.

use glowgap::codec::*;
use glowgap::scenario::*;
use proptest::prelude::*;

fn source_spec() -> impl Strategy<Value = SourceSpec> {
    prop_oneof![
        Just(SourceSpec::Am15g),
        Just(SourceSpec::Am15d),
        Just(SourceSpec::Am0),
        (1.0f64..1e5).prop_map(|t| SourceSpec::Blackbody { temp_k: t }),
        (proptest::collection::vec(0.0f64..1e9, 2..300), "[a-zA-Z0-9 _.-]{1,20}").prop_map(|(y, name)| {
            let x = (0..y.len()).map(|i| (300.0 + i as f64) * 1e-9).collect();
            SourceSpec::Table(TableSpec { name, axis: Axis::Wavelength, quantity: Quantity::Irradiance, x, y })
        }),
    ]
}

fn radiator() -> impl Strategy<Value = radiator::RadiatorScenario> {
    use radiator::*;
    let emitter = prop_oneof![
        Just(EmitterSpec::Blackbody),
        (0.0f64..=1.0).prop_map(|e| EmitterSpec::Grey { emissivity: e }),
        (0.1f64..20.0, 0.0f64..=1.0, 0.0f64..=1.0, 0.0f64..2.0).prop_map(|(a, i, o, e)| EmitterSpec::Window {
            from_um: a,
            to_um: a + 5.0,
            inside: i,
            outside: o,
            edge_um: e
        }),
        proptest::collection::vec((0.1f64..100.0, 0.0f64..=1.0), 1..6)
            .prop_map(|v| EmitterSpec::Points { points: v.into_iter().map(|(l, e)| [l, e]).collect() }),
        proptest::collection::vec(0.0f64..=1.0, 2..50).prop_map(|e| EmitterSpec::Table(EmissivityTable {
            name: "m.csv".into(),
            wavelength_m: (0..e.len()).map(|i| (1.0 + i as f64) * 1e-6).collect(),
            emissivity: e
        })),
    ];
    let sky = prop_oneof![
        Just(SkySpec::Box),
        Just(SkySpec::Space),
        (0.0f64..10.0).prop_map(|w| SkySpec::Clear { pwv_cm: w }),
        proptest::collection::vec(0.0f64..=1.0, 2..50).prop_map(|t| SkySpec::Table(TransmittanceTable {
            name: "sky.csv".into(),
            wavelength_m: (0..t.len()).map(|i| (5.0 + i as f64) * 1e-6).collect(),
            transmittance: t
        })),
    ];
    let angular = prop_oneof![
        Just(AngularSpec::Lambertian),
        (1.0f64..90.0, 0.0f64..=1.0).prop_map(|(a, b)| AngularSpec::CutOff { angle_deg: a, beyond: b }),
    ];
    (
        emitter,
        proptest::option::of((0.2f64..10.0, 0.0f64..=1.0)),
        angular,
        sky,
        (100.0f64..400.0, proptest::option::of(1.0f64..3000.0)),
        proptest::option::of(source_spec()),
        (0.0f64..89.0, 0.0f64..10.0, 0.0f64..100.0),
    )
        .prop_map(|(emitter, solar, angular, sky, (ambient_k, surface_k), sun, (zenith, scale, hc))| {
            RadiatorScenario {
                emitter,
                solar_band: solar
                    .map(|(b, e)| SolarBandSpec { below_um: b, profile: EmitterSpec::Grey { emissivity: e } }),
                angular,
                sky,
                ambient_k,
                surface_k,
                sun,
                sun_zenith_deg: zenith,
                sun_scale: scale,
                h_c_w_m2k: hc,
                curve_from_k: 200.0,
                curve_to_k: ambient_k + 50.0,
            }
        })
}

fn scenario() -> impl Strategy<Value = Scenario> {
    (
        0.01f64..20.0,
        source_spec(),
        1.0f64..46000.0,
        1.0f64..1e4,
        1e-9f64..1.0,
        prop_oneof![Just(Emission::Front), Just(Emission::Both)],
        prop_oneof![Just(JvModel::Exact), Just(JvModel::Boltzmann)],
        prop_oneof![Just(PlotAxis::Wavelength), Just(PlotAxis::PhotonEnergy)],
        prop_oneof![Just(PlotQuantity::Irradiance), Just(PlotQuantity::PhotonFlux)],
        (
            (0.01f64..5.0, 5.0f64..20.0, prop_oneof![Just(Panel::Cell), Just(Panel::Radiator), Just(Panel::Stack)]),
            radiator(),
        ),
    )
        .prop_map(|(gap, spectrum, x, t, ere, emission, approx, axis, quantity, ((from, to, panel), radiator))| {
            Scenario {
                cell: CellScenario {
                    gap_ev: gap,
                    spectrum,
                    concentration: x,
                    cell_temp_k: t,
                    ere,
                    emission,
                    approx,
                    gap_material: None,
                },
                view: ViewSettings {
                    spectrum_axis: axis,
                    spectrum_quantity: quantity,
                    curve_from_ev: from,
                    curve_to_ev: to,
                    panel,
                },
                radiator,
                ..Default::default()
            }
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn links_round_trip_exactly(s in scenario()) {
        let link = encode_fragment(&s);
        prop_assert!(link.starts_with("#g1."));
        // the fragment is URL-safe as it stands
        prop_assert!(link[1..].bytes().all(|b| b.is_ascii_alphanumeric() || b == b'-' || b == b'_' || b == b'.'));
        let back = decode_link(&format!("http://127.0.0.1:8080/index.html{link}")).unwrap();
        prop_assert_eq!(&back, &s);
        prop_assert_eq!(from_json(&to_json(&s)).unwrap(), s);
    }

    #[test]
    fn truncated_links_fail_with_a_message(s in scenario(), cut in 0.0f64..1.0) {
        let link = encode_fragment(&s);
        let keep = 1 + ((link.len() - 2) as f64 * cut) as usize;
        match decode_link(&link[..keep]) {
            Ok(back) => prop_assert_eq!(back, s), // only possible if nothing was cut
            Err(e) => prop_assert!(!e.0.is_empty()),
        }
    }

    #[test]
    fn garbage_never_panics(text in ".{0,400}") {
        let _ = decode_link(&text);
        let _ = decode_link(&format!("#g1.{text}"));
        let _ = from_json(&text);
    }
}

#[test]
fn newer_versions_are_refused_with_advice() {
    let e = decode_link("#g2.AAAA").unwrap_err();
    assert!(e.0.contains("newer"), "{e}");
    let doc = r#"{"format":"glowgap-scenario","version":7,"scenario":{}}"#;
    assert!(from_json(doc).unwrap_err().0.contains("newer"));
}

#[test]
fn oversized_links_are_refused() {
    // a deflate stream of 10 MB of zeros compresses to a few kB: the decoded cap must stop it
    let bomb = vec![b' '; 10_000_000];
    let packed = miniz_oxide::deflate::compress_to_vec(&bomb, 9);
    let link = format!("#g1.{}", base64url_encode(&packed));
    assert!(link.len() < MAX_LINK_CHARS);
    let e = decode_link(&link).unwrap_err();
    assert!(e.0.contains("more than"), "{e}");
    let long = format!("#g1.{}", "A".repeat(MAX_LINK_CHARS + 10));
    assert!(decode_link(&long).unwrap_err().0.contains("characters long"));
}

#[test]
fn defaults_fill_in_missing_fields() {
    let s = from_json(r#"{"cell":{"gap_ev":1.1}}"#).unwrap();
    assert_eq!(s.cell.gap_ev, 1.1);
    assert_eq!(s.cell.cell_temp_k, 300.0);
    assert_eq!(s.view, ViewSettings::default());
}
