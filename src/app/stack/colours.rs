//! Colours of the stack panel: one per subcell (top first, from short-wavelength violet to
//! long-wavelength brick), the efficiency ramp of the map, and one per loss part.

use plotters::style::RGBColor;

/// Subcell colours, top first.
pub const SUBCELL: [RGBColor; 6] = [
    RGBColor(112, 78, 180),
    RGBColor(36, 112, 192),
    RGBColor(20, 146, 118),
    RGBColor(188, 150, 16),
    RGBColor(224, 112, 38),
    RGBColor(168, 50, 62),
];

pub fn subcell(i: usize) -> RGBColor {
    SUBCELL[i.min(SUBCELL.len() - 1)]
}

/// The colour as CSS text.
pub fn css(c: RGBColor) -> String {
    format!("rgb({},{},{})", c.0, c.1, c.2)
}

/// A darker shade (markers drawn over a shaded band).
pub fn darker(c: RGBColor) -> RGBColor {
    RGBColor((c.0 as f64 * 0.72) as u8, (c.1 as f64 * 0.72) as u8, (c.2 as f64 * 0.72) as u8)
}

/// Stops of the map's ramp, low efficiency first: pale paper, straw, sage, sea blue, navy.
const RAMP: [(f64, (f64, f64, f64)); 5] = [
    (0.0, (246.0, 242.0, 228.0)),
    (0.28, (232.0, 206.0, 138.0)),
    (0.55, (124.0, 184.0, 152.0)),
    (0.8, (46.0, 118.0, 152.0)),
    (1.0, (26.0, 38.0, 74.0)),
];

/// The ramp at `t` in [0, 1].
pub fn ramp(t: f64) -> RGBColor {
    let t = if t.is_finite() { t.clamp(0.0, 1.0) } else { 0.0 };
    let k = RAMP.windows(2).position(|w| t <= w[1].0).unwrap_or(RAMP.len() - 2);
    let (a, b) = (RAMP[k], RAMP[k + 1]);
    let u = if b.0 > a.0 { (t - a.0) / (b.0 - a.0) } else { 0.0 };
    let mix = |x: f64, y: f64| (x + (y - x) * u).round().clamp(0.0, 255.0) as u8;
    RGBColor(mix(a.1 .0, b.1 .0), mix(a.1 .1, b.1 .1), mix(a.1 .2, b.1 .2))
}

/// Whether text or lines over `c` should be light.
pub fn is_dark(c: RGBColor) -> bool {
    0.2126 * c.0 as f64 + 0.7152 * c.1 as f64 + 0.0722 * c.2 as f64 <= 120.0
}

/// Where points that are not a stack (bottom gap not below the top gap) sit on the map.
pub const NOT_A_STACK: RGBColor = RGBColor(226, 223, 216);

/// Loss parts in the order of `LossReport::parts`: below the gap, thermalization, emission,
/// Carnot, Boltzmann, delivered.
pub const LOSS: [RGBColor; 6] = [
    RGBColor(190, 195, 204),
    RGBColor(232, 136, 76),
    RGBColor(150, 116, 200),
    RGBColor(98, 162, 204),
    RGBColor(132, 196, 168),
    RGBColor(14, 122, 120),
];
