//! The best thicknesses of a film emitter: a search over the thicknesses of a stack's
//! coherent layers, toward one of three targets, with [`crate::physics::search`] (the same
//! differential evolution and simplex polish as the band-gap optimizer).
//!
//! Each candidate is judged on a search grid fixed once per problem: wavelengths from
//! [`SEARCH_SPAN_M`] that resolve the fringes of the thickest stack allowed with
//! [`SEARCH_POINTS_PER_FRINGE`] points (at most [`SEARCH_MAX_WAVELENGTHS`]), directions at the
//! nodes of a [`SEARCH_ANGLES`]-point Gauss-Legendre rule in mu = cos(theta), plus the
//! sun's. On it, with the film's directional emissivity eps_ij at wavelength i and direction
//! j, hemispherical weights W_j = 2 mu_j w_j, cell widths dlambda_i, the sky's directional
//! emissivity e_ij and the sun's irradiance S_i in each cell (all fixed), the balance at
//! surface temperature T is (Raman et al., Nature 515, 540, 2014, eq. 1)
//!   P_net(T) = sum_i pi B(lambda_i, T) dlambda_i sum_j W_j eps_ij
//!            - sum_i pi B(lambda_i, T_a) dlambda_i sum_j W_j eps_ij e_ij
//!            - sum_i S_i eps_i,sun - h_c (T_a - T).
//! Targets: the largest P_net(T_a) (net cooling power at ambient), the lowest T with
//! P_net(T) = 0 (steady temperature), or the least mean squared difference between the
//! normal emissivity and a target profile over the grid (a target spectrum). The grid is
//! coarser than the full evaluation's; the caller re-evaluates the answer in full.
//!
//! Architecture invariant: pure numerics of SI quantities; materials come in as indices
//! already evaluated on the grid.

use super::emissivity::Profile;
use super::quadrature::GaussRule;
use super::sky::Sky;
use super::solar::Sun;
use crate::physics::batch::map_indexed;
use crate::physics::constants::{HC, SUN_DILUTION};
use crate::physics::film::{emissivity, Complex, Layer};
use crate::physics::planck::{band_power_wavelength, radiance_per_wavelength};
use crate::physics::search::{self, Evolution, Objective};
use crate::physics::sources::Source;
use std::f64::consts::PI;

/// Wavelengths of the search grid [m]: the solar band and a surface's thermal band.
pub const SEARCH_SPAN_M: (f64, f64) = (0.28e-6, 60e-6);
/// Points per fringe of the thickest stack allowed on the search grid.
pub const SEARCH_POINTS_PER_FRINGE: f64 = 4.0;
/// Most wavelengths of the search grid.
pub const SEARCH_MAX_WAVELENGTHS: usize = 1200;
/// Largest step in ln(lambda) of the search grid.
pub const SEARCH_MAX_LOG_STEP: f64 = 0.04;
/// Directions of the search's angular rule.
pub const SEARCH_ANGLES: usize = 6;

/// What the search aims for.
#[derive(Debug, Clone, PartialEq)]
pub enum Target {
    /// the largest net cooling power at ambient
    NetPower,
    /// the lowest steady temperature
    SteadyTemperature,
    /// the closest normal emissivity to this profile (least squares over the grid)
    Spectrum(Profile),
}

/// A film to design, on its search grid.
pub struct Design {
    target: Target,
    /// search wavelengths [m] and their cell widths [m]
    grid: Vec<f64>,
    width: Vec<f64>,
    /// per wavelength: incident index, layer indices, substrate index
    n0: Vec<f64>,
    layer_n: Vec<Vec<Complex>>,
    substrate: Vec<Complex>,
    /// each layer: its fixed thickness [m] (None: a variable) and whether incoherent
    fixed: Vec<Option<f64>>,
    incoherent: Vec<bool>,
    /// directions mu of the columns: the rule's nodes, then the sun's
    columns: Vec<f64>,
    /// hemispherical weights 2 mu w of the rule's columns
    weights: Vec<f64>,
    /// pi B(lambda_i, T_a) dlambda_i [W m^-2] and the sky's emissivity per column
    ambient_power: Vec<f64>,
    sky_eps: Vec<Vec<f64>>,
    /// the sun's irradiance in each cell [W m^-2] (empty at night)
    sun_power: Vec<f64>,
    /// the target profile on the grid (Spectrum only)
    goal: Vec<f64>,
    ambient_k: f64,
    h_c: f64,
}

/// What the search found.
#[derive(Debug, Clone, PartialEq)]
pub struct Found {
    /// every layer's thickness [m] (the fixed ones unchanged)
    pub thickness_m: Vec<f64>,
    /// the target's value on the search grid: W m^-2 (net power), K (steady temperature) or
    /// the root-mean-square emissivity difference
    pub value: f64,
    pub evaluations: u64,
}

/// The cells of a grid: boundaries midway (geometrically) between points.
fn cell_edges(grid: &[f64]) -> Vec<f64> {
    let n = grid.len();
    let mut e = Vec::with_capacity(n + 1);
    e.push(grid[0]);
    for w in grid.windows(2) {
        e.push((w[0] * w[1]).sqrt());
    }
    e.push(grid[n - 1]);
    e
}

/// The sun's irradiance [W m^-2] between wavelengths `a` and `b` [m] at one sun.
fn sun_between(source: &Source, a: f64, b: f64) -> f64 {
    let p = match source {
        Source::Table { spectrum, .. } => spectrum.power_between(HC / b, HC / a),
        Source::BlackbodySun { temp_k } => SUN_DILUTION * band_power_wavelength(a, b, *temp_k),
    };
    if p.is_finite() {
        p.max(0.0)
    } else {
        0.0
    }
}

impl Design {
    /// Prepare a design: `stack_at(lambda)` gives the incident index, the layers (their
    /// thicknesses are the starting ones) and the substrate at lambda [m]; `vary[i]` says
    /// whether layer i's thickness is searched, with at most `max_thickness_m` [m] (the
    /// fringes of that are what the grid resolves); the sky, sun, ambient `ambient_k` [K] and
    /// `h_c` [W m^-2 K^-1] are those of the balance.
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        stack_at: impl Fn(f64) -> (f64, Vec<Layer>, Complex),
        vary: &[bool],
        max_thickness_m: f64,
        target: Target,
        sky: &Sky,
        sun: Option<&Sun>,
        ambient_k: f64,
        h_c: f64,
    ) -> Design {
        let (_, start, _) = stack_at(1e-6);
        let varies = |i: usize| vary.get(i).copied().unwrap_or(false) && !start[i].incoherent;
        let optical = |l: f64| {
            let (_, layers, _) = stack_at(l);
            layers
                .iter()
                .enumerate()
                .filter(|(_, x)| !x.incoherent)
                .map(|(i, x)| x.index.re.max(1.0) * if varies(i) { max_thickness_m } else { x.thickness_m })
                .sum::<f64>()
        };
        // the fringe rule of layered::fringe_grid at the search's density
        let (lo, hi) = SEARCH_SPAN_M;
        let floor = (hi / lo).ln() / SEARCH_MAX_WAVELENGTHS as f64;
        let mut grid = vec![lo];
        let mut l = lo;
        while l < hi {
            let d = optical(l);
            let step = if d > 0.0 { l / (2.0 * d * SEARCH_POINTS_PER_FRINGE) } else { SEARCH_MAX_LOG_STEP };
            l = (l * step.clamp(floor, SEARCH_MAX_LOG_STEP).exp()).min(hi);
            grid.push(l);
        }
        let edges = cell_edges(&grid);
        let width: Vec<f64> = edges.windows(2).map(|w| w[1] - w[0]).collect();
        let rule = GaussRule::new(SEARCH_ANGLES);
        let mut columns: Vec<f64> = Vec::new();
        let mut weights = Vec::new();
        for (mu, w) in rule.on(0.0, 1.0) {
            columns.push(mu);
            weights.push(2.0 * mu * w);
        }
        if let Some(s) = sun {
            columns.push(s.zenith_rad.cos().clamp(0.0, 1.0));
        }
        let mut n0 = Vec::with_capacity(grid.len());
        let mut layer_n = Vec::with_capacity(grid.len());
        let mut substrate = Vec::with_capacity(grid.len());
        for &l in &grid {
            let (a, layers, s) = stack_at(l);
            n0.push(a);
            layer_n.push(layers.iter().map(|x| x.index).collect());
            substrate.push(s);
        }
        let ambient_power: Vec<f64> =
            grid.iter().zip(&width).map(|(l, w)| PI * radiance_per_wavelength(*l, ambient_k) * w).collect();
        let sky_eps = grid
            .iter()
            .map(|l| {
                let path = sky.along(*l, ambient_k);
                columns[..weights.len()].iter().map(|mu| path.emissivity(*mu)).collect()
            })
            .collect();
        let sun_power = match sun {
            Some(s) => {
                let scale = if s.scale.is_finite() { s.scale.max(0.0) } else { 0.0 };
                edges.windows(2).map(|w| scale * sun_between(&s.source, w[0], w[1])).collect()
            }
            None => Vec::new(),
        };
        let goal = match &target {
            Target::Spectrum(p) => grid.iter().map(|l| p.at(*l)).collect(),
            _ => Vec::new(),
        };
        let fixed = start.iter().enumerate().map(|(i, x)| (!varies(i)).then_some(x.thickness_m)).collect();
        let incoherent = start.iter().map(|x| x.incoherent).collect();
        Design {
            target,
            grid,
            width,
            n0,
            layer_n,
            substrate,
            fixed,
            incoherent,
            columns,
            weights,
            ambient_power,
            sky_eps,
            sun_power,
            goal,
            ambient_k,
            h_c: if h_c.is_finite() { h_c.max(0.0) } else { 0.0 },
        }
    }

    /// How many thicknesses are searched.
    pub fn variables(&self) -> usize {
        self.fixed.iter().filter(|f| f.is_none()).count()
    }

    /// Wavelengths of the search grid.
    pub fn wavelengths(&self) -> usize {
        self.grid.len()
    }

    /// Every layer's thickness [m] for the searched ones `x` [m].
    pub fn thicknesses(&self, x: &[f64]) -> Vec<f64> {
        let mut it = x.iter();
        self.fixed.iter().map(|f| f.unwrap_or_else(|| it.next().copied().unwrap_or(0.0).max(0.0))).collect()
    }

    /// The film's emissivity at grid wavelength `i` toward each column, for thicknesses `d`
    /// [m]; only the normal when the target is a spectrum.
    fn row(&self, i: usize, d: &[f64]) -> Vec<f64> {
        let layers: Vec<Layer> = self.layer_n[i]
            .iter()
            .zip(d)
            .zip(&self.incoherent)
            .map(|((n, t), inc)| Layer { index: *n, thickness_m: *t, incoherent: *inc })
            .collect();
        let l = self.grid[i];
        let mus: &[f64] = match self.target {
            Target::Spectrum(_) => &[1.0],
            _ => &self.columns,
        };
        mus.iter().map(|mu| emissivity(self.n0[i], &layers, self.substrate[i], l, mu.acos())).collect()
    }

    /// The target's value for the searched thicknesses `x` [m] (see [`Found::value`]).
    pub fn value(&self, x: &[f64]) -> f64 {
        let d = self.thicknesses(x);
        let rows: Vec<Vec<f64>> = (0..self.grid.len()).map(|i| self.row(i, &d)).collect();
        if let Target::Spectrum(_) = self.target {
            let sum: f64 = rows.iter().zip(&self.goal).map(|(r, g)| (r[0] - g).powi(2)).sum();
            return (sum / self.grid.len().max(1) as f64).sqrt();
        }
        let nq = self.weights.len();
        let hemi: Vec<f64> = rows.iter().map(|r| r[..nq].iter().zip(&self.weights).map(|(e, w)| e * w).sum()).collect();
        let sky: f64 = rows
            .iter()
            .zip(&self.sky_eps)
            .zip(&self.ambient_power)
            .map(|((r, s), p)| p * r[..nq].iter().zip(&self.weights).zip(s).map(|((e, w), k)| e * w * k).sum::<f64>())
            .sum();
        let sun: f64 = rows.iter().zip(&self.sun_power).map(|(r, p)| p * r[nq]).sum();
        let emitted = |t: f64| -> f64 {
            self.grid
                .iter()
                .zip(&self.width)
                .zip(&hemi)
                .map(|((l, w), e)| PI * radiance_per_wavelength(*l, t) * w * e)
                .sum()
        };
        let net = |t: f64| emitted(t) - sky - sun - self.h_c * (self.ambient_k - t);
        match self.target {
            Target::NetPower => net(self.ambient_k),
            _ => steady(&net),
        }
    }

    /// The search itself, from the starting thicknesses `start` [m] (the searched ones),
    /// each in [0, `max_m`] [m]; `observer` hears the evaluations so far every 100.
    pub fn run(&self, start: &[f64], max_m: f64, observer: Option<&mut dyn FnMut(u64)>) -> Found {
        let d = self.variables();
        let mut obj = Counted { design: self, evaluations: 0, observer };
        if d == 0 {
            let v = self.value(&[]);
            return Found { thickness_m: self.thicknesses(&[]), value: v, evaluations: 1 };
        }
        let (lo, hi) = (vec![0.0; d], vec![max_m.max(1e-9); d]);
        let settings = Evolution {
            seed: 0x6669_6c6d_0000_0001 ^ d as u64,
            population: (6 * d).max(16),
            generations: 30,
            spread_tol: 1e-6,
            apart: 0.02 * max_m,
            keep: 2,
            batch: true,
        };
        let mut starts = search::evolve(&mut obj, &lo, &hi, &settings);
        if start.len() == d {
            let x: Vec<f64> = start.iter().map(|v| v.clamp(0.0, hi[0])).collect();
            let v = obj.value(&x);
            starts.push((x, v));
        }
        let mut best: Option<(Vec<f64>, f64)> = None;
        for (x, v) in starts {
            let (x, v) = search::nelder_mead(&mut obj, &x, v, &vec![0.02 * max_m; d], &lo, &hi, &vec![0.5e-9; d]);
            if best.as_ref().is_none_or(|b| v > b.1) {
                best = Some((x, v));
            }
        }
        let (x, v) = best.unwrap_or_default();
        let value = if matches!(self.target, Target::NetPower) { v } else { -v };
        Found { thickness_m: self.thicknesses(&x), value, evaluations: obj.evaluations }
    }
}

/// The steady temperature [K] of a net power `net(T)` that increases with T: found in
/// [1, 3000] K by bisection to 1e-4 K; the nearer end when there is no root.
fn steady(net: &dyn Fn(f64) -> f64) -> f64 {
    let (mut a, mut b) = (1.0, 3000.0);
    let (fa, fb) = (net(a), net(b));
    if fa >= 0.0 {
        return a;
    }
    if fb <= 0.0 {
        return b;
    }
    for _ in 0..60 {
        let c = 0.5 * (a + b);
        let fc = net(c);
        if fc < 0.0 {
            a = c;
        } else {
            b = c;
        }
        if b - a < 1e-4 {
            break;
        }
    }
    0.5 * (a + b)
}

/// The design as a search objective: maximizes net power, or minus the temperature or the
/// misfit.
struct Counted<'a, 'o> {
    design: &'a Design,
    evaluations: u64,
    observer: Option<&'o mut dyn FnMut(u64)>,
}

impl Counted<'_, '_> {
    fn score(design: &Design, x: &[f64]) -> f64 {
        let v = design.value(x);
        let s = if matches!(design.target, Target::NetPower) { v } else { -v };
        if s.is_finite() {
            s
        } else {
            f64::MIN
        }
    }

    fn count(&mut self, n: u64) {
        let before = self.evaluations / 100;
        self.evaluations += n;
        if self.evaluations / 100 != before {
            if let Some(o) = self.observer.as_mut() {
                o(self.evaluations);
            }
        }
    }
}

impl Objective for Counted<'_, '_> {
    fn value(&mut self, x: &[f64]) -> f64 {
        self.count(1);
        Counted::score(self.design, x)
    }
    fn values(&mut self, n: usize, xs: &(dyn Fn(usize) -> Vec<f64> + Sync)) -> Vec<f64> {
        let design = self.design;
        let out = map_indexed(n, |i| Counted::score(design, &xs(i)));
        self.count(n as u64);
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::radiator::layered::{film_table, FILM_SPAN_M};
    use crate::physics::radiator::{evaluate, Emitter, Surroundings};

    fn stack(l: f64) -> (f64, Vec<Layer>, Complex) {
        let _ = l;
        (
            1.0,
            vec![
                Layer::new(Complex::new(1.9, 0.0), 1.6e-6),
                Layer::new(Complex::new(1.4, 0.3), 0.3e-6),
                Layer::new(Complex::new(1.9, 0.0), 1.3e-6),
                Layer::new(Complex::new(1.4, 0.5), 2.0e-6),
                Layer::new(Complex::new(2.2, 0.05), 1.2e-6),
            ],
            Complex::new(0.1, 60.0),
        )
    }

    #[test]
    fn search_grid_meets_the_full_balance() {
        let sky = Sky::Clear { pwv_m: 0.015 };
        let sun = Sun { source: Source::am15g(), zenith_rad: 0.3, scale: 1.0 };
        let d = Design::new(stack, &[true; 5], 2e-6, Target::NetPower, &sky, Some(&sun), 300.0, 0.0);
        let (_, layers, _) = stack(1e-6);
        let x: Vec<f64> = layers.iter().map(|l| l.thickness_m).collect();
        let quick = d.value(&x);
        let table = film_table(stack, FILM_SPAN_M, &[1.0, 0.3f64.cos()]);
        let emitter = Emitter::new(Profile::Directional(std::sync::Arc::new(table)));
        let s = Surroundings { sky, ambient_k: 300.0, sun: Some(sun), h_c: 0.0 };
        let full = evaluate(&emitter, &s, 300.0).at_surface.net;
        eprintln!("search {quick} full {full}");
        assert!((quick - full).abs() < 2.0, "search {quick} W/m2, full {full} W/m2");
    }
}
