//! The figures of a cell with a real absorber (`physics::silicon`), as the command line and
//! the page show them.
//!
//! Architecture invariant: formatting only; every number comes from the physics result.

use super::{CellReport, A_PER_M2_PER_MA_PER_CM2};
use crate::physics::constants::to_ev;
use crate::physics::silicon::RealCellResult;
use serde::{Deserialize, Serialize};

/// A real-absorber cell: the cell's figures plus its thickness and recombination split.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RealCellReport {
    #[serde(flatten)]
    pub cell: CellReport,
    pub thickness_um: f64,
    /// true when Auger recombination is included (silicon)
    pub auger_limited: bool,
    pub light_trapping: String,
    /// recombination currents at the maximum power point [mA/cm2]
    pub radiative_mpp_ma_cm2: f64,
    pub auger_mpp_ma_cm2: f64,
}

impl RealCellReport {
    /// From the result `r`, the absorptance's half-maximum edge `edge_j` [J] (shown as the
    /// gap), the thickness [um], Auger on or off, the trapping's name, the input [W m^-2].
    pub fn new(r: &RealCellResult, edge_j: f64, thickness_um: f64, auger: bool, trapping: &str, input: f64) -> Self {
        let ma = |j: f64| j / A_PER_M2_PER_MA_PER_CM2;
        let ff = if r.voc > 0.0 && r.jsc > 0.0 { r.vmp * r.jmp / (r.voc * r.jsc) } else { 0.0 };
        RealCellReport {
            cell: CellReport {
                gap_ev: to_ev(edge_j),
                efficiency: r.efficiency,
                jsc_ma_cm2: ma(r.jsc),
                voc_v: r.voc,
                ff,
                vmp_v: r.vmp,
                jmp_ma_cm2: ma(r.jmp),
                pmax_w_m2: r.vmp * r.jmp,
                input_w_m2: input,
            },
            thickness_um,
            auger_limited: auger,
            light_trapping: trapping.to_string(),
            radiative_mpp_ma_cm2: ma(r.j_radiative_mpp),
            auger_mpp_ma_cm2: ma(r.j_auger_mpp),
        }
    }
}

/// One point of a thickness sweep.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ThicknessPoint {
    pub thickness_um: f64,
    pub efficiency: f64,
    pub jsc_ma_cm2: f64,
    pub voc_v: f64,
}

impl ThicknessPoint {
    /// The point of thickness `thickness_um` [um] with result `r`.
    pub fn new(thickness_um: f64, r: &RealCellResult) -> ThicknessPoint {
        ThicknessPoint {
            thickness_um,
            efficiency: r.efficiency,
            jsc_ma_cm2: r.jsc / A_PER_M2_PER_MA_PER_CM2,
            voc_v: r.voc,
        }
    }
}
