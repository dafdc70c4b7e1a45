//! A light source as the spectrum plots show it: in nm or eV, as irradiance or photon flux,
//! thinned for drawing, with the unit texts of the axes. Shared by the cell and stack panels.
//!
//! Architecture invariant: unit conversions go through `physics::constants` (`ev`, `to_ev`,
//! `HC`) and `Spectrum`'s own axes; nothing here types in a physical number.

use crate::physics::constants::{energy_of_wavelength, ev, to_ev, wavelength_of_energy, CHARGE};
use crate::physics::sources::Source;
use crate::physics::spectrum::{jacobian_per_energy, Axis};
use crate::scenario::{PlotAxis, PlotQuantity, SourceSpec};
use crate::view::input::ev_of_nm;

/// Most points drawn for a spectrum (longer tables are thinned, keeping each bucket's
/// extremes, for drawing only; exports keep every point).
const SPECTRUM_DRAW_POINTS: usize = 3000;

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
            PlotAxis::Wavelength => ev_of_nm(x),
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

/// Plot coordinate (nm or eV) of a photon energy [J].
pub fn x_of_energy(axis: PlotAxis, e_j: f64) -> f64 {
    match axis {
        PlotAxis::Wavelength => wavelength_of_energy(e_j) * 1e9,
        PlotAxis::PhotonEnergy => to_ev(e_j),
    }
}

/// Photon energy [J] at a plot coordinate.
pub fn energy_of_x(axis: PlotAxis, x: f64) -> f64 {
    match axis {
        PlotAxis::Wavelength => energy_of_wavelength(x * 1e-9),
        PlotAxis::PhotonEnergy => ev(x),
    }
}

/// Spectral value at photon energy `e_j` in display units.
pub fn display_value(src: &Source, axis: PlotAxis, quantity: PlotQuantity, e_j: f64) -> f64 {
    let per_j = src.irradiance_per_energy(e_j);
    let per_unit = match axis {
        PlotAxis::PhotonEnergy => per_j * CHARGE,
        // per m of wavelength through the change of variable, then per nm
        PlotAxis::Wavelength => per_j / jacobian_per_energy(Axis::Wavelength, wavelength_of_energy(e_j)) * 1e-9,
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
                    let peak = crate::physics::planck::peak_wavelength(*temp_k);
                    (energy_of_wavelength(5.0 * peak), energy_of_wavelength(0.25 * peak))
                }
                PlotAxis::PhotonEnergy => (0.02 * kt, 12.0 * kt),
            }
        }
        SourceSpec::Am15g | SourceSpec::Am15d | SourceSpec::Am0 => {
            let (lo, hi) = src.energy_range();
            match axis {
                PlotAxis::Wavelength => (lo.max(energy_of_wavelength(2500e-9)), hi.min(energy_of_wavelength(280e-9))),
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
    crate::physics::order::sort_numbers(&mut x);
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
        crate::physics::order::sort_indices(&mut keep);
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

/// Axis title of the spectrum's values.
pub fn value_name(q: PlotQuantity) -> &'static str {
    match q {
        PlotQuantity::Irradiance => "Spectral irradiance",
        PlotQuantity::PhotonFlux => "Spectral photon flux",
    }
}

/// Axis title of the spectral axis.
pub fn axis_name(a: PlotAxis) -> &'static str {
    match a {
        PlotAxis::Wavelength => "Wavelength",
        PlotAxis::PhotonEnergy => "Photon energy",
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::constants::HC;

    #[test]
    fn plotted_values_change_variable_exactly() {
        // a density per nm times d(lambda) equals the density per eV times d(E): with
        // lambda = hc/E, |dE/d lambda| = E^2/(hc) (definition of a spectral density)
        let src = Source::am15g();
        for nm in [400.0, 555.5, 1000.0, 2000.0] {
            let e = energy_of_wavelength(nm * 1e-9);
            let per_nm = display_value(&src, PlotAxis::Wavelength, PlotQuantity::Irradiance, e);
            let per_ev = display_value(&src, PlotAxis::PhotonEnergy, PlotQuantity::Irradiance, e);
            let de_ev_per_nm = e * e / HC * 1e-9 / CHARGE;
            assert!((per_nm - per_ev * de_ev_per_nm).abs() <= 1e-12 * per_nm, "{nm} nm");
            // photon flux = irradiance / photon energy
            let flux = display_value(&src, PlotAxis::Wavelength, PlotQuantity::PhotonFlux, e);
            assert!((flux * e - per_nm).abs() <= 1e-12 * per_nm);
        }
    }

    #[test]
    fn the_plotted_am15g_integrates_to_its_power() {
        // ASTM G173-03 global tilt: 1000.37 W/m2 over 280-4000 nm (the table's own integral);
        // the plot shows 280-2500 nm, which holds all but about 1.5 % of it (common practice)
        let src = Source::am15g();
        let spec = SourceSpec::Am15g;
        let v = spectrum_view(&src, &spec, PlotAxis::Wavelength, PlotQuantity::Irradiance, SpectrumDetail::Export);
        let sum: f64 = v.x.windows(2).zip(v.y.windows(2)).map(|(x, y)| 0.5 * (y[0] + y[1]) * (x[1] - x[0])).sum();
        assert!((sum / src.total_power() - 1.0).abs() < 1e-6, "{sum}");
        let plot = spectrum_view(&src, &spec, PlotAxis::Wavelength, PlotQuantity::Irradiance, SpectrumDetail::Plot);
        assert!((plot.x_lo - 280.0).abs() < 1e-6 && (plot.x_hi - 2500.0).abs() < 1e-6);
    }

    #[test]
    fn names_and_interpolation() {
        assert_eq!(axis_name(PlotAxis::Wavelength), "Wavelength");
        assert_eq!(value_name(PlotQuantity::PhotonFlux), "Spectral photon flux");
        assert_eq!(interpolate(&[1.0, 2.0], &[10.0, 20.0], 1.5), 15.0);
        assert_eq!(interpolate(&[1.0, 2.0], &[10.0, 20.0], 3.0), 0.0);
        assert_eq!(nearest(&[1.0, 2.0, 4.0], 2.9), Some(1));
        assert_eq!(nearest(&[], 1.0), None);
    }
}
