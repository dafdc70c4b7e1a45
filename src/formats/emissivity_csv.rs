//! Optical property tables: a measured emissivity, absorptance or reflectance of an opaque
//! emitter, or a zenith transmittance of the sky, against wavelength or wavenumber.
//!
//! # Layout
//!
//! The same as spectrum files (see [`super::spectrum_csv`]): the spectral coordinate in
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

use std::fmt;

use super::spectrum_csv::{
    axis_unit_from_name, check_distinct, name_words, quoted, scan_table, AxisUnit, CsvError, TablePoints, TableWords,
    MAX_DATA_ROWS,
};
use crate::physics::constants::HC;

/// What a column of an optical table measures.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OpticalQuantity {
    Emissivity,
    Absorptance,
    Reflectance,
    Transmittance,
}

impl OpticalQuantity {
    pub fn label(self) -> &'static str {
        match self {
            OpticalQuantity::Emissivity => "emissivity",
            OpticalQuantity::Absorptance => "absorptance",
            OpticalQuantity::Reflectance => "reflectance",
            OpticalQuantity::Transmittance => "transmittance",
        }
    }

    /// Recognise the quantity in a word: emissivity/emittance, absorptance/absorptivity (not
    /// absorbance, which is a logarithm), reflectance/reflectivity,
    /// transmittance/transmissivity/transmission. Case is ignored.
    pub fn from_word(word: &str) -> Option<OpticalQuantity> {
        let w = word.to_lowercase();
        if w.starts_with("emissiv") || w.starts_with("emitt") {
            Some(OpticalQuantity::Emissivity)
        } else if w.starts_with("absorpt") {
            Some(OpticalQuantity::Absorptance)
        } else if w.starts_with("reflect") {
            Some(OpticalQuantity::Reflectance)
        } else if w.starts_with("transmi") {
            Some(OpticalQuantity::Transmittance)
        } else {
            None
        }
    }
}

impl fmt::Display for OpticalQuantity {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.label())
    }
}

/// A value column: what it measures and whether in percent.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ValueKind {
    pub quantity: OpticalQuantity,
    pub percent: bool,
}

impl ValueKind {
    /// Read `reflectance`, `emissivity%`, `absorptance (%)`, `transmittance percent`, ...
    pub fn parse(text: &str) -> Option<ValueKind> {
        let t = text.trim();
        let lower = t.to_lowercase();
        let percent = lower.contains('%') || lower.contains("percent");
        let quantity =
            lower.split(|c: char| !c.is_alphabetic()).filter(|w| !w.is_empty()).find_map(OpticalQuantity::from_word)?;
        Some(ValueKind { quantity, percent })
    }

    /// The column header's kind, if its name says one.
    fn from_name(name: &str) -> Option<ValueKind> {
        ValueKind::parse(name).or_else(|| name_words(name).into_iter().find_map(ValueKind::parse))
    }
}

/// Units, quantity and column chosen by the caller; each `Some` overrides the header.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct OpticalHints {
    pub axis: Option<AxisUnit>,
    pub value: Option<ValueKind>,
    /// the value column, counting the axis as 0; default 1
    pub column: Option<usize>,
}

/// The names of the options that set [`OpticalHints`], for messages.
pub(crate) struct OptionNames {
    pub axis: &'static str,
    pub values: &'static str,
    pub column: &'static str,
    pub words: TableWords,
}

/// Options of an emitter file on the command line.
pub(crate) const EMITTER_OPTIONS: OptionNames = OptionNames {
    axis: "--emitter-axis",
    values: "--emitter-values",
    column: "--emitter-column",
    words: TableWords {
        column_hint: "(choose it with --emitter-column, counting the axis as 0)",
        unit_options: "--emitter-axis and --emitter-values",
        values: "emissivities, absorptances and reflectances",
        table: "an emissivity table",
    },
};

/// Options of a sky transmittance file on the command line.
pub(crate) const SKY_OPTIONS: OptionNames = OptionNames {
    axis: "--sky-axis",
    values: "--sky-values",
    column: "--sky-column",
    words: TableWords {
        column_hint: "(choose it with --sky-column, counting the axis as 0)",
        unit_options: "--sky-axis and --sky-values",
        values: "transmittances",
        table: "a transmittance table",
    },
};

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

const AXIS_HELP: &str = "nm, um or cm-1";

fn header_example(opts: &OptionNames) -> &'static str {
    if opts.words.values == SKY_OPTIONS.words.values {
        "'wavelength_um,transmittance' or 'Wavenumber (cm-1); Transmittance (%)'"
    } else {
        "'wavelength_um,reflectance' or 'Wavenumber (cm-1); Emissivity (%)'"
    }
}

/// Read a table of emissivity (or absorptance, or reflectance converted to 1 - R) of an
/// opaque emitter.
pub fn parse_emissivity_csv(text: &str, hints: &OpticalHints, name: &str) -> Result<OpticalTable, CsvError> {
    read_optical(
        text,
        hints,
        name,
        &EMITTER_OPTIONS,
        &[OpticalQuantity::Emissivity, OpticalQuantity::Absorptance, OpticalQuantity::Reflectance],
    )
}

/// Read a table of the sky's zenith transmittance.
pub fn parse_transmittance_csv(text: &str, hints: &OpticalHints, name: &str) -> Result<OpticalTable, CsvError> {
    read_optical(text, hints, name, &SKY_OPTIONS, &[OpticalQuantity::Transmittance])
}

fn read_optical(
    text: &str,
    hints: &OpticalHints,
    name: &str,
    opts: &OptionNames,
    accepted: &[OpticalQuantity],
) -> Result<OpticalTable, CsvError> {
    let words = &opts.words;
    let value_col = hints.column.unwrap_or(1);
    if value_col == 0 {
        return Err(CsvError::general(format!(
            "{} 0 would read the axis as values; columns count from the axis (0), so the first \
             value column is {} 1",
            opts.column, opts.column
        )));
    }
    let scan = scan_table(text, MAX_DATA_ROWS)?;
    scan.check_header_width(hints.axis.is_none() || hints.value.is_none(), words)?;
    let at_header = |msg: String| match scan.header_line {
        Some(h) => CsvError::at(h, msg),
        None => CsvError::general(msg),
    };
    let value_name = scan.names.get(value_col).map(String::as_str);
    let axis_unit = match hints.axis.or_else(|| scan.names.first().and_then(|n| axis_unit_from_name(n))) {
        Some(u) => u,
        None => {
            return Err(at_header(format!(
                "the unit of the spectral axis (column 0) is not given; name it in a header line such as {} \
                 or give {} UNIT ({AXIS_HELP})",
                header_example(opts),
                opts.axis
            )))
        }
    };
    let accepted_list = accepted.iter().map(|q| q.label()).collect::<Vec<_>>().join(", ");
    let kind = match hints.value.or_else(|| value_name.and_then(ValueKind::from_name)) {
        Some(k) => k,
        None => {
            let named = value_name.map(|n| format!(" (the header calls it {})", quoted(n))).unwrap_or_default();
            return Err(at_header(format!(
                "column {value_col} does not say what it holds{named}; name it {accepted_list} in the header, \
                 with '%' for percent, e.g. {}, or give {} KIND",
                header_example(opts),
                opts.values
            )));
        }
    };
    if !accepted.contains(&kind.quantity) && hints.value.is_some() {
        return Err(CsvError::general(format!(
            "{} says the values are {}, but this file must hold {accepted_list}",
            opts.values, kind.quantity
        )));
    }
    if !accepted.contains(&kind.quantity) {
        let fix = if kind.quantity == OpticalQuantity::Transmittance {
            "an opaque emitter has no transmittance; a sky transmittance goes to --sky file:PATH"
        } else {
            "a sky file holds the zenith transmittance of the atmosphere; an emitter's data goes to --emitter file:PATH"
        };
        return Err(at_header(format!(
            "column {value_col} holds {}, but this file must hold {accepted_list}: {fix}",
            kind.quantity
        )));
    }

    let TablePoints { xs, ys, line_of } = scan.read_points(value_col, words)?;
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
            return Err(CsvError::at(
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
            return Err(CsvError::at(
                line,
                format!(
                    "the axis value is out of range once converted from {} to a wavelength; check the \
                     axis unit ({})",
                    axis_unit.label(),
                    opts.axis
                ),
            ));
        }
        rows.push((lambda, value, line));
    }
    rows.sort_by(|a, b| a.0.total_cmp(&b.0));
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

    fn emis(text: &str) -> Result<OpticalTable, CsvError> {
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
        let e = emis("wavelength_um,emissivity\n1,0.5\n2,45\n").unwrap_err();
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("percent"), "{e}");
        let e = emis("wavelength_um,transmittance\n1,0.5\n2,0.5\n").unwrap_err();
        assert!(e.message.contains("--sky file"), "{e}");
        let e = emis("1,0.5\n2,0.5\n").unwrap_err();
        assert!(e.message.contains("--emitter-axis"), "{e}");
        let e = parse_transmittance_csv("wavelength_um,emissivity\n1,0.5\n2,0.5\n", &OpticalHints::default(), "s")
            .unwrap_err();
        assert!(e.message.contains("--emitter file"), "{e}");
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
