//! The radiator panel's own state beside the shared scenario: what was computed, where its
//! plots' axes landed, the selected control point, and the user's tables and choices that
//! are kept while another one is in use (so switching back loses nothing).

use std::cell::RefCell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::prelude::*;

use super::optimize::OptimizeState;
use crate::app::state::Ctx;
use crate::app::widgets::plot::Frame;
use crate::scenario::film::{LayerSpec, MaterialSpec};
use crate::scenario::radiator::{
    AngularSpec, EmissivityTable, EmitterSpec, RadiatorScenario, SkySpec, SolarBandSpec, TransmittanceTable,
};
use crate::scenario::SourceSpec;
use crate::view::radiator::film::{builtin_materials, FilmView, MaterialInfo};
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

/// The layer stack's plots.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FilmSlot {
    /// the stack as bars (drag a layer's top edge)
    Stack,
    /// reflectance, transmittance and absorptance against wavelength
    Spectrum,
    /// the emissivity over wavelength and angle
    Map,
}

impl FilmSlot {
    pub const ALL: [FilmSlot; 3] = [FilmSlot::Stack, FilmSlot::Spectrum, FilmSlot::Map];

    /// The test hook and file-name part.
    pub fn slug(self) -> &'static str {
        match self {
            FilmSlot::Stack => "film-stack",
            FilmSlot::Spectrum => "film-rta",
            FilmSlot::Map => "film-map",
        }
    }

    pub fn index(self) -> usize {
        self as usize
    }
}

/// What the profile was before the user switched to layers: the profile, its solar-band
/// profile and angular model (a stack sets both itself).
pub type SavedProfile = (EmitterSpec, Option<SolarBandSpec>, AngularSpec);

/// A drag of a layer's top edge: the layer, the pointer's start [CSS px], the thickness
/// then [nm] and the diagram's scale held during the drag [CSS px per nm].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EdgeDrag {
    pub layer: usize,
    pub y0: f64,
    pub d0: f64,
    pub px_per_nm: f64,
}

/// The substrate's row in [`FilmState::row_error`].
pub const SUBSTRATE_ROW: usize = usize::MAX;

/// The layer-stack editor's state.
#[derive(Clone, Copy)]
pub struct FilmState {
    pub view: RwSignal<Option<Arc<FilmView>>>,
    pub frames: RwSignal<[Frame; 3]>,
    pub plot_errors: RwSignal<[Option<String>; 3]>,
    /// the layers while a thickness is dragged or a key held (committed on release)
    pub draft: RwSignal<Option<Vec<LayerSpec>>>,
    pub drag: StoredValue<Option<EdgeDrag>>,
    /// the layer the keys act on
    pub focused: RwSignal<Option<usize>>,
    /// the curves' second angle [deg], if any
    pub angle: RwSignal<Option<f64>>,
    /// the table row that the message of [`crate::view::controls::Control::FilmLayers`] is
    /// about, shown beside it ([`SUBSTRATE_ROW`] for the substrate)
    pub row_error: RwSignal<Option<usize>>,
    /// the profile kept while layers are in use, and the stack kept while a profile is
    pub saved_profile: StoredValue<Option<SavedProfile>>,
    pub saved_film: StoredValue<Option<(Vec<LayerSpec>, MaterialSpec)>>,
    /// the built-in materials with their sources and ranges
    pub materials: StoredValue<Arc<Vec<MaterialInfo>>>,
    /// the thickness search: its settings, where it stands, the thicknesses to revert to
    pub optimize: OptimizeState,
}

impl FilmState {
    fn new() -> FilmState {
        FilmState {
            view: RwSignal::new(None),
            frames: RwSignal::new([Frame::default(); 3]),
            plot_errors: RwSignal::new([None, None, None]),
            draft: RwSignal::new(None),
            drag: StoredValue::new(None),
            focused: RwSignal::new(None),
            angle: RwSignal::new(Some(60.0)),
            row_error: RwSignal::new(None),
            saved_profile: StoredValue::new(None),
            saved_film: StoredValue::new(None),
            materials: StoredValue::new(Arc::new(builtin_materials())),
            optimize: OptimizeState::new(),
        }
    }

    pub fn frame(&self, slot: FilmSlot) -> Frame {
        self.frames.with_untracked(|f| f[slot.index()])
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
    /// the layer-stack editor
    pub film: FilmState,
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
            film: FilmState::new(),
        };
        // remember what any scenario brings (links, files, edits)
        let remember = move |r: &RadiatorScenario| {
            if let EmitterSpec::Film { layers, substrate } = &r.emitter {
                rad.film.saved_film.set_value(Some((layers.clone(), substrate.clone())));
            }
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
