//! A radiator through one clear day at a place: the text form of `glowgap cool --day`
//! (`lat=DEG,lon=DEG,date=YYYY-MM-DD[,tmin=C,tmax=C][,place keys]`), its checks, and the
//! day run: at each 5-minute step from local mean-time midnight, the sun's clear-sky light on
//! the radiator's plane (none with the sun down), the air temperature of the two-piece
//! cosine day ([`DailyAir`]), and the radiator's balance at that air temperature.
//!
//! Architecture invariant: every accepted range lives here, in [`PlaceSpec::to_site`] and in
//! the radiator's own `to_physics` (called at every step with that step's air temperature);
//! front ends only parse text into these fields.

use crate::physics::air_temperature::{AirModel, DailyAir, HourlyAir};
use crate::physics::batch::map_indexed;
use crate::physics::clear_sky::clear_sky_source;
use crate::physics::radiator::balance::{Balance, Steady, STEADY_SEARCH_K};
use crate::physics::radiator::solar::Sun;
use crate::physics::site::{day_steps, moment};
use crate::physics::solar_position::{delta_t_estimate, sun_day, CivilTime, SunDay};
use crate::scenario::place::{parse_date, parse_time, PlaceSpec};
use crate::scenario::radiator::RadiatorScenario;

/// The time step of a day [s] (5 minutes).
pub const DAY_STEP_S: f64 = 300.0;

/// The air temperatures taken for a day [deg C].
pub const DAY_AIR_RANGE_C: (f64, f64) = (-90.0, 60.0);

/// Where the absorptance is read when the sun's beam is behind the plane and only sky light
/// reaches it [deg from the normal]: about 60 deg, the effective direction of isotropic sky
/// light on a plane (common practice).
pub const SKY_LIGHT_DIRECTION_DEG: f64 = 60.0;

/// One day at one place, as typed.
#[derive(Debug, Clone, PartialEq)]
pub struct DaySpec {
    /// the place and the radiator's plane (tilt 0 unless given) and air
    pub place: PlaceSpec,
    /// `YYYY-MM-DD`
    pub date: (i32, u32, u32),
    /// the day's lowest and highest air temperature [deg C]
    pub tmin_c: f64,
    pub tmax_c: f64,
    /// whether tmin or tmax was given
    pub extremes_given: bool,
    /// air temperatures [deg C] at clock hours [h] of the steps' clock (local mean time),
    /// instead of the two-piece cosine
    pub hourly_c: Option<Vec<(f64, f64)>>,
}

/// One step of a day.
#[derive(Debug, Clone, PartialEq)]
pub struct DayStep {
    pub when: CivilTime,
    /// global irradiance on the radiator's plane, 300-4000 nm [W m^-2]
    pub sun_w_m2: f64,
    /// net cooling power with the surface at the air temperature [W m^-2]
    pub net_w_m2: f64,
    /// the steady surface temperature [K], if the balance has one in its search range
    pub steady_k: Option<f64>,
    /// the air temperature [K]
    pub ambient_k: f64,
}

/// A day's run.
#[derive(Debug, Clone, PartialEq)]
pub struct DayRun {
    pub steps: Vec<DayStep>,
    /// the step [s]
    pub step_s: f64,
    /// the clock's UTC offset [h] (local mean time, whole hours)
    pub utc_offset_h: f64,
    /// the sun's day on that clock
    pub sun_day: SunDay,
    /// the air model used
    pub air: AirModel,
    /// the radiator's warnings, each once
    pub warnings: Vec<String>,
}

impl DaySpec {
    /// Parse the text of `--day`. Place messages are the scenario's own; the front end
    /// names its option.
    pub fn parse(text: &str) -> Result<DaySpec, String> {
        let mut place = PlaceSpec::default();
        let (mut lat, mut lon, mut date) = (false, false, None);
        let (mut tmin_c, mut tmax_c, mut extremes_given) = (15.0, 25.0, false);
        for part in text.split(',').map(str::trim).filter(|p| !p.is_empty()) {
            let (k, v) = part.split_once('=').ok_or_else(|| {
                format!("'{part}' is not key=value; write e.g. lat=45,lon=7,date=2024-07-15,tmin=15,tmax=25")
            })?;
            let k = k.trim().to_ascii_lowercase();
            lat |= k == "lat";
            lon |= k == "lon";
            match k.as_str() {
                "date" => date = Some(parse_date(v)?),
                "tmin" | "tmax" => {
                    extremes_given = true;
                    let t: f64 =
                        v.trim().parse().ok().filter(|t: &f64| t.is_finite()).ok_or_else(|| {
                            format!("{k}='{}' is not a temperature; give deg C, e.g. {k}=20", v.trim())
                        })?;
                    if k == "tmin" {
                        tmin_c = t;
                    } else {
                        tmax_c = t;
                    }
                }
                _ => {
                    if !place.set(&k, v)? {
                        return Err(format!(
                            "unknown key '{k}'; use lat, lon, date, tmin, tmax, tilt, azimuth, elevation, pressure, \
                             air-temp, pwv, ozone, aod500, angstrom, albedo, delta-t or sky-model"
                        ));
                    }
                }
            }
        }
        let Some(date) = date.filter(|_| lat && lon) else {
            return Err("needs lat, lon and date, e.g. lat=45,lon=7,date=2024-07-15".into());
        };
        let spec = DaySpec { place, date, tmin_c, tmax_c, extremes_given, hourly_c: None };
        spec.check()?;
        Ok(spec)
    }

    /// Take the air temperature from a table of values at hours of the day instead of the
    /// two-piece cosine. `text`: one `hour,temperature` pair per line (separated by a comma,
    /// semicolon, tab or spaces), the hour a clock hour 0 to below 24 on the steps' clock
    /// (local mean time, UTC + round(lon/15) h) or an ISO 8601 time with its offset (only its
    /// time of day counts, moved onto that clock), the temperature in deg C; `#` comments
    /// and one header line are skipped.
    pub fn set_hourly_air(&mut self, text: &str) -> Result<(), String> {
        if self.extremes_given {
            return Err("tmin and tmax do not go with a table of hourly air temperatures; give one or the other".into());
        }
        let offset = crate::physics::site::mean_time_offset_h(self.place.lon_deg);
        let mut points = Vec::new();
        let mut header_seen = false;
        for (i, line) in text.lines().enumerate() {
            let line = line.trim();
            if line.is_empty() || line.starts_with('#') {
                continue;
            }
            let cells: Vec<&str> = line.split([',', ';', '\t', ' ']).map(str::trim).filter(|c| !c.is_empty()).collect();
            let shown: String = line.chars().take(40).collect();
            let more = if shown.len() < line.len() { "..." } else { "" };
            let bad = |what: &str| {
                format!(
                    "line {}: '{shown}{more}' {what}; write hour,temperature in deg C, e.g. 14,27.5 or \
                     2024-07-15T14:00-07:00,27.5",
                    i + 1
                )
            };
            let [first, second] = cells.as_slice() else {
                return Err(bad("is not two values"));
            };
            let hour = match first.parse::<f64>() {
                Ok(h) if (0.0..24.0).contains(&h) => h,
                Ok(_) => return Err(bad("has an hour outside 0 to below 24")),
                Err(_) => match parse_time(first) {
                    Ok(t) => {
                        let h = t.hour as f64 + (t.minute as f64 + t.second / 60.0) / 60.0;
                        (h - t.utc_offset_h + offset).rem_euclid(24.0)
                    }
                    Err(_) if !header_seen && points.is_empty() && second.parse::<f64>().is_err() => {
                        header_seen = true;
                        continue;
                    }
                    Err(e) => return Err(format!("line {}: {e}", i + 1)),
                },
            };
            let t: f64 = second.parse().map_err(|_| bad("has a temperature that is not a number"))?;
            if !(DAY_AIR_RANGE_C.0..=DAY_AIR_RANGE_C.1).contains(&t) {
                return Err(bad(&format!(
                    "has a temperature outside {} to {} C",
                    DAY_AIR_RANGE_C.0, DAY_AIR_RANGE_C.1
                )));
            }
            if points.iter().any(|(h, _)| (h - hour).abs() < 1e-9) {
                return Err(bad("repeats an hour of the day"));
            }
            points.push((hour, t));
        }
        if points.len() < 2 {
            return Err("needs at least two hour,temperature lines (e.g. one per hour, 0 to 23)".into());
        }
        let (lo, hi) = points.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| (a.min(p.1), b.max(p.1)));
        self.tmin_c = lo;
        self.tmax_c = hi;
        self.hourly_c = Some(points);
        Ok(())
    }

    /// Check the place and the air temperatures.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a <= b) on purpose: it also refuses NaN
    pub fn check(&self) -> Result<(), String> {
        self.place.to_site()?;
        for (k, t) in [("tmin", self.tmin_c), ("tmax", self.tmax_c)] {
            if !(t >= DAY_AIR_RANGE_C.0 && t <= DAY_AIR_RANGE_C.1) {
                return Err(format!(
                    "{k}={t} C is out of range; give {} to {} C",
                    DAY_AIR_RANGE_C.0, DAY_AIR_RANGE_C.1
                ));
            }
        }
        if !(self.tmin_c <= self.tmax_c) {
            return Err(format!(
                "tmin={} C is above tmax={} C; give the day's lowest air temperature as tmin",
                self.tmin_c, self.tmax_c
            ));
        }
        Ok(())
    }

    /// The radiator `radiator` (its sun and air temperature are the day's) through the day.
    pub fn run(&self, radiator: &RadiatorScenario) -> Result<DayRun, String> {
        self.check()?;
        let site = self.place.to_site()?;
        let (y, m, d) = self.date;
        let times = day_steps(y, m, d, self.place.lon_deg, DAY_STEP_S);
        let first = *times.first().ok_or("no time steps")?;
        let delta_t = |w: &CivilTime| site.delta_t_s.unwrap_or_else(|| delta_t_estimate(w.decimal_year()));
        let day = sun_day(&first, &site.observer, delta_t(&first))?;
        let (sunrise, noon) = match day {
            SunDay::RiseAndSet { sunrise_h, transit_h, .. } => (Some(sunrise_h), transit_h),
            SunDay::PolarDay { transit_h } | SunDay::PolarNight { transit_h } => (None, transit_h),
        };
        let air = match &self.hourly_c {
            None => AirModel::Cosine(DailyAir::new(self.tmin_c + 273.15, self.tmax_c + 273.15, sunrise, noon)),
            Some(points) => {
                let kelvin: Vec<(f64, f64)> = points.iter().map(|&(h, t)| (h, t + 273.15)).collect();
                AirModel::Hourly(HourlyAir::new(&kelvin).ok_or("the hourly air temperatures are not usable")?)
            }
        };
        let mut sc = radiator.clone();
        sc.sun = None;
        sc.surface_k = None;
        // every step on its own (natively on every core): the radiator checked at the
        // step's air temperature, the sun's light, the balance
        let one = |when: &CivilTime| -> Result<(DayStep, Vec<String>), String> {
            let hour = when.hour as f64 + (when.minute as f64 + when.second / 60.0) / 60.0;
            let ambient_k = air.at(hour);
            let mut setup = RadiatorScenario { ambient_k, ..sc.clone() }.to_physics()?;
            let now = moment(&site, when)?;
            let sun_w_m2 = if now.position.zenith_deg < 90.0 { now.spectra.plane_global_total() } else { 0.0 };
            if sun_w_m2 > 0.0 {
                let source = clear_sky_source(&now.spectra, "clear sky")?;
                let incidence = now.position.incidence_deg;
                let direction = if incidence < 90.0 { incidence } else { SKY_LIGHT_DIRECTION_DEG };
                setup.surroundings.sun = Some(Sun { source, zenith_rad: direction.to_radians(), scale: 1.0 });
            }
            let balance = Balance::new(&setup.emitter, &setup.surroundings);
            let step = DayStep {
                when: *when,
                sun_w_m2,
                net_w_m2: balance.net(ambient_k),
                steady_k: steady_near(&balance, ambient_k),
                ambient_k,
            };
            Ok((step, setup.warnings))
        };
        let done = map_indexed(times.len(), |i| Some(one(&times[i])));
        // the radiator's warnings, each kind once (the same words with other numbers are one
        // kind): its first text, the step's time and how many steps had it
        let mut warnings: Vec<(String, String, String, usize)> = Vec::new();
        let mut steps = Vec::with_capacity(times.len());
        for result in done {
            let (step, step_warnings) = result.ok_or("a time step was not computed")??;
            for w in step_warnings {
                let kind: String = w.chars().filter(|c| !c.is_ascii_digit() && *c != '.').collect();
                match warnings.iter_mut().find(|(k, ..)| *k == kind) {
                    Some(seen) => seen.3 += 1,
                    None => {
                        let at = format!("{:02}:{:02}", step.when.hour, step.when.minute);
                        warnings.push((kind, w, at, 1));
                    }
                }
            }
            steps.push(step);
        }
        let n = steps.len();
        let warnings = warnings
            .into_iter()
            .map(|(_, w, at, count)| match count {
                1 => format!("at {at}: {w}"),
                _ => format!("from {at}, at {count} of the day's {n} steps: {w}"),
            })
            .collect();
        Ok(DayRun { steps, step_s: DAY_STEP_S, utc_offset_h: first.utc_offset_h, sun_day: day, air, warnings })
    }
}

/// The steady temperature [K]: searched first within 150 K below to 250 K above the air
/// (where a sunlit or night-sky surface settles; a narrower bracket needs fewer balance
/// evaluations), then over the whole search range.
fn steady_near(balance: &Balance, ambient_k: f64) -> Option<f64> {
    let (lo, hi) = ((ambient_k - 150.0).max(STEADY_SEARCH_K.0), (ambient_k + 250.0).min(STEADY_SEARCH_K.1));
    match balance.steady_between(lo, hi) {
        Steady::At(t) => Some(t),
        _ => balance.steady().temperature(),
    }
}

impl DayRun {
    /// The integral of the net cooling power at the air temperature over the day
    /// [kWh m^-2]: each step's power times its length, heating steps negative.
    pub fn cooling_kwh_m2(&self) -> f64 {
        self.steps.iter().map(|s| s.net_w_m2 * self.step_s).sum::<f64>() / 3.6e6
    }

    /// Hours in which the steady surface temperature is below the air's.
    pub fn hours_below_ambient(&self) -> f64 {
        let n = self.steps.iter().filter(|s| s.steady_k.is_some_and(|t| t < s.ambient_k)).count();
        n as f64 * self.step_s / 3600.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_text_form_and_its_checks() {
        let d = DaySpec::parse("lat=35,lon=-106,date=2024-07-15,tmin=12,tmax=30,pwv=0.8,tilt=10").unwrap();
        assert_eq!((d.date, d.tmin_c, d.tmax_c), ((2024, 7, 15), 12.0, 30.0));
        assert_eq!((d.place.pwv_cm, d.place.tilt_deg), (0.8, 10.0));
        let d = DaySpec::parse("lat=35,lon=-106,date=2024-07-15").unwrap();
        assert_eq!((d.tmin_c, d.tmax_c, d.place.tilt_deg), (15.0, 25.0, 0.0));
        let err = |t: &str| DaySpec::parse(t).unwrap_err();
        assert!(err("lat=95,lon=0,date=2024-07-15").contains("latitude 95"));
        assert!(err("lat=45,lon=0,date=2023-02-29").contains("does not exist"));
        assert!(err("lat=45,lon=0,date=2024-07-15,tmin=30,tmax=20").contains("above tmax"));
        assert!(err("lat=45,lon=0,date=2024-07-15,fog=1").contains("unknown key 'fog'"));
        assert!(err("lat=45,lon=0").contains("needs lat, lon and date"));
        assert!(err("lat=45,lon=0,date=2024-07-15,tmin=x").contains("tmin='x'"));
    }

    #[test]
    fn hourly_air_tables() {
        let mut d = DaySpec::parse("lat=35,lon=-106,date=2024-07-15").unwrap();
        d.set_hourly_air("# measured\nhour,temp_c\n0,20\n6;15\n2024-07-15T14:00-06:00 30\n").unwrap();
        // 14:00 at UTC-6 is 13:00 on the steps' clock (UTC-7)
        assert_eq!(d.hourly_c.as_deref(), Some(&[(0.0, 20.0), (6.0, 15.0), (13.0, 30.0)][..]));
        assert_eq!((d.tmin_c, d.tmax_c), (15.0, 30.0));
        let mut e = DaySpec::parse("lat=35,lon=-106,date=2024-07-15").unwrap();
        assert!(e.set_hourly_air("0,20\n25,20\n").unwrap_err().contains("line 2"));
        assert!(e.set_hourly_air("0,20\n1,x\n").unwrap_err().contains("not a number"));
        assert!(e.set_hourly_air("0,20\n").unwrap_err().contains("at least two"));
        assert!(e.set_hourly_air("0,20\n0,21\n").unwrap_err().contains("repeats"));
        let mut f = DaySpec::parse("lat=35,lon=-106,date=2024-07-15,tmin=10").unwrap();
        assert!(f.set_hourly_air("0,20\n1,21\n").unwrap_err().contains("tmin and tmax"));
    }
}
