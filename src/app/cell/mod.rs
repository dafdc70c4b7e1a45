//! The Solar cell panel: the light source and the cell's settings, the headline figures,
//! and three plots (the spectrum with the gap, efficiency against band gap, the J-V curve).
//! One effect computes the panel's view model ([`CellCache::compute`]) and redraws its
//! canvases after every change of the scenario or of the layout.

pub mod cards;
pub mod controls;
pub mod figures;
pub mod plots;

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

use super::watch_sizes;
use super::widgets::plot::render::draw_on_canvas;
use crate::app::state::{count_render, mark, sentence, Ctx};
use crate::view::cell::CellCache;
use plots::{CellPlot, PlotKind};

/// The solar-cell panel: its settings, figures and three plots.
pub fn cell_panel(ctx: Ctx, engine: StoredValue<Rc<RefCell<CellCache>>, LocalStorage>) -> impl IntoView {
    let canvases: [NodeRef<html::Canvas>; 3] = [NodeRef::new(), NodeRef::new(), NodeRef::new()];
    Effect::new(move |_| {
        ctx.layout.track();
        let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
        let engine = engine.get_value();
        let outcome = ctx.scenario.with(|s| engine.borrow_mut().compute(s));
        match outcome {
            Ok(c) => {
                let c = Arc::new(c);
                let mut frames = ctx.frames.get_untracked();
                let mut errors: [Option<String>; 3] = [None, None, None];
                for kind in PlotKind::ALL {
                    if let Some(canvas) = &targets[kind.index()] {
                        match draw_on_canvas(canvas, &CellPlot { kind, c: &c }) {
                            Ok(Some(f)) => frames[kind.index()] = f,
                            Ok(None) => {}
                            Err(e) => errors[kind.index()] = Some(e),
                        }
                    }
                }
                mark("gg-drawn");
                ctx.frames.set(frames);
                if ctx.plot_errors.with_untracked(|p| *p != errors) {
                    ctx.plot_errors.set(errors);
                }
                ctx.computed.set(Some(c));
                if ctx.compute_error.with_untracked(|e| e.is_some()) {
                    ctx.compute_error.set(None);
                }
            }
            Err(e) => ctx
                .compute_error
                .set(Some(format!("{} The figures shown are from the last usable scenario.", sentence(&e)))),
        }
        count_render();
    });
    watch_sizes(ctx, canvases.to_vec());
    view! {
        <main class="layout">
            <aside class="panel" aria-label="Settings">
                {controls::source_panel(ctx)}
                {controls::cell_panel(ctx)}
            </aside>
            <section class="results" aria-label="Results">
                {figures::figures(ctx)}
                <div class="plots">
                    {cards::plot_card(ctx, PlotKind::Spectrum, canvases[0])}
                    {cards::plot_card(ctx, PlotKind::Efficiency, canvases[1])}
                    {cards::plot_card(ctx, PlotKind::Jv, canvases[2])}
                </div>
            </section>
        </main>
        {figures::cautions()}
    }
}
