//! The Solar cell panel's own state beside the shared scenario: its caches, what was computed,
//! where its plots' axes landed and why a plot could not be drawn.

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::prelude::*;

use crate::app::state::Ctx;
use crate::app::widgets::plot::Frame;
use crate::view::cell::absorber::AbsorberView;
use crate::view::cell::losses::LossView;
use crate::view::cell::{CellCache, CellView};

/// The panel's plots, by index into [`CellState::frames`]: the three of
/// [`super::plots::PlotKind`] first, then these two.
pub const LOSSES: usize = 3;
pub const ABSORPTANCE: usize = 4;
pub const PLOTS: usize = 5;

/// Shared handles of the cell panel; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct CellState {
    pub ctx: Ctx,
    /// caches, kept while another panel is in front
    pub cache: StoredValue<Rc<RefCell<CellCache>>, LocalStorage>,
    pub computed: RwSignal<Option<Arc<CellView>>>,
    /// why the scenario cannot be computed (should not happen: edits are checked)
    pub compute_error: RwSignal<Option<String>>,
    pub frames: RwSignal<[Frame; PLOTS]>,
    pub plot_errors: RwSignal<[Option<String>; PLOTS]>,
    /// where the power goes, for the cell and against band gap
    pub losses: RwSignal<Option<Arc<LossView>>>,
    /// the cell with its real absorptance next to the ideal step (None for a step)
    pub absorber: RwSignal<Option<Arc<AbsorberView>>>,
}

impl CellState {
    pub fn new(ctx: Ctx) -> CellState {
        CellState {
            ctx,
            cache: StoredValue::new_local(Rc::new(RefCell::new(CellCache::default()))),
            computed: RwSignal::new(None),
            compute_error: RwSignal::new(None),
            frames: RwSignal::new([Frame::default(); PLOTS]),
            plot_errors: RwSignal::new(Default::default()),
            losses: RwSignal::new(None),
            absorber: RwSignal::new(None),
        }
    }

    /// Where plot `i`'s axes landed.
    pub fn frame(&self, i: usize) -> Frame {
        self.frames.with_untracked(|f| f[i])
    }
}
