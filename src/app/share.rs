//! The scenario in the address bar and in local storage.
//!
//! On opening, a link in the fragment wins; without one the last saved scenario is used;
//! anything unreadable gives a notice and the default scenario (the unreadable saved text
//! is kept under a second key, and saved work is never overwritten before the user edits).
//! After every render the fragment is rewritten with `history.replaceState`, and the
//! scenario is saved.

use std::cell::{Cell, RefCell};
use std::rc::Rc;
use std::time::Duration;

use leptos::prelude::*;
use wasm_bindgen::JsValue;

use crate::app::state::{sentence, Ctx, Notice, NoticeAction, NoticeKind};
use crate::codec::{encode_fragment, open, to_json, MAX_LINK_CHARS};
use crate::scenario::{Scenario, SourceSpec};

pub const STORAGE_KEY: &str = "glowgap:scenario";
/// Where an unreadable saved scenario is moved, so that nothing the user had is destroyed.
pub const UNREADABLE_KEY: &str = "glowgap:scenario:unreadable";
/// A user spectrum with more points than this is written to the link and storage a little
/// after the last edit, not on every drag step.
const LARGE_TABLE_POINTS: usize = 20_000;

fn storage() -> Option<web_sys::Storage> {
    web_sys::window()?.local_storage().ok()?
}

pub fn location_hash() -> String {
    web_sys::window().and_then(|w| w.location().hash().ok()).unwrap_or_default()
}

fn read_saved() -> Option<String> {
    storage()?.get_item(STORAGE_KEY).ok()?
}

/// The scenario to open with, the notices to show, and whether saving must wait for the
/// user's first edit (the saved work is then still the user's to restore).
pub struct Opening {
    pub scenario: Scenario,
    pub notices: Vec<Notice>,
    pub hold_storage: bool,
}

fn saved_scenario() -> Option<Scenario> {
    let text = read_saved()?;
    open(&text).ok().map(|(s, _)| s)
}

pub fn opening() -> Opening {
    let hash = location_hash();
    let mut notices = Vec::new();
    if hash.len() > 1 {
        let saved = saved_scenario();
        match open(&hash).map(|(s, _)| s) {
            Ok(s) => {
                if let Some(prev) = saved.filter(|p| *p != s) {
                    notices.push(Notice {
                        kind: NoticeKind::Restore,
                        text: "Opened the scenario in the link. The scenario you were last working on is kept: you can go back to it.".into(),
                        alert: false,
                        action: Some(NoticeAction::Restore(Box::new(prev), "Back to my last scenario")),
                    });
                }
                return Opening { scenario: s, notices, hold_storage: false };
            }
            Err(e) => {
                let text = format!(
                    "This link could not be opened: {}. Showing the default scenario instead.",
                    sentence(&e.0).trim_end_matches('.')
                );
                let action = saved.clone().map(|p| NoticeAction::Restore(Box::new(p), "Open my last saved scenario"));
                notices.push(Notice { kind: NoticeKind::Link, text, alert: true, action });
                return Opening { scenario: Scenario::default(), notices, hold_storage: saved.is_some() };
            }
        }
    }
    if let Some(text) = read_saved() {
        match open(&text).map(|(s, _)| s) {
            Ok(s) => return Opening { scenario: s, notices, hold_storage: false },
            Err(e) => {
                if let Some(st) = storage() {
                    let _ = st.set_item(UNREADABLE_KEY, &text);
                }
                notices.push(Notice {
                    kind: NoticeKind::Storage,
                    text: format!(
                        "Your last saved scenario could not be read ({}); starting from the default scenario. The unreadable copy was set aside in this browser's storage.",
                        e.0.trim_end_matches('.')
                    ),
                    alert: true,
                    action: None,
                });
            }
        }
    }
    Opening { scenario: Scenario::default(), notices, hold_storage: false }
}

/// Writes the scenario to the address bar and storage.
pub struct Persist {
    /// saved work is not overwritten while the page still shows this untouched scenario
    pub hold: RefCell<Option<Scenario>>,
    /// the fragment last written by the page (to tell our writes from the user's)
    pub last_fragment: RefCell<String>,
    generation: Cell<u64>,
    told_full: Cell<bool>,
}

impl Persist {
    pub fn new(hold: Option<Scenario>) -> Rc<Persist> {
        Rc::new(Persist {
            hold: RefCell::new(hold),
            last_fragment: RefCell::new(String::new()),
            generation: Cell::new(0),
            told_full: Cell::new(false),
        })
    }
}

/// Points of the tables the scenario carries (user spectrum, measured emissivity, sky).
fn table_points(s: &Scenario) -> usize {
    use crate::scenario::radiator::{EmitterSpec, SkySpec};
    let cell = match &s.cell.spectrum {
        SourceSpec::Table(t) => t.x.len(),
        _ => 0,
    };
    let r = &s.radiator;
    let emitter = match &r.emitter {
        EmitterSpec::Table(t) => t.wavelength_m.len(),
        _ => 0,
    };
    let sky = match &r.sky {
        SkySpec::Table(t) => t.wavelength_m.len(),
        _ => 0,
    };
    cell + emitter + sky
}

/// Write the current scenario out: now for ordinary scenarios, shortly after the last edit
/// for a scenario carrying a large spectrum.
pub fn persist(ctx: Ctx, p: &Rc<Persist>) {
    let large = ctx.scenario.with_untracked(|s| table_points(s) > LARGE_TABLE_POINTS);
    if !large {
        write_now(ctx, p);
        return;
    }
    let gen = p.generation.get() + 1;
    p.generation.set(gen);
    let p2 = p.clone();
    set_timeout(
        move || {
            if p2.generation.get() == gen {
                write_now(ctx, &p2);
            }
        },
        Duration::from_millis(400),
    );
}

fn write_now(ctx: Ctx, p: &Persist) {
    let Some(window) = web_sys::window() else { return };
    ctx.scenario.with_untracked(|s| {
        let frag = encode_fragment(s);
        if let Ok(history) = window.history() {
            if frag.len() <= MAX_LINK_CHARS {
                if *p.last_fragment.borrow() != frag {
                    let _ = history.replace_state_with_url(&JsValue::NULL, "", Some(&frag));
                    *p.last_fragment.borrow_mut() = frag;
                }
                if ctx.status.with_untracked(|m| m.as_deref().is_some_and(|t| t.starts_with("This scenario is too large"))) {
                    ctx.status.set(None);
                }
            } else {
                // too long to be read back: leave no stale scenario in the address bar
                let url = window.location().href().unwrap_or_default();
                let bare = url.split('#').next().unwrap_or("").to_string();
                let _ = history.replace_state_with_url(&JsValue::NULL, "", Some(&bare));
                p.last_fragment.borrow_mut().clear();
                ctx.status.set(Some(format!(
                    "This scenario is too large for a link ({} characters; links hold up to {MAX_LINK_CHARS}). Use “Save scenario” to keep or share it as a file.",
                    frag.len()
                )));
            }
        }
        let held = p.hold.borrow().as_ref().is_some_and(|h| h == s);
        if held {
            return;
        }
        p.hold.borrow_mut().take();
        if let Some(st) = storage() {
            if st.set_item(STORAGE_KEY, &to_json(s)).is_err() && !p.told_full.replace(true) {
                ctx.notify(Notice {
                    kind: NoticeKind::Save,
                    text: "This browser's storage is full or switched off, so the scenario is not saved here; the link in the address bar still holds it.".into(),
                    alert: false,
                    action: None,
                });
            }
        }
    });
}

/// Follow a scenario link pasted into the address bar of the open page.
pub fn on_hash_change(ctx: Ctx, p: &Persist) {
    let hash = location_hash();
    if hash.len() <= 1 || *p.last_fragment.borrow() == hash {
        return;
    }
    match open(&hash).map(|(s, _)| s) {
        Ok(s) => {
            ctx.dismiss(NoticeKind::Link);
            apply_scenario(ctx, s);
        }
        Err(e) => ctx.notify(Notice {
            kind: NoticeKind::Link,
            text: format!(
                "This link could not be opened: {}. Your current scenario is unchanged.",
                sentence(&e.0).trim_end_matches('.')
            ),
            alert: true,
            action: None,
        }),
    }
}

/// Replace the whole scenario (from a link or a file), remembering its spectrum choices.
pub fn apply_scenario(ctx: Ctx, s: Scenario) {
    match &s.cell.spectrum {
        SourceSpec::Table(t) => ctx.user_table.set(Some(t.clone())),
        SourceSpec::Blackbody { temp_k } => ctx.bb_temp.set(*temp_k),
        _ => {}
    }
    ctx.errors.update(|e| e.clear());
    ctx.scenario.set(s);
}

/// Copy the page's address (which holds the scenario) to the clipboard.
pub fn copy_link(ctx: Ctx, fallback: RwSignal<Option<String>>) {
    let Some(window) = web_sys::window() else { return };
    let href = window.location().href().unwrap_or_default();
    if !href.contains('#') {
        ctx.status.set(Some("There is no link to copy for this scenario; use “Save scenario” instead.".into()));
        return;
    }
    let nav = window.navigator();
    let has_clipboard = js_sys::Reflect::get(&nav, &JsValue::from_str("clipboard"))
        .map(|v| !v.is_undefined() && !v.is_null())
        .unwrap_or(false);
    if !has_clipboard {
        fallback.set(Some(href));
        ctx.status.set(Some(
            "This browser offers no clipboard here; the link is selected below — press Ctrl+C (⌘C) to copy it.".into(),
        ));
        return;
    }
    let promise = nav.clipboard().write_text(&href);
    let len = href.len();
    let with_table = ctx.scenario.with_untracked(|s| matches!(s.cell.spectrum, SourceSpec::Table(_)));
    leptos::task::spawn_local(async move {
        match wasm_bindgen_futures::JsFuture::from(promise).await {
            Ok(_) => {
                fallback.set(None);
                let what = if with_table { "the whole scenario, your spectrum included" } else { "the whole scenario" };
                ctx.status.set(Some(format!("Link copied ({len} characters). It holds {what}.")));
            }
            Err(_) => {
                fallback.set(Some(href));
                ctx.status.set(Some(
                    "The browser did not allow copying; the link is selected below — press Ctrl+C (⌘C) to copy it."
                        .into(),
                ));
            }
        }
    });
}
