//! Form fields shared by every panel: a numeric field with its unit and its message, the
//! band-gap arrow keys, and the drop zone for data files.
//!
//! Every numeric field shows its unit, commits as the user types when the text is a usable
//! value, and otherwise says next to itself what is wrong while the last good value stays in
//! use. Fields follow the scenario when it changes elsewhere (a drag, a key, a file), except
//! while the user is typing a value that already matches.

use crate::view::controls::Control;
use std::cell::Cell;
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use crate::app::state::Ctx;
use crate::view::input::parse_number;

/// A key handler of a field; returns whether it handled the key.
pub type KeyHandler = Rc<dyn Fn(&web_sys::KeyboardEvent, &web_sys::HtmlInputElement) -> bool>;

/// What a numeric field needs to know.
pub struct Field {
    pub label: &'static str,
    pub unit: &'static str,
    pub hook: Control,
    pub hint: Option<String>,
    /// an example value for messages
    pub example: &'static str,
    pub value: Memo<f64>,
    pub show: fn(f64) -> String,
    pub parse: fn(&str) -> Result<f64, String>,
}

pub fn plain_parse(text: &str) -> Result<f64, String> {
    parse_number(text).ok_or_else(|| format!("'{}' is not a number", text.trim()))
}

pub fn same(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-12 * a.abs().max(b.abs())
}

pub fn is_focused(el: &web_sys::HtmlInputElement) -> bool {
    el.matches(":focus").unwrap_or(false)
}

/// Steps of the band gap by key [eV]: 1 meV, 10 meV with Shift.
pub fn key_step(ev: &web_sys::KeyboardEvent) -> f64 {
    if ev.shift_key() {
        0.010
    } else {
        0.001
    }
}

/// Arrow keys on a band-gap field: Up/Down always step the gap, Left/Right only while the
/// user is not typing in the field (there they move the caret). `step(d)` applies a step of
/// `d` eV (1 meV, 10 meV with Shift) and says whether it was taken. Returns the handler and
/// the typing flag, which the field's focus-in should clear.
pub fn gap_keys(step: Rc<dyn Fn(f64) -> bool>) -> (KeyHandler, Rc<Cell<bool>>) {
    let typing = Rc::new(Cell::new(false));
    let t = typing.clone();
    let handler: KeyHandler = Rc::new(move |ev, _el| {
        let dir = match ev.key().as_str() {
            "ArrowUp" => 1.0,
            "ArrowDown" => -1.0,
            "ArrowRight" if !t.get() => 1.0,
            "ArrowLeft" if !t.get() => -1.0,
            "Enter" | "Escape" => {
                t.set(false);
                return false;
            }
            k if k.chars().count() == 1 || k == "Backspace" || k == "Delete" => {
                t.set(true);
                return false;
            }
            _ => return false,
        };
        step(dir * key_step(ev));
        true
    });
    (handler, typing)
}

fn still_using(value: String, unit: &str) -> String {
    let unit = if value == "1" && unit == "suns" { "sun" } else { unit };
    if unit.is_empty() {
        format!("Still using {value}.")
    } else {
        format!("Still using {value} {unit}.")
    }
}

/// A bare numeric input: what it edits and how it reads and shows values. Messages go to
/// the error line of `hook`.
pub struct NumberInput {
    pub hook: Control,
    /// its `data-control` hook
    pub control: String,
    pub id: Option<String>,
    /// an accessible name, when no <label> names it
    pub aria_label: Option<String>,
    pub describedby: String,
    pub unit: &'static str,
    /// an example value for messages
    pub example: &'static str,
    pub value: Memo<f64>,
    pub show: fn(f64) -> String,
    pub parse: fn(&str) -> Result<f64, String>,
}

/// A numeric input that follows the scenario, commits as the user types when the text is a
/// usable value, and otherwise says under `hook` what is wrong while the last good value
/// stays in use. `commit` returns whether the value was taken; `on_key` may handle a key
/// (returns true when it did).
pub fn numeric_input(
    ctx: Ctx,
    f: NumberInput,
    commit: Rc<dyn Fn(f64) -> bool>,
    on_key: Option<KeyHandler>,
) -> impl IntoView {
    let input = NodeRef::<html::Input>::new();
    let NumberInput { hook, control, id, aria_label, describedby, unit, example, value, show, parse } = f;

    // follow the scenario
    Effect::new(move |_| {
        let v = value.get();
        if let Some(el) = input.get() {
            let typed = parse(&el.value()).ok();
            if is_focused(&el) && typed.is_some_and(|t| same(t, v)) {
                return;
            }
            el.set_value(&show(v));
        }
    });

    let on_input = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match parse(&text) {
            Ok(v) => {
                if !commit(v) {
                    let still = still_using(show(value.get_untracked()), unit);
                    ctx.errors.update(|e| {
                        if let Some(m) = e.get_mut(&hook) {
                            if !m.contains("Still using") {
                                m.push(' ');
                                m.push_str(&still);
                            }
                        }
                    });
                }
            }
            Err(msg) => {
                let shown = if text.trim().is_empty() {
                    format!("Type a value, e.g. {example} {unit}")
                } else {
                    crate::app::state::sentence(&msg)
                };
                let shown = format!("{}.", shown.trim_end_matches('.'));
                ctx.set_error(hook, format!("{shown} {}", still_using(show(value.get_untracked()), unit)));
            }
        }
    };
    let on_change = move |_ev: ev::Event| {
        // tidy the text once the user is done, if it holds the value in use
        if let Some(el) = input.get_untracked() {
            if let Ok(t) = parse(&el.value()) {
                let v = value.get_untracked();
                if same(t, v) {
                    el.set_value(&show(v));
                }
            }
        }
    };
    let on_keydown = move |ev: ev::KeyboardEvent| {
        if let (Some(k), Some(el)) = (&on_key, input.get_untracked()) {
            if k(&ev, &el) {
                ev.prevent_default();
            }
        }
    };
    view! {
        <input
            id=id
            type="text"
            inputmode="decimal"
            autocomplete="off"
            spellcheck="false"
            data-control=control
            value=show(value.get_untracked())
            node_ref=input
            aria-label=aria_label
            aria-describedby=describedby
            aria-invalid=move || if ctx.error_of(hook).is_some() { "true" } else { "false" }
            on:input=on_input
            on:change=on_change
            on:keydown=on_keydown
        />
    }
}

/// A labelled numeric input with its unit, hint and message line (see [`numeric_input`]).
pub fn number_field(ctx: Ctx, f: Field, commit: Rc<dyn Fn(f64) -> bool>, on_key: Option<KeyHandler>) -> impl IntoView {
    let Field { label, unit, hook, hint, example, value, show, parse } = f;
    let id = format!("f-{hook}");
    let err_id = format!("e-{hook}");
    let hint_id = format!("h-{hook}");
    let describedby = if hint.is_some() { format!("{hint_id} {err_id}") } else { err_id.clone() };
    let input = NumberInput {
        hook,
        control: hook.to_string(),
        id: Some(id.clone()),
        aria_label: None,
        describedby,
        unit,
        example,
        value,
        show,
        parse,
    };
    view! {
        <div class="field" class:has-error=move || ctx.error_of(hook).is_some()>
            <label for=id>{label}</label>
            <div class="input-unit">
                {numeric_input(ctx, input, commit, on_key)}
                <span class="unit" aria-hidden="true">{unit}</span>
            </div>
            {hint.map(|h| view! { <p class="hint" id=hint_id>{h}</p> })}
            <p class="field-error" id=err_id data-error=hook.as_str() aria-live="polite">{move || ctx.error_of(hook)}</p>
        </div>
    }
}

/// A file button that also takes a dropped file: `control` is the input's hook, `hint` the
/// line under it (which should carry the id named in `describedby`).
pub fn drop_zone(
    control: &'static str,
    accept: &'static str,
    describedby: &'static str,
    button: &'static str,
    hint: AnyView,
    on_file: Rc<dyn Fn(web_sys::File)>,
) -> impl IntoView {
    let file_input = NodeRef::<html::Input>::new();
    let over = RwSignal::new(false);
    let take = on_file.clone();
    let on_change = move |_ev: ev::Event| {
        if let Some(el) = file_input.get_untracked() {
            if let Some(f) = crate::app::import::take_file(&el) {
                take(f);
            }
        }
    };
    let on_drop = move |ev: ev::DragEvent| {
        ev.prevent_default();
        ev.stop_propagation();
        over.set(false);
        if let Some(f) = crate::app::import::dropped_file(&ev) {
            on_file(f);
        }
    };
    view! {
        <div
            class="drop-zone"
            class:over=move || over.get()
            on:dragover=move |ev: ev::DragEvent| { ev.prevent_default(); over.set(true); }
            on:dragleave=move |_| over.set(false)
            on:drop=on_drop
        >
            <label class="file-button">
                <input type="file" data-control=control accept=accept node_ref=file_input on:change=on_change aria-describedby=describedby />
                <span>{button}</span>
            </label>
            <span class="drop-note">"or drop it here"</span>
            {hint}
        </div>
    }
}
