//! What the command line prints for people: no negative zero in JSON or tables, water columns
//! rounded, a surface that sees only the space background at the background's temperature,
//! and a typed gap that a measured EQE overrides said to be unused.

mod common;

use common::{glowgap, json};

#[test]
fn no_negative_zero_in_json_or_tables() {
    // the default surface at ambient exchanges nothing with the air: h_c (T_a - T) is zero
    for args in [
        &["cool", "--json"][..],
        &["cool", "--emitter", "window:3-5", "--sky", "space", "--json"],
        &["cool", "--hc", "0", "--surface", "310", "--json"],
        &["cool", "--curve", "290:300:5", "--json"],
        &["sweep", "--from", "1", "--to", "1.2", "--step", "0.1", "--json"],
        &["losses", "--gap", "1.34", "--json"],
    ] {
        let out = glowgap(args);
        assert!(out.status.success(), "{args:?}");
        let text = String::from_utf8_lossy(&out.stdout);
        assert!(!text.contains("-0.0,") && !text.contains("-0.0}") && !text.contains("-0.0]"), "{args:?}: {text}");
    }
    let out = glowgap(&["cool", "--emitter", "window:3-5", "--sky", "space"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(!text.contains("-0.00"), "{text}");
}

#[test]
fn water_columns_are_rounded() {
    // a dew point gives a water column of many digits (Reitan's relation)
    let out = glowgap(&["cool", "--sky", "clear:dew=30"]);
    assert!(out.status.success());
    let shown = format!("{}{}", String::from_utf8_lossy(&out.stdout), String::from_utf8_lossy(&out.stderr));
    for word in shown.split_whitespace() {
        if let Some((_, decimals)) = word.split_once('.') {
            if word.parse::<f64>().is_ok() {
                assert!(decimals.len() <= 4, "{word} in {shown}");
            }
        }
    }
    assert!(shown.contains(" cm precipitable water"), "{shown}");
}

#[test]
fn a_surface_that_sees_only_space_comes_to_the_background_temperature() {
    // detailed balance (Kirchhoff): a body that exchanges radiation only with the 3 K cosmic
    // background (Fixsen, ApJ 707, 916 (2009): 2.7255 K; the program's space sky is 3 K)
    // settles at the background's temperature, whatever its emissivity bands
    for emitter in ["window:3-5", "window:8-13", "grey:0.5"] {
        let v = json(&["cool", "--emitter", emitter, "--sky", "space", "--json"]);
        assert_eq!(v["steady_status"], "found", "{emitter}");
        let t = v["steady_temp_k"].as_f64().expect("a steady temperature");
        assert!((t - 3.0).abs() < 1e-6, "{emitter}: {t} K");
    }
}

#[test]
fn a_gap_next_to_a_measured_eqe_is_said_to_be_unused() {
    let eqe = format!("file:{}/tests/fixtures/links/data/eqe.csv", env!("CARGO_MANIFEST_DIR"));
    let with = glowgap(&["cell", "--gap", "1.3", "--eqe", &eqe, "--json"]);
    let without = glowgap(&["cell", "--eqe", &eqe, "--json"]);
    assert!(with.status.success() && without.status.success());
    assert_eq!(with.stdout, without.stdout, "the measured edge is used either way");
    let warning = String::from_utf8_lossy(&with.stderr);
    assert!(warning.contains("--gap 1.3 is not used with --eqe") && warning.lines().count() == 1, "{warning}");
    assert!(without.stderr.is_empty(), "{}", String::from_utf8_lossy(&without.stderr));
}
