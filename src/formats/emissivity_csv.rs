//! Optical property tables: a measured emissivity, absorptance or reflectance of an opaque
//! emitter, or a zenith transmittance of the sky, against wavelength or wavenumber.
//!
//! # Layout
//!
//! The same as every data file (see [`super::table`]): the spectral coordinate in
//! column 0, values in the following columns, commas, semicolons, tabs or spaces, `#`
//! comments, an optional header line. The header names the axis unit and what the values
//! are, e.g. `wavelength_um,reflectance`, `Wavenumber (cm-1); Emissivity` or
//! `lambda [nm]  absorptance (%)`; options can say it instead, for files without a header.
//!
//! # Conversion
//!
//! * axis: nm, um or cm^-1 (eV also works) to wavelength in metres, sorted ascending;
//! * values: fractions 0-1, or percent when the column says `%` / `percent`;
//! * an opaque sample has transmittance 0, so absorptance A = 1 - R and, by Kirchhoff's
//!   law, emissivity eps = A: a reflectance column becomes eps = 1 - R, an absorptance
//!   column is taken as it is.
//!
//! Architecture invariant: messages name no option or control; what would fix a file is the
//! error's [`Hint`] (the axis unit, what the column holds, the value column, or the other
//! table's input), worded by each front end.

use super::table::{check_distinct, check_value_column, quoted, scan_table, Hint, TableError, TableKind, TablePoints};
use super::units::{axis_unit_from_name, AxisUnit, OpticalQuantity, ValueKind};
use crate::physics::constants::HC;

/// Units, quantity and column chosen by the caller; each `Some` overrides the header.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct OpticalHints {
    pub axis: Option<AxisUnit>,
    pub value: Option<ValueKind>,
    /// the value column, counting the axis as 0; default 1
    pub column: Option<usize>,
}

/// A table of fractions against wavelength, read from a file.
#[derive(Debug, Clone, PartialEq)]
pub struct OpticalTable {
    pub name: String,
    pub provenance: String,
    /// wavelengths [m], strictly ascending
    pub wavelength_m: Vec<f64>,
    /// fractions 0-1: emissivity for an emitter file, transmittance for a sky file
    pub values: Vec<f64>,
}

/// The axis units advertised for optical tables (an eV axis is read too).
const AXIS_HINT: Hint =
    Hint::AxisUnit { accepted: &[AxisUnit::Nanometre, AxisUnit::Micrometre, AxisUnit::PerCentimetre] };

/// What an emitter file may hold.
const EMITTER_QUANTITIES: &[OpticalQuantity] =
    &[OpticalQuantity::Emissivity, OpticalQuantity::Absorptance, OpticalQuantity::Reflectance];

/// What a sky file may hold.
const SKY_QUANTITIES: &[OpticalQuantity] = &[OpticalQuantity::Transmittance];

/// Read a table of emissivity (or absorptance, or reflectance converted to 1 - R) of an
/// opaque emitter.
pub fn parse_emissivity_csv(text: &str, hints: &OpticalHints, name: &str) -> Result<OpticalTable, TableError> {
    read_optical(text, hints, name, TableKind::Emissivity, EMITTER_QUANTITIES)
}

/// Read a table of the sky's zenith transmittance.
pub fn parse_transmittance_csv(text: &str, hints: &OpticalHints, name: &str) -> Result<OpticalTable, TableError> {
    read_optical(text, hints, name, TableKind::Transmittance, SKY_QUANTITIES)
}

fn read_optical(
    text: &str,
    hints: &OpticalHints,
    name: &str,
    kind_of_table: TableKind,
    accepted: &'static [OpticalQuantity],
) -> Result<OpticalTable, TableError> {
    let value_col = hints.column.unwrap_or(1);
    check_value_column(value_col)?;
    let scan = scan_table(text)?;
    scan.check_header_width(hints.axis.is_none() || hints.value.is_none())?;
    let at_header = |msg: String| TableError::maybe_at(scan.header_line, msg);
    let value_name = scan.names.get(value_col).map(String::as_str);
    let axis_unit = match hints.axis.or_else(|| scan.names.first().and_then(|n| axis_unit_from_name(n))) {
        Some(u) => u,
        None => {
            let why =
                if scan.header_line.is_some() { "the header does not name it" } else { "the file has no header line" };
            return Err(
                at_header(format!("the unit of the spectral axis (column 0) is not given: {why}")).with_hint(AXIS_HINT)
            );
        }
    };
    let accepted_list = accepted.iter().map(|q| q.label()).collect::<Vec<_>>().join(", ");
    let value_hint = Hint::ValueKind { accepted };
    let kind = match hints.value.or_else(|| value_name.and_then(ValueKind::from_name)) {
        Some(k) => k,
        None => {
            let named = value_name.map(|n| format!(" (the header calls it {})", quoted(n))).unwrap_or_default();
            return Err(at_header(format!(
                "column {value_col} does not say what it holds{named}; it must hold {accepted_list}"
            ))
            .with_hint(value_hint));
        }
    };
    if !accepted.contains(&kind.quantity) && hints.value.is_some() {
        return Err(TableError::general(format!(
            "the values are set to be {}, but this file must hold {accepted_list}",
            kind.quantity
        ))
        .with_hint(value_hint));
    }
    if !accepted.contains(&kind.quantity) {
        let (why, other) = if kind.quantity == OpticalQuantity::Transmittance {
            ("an opaque emitter has no transmittance", TableKind::Transmittance)
        } else {
            ("a sky file holds the zenith transmittance of the atmosphere", TableKind::Emissivity)
        };
        return Err(at_header(format!(
            "column {value_col} holds {}, but this file must hold {accepted_list}: {why}",
            kind.quantity
        ))
        .with_hint(Hint::OtherTable(other)));
    }

    let TablePoints { xs, ys, line_of } = scan.read_points(value_col, kind_of_table)?;
    let per = if kind.percent { 100.0 } else { 1.0 };
    let mut rows: Vec<(f64, f64, usize)> = Vec::with_capacity(xs.len());
    for ((x, y), &line) in xs.iter().zip(&ys).zip(&line_of) {
        let fraction = y / per;
        if fraction > 1.0 {
            let as_written = if kind.percent { format!("{y} %") } else { format!("{y}") };
            let hint = if kind.percent || *y > 100.0 {
                "replace a small overshoot by the limit".to_string()
            } else {
                format!("if the column is in percent, say so in its header, e.g. '{} (%)'", kind.quantity)
            };
            return Err(TableError::at(
                line,
                format!(
                    "the {} {as_written} exceeds {}; values lie from 0 to {}: {hint}",
                    kind.quantity,
                    if kind.percent { "100 %" } else { "1" },
                    if kind.percent { "100 %" } else { "1" }
                ),
            ));
        }
        let value = match kind.quantity {
            OpticalQuantity::Reflectance => 1.0 - fraction,
            _ => fraction,
        };
        let si = axis_unit.coordinate_to_si(*x);
        let lambda = match axis_unit {
            AxisUnit::Nanometre | AxisUnit::Micrometre => si,
            AxisUnit::PerCentimetre => 1.0 / si,
            AxisUnit::Electronvolt => HC / si,
        };
        if !(lambda.is_finite() && lambda > 0.0) {
            return Err(TableError::at(
                line,
                format!(
                    "the axis value is out of range once converted from {} to a wavelength; check the \
                     axis unit",
                    axis_unit.label(),
                ),
            )
            .with_hint(AXIS_HINT));
        }
        rows.push((lambda, value, line));
    }
    crate::physics::order::sort_ascending_by(&mut rows, |r| r.0);
    let wavelength_m: Vec<f64> = rows.iter().map(|r| r.0).collect();
    let values: Vec<f64> = rows.iter().map(|r| r.1).collect();
    let lines: Vec<usize> = rows.iter().map(|r| r.2).collect();
    check_distinct(&wavelength_m, &lines)?;
    let n = wavelength_m.len();
    let mut provenance = format!(
        "user file '{name}', {n} points, axis {}, {}{}",
        axis_unit.label(),
        kind.quantity,
        if kind.percent { " in %" } else { "" }
    );
    if kind.quantity == OpticalQuantity::Reflectance {
        provenance.push_str(", emissivity = 1 - reflectance (opaque)");
    }
    if scan.ncols > 2 || hints.column.is_some() {
        provenance.push_str(&format!(", column {value_col}"));
    }
    Ok(OpticalTable { name: name.to_string(), provenance, wavelength_m, values })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn emis(text: &str) -> Result<OpticalTable, TableError> {
        parse_emissivity_csv(text, &OpticalHints::default(), "t.csv")
    }

    #[test]
    fn reflectance_becomes_one_minus_r() {
        let t = emis("wavelength_um,reflectance\n0.5,0.9\n10,0.05\n").unwrap();
        assert_eq!(t.wavelength_m, vec![0.5e-6, 10e-6]);
        assert!((t.values[0] - 0.1).abs() < 1e-15 && (t.values[1] - 0.95).abs() < 1e-15);
    }

    #[test]
    fn wavenumber_percent_file_is_sorted_by_wavelength() {
        let t = emis("Wavenumber (cm-1); Emissivity (%)\n1250;90\n1000;95\n770;80\n").unwrap();
        assert_eq!(t.values, vec![0.9, 0.95, 0.8]);
        assert!((t.wavelength_m[0] - 8e-6).abs() < 1e-18 && (t.wavelength_m[2] - 0.01 / 770.0).abs() < 1e-18);
    }

    #[test]
    fn errors_say_what_to_do() {
        let e = emis("wavelength_um,value\n1,0.5\n2,0.5\n").unwrap_err();
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("emissivity, absorptance, reflectance"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueKind { accepted: EMITTER_QUANTITIES }));
        let e = emis("wavelength_um,emissivity\n1,0.5\n2,45\n").unwrap_err();
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("percent"), "{e}");
        let e = emis("wavelength_um,transmittance\n1,0.5\n2,0.5\n").unwrap_err();
        assert_eq!(e.hint, Some(Hint::OtherTable(TableKind::Transmittance)));
        let e = emis("1,0.5\n2,0.5\n").unwrap_err();
        assert!(e.message.contains("no header line"), "{e}");
        assert!(matches!(e.hint, Some(Hint::AxisUnit { .. })));
        let e = parse_transmittance_csv("wavelength_um,emissivity\n1,0.5\n2,0.5\n", &OpticalHints::default(), "s")
            .unwrap_err();
        assert_eq!(e.hint, Some(Hint::OtherTable(TableKind::Emissivity)));
        let e = parse_emissivity_csv("1,0.5\n2,0.5\n", &OpticalHints { column: Some(0), ..Default::default() }, "z")
            .unwrap_err();
        assert_eq!(e.hint, Some(Hint::ValueColumn));
    }

    #[test]
    fn hints_serve_headerless_files() {
        let hints = OpticalHints {
            axis: Some(AxisUnit::Nanometre),
            value: Some(ValueKind { quantity: OpticalQuantity::Absorptance, percent: false }),
            column: Some(2),
        };
        let t = parse_emissivity_csv("400 0.1 0.2\n800 0.3 0.4\n", &hints, "h").unwrap();
        assert_eq!(t.values, vec![0.2, 0.4]);
    }
}
