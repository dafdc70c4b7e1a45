//! Net cooling power against surface temperature, with zero, the ambient temperature, the
//! surface temperature of the balance and the steady temperature (P_net = 0) marked.

use crate::report::radiator::RadiatorMetric;
use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::{edges, padded_axis, px_x, px_y};
use crate::app::widgets::plot::palette::*;
use crate::app::widgets::plot::{
    chart, draw_boxed_text, draw_caption, draw_legend_row, draw_tag, err, tick_target, AxisSpec, Frame, Look,
};
use crate::view::radiator::RadiatorView;

pub fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &RadiatorView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let sc = &c.scenario;
    let r = &c.report;
    let (from, to) = (sc.curve_from_k, sc.curve_to_k);
    let lo = c.curve.iter().map(|p| p.net).fold(0.0f64, f64::min);
    let hi = c.curve.iter().map(|p| p.net).fold(0.0f64, f64::max);
    let x = AxisSpec::new(from, to, tick_target(look, w, 80.0), "Surface temperature", "K", false);
    let y = padded_axis(lo, hi.max(lo + 1.0), tick_target(look, h, 48.0), "Net cooling power P_net", "W/m²");
    let (mut chart, frame) = chart(root, look, &x, &y, true)?;
    let plot = root.clone();
    let (left, top, right, bottom) = edges(&frame);
    let thin = look.px(1.0).max(1) as u32;

    let zero = px_y(&frame, look, 0.0);
    plot.draw(&PathElement::new(vec![(left, zero), (right, zero)], INK.stroke_width(look.px(1.2).max(1) as u32)))
        .map_err(err)?;
    let ta = r.ambient_temp_k;
    if ta >= from && ta <= to {
        let px = px_x(&frame, look, ta);
        plot.draw(&DashedPathElement::new(
            vec![(px, top), (px, bottom)],
            look.px(5.0),
            look.px(4.0),
            AIR.stroke_width(thin),
        ))
        .map_err(err)?;
    }
    chart
        .draw_series(LineSeries::new(
            c.curve.iter().map(|p| (p.temp_k, p.net)),
            CURVE.stroke_width(look.px(2.2).max(1) as u32),
        ))
        .map_err(err)?;

    // the balance's own surface temperature
    let ts = r.surface_temp_k;
    if ts >= from && ts <= to {
        let (px, py) = (px_x(&frame, look, ts), px_y(&frame, look, r.net_w_m2));
        plot.draw(&Circle::new((px, py), look.px(4.5), EMITTED.filled())).map_err(err)?;
        plot.draw(&Circle::new((px, py), look.px(4.5), WHITE.stroke_width(look.px(1.5).max(1) as u32))).map_err(err)?;
    }
    // the steady temperature, or where it lies
    match r.steady_temp_k {
        Some(t) if t >= from && t <= to => {
            let (px, py) = (px_x(&frame, look, t), px_y(&frame, look, 0.0));
            let s = look.px(6.0);
            plot.draw(&Polygon::new(vec![(px, py - s), (px + s, py), (px, py + s), (px - s, py)], BEST.filled()))
                .map_err(err)?;
            draw_tag(
                &plot,
                look,
                &format!("steady {}", r.display(RadiatorMetric::SteadyTemp)),
                px,
                top,
                left,
                right,
                &BEST,
            )?;
        }
        _ => {
            let text = match r.steady_temp_k {
                Some(t) if t < from => format!("steady {} — below this range ◂", r.display(RadiatorMetric::SteadyTemp)),
                Some(_) => format!("steady {} — above this range ▸", r.display(RadiatorMetric::SteadyTemp)),
                None => format!("steady temperature: {}", r.steady_text()),
            };
            let right_side = r.steady_temp_k.is_some_and(|t| t > to);
            let (anchor, ax) =
                if right_side { (HPos::Right, right - look.px(4.0)) } else { (HPos::Left, left + look.px(4.0)) };
            draw_boxed_text(
                &plot,
                look,
                &text,
                ax,
                top + look.px(4.0),
                anchor,
                VPos::Top,
                &BEST,
                (left, top, right, bottom),
            )?;
        }
    }

    if look.legend {
        let lx = left + look.px(14.0);
        let ly = bottom - look.px(60.0);
        draw_legend_row(&plot, look, lx, ly, &CURVE, false, "net cooling power P_net(T) (> 0 cools)")?;
        draw_legend_row(
            &plot,
            look,
            lx,
            ly + look.px(20.0),
            &AIR,
            false,
            &format!("ambient {}", r.display(RadiatorMetric::AmbientTemp)),
        )?;
        draw_legend_row(
            &plot,
            look,
            lx,
            ly + look.px(40.0),
            &EMITTED,
            false,
            &format!("balance at {}: {}", r.display(RadiatorMetric::SurfaceTemp), r.display(RadiatorMetric::NetPower)),
        )?;
    }
    Ok(frame)
}
