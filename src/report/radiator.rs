//! A radiator's figures as people read them: W/m², K and fractions, one JSON shape for the
//! command line and scenario evaluation, and the rows of the readable table, so that the
//! command line and the browser can show the same digits.

use crate::physics::radiator::{Evaluation, Steady, STEADY_SEARCH_K};
use crate::report::fixed;
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
    /// whether the steady temperature was found, and if not, why
    pub steady_status: SteadyStatus,
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
            steady_status: SteadyStatus::from(&e.steady),
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

/// Whether a steady temperature exists in the search range [`STEADY_SEARCH_K`]. The serde
/// names are the `steady_status` values of `glowgap cool --json`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum SteadyStatus {
    /// P_net = 0 at a temperature in the range
    #[serde(rename = "found")]
    Found,
    /// the surface still cools at the lower end of the range
    #[serde(rename = "below-range")]
    BelowRange,
    /// the surface still heats at the upper end of the range
    #[serde(rename = "above-range")]
    AboveRange,
    /// the surface exchanges no heat at all (emissivity 0 and h_c 0)
    #[serde(rename = "undefined")]
    Undefined,
}

impl SteadyStatus {
    /// The name in the command line's JSON.
    pub fn as_str(self) -> &'static str {
        match self {
            SteadyStatus::Found => "found",
            SteadyStatus::BelowRange => "below-range",
            SteadyStatus::AboveRange => "above-range",
            SteadyStatus::Undefined => "undefined",
        }
    }
}

impl From<&Steady> for SteadyStatus {
    fn from(s: &Steady) -> Self {
        match s {
            Steady::At(_) => SteadyStatus::Found,
            Steady::BelowRange(_) => SteadyStatus::BelowRange,
            Steady::AboveRange(_) => SteadyStatus::AboveRange,
            Steady::Undefined => SteadyStatus::Undefined,
        }
    }
}

/// A figure of the radiator's balance, as the page and the table show it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RadiatorMetric {
    NetPower,
    Emitted,
    SkyAbsorbed,
    SunAbsorbed,
    Parasitic,
    SteadyTemp,
    SurfaceTemp,
    AmbientTemp,
    SkyEmissivity,
    SolarReflectance,
    ThermalEmittance,
    HemisphericalEmittance,
    WindowEmissivity,
}

impl RadiatorMetric {
    /// The headline figures, in display order.
    pub const HEADLINE: [RadiatorMetric; 6] = [
        RadiatorMetric::NetPower,
        RadiatorMetric::SteadyTemp,
        RadiatorMetric::SolarReflectance,
        RadiatorMetric::ThermalEmittance,
        RadiatorMetric::WindowEmissivity,
        RadiatorMetric::SkyEmissivity,
    ];

    /// The terms of the balance, in the order they add up to the net power.
    pub const PARTS: [RadiatorMetric; 4] =
        [RadiatorMetric::Emitted, RadiatorMetric::SkyAbsorbed, RadiatorMetric::SunAbsorbed, RadiatorMetric::Parasitic];

    /// The page's `data-metric` hook.
    pub fn as_str(self) -> &'static str {
        match self {
            RadiatorMetric::NetPower => "net-power",
            RadiatorMetric::Emitted => "emitted",
            RadiatorMetric::SkyAbsorbed => "sky-absorbed",
            RadiatorMetric::SunAbsorbed => "sun-absorbed",
            RadiatorMetric::Parasitic => "parasitic",
            RadiatorMetric::SteadyTemp => "steady-temp",
            RadiatorMetric::SurfaceTemp => "surface-temp",
            RadiatorMetric::AmbientTemp => "ambient-temp",
            RadiatorMetric::SkyEmissivity => "sky-emissivity",
            RadiatorMetric::SolarReflectance => "solar-reflectance",
            RadiatorMetric::ThermalEmittance => "thermal-emittance",
            RadiatorMetric::HemisphericalEmittance => "hemispherical-emittance",
            RadiatorMetric::WindowEmissivity => "window-emissivity",
        }
    }

    /// The label beside the figure.
    pub fn label(self) -> &'static str {
        match self {
            RadiatorMetric::NetPower => "Net cooling power",
            RadiatorMetric::Emitted => "Emitted",
            RadiatorMetric::SkyAbsorbed => "Absorbed from the sky",
            RadiatorMetric::SunAbsorbed => "Absorbed from the sun",
            RadiatorMetric::Parasitic => "Gained from the air",
            RadiatorMetric::SteadyTemp => "Steady temperature",
            RadiatorMetric::SurfaceTemp => "Surface temperature",
            RadiatorMetric::AmbientTemp => "Ambient temperature",
            RadiatorMetric::SkyEmissivity => "Sky broadband emissivity",
            RadiatorMetric::SolarReflectance => "Solar reflectance (AM1.5G)",
            RadiatorMetric::ThermalEmittance => "Thermal emittance",
            RadiatorMetric::HemisphericalEmittance => "Hemispherical emittance",
            RadiatorMetric::WindowEmissivity => "8-13 um emissivity",
        }
    }
}

impl RadiatorReport {
    /// The value of a figure in its display unit (W/m², K or a fraction); NaN for a steady
    /// temperature that does not exist.
    pub fn metric(&self, m: RadiatorMetric) -> f64 {
        match m {
            RadiatorMetric::NetPower => self.net_w_m2,
            RadiatorMetric::Emitted => self.emitted_w_m2,
            RadiatorMetric::SkyAbsorbed => self.sky_absorbed_w_m2,
            RadiatorMetric::SunAbsorbed => self.sun_absorbed_w_m2,
            RadiatorMetric::Parasitic => self.parasitic_w_m2,
            RadiatorMetric::SteadyTemp => self.steady_temp_k.unwrap_or(f64::NAN),
            RadiatorMetric::SurfaceTemp => self.surface_temp_k,
            RadiatorMetric::AmbientTemp => self.ambient_temp_k,
            RadiatorMetric::SkyEmissivity => self.sky_emissivity,
            RadiatorMetric::SolarReflectance => self.solar_reflectance,
            RadiatorMetric::ThermalEmittance => self.thermal_emittance,
            RadiatorMetric::HemisphericalEmittance => self.hemispherical_emittance,
            RadiatorMetric::WindowEmissivity => self.window_emissivity,
        }
    }

    /// A figure as displayed, number and unit: powers "140.57 W/m²", temperatures
    /// "262.36 K", fractions "0.9500"; a missing steady temperature reads "none" or
    /// "none in range" (see [`RadiatorReport::steady_note`] for why).
    pub fn display(&self, m: RadiatorMetric) -> String {
        use RadiatorMetric as M;
        match m {
            M::NetPower | M::Emitted | M::SkyAbsorbed | M::SunAbsorbed | M::Parasitic => {
                format!("{} W/m²", fixed(self.metric(m), 2))
            }
            M::SteadyTemp => match self.steady_temp_k {
                Some(t) => format!("{} K", fixed(t, 2)),
                None if self.steady_status == SteadyStatus::Undefined => "none".into(),
                None => "none in range".into(),
            },
            M::SurfaceTemp | M::AmbientTemp => format!("{} K", fixed(self.metric(m), 2)),
            _ => fixed(self.metric(m), 4),
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
            None => match self.steady_status {
                SteadyStatus::BelowRange => format!("still cooling at {} K", STEADY_SEARCH_K.0),
                SteadyStatus::AboveRange => format!("still heating at {} K", STEADY_SEARCH_K.1),
                SteadyStatus::Found | SteadyStatus::Undefined => {
                    "the surface exchanges no heat (emissivity 0, h_c 0)".into()
                }
            },
        }
    }

    /// The steady temperature as people read it, e.g. "285.31 K (14.69 K below ambient)" or
    /// the reason there is none.
    pub fn steady_text(&self) -> String {
        match self.steady_temp_k {
            Some(_) => format!("{} ({})", self.display(RadiatorMetric::SteadyTemp), self.steady_note()),
            None => format!("{}: {}", self.display(RadiatorMetric::SteadyTemp), self.steady_note()),
        }
    }

    /// The rows of the readable table: (label, value with unit).
    pub fn rows(&self) -> Vec<(String, String)> {
        let t = self.surface_temp_k;
        vec![
            (
                "Ambient / surface".into(),
                format!(
                    "{} / {}",
                    self.display(RadiatorMetric::AmbientTemp),
                    self.display(RadiatorMetric::SurfaceTemp)
                ),
            ),
            ("Sky broadband emissivity".into(), self.display(RadiatorMetric::SkyEmissivity)),
            ("Emitted".into(), self.display(RadiatorMetric::Emitted)),
            ("Absorbed from the sky".into(), self.display(RadiatorMetric::SkyAbsorbed)),
            ("Absorbed from the sun".into(), self.display(RadiatorMetric::SunAbsorbed)),
            ("Gained from the air".into(), self.display(RadiatorMetric::Parasitic)),
            ("Net cooling power".into(), self.display(RadiatorMetric::NetPower)),
            ("Steady temperature".into(), self.steady_text()),
            ("Solar reflectance (AM1.5G)".into(), self.display(RadiatorMetric::SolarReflectance)),
            (format!("Thermal emittance ({t:.0} K)"), self.display(RadiatorMetric::ThermalEmittance)),
            (format!("Hemispherical emittance ({t:.0} K)"), self.display(RadiatorMetric::HemisphericalEmittance)),
            (format!("8-13 um emissivity ({t:.0} K)"), self.display(RadiatorMetric::WindowEmissivity)),
        ]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn report(steady: Option<f64>, status: SteadyStatus) -> RadiatorReport {
        RadiatorReport {
            net_w_m2: 140.567,
            emitted_w_m2: 459.3,
            sky_absorbed_w_m2: 318.733,
            sun_absorbed_w_m2: 0.0,
            parasitic_w_m2: -0.004,
            steady_temp_k: steady,
            steady_status: status,
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
        let r = report(Some(262.3604), SteadyStatus::Found);
        assert_eq!(r.display(RadiatorMetric::NetPower), "140.57 W/m²");
        assert_eq!(r.display(RadiatorMetric::SteadyTemp), "262.36 K");
        assert_eq!(r.display(RadiatorMetric::SolarReflectance), "0.0000");
        assert_eq!(r.display(RadiatorMetric::WindowEmissivity), "1.0000");
        assert_eq!(r.steady_text(), "262.36 K (37.64 K below ambient)");
        let rows = r.rows();
        let row = |label: &str| rows.iter().find(|(l, _)| l == label).map(|(_, v)| v.clone()).unwrap();
        assert_eq!(row("Net cooling power"), r.display(RadiatorMetric::NetPower));
        assert_eq!(row("Thermal emittance (300 K)"), r.display(RadiatorMetric::ThermalEmittance));
        assert_eq!(row("Ambient / surface"), "300.00 K / 300.00 K");
        for m in RadiatorMetric::HEADLINE.iter().chain(RadiatorMetric::PARTS.iter()) {
            assert!(!r.display(*m).contains("NaN"), "{m:?}");
        }
    }

    #[test]
    fn a_missing_steady_temperature_says_why() {
        let r = report(None, SteadyStatus::BelowRange);
        assert_eq!(r.display(RadiatorMetric::SteadyTemp), "none in range");
        assert_eq!(r.steady_text(), format!("none in range: still cooling at {} K", STEADY_SEARCH_K.0));
        let r = report(None, SteadyStatus::Undefined);
        assert_eq!(r.steady_text(), "none: the surface exchanges no heat (emissivity 0, h_c 0)");
    }

    #[test]
    fn steady_status_keeps_its_json_names() {
        for s in [SteadyStatus::Found, SteadyStatus::BelowRange, SteadyStatus::AboveRange, SteadyStatus::Undefined] {
            let json = serde_json::to_string(&s).unwrap();
            assert_eq!(json, format!("\"{}\"", s.as_str()));
            assert_eq!(serde_json::from_str::<SteadyStatus>(&json).unwrap(), s);
        }
    }
}
