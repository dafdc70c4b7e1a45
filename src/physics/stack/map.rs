//! The two-junction efficiency map over (top gap, bottom gap).
//!
//! Everything that depends on one gap only is computed once per gap: the photon flux above
//! each gap, and each gap's diode (its radiative current at zero bias, the one Bose
//! integral of the set-up). A map point then costs one subtraction for the bottom cell's
//! photocurrent, a re-targeted diode, and the series maximum (or, for independent
//! connection, the bottom cell's own maximum: the top cell's does not depend on the bottom
//! gap and is computed once per row). Along a row each series search starts from the
//! extrapolation of the two before it. The batch engine ([`crate::physics::batch`]) solves
//! a point where its series form applies, the scalar path elsewhere; rows are independent,
//! so natively they go to every core and the result does not depend on the thread count.

use super::{series, Connection};
use crate::physics::batch::{fill_chunks, series_max_power, FastDiode, SeriesCell};
use crate::physics::constants::CHARGE;
use crate::physics::junction::{Cell, Diode, Illumination, ThermalPrefactor};
use crate::physics::sources::Source;

/// A grid of two-junction efficiencies.
#[derive(Debug, Clone, PartialEq)]
pub struct EfficiencyMap {
    pub connection: Connection,
    /// top-cell gaps [J], the rows
    pub top_gaps_j: Vec<f64>,
    /// bottom-cell gaps [J], the columns
    pub bottom_gaps_j: Vec<f64>,
    /// efficiency (dimensionless) of row i, column k at index i * bottom_gaps_j.len() + k.
    /// A point whose bottom gap is not below its top gap is not a stack and holds 0.
    pub efficiency: Vec<f64>,
}

impl EfficiencyMap {
    /// Efficiency at row `i` (top gap), column `k` (bottom gap); 0 outside the grid.
    pub fn at(&self, i: usize, k: usize) -> f64 {
        if k >= self.bottom_gaps_j.len() {
            return 0.0;
        }
        self.efficiency.get(i * self.bottom_gaps_j.len() + k).copied().unwrap_or(0.0)
    }

    /// The best point: (top gap [J], bottom gap [J], efficiency); None for an empty map.
    pub fn best(&self) -> Option<(f64, f64, f64)> {
        let nb = self.bottom_gaps_j.len();
        let (idx, eff) =
            self.efficiency.iter().enumerate().fold(None, |best: Option<(usize, f64)>, (i, &e)| match best {
                Some((_, b)) if b >= e => best,
                _ => Some((i, e)),
            })?;
        Some((self.top_gaps_j[idx / nb], self.bottom_gaps_j[idx % nb], eff))
    }
}

/// One gap's precomputed pieces.
struct GapColumn {
    gap_j: f64,
    /// photon flux above the gap times q X [A m^-2]
    jsc_above: f64,
    /// the gap's diode (photocurrent to be set per point), None for an unusable gap
    diode: Option<Diode>,
    /// the same diode for the batch engine, None where its series form does not apply
    fast: Option<FastDiode>,
}

/// The per-gap pieces for every gap of `gaps_j` [J] under `light`, cells like `cell`.
fn columns(light: &Illumination, cell: &Cell, pre: &ThermalPrefactor, gaps_j: &[f64]) -> Vec<GapColumn> {
    let q_x = CHARGE * light.concentration;
    gaps_j
        .iter()
        .map(|&g| {
            let ok = g > 0.0 && g.is_finite();
            let jsc_above = if ok { q_x * light.source.photon_flux_above(g) } else { 0.0 };
            let diode = ok.then(|| Diode::with_prefactor(pre, &Cell { gap_j: g, ..*cell }, jsc_above));
            let fast = if ok { FastDiode::new(pre, cell, g) } else { None };
            GapColumn { gap_j: g, jsc_above, diode, fast }
        })
        .collect()
}

/// Efficiencies of every two-junction stack (top gap from `top_gaps_j`, bottom gap from
/// `bottom_gaps_j`, both [J]) under `light`, with subcells like `template`. The batch
/// engine ([`crate::physics::batch`]) solves each point where its series form applies (the
/// scalar path elsewhere); rows go to every core natively.
pub fn tandem_map(
    light: &Illumination,
    template: &Cell,
    connection: Connection,
    top_gaps_j: &[f64],
    bottom_gaps_j: &[f64],
) -> EfficiencyMap {
    map_with(light, template, connection, top_gaps_j, bottom_gaps_j, true)
}

/// As [`tandem_map`], every point through the scalar path (`Diode`, `series`): the
/// reference the batch engine is checked against.
pub fn tandem_map_scalar(
    light: &Illumination,
    template: &Cell,
    connection: Connection,
    top_gaps_j: &[f64],
    bottom_gaps_j: &[f64],
) -> EfficiencyMap {
    map_with(light, template, connection, top_gaps_j, bottom_gaps_j, false)
}

fn map_with(
    light: &Illumination,
    template: &Cell,
    connection: Connection,
    top_gaps_j: &[f64],
    bottom_gaps_j: &[f64],
    fast: bool,
) -> EfficiencyMap {
    let input = light.input_power();
    let mut efficiency = vec![0.0; top_gaps_j.len() * bottom_gaps_j.len()];
    let usable = input > 0.0 && template.temp_k > 0.0 && template.temp_k.is_finite() && template.ere > 0.0;
    let nb = bottom_gaps_j.len();
    if usable && nb > 0 {
        let cell = Cell { ere: template.ere.min(1.0), ..*template };
        let pre = ThermalPrefactor::new(cell.temp_k, cell.emission);
        let tops = columns(light, &cell, &pre, top_gaps_j);
        let bottoms = columns(light, &cell, &pre, bottom_gaps_j);
        let (tops, bottoms) = (&tops, &bottoms);
        // a chunk is a whole number of rows (about 4,000 points), so hints never cross chunks
        let rows_per_chunk = (4096 / nb).max(1);
        fill_chunks(&mut efficiency, rows_per_chunk * nb, |first, part| {
            for (r, row) in part.chunks_mut(nb).enumerate() {
                map_row(&tops[first / nb + r], bottoms, row, connection, input, fast);
            }
        });
    }
    EfficiencyMap { connection, top_gaps_j: top_gaps_j.to_vec(), bottom_gaps_j: bottom_gaps_j.to_vec(), efficiency }
}

/// One row of the map: the top gap `top` with every bottom gap, efficiencies into `row`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn map_row(top: &GapColumn, bottoms: &[GapColumn], row: &mut [f64], connection: Connection, input: f64, fast: bool) {
    let Some(top_diode) = top.diode else { return };
    let top_fast = if fast { top.fast } else { None };
    let top_p = match connection {
        Connection::Independent => top_diode.solve(top.gap_j, input).pmax,
        Connection::Series => 0.0,
    };
    // the last two series maxima of the row: their linear extrapolation starts the
    // next point's search (the maximum moves smoothly along a row, so the first
    // Newton step from there is usually already within tolerance)
    let (mut hint, mut before) = (None::<series::SeriesHint>, None::<series::SeriesHint>);
    let (mut j_last, mut j_before) = (f64::NAN, f64::NAN);
    for (out, bottom) in row.iter_mut().zip(bottoms) {
        let Some(bottom_diode) = bottom.diode else { continue };
        if !(bottom.gap_j < top.gap_j) {
            continue;
        }
        let jsc_b = (bottom.jsc_above - top.jsc_above).max(0.0);
        let bottom_fast = if fast { bottom.fast } else { None };
        let p = match connection {
            Connection::Independent => {
                let solved = bottom_fast.and_then(|d| d.solve(bottom.gap_j, jsc_b, input));
                top_p + solved.unwrap_or_else(|| bottom_diode.with_photocurrent(jsc_b).solve(bottom.gap_j, input)).pmax
            }
            Connection::Series => {
                let quick = match (&top_fast, &bottom_fast) {
                    (Some(t), Some(b)) => {
                        let cells =
                            [SeriesCell { diode: *t, jsc: top.jsc_above }, SeriesCell { diode: *b, jsc: jsc_b }];
                        let start = if j_before.is_finite() { 2.0 * j_last - j_before } else { j_last };
                        series_max_power(&cells, start)
                    }
                    _ => None,
                };
                match quick {
                    Some((p, j)) => {
                        j_before = j_last;
                        j_last = j;
                        p
                    }
                    None => {
                        let b = bottom_diode.with_photocurrent(jsc_b);
                        let start = match (before, hint) {
                            (Some(a), Some(h)) if a.limiting == h.limiting => {
                                Some(series::SeriesHint { limiting: h.limiting, m: 2.0 * h.m - a.m })
                            }
                            _ => hint,
                        };
                        let (point, next) = series::max_power_near(&[top_diode, b], start);
                        before = hint;
                        hint = next;
                        point.p
                    }
                }
            }
        };
        *out = p / input;
    }
}

/// The bottom gap [J] at which a two-junction stack's photocurrents match for top gap
/// `top_j` [J]: with ideal step absorbers the bottom cell collects the photons between the
/// two gaps, so its current equals the top cell's where the photon flux above the bottom
/// gap is twice the flux above the top gap (Henry, J. Appl. Phys. 51, 4494 (1980), the
/// current-matching condition of a series stack). Searched by bisection on
/// [`lo_j`, min(`hi_j`, `top_j`)] (the flux above a gap falls as the gap rises), to 2^-60 of
/// the interval; None when the matching gap is not in that interval.
pub fn matched_bottom_gap(source: &Source, top_j: f64, lo_j: f64, hi_j: f64) -> Option<f64> {
    let target = 2.0 * source.photon_flux_above(top_j);
    let (mut a, mut b) = (lo_j, hi_j.min(top_j));
    if !(source.photon_flux_above(a) >= target && source.photon_flux_above(b) <= target) {
        return None;
    }
    for _ in 0..60 {
        let m = 0.5 * (a + b);
        if source.photon_flux_above(m) >= target {
            a = m;
        } else {
            b = m;
        }
    }
    Some(0.5 * (a + b))
}
