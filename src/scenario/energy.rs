//! Energy over a clear day or year at a place: which days, at which step, and the reading of
//! a measured series of spectra (a CSV of timestamped spectra).
//!
//! Measured series, a format of our own: a header line `time,WL1,WL2,...` with the
//! wavelengths in nm, then one line per spectrum: an ISO 8601 timestamp with its UTC offset
//! and the spectral irradiance on the plane [W m^-2 nm^-1] at each wavelength; lines starting
//! with `#` are comments. Each spectrum stands for the time until the next one; the last for
//! the median interval; an interval longer than twice the median (a gap in the record) is
//! cut to the median, so missing data counts no energy.
//!
//! Architecture invariant: ranges live here (and in `PlaceSpec::to_site`); front ends parse
//! text into these fields only.

use super::place::{parse_date, parse_time, PlaceSpec};
use crate::physics::energy_yield::{year_days, ClearSkySeries, MeasuredSeries, SunStep};
use crate::physics::junction::Illumination;
use crate::physics::site::{days_from_civil, Site};
use crate::physics::sources::Source;
use crate::physics::spectrum::{Axis, Quantity, Spectrum};
use serde::{Deserialize, Serialize};

/// The days counted.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum Period {
    /// one date, `YYYY-MM-DD`
    Day { date: String },
    /// every day of a year
    Year { year: i32 },
}

impl Default for Period {
    fn default() -> Self {
        Period::Year { year: 2025 }
    }
}

/// Default step of a day [min] (the contract's "at most 5 minutes").
pub const DAY_STEP_MIN: f64 = 5.0;
/// Default step of a year [min].
pub const YEAR_STEP_MIN: f64 = 15.0;

/// A clear-sky period at a place.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
#[serde(default)]
pub struct YieldSpec {
    pub place: PlaceSpec,
    pub period: Period,
    /// time step [min]; `None` for [`DAY_STEP_MIN`] or [`YEAR_STEP_MIN`]
    pub step_min: Option<f64>,
}

/// A checked clear-sky period, ready to walk.
#[derive(Debug, Clone)]
pub struct YieldSetup {
    pub site: Site,
    pub days: Vec<(i32, u32, u32)>,
    /// [s]
    pub step_s: f64,
}

impl YieldSetup {
    pub fn series(&self) -> ClearSkySeries<'_> {
        ClearSkySeries { site: &self.site, days: &self.days, step_s: self.step_s }
    }

    /// The same place and step over every `stride`-th day, at least `min_step_s` apart:
    /// what a stack's gap search walks over a year.
    pub fn thinned(&self, stride: usize, min_step_s: f64) -> YieldSetup {
        YieldSetup {
            site: self.site,
            days: self.days.iter().copied().step_by(stride.max(1)).collect(),
            step_s: self.step_s.max(min_step_s),
        }
    }
}

impl YieldSpec {
    /// The step in force [min].
    pub fn step_now_min(&self) -> f64 {
        self.step_min.unwrap_or(match self.period {
            Period::Day { .. } => DAY_STEP_MIN,
            Period::Year { .. } => YEAR_STEP_MIN,
        })
    }

    /// Check every value; the days and the site.
    pub fn setup(&self) -> Result<YieldSetup, String> {
        let site = self.place.to_site()?;
        let days = match &self.period {
            Period::Day { date } => vec![parse_date(date)?],
            Period::Year { year } => {
                if !(1900..=2200).contains(year) {
                    return Err(format!("the year {year} is out of range; give 1900 to 2200"));
                }
                year_days(*year)
            }
        };
        let step = self.step_now_min();
        if !(step.is_finite() && (1.0..=60.0).contains(&step)) {
            return Err(format!("the time step {step} min is out of range; give 1 to 60 minutes (e.g. 5)"));
        }
        if matches!(self.period, Period::Day { .. }) && step > DAY_STEP_MIN {
            return Err(format!("the time step {step} min is too long for a day; give at most {DAY_STEP_MIN} minutes"));
        }
        Ok(YieldSetup { site, days, step_s: step * 60.0 })
    }
}

/// Seconds since 1970-01-01 UTC of a parsed time.
fn unix_seconds(t: &crate::physics::solar_position::CivilTime) -> f64 {
    days_from_civil(t.year, t.month, t.day) as f64 * 86_400.0
        + (t.hour as f64 - t.utc_offset_h) * 3600.0
        + t.minute as f64 * 60.0
        + t.second
}

/// Read a measured series (module notes for the format). `name` labels messages.
pub fn read_measured_series(name: &str, text: &str) -> Result<MeasuredSeries, String> {
    let mut lines = text.lines().enumerate().filter(|(_, l)| !l.trim().is_empty() && !l.trim_start().starts_with('#'));
    let (_, header) =
        lines.next().ok_or_else(|| format!("{name}: the file is empty; give a header line time,WL1_NM,WL2_NM,..."))?;
    let cells: Vec<&str> = header.split(',').map(str::trim).collect();
    if cells.len() < 3 || !cells[0].eq_ignore_ascii_case("time") {
        return Err(format!(
            "{name}: the header must be time,WL1_NM,WL2_NM,... (at least two wavelengths in nm), not '{header}'"
        ));
    }
    let wl: Vec<f64> = cells[1..]
        .iter()
        .map(|c| c.parse::<f64>().map_err(|_| format!("{name}: header wavelength '{c}' is not a number in nm")))
        .collect::<Result<_, _>>()?;
    if !wl.windows(2).all(|w| w[1] > w[0]) || wl[0].is_nan() || wl[0] <= 0.0 {
        return Err(format!("{name}: the header wavelengths must be positive and ascending (nm)"));
    }
    let mut rows: Vec<(f64, crate::physics::solar_position::CivilTime, Vec<f64>)> = Vec::new();
    for (i, line) in lines {
        let mut it = line.split(',').map(str::trim);
        let t = it.next().unwrap_or("");
        let when = parse_time(t).map_err(|e| format!("{name} line {}: {e}", i + 1))?;
        let values: Vec<f64> = it
            .map(|c| c.parse::<f64>().map_err(|_| format!("{name} line {}: '{c}' is not a number (W m-2 nm-1)", i + 1)))
            .collect::<Result<_, _>>()?;
        if values.len() != wl.len() {
            return Err(format!("{name} line {}: {} values for {} wavelengths", i + 1, values.len(), wl.len()));
        }
        if values.iter().any(|v| !v.is_finite() || *v < 0.0) {
            return Err(format!("{name} line {}: irradiance must be finite and not negative", i + 1));
        }
        let s = unix_seconds(&when);
        if let Some(last) = rows.last() {
            if s <= last.0 {
                return Err(format!(
                    "{name} line {}: the time {t} is not after the line before; sort the file by time",
                    i + 1
                ));
            }
        }
        rows.push((s, when, values));
    }
    if rows.len() < 2 {
        return Err(format!("{name}: needs at least two timestamped spectra"));
    }
    let mut gaps: Vec<f64> = rows.windows(2).map(|w| w[1].0 - w[0].0).collect();
    gaps.sort_by(f64::total_cmp);
    let median = gaps[gaps.len() / 2];
    let x: Vec<f64> = wl.iter().map(|l| l * 1e-9).collect();
    let mut steps = Vec::with_capacity(rows.len());
    for k in 0..rows.len() {
        let next = rows.get(k + 1).map_or(median, |r| r.0 - rows[k].0);
        let seconds = if next > 2.0 * median { median } else { next };
        let y: Vec<f64> = rows[k].2.iter().map(|v| v * 1e9).collect();
        let plane: f64 =
            rows[k].2.windows(2).zip(wl.windows(2)).map(|(v, l)| 0.5 * (v[0] + v[1]) * (l[1] - l[0])).sum();
        let light = if plane > 0.0 {
            let sp = Spectrum::new(name, "measured spectrum", Axis::Wavelength, Quantity::Irradiance, x.clone(), y)
                .map_err(|e| format!("{name} line {}: {e}", k + 2))?;
            Some(Illumination::one_sun(Source::user(sp)))
        } else {
            None
        };
        steps.push(SunStep { when: rows[k].1, seconds, position: None, plane_w_m2: plane, light });
    }
    Ok(MeasuredSeries { steps })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_series_reads_with_its_intervals() {
        let text = "# test\ntime,400,500,600\n2025-06-01T12:00+02:00,1,1,1\n2025-06-01T12:05+02:00,2,2,2\n\
                    2025-06-01T12:10+02:00,0,0,0\n2025-06-01T13:00+02:00,1,1,1\n";
        let s = read_measured_series("m.csv", text).unwrap();
        let secs: Vec<f64> = s.steps.iter().map(|x| x.seconds).collect();
        // intervals 300, 300, 3000 (cut to the median 300), last = median
        assert_eq!(secs, vec![300.0, 300.0, 300.0, 300.0]);
        assert!((s.steps[1].plane_w_m2 - 400.0).abs() < 1e-12);
        assert!(s.steps[2].light.is_none());
        assert!(read_measured_series("m", "time,400,500\n2025-06-01T12:00,1,1\n")
            .unwrap_err()
            .contains("no UTC offset"));
        assert!(read_measured_series("m", "time,500,400\n").unwrap_err().contains("ascending"));
    }

    #[test]
    fn periods_are_checked() {
        let d = YieldSpec { period: Period::Day { date: "2025-02-30".into() }, ..Default::default() };
        assert!(d.setup().unwrap_err().contains("does not exist"));
        let y = YieldSpec::default().setup().unwrap();
        assert_eq!((y.days.len(), y.step_s), (365, 900.0));
        let long =
            YieldSpec { period: Period::Day { date: "2025-06-21".into() }, step_min: Some(10.0), ..Default::default() };
        assert!(long.setup().unwrap_err().contains("at most 5"));
    }
}
