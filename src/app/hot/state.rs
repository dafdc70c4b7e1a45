//! The hot-emitter panel's own state beside the shared scenario: what each card computed,
//! where its plots' axes landed, and whether a temperature is being dragged.

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::prelude::*;

use crate::app::state::Ctx;
use crate::app::widgets::plot::Frame;
use crate::view::hot::{AbsorberView, BlackbodyView, HotCache, TpvView};

/// The panel's plots.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Slot {
    /// the blackbody spectrum (with the TPV emitter's)
    Spectrum,
    /// the spectrum exchanged between emitter and cell
    Exchange,
    /// the TPV cell's J-V curve
    Jv,
    /// efficiency and power density against band gap
    Tradeoff,
    /// the absorber's efficiencies against temperature
    Absorber,
}

impl Slot {
    pub const ALL: [Slot; 5] = [Slot::Spectrum, Slot::Exchange, Slot::Jv, Slot::Tradeoff, Slot::Absorber];

    /// The test hook and file-name part.
    pub fn slug(self) -> &'static str {
        match self {
            Slot::Spectrum => "blackbody-spectrum",
            Slot::Exchange => "tpv-exchange",
            Slot::Jv => "tpv-jv",
            Slot::Tradeoff => "tpv-tradeoff",
            Slot::Absorber => "absorber-efficiency",
        }
    }

    pub fn index(self) -> usize {
        self as usize
    }
}

/// Which card a compute error belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Part {
    Blackbody = 0,
    Tpv = 1,
    Absorber = 2,
}

/// Shared handles of the panel; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct HotState {
    pub ctx: Ctx,
    pub cache: StoredValue<Rc<RefCell<HotCache>>, LocalStorage>,
    pub bb: RwSignal<Option<Arc<BlackbodyView>>>,
    pub tpv: RwSignal<Option<Arc<TpvView>>>,
    pub abs: RwSignal<Option<Arc<AbsorberView>>>,
    /// why a card cannot be computed (should not happen: edits are checked)
    pub compute_errors: RwSignal<[Option<String>; 3]>,
    pub frames: RwSignal<[Frame; 5]>,
    pub plot_errors: RwSignal<[Option<String>; 5]>,
    /// a temperature slider is held: the trade-off is drawn from fewer gaps
    pub coarse: RwSignal<bool>,
    /// the wavelength where a drag over the blackbody plot started [um]
    pub band_drag: StoredValue<Option<f64>>,
}

impl HotState {
    pub fn new(ctx: Ctx) -> HotState {
        HotState {
            ctx,
            cache: StoredValue::new_local(Rc::new(RefCell::new(HotCache::default()))),
            bb: RwSignal::new(None),
            tpv: RwSignal::new(None),
            abs: RwSignal::new(None),
            compute_errors: RwSignal::new([None, None, None]),
            frames: RwSignal::new([Frame::default(); 5]),
            plot_errors: RwSignal::new([None, None, None, None, None]),
            coarse: RwSignal::new(false),
            band_drag: StoredValue::new(None),
        }
    }

    pub fn frame(&self, slot: Slot) -> Frame {
        self.frames.with_untracked(|f| f[slot.index()])
    }

    pub fn set_compute_error(&self, part: Part, e: Option<String>) {
        if self.compute_errors.with_untracked(|c| c[part as usize] != e) {
            self.compute_errors.update(|c| c[part as usize] = e);
        }
    }
}
