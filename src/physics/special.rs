//! Special functions behind the closed-form Planck integrals.
//!
//! * Polylogarithms Li_s(e^-a) for integer s from -1 to 4, in a scaled form that never
//!   overflows or underflows: `scaled_polylog(s, a) = e^a Li_s(e^-a)`.
//! * Bose-Einstein integrals G_n(x0, m) = integral_{x0}^inf x^n / (e^(x - m) - 1) dx, n = 2, 3,
//!   through the identity
//!   G_n(x0, m) = sum_{j=0..n} n!/(n-j)! x0^(n-j) Li_{j+1}(e^-(x0 - m)),
//!   which follows from expanding 1/(e^y - 1) = sum_k e^-ky and integrating term by term
//!   (see e.g. Abramowitz & Stegun 27.1 and Lewin, "Polylogarithms and associated functions",
//!   1981, ch. 7). For m = 0 it is the classical series for the blackbody radiation functions.
//! * The low part integral_0^x x^n / (e^x - 1) dx by its Bernoulli-number series
//!   (A&S 23.1.1: t / (e^t - 1) = sum B_k t^k / k!, |t| < 2 pi).
//! * The principal branch of the Lambert W function in the exponential form W(e^y).
//! * The exponential integral E_3(x), the angular integral of a slab's transmittance.

use std::f64::consts::PI;

/// Riemann zeta at 2, 3, 4 and 5 (A&S 23.2, tables 23.3), dimensionless.
/// zeta(2) = pi^2 / 6 (Euler).
pub const ZETA2: f64 = PI * PI / 6.0;
/// zeta(3), Apery's constant (A&S table 23.3).
pub const ZETA3: f64 = 1.202_056_903_159_594_3;
/// zeta(4) = pi^4 / 90 (Euler).
pub const ZETA4: f64 = PI * PI * PI * PI / 90.0;
/// zeta(5) (A&S table 23.3).
pub const ZETA5: f64 = 1.036_927_755_143_37; // zeta(5) = 1.0369277551433699..., the nearest f64

/// Bernoulli numbers B_0 .. B_30 (A&S table 23.2); odd ones past B_1 are zero.
const BERNOULLI: [f64; 31] = [
    1.0,
    -0.5,
    1.0 / 6.0,
    0.0,
    -1.0 / 30.0,
    0.0,
    1.0 / 42.0,
    0.0,
    -1.0 / 30.0,
    0.0,
    5.0 / 66.0,
    0.0,
    -691.0 / 2730.0,
    0.0,
    7.0 / 6.0,
    0.0,
    -3617.0 / 510.0,
    0.0,
    43867.0 / 798.0,
    0.0,
    -174611.0 / 330.0,
    0.0,
    854513.0 / 138.0,
    0.0,
    -236364091.0 / 2730.0,
    0.0,
    8553103.0 / 6.0,
    0.0,
    -23749461029.0 / 870.0,
    0.0,
    8615841276005.0 / 14322.0,
];

/// Riemann zeta at an integer argument s <= 5, s != 1. For s <= 0 it uses
/// zeta(-n) = (-1)^n B_(n+1) / (n + 1) (A&S 23.2.15), valid while B_(n+1) is tabulated.
fn zeta_int(s: i32) -> f64 {
    match s {
        5 => ZETA5,
        4 => ZETA4,
        3 => ZETA3,
        2 => ZETA2,
        0 => -0.5,
        s if s < 0 => {
            let n = (-s) as usize;
            if n + 1 >= BERNOULLI.len() {
                return 0.0; // past the table; the series below never reaches here for a < 1
            }
            let sign = if n % 2 == 0 { 1.0 } else { -1.0 };
            sign * BERNOULLI[n + 1] / (n as f64 + 1.0)
        }
        _ => f64::NAN, // zeta(1) is the pole; callers never ask for it
    }
}

/// Below this the logarithmic expansion of Li_s is used, above it the direct series.
const LOG_EXPANSION_LIMIT: f64 = 1.0;

/// e^a Li_s(e^-a) for s in {-1, 0, 1, 2, 3, 4} and a >= 0 (a = 0 only for s >= 2); `a` and
/// the result are dimensionless (in the Planck integrals a = (E - mu)/kT).
///
/// For large a this tends to 1 (Li_s(z) ~ z), so products with e^-a never overflow.
/// * s = -1, 0, 1 use the closed forms z/(1-z)^2, z/(1-z), -ln(1-z).
/// * s >= 2, a >= 1: the defining series sum_k z^(k-1) / k^s (ratio z <= 1/e).
/// * s >= 2, a < 1: the expansion about z = 1 in mu = ln z = -a (Lewin 1981, eq. 7.51;
///   also Wood, "The computation of polylogarithms", 1992, eq. 9.4):
///   Li_s(e^mu) = mu^(s-1)/(s-1)! [H_(s-1) - ln(-mu)] + sum_{k>=0, k != s-1} zeta(s-k) mu^k / k!
pub fn scaled_polylog(s: i32, a: f64) -> f64 {
    debug_assert!(a >= 0.0);
    match s {
        -1 => {
            let one_minus_z = -(-a).exp_m1();
            let z_scaled = 1.0; // e^a * z
            z_scaled / (one_minus_z * one_minus_z)
        }
        0 => 1.0 / (-(-a).exp_m1()),
        1 => {
            let z = (-a).exp();
            if z < 1e-8 {
                // -ln(1-z)/z = 1 + z/2 + z^2/3 + ...
                1.0 + z * (0.5 + z / 3.0)
            } else if z < 0.5 {
                // ln_1p keeps full relative precision while 1 - z is near 1
                -(-z).ln_1p() / z
            } else {
                // near a = 0, 1 - z = -expm1(-a) is exact where 1 - z would cancel
                -(-(-a).exp_m1()).ln() / z
            }
        }
        _ => {
            if a >= LOG_EXPANSION_LIMIT {
                polylog_series_scaled(s, a)
            } else {
                polylog_log_expansion(s, -a) * a.exp()
            }
        }
    }
}

/// sum_{k>=1} z^(k-1) / k^s with z = e^-a, a >= 1.
fn polylog_series_scaled(s: i32, a: f64) -> f64 {
    let z = (-a).exp();
    let mut sum = 1.0;
    let mut zk = 1.0;
    let mut k = 1.0_f64;
    loop {
        zk *= z;
        k += 1.0;
        let term = zk / k.powi(s);
        sum += term;
        if term < 1e-17 * sum {
            return sum;
        }
    }
}

/// Li_s(e^mu) for mu in (-1, 0], s >= 2.
fn polylog_log_expansion(s: i32, mu: f64) -> f64 {
    // harmonic number H_(s-1)
    let mut h = 0.0;
    for i in 1..s {
        h += 1.0 / i as f64;
    }
    let mut fact = 1.0; // k!
    let mut mu_k = 1.0; // mu^k
    let mut sum = 0.0;
    let mut small_in_a_row = 0;
    for k in 0..=30 {
        if k > 0 {
            fact *= k as f64;
            mu_k *= mu;
        }
        let term = if k == s - 1 {
            if mu == 0.0 {
                0.0
            } else {
                mu_k / fact * (h - (-mu).ln())
            }
        } else {
            zeta_int(s - k) * mu_k / fact
        };
        sum += term;
        // zeta vanishes at even negative integers, so wait for two small terms in a row
        if k > s && term.abs() <= 1e-17 * sum.abs() {
            small_in_a_row += 1;
            if small_in_a_row == 2 {
                break;
            }
        } else {
            small_in_a_row = 0;
        }
    }
    sum
}

/// The scaled pieces of a Bose-Einstein integral with chemical potential:
/// with a = x0 - m >= 0, G_n(x0, m) = e^-a * `value`, dG/dm = e^-a * `d1`,
/// d2G/dm2 = e^-a * `d2`, d3G/dm3 = e^-a * `d3`. Differentiating in m lowers the polylog
/// order by one: d/dm Li_s(e^(m - x0)) = Li_(s-1)(e^(m - x0)).
#[derive(Debug, Clone, Copy)]
pub struct ScaledBose {
    pub value: f64,
    pub d1: f64,
    pub d2: f64,
    pub d3: f64,
}

/// G_2 and its first three derivatives in m, scaled by e^a (see [`ScaledBose`]), from the
/// polylog identity of the module docs with n = 2. `x0` = E0/kT >= 0 and `a` = x0 - m > 0,
/// m = mu/kT, all dimensionless.
#[inline]
pub fn scaled_bose2(x0: f64, a: f64) -> ScaledBose {
    // 1 - z, and e^a Li_1(e^-a) = -ln(1 - z)/z, from one exponential; for a >= 1, z <= 1/e
    // so 1 - z has no cancellation, below that expm1 keeps 1 - z exact
    let (z, omz) = if a >= LOG_EXPANSION_LIMIT {
        let z = (-a).exp();
        (z, 1.0 - z)
    } else {
        let em1 = (-a).exp_m1();
        (1.0 + em1, -em1)
    };
    // closed forms: e^a Li_0 = 1/(1-z), e^a Li_-1 = 1/(1-z)^2, e^a Li_-2 = (1+z)/(1-z)^3
    let l0 = 1.0 / omz;
    let l_m1 = l0 * l0;
    let l_m2 = (1.0 + z) * l_m1 * l0;
    let (l1, l2, l3) = if z <= SERIES_Z_LIMIT {
        scaled_series_triple(z)
    } else if a >= LOG_EXPANSION_LIMIT {
        let (l2, l3) = scaled_series_pair(z);
        (-omz.ln() / z, l2, l3)
    } else {
        (-omz.ln() / z, scaled_polylog(2, a), scaled_polylog(3, a))
    };
    let x2 = x0 * x0;
    ScaledBose {
        value: x2 * l1 + 2.0 * x0 * l2 + 2.0 * l3,
        d1: x2 * l0 + 2.0 * x0 * l1 + 2.0 * l2,
        d2: x2 * l_m1 + 2.0 * x0 * l0 + 2.0 * l1,
        d3: x2 * l_m2 + 2.0 * x0 * l_m1 + 2.0 * l0,
    }
}

/// Below this z = e^-a the series for Li_1 as well converges in a dozen terms.
const SERIES_Z_LIMIT: f64 = 0.05;

/// (e^a Li_1, e^a Li_2, e^a Li_3) at z = e^-a <= 0.05 in one pass of the defining series.
#[inline]
fn scaled_series_triple(z: f64) -> (f64, f64, f64) {
    let (mut s1, mut s2, mut s3) = (1.0, 1.0, 1.0);
    let mut zk = 1.0;
    let mut k = 1.0_f64;
    loop {
        zk *= z;
        k += 1.0;
        let t1 = zk / k;
        s1 += t1;
        let t2 = t1 / k;
        s2 += t2;
        s3 += t2 / k;
        if t1 < 1e-17 {
            return (s1, s2, s3);
        }
    }
}

/// (e^a Li_2(e^-a), e^a Li_3(e^-a)) in one pass of the series, for z = e^-a <= 1/e.
#[inline]
fn scaled_series_pair(z: f64) -> (f64, f64) {
    let (mut s2, mut s3) = (1.0, 1.0);
    let mut zk = 1.0;
    let mut k = 1.0_f64;
    loop {
        zk *= z;
        k += 1.0;
        let t2 = zk / (k * k);
        s2 += t2;
        s3 += t2 / k;
        if t2 < 1e-17 {
            return (s2, s3);
        }
    }
}

/// Upper Bose-Einstein integral integral_{x0}^inf x^n / (e^x - 1) dx for n in {1, 2, 3}, x0 >= 0
/// (x0 = E0/kT and the result dimensionless).
///
/// Small x0 uses the complement n! zeta(n+1) - [`bose_lower`]; elsewhere the polylog series.
/// Returns 0 (not NaN) once the answer underflows.
pub fn bose_upper(n: u32, x0: f64) -> f64 {
    if x0.is_nan() {
        return f64::NAN;
    }
    if x0 <= 0.0 {
        return bose_complete(n);
    }
    if x0 < 1.0 {
        return bose_complete(n) - bose_lower(n, x0);
    }
    if x0 == f64::INFINITY || x0 > 745.0 + 4.0 * x0.ln() {
        return 0.0;
    }
    // G_n(x0) = e^-x0 sum_j n!/(n-j)! x0^(n-j) Ltilde_{j+1}(x0)
    let mut sum = 0.0;
    let mut coef = 1.0; // n!/(n-j)!
    for j in 0..=n {
        if j > 0 {
            coef *= (n - j + 1) as f64;
        }
        let xp = x0.powi((n - j) as i32);
        sum += coef * xp * scaled_polylog(j as i32 + 1, x0);
    }
    // multiply by e^-x0 in log space so that x0^n cannot overflow first
    (sum.ln() - x0).exp()
}

/// Complete Bose-Einstein integral integral_0^inf x^n / (e^x - 1) dx = n! zeta(n+1)
/// (dimensionless; A&S 23.2.7 with s = n + 1, from memory).
pub fn bose_complete(n: u32) -> f64 {
    match n {
        1 => ZETA2,
        2 => 2.0 * ZETA3,
        3 => 6.0 * ZETA4, // = pi^4 / 15
        _ => {
            let mut f = 1.0;
            for i in 1..=n {
                f *= i as f64;
            }
            f * zeta_sum(n + 1)
        }
    }
}

/// zeta(s) by its defining sum over k = 1..199 (A&S 23.2.1); the truncation error is about
/// 1 / ((s - 1) 200^(s-1)), 1.6e-10 at s = 5.
fn zeta_sum(s: u32) -> f64 {
    (1..200).map(|k| 1.0 / (k as f64).powi(s as i32)).sum()
}

/// Lower Bose-Einstein integral integral_0^x x^n / (e^x - 1) dx (x and the result dimensionless)
/// for n >= 1 and 0 <= x < 2 pi,
/// by the Bernoulli series sum_k B_k x^(n+k) / (k! (n+k)) (A&S 23.1.1 integrated termwise).
/// For x >= 2 it switches to the complement of the upper integral.
pub fn bose_lower(n: u32, x: f64) -> f64 {
    if x <= 0.0 {
        return 0.0;
    }
    if x >= 2.0 {
        return bose_complete(n) - bose_upper(n, x);
    }
    let mut sum = 0.0;
    let mut xk = x.powi(n as i32); // x^(n+k), k = 0
    let mut fact = 1.0;
    for (k, b) in BERNOULLI.iter().enumerate() {
        if k > 0 {
            fact *= k as f64;
            xk *= x;
        }
        if *b == 0.0 {
            continue;
        }
        let term = b * xk / (fact * (n as f64 + k as f64));
        sum += term;
        if k > 4 && term.abs() < 1e-18 * sum.abs() {
            break;
        }
    }
    sum
}

/// Band integral integral_{x1}^{x2} x^n / (e^x - 1) dx (dimensionless) for 0 <= x1 <= x2
/// (infinite x2 allowed; x1 > x2 gives the negated integral),
/// choosing the low series or the upper series so that no large numbers cancel.
pub fn bose_band(n: u32, x1: f64, x2: f64) -> f64 {
    let (lo, hi) = if x1 <= x2 { (x1, x2) } else { (x2, x1) };
    let lo = lo.max(0.0);
    let sign = if x1 <= x2 { 1.0 } else { -1.0 };
    let value = if hi <= 2.0 {
        bose_lower(n, hi) - bose_lower(n, lo)
    } else if lo >= 2.0 {
        bose_upper(n, lo) - bose_upper(n, hi)
    } else {
        (bose_lower(n, 2.0) - bose_lower(n, lo)) + (bose_upper(n, 2.0) - bose_upper(n, hi))
    };
    sign * value.max(0.0)
}

/// Principal Lambert W of e^y, i.e. the w > 0 solving w + ln w = y, for any finite y
/// (y and w dimensionless).
///
/// Used for the maximum power point in the Boltzmann approximation,
/// V_mp = (kT/q) (W(e (1 + Jsc/J0)) - 1), where the argument is passed as its logarithm so
/// that a huge Jsc/J0 never overflows. Halley's method on w + ln w - y converges cubically
/// from the asymptotic start y - ln y + ln y / y for y > 2 (Corless et al., Adv. Comput.
/// Math. 5, 329, 1996, eq. 4.19) and from a series start below.
pub fn lambert_w_of_exp(y: f64) -> f64 {
    if y.is_nan() {
        return f64::NAN;
    }
    if y == f64::INFINITY {
        return f64::INFINITY;
    }
    if y < -700.0 {
        // W(x) ~ x for tiny x
        return y.exp();
    }
    let mut w = if y > 2.0 {
        // asymptotic expansion W ~ L1 - L2 + L2/L1 (Corless et al. 1996, eq. 4.19)
        let l2 = y.ln();
        y - l2 + l2 / y
    } else {
        let x = y.exp();
        if x < 1.0 {
            // series about 0: W = x - x^2 + 1.5 x^3
            x * (1.0 - x + 1.5 * x * x).max(0.2)
        } else {
            1.0 + (y - 1.0) * 0.5
        }
    };
    for _ in 0..60 {
        // Halley on f(w) = w + ln w - y: f' = 1 + 1/w, f'' = -1/w^2
        let f = w + w.ln() - y;
        let d1 = 1.0 + 1.0 / w;
        let d2 = -1.0 / (w * w);
        let step = 2.0 * f * d1 / (2.0 * d1 * d1 - f * d2);
        let next = if w - step <= 0.0 { 0.5 * w } else { w - step };
        // Halley converges cubically: a step below 1e-6 leaves an error near 1e-18
        if (next - w).abs() <= 1e-6 * next.abs() {
            return next;
        }
        w = next;
    }
    w
}

/// W(e^y) to about 1e-7 relative for y > 2 (one Halley step from the asymptotic start), the
/// full [`lambert_w_of_exp`] elsewhere (y and the result dimensionless). A starting point for
/// iterations that refine further.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn lambert_w_of_exp_rough(y: f64) -> f64 {
    if !(y > 8.0) || !y.is_finite() {
        return lambert_w_of_exp(y);
    }
    let l2 = y.ln();
    let w = y - l2 + l2 / y;
    let f = w + w.ln() - y;
    let d1 = 1.0 + 1.0 / w;
    let d2 = -1.0 / (w * w);
    w - 2.0 * f * d1 / (2.0 * d1 * d1 - f * d2)
}

/// Euler's constant gamma (A&S 6.1.3).
const EULER_GAMMA: f64 = 0.577_215_664_901_532_9;

/// The exponential integral E_3(x) = integral_1^inf e^(-x t) t^-3 dt for x >= 0
/// (A&S 5.1.4), with E_3(0) = 1/2 and E_3(inf) = 0; x and the result dimensionless.
/// Relative error near 1e-15.
///
/// * x <= 1: the power series A&S 5.1.12 for n = 3,
///   E_3(x) = (x^2/2) (psi(3) - ln x) - sum_{k>=0, k!=2} (-x)^k / ((k - 2) k!),
///   psi(3) = 3/2 - gamma (A&S 6.3.2);
/// * x > 1: the continued fraction A&S 5.1.22 in its even contraction,
///   E_3(x) = e^-x / (x + 3 - 1*3 / (x + 5 - 2*4 / (x + 7 - ...))),
///   evaluated forward by the modified Lentz method (Thompson & Barnett, J. Comput. Phys.
///   64, 490, 1986).
///
/// Negative x and NaN give 1/2 (the x = 0 value); beyond x = 745 e^-x underflows to 0.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn exp_integral_3(x: f64) -> f64 {
    if !(x > 0.0) {
        return 0.5;
    }
    if x > 745.0 {
        return 0.0;
    }
    if x <= 1.0 {
        let psi3 = 1.5 - EULER_GAMMA;
        // k = 0 and k = 1 terms: -(1 / (-2)) - (-x / (-1)) = 1/2 - x
        let mut sum = 0.5 - x;
        let mut power = x * x / 2.0; // (-x)^k / k! at k = 2
        for k in 3..60 {
            power *= -x / k as f64;
            let term = power / (k - 2) as f64;
            sum -= term;
            if term.abs() < 1e-17 * sum.abs() {
                break;
            }
        }
        return sum + 0.5 * x * x * (psi3 - x.ln());
    }
    const TINY: f64 = 1e-300;
    let n = 3.0;
    let mut b = x + n;
    let mut c = 1.0 / TINY;
    let mut d = 1.0 / b;
    let mut h = d;
    for i in 1..200 {
        let fi = i as f64;
        let a = -fi * (n - 1.0 + fi);
        b += 2.0;
        d = 1.0 / (a * d + b);
        c = b + a / c;
        let delta = c * d;
        h *= delta;
        if (delta - 1.0).abs() < 1e-16 {
            break;
        }
    }
    h * (-x).exp()
}

/// The maximum of a unimodal `score(f(x))` on [`lo`, `hi`] by golden-section search (Kiefer,
/// Proc. AMS 4, 502 (1953)): each step shrinks the bracket by 0.618 until it is narrower than
/// `tol` (in x's unit; 100 steps cover any finite start). Returns the better of the last two
/// interior points, (x, f(x)).
pub fn golden_max<R: Copy>(f: impl Fn(f64) -> R, score: impl Fn(&R) -> f64, lo: f64, hi: f64, tol: f64) -> (f64, R) {
    const INV_PHI: f64 = 0.618_033_988_749_895; // (sqrt 5 - 1) / 2
    let (mut lo, mut hi) = (lo, hi);
    let mut a = hi - INV_PHI * (hi - lo);
    let mut c = lo + INV_PHI * (hi - lo);
    let (mut ra, mut rc) = (f(a), f(c));
    for _ in 0..100 {
        if hi - lo < tol {
            break;
        }
        if score(&ra) > score(&rc) {
            hi = c;
            c = a;
            rc = ra;
            a = hi - INV_PHI * (hi - lo);
            ra = f(a);
        } else {
            lo = a;
            a = c;
            ra = rc;
            c = lo + INV_PHI * (hi - lo);
            rc = f(c);
        }
    }
    if score(&ra) > score(&rc) {
        (a, ra)
    } else {
        (c, rc)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn polylog_matches_direct_sum_across_the_switch() {
        // Li_s(e^-a) by brute-force summation of the defining series (converges for a > 0).
        for s in 2..=4 {
            for &a in &[0.05f64, 0.3, 0.7, 0.99, 1.0, 1.01, 1.5, 3.0, 10.0] {
                let z: f64 = (-a).exp();
                let mut direct = 0.0;
                for k in 1..200_000 {
                    let t = z.powi(k) / (k as f64).powi(s);
                    direct += t;
                    if t < 1e-20 {
                        break;
                    }
                }
                let ours = scaled_polylog(s, a) * z;
                assert!(((ours - direct) / direct).abs() < 1e-12, "s={s} a={a}: {ours} vs {direct}");
            }
        }
    }

    #[test]
    fn polylog_at_one_is_zeta() {
        // Li_s(1) = zeta(s) (definition).
        assert!((scaled_polylog(2, 0.0) - ZETA2).abs() < 1e-15);
        assert!((scaled_polylog(3, 0.0) - ZETA3).abs() < 1e-15);
        assert!((scaled_polylog(4, 0.0) - ZETA4).abs() < 1e-15);
    }

    #[test]
    fn lambert_w_inverts() {
        for &y in &[-50.0, -3.0, -0.5, 0.0, 0.5, 1.0, 2.0, 5.0, 40.0, 1e3, 1e8, 1e300] {
            let w = lambert_w_of_exp(y);
            assert!(w > 0.0 && w.is_finite());
            let resid = w + w.ln() - y;
            assert!(resid.abs() < 1e-12 * y.abs().max(1.0), "y={y} w={w} resid={resid}");
        }
        // W(e) = 1 exactly (definition: 1 * e^1 = e)
        assert!((lambert_w_of_exp(1.0) - 1.0).abs() < 1e-15);
    }

    #[test]
    fn lower_and_upper_add_to_complete() {
        for n in 1..=3 {
            for &x in &[1e-6, 0.1, 0.9, 1.0, 1.5, 1.99, 2.0, 3.0] {
                let total = bose_lower(n, x) + bose_upper(n, x);
                assert!((total / bose_complete(n) - 1.0).abs() < 1e-13, "n={n} x={x}");
            }
        }
    }
    #[test]
    fn exp_integral_3_known_values() {
        // Tabulated values are checked against scipy.special.expn in tests/radiator.rs
        // (sky_angular_integral_matches_the_exponential_integral). Here the identities that
        // need no table: E_3(0) = 1/2 (A&S 5.1.23); E_3 decreases (dE_3/dx = -E_2 < 0,
        // A&S 5.1.26); E_3(x) = e^-x / (x + 3) (1 + O(x^-2)) for large x (A&S 5.1.52).
        assert_eq!(exp_integral_3(0.0), 0.5);
        for &x in &[50.0f64, 200.0, 700.0] {
            let lead = (-x).exp() / (x + 3.0);
            assert!((exp_integral_3(x) / lead - 1.0).abs() < 3.0 / (x * x), "{x}");
        }
        // no jump at the switch x = 1 (series at and below, fraction above): the one-sided
        // difference quotients agree to within the curvature term h E_1(1) ~ 2e-7 (a jump
        // of 1e-11 would show as 1e-5)
        let h = 1e-6;
        let left = (exp_integral_3(1.0) - exp_integral_3(1.0 - h)) / h;
        let right = (exp_integral_3(1.0 + h) - exp_integral_3(1.0)) / h;
        assert!((left - right).abs() < 1e-5, "{left} {right}");
        let mut last = 0.5;
        for i in 1..2000 {
            let v = exp_integral_3(i as f64 * 0.01);
            assert!(v < last && v > 0.0);
            last = v;
        }
        assert_eq!(exp_integral_3(1e300), 0.0);
        assert_eq!(exp_integral_3(f64::NAN), 0.5);
    }
}
