//! Gauss-Legendre quadrature, the rule behind every spectral integral of the radiator
//! balance that has no closed form (the angular ones all have one).
//!
//! The n nodes are the zeros of the Legendre polynomial P_n, found by Newton's method on the
//! three-term recurrence (n+1) P_{n+1} = (2n+1) x P_n - n P_{n-1} (Abramowitz & Stegun,
//! Handbook of Mathematical Functions, 1964, 22.7.10) from the starting values
//! x_i = cos(pi (i - 1/4) / (n + 1/2)) (A&S 22.16.6 gives the asymptotic form of the zeros),
//! and the weights are w_i = 2 / ((1 - x_i^2) P_n'(x_i)^2) (A&S 25.4.29). The rule integrates
//! polynomials of degree 2n - 1 exactly. Nothing is tabulated: the nodes are computed once
//! and kept.

use std::sync::OnceLock;

/// Nodes and weights of the n-point rule on [-1, 1], nodes ascending.
#[derive(Debug, Clone)]
pub struct GaussRule {
    pub nodes: Vec<f64>,
    pub weights: Vec<f64>,
}

impl GaussRule {
    /// The n-point Gauss-Legendre rule (n >= 1; n = 0 is taken as 1).
    pub fn new(n: usize) -> GaussRule {
        let n = n.max(1);
        let mut nodes = vec![0.0; n];
        let mut weights = vec![0.0; n];
        let nf = n as f64;
        for i in 0..n.div_ceil(2) {
            let mut x = (std::f64::consts::PI * (i as f64 + 0.75) / (nf + 0.5)).cos();
            let mut dp = 1.0;
            for _ in 0..100 {
                let (p, d) = legendre_and_derivative(n, x);
                dp = d;
                let step = p / d;
                x -= step;
                if step.abs() < 1e-16 {
                    break;
                }
            }
            let (_, d) = legendre_and_derivative(n, x);
            if d.is_finite() && d != 0.0 {
                dp = d;
            }
            let w = 2.0 / ((1.0 - x * x) * dp * dp);
            // x is the i-th largest zero; store symmetric pairs, ascending
            nodes[n - 1 - i] = x;
            nodes[i] = -x;
            weights[n - 1 - i] = w;
            weights[i] = w;
        }
        if n % 2 == 1 {
            nodes[n / 2] = 0.0;
        }
        GaussRule { nodes, weights }
    }

    /// Nodes and weights mapped onto [a, b]: (x, w) pairs with sum of w = b - a (x and w in
    /// the unit of a and b).
    pub fn on(&self, a: f64, b: f64) -> impl Iterator<Item = (f64, f64)> + '_ {
        let half = 0.5 * (b - a);
        let mid = 0.5 * (a + b);
        self.nodes.iter().zip(&self.weights).map(move |(&x, &w)| (mid + half * x, half * w))
    }

    /// The integral of `f` over [a, b] by this rule, in [unit of f x unit of a and b]
    /// (A&S 25.4.29 on the mapped interval).
    pub fn integrate(&self, a: f64, b: f64, mut f: impl FnMut(f64) -> f64) -> f64 {
        self.on(a, b).map(|(x, w)| w * f(x)).sum()
    }
}

/// P_n(x) and P_n'(x) by the recurrence (A&S 22.7.10) and
/// (1 - x^2) P_n' = n (P_{n-1} - x P_n) (A&S 22.8.5).
fn legendre_and_derivative(n: usize, x: f64) -> (f64, f64) {
    let (mut p0, mut p1) = (1.0, x);
    for k in 1..n {
        let kf = k as f64;
        let p2 = ((2.0 * kf + 1.0) * x * p1 - kf * p0) / (kf + 1.0);
        p0 = p1;
        p1 = p2;
    }
    let nf = n as f64;
    let d = nf * (p0 - x * p1) / (1.0 - x * x);
    (p1, d)
}

/// Points per wavelength cell of the spectral grid (exact for polynomials of degree 5).
pub const SPECTRAL_POINTS: usize = 3;

/// The shared per-cell spectral rule.
pub fn spectral_rule() -> &'static GaussRule {
    static RULE: OnceLock<GaussRule> = OnceLock::new();
    RULE.get_or_init(|| GaussRule::new(SPECTRAL_POINTS))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn integrates_polynomials_up_to_degree_2n_minus_1() {
        // integral_0^1 x^k dx = 1 / (k + 1), exact for k <= 2n - 1 (A&S 25.4.29)
        for n in [1usize, 2, 3, 5, 8, 32] {
            let rule = GaussRule::new(n);
            for k in 0..(2 * n) {
                let q = rule.integrate(0.0, 1.0, |x| x.powi(k as i32));
                assert!((q - 1.0 / (k as f64 + 1.0)).abs() < 1e-14, "n={n} k={k} q={q}");
            }
        }
    }

    #[test]
    fn three_point_rule_matches_the_textbook_nodes() {
        // A&S table 25.4: n = 3, x = 0, +-sqrt(3/5); w = 8/9, 5/9
        let r = GaussRule::new(3);
        assert!((r.nodes[2] - (0.6f64).sqrt()).abs() < 1e-15);
        assert!(r.nodes[1].abs() < 1e-300);
        assert!((r.weights[1] - 8.0 / 9.0).abs() < 1e-15);
        assert!((r.weights[0] - 5.0 / 9.0).abs() < 1e-15);
    }
}
