//! The browser app (stub while building).
pub fn start() {}
