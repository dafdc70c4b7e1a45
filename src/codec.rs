//! Scenario documents: the saved state, the scenario file and the share link are one
//! versioned JSON document. The link carries it in the URL fragment as
//! `#g<version>.<base64url(deflate(json))>`, so nothing is sent to any server.
//!
//! Decoding never trusts its input: the compressed size and the decoded size are capped,
//! the version is checked before the body is read, and every failure says what was wrong
//! with the link and what the user can do. [`open`] is the one way in for people's links and
//! files: decode, then check the whole scenario.
//!
//! Architecture invariant: every front end opens links and files through [`open`], so a
//! scenario that opens is one every panel can compute.

use crate::formats::table::quoted;
use crate::scenario::Scenario;
use serde::{Deserialize, Serialize};

/// The document version written by this build. Readers accept this and older versions.
pub const FORMAT_VERSION: u32 = 1;
/// The `format` field of a scenario file.
pub const FORMAT_NAME: &str = "glowgap-scenario";
/// Largest encoded fragment accepted (characters).
pub const MAX_LINK_CHARS: usize = 1_500_000;
/// Largest decoded document accepted (bytes), guarding against decompression bombs.
pub const MAX_DOCUMENT_BYTES: usize = 4_000_000;

/// A scenario with its envelope.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Document {
    pub format: String,
    pub version: u32,
    pub scenario: Scenario,
}

impl Document {
    pub fn new(scenario: Scenario) -> Document {
        Document { format: FORMAT_NAME.to_string(), version: FORMAT_VERSION, scenario }
    }
}

/// Why a link or file could not be read. The message is for people.
#[derive(Debug, Clone, PartialEq)]
pub struct LinkError(pub String);

impl std::fmt::Display for LinkError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

/// The scenario as a pretty JSON file.
pub fn to_json(scenario: &Scenario) -> String {
    serde_json::to_string_pretty(&Document::new(scenario.clone())).unwrap_or_default()
}

/// Read a scenario file (the JSON document). Also accepts a bare scenario object.
pub fn from_json(text: &str) -> Result<Scenario, LinkError> {
    if text.len() > MAX_DOCUMENT_BYTES {
        return Err(LinkError(format!(
            "the scenario file is {} bytes, more than the {} accepted",
            text.len(),
            MAX_DOCUMENT_BYTES
        )));
    }
    let value: serde_json::Value = serde_json::from_str(text).map_err(|e| LinkError(not_json(&e)))?;
    if let Some(v) = value.get("version") {
        let v = v.as_u64().unwrap_or(u64::MAX);
        if v > FORMAT_VERSION as u64 {
            return Err(LinkError(format!(
                "the scenario was written by a newer Glowgap (format version {v}; this one reads up to {FORMAT_VERSION}); update Glowgap to open it"
            )));
        }
        if let Some(f) = value.get("format").and_then(|f| f.as_str()) {
            if f != FORMAT_NAME {
                return Err(LinkError(format!("this file is a {}, not a Glowgap scenario", quoted(f))));
            }
        }
        let doc: Document = serde_json::from_value(value)
            .map_err(|e| LinkError(format!("the scenario does not fit this version of Glowgap: {}", detail(&e))))?;
        Ok(doc.scenario)
    } else {
        serde_json::from_value::<Scenario>(value)
            .map_err(|e| LinkError(format!("the file is not a Glowgap scenario: {}", detail(&e))))
    }
}

/// Longest part of a JSON reader's message that is shown (characters).
const MAX_DETAIL_CHARS: usize = 300;

/// A JSON reader's message on one line, shortened to [`MAX_DETAIL_CHARS`]: it may quote the
/// file's own text.
fn detail(e: &serde_json::Error) -> String {
    let text = e.to_string();
    let mut out: String = text.chars().take(MAX_DETAIL_CHARS).map(|c| if c.is_control() { ' ' } else { c }).collect();
    if text.chars().count() > MAX_DETAIL_CHARS {
        out.push_str("...");
    }
    out
}

/// Why a text that should be a scenario file is not JSON, in words for people.
fn not_json(e: &serde_json::Error) -> String {
    let text = e.to_string();
    let at = format!("line {}, column {}", e.line(), e.column());
    if text.starts_with("recursion limit exceeded") {
        format!(
            "the scenario file nests brackets too deeply (more than 128 levels, at {at}); a Glowgap scenario \
             nests only a few, so this is not one: save the scenario again from Glowgap"
        )
    } else if text.starts_with("number out of range") {
        format!(
            "the scenario file holds a number too large for any setting (at {at}, e.g. 1e999); \
             write the value in its usual units, or save the scenario again from Glowgap"
        )
    } else {
        format!("the scenario file is not valid JSON ({}); save it again from Glowgap", detail(e))
    }
}

/// The URL fragment for a scenario, starting with '#'.
pub fn encode_fragment(scenario: &Scenario) -> String {
    let json = serde_json::to_vec(&Document::new(scenario.clone())).unwrap_or_default();
    let packed = miniz_oxide::deflate::compress_to_vec(&json, 9);
    format!("#g{FORMAT_VERSION}.{}", base64url_encode(&packed))
}

/// Read a scenario from a share link: a whole URL, or just its fragment (with or without
/// the leading '#').
pub fn decode_link(link: &str) -> Result<Scenario, LinkError> {
    let text = link.trim();
    let frag = match text.find('#') {
        Some(i) => &text[i + 1..],
        None => text,
    };
    if frag.is_empty() {
        return Err(LinkError("the link has no scenario in it (nothing after '#')".into()));
    }
    if frag.len() > MAX_LINK_CHARS {
        return Err(LinkError(format!(
            "the link is {} characters long, more than the {MAX_LINK_CHARS} accepted",
            frag.len()
        )));
    }
    let Some(rest) = frag.strip_prefix('g') else {
        return Err(LinkError("this is not a Glowgap scenario link (it should contain '#g1.')".into()));
    };
    let Some((ver, body)) = rest.split_once('.') else {
        return Err(LinkError(
            "the link is cut short: its version mark is incomplete; copy the whole link again".into(),
        ));
    };
    let version: u32 = ver.parse().map_err(|_| {
        LinkError(format!(
            "the link's version mark {} is garbled; copy the whole link again",
            quoted(&format!("g{ver}"))
        ))
    })?;
    if version > FORMAT_VERSION {
        return Err(LinkError(format!(
            "the link was made by a newer Glowgap (format version {version}; this one reads up to {FORMAT_VERSION}); open it with a current Glowgap"
        )));
    }
    if version == 0 {
        return Err(LinkError("the link's version mark 'g0' is not one Glowgap ever wrote".into()));
    }
    // a link broken across lines (by a mail program, say) is still the same link
    let body: String = body.chars().filter(|c| !c.is_ascii_whitespace()).collect();
    let packed = base64url_decode(&body)
        .map_err(|e| LinkError(format!("the link is garbled ({e}); copy the whole link again")))?;
    let json = miniz_oxide::inflate::decompress_to_vec_with_limit(&packed, MAX_DOCUMENT_BYTES).map_err(|e| match e
        .status
    {
        miniz_oxide::inflate::TINFLStatus::HasMoreOutput => LinkError(format!(
            "the link unpacks to more than {MAX_DOCUMENT_BYTES} bytes, more than any scenario needs; it was refused"
        )),
        _ => LinkError("the link is damaged or cut short (its data does not unpack); copy the whole link again".into()),
    })?;
    let text = std::str::from_utf8(&json)
        .map_err(|_| LinkError("the link's data is not text; copy the whole link again".into()))?;
    from_json(text)
}

/// Open a scenario from what a person gives: a share link (a whole URL, or its fragment with
/// or without the '#') or the text of a scenario file (JSON, a leading byte-order mark
/// allowed). The scenario is decoded ([`decode`]) and then checked as a whole
/// ([`Scenario::check`]), so what opens can be computed in every panel. Returns the scenario
/// and the warnings worth showing; the error says what is wrong with the link or file, or
/// which setting is out of range.
pub fn open(text: &str) -> Result<(Scenario, Vec<String>), LinkError> {
    let mut scenario = decode(text)?;
    // a material's gap at the scenario's cell temperature, whatever the file says
    scenario.cell.sync_gap();
    let warnings = scenario.check_with_warnings().map_err(LinkError)?;
    Ok((scenario, warnings))
}

/// Decode a share link, a fragment or a scenario file's text, as [`open`] does, without
/// checking the values: for a front end that must first replace `file:` references in a
/// scenario file by the tables they name, then call [`Scenario::check_with_warnings`].
pub fn decode(text: &str) -> Result<Scenario, LinkError> {
    let t = text.trim_start_matches('\u{feff}').trim();
    if t.is_empty() {
        Err(LinkError("there is nothing to open; give a share link or a scenario file".into()))
    } else if t.starts_with('{') {
        from_json(t)
    } else {
        decode_link(t)
    }
}

const B64: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

/// RFC 4648 section 5 base64url, without padding.
pub fn base64url_encode(data: &[u8]) -> String {
    let mut out = String::with_capacity(data.len().div_ceil(3) * 4);
    for chunk in data.chunks(3) {
        let b = [chunk[0], *chunk.get(1).unwrap_or(&0), *chunk.get(2).unwrap_or(&0)];
        let n = (b[0] as u32) << 16 | (b[1] as u32) << 8 | b[2] as u32;
        let chars = chunk.len() + 1;
        for i in 0..chars {
            out.push(B64[((n >> (18 - 6 * i)) & 63) as usize] as char);
        }
    }
    out
}

/// Inverse of [`base64url_encode`]; also accepts '=' padding and the '+' '/' alphabet.
pub fn base64url_decode(text: &str) -> Result<Vec<u8>, String> {
    let text = text.trim_end_matches('=');
    let mut out = Vec::with_capacity(text.len() * 3 / 4);
    let mut acc: u32 = 0;
    let mut bits = 0;
    for (i, c) in text.bytes().enumerate() {
        let v = match c {
            b'A'..=b'Z' => c - b'A',
            b'a'..=b'z' => c - b'a' + 26,
            b'0'..=b'9' => c - b'0' + 52,
            b'-' | b'+' => 62,
            b'_' | b'/' => 63,
            _ => return Err(bad_character(text, i)),
        };
        acc = (acc << 6) | v as u32;
        bits += 6;
        if bits >= 8 {
            bits -= 8;
            out.push((acc >> bits) as u8);
            acc &= (1 << bits) - 1;
        }
    }
    if bits >= 6 {
        return Err("its length is not possible for encoded data".into());
    }
    Ok(out)
}

/// Which character at byte `at` of `text` cannot be in a link: its position in characters,
/// and the character itself, or its code point when it cannot be shown on one line.
fn bad_character(text: &str, at: usize) -> String {
    let position = text.get(..at).map_or(at, |head| head.chars().count()) + 1;
    let shown = match text.get(at..).and_then(|rest| rest.chars().next()) {
        Some(c) if !c.is_control() && !c.is_whitespace() => format!("'{c}'"),
        Some(c) => format!("U+{:04X}", c as u32),
        None => "a broken character".into(),
    };
    format!("character {position} ({shown}) cannot appear in a link")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base64url_matches_rfc4648_vectors() {
        // RFC 4648 section 10 test vectors (base64; same alphabet for these inputs), no padding
        for (plain, enc) in [
            ("", ""),
            ("f", "Zg"),
            ("fo", "Zm8"),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg"),
            ("fooba", "Zm9vYmE"),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(base64url_encode(plain.as_bytes()), enc);
            assert_eq!(base64url_decode(enc).unwrap(), plain.as_bytes());
        }
    }
}
