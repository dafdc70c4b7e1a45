//! `glowgap yield`: the command-line contract (JSON keys, one-line errors with exit code 2),
//! the day's energy as the sum of its printed steps, the AM1.5G optimum beside the yield
//! optimum, a measured series through the same sum, and a clear-sky share link through
//! `glowgap eval`.

mod common;
use common::{expect_usage_error, glowgap, json};

const DAY: &[&str] = &["yield", "--lat", "38", "--lon", "-15", "--date", "2025-06-21", "--tilt", "30", "--json"];

fn with(base: &[&'static str], more: &[&'static str]) -> Vec<&'static str> {
    base.iter().chain(more).copied().collect()
}

#[test]
fn a_day_is_the_sum_of_its_five_minute_steps() {
    // Energy bookkeeping: the printed electric and incident energies equal the sum of the
    // printed per-step powers times 5 minutes (1e-9 relative; the JSON carries full
    // precision). 288 steps from local mean-time midnight (UTC offset round(-15/15) = -1 h).
    let v = json(&with(DAY, &["--gap", "1.34"]));
    let steps = v["steps"].as_array().unwrap();
    assert_eq!(steps.len(), 288);
    assert_eq!(steps[0]["time"], "2025-06-21T00:00-01:00");
    assert_eq!(steps[287]["time"], "2025-06-21T23:55-01:00");
    let sum = |k: &str| steps.iter().map(|s| s[k].as_f64().unwrap()).sum::<f64>() * 300.0 / 3.6e6;
    let (el, inc) = (v["electric_kwh_m2"].as_f64().unwrap(), v["incident_kwh_m2"].as_f64().unwrap());
    assert!((sum("electric_w_m2") / el - 1.0).abs() < 1e-9);
    assert!((sum("plane_w_m2") / inc - 1.0).abs() < 1e-9);
    assert!((v["energy_efficiency"].as_f64().unwrap() - el / inc).abs() < 1e-12);
    // common practice: a clear June day on a 30 deg plane at 38 N receives some 7-9 kWh/m2
    assert!(inc > 7.0 && inc < 9.5, "{inc}");
    // night steps carry no light
    assert_eq!(steps[0]["plane_w_m2"].as_f64(), Some(0.0));
}

#[test]
fn best_prints_the_am15g_optimum_beside_its_own() {
    // The AM1.5G single-junction optimum is 1.3364 eV at 33.69 % (Ruhle, Sol. Energy 130,
    // 139 (2016), recalled); the yield optimum of a clear day differs and gives at least as
    // much energy there as the AM1.5G gap.
    let v = json(&with(DAY, &["--best"]));
    let best = v["best_gap_ev"].as_f64().unwrap();
    let am = &v["am15g_optimum"];
    let am_gap = am["gaps_ev"][0].as_f64().unwrap();
    assert!((am_gap - 1.3364).abs() < 2e-4, "{am_gap}");
    assert!((am["efficiency"].as_f64().unwrap() - 0.3369).abs() < 1e-4);
    assert!(v["electric_kwh_m2"].as_f64().unwrap() >= am["electric_kwh_m2"].as_f64().unwrap() * (1.0 - 1e-6));
    assert!((0.9..1.8).contains(&best), "{best}");
    let two = json(&with(DAY, &["--best", "--junctions", "2"]));
    assert_eq!(two["best_gaps_ev"].as_array().unwrap().len(), 2);
    assert_eq!(two["am15g_optimum"]["gaps_ev"].as_array().unwrap().len(), 2);
}

#[test]
fn a_measured_series_file_is_read() {
    let dir = std::env::temp_dir().join(format!("glowgap-yield-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("series.csv");
    // two flat spectra of 1 W/m2/nm from 400 to 1000 nm (600 W/m2), an hour apart, then a
    // third at the same interval: 3 h of 600 W/m2 = 1.8 kWh/m2 incident
    std::fs::write(
        &path,
        "# our own test series\ntime,400,1000\n2025-06-21T10:00+02:00,1,1\n2025-06-21T11:00+02:00,1,1\n2025-06-21T12:00+02:00,1,1\n",
    )
    .unwrap();
    let v = json(&["yield", "--spectra", path.to_str().unwrap(), "--gap", "1.34", "--json"]);
    assert!((v["incident_kwh_m2"].as_f64().unwrap() - 1.8).abs() < 1e-12);
    assert_eq!(v["steps"].as_array().unwrap().len(), 3);
    expect_usage_error(&["yield", "--spectra", path.to_str().unwrap(), "--lat", "40"], "--lat does not apply");
    std::fs::write(&path, "time,400,1000\n2025-06-21T10:00,1,1\n2025-06-21T11:00,1,1\n").unwrap();
    expect_usage_error(&["yield", "--spectra", path.to_str().unwrap(), "--gap", "1.34"], "no UTC offset");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn bad_input_is_one_line_with_exit_code_2() {
    expect_usage_error(&["yield", "--lat", "95", "--lon", "0", "--year", "2025"], "--lat");
    expect_usage_error(&["yield", "--lat", "45", "--lon", "0", "--date", "2025-02-30"], "does not exist");
    expect_usage_error(&["yield", "--lat", "45", "--lon", "0", "--date", "2025-06-21", "--pwv", "-1"], "--pwv");
    expect_usage_error(&["yield", "--lat", "45", "--lon", "0"], "--date");
    expect_usage_error(&["yield", "--lat", "45", "--lon", "0", "--date", "2025-06-21", "--step", "10"], "at most 5");
    expect_usage_error(&["yield", "--lat", "45", "--lon", "0", "--year", "2025", "--gap", "1.3", "--best"], "one of");
    expect_usage_error(
        &["cell", "--gap", "1.3", "--spectrum", "clearsky:lat=45,lon=0,time=2025-06-21T12:00"],
        "no UTC offset",
    );
    expect_usage_error(
        &["cell", "--gap", "1.3", "--spectrum", "clearsky:lat=45,lon=0,time=2025-06-21T23:00+00:00"],
        "sunrise",
    );
}

#[test]
fn a_clear_sky_link_opens_in_eval_with_the_same_figures() {
    let spec = "clearsky:lat=38,lon=-15,time=2025-06-21T13:00-01:00,tilt=30,pwv=2";
    let out = glowgap(&["cell", "--gap", "1.34", "--spectrum", spec, "--link"]);
    assert!(out.status.success());
    let link = String::from_utf8(out.stdout).unwrap();
    let direct = json(&["cell", "--gap", "1.34", "--spectrum", spec, "--json"]);
    let via = json(&["eval", link.trim(), "--json"]);
    let e = |v: &serde_json::Value| v["efficiency"].as_f64().or_else(|| v["cell"]["efficiency"].as_f64()).unwrap();
    assert_eq!(e(&direct), e(&via));
}
