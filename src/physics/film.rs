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

/// One layer: its complex index (k >= 0 absorbs), thickness [m], and whether it is taken
/// as incoherent (a thick sheet whose fringes average out; see [`COHERENCE_LIMIT_M`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Layer {
    pub index: Complex,
    pub thickness_m: f64,
    pub incoherent: bool,
}

impl Layer {
    /// A coherent layer of index `index` and thickness `thickness_m` [m].
    pub fn new(index: Complex, thickness_m: f64) -> Layer {
        Layer { index, thickness_m, incoherent: false }
    }
}

/// Layers thicker than this [m] are treated incoherently unless the user says otherwise:
/// 10 um of n = 1.5 puts the fringes lambda / (2 n d) = 1/60 of the wavelength apart at
/// 0.5 um (Delta lambda / lambda = lambda / (2 n d), from the phase 4 pi n d / lambda), finer
/// than the bandwidth of usual spectrophotometer data, so what is measured is their average;
/// thinner layers (interference coatings) keep their fringes. A stated rule of thumb (common
/// practice, no single source); mark a layer `:coherent` or `:incoherent` to override it.
pub const COHERENCE_LIMIT_M: f64 = 10e-6;

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

impl Response {
    fn from_rt(r: f64, t: f64) -> Response {
        let clean = |x: f64| if x.is_finite() { x.clamp(0.0, 1.0) } else { 0.0 };
        let (r, t) = (clean(r), clean(t));
        let t = t.min(1.0 - r);
        Response { reflectance: r, transmittance: t, absorptance: (1.0 - r - t).max(0.0) }
    }

    /// R and T each clamped to [0, 1] but not to R + T <= 1: seen from inside a lossy sheet
    /// the split into incident and reflected power is approximate, and the sum may exceed 1
    /// by O(k/n) there; the cascade of [`pair`] needs the values as they are.
    fn raw(r: f64, t: f64) -> Response {
        let clean = |x: f64| if x.is_finite() { x.clamp(0.0, 1.0) } else { 0.0 };
        let (r, t) = (clean(r), clean(t));
        Response { reflectance: r, transmittance: t, absorptance: (1.0 - r - t).max(0.0) }
    }

    /// The mean of two responses (unpolarized light from s and p).
    pub fn mean(a: Response, b: Response) -> Response {
        Response::from_rt(0.5 * (a.reflectance + b.reflectance), 0.5 * (a.transmittance + b.transmittance))
    }
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

/// The tilted admittances (s, p) of a medium of index `n` with kz = `k`: eta_s = N cos =
/// kz, eta_p = N / cos = N^2 / kz (in units of the free-space admittance).
fn admittances(n: Complex, k: Complex) -> (Complex, Complex) {
    let p = if k.norm_sqr() > 0.0 { n * n / k } else { Complex::new(f64::MAX, 0.0) };
    (k, p)
}

/// The field vector [B, C] at one interface with its scale: the true vector is
/// (b, c) * e^log_scale (kept so that stacks of opaque layers stay finite).
#[derive(Clone, Copy)]
struct Field {
    b: Complex,
    c: Complex,
    log_scale: f64,
}

impl Field {
    fn renormalized(mut self) -> Field {
        let m = self.b.norm_sqr().max(self.c.norm_sqr());
        if m > 1e200 || (m < 1e-200 && m > 0.0) {
            let f = m.sqrt();
            self.b = self.b.scale(1.0 / f);
            self.c = self.c.scale(1.0 / f);
            self.log_scale += f.ln();
        }
        self
    }
}

/// The coherent responses (s, p) of `layers` (all taken coherent) between an incident
/// medium of index `n_in` and `substrate`, with Snell's invariant `s_inv` = n0 sin(theta0),
/// at vacuum wavelength `lambda_m` [m]; when `per_layer` is given, each layer's share of the
/// absorbed power (s, p) is written there.
///
/// The characteristic-matrix form (Macleod, Thin-Film Optical Filters, ch. 2): with
/// delta_j = 2 pi kz_j d_j / lambda and tilted admittances eta_j,
///   [B; C] = prod_j [[cos delta_j, -i sin delta_j / eta_j], [-i eta_j sin delta_j,
///   cos delta_j]] [1; eta_sub]
/// (the signs of the e^(-i omega t), N = n + ik convention); then
///   R = |(eta_0 B - C) / (eta_0 B + C)|^2,  T = 4 Re(eta_0) Re(eta_sub) / |eta_0 B + C|^2,
/// and the power crossing the top of layer j is 4 Re(eta_0) Re(B_j conj(C_j)) /
/// |eta_0 B + C|^2 (the same ratio one interface down), so each layer absorbs the
/// difference between the flux at its top and at its bottom. For a lossless incident
/// medium this is the exact transfer-matrix result (checked against the tmm library to
/// 1e-12); for a lossy one (a thick absorbing sheet seen from inside, in the incoherent
/// cascade) it is the usual approximation that splits the fields as if it were lossless.
fn coherent_pair(
    n_in: Complex,
    s_inv: f64,
    layers: &[Layer],
    substrate: Complex,
    lambda_m: f64,
    per_layer: Option<&mut Vec<(f64, f64)>>,
) -> (Response, Response) {
    let k_sub = kz(substrate, s_inv);
    let (eta_sub_s, eta_sub_p) = admittances(substrate, k_sub);
    let mut fs = Field { b: Complex::ONE, c: eta_sub_s, log_scale: 0.0 };
    let mut fp = Field { b: Complex::ONE, c: eta_sub_p, log_scale: 0.0 };
    let mut fluxes: Vec<(Field, Field)> = Vec::new();
    let keep = per_layer.is_some();
    if keep {
        fluxes.push((fs, fp));
    }
    for l in layers.iter().rev() {
        let k = kz(l.index, s_inv);
        let (eta_s, eta_p) = admittances(l.index, k);
        let delta = k.scale(2.0 * PI * l.thickness_m.max(0.0) / lambda_m);
        let delta = Complex::new(delta.re, delta.im.min(OPACITY_CAP));
        // e^(i delta) and e^(-i delta); cos = (e+ + e-) / 2, -i sin = (e- - e+) / 2
        let e_plus = (Complex::new(0.0, 1.0) * delta).exp();
        // e^(-i delta) = 1 / e^(i delta): |e+| >= e^-35 after the cap, so no overflow
        let e_minus = Complex::ONE / e_plus;
        let cos = (e_plus + e_minus).scale(0.5);
        let misin = (e_minus - e_plus).scale(0.5);
        let step = |f: Field, eta: Complex| {
            Field { b: cos * f.b + misin / eta * f.c, c: misin * eta * f.b + cos * f.c, log_scale: f.log_scale }
                .renormalized()
        };
        fs = step(fs, eta_s);
        fp = step(fp, eta_p);
        if keep {
            fluxes.push((fs, fp));
        }
    }
    let k0 = kz(n_in, s_inv);
    let (eta0_s, eta0_p) = admittances(n_in, k0);
    let finish = |f: Field, eta0: Complex, eta_sub: Complex| {
        let y = eta0 * f.b + f.c;
        let r = (eta0 * f.b - f.c) / y;
        let scale = (-2.0 * f.log_scale).exp();
        let t = 4.0 * eta0.re * eta_sub.re.max(0.0) / y.norm_sqr() * scale;
        (Response::raw(r.norm_sqr(), t), y, f.log_scale)
    };
    let (rs, ys, ls) = finish(fs, eta0_s, eta_sub_s);
    let (rp, yp, lp) = finish(fp, eta0_p, eta_sub_p);
    if let Some(out) = per_layer {
        out.clear();
        // fluxes[0] is at the substrate, fluxes[len] at the top of the first layer
        let flux = |f: &Field, eta0: Complex, y: Complex, top: f64| {
            let v = 4.0 * eta0.re * (f.b * f.c.conj()).re / y.norm_sqr() * (2.0 * (f.log_scale - top)).exp();
            if v.is_finite() {
                v
            } else {
                0.0
            }
        };
        let n = layers.len();
        for j in 0..n {
            let (top, bottom) = (&fluxes[n - j], &fluxes[n - j - 1]);
            let a_s = flux(&top.0, eta0_s, ys, ls) - flux(&bottom.0, eta0_s, ys, ls);
            let a_p = flux(&top.1, eta0_p, yp, lp) - flux(&bottom.1, eta0_p, yp, lp);
            out.push((a_s.max(0.0), a_p.max(0.0)));
        }
    }
    (rs, rp)
}

/// The responses (s, p) of a stack in which some layers may be incoherent, from the
/// lossless incident medium `n0` at angle `theta0` [rad] and wavelength `lambda_m` [m].
///
/// Incoherent layers split the stack into coherent groups. Each group between two thick
/// media is solved coherently from both sides; the thick layer between groups passes the
/// intensity fraction P = exp(-4 pi Im(kz) d / lambda) per crossing; and the groups combine
/// by adding intensities over all round trips (the net-radiation, or intensity-matrix,
/// method: e.g. Centurioni, Appl. Opt. 44, 7532 (2005); Byrnes, arXiv:1603.02720, sec. 5):
///   R = R_a + T_a T_a' P^2 R_b / (1 - R_a' R_b P^2),   T = T_a P T_b / (1 - R_a' R_b P^2),
/// with primes for light met from the back. A 1 mm glass sheet thus reflects
/// 2 R_1 / (1 + R_1) when lossless (tested), as in a spectrophotometer.
fn pair(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64, theta0: f64) -> (Response, Response) {
    if !(n0 > 0.0 && lambda_m > 0.0 && lambda_m.is_finite() && theta0.is_finite()) {
        return (Response::default(), Response::default());
    }
    let s_inv = n0 * theta0.sin();
    let n_in = Complex::real(n0);
    if !layers.iter().any(|l| l.incoherent) {
        let (s, p) = coherent_pair(n_in, s_inv, layers, substrate, lambda_m, None);
        return (Response::from_rt(s.reflectance, s.transmittance), Response::from_rt(p.reflectance, p.transmittance));
    }
    // thick media: the incident medium, each incoherent layer, the substrate
    let mut thick: Vec<(Complex, f64)> = vec![(n_in, 0.0)];
    let mut groups: Vec<Vec<Layer>> = vec![Vec::new()];
    for l in layers {
        if l.incoherent {
            thick.push((l.index, l.thickness_m.max(0.0)));
            groups.push(Vec::new());
        } else if let Some(g) = groups.last_mut() {
            g.push(*l);
        }
    }
    thick.push((substrate, 0.0));
    let both = |from: Complex, group: &[Layer], to: Complex| {
        let forward = coherent_pair(from, s_inv, group, to, lambda_m, None);
        let reversed: Vec<Layer> = group.iter().rev().copied().collect();
        let back = coherent_pair(to, s_inv, &reversed, from, lambda_m, None);
        (forward, back)
    };
    let combine = |pol: usize| {
        let pick = |x: (Response, Response)| if pol == 0 { x.0 } else { x.1 };
        let (f, b) = both(thick[0].0, &groups[0], thick[1].0);
        let (f, b) = (pick(f), pick(b));
        let (mut r, mut t, mut rb, mut tb) = (f.reflectance, f.transmittance, b.reflectance, b.transmittance);
        for i in 1..thick.len() - 1 {
            let (n, d) = thick[i];
            let k = kz(n, s_inv);
            let p = (-4.0 * PI * k.im.max(0.0) * d / lambda_m).exp();
            let (f, b) = both(n, &groups[i], thick[i + 1].0);
            let (f, b) = (pick(f), pick(b));
            let denom = 1.0 - rb * f.reflectance * p * p;
            let denom = if denom > 1e-300 { denom } else { 1e-300 };
            let r_new = r + t * tb * p * p * f.reflectance / denom;
            let t_new = t * p * f.transmittance / denom;
            let rb_new = b.reflectance + b.transmittance * f.transmittance * p * p * rb / denom;
            let tb_new = b.transmittance * p * tb / denom;
            (r, t, rb, tb) = (r_new, t_new, rb_new, tb_new);
        }
        Response::from_rt(r, t)
    };
    (combine(0), combine(1))
}

/// The response of `layers` between the lossless incident medium of index `n0` and the
/// substrate `substrate`, at vacuum wavelength `lambda_m` [m] and angle `theta0` [rad]
/// (0 <= theta0 < pi/2) in the incident medium, for polarization `pol`. Layers marked
/// incoherent are treated so (see [`pair`]); with none, this is the coherent
/// transfer-matrix result.
pub fn coherent(
    n0: f64,
    layers: &[Layer],
    substrate: Complex,
    lambda_m: f64,
    theta0: f64,
    pol: Polarization,
) -> Response {
    let (s, p) = pair(n0, layers, substrate, lambda_m, theta0);
    match pol {
        Polarization::S => s,
        Polarization::P => p,
    }
}

/// The mean of the s and p responses (unpolarized light).
pub fn coherent_mean(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64, theta0: f64) -> Response {
    let (s, p) = pair(n0, layers, substrate, lambda_m, theta0);
    Response::mean(s, p)
}

/// Each layer's absorptance (fraction of the incident power, unpolarized: the mean of s and
/// p) for an all-coherent stack, from the flux at its top and bottom (see
/// [`coherent_pair`]); they sum to the stack's absorptance. Incoherent marks are ignored
/// here (the whole stack is taken coherent).
pub fn layer_absorptance(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64, theta0: f64) -> Vec<f64> {
    if !(n0 > 0.0 && lambda_m > 0.0 && lambda_m.is_finite() && theta0.is_finite()) {
        return vec![0.0; layers.len()];
    }
    let mut out = Vec::with_capacity(layers.len());
    coherent_pair(Complex::real(n0), n0 * theta0.sin(), layers, substrate, lambda_m, Some(&mut out));
    out.into_iter().map(|(a, b)| 0.5 * (a + b)).collect()
}

/// The stack's emissivity toward angle `theta0` [rad] (unpolarized, fraction 0-1), by
/// Kirchhoff's law equal to its absorptance for light arriving from there: 1 - R - T over a
/// lossless substrate (what enters it is carried away, and nothing comes back out of it),
/// and 1 - R over an absorbing one (it takes in what enters and, at the same temperature,
/// emits it back out).
pub fn emissivity(n0: f64, layers: &[Layer], substrate: Complex, lambda_m: f64, theta0: f64) -> f64 {
    let r = coherent_mean(n0, layers, substrate, lambda_m, theta0);
    if substrate.im > 0.0 {
        1.0 - r.reflectance
    } else {
        r.absorptance
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
    Response::from_rt(r, t)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn layer(n: f64, k: f64, d_nm: f64) -> Layer {
        Layer::new(Complex::new(n, k), d_nm * 1e-9)
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
    fn transmittance_is_reciprocal_and_absorption_is_not() {
        // Reciprocity (e.g. Born & Wolf, Principles of Optics, on Stokes' relations; for
        // absorbing stacks Macleod, Thin-Film Optical Filters, ch. 2): between equal media a
        // stack transmits the same from either side at the same angle, even when it absorbs;
        // its reflectance (and so its absorptance) may differ between the two sides.
        let l = [layer(2.0, 0.1, 120.0), layer(1.46, 0.0, 200.0), layer(3.5, 0.5, 30.0)];
        let rev: Vec<Layer> = l.iter().rev().copied().collect();
        let mut r_differs = false;
        for deg in [0.0, 25.0, 55.0, 80.0] {
            for pol in [Polarization::S, Polarization::P] {
                let th = f64::to_radians(deg);
                let a = coherent(1.5, &l, Complex::real(1.5), 600e-9, th, pol);
                let b = coherent(1.5, &rev, Complex::real(1.5), 600e-9, th, pol);
                assert!((a.transmittance - b.transmittance).abs() < 1e-14, "{deg} {pol:?}: {a:?} {b:?}");
                r_differs |= (a.reflectance - b.reflectance).abs() > 1e-3;
            }
        }
        assert!(r_differs);
        // and the per-layer shares add up to the stack's absorptance
        let parts = layer_absorptance(1.0, &l, Complex::real(1.5), 600e-9, 0.7);
        let total = coherent_mean(1.0, &l, Complex::real(1.5), 600e-9, 0.7).absorptance;
        assert!((parts.iter().sum::<f64>() - total).abs() < 1e-14);
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
