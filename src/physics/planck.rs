//! Planck's law: spectral radiance in every common spectral variable, photon forms, the
//! generalized form with a chemical potential, and exact band integrals.
//!
//! Planck, Ann. Phys. 4, 553 (1901). Generalized law with chemical potential mu for the
//! emission of an excited semiconductor: Wurfel, J. Phys. C 15, 3967 (1982), eq. 11.
//!
//! Every function takes SI arguments and returns SI values. Every finite input gives a
//! finite answer: the Bose factor 1 / (e^x - 1) is evaluated with `exp_m1` for small x
//! (the Rayleigh-Jeans end) and in logarithms for large x (the Wien end), so neither
//! overflow nor underflow turns into NaN.

use super::constants::{BOLTZMANN, HC, LIGHT_SPEED, PHOTON_FLUX_PREFACTOR, PLANCK, STEFAN_BOLTZMANN};
use super::special::{bose_band, bose_complete, bose_upper, scaled_bose2};
use std::f64::consts::PI;

/// prefactor * base^p / (e^x - 1) (x dimensionless; the result in the unit of
/// prefactor * base^p) computed as exp(ln prefactor + p ln x - x - ln(1 - e^-x)) when
/// the direct product could overflow or underflow; directly otherwise.
#[inline]
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn bose_weighted(prefactor: f64, base: f64, power: i32, x: f64) -> f64 {
    if !(x > 0.0) || !(base > 0.0) || !(prefactor > 0.0) {
        return 0.0;
    }
    let direct = prefactor * base.powi(power) / x.exp_m1();
    if direct.is_finite() && direct > 1e-290 {
        return direct;
    }
    exp_saturating(prefactor.ln() + power as f64 * base.ln() - x - (-(-x).exp_m1()).ln())
}

/// e^ln, saturating at `f64::MAX` instead of overflowing to infinity.
#[inline]
fn exp_saturating(ln: f64) -> f64 {
    if ln > 709.0 {
        f64::MAX
    } else {
        ln.exp()
    }
}

/// Spectral radiance per unit wavelength B_lambda [W m^-2 sr^-1 m^-1].
/// `lambda_m`: wavelength [m]; `temp_k`: temperature [K].
/// B_lambda = 2 h c^2 / lambda^5 / (exp(hc / (lambda k T)) - 1) (Planck 1901).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn radiance_per_wavelength(lambda_m: f64, temp_k: f64) -> f64 {
    if !(lambda_m > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    let x = HC / (lambda_m * BOLTZMANN * temp_k);
    // write 1/lambda^5 as (1/lambda)^5 so huge and tiny lambda stay in range via logs
    bose_weighted(2.0 * HC * LIGHT_SPEED, 1.0 / lambda_m, 5, x)
}

/// Spectral radiance per unit frequency B_nu [W m^-2 sr^-1 Hz^-1].
/// `nu_hz`: frequency [Hz]; `temp_k`: temperature [K].
/// B_nu = 2 h nu^3 / c^2 / (exp(h nu / kT) - 1) (Planck 1901).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn radiance_per_frequency(nu_hz: f64, temp_k: f64) -> f64 {
    if !(nu_hz > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    let x = PLANCK * nu_hz / (BOLTZMANN * temp_k);
    bose_weighted(2.0 * PLANCK / (LIGHT_SPEED * LIGHT_SPEED), nu_hz, 3, x)
}

/// Spectral radiance per unit wavenumber B_nutilde [W m^-2 sr^-1 (m^-1)^-1].
/// `wavenumber_per_m`: wavenumber [m^-1] (1 cm^-1 = 100 m^-1); `temp_k` [K].
/// B = 2 h c^2 nutilde^3 / (exp(h c nutilde / kT) - 1) (Planck 1901, B_nu |d nu / d nutilde|).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn radiance_per_wavenumber(wavenumber_per_m: f64, temp_k: f64) -> f64 {
    if !(wavenumber_per_m > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    let x = HC * wavenumber_per_m / (BOLTZMANN * temp_k);
    bose_weighted(2.0 * HC * LIGHT_SPEED, wavenumber_per_m, 3, x)
}

/// Spectral radiance per unit photon energy B_E [W m^-2 sr^-1 J^-1].
/// `energy_j`: photon energy [J]; `temp_k` [K].
/// B_E = 2 E^3 / (h^3 c^2) / (exp(E / kT) - 1) (Planck 1901, B_nu |d nu / dE|).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn radiance_per_energy(energy_j: f64, temp_k: f64) -> f64 {
    if !(energy_j > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    let x = energy_j / (BOLTZMANN * temp_k);
    bose_weighted(2.0 / (PLANCK * PLANCK * PLANCK * LIGHT_SPEED * LIGHT_SPEED), energy_j, 3, x)
}

/// Spectral photon radiance per unit wavelength [photons s^-1 m^-2 sr^-1 m^-1]:
/// B_lambda / (hc / lambda) = 2 c / lambda^4 / (exp(hc / (lambda k T)) - 1).
/// `lambda_m`: wavelength [m]; `temp_k`: temperature [K].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn photon_radiance_per_wavelength(lambda_m: f64, temp_k: f64) -> f64 {
    if !(lambda_m > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    let x = HC / (lambda_m * BOLTZMANN * temp_k);
    bose_weighted(2.0 * LIGHT_SPEED, 1.0 / lambda_m, 4, x)
}

/// Spectral photon radiance per unit photon energy [photons s^-1 m^-2 sr^-1 J^-1]:
/// 2 E^2 / (h^3 c^2) / (exp(E/kT) - 1), i.e. B_E / E (Planck 1901).
/// `energy_j`: photon energy [J]; `temp_k` [K].
pub fn photon_radiance_per_energy(energy_j: f64, temp_k: f64) -> f64 {
    generalized_photon_radiance_per_energy(energy_j, temp_k, 0.0)
}

/// Generalized Planck law: photon radiance per unit photon energy of a body at temperature
/// `temp_k` [K] with photon chemical potential `mu_j` [J] (mu = qV for a cell at voltage V),
/// [photons s^-1 m^-2 sr^-1 J^-1]: 2 E^2 / (h^3 c^2) / (exp((E - mu)/kT) - 1).
/// Defined for E > mu; returns +inf at or below E = mu (the law has a pole there), never NaN.
/// Wurfel 1982, eq. 11.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn generalized_photon_radiance_per_energy(energy_j: f64, temp_k: f64, mu_j: f64) -> f64 {
    if !(energy_j > 0.0) || !(temp_k > 0.0) {
        return 0.0;
    }
    if energy_j <= mu_j {
        return f64::INFINITY;
    }
    let x = (energy_j - mu_j) / (BOLTZMANN * temp_k);
    bose_weighted(2.0 / (PLANCK * PLANCK * PLANCK * LIGHT_SPEED * LIGHT_SPEED), energy_j, 2, x)
}

/// Hemispherical photon flux per unit photon energy leaving a black surface
/// [photons s^-1 m^-2 J^-1]: pi times the photon radiance (Lambertian emitter), the
/// generalized law of Wurfel 1982 integrated over the hemisphere. `energy_j` [J], `temp_k` [K],
/// photon chemical potential `mu_j` [J].
pub fn hemispherical_photon_flux_per_energy(energy_j: f64, temp_k: f64, mu_j: f64) -> f64 {
    PI * generalized_photon_radiance_per_energy(energy_j, temp_k, mu_j)
}

/// PHOTON_FLUX_PREFACTOR (kT)^p * band (`kt` [J], `band` dimensionless; the result
/// [J^(p-3) m^-2 s^-1]), in logarithms where the product would leave the f64
/// range: tiny results go to 0, enormous ones saturate at f64::MAX instead of inf or NaN.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn scaled_by_power_of_kt(band: f64, kt: f64, p: i32) -> f64 {
    if !(band > 0.0) {
        return 0.0;
    }
    let direct = PHOTON_FLUX_PREFACTOR * kt.powi(p) * band;
    if direct.is_finite() && direct > 1e-290 {
        return direct;
    }
    let ln = PHOTON_FLUX_PREFACTOR.ln() + p as f64 * kt.ln() + band.ln();
    if ln > 709.0 {
        f64::MAX
    } else {
        ln.exp()
    }
}

/// Spectral exitance of a black (Lambertian) surface per unit wavelength,
/// M_lambda = pi B_lambda [W m^-2 m^-1]: a diffuse surface's radiance integrated over the
/// hemisphere with cos(theta) d(Omega) gives pi times the radiance (Modest, Radiative Heat
/// Transfer, ch. 1; equation number from memory not given). `lambda_m` [m], `temp_k` [K].
pub fn exitance_per_wavelength(lambda_m: f64, temp_k: f64) -> f64 {
    PI * radiance_per_wavelength(lambda_m, temp_k)
}

/// Wavelength [m] at which B_lambda (and M_lambda) peaks at `temp_k` [K]: Wien's
/// displacement law, lambda_max = b / T (Wien 1893; b from
/// [`super::constants::wien_displacement`]). 0 for a temperature that is not positive.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn peak_wavelength(temp_k: f64) -> f64 {
    if !(temp_k > 0.0) {
        return 0.0;
    }
    super::constants::wien_displacement() / temp_k
}

/// Wien's approximation to the spectral exitance per unit wavelength,
/// M_lambda ~ 2 pi h c^2 / lambda^5 e^(-hc/(lambda k T)) [W m^-2 m^-1] (Wien 1896): Planck's
/// law without the -1 of the Bose factor, so right where hc/(lambda k T) >> 1 and short of it
/// in the infrared (by the factor 1 - e^-x). `lambda_m` [m], `temp_k` [K]; 0 outside
/// positive inputs, never NaN.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn wien_exitance_per_wavelength(lambda_m: f64, temp_k: f64) -> f64 {
    if !(lambda_m > 0.0 && temp_k > 0.0 && lambda_m.is_finite()) {
        return 0.0;
    }
    let x = HC / (lambda_m * BOLTZMANN * temp_k);
    exp_saturating((2.0 * PI * PLANCK * LIGHT_SPEED * LIGHT_SPEED).ln() - 5.0 * lambda_m.ln() - x)
}

/// The Rayleigh-Jeans approximation to the spectral exitance per unit wavelength,
/// M_lambda ~ 2 pi c k T / lambda^4 [W m^-2 m^-1] (Rayleigh 1900, Jeans 1905): the classical
/// limit hc/(lambda k T) << 1 of Planck's law, right in the far infrared and unbounded towards
/// the ultraviolet. `lambda_m` [m], `temp_k` [K]; 0 outside positive inputs, saturates at
/// `f64::MAX`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn rayleigh_jeans_exitance_per_wavelength(lambda_m: f64, temp_k: f64) -> f64 {
    if !(lambda_m > 0.0 && temp_k > 0.0 && lambda_m.is_finite()) {
        return 0.0;
    }
    let l2 = lambda_m * lambda_m;
    (2.0 * PI * LIGHT_SPEED * BOLTZMANN * temp_k / (l2 * l2)).min(f64::MAX)
}

/// Photon energy [J] at which the blackbody's distribution per unit energy (or frequency)
/// peaks at `temp_k` [K]: E = x kT with x of [`super::constants::energy_peak_x`] (about
/// 2.8214). A different peak from [`peak_wavelength`]'s (hc/lambda_max = 4.9651 kT). 0 for
/// a temperature that is not positive.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn peak_energy(temp_k: f64) -> f64 {
    if !(temp_k > 0.0) {
        return 0.0;
    }
    super::constants::energy_peak_x() * BOLTZMANN * temp_k
}

/// Total hemispherical photon exitance of a black surface [photons s^-1 m^-2]:
/// 2 pi (kT)^3 / (h^3 c^2) * 2 zeta(3) (Planck's law over all energies; the integral
/// int_0^inf x^2/(e^x - 1) dx = 2 zeta(3)). `temp_k` [K].
pub fn photon_exitance(temp_k: f64) -> f64 {
    band_photon_flux_energy(0.0, f64::INFINITY, temp_k)
}

/// Total hemispherical emissive power of a black surface, sigma T^4 [W m^-2]
/// (Stefan 1879, Boltzmann 1884). `temp_k` [K].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn stefan_boltzmann(temp_k: f64) -> f64 {
    if !(temp_k > 0.0) {
        return 0.0;
    }
    let t2 = temp_k * temp_k;
    (STEFAN_BOLTZMANN * t2 * t2).min(f64::MAX) // saturate rather than overflow
}

/// Fraction of sigma T^4 emitted at wavelengths below lambda, the blackbody fractional
/// function F(0 -> lambda T) (Modest, Radiative Heat Transfer, ch. 1)
/// (dimensionless), as a function of the product `lambda_t_m_k` = lambda T [m K].
/// F = (15 / pi^4) integral_{x}^{inf} x^3 / (e^x - 1) dx, x = hc / (lambda k T).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn band_fraction_below(lambda_t_m_k: f64) -> f64 {
    if !(lambda_t_m_k > 0.0) {
        return 0.0;
    }
    if lambda_t_m_k == f64::INFINITY {
        return 1.0;
    }
    let x = HC / (lambda_t_m_k * BOLTZMANN);
    (bose_upper(3, x) / bose_complete(3)).clamp(0.0, 1.0)
}

/// Hemispherical emissive power of a black surface at `temp_k` [K] between photon energies
/// `e1_j` and `e2_j` [J] (either order; `f64::INFINITY` allowed) [W m^-2]:
/// 2 pi (kT)^4 / (h^3 c^2) * integral_{x1}^{x2} x^3 / (e^x - 1) dx, x = E/kT: pi B_E
/// (Planck 1901) integrated over the band, the integral in closed form
/// ([`super::special::bose_band`]).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn band_power_energy(e1_j: f64, e2_j: f64, temp_k: f64) -> f64 {
    if !(temp_k > 0.0) {
        return 0.0;
    }
    let kt = BOLTZMANN * temp_k;
    let band = bose_band(3, e1_j.max(0.0) / kt, e2_j.max(0.0) / kt).abs();
    scaled_by_power_of_kt(band, kt, 4)
}

/// Hemispherical photon flux of a black surface at `temp_k` [K] between photon energies
/// `e1_j` and `e2_j` [J] [photons s^-1 m^-2]:
/// 2 pi (kT)^3 / (h^3 c^2) * integral_{x1}^{x2} x^2 / (e^x - 1) dx, x = E/kT (either order of
/// the energies; `f64::INFINITY` allowed). The photon flux of Shockley & Queisser 1961.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn band_photon_flux_energy(e1_j: f64, e2_j: f64, temp_k: f64) -> f64 {
    if !(temp_k > 0.0) {
        return 0.0;
    }
    let kt = BOLTZMANN * temp_k;
    let band = bose_band(2, e1_j.max(0.0) / kt, e2_j.max(0.0) / kt).abs();
    scaled_by_power_of_kt(band, kt, 3)
}

/// Hemispherical emissive power of a black surface between wavelengths `l1_m` and `l2_m`
/// [m] (either order; 0 and infinity allowed) at `temp_k` [K] [W m^-2], through
/// [`band_power_energy`] with E = hc / lambda.
pub fn band_power_wavelength(l1_m: f64, l2_m: f64, temp_k: f64) -> f64 {
    let to_e = |l: f64| if l > 0.0 { HC / l } else { f64::INFINITY };
    band_power_energy(to_e(l1_m), to_e(l2_m), temp_k)
}

/// Hemispherical photon flux of a body at `temp_k` [K] with chemical potential `mu_j` [J]
/// above photon energy `e0_j` [J] (e0 > mu), returned as its natural logarithm
/// ln(flux / [photons s^-1 m^-2]) together with the first and second derivatives of that
/// logarithm with respect to m = mu / kT (dimensionless): flux = 2 pi (kT)^3 / (h^3 c^2)
/// G_2(e0/kT, m), the generalized law (Wurfel 1982, eq. 11) integrated over the hemisphere
/// and over E > e0 (G_2 as in [`super::special`]). Working in logarithms keeps the radiative
/// recombination of wide-gap or cold cells, some e^-1000 in size, in range.
pub fn ln_photon_flux_above(e0_j: f64, temp_k: f64, mu_j: f64) -> (f64, f64, f64) {
    let kt = BOLTZMANN * temp_k;
    let x0 = e0_j / kt;
    let a = (e0_j - mu_j) / kt;
    let g = scaled_bose2(x0, a);
    let ln_scale = (PHOTON_FLUX_PREFACTOR * kt * kt * kt).ln();
    let rho = g.d1 / g.value;
    (ln_scale - a + g.value.ln(), rho, g.d2 / g.value - rho * rho)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn peak_wavelength_is_wien_and_the_maximum() {
        // CODATA 2018: b = 2.897 771 955... e-3 m K (exact constants, 10 digits published)
        assert!((peak_wavelength(1.0) - 2.897_771_955e-3).abs() < 1e-12);
        for t in [300.0, 1500.0, 5772.0] {
            let l = peak_wavelength(t);
            let m = exitance_per_wavelength(l, t);
            // a maximum: 0.1 % either side is lower (definition of the peak)
            assert!(m > exitance_per_wavelength(l * 1.001, t) && m > exitance_per_wavelength(l * 0.999, t));
        }
        assert_eq!(peak_wavelength(0.0), 0.0);
    }

    #[test]
    fn forms_agree_through_jacobians() {
        // B_lambda |d lambda| = B_nu |d nu| = B_E |dE| = B_nutilde |d nutilde| (definitions)
        let t = 5772.0;
        for &lambda in &[300e-9, 1e-6, 10e-6] {
            let nu = LIGHT_SPEED / lambda;
            let e = HC / lambda;
            let wn = 1.0 / lambda;
            let bl = radiance_per_wavelength(lambda, t);
            let bnu = radiance_per_frequency(nu, t) * nu * nu / LIGHT_SPEED;
            let be = radiance_per_energy(e, t) * e * e / HC;
            let bwn = radiance_per_wavenumber(wn, t) * wn * wn;
            for other in [bnu, be, bwn] {
                assert!((other / bl - 1.0).abs() < 1e-13);
            }
        }
    }

    #[test]
    fn extremes_are_finite() {
        for &l in &[1e-300, 1e-30, 1e-12, 1.0, 1e10, 1e300] {
            for &t in &[1e-300, 1e-3, 3.0, 300.0, 1e9, 1e300] {
                let b = radiance_per_wavelength(l, t);
                assert!(b.is_finite() && b >= 0.0, "l={l} t={t} b={b}");
                let f = band_fraction_below(l * t);
                assert!(f.is_finite() && (0.0..=1.0).contains(&f));
            }
        }
    }
}
