//! The stack panel's part of the scenario: a multi-junction stack (gaps and connection), the
//! optimizer's and the tandem map's settings, the single cell's absorptance (step, Urbach
//! tail or measured EQE) and the inputs of a spectral mismatch calculation.
//!
//! Light, concentration, cell temperature, ERE, emission and J-V model are those of the cell
//! panel ([`CellScenario`]): a stack is always seen under the same light as the single cell,
//! so one set of controls drives both. Everything here is in the units people type (eV, meV,
//! fractions); [`StackScenario::to_physics`] and its siblings check every value once and say
//! what is accepted.

use super::{
    check_gap_ev, check_gap_range, check_gap_setting, Axis, CellScenario, CellSetup, Connection, FixAt, SourceSpec,
};
use crate::physics::absorber::{Absorptance, AbsorptanceTable};
use crate::physics::constants::{ev, thermal_energy};
use crate::physics::junction::{Cell, Illumination};
use crate::physics::stack::optimize::{FixedGap, Problem, SEARCH_RANGE_EV};
use crate::physics::stack::{Connection as PhysicsConnection, MAX_JUNCTIONS};
use serde::{Deserialize, Serialize};
use std::sync::Arc;

/// A multi-junction stack and the panel's other settings.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct StackScenario {
    /// band gaps [eV], top first (strictly descending), 2 to 6 of them
    pub gaps_ev: Vec<f64>,
    pub connection: Connection,
    pub optimize: OptimizeSettings,
    pub map: MapSettings,
    /// the single cell's absorptance; a step at the cell's gap by default
    pub absorber: AbsorberSpec,
    pub mismatch: MismatchSettings,
}

impl Default for StackScenario {
    fn default() -> Self {
        StackScenario {
            gaps_ev: vec![1.7, 1.1],
            connection: Connection::Series,
            optimize: OptimizeSettings::default(),
            map: MapSettings::default(),
            absorber: AbsorberSpec::Step,
            mismatch: MismatchSettings::default(),
        }
    }
}

/// What the optimizer searches.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct OptimizeSettings {
    /// number of junctions, 1 to 6
    pub junctions: usize,
    /// a gap held fixed [eV] ("best partner" of e.g. a 1.12 eV bottom cell), if any
    pub fix_ev: Option<f64>,
    /// where the fixed gap sits
    pub fix_at: FixAt,
    /// range of the free gaps [eV]
    pub from_ev: f64,
    pub to_ev: f64,
}

impl Default for OptimizeSettings {
    fn default() -> Self {
        OptimizeSettings {
            junctions: 2,
            fix_ev: None,
            fix_at: FixAt::Any,
            from_ev: SEARCH_RANGE_EV.0,
            to_ev: SEARCH_RANGE_EV.1,
        }
    }
}

/// The axes of the two-junction efficiency map.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct MapSettings {
    /// top-cell gap range [eV]
    pub top_from_ev: f64,
    pub top_to_ev: f64,
    /// bottom-cell gap range [eV]
    pub bottom_from_ev: f64,
    pub bottom_to_ev: f64,
    /// points along each axis, 2 to [`MAX_MAP_POINTS`]
    pub points: usize,
}

impl Default for MapSettings {
    fn default() -> Self {
        MapSettings { top_from_ev: 1.2, top_to_ev: 2.4, bottom_from_ev: 0.5, bottom_to_ev: 1.5, points: 121 }
    }
}

/// The most points along one axis of the map.
pub const MAX_MAP_POINTS: usize = 500;
/// Accepted Urbach energies [meV].
pub const URBACH_RANGE_MEV: (f64, f64) = (0.1, 200.0);

/// A measured quantum efficiency carried inside the scenario: SI coordinates on its own
/// axis, EQE as a fraction.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EqeTableSpec {
    pub name: String,
    pub axis: Axis,
    pub x: Vec<f64>,
    pub eqe: Vec<f64>,
}

impl EqeTableSpec {
    /// The table as stored in a scenario.
    pub fn from_table(t: &AbsorptanceTable) -> EqeTableSpec {
        EqeTableSpec {
            name: t.name.clone(),
            axis: t.axis().into(),
            x: t.coordinates().to_vec(),
            eqe: t.values().to_vec(),
        }
    }

    /// Check and build the physics table.
    pub fn to_table(&self) -> Result<Arc<AbsorptanceTable>, String> {
        AbsorptanceTable::new(self.name.clone(), self.axis.into(), self.x.clone(), self.eqe.clone())
            .map(Arc::new)
            .map_err(|e| format!("the quantum efficiency '{}' is not usable: {e}", self.name))
    }
}

/// The single cell's absorptance.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum AbsorberSpec {
    /// a step at the cell's band gap (the Shockley-Queisser cell). Default.
    #[default]
    Step,
    /// the cell's band gap with an exponential tail of width `urbach_mev` [meV] below it
    Urbach { urbach_mev: f64 },
    /// a measured EQE
    Measured(EqeTableSpec),
}

impl AbsorberSpec {
    pub fn is_step(&self) -> bool {
        matches!(self, AbsorberSpec::Step)
    }

    /// The physics absorptance for a cell of gap `gap_ev` [eV] at `cell_temp_k` [K];
    /// warnings (e.g. a tail wider than kT) are pushed to `warnings`.
    pub fn to_physics(&self, gap_ev: f64, cell_temp_k: f64, warnings: &mut Vec<String>) -> Result<Absorptance, String> {
        match self {
            AbsorberSpec::Step => Ok(Absorptance::Step { gap_j: ev(gap_ev) }),
            AbsorberSpec::Urbach { urbach_mev } => {
                let (lo, hi) = URBACH_RANGE_MEV;
                if !(urbach_mev.is_finite() && *urbach_mev >= lo && *urbach_mev <= hi) {
                    return Err(format!(
                        "the Urbach energy {urbach_mev} meV is out of range; give a value from {lo} to {hi} meV (e.g. 15)"
                    ));
                }
                let kt_mev = thermal_energy(cell_temp_k) / ev(1e-3);
                if *urbach_mev >= kt_mev {
                    warnings.push(format!(
                        "the Urbach energy {urbach_mev} meV is not below kT = {kt_mev:.1} meV at {cell_temp_k} K: the tail's \
                         emission dominates and the radiative-limit Voc collapses; real tails end somewhere, so treat the result as a bound"
                    ));
                }
                Ok(Absorptance::Urbach { gap_j: ev(gap_ev), urbach_j: ev(urbach_mev * 1e-3) })
            }
            AbsorberSpec::Measured(t) => Ok(Absorptance::Table(t.to_table()?)),
        }
    }
}

/// Inputs of a spectral mismatch calculation. The test spectrum is the cell panel's.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct MismatchSettings {
    /// the device under test
    pub test_eqe: Option<EqeTableSpec>,
    /// the reference device
    pub reference_eqe: Option<EqeTableSpec>,
    /// the reference spectrum, AM1.5G by default
    pub reference_spectrum: SourceSpec,
}

impl Default for MismatchSettings {
    fn default() -> Self {
        MismatchSettings { test_eqe: None, reference_eqe: None, reference_spectrum: SourceSpec::Am15g }
    }
}

/// Physics inputs of a stack.
#[derive(Debug, Clone)]
pub struct StackSetup {
    pub light: Illumination,
    /// temperature, ERE, emission and J-V model of every subcell (gap unused)
    pub cell: Cell,
    /// [J], top first
    pub gaps_j: Vec<f64>,
    pub connection: PhysicsConnection,
    pub warnings: Vec<String>,
}

/// Check a list of gaps [eV] given top first: 2 to 6 of them, each in the accepted range,
/// strictly descending. Returns them in J.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn check_gaps(gaps_ev: &[f64]) -> Result<Vec<f64>, String> {
    let example = "e.g. 1.8,1.1 (top cell first)";
    if gaps_ev.len() < 2 || gaps_ev.len() > MAX_JUNCTIONS {
        return Err(format!(
            "a stack needs 2 to {MAX_JUNCTIONS} band gaps, {} given; give them top first, {example}",
            gaps_ev.len()
        ));
    }
    for (i, g) in gaps_ev.iter().enumerate() {
        check_gap_ev(*g).map_err(|e| format!("subcell {}: {e}", i + 1))?;
    }
    for (i, w) in gaps_ev.windows(2).enumerate() {
        if !(w[0] > w[1]) {
            return Err(format!(
                "band gap {} ({} eV) is not above band gap {} ({} eV); give the gaps top first, strictly descending \
                 (light reaches the widest gap first), {example}",
                i + 1,
                w[0],
                i + 2,
                w[1]
            ));
        }
    }
    Ok(gaps_ev.iter().map(|&g| ev(g)).collect())
}

impl StackScenario {
    /// Check every setting of the stack panel under the cell panel's `cell`: the gaps, the
    /// optimizer's settings, the map's axes, the single cell's absorptance and any mismatch
    /// inputs. Returns the warnings worth showing.
    pub fn check(&self, cell: &CellScenario) -> Result<Vec<String>, String> {
        check_gaps(&self.gaps_ev)?;
        self.optimize.check()?;
        self.map.check()?;
        let mut warnings = Vec::new();
        self.absorber.to_physics(cell.gap_ev, cell.cell_temp_k, &mut warnings)?;
        self.mismatch.check()?;
        Ok(warnings)
    }

    /// Check the stack and build its physics inputs under the cell panel's light and cell.
    pub fn to_physics(&self, cell: &CellScenario) -> Result<StackSetup, String> {
        let gaps_j = check_gaps(&self.gaps_ev)?;
        let CellSetup { light, cell, warnings } = cell.to_physics()?;
        Ok(StackSetup { light, cell, gaps_j, connection: self.connection.into(), warnings })
    }
}

impl OptimizeSettings {
    /// Check the settings and build the optimizer's problem under `light`, subcells like
    /// `cell` (its gap unused), wired as `connection` (the scenario's or the physics value).
    pub fn to_problem<'a>(
        &self,
        light: &'a Illumination,
        cell: &Cell,
        connection: impl Into<PhysicsConnection>,
    ) -> Result<Problem<'a>, String> {
        let fixed = self.check()?;
        Ok(Problem {
            light,
            cell: *cell,
            connection: connection.into(),
            junctions: self.junctions,
            fixed,
            range_j: (ev(self.from_ev), ev(self.to_ev)),
            seeds: Vec::new(),
        })
    }

    /// Check the number of junctions, the search range and the fixed gap (what does not
    /// depend on the light or the cells); returns the fixed gap, if any.
    pub fn check(&self) -> Result<Option<FixedGap>, String> {
        if !(1..=MAX_JUNCTIONS).contains(&self.junctions) {
            return Err(format!(
                "the number of junctions {} is out of range; give 1 to {MAX_JUNCTIONS}",
                self.junctions
            ));
        }
        let (a, b) = (self.from_ev, self.to_ev);
        check_gap_range("search range", a, b)?;
        let fixed = match self.fix_ev {
            None => None,
            Some(f) => {
                check_gap_setting("fixed gap", f, "e.g. 1.12 for silicon")?;
                if self.junctions < 2 {
                    return Err(
                        "a fixed gap needs at least 2 junctions (it is the partner search); give --junctions 2 or more"
                            .into(),
                    );
                }
                let room = match self.fix_at {
                    FixAt::Any => true,
                    FixAt::Top => a < f,
                    FixAt::Bottom => f < b,
                };
                if !room {
                    return Err(format!(
                        "with the fixed gap {f} eV at the {}, the search range {a}-{b} eV leaves no room for the other gaps; \
                         widen the range or move the fixed gap",
                        if self.fix_at == FixAt::Top { "top" } else { "bottom" }
                    ));
                }
                Some(FixedGap { gap_j: ev(f), at: self.fix_at.into() })
            }
        };
        Ok(fixed)
    }
}

impl MapSettings {
    /// Check the number of points and both axes.
    pub fn check(&self) -> Result<(), String> {
        if !(2..=MAX_MAP_POINTS).contains(&self.points) {
            return Err(format!("the map needs 2 to {MAX_MAP_POINTS} points along each axis, {} given", self.points));
        }
        check_gap_range("map's top-gap range", self.top_from_ev, self.top_to_ev)?;
        check_gap_range("map's bottom-gap range", self.bottom_from_ev, self.bottom_to_ev)
    }

    /// Check the axes; returns (top gaps, bottom gaps) [J].
    pub fn grid(&self) -> Result<(Vec<f64>, Vec<f64>), String> {
        self.check()?;
        let n = self.points;
        let axis =
            |a: f64, b: f64| -> Vec<f64> { (0..n).map(|i| ev(a + (b - a) * i as f64 / (n - 1) as f64)).collect() };
        Ok((axis(self.top_from_ev, self.top_to_ev), axis(self.bottom_from_ev, self.bottom_to_ev)))
    }
}

/// Physics inputs of a mismatch calculation.
#[derive(Debug, Clone)]
pub struct MismatchSetup {
    pub test_device: Absorptance,
    pub reference_device: Absorptance,
    pub test_spectrum: crate::physics::sources::Source,
    pub reference_spectrum: crate::physics::sources::Source,
}

impl MismatchSettings {
    /// Check the tables present and the reference spectrum (a missing table is not an error
    /// here: the inputs may still be incomplete).
    pub fn check(&self) -> Result<(), String> {
        for t in [&self.test_eqe, &self.reference_eqe].into_iter().flatten() {
            t.to_table()?;
        }
        self.reference_spectrum.to_source().map(drop)
    }

    /// Check the inputs; `test_spectrum` is the cell panel's spectrum. `File` sources must
    /// have been read by the front end.
    pub fn to_physics(&self, test_spectrum: &SourceSpec) -> Result<MismatchSetup, String> {
        let need = |t: &Option<EqeTableSpec>, what: &str| -> Result<Absorptance, String> {
            match t {
                Some(t) => Ok(Absorptance::Table(t.to_table()?)),
                None => Err(format!(
                    "the {what}'s quantum efficiency is missing; give it as a file (wavelength and EQE or A/W)"
                )),
            }
        };
        let test_source = test_spectrum.to_source()?;
        let reference_source = self.reference_spectrum.to_source()?;
        Ok(MismatchSetup {
            test_device: need(&self.test_eqe, "device under test")?,
            reference_device: need(&self.reference_eqe, "reference device")?,
            test_spectrum: test_source,
            reference_spectrum: reference_source,
        })
    }
}
