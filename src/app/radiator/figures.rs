//! The radiator's headline figures (formatted by [`crate::report::radiator`], as the
//! command line prints them), the parts of the balance, warnings, and the cautions.

use leptos::prelude::*;

use crate::app::radiator::state::RadiatorState;
use crate::app::widgets::notices::caution_footer;
use crate::report::radiator::RadiatorMetric;

pub fn figures(rad: RadiatorState) -> impl IntoView {
    let text = move |m: RadiatorMetric| {
        move || rad.computed.with(|c| c.as_ref().map(|c| c.report.display(m)).unwrap_or_else(|| "—".into()))
    };
    let label = move |m: RadiatorMetric, base: &'static str| {
        move || {
            let t = rad.computed.with(|c| c.as_ref().map(|c| c.report.surface_temp_k));
            match (m, t) {
                (RadiatorMetric::ThermalEmittance | RadiatorMetric::WindowEmissivity, Some(t)) => {
                    format!("{} ({t:.0}\u{a0}K)", base.replace("8-13 um", "8–13 µm"))
                }
                _ => base.to_string(),
            }
        }
    };
    let cards = RadiatorMetric::HEADLINE
        .into_iter()
        .map(|m| {
            let (hook, base) = (m.as_str(), m.label());
            let note = (m == RadiatorMetric::SteadyTemp).then(|| {
                view! { <span class="fig-note" data-note="steady-temp">{move || rad.computed.with(|c| c.as_ref().map(|c| c.report.steady_note()))}</span> }
            });
            view! {
                <div class="figure" class:lead=m == RadiatorMetric::NetPower>
                    <span class="fig-label">{label(m, base)}</span>
                    <span class="fig-value" data-metric=hook>{text(m)}</span>
                    {note}
                </div>
            }
        })
        .collect_view();
    let parts = RadiatorMetric::PARTS
        .into_iter()
        .map(|m| {
            view! {
                <span class="part"><span class="part-label">{m.label()}</span> <span class="part-value" data-metric=m.as_str()>{text(m)}</span></span>
            }
        })
        .collect_view();
    let warnings = move || {
        rad.computed.with(|c| {
            c.as_ref()
                .map(|c| c.warnings.iter().map(|w| crate::app::state::sentence(w)).collect::<Vec<_>>().join(" "))
                .unwrap_or_default()
        })
    };
    let error = move || rad.compute_error.get();
    let at = move || {
        rad.computed.with(|c| {
            c.as_ref().map(|c| {
                let r = &c.report;
                let sun = if c.scenario.sun.is_some() { "in sunlight" } else { "at night" };
                format!("Balance at a surface temperature of {} under ambient air at {}, {sun}; P_net > 0 means the surface loses heat.", r.display(RadiatorMetric::SurfaceTemp), r.display(RadiatorMetric::AmbientTemp))
            })
        })
    };
    view! {
        <section class="figures-block rad-figures" aria-labelledby="rad-fig-h">
            <h2 id="rad-fig-h" class="visually-hidden">"Radiator figures"</h2>
            <div class="figures">{cards}</div>
            <p class="parts" aria-label="Parts of the balance">{parts}</p>
            <p class="summary">{at}</p>
            <p class="warning" hidden=move || warnings().is_empty()>{warnings}</p>
            <p class="compute-error" role="alert" hidden=move || error().is_none()>{error}</p>
            <p class="caution-inline">
                "An idealized radiative balance of an opaque surface: a limit for this profile and sky, not a prediction of how a real coating will perform."
            </p>
        </section>
    }
}

pub fn cautions() -> impl IntoView {
    caution_footer(&[
        (
            "Idealized balance, not a product rating. ",
            "The figures assume an opaque surface with exactly this emissivity, a uniform sky and a single convection coefficient. Real coatings age, soil and differ from their data sheets; test before relying on them.",
        ),
        (
            "Hot surfaces and roof work. ",
            "Surfaces in sunlight, dark ones above all, can get hot enough to burn skin. Working on roofs risks falls: use fall protection, and defer to local codes and licensed practice for anything installed.",
        ),
    ])
}
