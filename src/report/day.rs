//! A radiator through a clear day in display units (W/m2, K, kWh/m2, local clock times):
//! the JSON of `glowgap cool --day`, its CSV rows and its table.
//!
//! Architecture invariant: numbers come from the scenario's day run (hence
//! `physics::radiator` and `physics::site`); this module only converts units, names the keys
//! and writes times.

use crate::physics::air_temperature::AirModel;
use crate::physics::solar_position::CivilTime;
use crate::report::sun::day_events;
use crate::scenario::day::{DayRun, DaySpec};
use crate::scenario::place::clock;
use serde::Serialize;

/// The columns of the day's CSV.
pub const DAY_COLUMNS: &str = "time,sun_w_m2,net_w_m2,steady_temp_k,ambient_k";

/// What the day's figures assume.
pub const DAY_NOTE: &str = "clear sky, no clouds all day; net cooling power with the surface held at the air \
                            temperature, steady temperature where the balance is zero";

/// One time step. Field names are the command line's JSON keys.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DayStepReport {
    /// ISO 8601 with the clock's UTC offset
    pub time: String,
    /// global irradiance on the radiator's plane, 300-4000 nm [W/m2]
    pub sun_w_m2: f64,
    /// net cooling power at the air temperature [W/m2], > 0 cools
    pub net_w_m2: f64,
    /// the steady surface temperature [K], null where the balance has none in range
    pub steady_temp_k: Option<f64>,
    pub ambient_k: f64,
}

/// The day. Field names are the command line's JSON keys.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DayReport {
    pub date: String,
    pub lat_deg: f64,
    pub lon_deg: f64,
    /// the radiator's plane [deg]
    pub tilt_deg: f64,
    pub azimuth_deg: f64,
    pub pwv_cm: f64,
    /// the clock of the steps: local mean time, whole hours from UTC
    pub utc_offset_h: f64,
    pub step_minutes: f64,
    pub tmin_c: f64,
    pub tmax_c: f64,
    /// `rises-and-sets`, `polar-day` or `polar-night`
    pub daylight: &'static str,
    /// on the steps' clock; sunrise and sunset null on polar day or night
    pub sunrise: Option<String>,
    pub solar_noon: String,
    pub sunset: Option<String>,
    /// `two-piece cosine` (tmin, tmax) or `hourly table` (tmin and tmax its extremes)
    pub air_model: &'static str,
    /// when the air model puts its minimum (sunrise, or solar noon - 6 h on polar day or
    /// night) and its maximum (14:00 solar time)
    pub air_min_at: String,
    pub air_max_at: String,
    /// the integral of the net cooling power at the air temperature [kWh/m2], heating
    /// steps counted negative
    pub cooling_kwh_m2: f64,
    /// hours with the steady temperature below the air's
    pub hours_below_ambient: f64,
    pub steps: Vec<DayStepReport>,
    pub note: &'static str,
}

/// `YYYY-MM-DDTHH:MM+HH:MM` of a step.
pub fn iso_time(t: &CivilTime) -> String {
    let sign = if t.utc_offset_h < 0.0 { '-' } else { '+' };
    let off = (t.utc_offset_h.abs() * 60.0).round() as u32;
    format!(
        "{:04}-{:02}-{:02}T{:02}:{:02}{sign}{:02}:{:02}",
        t.year,
        t.month,
        t.day,
        t.hour,
        t.minute,
        off / 60,
        off % 60
    )
}

impl DayReport {
    pub fn new(spec: &DaySpec, run: &DayRun) -> DayReport {
        let (daylight, sunrise, noon, sunset) = day_events(&run.sun_day);
        let (y, m, d) = spec.date;
        DayReport {
            date: format!("{y:04}-{m:02}-{d:02}"),
            lat_deg: spec.place.lat_deg,
            lon_deg: spec.place.lon_deg,
            tilt_deg: spec.place.tilt_deg,
            azimuth_deg: spec.place.azimuth_deg,
            pwv_cm: spec.place.pwv_cm,
            utc_offset_h: run.utc_offset_h,
            step_minutes: run.step_s / 60.0,
            tmin_c: spec.tmin_c,
            tmax_c: spec.tmax_c,
            daylight,
            sunrise,
            solar_noon: noon,
            sunset,
            air_model: match run.air {
                AirModel::Cosine(_) => "two-piece cosine",
                AirModel::Hourly(_) => "hourly table",
            },
            air_min_at: clock(run.air.extremes_at().0),
            air_max_at: clock(run.air.extremes_at().1),
            cooling_kwh_m2: run.cooling_kwh_m2(),
            hours_below_ambient: run.hours_below_ambient(),
            steps: run
                .steps
                .iter()
                .map(|s| DayStepReport {
                    time: iso_time(&s.when),
                    sun_w_m2: s.sun_w_m2,
                    net_w_m2: s.net_w_m2,
                    steady_temp_k: s.steady_k,
                    ambient_k: s.ambient_k,
                })
                .collect(),
            note: DAY_NOTE,
        }
    }
}
