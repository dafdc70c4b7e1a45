//! Files the user brings: spectrum tables and scenario files, from a file picker or a drop.
//! A file that cannot be used changes nothing; the reason is shown next to its control.

use crate::view::controls::Control;
use leptos::prelude::*;
use wasm_bindgen_futures::JsFuture;

use super::share::apply_scenario;
use crate::app::state::{sentence, Ctx, Notice, NoticeAction, NoticeKind};
use crate::app::widgets::worker::{Background, WorkerReply};
use crate::codec::open;
use crate::scenario::{SourceSpec, TableSpec};
use crate::view::tables::{resample_offer, spectrum_for_page, PageTable};

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

/// Files larger than this are read in the background worker, so the page keeps drawing.
const BACKGROUND_BYTES: usize = 1 << 20;

thread_local! {
    /// the worker reading a long file, kept until it answers
    static READER: std::cell::RefCell<Option<Background>> = const { std::cell::RefCell::new(None) };
}

/// Read a spectrum file and make it the source: a short file here, a long one in the
/// background worker, which reads the file itself (the page keeps drawing); a table longer
/// than a link can carry is offered resampled.
pub fn open_spectrum(ctx: Ctx, file: web_sys::File) {
    if file.size() <= BACKGROUND_BYTES as f64 {
        return read_then(file, move |name, text| match text {
            Ok(text) => spectrum_read(ctx, &name, spectrum_for_page(&text, &name)),
            Err(e) => ctx.set_error(
                Control::Spectrum,
                format!("'{name}' was not loaded: {e}. The previous spectrum is still in use."),
            ),
        });
    }
    let name = file.name();
    if file.size() > MAX_FILE_BYTES {
        return ctx.set_error(
            Control::Spectrum,
            format!(
                "'{name}' was not loaded: the file is {:.1} MB, more than the {:.0} MB accepted. The previous spectrum is still in use.",
                file.size() / 1048576.0,
                MAX_FILE_BYTES / 1048576.0
            ),
        );
    }
    ctx.status.set(Some(format!("Reading '{name}' ({:.1} MB) in the background…", file.size() / 1048576.0)));
    let on_reply = {
        let name = name.clone();
        move |m: WorkerReply| {
            if m.progress.is_some() {
                return;
            }
            READER.with(|r| r.borrow_mut().take().map(|w| w.stop()));
            let outcome = match (m.reply, m.failed) {
                (Some(reply), _) => serde_json::from_str::<Result<PageTable, String>>(&reply)
                    .unwrap_or_else(|_| Err("the background reader gave no readable answer".into())),
                (None, Some(f)) => Err(format!("the background reader failed ({f})")),
                _ => Err("the background reader gave no answer".into()),
            };
            ctx.status.set(None);
            spectrum_read(ctx, &name, outcome);
        }
    };
    let on_error = {
        let name = name.clone();
        move |msg: String| {
            READER.with(|r| r.borrow_mut().take().map(|w| w.stop()));
            ctx.status.set(None);
            spectrum_read(ctx, &name, Err(format!("the background reader stopped ({msg})")));
        }
    };
    let started = match Background::start(on_reply, on_error) {
        Ok(w) if w.post_file(1, "glowgap_read_spectrum", &name, &file) => Some(w),
        Ok(w) => {
            w.stop();
            None
        }
        Err(_) => None,
    };
    match started {
        Some(w) => READER.with(|r| {
            if let Some(old) = r.borrow_mut().replace(w) {
                old.stop();
            }
        }),
        // no worker in this browser: read it here
        None => read_then(file, move |name, text| match text {
            Ok(text) => spectrum_read(ctx, &name, spectrum_for_page(&text, &name)),
            Err(e) => ctx.set_error(
                Control::Spectrum,
                format!("'{name}' was not loaded: {e}. The previous spectrum is still in use."),
            ),
        }),
    }
}

/// Entry point for the background worker (`app::widgets::worker`): read spectrum file `job`
/// (its name) with contents `text`. Returns JSON, `{"Ok": table}` or `{"Err": text}`.
#[wasm_bindgen::prelude::wasm_bindgen]
pub fn glowgap_read_spectrum(job: &str, text: &str, _progress: &js_sys::Function) -> String {
    serde_json::to_string(&spectrum_for_page(text, job))
        .unwrap_or_else(|_| "{\"Err\":\"the table could not be written\"}".into())
}

/// What happened to a spectrum file: used, offered resampled, or refused with the reason.
fn spectrum_read(ctx: Ctx, file_name: &str, outcome: Result<PageTable, String>) {
    match outcome {
        Ok(t) if t.resampled => {
            ctx.clear_error(Control::Spectrum);
            let label = format!("Use it at {} points", crate::view::input::thousands(t.table.x.len() as f64));
            ctx.notify(Notice {
                kind: NoticeKind::Resample,
                text: format!("{} The previous spectrum is in use until you choose.", resample_offer(file_name, &t)),
                alert: false,
                action: Some(NoticeAction::UseSpectrum(Box::new(t.table), label)),
            });
        }
        Ok(t) => {
            if !use_table(ctx, t.table) {
                if let Some(msg) = ctx.errors.with_untracked(|e| e.get(&Control::Spectrum).cloned()) {
                    ctx.set_error(
                        Control::Spectrum,
                        format!("'{file_name}' was read but cannot be used: {msg} The previous spectrum is still in use."),
                    );
                }
            }
        }
        Err(e) => ctx.set_error(
            Control::Spectrum,
            format!("'{file_name}' was not loaded — {e}. Fix the file and load it again; the previous spectrum is still in use."),
        ),
    }
}

/// Make `table` the light source (checked as every edit is); returns whether it was taken.
pub fn use_table(ctx: Ctx, table: TableSpec) -> bool {
    let spec = SourceSpec::Table(table.clone());
    if ctx.edit(Control::Spectrum, move |s| s.cell.spectrum = spec) {
        ctx.user_table.set(Some(table));
        ctx.clear_error(Control::Spectrum);
        ctx.dismiss(NoticeKind::Resample);
        true
    } else {
        false
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
