//! Readers for data files supplied by users. Each reader turns text into a validated physics
//! type and reports problems as a [`TableError`]: a one-line message that names the offending
//! line, and a [`Hint`] saying which setting would fix the file. No reader panics on any input.
//!
//! Layout: `units` (the vocabulary of units and quantities in headers and options), `table`
//! (the line scanner and the error type every reader shares), and one reader per kind of
//! table: `spectrum_csv`, `emissivity_csv` (emissivity and sky transmittance), `eqe_csv`,
//! `nk_csv` (a material's n,k or permittivity).
//!
//! Architecture invariant: readers are pure functions of text (no I/O, no front-end words:
//! no option or control is named in a message); `units` imports no reader, `table` imports
//! only `units`, readers never import each other.

pub mod emissivity_csv;
pub mod eqe_csv;
pub mod nk_csv;
pub mod spectrum_csv;
pub mod table;
pub mod units;

pub use spectrum_csv::{parse_spectrum_csv, ColumnHints};
pub use table::{Hint, TableError, TableKind};
pub use units::{AreaUnit, AxisUnit, ValueUnit};
