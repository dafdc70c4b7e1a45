//! The loss breakdown of a cell whose external radiative efficiency is below 1: the voltage
//! every extracted carrier loses to non-radiative recombination, kTc ln(1/ERE) (Ross,
//! J. Chem. Phys. 46, 4590 (1967); Green, Prog. Photovolt. 20, 472 (2012)), is booked with
//! emission and recombination, and thermalization stays the photons' energy above the gap
//! plus the few meV per carrier documented in `physics::losses`.

use glowgap::physics::constants::{thermal_energy, CHARGE, HC};
use glowgap::physics::junction::{solve_cell, Cell, Emission, Illumination, JvModel};
use glowgap::physics::losses::loss_breakdown;
use glowgap::physics::sources::Source;

/// The absorbed power and photon flux above `gap_ev` of the global-tilt column of ASTM
/// G173-03, integrated here from the standard's table (linear between its points, split
/// exactly at the gap's wavelength; Simpson's rule is exact for the flux integrand, a
/// quadratic in wavelength on each interval): [W m^-2] and [m^-2 s^-1].
fn g173_global_above(gap_ev: f64) -> (f64, f64) {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/src/physics/data/astm_g173_03.csv"))
        .expect("the ASTM G173-03 table");
    let pts: Vec<(f64, f64)> = text
        .lines()
        .skip(2)
        .filter_map(|l| {
            let f: Vec<f64> = l.split(',').filter_map(|x| x.trim().parse().ok()).collect();
            (f.len() == 4).then(|| (f[0] * 1e-9, f[2] * 1e9)) // m, W m^-2 m^-1
        })
        .collect();
    let edge = HC / (gap_ev * CHARGE);
    let (mut power, mut flux) = (0.0, 0.0);
    for w in pts.windows(2) {
        let ((a, fa), (b, fb)) = (w[0], w[1]);
        if a >= edge {
            break;
        }
        let (b, fb) = if b > edge { (edge, fa + (fb - fa) * (edge - a) / (b - a)) } else { (b, fb) };
        let fm = 0.5 * (fa + fb);
        let m = 0.5 * (a + b);
        power += 0.5 * (fa + fb) * (b - a);
        flux += (b - a) / 6.0 * (fa * a + 4.0 * fm * m + fb * b) / HC;
    }
    (power, flux)
}

fn cell(ere: f64) -> Cell {
    Cell { gap_j: 1.34 * CHARGE, temp_k: 300.0, ere, emission: Emission::Both, model: JvModel::Exact }
}

/// Thermalization less the photons' energy above the gap, per extracted carrier [eV].
fn remainder_per_carrier_ev(ere: f64) -> f64 {
    let light = Illumination::one_sun(Source::am15g());
    let l = loss_breakdown(&light, &cell(ere));
    let r = solve_cell(&light, &cell(ere));
    let (above, phi_abs) = g173_global_above(1.34);
    let phi_mp = r.jmp / CHARGE;
    (l.thermalization - (above - l.gap_j * phi_abs)) / phi_mp / CHARGE
}

#[test]
fn absorbed_power_and_flux_match_the_standard_table() {
    // the cell's photocurrent and the power above the gap against the table integrated here
    let light = Illumination::one_sun(Source::am15g());
    let (above, phi_abs) = g173_global_above(1.34);
    let r = solve_cell(&light, &cell(1.0));
    // 1e-6: the program integrates the photon flux of the table in its own way
    assert!((r.jsc / CHARGE / phi_abs - 1.0).abs() < 1e-6, "{} vs {phi_abs}", r.jsc / CHARGE);
    let l = loss_breakdown(&light, &cell(1.0));
    assert!(((l.input - l.below_gap) / above - 1.0).abs() < 1e-9);
}

#[test]
fn nonradiative_loss_is_kt_ln_one_over_ere_per_extracted_carrier() {
    let light = Illumination::one_sun(Source::am15g());
    for ere in [1.0, 0.1, 0.01, 1e-4] {
        let l = loss_breakdown(&light, &cell(ere));
        let r = solve_cell(&light, &cell(ere));
        // Ross 1967: each extracted carrier gives up kT ln(1/ERE) of voltage
        let expected = r.jmp / CHARGE * thermal_energy(300.0) * (1.0 / ere).ln();
        assert!((l.nonradiative - expected).abs() <= 1e-9 * expected.max(1.0), "ERE {ere}: {}", l.nonradiative);
        assert!(l.emission >= l.nonradiative, "ERE {ere}: it is part of emission and recombination");
        assert!((l.total() / l.input - 1.0).abs() < 1e-9, "ERE {ere}: the parts add up to the input");
    }
}

#[test]
fn thermalization_keeps_only_the_documented_remainder() {
    // at ERE = 1 the remainder per carrier is a few meV (physics::losses); a lower ERE must
    // not add its kT ln(1/ERE), about 119 meV at ERE 0.01, to thermalization. It changes by a
    // few meV only, as the maximum power point moves (qVmp falls by a little less than
    // kT ln(1/ERE), Green 2012).
    let radiative = remainder_per_carrier_ev(1.0);
    assert!(radiative.abs() < 0.01, "{radiative} eV");
    for ere in [0.1, 0.01, 1e-4] {
        let r = remainder_per_carrier_ev(ere);
        assert!(r.abs() < 0.01 && (r - radiative).abs() < 0.01, "ERE {ere}: {r} eV against {radiative} eV at ERE 1");
    }
}
