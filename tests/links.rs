//! Compatibility fixture of share links and scenario files (`tests/fixtures/links/`).
//!
//! This is the program's own earlier output, kept so that old links keep opening to the same
//! figures: it is a compatibility check, not a physics reference (the physics is checked
//! against outside sources in `published_values.rs`, `radiator.rs` and `stack.rs`). Every
//! recorded link and scenario file must decode, give the recorded `glowgap eval --json`
//! figures, and survive a re-encoding unchanged. `tests/fixtures/links/README.md` says how
//! the fixture was made.

mod common;

use glowgap::codec;
use glowgap::scenario::hot::HotScenario;
use glowgap::scenario::radiator::{
    AngularSpec, EmissivityTable, EmitterSpec, RadiatorScenario, SkySpec, SolarBandSpec, TransmittanceTable,
};
use glowgap::scenario::stack::{
    AbsorberSpec, EqeTableSpec, MapSettings, MismatchSettings, OptimizeSettings, StackScenario,
};
use glowgap::scenario::{
    Axis, CellScenario, Connection, Emission, FixAt, JvModel, Panel, PlotAxis, PlotQuantity, Quantity, Scenario,
    SourceSpec, TableSpec, ViewSettings,
};
use serde_json::Value;
use std::path::{Path, PathBuf};

/// The fixture folder.
fn dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/links")
}

/// The parts of a scenario `glowgap eval` can show, with the flag that selects each and the
/// suffix of its recorded output.
const PARTS: [(&str, Option<&str>); 3] = [("cell", None), ("radiator", Some("--radiator")), ("stack", Some("--stack"))];

/// One recorded case: a name, the parts whose figures were recorded, and how its link was made.
struct Case {
    name: String,
    parts: Vec<String>,
    /// `glowgap` arguments (command-line cases) or `None` (a scenario built in [`page_scenarios`])
    args: Option<Vec<String>>,
}

/// The command-line cases of `cases.txt` (`name | parts | arguments`).
fn cli_cases() -> Vec<Case> {
    let text = std::fs::read_to_string(dir().join("cases.txt")).expect("cases.txt");
    let data = dir().join("data");
    text.lines()
        .filter(|l| !l.trim().is_empty() && !l.starts_with('#'))
        .map(|l| {
            let f: Vec<&str> = l.split('|').map(str::trim).collect();
            assert_eq!(f.len(), 3, "cases.txt line '{l}' is not 'name | parts | arguments'");
            Case {
                name: f[0].to_string(),
                parts: f[1].split(',').map(|p| p.trim().to_string()).collect(),
                args: Some(f[2].split_whitespace().map(|a| a.replace("{DATA}", &data.to_string_lossy())).collect()),
            }
        })
        .collect()
}

/// Scenarios with settings only the page can make (view settings, the optimizer's fixed
/// gap, map axes, absorber, mismatch tables, tables on every spectral axis), built here and
/// encoded by the codec.
fn page_scenarios() -> Vec<(&'static str, Scenario)> {
    let eqe_nm = |name: &str, nm: &[f64], eqe: &[f64]| EqeTableSpec {
        name: name.into(),
        axis: Axis::Wavelength,
        x: nm.iter().map(|l| l * 1e-9).collect(),
        eqe: eqe.to_vec(),
    };
    let stack_panel = Scenario {
        cell: CellScenario {
            gap_ev: 1.42,
            spectrum: SourceSpec::Am15d,
            concentration: 20.0,
            cell_temp_k: 305.0,
            ere: 0.05,
            emission: Emission::Front,
            approx: JvModel::Exact,
            gap_material: None,
        },
        view: ViewSettings {
            panel: Panel::Stack,
            spectrum_axis: PlotAxis::PhotonEnergy,
            spectrum_quantity: PlotQuantity::PhotonFlux,
            curve_from_ev: 0.8,
            curve_to_ev: 2.6,
        },
        radiator: RadiatorScenario::default(),
        stack: StackScenario {
            gaps_ev: vec![1.8, 1.3, 0.9],
            connection: Connection::Independent,
            optimize: OptimizeSettings {
                junctions: 3,
                fix_ev: Some(1.12),
                fix_at: FixAt::Bottom,
                from_ev: 0.6,
                to_ev: 2.5,
            },
            map: MapSettings {
                top_from_ev: 1.4,
                top_to_ev: 2.2,
                bottom_from_ev: 0.7,
                bottom_to_ev: 1.3,
                points: 51,
                ..Default::default()
            },
            absorber: AbsorberSpec::Urbach { urbach_mev: 25.0 },
            mismatch: MismatchSettings {
                test_eqe: Some(eqe_nm(
                    "test device",
                    &[350.0, 500.0, 800.0, 1100.0, 1200.0],
                    &[0.3, 0.9, 0.95, 0.6, 0.0],
                )),
                reference_eqe: Some(eqe_nm("reference cell", &[300.0, 600.0, 1000.0, 1150.0], &[0.5, 0.92, 0.85, 0.0])),
                reference_spectrum: SourceSpec::Am15d,
            },
            bottom: None,
            luminescent_coupling: 0.0,
        },
        hot: HotScenario::default(),
    };
    let ev_j = 1.602176634e-19;
    let radiator_panel = Scenario {
        cell: CellScenario {
            gap_ev: 1.1,
            spectrum: SourceSpec::Table(TableSpec {
                name: "hand-made photon table".into(),
                axis: Axis::PhotonEnergy,
                quantity: Quantity::PhotonFlux,
                x: [1.0, 1.5, 2.0, 2.5, 3.0].iter().map(|e| e * ev_j).collect(),
                y: vec![1.0e39, 5.0e39, 8.0e39, 4.0e39, 1.0e39],
            }),
            concentration: 3.0,
            cell_temp_k: 290.0,
            ere: 1.0,
            emission: Emission::Both,
            approx: JvModel::Exact,
            gap_material: None,
        },
        view: ViewSettings {
            panel: Panel::Radiator,
            spectrum_axis: PlotAxis::Wavelength,
            spectrum_quantity: PlotQuantity::PhotonFlux,
            curve_from_ev: 0.6,
            curve_to_ev: 2.0,
        },
        radiator: RadiatorScenario {
            emitter: EmitterSpec::Table(EmissivityTable {
                name: "hand-made coating".into(),
                wavelength_m: vec![0.3e-6, 3.0e-6, 8.0e-6, 13.0e-6, 25.0e-6],
                emissivity: vec![0.04, 0.1, 0.93, 0.9, 0.3],
            }),
            solar_band: Some(SolarBandSpec {
                below_um: 2.5,
                profile: EmitterSpec::Window { from_um: 0.4, to_um: 0.7, inside: 0.2, outside: 0.05, edge_um: 0.05 },
            }),
            angular: AngularSpec::CutOff { angle_deg: 60.0, beyond: 0.1 },
            sky: SkySpec::Table(TransmittanceTable {
                name: "hand-made sky".into(),
                wavelength_m: vec![1.0e-6, 7.9e-6, 8.1e-6, 12.9e-6, 13.1e-6, 30.0e-6],
                transmittance: vec![0.0, 0.0, 0.8, 0.8, 0.0, 0.0],
            }),
            ambient_k: 290.0,
            surface_k: Some(285.0),
            sun: Some(SourceSpec::Am0),
            sun_zenith_deg: 20.0,
            sun_scale: 0.5,
            h_c_w_m2k: 4.0,
            curve_from_k: 270.0,
            curve_to_k: 320.0,
        },
        stack: StackScenario {
            gaps_ev: vec![1.7, 1.1],
            connection: Connection::Series,
            optimize: OptimizeSettings {
                junctions: 4,
                fix_ev: Some(1.9),
                fix_at: FixAt::Top,
                from_ev: 0.5,
                to_ev: 3.0,
            },
            map: MapSettings {
                top_from_ev: 1.5,
                top_to_ev: 2.0,
                bottom_from_ev: 0.8,
                bottom_to_ev: 1.2,
                points: 2,
                ..Default::default()
            },
            absorber: AbsorberSpec::Measured(EqeTableSpec {
                name: "hand-made wavenumber EQE".into(),
                axis: Axis::Wavenumber,
                x: vec![8.0e5, 9.0e5, 1.0e6, 1.5e6, 2.5e6],
                eqe: vec![0.0, 0.5, 0.9, 0.95, 0.8],
            }),
            mismatch: MismatchSettings::default(),
            bottom: None,
            luminescent_coupling: 0.0,
        },
        hot: HotScenario::default(),
    };
    let optimize_any = Scenario {
        view: ViewSettings { panel: Panel::Cell, ..ViewSettings::default() },
        stack: StackScenario {
            gaps_ev: vec![2.3, 1.7, 1.2, 0.7],
            connection: Connection::Series,
            optimize: OptimizeSettings {
                junctions: 6,
                fix_ev: Some(1.34),
                fix_at: FixAt::Any,
                from_ev: 0.4,
                to_ev: 4.0,
            },
            map: MapSettings {
                top_from_ev: 1.0,
                top_to_ev: 3.0,
                bottom_from_ev: 0.3,
                bottom_to_ev: 1.9,
                points: 500,
                ..Default::default()
            },
            absorber: AbsorberSpec::Step,
            mismatch: MismatchSettings::default(),
            bottom: None,
            luminescent_coupling: 0.0,
        },
        ..Scenario::default()
    };
    vec![
        ("page-stack-panel", stack_panel),
        ("page-radiator-panel", radiator_panel),
        ("page-optimize-any", optimize_any),
    ]
}

fn all_cases() -> Vec<Case> {
    let mut cases = cli_cases();
    for (name, _) in page_scenarios() {
        cases.push(Case { name: name.into(), parts: PARTS.iter().map(|p| p.0.to_string()).collect(), args: None });
    }
    cases
}

fn eval_args<'a>(input: &'a str, part: &str) -> Vec<&'a str> {
    let flag = PARTS.iter().find(|p| p.0 == part).unwrap_or_else(|| panic!("unknown part '{part}'")).1;
    let mut args = vec!["eval", input, "--json"];
    args.extend(flag);
    args
}

fn eval_json(input: &str, part: &str) -> Value {
    common::json(&eval_args(input, part))
}

fn recorded_path(name: &str, part: &str) -> PathBuf {
    dir().join(format!("{name}.eval-{part}.json"))
}

fn read(path: &Path) -> String {
    std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Where a series stack's subcells operate (their current, voltage and power at the stack's
/// maximum): the place of a flat maximum, which rounding alone fixes only to about 1e-11
/// (dP/dJ there is a difference of two terms near 60 kT/q each), so two exact solvers of
/// the same equations agree on it to about that, not to 1e-12; 1e-9 still catches any change
/// of behaviour (a subcell voltage off by a microvolt).
fn is_operating_point(at: &str) -> bool {
    at.contains(".subcells[") && ["j_ma_cm2", "v_v", "pmax_w_m2"].iter().any(|k| at.ends_with(&format!(".{k}")))
}

/// Equal JSON, numbers to 1e-12 relative (1e-9 for [`is_operating_point`]): the figures come from the same code on the same
/// inputs, and only the decimal printing and reading of floats lies between them (which
/// serde_json does exactly), so anything beyond rounding noise is a change of behaviour.
fn assert_same_figures(got: &Value, want: &Value, at: &str) {
    match (got, want) {
        (Value::Number(a), Value::Number(b)) => {
            let (a, b) = (a.as_f64().unwrap(), b.as_f64().unwrap());
            let tol = if is_operating_point(at) { 1e-9 } else { 1e-12 };
            assert!((a - b).abs() <= tol * a.abs().max(b.abs()), "{at}: {a} != recorded {b}");
        }
        (Value::Object(a), Value::Object(b)) => {
            let (ka, kb): (Vec<_>, Vec<_>) = (a.keys().collect(), b.keys().collect());
            assert_eq!(ka, kb, "{at}: keys differ");
            for (k, v) in b {
                assert_same_figures(&a[k], v, &format!("{at}.{k}"));
            }
        }
        (Value::Array(a), Value::Array(b)) => {
            assert_eq!(a.len(), b.len(), "{at}: lengths differ");
            for (i, (x, y)) in a.iter().zip(b).enumerate() {
                assert_same_figures(x, y, &format!("{at}[{i}]"));
            }
        }
        _ => assert_eq!(got, want, "{at}"),
    }
}

#[test]
fn every_recorded_link_and_file_gives_the_recorded_figures() {
    let cases = all_cases();
    assert!(cases.len() >= 20, "the fixture lists {} cases", cases.len());
    for case in &cases {
        let link = read(&dir().join(format!("{}.link", case.name)));
        let file = dir().join(format!("{}.scenario.json", case.name));
        for part in &case.parts {
            let want: Value = serde_json::from_str(&read(&recorded_path(&case.name, part))).unwrap();
            assert_same_figures(&eval_json(link.trim(), part), &want, &format!("{} link, {part}", case.name));
            assert_same_figures(
                &eval_json(&file.to_string_lossy(), part),
                &want,
                &format!("{} file, {part}", case.name),
            );
        }
    }
}

#[test]
fn every_recorded_link_and_file_decodes_and_survives_re_encoding() {
    for case in all_cases() {
        let link = read(&dir().join(format!("{}.link", case.name)));
        let from_link = codec::decode_link(link.trim()).unwrap_or_else(|e| panic!("{}: {e}", case.name));
        let file = read(&dir().join(format!("{}.scenario.json", case.name)));
        let from_file = codec::from_json(&file).unwrap_or_else(|e| panic!("{}: {e}", case.name));
        assert_eq!(from_link, from_file, "{}: the link and the file hold different scenarios", case.name);
        let again = codec::decode_link(&codec::encode_fragment(&from_link)).unwrap();
        assert_eq!(again, from_link, "{}: link re-encoding", case.name);
        let again = codec::from_json(&codec::to_json(&from_link)).unwrap();
        assert_eq!(again, from_link, "{}: file re-encoding", case.name);
    }
}

#[test]
fn every_recorded_scenario_passes_the_whole_check_and_opens() {
    for case in all_cases() {
        let link = read(&dir().join(format!("{}.link", case.name)));
        let (s, _) = codec::open(&link).unwrap_or_else(|e| panic!("{}: {e}", case.name));
        assert_eq!(s.check(), Ok(()), "{}", case.name);
        let file = read(&dir().join(format!("{}.scenario.json", case.name)));
        assert_eq!(codec::open(&file).unwrap().0, s, "{}", case.name);
    }
}

#[test]
fn the_built_scenarios_are_the_recorded_ones() {
    for (name, scenario) in page_scenarios() {
        let link = read(&dir().join(format!("{name}.link")));
        assert_eq!(codec::decode_link(link.trim()).unwrap(), scenario, "{name}");
    }
}

/// Rewrites the fixture from the current program. Run only to add a case, never to make a
/// changed program pass: `cargo test --release --test links -- --ignored write_fixture`.
#[test]
#[ignore]
fn write_fixture() {
    let page = page_scenarios();
    for case in all_cases() {
        let link = match &case.args {
            Some(args) => {
                let args: Vec<&str> = args.iter().map(String::as_str).collect();
                let out = common::glowgap(&args);
                assert!(out.status.success(), "{}: {}", case.name, String::from_utf8_lossy(&out.stderr));
                String::from_utf8(out.stdout).unwrap().trim().to_string()
            }
            None => codec::encode_fragment(&page.iter().find(|(n, _)| *n == case.name).unwrap().1),
        };
        std::fs::write(dir().join(format!("{}.link", case.name)), format!("{link}\n")).unwrap();
        let scenario = codec::decode_link(&link).unwrap();
        std::fs::write(dir().join(format!("{}.scenario.json", case.name)), codec::to_json(&scenario) + "\n").unwrap();
        for part in &case.parts {
            let out = common::glowgap(&eval_args(&link, part));
            assert!(out.status.success(), "{} {part}: {}", case.name, String::from_utf8_lossy(&out.stderr));
            std::fs::write(recorded_path(&case.name, part), out.stdout).unwrap();
        }
    }
}
