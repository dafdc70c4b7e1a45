//! The fast path for cells of a real absorber ([`super::silicon`]): everything that does not
//! depend on the thickness is integrated once per light and temperature, so a thickness
//! sweep, a drag of the thickness control or a stack optimizer costs one pass over the
//! absorption table per evaluation.
//!
//! The absorptance a(E) is piecewise linear in photon energy E between the refined table
//! points x_k ([`RealAbsorber::refined`]), exactly as the table absorptance of
//! `RealAbsorber::absorptance` that the scalar path (`absorber::photocurrent`,
//! `absorber::ln_dark_current`) integrates. On interval k with t = (E - x_k)/(x_(k+1) - x_k):
//!
//!   Jsc = q X sum_k [ a_k S0_k + a_(k+1) S1_k ],  S0_k = integral (1 - t) Phi_src dE,
//!   S1_k = integral t Phi_src dE (`absorber::hat_moments`, the source's own
//!   quadrature);
//!
//!   J0_rad = q g (2 pi / h^3 c^2) e^(-E_ref/kT) sum_k [ a_k B0_k + a_(k+1) B1_k ],
//!   B_k = integral (1 - t or t) E^2 e^(-(E - E_ref)/kT) / (1 - e^(-E/kT)) dE,
//!
//! by 4-point Gauss-Legendre on panels no wider than kT/4 (on a panel of kT/4 the rule's
//! error for e^(-E/kT) is below 1e-10 relative; the table path, `absorber::ln_dark_current`,
//! uses 8 points on kT/2), scaled by E_ref (the lowest table energy) so nothing
//! underflows. The J-V equations and the maximum power point are those of `solve_real`.
//!
//! A cell under other cells (the bottom of a stack) sees only photons below the gap above
//! it: [`RealCellModel::diode`] takes that upper edge and integrates the interval it cuts
//! on the fly.
//!
//! Architecture invariant: pure functions of SI numbers; no NaN for any finite input.

use super::absorber::hat_moments;
use super::constants::{thermal_energy, CHARGE, PHOTON_FLUX_PREFACTOR};
use super::junction::Illumination;
use super::silicon::{silicon_ni, trapped_absorptance, Doping, RealAbsorber, RealCellResult, RichterAuger, Trapping};

/// 4-point Gauss-Legendre on [-1, 1], half the nodes (symmetric; A&S table 25.4, n = 4).
const GL4_X: [f64; 2] = [0.339_981_043_584_856_3, 0.861_136_311_594_052_6];
const GL4_W: [f64; 2] = [0.652_145_154_862_546_1, 0.347_854_845_137_453_9];

/// A real absorber's cell under one light at one temperature, ready for any thickness.
#[derive(Debug, Clone)]
pub struct RealCellModel {
    light: Illumination,
    /// refined photon energies [J], ascending, with alpha [m^-1] and n there
    grid: Vec<f64>,
    alpha: Vec<f64>,
    index: Vec<f64>,
    /// per interval: q X S0_k, q X S1_k [A m^-2]
    sun0: Vec<f64>,
    sun1: Vec<f64>,
    /// per interval: B0_k, B1_k scaled by e^(E_ref/kT) [J^3]
    bb0: Vec<f64>,
    bb1: Vec<f64>,
    /// ln of q g (2 pi / h^3 c^2) e^(-E_ref/kT) [ln(A m^-2 J^-3)]
    ln_bb_scale: f64,
    kt: f64,
    ni: f64,
    n0: f64,
    p0: f64,
    auger: bool,
    input: f64,
}

/// One real-absorber diode at one thickness: J(V) = Jsc + extra - J_rad(V) - J_Auger(V).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RealDiode {
    /// photocurrent [A m^-2]
    pub jsc: f64,
    /// ln of the radiative dark current [ln(A m^-2)]
    pub ln_j0: f64,
    thickness_m: f64,
    kt: f64,
    ni: f64,
    n0: f64,
    p0: f64,
    /// silicon's Auger recombination, if included
    auger: Option<RichterAuger>,
}

impl RealDiode {
    /// (radiative, Auger) recombination currents [A m^-2] at voltage `v` [V].
    pub fn recombination(&self, v: f64) -> (f64, f64) {
        let x = (CHARGE * v / self.kt).min(700.0);
        let rad = (self.ln_j0 + x).exp() - self.ln_j0.exp();
        let aug = match &self.auger {
            Some(r) => {
                // dn from (n0 + dn)(p0 + dn) = ni^2 e^x, in the cancellation-free form
                let s = self.n0 + self.p0;
                let c = self.ni * self.ni * x.exp_m1();
                let dn = 2.0 * c / (s + (s * s + 4.0 * c).max(0.0).sqrt());
                CHARGE * self.thickness_m * r.rate(dn)
            }
            None => 0.0,
        };
        let ok = |r: f64| if r.is_finite() { r } else { f64::MAX };
        (ok(rad), ok(aug))
    }

    /// J(V) [A m^-2] with `extra` photocurrent [A m^-2] (luminescent coupling) added.
    pub fn current(&self, v: f64, extra: f64) -> f64 {
        let (r, a) = self.recombination(v);
        self.jsc + extra - r - a
    }

    /// The voltage [V] where J(V) = `j` [A m^-2] with `extra` photocurrent, on [-0.5, 3] V
    /// (J falls monotonically with V). For V > 0 the root of ln R(V) = ln(Jsc + extra - j),
    /// R the recombination current, nearly linear in V, by the Illinois variant of regula
    /// falsi (Dowell & Jarratt, BIT 11, 168 (1971)) to 1e-14 in ln R (a relative current
    /// error of 1e-14); near and below 0 V by bisection to 1e-13 V.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn voltage_at(&self, j: f64, extra: f64) -> f64 {
        const LOW: f64 = 1e-9;
        let target = self.jsc + extra - j;
        let f = |v: f64| self.current(v, extra) - j;
        if !(target > 0.0) || !(f(LOW) > 0.0) {
            let (mut a, mut b) = (-0.5, LOW);
            for _ in 0..200 {
                let m = 0.5 * (a + b);
                if f(m) > 0.0 {
                    a = m;
                } else {
                    b = m;
                }
                if b - a < 1e-13 {
                    break;
                }
            }
            return 0.5 * (a + b);
        }
        let ln_target = target.ln();
        let g = |v: f64| {
            let (r, a) = self.recombination(v);
            (r + a).max(f64::MIN_POSITIVE).ln() - ln_target
        };
        let (mut a, mut b) = (LOW, 3.0);
        let (mut ga, mut gb) = (g(a), g(b));
        if !(gb > 0.0) {
            return b;
        }
        if !(ga < 0.0) {
            return a;
        }
        let mut side = 0i8;
        for _ in 0..200 {
            let c = {
                let c = (a * gb - b * ga) / (gb - ga);
                if c > a && c < b {
                    c
                } else {
                    0.5 * (a + b)
                }
            };
            let gc = g(c);
            if gc.abs() < 1e-14 || b - a < 1e-13 {
                return c;
            }
            if gc < 0.0 {
                a = c;
                ga = gc;
                if side == -1 {
                    gb *= 0.5;
                }
                side = -1;
            } else {
                b = c;
                gb = gc;
                if side == 1 {
                    ga *= 0.5;
                }
                side = 1;
            }
        }
        0.5 * (a + b)
    }

    /// The cell alone at its maximum power point, with `extra` photocurrent [A m^-2]:
    /// Voc by bisection, then golden section on V J(V) to 1e-12 V. `input` is the incident
    /// power [W m^-2].
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn solve(&self, extra: f64, input: f64) -> RealCellResult {
        let jsc = self.jsc + extra;
        if !(jsc > 0.0) {
            return RealCellResult::default();
        }
        let voc = self.voltage_at(0.0, extra).max(0.0);
        let (vmp, _) = super::special::golden_max(|v: f64| v * self.current(v, extra), |p| *p, 0.0, voc, 1e-12);
        let jmp = self.current(vmp, extra).max(0.0);
        let (r, au) = self.recombination(vmp);
        RealCellResult {
            jsc,
            voc,
            vmp,
            jmp,
            efficiency: if input > 0.0 { vmp * jmp / input } else { 0.0 },
            j_radiative_mpp: r,
            j_auger_mpp: au,
        }
    }
}

impl RealCellModel {
    /// The model of `material` (its thickness unused) under `light` at `temp_k` [K] with
    /// `doping`; silicon's Auger recombination when `auger`. The cell emits through its
    /// front only (the light-trapping models have a mirror behind the absorber).
    pub fn new(material: &RealAbsorber, light: &Illumination, temp_k: f64, doping: Doping, auger: bool) -> Self {
        let temp_k = if temp_k.is_finite() && temp_k > 0.0 { temp_k } else { 300.0 };
        let (grid, alpha, index) = material.refined();
        let kt = thermal_energy(temp_k);
        let q_x = CHARGE * light.concentration;
        let intervals = grid.len().saturating_sub(1);
        let (sun0, sun1) = hat_moments(&light.source, &grid);
        let sun0: Vec<f64> = sun0.into_iter().map(|v| q_x * v).collect();
        let sun1: Vec<f64> = sun1.into_iter().map(|v| q_x * v).collect();
        let (mut bb0, mut bb1) = (Vec::with_capacity(intervals), Vec::with_capacity(intervals));
        let e_ref = grid.first().copied().unwrap_or(0.0);
        for w in grid.windows(2) {
            let (a, b) = (w[0], w[1]);
            let t = |e: f64| ((e - a) / (b - a)).clamp(0.0, 1.0);
            let (mut s0, mut s1) = (0.0, 0.0);
            let panels = (((b - a) / (0.25 * kt)).ceil() as usize).clamp(1, 10_000);
            for p in 0..panels {
                let pa = a + (b - a) * p as f64 / panels as f64;
                let pb = a + (b - a) * (p + 1) as f64 / panels as f64;
                let (mid, half) = (0.5 * (pa + pb), 0.5 * (pb - pa));
                for (x, wt) in GL4_X.iter().zip(GL4_W) {
                    for e in [mid - half * x, mid + half * x] {
                        let f = e * e * (-(e - e_ref) / kt).exp() / -(-e / kt).exp_m1();
                        let f = if f.is_finite() { f * half * wt } else { 0.0 };
                        s0 += (1.0 - t(e)) * f;
                        s1 += t(e) * f;
                    }
                }
            }
            bb0.push(s0);
            bb1.push(s1);
        }
        let ln_bb_scale = (CHARGE * PHOTON_FLUX_PREFACTOR).ln() - e_ref / kt;
        let ni = silicon_ni(temp_k);
        let (n0, p0) = match doping {
            Doping::Undoped => (ni, ni),
            Doping::NType(d) => (d.max(ni), ni * ni / d.max(ni)),
            Doping::PType(d) => (ni * ni / d.max(ni), d.max(ni)),
        };
        RealCellModel {
            light: light.clone(),
            grid,
            alpha,
            index,
            sun0,
            sun1,
            bb0,
            bb1,
            ln_bb_scale,
            kt,
            ni,
            n0,
            p0,
            auger,
            input: light.input_power(),
        }
    }

    /// Incident power [W m^-2].
    pub fn input_power(&self) -> f64 {
        self.input
    }

    /// The lowest photon energy the absorber's table covers [J] (its absorption edge for
    /// the purpose of ordering it under other cells).
    pub fn lowest_energy_j(&self) -> f64 {
        self.grid.first().copied().unwrap_or(0.0)
    }

    /// The absorptance at the refined points for thickness `thickness_m` [m] and `trapping`.
    pub fn absorptance(&self, thickness_m: f64, trapping: Trapping) -> Vec<f64> {
        self.alpha.iter().zip(&self.index).map(|(&al, &n)| trapped_absorptance(al, n, thickness_m, trapping)).collect()
    }

    /// The absorption edge [J]: the lowest refined point where the absorptance reaches half
    /// its largest value (the gap a reader compares with a step cell's).
    pub fn edge_j(&self, thickness_m: f64, trapping: Trapping) -> f64 {
        let a = self.absorptance(thickness_m, trapping);
        let half = 0.5 * a.iter().copied().fold(0.0, f64::max);
        a.iter().position(|&v| v >= half && v > 0.0).map_or(0.0, |i| self.grid[i])
    }

    /// (photon energy [J], absorptance) at the refined points.
    pub fn absorptance_curve(&self, thickness_m: f64, trapping: Trapping) -> Vec<(f64, f64)> {
        self.grid.iter().copied().zip(self.absorptance(thickness_m, trapping)).collect()
    }

    /// The diode of thickness `thickness_m` [m] with `trapping`, seeing only photons below
    /// `upper_j` [J] (infinity when nothing is above it).
    pub fn diode(&self, thickness_m: f64, trapping: Trapping, upper_j: f64) -> RealDiode {
        let w = if thickness_m.is_finite() { thickness_m.max(0.0) } else { 0.0 };
        let a = self.absorptance(w, trapping);
        let mut jsc = 0.0;
        let mut bb = 0.0;
        for k in 0..self.sun0.len() {
            bb += a[k] * self.bb0[k] + a[k + 1] * self.bb1[k];
            let (lo, hi) = (self.grid[k], self.grid[k + 1]);
            if hi <= upper_j {
                jsc += a[k] * self.sun0[k] + a[k + 1] * self.sun1[k];
            } else if lo < upper_j {
                // a is linear on [lo, hi]; the moments of [lo, upper] give its integral there:
                // integral Phi = S0' + S1', integral (E - lo) Phi = (upper - lo) S1'
                let (m0, m1) = hat_moments(&self.light.source, &[lo, upper_j]);
                let (s0, s1) = (m0[0], m1[0]);
                let slope = (a[k + 1] - a[k]) * (upper_j - lo) / (hi - lo);
                jsc += CHARGE * self.light.concentration * (a[k] * (s0 + s1) + slope * s1);
            }
        }
        let ln_j0 = if bb > 0.0 { self.ln_bb_scale + bb.ln() } else { f64::NEG_INFINITY };
        RealDiode {
            jsc: if jsc.is_finite() { jsc.max(0.0) } else { 0.0 },
            ln_j0,
            thickness_m: w,
            kt: self.kt,
            ni: self.ni,
            n0: self.n0,
            p0: self.p0,
            auger: self.auger.then(|| RichterAuger::new(self.n0, self.p0)),
        }
    }

    /// The single cell of thickness `thickness_m` [m] with `trapping`.
    pub fn solve(&self, thickness_m: f64, trapping: Trapping) -> RealCellResult {
        self.diode(thickness_m, trapping, f64::INFINITY).solve(0.0, self.input)
    }

    /// The cell at every thickness of `thicknesses_m` [m] (on every core natively).
    pub fn sweep(&self, thicknesses_m: &[f64], trapping: Trapping) -> Vec<RealCellResult> {
        super::batch::map_indexed(thicknesses_m.len(), |i| self.solve(thicknesses_m[i], trapping))
    }

    /// The most efficient thickness [m] between `from_m` and `to_m` [m] (golden section
    /// on ln W to 1e-6 relative, after a 24-point scan that brackets the best point).
    pub fn best_thickness(&self, from_m: f64, to_m: f64, trapping: Trapping) -> (f64, RealCellResult) {
        let (lo, hi) = (from_m.max(1e-9).ln(), to_m.max(from_m.max(1e-9)).ln());
        let eval = |u: f64| self.solve(u.exp(), trapping);
        let scan = 24;
        let mut best = (0usize, f64::NEG_INFINITY);
        for i in 0..=scan {
            let e = eval(lo + (hi - lo) * i as f64 / scan as f64).efficiency;
            if e > best.1 {
                best = (i, e);
            }
        }
        let step = (hi - lo) / scan as f64;
        let a = (lo + step * best.0.saturating_sub(1) as f64).max(lo);
        let b = (lo + step * (best.0 + 1) as f64).min(hi);
        let (u, r) = super::special::golden_max(eval, |r| r.efficiency, a, b, 1e-6);
        (u.exp(), r)
    }
}
