//! The Solar cell panel: the light source and the cell's settings, the cell's absorptance
//! (ideal step, Urbach tail or a measured EQE, with its reciprocity limits), the headline
//! figures, and the plots: the spectrum with the gap, efficiency against band gap, the J-V
//! curve, and where the power goes. One effect computes the panel's view models
//! ([`crate::view::cell::CellCache::compute`], [`crate::view::cell::losses::loss_view`],
//! [`crate::view::cell::absorber::absorber_view`]) and redraws its canvases after every change
//! of the scenario or of the layout.

pub mod absorptance;
pub mod cards;
pub mod controls;
pub mod figures;
pub mod losses;
pub mod plots;
pub mod silicon;
pub mod state;
pub mod year;

use crate::view::controls::Control;
use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use super::widgets::place::{day_chart, PlaceUi};
use crate::scenario::SourceSpec;
use crate::view::place::{DayCache, DayPlot};

use leptos::html;
use leptos::prelude::*;

use super::state::{count_render, mark, sentence};
use super::watch_sizes;
use super::widgets::plot::render::draw_into;
use crate::view::cell::absorber::absorber_view;
use crate::view::cell::losses::loss_view;
use plots::{CellPlot, PlotKind};
use state::{CellState, ABSORPTANCE, LOSSES, PLOTS, SI_ABSORPTANCE, SI_THICKNESS};

/// How the message on an absorptance that cannot be computed (from a link) begins.
const ABSORBER_UNUSABLE: &str = "The cell's absorptance cannot be computed:";

/// Solve and draw after every change of the scenario or the layout.
fn render_effect(cs: CellState, canvases: [NodeRef<html::Canvas>; PLOTS]) {
    let ctx = cs.ctx;
    Effect::new(move |_| {
        ctx.layout.track();
        let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
        let cache = cs.cache.get_value();
        let mut frames = cs.frames.get_untracked();
        let mut errors: [Option<String>; PLOTS] = Default::default();
        let outcome = ctx.scenario.with(|s| cache.borrow_mut().compute(s));
        match outcome {
            Ok(c) => {
                let c = Arc::new(c);
                for kind in PlotKind::ALL {
                    let i = kind.index();
                    draw_into(i, &targets[i], &CellPlot { kind, c: &c }, &mut frames, &mut errors);
                }
                mark("gg-drawn");
                cs.computed.set(Some(c));
                if cs.compute_error.with_untracked(|e| e.is_some()) {
                    cs.compute_error.set(None);
                }
            }
            Err(e) => cs
                .compute_error
                .set(Some(format!("{} The figures shown are from the last usable scenario.", sentence(&e)))),
        }
        match ctx.scenario.with(loss_view) {
            Ok(l) => {
                let l = Arc::new(l);
                draw_into(LOSSES, &targets[LOSSES], &losses::LossPlot { l: &l }, &mut frames, &mut errors);
                cs.losses.set(Some(l));
            }
            Err(e) => errors[LOSSES] = Some(sentence(&e)),
        }
        match ctx.scenario.with(absorber_view) {
            Ok(a) => {
                let a = a.map(Arc::new);
                if let Some(a) = &a {
                    let what =
                        if a.kind == crate::view::cell::absorber::AbsorberKind::Urbach { "Absorptance" } else { "EQE" };
                    let plot = absorptance::AbsorptancePlot { points: &a.points, edge_ev: a.step.cell.gap_ev, what };
                    draw_into(ABSORPTANCE, &targets[ABSORPTANCE], &plot, &mut frames, &mut errors);
                }
                cs.absorber.set(a);
                if ctx
                    .errors
                    .with_untracked(|m| m.get(&Control::Absorber).is_some_and(|t| t.starts_with(ABSORBER_UNUSABLE)))
                {
                    ctx.clear_error(Control::Absorber);
                }
            }
            Err(e) => {
                cs.absorber.set(None);
                ctx.set_error(Control::Absorber, format!("{ABSORBER_UNUSABLE} {}", sentence(&e)));
            }
        }
        let real = cs.real_cache.get_value();
        match ctx.scenario.with(|s| real.borrow_mut().compute(s)) {
            Ok(v) => {
                let v = v.map(Arc::new);
                if let Some(v) = &v {
                    let t = silicon::ThicknessPlot { v };
                    draw_into(SI_THICKNESS, &targets[SI_THICKNESS], &t, &mut frames, &mut errors);
                    let a = silicon::absorptance_plot(v);
                    draw_into(SI_ABSORPTANCE, &targets[SI_ABSORPTANCE], &a, &mut frames, &mut errors);
                    mark("gg-si-drawn");
                }
                cs.real.set(v);
            }
            Err(e) => {
                cs.real.set(None);
                ctx.set_error(Control::Absorber, format!("{ABSORBER_UNUSABLE} {}", sentence(&e)));
            }
        }
        cs.frames.set(frames);
        if cs.plot_errors.with_untracked(|p| *p != errors) {
            cs.plot_errors.set(errors);
        }
        count_render();
    });
    watch_sizes(ctx, canvases.to_vec());
}

/// The cell's day under its clear-sky source (cached: the time slider does not recompute
/// it), `None` for any other source.
pub fn cell_day_series(cs: CellState) -> Signal<Option<Result<Arc<DayPlot>, String>>> {
    let ctx = cs.ctx;
    let cache = StoredValue::new_local(Rc::new(RefCell::new(DayCache::default())));
    let memo = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.cell.spectrum {
            SourceSpec::ClearSky(c) => {
                Some(cache.get_value().borrow_mut().cell(c, &s.cell).map(|d| Arc::new(d.plot("cell"))))
            }
            _ => None,
        })
    });
    memo.into()
}

/// The Solar cell tab's content.
#[component]
pub fn CellPanel() -> impl IntoView {
    let cs = expect_context::<CellState>();
    let canvases: [NodeRef<html::Canvas>; PLOTS] = std::array::from_fn(|_| NodeRef::new());
    render_effect(cs, canvases);
    let place = PlaceUi::new(cs.ctx, crate::view::place::CELL_LIGHT);
    let day = cell_day_series(cs);
    view! {
        <main class="layout">
            <aside class="panel" aria-label="Settings">
                {controls::source_panel(cs, place)}
                {controls::cell_panel(cs)}
                {absorptance::absorptance_section(cs, canvases[ABSORPTANCE])}
            </aside>
            <section class="results" aria-label="Results">
                {figures::figures(cs)}
                <div class="plots">
                    <div class="day-slot" hidden=move || day.with(Option::is_none)>{day_chart(place, day, "The cell through the day")}</div>
                    <div class="day-slot" hidden=move || day.with(Option::is_none)>{year::year_card(cs.ctx)}</div>
                    {silicon::silicon_cards(cs, canvases[SI_THICKNESS], canvases[SI_ABSORPTANCE])}
                    {cards::cell_plot_card(cs, PlotKind::Spectrum, canvases[0])}
                    {cards::cell_plot_card(cs, PlotKind::Efficiency, canvases[1])}
                    {cards::cell_plot_card(cs, PlotKind::Jv, canvases[2])}
                    {losses::losses_card(cs, canvases[LOSSES])}
                </div>
            </section>
        </main>
        {figures::cautions()}
    }
}
