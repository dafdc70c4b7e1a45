//! A plot on the page: its header (title, view choices, downloads), its canvas with the
//! band-gap drag and keys, and the hover read-out.

use leptos::ev;
use leptos::html;
use leptos::prelude::*;
use wasm_bindgen::JsCast;

use super::engine::{nearest, Computed};
use super::export;
use super::fmt::{fixed, gap_ev, sig};
use super::plots::render::PlotKind;
use super::plots::Frame;
use super::state::{ev_of_nm, tidy, Ctx};
use crate::physics::constants::to_ev;
use crate::report::CellReport;
use crate::scenario::{PlotAxis, PlotQuantity};

/// What the hover read-out shows.
#[derive(Debug, Clone, PartialEq)]
struct Hover {
    /// pointer position and the marked data point [CSS px in the canvas]
    x: f64,
    y: f64,
    dot: Option<(f64, f64)>,
    lines: Vec<String>,
    flip: bool,
}

fn round_mev(v: f64) -> f64 {
    (v * 1000.0).round() / 1000.0
}

fn pointer_pos(ev: &web_sys::MouseEvent) -> Option<(f64, f64, f64)> {
    let el: web_sys::Element = ev.current_target()?.dyn_into().ok()?;
    let r = el.get_bounding_client_rect();
    Some((ev.client_x() as f64 - r.left(), ev.client_y() as f64 - r.top(), r.width()))
}

/// The band gap [eV] under CSS x on a draggable plot.
fn gap_at(kind: PlotKind, frame: &Frame, c: &Computed, x_css: f64) -> Option<f64> {
    let x = frame.x_at_css(x_css);
    let g = match kind {
        PlotKind::Spectrum => c.spectrum.ev_of_x(x),
        PlotKind::Efficiency => x,
        PlotKind::Jv => return None,
    };
    let (lo, hi) = crate::scenario::GAP_RANGE_EV;
    Some(round_mev(g).clamp(lo, hi))
}

fn hover_of(kind: PlotKind, frame: &Frame, c: &Computed, x_css: f64, y_css: f64, width: f64) -> Option<Hover> {
    if !frame.is_valid() || !frame.contains_css(x_css, y_css, 0.0) {
        return None;
    }
    let xv = frame.x_at_css(x_css);
    let flip = x_css > width - 240.0;
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
                    format!("efficiency {}", r.display("efficiency")),
                    format!("Jsc {} · Voc {}", r.display("jsc"), r.display("voc")),
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
    Some(Hover { x: x_css, y: y_css, dot, lines, flip })
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
    hook: &'static str,
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
    view! { <div class="seg" role="group" aria-label=label data-control=hook>{buttons}</div> }
}

fn header_tools(ctx: Ctx, kind: PlotKind) -> impl IntoView {
    match kind {
        PlotKind::Spectrum => view! {
            <div class="plot-tools">
                {toggle(ctx, "Spectral axis", "spectrum-axis", [(PlotAxis::Wavelength, "Wavelength", "wavelength"), (PlotAxis::PhotonEnergy, "Photon energy", "energy")], |v| v.spectrum_axis, |v, a| v.spectrum_axis = a)}
                {toggle(ctx, "Plotted quantity", "spectrum-quantity", [(PlotQuantity::Irradiance, "Irradiance", "irradiance"), (PlotQuantity::PhotonFlux, "Photon flux", "photon-flux")], |v| v.spectrum_quantity, |v, q| v.spectrum_quantity = q)}
            </div>
        }
        .into_any(),
        PlotKind::Efficiency => range_tools(ctx).into_any(),
        PlotKind::Jv => ().into_any(),
    }
}

fn range_tools(ctx: Ctx) -> impl IntoView {
    let from = Memo::new(move |_| ctx.scenario.with(|s| s.view.curve_from_ev));
    let to = Memo::new(move |_| ctx.scenario.with(|s| s.view.curve_to_ev));
    let input = move |hook: &'static str, value: Memo<f64>, label: &'static str| {
        let r = NodeRef::<html::Input>::new();
        Effect::new(move |_| {
            let v = value.get();
            if let Some(el) = r.get() {
                let typed = super::controls::parse_number(&el.value());
                if el.matches(":focus").unwrap_or(false) && typed == Some(v) {
                    return;
                }
                el.set_value(&super::fmt::field(v, 6));
            }
        });
        let on_input = move |ev: ev::Event| {
            let text = event_target_value(&ev);
            match super::controls::parse_number(&text) {
                Some(v) => {
                    ctx.edit("curve-range", |s| {
                        if hook == "curve-from" {
                            s.view.curve_from_ev = v
                        } else {
                            s.view.curve_to_ev = v
                        }
                    });
                }
                None => ctx.set_error("curve-range", format!("'{}' is not a band gap; type a number of eV, e.g. 0.5. The plotted range is unchanged.", text.trim())),
            }
        };
        view! {
            <label class="range-field">
                <span>{label}</span>
                <input type="text" inputmode="decimal" data-control=hook node_ref=r value=super::fmt::field(value.get_untracked(), 6) on:input=on_input aria-describedby="e-curve-range" />
                <span class="unit">"eV"</span>
            </label>
        }
    };
    let best = move || {
        ctx.computed.with(|c| c.as_ref().and_then(|c| c.curve.best.map(|b| to_ev(b.gap_j))))
    };
    view! {
        <div class="plot-tools">
            {input("curve-from", from, "from")}
            {input("curve-to", to, "to")}
            <button
                type="button"
                class="small"
                data-action="use-best-gap"
                disabled=move || best().is_none()
                on:click=move |_| {
                    if let Some(g) = best() {
                        ctx.set_gap("gap", tidy(g));
                    }
                }
            >
                "Use best gap"
            </button>
        </div>
    }
}

fn legend(ctx: Ctx, kind: PlotKind) -> impl IntoView {
    move || {
        ctx.computed.with(|c| {
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
                    <span class="key"><i class="k-dot"></i>{format!("max power point: {} at {}", c.report.display("jmp"), c.report.display("vmp"))}</span>
                }
                .into_any(),
            })
        })
    }
}

pub fn plot_card(ctx: Ctx, kind: PlotKind, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let i = kind.index();
    let hover = RwSignal::new(None::<Hover>);
    let dragging = StoredValue::new(false);
    let draggable = kind != PlotKind::Jv;

    let frame = move || ctx.frames.with_untracked(|f| f[i]);
    let move_to = move |x_css: f64| {
        let f = frame();
        let g = ctx.computed.with_untracked(|c| c.as_ref().and_then(|c| gap_at(kind, &f, c, x_css)));
        if let Some(g) = g {
            ctx.set_gap("gap", g);
        }
    };
    let update_hover = move |x: f64, y: f64, w: f64| {
        let f = frame();
        let h = ctx.computed.with_untracked(|c| c.as_ref().and_then(|c| hover_of(kind, &f, c, x, y, w)));
        hover.set(h);
    };

    let on_down = move |ev: ev::PointerEvent| {
        if !draggable || ev.button() != 0 {
            return;
        }
        let Some((x, y, _)) = pointer_pos(&ev) else { return };
        if !frame().contains_css(x, y, 12.0) {
            return;
        }
        ev.prevent_default();
        if let Some(c) = canvas.get_untracked() {
            let _ = c.set_pointer_capture(ev.pointer_id());
            let _ = c.focus();
        }
        dragging.set_value(true);
        move_to(x);
    };
    let on_move = move |ev: ev::PointerEvent| {
        let Some((x, y, w)) = pointer_pos(&ev) else { return };
        if dragging.get_value() {
            move_to(x);
        }
        update_hover(x, y, w);
    };
    let end = move |ev: ev::PointerEvent| {
        if dragging.get_value() {
            dragging.set_value(false);
            if let Some(c) = canvas.get_untracked() {
                let _ = c.release_pointer_capture(ev.pointer_id());
            }
        }
    };
    let on_leave = move |_ev: ev::PointerEvent| {
        if !dragging.get_value() {
            hover.set(None);
        }
    };
    let on_key = move |ev: ev::KeyboardEvent| {
        if !draggable {
            return;
        }
        let step = super::controls::key_step(&ev);
        // on a wavelength axis, right means longer wavelengths: a smaller gap
        let right = ctx.scenario.with_untracked(|s| if kind == PlotKind::Spectrum && s.view.spectrum_axis == PlotAxis::Wavelength { -1.0 } else { 1.0 });
        let dir = match ev.key().as_str() {
            "ArrowUp" => 1.0,
            "ArrowDown" => -1.0,
            "ArrowRight" => right,
            "ArrowLeft" => -right,
            _ => return,
        };
        ev.prevent_default();
        ctx.set_gap("gap", tidy(ctx.gap() + dir * step));
    };

    let download = move |what: &'static str| {
        let s = ctx.scenario.get_untracked();
        let r = ctx.computed.with_untracked(|c| match c.as_ref() {
            Some(c) => match what {
                "svg" => export::save_svg(kind, &s, c),
                "png" => export::save_png(kind, &s, c),
                _ => export::save_csv(kind, &s, c),
            },
            None => Err("nothing has been computed yet".into()),
        });
        match r {
            Ok(()) => ctx.status.set(Some(format!("Saved {}.", export::file_name(kind, what)))),
            Err(e) => ctx.status.set(Some(format!("Could not save the {} file: {e}.", what.to_uppercase()))),
        }
    };
    let slug = kind.slug();
    let tip = move || {
        hover.get().map(|h| {
            let style = if h.flip {
                format!("right:calc(100% - {:.0}px);top:{:.0}px", h.x - 14.0, h.y + 14.0)
            } else {
                format!("left:{:.0}px;top:{:.0}px", h.x + 14.0, h.y + 14.0)
            };
            let dot = h.dot.map(|(x, y)| view! { <span class="hover-dot" style=format!("left:{x:.1}px;top:{y:.1}px")></span> });
            let lines = h.lines.into_iter().map(|l| view! { <span>{l}</span> }).collect_view();
            view! {
                {dot}
                <div class="tooltip" style=style>{lines}</div>
            }
        })
    };
    let plot_error = move || ctx.plot_errors.with(|e| e[i].clone());

    view! {
        <article class="plot-card" data-card=slug>
            <header class="plot-head">
                <h3>{title(kind)}</h3>
                {header_tools(ctx, kind)}
                <div class="downloads" role="group" aria-label=format!("Download the {} plot", slug)>
                    <button type="button" data-action=format!("download-{slug}-svg") title="Download the plot as SVG (vector)" on:click=move |_| download("svg")>"SVG"</button>
                    <button type="button" data-action=format!("download-{slug}-png") title="Download the plot as PNG, 1600×1000" on:click=move |_| download("png")>"PNG"</button>
                    <button type="button" data-action=format!("download-{slug}-csv") title="Download the plotted data as CSV" on:click=move |_| download("csv")>"CSV"</button>
                </div>
            </header>
            <div class="legend">{legend(ctx, kind)}</div>
            {(kind == PlotKind::Efficiency).then(|| view! {
                <p class="field-error" id="e-curve-range" data-error="curve-range" aria-live="polite">{move || ctx.error_of("curve-range")}</p>
            })}
            <div class="plot-wrap" class:draggable=draggable>
                <canvas
                    data-plot=slug
                    node_ref=canvas
                    role="img"
                    aria-label=aria(kind)
                    tabindex=if draggable { "0" } else { "-1" }
                    on:pointerdown=on_down
                    on:pointermove=on_move
                    on:pointerup=end
                    on:pointercancel=end
                    on:pointerleave=on_leave
                    on:keydown=on_key
                ></canvas>
                {tip}
                <p class="plot-error" hidden=move || plot_error().is_none()>{plot_error}</p>
            </div>
        </article>
    }
}
