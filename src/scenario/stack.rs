//! The stack panel's part of the scenario: a multi-junction stack (gaps and connection), the
//! optimizer's and the tandem map's settings, the single cell's absorptance (step, Urbach
//! tail or measured EQE) and the inputs of a spectral mismatch calculation.
//!
//! Light, concentration, cell temperature, ERE, emission and J-V model are those of the cell
//! panel ([`CellScenario`]): a stack is always seen under the same light as the single cell,
//! so one set of controls drives both. Everything here is in the units people type (eV, meV,
//! fractions); [`StackScenario::to_physics`] and its siblings check every value once and say
//! what is accepted.

use super::real::RealAbsorberSpec;
use super::{
    check_gap_ev, check_gap_range, check_gap_setting, Axis, CellScenario, CellSetup, Connection, FixAt, SourceSpec,
};
use crate::physics::absorber::{Absorptance, AbsorptanceTable};
use crate::physics::constants::to_ev;
use crate::physics::constants::{ev, thermal_energy};
use crate::physics::junction::{Cell, Illumination};
use crate::physics::stack::mixed::{solve_mixed, StackExtras};
use crate::physics::stack::optimize::{FixedGap, Problem, SEARCH_RANGE_EV};
use crate::physics::stack::{solve_stack, Connection as PhysicsConnection, StackResult, MAX_JUNCTIONS};
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
    /// a real absorber (e.g. silicon) as the bottom subcell, under the gaps of `gaps_ev`;
    /// none by default (every subcell a step)
    pub bottom: Option<RealAbsorberSpec>,
    /// the fraction of each subcell's radiative emission absorbed by the subcell below it,
    /// 0 (none, the default) to 1
    pub luminescent_coupling: f64,
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
            bottom: None,
            luminescent_coupling: 0.0,
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
    /// with a real bottom cell the map's second axis is its thickness [um], log-spaced
    pub thickness_from_um: f64,
    pub thickness_to_um: f64,
}

impl Default for MapSettings {
    fn default() -> Self {
        MapSettings {
            top_from_ev: 1.2,
            top_to_ev: 2.4,
            bottom_from_ev: 0.5,
            bottom_to_ev: 1.5,
            points: 121,
            thickness_from_um: 10.0,
            thickness_to_um: 1000.0,
        }
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
    /// a real absorber (silicon or an alpha / n,k table) of a given thickness; its table,
    /// not the cell's band gap, sets the absorption
    Real(RealAbsorberSpec),
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
            AbsorberSpec::Real(r) => {
                let (abs, _) = r.to_physics()?;
                abs.absorptance().ok_or_else(|| "the absorber's table has fewer than two rows".to_string())
            }
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
    /// a real bottom cell and luminescent coupling, if any
    pub extras: StackExtras,
    pub warnings: Vec<String>,
}

impl StackSetup {
    /// Solve the stack (the plain step-cell solver when there are no extras).
    pub fn solve(&self) -> StackResult {
        if self.extras.is_plain() {
            solve_stack(&self.light, &self.cell, &self.gaps_j, self.connection)
        } else {
            solve_mixed(&self.light, &self.cell, &self.gaps_j, &self.extras, self.connection)
        }
    }
}

/// Check a list of gaps [eV] given top first: 2 to 6 of them, each in the accepted range,
/// strictly descending. Returns them in J.
pub fn check_gaps(gaps_ev: &[f64]) -> Result<Vec<f64>, String> {
    check_gaps_over(gaps_ev, false)
}

/// [`check_gaps`] for the step subcells over a real bottom cell when `real_bottom`: then 1
/// to 5 gaps (the bottom cell is the last junction).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn check_gaps_over(gaps_ev: &[f64], real_bottom: bool) -> Result<Vec<f64>, String> {
    if real_bottom {
        if gaps_ev.is_empty() || gaps_ev.len() >= MAX_JUNCTIONS {
            return Err(format!(
                "a stack on a real bottom cell needs 1 to {} band gaps above it, {} given; give them top first, \
                 e.g. 1.71,silicon:300",
                MAX_JUNCTIONS - 1,
                gaps_ev.len()
            ));
        }
    } else if gaps_ev.len() < 2 || gaps_ev.len() > MAX_JUNCTIONS {
        return Err(format!(
            "a stack needs 2 to {MAX_JUNCTIONS} band gaps, {} given; give them top first, e.g. 1.8,1.1 (top cell first)",
            gaps_ev.len()
        ));
    }
    let example = "e.g. 1.8,1.1 (top cell first)";
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
        check_gaps_over(&self.gaps_ev, self.bottom.is_some())?;
        self.optimize.check()?;
        self.map.check()?;
        self.check_extras()?;
        let mut warnings = Vec::new();
        self.absorber.to_physics(cell.gap_ev, cell.cell_temp_k, &mut warnings)?;
        self.mismatch.check()?;
        Ok(warnings)
    }

    /// Check the stack and build its physics inputs under the cell panel's light and cell.
    pub fn to_physics(&self, cell: &CellScenario) -> Result<StackSetup, String> {
        let gaps_j = check_gaps_over(&self.gaps_ev, self.bottom.is_some())?;
        let CellSetup { light, cell, mut warnings } = cell.to_physics()?;
        let extras = self.extras(&light, cell.temp_k)?;
        if let Some(b) = &extras.bottom {
            let edge = b.model.edge_j(b.thickness_m, b.trapping);
            if gaps_j.last().is_some_and(|&g| g <= edge) {
                warnings.push(format!(
                    "the lowest band gap above the bottom cell is not above its absorption edge ({:.3} eV): the step \
                     cell takes the light the bottom cell could use",
                    to_ev(edge)
                ));
            }
        }
        Ok(StackSetup { light, cell, gaps_j, connection: self.connection.into(), extras, warnings })
    }

    /// Check the real bottom cell's settings and the luminescent coupling.
    pub fn check_extras(&self) -> Result<(), String> {
        check_coupling(self.luminescent_coupling)?;
        if let Some(b) = &self.bottom {
            b.to_physics().map_err(|e| format!("bottom cell: {e}"))?;
        }
        Ok(())
    }

    /// The real bottom cell (its model under `light` at `cell_temp_k` [K]) and coupling.
    pub fn extras(&self, light: &Illumination, cell_temp_k: f64) -> Result<StackExtras, String> {
        check_coupling(self.luminescent_coupling)?;
        let bottom = match &self.bottom {
            Some(b) => Some(b.setup(light, cell_temp_k).map_err(|e| format!("bottom cell: {e}"))?.bottom()),
            None => None,
        };
        Ok(StackExtras { bottom, coupling: self.luminescent_coupling })
    }

    /// The optimizer's problem for this stack's settings under `setup` (its light, cells,
    /// connection and extras): with a real bottom cell the optimizer searches the gaps
    /// above it, and `optimize.junctions` counts the bottom cell too.
    pub fn problem<'a>(&self, setup: &'a StackSetup) -> Result<Problem<'a>, String> {
        self.optimize.to_problem_with(&setup.light, &setup.cell, setup.connection, setup.extras.clone())
    }
}

/// Check a luminescent-coupling fraction.
pub fn check_coupling(x: f64) -> Result<(), String> {
    if !(0.0..=1.0).contains(&x) {
        return Err(format!(
            "the luminescent coupling {x} is out of range; give a fraction from 0 (none) to 1 (all of a subcell's \
             emission reaches the one below), e.g. 0.3"
        ));
    }
    Ok(())
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
            extras: Default::default(),
        })
    }

    /// [`OptimizeSettings::to_problem`] with a real bottom cell and luminescent coupling:
    /// with a real bottom cell the optimizer searches the gaps above it, and `junctions`
    /// counts the bottom cell too.
    pub fn to_problem_with<'a>(
        &self,
        light: &'a Illumination,
        cell: &Cell,
        connection: impl Into<PhysicsConnection>,
        extras: StackExtras,
    ) -> Result<Problem<'a>, String> {
        let mut p = self.to_problem(light, cell, connection)?;
        if extras.bottom.is_some() {
            if self.junctions < 2 {
                return Err("with a real bottom cell the stack needs at least 2 junctions (the bottom cell and one \
                            above it); raise the number of junctions to 2 or more"
                    .into());
            }
            if self.fix_ev.is_some() {
                return Err("the real bottom cell is fixed already; hold no band gap fixed in the search".into());
            }
            p.junctions = self.junctions - 1;
        }
        p.extras = extras;
        Ok(p)
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
        check_gap_range("map's bottom-gap range", self.bottom_from_ev, self.bottom_to_ev)?;
        self.thicknesses().map(drop)
    }

    /// The thickness axis [m] of a map over a real bottom cell (log-spaced).
    pub fn thicknesses(&self) -> Result<Vec<f64>, String> {
        super::real::thickness_sweep(self.thickness_from_um, self.thickness_to_um, self.points)
            .map(|ts| ts.into_iter().map(|t| t * 1e-6).collect())
            .map_err(|e| format!("the map's {}", e.trim_start_matches("the ")))
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
