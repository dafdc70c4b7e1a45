//! What the sky sends down: the spectral, directional emissivity of the atmosphere, which
//! radiates as a body at the ambient air temperature, in front of a cold space background.
//!
//! From a zenith transmittance t(lambda) the emissivity along a path at zenith angle theta
//! is eps_sky(lambda, theta) = 1 - t(lambda)^(1/cos theta) (Granqvist & Hjortsberg,
//! J. Appl. Phys. 52, 4205, 1981: a plane-parallel, horizontally uniform atmosphere whose
//! slant path is 1/cos theta times the vertical one). The downwelling spectral radiance is
//! eps_sky B_lambda(T_a) + (1 - eps_sky) B_lambda(T_space).

use super::angular::clamp_fraction;
use super::clear_sky::{feature_wavelengths, zenith_optical_depth};
use super::emissivity::Piece;

/// Temperature of the space background [K]: the "3 K" of the cosmic microwave background
/// (measured 2.7255 K, Fixsen, ApJ 707, 916, 2009; at thermal-infrared wavelengths either
/// value radiates less than 1e-5 W m^-2).
pub const SPACE_TEMPERATURE_K: f64 = 3.0;

/// Edges of the textbook atmospheric window [m]: 8 and 13 um (common practice).
pub const WINDOW_M: (f64, f64) = (8e-6, 13e-6);

/// A measured or computed zenith transmittance t(lambda): wavelengths [m] ascending, values
/// fractions 0-1, interpolated linearly in wavelength. Outside its range the sky is taken as
/// opaque (t = 0), the cautious choice for cooling.
#[derive(Debug, Clone, PartialEq)]
pub struct Transmittance {
    pub wavelength_m: Vec<f64>,
    pub transmittance: Vec<f64>,
}

impl Transmittance {
    /// t at `lambda_m` [m]; 0 outside the table.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn at(&self, lambda_m: f64) -> f64 {
        let n = self.wavelength_m.len().min(self.transmittance.len());
        if n < 2 || !(lambda_m >= self.wavelength_m[0]) || lambda_m > self.wavelength_m[n - 1] {
            return 0.0;
        }
        let i = (self.wavelength_m[..n].partition_point(|&l| l <= lambda_m)).clamp(1, n - 1) - 1;
        let (a, b) = (self.wavelength_m[i], self.wavelength_m[i + 1]);
        let t = if b > a { (lambda_m - a) / (b - a) } else { 0.0 };
        let (ya, yb) = (self.transmittance[i], self.transmittance[i + 1]);
        clamp_fraction(ya + t.clamp(0.0, 1.0) * (yb - ya))
    }
}

/// The sky at one wavelength.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SkyPath {
    /// the same emissivity in every direction
    Isotropic(f64),
    /// zenith optical depth tau (dimensionless): eps_sky(mu) = 1 - t^(1/mu) = 1 - e^(-tau/mu)
    /// (Granqvist & Hjortsberg 1981)
    Depth(f64),
}

impl SkyPath {
    /// Emissivity (dimensionless) along mu = cos(zenith angle); mu is taken in (0, 1].
    #[inline]
    pub fn emissivity(&self, mu: f64) -> f64 {
        match self {
            SkyPath::Isotropic(e) => clamp_fraction(*e),
            SkyPath::Depth(tau) => {
                let mu = if mu > 0.0 { mu.min(1.0) } else { f64::MIN_POSITIVE };
                clamp_fraction(-(-tau.max(0.0) / mu).exp_m1())
            }
        }
    }
}

/// The sky above the emitter.
#[derive(Debug, Clone, PartialEq)]
pub enum Sky {
    /// The idealized box sky: transparent from `from_m` to `to_m` [m] (8-13 um by default),
    /// a blackbody at ambient temperature at every other wavelength, in every direction.
    Box { from_m: f64, to_m: f64 },
    /// No atmosphere: only the space background.
    Space,
    /// The spectral clear-sky model of [`super::clear_sky`] for `pwv_m` [m] of precipitable
    /// water (1 cm = 0.01 m).
    Clear { pwv_m: f64 },
    /// An imported zenith transmittance.
    Table(Transmittance),
}

impl Sky {
    /// The textbook box sky, open from 8 to 13 um.
    pub fn textbook_box() -> Sky {
        Sky::Box { from_m: WINDOW_M.0, to_m: WINDOW_M.1 }
    }

    /// Emissivity of the sky (fraction 0-1) at wavelength `lambda_m` [m] along a path at
    /// mu = cos(zenith angle) in (0, 1], with air at `ambient_k` [K].
    pub fn emissivity(&self, lambda_m: f64, mu: f64, ambient_k: f64) -> f64 {
        self.along(lambda_m, ambient_k).emissivity(mu)
    }

    /// The sky at wavelength `lambda_m` [m] with air at `ambient_k` [K], ready to be read in
    /// any direction; a table's t gives tau = -ln t.
    pub fn along(&self, lambda_m: f64, ambient_k: f64) -> SkyPath {
        match self {
            Sky::Box { from_m, to_m } => {
                SkyPath::Isotropic(if lambda_m >= *from_m && lambda_m <= *to_m { 0.0 } else { 1.0 })
            }
            Sky::Space => SkyPath::Isotropic(0.0),
            Sky::Clear { pwv_m } => SkyPath::Depth(zenith_optical_depth(lambda_m, *pwv_m, ambient_k)),
            Sky::Table(t) => {
                let tz = t.at(lambda_m);
                if tz <= 0.0 {
                    SkyPath::Isotropic(1.0)
                } else {
                    SkyPath::Depth(-tz.ln())
                }
            }
        }
    }

    /// Zenith transmittance (fraction 0-1) at `lambda_m` [m] with air at `ambient_k` [K].
    pub fn zenith_transmittance(&self, lambda_m: f64, ambient_k: f64) -> f64 {
        1.0 - self.emissivity(lambda_m, 1.0, ambient_k)
    }

    /// Whether the sky's emissivity is the same in every direction.
    pub fn is_isotropic(&self) -> bool {
        matches!(self, Sky::Box { .. } | Sky::Space)
    }

    /// The emissivity as constant, direction-independent pieces covering (0, inf), when it
    /// is so (box and space skies).
    pub fn constant_pieces(&self) -> Option<Vec<Piece>> {
        match self {
            Sky::Box { from_m, to_m } => {
                let (a, b) = (from_m.max(0.0), to_m.max(from_m.max(0.0)));
                Some(vec![(0.0, a, 1.0), (a, b, 0.0), (b, f64::INFINITY, 1.0)])
            }
            Sky::Space => Some(vec![(0.0, f64::INFINITY, 0.0)]),
            _ => None,
        }
    }

    /// Wavelengths [m] where the sky changes behaviour, for integration grids.
    pub fn knots(&self) -> Vec<f64> {
        match self {
            Sky::Box { from_m, to_m } => vec![*from_m, *to_m],
            Sky::Space => Vec::new(),
            Sky::Clear { .. } => feature_wavelengths(),
            Sky::Table(t) => t.wavelength_m.clone(),
        }
        .into_iter()
        .filter(|l| l.is_finite() && *l > 0.0)
        .collect()
    }
}
