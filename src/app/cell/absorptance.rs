//! The single cell's absorptance: an ideal step, an Urbach tail of a chosen width, or a
//! measured EQE loaded from a file. For the last two, the Jsc and Voc limits they imply by
//! reciprocity (radiative, and with the cell's ERE) are shown next to those of an ideal step
//! at the same absorption edge, with the absorptance itself against the step.

use crate::app::widgets::plot::Backend;
use crate::report::CellMetric;
use crate::view::controls::Control;
use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;
use plotters::coord::Shift;
use plotters::prelude::*;

use super::state::{CellState, ABSORPTANCE};
use crate::app::import::read_then;
use crate::app::state::{sentence, Ctx};
use crate::app::widgets::fields::{drop_zone, number_field, Field};
use crate::app::widgets::plot::{chart, err, palette, tick_target, AxisSpec, Drawing, Frame, Look};
use crate::formats::eqe_csv::parse_eqe_csv;
use crate::formats::TableKind;
use crate::report::stack::AbsorberReport;
use crate::scenario::stack::{AbsorberSpec, EqeTableSpec};
use crate::view::cell::absorber::{AbsorberKind, AbsorberView};
use crate::view::format::{self as fmt, fixed};
use crate::view::input::{ev_of_nm, parse_number};
use crate::view::tables::stem;

/// Make `spec` the single cell's absorptance, if the scenario accepts it for the cell's gap
/// and temperature; otherwise say why under `hook`.
pub fn set_absorber(ctx: Ctx, hook: Control, spec: AbsorberSpec) -> bool {
    let (gap, temp) = ctx.scenario.with_untracked(|s| (s.cell.gap_ev, s.cell.cell_temp_k));
    if let Err(e) = spec.to_physics(gap, temp, &mut Vec::new()) {
        ctx.set_error(hook, sentence(&e));
        return false;
    }
    ctx.edit(hook, move |s| s.stack.absorber = spec)
}

/// Read an EQE file and make it the measured cell; `kept` remembers it while another
/// absorptance is chosen.
pub fn open_eqe(ctx: Ctx, kept: RwSignal<Option<EqeTableSpec>>, file: web_sys::File) {
    read_then(file, move |name, text| {
        let outcome = text.and_then(|t| {
            parse_eqe_csv(&t, &stem(&name))
                .map_err(|e| crate::view::hints::page_message(&e, TableKind::QuantumEfficiency))
        });
        match outcome {
            Ok(table) => {
                let spec = EqeTableSpec::from_table(&table);
                if set_absorber(ctx, Control::EqeFile, AbsorberSpec::Measured(spec.clone())) {
                    kept.set(Some(spec));
                    ctx.clear_error(Control::Absorber);
                    ctx.status.set(Some(format!(
                        "Loaded the quantum efficiency '{name}' ({} points).",
                        table.coordinates().len()
                    )));
                }
            }
            Err(e) => ctx.set_error(
                Control::EqeFile,
                format!(
                    "'{name}' was not loaded — {}. Fix the file and load it again; nothing else changed.",
                    sentence(&e).trim_end_matches('.')
                ),
            ),
        }
    });
}

/// An absorptance (or EQE) against wavelength with the ideal step at the same edge.
pub struct AbsorptancePlot<'a> {
    /// (photon energy [eV], fraction), any order
    pub points: &'a [(f64, f64)],
    /// where the ideal step sits [eV]
    pub edge_ev: f64,
    /// the y axis' name
    pub what: &'static str,
}

impl Drawing for AbsorptancePlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        let (w, h) = root.dim_in_pixel();
        let pts: Vec<(f64, f64)> = self.points.iter().map(|(e, q)| (ev_of_nm(1.0) / e, q * 100.0)).collect();
        let (lo, hi) = pts.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| (a.min(p.0), b.max(p.0)));
        let (lo, hi) = if hi > lo { (lo, hi) } else { (300.0, 1200.0) };
        let x = AxisSpec::new(lo, hi, tick_target(look, w, 70.0), "Wavelength", "nm", false);
        let y = AxisSpec::new(0.0, 105.0, tick_target(look, h, 40.0), self.what, "%", false);
        let (mut c, frame) = chart(root, look, &x, &y, true)?;
        // the ideal step at the same edge
        let edge_nm = ev_of_nm(1.0) / self.edge_ev;
        if edge_nm > lo {
            let e = edge_nm.min(hi);
            let step = vec![(lo, 100.0), (e, 100.0), (e, 0.0), (hi, 0.0)];
            c.draw_series(std::iter::once(PathElement::new(
                step,
                palette::MUTED.stroke_width(look.px(1.4).max(1) as u32),
            )))
            .map_err(err)?;
        }
        let mut sorted = pts.clone();
        crate::physics::order::sort_ascending_by(&mut sorted, |p| p.0);
        c.draw_series(AreaSeries::new(sorted.clone(), 0.0, palette::ABSORBED.mix(0.35).filled())).map_err(err)?;
        c.draw_series(LineSeries::new(sorted, palette::SPECTRUM.stroke_width(look.px(1.8).max(1) as u32)))
            .map_err(err)?;
        Ok(frame)
    }
}

/// One row of the comparison: label, hook, value for the step, value for the EQE.
fn rows(a: &AbsorberView, ere: f64) -> Vec<(String, &'static str, String, String)> {
    let (s, m): (&AbsorberReport, &AbsorberReport) = (&a.step, &a.measured);
    let v = |x: f64| format!("{} V", fixed(x, 4));
    vec![
        ("Jsc".into(), "eqe-jsc", s.cell.display(CellMetric::Jsc), m.cell.display(CellMetric::Jsc)),
        ("Voc, radiative limit".into(), "eqe-voc-rad", v(s.voc_rad_v), v(m.voc_rad_v)),
        (
            format!("Voc at ERE {}", crate::view::format::field(ere, 4)),
            "eqe-voc",
            s.cell.display(CellMetric::Voc),
            m.cell.display(CellMetric::Voc),
        ),
        ("Non-radiative Voc loss".into(), "eqe-nonrad-loss", v(s.nonrad_voc_loss_v), v(m.nonrad_voc_loss_v)),
        (
            "Efficiency limit".into(),
            "eqe-efficiency",
            s.cell.display(CellMetric::Efficiency),
            m.cell.display(CellMetric::Efficiency),
        ),
    ]
}

/// The absorptance choices: (value, `data-control` hook, label).
const CHOICES: [(&str, &str, &str); 4] = [
    ("step", "absorber-step", "Ideal step at the band gap"),
    ("urbach", "absorber-urbach", "Step with an Urbach tail below the gap"),
    ("measured", "absorber-measured", "Measured EQE"),
    ("silicon", "absorber-silicon", "Silicon (real absorption)"),
];

/// The Urbach energy offered when the tail is first chosen [meV] (the scenario's example).
const FIRST_URBACH_MEV: f64 = 15.0;

fn kind_of(a: &AbsorberSpec) -> &'static str {
    match a {
        AbsorberSpec::Step => "step",
        AbsorberSpec::Urbach { .. } => "urbach",
        AbsorberSpec::Measured(_) => "measured",
        AbsorberSpec::Real(_) => "silicon",
    }
}

pub fn absorptance_section(cs: CellState, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = cs.ctx;
    let kind = Memo::new(move |_| ctx.scenario.with(|s| kind_of(&s.stack.absorber)));
    // what the other choices were, offered again when chosen again
    let kept_table = RwSignal::new(ctx.scenario.with_untracked(|s| match &s.stack.absorber {
        AbsorberSpec::Measured(t) => Some(t.clone()),
        _ => None,
    }));
    let urbach = Memo::new(move |_| {
        ctx.scenario.with(|s| match s.stack.absorber {
            AbsorberSpec::Urbach { urbach_mev } => Some(urbach_mev),
            _ => None,
        })
    });
    let last_urbach = RwSignal::new(urbach.get_untracked().unwrap_or(FIRST_URBACH_MEV));
    let kept_real = super::silicon::kept(ctx);
    // bumped when a choice is refused, so the radios show the one in use again
    let refresh = RwSignal::new(0u32);

    let choose = move |value: &str| {
        let ok = match value {
            "urbach" => {
                set_absorber(ctx, Control::Absorber, AbsorberSpec::Urbach { urbach_mev: last_urbach.get_untracked() })
            }
            "measured" => match kept_table.get_untracked() {
                Some(t) => set_absorber(ctx, Control::Absorber, AbsorberSpec::Measured(t)),
                None => {
                    ctx.set_error(
                        Control::Absorber,
                        "Load an EQE file first (below); the current absorptance is still in use.".into(),
                    );
                    false
                }
            },
            "silicon" => set_absorber(ctx, Control::Absorber, AbsorberSpec::Real(kept_real.get_untracked())),
            _ => set_absorber(ctx, Control::Absorber, AbsorberSpec::Step),
        };
        if ok {
            ctx.clear_error(Control::Urbach);
        } else {
            refresh.update(|n| *n += 1);
        }
    };
    let radios = CHOICES
        .iter()
        .map(|&(value, hook, label)| {
            let label = move || {
                if value == "measured" {
                    kept_table.with(|t| match t {
                        Some(t) => format!("Measured EQE: {}", t.name),
                        None => "Measured EQE (load a file below)".to_string(),
                    })
                } else {
                    label.to_string()
                }
            };
            view! {
                <label>
                    <input type="radio" name="absorber" value=value data-control=hook aria-describedby="e-absorber"
                        prop:checked=move || { refresh.track(); kind.get() == value }
                        on:change=move |_| choose(value) />
                    {label}
                </label>
            }
        })
        .collect_view();

    let urbach_field = Field {
        label: "Urbach energy",
        unit: "meV",
        hook: Control::Urbach,
        hint: Some("The width of the exponential absorption tail below the gap, e.g. 15 meV; absorption falls e-fold per Urbach energy.".into()),
        example: "15",
        value: Memo::new(move |_| urbach.get().unwrap_or_else(|| last_urbach.get())),
        show: |v| fmt::field(v, 6),
        parse: |t| parse_number(t.trim().trim_end_matches("meV").trim_end_matches("mev")).ok_or_else(|| format!("'{}' is not an Urbach energy; type a number of meV, e.g. 15", t.trim())),
    };
    let urbach_commit: Rc<dyn Fn(f64) -> bool> = Rc::new(move |u| {
        let ok = set_absorber(ctx, Control::Urbach, AbsorberSpec::Urbach { urbach_mev: u });
        if ok {
            last_urbach.set(u);
        }
        ok
    });

    let hint = view! {
        <p class="hint" id="h-eqe-file">
            "A text table: wavelength (nm, µm), photon energy (eV) or wavenumber (cm⁻¹), then EQE as a fraction or % (or a response in A/W); "
            "units in the header, e.g. " <code>"wavelength_nm,eqe_percent"</code> "."
        </p>
    };
    let drop = drop_zone(
        "eqe-file",
        ".csv,.tsv,.txt,.dat,text/csv,text/plain",
        "e-eqe-file h-eqe-file",
        "Load an EQE file…",
        hint.into_any(),
        Rc::new(move |f| open_eqe(ctx, kept_table, f)),
    );
    let has = move || cs.absorber.with(|a| a.is_some());
    let table = move || {
        let ere = ctx.scenario.with(|s| s.cell.ere);
        cs.absorber.with(|a| {
            let a = a.as_ref()?;
            let body = rows(a, ere)
                .into_iter()
                .map(|(label, hook, step, measured)| {
                    view! {
                        <tr>
                            <th scope="row">{label}</th>
                            <td data-metric=format!("{hook}-step")>{step}</td>
                            <td data-metric=hook>{measured}</td>
                        </tr>
                    }
                })
                .collect_view();
            let warnings = a.warnings.iter().map(|w| sentence(w)).collect::<Vec<_>>().join(" ");
            let (name, column) = if a.kind == AbsorberKind::Urbach {
                (format!("{} below the {} eV gap", a.name, fixed(a.step.cell.gap_ev, 3)), "Urbach tail")
            } else {
                (format!("{} · edge (half maximum) {} eV", a.name, fixed(a.step.cell.gap_ev, 3)), "This EQE")
            };
            Some(view! {
                <p class="eqe-name" data-info="eqe-name">{name}</p>
                <table class="stack-table eqe-table" data-table="eqe">
                    <thead><tr><th scope="col"></th><th scope="col">"Ideal step"</th><th scope="col">{column}</th></tr></thead>
                    <tbody>{body}</tbody>
                </table>
                <p class="warning" hidden=warnings.is_empty()>{warnings.clone()}</p>
            })
        })
    };
    let gap = move || ctx.scenario.with(|s| fmt::gap_ev(s.cell.gap_ev));
    let plot_label = move || {
        if kind.get() == "urbach" {
            "The absorptance of the Urbach tail against wavelength, with the ideal step at the same gap."
        } else {
            "The measured EQE against wavelength, with the ideal step at the same edge."
        }
    };
    view! {
        <section class="panel-section eqe-section" aria-labelledby="eqe-h">
            <h2 id="eqe-h">"Absorptance"</h2>
            <p class="hint">
                "How this cell (band gap " {gap} " eV) absorbs. Reciprocity turns the absorptance into the cell's Jsc and its radiative-limit Voc; the ERE above sets the non-radiative loss. Compared with an ideal step at the same edge, under the same light."
            </p>
            <fieldset class="choice">
                <legend>"Absorptance"</legend>
                {radios}
                <p class="field-error" id="e-absorber" data-error=Control::Absorber.as_str() aria-live="polite">{move || ctx.error_of(Control::Absorber)}</p>
            </fieldset>
            <div class="sub-field" hidden=move || kind.get() != "urbach">{number_field(ctx, urbach_field, urbach_commit, None)}</div>
            <div class="sub-field" hidden=move || kind.get() != "silicon">{super::silicon::silicon_settings(cs, kept_real)}</div>
            {drop}
            <p class="field-error" id="e-eqe-file" data-error=Control::EqeFile.as_str() aria-live="polite">{move || ctx.error_of(Control::EqeFile)}</p>
            {table}
            <div class="legend" hidden=move || !has()>
                <span class="key"><i class="k-line k-spectrum"></i>{move || if kind.get() == "urbach" { "with the Urbach tail" } else { "measured EQE" }}</span>
                <span class="key"><i class="k-line k-muted"></i>"ideal step"</span>
            </div>
            <div class="plot-wrap eqe-plot" hidden=move || !has()>
                <canvas data-plot="eqe" node_ref=canvas role="img" aria-label=plot_label></canvas>
                <p class="plot-error" hidden=move || cs.plot_errors.with(|e| e[ABSORPTANCE].is_none())>{move || cs.plot_errors.with(|e| e[ABSORPTANCE].clone())}</p>
            </div>
        </section>
    }
}
