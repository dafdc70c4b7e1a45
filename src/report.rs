//! Results as people read them: the figures in practitioners' units (eV, V, mA/cm^2,
//! W/m^2), one JSON shape shared by the command line and scenario evaluation, and the
//! display formatting that the command line and the browser app both use, so that the two
//! always agree to the digits they show.

use crate::physics::constants::to_ev;
use crate::physics::junction::CellResult;
use serde::{Deserialize, Serialize};

pub mod blackbody;
pub mod hot;
pub mod radiator;
pub mod real;
pub mod stack;
pub mod sun;

/// `x` with `decimals` decimals, without the minus sign of a value that rounds to zero
/// ("0.0000", never "-0.0000").
pub fn fixed(x: f64, decimals: usize) -> String {
    let text = format!("{x:.decimals$}");
    match text.strip_prefix('-') {
        Some(rest) if rest.bytes().all(|b| b == b'0' || b == b'.') => rest.to_string(),
        _ => text,
    }
}

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

/// A figure of a single cell, as the page and the table show it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CellMetric {
    Efficiency,
    Jsc,
    Voc,
    Ff,
    Vmp,
    Jmp,
    InputPower,
    Pmax,
}

impl CellMetric {
    /// The headline figures, in display order.
    pub const HEADLINE: [CellMetric; 7] = [
        CellMetric::Efficiency,
        CellMetric::Jsc,
        CellMetric::Voc,
        CellMetric::Ff,
        CellMetric::Vmp,
        CellMetric::Jmp,
        CellMetric::InputPower,
    ];

    /// The page's `data-metric` hook.
    pub fn as_str(self) -> &'static str {
        match self {
            CellMetric::Efficiency => "efficiency",
            CellMetric::Jsc => "jsc",
            CellMetric::Voc => "voc",
            CellMetric::Ff => "ff",
            CellMetric::Vmp => "vmp",
            CellMetric::Jmp => "jmp",
            CellMetric::InputPower => "input-power",
            CellMetric::Pmax => "pmax",
        }
    }

    /// The label beside the figure.
    pub fn label(self) -> &'static str {
        match self {
            CellMetric::Efficiency => "Efficiency",
            CellMetric::Jsc => "Short-circuit current Jsc",
            CellMetric::Voc => "Open-circuit voltage Voc",
            CellMetric::Ff => "Fill factor",
            CellMetric::Vmp => "Voltage at max power Vmp",
            CellMetric::Jmp => "Current at max power Jmp",
            CellMetric::InputPower => "Incident power",
            CellMetric::Pmax => "Maximum power",
        }
    }

    /// The display unit ("" for the fill factor).
    pub fn unit(self) -> &'static str {
        match self {
            CellMetric::Efficiency => "%",
            CellMetric::Jsc | CellMetric::Jmp => "mA/cm²",
            CellMetric::Voc | CellMetric::Vmp => "V",
            CellMetric::Ff => "",
            CellMetric::InputPower | CellMetric::Pmax => "W/m²",
        }
    }

    /// Decimal places shown for the value `v`: enough to see a 1 meV change of gap.
    pub fn decimals(self, v: f64) -> usize {
        match self {
            CellMetric::Efficiency => 2,
            CellMetric::Jsc | CellMetric::Jmp => {
                if v.abs() < 0.1 {
                    5
                } else {
                    3
                }
            }
            CellMetric::Voc | CellMetric::Vmp | CellMetric::Ff => 4,
            CellMetric::InputPower => {
                if v.abs() >= 1e5 {
                    0
                } else {
                    1
                }
            }
            CellMetric::Pmax => 4,
        }
    }
}

impl CellReport {
    /// The value of a figure in its display unit (efficiency in %).
    pub fn metric(&self, m: CellMetric) -> f64 {
        match m {
            CellMetric::Efficiency => self.efficiency * 100.0,
            CellMetric::Jsc => self.jsc_ma_cm2,
            CellMetric::Voc => self.voc_v,
            CellMetric::Ff => self.ff,
            CellMetric::Vmp => self.vmp_v,
            CellMetric::Jmp => self.jmp_ma_cm2,
            CellMetric::InputPower => self.input_w_m2,
            CellMetric::Pmax => self.pmax_w_m2,
        }
    }

    /// A figure as displayed, number and unit, e.g. "33.68 %".
    pub fn display(&self, m: CellMetric) -> String {
        let v = self.metric(m);
        let digits = m.decimals(v);
        if m.unit().is_empty() {
            format!("{v:.digits$}")
        } else {
            format!("{v:.digits$} {}", m.unit())
        }
    }
}
