//! Limiting efficiency against band gap, with the current gap and the best gap marked.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use crate::app::widgets::plot::{
    draw_boxed_text, draw_caption, draw_legend_row, draw_tag, err, palette::*, tick_target, AxisSpec, Frame, Look,
};
use crate::physics::constants::to_ev;
use crate::view::cell::CellView;
use crate::view::format::{fixed, gap_ev};

pub fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &CellView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let curve = &c.curve;
    let gap = c.gap_ev;
    let eff: Vec<f64> = curve.results.iter().map(|r| r.efficiency * 100.0).collect();
    let emax = eff.iter().copied().fold(0.0f64, f64::max).max(c.result.efficiency * 100.0);
    let emax = if emax > 0.0 { emax } else { 1.0 };
    let x = AxisSpec::new(curve.from_ev, curve.to_ev, tick_target(look, w, 90.0), "Band gap", "eV", false);
    let y = AxisSpec::new(0.0, emax * 1.22, tick_target(look, h, 55.0), "Limiting efficiency", "%", true);
    let (mut chart, frame) = crate::app::widgets::plot::chart(root, look, &x, &y, true)?;

    chart
        .draw_series(LineSeries::new(
            curve.gaps_ev.iter().copied().zip(eff.iter().copied()),
            CURVE.stroke_width(look.px(2.0).max(1) as u32),
        ))
        .map_err(err)?;

    let plot = root.clone();
    let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
    let bx = |v: f64| (frame.css_of_x(v) * look.scale).round() as i32;
    let by = |v: f64| (frame.css_of_y(v) * look.scale).round() as i32;

    // the current gap
    if gap >= x.lo && gap <= x.hi {
        let px = bx(gap);
        plot.draw(&PathElement::new(vec![(px, top), (px, bottom)], GAP.stroke_width(look.px(2.0).max(1) as u32)))
            .map_err(err)?;
        let py = by(c.result.efficiency * 100.0);
        plot.draw(&Circle::new((px, py), look.px(4.5), GAP.filled())).map_err(err)?;
        plot.draw(&Circle::new((px, py), look.px(4.5), WHITE.stroke_width(look.px(1.5).max(1) as u32))).map_err(err)?;
    } else {
        let beyond_right = gap > x.hi;
        let text = format!("Eg {} eV — outside this range {}", gap_ev(gap), if beyond_right { "▸" } else { "◂" });
        let (anchor, ax) =
            if beyond_right { (HPos::Right, right - look.px(4.0)) } else { (HPos::Left, left + look.px(4.0)) };
        draw_boxed_text(
            &plot,
            look,
            &text,
            ax,
            top + look.px(4.0),
            anchor,
            VPos::Top,
            &GAP,
            (left, top, right, bottom),
        )?;
    }

    // the best gap of the range
    if let Some(b) = curve.best {
        let (gx, gy) = (to_ev(b.gap_j), b.efficiency * 100.0);
        let (px, py) = (bx(gx), by(gy));
        let r = look.px(5.5);
        plot.draw(&Polygon::new(vec![(px, py - r), (px + r, py), (px, py + r), (px - r, py)], BEST.filled()))
            .map_err(err)?;
        let text = format!("best {} eV · {} %", fixed(gx, 3), fixed(gy, 2));
        draw_boxed_text(
            &plot,
            look,
            &text,
            px,
            py - look.px(9.0),
            HPos::Center,
            VPos::Bottom,
            &BEST,
            (left, top + look.px(22.0), right, bottom),
        )?;
    }

    if gap >= x.lo && gap <= x.hi {
        draw_tag(&plot, look, &format!("Eg {} eV", gap_ev(gap)), bx(gap), top, left, right, &GAP)?;
    }

    if look.legend {
        let lx = left + look.px(14.0);
        let ly = bottom - look.px(40.0);
        draw_legend_row(&plot, look, lx, ly, &CURVE, false, "detailed-balance limit against band gap")?;
        draw_legend_row(
            &plot,
            look,
            lx,
            ly + look.px(20.0),
            &GAP,
            false,
            &format!("this cell: {} %", fixed(c.result.efficiency * 100.0, 2)),
        )?;
    }
    Ok(frame)
}
