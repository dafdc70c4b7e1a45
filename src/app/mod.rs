//! The browser app: one page that keeps the scenario in its address bar, recomputes and
//! redraws as the user edits, and works offline.
//!
//! Flow: controls and plots edit the scenario signal ([`state::Ctx::edit`] checks every
//! edit); one effect computes ([`engine::Engine`] caches what the gap does not change),
//! redraws the three canvases, then writes the link and the saved state ([`share`]).

pub mod controls;
pub mod engine;
pub mod export;
pub mod figures;
pub mod fmt;
pub mod import;
pub mod plot_card;
pub mod plots;
pub mod share;
pub mod state;

use std::cell::{Cell, RefCell};
use std::rc::Rc;
use std::sync::Arc;
use std::time::Duration;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use engine::Engine;
use plots::render::{draw_on_canvas, PlotKind};
use state::{mark, Ctx};

/// Start the app (called from `main` on wasm32).
pub fn start() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(App);
}

fn set_body_renders(n: u64) {
    if let Some(body) = web_sys::window().and_then(|w| w.document()).and_then(|d| d.body()) {
        let _ = body.dataset().set("renders", &n.to_string());
    }
}

/// Whether a canvas' bitmap no longer matches its size on the page.
fn needs_resize(c: &web_sys::HtmlCanvasElement) -> bool {
    let dpr = web_sys::window().map(|w| w.device_pixel_ratio()).unwrap_or(1.0).clamp(1.0, 4.0);
    let (w, h) = ((c.client_width() as f64 * dpr).round() as u32, (c.client_height() as f64 * dpr).round() as u32);
    w > 0 && h > 0 && (w != c.width() || h != c.height())
}

/// Observe the canvases and redraw when one of them is resized.
fn watch_sizes(ctx: Ctx, canvases: Vec<web_sys::HtmlCanvasElement>) {
    use wasm_bindgen::closure::Closure;
    use wasm_bindgen::JsCast;
    let watched = canvases.clone();
    let pending = Rc::new(Cell::new(false));
    let cb = Closure::<dyn FnMut(js_sys::Array, web_sys::ResizeObserver)>::new(move |_entries, _observer| {
        if watched.iter().any(needs_resize) && !pending.replace(true) {
            let p = pending.clone();
            request_animation_frame(move || {
                p.set(false);
                ctx.layout.update(|n| *n = n.wrapping_add(1));
            });
        }
    });
    if let Ok(observer) = web_sys::ResizeObserver::new(cb.as_ref().unchecked_ref()) {
        for c in &canvases {
            observer.observe(c);
        }
        // both live as long as the page
        std::mem::forget(observer);
        cb.forget();
    }
}

#[component]
fn App() -> impl IntoView {
    let opening = share::opening();
    let hold = if opening.hold_storage { Some(opening.scenario.clone()) } else { None };
    let ctx = Ctx::new(opening.scenario);
    for n in opening.notices {
        ctx.notify(n);
    }
    provide_context(ctx);
    let persist = share::Persist::new(hold);

    let canvases: [NodeRef<html::Canvas>; 3] = [NodeRef::new(), NodeRef::new(), NodeRef::new()];
    let engine = Rc::new(RefCell::new(Engine::default()));
    let renders = Rc::new(Cell::new(0u64));

    {
        let persist = persist.clone();
        Effect::new(move |_| {
            ctx.layout.track();
            let targets: Vec<_> = canvases.iter().map(|r| r.get()).collect();
            let outcome = ctx.scenario.with(|s| engine.borrow_mut().compute(s));
            match outcome {
                Ok(c) => {
                    let c = Arc::new(c);
                    let mut frames = ctx.frames.get_untracked();
                    let mut errors: [Option<String>; 3] = [None, None, None];
                    for kind in PlotKind::ALL {
                        if let Some(canvas) = &targets[kind.index()] {
                            match draw_on_canvas(canvas, kind, &c) {
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
                Err(e) => ctx.compute_error.set(Some(format!("{} The figures shown are from the last usable scenario.", state::sentence(&e)))),
            }
            share::persist(ctx, &persist);
            let n = renders.get() + 1;
            renders.set(n);
            // after the figures' text has been updated
            set_timeout(move || set_body_renders(n), Duration::ZERO);
        });
    }

    // redraw when a canvas changes size (layout, notices, scrollbars), at most once a frame
    Effect::new(move |done: Option<bool>| {
        if done == Some(true) {
            return true;
        }
        let list: Vec<_> = canvases.iter().filter_map(|r| r.get()).collect();
        if list.len() < canvases.len() {
            return false;
        }
        watch_sizes(ctx, list);
        true
    });
    let pending = Rc::new(Cell::new(false));
    let _resize = window_event_listener(ev::resize, move |_| {
        if !pending.replace(true) {
            let p = pending.clone();
            request_animation_frame(move || {
                p.set(false);
                ctx.layout.update(|n| *n = n.wrapping_add(1));
            });
        }
    });
    {
        let persist = persist.clone();
        let _hash = window_event_listener(ev::hashchange, move |_| share::on_hash_change(ctx, &persist));
    }
    // a file dropped anywhere must not replace the page
    let _over = window_event_listener(ev::dragover, |e| e.prevent_default());
    let _drop = window_event_listener(ev::drop, move |e| {
        e.prevent_default();
        if let Some(f) = import::dropped_file(&e) {
            import::open_dropped(ctx, f);
        }
    });

    // status lines fade after a while
    Effect::new(move |_| {
        if let Some(text) = ctx.status.get() {
            set_timeout(
                move || {
                    if ctx.status.with_untracked(|s| s.as_deref() == Some(text.as_str())) && !text.starts_with("This scenario is too large") {
                        ctx.status.set(None);
                    }
                },
                Duration::from_secs(8),
            );
        }
    });
    let link_fallback = RwSignal::new(None::<String>);
    let scenario_input = NodeRef::<html::Input>::new();
    let on_scenario_file = move |_| {
        if let Some(el) = scenario_input.get_untracked() {
            if let Some(f) = import::take_file(&el) {
                import::open_scenario(ctx, f);
            }
        }
    };
    let save = move |_| {
        let r = ctx.scenario.with_untracked(export::save_scenario);
        ctx.status.set(Some(match r {
            Ok(()) => "Saved glowgap-scenario.json; open it again with “Open scenario…” or by dropping it on the page.".into(),
            Err(e) => format!("Could not save the scenario: {e}."),
        }));
    };
    let fallback_ref = NodeRef::<html::Input>::new();
    Effect::new(move |_| {
        if link_fallback.get().is_some() {
            if let Some(el) = fallback_ref.get() {
                el.select();
            }
        }
    });

    view! {
        <div class="app">
            <header class="top">
                <div class="brand">
                    <img src="icon.svg" alt="" width="34" height="34" />
                    <div>
                        <h1>"Glowgap"</h1>
                        <p class="tagline">"Detailed-balance limit of a single-junction solar cell"</p>
                    </div>
                </div>
                <div class="top-actions">
                    <button type="button" class="primary" data-action="copy-link" on:click=move |_| share::copy_link(ctx, link_fallback)>
                        "Copy link"
                    </button>
                    <button type="button" data-action="save-scenario" on:click=save>"Save scenario"</button>
                    <label class="file-button plain">
                        <input type="file" accept=".json,application/json" data-control="scenario-file" node_ref=scenario_input on:change=on_scenario_file />
                        <span>"Open scenario…"</span>
                    </label>
                </div>
            </header>
            <div class="status-line" role="status" aria-live="polite">
                {move || ctx.status.get()}
                {move || link_fallback.get().map(|l| view! { <input class="link-copy" readonly node_ref=fallback_ref value=l aria-label="Link to this scenario" /> })}
            </div>
            {figures::notices(ctx)}
            <main class="layout">
                <aside class="panel" aria-label="Settings">
                    {controls::source_panel(ctx)}
                    {controls::cell_panel(ctx)}
                </aside>
                <section class="results" aria-label="Results">
                    {figures::figures(ctx)}
                    <div class="plots">
                        {plot_card::plot_card(ctx, PlotKind::Spectrum, canvases[0])}
                        {plot_card::plot_card(ctx, PlotKind::Efficiency, canvases[1])}
                        {plot_card::plot_card(ctx, PlotKind::Jv, canvases[2])}
                    </div>
                </section>
            </main>
            {figures::cautions()}
        </div>
    }
}
