//! The page's state: the scenario (the single source of truth), what was computed from
//! it, and the messages shown next to controls. Every edit goes through [`Ctx::edit`],
//! which checks the edited scenario as a whole and either commits it or leaves the current
//! one in place and says, next to the control, what is wrong.

use crate::view::controls::Control;
use std::collections::BTreeMap;

use leptos::prelude::*;

use crate::scenario::{Scenario, TableSpec};

/// A message across the top of the page.
/// What a notice is about; one notice of each kind at a time.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NoticeKind {
    /// a link that could not be opened, or was opened over saved work
    Link,
    /// the browser's storage could not be read or written
    Storage,
    /// a file that could not be opened
    File,
    /// the scenario is too large to save
    Save,
    /// saved work that can be put back
    Restore,
    /// a long spectrum file offered resampled
    Resample,
}

impl NoticeKind {
    /// The `data-notice` hook.
    pub fn as_str(self) -> &'static str {
        match self {
            NoticeKind::Link => "link",
            NoticeKind::Storage => "storage",
            NoticeKind::File => "file",
            NoticeKind::Save => "save",
            NoticeKind::Restore => "restore",
            NoticeKind::Resample => "resample",
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Notice {
    pub kind: NoticeKind,
    pub text: String,
    /// an alert (something went wrong) or a status line
    pub alert: bool,
    /// an action offered with the notice
    pub action: Option<NoticeAction>,
}

#[derive(Debug, Clone, PartialEq)]
pub enum NoticeAction {
    /// put this scenario back (e.g. the saved work that a link replaced)
    Restore(Box<Scenario>, &'static str),
    /// make this table the light source (a long file, resampled)
    UseSpectrum(Box<crate::scenario::TableSpec>, String),
}

/// Shared handles; all are cheap to copy.
#[derive(Clone, Copy)]
pub struct Ctx {
    pub scenario: RwSignal<Scenario>,
    /// messages next to controls, by control hook
    pub errors: RwSignal<BTreeMap<Control, String>>,
    pub notices: RwSignal<Vec<Notice>>,
    /// the last spectrum the user loaded, kept while another source is in use
    pub user_table: RwSignal<Option<TableSpec>>,
    /// the last blackbody temperature chosen [K]
    pub bb_temp: RwSignal<f64>,
    /// bumped when the window size changes, to redraw the plots
    pub layout: RwSignal<u32>,
    /// a line of status beside the link and file buttons
    pub status: RwSignal<Option<String>>,
    /// the last place and time used by any tab's clear-sky source (one per page)
    pub place: RwSignal<crate::scenario::place::ClearSkySpec>,
}

/// A message for people: first letter upper case, ends with a full stop.
pub fn sentence(msg: &str) -> String {
    let mut m = msg.trim().to_string();
    // ASCII only (every message starts with an ASCII letter), so the page carries no
    // Unicode case tables
    if let Some(first) = m.get_mut(0..1) {
        first.make_ascii_uppercase();
    }
    if !m.ends_with('.') {
        m.push('.');
    }
    m
}

impl Ctx {
    pub fn new(initial: Scenario) -> Ctx {
        let place = first_place(&initial);
        let user_table = match &initial.cell.spectrum {
            crate::scenario::SourceSpec::Table(t) => Some(t.clone()),
            _ => None,
        };
        let bb = match &initial.cell.spectrum {
            crate::scenario::SourceSpec::Blackbody { temp_k } => *temp_k,
            _ => 5772.0,
        };
        Ctx {
            scenario: RwSignal::new(initial),
            errors: RwSignal::new(BTreeMap::new()),
            notices: RwSignal::new(Vec::new()),
            user_table: RwSignal::new(user_table),
            bb_temp: RwSignal::new(bb),
            layout: RwSignal::new(0),
            status: RwSignal::new(None),
            place: RwSignal::new(place),
        }
    }

    pub fn set_error(&self, hook: Control, msg: String) {
        self.errors.update(|e| {
            e.insert(hook, msg);
        });
    }

    pub fn clear_error(&self, hook: Control) {
        if self.errors.with_untracked(|e| e.contains_key(&hook)) {
            self.errors.update(|e| {
                e.remove(&hook);
            });
        }
    }

    /// The message shown next to control `hook`, if any (reactive).
    pub fn error_of(&self, hook: Control) -> Option<String> {
        self.errors.with(|e| e.get(&hook).cloned())
    }

    /// Apply `f` to a copy of the scenario; commit it if it checks out, otherwise show the
    /// reason next to control `hook` and keep the current scenario. Returns whether the
    /// edit was committed.
    pub fn edit(&self, hook: Control, f: impl FnOnce(&mut Scenario)) -> bool {
        let mut next = self.scenario.get_untracked();
        f(&mut next);
        // a material's gap follows the cell temperature
        next.cell.sync_gap();
        match next.check() {
            Ok(()) => {
                self.clear_error(hook);
                if self.scenario.with_untracked(|s| *s != next) {
                    self.scenario.set(next);
                }
                true
            }
            Err(msg) => {
                self.set_error(hook, sentence(&msg));
                false
            }
        }
    }

    /// Apply a choice that may be missing (e.g. "your table" before one was loaded): with
    /// `Some(value)`, edit under `hook` as [`Ctx::edit`] does; with `None`, show `missing`
    /// next to the control and keep the scenario.
    pub fn choose<T>(
        &self,
        hook: Control,
        value: Option<T>,
        missing: &str,
        apply: impl FnOnce(&mut Scenario, T),
    ) -> bool {
        match value {
            Some(v) => self.edit(hook, move |s| apply(s, v)),
            None => {
                self.set_error(hook, missing.to_string());
                false
            }
        }
    }

    /// Move the band gap [eV] (from a drag, a key, a typed value or a preset). Only the gap
    /// changes, so only its range needs checking; the scenario is updated in place.
    pub fn set_gap(&self, hook: Control, gap_ev: f64) -> bool {
        mark("gg-edit");
        // the scenario's own range check; the page adds how to type a wavelength
        if let Err(e) = crate::scenario::check_gap_ev(gap_ev) {
            let mut msg = sentence(&e);
            if (100.0..=1e5).contains(&gap_ev) {
                msg.pop();
                msg.push_str(&format!(
                    " — for a wavelength, type it with its unit, e.g. '{} nm'.",
                    crate::view::format::field(gap_ev, 6)
                ));
            }
            self.set_error(hook, msg);
            return false;
        }
        self.clear_error(Control::Gap);
        self.clear_error(Control::GapNm);
        if self
            .scenario
            .with_untracked(|s| s.cell.gap_ev.to_bits() != gap_ev.to_bits() || s.cell.gap_material.is_some())
        {
            // a typed gap replaces a material's
            self.scenario.update(|s| {
                s.cell.gap_ev = gap_ev;
                s.cell.gap_material = None;
            });
        }
        true
    }

    pub fn gap(&self) -> f64 {
        self.scenario.with_untracked(|s| s.cell.gap_ev)
    }

    /// Add a notice, replacing any of the same kind.
    pub fn notify(&self, n: Notice) {
        self.notices.update(|v| {
            v.retain(|o| o.kind != n.kind);
            v.push(n);
        });
    }

    pub fn dismiss(&self, kind: NoticeKind) {
        self.notices.update(|v| v.retain(|o| o.kind != kind));
    }
}

/// The place of the first clear-sky source in `s` (cell, radiator's sun, hot absorber), or
/// the default place at noon local mean time today.
fn first_place(s: &Scenario) -> crate::scenario::place::ClearSkySpec {
    use crate::scenario::SourceSpec;
    let found = [Some(&s.cell.spectrum), s.radiator.sun.as_ref(), Some(&s.hot.absorber.source)]
        .into_iter()
        .flatten()
        .find_map(|src| match src {
            SourceSpec::ClearSky(c) => Some(c.clone()),
            _ => None,
        });
    found.unwrap_or_else(|| {
        let d = js_sys::Date::new_0();
        crate::view::place::default_spec(d.get_full_year() as i32, d.get_month() + 1, d.get_date())
    })
}

thread_local! {
    static RENDERS: std::cell::Cell<u64> = const { std::cell::Cell::new(0) };
}

/// Count one finished render in `body[data-renders]` (tests wait on it), once the figures'
/// text has been updated.
pub fn count_render() {
    let n = RENDERS.with(|r| {
        r.set(r.get() + 1);
        r.get()
    });
    set_timeout(
        move || {
            if let Some(body) = web_sys::window().and_then(|w| w.document()).and_then(|d| d.body()) {
                let _ = body.dataset().set("renders", &n.to_string());
            }
        },
        std::time::Duration::ZERO,
    );
}

/// Record a performance mark (for the latency benchmark).
pub fn mark(name: &str) {
    if let Some(p) = web_sys::window().and_then(|w| w.performance()) {
        let _ = p.mark(name);
    }
}
