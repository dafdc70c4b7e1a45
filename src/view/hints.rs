//! The page's words for a data file it cannot read: the reader's message, then what to change
//! in the file. Dropped files have no unit or column controls on the page, so every hint
//! (see `formats::Hint`) is worded as the header line or the column layout to write, or as
//! the other file input that takes such a table.
//!
//! Architecture invariant: native text functions of a `TableError` and the kind of table the
//! page was reading; no option of the command line is named (the command line words the same
//! hints as its options in `cli`).

use crate::formats::units::{OpticalQuantity, VALUE_UNITS_HELP};
use crate::formats::{AxisUnit, Hint, TableError, TableKind};

/// `a, b or c`.
fn or_list(items: &[&str]) -> String {
    match items {
        [] => String::new(),
        [one] => one.to_string(),
        [init @ .., last] => format!("{} or {last}", init.join(", ")),
    }
}

fn axis_labels(accepted: &[AxisUnit]) -> String {
    or_list(&accepted.iter().map(|u| u.label()).collect::<Vec<_>>())
}

fn quantity_labels(accepted: &[OpticalQuantity]) -> String {
    or_list(&accepted.iter().map(|q| q.label()).collect::<Vec<_>>())
}

/// What to change in a file of `kind` so that `hint` no longer applies, as the page says it.
pub fn page_fix(hint: Hint, kind: TableKind) -> String {
    let example = kind.example_header();
    match hint {
        Hint::AxisUnit { accepted } => format!(
            "name the axis unit in a header line above the data, such as '{example}' (axis units: {})",
            axis_labels(accepted)
        ),
        Hint::ValueUnit => format!(
            "name the unit of the values in a header line above the data, such as '{example}' \
             (units: {VALUE_UNITS_HELP})"
        ),
        Hint::Units => {
            format!("name both units in a header line above the data, one name per column, such as '{example}'")
        }
        Hint::ValueColumn => {
            "put the values in column 1, right after the axis (column 0): the page reads that column".to_string()
        }
        Hint::ValueKind { accepted } => format!(
            "say what the values are in a header line above the data, such as '{example}' ({}; add (%) for percent)",
            quantity_labels(accepted)
        ),
        Hint::OtherTable(TableKind::Transmittance) => {
            "load it with 'Load a sky transmittance…' for the sky instead".to_string()
        }
        Hint::OtherTable(TableKind::Emissivity) => {
            "load it with 'Load measured data…' for the emitter's profile instead".to_string()
        }
        Hint::OtherTable(other) => format!("load it where the page asks for {} instead", other.table()),
    }
}

/// A reader's error for the page: `line N: what is wrong; what to change in the file`.
pub fn page_message(e: &TableError, kind: TableKind) -> String {
    match e.hint {
        Some(h) => format!("{e}; {}", page_fix(h, kind)),
        None => e.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::formats::emissivity_csv::{parse_emissivity_csv, OpticalHints};
    use crate::formats::{parse_spectrum_csv, ColumnHints};

    #[test]
    fn headerless_spectrum_asks_for_a_header_line_and_names_no_option() {
        let e = parse_spectrum_csv("400,1\n500,1\n", &ColumnHints::default(), "x").unwrap_err();
        let text = page_message(&e, TableKind::Spectrum);
        assert!(!text.contains("--"), "{text}");
        assert!(text.contains("header line") && text.contains("'wavelength_nm,irradiance_W_m2_nm'"), "{text}");
        assert!(text.contains("nm, um, eV or cm^-1"), "{text}");
    }

    #[test]
    fn every_hint_has_page_words_without_options() {
        let hints = [
            Hint::AxisUnit { accepted: &AxisUnit::ALL },
            Hint::ValueUnit,
            Hint::Units,
            Hint::ValueColumn,
            Hint::ValueKind { accepted: &[OpticalQuantity::Transmittance] },
            Hint::OtherTable(TableKind::Transmittance),
            Hint::OtherTable(TableKind::Emissivity),
            Hint::OtherTable(TableKind::Spectrum),
        ];
        let kinds =
            [TableKind::Spectrum, TableKind::Emissivity, TableKind::Transmittance, TableKind::QuantumEfficiency];
        for h in hints {
            for k in kinds {
                let text = page_fix(h, k);
                assert!(!text.is_empty() && !text.contains("--"), "{h:?} {k:?}: {text}");
            }
        }
    }

    #[test]
    fn transmittance_dropped_on_the_emitter_points_to_the_sky_input() {
        let e = parse_emissivity_csv("wavelength_um,transmittance\n1,0.5\n2,0.5\n", &OpticalHints::default(), "t")
            .unwrap_err();
        let text = page_message(&e, TableKind::Emissivity);
        assert!(text.starts_with("line 1: ") && text.contains("sky transmittance"), "{text}");
    }

    #[test]
    fn errors_without_a_hint_are_shown_as_they_are() {
        let e = parse_spectrum_csv("wavelength_nm,W/m2/nm\n400,1\n500,x\n", &ColumnHints::default(), "x").unwrap_err();
        assert_eq!(e.hint, None);
        assert_eq!(page_message(&e, TableKind::Spectrum), e.to_string());
    }
}
