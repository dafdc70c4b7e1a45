//! Many cells at once: the single-junction maximum power point and the series maximum of a
//! few subcells, for whole grids of gaps (sweeps, loss curves, two-junction maps), and the
//! one place that spreads such grids over every core.
//!
//! The exact radiative current (generalized Planck law, Würfel, J. Phys. C 15, 3967, 1982;
//! the Bose series of `special::scaled_bose2`) is a power series in z = e^(m - x0), with
//! x0 = Eg/kT and m = qV/kT:
//!
//!   R(m) = P c_1 h(z),   h(z) = z H0(z),   H0(z) = sum_{k>=1} a_k z^(k-1),
//!   a_k = c_k / c_1,     c_k = x0^2/k + 2 x0/k^2 + 2/k^3                         [-]
//!
//! with P = q g 2 pi (kT)^3 / (h^3 c^2) [A m^-2] (`ThermalPrefactor`). Where a cell works
//! (z at most [`Z_LIMIT`]: every one-sun and concentrated cell above a few kT of gap) the
//! series converges geometrically, so the exact J-V needs no Bose integral per point:
//!
//! * open circuit: h(z_oc) = w = (ERE Jsc + R(0)) / (P c_1), a polynomial root found by
//!   Newton's method from z = w (the Boltzmann value), then m_oc = x0 + ln z_oc;
//! * maximum power of one cell: d(m J)/dm = 0, i.e. h(z) + m z h'(z) = w, solved in
//!   y = ln z by Newton's method from the Boltzmann closed form s + ln s = ln w + 1 + x0
//!   (s = 1 + m, the asymptotic start of Lambert W), the current there
//!   J_mp = m P c_1 z h'(z) / ERE without cancellation;
//! * series maximum (De Vos, J. Phys. D 13, 839, 1980): with the common current J as the
//!   variable, each subcell's reduced voltage m_i(J) = x0_i + ln z_i(J) from
//!   h_i(z_i) = (T_i - ERE J) / (P c_1,i), and its first two derivatives in closed form;
//!   P(J) = (kT/q) J sum_i m_i(J) is concave, and dP/dJ = 0 is found by Newton's method
//!   kept inside the bracket (0, min_i Jsc_i), where no subcell is reverse biased; the maximum is the second-order Taylor
//!   maximum P + P'^2/(2|P''|) once a bound on the third-order remainder, |P'''| <=
//!   4 |P''| / (Jsc_i - J) (twice the Boltzmann limit's 2/(T_i/ERE - J), which is smaller),
//!   says it is within 1e-14 of P.
//!
//! Every solve either meets its error bound (the Newton step's predicted error below
//! 1e-14 relative) or returns `None`, and the caller falls back to the scalar path of
//! `junction` and `stack::series`; both are exact solutions of the same equations, and
//! they agree to about 1e-13 in efficiency (tests/stack.rs checks 1e-9 over a whole sweep
//! and map).
//!
//! Parallelism: [`fill_chunks`] and [`map_indexed`] hand out fixed chunks of a grid to
//! rayon's threads natively and run them in order on wasm32 (the page stays
//! single-threaded). Chunks are independent and each is computed exactly as it would be
//! alone, so the result is the same bit for bit whatever the number of threads.
//!
//! Architecture invariant: pure functions of SI numbers like the rest of `physics`; the
//! only outside crate is rayon, natively, for the thread pool; no allocation per grid point.

use super::constants::CHARGE;
use super::junction::{Cell, CellResult, Diode, JvModel, ThermalPrefactor};

/// The largest z = e^(m - x0) at open circuit that the series form takes: beyond it (gaps
/// of a few kT, or extreme concentration) the scalar path's polylogarithms are used.
pub const Z_LIMIT: f64 = 0.05;

/// The most series terms: at z <= [`Z_LIMIT`] the term a_k z^(k-1) < 0.05^(k-1) is below
/// 1e-17 of the sum from k = 15 on.
const MAX_TERMS: usize = 16;

/// 1/k for the series coefficients, k = 0..=MAX_TERMS (k = 0, 1 unused).
const INV_K: [f64; MAX_TERMS + 1] = {
    let mut t = [0.0; MAX_TERMS + 1];
    let mut k = 1;
    while k <= MAX_TERMS {
        t[k] = 1.0 / k as f64;
        k += 1;
    }
    t
};

/// Series terms below this fraction of the sum (which is at least 1) are dropped.
const TERM_TOL: f64 = 1e-18;

/// Relative error a solve must reach before it is accepted.
const SOLVE_TOL: f64 = 1e-14;

/// H0, H1 = (z H0)' = h', and z H0', z H1' of a cell's series at z (see the module doc).
#[derive(Debug, Clone, Copy)]
struct Series {
    h0: f64,
    h1: f64,
    zh0d: f64,
    zh1d: f64,
}

/// One gap's part of the exact J-V that does not depend on the light: the series
/// coefficients' scale and the radiative current at zero bias. (The default is a
/// placeholder for unused slots of fixed-size arrays, never solved.)
#[derive(Debug, Clone, Copy, Default)]
pub struct FastDiode {
    /// x0 = Eg/kT [-]
    x0: f64,
    /// 2 x0, x0^2 and 1/c_1 for the series coefficients a_k
    two_x0: f64,
    x0_sq: f64,
    inv_c1: f64,
    /// 1 for the Boltzmann model (first term only), [`MAX_TERMS`] for the exact law
    terms: usize,
    /// a_2 and 2 a_2^2 - a_3: the series reversion z = w - a_2 w^2 + (2 a_2^2 - a_3) w^3 + O(w^4)
    /// of h(z) = w that starts [`FastDiode::invert`] (both 0 for the Boltzmann model)
    rev2: f64,
    rev3: f64,
    /// P c_1 [A m^-2]
    pc1: f64,
    /// R(0) [A m^-2]
    r0: f64,
    /// ERE in (0, 1]
    ere: f64,
    /// kT/q [V]
    vt: f64,
}

impl FastDiode {
    /// The diode of a cell of gap `gap_j` [J] like `cell` (temperature, ERE <= 1, emission,
    /// model), with the prefactor `pre` of its temperature and emission; `None` where the
    /// series form does not apply (a gap so wide that R(0) underflows, or not a number).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn new(pre: &ThermalPrefactor, cell: &Cell, gap_j: f64) -> Option<FastDiode> {
        let kt = pre.thermal_energy();
        let x0 = gap_j / kt;
        if !(x0 > 1.0 && x0 < 700.0 && cell.ere > 0.0 && cell.ere <= 1.0) {
            return None;
        }
        let c1 = x0 * x0 + 2.0 * x0 + 2.0;
        let pc1 = pre.prefactor() * c1;
        let terms = match cell.model {
            JvModel::Exact => MAX_TERMS,
            JvModel::Boltzmann => 1,
        };
        let mut d = FastDiode {
            x0,
            two_x0: 2.0 * x0,
            x0_sq: x0 * x0,
            inv_c1: 1.0 / c1,
            terms,
            rev2: 0.0,
            rev3: 0.0,
            pc1,
            r0: 0.0,
            ere: cell.ere,
            vt: kt / CHARGE,
        };
        if terms > 1 {
            // a_k = (x0^2/k + 2 x0/k^2 + 2/k^3) / c_1
            let a2 = (x0 * x0 / 2.0 + x0 / 2.0 + 0.25) / c1;
            let a3 = (x0 * x0 / 3.0 + 2.0 * x0 / 9.0 + 2.0 / 27.0) / c1;
            d.rev2 = a2;
            d.rev3 = 2.0 * a2 * a2 - a3;
        }
        let z0 = (-x0).exp();
        d.r0 = pc1 * z0 * d.series(z0).h0;
        (pc1.is_finite() && pc1 > 0.0 && d.r0 > 0.0 && d.r0.is_finite()).then_some(d)
    }

    /// The series sums at z (0 <= z <= [`Z_LIMIT`]).
    #[inline]
    fn series(&self, z: f64) -> Series {
        let (mut h0, mut h1, mut zh0d, mut zh1d) = (1.0, 1.0, 0.0, 0.0);
        let mut zk = 1.0; // z^(k-1)
        for (k, &ik) in INV_K.iter().enumerate().take(self.terms + 1).skip(2) {
            zk *= z;
            // a_k z^(k-1) with a_k = (x0^2/k + 2 x0/k^2 + 2/k^3) / c_1
            let kf = k as f64;
            let t = zk * ik * (self.x0_sq + ik * (self.two_x0 + 2.0 * ik)) * self.inv_c1;
            h0 += t;
            h1 += kf * t;
            zh0d += (kf - 1.0) * t;
            zh1d += kf * (kf - 1.0) * t;
            if t < TERM_TOL {
                break;
            }
        }
        Series { h0, h1, zh0d, zh1d }
    }

    /// z with h(z) = w (0 < w <= [`Z_LIMIT`]), by Newton's method from the series
    /// reversion to third order (its error is O(w^4) relative to z, so at a working point,
    /// w below about 1e-3, the first step is already accepted), with the series at the last
    /// point evaluated. h is increasing and convex with h'' about 2 a_2 < 1, so after a
    /// Newton step s the error is below s^2/z: a step under 1e-8 z leaves less than 1e-16 z.
    #[inline]
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    fn invert(&self, w: f64) -> Option<(f64, Series)> {
        let start = w * (1.0 - w * (self.rev2 - w * self.rev3));
        let mut z = if start > 0.0 && start <= w { start } else { w };
        for _ in 0..40 {
            let s = self.series(z);
            let step = (z * s.h0 - w) / s.h1;
            z -= step;
            if step.abs() <= 1e-8 * z {
                return Some((z, s));
            }
            if !(z > 0.0) {
                return None;
            }
        }
        None
    }

    /// The open-circuit level w = (ERE Jsc + R(0)) / (P c_1) for photocurrent `jsc`
    /// [A m^-2], if the series form applies to this cell there.
    #[inline]
    fn level(&self, jsc: f64) -> Option<(f64, f64)> {
        let target = self.ere * jsc + self.r0; // [A m^-2]
        let w = target / self.pc1;
        (jsc > 0.0 && jsc.is_finite() && w > 0.0 && w <= Z_LIMIT).then_some((target, w))
    }

    /// The cell's figures at photocurrent `jsc` [A m^-2] under incident power `input`
    /// [W m^-2], or `None` where the series form does not reach its error bound (the caller
    /// then uses [`Diode::solve`], which solves the same equations).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn solve(&self, gap_j: f64, jsc: f64, input: f64) -> Option<CellResult> {
        let (_, w) = self.level(jsc)?;
        let (z_oc, _) = self.invert(w)?;
        let m_oc = self.x0 + z_oc.ln();
        if !(m_oc > 0.0) {
            return None;
        }
        let ln_w = w.ln();
        // Boltzmann start: s + ln s = Y with s = 1 + m, Y = ln w + 1 + x0 (= 1 + m_oc in the
        // Boltzmann limit); the asymptotic form of Lambert W, s = Y - ln Y + ln Y / Y
        let big_y = ln_w + 1.0 + self.x0;
        if !(big_y > 1.5) {
            return None;
        }
        let ln_y = big_y.ln();
        let mut y = (big_y - ln_y + ln_y / big_y) - 1.0 - self.x0; // y = ln z = m - x0
                                                                   // Newton on F(y) = y + ln(H0 + m H1) - ln w = 0, F increasing and nearly linear
        for _ in 0..20 {
            let z = y.exp();
            let s = self.series(z);
            let m = self.x0 + y;
            let d = s.h0 + m * s.h1;
            let f = y + d.ln() - ln_w;
            let f1 = 1.0 + (s.zh0d + s.h1 + m * s.zh1d) / d;
            let step = f / f1;
            // F'' is about -1/(1 + m)^2: the error left after this step
            let left = 0.5 * step * step / ((1.0 + m) * (1.0 + m) * f1);
            if left <= SOLVE_TOL * m.abs().max(1.0) && step.abs() < 1e-3 {
                let m_mp = m - step;
                // z and h'(z) at the root by Taylor's rule from this evaluation
                let e = -step;
                let z_mp = z * (1.0 + e * (1.0 + 0.5 * e * (1.0 + e / 3.0)));
                let h1 = s.h1 + s.zh1d * e;
                return finish(gap_j, jsc, input, self.vt, m_oc, m_mp, m_mp * self.pc1 * z_mp * h1 / self.ere);
            }
            y -= step;
            if !y.is_finite() {
                return None;
            }
        }
        None
    }
}

/// A cell's figures from its reduced open-circuit and maximum-power voltages and the
/// current there, the same checks and formulas as [`Diode::solve`].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn finish(gap_j: f64, jsc: f64, input: f64, vt: f64, m_oc: f64, m_mp: f64, jmp: f64) -> Option<CellResult> {
    if !(m_mp > 0.0 && m_mp < m_oc && jmp.is_finite()) {
        return None;
    }
    let voc = m_oc * vt;
    let vmp = m_mp * vt;
    let jmp = jmp.clamp(0.0, jsc);
    let pmax = vmp * jmp;
    let ff = if voc > 0.0 { pmax / (voc * jsc) } else { 0.0 };
    let efficiency = if input > 0.0 { pmax / input } else { 0.0 };
    Some(CellResult { gap_j, jsc, voc, ff, vmp, jmp, pmax, input, efficiency })
}

/// A subcell of a series stack for [`series_max_power`]: its diode and its photocurrent
/// [A m^-2].
#[derive(Debug, Clone, Copy, Default)]
pub struct SeriesCell {
    pub diode: FastDiode,
    pub jsc: f64,
}

/// Most subcells [`series_max_power`] takes.
const MAX_CELLS: usize = super::stack::MAX_JUNCTIONS;

/// The series maximum of `cells` (all at one temperature): (power [W m^-2], current
/// [A m^-2]), Newton's method on dP/dJ started at `start` [A m^-2] when it is inside the
/// bracket (e.g. the current of a neighbouring point of a map). `None` where the series
/// form does not apply or the error bound is not met: the caller then uses
/// `stack::series`, which solves the same problem.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn series_max_power(cells: &[SeriesCell], start: f64) -> Option<(f64, f64)> {
    let n = cells.len();
    if n == 0 || n > MAX_CELLS {
        return None;
    }
    let mut target = [0.0; MAX_CELLS];
    let mut hi = f64::INFINITY;
    let mut m0 = 0.0; // sum of the Boltzmann open-circuit reduced voltages, an upper bound
    for (i, c) in cells.iter().enumerate() {
        let (t, w) = c.diode.level(c.jsc)?;
        target[i] = t;
        // the series problem of `stack::series`: no subcell driven into reverse bias, so
        // J < min_i Jsc_i (where a gap is a few kT wide and R(0) rivals Jsc, a reverse-biased
        // limiting cell could pass up to Jsc + R(0)/ERE; that operating range is excluded)
        hi = hi.min(c.jsc);
        if !(start > 0.0 && start < hi) {
            m0 += c.diode.x0 + w.ln();
        }
    }
    if !hi.is_finite() {
        return None;
    }
    let vt = cells[0].diode.vt;
    // (M, M', M'') at current j: the sum of reduced voltages and its derivatives in J
    let eval = |j: f64| -> Option<(f64, f64, f64)> {
        let (mut m, mut m1, mut m2) = (0.0, 0.0, 0.0);
        for (i, c) in cells.iter().enumerate() {
            let d = &c.diode;
            let w = (target[i] - d.ere * j) / d.pc1;
            if !(w > 0.0) {
                return None;
            }
            let (z, s) = d.invert(w)?;
            // m = x0 + ln z; dz/dJ = -q/h'(z) with q = ERE/(P c_1)
            let q = d.ere / d.pc1;
            let zh1 = z * s.h1;
            m += d.x0 + z.ln();
            m1 -= q / zh1;
            m2 -= q * q * (s.h1 + s.zh1d) / (zh1 * zh1 * s.h1);
        }
        Some((m, m1, m2))
    };
    let (mut lo, mut up) = (0.0, hi);
    // Boltzmann start: for a limiting cell in series with a constant voltage,
    // J / (J_hi - J) = M, i.e. J = J_hi M / (1 + M)
    let mut j = if start > 0.0 && start < hi { start } else { hi * m0.max(1.0) / (1.0 + m0.max(1.0)) };
    for _ in 0..60 {
        let Some((m, m1, m2)) = eval(j) else {
            // beyond the last subcell's open circuit: the maximum lies below
            up = j;
            j = 0.5 * (lo + up);
            continue;
        };
        let g = m + j * m1; // dP/dJ / (kT/q), decreasing
        let g1 = 2.0 * m1 + j * m2;
        if g > 0.0 {
            lo = j;
        } else {
            up = j;
        }
        if g1 < 0.0 && g1.is_finite() {
            let step = g / g1;
            // The maximum of P's Taylor polynomial to second order, P + P'^2 / (2 |P''|),
            // misses the maximum by at most |P'''| |step|^3 / 6. Each subcell adds
            // (kT/q)(2 m' + J m'') to P'' and (kT/q)(3 m'' + J m''') to P''', and with
            // m = const + ln(d_i), d_i = T_i/ERE - J (the Boltzmann limit), the second is at
            // most 2/d_i times the first; we take 4/d with d the smallest d_i less the
            // step (twice the bound, for the Bose terms' few-per-cent share and the
            // interval between J and the root).
            let d = hi - j - step.abs();
            let p = vt * (j * m - 0.5 * g * step);
            let cubic = 4.0 * vt * (-g1) * (step * step * step).abs() / (6.0 * d);
            if d > 10.0 * step.abs() && cubic <= SOLVE_TOL * p && p > 0.0 {
                return Some((p, j - step));
            }
            let next = j - step;
            if next > lo && next < up {
                j = next;
                continue;
            }
        }
        if up - lo <= 1e-15 * up {
            return None;
        }
        j = 0.5 * (lo + up);
    }
    None
}

/// Solve the cell `template` (its gap ignored, ERE at most 1) at every gap of `gaps_j` [J]
/// with photocurrents `jsc` [A m^-2]: the series form where it applies, the scalar
/// [`Diode::solve`] elsewhere. Every core natively.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn solve_cells(template: &Cell, gaps_j: &[f64], jsc: &[f64], input: f64) -> Vec<CellResult> {
    let valid = template.temp_k > 0.0 && template.ere > 0.0;
    let cell = Cell { ere: template.ere.min(1.0), ..*template };
    let pre = ThermalPrefactor::new(cell.temp_k, cell.emission);
    let mut out = vec![CellResult::default(); gaps_j.len()];
    fill_chunks(&mut out, 2048, |first, part| {
        for (k, r) in part.iter_mut().enumerate() {
            let (g, j) = (gaps_j[first + k], jsc[first + k]);
            *r = if !(g > 0.0) || !g.is_finite() || !valid {
                CellResult { gap_j: g, input, ..Default::default() }
            } else {
                FastDiode::new(&pre, &cell, g)
                    .and_then(|d| d.solve(g, j, input))
                    .unwrap_or_else(|| Diode::with_prefactor(&pre, &Cell { gap_j: g, ..cell }, j).solve(g, input))
            };
        }
    });
    out
}

/// Fill `out` in chunks of `chunk` elements: `f(first, part)` fills `part`, which starts at
/// index `first` of `out`. Natively the chunks go to every core; on wasm32 they run in
/// order. A grid no longer than one chunk is filled on the calling thread.
pub fn fill_chunks<T: Send>(out: &mut [T], chunk: usize, f: impl Fn(usize, &mut [T]) + Sync + Send) {
    let chunk = chunk.max(1);
    #[cfg(not(target_arch = "wasm32"))]
    if out.len() > chunk {
        use rayon::prelude::*;
        out.par_chunks_mut(chunk).enumerate().for_each(|(c, part)| f(c * chunk, part));
        return;
    }
    for (c, part) in out.chunks_mut(chunk).enumerate() {
        f(c * chunk, part);
    }
}

/// `f(i)` for every i in 0..n, in order: natively on every core (when n > 1), on wasm32 in
/// turn. `f` must not depend on the order of the calls.
pub fn map_indexed<T: Send + Clone + Default>(n: usize, f: impl Fn(usize) -> T + Sync + Send) -> Vec<T> {
    let mut out = vec![T::default(); n];
    fill_chunks(&mut out, 1, |i, part| {
        if let Some(slot) = part.first_mut() {
            *slot = f(i);
        }
    });
    out
}
