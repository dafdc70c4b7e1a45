//! What the stack panel shows, computed from the scenario, with caches so that moving a gap
//! recomputes only the stack itself: the light and cell inputs ([`crate::view::cell::setup_of`])
//! and the plotted spectrum are kept until the light, the cell settings or the plot's view
//! change. The caches live outside the component, so reopening the tab reuses them.

pub mod map;

use std::cell::RefCell;
use std::sync::Arc;

use crate::physics::constants::to_ev;
use crate::physics::stack::mixed::StackExtras;
use crate::physics::stack::StackResult;
use crate::report::stack::StackReport;
use crate::scenario::real::RealAbsorberSpec;
use crate::scenario::stack::{check_gaps_over, StackSetup};
use crate::scenario::{CellScenario, CellSetup, PlotAxis, PlotQuantity, Scenario, SourceSpec};
use std::fmt::Write;

use crate::view::cell::setup_of;
use crate::view::format::{csv_num, gap_ev};
use crate::view::spectrum::{axis_name, value_name};
use crate::view::spectrum::{spectrum_view, SpectrumDetail, SpectrumView};

/// The stack as designed, solved.
#[derive(Debug, Clone)]
pub struct StackView {
    /// band gaps [eV] as the scenario gives them, top first
    pub gaps_ev: Vec<f64>,
    pub result: StackResult,
    pub report: StackReport,
    pub setup: Arc<CellSetup>,
    pub spectrum: Arc<SpectrumView>,
    /// the real bottom cell's absorption edge [eV] (half maximum), when there is one
    pub bottom_edge_ev: Option<f64>,
}

/// What the plotted spectrum was drawn for: the source, the plot's axis and quantity.
type SpectrumKey = (SourceSpec, PlotAxis, PlotQuantity);

thread_local! {
    /// the plotted spectrum, kept while the source and the plot's axis and quantity stay
    static SPECTRUM: RefCell<Option<(SpectrumKey, Arc<SpectrumView>)>> = const { RefCell::new(None) };
    /// the real bottom cell's model and the coupling, kept while the light, the cells'
    /// temperature and the bottom cell's material and doping stay
    static EXTRAS: RefCell<Option<(ExtrasKey, StackExtras)>> = const { RefCell::new(None) };
}

/// What the extras were built for: the cell scenario (its gap ignored), the bottom cell
/// without its thickness and trapping (they are solve arguments), the coupling's bits.
type ExtrasKey = (CellScenario, Option<RealAbsorberSpec>, u64);

/// The stack's real bottom cell and coupling under `setup`'s light (cached; the model is
/// rebuilt only when what it depends on changes).
pub fn extras_of(setup: &CellSetup, s: &Scenario) -> Result<StackExtras, String> {
    s.stack.check_extras()?;
    let model_part = s.stack.bottom.as_ref().map(|b| RealAbsorberSpec {
        thickness_um: 1.0,
        trapping: Default::default(),
        ..b.clone()
    });
    let key: ExtrasKey = (s.cell.clone(), model_part, s.stack.luminescent_coupling.to_bits());
    let cached = EXTRAS.with(|c| {
        c.borrow()
            .as_ref()
            .filter(|(k, _)| crate::view::cell::same_but_gap(&k.0, &key.0) && k.1 == key.1 && k.2 == key.2)
            .map(|(_, e)| e.clone())
    });
    let mut extras = match cached {
        Some(e) => e,
        None => {
            let e = s.stack.extras(&setup.light, s.cell.cell_temp_k)?;
            EXTRAS.with(|c| *c.borrow_mut() = Some((key, e.clone())));
            e
        }
    };
    // this scenario's thickness and trapping on the cached model
    if let (Some(b), Some(spec)) = (extras.bottom.as_mut(), s.stack.bottom.as_ref()) {
        let (abs, _) = spec.to_physics().map_err(|e| format!("bottom cell: {e}"))?;
        b.thickness_m = abs.thickness_m;
        b.trapping = abs.trapping;
    }
    Ok(extras)
}

fn spectrum_of(setup: &CellSetup, s: &Scenario) -> Arc<SpectrumView> {
    let key = (s.cell.spectrum.clone(), s.view.spectrum_axis, s.view.spectrum_quantity);
    SPECTRUM.with(|c| {
        let mut c = c.borrow_mut();
        if let Some((k, v)) = &*c {
            if k.0 == s.cell.spectrum && k.1 == key.1 && k.2 == key.2 {
                return v.clone();
            }
        }
        let v = Arc::new(spectrum_view(&setup.light.source, &s.cell.spectrum, key.1, key.2, SpectrumDetail::Plot));
        *c = Some((key, v.clone()));
        v
    })
}

/// Solve the stack of `s`. Errors are the scenario's own messages.
pub fn stack_view(s: &Scenario) -> Result<StackView, String> {
    let gaps_j = check_gaps_over(&s.stack.gaps_ev, s.stack.bottom.is_some())?;
    let setup = setup_of(&s.cell)?;
    let extras = extras_of(&setup, s)?;
    let bottom_edge_ev = extras.bottom.as_ref().map(|b| to_ev(b.model.edge_j(b.thickness_m, b.trapping)));
    let stack = StackSetup {
        light: setup.light.clone(),
        cell: setup.cell,
        gaps_j,
        connection: s.stack.connection.to_physics(),
        extras,
        warnings: Vec::new(),
    };
    let result = stack.solve();
    let mut report = StackReport::from(&result).with_extras(&s.stack);
    // show the gaps as typed (eV to J and back may change the last digit)
    for (i, sub) in report.subcells.iter_mut().enumerate().take(s.stack.gaps_ev.len()) {
        sub.gap_ev = s.stack.gaps_ev[i];
        sub.upper_gap_ev = if i == 0 { None } else { Some(s.stack.gaps_ev[i - 1]) };
    }
    if let (Some(sub), true) = (report.subcells.get_mut(s.stack.gaps_ev.len()), s.stack.bottom.is_some()) {
        sub.upper_gap_ev = s.stack.gaps_ev.last().copied();
    }
    let spectrum = spectrum_of(&setup, s);
    Ok(StackView { gaps_ev: s.stack.gaps_ev.clone(), result, report, setup, spectrum, bottom_edge_ev })
}

/// One line describing the stack's light and cells, for exported figures and files; `what`
/// names the plot.
pub fn caption(s: &Scenario, what: &str) -> String {
    crate::view::cell::csv::conditions_caption(s, "cells", what)
}

/// Subcell `i`'s gap as the page writes it: "1.710 eV", or for a real bottom cell its
/// absorber, thickness and absorption edge, "silicon 300 µm, edge 1.078 eV".
pub fn subcell_gap_text(r: &StackReport, i: usize) -> String {
    let Some(s) = r.subcells.get(i) else { return String::new() };
    match &r.bottom {
        Some(b) if i + 1 == r.subcells.len() => format!(
            "{} {} µm, edge {} eV",
            b.absorber,
            crate::view::format::field(b.thickness_um, 6),
            crate::view::format::fixed(s.gap_ev, 3)
        ),
        _ => format!("{} eV", gap_ev(s.gap_ev)),
    }
}

/// Which subcell (0 = top) absorbs photons of energy `e_ev`, if any.
pub fn absorbing(gaps_ev: &[f64], e_ev: f64) -> Option<usize> {
    gaps_ev.iter().position(|g| e_ev >= *g)
}

/// The spectrum as CSV, each point with the subcell that absorbs it.
pub fn spectrum_csv(v: &StackView, what: &str) -> String {
    let sv = &v.spectrum;
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(
        out,
        "# band gaps top first (eV): {}",
        v.gaps_ev.iter().map(|g| gap_ev(*g)).collect::<Vec<_>>().join(", ")
    );
    let _ = writeln!(out, "# subcell = which subcell absorbs the photon (1 = top), 0 = below every gap");
    let _ = writeln!(out, "# Detailed-balance limits of an ideal stack: upper bounds, not predictions of a device.");
    let unit = sv.unit().replace('⁻', "-").replace('¹', "1").replace('²', "2");
    let _ = writeln!(
        out,
        "{} ({}),{} ({unit}),subcell",
        axis_name(sv.axis).to_ascii_lowercase(),
        sv.x_unit(),
        value_name(sv.quantity).to_ascii_lowercase()
    );
    for (x, y) in sv.x.iter().zip(&sv.y) {
        let k = absorbing(&v.gaps_ev, sv.ev_of_x(*x)).map(|i| i + 1).unwrap_or(0);
        let _ = writeln!(out, "{},{},{k}", csv_num(*x), csv_num(*y));
    }
    out
}
