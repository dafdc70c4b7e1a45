//! The vocabulary of data-file headers: units of the spectral axis ([`AxisUnit`]), units of
//! spectral values ([`ValueUnit`], with the unit-expression reader behind it), what an
//! optical table measures ([`OpticalQuantity`], [`ValueKind`]), and how each is found in a
//! column name (`wavelength_nm`, `Irradiance (W m-2 nm-1)`, `emissivity (%)`).
//!
//! Architecture invariant: pure text-to-unit functions with no I/O and no knowledge of any
//! front end; a name that cannot be read is `None`, never a guess, and nothing here panics on
//! any input. The table readers (`table`, `spectrum_csv`, `emissivity_csv`, `eqe_csv`) import
//! this module; it imports none of them.

use std::fmt;

use crate::physics::constants::CHARGE;
use crate::physics::spectrum::{Axis, Quantity};

/// Accepted axis units, for help texts and hints.
pub const AXIS_UNITS_HELP: &str = "nm, um, eV or cm-1";
/// Accepted value units, for help texts.
pub const VALUE_UNITS_HELP: &str = "W/m2/nm, W/m2/um, W/m2/eV, W/m2/cm-1, photons/m2/s/nm, \
photons/m2/s/um, photons/m2/s/eV or photons/m2/s/cm-1, each also with cm2 in place of m2";

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

/// ASCII letters in lower case (other letters as typed: unit names are ASCII but for the
/// micro sign, and the page then needs no Unicode case tables), with micro signs as `u`, superscript digits and signs as plain ones, unicode
/// minus signs and dots as their ASCII counterparts and `**` as `^`.
pub(crate) fn normalize_unit_text(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            'µ' | 'μ' | 'Μ' => out.push('u'),
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
            c => out.push(c.to_ascii_lowercase()),
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

/// The most words a unit spans in a column name ("photons m-2 s-1 nm-1" is four).
const MAX_UNIT_WORDS: usize = 12;

/// The word tails of a column name that may be its unit, longest first: its last 1 to
/// [`MAX_UNIT_WORDS`] words (never all of them), joined by `sep`. The cap keeps a long
/// header line linear: every tail of thousands of words would be quadratic.
pub(crate) fn unit_tails(words: &[&str], sep: &str) -> Vec<String> {
    let first = words.len().saturating_sub(MAX_UNIT_WORDS).max(1);
    (first..words.len()).filter_map(|i| words.get(i..)).map(|w| w.join(sep)).collect()
}

/// The axis unit a column name carries, if any: `wavelength_nm`, `Wavelength (nm)`,
/// `lambda [um]`, `energy/eV`, `wavenumber (cm-1)`. A bare quantity name such as
/// `wavenumber` does not count as a unit here.
pub(crate) fn axis_unit_from_name(name: &str) -> Option<AxisUnit> {
    let is_bare_name = |s: &str| {
        let t = s.trim().to_ascii_lowercase();
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
pub(crate) fn value_unit_from_name(name: &str) -> Option<ValueUnit> {
    let words = name_words(name);
    let mut candidates: Vec<String> = vec![name.to_string()];
    candidates.extend(bracket_contents(name).into_iter().map(str::to_string));
    candidates.extend(unit_tails(&words, " "));
    if let Some(u) = candidates.iter().find_map(|c| ValueUnit::parse(c)) {
        return Some(u);
    }
    // "photon_flux_per_m2_s_eV": the counted thing is named in words, the rest is a unit
    let lower = name.to_ascii_lowercase();
    let lower_words: Vec<&str> = lower
        .split(|c: char| c.is_ascii() && !c.is_ascii_alphanumeric() && c != '#')
        .filter(|w| !w.is_empty())
        .collect();
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
// What an optical table measures
// ---------------------------------------------------------------------------------------------

/// What a column of an optical table measures.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OpticalQuantity {
    Emissivity,
    Absorptance,
    Reflectance,
    Transmittance,
}

impl OpticalQuantity {
    pub fn label(self) -> &'static str {
        match self {
            OpticalQuantity::Emissivity => "emissivity",
            OpticalQuantity::Absorptance => "absorptance",
            OpticalQuantity::Reflectance => "reflectance",
            OpticalQuantity::Transmittance => "transmittance",
        }
    }

    /// Recognise the quantity in a word: emissivity/emittance, absorptance/absorptivity (not
    /// absorbance, which is a logarithm), reflectance/reflectivity,
    /// transmittance/transmissivity/transmission. Case is ignored.
    pub fn from_word(word: &str) -> Option<OpticalQuantity> {
        let w = word.to_ascii_lowercase();
        if w.starts_with("emissiv") || w.starts_with("emitt") {
            Some(OpticalQuantity::Emissivity)
        } else if w.starts_with("absorpt") {
            Some(OpticalQuantity::Absorptance)
        } else if w.starts_with("reflect") {
            Some(OpticalQuantity::Reflectance)
        } else if w.starts_with("transmi") {
            Some(OpticalQuantity::Transmittance)
        } else {
            None
        }
    }
}

impl fmt::Display for OpticalQuantity {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.label())
    }
}

/// A value column: what it measures and whether in percent.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ValueKind {
    pub quantity: OpticalQuantity,
    pub percent: bool,
}

impl ValueKind {
    /// Read `reflectance`, `emissivity%`, `absorptance (%)`, `transmittance percent`, ...
    pub fn parse(text: &str) -> Option<ValueKind> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        let percent = lower.contains('%') || lower.contains("percent");
        let quantity = lower
            .split(|c: char| c.is_ascii() && !c.is_ascii_alphabetic())
            .filter(|w| !w.is_empty())
            .find_map(OpticalQuantity::from_word)?;
        Some(ValueKind { quantity, percent })
    }

    /// The column header's kind, if its name says one.
    pub(crate) fn from_name(name: &str) -> Option<ValueKind> {
        ValueKind::parse(name).or_else(|| name_words(name).into_iter().find_map(ValueKind::parse))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
    fn optical_kinds_from_names() {
        let k = ValueKind::from_name("Emissivity (%)").unwrap();
        assert_eq!((k.quantity, k.percent), (OpticalQuantity::Emissivity, true));
        let k = ValueKind::from_name("total_hemispherical_reflectance").unwrap();
        assert_eq!((k.quantity, k.percent), (OpticalQuantity::Reflectance, false));
        assert_eq!(ValueKind::parse("transmission percent").map(|k| k.percent), Some(true));
        // absorbance is a logarithm, not a fraction
        assert_eq!(ValueKind::parse("absorbance"), None);
        assert_eq!(ValueKind::from_name("value"), None);
    }

    #[test]
    fn odd_unit_texts_do_not_panic() {
        for s in ["^", "m^", "m^(", "m^(-", "m^(-1", "(", ")", "/", "per", "per2", "1", "11/cm", "m99999", "#^2", "𝔪"]
        {
            let _ = ValueUnit::parse(s);
            let _ = AxisUnit::parse(s);
            let _ = ValueKind::parse(s);
        }
    }

    mod props {
        use super::super::*;
        use proptest::prelude::*;

        proptest! {
            #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

            #[test]
            fn never_panics(text in "[0-9a-zA-Z#%/;,\\t .eE+\\-()\\[\\]^_\"µ²⁻¹]{0,80}") {
                let _ = ValueUnit::parse(&text);
                let _ = AxisUnit::parse(&text);
                let _ = axis_unit_from_name(&text);
                let _ = value_unit_from_name(&text);
                let _ = ValueKind::from_name(&text);
            }
        }
    }
}
