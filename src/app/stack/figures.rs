//! The stack's headline figures (formatted by `report::stack`, as `glowgap stack` prints
//! them), the per-subcell table, and the cautions.

use super::{colours, edit_stack, StackState};
use crate::report::stack::{StackMetric, StackReport};
use crate::scenario::Connection;
use crate::view::controls::Control;
use crate::view::format as fmt;
use leptos::prelude::*;

/// The headline figures of the stack.
pub fn figures(stack: StackState) -> impl IntoView {
    let cards = StackMetric::HEADLINE
        .into_iter()
        .map(|m| {
            let label = move || stack.view.with(|v| v.as_ref().map(|v| v.report.label(m)).unwrap_or(m.label()));
            let text =
                move || stack.view.with(|v| v.as_ref().map(|v| v.report.display(m)).unwrap_or_else(|| "—".into()));
            view! {
                <div class="figure" class:lead=m == StackMetric::Efficiency>
                    <span class="fig-label">{label}</span>
                    <span class="fig-value" data-metric=m.as_str()>{text}</span>
                </div>
            }
        })
        .collect_view();
    let summary = move || stack.view.with(|v| v.as_ref().map(|v| summary_line(&v.report)));
    let error = move || stack.error.get();
    view! {
        <section class="figures-block stack-figures" aria-labelledby="stack-fig-h">
            <h2 id="stack-fig-h" class="visually-hidden">"Stack figures"</h2>
            <div class="figures">{cards}</div>
            <p class="summary" data-info="stack-summary">{summary}</p>
            <p class="compute-error" role="alert" hidden=move || error().is_none()>{error}</p>
            <p class="caution-inline">
                "Detailed-balance limits of an ideal stack (step absorbers, and a silicon bottom cell limited by radiative and Auger recombination when chosen): upper bounds set by physics, not predictions of a real device."
            </p>
        </section>
    }
}

/// One line on the design: junctions, connection and, in series, the limiting subcell and
/// the current left unused.
fn summary_line(r: &StackReport) -> String {
    let gaps: Vec<String> = (0..r.subcells.len()).map(|i| crate::view::stack::subcell_gap_text(r, i)).collect();
    let head = format!("{} junctions, {} · gaps {}", r.subcells.len(), r.connection.label(), gaps.join(" / "));
    match r.limiting_subcell {
        Some(l) => {
            let unused: f64 = r.subcells.iter().map(|s| s.excess_jsc_ma_cm2).sum();
            format!(
                "{head} · subcell {l}{} limits the current; {} mA/cm² of photocurrent elsewhere cannot be delivered (current mismatch)",
                if l == 1 { " (top)" } else { "" },
                fmt::fixed(unused, 3)
            )
        }
        None => format!("{head} · every subcell at its own maximum power point"),
    }
}

/// The per-subcell table.
pub fn subcell_table(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let series = move || stack.view.with(|v| v.as_ref().is_some_and(|v| v.report.connection == Connection::Series));
    let rows = move || {
        stack.view.with(|v| {
            let v = v.as_ref()?;
            let n = v.report.subcells.len();
            Some(
                v.report
                    .subcells
                    .iter()
                    .enumerate()
                    .map(|(i, s)| {
                        let limiting = v.report.limiting_subcell == Some(i + 1);
                        let band = match s.upper_gap_ev {
                            Some(u) => format!("{}–{}", fmt::fixed(s.gap_ev, 3), fmt::fixed(u, 3)),
                            None => format!("≥ {}", fmt::fixed(s.gap_ev, 3)),
                        };
                        let swatch = format!("background:{}", colours::css(colours::subcell(i)));
                        let remove = move |_| {
                            let mut g = stack.gaps();
                            if g.len() > 2 && i < g.len() {
                                g.remove(i);
                                let n = g.len();
                                edit_stack(ctx, Control::Junctions, move |st| {
                                    st.gaps_ev = g;
                                    st.optimize.junctions = n;
                                });
                                stack.selected.set(stack.selected.get_untracked().min(n - 1));
                            }
                        };
                        view! {
                            <tr class:limiting=limiting data-subcell=(i + 1).to_string()>
                                <th scope="row"><i class="stack-swatch" style=swatch aria-hidden="true"></i>{format!("{}{}", i + 1, if i == 0 { " top" } else if i == v.gaps_ev.len() { " silicon" } else { "" })}</th>
                                <td>{if i == v.gaps_ev.len() { format!("{} (edge)", fmt::fixed(s.gap_ev, 3)) } else { fmt::gap_ev(s.gap_ev) }}</td>
                                <td>{band}</td>
                                <td>{fmt::fixed(s.jsc_ma_cm2, 3)}</td>
                                <td>{fmt::fixed(s.voc_v, 4)}</td>
                                <td>{fmt::fixed(s.j_ma_cm2, 3)}</td>
                                <td>{fmt::fixed(s.v_v, 4)}</td>
                                <td>{fmt::fixed(s.pmax_w_m2, 2)}</td>
                                <td class="stack-excess">{if limiting { "limits".to_string() } else { fmt::fixed(s.excess_jsc_ma_cm2, 3) }}</td>
                                <td>
                                    <button type="button" class="small ghost" data-action=format!("remove-subcell-{}", i + 1) disabled=n <= 2
                                        title="Remove this subcell (a stack keeps at least two)" aria-label=format!("Remove subcell {}", i + 1) on:click=remove>"×"</button>
                                </td>
                            </tr>
                        }
                    })
                    .collect_view(),
            )
        })
    };
    view! {
        <article class="plot-card stack-table-card" data-card="subcells">
            <header class="plot-head"><h3>"Subcells"</h3></header>
            <div class="table-scroll">
                <table class="stack-table" data-table="subcells" class:series=series>
                    <thead>
                        <tr>
                            <th scope="col">"Subcell"</th>
                            <th scope="col">"Gap (eV)"</th>
                            <th scope="col">"Absorbs (eV)"</th>
                            <th scope="col">"Jsc (mA/cm²)"</th>
                            <th scope="col">"Voc (V)"</th>
                            <th scope="col">"J (mA/cm²)"</th>
                            <th scope="col">"V (V)"</th>
                            <th scope="col">"P (W/m²)"</th>
                            <th scope="col" class="stack-excess">"Unused Jsc (mA/cm²)"</th>
                            <th scope="col"><span class="visually-hidden">"Remove"</span></th>
                        </tr>
                    </thead>
                    <tbody>{rows}</tbody>
                </table>
            </div>
            <p class="hint">
                {move || if series() {
                    "J and V at the stack's maximum power point: one current through all subcells, their voltages add. Unused Jsc is each subcell's photocurrent above the limiting one."
                } else {
                    "J and V at each subcell's own maximum power point; the powers add."
                }}
            </p>
        </article>
    }
}

pub fn cautions(stack: StackState) -> impl IntoView {
    let _ = stack;
    view! {
        <footer class="cautions">
            <p>
                <strong>"Limits, not predictions. "</strong>
                "Every figure here is a detailed-balance limit: ideal step absorbers stacked widest gap on top, every photon in a subcell's band absorbed, only radiative loss scaled by the ERE (a silicon bottom cell: radiative and Auger), no light exchanged between subcells beyond the luminescent coupling set. Real stacks fall short of it."
            </p>
            <p>
                <strong>"Concentrated light is dangerous. "</strong>
                "Concentrated sunlight can burn skin, start fires and damage eyes within moments. Defer to local codes and licensed practice for any real optics."
            </p>
        </footer>
    }
}
