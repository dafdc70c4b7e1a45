//! A spectral clear-sky model: the zenith optical depth of a cloudless atmosphere from its
//! precipitable water vapour and the air temperature at the ground.
//!
//! This is an engineering approximation, not a line-by-line radiative transfer code. The
//! atmosphere is one layer at ambient temperature; its zenith optical depth tau(nu) is the
//! sum of the main absorbers of the thermal infrared, each with its own physics:
//!
//! * the self- and foreign-broadened water-vapour continuum that limits the 8-13 um window,
//!   with the coefficient of Roberts, Selby & Biberman (Appl. Opt. 15, 2085, 1976):
//!   C_s(nu, 296 K) = 4.18 + 5578 exp(-7.87e-3 nu) g^-1 cm^2 atm^-1 (nu in cm^-1), scaled
//!   by exp(1800 (1/T - 1/296)), and tau_c = C_s u (e_eff + gamma p_eff) with u the water
//!   column [g cm^-2], e_eff the water-weighted vapour pressure and gamma = 0.002 the
//!   relative efficiency of air as a broadener (from memory, as used with that coefficient);
//! * water-vapour line bands: the pure rotational band (closing the sky beyond about
//!   17-25 um), the 6.3 um bending band (closing it below about 8 um) and the 2.7 um band;
//! * the CO2 15 um band (zenith optical depth above 1 from about 13.5 to 17 um) and the
//!   4.3 um band;
//! * the ozone 9.6 um band, a partial bite out of the window.
//!
//! Each line band is a Malkmus statistical band (Malkmus, J. Opt. Soc. Am. 57, 323, 1967):
//! the band-mean optical depth of lines of mean strength-to-spacing k(nu) [cm^2 g^-1] and
//! overlap parameter beta (pi times the mean line width over the spacing) along an absorber
//! amount u is tau = (beta / 2) (sqrt(1 + 4 k u / beta) - 1): k u in the weak-line limit,
//! sqrt(beta k u) in the strong-line (square-root) limit. The band envelope k(nu) falls off
//! exponentially away from the band centre with a width of its own on either side, in the
//! manner of Edwards' exponential wide-band model (Edwards, Adv. Heat Transfer 12, 115,
//! 1976). CO2 and ozone amounts are fixed (a present-day well-mixed CO2 column and about
//! 300 Dobson units of ozone); only water varies.
//!
//! Vertical structure: water vapour falls off exponentially with a scale height of 2 km and
//! the air pressure with 8 km (common practice). The water column u = rho_0 H fixes the
//! vapour density at the ground, rho_0 = u / H, hence the ground vapour pressure
//! e_0 = rho_0 R_v T. Along the water path the self-broadening pressure averages to e_0 / 2
//! and the air pressure to p_0 H_p / (H_p + H).
//!
//! Calibration: the band strengths and widths were set once so that the broadband emissivity
//! of the sky, eps = (downwelling flux) / (sigma T_a^4) with the angular law
//! eps(theta) = 1 - t^(1/cos theta) (Granqvist & Hjortsberg, J. Appl. Phys. 52, 4205, 1981),
//! follows the clear-sky correlations of Berdahl & Martin (Solar Energy 32, 663, 1984) and
//! Brutsaert (Water Resour. Res. 11, 742, 1975) for dew points from -10 to 25 deg C and
//! air 0-12 K above the dew point, with the water column from the dew point by Reitan's
//! relation (Reitan, J. Appl. Meteor. 2, 776, 1963). The tests hold it within 0.03 of both.
//! Outside that range (very dry or hot skies, high sites, inversions) expect larger errors.

use crate::physics::constants::BOLTZMANN;

/// Scale height of water vapour [m] (common practice: about 2 km).
pub const VAPOUR_SCALE_HEIGHT_M: f64 = 2000.0;
/// Scale height of air pressure [m] (common practice: about 8 km).
pub const PRESSURE_SCALE_HEIGHT_M: f64 = 8000.0;
/// Standard atmosphere [Pa] (exact by definition, CGPM 1954).
pub const STANDARD_ATMOSPHERE_PA: f64 = 101_325.0;
/// Mass of a water molecule [kg]: 18.015 u (IUPAC standard atomic weights: H 1.008,
/// O 15.999) times the atomic mass constant 1.66053906660e-27 kg (CODATA 2018).
pub const WATER_MOLECULE_KG: f64 = 18.015 * 1.660_539_066_60e-27;
/// Reference temperature of the continuum coefficient [K] (Roberts et al. 1976).
const CONTINUUM_REFERENCE_K: f64 = 296.0;
/// Temperature coefficient of the self continuum [K] (Roberts et al. 1976).
const CONTINUUM_TEMPERATURE_K: f64 = 1800.0;
/// Broadening efficiency of air relative to water vapour in the continuum (from memory).
const FOREIGN_EFFICIENCY: f64 = 0.002;

/// One absorption band: a Malkmus band with an exponential envelope.
#[derive(Debug, Clone, Copy)]
pub struct AbsorberBand {
    pub name: &'static str,
    /// band centre [cm^-1]
    pub centre_cm: f64,
    /// peak mean strength-to-spacing ratio: [cm^2 g^-1] of water when `per_water`,
    /// otherwise the peak weak-line optical depth of the fixed column (dimensionless)
    pub strength: f64,
    /// e-folding width of the envelope below / above the centre [cm^-1]; a width of
    /// infinity holds the peak on that side (the rotational band's low-frequency side)
    pub width_below_cm: f64,
    pub width_above_cm: f64,
    /// Malkmus overlap parameter beta (dimensionless); infinity for the weak-line (linear)
    /// limit
    pub overlap: f64,
    /// whether the amount is the water column (true) or a fixed column (false)
    pub per_water: bool,
}

/// The bands of the model, with the calibrated parameters (see the module notes).
pub const BANDS: [AbsorberBand; 6] = [
    AbsorberBand {
        name: "H2O rotational",
        centre_cm: 230.0,
        strength: 150.0,
        width_below_cm: f64::INFINITY,
        width_above_cm: 70.0,
        overlap: 0.18,
        per_water: true,
    },
    AbsorberBand {
        name: "H2O 6.3 um",
        centre_cm: 1595.0,
        strength: 250.0,
        width_below_cm: 62.0,
        width_above_cm: 62.0,
        overlap: 0.18,
        per_water: true,
    },
    AbsorberBand {
        name: "H2O 2.7 um",
        centre_cm: 3755.0,
        strength: 100.0,
        width_below_cm: 80.0,
        width_above_cm: 80.0,
        overlap: 0.18,
        per_water: true,
    },
    AbsorberBand {
        name: "CO2 15 um",
        centre_cm: 667.0,
        strength: 3.0e6,
        width_below_cm: 5.3,
        width_above_cm: 5.3,
        overlap: 0.3,
        per_water: false,
    },
    AbsorberBand {
        name: "CO2 4.3 um",
        centre_cm: 2349.0,
        strength: 3.0e5,
        width_below_cm: 8.0,
        width_above_cm: 8.0,
        overlap: 0.3,
        per_water: false,
    },
    AbsorberBand {
        name: "O3 9.6 um",
        centre_cm: 1042.0,
        strength: 0.6,
        width_below_cm: 18.0,
        width_above_cm: 18.0,
        overlap: f64::INFINITY,
        per_water: false,
    },
];

/// Malkmus band-mean optical depth (dimensionless) for weak-line optical depth `x` and
/// overlap `beta` (both dimensionless)
/// (Malkmus 1967): (beta/2) (sqrt(1 + 4x/beta) - 1), computed without cancellation as
/// 2x / (1 + sqrt(1 + 4x/beta)).
#[inline]
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn malkmus_optical_depth(x: f64, beta: f64) -> f64 {
    if !(x > 0.0) {
        return 0.0;
    }
    if beta == f64::INFINITY {
        return x;
    }
    2.0 * x / (1.0 + (1.0 + 4.0 * x / beta).sqrt())
}

impl AbsorberBand {
    /// Band optical depth (dimensionless) at wavenumber `nu_cm` [cm^-1] for water column
    /// `u_g_cm2` [g cm^-2]: [`malkmus_optical_depth`] of the envelope k(nu) times the amount.
    pub fn optical_depth(&self, nu_cm: f64, u_g_cm2: f64) -> f64 {
        let d = nu_cm - self.centre_cm;
        let width = if d < 0.0 { self.width_below_cm } else { self.width_above_cm };
        let envelope = if width == f64::INFINITY { 1.0 } else { (-d.abs() / width).exp() };
        let amount = if self.per_water { u_g_cm2 } else { 1.0 };
        malkmus_optical_depth(self.strength * envelope * amount, self.overlap)
    }
}

/// Self-continuum coefficient C_s(nu, T) [g^-1 cm^2 atm^-1] at wavenumber `nu_cm` [cm^-1]
/// and temperature `temp_k` [K] (Roberts, Selby & Biberman 1976).
pub fn continuum_coefficient(nu_cm: f64, temp_k: f64) -> f64 {
    let c296 = 4.18 + 5578.0 * (-7.87e-3 * nu_cm.max(0.0)).exp();
    let t = temp_k.max(1.0);
    c296 * (CONTINUUM_TEMPERATURE_K * (1.0 / t - 1.0 / CONTINUUM_REFERENCE_K)).min(700.0).exp()
}

/// Ground vapour pressure [Pa] of an exponential vapour profile holding the precipitable
/// water `pwv_m` [m of liquid] at air temperature `temp_k` [K]: e_0 = rho_0 R_v T with
/// rho_0 = (1000 kg m^-3 * pwv) / H and R_v = k_B / m_H2O.
pub fn ground_vapour_pressure(pwv_m: f64, temp_k: f64) -> f64 {
    let column_kg_m2 = 1000.0 * pwv_m.max(0.0);
    let rho0 = column_kg_m2 / VAPOUR_SCALE_HEIGHT_M;
    rho0 * (BOLTZMANN / WATER_MOLECULE_KG) * temp_k.max(0.0)
}

/// Zenith optical depth (dimensionless) of the clear sky at wavelength `lambda_m` [m] for
/// precipitable water `pwv_m` [m] (1 cm = 0.01 m) and ambient air temperature `ambient_k`
/// [K]: continuum plus line bands, as in the module docs. Non-negative, finite for every
/// finite input.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn zenith_optical_depth(lambda_m: f64, pwv_m: f64, ambient_k: f64) -> f64 {
    if !(lambda_m > 0.0) {
        return 0.0;
    }
    let nu_cm = 0.01 / lambda_m; // 1/lambda in cm^-1
    let u = 100.0 * pwv_m.max(0.0); // g cm^-2 of water (1 cm of liquid = 1 g cm^-2)
    let e_eff_atm = 0.5 * ground_vapour_pressure(pwv_m, ambient_k) / STANDARD_ATMOSPHERE_PA;
    let p_eff_atm = PRESSURE_SCALE_HEIGHT_M / (PRESSURE_SCALE_HEIGHT_M + VAPOUR_SCALE_HEIGHT_M);
    let continuum = continuum_coefficient(nu_cm, ambient_k) * u * (e_eff_atm + FOREIGN_EFFICIENCY * p_eff_atm);
    let lines: f64 = BANDS.iter().map(|b| b.optical_depth(nu_cm, u)).sum();
    let tau = continuum + lines;
    if tau.is_finite() {
        tau
    } else {
        f64::MAX
    }
}

/// Where the model's features sit (band centres, and 1 and 3 envelope widths either side,
/// placed in wavenumber [cm^-1]), as wavelengths [m], for integration grids.
pub fn feature_wavelengths() -> Vec<f64> {
    let mut out = Vec::new();
    for b in BANDS.iter() {
        for k in [-3.0, -1.0, 0.0, 1.0, 3.0] {
            let w = if k < 0.0 { b.width_below_cm } else { b.width_above_cm };
            if w.is_finite() {
                let nu = b.centre_cm + k * w;
                if nu > 0.0 {
                    out.push(0.01 / nu);
                }
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn malkmus_limits() {
        // weak lines: tau = x; strong lines: tau -> sqrt(beta x) (Malkmus 1967)
        assert!((malkmus_optical_depth(1e-6, 0.2) / 1e-6 - 1.0).abs() < 1e-4);
        let x = 1e8;
        assert!((malkmus_optical_depth(x, 0.2) / (0.2 * x).sqrt() - 1.0).abs() < 1e-3);
    }

    #[test]
    fn continuum_coefficient_at_the_window_centre() {
        // 4.18 + 5578 e^-7.87 at 1000 cm^-1, 296 K (Roberts et al. 1976): 6.31
        assert!((continuum_coefficient(1000.0, 296.0) - (4.18 + 5578.0 * (-7.87f64).exp())).abs() < 1e-12);
    }

    #[test]
    fn ground_vapour_pressure_of_two_centimetres() {
        // 20 kg m^-2 over 2 km: 0.01 kg m^-3; at 288 K, e = rho R_v T = 0.01 * 461.5 * 288
        // = 1329 Pa (R_v = 461.5 J kg^-1 K^-1, handbook value).
        let e = ground_vapour_pressure(0.02, 288.0);
        assert!((e - 1329.1).abs() < 1.0, "{e}");
    }

    #[test]
    fn extremes_are_finite() {
        for l in [1e-300, 1e-9, 1e-5, 1.0, 1e300] {
            for w in [0.0, 1e-9, 0.01, 0.1, 1e300] {
                for t in [0.0, 1.0, 300.0, 1e300] {
                    let tau = zenith_optical_depth(l, w, t);
                    assert!(tau.is_finite() && tau >= 0.0, "{l} {w} {t} {tau}");
                }
            }
        }
    }
}
