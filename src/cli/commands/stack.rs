//! `glowgap stack`: a multi-junction stack of given band gaps, series or independent.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::options::{apply_common, connection, real_absorber, with_light_and_cell_options};
use crate::cli::shared::output::{print_json, warn, with_gaps_as_given, write_stack_extras, write_stack_table};
use crate::cli::shared::{Command, Failure, Out};
use crate::report::stack::StackReport;
use crate::scenario::real::RealAbsorberSpec;
use crate::scenario::stack::StackScenario;
use crate::scenario::{CellScenario, Scenario, GAP_RANGE_EV};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "stack",
        valued: with_light_and_cell_options!(
            "gaps",
            "connection",
            "light-trapping",
            "doping-type",
            "doping",
            "luminescent-coupling"
        ),
        flags: &["json", "link"],
        max_positional: 0,
    },
    about: "a multi-junction stack: efficiency and each subcell's currents and voltages",
    usage: "stack --gaps EV,EV[,...][,silicon:UM] [--connection C] [--luminescent-coupling F]\n\
            [--light-trapping MODEL] [--doping-type n|p --doping CM3]\n\
            [SOURCE AND CELL OPTIONS] [--json | --link]",
    docs: &[OptionDoc {
        name: "gaps",
        arg: "EV,EV,...",
        text: "2 to 6 band gaps in eV, top cell first (strictly descending), required; the last\n\
               may be a real absorber, silicon:THICKNESS_UM or file:PATH:THICKNESS_UM\n\
               (e.g. 1.71,silicon:300)",
    }],
    run,
};

/// `--gaps 1.8,1.1` or `--gaps 1.71,silicon:300`: band gaps in eV, top first, and a real
/// bottom cell if the last item is one.
fn gap_list(p: &Parsed, command: &str) -> Result<(Vec<f64>, Option<RealAbsorberSpec>), Failure> {
    let Some(text) = p.text("gaps") else {
        return Err(Failure::Usage(format!(
            "'glowgap {command}' needs --gaps: the band gaps in eV, top cell first, separated by commas, e.g. --gaps 1.8,1.1"
        )));
    };
    let items: Vec<&str> = text.split(',').map(str::trim).collect();
    let mut bottom = None;
    let mut gaps = Vec::new();
    for (i, t) in items.iter().enumerate() {
        if let Ok(v) = t.parse::<f64>() {
            if v.is_finite() {
                gaps.push(v);
                continue;
            }
        }
        if t.contains(':') && i + 1 == items.len() {
            bottom = Some(real_absorber(p, "gaps", t)?);
            continue;
        }
        return Err(Failure::Usage(format!(
            "--gaps '{text}': '{t}' is not a number; give band gaps in eV separated by commas, top first, e.g. --gaps 1.8,1.1; \
             only the last may be a real absorber such as silicon:300"
        )));
    }
    Ok((gaps, bottom))
}

/// `glowgap stack --gaps EV,EV[,...] [--connection ...] [SOURCE AND CELL OPTIONS] [--json | --link]`
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    let (gaps_ev, bottom) = gap_list(&p, "stack")?;
    if bottom.is_none() {
        for o in ["light-trapping", "doping-type", "doping"] {
            if p.text(o).is_some() {
                return Err(Failure::Usage(format!(
                    "--{o} applies to a real bottom cell; end --gaps with one, e.g. --gaps 1.71,silicon:300"
                )));
            }
        }
    }
    let luminescent_coupling =
        p.number("luminescent-coupling", "luminescent coupling", "a fraction, 0 to 1")?.unwrap_or(0.0);
    let st = StackScenario { gaps_ev, connection: connection(&p)?, bottom, luminescent_coupling, ..Default::default() };
    let mut sc = CellScenario {
        gap_ev: st.gaps_ev.first().copied().unwrap_or(1.34).clamp(GAP_RANGE_EV.0, GAP_RANGE_EV.1),
        ..Default::default()
    };
    apply_common(&p, &mut sc)?;
    let setup = st.to_physics(&sc)?;
    warn(&setup.warnings);
    if p.flag("link") {
        let scenario = Scenario { cell: sc, stack: st, ..Default::default() };
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let r = setup.solve();
    let report = with_gaps_as_given(StackReport::from(&r), &st.gaps_ev).with_extras(&st);
    if p.flag("json") {
        print_json(out, &report)
    } else {
        write_stack_table(out, &report, &setup.light.source.name(), &sc)?;
        write_stack_extras(out, &report)?;
        Ok(())
    }
}
