//! What the panels share on the page: the plot card (canvas, hover read-out, downloads),
//! plot drawing (frames, axes, ticks, the canvas/SVG/PNG back ends), the export buttons'
//! one dispatch, numeric fields and the file drop zone.
//!
//! Architecture invariant: no widget knows a panel; panels pass in what to draw and what to
//! write through traits ([`card::PlotBehaviour`], [`plot::Drawing`]).

pub mod card;
pub mod export;
pub mod fields;
pub mod notices;
pub mod place;
pub mod plot;
pub mod real_fields;
pub mod worker;
