//! The three plots, drawn with plotters onto any backend: the page's canvases, an
//! offscreen canvas for PNG files, and an SVG string. Sizes are given in CSS pixels and
//! multiplied by [`Look::scale`], so one drawing routine serves a crisp on-screen canvas
//! (scale = device pixel ratio) and a large export with proportionally larger type.
//!
//! Tick positions and labels are computed here (not left to plotters) and the label areas
//! are sized from measured label widths, so no label is ever cut off.

pub mod backend;
pub mod measure;
pub mod render;

pub use backend::Backend;

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::view::format::{axis_exponent, field, fixed, nice_step, nice_ticks, superscript, ticks_with_step, Ticks};

/// Something that draws itself as a plot on any backend (the page's canvas, a PNG, an
/// SVG) and says where its axes landed.
pub trait Drawing {
    /// Draw on `root` (the page's canvas or an SVG document, behind one type) and say where
    /// the axes landed.
    fn draw(&self, root: &DrawingArea<Backend<'_>, Shift>, look: &Look) -> Result<Frame, String>;
}

/// Colours of the plots (RGB).
pub mod palette {
    use plotters::style::RGBColor;
    pub const INK: RGBColor = RGBColor(32, 38, 50);
    pub const MUTED: RGBColor = RGBColor(92, 101, 116);
    pub const AXIS: RGBColor = RGBColor(120, 128, 142);
    pub const GRID: RGBColor = RGBColor(223, 227, 233);
    pub const GRID_LIGHT: RGBColor = RGBColor(240, 242, 245);
    /// the spectrum and the J-V curve
    pub const SPECTRUM: RGBColor = RGBColor(44, 72, 150);
    /// light the cell absorbs
    pub const ABSORBED: RGBColor = RGBColor(246, 168, 52);
    /// the band-gap marker
    pub const GAP: RGBColor = RGBColor(196, 40, 84);
    /// the efficiency curve
    pub const CURVE: RGBColor = RGBColor(14, 122, 120);
    /// the best gap
    pub const BEST: RGBColor = RGBColor(150, 96, 0);
    /// the P-V curve
    pub const POWER: RGBColor = RGBColor(214, 110, 24);
    /// a radiator's emissivity profile and its control points
    pub const EMISSIVITY: RGBColor = RGBColor(36, 48, 112);
    /// the sky's transmittance, and text on it
    pub const SKY: RGBColor = RGBColor(70, 150, 210);
    pub const SKY_INK: RGBColor = RGBColor(24, 92, 150);
    /// the blackbody at a radiator's surface temperature
    pub const BLACKBODY: RGBColor = RGBColor(170, 48, 120);
    /// power a radiator sends out
    pub const EMITTED: RGBColor = RGBColor(196, 86, 40);
    /// heat from the air
    pub const AIR: RGBColor = RGBColor(120, 128, 142);
}

/// How big to draw: all sizes are CSS pixels times `scale`.
#[derive(Debug, Clone)]
pub struct Look {
    pub scale: f64,
    /// A line of text above the plot (exports only).
    pub caption: Option<String>,
    /// Draw legends inside the plot (exports; the page shows them in HTML).
    pub legend: bool,
}

impl Look {
    pub fn screen(scale: f64) -> Look {
        Look { scale, caption: None, legend: false }
    }
    pub fn px(&self, v: f64) -> i32 {
        (v * self.scale).round() as i32
    }
    pub fn size(&self, v: f64) -> f64 {
        v * self.scale
    }
    /// Tick-label font size [backend px].
    pub fn tick_font(&self) -> f64 {
        self.size(12.0)
    }
    /// Axis-title font size [backend px].
    pub fn desc_font(&self) -> f64 {
        self.size(13.0)
    }
    pub fn text(&self, px: f64, color: &RGBColor) -> TextStyle<'static> {
        (FontFamily::SansSerif, px).into_font().color(color)
    }
}

/// A linear axis whose tick positions are given (major and minor), labelled by our own
/// formatters.
#[derive(Debug, Clone)]
pub struct TickRange {
    pub lo: f64,
    pub hi: f64,
    pub major: Vec<f64>,
    pub minor: Vec<f64>,
}

impl Ranged for TickRange {
    type FormatOption = plotters::coord::ranged1d::DefaultFormatting;
    type ValueType = f64;

    fn map(&self, value: &f64, limit: (i32, i32)) -> i32 {
        let t = (value - self.lo) / (self.hi - self.lo);
        let px = limit.0 as f64 + t * (limit.1 - limit.0) as f64;
        px.clamp(-1e7, 1e7).round() as i32
    }

    fn key_points<H: plotters::coord::ranged1d::KeyPointHint>(&self, hint: H) -> Vec<f64> {
        if hint.weight().allow_light_points() {
            self.minor.clone()
        } else {
            self.major.clone()
        }
    }

    fn range(&self) -> std::ops::Range<f64> {
        self.lo..self.hi
    }
}

/// Where the plotting area landed, for mapping the pointer back to values.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Frame {
    /// plotting-area edges in backend pixels
    pub left: f64,
    pub right: f64,
    pub top: f64,
    pub bottom: f64,
    pub x_lo: f64,
    pub x_hi: f64,
    pub y_lo: f64,
    pub y_hi: f64,
    /// backend pixels per CSS pixel
    pub scale: f64,
}

impl Frame {
    /// Value on the x axis at CSS pixel `x` (from the canvas' left edge), clamped to the axis.
    pub fn x_at_css(&self, x_css: f64) -> f64 {
        let px = x_css * self.scale;
        let t = ((px - self.left) / (self.right - self.left)).clamp(0.0, 1.0);
        self.x_lo + t * (self.x_hi - self.x_lo)
    }
    /// Value on the y axis at CSS pixel `y` (from the canvas' top edge), clamped to the axis.
    pub fn y_at_css(&self, y_css: f64) -> f64 {
        let px = y_css * self.scale;
        let t = ((self.bottom - px) / (self.bottom - self.top)).clamp(0.0, 1.0);
        self.y_lo + t * (self.y_hi - self.y_lo)
    }
    /// CSS pixel of x value `x`.
    pub fn css_of_x(&self, x: f64) -> f64 {
        (self.left + (x - self.x_lo) / (self.x_hi - self.x_lo) * (self.right - self.left)) / self.scale
    }
    /// CSS pixel of y value `y`.
    pub fn css_of_y(&self, y: f64) -> f64 {
        (self.bottom - (y - self.y_lo) / (self.y_hi - self.y_lo) * (self.bottom - self.top)) / self.scale
    }
    /// Whether a CSS point lies over the plotting area (with a little slack).
    pub fn contains_css(&self, x_css: f64, y_css: f64, slack_css: f64) -> bool {
        let (x, y, s) = (x_css * self.scale, y_css * self.scale, slack_css * self.scale);
        x >= self.left - s && x <= self.right + s && y >= self.top - s && y <= self.bottom + s
    }
    pub fn is_valid(&self) -> bool {
        self.right > self.left && self.x_hi > self.x_lo && self.scale > 0.0
    }
}

/// How an axis maps values to positions and labels its ticks.
#[derive(Debug, Clone, PartialEq)]
pub enum Scale {
    Linear,
    /// the axis runs in log10 of the value; ticks are labelled with the value itself
    Log10,
    /// categories centred at 0.5, 1.5, ... with these names
    Named(Vec<String>),
}

/// One axis: its range, ticks, power-of-ten factor and title.
#[derive(Debug, Clone)]
pub struct AxisSpec {
    pub lo: f64,
    pub hi: f64,
    pub ticks: Ticks,
    /// values are labelled divided by 10^exp
    pub exp: i32,
    pub title: String,
    pub scale: Scale,
}

/// Title of an axis with its unit.
fn titled(name: &str, unit: &str) -> String {
    if unit.is_empty() {
        name.to_string()
    } else {
        format!("{name} ({unit})")
    }
}

/// Tick mantissas per decade of a logarithmic axis, densest first.
const LOG_MANTISSAS: [&[f64]; 4] = [&[1.0, 2.0, 3.0, 5.0], &[1.0, 2.0, 5.0], &[1.0, 3.0], &[1.0]];

impl AxisSpec {
    /// Ticks over [lo, hi]; with `snap_hi` the top is raised to the next tick.
    pub fn new(lo: f64, hi: f64, target: usize, name: &str, unit: &str, snap_hi: bool) -> AxisSpec {
        let (lo, hi) =
            if hi > lo && hi.is_finite() && lo.is_finite() { (lo, hi) } else { (lo.min(0.0), lo.min(0.0) + 1.0) };
        let exp = axis_exponent(lo.abs().max(hi.abs()));
        let f = 10f64.powi(exp);
        let mut t = nice_ticks(lo / f, hi / f, target);
        let mut hi = hi;
        if snap_hi {
            // raise the top to the next multiple of the same step
            let (step, sub, decimals) = nice_step((hi - lo) / f, target);
            let top = (hi / f / step - 1e-9).ceil() * step;
            if top * f > hi {
                hi = top * f;
                t = ticks_with_step(lo / f, top, step, sub, decimals);
            }
        }
        let major = t.major.iter().map(|v| v * f).collect();
        let minor = t.minor.iter().map(|v| v * f).collect();
        let title = match (exp, unit.is_empty()) {
            (0, true) => name.to_string(),
            (0, false) => format!("{name} ({unit})"),
            (e, true) => format!("{name} (10{})", superscript(e)),
            (e, false) => format!("{name} (10{} {unit})", superscript(e)),
        };
        AxisSpec { lo, hi, ticks: Ticks { major, minor, decimals: t.decimals }, exp, title, scale: Scale::Linear }
    }

    /// A logarithmic axis over [lo, hi] (values > 0, e.g. wavelengths in um), labelled at
    /// 1-2-3-5 (or sparser) multiples of each decade, at most about `target` labels.
    pub fn log10(lo: f64, hi: f64, target: usize, name: &str, unit: &str) -> AxisSpec {
        let (lo, hi) = if lo > 0.0 && hi > lo && hi.is_finite() { (lo.log10(), hi.log10()) } else { (0.0, 1.0) };
        let in_range = |v: f64| v >= lo - 1e-9 && v <= hi + 1e-9;
        let decades = (lo.floor() as i32)..=(hi.ceil() as i32);
        let at = |mantissas: &[f64]| -> Vec<f64> {
            decades
                .clone()
                .flat_map(|d| mantissas.iter().map(move |m| (m * 10f64.powi(d)).log10()))
                .filter(|v| in_range(*v))
                .collect()
        };
        let major =
            LOG_MANTISSAS.iter().map(|m| at(m)).find(|t| t.len() <= target.max(2)).unwrap_or_else(|| at(&[1.0]));
        let all: Vec<f64> = (1..10).map(|k| k as f64).collect();
        let minor = at(&all);
        AxisSpec {
            lo,
            hi,
            ticks: Ticks { major, minor, decimals: 0 },
            exp: 0,
            title: titled(name, unit),
            scale: Scale::Log10,
        }
    }

    /// A category axis: one slot per name, ticks at the slot centres.
    pub fn named(names: &[&str], name: &str) -> AxisSpec {
        let n = names.len().max(1);
        let major = (0..n).map(|i| i as f64 + 0.5).collect();
        AxisSpec {
            lo: 0.0,
            hi: n as f64,
            ticks: Ticks { major, minor: Vec::new(), decimals: 0 },
            exp: 0,
            title: name.to_string(),
            scale: Scale::Named(names.iter().map(|s| s.to_string()).collect()),
        }
    }

    /// The tick label of value `v`.
    pub fn label(&self, v: f64) -> String {
        match &self.scale {
            Scale::Linear => fixed(v / 10f64.powi(self.exp), self.ticks.decimals),
            Scale::Log10 => field(10f64.powf(v), 3),
            Scale::Named(names) => names.get(v.max(0.0).floor() as usize).cloned().unwrap_or_default(),
        }
    }

    /// The axis as a plotters coordinate with our ticks.
    pub fn coord(&self) -> TickRange {
        TickRange { lo: self.lo, hi: self.hi, major: self.ticks.major.clone(), minor: self.ticks.minor.clone() }
    }

    /// The same without minor ticks (for a second axis that must not add grid lines).
    pub fn coord_major(&self) -> TickRange {
        TickRange { minor: Vec::new(), ..self.coord() }
    }

    pub fn labels(&self) -> Vec<String> {
        self.ticks.major.iter().map(|v| self.label(*v)).collect()
    }
}

/// Sizes of the areas around the plotting area [backend px].
#[derive(Debug, Clone, Copy)]
pub struct Margins {
    pub top: i32,
    pub right: i32,
    pub left: i32,
    pub bottom: i32,
    pub left_area: i32,
    pub bottom_area: i32,
    pub right_area: i32,
}

/// Tick mark length [CSS px].
const TICK: f64 = 5.0;

/// Room for tick labels and titles, from measured label widths.
pub fn margins(look: &Look, x: &AxisSpec, y: &AxisSpec, y2: Option<&AxisSpec>) -> Margins {
    let tf = look.tick_font();
    let df = look.desc_font();
    let widest = |a: &AxisSpec| a.labels().iter().map(|l| measure::text_width(l, tf)).fold(0.0f64, f64::max);
    let label_dist = look.size(2.0 * TICK);
    let side = |a: &AxisSpec| (look.size(2.0) + df * 1.25 + look.size(8.0) + widest(a) + label_dist).ceil() as i32;
    let left_area = side(y);
    let right_area = y2.map(side).unwrap_or(0);
    let bottom_area = (label_dist + tf * 1.25 + look.size(8.0) + df * 1.25 + look.size(2.0)).ceil() as i32;
    // the last x label is centred on the axis end: leave half of it free on the right
    let last_x = x.labels().last().map(|l| measure::text_width(l, tf)).unwrap_or(0.0);
    let right =
        if y2.is_some() { look.px(8.0) } else { ((last_x / 2.0).ceil() as i32 + look.px(6.0)).max(look.px(18.0)) };
    let mut top = look.px(14.0);
    if look.caption.is_some() {
        top += (look.size(13.0) * 1.6).ceil() as i32;
    }
    Margins { top, right, left: look.px(8.0), bottom: look.px(6.0), left_area, bottom_area, right_area }
}

/// A chart builder with the margins and label areas of `m` (the right label area is the
/// caller's, for charts with a second axis).
pub fn builder<'a, 'b, DB: DrawingBackend>(root: &'a DrawingArea<DB, Shift>, m: &Margins) -> ChartBuilder<'a, 'b, DB> {
    let mut b = ChartBuilder::on(root);
    b.margin_top(m.top)
        .margin_right(m.right)
        .margin_left(m.left)
        .margin_bottom(m.bottom)
        .x_label_area_size(m.bottom_area)
        .y_label_area_size(m.left_area);
    b
}

/// A chart with our tick ranges on both axes.
pub type Chart<'a, DB> = ChartContext<'a, DB, Cartesian2d<TickRange, TickRange>>;

/// A chart on `root` with one x and one y axis, its mesh, ticks and titles drawn (grid lines
/// across x only with `x_grid`), and the frame of its plotting area.
pub fn chart<'a, DB: DrawingBackend>(
    root: &'a DrawingArea<DB, Shift>,
    look: &Look,
    x: &AxisSpec,
    y: &AxisSpec,
    x_grid: bool,
) -> Result<(Chart<'a, DB>, Frame), String> {
    let m = margins(look, x, y, None);
    let mut chart = builder(root, &m).build_cartesian_2d(x.coord(), y.coord()).map_err(err)?;
    let xf = |v: &f64| x.label(*v);
    let yf = |v: &f64| y.label(*v);
    let mut mesh = chart.configure_mesh();
    mesh.bold_line_style(palette::GRID)
        .light_line_style(palette::GRID_LIGHT)
        .axis_style(palette::AXIS)
        .label_style(look.text(look.tick_font(), &palette::INK))
        .axis_desc_style(look.text(look.desc_font(), &palette::INK))
        .x_label_formatter(&xf)
        .y_label_formatter(&yf)
        .x_desc(x.title.clone())
        .y_desc(y.title.clone())
        .set_all_tick_mark_size(look.px(TICK));
    if !x_grid {
        mesh.disable_x_mesh();
    }
    mesh.draw().map_err(err)?;
    let frame = frame_of(chart.plotting_area().get_pixel_range(), x, y, look);
    Ok((chart, frame))
}

/// How many ticks fit along `pixels` backend pixels.
pub fn tick_target(look: &Look, pixels: u32, spacing_css: f64) -> usize {
    ((pixels as f64 / look.size(spacing_css)).floor() as usize).clamp(2, 12)
}

/// Draw the caption line, if any, at the top left.
pub fn draw_caption<DB: DrawingBackend>(
    root: &DrawingArea<DB, plotters::coord::Shift>,
    look: &Look,
) -> Result<(), String> {
    if let Some(c) = &look.caption {
        let fs = look.size(13.0);
        let style = look.text(fs, &palette::MUTED).pos(Pos::new(HPos::Left, VPos::Top));
        let room = root.dim_in_pixel().0 as f64 - 2.0 * look.size(10.0);
        root.draw_text(&fit(c, fs, room), &style, (look.px(10.0), look.px(8.0))).map_err(err)?;
    }
    Ok(())
}

/// `text` cut short with an ellipsis where it would be wider than `room` px at `size_px`.
pub fn fit(text: &str, size_px: f64, room: f64) -> String {
    if measure::text_width(text, size_px) <= room {
        return text.to_string();
    }
    let chars: Vec<char> = text.chars().collect();
    // the longest prefix that fits with the ellipsis (bisection on the character count)
    let (mut lo, mut hi) = (0usize, chars.len());
    while hi - lo > 1 {
        let mid = (lo + hi) / 2;
        let t: String = chars[..mid].iter().chain(std::iter::once(&'…')).collect();
        if measure::text_width(&t, size_px) <= room {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    chars[..lo].iter().collect::<String>().trim_end().to_string() + "…"
}

/// A plotters error as text.
pub fn err<E: std::fmt::Debug>(e: E) -> String {
    format!("the plot could not be drawn: {e:?}")
}

/// The frame of a chart's plotting area.
pub fn frame_of(range: (std::ops::Range<i32>, std::ops::Range<i32>), x: &AxisSpec, y: &AxisSpec, look: &Look) -> Frame {
    let (xr, yr) = range;
    Frame {
        left: xr.start as f64,
        right: xr.end as f64,
        top: yr.start as f64,
        bottom: yr.end as f64,
        x_lo: x.lo,
        x_hi: x.hi,
        y_lo: y.lo,
        y_hi: y.hi,
        scale: look.scale,
    }
}

/// A small filled tag with text, anchored at backend pixel (x, y) by its top-centre, kept
/// inside [min_x, max_x].
#[allow(clippy::too_many_arguments)]
pub fn draw_tag<DB: DrawingBackend>(
    root: &DrawingArea<DB, plotters::coord::Shift>,
    look: &Look,
    text: &str,
    x: i32,
    y: i32,
    min_x: i32,
    max_x: i32,
    fill: &RGBColor,
) -> Result<(), String> {
    let fs = look.size(11.5);
    let w = measure::text_width(text, fs).ceil() as i32 + look.px(10.0);
    let h = (fs * 1.45).ceil() as i32;
    let mut x0 = x - w / 2;
    x0 = x0.max(min_x).min(max_x - w);
    root.draw(&Rectangle::new([(x0, y), (x0 + w, y + h)], fill.filled())).map_err(err)?;
    let style = look.text(fs, &WHITE).pos(Pos::new(HPos::Center, VPos::Center));
    root.draw_text(text, &style, (x0 + w / 2, y + h / 2)).map_err(err)?;
    Ok(())
}

/// A text label on a white backing box; `anchor` is where (x, y) sits on the box.
#[allow(clippy::too_many_arguments)]
pub fn draw_boxed_text<DB: DrawingBackend>(
    root: &DrawingArea<DB, plotters::coord::Shift>,
    look: &Look,
    text: &str,
    x: i32,
    y: i32,
    h_pos: HPos,
    v_pos: VPos,
    color: &RGBColor,
    bounds: (i32, i32, i32, i32),
) -> Result<(), String> {
    let (x0, y0, x1, y1) = boxed_text_rect(look, text, x, y, h_pos, v_pos, bounds);
    root.draw(&Rectangle::new([(x0, y0), (x1, y1)], WHITE.mix(0.85).filled())).map_err(err)?;
    let style = look.text(look.size(12.0), color).pos(Pos::new(HPos::Left, VPos::Center));
    root.draw_text(text, &style, (x0 + look.px(4.0), (y0 + y1) / 2)).map_err(err)?;
    Ok(())
}

/// Where [`draw_boxed_text`] puts its box: (left, top, right, bottom) [backend px].
pub fn boxed_text_rect(
    look: &Look,
    text: &str,
    x: i32,
    y: i32,
    h_pos: HPos,
    v_pos: VPos,
    bounds: (i32, i32, i32, i32),
) -> (i32, i32, i32, i32) {
    let fs = look.size(12.0);
    let pad = look.px(4.0);
    let w = measure::text_width(text, fs).ceil() as i32 + 2 * pad;
    let h = (fs * 1.35).ceil() as i32 + pad;
    let mut x0 = match h_pos {
        HPos::Left => x,
        HPos::Center => x - w / 2,
        HPos::Right => x - w,
    };
    let mut y0 = match v_pos {
        VPos::Top => y,
        VPos::Center => y - h / 2,
        VPos::Bottom => y - h,
    };
    let (bl, bt, br, bb) = bounds;
    x0 = x0.max(bl).min(br - w);
    y0 = y0.max(bt).min(bb - h);
    (x0, y0, x0 + w, y0 + h)
}

/// One legend row: a short line (or a swatch) and its text, at backend pixel (x, y).
#[allow(clippy::too_many_arguments)]
pub fn draw_legend_row<DB: DrawingBackend>(
    root: &DrawingArea<DB, plotters::coord::Shift>,
    look: &Look,
    x: i32,
    y: i32,
    color: &RGBColor,
    swatch: bool,
    text: &str,
) -> Result<i32, String> {
    let fs = look.size(12.0);
    let len = look.px(22.0);
    let tw = measure::text_width(text, fs).ceil() as i32;
    let pad = look.px(4.0);
    let half = (fs * 0.75).ceil() as i32;
    root.draw(&Rectangle::new(
        [(x - pad, y - half - pad / 2), (x + len + look.px(6.0) + tw + pad, y + half + pad / 2)],
        WHITE.mix(0.85).filled(),
    ))
    .map_err(err)?;
    if swatch {
        root.draw(&Rectangle::new([(x, y - look.px(5.0)), (x + len, y + look.px(5.0))], color.mix(0.5).filled()))
            .map_err(err)?;
    } else {
        root.draw(&PathElement::new(vec![(x, y), (x + len, y)], color.stroke_width(look.px(2.5).max(1) as u32)))
            .map_err(err)?;
    }
    let style = look.text(fs, &palette::INK).pos(Pos::new(HPos::Left, VPos::Center));
    root.draw_text(text, &style, (x + len + look.px(6.0), y)).map_err(err)?;
    Ok(len + look.px(6.0) + tw)
}
