//! A plot on the page: its header (title, view choices, downloads), its canvas with the
//! band-gap drag and keys, and the hover read-out.

use crate::report::CellMetric;
use crate::view::controls::Control;
use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;

use super::plots::{CellPlot, PlotKind};
use super::state::CellState;
use crate::app::state::Ctx;
use crate::app::widgets::card::{plot_card, range_input, Card, Hover, PlotBehaviour};
use crate::app::widgets::export::offer;
use crate::app::widgets::plot::Frame;
use crate::physics::constants::to_ev;
use crate::report::CellReport;
use crate::scenario::{PlotAxis, PlotQuantity};
use crate::view::cell::csv;
use crate::view::cell::CellView;
use crate::view::export::ExportKind;
use crate::view::format::{fixed, gap_ev, sig};
use crate::view::input::{ev_of_nm, tidy};
use crate::view::spectrum::nearest;

fn round_mev(v: f64) -> f64 {
    (v * 1000.0).round() / 1000.0
}

/// The band gap [eV] under CSS x on a draggable plot.
fn gap_at(kind: PlotKind, frame: &Frame, c: &CellView, x_css: f64) -> Option<f64> {
    let x = frame.x_at_css(x_css);
    let g = match kind {
        PlotKind::Spectrum => c.spectrum.ev_of_x(x),
        PlotKind::Efficiency => x,
        PlotKind::Jv => return None,
    };
    let (lo, hi) = crate::scenario::GAP_RANGE_EV;
    Some(round_mev(g).clamp(lo, hi))
}

fn hover_of(kind: PlotKind, frame: &Frame, c: &CellView, x_css: f64, y_css: f64, width: f64) -> Option<Hover> {
    if !frame.is_valid() || !frame.contains_css(x_css, y_css, 0.0) {
        return None;
    }
    let xv = frame.x_at_css(x_css);
    let (dot, lines) = match kind {
        PlotKind::Spectrum => {
            let sv = &c.spectrum;
            let i = nearest(&sv.x, xv)?;
            let (x, y) = (sv.x[i], sv.y[i]);
            let e = sv.ev_of_x(x);
            let coord = match sv.axis {
                PlotAxis::Wavelength => format!("λ {} nm · {} eV", fixed(x, 1), fixed(e, 3)),
                PlotAxis::PhotonEnergy => format!("E {} eV · λ {} nm", fixed(x, 3), fixed(ev_of_nm(1.0) / e, 1)),
            };
            let side = if e >= c.gap_ev { "absorbed (above the gap)" } else { "not absorbed (below the gap)" };
            (
                Some((frame.css_of_x(x), frame.css_of_y(y))),
                vec![coord, format!("{} {}", sig(y, 4), sv.unit()), side.to_string()],
            )
        }
        PlotKind::Efficiency => {
            let cv = &c.curve;
            let i = nearest(&cv.gaps_ev, xv)?;
            let r = CellReport::from(&cv.results[i]);
            let g = cv.gaps_ev[i];
            (
                Some((frame.css_of_x(g), frame.css_of_y(r.efficiency * 100.0))),
                vec![
                    format!("Eg {} eV · {} nm", fixed(g, 3), fixed(ev_of_nm(1.0) / g, 1)),
                    format!("efficiency {}", r.display(CellMetric::Efficiency)),
                    format!("Jsc {} · Voc {}", r.display(CellMetric::Jsc), r.display(CellMetric::Voc)),
                    "click or drag to move the gap here".into(),
                ],
            )
        }
        PlotKind::Jv => {
            let vs: Vec<f64> = c.jv.iter().map(|p| p.0).collect();
            let i = nearest(&vs, xv)?;
            let (v, j) = c.jv[i];
            (
                Some((frame.css_of_x(v), frame.css_of_y(j))),
                vec![
                    format!("V {} V", fixed(v, 4)),
                    format!("J {} mA/cm²", sig(j, 5)),
                    format!("P {} mW/cm²", sig(v * j, 5)),
                ],
            )
        }
    };
    Some(Hover::new(x_css, y_css, width, dot, lines))
}

fn title(kind: PlotKind) -> &'static str {
    match kind {
        PlotKind::Spectrum => "Source spectrum",
        PlotKind::Efficiency => "Limiting efficiency against band gap",
        PlotKind::Jv => "J–V and P–V curves",
    }
}

fn aria(kind: PlotKind) -> &'static str {
    match kind {
        PlotKind::Spectrum => "Source spectrum with the absorbed part shaded and the band gap marked. Drag or click to move the band gap; arrow keys step it by 1 meV, with Shift by 10 meV.",
        PlotKind::Efficiency => "Limiting efficiency against band gap, with the current gap and the best gap marked. Drag or click to move the band gap; arrow keys step it.",
        PlotKind::Jv => "Current density and power density against voltage, with the maximum power point marked.",
    }
}

/// A segmented choice of two values for the spectrum plot's view.
fn toggle<T: Copy + PartialEq + Send + Sync + 'static>(
    ctx: Ctx,
    label: &'static str,
    hook: Control,
    options: [(T, &'static str, &'static str); 2],
    get: fn(&crate::scenario::ViewSettings) -> T,
    set: fn(&mut crate::scenario::ViewSettings, T),
) -> impl IntoView {
    let current = Memo::new(move |_| ctx.scenario.with(|s| get(&s.view)));
    let buttons = options
        .into_iter()
        .map(|(v, text, slug)| {
            view! {
                <button
                    type="button"
                    data-view=format!("{hook}-{slug}")
                    aria-pressed=move || if current.get() == v { "true" } else { "false" }
                    on:click=move |_| { ctx.edit(hook, |s| set(&mut s.view, v)); }
                >
                    {text}
                </button>
            }
        })
        .collect_view();
    view! { <div class="seg" role="group" aria-label=label data-control=hook.as_str()>{buttons}</div> }
}

fn header_tools(cs: CellState, kind: PlotKind) -> impl IntoView {
    let ctx = cs.ctx;
    match kind {
        PlotKind::Spectrum => view! {
            <div class="plot-tools">
                {toggle(ctx, "Spectral axis", Control::SpectrumAxis, [(PlotAxis::Wavelength, "Wavelength", "wavelength"), (PlotAxis::PhotonEnergy, "Photon energy", "energy")], |v| v.spectrum_axis, |v, a| v.spectrum_axis = a)}
                {toggle(ctx, "Plotted quantity", Control::SpectrumQuantity, [(PlotQuantity::Irradiance, "Irradiance", "irradiance"), (PlotQuantity::PhotonFlux, "Photon flux", "photon-flux")], |v| v.spectrum_quantity, |v, q| v.spectrum_quantity = q)}
            </div>
        }
        .into_any(),
        PlotKind::Efficiency => range_tools(cs).into_any(),
        PlotKind::Jv => ().into_any(),
    }
}

fn range_tools(cs: CellState) -> impl IntoView {
    let ctx = cs.ctx;
    let from = Memo::new(move |_| ctx.scenario.with(|s| s.view.curve_from_ev));
    let to = Memo::new(move |_| ctx.scenario.with(|s| s.view.curve_to_ev));
    let bad = |text: &str| {
        format!("'{text}' is not a band gap; type a number of eV, e.g. 0.5. The plotted range is unchanged.")
    };
    let best = move || cs.computed.with(|c| c.as_ref().and_then(|c| c.curve.best.map(|b| to_ev(b.gap_j))));
    view! {
        <div class="plot-tools">
            {range_input(ctx, "curve-from", Control::CurveRange, "from", "eV", from, |s, v| s.view.curve_from_ev = v, bad)}
            {range_input(ctx, "curve-to", Control::CurveRange, "to", "eV", to, |s, v| s.view.curve_to_ev = v, bad)}
            <button
                type="button"
                class="small"
                data-action="use-best-gap"
                disabled=move || best().is_none()
                on:click=move |_| {
                    if let Some(g) = best() {
                        ctx.set_gap(Control::Gap, tidy(g));
                    }
                }
            >
                "Use best gap"
            </button>
        </div>
    }
}

fn legend(cs: CellState, kind: PlotKind) -> impl IntoView {
    move || {
        cs.computed.with(|c| {
            let c = c.as_ref()?;
            Some(match kind {
                PlotKind::Spectrum => view! {
                    <span class="key"><i class="k-line k-spectrum"></i>{format!("{}, one sun", c.spectrum.name)}</span>
                    <span class="key"><i class="k-fill k-absorbed"></i>{format!(
                        "absorbed (E ≥ Eg): {} % of the power, {} % of the photons",
                        fixed(c.absorbed_power_fraction * 100.0, 1),
                        fixed(c.absorbed_photon_fraction * 100.0, 1)
                    )}</span>
                    <span class="key"><i class="k-line k-gap"></i>"band gap — drag or click to move"</span>
                }
                .into_any(),
                PlotKind::Efficiency => {
                    let best = c.curve.best.map(|b| format!("best in range: {} eV, {} %", fixed(to_ev(b.gap_j), 3), fixed(b.efficiency * 100.0, 2)));
                    view! {
                        <span class="key"><i class="k-line k-curve"></i>"detailed-balance limit"</span>
                        <span class="key"><i class="k-diamond"></i>{best}</span>
                        <span class="key"><i class="k-line k-gap"></i>{format!("this cell: Eg {} eV", gap_ev(c.gap_ev))}</span>
                    }
                    .into_any()
                }
                PlotKind::Jv => view! {
                    <span class="key"><i class="k-line k-spectrum"></i>"J–V (left axis)"</span>
                    <span class="key"><i class="k-line k-power"></i>"P–V (right axis)"</span>
                    <span class="key"><i class="k-dot"></i>{format!("max power point: {} at {}", c.report.display(CellMetric::Jmp), c.report.display(CellMetric::Vmp))}</span>
                }
                .into_any(),
            })
        })
    }
}

/// What the cell's plots do with the pointer and keys: drag or step the band gap.
struct CellCard {
    cs: CellState,
    kind: PlotKind,
}

impl CellCard {
    fn frame(&self) -> Frame {
        self.cs.frames.with_untracked(|f| f[self.kind.index()])
    }
    fn draggable(&self) -> bool {
        self.kind != PlotKind::Jv
    }
    fn move_to(&self, x_css: f64) {
        let f = self.frame();
        let g = self.cs.computed.with_untracked(|c| c.as_ref().and_then(|c| gap_at(self.kind, &f, c, x_css)));
        if let Some(g) = g {
            self.cs.ctx.set_gap(Control::Gap, g);
        }
    }
}

impl PlotBehaviour for CellCard {
    fn hover(&self, x: f64, y: f64, width: f64) -> Option<Hover> {
        let f = self.frame();
        self.cs.computed.with_untracked(|c| c.as_ref().and_then(|c| hover_of(self.kind, &f, c, x, y, width)))
    }

    fn press(&self, x: f64, y: f64) -> bool {
        if !self.draggable() || !self.frame().contains_css(x, y, 12.0) {
            return false;
        }
        self.move_to(x);
        true
    }

    fn drag(&self, x: f64, _y: f64) {
        self.move_to(x);
    }

    fn key_down(&self, ev: &web_sys::KeyboardEvent) -> bool {
        if !self.draggable() {
            return false;
        }
        let ctx = self.cs.ctx;
        let step = crate::app::widgets::fields::key_step(ev);
        // on a wavelength axis, right means longer wavelengths: a smaller gap
        let right = ctx.scenario.with_untracked(|s| {
            if self.kind == PlotKind::Spectrum && s.view.spectrum_axis == PlotAxis::Wavelength {
                -1.0
            } else {
                1.0
            }
        });
        let dir = match ev.key().as_str() {
            "ArrowUp" => 1.0,
            "ArrowDown" => -1.0,
            "ArrowRight" => right,
            "ArrowLeft" => -right,
            _ => return false,
        };
        ctx.set_gap(Control::Gap, tidy(ctx.gap() + dir * step));
        true
    }

    fn save(&self, kind: ExportKind) -> Result<(), String> {
        let s = self.cs.ctx.scenario.get_untracked();
        let c = self.cs.computed.get_untracked().ok_or("nothing has been computed yet")?;
        let plot = CellPlot { kind: self.kind, c: &c };
        let csv = || match self.kind {
            PlotKind::Spectrum => csv::spectrum_csv(&s, &c),
            PlotKind::Efficiency => csv::efficiency_csv(&s, &c),
            PlotKind::Jv => csv::jv_csv(&s, &c),
        };
        offer(kind, self.kind.slug(), &plot, || csv::caption(&s, &c), csv)
    }
}

pub fn cell_plot_card(cs: CellState, kind: PlotKind, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = cs.ctx;
    let i = kind.index();
    let draggable = kind != PlotKind::Jv;
    let note = (kind == PlotKind::Efficiency).then(|| view! {
        <p class="field-error" id="e-curve-range" data-error=Control::CurveRange.as_str() aria-live="polite">{move || ctx.error_of(Control::CurveRange)}</p>
    });
    plot_card(
        ctx,
        Card {
            slug: kind.slug(),
            title: title(kind),
            aria: aria(kind).to_string(),
            interactive: draggable,
            wrap_class: if draggable { "draggable" } else { "" },
            control: None,
            tools: header_tools(cs, kind).into_any(),
            legend: legend(cs, kind).into_any(),
            note: note.into_any(),
            footer: ().into_any(),
            canvas,
            plot_error: Signal::derive(move || cs.plot_errors.with(|e| e[i].clone())),
        },
        Rc::new(CellCard { cs, kind }),
    )
}
