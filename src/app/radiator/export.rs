//! The radiator's plots as files: SVG and PNG through the shared renderers, the plotted data
//! as CSV (the profile's file loads back as an emissivity table).

use std::fmt::Write;

use super::engine::RadComputed;
use super::plots::balance::{amounts, BARS};
use super::plots::RadPlot;
use super::state::Slot;
use crate::app::card::file_name;
use crate::app::export::{download_text, download_url};
use crate::app::fmt::{csv_num, field};
use crate::app::plots::render::{png_data_url, svg_text};
use crate::report::radiator::RADIATOR_PARTS;
use crate::scenario::radiator::SkySpec;

/// Scenario labels as the page writes them (um as µm).
pub fn shown(label: String) -> String {
    label.replace(" um", " µm")
}

/// One line describing the radiator, for exported figures and files.
pub fn caption(c: &RadComputed) -> String {
    let sc = &c.scenario;
    let r = &c.report;
    let sky = match &sc.sky {
        SkySpec::Box => "box sky".to_string(),
        SkySpec::Space => "space".to_string(),
        SkySpec::Clear { pwv_cm } => format!("clear sky, {} cm water", field(*pwv_cm, 4)),
        other => shown(other.label()),
    };
    let sun = match &sc.sun {
        Some(_) => format!("{} at {}°", c.background.sun_name, field(sc.sun_zenith_deg, 4)),
        None => "night".into(),
    };
    format!(
        "Glowgap · radiator · {} · {sky} · air {} K · {sun} · h_c {} W/m²K · P_net {} at {}",
        shown(sc.emitter.label()),
        field(sc.ambient_k, 6),
        field(sc.h_c_w_m2k, 6),
        r.display("net-power"),
        r.display("surface-temp"),
    )
}

fn comment_lines(out: &mut String, what: &str, c: &RadComputed) {
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(out, "# {}", caption(c));
    let _ = writeln!(out, "# An idealized radiative balance: a limit for this profile and sky, not a prediction of a coating's performance.");
}

/// The profile and the curves behind it at the editor's sample wavelengths.
pub fn emissivity_csv(c: &RadComputed) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "emissivity profile, sky transmittance, sun and blackbody", c);
    let bg = &c.background;
    let _ = writeln!(
        out,
        "# sun: {} (peak {} W m-2 um-1); blackbody at {} K (peak {} W m-2 um-1)",
        bg.sun_name,
        csv_num(bg.sun_peak),
        field(c.scenario.surface_temperature(), 6),
        csv_num(bg.bb_peak)
    );
    let _ = writeln!(out, "wavelength_um,emissivity,sky_transmittance,sun_W_m2_um,blackbody_W_m2_um");
    for (i, x) in bg.x.iter().enumerate() {
        let l = 10f64.powf(*x);
        let _ = writeln!(
            out,
            "{},{},{},{},{}",
            csv_num(l),
            csv_num(c.eps_at(l)),
            csv_num(bg.sky[i]),
            csv_num(bg.sun[i] * bg.sun_peak),
            csv_num(bg.bb[i] * bg.bb_peak)
        );
    }
    out
}

/// The parts of the balance at the surface temperature.
pub fn balance_csv(c: &RadComputed) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "parts of the balance at the surface temperature", c);
    let _ = writeln!(out, "# P_net = emitted - absorbed from the sky - absorbed from the sun - gained from the air");
    let _ = writeln!(out, "term,power_W_m2,contribution_to_net_W_m2");
    let amounts = amounts(c);
    for (i, (hook, label)) in RADIATOR_PARTS.iter().enumerate() {
        let _ = writeln!(out, "{label},{},{}", csv_num(c.report.metric(hook)), csv_num(amounts[i]));
    }
    let _ = writeln!(out, "Net cooling power,{},{}", csv_num(c.report.net_w_m2), csv_num(amounts[BARS.len() - 1]));
    out
}

/// The P_net(T) curve with its parts.
pub fn curve_csv(c: &RadComputed) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "net cooling power against surface temperature", c);
    let _ = writeln!(out, "# steady temperature: {}", c.report.steady_text());
    let _ =
        writeln!(out, "temperature_K,net_W_m2,emitted_W_m2,sky_absorbed_W_m2,sun_absorbed_W_m2,gained_from_air_W_m2");
    for p in &c.curve {
        let _ = writeln!(
            out,
            "{},{},{},{},{},{}",
            csv_num(p.temp_k),
            csv_num(p.net),
            csv_num(p.emitted),
            csv_num(p.sky_absorbed),
            csv_num(p.sun_absorbed),
            csv_num(p.parasitic)
        );
    }
    out
}

/// Offer one plot as `what` ("svg", "png" or "csv").
pub fn save(slot: Slot, c: &RadComputed, selected: Option<usize>, what: &str) -> Result<(), String> {
    let name = file_name(slot.slug(), what);
    let plot = RadPlot { slot, c, selected };
    match what {
        "svg" => download_text(&name, "image/svg+xml", &svg_text(&plot, caption(c))?),
        "png" => download_url(&name, &png_data_url(&plot, caption(c))?),
        _ => {
            let text = match slot {
                Slot::Editor => emissivity_csv(c),
                Slot::Balance => balance_csv(c),
                Slot::Curve => curve_csv(c),
            };
            download_text(&name, "text/csv", &text)
        }
    }
}
