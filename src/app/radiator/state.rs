//! The radiator panel's own state beside the shared scenario: what was computed, where its
//! plots' axes landed, the selected control point, and the user's tables and choices that
//! are kept while another one is in use (so switching back loses nothing).

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::prelude::*;

use crate::app::state::Ctx;
use crate::app::widgets::plot::Frame;
use crate::scenario::radiator::{EmissivityTable, EmitterSpec, RadiatorScenario, SkySpec, TransmittanceTable};
use crate::scenario::SourceSpec;
use crate::view::radiator::{RadiatorCache, RadiatorView};

/// The radiator's plots.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Slot {
    /// the emissivity-profile editor
    Editor,
    /// the parts of the balance
    Balance,
    /// P_net against surface temperature
    Curve,
}

impl Slot {
    pub const ALL: [Slot; 3] = [Slot::Editor, Slot::Balance, Slot::Curve];

    /// The test hook and file-name part.
    pub fn slug(self) -> &'static str {
        match self {
            Slot::Editor => "emissivity",
            Slot::Balance => "balance",
            Slot::Curve => "net-curve",
        }
    }

    pub fn index(self) -> usize {
        match self {
            Slot::Editor => 0,
            Slot::Balance => 1,
            Slot::Curve => 2,
        }
    }
}

/// Shared handles of the radiator panel; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct RadiatorState {
    pub ctx: Ctx,
    /// caches, kept while another panel is in front
    pub cache: StoredValue<Rc<RefCell<RadiatorCache>>, LocalStorage>,
    pub computed: RwSignal<Option<Arc<RadiatorView>>>,
    /// why the radiator cannot be computed (should not happen: edits are checked)
    pub compute_error: RwSignal<Option<String>>,
    pub frames: RwSignal<[Frame; 3]>,
    pub plot_errors: RwSignal<[Option<String>; 3]>,
    /// the control point that keys act on (index into the profile's points)
    pub selected: RwSignal<Option<usize>>,
    /// a drag or a held key is under way: the P_net(T) curve is drawn from fewer points
    pub coarse: RwSignal<bool>,
    /// dragged points snap to a coarse grid
    pub snap: RwSignal<bool>,
    /// the last measured emissivity and sky transmittance loaded
    pub user_emissivity: RwSignal<Option<EmissivityTable>>,
    pub user_sky: RwSignal<Option<TransmittanceTable>>,
    /// the sun's spectrum last chosen (kept while the sun is off)
    pub last_sun: RwSignal<SourceSpec>,
    /// the precipitable water last chosen [cm] (kept while another sky is in use)
    pub last_pwv: RwSignal<f64>,
}

/// Precipitable water offered first for the clear sky [cm]: a mid-latitude summer-ish sky.
pub const DEFAULT_PWV_CM: f64 = 1.5;

impl RadiatorState {
    pub fn new(ctx: Ctx) -> RadiatorState {
        let rad = RadiatorState {
            ctx,
            cache: StoredValue::new_local(Rc::new(RefCell::new(RadiatorCache::default()))),
            computed: RwSignal::new(None),
            compute_error: RwSignal::new(None),
            frames: RwSignal::new([Frame::default(); 3]),
            plot_errors: RwSignal::new([None, None, None]),
            selected: RwSignal::new(None),
            coarse: RwSignal::new(false),
            snap: RwSignal::new(false),
            user_emissivity: RwSignal::new(None),
            user_sky: RwSignal::new(None),
            last_sun: RwSignal::new(SourceSpec::Am15g),
            last_pwv: RwSignal::new(DEFAULT_PWV_CM),
        };
        // remember what any scenario brings (links, files, edits)
        let remember = move |r: &RadiatorScenario| {
            if let EmitterSpec::Table(t) = &r.emitter {
                if rad.user_emissivity.with_untracked(|u| u.as_ref() != Some(t)) {
                    rad.user_emissivity.set(Some(t.clone()));
                }
            }
            match &r.sky {
                SkySpec::Table(t) if rad.user_sky.with_untracked(|u| u.as_ref() != Some(t)) => {
                    rad.user_sky.set(Some(t.clone()))
                }
                SkySpec::Clear { pwv_cm } if rad.last_pwv.get_untracked() != *pwv_cm => rad.last_pwv.set(*pwv_cm),
                _ => {}
            }
            if let Some(s) = &r.sun {
                if rad.last_sun.with_untracked(|l| l != s) {
                    rad.last_sun.set(s.clone());
                }
            }
        };
        Effect::new(move |_| ctx.scenario.with(|s| remember(&s.radiator)));
        rad
    }

    /// The radiator scenario now (untracked).
    pub fn scenario(&self) -> RadiatorScenario {
        self.ctx.scenario.with_untracked(|s| s.radiator.clone())
    }

    /// The profile's control points, if it is a control-point profile (untracked).
    pub fn points(&self) -> Option<Vec<[f64; 2]>> {
        self.ctx.scenario.with_untracked(|s| match &s.radiator.emitter {
            EmitterSpec::Points { points } => Some(points.clone()),
            _ => None,
        })
    }

    pub fn frame(&self, slot: Slot) -> Frame {
        self.frames.with_untracked(|f| f[slot.index()])
    }
}
