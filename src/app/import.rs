//! Files the user brings: spectrum tables and scenario files, from a file picker or a drop.
//! A file that cannot be used changes nothing; the reason is shown next to its control.

use crate::view::controls::Control;
use leptos::prelude::*;
use wasm_bindgen_futures::JsFuture;

use super::share::apply_scenario;
use crate::app::state::{sentence, Ctx, Notice, NoticeKind};
use crate::codec::open;
use crate::formats::spectrum_csv::{parse_spectrum_csv, ColumnHints};
use crate::formats::TableKind;
use crate::scenario::{SourceSpec, TableSpec};
use crate::view::hints::page_message;

/// Largest file read [bytes].
pub const MAX_FILE_BYTES: f64 = 32.0 * 1024.0 * 1024.0;

async fn read_text(file: &web_sys::File) -> Result<String, String> {
    if file.size() > MAX_FILE_BYTES {
        return Err(format!(
            "the file is {:.1} MB, more than the {:.0} MB accepted",
            file.size() / 1048576.0,
            MAX_FILE_BYTES / 1048576.0
        ));
    }
    let v = JsFuture::from(file.text()).await.map_err(|_| "the browser could not read the file".to_string())?;
    v.as_string().ok_or_else(|| "the file is not text".to_string())
}

/// Read a text file, then hand its name and its text (or why it could not be read) to `then`.
pub fn read_then(file: web_sys::File, then: impl FnOnce(String, Result<String, String>) + 'static) {
    let name = file.name();
    leptos::task::spawn_local(async move {
        let text = read_text(&file).await;
        then(name, text);
    });
}

/// A table's name from its file name.
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

/// Read a spectrum file and make it the source.
pub fn open_spectrum(ctx: Ctx, file: web_sys::File) {
    read_then(file, move |name, text| match text {
        Ok(text) => use_spectrum_text(ctx, &name, &text),
        Err(e) => ctx.set_error(
            Control::Spectrum,
            format!("'{name}' was not loaded: {e}. The previous spectrum is still in use."),
        ),
    });
}

pub fn use_spectrum_text(ctx: Ctx, file_name: &str, text: &str) {
    let name = stem(file_name);
    match parse_spectrum_csv(text, &ColumnHints::default(), &name) {
        Ok(sp) => {
            let table = TableSpec { name: name.clone(), axis: sp.axis().into(), quantity: sp.quantity().into(), x: sp.coordinates().to_vec(), y: sp.values().to_vec() };
            let spec = SourceSpec::Table(table.clone());
            if ctx.edit(Control::Spectrum, move |s| s.cell.spectrum = spec) {
                ctx.user_table.set(Some(table));
                ctx.clear_error(Control::Spectrum);
            } else if let Some(msg) = ctx.errors.with_untracked(|e| e.get(&Control::Spectrum).cloned()) {
                ctx.set_error(Control::Spectrum, format!("'{file_name}' was read but cannot be used: {msg} The previous spectrum is still in use."));
            }
        }
        Err(e) => ctx.set_error(
            Control::Spectrum,
            format!("'{file_name}' was not loaded — {}. Fix the file and load it again; the previous spectrum is still in use.", page_message(&e, TableKind::Spectrum)),
        ),
    }
}

/// Read a scenario file and open it.
pub fn open_scenario(ctx: Ctx, file: web_sys::File) {
    read_then(file, move |name, text| {
        let outcome = text.and_then(|text| open(&text).map(|(s, _)| s).map_err(|e| e.0));
        match outcome {
            Ok(s) => {
                ctx.dismiss(NoticeKind::File);
                apply_scenario(ctx, s);
                ctx.status.set(Some(format!("Opened the scenario file '{name}'.")));
            }
            Err(e) => ctx.notify(Notice {
                kind: NoticeKind::File,
                text: format!(
                    "The scenario file '{name}' could not be opened: {} Your current scenario is unchanged.",
                    sentence(&e)
                ),
                alert: true,
                action: None,
            }),
        }
    });
}

/// A file dropped on the page: a scenario if it is JSON, otherwise the data table of the
/// panel in front (`data`).
pub fn open_dropped(ctx: Ctx, file: web_sys::File, data: impl FnOnce(web_sys::File)) {
    let name = file.name().to_ascii_lowercase();
    if name.ends_with(".json") {
        open_scenario(ctx, file);
    } else {
        data(file);
    }
}

/// The first file of a file input, clearing the input so the same file can be chosen again.
pub fn take_file(input: &web_sys::HtmlInputElement) -> Option<web_sys::File> {
    let f = input.files().and_then(|l| l.get(0));
    input.set_value("");
    f
}

/// The first file of a drop.
pub fn dropped_file(ev: &web_sys::DragEvent) -> Option<web_sys::File> {
    ev.data_transfer().and_then(|d| d.files()).and_then(|l| l.get(0))
}
