//! Emitters whose emissivity depends on wavelength and direction together: layer stacks.
//!
//! A stack's directional emissivity eps(lambda, mu) is sampled once on a table: wavelengths
//! that resolve its interference fringes ([`fringe_grid`]) by directions mu = cos(theta) at
//! the nodes of a Gauss-Legendre rule on [0, 1] plus any directions asked for exactly (the
//! normal, the sun's). Between wavelengths the table is linear; beyond its ends it holds
//! the end values. The hemispherical emissivity is the rule's sum
//! eps_h = sum_j 2 mu_j w_j eps(lambda, mu_j) (the cosine-weighted mean, Modest, Radiative Heat
//! Transfer, 3rd ed., 2013, ch. 3), and the part of a sky's emission it absorbs is the same
//! sum weighted by the sky's directional emissivity.
//!
//! Architecture invariant: pure functions of SI numbers; the table is built once per stack
//! and read many times (the balance reads it at every node of its spectral grid).

use super::quadrature::GaussRule;
use super::sky::SkyPath;
use crate::physics::batch::map_indexed;
use crate::physics::film::{emissivity, Complex, Layer};

/// Directions of the angular rule. From 3 um up (the thermal band, where the hemispherical
/// emissivity sets emission and sky exchange) 12 Gauss-Legendre nodes in mu meet a 96-node
/// rule to 1.3e-5 for 3- and 10-layer stacks on metal, absorbing and lossless substrates
/// (tested below; 8 nodes give 6e-5, 24 give 4e-7): the integrand is smooth in mu there,
/// and the nodes crowding near mu = 0 catch a metal's grazing p-polarized dip. Below 3 um a
/// stack several wavelengths thick has angular fringes that 12 nodes do not resolve (errors
/// up to 3e-2 in the hemispherical value at 0.3 um); there only the normal and the sun's
/// direction matter for the balance, and those are exact columns of the table.
pub const ANGLE_POINTS: usize = 12;

/// Wavelengths [m] over which a stack is sampled for the radiator: from below the start of
/// the solar tables to where less than 0.1 % of a 300 K blackbody's power remains.
pub const FILM_SPAN_M: (f64, f64) = (0.25e-6, 200e-6);

/// Most wavelengths of a stack's table (a very thick coherent layer is sampled more
/// coarsely than [`fringe_grid`] asks, and its fringes are then averaged by the grid).
pub const MAX_WAVELENGTHS: usize = 20_000;

/// Largest step in ln(lambda) of a stack's table (1 %, the radiator's spectral grid).
pub const MAX_LOG_STEP: f64 = 0.01;

/// Points per interference fringe.
pub const POINTS_PER_FRINGE: f64 = 8.0;

/// Wavelengths [m] from `from_m` to `to_m` that resolve the fringes of a stack whose
/// optical thickness sum_j Re(n_j) d_j [m] (over its coherent layers) at lambda is
/// `optical_thickness(lambda)`: the fringes of a layer of optical thickness D are
/// lambda / (2 D) apart in ln(lambda) at normal incidence (the phase 4 pi D / lambda changes
/// by 2 pi; at oblique incidence they are wider), so the step in ln(lambda) is
/// lambda / (2 D [`POINTS_PER_FRINGE`]), at most [`MAX_LOG_STEP`].
pub fn fringe_grid(from_m: f64, to_m: f64, optical_thickness: impl Fn(f64) -> f64) -> Vec<f64> {
    if !(from_m > 0.0 && to_m > from_m && to_m.is_finite()) {
        return Vec::new();
    }
    // the smallest step that keeps the table within MAX_WAVELENGTHS
    let floor = (to_m / from_m).ln() / MAX_WAVELENGTHS as f64;
    let mut out = vec![from_m];
    let mut l = from_m;
    while l < to_m {
        let d = optical_thickness(l);
        let step = if d > 0.0 { l / (2.0 * d * POINTS_PER_FRINGE) } else { MAX_LOG_STEP };
        let step = if step.is_finite() { step.clamp(floor, MAX_LOG_STEP) } else { MAX_LOG_STEP };
        l = (l * step.exp()).min(to_m);
        out.push(l);
    }
    out
}

/// A directional emissivity table eps(lambda, mu) (fractions 0-1).
#[derive(Debug, Clone, PartialEq)]
pub struct Directional {
    /// the table's wavelengths [m], ascending
    pub wavelength_m: Vec<f64>,
    /// the directions mu = cos(theta) of its columns (dimensionless), ascending
    pub columns: Vec<f64>,
    /// (column, weight 2 mu w) of the angular rule
    quad: Vec<(usize, f64)>,
    /// eps by wavelength, then column
    eps: Vec<f64>,
    /// hemispherical emissivity at each wavelength
    hemi: Vec<f64>,
}

impl Directional {
    /// Sample `row(lambda, mus)`, which gives eps at `lambda` [m] for each direction of
    /// `mus`, at `wavelength_m` [m] on the rule's directions plus `exact_mu` (natively on
    /// every core).
    pub fn build(
        wavelength_m: Vec<f64>,
        exact_mu: &[f64],
        row: impl Fn(f64, &[f64]) -> Vec<f64> + Sync + Send,
    ) -> Directional {
        let rule = GaussRule::new(ANGLE_POINTS);
        let nodes: Vec<(f64, f64)> = rule.on(0.0, 1.0).collect();
        let mut columns: Vec<f64> = nodes.iter().map(|n| n.0).collect();
        columns.extend(exact_mu.iter().map(|m| if m.is_finite() { m.clamp(0.0, 1.0) } else { 1.0 }));
        crate::physics::order::sort_numbers(&mut columns);
        columns.dedup();
        let quad = nodes
            .iter()
            .map(|&(mu, w)| (columns.iter().position(|c| *c == mu).unwrap_or(0), 2.0 * mu * w))
            .collect::<Vec<_>>();
        let rows = map_indexed(wavelength_m.len(), |i| row(wavelength_m[i], &columns));
        let n = columns.len();
        let mut eps = Vec::with_capacity(rows.len() * n);
        for r in rows {
            eps.extend((0..n).map(|j| super::angular::clamp_fraction(r.get(j).copied().unwrap_or(0.0))));
        }
        let hemi = (0..wavelength_m.len())
            .map(|i| super::angular::clamp_fraction(quad.iter().map(|&(j, w)| w * eps[i * n + j]).sum()))
            .collect();
        Directional { wavelength_m, columns, quad, eps, hemi }
    }

    /// The row below `lambda_m` [m] and the fraction toward the next (clamped at the ends).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: NaN takes the first row
    fn place(&self, lambda_m: f64) -> (usize, f64) {
        let w = &self.wavelength_m;
        if w.len() < 2 || !(lambda_m > w[0]) {
            return (0, 0.0);
        }
        if lambda_m >= w[w.len() - 1] {
            return (w.len() - 1, 0.0);
        }
        let i = w.partition_point(|x| *x <= lambda_m).saturating_sub(1);
        let t = (lambda_m - w[i]) / (w[i + 1] - w[i]);
        (i, if t.is_finite() { t.clamp(0.0, 1.0) } else { 0.0 })
    }

    fn cell(&self, i: usize, t: f64, j: usize) -> f64 {
        let n = self.columns.len();
        let a = self.eps.get(i * n + j).copied().unwrap_or(0.0);
        if t == 0.0 {
            return a;
        }
        let b = self.eps.get((i + 1) * n + j).copied().unwrap_or(a);
        a + t * (b - a)
    }

    /// eps at `lambda_m` [m] toward mu = cos(theta) (linear between columns; mu below the
    /// lowest column takes that column).
    pub fn at(&self, lambda_m: f64, mu: f64) -> f64 {
        if self.columns.is_empty() || self.wavelength_m.is_empty() {
            return 0.0;
        }
        let (i, t) = self.place(lambda_m);
        let c = &self.columns;
        let j = c.partition_point(|x| *x < mu);
        if j < c.len() && (c[j] - mu).abs() <= 1e-12 {
            return self.cell(i, t, j);
        }
        if j == 0 {
            return self.cell(i, t, 0);
        }
        if j >= c.len() {
            return self.cell(i, t, c.len() - 1);
        }
        let f = (mu - c[j - 1]) / (c[j] - c[j - 1]);
        let (a, b) = (self.cell(i, t, j - 1), self.cell(i, t, j));
        super::angular::clamp_fraction(a + f * (b - a))
    }

    /// The hemispherical emissivity at `lambda_m` [m].
    pub fn hemispherical(&self, lambda_m: f64) -> f64 {
        if self.hemi.is_empty() {
            return 0.0;
        }
        let (i, t) = self.place(lambda_m);
        let a = self.hemi[i];
        let b = self.hemi.get(i + 1).copied().unwrap_or(a);
        a + t * (b - a)
    }

    /// 2 integral_0^1 eps(lambda, mu) eps_sky(mu) mu dmu at `lambda_m` [m] for the sky
    /// `path`: the fraction of a blackbody sky's hemispherical flux that the stack absorbs.
    pub fn sky_share(&self, lambda_m: f64, path: SkyPath) -> f64 {
        let (i, t) = self.place(lambda_m);
        let s: f64 = self.quad.iter().map(|&(j, w)| w * self.cell(i, t, j) * path.emissivity(self.columns[j])).sum();
        super::angular::clamp_fraction(s)
    }
}

/// The directional emissivity table of a stack: `stack_at(lambda)` gives the incident index,
/// the layers and the substrate at lambda [m]; the table spans `span_m` [m] on the
/// [`fringe_grid`] of the stack's coherent layers, with `exact_mu` among its directions.
pub fn film_table(
    stack_at: impl Fn(f64) -> (f64, Vec<Layer>, Complex) + Sync + Send,
    span_m: (f64, f64),
    exact_mu: &[f64],
) -> Directional {
    let optical = |l: f64| {
        let (_, layers, _) = stack_at(l);
        layers.iter().filter(|x| !x.incoherent).map(|x| x.index.re.max(0.0) * x.thickness_m.max(0.0)).sum::<f64>()
    };
    let grid = fringe_grid(span_m.0, span_m.1, optical);
    Directional::build(grid, exact_mu, |l, mus| {
        let (n0, layers, substrate) = stack_at(l);
        mus.iter().map(|&mu| emissivity(n0, &layers, substrate, l, mu.clamp(0.0, 1.0).acos())).collect()
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn stack(l: f64) -> (f64, Vec<Layer>, Complex) {
        let _ = l;
        (
            1.0,
            vec![
                Layer::new(Complex::new(1.45, 0.02), 1.2e-6),
                Layer::new(Complex::new(2.0, 0.0), 0.3e-6),
                Layer::new(Complex::new(1.7, 0.4), 0.5e-6),
            ],
            Complex::new(0.1, 60.0),
        )
    }

    #[test]
    fn angular_rule_meets_the_dense_rule_in_the_thermal_band() {
        // the 96-node rule of physics::film::hemispherical as the reference; a 10-layer
        // stack and a 3-layer lossy one on five substrates, 3-60 um
        let ten: Vec<Layer> = (0..10)
            .map(|i| {
                if i % 2 == 0 {
                    Layer::new(Complex::new(2.1, 0.002), 150e-9)
                } else {
                    Layer::new(Complex::new(1.45, 0.01), 250e-9)
                }
            })
            .collect();
        let (_, three, _) = stack(1e-6);
        let substrates = [
            Complex::new(0.1, 60.0),
            Complex::new(1.5, 0.0),
            Complex::new(3.0, 0.5),
            Complex::new(20.0, 40.0),
            Complex::new(0.05, 4.0),
        ];
        let mut worst: f64 = 0.0;
        for st in [&ten, &three] {
            for sub in substrates {
                for i in 0..40 {
                    let l = 3e-6 * 20f64.powf(i as f64 / 39.0);
                    let t = Directional::build(vec![l], &[1.0], |l, mus| {
                        mus.iter().map(|&mu| emissivity(1.0, st, sub, l, mu.acos())).collect()
                    });
                    let dense = crate::physics::film::hemispherical(1.0, st, sub, l);
                    let want = if sub.im > 0.0 { 1.0 - dense.reflectance } else { dense.absorptance };
                    worst = worst.max((t.hemispherical(l) - want).abs());
                }
            }
        }
        assert!(worst < 1e-4, "worst {worst:.3e}");
    }

    #[test]
    fn fringe_grid_resolves_a_thick_layer_and_keeps_its_ends() {
        let g = fringe_grid(0.3e-6, 20e-6, |_| 5e-6);
        assert_eq!(g[0], 0.3e-6);
        assert_eq!(*g.last().unwrap(), 20e-6);
        for w in g.windows(2) {
            let step = (w[1] / w[0]).ln();
            assert!(step <= w[0] / (2.0 * 5e-6 * POINTS_PER_FRINGE) * (1.0 + 1e-12) || step <= MAX_LOG_STEP);
        }
        assert!(fringe_grid(1.0, 0.5, |_| 0.0).is_empty());
    }

    #[test]
    fn table_reads_its_columns_exactly_and_holds_beyond_its_ends() {
        let t = Directional::build(vec![1e-6, 2e-6], &[1.0, 0.5], |l, mus| mus.iter().map(|m| m * l * 1e5).collect());
        let near = |a: f64, b: f64| (a - b).abs() < 1e-15;
        assert!(near(t.at(1e-6, 1.0), 0.1));
        assert!(near(t.at(1.5e-6, 0.5), 0.075));
        assert!(near(t.at(5e-6, 1.0), 0.2));
        assert!(near(t.at(1e-9, 0.5), 0.05));
    }
}
