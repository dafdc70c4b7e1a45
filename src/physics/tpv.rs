//! Thermophotovoltaics in the detailed-balance picture: a hot emitter facing a cell.
//!
//! Geometry: emitter (1) at Te and cell (2) at Tc are parallel plates of equal area that see
//! each other with view factor F and see black surroundings (3) at the cell's temperature
//! with 1 - F. All surfaces are opaque and diffuse. Per photon energy E the emitter has
//! emissivity eps(E) (Kirchhoff: absorptance too), the cell absorptance a(E) = 1 above its
//! (bottom) gap and 1 - R_sub below. With the hemispherical photon fluxes
//! e1 = phi(E, Te, 0), e2 = phi(E, Tc, mu), e3 = phi(E, Tc, 0), where
//! phi(E, T, mu) = (2 pi / h^3 c^2) E^2 / (e^((E - mu)/kT) - 1) (generalized Planck law,
//! Würfel, J. Phys. C 15, 3967 (1982)), the net-radiation (radiosity) method for an
//! enclosure (Siegel & Howell, Thermal Radiation Heat Transfer, the net-radiation method)
//! gives the radiosities
//!
//!   J1 = eps e1 + r1 (F J2 + (1 - F) e3),   J2 = a e2 + r2 (F J1 + (1 - F) e3),
//!
//! r1 = 1 - eps, r2 = 1 - a, hence with D = 1 - r1 r2 F^2
//!
//!   J1 = [eps e1 + r1 F a e2 + r1 (1 - F)(1 + F r2) e3] / D,
//!   J2 = [r2 F eps e1 + a e2 + r2 (1 - F)(1 + F r1) e3] / D,
//!
//! the net flux leaving the emitter q1 = eps (e1 - F J2 - (1 - F) e3) and the net flux the
//! cell absorbs q2 = a (F J1 + (1 - F) e3 - e2). At F = 1 both reduce to the parallel-plate
//! exchange with multiple reflections, q1 = q2 = tau (e1 - e2),
//! tau = eps a / (1 - (1 - eps)(1 - a)) (the e3 terms vanish and eps (1 - r2 eps / D) =
//! eps a / D); `exchange` returns the coefficients of e1, e2 and e3 in q1 and q2, and the
//! tests check this reduction.
//!
//! Cell: mu = qV above the gap, 0 below. Current J(V) = q int_{E >= Eg} q2(E, 0) dE -
//! (q / ERE) int_{E >= Eg} c(E) [phi(E, Tc, qV) - phi(E, Tc, 0)] dE with c = -dq2/de2 (the
//! non-radiative recombination scales the dark current by 1/ERE as for the solar cell,
//! Green, Prog. Photovolt. 20, 472 (2012)). Heat drawn from the emitter
//! heat_in = int E q1(E, mu(E)) dE; efficiency = P / heat_in (the calorimetric definition of
//! LaPotin et al., Nature 604, 287 (2022)). Stacks (gaps descending, top first): subcell i
//! absorbs between its gap and the gap above and emits one hemisphere from its own gap up;
//! the heat sees, at each energy, the chemical potential of the subcell that absorbs there.
//! Series: one current, the sum of the subcell voltages; independent: each subcell at its
//! own maximum power point. The efficiency at its own optimum (`max_efficiency`, which
//! differs from the efficiency at the maximum power point because heat_in falls as V rises)
//! is found by Dinkelbach's iteration (Management Sci. 13, 492 (1967)): maximize
//! P - eta heat_in, set eta = P / heat_in, repeat.
//!
//! Numerics. The parts that do not depend on the voltage are integrated once per setup on a
//! logarithmic energy grid (ratio 1.01 between points, from hc / 1 mm to 60 kTe, refined at
//! every corner of the emitter and reflectance profiles and at every gap, 3-point
//! Gauss-Legendre per cell, exact band-integral tails) and kept as cumulative tables, so a
//! gap anywhere costs a lookup and one split cell. The voltage-dependent parts live within
//! about 50 kTc of each gap: panels of kTc / 2 (split at every profile corner and gap), 4
//! Gauss points each, and the Bose factor as the series
//! 1 / (e^((E - mu)/kT) - 1) = sum_k z^k e^(-k (E - Eg)/kT), z = e^((mu - Eg)/kT), so that
//! each subcell's dark current and returned heat are polynomials in z whose coefficients
//! (moments) are computed once per gap; when z may exceed 0.45 at open circuit the sums over
//! the nodes are done directly instead. Relative accuracy about 1e-10 (checked against an
//! independent scipy reference in the tests).
//!
//! Architecture invariant: pure functions of SI numbers, no NaN for any finite input.
#![allow(clippy::neg_cmp_op_on_partial_ord)] // !(a > b) on purpose here: it also refuses NaN

use super::constants::{thermal_energy, BOLTZMANN, CHARGE, HC, PHOTON_FLUX_PREFACTOR};
use super::planck::{band_photon_flux_energy, band_power_energy};
use super::radiator::emissivity::Profile;
use super::radiator::quadrature::{spectral_rule, GaussRule};
use super::special::golden_max;
use super::stack::Connection;
use std::sync::OnceLock;

/// Lowest photon energy of the grid [J]: a wavelength of 1 mm.
const GRID_LO_WAVELENGTH_M: f64 = 1e-3;
/// The grid reaches this many kTe above zero (the emitter's photons beyond carry e^-60).
const GRID_TOP_KT: f64 = 60.0;
/// Ratio between neighbouring grid energies.
const GRID_RATIO: f64 = 1.01;
/// The voltage-dependent integrals reach this many kTc above each gap.
const DARK_SPAN_KT: f64 = 50.0;
/// Panel width of the voltage-dependent integrals, in kTc.
const DARK_PANEL_KT: f64 = 0.5;
/// Most terms of the far series.
const SERIES_TERMS: usize = 48;

fn panel_rule() -> &'static GaussRule {
    static RULE: OnceLock<GaussRule> = OnceLock::new();
    RULE.get_or_init(|| GaussRule::new(4))
}

/// What a TPV converter is made of, apart from its cell's gaps.
#[derive(Debug, Clone, PartialEq)]
pub struct TpvSetup {
    /// the emitter's hemispherical spectral emissivity
    pub emitter: Profile,
    /// emitter temperature [K]
    pub emitter_temp_k: f64,
    /// view factor between emitter and cell (0 < F <= 1)
    pub view_factor: f64,
    /// the cell's absorptance below its gap, 1 - R_sub (a profile over wavelength)
    pub subgap_absorptance: Profile,
    /// cell temperature [K]
    pub cell_temp_k: f64,
    /// external radiative efficiency (0 < ERE <= 1)
    pub ere: f64,
}

/// Coefficients of (e1, e2, e3) in the net emitter flux q1 and the net cell flux q2.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Exchange {
    pub q1: [f64; 3],
    pub q2: [f64; 3],
}

/// The radiosity solution for emitter emissivity `eps`, cell absorptance `a` and view
/// factor `f` (all fractions): the coefficients of e1, e2, e3 in q1 and q2 (module text).
pub fn exchange(eps: f64, a: f64, f: f64) -> Exchange {
    let eps = clamp01(eps);
    let a = clamp01(a);
    let f = clamp01(f);
    let (r1, r2) = (1.0 - eps, 1.0 - a);
    let d = 1.0 - r1 * r2 * f * f;
    if d <= 0.0 {
        // eps = a = 0 at F = 1: nothing is exchanged
        return Exchange::default();
    }
    let q1 = [
        eps * (1.0 - f * f * r2 * eps / d),
        -eps * f * a / d,
        -eps * (f * r2 * (1.0 - f) * (1.0 + f * r1) / d + (1.0 - f)),
    ];
    let q2 =
        [a * f * eps / d, a * (f * f * r1 * a / d - 1.0), a * (f * r1 * (1.0 - f) * (1.0 + f * r2) / d + (1.0 - f))];
    Exchange { q1, q2 }
}

/// The parallel-plate exchange factor tau = eps a / (1 - (1 - eps)(1 - a)) (fraction).
pub fn exchange_factor(eps: f64, a: f64) -> f64 {
    let (eps, a) = (clamp01(eps), clamp01(a));
    let d = 1.0 - (1.0 - eps) * (1.0 - a);
    if d > 0.0 {
        eps * a / d
    } else {
        0.0
    }
}

fn clamp01(x: f64) -> f64 {
    if x.is_nan() {
        0.0
    } else {
        x.clamp(0.0, 1.0)
    }
}

/// phi(E, T, 0) [m^-2 s^-1 J^-1], zero for T <= 0, finite for any finite input.
fn phi0(e: f64, temp_k: f64) -> f64 {
    if !(temp_k > 0.0 && e > 0.0) {
        return 0.0;
    }
    let x = e / (BOLTZMANN * temp_k);
    if x > 700.0 {
        return 0.0;
    }
    PHOTON_FLUX_PREFACTOR * e * e / x.exp_m1()
}

/// One subcell's voltage-dependent parts, in the reduced voltage m = qV / kTc.
///
/// D(m) = sum over nodes of w / (e^(x - m) - 1) (the dark photon flux) and H(m) the same
/// with the heat weights. Nodes within [`NEAR_KT`] of the gap are summed directly; beyond,
/// the Bose factor is the series sum_k z^k e^(-k (x - x0)) whose ratio is below e^-3 for
/// any z <= 1, so a few moments hold them exactly.
#[derive(Debug, Clone, Default)]
struct Dark {
    /// x0 = Eg / kTc
    x0: f64,
    /// photocurrent at V = 0 [A m^-2]
    j_gen: f64,
    /// near nodes: (e^((E - Eg)/kTc) - 1, dark weight [m^-2 s^-1], heat weight [W m^-2])
    near: Vec<(f64, f64, f64)>,
    /// moments of the far nodes' dark and heat weights, k = 1, 2, ...
    dark_m: Vec<f64>,
    heat_m: Vec<f64>,
    /// D(0) and H(0)
    d0: f64,
    h0: f64,
    /// reduced open-circuit voltage
    m_oc: f64,
}

/// Nodes closer than this many kTc to the gap are summed directly.
const NEAR_KT: f64 = 3.0;

impl Dark {
    /// (D, dD/dm, H, dH/dm) at reduced voltage m.
    fn eval(&self, m: f64) -> (f64, f64, f64, f64) {
        // e^(x - m) - 1 = (e^(x - x0) - 1) s + (s - 1), s = e^(x0 - m): one exponential per
        // call and no cancellation
        let sm1 = (self.x0 - m).exp_m1();
        let s1 = sm1 + 1.0;
        let (mut d, mut dd, mut h, mut dh) = (0.0, 0.0, 0.0, 0.0);
        for &(y0m1, w, hw) in &self.near {
            let ym1 = y0m1 * s1 + sm1;
            let b = 1.0 / ym1;
            let g = (ym1 + 1.0) * b * b;
            d += w * b;
            dd += w * g;
            h += hw * b;
            dh += hw * g;
        }
        let z = 1.0 / s1;
        let (mut sd, mut sdd, mut sh, mut sdh) = (0.0, 0.0, 0.0, 0.0);
        for k in (0..self.dark_m.len()).rev() {
            let kf = k as f64 + 1.0;
            sd = sd * z + self.dark_m[k];
            sdd = sdd * z + kf * self.dark_m[k];
            sh = sh * z + self.heat_m[k];
            sdh = sdh * z + kf * self.heat_m[k];
        }
        (d + sd * z, dd + sdd * z, h + sh * z, dh + sdh * z)
    }

    /// Current [A m^-2] and its m-derivative at reduced voltage m.
    fn current(&self, m: f64, ere: f64) -> (f64, f64) {
        let (d, dd, _, _) = self.eval(m);
        let c = CHARGE / ere;
        (self.j_gen - c * (d - self.d0), -c * dd)
    }

    /// The reduced voltage where the current is `j` [A m^-2] (0 <= j <= j_gen), Newton on
    /// ln D (convex in m) inside [0, m_oc], from `start`.
    fn voltage_at(&self, j: f64, ere: f64, start: f64) -> f64 {
        let target = self.d0 + (self.j_gen - j).max(0.0) * ere / CHARGE;
        if !(target > self.d0) {
            return 0.0;
        }
        let hi = self.m_oc;
        let (mut lo, mut up) = (0.0, hi);
        let mut m = start.clamp(0.0, hi);
        let lt = target.ln();
        for _ in 0..100 {
            let (d, dd, _, _) = self.eval(m);
            if !(d > 0.0 && dd > 0.0) {
                m = 0.5 * (lo + up);
                continue;
            }
            let g = d.ln() - lt;
            if g > 0.0 {
                up = m;
            } else {
                lo = m;
            }
            let mut next = m - g * d / dd;
            if !(next > lo && next < up) {
                next = 0.5 * (lo + up);
            }
            if (next - m).abs() <= 1e-15 * m.abs().max(1.0) || up - lo <= 1e-15 * up.abs().max(1.0) {
                return next;
            }
            m = next;
        }
        m
    }
}

/// The root of a decreasing `slope` near `x` inside [lo, hi]: the bracket [x - w, x + w]
/// (w shrinks the golden search's tolerance to a root finder's), then the Illinois variant
/// of regula falsi (Dowell & Jarratt, BIT 11, 168 (1971)) to full precision. Returns `x`
/// when the slope does not change sign there.
fn polish(slope: impl Fn(f64) -> f64, x: f64, w: f64, lo: f64, hi: f64) -> f64 {
    let (mut a, mut b) = ((x - w).max(lo), (x + w).min(hi));
    let (mut fa, mut fb) = (slope(a), slope(b));
    if !(fa > 0.0 && fb < 0.0) {
        return x;
    }
    let mut side = 0;
    for _ in 0..60 {
        let c = (a * fb - b * fa) / (fb - fa);
        if !(c > a && c < b) || b - a <= 1e-15 * b.abs().max(1e-300) {
            break;
        }
        let fc = slope(c);
        if fc == 0.0 {
            return c;
        }
        if fc > 0.0 {
            a = c;
            fa = fc;
            if side == 1 {
                fb *= 0.5;
            }
            side = 1;
        } else {
            b = c;
            fb = fc;
            if side == -1 {
                fa *= 0.5;
            }
            side = -1;
        }
    }
    if fa.abs() < fb.abs() {
        a
    } else {
        b
    }
}

/// A prepared TPV converter: the voltage-independent integrals as cumulative tables.
#[derive(Debug, Clone)]
pub struct Tpv {
    setup: TpvSetup,
    kte: f64,
    ktc: f64,
    /// cell edges [J], ascending
    edges: Vec<f64>,
    /// cumulative from the top: int_{edge_i}^inf q2_hi(E, 0) dE [m^-2 s^-1] (cell black)
    gen_above: Vec<f64>,
    /// cumulative from the top: int_{edge_i}^inf E q1_hi(E, 0) dE [W m^-2]
    heat_above: Vec<f64>,
    /// cumulative from zero: int_0^{edge_i} E q1_lo(E, 0) dE [W m^-2] (cell at 1 - R_sub)
    heat_below: Vec<f64>,
    /// profile corners in energy [J], ascending
    corners: Vec<f64>,
}

/// The result at the maximum power point, in SI.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct TpvResult {
    /// P / heat_in at the maximum power point (fraction)
    pub efficiency: f64,
    /// electric power density [W m^-2]
    pub pmax: f64,
    /// net heat drawn from the emitter [W m^-2]
    pub heat_in: f64,
    /// the part of heat_in below the bottom gap [W m^-2]
    pub subgap_heat: f64,
    /// the stack's short-circuit current (smallest subcell's in series, sum when
    /// independent) [A m^-2]
    pub jsc: f64,
    /// sum of the subcell open-circuit voltages [V]
    pub voc: f64,
    /// stack voltage at the maximum power point [V]; None when independent
    pub vmp: Option<f64>,
    /// current at the maximum power point [A m^-2]; None when independent
    pub jmp: Option<f64>,
    /// the efficiency at its own optimum voltage (fraction)
    pub max_efficiency: f64,
    /// Carnot bound 1 - Tc/Te (fraction)
    pub carnot: f64,
    pub subcells: Vec<TpvSubcell>,
}

/// One subcell at the stack's maximum power point.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct TpvSubcell {
    pub gap_j: f64,
    pub jsc: f64,
    pub voc: f64,
    pub vmp: f64,
    pub jmp: f64,
}

/// Efficiency and power density at one gap of a sweep.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SweepPoint {
    pub gap_j: f64,
    pub efficiency: f64,
    pub pmax: f64,
}

impl Tpv {
    /// Prepare the voltage-independent tables for `setup`.
    pub fn new(setup: &TpvSetup) -> Tpv {
        let te = setup.emitter_temp_k.max(1e-3);
        let tc = setup.cell_temp_k.max(1e-3);
        let (kte, ktc) = (thermal_energy(te), thermal_energy(tc));
        let lo = HC / GRID_LO_WAVELENGTH_M;
        let hi = (GRID_TOP_KT * kte).max(GRID_TOP_KT * ktc).max(lo * 2.0);
        let mut corners: Vec<f64> = setup
            .emitter
            .knots()
            .into_iter()
            .chain(setup.subgap_absorptance.knots())
            .map(|l| HC / l)
            .filter(|e| e.is_finite() && *e > 0.0)
            .collect();
        super::order::sort_numbers(&mut corners);
        corners.dedup();
        let steps = ((hi / lo).ln() / GRID_RATIO.ln()).ceil().max(1.0) as usize;
        let mut edges: Vec<f64> = (0..=steps).map(|i| lo * (hi / lo).powf(i as f64 / steps as f64)).collect();
        edges.extend(corners.iter().copied().filter(|e| *e > lo && *e < hi));
        super::order::sort_numbers(&mut edges);
        edges.dedup_by(|a, b| (*a - *b).abs() <= 1e-13 * b.abs());
        let n = edges.len();
        let mut tpv = Tpv {
            setup: setup.clone(),
            kte,
            ktc,
            edges,
            gen_above: vec![0.0; n],
            heat_above: vec![0.0; n],
            heat_below: vec![0.0; n],
            corners,
        };
        // per-cell integrals
        let mut gen = vec![0.0; n];
        let mut hab = vec![0.0; n];
        let mut hbe = vec![0.0; n];
        for i in 0..n - 1 {
            let (a, b) = (tpv.edges[i], tpv.edges[i + 1]);
            let (g, h, l) = tpv.cell_parts(a, b);
            gen[i] = g;
            hab[i] = h;
            hbe[i] = l;
        }
        // tails: the coefficients at the grid's ends times exact band integrals
        let (tg, th) = tpv.top_tail(hi);
        tpv.gen_above[n - 1] = tg;
        tpv.heat_above[n - 1] = th;
        for i in (0..n - 1).rev() {
            tpv.gen_above[i] = tpv.gen_above[i + 1] + gen[i];
            tpv.heat_above[i] = tpv.heat_above[i + 1] + hab[i];
        }
        tpv.heat_below[0] = tpv.bottom_tail(lo);
        for i in 1..n {
            tpv.heat_below[i] = tpv.heat_below[i - 1] + hbe[i - 1];
        }
        tpv
    }

    /// The setup this converter was prepared for.
    pub fn setup(&self) -> &TpvSetup {
        &self.setup
    }

    fn eps(&self, e: f64) -> f64 {
        self.setup.emitter.at(HC / e)
    }

    fn a_sub(&self, e: f64) -> f64 {
        self.setup.subgap_absorptance.at(HC / e)
    }

    /// Spectral fluxes at energy e: (q2_hi(0) [m^-2 s^-1 J^-1], E q1_hi(0), E q1_lo(0) [W m^-2 J^-1]).
    fn spectral_parts(&self, e: f64) -> (f64, f64, f64) {
        let e1 = phi0(e, self.setup.emitter_temp_k);
        let e3 = phi0(e, self.setup.cell_temp_k);
        let eps = self.eps(e);
        let f = self.setup.view_factor;
        let hi = exchange(eps, 1.0, f);
        let lo = exchange(eps, self.a_sub(e), f);
        let q = |c: [f64; 3]| c[0] * e1 + (c[1] + c[2]) * e3;
        (q(hi.q2), e * q(hi.q1), e * q(lo.q1))
    }

    fn cell_parts(&self, a: f64, b: f64) -> (f64, f64, f64) {
        let (mut g, mut h, mut l) = (0.0, 0.0, 0.0);
        for (e, w) in spectral_rule().on(a, b) {
            let (x, y, z) = self.spectral_parts(e);
            g += w * x;
            h += w * y;
            l += w * z;
        }
        (g, h, l)
    }

    fn top_tail(&self, hi: f64) -> (f64, f64) {
        let (te, tc) = (self.setup.emitter_temp_k, self.setup.cell_temp_k);
        let c = exchange(self.eps(hi), 1.0, self.setup.view_factor);
        let g = c.q2[0] * band_photon_flux_energy(hi, f64::INFINITY, te)
            + (c.q2[1] + c.q2[2]) * band_photon_flux_energy(hi, f64::INFINITY, tc);
        let h = c.q1[0] * band_power_energy(hi, f64::INFINITY, te)
            + (c.q1[1] + c.q1[2]) * band_power_energy(hi, f64::INFINITY, tc);
        (finite(g), finite(h))
    }

    fn bottom_tail(&self, lo: f64) -> f64 {
        let (te, tc) = (self.setup.emitter_temp_k, self.setup.cell_temp_k);
        let c = exchange(self.eps(lo), self.a_sub(lo), self.setup.view_factor);
        finite(c.q1[0] * band_power_energy(0.0, lo, te) + (c.q1[1] + c.q1[2]) * band_power_energy(0.0, lo, tc))
    }

    /// Index i with edges[i] <= e < edges[i+1] (clamped).
    fn cell_of(&self, e: f64) -> usize {
        let n = self.edges.len();
        match self.edges.binary_search_by(|x| x.total_cmp(&e)) {
            Ok(i) => i.min(n - 1),
            Err(i) => i.saturating_sub(1).min(n - 1),
        }
    }

    /// (int_e^inf q2_hi, int_e^inf E q1_hi, int_0^e E q1_lo) at any energy e [J].
    fn cumulative_at(&self, e: f64) -> (f64, f64, f64) {
        let n = self.edges.len();
        if e <= self.edges[0] {
            // below the grid: the bottom tail taken whole (e is far below any gap in range)
            return (self.gen_above[0], self.heat_above[0], self.heat_below[0]);
        }
        if e >= self.edges[n - 1] {
            // above the grid (a gap beyond 60 kTe): integrate what is left from e up, on
            // panels of half the smaller kT, to 40 of the larger kT above e (the rest carries
            // under e^-40 of it)
            let (small, large) = (self.kte.min(self.ktc), self.kte.max(self.ktc));
            let panels = (80.0 * large / small).ceil().clamp(1.0, 4000.0) as usize;
            let w = 40.0 * large / panels as f64;
            let (mut g, mut h) = (0.0, 0.0);
            for k in 0..panels {
                let a = e + k as f64 * w;
                let (x, y, _) = self.cell_parts(a, a + w);
                g += x;
                h += y;
            }
            return (finite(g), finite(h), self.heat_below[n - 1]);
        }
        let i = self.cell_of(e);
        if e == self.edges[i] {
            return (self.gen_above[i], self.heat_above[i], self.heat_below[i]);
        }
        let (g_up, h_up, _) = self.cell_parts(e, self.edges[i + 1]);
        let (_, _, l_dn) = self.cell_parts(self.edges[i], e);
        (self.gen_above[i + 1] + g_up, self.heat_above[i + 1] + h_up, self.heat_below[i] + l_dn)
    }

    /// The voltage-dependent parts of a subcell with gap `gap` [J], the gap above it
    /// `above` [J] (infinity for the top) and its photocurrent `j_gen` [A m^-2].
    fn dark_part(&self, gap: f64, above: f64, j_gen: f64) -> Dark {
        let ktc = self.ktc;
        let x0 = gap / ktc;
        let top = gap + DARK_SPAN_KT * ktc;
        let mut breaks: Vec<f64> = Vec::with_capacity(128);
        let step = DARK_PANEL_KT * ktc;
        let panels = (DARK_SPAN_KT / DARK_PANEL_KT) as usize;
        breaks.extend((0..=panels).map(|k| gap + k as f64 * step));
        breaks.extend(self.corners.iter().copied().filter(|c| *c > gap && *c < top));
        if above > gap && above < top {
            breaks.push(above);
        }
        super::order::sort_numbers(&mut breaks);
        breaks.dedup_by(|a, b| (*a - *b).abs() <= 1e-13 * b.abs());
        let f = self.setup.view_factor;
        let mut near = Vec::with_capacity(32);
        let mut far = Vec::with_capacity(breaks.len() * 4);
        for w in breaks.windows(2) {
            let own = w[0] < above;
            for (e, wt) in panel_rule().on(w[0], w[1]) {
                let c = exchange(self.eps(e), 1.0, f);
                let p = PHOTON_FLUX_PREFACTOR * e * e * wt;
                let dark = -c.q2[1] * p;
                let heat = if own { c.q1[1] * e * p } else { 0.0 };
                let delta = (e - gap) / ktc;
                if delta < NEAR_KT {
                    near.push((delta.exp_m1(), dark, heat));
                } else {
                    far.push(((-delta).exp(), dark, heat));
                }
            }
        }
        let mut d = Dark { x0, j_gen, near, ..Dark::default() };
        // the far series: its ratio is z e^-3 <= e^-3 for z <= 1
        let terms = ((37.0 / NEAR_KT).ceil() as usize + 1).min(SERIES_TERMS);
        let mut dm = vec![0.0; terms];
        let mut hm = vec![0.0; terms];
        for &(r, w, h) in &far {
            let mut p = r;
            for k in 0..terms {
                dm[k] += w * p;
                hm[k] += h * p;
                p *= r;
            }
        }
        d.dark_m = dm;
        d.heat_m = hm;
        let e0 = d.eval(0.0);
        d.d0 = e0.0;
        d.h0 = e0.2;
        d.m_oc = x0; // bracket for the search below: z <= 1
        d.m_oc = if j_gen > 0.0 { d.voltage_at(0.0, self.setup.ere, x0 - 3.0) } else { 0.0 };
        d
    }

    /// Solve the cell with `gaps_j` [J] (descending, top first) and `connection`.
    pub fn solve(&self, gaps_j: &[f64], connection: Connection) -> TpvResult {
        let Some(stack) = self.stack(gaps_j) else {
            return TpvResult { carnot: self.carnot(), ..TpvResult::default() };
        };
        self.solve_prepared(&stack, connection, true)
    }

    fn carnot(&self) -> f64 {
        let (te, tc) = (self.setup.emitter_temp_k, self.setup.cell_temp_k);
        if te > 0.0 {
            1.0 - tc / te
        } else {
            0.0
        }
    }

    fn stack(&self, gaps_j: &[f64]) -> Option<Stack> {
        if gaps_j.is_empty() || gaps_j.iter().any(|g| !(g.is_finite() && *g > 0.0)) {
            return None;
        }
        let bottom = *gaps_j.last()?;
        let (_, _, subgap) = self.cumulative_at(bottom);
        let (_, heat_hi, _) = self.cumulative_at(bottom);
        let mut subs = Vec::with_capacity(gaps_j.len());
        let mut above = f64::INFINITY;
        let mut gen_above = 0.0;
        for &g in gaps_j {
            let (gen_g, _, _) = self.cumulative_at(g);
            let j_gen = CHARGE * (gen_g - gen_above).max(0.0);
            subs.push(self.dark_part(g, above, j_gen));
            gen_above = gen_g;
            above = g;
        }
        Some(Stack { subs, fixed_heat: subgap + heat_hi, subgap_heat: subgap, gaps: gaps_j.to_vec() })
    }

    fn solve_prepared(&self, st: &Stack, connection: Connection, with_max_eff: bool) -> TpvResult {
        let ere = self.setup.ere.clamp(1e-12, 1.0);
        let kq = self.ktc / CHARGE;
        let n = st.subs.len();
        let series = connection == Connection::Series && n > 1;
        let heat_of = |ms: &[f64]| -> f64 {
            st.fixed_heat + st.subs.iter().zip(ms).map(|(d, &m)| d.eval(m).2 - d.h0).sum::<f64>()
        };
        let mut ms = vec![0.0; n];
        let mut result = TpvResult { carnot: self.carnot(), subgap_heat: st.subgap_heat, ..TpvResult::default() };
        let jscs: Vec<f64> = st.subs.iter().map(|d| d.j_gen).collect();
        result.voc = st.subs.iter().map(|d| d.m_oc * kq).sum();
        // maximize P - eta H (eta = 0: the maximum power point): golden section to 1e-7 of
        // the range, then the root of the analytic slope (P is flat at its maximum, so only
        // the slope fixes the point to full precision)
        let optimize = |eta: f64, ms: &mut [f64]| -> Option<f64> {
            if series {
                let jmin = jscs.iter().copied().fold(f64::INFINITY, f64::min).max(0.0);
                let guess: Vec<f64> = st.subs.iter().map(|d| 0.9 * d.m_oc).collect();
                let volts = |j: f64, out: &mut [f64]| {
                    for (i, d) in st.subs.iter().enumerate() {
                        out[i] = d.voltage_at(j, ere, guess[i]);
                    }
                };
                let mut buf = vec![0.0; n];
                let score = |j: f64| -> f64 {
                    let mut v = 0.0;
                    let mut h = 0.0;
                    for (i, d) in st.subs.iter().enumerate() {
                        let m = d.voltage_at(j, ere, guess[i]);
                        v += m;
                        h += d.eval(m).2 - d.h0;
                    }
                    j * v * kq - eta * h
                };
                let (j0, _) = golden_max(score, |s| *s, 0.0, jmin, 1e-7 * jmin.max(1e-300));
                let slope = |j: f64| -> f64 {
                    let (mut v, mut dv, mut dh) = (0.0, 0.0, 0.0);
                    for (i, d) in st.subs.iter().enumerate() {
                        let m = d.voltage_at(j, ere, guess[i]);
                        let (_, dd, _, hh) = d.eval(m);
                        let dm_dj = -ere / (CHARGE * dd);
                        v += m;
                        dv += dm_dj;
                        dh += hh * dm_dj;
                    }
                    kq * (v + j * dv) - eta * dh
                };
                let j = polish(slope, j0, 4e-7 * jmin, 0.0, jmin);
                volts(j, &mut buf);
                ms.copy_from_slice(&buf);
                Some(j)
            } else {
                for (i, d) in st.subs.iter().enumerate() {
                    let score = |m: f64| d.current(m, ere).0 * m * kq - eta * (d.eval(m).2 - d.h0);
                    let (m0, _) = golden_max(score, |s| *s, 0.0, d.m_oc, 1e-7 * d.m_oc.max(1e-300));
                    let slope = |m: f64| -> f64 {
                        let (dv, dd, _, dh) = d.eval(m);
                        let c = CHARGE / ere;
                        let jj = d.j_gen - c * (dv - d.d0);
                        kq * (jj - m * c * dd) - eta * dh
                    };
                    ms[i] = polish(slope, m0, 4e-7 * d.m_oc, 0.0, d.m_oc);
                }
                None
            }
        };
        let power_of = |ms: &[f64], j: Option<f64>| -> f64 {
            match j {
                Some(j) => j * ms.iter().sum::<f64>() * kq,
                None => st.subs.iter().zip(ms).map(|(d, &m)| d.current(m, ere).0 * m * kq).sum(),
            }
        };
        let j = optimize(0.0, &mut ms);
        let p = power_of(&ms, j);
        let h = heat_of(&ms);
        result.pmax = finite(p.max(0.0));
        result.heat_in = finite(h);
        result.efficiency = if h > 0.0 { finite(p / h).max(0.0) } else { 0.0 };
        result.jsc = if series { jscs.iter().copied().fold(f64::INFINITY, f64::min) } else { jscs.iter().sum() };
        result.jsc = finite(result.jsc);
        if series || n == 1 {
            let vmp = ms.iter().sum::<f64>() * kq;
            result.vmp = Some(finite(vmp));
            result.jmp = Some(match j {
                Some(j) => finite(j),
                None => finite(st.subs[0].current(ms[0], ere).0),
            });
        }
        result.subcells = st
            .subs
            .iter()
            .zip(&ms)
            .zip(&st.gaps)
            .map(|((d, &m), &g)| TpvSubcell {
                gap_j: g,
                jsc: d.j_gen,
                voc: d.m_oc * kq,
                vmp: m * kq,
                jmp: j.unwrap_or_else(|| d.current(m, ere).0),
            })
            .collect();
        result.max_efficiency = result.efficiency;
        if with_max_eff && h > 0.0 && p > 0.0 {
            let mut eta = result.efficiency;
            let mut work = ms.clone();
            for _ in 0..30 {
                let j = optimize(eta, &mut work);
                let (p, h) = (power_of(&work, j), heat_of(&work));
                if !(h > 0.0) {
                    break;
                }
                let next = p / h;
                let done = (next - eta).abs() <= 1e-15 * eta.abs().max(1e-300);
                if next > eta {
                    eta = next;
                }
                if done {
                    break;
                }
            }
            result.max_efficiency = finite(eta.max(result.efficiency));
        }
        result
    }

    /// Efficiency and power density at the maximum power point of a single junction at each
    /// of `gaps_j` [J] (the efficiency-power trade-off; the efficiency at its own optimum is
    /// not searched).
    pub fn sweep(&self, gaps_j: &[f64]) -> Vec<SweepPoint> {
        let mut out = vec![SweepPoint::default(); gaps_j.len()];
        super::batch::fill_chunks(&mut out, 64, |start, chunk| {
            for (k, p) in chunk.iter_mut().enumerate() {
                let g = gaps_j[start + k];
                *p = match self.stack(&[g]) {
                    Some(st) => {
                        let r = self.solve_prepared(&st, Connection::Independent, false);
                        SweepPoint { gap_j: g, efficiency: r.efficiency, pmax: r.pmax }
                    }
                    None => SweepPoint { gap_j: g, ..SweepPoint::default() },
                };
            }
        });
        out
    }

    /// The J-V curve of a single junction or a series stack: (V [V], J [A m^-2]) at `n`
    /// currents from the short circuit to the open circuit (independent stacks: the first
    /// subcell's curve is not meaningful alone, so their sum of powers is not drawn here).
    pub fn jv_curve(&self, gaps_j: &[f64], n: usize) -> Vec<(f64, f64)> {
        let Some(st) = self.stack(gaps_j) else { return Vec::new() };
        let ere = self.setup.ere.clamp(1e-12, 1.0);
        let kq = self.ktc / CHARGE;
        let jmin = st.subs.iter().map(|d| d.j_gen).fold(f64::INFINITY, f64::min).max(0.0);
        let n = n.max(2);
        (0..n)
            .map(|i| {
                let j = jmin * (1.0 - i as f64 / (n - 1) as f64);
                let v: f64 = st.subs.iter().map(|d| d.voltage_at(j, ere, 0.9 * d.m_oc)).sum::<f64>() * kq;
                (finite(v), finite(j))
            })
            .collect()
    }

    /// The spectral exchange at photon energy `e` [J] for a cell whose subcells (gaps `gaps_j`
    /// [J], descending) sit at voltages `volts` [V]: (emitted by the emitter eps e1,
    /// net leaving the emitter q1, net absorbed by the cell q2), all per unit energy
    /// [W m^-2 J^-1] (power, E times the photon fluxes).
    pub fn spectral_exchange(&self, e: f64, gaps_j: &[f64], volts: &[f64]) -> (f64, f64, f64) {
        let te = self.setup.emitter_temp_k;
        let tc = self.setup.cell_temp_k;
        let e1 = phi0(e, te);
        let e3 = phi0(e, tc);
        let eps = self.eps(e);
        let bottom = gaps_j.last().copied().unwrap_or(f64::INFINITY);
        let (a, mu) = if e >= bottom {
            let i = gaps_j.iter().position(|g| e >= *g).unwrap_or(0);
            (1.0, volts.get(i).copied().unwrap_or(0.0) * CHARGE)
        } else {
            (self.a_sub(e), 0.0)
        };
        let e2 = if mu == 0.0 {
            e3
        } else {
            let x = (e - mu) / (BOLTZMANN * tc);
            if x > 0.0 && x < 700.0 {
                PHOTON_FLUX_PREFACTOR * e * e / x.exp_m1()
            } else if x >= 700.0 {
                0.0
            } else {
                f64::MAX
            }
        };
        let c = exchange(eps, a, self.setup.view_factor);
        let q1 = c.q1[0] * e1 + c.q1[1] * e2 + c.q1[2] * e3;
        let q2 = c.q2[0] * e1 + c.q2[1] * e2 + c.q2[2] * e3;
        (finite(e * eps * e1), finite(e * q1), finite(e * q2))
    }

    /// kTe [J]
    pub fn emitter_kt(&self) -> f64 {
        self.kte
    }
}

#[derive(Debug, Clone)]
struct Stack {
    subs: Vec<Dark>,
    fixed_heat: f64,
    subgap_heat: f64,
    gaps: Vec<f64>,
}

fn finite(x: f64) -> f64 {
    if x.is_nan() {
        0.0
    } else {
        x.clamp(-f64::MAX, f64::MAX)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn radiosity_reduces_to_the_parallel_plate_exchange_at_unit_view_factor() {
        for &(eps, a) in &[(0.9, 1.0), (0.3, 0.05), (1.0, 0.2), (0.01, 0.99), (0.5, 0.5)] {
            let c = exchange(eps, a, 1.0);
            let tau = exchange_factor(eps, a);
            assert!((c.q1[0] - tau).abs() <= 1e-15 && (c.q1[1] + tau).abs() <= 1e-15 && c.q1[2].abs() <= 1e-15);
            assert!((c.q2[0] - tau).abs() <= 1e-15 && (c.q2[1] + tau).abs() <= 1e-15 && c.q2[2].abs() <= 1e-15);
        }
    }

    #[test]
    fn equilibrium_exchanges_nothing() {
        // with e1 = e2 = e3 every net flux vanishes (second law), for any F
        for &(eps, a, f) in &[(0.9, 1.0, 0.7), (0.3, 0.05, 0.2), (0.6, 0.4, 1.0)] {
            let c = exchange(eps, a, f);
            assert!(c.q1.iter().sum::<f64>().abs() < 1e-15);
            assert!(c.q2.iter().sum::<f64>().abs() < 1e-15);
        }
    }
}
