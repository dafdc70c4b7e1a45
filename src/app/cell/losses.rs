//! Where the incident power goes in the single-junction cell of the solar-cell panel: a
//! stacked bar for its band gap and stacked areas against band gap (below the gap,
//! thermalization, emission, Carnot, Boltzmann, delivered). Clicking the areas moves the
//! single cell's gap.

use crate::app::widgets::plot::Backend;
use crate::view::controls::Control;
use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use crate::view::export::ExportKind;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::state::{CellState, LOSSES};
use crate::app::stack::colours;
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::export::offer;
use crate::app::widgets::plot::{
    chart, draw_caption, draw_tag, err, palette, tick_target, AxisSpec, Drawing, Frame, Look,
};
use crate::report::stack::LossReport;
use crate::view::cell::losses::LossView;
use crate::view::format::{fixed, gap_ev};
use crate::view::spectrum::nearest;

/// Short names of the parts, in the order of [`LossReport::parts`].
const SHORT: [&str; 6] = ["below gap", "thermalization", "emission", "Carnot", "Boltzmann", "delivered"];

/// The parts of a breakdown as percentages of the incident power.
fn percents(r: &LossReport) -> [f64; 6] {
    let p = r.parts();
    let f = if r.input_w_m2 > 0.0 { 100.0 / r.input_w_m2 } else { 0.0 };
    [p[0].1 * f, p[1].1 * f, p[2].1 * f, p[3].1 * f, p[4].1 * f, p[5].1 * f]
}

/// The stacked bar of the single cell on `area`; labels go on `root`.
fn draw_bar<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    root: &DrawingArea<DB, Shift>,
    look: &Look,
    cell: &LossReport,
    h: u32,
) -> Result<(), String> {
    let label = format!("Eg {} eV", gap_ev(cell.gap_ev));
    let bx = AxisSpec::named(&[label.as_str()], "");
    let y = AxisSpec::new(0.0, 100.0, tick_target(look, h, 50.0), "Share of the incident power", "%", false);
    let (mut bar, bar_frame) = chart(area, look, &bx, &y, false)?;
    let mut base = 0.0;
    let pc = percents(cell);
    for (j, v) in pc.iter().enumerate() {
        bar.draw_series(std::iter::once(Rectangle::new([(0.18, base), (0.82, base + v)], colours::LOSS[j].filled())))
            .map_err(err)?;
        base += v;
    }
    // labels of the parts tall enough to hold one
    let fs = look.size(11.0);
    base = 0.0;
    for (j, v) in pc.iter().enumerate() {
        let mid = base + v / 2.0;
        base += v;
        let py = (bar_frame.css_of_y(mid) * look.scale).round() as i32;
        let px = (bar_frame.css_of_x(0.5) * look.scale).round() as i32;
        let tall = (bar_frame.css_of_y(0.0) - bar_frame.css_of_y(*v)) * look.scale;
        if tall >= fs * 1.3 {
            let c = if colours::is_dark(colours::LOSS[j]) { WHITE } else { palette::INK };
            let style = look.text(fs, &c).pos(Pos::new(HPos::Center, VPos::Center));
            root.draw_text(&format!("{} %", fixed(*v, 1)), &style, (px, py)).map_err(err)?;
        }
    }

    Ok(())
}

pub struct LossPlot<'a> {
    pub l: &'a LossView,
}

impl Drawing for LossPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        draw_caption(root, look)?;
        let (w, h) = root.dim_in_pixel();
        let cell = &self.l.cell;
        // on a narrow plot the bar is left out (the legend gives its numbers)
        let with_bar = w as f64 >= look.size(560.0);
        let bar_w = if with_bar { (w as f64 * 0.2).clamp(look.size(120.0), look.size(200.0)) as u32 } else { 0 };
        let (bar_area, area) = root.split_horizontally(bar_w);
        let (aw, _) = area.dim_in_pixel();
        if with_bar {
            draw_bar(&bar_area, root, look, cell, h)?;
        }

        // the areas against band gap
        let curve = &self.l.curve;
        let x = AxisSpec::new(self.l.from_ev, self.l.to_ev, tick_target(look, aw, 90.0), "Band gap", "eV", false);
        let (name, unit) = if with_bar { ("", "") } else { ("Share of the incident power", "%") };
        let ya = AxisSpec::new(0.0, 100.0, tick_target(look, h, 50.0), name, unit, false);
        let (mut chart2, frame) = chart(&area, look, &x, &ya, true)?;
        let cum: Vec<[f64; 6]> = curve
            .iter()
            .map(|r| {
                let p = percents(r);
                let mut c = [0.0; 6];
                let mut s = 0.0;
                for (cj, pj) in c.iter_mut().zip(p.iter()) {
                    s += pj;
                    *cj = s;
                }
                c
            })
            .collect();
        for j in 0..6 {
            let upper: Vec<(f64, f64)> = curve.iter().zip(&cum).map(|(r, c)| (r.gap_ev, c[j])).collect();
            let lower: Vec<(f64, f64)> =
                curve.iter().zip(&cum).rev().map(|(r, c)| (r.gap_ev, if j == 0 { 0.0 } else { c[j - 1] })).collect();
            let poly: Vec<(f64, f64)> = upper.into_iter().chain(lower).collect();
            chart2.draw_series(std::iter::once(Polygon::new(poly, colours::LOSS[j].mix(0.9).filled()))).map_err(err)?;
        }
        // the cell's gap
        let g = cell.gap_ev;
        let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
        if g >= x.lo && g <= x.hi {
            let px = (frame.css_of_x(g) * look.scale).round() as i32;
            root.draw(&PathElement::new(
                vec![(px, top), (px, bottom)],
                palette::GAP.stroke_width(look.px(2.0).max(1) as u32),
            ))
            .map_err(err)?;
            draw_tag(root, look, &format!("Eg {} eV", gap_ev(g)), px, top, left, right, &palette::GAP)?;
        }
        if look.legend {
            let fs = look.size(11.5);
            let mut lx = left + look.px(8.0);
            let ly = bottom - look.px(14.0);
            for (colour, short) in colours::LOSS.iter().zip(SHORT) {
                root.draw(&Rectangle::new(
                    [(lx, ly - look.px(5.0)), (lx + look.px(12.0), ly + look.px(5.0))],
                    colour.filled(),
                ))
                .map_err(err)?;
                let style = look.text(fs, &palette::INK).pos(Pos::new(HPos::Left, VPos::Center));
                root.draw_text(short, &style, (lx + look.px(16.0), ly)).map_err(err)?;
                lx += look.px(24.0) + crate::app::widgets::plot::measure::text_width(short, fs) as i32;
            }
        }
        Ok(frame)
    }
}

struct LossCard {
    cs: CellState,
}

impl LossCard {
    fn gap_at(&self, x: f64, y: f64) -> Option<f64> {
        let f = self.cs.frame(LOSSES);
        (f.is_valid() && f.contains_css(x, y, 8.0)).then(|| (f.x_at_css(x) * 1000.0).round() / 1000.0)
    }
}

impl PlotBehaviour for LossCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let l = self.cs.losses.get_untracked()?;
        let f = self.cs.frame(LOSSES);
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let gaps: Vec<f64> = l.curve.iter().map(|r| r.gap_ev).collect();
        let i = nearest(&gaps, f.x_at_css(x))?;
        let r = &l.curve[i];
        let p = percents(r);
        let mut lines = vec![format!("Eg {} eV", fixed(r.gap_ev, 3))];
        lines.extend((0..6).rev().map(|j| format!("{} {} %", SHORT[j], fixed(p[j], 1))));
        lines.push("click to move the cell's gap here".into());
        Some(Hover::new(x, y, width, None, lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        match self.gap_at(x, y) {
            Some(g) => {
                self.cs.ctx.set_gap(Control::Gap, g);
                true
            }
            None => false,
        }
    }

    fn drag(&self, x: f64, y: f64) {
        if let Some(g) = self.gap_at(x, y) {
            self.cs.ctx.set_gap(Control::Gap, g);
        }
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let l = self.cs.losses.get_untracked().ok_or("nothing has been computed yet")?;
        let cap = self.cs.ctx.scenario.with_untracked(|s| {
            crate::view::cell::csv::conditions_caption(s, "cell", "where the power goes in a single-junction cell")
        });
        offer(kind, "losses", &LossPlot { l: &l }, || cap.clone(), || crate::view::cell::losses::losses_csv(&l, &cap))
    }
}

fn legend(cs: CellState) -> impl IntoView {
    move || {
        cs.losses.with(|l| {
            let l = l.as_ref()?;
            let p = percents(&l.cell);
            Some(
                (0..6)
                    .map(|j| {
                        let style = format!("background:{}", colours::css(colours::LOSS[j]));
                        view! { <span class="key" data-loss=SHORT[j]><i class="k-fill" style=style></i>{format!("{} {} %", SHORT[j], fixed(p[j], 1))}</span> }
                    })
                    .collect_view(),
            )
        })
    }
}

pub fn losses_card(cs: CellState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = cs.ctx;
    let note = view! {
        <p class="hint loss-note">
            {move || ctx.scenario.with(|s| format!(
                "This cell (Eg {} eV) and the same split against band gap; the parts add up to the incident power.",
                gap_ev(s.cell.gap_ev)
            ))}
        </p>
    };
    plot_card(
        ctx,
        Card {
            slug: "losses",
            title: "Where the power goes (single junction)",
            aria: "Stacked bar of the incident power of the single-junction cell split into below-gap, thermalization, emission, Carnot and Boltzmann losses and the delivered power, and the same split as stacked areas against band gap. Click the areas to move the cell's gap.".into(),
            interactive: true,
            wrap_class: "draggable",
            control: None,
            tools: ().into_any(),
            legend: legend(cs).into_any(),
            note: ().into_any(),
            footer: note.into_any(),
            canvas,
            plot_error: Signal::derive(move || cs.plot_errors.with(|e| e[LOSSES].clone())),
        },
        Rc::new(LossCard { cs }),
    )
}
