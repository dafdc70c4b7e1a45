//! Readers for data files supplied by users. Each reader turns text into a validated physics
//! type and reports problems as one-line messages that name the offending line and say how
//! to fix it. No reader panics on any input.

pub mod emissivity_csv;
pub mod eqe_csv;
pub mod spectrum_csv;

pub use spectrum_csv::{parse_spectrum_csv, AreaUnit, AxisUnit, ColumnHints, CsvError, ValueUnit};
