//! The hot-emitter panel's data as text: the captions under exported figures and the CSV of
//! each of its five plots.
//!
//! Architecture invariant: figures come from `report::hot` and `report::blackbody`; numbers
//! are written by `view::format::csv_num`.

use std::fmt::Write;

use super::{AbsorberView, BlackbodyView, TpvView};
use crate::report::hot::connection_words;
use crate::view::format::{csv_num, field};

/// Scenario labels as the page writes them (um as µm).
fn shown(label: String) -> String {
    label.replace(" um", " µm")
}

pub fn blackbody_caption(v: &BlackbodyView) -> String {
    let r = &v.report;
    let band = match (v.scenario.band_um, r.band_fraction) {
        (Some([a, b]), Some(f)) => format!(" · {}–{} µm: {:.2} % of σT⁴", field(a, 6), field(b, 6), f * 100.0),
        _ => String::new(),
    };
    format!(
        "Glowgap · blackbody at {} K · peak {:.4} µm · σT⁴ {:.4e} W/m²{band}",
        field(r.temp_k, 8),
        r.peak_wavelength_um,
        r.exitance_w_m2
    )
}

pub fn tpv_caption(v: &TpvView) -> String {
    let sc = &v.scenario;
    let gaps: Vec<String> = sc.gaps_ev.iter().map(|g| field(*g, 6)).collect();
    let conn =
        if gaps.len() > 1 { format!(" ({})", connection_words(sc.connection.to_physics())) } else { String::new() };
    format!(
        "Glowgap · TPV · emitter {} at {} K · view factor {} · gap {} eV{conn} · cell {} K · ERE {} · sub-gap R {} · efficiency {:.2} % · {:.4} W/cm²",
        shown(sc.emitter.label()),
        field(sc.emitter_temp_k, 6),
        field(sc.view_factor, 6),
        gaps.join(", "),
        field(sc.cell_temp_k, 6),
        field(sc.ere, 6),
        sc.subgap_reflectance.label(),
        v.report.efficiency * 100.0,
        v.report.pmax_w_cm2
    )
}

pub fn absorber_caption(v: &AbsorberView) -> String {
    let sc = &v.scenario;
    format!(
        "Glowgap · solar-thermal absorber · {} · {} suns of {} · ambient {} K · h_c {} W/m²K · at {} K: work efficiency {:.2} %",
        shown(sc.surface.label()),
        field(sc.concentration, 6),
        sc.source.label(),
        field(sc.ambient_k, 6),
        field(sc.hc_w_m2k, 6),
        field(sc.temp_k, 6),
        v.report.work_efficiency * 100.0
    )
}

fn head(out: &mut String, what: &str, caption: &str) {
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(out, "# {caption}");
    let _ = writeln!(out, "# Detailed-balance limits of ideal surfaces, not ratings of real equipment.");
}

/// The blackbody spectrum (and the TPV emitter's, when it is not black).
pub fn blackbody_csv(v: &BlackbodyView) -> String {
    let mut out = String::new();
    head(&mut out, "blackbody spectral exitance by Planck, Wien and Rayleigh-Jeans", &blackbody_caption(v));
    if let Some(e) = &v.emitter {
        let _ = writeln!(out, "# emitter: {} at {} K", shown(e.label.clone()), field(e.temp_k, 6));
        let _ = writeln!(out, "wavelength_um,planck_w_m2_um,wien_w_m2_um,rayleigh_jeans_w_m2_um,emitter_w_m2_um");
        for (r, p) in v.rows.iter().zip(&e.points) {
            let _ = writeln!(
                out,
                "{},{},{},{},{}",
                csv_num(r[0]),
                csv_num(r[1]),
                csv_num(r[2]),
                csv_num(r[3]),
                csv_num(p[1])
            );
        }
    } else {
        let _ = writeln!(out, "wavelength_um,planck_w_m2_um,wien_w_m2_um,rayleigh_jeans_w_m2_um");
        for r in &v.rows {
            let _ = writeln!(out, "{},{},{},{}", csv_num(r[0]), csv_num(r[1]), csv_num(r[2]), csv_num(r[3]));
        }
    }
    out
}

/// The spectrum exchanged between emitter and cell.
pub fn exchange_csv(v: &TpvView) -> String {
    let mut out = String::new();
    head(&mut out, "spectrum exchanged between the emitter and the cell at the maximum power point", &tpv_caption(v));
    let _ =
        writeln!(out, "wavelength_um,emitted_w_m2_um,absorbed_by_cell_w_m2_um,returned_to_emitter_w_m2_um,above_gap");
    for p in &v.exchange {
        let _ = writeln!(
            out,
            "{},{},{},{},{}",
            csv_num(p.um),
            csv_num(p.emitted),
            csv_num(p.absorbed),
            csv_num(p.returned),
            u8::from(p.above_gap)
        );
    }
    out
}

pub fn jv_csv(v: &TpvView) -> String {
    let mut out = String::new();
    head(&mut out, "J-V curve of the TPV cell", &tpv_caption(v));
    let _ = writeln!(out, "voltage_v,current_a_cm2,power_w_cm2");
    for p in &v.jv {
        let _ = writeln!(out, "{},{},{}", csv_num(p[0]), csv_num(p[1]), csv_num(p[0] * p[1]));
    }
    out
}

pub fn tradeoff_csv(v: &TpvView) -> String {
    let mut out = String::new();
    head(&mut out, "efficiency and power density of single-junction cells against band gap", &tpv_caption(v));
    let t = &v.tradeoff;
    let _ = writeln!(
        out,
        "# highest efficiency at {} eV ({} %); highest power density at {} eV ({} W/cm2)",
        csv_num(t.best_efficiency.gap_ev),
        csv_num(t.best_efficiency.efficiency * 100.0),
        csv_num(t.best_power.gap_ev),
        csv_num(t.best_power.pmax_w_cm2)
    );
    let _ = writeln!(out, "gap_ev,efficiency_percent,power_density_w_cm2");
    for p in &t.points {
        let _ = writeln!(out, "{},{},{}", csv_num(p.gap_ev), csv_num(p.efficiency * 100.0), csv_num(p.pmax_w_cm2));
    }
    out
}

pub fn absorber_csv(v: &AbsorberView) -> String {
    let mut out = String::new();
    head(&mut out, "solar-thermal absorber efficiency against temperature", &absorber_caption(v));
    if let Some(s) = v.report.stagnation_temp_k {
        let _ = writeln!(out, "# stagnation temperature {} K", csv_num(s));
    }
    let _ = writeln!(out, "temperature_k,thermal_efficiency_percent,work_efficiency_percent");
    for p in v.curve.iter() {
        let _ = writeln!(out, "{},{},{}", csv_num(p[0]), csv_num(p[1] * 100.0), csv_num(p[2] * 100.0));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::super::*;
    use super::*;
    use crate::scenario::hot::HotScenario;

    #[test]
    fn files_have_a_header_and_one_row_per_point() {
        let s = HotScenario::default();
        let b = blackbody_view(&s.blackbody, &s.tpv).unwrap();
        let text = blackbody_csv(&b);
        assert_eq!(text.lines().filter(|l| !l.starts_with('#')).count(), b.rows.len() + 1);
        let mut cache = HotCache::default();
        let t = cache.tpv(&s.tpv, false).unwrap();
        assert!(tradeoff_csv(&t).contains("gap_ev,efficiency_percent"));
        assert_eq!(jv_csv(&t).lines().filter(|l| !l.starts_with('#')).count(), t.jv.len() + 1);
        assert!(exchange_csv(&t).lines().all(|l| !l.contains("NaN") && !l.contains("inf")));
        let a = cache.absorber(&s.absorber).unwrap();
        assert!(absorber_csv(&a).contains("stagnation temperature"));
        assert!(absorber_caption(&a).contains("100 suns"));
    }
}
