//! The radiator's three plots, drawn with the shared axis, tick and label code of
//! [`crate::app::widgets::plot`]: the emissivity editor over the sky, sun and blackbody curves, the
//! parts of the balance as a waterfall, and P_net against surface temperature.

pub mod balance;
pub mod curve;
pub mod editor;
pub mod film;

use crate::app::widgets::plot::Backend;
use plotters::coord::Shift;
use plotters::prelude::*;

use crate::app::radiator::state::Slot;
use crate::app::widgets::plot::{AxisSpec, Drawing, Frame, Look};
use crate::view::format::nice_step;
use crate::view::radiator::RadiatorView;

/// One of the radiator's plots of one result; `selected` marks a control point.
pub struct RadPlot<'a> {
    pub slot: Slot,
    pub c: &'a RadiatorView,
    pub selected: Option<usize>,
}

impl Drawing for RadPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        match self.slot {
            Slot::Editor => editor::draw(root, self.c, self.selected, look),
            Slot::Balance => balance::draw(root, self.c, look),
            Slot::Curve => curve::draw(root, self.c, look),
        }
    }
}

/// A linear axis over [lo, hi] widened to whole tick steps at both ends (so both ends are
/// labelled), with some headroom.
pub fn padded_axis(lo: f64, hi: f64, target: usize, name: &str, unit: &str) -> AxisSpec {
    let (lo, hi) = if hi > lo { (lo, hi) } else { (lo - 1.0, lo + 1.0) };
    let pad = 0.04 * (hi - lo);
    let (lo, hi) = (if lo < 0.0 { lo - pad } else { lo }, hi + pad);
    let (step, _, _) = nice_step(hi - lo, target);
    // a value on a step stays the end (the tolerance points inwards)
    let lo = (lo / step + 1e-9).floor() * step;
    let hi = (hi / step - 1e-9).ceil() * step;
    AxisSpec::new(lo, hi, target, name, unit, false)
}

/// Backend pixel of a value on an axis of `frame`.
pub fn px_x(frame: &Frame, look: &Look, v: f64) -> i32 {
    (frame.css_of_x(v) * look.scale).round() as i32
}

pub fn px_y(frame: &Frame, look: &Look, v: f64) -> i32 {
    (frame.css_of_y(v) * look.scale).round() as i32
}

/// The frame's edges in backend pixels: (left, top, right, bottom).
pub fn edges(frame: &Frame) -> (i32, i32, i32, i32) {
    (frame.left as i32, frame.top as i32, frame.right as i32, frame.bottom as i32)
}
