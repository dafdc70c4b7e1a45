//! The air temperature through a day from its minimum and maximum: the two-piece cosine
//! commonly used when only the daily extremes are known (common practice; no source is
//! claimed beyond that). The minimum falls at sunrise, the maximum at 14:00 local solar
//! time; between them the air warms along half a cosine, and from the maximum to the next
//! sunrise (taken as today's sunrise one day later, so the day is periodic) it cools along
//! another.
//!
//! [`HourlyAir`] takes measured or chosen values at clock hours instead, joined by straight
//! lines and periodic over the day.
//!
//! Architecture invariant: pure functions of numbers (hours and kelvin); never NaN for
//! finite input.

/// One day's air temperature model. Times are clock hours of one clock (any UTC offset,
/// as long as all three use the same one).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DailyAir {
    /// the daily minimum [K], reached at `sunrise_h`
    pub min_k: f64,
    /// the daily maximum [K], reached at `peak_h`
    pub max_k: f64,
    /// sunrise [h]
    pub sunrise_h: f64,
    /// the time of the maximum [h], after `sunrise_h` and less than 24 h after it
    pub peak_h: f64,
}

impl DailyAir {
    /// The model with its maximum at 14:00 local solar time, i.e. 2 h after the solar noon
    /// `solar_noon_h` [h]; `sunrise_h` `None` on polar day or night, where the solar noon
    /// minus 6 h stands in for the sunrise.
    pub fn new(min_k: f64, max_k: f64, sunrise_h: Option<f64>, solar_noon_h: f64) -> DailyAir {
        let peak_h = solar_noon_h + 2.0;
        let mut sunrise_h = sunrise_h.unwrap_or(solar_noon_h - 6.0);
        // the sunrise before the peak, within a day of it
        while sunrise_h >= peak_h {
            sunrise_h -= 24.0;
        }
        while sunrise_h < peak_h - 24.0 {
            sunrise_h += 24.0;
        }
        DailyAir { min_k, max_k, sunrise_h, peak_h }
    }

    /// The air temperature [K] at clock hour `h` (any real hour; the model repeats every
    /// 24 h).
    pub fn at(&self, h: f64) -> f64 {
        let span = self.max_k - self.min_k;
        let rise = (self.peak_h - self.sunrise_h).max(1e-9);
        // hours since the sunrise, in [0, 24)
        let t = (h - self.sunrise_h).rem_euclid(24.0);
        if t <= rise {
            // warming: min at sunrise, max at the peak
            self.min_k + span * 0.5 * (1.0 - (std::f64::consts::PI * t / rise).cos())
        } else {
            // cooling: max at the peak, min at the next sunrise
            let fall = 24.0 - rise;
            self.max_k - span * 0.5 * (1.0 - (std::f64::consts::PI * (t - rise) / fall).cos())
        }
    }
}

/// The air temperature from values at clock hours of the day, linear between them and
/// periodic over 24 h (after the last value of the day it runs to the first of the next).
#[derive(Debug, Clone, PartialEq)]
pub struct HourlyAir {
    /// clock hours in [0, 24), ascending, distinct
    hours: Vec<f64>,
    /// the air temperature at each [K]
    temps_k: Vec<f64>,
}

impl HourlyAir {
    /// From `(hour, kelvin)` pairs in any order; `None` unless there are at least two with
    /// distinct hours in [0, 24) and finite temperatures.
    pub fn new(points: &[(f64, f64)]) -> Option<HourlyAir> {
        let mut p: Vec<(f64, f64)> = points.to_vec();
        if p.len() < 2 || p.iter().any(|(h, t)| !(0.0..24.0).contains(h) || !t.is_finite()) {
            return None;
        }
        super::order::sort_ascending_by(&mut p, |x| x.0);
        if p.windows(2).any(|w| w[1].0 <= w[0].0) {
            return None;
        }
        Some(HourlyAir { hours: p.iter().map(|x| x.0).collect(), temps_k: p.iter().map(|x| x.1).collect() })
    }

    /// The air temperature [K] at clock hour `h`.
    pub fn at(&self, h: f64) -> f64 {
        let t = h.rem_euclid(24.0);
        let n = self.hours.len();
        let next = self.hours.partition_point(|&x| x <= t);
        // the values before and after t, the day wrapping round
        let (h0, t0, h1, t1) = match next {
            0 => (self.hours[n - 1] - 24.0, self.temps_k[n - 1], self.hours[0], self.temps_k[0]),
            k if k == n => (self.hours[n - 1], self.temps_k[n - 1], self.hours[0] + 24.0, self.temps_k[0]),
            k => (self.hours[k - 1], self.temps_k[k - 1], self.hours[k], self.temps_k[k]),
        };
        t0 + (t1 - t0) * (t - h0) / (h1 - h0)
    }

    /// The clock hours [h] of the lowest and the highest value.
    pub fn extremes_at(&self) -> (f64, f64) {
        let pick = |better: fn(f64, f64) -> bool| {
            let mut k = 0;
            for i in 1..self.temps_k.len() {
                if better(self.temps_k[i], self.temps_k[k]) {
                    k = i;
                }
            }
            self.hours[k]
        };
        (pick(|a, b| a < b), pick(|a, b| a > b))
    }

    /// The lowest and highest value [K].
    pub fn range_k(&self) -> (f64, f64) {
        let lo = self.temps_k.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = self.temps_k.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        (lo, hi)
    }
}

/// The air through a day: the two-piece cosine or values at clock hours.
#[derive(Debug, Clone, PartialEq)]
pub enum AirModel {
    Cosine(DailyAir),
    Hourly(HourlyAir),
}

impl AirModel {
    /// The air temperature [K] at clock hour `h`.
    pub fn at(&self, h: f64) -> f64 {
        match self {
            AirModel::Cosine(c) => c.at(h),
            AirModel::Hourly(t) => t.at(h),
        }
    }

    /// The clock hours [h] of the minimum and the maximum.
    pub fn extremes_at(&self) -> (f64, f64) {
        match self {
            AirModel::Cosine(c) => (c.sunrise_h, c.peak_h),
            AirModel::Hourly(t) => t.extremes_at(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn extremes_at_sunrise_and_two_hours_after_noon() {
        let a = DailyAir::new(288.15, 298.15, Some(5.5), 12.2);
        assert!((a.at(5.5) - 288.15).abs() < 1e-12);
        assert!((a.at(14.2) - 298.15).abs() < 1e-12);
        assert!((a.at(5.5 + 24.0) - 288.15).abs() < 1e-9);
        // continuous through the day (the steepest slope is pi span / (2 x 8.7 h), 1.8 K/h,
        // 0.018 K per 0.01 h) and within the extremes
        let mut last = a.at(0.0);
        for k in 1..=2400 {
            let v = a.at(k as f64 * 0.01);
            assert!((v - last).abs() < 0.02 && (288.15..=298.15).contains(&v), "{k}");
            last = v;
        }
        // polar day or night: noon - 6 h stands in for the sunrise
        let p = DailyAir::new(250.0, 260.0, None, 12.0);
        assert_eq!((p.sunrise_h, p.peak_h), (6.0, 14.0));
    }

    #[test]
    fn hourly_values_are_joined_by_straight_lines_round_the_clock() {
        let a = HourlyAir::new(&[(14.0, 300.0), (2.0, 290.0), (20.0, 294.0)]).unwrap();
        assert_eq!(a.at(2.0), 290.0);
        assert!((a.at(8.0) - 295.0).abs() < 1e-12);
        // from 20:00 (294 K) to 02:00 the next day (290 K): 6 h, so 23:00 is halfway
        assert!((a.at(23.0) - 292.0).abs() < 1e-12);
        assert!((a.at(-1.0) - 292.0).abs() < 1e-12);
        assert_eq!(a.extremes_at(), (2.0, 14.0));
        assert!(HourlyAir::new(&[(1.0, 290.0)]).is_none());
        assert!(HourlyAir::new(&[(1.0, 290.0), (1.0, 291.0)]).is_none());
        assert!(HourlyAir::new(&[(1.0, 290.0), (24.0, 291.0)]).is_none());
    }
}
