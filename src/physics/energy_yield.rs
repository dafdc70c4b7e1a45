//! Energy over a clear day or year: the detailed-balance electric energy of a cell or stack
//! integrated over time steps of clear-sky spectra, and the band gaps that maximize it.
//!
//! The sum. Each step k stands for the interval [t_k, t_k + dt) of a day divided from local
//! mean-time midnight ([`site::day_steps`]); its power is taken at t_k. With power zero at
//! both midnights (the sun is down, or, on a polar day, the power is continuous across them)
//! this rectangle sum over a whole day equals the trapezoid rule, whose error falls as dt^2:
//! a day at 5-minute steps is within about 1e-5 of the same day at 1-minute steps, at
//! 15-minute steps within 2e-4 (tests/energy_yield.rs holds them to 1e-4 and 1e-3). The energy is E = sum_k P_k dt [J m^-2], P_k the
//! maximum power [W m^-2] under the plane-of-array global spectrum of step k; the incident
//! energy likewise from the spectrum's integral; the energy efficiency is their ratio.
//!
//! The cell temperature is constant (the template's); no clouds, no soiling, no angular
//! reflection losses: an upper limit for a clear sky.
//!
//! Gaps that maximize the energy: one gap from a grid of gaps evaluated at every step in one
//! pass (the electric energy against gap), refined by a parabola through the grid's best
//! point and its neighbours; stacks by the simplex search of [`super::search::nelder_mead`]
//! from the AM1.5G optimum over a thinned set of steps, whose energy at the
//! found gaps is then recomputed over every step.
//!
//! Architecture invariant: pure functions of numbers; every pass over the steps goes
//! through [`Series::visit`], so the energy of a run is exactly the sum of its steps.

use super::clear_sky::{clear_sky_source, ClearSkySpectra};
use super::constants::CHARGE;
use super::junction::{sweep, Cell, Illumination};
use super::search::{nelder_mead, Objective};
use super::site::{civil_from_days, day_steps, days_from_civil, PreparedSite, Site};
use super::solar_position::{CivilTime, SunPosition};
use super::stack::{stack_efficiency, Connection};

/// One time step of a series of spectra.
#[derive(Debug, Clone)]
pub struct SunStep {
    /// start of the step (clear sky: local mean time of the day's longitude; measured: the
    /// timestamp as given)
    pub when: CivilTime,
    /// length of the step [s]
    pub seconds: f64,
    /// where the sun is (clear sky only)
    pub position: Option<SunPosition>,
    /// plane-of-array global irradiance [W m^-2] (0 at night)
    pub plane_w_m2: f64,
    /// the plane-of-array light, `None` when it is dark
    pub light: Option<Illumination>,
}

/// A series of spectra that can be walked step by step: a clear-sky day or year
/// ([`ClearSkySeries`]) or a measured one ([`MeasuredSeries`]).
pub trait Series {
    /// Call `f` for every step in time order and `progress(done, all)` now and then.
    fn visit(&self, progress: &mut dyn FnMut(usize, usize), f: &mut dyn FnMut(&SunStep)) -> Result<(), String>;
}

/// The calendar dates of `year`.
pub fn year_days(year: i32) -> Vec<(i32, u32, u32)> {
    (days_from_civil(year, 1, 1)..days_from_civil(year + 1, 1, 1)).map(civil_from_days).collect()
}

/// Clear-sky steps of the days `days` at `site`, `step_s` apart from local mean-time midnight.
#[derive(Debug, Clone)]
pub struct ClearSkySeries<'a> {
    pub site: &'a Site,
    pub days: &'a [(i32, u32, u32)],
    /// [s], 1 to 3600
    pub step_s: f64,
}

impl Series for ClearSkySeries<'_> {
    /// Progress after each day; dark steps come with `light: None`.
    fn visit(&self, progress: &mut dyn FnMut(usize, usize), f: &mut dyn FnMut(&SunStep)) -> Result<(), String> {
        let step_s = self.step_s;
        if !(step_s.is_finite() && (1.0..=3600.0).contains(&step_s)) {
            return Err(format!("the time step {step_s} s is out of range; give 1 to 3600 s (e.g. 300)"));
        }
        let prepared = PreparedSite::new(self.site)?;
        for (i, &(y, m, d)) in self.days.iter().enumerate() {
            for when in day_steps(y, m, d, self.site.observer.longitude_deg, step_s) {
                let mo = prepared.moment(&when)?;
                f(&sun_step(when, step_s, mo.position, &mo.spectra)?);
            }
            progress(i + 1, self.days.len());
        }
        Ok(())
    }
}

fn sun_step(
    when: CivilTime,
    seconds: f64,
    position: SunPosition,
    spectra: &ClearSkySpectra,
) -> Result<SunStep, String> {
    let plane = spectra.plane_global_total();
    let light = if plane > 0.0 { Some(Illumination::one_sun(clear_sky_source(spectra, "clear sky")?)) } else { None };
    Ok(SunStep { when, seconds, position: Some(position), plane_w_m2: plane, light })
}

/// A measured series: one spectrum per timestamp, each standing for `seconds`.
#[derive(Debug, Clone, Default)]
pub struct MeasuredSeries {
    pub steps: Vec<SunStep>,
}

impl Series for MeasuredSeries {
    fn visit(&self, progress: &mut dyn FnMut(usize, usize), f: &mut dyn FnMut(&SunStep)) -> Result<(), String> {
        for (i, s) in self.steps.iter().enumerate() {
            f(s);
            if (i + 1) % 1000 == 0 || i + 1 == self.steps.len() {
                progress(i + 1, self.steps.len());
            }
        }
        Ok(())
    }
}

/// What a cell or stack made of one series.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Energy {
    /// plane-of-array incident energy [J m^-2]
    pub incident_j_m2: f64,
    /// electric energy at the maximum power point of every step [J m^-2]
    pub electric_j_m2: f64,
}

impl Energy {
    /// electric / incident (0 without light)
    pub fn efficiency(&self) -> f64 {
        if self.incident_j_m2 > 0.0 {
            self.electric_j_m2 / self.incident_j_m2
        } else {
            0.0
        }
    }
}

/// The device whose energy is counted: step-absorber subcells like `template` with gaps
/// `gaps_j` [J], top first (one gap: a single cell).
#[derive(Debug, Clone)]
pub struct Device {
    pub template: Cell,
    pub gaps_j: Vec<f64>,
    pub connection: Connection,
}

impl Device {
    /// Maximum power [W m^-2] under `light`.
    pub fn power(&self, light: &Illumination) -> f64 {
        stack_efficiency(light, &self.template, &self.gaps_j, self.connection) * light.input_power()
    }
}

/// Power of one step: (incident, electric) [W m^-2].
pub fn step_power(step: &SunStep, device: &Device) -> (f64, f64) {
    match &step.light {
        Some(light) => (step.plane_w_m2, device.power(light)),
        None => (0.0, 0.0),
    }
}

/// The energy of `device` over the steps, with each step's (incident, electric) power
/// [W m^-2] passed to `per_step`.
pub fn device_energy(
    series: &dyn Series,
    device: &Device,
    progress: &mut dyn FnMut(usize, usize),
    per_step: &mut dyn FnMut(&SunStep, f64, f64),
) -> Result<Energy, String> {
    let mut e = Energy::default();
    series.visit(progress, &mut |s| {
        let (inc, el) = step_power(s, device);
        e.incident_j_m2 += inc * s.seconds;
        e.electric_j_m2 += el * s.seconds;
        per_step(s, inc, el);
    })?;
    Ok(e)
}

/// Electric energy against band gap for a single cell.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct GapCurve {
    /// [J], ascending
    pub gaps_j: Vec<f64>,
    /// [J m^-2] per gap
    pub electric_j_m2: Vec<f64>,
    /// [J m^-2]
    pub incident_j_m2: f64,
}

impl GapCurve {
    /// The gap [J] of most energy, refined by a parabola through the grid's best point and
    /// its neighbours (the vertex kept inside them), with that energy [J m^-2] (the
    /// parabola's value); `None` for an empty curve.
    pub fn best(&self) -> Option<(f64, f64)> {
        let e = &self.electric_j_m2;
        let i = (0..e.len()).max_by(|&a, &b| e[a].total_cmp(&e[b]))?;
        if i == 0 || i + 1 == e.len() {
            return Some((self.gaps_j[i], e[i]));
        }
        let (x0, x1, x2) = (self.gaps_j[i - 1], self.gaps_j[i], self.gaps_j[i + 1]);
        let (y0, y1, y2) = (e[i - 1], e[i], e[i + 1]);
        let d0 = (y1 - y0) / (x1 - x0);
        let d1 = (y2 - y1) / (x2 - x1);
        let curv = (d1 - d0) / (x2 - x0);
        if curv.is_nan() || curv >= 0.0 {
            return Some((x1, y1));
        }
        // vertex of the parabola through the three points
        let xv = (0.5 * (x0 + x1) - d0 / (2.0 * curv)).clamp(x0, x2);
        let yv = y1 + (xv - x1) * (d0 + curv * (xv - x0));
        Some((xv, yv.max(y1)))
    }
}

/// The electric energy of a single cell like `template` at every gap of `gaps_j` [J]
/// (ascending), in one pass over the steps.
pub fn gap_curve(
    series: &dyn Series,
    template: &Cell,
    gaps_j: &[f64],
    progress: &mut dyn FnMut(usize, usize),
) -> Result<GapCurve, String> {
    let mut curve = GapCurve { gaps_j: gaps_j.to_vec(), electric_j_m2: vec![0.0; gaps_j.len()], incident_j_m2: 0.0 };
    series.visit(progress, &mut |s| {
        if let Some(light) = &s.light {
            curve.incident_j_m2 += s.plane_w_m2 * s.seconds;
            for (acc, r) in curve.electric_j_m2.iter_mut().zip(sweep(light, template, gaps_j)) {
                *acc += r.pmax * s.seconds;
            }
        }
    })?;
    Ok(curve)
}

struct SeriesObjective<'a> {
    lights: &'a [(f64, Illumination)],
    template: Cell,
    connection: Connection,
}

impl Objective for SeriesObjective<'_> {
    fn value(&mut self, x: &[f64]) -> f64 {
        let mut gaps: Vec<f64> = x.iter().map(|g| g * CHARGE).collect();
        gaps.sort_by(|a, b| b.total_cmp(a));
        self.lights
            .iter()
            .map(|(w, l)| w * stack_efficiency(l, &self.template, &gaps, self.connection) * l.input_power())
            .sum()
    }
    fn values(&mut self, n: usize, xs: &(dyn Fn(usize) -> Vec<f64> + Sync)) -> Vec<f64> {
        (0..n).map(|i| self.value(&xs(i))).collect()
    }
}

/// The gaps [J] (top first) of a stack like `template` that give the most electric energy
/// over the steps of `series` (pass a thinned one for a year: every few days, longer steps),
/// searched from `start_j` (e.g. the AM1.5G optimum) inside `range_j`, to 1e-4 eV.
pub fn best_stack_gaps(
    series: &dyn Series,
    template: &Cell,
    connection: Connection,
    start_j: &[f64],
    range_j: (f64, f64),
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Vec<f64>, String> {
    let mut lights = Vec::new();
    series.visit(progress, &mut |s| {
        if let Some(l) = &s.light {
            lights.push((s.seconds, l.clone()));
        }
    })?;
    let mut obj = SeriesObjective { lights: &lights, template: *template, connection };
    let x0: Vec<f64> = start_j.iter().map(|g| g / CHARGE).collect();
    let e0 = obj.value(&x0);
    let n = x0.len();
    let (lo, hi) = (vec![range_j.0 / CHARGE; n], vec![range_j.1 / CHARGE; n]);
    let (x, _) = nelder_mead(&mut obj, &x0, e0, &vec![0.05; n], &lo, &hi, &vec![1e-4; n]);
    let mut gaps: Vec<f64> = x.iter().map(|g| g * CHARGE).collect();
    gaps.sort_by(|a, b| b.total_cmp(a));
    Ok(gaps)
}
