//! The stack panel's drawings (plotters, on any back end): the absorbed bands on the
//! spectrum and the two-junction map.

pub mod map;
pub mod spectrum;
