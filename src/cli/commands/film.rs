//! `glowgap film`: the reflectance, transmittance into the substrate and absorptance of a
//! layer stack (the transfer-matrix method) at one wavelength or over a range, at one angle
//! and polarization, optionally with the hemispherical values; or the list of built-in
//! materials with their sources.
//!
//! Architecture invariant: imports only `cli::args` and `cli::shared` of the cli; the stack
//! is checked by `scenario::film`, every figure comes from `physics::film`.

use crate::cli::args::{OptionDoc, Parsed, Spec};
use crate::cli::shared::files::{film_error, resolve_material, resolve_radiator_files};
use crate::cli::shared::options::radiator_options;
use crate::cli::shared::output::print_json;
use crate::cli::shared::output::{print_radiator, warn};
use crate::cli::shared::{Command, Failure, Out};
use crate::physics::film::{coherent, coherent_mean, hemispherical, layer_absorptance, Polarization, Response};
use crate::physics::materials::BUILTINS;
use crate::physics::radiator::evaluate;
use crate::report::radiator::RadiatorReport;
use crate::scenario::film::{film_inputs, LayerSpec, MaterialSpec};
use crate::scenario::radiator::{EmitterSpec, FilmGoal, RadiatorScenario};
use serde::Serialize;

/// What `--layers` takes (shared with `glowgap cool --emitter film`).
pub const LAYERS_DOC: &str = "the layers, the first facing the light, each\n\
    MAT:THICKNESS_NM[:coherent|:incoherent] (default: none, a bare substrate;\n\
    layers over 10 um are incoherent unless marked); MAT is a built-in name, n=REAL,\n\
    nk=N/K or file:PATH (a table with a header such as wavelength_um,n,k; axis in nm,\n\
    um, cm-1 or eV; columns n,k or eps1,eps2)";

pub const COMMAND: Command = Command {
    spec: Spec {
        command: "film",
        valued: &[
            "layers",
            "substrate",
            "incident-medium",
            "wavelength",
            "from",
            "to",
            "step",
            "angle",
            "polarization",
            "optimize",
            "max-thickness",
            "sky",
            "sun",
            "sun-zenith",
            "sun-scale",
            "ambient",
            "hc",
        ],
        flags: &["hemispherical", "per-layer", "json", "csv", "materials"],
        max_positional: 0,
    },
    about: "a layer stack's reflectance, transmittance and absorptance (thin-film optics)",
    usage: "film [--layers LAYER,LAYER,...] [--substrate MAT] [--incident-medium MAT]\n\
            (--wavelength UM | --from UM --to UM --step UM) [--angle DEG]\n\
            [--polarization s|p|mean] [--hemispherical] [--json | --csv]\n\
            or: glowgap film --optimize TARGET [--layers ...] [--substrate MAT] [--max-thickness NM]\n\
            \x20   [--sky SKY] [--sun SPEC] [--sun-zenith DEG] [--ambient K] [--hc W_PER_M2K] [--json]\n\
            or: glowgap film --materials",
    docs: &[
        OptionDoc { name: "layers", arg: "LAYER,...", text: LAYERS_DOC },
        OptionDoc { name: "substrate", arg: "MAT", text: "the semi-infinite substrate, default n=1" },
        OptionDoc { name: "incident-medium", arg: "MAT", text: "where the light comes from, lossless, default n=1" },
        OptionDoc {
            name: "wavelength",
            arg: "UM",
            text: "one vacuum wavelength in um (required unless --from/--to/--step)",
        },
        OptionDoc {
            name: "from",
            arg: "UM",
            text: "the first wavelength in um (with --to and --step; required there)",
        },
        OptionDoc { name: "to", arg: "UM", text: "the last wavelength in um, included (required with --from)" },
        OptionDoc { name: "step", arg: "UM", text: "the wavelength step in um (required with --from)" },
        OptionDoc {
            name: "angle",
            arg: "DEG",
            text: "angle of incidence in the incident medium, 0 to below 90, default 0",
        },
        OptionDoc { name: "polarization", arg: "P", text: "s | p | mean (default: mean, unpolarized light)" },
        OptionDoc {
            name: "hemispherical",
            arg: "",
            text: "also the hemispherical (cos-weighted, unpolarized) reflectance, transmittance and\n\
                   absorptance",
        },
        OptionDoc {
            name: "json",
            arg: "",
            text: "print JSON {\"points\": [{\"wavelength_um\", \"reflectance\", \"transmittance\",\n\
                   \"absorptance\"}...]}, with --hemispherical also \"hemispherical_reflectance\",\n\
                   \"hemispherical_transmittance\", \"hemispherical_absorptance\"",
        },
        OptionDoc { name: "csv", arg: "", text: "print CSV with a header line" },
        OptionDoc {
            name: "per-layer",
            arg: "",
            text: "also each layer's absorptance (unpolarized, coherent stacks):\n\
                   JSON \"layer_absorptance\", CSV and text columns A1, A2, ...",
        },
        OptionDoc {
            name: "optimize",
            arg: "TARGET",
            text: "search the thicknesses of the coherent layers of the film emitter (in air, as in\n\
                   glowgap cool --emitter film) for: net-power (the largest net cooling power at\n\
                   ambient) | steady (the lowest steady temperature) | spectrum:EMIT (the normal\n\
                   emissivity closest to a profile, e.g. spectrum:window:8-13); default: no search",
        },
        OptionDoc {
            name: "max-thickness",
            arg: "NM",
            text: "the thickest a searched layer may become, in nm, default 2000",
        },
        OptionDoc { name: "sky", arg: "SKY", text: "with --optimize: the sky, as in glowgap cool (default box)" },
        OptionDoc {
            name: "sun",
            arg: "SPEC|none",
            text: "with --optimize: the sun, as in glowgap cool (default none)",
        },
        OptionDoc { name: "sun-zenith", arg: "DEG", text: "with --optimize: the sun's zenith angle, default 0" },
        OptionDoc { name: "sun-scale", arg: "X", text: "with --optimize: factor on the sun's irradiance, default 1" },
        OptionDoc { name: "ambient", arg: "K", text: "with --optimize: ambient air temperature in K, default 300" },
        OptionDoc {
            name: "hc",
            arg: "W_PER_M2K",
            text: "with --optimize: convection coefficient from the air in W/m²K, default 0",
        },
        OptionDoc { name: "materials", arg: "", text: "list the built-in materials with their sources and ranges" },
    ],
    run,
};

/// The most wavelengths of one run.
const MAX_POINTS: f64 = 1e6;

#[derive(Serialize)]
struct Point {
    wavelength_um: f64,
    reflectance: f64,
    transmittance: f64,
    absorptance: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    hemispherical_reflectance: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    hemispherical_transmittance: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    hemispherical_absorptance: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    layer_absorptance: Option<Vec<f64>>,
}

#[derive(Serialize)]
struct Points {
    points: Vec<Point>,
}

fn run(args: &[String], out: Out) -> Result<(), Failure> {
    let p = COMMAND.spec.parse(args)?;
    if p.flag("materials") {
        for b in BUILTINS {
            let m = (b.build)();
            let um = |x: f64| format!("{}", (x * 1e10).round() / 1e4);
            writeln!(out, "{:<10} {} ({} to {} um); {}", b.name, b.what, um(m.range_m.0), um(m.range_m.1), m.source)?;
        }
        writeln!(out, "{:<10} any constant index, e.g. n=1.5 or nk=2.1/0.05", "n=, nk=")?;
        return Ok(());
    }
    if p.flag("json") && p.flag("csv") {
        return Err(Failure::Usage("'glowgap film': choose one of --json and --csv".into()));
    }
    if let Some(goal) = p.text("optimize") {
        return optimize(&p, goal, out);
    }
    for o in ["max-thickness", "sky", "sun", "sun-zenith", "sun-scale", "ambient", "hc"] {
        if p.text(o).is_some() {
            return Err(Failure::Usage(format!("--{o} applies only to a thickness search; add --optimize TARGET")));
        }
    }
    let material = |opt: &str, default: &str| -> Result<MaterialSpec, String> {
        let text = p.text(opt).unwrap_or(default);
        resolve_material(MaterialSpec::parse(text).map_err(|e| format!("--{opt}: {e}"))?)
            .map_err(|e| format!("--{opt}: {e}"))
    };
    let incident = material("incident-medium", "n=1")?;
    let substrate = material("substrate", "n=1")?;
    let mut layers = Vec::new();
    if let Some(list) = p.text("layers") {
        for (i, l) in list.split(',').filter(|l| !l.trim().is_empty()).enumerate() {
            let mut spec = LayerSpec::parse(l).map_err(|e| format!("--layers: {e}"))?;
            spec.material = resolve_material(spec.material).map_err(|e| format!("--layers, layer {}: {e}", i + 1))?;
            layers.push(spec);
        }
    }
    let inputs = film_inputs(&incident, &layers, &substrate).map_err(film_error)?;
    let angle = p.number("angle", "angle of incidence", "degrees")?.unwrap_or(0.0);
    if !(0.0..90.0).contains(&angle) {
        return Err(Failure::Usage(format!(
            "--angle {angle} is out of range; give 0 to below 90 degrees, e.g. --angle 30"
        )));
    }
    let pol = match p.text("polarization").map(|s| s.trim().to_ascii_lowercase()) {
        None => None,
        Some(s) if s == "mean" => None,
        Some(s) if s == "s" => Some(Polarization::S),
        Some(s) if s == "p" => Some(Polarization::P),
        Some(s) => return Err(Failure::Usage(format!("--polarization '{s}' is not known; use s, p or mean"))),
    };
    let wavelengths = wavelengths(&p)?;
    let hemi = p.flag("hemispherical");
    let per_layer = p.flag("per-layer");
    if per_layer && pol.is_some() {
        return Err(Failure::Usage(
            "--per-layer gives unpolarized values; remove --polarization or set it to mean".into(),
        ));
    }
    if per_layer && inputs.layers.iter().any(|l| l.2) {
        return Err(Failure::Usage(
            "--per-layer needs a coherent stack; mark thick layers :coherent or leave out --per-layer".into(),
        ));
    }
    let mut points = Vec::with_capacity(wavelengths.len());
    for &l_um in &wavelengths {
        let (n0, st, sub) =
            inputs.at(l_um * 1e-6).map_err(|e| format!("at {l_um} um: {e}; choose wavelengths inside it"))?;
        let th = angle.to_radians();
        let r: Response = match pol {
            Some(pol) => coherent(n0, &st, sub, l_um * 1e-6, th, pol),
            None => coherent_mean(n0, &st, sub, l_um * 1e-6, th),
        };
        let h = hemi.then(|| hemispherical(n0, &st, sub, l_um * 1e-6));
        points.push(Point {
            wavelength_um: l_um,
            reflectance: r.reflectance,
            transmittance: r.transmittance,
            absorptance: r.absorptance,
            hemispherical_reflectance: h.map(|h| h.reflectance),
            hemispherical_transmittance: h.map(|h| h.transmittance),
            hemispherical_absorptance: h.map(|h| h.absorptance),
            layer_absorptance: per_layer.then(|| layer_absorptance(n0, &st, sub, l_um * 1e-6, th)),
        });
    }
    if p.flag("json") {
        return print_json(out, &Points { points });
    }
    let csv = p.flag("csv");
    if csv {
        let extra =
            if hemi { ",hemispherical_reflectance,hemispherical_transmittance,hemispherical_absorptance" } else { "" };
        let layers: String = (1..=inputs.layers.len()).filter(|_| per_layer).map(|i| format!(",A{i}")).collect();
        writeln!(out, "wavelength_um,reflectance,transmittance,absorptance{extra}{layers}")?;
    } else {
        let extra = if hemi { "   hemi R     hemi T     hemi A" } else { "" };
        let layers: String =
            (1..=inputs.layers.len()).filter(|_| per_layer).map(|i| format!(" {:>10}", format!("A{i}"))).collect();
        writeln!(out, "{:>14} {:>10} {:>10} {:>10}{extra}{layers}", "wavelength um", "R", "T", "A")?;
    }
    for pt in &points {
        if csv {
            let mut line = format!("{},{},{},{}", pt.wavelength_um, pt.reflectance, pt.transmittance, pt.absorptance);
            if let (Some(a), Some(b), Some(c)) =
                (pt.hemispherical_reflectance, pt.hemispherical_transmittance, pt.hemispherical_absorptance)
            {
                line += &format!(",{a},{b},{c}");
            }
            for a in pt.layer_absorptance.iter().flatten() {
                line += &format!(",{a}");
            }
            writeln!(out, "{line}")?;
        } else {
            let mut line = format!(
                "{:>14.6} {:>10.6} {:>10.6} {:>10.6}",
                pt.wavelength_um, pt.reflectance, pt.transmittance, pt.absorptance
            );
            if let (Some(a), Some(b), Some(c)) =
                (pt.hemispherical_reflectance, pt.hemispherical_transmittance, pt.hemispherical_absorptance)
            {
                line += &format!(" {a:>10.6} {b:>10.6} {c:>10.6}");
            }
            for a in pt.layer_absorptance.iter().flatten() {
                line += &format!(" {a:>10.6}");
            }
            writeln!(out, "{line}")?;
        }
    }
    Ok(())
}

/// `--wavelength UM` or `--from --to --step` (both ends included).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn wavelengths(p: &Parsed) -> Result<Vec<f64>, String> {
    let one = p.number("wavelength", "wavelength", "um")?;
    let grid = [
        p.number("from", "first wavelength", "um")?,
        p.number("to", "last wavelength", "um")?,
        p.number("step", "wavelength step", "um")?,
    ];
    match (one, grid) {
        (Some(l), [None, None, None]) => {
            if !(l > 0.0 && l.is_finite()) {
                return Err(format!("--wavelength {l} must be a positive number of um, e.g. --wavelength 0.55"));
            }
            Ok(vec![l])
        }
        (None, [Some(a), Some(b), Some(s)]) => {
            if !(a > 0.0 && b >= a && b.is_finite()) {
                return Err(format!("--from {a} --to {b}: give two positive wavelengths in um, the shorter first"));
            }
            if !(s > 0.0) {
                return Err(format!("--step {s} must be positive, e.g. --step 0.01 (um)"));
            }
            let steps = ((b - a) / s).floor();
            if steps + 1.0 > MAX_POINTS {
                return Err(format!(
                    "--from/--to/--step make {} wavelengths, more than {MAX_POINTS}; give a larger --step",
                    steps + 1.0
                ));
            }
            let n = steps as usize;
            let mut v: Vec<f64> = (0..=n).map(|i| a + s * i as f64).collect();
            if b - v[n] > 1e-9 * s {
                v.push(b);
            } else {
                v[n] = b;
            }
            Ok(v)
        }
        (Some(_), _) => Err("give either --wavelength or --from/--to/--step, not both".into()),
        _ => Err("give a wavelength: --wavelength UM, or --from UM --to UM --step UM, e.g. --wavelength 0.55".into()),
    }
}

#[derive(Serialize)]
struct FoundLayer {
    material: String,
    thickness_nm: f64,
}

#[derive(Serialize)]
struct Search {
    target: String,
    layers: Vec<FoundLayer>,
    layers_text: String,
    /// the target's value on the search grid: W/m2, K, or the rms emissivity misfit
    search_value: f64,
    search_unit: &'static str,
    start_value: f64,
    evaluations: u64,
    seconds: f64,
    wavelengths: usize,
    radiator: RadiatorReport,
}

/// `glowgap film --optimize TARGET ...`: the thickness search, then the full balance of the
/// stack it found.
fn optimize(p: &Parsed, goal_text: &str, out: Out) -> Result<(), Failure> {
    for o in ["wavelength", "from", "to", "step", "angle", "polarization", "incident-medium"] {
        if p.text(o).is_some() {
            return Err(Failure::Usage(format!(
                "--{o} does not apply to a thickness search, which uses the radiator's whole spectrum in air; remove it"
            )));
        }
    }
    if p.flag("hemispherical") || p.flag("csv") {
        return Err(Failure::Usage("--hemispherical and --csv do not apply to --optimize; use --json".into()));
    }
    let goal = FilmGoal::parse(goal_text).map_err(|e| format!("--optimize: {e}"))?;
    let max_nm = p.number("max-thickness", "largest layer thickness", "nm")?.unwrap_or(2000.0);
    let mut sc = RadiatorScenario { emitter: EmitterSpec::parse("film")?, ..Default::default() };
    radiator_options(p, &mut sc)?;
    resolve_radiator_files(&mut sc, p)?;
    if let EmitterSpec::Film { layers, substrate } = &sc.emitter {
        if layers.is_empty() {
            return Err(Failure::Usage(
                "--optimize needs layers to search; give them with --layers, e.g. --layers hfo2:100,silica-ir:500"
                    .into(),
            ));
        }
        film_inputs(&MaterialSpec::Index { n: 1.0, k: 0.0 }, layers, substrate).map_err(film_error)?;
    }
    let (design, start) = sc.film_design(&goal, max_nm).map_err(|e| format!("--optimize: {e}"))?;
    let clock = std::time::Instant::now();
    let start_value = design.value(&start);
    let found = design.run(&start, max_nm * 1e-9, None);
    let seconds = clock.elapsed().as_secs_f64();
    let best = sc.with_film_thicknesses(&found.thickness_m);
    let setup = best.to_physics()?;
    warn(&setup.warnings);
    let report = RadiatorReport::from(&evaluate(&setup.emitter, &setup.surroundings, setup.surface_k));
    let EmitterSpec::Film { layers, .. } = &best.emitter else { return Err(Failure::Output) };
    let (target, unit) = match goal {
        FilmGoal::NetPower => ("net-power".to_string(), "W/m2"),
        FilmGoal::Steady => ("steady".to_string(), "K"),
        FilmGoal::Spectrum { profile } => (format!("spectrum:{}", profile.label()), "rms emissivity difference"),
    };
    let search = Search {
        target,
        layers: layers
            .iter()
            .map(|l| FoundLayer { material: l.material.text(), thickness_nm: l.thickness_nm })
            .collect(),
        layers_text: layers.iter().map(|l| l.text()).collect::<Vec<_>>().join(","),
        search_value: found.value,
        search_unit: unit,
        start_value,
        evaluations: found.evaluations,
        seconds,
        wavelengths: design.wavelengths(),
        radiator: report,
    };
    if p.flag("json") {
        return print_json(out, &search);
    }
    writeln!(out, "{:<32} {}", "Target", search.target)?;
    writeln!(out, "{:<32} {}", "Layers found", search.layers_text)?;
    writeln!(
        out,
        "{:<32} {:.4} {unit} (from {:.4} at the start; search grid of {} wavelengths)",
        "Search value", search.search_value, search.start_value, search.wavelengths
    )?;
    writeln!(out, "{:<32} {} in {:.2} s", "Evaluations", search.evaluations, search.seconds)?;
    writeln!(out, "full balance of the layers found:")?;
    print_radiator(&best, false, None, out)
}
