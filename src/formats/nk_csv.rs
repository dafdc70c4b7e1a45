//! Reader for a material's optical constants: a header naming the axis and the columns, then
//! one line per point, the spectral coordinate in column 0 and the two constants after it.
//!
//! - Axis: wavelength in nm or um, wavenumber in cm^-1, or photon energy in eV, named in
//!   the header's first column (`wavelength_nm`, `Wavelength (um)`, `wavenumber_cm-1`,
//!   `energy_eV`); points may come in either direction.
//! - Constants: `n,k` (the complex index N = n + ik, k >= 0 absorbs) or `eps1,eps2` (the
//!   relative permittivity eps1 + i eps2, eps2 >= 0; N = sqrt(eps), the root with k >= 0).
//!
//! Architecture invariant: a pure function of text; messages name the line and never a
//! front end's control.

use super::table::{quoted, scan_table, TableError};
use super::units::{axis_unit_from_name, AxisUnit};
use crate::physics::constants::HC;
use crate::physics::film::Complex;

/// Optical constants read from a file, ascending in wavelength.
#[derive(Debug, Clone, PartialEq)]
pub struct NkData {
    /// vacuum wavelengths [m]
    pub wavelength_m: Vec<f64>,
    pub n: Vec<f64>,
    pub k: Vec<f64>,
}

/// A header that reads well, for messages.
pub const NK_EXAMPLE_HEADER: &str = "wavelength_um,n,k (or wavelength_nm, wavenumber_cm-1, energy_eV; or eps1,eps2)";

fn column_is(name: &str, forms: &[&str]) -> bool {
    let t: String = name.trim().to_ascii_lowercase().chars().filter(|c| !c.is_whitespace() && *c != '_').collect();
    forms.contains(&t.as_str())
}

/// Read a table of optical constants (see the module docs).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn parse_nk_csv(text: &str) -> Result<NkData, TableError> {
    let scan = scan_table(text)?;
    let Some(header) = scan.header_line else {
        return Err(TableError::general(format!(
            "the file has no header line; begin it with one that names the axis unit and the columns, e.g. {NK_EXAMPLE_HEADER}"
        )));
    };
    if scan.names.len() < 3 {
        return Err(TableError::at(
            header,
            format!("the header names {} column(s); it needs three, e.g. {NK_EXAMPLE_HEADER}", scan.names.len()),
        ));
    }
    let unit = axis_unit_from_name(&scan.names[0]).ok_or_else(|| {
        TableError::at(
            header,
            format!(
                "the first column {} names no unit; call it wavelength_nm, wavelength_um, wavenumber_cm-1 or energy_eV",
                quoted(&scan.names[0])
            ),
        )
    })?;
    let (a, b) = (&scan.names[1], &scan.names[2]);
    let permittivity = if column_is(a, &["n"]) && column_is(b, &["k", "kappa"]) {
        false
    } else if column_is(a, &["eps1", "e1", "epsilon1", "epsr", "eps'"])
        && column_is(b, &["eps2", "e2", "epsilon2", "epsi", "eps''"])
    {
        true
    } else {
        return Err(TableError::at(
            header,
            format!("the columns after the axis are {} and {}; name them n,k or eps1,eps2", quoted(a), quoted(b)),
        ));
    };
    let rows = scan.read_rows(3)?;
    let mut points: Vec<(f64, f64, f64, usize)> = Vec::with_capacity(rows.len());
    for (line, r) in rows {
        let (x, p, q) = (r[0], r[1], r[2]);
        if !(x > 0.0) {
            return Err(TableError::at(line, format!("the axis value {x} is not positive")));
        }
        let lambda = match unit {
            AxisUnit::Nanometre | AxisUnit::Micrometre => unit.coordinate_to_si(x),
            AxisUnit::PerCentimetre => 1.0 / unit.coordinate_to_si(x),
            AxisUnit::Electronvolt => HC / unit.coordinate_to_si(x),
        };
        let (n, k) = if permittivity {
            if q < 0.0 {
                return Err(TableError::at(line, format!("eps2 = {q} is negative; an absorbing medium has eps2 >= 0")));
            }
            let root = Complex::new(p, q).sqrt();
            (root.re, root.im.max(0.0))
        } else {
            if !(p > 0.0) || q < 0.0 {
                return Err(TableError::at(line, format!("n = {p}, k = {q}: n must be above 0 and k at least 0")));
            }
            (p, q)
        };
        if !(n > 0.0) {
            return Err(TableError::at(line, format!("eps = {p} + {q}i gives n = {n}; n must be above 0")));
        }
        points.push((lambda, n, k, line));
    }
    if points.len() < 2 {
        return Err(TableError::general("the table needs at least two lines of numbers"));
    }
    points.sort_by(|a, b| a.0.total_cmp(&b.0));
    for w in points.windows(2) {
        if !(w[1].0 > w[0].0) {
            return Err(TableError::at(
                w[1].3.max(w[0].3),
                format!(
                    "the same wavelength appears on lines {} and {}; keep one",
                    w[0].3.min(w[1].3),
                    w[0].3.max(w[1].3)
                ),
            ));
        }
    }
    Ok(NkData {
        wavelength_m: points.iter().map(|p| p.0).collect(),
        n: points.iter().map(|p| p.1).collect(),
        k: points.iter().map(|p| p.2).collect(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_units_and_permittivity() {
        let d = parse_nk_csv("wavelength_nm,n,k\n500,1.5,0\n1000,1.45,0.01\n").unwrap();
        assert_eq!(d.wavelength_m, vec![500e-9, 1000e-9]);
        // wavenumbers descending become wavelengths ascending
        let d = parse_nk_csv("wavenumber_cm-1,n,k\n10000,2,0.1\n1000,2.2,0.3\n").unwrap();
        assert!((d.wavelength_m[0] - 1e-6).abs() < 1e-18 && (d.wavelength_m[1] - 1e-5).abs() < 1e-18);
        assert_eq!(d.n, vec![2.0, 2.2]);
        // eps = (n + ik)^2: n = 2, k = 1 gives eps1 = 3, eps2 = 4
        let d = parse_nk_csv("wavelength_um,eps1,eps2\n1,3,4\n2,-20,1\n").unwrap();
        assert!((d.n[0] - 2.0).abs() < 1e-15 && (d.k[0] - 1.0).abs() < 1e-15);
        assert!(d.k[1] > 4.0 && d.n[1] < 0.2); // a metal-like negative eps1
    }

    #[test]
    fn errors_name_the_line() {
        let e = parse_nk_csv("wavelength_um,n,k\n1,1.5,0\n2,1.5,-0.1\n").unwrap_err();
        assert_eq!(e.line, Some(3));
        let e = parse_nk_csv("wavelength,n,k\n1,1.5,0\n2,1.5,0\n").unwrap_err();
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("wavelength_um"), "{e}");
        let e = parse_nk_csv("wavelength_um,n,k\n1,1.5,0\n1,1.6,0\n").unwrap_err();
        assert_eq!(e.line, Some(3));
        let e = parse_nk_csv("wavelength_um,a,b\n1,1.5,0\n2,1.6,0\n").unwrap_err();
        assert!(e.message.contains("n,k or eps1,eps2"));
        assert!(parse_nk_csv("1,1.5,0\n2,1.6,0\n").is_err());
    }
}
