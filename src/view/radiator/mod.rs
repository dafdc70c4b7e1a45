//! Turning the radiator scenario into what the panel shows. The balance is evaluated by the
//! same code as `glowgap eval --radiator` (the scenario's own checks, then
//! [`crate::physics::radiator::evaluate`]), so the page and the command line agree. What does
//! not depend on the emissivity profile (the sky's transmittance, the sun's spectrum, the
//! blackbody at the surface temperature, drawn behind the editor) is cached; while a point
//! is dragged the P_net(T) curve is computed at fewer temperatures and refined on release.

use std::sync::Arc;

use crate::physics::constants::HC;
use crate::physics::planck::{exitance_per_wavelength, peak_wavelength};
use crate::physics::radiator::{evaluate, Emitter, Evaluation, Parts, Sky};
use crate::report::radiator::RadiatorReport;
use crate::scenario::radiator::{EmitterSpec, RadiatorScenario, SkySpec};
use crate::scenario::{PlotAxis, PlotQuantity, SourceSpec};
use crate::view::spectrum::display_value;
use points::{as_points, EDITOR_RANGE_UM};

/// Temperatures of the P_net(T) curve: settled, and while dragging.
pub const CURVE_POINTS: usize = 161;
pub const CURVE_POINTS_COARSE: usize = 21;
/// Wavelengths sampled across the editor for drawing, and the most profile corners added.
const DRAW_SAMPLES: usize = 420;
const MAX_DRAW_KNOTS: usize = 1500;

/// The curves drawn behind the editor, on its log-wavelength samples.
#[derive(Debug, Clone)]
pub struct Background {
    /// log10 of the wavelength [um], ascending
    pub x: Vec<f64>,
    /// zenith transmittance of the sky (fraction)
    pub sky: Vec<f64>,
    /// the sun's spectral irradiance over its peak (0-1), and the peak [W m^-2 um^-1]
    pub sun: Vec<f64>,
    pub sun_peak: f64,
    pub sun_name: String,
    /// blackbody spectral exitance at the surface temperature over its peak, and the peak
    /// [W m^-2 um^-1]
    pub bb: Vec<f64>,
    pub bb_peak: f64,
}

/// The profile drawn in the editor.
#[derive(Debug, Clone)]
pub struct ProfileView {
    /// log10 of the wavelength [um] and the normal emissivity there
    pub x: Vec<f64>,
    pub eps: Vec<f64>,
    /// the control points [um, emissivity]: the profile's own, or those it would become
    pub handles: Vec<[f64; 2]>,
    /// whether the profile is made of control points (otherwise the first edit turns it
    /// into the handles shown)
    pub editable: bool,
}

/// Everything the panel shows for one radiator scenario.
#[derive(Debug, Clone)]
pub struct RadiatorView {
    pub scenario: RadiatorScenario,
    pub report: RadiatorReport,
    pub warnings: Vec<String>,
    /// the balance at surface temperatures from the curve range
    pub curve: Vec<Parts>,
    /// the curve is the settled one (not the coarse one of a drag)
    pub fine: bool,
    /// the wavelengths the editor shows [um]
    pub range_um: (f64, f64),
    pub profile: ProfileView,
    pub background: Arc<Background>,
    /// the emitter as the balance saw it (for read-outs and exports)
    pub emitter: Emitter,
    pub sky: Sky,
}

impl RadiatorView {
    /// Normal emissivity at `l_um`.
    pub fn eps_at(&self, l_um: f64) -> f64 {
        self.emitter.normal(l_um * 1e-6)
    }
}

/// Caches between renders.
#[derive(Default)]
pub struct RadiatorCache {
    /// the last scenario evaluated, its evaluation and warnings
    last: Option<(RadiatorScenario, Evaluated)>,
    /// background: keyed by sky, ambient, sun, surface temperature and range
    background: Option<(BackgroundKey, Arc<Background>)>,
    /// the last result, for redraws that change nothing computed (a point chosen, a resize)
    result: Option<((bool, SourceSpec), Arc<RadiatorView>)>,
}

/// An evaluation with the warnings, emitter and sky it was made from.
type Evaluated = (Arc<Evaluation>, Vec<String>, Emitter, Sky);

type BackgroundKey = (SkySpec, u64, Option<SourceSpec>, u64, (u64, u64));

/// The wavelengths the editor shows: its usual span, widened to every control point.
pub fn editor_range(spec: &EmitterSpec) -> (f64, f64) {
    let (mut lo, mut hi) = EDITOR_RANGE_UM;
    if let EmitterSpec::Points { points } = spec {
        if let (Some(a), Some(b)) = (points.first(), points.last()) {
            if a[0] < lo {
                lo = a[0] / 1.15;
            }
            if b[0] > hi {
                hi = b[0] * 1.15;
            }
        }
    }
    (lo, hi)
}

/// Log-spaced sample wavelengths [um] over `range`, with the profile's corners (and points
/// just either side of them) so that steps and kinks are drawn sharp.
fn samples(range: (f64, f64), knots_m: &[f64]) -> Vec<f64> {
    let (a, b) = (range.0.log10(), range.1.log10());
    let mut x: Vec<f64> = (0..DRAW_SAMPLES).map(|i| a + (b - a) * i as f64 / (DRAW_SAMPLES - 1) as f64).collect();
    // a long measured table: its own points are dense enough; keep a few thousand corners
    let every = (knots_m.len() / MAX_DRAW_KNOTS).max(1);
    for k in knots_m.iter().step_by(every) {
        let l = (k * 1e6).log10();
        if l > a && l < b {
            x.extend([l - 1e-7, l, l + 1e-7]);
        }
    }
    crate::physics::order::sort_numbers(&mut x);
    x.dedup();
    x
}

/// Scale `v` to peak 1; returns the values and the peak.
fn normalized(v: Vec<f64>) -> (Vec<f64>, f64) {
    let peak = v.iter().copied().fold(0.0f64, f64::max);
    if peak > 0.0 && peak.is_finite() {
        (v.iter().map(|y| y / peak).collect(), peak)
    } else {
        (vec![0.0; v.len()], 0.0)
    }
}

fn background(sky: &Sky, ambient_k: f64, sun: &SourceSpec, surface_k: f64, range: (f64, f64)) -> Background {
    let (a, b) = (range.0.log10(), range.1.log10());
    let x: Vec<f64> = (0..DRAW_SAMPLES).map(|i| a + (b - a) * i as f64 / (DRAW_SAMPLES - 1) as f64).collect();
    let lambda_m = |v: f64| 10f64.powf(v) * 1e-6;
    let sky_t = x.iter().map(|v| sky.zenith_transmittance(lambda_m(*v), ambient_k)).collect();
    let (sun_rel, sun_peak, sun_name) = match sun.to_source() {
        Ok(src) => {
            // W m^-2 nm^-1 -> W m^-2 um^-1
            let v = x
                .iter()
                .map(|v| {
                    1000.0 * display_value(&src, PlotAxis::Wavelength, PlotQuantity::Irradiance, HC / lambda_m(*v))
                })
                .collect();
            let (rel, peak) = normalized(v);
            (rel, peak, src.name())
        }
        Err(_) => (vec![0.0; x.len()], 0.0, sun.label()),
    };
    // exitance pi B_lambda per um, over its value at Wien's peak (or at the window's edge
    // nearest to the peak, when the peak lies outside the editor's span)
    let per_um = |l_m: f64| exitance_per_wavelength(l_m, surface_k) * 1e-6;
    let peak_m = peak_wavelength(surface_k).clamp(lambda_m(a), lambda_m(b));
    let bb_peak = per_um(peak_m);
    let bb = if bb_peak > 0.0 && bb_peak.is_finite() {
        x.iter().map(|v| per_um(lambda_m(*v)) / bb_peak).collect()
    } else {
        vec![0.0; x.len()]
    };
    let bb_peak = if bb_peak.is_finite() { bb_peak } else { 0.0 };
    Background { x, sky: sky_t, sun: sun_rel, sun_peak, sun_name, bb, bb_peak }
}

/// The temperatures of the P_net(T) curve [K].
pub fn curve_temps(from: f64, to: f64, n: usize) -> Vec<f64> {
    (0..n).map(|i| from + (to - from) * i as f64 / (n - 1) as f64).collect()
}

impl RadiatorCache {
    /// Compute everything for `sc`, the curve coarse when `coarse`. Errors are the
    /// scenario's own messages.
    pub fn compute(
        &mut self,
        sc: &RadiatorScenario,
        coarse: bool,
        sun_shown: &SourceSpec,
    ) -> Result<Arc<RadiatorView>, String> {
        if let Some(((c, sun), r)) = &self.result {
            if *c == coarse && sun == sun_shown && r.scenario == *sc {
                return Ok(r.clone());
            }
        }
        let r = Arc::new(self.compute_new(sc, coarse, sun_shown)?);
        self.result = Some(((coarse, sun_shown.clone()), r.clone()));
        Ok(r)
    }

    fn compute_new(
        &mut self,
        sc: &RadiatorScenario,
        coarse: bool,
        sun_shown: &SourceSpec,
    ) -> Result<RadiatorView, String> {
        let (ev, warnings, emitter, sky) = match &self.last {
            Some((k, done)) if k == sc => done.clone(),
            _ => {
                let setup = sc.to_physics()?;
                let ev = Arc::new(evaluate(&setup.emitter, &setup.surroundings, setup.surface_k));
                let done: Evaluated = (ev, setup.warnings, setup.emitter, setup.surroundings.sky);
                self.last = Some((sc.clone(), done.clone()));
                done
            }
        };
        let report = RadiatorReport::from(&*ev);
        let n = if coarse { CURVE_POINTS_COARSE } else { CURVE_POINTS };
        let curve = ev.balance.curve(&curve_temps(sc.curve_from_k, sc.curve_to_k, n));

        let range = editor_range(&sc.emitter);
        let surface_k = sc.surface_temperature();
        let key: BackgroundKey = (
            sc.sky.clone(),
            sc.ambient_k.to_bits(),
            sc.sun.clone().or_else(|| Some(sun_shown.clone())),
            surface_k.to_bits(),
            (range.0.to_bits(), range.1.to_bits()),
        );
        let bg = match &self.background {
            Some((k, b)) if *k == key => b.clone(),
            _ => {
                let b =
                    Arc::new(background(&sky, sc.ambient_k, sc.sun.as_ref().unwrap_or(sun_shown), surface_k, range));
                self.background = Some((key, b.clone()));
                b
            }
        };

        let xs = samples(range, &emitter.knots());
        let eps = xs.iter().map(|v| emitter.normal(10f64.powf(*v) * 1e-6)).collect();
        let editable = matches!(sc.emitter, EmitterSpec::Points { .. });
        // a layer stack is edited as layers, not as points (and sampling it would build its
        // table a second time)
        let handles = if matches!(sc.emitter, EmitterSpec::Film { .. }) {
            Vec::new()
        } else {
            as_points(&sc.emitter).unwrap_or_default()
        };
        Ok(RadiatorView {
            scenario: sc.clone(),
            report,
            warnings,
            curve,
            fine: !coarse,
            range_um: range,
            profile: ProfileView { x: xs, eps, handles, editable },
            background: bg,
            emitter,
            sky,
        })
    }
}

/// The bars of the balance chart, in order.
pub const BALANCE_BARS: [&str; 5] = ["emitted", "from sky", "from sun", "from air", "net"];

/// Each bar's (start, end) [W/m²]: the waterfall from 0 up by the emitted power, down by each
/// gain, and the net power from 0.
pub fn balance_steps(c: &RadiatorView) -> [(f64, f64); 5] {
    let r = &c.report;
    let e = r.emitted_w_m2;
    let after_sky = e - r.sky_absorbed_w_m2;
    let after_sun = after_sky - r.sun_absorbed_w_m2;
    let net = r.net_w_m2;
    [(0.0, e), (e, after_sky), (after_sky, after_sun), (after_sun, net), (0.0, net)]
}

/// The signed amount each bar stands for, as its label shows it.
pub fn balance_amounts(c: &RadiatorView) -> [f64; 5] {
    let r = &c.report;
    [r.emitted_w_m2, -r.sky_absorbed_w_m2, -r.sun_absorbed_w_m2, -r.parasitic_w_m2, r.net_w_m2]
}

pub mod csv;
pub mod film;
pub mod points;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_page_shows_the_balance_the_cli_computes() {
        let sc = RadiatorScenario::default();
        let mut cache = RadiatorCache::default();
        let v = cache.compute(&sc, false, &SourceSpec::Am15g).unwrap();
        assert_eq!(v.curve.len(), CURVE_POINTS);
        // the same scenario through the same physics call gives the same report
        let p = sc.to_physics().unwrap();
        let r = RadiatorReport::from(&evaluate(&p.emitter, &p.surroundings, p.surface_k));
        assert_eq!(v.report.net_w_m2.to_bits(), r.net_w_m2.to_bits());
        // a coarse curve while dragging, the settled one after
        assert_eq!(cache.compute(&sc, true, &SourceSpec::Am15g).unwrap().curve.len(), CURVE_POINTS_COARSE);
    }

    #[test]
    fn background_blackbody_peaks_at_one() {
        // 300 K: Wien's peak near 9.66 um lies inside the editor's span, so the drawn curve
        // reaches 1 there and nowhere exceeds it (normalized by the exact peak value)
        let sky = Sky::Space;
        let bg = background(&sky, 300.0, &SourceSpec::Am15g, 300.0, EDITOR_RANGE_UM);
        let max = bg.bb.iter().copied().fold(0.0, f64::max);
        assert!(max <= 1.0 + 1e-12 && max > 0.999, "{max}");
        assert!(bg.bb_peak > 0.0 && bg.sun_peak > 0.0);
    }
}
