//! The maximum power point of subcells connected in series.
//!
//! With one current J through every subcell, the stack voltage is V(J) = sum_i V_i(J) and
//! the power P = J V (the series problem as posed by De Vos, J. Phys. D 13, 839, 1980). On
//! 0 < J < min Jsc the voltage of the limiting subcell L (the smallest Jsc) runs through
//! 0 < m_L < m_oc,L (m = qV/kT) one to one, so m_L serves as the variable: J = J_L(m_L) is
//! explicit, the other subcells' voltages follow by inverting their J-V curves
//! ([`Diode::voltage_at_current_near`]), and P(m_L) is as smooth as a single cell's power
//! curve, even where the currents are nearly matched or the limiting cell's voltage falls
//! steeply with J. The maximum is the root of dP/dm_L, found by Newton's method (second
//! derivatives analytic) kept inside the bracket (0, m_oc,L), started from the maximum of a
//! Boltzmann diode in series with a constant voltage: with c the other cells' reduced
//! voltage, d/dm [(m + c) J(m)] = 0 gives m = W(e^(1 + m_oc + c)) - 1 - c (Lambert W).

use super::MAX_JUNCTIONS;
use crate::physics::junction::Diode;
use crate::physics::special::lambert_w_of_exp;

/// A series operating point. SI units.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SeriesPoint {
    /// current density [A m^-2]
    pub j: f64,
    /// stack voltage [V]
    pub v: f64,
    /// power density [W m^-2]
    pub p: f64,
    /// evaluations of the stack's power curve used (a count)
    pub evaluations: u32,
}

/// Stop when a Newton step in m_L is below this, relative to max(1, m_L) (or to m_oc,L
/// where that is below 1). P is flat at its
/// maximum: the point last evaluated is then within about one step of it, which costs
/// (|P''|/2P) (step)^2 in relative power, about 1e-13 for m_L ~ 25-40 and |P''|/P ~ 0.02
/// (a one-sun tandem), and less at higher voltages.
const STEP_TOL: f64 = 1e-7;

/// The maximum power point of `diodes` (at most [`MAX_JUNCTIONS`]) in series. Zero power
/// if any subcell has no photocurrent or the stack cannot reach a positive voltage; never
/// NaN.
pub fn max_power(diodes: &[Diode]) -> SeriesPoint {
    solve(diodes, None, true).0
}

/// Where a series maximum was found: the limiting subcell and its reduced voltage. A good
/// start for a neighbouring stack (the next point of a map).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeriesHint {
    /// index of the limiting subcell (0 = top)
    pub limiting: usize,
    /// its reduced voltage m = qV/kT at the maximum (dimensionless)
    pub m: f64,
}

/// As [`max_power`], started from `hint` when its limiting subcell is this stack's too;
/// returns the hint for the next stack. (It once skipped the last Newton point to save an
/// evaluation; where a subcell's whole J-V lies within a small fraction of kT/q, e.g. a
/// gap of a few kT at ERE 1e-4, that cost 2e-8 in power, so it now evaluates it too.)
pub fn max_power_near(diodes: &[Diode], hint: Option<SeriesHint>) -> (SeriesPoint, Option<SeriesHint>) {
    solve(diodes, hint, true)
}

#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn solve(diodes: &[Diode], hint: Option<SeriesHint>, precise: bool) -> (SeriesPoint, Option<SeriesHint>) {
    let n = diodes.len();
    if n == 0 || n > MAX_JUNCTIONS {
        return (SeriesPoint::default(), None);
    }
    let (lim, jmin) = diodes.iter().enumerate().fold((0, f64::INFINITY), |(bi, bj), (i, d)| {
        if d.photocurrent() < bj {
            (i, d.photocurrent())
        } else {
            (bi, bj)
        }
    });
    if !(jmin > 0.0) || !jmin.is_finite() {
        return (SeriesPoint::default(), None);
    }
    let limiting = &diodes[lim];
    // the Boltzmann value bounds the exact m_oc from above; past the true m_oc the limiting
    // cell's current is negative, the other cells sit at open circuit, and dP/dm < 0 there
    let m_oc = limiting.reduced_open_circuit_bound();
    if !(m_oc > 0.0) || !m_oc.is_finite() {
        return (SeriesPoint::default(), None);
    }
    let s_l = limiting.thermal_voltage();
    // the other cells' reduced voltage near the expected current, Boltzmann estimate
    // m_i(J) ~ m_oc,i + ln(1 - J/Jsc_i), in units of the limiting cell's kT/q; j_guess
    // [A m^-2] = Jsc_L m_oc/(1 + m_oc), near the limiting cell's own maximum-power current
    let j_guess = jmin * m_oc / (1.0 + m_oc);
    let c: f64 = diodes
        .iter()
        .enumerate()
        .filter(|&(i, _)| i != lim)
        .map(|(_, d)| {
            d.thermal_voltage() / s_l * (d.reduced_open_circuit_bound() + (-j_guess / d.photocurrent()).ln_1p())
        })
        .sum();
    let mut warm = [f64::NAN; MAX_JUNCTIONS];
    // (J, V, dP/dm, d2P/dm2) at m_L = x
    let mut eval = |x: f64| {
        let (j, j1, j2) = limiting.current_at_reduced(x);
        let (mut v, mut v1, mut v2) = (s_l * x, s_l, 0.0);
        for (i, d) in diodes.iter().enumerate() {
            if i == lim {
                continue;
            }
            let r = d.voltage_at_current_near(j, warm[i]);
            warm[i] = r.m;
            let s = d.thermal_voltage();
            v += s * r.m;
            v1 += s * r.dm_dj * j1;
            v2 += s * (r.d2m_dj2 * j1 * j1 + r.dm_dj * j2);
        }
        (j, v, j1 * v + j * v1, j2 * v + 2.0 * j1 * v1 + j * v2)
    };
    let (mut lo, mut hi) = (0.0, m_oc);
    let mut x = match hint {
        Some(h) if h.limiting == lim && h.m > 0.0 && h.m < m_oc => h.m,
        _ => (lambert_w_of_exp(1.0 + m_oc + c) - 1.0 - c).clamp(0.0, m_oc),
    };
    if !(x > lo && x < hi) {
        x = 0.5 * (lo + hi);
    }
    let mut best = (0.0, 0.0);
    let mut evaluations = 0;
    let mut pending = None; // a last Newton point not yet evaluated
    for _ in 0..200 {
        let (j, v, dp, d2p) = eval(x);
        evaluations += 1;
        best = (j, v);
        // g = -dP/dm rises through its root
        if dp.is_nan() || dp < 0.0 {
            hi = x;
        } else if dp > 0.0 {
            lo = x;
        } else {
            break;
        }
        // relative to the range of m_L where that is narrower than 1 (a subcell whose
        // open-circuit voltage is a small fraction of kT/q: its whole J-V lies in (0, m_oc))
        let scale = STEP_TOL * x.abs().max(m_oc.min(1.0));
        let newton_ok = d2p < 0.0 && d2p.is_finite();
        let newton = x - dp / d2p;
        if newton_ok && (newton - x).abs() <= scale {
            // the evaluated point is within one tiny step of the maximum
            if newton > lo && newton < hi {
                pending = Some(newton);
            }
            break;
        }
        x = if newton_ok && newton > lo && newton < hi { newton } else { 0.5 * (lo + hi) };
        if hi - lo <= scale {
            break;
        }
    }
    // the maximum at the end of the range, the limiting cell at zero bias (dP/dm < 0 all
    // the way down: a gap so narrow for its temperature that R(0) rivals Jsc): the
    // bisection closes in on m_L = 0 but stops a step short, so take the end point itself
    if lo == 0.0 && x <= STEP_TOL * m_oc.min(1.0) {
        let (j, v, _, _) = eval(0.0);
        evaluations += 1;
        if j * v >= best.0 * best.1 {
            best = (j, v);
            x = 0.0;
            pending = None;
        }
    }
    if let (true, Some(xn)) = (precise, pending) {
        let (j, v, _, _) = eval(xn);
        evaluations += 1;
        if j * v >= best.0 * best.1 {
            best = (j, v);
            x = xn;
        }
    }
    let (j, v) = best;
    let p = j * v;
    if p.is_finite() && p > 0.0 && j > 0.0 {
        (SeriesPoint { j, v, p, evaluations }, Some(SeriesHint { limiting: lim, m: x }))
    } else {
        (SeriesPoint { evaluations, ..Default::default() }, None)
    }
}
