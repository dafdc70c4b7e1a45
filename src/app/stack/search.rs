//! The gap search ("optimize"): it runs in a background worker that loads this same module,
//! so the page never waits for it; the worker reports how many stacks it has evaluated, and
//! "Cancel" ends it at once. The answer becomes the design (never worse than the design,
//! which the search starts from as well), unless the light, the cells or the stack changed
//! meanwhile.

use crate::view::controls::Control;
use std::cell::RefCell;

use leptos::prelude::*;

use super::worker::SearchReply;
use super::{set_gaps, StackState};
use crate::app::state::{mark, sentence, Ctx};
use crate::app::widgets::card::range_input;
use crate::app::widgets::fields::{gap_keys, number_field, Field};
use crate::app::widgets::worker::{Background, WorkerReply};
use crate::report::stack::StackMetric;
use crate::scenario::stack::{check_gaps_over, OptimizeSettings};
use crate::scenario::Connection;
use crate::scenario::FixAt;
use crate::scenario::{CellScenario, Scenario};
use crate::view::cell::same_but_gap;
use crate::view::format::{self as fmt, fixed, gap_ev};
use crate::view::input::{parse_gap, thousands, tidy};

/// Where the search stands.
#[derive(Debug, Clone, PartialEq, Default)]
pub enum SearchState {
    #[default]
    Idle,
    Running {
        evaluations: u64,
        /// performance.now() at the start [ms]
        started: f64,
        /// [ms] since the start at the last report
        elapsed: f64,
    },
    /// what the search found
    Done(String),
    Failed(String),
    Cancelled,
}

impl SearchState {
    pub fn running(&self) -> bool {
        matches!(self, SearchState::Running { .. })
    }
}

/// The worker's script: it loads the app's module (the page's own, from the cache) and runs
/// one search per message.
/// What a search was started for: its answer is used only if these still hold.
struct Started {
    id: u64,
    cell: CellScenario,
    connection: Connection,
    junctions: usize,
    /// the gap held fixed and where
    fix: (Option<f64>, FixAt),
    /// the real bottom cell and the luminescent coupling
    bottom: (Option<crate::scenario::real::RealAbsorberSpec>, f64),
    /// the design's efficiency at the start (display text)
    before: String,
}

struct Runner {
    worker: Background,
    job: Option<Started>,
}

thread_local! {
    static RUNNER: RefCell<Option<Runner>> = const { RefCell::new(None) };
    /// The Stack panel's state while the panel is shown: the worker's replies go there (the
    /// worker may start before the panel, see [`prestart`]).
    static PANEL: std::cell::Cell<Option<StackState>> = const { std::cell::Cell::new(None) };
    static LAST_ID: std::cell::Cell<u64> = const { std::cell::Cell::new(0) };
}

fn now() -> f64 {
    web_sys::window().and_then(|w| w.performance()).map(|p| p.now()).unwrap_or(0.0)
}

fn new_worker() -> Result<Runner, String> {
    let worker = Background::start(
        move |m| {
            if let Some(stack) = PANEL.with(|p| p.get()) {
                on_message(stack, m)
            }
        },
        move |msg| {
            let text = format!(
                "The search stopped: the background worker failed{}.",
                if msg.is_empty() { String::new() } else { format!(" ({msg})") }
            );
            match PANEL.with(|p| p.get()) {
                Some(stack) => fail(stack, text),
                None => stop(),
            }
        },
    )?;
    Ok(Runner { worker, job: None })
}

fn fail(stack: StackState, text: String) {
    stop();
    stack.search.try_set(SearchState::Failed(text));
}

/// The Stack panel is shown: replies go to `stack`, and the search's worker starts now if
/// it has not (see [`prestart`]).
pub fn attach(stack: StackState) {
    PANEL.with(|p| p.set(Some(stack)));
    prestart();
}

/// Start the search's worker, so that it has loaded the module and run the search's inner
/// loops once (`glowgap_stack_warm`) before the first search is asked for: called shortly
/// after the page's first render (the worker compiles on another core) and when the Stack
/// panel opens.
pub fn prestart() {
    if RUNNER.with(|r| r.borrow().is_some()) {
        return;
    }
    if let Ok(r) = new_worker() {
        // id 0 is never a search's id, so its answer is ignored
        if r.worker.post(0, "glowgap_stack_warm", "", "") {
            RUNNER.with(|x| *x.borrow_mut() = Some(r));
        }
    }
}

/// The Stack panel goes away: its worker ends.
pub fn detach() {
    PANEL.with(|p| p.set(None));
    stop();
}

/// End the worker, if any (cancel, or the panel going away).
pub fn stop() {
    if let Some(r) = RUNNER.with(|r| r.borrow_mut().take()) {
        r.worker.stop();
    }
}

fn on_message(stack: StackState, m: WorkerReply) {
    let current = RUNNER.with(|r| r.borrow().as_ref().and_then(|r| r.job.as_ref().map(|j| j.id)));
    if current != Some(m.id) {
        return;
    }
    if let Some(n) = m.progress {
        if let Some(SearchState::Running { started, .. }) = stack.search.try_get_untracked() {
            stack.search.try_set(SearchState::Running { evaluations: n as u64, started, elapsed: now() - started });
        }
        return;
    }
    let job = RUNNER.with(|r| r.borrow_mut().as_mut().and_then(|r| r.job.take()));
    let Some(job) = job else { return };
    let elapsed = match stack.search.try_get_untracked() {
        Some(SearchState::Running { started, .. }) => now() - started,
        _ => 0.0,
    };
    if let Some(f) = m.failed {
        fail(stack, format!("The search stopped: {}", sentence(&f)));
        return;
    }
    let reply: Result<SearchReply, String> = match m.reply.as_deref().map(serde_json::from_str) {
        Some(Ok(r)) => r,
        _ => Err("the background worker gave no readable answer".into()),
    };
    match reply {
        Err(e) => stack.search.try_set(SearchState::Failed(sentence(&e))),
        Ok(r) => apply(stack, job, r, elapsed),
    };
}

/// Make the answer the design, if the search still fits the scenario.
fn apply(stack: StackState, job: Started, r: SearchReply, elapsed: f64) -> Option<SearchState> {
    let ctx = stack.ctx;
    let still = ctx.scenario.try_with_untracked(|s| {
        same_but_gap(&s.cell, &job.cell)
            && s.stack.connection == job.connection
            && s.stack.gaps_ev.len() == job.junctions
            && (s.stack.optimize.fix_ev, s.stack.optimize.fix_at) == job.fix
            && (s.stack.bottom.as_ref(), s.stack.luminescent_coupling) == (job.bottom.0.as_ref(), job.bottom.1)
    })?;
    if !still {
        return stack.search.try_set(SearchState::Failed(
            "The light, the cells, the stack or the fixed gap changed during the search, so its answer was not used; run it again.".into(),
        ));
    }
    // 0.1 meV is far below any gap that matters, and reads better than 1 µeV; the fixed gap
    // stays exactly as given
    let gaps: Vec<f64> =
        r.gaps_ev.iter().map(|&g| if Some(g) == job.fix.0 { g } else { (g * 1e4).round() / 1e4 }).collect();
    if let Some(f) = job.fix.0 {
        if !gaps.contains(&f) {
            return stack.search.try_set(SearchState::Failed(format!(
                "The search's answer does not hold the fixed gap {} eV, so it was not used; run it again.",
                fmt::field(f, 6)
            )));
        }
    }
    if !set_gaps(ctx, Control::Optimize, gaps.clone()) {
        // the reason is under the button
        return stack.search.try_set(SearchState::Idle);
    }
    mark("gg-search-done");
    let shown: Vec<String> = gaps.iter().map(|g| gap_ev(*g)).collect();
    let within = match fixed_words(job.fix) {
        Some(w) => format!("with {w} and the other gaps"),
        None => "with gaps".into(),
    };
    let text = format!(
        "Best {}-junction {} stack {within} from {} to {} eV: {} eV{}, {} % (the design had {}). {} stacks evaluated in {}.",
        job.junctions + usize::from(job.bottom.0.is_some()),
        job.connection.label(),
        fmt::field(r.from_ev, 4),
        fmt::field(r.to_ev, 4),
        shown.join(" / "),
        if job.bottom.0.is_some() { " over the silicon bottom cell" } else { "" },
        fixed(r.efficiency * 100.0, 2),
        job.before,
        thousands(r.evaluations as f64),
        // below a second in whole milliseconds (a fast search read "0.0 s")
        if elapsed < 1000.0 { format!("{} ms", fixed(elapsed.max(1.0), 0)) } else { format!("{} s", fixed(elapsed / 1000.0, 1)) }
    );
    stack.search.try_set(SearchState::Done(text))
}

/// Start a search for the current stack.
pub fn start(stack: StackState) {
    let ctx = stack.ctx;
    if stack.search.with_untracked(|s| s.running()) {
        return;
    }
    ctx.clear_error(Control::Optimize);
    let s: Scenario = ctx.scenario.get_untracked();
    // say what is wrong here rather than from the worker
    let checked = check_gaps_over(&s.stack.gaps_ev, s.stack.bottom.is_some()).and_then(|_| {
        let (st, _) = super::worker::search_settings(&s.stack);
        let setup = st.to_physics(&s.cell)?;
        st.problem(&setup).map(|_| ())
    });
    if let Err(e) = checked {
        ctx.set_error(Control::Optimize, sentence(&e));
        return;
    }
    let have = RUNNER.with(|r| r.borrow().is_some());
    if !have {
        match new_worker() {
            Ok(r) => RUNNER.with(|x| *x.borrow_mut() = Some(r)),
            Err(e) => {
                stack.search.set(SearchState::Failed(format!("{}.", sentence(&e).trim_end_matches('.'))));
                return;
            }
        }
    }
    let id = LAST_ID.with(|c| {
        c.set(c.get() + 1);
        c.get()
    });
    let before = stack.view.with_untracked(|v| {
        v.as_ref().map(|v| v.report.display(StackMetric::Efficiency)).unwrap_or_else(|| "—".into())
    });
    let job = crate::codec::to_json(&s);
    let posted = RUNNER.with(|r| {
        let mut r = r.borrow_mut();
        let r = r.as_mut()?;
        r.job = Some(Started {
            id,
            cell: s.cell.clone(),
            connection: s.stack.connection,
            junctions: s.stack.gaps_ev.len(),
            fix: (s.stack.optimize.fix_ev, s.stack.optimize.fix_at),
            bottom: (s.stack.bottom.clone(), s.stack.luminescent_coupling),
            before,
        });
        Some(r.worker.post(id, "glowgap_stack_search", &job, ""))
    });
    if posted != Some(true) {
        fail(stack, "The search could not be handed to the background worker.".into());
        return;
    }
    mark("gg-search-start");
    stack.search.set(SearchState::Running { evaluations: 0, started: now(), elapsed: 0.0 });
}

/// Cancel a running search.
pub fn cancel(stack: StackState) {
    if stack.search.with_untracked(|s| s.running()) {
        stop();
        stack.search.set(SearchState::Cancelled);
    }
}

/// "the bottom cell held at 1.12 eV", for a fixed gap.
fn fixed_words(fix: (Option<f64>, FixAt)) -> Option<String> {
    let f = fmt::field(fix.0?, 6);
    Some(match fix.1 {
        FixAt::Bottom => format!("the bottom cell held at {f} eV"),
        FixAt::Top => format!("the top cell held at {f} eV"),
        FixAt::Any => format!("one subcell held at {f} eV"),
    })
}

/// The search settings for the design's number of junctions.
fn settings_of(s: &Scenario) -> OptimizeSettings {
    OptimizeSettings { junctions: s.stack.gaps_ev.len(), ..s.stack.optimize.clone() }
}

/// Edit the search settings: the edited settings are checked by the scenario, for the
/// design's number of junctions, before they are committed; otherwise the reason goes
/// under `hook`.
fn edit_search(ctx: Ctx, hook: Control, f: impl FnOnce(&mut OptimizeSettings)) -> bool {
    let mut o = ctx.scenario.with_untracked(|s| s.stack.optimize.clone());
    f(&mut o);
    let n = ctx.scenario.with_untracked(|s| s.stack.gaps_ev.len());
    if let Err(e) = (OptimizeSettings { junctions: n, ..o.clone() }).check() {
        ctx.set_error(hook, sentence(&e));
        return false;
    }
    ctx.edit(hook, move |s| s.stack.optimize = o)
}

/// The value of the fixed-gap <select>: "off", "bottom", "top" or "any".
fn fix_key(fix: (Option<f64>, FixAt)) -> &'static str {
    match fix {
        (None, _) => "off",
        (Some(_), FixAt::Bottom) => "bottom",
        (Some(_), FixAt::Top) => "top",
        (Some(_), FixAt::Any) => "any",
    }
}

/// The fixed gap used when one is first asked for [eV]: crystalline silicon, a typical
/// room-temperature value.
const FIRST_FIXED_EV: f64 = 1.12;

/// "Hold one gap fixed": off, or a gap and where it sits.
fn fixed_gap_control(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let fix = Memo::new(move |_| ctx.scenario.with(|s| (s.stack.optimize.fix_ev, s.stack.optimize.fix_at)));
    // the last gap held fixed, offered again when the choice is turned back on
    let last = RwSignal::new(ctx.scenario.with_untracked(|s| s.stack.optimize.fix_ev).unwrap_or(FIRST_FIXED_EV));
    // the <select> shows the choice in use (set after it is mounted and on every change)
    let select = leptos::prelude::NodeRef::<leptos::html::Select>::new();
    Effect::new(move |_| {
        let k = fix_key(fix.get());
        if let Some(sel) = select.get() {
            sel.set_value(k);
        }
    });
    let on_choice = move |ev: leptos::ev::Event| {
        let at = match event_target_value(&ev).as_str() {
            "bottom" => Some(FixAt::Bottom),
            "top" => Some(FixAt::Top),
            "any" => Some(FixAt::Any),
            _ => None,
        };
        match at {
            None => {
                ctx.clear_error(Control::FixGap);
                ctx.edit(Control::FixAt, |s| s.stack.optimize.fix_ev = None);
            }
            Some(at) => {
                let g = ctx.scenario.with_untracked(|s| s.stack.optimize.fix_ev).unwrap_or(last.get_untracked());
                edit_search(ctx, Control::FixAt, move |o| {
                    o.fix_ev = Some(g);
                    o.fix_at = at;
                });
            }
        }
        // a refused choice shows the one in use again
        if let Some(sel) = select.get_untracked() {
            sel.set_value(fix_key(fix.get_untracked()));
        }
    };
    let value = Memo::new(move |_| fix.get().0.unwrap_or_else(|| last.get()));
    let commit: std::rc::Rc<dyn Fn(f64) -> bool> = std::rc::Rc::new(move |g| {
        let ok = edit_search(ctx, Control::FixGap, |o| o.fix_ev = Some(g));
        if ok {
            last.set(g);
        }
        ok
    });
    let step = commit.clone();
    let (keys, typing) = gap_keys(std::rc::Rc::new(move |d| {
        let g = ctx.scenario.with_untracked(|s| s.stack.optimize.fix_ev);
        g.is_some_and(|g| step(tidy(g + d)))
    }));
    let field = Field {
        label: "Fixed gap",
        unit: "eV",
        hook: Control::FixGap,
        hint: Some("e.g. 1.12 eV for a silicon bottom cell (or type nm). Arrow keys: ±1 meV (Shift: ±10 meV).".into()),
        example: "1.12",
        value,
        show: fmt::gap_ev,
        parse: parse_gap,
    };
    let off = move || fix.get().0.is_none();
    view! {
        <div class="fix-gap">
            <div class="field">
                <label for="f-fix-at">"Hold one gap fixed"</label>
                <select id="f-fix-at" data-control="fix-at" node_ref=select on:change=on_choice aria-describedby="e-fix-at">
                    <option value="off">"No: search every gap"</option>
                    <option value="bottom">"Yes, the bottom cell"</option>
                    <option value="top">"Yes, the top cell"</option>
                    <option value="any">"Yes, any subcell"</option>
                </select>
                <p class="field-error" id="e-fix-at" data-error=Control::FixAt.as_str() aria-live="polite">{move || ctx.error_of(Control::FixAt)}</p>
            </div>
            <div class="sub-field" hidden=off on:focusin=move |_| typing.set(false)>{number_field(ctx, field, commit, Some(keys))}</div>
        </div>
    }
}

pub fn search_section(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let running = move || stack.search.with(|s| s.running());
    let from = Memo::new(move |_| ctx.scenario.with(|s| s.stack.optimize.from_ev));
    let to = Memo::new(move |_| ctx.scenario.with(|s| s.stack.optimize.to_ev));
    let bad = |text: &str| {
        format!("'{text}' is not a band gap; type a number of eV, e.g. 0.5. The search range is unchanged.")
    };
    let what = move || {
        ctx.scenario.with(|s| {
            let o = &s.stack.optimize;
            let (n, conn, a, b) = (s.stack.gaps_ev.len(), s.stack.connection.label(), fmt::field(o.from_ev, 4), fmt::field(o.to_ev, 4));
            match fixed_words((o.fix_ev, o.fix_at)) {
                Some(w) => format!(
                    "Finds the {n}-junction {conn} stack with the highest limit with {w}: the other gaps searched from {a} to {b} eV, starting from the current design with the fixed gap in its place."
                ),
                None => format!(
                    "Finds the {n}-junction {conn} stack with the highest limit: every gap from {a} to {b} eV, the current design included, so the answer is never worse than it."
                ),
            }
        })
    };
    let progress = move || match stack.search.get() {
        SearchState::Running { evaluations, elapsed, .. } => {
            if evaluations == 0 {
                "Starting the search…".to_string()
            } else {
                format!(
                    "Searching… {} stacks evaluated ({} s)",
                    thousands(evaluations as f64),
                    fixed(elapsed / 1000.0, 1)
                )
            }
        }
        _ => String::new(),
    };
    let outcome = move || match stack.search.get() {
        SearchState::Done(t) => Some(t),
        SearchState::Cancelled => Some("Search cancelled; the design is unchanged.".into()),
        _ => None,
    };
    // settings that cannot be searched (the scenario's own check) are said at once, not
    // when the button is pressed; while a typed range is refused (the scenario keeps the
    // last usable one) the button waits too, so the search never runs on a range the user
    // is still correcting
    let range_problem = Memo::new(move |_| {
        ctx.scenario
            .with(|s| settings_of(s).check().err())
            .map(|e| format!("{} The search waits for usable settings.", sentence(&e)))
    });
    let failed = move || match stack.search.get() {
        SearchState::Failed(t) => Some(t),
        _ => range_problem.get().or_else(|| ctx.error_of(Control::Optimize)),
    };
    view! {
        <section class="panel-section search-section" aria-labelledby="search-h">
            <h2 id="search-h">"Best gaps"</h2>
            <p class="hint">{what}</p>
            <div class="plot-tools search-range">
                {range_input(ctx, "search-from", Control::Optimize, "from", "eV", from, |s, v| s.stack.optimize.from_ev = v, bad)}
                {range_input(ctx, "search-to", Control::Optimize, "to", "eV", to, |s, v| s.stack.optimize.to_ev = v, bad)}
            </div>
            {fixed_gap_control(stack)}
            <div class="search-row">
                <button type="button" class="action" data-action="optimize" disabled=move || running() || range_problem.get().is_some() || ctx.error_of(Control::Optimize).is_some() on:click=move |_| start(stack)>
                    {move || if running() { "Optimizing…" } else { "Optimize the gaps" }}
                </button>
                <button type="button" class="small" data-action="cancel-optimize" hidden=move || !running() on:click=move |_| cancel(stack)>"Cancel"</button>
            </div>
            <div class="search-progress" data-progress="optimize" role="status" aria-live="polite" hidden=move || !running()>
                <div class="search-bar" aria-hidden="true"><span></span></div>
                <span class="search-count">{progress}</span>
            </div>
            <p class="search-result" data-info="optimize" role="status" aria-live="polite" hidden=move || outcome().is_none()>{outcome}</p>
            <p class="field-error" id="e-optimize" data-error=Control::Optimize.as_str() aria-live="polite">{failed}</p>
        </section>
    }
}
