//! Place and time: a site under a cloudless sky (latitude, longitude, the receiving plane and
//! the air), as typed by a user, and the clear-sky light source of one moment there.
//!
//! Text forms (the command line's `--spectrum clearsky:...`, the option values of `sun` and
//! `yield`): times are ISO 8601 with their UTC offset (`2024-06-21T12:00+02:00`, `...Z`),
//! dates `YYYY-MM-DD`.
//!
//! Architecture invariant: every accepted range of a place lives in [`PlaceSpec::to_site`]
//! (and the physics checks it calls); front ends only parse text into these fields.

use crate::physics::clear_sky::clear_sky_source;
use crate::physics::clear_sky::SkyModel;
use crate::physics::site::{moment, standard_pressure_hpa, Atmosphere, Moment, Site};
use crate::physics::solar_position::{delta_t_estimate, sun_day, CivilTime, Observer, SunDay, Surface};
use crate::physics::sources::Source;
use serde::{Deserialize, Serialize};

/// How diffuse sky light reaches a tilted plane.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum SkyChoice {
    /// the same radiance from every part of the sky
    Isotropic,
    /// Hay & Davies (1980), per wavelength (default)
    #[default]
    HayDavies,
}

impl SkyChoice {
    pub fn parse(text: &str) -> Result<SkyChoice, String> {
        match text.trim().to_ascii_lowercase().as_str() {
            "isotropic" => Ok(SkyChoice::Isotropic),
            "hay-davies" | "haydavies" => Ok(SkyChoice::HayDavies),
            _ => Err(format!("unknown sky model '{text}'; use isotropic or hay-davies")),
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            SkyChoice::Isotropic => "isotropic",
            SkyChoice::HayDavies => "hay-davies",
        }
    }
}

impl From<SkyChoice> for SkyModel {
    fn from(c: SkyChoice) -> SkyModel {
        match c {
            SkyChoice::Isotropic => SkyModel::Isotropic,
            SkyChoice::HayDavies => SkyModel::HayDavies,
        }
    }
}

/// A place, its receiving plane and its clear air, in the units a user types.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct PlaceSpec {
    /// latitude [deg], north positive
    pub lat_deg: f64,
    /// longitude [deg], east positive
    pub lon_deg: f64,
    /// elevation above sea level [m]
    pub elevation_m: f64,
    /// surface pressure [hPa]; `None` for the standard atmosphere at `elevation_m`
    pub pressure_hpa: Option<f64>,
    /// air temperature for refraction [deg C]
    pub air_temp_c: f64,
    /// TT - UT1 [s]; `None` for the Espenak & Meeus estimate
    pub delta_t_s: Option<f64>,
    /// plane tilt from horizontal [deg]
    pub tilt_deg: f64,
    /// direction the plane faces, clockwise from north [deg] (180 = south)
    pub azimuth_deg: f64,
    /// precipitable water [cm]
    pub pwv_cm: f64,
    /// ozone column [atm-cm]
    pub ozone_atm_cm: f64,
    /// aerosol optical depth at 500 nm
    pub aod500: f64,
    /// Angstrom exponent
    pub angstrom: f64,
    /// ground albedo, 0-1
    pub albedo: f64,
    pub sky_model: SkyChoice,
}

impl Default for PlaceSpec {
    /// The defaults of the command line's `sun`: a horizontal plane at sea level, 12 deg C,
    /// 1.4 cm of water, 0.3 atm-cm of ozone, aerosol depth 0.1, Angstrom 1.14, albedo 0.2,
    /// Hay-Davies sky. The place itself is an example of our own (45 N, 7 E).
    fn default() -> Self {
        PlaceSpec {
            lat_deg: 45.0,
            lon_deg: 7.0,
            elevation_m: 0.0,
            pressure_hpa: None,
            air_temp_c: 12.0,
            delta_t_s: None,
            tilt_deg: 0.0,
            azimuth_deg: 180.0,
            pwv_cm: 1.4,
            ozone_atm_cm: 0.3,
            aod500: 0.1,
            angstrom: 1.14,
            albedo: 0.2,
            sky_model: SkyChoice::HayDavies,
        }
    }
}

impl PlaceSpec {
    /// The surface pressure in force [hPa].
    pub fn pressure_now_hpa(&self) -> f64 {
        self.pressure_hpa.unwrap_or_else(|| standard_pressure_hpa(self.elevation_m))
    }

    /// Check every value and build the physics site.
    pub fn to_site(&self) -> Result<Site, String> {
        let within = |v: f64, lo: f64, hi: f64| v.is_finite() && (lo..=hi).contains(&v);
        if !within(self.lat_deg, -90.0, 90.0) {
            return Err(format!("the latitude {} deg is out of range; give -90 (south) to 90 (north)", self.lat_deg));
        }
        if !within(self.lon_deg, -180.0, 180.0) {
            return Err(format!("the longitude {} deg is out of range; give -180 to 180, east positive", self.lon_deg));
        }
        if !within(self.elevation_m, -500.0, 9000.0) {
            return Err(format!(
                "the elevation {} m is out of range; give -500 to 9000 m above sea level",
                self.elevation_m
            ));
        }
        if let Some(p) = self.pressure_hpa {
            if !within(p, 10.0, 1200.0) {
                return Err(format!("the pressure {p} hPa is out of range; give 10 to 1200 hPa (1013 at sea level)"));
            }
        }
        if !within(self.air_temp_c, -90.0, 60.0) {
            return Err(format!("the air temperature {} C is out of range; give -90 to 60 C", self.air_temp_c));
        }
        if let Some(dt) = self.delta_t_s {
            if !within(dt, -100_000.0, 100_000.0) {
                return Err(format!("delta T {dt} s is out of range; give -100000 to 100000 s (about 69 s in 2024)"));
            }
        }
        if !within(self.azimuth_deg, 0.0, 360.0) {
            return Err(format!(
                "the azimuth {} deg is out of range; give 0 to 360, clockwise from north (180 = south-facing)",
                self.azimuth_deg
            ));
        }
        if self.pwv_cm.is_finite() && self.pwv_cm < 0.0 {
            return Err(format!("the precipitable water {} cm is negative; give 0 to 15 cm (e.g. 1.4)", self.pwv_cm));
        }
        let site = Site {
            observer: Observer {
                latitude_deg: self.lat_deg,
                longitude_deg: self.lon_deg,
                elevation_m: self.elevation_m,
                pressure_hpa: self.pressure_now_hpa(),
                temperature_c: self.air_temp_c,
            },
            surface: Surface { tilt_deg: self.tilt_deg, azimuth_deg: self.azimuth_deg },
            atmosphere: Atmosphere {
                precipitable_water_cm: self.pwv_cm,
                ozone_atm_cm: self.ozone_atm_cm,
                aod_500nm: self.aod500,
                angstrom_exponent: self.angstrom,
                ground_albedo: self.albedo,
                sky: self.sky_model.into(),
            },
            delta_t_s: self.delta_t_s,
        };
        site.check()?;
        Ok(site)
    }

    /// Set one field from its text key (`lat`, `lon`, `elevation`, `pressure`, `air-temp`,
    /// `delta-t`, `tilt`, `azimuth`, `pwv`, `ozone`, `aod500`, `angstrom`, `albedo`,
    /// `sky-model`); `Ok(false)` for a key that is not a place key.
    pub fn set(&mut self, key: &str, value: &str) -> Result<bool, String> {
        if key == "sky-model" {
            self.sky_model = SkyChoice::parse(value)?;
            return Ok(true);
        }
        let slot: &mut f64 = match key {
            "lat" => &mut self.lat_deg,
            "lon" => &mut self.lon_deg,
            "elevation" => &mut self.elevation_m,
            "air-temp" => &mut self.air_temp_c,
            "tilt" => &mut self.tilt_deg,
            "azimuth" => &mut self.azimuth_deg,
            "pwv" => &mut self.pwv_cm,
            "ozone" => &mut self.ozone_atm_cm,
            "aod500" => &mut self.aod500,
            "angstrom" => &mut self.angstrom,
            "albedo" => &mut self.albedo,
            "pressure" | "delta-t" => {
                let v = number(key, value)?;
                if key == "pressure" {
                    self.pressure_hpa = Some(v);
                } else {
                    self.delta_t_s = Some(v);
                }
                return Ok(true);
            }
            _ => return Ok(false),
        };
        *slot = number(key, value)?;
        Ok(true)
    }

    /// The `key=value` pairs that differ from the defaults, in a fixed order.
    pub fn pairs(&self) -> Vec<(String, String)> {
        let d = PlaceSpec::default();
        let opt = |v: Option<f64>| v.map(|x| x.to_string());
        let differs = |v: f64, dv: f64| (v != dv).then(|| v.to_string());
        let list = [
            ("lat", Some(self.lat_deg.to_string())),
            ("lon", Some(self.lon_deg.to_string())),
            ("tilt", differs(self.tilt_deg, d.tilt_deg)),
            ("azimuth", differs(self.azimuth_deg, d.azimuth_deg)),
            ("elevation", differs(self.elevation_m, d.elevation_m)),
            ("pressure", opt(self.pressure_hpa)),
            ("air-temp", differs(self.air_temp_c, d.air_temp_c)),
            ("delta-t", opt(self.delta_t_s)),
            ("pwv", differs(self.pwv_cm, d.pwv_cm)),
            ("ozone", differs(self.ozone_atm_cm, d.ozone_atm_cm)),
            ("aod500", differs(self.aod500, d.aod500)),
            ("angstrom", differs(self.angstrom, d.angstrom)),
            ("albedo", differs(self.albedo, d.albedo)),
            ("sky-model", (self.sky_model != d.sky_model).then(|| self.sky_model.label().to_string())),
        ];
        let out: Vec<(String, String)> = list.into_iter().filter_map(|(k, v)| v.map(|v| (k.to_string(), v))).collect();
        out
    }
}

fn number(key: &str, value: &str) -> Result<f64, String> {
    let v: f64 = value.trim().parse().map_err(|_| format!("{key}='{value}' is not a number; write e.g. {key}=1.5"))?;
    if !v.is_finite() {
        return Err(format!("{key}='{value}' is not a finite number"));
    }
    Ok(v)
}

/// The clear-sky light of one moment at one place: the plane-of-array global spectrum.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct ClearSkySpec {
    pub place: PlaceSpec,
    /// ISO 8601 with its UTC offset, e.g. `2024-06-21T12:00+02:00`
    pub time: String,
}

impl ClearSkySpec {
    /// Parse the text after `clearsky:`: `lat=DEG,lon=DEG,time=ISO8601[,key=value...]`.
    pub fn parse(text: &str) -> Result<ClearSkySpec, String> {
        let mut spec = ClearSkySpec::default();
        let (mut lat, mut lon) = (false, false);
        for part in text.split(',').map(str::trim).filter(|p| !p.is_empty()) {
            let (k, v) = part.split_once('=').ok_or_else(|| {
                format!(
                    "clearsky: '{part}' is not key=value; write e.g. clearsky:lat=45,lon=7,time=2024-06-21T12:00+02:00"
                )
            })?;
            let k = k.trim().to_ascii_lowercase();
            lat |= k == "lat";
            lon |= k == "lon";
            if k == "time" {
                parse_time(v)?;
                spec.time = v.trim().to_string();
            } else if !spec.place.set(&k, v)? {
                return Err(format!(
                    "clearsky: unknown key '{k}'; use lat, lon, time, tilt, azimuth, elevation, pressure, air-temp, pwv, ozone, aod500, angstrom, albedo, delta-t or sky-model"
                ));
            }
        }
        if !(lat && lon) || spec.time.is_empty() {
            return Err(
                "clearsky: needs lat, lon and time, e.g. clearsky:lat=45,lon=7,time=2024-06-21T12:00+02:00".into()
            );
        }
        spec.place.to_site()?;
        Ok(spec)
    }

    /// The text form (inverse of [`ClearSkySpec::parse`]).
    pub fn label(&self) -> String {
        let mut pairs = self.place.pairs();
        pairs.insert(2, ("time".into(), self.time.clone()));
        pairs.iter().map(|(k, v)| format!("{k}={v}")).collect::<Vec<_>>().join(",")
    }

    /// The parsed moment.
    pub fn when(&self) -> Result<CivilTime, String> {
        parse_time(&self.time)
    }

    /// The sun and the light at this place and moment.
    pub fn moment(&self) -> Result<Moment, String> {
        let site = self.place.to_site()?;
        moment(&site, &self.when()?)
    }

    /// The plane-of-array global spectrum as a light source; refused with the day's sunrise
    /// and sunset when the sun is down or the plane sees no light.
    pub fn to_source(&self) -> Result<Source, String> {
        let m = self.moment()?;
        if m.spectra.plane_global_total() <= 0.0 {
            let site = self.place.to_site()?;
            let when = self.when()?;
            let dt = site.delta_t_s.unwrap_or_else(|| delta_t_estimate(when.decimal_year()));
            let day = match sun_day(&when, &site.observer, dt)? {
                SunDay::RiseAndSet { sunrise_h, sunset_h, .. } => {
                    format!("pick a time between sunrise {} and sunset {}", clock(sunrise_h), clock(sunset_h))
                }
                SunDay::PolarDay { .. } => "turn the plane toward the sun".to_string(),
                SunDay::PolarNight { .. } => "the sun does not rise that day; pick another date".to_string(),
            };
            return Err(format!(
                "at {} the sun is below the horizon or behind the plane at {} deg, {} deg (zenith {:.1} deg, incidence {:.1} deg); {day}",
                self.time, self.place.lat_deg, self.place.lon_deg, m.position.zenith_deg, m.position.incidence_deg
            ));
        }
        clear_sky_source(&m.spectra, &format!("clear sky {}", self.time))
    }
}

/// `hh:mm` of a clock hour.
pub fn clock(h: f64) -> String {
    let minutes = (h * 60.0).round().rem_euclid(1440.0) as u32;
    format!("{:02}:{:02}", minutes / 60, minutes % 60)
}

fn two(text: &str, what: &str, full: &str) -> Result<u32, String> {
    if text.len() == 2 && text.bytes().all(|b| b.is_ascii_digit()) {
        Ok(text.parse().unwrap_or(0))
    } else {
        Err(format!("the time '{full}' has a bad {what} '{text}'; write e.g. 2024-06-21T12:30+02:00"))
    }
}

/// Parse `YYYY-MM-DD`; the date must exist.
pub fn parse_date(text: &str) -> Result<(i32, u32, u32), String> {
    let t = text.trim();
    let bad = || format!("the date '{t}' is not YYYY-MM-DD; write e.g. 2024-06-21");
    let (y, rest) =
        t.rsplit_once('-').and_then(|(ym, d)| ym.rsplit_once('-').map(|(y, m)| (y, (m, d)))).ok_or_else(bad)?;
    let year: i32 = y.parse().map_err(|_| bad())?;
    let month: u32 = rest.0.parse().map_err(|_| bad())?;
    let day: u32 = rest.1.parse().map_err(|_| bad())?;
    if !(1..=12).contains(&month) {
        return Err(format!("the date '{t}' has month {month}; give 01 to 12"));
    }
    let last = crate::physics::site::days_from_civil(
        if month == 12 { year + 1 } else { year },
        if month == 12 { 1 } else { month + 1 },
        1,
    ) - crate::physics::site::days_from_civil(year, month, 1);
    if !(1..=last as u32).contains(&day) {
        return Err(format!("the date '{t}' does not exist: {year}-{month:02} has {last} days"));
    }
    Ok((year, month, day))
}

/// Parse an ISO 8601 time with its UTC offset: `YYYY-MM-DDTHH:MM[:SS[.s]]` then `Z`,
/// `+HH:MM`, `+HHMM` or `+HH` (a space may stand for the `T`).
pub fn parse_time(text: &str) -> Result<CivilTime, String> {
    let t = text.trim();
    let (date, clock) = t
        .split_once(['T', 't', ' '])
        .ok_or_else(|| format!("the time '{t}' is not ISO 8601; write e.g. 2024-06-21T12:30+02:00"))?;
    let (year, month, day) = parse_date(date)?;
    let (clock, offset) = if let Some(c) = clock.strip_suffix(['Z', 'z']) {
        (c, 0.0)
    } else if let Some(k) = clock.rfind(['+', '-']) {
        let (c, o) = clock.split_at(k);
        let sign = if o.starts_with('-') { -1.0 } else { 1.0 };
        let digits = o[1..].replace(':', "");
        let (hh, mm) = match digits.len() {
            2 => (two(&digits, "UTC offset", t)?, 0),
            4 => (two(&digits[..2], "UTC offset", t)?, two(&digits[2..], "UTC offset", t)?),
            _ => return Err(format!("the time '{t}' has a bad UTC offset '{o}'; write e.g. +02:00, -07:00 or Z")),
        };
        (c, sign * (hh as f64 + mm as f64 / 60.0))
    } else {
        return Err(format!("the time '{t}' has no UTC offset; add one, e.g. {t}+02:00, or Z for UTC"));
    };
    let mut parts = clock.split(':');
    let hour = two(parts.next().unwrap_or(""), "hour", t)?;
    let minute = two(parts.next().unwrap_or(""), "minute", t)?;
    let second: f64 = match parts.next() {
        Some(s) if !s.is_empty() && s.as_bytes()[0].is_ascii_digit() => {
            s.parse().map_err(|_| format!("the time '{t}' has a bad second '{s}'; write e.g. 12:30:05"))?
        }
        None => 0.0,
        Some(s) => return Err(format!("the time '{t}' has a bad second '{s}'; write e.g. 12:30:05")),
    };
    if parts.next().is_some() || hour > 24 || minute > 59 || !(0.0..61.0).contains(&second) {
        return Err(format!("the time '{t}' is not a clock time; give hours 00-24, minutes 00-59, seconds below 61"));
    }
    if hour == 24 && (minute > 0 || second > 0.0) {
        return Err(format!("the time '{t}' is past 24:00; give a time of the next day"));
    }
    Ok(CivilTime { year, month, day, hour, minute, second, utc_offset_h: offset })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn times_need_their_offset() {
        let t = parse_time("2003-10-17T12:30:30-07:00").unwrap();
        assert_eq!(
            (t.year, t.month, t.day, t.hour, t.minute, t.second, t.utc_offset_h),
            (2003, 10, 17, 12, 30, 30.0, -7.0)
        );
        assert_eq!(parse_time("2024-06-21 06:00Z").unwrap().utc_offset_h, 0.0);
        assert_eq!(parse_time("2024-06-21T06:00+0530").unwrap().utc_offset_h, 5.5);
        assert!(parse_time("2024-06-21T12:00").unwrap_err().contains("no UTC offset"));
        assert!(parse_time("2023-02-29T12:00Z").unwrap_err().contains("does not exist"));
        assert!(parse_time("2024-06-21T25:00Z").is_err());
        assert!(parse_time("2024-06-21T12:00+2").is_err());
    }

    #[test]
    fn clearsky_text_round_trips() {
        let s = ClearSkySpec::parse(
            "lat=39.74,lon=-105.18,time=2024-06-21T12:00-07:00,tilt=30,pwv=0.8,sky-model=isotropic",
        )
        .unwrap();
        assert_eq!(s.place.tilt_deg, 30.0);
        assert_eq!(s.place.sky_model, SkyChoice::Isotropic);
        assert_eq!(ClearSkySpec::parse(&s.label()).unwrap(), s);
        assert!(ClearSkySpec::parse("lat=95,lon=0,time=2024-06-21T12:00Z").unwrap_err().contains("latitude 95"));
        assert!(ClearSkySpec::parse("lat=45,lon=0").unwrap_err().contains("needs lat, lon and time"));
        assert!(ClearSkySpec::parse("lat=45,lon=0,time=2024-06-21T12:00Z,pwv=-1").unwrap_err().contains("negative"));
        assert!(ClearSkySpec::parse("lat=45,lon=0,time=2024-06-21T12:00Z,fog=1")
            .unwrap_err()
            .contains("unknown key 'fog'"));
    }
}
