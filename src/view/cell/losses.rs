//! Where the incident power goes in the Solar cell tab's cell: its loss breakdown, and the
//! breakdown against band gap over the efficiency curve's range (cached until the light or
//! the cell's other settings change).

use std::cell::RefCell;
use std::fmt::Write;
use std::sync::Arc;

use super::{same_but_gap, setup_of};
use crate::physics::constants::ev;
use crate::physics::junction::Cell;
use crate::physics::losses::{loss_breakdown, loss_sweep};
use crate::report::stack::LossReport;
use crate::scenario::{CellScenario, Scenario};
use crate::view::format::csv_num;

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

/// The loss curve as CSV: the six parts against band gap (they add up to the incident
/// power), and the non-radiative share of emission and recombination.
pub fn losses_csv(l: &LossView, what: &str) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(out, "# the six parts add up to the incident power; emission includes non-radiative recombination (ERE < 1), shown again in the last column");
    let _ = writeln!(out, "# Detailed-balance limits of an ideal cell: upper bounds, not predictions of a device.");
    let _ = writeln!(
        out,
        "band gap (eV),incident (W/m2),below gap (W/m2),thermalization (W/m2),emission and recombination (W/m2),Carnot (W/m2),Boltzmann (W/m2),delivered (W/m2),of which non-radiative (W/m2)"
    );
    for r in l.curve.iter() {
        let p = r.parts();
        let _ = writeln!(
            out,
            "{:.6},{},{},{},{},{},{},{},{}",
            r.gap_ev,
            csv_num(r.input_w_m2),
            csv_num(p[0].1),
            csv_num(p[1].1),
            csv_num(p[2].1),
            csv_num(p[3].1),
            csv_num(p[4].1),
            csv_num(p[5].1),
            csv_num(r.nonradiative_w_m2)
        );
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::constants::{thermal_energy, CHARGE};

    #[test]
    fn the_csv_adds_up_and_shows_the_nonradiative_part() {
        let mut s = Scenario::default();
        s.cell.ere = 0.01;
        let l = loss_view(&s).unwrap();
        let csv = losses_csv(&l, "test");
        let rows: Vec<Vec<f64>> = csv
            .lines()
            .filter(|r| !r.starts_with('#') && !r.starts_with("band"))
            .map(|r| r.split(',').map(|v| v.parse().unwrap()).collect())
            .collect();
        assert_eq!(rows.len(), LOSS_POINTS);
        for r in &rows {
            // energy conservation (Hirst & Ekins-Daukes 2011): the six parts add up to the
            // input; csv_num keeps 7 significant figures, so 1e-5 of the input
            let parts: f64 = r[2..8].iter().sum();
            assert!((parts - r[1]).abs() <= 1e-5 * r[1], "{r:?}");
        }
        // the non-radiative part is kTc ln(1/ERE) per extracted carrier (Jmp/q): the
        // voltage lost to an ERE below 1 (Ross 1967, the (kT/q) ln(ERE) shift of Voc)
        let setup = setup_of(&s.cell).unwrap();
        let r = crate::physics::junction::solve_cell(&setup.light, &Cell { gap_j: ev(s.cell.gap_ev), ..setup.cell });
        let per_carrier = thermal_energy(300.0) * (1.0f64 / 0.01).ln();
        let want = per_carrier * r.jmp / CHARGE;
        assert!((l.cell.nonradiative_w_m2 / want - 1.0).abs() < 1e-9, "{} vs {want}", l.cell.nonradiative_w_m2);
    }
}
