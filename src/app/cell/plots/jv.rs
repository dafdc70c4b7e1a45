//! The J-V curve (left axis) and the P-V curve (right axis) with the maximum power point.

use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use crate::app::widgets::plot::{
    draw_boxed_text, draw_caption, draw_legend_row, err, frame_of, margins, palette::*, tick_target, AxisSpec, Frame,
    Look,
};
use crate::view::cell::CellView;
use crate::view::format::sig;

pub fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &CellView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let r = &c.report;
    let voc = if r.voc_v > 0.0 { r.voc_v } else { 1.0 };
    let jsc = if r.jsc_ma_cm2 > 0.0 { r.jsc_ma_cm2 } else { 1.0 };
    let pmax = r.vmp_v * r.jmp_ma_cm2;
    let pmax = if pmax > 0.0 { pmax } else { 1.0 };
    let x = AxisSpec::new(0.0, voc * 1.06, tick_target(look, w, 90.0), "Voltage", "V", true);
    let y = AxisSpec::new(0.0, jsc * 1.16, tick_target(look, h, 55.0), "Current density J", "mA/cm²", true);
    let y2 = AxisSpec::new(0.0, pmax * 1.6, tick_target(look, h, 55.0), "Power density P", "mW/cm²", true);
    let m = margins(look, &x, &y, Some(&y2));
    let tick = look.px(5.0);

    let mut chart = crate::app::widgets::plot::builder(root, &m)
        .right_y_label_area_size(m.right_area)
        .build_cartesian_2d(x.coord(), y.coord())
        .map_err(err)?
        .set_secondary_coord(x.coord_major(), y2.coord_major());
    let xf = |v: &f64| x.label(*v);
    let yf = |v: &f64| y.label(*v);
    let y2f = |v: &f64| y2.label(*v);
    chart
        .configure_mesh()
        .bold_line_style(GRID)
        .light_line_style(GRID_LIGHT)
        .axis_style(AXIS)
        .label_style(look.text(look.tick_font(), &INK))
        .axis_desc_style(look.text(look.desc_font(), &SPECTRUM))
        .x_label_formatter(&xf)
        .y_label_formatter(&yf)
        .x_desc(x.title.clone())
        .y_desc(y.title.clone())
        .set_all_tick_mark_size(tick)
        .draw()
        .map_err(err)?;
    chart
        .configure_secondary_axes()
        .axis_style(AXIS)
        .label_style(look.text(look.tick_font(), &INK))
        .axis_desc_style(look.text(look.desc_font(), &POWER))
        .y_label_formatter(&y2f)
        .x_label_formatter(&|_| String::new())
        .y_desc(y2.title.clone())
        .set_all_tick_mark_size(tick)
        .draw()
        .map_err(err)?;
    let frame = frame_of(chart.plotting_area().get_pixel_range(), &x, &y, look);

    let lw = look.px(2.0).max(1) as u32;
    chart.draw_series(LineSeries::new(c.jv.iter().copied(), SPECTRUM.stroke_width(lw))).map_err(err)?;
    chart
        .draw_secondary_series(LineSeries::new(c.jv.iter().map(|(v, j)| (*v, v * j)), POWER.stroke_width(lw)))
        .map_err(err)?;

    let plot = root.clone();
    let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
    let bx = |v: f64| (frame.css_of_x(v) * look.scale).round() as i32;
    let by = |v: f64| (frame.css_of_y(v) * look.scale).round() as i32;
    let by2 = |p: f64| (bottom as f64 - (p - y2.lo) / (y2.hi - y2.lo) * (bottom - top) as f64).round() as i32;
    if r.jmp_ma_cm2 > 0.0 && r.vmp_v > 0.0 {
        let (mx, my, mp) = (bx(r.vmp_v), by(r.jmp_ma_cm2), by2(pmax));
        let dash = look.px(5.0);
        let gapd = look.px(4.0);
        let thin = MUTED.stroke_width(look.px(1.0).max(1) as u32);
        plot.draw(&DashedPathElement::new(vec![(left, my), (mx, my), (mx, bottom)], dash, gapd, thin)).map_err(err)?;
        plot.draw(&DashedPathElement::new(
            vec![(mx, mp), (right, mp)],
            dash,
            gapd,
            POWER.mix(0.7).stroke_width(look.px(1.0).max(1) as u32),
        ))
        .map_err(err)?;
        plot.draw(&Circle::new((mx, my), look.px(5.0), GAP.filled())).map_err(err)?;
        plot.draw(&Circle::new((mx, mp), look.px(4.0), POWER.filled())).map_err(err)?;
        let text = format!("max power {} mW/cm² at {} V", sig(pmax, 4), sig(r.vmp_v, 4));
        draw_boxed_text(
            &plot,
            look,
            &text,
            mx - look.px(10.0),
            bottom - (bottom - top) / 4,
            HPos::Right,
            VPos::Center,
            &GAP,
            (left, top, right, bottom),
        )?;
    }
    if look.legend {
        let lx = left + look.px(14.0);
        let ly = top + (bottom - top) / 2;
        draw_legend_row(&plot, look, lx, ly, &SPECTRUM, false, "J–V (left axis)")?;
        draw_legend_row(&plot, look, lx, ly + look.px(20.0), &POWER, false, "P–V (right axis)")?;
    }
    Ok(frame)
}
