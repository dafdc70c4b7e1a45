//! The stack editor (number of junctions, connection, one field per gap), the headline
//! figures, the per-subcell table, the light-and-cell summary and the cautions.

use crate::view::controls::Control;
use std::rc::Rc;

use leptos::ev;
use leptos::prelude::*;

use super::{colours, edit_stack, set_gaps, StackState, GAP_HOOKS};
use crate::app::widgets::fields::{gap_keys, number_field, plain_parse, Field};
use crate::app::widgets::real_fields::{real_fields, RealHooks};
use crate::physics::stack::MAX_JUNCTIONS;
use crate::scenario::real::RealAbsorberSpec;
use crate::scenario::Scenario;
use crate::scenario::{Connection, Emission, JvModel};
use crate::scenario::{Panel, GAP_RANGE_EV};
use crate::view::cell::real::first_silicon;
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
fn gap_field(stack: StackState, i: usize) -> impl IntoView {
    let ctx = stack.ctx;
    let hook = GAP_HOOKS[i];
    let value = Memo::new(move |_| ctx.scenario.with(|s| s.stack.gaps_ev.get(i).copied().unwrap_or(f64::NAN)));
    let commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |g| {
        let mut gaps = stack.gaps();
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
        <div class="stack-gap" on:focusin=move |_| { typing.set(false); stack.selected.set(i); }>
            <i class="stack-swatch" style=swatch aria-hidden="true"></i>
            {number_field(ctx, field, commit, Some(keys))}
        </div>
    }
}

pub fn editor_section(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let count = Memo::new(move |_| ctx.scenario.with(|s| s.stack.gaps_ev.len()));
    let junctions =
        Memo::new(move |_| ctx.scenario.with(|s| s.stack.gaps_ev.len() + usize::from(s.stack.bottom.is_some())));
    let connection = Memo::new(move |_| ctx.scenario.with(|s| s.stack.connection));
    let on_count = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        match text.parse::<usize>() {
            Ok(n) if (2..=MAX_JUNCTIONS).contains(&n) => {
                // a real bottom cell is one of the junctions
                let real = ctx.scenario.with_untracked(|s| s.stack.bottom.is_some());
                let gaps = resized(&stack.gaps(), n - usize::from(real));
                edit_stack(ctx, Control::Junctions, move |st| {
                    st.gaps_ev = gaps;
                    st.optimize.junctions = n;
                });
                if stack.selected.get_untracked() >= n {
                    stack.selected.set(n - 1);
                }
            }
            _ => ctx.set_error(
                Control::Junctions,
                format!("'{text}' is not a number of junctions; choose 2 to {MAX_JUNCTIONS}."),
            ),
        }
    };
    let on_connection = move |ev: ev::Event| {
        let c = match event_target_value(&ev).as_str() {
            "independent" => Connection::Independent,
            _ => Connection::Series,
        };
        edit_stack(ctx, Control::Connection, move |st| st.connection = c);
    };
    let options = (2..=MAX_JUNCTIONS)
        .map(|n| view! { <option value=n.to_string() prop:selected=move || junctions.get() == n>{n.to_string()}</option> })
        .collect_view();
    let fields = move || (0..count.get()).map(|i| gap_field(stack, i)).collect_view();
    view! {
        <section class="panel-section stack-editor" aria-labelledby="stack-h">
            <h2 id="stack-h">"Stack"</h2>
            <div class="stack-choices">
                <div class="field">
                    <label for="f-junctions">"Junctions"</label>
                    <select id="f-junctions" data-control="junctions" on:change=on_count aria-describedby="e-junctions">{options}</select>
                    <p class="field-error" id="e-junctions" data-error=Control::Junctions.as_str() aria-live="polite">{move || ctx.error_of(Control::Junctions)}</p>
                </div>
                <div class="field">
                    <label for="f-connection">"Connection"</label>
                    <select id="f-connection" data-control="connection" on:change=on_connection aria-describedby="e-connection h-connection">
                        <option value="series" prop:selected=move || connection.get() == Connection::Series>"Series (two-terminal)"</option>
                        <option value="independent" prop:selected=move || connection.get() == Connection::Independent>"Independent (multi-terminal)"</option>
                    </select>
                    <p class="field-error" id="e-connection" data-error=Control::Connection.as_str() aria-live="polite">{move || ctx.error_of(Control::Connection)}</p>
                </div>
            </div>
            <p class="hint" id="h-connection">
                {move || match connection.get() {
                    Connection::Series => "One current through every subcell: the smallest photocurrent limits the stack (current matching).",
                    Connection::Independent => "Each subcell works at its own maximum power point; the powers add.",
                }}
            </p>
            <div class="stack-gaps">{fields}</div>
            {bottom_section(stack)}
            <p class="field-error" data-error=Control::StackGaps.as_str() aria-live="polite">{move || stack.error.get().is_some().then(|| ctx.error_of(Control::StackGaps)).flatten()}</p>
            <p class="hint">"Band gaps top cell first, each below the one above. Arrow keys in a field: ±1 meV (Shift: ±10 meV). Drag the markers on the spectrum, or click the map."</p>
        </section>
    }
}

/// What the stack is seen under: the solar-cell panel's light and cell settings.
pub fn conditions(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
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
            <p class="hint">"Every step subcell is an ideal step absorber with the solar cell's settings (a silicon bottom cell has its own absorption); light passes between subcells only by the luminescent coupling set above."</p>
            <button type="button" class="small" data-action="edit-conditions" on:click=move |_| { ctx.edit(Control::Panel, |s| s.view.panel = Panel::Cell); }>
                "Change them in the Solar cell tab"
            </button>
            <p class="safety" hidden=move || !concentrated()>
                "Concentrated sunlight can burn skin and damage eyes. Follow local codes and licensed practice when working with real concentrators."
            </p>
        </section>
    }
}

fn bottom_of(s: &Scenario) -> Option<RealAbsorberSpec> {
    s.stack.bottom.clone()
}

const BOTTOM_HOOKS: RealHooks = RealHooks {
    prefix: "bottom",
    thickness: Control::BottomThickness,
    trapping: Control::BottomTrapping,
    doping: Control::BottomDoping,
    get: bottom_of,
};

/// The silicon bottom cell first offered: 300 um, Lambertian, undoped.
fn first_bottom() -> RealAbsorberSpec {
    RealAbsorberSpec { thickness_um: 300.0, ..first_silicon() }
}

/// The bottom cell's choice (a step at the lowest gap, or silicon with its settings) and the
/// luminescent coupling.
fn bottom_section(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let real = Memo::new(move |_| ctx.scenario.with(|s| s.stack.bottom.is_some()));
    let kept = StoredValue::new(ctx.scenario.with_untracked(bottom_of).unwrap_or_else(first_bottom));
    let refresh = RwSignal::new(0u32);
    let choose = move |silicon: bool| {
        let ok = if silicon {
            // the silicon cell takes the place of the lowest step subcell
            let b = kept.get_value();
            edit_stack(ctx, Control::StackBottom, move |st| {
                if st.gaps_ev.len() > 1 {
                    st.gaps_ev.pop();
                }
                st.bottom = Some(b);
            })
        } else {
            // a step subcell below the others takes its place
            let gaps = stack.gaps();
            let n = gaps.len() + 1;
            let gaps = resized(&gaps, n);
            edit_stack(ctx, Control::StackBottom, move |st| {
                st.gaps_ev = gaps;
                st.bottom = None;
            })
        };
        if !ok {
            refresh.update(|n| *n += 1);
        }
    };
    let commit: Rc<dyn Fn(Control, RealAbsorberSpec) -> bool> = Rc::new(move |hook, b: RealAbsorberSpec| {
        let kept_b = b.clone();
        let ok = edit_stack(ctx, hook, move |st| st.bottom = Some(b));
        if ok {
            kept.set_value(kept_b);
        }
        ok
    });
    let coupling = number_field(
        ctx,
        Field {
            label: "Luminescent coupling",
            unit: "",
            hook: Control::Coupling,
            hint: Some("The fraction of each subcell's own light emission that the subcell below absorbs: 0 (none) to 1 (all of it).".into()),
            example: "0.3",
            value: Memo::new(move |_| ctx.scenario.with(|s| s.stack.luminescent_coupling)),
            show: |v| fmt::field(v, 6),
            parse: plain_parse,
        },
        Rc::new(move |x| edit_stack(ctx, Control::Coupling, move |st| st.luminescent_coupling = x)),
        None,
    );
    view! {
        <fieldset class="choice">
            <legend>"Bottom subcell"</legend>
            <label>
                <input type="radio" name="stack-bottom" data-control="stack-bottom-step" aria-describedby="e-stack-bottom"
                    prop:checked=move || { refresh.track(); !real.get() } on:change=move |_| choose(false) />
                "Step (band gap)"
            </label>
            <label>
                <input type="radio" name="stack-bottom" data-control="stack-bottom-silicon" aria-describedby="e-stack-bottom"
                    prop:checked=move || { refresh.track(); real.get() } on:change=move |_| choose(true) />
                "Silicon (real absorption)"
            </label>
            <p class="field-error" id="e-stack-bottom" data-error=Control::StackBottom.as_str() aria-live="polite">{move || ctx.error_of(Control::StackBottom)}</p>
        </fieldset>
        <div class="sub-field" hidden=move || !real.get()>
            <p class="hint">"The gaps above are the step subcells over the silicon cell. Silicon's absorption is Green's 2008 table at 300 K, its Auger recombination Richter's 2012 parametrization."</p>
            {real_fields(ctx, BOTTOM_HOOKS, commit)}
        </div>
        {coupling}
    }
}
