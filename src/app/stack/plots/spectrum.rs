//! The source spectrum with each subcell's absorbed band shaded in its own colour and one
//! draggable marker per band gap. Arrow keys on the plot move the selected marker (digit
//! keys select one); a drag moves the marker nearest to the pointer, kept between its
//! neighbours.

use crate::app::widgets::plot::Backend;
use plotters::coord::Shift;
use plotters::prelude::*;

use crate::app::stack::colours;
use crate::app::widgets::plot::{
    chart, draw_caption, draw_legend_row, draw_tag, err, measure, palette, tick_target, AxisSpec, Drawing, Frame, Look,
};
use crate::scenario::PlotAxis;
use crate::view::format::{fixed, gap_ev};
use crate::view::spectrum::{axis_name, value_name};
use crate::view::spectrum::{interpolate, SpectrumView};
use crate::view::stack::StackView;

/// Smallest distance kept between neighbouring gaps while dragging [eV].
pub const MIN_SPACING_EV: f64 = 0.001;

pub struct SpectrumPlot<'a> {
    pub v: &'a StackView,
    /// the marker drawn as selected
    pub selected: usize,
}

/// The plot-coordinate interval [a, b] (ascending) of photon energies [lo, hi] eV.
fn band_x(sv: &SpectrumView, lo_ev: f64, hi_ev: f64) -> (f64, f64) {
    let a = if hi_ev.is_finite() {
        sv.x_of_ev(hi_ev)
    } else if sv.axis == PlotAxis::Wavelength {
        sv.x_lo
    } else {
        sv.x_hi
    };
    let b = sv.x_of_ev(lo_ev);
    if a <= b {
        (a, b)
    } else {
        (b, a)
    }
}

/// The spectrum's points over [a, b], with interpolated end points.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(b > a)` also refuses NaN ends
fn band_points(sv: &SpectrumView, a: f64, b: f64) -> Vec<(f64, f64)> {
    let (a, b) = (a.max(sv.x_lo), b.min(sv.x_hi));
    if !(b > a) {
        return Vec::new();
    }
    let mut pts = vec![(a, interpolate(&sv.x, &sv.y, a))];
    pts.extend(sv.x.iter().zip(&sv.y).filter(|(x, _)| **x > a && **x < b).map(|(x, y)| (*x, *y)));
    pts.push((b, interpolate(&sv.x, &sv.y, b)));
    pts
}

/// Where `draw_tag` puts a tag centred at `x` between `min_x` and `max_x` [backend px].
fn tag_extent(look: &Look, text: &str, x: i32, min_x: i32, max_x: i32) -> (i32, i32) {
    let w = measure::text_width(text, look.size(11.5)).ceil() as i32 + look.px(10.0);
    let x0 = (x - w / 2).max(min_x).min(max_x - w);
    (x0, x0 + w)
}

/// The row of each tag (text, centre [backend px]), left to right: the first row in which it
/// overlaps no other tag.
fn tag_rows(look: &Look, tags: &[(&str, i32)], min_x: i32, max_x: i32) -> Vec<usize> {
    let mut rows: Vec<Vec<(i32, i32)>> = Vec::new();
    let pad = look.px(3.0);
    tags.iter()
        .map(|(text, x)| {
            let (x0, x1) = tag_extent(look, text, *x, min_x, max_x);
            let row =
                rows.iter().position(|r| r.iter().all(|&(a, b)| x1 + pad <= a || x0 >= b + pad)).unwrap_or(rows.len());
            if row == rows.len() {
                rows.push(Vec::new());
            }
            rows[row].push((x0, x1));
            row
        })
        .collect()
}

impl Drawing for SpectrumPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        draw_caption(root, look)?;
        let (w, h) = root.dim_in_pixel();
        let sv = &self.v.spectrum;
        let ymax = sv.y.iter().copied().fold(0.0f64, f64::max);
        let ymax = if ymax > 0.0 { ymax } else { 1.0 };
        let x = AxisSpec::new(sv.x_lo, sv.x_hi, tick_target(look, w, 95.0), axis_name(sv.axis), sv.x_unit(), false);
        let y = AxisSpec::new(0.0, ymax * 1.2, tick_target(look, h, 55.0), value_name(sv.quantity), sv.unit(), true);
        let (mut chart, frame) = chart(root, look, &x, &y, true)?;

        let gaps = &self.v.gaps_ev;
        // the bands: each step subcell's, then a real bottom cell's from its edge
        let edges: Vec<f64> = gaps.iter().copied().chain(self.v.bottom_edge_ev).collect();
        for (i, g) in edges.iter().enumerate() {
            let upper = if i == 0 { f64::INFINITY } else { edges[i - 1] };
            let (a, b) = band_x(sv, *g, upper);
            let pts = band_points(sv, a, b);
            if pts.len() >= 2 {
                chart.draw_series(AreaSeries::new(pts, 0.0, colours::subcell(i).mix(0.42).filled())).map_err(err)?;
            }
        }
        chart
            .draw_series(LineSeries::new(
                sv.x.iter().copied().zip(sv.y.iter().copied()),
                palette::SPECTRUM.stroke_width(look.px(1.4).max(1) as u32),
            ))
            .map_err(err)?;

        let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
        let tag_h = (look.size(11.5) * 1.45).ceil() as i32 + look.px(3.0);
        let mut order: Vec<usize> = (0..gaps.len()).filter(|&i| (x.lo..=x.hi).contains(&sv.x_of_ev(gaps[i]))).collect();
        crate::physics::order::sort_ascending_by(&mut order, |&i| sv.x_of_ev(gaps[i]));
        let px_of = |i: usize| (frame.css_of_x(sv.x_of_ev(gaps[i])) * look.scale).round() as i32;
        // the markers first, so that no marker crosses a tag
        for &i in &order {
            let px = px_of(i);
            let width = if i == self.selected { 3.0 } else { 2.0 };
            let c = colours::darker(colours::subcell(i));
            root.draw(&PathElement::new(vec![(px, top), (px, bottom)], c.stroke_width(look.px(width).max(1) as u32)))
                .map_err(err)?;
        }
        // the most detailed tags that fit in two rows (the shortest otherwise)
        let forms: [&dyn Fn(usize) -> String; 3] = [
            &|i| match sv.axis {
                PlotAxis::Wavelength => {
                    format!("{} · {} eV · {} nm", i + 1, gap_ev(gaps[i]), fixed(sv.x_of_ev(gaps[i]), 0))
                }
                PlotAxis::PhotonEnergy => format!("{} · {} eV", i + 1, gap_ev(gaps[i])),
            },
            &|i| format!("{} · {} eV", i + 1, gap_ev(gaps[i])),
            &|i| format!("{} · {}", i + 1, fixed(gaps[i], 2)),
        ];
        let mut layout = Vec::new();
        for form in forms {
            layout = order.iter().map(|&i| (i, form(i))).collect::<Vec<_>>();
            let rows =
                tag_rows(look, &layout.iter().map(|(i, t)| (t.as_str(), px_of(*i))).collect::<Vec<_>>(), left, right);
            if rows.iter().all(|r| *r < 2) {
                break;
            }
        }
        let rows =
            tag_rows(look, &layout.iter().map(|(i, t)| (t.as_str(), px_of(*i))).collect::<Vec<_>>(), left, right);
        for ((i, text), row) in layout.iter().zip(&rows) {
            let c = colours::darker(colours::subcell(*i));
            draw_tag(root, look, text, px_of(*i), top + *row as i32 * tag_h, left, right, &c)?;
        }
        let tag_rows = rows.iter().max().map(|r| r + 1).unwrap_or(1) as i32;

        if look.legend {
            let lx = right - look.px(230.0).min((right - left) / 2);
            let mut ly = top + tag_rows * tag_h + look.px(16.0);
            draw_legend_row(root, look, lx, ly, &palette::SPECTRUM, false, &format!("{} (one sun)", sv.name))?;
            for (i, s) in self.v.report.subcells.iter().enumerate() {
                ly += look.px(20.0);
                draw_legend_row(
                    root,
                    look,
                    lx,
                    ly,
                    &colours::subcell(i),
                    true,
                    &format!("subcell {}: Jsc {} mA/cm²", i + 1, fixed(s.jsc_ma_cm2, 2)),
                )?;
            }
        }
        Ok(frame)
    }
}
