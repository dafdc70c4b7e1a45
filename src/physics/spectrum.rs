//! Tabulated spectra: one type for every spectral axis and quantity, integrated exactly on
//! the table's own points.
//!
//! A [`Spectrum`] keeps its native axis (wavelength, photon energy or wavenumber) and its
//! native quantity (irradiance or photon flux), both stored in SI. Integrals use the
//! trapezoid rule on the tabulated points, i.e. the exact integral of the piecewise-linear
//! interpolant of the tabulated density; a band edge that falls between two points is
//! handled by evaluating that same interpolant at the edge. Cumulative tables make every
//! band query O(log n).
//!
//! Axis changes (for display or export) multiply by the Jacobian |dx/dy| so that the area
//! under each point's neighbourhood is conserved: per wavelength to per energy,
//! y_E = y_lambda * lambda^2 / (hc); per wavelength to per wavenumber, y = y_lambda * lambda^2.

use super::constants::HC;

/// The independent variable of a table, stored in SI.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    /// wavelength [m]
    Wavelength,
    /// photon energy [J]
    PhotonEnergy,
    /// wavenumber [m^-1]
    Wavenumber,
}

impl Axis {
    /// Photon energy [J] at axis coordinate `u` (SI: [m], [J] or [m^-1]): E = hc / lambda,
    /// E, or E = hc nutilde.
    #[inline]
    pub fn energy_at(self, u: f64) -> f64 {
        match self {
            Axis::Wavelength => HC / u,
            Axis::PhotonEnergy => u,
            Axis::Wavenumber => HC * u,
        }
    }

    /// Axis coordinate (SI: [m], [J] or [m^-1]) of photon energy `e` [J]. Energy 0 maps to
    /// +inf wavelength.
    #[inline]
    pub fn coordinate_of_energy(self, e: f64) -> f64 {
        match self {
            Axis::Wavelength => {
                if e > 0.0 {
                    HC / e
                } else {
                    f64::INFINITY
                }
            }
            Axis::PhotonEnergy => e,
            Axis::Wavenumber => e / HC,
        }
    }

    /// Whether the coordinate grows with photon energy.
    #[inline]
    pub fn increases_with_energy(self) -> bool {
        !matches!(self, Axis::Wavelength)
    }
}

/// What a table's values measure, per unit of its axis.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// spectral irradiance [W m^-2 per axis unit]
    Irradiance,
    /// spectral photon flux [photons s^-1 m^-2 per axis unit]
    PhotonFlux,
}

/// Why a table cannot be a spectrum.
#[derive(Debug, Clone, PartialEq)]
pub enum SpectrumError {
    TooFewPoints(usize),
    NotFinite { index: usize },
    NotAscending { index: usize },
    Negative { index: usize },
    NonPositiveAxis { index: usize },
}

impl std::fmt::Display for SpectrumError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SpectrumError::TooFewPoints(n) => {
                write!(f, "a spectrum needs at least two points, this one has {n}")
            }
            SpectrumError::NotFinite { index } => write!(f, "point {} is not a finite number", index + 1),
            SpectrumError::NotAscending { index } => write!(
                f,
                "point {} does not increase along the spectral axis (points must be sorted, without duplicates)",
                index + 1
            ),
            SpectrumError::Negative { index } => write!(f, "point {} has a negative value", index + 1),
            SpectrumError::NonPositiveAxis { index } => {
                write!(f, "point {} has a spectral coordinate that is zero or negative", index + 1)
            }
        }
    }
}

/// A tabulated spectrum with cumulative integrals of power and photon number.
#[derive(Debug, Clone)]
pub struct Spectrum {
    /// Short name shown to users, e.g. "AM1.5G".
    pub name: String,
    /// Where the numbers come from.
    pub provenance: String,
    axis: Axis,
    quantity: Quantity,
    /// axis coordinates, strictly ascending, SI
    x: Vec<f64>,
    /// values in SI per SI axis unit, in the native quantity
    y: Vec<f64>,
    /// irradiance density per axis unit [W m^-2 / axis unit] at each point
    power: Vec<f64>,
    /// photon flux density per axis unit [s^-1 m^-2 / axis unit] at each point
    photons: Vec<f64>,
    /// cumulative trapezoid integrals of `power` and `photons` from the first point
    cum_power: Vec<f64>,
    cum_photons: Vec<f64>,
}

impl Spectrum {
    /// Build a spectrum from SI coordinates `x` ([m], [J] or [m^-1] as `axis` says; strictly
    /// ascending, positive) and SI values `y` ([W m^-2] or [photons s^-1 m^-2] per axis unit
    /// as `quantity` says; finite, non-negative).
    pub fn new(
        name: impl Into<String>,
        provenance: impl Into<String>,
        axis: Axis,
        quantity: Quantity,
        x: Vec<f64>,
        y: Vec<f64>,
    ) -> Result<Spectrum, SpectrumError> {
        let n = x.len().min(y.len());
        if n < 2 || x.len() != y.len() {
            return Err(SpectrumError::TooFewPoints(n));
        }
        for i in 0..n {
            if !x[i].is_finite() || !y[i].is_finite() {
                return Err(SpectrumError::NotFinite { index: i });
            }
            if x[i] <= 0.0 {
                return Err(SpectrumError::NonPositiveAxis { index: i });
            }
            if y[i] < 0.0 {
                return Err(SpectrumError::Negative { index: i });
            }
            if i > 0 && x[i] <= x[i - 1] {
                return Err(SpectrumError::NotAscending { index: i });
            }
        }
        let (power, photons): (Vec<f64>, Vec<f64>) = x
            .iter()
            .zip(&y)
            .map(|(&u, &v)| {
                let e = axis.energy_at(u);
                match quantity {
                    Quantity::Irradiance => (v, v / e),
                    Quantity::PhotonFlux => (v * e, v),
                }
            })
            .unzip();
        let cum_power = cumulative_trapezoid(&x, &power);
        let cum_photons = cumulative_trapezoid(&x, &photons);
        Ok(Spectrum {
            name: name.into(),
            provenance: provenance.into(),
            axis,
            quantity,
            x,
            y,
            power,
            photons,
            cum_power,
            cum_photons,
        })
    }

    /// The native spectral axis.
    pub fn axis(&self) -> Axis {
        self.axis
    }
    /// The native quantity.
    pub fn quantity(&self) -> Quantity {
        self.quantity
    }
    /// Axis coordinates (SI, ascending).
    pub fn coordinates(&self) -> &[f64] {
        &self.x
    }
    /// Values in the native quantity (SI per SI axis unit).
    pub fn values(&self) -> &[f64] {
        &self.y
    }
    /// Irradiance density at each point [W m^-2 per SI axis unit].
    pub fn power_density(&self) -> &[f64] {
        &self.power
    }
    /// Photon flux density at each point [s^-1 m^-2 per SI axis unit].
    pub fn photon_density(&self) -> &[f64] {
        &self.photons
    }
    /// Number of tabulated points.
    pub fn len(&self) -> usize {
        self.x.len()
    }
    /// Whether the table has no points (never, once built).
    pub fn is_empty(&self) -> bool {
        self.x.is_empty()
    }

    /// Photon-energy range covered by the table [J] (low, high).
    pub fn energy_range(&self) -> (f64, f64) {
        let a = self.axis.energy_at(self.x[0]);
        let b = self.axis.energy_at(*self.x.last().unwrap());
        (a.min(b), a.max(b))
    }

    /// Integrated irradiance over the whole table [W m^-2].
    pub fn total_power(&self) -> f64 {
        *self.cum_power.last().unwrap()
    }

    /// Integrated photon flux over the whole table [s^-1 m^-2].
    pub fn total_photon_flux(&self) -> f64 {
        *self.cum_photons.last().unwrap()
    }

    /// Irradiance carried by photons with energy between `e1` and `e2` [J] (any order,
    /// infinity allowed) [W m^-2].
    pub fn power_between(&self, e1: f64, e2: f64) -> f64 {
        self.between(e1, e2, &self.power, &self.cum_power)
    }

    /// Photon flux with energy between `e1` and `e2` [J] [s^-1 m^-2].
    pub fn photon_flux_between(&self, e1: f64, e2: f64) -> f64 {
        self.between(e1, e2, &self.photons, &self.cum_photons)
    }

    /// Photon flux with energy above `e` [J] [s^-1 m^-2]. O(log n).
    pub fn photon_flux_above(&self, e: f64) -> f64 {
        self.photon_flux_between(e, f64::INFINITY)
    }

    /// Photon flux above each energy in `energies` [J] [s^-1 m^-2]. For sorted energies
    /// (the usual sweep) the search walks the table once instead of bisecting per query;
    /// unsorted input falls back to bisection. Same values as [`Spectrum::photon_flux_above`].
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn photon_flux_above_many(&self, energies: &[f64]) -> Vec<f64> {
        let total = self.total_photon_flux();
        let n = self.x.len();
        let mut hint = 0usize;
        energies
            .iter()
            .map(|&e| {
                if e.is_nan() {
                    return 0.0;
                }
                let u = self.axis.coordinate_of_energy(e);
                if !(u > self.x[0]) || u >= self.x[n - 1] {
                    // "above e" is everything at or below u (wavelength axis) or above it
                    let below = if u >= self.x[n - 1] { total } else { 0.0 };
                    return if self.axis.increases_with_energy() { total - below } else { below };
                }
                // move the hint to the segment holding u, then interpolate as cumulative_at
                if self.x[hint] > u || self.x[(hint + 1).min(n - 1)] <= u {
                    let step_ok = hint + 2 < n && self.x[hint + 1] <= u && self.x[hint + 2] > u;
                    hint = if step_ok {
                        hint + 1
                    } else if hint > 0 && self.x[hint - 1] <= u && self.x[hint] > u {
                        hint - 1
                    } else {
                        self.x.partition_point(|&v| v <= u) - 1
                    };
                }
                let i = hint;
                let (x0, x1) = (self.x[i], self.x[i + 1]);
                let t = (u - x0) / (x1 - x0);
                let d_u = self.photons[i] + t * (self.photons[i + 1] - self.photons[i]);
                let below = self.cum_photons[i] + 0.5 * (u - x0) * (self.photons[i] + d_u);
                if self.axis.increases_with_energy() {
                    (total - below).max(0.0)
                } else {
                    below.max(0.0)
                }
            })
            .collect()
    }

    /// Irradiance carried by photons above `e` [J] [W m^-2]. O(log n).
    pub fn power_above(&self, e: f64) -> f64 {
        self.power_between(e, f64::INFINITY)
    }

    /// Integral of `density` between photon energies `e1` and `e2` [J] (any order), in
    /// [density unit x axis unit]; 0 for NaN.
    fn between(&self, e1: f64, e2: f64, density: &[f64], cum: &[f64]) -> f64 {
        if e1.is_nan() || e2.is_nan() {
            return 0.0;
        }
        let (lo, hi) = if e1 <= e2 { (e1, e2) } else { (e2, e1) };
        let (u1, u2) = {
            let a = self.axis.coordinate_of_energy(lo);
            let b = self.axis.coordinate_of_energy(hi);
            if a <= b {
                (a, b)
            } else {
                (b, a)
            }
        };
        (self.cumulative_at(u2, density, cum) - self.cumulative_at(u1, density, cum)).max(0.0)
    }

    /// Integral of the piecewise-linear density from the first point to coordinate `u` (SI),
    /// in [density unit x axis unit].
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    fn cumulative_at(&self, u: f64, density: &[f64], cum: &[f64]) -> f64 {
        let n = self.x.len();
        if !(u > self.x[0]) {
            return 0.0;
        }
        if u >= self.x[n - 1] {
            return cum[n - 1];
        }
        // index of the last point at or below u
        let i = self.x.partition_point(|&v| v <= u) - 1;
        let (x0, x1) = (self.x[i], self.x[i + 1]);
        let t = (u - x0) / (x1 - x0);
        let d_u = density[i] + t * (density[i + 1] - density[i]);
        cum[i] + 0.5 * (u - x0) * (density[i] + d_u)
    }

    /// The density (in the native quantity, SI per SI axis unit) linearly interpolated at
    /// coordinate `u` (SI axis unit); zero outside the table.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn value_at(&self, u: f64) -> f64 {
        let n = self.x.len();
        if !(u >= self.x[0]) || u > self.x[n - 1] {
            return 0.0;
        }
        let i = (self.x.partition_point(|&v| v <= u) - 1).min(n - 2);
        let t = (u - self.x[i]) / (self.x[i + 1] - self.x[i]);
        self.y[i] + t * (self.y[i + 1] - self.y[i])
    }

    /// The same table on another axis and quantity, point by point, with the Jacobian of the
    /// change of variable, so that each point carries the same power (or photon number)
    /// per interval. Exactly invertible up to rounding.
    pub fn converted(&self, axis: Axis, quantity: Quantity) -> Spectrum {
        let mut pts: Vec<(f64, f64)> = self
            .x
            .iter()
            .enumerate()
            .map(|(i, &u)| {
                let e = self.axis.energy_at(u);
                let v_native = match quantity {
                    Quantity::Irradiance => self.power[i],
                    Quantity::PhotonFlux => self.photons[i],
                };
                // density per unit energy first: |du/dE|
                let per_energy = v_native * jacobian_per_energy(self.axis, u);
                let w = axis.coordinate_of_energy(e);
                (w, per_energy / jacobian_per_energy(axis, w))
            })
            .collect();
        super::order::sort_ascending_by(&mut pts, |p| p.0);
        let (x, y): (Vec<f64>, Vec<f64>) = pts.into_iter().unzip();
        Spectrum::new(self.name.clone(), self.provenance.clone(), axis, quantity, x, y)
            .expect("a valid spectrum stays valid under a change of variable")
    }

    /// Multiply every value by `factor` (dimensionless, >= 0), e.g. to scale an irradiance.
    pub fn scaled(&self, factor: f64) -> Spectrum {
        let y = self.y.iter().map(|v| v * factor).collect();
        Spectrum::new(self.name.clone(), self.provenance.clone(), self.axis, self.quantity, self.x.clone(), y)
            .expect("scaling by a finite non-negative factor keeps a spectrum valid")
    }
}

/// |du/dE| for the axis variable u at coordinate `u` (SI): converts a density per unit of u
/// into a density per unit of photon energy. [m J^-1] for wavelength (lambda^2 / hc),
/// 1 for photon energy, [m^-1 J^-1] for wavenumber (1 / hc).
#[inline]
pub fn jacobian_per_energy(axis: Axis, u: f64) -> f64 {
    match axis {
        // lambda = hc/E, |d lambda/dE| = hc/E^2 = lambda^2/hc
        Axis::Wavelength => u * u / HC,
        Axis::PhotonEnergy => 1.0,
        // nutilde = E/hc
        Axis::Wavenumber => 1.0 / HC,
    }
}

/// Running trapezoid-rule integrals of `y` over `x` from the first point (A&S 25.4.1, from
/// memory), in [y unit x x unit].
fn cumulative_trapezoid(x: &[f64], y: &[f64]) -> Vec<f64> {
    let mut out = Vec::with_capacity(x.len());
    let mut acc = 0.0;
    out.push(0.0);
    for i in 1..x.len() {
        acc += 0.5 * (x[i] - x[i - 1]) * (y[i] + y[i - 1]);
        out.push(acc);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ramp() -> Spectrum {
        // irradiance per wavelength: 1 W m^-2 nm^-1 = 1e9 W m^-2 m^-1 from 400 to 800 nm
        let x: Vec<f64> = (0..=40).map(|i| (400.0 + 10.0 * i as f64) * 1e-9).collect();
        let y = vec![1e9; x.len()];
        Spectrum::new("flat", "test", Axis::Wavelength, Quantity::Irradiance, x, y).unwrap()
    }

    #[test]
    fn flat_table_integrates_exactly() {
        let s = ramp();
        assert!((s.total_power() - 400.0).abs() < 1e-9);
        // half the band: 600..800 nm = photons below hc/600nm
        let e600 = HC / 600e-9;
        assert!((s.power_between(0.0, e600) - 200.0).abs() < 1e-9);
        // an edge between points (605 nm) interpolates exactly on a flat table
        let e605 = HC / 605e-9;
        assert!((s.power_above(e605) - 205.0).abs() < 1e-9);
    }

    #[test]
    fn many_queries_match_single_queries() {
        // the walking search must give exactly what bisection gives, sorted or not
        let x: Vec<f64> = (0..300).map(|i| (300.0 + 2.0 * i as f64 + (i % 7) as f64 * 0.1) * 1e-9).collect();
        let y: Vec<f64> = (0..300).map(|i| 1e9 * (1.0 + (i as f64 * 0.37).sin().abs())).collect();
        for axis in [Axis::Wavelength, Axis::PhotonEnergy, Axis::Wavenumber] {
            let s = Spectrum::new("t", "t", Axis::Wavelength, Quantity::Irradiance, x.clone(), y.clone())
                .unwrap()
                .converted(axis, Quantity::Irradiance);
            let mut e: Vec<f64> =
                (0..2000).map(|i| (0.2 + 0.002 * i as f64) * crate::physics::constants::CHARGE).collect();
            let sorted = s.photon_flux_above_many(&e);
            e.reverse();
            let reversed = s.photon_flux_above_many(&e);
            e.reverse();
            for (i, &ei) in e.iter().enumerate() {
                let one = s.photon_flux_above(ei);
                assert!((sorted[i] - one).abs() <= 1e-12 * one.abs().max(1.0), "{axis:?} {i}");
                assert!((reversed[e.len() - 1 - i] - one).abs() <= 1e-12 * one.abs().max(1.0));
            }
        }
    }

    #[test]
    fn rejects_bad_tables() {
        let e = Spectrum::new("x", "t", Axis::Wavelength, Quantity::Irradiance, vec![1.0, 1.0], vec![1.0, 2.0]);
        assert_eq!(e.unwrap_err(), SpectrumError::NotAscending { index: 1 });
        let e = Spectrum::new("x", "t", Axis::Wavelength, Quantity::Irradiance, vec![1.0], vec![1.0]);
        assert_eq!(e.unwrap_err(), SpectrumError::TooFewPoints(1));
        let e = Spectrum::new("x", "t", Axis::Wavelength, Quantity::Irradiance, vec![1.0, 2.0], vec![1.0, -2.0]);
        assert_eq!(e.unwrap_err(), SpectrumError::Negative { index: 1 });
    }
}
