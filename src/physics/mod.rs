//! The physics core: pure functions of SI quantities. No I/O, no web types, no allocation
//! in the hot paths beyond the result vectors.

pub mod absorber;
pub mod batch;
pub mod clear_sky;
pub mod constants;
pub mod data;
pub mod energy_yield;
pub mod film;
pub mod junction;
pub mod losses;
pub mod materials;
pub mod mismatch;
pub mod order;
pub mod planck;
pub mod radiator;
pub mod real_cell;
pub mod search;
pub mod silicon;
pub mod site;
pub mod solar_position;
pub mod solar_thermal;
pub mod sources;
pub mod special;
pub mod spectrum;
pub mod stack;
pub mod tpv;
pub mod varshni;
