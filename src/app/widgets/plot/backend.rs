//! One drawing back end for every plot: the page's canvas or an SVG document behind a single
//! type, so that each plot's drawing code is compiled once rather than once per back end
//! (the download is what a first visit pays for).
//!
//! Architecture invariant: plots draw on [`Backend`] only; which surface is behind it is the
//! caller's choice (`render.rs`).

use std::error::Error;
use std::fmt;

use plotters::prelude::{DrawingBackend, SVGBackend};
use plotters_backend::{BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingErrorKind};
use plotters_canvas::CanvasBackend;

/// The page's canvas or an SVG document.
pub enum Backend<'a> {
    Canvas(CanvasBackend),
    Svg(SVGBackend<'a>),
}

/// Why a back end could not draw (its own words).
#[derive(Debug)]
pub struct BackendFailure(String);

impl fmt::Display for BackendFailure {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl Error for BackendFailure {}

fn lift<E: Error + Send + Sync>(e: DrawingErrorKind<E>) -> DrawingErrorKind<BackendFailure> {
    match e {
        DrawingErrorKind::DrawingError(e) => DrawingErrorKind::DrawingError(BackendFailure(e.to_string())),
        DrawingErrorKind::FontError(e) => DrawingErrorKind::FontError(e),
    }
}

/// Call the same method on whichever back end is inside.
macro_rules! either {
    ($self:ident, $b:ident => $call:expr) => {
        match $self {
            Backend::Canvas($b) => $call.map_err(lift),
            Backend::Svg($b) => $call.map_err(lift),
        }
    };
}

impl DrawingBackend for Backend<'_> {
    type ErrorType = BackendFailure;

    fn get_size(&self) -> (u32, u32) {
        match self {
            Backend::Canvas(b) => b.get_size(),
            Backend::Svg(b) => b.get_size(),
        }
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.ensure_prepared())
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.present())
    }

    fn draw_pixel(&mut self, point: BackendCoord, color: BackendColor) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_pixel(point, color))
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_line(from, to, style))
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_rect(upper_left, bottom_right, style, fill))
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_path(path, style))
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_circle(center, radius, style, fill))
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.fill_polygon(vert, style))
    }

    fn draw_text<TStyle: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &TStyle,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.draw_text(text, style, pos))
    }

    fn estimate_text_size<TStyle: BackendTextStyle>(
        &self,
        text: &str,
        style: &TStyle,
    ) -> Result<(u32, u32), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.estimate_text_size(text, style))
    }

    fn blit_bitmap(
        &mut self,
        pos: BackendCoord,
        (iw, ih): (u32, u32),
        src: &[u8],
    ) -> Result<(), DrawingErrorKind<BackendFailure>> {
        either!(self, b => b.blit_bitmap(pos, (iw, ih), src))
    }
}
