//! The emissivity editor: the profile and its control points on a log-wavelength axis,
//! drawn over the sky's zenith transmittance, the sun's spectrum and the blackbody at the
//! surface temperature (both scaled to peak 1), with the 8-13 um window shaded.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::{edges, px_x, px_y};
use crate::app::widgets::plot::palette::*;
use crate::app::widgets::plot::{chart, draw_caption, draw_legend_row, err, tick_target, AxisSpec, Frame, Look};
use crate::view::radiator::csv::shown;
use crate::view::radiator::RadiatorView;

/// Radius of a control point [CSS px]; the pointer picks a point within [`PICK_RADIUS`].
pub const HANDLE_RADIUS: f64 = 5.5;
pub const PICK_RADIUS: f64 = 11.0;

pub fn draw<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &RadiatorView,
    selected: Option<usize>,
    look: &Look,
) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let (lo, hi) = c.range_um;
    let x = AxisSpec::log10(lo, hi, tick_target(look, w, 62.0), "Wavelength", "µm");
    let y = AxisSpec::new(0.0, 1.0, tick_target(look, h, 48.0), "Emissivity · transmittance", "", false);
    let (mut chart, frame) = chart(root, look, &x, &y, true)?;
    let bg = &c.background;
    let thin = look.px(1.0).max(1) as u32;

    // the atmospheric window
    let (w0, w1) = (8f64.log10(), 13f64.log10());
    if w0 > x.lo && w1 < x.hi {
        chart
            .draw_series(std::iter::once(Rectangle::new([(w0, 0.0), (w1, 1.0)], SKY.mix(0.07).filled())))
            .map_err(err)?;
    }
    chart
        .draw_series(
            AreaSeries::new(bg.x.iter().copied().zip(bg.sky.iter().copied()), 0.0, SKY.mix(0.2).filled())
                .border_style(SKY.mix(0.75).stroke_width(thin)),
        )
        .map_err(err)?;
    let sun_alpha = if c.scenario.sun.is_some() { 0.42 } else { 0.16 };
    chart
        .draw_series(AreaSeries::new(
            bg.x.iter().copied().zip(bg.sun.iter().copied()),
            0.0,
            ABSORBED.mix(sun_alpha).filled(),
        ))
        .map_err(err)?;
    chart
        .draw_series(DashedLineSeries::new(
            bg.x.iter().copied().zip(bg.bb.iter().copied()),
            look.px(6.0),
            look.px(4.0),
            BLACKBODY.stroke_width(look.px(1.6).max(1) as u32),
        ))
        .map_err(err)?;
    chart
        .draw_series(LineSeries::new(
            c.profile.x.iter().copied().zip(c.profile.eps.iter().copied()),
            EMISSIVITY.stroke_width(look.px(2.6).max(1) as u32),
        ))
        .map_err(err)?;

    let plot = root.clone();
    let (left, top, _, bottom) = edges(&frame);
    if w0 > x.lo && w1 < x.hi {
        let style = look.text(look.size(11.0), &SKY_INK).pos(Pos::new(HPos::Center, VPos::Bottom));
        let mid = (px_x(&frame, look, w0) + px_x(&frame, look, w1)) / 2;
        plot.draw_text("8–13 µm", &style, (mid, bottom - look.px(3.0))).map_err(err)?;
    }

    // control points: filled when the profile is made of them, hollow when the first edit
    // would turn the profile into them
    let r = look.px(HANDLE_RADIUS);
    let ring = look.px(1.6).max(1) as u32;
    for (i, p) in c.profile.handles.iter().enumerate() {
        let lx = p[0].log10();
        if lx < x.lo - 1e-9 || lx > x.hi + 1e-9 {
            continue;
        }
        let (px, py) = (px_x(&frame, look, lx), px_y(&frame, look, p[1]));
        if c.profile.editable && selected == Some(i) {
            plot.draw(&Circle::new((px, py), r + look.px(3.5), EMISSIVITY.mix(0.18).filled())).map_err(err)?;
            plot.draw(&Circle::new((px, py), r + look.px(1.0), EMISSIVITY.filled())).map_err(err)?;
            plot.draw(&Circle::new((px, py), r + look.px(1.0), WHITE.stroke_width(ring))).map_err(err)?;
        } else if c.profile.editable {
            plot.draw(&Circle::new((px, py), r, WHITE.filled())).map_err(err)?;
            plot.draw(&Circle::new((px, py), r, EMISSIVITY.stroke_width(ring + 1))).map_err(err)?;
        } else {
            plot.draw(&Circle::new((px, py), r - look.px(1.0), WHITE.mix(0.9).filled())).map_err(err)?;
            plot.draw(&Circle::new((px, py), r - look.px(1.0), MUTED.mix(0.8).stroke_width(ring))).map_err(err)?;
        }
    }

    if look.legend {
        let lx = left + look.px(14.0);
        let ly = top + (bottom - top) * 2 / 5;
        let rows: [(&RGBColor, bool, String); 4] = [
            (&EMISSIVITY, false, format!("emissivity: {}", shown(c.scenario.emitter.label()))),
            (&SKY, true, format!("sky zenith transmittance: {}", shown(c.scenario.sky.label()))),
            (
                &ABSORBED,
                true,
                format!("{} (peak = 1){}", bg.sun_name, if c.scenario.sun.is_some() { "" } else { ", sun off" }),
            ),
            (&BLACKBODY, false, format!("blackbody at {:.1} K (peak = 1)", c.scenario.surface_temperature())),
        ];
        for (k, (col, swatch, text)) in rows.iter().enumerate() {
            draw_legend_row(&plot, look, lx, ly + look.px(20.0) * k as i32, col, *swatch, text)?;
        }
    }
    Ok(frame)
}
