//! The stack panel's plot cards: the spectrum with its draggable band-gap markers (a drag
//! moves the marker nearest to the pointer, kept between its neighbours; arrow keys move the
//! selected one, digit keys select) and the two-junction map (a click or a drag moves the
//! design; a click on the optimum takes it).

use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use super::plots::map::MapPlot;
use super::plots::spectrum::{SpectrumPlot, MIN_SPACING_EV};
use super::{colours, edit_stack, save_plot, set_gaps, StackState, MAP, SPECTRUM};
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::plot::Frame;
use crate::physics::stack::Connection;
use crate::scenario::{PlotAxis, GAP_RANGE_EV};
use crate::view::controls::Control;
use crate::view::export::ExportKind;
use crate::view::format::{fixed, sig};
use crate::view::input::{ev_of_nm, tidy};
use crate::view::spectrum::nearest;
use crate::view::stack::map::{map_csv, Design, MapStatus};
use crate::view::stack::{absorbing, spectrum_csv, StackView};

/// What the spectrum plot does with the pointer and keys.
struct SpectrumCard {
    stack: StackState,
}

impl SpectrumCard {
    fn view(&self) -> Option<std::sync::Arc<StackView>> {
        self.stack.view.get_untracked()
    }

    /// The marker nearest to CSS x and its distance [CSS px].
    fn nearest_marker(&self, v: &StackView, f: &Frame, x_css: f64) -> Option<(usize, f64)> {
        v.gaps_ev
            .iter()
            .enumerate()
            .map(|(i, g)| (i, (f.css_of_x(v.spectrum.x_of_ev(*g)) - x_css).abs()))
            .min_by(|a, b| a.1.total_cmp(&b.1))
    }

    /// Move gap `i` to `g` eV, kept strictly between its neighbours.
    fn move_gap(&self, i: usize, g: f64) {
        let mut gaps = self.stack.gaps();
        if i >= gaps.len() {
            return;
        }
        let below = gaps.get(i + 1).copied().unwrap_or(GAP_RANGE_EV.0 - MIN_SPACING_EV);
        let above = if i == 0 { GAP_RANGE_EV.1 + MIN_SPACING_EV } else { gaps[i - 1] };
        let g = tidy(g.clamp(below + MIN_SPACING_EV, above - MIN_SPACING_EV));
        gaps[i] = g;
        set_gaps(self.stack.ctx, Control::StackSpectrum, gaps);
    }

    fn move_to(&self, x_css: f64) {
        let Some(v) = self.view() else { return };
        let f = self.stack.frame(SPECTRUM);
        let g = (v.spectrum.ev_of_x(f.x_at_css(x_css)) * 1000.0).round() / 1000.0;
        self.move_gap(self.stack.selected.get_untracked(), g);
    }
}

impl PlotBehaviour for SpectrumCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let v = self.view()?;
        let f = self.stack.frame(SPECTRUM);
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let sv = &v.spectrum;
        let i = nearest(&sv.x, f.x_at_css(x))?;
        let (px, py) = (sv.x[i], sv.y[i]);
        let e = sv.ev_of_x(px);
        let coord = match sv.axis {
            PlotAxis::Wavelength => format!("λ {} nm · {} eV", fixed(px, 1), fixed(e, 3)),
            PlotAxis::PhotonEnergy => format!("E {} eV · λ {} nm", fixed(px, 3), fixed(ev_of_nm(1.0) / e, 1)),
        };
        let who = match absorbing(&v.gaps_ev, e) {
            Some(k) => format!("absorbed by subcell {}{}", k + 1, if k == 0 { " (top)" } else { "" }),
            None => "below every gap: passes through".to_string(),
        };
        let lines = vec![coord, format!("{} {}", sig(py, 4), sv.unit()), who, "drag a marker to move its gap".into()];
        Some(Hover::new(x, y, width, Some((f.css_of_x(px), f.css_of_y(py))), lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        let f = self.stack.frame(SPECTRUM);
        let Some(v) = self.view() else { return false };
        if !f.is_valid() || !f.contains_css(x, y, 12.0) {
            return false;
        }
        let Some((i, dist)) = self.nearest_marker(&v, &f, x) else { return false };
        self.stack.selected.set(i);
        // a press on a marker grabs it; elsewhere the nearest marker jumps to the pointer
        if dist > 10.0 {
            self.move_to(x);
        }
        true
    }

    fn drag(&self, x: f64, _y: f64) {
        self.move_to(x);
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let key = ev.key();
        let n = self.stack.ctx.scenario.with_untracked(|s| s.stack.gaps_ev.len());
        if let Some(d) = key.chars().next().and_then(|c| c.to_digit(10)).filter(|_| key.chars().count() == 1) {
            let d = d as usize;
            if (1..=n).contains(&d) {
                self.stack.selected.set(d - 1);
                return true;
            }
            return false;
        }
        let wavelength = self.stack.ctx.scenario.with_untracked(|s| s.view.spectrum_axis == PlotAxis::Wavelength);
        // on a wavelength axis, right means longer wavelengths: a smaller gap
        let right = if wavelength { -1.0 } else { 1.0 };
        let dir = match key.as_str() {
            "ArrowUp" => 1.0,
            "ArrowDown" => -1.0,
            "ArrowRight" => right,
            "ArrowLeft" => -right,
            _ => return false,
        };
        let i = self.stack.selected.get_untracked().min(n.saturating_sub(1));
        if let Some(g) = self.stack.gaps().get(i).copied() {
            self.move_gap(i, g + dir * crate::app::widgets::fields::key_step(ev));
        }
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let v = self.view().ok_or("nothing has been computed yet")?;
        let describe = format!("{}-junction stack, absorbed bands", v.gaps_ev.len());
        save_plot(self.stack, "stack-spectrum", kind, &describe, &SpectrumPlot { v: &v, selected: usize::MAX }, |cap| {
            spectrum_csv(&v, cap)
        })
    }
}

fn spectrum_legend(stack: StackState) -> impl IntoView {
    move || {
        stack.view.with(|v| {
            let v = v.as_ref()?;
            let keys = v
                .report
                .subcells
                .iter()
                .enumerate()
                .map(|(i, s)| {
                    let style = format!("background:{}", colours::css(colours::subcell(i)));
                    view! {
                        <span class="key"><i class="k-fill" style=style></i>{format!("{}: {}, Jsc {} mA/cm²", i + 1, crate::view::stack::subcell_gap_text(&v.report, i), fixed(s.jsc_ma_cm2, 2))}</span>
                    }
                })
                .collect_view();
            Some(view! {
                <span class="key"><i class="k-line k-spectrum"></i>{format!("{}, one sun", v.spectrum.name)}</span>
                {keys}
            })
        })
    }
}

pub fn spectrum_card(stack: StackState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = stack.ctx;
    let note = view! {
        <p class="field-error" data-error=Control::StackSpectrum.as_str() aria-live="polite">{move || ctx.error_of(Control::StackSpectrum)}</p>
    };
    plot_card(
        ctx,
        Card {
            slug: "stack-spectrum",
            title: "Absorbed bands of the subcells",
            aria: "Source spectrum with each subcell's absorbed band shaded and its band gap marked. Drag a marker to move that gap; arrow keys move the selected marker by 1 meV (Shift: 10 meV), digit keys 1 to 6 select a marker.".into(),
            interactive: true,
            wrap_class: "draggable",
            control: None,
            tools: ().into_any(),
            legend: spectrum_legend(stack).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: Signal::derive(move || stack.plot_errors.with(|e| e[SPECTRUM].clone())),
        },
        Rc::new(SpectrumCard { stack }),
    )
}

/// How near the pointer must be to the optimum's or the best grid point's marker for the
/// read-out to be about it [CSS px].
const MARKER_REACH_CSS: f64 = 7.0;

/// Put a two-junction design at (top, bottom) [eV], rounded to `unit` [eV]; a design with
/// another number of junctions is left alone with a message.
fn place_design(stack: StackState, top: f64, bottom: f64, unit: f64) -> bool {
    let ctx = stack.ctx;
    let r = |v: f64| (v / unit).round() * unit;
    // over a real bottom cell the map's columns are log10 of its thickness [um]
    let (n, real) = ctx.scenario.with_untracked(|s| (s.stack.gaps_ev.len(), s.stack.bottom.is_some()));
    if real {
        if n != 1 {
            ctx.set_error(
                Control::TandemMap,
                format!("The map is for one top cell over the silicon cell and this design has {} junctions; set Junctions to 2 to place it on the map.", n + 1),
            );
            return false;
        }
        let (lo, hi) = crate::scenario::real::THICKNESS_RANGE_UM;
        let um = crate::view::format::round_sig(10f64.powf(bottom), 3).clamp(lo, hi);
        let top = tidy(r(top));
        return edit_stack(ctx, Control::TandemMap, move |st| {
            st.gaps_ev = vec![top];
            if let Some(b) = st.bottom.as_mut() {
                b.thickness_um = um;
            }
        });
    }
    if n != 2 {
        ctx.set_error(
            Control::TandemMap,
            format!("The map is for two-junction stacks and this design has {n}; set Junctions to 2 to place it on the map."),
        );
        return false;
    }
    set_gaps(ctx, Control::TandemMap, vec![tidy(r(top)), tidy(r(bottom))])
}

/// The optimum's gaps are given to 0.1 meV, as the gap search gives its answer [eV].
const OPTIMUM_UNIT_EV: f64 = 1e-4;

/// `p` (top, bottom [eV], efficiency), if the pointer at (x, y) [CSS px] is on its marker.
fn on_marker(f: &Frame, p: Option<(f64, f64, f64)>, x: f64, y: f64) -> Option<(f64, f64, f64)> {
    p.filter(|(t, b, _)| (f.css_of_x(*b) - x).hypot(f.css_of_y(*t) - y) <= MARKER_REACH_CSS)
}

/// What the map does with the pointer and keys.
struct MapCard {
    stack: StackState,
}

impl MapCard {
    /// Put the design at (top, bottom) [eV], rounded to 1 meV.
    fn place(&self, top: f64, bottom: f64) -> bool {
        place_design(self.stack, top, bottom, 1e-3)
    }

    fn point_at(&self, x: f64, y: f64) -> Option<(f64, f64)> {
        let f = self.stack.frame(MAP);
        (f.is_valid() && f.contains_css(x, y, 4.0)).then(|| (f.y_at_css(y), f.x_at_css(x)))
    }
}

impl PlotBehaviour for MapCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let m = self.stack.map.get_untracked()?;
        let (t, b) = self.point_at(x, y)?;
        let f = self.stack.frame(MAP);
        if !f.contains_css(x, y, 0.0) {
            return None;
        }
        // on a marker, say which it is and its figures
        let near = |p| on_marker(&f, p, x, y);
        if let Some((pt, pb, pe)) = near(m.refined) {
            let lines = vec![
                format!("optimum: top {} eV · bottom {} eV", fixed(pt, 4), fixed(pb, 4)),
                format!("{} % ({}), refined from the grid's best points", fixed(pe, 3), m.connection.label()),
                "click to put the design on it".into(),
            ];
            return Some(Hover::new(x, y, width, Some((f.css_of_x(pb), f.css_of_y(pt))), lines));
        }
        if let Some((pt, pb, pe)) = near(m.best) {
            let lines = vec![
                format!("best point of the grid: top {} eV · bottom {}", fixed(pt, 3), m.column_text(pb, 3)),
                format!("{} % ({})", fixed(pe, 2), m.connection.label()),
                "click to move the design here".into(),
            ];
            return Some(Hover::new(x, y, width, Some((f.css_of_x(pb), f.css_of_y(pt))), lines));
        }
        let (i, k) = m.nearest(b, t)?;
        let e = m.at(i, k);
        let mut lines =
            vec![format!("top {} eV · bottom {}", fixed(m.tops_ev[i], 3), m.column_text(m.bottoms_ev[k], 3))];
        if e.is_finite() {
            lines.push(format!("{} % ({})", fixed(e, 2), m.connection.label()));
            lines.push("click to move the design here".into());
        } else {
            lines.push("not a stack: the bottom gap must be below the top gap".into());
        }
        Some(Hover::new(x, y, width, Some((f.css_of_x(m.bottoms_ev[k]), f.css_of_y(m.tops_ev[i]))), lines))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        let Some(m) = self.stack.map.get_untracked() else { return false };
        // on the optimum's marker: the design takes the optimum (to 0.1 meV, as the search gives it)
        let f = self.stack.frame(MAP);
        if let Some((t, b, _)) = on_marker(&f, m.refined, x, y) {
            place_design(self.stack, t, b, OPTIMUM_UNIT_EV);
            return true;
        }
        match self.point_at(x, y) {
            Some((t, b)) => {
                self.place(t, b);
                true
            }
            None => false,
        }
    }

    fn drag(&self, x: f64, y: f64) {
        if let Some((t, b)) = self.point_at(x, y) {
            self.place(t, b);
        }
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        let step = crate::app::widgets::fields::key_step(ev);
        let (dt, db) = match ev.key().as_str() {
            "ArrowUp" => (step, 0.0),
            "ArrowDown" => (-step, 0.0),
            "ArrowRight" => (0.0, step),
            "ArrowLeft" => (0.0, -step),
            _ => return false,
        };
        let g = self.stack.gaps();
        let thickness = self.stack.ctx.scenario.with_untracked(|s| s.stack.bottom.as_ref().map(|b| b.thickness_um));
        if let Some(um) = thickness.filter(|_| g.len() == 1) {
            // across: the thickness by 0.01 decade (Shift: 0.1)
            place_design(self.stack, tidy(g[0] + dt), um.log10() + 10.0 * db, 1e-3);
        } else if g.len() == 2 {
            self.place(tidy(g[0] + dt), tidy(g[1] + db));
        } else {
            self.place(0.0, 0.0);
        }
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let m = self.stack.map.get_untracked().ok_or("the map has not been computed yet")?;
        let design = self.stack.ctx.scenario.with_untracked(|s| Design::of(&s.stack));
        let describe = format!("two-junction {} map", m.connection.label());
        save_plot(self.stack, "tandem-map", kind, &describe, &MapPlot { map: &m, design }, |cap| map_csv(&m, cap))
    }
}

fn map_legend(stack: StackState) -> impl IntoView {
    // each line follows the map on its own, so a new map or design changes only text
    let optimum = move || stack.map.with(|m| m.as_ref().and_then(|m| m.refined));
    let has_best = move || stack.map.with(|m| m.as_ref().is_some_and(|m| m.best.is_some()));
    let refined = move || match optimum() {
        Some((t, b, e)) => format!(
            "optimum, refined from the grid: top {} eV, bottom {} eV, {} %",
            fixed(t, 4),
            fixed(b, 4),
            fixed(e, 3)
        ),
        None => "refining the optimum…".to_string(),
    };
    let best = move || {
        stack.map.with(|m| {
            let m = m.as_ref()?;
            m.best.map(|(t, b, e)| {
                format!(
                    "best point of the grid: top {} eV, bottom {}, {} %",
                    fixed(t, 3),
                    m.column_text(b, 3),
                    fixed(e, 2)
                )
            })
        })
    };
    let series = move || stack.map.with(|m| m.as_ref().is_some_and(|m| m.connection == Connection::Series));
    let thickness = move || stack.map.with(|m| m.as_ref().is_some_and(|m| m.thickness));
    let design = move || {
        let n = stack.ctx.scenario.with(|s| s.stack.gaps_ev.len() + usize::from(s.stack.bottom.is_some()));
        if n == 2 {
            "this design — click or drag to move it".to_string()
        } else {
            format!("the design has {n} junctions; set Junctions to 2 to place it on the map")
        }
    };
    let timing = move || {
        let status = stack.map_status.get();
        stack.map.with(|m| match (&status, m) {
            (MapStatus::Computing(f), _) => format!("computing the map… {} %", fixed(f * 100.0, 0)),
            (MapStatus::Failed(e), _) => e.clone(),
            (_, Some(m)) if m.refined.is_some() => format!(
                "{}×{} stacks in {} ms, optimum refined in {} ms",
                m.tops_ev.len(),
                m.bottoms_ev.len(),
                fixed(m.compute_ms, 0),
                fixed(m.refine_ms, 0)
            ),
            (_, Some(m)) => {
                format!("{}×{} stacks in {} ms", m.tops_ev.len(), m.bottoms_ev.len(), fixed(m.compute_ms, 0))
            }
            _ => String::new(),
        })
    };
    let use_optimum = move |_| {
        if let Some((t, b, _)) = optimum() {
            place_design(stack, t, b, OPTIMUM_UNIT_EV);
        }
    };
    view! {
        <span class="key" data-info="map-optimum" hidden=move || !has_best() || thickness()>
            <svg class="k-star" viewBox="0 0 20 20" aria-hidden="true"><polygon points=STAR_KEY></polygon></svg>
            {refined}
            <button type="button" class="small" data-action="use-optimum" title="Make the optimum the design (gaps to 0.1 meV)"
                hidden=move || optimum().is_none() on:click=use_optimum>"Use it"</button>
        </span>
        <span class="key" data-info="map-best" hidden=move || !has_best()><i class="k-diamond" class:hollow=move || optimum().is_some()></i>{best}</span>
        <span class="key"><i class="k-ring"></i>{design}</span>
        <span class="key" hidden=move || !series() || thickness()><i class="k-line k-matched"></i>"currents matched"</span>
        <span class="key"><i class="k-fill k-not-stack"></i>"not a stack"</span>
        <span class="key map-timing" data-info="map-timing">{timing}</span>
    }
}

/// The legend's star, as drawn on the map (a 20 × 20 box).
const STAR_KEY: &str = "10.0,1.6 12.3,7.6 18.7,8.0 13.7,12.0 15.4,18.2 10.0,14.7 4.6,18.2 6.3,12.0 1.3,8.0 7.7,7.6";

/// Grid sizes offered for the map (points along each axis).
const RESOLUTIONS: [usize; 4] = [61, 121, 201, 301];

fn resolution_tool(stack: StackState) -> impl IntoView {
    let ctx = stack.ctx;
    let points = Memo::new(move |_| ctx.scenario.with(|s| s.stack.map.points));
    let on_change = move |ev: leptos::ev::Event| {
        if let Ok(n) = event_target_value(&ev).parse::<usize>() {
            edit_stack(ctx, Control::TandemMap, move |st| st.map.points = n);
        }
    };
    let options = move || {
        let now = points.get();
        let mut list: Vec<usize> = RESOLUTIONS.to_vec();
        if !list.contains(&now) {
            list.push(now);
            crate::physics::order::sort_indices(&mut list);
        }
        list.into_iter()
            .map(|n| view! { <option value=n.to_string() prop:selected=n == now>{format!("{n} × {n}")}</option> })
            .collect_view()
    };
    view! {
        <label class="range-field">
            <span>"grid"</span>
            <select data-control="map-points" class="small-select" on:change=on_change aria-label="Points along each axis of the map">{options}</select>
        </label>
    }
}

pub fn map_card(stack: StackState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = stack.ctx;
    let progress = move || match stack.map_status.get() {
        MapStatus::Computing(f) => {
            Some(view! { <progress class="map-progress" data-progress="map" max="1" value=f.to_string()></progress> })
        }
        _ => None,
    };
    let note = view! {
        <p class="field-error" data-error=Control::TandemMap.as_str() aria-live="polite">{move || ctx.error_of(Control::TandemMap)}</p>
        {progress}
    };
    plot_card(
        ctx,
        Card {
            slug: "tandem-map",
            title: "Two-junction efficiency map",
            aria: "Heat map of the limiting efficiency of two-junction stacks against the bottom-cell gap (across; over a silicon bottom cell, its thickness on a logarithmic axis) and the top-cell gap (up), with contour lines, the best point of the grid, the optimum refined from the grid and the current design. Click or drag to move a two-junction design; arrow keys step its gaps by 1 meV (Shift: 10 meV): left and right the bottom gap, up and down the top gap.".into(),
            interactive: true,
            wrap_class: "map-wrap",
            control: None,
            tools: view! { <div class="plot-tools">{resolution_tool(stack)}</div> }.into_any(),
            legend: map_legend(stack).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: Signal::derive(move || stack.plot_errors.with(|e| e[MAP].clone())),
        },
        Rc::new(MapCard { stack }),
    )
}
