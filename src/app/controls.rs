//! The control panel: the light source and the cell.
//!
//! Every numeric field shows its unit, commits as the user types when the text is a usable
//! value, and otherwise says next to itself what is wrong while the last good value stays in
//! use. Fields follow the scenario when it changes elsewhere (a drag, a key, a file), except
//! while the user is typing a value that already matches.

use std::cell::Cell;
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use super::fmt;
use super::import;
use super::state::{ev_of_nm, tidy, Ctx};
use crate::physics::constants::MAX_CONCENTRATION;
use crate::scenario::{Emission, JvModel};
use crate::scenario::{Scenario, SourceSpec, CELL_TEMP_RANGE_K};

/// Band-gap starting points: (label, eV). Typical room-temperature values.
pub const ABSORBERS: [(&str, f64); 7] =
    [("Ge", 0.66), ("c-Si", 1.12), ("CIGS", 1.15), ("InP", 1.34), ("GaAs", 1.42), ("CdTe", 1.50), ("MAPbI₃", 1.60)];

/// Read a number as people type it: spaces ignored, a lone decimal comma accepted.
pub fn parse_number(text: &str) -> Option<f64> {
    let t: String = text.trim().chars().filter(|c| !c.is_whitespace() && *c != '_').collect();
    if t.is_empty() {
        return None;
    }
    let t = if !t.contains('.') && t.matches(',').count() == 1 { t.replace(',', ".") } else { t.replace(',', "") };
    t.parse::<f64>().ok()
}

/// A band gap typed as "1.42", "1.42 eV", "873 nm" or "0.873 µm"; returns eV.
pub fn parse_gap(text: &str) -> Result<f64, String> {
    let t = text.trim().to_lowercase();
    let (num, unit) = match t.find(|c: char| c.is_alphabetic() || c == 'µ') {
        Some(i) => (t[..i].trim(), t[i..].trim()),
        None => (t.as_str(), ""),
    };
    let v = parse_number(num)
        .ok_or_else(|| format!("'{}' is not a band gap; type e.g. 1.34, 1.34 eV or 925 nm", text.trim()))?;
    match unit {
        "" | "ev" => Ok(v),
        "mev" => Ok(v / 1000.0),
        "nm" => positive_wavelength(v, text).map(ev_of_nm),
        "um" | "µm" | "μm" | "micron" | "microns" => positive_wavelength(v, text).map(|u| ev_of_nm(u * 1000.0)),
        _ => Err(format!("'{unit}' is not a unit for the band gap; use eV, nm or µm (e.g. 1.34 eV or 925 nm)")),
    }
}

fn positive_wavelength(v: f64, text: &str) -> Result<f64, String> {
    if v > 0.0 && v.is_finite() {
        Ok(v)
    } else {
        Err(format!("the wavelength '{}' must be a positive number, e.g. 925 nm", text.trim()))
    }
}

/// A key handler of a field; returns whether it handled the key.
pub type KeyHandler = Rc<dyn Fn(&web_sys::KeyboardEvent, &web_sys::HtmlInputElement) -> bool>;

/// What a numeric field needs to know.
pub struct Field {
    pub label: &'static str,
    pub unit: &'static str,
    pub hook: &'static str,
    pub hint: Option<String>,
    /// an example value for messages
    pub example: &'static str,
    pub value: Memo<f64>,
    pub show: fn(f64) -> String,
    pub parse: fn(&str) -> Result<f64, String>,
}

fn plain_parse(text: &str) -> Result<f64, String> {
    parse_number(text).ok_or_else(|| format!("'{}' is not a number", text.trim()))
}

fn same(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-12 * a.abs().max(b.abs())
}

fn is_focused(el: &web_sys::HtmlInputElement) -> bool {
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
    pub hook: &'static str,
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
                        if let Some(m) = e.get_mut(hook) {
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
                    super::state::sentence(&msg)
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
            <p class="field-error" id=err_id data-error=hook aria-live="polite">{move || ctx.error_of(hook)}</p>
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
            if let Some(f) = import::take_file(&el) {
                take(f);
            }
        }
    };
    let on_drop = move |ev: ev::DragEvent| {
        ev.prevent_default();
        ev.stop_propagation();
        over.set(false);
        if let Some(f) = import::dropped_file(&ev) {
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

/// The value of the source <select> for a source.
fn source_key(s: &SourceSpec) -> &'static str {
    match s {
        SourceSpec::Am15g => "am1.5g",
        SourceSpec::Am15d => "am1.5d",
        SourceSpec::Am0 => "am0",
        SourceSpec::Blackbody { .. } => "blackbody",
        SourceSpec::File { .. } | SourceSpec::Table(_) => "table",
    }
}

pub fn source_panel(ctx: Ctx) -> impl IntoView {
    let key = Memo::new(move |_| ctx.scenario.with(|s| source_key(&s.cell.spectrum)));
    let on_select = move |ev: ev::Event| {
        let v = event_target_value(&ev);
        let spec = match v.as_str() {
            "am1.5g" => Some(SourceSpec::Am15g),
            "am1.5d" => Some(SourceSpec::Am15d),
            "am0" => Some(SourceSpec::Am0),
            "blackbody" => Some(SourceSpec::Blackbody { temp_k: ctx.bb_temp.get_untracked() }),
            "table" => ctx.user_table.get_untracked().map(SourceSpec::Table),
            _ => None,
        };
        ctx.choose(
            "spectrum",
            spec,
            "Load a spectrum file first (below); the current source is still in use.",
            |s, spec| s.cell.spectrum = spec,
        );
        // if the edit was refused, show the source in use again
        if let Some(t) = ev.target() {
            use wasm_bindgen::JsCast;
            if let Ok(sel) = t.dyn_into::<web_sys::HtmlSelectElement>() {
                sel.set_value(key.get_untracked());
            }
        }
    };
    let select = NodeRef::<html::Select>::new();
    Effect::new(move |_| {
        let k = key.get();
        // the table option's label and state may change in the same turn
        ctx.user_table.track();
        if let Some(sel) = select.get() {
            sel.set_value(k);
        }
    });
    let table_label = move || {
        ctx.user_table.with(|t| match t {
            Some(t) => format!("Your spectrum: {} ({} points)", t.name, t.x.len()),
            None => "Your spectrum (load a file below)".to_string(),
        })
    };

    let bb_value = Memo::new(move |_| {
        ctx.scenario.with(|s| match s.cell.spectrum {
            SourceSpec::Blackbody { temp_k } => temp_k,
            _ => ctx.bb_temp.get(),
        })
    });
    let bb_field = Field {
        label: "Sun temperature",
        unit: "K",
        hook: "blackbody-temp",
        hint: Some("Blackbody disc seen from 1 au; 5772 K matches the Sun's output.".into()),
        example: "5772",
        value: bb_value,
        show: |v| fmt::field(v, 6),
        parse: plain_parse,
    };
    let bb_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |t| {
        let ok = ctx.edit("blackbody-temp", |s| s.cell.spectrum = SourceSpec::Blackbody { temp_k: t });
        if ok {
            ctx.bb_temp.set(t);
        }
        ok
    });
    let bb_view = number_field(ctx, bb_field, bb_commit, None);

    let spectrum_hint = view! {
        <p class="hint" id="h-spectrum-file">
            "A text table: first column wavelength (nm, µm), photon energy (eV) or wavenumber (cm⁻¹); "
            "units in the header, e.g. " <code>"Wavelength (nm), Irradiance (W m-2 nm-1)"</code> "."
        </p>
    };
    let drop = drop_zone(
        "spectrum-file",
        ".csv,.tsv,.txt,.dat,text/csv,text/plain",
        "e-spectrum h-spectrum-file",
        "Load a spectrum file…",
        spectrum_hint.into_any(),
        Rc::new(move |f| import::open_spectrum(ctx, f)),
    );
    let info = move || {
        ctx.computed.with(|c| {
            c.as_ref().map(|c| {
                let p = c.setup.light.source.total_power();
                let what = match &c.spectrum.name[..] {
                    "AM1.5G" | "AM1.5D" | "AM0" => " (ASTM G173-03)",
                    _ => "",
                };
                format!("{}{what} · {} W/m² at one sun", c.spectrum.name, fmt::fixed(p, 1))
            })
        })
    };

    view! {
        <section class="panel-section" aria-labelledby="src-h">
            <h2 id="src-h">Light source</h2>
            <div class="field">
                <label for="f-spectrum">Spectrum</label>
                <select id="f-spectrum" data-control="spectrum" node_ref=select on:change=on_select aria-describedby="e-spectrum">
                    <option value="am1.5g" prop:selected=move || key.get() == "am1.5g">"AM1.5G (global, tilted)"</option>
                    <option value="am1.5d" prop:selected=move || key.get() == "am1.5d">"AM1.5D (direct + circumsolar)"</option>
                    <option value="am0" prop:selected=move || key.get() == "am0">"AM0 (above the atmosphere)"</option>
                    <option value="blackbody" prop:selected=move || key.get() == "blackbody">"Blackbody sun"</option>
                    <option value="table" prop:selected=move || key.get() == "table" disabled=move || ctx.user_table.with(|t| t.is_none())>
                        {table_label}
                    </option>
                </select>
                <p class="hint">{info}</p>
            </div>
            <div class="sub-field" hidden=move || key.get() != "blackbody">{bb_view}</div>
            {drop}
            <p class="field-error" id="e-spectrum" data-error="spectrum" aria-live="polite">{move || ctx.error_of("spectrum")}</p>
        </section>
    }
}

pub fn cell_panel(ctx: Ctx) -> impl IntoView {
    let gap = Memo::new(move |_| ctx.scenario.with(|s| s.cell.gap_ev));
    let gap_nm = Memo::new(move |_| ctx.scenario.with(|s| ev_of_nm(1.0) / s.cell.gap_ev));

    // arrow keys on the gap field: Up/Down always; Left/Right unless the user is typing
    let (gap_keys, typing) = gap_keys(Rc::new(move |d| ctx.set_gap("gap", tidy(ctx.gap() + d))));
    let gap_field = Field {
        label: "Band gap",
        unit: "eV",
        hook: "gap",
        hint: None,
        example: "1.34",
        value: gap,
        show: fmt::gap_ev,
        parse: parse_gap,
    };
    let gap_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |g| ctx.set_gap("gap", g));
    let gap_view = view! {
        <div on:focusin=move |_| typing.set(false)>{number_field(ctx, gap_field, gap_commit, Some(gap_keys))}</div>
    };

    let nm_field = Field {
        label: "Absorption edge",
        unit: "nm",
        hook: "gap-nm",
        hint: None,
        example: "925",
        value: gap_nm,
        show: |v| fmt::fixed(v, 1),
        parse: |t| {
            let v = parse_number(t).ok_or_else(|| format!("'{}' is not a wavelength; type e.g. 925", t.trim()))?;
            if v > 0.0 && v.is_finite() {
                Ok(v)
            } else {
                Err(format!("the wavelength {v} nm must be positive, e.g. 925"))
            }
        },
    };
    let nm_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |nm| ctx.set_gap("gap-nm", ev_of_nm(nm)));
    let nm_view = number_field(ctx, nm_field, nm_commit, None);

    let presets = ABSORBERS
        .iter()
        .map(|(name, g)| {
            let g = *g;
            let pressed = move || (ctx.scenario.with(|s| s.cell.gap_ev) - g).abs() < 5e-7;
            view! {
                <button
                    type="button"
                    class="chip"
                    data-preset=*name
                    aria-pressed=move || if pressed() { "true" } else { "false" }
                    title=format!("{name}: {} eV, a typical room-temperature value", fmt::fixed(g, 2))
                    on:click=move |_| { ctx.set_gap("gap", g); }
                >
                    <span class="chip-name">{*name}</span>
                    <span class="chip-value">{fmt::fixed(g, 2)}</span>
                </button>
            }
        })
        .collect_view();

    let temp = Memo::new(move |_| ctx.scenario.with(|s| s.cell.cell_temp_k));
    let temp_view = number_field(
        ctx,
        Field {
            label: "Cell temperature",
            unit: "K",
            hook: "cell-temp",
            hint: Some(format!("{} to {} K; 300 K is the usual reference.", CELL_TEMP_RANGE_K.0, CELL_TEMP_RANGE_K.1)),
            example: "300",
            value: temp,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |t| ctx.edit("cell-temp", |s| s.cell.cell_temp_k = t)),
        None,
    );

    let conc = Memo::new(move |_| ctx.scenario.with(|s| s.cell.concentration));
    let conc_view = number_field(
        ctx,
        Field {
            label: "Concentration",
            unit: "suns",
            hook: "concentration",
            hint: Some(format!(
                "1 (no concentration) up to {} suns, the limit for light from the sun's disc.",
                thousands(MAX_CONCENTRATION)
            )),
            example: "1",
            value: conc,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |x| ctx.edit("concentration", |s| s.cell.concentration = x)),
        None,
    );
    let slider_max = MAX_CONCENTRATION.log10();
    let on_slider = move |ev: ev::Event| {
        if let Some(v) = parse_number(&event_target_value(&ev)) {
            let x = if v >= slider_max - 5e-4 { MAX_CONCENTRATION } else { round_sig(10f64.powf(v), 3).max(1.0) };
            ctx.edit("concentration", |s| s.cell.concentration = x);
        }
    };
    let warnings = move || {
        ctx.computed.with(|c| {
            c.as_ref().map(|c| c.setup.warnings.iter().map(|w| super::state::sentence(w)).collect::<Vec<_>>().join(" "))
        })
    };

    let ere = Memo::new(move |_| ctx.scenario.with(|s| s.cell.ere));
    let ere_view = number_field(
        ctx,
        Field {
            label: "External radiative efficiency (ERE)",
            unit: "",
            hook: "ere",
            hint: Some("A fraction above 0, at most 1. 1 is the radiative limit; 0.01 means 1 in 100 recombinations gives out a photon.".into()),
            example: "1",
            value: ere,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |x| ctx.edit("ere", |s| s.cell.ere = x)),
        None,
    );

    let emission = Memo::new(move |_| ctx.scenario.with(|s| s.cell.emission));
    let model = Memo::new(move |_| ctx.scenario.with(|s| s.cell.approx));
    let set_emission = move |e: Emission| {
        ctx.edit("emission", |s| s.cell.emission = e);
    };
    let set_model = move |m: JvModel| {
        ctx.edit("model", |s| s.cell.approx = m);
    };

    view! {
        <section class="panel-section" aria-labelledby="cell-h">
            <h2 id="cell-h">Cell</h2>
            <div class="gap-pair">
                {gap_view}
                {nm_view}
            </div>
            <p class="hint gap-hint">"Arrow keys in the field or on a plot: ±1 meV (Shift: ±10 meV). Drag the red marker on the plots. Type 925 nm in either field if you prefer."</p>
            <div class="presets" role="group" aria-labelledby="presets-h">
                <p id="presets-h" class="presets-title">"Typical absorbers " <span class="muted">"(room-temperature values, common practice)"</span></p>
                <div class="chips">{presets}</div>
            </div>
            {temp_view}
            <div class="conc">
                {conc_view}
                <div class="slider-row">
                    <input
                        type="range"
                        min="0"
                        max=format!("{slider_max:.4}")
                        step="0.001"
                        data-control="concentration-slider"
                        aria-label="Concentration, logarithmic scale"
                        prop:value=move || format!("{:.4}", conc.get().max(1.0).log10())
                        on:input=on_slider
                    />
                    <button type="button" class="small" data-action="max-concentration" title=format!("Set the limit for light from the sun's disc, {} suns", thousands(MAX_CONCENTRATION)) on:click=move |_| { ctx.edit("concentration", |s| s.cell.concentration = MAX_CONCENTRATION); }>
                        "Max"
                    </button>
                </div>
                <p class="warning" hidden=move || warnings().map(|w| w.is_empty()).unwrap_or(true)>{warnings}</p>
                <p class="safety" hidden=move || conc.get() <= 1.0>
                    "Concentrated sunlight can burn skin and damage eyes. Follow local codes and licensed practice when working with real concentrators."
                </p>
            </div>
            {ere_view}
            <fieldset class="choice">
                <legend>"Emitting faces"</legend>
                <label>
                    <input type="radio" name="emission" data-control="emission-front" prop:checked=move || emission.get() == Emission::Front on:change=move |_| set_emission(Emission::Front) />
                    "Front only (perfect back mirror)"
                </label>
                <label>
                    <input type="radio" name="emission" data-control="emission-both" prop:checked=move || emission.get() == Emission::Both on:change=move |_| set_emission(Emission::Both) />
                    "Both faces"
                </label>
                <p class="field-error" data-error="emission">{move || ctx.error_of("emission")}</p>
            </fieldset>
            <fieldset class="choice">
                <legend>"J–V model"</legend>
                <label>
                    <input type="radio" name="model" data-control="model-exact" prop:checked=move || model.get() == JvModel::Exact on:change=move |_| set_model(JvModel::Exact) />
                    "Exact (generalized Planck)"
                </label>
                <label>
                    <input type="radio" name="model" data-control="model-boltzmann" prop:checked=move || model.get() == JvModel::Boltzmann on:change=move |_| set_model(JvModel::Boltzmann) />
                    "Boltzmann approximation"
                </label>
                <p class="field-error" data-error="model">{move || ctx.error_of("model")}</p>
            </fieldset>
        </section>
    }
}

/// A whole number with thousands separators.
pub fn thousands(v: f64) -> String {
    let s = format!("{:.0}", v);
    let mut out = String::new();
    for (i, c) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

fn round_sig(v: f64, sig: i32) -> f64 {
    if v <= 0.0 || !v.is_finite() {
        return v;
    }
    let p = 10f64.powi(sig - 1 - v.log10().floor() as i32);
    (v * p).round() / p
}

/// The current scenario, untracked (for handlers).
pub fn scenario_now(ctx: Ctx) -> Scenario {
    ctx.scenario.get_untracked()
}
