//! Clear-sky solar spectra: direct normal, diffuse horizontal and plane-of-array global
//! irradiance at 122 wavelengths from 300 to 4000 nm under a cloudless sky, after
//! R. Bird & C. Riordan, SERI/TR-215-2436 (1984), doi:10.2172/5986936, and J. Climate Appl.
//! Meteorol. 25, 87 (1986). Equation numbers below are the report's.
//!
//! Direct normal (Eq. 2-1): I_d = H0 D T_r T_a T_w T_o T_u, with H0 the extraterrestrial
//! spectrum and D the Earth-Sun distance factor of J. W. Spencer, Search 2, 172 (1971),
//! day angle 2 pi (day - 1) / 365. The transmittances (Eqs. 2-4 to 2-11), with lambda in um,
//! M the relative air mass and M' = M p / 101300 Pa the pressure-corrected one:
//!
//! * Rayleigh: T_r = exp(-M' / (lambda^4 (115.6406 - 1.3366 / lambda^2)));
//! * aerosol: T_a = exp(-tau M), tau = tau_500 (lambda / 0.5 um)^(-alpha) (Angstrom);
//! * water vapour: T_w = exp(-0.2385 a_w W M / (1 + 20.07 a_w W M)^0.45), W in cm;
//! * ozone: T_o = exp(-a_o O3 M_o), M_o = (1 + h) / (cos^2 Z + 2 h)^0.5, h = 22 km / 6370 km;
//! * mixed gases: T_u = exp(-1.41 a_u M' / (1 + 118.3 a_u M')^0.45).
//!
//! Diffuse horizontal (Eqs. 3-1 to 3-17): Rayleigh and aerosol scattering, I_r and I_a, and
//! the multiple reflection between ground and sky, I_g, with the aerosol single-scattering
//! albedo omega = 0.945 exp(-0.095 ln^2(lambda / 0.4 um)), asymmetry factor 0.65 (the report's
//! rural aerosol), the sky reflectivity r_s from the transmittances at M = 1.8, and the
//! short-wave correction C_s = ((lambda + 0.55 um) / 1 um)^1.8 below 0.45 um.
//!
//! Relative air mass: F. Kasten & A. T. Young, Appl. Opt. 28, 4735 (1989), at the apparent
//! zenith, M = 1 / (cos Z + 0.50572 (96.07995 deg - Z)^-1.6364). A zenith of 90 deg or more
//! (the sun at or below the horizon) gives zero irradiance.
//!
//! The forms used, where the report's printed text reads otherwise (its value in brackets):
//!
//! * Rayleigh constant 1.3366 (1.335);
//! * mixed-gas constant 118.3 (118.93);
//! * the sky reflectivity (Eq. 3-8) begins with the mixed-gas T_u' (the ozone T_o');
//! * C_s is applied once, to the total scattered irradiance I_r + I_a + I_g (to I_r and I_a
//!   and again to their sum);
//! * air mass of Kasten & Young (1989) (Kasten 1966).
//!
//! Plane of array: beam I_d max(cos theta, 0) for angle of incidence theta, ground
//! reflection (I_d cos Z + I_s) rho_g (1 - cos beta) / 2 for tilt beta, and the sky by
//! [`SkyModel`]: isotropic, I_s (1 + cos beta) / 2, or Hay & Davies (J. E. Hay &
//! J. A. Davies, Proc. First Canadian Solar Radiation Data Workshop, 59 (1980)) applied
//! per wavelength with anisotropy index A = I_d / (H0 D) and beam ratio
//! R_b = max(cos theta, 0) / max(cos Z, 0.01745): I_s (A R_b + (1 - A) (1 + cos beta) / 2).
//!
//! The table (extraterrestrial spectrum and absorption coefficients) is the report's,
//! transcribed by `scripts/extract_clear_sky_tables.py` into `data/clear_sky_tables.csv`.
//!
//! Architecture invariant: pure functions of SI numbers (and the trade's units where stated:
//! cm of precipitable water, atm-cm of ozone); no NaN for any finite input.

use super::sources::Source;
use super::spectrum::{Axis, Quantity, Spectrum};
use std::sync::OnceLock;

/// Number of wavelengths of the model.
pub const CLEAR_SKY_POINTS: usize = 122;

/// Pressure of the model's standard atmosphere [Pa] (the report's reference for M').
const REFERENCE_PRESSURE_PA: f64 = 101_300.0;

/// Smallest cos Z in the Hay-Davies beam ratio (cos 89 deg), so the ratio stays bounded.
const MIN_COS_ZENITH: f64 = 0.01745;

/// How the sky's diffuse light reaches a tilted plane.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SkyModel {
    /// the same radiance from every direction of the sky
    Isotropic,
    /// Hay & Davies (1980) per wavelength: a circumsolar part in proportion to the sky's
    /// transmittance of the beam, the rest isotropic
    HayDavies,
}

/// A place and moment under a cloudless sky.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ClearSkyInput {
    /// apparent (refracted) solar zenith [rad]; pi/2 or more is night
    pub apparent_zenith_rad: f64,
    /// angle between the sun and the plane's normal [rad]
    pub incidence_rad: f64,
    /// tilt of the plane from horizontal [rad], 0 to pi
    pub tilt_rad: f64,
    /// day of the year, 1 to 366 (fractions allowed)
    pub day_of_year: f64,
    /// surface pressure [Pa]
    pub pressure_pa: f64,
    /// precipitable water [cm]
    pub precipitable_water_cm: f64,
    /// total ozone column [atm-cm]
    pub ozone_atm_cm: f64,
    /// aerosol optical depth at 500 nm (unitless)
    pub aod_500nm: f64,
    /// Angstrom exponent of the aerosol optical depth (unitless)
    pub angstrom_exponent: f64,
    /// ground albedo, 0 to 1, the same at every wavelength
    pub ground_albedo: f64,
    /// sky model for the plane of array
    pub sky: SkyModel,
}

impl Default for ClearSkyInput {
    /// The sun overhead at sea level on a horizontal plane, with the atmosphere of the
    /// ASTM G173-03 reference (1.42 cm water, 0.344 atm-cm ozone, aerosol depth 0.084 at
    /// 500 nm) and the report's rural Angstrom exponent 1.14; ground albedo 0.2.
    fn default() -> Self {
        ClearSkyInput {
            apparent_zenith_rad: 0.0,
            incidence_rad: 0.0,
            tilt_rad: 0.0,
            day_of_year: 1.0,
            pressure_pa: 101_325.0,
            precipitable_water_cm: 1.42,
            ozone_atm_cm: 0.344,
            aod_500nm: 0.084,
            angstrom_exponent: 1.14,
            ground_albedo: 0.2,
            sky: SkyModel::HayDavies,
        }
    }
}

/// Accepted ranges, with a hint for each message: (name, value, low, high, unit, hint).
fn ranges(i: &ClearSkyInput) -> [(&'static str, f64, f64, f64, &'static str, &'static str); 10] {
    use std::f64::consts::PI;
    [
        ("solar zenith", i.apparent_zenith_rad, 0.0, PI, "rad", "0 for the sun overhead, pi/2 at the horizon"),
        ("angle of incidence", i.incidence_rad, 0.0, PI, "rad", "0 when the sun faces the plane"),
        ("plane tilt", i.tilt_rad, 0.0, PI, "rad", "0 for horizontal, pi/2 for a wall"),
        ("day of year", i.day_of_year, 1.0, 367.0, "", "1 for 1 January"),
        ("surface pressure", i.pressure_pa, 1.0e3, 1.2e5, "Pa", "101325 at sea level"),
        ("precipitable water", i.precipitable_water_cm, 0.0, 15.0, "cm", "e.g. 1.42"),
        ("ozone column", i.ozone_atm_cm, 0.0, 1.0, "atm-cm", "e.g. 0.344"),
        ("aerosol optical depth at 500 nm", i.aod_500nm, 0.0, 5.0, "", "e.g. 0.084 for clean air"),
        ("Angstrom exponent", i.angstrom_exponent, -1.0, 4.0, "", "e.g. 1.14"),
        ("ground albedo", i.ground_albedo, 0.0, 1.0, "", "e.g. 0.2 for grass, 0.8 for fresh snow"),
    ]
}

impl ClearSkyInput {
    /// Check every input against its accepted range; the message says which one is wrong
    /// and what to give instead.
    pub fn check(&self) -> Result<(), String> {
        for (what, v, lo, hi, unit, hint) in ranges(self) {
            let unit = if unit.is_empty() { String::new() } else { format!(" {unit}") };
            if v.is_nan() {
                return Err(format!("the {what} is not a number; give a value from {lo} to {hi}{unit} ({hint})"));
            }
            if !(lo..=hi).contains(&v) {
                return Err(format!(
                    "the {what} {v}{unit} is out of range; give a value from {lo} to {hi}{unit} ({hint})"
                ));
            }
        }
        Ok(())
    }

    /// The inputs pulled into their accepted ranges (so any finite input gives finite
    /// output; [`ClearSkyInput::check`] is the place that refuses them).
    fn clamped(&self) -> ClearSkyInput {
        let mut c = *self;
        let fix = |v: f64, lo: f64, hi: f64| if v.is_nan() { lo } else { v.clamp(lo, hi) };
        let r = ranges(self);
        c.pressure_pa = fix(c.pressure_pa, 0.0, r[4].3);
        c.precipitable_water_cm = fix(c.precipitable_water_cm, r[5].2, r[5].3);
        c.ozone_atm_cm = fix(c.ozone_atm_cm, r[6].2, r[6].3);
        c.aod_500nm = fix(c.aod_500nm, r[7].2, r[7].3);
        c.angstrom_exponent = fix(c.angstrom_exponent, r[8].2, r[8].3);
        c.ground_albedo = fix(c.ground_albedo, r[9].2, r[9].3);
        c.day_of_year = fix(c.day_of_year, r[3].2, r[3].3);
        c
    }
}

/// The model's table at its 122 wavelengths.
#[derive(Debug, Clone)]
pub struct ClearSkyTable {
    /// wavelength [nm], ascending
    pub wavelength_nm: [f64; CLEAR_SKY_POINTS],
    /// extraterrestrial spectral irradiance at 1 au [W m^-2 nm^-1]
    pub extraterrestrial: [f64; CLEAR_SKY_POINTS],
    /// water-vapour absorption coefficient [per cm of precipitable water]
    pub water: [f64; CLEAR_SKY_POINTS],
    /// ozone absorption coefficient [per atm-cm]
    pub ozone: [f64; CLEAR_SKY_POINTS],
    /// uniformly mixed gas absorption coefficient [per unit air mass]
    pub mixed: [f64; CLEAR_SKY_POINTS],
}

const TABLE_CSV: &str = include_str!("data/clear_sky_tables.csv");

fn parse_table(csv: &str) -> Result<ClearSkyTable, String> {
    let mut cols = [[0.0; CLEAR_SKY_POINTS]; 5];
    let mut row = 0;
    for line in csv.lines().filter(|l| !l.starts_with('#')).skip(1) {
        if row >= CLEAR_SKY_POINTS {
            return Err(format!("more than {CLEAR_SKY_POINTS} rows"));
        }
        let cells: Vec<&str> = line.split(',').collect();
        if cells.len() != 5 {
            return Err(format!("row {row}: {} cells, expected 5", cells.len()));
        }
        for (c, cell) in cells.iter().enumerate() {
            cols[c][row] = cell.trim().parse().map_err(|_| format!("row {row}: '{cell}' is not a number"))?;
        }
        row += 1;
    }
    if row != CLEAR_SKY_POINTS {
        return Err(format!("{row} rows, expected {CLEAR_SKY_POINTS}"));
    }
    let [wavelength_nm, extraterrestrial, water, ozone, mixed] = cols;
    Ok(ClearSkyTable { wavelength_nm, extraterrestrial, water, ozone, mixed })
}

/// The shipped table, parsed once.
pub fn clear_sky_table() -> &'static ClearSkyTable {
    static TABLE: OnceLock<ClearSkyTable> = OnceLock::new();
    TABLE.get_or_init(|| parse_table(TABLE_CSV).expect("the shipped clear-sky table parses"))
}

/// Spectra at the model's wavelengths ([`ClearSkyTable::wavelength_nm`]), all
/// [W m^-2 nm^-1].
#[derive(Debug, Clone, PartialEq)]
pub struct ClearSkySpectra {
    /// direct normal irradiance
    pub direct_normal: [f64; CLEAR_SKY_POINTS],
    /// diffuse irradiance on a horizontal plane
    pub diffuse_horizontal: [f64; CLEAR_SKY_POINTS],
    /// global irradiance on the plane of array (beam + sky + ground)
    pub plane_global: [f64; CLEAR_SKY_POINTS],
}

/// Trapezoid integral over the model's wavelengths [W m^-2] of a spectrum [W m^-2 nm^-1].
pub fn integrate_nm(values: &[f64; CLEAR_SKY_POINTS]) -> f64 {
    let wl = &clear_sky_table().wavelength_nm;
    (1..CLEAR_SKY_POINTS).map(|i| 0.5 * (wl[i] - wl[i - 1]) * (values[i] + values[i - 1])).sum()
}

impl ClearSkySpectra {
    /// Direct normal irradiance over 300-4000 nm [W m^-2].
    pub fn direct_normal_total(&self) -> f64 {
        integrate_nm(&self.direct_normal)
    }
    /// Diffuse horizontal irradiance over 300-4000 nm [W m^-2].
    pub fn diffuse_horizontal_total(&self) -> f64 {
        integrate_nm(&self.diffuse_horizontal)
    }
    /// Plane-of-array global irradiance over 300-4000 nm [W m^-2].
    pub fn plane_global_total(&self) -> f64 {
        integrate_nm(&self.plane_global)
    }
}

/// Earth-Sun distance factor (r0 / r)^2 on day `day` (Spencer 1971).
pub fn distance_factor(day: f64) -> f64 {
    let b = 2.0 * std::f64::consts::PI / 365.0 * (day - 1.0);
    1.00011 + 0.034221 * b.cos() + 0.00128 * b.sin() + 0.000719 * (2.0 * b).cos() + 7.7e-05 * (2.0 * b).sin()
}

/// Relative optical air mass at apparent zenith `zenith_rad` (Kasten & Young 1989); finite
/// for every zenith up to and a little past the horizon (about 38 at 90 deg).
pub fn relative_air_mass(zenith_rad: f64) -> f64 {
    let z_deg = zenith_rad.to_degrees();
    1.0 / (zenith_rad.cos() + 0.50572 * (6.07995 + (90.0 - z_deg)).powf(-1.6364))
}

/// Per-wavelength values of the model that depend on the air but not on the sun's position
/// or the day: built once per place by [`ClearSkyColumns::new`] and reused for every moment.
#[derive(Debug, Clone)]
struct Column {
    /// 1 / (lambda^4 (115.6406 - 1.3366 / lambda^2)), lambda in um (Eq. 2-4)
    rayleigh: f64,
    /// aerosol optical depth at this wavelength (Eq. 2-7)
    tau: f64,
    /// aerosol single-scattering albedo (Eq. 3-16)
    omega: f64,
    /// a_w W (Eq. 2-8)
    water: f64,
    /// a_o O3 (Eq. 2-9)
    ozone: f64,
    /// a_u (Eq. 2-11)
    mixed: f64,
    /// short-wave correction C_s (Eq. 3-17)
    cs: f64,
    /// sky reflectivity r_s (Eq. 3-8, from the transmittances at M = 1.8)
    rs: f64,
}

/// The model's per-wavelength constants for one atmosphere (pressure, water, ozone,
/// aerosol, albedo and sky model of a [`ClearSkyInput`]), ready for any sun position.
#[derive(Debug, Clone)]
pub struct ClearSkyColumns {
    input: ClearSkyInput,
    columns: Vec<Column>,
}

/// Mixed-gas transmittance for a_u M' (Eq. 2-11).
fn mixed_gas(au: f64) -> f64 {
    (-1.41 * au / (1.0 + 118.3 * au).powf(0.45)).exp()
}

/// Water-vapour transmittance for a_w W M (Eq. 2-8).
fn water_vapour(aw: f64) -> f64 {
    (-0.2385 * aw / (1.0 + 20.07 * aw).powf(0.45)).exp()
}

/// Aerosol forward-scattering fraction at cos Z = `cos_z` (Eqs. 3-11 to 3-15, asymmetry
/// factor 0.65).
fn forward_scattering(cos_z: f64) -> f64 {
    let alg = (1.0f64 - 0.65).ln();
    let bfs = alg * (0.0783 + alg * (-0.3824 - alg * 0.5874));
    let afs = alg * (1.459 + alg * (0.1595 + alg * 0.4129));
    1.0 - 0.5 * ((afs + bfs * cos_z) * cos_z).exp()
}

impl ClearSkyColumns {
    /// The constants of `input`'s atmosphere (its geometry and day are ignored). Inputs
    /// outside [`ClearSkyInput::check`]'s ranges are pulled to the nearest accepted value.
    pub fn new(input: &ClearSkyInput) -> ClearSkyColumns {
        let i = input.clamped();
        let t = clear_sky_table();
        let pressure_ratio = i.pressure_pa / REFERENCE_PRESSURE_PA;
        let fs_primed = forward_scattering(1.0 / 1.8);
        let columns = (0..CLEAR_SKY_POINTS)
            .map(|k| {
                let wl = t.wavelength_nm[k];
                let l = wl / 1000.0;
                let rayleigh = 1.0 / (l.powf(4.0) * (115.6406 - 1.3366 / l.powf(2.0)));
                let tau = i.aod_500nm * (wl / 500.0).powf(-i.angstrom_exponent);
                let omega = 0.945 * (-0.095 * (wl / 400.0).ln().powi(2)).exp();
                // Eq. 3-8 at M = 1.8 with T_u' (see the module notes)
                let m = 1.8;
                let tr = (-m * pressure_ratio * rayleigh).exp();
                let rs = mixed_gas(t.mixed[k] * m * pressure_ratio)
                    * water_vapour(t.water[k] * i.precipitable_water_cm * m)
                    * (-(1.0 - omega) * tau * m).exp()
                    * (0.5 * (1.0 - tr) + (1.0 - fs_primed) * tr * (1.0 - (-omega * tau * m).exp()));
                Column {
                    rayleigh,
                    tau,
                    omega,
                    water: t.water[k] * i.precipitable_water_cm,
                    ozone: t.ozone[k] * i.ozone_atm_cm,
                    mixed: t.mixed[k],
                    cs: if wl <= 450.0 { ((wl + 550.0) / 1000.0).powf(1.8) } else { 1.0 },
                    rs,
                }
            })
            .collect();
        ClearSkyColumns { input: i, columns }
    }

    /// The spectra with the sun at apparent zenith `zenith_rad`, at `incidence_rad` to the
    /// plane's normal, on day of year `day` (the plane's tilt is the input's).
    pub fn spectra(&self, zenith_rad: f64, incidence_rad: f64, day: f64) -> ClearSkySpectra {
        let mut out = ClearSkySpectra {
            direct_normal: [0.0; CLEAR_SKY_POINTS],
            diffuse_horizontal: [0.0; CLEAR_SKY_POINTS],
            plane_global: [0.0; CLEAR_SKY_POINTS],
        };
        let zenith = zenith_rad.abs();
        if zenith.is_nan() || zenith >= std::f64::consts::FRAC_PI_2 || zenith.to_degrees() >= 90.0 {
            return out;
        }
        let i = &self.input;
        let t = clear_sky_table();
        let cos_z = zenith.cos();
        let m = relative_air_mass(zenith);
        let d = distance_factor(if day.is_nan() { 1.0 } else { day.clamp(1.0, 367.0) });
        let m_p = m * i.pressure_pa / REFERENCE_PRESSURE_PA;
        let h0 = 22.0 / 6370.0;
        let ozone_mass = (1.0 + h0) / (cos_z * cos_z + 2.0 * h0).sqrt(); // Eq. 2-10
        let fs = forward_scattering(cos_z);

        let cos_aoi = if incidence_rad.is_nan() { 0.0 } else { incidence_rad.cos().max(0.0) };
        let cos_tilt = i.tilt_rad.cos();
        let sky_view = 0.5 * (1.0 + cos_tilt);
        let ground_view = 0.5 * (1.0 - cos_tilt);
        let beam_ratio = cos_aoi / cos_z.max(MIN_COS_ZENITH);
        let rg = i.ground_albedo;

        for (k, c) in self.columns.iter().enumerate() {
            let rayleigh_depth = m_p * c.rayleigh;
            let tr = (-rayleigh_depth).exp(); // Eq. 2-4
            let ta = (-c.tau * m).exp(); // Eq. 2-6
            let tw = water_vapour(c.water * m); // Eq. 2-8
            let to = (-c.ozone * ozone_mass).exp(); // Eq. 2-9
            let tu = mixed_gas(c.mixed * m_p); // Eq. 2-11
            let tas = (-c.omega * c.tau * m).exp(); // Eq. 3-9
            let taa = (-(1.0 - c.omega) * c.tau * m).exp(); // Eq. 3-10

            let h0d = t.extraterrestrial[k] * d;
            let direct = h0d * tr * ta * tw * to * tu; // Eq. 2-1
            let common = h0d * cos_z * to * tu * tw * taa;
            let ir = common * (1.0 - (-0.95 * rayleigh_depth).exp()) * 0.5; // Eq. 3-5, T_r^0.95
            let ia = common * (-1.5 * rayleigh_depth).exp() * (1.0 - tas) * fs; // Eq. 3-6, T_r^1.5
            let ig = (direct * cos_z + ir + ia) * c.rs * rg / (1.0 - c.rs * rg); // Eq. 3-7
            let diffuse = (ir + ia + ig) * c.cs; // Eq. 3-1, C_s once

            let sky = match i.sky {
                SkyModel::Isotropic => diffuse * sky_view,
                SkyModel::HayDavies => {
                    let a = if h0d > 0.0 { direct / h0d } else { 0.0 };
                    (diffuse * (1.0 - a) * sky_view).max(0.0) + (diffuse * a * beam_ratio).max(0.0)
                }
            };
            let ground = (direct * cos_z + diffuse) * rg * ground_view;
            out.direct_normal[k] = direct;
            out.diffuse_horizontal[k] = diffuse;
            out.plane_global[k] = direct * cos_aoi + sky + ground;
        }
        out
    }
}

/// Clear-sky spectra for `input` (see the module notes for the model). Inputs outside
/// [`ClearSkyInput::check`]'s ranges are pulled to the nearest accepted value; the sun at or
/// below the horizon gives zeros. For many moments under one atmosphere, build
/// [`ClearSkyColumns`] once instead.
pub fn clear_sky_spectra(input: &ClearSkyInput) -> ClearSkySpectra {
    let i = input.clamped();
    ClearSkyColumns::new(&i).spectra(input.apparent_zenith_rad, i.incidence_rad, i.day_of_year)
}

/// The plane-of-array global spectrum as a light source on the wavelength axis (SI: [m],
/// [W m^-2 m^-1]), named `name`, for any panel that takes a [`Source`].
pub fn clear_sky_source(spectra: &ClearSkySpectra, name: &str) -> Result<Source, String> {
    let t = clear_sky_table();
    let x: Vec<f64> = t.wavelength_nm.iter().map(|l| l * 1e-9).collect(); // nm -> m
    let y: Vec<f64> = spectra.plane_global.iter().map(|v| v * 1e9).collect(); // per nm -> per m
    let s = Spectrum::new(
        name,
        "clear-sky model of Bird & Riordan (1984), plane-of-array global, 300-4000 nm",
        Axis::Wavelength,
        Quantity::Irradiance,
        x,
        y,
    )
    .map_err(|e| format!("the clear-sky spectrum '{name}' is not usable: {e}"))?;
    Ok(Source::user(s))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_table_is_the_reports() {
        // Checks on the transcription of Bird & Riordan (1984), their table: 122 rows,
        // 300, 305, 310 ... 3800, 3900, 4000 nm; ET trapezoid 1339.34 W/m2; ozone absorbs
        // up to 767.5 nm; water peaks at 22000 (2700 nm), mixed gases at 150 (2800 nm).
        let t = clear_sky_table();
        assert_eq!(&t.wavelength_nm[..3], &[300.0, 305.0, 310.0]);
        assert_eq!(&t.wavelength_nm[CLEAR_SKY_POINTS - 3..], &[3800.0, 3900.0, 4000.0]);
        assert!(t.wavelength_nm.windows(2).all(|w| w[1] > w[0]));
        let et = integrate_nm(&t.extraterrestrial);
        assert!((et - 1339.34).abs() < 0.005, "ET integral {et}");
        let last_ozone = (0..CLEAR_SKY_POINTS).filter(|&k| t.ozone[k] > 0.0).max().unwrap();
        assert_eq!(t.wavelength_nm[last_ozone], 767.5);
        let peak = |c: &[f64; CLEAR_SKY_POINTS]| {
            let k = (0..CLEAR_SKY_POINTS).max_by(|&a, &b| c[a].total_cmp(&c[b])).unwrap();
            (c[k], t.wavelength_nm[k])
        };
        assert_eq!(peak(&t.water), (22000.0, 2700.0));
        assert_eq!(peak(&t.mixed), (150.0, 2800.0));
    }

    #[test]
    fn a_bad_table_is_refused_with_the_row() {
        assert!(parse_table("h\n1,2,3\n").unwrap_err().contains("3 cells"));
        assert!(parse_table("h\n1,2,x,4,5\n").unwrap_err().contains("'x' is not a number"));
        assert!(parse_table("h\n1,2,3,4,5\n").unwrap_err().contains("1 rows"));
    }

    #[test]
    fn the_sun_at_or_below_the_horizon_gives_zeros() {
        for z_deg in [90.0, 90.5, 120.0, 180.0, 1e6] {
            let s =
                clear_sky_spectra(&ClearSkyInput { apparent_zenith_rad: f64::to_radians(z_deg), ..Default::default() });
            assert!(s.plane_global.iter().chain(&s.direct_normal).chain(&s.diffuse_horizontal).all(|&v| v == 0.0));
        }
    }

    #[test]
    fn air_mass_follows_the_secant_away_from_the_horizon() {
        // common practice: M is close to sec Z up to about 60 deg (within 0.5 %) and near 38
        // at the horizon (Kasten & Young 1989 give 38 as the horizon value, recalled)
        for z_deg in [0.0f64, 30.0, 60.0] {
            let sec = 1.0 / z_deg.to_radians().cos();
            assert!((relative_air_mass(z_deg.to_radians()) / sec - 1.0).abs() < 0.005, "{z_deg}");
        }
        assert!((relative_air_mass(90f64.to_radians()) - 38.0).abs() < 0.5);
    }

    #[test]
    fn distance_factor_spans_perihelion_to_aphelion() {
        // Common practice: (r0/r)^2 is about 1.034 in early January and 0.967 in early July
        // (eccentricity about 0.0167; the values from memory).
        assert!((distance_factor(3.0) - 1.034).abs() < 0.002);
        assert!((distance_factor(185.0) - 0.967).abs() < 0.002);
    }

    #[test]
    fn a_wrong_input_is_named_with_its_range() {
        let e = ClearSkyInput { ground_albedo: 1.5, ..Default::default() }.check().unwrap_err();
        assert!(e.contains("ground albedo 1.5") && e.contains("from 0 to 1"), "{e}");
        let e = ClearSkyInput { pressure_pa: f64::NAN, ..Default::default() }.check().unwrap_err();
        assert!(e.contains("surface pressure is not a number"), "{e}");
        assert!(ClearSkyInput::default().check().is_ok());
    }

    #[test]
    fn the_source_carries_the_plane_spectrum() {
        let s = clear_sky_spectra(&ClearSkyInput::default());
        let src = clear_sky_source(&s, "clear sky").unwrap();
        let rel = (src.total_power() - s.plane_global_total()).abs() / s.plane_global_total();
        assert!(rel < 1e-12, "{rel}");
    }
}
