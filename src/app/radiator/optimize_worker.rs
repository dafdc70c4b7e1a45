//! The film thickness search as it runs inside the background worker
//! (`app::widgets::worker`): the worker loads this same module, calls
//! [`glowgap_film_search`] with the radiator scenario, the target and the largest thickness,
//! and posts the progress and the answer back to the page. The search is the one
//! `glowgap film --optimize` runs, started from the current thicknesses as well, so on its
//! grid the answer is never worse than the stack it started from.

use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

use crate::scenario::radiator::{EmitterSpec, FilmGoal, RadiatorScenario};

/// What the page asks for.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FilmJob {
    /// the whole scenario document (`codec::to_json`), so the worker reads it exactly as a
    /// link would be read
    pub scenario: String,
    pub goal: FilmGoal,
    /// largest thickness of a searched layer [nm]
    pub max_nm: f64,
}

/// The search's answer.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FilmReply {
    /// every layer's thickness [nm], top first (as the scenario stores them, to 0.01 nm)
    pub thickness_nm: Vec<f64>,
    /// the target's value on the search grid for the layers found and for the starting
    /// stack: W/m² (net power), K (steady temperature) or the rms emissivity difference
    pub value: f64,
    pub start_value: f64,
    pub evaluations: u64,
    /// how many thicknesses were searched, and the search grid's wavelengths
    pub variables: usize,
    pub wavelengths: usize,
}

/// Search the thicknesses for the job `job` (a [`FilmJob`] as JSON), telling `progress` the
/// number of stacks evaluated so far.
pub fn run(job: &str, progress: &mut dyn FnMut(u64)) -> Result<FilmReply, String> {
    let job: FilmJob = serde_json::from_str(job).map_err(|_| "the search was asked in a form it cannot read")?;
    let s = crate::codec::from_json(&job.scenario).map_err(|e| e.0)?;
    let r: &RadiatorScenario = &s.radiator;
    let (design, start) = r.film_design(&job.goal, job.max_nm)?;
    let start_value = design.value(&start);
    let found = design.run(&start, job.max_nm * 1e-9, Some(progress));
    let best = r.with_film_thicknesses(&found.thickness_m);
    let EmitterSpec::Film { layers, .. } = &best.emitter else {
        return Err("the emitter is no longer a layer stack".into());
    };
    Ok(FilmReply {
        thickness_nm: layers.iter().map(|l| l.thickness_nm).collect(),
        value: found.value,
        start_value,
        evaluations: found.evaluations,
        variables: design.variables(),
        wavelengths: design.wavelengths(),
    })
}

/// Entry point for the background worker: `job` is a [`FilmJob`] as JSON (`_text` is
/// unused); `progress(n)` is called with the number of stacks evaluated so far. Returns
/// JSON, `{"Ok": reply}` or `{"Err": text}`.
#[wasm_bindgen]
pub fn glowgap_film_search(job: &str, _text: &str, progress: &js_sys::Function) -> String {
    let mut tell = |n: u64| {
        let _ = progress.call1(&JsValue::NULL, &JsValue::from_f64(n as f64));
    };
    serde_json::to_string(&run(job, &mut tell))
        .unwrap_or_else(|_| "{\"Err\":\"the answer could not be written\"}".into())
}

/// Entry point posted when the layers are first shown: the worker loads the module, then
/// judges the default stack a few times on its search grid, so that the browser's
/// optimizing compiler has the hot functions (the layer optics) before the first real
/// search. It runs in the background, on another core; returns the values found.
#[wasm_bindgen]
pub fn glowgap_film_warm(_job: &str, _text: &str, _progress: &js_sys::Function) -> String {
    let (layers, substrate) = crate::view::radiator::film::default_stack();
    let r = RadiatorScenario { emitter: EmitterSpec::Film { layers, substrate }, ..Default::default() };
    match r.film_design(&FilmGoal::NetPower, 2000.0) {
        Ok((design, start)) => {
            let mut x = start;
            let mut found = Vec::new();
            for k in 0..4 {
                if let Some(v) = x.first_mut() {
                    *v += 10e-9 * k as f64;
                }
                found.push(design.value(&x));
            }
            format!("{found:?}")
        }
        Err(e) => e,
    }
}
