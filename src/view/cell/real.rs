//! The Solar cell tab's cell with a real absorber (silicon or an n,k table): its figures
//! (`report::real::RealCellReport`, the command line's), the efficiency against thickness with
//! the best thickness, and the absorptance against photon energy beside the ideal step at the
//! same absorption edge.
//!
//! The absorber's model (`physics::real_cell::RealCellModel`) costs a few milliseconds to
//! build, so [`RealCache`] keeps it for as long as what it depends on (light, concentration,
//! cell temperature, material, doping) is unchanged: a thickness edit only re-solves, and a
//! trapping edit also redraws the thickness curve.
//!
//! Architecture invariant: figures come from `report::real`; every input is checked by the
//! scenario's own `RealAbsorberSpec::to_physics`; no web crate.

use std::sync::Arc;

use super::setup_of;
use crate::physics::constants::to_ev;
use crate::report::real::{RealCellReport, ThicknessPoint};
use crate::scenario::real::{thickness_sweep, DopingType, RealAbsorberSpec, RealMaterial, RealSetup, TrappingSpec};
use crate::scenario::stack::AbsorberSpec;
use crate::scenario::{Scenario, SourceSpec};

/// The thickness range of the efficiency-against-thickness curve [um] (log-spaced).
pub const CURVE_RANGE_UM: (f64, f64) = (1.0, 1000.0);
/// Points of the efficiency-against-thickness curve.
pub const CURVE_POINTS: usize = 121;

/// The efficiency against thickness for one model and trapping.
#[derive(Debug, Clone)]
pub struct ThicknessCurve {
    /// ascending thicknesses [um] with their figures
    pub points: Vec<ThicknessPoint>,
    /// the best thickness in the range [um], refined between grid points
    pub best_um: f64,
    /// the cell at the best thickness
    pub best: RealCellReport,
}

/// Everything the page shows for a real absorber.
#[derive(Debug, Clone)]
pub struct RealView {
    /// the cell at the scenario's thickness
    pub report: RealCellReport,
    pub spec: RealAbsorberSpec,
    pub curve: Arc<ThicknessCurve>,
    /// (photon energy [eV], absorptance) at the model's points, ascending
    pub absorptance: Vec<(f64, f64)>,
    /// the half-maximum absorption edge [eV], where the ideal step of the plot sits
    pub edge_ev: f64,
}

/// What the model depends on.
#[derive(Debug, Clone, PartialEq)]
struct ModelKey {
    spectrum: SourceSpec,
    concentration: u64,
    temp_k: u64,
    material: RealMaterial,
    doping_type: DopingType,
    doping_cm3: u64,
}

impl ModelKey {
    fn of(s: &Scenario, r: &RealAbsorberSpec) -> ModelKey {
        ModelKey {
            spectrum: s.cell.spectrum.clone(),
            concentration: s.cell.concentration.to_bits(),
            temp_k: s.cell.cell_temp_k.to_bits(),
            material: r.material.clone(),
            doping_type: r.doping_type,
            doping_cm3: r.doping_cm3.to_bits(),
        }
    }
}

/// The model and thickness curve between renders.
#[derive(Default)]
pub struct RealCache {
    model: Option<(ModelKey, Arc<RealSetup>)>,
    curve: Option<(TrappingSpec, Arc<ThicknessCurve>)>,
    /// how many times the model was built
    pub model_builds: u64,
    /// how many times the thickness curve was computed
    pub curve_runs: u64,
}

impl RealCache {
    /// The real absorber of `s`, or None when the cell's absorptance is not a real absorber.
    /// Errors are the scenario's own messages.
    pub fn compute(&mut self, s: &Scenario) -> Result<Option<RealView>, String> {
        let AbsorberSpec::Real(spec) = &s.stack.absorber else {
            return Ok(None);
        };
        // every setting checked by the scenario (a bad thickness gives its message)
        let (abs, _) = spec.to_physics()?;
        let key = ModelKey::of(s, spec);
        let setup = match &self.model {
            Some((k, m)) if *k == key => m.clone(),
            _ => {
                let cell = setup_of(&s.cell)?;
                let m = Arc::new(spec.setup(&cell.light, s.cell.cell_temp_k)?);
                self.model_builds += 1;
                self.model = Some((key, m.clone()));
                self.curve = None;
                m
            }
        };
        let model = &setup.model;
        let trapping = abs.trapping;
        let input = model.input_power();
        let label = spec.trapping.label();
        let curve = match &self.curve {
            Some((t, c)) if *t == spec.trapping => c.clone(),
            _ => {
                let (lo, hi) = CURVE_RANGE_UM;
                let ums = thickness_sweep(lo, hi, CURVE_POINTS)?;
                let ms: Vec<f64> = ums.iter().map(|t| t * 1e-6).collect();
                let rs = model.sweep(&ms, trapping);
                let points = ums.iter().zip(&rs).map(|(&t, r)| ThicknessPoint::new(t, r)).collect();
                let (best_m, r) = model.best_thickness(lo * 1e-6, hi * 1e-6, trapping);
                let best =
                    RealCellReport::new(&r, model.edge_j(best_m, trapping), best_m * 1e6, setup.auger, label, input);
                let c = Arc::new(ThicknessCurve { points, best_um: best_m * 1e6, best });
                self.curve_runs += 1;
                self.curve = Some((spec.trapping, c.clone()));
                c
            }
        };
        let w = abs.thickness_m;
        let edge_j = model.edge_j(w, trapping);
        let report =
            RealCellReport::new(&model.solve(w, trapping), edge_j, spec.thickness_um, setup.auger, label, input);
        let absorptance = model.absorptance_curve(w, trapping).into_iter().map(|(e, a)| (to_ev(e), a)).collect();
        Ok(Some(RealView { report, spec: spec.clone(), curve, absorptance, edge_ev: to_ev(edge_j) }))
    }
}

/// The light-trapping choices: (scenario value, hook suffix, words on the page).
pub const TRAPPING_CHOICES: [(TrappingSpec, &str, &str); 3] = [
    (TrappingSpec::Lambertian, "lambertian", "Lambertian (ideal textured front, mirror behind)"),
    (TrappingSpec::DoublePass, "double-pass", "Double pass (flat, mirror behind)"),
    (TrappingSpec::SinglePass, "single-pass", "Single pass (flat, nothing reflected)"),
];

/// The words for a trapping choice.
pub fn trapping_words(t: TrappingSpec) -> &'static str {
    match t {
        TrappingSpec::Lambertian => "Lambertian",
        TrappingSpec::DoublePass => "double pass",
        TrappingSpec::SinglePass => "single pass",
    }
}

/// The silicon absorber first offered: 110 um, Lambertian, undoped.
pub fn first_silicon() -> RealAbsorberSpec {
    RealAbsorberSpec {
        material: RealMaterial::Silicon,
        thickness_um: 110.0,
        trapping: TrappingSpec::Lambertian,
        doping_type: DopingType::N,
        doping_cm3: 0.0,
    }
}

/// The caption under the real absorber's exported plots.
pub fn caption(s: &Scenario, v: &RealView) -> String {
    let what = format!(
        "{} {} um, {} light trapping, {}",
        v.spec.material_name(),
        crate::view::format::field(v.spec.thickness_um, 6),
        trapping_words(v.spec.trapping),
        doping_words(&v.spec)
    );
    super::csv::conditions_caption(s, "cell", &what)
}

/// "undoped" or e.g. "n-type 1e+16 cm^-3".
pub fn doping_words(r: &RealAbsorberSpec) -> String {
    if r.doping_cm3 > 0.0 {
        let t = if r.doping_type == DopingType::N { "n" } else { "p" };
        format!("{t}-type {} cm⁻³", crate::view::format::sig(r.doping_cm3, 3))
    } else {
        "undoped".into()
    }
}

/// The efficiency against thickness as CSV (the JSON keys of `glowgap cell --thickness-sweep`).
pub fn thickness_csv(s: &Scenario, v: &RealView) -> String {
    use crate::view::format::csv_num;
    let mut out = format!("# Glowgap: efficiency against absorber thickness\n# {}\n", caption(s, v));
    out.push_str(&format!("# best thickness in the range: {} um\n", csv_num(v.curve.best_um)));
    out.push_str("thickness_um,efficiency_percent,jsc_ma_cm2,voc_v\n");
    for p in &v.curve.points {
        out.push_str(&format!(
            "{},{},{},{}\n",
            csv_num(p.thickness_um),
            csv_num(p.efficiency * 100.0),
            csv_num(p.jsc_ma_cm2),
            csv_num(p.voc_v)
        ));
    }
    out
}

/// The absorptance against photon energy as CSV, with the ideal step at the same edge.
pub fn absorptance_csv(s: &Scenario, v: &RealView) -> String {
    use crate::view::format::csv_num;
    let mut out = format!("# Glowgap: absorptance against photon energy\n# {}\n", caption(s, v));
    out.push_str(&format!("# absorption edge (half maximum): {} eV\n", csv_num(v.edge_ev)));
    out.push_str("photon_energy_ev,absorptance,ideal_step\n");
    for &(e, a) in &v.absorptance {
        let step = if e >= v.edge_ev { 1.0 } else { 0.0 };
        out.push_str(&format!("{},{},{}\n", csv_num(e), csv_num(a), csv_num(step)));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn silicon(s: &mut Scenario, um: f64) {
        s.stack.absorber = AbsorberSpec::Real(RealAbsorberSpec { thickness_um: um, ..first_silicon() });
    }

    #[test]
    fn a_step_has_no_real_view() {
        assert!(RealCache::default().compute(&Scenario::default()).unwrap().is_none());
    }

    #[test]
    fn the_curve_spans_the_range_with_its_points() {
        let mut s = Scenario::default();
        silicon(&mut s, 110.0);
        let v = RealCache::default().compute(&s).unwrap().unwrap();
        assert_eq!(v.curve.points.len(), CURVE_POINTS);
        let (a, b) = (v.curve.points[0].thickness_um, v.curve.points[CURVE_POINTS - 1].thickness_um);
        assert!((a - 1.0).abs() < 1e-12 && (b - 1000.0).abs() < 1e-9, "{a} {b}");
        // the edge of silicon (indirect gap 1.12 eV at 300 K, common practice) sits near it
        assert!((1.0..1.2).contains(&v.edge_ev), "{}", v.edge_ev);
    }
}
