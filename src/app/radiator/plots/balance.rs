//! The balance at the surface temperature as a waterfall: the emitted power, then what the
//! sky, the sun and the air give back, down to the net cooling power.

use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::{edges, padded_axis, px_x, px_y};
use crate::app::widgets::plot::measure::text_width;
use crate::app::widgets::plot::palette::*;
use crate::app::widgets::plot::{chart, draw_caption, err, tick_target, AxisSpec, Frame, Look};
use crate::view::radiator::{balance_amounts, balance_steps, RadiatorView, BALANCE_BARS};

/// The bars' names on the axis, and shorter ones for narrow plots.
const BARS_SHORT: [&str; 5] = ["out", "sky", "sun", "air", "net"];

fn signed(v: f64) -> String {
    let s = format!("{:.1}", v.abs());
    if s.trim_start_matches(['0', '.']).is_empty() {
        "0.0".into()
    } else if v < 0.0 {
        format!("−{s}")
    } else {
        format!("+{s}")
    }
}

pub fn draw<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &RadiatorView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let bars = balance_steps(c);
    // the names need their width and some room each, in about four fifths of the width
    let widest = BALANCE_BARS.iter().map(|n| text_width(n, look.tick_font())).fold(0.0f64, f64::max);
    let names = if (widest + look.size(14.0)) * BALANCE_BARS.len() as f64 > 0.8 * w as f64 {
        &BARS_SHORT
    } else {
        &BALANCE_BARS
    };
    let lo = bars.iter().flat_map(|b| [b.0, b.1]).fold(0.0f64, f64::min);
    let hi = bars.iter().flat_map(|b| [b.0, b.1]).fold(0.0f64, f64::max);
    let x = AxisSpec::named(names, "Term of the balance at the surface temperature");
    let y = padded_axis(lo, hi.max(lo + 1.0), tick_target(look, h, 48.0), "Power", "W/m²");
    let (mut chart, frame) = chart(root, look, &x, &y, false)?;
    let net_colour = if c.report.net_w_m2 >= 0.0 { CURVE } else { GAP };
    let colours = [EMITTED, SKY, ABSORBED, AIR, net_colour];
    let half = 0.3;
    for (i, (a, b)) in bars.iter().enumerate() {
        let xc = i as f64 + 0.5;
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(xc - half, *a), (xc + half, *b)],
                colours[i].mix(0.85).filled(),
            )))
            .map_err(err)?;
    }

    let plot = root.clone();
    let (left, top, right, _) = edges(&frame);
    let zero = px_y(&frame, look, 0.0);
    plot.draw(&PathElement::new(vec![(left, zero), (right, zero)], INK.stroke_width(look.px(1.2).max(1) as u32)))
        .map_err(err)?;
    // connectors between the running levels
    let thin = MUTED.stroke_width(look.px(1.0).max(1) as u32);
    for (i, bar) in bars.iter().take(4).enumerate() {
        let level = bar.1;
        let (x0, x1) = (px_x(&frame, look, i as f64 + 0.5 + half), px_x(&frame, look, i as f64 + 1.5 - half));
        let yl = px_y(&frame, look, level);
        plot.draw(&DashedPathElement::new(vec![(x0, yl), (x1, yl)], look.px(3.0), look.px(3.0), thin)).map_err(err)?;
    }
    // amounts beside each bar's upper end
    let amounts = balance_amounts(c);
    let fs = look.size(12.0);
    for (i, (a, b)) in bars.iter().enumerate() {
        let xc = px_x(&frame, look, i as f64 + 0.5);
        let top_v = a.max(*b);
        let text = if i == 4 { format!("{:.1}", amounts[i]).replace('-', "−") } else { signed(amounts[i]) };
        let yt = (px_y(&frame, look, top_v) - look.px(4.0)).max(top + (fs * 1.1) as i32);
        let style = look.text(fs, &INK).pos(Pos::new(HPos::Center, VPos::Bottom));
        plot.draw_text(&text, &style, (xc, yt)).map_err(err)?;
    }
    Ok(frame)
}
