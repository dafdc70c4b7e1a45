"""Vectorized numpy baseline: the two-junction series (two-terminal) efficiency map.

Run with:

    python3 benches/map_numpy.py

Computes the detailed-balance efficiency of every two-junction stack on a 500 x 500 grid:
top gaps 1.2 to 2.4 eV and bottom gaps 0.5 to 1.5 eV, 500 points each, both ends
included (gap_i = start + width * i / 499), under ASTM G173-03 AM1.5G (global column of
src/physics/data/astm_g173_03.csv), cells at 300 K, 1 sun, ERE = 1, front-face emission
only.  A point whose bottom gap is not below its top gap is not a stack and holds 0.

Physics
-------
* Single junction in the detailed-balance limit: W. Shockley and H. J. Queisser,
  J. Appl. Phys. 32, 510 (1961).  Step absorptance at the gap.
* Stack (A. De Vos, J. Phys. D 13, 839 (1980)): the top cell absorbs every photon above
  its gap, the bottom cell those between its gap and the top gap; no luminescent
  coupling.  Photocurrents Jsc_top = q Phi(>Eg_top), Jsc_bottom = q (Phi(>Eg_bottom) -
  Phi(>Eg_top)).  Phi(>Eg) is the trapezoid rule on the table's own wavelength points of
  the photon density I*lambda/(hc), with linear interpolation of that density at
  lambda_g = hc/Eg for the partial interval.  Input power: the trapezoid rule on the
  irradiance.
* Emission: the generalized Planck law with chemical potential qV (P. Wurfel, J. Phys. C
  15, 3967 (1982)), front face, exact (Bose, not Boltzmann), through the Bose series
    R(m) = scale * S0,  S0 = int_{x0}^inf x^2/(e^{x-m}-1) dx
                           = sum_{k>=1} e^{-k d} (x0^2/k + 2 x0/k^2 + 2/k^3),
    d = x0 - m, x0 = Eg/kT, m = qV/kT, scale = q 2 pi (kT)^3/(h^3 c^2),
  truncated once e^{-(k-1) d_min} < 1e-16 (K = ceil(37/d_min) + 1 terms), so the
  truncation error is below 1e-16 relative.  J(m) = Jsc - (R(m) - R(0)).
* Series connection (De Vos 1980): one current J, voltages add; the stack delivers
  P = max_J J (V_top(J) + V_bottom(J)).

Method (every step vectorized over all map points; Python loops run over iterations and
series terms only)
------
* The variable is the reduced voltage x of the limiting subcell (smaller Jsc; the top one
  on a tie), which runs through (0, x_oc) one to one with J.  J(x) is explicit; the other
  subcell's reduced voltage follows from ln S0(m) = ln(S0 at the current J) by Newton's
  method started from the Boltzmann value, an upper bound of the root of this convex
  increasing function, so the iterates fall monotonically onto it; stopped once the
  largest step is below 1e-9 (the next error is below (rho'/2 rho) step^2 < 1e-21).
  Its first two derivatives in J are closed forms (dm/dJ = -1/S1, d2m/dJ2 = -S2/S1^3,
  in units of scale).
* dP/dx = 0 by Newton's method with analytic second derivatives, kept inside the bracket
  (0, x_oc,Boltzmann) (bisection when a step would leave it), started from the maximum of
  a Boltzmann diode in series with a constant voltage c, x = W(e^(1 + x_oc + c)) - 1 - c
  (Lambert W), and stopped once the largest step is below 1e-11 relative to max(1, x).
  P is flat at its maximum, so the power at the last point evaluated is within about
  (|P''|/2P) step^2 < 1e-20 relative of the maximum (|P''|/P ~ 0.02 at x ~ 30).

Accuracy: limited by rounding.  Measured: the self-check below agrees with an
independent quad-and-brentq reference to 3e-16 in efficiency (absolute); cargo bench
prints the difference of its best point from glowgap's.

Output (machine-readable lines):
    numpy_import_seconds=<s>
    numpy_load_seconds=<s>       (CSV parse, not part of the map timing)
    numpy_map_seconds=<median s over REPEATS> points=250000 best_top_ev=<..>
        best_bottom_ev=<..> best_efficiency=<..>     (one line)
    selfcheck_rows=<n> max_abs_efficiency_diff=<..>
REPEATS comes from GLOWGAP_BENCH_REPEATS (default 7).  The self-check solves the
two-junction series rows on tabulated sources (AM1.5G, AM1.5D; any temperature and
concentration) of tests/fixtures/stack_series.csv, written by
tests/reference/gen_stack.py with scipy (quad for the radiative current, brentq for
V(J) and dP/dJ = 0): an independent method.
"""

import time

_t_import0 = time.perf_counter()
import numpy as np  # noqa: E402
_t_import1 = time.perf_counter()

import csv  # noqa: E402
import math  # noqa: E402
import os  # noqa: E402
import statistics  # noqa: E402
from pathlib import Path  # noqa: E402

import sys  # noqa: E402

# the exact SI constants, the table reader and the column names are the curve baseline's
sys.dont_write_bytecode = True
sys.path.insert(0, str(Path(__file__).resolve().parent))
from sweep_numpy import C, COLUMN_OF, H, KB, Q, load_table  # noqa: E402

REPEATS = int(os.environ.get("GLOWGAP_BENCH_REPEATS", "7"))
ROOT = Path(__file__).resolve().parents[1]
G173 = ROOT / "src" / "physics" / "data" / "astm_g173_03.csv"
FIXTURE = ROOT / "tests" / "fixtures" / "stack_series.csv"
POINTS = 500


def flux_above(lam, irr, gaps_ev):
    """Photon flux above each gap [m^-2 s^-1] and the input power [W m^-2]."""
    s = irr * (lam * 1e-9) / (H * C)
    cum = np.empty_like(s)
    cum[0] = 0.0
    np.cumsum(0.5 * (s[1:] + s[:-1]) * np.diff(lam), out=cum[1:])
    pin = float(np.sum(0.5 * (irr[1:] + irr[:-1]) * np.diff(lam)))
    lam_g = (H * C * 1e9) / (gaps_ev * Q)
    n = lam.size
    idx = np.searchsorted(lam, lam_g, side="right")
    i0 = np.clip(idx - 1, 0, n - 2)
    l0 = lam[i0]
    s_g = s[i0] + (s[i0 + 1] - s[i0]) * (lam_g - l0) / (lam[i0 + 1] - l0)
    flux = cum[i0] + 0.5 * (s[i0] + s_g) * (lam_g - l0)
    return np.where(idx >= n, cum[-1], np.where(idx == 0, 0.0, flux)), pin


def bose(x0, d, second=True):
    """S0 = sum_k e^{-kd}(x0^2/k + 2x0/k^2 + 2/k^3), S1 = dS0/dm, S2 = d2S0/dm2 (m = x0 - d)."""
    kmax = int(math.ceil(37.0 / max(float(np.min(d)), 1e-3))) + 1
    a = x0 * x0
    b = 2.0 * x0
    e1 = np.exp(-d)
    ek = e1
    p = a + b + 2.0                      # k * (k-th term of S0) / e^{-kd}, k = 1
    t = ek * p
    s0, s1 = t.copy(), t.copy()
    s2 = t.copy() if second else None
    for k in range(2, kmax + 1):
        ek = ek * e1
        t = ek * (a + b * (1.0 / k) + 2.0 / (k * k))
        s0 += t * (1.0 / k)
        s1 += t
        if second:
            s2 += t * k
    return s0, s1, s2


def lambert_w_of_exp(y):
    """W(e^y): the root of w + ln w = y; a start value only, 4 Newton steps."""
    w = np.where(y > 1.0, y - np.log(np.maximum(y, 1.0)), np.exp(np.minimum(y, 1.0)))
    for _ in range(4):
        w = np.maximum(w - (w + np.log(w) - y) * w / (w + 1.0), 1e-300)
    return w


def series_map(lam, irr, tops_ev, bottoms_ev, cell_t=300.0, conc=1.0):
    """Efficiency [fraction] of every series two-junction stack; rows = top gaps."""
    kt = KB * cell_t
    vt = kt / Q
    scale = Q * 2.0 * math.pi * kt ** 3 / (H ** 3 * C ** 2)       # A m^-2
    fl_t, pin = flux_above(lam, irr, tops_ev)
    fl_b, _ = flux_above(lam, irr, bottoms_ev)
    pin *= conc
    jt_gap = Q * conc * fl_t / scale                              # Jsc above, in units of scale
    jb_gap = Q * conc * fl_b / scale
    xt_gap = tops_ev / vt
    xb_gap = bottoms_ev / vt
    r0t_gap = bose(xt_gap, xt_gap, False)[0]                      # S0 at zero bias
    r0b_gap = bose(xb_gap, xb_gap, False)[0]

    eff = np.zeros((tops_ev.size, bottoms_ev.size))
    ti, bi = np.nonzero(bottoms_ev[None, :] < tops_ev[:, None])   # the stacks
    jt = jt_gap[ti]
    jb = np.maximum(jb_gap[bi] - jt, 0.0)
    top_lim = jt <= jb
    # limiting subcell L and the other one O
    x_l = np.where(top_lim, xt_gap[ti], xb_gap[bi])
    x_o = np.where(top_lim, xb_gap[bi], xt_gap[ti])
    r0_l = np.where(top_lim, r0t_gap[ti], r0b_gap[bi])
    r0_o = np.where(top_lim, r0b_gap[bi], r0t_gap[ti])
    j_l = np.where(top_lim, jt, jb)
    j_o = np.where(top_lim, jb, jt)
    ok = j_l > 0.0
    if not np.all(ok):
        ti, bi, x_l, x_o, r0_l, r0_o, j_l, j_o = (v[ok] for v in (ti, bi, x_l, x_o, r0_l, r0_o, j_l, j_o))
    mismatch = j_o - j_l                                           # >= 0
    p_l = x_l * x_l + 2.0 * x_l + 2.0
    p_o = x_o * x_o + 2.0 * x_o + 2.0
    # Boltzmann open-circuit voltages: upper bounds of the exact ones
    moc_l = x_l + np.log((j_l + r0_l) / p_l)
    moc_o = x_o + np.log((j_o + r0_o) / p_o)
    j_guess = j_l * moc_l / (1.0 + moc_l)
    c = moc_o + np.log1p(-j_guess / j_o)
    x = np.clip(lambert_w_of_exp(1.0 + moc_l + c) - 1.0 - c, 0.0, moc_l)
    lo = np.zeros_like(x)
    hi = moc_l.copy()
    x = np.where((x > lo) & (x < hi), x, 0.5 * (lo + hi))

    def evaluate(x):
        s0, s1, s2 = bose(x_l, x_l - x)
        rise = s0 - r0_l                                           # R_L(x) - R_L(0)
        j = j_l - rise
        j1, j2 = -s1, -s2
        # the other subcell at current j: S0_O(m) = u
        u = mismatch + r0_o + rise
        ln_u = np.log(u)
        m = x_o + np.log(u / p_o)                                  # Boltzmann, above the root
        for _ in range(50):
            t0, t1, t2 = bose(x_o, x_o - m)
            step = (np.log(t0) - ln_u) * t0 / t1
            m = m - step
            if float(np.max(np.abs(step))) < 1e-9:
                break
        mj = -1.0 / t1                                             # dm/dj
        mjj = -t2 / (t1 * t1 * t1)                                 # d2m/dj2
        v = x + m
        v1 = 1.0 + mj * j1
        v2 = mjj * j1 * j1 + mj * j2
        return j, v, j1 * v + j * v1, j2 * v + 2.0 * j1 * v1 + j * v2

    for _ in range(200):
        j, v, dp, d2p = evaluate(x)
        lo = np.where(dp > 0.0, x, lo)
        hi = np.where((dp < 0.0) | np.isnan(dp), x, hi)
        newton = x - dp / d2p
        good = (d2p < 0.0) & (newton >= lo) & (newton <= hi)
        x_next = np.where(good, newton, 0.5 * (lo + hi))
        if float(np.max(np.abs(x_next - x) / np.maximum(x, 1.0))) < 1e-11:
            break
        x = x_next
    power = scale * vt * np.maximum(j * v, 0.0)
    eff[ti, bi] = np.where(np.isfinite(power), power, 0.0) / pin
    return eff


def self_check(table):
    """Two-junction series rows of the scipy fixture on tabulated sources."""
    if not FIXTURE.exists():
        return None
    with open(FIXTURE, "r", encoding="utf-8") as fh:
        rows = list(csv.DictReader(l for l in fh if not l.startswith("#")))
    worst, count = 0.0, 0
    for r in rows:
        col = COLUMN_OF.get(r["source"])
        gaps = [float(g) for g in r["gaps_ev"].split(";")]
        if col is None or r["connection"] != "series" or len(gaps) != 2:
            continue
        eff = series_map(table["wavelength"], table[col], np.array([gaps[0]]), np.array([gaps[1]]),
                         float(r["cell_temp_k"]), float(r["concentration"]))
        worst = max(worst, abs(float(eff[0, 0]) - float(r["efficiency"])))
        count += 1
    return count, worst


def main():
    t0 = time.perf_counter()
    table = load_table(G173)
    t1 = time.perf_counter()
    lam, irr = table["wavelength"], table["global"]
    steps = np.arange(POINTS, dtype=float)
    tops = 1.2 + 1.2 * steps / (POINTS - 1)                      # 1.2 .. 2.4 eV, both ends
    bottoms = 0.5 + 1.0 * steps / (POINTS - 1)                   # 0.5 .. 1.5 eV, both ends

    eff = series_map(lam, irr, tops, bottoms)                    # warm-up
    times = []
    for _ in range(max(REPEATS, 1)):
        ta = time.perf_counter()
        eff = series_map(lam, irr, tops, bottoms)
        times.append(time.perf_counter() - ta)
    best = int(np.argmax(eff))                                   # first maximum, row-major
    i, k = divmod(best, POINTS)

    print(f"numpy_import_seconds={_t_import1 - _t_import0:.6f}")
    print(f"numpy_load_seconds={t1 - t0:.6f}")
    print(f"numpy_map_seconds={statistics.median(times):.6f} points={eff.size} "
          f"best_top_ev={tops[i]:.6f} best_bottom_ev={bottoms[k]:.6f} "
          f"best_efficiency={eff[i, k]:.12f}")
    chk = self_check(table)
    if chk is None:
        print("selfcheck skipped: tests/fixtures/stack_series.csv not found")
    else:
        print(f"selfcheck_rows={chk[0]} max_abs_efficiency_diff={chk[1]:.3e}")


if __name__ == "__main__":
    main()
