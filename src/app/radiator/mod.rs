//! The radiator panel: an opaque surface facing the sky, by day or by night. The user
//! shapes its emissivity profile on a log-wavelength editor (drag, keys, a table of control
//! points, presets, measured data), chooses the sky, the air and the sun, and reads the net
//! cooling power, its parts, the steady temperature, the figures of merit and P_net(T).
//!
//! Flow: edits go through [`crate::app::state::Ctx::edit`] like the cell panel's, so the
//! radiator is part of the one scenario in the link. One effect computes ([`crate::view::radiator::RadiatorCache`], the
//! same evaluation as `glowgap eval --radiator`), draws the three canvases and then
//! publishes the result in [`state::RadiatorState::computed`] for the figures and read-outs.
//!
//! * [`crate::view::radiator::points`]: presets, profiles as control points, the point edits;
//! * [`editor`]: the editor's pointer and keys, the table of points;
//! * [`controls`]: surface, sky and air, sun; [`import`]: measured tables;
//! * [`figures`]: headline figures and cautions; [`cards`]: the two read-only plots;
//! * [`layers`]: the "Emitter: profile | layers" switch and the layer-stack editor (table,
//!   bar diagram, reflectance/transmittance/absorptance and the emissivity map);
//! * [`optimize`]: "Optimize thicknesses", the film thickness search under the layer table,
//!   run in the background worker ([`optimize_worker`]);
//! * [`plots`]: drawing; [`export`]: SVG, PNG and CSV files.

pub mod cards;
pub mod controls;
pub mod editor;
pub mod export;
pub mod figures;
pub mod import;
pub mod layers;
pub mod optimize;
pub mod optimize_worker;
pub mod plots;
pub mod state;

use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

pub use state::RadiatorState;

use crate::app::state::{count_render, mark, sentence, Ctx};
use crate::app::watch_sizes;
use crate::app::widgets::plot::render::draw_on_canvas;
use plots::RadPlot;
use state::Slot;

/// Compute and redraw whenever the radiator's part of the scenario, the drag state, the
/// chosen point or a canvas' size changes (the view's caches make the last three cheap).
/// The plots are drawn before the figures' text changes, so drawing forces no extra layout.
fn render_effect(rad: RadiatorState, canvases: [NodeRef<html::Canvas>; 3]) {
    let ctx: Ctx = rad.ctx;
    let scenario = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.clone()));
    Effect::new(move |_| {
        ctx.layout.track();
        let coarse = rad.coarse.get();
        let selected = rad.selected.get();
        let sun_shown = rad.last_sun.get();
        let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
        let cache = rad.cache.get_value();
        let outcome = scenario.with(|sc| cache.borrow_mut().compute(sc, coarse, &sun_shown));
        let c = match outcome {
            Ok(c) => {
                mark("gg-computed");
                c
            }
            Err(e) => {
                rad.compute_error
                    .set(Some(format!("{} The figures shown are from the last usable scenario.", sentence(&e))));
                count_render();
                return;
            }
        };
        let mut frames = rad.frames.get_untracked();
        let mut errors: [Option<String>; 3] = [None, None, None];
        for slot in Slot::ALL {
            if let Some(canvas) = &targets[slot.index()] {
                match draw_on_canvas(canvas, &RadPlot { slot, c: &c, selected }) {
                    Ok(Some(f)) => frames[slot.index()] = f,
                    Ok(None) => {}
                    Err(e) => errors[slot.index()] = Some(e),
                }
            }
        }
        mark("gg-drawn");
        // where the control points landed, in CSS px (for tests and tools)
        if let Some(canvas) = &targets[Slot::Editor.index()] {
            let f = frames[Slot::Editor.index()];
            let at: Vec<String> = c
                .profile
                .handles
                .iter()
                .map(|p| format!("{:.1},{:.1}", f.css_of_x(p[0].log10()), f.css_of_y(p[1])))
                .collect();
            let _ = canvas.set_attribute("data-handles", &at.join(";"));
        }
        rad.frames.set(frames);
        if rad.plot_errors.with_untracked(|p| *p != errors) {
            rad.plot_errors.set(errors);
        }
        if rad.computed.with_untracked(|p| !p.as_ref().is_some_and(|p| Arc::ptr_eq(p, &c))) {
            rad.computed.set(Some(c));
        }
        if rad.compute_error.with_untracked(|e| e.is_some()) {
            rad.compute_error.set(None);
        }
        count_render();
    });
}

/// The radiator's day under a clear-sky sun (cached: the time slider does not recompute
/// it), `None` for any other sun or none.
fn radiator_day_plot(ctx: Ctx) -> Signal<Option<Result<Arc<crate::view::place::DayPlot>, String>>> {
    use std::cell::RefCell;
    use std::rc::Rc;
    let cache = StoredValue::new_local(Rc::new(RefCell::new(crate::view::place::RadiatorDayCache::default())));
    let memo = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.radiator.sun {
            Some(crate::scenario::SourceSpec::ClearSky(c)) => {
                Some(cache.get_value().borrow_mut().day(c, &s.radiator).map(|d| Arc::new(d.plot())))
            }
            _ => None,
        })
    });
    memo.into()
}

/// The Radiator tab's content.
#[component]
pub fn RadiatorPanel() -> impl IntoView {
    let rad = expect_context::<RadiatorState>();
    let canvases: [NodeRef<html::Canvas>; 3] = [NodeRef::new(), NodeRef::new(), NodeRef::new()];
    let film_canvases: [NodeRef<html::Canvas>; 3] = [NodeRef::new(), NodeRef::new(), NodeRef::new()];
    render_effect(rad, canvases);
    layers::film_effect(rad, film_canvases);
    watch_sizes(rad.ctx, canvases.iter().chain(film_canvases.iter()).copied().collect());
    let place = crate::app::widgets::place::PlaceUi::new(rad.ctx, crate::view::place::RADIATOR_SUN);
    let day = radiator_day_plot(rad.ctx);
    view! {
        <main class="layout rad-layout">
            <aside class="panel" aria-label="Radiator settings">
                {controls::surface_section(rad)}
                {controls::environment_section(rad)}
                {controls::sun_section(rad, place)}
            </aside>
            <section class="results" aria-label="Radiator results">
                {figures::figures(rad)}
                <div class="plots rad-plots">
                    <div class="day-slot" hidden=move || day.with(Option::is_none)>
                        {crate::app::widgets::place::day_chart(place, day, "The radiator through the day")}
                    </div>
                    {layers::film_cards(rad, film_canvases)}
                    {editor::editor_card(rad, canvases[0])}
                    {cards::balance_card(rad, canvases[1])}
                    {cards::curve_card(rad, canvases[2])}
                </div>
            </section>
        </main>
        {figures::cautions()}
    }
}
