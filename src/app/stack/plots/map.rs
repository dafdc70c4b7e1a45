//! Drawing the two-junction map: the heat map over (bottom gap, top gap) with contour lines,
//! the current-matching line, the grid's best point, the refined optimum and the design, with
//! labels placed clear of each other; on the page its base layer is cached in an offscreen
//! canvas so a gap edit redraws only the markers and labels.

use crate::app::widgets::plot::Backend;
use std::cell::RefCell;

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::app::stack::colours;
use crate::app::widgets::plot::{
    boxed_text_rect, chart, draw_boxed_text, draw_caption, draw_legend_row, err, palette, tick_target, AxisSpec,
    Drawing, Frame, Look,
};
use crate::physics::stack::Connection;
use crate::view::format::{fixed, gap_ev};
use crate::view::stack::map::{contour, levels, Design, MapData};

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
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        let frame = self.draw_base(root, look)?;
        self.draw_design(root, look, &frame)?;
        Ok(frame)
    }
}

/// Everything of the map but the design: what a gap edit leaves unchanged.
struct MapBase<'a>(&'a MapPlot<'a>);

impl Drawing for MapBase<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
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
        let x = if m.thickness {
            // the columns are log10 of the thickness in um
            let target = tick_target(look, mw, 60.0);
            AxisSpec::log10(10f64.powf(b0), 10f64.powf(b1), target, "Silicon bottom-cell thickness", "µm")
        } else {
            AxisSpec::new(b0, b1, tick_target(look, mw, 80.0), "Bottom-cell band gap", "eV", false)
        };
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
                Some((format!("{what} {} eV / {} · {} %", fixed(t, 3), m.column_text(b, 3), fixed(e, 2)), at))
            }
            (None, Some((t, b, e))) => Some((
                format!("best of the grid {} eV / {} · {} %", fixed(t, 2), m.column_text(b, 2), fixed(e, 2)),
                at(b, t),
            )),
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
                    Some(e) => format!("design {} eV / {} · ≈{} %", gap_ev(t), design_column(m, b), fixed(e, 1)),
                    None => format!("design {} eV / {}", gap_ev(t), design_column(m, b)),
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

/// The design's column value: its bottom gap as typed, or its thickness.
fn design_column(m: &MapData, b: f64) -> String {
    if m.thickness {
        m.column_text(b, 3)
    } else {
        format!("{} eV", gap_ev(b))
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
    let root = crate::app::widgets::plot::Backend::Canvas(backend).into_drawing_area();
    plot.draw_design(&root, &Look::screen(dpr), &frame)?;
    root.present().map_err(err)?;
    Ok(Some(frame))
}
