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
use crate::view::cell::real::{RealCache, RealView};
use crate::view::cell::{CellCache, CellView};

/// The panel's plots, by index into [`CellState::frames`]: the three of
/// [`super::plots::PlotKind`] first, then these four.
pub const LOSSES: usize = 3;
pub const ABSORPTANCE: usize = 4;
/// a real absorber's efficiency against thickness and its absorptance
pub const SI_THICKNESS: usize = 5;
pub const SI_ABSORPTANCE: usize = 6;
pub const PLOTS: usize = 7;

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
    /// the real absorber's model and thickness curve, kept while another panel is in front
    pub real_cache: StoredValue<Rc<RefCell<RealCache>>, LocalStorage>,
    /// the cell with a real absorber (None for the other absorptances)
    pub real: RwSignal<Option<Arc<RealView>>>,
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
            real_cache: StoredValue::new_local(Rc::new(RefCell::new(RealCache::default()))),
            real: RwSignal::new(None),
        }
    }

    /// Where plot `i`'s axes landed.
    pub fn frame(&self, i: usize) -> Frame {
        self.frames.with_untracked(|f| f[i])
    }
}
