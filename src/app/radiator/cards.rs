//! The balance waterfall and the P_net(T) plot as cards: their read-outs and downloads (the
//! editor's card, which also edits, is in [`super::editor`]).

use crate::report::radiator::RadiatorMetric;
use crate::view::controls::Control;
use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use crate::view::export::ExportKind;

use super::export;
use crate::app::radiator::state::{RadiatorState, Slot};
use crate::app::widgets::card::{plot_card, range_input, Card, Hover, PlotBehaviour};

use crate::view::format::fixed;
use crate::view::radiator::{balance_amounts, balance_steps, BALANCE_BARS};
use crate::view::spectrum::nearest;

/// What each bar of the waterfall stands for.
const BAR_NOTES: [&str; 5] = [
    "thermal radiation the surface sends out",
    "atmospheric radiation it absorbs (taken off)",
    "sunlight it absorbs (taken off)",
    "heat it gains from the air by convection and conduction, h_c (T_a − T) (taken off)",
    "what is left: > 0 the surface cools, < 0 it warms",
];

/// A read-only plot of the radiator: read-outs and downloads.
struct ReadOut {
    rad: RadiatorState,
    slot: Slot,
}

impl PlotBehaviour for ReadOut {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.rad.frame(self.slot);
        let c = self.rad.computed.get_untracked()?;
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let r = &c.report;
        match self.slot {
            Slot::Balance => {
                let i = (f.x_at_css(x).floor().max(0.0) as usize).min(BALANCE_BARS.len() - 1);
                let (label, value) = match RadiatorMetric::PARTS.get(i) {
                    Some(m) => (m.label(), r.display(*m)),
                    None => ("Net cooling power", r.display(RadiatorMetric::NetPower)),
                };
                let (a, b) = balance_steps(&c)[i];
                let dot = Some((f.css_of_x(i as f64 + 0.5), f.css_of_y(a.max(b))));
                let change = balance_amounts(&c)[i];
                Some(Hover::new(
                    x,
                    y,
                    width,
                    dot,
                    vec![
                        format!("{label}: {value}"),
                        format!("{} W/m² to the net power", fixed(change, 2)),
                        BAR_NOTES[i].into(),
                    ],
                ))
            }
            _ => {
                let temps: Vec<f64> = c.curve.iter().map(|p| p.temp_k).collect();
                let p = c.curve[nearest(&temps, f.x_at_css(x))?];
                let d = p.temp_k - r.ambient_temp_k;
                let side = if d < 0.0 { "below" } else { "above" };
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(p.temp_k), f.css_of_y(p.net))),
                    vec![
                        format!("T {} K ({} K {side} ambient)", fixed(p.temp_k, 2), fixed(d.abs(), 2)),
                        format!("P_net {} W/m²", fixed(p.net, 2)),
                        format!("emitted {} W/m² · from the air {} W/m²", fixed(p.emitted, 2), fixed(p.parasitic, 2)),
                    ],
                ))
            }
        }
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let c = self.rad.computed.get_untracked().ok_or("nothing has been computed yet")?;
        export::save(self.slot, &c, None, kind)
    }
}

fn balance_legend(rad: RadiatorState) -> impl IntoView {
    move || {
        rad.computed.with(|c| {
            let c = c.as_ref()?;
            let net = c.report.display(RadiatorMetric::NetPower);
            let key = if c.report.net_w_m2 >= 0.0 { "k-fill k-net" } else { "k-fill k-net-warms" };
            Some(view! {
                <span class="key"><i class="k-fill k-emitted"></i>"emitted"</span>
                <span class="key"><i class="k-fill k-sky"></i>"absorbed from the sky"</span>
                <span class="key"><i class="k-fill k-absorbed"></i>"absorbed from the sun"</span>
                <span class="key"><i class="k-fill k-air"></i>"from the air"</span>
                <span class="key"><i class=key></i>{format!("net {net} at {}", c.report.display(RadiatorMetric::SurfaceTemp))}</span>
            })
        })
    }
}

fn curve_legend(rad: RadiatorState) -> impl IntoView {
    move || {
        rad.computed.with(|c| {
            let c = c.as_ref()?;
            let r = &c.report;
            Some(view! {
                <span class="key"><i class="k-line k-curve"></i>"P_net(T): above zero the surface cools"</span>
                <span class="key"><i class="k-diamond"></i>{format!("steady: {}", r.steady_text())}</span>
                <span class="key"><i class="k-line k-ambient"></i>{format!("ambient {}", r.display(RadiatorMetric::AmbientTemp))}</span>
            })
        })
    }
}

fn plot_error(rad: RadiatorState, slot: Slot) -> Signal<Option<String>> {
    Signal::derive(move || rad.plot_errors.with(|e| e[slot.index()].clone()))
}

pub fn balance_card(rad: RadiatorState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    plot_card(
        rad.ctx,
        Card {
            slug: Slot::Balance.slug(),
            title: "Where the power goes",
            aria: "The balance at the surface temperature as a waterfall: emitted power, minus what the sky, the sun and the air give back, leaves the net cooling power.".into(),
            interactive: false,
            wrap_class: "",
            control: None,
            tools: ().into_any(),
            legend: balance_legend(rad).into_any(),
            note: ().into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: plot_error(rad, Slot::Balance),
        },
        Rc::new(ReadOut { rad, slot: Slot::Balance }),
    )
}

pub fn curve_card(rad: RadiatorState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = rad.ctx;
    let from = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.curve_from_k));
    let to = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.curve_to_k));
    let bad = |text: &str| {
        format!("'{text}' is not a temperature; type a number of kelvin, e.g. 250. The plotted range is unchanged.")
    };
    let tools = view! {
        <div class="plot-tools">
            {range_input(ctx, "net-curve-from", Control::NetCurveRange, "from", "K", from, |s, v| s.radiator.curve_from_k = v, bad)}
            {range_input(ctx, "net-curve-to", Control::NetCurveRange, "to", "K", to, |s, v| s.radiator.curve_to_k = v, bad)}
        </div>
    };
    let note = view! {
        <p class="field-error" id="e-net-curve-range" data-error=Control::NetCurveRange.as_str() aria-live="polite">{move || ctx.error_of(Control::NetCurveRange)}</p>
    };
    plot_card(
        ctx,
        Card {
            slug: Slot::Curve.slug(),
            title: "Net cooling power against surface temperature",
            aria: "Net cooling power against surface temperature, with the ambient temperature and the steady temperature (where it crosses zero) marked.".into(),
            interactive: false,
            wrap_class: "",
            control: None,
            tools: tools.into_any(),
            legend: curve_legend(rad).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: plot_error(rad, Slot::Curve),
        },
        Rc::new(ReadOut { rad, slot: Slot::Curve }),
    )
}
