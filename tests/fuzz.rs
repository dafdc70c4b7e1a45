//! Every decoder of user input, fed random and mutated bytes: share links and scenario files
//! (`codec::open`), spectrum, emissivity, sky-transmittance and quantum-efficiency tables
//! (`formats`). Each input must give `Ok` or an error of one line, never a panic and never a
//! hang.
//!
//! The inputs come from a small self-made mutator (bit flips, byte changes, inserted tokens
//! such as `1e999`, deep brackets and separators, deleted, repeated and swapped ranges and
//! lines, splices of two files) seeded with the real files of the repository: the data and
//! link fixtures under `tests/`, and the embedded ASTM G173-03 table. Share links are also
//! made by compressing mutated scenario files, so the mutations reach the JSON behind a link.
//!
//! `cargo test` runs a few thousand inputs. The long run takes its count (the total over all
//! decoders) and, optionally, its seed from the environment:
//!
//! ```text
//! GLOWGAP_FUZZ_CASES=10000000 GLOWGAP_FUZZ_SEED=1 nice cargo test --release --test fuzz -- --nocapture
//! ```

mod common;

use common::Rng;
use glowgap::codec;
use glowgap::formats::emissivity_csv::{parse_emissivity_csv, parse_transmittance_csv, OpticalHints};
use glowgap::formats::eqe_csv::parse_eqe_csv;
use glowgap::formats::spectrum_csv::{parse_spectrum_csv, ColumnHints};
use glowgap::formats::units::{AxisUnit, ValueUnit};
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::time::{Duration, Instant};

/// Inputs per `cargo test` run, over all decoders.
const DEFAULT_CASES: u64 = 12_000;
/// Longest accepted time for one input. Inputs are at most `MAX_LEN` bytes and every decoder
/// is linear in its input, so a case takes well under a millisecond in a release build; the
/// bound is generous for a debug build on a busy two-core machine.
const CASE_TIME_LIMIT: Duration = Duration::from_secs(2);
/// Longest input the mutator makes (bytes).
const MAX_LEN: usize = 64 * 1024;
/// Findings shown per decoder.
const MAX_EXAMPLES: usize = 5;
/// Longest accepted error message (characters).
const MAX_MESSAGE: usize = 2_000;

/// Text that the readers treat specially, inserted at random places.
const TOKENS: &[&str] = &[
    "1e999",
    "-1e999",
    "1e-400",
    "NaN",
    "inf",
    "-0",
    "0",
    "1D5",
    "99999999999999999999999999999999",
    "0.000000000000000000000000000001",
    "\n",
    "\r\n",
    "\r",
    ",",
    ";",
    "\t",
    " ",
    "#",
    "%",
    "//",
    "\"",
    "{",
    "}",
    "[",
    "]",
    ":",
    "(",
    ")",
    "µ",
    "\u{feff}",
    "\u{0}",
    "e",
    "-",
    ".",
    "nm",
    "um",
    "eV",
    "cm-1",
    "W/m2/nm",
    "photons/m2/s/eV",
    "percent",
    "(%)",
    "A/W",
    "reflectance",
    "transmittance",
    "wavelength_nm,eqe_percent\n",
    "wavelength_nm,irradiance_W_m2_nm\n",
    "wavelength_um,emissivity\n",
    "null",
    "true",
    "\"version\":2,",
    "\"type\":\"table\",",
    "#g1.",
    "#g99999999999.",
    "https://x/#g1.",
    "[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[",
    "{\"a\":{\"a\":{\"a\":{\"a\":{\"a\":{\"a\":{\"a\":{\"a\":",
];

/// One mutation of `data` in place; `other` is another seed for splices.
fn mutate(rng: &mut Rng, data: &mut Vec<u8>, other: &[u8]) {
    let len = data.len();
    match rng.below(10) {
        0 if len > 0 => {
            let i = rng.below(len);
            data[i] ^= 1 << rng.below(8);
        }
        1 if len > 0 => {
            let i = rng.below(len);
            data[i] = rng.next() as u8;
        }
        2 | 3 => {
            let t = TOKENS[rng.below(TOKENS.len())].as_bytes();
            let i = rng.below(len + 1);
            data.splice(i..i, t.iter().copied());
        }
        4 if len > 0 => {
            let i = rng.below(len);
            let j = (i + 1 + rng.below(64)).min(len);
            data.drain(i..j);
        }
        5 if len > 0 => {
            // repeat a range, up to 50 times
            let i = rng.below(len);
            let j = (i + 1 + rng.below(200)).min(len);
            let piece = data[i..j].to_vec();
            let times = 1 + rng.below(50);
            let at = rng.below(data.len() + 1);
            let copies: Vec<u8> = piece.iter().copied().cycle().take(piece.len() * times).collect();
            data.splice(at..at, copies);
        }
        6 if len > 0 => data.truncate(rng.below(len)),
        7 if !other.is_empty() => {
            // splice: our head, then the other seed's tail
            let i = rng.below(len + 1);
            let j = rng.below(other.len());
            data.truncate(i);
            data.extend_from_slice(&other[j..]);
        }
        8 => {
            // swap two lines
            let mut lines: Vec<Vec<u8>> = data.split(|&b| b == b'\n').map(<[u8]>::to_vec).collect();
            if lines.len() > 1 {
                let a = rng.below(lines.len());
                let b = rng.below(lines.len());
                lines.swap(a, b);
                *data = lines.join(&b'\n');
            }
        }
        _ => {
            // a run of random bytes
            let i = rng.below(len + 1);
            let n = 1 + rng.below(16);
            let bytes: Vec<u8> = (0..n).map(|_| rng.next() as u8).collect();
            data.splice(i..i, bytes);
        }
    }
    data.truncate(MAX_LEN);
}

/// A seed file's text, at most `max_lines` lines of it.
fn seed(path: &str, max_lines: usize) -> Vec<u8> {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("seed {path}: {e}"));
    let mut out: String = text.lines().take(max_lines).collect::<Vec<_>>().join("\n");
    out.push('\n');
    out.into_bytes()
}

/// Seeds from a folder: every file whose name ends with one of `endings`.
fn seeds_in(dir: &str, endings: &[&str], max_lines: usize) -> Vec<Vec<u8>> {
    let mut paths: Vec<_> = std::fs::read_dir(dir)
        .unwrap_or_else(|e| panic!("{dir}: {e}"))
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.to_str().is_some_and(|s| endings.iter().any(|end| s.ends_with(end))))
        .collect();
    paths.sort();
    paths.iter().map(|p| seed(p.to_str().unwrap_or_default(), max_lines)).collect()
}

/// The decoders under test.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Decoder {
    Link,
    ScenarioFile,
    Spectrum,
    Emissivity,
    Transmittance,
    QuantumEfficiency,
}

const DECODERS: [Decoder; 6] = [
    Decoder::Link,
    Decoder::ScenarioFile,
    Decoder::Spectrum,
    Decoder::Emissivity,
    Decoder::Transmittance,
    Decoder::QuantumEfficiency,
];

fn root(rel: &str) -> String {
    format!("{}/{rel}", env!("CARGO_MANIFEST_DIR"))
}

/// Seeds for each decoder: the repository's own files of that kind, and every table for the
/// table readers (a file of another kind must be refused cleanly too).
fn seeds_of(d: Decoder) -> Vec<Vec<u8>> {
    const LINES: usize = 80;
    let links = root("tests/fixtures/links");
    let mut tables = seeds_in(&root("tests/fixtures/links/data"), &[".csv", ".txt"], LINES);
    tables.extend(seeds_in(&root("tests/fixtures"), &[".csv"], LINES));
    tables.extend(seeds_in(&root("tests/data"), &[".csv"], LINES));
    tables.push(seed(&root("src/physics/data/astm_g173_03.csv"), LINES));
    let own = |names: &[&str]| -> Vec<Vec<u8>> { names.iter().map(|n| seed(&root(n), LINES)).collect() };
    let mut out = match d {
        Decoder::Link => return seeds_in(&links, &[".link"], LINES),
        Decoder::ScenarioFile => return seeds_in(&links, &[".scenario.json"], 400),
        Decoder::Spectrum => own(&["tests/data/led_like_spectrum.csv", "src/physics/data/astm_g173_03.csv"]),
        Decoder::Emissivity => own(&["tests/fixtures/links/data/emissivity.csv"]),
        Decoder::Transmittance => own(&["tests/fixtures/links/data/sky.csv"]),
        Decoder::QuantumEfficiency => own(&[
            "tests/fixtures/links/data/eqe.csv",
            "tests/fixtures/stack_eqe_table.csv",
            "tests/fixtures/stack_eqe_reference.csv",
        ]),
    };
    // files of its own kind three times as often as any other table
    let mine = out.clone();
    out.extend(mine.iter().cloned());
    out.extend(mine);
    out.extend(tables);
    out
}

/// The outcome of one input: `Err(text)` when the decoder refused it.
fn decode(d: Decoder, bytes: &[u8], rng: &mut Rng) -> Result<(), String> {
    let text = String::from_utf8_lossy(bytes);
    let axis = [None, Some(AxisUnit::Nanometre), Some(AxisUnit::Micrometre), Some(AxisUnit::PerCentimetre)];
    let column = [None, None, Some(1), Some(2), Some(0)][rng.below(5)];
    match d {
        Decoder::Link | Decoder::ScenarioFile => codec::open(&text).map(drop).map_err(|e| e.to_string()),
        Decoder::Spectrum => {
            let hints = ColumnHints {
                axis: axis[rng.below(4)],
                value: [None, ValueUnit::parse("W/m2/nm"), ValueUnit::parse("photons/m2/s/eV")][rng.below(3)],
                column,
            };
            parse_spectrum_csv(&text, &hints, "fuzz").map(drop).map_err(|e| e.to_string())
        }
        Decoder::Emissivity | Decoder::Transmittance => {
            let hints = OpticalHints { axis: axis[rng.below(4)], value: None, column };
            let r = if d == Decoder::Emissivity {
                parse_emissivity_csv(&text, &hints, "fuzz")
            } else {
                parse_transmittance_csv(&text, &hints, "fuzz")
            };
            r.map(drop).map_err(|e| e.to_string())
        }
        Decoder::QuantumEfficiency => parse_eqe_csv(&text, "fuzz").map(drop).map_err(|e| e.to_string()),
    }
}

/// A share link to `json` (mutated scenario text), as the page writes one.
fn as_link(json: &[u8]) -> Vec<u8> {
    let packed = miniz_oxide::deflate::compress_to_vec(json, 1);
    format!("#g1.{}", codec::base64url_encode(&packed)).into_bytes()
}

/// Totals of one run.
#[derive(Default)]
struct Tally {
    cases: u64,
    accepted: u64,
    slowest: Duration,
    /// inputs that panicked, hung or gave a message that is not one short line
    findings: u64,
    /// the first few of them
    examples: Vec<String>,
}

fn run(d: Decoder, cases: u64, seed_value: u64) -> Tally {
    let seeds = seeds_of(d);
    let json_seeds = if d == Decoder::Link { seeds_of(Decoder::ScenarioFile) } else { Vec::new() };
    assert!(!seeds.is_empty(), "{d:?} has seeds");
    let mut rng = Rng(seed_value ^ (d as u64).wrapping_mul(0xA24B_AED4_963E_E407));
    let mut tally = Tally::default();
    for case in 0..cases {
        let mut input = if rng.chance(10) {
            // plain random bytes, sometimes only printable ones
            let n = rng.below(2048);
            let printable = rng.chance(2);
            (0..n).map(|_| if printable { 32 + (rng.next() % 95) as u8 } else { rng.next() as u8 }).collect()
        } else {
            seeds[rng.below(seeds.len())].clone()
        };
        let other = seeds[rng.below(seeds.len())].clone();
        let rounds = 1 + rng.below(3);
        if d == Decoder::Link && !json_seeds.is_empty() && rng.chance(2) {
            // mutate the scenario behind the link, then pack it
            let mut json = json_seeds[rng.below(json_seeds.len())].clone();
            for _ in 0..rounds {
                mutate(&mut rng, &mut json, &other);
            }
            input = as_link(&json);
            if rng.chance(4) {
                mutate(&mut rng, &mut input, &other);
            }
        } else {
            for _ in 0..rounds {
                mutate(&mut rng, &mut input, &other);
            }
        }
        let mut inner = Rng(rng.next());
        let start = Instant::now();
        let outcome = catch_unwind(AssertUnwindSafe(|| decode(d, &input, &mut inner)));
        let took = start.elapsed();
        let shown = || String::from_utf8_lossy(&input[..input.len().min(600)]).into_owned();
        let mut finding = |what: String| {
            tally.findings += 1;
            if tally.examples.len() < MAX_EXAMPLES {
                tally.examples.push(format!("{d:?} case {case} (seed {seed_value}): {what} for {:?}", shown()));
            }
        };
        tally.slowest = tally.slowest.max(took);
        tally.cases += 1;
        if took >= CASE_TIME_LIMIT {
            finding(format!("took {took:?}"));
        }
        match outcome {
            Err(_) => finding("panicked".into()),
            Ok(Ok(())) => tally.accepted += 1,
            Ok(Err(msg)) => {
                if msg.is_empty() || msg.contains(['\n', '\r']) || msg.chars().count() > MAX_MESSAGE {
                    finding(format!("the error is not one short line: {msg:?}"));
                }
            }
        }
    }
    tally
}

fn env_number(name: &str) -> Option<u64> {
    std::env::var(name).ok().and_then(|v| v.trim().replace('_', "").parse().ok())
}

#[test]
fn decoders_survive_random_and_mutated_input() {
    let total = env_number("GLOWGAP_FUZZ_CASES").unwrap_or(DEFAULT_CASES);
    let seed_value = env_number("GLOWGAP_FUZZ_SEED").unwrap_or(0x676C_6F77);
    let per = total.div_ceil(DECODERS.len() as u64);
    let started = Instant::now();
    let mut all = 0;
    let mut findings = 0;
    let mut examples = Vec::new();
    for d in DECODERS {
        let t0 = Instant::now();
        let tally = run(d, per, seed_value);
        all += tally.cases;
        findings += tally.findings;
        eprintln!(
            "fuzz {d:?}: {} inputs, {} accepted, {} findings, slowest {:?}, {:.1} s",
            tally.cases,
            tally.accepted,
            tally.findings,
            tally.slowest,
            t0.elapsed().as_secs_f64()
        );
        examples.extend(tally.examples);
    }
    eprintln!(
        "fuzz total: {all} inputs, {findings} findings in {:.1} s (seed {seed_value})",
        started.elapsed().as_secs_f64()
    );
    assert!(examples.is_empty(), "{findings} findings, the first:\n{}", examples.join("\n"));
}

#[test]
fn long_header_lines_are_read_in_linear_time() {
    // a header line of thousands of words, as a mutation once made: every reader must stay
    // linear in it (every word tail as a unit candidate was quadratic, seconds for 64 KB)
    let words = "e-up narrow-band source for tests: a triangle around 650 n".repeat(1_000);
    let bracketed = "(W m-2 nm-1) [um] ".repeat(3_000);
    for header in [
        format!("wavelength_nm,irradiance_W_{words}"),
        format!("wavelength (nm), {words}"),
        format!("{words},{words}"),
        format!("wavelength_nm,{bracketed}"),
        format!("wavelength_nm;eqe_{}", "percent_".repeat(8_000)),
    ] {
        let text = format!("{header}\n400,1\n500,2\n600,1\n");
        for d in DECODERS {
            let start = Instant::now();
            let outcome = decode(d, text.as_bytes(), &mut Rng(1));
            let took = start.elapsed();
            assert!(took < CASE_TIME_LIMIT, "{d:?} took {took:?} on a header of {} bytes", header.len());
            if let Err(msg) = outcome {
                assert!(!msg.contains('\n') && msg.chars().count() <= MAX_MESSAGE, "{d:?}: {msg}");
            }
        }
    }
}
