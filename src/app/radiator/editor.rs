//! Editing the emissivity profile: the editor plot's pointer and keys, and the table of
//! control points. Every edit is a whole new list of points checked by [`Ctx::edit`]; a
//! profile that is not made of control points (a preset, a measured table) becomes the
//! points drawn as hollow handles on its first edit.

use crate::view::controls::Control;
use std::rc::Rc;
use std::sync::Arc;

use leptos::html;
use leptos::prelude::*;

use crate::view::export::ExportKind;

use super::export;
use super::plots::editor::PICK_RADIUS;
use crate::app::radiator::state::{RadiatorState, Slot};
use crate::app::state::{mark, Ctx};
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::fields::{numeric_input, NumberInput};
use crate::scenario::radiator::EmitterSpec;
use crate::view::format::{field, fixed, sig};
use crate::view::input::parse_number;
use crate::view::radiator::points::{as_points, insert_after, insert_at, move_point, preset_of, remove, step_point};
use crate::view::radiator::RadiatorView;
use crate::view::spectrum::interpolate;

/// The hook under which editor messages are shown.
pub const HOOK: Control = Control::EmissivityEditor;
/// The hook of the points table's messages.
pub const TABLE_HOOK: Control = Control::EmissivityPoints;

/// The keys, as the page states them.
pub const KEY_HELP: &str = "Keys on the plot: ←/→ move the chosen point 1 % in wavelength (Shift: 10 %), ↑/↓ 0.01 in emissivity (Shift: 0.1); Page Up/Page Down (or [ and ]) choose the previous/next point; Delete removes it; Insert or Enter adds one after it; Esc lets go.";

/// Commit `points` as the profile under `hook`; says where the points came from when the
/// profile was not made of points before.
fn commit(rad: RadiatorState, hook: Control, points: Vec<[f64; 2]>) -> bool {
    mark("gg-edit");
    let ctx = rad.ctx;
    let before = ctx.scenario.with_untracked(|s| s.radiator.emitter.clone());
    if matches!(before, EmitterSpec::Film { .. }) {
        ctx.set_error(
            hook,
            "The layer stack sets this emissivity; choose “profile” under Surface to shape a profile by points.".into(),
        );
        return false;
    }
    let ok = ctx.edit(hook, |s| s.radiator.emitter = EmitterSpec::Points { points });
    if ok && !matches!(before, EmitterSpec::Points { .. }) {
        let again = match (&before, preset_of(&before)) {
            (_, Some(_)) => "choose its preset again to go back to it",
            (EmitterSpec::Table(_), _) => "your measured profile stays under “Measured” among the presets",
            _ => "undo by choosing a preset",
        };
        ctx.status.set(Some(format!("The profile ({}) is now control points you can move; {again}.", before.label())));
    }
    ok
}

/// The points to edit: the profile's own, or the ones it becomes.
fn points_now(rad: RadiatorState) -> Option<Vec<[f64; 2]>> {
    rad.ctx.scenario.with_untracked(|s| as_points(&s.radiator.emitter))
}

/// The selected point, if it is still one of the points.
fn selected(rad: RadiatorState, n: usize) -> Option<usize> {
    rad.selected.get_untracked().filter(|i| *i < n)
}

struct EditorCard {
    rad: RadiatorState,
}

impl EditorCard {
    fn computed(&self) -> Option<Arc<RadiatorView>> {
        self.rad.computed.get_untracked()
    }

    /// The control point under CSS (x, y), if any.
    fn pick(&self, x: f64, y: f64) -> Option<usize> {
        let f = self.rad.frame(Slot::Editor);
        let c = self.computed()?;
        if !f.is_valid() {
            return None;
        }
        c.profile
            .handles
            .iter()
            .enumerate()
            .map(|(i, p)| (i, (f.css_of_x(p[0].log10()) - x).hypot(f.css_of_y(p[1]) - y)))
            .filter(|(_, d)| *d <= PICK_RADIUS)
            .min_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(i, _)| i)
    }

    /// (wavelength [um], emissivity) at CSS (x, y), kept on the plot.
    fn value_at(&self, x: f64, y: f64) -> (f64, f64) {
        let f = self.rad.frame(Slot::Editor);
        (10f64.powf(f.x_at_css(x)), f.y_at_css(y).clamp(0.0, 1.0))
    }

    fn range(&self) -> (f64, f64) {
        self.computed().map(|c| c.range_um).unwrap_or(crate::view::radiator::points::EDITOR_RANGE_UM)
    }

    fn edit(&self, points: Vec<[f64; 2]>) -> bool {
        commit(self.rad, HOOK, points)
    }
}

impl PlotBehaviour for EditorCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.rad.frame(Slot::Editor);
        let c = self.computed()?;
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let n = c.profile.handles.len();
        if let Some(i) = self.pick(x, y) {
            let p = c.profile.handles[i];
            let how = if c.profile.editable {
                "drag to move · double-click to remove"
            } else {
                "drag to reshape: the profile becomes control points"
            };
            let dot = Some((f.css_of_x(p[0].log10()), f.css_of_y(p[1])));
            return Some(Hover::new(
                x,
                y,
                width,
                dot,
                vec![
                    format!("point {} of {n}: {} µm, emissivity {}", i + 1, field(p[0], 4), fixed(p[1], 3)),
                    how.into(),
                ],
            ));
        }
        let (l, _) = self.value_at(x, y);
        let lx = l.log10();
        let e = c.eps_at(l);
        let bg = &c.background;
        let at = |v: &[f64]| interpolate(&bg.x, v, lx);
        let mut lines = vec![
            format!("λ {} µm · emissivity {}", sig(l, 4), fixed(e, 3)),
            format!("sky transmittance {} (zenith)", fixed(at(&bg.sky), 3)),
            format!(
                "sun: {} W m⁻² µm⁻¹{}",
                sig(at(&bg.sun) * bg.sun_peak, 3),
                if c.scenario.sun.is_some() { "" } else { " (sun off)" }
            ),
            format!(
                "blackbody at {} K: {} W m⁻² µm⁻¹",
                field(c.scenario.surface_temperature(), 5),
                sig(at(&bg.bb) * bg.bb_peak, 3)
            ),
        ];
        lines.push("double-click to add a point here".into());
        Some(Hover::new(x, y, width, Some((x, f.css_of_y(e))), lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        match self.pick(x, y) {
            Some(i) => {
                self.rad.selected.set(Some(i));
                true
            }
            None => false,
        }
    }

    fn drag(&self, x: f64, y: f64) {
        let Some(pts) = points_now(self.rad) else { return };
        let Some(i) = selected(self.rad, pts.len()) else { return };
        if !self.rad.coarse.get_untracked() {
            self.rad.coarse.set(true);
        }
        let (l, e) = self.value_at(x, y);
        let snap = self.rad.snap.get_untracked();
        let next = move_point(&pts, i, l, e, self.range(), snap);
        if next != pts || self.rad.points().is_none() {
            self.edit(next);
        }
    }

    fn release(&self) {
        if self.rad.coarse.get_untracked() {
            self.rad.coarse.set(false);
        }
    }

    fn double_click(&self, x: f64, y: f64) {
        let f = self.rad.frame(Slot::Editor);
        let Some(pts) = points_now(self.rad) else { return };
        let outcome = match self.pick(x, y) {
            Some(i) => remove(&pts, i).map(|p| (p, None)),
            None if f.contains_css(x, y, 0.0) => {
                let (l, e) = self.value_at(x, y);
                insert_at(&pts, l, e).map(|(p, i)| (p, Some(i)))
            }
            None => return,
        };
        match outcome {
            Ok((p, sel)) => {
                if self.edit(p) {
                    self.rad.selected.set(sel);
                }
            }
            Err(msg) => self.rad.ctx.set_error(HOOK, msg),
        }
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let rad = self.rad;
        let Some(pts) = points_now(rad) else { return false };
        let n = pts.len();
        let sel = selected(rad, n);
        let big = ev.shift_key();
        let choose = |i: usize| {
            rad.selected.set(Some(i));
            true
        };
        let key = ev.key();
        let step = |dl: i32, de: i32| -> bool {
            match sel {
                None => choose(0),
                Some(i) => {
                    if ev.repeat() && !rad.coarse.get_untracked() {
                        rad.coarse.set(true);
                    }
                    self.edit(step_point(&pts, i, dl, de, big, self.range()));
                    true
                }
            }
        };
        match key.as_str() {
            "ArrowLeft" => step(-1, 0),
            "ArrowRight" => step(1, 0),
            "ArrowUp" => step(0, 1),
            "ArrowDown" => step(0, -1),
            "PageUp" | "[" => choose(sel.map(|i| i.saturating_sub(1)).unwrap_or(0)),
            "PageDown" | "]" => choose(sel.map(|i| (i + 1).min(n - 1)).unwrap_or(0)),
            "Home" => choose(0),
            "End" => choose(n - 1),
            "Delete" | "Backspace" => {
                let Some(i) = sel else { return false };
                match remove(&pts, i) {
                    Ok(p) => {
                        if self.edit(p) {
                            rad.selected.set(if i > 0 { Some(i - 1) } else { Some(0) });
                        }
                    }
                    Err(msg) => rad.ctx.set_error(HOOK, msg),
                }
                true
            }
            "Insert" | "Enter" => {
                let at = sel.unwrap_or(n / 2).min(n - 1);
                match insert_after(&pts, at, self.range()) {
                    Ok((p, i)) => {
                        if self.edit(p) {
                            rad.selected.set(Some(i));
                        }
                    }
                    Err(msg) => rad.ctx.set_error(HOOK, msg),
                }
                true
            }
            "Escape" if sel.is_some() => {
                rad.selected.set(None);
                true
            }
            _ => false,
        }
    }

    fn key_up(&self, _ev: &web_sys::KeyboardEvent) {
        self.release();
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let c = self.computed().ok_or("nothing has been computed yet")?;
        export::save(Slot::Editor, &c, self.rad.selected.get_untracked(), kind)
    }
}

/// A line saying which point the keys act on.
fn selection_line(rad: RadiatorState) -> impl IntoView {
    move || {
        let c = rad.computed.get()?;
        let i = rad.selected.get().filter(|i| *i < c.profile.handles.len())?;
        let p = c.profile.handles[i];
        Some(format!(
            "Chosen: point {} of {} — {} µm, emissivity {}",
            i + 1,
            c.profile.handles.len(),
            field(p[0], 4),
            fixed(p[1], 3)
        ))
    }
}

fn legend(rad: RadiatorState) -> impl IntoView {
    move || {
        rad.computed.with(|c| {
            let c = c.as_ref()?;
            let sun = if c.scenario.sun.is_some() { String::new() } else { " — sun off".into() };
            Some(view! {
                <span class="key"><i class="k-line k-emis"></i>"emissivity (drag the points)"</span>
                <span class="key"><i class="k-fill k-sky"></i>"sky transmittance, zenith"</span>
                <span class="key"><i class="k-fill k-absorbed"></i>{format!("{}, peak = 1{sun}", c.background.sun_name)}</span>
                <span class="key"><i class="k-line k-bb"></i>{format!("blackbody at {} K, peak = 1", field(c.scenario.surface_temperature(), 5))}</span>
            })
        })
    }
}

pub fn editor_card(rad: RadiatorState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = rad.ctx;
    let tools = view! {
        <div class="plot-tools">
            <label class="check">
                <input type="checkbox" data-control="snap" prop:checked=move || rad.snap.get() on:change=move |ev| rad.snap.set(event_target_checked(&ev)) />
                "Snap (2 significant figures, 0.05)"
            </label>
        </div>
    };
    let note = view! {
        <p class="field-error" id=format!("e-{HOOK}") data-error=HOOK.as_str() aria-live="polite">{move || ctx.error_of(HOOK)}</p>
        <p class="hint editor-selection" aria-live="polite">{selection_line(rad)}</p>
    };
    let footer = view! {
        <p class="hint key-help">{KEY_HELP}</p>
        <details class="points-details" open>
            <summary>{move || match rad.computed.with(|c| c.as_ref().filter(|c| c.profile.editable).map(|c| c.profile.handles.len())) {
                Some(n) => format!("Control points as numbers ({n})"),
                None => "Control points as numbers".to_string(),
            }}</summary>
            {points_table(rad)}
        </details>
    };
    plot_card(
        ctx,
        Card {
            slug: Slot::Editor.slug(),
            title: "Emissivity profile",
            aria: format!("Emissivity profile editor over the sky's transmittance, the sun's spectrum and the blackbody curve. Drag a control point; double-click to add or remove one. {KEY_HELP}"),
            interactive: true,
            wrap_class: "editor",
            control: Some(HOOK.as_str()),
            tools: tools.into_any(),
            legend: legend(rad).into_any(),
            note: note.into_any(),
            footer: footer.into_any(),
            canvas,
            plot_error: Signal::derive(move || rad.plot_errors.with(|e| e[Slot::Editor.index()].clone())),
        },
        Rc::new(EditorCard { rad }),
    )
}

/// One value of point `i` (0: wavelength, 1: emissivity), NaN once it is gone.
fn point_value(ctx: Ctx, i: usize, k: usize) -> Memo<f64> {
    Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.radiator.emitter {
            EmitterSpec::Points { points } => points.get(i).map(|p| p[k]).unwrap_or(f64::NAN),
            _ => f64::NAN,
        })
    })
}

/// Set value `k` of point `i` to `v` (as typed: the scenario's checks say what is wrong).
fn set_point(rad: RadiatorState, i: usize, k: usize, v: f64) -> bool {
    let Some(mut pts) = rad.points() else { return false };
    let Some(p) = pts.get_mut(i) else { return false };
    p[k] = v;
    commit(rad, TABLE_HOOK, pts)
}

fn parse_wavelength(t: &str) -> Result<f64, String> {
    parse_number(t).ok_or_else(|| format!("'{}' is not a wavelength; type a number of µm, e.g. 8", t.trim()))
}

fn parse_fraction(t: &str) -> Result<f64, String> {
    parse_number(t)
        .ok_or_else(|| format!("'{}' is not an emissivity; type a fraction from 0 to 1, e.g. 0.95", t.trim()))
}

fn row(rad: RadiatorState, i: usize) -> impl IntoView {
    let ctx = rad.ctx;
    let cell = |k: usize| {
        let (what, unit, example): (&str, &'static str, &'static str) =
            if k == 0 { ("wavelength", "µm", "8") } else { ("emissivity", "", "0.95") };
        let show: fn(f64) -> String = if k == 0 { |v| field(v, 4) } else { |v| field(v, 3) };
        let parse: fn(&str) -> Result<f64, String> = if k == 0 { parse_wavelength } else { parse_fraction };
        let input = NumberInput {
            hook: TABLE_HOOK,
            control: format!("point-{}-{}", i + 1, if k == 0 { "um" } else { "eps" }),
            id: None,
            aria_label: Some(format!("Point {}: {what}", i + 1)),
            describedby: format!("e-{TABLE_HOOK}"),
            unit,
            example,
            value: point_value(ctx, i, k),
            show,
            parse,
        };
        numeric_input(ctx, input, Rc::new(move |v| set_point(rad, i, k, v)), None)
    };
    let on_remove = move |_| {
        if let Some(pts) = rad.points() {
            match remove(&pts, i) {
                Ok(p) => {
                    commit(rad, TABLE_HOOK, p);
                }
                Err(msg) => ctx.set_error(TABLE_HOOK, msg),
            }
        }
    };
    view! {
        <tr class:selected=move || rad.selected.get() == Some(i) on:focusin=move |_| rad.selected.set(Some(i))>
            <th scope="row">{i + 1}</th>
            <td>{cell(0)}</td>
            <td>{cell(1)}</td>
            <td>
                <button type="button" class="small ghost" data-action=format!("remove-point-{}", i + 1) aria-label=format!("Remove point {}", i + 1) on:click=on_remove>"×"</button>
            </td>
        </tr>
    }
}

/// The control points as a small table, with add and convert buttons.
pub fn points_table(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let count = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.radiator.emitter {
            EmitterSpec::Points { points } => points.len(),
            _ => 0,
        })
    });
    let convert = move |_| {
        if let Some(p) = points_now(rad) {
            commit(rad, TABLE_HOOK, p);
        }
    };
    let add = move |_| {
        let Some(pts) = points_now(rad) else { return };
        let n = pts.len();
        let at = selected(rad, n).unwrap_or(n.saturating_sub(1));
        let range = rad
            .computed
            .with_untracked(|c| c.as_ref().map(|c| c.range_um))
            .unwrap_or(crate::view::radiator::points::EDITOR_RANGE_UM);
        match insert_after(&pts, at, range) {
            Ok((p, i)) => {
                if commit(rad, TABLE_HOOK, p) {
                    rad.selected.set(Some(i));
                }
            }
            Err(msg) => ctx.set_error(TABLE_HOOK, msg),
        }
    };
    view! {
        <div class="points-block">
            <div class="points-scroll" hidden=move || count.get() == 0>
                <table class="points-table" data-control="emissivity-points">
                    <thead>
                        <tr><th scope="col">"#"</th><th scope="col">"Wavelength (µm)"</th><th scope="col">"Emissivity"</th><th scope="col"><span class="visually-hidden">"Remove"</span></th></tr>
                    </thead>
                    <tbody>
                        <For each=move || 0..count.get() key=|i| *i children=move |i| row(rad, i) />
                    </tbody>
                </table>
            </div>
            <p class="hint" hidden=move || count.get() != 0>
                "This profile is not made of control points. Drag a hollow point on the plot, or turn it into points here, to reshape it."
            </p>
            <div class="points-actions">
                <button type="button" class="small" data-action="add-point" on:click=add>"Add point"</button>
                <button type="button" class="small" data-action="edit-as-points" hidden=move || count.get() != 0 on:click=convert>"Edit as control points"</button>
            </div>
            <p class="field-error" id=format!("e-{TABLE_HOOK}") data-error=TABLE_HOOK.as_str() aria-live="polite">{move || ctx.error_of(TABLE_HOOK)}</p>
        </div>
    }
}
