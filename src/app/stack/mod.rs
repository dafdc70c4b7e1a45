//! The Stack panel: a multi-junction design editor (junctions, connection, gaps dragged on
//! the spectrum), its figures and per-subcell table, the two-junction efficiency map (computed
//! in slices so the page stays responsive, its best points then refined), the gap search (run
//! in a background worker, cancellable, optionally holding one gap fixed), the single cell's
//! absorptance (ideal step, Urbach tail or a measured EQE) with its reciprocity limits, and
//! the loss chart of the single cell.
//!
//! Everything the user chooses lives in `Scenario.stack` (and the light and cell settings in
//! `Scenario.cell`, shared with the solar-cell panel), so the share link holds it. Edits go
//! through [`set_gaps`] and [`edit_stack`], which check the stack before committing it and
//! otherwise say next to the control what is wrong. One effect solves the stack and redraws
//! the panel's plots after every change; the map is recomputed only when the light, the
//! cell settings, the connection or the map's axes change, never on a gap edit.

pub mod colours;

pub mod controls;
pub mod eqe;
pub mod losses;
pub mod map;
pub mod search;
pub mod spectrum;
pub mod worker;

use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

use crate::app::widgets::export::offer;
use crate::view::export::ExportKind;
use crate::view::stack::map::{MapData, MapStatus};
use crate::view::stack::{AbsorberView, LossView, StackView};
use search::SearchState;

use crate::app::state::{count_render, mark, sentence, Ctx};
use crate::app::widgets::plot::render::draw_on_canvas;
use crate::app::widgets::plot::{Drawing, Frame};
use crate::scenario::stack::{check_gaps, StackScenario};

/// The panel's plots, by index into [`StackCtx::frames`].
pub const SPECTRUM: usize = 0;
pub const MAP: usize = 1;
pub const LOSSES: usize = 2;
pub const EQE: usize = 3;
const PLOTS: usize = 4;

/// How the message on an absorptance that cannot be computed (from a link) begins.
const ABSORBER_UNUSABLE: &str = "The single cell's absorptance cannot be computed:";

/// `data-control` hooks of the gap fields, top first.
pub const GAP_HOOKS: [&str; 6] = ["gap-1", "gap-2", "gap-3", "gap-4", "gap-5", "gap-6"];

/// The panel's shared handles; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct StackCtx {
    pub ctx: Ctx,
    /// the stack as designed, solved
    pub view: RwSignal<Option<Arc<StackView>>>,
    /// why the stack cannot be computed (a link with a bad stack)
    pub error: RwSignal<Option<String>>,
    pub frames: RwSignal<[Frame; PLOTS]>,
    pub plot_errors: RwSignal<[Option<String>; PLOTS]>,
    /// the subcell whose gap the spectrum plot's keys move
    pub selected: RwSignal<usize>,
    pub map: RwSignal<Option<Arc<MapData>>>,
    pub map_status: RwSignal<MapStatus>,
    pub losses: RwSignal<Option<Arc<LossView>>>,
    pub absorber: RwSignal<Option<Arc<AbsorberView>>>,
    pub search: RwSignal<SearchState>,
}

impl StackCtx {
    fn new(ctx: Ctx) -> StackCtx {
        StackCtx {
            ctx,
            view: RwSignal::new(None),
            error: RwSignal::new(None),
            frames: RwSignal::new([Frame::default(); PLOTS]),
            plot_errors: RwSignal::new(Default::default()),
            selected: RwSignal::new(0),
            map: RwSignal::new(None),
            map_status: RwSignal::new(MapStatus::Idle),
            losses: RwSignal::new(None),
            absorber: RwSignal::new(None),
            search: RwSignal::new(SearchState::Idle),
        }
    }

    pub fn frame(&self, i: usize) -> Frame {
        self.frames.with_untracked(|f| f[i])
    }

    /// The current gaps [eV], top first (untracked).
    pub fn gaps(&self) -> Vec<f64> {
        self.ctx.scenario.with_untracked(|s| s.stack.gaps_ev.clone())
    }
}

/// Set the stack's gaps [eV] (from a field, a key, a drag or the map). Only the gaps change,
/// so only they are checked; a refused set leaves a message under `hook`.
pub fn set_gaps(ctx: Ctx, hook: &'static str, gaps: Vec<f64>) -> bool {
    mark("gg-stack-edit");
    if let Err(e) = check_gaps(&gaps) {
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
pub fn edit_stack(ctx: Ctx, hook: &'static str, f: impl FnOnce(&mut StackScenario)) -> bool {
    let mut st = ctx.scenario.with_untracked(|s| s.stack.clone());
    f(&mut st);
    if let Err(e) = check_gaps(&st.gaps_ev).and_then(|_| st.map.grid().map(|_| ())) {
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
    sc: StackCtx,
    slug: &str,
    kind: ExportKind,
    describe: &str,
    plot: &impl Drawing,
    csv: impl FnOnce(&str) -> String,
) -> Result<(), String> {
    let cap = sc.ctx.scenario.with_untracked(|s| crate::view::stack::caption(s, describe));
    offer(kind, slug, plot, || cap.clone(), || csv(&cap))
}

/// Put where the axes landed on the canvas, in CSS px and axis units (tests aim with it).
fn expose_frame(canvas: &web_sys::HtmlCanvasElement, f: &Frame) {
    let text = format!(
        "{{\"left\":{:.2},\"right\":{:.2},\"top\":{:.2},\"bottom\":{:.2},\"x\":[{},{}],\"y\":[{},{}]}}",
        f.left / f.scale,
        f.right / f.scale,
        f.top / f.scale,
        f.bottom / f.scale,
        f.x_lo,
        f.x_hi,
        f.y_lo,
        f.y_hi
    );
    let _ = canvas.set_attribute("data-frame", &text);
}

/// Draw `plot` on `canvas` (if it is on the page), recording its frame or its error.
fn draw_into(
    i: usize,
    canvas: &Option<web_sys::HtmlCanvasElement>,
    plot: &impl Drawing,
    frames: &mut [Frame; PLOTS],
    errors: &mut [Option<String>; PLOTS],
) {
    if let Some(canvas) = canvas {
        match draw_on_canvas(canvas, plot) {
            Ok(Some(f)) => {
                expose_frame(canvas, &f);
                frames[i] = f
            }
            Ok(None) => {}
            Err(e) => errors[i] = Some(e),
        }
    }
}

/// The Stack tab's content.
#[component]
pub fn StackPanel() -> impl IntoView {
    let ctx = expect_context::<Ctx>();
    let sc = StackCtx::new(ctx);
    let canvases: [NodeRef<html::Canvas>; PLOTS] = [NodeRef::new(), NodeRef::new(), NodeRef::new(), NodeRef::new()];

    // solve and redraw after every change; the map only starts a new computation when its
    // inputs change
    Effect::new(move |_| {
        ctx.layout.track();
        let selected = sc.selected.get();
        let map = sc.map.get();
        let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
        let mut frames = sc.frames.get_untracked();
        let mut errors: [Option<String>; PLOTS] = Default::default();
        let outcome = ctx.scenario.with(crate::view::stack::stack_view);
        match outcome {
            Ok(v) => {
                let v = Arc::new(v);
                draw_into(
                    SPECTRUM,
                    &targets[SPECTRUM],
                    &spectrum::SpectrumPlot { v: &v, selected },
                    &mut frames,
                    &mut errors,
                );
                sc.view.set(Some(v));
                if sc.error.with_untracked(|e| e.is_some()) {
                    sc.error.set(None);
                    ctx.clear_error("stack-gaps");
                }
            }
            Err(e) => {
                let had = sc.view.with_untracked(|v| v.is_some());
                let tail = if had { " The figures shown are from the last usable stack." } else { "" };
                sc.error.set(Some(format!("{}{tail}", sentence(&e))));
                if ctx.errors.with_untracked(|m| m.get("stack-gaps").map(|t| t != &sentence(&e)).unwrap_or(true)) {
                    ctx.set_error("stack-gaps", sentence(&e));
                }
            }
        }
        ctx.scenario.with(|s| map::ensure(sc, s));
        if let Some(m) = &map {
            let design = ctx.scenario.with(|s| crate::view::stack::map::Design::of(&s.stack));
            if let Some(canvas) = &targets[MAP] {
                match map::draw_on_page(canvas, &map::MapPlot { map: m, design }) {
                    Ok(Some(f)) => {
                        expose_frame(canvas, &f);
                        frames[MAP] = f
                    }
                    Ok(None) => {}
                    Err(e) => errors[MAP] = Some(e),
                }
            }
        }
        match ctx.scenario.with(crate::view::stack::loss_view) {
            Ok(l) => {
                let l = Arc::new(l);
                draw_into(LOSSES, &targets[LOSSES], &losses::LossPlot { l: &l }, &mut frames, &mut errors);
                sc.losses.set(Some(l));
            }
            Err(e) => errors[LOSSES] = Some(sentence(&e)),
        }
        match ctx.scenario.with(crate::view::stack::absorber_view) {
            Ok(a) => {
                let a = a.map(Arc::new);
                if let Some(a) = &a {
                    draw_into(EQE, &targets[EQE], &eqe::EqePlot { a }, &mut frames, &mut errors);
                }
                sc.absorber.set(a);
                if ctx.errors.with_untracked(|m| m.get("absorber").is_some_and(|t| t.starts_with(ABSORBER_UNUSABLE))) {
                    ctx.clear_error("absorber");
                }
            }
            Err(e) => {
                sc.absorber.set(None);
                ctx.set_error("absorber", format!("{ABSORBER_UNUSABLE} {}", sentence(&e)));
            }
        }
        mark("gg-stack-drawn");
        sc.frames.set(frames);
        if sc.plot_errors.with_untracked(|p| *p != errors) {
            sc.plot_errors.set(errors);
        }
        count_render();
    });
    super::watch_sizes(ctx, canvases.to_vec());
    on_cleanup(|| {
        map::stop();
        search::stop();
    });

    view! {
        <main class="layout stack-layout">
            <aside class="panel" aria-label="Stack settings">
                {controls::editor_section(sc)}
                {search::search_section(sc)}
                {controls::conditions(sc)}
                {eqe::eqe_section(sc, canvases[EQE])}
            </aside>
            <section class="results" aria-label="Stack results">
                {controls::figures(sc)}
                {controls::subcell_table(sc)}
                <div class="plots stack-plots">
                    {spectrum::spectrum_card(sc, canvases[SPECTRUM])}
                    {map::map_card(sc, canvases[MAP])}
                    {losses::losses_card(sc, canvases[LOSSES])}
                </div>
            </section>
        </main>
        {controls::cautions(sc)}
    }
}
