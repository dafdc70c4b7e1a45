//! Number formatting for the page: field values, tick labels and hover read-outs.
//! Headline figures do not use this module; they come from `report::CellReport::display`
//! so that the page and the command line show the same digits.

/// Superscript digits for exponents, e.g. 10¹⁸.
pub fn superscript(n: i32) -> String {
    const DIGITS: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
    let mut out = String::new();
    if n < 0 {
        out.push('⁻');
    }
    for c in n.unsigned_abs().to_string().chars() {
        out.push(DIGITS[(c as u8 - b'0') as usize]);
    }
    out
}

/// Replace an ASCII hyphen used as a sign by a typographic minus.
fn minus(s: String) -> String {
    if let Some(rest) = s.strip_prefix('-') {
        format!("−{rest}")
    } else {
        s
    }
}

/// A value with a fixed number of decimals and a typographic minus.
pub fn fixed(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    // "-0.00" reads badly
    if s.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
        return s.trim_start_matches('-').to_string();
    }
    minus(s)
}

/// A value to `sig` significant figures; scientific form (a×10ⁿ) outside 1e-3..1e5.
pub fn sig(v: f64, sig: usize) -> String {
    if !v.is_finite() {
        return if v.is_nan() {
            "—".into()
        } else if v > 0.0 {
            "∞".into()
        } else {
            "−∞".into()
        };
    }
    if v == 0.0 {
        return "0".into();
    }
    let a = v.abs();
    let e = a.log10().floor() as i32;
    if (-3..5).contains(&e) {
        let decimals = (sig as i32 - 1 - e).max(0) as usize;
        fixed(v, decimals)
    } else {
        let m = v / 10f64.powi(e);
        // rounding can carry the mantissa to 10
        let (m, e) = if (m.abs() * 10f64.powi(sig as i32 - 1)).round() >= 10f64.powi(sig as i32) {
            (m / 10.0, e + 1)
        } else {
            (m, e)
        };
        format!("{}×10{}", fixed(m, sig.saturating_sub(1)), superscript(e))
    }
}

/// `v` rounded to `sig` significant figures (0 and non-finite values unchanged).
pub fn round_sig(v: f64, sig: i32) -> f64 {
    if v == 0.0 || !v.is_finite() {
        return v;
    }
    let p = 10f64.powi(sig - 1 - v.abs().log10().floor() as i32);
    (v * p).round() / p
}

/// A field value as the user would type it: at most `max_sig` significant figures,
/// trailing zeros dropped.
pub fn field(v: f64, max_sig: usize) -> String {
    if !v.is_finite() {
        return format!("{v}");
    }
    if v == 0.0 {
        return "0".into();
    }
    let e = v.abs().log10().floor() as i32;
    let decimals = (max_sig as i32 - 1 - e).clamp(0, 12) as usize;
    let s = format!("{v:.decimals$}");
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}

/// A band gap in eV for its field: at least 3 decimals (1 meV), at most 6.
pub fn gap_ev(v: f64) -> String {
    let s = format!("{v:.6}");
    let (int, frac) = s.split_once('.').unwrap_or((&s, ""));
    let mut frac = frac.trim_end_matches('0').to_string();
    while frac.len() < 3 {
        frac.push('0');
    }
    format!("{int}.{frac}")
}

/// Ticks for an axis: values, decimals to print them with, and minor values.
#[derive(Debug, Clone, PartialEq)]
pub struct Ticks {
    pub major: Vec<f64>,
    pub minor: Vec<f64>,
    pub decimals: usize,
}

/// A "nice" tick step for `span` in about `target` intervals: (step, minor subdivisions,
/// decimals needed to print multiples of the step).
pub fn nice_step(span: f64, target: usize) -> (f64, f64, usize) {
    let raw = span / target.max(1) as f64;
    let p = 10f64.powf(raw.log10().floor());
    let f = raw / p;
    let (m, sub) = if f < 1.5 {
        (1.0, 5.0)
    } else if f < 2.25 {
        (2.0, 4.0)
    } else if f < 3.5 {
        (2.5, 5.0)
    } else if f < 7.5 {
        (5.0, 5.0)
    } else {
        (10.0, 5.0)
    };
    let step = m * p;
    (step, sub, decimals_of(step))
}

/// The fewest decimals that print every multiple of `step` exactly.
pub fn decimals_of(step: f64) -> usize {
    (0..12)
        .find(|d| {
            let v = step * 10f64.powi(*d as i32);
            (v - v.round()).abs() < 1e-6 * v.abs().max(1.0)
        })
        .unwrap_or(12)
}

/// A number for a CSV file: 7 significant figures, plain where that stays short.
pub fn csv_num(v: f64) -> String {
    if v == 0.0 || !v.is_finite() {
        return if v.is_finite() { "0".into() } else { format!("{v}") };
    }
    let a = v.abs();
    if (1e-4..1e9).contains(&a) {
        let e = a.log10().floor() as i32;
        let d = (6 - e).max(0) as usize;
        let s = format!("{v:.d$}");
        if s.contains('.') {
            s.trim_end_matches('0').trim_end_matches('.').to_string()
        } else {
            s
        }
    } else {
        format!("{v:.6e}")
    }
}

/// Ticks at multiples of `step` within [lo, hi], minor ticks at step / sub.
pub fn ticks_with_step(lo: f64, hi: f64, step: f64, sub: f64, decimals: usize) -> Ticks {
    let eps = step * 1e-9;
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    let major: Vec<f64> =
        (first..=last).map(|i| i as f64 * step).filter(|v| *v >= lo - eps && *v <= hi + eps).collect();
    let mstep = step / sub;
    let mfirst = (lo / mstep - 1e-9).ceil() as i64;
    let mlast = (hi / mstep + 1e-9).floor() as i64;
    let minor: Vec<f64> =
        if mlast - mfirst < 400 { (mfirst..=mlast).map(|i| i as f64 * mstep).collect() } else { vec![] };
    Ticks { major, minor, decimals }
}

/// "Nice" ticks covering [lo, hi] with about `target` intervals.
pub fn nice_ticks(lo: f64, hi: f64, target: usize) -> Ticks {
    let span = hi - lo;
    if span.is_nan() || span <= 0.0 || !span.is_finite() {
        return Ticks { major: vec![lo], minor: vec![], decimals: 2 };
    }
    let (step, sub, decimals) = nice_step(span, target);
    ticks_with_step(lo, hi, step, sub, decimals)
}

/// Power-of-ten factor that keeps axis numbers short: returns (exponent, divisor).
/// Values whose largest magnitude lies in 1e-3..1e5 are not scaled.
pub fn axis_exponent(max_abs: f64) -> i32 {
    if max_abs.is_nan() || max_abs <= 0.0 || !max_abs.is_finite() {
        return 0;
    }
    let e = max_abs.log10().floor() as i32;
    if (-3..5).contains(&e) {
        0
    } else {
        e
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formats() {
        assert_eq!(gap_ev(1.34), "1.340");
        assert_eq!(gap_ev(1.3405), "1.3405");
        assert_eq!(field(300.0, 6), "300");
        assert_eq!(field(46239.28, 6), "46239.3");
        assert_eq!(sig(4.2156e18, 4), "4.216×10¹⁸");
        assert_eq!(superscript(-3), "⁻³");
        let t = nice_ticks(0.5, 3.0, 6);
        assert_eq!(t.major.first().copied(), Some(0.5));
        assert_eq!(decimals_of(250.0), 0);
        assert_eq!(decimals_of(0.25), 2);
        assert_eq!(csv_num(35.03235), "35.03235");
        assert_eq!(round_sig(46239.28, 3), 46200.0);
        assert_eq!(round_sig(-0.012345, 2), -0.012);
        assert_eq!(round_sig(0.0, 3), 0.0);
    }
}
