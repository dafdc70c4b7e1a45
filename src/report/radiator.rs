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

/// The radiator's headline figures, in display order: (hook name, label). The page shows
/// them under these `data-metric` hooks; [`RadiatorReport::display`] formats each.
pub const RADIATOR_METRICS: [(&str, &str); 6] = [
    ("net-power", "Net cooling power"),
    ("steady-temp", "Steady temperature"),
    ("solar-reflectance", "Solar reflectance (AM1.5G)"),
    ("thermal-emittance", "Thermal emittance"),
    ("window-emissivity", "8-13 um emissivity"),
    ("sky-emissivity", "Sky broadband emissivity"),
];

/// The terms of the balance, in the order they add up to the net power: (hook, label).
pub const RADIATOR_PARTS: [(&str, &str); 4] = [
    ("emitted", "Emitted"),
    ("sky-absorbed", "Absorbed from the sky"),
    ("sun-absorbed", "Absorbed from the sun"),
    ("parasitic", "Gained from the air"),
];

impl RadiatorReport {
    /// The value of a figure in its display unit (W/m², K or a fraction); NaN for an unknown
    /// hook or a steady temperature that does not exist.
    pub fn metric(&self, hook: &str) -> f64 {
        match hook {
            "net-power" => self.net_w_m2,
            "emitted" => self.emitted_w_m2,
            "sky-absorbed" => self.sky_absorbed_w_m2,
            "sun-absorbed" => self.sun_absorbed_w_m2,
            "parasitic" => self.parasitic_w_m2,
            "steady-temp" => self.steady_temp_k.unwrap_or(f64::NAN),
            "surface-temp" => self.surface_temp_k,
            "ambient-temp" => self.ambient_temp_k,
            "sky-emissivity" => self.sky_emissivity,
            "solar-reflectance" => self.solar_reflectance,
            "thermal-emittance" => self.thermal_emittance,
            "hemispherical-emittance" => self.hemispherical_emittance,
            "window-emissivity" => self.window_emissivity,
            _ => f64::NAN,
        }
    }

    /// A figure as displayed, number and unit: powers "140.57 W/m²", temperatures
    /// "262.36 K", fractions "0.9500"; a missing steady temperature reads "none" or
    /// "none in range" (see [`RadiatorReport::steady_note`] for why).
    pub fn display(&self, hook: &str) -> String {
        match hook {
            "net-power" | "emitted" | "sky-absorbed" | "sun-absorbed" | "parasitic" => {
                format!("{:.2} W/m²", self.metric(hook))
            }
            "steady-temp" => match self.steady_temp_k {
                Some(t) => format!("{t:.2} K"),
                None if self.steady_status == "undefined" => "none".into(),
                None => "none in range".into(),
            },
            "surface-temp" | "ambient-temp" => format!("{:.2} K", self.metric(hook)),
            _ => format!("{:.4}", self.metric(hook)),
        }
    }

    /// What qualifies the steady temperature: how far it lies from ambient, e.g. "14.69 K
    /// below ambient", or why there is none.
    pub fn steady_note(&self) -> String {
        match self.steady_temp_k {
            Some(t) => {
                let d = t - self.ambient_temp_k;
                let side = if d < 0.0 { "below" } else { "above" };
                format!("{:.2} K {side} ambient", d.abs())
            }
            None => match self.steady_status.as_str() {
                "below-range" => format!("still cooling at {} K", STEADY_SEARCH_K.0),
                "above-range" => format!("still heating at {} K", STEADY_SEARCH_K.1),
                _ => "the surface exchanges no heat (emissivity 0, h_c 0)".into(),
            },
        }
    }

    /// The steady temperature as people read it, e.g. "285.31 K (14.69 K below ambient)" or
    /// the reason there is none.
    pub fn steady_text(&self) -> String {
        match self.steady_temp_k {
            Some(_) => format!("{} ({})", self.display("steady-temp"), self.steady_note()),
            None => format!("{}: {}", self.display("steady-temp"), self.steady_note()),
        }
    }

    /// The rows of the readable table: (label, value with unit).
    pub fn rows(&self) -> Vec<(String, String)> {
        let t = self.surface_temp_k;
        vec![
            (
                "Ambient / surface".into(),
                format!("{} / {}", self.display("ambient-temp"), self.display("surface-temp")),
            ),
            ("Sky broadband emissivity".into(), self.display("sky-emissivity")),
            ("Emitted".into(), self.display("emitted")),
            ("Absorbed from the sky".into(), self.display("sky-absorbed")),
            ("Absorbed from the sun".into(), self.display("sun-absorbed")),
            ("Gained from the air".into(), self.display("parasitic")),
            ("Net cooling power".into(), self.display("net-power")),
            ("Steady temperature".into(), self.steady_text()),
            ("Solar reflectance (AM1.5G)".into(), self.display("solar-reflectance")),
            (format!("Thermal emittance ({t:.0} K)"), self.display("thermal-emittance")),
            (format!("Hemispherical emittance ({t:.0} K)"), self.display("hemispherical-emittance")),
            (format!("8-13 um emissivity ({t:.0} K)"), self.display("window-emissivity")),
        ]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn report(steady: Option<f64>, status: &str) -> RadiatorReport {
        RadiatorReport {
            net_w_m2: 140.567,
            emitted_w_m2: 459.3,
            sky_absorbed_w_m2: 318.733,
            sun_absorbed_w_m2: 0.0,
            parasitic_w_m2: -0.004,
            steady_temp_k: steady,
            steady_status: status.into(),
            surface_temp_k: 300.0,
            ambient_temp_k: 300.0,
            sky_emissivity: 0.67781,
            solar_reflectance: 0.0,
            thermal_emittance: 1.0,
            hemispherical_emittance: 1.0,
            window_emissivity: 0.99995,
        }
    }

    #[test]
    fn the_page_figures_are_the_table_rows() {
        let r = report(Some(262.3604), "found");
        assert_eq!(r.display("net-power"), "140.57 W/m²");
        assert_eq!(r.display("steady-temp"), "262.36 K");
        assert_eq!(r.display("solar-reflectance"), "0.0000");
        assert_eq!(r.display("window-emissivity"), "1.0000");
        assert_eq!(r.steady_text(), "262.36 K (37.64 K below ambient)");
        let rows = r.rows();
        let row = |label: &str| rows.iter().find(|(l, _)| l == label).map(|(_, v)| v.clone()).unwrap();
        assert_eq!(row("Net cooling power"), r.display("net-power"));
        assert_eq!(row("Thermal emittance (300 K)"), r.display("thermal-emittance"));
        assert_eq!(row("Ambient / surface"), "300.00 K / 300.00 K");
        for (hook, _) in RADIATOR_METRICS.iter().chain(RADIATOR_PARTS.iter()) {
            assert!(!r.display(hook).contains("NaN"), "{hook}");
        }
    }

    #[test]
    fn a_missing_steady_temperature_says_why() {
        let r = report(None, "below-range");
        assert_eq!(r.display("steady-temp"), "none in range");
        assert_eq!(r.steady_text(), format!("none in range: still cooling at {} K", STEADY_SEARCH_K.0));
        let r = report(None, "undefined");
        assert_eq!(r.steady_text(), "none: the surface exchanges no heat (emissivity 0, h_c 0)");
    }
}
