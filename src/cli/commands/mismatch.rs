//! `glowgap mismatch`: the spectral mismatch factor of a device under test against a
//! reference device, under a test spectrum and a reference spectrum.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{read_eqe_file, read_spectrum_as, HEADER_ONLY_SPECTRUM};
use crate::cli::shared::options::apply_common;
use crate::cli::shared::output::print_json;
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::mismatch::mismatch_factor;
use crate::report::stack::MismatchReport;
use crate::scenario::stack::{EqeTableSpec, MismatchSettings};
use crate::scenario::{CellScenario, SourceSpec};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "mismatch",
        valued: &[
            "test-eqe",
            "ref-eqe",
            "spectrum",
            "reference",
            "spectrum-axis",
            "spectrum-values",
            "spectrum-column",
        ],
        flags: &["json"],
        max_positional: 0,
    },
    about: "the spectral mismatch factor M of a test device against a reference device",
    usage: "mismatch --test-eqe file:PATH --ref-eqe file:PATH --spectrum SPEC [--reference SPEC] [--json]",
    docs: &[
        OptionDoc {
            name: "test-eqe",
            arg: "file:PATH",
            text: "EQE (fraction or %) or response (A/W, mA/W) of the device under test, required",
        },
        OptionDoc { name: "ref-eqe", arg: "file:PATH", text: "EQE or response of the reference device, required" },
        OptionDoc {
            name: "spectrum",
            arg: "SPEC",
            text: "the spectrum the measurement is made under, required:\n\
                   am1.5g | am1.5d | am0 | blackbody:K | file:PATH",
        },
        OptionDoc {
            name: "reference",
            arg: "SPEC",
            text: "the reference spectrum, default am1.5g (a file needs units in its header)",
        },
    ],
    run,
};

/// `glowgap mismatch --test-eqe file:PATH --ref-eqe file:PATH --spectrum SPEC [--reference SPEC] [--json]`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let need = |name: &str, what: &str| -> Result<String, Failure> {
        p.text(name).map(str::to_string).ok_or_else(|| {
            Failure::Usage(format!("'glowgap mismatch' needs --{name}: {what}, e.g. --{name} file:eqe.csv"))
        })
    };
    let test = read_eqe_file(
        &need("test-eqe", "the quantum efficiency (or A/W response) of the device under test")?,
        "--test-eqe",
    )?;
    let reference = read_eqe_file(
        &need("ref-eqe", "the quantum efficiency (or A/W response) of the reference device")?,
        "--ref-eqe",
    )?;
    let Some(test_spec) = p.text("spectrum") else {
        return Err(Failure::Usage(
            "'glowgap mismatch' needs --spectrum: the spectrum the measurement is made under (e.g. a simulator's, --spectrum file:simulator.csv)".into(),
        ));
    };
    // the test spectrum reads like every --spectrum; a reference file needs a header
    let mut sc = CellScenario { spectrum: SourceSpec::parse(test_spec)?, ..Default::default() };
    apply_common(&p, &mut sc)?;
    let mut settings = MismatchSettings {
        test_eqe: Some(EqeTableSpec::from_table(&test)),
        reference_eqe: Some(EqeTableSpec::from_table(&reference)),
        ..Default::default()
    };
    if let Some(r) = p.text("reference") {
        settings.reference_spectrum = match SourceSpec::parse(r)? {
            SourceSpec::File { path } => read_spectrum_as(&path, &Parsed::default(), HEADER_ONLY_SPECTRUM)
                .map_err(|e| format!("--reference: {e}"))?,
            other => other,
        };
    }
    let setup = settings.to_physics(&sc.spectrum)?;
    let m =
        mismatch_factor(&setup.test_device, &setup.reference_device, &setup.test_spectrum, &setup.reference_spectrum)?;
    let report = MismatchReport::new(&m, setup.test_spectrum.name(), setup.reference_spectrum.name());
    if p.flag("json") {
        return print_json(out, &report);
    }
    writeln!(out, "{:<44} {:.6}", "Spectral mismatch factor M", report.mismatch_factor)?;
    writeln!(out, "{:<44} {}", "Test spectrum", report.test_spectrum)?;
    writeln!(out, "{:<44} {}", "Reference spectrum", report.reference_spectrum)?;
    for (label, v) in [
        ("Device under test, test spectrum", report.test_device_test_spectrum_ma_cm2),
        ("Device under test, reference spectrum", report.test_device_reference_spectrum_ma_cm2),
        ("Reference device, test spectrum", report.reference_device_test_spectrum_ma_cm2),
        ("Reference device, reference spectrum", report.reference_device_reference_spectrum_ma_cm2),
    ] {
        writeln!(out, "{label:<44} {v:.4} mA/cm²")?;
    }
    writeln!(out, "calibrated current = measured current / M")?;
    Ok(())
}
