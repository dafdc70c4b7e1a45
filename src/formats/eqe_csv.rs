//! A quantum-efficiency table from a delimited text file: an external quantum efficiency
//! (EQE) as a fraction or in percent, or a spectral response in A/W (or mA/W), against
//! wavelength, photon energy or wavenumber.
//!
//! The layout is that of every data file (see [`super::table`]: separators, comments,
//! ascending or descending axis, errors naming the line), read by the same scanner. The
//! header must name both units, e.g. `wavelength_nm,eqe_percent`,
//! `Wavelength (nm), EQE (%)`, `energy (eV), EQE (fraction)` or `lambda [nm]; SR [A/W]`;
//! the value is column 1. A spectral response is converted point by point with
//! EQE = h c SR / (q lambda) = SR E / q (E the photon energy). The result is an
//! [`AbsorptanceTable`] on the file's axis, linear between its points, zero outside.
//!
//! Architecture invariant: units come from the header only (no option can give them), so
//! every message says which header would fix the file and names no option or control.

use super::table::{check_distinct, quoted, scan_table, TableError, TableKind, TablePoints};
use super::units::{axis_unit_from_name, bracket_contents, compact_unit_text, name_words, unit_tails};
use crate::physics::absorber::AbsorptanceTable;
use crate::physics::constants::CHARGE;
use std::fmt;

/// Unit of the values of a quantum-efficiency file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ResponseUnit {
    /// EQE as a fraction, 0-1
    Fraction,
    /// EQE in percent, 0-100
    Percent,
    /// spectral response in A/W
    AmpsPerWatt,
    /// spectral response in mA/W
    MilliampsPerWatt,
}

impl ResponseUnit {
    /// Read a unit: `fraction`, `-`, `0-1`, `%`, `percent`, `A/W`, `A W-1`, `mA/W`, ...
    /// Case and spaces are ignored.
    pub fn parse(s: &str) -> Option<ResponseUnit> {
        match compact_unit_text(s).as_str() {
            "fraction" | "frac" | "-" | "0-1" | "1" | "unitless" | "dimensionless" => Some(ResponseUnit::Fraction),
            "%" | "percent" | "pct" | "0-100" => Some(ResponseUnit::Percent),
            "a/w" | "aw-1" | "aw^-1" | "a.w-1" | "a.w^-1" | "amps/watt" | "amp/watt" | "ampsperwatt" | "aperw" => {
                Some(ResponseUnit::AmpsPerWatt)
            }
            "ma/w" | "maw-1" | "maw^-1" | "ma.w-1" | "ma.w^-1" | "maperw" => Some(ResponseUnit::MilliampsPerWatt),
            _ => None,
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            ResponseUnit::Fraction => "fraction",
            ResponseUnit::Percent => "%",
            ResponseUnit::AmpsPerWatt => "A/W",
            ResponseUnit::MilliampsPerWatt => "mA/W",
        }
    }

    /// A value in this unit as an EQE fraction at photon energy `e_j` [J].
    pub fn to_eqe(self, v: f64, e_j: f64) -> f64 {
        match self {
            ResponseUnit::Fraction => v,
            ResponseUnit::Percent => v / 100.0,
            // EQE = SR h c / (q lambda) = SR E / q
            ResponseUnit::AmpsPerWatt => v * e_j / CHARGE,
            ResponseUnit::MilliampsPerWatt => 1e-3 * v * e_j / CHARGE,
        }
    }
}

impl fmt::Display for ResponseUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.label())
    }
}

/// The unit a value-column name carries: `eqe_percent`, `EQE (%)`, `EQE [fraction]`,
/// `SR (A/W)`, `responsivity_mA_W`.
fn response_unit_from_name(name: &str) -> Option<ResponseUnit> {
    let words = name_words(name);
    let mut candidates: Vec<String> = bracket_contents(name).into_iter().map(str::to_string).collect();
    candidates.extend(unit_tails(&words, "/"));
    candidates.extend(words.iter().map(|w| w.to_string()));
    if let Some(u) = candidates.iter().find_map(|c| ResponseUnit::parse(c)) {
        return Some(u);
    }
    name.contains('%').then_some(ResponseUnit::Percent)
}

const EQE_HEADER_EXAMPLE: &str = "'wavelength_nm,eqe_percent', 'Wavelength (nm), EQE (fraction)', \
'energy (eV), EQE (%)' or 'wavelength (nm), SR (A/W)'";

/// Read a quantum-efficiency table (see the module documentation). `name` names it.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting checks: `!(x > 0.0)` also refuses NaN
pub fn parse_eqe_csv(text: &str, name: &str) -> Result<AbsorptanceTable, TableError> {
    let scan = scan_table(text)?;
    scan.check_header_width(true)?;
    let Some(header_line) = scan.header_line else {
        return Err(TableError::general(format!(
            "a quantum-efficiency file needs a header line that names the units, e.g. {EQE_HEADER_EXAMPLE} \
             (a header must not start with '#', '%' or '//', which mark comments)"
        )));
    };
    let axis_name = scan.names.first().map(String::as_str).unwrap_or("");
    let Some(axis_unit) = axis_unit_from_name(axis_name) else {
        return Err(TableError::at(
            header_line,
            format!(
                "the unit of the spectral axis is missing: column 0 is named {} with no recognised unit; \
                 write e.g. {EQE_HEADER_EXAMPLE} (axis units: nm, um, eV or cm-1)",
                quoted(axis_name)
            ),
        ));
    };
    let value_name = scan.names.get(1).map(String::as_str).unwrap_or("");
    let Some(unit) = response_unit_from_name(value_name) else {
        return Err(TableError::at(
            header_line,
            format!(
                "the unit of the quantum efficiency is missing: column 1 is named {} with no recognised unit; \
                 write e.g. {EQE_HEADER_EXAMPLE} (units: fraction, %, A/W or mA/W)",
                quoted(value_name)
            ),
        ));
    };
    let TablePoints { mut xs, ys, line_of } = scan.read_points(1, TableKind::QuantumEfficiency)?;
    let axis = axis_unit.axis();
    let mut eqe = Vec::with_capacity(ys.len());
    for ((x, y), &line) in xs.iter_mut().zip(&ys).zip(&line_of) {
        let raw = *x;
        *x = axis_unit.coordinate_to_si(raw);
        if !(x.is_finite() && *x > 0.0) {
            return Err(TableError::at(
                line,
                format!(
                    "the axis value is out of the representable range once converted from {} to SI; check the axis unit",
                    axis_unit.label()
                ),
            ));
        }
        let q = unit.to_eqe(*y, axis.energy_at(*x));
        if !(q <= 1.0) {
            let hint = match unit {
                ResponseUnit::Fraction if *y <= 100.0 => "; if the column is in percent, name it e.g. 'EQE (%)'",
                ResponseUnit::AmpsPerWatt => "; if the column is in mA/W, name it e.g. 'SR (mA/W)'",
                _ => "",
            };
            return Err(TableError::at(
                line,
                format!(
                    "the quantum efficiency {} ({}) is above 1 (100 %) here; a detailed-balance absorptance \
                     cannot exceed 1, so check the unit or clip the value to 1{hint}",
                    y,
                    unit.label()
                ),
            ));
        }
        eqe.push(q);
    }
    check_distinct(&xs, &line_of)?;
    if !eqe.iter().any(|&q| q > 0.0) {
        return Err(TableError::general(
            "every quantum efficiency in the file is 0; a cell needs some response to absorb light",
        ));
    }
    AbsorptanceTable::new(name, axis, xs, eqe).map_err(|e| TableError::general(format!("the table is not usable: {e}")))
}
