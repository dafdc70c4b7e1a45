//! The radiator panel's data as text: the caption under exported figures and the CSV of each
//! plot (the profile's file loads back as an emissivity table).
//!
//! Architecture invariant: figures come from `report::radiator::RadiatorReport`, numbers are
//! written by `view::format::csv_num`.

use crate::report::radiator::RadiatorMetric;
use std::fmt::Write;

use super::{balance_amounts, RadiatorView, BALANCE_BARS};
use crate::scenario::radiator::SkySpec;
use crate::view::format::{csv_num, field};

/// Scenario labels as the page writes them (um as µm).
pub fn shown(label: String) -> String {
    label.replace(" um", " µm")
}

/// One line describing the radiator, for exported figures and files.
pub fn caption(c: &RadiatorView) -> String {
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
        r.display(RadiatorMetric::NetPower),
        r.display(RadiatorMetric::SurfaceTemp),
    )
}

fn comment_lines(out: &mut String, what: &str, c: &RadiatorView) {
    let _ = writeln!(out, "# Glowgap: {what}");
    let _ = writeln!(out, "# {}", caption(c));
    let _ = writeln!(out, "# An idealized radiative balance: a limit for this profile and sky, not a prediction of a coating's performance.");
}

/// The profile and the curves behind it at the editor's sample wavelengths.
pub fn emissivity_csv(c: &RadiatorView) -> String {
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
pub fn balance_csv(c: &RadiatorView) -> String {
    let mut out = String::new();
    comment_lines(&mut out, "parts of the balance at the surface temperature", c);
    let _ = writeln!(out, "# P_net = emitted - absorbed from the sky - absorbed from the sun - gained from the air");
    let _ = writeln!(out, "term,power_W_m2,contribution_to_net_W_m2");
    let amounts = balance_amounts(c);
    for (m, amount) in RadiatorMetric::PARTS.iter().zip(amounts) {
        let _ = writeln!(out, "{},{},{}", m.label(), csv_num(c.report.metric(*m)), csv_num(amount));
    }
    let _ =
        writeln!(out, "Net cooling power,{},{}", csv_num(c.report.net_w_m2), csv_num(amounts[BALANCE_BARS.len() - 1]));
    out
}

/// The P_net(T) curve with its parts.
pub fn curve_csv(c: &RadiatorView) -> String {
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
