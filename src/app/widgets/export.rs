//! Files the user takes away: plots as SVG, PNG or CSV through one dispatch ([`offer`]),
//! and the scenario as JSON.

use wasm_bindgen::{JsCast, JsValue};

use super::plot::render::{png_data_url, svg_text};
use super::plot::Drawing;
use crate::codec::to_json;
use crate::scenario::Scenario;
use crate::view::export::{file_name, ExportKind};

/// Offer a plot as a file of `kind`, named after `slug`: the drawing with `caption` under
/// it as SVG or PNG, or the CSV that `csv` writes.
pub fn offer(
    kind: ExportKind,
    slug: &str,
    plot: &impl Drawing,
    caption: impl FnOnce() -> String,
    csv: impl FnOnce() -> String,
) -> Result<(), String> {
    let name = file_name(slug, kind);
    match kind {
        ExportKind::Svg => download_text(&name, kind.mime(), &svg_text(plot, caption())?),
        ExportKind::Png => download_url(&name, &png_data_url(plot, caption())?),
        ExportKind::Csv => download_text(&name, kind.mime(), &csv()),
    }
}

/// Offer `url` as a download named `name`.
pub fn download_url(name: &str, url: &str) -> Result<(), String> {
    let doc = web_sys::window().and_then(|w| w.document()).ok_or("no document")?;
    let a: web_sys::HtmlAnchorElement = doc
        .create_element("a")
        .map_err(|_| "could not start the download")?
        .dyn_into()
        .map_err(|_| "could not start the download")?;
    a.set_href(url);
    a.set_download(name);
    a.set_attribute("hidden", "").ok();
    let body = doc.body().ok_or("no body")?;
    body.append_child(&a).map_err(|_| "could not start the download")?;
    a.click();
    a.remove();
    Ok(())
}

/// Offer `text` as a download.
pub fn download_text(name: &str, mime: &str, text: &str) -> Result<(), String> {
    let parts = js_sys::Array::of1(&JsValue::from_str(text));
    let opts = web_sys::BlobPropertyBag::new();
    opts.set_type(mime);
    let blob = web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts)
        .map_err(|_| "the browser could not make the file")?;
    let url = web_sys::Url::create_object_url_with_blob(&blob).map_err(|_| "the browser could not make the file")?;
    let r = download_url(name, &url);
    let u = url.clone();
    leptos::prelude::set_timeout(
        move || {
            let _ = web_sys::Url::revoke_object_url(&u);
        },
        std::time::Duration::from_secs(30),
    );
    r
}

pub fn save_scenario(s: &Scenario) -> Result<(), String> {
    download_text("glowgap-scenario.json", "application/json", &to_json(s))
}
