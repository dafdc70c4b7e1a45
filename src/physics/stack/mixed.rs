//! Stacks whose bottom subcell is a real absorber (silicon under one or more step cells),
//! and luminescent coupling between neighbouring subcells.
//!
//! * The step subcells on top are those of the module above (De Vos 1980): subcell i
//!   absorbs every photon between its gap and the gap above it. A real bottom cell
//!   ([`RealBottom`]) sees only the photons below the lowest step gap, with its own
//!   absorptance a(E) there (`real_cell::RealCellModel::diode`), and recombines
//!   radiatively by reciprocity plus Auger (`silicon`).
//! * Luminescent coupling: a fraction `coupling` (0 to 1) of the radiative emission of each
//!   subcell is absorbed by the subcell below it and adds to its photocurrent. A step
//!   subcell's radiative recombination current is ERE (Jsc_eff - J) (its recombination is
//!   (Jsc_eff - J), of which the fraction ERE is radiative; Jsc_eff includes what it
//!   receives from above). With coupling 0 this is the uncoupled model of De Vos 1980 and
//!   Henry 1980; the coupled form follows Brown & Green, Prog. Photovolt. 10, 299 (2002),
//!   with the fraction as the user's parameter.
//! * Series connection: one current J. Given J the subcells are solved top down (each
//!   one's coupled photocurrent is known once the one above is), V(J) = sum V_i(J), and
//!   P = max J V(J) over the currents every subcell can carry, by golden section to 1e-12
//!   relative in J (1e-8 where only the efficiency is wanted: the power is flat there).
//!   Independent connection: each subcell at its own maximum power point, top down, each
//!   receiving its upper neighbour's emission at that neighbour's point.
//!
//! Stacks of step cells without coupling are solved by `stack::solve_stack`; this module
//! gives the same answers for them (checked in the tests to 1e-9).
//!
//! Architecture invariant: pure functions of SI numbers; no NaN for any finite input.

use super::{gaps_are_valid, subcell_photocurrents, Connection, StackResult, SubcellResult, MAX_JUNCTIONS};
use crate::physics::junction::Illumination;
use crate::physics::junction::{Cell, Diode, ThermalPrefactor};
use crate::physics::real_cell::{RealCellModel, RealDiode};
use crate::physics::silicon::Trapping;
use crate::physics::special::golden_max;
use std::sync::Arc;

/// A real absorber as the bottom subcell.
#[derive(Debug, Clone)]
pub struct RealBottom {
    /// the absorber under the stack's light and cell temperature
    pub model: Arc<RealCellModel>,
    /// [m]
    pub thickness_m: f64,
    pub trapping: Trapping,
}

/// What a stack adds to step subcells: a real bottom cell and luminescent coupling.
#[derive(Debug, Clone, Default)]
pub struct StackExtras {
    pub bottom: Option<RealBottom>,
    /// fraction of each subcell's radiative emission absorbed by the one below, 0 to 1
    pub coupling: f64,
}

impl StackExtras {
    /// Whether there is nothing beyond step subcells (the plain stack solvers apply).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(x > 0.0) on purpose: a NaN coupling is no coupling
    pub fn is_plain(&self) -> bool {
        self.bottom.is_none() && !(self.coupling > 0.0)
    }
}

#[derive(Debug, Clone, Copy)]
enum Sub {
    Step { diode: Diode, ere: f64 },
    Real(RealDiode),
}

impl Sub {
    fn jsc(&self) -> f64 {
        match self {
            Sub::Step { diode, .. } => diode.photocurrent(),
            Sub::Real(d) => d.jsc,
        }
    }

    /// voltage [V] at current `j` [A m^-2] with `extra` photocurrent
    fn voltage(&self, j: f64, extra: f64) -> f64 {
        match self {
            Sub::Step { diode, .. } => {
                let d = if extra > 0.0 { diode.with_photocurrent(diode.photocurrent() + extra) } else { *diode };
                d.voltage_at_current(j).m * d.thermal_voltage()
            }
            Sub::Real(d) => d.voltage_at(j, extra),
        }
    }

    /// radiative emission current [A m^-2] at current `j` with `extra` photocurrent
    fn emission(&self, j: f64, extra: f64) -> f64 {
        match self {
            Sub::Step { diode, ere } => (ere * (diode.photocurrent() + extra - j)).max(0.0),
            Sub::Real(d) => {
                let v = d.voltage_at(j, extra);
                d.recombination(v).0.max(0.0)
            }
        }
    }

    /// (voltage, current) at the subcell's own maximum power point with `extra`
    fn own_point(&self, gap_j: f64, extra: f64, input: f64) -> (f64, f64, f64) {
        match self {
            Sub::Step { diode, .. } => {
                let d = if extra > 0.0 { diode.with_photocurrent(diode.photocurrent() + extra) } else { *diode };
                let r = d.solve(gap_j, input);
                (r.vmp, r.jmp, r.voc)
            }
            Sub::Real(d) => {
                let r = d.solve(extra, input);
                (r.vmp, r.jmp, r.voc)
            }
        }
    }
}

/// The subcells (top first) and their gaps [J] (a real bottom's: its half-maximum edge).
fn subcells(light: &Illumination, template: &Cell, gaps_j: &[f64], extras: &StackExtras) -> (Vec<Sub>, Vec<f64>) {
    let cell = Cell { ere: template.ere.min(1.0), ..*template };
    let pre = ThermalPrefactor::new(cell.temp_k, cell.emission);
    let mut subs: Vec<Sub> = subcell_photocurrents(light, gaps_j)
        .into_iter()
        .zip(gaps_j)
        .map(|(jsc, &g)| Sub::Step {
            diode: Diode::with_prefactor(&pre, &Cell { gap_j: g, ..cell }, jsc),
            ere: cell.ere,
        })
        .collect();
    let mut gaps = gaps_j.to_vec();
    if let Some(b) = &extras.bottom {
        let upper = gaps_j.last().copied().unwrap_or(f64::INFINITY);
        subs.push(Sub::Real(b.model.diode(b.thickness_m, b.trapping, upper)));
        gaps.push(b.model.edge_j(b.thickness_m, b.trapping));
    }
    (subs, gaps)
}

/// The coupled photocurrents each subcell receives from above at series current `j`, top
/// down; `None` when some subcell cannot carry `j`.
fn extras_at(subs: &[Sub], j: f64, coupling: f64) -> Option<Vec<f64>> {
    let mut out = Vec::with_capacity(subs.len());
    let mut extra = 0.0;
    for (i, s) in subs.iter().enumerate() {
        if s.jsc() + extra < j {
            return None;
        }
        out.push(extra);
        // the last subcell's emission reaches no one
        extra = if coupling > 0.0 && i + 1 < subs.len() { coupling * s.emission(j, extra) } else { 0.0 };
    }
    Some(out)
}

/// Whether the inputs make a stack: 0 to 5 step gaps over a real bottom, or 1 to 6
/// without one; a finite positive temperature and ERE; a coupling from 0 to 1.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
fn usable(template: &Cell, gaps_j: &[f64], extras: &StackExtras) -> bool {
    let n = gaps_j.len() + usize::from(extras.bottom.is_some());
    let gaps_ok = if gaps_j.is_empty() { extras.bottom.is_some() } else { gaps_are_valid(gaps_j) };
    gaps_ok
        && (1..=MAX_JUNCTIONS).contains(&n)
        && template.temp_k > 0.0
        && template.temp_k.is_finite()
        && template.ere > 0.0
        && (0.0..=1.0).contains(&extras.coupling)
}

/// The series maximum (power [W m^-2], current [A m^-2]) of `subs`, the current found to
/// `rel_tol` relative (the power, flat at its maximum, to about its square).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(x > 0.0) on purpose: it also refuses NaN
fn series_max(subs: &[Sub], coupling: f64, rel_tol: f64) -> (f64, f64) {
    // the largest current every subcell can carry, by bisection (feasible currents form
    // an interval from 0: each coupled photocurrent falls as the current rises)
    let top = subs.iter().map(Sub::jsc).fold(0.0, f64::max) * (1.0 + coupling * subs.len() as f64);
    if extras_at(subs, 0.0, coupling).is_none() || !(top > 0.0) {
        return (0.0, 0.0);
    }
    let (mut lo, mut hi) = (0.0, top);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if extras_at(subs, mid, coupling).is_some() {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-14 * top {
            break;
        }
    }
    let jmax = lo;
    let power = |j: f64| match extras_at(subs, j, coupling) {
        Some(ex) => j * subs.iter().zip(&ex).map(|(s, &e)| s.voltage(j, e)).sum::<f64>(),
        None => 0.0,
    };
    let (j, p) = golden_max(power, |p| *p, 0.0, jmax, rel_tol * jmax.max(1e-300));
    (p.max(0.0), j)
}

/// Solve a stack of step subcells of gaps `gaps_j` [J] (top first, strictly descending;
/// may be empty over a real bottom) with `extras`, under `light`, every step subcell like
/// `template`. An unusable stack gives zero power, never NaN.
pub fn solve_mixed(
    light: &Illumination,
    template: &Cell,
    gaps_j: &[f64],
    extras: &StackExtras,
    connection: Connection,
) -> StackResult {
    let input = light.input_power();
    let empty = StackResult { connection, input, ..Default::default() };
    if !usable(template, gaps_j, extras) {
        return empty;
    }
    let (subs, gaps) = subcells(light, template, gaps_j, extras);
    let uppers: Vec<f64> = std::iter::once(f64::INFINITY).chain(gaps.iter().copied()).collect();
    let coupling = extras.coupling;
    // open circuit: J = 0 everywhere
    let open = extras_at(&subs, 0.0, coupling).unwrap_or_else(|| vec![0.0; subs.len()]);
    let mut out: Vec<SubcellResult> = subs
        .iter()
        .zip(&gaps)
        .zip(&uppers)
        .zip(&open)
        .map(|(((s, &g), &u), &e)| SubcellResult {
            gap_j: g,
            upper_j: u,
            jsc: s.jsc() + e,
            voc: s.voltage(0.0, e).max(0.0),
            ..Default::default()
        })
        .collect();
    let voc = out.iter().map(|s| s.voc).sum();
    let (jsc, pmax, limiting) = match connection {
        Connection::Independent => {
            let mut extra = 0.0;
            let mut total = 0.0;
            for (s, r) in subs.iter().zip(out.iter_mut()) {
                let (v, j, _) = s.own_point(r.gap_j, extra, input);
                r.jsc = s.jsc() + extra;
                r.v_op = v;
                r.j_op = j;
                r.p_op = v * j;
                total += r.p_op;
                extra = if coupling > 0.0 { coupling * s.emission(j, extra) } else { 0.0 };
            }
            (out.iter().map(|r| r.jsc).sum(), total, None)
        }
        Connection::Series => {
            let (p, j) = series_max(&subs, coupling, 1e-12);
            let ex = extras_at(&subs, j, coupling).unwrap_or_else(|| vec![0.0; subs.len()]);
            // photocurrents as coupled at the operating point
            for ((r, s), &e) in out.iter_mut().zip(&subs).zip(&ex) {
                r.jsc = s.jsc() + e;
            }
            let (lim, jmin) =
                out.iter()
                    .enumerate()
                    .fold((0, f64::INFINITY), |(bi, bj), (i, r)| if r.jsc < bj { (i, r.jsc) } else { (bi, bj) });
            for ((r, s), &e) in out.iter_mut().zip(&subs).zip(&ex) {
                r.j_op = j;
                r.v_op = if j > 0.0 { s.voltage(j, e) } else { 0.0 };
                r.p_op = r.j_op * r.v_op;
                r.excess_jsc = (s.jsc() + e - j).max(0.0);
            }
            (jmin.max(0.0), p, Some(lim))
        }
    };
    let efficiency = if input > 0.0 { pmax / input } else { 0.0 };
    StackResult { connection, subcells: out, jsc, voc, pmax, input, efficiency, limiting }
}

/// The efficiency alone (dimensionless) of [`solve_mixed`]'s stack: what the optimizer
/// and the map evaluate.
pub fn mixed_efficiency(
    light: &Illumination,
    template: &Cell,
    gaps_j: &[f64],
    extras: &StackExtras,
    connection: Connection,
) -> f64 {
    let input = light.input_power();
    if !(usable(template, gaps_j, extras) && input > 0.0) {
        return 0.0;
    }
    let (subs, gaps) = subcells(light, template, gaps_j, extras);
    let p = match connection {
        // 1e-8 in the current is about 1e-16 in the power at its maximum
        Connection::Series => series_max(&subs, extras.coupling, 1e-8).0,
        Connection::Independent => {
            let mut extra = 0.0;
            let mut total = 0.0;
            for (s, &g) in subs.iter().zip(&gaps) {
                let (v, j, _) = s.own_point(g, extra, input);
                total += v * j;
                extra = if extras.coupling > 0.0 { extras.coupling * s.emission(j, extra) } else { 0.0 };
            }
            total
        }
    };
    let e = p / input;
    if e.is_finite() {
        e.max(0.0)
    } else {
        0.0
    }
}

/// The efficiency map of stacks of one step top cell over a real bottom cell: `eff[i * m +
/// k]` is the stack of top gap `tops_j[i]` [J] and bottom thickness `thicknesses_m[k]` [m]
/// (`m` = `thicknesses_m.len()`), the bottom cell being `bottom` at that thickness, every
/// row on every core natively. With `coupling` as [`StackExtras::coupling`].
pub fn thickness_map(
    light: &Illumination,
    template: &Cell,
    bottom: &RealBottom,
    tops_j: &[f64],
    thicknesses_m: &[f64],
    connection: Connection,
    coupling: f64,
) -> Vec<f64> {
    let m = thicknesses_m.len();
    let rows = crate::physics::batch::map_indexed(tops_j.len(), |i| {
        thicknesses_m
            .iter()
            .map(|&w| {
                let extras = StackExtras { bottom: Some(RealBottom { thickness_m: w, ..bottom.clone() }), coupling };
                mixed_efficiency(light, template, &tops_j[i..=i], &extras, connection)
            })
            .collect::<Vec<f64>>()
    });
    let mut out = Vec::with_capacity(tops_j.len() * m);
    for r in rows {
        out.extend(r);
    }
    out
}
