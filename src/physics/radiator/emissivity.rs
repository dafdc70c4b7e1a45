//! Spectral emissivity profiles of opaque emitters.
//!
//! An opaque surface (transmittance 0) that reflects R(lambda) and absorbs A(lambda) has
//! A = 1 - R, and by Kirchhoff's law (Kirchhoff, Ann. Phys. 185, 275, 1860) its emissivity
//! equals its absorptance at every wavelength and direction: eps = A = 1 - R. So one
//! profile eps(lambda) sets the thermal emission, the absorbed sky radiation and the
//! absorbed sunlight alike.
//!
//! Every profile is a fraction 0-1 at every wavelength (values are clamped; NaN counts as
//! 0) and constant beyond its outermost control point, so integrals to 0 and infinity
//! close with exact band integrals of Planck's law.

use super::angular::{clamp_fraction, AngularModel};
use super::balance::sky_and_share;
use super::layered::Directional;
use super::sky::SkyPath;

/// A spectral emissivity eps(lambda) at normal incidence. Wavelengths in metres.
#[derive(Debug, Clone, PartialEq)]
pub enum Profile {
    /// The same emissivity at every wavelength (1 = blackbody).
    Grey { emissivity: f64 },
    /// A band from `from_m` to `to_m` [m] with emissivity `inside`, `outside` elsewhere.
    /// `edge_m` [m] = 0 gives sharp edges (the ideal selective emitter when inside = 1 and
    /// outside = 0); `edge_m` > 0 gives logistic edges whose 10-90 % rise takes `edge_m`:
    /// eps = outside + (inside - outside) L((lambda - from)/s) L((to - lambda)/s),
    /// L(x) = 1 / (1 + e^-x), s = edge / (2 ln 9) (L rises from 0.1 to 0.9 over 2 ln 9).
    Window { from_m: f64, to_m: f64, inside: f64, outside: f64, edge_m: f64 },
    /// Control points (wavelength [m], emissivity), wavelengths strictly ascending, joined
    /// by straight lines on a logarithmic wavelength axis and held constant beyond the first
    /// and last point.
    Points { points: Vec<(f64, f64)> },
    /// A measured table (wavelength [m], emissivity), ascending, interpolated linearly in
    /// wavelength and held at its end values beyond the measured range.
    Table { wavelength_m: Vec<f64>, emissivity: Vec<f64> },
    /// A layer stack's emissivity by wavelength and direction ([`Directional`]); its
    /// angular behaviour is its own, so the emitter's angular model does not apply.
    Directional(std::sync::Arc<Directional>),
}

/// A wavelength range on which a profile is constant: (from [m], to [m], emissivity).
pub type Piece = (f64, f64, f64);

/// Number of logistic scale lengths on either side of a smooth edge that get their own
/// grid points; beyond 12 s the logistic is within e^-12 = 6e-6 of its asymptote.
const EDGE_SPAN: i32 = 12;

/// The logistic function 1 / (1 + e^-x) (x and the result dimensionless), without overflow
/// for any x.
#[inline]
fn logistic(x: f64) -> f64 {
    if x >= 0.0 {
        1.0 / (1.0 + (-x).exp())
    } else {
        let e = x.exp();
        e / (1.0 + e)
    }
}

/// 2 ln 9 (dimensionless): the logistic rises from 0.1 to 0.9 over this many scale lengths
/// (L(x) = 0.1 at x = -ln 9, 0.9 at x = ln 9).
fn ten_to_ninety() -> f64 {
    2.0 * 9f64.ln()
}

impl Profile {
    /// The blackbody: emissivity 1 everywhere.
    pub fn blackbody() -> Profile {
        Profile::Grey { emissivity: 1.0 }
    }

    /// The ideal selective emitter: 1 from `from_m` to `to_m` [m], 0 elsewhere.
    pub fn ideal_window(from_m: f64, to_m: f64) -> Profile {
        Profile::Window { from_m, to_m, inside: 1.0, outside: 0.0, edge_m: 0.0 }
    }

    /// Emissivity (fraction 0-1) at wavelength `lambda_m` [m] (the formulas of [`Profile`]).
    pub fn at(&self, lambda_m: f64) -> f64 {
        let v = match self {
            Profile::Grey { emissivity } => *emissivity,
            Profile::Window { from_m, to_m, inside, outside, edge_m } => {
                let (inside, outside) = (clamp_fraction(*inside), clamp_fraction(*outside));
                if *edge_m > 0.0 {
                    let s = edge_m / ten_to_ninety();
                    let shape = logistic((lambda_m - from_m) / s) * logistic((to_m - lambda_m) / s);
                    outside + (inside - outside) * shape
                } else if lambda_m >= *from_m && lambda_m <= *to_m {
                    inside
                } else {
                    outside
                }
            }
            Profile::Points { points } => interpolate(points.len(), |i| points[i], lambda_m, true),
            Profile::Table { wavelength_m, emissivity } => {
                let n = wavelength_m.len().min(emissivity.len());
                interpolate(n, |i| (wavelength_m[i], emissivity[i]), lambda_m, false)
            }
            Profile::Directional(d) => d.at(lambda_m, 1.0),
        };
        clamp_fraction(v)
    }

    /// Wavelengths [m] where the profile changes behaviour (corners, edges), for
    /// integration grids.
    pub fn knots(&self) -> Vec<f64> {
        match self {
            Profile::Grey { .. } => Vec::new(),
            Profile::Window { from_m, to_m, edge_m, .. } => {
                if *edge_m > 0.0 {
                    let s = edge_m / ten_to_ninety();
                    (-EDGE_SPAN..=EDGE_SPAN)
                        .flat_map(|k| [from_m + k as f64 * s, to_m + k as f64 * s])
                        .filter(|l| *l > 0.0)
                        .collect()
                } else {
                    vec![*from_m, *to_m]
                }
            }
            Profile::Points { points } => points.iter().map(|p| p.0).collect(),
            Profile::Table { wavelength_m, .. } => wavelength_m.clone(),
            Profile::Directional(d) => d.wavelength_m.clone(),
        }
        .into_iter()
        .filter(|l| l.is_finite() && *l > 0.0)
        .collect()
    }

    /// The profile as constant pieces covering (0, inf), when it is piecewise constant.
    pub fn constant_pieces(&self) -> Option<Vec<Piece>> {
        match self {
            Profile::Grey { emissivity } => Some(vec![(0.0, f64::INFINITY, clamp_fraction(*emissivity))]),
            Profile::Window { from_m, to_m, inside, outside, edge_m } if *edge_m <= 0.0 => {
                let (a, b) = (from_m.max(0.0), to_m.max(from_m.max(0.0)));
                Some(vec![
                    (0.0, a, clamp_fraction(*outside)),
                    (a, b, clamp_fraction(*inside)),
                    (b, f64::INFINITY, clamp_fraction(*outside)),
                ])
            }
            Profile::Points { points } if points.len() == 1 => {
                Some(vec![(0.0, f64::INFINITY, clamp_fraction(points[0].1))])
            }
            _ => None,
        }
    }
}

/// Linear interpolation of n points (x, y) at `x`, in ln x when `log_axis`; the end values
/// beyond the ends; 0 for an empty table. `x` in the unit of the table's x; the result in the
/// unit of its y.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn interpolate(n: usize, point: impl Fn(usize) -> (f64, f64), x: f64, log_axis: bool) -> f64 {
    if n == 0 {
        return 0.0;
    }
    let (x0, y0) = point(0);
    let (xn, yn) = point(n - 1);
    if !(x > x0) {
        return y0;
    }
    if !(x < xn) {
        return yn;
    }
    // first index whose x exceeds the query: binary search over the table
    let (mut lo, mut hi) = (0usize, n - 1);
    while hi - lo > 1 {
        let mid = (lo + hi) / 2;
        if point(mid).0 <= x {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    let (xa, ya) = point(lo);
    let (xb, yb) = point(hi);
    let t = if log_axis { (x / xa).ln() / (xb / xa).ln() } else { (x - xa) / (xb - xa) };
    if t.is_finite() {
        ya + t.clamp(0.0, 1.0) * (yb - ya)
    } else {
        ya
    }
}

/// A separate emissivity for the solar band: `profile` applies below `below_m` [m], the
/// emitter's main profile from `below_m` up.
#[derive(Debug, Clone, PartialEq)]
pub struct SolarBand {
    /// the split wavelength [m]
    pub below_m: f64,
    pub profile: Profile,
}

/// An opaque emitter: spectral profile, optional solar-band profile, angular model.
#[derive(Debug, Clone, PartialEq)]
pub struct Emitter {
    pub profile: Profile,
    pub solar: Option<SolarBand>,
    pub angular: AngularModel,
}

impl Emitter {
    /// A Lambertian emitter with one profile at all wavelengths.
    pub fn new(profile: Profile) -> Emitter {
        Emitter { profile, solar: None, angular: AngularModel::Lambertian }
    }

    /// Normal spectral emissivity (= absorptance) at `lambda_m` [m], fraction 0-1.
    pub fn normal(&self, lambda_m: f64) -> f64 {
        match &self.solar {
            Some(s) if lambda_m < s.below_m => s.profile.at(lambda_m),
            _ => self.profile.at(lambda_m),
        }
    }

    /// The stack table that sets the emissivity at `lambda_m` [m], if a stack does.
    fn table_at(&self, lambda_m: f64) -> Option<&Directional> {
        match (&self.solar, &self.profile) {
            (Some(s), _) if lambda_m < s.below_m => None,
            (_, Profile::Directional(d)) => Some(d),
            _ => None,
        }
    }

    /// Directional spectral emissivity (fraction 0-1) at `lambda_m` [m] and mu = cos(theta)
    /// (dimensionless).
    #[inline]
    pub fn directional(&self, lambda_m: f64, mu: f64) -> f64 {
        match self.table_at(lambda_m) {
            Some(d) => d.at(lambda_m, mu),
            None => self.angular.apply(self.normal(lambda_m), mu),
        }
    }

    /// Hemispherical spectral emissivity (fraction 0-1) at `lambda_m` [m] (closed form in
    /// angle, [`AngularModel::hemispherical`], or a stack's angular rule).
    #[inline]
    pub fn hemispherical(&self, lambda_m: f64) -> f64 {
        match self.table_at(lambda_m) {
            Some(d) => d.hemispherical(lambda_m),
            None => self.angular.hemispherical(self.normal(lambda_m)),
        }
    }

    /// The sky's hemispherical emissivity along `path` and the emitter's share of it at
    /// `lambda_m` [m] (both dimensionless; [`sky_and_share`] for a profile with an angular
    /// model, the stack's angular rule for a stack).
    pub fn sky_share(&self, lambda_m: f64, path: SkyPath) -> (f64, f64) {
        match self.table_at(lambda_m) {
            Some(d) => (sky_and_share(&AngularModel::Lambertian, 1.0, path).0, d.sky_share(lambda_m, path)),
            None => sky_and_share(&self.angular, self.normal(lambda_m), path),
        }
    }

    /// Wavelengths [m] where the emitter's profile changes behaviour.
    pub fn knots(&self) -> Vec<f64> {
        match &self.solar {
            None => self.profile.knots(),
            Some(s) => {
                let mut k: Vec<f64> = s.profile.knots().into_iter().filter(|l| *l < s.below_m).collect();
                k.extend(self.profile.knots().into_iter().filter(|l| *l > s.below_m));
                if s.below_m.is_finite() && s.below_m > 0.0 {
                    k.push(s.below_m);
                }
                k
            }
        }
    }

    /// The normal emissivity as constant pieces covering (0, inf), when piecewise constant.
    pub fn constant_pieces(&self) -> Option<Vec<Piece>> {
        let main = self.profile.constant_pieces()?;
        match &self.solar {
            None => Some(main),
            Some(s) => {
                let split = s.below_m.max(0.0);
                let solar = s.profile.constant_pieces()?;
                let mut out: Vec<Piece> = clip(&solar, 0.0, split);
                out.extend(clip(&main, split, f64::INFINITY));
                Some(out)
            }
        }
    }
}

/// The pieces restricted to [`lo`, `hi`] [m], empty ones dropped.
fn clip(pieces: &[Piece], lo: f64, hi: f64) -> Vec<Piece> {
    pieces.iter().map(|&(a, b, v)| (a.max(lo), b.min(hi), v)).filter(|(a, b, _)| b > a).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn logistic_edges_have_the_stated_width() {
        // 10-90 % rise over edge_m, midpoint at the band edge
        let p = Profile::Window { from_m: 8e-6, to_m: 13e-6, inside: 1.0, outside: 0.0, edge_m: 0.5e-6 };
        assert!((p.at(8e-6) - 0.5).abs() < 1e-6);
        assert!((p.at(7.75e-6) - 0.1).abs() < 1e-6);
        assert!((p.at(8.25e-6) - 0.9).abs() < 1e-6);
        assert!((p.at(13.25e-6) - 0.1).abs() < 1e-6);
    }

    #[test]
    fn control_points_are_linear_on_a_log_axis() {
        let p = Profile::Points { points: vec![(1e-6, 0.0), (100e-6, 1.0)] };
        assert!((p.at(10e-6) - 0.5).abs() < 1e-12); // one decade of two
        assert_eq!(p.at(0.5e-6), 0.0);
        assert_eq!(p.at(1.0), 1.0);
    }

    #[test]
    fn solar_band_overrides_below_its_split() {
        let e = Emitter {
            profile: Profile::Grey { emissivity: 0.9 },
            solar: Some(SolarBand { below_m: 4e-6, profile: Profile::Grey { emissivity: 0.05 } }),
            angular: AngularModel::Lambertian,
        };
        assert_eq!(e.normal(1e-6), 0.05);
        assert_eq!(e.normal(10e-6), 0.9);
        let p = e.constant_pieces().unwrap();
        assert_eq!(p, vec![(0.0, 4e-6, 0.05), (4e-6, f64::INFINITY, 0.9)]);
    }

    #[test]
    fn odd_values_stay_fractions() {
        let p = Profile::Grey { emissivity: f64::NAN };
        assert_eq!(p.at(1e-5), 0.0);
        let t = Profile::Table { wavelength_m: vec![], emissivity: vec![] };
        assert_eq!(t.at(1e-5), 0.0);
        let w = Profile::Window { from_m: 8e-6, to_m: 13e-6, inside: 2.0, outside: -1.0, edge_m: 1e-300 };
        for l in [1e-9, 8e-6, 1e-5, 1.0] {
            let v = w.at(l);
            assert!((0.0..=1.0).contains(&v));
        }
    }
}
