//! The radiator's settings: the surface (presets, measured data, control points), the sky,
//! the air and the sun. Fields are the shared numeric fields: they commit usable values as
//! the user types and otherwise say next to themselves what is wrong, keeping the last good
//! value in use.

use crate::view::controls::Control;
use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use super::import::{open_emissivity, open_sky};
use crate::app::radiator::state::RadiatorState;
use crate::app::state::Ctx;
use crate::app::widgets::fields::{drop_zone, number_field, Field};
use crate::app::widgets::place::{place_controls, PlaceUi};
use crate::scenario::radiator::{
    pwv_from_dew_point, reitan_dew_point_c, AngularSpec, EmitterSpec, SkySpec, AMBIENT_RANGE_K, CLEAR_SKY_AMBIENT_K,
    DEW_POINT_RANGE_C, HC_RANGE, PWV_RANGE_CM, SUN_SCALE_RANGE,
};
use crate::scenario::{Scenario, SourceSpec};
use crate::view::format as fmt;
use crate::view::input::parse_number;
use crate::view::radiator::points::{preset, preset_of, PRESETS};

fn plain(text: &str) -> Result<f64, String> {
    parse_number(text).ok_or_else(|| format!("'{}' is not a number", text.trim()))
}

/// A numeric field of the radiator scenario: `get` reads it, `set` writes a typed value.
#[allow(clippy::too_many_arguments)]
fn field(
    ctx: Ctx,
    label: &'static str,
    unit: &'static str,
    hook: Control,
    hint: String,
    example: &'static str,
    get: fn(&Scenario) -> f64,
    set: fn(&mut Scenario, f64),
) -> impl IntoView {
    let value = Memo::new(move |_| ctx.scenario.with(get));
    number_field(
        ctx,
        Field { label, unit, hook, hint: Some(hint), example, value, show: |v| fmt::field(v, 6), parse: plain },
        Rc::new(move |v| ctx.edit(hook, |s| set(s, v))),
        None,
    )
}

/// A <select> whose options are (value, text, enabled); `choose` commits a value and
/// returns whether it was taken. The select always shows the value `current` holds.
fn select(
    hook: Control,
    label: &'static str,
    current: Memo<&'static str>,
    options: Vec<(&'static str, Signal<String>, Signal<bool>)>,
    choose: impl Fn(&str) + 'static,
) -> impl IntoView {
    let node = NodeRef::<html::Select>::new();
    Effect::new(move |_| {
        let k = current.get();
        if let Some(sel) = node.get() {
            sel.set_value(k);
        }
    });
    let on_change = move |ev: ev::Event| {
        choose(&event_target_value(&ev));
        if let Some(sel) = node.get_untracked() {
            sel.set_value(current.get_untracked());
        }
    };
    let id = format!("f-{hook}");
    let opts = options
        .into_iter()
        .map(|(v, text, enabled)| view! { <option value=v prop:selected=move || current.get() == v disabled=move || !enabled.get()>{move || text.get()}</option> })
        .collect_view();
    view! {
        <label for=id.clone()>{label}</label>
        <select id=id data-control=hook.as_str() node_ref=node on:change=on_change aria-describedby=format!("e-{hook}")>{opts}</select>
    }
}

fn fixed_text(t: &'static str) -> Signal<String> {
    Signal::stored(t.to_string())
}

fn always() -> Signal<bool> {
    Signal::stored(true)
}

fn error_line(ctx: Ctx, hook: Control) -> impl IntoView {
    view! { <p class="field-error" id=format!("e-{hook}") data-error=hook.as_str() aria-live="polite">{move || ctx.error_of(hook)}</p> }
}

fn sky_key(s: &SkySpec) -> &'static str {
    match s {
        SkySpec::Box => "box",
        SkySpec::Space => "space",
        SkySpec::Clear { .. } => "clear",
        SkySpec::File { .. } | SkySpec::Table(_) => "table",
    }
}

/// The sky and the air around the surface.
pub fn environment_section(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let key = Memo::new(move |_| ctx.scenario.with(|s| sky_key(&s.radiator.sky)));
    let table_text = Signal::derive(move || {
        rad.user_sky.with(|t| match t {
            Some(t) => format!("Your sky: {} ({} points)", t.name, t.wavelength_m.len()),
            None => "Your sky transmittance (load a file below)".into(),
        })
    });
    let options = vec![
        ("box", fixed_text("Box (open 8–13 µm only)"), always()),
        ("space", fixed_text("Space (3 K, no air)"), always()),
        ("clear", fixed_text("Clear sky (spectral model)"), always()),
        ("table", table_text, Signal::derive(move || rad.user_sky.with(|t| t.is_some()))),
    ];
    let choose = move |v: &str| {
        let spec = match v {
            "box" => Some(SkySpec::Box),
            "space" => Some(SkySpec::Space),
            "clear" => Some(SkySpec::Clear { pwv_cm: rad.last_pwv.get_untracked() }),
            "table" => rad.user_sky.get_untracked().map(SkySpec::Table),
            _ => None,
        };
        ctx.choose(
            Control::Sky,
            spec,
            "Load a sky transmittance file first (below); the current sky is still in use.",
            |s, spec| s.radiator.sky = spec,
        );
    };
    let pwv = field(
        ctx,
        "Precipitable water",
        "cm",
        Control::Pwv,
        format!("{} to {} cm; about 0.5 is a dry sky, 4 a humid one.", PWV_RANGE_CM.0, PWV_RANGE_CM.1),
        "1.5",
        |s| match s.radiator.sky {
            SkySpec::Clear { pwv_cm } => pwv_cm,
            _ => f64::NAN,
        },
        |s, v| s.radiator.sky = SkySpec::Clear { pwv_cm: v },
    );
    // the same water column as a dew point at the ground (Reitan's relation), both ways
    let dew = number_field(
        ctx,
        Field {
            label: "or its dew point",
            unit: "°C",
            hook: Control::Dew,
            hint: Some(format!(
                "At the ground, {} to {} °C; sets the precipitable water above by Reitan's relation.",
                DEW_POINT_RANGE_C.0, DEW_POINT_RANGE_C.1
            )),
            example: "12",
            value: Memo::new(move |_| {
                ctx.scenario.with(|s| match s.radiator.sky {
                    SkySpec::Clear { pwv_cm } if pwv_cm > 0.0 => reitan_dew_point_c(pwv_cm),
                    _ => f64::NAN,
                })
            }),
            show: |v| if v.is_finite() { format!("{v:.1}") } else { String::new() },
            parse: |t| {
                let v = plain(t.trim().trim_end_matches("°C").trim_end_matches('C'))?;
                pwv_from_dew_point(v).map(|_| v)
            },
        },
        Rc::new(move |v| match pwv_from_dew_point(v) {
            Ok(pwv_cm) => ctx.edit(Control::Dew, |s| s.radiator.sky = SkySpec::Clear { pwv_cm }),
            Err(_) => false,
        }),
        None,
    );
    let sky_hint = view! {
        <p class="hint" id="h-sky-file">
            "Zenith transmittance against wavelength (nm, µm) or wavenumber (cm⁻¹), e.g. a header "
            <code>"wavelength_um,transmittance"</code> "; % columns are read as percent."
        </p>
    };
    let sky_drop = drop_zone(
        "sky-file",
        ".csv,.tsv,.txt,.dat,text/csv,text/plain",
        "e-sky-file h-sky-file",
        "Load a sky transmittance…",
        sky_hint.into_any(),
        Rc::new(move |f| open_sky(ctx, f)),
    );
    let ambient = field(
        ctx,
        "Ambient air temperature",
        "K",
        Control::Ambient,
        format!(
            "{} to {} K (the clear sky: {} to {} K). The air also radiates as the sky.",
            AMBIENT_RANGE_K.0, AMBIENT_RANGE_K.1, CLEAR_SKY_AMBIENT_K.0, CLEAR_SKY_AMBIENT_K.1
        ),
        "300",
        |s| s.radiator.ambient_k,
        |s, v| s.radiator.ambient_k = v,
    );
    let at_ambient = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.surface_k.is_none()));
    let surface = field(
        ctx,
        "Surface temperature",
        "K",
        Control::Surface,
        "Where the balance and the figures of merit are evaluated.".into(),
        "300",
        |s| s.radiator.surface_temperature(),
        |s, v| s.radiator.surface_k = Some(v),
    );
    let on_at_ambient = move |ev: ev::Event| {
        let on = event_target_checked(&ev);
        ctx.edit(Control::Surface, |s| s.radiator.surface_k = if on { None } else { Some(s.radiator.ambient_k) });
    };
    let hc = field(
        ctx,
        "Convection coefficient h_c",
        "W/m²K",
        Control::Hc,
        format!(
            "{} to {}; 0 for none (vacuum, a still enclosure), about 3-10 for still air to a light wind.",
            HC_RANGE.0, HC_RANGE.1
        ),
        "6",
        |s| s.radiator.h_c_w_m2k,
        |s, v| s.radiator.h_c_w_m2k = v,
    );
    view! {
        <section class="panel-section" aria-labelledby="env-h">
            <h2 id="env-h">"Sky and air"</h2>
            <div class="field">
                {select(Control::Sky, "Sky model", key, options, choose)}
                {error_line(ctx, Control::Sky)}
            </div>
            <div class="sub-field" hidden=move || key.get() != "clear">{pwv}{dew}</div>
            {sky_drop}
            {error_line(ctx, Control::SkyFile)}
            {ambient}
            <label class="check">
                <input type="checkbox" data-control="surface-at-ambient" prop:checked=move || at_ambient.get() on:change=on_at_ambient />
                "Surface at ambient temperature"
            </label>
            <div class="sub-field" hidden=move || at_ambient.get()>{surface}</div>
            {hc}
        </section>
    }
}

fn sun_key(s: &SourceSpec) -> &'static str {
    match s {
        SourceSpec::Am15g => "am1.5g",
        SourceSpec::Am15d => "am1.5d",
        SourceSpec::Am0 => "am0",
        SourceSpec::ClearSky(_) => "place",
        _ => "other",
    }
}

/// The sun: on or off, its spectrum, angle and scale.
pub fn sun_section(rad: RadiatorState, place: PlaceUi) -> impl IntoView {
    let ctx = rad.ctx;
    let on = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.sun.is_some()));
    let on_toggle = move |ev: ev::Event| {
        let want = event_target_checked(&ev);
        let spec = want.then(|| rad.last_sun.get_untracked());
        ctx.edit(Control::Sun, move |s| s.radiator.sun = spec);
    };
    let key =
        Memo::new(move |_| ctx.scenario.with(|s| sun_key(s.radiator.sun.as_ref().unwrap_or(&rad.last_sun.get()))));
    let other = Signal::derive(move || rad.last_sun.with(|s| format!("From the link: {}", s.label())));
    let options = vec![
        ("am1.5g", fixed_text("AM1.5G (global, tilted)"), always()),
        ("am1.5d", fixed_text("AM1.5D (direct + circumsolar)"), always()),
        ("am0", fixed_text("AM0 (above the atmosphere)"), always()),
        ("place", fixed_text("Place and time (clear sky)"), always()),
        ("other", other, Signal::derive(move || sun_key(&rad.last_sun.get()) == "other")),
    ];
    let choose = move |v: &str| {
        let spec = match v {
            "am1.5g" => SourceSpec::Am15g,
            "am1.5d" => SourceSpec::Am15d,
            "am0" => SourceSpec::Am0,
            "place" => SourceSpec::ClearSky(ctx.place.get_untracked()),
            _ => return,
        };
        rad.last_sun.set(spec.clone());
        if on.get_untracked() {
            ctx.edit(Control::SunSpectrum, move |s| s.radiator.sun = Some(spec));
        }
    };
    let zenith = field(
        ctx,
        "Sun's zenith angle",
        "°",
        Control::SunZenith,
        "0 (overhead) to below 90°: the direction the surface's absorptance is read in (no effect on a Lambertian surface).".into(),
        "30",
        |s| s.radiator.sun_zenith_deg,
        |s, v| s.radiator.sun_zenith_deg = v,
    );
    let scale = field(
        ctx,
        "Irradiance scale",
        "×",
        Control::SunScale,
        format!(
            "{} to {} times the tabulated spectrum (1000 W/m² for AM1.5G at 1).",
            SUN_SCALE_RANGE.0, SUN_SCALE_RANGE.1
        ),
        "1",
        |s| s.radiator.sun_scale,
        |s, v| s.radiator.sun_scale = v,
    );
    view! {
        <section class="panel-section" aria-labelledby="sun-h">
            <h2 id="sun-h">"Sun"</h2>
            <label class="check">
                <input type="checkbox" data-control="sun" prop:checked=move || on.get() on:change=on_toggle />
                "Sunlit (off: night)"
            </label>
            {error_line(ctx, Control::Sun)}
            <div class="sun-fields" hidden=move || !on.get()>
                <div class="field">
                    {select(Control::SunSpectrum, "Sun's spectrum", key, options, choose)}
                    {error_line(ctx, Control::SunSpectrum)}
                </div>
                <div class="sub-field" hidden=move || key.get() != "place">{place_controls(place)}</div>
                {zenith}
                {scale}
                <p class="safety">"Sunlit surfaces, dark ones above all, can get hot enough to burn. Take care on roofs and defer to local codes and licensed practice."</p>
            </div>
        </section>
    }
}

/// The surface: presets, measured data, control points.
pub fn surface_section(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let current = Memo::new(move |_| ctx.scenario.with(|s| preset_of(&s.radiator.emitter)));
    let is_measured = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Table(_))));
    let use_preset = move |hook: &'static str| {
        if let Some(spec) = preset(hook) {
            if ctx.edit(Control::EmissivityPreset, move |s| s.radiator.emitter = spec) {
                rad.selected.set(None);
                ctx.clear_error(super::editor::HOOK);
            }
        }
    };
    let chips = PRESETS
        .iter()
        .map(|(hook, text, about)| {
            let hook = *hook;
            view! {
                <button
                    type="button"
                    class="chip"
                    data-preset=hook
                    title=*about
                    aria-pressed=move || if current.get() == Some(hook) { "true" } else { "false" }
                    on:click=move |_| use_preset(hook)
                >
                    <span class="chip-name">{*text}</span>
                </button>
            }
        })
        .collect_view();
    let measured = move || {
        rad.user_emissivity.get().map(|t| {
            let label = format!("Measured: {}", t.name);
            view! {
                <button
                    type="button"
                    class="chip"
                    data-preset="measured"
                    title=format!("your measured profile, {} points", t.wavelength_m.len())
                    aria-pressed=move || if is_measured.get() { "true" } else { "false" }
                    on:click=move |_| {
                        let spec = EmitterSpec::Table(t.clone());
                        ctx.edit(Control::EmissivityPreset, move |s| s.radiator.emitter = spec);
                    }
                >
                    <span class="chip-name">{label}</span>
                </button>
            }
        })
    };
    let is_grey = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Grey { .. })));
    let grey = field(
        ctx,
        "Grey emissivity",
        "",
        Control::GreyEmissivity,
        "A fraction from 0 to 1, the same at every wavelength.".into(),
        "0.9",
        |s| match s.radiator.emitter {
            EmitterSpec::Grey { emissivity } => emissivity,
            _ => f64::NAN,
        },
        |s, v| s.radiator.emitter = EmitterSpec::Grey { emissivity: v },
    );
    let extras = move || {
        ctx.scenario.with(|s| {
            let r = &s.radiator;
            let mut notes = Vec::new();
            if let Some(b) = &r.solar_band {
                notes.push(format!(
                    "Below {} µm a separate solar-band profile applies ({}); the editor reshapes the profile above it.",
                    fmt::field(b.below_um, 4),
                    b.profile.label()
                ));
            }
            if let AngularSpec::CutOff { angle_deg, beyond } = r.angular {
                notes.push(format!(
                    "Angular cut-off from the link: the emissivity drops to {} beyond {}° from the normal.",
                    fmt::field(beyond, 3),
                    fmt::field(angle_deg, 4)
                ));
            }
            notes.join(" ")
        })
    };
    let is_film = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Film { .. })));
    let has_band = Memo::new(move |_| ctx.scenario.with(|s| s.radiator.solar_band.is_some()));
    let file_hint = view! {
        <p class="hint" id="h-emissivity-file">
            "Emissivity, absorptance or reflectance (taken as 1 − R) against wavelength (nm, µm) or wavenumber (cm⁻¹), e.g. "
            <code>"wavelength_um,emissivity"</code> "; % columns are read as percent."
        </p>
    };
    let drop = drop_zone(
        "emissivity-file",
        ".csv,.tsv,.txt,.dat,text/csv,text/plain",
        "e-emissivity-file h-emissivity-file",
        "Load measured data…",
        file_hint.into_any(),
        Rc::new(move |f| open_emissivity(ctx, rad, f)),
    );
    view! {
        <section class="panel-section" aria-labelledby="surface-h">
            <h2 id="surface-h">"Surface"</h2>
            {super::layers::emitter_switch(rad)}
            <p class="hint" hidden=move || !is_film.get()>"The emissivity comes from the layer stack: edit its layers in the “Layer stack” card beside the plots."</p>
            <div class="profile-controls" hidden=move || is_film.get()>
            <div class="presets" role="group" aria-labelledby="rad-presets-h">
                <p id="rad-presets-h" class="presets-title">"Start from " <span class="muted">"(illustrative shapes of our own, not products)"</span></p>
                <div class="chips">{chips}{measured}</div>
            </div>
            {error_line(ctx, Control::EmissivityPreset)}
            <div class="sub-field" hidden=move || !is_grey.get()>{grey}</div>
            <p class="hint" hidden=move || extras().is_empty()>{extras}</p>
            <button type="button" class="small" data-action="drop-solar-band" hidden=move || !has_band.get() on:click=move |_| { ctx.edit(Control::EmissivityPreset, |s| s.radiator.solar_band = None); }>
                "Use one profile at all wavelengths"
            </button>
            {drop}
            {error_line(ctx, Control::EmissivityFile)}
            </div>
        </section>
    }
}
