//! Data tables as the page takes them: a spectrum file read and checked by the same reader
//! as the command line's, in the page's words when it cannot be used, and offered resampled
//! when it is longer than a share link can carry.
//!
//! Architecture invariant: the reading is `formats`' and the resampling `view::resample`'s;
//! this module only decides which the page needs and words the outcome.

use serde::{Deserialize, Serialize};

use crate::formats::spectrum_csv::{parse_spectrum_csv, ColumnHints};
use crate::formats::TableKind;
use crate::scenario::TableSpec;
use crate::view::hints::page_message;
use crate::view::resample::{resample, PAGE_MAX_TABLE_POINTS, RESAMPLED_POINTS};

/// A spectrum file as the page can use it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PageTable {
    /// the table to use: the file's own, or resampled when the file is too long
    pub table: TableSpec,
    /// data rows in the file
    pub rows: usize,
    /// whether `table` is resampled (the page asks before using it)
    pub resampled: bool,
}

/// A table's name from its file name: the base name without its extension, without control
/// characters, at most 60 characters.
pub fn stem(name: &str) -> String {
    let base = name.rsplit(['/', '\\']).next().unwrap_or(name);
    let s = match base.rsplit_once('.') {
        Some((a, _)) if !a.is_empty() => a,
        _ => base,
    };
    let s: String = s.chars().filter(|c| !c.is_control()).take(60).collect();
    if s.is_empty() {
        "spectrum".into()
    } else {
        s
    }
}

/// Read the spectrum file `file_name` with contents `text` for the page. Errors are the
/// reader's, in the page's words.
pub fn spectrum_for_page(text: &str, file_name: &str) -> Result<PageTable, String> {
    let name = stem(file_name);
    let sp =
        parse_spectrum_csv(text, &ColumnHints::default(), &name).map_err(|e| page_message(&e, TableKind::Spectrum))?;
    let (x, y) = (sp.coordinates(), sp.values());
    let rows = x.len();
    let (x, y, resampled) = if rows > PAGE_MAX_TABLE_POINTS {
        let (rx, ry) = resample(x, y, RESAMPLED_POINTS);
        (rx, ry, true)
    } else {
        (x.to_vec(), y.to_vec(), false)
    };
    Ok(PageTable {
        table: TableSpec { name, axis: sp.axis().into(), quantity: sp.quantity().into(), x, y },
        rows,
        resampled,
    })
}

/// What the page says about a resampled table before using it.
pub fn resample_offer(file_name: &str, t: &PageTable) -> String {
    format!(
        "'{file_name}' has {} rows. A link carries the whole scenario, so the page keeps at most {} points of a \
         table: it can use this spectrum resampled to {} points, each the file's mean over its interval (so the power \
         and photon counts over any band are kept).",
        crate::view::input::thousands(t.rows as f64),
        crate::view::input::thousands(PAGE_MAX_TABLE_POINTS as f64),
        crate::view::input::thousands(t.table.x.len() as f64)
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_from_file_names() {
        assert_eq!(stem("C:\\data\\sun.csv"), "sun");
        assert_eq!(stem("/tmp/.hidden"), ".hidden");
        assert_eq!(stem(""), "spectrum");
    }

    #[test]
    fn a_long_file_is_offered_resampled_and_a_short_one_used_as_it_is() {
        let mut text = String::from("wavelength_nm,irradiance_W_m2_nm\n");
        for i in 0..60_000 {
            text.push_str(&format!("{},{}\n", 300.0 + i as f64 * 0.02, 1.0 + (i % 7) as f64 * 0.1));
        }
        let t = spectrum_for_page(&text, "long.csv").unwrap();
        assert!(t.resampled && t.rows == 60_000 && t.table.x.len() == RESAMPLED_POINTS);
        assert!(resample_offer("long.csv", &t).contains("60,000 rows"));
        let short = spectrum_for_page("wavelength_nm,irradiance_W_m2_nm\n400,1\n500,2\n", "short.csv").unwrap();
        assert!(!short.resampled && short.rows == 2 && short.table.name == "short");
    }

    #[test]
    fn a_bad_file_is_refused_in_the_pages_words() {
        let e = spectrum_for_page("400,1\n500,2\n", "bare.csv").unwrap_err();
        assert!(!e.contains("--"), "{e}");
    }
}
