//! Data files read from disk into the tables a scenario carries: spectra, optical tables
//! (emissivity, sky transmittance) and quantum efficiencies; scenarios opened from a link,
//! a file or standard input ([`open_scenario`]); and the command line's wording of what would
//! fix a file a reader refused ([`cli_fix`]).
//!
//! Architecture invariant: the readers (`formats`) say what is wrong and which setting would
//! fix it; this module alone turns that setting into the option of this command line.

use crate::cli::args::Parsed;
use crate::codec;
use crate::formats::emissivity_csv::{parse_emissivity_csv, parse_transmittance_csv, OpticalHints, OpticalTable};
use crate::formats::eqe_csv::parse_eqe_csv;
use crate::formats::nk_csv::parse_nk_csv;
use crate::formats::spectrum_csv::{parse_spectrum_csv, ColumnHints};
use crate::formats::units::{AxisUnit, ValueKind, ValueUnit};
use crate::formats::{Hint, TableError, TableKind};
use crate::physics::absorber::AbsorptanceTable;
use crate::scenario::film::{FilmError, FilmPart, LayerSpec, MaterialSpec};
use crate::scenario::hot::ReflectanceSpec;
use crate::scenario::radiator::{EmissivityTable, EmitterSpec, RadiatorScenario, SkySpec, TransmittanceTable};
use crate::scenario::{Scenario, SourceSpec, TableSpec};

/// A kind of data file and the prefix of the options that describe it (`--{prefix}-axis`,
/// `--{prefix}-values`, `--{prefix}-column`); `None` when only the header can.
#[derive(Clone, Copy)]
pub struct FileOptions {
    pub prefix: Option<&'static str>,
    pub kind: TableKind,
}

/// `--spectrum file:PATH` (and `--sun file:PATH`).
pub const SPECTRUM_FILE: FileOptions = FileOptions { prefix: Some("spectrum"), kind: TableKind::Spectrum };
/// A spectrum file no option describes (`mismatch --reference file:PATH`).
pub const HEADER_ONLY_SPECTRUM: FileOptions = FileOptions { prefix: None, kind: TableKind::Spectrum };
/// `--emitter file:PATH`, `--solar file:PATH`.
pub const EMITTER_FILE: FileOptions = FileOptions { prefix: Some("emitter"), kind: TableKind::Emissivity };
/// `--sky file:PATH`.
pub const SKY_FILE: FileOptions = FileOptions { prefix: Some("sky"), kind: TableKind::Transmittance };
/// `--eqe`, `--test-eqe`, `--ref-eqe`: units only from the header.
pub const EQE_FILE: FileOptions = FileOptions { prefix: None, kind: TableKind::QuantumEfficiency };

/// An axis unit as this command line's options write it.
fn axis_option_label(u: AxisUnit) -> &'static str {
    match u {
        AxisUnit::PerCentimetre => "cm-1",
        other => other.label(),
    }
}

/// What would fix a file, worded as this command line's options for `file`.
pub fn cli_fix(hint: Hint, file: FileOptions) -> String {
    let example = file.kind.example_header();
    let Some(p) = file.prefix else {
        return match hint {
            Hint::ValueColumn => "the values must be in column 1, right after the axis".into(),
            Hint::OtherTable(other) => other_table(other),
            _ => format!("write a header line such as '{example}'"),
        };
    };
    match hint {
        Hint::AxisUnit { accepted } => {
            let units: Vec<&str> = accepted.iter().map(|u| axis_option_label(*u)).collect();
            format!("put the unit in the header, e.g. '{example}', or give --{p}-axis {}", units.join("|"))
        }
        Hint::ValueUnit => format!(
            "put the unit in the header, e.g. '{example}', or give --{p}-values UNIT, e.g. W/m2/nm or photons/m2/s/eV"
        ),
        Hint::Units => format!("write the units in the header, e.g. '{example}', or give --{p}-axis and --{p}-values"),
        Hint::ValueColumn => format!("choose the value column with --{p}-column N (1 = the first after the axis)"),
        Hint::ValueKind { accepted } => {
            let kinds: Vec<&str> = accepted.iter().map(|q| q.label()).collect();
            format!(
                "name it in the header, e.g. '{example}', with '%' for percent, or give --{p}-values {} \
                 (with % for percent)",
                kinds.join("|")
            )
        }
        Hint::OtherTable(other) => other_table(other),
    }
}

fn other_table(kind: TableKind) -> String {
    match kind {
        TableKind::Transmittance => "a sky transmittance goes to --sky file:PATH".into(),
        TableKind::Emissivity => "an emitter's data goes to --emitter file:PATH".into(),
        TableKind::Spectrum => "a spectrum goes to --spectrum file:PATH".into(),
        TableKind::QuantumEfficiency => "a quantum efficiency goes to --eqe file:PATH".into(),
    }
}

/// Open what a command is given as a scenario: a share link (a whole URL or its fragment), the
/// path of a scenario file, or `-` for standard input. The text is decoded
/// ([`codec::decode`]), the radiator's `file:PATH` references are read from disk (paths as
/// written, from the working folder), and the whole scenario is checked
/// ([`Scenario::check_with_warnings`]); without file references this is [`codec::open`].
/// Returns the scenario, usable by every part, and the warnings worth showing.
pub fn open_scenario(what: &str) -> Result<(Scenario, Vec<String>), String> {
    let looks_like_link = |t: &str| {
        let t = t.trim();
        let versioned = t
            .strip_prefix('g')
            .and_then(|r| r.split_once('.'))
            .is_some_and(|(v, _)| !v.is_empty() && v.bytes().all(|b| b.is_ascii_digit()));
        t.contains('#') || versioned || t.starts_with("http://") || t.starts_with("https://")
    };
    let text = if what == "-" {
        read_limited(std::io::stdin().lock(), 0, MAX_SCENARIO_BYTES, SCENARIO_FIX)
            .map_err(|e| format!("standard input: {e}"))?
    } else if looks_like_link(what) && !std::path::Path::new(what).exists() {
        what.to_string()
    } else {
        read_text_within(what, "scenario file", MAX_SCENARIO_BYTES, SCENARIO_FIX)
            .map_err(|e| if e.contains(SCENARIO_FIX) { e } else { format!("{e}; {SCENARIO_FIX}") })?
            .0
    };
    let mut scenario = codec::decode(&text).map_err(|e| e.to_string())?;
    resolve_radiator_files(&mut scenario.radiator, &Parsed::default())
        .map_err(|e| format!("the scenario's radiator cannot be read: {e}"))?;
    let warnings = scenario.check_with_warnings().map_err(|e| format!("the scenario cannot be computed: {e}"))?;
    Ok((scenario, warnings))
}

/// `what 'path': line N: message; fix`.
pub fn file_error(what: &str, path: &str, e: &TableError, file: FileOptions) -> String {
    match e.hint {
        Some(h) => format!("{what} '{path}': {e}; {}", cli_fix(h, file)),
        None => format!("{what} '{path}': {e}"),
    }
}

pub fn io_reason(e: &std::io::Error) -> String {
    match e.kind() {
        std::io::ErrorKind::NotFound => "no such file; check the path".into(),
        std::io::ErrorKind::PermissionDenied => "permission denied".into(),
        _ => e.to_string(),
    }
}

/// The largest data file read (bytes): a table of a few million lines, read whole; the limit
/// keeps the memory of a mistaken path (a video, a disk image) bounded.
pub const MAX_DATA_FILE_BYTES: u64 = 256 * 1024 * 1024;

/// The largest scenario file or standard input read (bytes): a share link or a scenario
/// file is never longer than the codec accepts.
const MAX_SCENARIO_BYTES: u64 = {
    let (link, doc) = (codec::MAX_LINK_CHARS as u64, codec::MAX_DOCUMENT_BYTES as u64);
    if link > doc {
        link
    } else {
        doc
    }
};

/// What to give instead of a scenario file that is too large or not text.
const SCENARIO_FIX: &str = "give a share link, a scenario file saved by Glowgap, or - to read one from standard input";

/// The text of a data file holding a `kind` table and its name (the file name without
/// folders); at most [`MAX_DATA_FILE_BYTES`].
fn read_text(path: &str, what: &str, kind: TableKind) -> Result<(String, String), String> {
    let fix = format!("give a text table, one point per line, thinned if need be ({})", other_table(kind));
    read_text_within(path, what, MAX_DATA_FILE_BYTES, &fix)
}

/// The text of a measured series of spectra (`glowgap yield --spectra`), at most
/// [`MAX_DATA_FILE_BYTES`].
pub fn read_series_file(path: &str) -> Result<String, String> {
    let fix = "give a CSV of timestamped spectra (header time,WL_NM,WL_NM,...), thinned if need be";
    read_text_within(path, "--spectra", MAX_DATA_FILE_BYTES, fix).map(|(text, _)| text)
}

/// [`read_text`] with a size limit of `max` bytes; `fix` says what to give instead of a file
/// that is too large or not text.
fn read_text_within(path: &str, what: &str, max: u64, fix: &str) -> Result<(String, String), String> {
    let file = std::fs::File::open(path).map_err(|e| format!("cannot read {what} '{path}': {}", io_reason(&e)))?;
    let size = file.metadata().map(|m| m.len()).unwrap_or(0);
    let text = read_limited(file, size, max, fix).map_err(|e| format!("{what} '{path}': {e}"))?;
    let name =
        std::path::Path::new(path).file_name().map_or_else(|| path.to_string(), |n| n.to_string_lossy().into_owned());
    Ok((text, name))
}

/// At most `max` bytes of text from `source` (`size` bytes expected, 0 if not known): refused
/// before reading when `size` is too large, and refused when it does not look like text (a
/// zero byte, or more than one byte in a hundred that is not UTF-8, as in binary data). The
/// few bytes of another encoding a text may hold (a Latin-1 'µ') become U+FFFD. `fix` says
/// what to give instead.
fn read_limited(source: impl std::io::Read, size: u64, max: u64, fix: &str) -> Result<String, String> {
    let mb = |n: u64| n as f64 / 1e6;
    if size > max {
        return Err(format!("it is {:.1} MB, more than the {:.0} MB accepted; {fix}", mb(size), mb(max)));
    }
    let mut bytes = Vec::with_capacity(usize::try_from(size).unwrap_or(0).saturating_add(1));
    std::io::Read::read_to_end(&mut std::io::Read::take(source, max + 1), &mut bytes)
        .map_err(|e| format!("cannot be read: {}", io_reason(&e)))?;
    if bytes.len() as u64 > max {
        return Err(format!("it holds more than the {:.0} MB accepted; {fix}", mb(max)));
    }
    let not_text = |why: String| format!("it is not text ({why}, as in binary data); {fix}");
    if let Some(at) = bytes.iter().position(|&b| b == 0) {
        return Err(not_text(format!("byte {} is zero", at + 1)));
    }
    match String::from_utf8(bytes) {
        Ok(text) => Ok(text),
        Err(e) => {
            let bytes = e.into_bytes();
            let invalid: usize = bytes.utf8_chunks().map(|c| c.invalid().len()).sum();
            if invalid > 16 && invalid > bytes.len() / 100 {
                return Err(not_text(format!("{invalid} of its {} bytes are not UTF-8", bytes.len())));
            }
            Ok(String::from_utf8_lossy(&bytes).into_owned())
        }
    }
}

/// A column option (`--{prefix}-column N`), 1 or more.
fn column_option(p: &Parsed, name: &str) -> Result<Option<usize>, String> {
    p.text(name)
        .map(|c| {
            c.trim().parse::<usize>().ok().filter(|n| *n >= 1).ok_or_else(|| {
                format!("--{name} '{c}' is not a column number; give 1 for the first value column after the axis")
            })
        })
        .transpose()
}

/// Read and parse a spectrum file into a table carried by the scenario; `p` holds the
/// `--spectrum-axis/-values/-column` options.
pub fn read_spectrum_file(path: &str, p: &Parsed) -> Result<SourceSpec, String> {
    read_spectrum_as(path, p, SPECTRUM_FILE)
}

/// [`read_spectrum_file`], for a file that `file`'s options describe.
pub fn read_spectrum_as(path: &str, p: &Parsed, file: FileOptions) -> Result<SourceSpec, String> {
    let mut hints = ColumnHints::default();
    if let Some(a) = p.text("spectrum-axis") {
        hints.axis = Some(
            AxisUnit::parse(a).ok_or_else(|| format!("--spectrum-axis '{a}' is not known; use nm, um, eV or cm-1"))?,
        );
    }
    if let Some(v) = p.text("spectrum-values") {
        hints.value = Some(ValueUnit::parse(v).ok_or_else(|| {
            format!("--spectrum-values '{v}' is not known; use e.g. W/m2/nm, W/m2/um, W/m2/eV, W/m2/cm-1 or photons/m2/s/nm")
        })?);
    }
    hints.column = column_option(p, "spectrum-column")?;
    let (text, name) = read_text(path, "spectrum file", TableKind::Spectrum)?;
    let s = parse_spectrum_csv(&text, &hints, &name).map_err(|e| file_error("spectrum file", path, &e, file))?;
    Ok(SourceSpec::Table(TableSpec {
        name,
        axis: s.axis().into(),
        quantity: s.quantity().into(),
        x: s.coordinates().to_vec(),
        y: s.values().to_vec(),
    }))
}

/// An optical table of `file` (emitter or sky), with its `--{prefix}-*` options from `p`.
fn read_optical_file(path: &str, file: FileOptions, p: &Parsed) -> Result<OpticalTable, String> {
    let prefix = file.prefix.unwrap_or_default();
    let sky = file.kind == TableKind::Transmittance;
    let what = if sky { "sky transmittance file" } else { "emissivity file" };
    let mut hints = OpticalHints::default();
    if let Some(a) = p.text(&format!("{prefix}-axis")) {
        hints.axis =
            Some(AxisUnit::parse(a).ok_or_else(|| format!("--{prefix}-axis '{a}' is not known; use nm, um or cm-1"))?);
    }
    if let Some(v) = p.text(&format!("{prefix}-values")) {
        let kinds = if sky {
            "transmittance or transmittance%"
        } else {
            "emissivity, absorptance or reflectance, with % for percent"
        };
        hints.value =
            Some(ValueKind::parse(v).ok_or_else(|| format!("--{prefix}-values '{v}' is not known; use {kinds}"))?);
    }
    hints.column = column_option(p, &format!("{prefix}-column"))?;
    let (text, name) = read_text(path, what, file.kind)?;
    let parsed =
        if sky { parse_transmittance_csv(&text, &hints, &name) } else { parse_emissivity_csv(&text, &hints, &name) };
    parsed.map_err(|e| file_error(what, path, &e, file))
}

/// Read every `file:` part of a radiator scenario into a table it carries; `p` holds the
/// file options (`--emitter-*`, `--sky-*`, `--spectrum-*` for the sun).
pub fn resolve_radiator_files(sc: &mut RadiatorScenario, p: &Parsed) -> Result<(), String> {
    let emitter_hints = ["emitter-axis", "emitter-values", "emitter-column"].iter().any(|o| p.text(o).is_some());
    let sky_hints = ["sky-axis", "sky-values", "sky-column"].iter().any(|o| p.text(o).is_some());
    let emitter_file = matches!(sc.emitter, EmitterSpec::File { .. })
        || matches!(sc.solar_band.as_ref().map(|s| &s.profile), Some(EmitterSpec::File { .. }));
    if emitter_hints && !emitter_file {
        return Err("--emitter-axis, --emitter-values and --emitter-column apply only to --emitter file:PATH or --solar file:PATH".into());
    }
    if sky_hints && !matches!(sc.sky, SkySpec::File { .. }) {
        return Err("--sky-axis, --sky-values and --sky-column apply only to --sky file:PATH".into());
    }
    let sun_hints = ["spectrum-axis", "spectrum-values", "spectrum-column"].iter().any(|o| p.text(o).is_some());
    if sun_hints && !matches!(sc.sun, Some(SourceSpec::File { .. })) {
        return Err("--spectrum-axis, --spectrum-values and --spectrum-column apply only to --sun file:PATH".into());
    }
    if let EmitterSpec::File { path } = &sc.emitter {
        sc.emitter = emissivity_table(read_optical_file(path, EMITTER_FILE, p)?);
    }
    if let Some(s) = &mut sc.solar_band {
        if let EmitterSpec::File { path } = &s.profile {
            s.profile = emissivity_table(read_optical_file(path, EMITTER_FILE, p)?);
        }
    }
    if let SkySpec::File { path } = &sc.sky {
        let t = read_optical_file(path, SKY_FILE, p)?;
        sc.sky =
            SkySpec::Table(TransmittanceTable { name: t.name, wavelength_m: t.wavelength_m, transmittance: t.values });
    }
    if let Some(SourceSpec::File { path }) = &sc.sun {
        sc.sun = Some(read_spectrum_file(path, p)?);
    }
    if let EmitterSpec::Film { layers, substrate } = &mut sc.emitter {
        resolve_film_files(layers, substrate)?;
    }
    Ok(())
}

/// Read a material's `file:PATH` (an n,k or eps1,eps2 table, `formats::nk_csv`) into a
/// table the scenario carries; other materials pass through.
pub fn resolve_material(spec: MaterialSpec) -> Result<MaterialSpec, String> {
    let MaterialSpec::File { path } = &spec else { return Ok(spec) };
    let fix = "give a text table of optical constants, one point per line, e.g. wavelength_um,n,k";
    let (text, name) = read_text_within(path, "the n,k file", MAX_DATA_FILE_BYTES, fix)?;
    let d = parse_nk_csv(&text).map_err(|e| format!("the n,k file '{path}', {e}"))?;
    Ok(MaterialSpec::Table { name, wavelength_m: d.wavelength_m, n: d.n, k: d.k })
}

/// A stack's problem in the words of the command line: the option that holds the part.
pub fn film_error(e: FilmError) -> String {
    match e.part {
        FilmPart::Incident => format!("--incident-medium: {}", e.message),
        FilmPart::Layer(i) => format!("--layers, layer {}: {}", i + 1, e.message),
        FilmPart::Substrate => format!("--substrate: {}", e.message),
    }
}

/// Read every `file:` material of a film's layers (named `--layers`) and substrate (named
/// `--substrate`).
pub fn resolve_film_files(layers: &mut [LayerSpec], substrate: &mut MaterialSpec) -> Result<(), String> {
    for (i, l) in layers.iter_mut().enumerate() {
        let m = std::mem::replace(&mut l.material, MaterialSpec::Index { n: 1.0, k: 0.0 });
        l.material = resolve_material(m).map_err(|e| format!("--layers, layer {}: {e}", i + 1))?;
    }
    let m = std::mem::replace(substrate, MaterialSpec::Index { n: 1.0, k: 0.0 });
    *substrate = resolve_material(m).map_err(|e| format!("--substrate: {e}"))?;
    Ok(())
}

/// Read an emitter profile's `file:PATH` (with `--emitter-*` options) into a table, for the
/// commands other than `cool` that take an emitter (`tpv`, `absorber`).
pub fn resolve_emitter_file(spec: &mut EmitterSpec, p: &Parsed) -> Result<(), String> {
    let hints = ["emitter-axis", "emitter-values", "emitter-column"].iter().any(|o| p.text(o).is_some());
    if hints && !matches!(spec, EmitterSpec::File { .. }) {
        return Err("--emitter-axis, --emitter-values and --emitter-column apply only to --emitter file:PATH".into());
    }
    if let EmitterSpec::File { path } = spec {
        *spec = emissivity_table(read_optical_file(path, EMITTER_FILE, p)?);
    }
    Ok(())
}

/// Read `--subgap-reflectance file:PATH`: an optical table against wavelength whose header
/// names its quantity (reflectance, or absorptance/emissivity taken as 1 - R; fractions or
/// percent), stored as the reflectance.
pub fn resolve_reflectance_file(spec: &mut ReflectanceSpec) -> Result<(), String> {
    if let ReflectanceSpec::File { path } = spec {
        let hints = OpticalHints::default();
        let (text, name) = read_text(path, "reflectance file", TableKind::Emissivity)?;
        let t = parse_emissivity_csv(&text, &hints, &name)
            .map_err(|e| file_error("reflectance file", path, &e, REFLECTANCE_FILE))?;
        *spec = ReflectanceSpec::Table {
            name: t.name,
            wavelength_m: t.wavelength_m,
            reflectance: t.values.iter().map(|a| 1.0 - a).collect(),
        };
    }
    Ok(())
}

/// `--subgap-reflectance file:PATH`: units only from the header.
pub const REFLECTANCE_FILE: FileOptions = FileOptions { prefix: None, kind: TableKind::Emissivity };

fn emissivity_table(t: OpticalTable) -> EmitterSpec {
    EmitterSpec::Table(EmissivityTable { name: t.name, wavelength_m: t.wavelength_m, emissivity: t.values })
}

/// An EQE file given to `option` as `file:PATH` (or a bare path).
pub fn read_eqe_file(spec: &str, option: &str) -> Result<AbsorptanceTable, String> {
    let path = match (spec.get(..5), spec.get(5..)) {
        (Some(prefix), Some(rest)) if prefix.eq_ignore_ascii_case("file:") => rest,
        _ => spec,
    };
    if path.trim().is_empty() {
        return Err(format!("{option} needs a file, e.g. {option} file:eqe.csv"));
    }
    let what = "quantum-efficiency file";
    let (text, name) = read_text(path, what, TableKind::QuantumEfficiency)?;
    parse_eqe_csv(&text, &name).map_err(|e| file_error(what, path, &e, EQE_FILE))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn headerless_spectrum_names_the_axis_option() {
        let e = parse_spectrum_csv("400,1\n500,1\n", &ColumnHints::default(), "x").unwrap_err();
        let text = file_error("spectrum file", "x.csv", &e, SPECTRUM_FILE);
        assert!(text.contains("--spectrum-axis nm|um|eV|cm-1"), "{text}");
        let text = file_error("spectrum file", "x.csv", &e, HEADER_ONLY_SPECTRUM);
        assert!(!text.contains("--") && text.contains("header line"), "{text}");
    }

    #[test]
    fn each_file_option_is_named_by_its_prefix() {
        let column = cli_fix(Hint::ValueColumn, SKY_FILE);
        assert!(column.contains("--sky-column"), "{column}");
        let kind =
            cli_fix(Hint::ValueKind { accepted: &[crate::formats::units::OpticalQuantity::Reflectance] }, EMITTER_FILE);
        assert!(kind.contains("--emitter-values reflectance"), "{kind}");
        assert!(cli_fix(Hint::Units, EMITTER_FILE).contains("--emitter-axis and --emitter-values"));
    }
}
