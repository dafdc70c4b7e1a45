//! The source spectrum with the absorbed part shaded and the band gap marked.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use crate::app::widgets::plot::{
    draw_caption, draw_legend_row, draw_tag, err, palette::*, tick_target, AxisSpec, Frame, Look,
};
use crate::scenario::PlotAxis;
use crate::view::cell::CellView;
use crate::view::format::{fixed, gap_ev};
use crate::view::spectrum::{axis_name, value_name};

pub fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &CellView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let sv = &c.spectrum;
    let gap = c.gap_ev;
    let ymax = sv.y.iter().copied().fold(0.0f64, f64::max);
    let ymax = if ymax > 0.0 { ymax } else { 1.0 };
    let x = AxisSpec::new(sv.x_lo, sv.x_hi, tick_target(look, w, 95.0), axis_name(sv.axis), sv.x_unit(), false);
    let y = AxisSpec::new(0.0, ymax * 1.12, tick_target(look, h, 55.0), value_name(sv.quantity), sv.unit(), true);
    let (mut chart, frame) = crate::app::widgets::plot::chart(root, look, &x, &y, true)?;
    let xg = sv.x_of_ev(gap);
    let in_view = xg >= x.lo && xg <= x.hi;

    // absorbed part
    let yg = sv.y_at(xg);
    let mut area: Vec<(f64, f64)> = Vec::new();
    match sv.axis {
        PlotAxis::Wavelength => {
            area.extend(sv.x.iter().zip(&sv.y).filter(|(a, _)| **a <= xg).map(|(a, b)| (*a, *b)));
            if in_view && yg > 0.0 {
                area.push((xg, yg));
            }
        }
        PlotAxis::PhotonEnergy => {
            if in_view && yg > 0.0 {
                area.push((xg, yg));
            }
            area.extend(sv.x.iter().zip(&sv.y).filter(|(a, _)| **a >= xg).map(|(a, b)| (*a, *b)));
        }
    }
    if area.len() >= 2 {
        chart.draw_series(AreaSeries::new(area, 0.0, ABSORBED.mix(0.5).filled())).map_err(err)?;
    }
    chart
        .draw_series(LineSeries::new(
            sv.x.iter().copied().zip(sv.y.iter().copied()),
            SPECTRUM.stroke_width(look.px(1.6).max(1) as u32),
        ))
        .map_err(err)?;

    // the gap marker and its handle
    let plot = root.clone();
    let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
    let label = match sv.axis {
        PlotAxis::Wavelength => format!("Eg {} eV · {} nm", gap_ev(gap), fixed(sv.x_of_ev(gap), 1)),
        PlotAxis::PhotonEnergy => format!("Eg {} eV", gap_ev(gap)),
    };
    if in_view {
        let px = frame.css_of_x(xg) * look.scale;
        let px = px.round() as i32;
        plot.draw(&PathElement::new(vec![(px, top), (px, bottom)], GAP.stroke_width(look.px(2.0).max(1) as u32)))
            .map_err(err)?;
        draw_tag(&plot, look, &label, px, top, left, right, &GAP)?;
    } else {
        // off scale: say so at the edge the gap lies beyond
        let beyond_right = xg > x.hi;
        let text = format!("{label} — off scale {}", if beyond_right { "▸" } else { "◂" });
        let anchor = if beyond_right { HPos::Right } else { HPos::Left };
        let ax = if beyond_right { right - look.px(4.0) } else { left + look.px(4.0) };
        crate::app::widgets::plot::draw_boxed_text(
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

    if look.legend {
        let lx = right - look.px(300.0).min((right - left) / 2);
        let ly = top + look.px(34.0);
        draw_legend_row(&plot, look, lx, ly, &SPECTRUM, false, &format!("{} (one sun)", sv.name))?;
        draw_legend_row(
            &plot,
            look,
            lx,
            ly + look.px(20.0),
            &ABSORBED,
            true,
            &format!("absorbed, E ≥ Eg: {} % of the power", fixed(c.absorbed_power_fraction * 100.0, 1)),
        )?;
    }
    Ok(frame)
}
