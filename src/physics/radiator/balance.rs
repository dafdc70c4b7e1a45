//! The power balance of a radiator facing the sky (Raman, Anoma, Zhu, Rephaeli & Fan,
//! Nature 515, 540, 2014, their eq. 1):
//!
//!   P_net(T) = P_rad(T) - P_sky(T_a) - P_sun - h_c (T_a - T)                 [W m^-2]
//!
//! * P_rad(T) = integral dlambda integral_hemisphere cos(theta) dOmega B_lambda(T) eps(lambda, theta)
//! * P_sky = the same with B_lambda(T_a) eps(lambda, theta) eps_sky(lambda, theta), plus the
//!   space background B_lambda(3 K) seen through the transparent part (1 - eps_sky)
//! * P_sun = integral eps(lambda, theta_sun) I_sun(lambda) dlambda
//! * h_c (T_a - T): conduction and convection from the air, with a combined coefficient
//!   h_c [W m^-2 K^-1].
//!
//! With cos(theta) dOmega = 2 pi mu dmu, each hemispherical integral is
//! pi integral dlambda B_lambda * 2 integral_0^1 (...) mu dmu. The angular part is closed form
//! for the emitter alone ([`AngularModel::hemispherical`]), for an isotropic sky, and against
//! a sky layer of optical depth tau through the exponential integral E_3 on each piece where
//! the emitter's angular model is constant. The spectral part is exact band integrals where
//! everything is piecewise constant in wavelength, and the fine grid otherwise (see
//! [`super::spectral`]).
//!
//! P_net > 0 means the surface loses heat: it cools below T. P_net is increasing in T
//! whenever the surface emits at all or h_c > 0, so the steady temperature (P_net = 0) is
//! unique when it exists and a bracketing search finds it.

use super::angular::{clamp_fraction, AngularModel};
use super::emissivity::{Emitter, Piece};
use super::sky::{Sky, SkyPath, SPACE_TEMPERATURE_K};
use super::solar::Sun;
use super::spectral::{Grid, Weights};
use crate::physics::planck::stefan_boltzmann;
use crate::physics::special::exp_integral_3;

/// What surrounds the radiator.
#[derive(Debug, Clone)]
pub struct Surroundings {
    pub sky: Sky,
    /// ambient air temperature [K], also the temperature of the radiating atmosphere
    pub ambient_k: f64,
    /// `None` at night
    pub sun: Option<Sun>,
    /// combined convection and conduction coefficient h_c [W m^-2 K^-1], >= 0
    pub h_c: f64,
}

/// The terms of the balance at one surface temperature [W m^-2].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Parts {
    /// surface temperature [K]
    pub temp_k: f64,
    /// P_rad: emitted by the surface
    pub emitted: f64,
    /// P_sky: absorbed from the sky (and the space background)
    pub sky_absorbed: f64,
    /// P_sun: absorbed from the sun
    pub sun_absorbed: f64,
    /// h_c (T_a - T): gained from the air (negative when the surface is warmer)
    pub parasitic: f64,
    /// P_net = emitted - sky_absorbed - sun_absorbed - parasitic
    pub net: f64,
}

/// The temperature at which P_net = 0, or why there is none in the search range.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Steady {
    /// found [K]
    At(f64),
    /// P_net is still positive at the lowest temperature searched [K]
    BelowRange(f64),
    /// P_net is still negative at the highest temperature searched [K]
    AboveRange(f64),
    /// the surface exchanges no heat that depends on its temperature (emissivity 0
    /// everywhere and h_c = 0), so no temperature is singled out
    Undefined,
}

impl Steady {
    /// The steady temperature [K], if one was found.
    pub fn temperature(&self) -> Option<f64> {
        match self {
            Steady::At(t) => Some(*t),
            _ => None,
        }
    }
}

/// The search range of the steady temperature [K].
pub const STEADY_SEARCH_K: (f64, f64) = (1.0, 3000.0);

/// How the spectral integrals were done.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Method {
    /// exact band integrals of Planck's law on piecewise-constant profiles
    ClosedForm,
    /// Gauss-Legendre on the fine logarithmic wavelength grid
    Grid,
}

/// A prepared balance: everything that does not depend on the surface temperature is
/// computed once, so P_net(T) costs one spectral sum.
#[derive(Debug, Clone)]
pub struct Balance {
    grid: Grid,
    emit: Weights,
    sky_absorbed: f64,
    sun_absorbed: f64,
    sky_emissivity: f64,
    ambient_k: f64,
    h_c: f64,
    method: Method,
}

/// The breaks of pieces, without the ends 0 and infinity.
fn breaks(pieces: &[Piece]) -> Vec<f64> {
    pieces.iter().flat_map(|p| [p.0, p.1]).filter(|l| l.is_finite() && *l > 0.0).collect()
}

/// The sky's hemispherical emissivity 2 integral_0^1 eps_sky(mu) mu dmu and the emitter's
/// share of it, 2 integral_0^1 eps(mu) eps_sky(mu) mu dmu, for an emitter of normal
/// emissivity `eps` (fraction) under the sky `path`, both in closed form and dimensionless.
/// The emitter's angular model is constant on each of its pieces [a, b] in mu, and for a
/// layer of zenith optical depth tau
///   2 integral_a^b (1 - e^(-tau/mu)) mu dmu = (b^2 - a^2) - 2 (b^2 E_3(tau/b) - a^2 E_3(tau/a)),
/// since integral_a^b e^(-tau/mu) mu dmu = integral_{1/b}^{1/a} e^(-tau t) t^-3 dt and
/// integral_c^inf e^(-tau t) t^-3 dt = c^-2 E_3(tau c) (A&S 5.1.4). Over the whole
/// hemisphere this is the familiar 1 - 2 E_3(tau) of a plane layer (e.g. Modest, Radiative
/// Heat Transfer, 3rd ed., 2013, ch. 14).
pub fn sky_and_share(angular: &AngularModel, eps: f64, path: SkyPath) -> (f64, f64) {
    match path {
        SkyPath::Isotropic(s) => {
            let s = clamp_fraction(s);
            (s, angular.hemispherical(eps) * s)
        }
        SkyPath::Depth(tau) => {
            let tau = if tau.is_nan() { 0.0 } else { tau.max(0.0) };
            // mu^2 E_3(tau/mu), which tends to 0 as mu -> 0 for every tau >= 0
            let slant = |mu: f64| if mu > 0.0 { mu * mu * exp_integral_3(tau / mu) } else { 0.0 };
            let at_zenith = slant(1.0);
            let edge = |mu: f64| if mu == 1.0 { at_zenith } else { slant(mu) };
            let share: f64 = angular
                .mu_pieces()
                .into_iter()
                .map(|(a, b)| angular.apply(eps, 0.5 * (a + b)) * ((b * b - a * a) - 2.0 * (edge(b) - edge(a))))
                .sum();
            (clamp_fraction(1.0 - 2.0 * at_zenith), clamp_fraction(share))
        }
    }
}

/// The grid for a weight that is piecewise constant when both `a` and `b` are (pieces in
/// [m]; `knots` [m] for the fine grid otherwise), and the method that it implies.
pub fn grid_for(a: Option<Vec<Piece>>, b: Option<Vec<Piece>>, knots: &[f64]) -> (Grid, Method) {
    match (a, b) {
        (Some(a), Some(b)) => {
            let mut br = breaks(&a);
            br.extend(breaks(&b));
            (Grid::exact(&br), Method::ClosedForm)
        }
        _ => (Grid::fine(knots), Method::Grid),
    }
}

/// Hemispherical downwelling flux of a sky at ambient `ambient_k` [K], over sigma T_a^4:
/// the sky's broadband emissivity (dimensionless; the space background included, which is
/// negligible).
pub fn sky_broadband_emissivity(sky: &Sky, ambient_k: f64) -> f64 {
    let (grid, _) = grid_for(sky.constant_pieces(), Some(vec![]), &sky.knots());
    let w = grid.weights(|l| sky_hemispherical(sky, l, ambient_k));
    broadband(&grid, &w, ambient_k)
}

/// Downwelling flux over sigma T_a^4 (dimensionless) for the sky's hemispherical emissivity
/// `w` on `grid`, at ambient `ambient_k` [K], the rest open to space at 3 K.
fn broadband(grid: &Grid, w: &Weights, ambient_k: f64) -> f64 {
    let space = w.combine(w, |v, _| 1.0 - v);
    let down = grid.against_blackbody(w, ambient_k) + grid.against_blackbody(&space, SPACE_TEMPERATURE_K);
    let sigma_t4 = stefan_boltzmann(ambient_k);
    if sigma_t4 > 0.0 {
        (down / sigma_t4).clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// Hemispherical emissivity of the sky (dimensionless) at wavelength `lambda_m` [m] with air
/// at `ambient_k` [K], 2 integral_0^1 eps_sky mu dmu.
pub fn sky_hemispherical(sky: &Sky, lambda_m: f64, ambient_k: f64) -> f64 {
    sky_and_share(&AngularModel::Lambertian, 1.0, sky.along(lambda_m, ambient_k)).0
}

impl Balance {
    /// Prepare the balance of `emitter` in `surroundings`.
    pub fn new(emitter: &Emitter, surroundings: &Surroundings) -> Balance {
        let ta = surroundings.ambient_k;
        let sky = &surroundings.sky;
        let mut knots = emitter.knots();
        knots.extend(sky.knots());
        let (grid, method) = grid_for(emitter.constant_pieces(), sky.constant_pieces(), &knots);
        let emit = grid.weights(|l| emitter.hemispherical(l));
        // absorbed from the atmosphere (at T_a) and from space (at 3 K) through the rest
        // (the sky is read once per wavelength; its own hemispherical emissivity comes along
        // for the broadband figure)
        let mut sky_alone = Vec::with_capacity(grid.bands.len() + grid.nodes.len());
        let absorbed_sky = grid.weights(|l| {
            let (alone, share) = emitter.sky_share(l, sky.along(l, ta));
            sky_alone.push(alone);
            share
        });
        let sky_alone = Weights::from_samples(sky_alone, grid.bands.len());
        let through = emit.combine(&absorbed_sky, |e, s| (e - s).max(0.0));
        let sky_absorbed =
            grid.against_blackbody(&absorbed_sky, ta) + grid.against_blackbody(&through, SPACE_TEMPERATURE_K);
        let sun_absorbed = match &surroundings.sun {
            Some(sun) => sun.absorbed(|l, mu| emitter.directional(l, mu), &emitter.knots()),
            None => 0.0,
        };
        let h_c = if surroundings.h_c.is_nan() { 0.0 } else { surroundings.h_c.max(0.0) };
        let sky_emissivity = broadband(&grid, &sky_alone, ta);
        Balance {
            grid,
            emit,
            sky_absorbed: finite(sky_absorbed),
            sun_absorbed: finite(sun_absorbed),
            sky_emissivity,
            ambient_k: ta,
            h_c,
            method,
        }
    }

    /// P_rad(T) [W m^-2] at surface temperature `temp_k` [K] (Raman et al. 2014, eq. 1).
    pub fn emitted(&self, temp_k: f64) -> f64 {
        self.grid.against_blackbody(&self.emit, temp_k)
    }

    /// P_sky [W m^-2].
    pub fn sky_absorbed(&self) -> f64 {
        self.sky_absorbed
    }

    /// P_sun [W m^-2].
    pub fn sun_absorbed(&self) -> f64 {
        self.sun_absorbed
    }

    /// The sky's broadband emissivity, downwelling flux / (sigma T_a^4) (dimensionless).
    pub fn sky_emissivity(&self) -> f64 {
        self.sky_emissivity
    }

    /// Ambient air temperature [K].
    pub fn ambient_k(&self) -> f64 {
        self.ambient_k
    }

    /// How the spectral integrals were done.
    pub fn method(&self) -> Method {
        self.method
    }

    /// All terms at surface temperature `temp_k` [K].
    pub fn parts(&self, temp_k: f64) -> Parts {
        let emitted = self.emitted(temp_k);
        let parasitic = finite(self.h_c * (self.ambient_k - temp_k));
        let net = finite(emitted - self.sky_absorbed - self.sun_absorbed - parasitic);
        Parts { temp_k, emitted, sky_absorbed: self.sky_absorbed, sun_absorbed: self.sun_absorbed, parasitic, net }
    }

    /// P_net(T) [W m^-2] at surface temperature `temp_k` [K] (Raman et al. 2014, eq. 1).
    pub fn net(&self, temp_k: f64) -> f64 {
        self.parts(temp_k).net
    }

    /// The balance at each temperature of `temps_k` [K]: the P_net(T) curve.
    pub fn curve(&self, temps_k: &[f64]) -> Vec<Parts> {
        temps_k.iter().map(|&t| self.parts(t)).collect()
    }

    /// The steady temperature [K] in [`STEADY_SEARCH_K`].
    pub fn steady(&self) -> Steady {
        self.steady_between(STEADY_SEARCH_K.0, STEADY_SEARCH_K.1)
    }

    /// The temperature in [lo, hi] [K] where P_net = 0, to 1e-9 relative: bisection kept
    /// inside the bracket, sped up by false-position steps (the Illinois variant, Dowell &
    /// Jarratt, BIT 11, 168, 1971).
    pub fn steady_between(&self, lo: f64, hi: f64) -> Steady {
        let exchanges = self.h_c > 0.0 || self.emit.bands.iter().chain(&self.emit.nodes).any(|v| *v > 0.0);
        if !exchanges {
            return Steady::Undefined;
        }
        let (mut a, mut b) = (lo.min(hi), hi.max(lo));
        let (mut fa, mut fb) = (self.net(a), self.net(b));
        let only_background = self.sky_absorbed == 0.0 && self.sun_absorbed == 0.0 && self.h_c == 0.0;
        if fa == 0.0 && only_background && (a..=b).contains(&SPACE_TEMPERATURE_K) {
            // Nothing but the space background reaches the emitter in its bands (the 3 K
            // radiation it absorbs underflows to 0, as its own emission does near 3 K): P_net
            // is flat at 0 at the bottom of the range, and by detailed balance a body that
            // sees only the background comes to the background's temperature.
            return Steady::At(SPACE_TEMPERATURE_K);
        }
        if fa >= 0.0 {
            return if fa == 0.0 { Steady::At(a) } else { Steady::BelowRange(a) };
        }
        if fb <= 0.0 {
            return if fb == 0.0 { Steady::At(b) } else { Steady::AboveRange(b) };
        }
        let mut side = 0i8;
        for i in 0..200 {
            // alternate false position (Illinois) with plain bisection every fourth step
            let c = if i % 4 == 3 { 0.5 * (a + b) } else { (a * fb - b * fa) / (fb - fa) };
            let c = if c > a && c < b { c } else { 0.5 * (a + b) };
            let fc = self.net(c);
            if fc == 0.0 || (b - a) < 1e-9 * c {
                return Steady::At(c);
            }
            if fc < 0.0 {
                a = c;
                fa = fc;
                if side == -1 {
                    fb *= 0.5;
                }
                side = -1;
            } else {
                b = c;
                fb = fc;
                if side == 1 {
                    fa *= 0.5;
                }
                side = 1;
            }
        }
        Steady::At(0.5 * (a + b))
    }
}

/// `v` with NaN as 0 and infinities as +-f64::MAX (unit unchanged).
fn finite(v: f64) -> f64 {
    if v.is_nan() {
        0.0
    } else {
        v.clamp(-f64::MAX, f64::MAX)
    }
}
