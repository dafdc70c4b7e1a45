//! Stack, optimizer, loss, mismatch and measured-cell results in display units (eV, V,
//! mA/cm^2, W/m^2). Field names are the command line's JSON keys; the browser's stack panel
//! shows the same structs.
//!
//! Architecture invariant: a stack's headline figure is named by a [`StackMetric`], never by
//! a string; its hook, label, unit and decimals are written once, here.

use super::{CellReport, A_PER_M2_PER_MA_PER_CM2};
use crate::physics::absorber::AbsorberResult;
use crate::physics::constants::to_ev;
use crate::physics::losses::LossBreakdown;
use crate::physics::mismatch::Mismatch;
use crate::physics::stack::optimize::Optimum;
use crate::physics::stack::StackResult;
use crate::scenario::Connection;
use serde::Serialize;

/// One subcell.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SubcellReport {
    pub gap_ev: f64,
    /// the gap above, which bounds the band this subcell absorbs (none for the top cell)
    pub upper_gap_ev: Option<f64>,
    pub jsc_ma_cm2: f64,
    /// open-circuit voltage of the subcell alone
    pub voc_v: f64,
    /// current and voltage at the stack's operating point
    pub j_ma_cm2: f64,
    pub v_v: f64,
    /// power delivered at the operating point
    pub pmax_w_m2: f64,
    /// photocurrent the subcell cannot deliver in series (0 for independent connection)
    pub excess_jsc_ma_cm2: f64,
}

/// A stack.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StackReport {
    pub connection: Connection,
    /// fraction, 0-1
    pub efficiency: f64,
    /// sum of the subcell open-circuit voltages (the stack's Voc in series)
    pub voc_v: f64,
    /// series: the common current at short circuit; independent: the sum over subcells
    pub jsc_ma_cm2: f64,
    pub pmax_w_m2: f64,
    pub input_w_m2: f64,
    /// series: the subcell with the smallest Jsc, 1 = top; independent: none
    pub limiting_subcell: Option<usize>,
    /// top first
    pub subcells: Vec<SubcellReport>,
    /// the real absorber of the bottom subcell, if it is one
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bottom: Option<BottomReport>,
    /// fraction of each subcell's radiative emission absorbed by the one below (shown when
    /// above 0)
    #[serde(skip_serializing_if = "is_zero")]
    pub luminescent_coupling: f64,
}

fn is_zero(x: &f64) -> bool {
    *x == 0.0
}

/// The real absorber under a stack.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BottomReport {
    pub absorber: String,
    pub thickness_um: f64,
    pub light_trapping: String,
    /// true when Auger recombination is included (silicon)
    pub auger_limited: bool,
}

impl StackReport {
    /// This report with the stack scenario's real bottom cell and luminescent coupling.
    pub fn with_extras(mut self, st: &crate::scenario::stack::StackScenario) -> StackReport {
        self.bottom = st.bottom.as_ref().map(|b| BottomReport {
            absorber: b.material_name(),
            thickness_um: b.thickness_um,
            light_trapping: b.trapping.label().to_string(),
            auger_limited: b.auger_limited(),
        });
        self.luminescent_coupling = st.luminescent_coupling;
        self
    }
}

impl From<&StackResult> for StackReport {
    fn from(r: &StackResult) -> Self {
        let ma = |a: f64| a / A_PER_M2_PER_MA_PER_CM2;
        StackReport {
            connection: r.connection.into(),
            efficiency: r.efficiency,
            voc_v: r.voc,
            jsc_ma_cm2: ma(r.jsc),
            pmax_w_m2: r.pmax,
            input_w_m2: r.input,
            limiting_subcell: r.limiting.map(|i| i + 1),
            subcells: r
                .subcells
                .iter()
                .map(|s| SubcellReport {
                    gap_ev: to_ev(s.gap_j),
                    upper_gap_ev: s.upper_j.is_finite().then(|| to_ev(s.upper_j)),
                    jsc_ma_cm2: ma(s.jsc),
                    voc_v: s.voc,
                    j_ma_cm2: ma(s.j_op),
                    v_v: s.v_op,
                    pmax_w_m2: s.p_op,
                    excess_jsc_ma_cm2: ma(s.excess_jsc),
                })
                .collect(),
            bottom: None,
            luminescent_coupling: 0.0,
        }
    }
}

/// A headline figure of a stack, as the page and the table show it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StackMetric {
    Efficiency,
    Voc,
    Jsc,
    Pmax,
    InputPower,
}

impl StackMetric {
    /// Every figure, in the order of the command line's table.
    pub const ALL: [StackMetric; 5] =
        [StackMetric::Efficiency, StackMetric::Voc, StackMetric::Jsc, StackMetric::Pmax, StackMetric::InputPower];

    /// The figures the stack panel shows at the top, in display order.
    pub const HEADLINE: [StackMetric; 4] =
        [StackMetric::Efficiency, StackMetric::Voc, StackMetric::Jsc, StackMetric::Pmax];

    /// The page's `data-metric` hook.
    pub fn as_str(self) -> &'static str {
        match self {
            StackMetric::Efficiency => "stack-efficiency",
            StackMetric::Voc => "stack-voc",
            StackMetric::Jsc => "stack-jsc",
            StackMetric::Pmax => "stack-pmax",
            StackMetric::InputPower => "stack-input",
        }
    }

    /// The label beside the figure for series connection (the command line's table label);
    /// [`StackReport::label`] gives the one that fits the stack's connection.
    pub fn label(self) -> &'static str {
        match self {
            StackMetric::Efficiency => "Efficiency",
            StackMetric::Voc => "Open-circuit voltage Voc",
            StackMetric::Jsc => "Short-circuit current Jsc",
            StackMetric::Pmax => "Maximum power",
            StackMetric::InputPower => "Incident power",
        }
    }

    /// The display unit.
    pub fn unit(self) -> &'static str {
        match self {
            StackMetric::Efficiency => "%",
            StackMetric::Voc => "V",
            StackMetric::Jsc => "mA/cm²",
            StackMetric::Pmax | StackMetric::InputPower => "W/m²",
        }
    }

    /// Decimal places shown.
    pub fn decimals(self) -> usize {
        match self {
            StackMetric::Efficiency | StackMetric::Pmax => 2,
            StackMetric::Voc => 4,
            StackMetric::Jsc => 3,
            StackMetric::InputPower => 1,
        }
    }
}

impl StackReport {
    /// The value of a headline figure in its display unit (efficiency in %).
    pub fn metric(&self, m: StackMetric) -> f64 {
        match m {
            StackMetric::Efficiency => self.efficiency * 100.0,
            StackMetric::Voc => self.voc_v,
            StackMetric::Jsc => self.jsc_ma_cm2,
            StackMetric::Pmax => self.pmax_w_m2,
            StackMetric::InputPower => self.input_w_m2,
        }
    }

    /// A headline figure as displayed, number and unit, e.g. "45.12 %": what the stack
    /// panel shows and `glowgap stack` / `glowgap eval --stack` print.
    pub fn display(&self, m: StackMetric) -> String {
        let digits = m.decimals();
        format!("{:.digits$} {}", self.metric(m), m.unit())
    }

    /// The label of a headline figure for this stack's connection.
    pub fn label(&self, m: StackMetric) -> &'static str {
        match (m, self.connection) {
            (StackMetric::Jsc, Connection::Independent) => "Sum of subcell Jsc",
            (StackMetric::Voc, Connection::Independent) => "Sum of subcell Voc",
            _ => m.label(),
        }
    }
}

/// The optimizer's answer, with the full stack at the optimum.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OptimumReport {
    pub junctions: usize,
    pub connection: Connection,
    /// top first
    pub gaps_ev: Vec<f64>,
    pub efficiency: f64,
    /// stack evaluations used
    pub evaluations: u64,
    /// the gap held fixed, if any
    pub fixed_ev: Option<f64>,
    pub stack: StackReport,
}

impl OptimumReport {
    /// The report of optimum `o` for stacks wired as `connection` (the scenario's or the
    /// physics value), holding `fixed_ev` [eV] fixed, with `stack` the full stack there.
    pub fn new(
        o: &Optimum,
        connection: impl Into<Connection>,
        fixed_ev: Option<f64>,
        stack: &StackResult,
    ) -> OptimumReport {
        OptimumReport {
            // a real bottom cell is a junction too, without a gap of its own in `gaps_ev`
            junctions: o.gaps_j.len().max(stack.subcells.len()),
            connection: connection.into(),
            gaps_ev: o.gaps_j.iter().map(|&g| to_ev(g)).collect(),
            efficiency: o.efficiency,
            evaluations: o.evaluations,
            fixed_ev,
            stack: StackReport::from(stack),
        }
    }
}

/// The loss breakdown of one cell [W/m^2]; the parts add up to `sum_w_m2` = `input_w_m2`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LossReport {
    pub gap_ev: f64,
    pub input_w_m2: f64,
    pub below_gap_w_m2: f64,
    pub thermalization_w_m2: f64,
    /// carriers lost to emission or recombination, with `nonradiative_w_m2`
    pub emission_w_m2: f64,
    /// of `emission_w_m2`: the extracted carriers' voltage lost to non-radiative
    /// recombination, kTc ln(1/ERE) each (0 at ERE = 1)
    pub nonradiative_w_m2: f64,
    pub carnot_w_m2: f64,
    pub boltzmann_w_m2: f64,
    pub delivered_w_m2: f64,
    pub sum_w_m2: f64,
    /// delivered / input
    pub efficiency: f64,
    /// source temperature of the Carnot factor [K]
    pub source_temp_k: f64,
    /// Omega_emit / Omega_abs of the Boltzmann factor
    pub etendue_ratio: f64,
}

impl From<&LossBreakdown> for LossReport {
    fn from(l: &LossBreakdown) -> Self {
        LossReport {
            gap_ev: to_ev(l.gap_j),
            input_w_m2: l.input,
            below_gap_w_m2: l.below_gap,
            thermalization_w_m2: l.thermalization,
            emission_w_m2: l.emission,
            nonradiative_w_m2: l.nonradiative,
            carnot_w_m2: l.carnot,
            boltzmann_w_m2: l.boltzmann,
            delivered_w_m2: l.delivered,
            sum_w_m2: l.total(),
            efficiency: if l.input > 0.0 { l.delivered / l.input } else { 0.0 },
            source_temp_k: l.source_temp_k,
            etendue_ratio: l.etendue_ratio,
        }
    }
}

impl LossReport {
    /// (label, W/m^2) of the parts in display order, delivered last.
    pub fn parts(&self) -> [(&'static str, f64); 6] {
        [
            ("Below the gap (not absorbed)", self.below_gap_w_m2),
            ("Thermalization", self.thermalization_w_m2),
            ("Emission and recombination", self.emission_w_m2),
            ("Carnot factor", self.carnot_w_m2),
            ("Boltzmann (etendue) factor", self.boltzmann_w_m2),
            ("Delivered", self.delivered_w_m2),
        ]
    }
}

/// A spectral mismatch factor and its four integrals (as short-circuit currents).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MismatchReport {
    pub mismatch_factor: f64,
    pub test_device_test_spectrum_ma_cm2: f64,
    pub test_device_reference_spectrum_ma_cm2: f64,
    pub reference_device_test_spectrum_ma_cm2: f64,
    pub reference_device_reference_spectrum_ma_cm2: f64,
    pub test_spectrum: String,
    pub reference_spectrum: String,
}

impl MismatchReport {
    pub fn new(m: &Mismatch, test_spectrum: String, reference_spectrum: String) -> MismatchReport {
        let ma = |a: f64| a / A_PER_M2_PER_MA_PER_CM2;
        MismatchReport {
            mismatch_factor: m.factor,
            test_device_test_spectrum_ma_cm2: ma(m.test_device_test_spectrum),
            test_device_reference_spectrum_ma_cm2: ma(m.test_device_reference_spectrum),
            reference_device_test_spectrum_ma_cm2: ma(m.reference_device_test_spectrum),
            reference_device_reference_spectrum_ma_cm2: ma(m.reference_device_reference_spectrum),
            test_spectrum,
            reference_spectrum,
        }
    }
}

/// Which absorptance a cell has; its JSON name is the `absorber` key's value.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum AbsorberKind {
    /// the ideal step at the gap
    Step,
    /// an exponential tail below the gap
    Urbach,
    /// a measured EQE table
    Measured,
    /// a real absorber (silicon or an alpha / n,k table)
    Real,
}

impl AbsorberKind {
    /// The kind of an absorber choice of the scenario.
    pub fn of(spec: &crate::scenario::stack::AbsorberSpec) -> AbsorberKind {
        use crate::scenario::stack::AbsorberSpec;
        match spec {
            AbsorberSpec::Step => AbsorberKind::Step,
            AbsorberSpec::Urbach { .. } => AbsorberKind::Urbach,
            AbsorberSpec::Measured(_) => AbsorberKind::Measured,
            AbsorberSpec::Real(_) => AbsorberKind::Real,
        }
    }
}

/// A cell with a measured or modelled absorptance: the usual figures (same keys as
/// [`CellReport`]) and the reciprocity quantities.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AbsorberReport {
    #[serde(flatten)]
    pub cell: CellReport,
    pub absorber: AbsorberKind,
    /// radiative dark current J0_rad (0 once it underflows)
    pub j0_rad_ma_cm2: f64,
    /// log10 of J0_rad in mA/cm^2, which does not underflow
    pub log10_j0_rad_ma_cm2: Option<f64>,
    /// open-circuit voltage in the radiative limit (ERE = 1)
    pub voc_rad_v: f64,
    /// Voc_rad - Voc: the non-radiative loss, (kT/q) ln(1/ERE)
    pub nonrad_voc_loss_v: f64,
    /// a measured Voc, when given, and what it implies
    pub measured_voc_v: Option<f64>,
    pub ere_from_voc: Option<f64>,
    pub measured_nonrad_voc_loss_v: Option<f64>,
}

impl AbsorberReport {
    pub fn new(r: &AbsorberResult, absorber: AbsorberKind) -> AbsorberReport {
        let ln_ma = r.ln_j0 - A_PER_M2_PER_MA_PER_CM2.ln();
        AbsorberReport {
            cell: CellReport::from(&r.cell),
            absorber,
            j0_rad_ma_cm2: r.j0 / A_PER_M2_PER_MA_PER_CM2,
            log10_j0_rad_ma_cm2: ln_ma.is_finite().then(|| ln_ma / std::f64::consts::LN_10),
            voc_rad_v: r.voc_rad,
            nonrad_voc_loss_v: r.nonrad_voc_loss,
            measured_voc_v: None,
            ere_from_voc: None,
            measured_nonrad_voc_loss_v: None,
        }
    }
}
