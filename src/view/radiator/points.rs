//! Emissivity profiles as the editor handles them: the presets, any profile turned into
//! control points, and the point edits (move, add, remove) with the rounding and the
//! ordering rules that keep every edit a valid scenario.

use crate::scenario::radiator::{EmitterSpec, MAX_POINTS, WAVELENGTH_RANGE_UM};
use crate::view::format::round_sig;

/// The wavelengths the editor always shows [um].
pub const EDITOR_RANGE_UM: (f64, f64) = (0.3, 50.0);
/// Neighbouring control points stay at least this ratio apart in wavelength.
const MIN_RATIO: f64 = 1.002;
/// Points a measured table is sampled at when it becomes control points.
const TABLE_SAMPLES: usize = 40;
/// Keyboard steps: wavelength by 1 % (Shift: 10 %), emissivity by 0.01 (Shift: 0.1).
pub const KEY_STEP_RATIO: (f64, f64) = (1.01, 1.10);
pub const KEY_STEP_EPS: (f64, f64) = (0.01, 0.1);
/// With snapping on: emissivity to multiples of 0.05, wavelength to two significant figures.
const SNAP_EPS: f64 = 0.05;

/// A starting profile: (hook, button text, description).
pub const PRESETS: [(&str, &str, &str); 5] = [
    ("blackbody", "Blackbody", "emissivity 1 at every wavelength"),
    ("grey", "Grey 0.9", "emissivity 0.9 at every wavelength"),
    ("window", "Ideal window", "1 from 8 to 13 um, 0 elsewhere: the ideal selective emitter"),
    (
        "white-paint",
        "White-paint-like",
        "low in the visible, high in the thermal infrared (an illustrative shape, not a product)",
    ),
    (
        "polished-metal",
        "Polished-metal-like",
        "low everywhere, a little higher at short wavelengths (an illustrative shape)",
    ),
];

/// An illustrative pigmented white coating: absorbing in the ultraviolet, scattering in the
/// visible, increasingly absorbing through the near infrared, nearly black beyond 3 um.
const WHITE_PAINT: [[f64; 2]; 15] = [
    [0.30, 0.92],
    [0.37, 0.88],
    [0.42, 0.10],
    [0.70, 0.06],
    [1.20, 0.08],
    [1.70, 0.15],
    [2.20, 0.22],
    [2.70, 0.70],
    [3.20, 0.85],
    [5.00, 0.90],
    [8.00, 0.94],
    [9.50, 0.90],
    [13.0, 0.95],
    [20.0, 0.93],
    [50.0, 0.93],
];

/// An illustrative bare, polished metal: a few per cent, a little more in the blue.
const POLISHED_METAL: [[f64; 2]; 7] =
    [[0.30, 0.30], [0.50, 0.15], [0.80, 0.08], [1.50, 0.05], [5.00, 0.03], [15.0, 0.025], [50.0, 0.02]];

/// The profile of a preset hook.
pub fn preset(hook: &str) -> Option<EmitterSpec> {
    Some(match hook {
        "blackbody" => EmitterSpec::Blackbody,
        "grey" => EmitterSpec::Grey { emissivity: 0.9 },
        "window" => EmitterSpec::Window { from_um: 8.0, to_um: 13.0, inside: 1.0, outside: 0.0, edge_um: 0.0 },
        "white-paint" => EmitterSpec::Points { points: WHITE_PAINT.to_vec() },
        "polished-metal" => EmitterSpec::Points { points: POLISHED_METAL.to_vec() },
        _ => return None,
    })
}

/// The preset hook a profile is, if it is one unchanged.
pub fn preset_of(spec: &EmitterSpec) -> Option<&'static str> {
    PRESETS.iter().map(|p| p.0).find(|h| preset(h).as_ref() == Some(spec))
}

/// A point as the link keeps it: wavelength to 4 significant figures, emissivity to 0.001.
pub fn tidy_point([l, e]: [f64; 2]) -> [f64; 2] {
    [round_sig(l, 4), ((e * 1000.0).round() / 1000.0).clamp(0.0, 1.0)]
}

/// Make points strictly ascending (a later point at the same wavelength is dropped).
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(b > a)` also drops a NaN wavelength
fn ascending(mut pts: Vec<[f64; 2]>) -> Vec<[f64; 2]> {
    crate::physics::order::sort_ascending_by(&mut pts, |p| p[0]);
    pts.dedup_by(|b, a| !(b[0] > a[0]));
    pts
}

/// [`TABLE_SAMPLES`] points of `profile` from `lo` to `hi` [um], evenly on a log axis.
fn sampled(profile: &crate::physics::radiator::Profile, lo: f64, hi: f64) -> Vec<[f64; 2]> {
    let n = TABLE_SAMPLES;
    (0..n)
        .map(|i| {
            let l = lo * (hi / lo).powf(i as f64 / (n - 1) as f64);
            [l, profile.at(l * 1e-6)]
        })
        .collect()
}

/// Any profile as control points that draw (nearly) the same curve: a grey profile as two
/// points, a window with short ramps at its edges, a measured table sampled at
/// logarithmically spaced wavelengths. `None` for a file not yet read.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(hi > lo)` also catches NaN table ends
pub fn as_points(spec: &EmitterSpec) -> Option<Vec<[f64; 2]>> {
    let (r0, r1) = EDITOR_RANGE_UM;
    let pts = match spec {
        EmitterSpec::Blackbody => vec![[r0, 1.0], [r1, 1.0]],
        EmitterSpec::Grey { emissivity } => vec![[r0, *emissivity], [r1, *emissivity]],
        EmitterSpec::Points { points } => points.clone(),
        EmitterSpec::Window { from_um, to_um, inside, outside, edge_um } => {
            let (a, b) = (from_um.min(*to_um), to_um.max(*from_um));
            let lo = r0.min(a / 1.05);
            let hi = r1.max(b * 1.05);
            if *edge_um > 0.0 {
                let profile = spec.to_profile().ok()?;
                let w = *edge_um;
                [lo, a - w, a - w / 2.0, a, a + w / 2.0, a + w, b - w, b - w / 2.0, b, b + w / 2.0, b + w, hi]
                    .into_iter()
                    .filter(|l| *l > 0.0)
                    .map(|l| [l, profile.at(l * 1e-6)])
                    .collect()
            } else {
                vec![
                    [lo, *outside],
                    [a / 1.02, *outside],
                    [a, *inside],
                    [b, *inside],
                    [b * 1.02, *outside],
                    [hi, *outside],
                ]
            }
        }
        // the film's normal emissivity, sampled like a table over the editor's range
        EmitterSpec::Film { .. } => sampled(&spec.to_profile().ok()?, r0, r1),
        EmitterSpec::Table(t) => {
            let profile = spec.to_profile().ok()?;
            let first = t.wavelength_m.first()? * 1e6;
            let last = t.wavelength_m.last()? * 1e6;
            let (lo, hi) = (first.max(WAVELENGTH_RANGE_UM.0), last.min(WAVELENGTH_RANGE_UM.1));
            if !(hi > lo) {
                vec![[lo, profile.at(lo * 1e-6)]]
            } else {
                sampled(&profile, lo, hi)
            }
        }
        EmitterSpec::File { .. } => return None,
    };
    let pts: Vec<[f64; 2]> =
        pts.into_iter().map(|[l, e]| tidy_point([l.clamp(WAVELENGTH_RANGE_UM.0, WAVELENGTH_RANGE_UM.1), e])).collect();
    Some(ascending(pts))
}

/// Snap a point to the coarse grid (two significant figures, emissivity 0.05).
fn snapped([l, e]: [f64; 2]) -> [f64; 2] {
    [round_sig(l, 2), ((e / SNAP_EPS).round() * SNAP_EPS).clamp(0.0, 1.0)]
}

/// Point `i` moved to (`l` um, `e`), kept between its neighbours and in `range` [um],
/// emissivity clamped to 0-1, snapped when `snap`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // `!(hi >= lo)` also refuses NaN bounds
pub fn move_point(points: &[[f64; 2]], i: usize, l: f64, e: f64, range: (f64, f64), snap: bool) -> Vec<[f64; 2]> {
    let mut out = points.to_vec();
    if i >= out.len() || !l.is_finite() || !e.is_finite() {
        return out;
    }
    let lo = if i > 0 { out[i - 1][0] * MIN_RATIO } else { range.0.max(WAVELENGTH_RANGE_UM.0) };
    let hi = if i + 1 < out.len() { out[i + 1][0] / MIN_RATIO } else { range.1.min(WAVELENGTH_RANGE_UM.1) };
    if !(hi >= lo) {
        return out;
    }
    let raw = [l.clamp(lo, hi), e.clamp(0.0, 1.0)];
    let mut p = if snap { snapped(raw) } else { tidy_point(raw) };
    // rounding may cross a neighbour: fall back to the finer value
    if !(p[0] >= lo && p[0] <= hi) {
        p[0] = round_sig(raw[0], 6).clamp(lo, hi);
    }
    out[i] = p;
    out
}

/// Move point `i` by whole key steps: `dl` steps in wavelength (1 % each, `big`: 10 %) and
/// `de` steps in emissivity (0.01 each, `big`: 0.1).
pub fn step_point(points: &[[f64; 2]], i: usize, dl: i32, de: i32, big: bool, range: (f64, f64)) -> Vec<[f64; 2]> {
    let Some([l, e]) = points.get(i).copied() else { return points.to_vec() };
    let ratio = if big { KEY_STEP_RATIO.1 } else { KEY_STEP_RATIO.0 };
    let de_step = if big { KEY_STEP_EPS.1 } else { KEY_STEP_EPS.0 };
    move_point(points, i, l * ratio.powi(dl), e + de as f64 * de_step, range, false)
}

/// A new point at (`l` um, `e`) in wavelength order; returns the points and its index, or
/// why it cannot be added.
pub fn insert_at(points: &[[f64; 2]], l: f64, e: f64) -> Result<(Vec<[f64; 2]>, usize), String> {
    if points.len() >= MAX_POINTS {
        return Err(format!("A profile holds at most {MAX_POINTS} control points; remove one first."));
    }
    let p = tidy_point([l.clamp(WAVELENGTH_RANGE_UM.0, WAVELENGTH_RANGE_UM.1), e]);
    let i = points.partition_point(|q| q[0] < p[0]);
    let near = |q: &[f64; 2]| q[0] / p[0] < MIN_RATIO && p[0] / q[0] < MIN_RATIO;
    if points.get(i).is_some_and(near) || (i > 0 && near(&points[i - 1])) {
        return Err(format!("There is already a control point at {} um; add the new one a little further away.", p[0]));
    }
    let mut out = points.to_vec();
    out.insert(i, p);
    Ok((out, i))
}

/// A new point after point `i`: midway (on the log axis) to the next one, or a tenth of a
/// decade beyond the last; its emissivity on the current curve.
pub fn insert_after(points: &[[f64; 2]], i: usize, range: (f64, f64)) -> Result<(Vec<[f64; 2]>, usize), String> {
    let Some(a) = points.get(i) else { return Err("Select a control point first.".into()) };
    let (l, e) = match points.get(i + 1) {
        Some(b) => ((a[0] * b[0]).sqrt(), 0.5 * (a[1] + b[1])),
        None if a[0] * 1.26 <= range.1 => (a[0] * 1.26, a[1]),
        None => match i.checked_sub(1).and_then(|j| points.get(j)) {
            Some(b) => ((a[0] * b[0]).sqrt(), 0.5 * (a[1] + b[1])),
            None => (a[0] / 1.26, a[1]),
        },
    };
    insert_at(points, l, e)
}

/// The points without point `i`, or why not (a profile keeps at least one point).
pub fn remove(points: &[[f64; 2]], i: usize) -> Result<Vec<[f64; 2]>, String> {
    if points.len() <= 1 {
        return Err(
            "A profile needs at least one control point; this is the last one. Move it, or choose a preset.".into()
        );
    }
    let mut out = points.to_vec();
    if i < out.len() {
        out.remove(i);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every edit must give a profile the scenario accepts (ascending, in range, 0-1).
    fn accepted(points: &[[f64; 2]]) {
        let spec = EmitterSpec::Points { points: points.to_vec() };
        assert!(spec.to_profile().is_ok(), "{points:?} refused: {:?}", spec.to_profile().err());
        assert!(points.windows(2).all(|w| w[1][0] > w[0][0]), "not ascending: {points:?}");
    }

    #[test]
    fn presets_are_valid_and_recognized() {
        for (hook, _, _) in PRESETS {
            let spec = preset(hook).unwrap();
            assert!(spec.to_profile().is_ok(), "{hook}");
            assert_eq!(preset_of(&spec), Some(hook));
            accepted(&as_points(&spec).unwrap());
        }
        assert_eq!(preset("no-such-preset"), None);
    }

    #[test]
    fn window_as_points_keeps_its_edges() {
        let spec = preset("window").unwrap();
        let pts = as_points(&spec).unwrap();
        let profile = EmitterSpec::Points { points: pts }.to_profile().unwrap();
        // inside the 8-13 um window the emissivity is 1, well outside it 0 (the preset's definition)
        assert!((profile.at(10e-6) - 1.0).abs() < 1e-9);
        assert!(profile.at(5e-6).abs() < 1e-9 && profile.at(20e-6).abs() < 1e-9);
    }

    #[test]
    fn moves_stay_between_neighbours_and_in_range() {
        let pts = vec![[1.0, 0.2], [5.0, 0.5], [10.0, 0.9]];
        // dragged far past the right neighbour: stops just short of it
        let m = move_point(&pts, 1, 50.0, 2.0, EDITOR_RANGE_UM, false);
        accepted(&m);
        // (rounded to 4 significant figures, so within 5e-4 relative of the limit)
        assert!(m[1][0] < 10.0 && m[1][0] >= 10.0 / MIN_RATIO * (1.0 - 5e-4), "{m:?}");
        assert_eq!(m[1][1], 1.0);
        // the first point cannot leave the editor's range
        let m = move_point(&pts, 0, 0.001, -1.0, EDITOR_RANGE_UM, false);
        accepted(&m);
        assert_eq!(m[0], [EDITOR_RANGE_UM.0, 0.0]);
        // snapping: two significant figures, emissivity to 0.05
        let m = move_point(&pts, 1, 5.4321, 0.537, EDITOR_RANGE_UM, true);
        assert_eq!(m[1], [5.4, 0.55]);
        // non-finite input leaves the points alone
        assert_eq!(move_point(&pts, 1, f64::NAN, 0.5, EDITOR_RANGE_UM, false), pts);
        // keys: one 1 % step right, one 0.01 step up
        let k = step_point(&pts, 1, 1, 1, false, EDITOR_RANGE_UM);
        assert_eq!(k[1], [5.05, 0.51]);
    }

    #[test]
    fn insert_and_remove() {
        let pts = vec![[1.0, 0.2], [4.0, 0.6]];
        let (p, i) = insert_at(&pts, 2.0, 0.4).unwrap();
        accepted(&p);
        assert_eq!((i, p[1]), (1, [2.0, 0.4]));
        assert!(insert_at(&pts, 1.001, 0.3).unwrap_err().contains("already a control point"));
        // after the first: midway on the log axis, mean emissivity
        let (p, i) = insert_after(&pts, 0, EDITOR_RANGE_UM).unwrap();
        assert_eq!((i, p[1]), (1, [2.0, 0.4]));
        let full: Vec<[f64; 2]> = (0..MAX_POINTS).map(|k| [0.5 * 1.05f64.powi(k as i32), 0.5]).collect();
        assert!(insert_at(&full, 49.0, 0.5).unwrap_err().contains("at most"));
        let r = remove(&pts, 0).unwrap();
        assert_eq!(r, vec![[4.0, 0.6]]);
        assert!(remove(&r, 0).unwrap_err().contains("at least one"));
    }
}
