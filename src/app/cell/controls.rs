//! The control panel: the light source and the cell.
//!
//! Every numeric field shows its unit, commits as the user types when the text is a usable
//! value, and otherwise says next to itself what is wrong while the last good value stays in
//! use. Fields follow the scenario when it changes elsewhere (a drag, a key, a file), except
//! while the user is typing a value that already matches.

use crate::view::controls::Control;
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use super::state::CellState;
use crate::app::state::Ctx;
use crate::app::widgets::fields::{drop_zone, gap_keys, number_field, plain_parse, Field};
use crate::app::widgets::place::{place_controls, PlaceUi};
use crate::physics::constants::MAX_CONCENTRATION;
use crate::physics::varshni::{gap_material, GAP_MATERIALS};
use crate::scenario::{Emission, JvModel};
use crate::scenario::{Scenario, SourceSpec, CELL_TEMP_RANGE_K};
use crate::view::format as fmt;
use crate::view::format::round_sig;
use crate::view::input::{ev_of_nm, parse_gap, parse_number, thousands, tidy};

/// Band-gap starting points: (label, eV). Typical room-temperature values.
pub const ABSORBERS: [(&str, f64); 7] =
    [("Ge", 0.66), ("c-Si", 1.12), ("CIGS", 1.15), ("InP", 1.34), ("GaAs", 1.42), ("CdTe", 1.50), ("MAPbI₃", 1.60)];

/// The value of the source <select> for a source.
fn source_key(s: &SourceSpec) -> &'static str {
    match s {
        SourceSpec::Am15g => "am1.5g",
        SourceSpec::Am15d => "am1.5d",
        SourceSpec::Am0 => "am0",
        SourceSpec::Blackbody { .. } => "blackbody",
        SourceSpec::File { .. } | SourceSpec::Table(_) => "table",
        SourceSpec::ClearSky(_) => "place",
    }
}

pub fn source_panel(cs: CellState, place: PlaceUi) -> impl IntoView {
    let ctx = cs.ctx;
    let key = Memo::new(move |_| ctx.scenario.with(|s| source_key(&s.cell.spectrum)));
    let on_select = move |ev: ev::Event| {
        let v = event_target_value(&ev);
        let spec = match v.as_str() {
            "am1.5g" => Some(SourceSpec::Am15g),
            "am1.5d" => Some(SourceSpec::Am15d),
            "am0" => Some(SourceSpec::Am0),
            "blackbody" => Some(SourceSpec::Blackbody { temp_k: ctx.bb_temp.get_untracked() }),
            "table" => ctx.user_table.get_untracked().map(SourceSpec::Table),
            "place" => Some(SourceSpec::ClearSky(ctx.place.get_untracked())),
            _ => None,
        };
        ctx.choose(
            Control::Spectrum,
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
        hook: Control::BlackbodyTemp,
        hint: Some("Blackbody disc seen from 1 au; 5772 K matches the Sun's output.".into()),
        example: "5772",
        value: bb_value,
        show: |v| fmt::field(v, 6),
        parse: plain_parse,
    };
    let bb_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |t| {
        let ok = ctx.edit(Control::BlackbodyTemp, |s| s.cell.spectrum = SourceSpec::Blackbody { temp_k: t });
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
        Rc::new(move |f| crate::app::import::open_spectrum(ctx, f)),
    );
    let info = move || {
        cs.computed.with(|c| {
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
                    <option value="place" prop:selected=move || key.get() == "place">"Place and time (clear sky)"</option>
                    <option value="table" prop:selected=move || key.get() == "table" disabled=move || ctx.user_table.with(|t| t.is_none())>
                        {table_label}
                    </option>
                </select>
                <p class="hint">{info}</p>
            </div>
            <div class="sub-field" hidden=move || key.get() != "blackbody">{bb_view}</div>
            <div class="sub-field" hidden=move || key.get() != "place">{place_controls(place)}</div>
            {drop}
            <p class="field-error" id="e-spectrum" data-error=Control::Spectrum.as_str() aria-live="polite">{move || ctx.error_of(Control::Spectrum)}</p>
        </section>
    }
}

pub fn cell_panel(cs: CellState) -> impl IntoView {
    let ctx = cs.ctx;
    let gap = Memo::new(move |_| ctx.scenario.with(|s| s.cell.gap_ev));
    let gap_nm = Memo::new(move |_| ctx.scenario.with(|s| ev_of_nm(1.0) / s.cell.gap_ev));

    // arrow keys on the gap field: Up/Down always; Left/Right unless the user is typing
    let (gap_keys, typing) = gap_keys(Rc::new(move |d| ctx.set_gap(Control::Gap, tidy(ctx.gap() + d))));
    let gap_field = Field {
        label: "Band gap",
        unit: "eV",
        hook: Control::Gap,
        hint: None,
        example: "1.34",
        value: gap,
        show: fmt::gap_ev,
        parse: parse_gap,
    };
    let gap_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |g| ctx.set_gap(Control::Gap, g));
    let gap_view = view! {
        <div on:focusin=move |_| typing.set(false)>{number_field(ctx, gap_field, gap_commit, Some(gap_keys))}</div>
    };

    let nm_field = Field {
        label: "Absorption edge",
        unit: "nm",
        hook: Control::GapNm,
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
    let nm_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |nm| ctx.set_gap(Control::GapNm, ev_of_nm(nm)));
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
                    on:click=move |_| { ctx.set_gap(Control::Gap, g); }
                >
                    <span class="chip-name">{*name}</span>
                    <span class="chip-value">{fmt::fixed(g, 2)}</span>
                </button>
            }
        })
        .collect_view();

    // a material whose gap follows the cell temperature (Varshni)
    let material = Memo::new(move |_| ctx.scenario.with(|s| s.cell.gap_material.clone().unwrap_or_default()));
    let on_material = move |ev: ev::Event| {
        let key = event_target_value(&ev);
        ctx.edit(Control::GapMaterial, |s| s.cell.gap_material = (!key.is_empty()).then_some(key));
    };
    let material_options = GAP_MATERIALS
        .iter()
        .map(|m| {
            let key = m.key;
            view! { <option value=key prop:selected=move || material.get() == key>{m.label}</option> }
        })
        .collect_view();
    let material_source = move || {
        material.with(|k| {
            gap_material(k).map(|m| {
                format!(
                    "Eg(T) = {} eV − {} meV/K · T² / (T + {} K), {}.",
                    fmt::field(m.eg0_ev, 6),
                    fmt::field(m.alpha_ev_per_k * 1e3, 6),
                    fmt::field(m.beta_k, 6),
                    m.source
                )
            })
        })
    };

    let temp = Memo::new(move |_| ctx.scenario.with(|s| s.cell.cell_temp_k));
    let temp_view = number_field(
        ctx,
        Field {
            label: "Cell temperature",
            unit: "K",
            hook: Control::CellTemp,
            hint: Some(format!("{} to {} K; 300 K is the usual reference.", CELL_TEMP_RANGE_K.0, CELL_TEMP_RANGE_K.1)),
            example: "300",
            value: temp,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |t| ctx.edit(Control::CellTemp, |s| s.cell.cell_temp_k = t)),
        None,
    );

    let conc = Memo::new(move |_| ctx.scenario.with(|s| s.cell.concentration));
    let conc_view = number_field(
        ctx,
        Field {
            label: "Concentration",
            unit: "suns",
            hook: Control::Concentration,
            hint: Some(format!(
                "1 (no concentration) up to {} suns, the limit for light from the sun's disc.",
                thousands(MAX_CONCENTRATION)
            )),
            example: "1",
            value: conc,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |x| ctx.edit(Control::Concentration, |s| s.cell.concentration = x)),
        None,
    );
    let slider_max = MAX_CONCENTRATION.log10();
    let on_slider = move |ev: ev::Event| {
        if let Some(v) = parse_number(&event_target_value(&ev)) {
            let x = if v >= slider_max - 5e-4 { MAX_CONCENTRATION } else { round_sig(10f64.powf(v), 3).max(1.0) };
            ctx.edit(Control::Concentration, |s| s.cell.concentration = x);
        }
    };
    let warnings = move || {
        cs.computed.with(|c| {
            c.as_ref()
                .map(|c| c.setup.warnings.iter().map(|w| crate::app::state::sentence(w)).collect::<Vec<_>>().join(" "))
        })
    };

    let ere = Memo::new(move |_| ctx.scenario.with(|s| s.cell.ere));
    let ere_view = number_field(
        ctx,
        Field {
            label: "External radiative efficiency (ERE)",
            unit: "",
            hook: Control::Ere,
            hint: Some("A fraction above 0, at most 1. 1 is the radiative limit; 0.01 means 1 in 100 recombinations gives out a photon.".into()),
            example: "1",
            value: ere,
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |x| ctx.edit(Control::Ere, |s| s.cell.ere = x)),
        None,
    );

    let emission = Memo::new(move |_| ctx.scenario.with(|s| s.cell.emission));
    let model = Memo::new(move |_| ctx.scenario.with(|s| s.cell.approx));
    let set_emission = move |e: Emission| {
        ctx.edit(Control::Emission, |s| s.cell.emission = e);
    };
    let set_model = move |m: JvModel| {
        ctx.edit(Control::Model, |s| s.cell.approx = m);
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
            <div class="field gap-material">
                <label for="f-gap-material">"Gap follows the cell temperature"</label>
                <select id="f-gap-material" data-control=Control::GapMaterial.as_str() on:change=on_material aria-describedby="e-gap-material">
                    <option value="" prop:selected=move || material.with(String::is_empty)>"No: the band gap as typed"</option>
                    {material_options}
                </select>
                <p class="hint" hidden=move || material.with(String::is_empty)>{material_source}</p>
                <p class="field-error" id="e-gap-material" data-error=Control::GapMaterial.as_str()>{move || ctx.error_of(Control::GapMaterial)}</p>
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
                    <button type="button" class="small" data-action="max-concentration" title=format!("Set the limit for light from the sun's disc, {} suns", thousands(MAX_CONCENTRATION)) on:click=move |_| { ctx.edit(Control::Concentration, |s| s.cell.concentration = MAX_CONCENTRATION); }>
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
                <p class="field-error" data-error=Control::Emission.as_str()>{move || ctx.error_of(Control::Emission)}</p>
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
                <p class="field-error" data-error=Control::Model.as_str()>{move || ctx.error_of(Control::Model)}</p>
            </fieldset>
        </section>
    }
}

/// The current scenario, untracked (for handlers).
pub fn scenario_now(ctx: Ctx) -> Scenario {
    ctx.scenario.get_untracked()
}
