//! Helpers shared by the integration tests: running the binary, reading fixtures.
#![allow(dead_code)] // each test crate uses its own subset

use std::process::{Command, Output};

/// Run the `glowgap` binary with `args`.
pub fn glowgap(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_glowgap")).args(args).output().expect("the binary runs")
}

/// Run the binary, expect success, parse stdout as JSON.
pub fn json(args: &[&str]) -> serde_json::Value {
    let out = glowgap(args);
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("valid JSON")
}

/// The command-line contract for bad input: exit code 2 and one line on stderr that starts
/// `glowgap: `, never a panic, and mentions `needle` (case-insensitive).
pub fn expect_usage_error(args: &[&str], needle: &str) {
    let out = glowgap(args);
    assert_eq!(out.status.code(), Some(2), "{args:?} should fail with 2");
    let err = String::from_utf8(out.stderr).unwrap();
    assert_eq!(err.trim_end().lines().count(), 1, "{args:?}: one line, got {err:?}");
    assert!(err.starts_with("glowgap: "), "{err}");
    assert!(!err.contains("panicked") && !err.contains("RUST_BACKTRACE"), "{err}");
    assert!(err.to_lowercase().contains(&needle.to_lowercase()), "{args:?}: {err} lacks {needle}");
}

/// Data rows of a fixture CSV: `#` comments and the header line skipped, fields trimmed.
pub fn fixture_rows(text: &str) -> Vec<Vec<String>> {
    text.lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .skip(1) // header
        .map(|l| l.split(',').map(|s| s.trim().to_string()).collect())
        .collect()
}

/// A fixture number; `inf` is infinity.
pub fn num(s: &str) -> f64 {
    if s == "inf" {
        f64::INFINITY
    } else {
        s.parse().unwrap()
    }
}
