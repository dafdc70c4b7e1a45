//! The cell panel's data as text: the caption under exported figures and the CSV of each
//! plot (the spectrum's file loads back as a spectrum).
//!
//! Architecture invariant: figures come from `report::CellReport`, numbers are written by
//! `view::format::csv_num`, so the files and the page show the same values.

use crate::report::CellMetric;
use std::fmt::Write;

use super::CellView;
use crate::report::CellReport;
use crate::scenario::{Emission, JvModel};
use crate::scenario::{PlotAxis, PlotQuantity, Scenario, SourceSpec};
use crate::view::format::{csv_num, field, fixed, gap_ev};
use crate::view::input::nm_of_ev;
use crate::view::spectrum::{spectrum_view, SpectrumDetail};

/// Short human name of a source.
pub fn source_label(spec: &SourceSpec) -> String {
    match spec {
        SourceSpec::Am15g => "AM1.5G".into(),
        SourceSpec::Am15d => "AM1.5D".into(),
        SourceSpec::Am0 => "AM0".into(),
        SourceSpec::Blackbody { temp_k } => format!("{} K blackbody sun", field(*temp_k, 6)),
        SourceSpec::File { path } => format!("file {path}"),
        SourceSpec::Table(t) => format!("spectrum '{}'", t.name),
        SourceSpec::ClearSky(c) => format!(
            "clear sky at {} deg, {} deg, {} (no clouds)",
            field(c.place.lat_deg, 6),
            field(c.place.lon_deg, 6),
            c.time
        ),
    }
}

/// One line describing the scenario, for exported figures and files.
pub fn caption(s: &Scenario, c: &CellView) -> String {
    let cell = &s.cell;
    let mut parts = vec![
        source_label(&cell.spectrum),
        format!("{} sun{}", field(cell.concentration, 6), if cell.concentration == 1.0 { "" } else { "s" }),
        format!("cell {} K", field(cell.cell_temp_k, 6)),
    ];
    if cell.ere != 1.0 {
        parts.push(format!("ERE {}", field(cell.ere, 4)));
    }
    if cell.emission == Emission::Both {
        parts.push("both faces emit".into());
    }
    if cell.approx == JvModel::Boltzmann {
        parts.push("Boltzmann approximation".into());
    }
    parts.push(format!("Eg {} eV: {}", gap_ev(cell.gap_ev), c.report.display(CellMetric::Efficiency)));
    format!("Glowgap · {} · detailed-balance limit", parts.join(" · "))
}

/// One line describing the light and the cell (`cells`: "cell" or "cells"), then `what`, for
/// exported figures that show more than one gap.
pub fn conditions_caption(s: &Scenario, cells: &str, what: &str) -> String {
    let cell = &s.cell;
    let mut parts = vec![
        source_label(&cell.spectrum),
        format!("{} sun{}", field(cell.concentration, 6), if cell.concentration == 1.0 { "" } else { "s" }),
        format!("{cells} {} K", field(cell.cell_temp_k, 6)),
    ];
    if cell.ere != 1.0 {
        parts.push(format!("ERE {}", field(cell.ere, 4)));
    }
    parts.push(what.to_string());
    format!("Glowgap · {} · detailed-balance limit", parts.join(" · "))
}

fn comment_lines(out: &mut String, what: &str, s: &Scenario, c: &CellView) {
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(out, "# {}", caption(s, c));
    let _ = writeln!(out, "# Detailed-balance limits of an ideal cell: upper bounds, not predictions of a device.");
}

/// The source spectrum at every point of the plotted window: the plot's axis and quantity
/// first (so the file loads back as a spectrum), then the other axis and quantity.
pub fn spectrum_csv(s: &Scenario, c: &CellView) -> String {
    let axis = c.view.spectrum_axis;
    let quantity = c.view.spectrum_quantity;
    let other_q = match quantity {
        PlotQuantity::Irradiance => PlotQuantity::PhotonFlux,
        PlotQuantity::PhotonFlux => PlotQuantity::Irradiance,
    };
    let src = &c.setup.light.source;
    let full = spectrum_view(src, &s.cell.spectrum, axis, quantity, SpectrumDetail::Export);
    let other = spectrum_view(src, &s.cell.spectrum, axis, other_q, SpectrumDetail::Export);
    let per = match axis {
        PlotAxis::Wavelength => "nm-1",
        PlotAxis::PhotonEnergy => "eV-1",
    };
    let qname = |q: PlotQuantity| match q {
        PlotQuantity::Irradiance => format!("spectral irradiance (W m-2 {per})"),
        PlotQuantity::PhotonFlux => format!("spectral photon flux (photons s-1 m-2 {per})"),
    };
    let (xname, oname) = match axis {
        PlotAxis::Wavelength => ("wavelength (nm)", "photon energy (eV)"),
        PlotAxis::PhotonEnergy => ("photon energy (eV)", "wavelength (nm)"),
    };
    let mut out = String::new();
    comment_lines(&mut out, &format!("source spectrum, one sun ({})", full.name), s, c);
    let range = match axis {
        PlotAxis::Wavelength => format!("{}-{} nm", fixed(full.x_lo, 1), fixed(full.x_hi, 1)),
        PlotAxis::PhotonEnergy => format!("{}-{} eV", fixed(full.x_lo, 4), fixed(full.x_hi, 4)),
    };
    let _ = writeln!(out, "# every point of the source over {range}");
    let _ = writeln!(out, "# absorbed = 1 where the photon energy is at or above the band gap");
    let _ = writeln!(out, "{xname},{},{oname},{},absorbed", qname(quantity), qname(other_q));
    for (i, x) in full.x.iter().enumerate() {
        let e_ev = full.ev_of_x(*x);
        let o = match axis {
            PlotAxis::Wavelength => e_ev,
            PlotAxis::PhotonEnergy => nm_of_ev(e_ev),
        };
        let absorbed = if e_ev >= c.gap_ev { 1 } else { 0 };
        let (xd, od) = match axis {
            PlotAxis::Wavelength => (4, 6),
            PlotAxis::PhotonEnergy => (6, 4),
        };
        let _ = writeln!(
            out,
            "{:.xd$},{},{:.od$},{},{absorbed}",
            x,
            csv_num(full.y[i]),
            o,
            csv_num(other.y.get(i).copied().unwrap_or(0.0))
        );
    }
    out
}

fn report_header(out: &mut String) {
    let _ = writeln!(out, "band gap (eV),absorption edge (nm),efficiency (%),Jsc (mA/cm2),Voc (V),fill factor,Vmp (V),Jmp (mA/cm2),Pmax (W/m2),incident power (W/m2)");
}

fn report_row(out: &mut String, r: &CellReport) {
    let nm = nm_of_ev(r.gap_ev);
    let _ = writeln!(
        out,
        "{:.6},{:.3},{},{},{},{},{},{},{},{}",
        r.gap_ev,
        nm,
        csv_num(r.efficiency * 100.0),
        csv_num(r.jsc_ma_cm2),
        csv_num(r.voc_v),
        csv_num(r.ff),
        csv_num(r.vmp_v),
        csv_num(r.jmp_ma_cm2),
        csv_num(r.pmax_w_m2),
        csv_num(r.input_w_m2)
    );
}

pub fn efficiency_csv(s: &Scenario, c: &CellView) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "limiting efficiency against band gap", s, c);
    if let Some(b) = c.curve.best {
        let b = CellReport::from(&b);
        let _ = writeln!(
            out,
            "# best band gap in {}-{} eV: {} eV, {} %",
            c.curve.from_ev,
            c.curve.to_ev,
            fixed(b.gap_ev, 4),
            fixed(b.efficiency * 100.0, 3)
        );
    }
    report_header(&mut out);
    for r in &c.curve.results {
        report_row(&mut out, &CellReport::from(r));
    }
    out
}

pub fn jv_csv(s: &Scenario, c: &CellView) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "J-V and P-V curves", s, c);
    let r = &c.report;
    let _ = writeln!(
        out,
        "# Jsc {} · Voc {} · FF {} · Vmp {} · Jmp {}",
        r.display(CellMetric::Jsc),
        r.display(CellMetric::Voc),
        r.display(CellMetric::Ff),
        r.display(CellMetric::Vmp),
        r.display(CellMetric::Jmp)
    );
    let _ = writeln!(out, "voltage (V),current density (mA/cm2),power density (mW/cm2)");
    for (v, j) in &c.jv {
        let _ = writeln!(out, "{:.6},{},{}", v, csv_num(*j), csv_num(v * j));
    }
    out
}
