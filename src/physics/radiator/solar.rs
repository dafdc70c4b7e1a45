//! Sunlight on the emitter: integral eps(lambda, theta_sun) I_sun(lambda) d lambda
//! (Kirchhoff: the absorptance is the emissivity; Raman et al., Nature 515, 540, 2014,
//! the solar term of their balance).
//!
//! The spectrum is taken as the irradiance the surface receives (as the AM1.5G table is the
//! irradiance on its receiving plane); the zenith angle sets only the direction in which
//! the emitter's absorptance is read, and a scale factor adjusts the irradiance.

use super::spectral::Grid;
use crate::physics::constants::{HC, SUN_DILUTION};
use crate::physics::sources::Source;
use crate::physics::spectrum::Spectrum;

/// The sun as the balance sees it.
#[derive(Debug, Clone)]
pub struct Sun {
    /// spectrum of the irradiance on the surface
    pub source: Source,
    /// zenith angle of the sun [rad], 0 to below pi/2
    pub zenith_rad: f64,
    /// factor on the irradiance (1 = the spectrum as tabulated), >= 0
    pub scale: f64,
}

/// Wavelengths [m] of a table's points, ascending.
fn table_wavelengths(s: &Spectrum) -> Vec<f64> {
    let axis = s.axis();
    let mut l: Vec<f64> = s.coordinates().iter().map(|&u| HC / axis.energy_at(u)).collect();
    crate::physics::order::sort_numbers(&mut l);
    l
}

/// integral v(lambda) I(lambda) d lambda [W m^-2] for a weight `v` (fraction, a function of
/// wavelength [m]) over the source's spectrum at one sun. For a table the cells run between
/// its own points and the weight's `knots` [m]; each cell carries the table's exact power
/// between its edges (the trapezoid integral of the table, as everywhere in Glowgap) times
/// v at the cell's middle. That is exact for a weight constant between knots; otherwise its
/// error is second order in the table's spacing. A blackbody sun uses the fine spectral grid.
pub fn weighted_irradiance(source: &Source, v: impl Fn(f64) -> f64, knots: &[f64]) -> f64 {
    let total = match source {
        Source::Table { spectrum, .. } => {
            let mut pts = table_wavelengths(spectrum);
            let (lo, hi) = (pts[0], pts[pts.len() - 1]);
            pts.extend(knots.iter().copied().filter(|k| *k > lo && *k < hi));
            crate::physics::order::sort_numbers(&mut pts);
            pts.dedup();
            pts.windows(2)
                .map(|w| {
                    let (a, b) = (w[0], w[1]);
                    let p = spectrum.power_between(HC / b, HC / a);
                    if p > 0.0 {
                        p * v(0.5 * (a + b))
                    } else {
                        0.0
                    }
                })
                .sum()
        }
        Source::BlackbodySun { temp_k } => {
            let grid = Grid::fine(knots);
            SUN_DILUTION * grid.against_blackbody(&grid.weights(v), *temp_k)
        }
    };
    if total.is_finite() {
        total.max(0.0)
    } else {
        f64::MAX
    }
}

impl Sun {
    /// Power absorbed from the sun [W m^-2] by a surface with directional absorptance
    /// `absorptance(lambda, mu)` (dimensionless; lambda [m], mu = cos theta) read at
    /// mu = cos(zenith), the weight changing behaviour at `knots` [m].
    pub fn absorbed(&self, absorptance: impl Fn(f64, f64) -> f64, knots: &[f64]) -> f64 {
        let mu = self.zenith_rad.cos().clamp(0.0, 1.0);
        let scale = if self.scale.is_nan() { 0.0 } else { self.scale.max(0.0) };
        if scale == 0.0 {
            return 0.0;
        }
        let p = scale * weighted_irradiance(&self.source, |l| absorptance(l, mu), knots);
        if p.is_finite() {
            p
        } else {
            f64::MAX
        }
    }
}
