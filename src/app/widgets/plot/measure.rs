//! Text widths for laying out plot labels, measured with a detached canvas (no layout).

use std::cell::RefCell;

use wasm_bindgen::JsCast;
use web_sys::CanvasRenderingContext2d;

thread_local! {
    static CONTEXT: RefCell<Option<CanvasRenderingContext2d>> = const { RefCell::new(None) };
}

fn context() -> Option<CanvasRenderingContext2d> {
    CONTEXT.with(|c| {
        let mut c = c.borrow_mut();
        if c.is_none() {
            let doc = web_sys::window()?.document()?;
            let canvas = doc.create_element("canvas").ok()?.dyn_into::<web_sys::HtmlCanvasElement>().ok()?;
            *c = canvas.get_context("2d").ok()??.dyn_into::<CanvasRenderingContext2d>().ok();
        }
        c.clone()
    })
}

/// Width [px] of `text` in the plots' sans-serif face at `size_px`.
pub fn text_width(text: &str, size_px: f64) -> f64 {
    if let Some(ctx) = context() {
        ctx.set_font(&format!("{size_px}px sans-serif"));
        if let Ok(m) = ctx.measure_text(text) {
            return m.width();
        }
    }
    text.chars().count() as f64 * size_px * 0.6
}
