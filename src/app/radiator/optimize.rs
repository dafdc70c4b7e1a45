//! "Optimize thicknesses": the film thickness search under the layer table. It runs in the
//! page's background worker (`app::widgets::worker`, entry point
//! [`super::optimize_worker::glowgap_film_search`]), so the page keeps drawing; the worker
//! reports how many stacks it has evaluated, and "Cancel" ends it at once. The answer
//! becomes the stack through [`Ctx::edit`] (so the link holds it), unless the radiator
//! changed meanwhile; the thicknesses before it are kept for "Revert".
//!
//! The search uses everything of the radiator scenario: sky, sun, ambient air and the
//! convection coefficient. It judges stacks on a coarse grid; the figures shown after the
//! answer is applied are the full evaluation.

use std::cell::{Cell, RefCell};

use leptos::ev;
use leptos::prelude::*;

use super::optimize_worker::{FilmJob, FilmReply};
use super::RadiatorState;
use crate::app::state::{mark, sentence};
use crate::app::widgets::worker::{Background, WorkerReply};
use crate::report::radiator::RadiatorMetric;
use crate::scenario::film::{LayerSpec, MaterialSpec};
use crate::scenario::radiator::{EmitterSpec, FilmGoal, RadiatorScenario, SEARCH_MAX_THICKNESS_NM};
use crate::view::controls::Control;
use crate::view::format::{field, fixed};
use crate::view::input::{parse_number, thousands};

/// Largest thickness offered first [nm].
pub const DEFAULT_MAX_NM: f64 = 2000.0;
/// The target emissivity offered first (the atmosphere's main window).
pub const DEFAULT_TARGET_PROFILE: &str = "window:8-13";

/// What the search aims for, as the target list offers it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum TargetKind {
    #[default]
    NetPower,
    Steady,
    Spectrum,
}

impl TargetKind {
    fn key(self) -> &'static str {
        match self {
            TargetKind::NetPower => "net-power",
            TargetKind::Steady => "steady",
            TargetKind::Spectrum => "spectrum",
        }
    }

    fn of_key(k: &str) -> TargetKind {
        match k {
            "steady" => TargetKind::Steady,
            "spectrum" => TargetKind::Spectrum,
            _ => TargetKind::NetPower,
        }
    }
}

/// One layer of an answer: material, thickness before and found [nm].
#[derive(Debug, Clone, PartialEq)]
pub struct FoundRow {
    pub material: String,
    pub before_nm: f64,
    pub after_nm: f64,
}

/// An answer as the page shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    pub summary: String,
    pub rows: Vec<FoundRow>,
    /// wall time from Start to the answer [ms]
    pub elapsed_ms: f64,
    pub evaluations: u64,
    pub variables: usize,
}

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
    Done(Outcome),
    Failed(String),
    Cancelled,
    Reverted,
}

impl SearchState {
    pub fn running(&self) -> bool {
        matches!(self, SearchState::Running { .. })
    }
}

/// The optimizer's settings and state (kept while another tab is in front).
#[derive(Clone, Copy)]
pub struct OptimizeState {
    pub search: RwSignal<SearchState>,
    pub target: RwSignal<TargetKind>,
    /// the target emissivity as typed (e.g. window:8-13)
    pub profile_text: RwSignal<String>,
    /// the largest thickness as typed [nm]
    pub max_text: RwSignal<String>,
    /// the layers before the last answer was applied, and the layers applied
    pub revert: RwSignal<Option<(Vec<LayerSpec>, Vec<LayerSpec>)>>,
}

impl OptimizeState {
    pub fn new() -> OptimizeState {
        OptimizeState {
            search: RwSignal::new(SearchState::Idle),
            target: RwSignal::new(TargetKind::NetPower),
            profile_text: RwSignal::new(DEFAULT_TARGET_PROFILE.into()),
            max_text: RwSignal::new(field(DEFAULT_MAX_NM, 6)),
            revert: RwSignal::new(None),
        }
    }
}

impl Default for OptimizeState {
    fn default() -> Self {
        OptimizeState::new()
    }
}

/// What a search was started for: its answer is used only if the radiator is unchanged.
struct Started {
    id: u64,
    radiator: RadiatorScenario,
    goal: FilmGoal,
    /// [nm]
    max_nm: f64,
}

struct Runner {
    worker: Background,
    job: Option<Started>,
}

thread_local! {
    static RUNNER: RefCell<Option<Runner>> = const { RefCell::new(None) };
    /// the radiator's state (made once for the page): the worker's replies go there
    static PANEL: Cell<Option<RadiatorState>> = const { Cell::new(None) };
    static LAST_ID: Cell<u64> = const { Cell::new(0) };
}

fn now() -> f64 {
    web_sys::window().and_then(|w| w.performance()).map(|p| p.now()).unwrap_or(0.0)
}

fn new_worker() -> Result<Runner, String> {
    let worker = Background::start(
        move |m| {
            if let Some(rad) = PANEL.with(|p| p.get()) {
                on_message(rad, m)
            }
        },
        move |msg| {
            let text = format!(
                "The thickness search stopped: the background worker failed{}.",
                if msg.is_empty() { String::new() } else { format!(" ({msg})") }
            );
            match PANEL.with(|p| p.get()) {
                Some(rad) => fail(rad, text),
                None => stop(),
            }
        },
    )?;
    Ok(Runner { worker, job: None })
}

fn fail(rad: RadiatorState, text: String) {
    stop();
    rad.film.optimize.search.try_set(SearchState::Failed(text));
}

/// End the worker, if any (cancel, or a failure).
fn stop() {
    if let Some(r) = RUNNER.with(|r| r.borrow_mut().take()) {
        r.worker.stop();
    }
}

/// Start the worker while the layers are shown, so that it has loaded the module (and run
/// the search's inner loops a few times) before the first search is asked for.
fn prestart(rad: RadiatorState) {
    PANEL.with(|p| p.set(Some(rad)));
    if RUNNER.with(|r| r.borrow().is_some()) {
        return;
    }
    if let Ok(r) = new_worker() {
        // id 0 is never a search's id, so its answer is ignored
        if r.worker.post(0, "glowgap_film_warm", "", "") {
            RUNNER.with(|x| *x.borrow_mut() = Some(r));
        }
    }
}

fn on_message(rad: RadiatorState, m: WorkerReply) {
    let opt = rad.film.optimize;
    let current = RUNNER.with(|r| r.borrow().as_ref().and_then(|r| r.job.as_ref().map(|j| j.id)));
    if current != Some(m.id) {
        return;
    }
    if let Some(n) = m.progress {
        if let Some(SearchState::Running { started, .. }) = opt.search.try_get_untracked() {
            opt.search.try_set(SearchState::Running { evaluations: n as u64, started, elapsed: now() - started });
        }
        return;
    }
    let job = RUNNER.with(|r| r.borrow_mut().as_mut().and_then(|r| r.job.take()));
    let Some(job) = job else { return };
    let elapsed = match opt.search.try_get_untracked() {
        Some(SearchState::Running { started, .. }) => now() - started,
        _ => 0.0,
    };
    if let Some(f) = m.failed {
        fail(rad, format!("The thickness search stopped: {}", sentence(&f)));
        return;
    }
    let reply: Result<FilmReply, String> = match m.reply.as_deref().map(serde_json::from_str) {
        Some(Ok(r)) => r,
        _ => Err("the background worker gave no readable answer".into()),
    };
    match reply {
        Err(e) => {
            opt.search.try_set(SearchState::Failed(format!("The thickness search stopped: {}", sentence(&e))));
        }
        Ok(r) => apply(rad, job, r, elapsed),
    }
}

/// The search value in words, with its unit.
fn value_words(goal: &FilmGoal, v: f64) -> String {
    match goal {
        FilmGoal::NetPower => format!("net cooling power at ambient {}", value_short(goal, v)),
        FilmGoal::Steady => format!("steady temperature {}", value_short(goal, v)),
        FilmGoal::Spectrum { profile } => {
            format!("rms emissivity difference from {} {}", profile.label(), value_short(goal, v))
        }
    }
}

/// The search value with its unit only.
fn value_short(goal: &FilmGoal, v: f64) -> String {
    match goal {
        FilmGoal::NetPower => format!("{} W/m²", fixed(v, 1)),
        FilmGoal::Steady => format!("{} K", fixed(v, 1)),
        FilmGoal::Spectrum { .. } => fixed(v, 4),
    }
}

fn time_words(ms: f64) -> String {
    if ms < 1000.0 {
        format!("{} ms", fixed(ms.max(1.0), 0))
    } else {
        format!("{} s", fixed(ms / 1000.0, 2))
    }
}

/// Make the answer the stack, if the radiator is still the one searched.
fn apply(rad: RadiatorState, job: Started, r: FilmReply, elapsed: f64) {
    let ctx = rad.ctx;
    let opt = rad.film.optimize;
    let still = ctx.scenario.try_with_untracked(|s| s.radiator == job.radiator).unwrap_or(false)
        && rad.film.draft.try_with_untracked(|d| d.is_none()).unwrap_or(false);
    if !still {
        opt.search.try_set(SearchState::Failed(
            "The layers, the sky, the sun or the air changed during the search, so its answer was not used; run it again."
                .into(),
        ));
        return;
    }
    let EmitterSpec::Film { layers, substrate } = &job.radiator.emitter else { return };
    if r.thickness_nm.len() != layers.len() {
        opt.search.try_set(SearchState::Failed(
            "The search's answer does not fit the stack's layers, so it was not used; run it again.".into(),
        ));
        return;
    }
    let mut found = layers.clone();
    for (l, d) in found.iter_mut().zip(&r.thickness_nm) {
        l.thickness_nm = *d;
    }
    let (next, sub): (Vec<LayerSpec>, MaterialSpec) = (found.clone(), substrate.clone());
    if !ctx
        .edit(Control::FilmOptimize, move |s| s.radiator.emitter = EmitterSpec::Film { layers: next, substrate: sub })
    {
        // the reason is under the button
        opt.search.try_set(SearchState::Idle);
        return;
    }
    rad.film.row_error.try_set(None);
    mark("gg-film-search-done");
    opt.revert.try_set(Some((layers.clone(), found.clone())));
    let rows: Vec<FoundRow> = layers
        .iter()
        .zip(&found)
        .map(|(a, b)| FoundRow { material: a.material.text(), before_nm: a.thickness_nm, after_nm: b.thickness_nm })
        .collect();
    let at_bound = found.iter().filter(|l| l.thickness_nm >= job.max_nm - 0.005).count();
    let bound = match at_bound {
        0 => String::new(),
        1 => " One layer reached the largest thickness; a larger one may do better.".into(),
        n => format!(" {n} layers reached the largest thickness; a larger one may do better."),
    };
    let summary = format!(
        "Applied. On the search's coarse grid: {} ({} before). {} of {} layers searched; {} stacks evaluated in {}.{bound}",
        value_words(&job.goal, r.value),
        value_short(&job.goal, r.start_value),
        r.variables,
        layers.len(),
        thousands(r.evaluations as f64),
        time_words(elapsed),
    );
    opt.search.try_set(SearchState::Done(Outcome {
        summary,
        rows,
        elapsed_ms: elapsed,
        evaluations: r.evaluations,
        variables: r.variables,
    }));
}

/// The target as chosen, or the reason it cannot be used (shown under the target field).
fn goal_of(opt: OptimizeState) -> Result<FilmGoal, String> {
    match opt.target.get_untracked() {
        TargetKind::NetPower => Ok(FilmGoal::NetPower),
        TargetKind::Steady => Ok(FilmGoal::Steady),
        TargetKind::Spectrum => opt.profile_text.with_untracked(|t| parse_profile(t)),
    }
}

/// A typed target emissivity: a profile as the command line writes it.
fn parse_profile(text: &str) -> Result<FilmGoal, String> {
    let t = text.trim();
    if t.is_empty() {
        return Err("Target emissivity: type a profile, e.g. window:8-13 (1 from 8 to 13 µm, 0 elsewhere).".into());
    }
    if t.get(..5).is_some_and(|p| p.eq_ignore_ascii_case("file:")) {
        return Err("Target emissivity: the page cannot read a file named here; type a profile such as window:8-13 or grey:0.9.".into());
    }
    let goal = FilmGoal::parse(&format!("spectrum:{t}")).map_err(|e| format!("Target emissivity: {}", sentence(&e)))?;
    if let FilmGoal::Spectrum { profile } = &goal {
        profile.to_profile().map_err(|e| format!("Target emissivity: {}", sentence(&e)))?;
    }
    Ok(goal)
}

/// A typed largest thickness [nm], or the reason it cannot be used.
fn parse_max(text: &str) -> Result<f64, String> {
    let (lo, hi) = SEARCH_MAX_THICKNESS_NM;
    let Some(v) = parse_number(text) else {
        return Err(format!(
            "Largest thickness: '{}' is not a number; type a thickness in nm from {} to {}, e.g. 2000.",
            text.trim(),
            field(lo, 6),
            field(hi, 6)
        ));
    };
    // the scenario's message names the field ("The largest thickness ... nm is out of range")
    crate::scenario::check_range("largest thickness", v, lo, hi, "nm", "e.g. 2000").map_err(|e| sentence(&e))?;
    Ok(v)
}

/// Start a search of the current stack.
pub fn start(rad: RadiatorState) {
    let ctx = rad.ctx;
    let opt = rad.film.optimize;
    if opt.search.with_untracked(|s| s.running()) {
        return;
    }
    ctx.clear_error(Control::FilmOptimize);
    let goal = match goal_of(opt) {
        Ok(g) => g,
        Err(e) => {
            ctx.set_error(Control::FilmTargetProfile, e);
            return;
        }
    };
    let max_nm = match opt.max_text.with_untracked(|t| parse_max(t)) {
        Ok(v) => v,
        Err(e) => {
            ctx.set_error(Control::FilmMaxThickness, e);
            return;
        }
    };
    // a drag still held is committed first, so the search starts from what is shown
    if rad.film.draft.with_untracked(|d| d.is_some()) {
        ctx.set_error(Control::FilmOptimize, "Finish the drag on the stack first, then start the search.".into());
        return;
    }
    let s = ctx.scenario.get_untracked();
    match &s.radiator.emitter {
        EmitterSpec::Film { layers, .. } if !layers.is_empty() => {}
        _ => {
            ctx.set_error(Control::FilmOptimize, "The stack has no layers to search; add a layer first.".into());
            return;
        }
    }
    PANEL.with(|p| p.set(Some(rad)));
    if RUNNER.with(|r| r.borrow().is_none()) {
        match new_worker() {
            Ok(r) => RUNNER.with(|x| *x.borrow_mut() = Some(r)),
            Err(e) => {
                opt.search.set(SearchState::Failed(sentence(&e)));
                return;
            }
        }
    }
    let id = LAST_ID.with(|c| {
        c.set(c.get() + 1);
        c.get()
    });
    let job = FilmJob { scenario: crate::codec::to_json(&s), goal: goal.clone(), max_nm };
    let Ok(job_text) = serde_json::to_string(&job) else {
        fail(rad, "The search could not be written for the background worker.".into());
        return;
    };
    let posted = RUNNER.with(|r| {
        let mut r = r.borrow_mut();
        let r = r.as_mut()?;
        r.job = Some(Started { id, radiator: s.radiator.clone(), goal, max_nm });
        Some(r.worker.post(id, "glowgap_film_search", &job_text, ""))
    });
    if posted != Some(true) {
        fail(rad, "The search could not be handed to the background worker.".into());
        return;
    }
    mark("gg-film-search-start");
    opt.search.set(SearchState::Running { evaluations: 0, started: now(), elapsed: 0.0 });
}

/// Cancel a running search: the worker ends at once and the stack stays as it is.
pub fn cancel(rad: RadiatorState) {
    let opt = rad.film.optimize;
    if opt.search.with_untracked(|s| s.running()) {
        stop();
        opt.search.set(SearchState::Cancelled);
    }
}

/// Put back the thicknesses the last answer replaced (if the stack is still that answer).
fn revert(rad: RadiatorState) {
    let ctx = rad.ctx;
    let opt = rad.film.optimize;
    let Some((before, applied)) = opt.revert.get_untracked() else { return };
    let Some(substrate) = ctx.scenario.with_untracked(|s| match &s.radiator.emitter {
        EmitterSpec::Film { layers, substrate } if *layers == applied => Some(substrate.clone()),
        _ => None,
    }) else {
        return;
    };
    if ctx.edit(Control::FilmOptimize, move |s| s.radiator.emitter = EmitterSpec::Film { layers: before, substrate }) {
        opt.revert.set(None);
        opt.search.set(SearchState::Reverted);
    }
}

/// The "Optimize thicknesses" group under the layer table.
pub fn optimize_group(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let opt = rad.film.optimize;
    let is_film = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Film { .. })));
    // the worker loads the module while the user looks at the stack
    Effect::new(move |_| {
        if is_film.get() {
            prestart(rad);
        }
    });
    let running = move || opt.search.with(|s| s.running());
    let layers_now = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.radiator.emitter {
            EmitterSpec::Film { layers, .. } => Some(layers.clone()),
            _ => None,
        })
    });
    let can_revert = move || {
        let now = layers_now.get();
        opt.revert.with(|r| r.as_ref().is_some_and(|(_, applied)| now.as_ref() == Some(applied)))
    };
    let on_target = move |e: ev::Event| {
        let k = TargetKind::of_key(&event_target_value(&e));
        opt.target.set(k);
        if k != TargetKind::Spectrum {
            ctx.clear_error(Control::FilmTargetProfile);
        } else if let Err(m) = opt.profile_text.with_untracked(|t| parse_profile(t)) {
            ctx.set_error(Control::FilmTargetProfile, m);
        }
    };
    let on_profile = move |e: ev::Event| {
        let t = event_target_value(&e);
        match parse_profile(&t) {
            Ok(_) => ctx.clear_error(Control::FilmTargetProfile),
            Err(m) => ctx.set_error(Control::FilmTargetProfile, m),
        }
        opt.profile_text.set(t);
    };
    let on_max = move |e: ev::Event| {
        let t = event_target_value(&e);
        match parse_max(&t) {
            Ok(_) => ctx.clear_error(Control::FilmMaxThickness),
            Err(m) => ctx.set_error(Control::FilmMaxThickness, m),
        }
        opt.max_text.set(t);
    };
    let spectrum = move || opt.target.get() == TargetKind::Spectrum;
    let target_key = move || opt.target.get().key();
    let option = move |k: TargetKind, text: &'static str| {
        view! { <option value=k.key() prop:selected=move || target_key() == k.key()>{text}</option> }
    };
    let progress = move || match opt.search.get() {
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
    let outcome = move || match opt.search.get() {
        SearchState::Done(o) => Some(o),
        _ => None,
    };
    let message = move || match opt.search.get() {
        SearchState::Cancelled => Some("Search cancelled; the layers are unchanged.".to_string()),
        SearchState::Reverted => Some("The thicknesses from before the search are back.".to_string()),
        _ => None,
    };
    let failed = move || match opt.search.get() {
        SearchState::Failed(t) => Some(t),
        _ => ctx.error_of(Control::FilmOptimize),
    };
    // the full evaluation of the layers applied, while they are the stack shown
    let full = move || {
        let applied = opt.revert.with(|r| r.as_ref().map(|(_, a)| a.clone()))?;
        rad.computed.with(|c| {
            let c = c.as_ref()?;
            let same = matches!(&c.scenario.emitter, EmitterSpec::Film { layers, .. } if *layers == applied);
            same.then(|| {
                format!(
                    "Full evaluation of the layers applied (the figures at the top): net cooling power {}, steady temperature {}.",
                    c.report.display(RadiatorMetric::NetPower),
                    c.report.display(RadiatorMetric::SteadyTemp)
                )
            })
        })
    };
    let result = move || {
        outcome().map(|o| {
            let rows = o
                .rows
                .iter()
                .enumerate()
                .map(|(i, r)| {
                    view! {
                        <tr>
                            <th scope="row">{i + 1}</th>
                            <td>{r.material.clone()}</td>
                            <td class="num">{field(r.before_nm, 6)}</td>
                            <td class="num" data-found=format!("layer-{}", i + 1)>{field(r.after_nm, 6)}</td>
                        </tr>
                    }
                })
                .collect_view();
            view! {
                <div
                    class="search-result film-found"
                    data-info="film-optimize"
                    data-ms=format!("{:.1}", o.elapsed_ms)
                    data-evaluations=o.evaluations.to_string()
                    data-variables=o.variables.to_string()
                    role="status"
                    aria-live="polite"
                >
                    <p>{o.summary.clone()}</p>
                    <p data-info="film-optimize-full">{full}</p>
                    <table class="film-found-table">
                        <caption class="visually-hidden">"Layers found by the thickness search"</caption>
                        <thead><tr><th scope="col">"#"</th><th scope="col">"Material"</th><th scope="col">"Before (nm)"</th><th scope="col">"Found (nm)"</th></tr></thead>
                        <tbody>{rows}</tbody>
                    </table>
                </div>
            }
        })
    };
    let profile_error = move || ctx.error_of(Control::FilmTargetProfile);
    let max_error = move || ctx.error_of(Control::FilmMaxThickness);
    let target_id = format!("f-{}", Control::FilmTarget);
    let profile_id = format!("f-{}", Control::FilmTargetProfile);
    let max_id = format!("f-{}", Control::FilmMaxThickness);
    view! {
        <section class="film-optimize" data-slot="optimize-thicknesses" aria-labelledby="film-optimize-h">
            <h3 id="film-optimize-h">"Optimize thicknesses"</h3>
            <p class="hint">"Searches the thickness of every layer (from 0 to the largest thickness) under the sky, sun, air temperature and convection set on the left, starting from the stack as it is. Materials and their order stay."</p>
            <div class="film-optimize-fields">
                <div class="field">
                    <label for=target_id.clone()>"Target"</label>
                    <select id=target_id data-control=Control::FilmTarget.as_str() on:change=on_target disabled=running>
                        {option(TargetKind::NetPower, "highest net cooling power at ambient (W/m²)")}
                        {option(TargetKind::Steady, "lowest steady temperature (K)")}
                        {option(TargetKind::Spectrum, "match a target emissivity")}
                    </select>
                </div>
                <div class="field" class:has-error=move || profile_error().is_some() hidden=move || !spectrum()>
                    <label for=profile_id.clone()>"Target emissivity"</label>
                    <div class="input-unit">
                        <input
                            id=profile_id
                            type="text"
                            autocomplete="off"
                            spellcheck="false"
                            data-control=Control::FilmTargetProfile.as_str()
                            aria-describedby=format!("e-{} h-{}", Control::FilmTargetProfile, Control::FilmTargetProfile)
                            aria-invalid=move || if profile_error().is_some() { "true" } else { "false" }
                            prop:value=move || opt.profile_text.get()
                            on:input=on_profile
                        />
                        <span class="unit">"µm, 0-1"</span>
                    </div>
                    <p class="hint" id=format!("h-{}", Control::FilmTargetProfile)>"Compared with the stack's emissivity at normal incidence. E.g. window:8-13 (1 from 8 to 13 µm, 0 elsewhere; add ,in=0.95,out=0.05), grey:0.9, or points:0.3=0.05,8=0.95 (µm=emissivity)."</p>
                    <p class="field-error" id=format!("e-{}", Control::FilmTargetProfile) data-error=Control::FilmTargetProfile.as_str() aria-live="polite">{profile_error}</p>
                </div>
                <div class="field" class:has-error=move || max_error().is_some()>
                    <label for=max_id.clone()>"Largest thickness"</label>
                    <div class="input-unit">
                        <input
                            id=max_id
                            type="text"
                            inputmode="decimal"
                            autocomplete="off"
                            spellcheck="false"
                            data-control=Control::FilmMaxThickness.as_str()
                            aria-describedby=format!("e-{}", Control::FilmMaxThickness)
                            aria-invalid=move || if max_error().is_some() { "true" } else { "false" }
                            prop:value=move || opt.max_text.get()
                            on:input=on_max
                        />
                        <span class="unit">"nm"</span>
                    </div>
                    <p class="field-error" id=format!("e-{}", Control::FilmMaxThickness) data-error=Control::FilmMaxThickness.as_str() aria-live="polite">{max_error}</p>
                </div>
            </div>
            <div class="search-row">
                <button type="button" class="action" data-action="film-optimize" disabled=running on:click=move |_| start(rad)>
                    {move || if running() { "Searching…" } else { "Start" }}
                </button>
                <button type="button" class="small" data-action="cancel-film-optimize" hidden=move || !running() on:click=move |_| cancel(rad)>"Cancel"</button>
                <button type="button" class="small" data-action="revert-film-optimize" hidden=move || !can_revert() on:click=move |_| revert(rad)>"Revert to the previous thicknesses"</button>
            </div>
            <div class="search-progress" data-progress="film-optimize" role="status" aria-live="polite" hidden=move || !running()>
                <div class="search-bar" aria-hidden="true"><span></span></div>
                <span class="search-count">{progress}</span>
            </div>
            {result}
            <p class="search-result" data-info="film-optimize-note" role="status" aria-live="polite" hidden=move || message().is_none()>{message}</p>
            <p class="field-error" id=format!("e-{}", Control::FilmOptimize) data-error=Control::FilmOptimize.as_str() aria-live="polite">{failed}</p>
            <p class="hint">"The search judges each stack on a coarse grid of wavelengths and directions so that it is quick; its value is therefore a little off. The figures at the top of the page are the full evaluation of the layers applied."</p>
        </section>
    }
}
