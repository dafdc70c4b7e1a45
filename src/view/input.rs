//! Numbers as people type them into the page's fields: decimal commas, band gaps with a
//! unit (eV, meV, nm, µm), and the rounding that keeps stepped values free of binary noise.
//!
//! Architecture invariant: wavelength and photon energy convert only through
//! `physics::constants` (`energy_of_wavelength`, `to_ev`, `ev`).

use crate::physics::constants::{energy_of_wavelength, ev, to_ev, HC};

/// Photon energy [eV] of a wavelength [nm].
pub fn ev_of_nm(nm: f64) -> f64 {
    to_ev(energy_of_wavelength(nm * 1e-9))
}

/// Wavelength [nm] of a photon energy [eV].
pub fn nm_of_ev(e_ev: f64) -> f64 {
    HC / ev(e_ev) * 1e9
}

/// Round to 1 µeV so that arithmetic on steps leaves no binary noise in links.
pub fn tidy(v: f64) -> f64 {
    (v * 1e6).round() / 1e6
}

/// Read a number as people type it: spaces ignored, a lone decimal comma accepted.
pub fn parse_number(text: &str) -> Option<f64> {
    let t: String = text.trim().chars().filter(|c| !c.is_whitespace() && *c != '_').collect();
    if t.is_empty() {
        return None;
    }
    let t = if !t.contains('.') && t.matches(',').count() == 1 { t.replace(',', ".") } else { t.replace(',', "") };
    t.parse::<f64>().ok()
}

/// A band gap typed as "1.42", "1.42 eV", "873 nm" or "0.873 µm"; returns eV.
pub fn parse_gap(text: &str) -> Result<f64, String> {
    let t = text.trim().to_ascii_lowercase();
    let (num, unit) = match t.find(|c: char| c.is_ascii_alphabetic() || !c.is_ascii()) {
        Some(i) => (t[..i].trim(), t[i..].trim()),
        None => (t.as_str(), ""),
    };
    let v = parse_number(num)
        .ok_or_else(|| format!("'{}' is not a band gap; type e.g. 1.34, 1.34 eV or 925 nm", text.trim()))?;
    match unit {
        "" | "ev" => Ok(v),
        "mev" => Ok(v / 1000.0),
        "nm" => positive_wavelength(v, text).map(ev_of_nm),
        "um" | "µm" | "μm" | "micron" | "microns" => positive_wavelength(v, text).map(|u| ev_of_nm(u * 1000.0)),
        _ => Err(format!("'{unit}' is not a unit for the band gap; use eV, nm or µm (e.g. 1.34 eV or 925 nm)")),
    }
}

fn positive_wavelength(v: f64, text: &str) -> Result<f64, String> {
    if v > 0.0 && v.is_finite() {
        Ok(v)
    } else {
        Err(format!("the wavelength '{}' must be a positive number, e.g. 925 nm", text.trim()))
    }
}

/// A whole number with thousands separators.
pub fn thousands(v: f64) -> String {
    let s = format!("{:.0}", v);
    let mut out = String::new();
    for (i, c) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wavelength_and_energy() {
        // hc/e = 1239.841 984... eV nm from the exact SI constants (CODATA 2018)
        assert!((ev_of_nm(1000.0) - 1.239_841_984).abs() < 1e-9);
        assert!((nm_of_ev(1.239_841_984_332) - 1000.0).abs() < 1e-6);
        assert!((nm_of_ev(ev_of_nm(925.0)) - 925.0).abs() < 1e-9);
    }

    #[test]
    fn numbers_as_typed() {
        assert_eq!(parse_number(" 1,34 "), Some(1.34));
        assert_eq!(parse_number("46 239"), Some(46239.0));
        assert_eq!(parse_number("1,000.5"), Some(1000.5));
        assert_eq!(parse_number(""), None);
        assert_eq!(parse_number("abc"), None);
    }

    #[test]
    fn gaps_with_units() {
        assert_eq!(parse_gap("1.42").unwrap(), 1.42);
        assert_eq!(parse_gap("1.42 eV").unwrap(), 1.42);
        assert!((parse_gap("1420 meV").unwrap() - 1.42).abs() < 1e-12);
        assert!((parse_gap("925 nm").unwrap() - ev_of_nm(925.0)).abs() < 1e-12);
        assert!((parse_gap("0.925 µm").unwrap() - ev_of_nm(925.0)).abs() < 1e-12);
        assert!(parse_gap("-5 nm").unwrap_err().contains("positive"));
        assert!(parse_gap("1.4 furlongs").unwrap_err().contains("eV, nm or µm"));
        assert!(parse_gap("wide").unwrap_err().contains("not a band gap"));
    }

    #[test]
    fn tidy_and_thousands() {
        assert_eq!(tidy(1.1 + 0.2), 1.3);
        assert_eq!(tidy(0.123_456_789), 0.123_457);
        assert_eq!(thousands(46239.28), "46,239");
        assert_eq!(thousands(999.0), "999");
        assert_eq!(thousands(1_000_000.0), "1,000,000");
    }
}
