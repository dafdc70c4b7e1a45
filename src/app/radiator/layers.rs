//! The layer-stack emitter: the "Emitter: profile | layers" switch, the table of layers
//! (material from the searchable list or a constant index, thickness in nm, add, remove,
//! move), the substrate, the bar diagram whose top edges drag (and whose focused layer the
//! arrow keys thicken or thin), and the two plots of the stack's optics. Every edit is a
//! whole new stack through [`Ctx::edit`], so the scenario's checks word the refusals, shown
//! beside the row they are about while the last good stack stays in use.
//!
//! While an edge is dragged or a key held, the stack is a draft drawn on the coarse grids
//! of [`crate::view::radiator::film`] and committed (with the balance evaluated) on release.
//!
//! Under the table: the thickness search ([`super::optimize`]).

use std::cell::Cell;
use std::rc::Rc;
use std::sync::Arc;

use leptos::ev;
use leptos::html;
use leptos::prelude::*;

use super::plots::film::{draw_map, draw_spectrum, draw_stack, stack_geometry, StackLook, EDGE_PICK_CSS};
use crate::app::radiator::state::{EdgeDrag, FilmSlot, RadiatorState, SUBSTRATE_ROW};
use crate::app::state::mark;
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::export::offer;
use crate::app::widgets::plot::render::draw_on_canvas;
use crate::app::widgets::plot::{Backend, Drawing, Frame, Look};
use crate::scenario::film::{Coherence, LayerSpec, MaterialSpec};
use crate::scenario::radiator::{AngularSpec, EmitterSpec, RadiatorScenario};
use crate::view::controls::Control;
use crate::view::export::ExportKind;
use crate::view::format::{field, fixed, sig};
use crate::view::input::parse_number;
use crate::view::radiator::film::{
    default_stack, film_view, map_csv, material_about, parse_material, round_thickness, spectrum_csv, stack_caption,
    stack_csv, step_thickness, substrate_note, FilmView, MaterialInfo, NEW_LAYER_NM, PAGE_MAX_LAYERS,
    SECOND_ANGLES_DEG,
};
use plotters::coord::Shift;
use plotters::prelude::DrawingArea;

/// The keys of the bar diagram, as the page states them.
pub const KEY_HELP: &str = "Keys on the stack: ↑/↓ thicken or thin the chosen layer by about 1 % (Shift: 10 %); Page Up/Page Down (or [ and ]) choose the layer above/below; Home/End the top/bottom one.";

const HOOK: Control = Control::FilmLayers;

thread_local! {
    /// when the last drag or key step asked for a redraw [ms, performance.now()]
    static EDIT_AT: Cell<Option<f64>> = const { Cell::new(None) };
}

fn now_ms() -> f64 {
    web_sys::window().and_then(|w| w.performance()).map(|p| p.now()).unwrap_or(0.0)
}

/// The stack in the scenario, if the emitter is one.
fn stack_of(r: &RadiatorScenario) -> Option<(Vec<LayerSpec>, MaterialSpec)> {
    match &r.emitter {
        EmitterSpec::Film { layers, substrate } => Some((layers.clone(), substrate.clone())),
        _ => None,
    }
}

fn stack_now(rad: RadiatorState) -> Option<(Vec<LayerSpec>, MaterialSpec)> {
    rad.ctx.scenario.with_untracked(|s| stack_of(&s.radiator))
}

/// The layers shown now: the draft of a drag, or the scenario's.
fn layers_shown(rad: RadiatorState) -> Option<Vec<LayerSpec>> {
    rad.film.draft.get_untracked().or_else(|| stack_now(rad).map(|s| s.0))
}

/// Commit a stack; a refusal is shown beside `row`. Returns whether it was taken.
fn commit(rad: RadiatorState, row: usize, layers: Vec<LayerSpec>, substrate: MaterialSpec) -> bool {
    mark("gg-edit");
    let ok = rad.ctx.edit(HOOK, move |s| s.radiator.emitter = EmitterSpec::Film { layers, substrate });
    rad.film.row_error.set(if ok { None } else { Some(row) });
    ok
}

fn commit_layers(rad: RadiatorState, row: usize, layers: Vec<LayerSpec>) -> bool {
    match stack_now(rad) {
        Some((_, substrate)) => commit(rad, row, layers, substrate),
        None => false,
    }
}

/// Say what is wrong beside `row` without changing the stack.
fn refuse(rad: RadiatorState, row: usize, msg: String) {
    rad.ctx.set_error(HOOK, msg);
    rad.film.row_error.set(Some(row));
}

/// Commit the draft of a drag or held key, if there is one.
fn settle(rad: RadiatorState) {
    rad.film.drag.set_value(None);
    if let Some(layers) = rad.film.draft.get_untracked() {
        let row = rad.film.focused.get_untracked().unwrap_or(0);
        commit_layers(rad, row, layers);
        rad.film.draft.set(None);
    }
}

/// Switch the emitter between its profile and a layer stack, keeping the other for later.
pub fn emitter_switch(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let film = rad.film;
    let is_film = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Film { .. })));
    let to_layers = move |_| {
        if is_film.get_untracked() {
            return;
        }
        let r = rad.scenario();
        let (layers, substrate) = film.saved_film.get_value().unwrap_or_else(default_stack);
        let kept = (r.emitter.clone(), r.solar_band.clone(), r.angular);
        if ctx.edit(Control::EmitterKind, move |s| {
            s.radiator.emitter = EmitterSpec::Film { layers, substrate };
            s.radiator.solar_band = None;
            s.radiator.angular = AngularSpec::Lambertian;
        }) {
            film.saved_profile.set_value(Some(kept));
            rad.selected.set(None);
            ctx.status.set(Some("The emitter is now a layer stack; your profile is kept for “profile”.".into()));
        }
    };
    let to_profile = move |_| {
        if !is_film.get_untracked() {
            return;
        }
        settle(rad);
        let (emitter, band, angular) = film
            .saved_profile
            .get_value()
            .unwrap_or_else(|| (RadiatorScenario::default().emitter, None, AngularSpec::Lambertian));
        ctx.edit(Control::EmitterKind, move |s| {
            s.radiator.emitter = emitter;
            s.radiator.solar_band = band;
            s.radiator.angular = angular;
        });
    };
    view! {
        <div class="field emitter-kind" role="group" aria-labelledby="emitter-kind-h">
            <span id="emitter-kind-h" class="presets-title">"Emitter:"</span>
            <div class="seg" data-control=Control::EmitterKind.as_str()>
                <button type="button" data-emitter="profile" aria-pressed=move || if is_film.get() { "false" } else { "true" } on:click=to_profile>"profile"</button>
                <button type="button" data-emitter="layers" aria-pressed=move || if is_film.get() { "true" } else { "false" } on:click=to_layers>"layers"</button>
            </div>
            <p class="field-error" id=format!("e-{}", Control::EmitterKind) data-error=Control::EmitterKind.as_str() aria-live="polite">{move || ctx.error_of(Control::EmitterKind)}</p>
        </div>
    }
}

/// One of the stack's plots of one view.
struct FilmPlot<'a> {
    slot: FilmSlot,
    v: &'a FilmView,
    colours: Vec<Option<usize>>,
    substrate_colour: Option<usize>,
    focused: Option<usize>,
    fixed_px_per_nm: Option<f64>,
}

impl Drawing for FilmPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        match self.slot {
            FilmSlot::Stack => {
                let s = StackLook {
                    colours: &self.colours,
                    substrate_colour: self.substrate_colour,
                    focused: self.focused,
                    fixed_px_per_nm: self.fixed_px_per_nm,
                };
                draw_stack(root, self.v, &s, look)
            }
            FilmSlot::Spectrum => draw_spectrum(root, self.v, look),
            FilmSlot::Map => draw_map(root, self.v, look),
        }
    }
}

fn list_index(m: &MaterialSpec, list: &[MaterialInfo]) -> Option<usize> {
    match m {
        MaterialSpec::Builtin { name } => list.iter().position(|i| i.name.eq_ignore_ascii_case(name)),
        _ => None,
    }
}

fn plot_of<'a>(rad: RadiatorState, slot: FilmSlot, v: &'a FilmView) -> FilmPlot<'a> {
    let list = rad.film.materials.get_value();
    FilmPlot {
        slot,
        v,
        colours: v.layers.iter().map(|l| list_index(&l.material, &list)).collect(),
        substrate_colour: list_index(&v.substrate, &list),
        focused: rad.film.focused.get_untracked(),
        fixed_px_per_nm: rad.film.drag.get_value().map(|d| d.px_per_nm),
    }
}

/// Compute and draw the stack's plots whenever the stack, its draft, the second angle, the
/// chosen layer or the layout changes.
pub fn film_effect(rad: RadiatorState, canvases: [NodeRef<html::Canvas>; 3]) {
    let ctx = rad.ctx;
    let film = rad.film;
    let stack = Memo::new(move |_| ctx.scenario.with(|s| stack_of(&s.radiator)));
    Effect::new(move |_| {
        ctx.layout.track();
        let Some((layers, substrate)) = stack.get() else { return };
        let draft = film.draft.get();
        let angle = film.angle.get();
        film.focused.track();
        let targets: Vec<_> = canvases.iter().map(|c| c.get()).collect();
        let coarse = draft.is_some();
        let layers = draft.unwrap_or(layers);
        let cached = film.view.with_untracked(|v| {
            v.as_ref()
                .filter(|v| {
                    v.layers == layers && v.substrate == substrate && v.angle_deg == angle && v.coarse == coarse
                })
                .cloned()
        });
        let v = match cached {
            Some(v) => v,
            None => match film_view(&layers, &substrate, angle, coarse) {
                Ok(v) => Arc::new(v),
                Err(e) => {
                    // a stack the scenario took cannot fail here; a draft can (it is not checked)
                    ctx.set_error(HOOK, crate::app::state::sentence(&e.to_string()));
                    return;
                }
            },
        };
        let mut frames = film.frames.get_untracked();
        let mut errors: [Option<String>; 3] = [None, None, None];
        for slot in FilmSlot::ALL {
            if let Some(canvas) = &targets[slot.index()] {
                match draw_on_canvas(canvas, &plot_of(rad, slot, &v)) {
                    Ok(Some(f)) => frames[slot.index()] = f,
                    Ok(None) => {}
                    Err(e) => errors[slot.index()] = Some(e),
                }
            }
        }
        // where each layer's top edge landed, in CSS px (for tests and tools)
        if let Some(canvas) = &targets[FilmSlot::Stack.index()] {
            let f = frames[FilmSlot::Stack.index()];
            if f.is_valid() {
                let d: Vec<f64> = v.layers.iter().map(|l| l.thickness_nm).collect();
                let g = stack_geometry(&f, &d, film.drag.get_value().map(|d| d.px_per_nm));
                let x = (f.left + (f.right - f.left) * 0.21) / f.scale;
                let at: Vec<String> = g.bars.iter().map(|b| format!("{x:.1},{:.1}", b.0)).collect();
                let _ = canvas.set_attribute("data-edges", &at.join(";"));
            }
        }
        film.frames.set(frames);
        if film.plot_errors.with_untracked(|p| *p != errors) {
            film.plot_errors.set(errors);
        }
        if film.view.with_untracked(|p| !p.as_ref().is_some_and(|p| Arc::ptr_eq(p, &v))) {
            film.view.set(Some(v));
        }
        // the time from a drag or key step to its redraw, for the browser test
        if let Some(t) = EDIT_AT.with(|e| e.take()) {
            let ms = now_ms() - t;
            if let Some(body) = web_sys::window().and_then(|w| w.document()).and_then(|d| d.body()) {
                let ds = body.dataset();
                let mut list = ds.get("filmRedrawMs").unwrap_or_default();
                if !list.is_empty() {
                    list.push(',');
                }
                list.push_str(&format!("{ms:.2}"));
                let _ = ds.set("filmRedrawMs", &list);
            }
        }
        if let Some(body) = web_sys::window().and_then(|w| w.document()).and_then(|d| d.body()) {
            let ds = body.dataset();
            let n: u64 = ds.get("filmRenders").and_then(|t| t.parse().ok()).unwrap_or(0);
            let _ = ds.set("filmRenders", &(n + 1).to_string());
        }
    });
}

/// The bar diagram: drag a layer's top edge, keys on the focused layer, hover read-outs.
struct StackCard {
    rad: RadiatorState,
}

impl StackCard {
    fn geometry(&self) -> Option<(super::plots::film::StackGeometry, Vec<LayerSpec>)> {
        let f = self.rad.film.frame(FilmSlot::Stack);
        if !f.is_valid() {
            return None;
        }
        let layers = layers_shown(self.rad)?;
        let d: Vec<f64> = layers.iter().map(|l| l.thickness_nm).collect();
        let fixed = self.rad.film.drag.get_value().map(|d| d.px_per_nm);
        Some((stack_geometry(&f, &d, fixed), layers))
    }

    /// A key or drag step to `layers`: a draft while `held`, otherwise committed.
    fn step(&self, row: usize, layers: Vec<LayerSpec>, held: bool) {
        EDIT_AT.with(|e| e.set(Some(now_ms())));
        if held {
            self.rad.film.draft.set(Some(layers));
        } else {
            commit_layers(self.rad, row, layers);
        }
    }
}

impl PlotBehaviour for StackCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let (g, layers) = self.geometry()?;
        let list = self.rad.film.materials.get_value();
        let f = self.rad.film.frame(FilmSlot::Stack);
        if x * f.scale < f.left || x * f.scale > f.right {
            return None;
        }
        if let Some(i) = g.bars.iter().position(|(t, b)| y >= *t - EDGE_PICK_CSS && y <= *b) {
            let l = &layers[i];
            let edge = (y - g.bars[i].0).abs() <= EDGE_PICK_CSS;
            return Some(Hover::new(
                x,
                y,
                width,
                None,
                vec![
                    format!(
                        "Layer {} of {}: {}, {} nm",
                        i + 1,
                        layers.len(),
                        l.material.text(),
                        field(l.thickness_nm, 6)
                    ),
                    material_about(&l.material, &list),
                    if edge {
                        "drag this top edge up or down to change the thickness".into()
                    } else {
                        "click to choose it; ↑/↓ change its thickness".into()
                    },
                ],
            ));
        }
        if y >= g.substrate_top {
            let sub = self
                .rad
                .film
                .view
                .with_untracked(|v| v.as_ref().map(|v| (v.substrate.clone(), v.absorbing_substrate)))?;
            return Some(Hover::new(
                x,
                y,
                width,
                None,
                vec![
                    format!("Substrate: {} (thick)", sub.0.text()),
                    material_about(&sub.0, &list),
                    substrate_note(sub.1).into(),
                ],
            ));
        }
        None
    }

    fn press(&self, x: f64, y: f64) -> bool {
        let Some((g, layers)) = self.geometry() else { return false };
        let f = self.rad.film.frame(FilmSlot::Stack);
        if x * f.scale < f.left || x * f.scale > f.right {
            return false;
        }
        // an edge first (the pointer may be just above the bar), then a bar's body
        let edge = g.bars.iter().position(|(t, _)| (y - t).abs() <= EDGE_PICK_CSS);
        let body = g.bars.iter().position(|(t, b)| y >= *t && y <= *b);
        match (edge, body) {
            (Some(i), _) => {
                self.rad.film.focused.set(Some(i));
                self.rad.film.drag.set_value(Some(EdgeDrag {
                    layer: i,
                    y0: y,
                    d0: layers[i].thickness_nm,
                    px_per_nm: g.px_per_nm.max(1e-9),
                }));
                true
            }
            (None, Some(i)) => {
                self.rad.film.focused.set(Some(i));
                true
            }
            _ => false,
        }
    }

    fn drag(&self, _x: f64, y: f64) {
        let Some(d) = self.rad.film.drag.get_value() else { return };
        let Some(mut layers) = layers_shown(self.rad) else { return };
        let Some(l) = layers.get_mut(d.layer) else { return };
        let next = round_thickness(d.d0 + (d.y0 - y) / d.px_per_nm);
        if next != l.thickness_nm {
            l.thickness_nm = next;
            self.step(d.layer, layers, true);
        }
    }

    fn release(&self) {
        settle(self.rad);
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let rad = self.rad;
        let Some(layers) = layers_shown(rad) else { return false };
        let n = layers.len();
        if n == 0 {
            return false;
        }
        let sel = rad.film.focused.get_untracked().filter(|i| *i < n);
        let choose = |i: usize| {
            rad.film.focused.set(Some(i));
            true
        };
        let thicken = |dir: i32| {
            let Some(i) = sel else { return choose(0) };
            let mut next = layers.clone();
            next[i].thickness_nm = step_thickness(next[i].thickness_nm, dir, ev.shift_key());
            self.step(i, next, ev.repeat());
            true
        };
        match ev.key().as_str() {
            "ArrowUp" | "ArrowRight" | "+" => thicken(1),
            "ArrowDown" | "ArrowLeft" | "-" => thicken(-1),
            "PageUp" | "[" => choose(sel.map(|i| i.saturating_sub(1)).unwrap_or(0)),
            "PageDown" | "]" => choose(sel.map(|i| (i + 1).min(n - 1)).unwrap_or(0)),
            "Home" => choose(0),
            "End" => choose(n - 1),
            _ => false,
        }
    }

    fn key_up(&self, _ev: &web_sys::KeyboardEvent) {
        settle(self.rad);
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        save(self.rad, FilmSlot::Stack, kind)
    }
}

/// The curves and the map: read-outs and downloads.
struct OpticsCard {
    rad: RadiatorState,
    slot: FilmSlot,
}

impl PlotBehaviour for OpticsCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.rad.film.frame(self.slot);
        let v = self.rad.film.view.get_untracked()?;
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let l = 10f64.powf(f.x_at_css(x));
        match self.slot {
            FilmSlot::Map => {
                let a = f.y_at_css(y);
                let (i, j) = v.map_cell(l, a)?;
                let e = v.map_at(i, j);
                Some(Hover::new(
                    x,
                    y,
                    width,
                    None,
                    vec![
                        format!(
                            "λ {} µm · {}° from the normal",
                            sig(v.map_lambda_um[i], 3),
                            fixed(v.map_angle_deg[j], 1)
                        ),
                        format!("emissivity {}", fixed(e, 3)),
                    ],
                ))
            }
            _ => {
                let i = v.nearest(l)?;
                let r = v.normal[i];
                let mut lines = vec![
                    format!("λ {} µm, normal incidence", sig(v.lambda_um[i], 4)),
                    format!(
                        "R {} · T {} · A {}",
                        fixed(r.reflectance, 3),
                        fixed(r.transmittance, 3),
                        fixed(r.absorptance, 3)
                    ),
                    format!("emissivity {}", fixed(v.normal_eps[i], 3)),
                ];
                if let (Some(o), Some(a)) = (v.oblique.get(i), v.angle_deg) {
                    lines.push(format!(
                        "at {}°: R {} · T {} · A {}",
                        field(a, 3),
                        fixed(o.reflectance, 3),
                        fixed(o.transmittance, 3),
                        fixed(o.absorptance, 3)
                    ));
                }
                Some(Hover::new(
                    x,
                    y,
                    width,
                    Some((f.css_of_x(v.lambda_um[i].log10()), f.css_of_y(r.reflectance))),
                    lines,
                ))
            }
        }
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        save(self.rad, self.slot, kind)
    }
}

fn save(rad: RadiatorState, slot: FilmSlot, kind: ExportKind) -> Result<(), String> {
    let v = rad.film.view.get_untracked().ok_or("nothing has been computed yet")?;
    let mut plot = plot_of(rad, slot, &v);
    plot.fixed_px_per_nm = None;
    plot.focused = None;
    let list = rad.film.materials.get_value();
    let csv = || match slot {
        FilmSlot::Stack => stack_csv(&v, &list),
        FilmSlot::Spectrum => spectrum_csv(&v),
        FilmSlot::Map => map_csv(&v),
    };
    offer(kind, slot.slug(), &plot, || stack_caption(&v), csv)
}

fn plot_error(rad: RadiatorState, slot: FilmSlot) -> Signal<Option<String>> {
    Signal::derive(move || rad.film.plot_errors.with(|e| e[slot.index()].clone()))
}

/// The message of the table beside `row`, when it is about that row.
fn row_message(rad: RadiatorState, row: usize, cols: usize) -> impl IntoView {
    let ctx = rad.ctx;
    move || {
        (rad.film.row_error.get() == Some(row)).then(|| ctx.error_of(HOOK)).flatten().map(|m| {
            view! {
                <tr class="row-error"><td colspan=cols><p class="field-error" id=format!("e-{HOOK}") data-error=HOOK.as_str() aria-live="polite">{m}</p></td></tr>
            }
        })
    }
}

/// A material field: the list's names (with what each is and its range) or a constant index.
fn material_input(
    rad: RadiatorState,
    control: String,
    label: String,
    value: Memo<Option<MaterialSpec>>,
    row: usize,
    commit_material: Rc<dyn Fn(MaterialSpec) -> bool>,
) -> impl IntoView {
    let input = NodeRef::<html::Input>::new();
    Effect::new(move |_| {
        let v = value.get();
        if let (Some(el), Some(m)) = (input.get(), v) {
            if !el.matches(":focus").unwrap_or(false) {
                el.set_value(&m.text());
            }
        }
    });
    let label_shown = label.clone();
    let take = move |text: String| match parse_material(&text) {
        Ok(m) => {
            if commit_material(m.clone()) {
                if let Some(el) = input.get_untracked() {
                    el.set_value(&m.text());
                }
            }
        }
        Err(msg) => refuse(rad, row, format!("{label}: {msg}. The stack in use is unchanged.")),
    };
    let t2 = take.clone();
    let on_change = move |ev: ev::Event| take(event_target_value(&ev));
    let on_key = move |ev: ev::KeyboardEvent| {
        if ev.key() == "Enter" {
            if let Some(el) = input.get_untracked() {
                t2(el.value());
            }
        }
    };
    let start = value.get_untracked().map(|m| m.text()).unwrap_or_default();
    let aria = label_shown;
    view! {
        <input
            type="text"
            list="film-materials"
            class="material-input"
            autocomplete="off"
            spellcheck="false"
            data-control=control
            aria-label=aria
            aria-describedby=format!("e-{HOOK}")
            value=start
            node_ref=input
            on:change=on_change
            on:keydown=on_key
        />
    }
}

/// A thickness field [nm]: commits as the user types when the text is a usable number.
fn thickness_input(rad: RadiatorState, i: usize) -> impl IntoView {
    let ctx = rad.ctx;
    let film = rad.film;
    let value = Memo::new(move |_| {
        film.draft.with(|d| d.as_ref().and_then(|d| d.get(i).map(|l| l.thickness_nm))).or_else(|| {
            ctx.scenario.with(|s| match &s.radiator.emitter {
                EmitterSpec::Film { layers, .. } => layers.get(i).map(|l| l.thickness_nm),
                _ => None,
            })
        })
    });
    let input = NodeRef::<html::Input>::new();
    Effect::new(move |_| {
        let v = value.get();
        if let (Some(el), Some(v)) = (input.get(), v) {
            let typed = parse_number(&el.value());
            if el.matches(":focus").unwrap_or(false) && typed == Some(v) {
                return;
            }
            el.set_value(&field(v, 6));
        }
    });
    let n = i + 1;
    let on_input = move |ev: ev::Event| {
        let text = event_target_value(&ev);
        let still = value.get_untracked().map(|v| format!(" Still using {} nm.", field(v, 6))).unwrap_or_default();
        match parse_number(&text) {
            Some(d) => {
                let Some(mut layers) = stack_now(rad).map(|s| s.0) else { return };
                if let Some(l) = layers.get_mut(i) {
                    l.thickness_nm = d;
                }
                if !commit_layers(rad, i, layers) {
                    ctx.errors.update(|e| {
                        if let Some(m) = e.get_mut(&HOOK) {
                            m.push_str(&still);
                        }
                    });
                }
            }
            None => refuse(
                rad,
                i,
                format!(
                    "Layer {n} thickness: '{}' is not a thickness; type a number of nm, e.g. 120.{still}",
                    text.trim()
                ),
            ),
        }
    };
    view! {
        <div class="input-unit">
            <input
                type="text"
                inputmode="decimal"
                autocomplete="off"
                spellcheck="false"
                class="thickness-input"
                data-control=format!("layer-{n}-nm")
                aria-label=format!("Layer {n}: thickness in nm")
                aria-describedby=format!("e-{HOOK}")
                aria-invalid=move || if film.row_error.get() == Some(i) && ctx.error_of(HOOK).is_some() { "true" } else { "false" }
                value=value.get_untracked().map(|v| field(v, 6)).unwrap_or_default()
                node_ref=input
                on:input=on_input
            />
            <span class="unit" aria-hidden="true">"nm"</span>
        </div>
    }
}

fn layer_row(rad: RadiatorState, i: usize, count: Memo<usize>) -> impl IntoView {
    let ctx = rad.ctx;
    let film = rad.film;
    let n = i + 1;
    let material = Memo::new(move |_| {
        ctx.scenario.with(|s| match &s.radiator.emitter {
            EmitterSpec::Film { layers, .. } => layers.get(i).map(|l| l.material.clone()),
            _ => None,
        })
    });
    let about = move || {
        let list = film.materials.get_value();
        material.get().map(|m| material_about(&m, &list))
    };
    let set_material: Rc<dyn Fn(MaterialSpec) -> bool> = Rc::new(move |m| {
        let Some(mut layers) = stack_now(rad).map(|s| s.0) else { return false };
        if let Some(l) = layers.get_mut(i) {
            l.material = m;
        }
        commit_layers(rad, i, layers)
    });
    let edit = move |f: &dyn Fn(&mut Vec<LayerSpec>) -> Option<usize>| {
        settle(rad);
        let Some(mut layers) = stack_now(rad).map(|s| s.0) else { return };
        let focus = f(&mut layers);
        if commit_layers(rad, i, layers) {
            film.focused.set(focus);
        }
    };
    let up = move |_: ev::MouseEvent| {
        edit(&|l| {
            (i > 0 && i < l.len()).then(|| {
                l.swap(i - 1, i);
                i - 1
            })
        })
    };
    let down = move |_: ev::MouseEvent| {
        edit(&|l| {
            (i + 1 < l.len()).then(|| {
                l.swap(i, i + 1);
                i + 1
            })
        })
    };
    let remove = move |_: ev::MouseEvent| {
        edit(&|l| {
            if i < l.len() {
                l.remove(i);
            }
            (!l.is_empty()).then(|| i.min(l.len() - 1))
        })
    };
    let is_last = move || i + 1 >= count.get();
    view! {
        <tr class:focused=move || film.focused.get() == Some(i) on:focusin=move |_| film.focused.set(Some(i))>
            <th scope="row">{n}</th>
            <td class="material-cell">
                {material_input(rad, format!("layer-{n}-material"), format!("Layer {n} material"), material, i, set_material)}
                <small class="about">{about}</small>
            </td>
            <td>{thickness_input(rad, i)}</td>
            <td class="row-actions">
                <button type="button" class="small ghost" data-action=format!("layer-{n}-up") aria-label=format!("Move layer {n} up (toward the sky)") disabled=move || i == 0 on:click=up>"↑"</button>
                <button type="button" class="small ghost" data-action=format!("layer-{n}-down") aria-label=format!("Move layer {n} down (toward the substrate)") disabled=is_last on:click=down>"↓"</button>
                <button type="button" class="small ghost" data-action=format!("layer-{n}-remove") aria-label=format!("Remove layer {n}") on:click=remove>"×"</button>
            </td>
        </tr>
        {row_message(rad, i, 4)}
    }
}

/// The table of layers, the substrate and the note on what lies behind it.
fn layer_table(rad: RadiatorState) -> impl IntoView {
    let ctx = rad.ctx;
    let film = rad.film;
    let count = Memo::new(move |_| ctx.scenario.with(|s| stack_of(&s.radiator).map(|s| s.0.len()).unwrap_or(0)));
    let substrate = Memo::new(move |_| ctx.scenario.with(|s| stack_of(&s.radiator).map(|s| s.1)));
    let set_substrate: Rc<dyn Fn(MaterialSpec) -> bool> = Rc::new(move |m| {
        let Some((layers, _)) = stack_now(rad) else { return false };
        commit(rad, SUBSTRATE_ROW, layers, m)
    });
    let substrate_about = move || {
        let list = film.materials.get_value();
        substrate.get().map(|m| material_about(&m, &list))
    };
    let note = move || film.view.with(|v| v.as_ref().map(|v| substrate_note(v.absorbing_substrate)));
    let add = move |_| {
        settle(rad);
        let Some(mut layers) = stack_now(rad).map(|s| s.0) else { return };
        if layers.len() >= PAGE_MAX_LAYERS {
            refuse(
                rad,
                layers.len().saturating_sub(1),
                format!("The table takes up to {PAGE_MAX_LAYERS} layers; remove one first."),
            );
            return;
        }
        let at = film.focused.get_untracked().filter(|i| *i < layers.len()).map(|i| i + 1).unwrap_or(layers.len());
        let material = layers
            .get(at.saturating_sub(1))
            .map(|l| l.material.clone())
            .unwrap_or(MaterialSpec::Builtin { name: "silica-ir".into() });
        layers.insert(at, LayerSpec { material, thickness_nm: NEW_LAYER_NM, coherence: Coherence::Auto });
        if commit_layers(rad, at, layers) {
            film.focused.set(Some(at));
        }
    };
    let list = film.materials.get_value();
    let options = list.iter().map(|m| view! { <option value=m.name label=m.option_text()></option> }).collect_view();
    view! {
        <datalist id="film-materials">{options}</datalist>
        <div class="film-table-wrap">
            <table class="film-table" data-control=HOOK.as_str()>
                <caption class="visually-hidden">"Layers from the sky side down, then the substrate"</caption>
                <thead>
                    <tr><th scope="col">"#"</th><th scope="col">"Material"</th><th scope="col">"Thickness"</th><th scope="col"><span class="visually-hidden">"Move or remove"</span></th></tr>
                </thead>
                <tbody>
                    <For each=move || 0..count.get() key=|i| *i children=move |i| layer_row(rad, i, count) />
                    <tr class="substrate-row">
                        <th scope="row">"sub."</th>
                        <td class="material-cell" colspan="3">
                            {material_input(rad, Control::FilmSubstrate.as_str().to_string(), "Substrate material".into(), substrate, SUBSTRATE_ROW, set_substrate)}
                            <small class="about">{substrate_about}</small>
                        </td>
                    </tr>
                    {row_message(rad, SUBSTRATE_ROW, 4)}
                </tbody>
            </table>
        </div>
        <p class="hint" hidden=move || count.get() != 0>"No layers: the bare substrate faces the sky. Add a layer to start a stack."</p>
        <div class="points-actions">
            <button type="button" class="small" data-action="add-layer" on:click=add>"Add layer"</button>
        </div>
        <p class="hint substrate-note">{note}</p>
        <p class="hint">"Type a material's name (the list filters as you type) or a constant index: n=1.5 (lossless) or nk=2.1/0.05. Each built-in material is known over its range only; beyond it its index is held at the end values (the warnings above the figures say where)."</p>
        {super::optimize::optimize_group(rad)}
    }
}

/// The stack card (bars and table), the curves and the map; shown while the emitter is a
/// stack.
pub fn film_cards(rad: RadiatorState, canvases: [NodeRef<html::Canvas>; 3]) -> impl IntoView {
    let ctx = rad.ctx;
    let film = rad.film;
    let is_film = Memo::new(move |_| ctx.scenario.with(|s| matches!(s.radiator.emitter, EmitterSpec::Film { .. })));
    let focused_line = move || {
        let v = film.view.get()?;
        let i = film.focused.get().filter(|i| *i < v.layers.len())?;
        let l = &v.layers[i];
        Some(format!(
            "Chosen: layer {} of {}, {} at {} nm",
            i + 1,
            v.layers.len(),
            l.material.text(),
            field(l.thickness_nm, 6)
        ))
    };
    let stack_note = view! {
        <p class="hint editor-selection" aria-live="polite">{focused_line}</p>
    };
    let stack_footer = view! {
        <p class="hint key-help">{KEY_HELP}</p>
        {layer_table(rad)}
    };
    let stack = plot_card(
        ctx,
        Card {
            slug: FilmSlot::Stack.slug(),
            title: "Layer stack",
            aria: format!("The layer stack as bars from the sky side down to the substrate, heights in proportion to thickness. Drag a layer's top edge to change its thickness. {KEY_HELP}"),
            interactive: true,
            wrap_class: "film-stack",
            control: Some(Control::FilmStack.as_str()),
            tools: ().into_any(),
            legend: view! { <span class="key">"layer 1 faces the sky; the substrate (hatched) is thick"</span> }.into_any(),
            note: stack_note.into_any(),
            footer: stack_footer.into_any(),
            canvas: canvases[0],
            plot_error: plot_error(rad, FilmSlot::Stack),
        },
        Rc::new(StackCard { rad }),
    );
    let angle_key = move || film.angle.get().map(|a| format!("{a}")).unwrap_or_else(|| "none".into());
    let on_angle = move |ev: ev::Event| {
        let v = event_target_value(&ev);
        film.angle.set(v.parse::<f64>().ok());
    };
    let angle_options = std::iter::once(("none".to_string(), "normal only".to_string()))
        .chain(SECOND_ANGLES_DEG.iter().map(|a| (format!("{a}"), format!("and at {a}°"))))
        .map(|(v, t)| {
            let v2 = v.clone();
            view! { <option value=v prop:selected=move || angle_key() == v2>{t}</option> }
        })
        .collect_view();
    let spectrum_tools = view! {
        <div class="plot-tools">
            <label class="range-field">
                <span>"Angle"</span>
                <select data-control="film-angle" on:change=on_angle>{angle_options}</select>
            </label>
        </div>
    };
    let spectrum_legend = move || {
        film.view.with(|v| {
            let v = v.as_ref()?;
            let oblique = v.angle_deg.map(|a| view! { <span class="key"><i class="k-line k-dashed"></i>{format!("dashed: at {}° from the normal", field(a, 3))}</span> });
            let eps = v.absorbing_substrate.then(|| view! { <span class="key"><i class="k-line k-film-eps"></i>"emissivity 1 − R (dotted)"</span> });
            Some(view! {
                <span class="key"><i class="k-line k-film-r"></i>"reflectance R"</span>
                <span class="key"><i class="k-line k-film-t"></i>"transmittance T into the substrate"</span>
                <span class="key"><i class="k-line k-film-a"></i>"absorptance A in the layers"</span>
                {oblique}
                {eps}
            })
        })
    };
    let spectrum = plot_card(
        ctx,
        Card {
            slug: FilmSlot::Spectrum.slug(),
            title: "Reflectance, transmittance, absorptance",
            aria: "Reflectance, transmittance into the substrate and absorptance in the layers against wavelength from 0.3 to 30 µm, at normal incidence and at a second angle.".into(),
            interactive: false,
            wrap_class: "",
            control: None,
            tools: spectrum_tools.into_any(),
            legend: spectrum_legend.into_any(),
            note: ().into_any(),
            footer: ().into_any(),
            canvas: canvases[1],
            plot_error: plot_error(rad, FilmSlot::Spectrum),
        },
        Rc::new(OpticsCard { rad, slot: FilmSlot::Spectrum }),
    );
    let map = plot_card(
        ctx,
        Card {
            slug: FilmSlot::Map.slug(),
            title: "Emissivity by wavelength and angle",
            aria: "The stack's emissivity over wavelength (0.3 to 30 µm) and angle from the normal (0 to 90°), with a colour scale from 0 to 1.".into(),
            interactive: false,
            wrap_class: "",
            control: None,
            tools: ().into_any(),
            legend: view! { <span class="key">"unpolarized; what the balance uses in every direction"</span> }.into_any(),
            note: ().into_any(),
            footer: ().into_any(),
            canvas: canvases[2],
            plot_error: plot_error(rad, FilmSlot::Map),
        },
        Rc::new(OpticsCard { rad, slot: FilmSlot::Map }),
    );
    view! {
        <div class="film-cards" hidden=move || !is_film.get()>
            {stack}
            {spectrum}
            {map}
        </div>
    }
}
