//! The `glowgap cool` contract: JSON keys, a readable table with units, data files, share
//! links through `glowgap eval --radiator`, and one-line errors with exit code 2.

use std::path::PathBuf;

mod common;
use common::{expect_usage_error, glowgap, json};

fn f(v: &serde_json::Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("{key} missing in {v}"))
}

/// A file under the system temp directory, unique to this test process.
fn temp_file(name: &str, text: &str) -> PathBuf {
    let p = std::env::temp_dir().join(format!("glowgap-cool-{}-{name}", std::process::id()));
    std::fs::write(&p, text).unwrap();
    p
}

/// A value of tests/fixtures/radiator_balance.csv (scipy band integrals).
fn scipy(case: &str, column: usize) -> f64 {
    include_str!("fixtures/radiator_balance.csv")
        .lines()
        .find(|l| l.starts_with(&format!("{case},")))
        .and_then(|l| l.split(',').nth(column))
        .and_then(|v| v.parse().ok())
        .unwrap()
}

const KEYS: [&str; 12] = [
    "net_w_m2",
    "emitted_w_m2",
    "sky_absorbed_w_m2",
    "sun_absorbed_w_m2",
    "parasitic_w_m2",
    "steady_temp_k",
    "surface_temp_k",
    "ambient_temp_k",
    "sky_emissivity",
    "solar_reflectance",
    "thermal_emittance",
    "window_emissivity",
];

#[test]
fn defaults_are_a_blackbody_under_the_box_sky_at_300_k() {
    // Defaults: blackbody, box sky, ambient 300 K, surface = ambient, no sun, h_c 0.
    // Check values: scipy band integrals (tests/fixtures/radiator_balance.csv,
    // blackbody_box_300), to 1e-9 relative (closed forms on our side).
    let v = json(&["cool", "--json"]);
    for k in KEYS {
        assert!(v.get(k).is_some(), "missing {k}");
    }
    assert!((f(&v, "net_w_m2") / scipy("blackbody_box_300", 6) - 1.0).abs() < 1e-9);
    assert!((f(&v, "emitted_w_m2") / scipy("blackbody_box_300", 4) - 1.0).abs() < 1e-9);
    assert!((f(&v, "steady_temp_k") / scipy("blackbody_box_300", 7) - 1.0).abs() < 1e-8);
    assert_eq!(f(&v, "ambient_temp_k"), 300.0);
    assert_eq!(f(&v, "surface_temp_k"), 300.0);
    assert_eq!(f(&v, "sun_absorbed_w_m2"), 0.0);
    assert_eq!(f(&v, "parasitic_w_m2"), 0.0);
    // Kirchhoff: a blackbody reflects nothing and emits as a blackbody
    assert_eq!(f(&v, "solar_reflectance"), 0.0);
    assert!((f(&v, "thermal_emittance") - 1.0).abs() < 1e-12);
}

#[test]
fn ideal_window_and_options_follow_the_contract() {
    // ideal 8-13 um emitter: 147.965 W/m² at 300 K (scipy fixture window_8_13_box_300)
    let v = json(&["cool", "--emitter", "window:8-13", "--json"]);
    assert!((f(&v, "emitted_w_m2") / scipy("window_8_13_box_300", 4) - 1.0).abs() < 1e-9);
    assert_eq!(f(&v, "window_emissivity"), 1.0);
    // a warmer surface under a cooler sky with convection (fixture case with h_c = 5)
    let v = json(&[
        "cool",
        "--emitter",
        "window:8-13,in=0.9,out=0.2",
        "--ambient",
        "290",
        "--surface",
        "280",
        "--hc",
        "5",
        "--json",
    ]);
    let case = "window_0.9_0.2_box_290_surface_280_hc_5";
    assert!((f(&v, "net_w_m2") / scipy(case, 6) - 1.0).abs() < 1e-9);
    assert!((f(&v, "parasitic_w_m2") - 5.0 * 10.0).abs() < 1e-9);
    assert!((f(&v, "steady_temp_k") / scipy(case, 7) - 1.0).abs() < 1e-8);
    // the sun adds absorbed power: a grey 0.03 absorbs 3 % of AM1.5G (1000.37 W/m², ASTM G173)
    let v = json(&["cool", "--emitter", "grey:0.03", "--sun", "am1.5g", "--json"]);
    assert!((f(&v, "sun_absorbed_w_m2") - 0.03 * 1000.3706555734423).abs() < 1e-6);
    assert!((f(&v, "solar_reflectance") - 0.97).abs() < 1e-12);
    // a user spectrum as the sun: the triangle of tests/data (200 W/m² by the trapezoid rule)
    let led = format!("file:{}", concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/led_like_spectrum.csv"));
    let u = json(&["cool", "--emitter", "grey:0.5", "--sun", &led, "--json"]);
    assert!((f(&u, "sun_absorbed_w_m2") - 100.0).abs() < 1e-9);
    let half = json(&["cool", "--emitter", "grey:0.03", "--sun", "am1.5g", "--sun-scale", "0.5", "--json"]);
    assert!((f(&half, "sun_absorbed_w_m2") * 2.0 - f(&v, "sun_absorbed_w_m2")).abs() < 1e-9);
    // angular cut-off at 60 deg: emitted sin^2(60 deg) = 3/4 of sigma T^4 (fixture)
    let v = json(&["cool", "--cutoff", "60", "--json"]);
    assert!((f(&v, "emitted_w_m2") / scipy("blackbody_cutoff_60_box_300", 4) - 1.0).abs() < 1e-9);
    // outside the cut-off cone the sun finds a zero absorptance
    let v = json(&["cool", "--cutoff", "60:0", "--sun", "am1.5g", "--sun-zenith", "70", "--json"]);
    assert_eq!(f(&v, "sun_absorbed_w_m2"), 0.0);
    // a separate solar band: 0.05 below 4 um, 0.95 above (fixture)
    let v = json(&["cool", "--emitter", "grey:0.95", "--solar", "0.05", "--json"]);
    assert!((f(&v, "net_w_m2") / scipy("solar_band_0.05_below_4um_grey_0.95_box_300", 6) - 1.0).abs() < 1e-9);
    assert!((f(&v, "solar_reflectance") - 0.95).abs() < 1e-9);
}

#[test]
fn no_steady_temperature_is_reported_as_null() {
    // emissivity 0 and no convection: nothing depends on the surface temperature
    let v = json(&["cool", "--emitter", "grey:0", "--json"]);
    assert!(v["steady_temp_k"].is_null());
    assert_eq!(v["steady_status"], "undefined");
    let out = glowgap(&["cool", "--emitter", "grey:0"]);
    assert!(String::from_utf8_lossy(&out.stdout).contains("none"));
}

#[test]
fn table_is_readable_with_units_and_curve() {
    let out = glowgap(&["cool", "--sky", "clear:pwv=1.5", "--curve", "280:300:10"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8(out.stdout).unwrap();
    for needle in
        ["Net cooling power", "W/m²", " K", "Steady temperature", "Solar reflectance", "8-13 um emissivity", "P_net"]
    {
        assert!(text.contains(needle), "{needle} missing in\n{text}");
    }
    // the curve has 3 rows, 280, 290, 300 K, and its value at 300 K is the table's net
    let v = json(&["cool", "--sky", "clear:pwv=1.5", "--curve", "280:300:10", "--json"]);
    let c = v["curve"].as_array().unwrap();
    assert_eq!(c.len(), 3);
    assert_eq!(c[2]["temp_k"].as_f64().unwrap(), 300.0);
    assert!((c[2]["net_w_m2"].as_f64().unwrap() - f(&v, "net_w_m2")).abs() < 1e-9);
    assert!(c[0]["net_w_m2"].as_f64().unwrap() < c[2]["net_w_m2"].as_f64().unwrap());
}

#[test]
fn a_dew_point_sky_is_the_clear_sky_of_its_precipitable_water() {
    // Reitan (J. Appl. Meteor. 2, 776, 1963; coefficients from memory):
    // ln(w / cm) = 0.1102 + 0.0614 Tdp, so a 15 deg C dew point is 2.8044 cm of water.
    let pwv = (0.1102f64 + 0.0614 * 15.0).exp();
    assert!((pwv - 2.8044).abs() < 1e-4);
    let by_dew = json(&["cool", "--sky", "clear:dew=15", "--json"]);
    let by_pwv = json(&["cool", "--sky", &format!("clear:pwv={pwv}"), "--json"]);
    for key in ["sky_emissivity", "net_w_m2", "steady_temp_k"] {
        assert!((f(&by_dew, key) - f(&by_pwv, key)).abs() <= 1e-12 * f(&by_pwv, key).abs(), "{key}");
    }
    // a wetter sky is warmer (monotonic in water vapour, as every clear-sky correlation is)
    let wetter = json(&["cool", "--sky", "clear:dew=20", "--json"]);
    assert!(f(&wetter, "sky_emissivity") > f(&by_dew, "sky_emissivity"));
}

#[test]
fn data_files_give_the_same_answers_as_the_equivalent_built_ins() {
    // an opaque sample reflecting 10 % everywhere is a grey 0.9 emitter (Kirchhoff); the
    // table is integrated on the fine grid, the grey profile in closed form: 1e-9
    let refl = temp_file("refl.csv", "# measured\nwavelength (um), reflectance (%)\n0.25, 10\n50, 10\n");
    let a = json(&["cool", "--emitter", &format!("file:{}", refl.display()), "--sky", "space", "--json"]);
    let b = json(&["cool", "--emitter", "grey:0.9", "--sky", "space", "--json"]);
    assert!((f(&a, "emitted_w_m2") / f(&b, "emitted_w_m2") - 1.0).abs() < 1e-9);
    // wavenumber axis and a headerless file with the options
    let wn = temp_file("wn.txt", "2000 0.9\n100 0.9\n");
    let c = json(&[
        "cool",
        "--emitter",
        &format!("file:{}", wn.display()),
        "--emitter-axis",
        "cm-1",
        "--emitter-values",
        "emissivity",
        "--sky",
        "space",
        "--json",
    ]);
    assert!((f(&c, "emitted_w_m2") / f(&b, "emitted_w_m2") - 1.0).abs() < 1e-9);
    // a sky that transmits everything from 0.1 um to 1 mm is space (3 K) there
    let clear = temp_file("sky.csv", "wavelength_um,transmittance\n0.1,1\n1000,1\n");
    let d = json(&["cool", "--sky", &format!("file:{}", clear.display()), "--json"]);
    let e = json(&["cool", "--sky", "space", "--json"]);
    assert!((f(&d, "net_w_m2") / f(&e, "net_w_m2") - 1.0).abs() < 1e-9);
    for p in [refl, wn, clear] {
        let _ = std::fs::remove_file(p);
    }
}

#[test]
fn share_link_round_trips_through_eval_radiator() {
    let args = [
        "cool",
        "--emitter",
        "points:0.3=0.05,4=0.05,8=0.95,13=0.95,14=0.2",
        "--sky",
        "clear:pwv=2",
        "--sun",
        "am1.5g",
        "--hc",
        "4",
    ];
    let out = glowgap(&[&args[..], &["--link"]].concat());
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let link = String::from_utf8(out.stdout).unwrap();
    assert!(link.starts_with("#g1."));
    let url = format!("http://127.0.0.1:8080/{}", link.trim());
    let a = json(&["eval", &url, "--radiator", "--json"]);
    let b = json(&[&args[..], &["--json"]].concat());
    assert_eq!(a, b);
    // eval without --radiator still prints the cell figures of the same link
    let cell = json(&["eval", &url, "--json"]);
    assert!(cell.get("efficiency").is_some() && cell.get("net_w_m2").is_none());
}

#[test]
fn help_carries_the_cautions() {
    let out = glowgap(&["help"]);
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("glowgap cool"));
    assert!(text.contains("local codes") && text.contains("licensed practice"));
}

#[test]
fn every_bad_input_gets_one_line_and_exit_2() {
    let bad = temp_file("bad.csv", "wavelength_um,emissivity\n1,0.5\n2,oops\n");
    let over = temp_file("over.csv", "wavelength_um,emissivity\n1,0.5\n2,45\n");
    let unnamed = temp_file("unnamed.csv", "wavelength_um,value\n1,0.5\n2,0.5\n");
    let transmit = temp_file("transmit.csv", "wavelength_um,transmittance\n1,0.5\n2,0.5\n");
    let file = |p: &PathBuf| format!("file:{}", p.display());
    let (bad, over, unnamed, transmit) = (file(&bad), file(&over), file(&unnamed), file(&transmit));
    let cases: &[(&[&str], &str)] = &[
        (&["cool", "--wat"], "unknown option"),
        (&["cool", "stray"], "unexpected argument"),
        (&["cool", "--emitter"], "needs a value"),
        (&["cool", "--emitter", "chrome"], "unknown emitter"),
        (&["cool", "--emitter", "grey:1.5"], "fraction"),
        (&["cool", "--emitter", "grey:x"], "not a number"),
        (&["cool", "--emitter", "grey:NaN"], "fraction"),
        (&["cool", "--emitter", "window:13-8"], "shorter wavelength first"),
        (&["cool", "--emitter", "window:8"], "L1-L2"),
        (&["cool", "--emitter", "window:8-13,in=2"], "fraction"),
        (&["cool", "--emitter", "window:8-13,tilt=2"], "unknown window setting"),
        (&["cool", "--emitter", "window:0.01-13"], "out of range"),
        (&["cool", "--emitter", "points:8=0.5,4=0.5"], "increasing wavelength"),
        (&["cool", "--emitter", "points:8"], "UM=EPS"),
        (&["cool", "--emitter", "points:"], "1 to"),
        (&["cool", "--emitter", "file:/no/such/emissivity.csv"], "no such file"),
        (&["cool", "--emitter", &bad], "line 3"),
        (&["cool", "--emitter", &over], "percent"),
        (&["cool", "--emitter", &unnamed], "emissivity, absorptance, reflectance"),
        (&["cool", "--emitter", &transmit], "--sky file"),
        (&["cool", "--emitter-axis", "nm"], "file:PATH"),
        (&["cool", "--emitter", &bad, "--emitter-axis", "furlong"], "not known"),
        (&["cool", "--emitter", &bad, "--emitter-column", "0"], "column number"),
        (&["cool", "--sky", "cloudy"], "unknown sky"),
        (&["cool", "--sky", "clear"], "unknown sky"),
        (&["cool", "--sky", "clear:1.5"], "pwv=CM"),
        (&["cool", "--sky", "clear:pwv=-1"], "precipitable water"),
        (&["cool", "--sky", "clear:dew=warm"], "dew point"),
        (&["cool", "--sky", "clear:dew=288"], "not in K"),
        (&["cool", "--sky", "clear:pwv=20"], "precipitable water"),
        (&["cool", "--sky", "clear:pwv=1", "--ambient", "150"], "clear-sky"),
        (&["cool", "--sky", &bad], "sky transmittance file"),
        (&["cool", "--sky", &over], "transmittance"),
        (&["cool", "--sky-values", "transmittance"], "--sky file"),
        (&["cool", "--ambient", "1e9"], "ambient temperature"),
        (&["cool", "--ambient", "nan"], "not a finite number"),
        (&["cool", "--ambient", "warm"], "not a number"),
        (&["cool", "--surface", "0"], "surface temperature"),
        (&["cool", "--hc", "-1"], "h_c"),
        (&["cool", "--sun", "moon"], "unknown spectrum"),
        (&["cool", "--sun", "ééé"], "unknown spectrum"),
        (&["cool", "--sun", "blackbody:-5"], "out of range"),
        (&["cool", "--sun-zenith", "30"], "needs the sun on"),
        (&["cool", "--sun", "am1.5g", "--sun-zenith", "95"], "zenith"),
        (&["cool", "--sun", "am1.5g", "--sun-scale", "-1"], "scale"),
        (&["cool", "--solar", "2"], "fraction"),
        (&["cool", "--solar", "0.1", "--solar-below", "0.01"], "solar-band limit"),
        (&["cool", "--solar-below", "4"], "needs --solar"),
        (&["cool", "--cutoff", "0"], "cut-off angle"),
        (&["cool", "--cutoff", "95"], "cut-off angle"),
        (&["cool", "--cutoff", "60:2"], "fraction"),
        (&["cool", "--cutoff", "steep"], "not a number"),
        (&["cool", "--curve", "300:250:5"], "FROM below TO"),
        (&["cool", "--curve", "250:300"], "FROM:TO:STEP"),
        (&["cool", "--curve", "1:3000:0.0001"], "larger STEP"),
        (&["cool", "--json", "--link"], "one of"),
        (&["cool", "--spectrum-axis", "nm"], "--sun file"),
        (&["eval", "#g1.AAAA", "--radiator"], "link"),
    ];
    for (args, needle) in cases {
        expect_usage_error(args, needle);
    }
}
