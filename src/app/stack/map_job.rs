//! Computing the two-junction map in the page: in slices of rows between turns of the
//! browser's event loop (each slice a few milliseconds), so the page stays responsive; a newer
//! request drops an older one. Once shown, its best few local maxima are each refined in a turn
//! of their own by the gap search's simplex, and the best of them marked as the optimum. The
//! map is recomputed only when the light, the cell settings, the connection or the map's axes
//! change, not when a gap moves.

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;
use std::time::Duration;

use leptos::prelude::*;

use crate::app::stack::StackState;
use crate::physics::constants::{ev, to_ev};
use crate::physics::stack::map::tandem_map;
use crate::physics::stack::mixed::{thickness_map, RealBottom};
use crate::physics::stack::optimize::{grid_maxima, refine, Optimum, Problem, POLISHED_STARTS};
use crate::physics::stack::Connection;
use crate::scenario::real::RealAbsorberSpec;
use crate::scenario::stack::MapSettings;
use crate::scenario::{CellScenario, CellSetup, Scenario};
use crate::view::cell::same_but_gap;
use crate::view::stack::map::{Grid, MapData, MapStatus};

/// Time one slice of the map may take before the page gets a turn [ms].
const SLICE_MS: f64 = 10.0;

/// What the map was computed for.
struct MapKey {
    cell: CellScenario,
    connection: Connection,
    settings: MapSettings,
    /// a real bottom cell (its thickness is the map's axis, so left out) and the coupling
    bottom: (Option<RealAbsorberSpec>, u64),
}

/// The real bottom cell of `s` without its thickness, and the coupling's bits.
fn bottom_key(s: &Scenario) -> (Option<RealAbsorberSpec>, u64) {
    let b = s.stack.bottom.as_ref().map(|b| RealAbsorberSpec { thickness_um: 1.0, ..b.clone() });
    (b, s.stack.luminescent_coupling.to_bits())
}

impl MapKey {
    fn matches(&self, s: &Scenario) -> bool {
        same_but_gap(&self.cell, &s.cell)
            && self.connection == s.stack.connection.to_physics()
            && self.settings == s.stack.map
            && self.bottom == bottom_key(s)
    }
}

/// A map being computed.
struct Job {
    id: u64,
    key: MapKey,
    setup: Arc<CellSetup>,
    tops_j: Vec<f64>,
    /// bottom gaps [J], or the bottom cell's thicknesses [m] on a thickness map
    bottoms_j: Vec<f64>,
    /// the real bottom cell and coupling of a thickness map
    real: Option<(RealBottom, f64)>,
    eff: Vec<f64>,
    /// next row to compute
    next: usize,
    /// rows per call of the map routine (adapted to keep a call near 3 ms)
    rows: usize,
    started: f64,
    busy: f64,
}

#[derive(Default)]
struct Maps {
    /// the last map computed, what it was for and its light and cells
    done: Option<(MapKey, Arc<MapData>, Arc<CellSetup>)>,
    job: Option<Job>,
    last_id: u64,
}

thread_local! {
    static MAPS: RefCell<Maps> = RefCell::new(Maps::default());
}

fn now() -> f64 {
    web_sys::window().and_then(|w| w.performance()).map(|p| p.now()).unwrap_or(0.0)
}

/// Make sure the map of `s` is shown or being computed.
pub fn ensure(stack: StackState, s: &Scenario) {
    let start = MAPS.with(|m| {
        let m = m.borrow();
        if let Some((k, d, _)) = &m.done {
            if k.matches(s) {
                return Some(Err(d.clone()));
            }
        }
        if m.job.as_ref().is_some_and(|j| j.key.matches(s)) {
            return None;
        }
        Some(Ok(()))
    });
    match start {
        None => {}
        Some(Err(done)) => {
            if !stack.map.with_untracked(|m| m.as_ref().is_some_and(|m| Arc::ptr_eq(m, &done))) {
                stack.map.set(Some(done));
            }
            if stack.map_status.with_untracked(|st| *st != MapStatus::Ready) {
                stack.map_status.set(MapStatus::Ready);
            }
        }
        Some(Ok(())) => begin(stack, s),
    }
}

fn begin(stack: StackState, s: &Scenario) {
    let setup = crate::view::cell::setup_of(&s.cell);
    // over a real bottom cell: top gap by the bottom cell's thickness
    let grid = s.stack.map.grid().and_then(|(tops, bottoms)| match &s.stack.bottom {
        None => Ok((tops, bottoms, None)),
        Some(_) => {
            let setup = setup.clone()?;
            let extras = crate::view::stack::extras_of(&setup, s)?;
            let real = extras.bottom.map(|b| (b, extras.coupling));
            Ok((tops, s.stack.map.thicknesses()?, real))
        }
    });
    let (setup, (tops_j, bottoms_j, real)) = match (setup, grid) {
        (Ok(a), Ok(b)) => (a, b),
        (Err(e), _) | (_, Err(e)) => {
            stop();
            stack.map_status.set(MapStatus::Failed(crate::app::state::sentence(&e)));
            return;
        }
    };
    let id = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        m.last_id += 1;
        let id = m.last_id;
        let n = tops_j.len() * bottoms_j.len();
        m.job = Some(Job {
            id,
            key: MapKey {
                cell: s.cell.clone(),
                connection: s.stack.connection.to_physics(),
                settings: s.stack.map.clone(),
                bottom: bottom_key(s),
            },
            setup,
            tops_j,
            bottoms_j,
            real,
            eff: vec![0.0; n],
            next: 0,
            rows: 4,
            started: now(),
            busy: 0.0,
        });
        id
    });
    stack.map_status.set(MapStatus::Computing(0.0));
    // the first slice after the current render
    set_timeout(move || pump(stack, id), Duration::ZERO);
}

/// Drop any computation in progress (the panel is going away).
pub fn stop() {
    MAPS.with(|m| m.borrow_mut().job = None);
}

/// When the map's next turn may run: at once, or, while the gap search runs in the
/// background worker, a little later, so that the search's answer finds the page's thread
/// free (the map is what the page does on its own; the search is what the user asked for).
fn next_turn(stack: StackState) -> Duration {
    let searching = stack.search.try_with_untracked(|s| s.running()).unwrap_or(false);
    if searching {
        Duration::from_millis(25)
    } else {
        Duration::ZERO
    }
}

/// Compute rows for one slice; then yield to the page, or finish.
fn pump(stack: StackState, id: u64) {
    let t0 = now();
    let finished = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        let job = m.job.as_mut().filter(|j| j.id == id)?;
        let nb = job.bottoms_j.len();
        while job.next < job.tops_j.len() && now() - t0 < SLICE_MS {
            let end = (job.next + job.rows).min(job.tops_j.len());
            let c0 = now();
            let tops = &job.tops_j[job.next..end];
            let (light, cell) = (&job.setup.light, &job.setup.cell);
            let part = match &job.real {
                Some((b, coupling)) => {
                    thickness_map(light, cell, b, tops, &job.bottoms_j, job.key.connection, *coupling)
                }
                None => tandem_map(light, cell, job.key.connection, tops, &job.bottoms_j).efficiency,
            };
            let took = now() - c0;
            job.eff[job.next * nb..end * nb].copy_from_slice(&part);
            job.next = end;
            job.busy += took;
            // aim for about 3 ms a call
            let per_row = took / tops.len().max(1) as f64;
            job.rows = if per_row > 0.0 { ((3.0 / per_row) as usize).clamp(1, 64) } else { 64 };
        }
        if job.next < job.tops_j.len() {
            return Some(Err(job.next as f64 / job.tops_j.len() as f64));
        }
        let job = m.job.take()?;
        let data = Arc::new(finish(&job));
        m.done = Some((job.key, data.clone(), job.setup));
        Some(Ok(data))
    });
    match finished {
        None => {}
        Some(Err(frac)) => {
            stack.map_status.try_set(MapStatus::Computing(frac));
            set_timeout(move || pump(stack, id), next_turn(stack));
        }
        Some(Ok(data)) => {
            crate::app::state::mark("gg-map-done");
            let id = data.id;
            stack.map.try_set(Some(data));
            stack.map_status.try_set(MapStatus::Ready);
            // refine the best point once the map is on the page
            set_timeout(move || refine_best(stack, id), next_turn(stack));
        }
    }
}

/// Refine the map `id` (while it is still the map and no other is being computed): its best
/// few local maxima are each polished by the gap search's simplex, one per turn of the page,
/// under the map's light, cells and connection, from first steps of one grid step, the gaps
/// ranging over both axes. Then the map is shown again with the best of them (under a new
/// id, so the cached drawing is redrawn once).
fn refine_best(stack: StackState, id: u64) {
    let starts = MAPS.with(|m| {
        let m = m.borrow();
        // a thickness map shows its grid's best (the refinement searches gaps)
        let (_, data, _) =
            m.done.as_ref().filter(|d| d.1.id == id && d.1.refined.is_none() && !d.1.thickness && m.job.is_none())?;
        let tops: Vec<f64> = data.tops_ev.iter().map(|g| ev(*g)).collect();
        let bottoms: Vec<f64> = data.bottoms_ev.iter().map(|g| ev(*g)).collect();
        let starts: Vec<Vec<f64>> =
            grid_maxima(&tops, &bottoms, &data.eff).into_iter().take(POLISHED_STARTS).map(|(x, _)| x).collect();
        (!starts.is_empty()).then_some(starts)
    });
    if let Some(starts) = starts {
        polish_next(stack, id, Rc::new(starts), 0, None, 0.0);
    }
}

/// Polish start `k` of map `id`, keeping the best optimum so far; then the next in a turn
/// of its own, or show the best.
fn polish_next(stack: StackState, id: u64, starts: Rc<Vec<Vec<f64>>>, k: usize, best: Option<Optimum>, busy: f64) {
    let t0 = now();
    let step = MAPS.with(|m| {
        let mut m = m.borrow_mut();
        if m.job.is_some() {
            return None;
        }
        let (key, data, setup) = m.done.as_ref().filter(|d| d.1.id == id)?;
        let (tops, bottoms) = (&data.tops_ev, &data.bottoms_ev);
        let lo = tops[0].min(bottoms[0]);
        let hi = tops[tops.len() - 1].max(bottoms[bottoms.len() - 1]);
        let grid_step = |xs: &[f64]| (xs[xs.len() - 1] - xs[0]) / (xs.len() - 1).max(1) as f64;
        let p = Problem {
            light: &setup.light,
            cell: setup.cell,
            connection: key.connection,
            junctions: 2,
            fixed: None,
            range_j: (ev(lo), ev(hi)),
            seeds: Vec::new(),
            extras: Default::default(),
        };
        let found = refine(&p, &starts[k], ev(grid_step(tops).max(grid_step(bottoms))));
        let best = match best {
            Some(b) if !(found.gaps_j.len() == 2 && found.efficiency > b.efficiency) => b,
            _ => found,
        };
        let busy = busy + (now() - t0);
        if k + 1 < starts.len() {
            return Some(Err((best, busy)));
        }
        if best.gaps_j.len() != 2 {
            return None;
        }
        let next_id = m.last_id + 1;
        let next = Arc::new(MapData {
            id: next_id,
            refined: Some((to_ev(best.gaps_j[0]), to_ev(best.gaps_j[1]), best.efficiency * 100.0)),
            refine_ms: busy,
            ..(**data).clone()
        });
        m.last_id = next_id;
        if let Some(d) = m.done.as_mut() {
            d.1 = next.clone();
        }
        Some(Ok(next))
    });
    match step {
        None => {}
        Some(Err((best, busy))) => {
            set_timeout(move || polish_next(stack, id, starts, k + 1, Some(best), busy), next_turn(stack))
        }
        Some(Ok(data)) => {
            crate::app::state::mark("gg-map-refined");
            stack.map.try_set(Some(data));
        }
    }
}

fn finish(job: &Job) -> MapData {
    let grid = Grid {
        id: job.id,
        connection: job.key.connection,
        setup: &job.setup,
        tops_j: &job.tops_j,
        bottoms_j: &job.bottoms_j,
        efficiency: &job.eff,
        compute_ms: job.busy,
        elapsed_ms: now() - job.started,
    };
    if job.real.is_some() {
        MapData::from_thickness(&grid, &job.bottoms_j)
    } else {
        MapData::from_grid(&grid)
    }
}
