//! The browser app: one page that keeps the scenario in its address bar, recomputes and
//! redraws as the user edits, and works offline.
//!
//! Flow: controls and plots edit the scenario signal ([`state::Ctx::edit`] checks every
//! edit); the panel in front (the cell, [`radiator`], [`stack`] or [`hot`], chosen by the tab bar
//! and kept in the scenario's view settings) has one effect that computes (with caches
//! such as [`crate::view::cell::CellCache`]) and redraws its canvases; one effect of the page writes the
//! link and the saved state ([`share`]) after every change.

pub mod cell;
pub mod hot;
pub mod import;
pub mod radiator;
pub mod share;
pub mod stack;
pub mod state;
pub mod widgets;

use crate::view::controls::Control;
use std::cell::{Cell, RefCell};
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use crate::scenario::Panel;
use state::Ctx;

/// Start the app (called from `main` on wasm32).
pub fn start() {
    // a panic's location, in the console (its message would pull the whole formatting of
    // panic payloads into the download; the location is enough to find it)
    std::panic::set_hook(Box::new(|info| {
        let at = info.location().map(|l| format!(" at {}:{}", l.file(), l.line())).unwrap_or_default();
        web_sys::console::error_1(&format!("Glowgap stopped on an internal error{at}; please report it.").into());
    }));
    leptos::mount::mount_to_body(App);
}

/// Whether a canvas' bitmap no longer matches its size on the page.
fn needs_resize(c: &web_sys::HtmlCanvasElement) -> bool {
    let dpr = web_sys::window().map(|w| w.device_pixel_ratio()).unwrap_or(1.0).clamp(1.0, 4.0);
    let (w, h) = ((c.client_width() as f64 * dpr).round() as u32, (c.client_height() as f64 * dpr).round() as u32);
    w > 0 && h > 0 && (w != c.width() || h != c.height())
}

thread_local! {
    /// the size observers of the mounted panels, by slot
    static OBSERVERS: RefCell<Vec<Option<web_sys::ResizeObserver>>> = const { RefCell::new(Vec::new()) };
}

/// Redraw (bump `ctx.layout`, at most once a frame) when one of `canvases` is resized
/// (layout, notices, scrollbars). Starts once all of them are on the page and stops when
/// the calling component goes away.
pub fn watch_sizes(ctx: Ctx, canvases: Vec<NodeRef<html::Canvas>>) {
    use wasm_bindgen::closure::Closure;
    use wasm_bindgen::JsCast;
    let slot = StoredValue::new(None::<usize>);
    Effect::new(move |done: Option<bool>| {
        if done == Some(true) {
            return true;
        }
        let list: Vec<web_sys::HtmlCanvasElement> = canvases.iter().filter_map(|r| r.get()).collect();
        if list.len() < canvases.len() {
            return false;
        }
        let watched = list.clone();
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
            for c in &list {
                observer.observe(c);
            }
            let i = OBSERVERS.with(|o| {
                let mut o = o.borrow_mut();
                o.push(Some(observer));
                o.len() - 1
            });
            slot.set_value(Some(i));
            // the callback lives as long as the page; it does nothing once disconnected
            cb.forget();
        }
        true
    });
    on_cleanup(move || {
        if let Some(i) = slot.try_get_value().flatten() {
            OBSERVERS.with(|o| {
                if let Some(obs) = o.borrow_mut().get_mut(i).and_then(|x| x.take()) {
                    obs.disconnect();
                }
            });
        }
    });
}

/// The panels in tab order: (panel, hook, tab text).
const PANELS: [(Panel, &str, &str); 4] = [
    (Panel::Cell, "cell", "Solar cell"),
    (Panel::Radiator, "radiator", "Radiator"),
    (Panel::Stack, "stack", "Stack"),
    (Panel::Hot, "hot", "Hot emitters"),
];

/// The tab bar that brings a panel to the front (arrow keys move between tabs).
fn panel_tabs(ctx: Ctx, panel: Memo<Panel>) -> impl IntoView {
    let choose = move |p: Panel| {
        ctx.edit(Control::Panel, |s| s.view.panel = p);
    };
    let on_key = move |ev: ev::KeyboardEvent| {
        let i = PANELS.iter().position(|(p, _, _)| *p == panel.get_untracked()).unwrap_or(0);
        let n = PANELS.len();
        let next = match ev.key().as_str() {
            "ArrowRight" => (i + 1) % n,
            "ArrowLeft" => (i + n - 1) % n,
            "Home" => 0,
            "End" => n - 1,
            _ => return,
        };
        ev.prevent_default();
        choose(PANELS[next].0);
        if let Some(el) = document().query_selector(&format!("[data-panel=\"{}\"]", PANELS[next].1)).ok().flatten() {
            use wasm_bindgen::JsCast;
            if let Ok(el) = el.dyn_into::<web_sys::HtmlElement>() {
                let _ = el.focus();
            }
        }
    };
    let tabs = PANELS
        .iter()
        .map(|&(p, hook, text)| {
            let on = move || panel.get() == p;
            view! {
                <button
                    type="button"
                    role="tab"
                    id=format!("tab-{hook}")
                    data-panel=hook
                    aria-selected=move || if on() { "true" } else { "false" }
                    aria-controls="panel-body"
                    tabindex=move || if on() { "0" } else { "-1" }
                    on:click=move |_| choose(p)
                >
                    {text}
                </button>
            }
        })
        .collect_view();
    view! {
        <nav class="panel-tabs" role="tablist" aria-label="What to design" on:keydown=on_key>{tabs}</nav>
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
    let rad = radiator::RadiatorState::new(ctx);
    provide_context(rad);
    let persist = share::Persist::new(hold);
    provide_context(cell::state::CellState::new(ctx));
    let panel = Memo::new(move |_| ctx.scenario.with(|s| s.view.panel));

    // the link and the saved state follow every change, whichever panel made it: after the
    // panels have computed and drawn (a microtask queued now runs after the effects already
    // scheduled), and before anything waits on `body[data-renders]` (a timeout)
    {
        let persist = persist.clone();
        Effect::new(move |_| {
            ctx.scenario.track();
            let persist = persist.clone();
            queue_microtask(move || share::persist(ctx, &persist));
        });
    }

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
            import::open_dropped(ctx, f, |f| match panel.get_untracked() {
                Panel::Radiator => radiator::import::open_emissivity(ctx, rad, f),
                _ => import::open_spectrum(ctx, f),
            });
        }
    });

    // the gap search's worker loads and warms up on another core once the first render is
    // out, so a search on a newly opened page does not wait for it
    set_timeout(stack::search::prestart, std::time::Duration::from_millis(50));

    // status lines fade after a while
    Effect::new(move |_| {
        if let Some(text) = ctx.status.get() {
            set_timeout(
                move || {
                    if ctx.status.with_untracked(|s| s.as_deref() == Some(text.as_str()))
                        && !text.starts_with("This scenario is too large")
                    {
                        ctx.status.set(None);
                    }
                },
                std::time::Duration::from_secs(8),
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
        let r = ctx.scenario.with_untracked(widgets::export::save_scenario);
        ctx.status.set(Some(match r {
            Ok(()) => {
                "Saved glowgap-scenario.json; open it again with “Open scenario…” or by dropping it on the page.".into()
            }
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
    let tagline = move || match panel.get() {
        Panel::Cell => "Detailed-balance limit of a single-junction solar cell",
        Panel::Radiator => "Radiative balance of a surface facing the sky",
        Panel::Stack => "Detailed-balance limits of multi-junction stacks",
        Panel::Hot => "Blackbodies, thermophotovoltaic pairs and solar-thermal absorbers",
    };
    let body = move || match panel.get() {
        Panel::Cell => view! { <cell::CellPanel /> }.into_any(),
        Panel::Radiator => view! { <radiator::RadiatorPanel /> }.into_any(),
        Panel::Stack => view! { <stack::StackPanel /> }.into_any(),
        Panel::Hot => view! { <hot::HotPanel /> }.into_any(),
    };

    view! {
        <div class="app">
            <header class="top">
                <div class="brand">
                    <img src="icon.svg" alt="" width="34" height="34" />
                    <div>
                        <h1>"Glowgap"</h1>
                        <p class="tagline">{tagline}</p>
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
            {widgets::notices::notices(ctx)}
            {panel_tabs(ctx, panel)}
            <p class="field-error tabs-error" data-error=Control::Panel.as_str() aria-live="polite">{move || ctx.error_of(Control::Panel)}</p>
            <div id="panel-body" role="tabpanel" aria-labelledby=move || format!("tab-{}", PANELS.iter().find(|p| p.0 == panel.get()).map(|p| p.1).unwrap_or("cell"))>
                {body}
            </div>
        </div>
    }
}
