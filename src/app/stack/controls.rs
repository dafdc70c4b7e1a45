//! The stack editor (number of junctions, connection, one field per gap), the headline
//! figures, the per-subcell table, the light-and-cell summary and the cautions.

use std::rc::Rc;

use leptos::ev;
use leptos::prelude::*;

use super::{colours, edit_stack, set_gaps, StackCtx, GAP_HOOKS};
use crate::app::widgets::fields::{gap_keys, number_field, Field};
use crate::physics::stack::MAX_JUNCTIONS;
use crate::report::stack::{StackMetric, StackReport};
use crate::scenario::{Connection, Emission, JvModel};
use crate::scenario::{Panel, GAP_RANGE_EV};
use crate::view::format as fmt;
use crate::view::input::parse_gap;
use crate::view::input::tidy;

/// Labels of the gap fields, top first.
const GAP_LABELS: [&str; 6] = ["Subcell 1 (top)", "Subcell 2", "Subcell 3", "Subcell 4", "Subcell 5", "Subcell 6"];

/// Band-gap spacing of a junction added to a stack [eV].
const ADDED_SPACING_EV: f64 = 0.35;
/// The lowest gap a junction is added at, below the stack [eV]; otherwise it goes on top.
const LOWEST_ADDED_EV: f64 = 0.5;

/// The gaps with `n` junctions: junctions are removed from the bottom and added below the
/// lowest gap (or above the top one when there is no room below).
pub fn resized(gaps: &[f64], n: usize) -> Vec<f64> {
    let mut g = gaps.to_vec();
    g.truncate(n.max(1));
    while g.len() < n {
        let low = g.last().copied().unwrap_or(1.1);
        if low - ADDED_SPACING_EV >= LOWEST_ADDED_EV {
            g.push(tidy(low - ADDED_SPACING_EV));
        } else {
            let top = g.first().copied().unwrap_or(1.7);
            g.insert(0, tidy((top + ADDED_SPACING_EV).min(GAP_RANGE_EV.1)));
        }
    }
    g
}

/// One gap field with its colour, keys and message line.
fn gap_field(sc: StackCtx, i: usize) -> impl IntoView {
    let ctx = sc.ctx;
    let hook = GAP_HOOKS[i];
    let value = Memo::new(move |_| ctx.scenario.with(|s| s.stack.gaps_ev.get(i).copied().unwrap_or(f64::NAN)));
    let commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |g| {
        let mut gaps = sc.gaps();
        if i >= gaps.len() {
            return false;
        }
        gaps[i] = g;
        set_gaps(ctx, hook, gaps)
    });
    let step = commit.clone();
    let (keys, typing) = gap_keys(Rc::new(move |d| {
        let g = ctx.scenario.with_untracked(|s| s.stack.gaps_ev.get(i).copied());
        g.is_some_and(|g| step(tidy(g + d)))
    }));
    let field = Field {
        label: GAP_LABELS[i],
        unit: "eV",
        hook,
        hint: None,
        example: "1.42",
        value,
        show: fmt::gap_ev,
        parse: parse_gap,
    };
    let swatch = format!("background:{}", colours::css(colours::subcell(i)));
    view! {
        <div class="stack-gap" on:focusin=move |_| { typing.set(false); sc.selected.set(i); }>
            <i class="stack-swatch" style=swatch aria-hidden="true"></i>
            {number_field(ctx, field, commit, Some(keys))}
        </div>
    }
}

pub fn editor_section(sc: StackCtx) -> impl IntoView {
    let ctx = sc.ctx;
    let count = Memo::new(move |_| ctx.scenario.with(|s| s.stack.gaps_ev.len()));
    let connection = Memo::new(move |_| ctx.scenario.with(|s| s.stack.connection));
    let on_count = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match text.parse::<usize>() {
            Ok(n) if (2..=MAX_JUNCTIONS).contains(&n) => {
                let gaps = resized(&sc.gaps(), n);
                edit_stack(ctx, "junctions", move |st| {
                    st.gaps_ev = gaps;
                    st.optimize.junctions = n;
                });
                if sc.selected.get_untracked() >= n {
                    sc.selected.set(n - 1);
                }
            }
            _ => ctx
                .set_error("junctions", format!("'{text}' is not a number of junctions; choose 2 to {MAX_JUNCTIONS}.")),
        }
    };
    let on_connection = move |ev: ev::Event| {
        let c = match event_target_value(&ev).as_str() {
            "independent" => Connection::Independent,
            _ => Connection::Series,
        };
        edit_stack(ctx, "connection", move |st| st.connection = c);
    };
    let options = (2..=MAX_JUNCTIONS)
        .map(|n| view! { <option value=n.to_string() prop:selected=move || count.get() == n>{n.to_string()}</option> })
        .collect_view();
    let fields = move || (0..count.get()).map(|i| gap_field(sc, i)).collect_view();
    view! {
        <section class="panel-section stack-editor" aria-labelledby="stack-h">
            <h2 id="stack-h">"Stack"</h2>
            <div class="stack-choices">
                <div class="field">
                    <label for="f-junctions">"Junctions"</label>
                    <select id="f-junctions" data-control="junctions" on:change=on_count aria-describedby="e-junctions">{options}</select>
                    <p class="field-error" id="e-junctions" data-error="junctions" aria-live="polite">{move || ctx.error_of("junctions")}</p>
                </div>
                <div class="field">
                    <label for="f-connection">"Connection"</label>
                    <select id="f-connection" data-control="connection" on:change=on_connection aria-describedby="e-connection h-connection">
                        <option value="series" prop:selected=move || connection.get() == Connection::Series>"Series (two-terminal)"</option>
                        <option value="independent" prop:selected=move || connection.get() == Connection::Independent>"Independent (multi-terminal)"</option>
                    </select>
                    <p class="field-error" id="e-connection" data-error="connection" aria-live="polite">{move || ctx.error_of("connection")}</p>
                </div>
            </div>
            <p class="hint" id="h-connection">
                {move || match connection.get() {
                    Connection::Series => "One current through every subcell: the smallest photocurrent limits the stack (current matching).",
                    Connection::Independent => "Each subcell works at its own maximum power point; the powers add.",
                }}
            </p>
            <div class="stack-gaps">{fields}</div>
            <p class="field-error" data-error="stack-gaps" aria-live="polite">{move || sc.error.get().is_some().then(|| ctx.error_of("stack-gaps")).flatten()}</p>
            <p class="hint">"Band gaps top cell first, each below the one above. Arrow keys in a field: ±1 meV (Shift: ±10 meV). Drag the markers on the spectrum, or click the map."</p>
        </section>
    }
}

/// What the stack is seen under: the solar-cell panel's light and cell settings.
pub fn conditions(sc: StackCtx) -> impl IntoView {
    let ctx = sc.ctx;
    let line = move || {
        ctx.scenario.with(|s| {
            let c = &s.cell;
            let source = crate::view::cell::csv::source_label(&c.spectrum);
            let suns = fmt::field(c.concentration, 6);
            let mut parts = vec![
                format!("{source} at {suns} sun{}", if c.concentration == 1.0 { "" } else { "s" }),
                format!("subcells at {} K", fmt::field(c.cell_temp_k, 6)),
                format!("ERE {}", fmt::field(c.ere, 4)),
            ];
            parts.push(match c.emission {
                Emission::Front => "front faces emit".into(),
                Emission::Both => "both faces emit".into(),
            });
            if c.approx == JvModel::Boltzmann {
                parts.push("Boltzmann J–V".into());
            }
            parts.join(" · ")
        })
    };
    let concentrated = move || ctx.scenario.with(|s| s.cell.concentration > 1.0);
    view! {
        <section class="panel-section" aria-labelledby="stack-light-h">
            <h2 id="stack-light-h">"Light and cells"</h2>
            <p class="stack-conditions" data-info="stack-conditions">{line}</p>
            <p class="hint">"Every subcell is an ideal step absorber with the solar cell's settings; no light passes between subcells."</p>
            <button type="button" class="small" data-action="edit-conditions" on:click=move |_| { ctx.edit("panel", |s| s.view.panel = Panel::Cell); }>
                "Change them in the Solar cell tab"
            </button>
            <p class="safety" hidden=move || !concentrated()>
                "Concentrated sunlight can burn skin and damage eyes. Follow local codes and licensed practice when working with real concentrators."
            </p>
        </section>
    }
}

/// The headline figures of the stack.
pub fn figures(sc: StackCtx) -> impl IntoView {
    let cards = StackMetric::HEADLINE
        .into_iter()
        .map(|m| {
            let label = move || sc.view.with(|v| v.as_ref().map(|v| v.report.label(m)).unwrap_or(m.label()));
            let text = move || sc.view.with(|v| v.as_ref().map(|v| v.report.display(m)).unwrap_or_else(|| "—".into()));
            view! {
                <div class="figure" class:lead=m == StackMetric::Efficiency>
                    <span class="fig-label">{label}</span>
                    <span class="fig-value" data-metric=m.as_str()>{text}</span>
                </div>
            }
        })
        .collect_view();
    let summary = move || sc.view.with(|v| v.as_ref().map(|v| summary_line(&v.report)));
    let error = move || sc.error.get();
    view! {
        <section class="figures-block stack-figures" aria-labelledby="stack-fig-h">
            <h2 id="stack-fig-h" class="visually-hidden">"Stack figures"</h2>
            <div class="figures">{cards}</div>
            <p class="summary" data-info="stack-summary">{summary}</p>
            <p class="compute-error" role="alert" hidden=move || error().is_none()>{error}</p>
            <p class="caution-inline">
                "Detailed-balance limits of an ideal stack of step absorbers: upper bounds set by physics, not predictions of a real device."
            </p>
        </section>
    }
}

/// One line on the design: junctions, connection and, in series, the limiting subcell and
/// the current left unused.
fn summary_line(r: &StackReport) -> String {
    let gaps: Vec<String> = r.subcells.iter().map(|s| fmt::gap_ev(s.gap_ev)).collect();
    let head = format!("{} junctions, {} · gaps {} eV", r.subcells.len(), r.connection.label(), gaps.join(" / "));
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
pub fn subcell_table(sc: StackCtx) -> impl IntoView {
    let ctx = sc.ctx;
    let series = move || sc.view.with(|v| v.as_ref().is_some_and(|v| v.report.connection == Connection::Series));
    let rows = move || {
        sc.view.with(|v| {
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
                            let mut g = sc.gaps();
                            if g.len() > 2 && i < g.len() {
                                g.remove(i);
                                let n = g.len();
                                edit_stack(ctx, "junctions", move |st| {
                                    st.gaps_ev = g;
                                    st.optimize.junctions = n;
                                });
                                sc.selected.set(sc.selected.get_untracked().min(n - 1));
                            }
                        };
                        view! {
                            <tr class:limiting=limiting data-subcell=(i + 1).to_string()>
                                <th scope="row"><i class="stack-swatch" style=swatch aria-hidden="true"></i>{format!("{}{}", i + 1, if i == 0 { " top" } else { "" })}</th>
                                <td>{fmt::gap_ev(s.gap_ev)}</td>
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

pub fn cautions(sc: StackCtx) -> impl IntoView {
    let _ = sc;
    view! {
        <footer class="cautions">
            <p>
                <strong>"Limits, not predictions. "</strong>
                "Every figure here is a detailed-balance limit: ideal step absorbers stacked widest gap on top, every photon in a subcell's band absorbed, only radiative loss scaled by the ERE, no light exchanged between subcells. Real stacks fall short of it."
            </p>
            <p>
                <strong>"Concentrated light is dangerous. "</strong>
                "Concentrated sunlight can burn skin, start fires and damage eyes within moments. Defer to local codes and licensed practice for any real optics."
            </p>
        </footer>
    }
}
