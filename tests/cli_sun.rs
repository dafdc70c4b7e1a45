//! `glowgap sun`: the command-line contract (JSON keys, CSV columns, one-line errors with
//! exit code 2) and its figures against outside sources: the worked example of Reda &
//! Andreas (2004), the trapezoid rule applied here to the printed spectra, and the same
//! place given as a `clearsky:` light source to `glowgap cell`.

mod common;
use common::{expect_usage_error, glowgap, json};

/// Reda & Andreas, "Solar position algorithm for solar radiation applications", Solar Energy
/// 76, 577 (2004), section 5 (the worked example) and table A4.1: Golden, Colorado,
/// 17 October 2003 12:30:30 local standard time (UTC-7), elevation 1830.14 m, 820 mbar,
/// 11 C, delta T 67 s, a plane tilted 30 deg with azimuth rotation -10 deg (from south
/// toward east, i.e. facing 170 deg clockwise from north).
const SPA_EXAMPLE: &[&str] = &[
    "sun",
    "--lat",
    "39.742476",
    "--lon",
    "-105.1786",
    "--time",
    "2003-10-17T12:30:30-07:00",
    "--elevation",
    "1830.14",
    "--pressure",
    "820",
    "--air-temp",
    "11",
    "--delta-t",
    "67",
    "--tilt",
    "30",
    "--azimuth",
    "170",
];

fn with(base: &[&'static str], more: &[&'static str]) -> Vec<&'static str> {
    base.iter().chain(more).copied().collect()
}

#[test]
fn the_published_worked_example() {
    let v = json(&with(SPA_EXAMPLE, &["--json"]));
    // the paper's results: topocentric zenith 50.11162 deg, azimuth 194.34024 deg,
    // incidence 25.18700 deg; they are printed to 1e-5 deg, the brief asks 1e-3
    for (key, want) in [("zenith_deg", 50.11162), ("azimuth_deg", 194.34024), ("incidence_deg", 25.18700)] {
        let got = v[key].as_f64().unwrap();
        assert!((got - want).abs() < 1e-3, "{key}: {got} against {want}");
    }
    assert_eq!(v["pressure_hpa"].as_f64(), Some(820.0));
    assert_eq!(v["delta_t_s"].as_f64(), Some(67.0));
    // the paper's appendix A.2 example (from memory): sunrise 6:12:43, transit 11:46:04,
    // sunset 17:20:19 local time; the command prints minutes
    assert_eq!(v["sunrise"], "06:13");
    assert_eq!(v["solar_noon"], "11:46");
    assert_eq!(v["sunset"], "17:20");
    assert!(v["note"].as_str().unwrap().contains("no clouds"));
    for key in
        ["air_mass", "direct_normal_w_m2", "diffuse_horizontal_w_m2", "global_horizontal_w_m2", "plane_of_array_w_m2"]
    {
        assert!(v[key].as_f64().unwrap() > 0.0, "{key}");
    }
}

#[test]
fn air_mass_follows_kasten_and_young() {
    // Kasten & Young, Appl. Opt. 28, 4735 (1989): m = 1 / (cos z + 0.50572 (96.07995 - z)^-1.6364)
    // at the apparent zenith z in degrees, not pressure-corrected (the formula, recalled)
    let v = json(&with(SPA_EXAMPLE, &["--json"]));
    let z: f64 = v["zenith_deg"].as_f64().unwrap();
    let want = 1.0 / (z.to_radians().cos() + 0.50572 * (96.07995 - z).powf(-1.6364));
    let got = v["air_mass"].as_f64().unwrap();
    assert!((got - want).abs() < 1e-9 * want, "{got} against {want}");
}

#[test]
fn night_has_no_air_mass_and_no_light() {
    // common practice: at local midnight in June at 45 N the sun is far below the horizon
    let args = ["sun", "--lat", "45", "--lon", "0", "--time", "2024-06-21T00:00Z"];
    let v = json(&with(&args, &["--json"]));
    assert!(v["zenith_deg"].as_f64().unwrap() > 90.0);
    assert!(v["air_mass"].is_null());
    for key in ["direct_normal_w_m2", "diffuse_horizontal_w_m2", "global_horizontal_w_m2", "plane_of_array_w_m2"] {
        assert_eq!(v[key].as_f64(), Some(0.0), "{key}");
    }
    let csv = glowgap(&with(&args, &["--csv"]));
    let text = String::from_utf8(csv.stdout).unwrap();
    for row in text.lines().filter(|l| !l.starts_with('#')).skip(1) {
        let cells: Vec<f64> = row.split(',').map(|c| c.parse().unwrap()).collect();
        assert_eq!(&cells[1..], &[0.0, 0.0, 0.0], "{row}");
    }
    // polar night (common practice: no sunrise north of the Arctic circle at the December
    // solstice): no sunrise or sunset, the solar noon still given
    let v = json(&["sun", "--lat", "78", "--lon", "15", "--time", "2024-12-21T12:00+01:00", "--json"]);
    assert_eq!(v["daylight"], "polar-night");
    assert!(v["sunrise"].is_null() && v["sunset"].is_null());
    assert!(v["solar_noon"].is_string());
    let v = json(&["sun", "--lat", "78", "--lon", "15", "--time", "2024-06-21T00:00+01:00", "--json"]);
    assert_eq!(v["daylight"], "polar-day");
    assert!(v["air_mass"].as_f64().unwrap() > 1.0, "the midnight sun is up");
}

/// Trapezoid rule over a printed column (the integral the totals are defined by).
fn trapezoid(x: &[f64], y: &[f64]) -> f64 {
    x.windows(2).zip(y.windows(2)).map(|(a, b)| 0.5 * (a[1] - a[0]) * (b[0] + b[1])).sum()
}

#[test]
fn totals_are_the_trapezoid_of_the_printed_spectra() {
    for extra in [&[][..], &["--sky-model", "isotropic"][..]] {
        let args: Vec<&str> = SPA_EXAMPLE.iter().chain(extra).copied().collect();
        let v = json(&with(&args, &["--json"]));
        let out = glowgap(&with(&args, &["--csv"]));
        assert!(out.status.success());
        let text = String::from_utf8(out.stdout).unwrap();
        let mut lines = text.lines().filter(|l| !l.starts_with('#'));
        assert_eq!(
            lines.next(),
            Some("wavelength_nm,direct_normal_w_m2_nm,diffuse_horizontal_w_m2_nm,plane_of_array_w_m2_nm")
        );
        assert!(text.starts_with('#') && text.contains("W m^-2 nm^-1"), "a comment names the units");
        let rows: Vec<Vec<f64>> = lines.map(|l| l.split(',').map(|c| c.parse().unwrap()).collect()).collect();
        // Bird & Riordan (1984) tabulate the model at 122 wavelengths, 300 to 4000 nm
        assert_eq!(rows.len(), 122);
        assert_eq!((rows[0][0], rows[121][0]), (300.0, 4000.0));
        let col = |i: usize| rows.iter().map(|r| r[i]).collect::<Vec<f64>>();
        let wl = col(0);
        // 1e-9 relative: the same sum of the same printed (round-trip exact) numbers, only
        // the order of additions may differ
        for (i, key) in [(1, "direct_normal_w_m2"), (2, "diffuse_horizontal_w_m2"), (3, "plane_of_array_w_m2")] {
            let want = trapezoid(&wl, &col(i));
            let got = v[key].as_f64().unwrap();
            assert!((got - want).abs() <= 1e-9 * want, "{key}: {got} against {want}");
        }
    }
}

#[test]
fn global_horizontal_is_beam_plus_diffuse_and_a_flat_plane_receives_it() {
    let flat = ["sun", "--lat", "39.742476", "--lon", "-105.1786", "--time", "2003-10-17T12:30:30-07:00"];
    for sky in ["isotropic", "hay-davies"] {
        let v = json(&with(&flat, &["--sky-model", sky, "--json"]));
        let z = v["zenith_deg"].as_f64().unwrap().to_radians();
        let dni = v["direct_normal_w_m2"].as_f64().unwrap();
        let dhi = v["diffuse_horizontal_w_m2"].as_f64().unwrap();
        let ghi = v["global_horizontal_w_m2"].as_f64().unwrap();
        // the closure of the components (common practice): GHI = DNI cos z + DHI
        assert!((dni * z.cos() + dhi - ghi).abs() < 1e-9 * ghi);
        // common practice: a horizontal plane sees no ground and the whole sky, so both
        // sky models give it the global horizontal irradiance, wavelength by wavelength
        let poa = v["plane_of_array_w_m2"].as_f64().unwrap();
        assert!((poa - ghi).abs() < 1e-9 * ghi, "{sky}: {poa} against {ghi}");
    }
}

#[test]
fn cell_under_the_same_clearsky_source_gets_the_same_plane_of_array_total() {
    let v = json(&with(SPA_EXAMPLE, &["--pwv", "0.8", "--json"]));
    let spec = "clearsky:lat=39.742476,lon=-105.1786,time=2003-10-17T12:30:30-07:00,elevation=1830.14,\
                pressure=820,air-temp=11,delta-t=67,tilt=30,azimuth=170,pwv=0.8";
    let cell = json(&["cell", "--gap", "1.34", "--spectrum", spec, "--json"]);
    let (sun, input) = (v["plane_of_array_w_m2"].as_f64().unwrap(), cell["input_w_m2"].as_f64().unwrap());
    // the same table integrated piecewise-linearly on both sides: 1e-9 relative
    assert!((sun - input).abs() < 1e-9 * sun, "sun {sun}, cell {input}");
    // and through a share link
    let link = glowgap(&["cell", "--gap", "1.34", "--spectrum", spec, "--link"]);
    assert!(link.status.success(), "{}", String::from_utf8_lossy(&link.stderr));
    let link = String::from_utf8(link.stdout).unwrap();
    let e = json(&["eval", link.trim(), "--json"]);
    assert!((e["input_w_m2"].as_f64().unwrap() - sun).abs() < 1e-9 * sun, "{e}");
}

#[test]
fn bad_input_names_its_option() {
    let base = |lat: &'static str, time: &'static str| vec!["sun", "--lat", lat, "--lon", "0", "--time", time];
    expect_usage_error(&base("95", "2024-06-21T12:00Z"), "--lat");
    expect_usage_error(&base("45", "2024-06-21T12:00"), "--time");
    expect_usage_error(&base("45", "2023-02-29T12:00Z"), "--time");
    expect_usage_error(&with(&base("45", "2024-06-21T12:00Z"), &["--pwv", "-1"]), "--pwv");
    expect_usage_error(&with(&base("45", "2024-06-21T12:00Z"), &["--albedo", "2"]), "--albedo");
    expect_usage_error(&with(&base("45", "2024-06-21T12:00Z"), &["--sky-model", "flat"]), "--sky-model");
    expect_usage_error(&with(&base("45", "2024-06-21T12:00Z"), &["--tilt", "x"]), "--tilt");
    expect_usage_error(&with(&base("45", "2024-06-21T12:00Z"), &["--json", "--csv"]), "one of");
    expect_usage_error(&["sun", "--lat", "45", "--time", "2024-06-21T12:00Z"], "--lon");
    expect_usage_error(&["sun", "--lat", "45", "--lon", "0"], "--time");
}

#[test]
fn plain_text_says_the_sky_is_clear_and_the_help_is_complete() {
    let out = glowgap(SPA_EXAMPLE);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("clear sky, no clouds"), "{text}");
    assert!(text.contains("W/m²") && text.contains("Zenith angle"), "{text}");
    let help = String::from_utf8(glowgap(&["help", "sun"]).stdout).unwrap();
    for o in ["--lat DEG", "--time ISO8601", "--pwv CM", "--sky-model", "default 180", "default 1.4", "--csv"] {
        assert!(help.contains(o), "{o}: {help}");
    }
}
