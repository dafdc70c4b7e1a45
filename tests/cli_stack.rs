//! The command-line contract of `stack`, `optimize`, `mismatch`, `losses`,
//! `cell --eqe/--urbach` and `eval --stack`: outputs, JSON keys, and one-line errors with
//! exit code 2 for every bad input.

use std::path::PathBuf;
use std::process::{Command, Output};

fn glowgap(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_glowgap")).args(args).output().expect("the binary runs")
}

fn json(args: &[&str]) -> serde_json::Value {
    let out = glowgap(args);
    assert!(out.status.success(), "{args:?}: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("valid JSON")
}

fn num(v: &serde_json::Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("{key} missing in {v}"))
}

/// A bad input: exit 2, nothing on stdout, exactly one line on stderr starting `glowgap: `
/// and containing `needle`.
fn refused(args: &[&str], needle: &str) {
    let out = glowgap(args);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
    assert!(out.stdout.is_empty(), "{args:?}: stdout {}", String::from_utf8_lossy(&out.stdout));
    let lines: Vec<&str> = err.lines().filter(|l| !l.starts_with("glowgap: warning:")).collect();
    assert_eq!(lines.len(), 1, "{args:?}: {err}");
    assert!(lines[0].starts_with("glowgap: ") && lines[0].contains(needle), "{args:?}: {err}");
}

fn fixture(name: &str) -> String {
    format!("file:{}/tests/fixtures/{name}", env!("CARGO_MANIFEST_DIR"))
}

fn temp_file(name: &str, text: &str) -> PathBuf {
    let p = std::env::temp_dir().join(format!("glowgap-cli-stack-{}-{name}", std::process::id()));
    std::fs::write(&p, text).unwrap();
    p
}

const SUBCELL_KEYS: [&str; 7] = ["gap_ev", "jsc_ma_cm2", "voc_v", "pmax_w_m2", "j_ma_cm2", "v_v", "excess_jsc_ma_cm2"];

#[test]
fn stack_json_has_the_contract_keys() {
    // Commonly cited: the AM1.5G two-terminal tandem at 1.63/0.96 eV is near 45.7%.
    // Tolerance 0.5 points on that figure.
    let v = json(&["stack", "--gaps", "1.63,0.96", "--json"]);
    for k in ["efficiency", "voc_v", "jsc_ma_cm2", "pmax_w_m2", "input_w_m2"] {
        assert!(v[k].is_number(), "missing {k}: {v}");
    }
    assert!((num(&v, "efficiency") - 0.457).abs() < 5e-3);
    assert_eq!(v["connection"], "series");
    let subs = v["subcells"].as_array().unwrap();
    assert_eq!(subs.len(), 2);
    for s in subs {
        for k in SUBCELL_KEYS {
            assert!(s[k].is_number(), "missing {k}: {s}");
        }
    }
    // gaps come back as typed, top first; the top cell's band is open above
    assert_eq!(num(&subs[0], "gap_ev"), 1.63);
    assert_eq!(num(&subs[1], "gap_ev"), 0.96);
    assert!(subs[0]["upper_gap_ev"].is_null() && num(&subs[1], "upper_gap_ev") == 1.63);
    // series: the stack Jsc is the smallest subcell Jsc, Voc the sum, power the sum
    let jmin = subs.iter().map(|s| num(s, "jsc_ma_cm2")).fold(f64::INFINITY, f64::min);
    assert_eq!(num(&v, "jsc_ma_cm2"), jmin);
    let vsum: f64 = subs.iter().map(|s| num(s, "voc_v")).sum();
    assert!((num(&v, "voc_v") - vsum).abs() < 1e-12);
    let psum: f64 = subs.iter().map(|s| num(s, "pmax_w_m2")).sum();
    assert!((num(&v, "pmax_w_m2") - psum).abs() < 1e-9 * psum);
    assert_eq!(v["limiting_subcell"], 1);
}

#[test]
fn independent_connection_sums_currents_and_beats_series() {
    let s = json(&["stack", "--gaps", "1.9,1.4,0.9", "--json"]);
    let i = json(&["stack", "--gaps", "1.9,1.4,0.9", "--connection", "independent", "--json"]);
    assert_eq!(i["connection"], "independent");
    assert!(i["limiting_subcell"].is_null());
    let jsum: f64 = i["subcells"].as_array().unwrap().iter().map(|x| num(x, "jsc_ma_cm2")).sum();
    assert!((num(&i, "jsc_ma_cm2") - jsum).abs() < 1e-12 * jsum);
    assert!(num(&i, "efficiency") >= num(&s, "efficiency"));
    // options reach the physics: concentration raises the input and the efficiency
    let c = json(&["stack", "--gaps", "1.9,1.4,0.9", "--spectrum", "am1.5d", "--concentration", "500", "--json"]);
    assert!(num(&c, "input_w_m2") > 4e5 && num(&c, "efficiency") > num(&s, "efficiency"));
}

#[test]
fn stack_table_reads_with_units() {
    let out = glowgap(&["stack", "--gaps", "1.8,1.1"]);
    assert!(out.status.success());
    let t = String::from_utf8(out.stdout).unwrap();
    assert!(t.contains("series (two-terminal)") && t.contains("mA/cm²") && t.contains("limiting subcell"), "{t}");
    assert!(t.contains(" %") && t.contains("1 top"), "{t}");
}

#[test]
fn optimize_json_has_gaps_efficiency_and_evaluations() {
    // De Vos, J. Phys. D 13, 839 (1980): two independent cells, 6000 K sun, 42.9%.
    // Tolerance 0.06 points (3 digits published).
    let args =
        ["optimize", "--junctions", "2", "--connection", "independent", "--spectrum", "blackbody:6000", "--json"];
    let v = json(&args);
    let gaps: Vec<f64> = v["gaps_ev"].as_array().unwrap().iter().map(|g| g.as_f64().unwrap()).collect();
    assert_eq!(gaps.len(), 2);
    assert!(gaps[0] > gaps[1], "top first: {gaps:?}");
    assert!((num(&v, "efficiency") - 0.429).abs() < 6e-4, "{v}");
    assert!(v["evaluations"].as_u64().unwrap() > 100);
    assert_eq!(num(&v["stack"], "efficiency"), num(&v, "efficiency"));
    // deterministic: the same question, the same answer and the same count
    let again = json(&args);
    assert_eq!(v, again);
}

#[test]
fn optimize_finds_a_partner_for_a_fixed_bottom_gap() {
    // Commonly cited: the best top cell for a 1.12 eV silicon bottom cell (AM1.5G, series)
    // is near 1.73 eV. Tolerance 0.03 eV.
    let v = json(&["optimize", "--junctions", "2", "--fix", "1.12", "--fix-at", "bottom", "--json"]);
    let gaps: Vec<f64> = v["gaps_ev"].as_array().unwrap().iter().map(|g| g.as_f64().unwrap()).collect();
    assert!((gaps[1] - 1.12).abs() < 1e-12 && (gaps[0] - 1.73).abs() < 0.03, "{gaps:?}");
    assert_eq!(num(&v, "fixed_ev"), 1.12);
    // one junction: the single-cell optimum of Ruhle, Solar Energy 130, 139 (2016), 33.7%
    // near 1.34 eV (tolerance: 3 digits)
    let one = json(&["optimize", "--junctions", "1", "--json"]);
    assert!((num(&one, "efficiency") - 0.337).abs() < 5e-4, "{one}");
}

#[test]
fn mismatch_json_gives_the_factor_and_its_four_integrals() {
    // Definition (IEC 60904-7): M = (I_dut,test I_ref,ref) / (I_dut,ref I_ref,test); and
    // M = 1 exactly when the test spectrum is the reference spectrum.
    let (dut, rd) = (fixture("stack_eqe_table.csv"), fixture("stack_eqe_reference.csv"));
    let v = json(&["mismatch", "--test-eqe", &dut, "--ref-eqe", &rd, "--spectrum", "blackbody:3200", "--json"]);
    let m = num(&v, "mismatch_factor");
    let (tt, tr, rt, rr) = (
        num(&v, "test_device_test_spectrum_ma_cm2"),
        num(&v, "test_device_reference_spectrum_ma_cm2"),
        num(&v, "reference_device_test_spectrum_ma_cm2"),
        num(&v, "reference_device_reference_spectrum_ma_cm2"),
    );
    assert!((m - tt * rr / (tr * rt)).abs() < 1e-12 * m);
    // tests/fixtures/stack_mismatch.csv (scipy): 0.5268694 for this pair; 1e-6 covers the
    // printed digits here (the full check is in tests/stack.rs)
    assert!((m - 0.526_869_4).abs() < 1e-6, "{m}");
    let same = json(&[
        "mismatch",
        "--test-eqe",
        &dut,
        "--ref-eqe",
        &rd,
        "--spectrum",
        "am1.5g",
        "--reference",
        "am1.5g",
        "--json",
    ]);
    assert!((num(&same, "mismatch_factor") - 1.0).abs() < 1e-12);
    let text =
        String::from_utf8(glowgap(&["mismatch", "--test-eqe", &dut, "--ref-eqe", &rd, "--spectrum", "am1.5d"]).stdout)
            .unwrap();
    assert!(text.contains("Spectral mismatch factor M") && text.contains("mA/cm²"), "{text}");
}

#[test]
fn losses_json_parts_add_up_to_the_input() {
    // Hirst & Ekins-Daukes, Prog. Photovolt. 19, 286 (2011): the parts account for all
    // incident power; 1e-9 relative (rounding only).
    let v = json(&["losses", "--gap", "1.34", "--json"]);
    let parts =
        ["below_gap_w_m2", "thermalization_w_m2", "emission_w_m2", "carnot_w_m2", "boltzmann_w_m2", "delivered_w_m2"];
    let sum: f64 = parts.iter().map(|k| num(&v, k)).sum();
    assert!((sum - num(&v, "input_w_m2")).abs() < 1e-9 * sum, "{v}");
    assert!((num(&v, "sum_w_m2") - sum).abs() < 1e-9 * sum);
    // the delivered part is the cell's maximum power (same figure as `cell`)
    let cell = json(&["cell", "--gap", "1.34", "--json"]);
    assert_eq!(num(&v, "delivered_w_m2"), num(&cell, "pmax_w_m2"));
    // against the gap: a CSV with a header and every point
    let out = glowgap(&["losses", "--from", "0.5", "--to", "3", "--step", "0.5", "--csv"]);
    let text = String::from_utf8(out.stdout).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert!(lines[0].starts_with("gap_ev,input_w_m2,below_gap_w_m2"), "{text}");
    assert_eq!(lines.len(), 7);
    let table = String::from_utf8(glowgap(&["losses", "--gap", "1.1", "--spectrum", "blackbody:6000"]).stdout).unwrap();
    assert!(table.contains("Carnot factor") && table.contains("100.00"), "{table}");
}

#[test]
fn cell_with_a_measured_eqe_or_an_urbach_tail() {
    let eqe = fixture("stack_eqe_table.csv");
    let v = json(&["cell", "--gap", "1.6", "--eqe", &eqe, "--json"]);
    for k in [
        "gap_ev",
        "efficiency",
        "jsc_ma_cm2",
        "voc_v",
        "ff",
        "vmp_v",
        "jmp_ma_cm2",
        "pmax_w_m2",
        "input_w_m2",
        "voc_rad_v",
        "j0_rad_ma_cm2",
        "nonrad_voc_loss_v",
    ] {
        assert!(v[k].is_number(), "missing {k}: {v}");
    }
    assert_eq!(v["absorber"], "measured");
    // tests/fixtures/stack_reciprocity.csv (scipy): this EQE under AM1.5G at 300 K gives
    // Jsc 23.68018 mA/cm2 and 27.25033%; 1e-6 relative covers the digits compared here
    assert!((num(&v, "jsc_ma_cm2") / 23.680_18 - 1.0).abs() < 1e-6, "{v}");
    assert!((num(&v, "efficiency") / 0.272_503_3 - 1.0).abs() < 1e-6, "{v}");
    // ERE lowers Voc by (kT/q) ln(1/ERE) (Green 2012, eq. 3); 1e-9 V
    let lossy = json(&["cell", "--gap", "1.6", "--eqe", &eqe, "--ere", "0.001", "--json"]);
    let kt_q = 1.380649e-23 * 300.0 / 1.602176634e-19;
    assert!((num(&lossy, "nonrad_voc_loss_v") - kt_q * 1000f64.ln()).abs() < 1e-9);
    // a measured Voc gives the implied ERE and loss
    let m = json(&["cell", "--gap", "1.6", "--eqe", &eqe, "--measured-voc", "1.1", "--json"]);
    assert!((num(&m, "measured_nonrad_voc_loss_v") - (num(&m, "voc_rad_v") - 1.1)).abs() < 1e-12);
    assert!(num(&m, "ere_from_voc") > 0.0 && num(&m, "ere_from_voc") < 1.0);
    // Urbach tail: below the step cell (Urbach 1953 tail adds emission)
    let step = json(&["cell", "--gap", "1.34", "--json"]);
    let tail = json(&["cell", "--gap", "1.34", "--urbach", "15", "--json"]);
    assert_eq!(tail["absorber"], "urbach");
    assert!(num(&tail, "voc_v") < num(&step, "voc_v") && num(&tail, "jsc_ma_cm2") > num(&step, "jsc_ma_cm2"));
    // a tail wider than kT warns but computes
    let wide = glowgap(&["cell", "--gap", "1.34", "--urbach", "40", "--json"]);
    assert!(wide.status.success() && String::from_utf8_lossy(&wide.stderr).contains("warning: the Urbach energy"));
}

#[test]
fn links_carry_the_stack_and_the_absorber_to_eval() {
    let out = glowgap(&["stack", "--gaps", "1.9,1.4,0.95", "--connection", "independent", "--link"]);
    assert!(out.status.success());
    let link = String::from_utf8(out.stdout).unwrap().trim().to_string();
    assert!(link.starts_with("#g1."), "{link}");
    let from_link = json(&["eval", &format!("http://127.0.0.1:8080/{link}"), "--stack", "--json"]);
    let direct = json(&["stack", "--gaps", "1.9,1.4,0.95", "--connection", "independent", "--json"]);
    assert_eq!(from_link, direct);
    // eval without --stack still prints the single cell, as before
    let cell = json(&["eval", &link, "--json"]);
    assert!(cell["gap_ev"].is_number() && cell.get("subcells").is_none());
    // an absorber travels in the link and eval shows the cell with it
    let out = glowgap(&["cell", "--gap", "1.34", "--urbach", "12", "--link"]);
    let link = String::from_utf8(out.stdout).unwrap().trim().to_string();
    let via_link = json(&["eval", &link, "--json"]);
    let direct = json(&["cell", "--gap", "1.34", "--urbach", "12", "--json"]);
    assert_eq!(via_link, direct);
}

#[test]
fn every_bad_input_is_one_line_and_exit_2() {
    // fixed arguments: (arguments, what the message must say)
    let fixed: &[(&[&str], &str)] = &[
        (&["stack"], "needs --gaps"),
        (&["stack", "--gaps", "0.96,1.63"], "top first"),
        (&["stack", "--gaps", "1.4,1.4"], "strictly descending"),
        (&["stack", "--gaps", "1.4"], "2 to 6 band gaps"),
        (&["stack", "--gaps", "3,2.5,2,1.5,1.2,1,0.8"], "2 to 6 band gaps"),
        (&["stack", "--gaps", "1.6,x"], "'x' is not a number"),
        (&["stack", "--gaps", "1.6,nan"], "is not a number"),
        (&["stack", "--gaps", "30,1"], "out of range"),
        (&["stack", "--gaps", "1.6,0.9", "--connection", "parallel"], "--connection 'parallel' is not known"),
        (&["stack", "--gaps", "1.6,0.9", "--concentration", "0.5"], "concentration"),
        (&["stack", "--gaps", "1.6,0.9", "--cell-temp", "-3"], "cell temperature"),
        (&["stack", "--gaps", "1.6,0.9", "--bogus", "1"], "unknown option '--bogus'"),
        (&["optimize"], "needs --junctions"),
        (&["optimize", "--junctions", "0"], "whole number from 1 to 6"),
        (&["optimize", "--junctions", "7"], "whole number from 1 to 6"),
        (&["optimize", "--junctions", "2.5"], "whole number from 1 to 6"),
        (&["optimize", "--junctions", "2", "--fix", "40"], "fixed gap 40 eV is out of range"),
        (&["optimize", "--junctions", "1", "--fix", "1.12"], "at least 2 junctions"),
        (&["optimize", "--junctions", "2", "--fix-at", "top"], "--fix-at applies only with --fix"),
        (&["optimize", "--junctions", "2", "--fix", "1.1", "--fix-at", "middle"], "--fix-at 'middle' is not known"),
        (&["optimize", "--junctions", "2", "--from", "2", "--to", "1"], "search range"),
        (&["optimize", "--junctions", "2", "--fix", "0.5", "--fix-at", "top", "--from", "0.6"], "no room"),
    ];
    for (args, needle) in fixed {
        refused(args, needle);
    }
    let (dut, rd) = (fixture("stack_eqe_table.csv"), fixture("stack_eqe_reference.csv"));
    refused(&["mismatch", "--ref-eqe", &rd, "--spectrum", "am1.5d"], "needs --test-eqe");
    refused(&["mismatch", "--test-eqe", &dut, "--spectrum", "am1.5d"], "needs --ref-eqe");
    refused(&["mismatch", "--test-eqe", &dut, "--ref-eqe", &rd], "needs --spectrum");
    refused(
        &["mismatch", "--test-eqe", "file:/no/such/eqe.csv", "--ref-eqe", &rd, "--spectrum", "am1.5d"],
        "no such file",
    );
    refused(&["mismatch", "--test-eqe", &dut, "--ref-eqe", &rd, "--spectrum", "sunshine"], "unknown spectrum");
    refused(
        &["mismatch", "--test-eqe", &dut, "--ref-eqe", &rd, "--spectrum", "am1.5d", "--reference", "file:/no/such.csv"],
        "no such file",
    );
    let no_header = temp_file("noheader.csv", "400,80\n500,80\n");
    let no_header = format!("file:{}", no_header.display());
    refused(&["mismatch", "--test-eqe", &no_header, "--ref-eqe", &rd, "--spectrum", "am1.5d"], "header");
    let too_big = temp_file("toobig.csv", "wavelength_nm,eqe_fraction\n400,0.5\n500,85\n");
    let too_big = format!("file:{}", too_big.display());
    refused(&["cell", "--gap", "1.4", "--eqe", &too_big], "line 3:");
    let uv = temp_file("uv.csv", "wavelength_nm,eqe_percent\n100,80\n150,80\n");
    let uv = format!("file:{}", uv.display());
    refused(&["mismatch", "--test-eqe", &uv, "--ref-eqe", &rd, "--spectrum", "am1.5d"], "no current");
    refused(&["cell", "--gap", "1.4", "--eqe", &dut, "--urbach", "10"], "not both");
    refused(&["cell", "--gap", "1.4", "--urbach", "10", "--approx", "exact"], "--approx exact applies to step cells");
    refused(&["cell", "--gap", "1.4", "--urbach", "0"], "Urbach energy 0 meV is out of range");
    refused(&["cell", "--gap", "1.4", "--urbach", "1e9"], "out of range");
    refused(&["cell", "--gap", "1.4", "--urbach", "ten"], "not a number");
    refused(&["cell", "--gap", "1.4", "--urbach", "10", "--measured-voc", "-1"], "positive voltage");
    refused(&["cell", "--gap", "1.4", "--eqe", "file:"], "needs a file");
    refused(&["losses"], "needs --gap");
    refused(&["losses", "--gap", "1.3", "--from", "1"], "needs --gap");
    refused(&["losses", "--gap", "1.3", "--json", "--csv"], "choose one of --json and --csv");
    refused(&["losses", "--from", "2", "--to", "1", "--step", "0.1"], "is not usable");
    refused(&["losses", "--from", "0.5", "--to", "3", "--step", "1e-7"], "more than the 100000 accepted");
    refused(&["losses", "--gap", "50"], "band gap 50 eV is out of range");
    refused(&["losses", "--from", "0.001", "--to", "1", "--step", "0.1"], "out of range");
    refused(&["eval", "#g1.garbage", "--stack"], "");
    refused(&["frobnicate"], "stack, optimize, mismatch, losses");
}

#[test]
fn help_lists_the_stack_commands() {
    let out = glowgap(&["help"]);
    let t = String::from_utf8(out.stdout).unwrap();
    for c in ["glowgap stack", "glowgap optimize", "glowgap mismatch", "glowgap losses", "--eqe", "--urbach"] {
        assert!(t.contains(c), "help lacks {c}");
    }
}
