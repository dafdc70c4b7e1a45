//! The hot-emitter panel's figures in display units (W/cm2, A/cm2, V, um, K): the JSON of
//! `glowgap tpv` and `glowgap absorber`, and the rows of their tables, shared by the command
//! line and the page.
//!
//! Architecture invariant: numbers come from `physics::tpv` and `physics::solar_thermal`;
//! this module only converts units, names the keys and writes the row texts.

use crate::physics::constants::{ev, to_ev, HC};
use crate::physics::solar_thermal::{Absorber, AbsorberSetup, BestStep, Surface, ThermalBalance};
use crate::physics::special::golden_max;
use crate::physics::stack::Connection;
use crate::physics::tpv::{SweepPoint, Tpv, TpvResult};
use serde::Serialize;

/// W/m2 (or A/m2) in W/cm2 (A/cm2).
const PER_CM2: f64 = 1e-4;

/// One subcell of a TPV cell at the stack's maximum power point.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TpvSubcellReport {
    pub gap_ev: f64,
    pub jsc_a_cm2: f64,
    pub voc_v: f64,
    pub vmp_v: f64,
}

/// A TPV pair at its maximum power point. Field names are the command line's JSON keys.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TpvReport {
    /// P / heat_in at the maximum power point (fraction)
    pub efficiency: f64,
    pub pmax_w_cm2: f64,
    /// net heat drawn from the emitter
    pub heat_in_w_cm2: f64,
    /// the part of heat_in below the (bottom) gap
    pub subgap_heat_w_cm2: f64,
    pub jsc_a_cm2: f64,
    pub voc_v: f64,
    /// None (null) when the subcells are independent
    pub vmp_v: Option<f64>,
    /// the efficiency at its own optimum voltage (fraction)
    pub max_efficiency: f64,
    /// the Carnot bound 1 - Tc/Te (fraction)
    pub carnot_efficiency: f64,
    pub subcells: Vec<TpvSubcellReport>,
}

impl TpvReport {
    pub fn new(r: &TpvResult) -> TpvReport {
        TpvReport {
            efficiency: r.efficiency,
            pmax_w_cm2: r.pmax * PER_CM2,
            heat_in_w_cm2: r.heat_in * PER_CM2,
            subgap_heat_w_cm2: r.subgap_heat * PER_CM2,
            jsc_a_cm2: r.jsc * PER_CM2,
            voc_v: r.voc,
            vmp_v: r.vmp,
            max_efficiency: r.max_efficiency,
            carnot_efficiency: r.carnot,
            subcells: r
                .subcells
                .iter()
                .map(|s| TpvSubcellReport {
                    gap_ev: to_ev(s.gap_j),
                    jsc_a_cm2: s.jsc * PER_CM2,
                    voc_v: s.voc,
                    vmp_v: s.vmp,
                })
                .collect(),
        }
    }

    /// (label, value with unit) rows for tables and the page's figures.
    pub fn rows(&self) -> Vec<(&'static str, String)> {
        let mut rows = vec![
            ("Efficiency (P / heat in)", format!("{:.2} %", self.efficiency * 100.0)),
            ("Electric power density", format!("{:.4} W/cm2", self.pmax_w_cm2)),
            ("Heat drawn from the emitter", format!("{:.4} W/cm2", self.heat_in_w_cm2)),
            ("  of which below the gap", format!("{:.4} W/cm2", self.subgap_heat_w_cm2)),
            ("Jsc", format!("{:.4} A/cm2", self.jsc_a_cm2)),
            ("Voc", format!("{:.4} V", self.voc_v)),
        ];
        rows.push(("Vmp", self.vmp_v.map_or("- (independent subcells)".into(), |v| format!("{v:.4} V"))));
        rows.push(("Efficiency at its own optimum", format!("{:.2} %", self.max_efficiency * 100.0)));
        rows.push(("Carnot bound 1 - Tc/Te", format!("{:.2} %", self.carnot_efficiency * 100.0)));
        rows
    }
}

/// One gap of the efficiency-power trade-off.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TradeoffPoint {
    pub gap_ev: f64,
    pub efficiency: f64,
    pub pmax_w_cm2: f64,
}

impl TradeoffPoint {
    fn of(p: &SweepPoint) -> TradeoffPoint {
        TradeoffPoint { gap_ev: to_ev(p.gap_j), efficiency: p.efficiency, pmax_w_cm2: p.pmax * PER_CM2 }
    }
}

/// The efficiency-power trade-off over band gap: `glowgap tpv --sweep` and the page's plot.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TradeoffReport {
    pub points: Vec<TradeoffPoint>,
    /// the gap of the highest efficiency (refined between the grid's neighbours)
    pub best_efficiency: TradeoffPoint,
    /// the gap of the highest power density (refined likewise)
    pub best_power: TradeoffPoint,
}

impl TradeoffReport {
    /// Single junctions at each of `gaps_ev` [eV]; both optima refined by golden section
    /// between the best grid point's neighbours to 1e-7 eV.
    pub fn new(tpv: &Tpv, gaps_ev: &[f64]) -> TradeoffReport {
        let gaps_j: Vec<f64> = gaps_ev.iter().map(|&g| ev(g)).collect();
        let sweep = tpv.sweep(&gaps_j);
        let points: Vec<TradeoffPoint> = sweep.iter().map(TradeoffPoint::of).collect();
        let refine = |score: fn(&SweepPoint) -> f64| -> TradeoffPoint {
            let Some(i) = (0..sweep.len()).max_by(|&a, &b| score(&sweep[a]).total_cmp(&score(&sweep[b]))) else {
                return TradeoffPoint { gap_ev: 0.0, efficiency: 0.0, pmax_w_cm2: 0.0 };
            };
            if sweep.len() < 3 {
                return points[i];
            }
            let lo = sweep[i.saturating_sub(1)].gap_j;
            let hi = sweep[(i + 1).min(sweep.len() - 1)].gap_j;
            let one = |g: f64| tpv.sweep(&[g])[0];
            let (_, p) = golden_max(one, score, lo, hi, ev(1e-7));
            let best = if score(&p) >= score(&sweep[i]) { p } else { sweep[i] };
            TradeoffPoint::of(&best)
        };
        let best_efficiency = refine(|p| p.efficiency);
        let best_power = refine(|p| p.pmax);
        TradeoffReport { points, best_efficiency, best_power }
    }
}

/// A solar-thermal absorber's balance. Field names are the command line's JSON keys.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AbsorberReport {
    pub temp_k: f64,
    /// C times the source's irradiance
    pub incident_w_m2: f64,
    /// sun and ambient absorbed
    pub absorbed_w_m2: f64,
    pub emitted_w_m2: f64,
    pub convection_w_m2: f64,
    /// (absorbed - emitted - convection) / incident (fraction; negative above stagnation)
    pub thermal_efficiency: f64,
    /// 1 - Ta / T
    pub carnot_factor: f64,
    /// thermal efficiency x Carnot factor
    pub work_efficiency: f64,
    /// where absorbed = emitted + convection; null when above 1e7 K
    pub stagnation_temp_k: Option<f64>,
    /// with --best: the best temperature [K]
    #[serde(skip_serializing_if = "Option::is_none")]
    pub best_temp_k: Option<f64>,
    /// with --best: the best step's cutoff [um], null when black is best
    #[serde(skip_serializing_if = "Option::is_none")]
    pub best_cutoff_um: Option<Option<f64>>,
}

impl AbsorberReport {
    /// The balance of `surface` under `setup` at `temp_k` [K].
    pub fn at(setup: &AbsorberSetup, surface: &Surface, temp_k: f64) -> AbsorberReport {
        let a = Absorber::new(setup, surface);
        Self::of(temp_k, &a.balance(temp_k), a.stagnation())
    }

    /// The best step absorber (or black) at its best temperature.
    pub fn best(setup: &AbsorberSetup) -> (AbsorberReport, BestStep) {
        let best = crate::physics::solar_thermal::best_cutoff(setup);
        let surface = match best.cutoff_m {
            Some(c) => Surface::Step { cutoff_m: c },
            None => Surface::Black,
        };
        let mut r = Self::at(setup, &surface, best.temp_k);
        r.best_temp_k = Some(best.temp_k);
        r.best_cutoff_um = Some(best.cutoff_m.map(|c| c * 1e6));
        (r, best)
    }

    fn of(temp_k: f64, b: &ThermalBalance, stagnation: Option<f64>) -> AbsorberReport {
        AbsorberReport {
            temp_k,
            incident_w_m2: b.incident,
            absorbed_w_m2: b.absorbed,
            emitted_w_m2: b.emitted,
            convection_w_m2: b.convection,
            thermal_efficiency: b.thermal_efficiency,
            carnot_factor: b.carnot_factor,
            work_efficiency: b.work_efficiency,
            stagnation_temp_k: stagnation,
            best_temp_k: None,
            best_cutoff_um: None,
        }
    }

    /// (label, value with unit) rows for tables and the page's figures.
    pub fn rows(&self) -> Vec<(&'static str, String)> {
        let mut rows = Vec::new();
        if let Some(Some(c)) = self.best_cutoff_um {
            rows.push(("Best cutoff", format!("{c:.4} um ({:.4} eV)", to_ev(HC / (c * 1e-6)))));
        } else if let Some(None) = self.best_cutoff_um {
            rows.push(("Best cutoff", "none: black is best".into()));
        }
        rows.extend([
            ("Absorber temperature", format!("{:.1} K", self.temp_k)),
            ("Incident", format!("{:.1} W/m2", self.incident_w_m2)),
            ("Absorbed (sun and ambient)", format!("{:.1} W/m2", self.absorbed_w_m2)),
            ("Emitted", format!("{:.1} W/m2", self.emitted_w_m2)),
            ("Convection", format!("{:.1} W/m2", self.convection_w_m2)),
            ("Thermal efficiency", format!("{:.2} %", self.thermal_efficiency * 100.0)),
            ("Carnot factor 1 - Ta/T", format!("{:.2} %", self.carnot_factor * 100.0)),
            ("Work efficiency", format!("{:.2} %", self.work_efficiency * 100.0)),
        ]);
        rows.push((
            "Stagnation temperature",
            self.stagnation_temp_k.map_or("above 1e7 K".into(), |t| format!("{t:.1} K")),
        ));
        rows
    }
}

/// The connection's words for tables.
pub fn connection_words(c: Connection) -> &'static str {
    match c {
        Connection::Series => "series",
        Connection::Independent => "independent",
    }
}
