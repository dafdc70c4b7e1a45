//! The hot-emitter panel's view models: the blackbody card (its spectrum by Planck, Wien and
//! Rayleigh-Jeans, the peak, the band, and the TPV emitter's own spectrum beside it), the
//! TPV pair (figures, the spectrum exchanged, the J-V curve, the efficiency-power trade-off
//! over band gap) and the solar-thermal absorber (figures, efficiency against temperature,
//! the best step absorber). [`HotCache`] keeps what does not follow every edit: the
//! trade-off waits for a change of anything but the gaps and the connection (and is drawn
//! from fewer gaps while a temperature is dragged); the absorber's curve and best step
//! wait for a change of the light and surroundings.
//!
//! Architecture invariant: figures come from `report::hot` and `report::blackbody`; the
//! scenario's own checks validate every input (nothing here checks a range); numbers are
//! finite (curves drop the points that are not).

pub mod csv;

use std::sync::Arc;

use crate::physics::constants::{ev, to_ev, wavelength_of_energy, HC};
use crate::physics::planck::exitance_per_wavelength;
use crate::physics::tpv::Tpv;
use crate::report::blackbody::{spectrum_row, BlackbodyReport};
use crate::report::hot::{AbsorberReport, TpvReport, TradeoffPoint, TradeoffReport};
use crate::scenario::hot::{AbsorberScenario, BlackbodyScenario, SurfaceSpec, TpvScenario};
use crate::scenario::radiator::EmitterSpec;
use crate::scenario::Connection;

/// Wavelengths per spectrum curve.
pub const SPECTRUM_POINTS: usize = 480;
/// Gaps of the efficiency-power trade-off, and while a temperature is dragged.
pub const TRADEOFF_POINTS: usize = 201;
pub const TRADEOFF_POINTS_COARSE: usize = 31;
/// Points of the J-V curve and of the absorber's efficiency curve.
pub const JV_POINTS: usize = 160;
pub const ABSORBER_POINTS: usize = 241;
/// Wien's peak times these: the blackbody plot's wavelength range on log axes.
pub const LOG_SPAN: (f64, f64) = (0.15, 40.0);
/// Wien's peak times this: the end of the linear wavelength axis.
pub const LINEAR_SPAN: f64 = 6.0;
/// Decades shown below the peak on the logarithmic exitance axis.
pub const LOG_DECADES: f64 = 5.0;

/// W/m2/m in W/m2/um.
const PER_UM: f64 = 1e-6;

/// `n` points from `a` to `b` evenly spaced in log (both > 0).
pub fn log_grid(a: f64, b: f64, n: usize) -> Vec<f64> {
    let (la, lb) = (a.ln(), b.ln());
    let n = n.max(2);
    (0..n).map(|i| (la + (lb - la) * i as f64 / (n - 1) as f64).exp()).collect()
}

// ---------------------------------------------------------------- blackbody

/// The TPV emitter's spectrum drawn on the blackbody card.
#[derive(Debug, Clone, PartialEq)]
pub struct EmitterCurve {
    /// the emitter's profile in words
    pub label: String,
    /// the TPV emitter's temperature [K]
    pub temp_k: f64,
    /// (um, eps x Planck W/m2/um)
    pub points: Vec<[f64; 2]>,
}

/// The blackbody card.
#[derive(Debug, Clone, PartialEq)]
pub struct BlackbodyView {
    pub scenario: BlackbodyScenario,
    pub report: BlackbodyReport,
    /// [um, Planck, Wien, Rayleigh-Jeans] W/m2/um (`report::blackbody::spectrum_row`)
    pub rows: Vec<[f64; 4]>,
    /// the peak (um, W/m2/um)
    pub peak: [f64; 2],
    /// the plotted wavelength range [um] and exitance range [W/m2/um] (linear values)
    pub x_range: (f64, f64),
    pub y_range: (f64, f64),
    /// None when the TPV emitter is black (the card says so)
    pub emitter: Option<EmitterCurve>,
}

/// The blackbody card of `sc`, with the emitter's spectrum of `tpv` when it is not black.
pub fn blackbody_view(sc: &BlackbodyScenario, tpv: &TpvScenario) -> Result<BlackbodyView, String> {
    sc.check()?;
    let t = sc.temp_k;
    let report = BlackbodyReport::new(t, sc.band_um.map(|[a, b]| (a, b)));
    let lp = report.peak_wavelength_um;
    let x_range = if sc.log_axes { (lp * LOG_SPAN.0, lp * LOG_SPAN.1) } else { (0.0, lp * LINEAR_SPAN) };
    let grid_lo = lp * LOG_SPAN.0;
    let rows: Vec<[f64; 4]> = log_grid(grid_lo, x_range.1.max(grid_lo * 2.0), SPECTRUM_POINTS)
        .into_iter()
        .map(|l| spectrum_row(l, t))
        .filter(|r| r.iter().all(|v| v.is_finite()))
        .collect();
    let peak = [lp, exitance_per_wavelength(lp * 1e-6, t) * PER_UM];
    let emitter = emitter_curve(tpv, grid_lo, x_range.1.max(grid_lo * 2.0));
    let top = emitter
        .as_ref()
        .map(|e| e.points.iter().map(|p| p[1]).fold(peak[1], f64::max))
        .unwrap_or(peak[1])
        .max(f64::MIN_POSITIVE);
    let y_range = if sc.log_axes { (peak[1] * 10f64.powf(-LOG_DECADES), top * 3.0) } else { (0.0, top * 1.12) };
    Ok(BlackbodyView { scenario: sc.clone(), report, rows, peak, x_range, y_range, emitter })
}

/// eps x Planck at the TPV emitter's temperature over [lo, hi] um, or None for a black
/// emitter or one the scenario cannot use.
fn emitter_curve(tpv: &TpvScenario, lo: f64, hi: f64) -> Option<EmitterCurve> {
    if matches!(tpv.emitter, EmitterSpec::Blackbody) {
        return None;
    }
    let profile = tpv.emitter.to_profile().ok()?;
    let te = tpv.emitter_temp_k;
    let points = log_grid(lo, hi, SPECTRUM_POINTS)
        .into_iter()
        .map(|l| [l, profile.at(l * 1e-6) * exitance_per_wavelength(l * 1e-6, te) * PER_UM])
        .filter(|p| p[1].is_finite())
        .collect();
    Some(EmitterCurve { label: tpv.emitter.label(), temp_k: te, points })
}

// ---------------------------------------------------------------- TPV

/// One wavelength of the spectrum exchanged between emitter and cell, W/m2/um.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ExchangePoint {
    pub um: f64,
    /// sent out by the emitter (eps x Planck at Te)
    pub emitted: f64,
    /// net absorbed by the cell
    pub absorbed: f64,
    /// returned to the emitter: emitted minus the net leaving it
    pub returned: f64,
    /// at or above the (bottom) gap
    pub above_gap: bool,
}

/// The TPV card.
#[derive(Debug, Clone, PartialEq)]
pub struct TpvView {
    pub scenario: TpvScenario,
    pub report: TpvReport,
    pub exchange: Vec<ExchangePoint>,
    /// the gaps' wavelengths [um], top first
    pub gaps_um: Vec<f64>,
    /// (V, J A/cm2) from short to open circuit; empty for independent subcells
    pub jv: Vec<[f64; 2]>,
    /// the maximum power point (V, A/cm2), when the cell has one voltage
    pub mpp: Option<[f64; 2]>,
    pub tradeoff: Arc<TradeoffReport>,
    /// the design on the trade-off (single junctions only)
    pub design: Option<TradeoffPoint>,
    /// the trade-off was drawn from fewer gaps (a drag is under way)
    pub coarse: bool,
}

/// The trade-off's inputs: the scenario but the gaps and the connection.
fn tradeoff_key(sc: &TpvScenario) -> TpvScenario {
    TpvScenario { gaps_ev: Vec::new(), connection: Connection::Series, ..sc.clone() }
}

/// The spectrum exchanged between `tpv`'s emitter and a cell with `gaps_j` at `volts`.
pub fn exchange_points(tpv: &Tpv, gaps_j: &[f64], volts: &[f64]) -> Vec<ExchangePoint> {
    let setup = tpv.setup();
    let lp = crate::physics::planck::peak_wavelength(setup.emitter_temp_k) * 1e6;
    let bottom_um = gaps_j.last().map(|g| wavelength_of_energy(*g) * 1e6).unwrap_or(lp);
    let lo = (lp * LOG_SPAN.0).min(bottom_um * 0.5);
    let hi = (lp * 12.0).max(bottom_um * 2.0);
    let mut grid = log_grid(lo, hi, SPECTRUM_POINTS);
    // both sides of every gap, so the step shows sharply
    for g in gaps_j {
        let l = wavelength_of_energy(*g) * 1e6;
        grid.extend([l * (1.0 - 1e-9), l * (1.0 + 1e-9)]);
    }
    crate::physics::order::sort_numbers(&mut grid);
    let bottom = gaps_j.last().copied().unwrap_or(f64::INFINITY);
    grid.into_iter()
        .filter_map(|um| {
            let e = HC / (um * 1e-6);
            let (emitted, net_out, absorbed) = tpv.spectral_exchange(e, gaps_j, volts);
            // per unit energy to per um: |dE/dlambda| = hc / lambda^2
            let k = HC / (um * 1e-6).powi(2) * PER_UM;
            let p = ExchangePoint {
                um,
                emitted: emitted * k,
                absorbed: absorbed * k,
                returned: (emitted - net_out) * k,
                above_gap: e >= bottom,
            };
            [p.emitted, p.absorbed, p.returned].iter().all(|v| v.is_finite()).then_some(p)
        })
        .collect()
}

// ---------------------------------------------------------------- absorber

/// The solar-thermal card.
#[derive(Debug, Clone, PartialEq)]
pub struct AbsorberView {
    pub scenario: AbsorberScenario,
    pub report: AbsorberReport,
    /// [T K, thermal, work] (fractions) from ambient to above stagnation
    pub curve: Arc<Vec<[f64; 3]>>,
    /// the best step absorber (or black) at its best temperature
    pub best: Arc<AbsorberReport>,
    pub warnings: Vec<String>,
}

/// The temperatures of the absorber's curve: ambient to 15 % above stagnation (or, when it
/// does not stagnate in range, to four times the larger of ambient and the absorber).
pub fn absorber_range(ambient_k: f64, temp_k: f64, stagnation: Option<f64>) -> (f64, f64) {
    let top = match stagnation {
        Some(s) if s > ambient_k => s * 1.15,
        _ => 4.0 * ambient_k.max(temp_k),
    };
    (ambient_k, top.max(temp_k * 1.05).max(ambient_k + 1.0))
}

// ---------------------------------------------------------------- the cache

/// What the panel keeps between edits.
#[derive(Default)]
pub struct HotCache {
    tradeoff: Option<(TpvScenario, usize, Arc<TradeoffReport>)>,
    absorber: Option<(AbsorberScenario, Arc<Vec<[f64; 3]>>)>,
    best: Option<(AbsorberScenario, Arc<AbsorberReport>)>,
}

impl HotCache {
    /// The TPV card; `coarse` while a temperature is dragged (the trade-off from
    /// [`TRADEOFF_POINTS_COARSE`] gaps unless the full one is at hand).
    pub fn tpv(&mut self, sc: &TpvScenario, coarse: bool) -> Result<TpvView, String> {
        let inputs = sc.to_physics()?;
        let tpv = Tpv::new(&inputs.setup);
        let result = tpv.solve(&inputs.gaps_j, inputs.connection);
        let report = TpvReport::new(&result);
        let volts: Vec<f64> = result.subcells.iter().map(|s| s.vmp).collect();
        let exchange = exchange_points(&tpv, &inputs.gaps_j, &volts);
        let single_voltage = inputs.gaps_j.len() == 1 || sc.connection == Connection::Series;
        let jv: Vec<[f64; 2]> = if single_voltage {
            tpv.jv_curve(&inputs.gaps_j, JV_POINTS).into_iter().map(|(v, j)| [v, j * 1e-4]).collect()
        } else {
            Vec::new()
        };
        let mpp = match (single_voltage, result.vmp, result.jmp) {
            (true, Some(v), Some(j)) => Some([v, j * 1e-4]),
            _ => None,
        };
        let key = tradeoff_key(sc);
        let want = if coarse { TRADEOFF_POINTS_COARSE } else { TRADEOFF_POINTS };
        let tradeoff = match &self.tradeoff {
            Some((k, n, t)) if *k == key && *n >= want => t.clone(),
            _ => {
                let gaps = tradeoff_gaps(sc.sweep_from_ev, sc.sweep_to_ev, want);
                let t = Arc::new(if coarse { coarse_tradeoff(&tpv, &gaps) } else { TradeoffReport::new(&tpv, &gaps) });
                self.tradeoff = Some((key, want, t.clone()));
                t
            }
        };
        let coarse = self.tradeoff.as_ref().is_some_and(|(_, n, _)| *n < TRADEOFF_POINTS);
        let design = (report.subcells.len() == 1).then(|| TradeoffPoint {
            gap_ev: report.subcells[0].gap_ev,
            efficiency: report.efficiency,
            pmax_w_cm2: report.pmax_w_cm2,
        });
        let gaps_um = inputs.gaps_j.iter().map(|g| wavelength_of_energy(*g) * 1e6).collect();
        Ok(TpvView { scenario: sc.clone(), report, exchange, gaps_um, jv, mpp, tradeoff, design, coarse })
    }

    /// The solar-thermal card.
    pub fn absorber(&mut self, sc: &AbsorberScenario) -> Result<AbsorberView, String> {
        let (setup, surface, temp_k, warnings) = sc.to_physics()?;
        let report = AbsorberReport::at(&setup, &surface, temp_k);
        // the curve does not depend on the absorber's temperature, unless it leaves the range
        let key = AbsorberScenario { temp_k: 0.0, ..sc.clone() };
        let curve = match &self.absorber {
            Some((k, c)) if *k == key && c.last().is_some_and(|l| l[0] >= sc.temp_k) => c.clone(),
            _ => {
                let a = crate::physics::solar_thermal::Absorber::new(&setup, &surface);
                let (lo, hi) = absorber_range(sc.ambient_k, sc.temp_k, report.stagnation_temp_k);
                let n = ABSORBER_POINTS;
                let c: Vec<[f64; 3]> = (0..n)
                    .map(|i| {
                        let t = lo + (hi - lo) * i as f64 / (n - 1) as f64;
                        let b = a.balance(t);
                        [t, b.thermal_efficiency, b.work_efficiency]
                    })
                    .collect();
                let c = Arc::new(c);
                self.absorber = Some((key, c.clone()));
                c
            }
        };
        // the best step depends on the light and surroundings only
        let best_key = AbsorberScenario { temp_k: 0.0, surface: SurfaceSpec::Black, ..sc.clone() };
        let best = match &self.best {
            Some((k, b)) if *k == best_key => b.clone(),
            _ => {
                let b = Arc::new(AbsorberReport::best(&setup).0);
                self.best = Some((best_key, b.clone()));
                b
            }
        };
        Ok(AbsorberView { scenario: sc.clone(), report, curve, best, warnings })
    }
}

/// The trade-off drawn while a temperature is dragged: the grid's own best points, not
/// refined (the full [`TradeoffReport`] follows once the slider is let go).
pub fn coarse_tradeoff(tpv: &Tpv, gaps_ev: &[f64]) -> TradeoffReport {
    let gaps_j: Vec<f64> = gaps_ev.iter().map(|&g| ev(g)).collect();
    let points: Vec<TradeoffPoint> = tpv
        .sweep(&gaps_j)
        .iter()
        .map(|p| TradeoffPoint { gap_ev: to_ev(p.gap_j), efficiency: p.efficiency, pmax_w_cm2: p.pmax * 1e-4 })
        .collect();
    let best = |score: fn(&TradeoffPoint) -> f64| {
        points.iter().copied().max_by(|a, b| score(a).total_cmp(&score(b))).unwrap_or(TradeoffPoint {
            gap_ev: 0.0,
            efficiency: 0.0,
            pmax_w_cm2: 0.0,
        })
    };
    let (best_efficiency, best_power) = (best(|p| p.efficiency), best(|p| p.pmax_w_cm2));
    TradeoffReport { points, best_efficiency, best_power }
}

/// `n` gaps evenly spaced from `from` to `to` eV.
pub fn tradeoff_gaps(from: f64, to: f64, n: usize) -> Vec<f64> {
    let n = n.max(2);
    (0..n).map(|i| from + (to - from) * i as f64 / (n - 1) as f64).collect()
}

/// The photon energy [eV] of a wavelength [um].
pub fn ev_of_um(um: f64) -> f64 {
    to_ev(HC / (um * 1e-6))
}

/// The wavelength [um] of a photon energy [eV].
pub fn um_of_ev(e_ev: f64) -> f64 {
    wavelength_of_energy(ev(e_ev)) * 1e6
}

// ---------------------------------------------------------------- texts

/// The blackbody's figures as the page shows them: (hook, label, text), in the command
/// line's digits (`glowgap blackbody`).
pub fn blackbody_figures(r: &BlackbodyReport) -> Vec<(&'static str, &'static str, String)> {
    let mut out = vec![
        ("bb-peak-um", "Peak per unit wavelength", format!("{:.4} µm", r.peak_wavelength_um)),
        ("bb-peak-ev", "Peak per unit energy", format!("{:.4} eV", r.peak_energy_ev)),
        ("bb-exitance", "Exitance σT⁴", format!("{:.6e} W/m²", r.exitance_w_m2)),
        ("bb-photons", "Photon exitance", format!("{:.6e} /(m² s)", r.photon_exitance_m2_s)),
    ];
    if let (Some(w), Some(f)) = (r.band_exitance_w_m2, r.band_fraction) {
        out.push(("bb-band-power", "Band power", format!("{w:.6e} W/m²")));
        out.push(("bb-band-fraction", "Band share of σT⁴", format!("{:.4} %", f * 100.0)));
    }
    out
}

/// An emitter profile in the text form `EmitterSpec::parse` reads (a measured table, which
/// has none, by its label).
pub fn emitter_text(e: &EmitterSpec) -> String {
    let n = |v: f64| format!("{v}");
    match e {
        EmitterSpec::Blackbody => "blackbody".into(),
        EmitterSpec::Grey { emissivity } => format!("grey:{}", n(*emissivity)),
        EmitterSpec::Window { from_um, to_um, inside, outside, edge_um } => {
            let mut t = format!("window:{}-{}", n(*from_um), n(*to_um));
            if *inside != 1.0 {
                t.push_str(&format!(",in={}", n(*inside)));
            }
            if *outside != 0.0 {
                t.push_str(&format!(",out={}", n(*outside)));
            }
            if *edge_um != 0.0 {
                t.push_str(&format!(",edge={}", n(*edge_um)));
            }
            t
        }
        EmitterSpec::Points { points } => {
            let p: Vec<String> = points.iter().map(|[l, e]| format!("{}={}", n(*l), n(*e))).collect();
            format!("points:{}", p.join(","))
        }
        EmitterSpec::File { path } => format!("file:{path}"),
        EmitterSpec::Table(t) => format!("measured: {}", t.name),
        EmitterSpec::Film { .. } => "film".into(),
    }
}

/// Band gaps as people type them: "0.75" or "1.4, 1.2" (commas, semicolons or spaces
/// between gaps; a decimal comma only in a single gap).
pub fn parse_gaps(text: &str) -> Result<Vec<f64>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Err("type one band gap in eV, e.g. 0.75, or a stack's gaps top first, e.g. 1.4, 1.2".into());
    }
    let parts: Vec<&str> = if t.contains(';') || t.contains(", ") || t.matches(',').count() > 1 || t.contains(' ') {
        t.split([';', ',', ' ']).filter(|p| !p.trim().is_empty()).collect()
    } else if t.contains(',') && t.split(',').all(|p| p.trim().contains('.')) {
        t.split(',').collect()
    } else {
        vec![t]
    };
    parts
        .iter()
        .map(|p| {
            crate::view::input::parse_number(p)
                .ok_or_else(|| format!("'{}' is not a band gap; type numbers in eV, e.g. 1.4, 1.2", p.trim()))
        })
        .collect()
}

/// Gaps as the field shows them.
pub fn gaps_text(gaps: &[f64]) -> String {
    gaps.iter().map(|g| format!("{g}")).collect::<Vec<_>>().join(", ")
}

// ---------------------------------------------------------------- drawing helpers

/// The pieces of a polyline inside the box [x0, x1] x [y0, y1], cut where it crosses the
/// edges (plots draw only what is inside their axes). Points with a non-finite coordinate
/// break the line.
pub fn clip_polyline(points: &[(f64, f64)], x: (f64, f64), y: (f64, f64)) -> Vec<Vec<(f64, f64)>> {
    let mut out: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut current: Vec<(f64, f64)> = Vec::new();
    let finite = |p: &(f64, f64)| p.0.is_finite() && p.1.is_finite();
    for w in points.windows(2) {
        let (a, b) = (w[0], w[1]);
        let seg = if finite(&a) && finite(&b) { clip_segment(a, b, x, y) } else { None };
        match seg {
            Some((p, q)) => {
                let joined = current.last().is_some_and(|l| *l == p);
                if !joined {
                    if current.len() > 1 {
                        out.push(std::mem::take(&mut current));
                    }
                    current.clear();
                    current.push(p);
                }
                current.push(q);
                if q != b {
                    out.push(std::mem::take(&mut current));
                }
            }
            None => {
                if current.len() > 1 {
                    out.push(std::mem::take(&mut current));
                }
                current.clear();
            }
        }
    }
    if current.len() > 1 {
        out.push(current);
    }
    out
}

/// The part of segment a-b inside the box (Liang-Barsky), if any.
fn clip_segment(a: (f64, f64), b: (f64, f64), x: (f64, f64), y: (f64, f64)) -> Option<((f64, f64), (f64, f64))> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for (p, q) in [(-dx, a.0 - x.0), (dx, x.1 - a.0), (-dy, a.1 - y.0), (dy, y.1 - a.1)] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let r = q / p;
            if p < 0.0 {
                t0 = t0.max(r);
            } else {
                t1 = t1.min(r);
            }
        }
    }
    if t0 > t1 {
        return None;
    }
    let at = |t: f64| {
        if t == 0.0 {
            a
        } else if t == 1.0 {
            b
        } else {
            (a.0 + t * dx, a.1 + t * dy)
        }
    };
    Some((at(t0), at(t1)))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::solar_thermal::best_cutoff;
    use crate::scenario::hot::HotScenario;

    #[test]
    fn band_fraction_is_the_reports() {
        let sc = BlackbodyScenario { temp_k: 1500.0, band_um: Some([1.0, 3.0]), ..BlackbodyScenario::default() };
        let v = blackbody_view(&sc, &TpvScenario::default()).unwrap();
        let r = BlackbodyReport::new(1500.0, Some((1.0, 3.0)));
        assert_eq!(v.report, r);
        let f = v.report.band_fraction.unwrap();
        assert!(f > 0.4 && f < 0.7, "{f}");
        // the peak is Wien's and the plotted curve peaks there
        let top = v.rows.iter().map(|r| r[1]).fold(0.0, f64::max);
        assert!((top - v.peak[1]).abs() < 1e-4 * v.peak[1], "{top} {}", v.peak[1]);
        assert!((v.peak[0] - 2897.77 / 1500.0).abs() < 1e-3);
        assert!(v.emitter.is_none(), "a black emitter draws nothing more");
    }

    #[test]
    fn curves_are_finite_on_both_axes() {
        for log_axes in [true, false] {
            for t in [1.0, 300.0, 1500.0, 6000.0, 1e6] {
                let sc = BlackbodyScenario { temp_k: t, log_axes, ..BlackbodyScenario::default() };
                let tpv = TpvScenario { emitter: EmitterSpec::Grey { emissivity: 0.5 }, ..TpvScenario::default() };
                let v = blackbody_view(&sc, &tpv).unwrap();
                assert!(v.rows.len() > SPECTRUM_POINTS / 2, "{t}");
                assert!(v.rows.iter().flatten().all(|x| x.is_finite()));
                assert!(v.y_range.1 > v.y_range.0 && v.x_range.1 > v.x_range.0);
                let e = v.emitter.as_ref().unwrap();
                assert!(e.points.iter().all(|p| p[1].is_finite() && p[1] >= 0.0));
            }
        }
    }

    #[test]
    fn tpv_view_matches_the_report_and_the_tradeoff_marks_its_optima() {
        let sc = TpvScenario::default();
        let mut cache = HotCache::default();
        let v = cache.tpv(&sc, false).unwrap();
        let inputs = sc.to_physics().unwrap();
        let r = TpvReport::new(&Tpv::new(&inputs.setup).solve(&inputs.gaps_j, inputs.connection));
        assert_eq!(v.report, r);
        assert!(!v.coarse);
        assert_eq!(v.tradeoff.points.len(), TRADEOFF_POINTS);
        let gaps = tradeoff_gaps(sc.sweep_from_ev, sc.sweep_to_ev, TRADEOFF_POINTS);
        let t = TradeoffReport::new(&Tpv::new(&inputs.setup), &gaps);
        assert_eq!(*v.tradeoff, t, "the markers are the report's optima");
        // every point lies at or below the optima
        for p in &v.tradeoff.points {
            assert!(p.efficiency <= t.best_efficiency.efficiency + 1e-12);
            assert!(p.pmax_w_cm2 <= t.best_power.pmax_w_cm2 * (1.0 + 1e-12));
        }
        // the design sits on the trade-off curve
        let d = v.design.unwrap();
        assert_eq!(d.gap_ev, 0.75);
        assert!((d.efficiency - r.efficiency).abs() < 1e-15);
        // the spectrum: finite, the absorbed part never above the emitted, nothing absorbed
        // below the gap by a cell that reflects everything there
        assert!(v.exchange.len() > SPECTRUM_POINTS);
        for p in &v.exchange {
            assert!(p.absorbed <= p.emitted * (1.0 + 1e-9) + 1e-9, "{p:?}");
            if !p.above_gap {
                assert!(p.absorbed.abs() <= 1e-9 * p.emitted.max(1.0), "{p:?}");
            }
        }
        // the J-V curve runs from Jsc to Voc
        let (first, last) = (v.jv[0], *v.jv.last().unwrap());
        assert!((first[1] - r.jsc_a_cm2).abs() < 1e-9 * r.jsc_a_cm2);
        assert!((last[0] - r.voc_v).abs() < 1e-6, "{last:?} {}", r.voc_v);
        assert!(v.jv.iter().flatten().all(|x| x.is_finite()));
    }

    #[test]
    fn tradeoff_is_kept_for_gap_edits_and_coarse_while_dragging() {
        let mut cache = HotCache::default();
        let sc = TpvScenario::default();
        let a = cache.tpv(&sc, false).unwrap();
        let b = cache.tpv(&TpvScenario { gaps_ev: vec![0.6], ..sc.clone() }, false).unwrap();
        assert!(Arc::ptr_eq(&a.tradeoff, &b.tradeoff));
        let hot = TpvScenario { emitter_temp_k: 2100.0, ..sc.clone() };
        let c = cache.tpv(&hot, true).unwrap();
        assert!(c.coarse && c.tradeoff.points.len() == TRADEOFF_POINTS_COARSE);
        let d = cache.tpv(&hot, false).unwrap();
        assert!(!d.coarse && d.tradeoff.points.len() == TRADEOFF_POINTS);
        // the coarse points are the report's at the same gaps
        let inputs = hot.to_physics().unwrap();
        let gaps = tradeoff_gaps(hot.sweep_from_ev, hot.sweep_to_ev, TRADEOFF_POINTS_COARSE);
        assert_eq!(c.tradeoff.points, TradeoffReport::new(&Tpv::new(&inputs.setup), &gaps).points);
        // a full trade-off serves a coarse request
        let e = cache.tpv(&hot, true).unwrap();
        assert!(Arc::ptr_eq(&d.tradeoff, &e.tradeoff) && !e.coarse);
    }

    #[test]
    fn independent_stacks_draw_no_jv_curve() {
        let sc = TpvScenario { gaps_ev: vec![1.2, 0.7], connection: Connection::Independent, ..TpvScenario::default() };
        let v = HotCache::default().tpv(&sc, false).unwrap();
        assert!(v.jv.is_empty() && v.mpp.is_none() && v.design.is_none());
        assert_eq!(v.gaps_um.len(), 2);
    }

    #[test]
    fn absorber_curve_spans_stagnation_and_best_is_the_physics() {
        let sc = HotScenario::default().absorber;
        let v = HotCache::default().absorber(&sc).unwrap();
        let stag = v.report.stagnation_temp_k.unwrap();
        let (lo, hi) = (v.curve[0][0], v.curve.last().unwrap()[0]);
        assert_eq!(lo, sc.ambient_k);
        assert!(hi > stag && hi > sc.temp_k);
        assert!(v.curve.iter().flatten().all(|x| x.is_finite()));
        // thermal efficiency crosses zero at stagnation
        let after = v.curve.iter().find(|p| p[0] > stag * 1.01).unwrap();
        assert!(after[1] < 0.0);
        let (setup, _, _, _) = sc.to_physics().unwrap();
        let b = best_cutoff(&setup);
        assert_eq!(v.best.best_temp_k, Some(b.temp_k));
        assert!((v.best.work_efficiency - b.work_efficiency).abs() < 1e-9);
    }

    #[test]
    fn bad_input_is_the_scenarios_message() {
        let sc = TpvScenario { view_factor: 1.5, ..TpvScenario::default() };
        let e = HotCache::default().tpv(&sc, false).unwrap_err();
        assert!(e.contains("view factor"), "{e}");
        let sc = BlackbodyScenario { band_um: Some([3.0, 1.0]), ..BlackbodyScenario::default() };
        assert!(blackbody_view(&sc, &TpvScenario::default()).unwrap_err().contains("band"));
    }

    #[test]
    fn texts_read_back() {
        for t in [
            "blackbody",
            "grey:0.8",
            "window:1-2.5,out=0.1",
            "window:1-2,in=0.9,edge=0.2",
            "points:0.5=0.9,2=0.9,3=0.1",
        ] {
            let spec = EmitterSpec::parse(t).unwrap();
            assert_eq!(EmitterSpec::parse(&emitter_text(&spec)).unwrap(), spec, "{t}");
        }
        assert_eq!(parse_gaps("0.75").unwrap(), vec![0.75]);
        assert_eq!(parse_gaps("0,75").unwrap(), vec![0.75]);
        assert_eq!(parse_gaps("1.4, 1.2").unwrap(), vec![1.4, 1.2]);
        assert_eq!(parse_gaps("1.4,1.2").unwrap(), vec![1.4, 1.2]);
        assert_eq!(parse_gaps("1.4; 1.2 0.7").unwrap(), vec![1.4, 1.2, 0.7]);
        assert_eq!(parse_gaps(&gaps_text(&[1.4, 0.75])).unwrap(), vec![1.4, 0.75]);
        assert!(parse_gaps("1.4, x").unwrap_err().contains("'x'"));
        assert!(parse_gaps(" ").is_err());
        let f = blackbody_figures(&BlackbodyReport::new(1500.0, Some((1.0, 3.0))));
        assert_eq!(f.len(), 6);
        assert_eq!(f[0].2, "1.9318 µm");
    }

    #[test]
    fn clipping_cuts_at_the_edges() {
        let pts = [(0.0, 0.0), (1.0, 2.0), (2.0, 0.0), (3.0, 0.5)];
        let parts = clip_polyline(&pts, (0.0, 3.0), (0.0, 1.0));
        assert_eq!(parts.len(), 2);
        assert_eq!(parts[0], vec![(0.0, 0.0), (0.5, 1.0)]);
        assert_eq!(parts[1], vec![(1.5, 1.0), (2.0, 0.0), (3.0, 0.5)]);
        assert!(clip_polyline(&[(0.0, 5.0), (1.0, 6.0)], (0.0, 1.0), (0.0, 1.0)).is_empty());
        assert_eq!(clip_polyline(&[(0.0, f64::NAN), (1.0, 0.5), (2.0, 0.5)], (0.0, 2.0), (0.0, 1.0)).len(), 1);
    }
}
