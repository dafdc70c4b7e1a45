//! The Solar cell tab's real absorber (silicon): its settings (`widgets::real_fields`, under
//! the absorptance choice), its figures with the recombination split at the maximum power
//! point, and two plot cards: efficiency against thickness (log axis, the current and the best
//! thickness marked; click, drag or arrow keys move the thickness) and the absorptance
//! against wavelength beside the ideal step at the same edge. Every number comes from
//! `view::cell::real::RealView`.

use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, VPos};

use super::absorptance::{set_absorber, AbsorptancePlot};
use super::state::{CellState, SI_ABSORPTANCE, SI_THICKNESS};
use crate::app::state::{mark, Ctx};
use crate::app::widgets::card::{plot_card, Card, Hover, PlotBehaviour};
use crate::app::widgets::export::offer;
use crate::app::widgets::plot::{
    chart, draw_boxed_text, draw_caption, err, palette::*, tick_target, AxisSpec, Backend, Drawing, Frame, Look,
};
use crate::app::widgets::real_fields::{real_fields, RealHooks, SLIDER_UM};
use crate::report::CellMetric;
use crate::scenario::real::{RealAbsorberSpec, THICKNESS_RANGE_UM};
use crate::scenario::stack::AbsorberSpec;
use crate::scenario::Scenario;
use crate::view::cell::real::{
    absorptance_csv, caption, doping_words, first_silicon, thickness_csv, trapping_words, RealView,
};
use crate::view::controls::Control;
use crate::view::export::ExportKind;
use crate::view::format::{field, fixed, round_sig};
use crate::view::input::ev_of_nm;
use crate::view::spectrum::nearest;

/// The real absorber in use, or the last one used (offered again when silicon is chosen
/// again), or 110 um Lambertian undoped silicon.
pub fn kept(ctx: Ctx) -> RwSignal<RealAbsorberSpec> {
    let now = ctx.scenario.with_untracked(|s| match &s.stack.absorber {
        AbsorberSpec::Real(r) => r.clone(),
        _ => first_silicon(),
    });
    let kept = RwSignal::new(now);
    Effect::new(move |_| {
        if let Some(r) = ctx.scenario.with(real_of) {
            kept.set(r);
        }
    });
    kept
}

fn real_of(s: &Scenario) -> Option<RealAbsorberSpec> {
    match &s.stack.absorber {
        AbsorberSpec::Real(r) => Some(r.clone()),
        _ => None,
    }
}

const HOOKS: RealHooks = RealHooks {
    prefix: "si",
    thickness: Control::SiThickness,
    trapping: Control::SiTrapping,
    doping: Control::SiDoping,
    get: real_of,
};

/// Rows of the silicon cell's figures: (label, hook, value).
fn rows(v: &RealView) -> Vec<(&'static str, &'static str, String)> {
    let r = &v.report;
    let ma = |x: f64| format!("{} mA/cm²", fixed(x, 3));
    vec![
        ("Jsc", "si-jsc", r.cell.display(CellMetric::Jsc)),
        ("Voc", "si-voc", r.cell.display(CellMetric::Voc)),
        ("Fill factor", "si-ff", r.cell.display(CellMetric::Ff)),
        ("Vmp", "si-vmp", r.cell.display(CellMetric::Vmp)),
        ("Jmp", "si-jmp", r.cell.display(CellMetric::Jmp)),
        ("Radiative recombination at max power", "si-radiative", ma(r.radiative_mpp_ma_cm2)),
        ("Auger recombination at max power", "si-auger", ma(r.auger_mpp_ma_cm2)),
        (
            "Absorption edge (half maximum)",
            "si-edge",
            format!("{} eV · {} nm", fixed(v.edge_ev, 3), fixed(ev_of_nm(1.0) / v.edge_ev, 0)),
        ),
        (
            "Best thickness (1–1000 µm)",
            "si-best",
            format!("{} µm · {} %", fixed(v.curve.best_um, 1), fixed(v.curve.best.cell.efficiency * 100.0, 2)),
        ),
    ]
}

/// The settings, the note on the data and the figures' table.
pub fn silicon_settings(cs: CellState, kept: RwSignal<RealAbsorberSpec>) -> impl IntoView {
    let ctx = cs.ctx;
    let commit: Rc<dyn Fn(Control, RealAbsorberSpec) -> bool> = Rc::new(move |hook, r: RealAbsorberSpec| {
        let ok = set_absorber(ctx, hook, AbsorberSpec::Real(r.clone()));
        if ok {
            kept.set(r);
        }
        ok
    });
    let table = move || {
        cs.real.with(|v| {
            let v = v.as_ref()?;
            let body = rows(v)
                .into_iter()
                .map(|(label, hook, value)| {
                    view! { <tr><th scope="row">{label}</th><td data-metric=hook>{value}</td></tr> }
                })
                .collect_view();
            Some(view! {
                <table class="stack-table si-table" data-table="silicon">
                    <thead><tr><th scope="col">{format!("{} µm silicon", field(v.spec.thickness_um, 6))}</th><th scope="col">"This cell"</th></tr></thead>
                    <tbody>
                        <tr><th scope="row">"Efficiency"</th><td data-metric="si-efficiency">{v.report.cell.display(CellMetric::Efficiency)}</td></tr>
                        {body}
                    </tbody>
                </table>
            })
        })
    };
    view! {
        <p class="hint">
            "Silicon's absorption and refractive index are Green's 2008 table at 300 K; Auger recombination is Richter's 2012 parametrization. "
            "The table sets the absorption, so the band-gap field above does not apply to this cell. Radiative and Auger recombination only: the intrinsic limit."
        </p>
        {real_fields(ctx, HOOKS, commit)}
        {table}
    }
}

/// What the two silicon plots are.
#[derive(Clone, Copy, PartialEq, Eq)]
enum SiPlot {
    Thickness,
    Absorptance,
}

impl SiPlot {
    fn index(self) -> usize {
        match self {
            SiPlot::Thickness => SI_THICKNESS,
            SiPlot::Absorptance => SI_ABSORPTANCE,
        }
    }
}

/// Efficiency against thickness (log axis) with the current and the best thickness.
pub struct ThicknessPlot<'a> {
    pub v: &'a RealView,
}

impl Drawing for ThicknessPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        draw_caption(root, look)?;
        let (w, h) = root.dim_in_pixel();
        let v = self.v;
        let pts: Vec<(f64, f64)> =
            v.curve.points.iter().map(|p| (p.thickness_um.log10(), p.efficiency * 100.0)).collect();
        let here = v.report.cell.efficiency * 100.0;
        let emax = pts.iter().map(|p| p.1).fold(here, f64::max).max(1.0);
        let emin = pts.iter().map(|p| p.1).fold(here, f64::min).max(0.0);
        // the curve is flat near its best: the axis starts a little below its lowest point
        let floor = (emin - 0.15 * (emax - emin)).floor().max(0.0);
        let (lo, hi) = SLIDER_UM;
        let x = AxisSpec::log10(lo, hi, tick_target(look, w, 60.0), "Absorber thickness", "µm");
        let top = emax + 0.25 * (emax - floor).max(1.0);
        let y = AxisSpec::new(floor, top, tick_target(look, h, 50.0), "Efficiency limit", "%", true);
        let (mut c, frame) = chart(root, look, &x, &y, true)?;
        c.draw_series(LineSeries::new(pts, CURVE.stroke_width(look.px(2.0).max(1) as u32))).map_err(err)?;
        let (left, right, top, bottom) = (frame.left as i32, frame.right as i32, frame.top as i32, frame.bottom as i32);
        let bx = |u: f64| (frame.css_of_x(u.log10()) * look.scale).round() as i32;
        let by = |e: f64| (frame.css_of_y(e) * look.scale).round() as i32;
        let bounds = (left, top, right, bottom);
        let t = v.spec.thickness_um;
        let eff = v.report.cell.efficiency * 100.0;
        if (lo..=hi).contains(&t) {
            let px = bx(t);
            root.draw(&PathElement::new(vec![(px, top), (px, bottom)], GAP.stroke_width(look.px(2.0).max(1) as u32)))
                .map_err(err)?;
            root.draw(&Circle::new((px, by(eff)), look.px(4.5), GAP.filled())).map_err(err)?;
            let to_left = px > (left + right) / 2;
            let (anchor, dx) = if to_left { (HPos::Right, -look.px(6.0)) } else { (HPos::Left, look.px(6.0)) };
            let text = format!("{} µm · {} %", field(t, 4), fixed(eff, 2));
            draw_boxed_text(root, look, &text, px + dx, bottom - look.px(8.0), anchor, VPos::Bottom, &GAP, bounds)?;
        } else {
            let right_side = t > hi;
            let text = format!("{} µm — outside this range {}", field(t, 6), if right_side { "▸" } else { "◂" });
            let (anchor, ax) =
                if right_side { (HPos::Right, right - look.px(4.0)) } else { (HPos::Left, left + look.px(4.0)) };
            draw_boxed_text(root, look, &text, ax, bottom - look.px(8.0), anchor, VPos::Bottom, &GAP, bounds)?;
        }
        let (bu, be) = (v.curve.best_um, v.curve.best.cell.efficiency * 100.0);
        let (px, py) = (bx(bu), by(be));
        let r = look.px(5.5);
        root.draw(&Polygon::new(vec![(px, py - r), (px + r, py), (px, py + r), (px - r, py)], BEST.filled()))
            .map_err(err)?;
        let text = format!("best {} µm · {} %", fixed(bu, 1), fixed(be, 2));
        draw_boxed_text(root, look, &text, px, py - look.px(9.0), HPos::Center, VPos::Bottom, &BEST, bounds)?;
        Ok(frame)
    }
}

/// The plots' pointer and keys: the thickness plot moves the thickness.
struct SiCard {
    cs: CellState,
    plot: SiPlot,
}

impl SiCard {
    fn frame(&self) -> Frame {
        self.cs.frame(self.plot.index())
    }

    fn set_thickness(&self, um: f64) {
        let Some(mut r) = self.cs.ctx.scenario.with_untracked(real_of) else { return };
        let (lo, hi) = THICKNESS_RANGE_UM;
        r.thickness_um = round_sig(um, 3).clamp(lo, hi);
        mark("gg-edit");
        set_absorber(self.cs.ctx, Control::SiThickness, AbsorberSpec::Real(r));
    }
}

impl PlotBehaviour for SiCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.frame();
        if !f.is_valid() || !f.contains_css(x, y, 0.0) {
            return None;
        }
        let xv = f.x_at_css(x);
        self.cs.real.with_untracked(|v| {
            let v = v.as_ref()?;
            let (dot, lines) = match self.plot {
                SiPlot::Thickness => {
                    let xs: Vec<f64> = v.curve.points.iter().map(|p| p.thickness_um.log10()).collect();
                    let p = v.curve.points[nearest(&xs, xv)?];
                    (
                        Some((f.css_of_x(p.thickness_um.log10()), f.css_of_y(p.efficiency * 100.0))),
                        vec![
                            format!("thickness {} µm", field(p.thickness_um, 4)),
                            format!("efficiency {} %", fixed(p.efficiency * 100.0, 2)),
                            format!("Jsc {} mA/cm² · Voc {} V", fixed(p.jsc_ma_cm2, 2), fixed(p.voc_v, 4)),
                            "click or drag to use this thickness".into(),
                        ],
                    )
                }
                SiPlot::Absorptance => {
                    let xs: Vec<f64> = v.absorptance.iter().map(|p| ev_of_nm(1.0) / p.0).collect();
                    let i = nearest(&xs, xv)?;
                    let (e, a) = v.absorptance[i];
                    (
                        Some((f.css_of_x(xs[i]), f.css_of_y(a * 100.0))),
                        vec![
                            format!("λ {} nm · {} eV", fixed(xs[i], 1), fixed(e, 3)),
                            format!("absorptance {} %", fixed(a * 100.0, 2)),
                            format!("ideal step: {} %", if e >= v.edge_ev { 100 } else { 0 }),
                        ],
                    )
                }
            };
            Some(Hover::new(x, y, width, dot, lines))
        })
    }

    fn press(&self, x: f64, y: f64) -> bool {
        if self.plot != SiPlot::Thickness || !self.frame().contains_css(x, y, 12.0) {
            return false;
        }
        self.drag(x, y);
        true
    }

    fn drag(&self, x: f64, _y: f64) {
        self.set_thickness(10f64.powf(self.frame().x_at_css(x)));
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        if self.plot != SiPlot::Thickness {
            return false;
        }
        // a step of 1 % in thickness, 10 % with Shift
        let f = if ev.shift_key() { 1.1 } else { 1.01 };
        let Some(t) = self.cs.ctx.scenario.with_untracked(real_of).map(|r| r.thickness_um) else { return false };
        match ev.key().as_str() {
            "ArrowUp" | "ArrowRight" => self.set_thickness(t * f),
            "ArrowDown" | "ArrowLeft" => self.set_thickness(t / f),
            _ => return false,
        }
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let s = self.cs.ctx.scenario.get_untracked();
        let v = self.cs.real.get_untracked().ok_or("no silicon cell has been computed yet")?;
        match self.plot {
            SiPlot::Thickness => {
                offer(kind, "thickness", &ThicknessPlot { v: &v }, || caption(&s, &v), || thickness_csv(&s, &v))
            }
            SiPlot::Absorptance => offer(
                kind,
                "silicon-absorptance",
                &absorptance_plot(&v),
                || caption(&s, &v),
                || absorptance_csv(&s, &v),
            ),
        }
    }
}

/// The absorptance plot of `v`.
pub fn absorptance_plot(v: &RealView) -> AbsorptancePlot<'_> {
    AbsorptancePlot { points: &v.absorptance, edge_ev: v.edge_ev, what: "Absorptance" }
}

/// The two cards, shown while the absorber is silicon.
pub fn silicon_cards(
    cs: CellState,
    thickness: NodeRef<html::Canvas>,
    absorptance: NodeRef<html::Canvas>,
) -> impl IntoView {
    let ctx = cs.ctx;
    let hidden = move || cs.real.with(|v| v.is_none());
    let legend_t = move || {
        cs.real.with(|v| {
            v.as_ref().map(|v| {
                view! {
                    <span class="key"><i class="k-line k-curve"></i>{format!("{} light trapping, {}", trapping_words(v.spec.trapping), doping_words(&v.spec))}</span>
                    <span class="key"><i class="k-diamond"></i>{format!("best: {} µm, {} %", fixed(v.curve.best_um, 1), fixed(v.curve.best.cell.efficiency * 100.0, 2))}</span>
                    <span class="key"><i class="k-line k-gap"></i>{format!("this cell: {} µm", field(v.spec.thickness_um, 6))}</span>
                }
            })
        })
    };
    let legend_a = move || {
        cs.real.with(|v| {
            v.as_ref().map(|v| {
                view! {
                    <span class="key"><i class="k-line k-spectrum"></i>{format!("silicon, {} µm", field(v.spec.thickness_um, 6))}</span>
                    <span class="key"><i class="k-line k-muted"></i>{format!("ideal step at the same edge, {} eV", fixed(v.edge_ev, 3))}</span>
                }
            })
        })
    };
    let card = |plot: SiPlot, slug, title, aria: &str, legend: AnyView, canvas| {
        let i = plot.index();
        plot_card(
            ctx,
            Card {
                slug,
                title,
                aria: aria.to_string(),
                interactive: plot == SiPlot::Thickness,
                wrap_class: if plot == SiPlot::Thickness { "draggable" } else { "" },
                control: None,
                tools: ().into_any(),
                legend,
                note: ().into_any(),
                footer: ().into_any(),
                canvas,
                plot_error: Signal::derive(move || cs.plot_errors.with(|e| e[i].clone())),
            },
            Rc::new(SiCard { cs, plot }),
        )
    };
    view! {
        <div class="si-cards" hidden=hidden>
            {card(SiPlot::Thickness, "thickness", "Efficiency limit against silicon thickness", "Efficiency limit against absorber thickness on a logarithmic axis, with this cell's thickness and the best thickness marked. Click or drag to move the thickness; arrow keys step it by 1 %, with Shift by 10 %.", legend_t.into_any(), thickness)}
            {card(SiPlot::Absorptance, "silicon-absorptance", "Silicon's absorptance", "The silicon absorber's absorptance against wavelength, with the ideal step at the same absorption edge.", legend_a.into_any(), absorptance)}
        </div>
    }
}
