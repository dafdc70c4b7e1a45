//! A measured quantum efficiency: load a file, see the Jsc and Voc limits it implies by
//! reciprocity (radiative, and with the cell's ERE) next to those of an ideal step at the
//! same absorption edge, and the EQE itself against the step.

use std::rc::Rc;

use leptos::html;
use leptos::prelude::*;
use plotters::coord::Shift;
use plotters::prelude::*;

use super::compute::AbsorberView;
use super::{edit_stack, StackCtx, EQE};
use crate::app::controls::drop_zone;
use crate::app::fmt::fixed;
use crate::app::import::{read_then, stem};
use crate::app::plots::{chart, err, palette, tick_target, AxisSpec, Drawing, Frame, Look};
use crate::app::state::{ev_of_nm, sentence, Ctx};
use crate::formats::eqe_csv::parse_eqe_csv;
use crate::report::stack::AbsorberReport;
use crate::scenario::stack::{AbsorberSpec, EqeTableSpec};

/// Read an EQE file and make it the measured cell.
pub fn open_eqe(ctx: Ctx, file: web_sys::File) {
    read_then(file, move |name, text| {
        let outcome = text.and_then(|t| parse_eqe_csv(&t, &stem(&name)).map_err(|e| e.to_string()));
        match outcome {
            Ok(table) => {
                let spec = AbsorberSpec::Measured(EqeTableSpec::from_table(&table));
                if edit_stack(ctx, "eqe-file", move |st| st.absorber = spec) {
                    ctx.status.set(Some(format!("Loaded the quantum efficiency '{name}' ({} points).", table.coordinates().len())));
                }
            }
            Err(e) => ctx.set_error(
                "eqe-file",
                format!("'{name}' was not loaded — {}. Fix the file and load it again; nothing else changed.", sentence(&e).trim_end_matches('.')),
            ),
        }
    });
}

pub struct EqePlot<'a> {
    pub a: &'a AbsorberView,
}

impl Drawing for EqePlot<'_> {
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>, look: &Look) -> Result<Frame, String> {
        root.fill(&WHITE).map_err(err)?;
        let (w, h) = root.dim_in_pixel();
        let pts: Vec<(f64, f64)> = self.a.points.iter().map(|(e, q)| (ev_of_nm(1.0) / e, q * 100.0)).collect();
        let (lo, hi) = pts.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| (a.min(p.0), b.max(p.0)));
        let (lo, hi) = if hi > lo { (lo, hi) } else { (300.0, 1200.0) };
        let x = AxisSpec::new(lo, hi, tick_target(look, w, 70.0), "Wavelength", "nm", false);
        let y = AxisSpec::new(0.0, 105.0, tick_target(look, h, 40.0), "EQE", "%", false);
        let (mut c, frame) = chart(root, look, &x, &y, true)?;
        // the ideal step at the same edge
        let edge_nm = ev_of_nm(1.0) / self.a.step.cell.gap_ev;
        if edge_nm > lo {
            let e = edge_nm.min(hi);
            let step = vec![(lo, 100.0), (e, 100.0), (e, 0.0), (hi, 0.0)];
            c.draw_series(std::iter::once(PathElement::new(step, palette::MUTED.stroke_width(look.px(1.4).max(1) as u32)))).map_err(err)?;
        }
        let mut sorted = pts.clone();
        sorted.sort_by(|a, b| a.0.total_cmp(&b.0));
        c.draw_series(AreaSeries::new(sorted.clone(), 0.0, palette::ABSORBED.mix(0.35).filled())).map_err(err)?;
        c.draw_series(LineSeries::new(sorted, palette::SPECTRUM.stroke_width(look.px(1.8).max(1) as u32))).map_err(err)?;
        Ok(frame)
    }
}

/// One row of the comparison: label, hook, value for the step, value for the EQE.
fn rows(a: &AbsorberView, ere: f64) -> Vec<(String, &'static str, String, String)> {
    let (s, m): (&AbsorberReport, &AbsorberReport) = (&a.step, &a.measured);
    let v = |x: f64| format!("{} V", fixed(x, 4));
    vec![
        ("Jsc".into(), "eqe-jsc", s.cell.display("jsc"), m.cell.display("jsc")),
        ("Voc, radiative limit".into(), "eqe-voc-rad", v(s.voc_rad_v), v(m.voc_rad_v)),
        (format!("Voc at ERE {}", crate::app::fmt::field(ere, 4)), "eqe-voc", s.cell.display("voc"), m.cell.display("voc")),
        ("Non-radiative Voc loss".into(), "eqe-nonrad-loss", v(s.nonrad_voc_loss_v), v(m.nonrad_voc_loss_v)),
        ("Efficiency limit".into(), "eqe-efficiency", s.cell.display("efficiency"), m.cell.display("efficiency")),
    ]
}

pub fn eqe_section(sc: StackCtx, canvas: NodeRef<html::Canvas>) -> impl IntoView {
    let ctx = sc.ctx;
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
        Rc::new(move |f| open_eqe(ctx, f)),
    );
    let has = move || sc.absorber.with(|a| a.is_some());
    let table = move || {
        let ere = ctx.scenario.with(|s| s.cell.ere);
        sc.absorber.with(|a| {
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
            Some(view! {
                <p class="eqe-name" data-info="eqe-name">{format!("{} · edge (half maximum) {} eV", a.name, fixed(a.step.cell.gap_ev, 3))}</p>
                <table class="stack-table eqe-table" data-table="eqe">
                    <thead><tr><th scope="col"></th><th scope="col">"Ideal step"</th><th scope="col">"This EQE"</th></tr></thead>
                    <tbody>{body}</tbody>
                </table>
                <p class="warning" hidden=warnings.is_empty()>{warnings.clone()}</p>
            })
        })
    };
    let remove = move |_| {
        edit_stack(ctx, "eqe-file", |st| st.absorber = AbsorberSpec::Step);
    };
    view! {
        <section class="panel-section eqe-section" aria-labelledby="eqe-h">
            <h2 id="eqe-h">"Measured cell (EQE)"</h2>
            <p class="hint">"Reciprocity turns a measured EQE into the cell's Jsc and its radiative-limit Voc; the ERE of the Solar cell tab sets the non-radiative loss. Compared with an ideal step at the same edge, under the same light."</p>
            {drop}
            <p class="field-error" id="e-eqe-file" data-error="eqe-file" aria-live="polite">{move || ctx.error_of("eqe-file")}</p>
            {table}
            <div class="plot-wrap eqe-plot" hidden=move || !has()>
                <canvas data-plot="eqe" node_ref=canvas role="img" aria-label="The measured EQE against wavelength, with the ideal step at the same edge."></canvas>
                <p class="plot-error" hidden=move || sc.plot_errors.with(|e| e[EQE].is_none())>{move || sc.plot_errors.with(|e| e[EQE].clone())}</p>
            </div>
            <button type="button" class="small" data-action="remove-eqe" hidden=move || !has() on:click=remove>"Remove the EQE"</button>
        </section>
    }
}
