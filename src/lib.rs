//! Glowgap: detailed-balance limits of solar cells and the radiative balance of surfaces.
//!
//! Data flows one way: a [`scenario`] (the single source of truth, serialized for links,
//! files and the command line) is turned into physics inputs, the [`physics`] core computes
//! results, and front ends (the `glowgap` command line, the browser app) display them.

#[cfg(target_arch = "wasm32")]
pub mod app;
pub mod codec;
pub mod formats;
pub mod physics;
pub mod report;
pub mod scenario;
pub mod view;

#[cfg(not(target_arch = "wasm32"))]
pub mod cli;
