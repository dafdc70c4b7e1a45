//! The settings of a real absorber (silicon): thickness in um (a field and a slider on a
//! logarithmic scale), light trapping, doping type and doping. The Solar cell tab uses them
//! for its absorber, the Stack tab for its bottom cell; each passes where the absorber lives
//! in the scenario and how an edit is committed.

use std::rc::Rc;

use leptos::ev;
use leptos::prelude::*;

use super::fields::{number_field, Field};
use crate::app::state::{mark, Ctx};
use crate::scenario::real::{DopingType, RealAbsorberSpec};
use crate::scenario::Scenario;
use crate::view::cell::real::TRAPPING_CHOICES;
use crate::view::controls::Control;
use crate::view::format::{self as fmt, round_sig};
use crate::view::input::parse_number;

/// The slider's range [um] (any value in the scenario's range can be typed).
pub const SLIDER_UM: (f64, f64) = (1.0, 1000.0);

/// Where a real absorber's settings live and how they are committed.
#[derive(Clone, Copy)]
pub struct RealHooks {
    /// `data-control` prefix of the radios and slider, e.g. "si" or "bottom"
    pub prefix: &'static str,
    pub thickness: Control,
    pub trapping: Control,
    pub doping: Control,
    /// the absorber in the scenario (None while another choice is in use)
    pub get: fn(&Scenario) -> Option<RealAbsorberSpec>,
}

fn parse_um(t: &str) -> Result<f64, String> {
    let s = t.trim();
    let s = s.strip_suffix("um").or_else(|| s.strip_suffix("µm")).unwrap_or(s);
    parse_number(s).ok_or_else(|| format!("'{}' is not a thickness; type a number of µm, e.g. 110", t.trim()))
}

fn parse_doping(t: &str) -> Result<f64, String> {
    let s = t.trim();
    let s = s.strip_suffix("cm-3").or_else(|| s.strip_suffix("cm⁻³")).unwrap_or(s);
    parse_number(s).ok_or_else(|| {
        format!("'{}' is not a doping density; type a number of cm⁻³ such as 1e16, or 0 for undoped", t.trim())
    })
}

/// The four settings of the absorber `hooks.get` finds; `commit(hook, spec)` tries an edit
/// and returns whether it was taken.
pub fn real_fields(ctx: Ctx, h: RealHooks, commit: Rc<dyn Fn(Control, RealAbsorberSpec) -> bool>) -> impl IntoView {
    let get = h.get;
    let spec = Memo::new(move |_| ctx.scenario.with(get));
    let current = move || spec.get_untracked();
    let with = move |hook: Control, f: &dyn Fn(&mut RealAbsorberSpec)| -> bool {
        match current() {
            Some(mut r) => {
                f(&mut r);
                commit(hook, r)
            }
            None => false,
        }
    };
    let with = Rc::new(with);

    let w = with.clone();
    let thickness_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |t| w(h.thickness, &|r| r.thickness_um = t));
    let thickness = number_field(
        ctx,
        Field {
            label: "Thickness",
            unit: "µm",
            hook: h.thickness,
            hint: Some(format!(
                "The slider runs from {} to {} µm; type any thickness from {} to {} µm.",
                SLIDER_UM.0,
                SLIDER_UM.1,
                crate::scenario::real::THICKNESS_RANGE_UM.0,
                fmt::field(crate::scenario::real::THICKNESS_RANGE_UM.1, 6)
            )),
            example: "110",
            value: Memo::new(move |_| spec.with(|s| s.as_ref().map_or(110.0, |s| s.thickness_um))),
            show: |v| fmt::field(v, 6),
            parse: parse_um,
        },
        thickness_commit.clone(),
        None,
    );
    let (lo, hi) = SLIDER_UM;
    let slide = thickness_commit.clone();
    let on_slider = move |ev: ev::Event| {
        if let Some(v) = parse_number(&event_target_value(&ev)) {
            mark("gg-edit");
            slide(round_sig(10f64.powf(v), 3).clamp(lo, hi));
        }
    };
    let now_um = move || spec.with(|s| s.as_ref().map_or(110.0, |s| s.thickness_um));
    let slider = view! {
        <div class="slider-row">
            <span class="slider-end" aria-hidden="true">{format!("{lo} µm")}</span>
            <input
                type="range"
                min=format!("{:.4}", lo.log10())
                max=format!("{:.4}", hi.log10())
                step="0.005"
                data-control=format!("{}-thickness-slider", h.prefix)
                aria-label="Thickness, logarithmic scale"
                aria-valuetext=move || format!("{} µm", fmt::field(now_um(), 6))
                prop:value=move || format!("{:.4}", now_um().clamp(lo, hi).log10())
                on:input=on_slider
            />
            <span class="slider-end" aria-hidden="true">{format!("{hi} µm")}</span>
        </div>
    };

    let trapping_now = move || spec.with(|s| s.as_ref().map(|s| s.trapping));
    let trap_radios = TRAPPING_CHOICES
        .iter()
        .map(|&(t, slug, words)| {
            let w = with.clone();
            view! {
                <label>
                    <input type="radio" name=format!("{}-trapping", h.prefix) data-control=format!("{}-trapping-{slug}", h.prefix)
                        prop:checked=move || trapping_now() == Some(t)
                        on:change=move |_| { w(h.trapping, &|r| r.trapping = t); } />
                    {words}
                </label>
            }
        })
        .collect_view();

    let type_now = move || spec.with(|s| s.as_ref().map(|s| s.doping_type));
    let type_radios = [(DopingType::N, "n", "n-type"), (DopingType::P, "p", "p-type")]
        .into_iter()
        .map(|(t, slug, words)| {
            let w = with.clone();
            view! {
                <label>
                    <input type="radio" name=format!("{}-doping-type", h.prefix) data-control=format!("{}-doping-{slug}", h.prefix)
                        prop:checked=move || type_now() == Some(t)
                        on:change=move |_| { w(h.doping, &|r| r.doping_type = t); } />
                    {words}
                </label>
            }
        })
        .collect_view();
    let w = with.clone();
    let doping = number_field(
        ctx,
        Field {
            label: "Doping",
            unit: "cm⁻³",
            hook: h.doping,
            hint: Some("0 for undoped, up to 1e20 cm⁻³; the type sets which carrier it adds.".into()),
            example: "0",
            value: Memo::new(move |_| spec.with(|s| s.as_ref().map_or(0.0, |s| s.doping_cm3))),
            show: |v| if v == 0.0 { "0".into() } else { fmt::sig(v, 4) },
            parse: parse_doping,
        },
        Rc::new(move |d| w(h.doping, &|r| r.doping_cm3 = d)),
        None,
    );
    let trap_error = move || ctx.error_of(h.trapping);
    view! {
        <div class="real-fields">
            {thickness}
            {slider}
            <fieldset class="choice">
                <legend>"Light trapping"</legend>
                {trap_radios}
                <p class="field-error" data-error=h.trapping.as_str() aria-live="polite">{trap_error}</p>
            </fieldset>
            <fieldset class="choice choice-row">
                <legend>"Doping type"</legend>
                {type_radios}
            </fieldset>
            {doping}
        </div>
    }
}
