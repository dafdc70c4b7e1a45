//! Global search and local polish of a function of a few bounded variables, for every
//! optimizer in Glowgap (the best band gaps of a stack, the best thicknesses of a film).
//! Deterministic: the same problem gives the same answer and the same number of
//! evaluations.
//!
//! * [`evolve`]: differential evolution, strategy rand/1/bin with crossover 0.9 and dithered
//!   weight (Storn & Price, J. Global Optim. 11, 341, 1997), from a fixed seed, with a
//!   stratified first population; returns the best few distinct members of the last
//!   population.
//! * [`nelder_mead`]: the simplex method (Nelder & Mead, Comput. J. 7, 308, 1965) with the
//!   standard coefficients, kept inside the bounds.
//!
//! Both maximize. Architecture invariant: pure numerics; the problem comes in through
//! [`Objective`], which also counts evaluations and may spread batches over cores.

use crate::physics::order::sort_descending_by;

/// What a search maximizes.
pub trait Objective {
    /// The value at `x` (counted as one evaluation; not finite counts as the worst).
    fn value(&mut self, x: &[f64]) -> f64;
    /// The values at `xs(i)` for i in 0..n (counted as n evaluations); may run on every core.
    fn values(&mut self, n: usize, xs: &(dyn Fn(usize) -> Vec<f64> + Sync)) -> Vec<f64>;
    /// The canonical form of a candidate (e.g. gaps sorted top first); by default itself.
    fn canon(&self, x: Vec<f64>) -> Vec<f64> {
        x
    }
}

/// Settings of [`evolve`].
#[derive(Debug, Clone, Copy)]
pub struct Evolution {
    /// seed of the generator (fixed, for reproducible results)
    pub seed: u64,
    /// population size
    pub population: usize,
    /// generations at most
    pub generations: usize,
    /// stop once the population's values agree to this (in the value's unit)
    pub spread_tol: f64,
    /// members kept must differ from every better one by more than this in some coordinate
    pub apart: f64,
    /// how many members to return
    pub keep: usize,
    /// make every trial of a generation from the population as it stood at the start of
    /// the generation and judge them together (on every core natively), instead of one by
    /// one with each success seen at once; a little slower to converge per evaluation
    pub batch: bool,
}

/// A small deterministic generator (SplitMix64; Steele, Lea & Flood, OOPSLA 2014).
pub struct SplitMix(pub u64);

impl SplitMix {
    /// The next 64 random bits (SplitMix64 increment and mix).
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// uniform in [0, 1)
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
    /// uniform index in 0..n
    pub fn below(&mut self, n: usize) -> usize {
        (self.unit() * n as f64) as usize % n.max(1)
    }
}

/// Differential evolution over the box `lo[k] <= x[k] <= hi[k]` (see the module docs);
/// returns up to `s.keep` distinct members of the last population, best first.
pub fn evolve(obj: &mut dyn Objective, lo: &[f64], hi: &[f64], s: &Evolution) -> Vec<(Vec<f64>, f64)> {
    let d = lo.len().min(hi.len());
    if d == 0 {
        return Vec::new();
    }
    let mut rng = SplitMix(s.seed);
    let np = s.population.max(4);
    // stratified start: member i draws each coordinate from its own slice of the range
    let mut pop: Vec<Vec<f64>> = (0..np)
        .map(|i| {
            obj.canon(
                (0..d)
                    .map(|k| lo[k] + (hi[k] - lo[k]) * ((i as f64 + rng.unit()) / np as f64 * 0.5 + rng.unit() * 0.5))
                    .collect(),
            )
        })
        .collect();
    let start = pop.clone();
    let mut fit: Vec<f64> = obj.values(np, &|i| start[i].clone());
    for _ in 0..s.generations {
        let weight = 0.5 + 0.5 * rng.unit(); // dither (Storn & Price 1997, sec. 5)
        let mut trials: Vec<Vec<f64>> = Vec::new();
        for i in 0..np {
            let mut pick = || loop {
                let r = rng.below(np);
                if r != i {
                    break r;
                }
            };
            let (r1, mut r2, mut r3) = (pick(), pick(), pick());
            while r2 == r1 {
                r2 = pick();
            }
            while r3 == r1 || r3 == r2 {
                r3 = pick();
            }
            let jrand = rng.below(d);
            let trial: Vec<f64> = (0..d)
                .map(|k| {
                    if k == jrand || rng.unit() < 0.9 {
                        let v = pop[r1][k] + weight * (pop[r2][k] - pop[r3][k]);
                        // out of bounds: go part of the way from the parent to the bound
                        if v < lo[k] {
                            lo[k] + rng.unit() * (pop[i][k] - lo[k])
                        } else if v > hi[k] {
                            hi[k] - rng.unit() * (hi[k] - pop[i][k])
                        } else {
                            v
                        }
                    } else {
                        pop[i][k]
                    }
                })
                .collect();
            let trial = obj.canon(trial);
            if s.batch {
                trials.push(trial);
                continue;
            }
            let e = obj.value(&trial);
            if e >= fit[i] {
                pop[i] = trial;
                fit[i] = e;
            }
        }
        if s.batch {
            let values = obj.values(trials.len(), &|i| trials[i].clone());
            for (i, (t, e)) in trials.into_iter().zip(values).enumerate() {
                if e >= fit[i] {
                    pop[i] = t;
                    fit[i] = e;
                }
            }
        }
        let (mn, mx) = fit.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &e| (a.min(e), b.max(e)));
        if mx - mn <= s.spread_tol {
            break;
        }
    }
    let mut members: Vec<(Vec<f64>, f64)> = pop.into_iter().zip(fit).collect();
    sort_descending_by(&mut members, |m| m.1);
    let mut kept: Vec<(Vec<f64>, f64)> = Vec::new();
    for m in members {
        if kept.iter().all(|k| k.0.iter().zip(&m.0).any(|(a, b)| (a - b).abs() > s.apart)) {
            kept.push(m);
        }
        if kept.len() == s.keep {
            break;
        }
    }
    kept
}

/// Simplex polish of a maximum from `x0` (value `e0`), first steps `step[k]` along each
/// coordinate, inside the box [lo, hi], until the simplex is smaller than `tol[k]` in
/// every coordinate or after 400 steps per coordinate. Standard coefficients (reflection
/// 1, expansion 2, contraction 1/2, shrink 1/2; Nelder & Mead 1965).
pub fn nelder_mead(
    obj: &mut dyn Objective,
    x0: &[f64],
    e0: f64,
    step: &[f64],
    lo: &[f64],
    hi: &[f64],
    tol: &[f64],
) -> (Vec<f64>, f64) {
    let d = x0.len();
    let clamp = |x: Vec<f64>| x.into_iter().enumerate().map(|(k, v)| v.clamp(lo[k], hi[k])).collect::<Vec<f64>>();
    let mut simplex: Vec<(Vec<f64>, f64)> = vec![(x0.to_vec(), e0)];
    for k in 0..d {
        let mut x = x0.to_vec();
        x[k] = if x[k] + step[k] <= hi[k] { x[k] + step[k] } else { x[k] - step[k] };
        let x = clamp(x);
        let e = obj.value(&x);
        simplex.push((x, e));
    }
    for _ in 0..(400 * d) {
        sort_descending_by(&mut simplex, |s| s.1);
        let small = simplex[1..]
            .iter()
            .all(|(x, _)| x.iter().zip(&simplex[0].0).enumerate().all(|(k, (a, b))| (a - b).abs() < tol[k]));
        if small {
            break;
        }
        let centroid: Vec<f64> =
            (0..d).map(|k| simplex[..d].iter().map(|(x, _)| x[k]).sum::<f64>() / d as f64).collect();
        let worst = simplex[d].clone();
        let along = |t: f64| clamp(centroid.iter().zip(&worst.0).map(|(c, w)| c + t * (c - w)).collect());
        let xr = along(1.0);
        let er = obj.value(&xr);
        if er > simplex[0].1 {
            let xe = along(2.0);
            let ee = obj.value(&xe);
            simplex[d] = if ee > er { (xe, ee) } else { (xr, er) };
        } else if er > simplex[d - 1].1 {
            simplex[d] = (xr, er);
        } else {
            let xc = if er > worst.1 { along(0.5) } else { along(-0.5) };
            let ec = obj.value(&xc);
            if ec > worst.1.max(er) {
                simplex[d] = (xc, ec);
            } else {
                let best = simplex[0].0.clone();
                for v in simplex.iter_mut().skip(1) {
                    let x: Vec<f64> = v.0.iter().zip(&best).map(|(a, b)| b + 0.5 * (a - b)).collect();
                    let e = obj.value(&x);
                    *v = (x, e);
                }
            }
        }
    }
    sort_descending_by(&mut simplex, |s| s.1);
    let (x, e) = simplex.swap_remove(0);
    (x, e)
}

#[cfg(test)]
mod tests {
    use super::*;

    struct Bumps(u64);
    impl Objective for Bumps {
        fn value(&mut self, x: &[f64]) -> f64 {
            self.0 += 1;
            // two bumps; the global maximum 2 at (0.7, 0.2), a lesser one (1) at (0.2, 0.8)
            let g = |a: f64, b: f64, h: f64| h * (-((x[0] - a).powi(2) + (x[1] - b).powi(2)) / 0.01).exp();
            g(0.7, 0.2, 2.0) + g(0.2, 0.8, 1.0)
        }
        fn values(&mut self, n: usize, xs: &(dyn Fn(usize) -> Vec<f64> + Sync)) -> Vec<f64> {
            (0..n).map(|i| self.value(&xs(i))).collect()
        }
    }

    #[test]
    fn finds_the_global_maximum_of_two_bumps() {
        let mut b = Bumps(0);
        let s = Evolution {
            seed: 7,
            population: 20,
            generations: 60,
            spread_tol: 1e-12,
            apart: 0.05,
            keep: 3,
            batch: false,
        };
        let starts = evolve(&mut b, &[0.0, 0.0], &[1.0, 1.0], &s);
        let (x, e) = nelder_mead(&mut b, &starts[0].0, starts[0].1, &[0.01, 0.01], &[0.0; 2], &[1.0; 2], &[1e-9; 2]);
        assert!((x[0] - 0.7).abs() < 1e-6 && (x[1] - 0.2).abs() < 1e-6 && (e - 2.0).abs() < 1e-9, "{x:?} {e}");
        assert!(b.0 > 100);
        // judged a generation at a time: the same maximum
        let starts = evolve(&mut b, &[0.0, 0.0], &[1.0, 1.0], &Evolution { batch: true, ..s });
        assert!((starts[0].0[0] - 0.7).abs() < 0.05 && (starts[0].0[1] - 0.2).abs() < 0.05, "{starts:?}");
    }
}
