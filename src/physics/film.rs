//! Thin-film optics: the transfer-matrix method for a stack of homogeneous, isotropic layers
//! between a lossless incident medium and a semi-infinite substrate, at any angle, for s and
//! p polarization, with absorbing media (Born & Wolf, Principles of Optics, ch. 1.6; Byrnes,
//! arXiv:1603.02720, for a clear account with absorbing layers).
//!
//! Conventions: the complex index is N = n + i k with k >= 0 for absorption; layers are
//! listed from the side the light comes from; angles are in the incident medium. Snell's
//! invariant n0 sin(theta0) fixes, in every medium j, kz_j = N_j cos(theta_j) =
//! sqrt(N_j^2 - n0^2 sin^2 theta0), taken on the branch with Im >= 0 (the wave decays
//! forward in a lossy medium; beyond the critical angle the substrate's wave is evanescent)
//! and Re >= 0 when Im = 0. Fresnel coefficients at the interface j -> k:
//!
//!   s: r = (kz_j - kz_k) / (kz_j + kz_k),                       t = 2 kz_j / (kz_j + kz_k)
//!   p: r = (N_k^2 kz_j - N_j^2 kz_k) / (N_k^2 kz_j + N_j^2 kz_k), t = 2 N_j N_k kz_j / (same)
//!
//! and each layer of thickness d the phase delta_j = 2 pi kz_j d / lambda. The stack's
//! matrix is (1/t_01) [[1, r_01], [r_01, 1]] times, for each layer, diag(e^(-i delta),
//! e^(i delta)) (1/t_j,j+1) [[1, r], [r, 1]]; r = M_10 / M_00, t = 1 / M_00 (Byrnes eqs. 6-12).
//! (The p coefficients are Byrnes' r = (N_k cos_j - N_j cos_k) / (N_k cos_j + N_j cos_k),
//! t = 2 N_j cos_j / (same), multiplied through by N_j N_k.) R = |r|^2; the power that enters
//! the substrate T = |t|^2 Re(kz_sub) / Re(kz_0) for s and |t|^2 Re(N_sub conj(cos_sub)) /
//! Re(n0 conj(cos_0)) for p (Byrnes eqs. 21-22); the layers absorb A = 1 - R - T. A layer whose single-pass
//! attenuation exceeds e^-35 (Im delta > 35) is capped there, as Byrnes does: what crosses it
//! is below 1e-30 and the matrix stays finite.
//!
//! Architecture invariant: pure functions of SI numbers, no NaN for any finite input.

use std::f64::consts::PI;
use std::ops::{Add, Div, Mul, Neg, Sub};

/// A complex number (the crate's own, a few operations only).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Complex {
    pub re: f64,
    pub im: f64,
}

impl Complex {
    pub const ONE: Complex = Complex { re: 1.0, im: 0.0 };
    pub const ZERO: Complex = Complex { re: 0.0, im: 0.0 };

    pub fn new(re: f64, im: f64) -> Complex {
        Complex { re, im }
    }

    pub fn real(re: f64) -> Complex {
        Complex { re, im: 0.0 }
    }

    pub fn conj(self) -> Complex {
        Complex { re: self.re, im: -self.im }
    }

    pub fn norm_sqr(self) -> f64 {
        self.re * self.re + self.im * self.im
    }

    /// The principal square root (Re >= 0), without overflow for large parts.
    pub fn sqrt(self) -> Complex {
        let m = self.re.hypot(self.im);
        if m == 0.0 {
            return Complex::ZERO;
        }
        let re = (0.5 * (m + self.re.abs())).sqrt();
        let other = 0.5 * self.im / re;
        if self.re >= 0.0 {
            Complex { re, im: other }
        } else {
            Complex { re: other.abs(), im: if self.im >= 0.0 { re } else { -re } }
        }
    }

    /// e^z.
    pub fn exp(self) -> Complex {
        let m = self.re.exp();
        Complex { re: m * self.im.cos(), im: m * self.im.sin() }
    }

    fn scale(self, s: f64) -> Complex {
        Complex { re: self.re * s, im: self.im * s }
    }
}

impl Add for Complex {
    type Output = Complex;
    fn add(self, o: Complex) -> Complex {
        Complex { re: self.re + o.re, im: self.im + o.im }
    }
}

impl Sub for Complex {
    type Output = Complex;
    fn sub(self, o: Complex) -> Complex {
        Complex { re: self.re - o.re, im: self.im - o.im }
    }
}

impl Mul for Complex {
    type Output = Complex;
    fn mul(self, o: Complex) -> Complex {
        Complex { re: self.re * o.re - self.im * o.im, im: self.re * o.im + self.im * o.re }
    }
}

impl Div for Complex {
    type Output = Complex;
    /// Smith's algorithm (no overflow of the squared denominator).
    fn div(self, o: Complex) -> Complex {
        if o.re.abs() >= o.im.abs() {
            if o.re == 0.0 {
                return Complex { re: f64::INFINITY, im: 0.0 };
            }
            let r = o.im / o.re;
            let d = o.re + o.im * r;
            Complex { re: (self.re + self.im * r) / d, im: (self.im - self.re * r) / d }
        } else {
            let r = o.re / o.im;
            let d = o.re * r + o.im;
            Complex { re: (self.re * r + self.im) / d, im: (self.im * r - self.re) / d }
        }
    }
}

impl Neg for Complex {
    type Output = Complex;
    fn neg(self) -> Complex {
        Complex { re: -self.re, im: -self.im }
    }
}

/// One layer: its complex index (k >= 0 absorbs) and thickness [m].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Layer {
    pub index: Complex,
    pub thickness_m: f64,
}

/// Polarization of the incident light.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Polarization {
    /// electric field perpendicular to the plane of incidence (TE)
    S,
    /// electric field in the plane of incidence (TM)
    P,
}

/// Reflectance, transmittance into the substrate and the layers' absorptance (fractions).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Response {
    pub reflectance: f64,
    pub transmittance: f64,
    pub absorptance: f64,
}

/// Largest single-pass attenuation exponent kept in a layer (Byrnes' cap).
const OPACITY_CAP: f64 = 35.0;

/// kz = N cos(theta) = sqrt(N^2 - s^2), s = n0 sin(theta0), on the forward branch.
fn kz(n: Complex, s: f64) -> Complex {
    let mut k = (n * n - Complex::real(s * s)).sqrt();
    if k.im < 0.0 || (k.im == 0.0 && k.re < 0.0) {
        k = -k;
    }
    k
}

/// Fresnel (r, t) from medium (n_j, kz_j) to (n_k, kz_k).
fn fresnel(pol: Polarization, nj: Complex, kj: Complex, nk: Complex, kk: Complex) -> (Complex, Complex) {
    match pol {
        Polarization::S => {
            let d = kj + kk;
            ((kj - kk) / d, kj.scale(2.0) / d)
        }
        Polarization::P => {
            let a = nk * nk * kj;
            let b = nj * nj * kk;
            let d = a + b;
            ((a - b) / d, (nj * nk * kj).scale(2.0) / d)
        }
    }
}

type M2 = [[Complex; 2]; 2];

fn mat_mul(a: &M2, b: &M2) -> M2 {
    [
        [a[0][0] * b[0][0] + a[0][1] * b[1][0], a[0][0] * b[0][1] + a[0][1] * b[1][1]],
        [a[1][0] * b[0][0] + a[1][1] * b[1][0], a[1][0] * b[0][1] + a[1][1] * b[1][1]],
    ]
}

/// The coherent response of `layers` between the lossless incident medium of index `n0`
/// and the substrate `substrate`, at vacuum wavelength `lambda_m` [m] and angle `theta0`
/// [rad] (0 <= theta0 < pi/2) in the incident medium, for polarization `pol`.
pub fn coherent(
    n0: f64,
    layers: &[Layer],
    substrate: Complex,
    lambda_m: f64,
    theta0: f64,
    pol: Polarization,
) -> Response {
    if !(n0 > 0.0 && lambda_m > 0.0 && lambda_m.is_finite() && theta0.is_finite()) {
        return Response::default();
    }
    let s = n0 * theta0.sin();
    let n_in = Complex::real(n0);
    let k_in = kz(n_in, s);
    let (mut n_prev, mut k_prev) = (n_in, k_in);
    let mut m: M2 = [[Complex::ONE, Complex::ZERO], [Complex::ZERO, Complex::ONE]];
    let mut first = true;
    let mut pending_phase: Option<Complex> = None;
    let media = layers.iter().map(|l| (l.index, l.thickness_m.max(0.0))).chain(std::iter::once((substrate, 0.0)));
    for (idx, (n, d)) in media.enumerate() {
        let k = kz(n, s);
        // propagate through the previous layer
        if let Some(delta) = pending_phase.take() {
            let delta = Complex::new(delta.re, delta.im.min(OPACITY_CAP));
            let e_minus = (Complex::new(0.0, -1.0) * delta).exp();
            let e_plus = (Complex::new(0.0, 1.0) * delta).exp();
            m = mat_mul(&m, &[[e_minus, Complex::ZERO], [Complex::ZERO, e_plus]]);
        }
        let (r, t) = fresnel(pol, n_prev, k_prev, n, k);
        let inv_t = Complex::ONE / t;
        let interface = [[inv_t, r * inv_t], [r * inv_t, inv_t]];
        m = if first { interface } else { mat_mul(&m, &interface) };
        first = false;
        if idx < layers.len() {
            pending_phase = Some(k.scale(2.0 * PI * d / lambda_m));
        }
        n_prev = n;
        k_prev = k;
    }
    let r = m[1][0] / m[0][0];
    let t = Complex::ONE / m[0][0];
    let reflectance = r.norm_sqr();
    let transmittance = match pol {
        Polarization::S => t.norm_sqr() * k_prev.re / k_in.re,
        Polarization::P => {
            let cos_sub = k_prev / n_prev;
            let cos_in = k_in / n_in;
            t.norm_sqr() * (n_prev * cos_sub.conj()).re / (n_in * cos_in.conj()).re
        }
    };
    let clean = |x: f64| if x.is_finite() { x.clamp(0.0, 1.0) } else { 0.0 };
    let reflectance = clean(reflectance);
    let transmittance = clean(transmittance);
    Response { reflectance, transmittance, absorptance: (1.0 - reflectance - transmittance).max(0.0) }
}

/// The mean of the s and p responses (unpolarized light).
pub fn coherent_mean(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64, theta0: f64) -> Response {
    let a = coherent(n0, layers, substrate, lambda_m, theta0, Polarization::S);
    let b = coherent(n0, layers, substrate, lambda_m, theta0, Polarization::P);
    Response {
        reflectance: 0.5 * (a.reflectance + b.reflectance),
        transmittance: 0.5 * (a.transmittance + b.transmittance),
        absorptance: 0.5 * (a.absorptance + b.absorptance),
    }
}

/// Points of the angular rule of [`hemispherical`].
pub const HEMISPHERICAL_POINTS: usize = 96;

/// Hemispherical (cos-weighted, polarization-averaged) values:
/// X_h = 2 int_0^(pi/2) X(theta) cos(theta) sin(theta) dtheta = int_0^1 X 2c dc with
/// c = cos(theta), by the [`HEMISPHERICAL_POINTS`]-point Gauss-Legendre rule in c (X is smooth
/// in c away from a critical angle; for a smooth dielectric it meets the closed form to
/// 2e-16, tests/film_reference.rs).
pub fn hemispherical(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64) -> Response {
    use std::sync::OnceLock;
    static RULE: OnceLock<super::radiator::quadrature::GaussRule> = OnceLock::new();
    let rule = RULE.get_or_init(|| super::radiator::quadrature::GaussRule::new(HEMISPHERICAL_POINTS));
    let (mut r, mut t) = (0.0, 0.0);
    for (c, w) in rule.on(0.0, 1.0) {
        let x = coherent_mean(n0, layers, substrate, lambda_m, c.clamp(0.0, 1.0).acos());
        r += w * 2.0 * c * x.reflectance;
        t += w * 2.0 * c * x.transmittance;
    }
    let (r, t) = (r.clamp(0.0, 1.0), t.clamp(0.0, 1.0));
    Response { reflectance: r, transmittance: t, absorptance: (1.0 - r - t).max(0.0) }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn layer(n: f64, k: f64, d_nm: f64) -> Layer {
        Layer { index: Complex::new(n, k), thickness_m: d_nm * 1e-9 }
    }

    #[test]
    fn quarter_wave_layer_matches_its_closed_form() {
        // Macleod, Thin-Film Optical Filters: a quarter-wave layer n1 on ns at its design
        // wavelength, normal incidence: R = ((n0 ns - n1^2) / (n0 ns + n1^2))^2
        let (n1, ns) = (1.38, 1.52);
        let l = [layer(n1, 0.0, 550.0 / (4.0 * n1))];
        let r = coherent(1.0, &l, Complex::real(ns), 550e-9, 0.0, Polarization::S).reflectance;
        let want = ((ns - n1 * n1) / (ns + n1 * n1)).powi(2);
        assert!((r - want).abs() < 1e-15, "{r} {want}");
        // a half-wave layer leaves the bare substrate's reflectance (absentee layer)
        let l = [layer(n1, 0.0, 550.0 / (2.0 * n1))];
        let r = coherent(1.0, &l, Complex::real(ns), 550e-9, 0.0, Polarization::P).reflectance;
        assert!((r - ((ns - 1.0) / (ns + 1.0)).powi(2)).abs() < 1e-15);
    }

    #[test]
    fn brewster_and_total_internal_reflection() {
        // Brewster's angle atan(n2/n1): R_p = 0 (Born & Wolf 1.5.3)
        let th = (1.5f64 / 1.0).atan();
        assert!(coherent(1.0, &[], Complex::real(1.5), 600e-9, th, Polarization::P).reflectance < 1e-28);
        // beyond the critical angle asin(1/1.5) = 41.81 deg: R = 1, T = 0
        for pol in [Polarization::S, Polarization::P] {
            let r = coherent(1.5, &[], Complex::real(1.0), 600e-9, 42f64.to_radians(), pol);
            assert!((r.reflectance - 1.0).abs() < 1e-14 && r.transmittance < 1e-14, "{r:?}");
        }
    }

    #[test]
    fn lossless_stacks_conserve_energy_and_lossy_ones_absorb() {
        let l = [layer(2.3, 0.0, 80.0), layer(1.46, 0.0, 190.0), layer(2.0, 0.0, 37.0)];
        for deg in [0.0, 20.0, 50.0, 80.0] {
            for pol in [Polarization::S, Polarization::P] {
                let r = coherent(1.0, &l, Complex::real(1.52), 700e-9, f64::to_radians(deg), pol);
                assert!((r.reflectance + r.transmittance - 1.0).abs() < 1e-13, "{deg} {pol:?} {r:?}");
            }
        }
        let l = [layer(0.05, 4.0, 200.0)]; // a thick silver-like layer: opaque, finite
        let r = coherent(1.0, &l, Complex::real(1.5), 500e-9, 0.3, Polarization::S);
        // single-pass intensity e^(-4 pi k d / lambda) = e^-20 at normal incidence
        assert!(r.transmittance < 1e-8 && r.reflectance > 0.9 && r.reflectance.is_finite(), "{r:?}");
        let thick = [layer(3.5, 2.0, 1e6)]; // 1 mm of a strong absorber: capped, no NaN
        let r = coherent(1.0, &thick, Complex::real(1.5), 500e-9, 0.0, Polarization::P);
        assert!(r.reflectance.is_finite() && r.transmittance < 1e-29, "{r:?}");
    }

    #[test]
    fn quarter_wave_mirror_matches_macleods_formula() {
        // (HL)^N H at its design wavelength, normal incidence (Macleod, Thin-Film Optical
        // Filters): R = ((1 - (nH/nL)^(2N) nH^2/ns) / (1 + (nH/nL)^(2N) nH^2/ns))^2, n0 = 1
        let (nh, nl, ns, lam) = (2.3, 1.38, 1.52, 600.0);
        let h = layer(nh, 0.0, lam / (4.0 * nh));
        let lo = layer(nl, 0.0, lam / (4.0 * nl));
        for n in 1..=6 {
            let mut st = Vec::new();
            for _ in 0..n {
                st.push(h);
                st.push(lo);
            }
            st.push(h);
            let y = (nh / nl).powi(2 * n) * nh * nh / ns;
            let want = ((1.0 - y) / (1.0 + y)).powi(2);
            let got = coherent(1.0, &st, Complex::real(ns), lam * 1e-9, 0.0, Polarization::S).reflectance;
            assert!((got - want).abs() < 1e-13, "N = {n}: {got} {want}");
        }
    }
}
