//! The layer-stack emitter as the radiator panel shows it: the material list with each
//! material's source and valid range, the page's words for a material typed by hand, the
//! thickness steps of the keys and the bar diagram's heights, and the stack's optics over
//! wavelength (reflectance, transmittance into the substrate, absorptance in the layers and
//! the emissivity, at normal incidence and at a second angle) and over wavelength and angle
//! together (the emissivity map), with their CSV.
//!
//! The numbers come from [`crate::physics::film`] on the scenario's own stack inputs
//! ([`crate::scenario::film::film_inputs`], each material held at the end values of its
//! range beyond it, as the balance does), so the map is the emissivity the balance uses.
//!
//! Architecture invariant: pure functions of the stack; no web crate; every accepted range is
//! the scenario's.

use std::fmt::Write;

use crate::physics::film::{coherent_mean, emissivity, Response};
use crate::physics::materials::BUILTINS;
use crate::scenario::film::{film_inputs, Coherence, FilmError, LayerSpec, MaterialSpec, THICKNESS_RANGE_NM};
use crate::view::format::{csv_num, field};

/// Wavelengths the stack's plots span [um].
pub const PLOT_RANGE_UM: (f64, f64) = (0.3, 30.0);
/// Wavelengths of the reflectance, transmittance and absorptance curves: settled, and while
/// a thickness is dragged or a key held.
pub const SPECTRUM_POINTS: usize = 480;
pub const SPECTRUM_POINTS_COARSE: usize = 200;
/// Cells of the emissivity map (wavelength × angle): settled, and while dragging.
pub const MAP_CELLS: (usize, usize) = (180, 45);
pub const MAP_CELLS_COARSE: (usize, usize) = (90, 18);
/// The second angle offered for the curves [deg from the normal].
pub const SECOND_ANGLES_DEG: [f64; 4] = [30.0, 45.0, 60.0, 75.0];
/// Most layers the page's table offers to add (the scenario takes more from a link).
pub const PAGE_MAX_LAYERS: usize = 20;
/// Thickness of a layer added by the table [nm].
pub const NEW_LAYER_NM: f64 = 100.0;

/// Air, the medium above the stack.
pub fn air() -> MaterialSpec {
    MaterialSpec::Index { n: 1.0, k: 0.0 }
}

fn builtin(name: &str) -> MaterialSpec {
    MaterialSpec::Builtin { name: name.into() }
}

fn layer(name: &str, nm: f64) -> LayerSpec {
    LayerSpec { material: builtin(name), thickness_nm: nm, coherence: Coherence::Auto }
}

/// The stack offered when the user first switches to layers: a thin hafnia cap over
/// alumina and silica films on silver (a reflector for sunlight whose oxide films emit in
/// the 8-13 µm window).
pub fn default_stack() -> (Vec<LayerSpec>, MaterialSpec) {
    (vec![layer("hfo2", 50.0), layer("al2o3-ir", 800.0), layer("silica-ir", 1200.0)], builtin("ag"))
}

/// A built-in material as the page lists it.
#[derive(Debug, Clone, PartialEq)]
pub struct MaterialInfo {
    pub name: &'static str,
    pub what: &'static str,
    pub source: String,
    /// valid wavelengths [um]
    pub range_um: (f64, f64),
}

impl MaterialInfo {
    /// "0.248–12.4 µm"
    pub fn range_text(&self) -> String {
        format!("{}–{} µm", field(self.range_um.0, 3), field(self.range_um.1, 3))
    }

    /// The option's text in the material list.
    pub fn option_text(&self) -> String {
        format!("{} · {}", self.what, self.range_text())
    }
}

/// Every built-in material (each built once).
pub fn builtin_materials() -> Vec<MaterialInfo> {
    BUILTINS
        .iter()
        .map(|b| {
            let m = (b.build)();
            MaterialInfo {
                name: b.name,
                what: b.what,
                source: m.source,
                range_um: (m.range_m.0 * 1e6, m.range_m.1 * 1e6),
            }
        })
        .collect()
}

/// The text a material field shows: a built-in name, `n=1.5` or `nk=2.1/0.05`, a table's name.
pub fn material_text(m: &MaterialSpec) -> String {
    m.text()
}

/// What the page says about a material: what it is, its range and its source.
pub fn material_about(m: &MaterialSpec, list: &[MaterialInfo]) -> String {
    match m {
        MaterialSpec::Builtin { name } => match list.iter().find(|i| i.name.eq_ignore_ascii_case(name)) {
            Some(i) => format!("{}, {}; {}", i.what, i.range_text(), i.source),
            None => format!("'{name}' is not a built-in material"),
        },
        MaterialSpec::Index { n, k } if *k == 0.0 => {
            format!("constant index n = {}, lossless, at every wavelength", field(*n, 6))
        }
        MaterialSpec::Index { n, k } => {
            format!("constant index n = {}, k = {} (absorbing), at every wavelength", field(*n, 6), field(*k, 6))
        }
        MaterialSpec::Table { name, wavelength_m, .. } => format!(
            "n,k table '{name}', {} rows, {}–{} µm",
            wavelength_m.len(),
            field(wavelength_m.first().copied().unwrap_or(0.0) * 1e6, 3),
            field(wavelength_m.last().copied().unwrap_or(0.0) * 1e6, 3)
        ),
        MaterialSpec::File { path } => format!("the n,k file '{path}'"),
    }
}

/// A material as typed in the page's material field: a built-in name from the list, a
/// constant index `n=1.5` or `nk=2.1/0.05`; the message says what is accepted.
pub fn parse_material(text: &str) -> Result<MaterialSpec, String> {
    let t = text.trim();
    if t.is_empty() {
        return Err("choose a material from the list, or type a constant index such as n=1.5 or nk=2.1/0.05".into());
    }
    if t.get(..5).is_some_and(|p| p.eq_ignore_ascii_case("file:")) {
        return Err(
            "the page does not read n,k files by path; choose a material from the list or type n=… or nk=…/…".into()
        );
    }
    // the list's option text starts with the name
    let name = t.split(" · ").next().unwrap_or(t).trim();
    match MaterialSpec::parse(name) {
        Ok(m) => Ok(m),
        Err(_) if name.contains('=') => Err(format!(
            "'{name}' is not a constant index; type n=1.5 (lossless) or nk=2.1/0.05 (n and k, k at least 0)"
        )),
        Err(_) => Err(format!(
            "'{name}' is not a material in the list; choose one from the list, or type a constant index such as n=1.5 or nk=2.1/0.05"
        )),
    }
}

/// The thickness after one key step [nm]: about 1 % of it (at least 1 nm; ten times that
/// with Shift), landing on a multiple of the step, within the scenario's range.
pub fn step_thickness(d_nm: f64, dir: i32, big: bool) -> f64 {
    let d = if d_nm.is_finite() { d_nm.max(0.0) } else { 0.0 };
    let base = 10f64.powf((d.max(1.0).log10().floor() - 2.0).max(0.0));
    let step = if big { base * 10.0 } else { base };
    let next = ((d / step).round() + dir as f64) * step;
    next.clamp(THICKNESS_RANGE_NM.0, THICKNESS_RANGE_NM.1)
}

/// A dragged thickness [nm] rounded as people read it: to 0.1 nm below 10 nm, to 1 nm
/// below 1000 nm, else to 3 significant figures; never below 0.
pub fn round_thickness(d_nm: f64) -> f64 {
    if !d_nm.is_finite() || d_nm <= 0.0 {
        return 0.0;
    }
    let r = if d_nm < 10.0 {
        (d_nm * 10.0).round() / 10.0
    } else if d_nm < 1000.0 {
        d_nm.round()
    } else {
        crate::view::format::round_sig(d_nm, 3)
    };
    r.min(THICKNESS_RANGE_NM.1)
}

/// Heights of the bar diagram's layers [px] for `room` px: proportional to thickness, each
/// at least `min` px. Returns the heights and the px per nm of the layers above the minimum.
pub fn bar_heights(thickness_nm: &[f64], room: f64, min: f64) -> (Vec<f64>, f64) {
    let n = thickness_nm.len();
    if n == 0 {
        return (Vec::new(), 0.0);
    }
    let d: Vec<f64> = thickness_nm.iter().map(|t| if t.is_finite() { t.max(0.0) } else { 0.0 }).collect();
    let mut pinned = vec![false; n];
    let mut scale = 0.0;
    // pin the thin layers at the minimum and share the rest; a few rounds settle it
    for _ in 0..n + 1 {
        let free: f64 = d.iter().zip(&pinned).filter(|(_, p)| !**p).map(|(t, _)| t).sum();
        let left = room - min * pinned.iter().filter(|p| **p).count() as f64;
        scale = if free > 0.0 { (left / free).max(0.0) } else { 0.0 };
        let mut changed = false;
        for i in 0..n {
            if !pinned[i] && d[i] * scale < min {
                pinned[i] = true;
                changed = true;
            }
        }
        if !changed {
            break;
        }
    }
    let h = d.iter().zip(&pinned).map(|(t, p)| if *p { min } else { (t * scale).max(min) }).collect();
    (h, scale)
}

/// The stack's optics as the panel plots them.
#[derive(Debug, Clone)]
pub struct FilmView {
    pub layers: Vec<LayerSpec>,
    pub substrate: MaterialSpec,
    /// the substrate absorbs somewhere in the plotted range (k > 0): emissivity is 1 − R there
    pub absorbing_substrate: bool,
    /// the curves' wavelengths [um], log-spaced over [`PLOT_RANGE_UM`]
    pub lambda_um: Vec<f64>,
    /// at normal incidence, and the emissivity there
    pub normal: Vec<Response>,
    pub normal_eps: Vec<f64>,
    /// the second angle [deg] and the curves there
    pub angle_deg: Option<f64>,
    pub oblique: Vec<Response>,
    /// the map's cell centres: wavelengths [um] (log-spaced) and angles [deg]
    pub map_lambda_um: Vec<f64>,
    pub map_angle_deg: Vec<f64>,
    /// emissivity by angle (rows, from the normal) then wavelength
    pub map: Vec<f64>,
    /// computed on the coarse grids of a drag
    pub coarse: bool,
}

fn log_grid(n: usize, centred: bool) -> Vec<f64> {
    let (a, b) = (PLOT_RANGE_UM.0.log10(), PLOT_RANGE_UM.1.log10());
    (0..n)
        .map(|i| {
            let t = if centred { (i as f64 + 0.5) / n as f64 } else { i as f64 / (n - 1).max(1) as f64 };
            10f64.powf(a + (b - a) * t)
        })
        .collect()
}

/// Compute the plots of a stack in air on `substrate`; `angle_deg` adds curves at a second
/// angle; `coarse` uses the drag's smaller grids. Errors name the part of the stack.
pub fn film_view(
    layers: &[LayerSpec],
    substrate: &MaterialSpec,
    angle_deg: Option<f64>,
    coarse: bool,
) -> Result<FilmView, FilmError> {
    let inputs = film_inputs(&air(), layers, substrate)?;
    let n = if coarse { SPECTRUM_POINTS_COARSE } else { SPECTRUM_POINTS };
    let lambda_um = log_grid(n, false);
    let angle = angle_deg.filter(|a| a.is_finite() && *a > 0.0 && *a < 90.0);
    let mut normal = Vec::with_capacity(n);
    let mut normal_eps = Vec::with_capacity(n);
    let mut oblique = Vec::new();
    let mut absorbing = false;
    for l in &lambda_um {
        let lm = l * 1e-6;
        let (n0, ls, sub) = inputs.at_held(lm);
        absorbing |= sub.im > 0.0;
        normal.push(coherent_mean(n0, &ls, sub, lm, 0.0));
        normal_eps.push(emissivity(n0, &ls, sub, lm, 0.0));
        if let Some(a) = angle {
            oblique.push(coherent_mean(n0, &ls, sub, lm, a.to_radians()));
        }
    }
    let (nx, ny) = if coarse { MAP_CELLS_COARSE } else { MAP_CELLS };
    let map_lambda_um = log_grid(nx, true);
    let map_angle_deg: Vec<f64> = (0..ny).map(|j| 90.0 * (j as f64 + 0.5) / ny as f64).collect();
    let mut map = vec![0.0; nx * ny];
    for (i, l) in map_lambda_um.iter().enumerate() {
        let lm = l * 1e-6;
        let (n0, ls, sub) = inputs.at_held(lm);
        for (j, a) in map_angle_deg.iter().enumerate() {
            map[j * nx + i] = emissivity(n0, &ls, sub, lm, a.to_radians());
        }
    }
    Ok(FilmView {
        layers: layers.to_vec(),
        substrate: substrate.clone(),
        absorbing_substrate: absorbing,
        lambda_um,
        normal,
        normal_eps,
        angle_deg: angle,
        oblique,
        map_lambda_um,
        map_angle_deg,
        map,
        coarse,
    })
}

impl FilmView {
    /// Index of the curve wavelength nearest to `l_um` (on the log axis).
    pub fn nearest(&self, l_um: f64) -> Option<usize> {
        let x = l_um.log10();
        (0..self.lambda_um.len())
            .min_by(|a, b| (self.lambda_um[*a].log10() - x).abs().total_cmp(&(self.lambda_um[*b].log10() - x).abs()))
    }

    /// The map cell (wavelength index, angle index) holding (l_um, angle_deg).
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn map_cell(&self, l_um: f64, angle_deg: f64) -> Option<(usize, usize)> {
        let (nx, ny) = (self.map_lambda_um.len(), self.map_angle_deg.len());
        if nx == 0 || ny == 0 || !(l_um > 0.0) || !angle_deg.is_finite() {
            return None;
        }
        let (a, b) = (PLOT_RANGE_UM.0.log10(), PLOT_RANGE_UM.1.log10());
        let i = (((l_um.log10() - a) / (b - a)) * nx as f64).floor().clamp(0.0, (nx - 1) as f64) as usize;
        let j = (angle_deg / 90.0 * ny as f64).floor().clamp(0.0, (ny - 1) as f64) as usize;
        Some((i, j))
    }

    pub fn map_at(&self, i: usize, j: usize) -> f64 {
        self.map.get(j * self.map_lambda_um.len() + i).copied().unwrap_or(0.0)
    }
}

/// What lies behind the stack, in words.
pub fn substrate_note(absorbing: bool) -> &'static str {
    if absorbing {
        "The substrate absorbs (k > 0) and is taken as thick: whatever enters it is absorbed, so the emissivity is 1 − R (reflectance of the whole stack)."
    } else {
        "The substrate is lossless (k = 0) and taken as thick: light that enters it leaves through it, so the emissivity is only what the layers absorb, 1 − R − T."
    }
}

/// One line describing the stack, for exported figures and files.
pub fn stack_caption(v: &FilmView) -> String {
    let list: Vec<String> =
        v.layers.iter().map(|l| format!("{} {} nm", l.material.text(), field(l.thickness_nm, 6))).collect();
    let stack = if list.is_empty() { "bare substrate".to_string() } else { list.join(" / ") };
    format!("Glowgap · radiator · layers in air: {stack} · on {} · 0.3–30 µm", v.substrate.text())
}

/// The curves as CSV: wavelength, R, T, A and emissivity at the normal (and at the second
/// angle).
pub fn spectrum_csv(v: &FilmView) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "# Glowgap: reflectance, transmittance into the substrate, absorptance in the layers, emissivity"
    );
    let _ = writeln!(out, "# {}", stack_caption(v));
    let _ = writeln!(out, "# {}", substrate_note(v.absorbing_substrate));
    let _ = write!(out, "wavelength_um,reflectance,transmittance,absorptance,emissivity");
    if let Some(a) = v.angle_deg {
        let a = field(a, 4);
        let _ = write!(out, ",reflectance_{a}deg,transmittance_{a}deg,absorptance_{a}deg");
    }
    out.push('\n');
    for (i, l) in v.lambda_um.iter().enumerate() {
        let r = v.normal[i];
        let _ = write!(
            out,
            "{},{},{},{},{}",
            csv_num(*l),
            csv_num(r.reflectance),
            csv_num(r.transmittance),
            csv_num(r.absorptance),
            csv_num(v.normal_eps[i])
        );
        if let Some(o) = v.oblique.get(i) {
            let _ = write!(out, ",{},{},{}", csv_num(o.reflectance), csv_num(o.transmittance), csv_num(o.absorptance));
        }
        out.push('\n');
    }
    out
}

/// The emissivity map as a long CSV table.
pub fn map_csv(v: &FilmView) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: emissivity by wavelength and angle from the normal (unpolarized)");
    let _ = writeln!(out, "# {}", stack_caption(v));
    let _ = writeln!(out, "wavelength_um,angle_deg,emissivity");
    let nx = v.map_lambda_um.len();
    for (j, a) in v.map_angle_deg.iter().enumerate() {
        for (i, l) in v.map_lambda_um.iter().enumerate() {
            let _ = writeln!(out, "{},{},{}", csv_num(*l), csv_num(*a), csv_num(v.map[j * nx + i]));
        }
    }
    out
}

/// The stack as CSV: one row per layer from the top, then the substrate.
pub fn stack_csv(v: &FilmView, list: &[MaterialInfo]) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Glowgap: layer stack, first layer facing the sky");
    let _ = writeln!(out, "# {}", stack_caption(v));
    let _ = writeln!(out, "position,material,thickness_nm,about");
    let quote = |s: String| format!("\"{}\"", s.replace('"', "'"));
    for (i, l) in v.layers.iter().enumerate() {
        let _ = writeln!(
            out,
            "{},{},{},{}",
            i + 1,
            quote(l.material.text()),
            csv_num(l.thickness_nm),
            quote(material_about(&l.material, list))
        );
    }
    let _ = writeln!(out, "substrate,{},,{}", quote(v.substrate.text()), quote(material_about(&v.substrate, list)));
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::radiator::EmitterSpec;

    #[test]
    fn default_stack_checks_out_and_its_map_is_the_balances_emissivity() {
        let (layers, substrate) = default_stack();
        let v = film_view(&layers, &substrate, Some(60.0), false).unwrap();
        assert!(v.absorbing_substrate);
        assert_eq!(v.map.len(), MAP_CELLS.0 * MAP_CELLS.1);
        // the normal emissivity agrees with the radiator's own profile of the same stack
        let profile = EmitterSpec::Film { layers, substrate }.to_profile().unwrap();
        for (i, l) in v.lambda_um.iter().enumerate().step_by(37) {
            let want = profile.at(l * 1e-6);
            // the profile's table is linear between its fringe-resolving wavelengths
            assert!((v.normal_eps[i] - want).abs() < 0.02, "{l} um: {} {want}", v.normal_eps[i]);
            let r = v.normal[i];
            assert!((r.reflectance + r.transmittance + r.absorptance - 1.0).abs() < 1e-9);
        }
        assert!(v.map.iter().all(|e| (0.0..=1.0).contains(e)));
    }

    #[test]
    fn bad_stacks_name_their_part() {
        let (mut layers, substrate) = default_stack();
        layers[1].thickness_nm = -5.0;
        let e = film_view(&layers, &substrate, None, true).unwrap_err();
        assert_eq!(e.part, crate::scenario::film::FilmPart::Layer(1));
    }

    #[test]
    fn typed_materials() {
        assert_eq!(parse_material(" HfO2 ").unwrap(), MaterialSpec::Builtin { name: "hfo2".into() });
        assert_eq!(parse_material("n=1.5").unwrap(), MaterialSpec::Index { n: 1.5, k: 0.0 });
        assert_eq!(parse_material("nk=2/0.1").unwrap(), MaterialSpec::Index { n: 2.0, k: 0.1 });
        assert!(parse_material("unobtainium").unwrap_err().contains("not a material in the list"));
        assert!(parse_material("n=abc").unwrap_err().contains("not a constant index"));
        assert!(parse_material("file:/x").is_err());
        let list = builtin_materials();
        assert_eq!(list.len(), BUILTINS.len());
        // an option's own text is taken too
        let opt = format!("{} · {}", list[0].name, list[0].option_text());
        assert_eq!(parse_material(&opt).unwrap(), MaterialSpec::Builtin { name: list[0].name.into() });
    }

    #[test]
    fn thickness_steps_and_bars() {
        assert_eq!(step_thickness(100.0, 1, false), 101.0);
        assert_eq!(step_thickness(100.0, -1, true), 90.0);
        assert_eq!(step_thickness(1200.0, 1, false), 1210.0);
        assert_eq!(step_thickness(0.0, -1, false), 0.0);
        assert_eq!(step_thickness(5.0, 1, false), 6.0);
        assert_eq!(round_thickness(123.4), 123.0);
        assert_eq!(round_thickness(-3.0), 0.0);
        let (h, s) = bar_heights(&[10.0, 1000.0, 1000.0], 200.0, 12.0);
        assert_eq!(h[0], 12.0);
        assert!((h.iter().sum::<f64>() - 200.0).abs() < 1e-9);
        assert!((h[1] - 94.0).abs() < 1e-9 && (s - 0.094).abs() < 1e-12);
    }
}
