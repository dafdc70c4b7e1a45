//! The Solar cell tab's cell with a real absorptance (an Urbach tail or a measured EQE) next
//! to the ideal step at the same edge: Jsc, J0 and Voc by reciprocity.

use super::setup_of;
use crate::physics::absorber::{solve_absorber, Absorptance};
use crate::physics::constants::{ev, to_ev};
use crate::physics::junction::Cell;
pub use crate::report::stack::AbsorberKind;
use crate::report::stack::AbsorberReport;
use crate::scenario::stack::AbsorberSpec;
use crate::scenario::Scenario;
use crate::view::format::field;

/// A measured (or modelled) absorptance next to the ideal step at the same edge.
#[derive(Debug, Clone)]
pub struct AbsorberView {
    pub kind: AbsorberKind,
    pub name: String,
    pub measured: AbsorberReport,
    pub step: AbsorberReport,
    /// (photon energy [eV], EQE or absorptance) of the table or the tail, ascending, for the plot
    pub points: Vec<(f64, f64)>,
    pub warnings: Vec<String>,
}

/// Points of a plotted Urbach tail.
const URBACH_POINTS: usize = 241;

/// (photon energy [eV], absorptance) of an Urbach tail, ascending: from 12 Urbach energies
/// below the gap (a = e^-12, nothing on a plot in %) or half the gap, to a fifth above it.
fn urbach_curve(a: &Absorptance, gap_j: f64, urbach_j: f64) -> Vec<(f64, f64)> {
    let lo = (gap_j - 12.0 * urbach_j).max(0.5 * gap_j);
    let hi = 1.2 * gap_j;
    (0..URBACH_POINTS)
        .map(|i| {
            let e = lo + (hi - lo) * i as f64 / (URBACH_POINTS - 1) as f64;
            (to_ev(e), a.at(e))
        })
        .collect()
}

/// The measured cell of `s` next to the ideal step, or None for a step or real absorber.
pub fn absorber_view(s: &Scenario) -> Result<Option<AbsorberView>, String> {
    let (kind, name) = match &s.stack.absorber {
        // a real absorber has its own view (`view::cell::real`)
        AbsorberSpec::Step | AbsorberSpec::Real(_) => return Ok(None),
        AbsorberSpec::Urbach { urbach_mev } => {
            (AbsorberKind::Urbach, format!("Urbach tail of {} meV", field(*urbach_mev, 6)))
        }
        AbsorberSpec::Measured(t) => (AbsorberKind::Measured, t.name.clone()),
    };
    let setup = setup_of(&s.cell)?;
    let mut warnings = Vec::new();
    let a = s.stack.absorber.to_physics(s.cell.gap_ev, s.cell.cell_temp_k, &mut warnings)?;
    let cell = Cell { gap_j: ev(s.cell.gap_ev), ..setup.cell };
    let measured = AbsorberReport::new(&solve_absorber(&setup.light, &a, &cell), kind);
    let edge = a.edge_j();
    let step = AbsorberReport::new(
        &solve_absorber(&setup.light, &Absorptance::Step { gap_j: edge }, &cell),
        AbsorberKind::Step,
    );
    let points = match &a {
        Absorptance::Table(t) => t.energies_j().into_iter().map(|e| (to_ev(e), t.at_energy(e))).collect(),
        Absorptance::Urbach { gap_j, urbach_j } => urbach_curve(&a, *gap_j, *urbach_j),
        Absorptance::Step { .. } => Vec::new(),
    };
    Ok(Some(AbsorberView { kind, name, measured, step, points, warnings }))
}
