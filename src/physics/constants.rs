//! Physical constants in SI units.
//!
//! The defining constants are the exact values fixed by the 2019 redefinition of the SI
//! (CODATA 2018). Derived constants are computed from them here, never typed in, so that
//! every number in the crate traces back to the four defining values.

use std::f64::consts::PI;

/// Planck constant h [J s] (exact, SI 2019).
pub const PLANCK: f64 = 6.626_070_15e-34;
/// Speed of light in vacuum c [m/s] (exact, SI 2019).
pub const LIGHT_SPEED: f64 = 299_792_458.0;
/// Boltzmann constant k_B [J/K] (exact, SI 2019).
pub const BOLTZMANN: f64 = 1.380_649e-23;
/// Elementary charge q [C] (exact, SI 2019). Also the number of joules in one electronvolt.
pub const CHARGE: f64 = 1.602_176_634e-19;

/// h c [J m]: converts between photon energy and wavelength, E = hc / lambda.
pub const HC: f64 = PLANCK * LIGHT_SPEED;

/// Stefan-Boltzmann constant sigma = 2 pi^5 k^4 / (15 h^3 c^2) [W m^-2 K^-4]; exact in the
/// SI 2019, 5.670 374 419... e-8 (CODATA 2018).
pub const STEFAN_BOLTZMANN: f64 = 2.0 * PI * PI * PI * PI * PI * BOLTZMANN * BOLTZMANN * BOLTZMANN * BOLTZMANN
    / (15.0 * PLANCK * PLANCK * PLANCK * LIGHT_SPEED * LIGHT_SPEED);

/// 2 pi / (h^3 c^2) [J^-3 m^-2 s^-1]: the prefactor of the hemispherical photon flux per unit
/// photon energy of a black surface, phi(E) = PHOTON_FLUX_PREFACTOR * E^2 / (exp(E/kT) - 1)
/// (Planck's law in photons, times pi for the hemisphere; Shockley & Queisser 1961).
pub const PHOTON_FLUX_PREFACTOR: f64 = 2.0 * PI / (PLANCK * PLANCK * PLANCK * LIGHT_SPEED * LIGHT_SPEED);

/// Nominal solar radius R_sun [m] (IAU 2015 Resolution B3).
pub const SOLAR_RADIUS: f64 = 6.957e8;
/// Astronomical unit [m] (IAU 2012 Resolution B2, exact).
pub const ASTRONOMICAL_UNIT: f64 = 1.495_978_707e11;
/// Nominal effective temperature of the Sun [K] (IAU 2015 Resolution B3).
pub const SUN_EFFECTIVE_TEMPERATURE: f64 = 5772.0;

/// Geometric dilution of sunlight at 1 au, f = (R_sun / au)^2 (dimensionless, about 2.16e-5).
/// A flat receiver facing a uniform disc of angular radius theta receives sin^2(theta) times
/// the hemispherical exitance of the disc; sin(theta) = R_sun / au. The geometric factor
/// f_omega of Shockley & Queisser, J. Appl. Phys. 32, 510 (1961).
pub const SUN_DILUTION: f64 = (SOLAR_RADIUS / ASTRONOMICAL_UNIT) * (SOLAR_RADIUS / ASTRONOMICAL_UNIT);

/// The highest concentration of the sun's disc that etendue conservation allows, 1 / f
/// (dimensionless, about 46,200).
pub const MAX_CONCENTRATION: f64 = 1.0 / SUN_DILUTION;

/// Wien's displacement constant b [m K] for the peak of B_lambda: b = hc / (k x), where x
/// solves x = 5 (1 - e^-x), i.e. x = 5 + W0(-5 e^-5) (W0 the principal Lambert W branch;
/// Corless et al., Adv. Comput. Math. 5, 329 (1996)). The condition dB_lambda/dlambda = 0 of
/// Wien's displacement law (Modest, Radiative Heat Transfer, ch. 1). CODATA 2018 lists
/// b = 2.897 771 955e-3 m K.
pub fn wien_displacement() -> f64 {
    HC / (BOLTZMANN * peak_x(5.0))
}

/// The positive root of x = n (1 - e^-x), where x^n / (e^x - 1) peaks (n = 5: per unit
/// wavelength, n = 3: per unit energy), by Newton's method on g(x) = x - n + n e^-x from
/// x = n; converges in a handful of steps.
fn peak_x(n: f64) -> f64 {
    let mut x = n;
    for _ in 0..50 {
        let g = x - n + n * (-x).exp();
        let dg = 1.0 - n * (-x).exp();
        let step = g / dg;
        x -= step;
        if step.abs() < 1e-15 * x {
            break;
        }
    }
    x
}

/// The root x of x = 3 (1 - e^-x), x = E/kT at the peak of the blackbody's distribution per
/// unit energy (or frequency), dM_E/dE = 0 for M_E ~ E^3 / (e^(E/kT) - 1) (Modest,
/// Radiative Heat Transfer, ch. 1; x = 2.821 439 372 122 079 to 16 digits, from memory;
/// the tests check the defining equation to rounding). Not the per-wavelength peak: the
/// two distributions differ by the Jacobian dE/dlambda = -hc/lambda^2.
pub fn energy_peak_x() -> f64 {
    peak_x(3.0)
}

/// Thermal energy kT [J] at temperature `temp_k` [K].
#[inline]
pub fn thermal_energy(temp_k: f64) -> f64 {
    BOLTZMANN * temp_k
}

/// Photon energy [J] of a photon of wavelength `lambda_m` [m]: E = hc / lambda.
#[inline]
pub fn energy_of_wavelength(lambda_m: f64) -> f64 {
    HC / lambda_m
}

/// Wavelength [m] of a photon of energy `e_j` [J]: lambda = hc / E (the inverse of
/// [`energy_of_wavelength`]).
pub fn wavelength_of_energy(e_j: f64) -> f64 {
    HC / e_j
}

/// Energy `e_ev` [eV] in joules [J]: 1 eV = q x 1 V, q exact (SI 2019).
#[inline]
pub fn ev(e_ev: f64) -> f64 {
    e_ev * CHARGE
}

/// Energy `e_j` [J] in electronvolts [eV].
#[inline]
pub fn to_ev(e_j: f64) -> f64 {
    e_j / CHARGE
}
