//! Where the incident power goes in the Solar cell tab's cell: its loss breakdown, and the
//! breakdown against band gap over the efficiency curve's range (cached until the light or
//! the cell's other settings change).

use std::cell::RefCell;
use std::sync::Arc;

use super::{same_but_gap, setup_of};
use crate::physics::constants::ev;
use crate::physics::junction::Cell;
use crate::physics::losses::{loss_breakdown, loss_sweep};
use crate::report::stack::LossReport;
use crate::scenario::{CellScenario, Scenario};

/// Points of the loss curve against band gap.
pub const LOSS_POINTS: usize = 251;

/// Where the incident power goes, for the single cell and against band gap.
#[derive(Debug, Clone)]
pub struct LossView {
    /// the single-junction cell of the cell panel
    pub cell: LossReport,
    /// the breakdown against band gap, ascending
    pub curve: Arc<Vec<LossReport>>,
    pub from_ev: f64,
    pub to_ev: f64,
}

/// The loss breakdown against band gap, ascending.
type LossCurve = Arc<Vec<LossReport>>;

/// A loss curve with what it was computed for: the cell scenario (gap ignored) and the gap
/// range [eV].
type CachedCurve = (CellScenario, (f64, f64), LossCurve);

thread_local! {
    static CURVE: RefCell<Option<CachedCurve>> = const { RefCell::new(None) };
}

/// The band gaps of the loss curve over [from, to] eV.
fn loss_gaps(from: f64, to: f64) -> Vec<f64> {
    (0..LOSS_POINTS).map(|i| from + (to - from) * i as f64 / (LOSS_POINTS - 1) as f64).collect()
}

/// The loss breakdown of the cell panel's cell and against band gap over the cell panel's
/// efficiency-curve range.
pub fn loss_view(s: &Scenario) -> Result<LossView, String> {
    let setup = setup_of(&s.cell)?;
    s.cell.to_physics()?;
    let cell = Cell { gap_j: ev(s.cell.gap_ev), ..setup.cell };
    let bar = LossReport::from(&loss_breakdown(&setup.light, &cell));
    let range = (s.view.curve_from_ev, s.view.curve_to_ev);
    let curve = CURVE.with(|c| {
        let mut c = c.borrow_mut();
        if let Some((k, r, v)) = &*c {
            if same_but_gap(k, &s.cell) && *r == range {
                return v.clone();
            }
        }
        let gaps: Vec<f64> = loss_gaps(range.0, range.1).into_iter().map(ev).collect();
        let v: Arc<Vec<LossReport>> =
            Arc::new(loss_sweep(&setup.light, &setup.cell, &gaps).iter().map(LossReport::from).collect());
        *c = Some((s.cell.clone(), range, v.clone()));
        v
    });
    Ok(LossView { cell: bar, curve, from_ev: range.0, to_ev: range.1 })
}
