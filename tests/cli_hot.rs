//! The hot-emitter commands (`glowgap tpv`, `glowgap absorber`) against published values,
//! the contract's keys and the command line's rules for bad input.

mod common;
use common::{expect_usage_error, glowgap, json};

fn f(v: &serde_json::Value, k: &str) -> f64 {
    v[k].as_f64().unwrap_or_else(|| panic!("{k} missing in {v}"))
}

#[test]
fn tpv_json_has_the_contract_keys() {
    let v = json(&["tpv", "--emitter-temp", "2000", "--gap", "0.74", "--json"]);
    for k in [
        "efficiency",
        "pmax_w_cm2",
        "heat_in_w_cm2",
        "subgap_heat_w_cm2",
        "jsc_a_cm2",
        "voc_v",
        "vmp_v",
        "max_efficiency",
    ] {
        assert!(v[k].is_number(), "{k} in {v}");
    }
    // independent subcells have no common voltage: vmp null
    let v = json(&["tpv", "--emitter-temp", "2000", "--gaps", "1.0,0.7", "--connection", "independent", "--json"]);
    assert!(v["vmp_v"].is_null(), "{v}");
}

#[test]
fn tpv_defaults_return_every_sub_gap_photon() {
    // default R_sub = 1: the sub-gap exchange is zero (no photon below the gap is absorbed)
    let v = json(&["tpv", "--emitter-temp", "2000", "--gap", "0.74", "--json"]);
    assert!(f(&v, "subgap_heat_w_cm2").abs() < 1e-12 * f(&v, "heat_in_w_cm2"), "{v}");
    // and the efficiency stays below the Carnot bound 1 - Tc/Te = 0.85 (second law)
    assert!(f(&v, "max_efficiency") < 0.85);
}

/// The radiative limit of the same gap(s) at the same emitter temperature (blackbody emitter,
/// every sub-gap photon returned, ERE 1 - the command's defaults) must exceed a measured
/// efficiency.
fn limit(temp_c: f64, gap_args: &[&str]) -> f64 {
    let t = format!("{}", temp_c + 273.15);
    let mut args = vec!["tpv", "--emitter-temp", &t, "--json"];
    args.extend_from_slice(gap_args);
    f(&json(&args), "efficiency")
}

#[test]
fn radiative_limits_exceed_published_tpv_records() {
    // LaPotin et al., Nature 604, 287 (2022): 41.1 %, 1.4/1.2 eV two-terminal tandem, 2400 C
    assert!(limit(2400.0, &["--gaps", "1.4,1.2"]) > 0.411);
    // Tervo et al., Joule (2022): 38.8 %, 0.74 eV, 1850 C
    assert!(limit(1850.0, &["--gap", "0.74"]) > 0.388);
    // Omair et al., PNAS 116, 15356 (2019): 29.1 % at 1207 C with an InGaAs cell (0.75 eV:
    // the gap is from memory, the paper's lattice-matched In0.53Ga0.47As)
    assert!(limit(1207.0, &["--gap", "0.75"]) > 0.291);
}

#[test]
fn tpv_sweep_has_two_different_optima() {
    let v =
        json(&["tpv", "--emitter-temp", "2000", "--sweep", "0.4:1.6:0.01", "--subgap-reflectance", "0.95", "--json"]);
    let pts = v["points"].as_array().unwrap();
    assert_eq!(pts.len(), 121);
    assert!((f(&pts[0], "gap_ev") - 0.4).abs() < 1e-12 && (f(&pts[120], "gap_ev") - 1.6).abs() < 1e-12);
    let be = &v["best_efficiency"];
    let bp = &v["best_power"];
    // power density peaks at a narrower gap than efficiency (common practice: a narrow gap
    // takes more photons, a wide one wastes less per photon)
    assert!(f(bp, "gap_ev") + 0.1 < f(be, "gap_ev"), "{be} {bp}");
    // the refined optima are at least as good as every grid point
    for p in pts {
        assert!(f(p, "efficiency") <= f(be, "efficiency") + 1e-12);
        assert!(f(p, "pmax_w_cm2") <= f(bp, "pmax_w_cm2") + 1e-12);
    }
}

#[test]
fn tpv_csv_is_the_jv_curve() {
    let out = glowgap(&["tpv", "--emitter-temp", "1800", "--gap", "0.7", "--csv"]);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("voltage_v,current_a_cm2,power_w_cm2"));
    let rows: Vec<Vec<f64>> = lines.map(|l| l.split(',').map(|x| x.parse().unwrap()).collect()).collect();
    assert_eq!(rows.len(), 201);
    assert_eq!(rows[0][0], 0.0); // short circuit first
    assert!(rows[200][1].abs() < 1e-9 * rows[0][1]); // open circuit last
}

#[test]
fn absorber_json_has_the_contract_keys_and_harder_wurfel_values() {
    let v = json(&["absorber", "--temp", "700", "--json"]);
    for k in [
        "incident_w_m2",
        "absorbed_w_m2",
        "emitted_w_m2",
        "thermal_efficiency",
        "carnot_factor",
        "work_efficiency",
        "stagnation_temp_k",
    ] {
        assert!(v[k].is_number(), "{k} in {v}");
    }
    // Harder & Wurfel, Semicond. Sci. Technol. 18, S151 (2003), 6000 K sun, Ta = 300 K:
    // the black absorber at full concentration, about 85.4 % near 2544 K ...
    let v = json(&["absorber", "--best", "--spectrum", "blackbody:6000", "--concentration", "max", "--json"]);
    assert!(v["best_cutoff_um"].is_null(), "{v}");
    assert!((f(&v, "work_efficiency") - 0.854).abs() < 5e-4, "{v}");
    assert!((f(&v, "best_temp_k") - 2544.0).abs() < 1.0, "{v}");
    // ... and the ideal step absorber at one sun, about 54 % with the cutoff near 0.92 eV
    // (1.348 um) and 863 K
    let v = json(&["absorber", "--best", "--spectrum", "blackbody:6000", "--json"]);
    assert!((f(&v, "work_efficiency") - 0.54).abs() < 5e-3, "{v}");
    assert!((1.2398419843320026 / f(&v, "best_cutoff_um") - 0.92).abs() < 0.01, "{v}");
    assert!((f(&v, "best_temp_k") - 863.0).abs() < 2.0, "{v}");
}

#[test]
fn absorber_profile_and_step_agree_for_the_same_window() {
    // a sharp window from 0 to the cutoff is the step: the same balance (exact band integrals
    // on both sides; the profile's sun term is exact for a piecewise-constant weight)
    let a = json(&["absorber", "--temp", "650", "--cutoff-um", "2", "--concentration", "50", "--json"]);
    let b = json(&["absorber", "--temp", "650", "--emitter", "window:0.1-2", "--concentration", "50", "--json"]);
    for k in ["absorbed_w_m2", "emitted_w_m2", "work_efficiency"] {
        assert!((f(&a, k) - f(&b, k)).abs() <= 1e-6 * f(&a, k).abs(), "{k}: {a} {b}");
    }
}

#[test]
fn links_from_the_commands_open_in_eval() {
    let out = glowgap(&["tpv", "--emitter-temp", "2100", "--gaps", "1.1,0.8", "--subgap-reflectance", "0.9", "--link"]);
    let link = String::from_utf8(out.stdout).unwrap().trim().to_string();
    let direct = json(&["tpv", "--emitter-temp", "2100", "--gaps", "1.1,0.8", "--subgap-reflectance", "0.9", "--json"]);
    let via = json(&["eval", &link, "--tpv", "--json"]);
    assert_eq!(direct, via);
    let out = glowgap(&["absorber", "--temp", "800", "--cutoff-um", "1.8", "--concentration", "200", "--link"]);
    let link = String::from_utf8(out.stdout).unwrap().trim().to_string();
    let direct = json(&["absorber", "--temp", "800", "--cutoff-um", "1.8", "--concentration", "200", "--json"]);
    assert_eq!(direct, json(&["eval", &link, "--absorber", "--json"]));
}

#[test]
fn concentration_max_is_accepted_everywhere() {
    let a = json(&["cell", "--gap", "1.1", "--concentration", "max", "--json"]);
    let b = json(&["cell", "--gap", "1.1", "--concentration", "46238.8", "--json"]);
    assert!(f(&a, "efficiency") > f(&b, "efficiency") - 1e-9);
    assert!(json(&["stack", "--gaps", "1.6,1.0", "--concentration", "max", "--json"])["efficiency"].is_number());
}

#[test]
fn bad_input_is_one_line_naming_the_option() {
    expect_usage_error(&["tpv"], "--emitter-temp");
    expect_usage_error(&["tpv", "--emitter-temp", "250"], "--emitter-temp");
    expect_usage_error(&["tpv", "--emitter-temp", "2000", "--view-factor", "0"], "--view-factor");
    expect_usage_error(&["tpv", "--emitter-temp", "2000", "--subgap-reflectance", "1.2"], "--subgap-reflectance");
    expect_usage_error(&["tpv", "--emitter-temp", "2000", "--gap", "1", "--gaps", "1.2,1"], "--gap");
    expect_usage_error(&["tpv", "--emitter-temp", "2000", "--sweep", "1.6:0.4:0.01"], "--sweep");
    expect_usage_error(&["tpv", "--emitter-temp", "2000", "--emitter", "grey:2"], "--emitter");
    expect_usage_error(&["absorber"], "--temp");
    expect_usage_error(&["absorber", "--temp", "500", "--cutoff-um", "2", "--emitter", "grey:0.5"], "--cutoff-um");
    expect_usage_error(&["absorber", "--best", "--temp", "500"], "--best");
    expect_usage_error(&["absorber", "--temp", "500", "--concentration", "0.5"], "--concentration");
    expect_usage_error(&["absorber", "--temp", "500", "--hc", "-1"], "--hc");
}

#[test]
fn a_reflectance_file_of_one_value_is_that_number() {
    // a flat table (held at its end values beyond its range) must give exactly the constant's
    // figures, up to the grid's integration of a table (linear pieces) against the constant
    let dir = std::env::temp_dir().join(format!("glowgap-refl-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("flat.csv");
    std::fs::write(&path, "wavelength_um,reflectance\n0.3,0.93\n2.0,0.93\n30,0.93\n").unwrap();
    let file = format!("file:{}", path.display());
    let a = json(&["tpv", "--emitter-temp", "1900", "--gap", "0.72", "--subgap-reflectance", &file, "--json"]);
    let b = json(&["tpv", "--emitter-temp", "1900", "--gap", "0.72", "--subgap-reflectance", "0.93", "--json"]);
    for k in ["efficiency", "heat_in_w_cm2", "subgap_heat_w_cm2", "pmax_w_cm2"] {
        assert!((f(&a, k) - f(&b, k)).abs() <= 1e-12 * f(&b, k).abs(), "{k}: {a} {b}");
    }
    expect_usage_error(&["tpv", "--emitter-temp", "1900", "--subgap-reflectance", "file:/no/such/file.csv"], "file");
    std::fs::remove_dir_all(&dir).ok();
}
