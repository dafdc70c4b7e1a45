//! The radiator's plots as files, through the shared dispatch.

use super::plots::RadPlot;
use crate::app::radiator::state::Slot;
use crate::app::widgets::export::offer;
use crate::view::export::ExportKind;
use crate::view::radiator::csv::{balance_csv, caption, curve_csv, emissivity_csv};
use crate::view::radiator::RadiatorView;

/// Offer one of the radiator's plots as a file of `kind`.
pub fn save(slot: Slot, c: &RadiatorView, selected: Option<usize>, kind: ExportKind) -> Result<(), String> {
    let plot = RadPlot { slot, c, selected };
    let csv = || match slot {
        Slot::Editor => emissivity_csv(c),
        Slot::Balance => balance_csv(c),
        Slot::Curve => curve_csv(c),
    };
    offer(kind, slot.slug(), &plot, || caption(c), csv)
}
