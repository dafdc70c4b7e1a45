//! Results as people read them: the figures in practitioners' units (eV, V, mA/cm^2,
//! W/m^2), one JSON shape shared by the command line and scenario evaluation, and the
//! display formatting that the command line and the browser app both use, so that the two
//! always agree to the digits they show.

use crate::physics::constants::to_ev;
use crate::physics::junction::CellResult;
use serde::{Deserialize, Serialize};

pub mod radiator;
pub mod stack;

/// 1 mA/cm^2 = 10 A/m^2.
pub const A_PER_M2_PER_MA_PER_CM2: f64 = 10.0;

/// One cell's figures in display units. Field names are the command line's JSON keys.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct CellReport {
    pub gap_ev: f64,
    /// fraction, 0-1
    pub efficiency: f64,
    pub jsc_ma_cm2: f64,
    pub voc_v: f64,
    pub ff: f64,
    pub vmp_v: f64,
    pub jmp_ma_cm2: f64,
    pub pmax_w_m2: f64,
    pub input_w_m2: f64,
}

impl From<&CellResult> for CellReport {
    fn from(r: &CellResult) -> Self {
        CellReport {
            gap_ev: to_ev(r.gap_j),
            efficiency: r.efficiency,
            jsc_ma_cm2: r.jsc / A_PER_M2_PER_MA_PER_CM2,
            voc_v: r.voc,
            ff: r.ff,
            vmp_v: r.vmp,
            jmp_ma_cm2: r.jmp / A_PER_M2_PER_MA_PER_CM2,
            pmax_w_m2: r.pmax,
            input_w_m2: r.input,
        }
    }
}

/// The headline figures, in display order: (hook name, label, unit).
pub const CELL_METRICS: [(&str, &str, &str); 7] = [
    ("efficiency", "Efficiency", "%"),
    ("jsc", "Short-circuit current Jsc", "mA/cm²"),
    ("voc", "Open-circuit voltage Voc", "V"),
    ("ff", "Fill factor", ""),
    ("vmp", "Voltage at max power Vmp", "V"),
    ("jmp", "Current at max power Jmp", "mA/cm²"),
    ("input-power", "Incident power", "W/m²"),
];

impl CellReport {
    /// The value of a headline figure in its display unit (efficiency in %).
    pub fn metric(&self, hook: &str) -> f64 {
        match hook {
            "efficiency" => self.efficiency * 100.0,
            "jsc" => self.jsc_ma_cm2,
            "voc" => self.voc_v,
            "ff" => self.ff,
            "vmp" => self.vmp_v,
            "jmp" => self.jmp_ma_cm2,
            "input-power" => self.input_w_m2,
            "pmax" => self.pmax_w_m2,
            _ => f64::NAN,
        }
    }

    /// A headline figure as displayed, number and unit, e.g. "33.68 %".
    pub fn display(&self, hook: &str) -> String {
        let v = self.metric(hook);
        let unit = CELL_METRICS.iter().find(|m| m.0 == hook).map(|m| m.2).unwrap_or("");
        let digits = display_decimals(hook, v);
        if unit.is_empty() {
            format!("{v:.digits$}")
        } else {
            format!("{v:.digits$} {unit}")
        }
    }
}

/// Decimal places shown for each figure: enough to see a 1 meV change of gap.
pub fn display_decimals(hook: &str, v: f64) -> usize {
    match hook {
        "efficiency" => 2,
        "jsc" | "jmp" => {
            if v.abs() < 0.1 {
                5
            } else {
                3
            }
        }
        "voc" | "vmp" => 4,
        "ff" => 4,
        "input-power" => {
            if v.abs() >= 1e5 {
                0
            } else {
                1
            }
        }
        _ => 4,
    }
}
