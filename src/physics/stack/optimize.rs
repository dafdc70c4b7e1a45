//! The best band gaps of a stack: a global search that does not stop at the first local
//! optimum, then a local polish. Deterministic: the same problem always gives the same
//! answer and the same number of evaluations.
//!
//! * One or two free gaps: every point of a grid (two-junction stacks use the fast map of
//!   [`super::map`]), then the best few grid points that are local maxima are polished with
//!   the Nelder-Mead simplex (Nelder & Mead, Comput. J. 7, 308, 1965).
//! * Three or more: differential evolution, strategy rand/1/bin with dithered weight (Storn &
//!   Price, J. Global Optim. 11, 341, 1997), from a fixed seed, then Nelder-Mead from the
//!   best few distinct members of the final population. The efficiency of AM1.5G stacks has
//!   several local optima (absorption bands of the atmosphere), which a population explores
//!   and a single descent would not.
//!
//! A candidate is a set of gaps in any order; it is sorted (top first) before evaluation.
//! Two equal gaps mean a subcell with no band to absorb: for independent connection it
//! delivers nothing and the others are unchanged; in series its zero current stops the stack.

use super::mixed::{mixed_efficiency, StackExtras};
use super::{stack_efficiency, Connection, MAX_JUNCTIONS};
use crate::physics::batch::map_indexed;
use crate::physics::constants::CHARGE;
use crate::physics::junction::{Cell, Illumination};
use crate::physics::order::{sort_descending_by, sort_numbers};
use crate::physics::search;

/// Where a fixed gap must sit in the stack.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum FixAt {
    /// anywhere: the other gaps may lie above or below it. Default.
    #[default]
    Any,
    /// the fixed gap is the top cell: every other gap is below it
    Top,
    /// the fixed gap is the bottom cell: every other gap is above it
    Bottom,
}

/// A gap held fixed while the others are optimized ("best partner" searches).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FixedGap {
    /// [J]
    pub gap_j: f64,
    pub at: FixAt,
}

/// What to optimize.
#[derive(Debug, Clone)]
pub struct Problem<'a> {
    pub light: &'a Illumination,
    /// temperature, ERE, emission and J-V model of every subcell (gap ignored)
    pub cell: Cell,
    pub connection: Connection,
    /// number of junctions, 1 to [`MAX_JUNCTIONS`]
    pub junctions: usize,
    pub fixed: Option<FixedGap>,
    /// range of the free gaps [J]
    pub range_j: (f64, f64),
    /// extra starting points (free gaps only, any order), e.g. a smaller stack's optimum;
    /// the result is never worse than the best of them
    pub seeds: Vec<Vec<f64>>,
    /// a real bottom cell under the step subcells (not counted in `junctions`) and
    /// luminescent coupling ([`super::mixed`]); none by default
    pub extras: StackExtras,
}

/// Default search range of the free gaps [eV].
pub const SEARCH_RANGE_EV: (f64, f64) = (0.2, 4.5);

/// The optimizer's answer.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Optimum {
    /// gaps [J], top first
    pub gaps_j: Vec<f64>,
    /// efficiency of that stack (dimensionless)
    pub efficiency: f64,
    /// number of stack evaluations used
    pub evaluations: u64,
}

/// How often [`optimize_observed`] reports the evaluations made so far.
pub const PROGRESS_EVERY: u64 = 1000;

/// Counts evaluations and maps free variables to a stack.
struct Objective<'a, 'o> {
    p: &'a Problem<'a>,
    evaluations: u64,
    /// told the evaluation count every [`PROGRESS_EVERY`] evaluations
    observer: Option<&'o mut dyn FnMut(u64)>,
}

impl Objective<'_, '_> {
    /// Count `n` evaluations, telling the observer when a multiple of [`PROGRESS_EVERY`]
    /// is passed.
    fn count(&mut self, n: u64) {
        let before = self.evaluations / PROGRESS_EVERY;
        self.evaluations += n;
        if self.evaluations / PROGRESS_EVERY != before {
            if let Some(o) = self.observer.as_mut() {
                o(self.evaluations);
            }
        }
    }

    /// The gaps of a candidate, top first, fixed gap included.
    fn gaps(&self, free: &[f64]) -> Vec<f64> {
        candidate_gaps(self.p, free)
    }

    /// The stack efficiency (dimensionless, 0 when not finite) for the free gaps `free` [J], any
    /// order; counts one evaluation.
    fn efficiency(&mut self, free: &[f64]) -> f64 {
        self.count(1);
        value(self.p, free)
    }

    /// The efficiency of every candidate `free(i)`, i in 0..n, on every core natively (each
    /// is a pure function of its gaps, so the values do not depend on the order); counted as
    /// n evaluations.
    fn efficiencies(&mut self, n: usize, free: impl Fn(usize) -> Vec<f64> + Sync + Send) -> Vec<f64> {
        let p = self.p;
        let out = map_indexed(n, |i| value(p, &free(i)));
        self.count(n as u64);
        out
    }
}

impl search::Objective for Objective<'_, '_> {
    fn value(&mut self, x: &[f64]) -> f64 {
        self.efficiency(x)
    }
    fn values(&mut self, n: usize, xs: &(dyn Fn(usize) -> Vec<f64> + Sync)) -> Vec<f64> {
        let p = self.p;
        let out = map_indexed(n, |i| value(p, &xs(i)));
        self.count(n as u64);
        out
    }
    /// gaps sorted top first
    fn canon(&self, mut x: Vec<f64>) -> Vec<f64> {
        sort_numbers(&mut x);
        x.reverse();
        x
    }
}

/// The gaps of a candidate, top first, fixed gap included.
fn candidate_gaps(p: &Problem, free: &[f64]) -> Vec<f64> {
    let mut g: Vec<f64> = free.to_vec();
    if let Some(f) = p.fixed {
        g.push(f.gap_j);
    }
    // descending (plain numbers: the order of equal values does not matter)
    sort_numbers(&mut g);
    g.reverse();
    g
}

/// The efficiency of the candidate with free gaps `free` [J]; 0 for a series stack with two
/// equal gaps or a value that is not finite.
fn value(p: &Problem, free: &[f64]) -> f64 {
    let mut g = candidate_gaps(p, free);
    let before = g.len();
    g.dedup();
    if g.len() < before && p.connection == Connection::Series {
        return 0.0;
    }
    let e = if p.extras.is_plain() {
        stack_efficiency(p.light, &p.cell, &g, p.connection)
    } else {
        mixed_efficiency(p.light, &p.cell, &g, &p.extras, p.connection)
    };
    if e.is_finite() {
        e
    } else {
        0.0
    }
}

/// Bounds of the free variables [J].
fn free_bounds(p: &Problem) -> (f64, f64) {
    let (lo, hi) = p.range_j;
    match p.fixed {
        Some(FixedGap { gap_j, at: FixAt::Top }) => (lo, gap_j.min(hi)),
        Some(FixedGap { gap_j, at: FixAt::Bottom }) => (gap_j.max(lo), hi),
        _ => (lo, hi),
    }
}

/// Find the best gaps. An unusable problem (no junctions, bad range) gives an empty result.
pub fn optimize(p: &Problem) -> Optimum {
    search(p, None)
}

/// As [`optimize`] (the same answer), telling `observer` the number of stacks evaluated so
/// far every [`PROGRESS_EVERY`] evaluations, for a progress display.
pub fn optimize_observed(p: &Problem, observer: &mut dyn FnMut(u64)) -> Optimum {
    search(p, Some(observer))
}

/// The number of free gaps and their bounds [J], or None for an unusable problem.
fn free_part(p: &Problem) -> Option<(usize, f64, f64)> {
    let n_free = p.junctions.saturating_sub(usize::from(p.fixed.is_some()));
    let (lo, hi) = free_bounds(p);
    let most = MAX_JUNCTIONS - usize::from(p.extras.bottom.is_some());
    let valid = (1..=most).contains(&p.junctions)
        && lo.is_finite()
        && hi.is_finite()
        && lo > 0.0
        && hi > lo
        && p.fixed.is_none_or(|f| f.gap_j > 0.0 && f.gap_j.is_finite());
    valid.then_some((n_free, lo, hi))
}

/// Polish the local maximum near `start` (the free gaps [J], any order; clamped to the
/// range) with the same simplex as the search's last stage, first steps `step_j` [J]: e.g.
/// the best point of a grid of stacks, refined. Never worse than `start`. An unusable
/// problem, or a start of the wrong length, gives an empty result.
pub fn refine(p: &Problem, start: &[f64], step_j: f64) -> Optimum {
    let Some((n_free, lo, hi)) = free_part(p) else { return Optimum::default() };
    if start.len() != n_free || n_free == 0 || !start.iter().all(|x| x.is_finite()) {
        return Optimum::default();
    }
    let step = if step_j.is_finite() && step_j > 0.0 { step_j.min(hi - lo) } else { (hi - lo) * 0.01 };
    let mut obj = Objective { p, evaluations: 0, observer: None };
    let x0: Vec<f64> = start.iter().map(|v| v.clamp(lo, hi)).collect();
    let e0 = obj.efficiency(&x0);
    let (x, e) = nelder_mead(&mut obj, &x0, e0, step, lo, hi);
    Optimum { gaps_j: obj.gaps(&x), efficiency: e, evaluations: obj.evaluations }
}

/// The global search and polish of the module docs, optionally observed.
fn search(p: &Problem, observer: Option<&mut dyn FnMut(u64)>) -> Optimum {
    let Some((n_free, lo, hi)) = free_part(p) else { return Optimum::default() };
    let mut obj = Objective { p, evaluations: 0, observer };
    if n_free == 0 {
        let e = obj.efficiency(&[]);
        return Optimum { gaps_j: obj.gaps(&[]), efficiency: e, evaluations: obj.evaluations };
    }
    let mut starts: Vec<(Vec<f64>, f64)> = match n_free {
        1 => grid_1d(&mut obj, lo, hi),
        2 => grid_2d(&mut obj, lo, hi),
        _ => evolve(&mut obj, n_free, lo, hi),
    };
    for s in &p.seeds {
        if s.len() == n_free && s.iter().all(|x| x.is_finite()) {
            let x: Vec<f64> = s.iter().map(|v| v.clamp(lo, hi)).collect();
            let e = obj.efficiency(&x);
            starts.push((x, e));
        }
    }
    sort_descending_by(&mut starts, |s| s.1);
    let mut best = starts.first().cloned().unwrap_or_default();
    let step = (hi - lo) * 0.01;
    let polish = &starts[..starts.len().min(POLISHED_STARTS)];
    let polished: Vec<(Vec<f64>, f64)> = if obj.observer.is_some() {
        polish.iter().map(|(x, e)| nelder_mead(&mut obj, x, *e, step, lo, hi)).collect()
    } else {
        // independent polishes, each with its own count: on every core natively, the same
        // answers and the same total as one after the other
        let runs: Vec<(Vec<f64>, f64, u64)> = map_indexed(polish.len(), |i| {
            let mut own = Objective { p, evaluations: 0, observer: None };
            let (x, e) = nelder_mead(&mut own, &polish[i].0, polish[i].1, step, lo, hi);
            (x, e, own.evaluations)
        });
        runs.into_iter()
            .map(|(x, e, n)| {
                obj.count(n);
                (x, e)
            })
            .collect()
    };
    for (px, pe) in polished {
        if pe > best.1 {
            best = (px, pe);
        }
    }
    let gaps = obj.gaps(&best.0);
    Optimum { gaps_j: gaps, efficiency: best.1, evaluations: obj.evaluations }
}

/// The optimum for every number of junctions from 1 to `max_junctions`, each seeded with
/// the previous one's gaps plus one more (a copy of its lowest free gap, which for
/// independent connection reproduces the smaller stack exactly, and one midway between its
/// top gap and the top of the range). For independent connection the efficiencies are
/// therefore never lower for more junctions.
pub fn optimize_each(p: &Problem, max_junctions: usize) -> Vec<Optimum> {
    let mut out: Vec<Optimum> = Vec::new();
    let (lo, hi) = free_bounds(p);
    for n in 1..=max_junctions.min(MAX_JUNCTIONS) {
        if p.fixed.is_some() && n < 2 {
            continue;
        }
        let mut q = Problem { junctions: n, ..p.clone() };
        if let Some(prev) = out.last() {
            let mut free: Vec<f64> = prev.gaps_j.clone();
            if let Some(f) = p.fixed {
                if let Some(i) = free.iter().position(|g| *g == f.gap_j) {
                    free.remove(i);
                }
            }
            let lowest = free.iter().copied().fold(hi, f64::min);
            let highest = free.iter().copied().fold(lo, f64::max);
            let mut a = free.clone();
            a.push(lowest);
            let mut b = free;
            b.push(0.5 * (highest + hi));
            q.seeds.push(a);
            q.seeds.push(b);
        }
        out.push(optimize(&q));
    }
    out
}

/// How many of the best starting points are polished.
pub const POLISHED_STARTS: usize = 4;

/// Grid step of one free gap [eV] and of two free gaps [eV].
const GRID_1D_EV: f64 = 0.002;
const GRID_2D_EV: f64 = 0.01;

/// Evenly spaced gaps [J] from `lo` to `hi` [J], ends included, no further apart than
/// `step_ev` [eV].
fn grid_points(lo: f64, hi: f64, step_ev: f64) -> Vec<f64> {
    let step = step_ev * CHARGE;
    let n = (((hi - lo) / step).ceil() as usize).clamp(1, 100_000);
    (0..=n).map(|i| lo + (hi - lo) * i as f64 / n as f64).collect()
}

/// Every grid point of one free gap; returns the local maxima, best first.
fn grid_1d(obj: &mut Objective, lo: f64, hi: f64) -> Vec<(Vec<f64>, f64)> {
    let xs = grid_points(lo, hi, GRID_1D_EV);
    let es = obj.efficiencies(xs.len(), |i| vec![xs[i]]);
    let mut maxima: Vec<(Vec<f64>, f64)> = (0..xs.len())
        .filter(|&i| {
            let left = if i > 0 { es[i - 1] } else { f64::NEG_INFINITY };
            let right = es.get(i + 1).copied().unwrap_or(f64::NEG_INFINITY);
            es[i] >= left && es[i] >= right && es[i] > 0.0
        })
        .map(|i| (vec![xs[i]], es[i]))
        .collect();
    sort_descending_by(&mut maxima, |m| m.1);
    maxima
}

/// Every point x1 > x2 of a grid of two free gaps; returns the local maxima, best first.
fn grid_2d(obj: &mut Objective, lo: f64, hi: f64) -> Vec<(Vec<f64>, f64)> {
    let xs = grid_points(lo, hi, GRID_2D_EV);
    let n = xs.len();
    let grid: Vec<f64> = if obj.p.fixed.is_none() && obj.p.extras.is_plain() {
        // the two-junction map: rows are the top gap, columns the bottom gap
        let m = super::map::tandem_map(obj.p.light, &obj.p.cell, obj.p.connection, &xs, &xs);
        obj.count((n * (n - 1) / 2) as u64);
        m.efficiency
    } else {
        // the pairs k < i in row order, evaluated on every core
        let pairs: Vec<(usize, usize)> = (0..n).flat_map(|i| (0..i).map(move |k| (i, k))).collect();
        let es = obj.efficiencies(pairs.len(), |m| vec![xs[pairs[m].0], xs[pairs[m].1]]);
        let mut g = vec![0.0; n * n];
        for (&(i, k), e) in pairs.iter().zip(es) {
            g[i * n + k] = e;
        }
        g
    };
    grid_maxima(&xs, &xs, &grid)
}

/// The local maxima of a grid of two-junction efficiencies, best first: `eff[i * n + k]` is
/// the stack of top gap `tops_j[i]` and bottom gap `bottoms_j[k]` (both ascending, [J],
/// `n` = `bottoms_j.len()`). Points whose bottom gap is not below the top gap, and values
/// that are not finite, are no stacks. Each maximum is ([top, bottom], efficiency).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn grid_maxima(tops_j: &[f64], bottoms_j: &[f64], eff: &[f64]) -> Vec<(Vec<f64>, f64)> {
    let (nt, nb) = (tops_j.len(), bottoms_j.len());
    if eff.len() != nt * nb {
        return Vec::new();
    }
    let at = |i: isize, k: isize| -> f64 {
        if i < 0 || k < 0 || i as usize >= nt || k as usize >= nb || !(bottoms_j[k as usize] < tops_j[i as usize]) {
            return f64::NEG_INFINITY;
        }
        let e = eff[i as usize * nb + k as usize];
        if e.is_finite() {
            e
        } else {
            f64::NEG_INFINITY
        }
    };
    let mut maxima = Vec::new();
    for i in 0..nt as isize {
        for k in 0..nb as isize {
            let e = at(i, k);
            if !(e > 0.0) {
                continue;
            }
            let is_max = (-1..=1).all(|di| (-1..=1).all(|dk| (di == 0 && dk == 0) || at(i + di, k + dk) <= e));
            if is_max {
                maxima.push((vec![tops_j[i as usize], bottoms_j[k as usize]], e));
            }
        }
    }
    sort_descending_by(&mut maxima, |m| m.1);
    maxima
}

/// Seed of the evolution; fixed so that results are reproducible.
const EVOLUTION_SEED: u64 = 0x6c6f_7767_6170_0001;
/// Generations of the evolution at most.
const MAX_GENERATIONS: usize = 400;
/// Stop once the population's efficiencies agree to this (absolute efficiency).
const SPREAD_TOL: f64 = 1e-10;

/// Differential evolution ([`search::evolve`]) over `d` free gaps in [lo, hi] [J]; returns
/// the best few members of the last population that differ by 0.02 eV, best first.
fn evolve(obj: &mut Objective, d: usize, lo: f64, hi: f64) -> Vec<(Vec<f64>, f64)> {
    let settings = search::Evolution {
        seed: EVOLUTION_SEED ^ (d as u64) << 8 ^ (obj.p.junctions as u64),
        population: (12 * d).max(24),
        generations: MAX_GENERATIONS,
        spread_tol: SPREAD_TOL,
        apart: 0.02 * CHARGE,
        keep: POLISHED_STARTS,
        batch: false,
    };
    search::evolve(obj, &vec![lo; d], &vec![hi; d], &settings)
}

/// Simplex polish ([`search::nelder_mead`]) of a maximum from `x0` (efficiency `e0`), first
/// steps `step` [J], inside [lo, hi] [J], to 0.1 ueV (far below any gap that matters).
fn nelder_mead(obj: &mut Objective, x0: &[f64], e0: f64, step: f64, lo: f64, hi: f64) -> (Vec<f64>, f64) {
    let d = x0.len();
    search::nelder_mead(obj, x0, e0, &vec![step; d], &vec![lo; d], &vec![hi; d], &vec![1e-7 * CHARGE; d])
}
