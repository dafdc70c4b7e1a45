//! The source spectrum with each subcell's absorbed band shaded in its own colour and one
//! draggable marker per band gap. Arrow keys on the plot move the selected marker (digit
//! keys select one); a drag moves the marker nearest to the pointer, kept between its
//! neighbours.

use crate::view::controls::Control;
use std::fmt::Write;
use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use crate::view::export::ExportKind;
use plotters::coord::Shift;
use plotters::prelude::*;

use super::{colours, save_plot, set_gaps, StackState, SPECTRUM};
use crate::app::cell::plots::spectrum::{axis_name, value_name};
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::plot::{
    chart, draw_caption, draw_legend_row, draw_tag, err, measure, palette, tick_target, AxisSpec, Drawing, Frame, Look,
};
use crate::scenario::{PlotAxis, GAP_RANGE_EV};
use crate::view::format::{csv_num, fixed, gap_ev, sig};
use crate::view::input::{ev_of_nm, tidy};
use crate::view::spectrum::{interpolate, nearest, SpectrumView};
use crate::view::stack::StackView;

/// Smallest distance kept between neighbouring gaps while dragging [eV].
const MIN_SPACING_EV: f64 = 0.001;

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

/// Which subcell (0 = top) absorbs photons of energy `e_ev`, if any.
pub fn absorbing(gaps_ev: &[f64], e_ev: f64) -> Option<usize> {
    gaps_ev.iter().position(|g| e_ev >= *g)
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
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, look: &Look) -> Result<Frame, String> {
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
        for (i, g) in gaps.iter().enumerate() {
            let upper = if i == 0 { f64::INFINITY } else { gaps[i - 1] };
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
        order.sort_by(|a, b| sv.x_of_ev(gaps[*a]).total_cmp(&sv.x_of_ev(gaps[*b])));
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

/// The spectrum as CSV, each point with the subcell that absorbs it.
fn spectrum_csv(v: &StackView, what: &str) -> String {
    let sv = &v.spectrum;
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(
        out,
        "# band gaps top first (eV): {}",
        v.gaps_ev.iter().map(|g| gap_ev(*g)).collect::<Vec<_>>().join(", ")
    );
    let _ = writeln!(out, "# subcell = which subcell absorbs the photon (1 = top), 0 = below every gap");
    let _ = writeln!(out, "# Detailed-balance limits of an ideal stack: upper bounds, not predictions of a device.");
    let unit = sv.unit().replace('⁻', "-").replace('¹', "1").replace('²', "2");
    let _ = writeln!(
        out,
        "{} ({}),{} ({unit}),subcell",
        axis_name(sv.axis).to_lowercase(),
        sv.x_unit(),
        value_name(sv.quantity).to_lowercase()
    );
    for (x, y) in sv.x.iter().zip(&sv.y) {
        let k = absorbing(&v.gaps_ev, sv.ev_of_x(*x)).map(|i| i + 1).unwrap_or(0);
        let _ = writeln!(out, "{},{},{k}", csv_num(*x), csv_num(*y));
    }
    out
}

/// What the spectrum plot does with the pointer and keys.
struct SpectrumCard {
    sc: StackState,
}

impl SpectrumCard {
    fn view(&self) -> Option<std::sync::Arc<StackView>> {
        self.sc.view.get_untracked()
    }

    /// The marker nearest to CSS x and its distance [CSS px].
    fn nearest_marker(&self, v: &StackView, f: &Frame, x_css: f64) -> Option<(usize, f64)> {
        v.gaps_ev
            .iter()
            .enumerate()
            .map(|(i, g)| (i, (f.css_of_x(v.spectrum.x_of_ev(*g)) - x_css).abs()))
            .min_by(|a, b| a.1.total_cmp(&b.1))
    }

    /// Move gap `i` to `g` eV, kept strictly between its neighbours.
    fn move_gap(&self, i: usize, g: f64) {
        let mut gaps = self.sc.gaps();
        if i >= gaps.len() {
            return;
        }
        let below = gaps.get(i + 1).copied().unwrap_or(GAP_RANGE_EV.0 - MIN_SPACING_EV);
        let above = if i == 0 { GAP_RANGE_EV.1 + MIN_SPACING_EV } else { gaps[i - 1] };
        let g = tidy(g.clamp(below + MIN_SPACING_EV, above - MIN_SPACING_EV));
        gaps[i] = g;
        set_gaps(self.sc.ctx, Control::StackSpectrum, gaps);
    }

    fn move_to(&self, x_css: f64) {
        let Some(v) = self.view() else { return };
        let f = self.sc.frame(SPECTRUM);
        let g = (v.spectrum.ev_of_x(f.x_at_css(x_css)) * 1000.0).round() / 1000.0;
        self.move_gap(self.sc.selected.get_untracked(), g);
    }
}

impl PlotBehaviour for SpectrumCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let v = self.view()?;
        let f = self.sc.frame(SPECTRUM);
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let sv = &v.spectrum;
        let i = nearest(&sv.x, f.x_at_css(x))?;
        let (px, py) = (sv.x[i], sv.y[i]);
        let e = sv.ev_of_x(px);
        let coord = match sv.axis {
            PlotAxis::Wavelength => format!("λ {} nm · {} eV", fixed(px, 1), fixed(e, 3)),
            PlotAxis::PhotonEnergy => format!("E {} eV · λ {} nm", fixed(px, 3), fixed(ev_of_nm(1.0) / e, 1)),
        };
        let who = match absorbing(&v.gaps_ev, e) {
            Some(k) => format!("absorbed by subcell {}{}", k + 1, if k == 0 { " (top)" } else { "" }),
            None => "below every gap: passes through".to_string(),
        };
        let lines = vec![coord, format!("{} {}", sig(py, 4), sv.unit()), who, "drag a marker to move its gap".into()];
        Some(Hover::new(x, y, width, Some((f.css_of_x(px), f.css_of_y(py))), lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        let f = self.sc.frame(SPECTRUM);
        let Some(v) = self.view() else { return false };
        if !f.is_valid() || !f.contains_css(x, y, 12.0) {
            return false;
        }
        let Some((i, dist)) = self.nearest_marker(&v, &f, x) else { return false };
        self.sc.selected.set(i);
        // a press on a marker grabs it; elsewhere the nearest marker jumps to the pointer
        if dist > 10.0 {
            self.move_to(x);
        }
        true
    }

    fn drag(&self, x: f64, _y: f64) {
        self.move_to(x);
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let key = ev.key();
        let n = self.sc.ctx.scenario.with_untracked(|s| s.stack.gaps_ev.len());
        if let Some(d) = key.chars().next().and_then(|c| c.to_digit(10)).filter(|_| key.chars().count() == 1) {
            let d = d as usize;
            if (1..=n).contains(&d) {
                self.sc.selected.set(d - 1);
                return true;
            }
            return false;
        }
        let wavelength = self.sc.ctx.scenario.with_untracked(|s| s.view.spectrum_axis == PlotAxis::Wavelength);
        // on a wavelength axis, right means longer wavelengths: a smaller gap
        let right = if wavelength { -1.0 } else { 1.0 };
        let dir = match key.as_str() {
            "ArrowUp" => 1.0,
            "ArrowDown" => -1.0,
            "ArrowRight" => right,
            "ArrowLeft" => -right,
            _ => return false,
        };
        let i = self.sc.selected.get_untracked().min(n.saturating_sub(1));
        if let Some(g) = self.sc.gaps().get(i).copied() {
            self.move_gap(i, g + dir * crate::app::widgets::fields::key_step(ev));
        }
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let v = self.view().ok_or("nothing has been computed yet")?;
        let describe = format!("{}-junction stack, absorbed bands", v.gaps_ev.len());
        save_plot(self.sc, "stack-spectrum", kind, &describe, &SpectrumPlot { v: &v, selected: usize::MAX }, |cap| {
            spectrum_csv(&v, cap)
        })
    }
}

fn legend(sc: StackState) -> impl IntoView {
    move || {
        sc.view.with(|v| {
            let v = v.as_ref()?;
            let keys = v
                .report
                .subcells
                .iter()
                .enumerate()
                .map(|(i, s)| {
                    let style = format!("background:{}", colours::css(colours::subcell(i)));
                    view! {
                        <span class="key"><i class="k-fill" style=style></i>{format!("{}: {} eV, Jsc {} mA/cm²", i + 1, gap_ev(s.gap_ev), fixed(s.jsc_ma_cm2, 2))}</span>
                    }
                })
                .collect_view();
            Some(view! {
                <span class="key"><i class="k-line k-spectrum"></i>{format!("{}, one sun", v.spectrum.name)}</span>
                {keys}
            })
        })
    }
}

pub fn spectrum_card(sc: StackState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = sc.ctx;
    let note = view! {
        <p class="field-error" data-error=Control::StackSpectrum.as_str() aria-live="polite">{move || ctx.error_of(Control::StackSpectrum)}</p>
    };
    plot_card(
        ctx,
        Card {
            slug: "stack-spectrum",
            title: "Absorbed bands of the subcells",
            aria: "Source spectrum with each subcell's absorbed band shaded and its band gap marked. Drag a marker to move that gap; arrow keys move the selected marker by 1 meV (Shift: 10 meV), digit keys 1 to 6 select a marker.".into(),
            interactive: true,
            wrap_class: "draggable",
            control: None,
            tools: ().into_any(),
            legend: legend(sc).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: Signal::derive(move || sc.plot_errors.with(|e| e[SPECTRUM].clone())),
        },
        Rc::new(SpectrumCard { sc }),
    )
}
