//! The headline figures, the notices across the top, and the cautions.

use leptos::prelude::*;

use super::fmt::{fixed, gap_ev};
use super::share::apply_scenario;
use super::state::{ev_of_nm, Ctx, NoticeAction};
use crate::report::CELL_METRICS;

pub fn figures(ctx: Ctx) -> impl IntoView {
    let cards = CELL_METRICS
        .iter()
        .map(|(hook, label, _unit)| {
            let hook = *hook;
            let text =
                move || ctx.computed.with(|c| c.as_ref().map(|c| c.report.display(hook)).unwrap_or_else(|| "—".into()));
            view! {
                <div class="figure" class:lead=hook == "efficiency">
                    <span class="fig-label">{*label}</span>
                    <span class="fig-value" data-metric=hook>{text}</span>
                </div>
            }
        })
        .collect_view();
    let summary = move || {
        ctx.computed.with(|c| {
            c.as_ref().map(|c| {
                format!(
                    "Band gap {} eV (absorption edge {} nm) · {} · {} sun{}",
                    gap_ev(c.gap_ev),
                    fixed(ev_of_nm(1.0) / c.gap_ev, 1),
                    c.spectrum.name,
                    super::fmt::field(c.setup.light.concentration, 6),
                    if c.setup.light.concentration == 1.0 { "" } else { "s" }
                )
            })
        })
    };
    let error = move || ctx.compute_error.get();
    view! {
        <section class="figures-block" aria-labelledby="fig-h">
            <h2 id="fig-h" class="visually-hidden">"Headline figures"</h2>
            <div class="figures">{cards}</div>
            <p class="summary">{summary}</p>
            <p class="compute-error" role="alert" hidden=move || error().is_none()>{error}</p>
            <p class="caution-inline">
                "Detailed-balance limits of an ideal single-junction cell: upper bounds set by physics, not predictions of a real device."
            </p>
        </section>
    }
}

pub fn notices(ctx: Ctx) -> impl IntoView {
    move || {
        let list = ctx.notices.get();
        if list.is_empty() {
            return None;
        }
        Some(view! {
            <div class="notices">
                {list
                    .into_iter()
                    .map(|n| {
                        let kind = n.kind;
                        let role = if n.alert { "alert" } else { "status" };
                        let action = n.action.map(|NoticeAction::Restore(s, label)| {
                            let s = *s;
                            view! {
                                <button type="button" class="small" data-action=format!("{kind}-restore") on:click=move |_| {
                                    apply_scenario(ctx, s.clone());
                                    ctx.dismiss(kind);
                                }>{label}</button>
                            }
                        });
                        view! {
                            <div class="notice" class:alert=n.alert role=role data-notice=kind>
                                <p>{n.text}</p>
                                <div class="notice-actions">
                                    {action}
                                    <button type="button" class="small ghost" aria-label="Dismiss this notice" on:click=move |_| ctx.dismiss(kind)>"Dismiss"</button>
                                </div>
                            </div>
                        }
                    })
                    .collect_view()}
            </div>
        })
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

/// A panel's cautions, each (lead-in, text), and the colophon.
pub fn caution_footer(items: &[(&'static str, &'static str)]) -> impl IntoView {
    let items = items.iter().map(|(lead, text)| view! { <p><strong>{*lead}</strong>{*text}</p> }).collect_view();
    view! {
        <footer class="cautions">
            {items}
            {colophon()}
        </footer>
    }
}

/// The closing line of every panel's cautions.
pub fn colophon() -> impl IntoView {
    view! { <p class="colophon">"Glowgap computes everything in this browser; nothing is sent anywhere. It keeps working offline after the first visit."</p> }
}
