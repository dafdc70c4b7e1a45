//! Single-junction detailed balance (Shockley & Queisser, J. Appl. Phys. 32, 510, 1961).
//!
//! A cell with a step absorptance at its band gap Eg absorbs every incident photon above Eg
//! and, by detailed balance, emits as a black body above Eg at the cell temperature Tc with
//! photon chemical potential qV (Wurfel, J. Phys. C 15, 3967, 1982):
//!
//! * short-circuit current  Jsc = q X integral_{Eg}^inf Phi_src(E) dE          [A m^-2]
//! * radiative current      R(V) = q g integral_{Eg}^inf phi(E; Tc, qV) dE     [A m^-2]
//!   with phi the hemispherical generalized Planck photon flux per unit energy and g the
//!   number of emitting faces (1: perfect back mirror; 2: both faces emit),
//! * J(V) = Jsc - (R(V) - R(0)) / ERE, ERE in (0, 1] the external radiative efficiency
//!   (non-radiative recombination scales the dark current by 1/ERE; Green, Prog.
//!   Photovolt. 20, 472, 2012, eq. 3).
//!
//! R(V) has the closed form q g 2 pi (kTc)^3 / (h^3 c^2) * G_2(x0, m) with x0 = Eg/kTc and
//! m = qV/kTc (see `special::scaled_bose2`), evaluated in logarithms. The Boltzmann
//! approximation keeps the first term of its series, R_B(V) = R_B(0) e^m, whose maximum
//! power point is closed-form through the Lambert W function:
//! V_mp = (kTc/q) (W(e (1 + Jsc/J0)) - 1), J0 = R_B(0)/ERE.
//!
//! The exact open-circuit voltage and maximum power point come from Newton's method on
//! monotone functions of m, started from the Boltzmann closed forms, kept inside a bracket
//! that always holds the root, and falling back to bisection whenever a step would leave it.

use super::constants::{thermal_energy, CHARGE, PHOTON_FLUX_PREFACTOR};
use super::sources::Source;
use super::special::{lambert_w_of_exp, lambert_w_of_exp_rough, scaled_bose2};

/// Which faces of the cell emit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Emission {
    /// The front face only (a perfect mirror behind the cell). Default.
    #[default]
    Front,
    /// Both faces (no back mirror): twice the radiative current.
    Both,
}

impl Emission {
    /// The number of emitting faces g (dimensionless): 1 or 2.
    pub fn faces(self) -> f64 {
        match self {
            Emission::Front => 1.0,
            Emission::Both => 2.0,
        }
    }
}

/// How the J-V curve is computed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum JvModel {
    /// The generalized Planck law with chemical potential qV. Default.
    #[default]
    Exact,
    /// The Boltzmann approximation exp((E - qV)/kT) >> 1.
    Boltzmann,
}

/// An ideal single-junction cell.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Cell {
    /// band gap [J]
    pub gap_j: f64,
    /// cell temperature [K]
    pub temp_k: f64,
    /// external radiative efficiency, in (0, 1] (dimensionless)
    pub ere: f64,
    pub emission: Emission,
    pub model: JvModel,
}

impl Cell {
    /// A cell at 300 K in the radiative limit, front emission, exact J-V.
    pub fn ideal(gap_j: f64) -> Cell {
        Cell { gap_j, temp_k: 300.0, ere: 1.0, emission: Emission::Front, model: JvModel::Exact }
    }
}

/// The figures of merit of one cell under one illumination. SI units.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct CellResult {
    /// band gap [J]
    pub gap_j: f64,
    /// short-circuit current density [A m^-2]
    pub jsc: f64,
    /// open-circuit voltage [V]
    pub voc: f64,
    /// fill factor Pmax / (Voc Jsc) (dimensionless)
    pub ff: f64,
    /// voltage at the maximum power point [V]
    pub vmp: f64,
    /// current density at the maximum power point [A m^-2]
    pub jmp: f64,
    /// maximum power density [W m^-2]
    pub pmax: f64,
    /// incident power density (concentration included) [W m^-2]
    pub input: f64,
    /// Pmax / input (dimensionless)
    pub efficiency: f64,
}

/// The temperature-dependent prefactor of the radiative current, shared by every gap of a
/// sweep: ln of q g 2 pi (kT)^3 / (h^3 c^2) [A m^-2].
#[derive(Debug, Clone, Copy)]
pub struct ThermalPrefactor {
    kt: f64,
    ln_prefactor: f64,
}

impl ThermalPrefactor {
    /// The prefactor for cells at `temp_k` [K] emitting through `emission`'s faces.
    pub fn new(temp_k: f64, emission: Emission) -> ThermalPrefactor {
        let kt = thermal_energy(temp_k);
        let ln_prefactor = (emission.faces() * CHARGE * PHOTON_FLUX_PREFACTOR * kt * kt * kt).ln();
        ThermalPrefactor { kt, ln_prefactor }
    }

    /// kT [J].
    pub fn thermal_energy(&self) -> f64 {
        self.kt
    }

    /// q g 2 pi (kT)^3 / (h^3 c^2) [A m^-2].
    pub fn prefactor(&self) -> f64 {
        self.ln_prefactor.exp()
    }
}

/// ln R and its first three derivatives with respect to m = qV/kT.
#[derive(Debug, Clone, Copy)]
struct LnRad {
    ln_r: f64,
    d1: f64,
    d2: f64,
    d3: f64,
}

/// The radiative diode of a cell: everything needed to evaluate J(V) quickly.
#[derive(Debug, Clone, Copy)]
pub struct Diode {
    kt: f64,
    x0: f64,
    ln_prefactor: f64,
    /// ln R_B(0), the Boltzmann (first series term) radiative current at zero bias
    ln_rb0: f64,
    ere: f64,
    jsc: f64,
    /// ln(ERE Jsc + R(0)): the level R(V) reaches at open circuit
    ln_target: f64,
    ln_r0: f64,
    /// R(0) [A m^-2] when it is comfortably inside the range of doubles (the fast, direct
    /// forms below use it), else 0 (the logarithmic forms are used)
    r0: f64,
    model: JvModel,
}

/// ln R(0) inside this range keeps R(0) and the sums formed with it far from overflow and
/// underflow.
const DIRECT_LN_R0: f64 = 600.0;

impl Diode {
    /// `jsc` [A m^-2] is the photocurrent the cell collects.
    pub fn new(cell: &Cell, jsc: f64) -> Diode {
        Diode::with_prefactor(&ThermalPrefactor::new(cell.temp_k, cell.emission), cell, jsc)
    }

    /// As [`Diode::new`] with the temperature prefactor computed once for many gaps.
    pub fn with_prefactor(pre: &ThermalPrefactor, cell: &Cell, jsc: f64) -> Diode {
        let kt = pre.kt;
        let x0 = cell.gap_j / kt;
        let ln_rb0 = pre.ln_prefactor - x0 + (x0 * x0 + 2.0 * x0 + 2.0).ln();
        let mut d = Diode {
            kt,
            x0,
            ln_prefactor: pre.ln_prefactor,
            ln_rb0,
            ere: cell.ere,
            jsc,
            ln_target: 0.0,
            ln_r0: ln_rb0,
            r0: 0.0,
            model: cell.model,
        };
        if cell.model == JvModel::Exact {
            d.ln_r0 = d.ln_r(0.0).ln_r;
        }
        if d.ln_r0.abs() < DIRECT_LN_R0 {
            d.r0 = d.ln_r0.exp();
        }
        d.ln_target = ln_target(d.ere * jsc, d.ln_r0);
        d
    }

    /// ln R at reduced voltage m = qV/kT (dimensionless), with its derivatives in m: the
    /// closed form R = q g 2 pi (kT)^3 / (h^3 c^2) G_2(Eg/kT, m) of the module docs, or its
    /// first series term R_B(0) e^m.
    #[inline]
    fn ln_r(&self, m: f64) -> LnRad {
        match self.model {
            JvModel::Exact => {
                let a = self.x0 - m;
                let g = scaled_bose2(self.x0, a);
                let inv = 1.0 / g.value;
                let rho = g.d1 * inv;
                let d2 = g.d2 * inv - rho * rho;
                let d3 = g.d3 * inv - 3.0 * rho * d2 - rho * rho * rho;
                LnRad { ln_r: self.ln_prefactor - a + g.value.ln(), d1: rho, d2, d3 }
            }
            JvModel::Boltzmann => LnRad { ln_r: self.ln_rb0 + m, d1: 1.0, d2: 0.0, d3: 0.0 },
        }
    }

    /// Volts [V] of reduced voltage `m` (dimensionless): V = m kT / q.
    fn volts(&self, m: f64) -> f64 {
        m * self.kt / CHARGE
    }

    /// Current density J(V) = Jsc - (R(V) - R(0)) / ERE [A m^-2] at voltage `v` [V] (module
    /// docs: Shockley & Queisser 1961, Wurfel 1982). For V at or beyond the band gap
    /// (where the exact law has its pole) it returns -infinity, never NaN.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn current(&self, v: f64) -> f64 {
        let m = v * CHARGE / self.kt;
        if self.model == JvModel::Exact && !(m < self.x0) {
            return f64::NEG_INFINITY;
        }
        let lr = self.ln_r(m).ln_r;
        // (R - R0)/ERE computed as R0 (e^(lnR - lnR0) - 1)/ERE, accurate near V = 0
        let excess = self.ln_r0.exp() * (lr - self.ln_r0).exp_m1();
        self.jsc - excess / self.ere
    }

    /// Reduced open-circuit voltage m_oc = qVoc/kT (dimensionless): the root of
    /// R(m) = ERE Jsc + R(0), i.e. J = 0.
    fn open_circuit_m(&self) -> f64 {
        let boltzmann = self.ln_target - self.ln_rb0;
        match self.model {
            JvModel::Boltzmann => boltzmann.max(0.0),
            JvModel::Exact => {
                // G(m) = lnR(m) - ln_target is increasing; the root lies in (0, x0)
                let g = |m: f64| {
                    let r = self.ln_r(m);
                    (r.ln_r - self.ln_target, r.d1, r.d2)
                };
                safeguarded_newton(g, 0.0, self.x0, boltzmann, 1e-15).0
            }
        }
    }

    /// Reduced maximum-power voltage (dimensionless) and the current there [A m^-2], given
    /// m_oc (dimensionless).
    fn max_power(&self, m_oc: f64) -> (f64, f64) {
        // Boltzmann closed form: e^m (1 + m) = 1 + Jsc/J0 = target / R_B(0)
        let l = self.ln_target - self.ln_rb0;
        let w = match self.model {
            JvModel::Boltzmann => lambert_w_of_exp(1.0 + l),
            JvModel::Exact => lambert_w_of_exp_rough(1.0 + l), // only a start for Newton
        };
        let boltzmann = (w - 1.0).clamp(0.0, m_oc);
        let scale = self.ln_target.exp() / self.ere; // Jsc + R0/ERE
        match self.model {
            // Jmp = (Jsc + J0) m / (1 + m), free of cancellation
            JvModel::Boltzmann => (boltzmann, scale * boltzmann / (1.0 + boltzmann)),
            JvModel::Exact => {
                // d(V J)/dV = 0  <=>  R(m) (1 + m rho(m)) = ERE Jsc + R(0); in logarithms
                // F(m) = lnR + ln(1 + m rho) - ln_target, increasing in m.
                let last = std::cell::Cell::new((f64::NAN, None::<LnRad>));
                let f = |m: f64| {
                    let r = self.ln_r(m);
                    last.set((m, Some(r)));
                    let s = 1.0 + m * r.d1;
                    let s1 = r.d1 + m * r.d2; // ds/dm
                    let s2 = 2.0 * r.d2 + m * r.d3;
                    let f1 = r.d1 + s1 / s;
                    let f2 = r.d2 + (s2 * s - s1 * s1) / (s * s);
                    (r.ln_r + s.ln() - self.ln_target, f1, f2)
                };
                let (m, _) = safeguarded_newton(f, 0.0, m_oc, boltzmann, 1e-15);
                // At the root R = target/(1 + m rho), so J = (target - R)/ERE
                //   = (target/ERE) m rho / (1 + m rho), again without cancellation.
                // rho at the root from the last evaluation by Taylor's rule (the step is
                // below 1e-2 and rho'' is tiny, so the error is far below 1e-15).
                let rho = match last.get() {
                    (x, Some(r)) if (m - x).abs() < 1e-2 => r.d1 + r.d2 * (m - x) + 0.5 * r.d3 * (m - x) * (m - x),
                    _ => self.ln_r(m).d1,
                };
                (m, scale * m * rho / (1.0 + m * rho))
            }
        }
    }

    /// Solve for the figures of merit. `input` [W m^-2] is the incident power; `gap_j` [J] is
    /// only recorded in the result (the diode already holds its gap).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn solve(&self, gap_j: f64, input: f64) -> CellResult {
        if !(self.jsc > 0.0) {
            return CellResult { gap_j, input, ..Default::default() };
        }
        let m_oc = self.open_circuit_m();
        if !(m_oc > 0.0) {
            return CellResult { gap_j, input, jsc: self.jsc, ..Default::default() };
        }
        let (m_mp, jmp) = self.max_power(m_oc);
        let voc = self.volts(m_oc);
        let vmp = self.volts(m_mp);
        if !(jmp.is_finite() && vmp.is_finite() && voc.is_finite()) {
            // a gap so small (subnormal in J) that the Bose series leaves the f64 range:
            // such a cell delivers nothing measurable; never NaN
            return CellResult { gap_j, input, jsc: self.jsc, ..Default::default() };
        }
        let jmp = jmp.clamp(0.0, self.jsc);
        let pmax = vmp * jmp;
        let ff = if voc > 0.0 { pmax / (voc * self.jsc) } else { 0.0 };
        let efficiency = if input > 0.0 { pmax / input } else { 0.0 };
        CellResult { gap_j, jsc: self.jsc, voc, ff, vmp, jmp, pmax, input, efficiency }
    }

    /// The J-V curve from 0 to `voc` [V] in `points` samples: (V [V], J [A m^-2]).
    pub fn curve(&self, voc: f64, points: usize) -> Vec<(f64, f64)> {
        let n = points.max(2);
        (0..n)
            .map(|i| {
                let v = voc * i as f64 / (n - 1) as f64;
                (v, if i == n - 1 { 0.0 } else { self.current(v) })
            })
            .collect()
    }
}

/// The reduced voltage of a diode at a given current, with its first two derivatives in the
/// current: what a series connection needs to add up the subcell voltages at one current.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct VoltageAtCurrent {
    /// m = qV/kT (dimensionless)
    pub m: f64,
    /// dm/dJ [per A m^-2]
    pub dm_dj: f64,
    /// d2m/dJ2 [per (A m^-2)^2]
    pub d2m_dj2: f64,
}

impl Diode {
    /// kT/q [V]: converts a reduced voltage m into volts.
    pub fn thermal_voltage(&self) -> f64 {
        self.kt / CHARGE
    }

    /// The photocurrent Jsc this diode was built with [A m^-2].
    pub fn photocurrent(&self) -> f64 {
        self.jsc
    }

    /// The same diode (gap, temperature, ERE, model) with another photocurrent `jsc`
    /// [A m^-2]; reuses R(0), so it costs no Bose integral.
    pub fn with_photocurrent(&self, jsc: f64) -> Diode {
        let mut d = *self;
        d.jsc = jsc;
        d.ln_target =
            if d.r0 > 0.0 && jsc < 1e300 { (d.ere * jsc + d.r0).ln() } else { ln_target(d.ere * jsc, d.ln_r0) };
        d
    }

    /// The Boltzmann closed form of the reduced open-circuit voltage, ln((ERE Jsc + R(0)) /
    /// R_B(0)) with R_B the first series term of R: exact for the Boltzmann model, and an
    /// upper bound for the exact one (whose R is larger at every voltage). Dimensionless.
    pub fn reduced_open_circuit_bound(&self) -> f64 {
        if self.jsc > 0.0 {
            (self.ln_target - self.ln_rb0).max(0.0)
        } else {
            0.0
        }
    }

    /// The reduced open-circuit voltage m_oc = qVoc/kT (dimensionless).
    pub fn reduced_open_circuit(&self) -> f64 {
        if self.jsc > 0.0 {
            self.open_circuit_m()
        } else {
            0.0
        }
    }

    /// J(m) = Jsc - (R(m) - R(0))/ERE [A m^-2] at reduced voltage `m` (dimensionless), with
    /// dJ/dm and d2J/dm2 [A m^-2].
    /// At or beyond the gap of the exact model all three are -infinity, never NaN.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn current_at_reduced(&self, m: f64) -> (f64, f64, f64) {
        if self.model == JvModel::Exact && !(m < self.x0) {
            return (f64::NEG_INFINITY, f64::NEG_INFINITY, f64::NEG_INFINITY);
        }
        let r = self.ln_r(m);
        let big_r = r.ln_r.exp();
        // (R - R0)/ERE: directly once R is well above R0 (no cancellation: R - R0 loses at
        // most a factor 1/(1 - e^-0.5) = 2.5 of relative accuracy), else R0 (e^(lnR - lnR0) - 1)
        let excess = if self.r0 > 0.0 && r.ln_r - self.ln_r0 > 0.5 && r.ln_r < DIRECT_LN_R0 {
            big_r - self.r0
        } else {
            self.ln_r0.exp() * (r.ln_r - self.ln_r0).exp_m1()
        };
        let j = self.jsc - excess / self.ere;
        (j, -big_r * r.d1 / self.ere, -big_r * (r.d1 * r.d1 + r.d2) / self.ere)
    }

    /// The inverse of J(V): the reduced voltage m = qV/kT at which the cell carries current
    /// density `j` [A m^-2] (clamped to 0..=Jsc), with dm/dJ and d2m/dJ2. The exact model
    /// starts Newton's method from the Boltzmann value; see [`Diode::voltage_at_current_near`].
    pub fn voltage_at_current(&self, j: f64) -> VoltageAtCurrent {
        self.voltage_at_current_near(j, f64::NAN)
    }

    /// As [`Diode::voltage_at_current`], Newton started at `start` (a reduced voltage,
    /// dimensionless, e.g. the answer for a nearby current) when it is a number.
    ///
    /// From J = Jsc - (R(m) - R(0))/ERE: ln R(m) = L(J) = ln(ERE (Jsc - J) + R(0)), solved in
    /// logarithms (closed form for the Boltzmann model, safeguarded Newton for the exact
    /// one). Differentiating ln R(m(J)) = L(J) twice, with rho = d lnR/dm,
    /// rho' = d2 lnR/dm2, L' = -ERE/(ERE (Jsc - J) + R(0)) and L'' = -L'^2:
    /// m' = L'/rho and m'' = (L'' - rho' m'^2)/rho.
    pub fn voltage_at_current_near(&self, j: f64, start: f64) -> VoltageAtCurrent {
        let j = if j > 0.0 { j.min(self.jsc) } else { 0.0 };
        // u = ERE (Jsc - J) + R(0), directly when R(0) is in range, else in logarithms
        let (ln_u, dl) = if self.r0 > 0.0 && self.jsc < 1e300 {
            let u = self.ere * (self.jsc - j) + self.r0;
            (u.ln(), -self.ere / u)
        } else {
            let ln_u = log_add((self.ere * (self.jsc - j)).ln(), self.ln_r0);
            (ln_u, -self.ere * (-ln_u).exp())
        };
        let boltzmann = ln_u - self.ln_rb0;
        let (m, rho, rho1) = match self.model {
            JvModel::Boltzmann => (boltzmann, 1.0, 0.0),
            JvModel::Exact => {
                let last = std::cell::Cell::new(None::<(f64, LnRad)>);
                let g = |m: f64| {
                    let r = self.ln_r(m);
                    last.set(Some((m, r)));
                    (r.ln_r - ln_u, r.d1, r.d2)
                };
                // exact R >= its first series term, so the root lies at or below the
                // Boltzmann value; m = -1 is safely below the root for any J <= Jsc
                let first = if start.is_finite() { start } else { boltzmann };
                let (m, _) = safeguarded_newton(g, -1.0, self.x0, first.min(self.x0), 1e-15);
                // rho and rho' at the root by Taylor's rule from the last evaluation (the
                // final Newton step is below 1e-2, its error far below 1e-15)
                match last.get() {
                    Some((x, r)) if (m - x).abs() < 1e-2 => {
                        let h = m - x;
                        (m, r.d1 + r.d2 * h + 0.5 * r.d3 * h * h, r.d2 + r.d3 * h)
                    }
                    _ => {
                        let r = self.ln_r(m);
                        (m, r.d1, r.d2)
                    }
                }
            }
        };
        let dm = dl / rho;
        VoltageAtCurrent { m, dm_dj: dm, d2m_dj2: (-dl * dl - rho1 * dm * dm) / rho }
    }
}

/// ln(ERE Jsc + R(0)) from ERE Jsc [A m^-2] and ln R(0): directly while R(0) is in range
/// (one exp, one ln), in logarithms when it is not.
#[inline]
fn ln_target(ere_jsc: f64, ln_r0: f64) -> f64 {
    if ln_r0 > -700.0 && ln_r0 < 700.0 {
        (ere_jsc + ln_r0.exp()).ln()
    } else {
        log_add(ere_jsc.ln(), ln_r0)
    }
}

/// ln(e^a + e^b) without overflow; -inf arguments allowed. `a`, `b` and the result are
/// logarithms of quantities in one unit.
#[inline]
pub(crate) fn log_add(a: f64, b: f64) -> f64 {
    let (hi, lo) = if a >= b { (a, b) } else { (b, a) };
    if hi == f64::NEG_INFINITY {
        return hi;
    }
    hi + (lo - hi).exp().ln_1p()
}

/// Root of an increasing function on (lo, hi) by Newton's method from `start`, keeping a
/// bracket and bisecting whenever a step leaves it or the function is not finite.
/// `f` returns (value, first derivative, second derivative). The iteration stops when the
/// error left after a Newton step, estimated as |f''| s^2 / (2 |f'|) for a step s, is below
/// `tol` (dimensionless) relative to max(1, |x|), or when the bracket has shrunk to that size.
/// Returns the root and the number of evaluations.
pub(crate) fn safeguarded_newton(
    f: impl Fn(f64) -> (f64, f64, f64),
    lo: f64,
    hi: f64,
    start: f64,
    tol: f64,
) -> (f64, u32) {
    let (mut lo, mut hi) = (lo, hi);
    let mut x = if start > lo && start < hi { start } else { 0.5 * (lo + hi) };
    for evals in 1..=200 {
        let (fx, d1, d2) = f(x);
        if fx.is_nan() || fx > 0.0 {
            hi = x;
        } else if fx < 0.0 {
            lo = x;
        } else {
            return (x, evals);
        }
        let scale = tol * x.abs().max(1.0);
        if fx.is_finite() && d1.is_finite() && d1 > 0.0 {
            let step = fx / d1;
            let newton = x - step;
            let left = 0.5 * d2.abs() * step * step / d1;
            if step.abs() < 1e-2 * x.abs().max(1.0) && left <= scale && newton >= lo && newton <= hi {
                return (newton, evals);
            }
            if newton > lo && newton < hi {
                x = newton;
                continue;
            }
        }
        if hi - lo <= scale {
            return (0.5 * (lo + hi), evals);
        }
        x = 0.5 * (lo + hi);
    }
    (x, 200)
}

/// Everything the sources and the cell say about one operating condition.
#[derive(Debug, Clone)]
pub struct Illumination {
    pub source: Source,
    /// concentration factor X >= 1 (1 = one sun), dimensionless
    pub concentration: f64,
}

impl Illumination {
    /// `source` unconcentrated, X = 1.
    pub fn one_sun(source: Source) -> Illumination {
        Illumination { source, concentration: 1.0 }
    }

    /// Incident power X P_source [W m^-2].
    pub fn input_power(&self) -> f64 {
        self.concentration * self.source.total_power()
    }

    /// Photocurrent of a step absorber with gap `gap_j` [J]: Jsc = q X Phi_src(E > Eg)
    /// [A m^-2] (Shockley & Queisser 1961).
    pub fn step_jsc(&self, gap_j: f64) -> f64 {
        CHARGE * self.concentration * self.source.photon_flux_above(gap_j)
    }
}

/// Solve one cell with a step absorptance in the detailed-balance limit (Shockley &
/// Queisser 1961; module docs). Figures in SI, see [`CellResult`].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn solve_cell(light: &Illumination, cell: &Cell) -> CellResult {
    if !(cell.gap_j > 0.0) || !(cell.temp_k > 0.0) || !(cell.ere > 0.0) || !cell.gap_j.is_finite() {
        return CellResult { gap_j: cell.gap_j, input: light.input_power(), ..Default::default() };
    }
    let cell = Cell { ere: cell.ere.min(1.0), ..*cell };
    let diode = Diode::new(&cell, light.step_jsc(cell.gap_j));
    diode.solve(cell.gap_j, light.input_power())
}

/// The cell's J-V curve from 0 to Voc, `points` samples: (V [V], J [A m^-2]).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn jv_curve(light: &Illumination, cell: &Cell, points: usize) -> Vec<(f64, f64)> {
    let r = solve_cell(light, cell);
    if !(r.jsc > 0.0) {
        return vec![(0.0, 0.0), (0.0, 0.0)];
    }
    Diode::new(cell, r.jsc).curve(r.voc, points)
}

/// Solve the same cell at every band gap in `gaps_j` [J]: the batch engine
/// ([`super::batch::solve_cells`]), on every core natively.
pub fn sweep(light: &Illumination, template: &Cell, gaps_j: &[f64]) -> Vec<CellResult> {
    // photocurrents for all gaps in one pass (a monotone walk over tabulated spectra)
    let jsc = step_photocurrents(light, gaps_j);
    super::batch::solve_cells(template, gaps_j, &jsc, light.input_power())
}

/// As [`sweep`], one gap after another through the scalar path ([`Diode::solve`]): the
/// reference the batch engine is checked against.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn sweep_scalar(light: &Illumination, template: &Cell, gaps_j: &[f64]) -> Vec<CellResult> {
    let input = light.input_power();
    let valid = template.temp_k > 0.0 && template.ere > 0.0;
    let template = Cell { ere: template.ere.min(1.0), ..*template };
    let pre = ThermalPrefactor::new(template.temp_k, template.emission);
    let jsc = step_photocurrents(light, gaps_j);
    gaps_j
        .iter()
        .zip(jsc)
        .map(|(&g, jsc)| {
            let cell = Cell { gap_j: g, ..template };
            if !(g > 0.0) || !g.is_finite() || !valid {
                return CellResult { gap_j: g, input, ..Default::default() };
            }
            Diode::with_prefactor(&pre, &cell, jsc).solve(g, input)
        })
        .collect()
}

/// Step-absorber photocurrents [A m^-2] for every gap in `gaps_j` [J] (any order).
pub fn step_photocurrents(light: &Illumination, gaps_j: &[f64]) -> Vec<f64> {
    let scale = CHARGE * light.concentration;
    match &light.source {
        Source::Table { spectrum, .. } => {
            spectrum.photon_flux_above_many(gaps_j).into_iter().map(|f| scale * f).collect()
        }
        _ => gaps_j.iter().map(|&g| light.step_jsc(g)).collect(),
    }
}

/// The best point of a sweep (highest efficiency); `None` for an empty sweep.
pub fn best_of(results: &[CellResult]) -> Option<CellResult> {
    results.iter().copied().fold(None, |best, r| match best {
        Some(b) if b.efficiency >= r.efficiency => Some(b),
        _ => Some(r),
    })
}

/// The best band gap of a sweep, refined between grid points.
///
/// `results` are the cells of one sweep over ascending gaps (as [`sweep`] returns them for
/// `template` under `light`). Takes the grid's best point, then searches the efficiency's
/// maximum by golden section (Kiefer, Proc. Amer. Math. Soc. 4, 502 (1953)) between its
/// grid neighbours (for an even grid of step `s`:
/// [best − s, best + s], clamped to the grid's range) until the bracket is narrower than
/// 1e-7 eV. Returns the refined cell if it beats the grid point, else the grid point;
/// `None` for an empty sweep. Costs about 30 cells beyond the sweep.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting checks: `!(x > 0.0)` also refuses NaN
pub fn best_gap(light: &Illumination, template: &Cell, results: &[CellResult]) -> Option<CellResult> {
    let (i, grid_best) =
        results.iter().copied().enumerate().fold(None, |best: Option<(usize, CellResult)>, (i, r)| match best {
            Some((_, b)) if b.efficiency >= r.efficiency => best,
            _ => Some((i, r)),
        })?;
    let lo_gap = results.get(i.wrapping_sub(1)).map_or(grid_best.gap_j, |r| r.gap_j);
    let hi_gap = results.get(i + 1).map_or(grid_best.gap_j, |r| r.gap_j);
    let (lo, hi) = (lo_gap.min(hi_gap), lo_gap.max(hi_gap));
    let tolerance = 1e-7 * CHARGE; // 1e-7 eV [J]
    if !(hi - lo > tolerance) {
        return Some(grid_best);
    }
    let at = |gap_j: f64| solve_cell(light, &Cell { gap_j, ..*template });
    let (_, refined) = super::special::golden_max(at, |r| r.efficiency, lo, hi, tolerance);
    Some(if refined.efficiency > grid_best.efficiency { refined } else { grid_best })
}

/// Shockley and Queisser's "ultimate efficiency" u(Eg) (1961, section IV; dimensionless) at gap
/// `gap_j` [J]: every photon above the gap delivers exactly Eg, u = Eg * Phi(>Eg) / P_in.
pub fn ultimate_efficiency(light: &Illumination, gap_j: f64) -> f64 {
    let p = light.input_power();
    if p > 0.0 {
        gap_j * light.concentration * light.source.photon_flux_above(gap_j) / p
    } else {
        0.0
    }
}
