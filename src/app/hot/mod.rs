//! The hot-emitter panel: a blackbody at any temperature, a thermophotovoltaic (TPV)
//! emitter-cell pair and a solar-thermal absorber, each a card with its settings, figures
//! and plots.
//!
//! Flow: edits go through [`crate::app::state::Ctx::edit`] like every panel's, so the cards
//! are part of the one scenario in the link. Each card has one effect that computes its
//! view model ([`crate::view::hot`], with the trade-off and the absorber's curve cached in
//! [`crate::view::hot::HotCache`]), draws its canvases and then publishes the result for the
//! figures; a blackbody edit therefore redraws one canvas, not five.
//!
//! * [`controls`]: the settings of the three cards; [`figures`]: figures and cautions;
//! * [`cards`]: the plot cards (read-outs, the band drag, downloads); [`plots`]: drawing.
//!
//! Architecture invariant: the panel computes no physics of its own; it draws what
//! `view::hot` returns, edits only `Scenario.hot` (and `view.panel`) through `Ctx::edit`, and
//! keys every message by `Control`.

pub mod cards;
pub mod controls;
pub mod figures;
pub mod plots;
pub mod state;

use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

pub use state::HotState;

use crate::app::state::{count_render, mark, sentence};
use crate::app::watch_sizes;
use crate::app::widgets::plot::render::draw_into;
use crate::app::widgets::plot::Frame;
use crate::view::hot::blackbody_view;
use plots::HotPlot;
use state::{Part, Slot};

/// Draw `slots` of the panel from what `plot` holds, keeping their frames and errors.
fn draw_slots(hot: HotState, canvases: &[NodeRef<html::Canvas>; 5], slots: &[Slot], plot: impl Fn(Slot) -> HotPlot) {
    let mut frames: [Frame; 5] = hot.frames.get_untracked();
    let mut errors = hot.plot_errors.get_untracked();
    for &slot in slots {
        let i = slot.index();
        errors[i] = None;
        draw_into(i, &canvases[i].get(), &plot(slot), &mut frames, &mut errors);
    }
    hot.frames.set(frames);
    if hot.plot_errors.with_untracked(|p| *p != errors) {
        hot.plot_errors.set(errors);
    }
}

fn stale(e: &str) -> String {
    format!("{} The figures shown are from the last usable settings.", sentence(e))
}

/// The three cards' effects.
fn render_effects(hot: HotState, canvases: [NodeRef<html::Canvas>; 5]) {
    let ctx = hot.ctx;
    let bb_in = Memo::new(move |_| {
        ctx.scenario.with(|s| {
            // a black emitter is not drawn here: its temperature does not redraw this card
            let black = matches!(s.hot.tpv.emitter, crate::scenario::radiator::EmitterSpec::Blackbody);
            (s.hot.blackbody.clone(), s.hot.tpv.emitter.clone(), if black { 0.0 } else { s.hot.tpv.emitter_temp_k })
        })
    });
    Effect::new(move |_| {
        ctx.layout.track();
        canvases[0].track();
        let r = bb_in.with(|(bb, emitter, te)| {
            let tpv = crate::scenario::hot::TpvScenario {
                emitter: emitter.clone(),
                emitter_temp_k: if *te > 0.0 { *te } else { 2000.0 },
                ..Default::default()
            };
            blackbody_view(bb, &tpv)
        });
        match r {
            Ok(v) => {
                let v = Arc::new(v);
                draw_slots(hot, &canvases, &[Slot::Spectrum], |slot| HotPlot::Blackbody(slot, v.clone()));
                mark("gg-drawn");
                hot.bb.set(Some(v));
                hot.set_compute_error(Part::Blackbody, None);
            }
            Err(e) => hot.set_compute_error(Part::Blackbody, Some(stale(&e))),
        }
        count_render();
    });

    let tpv_in = Memo::new(move |_| ctx.scenario.with(|s| s.hot.tpv.clone()));
    Effect::new(move |_| {
        ctx.layout.track();
        for c in &canvases[1..4] {
            c.track();
        }
        let coarse = hot.coarse.get();
        let cache = hot.cache.get_value();
        let r = tpv_in.with(|sc| cache.borrow_mut().tpv(sc, coarse));
        match r {
            Ok(v) => {
                let v = Arc::new(v);
                draw_slots(hot, &canvases, &[Slot::Exchange, Slot::Jv, Slot::Tradeoff], |slot| {
                    HotPlot::Tpv(slot, v.clone())
                });
                mark("gg-drawn");
                hot.tpv.set(Some(v));
                hot.set_compute_error(Part::Tpv, None);
            }
            Err(e) => hot.set_compute_error(Part::Tpv, Some(stale(&e))),
        }
        count_render();
    });

    let abs_in = Memo::new(move |_| ctx.scenario.with(|s| s.hot.absorber.clone()));
    Effect::new(move |_| {
        ctx.layout.track();
        canvases[4].track();
        let cache = hot.cache.get_value();
        let r = abs_in.with(|sc| cache.borrow_mut().absorber(sc));
        match r {
            Ok(v) => {
                let v = Arc::new(v);
                draw_slots(hot, &canvases, &[Slot::Absorber], |slot| HotPlot::Absorber(slot, v.clone()));
                mark("gg-drawn");
                hot.abs.set(Some(v));
                hot.set_compute_error(Part::Absorber, None);
            }
            Err(e) => hot.set_compute_error(Part::Absorber, Some(stale(&e))),
        }
        count_render();
    });
}

/// The Hot emitters tab's content.
#[component]
pub fn HotPanel() -> impl IntoView {
    let ctx = expect_context::<crate::app::state::Ctx>();
    let hot = HotState::new(ctx);
    let canvases: [NodeRef<html::Canvas>; 5] = std::array::from_fn(|_| NodeRef::new());
    render_effects(hot, canvases);
    watch_sizes(ctx, canvases.to_vec());
    let error = move |p: Part| move || hot.compute_errors.with(|e| e[p as usize].clone());
    view! {
        <main class="hot-layout">
            <section class="hot-card" data-hot-card="blackbody" aria-labelledby="hot-bb-h">
                <h2 id="hot-bb-h">"Blackbody"</h2>
                <div class="hot-grid">
                    <div class="hot-controls">{controls::blackbody_controls(hot)}</div>
                    <div class="hot-results">
                        {figures::blackbody_figures(hot)}
                        <p class="compute-error" role="alert" hidden=move || error(Part::Blackbody)().is_none()>{error(Part::Blackbody)}</p>
                        {cards::spectrum_card(hot, canvases[0])}
                    </div>
                </div>
            </section>
            <section class="hot-card" data-hot-card="tpv" aria-labelledby="hot-tpv-h">
                <h2 id="hot-tpv-h">"Thermophotovoltaic pair (TPV)"</h2>
                <div class="hot-grid">
                    <div class="hot-controls">{controls::tpv_controls(hot)}</div>
                    <div class="hot-results">
                        {figures::tpv_figures(hot)}
                        <p class="compute-error" role="alert" hidden=move || error(Part::Tpv)().is_none()>{error(Part::Tpv)}</p>
                        <div class="plots hot-plots">
                            {cards::exchange_card(hot, canvases[1])}
                            {cards::jv_card(hot, canvases[2])}
                            {cards::tradeoff_card(hot, canvases[3])}
                        </div>
                    </div>
                </div>
            </section>
            <section class="hot-card" data-hot-card="absorber" aria-labelledby="hot-abs-h">
                <h2 id="hot-abs-h">"Solar-thermal absorber"</h2>
                <div class="hot-grid">
                    <div class="hot-controls">{controls::absorber_controls(hot)}</div>
                    <div class="hot-results">
                        {figures::absorber_figures(hot)}
                        <p class="compute-error" role="alert" hidden=move || error(Part::Absorber)().is_none()>{error(Part::Absorber)}</p>
                        {cards::absorber_card(hot, canvases[4])}
                    </div>
                </div>
            </section>
        </main>
        {figures::cautions()}
    }
}
