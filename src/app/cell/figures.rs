//! The headline figures, the notices across the top, and the cautions.

use leptos::prelude::*;

use super::state::CellState;
use crate::app::widgets::notices::caution_footer;
use crate::report::CellMetric;
use crate::view::cell::real::{doping_words, trapping_words};
use crate::view::format::{fixed, gap_ev};
use crate::view::input::ev_of_nm;

pub fn figures(cs: CellState) -> impl IntoView {
    let cards = CellMetric::HEADLINE
        .into_iter()
        .map(|m| {
            // a real absorber's own figures replace the ideal step's
            let text = move || {
                cs.real.with(|r| match r {
                    Some(r) => r.report.cell.display(m),
                    None => cs.computed.with(|c| c.as_ref().map(|c| c.report.display(m)).unwrap_or_else(|| "—".into())),
                })
            };
            view! {
                <div class="figure" class:lead=m == CellMetric::Efficiency>
                    <span class="fig-label">{m.label()}</span>
                    <span class="fig-value" data-metric=m.as_str()>{text}</span>
                </div>
            }
        })
        .collect_view();
    let summary = move || {
        if let Some(r) = cs.real.get() {
            return cs.computed.with(|c| {
                c.as_ref().map(|c| {
                    format!(
                        "Silicon {} µm, {} light trapping, {} · absorption edge {} eV ({} nm) · {} · {} sun{} · the band-gap plots below are for an ideal step at {} eV",
                        crate::view::format::field(r.spec.thickness_um, 6),
                        trapping_words(r.spec.trapping),
                        doping_words(&r.spec),
                        fixed(r.edge_ev, 3),
                        fixed(ev_of_nm(1.0) / r.edge_ev, 0),
                        c.spectrum.name,
                        crate::view::format::field(c.setup.light.concentration, 6),
                        if c.setup.light.concentration == 1.0 { "" } else { "s" },
                        gap_ev(c.gap_ev)
                    )
                })
            });
        }
        cs.computed.with(|c| {
            c.as_ref().map(|c| {
                format!(
                    "Band gap {} eV (absorption edge {} nm) · {} · {} sun{}",
                    gap_ev(c.gap_ev),
                    fixed(ev_of_nm(1.0) / c.gap_ev, 1),
                    c.spectrum.name,
                    crate::view::format::field(c.setup.light.concentration, 6),
                    if c.setup.light.concentration == 1.0 { "" } else { "s" }
                )
            })
        })
    };
    let error = move || cs.compute_error.get();
    view! {
        <section class="figures-block" aria-labelledby="fig-h">
            <h2 id="fig-h" class="visually-hidden">"Headline figures"</h2>
            <div class="figures">{cards}</div>
            <p class="summary">{summary}</p>
            <p class="compute-error" role="alert" hidden=move || error().is_none()>{error}</p>
            <p class="caution-inline">
                {move || if cs.real.with(|r| r.is_some()) {
                    "The intrinsic limit of a silicon cell (radiative and Auger recombination only, the chosen light trapping): an upper bound, not a prediction of a real device."
                } else {
                    "Detailed-balance limits of an ideal single-junction cell: upper bounds set by physics, not predictions of a real device."
                }}
            </p>
        </section>
    }
}

pub fn cautions() -> impl IntoView {
    caution_footer(&[
        (
            "Limits, not predictions. ",
            "Every figure here is a detailed-balance limit for an ideal step absorber (every photon above the gap absorbed, only radiative loss scaled by the ERE). Real cells fall short of it.",
        ),
        (
            "Concentrated light is dangerous. ",
            "Concentrated sunlight can burn skin, start fires and damage eyes within moments. Defer to local codes and licensed practice for any real optics.",
        ),
    ])
}
