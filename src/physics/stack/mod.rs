//! Stacks of junctions (multi-junction, tandem cells) in the detailed-balance limit.
//!
//! Model (De Vos, J. Phys. D 13, 839, 1980; Henry, J. Appl. Phys. 51, 4494, 1980): the
//! subcells are stacked with the widest gap on top. Subcell i (top = 0) has a step
//! absorptance and absorbs every photon between its own gap Eg_i and the gap above it,
//! Eg_(i-1) (the top cell: everything above Eg_0), so its photocurrent is
//!
//!   Jsc_i = q X integral_{Eg_i}^{Eg_(i-1)} Phi_src(E) dE                        [A m^-2].
//!
//! Each subcell emits as a black body from its own gap up, at the cell temperature, with
//! chemical potential q V_i (the generalized Planck law of `junction`), through the faces
//! chosen by [`Emission`](super::junction::Emission). Light a subcell emits towards the cells
//! below is counted as lost: there is no luminescent coupling between subcells. That is the
//! treatment of De Vos 1980 and Henry 1980 and gives their published limits; coupling would
//! raise series-connected efficiencies slightly where currents are mismatched (Brown &
//! Green, Prog. Photovolt. 10, 299, 2002).
//!
//! Connections:
//! * independent (multi-terminal): every subcell at its own maximum power point;
//!   P = sum_i Pmax_i.
//! * series (two-terminal): one current J through all subcells, voltages add;
//!   P = max over 0 < J < min_i Jsc_i of J sum_i V_i(J), with V_i(J) the inverse of the
//!   subcell's J-V curve ([`Diode::voltage_at_current`]). P(J) is concave there (each V_i is
//!   a concave decreasing function of J), so its maximum is the one root of dP/dJ = 0,
//!   found by Newton's method kept inside a bracket ([`series`], which takes the limiting
//!   subcell's voltage, one to one with J, as the variable).

pub mod map;
pub mod mixed;
pub mod optimize;
pub mod series;

use super::batch::{series_max_power, FastDiode, SeriesCell};
use super::junction::{Cell, CellResult, Diode, Illumination, ThermalPrefactor};

/// The most junctions a stack may have.
pub const MAX_JUNCTIONS: usize = 6;

/// How the subcells are wired.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Connection {
    /// Two-terminal: one current through every subcell. Default.
    #[default]
    Series,
    /// Multi-terminal: every subcell at its own maximum power point.
    Independent,
}

impl Connection {
    /// A short name for display.
    pub fn label(self) -> &'static str {
        match self {
            Connection::Series => "series",
            Connection::Independent => "independent",
        }
    }
}

/// One subcell's figures. SI units.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SubcellResult {
    /// band gap [J]
    pub gap_j: f64,
    /// upper edge of the band it absorbs [J] (infinity for the top cell)
    pub upper_j: f64,
    /// short-circuit current density [A m^-2]
    pub jsc: f64,
    /// open-circuit voltage of the subcell alone [V]
    pub voc: f64,
    /// current density at the stack's operating point [A m^-2]
    pub j_op: f64,
    /// voltage at the stack's operating point [V]
    pub v_op: f64,
    /// power delivered at the operating point [W m^-2]
    pub p_op: f64,
    /// photocurrent the subcell cannot deliver in series: Jsc_i - min Jsc [A m^-2]
    /// (0 for independent connection)
    pub excess_jsc: f64,
}

/// The figures of a stack. SI units.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct StackResult {
    pub connection: Connection,
    /// subcells, top first
    pub subcells: Vec<SubcellResult>,
    /// series: the common current at zero total voltage, equal to the smallest subcell Jsc
    /// to within that subcell's dark saturation current; independent: the sum of the
    /// subcell Jsc [A m^-2]
    pub jsc: f64,
    /// the sum of the subcell open-circuit voltages [V] (for series, the stack's Voc)
    pub voc: f64,
    /// maximum power [W m^-2]
    pub pmax: f64,
    /// incident power (concentration included) [W m^-2]
    pub input: f64,
    /// Pmax / input (dimensionless)
    pub efficiency: f64,
    /// series: index of the subcell with the smallest Jsc (0 = top); independent: None
    pub limiting: Option<usize>,
}

/// Whether `gaps_j` [J] is a valid stack: 1 to [`MAX_JUNCTIONS`] finite positive gaps,
/// strictly descending (top first).
pub fn gaps_are_valid(gaps_j: &[f64]) -> bool {
    !gaps_j.is_empty()
        && gaps_j.len() <= MAX_JUNCTIONS
        && gaps_j.iter().all(|g| g.is_finite() && *g > 0.0)
        && gaps_j.windows(2).all(|w| w[0] > w[1])
}

/// Photocurrents [A m^-2] of the subcells of `gaps_j` [J] (descending), top first: each
/// absorbs between its gap and the gap above, Jsc_i of the module docs (De Vos 1980).
pub fn subcell_photocurrents(light: &Illumination, gaps_j: &[f64]) -> Vec<f64> {
    let mut out = vec![0.0; gaps_j.len()];
    photocurrents_into(light, gaps_j, &mut out);
    out
}

/// [`subcell_photocurrents`] into `out` (as many as both hold), without allocating.
fn photocurrents_into(light: &Illumination, gaps_j: &[f64], out: &mut [f64]) {
    let q_x = super::constants::CHARGE * light.concentration;
    let mut above = f64::INFINITY;
    for (j, &g) in out.iter_mut().zip(gaps_j) {
        *j = q_x * light.source.photon_flux_between(g, above);
        above = g;
    }
}

/// The subcell diodes of a stack, top first. `template` gives temperature, ERE, emission
/// and J-V model; its gap is ignored.
pub fn subcell_diodes(light: &Illumination, template: &Cell, gaps_j: &[f64]) -> Vec<Diode> {
    let pre = ThermalPrefactor::new(template.temp_k, template.emission);
    let cell = Cell { ere: template.ere.min(1.0), ..*template };
    subcell_photocurrents(light, gaps_j)
        .into_iter()
        .zip(gaps_j)
        .map(|(jsc, &g)| Diode::with_prefactor(&pre, &Cell { gap_j: g, ..cell }, jsc))
        .collect()
}

/// Solve a stack with band gaps `gaps_j` [J], top first (strictly descending), under
/// `light`, every subcell like `template` (temperature, ERE, emission, J-V model).
/// An invalid stack (see [`gaps_are_valid`]) or cell gives zero power, never NaN.
#[allow(clippy::neg_cmp_op_on_partial_ord, clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn solve_stack(light: &Illumination, template: &Cell, gaps_j: &[f64], connection: Connection) -> StackResult {
    let input = light.input_power();
    let empty = StackResult { connection, input, ..Default::default() };
    if !(gaps_are_valid(gaps_j) && template.temp_k > 0.0 && template.temp_k.is_finite() && template.ere > 0.0) {
        return empty;
    }
    let diodes = subcell_diodes(light, template, gaps_j);
    let cell = Cell { ere: template.ere.min(1.0), ..*template };
    let pre = ThermalPrefactor::new(cell.temp_k, cell.emission);
    let photocurrents: Vec<f64> = diodes.iter().map(Diode::photocurrent).collect();
    let singles: Vec<_> = gaps_j.iter().zip(&photocurrents).map(|(&g, &j)| single(&pre, &cell, g, j, input)).collect();
    let uppers = std::iter::once(f64::INFINITY).chain(gaps_j.iter().copied());
    let mut subcells: Vec<SubcellResult> = singles
        .iter()
        .zip(uppers)
        .map(|(r, upper)| SubcellResult {
            gap_j: r.gap_j,
            upper_j: upper,
            jsc: r.jsc,
            voc: r.voc,
            ..Default::default()
        })
        .collect();
    let voc = singles.iter().map(|r| r.voc).sum();
    let (jsc, pmax, limiting) = match connection {
        Connection::Independent => {
            for (s, r) in subcells.iter_mut().zip(&singles) {
                s.j_op = r.jmp;
                s.v_op = r.vmp;
                s.p_op = r.pmax;
            }
            (singles.iter().map(|r| r.jsc).sum(), singles.iter().map(|r| r.pmax).sum(), None)
        }
        Connection::Series => {
            let (lim, jmin) =
                singles
                    .iter()
                    .enumerate()
                    .fold((0, f64::INFINITY), |(bi, bj), (i, r)| if r.jsc < bj { (i, r.jsc) } else { (bi, bj) });
            let (p, j) = series_point(&pre, &cell, gaps_j, &photocurrents);
            for (s, d) in subcells.iter_mut().zip(&diodes) {
                s.excess_jsc = s.jsc - jmin;
                s.j_op = j;
                s.v_op = if j > 0.0 { d.voltage_at_current(j).m * d.thermal_voltage() } else { 0.0 };
                s.p_op = s.j_op * s.v_op;
            }
            (jmin.max(0.0), p, Some(lim))
        }
    };
    let efficiency = if input > 0.0 { pmax / input } else { 0.0 };
    StackResult { connection, subcells, jsc, voc, pmax, input, efficiency, limiting }
}

/// The efficiency alone (dimensionless; no per-subcell figures) of gaps `gaps_j` [J], top
/// first: what the optimizer and the map evaluate.
#[allow(clippy::neg_cmp_op_on_partial_ord, clippy::nonminimal_bool)] // NaN-rejecting comparisons: `!(x > 0.0)` also refuses NaN
pub fn stack_efficiency(light: &Illumination, template: &Cell, gaps_j: &[f64], connection: Connection) -> f64 {
    let input = light.input_power();
    if !(gaps_are_valid(gaps_j)
        && input > 0.0
        && template.temp_k > 0.0
        && template.temp_k.is_finite()
        && template.ere > 0.0)
    {
        return 0.0;
    }
    let cell = Cell { ere: template.ere.min(1.0), ..*template };
    let pre = ThermalPrefactor::new(cell.temp_k, cell.emission);
    // no allocation on the fast path: the optimizer calls this thousands of times
    let mut jsc = [0.0; MAX_JUNCTIONS];
    let jsc = &mut jsc[..gaps_j.len()];
    photocurrents_into(light, gaps_j, jsc);
    let p = match connection {
        Connection::Independent => {
            gaps_j.iter().zip(jsc.iter()).map(|(&g, &j)| single(&pre, &cell, g, j, input).pmax).sum()
        }
        Connection::Series => series_point(&pre, &cell, gaps_j, jsc).0,
    };
    p / input
}

/// One subcell alone at its maximum power point: the batch engine's solve where its series
/// form applies, the scalar `Diode::solve` elsewhere (as `junction::sweep` does), so the
/// optimizer, the stack figures and the sweep agree to the last bit.
fn single(pre: &ThermalPrefactor, cell: &Cell, gap_j: f64, jsc: f64, input: f64) -> CellResult {
    FastDiode::new(pre, cell, gap_j)
        .and_then(|d| d.solve(gap_j, jsc, input))
        .unwrap_or_else(|| Diode::with_prefactor(pre, &Cell { gap_j, ..*cell }, jsc).solve(gap_j, input))
}

/// The series maximum (power [W m^-2], current [A m^-2]) of subcells of gaps `gaps_j` [J]
/// and photocurrents `jsc` [A m^-2]: the batch engine's `series_max_power` where its series
/// form applies to every subcell and the solve meets its error bound, else the scalar
/// `series::max_power` (the same equations; they agree to about 1e-14).
fn series_point(pre: &ThermalPrefactor, cell: &Cell, gaps_j: &[f64], jsc: &[f64]) -> (f64, f64) {
    let n = gaps_j.len().min(jsc.len()).min(MAX_JUNCTIONS);
    let mut cells = [SeriesCell::default(); MAX_JUNCTIONS];
    let mut usable = n > 0;
    for (c, (&g, &j)) in cells.iter_mut().zip(gaps_j.iter().zip(jsc)) {
        match FastDiode::new(pre, cell, g) {
            Some(diode) => *c = SeriesCell { diode, jsc: j },
            None => usable = false,
        }
    }
    let quick = if usable { series_max_power(&cells[..n], 0.0) } else { None };
    quick.unwrap_or_else(|| {
        let diodes: Vec<Diode> =
            jsc.iter().zip(gaps_j).map(|(&j, &g)| Diode::with_prefactor(pre, &Cell { gap_j: g, ..*cell }, j)).collect();
        let point = series::max_power(&diodes);
        (point.p, point.j)
    })
}
