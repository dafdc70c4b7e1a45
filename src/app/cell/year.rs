//! The Solar cell tab's year view under the clear-sky light: the cell's clear-sky year
//! ([`crate::view::place::year_view`]) computed in the background worker
//! (`app::widgets::worker`, entry point [`glowgap_year`]) with the days done shown as
//! progress, then its figures and the year's electric energy against band gap.

use std::cell::RefCell;

use leptos::prelude::*;
use wasm_bindgen::prelude::*;

use crate::app::state::{sentence, Ctx};
use crate::app::widgets::worker::{Background, WorkerReply};
use crate::scenario::SourceSpec;
use crate::view::format::fixed;
use crate::view::place::{year_svg, year_view, YearView, H, W};

/// Entry point for the background worker: `job` is the scenario document
/// (`codec::to_json`); `progress(n)` gets the days done. Returns JSON, `{"Ok": year}` or
/// `{"Err": text}`.
#[wasm_bindgen]
pub fn glowgap_year(job: &str, _text: &str, progress: &js_sys::Function) -> String {
    let run = || -> Result<YearView, String> {
        let s = crate::codec::from_json(job).map_err(|e| e.0)?;
        let SourceSpec::ClearSky(c) = &s.cell.spectrum else {
            return Err("the cell's light is not a place and time".into());
        };
        year_view(c, &s.cell, &mut |d, _| {
            let _ = progress.call1(&JsValue::NULL, &JsValue::from_f64(d as f64));
        })
    };
    serde_json::to_string(&run()).unwrap_or_else(|_| "{\"Err\":\"the answer could not be written\"}".into())
}

/// Where the year view stands.
#[derive(Clone, PartialEq)]
enum YearState {
    Idle,
    Running(usize),
    Done(Box<YearView>),
    Failed(String),
}

thread_local! {
    static WORKER: RefCell<Option<Background>> = const { RefCell::new(None) };
}

fn stop() {
    WORKER.with(|w| {
        if let Some(b) = w.borrow_mut().take() {
            b.stop();
        }
    });
}

/// The year card: a button that starts the computation, its progress, then the figures and
/// the chart. A result stays until the scenario's cell or place changes.
pub fn year_card(ctx: Ctx) -> impl IntoView {
    let state = RwSignal::new(YearState::Idle);
    // a new cell, place or date makes the shown year stale
    let key = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.cell.spectrum {
            SourceSpec::ClearSky(c) => {
                let year = c.when().map(|t| t.year).unwrap_or(0);
                Some((
                    c.place.clone(),
                    year,
                    crate::scenario::CellScenario { spectrum: SourceSpec::Am15g, ..s.cell.clone() },
                ))
            }
            _ => None,
        })
    });
    Effect::new(move |prev: Option<()>| {
        key.track();
        if prev.is_some() {
            stop();
            state.set(YearState::Idle);
        }
    });
    on_cleanup(stop);
    let start = move |_| {
        stop();
        let job = ctx.scenario.with_untracked(crate::codec::to_json);
        let started = Background::start(
            move |m: WorkerReply| {
                if let Some(n) = m.progress {
                    state.set(YearState::Running(n as usize));
                } else if let Some(r) = m.reply {
                    stop();
                    state.set(match serde_json::from_str::<Result<YearView, String>>(&r) {
                        Ok(Ok(y)) => YearState::Done(Box::new(y)),
                        Ok(Err(e)) => YearState::Failed(sentence(&e)),
                        Err(_) => YearState::Failed("The year's answer could not be read.".into()),
                    });
                } else if let Some(f) = m.failed {
                    stop();
                    state.set(YearState::Failed(format!("The year could not be computed: {f}.")));
                }
            },
            move |msg| {
                state.set(YearState::Failed(format!(
                    "The background worker failed{}.",
                    if msg.is_empty() { String::new() } else { format!(" ({msg})") }
                )));
            },
        );
        match started {
            Ok(w) if w.post(1, "glowgap_year", &job, "") => {
                WORKER.with(|c| *c.borrow_mut() = Some(w));
                state.set(YearState::Running(0));
            }
            Ok(w) => {
                w.stop();
                state.set(YearState::Failed("The background worker did not take the job.".into()));
            }
            Err(e) => state.set(YearState::Failed(sentence(&e))),
        }
    };
    let running = move || matches!(state.get(), YearState::Running(_));
    let status = move || match state.get() {
        YearState::Idle => {
            "A clear-sky year at 15-minute steps, computed in the background (a few seconds).".to_string()
        }
        YearState::Running(d) => format!("Computing: day {d} of the year…"),
        YearState::Done(_) => String::new(),
        YearState::Failed(e) => e,
    };
    let figures = move || {
        match state.get() {
        YearState::Done(y) => format!(
            "The year {} (clear sky, no clouds, one sun): incident {} kWh/m² on the plane, electric {} kWh/m² at {} eV, energy efficiency {} %. The most energy comes at {} eV ({} kWh/m²); the AM1.5G optimum, {} eV, gives {} kWh/m².",
            y.year,
            fixed(y.incident_kwh_m2, 0),
            fixed(y.electric_kwh_m2, 0),
            fixed(y.gap_ev, 3),
            fixed(100.0 * y.energy_efficiency(), 1),
            fixed(y.best_gap_ev, 3),
            fixed(y.best_kwh_m2, 1),
            fixed(y.am15_gap_ev, 3),
            fixed(y.am15_kwh_m2, 1)
        ),
        _ => String::new(),
    }
    };
    let svg = move || match state.get() {
        YearState::Done(y) => Some(year_svg(&y)),
        _ => None,
    };
    view! {
        <section class="plot-card day-card" data-card="year" aria-labelledby="year-h">
            <div class="plot-head">
                <h3 id="year-h">"The cell through the year"</h3>
                <button type="button" class="small" data-action="year" on:click=start disabled=running>"Compute the year"</button>
            </div>
            <p class="day-readout" data-readout="year-status" role="status">{status}</p>
            <div hidden=move || svg().is_none()>
                <div class="legend">
                    <span class="key"><i class="k-line k-day-power"></i>"electric energy over the year against band gap (kWh/m²)"</span>
                    <span class="key"><i class="k-line k-year-best"></i>"most energy"</span>
                    <span class="key"><i class="k-line k-year-am15"></i>"AM1.5G optimum"</span>
                    <span class="key"><i class="k-line k-day-marker"></i>"this cell"</span>
                </div>
                <svg class="day-chart" data-plot="year" viewBox=format!("0 0 {W} {H}") role="img" aria-label="Electric energy over the year against band gap">
                    <g inner_html=move || svg().unwrap_or_default()></g>
                </svg>
            </div>
            <p class="day-totals" data-readout="year">{figures}</p>
        </section>
    }
}
