//! What the page derives from a scenario that is not drawing or events: one view model per
//! panel (figures, curves, markers, captions), number formatting, CSV writers, the stack
//! map's data and geometry, and emissivity-point edits. Native code, tested by `cargo test`.
//!
//! Architecture invariant: `view` imports `scenario`, `physics`, `report` and `formats`,
//! never `app` or `cli`, and no web crate; `app` draws what `view` returns and computes no
//! physics of its own.

pub mod cell;
pub mod controls;
pub mod export;
pub mod format;
pub mod hints;
pub mod hot;
pub mod input;
pub mod place;
pub mod radiator;
pub mod resample;
pub mod spectrum;
pub mod stack;
pub mod tables;
