//! A place under a cloudless sky, and the moments of its days: the glue between
//! [`solar_position`](super::solar_position) (where the sun is) and
//! [`clear_sky`](super::clear_sky) (what light arrives), plus the calendar arithmetic of a
//! day or a year of time steps.
//!
//! * [`moment`]: the sun's position, the relative air mass and the clear-sky spectra at one
//!   civil time.
//! * [`standard_pressure_hpa`]: surface pressure from elevation by the standard atmosphere
//!   (ISO 2533 / U.S. Standard Atmosphere 1976, troposphere: p = 1013.25 (1 - 2.25577e-5
//!   h)^5.25588 hPa, common practice).
//! * [`day_steps`]: the moments of one day from local mean-time midnight, the UTC offset of
//!   the clock being round(longitude / 15) h, at a fixed step.
//!
//! Architecture invariant: pure functions of numbers; bad input is a message, never a panic.

use super::clear_sky::{relative_air_mass, ClearSkyColumns, ClearSkyInput, ClearSkySpectra, SkyModel};
use super::solar_position::{delta_t_estimate, sun_at, CivilTime, Observer, SunPosition, Surface};

/// The air above the place (the clear-sky model's inputs other than geometry).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Atmosphere {
    /// precipitable water [cm]
    pub precipitable_water_cm: f64,
    /// total ozone column [atm-cm]
    pub ozone_atm_cm: f64,
    /// aerosol optical depth at 500 nm (unitless)
    pub aod_500nm: f64,
    /// Angstrom exponent (unitless)
    pub angstrom_exponent: f64,
    /// ground albedo, 0 to 1
    pub ground_albedo: f64,
    /// sky model for the plane of array
    pub sky: SkyModel,
}

/// A place, its receiving plane and its air.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Site {
    /// latitude, longitude, elevation; the pressure [hPa] serves both refraction and the
    /// clear-sky model, the temperature [deg C] only refraction
    pub observer: Observer,
    /// the receiving plane (tilt, azimuth clockwise from north)
    pub surface: Surface,
    pub atmosphere: Atmosphere,
    /// TT - UT1 [s]; `None` for the Espenak & Meeus estimate of the moment's year
    pub delta_t_s: Option<f64>,
}

/// The sun and the light at one moment.
#[derive(Debug, Clone, PartialEq)]
pub struct Moment {
    pub position: SunPosition,
    /// relative optical air mass at the apparent zenith (Kasten & Young 1989), `None` when
    /// the apparent zenith is 90 deg or more
    pub air_mass: Option<f64>,
    /// clear-sky spectra [W m^-2 nm^-1] at the model's 122 wavelengths (zeros at night)
    pub spectra: ClearSkySpectra,
}

/// Surface pressure [hPa] of the standard atmosphere at `elevation_m` [m] (troposphere
/// formula, common practice); kept positive above the formula's range.
pub fn standard_pressure_hpa(elevation_m: f64) -> f64 {
    let base = (1.0 - 2.255_77e-5 * elevation_m).max(1e-6);
    1013.25 * base.powf(5.255_88)
}

/// Day of the year (1 on 1 January) with the fraction of the UTC day, for the clear-sky
/// model's Earth-Sun distance.
fn day_of_year_utc(when: &CivilTime) -> f64 {
    let hours = when.hour as f64 + (when.minute as f64 + when.second / 60.0) / 60.0 - when.utc_offset_h;
    let n = days_from_civil(when.year, when.month, when.day) - days_from_civil(when.year, 1, 1);
    (1.0 + n as f64 + hours / 24.0).clamp(1.0, 367.0)
}

impl Site {
    /// Check the site's own values (the moment's are checked by [`moment`]).
    pub fn check(&self) -> Result<(), String> {
        if !(self.surface.tilt_deg.is_finite() && (0.0..=180.0).contains(&self.surface.tilt_deg)) {
            return Err(format!(
                "tilt {} deg is out of range; give 0 (horizontal) to 180 (facing down)",
                self.surface.tilt_deg
            ));
        }
        self.clear_sky_input(0.0, 0.0, 1.0).check()
    }

    fn clear_sky_input(&self, zenith_deg: f64, incidence_deg: f64, day: f64) -> ClearSkyInput {
        let a = &self.atmosphere;
        ClearSkyInput {
            apparent_zenith_rad: zenith_deg.to_radians(),
            incidence_rad: incidence_deg.to_radians(),
            tilt_rad: self.surface.tilt_deg.to_radians(),
            day_of_year: day,
            pressure_pa: self.observer.pressure_hpa * 100.0,
            precipitable_water_cm: a.precipitable_water_cm,
            ozone_atm_cm: a.ozone_atm_cm,
            aod_500nm: a.aod_500nm,
            angstrom_exponent: a.angstrom_exponent,
            ground_albedo: a.ground_albedo,
            sky: a.sky,
        }
    }
}

/// The sun's position and the clear-sky light at `when` (for many moments at one site,
/// [`PreparedSite`] builds the model's per-wavelength constants once).
pub fn moment(site: &Site, when: &CivilTime) -> Result<Moment, String> {
    PreparedSite::new(site)?.moment(when)
}

/// A checked site with the clear-sky model's constants for its air.
#[derive(Debug, Clone)]
pub struct PreparedSite {
    pub site: Site,
    columns: ClearSkyColumns,
}

impl PreparedSite {
    pub fn new(site: &Site) -> Result<PreparedSite, String> {
        site.check()?;
        Ok(PreparedSite { site: *site, columns: ClearSkyColumns::new(&site.clear_sky_input(0.0, 0.0, 1.0)) })
    }

    /// The sun's position and the clear-sky light at `when`.
    pub fn moment(&self, when: &CivilTime) -> Result<Moment, String> {
        let site = &self.site;
        let dt = site.delta_t_s.unwrap_or_else(|| delta_t_estimate(when.decimal_year()));
        let position = sun_at(when, &site.observer, &site.surface, dt)?;
        let up = position.zenith_deg < 90.0;
        let air_mass = up.then(|| relative_air_mass(position.zenith_deg.to_radians()));
        let spectra = self.columns.spectra(
            position.zenith_deg.clamp(0.0, 180.0).to_radians(),
            position.incidence_deg.to_radians(),
            day_of_year_utc(when),
        );
        Ok(Moment { position, air_mass, spectra })
    }
}

/// Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant's days_from_civil,
/// common practice).
pub fn days_from_civil(year: i32, month: u32, day: u32) -> i64 {
    let y = year as i64 - i64::from(month <= 2);
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let m = month as i64;
    let doy = (153 * (if m > 2 { m - 3 } else { m + 9 }) + 2) / 5 + day as i64 - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe - 719_468
}

/// The proleptic Gregorian date of a day count since 1970-01-01 (inverse of
/// [`days_from_civil`]).
pub fn civil_from_days(z: i64) -> (i32, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    ((yoe + era * 400 + i64::from(m <= 2)) as i32, m, d)
}

/// Number of days in `year` (proleptic Gregorian).
pub fn days_in_year(year: i32) -> i64 {
    days_from_civil(year + 1, 1, 1) - days_from_civil(year, 1, 1)
}

/// The UTC offset [h] of local mean time at `longitude_deg`, whole hours: round(lon / 15).
pub fn mean_time_offset_h(longitude_deg: f64) -> f64 {
    (longitude_deg / 15.0).round()
}

/// The clock times of one day, `step_s` apart, from 00:00 local mean time (offset
/// [`mean_time_offset_h`]) on `year-month-day`; the last step begins before the next
/// midnight. Each time stands for the interval [t, t + step).
pub fn day_steps(year: i32, month: u32, day: u32, longitude_deg: f64, step_s: f64) -> Vec<CivilTime> {
    if !(step_s.is_finite() && step_s >= 1.0) {
        return Vec::new();
    }
    let offset = mean_time_offset_h(longitude_deg);
    let n = (86_400.0 / step_s).ceil() as usize;
    (0..n)
        .map(|k| {
            let s = k as f64 * step_s;
            let hour = (s / 3600.0).floor();
            let minute = ((s - hour * 3600.0) / 60.0).floor();
            let second = s - hour * 3600.0 - minute * 60.0;
            CivilTime { year, month, day, hour: hour as u32, minute: minute as u32, second, utc_offset_h: offset }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn calendar_round_trips_and_knows_leap_years() {
        // common practice: 1970-01-01 is day 0; 2000 is a leap year, 1900 and 2100 are not
        assert_eq!(days_from_civil(1970, 1, 1), 0);
        assert_eq!(days_from_civil(2000, 3, 1) - days_from_civil(2000, 2, 28), 2);
        assert_eq!(days_in_year(2000), 366);
        assert_eq!(days_in_year(1900), 365);
        assert_eq!(days_in_year(2024), 366);
        for z in [-800_000, -1, 0, 59, 10_957, 20_000, 1_000_000] {
            let (y, m, d) = civil_from_days(z);
            assert_eq!(days_from_civil(y, m, d), z);
        }
    }

    #[test]
    fn standard_pressure_at_known_heights() {
        // U.S. Standard Atmosphere 1976 (values from memory): 1013.25 hPa at 0 m, about
        // 898.7 hPa at 1000 m and 795.0 hPa at 2000 m.
        assert!((standard_pressure_hpa(0.0) - 1013.25).abs() < 1e-9);
        assert!((standard_pressure_hpa(1000.0) - 898.75).abs() < 0.2);
        assert!((standard_pressure_hpa(2000.0) - 795.0).abs() < 0.2);
        assert!(standard_pressure_hpa(1e9) > 0.0);
    }

    #[test]
    fn a_day_of_steps_covers_24_hours() {
        let s = day_steps(2024, 6, 21, -105.0, 300.0);
        assert_eq!(s.len(), 288);
        assert_eq!(s[0].utc_offset_h, -7.0);
        assert_eq!((s[287].hour, s[287].minute), (23, 55));
        assert!(day_steps(2024, 6, 21, 0.0, f64::NAN).is_empty());
    }
}
