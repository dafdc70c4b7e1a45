//! The blackbody on its own (`glowgap blackbody` and `physics::planck`'s peaks, photon
//! exitance and approximations) against values from outside the project: CODATA, handbook
//! band fractions, closed forms of mathematics. Each check names its source; tolerances
//! carry their reason.

use glowgap::physics::constants::*;
use glowgap::physics::planck::*;

mod common;
use common::{expect_usage_error, glowgap, json};

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// The peak per unit energy solves x = 3 (1 - e^-x) (the derivative of x^3/(e^x - 1); common
/// practice, e.g. Modest, Radiative Heat Transfer, ch. 1); x = 2.821439 to the 7 digits the
/// field notes give (from memory there: 2.821439372). The peak per wavelength at
/// hc/(lambda k T) = 4.965114 (same source): the two peaks differ.
#[test]
fn the_two_peaks_solve_their_equations() {
    let x = energy_peak_x();
    assert!((x - 3.0 * (1.0 - (-x).exp())).abs() < 1e-14, "{x}");
    assert!((x - 2.821439).abs() < 1e-6, "{x}");
    let t = 1234.5;
    assert!(rel(peak_energy(t) / (BOLTZMANN * t), 2.821439) < 1e-6);
    let x_lambda = HC / (peak_wavelength(t) * BOLTZMANN * t);
    assert!((x_lambda - 4.965114).abs() < 1e-6, "{x_lambda}");
}

/// Total photon exitance = 2 pi (kT)^3 / (h^3 c^2) * 2 zeta(3) (the integral of x^2/(e^x - 1)
/// is Gamma(3) zeta(3); zeta(3) = 1.202056903159594 is Apery's constant, a value of
/// mathematics quoted from memory). Tolerance 1e-12: closed forms on both sides.
#[test]
fn photon_exitance_is_the_zeta_3_closed_form() {
    let zeta3 = 1.202_056_903_159_594_3;
    for t in [300.0, 1500.0, 5772.0] {
        let kt = BOLTZMANN * t;
        let want = 2.0 * std::f64::consts::PI * kt.powi(3) / (PLANCK.powi(3) * LIGHT_SPEED.powi(2)) * 2.0 * zeta3;
        assert!(rel(photon_exitance(t), want) < 1e-12, "{t}: {} vs {want}", photon_exitance(t));
    }
}

/// Wien's and Rayleigh-Jeans' approximations against Planck's law, by their definitions:
/// Wien / Planck = 1 - e^-x and Rayleigh-Jeans / Planck = (e^x - 1)/x with x = hc/(lambda k T)
/// (the -1 dropped, and e^x - 1 ~ x; common practice). At x = 20 Wien is right to 2e-9 and
/// Rayleigh-Jeans 24 million times too high; at x = 0.01 Rayleigh-Jeans is right to 0.5 %
/// and Wien is 1 % of Planck. Tolerance 1e-12 on the ratios (both sides in closed form).
#[test]
fn wien_and_rayleigh_jeans_are_right_at_their_own_ends_only() {
    let t = 1000.0;
    for x in [0.01, 0.5, 2.0, 20.0, 80.0] {
        let lambda = HC / (x * BOLTZMANN * t);
        let planck = exitance_per_wavelength(lambda, t);
        let wien = wien_exitance_per_wavelength(lambda, t) / planck;
        let rj = rayleigh_jeans_exitance_per_wavelength(lambda, t) / planck;
        assert!(rel(wien, -(-x).exp_m1()) < 1e-12, "x = {x}: Wien/Planck {wien}");
        assert!(rel(rj, x.exp_m1() / x) < 1e-12, "x = {x}: RJ/Planck {rj}");
    }
    // never NaN, at any finite input
    for (l, t) in [(0.0, 300.0), (1e-300, 1e6), (1e300, 1.0), (-1.0, 300.0), (1e-6, -5.0)] {
        assert!(
            wien_exitance_per_wavelength(l, t).is_finite() && rayleigh_jeans_exitance_per_wavelength(l, t).is_finite()
        );
    }
}

/// `glowgap blackbody --json`: CODATA 2018 values b = 2897.771955 um K and sigma =
/// 5.670374419e-8 W m-2 K-4 (exact in the SI), the handbook band fractions F(2898 um K) =
/// 0.2501, F(5000 um K) = 0.6337, F(10000 um K) = 0.9142 (Incropera & DeWitt, Fundamentals
/// of Heat and Mass Transfer, table 12.1, 4 digits: tolerance 6e-5).
#[test]
fn json_figures_match_codata_and_the_handbook_band_fractions() {
    let v = json(&["blackbody", "--temp", "1000", "--json"]);
    assert!(rel(v["peak_wavelength_um"].as_f64().unwrap(), 2.897771955) < 1e-9, "{v}");
    assert!(rel(v["exitance_w_m2"].as_f64().unwrap(), 5.670374419e-8 * 1e12) < 1e-9, "{v}");
    assert!(rel(v["peak_energy_ev"].as_f64().unwrap(), 2.821439 * 8.617333262e-5 * 1000.0) < 1e-6, "{v}");
    assert!(v.get("band_fraction").is_none(), "no band asked: {v}");
    for (lt, f) in [(2898.0, 0.2501), (5000.0, 0.6337), (10000.0, 0.9142)] {
        let band = format!("0-{}", lt / 1000.0);
        let v = json(&["blackbody", "--temp", "1000", "--band", &band, "--json"]);
        let got = v["band_fraction"].as_f64().unwrap();
        assert!((got - f).abs() < 6e-5, "F({lt} um K) = {got}, handbook {f}");
        assert!(rel(v["band_exitance_w_m2"].as_f64().unwrap(), got * v["exitance_w_m2"].as_f64().unwrap()) < 1e-12);
    }
}

/// `--csv`: the header with units, both ends included, Planck above Wien and below
/// Rayleigh-Jeans at every row (1 - e^-x < 1 < (e^x - 1)/x; common practice), and the
/// Planck column at the peak equal to pi B_lambda there (CODATA constants, h, c, k exact).
#[test]
fn csv_spectrum_has_units_both_ends_and_the_three_laws_in_order() {
    let out = glowgap(&["blackbody", "--temp", "5772", "--from", "0.2", "--to", "1", "--step", "0.3", "--csv"]);
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("wavelength_um,planck_w_m2_um,wien_w_m2_um,rayleigh_jeans_w_m2_um"));
    let rows: Vec<Vec<f64>> = lines.map(|l| l.split(',').map(|x| x.parse().unwrap()).collect()).collect();
    let wavelengths: Vec<f64> = rows.iter().map(|r| r[0]).collect();
    assert_eq!(wavelengths, [0.2, 0.5, 0.8, 1.0]);
    for r in &rows {
        assert!(r[2] < r[1] && r[1] < r[3], "{r:?}");
        // pi B_lambda from the definition, per um
        let (l, t) = (r[0] * 1e-6, 5772.0);
        let b = 2.0 * 6.62607015e-34 * 299792458f64.powi(2)
            / l.powi(5)
            / ((6.62607015e-34 * 299792458.0 / (l * 1.380649e-23 * t)).exp() - 1.0);
        assert!(rel(r[1], std::f64::consts::PI * b * 1e-6) < 1e-12, "{r:?}");
    }
}

/// Bad input: one line on stderr naming the option and a fix, exit 2.
#[test]
fn bad_blackbody_input_gets_one_line_and_exit_2() {
    expect_usage_error(&["blackbody"], "--temp");
    expect_usage_error(&["blackbody", "--temp", "0"], "from 1 to 1000000 K");
    expect_usage_error(&["blackbody", "--temp", "1e999"], "--temp");
    expect_usage_error(&["blackbody", "--temp", "900", "--band", "2-1"], "not shorter");
    expect_usage_error(&["blackbody", "--temp", "900", "--band", "x"], "UM-UM");
    expect_usage_error(&["blackbody", "--temp", "900", "--from", "1", "--to", "2", "--step", "0.1"], "add --csv");
    expect_usage_error(&["blackbody", "--temp", "900", "--from", "1", "--to", "2", "--step", "1e-9", "--csv"], "rows");
    expect_usage_error(
        &["blackbody", "--temp", "900", "--from", "0", "--to", "2", "--step", "0.1", "--csv"],
        "above 0",
    );
}

/// The text output carries the usual caution for a surface hot enough to burn.
#[test]
fn text_output_cautions_about_hot_surfaces() {
    let out = glowgap(&["blackbody", "--temp", "1500"]);
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(text.contains("Peak per unit wavelength") && text.contains(" um"), "{text}");
    assert!(text.contains("Caution") && text.contains("licensed practice"), "{text}");
    let cool = String::from_utf8(glowgap(&["blackbody", "--temp", "300"]).stdout).unwrap();
    assert!(!cool.contains("Caution"), "{cool}");
}
