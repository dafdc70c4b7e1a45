//! The two-junction map as the stack panel shows it: efficiencies in percent on the grid of
//! (top gap, bottom gap), the grid's best point, the current-matching line, contour levels
//! and their marching-squares segments, and the map's CSV. Computing the grid is
//! `physics::stack::map`'s; scheduling it between frames is the page's.
//!
//! Architecture invariant: pure functions of the map's numbers; no clock, no drawing.

use std::fmt::Write;

use crate::physics::constants::{ev, to_ev};
use crate::physics::stack::map::matched_bottom_gap;
use crate::physics::stack::Connection;
use crate::scenario::stack::StackScenario;
use crate::scenario::CellSetup;
use crate::view::format::nice_step;

/// Where the map's computation stands.
#[derive(Debug, Clone, PartialEq, Default)]
pub enum MapStatus {
    #[default]
    Idle,
    /// fraction of the rows done
    Computing(f64),
    Ready,
    Failed(String),
}

/// A computed map in display units.
#[derive(Debug, Clone)]
pub struct MapData {
    /// which computation made it (the page's drawing of it is cached by this)
    pub id: u64,
    pub connection: Connection,
    /// top-cell gaps [eV] (rows, the y axis), ascending
    pub tops_ev: Vec<f64>,
    /// bottom-cell gaps [eV] (columns, the x axis), ascending
    pub bottoms_ev: Vec<f64>,
    /// efficiency [%] of row i, column k at i * bottoms_ev.len() + k; NaN where the bottom
    /// gap is not below the top gap
    pub eff: Vec<f64>,
    /// the best grid point: (top gap [eV], bottom gap [eV], efficiency [%])
    pub best: Option<(f64, f64, f64)>,
    /// the best of the grid's best few local maxima, each refined to the local optimum near
    /// it (may lie off the map when the grid's best is on its edge), once found: (top,
    /// bottom [eV], efficiency [%])
    pub refined: Option<(f64, f64, f64)>,
    /// time spent refining [ms]
    pub refine_ms: f64,
    /// (bottom gap, top gap) [eV] where the two subcells' photocurrents are equal
    pub matched: Vec<(f64, f64)>,
    /// time spent computing and from request to result [ms]
    pub compute_ms: f64,
    pub elapsed_ms: f64,
    pub source: String,
    /// the columns are the thickness of a real bottom cell: `bottoms_ev` then holds
    /// log10 of the thickness in um (evenly spaced, as the axis is drawn), not gaps
    pub thickness: bool,
}

impl MapData {
    /// A column value as the page writes it: "1.120 eV" (`decimals` places), or the
    /// thickness "300 µm" on a thickness map.
    pub fn column_text(&self, b: f64, decimals: usize) -> String {
        if self.thickness {
            format!("{} µm", crate::view::format::field(10f64.powf(b), 3))
        } else {
            format!("{} eV", crate::view::format::fixed(b, decimals))
        }
    }

    /// The map of stacks of one step top cell over a real bottom cell: `thicknesses_m` [m]
    /// (log-spaced, ascending) across, top gaps `tops_j` [J] up, `efficiency` (fraction)
    /// row-major as `physics::stack::mixed::thickness_map` gives it. No current-matching
    /// line (the bottom cell has no gap to match).
    pub fn from_thickness(g: &Grid, thicknesses_m: &[f64]) -> MapData {
        let bottoms_ev: Vec<f64> = thicknesses_m.iter().map(|t| (t * 1e6).log10()).collect();
        let eff: Vec<f64> = g.efficiency.iter().map(|e| if e.is_finite() { e * 100.0 } else { f64::NAN }).collect();
        MapData::assemble(g, bottoms_ev, eff, |_, _| Vec::new(), true)
    }

    /// The map of grid `g` with these columns and efficiencies [%]; `matched` gives the
    /// current-matching line from the rows' and the columns' values.
    fn assemble(
        g: &Grid,
        bottoms_ev: Vec<f64>,
        eff: Vec<f64>,
        matched: impl Fn(&[f64], &[f64]) -> Vec<(f64, f64)>,
        thickness: bool,
    ) -> MapData {
        let tops_ev: Vec<f64> = g.tops_j.iter().map(|v| to_ev(*v)).collect();
        let nb = bottoms_ev.len().max(1);
        let best = eff
            .iter()
            .enumerate()
            .filter(|(_, e)| e.is_finite())
            .max_by(|a, b| a.1.total_cmp(b.1))
            .map(|(idx, e)| (tops_ev[idx / nb], bottoms_ev[idx % nb], *e));
        let matched = matched(&tops_ev, &bottoms_ev);
        MapData {
            id: g.id,
            connection: g.connection,
            tops_ev,
            bottoms_ev,
            eff,
            best,
            refined: None,
            refine_ms: 0.0,
            matched,
            compute_ms: g.compute_ms,
            elapsed_ms: g.elapsed_ms,
            source: g.setup.light.source.name(),
            thickness,
        }
    }

    pub fn at(&self, i: usize, k: usize) -> f64 {
        self.eff.get(i * self.bottoms_ev.len() + k).copied().unwrap_or(f64::NAN)
    }
    /// (smallest, largest) efficiency of the stacks on the map [%].
    pub fn range(&self) -> (f64, f64) {
        self.eff
            .iter()
            .filter(|e| e.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &e| (a.min(e), b.max(e)))
    }
    /// The grid point nearest to (bottom, top) [eV].
    pub fn nearest(&self, bottom: f64, top: f64) -> Option<(usize, usize)> {
        let idx = |xs: &[f64], v: f64| -> Option<usize> {
            let n = xs.len();
            if n < 2 {
                return None;
            }
            let t = (v - xs[0]) / (xs[n - 1] - xs[0]) * (n - 1) as f64;
            (t >= -0.5 && t <= n as f64 - 0.5).then(|| (t.round().max(0.0) as usize).min(n - 1))
        };
        Some((idx(&self.tops_ev, top)?, idx(&self.bottoms_ev, bottom)?))
    }
}

/// The design as the map shows it: the top and bottom gaps of a two-junction stack.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Design {
    /// (top, bottom) [eV] for a two-junction stack
    pub pair: Option<(f64, f64)>,
    pub junctions: usize,
}

impl Design {
    /// Over a real bottom cell the pair is (top gap [eV], log10 of the bottom cell's
    /// thickness [um]), as the thickness map's columns.
    pub fn of(st: &StackScenario) -> Design {
        if let Some(b) = &st.bottom {
            let pair = (st.gaps_ev.len() == 1 && b.thickness_um > 0.0).then(|| (st.gaps_ev[0], b.thickness_um.log10()));
            return Design { pair, junctions: st.gaps_ev.len() + 1 };
        }
        let pair = (st.gaps_ev.len() == 2).then(|| (st.gaps_ev[0], st.gaps_ev[1]));
        Design { pair, junctions: st.gaps_ev.len() }
    }
}

/// Contour levels [%] for a map spanning efficiencies up to `hi`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(hi > lo)` also refuses NaN bounds
pub fn levels(lo: f64, hi: f64) -> Vec<f64> {
    if !(hi > lo) {
        return Vec::new();
    }
    let (step, _, _) = nice_step(hi - lo, 7);
    let first = (lo / step).floor() as i64 + 1;
    (first..).map(|k| k as f64 * step).take_while(|v| *v < hi).collect()
}

/// Line segments where the grid crosses `level` (marching squares), in (x = bottom gap,
/// y = top gap) [eV]. Squares with a corner that is not a stack are skipped.
pub fn contour(m: &MapData, level: f64) -> Vec<[(f64, f64); 2]> {
    let (nt, nb) = (m.tops_ev.len(), m.bottoms_ev.len());
    let mut out = Vec::new();
    for i in 0..nt.saturating_sub(1) {
        for k in 0..nb.saturating_sub(1) {
            // corners counter-clockwise from (k, i)
            let c = [(k, i), (k + 1, i), (k + 1, i + 1), (k, i + 1)];
            let v: Vec<f64> = c.iter().map(|&(kk, ii)| m.at(ii, kk)).collect();
            if v.iter().any(|x| !x.is_finite()) {
                continue;
            }
            let p = |j: usize| (m.bottoms_ev[c[j].0], m.tops_ev[c[j].1]);
            // crossing on the edge from corner a to corner b
            let cross = |a: usize, b: usize| {
                let t = (level - v[a]) / (v[b] - v[a]);
                let (pa, pb) = (p(a), p(b));
                (pa.0 + t * (pb.0 - pa.0), pa.1 + t * (pb.1 - pa.1))
            };
            let edges: Vec<(f64, f64)> = (0..4)
                .filter(|&j| (v[j] >= level) != (v[(j + 1) % 4] >= level))
                .map(|j| cross(j, (j + 1) % 4))
                .collect();
            match edges.len() {
                2 => out.push([edges[0], edges[1]]),
                4 => {
                    // a saddle: the centre value decides how the crossings pair up
                    let centre = v.iter().sum::<f64>() / 4.0;
                    if (centre >= level) == (v[0] >= level) {
                        out.push([edges[0], edges[3]]);
                        out.push([edges[1], edges[2]]);
                    } else {
                        out.push([edges[0], edges[1]]);
                        out.push([edges[2], edges[3]]);
                    }
                }
                _ => {}
            }
        }
    }
    out
}

/// The map as a CSV table: a comment header (what it is, the grid's best and the refined
/// optimum) and one row per grid point, top gap first; efficiency empty off the stacks.
pub fn map_csv(m: &MapData, what: &str) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(
        out,
        "# efficiency of every two-junction stack of the grid; empty where the bottom gap is not below the top gap"
    );
    let _ = writeln!(out, "# Detailed-balance limits of an ideal stack: upper bounds, not predictions of a device.");
    if let Some((t, b, e)) = m.best {
        let _ = writeln!(out, "# best point of the grid: top {t:.6} eV, bottom {}, {e:.4} %", m.column_text(b, 6));
    }
    if let Some((t, b, e)) = m.refined {
        let _ = writeln!(
            out,
            "# optimum refined from the grid's best local maxima (simplex): top {t:.6} eV, bottom {b:.6} eV, {e:.4} %"
        );
    }
    if m.thickness {
        let _ = writeln!(out, "top gap (eV),bottom thickness (um),efficiency (%)");
    } else {
        let _ = writeln!(out, "top gap (eV),bottom gap (eV),efficiency (%)");
    }
    for (i, t) in m.tops_ev.iter().enumerate() {
        for (k, b) in m.bottoms_ev.iter().enumerate() {
            let e = m.at(i, k);
            let e = if e.is_finite() { format!("{e:.4}") } else { String::new() };
            if m.thickness {
                let _ = writeln!(out, "{t:.6},{},{e}", crate::view::format::csv_num(10f64.powf(*b)));
            } else {
                let _ = writeln!(out, "{t:.6},{b:.6},{e}");
            }
        }
    }
    out
}

/// What a finished grid computation produced, before it becomes [`MapData`].
pub struct Grid<'a> {
    /// which computation made it
    pub id: u64,
    pub connection: Connection,
    /// the light and cells it was computed for (the current-matching line needs the source)
    pub setup: &'a CellSetup,
    /// top-cell gaps [J] (rows), bottom-cell gaps [J] (columns), ascending
    pub tops_j: &'a [f64],
    pub bottoms_j: &'a [f64],
    /// efficiency (fraction) of row i, column k at i * bottoms_j.len() + k
    pub efficiency: &'a [f64],
    /// time spent computing and from request to result [ms]
    pub compute_ms: f64,
    pub elapsed_ms: f64,
}

impl MapData {
    /// The map in display units: gaps in eV, efficiency in percent (NaN where the bottom gap
    /// is not below the top gap), its best grid point and the current-matching line.
    pub fn from_grid(g: &Grid) -> MapData {
        let bottoms_ev: Vec<f64> = g.bottoms_j.iter().map(|v| to_ev(*v)).collect();
        let nb = bottoms_ev.len().max(1);
        let eff: Vec<f64> = g
            .efficiency
            .iter()
            .enumerate()
            .map(|(idx, e)| if g.bottoms_j[idx % nb] < g.tops_j[idx / nb] { e * 100.0 } else { f64::NAN })
            .collect();
        MapData::assemble(g, bottoms_ev, eff, |tops, bottoms| matched_line(g.setup, tops, bottoms), false)
    }
}

/// (bottom gap, top gap) [eV] along the current-matching line, one point per top gap of the
/// map whose matching bottom gap lies within the map's bottom-gap range.
pub fn matched_line(setup: &CellSetup, tops_ev: &[f64], bottoms_ev: &[f64]) -> Vec<(f64, f64)> {
    let (Some(lo), Some(hi)) = (bottoms_ev.first(), bottoms_ev.last()) else {
        return Vec::new();
    };
    let src = &setup.light.source;
    tops_ev.iter().filter_map(|&t| matched_bottom_gap(src, ev(t), ev(*lo), ev(*hi)).map(|b| (to_ev(b), t))).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::{CellScenario, SourceSpec};

    /// A map whose efficiency is the plane bottom + top [%] (a stack only where bottom < top).
    fn plane() -> MapData {
        let tops_ev: Vec<f64> = (0..11).map(|i| 1.0 + 0.1 * i as f64).collect();
        let bottoms_ev = tops_ev.clone();
        let mut eff = Vec::new();
        for t in &tops_ev {
            for b in &bottoms_ev {
                eff.push(if b < t { b + t } else { f64::NAN });
            }
        }
        MapData {
            id: 1,
            connection: Connection::Series,
            tops_ev,
            bottoms_ev,
            eff,
            best: None,
            refined: None,
            refine_ms: 0.0,
            matched: Vec::new(),
            compute_ms: 0.0,
            elapsed_ms: 0.0,
            source: "test".into(),
            thickness: false,
        }
    }

    #[test]
    fn contours_of_a_plane_lie_on_its_level_line() {
        // marching squares interpolates linearly along edges, so on a linear field every
        // crossing is exact (to rounding): bottom + top = level
        let m = plane();
        let segs = contour(&m, 3.55);
        assert!(!segs.is_empty());
        for [a, b] in &segs {
            assert!((a.0 + a.1 - 3.55).abs() < 1e-12 && (b.0 + b.1 - 3.55).abs() < 1e-12, "{a:?} {b:?}");
            // only where both ends are stacks (bottom below top)
            assert!(a.0 < a.1 && b.0 < b.1);
        }
        // a level above every value has no contour
        assert!(contour(&m, 10.0).is_empty());
    }

    #[test]
    fn levels_are_round_and_inside() {
        let l = levels(10.0, 45.7);
        assert_eq!(l, vec![15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0]);
        assert!(levels(5.0, 5.0).is_empty());
        assert!(levels(f64::NAN, 1.0).is_empty());
    }

    #[test]
    fn csv_has_every_grid_point_and_blanks_off_the_stacks() {
        let mut m = plane();
        m.best = Some((2.0, 1.9, 3.9));
        let csv = map_csv(&m, "test map");
        let rows: Vec<&str> = csv.lines().filter(|l| !l.starts_with('#')).collect();
        assert_eq!(rows[0], "top gap (eV),bottom gap (eV),efficiency (%)");
        assert_eq!(rows.len(), 1 + 11 * 11);
        assert!(csv.contains("# best point of the grid: top 2.000000 eV, bottom 1.900000 eV, 3.9000 %"));
        // top 1.0, bottom 1.0 is not a stack: empty efficiency
        assert_eq!(rows[1], "1.000000,1.000000,");
        // top 1.1, bottom 1.0: 2.1 %
        assert_eq!(rows[12], "1.100000,1.000000,2.1000");
    }

    #[test]
    fn grid_in_display_units_and_the_matched_line() {
        let cell = CellScenario { spectrum: SourceSpec::Blackbody { temp_k: 6000.0 }, ..CellScenario::default() };
        let setup = cell.to_physics().unwrap();
        let tops_j: Vec<f64> = [1.6, 1.8].iter().map(|v| ev(*v)).collect();
        let bottoms_j: Vec<f64> = [0.8, 1.0, 1.7].iter().map(|v| ev(*v)).collect();
        let efficiency = [0.40, 0.42, 0.30, 0.41, 0.44, 0.35];
        let m = MapData::from_grid(&Grid {
            id: 7,
            connection: Connection::Series,
            setup: &setup,
            tops_j: &tops_j,
            bottoms_j: &bottoms_j,
            efficiency: &efficiency,
            compute_ms: 1.0,
            elapsed_ms: 2.0,
        });
        // percent; NaN where the bottom gap (1.7) is not below the top gap (1.6)
        assert!((m.at(0, 1) - 42.0).abs() < 1e-12);
        assert!(m.at(0, 2).is_nan() && (m.at(1, 2) - 35.0).abs() < 1e-12);
        let (t, b, e) = m.best.unwrap();
        assert!((t - 1.8).abs() < 1e-12 && (b - 1.0).abs() < 1e-12 && (e - 44.0).abs() < 1e-12);
        // current matching (definition): photons between the gaps = photons above the top gap
        let src = &setup.light.source;
        assert!(!m.matched.is_empty());
        for (b, t) in &m.matched {
            let above_top = src.photon_flux_above(ev(*t));
            let between = src.photon_flux_between(ev(*b), ev(*t));
            assert!((between / above_top - 1.0).abs() < 1e-9, "{b} {t}");
        }
    }
}
