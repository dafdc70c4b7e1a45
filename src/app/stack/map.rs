//! The two-junction efficiency map: a heat map over (bottom gap, top gap) with contour
//! lines, the line where the two photocurrents match, the best point of the grid, that
//! point refined to the local optimum, and the current design. Clicking or dragging on it
//! moves the design; arrow keys step it.
//!
//! The map is computed in slices of rows between turns of the browser's event loop (each
//! slice a few milliseconds), so the page stays responsive; a newer request drops an older
//! one. Once shown, its best few local maxima are each refined in a turn of their own by the
//! gap search's simplex ([`refine`]), and the best of them marked as the optimum. It is recomputed only when the light, the cell settings, the
//! connection or the map's axes change, not when a gap moves.

use crate::view::controls::Control;
use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;
use std::time::Duration;

use leptos::html;
use leptos::prelude::*;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::{colours, edit_stack, save_plot, set_gaps, StackState, MAP};
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::plot::{
    boxed_text_rect, chart, draw_boxed_text, draw_caption, draw_legend_row, err, palette, tick_target, AxisSpec,
    Drawing, Frame, Look,
};
use crate::physics::constants::{ev, to_ev};
use crate::physics::stack::map::tandem_map;
use crate::physics::stack::optimize::{grid_maxima, refine, Optimum, Problem, POLISHED_STARTS};
use crate::physics::stack::Connection;
use crate::scenario::stack::MapSettings;
use crate::scenario::{CellScenario, CellSetup, Scenario};
use crate::view::cell::same_but_gap;
use crate::view::export::ExportKind;
use crate::view::format::{fixed, gap_ev};
use crate::view::input::tidy;
use crate::view::stack::map::{contour, levels, map_csv, Design, Grid, MapData, MapStatus};

/// Time one slice of the map may take before the page gets a turn [ms].
const SLICE_MS: f64 = 10.0;

/// What the map was computed for.
struct MapKey {
    cell: CellScenario,
    connection: Connection,
    settings: MapSettings,
}

impl MapKey {
    fn matches(&self, s: &Scenario) -> bool {
        same_but_gap(&self.cell, &s.cell)
            && self.connection == s.stack.connection.to_physics()
            && self.settings == s.stack.map
    }
}

/// A map being computed.
struct Job {
    id: u64,
    key: MapKey,
    setup: Arc<CellSetup>,
    tops_j: Vec<f64>,
    bottoms_j: Vec<f64>,
    eff: Vec<f64>,
    /// next row to compute
    next: usize,
    /// rows per call of the map routine (adapted to keep a call near 3 ms)
    rows: usize,
    started: f64,
    busy: f64,
}

#[derive(Default)]
struct Maps {
    /// the last map computed, what it was for and its light and cells
    done: Option<(MapKey, Arc<MapData>, Arc<CellSetup>)>,
    job: Option<Job>,
    last_id: u64,
}

thread_local! {
    static MAPS: RefCell<Maps> = RefCell::new(Maps::default());
}

fn now() -> f64 {
    web_sys::window().and_then(|w| w.performance()).map(|p| p.now()).unwrap_or(0.0)
}

/// Make sure the map of `s` is shown or being computed.
pub fn ensure(sc: StackState, s: &Scenario) {
    let start = MAPS.with(|m| {
        let m = m.borrow();
        if let Some((k, d, _)) = &m.done {
            if k.matches(s) {
                return Some(Err(d.clone()));
            }
        }
        if m.job.as_ref().is_some_and(|j| j.key.matches(s)) {
            return None;
        }
        Some(Ok(()))
    });
    match start {
        None => {}
        Some(Err(done)) => {
            if !sc.map.with_untracked(|m| m.as_ref().is_some_and(|m| Arc::ptr_eq(m, &done))) {
                sc.map.set(Some(done));
            }
            if sc.map_status.with_untracked(|st| *st != MapStatus::Ready) {
                sc.map_status.set(MapStatus::Ready);
            }
        }
        Some(Ok(())) => begin(sc, s),
    }
}

fn begin(sc: StackState, s: &Scenario) {
    let setup = crate::view::cell::setup_of(&s.cell);
    let grid = s.stack.map.grid();
    let (setup, (tops_j, bottoms_j)) = match (setup, grid) {
        (Ok(a), Ok(b)) => (a, b),
        (Err(e), _) | (_, Err(e)) => {
            stop();
            sc.map_status.set(MapStatus::Failed(crate::app::state::sentence(&e)));
            return;
        }
    };
    let id = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        m.last_id += 1;
        let id = m.last_id;
        let n = tops_j.len() * bottoms_j.len();
        m.job = Some(Job {
            id,
            key: MapKey {
                cell: s.cell.clone(),
                connection: s.stack.connection.to_physics(),
                settings: s.stack.map.clone(),
            },
            setup,
            tops_j,
            bottoms_j,
            eff: vec![0.0; n],
            next: 0,
            rows: 4,
            started: now(),
            busy: 0.0,
        });
        id
    });
    sc.map_status.set(MapStatus::Computing(0.0));
    // the first slice after the current render
    set_timeout(move || pump(sc, id), Duration::ZERO);
}

/// Drop any computation in progress (the panel is going away).
pub fn stop() {
    MAPS.with(|m| m.borrow_mut().job = None);
}

/// Compute rows for one slice; then yield to the page, or finish.
fn pump(sc: StackState, id: u64) {
    let t0 = now();
    let finished = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        let job = m.job.as_mut().filter(|j| j.id == id)?;
        let nb = job.bottoms_j.len();
        while job.next < job.tops_j.len() && now() - t0 < SLICE_MS {
            let end = (job.next + job.rows).min(job.tops_j.len());
            let c0 = now();
            let part = tandem_map(
                &job.setup.light,
                &job.setup.cell,
                job.key.connection,
                &job.tops_j[job.next..end],
                &job.bottoms_j,
            );
            let took = now() - c0;
            job.eff[job.next * nb..end * nb].copy_from_slice(&part.efficiency);
            job.next = end;
            job.busy += took;
            // aim for about 3 ms a call
            let per_row = took / part.top_gaps_j.len().max(1) as f64;
            job.rows = if per_row > 0.0 { ((3.0 / per_row) as usize).clamp(1, 64) } else { 64 };
        }
        if job.next < job.tops_j.len() {
            return Some(Err(job.next as f64 / job.tops_j.len() as f64));
        }
        let job = m.job.take()?;
        let data = Arc::new(finish(&job));
        m.done = Some((job.key, data.clone(), job.setup));
        Some(Ok(data))
    });
    match finished {
        None => {}
        Some(Err(frac)) => {
            sc.map_status.try_set(MapStatus::Computing(frac));
            set_timeout(move || pump(sc, id), Duration::ZERO);
        }
        Some(Ok(data)) => {
            crate::app::state::mark("gg-map-done");
            let id = data.id;
            sc.map.try_set(Some(data));
            sc.map_status.try_set(MapStatus::Ready);
            // refine the best point once the map is on the page
            set_timeout(move || refine_best(sc, id), Duration::ZERO);
        }
    }
}

/// Refine the map `id` (while it is still the map and no other is being computed): its best
/// few local maxima are each polished by the gap search's simplex, one per turn of the page,
/// under the map's light, cells and connection, from first steps of one grid step, the gaps
/// ranging over both axes. Then the map is shown again with the best of them (under a new
/// id, so the cached drawing is redrawn once).
fn refine_best(sc: StackState, id: u64) {
    let starts = MAPS.with(|m| {
        let m = m.borrow();
        let (_, data, _) = m.done.as_ref().filter(|d| d.1.id == id && d.1.refined.is_none() && m.job.is_none())?;
        let tops: Vec<f64> = data.tops_ev.iter().map(|g| ev(*g)).collect();
        let bottoms: Vec<f64> = data.bottoms_ev.iter().map(|g| ev(*g)).collect();
        let starts: Vec<Vec<f64>> =
            grid_maxima(&tops, &bottoms, &data.eff).into_iter().take(POLISHED_STARTS).map(|(x, _)| x).collect();
        (!starts.is_empty()).then_some(starts)
    });
    if let Some(starts) = starts {
        polish_next(sc, id, Rc::new(starts), 0, None, 0.0);
    }
}

/// Polish start `k` of map `id`, keeping the best optimum so far; then the next in a turn
/// of its own, or show the best.
fn polish_next(sc: StackState, id: u64, starts: Rc<Vec<Vec<f64>>>, k: usize, best: Option<Optimum>, busy: f64) {
    let t0 = now();
    let step = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        if m.job.is_some() {
            return None;
        }
        let (key, data, setup) = m.done.as_ref().filter(|d| d.1.id == id)?;
        let (tops, bottoms) = (&data.tops_ev, &data.bottoms_ev);
        let lo = tops[0].min(bottoms[0]);
        let hi = tops[tops.len() - 1].max(bottoms[bottoms.len() - 1]);
        let grid_step = |xs: &[f64]| (xs[xs.len() - 1] - xs[0]) / (xs.len() - 1).max(1) as f64;
        let p = Problem {
            light: &setup.light,
            cell: setup.cell,
            connection: key.connection,
            junctions: 2,
            fixed: None,
            range_j: (ev(lo), ev(hi)),
            seeds: Vec::new(),
        };
        let found = refine(&p, &starts[k], ev(grid_step(tops).max(grid_step(bottoms))));
        let best = match best {
            Some(b) if !(found.gaps_j.len() == 2 && found.efficiency > b.efficiency) => b,
            _ => found,
        };
        let busy = busy + (now() - t0);
        if k + 1 < starts.len() {
            return Some(Err((best, busy)));
        }
        if best.gaps_j.len() != 2 {
            return None;
        }
        let next_id = m.last_id + 1;
        let next = Arc::new(MapData {
            id: next_id,
            refined: Some((to_ev(best.gaps_j[0]), to_ev(best.gaps_j[1]), best.efficiency * 100.0)),
            refine_ms: busy,
            ..(**data).clone()
        });
        m.last_id = next_id;
        if let Some(d) = m.done.as_mut() {
            d.1 = next.clone();
        }
        Some(Ok(next))
    });
    match step {
        None => {}
        Some(Err((best, busy))) => {
            set_timeout(move || polish_next(sc, id, starts, k + 1, Some(best), busy), Duration::ZERO)
        }
        Some(Ok(data)) => {
            crate::app::state::mark("gg-map-refined");
            sc.map.try_set(Some(data));
        }
    }
}

fn finish(job: &Job) -> MapData {
    MapData::from_grid(&Grid {
        id: job.id,
        connection: job.key.connection,
        setup: &job.setup,
        tops_j: &job.tops_j,
        bottoms_j: &job.bottoms_j,
        efficiency: &job.eff,
        compute_ms: job.busy,
        elapsed_ms: now() - job.started,
    })
}

/// The line of matched currents.
const MATCHED: RGBColor = RGBColor(246, 168, 52);

/// A polyline [backend px] cut into dashes `on` long with gaps `off` long.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(len > 0.0)` also skips a NaN length
fn dashes(points: &[(f64, f64)], on: f64, off: f64) -> Vec<Vec<(i32, i32)>> {
    let mut out = Vec::new();
    let mut cur: Vec<(i32, i32)> = Vec::new();
    let (mut drawing, mut phase) = (true, 0.0);
    let at = |a: (f64, f64), b: (f64, f64), t: f64| {
        ((a.0 + t * (b.0 - a.0)).round() as i32, (a.1 + t * (b.1 - a.1)).round() as i32)
    };
    for w in points.windows(2) {
        let (a, b) = (w[0], w[1]);
        let len = ((b.0 - a.0).powi(2) + (b.1 - a.1).powi(2)).sqrt();
        if !(len > 0.0) {
            continue;
        }
        let mut done = 0.0;
        while done < len {
            let part = if drawing { on } else { off };
            let step = (part - phase).min(len - done);
            if drawing {
                if cur.is_empty() {
                    cur.push(at(a, b, done / len));
                }
                cur.push(at(a, b, (done + step) / len));
            }
            done += step;
            phase += step;
            if phase >= part - 1e-9 {
                phase = 0.0;
                if drawing && cur.len() >= 2 {
                    out.push(std::mem::take(&mut cur));
                }
                cur.clear();
                drawing = !drawing;
            }
        }
    }
    if cur.len() >= 2 {
        out.push(cur);
    }
    out
}

/// Whether (bottom gap, top gap) [eV] lies within the axes of `frame`.
fn on_axes(frame: &Frame, bottom: f64, top: f64) -> bool {
    bottom >= frame.x_lo && bottom <= frame.x_hi && top >= frame.y_lo && top <= frame.y_hi
}

/// The marker of the best grid point at `p` [backend px]: a diamond, filled or outlined.
fn draw_diamond<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    look: &Look,
    (px, py): (i32, i32),
    filled: bool,
) -> Result<(), String> {
    let r = look.px(6.0);
    let diamond = vec![(px, py - r), (px + r, py), (px, py + r), (px - r, py), (px, py - r)];
    if filled {
        root.draw(&Polygon::new(diamond[..4].to_vec(), palette::BEST.filled())).map_err(err)?;
        root.draw(&PathElement::new(diamond, WHITE.stroke_width(look.px(1.2).max(1) as u32))).map_err(err)?;
    } else {
        root.draw(&PathElement::new(diamond.clone(), WHITE.stroke_width(look.px(3.6).max(1) as u32))).map_err(err)?;
        root.draw(&PathElement::new(diamond, palette::BEST.stroke_width(look.px(1.6).max(1) as u32))).map_err(err)?;
    }
    Ok(())
}

/// The marker of the refined optimum at `p` [backend px]: a white star edged in the colour
/// of the best point.
fn draw_star<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    look: &Look,
    (px, py): (i32, i32),
) -> Result<(), String> {
    let star = star_points(px, py, look.size(10.0), look.size(4.2));
    root.draw(&Polygon::new(star.clone(), WHITE.filled())).map_err(err)?;
    let mut outline = star;
    outline.push(outline[0]);
    root.draw(&PathElement::new(outline, palette::BEST.stroke_width(look.px(1.8).max(1) as u32))).map_err(err)?;
    Ok(())
}

/// The design's marker at `p` [backend px]: a ring with a dot.
fn draw_ring<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    look: &Look,
    (px, py): (i32, i32),
) -> Result<(), String> {
    let r = look.px(7.0);
    root.draw(&Circle::new((px, py), r, WHITE.stroke_width(look.px(4.0).max(1) as u32))).map_err(err)?;
    root.draw(&Circle::new((px, py), r, palette::GAP.stroke_width(look.px(2.2).max(1) as u32))).map_err(err)?;
    root.draw(&Circle::new((px, py), look.px(1.8), palette::GAP.filled())).map_err(err)?;
    Ok(())
}

/// (cos, sin) of the directions of a five-pointed star's corners, one point up: -90° then
/// every 36°.
const STAR_DIRECTIONS: [(f64, f64); 10] = [
    (0.0, -1.0),
    (0.587_785_252_292_473_1, -0.809_016_994_374_947_4),
    (0.951_056_516_295_153_6, -0.309_016_994_374_947_5),
    (0.951_056_516_295_153_6, 0.309_016_994_374_947_5),
    (0.587_785_252_292_473_1, 0.809_016_994_374_947_4),
    (0.0, 1.0),
    (-0.587_785_252_292_473_1, 0.809_016_994_374_947_4),
    (-0.951_056_516_295_153_6, 0.309_016_994_374_947_5),
    (-0.951_056_516_295_153_6, -0.309_016_994_374_947_5),
    (-0.587_785_252_292_473_1, -0.809_016_994_374_947_4),
];

/// The corners of a five-pointed star at (x, y) [backend px], outer and inner radii, one
/// point up.
fn star_points(x: i32, y: i32, outer: f64, inner: f64) -> Vec<(i32, i32)> {
    STAR_DIRECTIONS
        .iter()
        .enumerate()
        .map(|(k, (c, s))| {
            let r = if k % 2 == 0 { outer } else { inner };
            (x + (r * c).round() as i32, y + (r * s).round() as i32)
        })
        .collect()
}

pub struct MapPlot<'a> {
    pub map: &'a MapData,
    pub design: Design,
}

impl Drawing for MapPlot<'_> {
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, look: &Look) -> Result<Frame, String> {
        let frame = self.draw_base(root, look)?;
        self.draw_design(root, look, &frame)?;
        Ok(frame)
    }
}

/// Everything of the map but the design: what a gap edit leaves unchanged.
struct MapBase<'a>(&'a MapPlot<'a>);

impl Drawing for MapBase<'_> {
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, look: &Look) -> Result<Frame, String> {
        self.0.draw_base(root, look)
    }
}

impl MapPlot<'_> {
    fn draw_base<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        draw_caption(root, look)?;
        let m = self.map;
        let (w, h) = root.dim_in_pixel();
        let bar_room = look.px(78.0) as u32;
        let (main, _) = root.split_horizontally(w.saturating_sub(bar_room));
        let (mw, _) = main.dim_in_pixel();
        let (b0, b1) = (m.bottoms_ev[0], m.bottoms_ev[m.bottoms_ev.len() - 1]);
        let (t0, t1) = (m.tops_ev[0], m.tops_ev[m.tops_ev.len() - 1]);
        let x = AxisSpec::new(b0, b1, tick_target(look, mw, 80.0), "Bottom-cell band gap", "eV", false);
        let y = AxisSpec::new(t0, t1, tick_target(look, h, 50.0), "Top-cell band gap", "eV", false);
        let (mut chart, frame) = chart(&main, look, &x, &y, true)?;
        let (lo, hi) = m.range();
        let (lo, hi) = if lo.is_finite() && hi > lo { (lo, hi) } else { (0.0, 1.0) };
        let shade = |e: f64| if e.is_finite() { colours::ramp((e - lo) / (hi - lo)) } else { colours::NOT_A_STACK };

        // heat map: one rectangle per grid point, half a step either side
        let (nt, nb) = (m.tops_ev.len(), m.bottoms_ev.len());
        let edge = |xs: &[f64], j: usize| -> (f64, f64) {
            let a = if j == 0 { xs[0] } else { 0.5 * (xs[j - 1] + xs[j]) };
            let b = if j + 1 == xs.len() { xs[j] } else { 0.5 * (xs[j] + xs[j + 1]) };
            (a, b)
        };
        let mut cells = Vec::with_capacity(nt * nb);
        for i in 0..nt {
            let (ya, yb) = edge(&m.tops_ev, i);
            for k in 0..nb {
                let (xa, xb) = edge(&m.bottoms_ev, k);
                cells.push(Rectangle::new([(xa, yb), (xb, ya)], shade(m.at(i, k)).filled()));
            }
        }
        chart.draw_series(cells).map_err(err)?;

        // contours, light over the dark end of the ramp
        let levels = levels(lo, hi);
        for level in &levels {
            let c = colours::ramp((level - lo) / (hi - lo));
            let line = if colours::is_dark(c) { WHITE.mix(0.75) } else { palette::INK.mix(0.5) };
            let segs = contour(m, *level);
            chart
                .draw_series(
                    segs.into_iter()
                        .map(|s| PathElement::new(s.to_vec(), line.stroke_width(look.px(1.1).max(1) as u32))),
                )
                .map_err(err)?;
        }
        // where the two photocurrents match (series maxima lie close to it)
        if m.connection == Connection::Series && m.matched.len() >= 2 {
            let px: Vec<(f64, f64)> = m
                .matched
                .iter()
                .map(|p| (frame.css_of_x(p.0) * look.scale, frame.css_of_y(p.1) * look.scale))
                .collect();
            let style = MATCHED.stroke_width(look.px(2.0).max(1) as u32);
            for dash in dashes(&px, look.size(7.0), look.size(5.0)) {
                root.draw(&PathElement::new(dash, style)).map_err(err)?;
            }
        }

        let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
        let bx = |v: f64| (frame.css_of_x(v) * look.scale).round() as i32;
        let by = |v: f64| (frame.css_of_y(v) * look.scale).round() as i32;
        let inside = |b: f64, t: f64| on_axes(&frame, b, t);
        // the best grid point: filled until it is refined, then an outline under the optimum
        if let Some((t, b, _)) = m.best {
            draw_diamond(root, look, (bx(b), by(t)), m.refined.is_none())?;
        }
        // the refined optimum: a star
        if let Some((t, b, _)) = m.refined.filter(|(t, b, _)| inside(*b, *t)) {
            draw_star(root, look, (bx(b), by(t)))?;
        }

        // the colour bar with the contour levels
        let bar_x = right + look.px(18.0);
        let bar_w = look.px(14.0);
        let steps = 64;
        for s in 0..steps {
            let (ya, yb) = (bottom - (bottom - top) * s / steps, bottom - (bottom - top) * (s + 1) / steps);
            let c = colours::ramp((s as f64 + 0.5) / steps as f64);
            root.draw(&Rectangle::new([(bar_x, yb), (bar_x + bar_w, ya)], c.filled())).map_err(err)?;
        }
        root.draw(&Rectangle::new([(bar_x, top), (bar_x + bar_w, bottom)], palette::AXIS.stroke_width(1)))
            .map_err(err)?;
        let fs = look.tick_font();
        let label_style = look.text(fs, &palette::INK).pos(Pos::new(HPos::Left, VPos::Center));
        let decimals = crate::view::format::decimals_of(levels.get(1).map(|b| b - levels[0]).unwrap_or(1.0));
        let mut last_y = i32::MAX;
        for level in &levels {
            let py = bottom - ((level - lo) / (hi - lo) * (bottom - top) as f64).round() as i32;
            root.draw(&PathElement::new(
                vec![(bar_x, py), (bar_x + bar_w + look.px(4.0), py)],
                palette::INK.stroke_width(1),
            ))
            .map_err(err)?;
            if (last_y - py).abs() as f64 >= fs * 1.1 {
                root.draw_text(&fixed(*level, decimals), &label_style, (bar_x + bar_w + look.px(6.0), py))
                    .map_err(err)?;
                last_y = py;
            }
        }
        let unit_style = look.text(fs, &palette::MUTED).pos(Pos::new(HPos::Left, VPos::Bottom));
        root.draw_text("%", &unit_style, (bar_x, top - look.px(4.0))).map_err(err)?;

        if look.legend {
            let lx = left + look.px(12.0);
            let mut ly = top + look.px(16.0);
            // each row's marker as on the map, over an invisible line
            let mark = lx + look.px(11.0);
            if m.refined.is_some() {
                draw_legend_row(root, look, lx, ly, &WHITE, false, "optimum, refined from the grid")?;
                draw_star(root, look, (mark, ly))?;
                ly += look.px(20.0);
            }
            draw_legend_row(root, look, lx, ly, &WHITE, false, "best point of the grid")?;
            draw_diamond(root, look, (mark, ly), m.refined.is_none())?;
            draw_legend_row(root, look, lx, ly + look.px(20.0), &WHITE, false, "this design")?;
            draw_ring(root, look, (mark, ly + look.px(20.0)))?;
        }
        Ok(frame)
    }

    /// The labelled marker, the optimum (or the grid's best until it is refined): its label
    /// and where its marker is [backend px], None when it is off the map.
    fn best_tag(&self, look: &Look, frame: &Frame) -> Option<(String, Option<(i32, i32)>)> {
        let m = self.map;
        let at = |b: f64, t: f64| {
            on_axes(frame, b, t).then(|| {
                ((frame.css_of_x(b) * look.scale).round() as i32, (frame.css_of_y(t) * look.scale).round() as i32)
            })
        };
        match (m.refined, m.best) {
            (Some((t, b, e)), _) => {
                let at = at(b, t);
                let what = if at.is_some() { "optimum" } else { "optimum off the map:" };
                Some((format!("{what} {} / {} eV · {} %", fixed(t, 3), fixed(b, 3), fixed(e, 2)), at))
            }
            (None, Some((t, b, e))) => {
                Some((format!("best of the grid {} / {} eV · {} %", fixed(t, 2), fixed(b, 2), fixed(e, 2)), at(b, t)))
            }
            (None, None) => None,
        }
    }

    /// What is redrawn over the cached map when the design moves: the design's marker, its
    /// label and the optimum's label (so that the two labels and the markers keep clear of
    /// each other).
    fn draw_design<DB: DrawingBackend>(
        &self,
        root: &DrawingArea<DB, Shift>,
        look: &Look,
        frame: &Frame,
    ) -> Result<(), String> {
        let m = self.map;
        let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
        let bounds = (left, top, right, bottom);
        let design = self.design.pair.map(|(t, b)| (t, b, on_axes(frame, b, t)));
        let design_at = design.filter(|d| d.2).map(|(t, b, _)| {
            ((frame.css_of_x(b) * look.scale).round() as i32, (frame.css_of_y(t) * look.scale).round() as i32)
        });
        let around = |(x, y): (i32, i32), r: i32| (x - r, y - r, x + r, y + r);
        // what the labels keep clear of: the markers and the labels already placed
        let mut taken: Vec<Rect> = design_at.map(|p| around(p, look.px(10.0))).into_iter().collect();
        if let Some((t, b, _)) = m.best.filter(|(t, b, _)| m.refined.is_some() && on_axes(frame, *b, *t)) {
            taken.push(around(
                ((frame.css_of_x(b) * look.scale).round() as i32, (frame.css_of_y(t) * look.scale).round() as i32),
                look.px(8.0),
            ));
        }
        let (dx, dy) = (look.px(11.0), look.px(8.0));

        // the optimum's label: below right of its star, else around it
        if let Some((text, at)) = self.best_tag(look, frame) {
            let place = match at {
                Some((x, y)) => {
                    taken.push(around((x, y), look.px(10.0)));
                    let right_side = (HPos::Left, x + dx);
                    let left_side = (HPos::Right, x - dx);
                    let below = (VPos::Top, y + dy);
                    let above = (VPos::Bottom, y - dy);
                    clear_place(
                        look,
                        &text,
                        &[(right_side, below), (left_side, below), (right_side, above), (left_side, above)],
                        bounds,
                        &taken,
                    )
                }
                None => ((HPos::Left, left + look.px(4.0)), (VPos::Bottom, bottom - look.px(4.0))),
            };
            let ((hp, x), (vp, y)) = place;
            draw_boxed_text(root, look, &text, x, y, hp, vp, &palette::BEST, bounds)?;
            taken.push(boxed_text_rect(look, &text, x, y, hp, vp, bounds));
        }

        // the design
        match (design, design_at) {
            (Some((t, b, _)), Some((px, py))) => {
                draw_ring(root, look, (px, py))?;
                let e = m.nearest(b, t).map(|(i, k)| m.at(i, k)).filter(|e| e.is_finite());
                let text = match e {
                    Some(e) => format!("design {} / {} eV · ≈{} %", gap_ev(t), gap_ev(b), fixed(e, 1)),
                    None => format!("design {} / {} eV", gap_ev(t), gap_ev(b)),
                };
                // above the marker, on the side away from the optimum; else below
                let left_of_best = m.refined.or(m.best).is_some_and(|(_, bb, _)| b < bb);
                let right_side = (HPos::Left, px + dx);
                let left_side = (HPos::Right, px - dx);
                let (near, far) = if left_of_best { (left_side, right_side) } else { (right_side, left_side) };
                let above = (VPos::Bottom, py - dy);
                let below = (VPos::Top, py + dy);
                let ((hp, x), (vp, y)) = clear_place(
                    look,
                    &text,
                    &[(near, above), (far, above), (near, below), (far, below)],
                    bounds,
                    &taken,
                );
                draw_boxed_text(root, look, &text, x, y, hp, vp, &palette::GAP, bounds)?;
            }
            (Some(_), None) => {
                draw_boxed_text(
                    root,
                    look,
                    "design off the map",
                    right - look.px(4.0),
                    bottom - look.px(4.0),
                    HPos::Right,
                    VPos::Bottom,
                    &palette::GAP,
                    bounds,
                )?;
            }
            // the legend says why there is no design on the map
            _ => {}
        }

        Ok(())
    }
}

/// A box on the plot: (left, top, right, bottom) [backend px].
type Rect = (i32, i32, i32, i32);

/// Where a label goes: ((horizontal anchor, x), (vertical anchor, y)) [backend px].
type Place = ((HPos, i32), (VPos, i32));

/// The first of `places` where the label `text` covers none of `taken`, else the first.
fn clear_place(look: &Look, text: &str, places: &[Place], bounds: Rect, taken: &[Rect]) -> Place {
    let apart = |a: &Rect, b: &Rect| a.2 <= b.0 || b.2 <= a.0 || a.3 <= b.1 || b.3 <= a.1;
    *places
        .iter()
        .find(|((hp, x), (vp, y))| {
            let r = boxed_text_rect(look, text, *x, *y, *hp, *vp, bounds);
            taken.iter().all(|t| apart(&r, t))
        })
        .unwrap_or(&places[0])
}

/// The map's base layer as last drawn on the page: (map id, bitmap size, a copy of the
/// bitmap, its frame).
struct BaseCache {
    id: u64,
    size: (u32, u32),
    image: web_sys::HtmlCanvasElement,
    frame: Frame,
}

thread_local! {
    static BASE: RefCell<Option<BaseCache>> = const { RefCell::new(None) };
}

fn context_2d(c: &web_sys::HtmlCanvasElement) -> Option<web_sys::CanvasRenderingContext2d> {
    use wasm_bindgen::JsCast;
    c.get_context("2d").ok()??.dyn_into().ok()
}

/// Draw the map on the page's canvas. The base layer (heat map, contours, axes) is drawn once
/// per map and canvas size and then copied, so moving the design redraws only its marker.
pub fn draw_on_page(canvas: &web_sys::HtmlCanvasElement, plot: &MapPlot) -> Result<Option<Frame>, String> {
    let dpr = web_sys::window()
        .map(|w| w.device_pixel_ratio())
        .filter(|r| r.is_finite() && *r > 0.0)
        .unwrap_or(1.0)
        .clamp(1.0, 4.0);
    let size =
        ((canvas.client_width() as f64 * dpr).round() as u32, (canvas.client_height() as f64 * dpr).round() as u32);
    if size.0 == 0 || size.1 == 0 {
        return Ok(None);
    }
    let fits = (canvas.width(), canvas.height()) == size;
    let cached = BASE.with(|b| {
        b.borrow()
            .as_ref()
            .filter(|c| fits && c.id == plot.map.id && c.size == size)
            .map(|c| (c.image.clone(), c.frame))
    });
    let frame = match cached {
        Some((image, frame)) => {
            let ctx = context_2d(canvas).ok_or("this browser gave no 2D drawing context for the map")?;
            ctx.draw_image_with_html_canvas_element(&image, 0.0, 0.0)
                .map_err(|_| "the map could not be copied".to_string())?;
            frame
        }
        None => {
            let Some(frame) = crate::app::widgets::plot::render::draw_on_canvas(canvas, &MapBase(plot))? else {
                return Ok(None);
            };
            // keep a copy of the base for the next redraw
            let copy = web_sys::window()
                .and_then(|w| w.document())
                .and_then(|d| d.create_element("canvas").ok())
                .and_then(|e| wasm_bindgen::JsCast::dyn_into::<web_sys::HtmlCanvasElement>(e).ok());
            if let Some(image) = copy {
                image.set_width(size.0);
                image.set_height(size.1);
                if let Some(ctx) = context_2d(&image) {
                    if ctx.draw_image_with_html_canvas_element(canvas, 0.0, 0.0).is_ok() {
                        BASE.with(|b| *b.borrow_mut() = Some(BaseCache { id: plot.map.id, size, image, frame }));
                    }
                }
            }
            frame
        }
    };
    let backend = plotters_canvas::CanvasBackend::with_canvas_object(canvas.clone())
        .ok_or("this browser gave no 2D drawing context for the map")?;
    let root = backend.into_drawing_area();
    plot.draw_design(&root, &Look::screen(dpr), &frame)?;
    root.present().map_err(err)?;
    Ok(Some(frame))
}

/// How near the pointer must be to the optimum's or the best grid point's marker for the
/// read-out to be about it [CSS px].
const MARKER_REACH_CSS: f64 = 7.0;

/// Put a two-junction design at (top, bottom) [eV], rounded to `unit` [eV]; a design with
/// another number of junctions is left alone with a message.
fn place_design(sc: StackState, top: f64, bottom: f64, unit: f64) -> bool {
    let ctx = sc.ctx;
    let n = ctx.scenario.with_untracked(|s| s.stack.gaps_ev.len());
    if n != 2 {
        ctx.set_error(
            Control::TandemMap,
            format!("The map is for two-junction stacks and this design has {n}; set Junctions to 2 to place it on the map."),
        );
        return false;
    }
    let r = |v: f64| (v / unit).round() * unit;
    set_gaps(ctx, Control::TandemMap, vec![tidy(r(top)), tidy(r(bottom))])
}

/// The optimum's gaps are given to 0.1 meV, as the gap search gives its answer [eV].
const OPTIMUM_UNIT_EV: f64 = 1e-4;

/// `p` (top, bottom [eV], efficiency), if the pointer at (x, y) [CSS px] is on its marker.
fn on_marker(f: &Frame, p: Option<(f64, f64, f64)>, x: f64, y: f64) -> Option<(f64, f64, f64)> {
    p.filter(|(t, b, _)| (f.css_of_x(*b) - x).hypot(f.css_of_y(*t) - y) <= MARKER_REACH_CSS)
}

/// What the map does with the pointer and keys.
struct MapCard {
    sc: StackState,
}

impl MapCard {
    /// Put the design at (top, bottom) [eV], rounded to 1 meV.
    fn place(&self, top: f64, bottom: f64) -> bool {
        place_design(self.sc, top, bottom, 1e-3)
    }

    fn point_at(&self, x: f64, y: f64) -> Option<(f64, f64)> {
        let f = self.sc.frame(MAP);
        (f.is_valid() && f.contains_css(x, y, 4.0)).then(|| (f.y_at_css(y), f.x_at_css(x)))
    }
}

impl PlotBehaviour for MapCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let m = self.sc.map.get_untracked()?;
        let (t, b) = self.point_at(x, y)?;
        let f = self.sc.frame(MAP);
        if !f.contains_css(x, y, 0.0) {
            return None;
        }
        // on a marker, say which it is and its figures
        let near = |p| on_marker(&f, p, x, y);
        if let Some((pt, pb, pe)) = near(m.refined) {
            let lines = vec![
                format!("optimum: top {} eV · bottom {} eV", fixed(pt, 4), fixed(pb, 4)),
                format!("{} % ({}), refined from the grid's best points", fixed(pe, 3), m.connection.label()),
                "click to put the design on it".into(),
            ];
            return Some(Hover::new(x, y, width, Some((f.css_of_x(pb), f.css_of_y(pt))), lines));
        }
        if let Some((pt, pb, pe)) = near(m.best) {
            let lines = vec![
                format!("best point of the grid: top {} eV · bottom {} eV", fixed(pt, 3), fixed(pb, 3)),
                format!("{} % ({})", fixed(pe, 2), m.connection.label()),
                "click to move the design here".into(),
            ];
            return Some(Hover::new(x, y, width, Some((f.css_of_x(pb), f.css_of_y(pt))), lines));
        }
        let (i, k) = m.nearest(b, t)?;
        let e = m.at(i, k);
        let mut lines = vec![format!("top {} eV · bottom {} eV", fixed(m.tops_ev[i], 3), fixed(m.bottoms_ev[k], 3))];
        if e.is_finite() {
            lines.push(format!("{} % ({})", fixed(e, 2), m.connection.label()));
            lines.push("click to move the design here".into());
        } else {
            lines.push("not a stack: the bottom gap must be below the top gap".into());
        }
        Some(Hover::new(x, y, width, Some((f.css_of_x(m.bottoms_ev[k]), f.css_of_y(m.tops_ev[i]))), lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        let Some(m) = self.sc.map.get_untracked() else { return false };
        // on the optimum's marker: the design takes the optimum (to 0.1 meV, as the search gives it)
        let f = self.sc.frame(MAP);
        if let Some((t, b, _)) = on_marker(&f, m.refined, x, y) {
            place_design(self.sc, t, b, OPTIMUM_UNIT_EV);
            return true;
        }
        match self.point_at(x, y) {
            Some((t, b)) => {
                self.place(t, b);
                true
            }
            None => false,
        }
    }

    fn drag(&self, x: f64, y: f64) {
        if let Some((t, b)) = self.point_at(x, y) {
            self.place(t, b);
        }
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let step = crate::app::widgets::fields::key_step(ev);
        let (dt, db) = match ev.key().as_str() {
            "ArrowUp" => (step, 0.0),
            "ArrowDown" => (-step, 0.0),
            "ArrowRight" => (0.0, step),
            "ArrowLeft" => (0.0, -step),
            _ => return false,
        };
        let g = self.sc.gaps();
        if g.len() == 2 {
            self.place(tidy(g[0] + dt), tidy(g[1] + db));
        } else {
            self.place(0.0, 0.0);
        }
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let m = self.sc.map.get_untracked().ok_or("the map has not been computed yet")?;
        let design = self.sc.ctx.scenario.with_untracked(|s| Design::of(&s.stack));
        let describe = format!("two-junction {} map", m.connection.label());
        save_plot(self.sc, "tandem-map", kind, &describe, &MapPlot { map: &m, design }, |cap| map_csv(&m, cap))
    }
}

fn legend(sc: StackState) -> impl IntoView {
    // each line follows the map on its own, so a new map or design changes only text
    let optimum = move || sc.map.with(|m| m.as_ref().and_then(|m| m.refined));
    let has_best = move || sc.map.with(|m| m.as_ref().is_some_and(|m| m.best.is_some()));
    let refined = move || match optimum() {
        Some((t, b, e)) => format!(
            "optimum, refined from the grid: top {} eV, bottom {} eV, {} %",
            fixed(t, 4),
            fixed(b, 4),
            fixed(e, 3)
        ),
        None => "refining the optimum…".to_string(),
    };
    let best = move || {
        sc.map.with(|m| {
            m.as_ref().and_then(|m| m.best).map(|(t, b, e)| {
                format!("best point of the grid: top {} eV, bottom {} eV, {} %", fixed(t, 3), fixed(b, 3), fixed(e, 2))
            })
        })
    };
    let series = move || sc.map.with(|m| m.as_ref().is_some_and(|m| m.connection == Connection::Series));
    let design = move || {
        let n = sc.ctx.scenario.with(|s| s.stack.gaps_ev.len());
        if n == 2 {
            "this design — click or drag to move it".to_string()
        } else {
            format!("the design has {n} junctions; set Junctions to 2 to place it on the map")
        }
    };
    let timing = move || {
        let status = sc.map_status.get();
        sc.map.with(|m| match (&status, m) {
            (MapStatus::Computing(f), _) => format!("computing the map… {} %", fixed(f * 100.0, 0)),
            (MapStatus::Failed(e), _) => e.clone(),
            (_, Some(m)) if m.refined.is_some() => format!(
                "{}×{} stacks in {} ms, optimum refined in {} ms",
                m.tops_ev.len(),
                m.bottoms_ev.len(),
                fixed(m.compute_ms, 0),
                fixed(m.refine_ms, 0)
            ),
            (_, Some(m)) => {
                format!("{}×{} stacks in {} ms", m.tops_ev.len(), m.bottoms_ev.len(), fixed(m.compute_ms, 0))
            }
            _ => String::new(),
        })
    };
    let use_optimum = move |_| {
        if let Some((t, b, _)) = optimum() {
            place_design(sc, t, b, OPTIMUM_UNIT_EV);
        }
    };
    view! {
        <span class="key" data-info="map-optimum" hidden=move || !has_best()>
            <svg class="k-star" viewBox="0 0 20 20" aria-hidden="true"><polygon points=STAR_KEY></polygon></svg>
            {refined}
            <button type="button" class="small" data-action="use-optimum" title="Make the optimum the design (gaps to 0.1 meV)"
                hidden=move || optimum().is_none() on:click=use_optimum>"Use it"</button>
        </span>
        <span class="key" data-info="map-best" hidden=move || !has_best()><i class="k-diamond" class:hollow=move || optimum().is_some()></i>{best}</span>
        <span class="key"><i class="k-ring"></i>{design}</span>
        <span class="key" hidden=move || !series()><i class="k-line k-matched"></i>"currents matched"</span>
        <span class="key"><i class="k-fill k-not-stack"></i>"not a stack"</span>
        <span class="key map-timing" data-info="map-timing">{timing}</span>
    }
}

/// The legend's star, as drawn on the map (a 20 × 20 box).
const STAR_KEY: &str = "10.0,1.6 12.3,7.6 18.7,8.0 13.7,12.0 15.4,18.2 10.0,14.7 4.6,18.2 6.3,12.0 1.3,8.0 7.7,7.6";

/// Grid sizes offered for the map (points along each axis).
const RESOLUTIONS: [usize; 4] = [61, 121, 201, 301];

fn resolution_tool(sc: StackState) -> impl IntoView {
    let ctx = sc.ctx;
    let points = Memo::new(move |_| ctx.scenario.with(|s| s.stack.map.points));
    let on_change = move |ev: leptos::ev::Event| {
        if let Ok(n) = event_target_value(&ev).parse::<usize>() {
            edit_stack(ctx, Control::TandemMap, move |st| st.map.points = n);
        }
    };
    let options = move || {
        let now = points.get();
        let mut list: Vec<usize> = RESOLUTIONS.to_vec();
        if !list.contains(&now) {
            list.push(now);
            list.sort_unstable();
        }
        list.into_iter()
            .map(|n| view! { <option value=n.to_string() prop:selected=n == now>{format!("{n} × {n}")}</option> })
            .collect_view()
    };
    view! {
        <label class="range-field">
            <span>"grid"</span>
            <select data-control="map-points" class="small-select" on:change=on_change aria-label="Points along each axis of the map">{options}</select>
        </label>
    }
}

pub fn map_card(sc: StackState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = sc.ctx;
    let progress = move || match sc.map_status.get() {
        MapStatus::Computing(f) => {
            Some(view! { <progress class="map-progress" data-progress="map" max="1" value=f.to_string()></progress> })
        }
        _ => None,
    };
    let note = view! {
        <p class="field-error" data-error=Control::TandemMap.as_str() aria-live="polite">{move || ctx.error_of(Control::TandemMap)}</p>
        {progress}
    };
    plot_card(
        ctx,
        Card {
            slug: "tandem-map",
            title: "Two-junction efficiency map",
            aria: "Heat map of the limiting efficiency of two-junction stacks against the bottom-cell gap (across) and the top-cell gap (up), with contour lines, the best point of the grid, the optimum refined from the grid and the current design. Click or drag to move a two-junction design; arrow keys step its gaps by 1 meV (Shift: 10 meV): left and right the bottom gap, up and down the top gap.".into(),
            interactive: true,
            wrap_class: "map-wrap",
            control: None,
            tools: view! { <div class="plot-tools">{resolution_tool(sc)}</div> }.into_any(),
            legend: legend(sc).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: Signal::derive(move || sc.plot_errors.with(|e| e[MAP].clone())),
        },
        Rc::new(MapCard { sc }),
    )
}
