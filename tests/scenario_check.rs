//! The one check of a whole scenario (`Scenario::check`) and the one way to open a link or
//! file (`codec::open`): every part refuses an out-of-range value with a message that names
//! the setting, and the defaults open.

use glowgap::codec;
use glowgap::scenario::radiator::{EmitterSpec, SkySpec};
use glowgap::scenario::stack::{check_gaps, AbsorberSpec};
use glowgap::scenario::{check_gap_ev, check_gap_range, CellScenario, Scenario, SourceSpec};

/// Apply `edit` to the default scenario and expect `Scenario::check` to refuse it with a
/// message containing every one of `words`.
fn refused(edit: impl FnOnce(&mut Scenario), words: &[&str]) {
    let mut s = Scenario::default();
    edit(&mut s);
    let e = s.check().expect_err("the scenario should be refused");
    for w in words {
        assert!(e.contains(w), "'{e}' lacks '{w}'");
    }
    // opening it as a link or as a file gives the same message
    let link = codec::encode_fragment(&s);
    assert_eq!(codec::open(&link).unwrap_err().0, e);
    assert_eq!(codec::open(&codec::to_json(&s)).unwrap_err().0, e);
}

#[test]
fn the_defaults_pass() {
    assert_eq!(Scenario::default().check(), Ok(()));
    assert_eq!(Scenario::default().check_with_warnings(), Ok(vec![]));
}

#[test]
fn each_part_refuses_an_out_of_range_value_and_names_it() {
    // cell
    refused(|s| s.cell.gap_ev = 25.0, &["band gap 25 eV", "out of range", "0.01 to 20 eV"]);
    let nan = Scenario { cell: CellScenario { gap_ev: f64::NAN, ..Default::default() }, ..Default::default() };
    assert!(nan.check().unwrap_err().contains("band gap is not a number"));
    refused(|s| s.cell.cell_temp_k = 0.0, &["cell temperature 0 K"]);
    refused(|s| s.cell.ere = 0.0, &["external radiative efficiency 0"]);
    refused(|s| s.cell.concentration = 0.5, &["concentration 0.5"]);
    refused(|s| s.cell.spectrum = SourceSpec::Blackbody { temp_k: -3.0 }, &["blackbody sun temperature -3 K"]);
    // view
    refused(|s| s.view.curve_to_ev = 0.2, &["efficiency-curve range 0.5-0.2 eV", "the lower first"]);
    // radiator
    refused(|s| s.radiator.ambient_k = 50.0, &["ambient temperature 50 K"]);
    refused(|s| s.radiator.emitter = EmitterSpec::Grey { emissivity: 1.5 }, &["grey emissivity 1.5"]);
    refused(|s| s.radiator.sky = SkySpec::Clear { pwv_cm: 20.0 }, &["precipitable water 20 cm"]);
    refused(|s| s.radiator.curve_from_k = 400.0, &["curve range 400-350 K"]);
    // stack gaps
    refused(|s| s.stack.gaps_ev = vec![1.7, 30.0], &["subcell 2", "band gap 30 eV", "out of range"]);
    refused(|s| s.stack.gaps_ev = vec![1.1, 1.7], &["band gap 1 (1.1 eV) is not above band gap 2"]);
    refused(|s| s.stack.gaps_ev = vec![1.1], &["2 to 6 band gaps, 1 given"]);
    // optimizer
    refused(|s| s.stack.optimize.fix_ev = Some(40.0), &["fixed gap 40 eV is out of range"]);
    refused(|s| s.stack.optimize.junctions = 9, &["number of junctions 9"]);
    refused(|s| s.stack.optimize.from_ev = 5.0, &["search range 5-4.5 eV"]);
    // map axes
    refused(|s| s.stack.map.top_to_ev = 25.0, &["map's top-gap range 1.2-25 eV"]);
    refused(|s| s.stack.map.bottom_from_ev = 2.0, &["map's bottom-gap range 2-1.5 eV"]);
    refused(|s| s.stack.map.points = 1, &["map needs 2 to 500 points", "1 given"]);
    // absorber
    refused(|s| s.stack.absorber = AbsorberSpec::Urbach { urbach_mev: 500.0 }, &["Urbach energy 500 meV"]);
    // mismatch
    refused(|s| s.stack.mismatch.reference_spectrum = SourceSpec::Blackbody { temp_k: 0.0 }, &["blackbody sun"]);
}

#[test]
fn the_per_field_checks_are_those_of_the_whole() {
    for g in [0.0, 20.5, f64::NAN, f64::INFINITY] {
        let whole = Scenario { cell: CellScenario { gap_ev: g, ..Default::default() }, ..Default::default() };
        assert_eq!(check_gap_ev(g).unwrap_err(), whole.check().unwrap_err());
    }
    assert_eq!(check_gap_ev(0.01), Ok(()));
    assert_eq!(check_gap_ev(20.0), Ok(()));
    assert_eq!(CellScenario::check_gap(1.34), Ok(()));
    assert!(check_gap_range("search range", 1.0, 1.0).is_err());
    assert!(check_gap_range("search range", 0.01, 20.0).is_ok());
    assert!(check_gaps(&[1.8, 1.1]).is_ok());
}

#[test]
fn open_reads_links_fragments_urls_and_files_and_returns_warnings() {
    let mut s = Scenario::default();
    s.cell.gap_ev = 1.1;
    let frag = codec::encode_fragment(&s);
    for text in [
        frag.clone(),
        frag[1..].to_string(),
        format!("http://127.0.0.1:8080/{frag}"),
        format!("  {frag}\n"),
        codec::to_json(&s),
        format!("\u{feff}{}", codec::to_json(&s)),
    ] {
        let (opened, warnings) = codec::open(&text).unwrap_or_else(|e| panic!("{text}: {e}"));
        assert_eq!(opened, s);
        assert!(warnings.is_empty());
    }
    // a warning, not an error: beyond the sun-disc limit with a user spectrum
    s.cell.spectrum = SourceSpec::Table(glowgap::scenario::TableSpec {
        name: "lamp".into(),
        axis: glowgap::scenario::Axis::Wavelength,
        quantity: glowgap::scenario::Quantity::Irradiance,
        x: vec![400e-9, 700e-9],
        y: vec![1e9, 1e9],
    });
    s.cell.concentration = 1e5;
    let (_, warnings) = codec::open(&codec::encode_fragment(&s)).unwrap();
    assert!(warnings.iter().any(|w| w.contains("exceeds the limit for the sun's disc")), "{warnings:?}");
    // decode alone does not check: a front end may resolve file references first
    let mut bad = Scenario::default();
    bad.cell.gap_ev = 25.0;
    assert_eq!(codec::decode(&codec::to_json(&bad)).unwrap(), bad);
    assert!(codec::open(&codec::to_json(&bad)).is_err());
    // nothing, garbage
    assert!(codec::open("  ").unwrap_err().0.contains("nothing to open"));
    assert!(codec::open("#g1.@@@").unwrap_err().0.contains("garbled"));
    assert!(codec::open("{\"version\": 1,").unwrap_err().0.contains("not valid JSON"));
}
