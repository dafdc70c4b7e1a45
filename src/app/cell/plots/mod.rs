//! The cell panel's three plots: the source spectrum with the gap, the limiting efficiency
//! against band gap, and the J-V curve.

pub mod efficiency;
pub mod jv;
pub mod spectrum;

use crate::app::widgets::plot::Backend;
use plotters::coord::Shift;
use plotters::prelude::*;

use crate::app::widgets::plot::{Drawing, Frame, Look};
use crate::view::cell::CellView;

/// The three plots.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlotKind {
    Spectrum,
    Efficiency,
    Jv,
}

impl PlotKind {
    pub const ALL: [PlotKind; 3] = [PlotKind::Spectrum, PlotKind::Efficiency, PlotKind::Jv];

    /// The test hook and file-name part.
    pub fn slug(self) -> &'static str {
        match self {
            PlotKind::Spectrum => "spectrum",
            PlotKind::Efficiency => "efficiency",
            PlotKind::Jv => "jv",
        }
    }

    pub fn index(self) -> usize {
        match self {
            PlotKind::Spectrum => 0,
            PlotKind::Efficiency => 1,
            PlotKind::Jv => 2,
        }
    }
}

/// One of the cell panel's plots of one result.
pub struct CellPlot<'a> {
    pub kind: PlotKind,
    pub c: &'a CellView,
}

impl Drawing for CellPlot<'_> {
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String> {
        match self.kind {
            PlotKind::Spectrum => spectrum::draw(root, self.c, look),
            PlotKind::Efficiency => efficiency::draw(root, self.c, look),
            PlotKind::Jv => jv::draw(root, self.c, look),
        }
    }
}
