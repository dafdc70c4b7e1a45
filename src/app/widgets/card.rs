//! A plot on the page, whatever it shows: its header (title, tools, downloads), its legend,
//! the canvas with pointer and key handling, and the hover read-out. What the pointer and
//! the keys do, and what the downloads hold, is the plot's own ([`PlotBehaviour`]); the
//! cell's plots and the radiator's share this one frame around them.

use crate::view::controls::Control;
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;
use wasm_bindgen::JsCast;

use crate::app::state::Ctx;
use crate::scenario::Scenario;
use crate::view::export::{file_name, ExportKind};
use crate::view::input::parse_number;

/// What the hover read-out shows.
#[derive(Debug, Clone, PartialEq)]
pub struct Hover {
    /// pointer position and the marked data point [CSS px in the canvas]
    pub x: f64,
    pub y: f64,
    pub dot: Option<(f64, f64)>,
    pub lines: Vec<String>,
    /// put the read-out on the pointer's left (near the right edge)
    pub flip: bool,
}

impl Hover {
    /// A read-out at the pointer (x, y) on a canvas `width` CSS px wide.
    pub fn new(x: f64, y: f64, width: f64, dot: Option<(f64, f64)>, lines: Vec<String>) -> Hover {
        Hover { x, y, dot, lines, flip: x > width - 240.0 }
    }
}

/// What a plot does with the pointer, the keys and the download buttons. Positions are CSS
/// pixels from the canvas' top-left corner.
pub trait PlotBehaviour: 'static {
    /// The read-out at the pointer, if any.
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover>;
    /// The primary button went down; returns whether a drag starts (the canvas then takes
    /// the pointer and the focus).
    fn press(&self, _x: f64, _y: f64) -> bool {
        false
    }
    /// The pointer moved during a drag.
    fn drag(&self, _x: f64, _y: f64) {}
    /// The drag ended (button up or cancelled).
    fn release(&self) {}
    fn double_click(&self, _x: f64, _y: f64) {}
    /// A key went down on the focused canvas; returns whether it was handled.
    fn key_down(&self, _ev: &web_sys::KeyboardEvent) -> bool {
        false
    }
    fn key_up(&self, _ev: &web_sys::KeyboardEvent) {}
    /// Offer the plot as a file of this kind (through [`super::export::offer`]).
    fn save(&self, kind: ExportKind) -> Result<(), String>;
}

/// Everything about a plot card but its behaviour.
pub struct Card {
    /// test hook (`data-card`, `data-plot`) and file-name part
    pub slug: &'static str,
    pub title: &'static str,
    pub aria: String,
    /// the canvas takes the focus (tab stop) and the pointer
    pub interactive: bool,
    /// extra class of the canvas' wrapper ("draggable", "editor", ...)
    pub wrap_class: &'static str,
    /// `data-control` hook of the canvas, if it is a control
    pub control: Option<&'static str>,
    pub tools: AnyView,
    pub legend: AnyView,
    /// anything between the legend and the plot (e.g. a message line)
    pub note: AnyView,
    /// anything under the plot
    pub footer: AnyView,
    pub canvas: NodeRef<html::Canvas>,
    pub plot_error: Signal<Option<String>>,
}

fn pointer_pos(ev: &web_sys::MouseEvent) -> Option<(f64, f64, f64)> {
    let el: web_sys::Element = ev.current_target()?.dyn_into().ok()?;
    let r = el.get_bounding_client_rect();
    Some((ev.client_x() as f64 - r.left(), ev.client_y() as f64 - r.top(), r.width()))
}

pub fn plot_card(ctx: Ctx, card: Card, b: Rc<dyn PlotBehaviour>) -> impl IntoView {
    let Card { slug, title, aria, interactive, wrap_class, control, tools, legend, note, footer, canvas, plot_error } =
        card;
    let hover = RwSignal::new(None::<Hover>);
    let dragging = StoredValue::new(false);

    let b1 = b.clone();
    let on_down = move |ev: ev::PointerEvent| {
        if ev.button() != 0 {
            return;
        }
        let Some((x, y, _)) = pointer_pos(&ev) else { return };
        if !b1.press(x, y) {
            return;
        }
        ev.prevent_default();
        if let Some(c) = canvas.get_untracked() {
            let _ = c.set_pointer_capture(ev.pointer_id());
            let _ = c.focus();
        }
        dragging.set_value(true);
    };
    let b2 = b.clone();
    let on_move = move |ev: ev::PointerEvent| {
        let Some((x, y, w)) = pointer_pos(&ev) else { return };
        if dragging.get_value() {
            b2.drag(x, y);
        }
        hover.set(b2.hover(x, y, w));
    };
    let b3 = b.clone();
    let end = move |ev: ev::PointerEvent| {
        if dragging.get_value() {
            dragging.set_value(false);
            if let Some(c) = canvas.get_untracked() {
                let _ = c.release_pointer_capture(ev.pointer_id());
            }
            b3.release();
        }
    };
    let on_leave = move |_ev: ev::PointerEvent| {
        if !dragging.get_value() {
            hover.set(None);
        }
    };
    let b4 = b.clone();
    let on_key = move |ev: ev::KeyboardEvent| {
        if b4.key_down(&ev) {
            ev.prevent_default();
        }
    };
    let b5 = b.clone();
    let on_key_up = move |ev: ev::KeyboardEvent| b5.key_up(&ev);
    let b6 = b.clone();
    let on_double = move |ev: ev::MouseEvent| {
        if let Some((x, y, w)) = pointer_pos(&ev) {
            ev.prevent_default();
            b6.double_click(x, y);
            hover.set(b6.hover(x, y, w));
        }
    };

    let download = move |kind: ExportKind| match b.save(kind) {
        Ok(()) => ctx.status.set(Some(format!("Saved {}.", file_name(slug, kind)))),
        Err(e) => ctx.status.set(Some(format!("Could not save the {} file: {e}.", kind.as_str().to_ascii_uppercase()))),
    };
    let download = Rc::new(download);
    let button = move |kind: ExportKind| {
        let d = download.clone();
        let what = kind.as_str();
        view! {
            <button type="button" data-action=format!("download-{slug}-{what}") title=kind.describe() on:click=move |_| d(kind)>
                {what.to_ascii_uppercase()}
            </button>
        }
    };
    let tip = move || {
        hover.get().map(|h| {
            let style = if h.flip {
                format!("right:calc(100% - {:.0}px);top:{:.0}px", h.x - 14.0, h.y + 14.0)
            } else {
                format!("left:{:.0}px;top:{:.0}px", h.x + 14.0, h.y + 14.0)
            };
            let dot = h
                .dot
                .map(|(x, y)| view! { <span class="hover-dot" style=format!("left:{x:.1}px;top:{y:.1}px")></span> });
            let lines = h.lines.into_iter().map(|l| view! { <span>{l}</span> }).collect_view();
            view! {
                {dot}
                <div class="tooltip" style=style>{lines}</div>
            }
        })
    };

    view! {
        <article class="plot-card" data-card=slug>
            <header class="plot-head">
                <h3>{title}</h3>
                {tools}
                <div class="downloads" role="group" aria-label=format!("Download the {} plot", slug)>
                    {ExportKind::ALL.map(button).collect_view()}
                </div>
            </header>
            <div class="legend">{legend}</div>
            {note}
            <div class=format!("plot-wrap {wrap_class}")>
                <canvas
                    data-plot=slug
                    data-control=control
                    node_ref=canvas
                    role="img"
                    aria-label=aria
                    tabindex=if interactive { "0" } else { "-1" }
                    on:pointerdown=on_down
                    on:pointermove=on_move
                    on:pointerup=end.clone()
                    on:pointercancel=end
                    on:pointerleave=on_leave
                    on:keydown=on_key
                    on:keyup=on_key_up
                    on:dblclick=on_double
                ></canvas>
                {tip}
                <p class="plot-error" hidden=move || plot_error.get().is_none()>{move || plot_error.get()}</p>
            </div>
            {footer}
        </article>
    }
}

/// A small numeric input in a plot's header for one end of a plotted range; edits go
/// through [`Ctx::edit`] under `err_hook`, text that is no number gets `bad(text)`.
#[allow(clippy::too_many_arguments)]
pub fn range_input(
    ctx: Ctx,
    hook: &'static str,
    err_hook: Control,
    label: &'static str,
    unit: &'static str,
    value: Memo<f64>,
    set: fn(&mut Scenario, f64),
    bad: fn(&str) -> String,
) -> impl IntoView {
    let r = NodeRef::<html::Input>::new();
    Effect::new(move |_| {
        let v = value.get();
        if let Some(el) = r.get() {
            let typed = parse_number(&el.value());
            if el.matches(":focus").unwrap_or(false) && typed == Some(v) {
                return;
            }
            el.set_value(&crate::view::format::field(v, 6));
        }
    });
    let on_input = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match parse_number(&text) {
            Some(v) => {
                ctx.edit(err_hook, |s| set(s, v));
            }
            None => ctx.set_error(err_hook, bad(text.trim())),
        }
    };
    view! {
        <label class="range-field">
            <span>{label}</span>
            <input type="text" inputmode="decimal" data-control=hook node_ref=r value=crate::view::format::field(value.get_untracked(), 6) on:input=on_input aria-describedby=format!("e-{err_hook}") />
            <span class="unit">{unit}</span>
        </label>
    }
}
