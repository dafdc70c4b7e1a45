//! The figures of the three cards (the report types' rows, as the command line prints
//! them), the best step absorber with its action, and the panel's cautions.

use leptos::prelude::*;

use crate::app::hot::state::HotState;
use crate::app::widgets::notices::caution_footer;
use crate::report::hot::TpvReport;
use crate::scenario::hot::SurfaceSpec;
use crate::view::controls::Control;
use crate::view::hot::blackbody_figures as bb_rows;

/// The `data-metric` hooks of `TpvReport::rows`, in their order.
pub const TPV_HOOKS: [&str; 9] = [
    "tpv-efficiency",
    "tpv-power",
    "tpv-heat-in",
    "tpv-subgap-heat",
    "tpv-jsc",
    "tpv-voc",
    "tpv-vmp",
    "tpv-max-efficiency",
    "tpv-carnot",
];

/// The `data-metric` hooks of `AbsorberReport::rows` (without a best cutoff), in order.
pub const ABS_HOOKS: [&str; 9] = [
    "abs-temp",
    "abs-incident",
    "abs-absorbed",
    "abs-emitted",
    "abs-convection",
    "abs-thermal-efficiency",
    "abs-carnot",
    "abs-work-efficiency",
    "abs-stagnation",
];

fn cells(rows: Vec<(&'static str, &'static str, String)>, lead: &'static str) -> impl IntoView {
    rows.into_iter()
        .map(|(hook, label, text)| {
            view! {
                <div class="figure" class:lead=hook == lead>
                    <span class="fig-label">{label.trim()}</span>
                    <span class="fig-value" data-metric=hook>{text.replace(" um", " µm").replace("W/m2", "W/m²").replace("W/cm2", "W/cm²").replace("A/cm2", "A/cm²")}</span>
                </div>
            }
        })
        .collect_view()
}

pub fn blackbody_figures(hot: HotState) -> impl IntoView {
    let body = move || {
        hot.bb.with(|v| {
            v.as_ref().map(|v| {
                let note = match &v.emitter {
                    Some(e) => format!(
                        "The plot also shows the TPV emitter ({}) at {} K: its emissivity times Planck's law.",
                        e.label.replace(" um", " µm"),
                        crate::view::format::field(e.temp_k, 6)
                    ),
                    None => "The TPV emitter below is black, so its spectrum is Planck's law at its own temperature; give it an emissivity profile to see it here.".into(),
                };
                view! {
                    <div class="hot-figures">{cells(bb_rows(&v.report), "")}</div>
                    <p class="summary" data-note="bb-emitter">{note}</p>
                }
            })
        })
    };
    view! { <section class="figures-block" aria-label="Blackbody figures">{body}</section> }
}

pub fn tpv_figures(hot: HotState) -> impl IntoView {
    let rows = move |r: &TpvReport| -> Vec<(&'static str, &'static str, String)> {
        r.rows().into_iter().zip(TPV_HOOKS).map(|((label, text), hook)| (hook, label, text)).collect()
    };
    let body = move || {
        hot.tpv.with(|v| {
            v.as_ref().map(|v| {
                let subcells = (v.report.subcells.len() > 1).then(|| {
                    let lines = v
                        .report
                        .subcells
                        .iter()
                        .map(|s| {
                            view! {
                                <tr><td>{format!("{:.4}", s.gap_ev)}</td><td>{format!("{:.4}", s.jsc_a_cm2)}</td><td>{format!("{:.4}", s.voc_v)}</td><td>{format!("{:.4}", s.vmp_v)}</td></tr>
                            }
                        })
                        .collect_view();
                    view! {
                        <div class="table-scroll">
                            <table class="stack-table" data-table="tpv-subcells">
                                <thead><tr><th>"Gap (eV)"</th><th>"Jsc (A/cm²)"</th><th>"Voc (V)"</th><th>"Vmp (V)"</th></tr></thead>
                                <tbody>{lines}</tbody>
                            </table>
                        </div>
                    }
                });
                view! {
                    <div class="hot-figures">{cells(rows(&v.report), "tpv-efficiency")}</div>
                    {subcells}
                }
            })
        })
    };
    view! {
        <section class="figures-block" aria-label="TPV figures">
            {body}
            <p class="summary">"Efficiency is electric power over the net heat drawn from the emitter; the sub-gap photons the cell reflects go back to the emitter and are not lost."</p>
            <p class="safety">
                "Emitters at these temperatures glow and burn on contact, and their radiation can harm eyes and skin: shield them, keep clear, and follow local codes and licensed practice for anything built."
            </p>
        </section>
    }
}

pub fn absorber_figures(hot: HotState) -> impl IntoView {
    let ctx = hot.ctx;
    let body = move || {
        hot.abs.with(|v| {
            v.as_ref().map(|v| {
                let rows: Vec<_> = v
                    .report
                    .rows()
                    .into_iter()
                    .zip(ABS_HOOKS)
                    .map(|((label, text), hook)| (hook, label, text))
                    .collect();
                view! { <div class="hot-figures">{cells(rows, "abs-work-efficiency")}</div> }
            })
        })
    };
    let best = move || {
        hot.abs.with(|v| {
            v.as_ref().map(|v| {
                let b = &v.best;
                let cutoff = match b.best_cutoff_um {
                    Some(Some(c)) => format!("a step at {c:.4} µm"),
                    _ => "black (no cutoff does better)".into(),
                };
                format!(
                    "Best step absorber for this light: {cutoff} at {:.1} K, work efficiency {:.2} % (stagnation {}).",
                    b.best_temp_k.unwrap_or(b.temp_k),
                    b.work_efficiency * 100.0,
                    b.stagnation_temp_k.map_or("above 1e7 K".into(), |t| format!("{t:.1} K"))
                )
            })
        })
    };
    let use_best = move |_| {
        let Some((cut, t)) =
            hot.abs.with_untracked(|v| v.as_ref().map(|v| (v.best.best_cutoff_um.flatten(), v.best.best_temp_k)))
        else {
            return;
        };
        let Some(t) = t else { return };
        let surface = match cut {
            Some(c) => SurfaceSpec::Step { cutoff_um: (c * 1e4).round() / 1e4 },
            None => SurfaceSpec::Black,
        };
        ctx.edit(Control::AbsSurface, |s| {
            s.hot.absorber.surface = surface;
            s.hot.absorber.temp_k = (t * 10.0).round() / 10.0;
        });
    };
    view! {
        <section class="figures-block" aria-label="Solar-thermal figures">
            {body}
            <div class="search-row">
                <p class="search-result" data-note="abs-best">{best}</p>
                <button type="button" class="small" data-action="abs-use-best" on:click=use_best>"Use this design"</button>
            </div>
            <p class="summary">"Work efficiency is the thermal efficiency times the Carnot factor 1 − Ta/T: the most an ideal engine between the absorber and the ambient could deliver."</p>
            <p class="safety">
                "Concentrated sunlight burns skin and damages eyes within moments, and absorbers near stagnation are hot enough to ignite materials: never look into the focus, and defer to local codes and licensed practice for real collectors."
            </p>
        </section>
    }
}

pub fn cautions() -> impl IntoView {
    caution_footer(&[
        (
            "Limits, not ratings. ",
            "These are detailed-balance limits of ideal surfaces and cells; real emitters, cells and collectors fall short of them.",
        ),
        (
            "Hot surfaces and bright light. ",
            "Emitters and absorbers at these temperatures burn on contact and can set materials alight; their radiation and concentrated sunlight harm eyes and skin. Use shielding and eye protection, and defer to local codes and licensed practice.",
        ),
    ])
}
