//! The table scanner that every data-file reader shares: lines, comments, separators, the
//! header, the data lines as numbers along one axis, and the typed error every reader
//! returns.
//!
//! # Layout
//!
//! - One point per line: the spectral coordinate in the first field (column 0), values in
//!   the following fields (columns 1, 2, ...).
//! - Fields are separated by commas, semicolons, tabs or runs of spaces; the separator is
//!   chosen once per file from its first data line.
//! - Blank lines are skipped. A line whose first visible character starts `#`, `%` or `//`
//!   is a comment; on a data line, anything from `#` (or `%`, `//`) on is a comment.
//! - The first non-comment line is a header if its first field is not a number.
//!
//! # Errors
//!
//! A [`TableError`] says what is wrong, on which line, in words that fit every front end; its
//! [`Hint`] says *which setting* would fix it (the axis unit, the value unit, the value column,
//! what an optical column holds, or another input for the file). Each front end words the
//! hint as its own control: the command line as its option, the page as a header line to
//! write (`view::hints`).
//!
//! Architecture invariant: messages never name a command-line option or a page control; the
//! scanner imports only the unit vocabulary (`units`) and knows no reader; it never panics on
//! any input.

use std::fmt;

use super::units::{AxisUnit, OpticalQuantity};

// ---------------------------------------------------------------------------------------------
// Errors and hints
// ---------------------------------------------------------------------------------------------

/// The kinds of table the readers read; says what the values are called and which header
/// line would describe such a file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum TableKind {
    /// a spectral irradiance or photon flux (`spectrum_csv`)
    Spectrum,
    /// an emitter's emissivity, absorptance or reflectance (`emissivity_csv`)
    Emissivity,
    /// the sky's zenith transmittance (`emissivity_csv`)
    Transmittance,
    /// a quantum efficiency or spectral response (`eqe_csv`)
    QuantumEfficiency,
}

impl TableKind {
    /// What the values are, plural, e.g. "spectral values".
    pub fn values(self) -> &'static str {
        match self {
            TableKind::Spectrum => "spectral values",
            TableKind::Emissivity => "emissivities, absorptances and reflectances",
            TableKind::Transmittance => "transmittances",
            TableKind::QuantumEfficiency => "quantum efficiencies",
        }
    }

    /// One table, with its article, e.g. "a spectrum".
    pub fn table(self) -> &'static str {
        match self {
            TableKind::Spectrum => "a spectrum",
            TableKind::Emissivity => "an emissivity table",
            TableKind::Transmittance => "a transmittance table",
            TableKind::QuantumEfficiency => "a quantum-efficiency table",
        }
    }

    /// A header line that names the units of such a file.
    pub fn example_header(self) -> &'static str {
        match self {
            TableKind::Spectrum => "wavelength_nm,irradiance_W_m2_nm",
            TableKind::Emissivity => "wavelength_um,reflectance",
            TableKind::Transmittance => "wavelength_um,transmittance",
            TableKind::QuantumEfficiency => "wavelength_nm,eqe_percent",
        }
    }
}

/// Which setting would fix a table that cannot be read as it is. Front ends word it as
/// their own control (an option on the command line, a header line on the page).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Hint {
    /// The unit of the spectral axis (column 0), one of `accepted`.
    AxisUnit { accepted: &'static [AxisUnit] },
    /// The unit of a spectrum's values: a density per a unit of the axis's kind, e.g.
    /// W/m2/nm (`units::VALUE_UNITS_HELP` lists them).
    ValueUnit,
    /// Both units, axis and values, which have to be read together.
    Units,
    /// Which column holds the values, counting the axis as column 0.
    ValueColumn,
    /// What an optical table's value column holds, one of `accepted`, optionally in percent.
    ValueKind { accepted: &'static [OpticalQuantity] },
    /// The file holds another kind of table and belongs to the input for that kind.
    OtherTable(TableKind),
}

/// A problem with a data file: what is wrong, the 1-based line of the file where it applies,
/// and which setting would fix it. `Display` shows the line and the message; the front end
/// adds the hint in its own words.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TableError {
    pub line: Option<usize>,
    pub message: String,
    pub hint: Option<Hint>,
}

impl TableError {
    pub(crate) fn at(line: usize, message: impl Into<String>) -> TableError {
        TableError { line: Some(line), message: message.into(), hint: None }
    }
    pub(crate) fn general(message: impl Into<String>) -> TableError {
        TableError { line: None, message: message.into(), hint: None }
    }
    /// At `line` if there is one, else for the whole file.
    pub(crate) fn maybe_at(line: Option<usize>, message: impl Into<String>) -> TableError {
        TableError { line, message: message.into(), hint: None }
    }
    pub(crate) fn with_hint(self, hint: Hint) -> TableError {
        TableError { hint: Some(hint), ..self }
    }
}

impl fmt::Display for TableError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.line {
            Some(n) => write!(f, "line {n}: {}", self.message),
            None => f.write_str(&self.message),
        }
    }
}

impl std::error::Error for TableError {}

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
// The scanner
// ---------------------------------------------------------------------------------------------

struct DataLine<'a> {
    line: usize,
    content: &'a str,
}

struct Context {
    sep: Separator,
    sep_line: usize,
    value_col: usize,
}

/// A table file split into its header and data lines, not yet read as numbers.
pub(crate) struct TableScan<'a> {
    /// line of the header, if the file has one
    pub header_line: Option<usize>,
    /// column names from the header (empty without one)
    pub names: Vec<String>,
    /// fields on the first data line
    pub ncols: usize,
    /// the whole text, read again by `read_points`
    text: &'a str,
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

/// Refuse column 0 as the value column: it holds the axis.
pub(crate) fn check_value_column(value_col: usize) -> Result<(), TableError> {
    if value_col == 0 {
        return Err(TableError::general(
            "column 0 holds the spectral axis and cannot also be the value column; columns count from the axis (0), \
             so the first value column is 1",
        )
        .with_hint(Hint::ValueColumn));
    }
    Ok(())
}

/// The lines of a table that hold something: (1-based line, trimmed text), blank lines and
/// comment lines left out. Lines end at '\n' (a '\r' before it is trimmed), or at lone '\r'
/// in a file without any '\n'.
fn content_lines(text: &str) -> impl Iterator<Item = (usize, &str)> + '_ {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let end = if text.contains('\n') { '\n' } else { '\r' };
    text.split(end)
        .enumerate()
        .map(|(idx, raw)| (idx + 1, raw.trim()))
        .filter(|(_, t)| !t.is_empty() && !is_comment_line(t))
}

/// The data lines of a table without their comments: every content line after the header
/// (if `has_header`, the first content line is the header).
fn data_lines(text: &str, has_header: bool) -> impl Iterator<Item = DataLine<'_>> + '_ {
    content_lines(text).skip(usize::from(has_header)).filter_map(|(line, t)| {
        let content = strip_data_comment(t).trim();
        (!content.is_empty()).then_some(DataLine { line, content })
    })
}

/// Find the header and the first data line of a table (see the module documentation for the
/// layout). The data lines are not stored: [`TableScan::read_points`] reads them from the
/// text in one pass, so a table of millions of lines costs only its numbers.
pub(crate) fn scan_table(text: &str) -> Result<TableScan<'_>, TableError> {
    let header = content_lines(text)
        .next()
        .filter(|(_, t)| !first_field_is_number(t))
        .map(|(line, t)| (line, strip_header_comment(t)));
    let Some(first) = data_lines(text, header.is_some()).next() else {
        let msg = "no data lines: the file needs at least two lines of numbers \
                   (spectral coordinate, then value), e.g. '400,1.2'";
        return Err(match header {
            Some((h, _)) => TableError::at(h, format!("{msg}; only a header was found on this line")),
            None => TableError::general(msg),
        });
    };
    let sep = Separator::detect(first.content);
    let ncols = split_fields(first.content, sep, false).len();
    let names = header.map(|(_, h)| header_names(h, sep, ncols)).unwrap_or_default();
    Ok(TableScan { header_line: header.map(|(h, _)| h), names, ncols, text, sep, first_line: first.line })
}

impl TableScan<'_> {
    /// Refuse a header with more names than the data has columns when units are to be read
    /// from it (`needs_header`).
    pub(crate) fn check_header_width(&self, needs_header: bool) -> Result<(), TableError> {
        if let Some(h) = self.header_line {
            if needs_header && self.names.len() > self.ncols {
                return Err(TableError::at(
                    h,
                    format!(
                        "the header names {} columns but the first data line (line {}) has {}, \
                         so the units cannot be matched to columns; write one name per column, \
                         separated by {} like the data",
                        self.names.len(),
                        self.first_line,
                        self.ncols,
                        self.sep.describe(),
                    ),
                )
                .with_hint(Hint::Units));
            }
        }
        Ok(())
    }

    /// Every data line as numbers: (1-based line, its fields read as numbers), each line
    /// with at least `columns` fields, all finite. For tables whose columns are read
    /// together (such as n and k).
    pub(crate) fn read_rows(&self, columns: usize) -> Result<Vec<(usize, Vec<f64>)>, TableError> {
        let ctx = Context { sep: self.sep, sep_line: self.first_line, value_col: 1 };
        let mut out = Vec::new();
        for d in data_lines(self.text, self.header_line.is_some()) {
            let fields = split_fields(d.content, self.sep, false);
            if fields.len() < columns {
                return Err(TableError::at(
                    d.line,
                    format!(
                        "{} field(s) separated by {}, but every data line needs {columns}",
                        fields.len(),
                        self.sep.describe()
                    ),
                ));
            }
            let mut row = Vec::with_capacity(columns);
            for (i, f) in fields.iter().take(columns).enumerate() {
                row.push(read_field(f, d.line, i, &ctx)?);
            }
            out.push((d.line, row));
        }
        Ok(out)
    }

    /// Read the axis (column 0) and the value column `value_col` of every data line:
    /// finite numbers, a positive axis, non-negative values, no repeated axis value, one
    /// direction throughout. Returned ascending along the axis.
    pub(crate) fn read_points(&self, value_col: usize, kind: TableKind) -> Result<TablePoints, TableError> {
        let ctx = Context { sep: self.sep, sep_line: self.first_line, value_col };
        let mut xs: Vec<f64> = Vec::new();
        let mut ys: Vec<f64> = Vec::new();
        let mut line_of: Vec<usize> = Vec::new();
        let mut direction: Option<(bool, usize)> = None; // (ascending, first line)
        let mut prev: Option<(f64, usize, &str)> = None;
        for d in data_lines(self.text, self.header_line.is_some()) {
            let fields = split_fields(d.content, self.sep, false);
            let x_text = fields.first().copied().unwrap_or("");
            let x = read_field(x_text, d.line, 0, &ctx)?;
            let Some(&y_text) = fields.get(value_col) else {
                return Err(TableError::at(
                    d.line,
                    format!(
                        "no value in column {value_col}: the line has {} field(s) separated by {}; \
                         every data line needs the axis value (column 0) and the value column",
                        fields.len(),
                        self.sep.describe(),
                    ),
                )
                .with_hint(Hint::ValueColumn));
            };
            let y = read_field(y_text, d.line, value_col, &ctx)?;
            if x <= 0.0 {
                return Err(TableError::at(
                    d.line,
                    format!(
                        "the axis value {} is zero or negative; wavelengths, photon energies and \
                         wavenumbers must be positive, so correct or remove this line",
                        quoted(x_text)
                    ),
                ));
            }
            if y < 0.0 {
                return Err(TableError::at(
                    d.line,
                    format!(
                        "the value {} in column {value_col} is negative; {} must be zero \
                         or positive (replace small negative noise by 0)",
                        quoted(y_text),
                        kind.values()
                    ),
                ));
            }
            if let Some((px, pline, ptext)) = prev {
                if x == px {
                    return Err(TableError::at(
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
                        return Err(TableError::at(
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
            return Err(TableError::at(
                only,
                format!("this is the only data line; {} needs at least two points, so add more lines", kind.table()),
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
pub(crate) fn check_distinct(xs: &[f64], line_of: &[usize]) -> Result<(), TableError> {
    for (i, w) in xs.windows(2).enumerate() {
        if let [a, b] = w {
            if b <= a {
                let l1 = line_of.get(i).copied().unwrap_or(0);
                let l2 = line_of.get(i + 1).copied().unwrap_or(0);
                return Err(TableError::at(
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

/// One number of a data line (column `col`), finite.
fn read_field(text: &str, line: usize, col: usize, ctx: &Context) -> Result<f64, TableError> {
    if text.is_empty() {
        return Err(TableError::at(
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
            && text.chars().any(|c| (c.is_ascii_alphabetic() || !c.is_ascii()) && !matches!(c, 'e' | 'E' | 'd' | 'D'))
        {
            msg.push_str("; give units in the header, not beside the numbers");
        }
        return Err(TableError::at(line, msg));
    };
    if !v.is_finite() {
        return Err(TableError::at(
            line,
            format!(
                "{} in column {col} is not a finite number; replace it by a number or remove the line",
                quoted(text)
            ),
        ));
    }
    Ok(v)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn points(text: &str) -> Result<TablePoints, TableError> {
        scan_table(text)?.read_points(1, TableKind::Spectrum)
    }

    fn err(text: &str) -> TableError {
        match points(text) {
            Ok(p) => panic!("expected an error, got {} points", p.xs.len()),
            Err(e) => e,
        }
    }

    #[test]
    fn header_is_found_and_split_like_the_data() {
        let scan = scan_table("# note\nWavelength (nm)  Irradiance (W m-2 nm-1)\n400 1\n500 1\n").unwrap();
        assert_eq!(scan.header_line, Some(2));
        assert_eq!(scan.names, vec!["Wavelength (nm)", "Irradiance (W m-2 nm-1)"]);
        assert_eq!(scan.ncols, 2);
        // quoted spreadsheet export, header separated differently from the data
        let scan = scan_table("\"wavelength_nm\",\"irradiance_W_m2_nm\"\n400 1\n500 1\n").unwrap();
        assert_eq!(scan.names, vec!["wavelength_nm", "irradiance_W_m2_nm"]);
        let scan = scan_table("400,1\n500,1\n").unwrap();
        assert_eq!(scan.header_line, None);
        assert!(scan.names.is_empty());
    }

    #[test]
    fn separators_semicolon_tab_and_whitespace() {
        for text in [
            "# semicolons\nwavelength_nm;irradiance_W_m2_nm\n400;1.0\n450;1.0;\n500 ; 1.0\n",
            "wavelength_nm   irradiance_W_m2_nm\n  400    1.0\n\t450  1.0\n500 1.0   \n",
            "wavelength_nm\tirradiance_W_m2_nm\n400\t1.0\n450\t1.0\n500\t 1.0\n",
        ] {
            let p = points(text).unwrap();
            assert_eq!(p.xs, vec![400.0, 450.0, 500.0], "{text:?}");
            assert_eq!(p.ys, vec![1.0; 3], "{text:?}");
        }
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
        let scan = scan_table(text).unwrap();
        assert_eq!(scan.header_line, Some(5));
        assert_eq!(scan.names, vec!["wavelength_nm", "irradiance_W_m2_nm"]);
        let p = scan.read_points(1, TableKind::Spectrum).unwrap();
        assert_eq!((p.xs, p.ys, p.line_of), (vec![400.0, 500.0, 600.0], vec![1.0; 3], vec![6, 9, 10]));
        // lone carriage returns as line ends
        assert_eq!(points("wavelength_nm,irradiance_W_m2_nm\r400,1\r500,1\r").unwrap().xs.len(), 2);
        // a '#' inside a unit is not a comment
        let scan = scan_table("wavenumber (cm-1), #/s/m^2/cm^-1\n1000,1e20\n2000,1e20\n").unwrap();
        assert_eq!(scan.names[1], "#/s/m^2/cm^-1");
    }

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
    fn missing_value_column_points_at_the_column_setting() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500\n600,1\n");
        assert_eq!(e.line, Some(3));
        assert!(e.message.contains("no value in column 1"), "{e}");
        assert_eq!(e.hint, Some(Hint::ValueColumn));
        let e = check_value_column(0).unwrap_err();
        assert_eq!((e.line, e.hint), (None, Some(Hint::ValueColumn)));
        assert!(check_value_column(1).is_ok());
    }

    #[test]
    fn header_wider_than_the_data_points_at_the_units() {
        let scan = scan_table("Wavelength nm Irradiance W/m2/nm\n400 1\n500 1\n").unwrap();
        let e = scan.check_header_width(true).unwrap_err();
        assert_eq!((e.line, e.hint), (Some(1), Some(Hint::Units)));
        assert!(e.message.contains("4 columns"), "{e}");
        assert!(scan.check_header_width(false).is_ok());
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
        assert!(e.message.contains("negative") && e.message.contains("spectral values"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n0,1\n500,1\n");
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("zero or negative"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n-500,1\n");
        assert_eq!(e.line, Some(3));
        // negative zero is zero
        let p = points("wavelength_nm,irradiance_W_m2_nm\n400,-0\n500,1\n").unwrap();
        assert!(p.ys.iter().all(|v| v.is_sign_positive()));
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
        let e = check_distinct(&[1.0, 2.0, 2.0], &[5, 6, 7]).unwrap_err();
        assert_eq!(e.line, Some(7));
        assert!(e.message.contains("lines 6 and 7"), "{e}");
    }

    #[test]
    fn one_direction_and_descending_files_are_reversed() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,1\n600,1\n550,1\n700,1\n");
        assert_eq!(e.line, Some(5));
        assert!(e.message.contains("ascends from line 2"), "{e}");
        let e = err("wavelength_nm,irradiance_W_m2_nm\n700,1\n600,1\n650,1\n");
        assert_eq!(e.line, Some(4));
        assert!(e.message.contains("descends"), "{e}");
        let p = points("x,y\n700,3\n600,2\n500,1\n").unwrap();
        assert_eq!((p.xs, p.ys, p.line_of), (vec![500.0, 600.0, 700.0], vec![1.0, 2.0, 3.0], vec![4, 3, 2]));
    }

    #[test]
    fn long_tables_are_read_whole() {
        // no cap on the number of lines: memory goes to the numbers only
        let text: String = (1..=300_000).map(|i| format!("{i} 1\n")).collect();
        let p = scan_table(&text).unwrap().read_points(1, TableKind::Spectrum).unwrap();
        assert_eq!((p.xs.len(), p.line_of.last().copied()), (300_000, Some(300_000)));
    }

    #[test]
    fn error_display_is_one_line() {
        let e = err("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,x\u{7}y\n");
        let shown = e.to_string();
        assert!(shown.starts_with("line 3: "), "{shown}");
        assert!(!shown.contains('\n') && !shown.contains('\u{7}'));
        assert_eq!(TableError::general("plain").to_string(), "plain");
        let long = format!("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,{}\n", "z".repeat(10_000));
        assert!(err(&long).to_string().len() < 400);
    }

    #[test]
    fn messages_name_no_option() {
        // every message of the scanner is for any front end; options are the hints' business
        for text in
            ["", "x,y\n400,1\n500\n", "x y z w\n1 2\n3 4\n", "x;y\n1;2\n3,4\n", "x,y\n1,1\n1,1\n", "x,y\n1,-1\n2,1\n"]
        {
            let e = match scan_table(text) {
                Err(e) => e,
                Ok(s) => match s.check_header_width(true).and_then(|_| s.read_points(1, TableKind::Spectrum)) {
                    Err(e) => e,
                    Ok(_) => panic!("{text:?} should fail"),
                },
            };
            assert!(!e.message.contains("--"), "{text:?}: {e}");
        }
    }

    mod props {
        use super::super::*;
        use proptest::prelude::*;

        proptest! {
            #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

            #[test]
            fn never_panics(text in "[0-9a-zA-Z#%/;,\\t .eE+\\-\\n\\r()\\[\\]^_\"µ²]{0,120}", col in 0usize..4) {
                if let Ok(scan) = scan_table(&text) {
                    let _ = scan.check_header_width(true);
                    let _ = scan.read_points(col, TableKind::Emissivity);
                }
            }
        }
    }
}
