//! Where the incident power goes in a single-junction cell at its maximum power point, after
//! the loss analysis of Hirst & Ekins-Daukes, Prog. Photovolt. 19, 286 (2011): photons
//! below the gap, thermalization, emission, the Carnot factor, the Boltzmann (etendue)
//! factor, and the power delivered. The six parts add up to the incident power exactly
//! (to rounding).
//!
//! With Phi_abs = Jsc/q the absorbed photon flux, Phi_mp = Jmp/q the extracted carrier flux,
//! Ts the source temperature, Tc the cell temperature, Omega_abs = X pi f the solid angle the
//! concentrated sun fills (f = (R_sun/au)^2) and Omega_emit = g pi the cell's emission
//! (g faces into hemispheres):
//!
//! * below gap        P_in - P(E > Eg)                       (not absorbed)
//! * emission         Eg (Phi_abs - Phi_mp)                  (absorbed but re-emitted or,
//!   for ERE < 1, recombined: carriers lost to the current, valued at the band edge)
//!   plus Phi_mp kTc ln(1/ERE)                               (the voltage every extracted
//!   carrier loses to non-radiative recombination, Ross, J. Chem. Phys. 46, 4590 (1967);
//!   zero at ERE = 1, and reported on its own as `nonradiative`)
//! * Carnot           Phi_mp Eg Tc/Ts                        (H&ED 2011: the free energy of a
//!   carrier is at most Eg (1 - Tc/Ts))
//! * Boltzmann        Phi_mp kTc ln(Omega_emit/Omega_abs)    (H&ED 2011: the entropy of the
//!   beam's expansion from the sun's solid angle to that of the emission)
//! * delivered        Jmp Vmp
//! * thermalization   the rest: P(E > Eg) - Eg Phi_abs, the photons' energy above the gap,
//!   plus Phi_mp [Eg (1 - Tc/Ts) - kTc ln(Omega_emit/Omega_abs) - kTc ln(1/ERE) - qVmp], the
//!   difference between the free energy per carrier that the Carnot, Boltzmann and
//!   non-radiative factors leave and qVmp. H&ED 2011 show that free energy per carrier is also limited by carrier
//!   thermalisation, and that a band (rather than a level) absorber gains some back as
//!   carriers cool; this term, a few meV per carrier, carries both and the cost of drawing
//!   current at the maximum power point.
//!
//! For tabulated sunlight (the G173 columns, user tables) Ts is the Sun's effective
//! temperature, 5772 K (IAU 2015 nominal), and Omega_abs that of the solar disc; for a
//! blackbody sun, its temperature.

use super::constants::{thermal_energy, CHARGE, SUN_DILUTION, SUN_EFFECTIVE_TEMPERATURE};
use super::junction::{solve_cell, sweep, Cell, CellResult, Illumination};
use super::sources::Source;

/// The loss parts of one cell [W m^-2]; they add up to `input`.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct LossBreakdown {
    /// band gap [J]
    pub gap_j: f64,
    /// incident power [W m^-2]
    pub input: f64,
    pub below_gap: f64,
    pub thermalization: f64,
    /// carriers lost to emission or recombination, valued at the gap, and the non-radiative
    /// voltage loss of the extracted carriers (`nonradiative`, included here)
    pub emission: f64,
    /// Phi_mp kTc ln(1/ERE): the part of `emission` that is the extracted carriers' voltage
    /// lost to non-radiative recombination (0 at ERE = 1)
    pub nonradiative: f64,
    pub carnot: f64,
    pub boltzmann: f64,
    pub delivered: f64,
    /// source temperature used in the Carnot factor [K]
    pub source_temp_k: f64,
    /// Omega_emit / Omega_abs (dimensionless)
    pub etendue_ratio: f64,
}

impl LossBreakdown {
    /// Sum of the five losses and the delivered power [W m^-2].
    pub fn total(&self) -> f64 {
        self.below_gap + self.thermalization + self.emission + self.carnot + self.boltzmann + self.delivered
    }
}

/// The temperature of the light source for the Carnot factor [K].
pub fn source_temperature(source: &Source) -> f64 {
    match source {
        Source::BlackbodySun { temp_k } => *temp_k,
        Source::Table { .. } => SUN_EFFECTIVE_TEMPERATURE,
    }
}

/// The breakdown for a solved cell `r` (from `solve_cell` for `cell` under `light`).
#[allow(clippy::neg_cmp_op_on_partial_ord, clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn breakdown_of(light: &Illumination, cell: &Cell, r: &CellResult) -> LossBreakdown {
    let input = light.input_power();
    let ts = source_temperature(&light.source);
    let etendue_ratio = cell.emission.faces() / (light.concentration * SUN_DILUTION);
    let mut out = LossBreakdown { gap_j: cell.gap_j, input, source_temp_k: ts, etendue_ratio, ..Default::default() };
    if !(input > 0.0 && cell.gap_j > 0.0 && cell.gap_j.is_finite() && cell.temp_k > 0.0) {
        out.below_gap = input.max(0.0);
        return out;
    }
    let eg = cell.gap_j;
    let above = light.concentration * light.source.power_above(eg);
    let phi_abs = r.jsc / CHARGE;
    let phi_mp = r.jmp / CHARGE;
    // per extracted carrier [J]: Eg Tc/Ts and kTc ln(Omega_emit/Omega_abs) (H&ED 2011)
    let carnot_per = eg * cell.temp_k / ts;
    let boltzmann_per = thermal_energy(cell.temp_k) * etendue_ratio.ln();
    // ERE in (0, 1] (the scenario's range); ln(1/ERE) >= 0
    let nonradiative_per =
        if cell.ere > 0.0 && cell.ere < 1.0 { -thermal_energy(cell.temp_k) * cell.ere.ln() } else { 0.0 };
    let residual_per = eg - carnot_per - boltzmann_per - nonradiative_per - CHARGE * r.vmp;
    out.below_gap = input - above;
    out.nonradiative = phi_mp * nonradiative_per;
    out.emission = eg * (phi_abs - phi_mp) + out.nonradiative;
    out.carnot = phi_mp * carnot_per;
    out.boltzmann = phi_mp * boltzmann_per;
    out.delivered = r.pmax;
    out.thermalization = (above - eg * phi_abs) + phi_mp * residual_per;
    out
}

/// The loss breakdown of a step cell `cell` under `light` at its maximum power point.
pub fn loss_breakdown(light: &Illumination, cell: &Cell) -> LossBreakdown {
    breakdown_of(light, cell, &solve_cell(light, cell))
}

/// The breakdown at every gap of `gaps_j` [J], cells like `template`.
pub fn loss_sweep(light: &Illumination, template: &Cell, gaps_j: &[f64]) -> Vec<LossBreakdown> {
    sweep(light, template, gaps_j)
        .iter()
        .zip(gaps_j)
        .map(|(r, &g)| breakdown_of(light, &Cell { gap_j: g, ..*template }, r))
        .collect()
}
