//! Where the sun is: the Solar Position Algorithm of I. Reda & A. Andreas, "Solar position
//! algorithm for solar radiation applications", Solar Energy 76, 577-589 (2004)
//! (NREL/TP-560-34302; corrigendum Solar Energy 81, 838 (2007)), stated uncertainty +-0.0003
//! deg for the years -2000 to 6000.
//!
//! * [`sun_at`]: topocentric zenith (refraction-corrected, eqs. 41-43) and azimuth clockwise
//!   from north (eqs. 44-45), the incidence angle on a tilted plane (eq. 47), the equation of
//!   time (appendix A.1) and the Earth-Sun distance, from the paper's steps 3.1-3.15
//!   (eqs. 4-47).
//! * [`sun_day`]: sunrise, transit and sunset by the paper's appendix A.2 (standard altitude
//!   -0.8333 deg, eqs. A.2.1-A.2.30), with polar day and night reported as such.
//! * [`delta_t_estimate`]: TT - UT1 from the polynomials of F. Espenak & J. Meeus, "Five
//!   Millennium Canon of Solar Eclipses", NASA/TP-2006-214141, section "Polynomial expressions
//!   for Delta T" (coefficients recalled from that text).
//!
//! The periodic terms (appendix tables A4.2 and A4.3) are read from `data/spa_terms.csv`,
//! written by `scripts/extract_spa_terms.py`, and parsed once.
//!
//! Angles are in degrees, as in the paper; elevation in metres, pressure in hPa (= mbar),
//! temperature in deg C, delta T in seconds.
//!
//! Architecture invariant: pure functions of numbers; bad input is a message, never a panic
//! or a NaN.

use std::sync::OnceLock;

/// A civil date and time with its offset from UTC (UTC = local - offset).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CivilTime {
    /// Gregorian year (Julian calendar before 1582-10-15, as in the paper's eq. 4)
    pub year: i32,
    /// 1-12
    pub month: u32,
    /// 1-31
    pub day: u32,
    /// 0-24
    pub hour: u32,
    /// 0-59
    pub minute: u32,
    /// [s], 0 to below 61 (a leap second is 60.x)
    pub second: f64,
    /// offset of the clock from UTC [h], e.g. -7 for Mountain Standard Time
    pub utc_offset_h: f64,
}

impl CivilTime {
    /// A UTC instant.
    pub fn utc(year: i32, month: u32, day: u32, hour: u32, minute: u32, second: f64) -> CivilTime {
        CivilTime { year, month, day, hour, minute, second, utc_offset_h: 0.0 }
    }

    /// The decimal year used by the delta T polynomials: year + (month - 0.5) / 12.
    pub fn decimal_year(&self) -> f64 {
        self.year as f64 + (self.month as f64 - 0.5) / 12.0
    }

    fn check(&self) -> Result<(), String> {
        if !(-2000..=6000).contains(&self.year) {
            return Err(format!(
                "year {} is outside -2000..6000, where the solar position algorithm is valid; give a year in that range",
                self.year
            ));
        }
        if !(1..=12).contains(&self.month) {
            return Err(format!("month {} does not exist; give 1 to 12", self.month));
        }
        let last = days_in_month(self.year, self.month);
        if !(1..=last).contains(&self.day) {
            return Err(format!(
                "day {} does not exist in {}-{:02}; give 1 to {last}",
                self.day, self.year, self.month
            ));
        }
        if self.hour > 24 || self.minute > 59 {
            return Err(format!(
                "time {}:{:02} is not a clock time; give hours 0-24 and minutes 0-59",
                self.hour, self.minute
            ));
        }
        if self.hour == 24 && (self.minute > 0 || self.second > 0.0) {
            return Err(format!(
                "time 24:{:02}:{} is past the end of the day; give 24:00:00 or a time of the next day",
                self.minute, self.second
            ));
        }
        if !(0.0..61.0).contains(&self.second) {
            return Err(format!("second {} is out of range; give 0 to below 61", self.second));
        }
        if !(-18.0..=18.0).contains(&self.utc_offset_h) {
            return Err(format!(
                "UTC offset {} h is out of range; give -18 to 18 hours (e.g. -7 for UTC-7)",
                self.utc_offset_h
            ));
        }
        Ok(())
    }
}

fn days_in_month(year: i32, month: u32) -> u32 {
    match month {
        4 | 6 | 9 | 11 => 30,
        2 => {
            let leap = if year < 1583 { year % 4 == 0 } else { (year % 4 == 0 && year % 100 != 0) || year % 400 == 0 };
            if leap {
                29
            } else {
                28
            }
        }
        _ => 31,
    }
}

/// Where the observer stands.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Observer {
    /// [deg], north positive, -90..90
    pub latitude_deg: f64,
    /// [deg], east positive, -180..180
    pub longitude_deg: f64,
    /// above sea level [m]
    pub elevation_m: f64,
    /// annual mean local air pressure [hPa = mbar] (refraction)
    pub pressure_hpa: f64,
    /// annual mean local air temperature [deg C] (refraction)
    pub temperature_c: f64,
}

impl Observer {
    fn check(&self) -> Result<(), String> {
        let within = |v: f64, lo: f64, hi: f64| v.is_finite() && (lo..=hi).contains(&v);
        if !within(self.latitude_deg, -90.0, 90.0) {
            return Err(format!("latitude {} deg is out of range; give -90 (south) to 90 (north)", self.latitude_deg));
        }
        if !within(self.longitude_deg, -180.0, 180.0) {
            return Err(format!(
                "longitude {} deg is out of range; give -180 to 180, east positive",
                self.longitude_deg
            ));
        }
        if !within(self.elevation_m, -6_500_000.0, 1e8) {
            return Err(format!("elevation {} m is out of range; give metres above sea level", self.elevation_m));
        }
        if !within(self.pressure_hpa, 0.0, 5000.0) {
            return Err(format!(
                "air pressure {} hPa is out of range; give 0 to 5000 hPa (sea level is about 1013)",
                self.pressure_hpa
            ));
        }
        if !within(self.temperature_c, -273.0, 6000.0) {
            return Err(format!(
                "air temperature {} deg C is out of range; give -273 to 6000 deg C",
                self.temperature_c
            ));
        }
        Ok(())
    }
}

/// A flat receiving surface.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Surface {
    /// slope from the horizontal [deg] (0 = horizontal)
    pub tilt_deg: f64,
    /// direction the surface faces, clockwise from north [deg] (180 = south-facing)
    pub azimuth_deg: f64,
}

/// The sun seen from one place at one moment.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SunPosition {
    /// topocentric zenith angle with refraction [deg]
    pub zenith_deg: f64,
    /// topocentric azimuth, clockwise from north [deg], 0..360
    pub azimuth_deg: f64,
    /// angle between the sun and the surface normal [deg], 0..180
    pub incidence_deg: f64,
    /// apparent solar time minus mean solar time [min]
    pub equation_of_time_min: f64,
    /// Earth-Sun distance [AU]
    pub distance_au: f64,
}

/// Sunrise, transit and sunset in local clock hours (0..24, the [`CivilTime`]'s offset).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SunDay {
    /// the sun rises and sets
    RiseAndSet { sunrise_h: f64, transit_h: f64, sunset_h: f64 },
    /// the sun stays above the standard altitude all day
    PolarDay { transit_h: f64 },
    /// the sun stays below the standard altitude all day
    PolarNight { transit_h: f64 },
}

/// TT - UT1 [s] at a decimal year (`CivilTime::decimal_year`), from the Espenak & Meeus
/// polynomials (NASA/TP-2006-214141); before 1800, and as the long-term form, their parabola
/// -20 + 32 u^2 with u = (y - 1820) / 100.
pub fn delta_t_estimate(y: f64) -> f64 {
    let u = (y - 1820.0) / 100.0;
    let poly = |t: f64, c: &[f64]| c.iter().rev().fold(0.0, |acc, &k| acc * t + k);
    if y < 1800.0 {
        -20.0 + 32.0 * u * u
    } else if y < 1860.0 {
        poly(
            y - 1800.0,
            &[13.72, -0.332447, 0.0068612, 0.0041116, -0.00037436, 0.0000121272, -0.0000001699, 0.000000000875],
        )
    } else if y < 1900.0 {
        poly(y - 1860.0, &[7.62, 0.5737, -0.251754, 0.01680668, -0.0004473624, 1.0 / 233174.0])
    } else if y < 1920.0 {
        poly(y - 1900.0, &[-2.79, 1.494119, -0.0598939, 0.0061966, -0.000197])
    } else if y < 1941.0 {
        poly(y - 1920.0, &[21.20, 0.84493, -0.076100, 0.0020936])
    } else if y < 1961.0 {
        poly(y - 1950.0, &[29.07, 0.407, -1.0 / 233.0, 1.0 / 2547.0])
    } else if y < 1986.0 {
        poly(y - 1975.0, &[45.45, 1.067, -1.0 / 260.0, -1.0 / 718.0])
    } else if y < 2005.0 {
        poly(y - 2000.0, &[63.86, 0.3345, -0.060374, 0.0017275, 0.000651814, 0.00002373599])
    } else if y < 2050.0 {
        poly(y - 2000.0, &[62.92, 0.32217, 0.005589])
    } else if y < 2150.0 {
        -20.0 + 32.0 * u * u - 0.5628 * (2150.0 - y)
    } else {
        -20.0 + 32.0 * u * u
    }
}

/// The parsed periodic terms: Earth tables L0..L5, B0..B1, R0..R4 as (A, B, C) rows, and the
/// nutation rows (Y0..Y4, a, b, c, d).
struct Terms {
    l: Vec<Vec<[f64; 3]>>,
    b: Vec<Vec<[f64; 3]>>,
    r: Vec<Vec<[f64; 3]>>,
    nutation: Vec<([f64; 5], [f64; 4])>,
}

const TERMS_CSV: &str = include_str!("data/spa_terms.csv");

fn parse_terms(text: &str) -> Result<Terms, String> {
    let mut t = Terms { l: vec![Vec::new(); 6], b: vec![Vec::new(); 2], r: vec![Vec::new(); 5], nutation: Vec::new() };
    for (i, line) in text.lines().enumerate().filter(|(_, l)| !l.starts_with('#') && !l.starts_with("table")) {
        let mut fields = line.split(',');
        let name = fields.next().unwrap_or("");
        let v: Vec<f64> = fields
            .map(|f| f.trim().parse::<f64>().map_err(|e| format!("spa_terms.csv line {}: {e}", i + 1)))
            .collect::<Result<_, _>>()?;
        let bad = || format!("spa_terms.csv line {}: unexpected row {line:?}", i + 1);
        if name == "NUT" {
            if v.len() != 9 {
                return Err(bad());
            }
            t.nutation.push(([v[0], v[1], v[2], v[3], v[4]], [v[5], v[6], v[7], v[8]]));
            continue;
        }
        let (table, index) = name.split_at(1.min(name.len()));
        let index: usize = index.parse().map_err(|_| bad())?;
        let group = match table {
            "L" => &mut t.l,
            "B" => &mut t.b,
            "R" => &mut t.r,
            _ => return Err(bad()),
        };
        if v.len() != 3 || index >= group.len() {
            return Err(bad());
        }
        group[index].push([v[0], v[1], v[2]]);
    }
    let counts: Vec<usize> = t.l.iter().chain(&t.b).chain(&t.r).map(Vec::len).collect();
    // Row counts of the paper's tables A4.2 and A4.3.
    if counts != [64, 34, 20, 7, 3, 1, 5, 2, 40, 10, 6, 2, 1] || t.nutation.len() != 63 {
        return Err(format!(
            "spa_terms.csv has {counts:?} Earth rows and {} nutation rows; regenerate it",
            t.nutation.len()
        ));
    }
    Ok(t)
}

fn terms() -> Result<&'static Terms, String> {
    static TERMS: OnceLock<Result<Terms, String>> = OnceLock::new();
    TERMS.get_or_init(|| parse_terms(TERMS_CSV)).as_ref().map_err(Clone::clone)
}

/// Eqs. 9-12: sum over the tables of (sum_rows A cos(B + C jme)) jme^i / 1e8.
fn earth_series(tables: &[Vec<[f64; 3]>], jme: f64) -> f64 {
    let mut total = 0.0;
    let mut power = 1.0;
    for table in tables {
        total += table.iter().map(|[a, b, c]| a * (b + c * jme).cos()).sum::<f64>() * power;
        power *= jme;
    }
    total / 1e8
}

/// Wrap into [0, 360).
fn limit_360(deg: f64) -> f64 {
    let r = deg.rem_euclid(360.0);
    if r >= 360.0 {
        0.0
    } else {
        r
    }
}

/// Paper eq. 4: Julian day of a UT calendar date plus fractional day.
fn julian_day(year: i32, month: u32, day_fraction: f64) -> f64 {
    let (y, m) = if month <= 2 { (year as f64 - 1.0, month as f64 + 12.0) } else { (year as f64, month as f64) };
    let jd = (365.25 * (y + 4716.0)).floor() + (30.6001 * (m + 1.0)).floor() + day_fraction - 1524.5;
    if jd > 2_299_160.0 {
        let a = (y / 100.0).floor();
        jd + 2.0 - a + (a / 4.0).floor()
    } else {
        jd
    }
}

/// The geocentric quantities of steps 3.1-3.8 at one Julian day.
struct Geocentric {
    /// apparent sidereal time at Greenwich [deg]
    nu: f64,
    /// right ascension [deg]
    alpha: f64,
    /// declination [deg]
    delta: f64,
    /// Earth-Sun distance [AU]
    r: f64,
    /// nutation in longitude [deg]
    dpsi: f64,
    /// true obliquity [deg]
    epsilon: f64,
    jme: f64,
}

fn geocentric(t: &Terms, jd: f64, delta_t_s: f64) -> Geocentric {
    let jde = jd + delta_t_s / 86400.0; // eq. 5
    let jc = (jd - 2_451_545.0) / 36525.0; // eq. 6
    let jce = (jde - 2_451_545.0) / 36525.0; // eq. 7
    let jme = jce / 10.0; // eq. 8
    let l = limit_360(earth_series(&t.l, jme).to_degrees()); // eqs. 9-12
    let b = earth_series(&t.b, jme).to_degrees(); // eq. 12 with B
    let r = earth_series(&t.r, jme); // eq. 12 with R [AU]
    let theta = limit_360(l + 180.0); // eq. 13
    let beta = -b; // eq. 14
                   // Eqs. 15-19: mean elongation of the moon, anomalies, argument of latitude, node.
    let p = |c: [f64; 3], d: f64| c[0] + c[1] * jce + c[2] * jce * jce + jce.powi(3) / d;
    let x = [
        p([297.85036, 445_267.111_480, -0.0019142], 189_474.0),
        p([357.52772, 35_999.050_340, -0.0001603], -300_000.0),
        p([134.96298, 477_198.867_398, 0.0086972], 56_250.0),
        p([93.27191, 483_202.017_538, -0.0036825], 327_270.0),
        p([125.04452, -1_934.136_261, 0.0020708], 450_000.0),
    ];
    // Eqs. 20-23: nutation in longitude and obliquity.
    let (mut dpsi, mut deps) = (0.0, 0.0);
    for (y, [a, bb, c, d]) in &t.nutation {
        let arg = (0..5).map(|i| x[i] * y[i]).sum::<f64>().to_radians();
        dpsi += (a + bb * jce) * arg.sin();
        deps += (c + d * jce) * arg.cos();
    }
    dpsi /= 36_000_000.0;
    deps /= 36_000_000.0;
    // Eq. 24: mean obliquity [arcsec], U = JME / 10.
    let u = jme / 10.0;
    let eps0_coeffs = [84_381.448, -4_680.93, -1.55, 1_999.25, -51.38, -249.67, -39.05, 7.12, 27.87, 5.79, 2.45];
    let eps0 = eps0_coeffs.iter().rev().fold(0.0, |acc, &k| acc * u + k);
    let epsilon = eps0 / 3600.0 + deps; // eq. 25
    let dtau = -20.4898 / (3600.0 * r); // eq. 26
    let lambda = theta + dpsi + dtau; // eq. 27
    let nu0 = limit_360(
        280.460_618_37 + 360.985_647_366_29 * (jd - 2_451_545.0) + 0.000_387_933 * jc * jc - jc.powi(3) / 38_710_000.0,
    ); // eq. 28
    let (le, eps) = (lambda.to_radians(), epsilon.to_radians());
    let nu = nu0 + dpsi * eps.cos(); // eq. 29
    let br = beta.to_radians();
    let alpha = limit_360((le.sin() * eps.cos() - br.tan() * eps.sin()).atan2(le.cos()).to_degrees()); // eq. 30
    let delta = (br.sin() * eps.cos() + br.cos() * eps.sin() * le.sin()).clamp(-1.0, 1.0).asin().to_degrees(); // eq. 31
    Geocentric { nu, alpha, delta, r, dpsi, epsilon, jme }
}

/// Effective refraction at sunrise/sunset [deg] used to decide whether to correct (the
/// paper's example value; common practice).
const ATMOS_REFRACTION_DEG: f64 = 0.5667;
/// Angular radius of the sun [deg] (paper, eq. 42 switch).
const SUN_RADIUS_DEG: f64 = 0.26667;

/// The sun at `when` seen from `place`, with the incidence on `surface` (steps 3.1-3.15 of
/// the paper). `delta_t_s` = TT - UT1 [s]; [`delta_t_estimate`] gives a default.
pub fn sun_at(when: &CivilTime, place: &Observer, surface: &Surface, delta_t_s: f64) -> Result<SunPosition, String> {
    when.check()?;
    place.check()?;
    if !(delta_t_s.is_finite() && (-100_000.0..=100_000.0).contains(&delta_t_s)) {
        return Err(format!("delta T {delta_t_s} s is out of range; give -100000 to 100000 s (about 69 s in 2020, about 47000 s in the year -2000)"));
    }
    if !(surface.tilt_deg.is_finite() && (-360.0..=360.0).contains(&surface.tilt_deg)) {
        return Err(format!(
            "surface tilt {} deg is out of range; give -360 to 360 (0 = horizontal)",
            surface.tilt_deg
        ));
    }
    if !(surface.azimuth_deg.is_finite() && (-360.0..=360.0).contains(&surface.azimuth_deg)) {
        return Err(format!(
            "surface azimuth {} deg is out of range; give -360 to 360, clockwise from north (180 = south)",
            surface.azimuth_deg
        ));
    }
    let t = terms()?;
    let hours = when.hour as f64 - when.utc_offset_h + (when.minute as f64 + when.second / 60.0) / 60.0;
    let jd = julian_day(when.year, when.month, when.day as f64 + hours / 24.0);
    let g = geocentric(t, jd, delta_t_s);
    let (lat, lon) = (place.latitude_deg, place.longitude_deg);
    let phi = lat.to_radians();
    let h = limit_360(g.nu + lon - g.alpha).to_radians(); // eq. 32
    let xi = (8.794 / (3600.0 * g.r)).to_radians(); // eq. 33
    let u = (0.996_647_19 * phi.tan()).atan(); // eq. 34
    let x = u.cos() + place.elevation_m / 6_378_140.0 * phi.cos(); // eq. 35
    let y = 0.996_647_19 * u.sin() + place.elevation_m / 6_378_140.0 * phi.sin(); // eq. 36
    let delta = g.delta.to_radians();
    let denom = delta.cos() - x * xi.sin() * h.cos();
    let dalpha = (-x * xi.sin() * h.sin()).atan2(denom); // eq. 37
    let delta_p = ((delta.sin() - y * xi.sin()) * dalpha.cos()).atan2(denom); // eq. 39
    let h_p = h - dalpha; // eq. 40
    let e0 = (phi.sin() * delta_p.sin() + phi.cos() * delta_p.cos() * h_p.cos()).clamp(-1.0, 1.0).asin().to_degrees(); // eq. 41
    let de = if e0 >= -(SUN_RADIUS_DEG + ATMOS_REFRACTION_DEG) {
        (place.pressure_hpa / 1010.0) * (283.0 / (273.0 + place.temperature_c)) * 1.02
            / (60.0 * (e0 + 10.3 / (e0 + 5.11)).to_radians().tan())
    } else {
        0.0
    }; // eq. 42
    let zenith = 90.0 - (e0 + de); // eqs. 43-44
    let gamma = limit_360(h_p.sin().atan2(h_p.cos() * phi.sin() - delta_p.tan() * phi.cos()).to_degrees()); // eq. 45
    let azimuth = limit_360(gamma + 180.0); // eq. 46
                                            // Eq. 47, with the surface azimuth measured from south, westward positive.
    let (z, w) = (zenith.to_radians(), surface.tilt_deg.to_radians());
    let rot = (gamma - (surface.azimuth_deg - 180.0)).to_radians();
    let incidence = (z.cos() * w.cos() + w.sin() * z.sin() * rot.cos()).clamp(-1.0, 1.0).acos().to_degrees();
    // Appendix A.1: equation of time.
    let jme = g.jme;
    let m = 280.466_456_7 + 360_007.698_277_9 * jme + 0.030_320_28 * jme * jme + jme.powi(3) / 49_931.0
        - jme.powi(4) / 15_300.0
        - jme.powi(5) / 2_000_000.0;
    let mut eot = 4.0 * limit_360(m - 0.005_718_3 - g.alpha + g.dpsi * g.epsilon.to_radians().cos());
    if eot > 20.0 {
        eot -= 1440.0;
    }
    Ok(SunPosition {
        zenith_deg: zenith,
        azimuth_deg: azimuth,
        incidence_deg: incidence,
        equation_of_time_min: eot,
        distance_au: g.r,
    })
}

/// Standard altitude of the sun's centre at sunrise and sunset [deg] (paper, appendix A.2).
const H0_PRIME_DEG: f64 = -0.8333;

/// Sunrise, transit and sunset on the calendar date of `when` (its time of day is ignored),
/// by the paper's appendix A.2, in local clock hours of `when`'s UTC offset.
pub fn sun_day(when: &CivilTime, place: &Observer, delta_t_s: f64) -> Result<SunDay, String> {
    let noon = Surface { tilt_deg: 0.0, azimuth_deg: 180.0 };
    sun_at(&CivilTime { hour: 0, minute: 0, second: 0.0, ..*when }, place, &noon, delta_t_s)?;
    let t = terms()?;
    let jd0 = julian_day(when.year, when.month, when.day as f64); // A.2.1, 0 UT
    let nu = geocentric(t, jd0, 0.0).nu; // A.2.2
    let day = |k: f64| geocentric(t, jd0 + k, 0.0); // A.2.3, delta T = 0
    let (before, today, after) = (day(-1.0), day(0.0), day(1.0));
    let (lat, lon) = (place.latitude_deg, place.longitude_deg);
    let phi = lat.to_radians();
    let m0 = (today.alpha - lon - nu) / 360.0; // A.2.4
    let cos_h0 = (H0_PRIME_DEG.to_radians().sin() - phi.sin() * today.delta.to_radians().sin())
        / (phi.cos() * today.delta.to_radians().cos()); // A.2.5
                                                        // A.2.6-A.2.10: interpolated right ascension and declination, local hour angle, altitude.
    let wrap1 = |v: f64| if v.abs() > 2.0 { v.rem_euclid(1.0) } else { v };
    let (a, b) = (wrap1(today.alpha - before.alpha), wrap1(after.alpha - today.alpha));
    let (ap, bp) = (wrap1(today.delta - before.delta), wrap1(after.delta - today.delta));
    let local = |m: f64| {
        let nu_i = nu + 360.985_647 * m;
        let n = m + delta_t_s / 86400.0;
        let alpha = today.alpha + n * (a + b + (b - a) * n) / 2.0;
        let delta = (today.delta + n * (ap + bp + (bp - ap) * n) / 2.0).to_radians();
        let mut hp = limit_360(nu_i + lon - alpha);
        if hp >= 180.0 {
            hp -= 360.0;
        }
        let h = (phi.sin() * delta.sin() + phi.cos() * delta.cos() * hp.to_radians().cos()).clamp(-1.0, 1.0).asin();
        (hp, h.to_degrees(), delta)
    };
    let to_local_h = |frac: f64| {
        let r = 24.0 * (frac + when.utc_offset_h / 24.0).rem_euclid(1.0);
        if r.is_finite() && r < 24.0 {
            r
        } else {
            0.0
        }
    };
    let m_transit = m0.rem_euclid(1.0);
    let (hp0, _, _) = local(m_transit);
    let transit_h = to_local_h(m_transit - hp0 / 360.0); // A.2.11
    if cos_h0.is_nan() || cos_h0.abs() > 1.0 {
        return Ok(if cos_h0 < -1.0 { SunDay::PolarDay { transit_h } } else { SunDay::PolarNight { transit_h } });
    }
    let h0 = cos_h0.acos().to_degrees(); // 0..180
    let event = |m: f64| {
        let m = m.rem_euclid(1.0);
        let (hp, h, delta) = local(m);
        let step = (h - H0_PRIME_DEG) / (360.0 * delta.cos() * phi.cos() * hp.to_radians().sin());
        to_local_h(if step.is_finite() { m + step } else { m })
    }; // A.2.12-A.2.13
    Ok(SunDay::RiseAndSet { sunrise_h: event(m0 - h0 / 360.0), transit_h, sunset_h: event(m0 + h0 / 360.0) })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_terms_table_parses_with_the_papers_row_counts() {
        // Row counts of Reda & Andreas (2004) tables A4.2 and A4.3.
        assert!(terms().is_ok(), "{:?}", terms().err());
    }

    #[test]
    fn the_terms_file_names_its_sources() {
        // The committed table must say where it comes from (paper and wheel checksum).
        let header: String = TERMS_CSV.lines().take_while(|l| l.starts_with('#')).collect();
        for needle in ["Reda & A. Andreas", "Solar Energy 76", "pvlib 0.16.1", "sha256 "] {
            assert!(header.contains(needle), "{needle}");
        }
    }

    #[test]
    fn julian_day_matches_the_papers_table_a4_1() {
        // Reda & Andreas (2004), table A4.1 examples (the dates and Julian days are recalled,
        // the same list as in J. Meeus, Astronomical Algorithms, ch. 7).
        assert_eq!(julian_day(2000, 1, 1.5), 2_451_545.0);
        assert_eq!(julian_day(1987, 1, 27.0), 2_446_822.5);
        assert_eq!(julian_day(1988, 6, 19.5), 2_447_332.0);
        assert_eq!(julian_day(1600, 12, 31.0), 2_305_812.5);
        assert!((julian_day(837, 4, 10.3) - 2_026_871.8).abs() < 1e-6);
        assert_eq!(julian_day(-1000, 7, 12.5), 1_356_001.0);
        assert_eq!(julian_day(-1000, 2, 29.0), 1_355_866.5);
        assert_eq!(julian_day(-4712, 1, 1.5), 0.0);
    }
}
