//! Solar-thermal step absorbers (`physics::solar_thermal`) against Harder & Würfel,
//! Semicond. Sci. Technol. 18, S151 (2003): 6000 K blackbody sun, ambient 300 K, no
//! convection. The paper quotes 3 digits (85.4 %, 54 %, 0.92 eV, 863 K, 2544 K); the
//! tolerances are half a unit of the last digit quoted, widened where the paper rounds
//! to two digits (54 %).

use glowgap::physics::constants::{ev, to_ev, MAX_CONCENTRATION};
use glowgap::physics::solar_thermal::*;

fn sun(concentration: f64) -> ThermalSetup {
    ThermalSetup { sun_temp_k: 6000.0, concentration, ambient_k: 300.0, hc_w_m2k: 0.0 }
}

/// The black absorber at full concentration: about 85.4 % of work near 2544 K.
#[test]
fn black_absorber_at_full_concentration() {
    let (t, w) = best_temperature(&sun(MAX_CONCENTRATION), 0.0);
    println!("black absorber, full concentration: {w} at {t} K");
    assert!((w - 0.854).abs() < 5e-4, "work efficiency {w}");
    assert!((t - 2544.0).abs() < 1.0, "best temperature {t} K");
    // the closed form there: (1 - (T/Ts)^4)(1 - Ta/T) (common practice)
    let closed = (1.0 - (t / 6000.0f64).powi(4)) * (1.0 - 300.0 / t);
    assert!((w - closed).abs() < 1e-12, "{w} vs {closed}");
}

/// The ideal step absorber at one sun: about 54 % with the cutoff near 0.92 eV and 863 K.
#[test]
fn step_absorber_at_one_sun() {
    let (ec, t, w) = best_step(&sun(1.0));
    assert!((w - 0.54).abs() < 5e-3, "work efficiency {w}");
    assert!((to_ev(ec) - 0.92).abs() < 5e-3, "cutoff {} eV", to_ev(ec));
    assert!((t - 863.0).abs() < 1.0, "best temperature {t} K");
    println!("step absorber, one sun: {w} at {} eV, {t} K", to_ev(ec));
    // the balance's parts agree with its efficiencies
    let b = balance(&sun(1.0), ev(0.92), t);
    assert!((b.thermal_efficiency - (b.absorbed - b.emitted - b.convection) / b.incident).abs() < 1e-15);
    assert!((b.work_efficiency - b.thermal_efficiency * (1.0 - 300.0 / t)).abs() < 1e-15);
}
