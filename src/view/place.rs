//! Place and time on the page: the clear-sky light source's shared controls turned into text
//! and numbers (the time slider's clock minutes, the date, the example sites), the sun's
//! figures at the slider's time (sunrise, solar noon, sunset, zenith, azimuth, plane-of-array
//! irradiance), the night notice, and the day's series for the day charts (the plane's
//! irradiance and the cell's electric power at 5-minute steps, with the day's totals).
//!
//! A day series depends on the place, the date and the cell, never on the time of day, so
//! [`DayCache`] keeps it while the time slider moves; the slider costs one [`sun_figures`].
//!
//! Architecture invariant: native code over `scenario` and `physics`; every range check of a
//! place stays in [`PlaceSpec::to_site`], this module only re-expresses the time.

use std::sync::Arc;

use crate::physics::clear_sky::clear_sky_source;
use crate::physics::constants::ev;
use crate::physics::junction::{solve_cell, Illumination};
use crate::physics::site::{moment, Site};
use crate::physics::solar_position::{delta_t_estimate, sun_day, CivilTime, SunDay};
use crate::scenario::place::{clock, parse_date, ClearSkySpec, PlaceSpec};
use crate::scenario::CellScenario;

/// Step of the day charts [min] (288 steps a day).
pub const DAY_STEP_MIN: u32 = 5;
/// Last position of the time slider [min from local midnight].
pub const SLIDER_MAX_MIN: u32 = 1435;

/// How a tab reads and writes its clear-sky source in the scenario.
#[derive(Clone, Copy)]
pub struct PlaceSlot {
    /// the tab's clear-sky source, if that is the source in use
    pub get: fn(&crate::scenario::Scenario) -> Option<ClearSkySpec>,
    /// put a clear-sky source in the tab's place
    pub set: fn(&mut crate::scenario::Scenario, ClearSkySpec),
}

/// The Solar cell's light (the Stack tab's too).
pub const CELL_LIGHT: PlaceSlot = PlaceSlot {
    get: |s| match &s.cell.spectrum {
        crate::scenario::SourceSpec::ClearSky(c) => Some(c.clone()),
        _ => None,
    },
    set: |s, c| s.cell.spectrum = crate::scenario::SourceSpec::ClearSky(c),
};

/// The radiator's sun.
pub const RADIATOR_SUN: PlaceSlot = PlaceSlot {
    get: |s| match &s.radiator.sun {
        Some(crate::scenario::SourceSpec::ClearSky(c)) => Some(c.clone()),
        _ => None,
    },
    set: |s, c| s.radiator.sun = Some(crate::scenario::SourceSpec::ClearSky(c)),
};

/// The solar-thermal absorber's sun (Hot emitters tab).
pub const ABSORBER_SUN: PlaceSlot = PlaceSlot {
    get: |s| match &s.hot.absorber.source {
        crate::scenario::SourceSpec::ClearSky(c) => Some(c.clone()),
        _ => None,
    },
    set: |s, c| s.hot.absorber.source = crate::scenario::SourceSpec::ClearSky(c),
};

/// An example site of our own (a climate and its coordinates, not a real town).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ExampleSite {
    pub key: &'static str,
    pub label: &'static str,
    pub lat_deg: f64,
    pub lon_deg: f64,
    pub elevation_m: f64,
    /// precipitable water typical of the climate [cm] (rough, from memory)
    pub pwv_cm: f64,
}

/// The example sites offered beside the latitude and longitude fields.
pub const EXAMPLES: [ExampleSite; 4] = [
    ExampleSite {
        key: "high-desert",
        label: "Example: high desert, 35 N 115 W, 1000 m",
        lat_deg: 35.0,
        lon_deg: -115.0,
        elevation_m: 1000.0,
        pwv_cm: 0.8,
    },
    ExampleSite {
        key: "northern-city",
        label: "Example: northern city, 60 N 25 E",
        lat_deg: 60.0,
        lon_deg: 25.0,
        elevation_m: 0.0,
        pwv_cm: 1.2,
    },
    ExampleSite {
        key: "tropical-coast",
        label: "Example: tropical coast, 1 N 104 E",
        lat_deg: 1.0,
        lon_deg: 104.0,
        elevation_m: 0.0,
        pwv_cm: 4.5,
    },
    ExampleSite {
        key: "southern-plateau",
        label: "Example: southern plateau, 23 S 47 W, 800 m",
        lat_deg: -23.0,
        lon_deg: -47.0,
        elevation_m: 800.0,
        pwv_cm: 2.5,
    },
];

impl ExampleSite {
    /// `place` moved to this site (its plane and other air values kept).
    pub fn apply(&self, place: &PlaceSpec) -> PlaceSpec {
        PlaceSpec {
            lat_deg: self.lat_deg,
            lon_deg: self.lon_deg,
            elevation_m: self.elevation_m,
            pressure_hpa: None,
            pwv_cm: self.pwv_cm,
            ..place.clone()
        }
    }
}

/// `+HH:MM` of a UTC offset [h] (`Z` is never used, so the text reads the same everywhere).
pub fn offset_text(offset_h: f64) -> String {
    let minutes = (offset_h * 60.0).round() as i64;
    let sign = if minutes < 0 { '-' } else { '+' };
    let m = minutes.abs();
    format!("{sign}{:02}:{:02}", m / 60, m % 60)
}

/// ISO 8601 text of a date, a clock time [min from midnight] and a UTC offset [h].
pub fn time_text(year: i32, month: u32, day: u32, minutes: u32, offset_h: f64) -> String {
    let m = minutes.min(24 * 60 - 1);
    format!("{year:04}-{month:02}-{day:02}T{:02}:{:02}{}", m / 60, m % 60, offset_text(offset_h))
}

/// The source first offered on a page: the default place at 12:00 local mean time (offset
/// round(longitude / 15) h) on the given date (today's, from the browser).
pub fn default_spec(year: i32, month: u32, day: u32) -> ClearSkySpec {
    let place = PlaceSpec::default();
    let offset = crate::physics::site::mean_time_offset_h(place.lon_deg);
    ClearSkySpec { place, time: time_text(year, month, day, 12 * 60, offset) }
}

/// The clock time of `spec` in minutes from its local midnight (seconds dropped).
pub fn clock_minutes(spec: &ClearSkySpec) -> Result<u32, String> {
    let t = spec.when()?;
    Ok((t.hour * 60 + t.minute).min(24 * 60 - 1))
}

/// `YYYY-MM-DD` of `spec`'s date.
pub fn date_text(spec: &ClearSkySpec) -> Result<String, String> {
    let t = spec.when()?;
    Ok(format!("{:04}-{:02}-{:02}", t.year, t.month, t.day))
}

/// `spec` at another clock time of the same date and offset.
pub fn with_minutes(spec: &ClearSkySpec, minutes: u32) -> Result<ClearSkySpec, String> {
    let t = spec.when()?;
    Ok(ClearSkySpec { time: time_text(t.year, t.month, t.day, minutes, t.utc_offset_h), ..spec.clone() })
}

/// `spec` on another date (typed `YYYY-MM-DD`), same clock time and offset.
pub fn with_date(spec: &ClearSkySpec, date: &str) -> Result<ClearSkySpec, String> {
    let (y, m, d) = parse_date(date)?;
    let t = spec.when()?;
    Ok(ClearSkySpec { time: time_text(y, m, d, t.hour * 60 + t.minute, t.utc_offset_h), ..spec.clone() })
}

/// `spec` with a new place: the date and clock time stay, the clock's offset becomes the new
/// longitude's local mean time, round(lon / 15) h, so the slider keeps meaning local time.
pub fn with_place(spec: &ClearSkySpec, place: PlaceSpec) -> Result<ClearSkySpec, String> {
    let t = spec.when()?;
    let offset = if place.lon_deg.is_finite() {
        crate::physics::site::mean_time_offset_h(place.lon_deg.clamp(-180.0, 180.0))
    } else {
        t.utc_offset_h
    };
    Ok(ClearSkySpec { place, time: time_text(t.year, t.month, t.day, t.hour * 60 + t.minute, offset) })
}

/// Sunrise, solar noon and sunset of a day, as clock text in the time's own offset.
#[derive(Debug, Clone, PartialEq)]
pub enum DayText {
    RiseAndSet { sunrise: String, noon: String, sunset: String, sunrise_h: f64, noon_h: f64, sunset_h: f64 },
    PolarDay { noon: String },
    PolarNight { noon: String },
}

/// The sun at the slider's time, for the figures beside the controls.
#[derive(Debug, Clone, PartialEq)]
pub struct SunFigures {
    pub day: DayText,
    /// clock text of the moment, `hh:mm`
    pub at: String,
    pub zenith_deg: f64,
    pub azimuth_deg: f64,
    pub incidence_deg: f64,
    /// plane-of-array global irradiance [W/m2] (300-4000 nm)
    pub plane_w_m2: f64,
}

impl SunFigures {
    /// Whether the plane receives clear-sky light at this moment.
    pub fn lit(&self) -> bool {
        self.plane_w_m2 > 0.0
    }

    /// The notice for a moment without light, or `None` when the plane is lit.
    pub fn dark_notice(&self) -> Option<String> {
        if self.lit() {
            return None;
        }
        let what = if self.zenith_deg >= 90.0 {
            "The sun is below the horizon"
        } else {
            "The sun is behind the plane (tilt and azimuth)"
        };
        let next = match &self.day {
            DayText::RiseAndSet { sunrise, sunset, .. } => {
                format!("; sunrise is {sunrise} and sunset {sunset} — move the time slider.")
            }
            DayText::PolarNight { .. } => "; the sun does not rise that day — pick another date.".to_string(),
            DayText::PolarDay { .. } => " — move the time slider or turn the plane toward the sun.".to_string(),
        };
        Some(format!("{what} at {}{next} The figures shown are from the last lit time.", self.at))
    }
}

/// The sun's day and its position and light at `spec`'s moment.
pub fn sun_figures(spec: &ClearSkySpec) -> Result<SunFigures, String> {
    let site = spec.place.to_site()?;
    let when = spec.when()?;
    let m = moment(&site, &when)?;
    let dt = site.delta_t_s.unwrap_or_else(|| delta_t_estimate(when.decimal_year()));
    let day = match sun_day(&when, &site.observer, dt)? {
        SunDay::RiseAndSet { sunrise_h, transit_h, sunset_h } => DayText::RiseAndSet {
            sunrise: clock(sunrise_h),
            noon: clock(transit_h),
            sunset: clock(sunset_h),
            sunrise_h,
            noon_h: transit_h,
            sunset_h,
        },
        SunDay::PolarDay { transit_h } => DayText::PolarDay { noon: clock(transit_h) },
        SunDay::PolarNight { transit_h } => DayText::PolarNight { noon: clock(transit_h) },
    };
    Ok(SunFigures {
        day,
        at: format!("{:02}:{:02}", when.hour, when.minute),
        zenith_deg: m.position.zenith_deg,
        azimuth_deg: m.position.azimuth_deg,
        incidence_deg: m.position.incidence_deg,
        plane_w_m2: m.spectra.plane_global_total(),
    })
}

/// One day at 5-minute steps: the plane's clear-sky irradiance and a device's electric power.
#[derive(Debug, Clone, PartialEq)]
pub struct DaySeries {
    /// local clock hours of the steps' starts (0, 1/12, ... 23 11/12)
    pub hours: Vec<f64>,
    /// plane-of-array global irradiance [W/m2]
    pub plane_w_m2: Vec<f64>,
    /// the cell's maximum power [W/m2] under each step's spectrum
    pub power_w_m2: Vec<f64>,
    /// the day's incident energy on the plane [kWh/m2]
    pub incident_kwh_m2: f64,
    /// the day's electric energy [kWh/m2]
    pub electric_kwh_m2: f64,
}

impl DaySeries {
    /// Electric over incident energy of the day (0 for a dark day).
    pub fn energy_efficiency(&self) -> f64 {
        crate::physics::energy_yield::Energy {
            incident_j_m2: self.incident_kwh_m2,
            electric_j_m2: self.electric_kwh_m2,
        }
        .efficiency()
    }

    /// The step at a clock time [min], clamped to the day.
    pub fn index_at(&self, minutes: u32) -> usize {
        ((minutes / DAY_STEP_MIN) as usize).min(self.hours.len().saturating_sub(1))
    }
}

/// The clear-sky plane-of-array spectra of a day (night steps empty), one per 5 minutes from
/// local midnight in the clock of `spec`'s time. Depends on the place and the date only.
pub struct DayLight {
    pub hours: Vec<f64>,
    /// per step: total [W/m2] and, when lit, the light source
    pub steps: Vec<(f64, Option<crate::physics::sources::Source>)>,
}

/// Every step of `spec`'s day.
pub fn day_light(spec: &ClearSkySpec) -> Result<DayLight, String> {
    let site: Site = spec.place.to_site()?;
    let t = spec.when()?;
    let n = (24 * 60 / DAY_STEP_MIN) as usize;
    let mut hours = Vec::with_capacity(n);
    let mut steps = Vec::with_capacity(n);
    for k in 0..n as u32 {
        let min = k * DAY_STEP_MIN;
        let when = CivilTime { hour: min / 60, minute: min % 60, second: 0.0, ..t };
        let m = moment(&site, &when)?;
        let total = m.spectra.plane_global_total();
        let source = if total > 0.0 { Some(clear_sky_source(&m.spectra, "clear sky")?) } else { None };
        hours.push(min as f64 / 60.0);
        steps.push((total, source));
    }
    Ok(DayLight { hours, steps })
}

/// The cell's day: each lit step's detailed-balance maximum power (the cell's gap,
/// temperature, ERE, emission, J-V model and concentration) and the day's energies
/// (each step stands for its 5 minutes).
pub fn cell_day(light: &DayLight, cell: &CellScenario) -> Result<DaySeries, String> {
    let probe = CellScenario { spectrum: crate::scenario::SourceSpec::Am15g, ..cell.clone() };
    let mut c = probe.to_physics()?.cell;
    c.gap_j = ev(cell.gap_now());
    series_of(light, cell.concentration, |l| Ok(solve_cell(l, &c).pmax))
}

/// The stack's day: each lit step's maximum power of the stack of `s` (its gaps,
/// connection, real bottom cell and luminescent coupling, the cell's temperature, ERE,
/// emission and concentration) under that step's spectrum.
pub fn stack_day(light: &DayLight, s: &crate::scenario::Scenario) -> Result<DaySeries, String> {
    use crate::scenario::stack::{check_gaps_over, StackSetup};
    let gaps_j = check_gaps_over(&s.stack.gaps_ev, s.stack.bottom.is_some())?;
    s.stack.check_extras()?;
    let probe = CellScenario { spectrum: crate::scenario::SourceSpec::Am15g, ..s.cell.clone() };
    let cell = probe.to_physics()?.cell;
    series_of(light, s.cell.concentration, |l| {
        let extras = s.stack.extras(l, s.cell.cell_temp_k)?;
        let setup = StackSetup {
            light: l.clone(),
            cell,
            gaps_j: gaps_j.clone(),
            connection: s.stack.connection.to_physics(),
            extras,
            warnings: Vec::new(),
        };
        Ok(setup.solve().pmax)
    })
}

/// A device's day: `pmax` of each lit step's light at concentration `x` (0 at night), and
/// the day's energies (each step stands for its 5 minutes).
fn series_of(
    light: &DayLight,
    x: f64,
    mut pmax: impl FnMut(&Illumination) -> Result<f64, String>,
) -> Result<DaySeries, String> {
    let mut power = Vec::with_capacity(light.steps.len());
    for (_, source) in &light.steps {
        power.push(match source {
            Some(src) => pmax(&Illumination { source: src.clone(), concentration: x })?.max(0.0),
            None => 0.0,
        });
    }
    let plane: Vec<f64> = light.steps.iter().map(|(total, _)| *total).collect();
    let step_h = DAY_STEP_MIN as f64 / 60.0;
    Ok(DaySeries {
        hours: light.hours.clone(),
        incident_kwh_m2: plane.iter().sum::<f64>() * x * step_h / 1000.0,
        electric_kwh_m2: power.iter().sum::<f64>() * step_h / 1000.0,
        plane_w_m2: plane,
        power_w_m2: power,
    })
}

/// The place and date of a spec (its clock time ignored): what a day's light depends on.
type DayKey = (PlaceSpec, i32, u32, u32, u64);

fn day_key(spec: &ClearSkySpec) -> Option<DayKey> {
    let t = spec.when().ok()?;
    Some((spec.place.clone(), t.year, t.month, t.day, t.utc_offset_h.to_bits()))
}

/// The day's light and the cell's day, kept while only the time of day changes.
#[derive(Default)]
pub struct DayCache {
    light: Option<(DayKey, Arc<DayLight>)>,
    series: Option<(CellScenario, Arc<DaySeries>)>,
    stack: Option<((CellScenario, crate::scenario::stack::StackScenario), Arc<DaySeries>)>,
    /// how many times a day's light was computed (tests check the slider costs none)
    pub light_runs: u64,
}

impl DayCache {
    /// The cell's day under `spec` (computed only when the place, the date or the cell
    /// other than its source's clock time changed).
    pub fn cell(&mut self, spec: &ClearSkySpec, cell: &CellScenario) -> Result<Arc<DaySeries>, String> {
        let light = self.light(spec)?;
        let cell_key = CellScenario { spectrum: crate::scenario::SourceSpec::Am15g, ..cell.clone() };
        if let Some((k, s)) = &self.series {
            if *k == cell_key {
                return Ok(s.clone());
            }
        }
        let s = Arc::new(cell_day(&light, cell)?);
        self.series = Some((cell_key, s.clone()));
        Ok(s)
    }

    /// The day's light of `spec` (kept while only the time of day changes).
    fn light(&mut self, spec: &ClearSkySpec) -> Result<Arc<DayLight>, String> {
        let key = day_key(spec).ok_or_else(|| format!("the time '{}' cannot be read", spec.time))?;
        if let Some((k, l)) = &self.light {
            if *k == key {
                return Ok(l.clone());
            }
        }
        let l = Arc::new(day_light(spec)?);
        self.light_runs += 1;
        self.light = Some((key, l.clone()));
        self.series = None;
        self.stack = None;
        Ok(l)
    }

    /// The stack's day under `spec` (computed only when the place, the date, the cell or
    /// the stack changed).
    pub fn stack(&mut self, spec: &ClearSkySpec, s: &crate::scenario::Scenario) -> Result<Arc<DaySeries>, String> {
        let light = self.light(spec)?;
        let key = (CellScenario { spectrum: crate::scenario::SourceSpec::Am15g, ..s.cell.clone() }, s.stack.clone());
        if let Some((k, d)) = &self.stack {
            if *k == key {
                return Ok(d.clone());
            }
        }
        let d = Arc::new(stack_day(&light, s)?);
        self.stack = Some((key, d.clone()));
        Ok(d)
    }
}

/// One line of a day chart.
#[derive(Debug, Clone, PartialEq)]
pub struct DayLine {
    /// legend text, without its unit
    pub label: String,
    pub unit: &'static str,
    /// the `data-line` hook and CSS class suffix
    pub key: &'static str,
    pub values: Vec<f64>,
    /// drawn against the right-hand axis (another unit)
    pub right: bool,
}

/// What a day chart draws: lines over local clock hours, the axes' units and the day's
/// totals as a sentence.
#[derive(Debug, Clone, PartialEq)]
pub struct DayPlot {
    pub hours: Vec<f64>,
    pub lines: Vec<DayLine>,
    pub left_unit: &'static str,
    pub right_unit: &'static str,
    pub totals: String,
}

impl DayPlot {
    /// The read-out of step `i`: clock time and each line's value.
    pub fn readout(&self, i: usize) -> Option<String> {
        let h = *self.hours.get(i)?;
        let m = (h * 60.0).round() as u32;
        let mut parts = vec![format!("{:02}:{:02}", m / 60, m % 60)];
        for l in &self.lines {
            let v = l.values.get(i).copied().unwrap_or(f64::NAN);
            let text = if v.is_finite() { crate::view::format::fixed(v, 1) } else { "—".to_string() };
            parts.push(format!("{} {text} {}", l.label, l.unit));
        }
        Some(parts.join(" · "))
    }
}

impl DaySeries {
    /// The cell's (or stack's) day chart; `device` names the device ("cell", "stack").
    pub fn plot(&self, device: &str) -> DayPlot {
        let f = |v: f64, d: usize| crate::view::format::fixed(v, d);
        DayPlot {
            hours: self.hours.clone(),
            lines: vec![
                DayLine { label: "on the plane".into(), unit: "W/m²", key: "plane", values: self.plane_w_m2.clone(), right: false },
                DayLine {
                    label: format!("{device}'s electric power"),
                    unit: "W/m²",
                    key: "power",
                    values: self.power_w_m2.clone(),
                    right: false,
                },
            ],
            left_unit: "W/m²",
            right_unit: "",
            totals: format!(
                "The day (clear sky, no clouds): incident {} kWh/m² on the plane, electric {} kWh/m², energy efficiency {} %.",
                f(self.incident_kwh_m2, 2),
                f(self.electric_kwh_m2, 2),
                f(100.0 * self.energy_efficiency(), 1)
            ),
        }
    }
}

/// Day chart geometry (SVG user units): width, height and the plot area's margins.
pub const W: f64 = 640.0;
pub const H: f64 = 260.0;
pub const LEFT: f64 = 52.0;
pub const RIGHT: f64 = 46.0;
pub const TOP: f64 = 12.0;
pub const BOTTOM: f64 = 34.0;

/// The x of a clock hour (0-24) on the day chart.
pub fn x_of(h: f64) -> f64 {
    LEFT + (W - LEFT - RIGHT) * h / 24.0
}

/// An axis: (from, to, step).
type AxisRange = (f64, f64, f64);

/// A rounded axis range holding `lo`..`hi` and 0 in steps of 1, 2, 2.5 or 5 times a power
/// of ten, about four of them.
pub fn nice_range(lo: f64, hi: f64) -> AxisRange {
    let (lo, hi) = (lo.min(0.0), hi.max(0.0));
    let span = (hi - lo).max(1e-9);
    let raw = span / 4.0;
    let mag = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 2.5, 5.0, 10.0].iter().map(|k| k * mag).find(|s| *s >= raw).unwrap_or(10.0 * mag);
    let from = (lo / step).floor() * step;
    let to = (hi / step).ceil() * step;
    (from, to.max(from + step), step)
}

fn y_of(v: f64, r: AxisRange) -> f64 {
    TOP + (H - TOP - BOTTOM) * (1.0 - ((v - r.0) / (r.1 - r.0)).clamp(0.0, 1.0))
}

fn svg_path(hours: &[f64], ys: &[f64], r: AxisRange) -> String {
    let mut d = String::with_capacity(hours.len() * 14);
    let mut pen = false;
    for (h, v) in hours.iter().zip(ys) {
        if !v.is_finite() {
            pen = false;
            continue;
        }
        d.push_str(&format!("{}{:.1},{:.1}", if pen { "L" } else { "M" }, x_of(*h), y_of(*v, r)));
        pen = true;
    }
    d
}

/// The left and right axes of a day plot; with a right axis both put zero at one height.
pub fn day_axes(p: &DayPlot) -> (AxisRange, Option<AxisRange>) {
    let span = |right: bool| {
        p.lines
            .iter()
            .filter(|l| l.right == right)
            .flat_map(|l| l.values.iter().copied())
            .filter(|v| v.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)))
    };
    let range = |(lo, hi): (f64, f64)| if lo.is_finite() { nice_range(lo, hi) } else { nice_range(0.0, 1.0) };
    let mut left = range(span(false));
    let mut right = p.lines.iter().any(|l| l.right).then(|| range(span(true)));
    if let Some(r) = right.as_mut() {
        let below = (-left.0 / left.2).round().max((-r.0 / r.2).round());
        let above = (left.1 / left.2).round().max((r.1 / r.2).round());
        left = (-below * left.2, above * left.2, left.2);
        *r = (-below * r.2, above * r.2, r.2);
    }
    (left, right)
}

fn escape(t: &str) -> String {
    t.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// The day chart's fixed layers as SVG markup: grid, tick labels, axis titles and one path
/// per line (`class="day-KEY"`, `data-line="KEY"`). The page adds the marker and the pointer
/// line over it.
pub fn svg_body(p: &DayPlot) -> String {
    use std::fmt::Write;
    let (left, right) = day_axes(p);
    let mut out = String::with_capacity(16_000);
    for k in 0..=8 {
        let x = x_of(3.0 * k as f64);
        let _ = write!(
            out,
            r#"<line class="grid" x1="{x:.1}" x2="{x:.1}" y1="{TOP}" y2="{}"/><text x="{x:.1}" y="{}" text-anchor="middle">{:02}:00</text>"#,
            H - BOTTOM,
            H - BOTTOM + 15.0,
            3 * k
        );
    }
    let mut axis = |r: AxisRange, x: f64, anchor: &str, grid: bool| {
        let n = ((r.1 - r.0) / r.2).round() as usize;
        for k in 0..=n {
            let v = r.0 + r.2 * k as f64;
            let y = y_of(v, r);
            if grid {
                let class = if v.abs() < 1e-9 * r.2 { "grid zero" } else { "grid" };
                let _ =
                    write!(out, r#"<line class="{class}" x1="{LEFT}" x2="{}" y1="{y:.1}" y2="{y:.1}"/>"#, W - RIGHT);
            }
            let text = crate::view::format::fixed(v, if r.2 < 1.0 { 1 } else { 0 });
            let _ = write!(out, r#"<text x="{x}" y="{:.1}" text-anchor="{anchor}">{text}</text>"#, y + 4.0);
        }
    };
    axis(left, LEFT - 6.0, "end", true);
    if let Some(r) = right {
        axis(r, W - RIGHT + 6.0, "start", false);
    }
    let mid = (TOP + H - BOTTOM) / 2.0;
    let _ = write!(
        out,
        r#"<text x="12" y="{mid}" text-anchor="middle" transform="rotate(-90 12 {mid})">{}</text>"#,
        escape(p.left_unit)
    );
    if right.is_some() {
        let _ = write!(
            out,
            r#"<text x="{x}" y="{mid}" text-anchor="middle" transform="rotate(90 {x} {mid})">{}</text>"#,
            escape(p.right_unit),
            x = W - 8.0
        );
    }
    let _ = write!(
        out,
        r#"<text x="{}" y="{}" text-anchor="middle">local clock time (h)</text>"#,
        (LEFT + W - RIGHT) / 2.0,
        H - 4.0
    );
    for l in &p.lines {
        let r = if l.right { right.unwrap_or(left) } else { left };
        let _ = write!(
            out,
            r#"<path class="day-{k}" data-line="{k}" d="{}"/>"#,
            svg_path(&p.hours, &l.values, r),
            k = escape(l.key)
        );
    }
    out
}

/// Step of the radiator's day [min] (96 steps a day: each one is a whole radiative balance
/// with its steady-temperature search).
pub const RADIATOR_STEP_MIN: u32 = 15;

/// A radiator through a clear day at a constant ambient temperature (the radiator's own
/// setting): net cooling power with the surface at ambient, and the steady temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct RadiatorDay {
    pub hours: Vec<f64>,
    /// net cooling power at ambient [W/m2] (positive: the surface cools)
    pub net_w_m2: Vec<f64>,
    /// steady surface temperature [K] (NaN where the search found none in range)
    pub steady_k: Vec<f64>,
    /// the plane-of-array irradiance of each step [W/m2]
    pub plane_w_m2: Vec<f64>,
    pub ambient_k: f64,
}

/// The radiator's day under `spec`: at each 15-minute step the radiator scenario with its
/// sun the clear sky of that moment (no sun while the plane is dark) and its surface at
/// ambient. The sun's direction for a directional surface stays the radiator's own setting.
pub fn radiator_day(
    spec: &ClearSkySpec,
    sc: &crate::scenario::radiator::RadiatorScenario,
) -> Result<RadiatorDay, String> {
    use crate::physics::radiator::{evaluate, Steady};
    use crate::scenario::SourceSpec;
    let site = spec.place.to_site()?;
    let t = spec.when()?;
    let n = (24 * 60 / RADIATOR_STEP_MIN) as usize;
    let mut out = RadiatorDay {
        hours: Vec::with_capacity(n),
        net_w_m2: Vec::with_capacity(n),
        steady_k: Vec::with_capacity(n),
        plane_w_m2: Vec::with_capacity(n),
        ambient_k: sc.ambient_k,
    };
    for k in 0..n as u32 {
        let min = k * RADIATOR_STEP_MIN;
        let when = CivilTime { hour: min / 60, minute: min % 60, second: 0.0, ..t };
        let plane = moment(&site, &when)?.spectra.plane_global_total();
        let mut step = sc.clone();
        step.surface_k = None;
        step.sun = (plane > 0.0).then(|| {
            SourceSpec::ClearSky(ClearSkySpec {
                place: spec.place.clone(),
                time: time_text(t.year, t.month, t.day, min, t.utc_offset_h),
            })
        });
        let setup = step.to_physics()?;
        let e = evaluate(&setup.emitter, &setup.surroundings, setup.surface_k);
        out.hours.push(min as f64 / 60.0);
        out.net_w_m2.push(e.at_surface.net);
        out.steady_k.push(match e.steady {
            Steady::At(k) => k,
            _ => f64::NAN,
        });
        out.plane_w_m2.push(plane);
    }
    Ok(out)
}

impl RadiatorDay {
    /// The day's cooling energy at ambient [kWh/m2] (net power summed where positive and
    /// where negative together).
    pub fn net_kwh_m2(&self) -> f64 {
        self.net_w_m2.iter().sum::<f64>() * RADIATOR_STEP_MIN as f64 / 60.0 / 1000.0
    }

    pub fn plot(&self) -> DayPlot {
        let f = |v: f64, d: usize| crate::view::format::fixed(v, d);
        let finite = self.steady_k.iter().copied().filter(|v| v.is_finite());
        let (lo, hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
        let span = if lo.is_finite() {
            format!("; steady temperature {}-{} K against {} K ambient", f(lo, 1), f(hi, 1), f(self.ambient_k, 1))
        } else {
            String::new()
        };
        DayPlot {
            hours: self.hours.clone(),
            lines: vec![
                DayLine {
                    label: "net cooling at ambient".into(),
                    unit: "W/m²",
                    key: "net",
                    values: self.net_w_m2.clone(),
                    right: false,
                },
                DayLine {
                    label: "steady temperature − ambient".into(),
                    unit: "K",
                    key: "steady",
                    values: self.steady_k.iter().map(|t| t - self.ambient_k).collect(),
                    right: true,
                },
            ],
            left_unit: "W/m²",
            right_unit: "K",
            totals: format!(
                "The day (clear sky, no clouds, constant ambient {} K): net cooling {} kWh/m² at ambient{span}.",
                f(self.ambient_k, 1),
                f(self.net_kwh_m2(), 2)
            ),
        }
    }
}

/// The radiator's day, kept while only the time of day (or the surface temperature, which
/// the day does not use) changes.
#[derive(Default)]
pub struct RadiatorDayCache {
    day: Option<((crate::scenario::radiator::RadiatorScenario, DayKey), Arc<RadiatorDay>)>,
    /// how many days were computed
    pub runs: u64,
}

impl RadiatorDayCache {
    pub fn day(
        &mut self,
        spec: &ClearSkySpec,
        sc: &crate::scenario::radiator::RadiatorScenario,
    ) -> Result<Arc<RadiatorDay>, String> {
        let day = day_key(spec).ok_or_else(|| format!("the time '{}' cannot be read", spec.time))?;
        let key = (crate::scenario::radiator::RadiatorScenario { sun: None, surface_k: None, ..sc.clone() }, day);
        if let Some((k, d)) = &self.day {
            if *k == key {
                return Ok(d.clone());
            }
        }
        let d = Arc::new(radiator_day(spec, sc)?);
        self.runs += 1;
        self.day = Some((key, d.clone()));
        Ok(d)
    }
}

/// Step of the year view [s] (15 minutes).
pub const YEAR_STEP_S: f64 = 900.0;

/// A clear-sky year at the place of a cell's light: the incident and electric energy of the
/// cell, its electric energy against band gap, the gap of most energy and the AM1.5G
/// optimum gap with the year's energy at each. One sun (the cell's concentration is not
/// applied), the cell's temperature, ERE and emission.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct YearView {
    pub year: i32,
    /// the cell's band gap [eV]
    pub gap_ev: f64,
    /// [kWh/m2] on the plane over the year
    pub incident_kwh_m2: f64,
    /// [kWh/m2] of the cell at its own gap
    pub electric_kwh_m2: f64,
    /// band gaps of the curve [eV], ascending, and the year's electric energy [kWh/m2]
    pub curve_gaps_ev: Vec<f64>,
    pub curve_kwh_m2: Vec<f64>,
    /// the gap of most energy (parabola through the grid's best point) [eV] and its energy
    pub best_gap_ev: f64,
    pub best_kwh_m2: f64,
    /// the AM1.5G optimum gap [eV] and the year's energy at it
    pub am15_gap_ev: f64,
    pub am15_kwh_m2: f64,
}

impl YearView {
    pub fn energy_efficiency(&self) -> f64 {
        crate::physics::energy_yield::Energy {
            incident_j_m2: self.incident_kwh_m2,
            electric_j_m2: self.electric_kwh_m2,
        }
        .efficiency()
    }
}

/// The year of `spec`'s date at `spec`'s place for the cell `cell` (its gap, temperature,
/// ERE, emission and J-V model) at 15-minute steps; `progress(days done, days)` after each
/// day. Band gaps 0.5-2.5 eV every 0.01 eV, plus the cell's own and the AM1.5G optimum, all
/// in one pass over the steps.
pub fn year_view(
    spec: &ClearSkySpec,
    cell: &CellScenario,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<YearView, String> {
    use crate::physics::constants::to_ev;
    use crate::physics::energy_yield::{gap_curve, year_days, ClearSkySeries};
    use crate::physics::junction::{best_gap, sweep};
    let site = spec.place.to_site()?;
    let year = spec.when()?.year;
    let am15 = CellScenario { spectrum: crate::scenario::SourceSpec::Am15g, concentration: 1.0, ..cell.clone() };
    let setup = am15.to_physics()?;
    let template = setup.cell;
    // the AM1.5G optimum over the same range (the page's efficiency-curve search)
    let grid: Vec<f64> = (0..=200).map(|k| ev(0.5 + 0.01 * k as f64)).collect();
    let am15_best = best_gap(&setup.light, &template, &sweep(&setup.light, &template, &grid))
        .map(|r| r.gap_j)
        .ok_or("the AM1.5G optimum could not be found")?;
    let own = ev(cell.gap_now());
    let mut gaps = grid.clone();
    gaps.extend([own, am15_best]);
    gaps.sort_by(|a, b| a.total_cmp(b));
    gaps.dedup();
    let days = year_days(year);
    let series = ClearSkySeries { site: &site, days: &days, step_s: YEAR_STEP_S };
    let curve = gap_curve(&series, &template, &gaps, progress)?;
    let kwh = |j: f64| j / 3.6e6;
    let at = |g: f64| gaps.iter().position(|x| *x == g).map(|i| kwh(curve.electric_j_m2[i])).unwrap_or(0.0);
    let (best_j, best_e) = curve.best().ok_or("the year has no light at this place")?;
    Ok(YearView {
        year,
        gap_ev: cell.gap_now(),
        incident_kwh_m2: kwh(curve.incident_j_m2),
        electric_kwh_m2: at(own),
        curve_gaps_ev: gaps.iter().map(|g| to_ev(*g)).collect(),
        curve_kwh_m2: curve.electric_j_m2.iter().map(|e| kwh(*e)).collect(),
        best_gap_ev: to_ev(best_j),
        best_kwh_m2: kwh(best_e),
        am15_gap_ev: to_ev(am15_best),
        am15_kwh_m2: at(am15_best),
    })
}

/// The year's electric energy against band gap as SVG markup (the day chart's frame), with
/// the gap of most energy, the AM1.5G optimum and the cell's gap marked.
pub fn year_svg(y: &YearView) -> String {
    use std::fmt::Write;
    let (g0, g1) = (0.5, 2.5);
    let xg = |g: f64| LEFT + (W - LEFT - RIGHT) * (g - g0) / (g1 - g0);
    let top = y.curve_kwh_m2.iter().copied().fold(0.0, f64::max);
    let r = nice_range(0.0, top);
    let mut out = String::with_capacity(12_000);
    for k in 0..=8 {
        let g = g0 + 0.25 * k as f64;
        let x = xg(g);
        let _ = write!(
            out,
            r#"<line class="grid" x1="{x:.1}" x2="{x:.1}" y1="{TOP}" y2="{}"/><text x="{x:.1}" y="{}" text-anchor="middle">{}</text>"#,
            H - BOTTOM,
            H - BOTTOM + 15.0,
            crate::view::format::fixed(g, 2)
        );
    }
    let n = ((r.1 - r.0) / r.2).round() as usize;
    for k in 0..=n {
        let v = r.0 + r.2 * k as f64;
        let yy = y_of(v, r);
        let _ = write!(
            out,
            r#"<line class="grid" x1="{LEFT}" x2="{}" y1="{yy:.1}" y2="{yy:.1}"/><text x="{}" y="{:.1}" text-anchor="end">{}</text>"#,
            W - RIGHT,
            LEFT - 6.0,
            yy + 4.0,
            crate::view::format::fixed(v, 0)
        );
    }
    let mid = (TOP + H - BOTTOM) / 2.0;
    let _ = write!(
        out,
        r#"<text x="12" y="{mid}" text-anchor="middle" transform="rotate(-90 12 {mid})">kWh/m²</text><text x="{}" y="{}" text-anchor="middle">band gap (eV)</text>"#,
        (LEFT + W - RIGHT) / 2.0,
        H - 4.0
    );
    let mut d = String::new();
    for (i, (g, e)) in y.curve_gaps_ev.iter().zip(&y.curve_kwh_m2).enumerate() {
        let _ = write!(d, "{}{:.1},{:.1}", if i == 0 { "M" } else { "L" }, xg(*g), y_of(*e, r));
    }
    let _ = write!(out, r#"<path class="day-power" data-line="year" d="{d}"/>"#);
    for (g, class, key) in
        [(y.gap_ev, "day-marker", "cell"), (y.am15_gap_ev, "year-am15", "am15"), (y.best_gap_ev, "year-best", "best")]
    {
        let x = xg(g.clamp(g0, g1));
        let _ = write!(
            out,
            r#"<line class="{class}" data-gap="{key}" x1="{x:.1}" x2="{x:.1}" y1="{TOP}" y2="{}"/>"#,
            H - BOTTOM
        );
    }
    out
}

/// The typical value and meaning of each atmosphere field, for its hint (values are typical
/// clear-sky inputs, common practice).
pub const ATMOSPHERE_HINTS: [(&str, &str); 7] = [
    ("elevation", "Height above sea level; sets the air pressure (standard atmosphere). Typical 0-2000 m."),
    ("pwv", "Precipitable water: the water vapour above the place as a liquid depth. Typical 0.5 (dry) to 5 cm (humid)."),
    ("ozone", "Total ozone column. Typical 0.25-0.45 atm-cm (0.3 = 300 Dobson units)."),
    ("aod500", "Aerosol optical depth at 500 nm: haze and dust. Typical 0.05 (very clean) to 0.5 (hazy)."),
    ("angstrom", "Angstrom exponent: how fast aerosol extinction falls with wavelength. Typical 1-1.4; near 0 for dust."),
    ("albedo", "Ground albedo: the fraction of light the ground reflects onto a tilted plane. Typical 0.2; fresh snow 0.8."),
    ("sky-model", "How diffuse sky light reaches a tilted plane: isotropic (the same from every part of the sky) or Hay-Davies (brighter around the sun)."),
];

/// The hint of an atmosphere field by key.
pub fn atmosphere_hint(key: &str) -> &'static str {
    ATMOSPHERE_HINTS.iter().find(|(k, _)| *k == key).map(|(_, h)| *h).unwrap_or("")
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(lat: f64, lon: f64, time: &str) -> ClearSkySpec {
        ClearSkySpec { place: PlaceSpec { lat_deg: lat, lon_deg: lon, ..PlaceSpec::default() }, time: time.into() }
    }

    #[test]
    fn default_is_noon_local_mean_time() {
        // round(lon / 15) h is the brief's own rule; 7 E rounds to +00:00
        let s = default_spec(2026, 12, 3);
        assert_eq!(s.time, "2026-12-03T12:00+00:00");
        assert_eq!(s.place, PlaceSpec::default());
        assert_eq!(offset_text(-7.0), "-07:00");
        assert_eq!(offset_text(5.5), "+05:30");
        assert_eq!(time_text(2024, 6, 21, 1435, 2.0), "2024-06-21T23:55+02:00");
    }

    #[test]
    fn slider_date_and_place_reexpress_the_time() {
        let s = spec(45.0, 7.0, "2024-06-21T12:00+02:00");
        assert_eq!(clock_minutes(&s).unwrap(), 720);
        let s2 = with_minutes(&s, 310).unwrap();
        assert_eq!(s2.time, "2024-06-21T05:10+02:00");
        assert_eq!(with_date(&s2, "2024-12-21").unwrap().time, "2024-12-21T05:10+02:00");
        assert!(with_date(&s2, "2024-02-30").unwrap_err().contains("does not exist"));
        let moved = with_place(&s2, EXAMPLES[0].apply(&s2.place)).unwrap();
        // 115 W: round(-115 / 15) = round(-7.67) = -8
        assert_eq!(moved.time, "2024-06-21T05:10-08:00");
        assert_eq!(moved.place.elevation_m, 1000.0);
        assert_eq!(date_text(&moved).unwrap(), "2024-06-21");
    }

    #[test]
    fn solar_noon_follows_the_equation_of_time() {
        // common practice: solar noon = 12 h - EoT - (lon - 15 * offset) / 15 h. Near
        // 3 November the equation of time is about +16.4 min (from memory; almanac tables).
        let s = spec(40.0, -105.0, "2024-11-03T12:00-07:00");
        let f = sun_figures(&s).unwrap();
        let DayText::RiseAndSet { noon_h, sunrise_h, sunset_h, .. } = f.day else { panic!("the sun rises at 40 N") };
        let expected = 12.0 - 16.4 / 60.0;
        assert!((noon_h - expected).abs() < 1.0 / 60.0, "noon {noon_h} h");
        // a day is symmetric about solar noon to within a few minutes
        assert!(((sunrise_h + sunset_h) / 2.0 - noon_h).abs() < 3.0 / 60.0);
        assert!(f.lit());
        assert!(f.zenith_deg > 40.0 && f.zenith_deg < 60.0);
    }

    #[test]
    fn night_gives_a_notice_with_sunrise() {
        let s = spec(45.0, 7.0, "2024-06-21T02:10+00:00");
        let f = sun_figures(&s).unwrap();
        let n = f.dark_notice().unwrap();
        assert!(n.starts_with("The sun is below the horizon at 02:10; sunrise is 0"), "{n}");
        assert!(n.contains("move the time slider"));
        // polar night (common practice: no sunrise at 80 N in December)
        let p = sun_figures(&spec(80.0, 0.0, "2024-12-21T12:00+00:00")).unwrap();
        assert!(p.dark_notice().unwrap().contains("does not rise"));
    }

    #[test]
    fn a_cells_day_adds_up_and_is_cached() {
        let s = spec(35.0, -115.0, "2024-06-21T12:00-08:00");
        let cell = CellScenario::default();
        let mut cache = DayCache::default();
        let d = cache.cell(&s, &cell).unwrap();
        assert_eq!(d.hours.len(), 288);
        // night has neither light nor power
        assert_eq!(d.plane_w_m2[0], 0.0);
        assert_eq!(d.power_w_m2[0], 0.0);
        // the slider's moment agrees with the day's step at that time
        let noon = sun_figures(&s).unwrap();
        let k = d.index_at(720);
        assert!((d.plane_w_m2[k] - noon.plane_w_m2).abs() < 1e-9 * noon.plane_w_m2);
        // a step's power is the same cell solved under that moment's source
        let mut one = cell.clone();
        one.spectrum = crate::scenario::SourceSpec::ClearSky(s.clone());
        let setup = one.to_physics().unwrap();
        let direct = solve_cell(&setup.light, &setup.cell).pmax;
        assert!((d.power_w_m2[k] - direct).abs() < 1e-9 * direct);
        // Shockley-Queisser (1961): an ideal 1.34 eV cell converts about a third of
        // sunlight; over a clear day the energy efficiency stays near that.
        let eta = d.energy_efficiency();
        assert!(eta > 0.28 && eta < 0.36, "{eta}");
        // a clear June day in a high desert brings roughly 7-9 kWh/m2 to a horizontal
        // plane (from memory; clear-sky solar-resource tables)
        assert!(d.incident_kwh_m2 > 6.5 && d.incident_kwh_m2 < 9.5, "{}", d.incident_kwh_m2);
        // moving the slider does not recompute the day
        let later = with_minutes(&s, 905).unwrap();
        let d2 = cache.cell(&later, &cell).unwrap();
        assert!(Arc::ptr_eq(&d, &d2));
        assert_eq!(cache.light_runs, 1);
        // another date does
        cache.cell(&with_date(&s, "2024-12-21").unwrap(), &cell).unwrap();
        assert_eq!(cache.light_runs, 2);
    }

    #[test]
    fn a_radiators_day_cools_less_in_the_sun() {
        use crate::scenario::radiator::RadiatorScenario;
        let s = spec(35.0, -115.0, "2024-06-21T12:00-08:00");
        let sc = RadiatorScenario::default();
        let t0 = std::time::Instant::now();
        let d = radiator_day(&s, &sc).unwrap();
        eprintln!("radiator day: {:?}", t0.elapsed());
        assert_eq!(d.hours.len(), 96);
        // at night the sun adds nothing; at noon it adds absorbed sunlight, so the net
        // cooling at ambient is lower (energy balance, common practice)
        let midnight = d.net_w_m2[0];
        let noon = d.net_w_m2[48];
        assert!(noon < midnight, "noon {noon} W/m2, midnight {midnight} W/m2");
        assert_eq!(d.plane_w_m2[0], 0.0);
        assert!(d.plane_w_m2[48] > 800.0);
        // a surface that cools at ambient settles below ambient (steady state with positive
        // net power at ambient, common practice)
        if midnight > 0.0 {
            assert!(d.steady_k[0] < d.ambient_k);
        }
        let p = d.plot();
        assert!(p.totals.contains("constant ambient"));
        assert_eq!(p.lines.len(), 2);
    }

    #[test]
    fn a_stacks_day_beats_its_single_cell() {
        let s = spec(35.0, -115.0, "2024-06-21T12:00-08:00");
        let mut sc = crate::scenario::Scenario::default();
        sc.cell.spectrum = crate::scenario::SourceSpec::ClearSky(s.clone());
        let mut cache = DayCache::default();
        let stack = cache.stack(&s, &sc).unwrap();
        let one = cache.cell(&s, &sc.cell).unwrap();
        assert_eq!(cache.light_runs, 1);
        assert_eq!(stack.incident_kwh_m2, one.incident_kwh_m2);
        // De Vos (1980): two junctions beat one under sunlight (about 42-46 % against 31-34 %
        // in the radiative limit)
        assert!(stack.energy_efficiency() > one.energy_efficiency() + 0.05, "{}", stack.energy_efficiency());
        assert!(stack.energy_efficiency() < 0.50);
    }

    #[test]
    fn chart_axes_are_round_and_share_zero() {
        // common practice: ticks at 1, 2, 2.5 or 5 times a power of ten
        assert_eq!(nice_range(0.0, 1071.0), (0.0, 1500.0, 500.0));
        assert_eq!(nice_range(-922.0, 150.0), (-1000.0, 500.0, 500.0));
        let p = DayPlot {
            hours: vec![0.0, 12.0],
            lines: vec![
                DayLine { label: "a".into(), unit: "W/m²", key: "net", values: vec![150.0, -922.0], right: false },
                DayLine { label: "b".into(), unit: "K", key: "steady", values: vec![-28.0, 95.0], right: true },
            ],
            left_unit: "W/m²",
            right_unit: "K",
            totals: String::new(),
        };
        let (l, r) = day_axes(&p);
        let r = r.unwrap();
        // zero sits at the same height on both axes
        assert!((y_of(0.0, l) - y_of(0.0, r)).abs() < 1e-9);
        assert!(l.0 <= -922.0 && l.1 >= 150.0 && r.0 <= -28.0 && r.1 >= 95.0);
        let svg = svg_body(&p);
        assert!(svg.contains(r#"data-line="net""#) && svg.contains(r#"data-line="steady""#));
        assert!(svg.contains("local clock time (h)"));
        assert_eq!(svg.matches("<path").count(), 2);
    }

    #[test]
    fn a_clear_year_peaks_near_the_am15_gap() {
        // a coarse run of the same function would be faster, but the year is the contract:
        // 366 days of 2024 at 15-minute steps
        let s = spec(35.0, -115.0, "2024-06-21T12:00-08:00");
        let mut days = 0;
        let y = year_view(&s, &CellScenario::default(), &mut |d, _| days = d).unwrap();
        assert_eq!(days, 366);
        // Shockley-Queisser under AM1.5G (Ruhle 2016): the optimum is near 1.34 eV
        assert!((y.am15_gap_ev - 1.34).abs() < 0.03, "{}", y.am15_gap_ev);
        // clear-sky years are bluer at noon and redder at dawn; the yield-optimal gap stays
        // within about 0.15 eV of the AM1.5G one (common practice; energy-yield studies)
        assert!((y.best_gap_ev - y.am15_gap_ev).abs() < 0.15, "{} vs {}", y.best_gap_ev, y.am15_gap_ev);
        assert!(y.best_kwh_m2 >= y.am15_kwh_m2);
        // a horizontal plane in a high desert: roughly 2300-2700 kWh/m2 a year under a clear
        // sky (from memory; clear-sky resource tables, without clouds)
        assert!(y.incident_kwh_m2 > 2000.0 && y.incident_kwh_m2 < 3000.0, "{}", y.incident_kwh_m2);
        let eta = y.energy_efficiency();
        assert!(eta > 0.28 && eta < 0.36, "{eta}");
        assert!(year_svg(&y).contains(r#"data-gap="best""#));
    }
}
