//! The hot-emitter panel's five plots, drawn with the shared axis, tick and label code of
//! [`crate::app::widgets::plot`]: the blackbody spectrum (log or linear axes), the spectrum
//! exchanged between emitter and cell, the TPV J-V curve, the efficiency-power trade-off
//! over band gap (two panels on one gap axis) and the absorber's efficiencies against
//! temperature. Every line is cut at its axes ([`crate::view::hot::clip_polyline`]).

use std::sync::Arc;

use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use crate::app::hot::state::Slot;
use crate::app::radiator::plots::{edges, padded_axis, px_x, px_y};
use crate::app::widgets::plot::palette::*;
use crate::app::widgets::plot::{
    builder, chart, draw_boxed_text, draw_caption, draw_legend_row, draw_tag, err, frame_of, margins, tick_target,
    AxisSpec, Backend, Drawing, Frame, Look,
};
use crate::view::format::sig;
use crate::view::hot::{clip_polyline, AbsorberView, BlackbodyView, TpvView};

/// One plot of one result.
pub enum HotPlot {
    Blackbody(Slot, Arc<BlackbodyView>),
    Tpv(Slot, Arc<TpvView>),
    Absorber(Slot, Arc<AbsorberView>),
}

impl Drawing for HotPlot {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        draw_caption(root, look)?;
        match self {
            HotPlot::Blackbody(_, v) => blackbody(root, v, look),
            HotPlot::Tpv(Slot::Exchange, v) => exchange(root, v, look),
            HotPlot::Tpv(Slot::Jv, v) => jv(root, v, look),
            HotPlot::Tpv(_, v) => tradeoff(root, v, look),
            HotPlot::Absorber(_, v) => absorber(root, v, look),
        }
    }
}

/// How a plot maps values onto its axes: log10 or as they are.
#[derive(Clone, Copy)]
pub struct Map {
    pub log_x: bool,
    pub log_y: bool,
}

impl Map {
    pub fn x(&self, v: f64) -> f64 {
        if self.log_x {
            v.max(1e-300).log10()
        } else {
            v
        }
    }
    pub fn y(&self, v: f64) -> f64 {
        if self.log_y {
            v.max(1e-300).log10()
        } else {
            v
        }
    }
    pub fn x_value(&self, t: f64) -> f64 {
        if self.log_x {
            10f64.powf(t)
        } else {
            t
        }
    }
}

/// Draw `points` (axis coordinates) cut at the axes of `x` and `y`.
fn line<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    frame: &Frame,
    look: &Look,
    points: &[(f64, f64)],
    color: &RGBColor,
    width: f64,
    dashed: bool,
) -> Result<(), String> {
    let style = color.stroke_width(look.px(width).max(1) as u32);
    for piece in clip_polyline(points, (frame.x_lo, frame.x_hi), (frame.y_lo, frame.y_hi)) {
        let px: Vec<(i32, i32)> = piece.iter().map(|&(x, y)| (px_x(frame, look, x), px_y(frame, look, y))).collect();
        if dashed {
            area.draw(&DashedPathElement::new(px, look.px(6.0) as u32, look.px(4.0) as u32, style)).map_err(err)?;
        } else {
            area.draw(&PathElement::new(px, style)).map_err(err)?;
        }
    }
    Ok(())
}

/// Fill between `points` (axis coordinates, ascending x) and the level `base` (kept inside
/// the axes: -inf for the bottom of a logarithmic axis).
fn fill<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    frame: &Frame,
    look: &Look,
    points: &[(f64, f64)],
    base: f64,
    color: RGBAColor,
) -> Result<(), String> {
    let inside: Vec<(f64, f64)> = points
        .iter()
        .filter(|p| p.0 >= frame.x_lo && p.0 <= frame.x_hi && p.1.is_finite())
        .map(|&(x, y)| (x, y.clamp(frame.y_lo, frame.y_hi)))
        .collect();
    if inside.len() < 2 {
        return Ok(());
    }
    let base = px_y(frame, look, base.clamp(frame.y_lo, frame.y_hi));
    let mut poly: Vec<(i32, i32)> = vec![(px_x(frame, look, inside[0].0), base)];
    poly.extend(inside.iter().map(|&(x, y)| (px_x(frame, look, x), px_y(frame, look, y))));
    poly.push((px_x(frame, look, inside[inside.len() - 1].0), base));
    area.draw(&Polygon::new(poly, color.filled())).map_err(err)?;
    Ok(())
}

fn axis(log: bool, lo: f64, hi: f64, target: usize, name: &str, unit: &str) -> AxisSpec {
    if log {
        AxisSpec::log10(lo, hi, target, name, unit)
    } else {
        AxisSpec::new(lo, hi, target, name, unit, false)
    }
}

fn vline<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    frame: &Frame,
    look: &Look,
    x: f64,
    color: &RGBColor,
) -> Result<Option<i32>, String> {
    if !(x >= frame.x_lo && x <= frame.x_hi) {
        return Ok(None);
    }
    let (_, top, _, bottom) = edges(frame);
    let px = px_x(frame, look, x);
    area.draw(&DashedPathElement::new(
        vec![(px, top), (px, bottom)],
        look.px(5.0) as u32,
        look.px(4.0) as u32,
        color.stroke_width(look.px(1.4).max(1) as u32),
    ))
    .map_err(err)?;
    Ok(Some(px))
}

fn blackbody<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    v: &BlackbodyView,
    look: &Look,
) -> Result<Frame, String> {
    let (w, h) = root.dim_in_pixel();
    let log = v.scenario.log_axes;
    let m = Map { log_x: log, log_y: log };
    let x = axis(log, v.x_range.0, v.x_range.1, tick_target(look, w, 80.0), "Wavelength", "µm");
    let y = axis(log, v.y_range.0, v.y_range.1, tick_target(look, h, 44.0), "Spectral exitance", "W/(m²·µm)");
    let (_chart, frame) = chart(root, look, &x, &y, true)?;
    let planck: Vec<(f64, f64)> = v.rows.iter().map(|r| (m.x(r[0]), m.y(r[1]))).collect();
    if let (Some([a, b]), Some(f)) = (v.scenario.band_um, v.report.band_fraction) {
        let band: Vec<(f64, f64)> =
            v.rows.iter().filter(|r| r[0] >= a && r[0] <= b).map(|r| (m.x(r[0]), m.y(r[1]))).collect();
        fill(root, &frame, look, &band, f64::NEG_INFINITY, ABSORBED.mix(0.45))?;
        let (ax, bx) = (m.x(a).max(frame.x_lo), m.x(b).min(frame.x_hi));
        if bx > ax {
            let (left, top, right, bottom) = edges(&frame);
            let cx = (px_x(&frame, look, ax) + px_x(&frame, look, bx)) / 2;
            let text = format!("band {}–{} µm: {:.2} %", sig(a, 4), sig(b, 4), f * 100.0);
            draw_boxed_text(
                root,
                look,
                &text,
                cx,
                bottom - look.px(6.0),
                HPos::Center,
                VPos::Bottom,
                &BEST,
                (left, top, right, bottom),
            )?;
        }
    }
    if v.scenario.rayleigh_jeans {
        let rj: Vec<(f64, f64)> = v.rows.iter().map(|r| (m.x(r[0]), m.y(r[3]))).collect();
        line(root, &frame, look, &rj, &SKY, 1.8, true)?;
    }
    if v.scenario.wien {
        let wien: Vec<(f64, f64)> = v.rows.iter().map(|r| (m.x(r[0]), m.y(r[2]))).collect();
        line(root, &frame, look, &wien, &CURVE, 1.8, true)?;
    }
    if let Some(e) = &v.emitter {
        let pts: Vec<(f64, f64)> = e.points.iter().map(|p| (m.x(p[0]), m.y(p[1]))).collect();
        line(root, &frame, look, &pts, &EMITTED, 2.2, false)?;
    }
    line(root, &frame, look, &planck, &SPECTRUM, 2.4, false)?;
    // the peak
    let (px, py) = (px_x(&frame, look, m.x(v.peak[0])), px_y(&frame, look, m.y(v.peak[1])));
    root.draw(&Circle::new((px, py), look.px(4.5), GAP.filled())).map_err(err)?;
    let (left, top, right, bottom) = edges(&frame);
    let text = format!("peak {:.4} µm · {} W/(m²·µm)", v.report.peak_wavelength_um, sig(v.peak[1], 4));
    draw_tag(root, look, &text, px, (py - look.px(26.0)).max(top), left, right, &GAP)?;
    if look.legend {
        let lx = right - look.px(300.0);
        let mut ly = top + look.px(40.0);
        let t = format!("Planck at {} K", sig(v.report.temp_k, 6));
        draw_legend_row(root, look, lx, ly, &SPECTRUM, false, &t)?;
        for (on, c, text) in
            [(v.scenario.wien, CURVE, "Wien's approximation"), (v.scenario.rayleigh_jeans, SKY, "Rayleigh-Jeans")]
        {
            if on {
                ly += look.px(20.0);
                draw_legend_row(root, look, lx, ly, &c, false, text)?;
            }
        }
        if let Some(e) = &v.emitter {
            ly += look.px(20.0);
            let t = format!("TPV emitter at {} K", sig(e.temp_k, 6));
            draw_legend_row(root, look, lx, ly, &EMITTED, false, &t)?;
        }
        let _ = bottom;
    }
    Ok(frame)
}

fn exchange<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, v: &TpvView, look: &Look) -> Result<Frame, String> {
    let (w, h) = root.dim_in_pixel();
    let m = Map { log_x: true, log_y: false };
    let pts = &v.exchange;
    let (lo, hi) = (pts.first().map_or(0.1, |p| p.um), pts.last().map_or(10.0, |p| p.um));
    let top = pts.iter().map(|p| p.emitted.max(p.absorbed)).fold(0.0f64, f64::max).max(1e-30);
    let bottom = pts.iter().map(|p| p.absorbed.min(0.0)).fold(0.0f64, f64::min);
    let x = AxisSpec::log10(lo, hi, tick_target(look, w, 70.0), "Wavelength", "µm");
    let y = padded_axis(bottom, top, tick_target(look, h, 44.0), "Spectral power", "W/(m²·µm)");
    let (_chart, frame) = chart(root, look, &x, &y, true)?;
    let above: Vec<(f64, f64)> = pts.iter().filter(|p| p.above_gap).map(|p| (m.x(p.um), p.absorbed)).collect();
    let below: Vec<(f64, f64)> = pts.iter().filter(|p| !p.above_gap).map(|p| (m.x(p.um), p.absorbed)).collect();
    fill(root, &frame, look, &above, 0.0, ABSORBED.mix(0.55))?;
    fill(root, &frame, look, &below, 0.0, GAP.mix(0.35))?;
    let emitted: Vec<(f64, f64)> = pts.iter().map(|p| (m.x(p.um), p.emitted)).collect();
    let returned: Vec<(f64, f64)> = pts.iter().map(|p| (m.x(p.um), p.returned)).collect();
    line(root, &frame, look, &returned, &SKY_INK, 1.8, true)?;
    line(root, &frame, look, &emitted, &BLACKBODY, 2.2, false)?;
    let (left, top_px, right, _) = edges(&frame);
    for (i, (um, g)) in v.gaps_um.iter().zip(&v.scenario.gaps_ev).enumerate() {
        if let Some(px) = vline(root, &frame, look, m.x(*um), &GAP)? {
            let text = format!("gap {} eV · {:.3} µm", sig(*g, 4), um);
            draw_tag(root, look, &text, px, top_px + look.px(2.0 + 20.0 * i as f64), left, right, &GAP)?;
        }
    }
    if look.legend {
        let lx = right - look.px(320.0);
        let ly = top_px + look.px(70.0);
        draw_legend_row(root, look, lx, ly, &BLACKBODY, false, "emitted by the emitter")?;
        draw_legend_row(root, look, lx, ly + look.px(20.0), &ABSORBED, true, "absorbed by the cell above the gap")?;
        draw_legend_row(root, look, lx, ly + look.px(40.0), &GAP, true, "absorbed below the gap (heat)")?;
        draw_legend_row(root, look, lx, ly + look.px(60.0), &SKY_INK, false, "returned to the emitter")?;
    }
    Ok(frame)
}

fn jv<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, v: &TpvView, look: &Look) -> Result<Frame, String> {
    let (w, h) = root.dim_in_pixel();
    let voc = v.jv.iter().map(|p| p[0]).fold(v.report.voc_v, f64::max).max(1e-6);
    let jsc = v.jv.iter().map(|p| p[1]).fold(0.0f64, f64::max).max(1e-12);
    let x = AxisSpec::new(0.0, voc * 1.04, tick_target(look, w, 70.0), "Voltage", "V", true);
    let y = AxisSpec::new(0.0, jsc * 1.1, tick_target(look, h, 44.0), "Current density", "A/cm²", true);
    let (_chart, frame) = chart(root, look, &x, &y, true)?;
    let (left, top, right, bottom) = edges(&frame);
    if v.jv.is_empty() {
        let text = "Independent subcells: each has its own J-V curve and terminals; see the table of subcells.";
        let cx = (left + right) / 2;
        draw_boxed_text(
            root,
            look,
            text,
            cx,
            (top + bottom) / 2,
            HPos::Center,
            VPos::Center,
            &MUTED,
            (left, top, right, bottom),
        )?;
        return Ok(frame);
    }
    let pts: Vec<(f64, f64)> = v.jv.iter().map(|p| (p[0], p[1])).collect();
    line(root, &frame, look, &pts, &SPECTRUM, 2.4, false)?;
    if let Some([vm, jm]) = v.mpp {
        let (px, py) = (px_x(&frame, look, vm), px_y(&frame, look, jm));
        root.draw(&Rectangle::new([(left, py), (px, bottom)], POWER.mix(0.12).filled())).map_err(err)?;
        root.draw(&Circle::new((px, py), look.px(5.0), GAP.filled())).map_err(err)?;
        let text = format!("max power {:.3} V · {:.3} A/cm² · {:.3} W/cm²", vm, jm, vm * jm);
        draw_boxed_text(
            root,
            look,
            &text,
            px - look.px(8.0),
            py + look.px(10.0),
            HPos::Right,
            VPos::Top,
            &GAP,
            (left, top, right, bottom),
        )?;
    }
    if look.legend {
        draw_legend_row(root, look, left + look.px(14.0), bottom - look.px(40.0), &SPECTRUM, false, "J(V)")?;
        draw_legend_row(
            root,
            look,
            left + look.px(14.0),
            bottom - look.px(20.0),
            &POWER,
            true,
            "power at the maximum power point",
        )?;
    }
    Ok(frame)
}

/// A chart with given margins, its mesh, ticks and titles drawn.
fn chart_with<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    look: &Look,
    x: &AxisSpec,
    y: &AxisSpec,
    m: &crate::app::widgets::plot::Margins,
    x_labels: bool,
) -> Result<Frame, String> {
    let mut ch = builder(area, m).build_cartesian_2d(x.coord(), y.coord()).map_err(err)?;
    let xf = |v: &f64| if x_labels { x.label(*v) } else { String::new() };
    let yf = |v: &f64| y.label(*v);
    ch.configure_mesh()
        .bold_line_style(GRID)
        .light_line_style(GRID_LIGHT)
        .axis_style(AXIS)
        .label_style(look.text(look.tick_font(), &INK))
        .axis_desc_style(look.text(look.desc_font(), &INK))
        .x_label_formatter(&xf)
        .y_label_formatter(&yf)
        .x_desc(if x_labels { x.title.clone() } else { String::new() })
        .y_desc(y.title.clone())
        .set_all_tick_mark_size(look.px(5.0))
        .draw()
        .map_err(err)?;
    Ok(frame_of(ch.plotting_area().get_pixel_range(), x, y, look))
}

/// A marker: a filled shape at backend pixel (x, y).
fn marker<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    look: &Look,
    shape: u8,
    x: i32,
    y: i32,
    c: &RGBColor,
) -> Result<(), String> {
    let s = look.px(6.0);
    let ring = WHITE.stroke_width(look.px(1.4).max(1) as u32);
    match shape {
        0 => {
            area.draw(&Circle::new((x, y), s, c.filled())).map_err(err)?;
            area.draw(&Circle::new((x, y), s, ring)).map_err(err)?;
        }
        1 => {
            let p = vec![(x, y - s - 1), (x + s + 1, y), (x, y + s + 1), (x - s - 1, y)];
            area.draw(&Polygon::new(p, c.filled())).map_err(err)?;
        }
        _ => {
            area.draw(&Rectangle::new([(x - s, y - s), (x + s, y + s)], c.filled())).map_err(err)?;
        }
    }
    Ok(())
}

fn tradeoff<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, v: &TpvView, look: &Look) -> Result<Frame, String> {
    let (w, h) = root.dim_in_pixel();
    let t = &v.tradeoff;
    let cap = if look.caption.is_some() { (look.size(13.0) * 1.6).ceil() as u32 } else { 0 };
    let (upper, lower) = root.split_vertically(cap + (h - cap) * 47 / 100);
    let (from, to) = (v.scenario.sweep_from_ev, v.scenario.sweep_to_ev);
    let x = AxisSpec::new(from, to, tick_target(look, w, 70.0), "Band gap", "eV", false);
    let eff_hi = t.points.iter().map(|p| p.efficiency).fold(0.0f64, f64::max) * 100.0;
    let pow_hi = t.points.iter().map(|p| p.pmax_w_cm2).fold(0.0f64, f64::max);
    let ye = padded_axis(0.0, eff_hi.max(1e-9), tick_target(look, h / 2, 34.0), "Efficiency", "%");
    let yp = padded_axis(0.0, pow_hi.max(1e-12), tick_target(look, h / 2, 34.0), "Power density", "W/cm²");
    let (mut me, mut mp) = (margins(look, &x, &ye, None), margins(look, &x, &yp, None));
    let left = me.left_area.max(mp.left_area);
    me.left_area = left;
    mp.left_area = left;
    me.bottom_area = look.px(6.0);
    mp.top = look.px(10.0);
    let fe = chart_with(&upper, look, &x, &ye, &me, false)?;
    let fp = chart_with(&lower, look, &x, &yp, &mp, true)?;
    let eff: Vec<(f64, f64)> = t.points.iter().map(|p| (p.gap_ev, p.efficiency * 100.0)).collect();
    let pow: Vec<(f64, f64)> = t.points.iter().map(|p| (p.gap_ev, p.pmax_w_cm2)).collect();
    // both frames are in the root's pixels: lines and marks go on the root
    line(root, &fe, look, &eff, &CURVE, 2.4, false)?;
    line(root, &fp, look, &pow, &POWER, 2.4, false)?;
    let be = t.best_efficiency;
    let bp = t.best_power;
    for (f, value) in [
        (&fe, (|p: &crate::report::hot::TradeoffPoint| p.efficiency * 100.0) as fn(&_) -> f64),
        (&fp, |p: &crate::report::hot::TradeoffPoint| p.pmax_w_cm2),
    ] {
        let area = root;
        for (shape, p, c) in [(1u8, be, BEST), (2u8, bp, SPECTRUM)] {
            if p.gap_ev >= from && p.gap_ev <= to {
                marker(area, look, shape, px_x(f, look, p.gap_ev), px_y(f, look, value(&p)), &c)?;
            }
        }
        if let Some(d) = v.design {
            if d.gap_ev >= from && d.gap_ev <= to {
                marker(area, look, 0, px_x(f, look, d.gap_ev), px_y(f, look, value(&d)), &GAP)?;
            }
        }
    }
    let (l, top, r, b) = edges(&fe);
    let text = format!("best efficiency {:.2} % at {:.4} eV", be.efficiency * 100.0, be.gap_ev);
    draw_boxed_text(
        root,
        look,
        &text,
        r - look.px(4.0),
        top + look.px(4.0),
        HPos::Right,
        VPos::Top,
        &BEST,
        (l, top, r, b),
    )?;
    let (l, top, r, b) = edges(&fp);
    let text = format!("most power {:.4} W/cm² at {:.4} eV", bp.pmax_w_cm2, bp.gap_ev);
    draw_boxed_text(
        root,
        look,
        &text,
        r - look.px(4.0),
        top + look.px(4.0),
        HPos::Right,
        VPos::Top,
        &SPECTRUM,
        (l, top, r, b),
    )?;
    if v.coarse {
        let (l, top, r, b) = edges(&fe);
        draw_boxed_text(
            root,
            look,
            "coarse while dragging",
            l + look.px(4.0),
            top + look.px(4.0),
            HPos::Left,
            VPos::Top,
            &MUTED,
            (l, top, r, b),
        )?;
    }
    if look.legend {
        let (l, _, _, b) = edges(&fp);
        draw_legend_row(root, look, l + look.px(14.0), b - look.px(20.0), &GAP, true, "this design (single junction)")?;
    }
    Ok(fe)
}

fn absorber<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, v: &AbsorberView, look: &Look) -> Result<Frame, String> {
    let (w, h) = root.dim_in_pixel();
    let c = &v.curve;
    let (lo, hi) = (c.first().map_or(0.0, |p| p[0]), c.last().map_or(1.0, |p| p[0]));
    let ymax = c.iter().map(|p| p[1].max(p[2])).fold(0.0f64, f64::max) * 100.0;
    let ymin = c.iter().map(|p| p[1].min(p[2])).fold(0.0f64, f64::min).max(-1.0) * 100.0;
    let x = AxisSpec::new(lo, hi, tick_target(look, w, 80.0), "Absorber temperature", "K", false);
    let y = padded_axis(ymin, ymax.max(ymin + 1.0), tick_target(look, h, 44.0), "Efficiency", "%");
    let (_chart, frame) = chart(root, look, &x, &y, true)?;
    let (left, top, right, bottom) = edges(&frame);
    let zero = px_y(&frame, look, 0.0);
    root.draw(&PathElement::new(vec![(left, zero), (right, zero)], INK.stroke_width(look.px(1.2).max(1) as u32)))
        .map_err(err)?;
    let thermal: Vec<(f64, f64)> = c.iter().map(|p| (p[0], p[1] * 100.0)).collect();
    let work: Vec<(f64, f64)> = c.iter().map(|p| (p[0], p[2] * 100.0)).collect();
    line(root, &frame, look, &thermal, &CURVE, 2.4, false)?;
    line(root, &frame, look, &work, &POWER, 2.4, false)?;
    let r = &v.report;
    if let Some(s) = r.stagnation_temp_k {
        if let Some(px) = vline(root, &frame, look, s, &BLACKBODY)? {
            let (sx, sy) = (px, zero);
            let d = look.px(6.0);
            root.draw(&Polygon::new(vec![(sx, sy - d), (sx + d, sy), (sx, sy + d), (sx - d, sy)], BLACKBODY.filled()))
                .map_err(err)?;
            draw_tag(root, look, &format!("stagnation {s:.1} K"), px, top + look.px(2.0), left, right, &BLACKBODY)?;
        }
    }
    if let Some(px) = vline(root, &frame, look, r.temp_k, &GAP)? {
        marker(root, look, 0, px, px_y(&frame, look, r.thermal_efficiency * 100.0), &CURVE)?;
        marker(root, look, 0, px, px_y(&frame, look, r.work_efficiency * 100.0), &POWER)?;
        let text = format!(
            "{:.1} K: thermal {:.2} %, work {:.2} %",
            r.temp_k,
            r.thermal_efficiency * 100.0,
            r.work_efficiency * 100.0
        );
        draw_boxed_text(
            root,
            look,
            &text,
            px + look.px(8.0),
            bottom - look.px(8.0),
            HPos::Left,
            VPos::Bottom,
            &GAP,
            (left, top, right, bottom),
        )?;
    }
    if look.legend {
        let lx = right - look.px(260.0);
        draw_legend_row(root, look, lx, top + look.px(40.0), &CURVE, false, "thermal efficiency")?;
        draw_legend_row(root, look, lx, top + look.px(60.0), &POWER, false, "work efficiency (× Carnot)")?;
    }
    Ok(frame)
}
