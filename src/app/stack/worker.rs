//! The gap search as it runs inside a background worker: the worker loads this same module,
//! calls [`glowgap_stack_search`] with the scenario, and posts the progress and the answer
//! back to the page. The search is the one `glowgap optimize` runs, started from the
//! current design as well, so its answer is never worse than the design.

use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use crate::physics::constants::{ev, to_ev};
use crate::physics::stack::optimize::{optimize_observed, FixAt};
use crate::scenario::stack::{OptimizeSettings, StackScenario};

/// The search's answer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SearchReply {
    /// the best gaps [eV], top first
    pub gaps_ev: Vec<f64>,
    /// fraction
    pub efficiency: f64,
    pub evaluations: u64,
    /// the searched range [eV]
    pub from_ev: f64,
    pub to_ev: f64,
}

/// Search the best gaps for the stack of the scenario document `job` (its number of
/// junctions and connection, the optimizer's range and fixed gap), telling `progress` the
/// number of stacks evaluated so far.
pub fn run(job: &str, progress: &mut dyn FnMut(u64)) -> Result<SearchReply, String> {
    let s = crate::codec::from_json(job).map_err(|e| e.0)?;
    let n = s.stack.gaps_ev.len();
    let (st, settings) = search_settings(&s.stack);
    let setup = st.to_physics(&s.cell)?;
    let mut problem = st.problem(&setup)?;
    let mut seed: Vec<f64> = s.stack.gaps_ev.iter().map(|g| ev(*g)).collect();
    if let Some(f) = problem.fixed {
        // the fixed gap is not a free variable: drop the design's gap in its place (top or
        // bottom), or the one nearest to it
        let nearest = (0..seed.len()).min_by(|&a, &b| (seed[a] - f.gap_j).abs().total_cmp(&(seed[b] - f.gap_j).abs()));
        let place = match f.at {
            FixAt::Top => Some(0),
            FixAt::Bottom => seed.len().checked_sub(1),
            FixAt::Any => nearest,
        };
        if let Some(i) = place {
            seed.remove(i);
        }
    }
    problem.seeds.push(seed);
    let best = optimize_observed(&problem, progress);
    if best.gaps_j.len() != n {
        return Err("the search found no usable stack; widen the search range".into());
    }
    // the fixed gap as given, not through J and back
    let fixed = problem.fixed.map(|f| f.gap_j);
    let gaps_ev = best
        .gaps_j
        .iter()
        .map(|g| if Some(*g) == fixed { settings.fix_ev.unwrap_or(to_ev(*g)) } else { to_ev(*g) })
        .collect();
    Ok(SearchReply {
        gaps_ev,
        efficiency: best.efficiency,
        evaluations: best.evaluations,
        from_ev: settings.from_ev,
        to_ev: settings.to_ev,
    })
}

/// The stack as searched: the optimizer's junctions are the design's (the step gaps, and the
/// real bottom cell when there is one), the rest of its settings the scenario's.
pub fn search_settings(st: &StackScenario) -> (StackScenario, OptimizeSettings) {
    let junctions = st.gaps_ev.len() + usize::from(st.bottom.is_some());
    let settings = OptimizeSettings { junctions, ..st.optimize.clone() };
    (StackScenario { optimize: settings.clone(), ..st.clone() }, settings)
}

/// Entry point for the background worker (`app::widgets::worker`): `job` is a scenario
/// document (`_text` is unused); `progress(n)` is called with the number of stacks evaluated
/// so far. Returns JSON, `{"Ok": reply}` or `{"Err": text}`.
#[wasm_bindgen]
pub fn glowgap_stack_search(job: &str, _text: &str, progress: &js_sys::Function) -> String {
    let mut tell = |n: u64| {
        let _ = progress.call1(&JsValue::NULL, &JsValue::from_f64(n as f64));
    };
    serde_json::to_string(&run(job, &mut tell))
        .unwrap_or_else(|_| "{\"Err\":\"the answer could not be written\"}".into())
}

/// Entry point posted shortly after the page's first render (and when the Stack panel
/// opens): the worker loads the module, then runs a two- and a three-junction search of the
/// default scenario, the search's own code from the scenario text to the answer, so that the
/// browser's optimizing compiler has the hot functions before the first real search (without
/// it, measured in Node, a cold 3-junction search took 39 ms and the next ones 18 ms). It
/// runs in the background, on another core; returns the efficiencies found.
#[wasm_bindgen]
pub fn glowgap_stack_warm(_job: &str, _text: &str, _progress: &js_sys::Function) -> String {
    let mut found = Vec::new();
    for gaps in [vec![1.63, 0.96], vec![1.9, 1.37, 0.96]] {
        let mut s = crate::scenario::Scenario::default();
        s.stack.optimize.junctions = gaps.len();
        s.stack.gaps_ev = gaps;
        found.push(run(&crate::codec::to_json(&s), &mut |_| {}).map(|r| r.efficiency).unwrap_or(0.0));
    }
    format!("{found:?}")
}
