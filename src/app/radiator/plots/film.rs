//! The layer stack's three plots: the stack as bars (heights by thickness, the substrate
//! under them), reflectance, transmittance and absorptance against wavelength, and the
//! emissivity over wavelength and angle as a map with its colour scale. Axes, ticks and
//! labels come from the shared plot code.

use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::{edges, px_x, px_y};
use crate::app::widgets::plot::palette::*;
use crate::app::widgets::plot::{chart, draw_caption, draw_legend_row, err, fit, tick_target, AxisSpec, Frame, Look};
use crate::view::format::field;
use crate::view::radiator::film::{bar_heights, FilmView, PLOT_RANGE_UM};

/// The smallest height of a layer's bar [CSS px].
pub const MIN_BAR_CSS: f64 = 14.0;
/// Height of the substrate's block and of the air's strip above the stack [CSS px].
const SUBSTRATE_CSS: f64 = 34.0;
const AIR_CSS: f64 = 22.0;
/// The pointer takes a layer's top edge within this distance [CSS px].
pub const EDGE_PICK_CSS: f64 = 7.0;

/// Reflectance, transmittance, absorptance and emissivity curves.
pub const REFLECTANCE: RGBColor = RGBColor(44, 72, 150);
pub const TRANSMITTANCE: RGBColor = RGBColor(14, 122, 120);
pub const ABSORPTANCE: RGBColor = RGBColor(196, 86, 40);
pub const EMISSIVITY_LINE: RGBColor = RGBColor(32, 38, 50);

/// Fill of a layer's bar, by its place in the material list (a custom index: `None`).
pub fn layer_colour(material_index: Option<usize>) -> RGBColor {
    const FILLS: [RGBColor; 8] = [
        RGBColor(168, 196, 226),
        RGBColor(226, 196, 150),
        RGBColor(170, 212, 182),
        RGBColor(214, 176, 206),
        RGBColor(238, 214, 140),
        RGBColor(186, 178, 230),
        RGBColor(232, 170, 160),
        RGBColor(160, 214, 214),
    ];
    match material_index {
        Some(i) => FILLS[i % FILLS.len()],
        None => RGBColor(222, 222, 214),
    }
}

/// The emissivity map's colour at `t` in [0, 1]: night blue through teal and sand to paper.
pub fn map_colour(t: f64) -> RGBColor {
    const STOPS: [(f64, (f64, f64, f64)); 5] = [
        (0.0, (24.0, 28.0, 58.0)),
        (0.3, (40.0, 92.0, 140.0)),
        (0.55, (56.0, 158.0, 146.0)),
        (0.8, (226.0, 196.0, 104.0)),
        (1.0, (252.0, 246.0, 224.0)),
    ];
    let t = if t.is_finite() { t.clamp(0.0, 1.0) } else { 0.0 };
    let k = STOPS.windows(2).position(|w| t <= w[1].0).unwrap_or(STOPS.len() - 2);
    let (a, b) = (STOPS[k], STOPS[k + 1]);
    let u = if b.0 > a.0 { (t - a.0) / (b.0 - a.0) } else { 0.0 };
    let mix = |x: f64, y: f64| (x + (y - x) * u).round().clamp(0.0, 255.0) as u8;
    RGBColor(mix(a.1 .0, b.1 .0), mix(a.1 .1, b.1 .1), mix(a.1 .2, b.1 .2))
}

/// Where each layer's bar lies in the stack plot [CSS px from the canvas' top]: (top,
/// bottom) per layer from the first (facing the sky), the substrate's top, and the px per nm.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct StackGeometry {
    pub bars: Vec<(f64, f64)>,
    pub substrate_top: f64,
    pub px_per_nm: f64,
}

/// The bars' places inside `frame` (the plot's drawing area) for these thicknesses; a drag
/// holds `fixed_px_per_nm` so that the dragged edge follows the pointer.
pub fn stack_geometry(frame: &Frame, thickness_nm: &[f64], fixed_px_per_nm: Option<f64>) -> StackGeometry {
    let top = frame.top / frame.scale + AIR_CSS;
    let substrate_top = frame.bottom / frame.scale - SUBSTRATE_CSS;
    let room = (substrate_top - top).max(MIN_BAR_CSS);
    let (heights, scale) = match fixed_px_per_nm {
        Some(s) => (thickness_nm.iter().map(|d| (d * s).max(MIN_BAR_CSS)).collect::<Vec<_>>(), s),
        None => bar_heights(thickness_nm, room, MIN_BAR_CSS),
    };
    // from the substrate up
    let mut y = substrate_top;
    let mut bars = vec![(0.0, 0.0); heights.len()];
    for (i, h) in heights.iter().enumerate().rev() {
        bars[i] = (y - h, y);
        y -= h;
    }
    StackGeometry { bars, substrate_top, px_per_nm: scale }
}

/// What the stack plot shows beside the film view.
pub struct StackLook<'a> {
    /// material list index of each layer and of the substrate (None: a custom index)
    pub colours: &'a [Option<usize>],
    pub substrate_colour: Option<usize>,
    pub focused: Option<usize>,
    pub fixed_px_per_nm: Option<f64>,
}

pub fn draw_stack<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    v: &FilmView,
    s: &StackLook,
    look: &Look,
) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let pad = look.px(10.0) as f64;
    let top_pad = if look.caption.is_some() { look.px(32.0) as f64 } else { pad };
    let frame = Frame {
        left: pad,
        right: w as f64 - pad,
        top: top_pad,
        bottom: h as f64 - pad,
        x_lo: 0.0,
        x_hi: 1.0,
        y_lo: 0.0,
        y_hi: 1.0,
        scale: look.scale,
    };
    let thickness: Vec<f64> = v.layers.iter().map(|l| l.thickness_nm).collect();
    let g = stack_geometry(&frame, &thickness, s.fixed_px_per_nm);
    let px = |css: f64| (css * look.scale).round() as i32;
    let (left, right) = (frame.left as i32, frame.right as i32);
    let bar_right = left + ((right - left) as f64 * 0.42) as i32;
    let fs = look.size(12.5);
    let ink = look.text(fs, &INK).pos(Pos::new(HPos::Left, VPos::Center));
    let muted = look.text(look.size(12.0), &MUTED).pos(Pos::new(HPos::Left, VPos::Center));
    let label_x = bar_right + look.px(12.0);
    let room = (right - label_x) as f64;

    // the air above
    let air_y = px(g.bars.first().map(|b| b.0).unwrap_or(g.substrate_top));
    root.draw(&Rectangle::new([(left, frame.top as i32), (bar_right, air_y)], SKY.mix(0.12).filled())).map_err(err)?;
    root.draw_text(
        &fit("air (the sky side): layer 1 faces the sky", look.size(12.0), room + (bar_right - left) as f64),
        &muted,
        (left + look.px(6.0), (frame.top as i32 + air_y) / 2),
    )
    .map_err(err)?;

    let mut last_label = i32::MIN;
    for (i, (t, b)) in g.bars.iter().enumerate() {
        let (y0, y1) = (px(*t), px(*b));
        let c = layer_colour(s.colours.get(i).copied().flatten());
        root.draw(&Rectangle::new([(left, y0), (bar_right, y1)], c.filled())).map_err(err)?;
        root.draw(&Rectangle::new([(left, y0), (bar_right, y1)], AXIS.stroke_width(1))).map_err(err)?;
        if s.focused == Some(i) {
            let ring = look.px(2.5).max(1) as u32;
            root.draw(&Rectangle::new([(left + 1, y0 + 1), (bar_right - 1, y1 - 1)], EMISSIVITY.stroke_width(ring)))
                .map_err(err)?;
        }
        // the top edge's grip
        let mid = (left + bar_right) / 2;
        root.draw(&PathElement::new(
            vec![(mid - look.px(14.0), y0 + look.px(3.0)), (mid + look.px(14.0), y0 + look.px(3.0))],
            INK.mix(0.55).stroke_width(look.px(1.5).max(1) as u32),
        ))
        .map_err(err)?;
        let text = format!("{} · {} · {} nm", i + 1, v.layers[i].material.text(), field(v.layers[i].thickness_nm, 6));
        let y = (y0 + y1) / 2;
        if (y - last_label).abs() as f64 >= fs * 1.05 || last_label == i32::MIN {
            root.draw_text(&fit(&text, fs, room), &ink, (label_x, y)).map_err(err)?;
            last_label = y;
        }
    }
    let st = px(g.substrate_top);
    let c = layer_colour(s.substrate_colour);
    root.draw(&Rectangle::new([(left, st), (bar_right, frame.bottom as i32)], c.mix(0.8).filled())).map_err(err)?;
    // hatching: the substrate is thick
    let step = look.px(9.0).max(3);
    let mut x = left;
    while x < bar_right {
        let x2 = (x + (frame.bottom as i32 - st)).min(bar_right);
        let y2 = st + (x2 - x);
        root.draw(&PathElement::new(vec![(x, st), (x2, y2)], INK.mix(0.25).stroke_width(1))).map_err(err)?;
        x += step;
    }
    root.draw(&Rectangle::new([(left, st), (bar_right, frame.bottom as i32)], AXIS.stroke_width(1))).map_err(err)?;
    let sub = format!("substrate: {} (thick)", v.substrate.text());
    root.draw_text(&fit(&sub, fs, room), &ink, (label_x, (st + frame.bottom as i32) / 2)).map_err(err)?;
    if s.fixed_px_per_nm.is_none() && !v.layers.is_empty() {
        let total: f64 = thickness.iter().sum();
        let note = format!("total {} nm · heights ∝ thickness, at least {} px", field(total, 6), MIN_BAR_CSS);
        root.draw_text(&fit(&note, look.size(12.0), room), &muted, (label_x, frame.top as i32 + look.px(10.0)))
            .map_err(err)?;
    }
    Ok(frame)
}

/// One part of a response (R, T or A).
type Part = fn(&crate::physics::film::Response) -> f64;

/// Reflectance, transmittance and absorptance against wavelength, with the emissivity.
pub fn draw_spectrum<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    v: &FilmView,
    look: &Look,
) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let x = AxisSpec::log10(PLOT_RANGE_UM.0, PLOT_RANGE_UM.1, tick_target(look, w, 62.0), "Wavelength", "µm");
    let y = AxisSpec::new(0.0, 1.0, tick_target(look, h, 44.0), "Fraction of the incident power", "", false);
    let (mut chart, frame) = chart(root, look, &x, &y, true)?;
    let (w0, w1) = (8f64.log10(), 13f64.log10());
    chart.draw_series(std::iter::once(Rectangle::new([(w0, 0.0), (w1, 1.0)], SKY.mix(0.08).filled()))).map_err(err)?;
    let lx: Vec<f64> = v.lambda_um.iter().map(|l| l.log10()).collect();
    let thick = look.px(2.2).max(1) as u32;
    let series = |f: fn(&crate::physics::film::Response) -> f64, list: &[crate::physics::film::Response]| {
        lx.iter().copied().zip(list.iter().map(f)).collect::<Vec<_>>()
    };
    let curves: [(RGBColor, Part); 3] =
        [(REFLECTANCE, |r| r.reflectance), (TRANSMITTANCE, |r| r.transmittance), (ABSORPTANCE, |r| r.absorptance)];
    for (c, f) in curves {
        chart.draw_series(LineSeries::new(series(f, &v.normal), c.stroke_width(thick))).map_err(err)?;
        if !v.oblique.is_empty() {
            let pts: Vec<(i32, i32)> =
                series(f, &v.oblique).iter().map(|p| (px_x(&frame, look, p.0), px_y(&frame, look, p.1))).collect();
            root.draw(&DashedPathElement::new(
                pts,
                look.px(6.0),
                look.px(4.0),
                c.stroke_width(look.px(1.6).max(1) as u32),
            ))
            .map_err(err)?;
        }
    }
    // the emissivity when it is not the layers' absorptance (absorbing substrate: 1 − R)
    if v.absorbing_substrate {
        let pts: Vec<(i32, i32)> =
            lx.iter().zip(&v.normal_eps).map(|(x, e)| (px_x(&frame, look, *x), px_y(&frame, look, *e))).collect();
        root.draw(&DashedPathElement::new(
            pts,
            look.px(2.0),
            look.px(3.0),
            EMISSIVITY_LINE.stroke_width(look.px(1.6).max(1) as u32),
        ))
        .map_err(err)?;
    }
    let (left, top, _, bottom) = edges(&frame);
    let style = look.text(look.size(11.0), &SKY_INK).pos(Pos::new(HPos::Center, VPos::Bottom));
    let mid = (px_x(&frame, look, w0) + px_x(&frame, look, w1)) / 2;
    root.draw_text("8–13 µm", &style, (mid, bottom - look.px(3.0))).map_err(err)?;
    if look.legend {
        let lx = left + look.px(14.0);
        let ly = top + look.px(18.0);
        let mut rows = vec![
            (REFLECTANCE, "reflectance R, normal".to_string()),
            (TRANSMITTANCE, "transmittance T into the substrate, normal".to_string()),
            (ABSORPTANCE, "absorptance A in the layers, normal".to_string()),
        ];
        if let Some(a) = v.angle_deg {
            rows.push((MUTED, format!("dashed: the same at {}°", field(a, 4))));
        }
        if v.absorbing_substrate {
            rows.push((EMISSIVITY_LINE, "emissivity 1 − R (dotted)".into()));
        }
        for (k, (c, t)) in rows.iter().enumerate() {
            draw_legend_row(root, look, lx, ly + look.px(20.0) * k as i32, c, false, t)?;
        }
    }
    Ok(frame)
}

/// The emissivity over wavelength (x) and angle from the normal (y), with its colour scale.
pub fn draw_map<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, v: &FilmView, look: &Look) -> Result<Frame, String> {
    root.fill(&WHITE).map_err(err)?;
    draw_caption(root, look)?;
    let (w, h) = root.dim_in_pixel();
    let bar_room = look.px(70.0) as u32;
    let (main, _) = root.split_horizontally(w.saturating_sub(bar_room));
    let (mw, _) = main.dim_in_pixel();
    let x = AxisSpec::log10(PLOT_RANGE_UM.0, PLOT_RANGE_UM.1, tick_target(look, mw, 62.0), "Wavelength", "µm");
    let y = AxisSpec::new(0.0, 90.0, tick_target(look, h, 44.0), "Angle from the normal", "°", false);
    let (mut chart, frame) = chart(&main, look, &x, &y, false)?;
    let (nx, ny) = (v.map_lambda_um.len(), v.map_angle_deg.len());
    let (a, b) = (PLOT_RANGE_UM.0.log10(), PLOT_RANGE_UM.1.log10());
    let mut cells = Vec::with_capacity(nx * ny);
    for j in 0..ny {
        let (y0, y1) = (90.0 * j as f64 / ny as f64, 90.0 * (j + 1) as f64 / ny as f64);
        for i in 0..nx {
            let (x0, x1) = (a + (b - a) * i as f64 / nx as f64, a + (b - a) * (i + 1) as f64 / nx as f64);
            cells.push(Rectangle::new([(x0, y1), (x1, y0)], map_colour(v.map_at(i, j)).filled()));
        }
    }
    chart.draw_series(cells).map_err(err)?;
    let (left, top, right, bottom) = edges(&frame);
    for wl in [8.0f64, 13.0] {
        let p = px_x(&frame, look, wl.log10());
        root.draw(&DashedPathElement::new(
            vec![(p, top), (p, bottom)],
            look.px(4.0),
            look.px(4.0),
            WHITE.mix(0.8).stroke_width(1),
        ))
        .map_err(err)?;
    }
    // the colour scale
    let bar_x = right + look.px(16.0);
    let bar_w = look.px(14.0);
    let steps = 50;
    for s in 0..steps {
        let (ya, yb) = (bottom - (bottom - top) * s / steps, bottom - (bottom - top) * (s + 1) / steps);
        let c = map_colour((s as f64 + 0.5) / steps as f64);
        root.draw(&Rectangle::new([(bar_x, yb), (bar_x + bar_w, ya)], c.filled())).map_err(err)?;
    }
    root.draw(&Rectangle::new([(bar_x, top), (bar_x + bar_w, bottom)], AXIS.stroke_width(1))).map_err(err)?;
    let fs = look.tick_font();
    let label = look.text(fs, &INK).pos(Pos::new(HPos::Left, VPos::Center));
    for k in 0..=5 {
        let t = k as f64 / 5.0;
        let py = bottom - (t * (bottom - top) as f64).round() as i32;
        root.draw(&PathElement::new(
            vec![(bar_x + bar_w, py), (bar_x + bar_w + look.px(4.0), py)],
            INK.stroke_width(1),
        ))
        .map_err(err)?;
        root.draw_text(&format!("{t:.1}"), &label, (bar_x + bar_w + look.px(6.0), py)).map_err(err)?;
    }
    let unit = look.text(fs, &MUTED).pos(Pos::new(HPos::Left, VPos::Bottom));
    root.draw_text("ε", &unit, (bar_x, top - look.px(4.0))).map_err(err)?;
    if look.legend {
        draw_legend_row(
            root,
            look,
            left + look.px(12.0),
            top + look.px(16.0),
            &WHITE,
            false,
            "emissivity (colour scale at right); dashed: 8 and 13 µm",
        )?;
    }
    Ok(frame)
}
