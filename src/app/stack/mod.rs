//! The Stack panel: a multi-junction design editor (junctions, connection, gaps dragged on
//! the spectrum), its figures and per-subcell table, the two-junction efficiency map (computed
//! in slices so the page stays responsive, its best points then refined), the gap search (run
//! in a background worker, cancellable, optionally holding one gap fixed). The single cell's
//! absorptance and its loss chart are the Solar cell tab's (`app::cell`).
//!
//! Everything the user chooses lives in `Scenario.stack` (and the light and cell settings in
//! `Scenario.cell`, shared with the solar-cell panel), so the share link holds it. Edits go
//! through [`set_gaps`] and [`edit_stack`], which check the stack before committing it and
//! otherwise say next to the control what is wrong. One effect solves the stack and redraws
//! the panel's plots after every change; the map is recomputed only when the light, the
//! cell settings, the connection or the map's axes change, never on a gap edit.

pub mod cards;
pub mod colours;
pub mod controls;
pub mod figures;
pub mod map_job;
pub mod plots;
pub mod search;
pub mod state;
pub mod worker;

use crate::view::controls::Control;
use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

use crate::app::state::{count_render, mark, sentence, Ctx};
use crate::app::widgets::export::offer;
use crate::app::widgets::plot::render::{draw_into, expose_frame};
use crate::app::widgets::plot::Drawing;
use crate::scenario::stack::{check_gaps_over, StackScenario};
use crate::view::export::ExportKind;
pub use state::{StackState, GAP_HOOKS, MAP, PLOTS, SPECTRUM};

/// Set the stack's gaps [eV] (from a field, a key, a drag or the map). Only the gaps change,
/// so only they are checked; a refused set leaves a message under `hook`.
pub fn set_gaps(ctx: Ctx, hook: Control, gaps: Vec<f64>) -> bool {
    mark("gg-stack-edit");
    let real_bottom = ctx.scenario.with_untracked(|s| s.stack.bottom.is_some());
    if let Err(e) = check_gaps_over(&gaps, real_bottom) {
        ctx.set_error(hook, sentence(&e));
        return false;
    }
    for h in GAP_HOOKS {
        ctx.clear_error(h);
    }
    ctx.clear_error(hook);
    if ctx.scenario.with_untracked(|s| s.stack.gaps_ev != gaps) {
        ctx.scenario.update(|s| s.stack.gaps_ev = gaps);
    }
    true
}

/// Edit the stack part of the scenario (junctions, connection, map axes, absorber): the
/// edited stack is checked, then the scenario as a whole.
pub fn edit_stack(ctx: Ctx, hook: Control, f: impl FnOnce(&mut StackScenario)) -> bool {
    let mut st = ctx.scenario.with_untracked(|s| s.stack.clone());
    f(&mut st);
    if let Err(e) = check_gaps_over(&st.gaps_ev, st.bottom.is_some()).and_then(|_| st.map.grid().map(|_| ())) {
        ctx.set_error(hook, sentence(&e));
        return false;
    }
    let ok = ctx.edit(hook, move |s| s.stack = st);
    if ok {
        for h in GAP_HOOKS {
            ctx.clear_error(h);
        }
    }
    ok
}

/// Offer one of the panel's plots as a file of `kind`, named after `slug`; `describe` goes
/// into the caption, `csv` writes the plotted data under it.
pub fn save_plot(
    stack: StackState,
    slug: &str,
    kind: ExportKind,
    describe: &str,
    plot: &impl Drawing,
    csv: impl FnOnce(&str) -> String,
) -> Result<(), String> {
    let cap = stack.ctx.scenario.with_untracked(|s| crate::view::stack::caption(s, describe));
    offer(kind, slug, plot, || cap.clone(), || csv(&cap))
}

/// The Stack tab's content.
/// The stack's day under the cell's clear-sky light (cached: the time slider does not
/// recompute it), `None` for any other light.
fn stack_day_plot(ctx: Ctx) -> Signal<Option<Result<Arc<crate::view::place::DayPlot>, String>>> {
    use std::cell::RefCell;
    use std::rc::Rc;
    let cache = StoredValue::new_local(Rc::new(RefCell::new(crate::view::place::DayCache::default())));
    let memo = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.cell.spectrum {
            crate::scenario::SourceSpec::ClearSky(c) => {
                Some(cache.get_value().borrow_mut().stack(c, s).map(|d| Arc::new(d.plot("stack"))))
            }
            _ => None,
        })
    });
    memo.into()
}

#[component]
pub fn StackPanel() -> impl IntoView {
    let ctx = expect_context::<Ctx>();
    let stack = StackState::new(ctx);
    let canvases: [NodeRef<html::Canvas>; PLOTS] = std::array::from_fn(|_| NodeRef::new());

    // solve and redraw after every change; the map only starts a new computation when its
    // inputs change
    Effect::new(move |_| {
        ctx.layout.track();
        let selected = stack.selected.get();
        let map = stack.map.get();
        let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
        let mut frames = stack.frames.get_untracked();
        let mut errors: [Option<String>; PLOTS] = Default::default();
        let outcome = ctx.scenario.with(crate::view::stack::stack_view);
        match outcome {
            Ok(v) => {
                let v = Arc::new(v);
                draw_into(
                    SPECTRUM,
                    &targets[SPECTRUM],
                    &plots::spectrum::SpectrumPlot { v: &v, selected },
                    &mut frames,
                    &mut errors,
                );
                stack.view.set(Some(v));
                if stack.error.with_untracked(|e| e.is_some()) {
                    stack.error.set(None);
                    ctx.clear_error(Control::StackGaps);
                }
            }
            Err(e) => {
                let had = stack.view.with_untracked(|v| v.is_some());
                let tail = if had { " The figures shown are from the last usable stack." } else { "" };
                stack.error.set(Some(format!("{}{tail}", sentence(&e))));
                if ctx.errors.with_untracked(|m| m.get(&Control::StackGaps).map(|t| t != &sentence(&e)).unwrap_or(true))
                {
                    ctx.set_error(Control::StackGaps, sentence(&e));
                }
            }
        }
        ctx.scenario.with(|s| map_job::ensure(stack, s));
        if let Some(m) = &map {
            let design = ctx.scenario.with(|s| crate::view::stack::map::Design::of(&s.stack));
            if let Some(canvas) = &targets[MAP] {
                match plots::map::draw_on_page(canvas, &plots::map::MapPlot { map: m, design }) {
                    Ok(Some(f)) => {
                        expose_frame(canvas, &f);
                        frames[MAP] = f
                    }
                    Ok(None) => {}
                    Err(e) => errors[MAP] = Some(e),
                }
            }
        }
        mark("gg-stack-drawn");
        stack.frames.set(frames);
        if stack.plot_errors.with_untracked(|p| *p != errors) {
            stack.plot_errors.set(errors);
        }
        count_render();
    });
    super::watch_sizes(ctx, canvases.to_vec());
    search::attach(stack);
    on_cleanup(|| {
        map_job::stop();
        search::detach();
    });

    // the stack shares the cell's light: its place and time, when that is the clear sky
    let place = crate::app::widgets::place::PlaceUi::new(ctx, crate::view::place::CELL_LIGHT);
    let day = stack_day_plot(ctx);
    let clear = move || day.with(Option::is_some);
    view! {
        <main class="layout stack-layout">
            <aside class="panel" aria-label="Stack settings">
                {controls::editor_section(stack)}
                {search::search_section(stack)}
                {controls::conditions(stack)}
                <section class="panel-section" aria-labelledby="stack-place-h" hidden=move || !clear()>
                    <h2 id="stack-place-h">"Light: place and time"</h2>
                    <p class="hint">"The stack takes the Solar cell tab's light; these are its controls."</p>
                    {crate::app::widgets::place::place_controls(place)}
                </section>
            </aside>
            <section class="results" aria-label="Stack results">
                {figures::figures(stack)}
                {figures::subcell_table(stack)}
                <div class="plots stack-plots">
                    <div class="day-slot" hidden=move || !clear()>
                        {crate::app::widgets::place::day_chart(place, day, "The stack through the day")}
                    </div>
                    {cards::spectrum_card(stack, canvases[SPECTRUM])}
                    {cards::map_card(stack, canvases[MAP])}
                </div>
            </section>
        </main>
        {figures::cautions(stack)}
    }
}
