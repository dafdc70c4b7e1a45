//! `glowgap absorber`: a solar-thermal absorber under (concentrated) sunlight: what it
//! absorbs from the sun and the ambient, emits and loses to the air, its thermal and work
//! (times Carnot) efficiency and stagnation temperature; or with `--best` the best step
//! absorber (cutoff and temperature) for work.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the
//! absorber is an `AbsorberScenario` checked by its own `to_physics`, every figure comes from
//! `report::hot`.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{read_spectrum_file, resolve_emitter_file};
use crate::cli::shared::options::concentration;
use crate::cli::shared::options::EMITTER_FILE_DOCS;
use crate::cli::shared::output::{print_json, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::report::hot::AbsorberReport;
use crate::scenario::hot::{AbsorberScenario, SurfaceSpec};
use crate::scenario::radiator::EmitterSpec;
use crate::scenario::{Panel, Scenario, SourceSpec};

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "absorber",
        valued: &[
            "temp",
            "cutoff-um",
            "emitter",
            "spectrum",
            "concentration",
            "ambient",
            "hc",
            "emitter-axis",
            "emitter-values",
            "emitter-column",
            "spectrum-axis",
            "spectrum-values",
            "spectrum-column",
        ],
        flags: &["best", "json", "link"],
        max_positional: 0,
    },
    about: "a solar-thermal absorber: absorbed, emitted, thermal and work efficiency, stagnation",
    usage: "absorber --temp K [--cutoff-um UM | --emitter EMIT] [--spectrum SPEC] [--concentration X]\n\
            [--ambient K] [--hc W_PER_M2K] [--json | --link]\n\
            or: glowgap absorber --best [--spectrum SPEC] [--concentration X] [--ambient K] [--json]",
    docs: &[
        OptionDoc {
            name: "temp",
            arg: "K",
            text: "the absorber's temperature in kelvin, 1 to 100000, required unless --best,\n\
                   e.g. --temp 700",
        },
        OptionDoc {
            name: "cutoff-um",
            arg: "UM",
            text: "a step absorber: absorptance (= emissivity) 1 below this wavelength in um, 0 above\n\
                   (default: black, 1 everywhere)",
        },
        OptionDoc {
            name: "emitter",
            arg: "EMIT",
            text: "any absorptance (= emissivity) profile: blackbody | grey:EPS |\n\
                   window:L1-L2[,in=EPS,out=EPS,edge=UM] | points:UM=EPS,... | file:PATH\n\
                   (default: black)",
        },
        OptionDoc {
            name: "spectrum",
            arg: "SPEC",
            text: "the sun: am1.5d (default) | am1.5g | am0 | blackbody:K | file:PATH",
        },
        OptionDoc {
            name: "concentration",
            arg: "X",
            text: "suns, 1 (default) up to the sun-disc limit (about 46,239); max for that limit",
        },
        OptionDoc {
            name: "ambient",
            arg: "K",
            text: "the ambient's (and sky's) temperature in kelvin, default 300; the sky the sun\n\
                   does not fill (1 - C f of the view) radiates at it",
        },
        OptionDoc { name: "hc", arg: "W_PER_M2K", text: "convective loss coefficient in W/(m2 K), default 0" },
        OptionDoc {
            name: "best",
            arg: "",
            text: "search the step cutoff and the temperature of the largest work efficiency\n\
                   (adds best_temp_k and best_cutoff_um, null when black is best)",
        },
        EMITTER_FILE_DOCS[0],
        EMITTER_FILE_DOCS[1],
        EMITTER_FILE_DOCS[2],
        OptionDoc {
            name: "spectrum-axis",
            arg: "U",
            text: "with --spectrum file:PATH: the axis unit, e.g. nm, um, eV (default: from the header)",
        },
        OptionDoc {
            name: "spectrum-values",
            arg: "U",
            text: "with --spectrum file:PATH: the value unit, e.g. W/m2/nm (default: from the header)",
        },
        OptionDoc {
            name: "spectrum-column",
            arg: "N",
            text: "with --spectrum file:PATH: the value column, the axis being 0 (default 1)",
        },
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON {\"temp_k\", \"incident_w_m2\", \"absorbed_w_m2\", \"emitted_w_m2\",\n\
                   \"convection_w_m2\", \"thermal_efficiency\", \"carnot_factor\", \"work_efficiency\",\n\
                   \"stagnation_temp_k\"; with --best also \"best_temp_k\", \"best_cutoff_um\"}",
        },
        OptionDoc {
            name: "link",
            arg: "",
            text: "print the scenario's share-link fragment (#g1.…) to append to the app's address,\n\
                   instead of the figures",
        },
    ],
    run,
};

/// `glowgap absorber --temp K [...]` or `glowgap absorber --best [...]`.
fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("json") && p.flag("link") {
        return Err(Failure::Usage("'glowgap absorber': choose one of --json and --link".into()));
    }
    let best = p.flag("best");
    if best && (p.text("cutoff-um").is_some() || p.text("emitter").is_some() || p.text("temp").is_some()) {
        return Err(Failure::Usage(
            "--best searches the step cutoff and the temperature itself; drop --cutoff-um, --emitter and --temp".into(),
        ));
    }
    if best && p.flag("link") {
        return Err(Failure::Usage("--link saves one absorber; drop --best (or --link)".into()));
    }
    let sc = scenario(&p, best)?;
    let (setup, surface, temp_k, warnings) = sc.to_physics().map_err(|e| option_words(&e))?;
    warn(&warnings);
    if p.flag("link") {
        let mut scenario = Scenario::default();
        scenario.hot.absorber = sc;
        scenario.view.panel = Panel::Hot;
        writeln!(out, "{}", crate::codec::encode_fragment(&scenario))?;
        return Ok(());
    }
    let report = if best { AbsorberReport::best(&setup).0 } else { AbsorberReport::at(&setup, &surface, temp_k) };
    if p.flag("json") {
        return print_json(out, &report);
    }
    let what = if best { "best step absorber".to_string() } else { sc.surface.label() };
    writeln!(
        out,
        "Absorber {what} under {} at {} suns, ambient {} K, h_c {} W/(m2 K)",
        setup.source.name(),
        sc.concentration,
        sc.ambient_k,
        sc.hc_w_m2k
    )?;
    for (label, value) in report.rows() {
        writeln!(out, "{label:<32} {value}")?;
    }
    writeln!(
        out,
        "Caution: concentrated sunlight and an absorber at {:.0} K burn skin and harm eyes; follow local codes \
         and licensed practice.",
        report.temp_k
    )?;
    Ok(())
}

/// The absorber from the options, on the command line's defaults; data files read.
fn scenario(p: &Parsed, best: bool) -> Result<AbsorberScenario, String> {
    let mut sc = AbsorberScenario::command_line();
    if !best {
        sc.temp_k = p.required_number("temp", "absorber temperature", "K", "absorber")?;
    }
    if p.text("cutoff-um").is_some() && p.text("emitter").is_some() {
        return Err("give one of --cutoff-um (a step) and --emitter (a profile)".into());
    }
    if let Some(c) = p.number("cutoff-um", "cutoff wavelength", "um")? {
        sc.surface = SurfaceSpec::Step { cutoff_um: c };
    }
    if let Some(e) = p.text("emitter") {
        let mut profile = EmitterSpec::parse(e).map_err(|m| format!("--emitter: {m}"))?;
        resolve_emitter_file(&mut profile, p)?;
        sc.surface = SurfaceSpec::Profile { profile };
    } else {
        resolve_emitter_file(&mut EmitterSpec::Blackbody, p)?;
    }
    if let Some(s) = p.text("spectrum") {
        sc.source = SourceSpec::parse(s).map_err(|m| format!("--spectrum: {m}"))?;
        if let SourceSpec::File { path } = &sc.source {
            sc.source = read_spectrum_file(&path.clone(), p)?;
        }
    }
    if let Some(c) = concentration(p)? {
        sc.concentration = c;
    }
    if let Some(t) = p.number("ambient", "ambient temperature", "K")? {
        sc.ambient_k = t;
    }
    if let Some(h) = p.number("hc", "convection coefficient", "W/(m2 K)")? {
        sc.hc_w_m2k = h;
    }
    Ok(sc)
}

/// The scenario's message with the option that sets the value named in it.
fn option_words(message: &str) -> String {
    let pairs = [
        ("absorber temperature", "--temp"),
        ("ambient temperature", "--ambient"),
        ("convection coefficient", "--hc"),
        ("cutoff wavelength", "--cutoff-um"),
        ("concentration", "--concentration"),
        ("emissivity", "--emitter"),
        ("window", "--emitter"),
        ("control point", "--emitter"),
    ];
    match pairs.iter().find(|(k, _)| message.contains(k)) {
        Some((_, opt)) => format!("{opt}: {message}"),
        None => message.to_string(),
    }
}
