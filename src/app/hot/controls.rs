//! The settings of the hot-emitter panel's three cards. Numeric fields are the shared ones
//! (they commit usable values as the user types and otherwise say next to themselves what
//! is wrong, keeping the last good value in use); text forms (the emitter profile, the
//! gaps) do the same with their own readers.

use std::rc::Rc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use crate::app::hot::state::HotState;
use crate::app::state::{mark, sentence, Ctx};
use crate::app::widgets::fields::{number_field, plain_parse, Field};
use crate::app::widgets::place::{place_controls, PlaceUi};
use crate::physics::constants::MAX_CONCENTRATION;
use crate::scenario::hot::{
    ReflectanceSpec, SurfaceSpec, ABSORBER_TEMP_RANGE_K, BLACKBODY_TEMP_RANGE_K, EMITTER_TEMP_RANGE_K, HC_RANGE,
};
use crate::scenario::radiator::EmitterSpec;
use crate::scenario::{Connection, Scenario, SourceSpec, CELL_TEMP_RANGE_K};
use crate::view::controls::Control;
use crate::view::format as fmt;
use crate::view::hot::{emitter_text, gaps_text, parse_gaps};
use crate::view::input::{parse_number, thousands};

/// A numeric field of the scenario: `get` reads it, `set` writes a typed value.
#[allow(clippy::too_many_arguments)]
fn num(
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
        Field {
            label,
            unit,
            hook,
            hint: Some(hint),
            example,
            value,
            show: |v| if v.is_finite() { fmt::field(v, 6) } else { String::new() },
            parse: plain_parse,
        },
        Rc::new(move |v| {
            mark("gg-edit");
            let ok = ctx.edit(hook, |s| set(s, v));
            // the band's two ends are checked together: a good edit of one clears both
            if ok && matches!(hook, Control::HotBand | Control::HotBandTo) {
                ctx.clear_error(Control::HotBand);
                ctx.clear_error(Control::HotBandTo);
            }
            ok
        }),
        None,
    )
}

fn error_line(ctx: Ctx, hook: Control) -> impl IntoView {
    view! { <p class="field-error" id=format!("e-{hook}") data-error=hook.as_str() aria-live="polite">{move || ctx.error_of(hook)}</p> }
}

/// Reads a text form and commits it: whether it was taken, or why the text is unusable.
type Commit = Rc<dyn Fn(&str) -> Result<bool, String>>;

/// A text field read by `parse` and committed by `commit` (which returns whether the value
/// was taken); follows the scenario's `get` while the user is not typing in it.
fn text_field(
    ctx: Ctx,
    label: &'static str,
    hook: Control,
    hint: &'static str,
    get: fn(&Scenario) -> String,
    commit: Commit,
) -> impl IntoView {
    let node = NodeRef::<html::Input>::new();
    let current = Memo::new(move |_| ctx.scenario.with(get));
    Effect::new(move |_| {
        let t = current.get();
        if let Some(el) = node.get() {
            if !el.matches(":focus").unwrap_or(false) {
                el.set_value(&t);
            }
        }
    });
    let on_input = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match commit(&text) {
            Ok(true) => {}
            Ok(false) => ctx.errors.update(|e| {
                if let Some(m) = e.get_mut(&hook) {
                    if !m.contains("Still using") {
                        m.push_str(&format!(" Still using {}.", current.get_untracked()));
                    }
                }
            }),
            Err(msg) => ctx.set_error(hook, format!("{} Still using {}.", sentence(&msg), current.get_untracked())),
        }
    };
    let on_change = move |_| {
        if let Some(el) = node.get_untracked() {
            if ctx.error_of(hook).is_none() {
                el.set_value(&current.get_untracked());
            }
        }
    };
    let id = format!("f-{hook}");
    view! {
        <div class="field" class:has-error=move || ctx.error_of(hook).is_some()>
            <label for=id.clone()>{label}</label>
            <div class="input-unit">
                <input id=id type="text" autocomplete="off" spellcheck="false" data-control=hook.as_str() node_ref=node
                    value=current.get_untracked() on:input=on_input on:change=on_change
                    aria-describedby=format!("h-{hook} e-{hook}")
                    aria-invalid=move || if ctx.error_of(hook).is_some() { "true" } else { "false" } />
            </div>
            <p class="hint" id=format!("h-{hook}")>{hint}</p>
            {error_line(ctx, hook)}
        </div>
    }
}

/// A <select> of (value, text); `choose` commits a value. Shows what `current` holds.
fn select(
    ctx: Ctx,
    hook: Control,
    label: &'static str,
    current: Memo<&'static str>,
    options: &'static [(&'static str, &'static str)],
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
        .iter()
        .map(|&(v, text)| view! { <option value=v prop:selected=move || current.get() == v>{text}</option> })
        .collect_view();
    view! {
        <div class="field">
            <label for=id.clone()>{label}</label>
            <select id=id data-control=hook.as_str() node_ref=node on:change=on_change aria-describedby=format!("e-{hook}")>{opts}</select>
            {error_line(ctx, hook)}
        </div>
    }
}

/// A temperature slider on a logarithmic scale over [lo, hi] K, in whole kelvin. While it is
/// held (pointer down) the panel draws the trade-off from fewer gaps.
fn temp_slider(
    hot: HotState,
    hook: Control,
    control: &'static str,
    aria: &'static str,
    (lo, hi): (f64, f64),
    get: fn(&Scenario) -> f64,
    set: fn(&mut Scenario, f64),
) -> impl IntoView {
    let ctx = hot.ctx;
    let value = Memo::new(move |_| ctx.scenario.with(get));
    let on_input = move |ev: ev::Event| {
        if let Some(v) = parse_number(&event_target_value(&ev)) {
            mark("gg-edit");
            let t = 10f64.powf(v).round().clamp(lo, hi);
            ctx.edit(hook, |s| set(s, t));
        }
    };
    let release = move || {
        if hot.coarse.get_untracked() {
            hot.coarse.set(false);
        }
    };
    view! {
        <div class="slider-row">
            <span class="slider-end" aria-hidden="true">{format!("{lo:.0} K")}</span>
            <input
                type="range"
                min=format!("{:.5}", lo.log10())
                max=format!("{:.5}", hi.log10())
                step="0.0005"
                data-control=control
                aria-label=aria
                aria-valuetext=move || format!("{} K", fmt::field(value.get(), 6))
                prop:value=move || format!("{:.5}", value.get().clamp(lo, hi).log10())
                on:pointerdown=move |_| hot.coarse.set(true)
                on:pointerup=move |_| release()
                on:change=move |_| release()
                on:input=on_input
            />
            <span class="slider-end" aria-hidden="true">{format!("{} K", thousands(hi))}</span>
        </div>
    }
}

fn check(
    ctx: Ctx,
    hook: Control,
    control: &'static str,
    text: &'static str,
    get: fn(&Scenario) -> bool,
    set: fn(&mut Scenario, bool),
) -> impl IntoView {
    let on = Memo::new(move |_| ctx.scenario.with(get));
    view! {
        <label class="check">
            <input type="checkbox" data-control=control prop:checked=move || on.get()
                on:change=move |ev| { ctx.edit(hook, |s| set(s, event_target_checked(&ev))); } />
            {text}
        </label>
    }
}

/// The blackbody card's settings.
pub fn blackbody_controls(hot: HotState) -> impl IntoView {
    let ctx = hot.ctx;
    let temp = num(
        ctx,
        "Temperature",
        "K",
        Control::HotBlackbodyTemp,
        format!(
            "The slider runs from 300 to 6,000 K; type any value from {} to {} K.",
            BLACKBODY_TEMP_RANGE_K.0,
            thousands(BLACKBODY_TEMP_RANGE_K.1)
        ),
        "1500",
        |s| s.hot.blackbody.temp_k,
        |s, v| s.hot.blackbody.temp_k = v,
    );
    let slider = temp_slider(
        hot,
        Control::HotBlackbodyTemp,
        "hot-bb-temp-slider",
        "Blackbody temperature, logarithmic scale",
        (300.0, 6000.0),
        |s| s.hot.blackbody.temp_k,
        |s, v| s.hot.blackbody.temp_k = v,
    );
    let band_from = num(
        ctx,
        "Band from",
        "µm",
        Control::HotBand,
        "Shorter wavelength of the band.".into(),
        "1",
        |s| s.hot.blackbody.band_um.map_or(f64::NAN, |b| b[0]),
        |s, v| {
            let to = s.hot.blackbody.band_um.map_or(v * 3.0, |b| b[1]);
            s.hot.blackbody.band_um = Some([v, to]);
        },
    );
    let band_to = num(
        ctx,
        "to",
        "µm",
        Control::HotBandTo,
        "Longer wavelength; or drag across the plot.".into(),
        "3",
        |s| s.hot.blackbody.band_um.map_or(f64::NAN, |b| b[1]),
        |s, v| {
            let from = s.hot.blackbody.band_um.map_or(v / 3.0, |b| b[0]);
            s.hot.blackbody.band_um = Some([from, v]);
        },
    );
    let has_band = Memo::new(move |_| ctx.scenario.with(|s| s.hot.blackbody.band_um.is_some()));
    view! {
        <div class="hot-temp">{temp}{slider}</div>
        <div class="gap-pair band-pair">{band_from}{band_to}</div>
        <button type="button" class="small" data-action="clear-band" disabled=move || !has_band.get()
            on:click=move |_| { ctx.edit(Control::HotBand, |s| s.hot.blackbody.band_um = None); }>
            "No band"
        </button>
        <fieldset class="choice">
            <legend>"Curves beside Planck's law"</legend>
            {check(ctx, Control::HotAxes, "hot-wien", "Wien's approximation", |s| s.hot.blackbody.wien, |s, v| s.hot.blackbody.wien = v)}
            {check(ctx, Control::HotAxes, "hot-rj", "Rayleigh-Jeans approximation", |s| s.hot.blackbody.rayleigh_jeans, |s, v| s.hot.blackbody.rayleigh_jeans = v)}
        </fieldset>
        {error_line(ctx, Control::HotAxes)}
    }
}

const CONNECTIONS: &[(&str, &str)] =
    &[("series", "series (one current)"), ("independent", "independent (own terminals)")];

/// The TPV card's settings.
pub fn tpv_controls(hot: HotState) -> impl IntoView {
    let ctx = hot.ctx;
    let emitter = text_field(
        ctx,
        "Emitter emissivity",
        Control::TpvEmitter,
        "blackbody, grey:0.8, window:0.5-1.8 (µm; add ,out=0.05 or ,edge=0.1) or points:1=0.9,2=0.9,2.5=0.1 (µm=emissivity)",
        |s| emitter_text(&s.hot.tpv.emitter),
        Rc::new(move |t: &str| {
            let spec = EmitterSpec::parse(t)?;
            if matches!(spec, EmitterSpec::File { .. }) {
                return Err("the page cannot read files by path; type the profile instead, e.g. grey:0.8".into());
            }
            Ok(ctx.edit(Control::TpvEmitter, |s| s.hot.tpv.emitter = spec))
        }),
    );
    let te = num(
        ctx,
        "Emitter temperature",
        "K",
        Control::TpvEmitterTemp,
        format!("Above the cell's, at most {} K.", thousands(EMITTER_TEMP_RANGE_K.1)),
        "2000",
        |s| s.hot.tpv.emitter_temp_k,
        |s, v| s.hot.tpv.emitter_temp_k = v,
    );
    let te_slider = temp_slider(
        hot,
        Control::TpvEmitterTemp,
        "tpv-emitter-temp-slider",
        "Emitter temperature, logarithmic scale",
        (500.0, 4000.0),
        |s| s.hot.tpv.emitter_temp_k,
        |s, v| s.hot.tpv.emitter_temp_k = v,
    );
    let vf = num(
        ctx,
        "View factor emitter → cell",
        "",
        Control::TpvViewFactor,
        "Above 0, at most 1 (1: close parallel plates).".into(),
        "1",
        |s| s.hot.tpv.view_factor,
        |s, v| s.hot.tpv.view_factor = v,
    );
    let gaps = text_field(
        ctx,
        "Band gap(s), eV",
        Control::TpvGaps,
        "One gap, e.g. 0.75, or a stack's gaps top first, e.g. 1.4, 0.75.",
        |s| gaps_text(&s.hot.tpv.gaps_ev),
        Rc::new(move |t: &str| {
            let g = parse_gaps(t)?;
            mark("gg-edit");
            Ok(ctx.edit(Control::TpvGaps, |s| s.hot.tpv.gaps_ev = g))
        }),
    );
    let conn_key = Memo::new(move |_| {
        ctx.scenario.with(|s| if s.hot.tpv.connection == Connection::Series { "series" } else { "independent" })
    });
    let conn = select(ctx, Control::TpvConnection, "Stack connection", conn_key, CONNECTIONS, move |v| {
        let c = if v == "series" { Connection::Series } else { Connection::Independent };
        ctx.edit(Control::TpvConnection, |s| s.hot.tpv.connection = c);
    });
    let ere = num(
        ctx,
        "External radiative efficiency (ERE)",
        "",
        Control::TpvEre,
        "Above 0, at most 1 (1: the radiative limit).".into(),
        "1",
        |s| s.hot.tpv.ere,
        |s, v| s.hot.tpv.ere = v,
    );
    let tc = num(
        ctx,
        "Cell temperature",
        "K",
        Control::TpvCellTemp,
        format!("{} to {} K.", CELL_TEMP_RANGE_K.0, CELL_TEMP_RANGE_K.1),
        "300",
        |s| s.hot.tpv.cell_temp_k,
        |s, v| s.hot.tpv.cell_temp_k = v,
    );
    let r = num(
        ctx,
        "Sub-gap reflectance of the cell",
        "",
        Control::TpvSubgapReflectance,
        "0 to 1; photons below the gap that the cell sends back to the emitter (1: all).".into(),
        "0.95",
        |s| match s.hot.tpv.subgap_reflectance {
            ReflectanceSpec::Constant { value } => value,
            _ => f64::NAN,
        },
        |s, v| s.hot.tpv.subgap_reflectance = ReflectanceSpec::Constant { value: v },
    );
    view! {
        {emitter}
        <div class="hot-temp">{te}{te_slider}</div>
        {vf}
        {gaps}
        {conn}
        {ere}
        {tc}
        {r}
    }
}

const SOURCES: &[(&str, &str)] = &[
    ("am1.5d", "AM1.5D (direct beam)"),
    ("am1.5g", "AM1.5G (global tilt)"),
    ("am0", "AM0 (outside the air)"),
    ("blackbody", "Blackbody sun"),
    ("place", "Place and time (clear sky)"),
];

const SURFACES: &[(&str, &str)] =
    &[("black", "Black"), ("step", "Step at a cutoff wavelength"), ("profile", "Emissivity profile")];

fn surface_key(s: &SurfaceSpec) -> &'static str {
    match s {
        SurfaceSpec::Black => "black",
        SurfaceSpec::Step { .. } => "step",
        SurfaceSpec::Profile { .. } => "profile",
    }
}

/// The solar-thermal card's settings.
pub fn absorber_controls(hot: HotState) -> impl IntoView {
    let ctx = hot.ctx;
    let key = Memo::new(move |_| ctx.scenario.with(|s| surface_key(&s.hot.absorber.surface)));
    let surface = select(ctx, Control::AbsSurface, "Surface", key, SURFACES, move |v| {
        let spec = match v {
            "black" => SurfaceSpec::Black,
            "step" => SurfaceSpec::Step { cutoff_um: 2.0 },
            _ => SurfaceSpec::Profile {
                profile: EmitterSpec::Window { from_um: 0.2, to_um: 2.0, inside: 0.95, outside: 0.05, edge_um: 0.0 },
            },
        };
        ctx.edit(Control::AbsSurface, |s| s.hot.absorber.surface = spec);
    });
    let cutoff = num(
        ctx,
        "Cutoff wavelength",
        "µm",
        Control::AbsCutoff,
        "Absorbs (and emits) below it, reflects above.".into(),
        "2",
        |s| match s.hot.absorber.surface {
            SurfaceSpec::Step { cutoff_um } => cutoff_um,
            _ => f64::NAN,
        },
        |s, v| s.hot.absorber.surface = SurfaceSpec::Step { cutoff_um: v },
    );
    let profile = text_field(
        ctx,
        "Absorptance profile",
        Control::AbsProfile,
        "The emitter forms, e.g. window:0.3-2,out=0.05 (µm) or points:0.3=0.95,2=0.95,3=0.05.",
        |s| match &s.hot.absorber.surface {
            SurfaceSpec::Profile { profile } => emitter_text(profile),
            _ => String::new(),
        },
        Rc::new(move |t: &str| {
            let spec = EmitterSpec::parse(t)?;
            if matches!(spec, EmitterSpec::File { .. }) {
                return Err("the page cannot read files by path; type the profile instead".into());
            }
            Ok(ctx.edit(Control::AbsProfile, |s| s.hot.absorber.surface = SurfaceSpec::Profile { profile: spec }))
        }),
    );
    let temp = num(
        ctx,
        "Absorber temperature",
        "K",
        Control::AbsTemp,
        format!("{} to {} K.", ABSORBER_TEMP_RANGE_K.0, thousands(ABSORBER_TEMP_RANGE_K.1)),
        "700",
        |s| s.hot.absorber.temp_k,
        |s, v| s.hot.absorber.temp_k = v,
    );
    let conc = num(
        ctx,
        "Concentration",
        "suns",
        Control::AbsConcentration,
        format!("Up to {} suns, the limit for light from the sun's disc.", thousands(MAX_CONCENTRATION)),
        "100",
        |s| s.hot.absorber.concentration,
        |s, v| s.hot.absorber.concentration = v,
    );
    let src_key = Memo::new(move |_| {
        ctx.scenario.with(|s| match s.hot.absorber.source {
            SourceSpec::Am15d => "am1.5d",
            SourceSpec::Am15g => "am1.5g",
            SourceSpec::Am0 => "am0",
            SourceSpec::ClearSky(_) => "place",
            _ => "blackbody",
        })
    });
    let source = select(ctx, Control::AbsSource, "Sunlight", src_key, SOURCES, move |v| {
        let spec = match v {
            "am1.5d" => SourceSpec::Am15d,
            "am1.5g" => SourceSpec::Am15g,
            "am0" => SourceSpec::Am0,
            "place" => SourceSpec::ClearSky(ctx.place.get_untracked()),
            _ => SourceSpec::Blackbody { temp_k: crate::physics::constants::SUN_EFFECTIVE_TEMPERATURE },
        };
        ctx.edit(Control::AbsSource, |s| s.hot.absorber.source = spec);
    });
    let is_bb = Memo::new(move |_| src_key.get() == "blackbody");
    let sun_t = num(
        ctx,
        "Sun temperature",
        "K",
        Control::AbsSunTemp,
        "A blackbody sun seen from 1 au, e.g. 5772 K.".into(),
        "5772",
        |s| match s.hot.absorber.source {
            SourceSpec::Blackbody { temp_k } => temp_k,
            _ => f64::NAN,
        },
        |s, v| s.hot.absorber.source = SourceSpec::Blackbody { temp_k: v },
    );
    let ambient = num(
        ctx,
        "Ambient temperature",
        "K",
        Control::AbsAmbient,
        "The surroundings and the sky the absorber sees; also the cold end for work.".into(),
        "300",
        |s| s.hot.absorber.ambient_k,
        |s, v| s.hot.absorber.ambient_k = v,
    );
    let hc = num(
        ctx,
        "Convection coefficient h_c",
        "W/m²K",
        Control::AbsHc,
        format!("{} to {} W/m²K; 0 for a surface in vacuum.", HC_RANGE.0, thousands(HC_RANGE.1)),
        "0",
        |s| s.hot.absorber.hc_w_m2k,
        |s, v| s.hot.absorber.hc_w_m2k = v,
    );
    let warnings = move || {
        hot.abs.with(|a| {
            a.as_ref().map(|a| a.warnings.iter().map(|w| sentence(w)).collect::<Vec<_>>().join(" ")).unwrap_or_default()
        })
    };
    view! {
        {surface}
        <div hidden=move || key.get() != "step">{cutoff}</div>
        <div hidden=move || key.get() != "profile">{profile}</div>
        {temp}
        <div class="conc">
            {conc}
            <button type="button" class="small" data-action="abs-max-concentration"
                title=format!("Set the limit for light from the sun's disc, {} suns", thousands(MAX_CONCENTRATION))
                on:click=move |_| { ctx.edit(Control::AbsConcentration, |s| s.hot.absorber.concentration = MAX_CONCENTRATION); }>
                "Max"
            </button>
        </div>
        {source}
        <div hidden=move || !is_bb.get()>{sun_t}</div>
        <div class="sub-field" hidden=move || src_key.get() != "place">{place_controls(PlaceUi::new(ctx, crate::view::place::ABSORBER_SUN))}</div>
        {ambient}
        {hc}
        <p class="warning" hidden=move || warnings().is_empty()>{warnings}</p>
    }
}
