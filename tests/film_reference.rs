//! The transfer-matrix method (`physics::film`) against the general-purpose transfer-matrix
//! library `tmm` on PyPI (tests/reference/gen_film.py, which also checks tmm against its own
//! independent textbook calculation to 1e-15): absorbing layers at oblique incidence, a
//! metal film, an absorbing substrate, total internal reflection and quarter-wave mirrors;
//! and the hemispherical emissivity of a smooth dielectric against the closed form (Dunkle;
//! Siegel & Howell, Thermal Radiation Heat Transfer) evaluated by scipy.

use glowgap::physics::film::{coherent, coherent_mean, Complex, Layer, Polarization, Response};

fn complex(t: &str) -> Complex {
    // "n+ki"
    let t = t.trim().trim_end_matches('i');
    let cut = t[1..].find(['+', '-']).map(|i| i + 1).expect("n+ki");
    Complex::new(t[..cut].parse().unwrap(), t[cut..].parse().unwrap())
}

fn layers(t: &str) -> Vec<Layer> {
    t.split(';')
        .filter(|s| !s.trim().is_empty())
        .map(|s| {
            let (n, d) = s.split_once(':').unwrap();
            Layer::new(complex(n), d.parse::<f64>().unwrap() * 1e-9)
        })
        .collect()
}

#[test]
fn matches_the_tmm_library() {
    let text = std::fs::read_to_string("tests/fixtures/film_tmm.csv").unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#') && !l.trim().is_empty());
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    assert_eq!(
        head,
        ["case", "n0", "layers", "substrate", "angle_deg", "polarization", "wavelength_nm", "R", "T", "A"]
    );
    let mut n = 0;
    for line in lines {
        let f: Vec<&str> = line.split(',').collect();
        let n0: f64 = f[1].parse().unwrap();
        let st = layers(f[2]);
        let sub = complex(f[3]);
        let th = f[4].parse::<f64>().unwrap().to_radians();
        let lam = f[6].parse::<f64>().unwrap() * 1e-9;
        let got: Response = match f[5] {
            "s" => coherent(n0, &st, sub, lam, th, Polarization::S),
            "p" => coherent(n0, &st, sub, lam, th, Polarization::P),
            _ => coherent_mean(n0, &st, sub, lam, th),
        };
        let (r, t): (f64, f64) = (f[7].parse().unwrap(), f[8].parse().unwrap());
        // absolute 1e-12: both sides are exact up to rounding (the reference agrees with an
        // independent calculation to 1e-15); T beyond the critical angle is ~2e-16 there
        assert!((got.reflectance - r).abs() < 1e-12, "{line}: R {}", got.reflectance);
        assert!((got.transmittance - t).abs() < 1e-12, "{line}: T {}", got.transmittance);
        n += 1;
    }
    assert!(n >= 60, "{n} rows");
}

#[test]
fn hemispherical_emissivity_of_a_smooth_dielectric() {
    // eps_h = 2 int (1 - R_mean(theta)) cos sin dtheta by the composite Simpson rule on 20,000
    // panels (the integrand is smooth; its error is about 1e-12, far below the 1e-9 tolerance)
    let text = std::fs::read_to_string("tests/fixtures/film_hemispherical.csv").unwrap();
    for line in text.lines().filter(|l| !l.starts_with('#') && !l.starts_with("n,") && !l.trim().is_empty()) {
        let (n, want) = line.split_once(',').unwrap();
        let (n, want): (f64, f64) = (n.parse().unwrap(), want.parse().unwrap());
        let m = 20_000;
        let h = std::f64::consts::FRAC_PI_2 / m as f64;
        let g = |th: f64| {
            let r = coherent_mean(1.0, &[], Complex::real(n), 1e-6, th.min(std::f64::consts::FRAC_PI_2 - 1e-12));
            2.0 * (1.0 - r.reflectance) * th.cos() * th.sin()
        };
        let mut s = g(0.0) + g(std::f64::consts::FRAC_PI_2);
        for i in 1..m {
            s += g(i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
        }
        let got = s * h / 3.0;
        assert!((got - want).abs() < 1e-9, "n = {n}: {got} against {want}");
    }
}

#[test]
fn the_hemispherical_rule_meets_the_closed_form() {
    // the page's and the command line's rule (Gauss-Legendre in cos theta) against the
    // closed form of a smooth dielectric (Dunkle; Siegel & Howell), via the scipy values
    let text = std::fs::read_to_string("tests/fixtures/film_hemispherical.csv").unwrap();
    for line in text.lines().filter(|l| !l.starts_with('#') && !l.starts_with("n,") && !l.trim().is_empty()) {
        let (n, want) = line.split_once(',').unwrap();
        let (n, want): (f64, f64) = (n.parse().unwrap(), want.parse().unwrap());
        let got = 1.0 - glowgap::physics::film::hemispherical(1.0, &[], Complex::real(n), 1e-6).reflectance;
        println!("n = {n}: hemispherical emissivity {got} against {want}, error {:.1e}", got - want);
        assert!((got - want).abs() < 1e-12, "n = {n}: {got} against {want}");
    }
}

/// Rows of a fixture after its header, which must be `head`.
fn rows(path: &str, head: &[&str]) -> Vec<Vec<String>> {
    let text = std::fs::read_to_string(path).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#') && !l.trim().is_empty());
    let got: Vec<&str> = lines.next().unwrap().split(',').collect();
    assert_eq!(got, head, "{path}");
    lines.map(|l| l.split(',').map(String::from).collect()).collect()
}

#[test]
fn incoherent_sheets_match_the_tmm_library() {
    // tests/reference/gen_film_incoherent.py: tmm.inc_tmm, which the script also checks
    // against the closed form of a lossless sheet, R = 2 R1 / (1 + R1) (to 2e-16)
    let rows = rows(
        "tests/fixtures/film_tmm_incoherent.csv",
        &["case", "n0", "layers", "substrate", "angle_deg", "polarization", "wavelength_nm", "R", "T"],
    );
    for f in &rows {
        let st: Vec<Layer> = f[2]
            .split(';')
            .map(|s| {
                let mut p = s.split(':');
                let n = complex(p.next().unwrap());
                let d: f64 = p.next().unwrap().parse().unwrap();
                Layer { index: n, thickness_m: d * 1e-9, incoherent: p.next() == Some("i") }
            })
            .collect();
        let pol = if f[5] == "s" { Polarization::S } else { Polarization::P };
        let got = coherent(
            f[1].parse().unwrap(),
            &st,
            complex(&f[3]),
            f[6].parse::<f64>().unwrap() * 1e-9,
            f[4].parse::<f64>().unwrap().to_radians(),
            pol,
        );
        let (r, t): (f64, f64) = (f[7].parse().unwrap(), f[8].parse().unwrap());
        // lossless stacks: 1e-12, both exact up to rounding. Where a sheet absorbs, the
        // fields inside it are split into incident and reflected waves as if it were
        // lossless, which both sides do but in different forms (tilted admittances here,
        // Fresnel amplitudes there); measured to differ by at most 1.8e-9 in these cases
        // (k <= 2e-5 in the sheets, 0.01 in one substrate), hence 5e-9
        let lossless = st.iter().all(|l| l.index.im == 0.0) && complex(&f[3]).im == 0.0;
        let tol = if lossless { 1e-12 } else { 5e-9 };
        assert!((got.reflectance - r).abs() < tol, "{f:?}: R {}", got.reflectance);
        assert!((got.transmittance - t).abs() < tol, "{f:?}: T {}", got.transmittance);
    }
    assert!(rows.len() >= 40, "{} rows", rows.len());
}

#[test]
fn each_layers_absorption_matches_the_tmm_library() {
    // tests/reference/gen_film_layers.py: tmm.absorp_in_each_layer, unpolarized
    let rows = rows(
        "tests/fixtures/film_tmm_layers.csv",
        &["case", "n0", "layers", "substrate", "angle_deg", "wavelength_nm", "absorbed"],
    );
    for f in &rows {
        let st = layers(&f[2]);
        let got = glowgap::physics::film::layer_absorptance(
            f[1].parse().unwrap(),
            &st,
            complex(&f[3]),
            f[5].parse::<f64>().unwrap() * 1e-9,
            f[4].parse::<f64>().unwrap().to_radians(),
        );
        let want: Vec<f64> = f[6].split(';').map(|v| v.parse().unwrap()).collect();
        assert_eq!(got.len(), want.len());
        for (g, w) in got.iter().zip(&want) {
            // 1e-12 absolute: both exact up to rounding (lossless films show 5e-16 there)
            assert!((g - w).abs() < 1e-12, "{f:?}: {got:?}");
        }
    }
    assert!(rows.len() >= 10);
}
