//! The physics core: pure functions of SI quantities. No I/O, no web types, no allocation
//! in the hot paths beyond the result vectors.

pub mod constants;
pub mod junction;
pub mod planck;
pub mod sources;
pub mod special;
pub mod spectrum;
