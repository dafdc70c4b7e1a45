//! Turning the scenario into everything the page shows, with caches so that dragging the
//! band gap recomputes only what depends on it: the cell's figures and its J-V curve. The
//! efficiency curve is recomputed only when the light, the cell settings other than the gap,
//! or its band-gap range change; the plotted spectrum only when the source or the plot's
//! axis and quantity change.

use std::sync::Arc;

use crate::physics::constants::{ev, to_ev, CHARGE, HC};
use crate::physics::junction::{best_of, jv_curve, solve_cell, sweep, CellResult};
use crate::physics::sources::Source;
use crate::report::CellReport;
use crate::scenario::{
    CellScenario, CellSetup, PlotAxis, PlotQuantity, Scenario, SourceSpec, ViewSettings, GAP_RANGE_EV,
};

/// Most band gaps computed for the efficiency curve.
pub const CURVE_MAX_POINTS: usize = 1001;
/// Finest band-gap step of the efficiency curve [eV].
pub const CURVE_MIN_STEP_EV: f64 = 0.001;
/// Samples of the J-V curve.
pub const JV_POINTS: usize = 240;
/// Most points drawn for a spectrum (longer tables are thinned, keeping each bucket's
/// extremes, for drawing only; exports keep every point).
const SPECTRUM_DRAW_POINTS: usize = 3000;

/// The efficiency curve for one light and cell template.
#[derive(Debug, Clone)]
pub struct Curve {
    pub gaps_ev: Vec<f64>,
    pub results: Vec<CellResult>,
    /// The best gap, refined between the grid points around the best grid point.
    pub best: Option<CellResult>,
    pub from_ev: f64,
    pub to_ev: f64,
}

/// The source spectrum in the units of the spectrum plot.
#[derive(Debug, Clone)]
pub struct SpectrumView {
    pub axis: PlotAxis,
    pub quantity: PlotQuantity,
    /// plot coordinates, ascending: nm or eV
    pub x: Vec<f64>,
    /// values in display units (see [`SpectrumView::unit`])
    pub y: Vec<f64>,
    /// the plotted window [nm or eV]
    pub x_lo: f64,
    pub x_hi: f64,
    pub name: String,
    /// fraction of the one-sun power and photon flux carried by photons above the gap are
    /// computed per result, not here
    pub total_power: f64,
    pub total_photons: f64,
}

impl SpectrumView {
    /// Unit of the plotted values.
    pub fn unit(&self) -> &'static str {
        unit_of(self.axis, self.quantity)
    }
    /// Unit of the axis.
    pub fn x_unit(&self) -> &'static str {
        match self.axis {
            PlotAxis::Wavelength => "nm",
            PlotAxis::PhotonEnergy => "eV",
        }
    }
    /// Plot coordinate of a photon energy given in eV.
    pub fn x_of_ev(&self, e_ev: f64) -> f64 {
        x_of_energy(self.axis, ev(e_ev))
    }
    /// Photon energy [eV] at a plot coordinate.
    pub fn ev_of_x(&self, x: f64) -> f64 {
        match self.axis {
            PlotAxis::Wavelength => to_ev(HC / (x * 1e-9)),
            PlotAxis::PhotonEnergy => x,
        }
    }
    /// Linear interpolation of the plotted values at `x` (0 outside the table).
    pub fn y_at(&self, x: f64) -> f64 {
        interpolate(&self.x, &self.y, x)
    }
    /// Whether plot coordinate `x` lies on the absorbed side of the gap.
    pub fn absorbed(&self, x: f64, gap_ev: f64) -> bool {
        match self.axis {
            PlotAxis::Wavelength => x <= self.x_of_ev(gap_ev),
            PlotAxis::PhotonEnergy => x >= gap_ev,
        }
    }
}

/// Unit text of a spectrum-plot quantity.
pub fn unit_of(axis: PlotAxis, quantity: PlotQuantity) -> &'static str {
    match (quantity, axis) {
        (PlotQuantity::Irradiance, PlotAxis::Wavelength) => "W m⁻² nm⁻¹",
        (PlotQuantity::Irradiance, PlotAxis::PhotonEnergy) => "W m⁻² eV⁻¹",
        (PlotQuantity::PhotonFlux, PlotAxis::Wavelength) => "s⁻¹ m⁻² nm⁻¹",
        (PlotQuantity::PhotonFlux, PlotAxis::PhotonEnergy) => "s⁻¹ m⁻² eV⁻¹",
    }
}

/// Everything shown for one scenario.
#[derive(Debug, Clone)]
pub struct Computed {
    /// the band gap [eV] as the scenario gives it
    pub gap_ev: f64,
    pub view: ViewSettings,
    pub setup: Arc<CellSetup>,
    pub result: CellResult,
    pub report: CellReport,
    /// (V [V], J [mA/cm^2]) from 0 to Voc
    pub jv: Vec<(f64, f64)>,
    pub curve: Arc<Curve>,
    pub spectrum: Arc<SpectrumView>,
    /// fraction of the incident power carried by photons above the gap
    pub absorbed_power_fraction: f64,
    /// fraction of the incident photons above the gap
    pub absorbed_photon_fraction: f64,
}

/// Caches between renders. Keys are compared in place, so that a large user spectrum is
/// not copied on every drag of the gap.
#[derive(Default)]
pub struct Engine {
    /// the cell scenario (its gap ignored) and its physics inputs
    setup: Option<(CellScenario, Arc<CellSetup>)>,
    /// the curve, valid for the cell scenario of `setup` and this range
    curve: Option<((f64, f64), Arc<Curve>)>,
    spectrum: Option<((SourceSpec, PlotAxis, PlotQuantity), Arc<SpectrumView>)>,
    /// how many times the efficiency curve was computed
    pub curve_runs: u64,
}

/// Whether two cell scenarios agree in everything but the band gap.
pub fn same_but_gap(a: &CellScenario, b: &CellScenario) -> bool {
    a.spectrum == b.spectrum
        && a.concentration.to_bits() == b.concentration.to_bits()
        && a.cell_temp_k.to_bits() == b.cell_temp_k.to_bits()
        && a.ere.to_bits() == b.ere.to_bits()
        && a.emission == b.emission
        && a.approx == b.approx
}

impl Engine {
    /// Compute everything for `s`. Errors are the scenario's own messages.
    pub fn compute(&mut self, s: &Scenario) -> Result<Computed, String> {
        s.view.check()?;
        let setup = match &self.setup {
            Some((k, setup)) if same_but_gap(k, &s.cell) => {
                // only the gap changed: check it the way the scenario does
                let (lo, hi) = GAP_RANGE_EV;
                let g = s.cell.gap_ev;
                if g.is_nan() || !(g >= lo && g <= hi) {
                    // the full check gives the standard message
                    s.cell.to_physics()?;
                }
                let mut one = (**setup).clone();
                one.cell.gap_j = ev(g);
                Arc::new(one)
            }
            _ => {
                let setup = Arc::new(s.cell.to_physics()?);
                let mut template = (*setup).clone();
                template.cell.gap_j = 0.0;
                self.setup = Some((s.cell.clone(), Arc::new(template)));
                // the curve belongs to the previous cell
                self.curve = None;
                setup
            }
        };

        let curve_key = (s.view.curve_from_ev, s.view.curve_to_ev);
        let curve = match &self.curve {
            Some((k, c)) if *k == curve_key => c.clone(),
            _ => {
                let c = Arc::new(efficiency_curve(&setup, s.view.curve_from_ev, s.view.curve_to_ev));
                self.curve_runs += 1;
                self.curve = Some((curve_key, c.clone()));
                c
            }
        };

        let (axis, quantity) = (s.view.spectrum_axis, s.view.spectrum_quantity);
        let spectrum = match &self.spectrum {
            Some(((spec, a, q), v)) if *spec == s.cell.spectrum && *a == axis && *q == quantity => v.clone(),
            _ => {
                let v = Arc::new(spectrum_view(
                    &setup.light.source,
                    &s.cell.spectrum,
                    axis,
                    quantity,
                    SpectrumDetail::Plot,
                ));
                self.spectrum = Some(((s.cell.spectrum.clone(), axis, quantity), v.clone()));
                v
            }
        };

        let result = solve_cell(&setup.light, &setup.cell);
        let report = CellReport::from(&result);
        let jv = jv_curve(&setup.light, &setup.cell, JV_POINTS).into_iter().map(|(v, j)| (v, j / 10.0)).collect();
        let src = &setup.light.source;
        let absorbed_power_fraction = ratio(src.power_above(setup.cell.gap_j), spectrum.total_power);
        let absorbed_photon_fraction = ratio(src.photon_flux_above(setup.cell.gap_j), spectrum.total_photons);
        Ok(Computed {
            gap_ev: s.cell.gap_ev,
            view: s.view.clone(),
            setup,
            result,
            report,
            jv,
            curve,
            spectrum,
            absorbed_power_fraction,
            absorbed_photon_fraction,
        })
    }
}

fn ratio(a: f64, b: f64) -> f64 {
    if b > 0.0 && a.is_finite() {
        (a / b).clamp(0.0, 1.0)
    } else {
        0.0
    }
}

/// The band gaps of the efficiency curve over [from, to] eV.
pub fn curve_gaps(from: f64, to: f64) -> Vec<f64> {
    let span = to - from;
    let n = ((span / CURVE_MIN_STEP_EV).round() as usize + 1).clamp(2, CURVE_MAX_POINTS);
    (0..n).map(|i| from + span * i as f64 / (n - 1) as f64).collect()
}

fn efficiency_curve(setup: &CellSetup, from: f64, to: f64) -> Curve {
    let gaps_ev = curve_gaps(from, to);
    let gaps_j: Vec<f64> = gaps_ev.iter().map(|g| ev(*g)).collect();
    let results = sweep(&setup.light, &setup.cell, &gaps_j);
    let mut best = best_of(&results);
    // refine between the neighbours of the best grid point (golden section)
    if let Some(b) = best {
        let step = ev((to - from) / (gaps_ev.len() - 1) as f64);
        let (mut lo, mut hi) = ((b.gap_j - step).max(ev(from)), (b.gap_j + step).min(ev(to)));
        let eval = |g: f64| {
            let cell = crate::physics::junction::Cell { gap_j: g, ..setup.cell };
            solve_cell(&setup.light, &cell)
        };
        let phi = 0.618_033_988_749_895;
        let mut a = hi - phi * (hi - lo);
        let mut c = lo + phi * (hi - lo);
        let mut ra = eval(a);
        let mut rc = eval(c);
        for _ in 0..40 {
            if ra.efficiency > rc.efficiency {
                hi = c;
                c = a;
                rc = ra;
                a = hi - phi * (hi - lo);
                ra = eval(a);
            } else {
                lo = a;
                a = c;
                ra = rc;
                c = lo + phi * (hi - lo);
                rc = eval(c);
            }
            if hi - lo < ev(1e-7) {
                break;
            }
        }
        let r = if ra.efficiency > rc.efficiency { ra } else { rc };
        if r.efficiency >= b.efficiency {
            best = Some(r);
        }
    }
    Curve { gaps_ev, results, best, from_ev: from, to_ev: to }
}

/// Plot coordinate (nm or eV) of a photon energy [J].
pub fn x_of_energy(axis: PlotAxis, e_j: f64) -> f64 {
    match axis {
        PlotAxis::Wavelength => HC / e_j * 1e9,
        PlotAxis::PhotonEnergy => to_ev(e_j),
    }
}

/// Photon energy [J] at a plot coordinate.
pub fn energy_of_x(axis: PlotAxis, x: f64) -> f64 {
    match axis {
        PlotAxis::Wavelength => HC / (x * 1e-9),
        PlotAxis::PhotonEnergy => ev(x),
    }
}

/// Spectral value at photon energy `e_j` in display units.
pub fn display_value(src: &Source, axis: PlotAxis, quantity: PlotQuantity, e_j: f64) -> f64 {
    let per_j = src.irradiance_per_energy(e_j);
    let per_unit = match axis {
        PlotAxis::PhotonEnergy => per_j * CHARGE,
        PlotAxis::Wavelength => per_j * e_j * e_j / HC * 1e-9,
    };
    let v = match quantity {
        PlotQuantity::Irradiance => per_unit,
        PlotQuantity::PhotonFlux => per_unit / e_j,
    };
    if v.is_finite() && v > 0.0 {
        v
    } else {
        0.0
    }
}

/// The plotted window in photon energy [J].
fn window(src: &Source, spec: &SourceSpec, axis: PlotAxis) -> (f64, f64) {
    match spec {
        SourceSpec::Blackbody { temp_k } => {
            let kt = crate::physics::constants::BOLTZMANN * temp_k;
            match axis {
                PlotAxis::Wavelength => {
                    let peak = 2.897_771_955e-3 / temp_k;
                    (HC / (5.0 * peak), HC / (0.25 * peak))
                }
                PlotAxis::PhotonEnergy => (0.02 * kt, 12.0 * kt),
            }
        }
        SourceSpec::Am15g | SourceSpec::Am15d | SourceSpec::Am0 => {
            let (lo, hi) = src.energy_range();
            match axis {
                PlotAxis::Wavelength => (lo.max(HC / 2500e-9), hi.min(HC / 280e-9)),
                PlotAxis::PhotonEnergy => (lo, hi),
            }
        }
        _ => src.energy_range(),
    }
}

/// How much of a spectrum to keep.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SpectrumDetail {
    /// the plotted window, thinned to a few thousand points
    Plot,
    /// every point of a table over its whole range (the plotted window for a blackbody)
    Export,
}

/// The source in plot units.
pub fn spectrum_view(
    src: &Source,
    spec: &SourceSpec,
    axis: PlotAxis,
    quantity: PlotQuantity,
    detail: SpectrumDetail,
) -> SpectrumView {
    let thin = detail == SpectrumDetail::Plot;
    let (e_lo, e_hi) = match (detail, src) {
        (SpectrumDetail::Export, Source::Table { .. }) => src.energy_range(),
        _ => window(src, spec, axis),
    };
    let (mut x_lo, mut x_hi) = (x_of_energy(axis, e_lo), x_of_energy(axis, e_hi));
    if x_lo > x_hi {
        std::mem::swap(&mut x_lo, &mut x_hi);
    }
    let mut x: Vec<f64> = match src {
        Source::Table { spectrum, .. } => {
            let a = spectrum.axis();
            spectrum
                .coordinates()
                .iter()
                .map(|u| x_of_energy(axis, a.energy_at(*u)))
                .filter(|v| *v >= x_lo * (1.0 - 1e-12) && *v <= x_hi * (1.0 + 1e-12))
                .collect()
        }
        Source::BlackbodySun { .. } => {
            let n = 1200;
            (0..n).map(|i| x_lo + (x_hi - x_lo) * i as f64 / (n - 1) as f64).collect()
        }
    };
    x.sort_by(|a, b| a.total_cmp(b));
    let mut y: Vec<f64> = x.iter().map(|v| display_value(src, axis, quantity, energy_of_x(axis, *v))).collect();
    if thin && x.len() > SPECTRUM_DRAW_POINTS {
        (x, y) = thin_extremes(&x, &y, SPECTRUM_DRAW_POINTS / 2);
    }
    let total_power = src.total_power();
    let total_photons = src.photon_flux_above(0.0);
    SpectrumView { axis, quantity, x, y, x_lo, x_hi, name: src.name(), total_power, total_photons }
}

/// Keep the first, the smallest, the largest and the last point of each of `buckets`
/// equal slices of the x range.
fn thin_extremes(x: &[f64], y: &[f64], buckets: usize) -> (Vec<f64>, Vec<f64>) {
    let (lo, hi) = (x[0], x[x.len() - 1]);
    let width = (hi - lo) / buckets as f64;
    let mut ox = Vec::with_capacity(buckets * 4);
    let mut oy = Vec::with_capacity(buckets * 4);
    let mut i = 0;
    while i < x.len() {
        let b = (((x[i] - lo) / width) as usize).min(buckets - 1);
        let start = i;
        while i < x.len() && ((((x[i] - lo) / width) as usize).min(buckets - 1)) == b {
            i += 1;
        }
        let slice = start..i;
        let (mut imin, mut imax) = (start, start);
        for k in slice.clone() {
            if y[k] < y[imin] {
                imin = k;
            }
            if y[k] > y[imax] {
                imax = k;
            }
        }
        let mut keep = vec![start, imin, imax, i - 1];
        keep.sort_unstable();
        keep.dedup();
        for k in keep {
            ox.push(x[k]);
            oy.push(y[k]);
        }
    }
    (ox, oy)
}

/// Piecewise-linear interpolation on ascending `xs`; 0 outside.
pub fn interpolate(xs: &[f64], ys: &[f64], x: f64) -> f64 {
    if xs.is_empty() || x < xs[0] || x > xs[xs.len() - 1] {
        return 0.0;
    }
    let i = xs.partition_point(|v| *v < x);
    if i == 0 {
        return ys[0];
    }
    let (x0, x1, y0, y1) = (xs[i - 1], xs[i], ys[i - 1], ys[i]);
    if x1 == x0 {
        y1
    } else {
        y0 + (y1 - y0) * (x - x0) / (x1 - x0)
    }
}

/// Index of the point of ascending `xs` nearest to `x`.
pub fn nearest(xs: &[f64], x: f64) -> Option<usize> {
    if xs.is_empty() {
        return None;
    }
    let i = xs.partition_point(|v| *v < x);
    if i == 0 {
        return Some(0);
    }
    if i >= xs.len() {
        return Some(xs.len() - 1);
    }
    Some(if (x - xs[i - 1]) <= (xs[i] - x) { i - 1 } else { i })
}
