//! The air temperature through a day from its minimum and maximum: the two-piece cosine
//! commonly used when only the daily extremes are known (common practice; no source is
//! claimed beyond that). The minimum falls at sunrise, the maximum at 14:00 local solar
//! time; between them the air warms along half a cosine, and from the maximum to the next
//! sunrise (taken as today's sunrise one day later, so the day is periodic) it cools along
//! another.
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
}
