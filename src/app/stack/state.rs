//! The stack panel's own state beside the shared scenario: the solved stack, the map and its
//! computation, the gap search, where its plots' axes landed and the selected subcell.

use std::sync::Arc;

use leptos::prelude::*;

use super::search::SearchState;
use crate::app::state::Ctx;
use crate::app::widgets::plot::Frame;
use crate::view::controls::Control;
use crate::view::stack::map::{MapData, MapStatus};
use crate::view::stack::StackView;

/// The panel's plots, by index into [`StackState::frames`].
pub const SPECTRUM: usize = 0;
pub const MAP: usize = 1;
pub const PLOTS: usize = 2;

/// `data-control` hooks of the gap fields, top first.
pub const GAP_HOOKS: [Control; 6] =
    [Control::Gap1, Control::Gap2, Control::Gap3, Control::Gap4, Control::Gap5, Control::Gap6];

/// The panel's shared handles; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct StackState {
    pub ctx: Ctx,
    /// the stack as designed, solved
    pub view: RwSignal<Option<Arc<StackView>>>,
    /// why the stack cannot be computed (a link with a bad stack)
    pub error: RwSignal<Option<String>>,
    pub frames: RwSignal<[Frame; PLOTS]>,
    pub plot_errors: RwSignal<[Option<String>; PLOTS]>,
    /// the subcell whose gap the spectrum plot's keys move
    pub selected: RwSignal<usize>,
    pub map: RwSignal<Option<Arc<MapData>>>,
    pub map_status: RwSignal<MapStatus>,
    pub search: RwSignal<SearchState>,
}

impl StackState {
    pub fn new(ctx: Ctx) -> StackState {
        StackState {
            ctx,
            view: RwSignal::new(None),
            error: RwSignal::new(None),
            frames: RwSignal::new([Frame::default(); PLOTS]),
            plot_errors: RwSignal::new(Default::default()),
            selected: RwSignal::new(0),
            map: RwSignal::new(None),
            map_status: RwSignal::new(MapStatus::Idle),
            search: RwSignal::new(SearchState::Idle),
        }
    }

    pub fn frame(&self, i: usize) -> Frame {
        self.frames.with_untracked(|f| f[i])
    }

    /// The current gaps [eV], top first (untracked).
    pub fn gaps(&self) -> Vec<f64> {
        self.ctx.scenario.with_untracked(|s| s.stack.gaps_ev.clone())
    }
}
