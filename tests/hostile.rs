//! Hostile and huge input on the command line: every refusal is exit code 2 and one line on
//! stderr that says what is wrong and how to fix it, within a bounded time and memory; a
//! large valid table is read whole.
//!
//! Inputs are generated here in a temporary folder (nothing large is kept in the repository).
//!
//! Time bound: [`TIME_LIMIT`], 10 s per run. Each refusal takes well under a second in a debug
//! build; the bound leaves room for a noisy two-core machine shared with other builds, while
//! a hang, or a path quadratic in the input's size, would exceed it.
//!
//! Memory: the binary reports its peak resident set (`VmHWM`) when
//! `GLOWGAP_REPORT_PEAK_MEMORY` is set (Linux only; elsewhere the memory checks are skipped).

mod common;

use glowgap::physics::constants::{BOLTZMANN, LIGHT_SPEED, PLANCK, SUN_DILUTION};
use glowgap::physics::planck::{band_fraction_below, stefan_boltzmann};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// Longest accepted run (see the module documentation).
const TIME_LIMIT: Duration = Duration::from_secs(10);

/// What a run left: exit code, stderr lines other than the memory report, peak memory [kB]
/// when reported, wall time.
struct Run {
    code: Option<i32>,
    errors: Vec<String>,
    peak_kb: Option<u64>,
    took: Duration,
    stdout: String,
}

fn run_with(args: &[&str], stdin: Option<&[u8]>) -> Run {
    let start = Instant::now();
    let mut child = Command::new(env!("CARGO_BIN_EXE_glowgap"))
        .args(args)
        .env("GLOWGAP_REPORT_PEAK_MEMORY", "1")
        .stdin(if stdin.is_some() { Stdio::piped() } else { Stdio::null() })
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary runs");
    if let Some(bytes) = stdin {
        // the program may stop reading early: a broken pipe is its right
        let _ = child.stdin.take().expect("stdin").write_all(bytes);
    }
    let out = child.wait_with_output().expect("the binary ends");
    let took = start.elapsed();
    let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
    let mut peak_kb = None;
    let mut errors = Vec::new();
    for line in stderr.lines() {
        match line.strip_prefix("glowgap: peak memory ") {
            Some(v) => peak_kb = v.trim_end_matches("kB").trim().parse().ok(),
            None => errors.push(line.to_string()),
        }
    }
    Run { code: out.status.code(), errors, peak_kb, took, stdout: String::from_utf8_lossy(&out.stdout).into_owned() }
}

fn run(args: &[&str]) -> Run {
    run_with(args, None)
}

/// Exit code 2, one line on stderr holding every one of `needles`, in time; returns the line.
fn refused(r: &Run, what: &str, needles: &[&str]) -> String {
    assert_eq!(r.code, Some(2), "{what}: exit code; stderr {:?}", r.errors);
    assert_eq!(r.errors.len(), 1, "{what}: one line on stderr, got {:?}", r.errors);
    let line = r.errors[0].clone();
    assert!(line.starts_with("glowgap: ") && line.len() < 600, "{what}: {line}");
    for n in needles {
        assert!(line.contains(n), "{what}: {n:?} missing from {line}");
    }
    assert!(r.took < TIME_LIMIT, "{what}: took {:?}", r.took);
    line
}

fn temp_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("glowgap-hostile-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("a temporary folder");
    dir
}

fn path_str(p: &Path) -> &str {
    p.to_str().expect("a UTF-8 temporary path")
}

/// `n` bytes from a fixed-seed generator.
fn random_bytes(n: usize) -> Vec<u8> {
    common::Rng(0x5EED).bytes(n)
}

#[test]
fn twenty_megabytes_of_random_bytes_are_refused_without_being_held_twice() {
    let dir = temp_dir("random");
    let file = dir.join("noise.csv");
    let mut bytes = random_bytes(20_000_000);
    std::fs::write(&file, &bytes).expect("write");
    // the same without zero bytes: refused as not UTF-8 rather than by its first zero
    bytes.retain(|&b| b != 0);
    let no_zero = dir.join("noise-no-zero.csv");
    std::fs::write(&no_zero, &bytes).expect("write");
    for f in [&file, &no_zero] {
        let spec = format!("file:{}", path_str(f));
        for (args, flag) in [
            (vec!["cell", "--gap", "1.34", "--spectrum", &spec], "--spectrum"),
            (vec!["cell", "--eqe", &spec], "--eqe"),
            (vec!["cool", "--emitter", &spec], "--emitter"),
            (vec!["cool", "--sky", &spec], "--sky"),
        ] {
            let r = run(&args);
            refused(&r, flag, &["is not text", flag]);
            if let Some(kb) = r.peak_kb {
                // the 20 MB file once, and the program itself
                assert!(kb < 50_000, "{flag}: peak memory {kb} kB");
            }
        }
    }
    // as a scenario: refused by its size before it is read
    let r = run(&["eval", path_str(&file)]);
    refused(&r, "eval", &["more than the 4 MB accepted", "share link"]);
    assert!(r.peak_kb.is_none_or(|kb| kb < 20_000), "eval: {:?} kB", r.peak_kb);
    // from standard input: read no further than the limit
    let r = run_with(&["eval", "-"], Some(&bytes));
    refused(&r, "eval -", &["standard input", "more than the 4 MB accepted"]);
    assert!(r.peak_kb.is_none_or(|kb| kb < 30_000), "eval -: {:?} kB", r.peak_kb);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn deeply_nested_json_is_refused_in_words() {
    let dir = temp_dir("deep");
    let depth = 200_000;
    for (name, text) in [
        ("arrays.json", format!("{{\"scenario\":{}{}}}", "[".repeat(depth), "]".repeat(depth))),
        ("objects.json", format!("{}1{}", "{\"a\":".repeat(depth), "}".repeat(depth))),
    ] {
        let file = dir.join(name);
        std::fs::write(&file, text.as_bytes()).expect("write");
        let line = refused(&run(&["eval", path_str(&file)]), name, &["nests brackets too deeply", "Glowgap"]);
        assert!(!line.contains("recursion limit"), "no parser words: {line}");
        // the same document behind a link
        let packed = miniz_oxide::deflate::compress_to_vec(text.as_bytes(), 9);
        let link = format!("#g1.{}", glowgap::codec::base64url_encode(&packed));
        refused(&run(&["eval", &link]), "deep link", &["nests brackets too deeply"]);
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_link_of_120000_characters_is_refused() {
    let body: String = random_bytes(120_000)
        .iter()
        .map(|b| b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_"[usize::from(b % 64)] as char)
        .collect();
    let link = format!("https://example.org/glowgap/#g1.{body}");
    refused(&run(&["eval", &link]), "long link", &["link", "copy the whole link again"]);
    // a link longer than any scenario's is refused by its length
    let huge = format!("#g1.{}", "A".repeat(glowgap::codec::MAX_LINK_CHARS + 1));
    refused(&run_with(&["eval", "-"], Some(huge.as_bytes())), "huge link", &["characters long", "accepted"]);
}

#[test]
fn overflowing_numbers_are_refused_as_out_of_range() {
    let digits = "7".repeat(5_000);
    for value in ["1e999", "-1e999", digits.as_str()] {
        let line = refused(&run(&["cell", "--gap", value]), value, &["--gap", "out of range", "e.g. --gap"]);
        assert!(line.len() < 300, "the value is shortened: {line}");
    }
    for option in ["--cell-temp", "--concentration", "--ere"] {
        refused(&run(&["cell", "--gap", "1.34", option, "1e999"]), option, &[option, "out of range"]);
    }
    // in a scenario file: the JSON reader refuses the number, in words
    let dir = temp_dir("numbers");
    for value in ["1e999", digits.as_str()] {
        let file = dir.join("gap.json");
        std::fs::write(&file, format!("{{\"cell\":{{\"gap_ev\":{value}}}}}")).expect("write");
        let line = refused(&run(&["eval", path_str(&file)]), "scenario number", &["too large for any setting"]);
        assert!(line.len() < 400, "{line}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_billion_point_sweep_is_refused_before_allocating() {
    let r = run(&["sweep", "--from", "0.5", "--to", "1.5", "--step", "1e-9"]);
    refused(&r, "sweep", &["1000000001 band gaps", "more than the 100000 accepted", "--step"]);
    assert!(r.peak_kb.is_none_or(|kb| kb < 20_000), "sweep: {:?} kB", r.peak_kb);
    let r = run(&["losses", "--from", "0.5", "--to", "1.5", "--step", "1e-9"]);
    refused(&r, "losses", &["1000000001 band gaps", "--step"]);
    // the largest grid accepted is computed
    let r = run(&["sweep", "--from", "1", "--to", "1.0999", "--step", "1e-6", "--best"]);
    assert_eq!(r.code, Some(0), "{:?}", r.errors);
}

/// Exitance of a black body per wavelength, pi B_lambda(T) [W m^-2 m^-1] (Planck's law).
fn exitance(lambda_m: f64, temp_k: f64) -> f64 {
    let x = PLANCK * LIGHT_SPEED / (lambda_m * BOLTZMANN * temp_k);
    2.0 * std::f64::consts::PI * PLANCK * LIGHT_SPEED * LIGHT_SPEED / lambda_m.powi(5) / x.exp_m1()
}

#[test]
fn a_spectrum_of_two_million_rows_is_read_whole() {
    // takes a few seconds in a release build (writing the file, then reading it); debug
    // builds are slower, so the time bound applies to release builds only
    const ROWS: usize = 2_000_000;
    let (t, from_nm, step_nm) = (5772.0, 200.0, 0.05);
    let dir = temp_dir("large");
    let file = dir.join("sun5772.csv");
    let mut text = String::with_capacity(ROWS * 32);
    text.push_str("# black body at 5772 K, diluted to the Earth's distance\nwavelength_nm,irradiance_W_m2_nm\n");
    for i in 0..ROWS {
        let nm = from_nm + step_nm * i as f64;
        let v = SUN_DILUTION * exitance(nm * 1e-9, t) * 1e-9;
        text.push_str(&format!("{nm:.2},{v:.9e}\n"));
    }
    std::fs::write(&file, &text).expect("write");
    drop(text);
    let spec = format!("file:{}", path_str(&file));
    let r = run(&["cell", "--gap", "1.34", "--spectrum", &spec, "--json"]);
    assert_eq!(r.code, Some(0), "{:?}", r.errors);
    if !cfg!(debug_assertions) {
        assert!(r.took < TIME_LIMIT, "took {:?}", r.took);
    }
    eprintln!("2,000,000 rows: {:?}, peak {:?} kB", r.took, r.peak_kb);
    if let Some(kb) = r.peak_kb {
        // the text (about 40 MB) and a few copies of 2 x 16 MB of numbers
        assert!(kb < 400_000, "peak memory {kb} kB");
    }
    let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
    let input = v["input_w_m2"].as_f64().expect("input_w_m2");
    // sigma T^4 (F(0->l2 T) - F(0->l1 T)), F the blackbody fraction (physics::planck, checked
    // against the handbook table in tests/published_values.rs); the table's trapezoids and
    // its 10 significant digits agree with it to well under 1e-6
    let (l1, l2) = (from_nm * 1e-9, (from_nm + step_nm * (ROWS - 1) as f64) * 1e-9);
    let expected = SUN_DILUTION * stefan_boltzmann(t) * (band_fraction_below(l2 * t) - band_fraction_below(l1 * t));
    assert!((input / expected - 1.0).abs() < 1e-6, "{input} W/m2 against {expected} W/m2");
    let _ = std::fs::remove_dir_all(&dir);
}
