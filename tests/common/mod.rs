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

/// A small reproducible generator for test inputs (SplitMix64; Steele, Lea & Flood, OOPSLA
/// 2014).
pub struct Rng(pub u64);

impl Rng {
    pub fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in `0..n` (`n` > 0).
    pub fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
    pub fn chance(&mut self, one_in: usize) -> bool {
        self.below(one_in) == 0
    }
    /// `n` bytes.
    pub fn bytes(&mut self, n: usize) -> Vec<u8> {
        let mut out = Vec::with_capacity(n + 8);
        while out.len() < n {
            out.extend_from_slice(&self.next().to_le_bytes());
        }
        out.truncate(n);
        out
    }
}
