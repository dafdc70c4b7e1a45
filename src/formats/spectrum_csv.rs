//! A spectrum from a delimited text table.
//!
//! # Layout
//!
//! - One point per line: the spectral coordinate in the first field (column 0), values in
//!   the following fields (columns 1, 2, ...).
//! - Fields are separated by commas, semicolons, tabs or runs of spaces; the separator is
//!   chosen once per file from its first data line.
//! - Blank lines are skipped. A line whose first visible character starts `#`, `%` or `//`
//!   is a comment; on a data line, anything from `#` (or `%`, `//`) on is a comment.
//! - The first non-comment line is a header if its first field is not a number. Its names
//!   may carry units, e.g. `wavelength_nm,irradiance_W_m2_nm`,
//!   `Wavelength (nm), Irradiance (W m-2 nm-1)` or `lambda [um]; E [W/m^2/um]`.
//! - Explicit [`ColumnHints`] override whatever the header says.
//!
//! # Conversion
//!
//! The axis keeps its kind (a wavelength file gives a wavelength spectrum) and both axis and
//! values are only rescaled into SI: the value unit must be a density per a unit of the same
//! kind as the axis (per nm or per um on a wavelength axis, per eV on an energy axis, per
//! cm^-1 on a wavenumber axis). Scaling the axis by `a` and the density by `1/a` leaves every
//! trapezoid area, hence every band integral, unchanged. Points are stored in ascending SI
//! order whatever the order of the file.

use std::fmt;

use crate::physics::constants::CHARGE;
use crate::physics::spectrum::{Axis, Quantity, Spectrum, SpectrumError};

/// The most data lines a file may hold.
pub const MAX_DATA_ROWS: usize = 200_000;

/// Command-line option that sets [`ColumnHints::axis`]; named in error messages.
pub const AXIS_OPTION: &str = "--spectrum-axis";
/// Command-line option that sets [`ColumnHints::value`]; named in error messages.
pub const VALUES_OPTION: &str = "--spectrum-values";
/// Command-line option that sets [`ColumnHints::column`]; named in error messages.
pub const COLUMN_OPTION: &str = "--spectrum-column";

/// Accepted axis units, for help texts.
pub const AXIS_UNITS_HELP: &str = "nm, um, eV or cm-1";
/// Accepted value units, for help texts.
pub const VALUE_UNITS_HELP: &str = "W/m2/nm, W/m2/um, W/m2/eV, W/m2/cm-1, photons/m2/s/nm, \
photons/m2/s/um, photons/m2/s/eV or photons/m2/s/cm-1, each also with cm2 in place of m2";

const HEADER_EXAMPLE: &str = "'wavelength_nm,irradiance_W_m2_nm' or 'Wavelength (nm), Irradiance (W m-2 nm-1)'";

// ---------------------------------------------------------------------------------------------
// Units
// ---------------------------------------------------------------------------------------------

/// Unit of the spectral coordinate in a file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum AxisUnit {
    /// wavelength in nm
    Nanometre,
    /// wavelength in um
    Micrometre,
    /// photon energy in eV
    Electronvolt,
    /// wavenumber in cm^-1
    PerCentimetre,
}

impl AxisUnit {
    pub const ALL: [AxisUnit; 4] =
        [AxisUnit::Nanometre, AxisUnit::Micrometre, AxisUnit::Electronvolt, AxisUnit::PerCentimetre];

    /// Read a unit name: `nm`, `um`, `µm`, `micron(s)`, `eV`, `cm-1`, `cm^-1`, `cm⁻¹`, `1/cm`,
    /// `wavenumber(s)` and spelled-out names. Case and whitespace are ignored.
    pub fn parse(s: &str) -> Option<AxisUnit> {
        match compact_unit_text(s).as_str() {
            "nm" | "nanometre" | "nanometres" | "nanometer" | "nanometers" => Some(AxisUnit::Nanometre),
            "um" | "micron" | "microns" | "micrometre" | "micrometres" | "micrometer" | "micrometers" => {
                Some(AxisUnit::Micrometre)
            }
            "ev" | "electronvolt" | "electronvolts" | "electron-volt" | "electron-volts" => {
                Some(AxisUnit::Electronvolt)
            }
            "cm-1" | "cm^-1" | "1/cm" | "/cm" | "percm" | "wavenumber" | "wavenumbers" => Some(AxisUnit::PerCentimetre),
            _ => None,
        }
    }

    /// Short ASCII label: `nm`, `um`, `eV`, `cm^-1`.
    pub fn label(self) -> &'static str {
        match self {
            AxisUnit::Nanometre => "nm",
            AxisUnit::Micrometre => "um",
            AxisUnit::Electronvolt => "eV",
            AxisUnit::PerCentimetre => "cm^-1",
        }
    }

    /// The SI axis this unit measures.
    pub fn axis(self) -> Axis {
        match self {
            AxisUnit::Nanometre | AxisUnit::Micrometre => Axis::Wavelength,
            AxisUnit::Electronvolt => Axis::PhotonEnergy,
            AxisUnit::PerCentimetre => Axis::Wavenumber,
        }
    }

    /// A coordinate in this unit, in SI (m, J or m^-1).
    pub fn coordinate_to_si(self, v: f64) -> f64 {
        match self {
            AxisUnit::Nanometre => v / 1e9,
            AxisUnit::Micrometre => v / 1e6,
            AxisUnit::Electronvolt => v * CHARGE,
            AxisUnit::PerCentimetre => v * 100.0,
        }
    }

    /// A density per this unit, as a density per SI axis unit (the inverse scaling of
    /// [`AxisUnit::coordinate_to_si`], so that products `density * d(coordinate)` are kept).
    pub fn density_to_si(self, v: f64) -> f64 {
        match self {
            AxisUnit::Nanometre => v * 1e9,
            AxisUnit::Micrometre => v * 1e6,
            AxisUnit::Electronvolt => v / CHARGE,
            AxisUnit::PerCentimetre => v / 100.0,
        }
    }
}

impl fmt::Display for AxisUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.label())
    }
}

/// Area in the denominator of a value unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum AreaUnit {
    SquareMetre,
    SquareCentimetre,
}

impl AreaUnit {
    fn label(self) -> &'static str {
        match self {
            AreaUnit::SquareMetre => "m^-2",
            AreaUnit::SquareCentimetre => "cm^-2",
        }
    }
    /// Factor from "per this area" to "per m^2".
    fn per_square_metre(self) -> f64 {
        match self {
            AreaUnit::SquareMetre => 1.0,
            AreaUnit::SquareCentimetre => 1e4,
        }
    }
}

/// Unit of the values in a file: a spectral irradiance (W per area per spectral unit) or a
/// spectral photon flux (photons per second per area per spectral unit).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ValueUnit {
    /// W per `area` per `per`
    Irradiance { per: AxisUnit, area: AreaUnit },
    /// photons s^-1 per `area` per `per`
    PhotonFlux { per: AxisUnit, area: AreaUnit },
}

impl ValueUnit {
    /// W m^-2 per `per`.
    pub const fn irradiance(per: AxisUnit) -> ValueUnit {
        ValueUnit::Irradiance { per, area: AreaUnit::SquareMetre }
    }

    /// photons s^-1 m^-2 per `per`.
    pub const fn photon_flux(per: AxisUnit) -> ValueUnit {
        ValueUnit::PhotonFlux { per, area: AreaUnit::SquareMetre }
    }

    /// Read a unit expression such as `W/m2/nm`, `W m-2 nm-1`, `W/(m^2 nm)`, `W/m²/nm`,
    /// `W m^-2 um^-1`, `photons/m2/s/nm`, `photons s-1 m-2 eV-1`, `ph/cm2/s/nm` or
    /// `#/s/m^2/cm^-1`. Case is ignored and whitespace only separates factors.
    ///
    /// Reading rules: factors multiply; `/` or the word `per` puts every following factor
    /// of the same bracket level in the denominator (so `W/m2 nm` and `W/m2/nm` agree);
    /// exponents are written `m2`, `m-2`, `m^-2` or `m⁻²`; a list with neither a division nor
    /// a negative exponent (`W m2 nm`) is read as the first factor over the rest. The result
    /// must be exactly one of W or photons (photons also need s^-1), one area (m^2 or cm^2)
    /// and one spectral unit (nm, um, eV, or cm^-1, i.e. a factor cm in the literal algebra:
    /// `W/m2/cm-1` = W m^-2 cm). Anything else is refused rather than guessed.
    pub fn parse(s: &str) -> Option<ValueUnit> {
        let factors = parse_factors(s)?;
        classify_factors(&factors)
    }

    pub fn quantity(self) -> Quantity {
        match self {
            ValueUnit::Irradiance { .. } => Quantity::Irradiance,
            ValueUnit::PhotonFlux { .. } => Quantity::PhotonFlux,
        }
    }

    /// The spectral unit the values are a density per.
    pub fn per(self) -> AxisUnit {
        match self {
            ValueUnit::Irradiance { per, .. } | ValueUnit::PhotonFlux { per, .. } => per,
        }
    }

    pub fn area(self) -> AreaUnit {
        match self {
            ValueUnit::Irradiance { area, .. } | ValueUnit::PhotonFlux { area, .. } => area,
        }
    }

    /// Label such as `W m^-2 nm^-1`, `photons s^-1 cm^-2 eV^-1` or `W m^-2 (cm^-1)^-1`.
    /// [`ValueUnit::parse`] reads every label back.
    pub fn label(self) -> String {
        let per = match self.per() {
            AxisUnit::Nanometre => "nm^-1",
            AxisUnit::Micrometre => "um^-1",
            AxisUnit::Electronvolt => "eV^-1",
            AxisUnit::PerCentimetre => "(cm^-1)^-1",
        };
        match self {
            ValueUnit::Irradiance { area, .. } => format!("W {} {per}", area.label()),
            ValueUnit::PhotonFlux { area, .. } => format!("photons s^-1 {} {per}", area.label()),
        }
    }

    /// A value in this unit, in SI per SI axis unit.
    pub fn value_to_si(self, v: f64) -> f64 {
        self.per().density_to_si(v * self.area().per_square_metre())
    }
}

impl fmt::Display for ValueUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.label())
    }
}

/// A unit name as one lower-case token: [`normalize_unit_text`] without whitespace and
/// brackets, so that `( nm )`, `[nm]` and `nm` read alike.
pub(crate) fn compact_unit_text(s: &str) -> String {
    normalize_unit_text(s)
        .chars()
        .filter(|c| !c.is_whitespace() && !matches!(c, '(' | ')' | '[' | ']' | '{' | '}'))
        .collect()
}

/// Lower-case, with micro signs as `u`, superscript digits and signs as plain ones, unicode
/// minus signs and dots as their ASCII counterparts and `**` as `^`.
pub(crate) fn normalize_unit_text(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            'µ' | 'μ' => out.push('u'),
            '⁰' => out.push('0'),
            '¹' => out.push('1'),
            '²' => out.push('2'),
            '³' => out.push('3'),
            '⁴' => out.push('4'),
            '⁵' => out.push('5'),
            '⁶' => out.push('6'),
            '⁷' => out.push('7'),
            '⁸' => out.push('8'),
            '⁹' => out.push('9'),
            '⁻' | '−' | '–' => out.push('-'),
            '⁺' => out.push('+'),
            '·' | '⋅' | '×' => out.push(' '),
            c => out.extend(c.to_lowercase()),
        }
    }
    out.replace("**", "^")
}

/// One symbol raised to an integer power, e.g. `m^-2`.
#[derive(Debug, Clone, PartialEq)]
struct Factor {
    symbol: String,
    power: i32,
}

fn parse_factors(s: &str) -> Option<Vec<Factor>> {
    let mut p = UnitReader { chars: normalize_unit_text(s).chars().collect(), pos: 0, divided: false };
    let mut factors = p.group(0)?;
    if factors.len() >= 2 && !p.divided && factors.iter().all(|f| f.power > 0) {
        // "W m2 nm": first factor over the rest
        for f in factors.iter_mut().skip(1) {
            f.power = -f.power;
        }
    }
    Some(factors)
}

struct UnitReader {
    chars: Vec<char>,
    pos: usize,
    divided: bool,
}

impl UnitReader {
    const MAX_DEPTH: usize = 4;

    fn peek(&self) -> Option<char> {
        self.chars.get(self.pos).copied()
    }

    fn at(&self, i: usize) -> Option<char> {
        self.chars.get(i).copied()
    }

    /// Factors up to the end of input (depth 0) or the closing bracket (depth > 0, consumed).
    fn group(&mut self, depth: usize) -> Option<Vec<Factor>> {
        if depth > Self::MAX_DEPTH {
            return None;
        }
        let mut out = Vec::new();
        let mut sign = 1i32;
        while let Some(c) = self.peek() {
            if c.is_whitespace() || matches!(c, '*' | '.' | '_' | ',' | '-') {
                self.pos += 1;
            } else if c == '/' {
                sign = -1;
                self.divided = true;
                self.pos += 1;
            } else if matches!(c, '(' | '[' | '{') {
                self.pos += 1;
                let inner = self.group(depth + 1)?;
                let p = self.exponent()?;
                for f in inner {
                    let power = f.power.checked_mul(p)?.checked_mul(sign)?;
                    out.push(Factor { symbol: f.symbol, power });
                }
            } else if matches!(c, ')' | ']' | '}') {
                if depth == 0 {
                    return None;
                }
                self.pos += 1;
                return Some(out);
            } else if c.is_ascii_alphabetic() || c == '#' {
                let symbol = self.word();
                let p = self.exponent()?;
                if symbol == "per" {
                    if p != 1 {
                        return None;
                    }
                    sign = -1;
                    self.divided = true;
                } else {
                    out.push(Factor { symbol, power: p.checked_mul(sign)? });
                }
            } else if c.is_ascii_digit() {
                // only the "1" of "1/cm" is allowed as a bare number
                let start = self.pos;
                while self.peek().is_some_and(|d| d.is_ascii_digit()) {
                    self.pos += 1;
                }
                if self.pos - start != 1 || c != '1' || self.peek() == Some('.') {
                    return None;
                }
            } else {
                return None;
            }
        }
        if depth > 0 {
            None
        } else {
            Some(out)
        }
    }

    fn word(&mut self) -> String {
        if self.peek() == Some('#') {
            self.pos += 1;
            return "#".to_string();
        }
        let mut w = String::new();
        while let Some(c) = self.peek().filter(|c| c.is_ascii_alphabetic()) {
            w.push(c);
            self.pos += 1;
        }
        w
    }

    /// An optional exponent after a symbol or bracket: `2`, `-2`, `^2`, `^-2`, `^(-2)`.
    /// Absent: 1. Malformed (a caret without digits): None.
    fn exponent(&mut self) -> Option<i32> {
        let mut i = self.pos;
        while self.at(i).is_some_and(char::is_whitespace) {
            i += 1;
        }
        let caret = self.at(i) == Some('^');
        if caret {
            i += 1;
            while self.at(i).is_some_and(char::is_whitespace) {
                i += 1;
            }
        } else {
            i = self.pos;
        }
        let paren = caret && self.at(i) == Some('(');
        if paren {
            i += 1;
        }
        let mut negative = false;
        match self.at(i) {
            Some('-') => {
                negative = true;
                i += 1;
            }
            Some('+') => i += 1,
            _ => {}
        }
        let mut value: i32 = 0;
        let mut digits = 0;
        while let Some(d) = self.at(i).and_then(|c| c.to_digit(10)) {
            digits += 1;
            if digits > 2 {
                return None;
            }
            value = value * 10 + d as i32;
            i += 1;
        }
        if digits == 0 {
            return if caret { None } else { Some(1) };
        }
        if paren {
            if self.at(i) != Some(')') {
                return None;
            }
            i += 1;
        }
        self.pos = i;
        Some(if negative { -value } else { value })
    }
}

fn classify_factors(factors: &[Factor]) -> Option<ValueUnit> {
    #[derive(PartialEq, Clone, Copy)]
    enum Counted {
        Power,
        Photons,
    }
    fn once<T>(slot: &mut Option<T>, v: T) -> Option<()> {
        if slot.is_some() {
            return None;
        }
        *slot = Some(v);
        Some(())
    }
    let mut what = None;
    let mut area = None;
    let mut per = None;
    let mut per_second = 0;
    for f in factors {
        match (f.symbol.as_str(), f.power) {
            ("w" | "watt" | "watts", 1) => once(&mut what, Counted::Power)?,
            ("photon" | "photons" | "ph" | "#" | "quanta", 1) => once(&mut what, Counted::Photons)?,
            ("s" | "sec" | "second" | "seconds", -1) => per_second += 1,
            ("m" | "metre" | "metres" | "meter" | "meters", -2) => once(&mut area, AreaUnit::SquareMetre)?,
            ("cm" | "centimetre" | "centimetres" | "centimeter" | "centimeters", -2) => {
                once(&mut area, AreaUnit::SquareCentimetre)?
            }
            ("nm" | "nanometre" | "nanometres" | "nanometer" | "nanometers", -1) => {
                once(&mut per, AxisUnit::Nanometre)?
            }
            ("um" | "micron" | "microns" | "micrometre" | "micrometres" | "micrometer" | "micrometers", -1) => {
                once(&mut per, AxisUnit::Micrometre)?
            }
            ("ev" | "electronvolt" | "electronvolts", -1) => once(&mut per, AxisUnit::Electronvolt)?,
            // per (cm^-1) is a factor of cm; "per wavenumber" names the same thing
            ("cm" | "centimetre" | "centimetres" | "centimeter" | "centimeters", 1)
            | ("wavenumber" | "wavenumbers", -1) => once(&mut per, AxisUnit::PerCentimetre)?,
            _ => return None,
        }
    }
    let (area, per) = (area?, per?);
    match (what?, per_second) {
        (Counted::Power, 0) => Some(ValueUnit::Irradiance { per, area }),
        (Counted::Photons, 1) => Some(ValueUnit::PhotonFlux { per, area }),
        _ => None,
    }
}

// ---------------------------------------------------------------------------------------------
// Units from header names
// ---------------------------------------------------------------------------------------------

/// Contents of the outermost (...), [...] and {...} groups, last first.
pub(crate) fn bracket_contents(s: &str) -> Vec<&str> {
    let mut out = Vec::new();
    let mut depth = 0usize;
    let mut start = 0usize;
    for (i, ch) in s.char_indices() {
        match ch {
            '(' | '[' | '{' => {
                if depth == 0 {
                    start = i + ch.len_utf8();
                }
                depth += 1;
            }
            ')' | ']' | '}' if depth > 0 => {
                depth -= 1;
                if depth == 0 {
                    if let Some(inner) = s.get(start..i) {
                        out.push(inner);
                    }
                }
            }
            _ => {}
        }
    }
    out.reverse();
    out
}

/// Words of a column name, split on underscores and whitespace.
pub(crate) fn name_words(name: &str) -> Vec<&str> {
    name.split(|c: char| c == '_' || c.is_whitespace()).filter(|w| !w.is_empty()).collect()
}

/// The axis unit a column name carries, if any: `wavelength_nm`, `Wavelength (nm)`,
/// `lambda [um]`, `energy/eV`, `wavenumber (cm-1)`. A bare quantity name such as
/// `wavenumber` does not count as a unit here.
pub(crate) fn axis_unit_from_name(name: &str) -> Option<AxisUnit> {
    let is_bare_name = |s: &str| {
        let t = s.trim().to_lowercase();
        t == "wavenumber" || t == "wavenumbers"
    };
    let mut candidates: Vec<&str> = vec![name];
    candidates.extend(bracket_contents(name));
    let words: Vec<&str> =
        name.split(|c: char| c == '_' || c == '/' || c.is_whitespace()).filter(|w| !w.is_empty()).collect();
    candidates.extend(words.iter().rev());
    candidates.into_iter().filter(|c| !is_bare_name(c)).find_map(AxisUnit::parse)
}

/// The value unit a column name carries, if any: `irradiance_W_m2_nm`,
/// `Irradiance (W m-2 nm-1)`, `E [W/m^2/um]`, `W/m2/cm-1`, `photon_flux_per_m2_s_eV`.
fn value_unit_from_name(name: &str) -> Option<ValueUnit> {
    let words = name_words(name);
    let mut candidates: Vec<String> = vec![name.to_string()];
    candidates.extend(bracket_contents(name).into_iter().map(str::to_string));
    candidates.extend((1..words.len()).filter_map(|i| words.get(i..)).map(|w| w.join(" ")));
    if let Some(u) = candidates.iter().find_map(|c| ValueUnit::parse(c)) {
        return Some(u);
    }
    // "photon_flux_per_m2_s_eV": the counted thing is named in words, the rest is a unit
    let lower = name.to_lowercase();
    let lower_words: Vec<&str> =
        lower.split(|c: char| !c.is_alphanumeric() && c != '#').filter(|w| !w.is_empty()).collect();
    let counted = if lower.contains("photon")
        || lower.contains("quanta")
        || lower_words.iter().any(|w| *w == "ph" || *w == "#")
    {
        "photons"
    } else if lower.contains("irradiance") || lower.contains("power") || lower.contains("watt") {
        "W"
    } else {
        return None;
    };
    candidates.iter().find_map(|c| ValueUnit::parse(&format!("{counted} {c}")))
}

// ---------------------------------------------------------------------------------------------
// Errors and hints
// ---------------------------------------------------------------------------------------------

/// Units and column chosen by the caller; each `Some` overrides the header.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct ColumnHints {
    /// Unit of the axis column (column 0).
    pub axis: Option<AxisUnit>,
    /// Unit of the value column.
    pub value: Option<ValueUnit>,
    /// The value column, counting the axis column as 0; default 1.
    pub column: Option<usize>,
}

/// A problem with a spectrum file: what is wrong and how to fix it, with the 1-based line
/// number of the file where it applies.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CsvError {
    pub line: Option<usize>,
    pub message: String,
}

impl CsvError {
    pub(crate) fn at(line: usize, message: impl Into<String>) -> CsvError {
        CsvError { line: Some(line), message: message.into() }
    }
    pub(crate) fn general(message: impl Into<String>) -> CsvError {
        CsvError { line: None, message: message.into() }
    }
}

impl fmt::Display for CsvError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.line {
            Some(n) => write!(f, "line {n}: {}", self.message),
            None => f.write_str(&self.message),
        }
    }
}

impl std::error::Error for CsvError {}

/// User text for a message: at most 40 characters, no control characters, in quotes.
pub(crate) fn quoted(s: &str) -> String {
    const MAX: usize = 40;
    let mut out = String::from("'");
    for (i, c) in s.chars().enumerate() {
        if i == MAX {
            out.push_str("...");
            break;
        }
        out.push(if c.is_control() { ' ' } else { c });
    }
    out.push('\'');
    out
}

// ---------------------------------------------------------------------------------------------
// Lines and fields
// ---------------------------------------------------------------------------------------------

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Separator {
    Comma,
    Semicolon,
    Tab,
    Whitespace,
}

impl Separator {
    fn detect(line: &str) -> Separator {
        if line.contains('\t') {
            Separator::Tab
        } else if line.contains(';') {
            Separator::Semicolon
        } else if line.contains(',') {
            Separator::Comma
        } else {
            Separator::Whitespace
        }
    }

    fn is(self, c: char) -> bool {
        match self {
            Separator::Comma => c == ',',
            Separator::Semicolon => c == ';',
            Separator::Tab => c == '\t',
            Separator::Whitespace => c.is_whitespace(),
        }
    }

    fn describe(self) -> &'static str {
        match self {
            Separator::Comma => "commas",
            Separator::Semicolon => "semicolons",
            Separator::Tab => "tabs",
            Separator::Whitespace => "spaces",
        }
    }
}

fn is_comment_line(t: &str) -> bool {
    t.starts_with('#') || t.starts_with('%') || t.starts_with("//")
}

/// A data line without its trailing comment.
fn strip_data_comment(t: &str) -> &str {
    let cut = [t.find('#'), t.find('%'), t.find("//")].into_iter().flatten().min();
    match cut.and_then(|i| t.get(..i)) {
        Some(head) => head,
        None => t,
    }
}

/// A header line without a trailing comment: a `#` that follows whitespace and is followed
/// by whitespace or the end of the line. (A bare `#` inside a unit such as `#/s/m2/nm` stays.)
fn strip_header_comment(t: &str) -> &str {
    let mut prev_space = false;
    let mut iter = t.char_indices().peekable();
    while let Some((i, c)) = iter.next() {
        if c == '#' && prev_space && iter.peek().is_none_or(|&(_, n)| n.is_whitespace()) {
            return t.get(..i).map(str::trim_end).unwrap_or(t);
        }
        prev_space = c.is_whitespace();
    }
    t
}

/// Trimmed, unquoted fields. Separators inside double quotes (and, with `brackets`, inside
/// brackets) do not split. Whitespace separation drops empty fields; other separators drop
/// only trailing empty fields.
fn split_fields(line: &str, sep: Separator, brackets: bool) -> Vec<&str> {
    let mut raw = Vec::new();
    let mut depth = 0usize;
    let mut quoted = false;
    let mut start = 0usize;
    for (i, ch) in line.char_indices() {
        if ch == '"' {
            quoted = !quoted;
            continue;
        }
        if quoted {
            continue;
        }
        if brackets {
            match ch {
                '(' | '[' | '{' => depth += 1,
                ')' | ']' | '}' => depth = depth.saturating_sub(1),
                _ => {}
            }
        }
        if depth == 0 && sep.is(ch) {
            raw.push(line.get(start..i).unwrap_or(""));
            start = i + ch.len_utf8();
        }
    }
    raw.push(line.get(start..).unwrap_or(""));
    let mut fields: Vec<&str> = raw.into_iter().map(clean_field).collect();
    if sep == Separator::Whitespace {
        fields.retain(|f| !f.is_empty());
    } else {
        while fields.last().is_some_and(|f| f.is_empty()) {
            fields.pop();
        }
    }
    fields
}

fn clean_field(f: &str) -> &str {
    let t = f.trim();
    t.strip_prefix('"').and_then(|u| u.strip_suffix('"')).unwrap_or(t).trim()
}

/// Column names of a header: split like the data (or, failing that, by the header's own
/// separator), keeping bracketed units with their names.
fn header_names(header: &str, file_sep: Separator, ncols: usize) -> Vec<String> {
    let split = |sep: Separator| -> Vec<String> {
        let mut names: Vec<String> = Vec::new();
        for f in split_fields(header, sep, true) {
            let attach = sep == Separator::Whitespace && (f.starts_with('(') || f.starts_with('['));
            match names.last_mut() {
                Some(prev) if attach => {
                    prev.push(' ');
                    prev.push_str(f);
                }
                _ => names.push(f.to_string()),
            }
        }
        names
    };
    let first = split(file_sep);
    let own = Separator::detect(header);
    if first.len() != ncols && own != file_sep {
        let second = split(own);
        if second.len() == ncols {
            return second;
        }
    }
    first
}

/// A number as written in a data file; Fortran `D` exponents are accepted.
fn read_number(s: &str) -> Option<f64> {
    if let Ok(v) = s.parse::<f64>() {
        return Some(v);
    }
    if s.contains(['d', 'D']) && s.starts_with(|c: char| c.is_ascii_digit() || matches!(c, '+' | '-' | '.')) {
        return s.replace(['d', 'D'], "e").parse::<f64>().ok();
    }
    None
}

fn first_field_is_number(t: &str) -> bool {
    let data = strip_data_comment(t).trim();
    let first = data.split(|c: char| matches!(c, ',' | ';') || c.is_whitespace()).next().unwrap_or("");
    read_number(clean_field(first)).is_some()
}

// ---------------------------------------------------------------------------------------------
// The reader
// ---------------------------------------------------------------------------------------------

/// Read a spectrum table (see the module documentation for the layout). `name` is the
/// spectrum's name and appears in its provenance.
pub fn parse_spectrum_csv(text: &str, hints: &ColumnHints, name: &str) -> Result<Spectrum, CsvError> {
    parse_with_limit(text, hints, name, MAX_DATA_ROWS)
}

struct DataLine<'a> {
    line: usize,
    content: &'a str,
}

struct Context {
    sep: Separator,
    sep_line: usize,
    value_col: usize,
}

/// The words that differ between the kinds of table read with [`scan_table`] (spectra,
/// quantum efficiencies), so that every message names the right options.
pub(crate) struct TableWords {
    /// how to choose the value column, in parentheses
    pub column_hint: &'static str,
    /// the options that give the units, as a phrase
    pub unit_options: &'static str,
    /// what the values are, plural, e.g. "spectral values"
    pub values: &'static str,
    /// one table, with its article, e.g. "a spectrum"
    pub table: &'static str,
}

const SPECTRUM_WORDS: TableWords = TableWords {
    column_hint: "(choose it with --spectrum-column, counting the axis as 0)",
    unit_options: "--spectrum-axis and --spectrum-values",
    values: "spectral values",
    table: "a spectrum",
};

/// A table file split into its header and data lines, not yet read as numbers.
pub(crate) struct TableScan<'a> {
    /// line of the header, if the file has one
    pub header_line: Option<usize>,
    /// column names from the header (empty without one)
    pub names: Vec<String>,
    /// fields on the first data line
    pub ncols: usize,
    data: Vec<DataLine<'a>>,
    sep: Separator,
    first_line: usize,
}

/// Numbers read from a table, ascending along the axis, in the file's units, with the
/// file line of each point.
pub(crate) struct TablePoints {
    pub xs: Vec<f64>,
    pub ys: Vec<f64>,
    pub line_of: Vec<usize>,
}

/// Refuse column 0 as the value column of a spectrum.
fn check_value_column(value_col: usize) -> Result<(), CsvError> {
    if value_col == 0 {
        return Err(CsvError::general(format!(
            "column 0 holds the spectral axis and cannot also be the value column; \
             give {COLUMN_OPTION} 1 for the first value column"
        )));
    }
    Ok(())
}

/// Find the header and the data lines of a table (see the module documentation for the
/// layout); at most `limit` data lines.
pub(crate) fn scan_table(text: &str, limit: usize) -> Result<TableScan<'_>, CsvError> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut header: Option<(usize, &str)> = None;
    let mut seen_content = false;
    let mut data: Vec<DataLine> = Vec::new();
    let lines = if text.contains('\n') { text.split('\n') } else { text.split('\r') };
    for (idx, raw) in lines.enumerate() {
        let line = idx + 1;
        let t = raw.trim();
        if t.is_empty() || is_comment_line(t) {
            continue;
        }
        if !seen_content {
            seen_content = true;
            if !first_field_is_number(t) {
                header = Some((line, strip_header_comment(t)));
                continue;
            }
        }
        let content = strip_data_comment(t).trim();
        if content.is_empty() {
            continue;
        }
        if data.len() >= limit {
            return Err(CsvError::at(
                line,
                format!(
                    "the file has more than {limit} data lines, the most accepted; \
                     thin the table (e.g. keep every second line) or shorten its spectral range"
                ),
            ));
        }
        data.push(DataLine { line, content });
    }
    let Some(first) = data.first() else {
        let msg = "no data lines: the file needs at least two lines of numbers \
                   (spectral coordinate, then value), e.g. '400,1.2'";
        return Err(match header {
            Some((h, _)) => CsvError::at(h, format!("{msg}; only a header was found on this line")),
            None => CsvError::general(msg),
        });
    };
    let sep = Separator::detect(first.content);
    let ncols = split_fields(first.content, sep, false).len();
    let names = header.map(|(_, h)| header_names(h, sep, ncols)).unwrap_or_default();
    let first_line = first.line;
    Ok(TableScan { header_line: header.map(|(h, _)| h), names, ncols, data, sep, first_line })
}

impl TableScan<'_> {
    /// Refuse a header with more names than the data has columns when units are to be read
    /// from it (`needs_header`).
    pub(crate) fn check_header_width(&self, needs_header: bool, words: &TableWords) -> Result<(), CsvError> {
        if let Some(h) = self.header_line {
            if needs_header && self.names.len() > self.ncols {
                return Err(CsvError::at(
                    h,
                    format!(
                        "the header names {} columns but the first data line (line {}) has {}, \
                         so the units cannot be matched to columns; write one name per column, \
                         separated by {} like the data, or give the units with {}",
                        self.names.len(),
                        self.first_line,
                        self.ncols,
                        self.sep.describe(),
                        words.unit_options
                    ),
                ));
            }
        }
        Ok(())
    }

    /// Read the axis (column 0) and the value column `value_col` of every data line:
    /// finite numbers, a positive axis, non-negative values, no repeated axis value, one
    /// direction throughout. Returned ascending along the axis.
    pub(crate) fn read_points(&self, value_col: usize, words: &TableWords) -> Result<TablePoints, CsvError> {
        let ctx = Context { sep: self.sep, sep_line: self.first_line, value_col };
        let mut xs: Vec<f64> = Vec::with_capacity(self.data.len());
        let mut ys: Vec<f64> = Vec::with_capacity(self.data.len());
        let mut line_of: Vec<usize> = Vec::with_capacity(self.data.len());
        let mut direction: Option<(bool, usize)> = None; // (ascending, first line)
        let mut prev: Option<(f64, usize, &str)> = None;
        for d in &self.data {
            let fields = split_fields(d.content, self.sep, false);
            let x_text = fields.first().copied().unwrap_or("");
            let x = read_field(x_text, d.line, 0, &ctx)?;
            let Some(&y_text) = fields.get(value_col) else {
                return Err(CsvError::at(
                    d.line,
                    format!(
                        "no value in column {value_col}: the line has {} field(s) separated by {}; \
                         every data line needs the axis value (column 0) and the value column \
                         {}",
                        fields.len(),
                        self.sep.describe(),
                        words.column_hint
                    ),
                ));
            };
            let y = read_field(y_text, d.line, value_col, &ctx)?;
            if x <= 0.0 {
                return Err(CsvError::at(
                    d.line,
                    format!(
                        "the axis value {} is zero or negative; wavelengths, photon energies and \
                         wavenumbers must be positive, so correct or remove this line",
                        quoted(x_text)
                    ),
                ));
            }
            if y < 0.0 {
                return Err(CsvError::at(
                    d.line,
                    format!(
                        "the value {} in column {value_col} is negative; {} must be zero \
                         or positive (replace small negative noise by 0)",
                        quoted(y_text),
                        words.values
                    ),
                ));
            }
            if let Some((px, pline, ptext)) = prev {
                if x == px {
                    return Err(CsvError::at(
                        d.line,
                        format!(
                            "the axis value {} repeats line {pline} ({}); each axis value may appear \
                             only once, so remove or merge the duplicate",
                            quoted(x_text),
                            quoted(ptext)
                        ),
                    ));
                }
                let up = x > px;
                match direction {
                    None => direction = Some((up, pline)),
                    Some((ascending, from)) if ascending != up => {
                        let (was, now) = if ascending { ("ascends", "goes down") } else { ("descends", "goes up") };
                        return Err(CsvError::at(
                            d.line,
                            format!(
                                "the axis {now} here ({} after {} on line {pline}) but the file {was} \
                                 from line {from}; the axis must run in one direction throughout, so \
                                 sort the file or fix this line",
                                quoted(x_text),
                                quoted(ptext)
                            ),
                        ));
                    }
                    Some(_) => {}
                }
            }
            prev = Some((x, d.line, x_text));
            xs.push(x);
            ys.push(y + 0.0); // -0 becomes +0
            line_of.push(d.line);
        }
        if xs.len() < 2 {
            let only = line_of.first().copied().unwrap_or(self.first_line);
            return Err(CsvError::at(
                only,
                format!("this is the only data line; {} needs at least two points, so add more lines", words.table),
            ));
        }
        if direction.is_some_and(|(ascending, _)| !ascending) {
            xs.reverse();
            ys.reverse();
            line_of.reverse();
        }
        Ok(TablePoints { xs, ys, line_of })
    }
}

/// Refuse axis values that coincide once converted to SI.
pub(crate) fn check_distinct(xs: &[f64], line_of: &[usize]) -> Result<(), CsvError> {
    for (i, w) in xs.windows(2).enumerate() {
        if let [a, b] = w {
            if b <= a {
                let l1 = line_of.get(i).copied().unwrap_or(0);
                let l2 = line_of.get(i + 1).copied().unwrap_or(0);
                return Err(CsvError::at(
                    l2.max(l1),
                    format!(
                        "the axis values on lines {} and {} are too close to tell apart; remove one of them",
                        l1.min(l2),
                        l1.max(l2)
                    ),
                ));
            }
        }
    }
    Ok(())
}

fn parse_with_limit(text: &str, hints: &ColumnHints, name: &str, limit: usize) -> Result<Spectrum, CsvError> {
    let value_col = hints.column.unwrap_or(1);
    check_value_column(value_col)?;
    let scan = scan_table(text, limit)?;

    // Units: explicit hints first, then the header.
    scan.check_header_width(hints.axis.is_none() || hints.value.is_none(), &SPECTRUM_WORDS)?;
    let names = &scan.names;
    let ncols = scan.ncols;
    let header_line = scan.header_line;
    let value_name = names.get(value_col).map(String::as_str);
    let axis_unit = match hints.axis {
        Some(u) => u,
        None => match names.first().and_then(|n| axis_unit_from_name(n)) {
            Some(u) => u,
            None => return Err(missing_axis_unit(header_line, names.first().map(String::as_str))),
        },
    };
    let value_unit = match hints.value {
        Some(u) => u,
        None => match value_name.and_then(value_unit_from_name) {
            Some(u) => u,
            None => return Err(missing_value_unit(header_line, value_col, value_name)),
        },
    };
    if axis_unit.axis() != value_unit.per().axis() {
        let msg = format!(
            "the values are per {} but the axis is in {}: a density per {} cannot be put on a {} \
             axis by rescaling; give values per {} (or an axis in {}), in the header or with \
             {AXIS_OPTION} / {VALUES_OPTION}",
            value_unit.per().label(),
            axis_unit.label(),
            axis_kind(value_unit.per().axis()),
            axis_kind(axis_unit.axis()),
            units_of_kind(axis_unit.axis()),
            units_of_kind(value_unit.per().axis()),
        );
        let from_header = hints.axis.is_none() || hints.value.is_none();
        return Err(match header_line.filter(|_| from_header) {
            Some(h) => CsvError::at(h, msg),
            None => CsvError::general(msg),
        });
    }

    // Pass 2: numbers, in file order.
    let TablePoints { mut xs, mut ys, line_of } = scan.read_points(value_col, &SPECTRUM_WORDS)?;

    // Into SI.
    for ((x, y), &line) in xs.iter_mut().zip(ys.iter_mut()).zip(&line_of) {
        *x = axis_unit.coordinate_to_si(*x);
        *y = value_unit.value_to_si(*y);
        if !(x.is_finite() && *x > 0.0) {
            return Err(CsvError::at(
                line,
                format!(
                    "the axis value is out of the representable range once converted from {} to SI; \
                     check the axis unit ({AXIS_OPTION})",
                    axis_unit.label()
                ),
            ));
        }
        if !y.is_finite() {
            return Err(CsvError::at(
                line,
                format!(
                    "the value overflows once converted from {} to SI; check the value unit ({VALUES_OPTION})",
                    value_unit.label()
                ),
            ));
        }
    }
    check_distinct(&xs, &line_of)?;

    let n = xs.len();
    let mut provenance =
        format!("user file '{name}', {n} points, axis {}, values {}", axis_unit.label(), value_unit.label());
    if ncols > 2 || hints.column.is_some() {
        provenance.push_str(&format!(", column {value_col}"));
        if let Some(v) = value_name {
            provenance.push_str(&format!(" {}", quoted(v)));
        }
    }
    let spectrum = Spectrum::new(name, provenance, axis_unit.axis(), value_unit.quantity(), xs, ys)
        .map_err(|e| spectrum_error(&e, &line_of))?;
    if !(spectrum.total_power().is_finite() && spectrum.total_photon_flux().is_finite()) {
        return Err(CsvError::general(format!(
            "the values are too large: their integral overflows; check the value unit \
             ({VALUES_OPTION}, now {})",
            value_unit.label()
        )));
    }
    Ok(spectrum)
}

/// One number of a data line (column `col`), finite.
fn read_field(text: &str, line: usize, col: usize, ctx: &Context) -> Result<f64, CsvError> {
    if text.is_empty() {
        return Err(CsvError::at(
            line,
            format!(
                "column {col} is empty; every data line needs a number in column 0 (the axis) and \
                 in column {} (the values)",
                ctx.value_col
            ),
        ));
    }
    let Some(v) = read_number(text) else {
        let mut msg = format!(
            "{} is not a number (column {col}); data lines may hold only numbers, with notes after '#'",
            quoted(text)
        );
        let other_seps = text.contains([',', ';', '\t', ' ']);
        if ctx.sep != Separator::Comma && text.contains(',') && !text.contains('.') && !text.contains(' ') {
            msg.push_str(&format!(
                "; if ',' is a decimal mark, write '.' instead; if it separates fields, use {} as on line {}",
                ctx.sep.describe(),
                ctx.sep_line
            ));
        } else if other_seps {
            msg.push_str(&format!(
                "; this file separates fields with {} (as on line {}), so use the same separator on every line",
                ctx.sep.describe(),
                ctx.sep_line
            ));
        } else if text.starts_with(|c: char| c.is_ascii_digit())
            && text.chars().any(|c| c.is_alphabetic() && !matches!(c, 'e' | 'E' | 'd' | 'D'))
        {
            msg.push_str("; give units in the header, not beside the numbers");
        }
        return Err(CsvError::at(line, msg));
    };
    if !v.is_finite() {
        return Err(CsvError::at(
            line,
            format!(
                "{} in column {col} is not a finite number; replace it by a number or remove the line",
                quoted(text)
            ),
        ));
    }
    Ok(v)
}

fn spectrum_error(e: &SpectrumError, line_of: &[usize]) -> CsvError {
    let index = match e {
        SpectrumError::NotFinite { index }
        | SpectrumError::NotAscending { index }
        | SpectrumError::Negative { index }
        | SpectrumError::NonPositiveAxis { index } => Some(*index),
        _ => None,
    };
    let msg = format!("the table is not a valid spectrum: {e}");
    match index.and_then(|i| line_of.get(i)) {
        Some(&l) => CsvError::at(l, msg),
        None => CsvError::general(msg),
    }
}

fn axis_kind(a: Axis) -> &'static str {
    match a {
        Axis::Wavelength => "wavelength",
        Axis::PhotonEnergy => "photon energy",
        Axis::Wavenumber => "wavenumber",
    }
}

fn units_of_kind(a: Axis) -> &'static str {
    match a {
        Axis::Wavelength => "nm or um",
        Axis::PhotonEnergy => "eV",
        Axis::Wavenumber => "cm-1",
    }
}

fn missing_axis_unit(header_line: Option<usize>, name: Option<&str>) -> CsvError {
    let fix =
        format!("put the unit in the header, e.g. {HEADER_EXAMPLE}, or give {AXIS_OPTION} UNIT ({AXIS_UNITS_HELP})");
    match (header_line, name) {
        (Some(h), Some(n)) => CsvError::at(
            h,
            format!(
                "the unit of the spectral axis is missing: column 0 is named {} with no recognised unit; {fix}",
                quoted(n)
            ),
        ),
        (Some(h), None) => {
            CsvError::at(h, format!("the unit of the spectral axis is missing: the header names no columns; {fix}"))
        }
        _ => CsvError::general(format!(
            "the unit of the spectral axis is missing: the file has no header line \
             (a header must not start with '#', '%' or '//', which mark comments); {fix}"
        )),
    }
}

fn missing_value_unit(header_line: Option<usize>, col: usize, name: Option<&str>) -> CsvError {
    let fix = format!(
        "put the unit in the header, e.g. {HEADER_EXAMPLE}, or give {VALUES_OPTION} UNIT \
         (e.g. W/m2/nm or photons/m2/s/eV)"
    );
    match (header_line, name) {
        (Some(h), Some(n)) => CsvError::at(
            h,
            format!(
                "the unit of the values is missing: column {col} is named {} with no recognised unit; \
                 {fix}; accepted units: {VALUE_UNITS_HELP}",
                quoted(n)
            ),
        ),
        (Some(h), None) => {
            CsvError::at(h, format!("the unit of the values is missing: the header names no column {col}; {fix}"))
        }
        _ => CsvError::general(format!(
            "the unit of the values is missing: the file has no header line \
             (a header must not start with '#', '%' or '//', which mark comments); {fix}"
        )),
    }
}

// ---------------------------------------------------------------------------------------------

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::constants::HC;

    fn parse(text: &str) -> Result<Spectrum, CsvError> {
        parse_spectrum_csv(text, &ColumnHints::default(), "test")
    }

    fn err(text: &str) -> CsvError {
        match parse(text) {
            Ok(s) => panic!("expected an error, got a spectrum of {} points", s.len()),
            Err(e) => e,
        }
    }

    fn rel(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    // ---- unit parsers ----

    #[test]
    fn axis_unit_forms() {
        use AxisUnit::*;
        for (s, u) in [
            ("nm", Nanometre),
            ("NM", Nanometre),
            (" nanometers ", Nanometre),
            ("um", Micrometre),
            ("µm", Micrometre),
            ("μm", Micrometre),
            ("micron", Micrometre),
            ("Microns", Micrometre),
            ("eV", Electronvolt),
            ("ev", Electronvolt),
            ("cm-1", PerCentimetre),
            ("cm^-1", PerCentimetre),
            ("CM ^ -1", PerCentimetre),
            ("cm⁻¹", PerCentimetre),
            ("1/cm", PerCentimetre),
            ("cm^(-1)", PerCentimetre),
            ("(nm)", Nanometre),
            ("wavenumber", PerCentimetre),
            ("Wavenumbers", PerCentimetre),
        ] {
            assert_eq!(AxisUnit::parse(s), Some(u), "{s}");
        }
        for s in ["", "m", "cm", "Hz", "mm", "nm nm", "keV", "1/m"] {
            assert_eq!(AxisUnit::parse(s), None, "{s}");
        }
        for u in AxisUnit::ALL {
            assert_eq!(AxisUnit::parse(u.label()), Some(u));
        }
    }

    #[test]
    fn value_unit_forms() {
        use AxisUnit::*;
        let irr = ValueUnit::irradiance;
        let ph = ValueUnit::photon_flux;
        let ph_cm2 = |per| ValueUnit::PhotonFlux { per, area: AreaUnit::SquareCentimetre };
        for (s, u) in [
            ("W/m2/nm", irr(Nanometre)),
            ("W m-2 nm-1", irr(Nanometre)),
            ("W/(m^2 nm)", irr(Nanometre)),
            ("W/m²/nm", irr(Nanometre)),
            ("W·m⁻²·nm⁻¹", irr(Nanometre)),
            ("w / M2 / NM", irr(Nanometre)),
            ("W/m^2 nm", irr(Nanometre)),
            ("W m2 nm", irr(Nanometre)),
            ("W m**-2 nm**-1", irr(Nanometre)),
            ("W m^-2 um^-1", irr(Micrometre)),
            ("W/m2/µm", irr(Micrometre)),
            ("W/m2/micron", irr(Micrometre)),
            ("W/m2/eV", irr(Electronvolt)),
            ("W/m2/cm-1", irr(PerCentimetre)),
            ("W/(m2 cm^-1)", irr(PerCentimetre)),
            ("W m-2 (cm-1)-1", irr(PerCentimetre)),
            ("W/m2/(1/cm)", irr(PerCentimetre)),
            ("W/m2/wavenumber", irr(PerCentimetre)),
            ("photons/m2/s/nm", ph(Nanometre)),
            ("photons s-1 m-2 eV-1", ph(Electronvolt)),
            ("photons per m2 per s per nm", ph(Nanometre)),
            ("photons/(s m^2 um)", ph(Micrometre)),
            ("ph/cm2/s/nm", ph_cm2(Nanometre)),
            ("#/s/m^2/cm^-1", ph(PerCentimetre)),
            ("quanta/s/m2/eV", ph(Electronvolt)),
        ] {
            assert_eq!(ValueUnit::parse(s), Some(u), "{s}");
        }
        for s in [
            "",
            "W",
            "W/m2",          // no spectral unit
            "W/nm",          // no area
            "photons/m2/nm", // no time: a fluence, not a flux
            "W/m2/s/nm",     // W already is per second
            "W/m2/nm/sr",    // a radiance
            "W/(m^2/nm)",    // W nm / m^2
            "W m2 nm-1",     // mixed: ambiguous
            "W m-2 cm-1",    // per cm of length, or per cm^-1? refused
            "W/m2/nm/nm",
            "W photons/m2/s/nm",
            "2 W/m2/nm",
            "W/m2/nm)",
            "(W/m2/nm",
            "W/m^/nm",
            "mW/m2/nm",
            "W/m3",
            "W/m2/nm extra",
            "((((((W))))))/m2/nm",
        ] {
            assert_eq!(ValueUnit::parse(s), None, "{s}");
        }
    }

    #[test]
    fn value_labels_read_back() {
        for per in AxisUnit::ALL {
            for area in [AreaUnit::SquareMetre, AreaUnit::SquareCentimetre] {
                for u in [ValueUnit::Irradiance { per, area }, ValueUnit::PhotonFlux { per, area }] {
                    assert_eq!(ValueUnit::parse(&u.label()), Some(u), "{}", u.label());
                }
            }
        }
        assert_eq!(ValueUnit::irradiance(AxisUnit::Nanometre).label(), "W m^-2 nm^-1");
    }

    #[test]
    fn units_from_header_names() {
        use AxisUnit::*;
        assert_eq!(axis_unit_from_name("wavelength_nm"), Some(Nanometre));
        assert_eq!(axis_unit_from_name("Wavelength (nm)"), Some(Nanometre));
        assert_eq!(axis_unit_from_name("lambda [um]"), Some(Micrometre));
        assert_eq!(axis_unit_from_name("energy_eV"), Some(Electronvolt));
        assert_eq!(axis_unit_from_name("E/eV"), Some(Electronvolt));
        assert_eq!(axis_unit_from_name("wavenumber (cm-1)"), Some(PerCentimetre));
        assert_eq!(axis_unit_from_name("wavenumber_cm^-1"), Some(PerCentimetre));
        assert_eq!(axis_unit_from_name("wavelength"), None);
        assert_eq!(axis_unit_from_name("wavenumber"), None);

        let irr = ValueUnit::irradiance;
        assert_eq!(value_unit_from_name("irradiance_W_m2_nm"), Some(irr(Nanometre)));
        assert_eq!(value_unit_from_name("Irradiance (W m-2 nm-1)"), Some(irr(Nanometre)));
        assert_eq!(value_unit_from_name("W/m2/cm-1"), Some(irr(PerCentimetre)));
        assert_eq!(value_unit_from_name("E [W/m^2/um]"), Some(irr(Micrometre)));
        assert_eq!(value_unit_from_name("Global tilt  W*m-2*nm-1"), Some(irr(Nanometre)));
        assert_eq!(value_unit_from_name("photon_flux_per_m2_s_eV"), Some(ValueUnit::photon_flux(Electronvolt)));
        assert_eq!(value_unit_from_name("Photon flux (per m2 s nm)"), Some(ValueUnit::photon_flux(Nanometre)));
        assert_eq!(value_unit_from_name("spectral irradiance per m2 nm"), Some(irr(Nanometre)));
        assert_eq!(value_unit_from_name("global"), None);
        assert_eq!(value_unit_from_name("flux_per_m2_s_eV"), None);
    }

    // ---- headers and layouts ----

    #[test]
    fn header_forms_from_the_layout_description() {
        let s = parse("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,1\n").unwrap();
        assert_eq!(s.axis(), Axis::Wavelength);
        assert_eq!(s.quantity(), Quantity::Irradiance);
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        assert_eq!(s.provenance, "user file 'test', 2 points, axis nm, values W m^-2 nm^-1");

        let s = parse("Wavelength (nm), Irradiance (W m-2 nm-1)\n400, 1\n500, 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);

        let s = parse("energy_eV,photon_flux_per_m2_s_eV\n1,1e21\n2,1e21\n").unwrap();
        assert_eq!(s.axis(), Axis::PhotonEnergy);
        assert_eq!(s.quantity(), Quantity::PhotonFlux);
        assert!(rel(s.total_photon_flux(), 1e21) < 1e-12);

        let s = parse("wavenumber (cm-1), W/m2/cm-1\n10000,0.5\n20000,0.5\n").unwrap();
        assert_eq!(s.axis(), Axis::Wavenumber);
        assert!(rel(s.total_power(), 5000.0) < 1e-12);

        let s = parse("lambda [um]; E [W/m^2/um]\n0.4;1000\n0.8;1000\n").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);

        // whitespace-separated header with bracketed units
        let s = parse("Wavelength (nm)  Irradiance (W m-2 nm-1)\n400 1\n500 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        // quoted spreadsheet export, header separated differently from the data
        let s = parse("\"wavelength_nm\",\"irradiance_W_m2_nm\"\n400 1\n500 1\n").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
    }

    #[test]
    fn separators_semicolon_tab_and_whitespace() {
        let semi = "# semicolons\nwavelength_nm;irradiance_W_m2_nm\n400;1.0\n450;1.0;\n500 ; 1.0\n";
        let s = parse(semi).unwrap();
        assert_eq!(s.len(), 3);
        assert!(rel(s.total_power(), 100.0) < 1e-12);

        let ws = "wavelength_nm   irradiance_W_m2_nm\n  400    1.0\n\t450  1.0\n500 1.0   \n";
        let s = parse(ws).unwrap();
        assert_eq!(s.len(), 3);
        assert!(rel(s.total_power(), 100.0) < 1e-12);

        let tab = "wavelength_nm\tirradiance_W_m2_nm\n400\t1.0\n500\t 1.0\n";
        let s = parse(tab).unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);

        // a line that uses another separator is named
        let e = err("wavelength_nm;irradiance_W_m2_nm\n400;1.0\n450,1.0\n");
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("semicolons"), "{e}");
        // decimal commas are not guessed
        let e = err("wavelength_nm;irradiance_W_m2_nm\n400;1,5\n500;1,5\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("decimal mark") && e.message.contains("semicolons"), "{e}");
    }

    #[test]
    fn comments_blank_lines_crlf_bom_and_fortran_exponents() {
        let text = "\u{feff}# a comment\r\n% another\r\n// and another\r\n\r\n\
                    wavelength_nm,irradiance_W_m2_nm   # trailing header note\r\n\
                    400,1.0D0  # first point\r\n   \r\n  # indented comment\r\n500,1.0 % note\r\n600,1.0 // note\r\n";
        let s = parse(text).unwrap();
        assert_eq!(s.len(), 3);
        assert!(rel(s.total_power(), 200.0) < 1e-12);
        // lone carriage returns as line ends
        let s = parse("wavelength_nm,irradiance_W_m2_nm\r400,1\r500,1\r").unwrap();
        assert_eq!(s.len(), 2);
        // a '#' inside a unit is not a comment
        let s = parse("wavenumber (cm-1), #/s/m^2/cm^-1\n1000,1e20\n2000,1e20\n").unwrap();
        assert_eq!(s.quantity(), Quantity::PhotonFlux);
        assert!(rel(s.total_photon_flux(), 1e20 * 1000.0) < 1e-12);
    }

    #[test]
    fn four_column_header_with_column_choice() {
        let text = "wavelength_nm,extraterrestrial,global,direct\n\
                    400,2,1,0.5\n500,2,1,0.5\n600,2,1,0.5\n";
        let axis = Some(AxisUnit::Nanometre);
        let value = Some(ValueUnit::irradiance(AxisUnit::Nanometre));
        // default: the first value column
        let s = parse_spectrum_csv(text, &ColumnHints { axis, value, column: None }, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
        for (col, want, label) in [(1, 400.0, "'extraterrestrial'"), (2, 200.0, "'global'"), (3, 100.0, "'direct'")] {
            let s = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(col) }, "x").unwrap();
            assert!(rel(s.total_power(), want) < 1e-12, "column {col}");
            assert!(s.provenance.ends_with(&format!("column {col} {label}")), "{}", s.provenance);
        }
        // the header gives no value unit: the error says so and names the option
        let e = parse_spectrum_csv(text, &ColumnHints { column: Some(2), ..Default::default() }, "x").unwrap_err();
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("'global'") && e.message.contains(VALUES_OPTION), "{e}");
        // per-column units in the header
        let text2 = "Wavelength (nm), ETR (W m-2 nm-1), Global (W m-2 nm-1)\n400,2,1\n500,2,1\n";
        let s = parse_spectrum_csv(text2, &ColumnHints { column: Some(2), ..Default::default() }, "x").unwrap();
        assert!(rel(s.total_power(), 100.0) < 1e-12);
        // column out of range, column 0
        let e = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(4) }, "x").unwrap_err();
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("column 4") && e.message.contains(COLUMN_OPTION), "{e}");
        let e = parse_spectrum_csv(text, &ColumnHints { axis, value, column: Some(0) }, "x").unwrap_err();
        assert_eq!(e.line, None);
        assert!(e.message.contains(COLUMN_OPTION), "{e}");
    }

    #[test]
    fn explicit_hints_override_the_header_and_serve_headerless_files() {
        let text = "wavelength_nm,irradiance_W_m2_nm\n0.4,1000\n0.8,1000\n";
        let hints = ColumnHints {
            axis: Some(AxisUnit::Micrometre),
            value: Some(ValueUnit::irradiance(AxisUnit::Micrometre)),
            column: None,
        };
        let s = parse_spectrum_csv(text, &hints, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
        assert!(s.provenance.contains("axis um, values W m^-2 um^-1"), "{}", s.provenance);
        let s = parse_spectrum_csv("0.4 1000\n0.8 1000\n", &hints, "x").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
    }

    #[test]
    fn missing_units_are_explained() {
        let e = err("400,1\n500,1\n");
        assert_eq!(e.line, None);
        assert!(e.message.contains("spectral axis") && e.message.contains(AXIS_OPTION), "{e}");
        assert!(e.message.contains("wavelength_nm,irradiance_W_m2_nm"), "{e}");
        let hints = ColumnHints { axis: Some(AxisUnit::Nanometre), ..Default::default() };
        let e = parse_spectrum_csv("400,1\n500,1\n", &hints, "x").unwrap_err();
        assert!(e.message.contains("values") && e.message.contains(VALUES_OPTION), "{e}");
        let e = err("# wavelength_nm, irradiance_W_m2_nm\nwavelength,irradiance_W_m2_nm\n400,1\n500,1\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("'wavelength'") && e.message.contains(AXIS_OPTION), "{e}");
        let e = err("wavelength_nm,irradiance\n400,1\n500,1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("'irradiance'") && e.message.contains(VALUES_OPTION), "{e}");
        // a header that does not line up with the data
        let e = err("Wavelength nm Irradiance W/m2/nm\n400 1\n500 1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("4 columns"), "{e}");
    }

    #[test]
    fn axis_and_value_kinds_must_agree() {
        let e = err("wavelength_nm,W/m2/eV\n400,1\n500,1\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("per eV") && e.message.contains("nm or um"), "{e}");
        // nm axis with per-um values is plain rescaling
        let s = parse("wavelength_nm,W/m2/um\n400,1000\n800,1000\n").unwrap();
        assert!(rel(s.total_power(), 400.0) < 1e-12);
    }

    // ---- data rules ----

    #[test]
    fn non_numeric_field_names_the_line() {
        let mut text = String::from("wavelength_nm,irradiance_W_m2_nm\n");
        for i in 0..12 {
            text.push_str(&format!("{},1\n", 400 + i));
        }
        text.push_str("412,abc\n");
        let e = err(&text);
        assert_eq!(e.line, Some(14));
        assert!(e.to_string().starts_with("line 14: 'abc' is not a number"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400nm,1\n500,1\n");
        assert!(e.message.contains("header"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,,1\n500,1\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("empty"), "{e}");
    }

    #[test]
    fn missing_value_column() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500\n600,1\n");
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("no value in column 1"), "{e}");
    }

    #[test]
    fn non_finite_values() {
        for bad in ["NaN", "nan", "inf", "-inf", "Infinity", "1e400"] {
            let e = err(&format!("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,{bad}\n"));
            assert_eq!(e.line, Some(3), "{bad}");
            assert!(e.message.contains("not a finite number"), "{bad}: {e}");
        }
        let e = err("wavelength_nm,irradiance_W_m2_nm\nnan,1\n500,1\n");
        assert_eq!(e.line, Some(2));
    }

    #[test]
    fn negative_values_and_non_positive_axis() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,-0.1\n");
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("negative"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n0,1\n500,1\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("zero or negative"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n-500,1\n");
        assert_eq!(e.line, Some(3));
        // negative zero is zero
        let s = parse("wavelength_nm,irradiance_W_m2_nm\n400,-0\n500,1\n").unwrap();
        assert!(s.values().iter().all(|v| v.is_sign_positive()));
    }

    #[test]
    fn too_few_points() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n# nothing\n\n400,1\n");
        assert_eq!(e.line, Some(4));
        assert!(e.message.contains("at least two points"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n");
        assert_eq!(e.line, Some(1));
        assert!(e.message.contains("no data lines"), "{e}");
        let e = err("");
        assert_eq!(e.line, None);
        let e = err("# only comments\n\n");
        assert!(e.message.contains("no data lines"), "{e}");
    }

    #[test]
    fn duplicate_axis_values() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,1\n500.0,2\n600,1\n");
        assert_eq!(e.line, Some(4));
        assert!(e.message.contains("repeats line 3"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n400,1\n");
        assert_eq!(e.line, Some(3));
    }

    #[test]
    fn direction_changes_are_rejected() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,1\n600,1\n550,1\n700,1\n");
        assert_eq!(e.line, Some(5));
        assert!(e.message.contains("ascends from line 2"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n700,1\n600,1\n650,1\n");
        assert_eq!(e.line, Some(4));
        assert!(e.message.contains("descends"), "{e}");
    }

    #[test]
    fn descending_wavenumber_file_is_reordered() {
        let text = "wavenumber (cm-1), W/m2/cm-1\n25000, 0.01\n20000, 0.02\n15000, 0.03\n12500, 0.04\n";
        let s = parse(text).unwrap();
        assert_eq!(s.axis(), Axis::Wavenumber);
        let x = s.coordinates();
        assert_eq!(x.len(), 4);
        assert!(x.windows(2).all(|w| w[0] < w[1]));
        assert_eq!(x[0], 12500.0 * 100.0);
        assert_eq!(s.values()[0], 0.04 / 100.0);
        // trapezoids in cm^-1: 2500*0.035 + 5000*0.025 + 5000*0.015 = 287.5 W/m^2
        assert!(rel(s.total_power(), 287.5) < 1e-12, "{}", s.total_power());
    }

    #[test]
    fn row_cap() {
        let hints = ColumnHints {
            axis: Some(AxisUnit::Nanometre),
            value: Some(ValueUnit::irradiance(AxisUnit::Nanometre)),
            column: None,
        };
        let small: String = (1..=5).map(|i| format!("{i} 1\n")).collect();
        assert_eq!(parse_with_limit(&small, &hints, "x", 5).unwrap().len(), 5);
        let e = parse_with_limit(&small, &hints, "x", 4).unwrap_err();
        assert_eq!(e.line, Some(5));
        // the real cap is hit before any number is read
        let big = "1 1\n".repeat(MAX_DATA_ROWS + 1);
        let e = parse_spectrum_csv(&big, &hints, "x").unwrap_err();
        assert_eq!(e.line, Some(MAX_DATA_ROWS + 1));
        assert!(e.message.contains("200000"), "{e}");
    }

    #[test]
    fn per_square_centimetre_is_converted() {
        let s = parse("wavelength_nm,ph/cm2/s/nm\n400,1e14\n500,1e14\n").unwrap();
        assert!(rel(s.total_photon_flux(), 1e14 * 1e4 * 100.0) < 1e-12);
        assert!(s.provenance.contains("photons s^-1 cm^-2 nm^-1"), "{}", s.provenance);
    }

    #[test]
    fn error_display_is_one_line() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,x\u{7}y\n");
        let shown = e.to_string();
        assert!(shown.starts_with("line 3: "), "{shown}");
        assert!(!shown.contains('\n') && !shown.contains('\u{7}'));
        let e = CsvError { line: None, message: "plain".into() };
        assert_eq!(e.to_string(), "plain");
        let long = format!("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,{}\n", "z".repeat(10_000));
        assert!(err(&long).to_string().len() < 400);
    }

    // ---- integrals ----

    #[test]
    fn flat_spectrum_integral_is_conserved_per_nm_and_per_um() {
        let per_nm: String = std::iter::once("wavelength_nm,irradiance_W_m2_nm\n".to_string())
            .chain((0..=40).map(|i| format!("{},1\n", 400 + 10 * i)))
            .collect();
        let per_um: String = std::iter::once("wavelength (um), irradiance (W m-2 um-1)\n".to_string())
            .chain((0..=40).map(|i| format!("{},1000\n", 0.4 + 0.01 * i as f64)))
            .collect();
        // the same data, in nm but with per-um values, and descending
        let mixed: String = std::iter::once("wavelength_nm;W/m2/um\n".to_string())
            .chain((0..=40).rev().map(|i| format!("{};1000\n", 400 + 10 * i)))
            .collect();
        for text in [&per_nm, &per_um, &mixed] {
            let s = parse(text).unwrap();
            assert_eq!(s.len(), 41);
            assert!(rel(s.total_power(), 400.0) < 1e-9, "{}", s.total_power());
        }
    }

    #[test]
    fn energy_file_matches_wavelength_file() {
        // constant photon flux per nm, 300..1000 nm every 1 nm; the energy file holds the same
        // points with the Jacobian |d lambda / dE| = lambda^2 / hc applied
        let f_nm = 2e18; // photons s^-1 m^-2 nm^-1
        let hc_ev_nm = HC / CHARGE * 1e9;
        let mut by_wavelength = String::from("wavelength_nm, photons/m2/s/nm\n");
        let mut by_energy = String::from("energy_eV, photon_flux_per_m2_s_eV\n");
        for l in 300..=1000 {
            let l = l as f64;
            by_wavelength.push_str(&format!("{l}, {f_nm:e}\n"));
            by_energy.push_str(&format!("{:e}, {:e}\n", hc_ev_nm / l, f_nm * l * l / hc_ev_nm));
        }
        let a = parse(&by_wavelength).unwrap();
        let b = parse(&by_energy).unwrap();
        assert_eq!(b.axis(), Axis::PhotonEnergy);
        let e2 = 2.0 * CHARGE;
        let (fa, fb) = (a.photon_flux_above(e2), b.photon_flux_above(e2));
        // photons above 2 eV: wavelengths 300 nm .. hc/2eV
        let exact = f_nm * (hc_ev_nm / 2.0 - 300.0);
        assert!(rel(fa, exact) < 1e-9, "{fa} {exact}");
        // 1e-3 allows for the trapezoid rule interpolating linearly in energy in one file and
        // in wavelength in the other (the actual difference here is far smaller)
        assert!(rel(fb, fa) < 1e-3, "{fa} {fb}");
        assert!(rel(b.total_photon_flux(), a.total_photon_flux()) < 1e-3);
    }

    // ---- robustness ----

    #[test]
    fn odd_inputs_do_not_panic() {
        let hints = [
            ColumnHints::default(),
            ColumnHints {
                axis: Some(AxisUnit::Electronvolt),
                value: Some(ValueUnit::photon_flux(AxisUnit::Electronvolt)),
                column: Some(3),
            },
        ];
        let inputs = [
            "",
            "\n\n\n",
            "#",
            "%%%",
            "//",
            ",,,,",
            ";;;",
            "\t\t",
            "\"",
            "\"\"\n\"",
            "(((",
            ")))",
            "[nm]",
            "wavelength (nm\n1,2\n3,4",
            "é,ü\n1,2\n",
            "µm,W/m²/µm\n1,1\n2,2\n",
            "1e308,1e308\n1.7e308,1e308\n",
            "1e-320 1\n2e-320 1\n",
            "\u{feff}",
            "1",
            "1,",
            ",1",
            "1 2 3 4 5 6 7 8\n",
            "x\ny\nz",
            "\u{0}\u{1}",
            "wavelength_nm,W/m2/nm\n1e-300,1e300\n2e-300,1e300\n",
            "wavelength_nm,W/m2/nm\n1,1e300\n1e300,1e300\n",
        ];
        for h in &hints {
            for t in inputs {
                let _ = parse_spectrum_csv(t, h, "x");
            }
        }
        for s in ["^", "m^", "m^(", "m^(-", "m^(-1", "(", ")", "/", "per", "per2", "1", "11/cm", "m99999", "#^2", "𝔪"]
        {
            let _ = ValueUnit::parse(s);
            let _ = AxisUnit::parse(s);
        }
    }

    #[test]
    fn overflowing_integrals_are_reported() {
        let e = err("wavelength_nm,W/m2/nm\n1,1e299\n1e300,1e299\n");
        assert!(e.message.contains("too large") || e.message.contains("overflows"), "{e}");
    }

    mod props {
        use super::super::*;
        use proptest::prelude::*;

        proptest! {
            #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

            #[test]
            fn never_panics(text in "[0-9a-zA-Z#%/;,\\t .eE+\\-\\n\\r()\\[\\]^_\"µ²]{0,120}") {
                let _ = parse_spectrum_csv(&text, &ColumnHints::default(), "p");
                let _ = ValueUnit::parse(&text);
                let _ = AxisUnit::parse(&text);
            }

            #[test]
            fn ascending_and_descending_files_agree(values in proptest::collection::vec(0.0f64..10.0, 2..30)) {
                let rows: Vec<String> = values.iter().enumerate().map(|(i, v)| format!("{},{v}", 400 + 5 * i)).collect();
                let up = format!("wavelength_nm,irradiance_W_m2_nm\n{}\n", rows.join("\n"));
                let rev: Vec<String> = rows.iter().rev().cloned().collect();
                let down = format!("wavelength_nm,irradiance_W_m2_nm\n{}\n", rev.join("\n"));
                let a = parse_spectrum_csv(&up, &ColumnHints::default(), "p").unwrap();
                let b = parse_spectrum_csv(&down, &ColumnHints::default(), "p").unwrap();
                prop_assert_eq!(a.coordinates(), b.coordinates());
                prop_assert_eq!(a.values(), b.values());
            }
        }
    }
}
