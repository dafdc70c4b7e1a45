//! `glowgap film` and the built-in materials: each material against its published table or
//! formula at three wavelengths, and the command's contract.

mod common;
use common::{expect_usage_error, glowgap, json};
use glowgap::physics::materials::{builtin, BUILTINS};

#[test]
fn builtin_materials_match_their_sources() {
    // tests/fixtures/material_points.csv: the open refractive-index database's full tables (or
    // the published formula) at three wavelengths per material (scripts/extract_materials.py);
    // the shipped tables are thinned to at most 400 rows, so the tolerance is the thinning's
    // stated error: 2e-3 in n and k, 2e-2 in the HfO2 phonon region (20 um)
    let text = std::fs::read_to_string("tests/fixtures/material_points.csv").unwrap();
    let by_file = |f: &str| {
        let name = match f {
            "sio2_malitson.csv" => "silica",
            "sio2_kischkat.csv" => "silica-ir",
            "si3n4_luke.csv" => "si3n4",
            "si3n4_kischkat.csv" => "si3n4-ir",
            "al2o3_kischkat.csv" => "al2o3-ir",
            "tio2_kischkat.csv" => "tio2-ir",
            "hfo2_bright.csv" => "hfo2",
            "ag_rakic.csv" => "ag",
            "al_rakic.csv" => "al",
            "si_green2008.csv" => "si",
            other => panic!("no built-in for {other}"),
        };
        builtin(name).unwrap()
    };
    let mut n = 0;
    for line in text.lines().filter(|l| !l.starts_with('#') && !l.starts_with("material_file")) {
        let f: Vec<&str> = line.split(',').collect();
        let m = by_file(f[0]);
        let l: f64 = f[1].parse().unwrap();
        let (want_n, want_k): (f64, f64) = (f[2].parse().unwrap(), f[3].parse().unwrap());
        let Some(got) = m.index_at(l * 1e-6) else {
            // Malitson's paper covers 0.21-3.71 um; the database extends the formula further
            assert_eq!(m.name, "silica", "{line}");
            continue;
        };
        let tol = if m.name == "hfo2" && l > 10.0 { 2e-2 } else { 2e-3 };
        assert!((got.re - want_n).abs() <= tol * want_n.abs().max(1.0), "{line}: n {}", got.re);
        assert!((got.im - want_k).abs() <= tol * want_k.abs().max(1.0), "{line}: k {}", got.im);
        n += 1;
    }
    assert!(n >= 25, "{n}");
    // every built-in builds and has a usable range
    for b in BUILTINS {
        let m = (b.build)();
        assert!(m.range_m.0 > 0.0 && m.range_m.1 > m.range_m.0, "{}", b.name);
    }
}

#[test]
fn film_json_has_the_contract_keys_and_a_quarter_wave_layer_is_exact() {
    // quarter-wave MgF2-like layer on glass at its design wavelength (Macleod):
    // R = ((1.52 - 1.38^2) / (1.52 + 1.38^2))^2
    let d = 550.0 / (4.0 * 1.38);
    let layers = format!("n=1.38:{d}");
    let v = json(&["film", "--layers", &layers, "--substrate", "n=1.52", "--wavelength", "0.55", "--json"]);
    let p = &v["points"][0];
    let want = ((1.52f64 - 1.38 * 1.38) / (1.52 + 1.38 * 1.38)).powi(2);
    assert!((p["reflectance"].as_f64().unwrap() - want).abs() < 1e-14, "{v}");
    assert!((p["transmittance"].as_f64().unwrap() - (1.0 - want)).abs() < 1e-14, "{v}");
    assert!(p["absorptance"].as_f64().unwrap().abs() < 1e-14);
    let v = json(&[
        "film",
        "--layers",
        "ag:20",
        "--substrate",
        "silica",
        "--from",
        "0.5",
        "--to",
        "0.7",
        "--step",
        "0.1",
        "--hemispherical",
        "--json",
    ]);
    let pts = v["points"].as_array().unwrap();
    assert_eq!(pts.len(), 3);
    for k in ["hemispherical_reflectance", "hemispherical_transmittance", "hemispherical_absorptance"] {
        assert!(pts[0][k].is_number(), "{k}");
    }
    let out = glowgap(&["film", "--wavelength", "0.6", "--substrate", "n=1.5", "--csv"]);
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.starts_with("wavelength_um,reflectance,transmittance,absorptance\n"), "{text}");
}

#[test]
fn film_bad_input_is_one_line() {
    expect_usage_error(&["film"], "wavelength");
    expect_usage_error(&["film", "--wavelength", "0.5", "--layers", "sio2:-5"], "--layers");
    expect_usage_error(&["film", "--wavelength", "0.5", "--layers", "unobtainium:50"], "--layers");
    expect_usage_error(&["film", "--wavelength", "0.5", "--incident-medium", "nk=1.5/0.1"], "--incident-medium");
    expect_usage_error(&["film", "--wavelength", "0.5", "--angle", "90"], "--angle");
    expect_usage_error(&["film", "--wavelength", "20", "--substrate", "silica"], "silica");
    expect_usage_error(&["film", "--wavelength", "0.5", "--polarization", "x"], "--polarization");
}

#[test]
fn film_emitter_of_a_bare_dielectric_meets_the_closed_forms() {
    // An opaque smooth dielectric (k -> 0 but absorbing, so eps = 1 - R): its normal
    // emittance is 1 - ((n - 1)/(n + 1))^2 (Fresnel, Born & Wolf 1.5.3) and its hemispherical
    // emittance the closed form of Dunkle (Siegel & Howell, Thermal Radiation Heat Transfer),
    // here from tests/fixtures/film_hemispherical.csv (scipy, tests/reference/gen_film.py).
    // Tolerance 1e-9: the film table's 24-point angular rule is exact to ~1e-14 for this
    // smooth integrand, and the spectral integrals of a constant are exact to 1e-10.
    let text = std::fs::read_to_string("tests/fixtures/film_hemispherical.csv").unwrap();
    for row in common::fixture_rows(&text).iter().skip(1) {
        let n = common::num(&row[0]);
        let want_h = common::num(&row[1]);
        let sub = format!("nk={n}/1e-12");
        let v = json(&["cool", "--emitter", "film", "--substrate", &sub, "--sky", "space", "--json"]);
        let normal = 1.0 - ((n - 1.0) / (n + 1.0)).powi(2);
        let got_n = v["thermal_emittance"].as_f64().unwrap();
        let got_h = v["hemispherical_emittance"].as_f64().unwrap();
        assert!((got_n - normal).abs() < 1e-9, "n = {n}: normal {got_n} vs {normal}");
        assert!((got_h - want_h).abs() < 1e-9, "n = {n}: hemispherical {got_h} vs {want_h}");
        // emitted = eps_h sigma T^4 at 300 K (sigma: CODATA 2018, 5.670374419e-8 W/m2K4)
        let emitted = v["emitted_w_m2"].as_f64().unwrap();
        let want = want_h * 5.670374419e-8 * 300f64.powi(4);
        assert!((emitted / want - 1.0).abs() < 1e-9, "n = {n}: {emitted} vs {want}");
    }
    // over a lossless substrate what enters is carried away: a bare one emits nothing
    let v = json(&["cool", "--emitter", "film", "--substrate", "n=1.5", "--sky", "space", "--json"]);
    assert!(v["emitted_w_m2"].as_f64().unwrap().abs() < 1e-9);
}

#[test]
fn film_emitter_bad_input_names_the_option() {
    expect_usage_error(&["cool", "--emitter", "film", "--cutoff", "60"], "--cutoff");
    expect_usage_error(&["cool", "--emitter", "film", "--solar", "0.1"], "--solar");
    expect_usage_error(&["cool", "--layers", "silica-ir:100"], "--emitter film");
    expect_usage_error(&["cool", "--emitter", "film", "--layers", "silica-ir:-1"], "--layers");
    expect_usage_error(&["cool", "--emitter", "film", "--substrate", "nk=1.5/-1"], "substrate");
    expect_usage_error(&["cool", "--emitter", "film", "--layers", "file:/no/such/file:100"], "--layers");
}

#[test]
fn a_thick_sheet_is_incoherent_as_in_a_spectrophotometer() {
    // 1 mm of lossless glass (n = 1.5) in air reflects 2 R1 / (1 + R1), R1 = (0.5/2.5)^2,
    // the textbook sum over multiple reflections without interference (e.g. Macleod,
    // Thin-Film Optical Filters, on thick substrates); marked coherent it shows fringes
    let r1: f64 = 0.04;
    let want = 2.0 * r1 / (1.0 + r1);
    for l in ["0.5", "0.5003", "1.2"] {
        let v = json(&["film", "--layers", "n=1.5:1000000", "--wavelength", l, "--json"]);
        let r = v["points"][0]["reflectance"].as_f64().unwrap();
        assert!((r - want).abs() < 1e-12, "{l}: {r}");
    }
    let fringe: Vec<f64> = ["0.5", "0.50005"]
        .iter()
        .map(|l| {
            let v = json(&["film", "--layers", "n=1.5:1000000:coherent", "--wavelength", l, "--json"]);
            v["points"][0]["reflectance"].as_f64().unwrap()
        })
        .collect();
    assert!((fringe[0] - fringe[1]).abs() > 0.01, "{fringe:?}");
}

#[test]
fn user_tables_in_other_units_and_permittivity_read_the_same() {
    // N = 2 + 0.1i: eps = 3.99 + 0.4i; at 2 um = 5000 cm-1. The same stack given by a
    // constant index and by tables in um (n,k) and cm-1 (eps1,eps2) must agree.
    let dir = std::env::temp_dir().join(format!("glowgap-nk-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let a = dir.join("a.csv");
    let b = dir.join("b.csv");
    std::fs::write(&a, "wavelength_um,n,k\n1,2,0.1\n3,2,0.1\n").unwrap();
    std::fs::write(&b, "# permittivity\nwavenumber_cm-1,eps1,eps2\n10000,3.99,0.4\n3000,3.99,0.4\n").unwrap();
    let r = |mat: &str| {
        let layers = format!("{mat}:150");
        let v = json(&[
            "film",
            "--layers",
            &layers,
            "--substrate",
            "n=1.5",
            "--wavelength",
            "2",
            "--angle",
            "30",
            "--json",
        ]);
        v["points"][0]["reflectance"].as_f64().unwrap()
    };
    let want = r("nk=2/0.1");
    assert!((r(&format!("file:{}", a.display())) - want).abs() < 1e-12);
    assert!((r(&format!("file:{}", b.display())) - want).abs() < 1e-12);
    // a bad line is named
    std::fs::write(&a, "wavelength_um,n,k\n1,2,0.1\n2,2,oops\n").unwrap();
    let layers = format!("file:{}:150", a.display());
    expect_usage_error(&["film", "--layers", &layers, "--wavelength", "1.5"], "line 3");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn thickness_search_recovers_a_layer_from_its_airy_spectrum() {
    // Target: the normal emissivity 1 - R of one lossless layer (n = 2, 250 nm) on an
    // opaque n = 1.5 substrate, from the Airy sum of the two interfaces (Born & Wolf,
    // Principles of Optics, 1.6.4): R = (r1^2 + r2^2 + 2 r1 r2 cos 2d) /
    // (1 + r1^2 r2^2 + 2 r1 r2 cos 2d), r1 = (1 - 2)/(1 + 2), r2 = (2 - 1.5)/(2 + 1.5),
    // d = 2 pi n t / lambda. Starting from 600 nm, the search must find 250 nm, the one
    // thickness in 0-1000 nm whose spectrum matches at every wavelength (the misfit's only
    // zero). Tolerance 1 nm: the target is linear between 240 points on a log axis.
    let (r1, r2) = (-1.0 / 3.0, 0.5 / 3.5);
    let pts: Vec<String> = (0..240)
        .map(|i| {
            let l = 0.28 * (60.0f64 / 0.28).powf(i as f64 / 239.0);
            let c = (2.0 * 2.0 * std::f64::consts::PI * 2.0 * 250e-3 / l).cos();
            let r = (r1 * r1 + r2 * r2 + 2.0 * r1 * r2 * c) / (1.0 + r1 * r1 * r2 * r2 + 2.0 * r1 * r2 * c);
            format!("{l}={}", 1.0 - r)
        })
        .collect();
    let goal = format!("spectrum:points:{}", pts.join(","));
    let v = json(&[
        "film",
        "--optimize",
        &goal,
        "--layers",
        "n=2:600",
        "--substrate",
        "nk=1.5/1e-9",
        "--max-thickness",
        "1000",
        "--json",
    ]);
    let t = v["layers"][0]["thickness_nm"].as_f64().unwrap();
    assert!((t - 250.0).abs() < 1.0, "{t} nm; {v}");
    assert!(v["search_value"].as_f64().unwrap() < 1e-3);
    assert!(v["evaluations"].as_u64().unwrap() > 10);
    assert!(v["radiator"]["net_w_m2"].is_number());
}

#[test]
fn thickness_search_bad_input_names_the_option() {
    let base = ["film", "--layers", "silica-ir:300", "--substrate", "ag"];
    let with = |extra: &[&str]| -> Vec<String> { base.iter().chain(extra).map(|s| s.to_string()).collect() };
    let run = |extra: &[&str], needle: &str| {
        let args = with(extra);
        let refs: Vec<&str> = args.iter().map(String::as_str).collect();
        expect_usage_error(&refs, needle);
    };
    run(&["--optimize", "coldest"], "--optimize");
    run(&["--optimize", "net-power", "--wavelength", "1"], "--wavelength");
    run(&["--optimize", "net-power", "--max-thickness", "0"], "thickness");
    run(&["--sky", "space", "--wavelength", "1"], "--optimize");
    expect_usage_error(&["film", "--optimize", "steady"], "--layers");
}

#[test]
fn a_film_travels_in_the_share_link() {
    // the link of `cool --emitter film` opens in `eval` with the same figures
    let args = [
        "cool",
        "--emitter",
        "film",
        "--layers",
        "hfo2:80,silica-ir:900,n=1.5:2000000",
        "--substrate",
        "ag",
        "--sun",
        "am1.5g",
        "--sky",
        "clear:pwv=2",
    ];
    let out = glowgap(&[&args[..], &["--link"]].concat());
    assert!(out.status.success());
    let link = String::from_utf8(out.stdout).unwrap();
    let direct = json(&[&args[..], &["--json"]].concat());
    let opened = json(&["eval", link.trim(), "--radiator", "--json"]);
    for key in ["net_w_m2", "sun_absorbed_w_m2", "solar_reflectance", "window_emissivity"] {
        assert_eq!(direct[key], opened[key], "{key}");
    }
}

#[test]
fn per_layer_absorption_on_the_command_line() {
    // tests/fixtures/film_tmm_layers.csv, case a1 at normal incidence and 500 nm (tmm's
    // absorp_in_each_layer, tests/reference/gen_film_layers.py): 0.2527151856303622,
    // ~0, 0.14792750604124708
    let v = json(&[
        "film",
        "--layers",
        "nk=2/0.1:120,n=1.46:200,nk=3.5/0.5:30",
        "--substrate",
        "n=1.5",
        "--wavelength",
        "0.5",
        "--per-layer",
        "--json",
    ]);
    let a: Vec<f64> =
        v["points"][0]["layer_absorptance"].as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect();
    let want = [0.2527151856303622, 0.0, 0.14792750604124708];
    for (g, w) in a.iter().zip(want) {
        assert!((g - w).abs() < 1e-12, "{a:?}");
    }
    let total = v["points"][0]["absorptance"].as_f64().unwrap();
    assert!((a.iter().sum::<f64>() - total).abs() < 1e-12);
    expect_usage_error(&["film", "--layers", "n=1.5:20000", "--wavelength", "1", "--per-layer"], "--per-layer");
    expect_usage_error(&["film", "--wavelength", "1", "--per-layer", "--polarization", "s"], "--polarization");
}
