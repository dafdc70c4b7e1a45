//! A radiator's figures as people read them: W/m², K and fractions, one JSON shape for the
//! command line and scenario evaluation, and the rows of the readable table, so that the
//! command line and the browser can show the same digits.

use crate::physics::radiator::{Evaluation, Steady, STEADY_SEARCH_K};
use serde::{Deserialize, Serialize};

/// One radiator's figures in display units (W/m², K, fractions). Field names are the
/// command line's JSON keys.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RadiatorReport {
    /// P_net at the surface temperature: > 0 cools
    pub net_w_m2: f64,
    pub emitted_w_m2: f64,
    pub sky_absorbed_w_m2: f64,
    pub sun_absorbed_w_m2: f64,
    /// h_c (T_a - T): heat gained from the air
    pub parasitic_w_m2: f64,
    /// where P_net = 0; `None` (JSON null) when there is none in the search range
    pub steady_temp_k: Option<f64>,
    /// "found", "below-range", "above-range" or "undefined"
    pub steady_status: String,
    pub surface_temp_k: f64,
    pub ambient_temp_k: f64,
    /// downwelling flux / (sigma T_a^4)
    pub sky_emissivity: f64,
    /// AM1.5G-weighted, normal incidence
    pub solar_reflectance: f64,
    /// normal, blackbody-weighted at the surface temperature
    pub thermal_emittance: f64,
    /// hemispherical, blackbody-weighted at the surface temperature
    pub hemispherical_emittance: f64,
    /// normal, 8-13 um, blackbody-weighted at the surface temperature
    pub window_emissivity: f64,
}

impl From<&Evaluation> for RadiatorReport {
    fn from(e: &Evaluation) -> Self {
        let p = &e.at_surface;
        RadiatorReport {
            net_w_m2: p.net,
            emitted_w_m2: p.emitted,
            sky_absorbed_w_m2: p.sky_absorbed,
            sun_absorbed_w_m2: p.sun_absorbed,
            parasitic_w_m2: p.parasitic,
            steady_temp_k: e.steady.temperature(),
            steady_status: match e.steady {
                Steady::At(_) => "found",
                Steady::BelowRange(_) => "below-range",
                Steady::AboveRange(_) => "above-range",
                Steady::Undefined => "undefined",
            }
            .to_string(),
            surface_temp_k: p.temp_k,
            ambient_temp_k: e.ambient_k,
            sky_emissivity: e.sky_emissivity,
            solar_reflectance: e.figures.solar_reflectance,
            thermal_emittance: e.figures.thermal_emittance,
            hemispherical_emittance: e.figures.hemispherical_emittance,
            window_emissivity: e.figures.window_emissivity,
        }
    }
}

impl RadiatorReport {
    /// The steady temperature as people read it, e.g. "285.31 K (14.69 K below ambient)" or
    /// the reason there is none.
    pub fn steady_text(&self) -> String {
        match self.steady_temp_k {
            Some(t) => {
                let d = t - self.ambient_temp_k;
                let side = if d < 0.0 { "below" } else { "above" };
                format!("{t:.2} K ({:.2} K {side} ambient)", d.abs())
            }
            None => match self.steady_status.as_str() {
                "below-range" => format!("none in range: still cooling at {} K", STEADY_SEARCH_K.0),
                "above-range" => format!("none in range: still heating at {} K", STEADY_SEARCH_K.1),
                _ => "none: the surface exchanges no heat (emissivity 0, h_c 0)".into(),
            },
        }
    }

    /// The rows of the readable table: (label, value with unit).
    pub fn rows(&self) -> Vec<(String, String)> {
        let t = self.surface_temp_k;
        let w = |v: f64| format!("{v:.2} W/m²");
        vec![
            ("Ambient / surface".into(), format!("{:.2} K / {:.2} K", self.ambient_temp_k, t)),
            ("Sky broadband emissivity".into(), format!("{:.4}", self.sky_emissivity)),
            ("Emitted".into(), w(self.emitted_w_m2)),
            ("Absorbed from the sky".into(), w(self.sky_absorbed_w_m2)),
            ("Absorbed from the sun".into(), w(self.sun_absorbed_w_m2)),
            ("Gained from the air".into(), w(self.parasitic_w_m2)),
            ("Net cooling power".into(), w(self.net_w_m2)),
            ("Steady temperature".into(), self.steady_text()),
            ("Solar reflectance (AM1.5G)".into(), format!("{:.4}", self.solar_reflectance)),
            (format!("Thermal emittance ({t:.0} K)"), format!("{:.4}", self.thermal_emittance)),
            (format!("Hemispherical emittance ({t:.0} K)"), format!("{:.4}", self.hemispherical_emittance)),
            (format!("8-13 um emissivity ({t:.0} K)"), format!("{:.4}", self.window_emissivity)),
        ]
    }
}
