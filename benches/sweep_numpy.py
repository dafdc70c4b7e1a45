"""Vectorized numpy baseline: detailed-balance efficiency vs band gap.

Run with:

    python3 benches/sweep_numpy.py

Computes the Shockley-Queisser limit (W. Shockley and H. J. Queisser,
J. Appl. Phys. 32, 510 (1961)) for 3,701 gaps from 0.300 to 4.000 eV in
1 meV steps (GLOWGAP_BENCH_STEP_MEV=0.1: 37,001 gaps in 0.1 meV steps) under ASTM G173-03 AM1.5G (global column), cell at 300 K,
1 sun, ERE = 1, front-face emission only (g = 1).  Emission uses the exact
generalized Planck law (P. Wurfel, J. Phys. C 15, 3967 (1982)) summed as the
Bose series

    int_{x0}^inf x^2/(e^{x-m}-1) dx = sum_{k>=1} e^{-k d} (x0^2/k + 2 x0/k^2 + 2/k^3),
    d = x0 - m, x0 = Eg/kT, m = qV/kT,

truncated adaptively once e^{-k d} < 1e-16 relative (K = ceil(37/d_min)+1).
Jsc uses the trapezoid rule on the table's own points with linear
interpolation of the photon integrand I*lambda/(hc) at lambda_g = hc/Eg.
Voc and the maximum power point are found with Newton iterations vectorized
across all gaps (Voc in log space; MPP on dP/dm = 0 with analytic first and
second derivatives), stopped when max |step| < 1e-13 in m = qV/kT.

Output (machine-readable lines):
    numpy_import_seconds=<s>
    numpy_load_seconds=<s>         (CSV parse, not part of the sweep timing)
    numpy_sweep_seconds=<median s over REPEATS> gaps=3701 best_gap_ev=<..> best_efficiency=<..>
    selfcheck_rows=<n> max_abs_efficiency_diff=<..> max_rel_voc_diff=<..>
The self-check compares against the tabulated-source rows of
tests/fixtures/detailed_balance.csv (written by
tests/reference/gen_detailed_balance.py, quad-based, independent method).
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

H = 6.62607015e-34
C = 299792458.0
KB = 1.380649e-23
Q = 1.602176634e-19

REPEATS = int(os.environ.get("GLOWGAP_BENCH_REPEATS", "20"))
STEP_MEV = float(os.environ.get("GLOWGAP_BENCH_STEP_MEV", "1"))
ROOT = Path(__file__).resolve().parents[1]
G173 = ROOT / "src" / "physics" / "data" / "astm_g173_03.csv"
FIXTURE = ROOT / "tests" / "fixtures" / "detailed_balance.csv"
COLUMN_OF = {"am1.5g": "global", "am1.5d": "direct", "am0": "extraterrestrial"}


def load_table(path):
    with open(path, "r", encoding="utf-8") as fh:
        fh.readline()
        names = [s.strip() for s in fh.readline().split(",")]
        data = np.loadtxt(fh, delimiter=",")
    return {n: data[:, i] for i, n in enumerate(names)}


def _bose_sums(x0, d):
    """S0 = sum e^{-kd}(x0^2/k + 2x0/k^2 + 2/k^3), S1 = dS0/dm, S2 = d2S0/dm2."""
    dmin = float(np.min(d))
    kmax = int(math.ceil(37.0 / max(dmin, 1e-3))) + 1
    k = np.arange(1, kmax + 1, dtype=float)[:, None]
    e = np.exp(-k * d[None, :])
    a = x0 * x0
    b = 2.0 * x0
    inv_k = 1.0 / k
    poly1 = a + b * inv_k + 2.0 * inv_k * inv_k          # k * (term of S0)/e
    s1 = np.sum(e * poly1, axis=0)
    s0 = np.sum(e * poly1 * inv_k, axis=0)
    s2 = np.sum(e * poly1 * k, axis=0)
    return s0, s1, s2


def sweep(lam, irr, gaps_ev, cell_t=300.0, conc=1.0, ere=1.0):
    """Return dict of arrays (jsc A/m^2, voc V, vmp V, jmp A/m^2, pmax, pin, eff)."""
    # --- Jsc: trapezoid on table points + interpolated partial segment
    s = irr * (lam * 1e-9) / (H * C)
    cum = np.empty_like(s)
    cum[0] = 0.0
    np.cumsum(0.5 * (s[1:] + s[:-1]) * np.diff(lam), out=cum[1:])
    pin = conc * float(np.sum(0.5 * (irr[1:] + irr[:-1]) * np.diff(lam)))
    lam_g = (H * C / Q * 1e9) / gaps_ev
    n = lam.size
    idx = np.searchsorted(lam, lam_g, side="right")
    i0 = np.clip(idx - 1, 0, n - 2)
    l0 = lam[i0]
    s_g = s[i0] + (s[i0 + 1] - s[i0]) * (lam_g - l0) / (lam[i0 + 1] - l0)
    flux = cum[i0] + 0.5 * (s[i0] + s_g) * (lam_g - l0)
    flux = np.where(idx >= n, cum[-1], np.where(idx == 0, 0.0, flux))
    jsc = Q * conc * flux

    # --- emission
    kt = KB * cell_t
    vt = kt / Q
    scale = Q * 2.0 * math.pi * kt ** 3 / (H ** 3 * C ** 2)   # A/m^2
    x0 = gaps_ev / vt
    s00, _, _ = _bose_sums(x0, x0)                          # J_rad(0)/scale
    target = jsc * ere / scale + s00                        # S0 at Voc

    # --- Voc: Newton on ln S0(x0 - m) = ln target, in m
    d = np.log((x0 * x0 + 2.0 * x0 + 2.0) / target)
    d = np.maximum(d, 1e-3)
    m = x0 - d
    for _ in range(50):
        s0, s1, _ = _bose_sums(x0, x0 - m)
        step = (np.log(s0) - np.log(target)) / (s1 / s0)
        m_new = np.minimum(m - step, x0 - 1e-3)
        done = np.max(np.abs(m_new - m)) < 1e-13 * max(1.0, float(np.max(np.abs(m))))
        m = m_new
        if done:
            break
    m_oc = m

    # --- MPP: Newton on g(m) = Jsc*ere/scale - (S0 - S00) - m S1 = 0
    m = m_oc - np.log1p(m_oc)
    for _ in range(50):
        s0, s1, s2 = _bose_sums(x0, x0 - m)
        g = jsc * ere / scale - (s0 - s00) - m * s1
        gp = -(2.0 * s1 + m * s2)
        m_new = np.clip(m - g / gp, 0.0, m_oc)
        done = np.max(np.abs(m_new - m)) < 1e-13 * max(1.0, float(np.max(np.abs(m))))
        m = m_new
        if done:
            break
    s0, _, _ = _bose_sums(x0, x0 - m)
    jmp = jsc - scale * (s0 - s00) / ere
    vmp = m * vt
    pmax = vmp * jmp
    return {"jsc": jsc, "voc": m_oc * vt, "vmp": vmp, "jmp": jmp,
            "pmax": pmax, "pin": pin, "eff": pmax / pin}


def self_check(table):
    """Compare with the tabulated-source rows of the quad-based fixture."""
    if not FIXTURE.exists():
        return None
    with open(FIXTURE, "r", encoding="utf-8") as fh:
        rows = list(csv.DictReader(l for l in fh if not l.startswith("#")))
    worst_eff, worst_voc, count = 0.0, 0.0, 0
    for r in rows:
        col = COLUMN_OF.get(r["source"])
        if col is None:
            continue
        res = sweep(table["wavelength"], table[col], np.array([float(r["gap_ev"])]),
                    float(r["cell_temp_k"]), float(r["concentration"]), float(r["ere"]))
        worst_eff = max(worst_eff, abs(float(res["eff"][0]) - float(r["efficiency"])))
        worst_voc = max(worst_voc, abs(float(res["voc"][0]) - float(r["voc_v"]))
                        / float(r["voc_v"]))
        count += 1
    return count, worst_eff, worst_voc


def main():
    t0 = time.perf_counter()
    table = load_table(G173)
    t1 = time.perf_counter()
    lam, irr = table["wavelength"], table["global"]
    # GLOWGAP_BENCH_STEP_MEV=0.1 gives the 37,001 gaps of `glowgap sweep --step 0.0001`
    per_ev = int(round(1000.0 / STEP_MEV))
    gaps = np.arange(round(0.3 * per_ev), round(4.0 * per_ev) + 1) / per_ev

    res = sweep(lam, irr, gaps)                              # warm-up
    times = []
    for _ in range(REPEATS):
        ta = time.perf_counter()
        res = sweep(lam, irr, gaps)
        times.append(time.perf_counter() - ta)
    best = int(np.argmax(res["eff"]))

    print(f"numpy_import_seconds={_t_import1 - _t_import0:.6f}")
    print(f"numpy_load_seconds={t1 - t0:.6f}")
    print(f"numpy_sweep_seconds={statistics.median(times):.6f} gaps={gaps.size} "
          f"best_gap_ev={gaps[best]:.4f} best_efficiency={res['eff'][best]:.10f}")
    chk = self_check(table)
    if chk is None:
        print("selfcheck skipped: tests/fixtures/detailed_balance.csv not found")
    else:
        print(f"selfcheck_rows={chk[0]} max_abs_efficiency_diff={chk[1]:.3e} "
              f"max_rel_voc_diff={chk[2]:.3e}")


if __name__ == "__main__":
    main()
