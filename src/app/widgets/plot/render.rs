//! Where plots are drawn: the page's canvases, PNG files and SVG files.

use plotters::prelude::*;
use plotters_canvas::CanvasBackend;
use wasm_bindgen::JsCast;
use web_sys::HtmlCanvasElement;

use super::{err, Backend, Drawing, Frame, Look};

/// Size of exported PNG files [px] and the scale of their type.
pub const PNG_SIZE: (u32, u32) = (1600, 1000);
pub const PNG_SCALE: f64 = 2.0;
/// Size of exported SVG files [user units] and the scale of their type.
pub const SVG_SIZE: (u32, u32) = (1000, 625);
pub const SVG_SCALE: f64 = 1.25;

fn device_pixel_ratio() -> f64 {
    web_sys::window()
        .map(|w| w.device_pixel_ratio())
        .filter(|r| r.is_finite() && *r > 0.0)
        .unwrap_or(1.0)
        .clamp(1.0, 4.0)
}

/// Draw onto a canvas of the page at its CSS size times the device pixel ratio. Returns
/// `Ok(None)` while the canvas has no size (not laid out yet).
pub fn draw_on_canvas(canvas: &HtmlCanvasElement, plot: &impl Drawing) -> Result<Option<Frame>, String> {
    let (cw, ch) = (canvas.client_width(), canvas.client_height());
    if cw <= 0 || ch <= 0 {
        return Ok(None);
    }
    let dpr = device_pixel_ratio();
    let (pw, ph) = ((cw as f64 * dpr).round() as u32, (ch as f64 * dpr).round() as u32);
    if canvas.width() != pw {
        canvas.set_width(pw);
    }
    if canvas.height() != ph {
        canvas.set_height(ph);
    }
    let backend = CanvasBackend::with_canvas_object(canvas.clone())
        .ok_or("this browser gave no 2D drawing context for the plot")?;
    let root = Backend::Canvas(backend).into_drawing_area();
    let frame = plot.draw(&root, &Look::screen(dpr))?;
    root.present().map_err(err)?;
    Ok(Some(frame))
}

/// A PNG image of a plot as a data URL, drawn on a detached canvas.
pub fn png_data_url(plot: &impl Drawing, caption: String) -> Result<String, String> {
    let doc = web_sys::window().and_then(|w| w.document()).ok_or("no document")?;
    let canvas: HtmlCanvasElement = doc
        .create_element("canvas")
        .map_err(|_| "could not make a canvas".to_string())?
        .dyn_into()
        .map_err(|_| "could not make a canvas".to_string())?;
    canvas.set_width(PNG_SIZE.0);
    canvas.set_height(PNG_SIZE.1);
    {
        let backend =
            CanvasBackend::with_canvas_object(canvas.clone()).ok_or("this browser gave no 2D drawing context")?;
        let root = Backend::Canvas(backend).into_drawing_area();
        plot.draw(&root, &Look { scale: PNG_SCALE, caption: Some(caption), legend: true })?;
        root.present().map_err(err)?;
    }
    canvas.to_data_url().map_err(|_| "the browser refused to encode the PNG image".to_string())
}

/// An SVG document of a plot.
pub fn svg_text(plot: &impl Drawing, caption: String) -> Result<String, String> {
    let mut out = String::new();
    {
        let root = Backend::Svg(SVGBackend::with_string(&mut out, SVG_SIZE)).into_drawing_area();
        plot.draw(&root, &Look { scale: SVG_SCALE, caption: Some(caption), legend: true })?;
        root.present().map_err(err)?;
    }
    Ok(out)
}

/// Put where the axes landed on the canvas, in CSS px and axis units (tests aim with it).
pub fn expose_frame(canvas: &web_sys::HtmlCanvasElement, f: &Frame) {
    let text = format!(
        "{{\"left\":{:.2},\"right\":{:.2},\"top\":{:.2},\"bottom\":{:.2},\"x\":[{},{}],\"y\":[{},{}]}}",
        f.left / f.scale,
        f.right / f.scale,
        f.top / f.scale,
        f.bottom / f.scale,
        f.x_lo,
        f.x_hi,
        f.y_lo,
        f.y_hi
    );
    let _ = canvas.set_attribute("data-frame", &text);
}

/// Draw `plot` on `canvas` (if it is on the page), recording its frame or its error.
pub fn draw_into<const N: usize>(
    i: usize,
    canvas: &Option<web_sys::HtmlCanvasElement>,
    plot: &impl Drawing,
    frames: &mut [Frame; N],
    errors: &mut [Option<String>; N],
) {
    if let Some(canvas) = canvas {
        match draw_on_canvas(canvas, plot) {
            Ok(Some(f)) => {
                expose_frame(canvas, &f);
                frames[i] = f
            }
            Ok(None) => {}
            Err(e) => errors[i] = Some(e),
        }
    }
}
