//! `glowgap cell`: one cell at one band gap; with `--eqe` or `--urbach`, a measured or
//! modelled absorptance and its reciprocity limits.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::read_eqe_file;
use crate::cli::shared::options::{apply_common, real_absorber, with_light_and_cell_options};
use crate::cli::shared::output::{print_cell, warn, write_absorber_cell, write_real_cell};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::varshni::{gap_material, GAP_MATERIALS};
use crate::scenario::real::thickness_sweep;
use crate::scenario::stack::{AbsorberSpec, EqeTableSpec, StackScenario};
use crate::scenario::{CellScenario, Scenario};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "cell",
        valued: with_light_and_cell_options!(
            "gap",
            "eqe",
            "urbach",
            "measured-voc",
            "absorber",
            "light-trapping",
            "doping-type",
            "doping",
            "thickness-sweep"
        ),
        flags: &["json", "link"],
        max_positional: 0,
    },
    about: "one cell: efficiency, Jsc, Voc, fill factor and maximum power point at one band gap",
    usage: "cell --gap EV [SOURCE AND CELL OPTIONS] [--json | --link]\n\
            [--eqe file:PATH | --urbach MEV [--measured-voc V]]\n\
            or: glowgap cell --absorber silicon:THICKNESS_UM\n\
            \x20   [--light-trapping lambertian|single-pass|double-pass] [--doping-type n|p --doping CM3]\n\
            \x20   [--thickness-sweep FROM:TO:N] [SOURCE AND CELL OPTIONS] [--json]",
    docs: &[
        OptionDoc {
            name: "gap",
            arg: "EV",
            text: "band gap in eV (0.01 to 20), or a material whose gap follows --cell-temp (Varshni):\n\
                   gan, gap, alas, gaas, inp, si, ge, gasb, inas, insb; required; with --eqe the\n\
                   table sets the edge",
        },
        OptionDoc {
            name: "eqe",
            arg: "file:PATH",
            text: "a measured EQE (header with units: wavelength_nm,eqe_percent; fraction, %, A/W\n\
                   or mA/W); Jsc, J0 and Voc by reciprocity (default: an ideal step at --gap)",
        },
        OptionDoc {
            name: "urbach",
            arg: "MEV",
            text: "an exponential absorption tail below the gap, Urbach energy in meV (default: none)",
        },
        OptionDoc {
            name: "measured-voc",
            arg: "V",
            text: "with --eqe or --urbach: the ERE and Voc loss that a measured Voc in V implies\n\
                   (default: none)",
        },
        OptionDoc {
            name: "absorber",
            arg: "MAT:UM",
            text: "a real absorber instead of a step: silicon:THICKNESS_UM (Green 2008 absorption, Auger\n\
                   by Richter 2012) or file:PATH:THICKNESS_UM (an n,k table, radiative limit only);\n\
                   default: none, an ideal step at --gap",
        },
        OptionDoc {
            name: "thickness-sweep",
            arg: "FROM:TO:N",
            text: "with --absorber: N thicknesses from FROM to TO um, evenly on a log scale, and the\n\
                   best (default: none)",
        },
    ],
    run,
};

fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let gap_material = p.text("gap").and_then(gap_material).map(|m| m.key.to_string());
    let mut sc = CellScenario { gap_ev: cell_gap(&p)?, gap_material, ..Default::default() };
    apply_common(&p, &mut sc)?;
    if let Some(a) = p.text("absorber") {
        return cell_real(&p, sc, a, out);
    }
    for o in ["light-trapping", "doping-type", "doping", "thickness-sweep"] {
        if p.text(o).is_some() {
            return Err(Failure::Usage(format!("--{o} applies to a real absorber; add --absorber, e.g. silicon:110")));
        }
    }
    if wants_absorber(&p) {
        return cell_with_absorber(&p, sc, out);
    }
    if p.flag("link") {
        let setup = sc.to_physics()?; // refuse to link a scenario that cannot be computed
        warn(&setup.warnings);
        // the share-link fragment of this scenario, to append to the app's address
        let scenario = Scenario { cell: sc, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    print_cell(&sc, p.flag("json"), out)
}

/// The `--gap`: required, except with `--eqe`, whose table sets the edge (the scenario then
/// keeps its default gap, which a measured absorptance does not use).
fn cell_gap(p: &Parsed) -> Result<f64, String> {
    if let Some(t) = p.text("gap") {
        if gap_material(t).is_some() {
            // a material: the gap follows the cell temperature once the options are applied
            return Ok(CellScenario::default().gap_ev);
        }
        if t.trim().parse::<f64>().is_err() && t.trim().chars().all(|c| c.is_ascii_alphabetic()) {
            let known: Vec<&str> = GAP_MATERIALS.iter().map(|m| m.key).collect();
            return Err(format!(
                "--gap '{}' is not a number nor a material with a built-in band gap; give the band gap in eV, \
                 e.g. --gap 1.34, or one of {}",
                t.trim(),
                known.join(", ")
            ));
        }
    }
    match p.number("gap", "band gap", "eV")? {
        Some(g) => Ok(g),
        None if p.text("eqe").is_some() || p.text("absorber").is_some() => Ok(CellScenario::default().gap_ev),
        None => p.required_number("gap", "band gap", "eV", "cell"),
    }
}

/// Whether a measured or modelled absorptance was asked for.
fn wants_absorber(p: &Parsed) -> bool {
    p.text("eqe").is_some() || p.text("urbach").is_some() || p.text("measured-voc").is_some()
}

/// `glowgap cell ... --eqe file:PATH | --urbach MEV [--measured-voc V]`: `sc` holds the
/// cell options already applied.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // NaN-rejecting checks: `!(x > 0.0)` also refuses NaN
fn cell_with_absorber(p: &Parsed, sc: CellScenario, out: Out) -> Result<(), Failure> {
    let absorber = match (p.text("eqe"), p.number("urbach", "Urbach energy", "meV")?) {
        (Some(_), Some(_)) => {
            return Err(Failure::Usage(
                "give one of --eqe (a measured absorptance) and --urbach (a modelled tail), not both".into(),
            ))
        }
        (Some(f), None) => AbsorberSpec::Measured(EqeTableSpec::from_table(&read_eqe_file(f, "--eqe")?)),
        (None, Some(u)) => AbsorberSpec::Urbach { urbach_mev: u },
        (None, None) => AbsorberSpec::Step,
    };
    if !absorber.is_step() && p.text("approx").is_some_and(|a| a.eq_ignore_ascii_case("exact")) {
        return Err(Failure::Usage(
            "--approx exact applies to step cells; with --eqe or --urbach the J-V follows reciprocity, J0 (e^(qV/kT) - 1), so leave --approx out"
                .into(),
        ));
    }
    let measured = p.number("measured-voc", "measured open-circuit voltage", "V")?;
    if let Some(v) = measured {
        if !(v > 0.0) {
            return Err(Failure::Usage(format!(
                "--measured-voc {v} must be a positive voltage in V, e.g. --measured-voc 1.1"
            )));
        }
    }
    if let (AbsorberSpec::Measured(_), Some(g), false) = (&absorber, p.number("gap", "band gap", "eV")?, p.flag("link"))
    {
        // the figures are the table's; say so rather than leave a typed gap silently unused
        warn(&[format!(
            "--gap {g} is not used with --eqe: the measured EQE sets the absorption edge and every figure; leave --gap out"
        )]);
    }
    let scenario = Scenario { cell: sc, stack: StackScenario { absorber, ..Default::default() }, ..Default::default() };
    if p.flag("link") {
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    write_absorber_cell(&scenario, measured, p.flag("json"), out)
}

/// `glowgap cell --absorber silicon:UM ...`: a real absorber's cell, or a thickness sweep.
fn cell_real(p: &Parsed, sc: CellScenario, text: &str, out: Out) -> Result<(), Failure> {
    for o in ["eqe", "urbach", "measured-voc", "gap"] {
        if p.text(o).is_some() {
            return Err(Failure::Usage(format!(
                "--{o} does not apply with --absorber, whose table sets the absorption"
            )));
        }
    }
    let spec = real_absorber(p, "absorber", text)?;
    if sc.ere != 1.0 {
        warn(&["--ere is not used with --absorber: its recombination is radiative (reciprocity) plus Auger".into()]);
    }
    let sweep = match p.text("thickness-sweep") {
        None => None,
        Some(sweep) => {
            let bad = || format!("--thickness-sweep '{sweep}' is not FROM:TO:N in um, e.g. 10:1000:50");
            let parts: Vec<&str> = sweep.split(':').collect();
            let [a, b, n] = parts.as_slice() else { return Err(Failure::Usage(bad())) };
            let a: f64 = a.trim().parse().map_err(|_| bad())?;
            let b: f64 = b.trim().parse().map_err(|_| bad())?;
            let n: usize = n.trim().parse().map_err(|_| bad())?;
            Some(thickness_sweep(a, b, n).map_err(|e| format!("--thickness-sweep: {e}"))?)
        }
    };
    let scenario = Scenario {
        cell: sc,
        stack: StackScenario { absorber: AbsorberSpec::Real(spec), ..Default::default() },
        ..Default::default()
    };
    if p.flag("link") {
        if sweep.is_some() {
            return Err(Failure::Usage("--link holds one thickness; leave out --thickness-sweep".into()));
        }
        scenario.check()?;
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    write_real_cell(&scenario, sweep.as_deref(), p.flag("json"), out)
}
