//! What the stack panel shows, computed from the scenario, with caches so that moving a gap
//! recomputes only the stack itself: the light and cell inputs, the plotted spectrum and the
//! loss curve are kept until the light, the cell settings or the plot's view change. The
//! caches live outside the component, so reopening the tab reuses them.

use std::cell::RefCell;
use std::sync::Arc;

use crate::physics::absorber::{solve_absorber, Absorptance};
use crate::physics::constants::{ev, to_ev};
use crate::physics::junction::Cell;
use crate::physics::losses::{loss_breakdown, loss_sweep};
use crate::physics::stack::{solve_stack, StackResult};
use crate::report::stack::{AbsorberReport, LossReport, StackReport};
use crate::scenario::stack::{check_gaps, AbsorberSpec};
use crate::scenario::{CellScenario, CellSetup, PlotAxis, PlotQuantity, Scenario, SourceSpec};
use crate::view::cell::same_but_gap;
use crate::view::format::field;
use crate::view::spectrum::{spectrum_view, SpectrumDetail, SpectrumView};

/// Points of the loss curve against band gap.
pub const LOSS_POINTS: usize = 251;

/// The stack as designed, solved.
#[derive(Debug, Clone)]
pub struct StackView {
    /// band gaps [eV] as the scenario gives them, top first
    pub gaps_ev: Vec<f64>,
    pub result: StackResult,
    pub report: StackReport,
    pub setup: Arc<CellSetup>,
    pub spectrum: Arc<SpectrumView>,
}

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

/// A measured (or modelled) absorptance next to the ideal step at the same edge.
#[derive(Debug, Clone)]
pub struct AbsorberView {
    /// "measured" or "urbach"
    pub kind: &'static str,
    pub name: String,
    pub measured: AbsorberReport,
    pub step: AbsorberReport,
    /// (photon energy [eV], EQE or absorptance) of the table or the tail, ascending, for the plot
    pub points: Vec<(f64, f64)>,
    pub warnings: Vec<String>,
}

/// What the plotted spectrum was drawn for: the source, the plot's axis and quantity.
type SpectrumKey = (SourceSpec, PlotAxis, PlotQuantity);

#[derive(Default)]
struct Caches {
    /// the cell scenario (its gap ignored) and its physics inputs
    setup: Option<(CellScenario, Arc<CellSetup>)>,
    spectrum: Option<(SpectrumKey, Arc<SpectrumView>)>,
    /// the loss curve for a cell scenario (gap ignored) and a gap range
    losses: Option<(CellScenario, (f64, f64), LossCurve)>,
}

/// The loss breakdown against band gap, ascending.
type LossCurve = Arc<Vec<LossReport>>;

thread_local! {
    static CACHES: RefCell<Caches> = RefCell::new(Caches::default());
}

/// The light and cell inputs of `cell`, its gap ignored (cached).
pub fn setup_of(cell: &CellScenario) -> Result<Arc<CellSetup>, String> {
    CACHES.with(|c| {
        let mut c = c.borrow_mut();
        if let Some((k, s)) = &c.setup {
            if same_but_gap(k, cell) {
                return Ok(s.clone());
            }
        }
        // the gap does not matter here; any valid one will do for the check
        let probe = CellScenario { gap_ev: 1.34, ..cell.clone() };
        let s = Arc::new(probe.to_physics()?);
        c.setup = Some((cell.clone(), s.clone()));
        Ok(s)
    })
}

fn spectrum_of(setup: &CellSetup, s: &Scenario) -> Arc<SpectrumView> {
    let key = (s.cell.spectrum.clone(), s.view.spectrum_axis, s.view.spectrum_quantity);
    CACHES.with(|c| {
        let mut c = c.borrow_mut();
        if let Some((k, v)) = &c.spectrum {
            if k.0 == s.cell.spectrum && k.1 == key.1 && k.2 == key.2 {
                return v.clone();
            }
        }
        let v = Arc::new(spectrum_view(&setup.light.source, &s.cell.spectrum, key.1, key.2, SpectrumDetail::Plot));
        c.spectrum = Some((key, v.clone()));
        v
    })
}

/// Solve the stack of `s`. Errors are the scenario's own messages.
pub fn stack_view(s: &Scenario) -> Result<StackView, String> {
    let gaps_j = check_gaps(&s.stack.gaps_ev)?;
    let setup = setup_of(&s.cell)?;
    let result = solve_stack(&setup.light, &setup.cell, &gaps_j, s.stack.connection.to_physics());
    let mut report = StackReport::from(&result);
    // show the gaps as typed (eV to J and back may change the last digit)
    for (i, sub) in report.subcells.iter_mut().enumerate() {
        sub.gap_ev = s.stack.gaps_ev[i];
        sub.upper_gap_ev = if i == 0 { None } else { Some(s.stack.gaps_ev[i - 1]) };
    }
    let spectrum = spectrum_of(&setup, s);
    Ok(StackView { gaps_ev: s.stack.gaps_ev.clone(), result, report, setup, spectrum })
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
    let curve = CACHES.with(|c| {
        let mut c = c.borrow_mut();
        if let Some((k, r, v)) = &c.losses {
            if same_but_gap(k, &s.cell) && *r == range {
                return v.clone();
            }
        }
        let gaps: Vec<f64> = loss_gaps(range.0, range.1).into_iter().map(ev).collect();
        let v: Arc<Vec<LossReport>> =
            Arc::new(loss_sweep(&setup.light, &setup.cell, &gaps).iter().map(LossReport::from).collect());
        c.losses = Some((s.cell.clone(), range, v.clone()));
        v
    });
    Ok(LossView { cell: bar, curve, from_ev: range.0, to_ev: range.1 })
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

/// The measured cell of `s` next to the ideal step, or None for a step absorber.
pub fn absorber_view(s: &Scenario) -> Result<Option<AbsorberView>, String> {
    let (kind, name) = match &s.stack.absorber {
        AbsorberSpec::Step => return Ok(None),
        AbsorberSpec::Urbach { urbach_mev } => ("urbach", format!("Urbach tail of {} meV", field(*urbach_mev, 6))),
        AbsorberSpec::Measured(t) => ("measured", t.name.clone()),
    };
    let setup = setup_of(&s.cell)?;
    let mut warnings = Vec::new();
    let a = s.stack.absorber.to_physics(s.cell.gap_ev, s.cell.cell_temp_k, &mut warnings)?;
    let cell = Cell { gap_j: ev(s.cell.gap_ev), ..setup.cell };
    let measured = AbsorberReport::new(&solve_absorber(&setup.light, &a, &cell), kind);
    let edge = a.edge_j();
    let step = AbsorberReport::new(&solve_absorber(&setup.light, &Absorptance::Step { gap_j: edge }, &cell), "step");
    let points = match &a {
        Absorptance::Table(t) => t.energies_j().into_iter().map(|e| (to_ev(e), t.at_energy(e))).collect(),
        Absorptance::Urbach { gap_j, urbach_j } => urbach_curve(&a, *gap_j, *urbach_j),
        Absorptance::Step { .. } => Vec::new(),
    };
    Ok(Some(AbsorberView { kind, name, measured, step, points, warnings }))
}
pub mod map;

/// One line describing the stack's light and cells, for exported figures and files; `what`
/// names the plot.
pub fn caption(s: &Scenario, what: &str) -> String {
    let cell = &s.cell;
    let mut parts = vec![
        crate::view::cell::csv::source_label(&cell.spectrum),
        format!("{} sun{}", field(cell.concentration, 6), if cell.concentration == 1.0 { "" } else { "s" }),
        format!("cells {} K", field(cell.cell_temp_k, 6)),
    ];
    if cell.ere != 1.0 {
        parts.push(format!("ERE {}", field(cell.ere, 4)));
    }
    parts.push(what.to_string());
    format!("Glowgap · {} · detailed-balance limit", parts.join(" · "))
}
