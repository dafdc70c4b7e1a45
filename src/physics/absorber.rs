//! Cells with any absorptance a(E): a step, an Urbach tail, or a measured EQE, in the
//! radiative limit by the reciprocity between photovoltaic quantum efficiency and
//! electroluminescence (Rau, Phys. Rev. B 76, 085303, 2007):
//!
//! * Jsc = q X integral a(E) Phi_src(E) dE                                  [A m^-2]
//! * J0_rad = q g integral a(E) phi_bb(E; Tc) dE,   phi_bb = (2 pi / (h^3 c^2)) E^2 / (e^(E/kTc) - 1)
//!   (g = number of emitting faces; the black-body flux with its exact Bose factor)
//! * J(V) = Jsc - (J0_rad / ERE) (e^(qV/kTc) - 1): the emission of a cell whose absorptance is
//!   a(E) is a(E) phi_bb (e^(qV/kT) - 1) beyond the dark level (Rau 2007), and non-radiative recombination scales
//!   the dark current by 1/ERE (Green, Prog. Photovolt. 20, 472, 2012, eq. 3). Hence
//!   Voc = (kTc/q) ln(1 + ERE Jsc / J0_rad) and Voc = Voc_rad - (kTc/q) ln(1/ERE) up to the
//!   "+1"; the maximum power point is closed-form through Lambert W, as for any ideal diode.
//!
//! The e^(qV/kT) voltage law is what reciprocity gives for any absorptance; for a step cell it
//! is the Boltzmann approximation of the generalized Planck law, which differs from the exact
//! law by terms e^-(Eg - qV)/kT (below 1e-4 relative in R at one sun). Step cells solved
//! through [`solve_absorber`] keep the exact closed-form path of `junction`.
//!
//! Absorptance models:
//! * step at Eg (Shockley & Queisser 1961),
//! * Urbach tail: a(E) = 1 for E >= Eg and exp((E - Eg)/Eu) below (the exponential edge of
//!   Urbach, Phys. Rev. 92, 1324, 1953, joined to full absorption at Eg). For Eu >= kTc the
//!   tail dominates the emission and the radiative Voc collapses: the known breakdown of
//!   wide tails (recalled from Wong, Omelchenko & Atwater, ACS Energy Lett. 6, 52, 2021),
//! * a table, e.g. a measured EQE, linear between its points on its own axis and zero
//!   outside it.
//!
//! Numerics: integrals of a(E) times a source are done on the source's own axis: between
//! consecutive points of the union of the source table and the absorptance breakpoints the
//! source photon density is linear (the trapezoid model of `spectrum`) and a(E) is smooth, and
//! an 8-point Gauss-Legendre rule is applied (exact for polynomials of degree 15, so exact for
//! a step or a table on the same axis as the source). The black-body integrals of J0 use
//! panels no wider than kTc/2 (and Eu/2 on an Urbach tail), 8 Gauss points each, summed in
//! logarithms so that e^(-Eg/kT) never underflows; relative error below 1e-11 (the rule's
//! error on e^x over half a unit is ~ 1e-20; checked against scipy quad in the tests).
//! The black-body source integrals use panels of kTs/4.

use super::constants::{thermal_energy, CHARGE, PHOTON_FLUX_PREFACTOR};
use super::junction::{log_add, solve_cell, Cell, CellResult, Emission, Illumination, JvModel};
use super::sources::Source;
use super::special::{lambert_w_of_exp, scaled_bose2};
use super::spectrum::Axis;
use std::sync::Arc;

/// A tabulated absorptance (or EQE), 0 <= a <= 1, on a spectral axis (SI coordinates,
/// strictly ascending), linear between points on that axis, 0 outside.
#[derive(Debug, Clone, PartialEq)]
pub struct AbsorptanceTable {
    pub name: String,
    axis: Axis,
    x: Vec<f64>,
    a: Vec<f64>,
}

impl AbsorptanceTable {
    /// Check and build. `x` in SI (m, J or m^-1), strictly ascending and positive; `a` in
    /// [0, 1]; at least two points.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn new(name: impl Into<String>, axis: Axis, x: Vec<f64>, a: Vec<f64>) -> Result<AbsorptanceTable, String> {
        if x.len() != a.len() || x.len() < 2 {
            return Err(format!(
                "an absorptance table needs at least two points with one value each, this one has {} coordinates and {} values",
                x.len(),
                a.len()
            ));
        }
        for i in 0..x.len() {
            if !(x[i].is_finite() && x[i] > 0.0) {
                return Err(format!("point {} has a spectral coordinate that is not a positive number", i + 1));
            }
            if i > 0 && !(x[i] > x[i - 1]) {
                return Err(format!(
                    "point {} does not increase along the spectral axis (sort the points, without duplicates)",
                    i + 1
                ));
            }
            if !(a[i] >= 0.0 && a[i] <= 1.0) {
                return Err(format!("point {} has a quantum efficiency {} outside 0 to 1 (0 to 100 %)", i + 1, a[i]));
            }
        }
        let a = a.into_iter().map(|v| v + 0.0).collect();
        Ok(AbsorptanceTable { name: name.into(), axis, x, a })
    }

    /// The table's spectral axis.
    pub fn axis(&self) -> Axis {
        self.axis
    }
    /// Coordinates (SI, ascending).
    pub fn coordinates(&self) -> &[f64] {
        &self.x
    }
    /// Absorptance at each coordinate (fraction).
    pub fn values(&self) -> &[f64] {
        &self.a
    }

    /// a(E) at photon energy `e_j` [J]: linear in the table's own axis, 0 outside.
    pub fn at_energy(&self, e_j: f64) -> f64 {
        let u = self.axis.coordinate_of_energy(e_j);
        let n = self.x.len();
        if !(u >= self.x[0] && u <= self.x[n - 1]) {
            return 0.0;
        }
        let i = (self.x.partition_point(|&v| v <= u).max(1) - 1).min(n - 2);
        let t = (u - self.x[i]) / (self.x[i + 1] - self.x[i]);
        self.a[i] + t * (self.a[i + 1] - self.a[i])
    }

    /// Photon energies of the points [J], ascending.
    pub fn energies_j(&self) -> Vec<f64> {
        let mut e: Vec<f64> = self.x.iter().map(|&u| self.axis.energy_at(u)).collect();
        if !self.axis.increases_with_energy() {
            e.reverse();
        }
        e
    }

    /// A band gap to show for the table [J]: the lowest photon energy at which the
    /// absorptance reaches half its maximum (linear interpolation between points). A
    /// reporting convention only; the physics uses the whole table.
    #[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
    pub fn half_maximum_edge_j(&self) -> f64 {
        let e = self.energies_j();
        let a: Vec<f64> = e.iter().map(|&x| self.at_energy(x)).collect();
        let half = 0.5 * a.iter().copied().fold(0.0, f64::max);
        if !(half > 0.0) {
            return e[e.len() - 1];
        }
        for i in 0..e.len() {
            if a[i] >= half {
                if i == 0 {
                    return e[0];
                }
                let t = (half - a[i - 1]) / (a[i] - a[i - 1]);
                return e[i - 1] + t * (e[i] - e[i - 1]);
            }
        }
        e[e.len() - 1]
    }
}

/// The absorptance a(E) of a cell.
#[derive(Debug, Clone, PartialEq)]
pub enum Absorptance {
    /// 1 at and above `gap_j` [J], 0 below.
    Step { gap_j: f64 },
    /// 1 at and above `gap_j` [J], exp((E - Eg)/Eu) below, Eu = `urbach_j` [J] > 0.
    Urbach { gap_j: f64, urbach_j: f64 },
    /// A table, e.g. a measured EQE.
    Table(Arc<AbsorptanceTable>),
}

impl Absorptance {
    /// a(E) (dimensionless) at photon energy `e_j` [J]; the Urbach tail below Eg is
    /// exp((E - Eg)/Eu) (Urbach 1953).
    pub fn at(&self, e_j: f64) -> f64 {
        match self {
            Absorptance::Step { gap_j } => {
                if e_j >= *gap_j {
                    1.0
                } else {
                    0.0
                }
            }
            Absorptance::Urbach { gap_j, urbach_j } => {
                if e_j >= *gap_j {
                    1.0
                } else {
                    ((e_j - gap_j) / urbach_j).exp()
                }
            }
            Absorptance::Table(t) => t.at_energy(e_j),
        }
    }

    /// The band gap shown for this absorptance [J] (for a table, see
    /// [`AbsorptanceTable::half_maximum_edge_j`]).
    pub fn edge_j(&self) -> f64 {
        match self {
            Absorptance::Step { gap_j } | Absorptance::Urbach { gap_j, .. } => *gap_j,
            Absorptance::Table(t) => t.half_maximum_edge_j(),
        }
    }

    /// Finite positive parameters (energies [J]).
    pub fn is_valid(&self) -> bool {
        match self {
            Absorptance::Step { gap_j } => gap_j.is_finite() && *gap_j > 0.0,
            Absorptance::Urbach { gap_j, urbach_j } => {
                gap_j.is_finite() && *gap_j > 0.0 && urbach_j.is_finite() && *urbach_j > 0.0
            }
            Absorptance::Table(_) => true,
        }
    }
}

// ------------------------------------------------------------------------ quadrature

/// Gauss-Legendre nodes and weights on [-1, 1], 8 points (half shown, symmetric; A&S
/// table 25.4, n = 8).
const GL_X: [f64; 4] =
    [0.183_434_642_495_649_78, 0.525_532_409_916_329, 0.796_666_477_413_626_7, 0.960_289_856_497_536_2];
const GL_W: [f64; 4] =
    [0.362_683_783_378_361_66, 0.313_706_645_877_886_9, 0.222_381_034_453_374_43, 0.101_228_536_290_377_06];

/// The 8 (node, weight) pairs of the rule on [a, b].
#[inline]
fn gauss_nodes(a: f64, b: f64) -> impl Iterator<Item = (f64, f64)> {
    let mid = 0.5 * (a + b);
    let half = 0.5 * (b - a);
    GL_X.iter().zip(GL_W.iter()).flat_map(move |(&x, &w)| [(mid - half * x, half * w), (mid + half * x, half * w)])
}

/// Split the ascending cut points into panels no wider than `max_width` in `width(a, b)`.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn panels(cuts: &[f64], max_width: f64, width: impl Fn(f64, f64) -> f64) -> Vec<(f64, f64)> {
    let mut out = Vec::new();
    for w in cuts.windows(2) {
        let (a, b) = (w[0], w[1]);
        if !(b > a) {
            continue;
        }
        let n = if max_width.is_finite() && max_width > 0.0 {
            ((width(a, b) / max_width).ceil() as usize).clamp(1, 1_000_000)
        } else {
            1
        };
        for k in 0..n {
            out.push((a + (b - a) * k as f64 / n as f64, a + (b - a) * (k + 1) as f64 / n as f64));
        }
    }
    out
}

/// Ascending, deduplicated cut points: `lo`, `hi` and every point of `inner` strictly
/// between them.
fn cut_points(lo: f64, hi: f64, inner: impl IntoIterator<Item = f64>) -> Vec<f64> {
    let mut c: Vec<f64> = inner.into_iter().filter(|&v| v > lo && v < hi).collect();
    c.push(lo);
    c.push(hi);
    super::order::sort_numbers(&mut c);
    c.dedup();
    c
}

/// integral_{lo}^{hi} w(E) Phi_src(E) dE at one sun [s^-1 m^-2] between photon energies
/// `lo_j` and `hi_j` [J], for a dimensionless weight `w` of photon energy [J] that is
/// smooth between the energies `breaks_j` [J] and varies on the scale `scale_j` [J] (panels
/// are no wider than half of it; infinity for piecewise-linear weights). `hi_j` must be finite.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn weighted_photon_flux(
    source: &Source,
    lo_j: f64,
    hi_j: f64,
    breaks_j: &[f64],
    scale_j: f64,
    w: &dyn Fn(f64) -> f64,
) -> f64 {
    if !(hi_j > lo_j) || !hi_j.is_finite() {
        return 0.0;
    }
    let lo_j = lo_j.max(0.0);
    let total = match source {
        Source::Table { spectrum, .. } => {
            let axis = spectrum.axis();
            let x = spectrum.coordinates();
            let n = spectrum.photon_density();
            let (ua, ub) = {
                let a = axis.coordinate_of_energy(lo_j);
                let b = axis.coordinate_of_energy(hi_j);
                (a.min(b).max(x[0]), a.max(b).min(x[x.len() - 1]))
            };
            if !(ub > ua) {
                return 0.0;
            }
            let inner = x.iter().copied().chain(breaks_j.iter().map(|&e| axis.coordinate_of_energy(e)));
            let cuts = cut_points(ua, ub, inner);
            let width = |a: f64, b: f64| (axis.energy_at(a) - axis.energy_at(b)).abs();
            let mut sum = 0.0;
            for (a, b) in panels(&cuts, 0.5 * scale_j, width) {
                // the table interval holding this panel: the density is linear there
                let k = (x.partition_point(|&v| v <= 0.5 * (a + b)).max(1) - 1).min(x.len() - 2);
                let slope = (n[k + 1] - n[k]) / (x[k + 1] - x[k]);
                for (u, wt) in gauss_nodes(a, b) {
                    let density = n[k] + slope * (u - x[k]);
                    sum += wt * density * w(axis.energy_at(u));
                }
            }
            sum
        }
        Source::BlackbodySun { temp_k } => {
            let kts = thermal_energy(*temp_k);
            let cuts = cut_points(lo_j, hi_j, breaks_j.iter().copied());
            let mut sum = 0.0;
            for (a, b) in panels(&cuts, (0.5 * scale_j).min(0.25 * kts), |a, b| b - a) {
                for (e, wt) in gauss_nodes(a, b) {
                    let x = e / kts;
                    if x > 0.0 && x < 700.0 {
                        sum += wt * w(e) * PHOTON_FLUX_PREFACTOR * e * e / x.exp_m1();
                    }
                }
            }
            super::constants::SUN_DILUTION * sum
        }
    };
    total.max(0.0)
}

/// The hat-function moments of the source's photon flux on an ascending energy grid
/// `grid_j` [J] at one sun: for each interval k, (integral (1 - t) Phi dE, integral t Phi dE)
/// with t = (E - x_k)/(x_(k+1) - x_k) [s^-1 m^-2]; so that integral a Phi dE of an `a`
/// linear between the grid points is sum_k a_k S0_k + a_(k+1) S1_k. The same quadrature as
/// [`weighted_photon_flux`] (8-point Gauss-Legendre on every piece between the table's
/// points and the grid's, in the table's own coordinate; panels no wider than a quarter of
/// kT_sun for a blackbody sun) in one pass over the table.
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
pub fn hat_moments(source: &Source, grid_j: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let m = grid_j.len().saturating_sub(1);
    let (mut s0, mut s1) = (vec![0.0; m], vec![0.0; m]);
    for k in 0..m {
        let (a, b) = (grid_j[k], grid_j[k + 1]);
        if !(b > a && a >= 0.0 && b.is_finite()) {
            continue;
        }
        let t = |e: f64| ((e - a) / (b - a)).clamp(0.0, 1.0);
        let (mut lo, mut hi) = (0.0, 0.0);
        match source {
            Source::Table { spectrum, .. } => {
                let axis = spectrum.axis();
                let x = spectrum.coordinates();
                let n = spectrum.photon_density();
                let (ua, ub) = {
                    let p = axis.coordinate_of_energy(a);
                    let q = axis.coordinate_of_energy(b);
                    (p.min(q).max(x[0]), p.max(q).min(x[x.len() - 1]))
                };
                if !(ub > ua) {
                    continue;
                }
                // the table interval holding ua, then every piece up to ub
                let mut i = (x.partition_point(|&v| v <= ua).max(1) - 1).min(x.len() - 2);
                let mut u0 = ua;
                while u0 < ub && i + 1 < x.len() {
                    let u1 = x[i + 1].min(ub);
                    if u1 > u0 {
                        let slope = (n[i + 1] - n[i]) / (x[i + 1] - x[i]);
                        for (u, wt) in gauss_nodes(u0, u1) {
                            let f = wt * (n[i] + slope * (u - x[i]));
                            let tt = t(axis.energy_at(u));
                            lo += f * (1.0 - tt);
                            hi += f * tt;
                        }
                    }
                    u0 = u1;
                    i += 1;
                }
            }
            Source::BlackbodySun { temp_k } => {
                let kts = thermal_energy(*temp_k);
                for (pa, pb) in panels(&[a, b], 0.25 * kts, |p, q| q - p) {
                    for (e, wt) in gauss_nodes(pa, pb) {
                        let x = e / kts;
                        if x > 0.0 && x < 700.0 {
                            let f = super::constants::SUN_DILUTION * wt * PHOTON_FLUX_PREFACTOR * e * e / x.exp_m1();
                            let tt = t(e);
                            lo += f * (1.0 - tt);
                            hi += f * tt;
                        }
                    }
                }
            }
        }
        s0[k] = lo.max(0.0);
        s1[k] = hi.max(0.0);
    }
    (s0, s1)
}

/// Photocurrent Jsc = q X integral a(E) Phi_src(E) dE [A m^-2] of absorptance `a` under
/// `light`.
pub fn photocurrent(light: &Illumination, a: &Absorptance) -> f64 {
    if !a.is_valid() {
        return 0.0;
    }
    let src = &light.source;
    let flux = match a {
        Absorptance::Step { gap_j } => src.photon_flux_above(*gap_j),
        Absorptance::Urbach { gap_j, urbach_j } => {
            // the tail weight is below e^-45 = 3e-20 past 45 Urbach energies
            let lo = (gap_j - 45.0 * urbach_j).max(0.0);
            let tail = |e: f64| ((e - gap_j) / urbach_j).exp();
            src.photon_flux_above(*gap_j) + weighted_photon_flux(src, lo, *gap_j, &[], *urbach_j, &tail)
        }
        Absorptance::Table(t) => {
            let e = t.energies_j();
            let f = |x: f64| t.at_energy(x);
            weighted_photon_flux(src, e[0], e[e.len() - 1], &e, f64::INFINITY, &f)
        }
    };
    CHARGE * light.concentration * flux
}

/// ln of the radiative dark current J0_rad = q g integral a(E) phi_bb(E; Tc) dE [ln(A m^-2)],
/// `temp_k` the cell temperature [K], `emission` the emitting faces (g).
#[allow(clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn ln_dark_current(a: &Absorptance, temp_k: f64, emission: Emission) -> f64 {
    if !(a.is_valid() && temp_k > 0.0 && temp_k.is_finite()) {
        return f64::NEG_INFINITY;
    }
    let kt = thermal_energy(temp_k);
    let ln_pre = (emission.faces() * CHARGE * PHOTON_FLUX_PREFACTOR).ln();
    // above a gap with a = 1: (kT)^3 G_2(x0, 0), G_2 = e^-x0 * scaled value
    let ln_step = |gap_j: f64| {
        let x0 = gap_j / kt;
        3.0 * kt.ln() - x0 + scaled_bose2(x0, x0).value.ln()
    };
    // ln of the integrand a(E) E^2 / (e^(E/kT) - 1), without the prefactor
    let ln_integrand = |e: f64, ln_a: f64| ln_a + 2.0 * e.ln() - e / kt - (-(-e / kt).exp_m1()).ln();
    match a {
        Absorptance::Step { gap_j } => ln_pre + ln_step(*gap_j),
        Absorptance::Urbach { gap_j, urbach_j } => {
            let (g, eu) = (*gap_j, *urbach_j);
            // below Eg the integrand falls as exp(-(Eg - E)(1/Eu - 1/kT)) going down;
            // 50 e-folds is far enough, and a tail wider than kT is integrated down to 0
            let rate = 1.0 / eu - 1.0 / kt;
            let lo = if rate > 0.0 { (g - 50.0 / rate).max(0.0) } else { 0.0 };
            let cuts = cut_points(lo, g, []);
            let tail =
                log_quadrature(&panels(&cuts, 0.5 * eu.min(kt), |a, b| b - a), |e| ln_integrand(e, (e - g) / eu));
            ln_pre + log_add(ln_step(g), tail)
        }
        Absorptance::Table(t) => {
            let e = t.energies_j();
            let cuts = cut_points(e[0], e[e.len() - 1], e.iter().copied());
            let ln_t = log_quadrature(&panels(&cuts, 0.5 * kt, |a, b| b - a), |x| ln_integrand(x, t.at_energy(x).ln()));
            ln_pre + ln_t
        }
    }
}

/// ln of integral e^(ln_f(E)) dE over the panels (energies [J]), by Gauss-Legendre in
/// logarithms: the result is ln of [unit of e^ln_f x J].
fn log_quadrature(panels: &[(f64, f64)], ln_f: impl Fn(f64) -> f64) -> f64 {
    let terms: Vec<f64> = panels
        .iter()
        .flat_map(|&(a, b)| gauss_nodes(a, b))
        .map(|(e, w)| if e > 0.0 && w > 0.0 { ln_f(e) + w.ln() } else { f64::NEG_INFINITY })
        .collect();
    let peak = terms.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if !peak.is_finite() {
        return f64::NEG_INFINITY;
    }
    let sum: f64 = terms.iter().map(|t| (t - peak).exp()).sum();
    peak + sum.ln()
}

/// A cell with a general absorptance: its figures and the reciprocity quantities.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct AbsorberResult {
    /// the usual figures; `gap_j` is [`Absorptance::edge_j`]
    pub cell: CellResult,
    /// ln of the radiative dark current J0_rad [ln(A m^-2)]
    pub ln_j0: f64,
    /// J0_rad [A m^-2] (0 once it underflows; `ln_j0` keeps it)
    pub j0: f64,
    /// open-circuit voltage in the radiative limit (ERE = 1) [V]
    pub voc_rad: f64,
    /// Voc_rad - Voc [V]: the non-radiative loss, (kT/q) ln(1/ERE) up to the "+1" terms
    pub nonrad_voc_loss: f64,
}

/// Reduced open-circuit voltage m = ln(1 + e^l) (dimensionless), l = ln(ERE Jsc / J0),
/// without overflow.
#[inline]
fn ln_one_plus_exp(l: f64) -> f64 {
    if l > 0.0 {
        l + (-l).exp().ln_1p()
    } else {
        l.exp().ln_1p()
    }
}

/// Figures of an ideal diode J = Jsc - (J0/ERE)(e^(qV/kT) - 1) given ln J0: Voc from the
/// closed form, the maximum power point from e^m (1 + m) = 1 + ERE Jsc/J0, i.e.
/// 1 + m_mp = W(e^(1 + m_oc)) (Lambert W, Corless et al. 1996), J_mp = (Jsc + J0/ERE) m_mp /
/// (1 + m_mp). `jsc` [A m^-2], `ln_j0` [ln(A m^-2)], `kt` [J], `ere` (dimensionless),
/// `gap_j` [J] (recorded only), `input` [W m^-2]; returns the figures and Voc_rad [V].
#[allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose: it also refuses NaN
fn reciprocity_diode(jsc: f64, ln_j0: f64, kt: f64, ere: f64, gap_j: f64, input: f64) -> (CellResult, f64) {
    let empty = CellResult { gap_j, input, jsc: jsc.max(0.0), ..Default::default() };
    if !(jsc > 0.0) || ln_j0.is_nan() || !(ere > 0.0) {
        return (empty, 0.0);
    }
    let volts = kt / CHARGE;
    let m_oc = ln_one_plus_exp((ere * jsc).ln() - ln_j0);
    let m_rad = ln_one_plus_exp(jsc.ln() - ln_j0);
    if !(m_oc > 0.0) || !m_oc.is_finite() {
        return (empty, volts * m_rad.max(0.0));
    }
    let m_mp = (lambert_w_of_exp(1.0 + m_oc) - 1.0).clamp(0.0, m_oc);
    let scale = jsc + (ln_j0 - ere.ln()).exp();
    let jmp = (scale * m_mp / (1.0 + m_mp)).clamp(0.0, jsc);
    let (voc, vmp) = (volts * m_oc, volts * m_mp);
    let pmax = vmp * jmp;
    let r = CellResult {
        gap_j,
        jsc,
        voc,
        ff: if voc > 0.0 { pmax / (voc * jsc) } else { 0.0 },
        vmp,
        jmp,
        pmax,
        input,
        efficiency: if input > 0.0 { pmax / input } else { 0.0 },
    };
    (r, volts * m_rad)
}

/// Solve a cell of absorptance `a` under `light` through reciprocity (module docs), whatever
/// the absorptance; `cell` gives temperature, ERE and emission (its gap and J-V model are
/// not used).
#[allow(clippy::neg_cmp_op_on_partial_ord, clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn solve_reciprocity(light: &Illumination, a: &Absorptance, cell: &Cell) -> AbsorberResult {
    let input = light.input_power();
    let gap_j = if a.is_valid() { a.edge_j() } else { 0.0 };
    if !(a.is_valid() && cell.temp_k > 0.0 && cell.temp_k.is_finite() && cell.ere > 0.0) {
        return AbsorberResult {
            cell: CellResult { gap_j, input, ..Default::default() },
            ln_j0: f64::NEG_INFINITY,
            ..Default::default()
        };
    }
    let ere = cell.ere.min(1.0);
    let jsc = photocurrent(light, a);
    let ln_j0 = ln_dark_current(a, cell.temp_k, cell.emission);
    let (r, voc_rad) = reciprocity_diode(jsc, ln_j0, thermal_energy(cell.temp_k), ere, gap_j, input);
    AbsorberResult { cell: r, ln_j0, j0: ln_j0.exp(), voc_rad, nonrad_voc_loss: (voc_rad - r.voc).max(0.0) }
}

/// Solve a cell of absorptance `a`: a step keeps the closed-form path of `junction` (exact
/// generalized Planck law or Boltzmann, as `cell.model` says); any other absorptance goes
/// through reciprocity ([`solve_reciprocity`]).
pub fn solve_absorber(light: &Illumination, a: &Absorptance, cell: &Cell) -> AbsorberResult {
    match a {
        Absorptance::Step { gap_j } => {
            let c = Cell { gap_j: *gap_j, ..*cell };
            let r = solve_cell(light, &c);
            let rad = solve_cell(light, &Cell { ere: 1.0, ..c });
            let ln_j0 = ln_dark_current(a, cell.temp_k, cell.emission);
            AbsorberResult {
                cell: r,
                ln_j0,
                j0: ln_j0.exp(),
                voc_rad: rad.voc,
                nonrad_voc_loss: (rad.voc - r.voc).max(0.0),
            }
        }
        _ => solve_reciprocity(light, a, &Cell { model: JvModel::Boltzmann, ..*cell }),
    }
}

/// The ERE that a measured open-circuit voltage `voc` [V] implies for a cell with
/// photocurrent `jsc` [A m^-2] and radiative dark current ln J0 `ln_j0` [ln(A m^-2)] at temperature
/// `temp_k` [K]: ERE = J0 (e^(qVoc/kT) - 1) / Jsc (the reciprocity Voc of Rau 2007, inverted). Values above 1
/// mean the measured Voc exceeds the radiative limit; dimensionless. None if the inputs cannot
/// give one.
#[allow(clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn ere_from_voc(jsc: f64, ln_j0: f64, temp_k: f64, voc: f64) -> Option<f64> {
    if !(jsc > 0.0 && voc > 0.0 && temp_k > 0.0 && ln_j0.is_finite()) {
        return None;
    }
    let m = voc * CHARGE / thermal_energy(temp_k);
    // ln(e^m - 1) = m + ln(1 - e^-m)
    let ln_em1 = m + (-(-m).exp()).ln_1p();
    let ere = (ln_j0 + ln_em1 - jsc.ln()).exp();
    (ere.is_finite() && ere > 0.0).then_some(ere)
}
