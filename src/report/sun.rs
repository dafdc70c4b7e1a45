//! The sun and the clear-sky light at one place and moment in display units (deg, W/m2,
//! W/m2/nm, local clock times): the JSON of `glowgap sun`, the rows of its table and of its
//! spectrum CSV.
//!
//! Architecture invariant: numbers come from `physics::site` (hence `solar_position` and
//! `clear_sky`); this module only converts units, names the keys and writes clock times.

use crate::physics::clear_sky::{clear_sky_table, integrate_nm};
use crate::physics::site::Moment;
use crate::physics::solar_position::SunDay;
use crate::scenario::place::{clock, PlaceSpec};
use serde::Serialize;

/// What the light figures assume, for every output.
pub const CLOUDLESS_NOTE: &str =
    "clear sky, no clouds: the irradiances are those of a cloudless sky; clouds change them";

/// The columns of the spectrum CSV, first line after the comments.
pub const SPECTRUM_COLUMNS: &str =
    "wavelength_nm,direct_normal_w_m2_nm,diffuse_horizontal_w_m2_nm,plane_of_array_w_m2_nm";

/// The sun and the light at one place and moment. Field names are the command line's JSON
/// keys.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SunReport {
    /// the moment as given (ISO 8601 with its UTC offset)
    pub time: String,
    pub lat_deg: f64,
    pub lon_deg: f64,
    pub elevation_m: f64,
    /// the surface pressure in use [hPa] (given, or the standard atmosphere's)
    pub pressure_hpa: f64,
    /// TT - UT1 in use [s]
    pub delta_t_s: f64,
    /// the receiving plane: tilt from horizontal and azimuth clockwise from north [deg]
    pub plane_tilt_deg: f64,
    pub plane_azimuth_deg: f64,
    /// `isotropic` or `hay-davies`
    pub sky_model: &'static str,
    /// topocentric zenith angle with refraction [deg]
    pub zenith_deg: f64,
    /// the sun's azimuth, clockwise from north [deg]
    pub azimuth_deg: f64,
    /// angle between the sun and the plane's normal [deg]
    pub incidence_deg: f64,
    /// relative optical air mass at the apparent zenith (Kasten & Young 1989), not
    /// pressure-corrected; `None` with the sun at or below the horizon
    pub air_mass: Option<f64>,
    /// apparent minus mean solar time [min]
    pub equation_of_time_min: f64,
    /// Earth-Sun distance [AU]
    pub earth_sun_distance_au: f64,
    /// totals over 300-4000 nm (trapezoid over the model's 122 wavelengths) [W/m2]
    pub direct_normal_w_m2: f64,
    pub diffuse_horizontal_w_m2: f64,
    /// direct normal times cos(zenith) plus diffuse horizontal
    pub global_horizontal_w_m2: f64,
    pub plane_of_array_w_m2: f64,
    /// `rises-and-sets`, `polar-day` (the sun stays up) or `polar-night` (it stays down)
    pub daylight: &'static str,
    /// local clock times (`hh:mm`, the time's own UTC offset) of that date; sunrise and
    /// sunset `None` on polar day or night
    pub sunrise: Option<String>,
    pub solar_noon: String,
    pub sunset: Option<String>,
    pub note: &'static str,
}

impl SunReport {
    /// The report of `moment` at `place` and `time` (its text), with the day's events
    /// `day` and the delta T in use [s].
    pub fn new(place: &PlaceSpec, time: &str, moment: &Moment, day: &SunDay, delta_t_s: f64) -> SunReport {
        let p = &moment.position;
        let s = &moment.spectra;
        let up = p.zenith_deg < 90.0;
        let direct = if up { integrate_nm(&s.direct_normal) } else { 0.0 };
        let diffuse = if up { integrate_nm(&s.diffuse_horizontal) } else { 0.0 };
        let plane = if up { integrate_nm(&s.plane_global) } else { 0.0 };
        let (daylight, sunrise, solar_noon, sunset) = match *day {
            SunDay::RiseAndSet { sunrise_h, transit_h, sunset_h } => {
                ("rises-and-sets", Some(clock(sunrise_h)), clock(transit_h), Some(clock(sunset_h)))
            }
            SunDay::PolarDay { transit_h } => ("polar-day", None, clock(transit_h), None),
            SunDay::PolarNight { transit_h } => ("polar-night", None, clock(transit_h), None),
        };
        SunReport {
            time: time.trim().to_string(),
            lat_deg: place.lat_deg,
            lon_deg: place.lon_deg,
            elevation_m: place.elevation_m,
            pressure_hpa: place.pressure_now_hpa(),
            delta_t_s,
            plane_tilt_deg: place.tilt_deg,
            plane_azimuth_deg: place.azimuth_deg,
            sky_model: place.sky_model.label(),
            zenith_deg: p.zenith_deg,
            azimuth_deg: p.azimuth_deg,
            incidence_deg: p.incidence_deg,
            air_mass: moment.air_mass,
            equation_of_time_min: p.equation_of_time_min,
            earth_sun_distance_au: p.distance_au,
            direct_normal_w_m2: direct,
            diffuse_horizontal_w_m2: diffuse,
            global_horizontal_w_m2: if up { direct * p.zenith_deg.to_radians().cos() + diffuse } else { 0.0 },
            plane_of_array_w_m2: plane,
            daylight,
            sunrise,
            solar_noon,
            sunset,
            note: CLOUDLESS_NOTE,
        }
    }

    /// The rows of the table: label (with its unit) and value.
    pub fn rows(&self) -> Vec<(String, String)> {
        let events = match (&self.sunrise, &self.sunset) {
            (Some(r), Some(s)) => format!("{r} / {} / {s}", self.solar_noon),
            _ => format!(
                "{} all day; solar noon {}",
                if self.daylight == "polar-day" { "sun up" } else { "sun down" },
                self.solar_noon
            ),
        };
        vec![
            ("Time".into(), self.time.clone()),
            ("Place".into(), format!("{} deg N, {} deg E, {} m", self.lat_deg, self.lon_deg, self.elevation_m)),
            ("Pressure".into(), format!("{:.2} hPa", self.pressure_hpa)),
            (
                "Plane".into(),
                format!(
                    "tilt {} deg, facing {} deg from north, {} sky",
                    self.plane_tilt_deg, self.plane_azimuth_deg, self.sky_model
                ),
            ),
            ("Zenith angle (refracted)".into(), format!("{:.5} deg", self.zenith_deg)),
            ("Azimuth (from north)".into(), format!("{:.5} deg", self.azimuth_deg)),
            ("Incidence on the plane".into(), format!("{:.5} deg", self.incidence_deg)),
            ("Air mass".into(), self.air_mass.map(|m| format!("{m:.4}")).unwrap_or_else(|| "- (sun down)".into())),
            ("Direct normal".into(), format!("{:.2} W/m²", self.direct_normal_w_m2)),
            ("Diffuse horizontal".into(), format!("{:.2} W/m²", self.diffuse_horizontal_w_m2)),
            ("Global horizontal".into(), format!("{:.2} W/m²", self.global_horizontal_w_m2)),
            ("Plane of array".into(), format!("{:.2} W/m²", self.plane_of_array_w_m2)),
            ("Sunrise / solar noon / sunset".into(), events),
            ("Equation of time".into(), format!("{:.3} min", self.equation_of_time_min)),
            ("Delta T".into(), format!("{:.1} s", self.delta_t_s)),
        ]
    }
}

/// The rows of the spectrum CSV ([`SPECTRUM_COLUMNS`]): wavelength [nm], direct normal,
/// diffuse horizontal and plane-of-array irradiance [W/m2/nm], zeros with the sun down.
pub fn spectrum_rows(moment: &Moment) -> Vec<[f64; 4]> {
    let up = moment.position.zenith_deg < 90.0;
    let t = clear_sky_table();
    let s = &moment.spectra;
    (0..t.wavelength_nm.len())
        .map(|i| {
            let v = |a: &[f64]| if up { a[i] } else { 0.0 };
            [t.wavelength_nm[i], v(&s.direct_normal), v(&s.diffuse_horizontal), v(&s.plane_global)]
        })
        .collect()
}
