//! The hot-emitter panel's plot cards: legends, hover read-outs, the band set by dragging
//! over the blackbody spectrum, the axes toggle, the trade-off's gap range, and downloads.

use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use crate::app::hot::plots::{HotPlot, Map};
use crate::app::hot::state::{HotState, Slot};
use crate::app::state::mark;
use crate::app::widgets::card::{plot_card, range_input, Card, Hover, PlotBehaviour};
use crate::app::widgets::export::offer;
use crate::view::controls::Control;
use crate::view::export::ExportKind;
use crate::view::format::{fixed, sig};
use crate::view::hot::csv::{
    absorber_caption, absorber_csv, blackbody_caption, blackbody_csv, exchange_csv, jv_csv, tpv_caption, tradeoff_csv,
};
use crate::view::hot::ev_of_um;
use crate::view::spectrum::nearest;

struct ReadOut {
    hot: HotState,
    slot: Slot,
}

impl ReadOut {
    fn map(&self) -> Map {
        match self.slot {
            Slot::Spectrum => {
                let log = self.hot.bb.with_untracked(|v| v.as_ref().is_some_and(|v| v.scenario.log_axes));
                Map { log_x: log, log_y: log }
            }
            Slot::Exchange => Map { log_x: true, log_y: false },
            _ => Map { log_x: false, log_y: false },
        }
    }

    /// The wavelength under CSS x on the blackbody plot [um].
    fn um_at(&self, x: f64) -> f64 {
        self.map().x_value(self.hot.frame(self.slot).x_at_css(x))
    }
}

impl PlotBehaviour for ReadOut {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.hot.frame(self.slot);
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let m = self.map();
        let at = f.x_at_css(x);
        match self.slot {
            Slot::Spectrum => {
                let v = self.hot.bb.get_untracked()?;
                let um = m.x_value(at);
                let xs: Vec<f64> = v.rows.iter().map(|r| r[0]).collect();
                let i = nearest(&xs, um)?;
                let r = v.rows[i];
                let mut lines = vec![
                    format!("{} µm ({} eV)", sig(r[0], 4), sig(ev_of_um(r[0]), 4)),
                    format!("Planck {} W/(m²·µm)", sig(r[1], 4)),
                ];
                if v.scenario.wien {
                    lines.push(format!("Wien {} W/(m²·µm)", sig(r[2], 4)));
                }
                if v.scenario.rayleigh_jeans {
                    lines.push(format!("Rayleigh-Jeans {} W/(m²·µm)", sig(r[3], 4)));
                }
                if let Some(e) = v.emitter.as_ref().and_then(|e| e.points.get(i)) {
                    lines.push(format!("emitter {} W/(m²·µm)", sig(e[1], 4)));
                }
                lines.push("drag across the plot to set the band".into());
                let dot = (f.css_of_x(m.x(r[0])), f.css_of_y(m.y(r[1])));
                let dot = f.contains_css(dot.0, dot.1, 0.0).then_some(dot);
                Some(Hover::new(x, y, width, dot, lines))
            }
            Slot::Exchange => {
                let v = self.hot.tpv.get_untracked()?;
                let um = m.x_value(at);
                let xs: Vec<f64> = v.exchange.iter().map(|p| p.um).collect();
                let p = v.exchange[nearest(&xs, um)?];
                let side = if p.above_gap { "above the gap" } else { "below the gap" };
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(m.x(p.um)), f.css_of_y(p.emitted))),
                    vec![
                        format!("{} µm ({} eV), {side}", sig(p.um, 4), sig(ev_of_um(p.um), 4)),
                        format!("emitted {} W/(m²·µm)", sig(p.emitted, 4)),
                        format!("absorbed by the cell {} W/(m²·µm)", sig(p.absorbed, 4)),
                        format!("returned to the emitter {} W/(m²·µm)", sig(p.returned, 4)),
                    ],
                ))
            }
            Slot::Jv => {
                let v = self.hot.tpv.get_untracked()?;
                let xs: Vec<f64> = v.jv.iter().map(|p| p[0]).collect();
                let p = v.jv[nearest(&xs, at)?];
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(p[0]), f.css_of_y(p[1]))),
                    vec![
                        format!("V {} V", fixed(p[0], 4)),
                        format!("J {} A/cm²", sig(p[1], 4)),
                        format!("P {} W/cm²", sig(p[0] * p[1], 4)),
                    ],
                ))
            }
            Slot::Tradeoff => {
                let v = self.hot.tpv.get_untracked()?;
                let xs: Vec<f64> = v.tradeoff.points.iter().map(|p| p.gap_ev).collect();
                let p = v.tradeoff.points[nearest(&xs, at)?];
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(p.gap_ev), f.css_of_y(p.efficiency * 100.0))),
                    vec![
                        format!("gap {} eV", fixed(p.gap_ev, 4)),
                        format!("efficiency {} %", fixed(p.efficiency * 100.0, 2)),
                        format!("power density {} W/cm²", sig(p.pmax_w_cm2, 4)),
                    ],
                ))
            }
            Slot::Absorber => {
                let v = self.hot.abs.get_untracked()?;
                let xs: Vec<f64> = v.curve.iter().map(|p| p[0]).collect();
                let p = v.curve[nearest(&xs, at)?];
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(p[0]), f.css_of_y(p[2] * 100.0))),
                    vec![
                        format!("T {} K", fixed(p[0], 1)),
                        format!("thermal {} %", fixed(p[1] * 100.0, 2)),
                        format!("work {} %", fixed(p[2] * 100.0, 2)),
                    ],
                ))
            }
        }
    }

    fn press(&self, x: f64, y: f64) -> bool {
        if self.slot != Slot::Spectrum || !self.hot.frame(self.slot).contains_css(x, y, 0.0) {
            return false;
        }
        self.hot.band_drag.set_value(Some(self.um_at(x)));
        true
    }

    fn drag(&self, x: f64, _y: f64) {
        let Some(start) = self.hot.band_drag.get_value() else { return };
        let now = self.um_at(x);
        let (a, b) = if now < start { (now, start) } else { (start, now) };
        if b > a * 1.001 {
            mark("gg-edit");
            let r = |v: f64| crate::view::format::round_sig(v, 4);
            self.hot.ctx.edit(Control::HotBand, |s| s.hot.blackbody.band_um = Some([r(a), r(b)]));
        }
    }

    fn release(&self) {
        self.hot.band_drag.set_value(None);
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let slug = self.slot.slug();
        let none = || "nothing has been computed yet".to_string();
        match self.slot {
            Slot::Spectrum => {
                let v = self.hot.bb.get_untracked().ok_or_else(none)?;
                offer(
                    kind,
                    slug,
                    &HotPlot::Blackbody(self.slot, v.clone()),
                    || blackbody_caption(&v),
                    || blackbody_csv(&v),
                )
            }
            Slot::Absorber => {
                let v = self.hot.abs.get_untracked().ok_or_else(none)?;
                offer(
                    kind,
                    slug,
                    &HotPlot::Absorber(self.slot, v.clone()),
                    || absorber_caption(&v),
                    || absorber_csv(&v),
                )
            }
            slot => {
                let v = self.hot.tpv.get_untracked().ok_or_else(none)?;
                let csv = || match slot {
                    Slot::Exchange => exchange_csv(&v),
                    Slot::Jv => jv_csv(&v),
                    _ => tradeoff_csv(&v),
                };
                offer(kind, slug, &HotPlot::Tpv(slot, v.clone()), || tpv_caption(&v), csv)
            }
        }
    }
}

fn plot_error(hot: HotState, slot: Slot) -> Signal<Option<String>> {
    Signal::derive(move || hot.plot_errors.with(|e| e[slot.index()].clone()))
}

#[allow(clippy::too_many_arguments)]
fn card(
    hot: HotState,
    slot: Slot,
    title: &'static str,
    aria: &'static str,
    interactive: bool,
    tools: AnyView,
    legend: AnyView,
    note: AnyView,
    canvas: NodeRef<html::Canvas>,
) -> impl IntoView {
    plot_card(
        hot.ctx,
        Card {
            slug: slot.slug(),
            title,
            aria: aria.into(),
            interactive,
            wrap_class: if interactive { "band-drag" } else { "" },
            control: interactive.then_some("blackbody-plot"),
            tools,
            legend,
            note,
            footer: ().into_any(),
            canvas,
            plot_error: plot_error(hot, slot),
        },
        Rc::new(ReadOut { hot, slot }),
    )
}

fn key(class: &'static str, text: String) -> impl IntoView {
    view! { <span class="key"><i class=class></i>{text}</span> }
}

pub fn spectrum_card(hot: HotState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = hot.ctx;
    let log = Memo::new(move |_| ctx.scenario.with(|s| s.hot.blackbody.log_axes));
    let seg = |value: bool, text: &'static str, slug: &'static str| {
        view! {
            <button type="button" data-view=format!("hot-axes-{slug}") aria-pressed=move || if log.get() == value { "true" } else { "false" }
                on:click=move |_| { ctx.edit(Control::HotAxes, |s| s.hot.blackbody.log_axes = value); }>{text}</button>
        }
    };
    let tools = view! {
        <div class="seg" role="group" aria-label="Axes" data-control=Control::HotAxes.as_str()>
            {seg(true, "Log axes", "log")}
            {seg(false, "Linear", "linear")}
        </div>
    };
    let legend = move || {
        hot.bb.with(|v| {
            v.as_ref().map(|v| {
                let sc = &v.scenario;
                view! {
                    {key("k-line k-spectrum", format!("Planck's law at {} K", sig(v.report.temp_k, 6)))}
                    {sc.wien.then(|| key("k-line k-dash-wien", "Wien's approximation".into()))}
                    {sc.rayleigh_jeans.then(|| key("k-line k-dash-rj", "Rayleigh-Jeans".into()))}
                    {v.emitter.as_ref().map(|e| key("k-line k-emitter", format!("TPV emitter at {} K (ε × Planck)", sig(e.temp_k, 6))))}
                    {sc.band_um.map(|_| key("k-fill k-absorbed", "band".into()))}
                    {key("k-dot", "peak".into())}
                }
            })
        })
    };
    card(
        hot,
        Slot::Spectrum,
        "Blackbody spectrum",
        "Spectral exitance of a blackbody against wavelength by Planck's law, with Wien's and Rayleigh-Jeans' approximations, the peak and the band marked. Drag across the plot to set the band.",
        true,
        tools.into_any(),
        legend.into_any(),
        ().into_any(),
        canvas,
    )
}

pub fn exchange_card(hot: HotState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let legend = view! {
        {key("k-line k-bb", "emitted by the emitter".into())}
        {key("k-fill k-absorbed", "absorbed by the cell above the gap".into())}
        {key("k-fill k-below", "absorbed below the gap (heat)".into())}
        {key("k-line k-returned", "returned to the emitter".into())}
        {key("k-line k-gap", "band gap".into())}
    };
    card(
        hot,
        Slot::Exchange,
        "Spectrum exchanged at the maximum power point",
        "Spectral power emitted by the emitter, absorbed by the cell above and below its gap, and returned to the emitter, against wavelength.",
        false,
        ().into_any(),
        legend.into_any(),
        ().into_any(),
        canvas,
    )
}

pub fn jv_card(hot: HotState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let legend = move || {
        hot.tpv.with(|v| {
            v.as_ref().map(|v| {
                let what = if v.report.subcells.len() > 1 { "J(V) of the series stack" } else { "J(V)" };
                view! {
                    {key("k-line k-spectrum", what.into())}
                    {v.mpp.map(|[vm, jm]| key("k-dot", format!("maximum power {} W/cm²", sig(vm * jm, 4))))}
                }
            })
        })
    };
    card(
        hot,
        Slot::Jv,
        "J-V curve",
        "Current density against voltage of the TPV cell, with the maximum power point marked.",
        false,
        ().into_any(),
        legend.into_any(),
        ().into_any(),
        canvas,
    )
}

pub fn tradeoff_card(hot: HotState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = hot.ctx;
    let from = Memo::new(move |_| ctx.scenario.with(|s| s.hot.tpv.sweep_from_ev));
    let to = Memo::new(move |_| ctx.scenario.with(|s| s.hot.tpv.sweep_to_ev));
    let bad = |text: &str| {
        format!("'{text}' is not a band gap; type a number of eV, e.g. 0.5. The plotted range is unchanged.")
    };
    let tools = view! {
        <div class="plot-tools">
            {range_input(ctx, "tpv-tradeoff-from", Control::TpvTradeoffRange, "from", "eV", from, |s, v| s.hot.tpv.sweep_from_ev = v, bad)}
            {range_input(ctx, "tpv-tradeoff-to", Control::TpvTradeoffRange, "to", "eV", to, |s, v| s.hot.tpv.sweep_to_ev = v, bad)}
        </div>
    };
    let note = view! {
        <p class="field-error" id="e-tpv-tradeoff-range" data-error=Control::TpvTradeoffRange.as_str() aria-live="polite">{move || ctx.error_of(Control::TpvTradeoffRange)}</p>
    };
    let legend = move || {
        hot.tpv.with(|v| {
            v.as_ref().map(|v| {
                let t = &v.tradeoff;
                view! {
                    {key("k-line k-curve", "efficiency".into())}
                    {key("k-line k-power", "power density".into())}
                    {key("k-diamond", format!("best efficiency {} % at {} eV", fixed(t.best_efficiency.efficiency * 100.0, 2), fixed(t.best_efficiency.gap_ev, 4)))}
                    {key("k-square", format!("most power {} W/cm² at {} eV", sig(t.best_power.pmax_w_cm2, 4), fixed(t.best_power.gap_ev, 4)))}
                    {v.design.map(|d| key("k-dot", format!("this cell, {} eV", fixed(d.gap_ev, 4))))}
                }
            })
        })
    };
    card(
        hot,
        Slot::Tradeoff,
        "Efficiency and power density against band gap",
        "Two panels on one band-gap axis: the efficiency (top) and the electric power density (bottom) of single-junction cells facing this emitter, with the highest efficiency, the most power and the current design marked.",
        false,
        tools.into_any(),
        legend.into_any(),
        note.into_any(),
        canvas,
    )
}

pub fn absorber_card(hot: HotState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let legend = move || {
        hot.abs.with(|v| {
            v.as_ref().map(|v| {
                view! {
                    {key("k-line k-curve", "thermal efficiency".into())}
                    {key("k-line k-power", "work efficiency (× Carnot factor)".into())}
                    {v.report.stagnation_temp_k.map(|s| key("k-diamond k-stag", format!("stagnation {s:.1} K")))}
                    {key("k-dot", format!("this absorber at {:.1} K", v.report.temp_k))}
                }
            })
        })
    };
    card(
        hot,
        Slot::Absorber,
        "Efficiency against absorber temperature",
        "Thermal and work efficiency of the absorber from ambient to above its stagnation temperature, with the stagnation point and the current temperature marked.",
        false,
        ().into_any(),
        legend.into_any(),
        ().into_any(),
        canvas,
    )
}
