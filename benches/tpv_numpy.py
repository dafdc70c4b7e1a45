"""Vectorized numpy baseline: thermophotovoltaic gap sweep and best step absorber.

Run with:

    python3 benches/tpv_numpy.py

Two workloads, each timed on its own (median of REPEATS runs after one warm-up):

1. TPV sweep: 1000 single-junction gaps, np.linspace(0.4, 1.6, 1000) eV, blackbody emitter
   at Te = 2000 K, view factor 1, cell at 300 K, ERE = 1, sub-gap reflectance 0.95 (cell
   absorptance a = 1 above the gap, 0.05 below).  For each gap: the maximum power point,
   the power P, the heat drawn from the emitter at that voltage and the efficiency
   P / heat_in.
2. Absorber best: the best step absorber (absorptance 1 below a cutoff wavelength, 0
   above) for work under the ASTM G173-03 direct spectrum (direct column of
   src/physics/data/astm_g173_03.csv), concentration C = 100, ambient Ta = 300 K, no
   convection: the work efficiency maximised over the absorber temperature and the cutoff.

Physics
-------
* Blackbody radiation: M. Planck, Ann. Phys. 4, 553 (1901).  Photon flux per unit photon
  energy into a hemisphere, with chemical potential mu (P. Wurfel, J. Phys. C 15, 3967
  (1982)):
      phi(E, T, mu) = (2 pi / (h^3 c^2)) E^2 / (exp((E - mu)/kT) - 1).
* Detailed balance in the manner of W. Shockley and H. J. Queisser, J. Appl. Phys. 32,
  510 (1961), between a grey emitter (emissivity eps) and the cell (absorptance a(E)) at
  view factor 1: the net exchange per photon energy is tau(E) [phi(E,Te,0) - phi(E,Tc,mu)],
      tau = eps a / (1 - (1 - eps)(1 - a))     (eps = 1 here, so tau = a),
  mu = qV above the gap (radiative limit, ERE = 1), mu = 0 below it.
      J(V)       = q int_{Eg}^inf tau [phi(E,Te,0) - phi(E,Tc,qV)] dE
      heat_in(V) = int_0^inf tau E [phi(E,Te,0) - phi(E,Tc,mu(E))] dE
      efficiency = P / heat_in at the maximum power point (the heat-to-electricity
      efficiency of A. LaPotin et al., Nature 604, 287 (2022)).
* Absorber: absorbed = C int_{l<lc} I dl + (1 - C f) int_{l<lc} pi B(l, Ta) dl with
  f = (R_sun / au)^2 = (6.957e8 / 149597870700)^2 (the ambient fills the sky except the
  solar disc); emitted = int_{l<lc} pi B(l, T) dl; thermal = (absorbed - emitted) /
  (C int I dl); work = thermal (1 - Ta/T).  I(l) is linear between the table points and
  zero outside them, so its integrals are the trapezoid rule with a partial last interval.

Method (every step vectorized over gaps or cutoffs; Python loops run over series terms
and iterations only)
------
* All band integrals are exact series (no quadrature error):
      int_x^inf t^2/(e^(t-m)-1) dt = sum_k e^(-k d) (x^2/k + 2x/k^2 + 2/k^3),
      int_x^inf t^3/(e^(t-m)-1) dt = sum_k e^(-k d) (x^3/k + 3x^2/k^2 + 6x/k^3 + 6/k^4),
  d = x - m, truncated once e^(-k d_min) < 1e-16 (K = ceil(37/d_min) + 1).  The parts
  below the gap (or above the cutoff wavelength) are pi^4/15 minus the part above.  For
  the absorber, small x = hc/(l_c k T) < 2 use the convergent expansion
      int_0^x t^3/(e^t-1) dt = x^3/3 - x^4/8
                               + sum_j (-1)^(j+1) 2 zeta(2j) x^(2j+3) / ((2 pi)^(2j) (2j+3))
  (ratio (x/2 pi)^2 < 0.102, 20 terms) and the series above for x >= 2 (20 terms).
* TPV maximum power point: dP/dm = 0 (m = qV/kTc) by Newton's method with analytic first
  and second derivatives of the Bose series, bracketed by (0, Boltzmann Voc) and started
  from the Boltzmann maximum, stopped when the largest step is below 1e-13 relative.
* Absorber temperature: W on a geometric grid of 128 temperatures from Ta to 8000 K for
  all 240 cutoffs (log-spaced, 0.2 to 50 um) brackets the maximum; then dW/dT = 0 by
  bracketed Newton with closed-form dW/dT and d2W/dT2, to 1e-13 relative.
* Cutoff: dW*/dlc is proportional to h(lc) = C I(lc) + (1 - C f) pi B(lc, Ta) - pi B(lc, T*)
  (envelope theorem).  The table wavelengths between the grid neighbours of the best grid
  cutoff are scored (I has kinks there), the sign of h at the best of them picks the
  adjacent interval, and a 32-point vectorized multisection on the sign change of h
  narrows it to below 1e-11 nm.

Accuracy: limited by rounding (series exact to 1e-16; planck_tail measured within 9e-16
of scipy quad for 0.01 <= x <= 200).  Measured: selfcheck_t1_rel_diff 5e-14,
selfcheck_b2_rel_diff 0 (the best cutoff and temperature agree with b2 to all printed
digits).  The self-checks compare with
independent scipy quad/brentq references: tests/fixtures/tpv_reference.csv row t1 (gap
0.74 eV, solved on its own with the same vectorized code, since the linspace grid does
not contain 0.74 exactly) and tests/fixtures/absorber_best_reference.csv row b2.

Output (machine-readable lines):
    numpy_import_seconds=<s>
    numpy_load_seconds=<s>       (CSV parse, not part of the timings)
    numpy_tpv_sweep_seconds=<median s> gaps=1000 best_eff_gap_ev=<..> best_efficiency=<..>
        best_power_gap_ev=<..> best_pmax_w_cm2=<..>                 (one line)
    selfcheck_t1_rel_diff=<..>
    numpy_absorber_best_seconds=<median s> best_cutoff_um=<..> best_temp_k=<..>
        best_work_efficiency=<..>                                   (one line)
    selfcheck_b2_rel_diff=<..>
REPEATS comes from GLOWGAP_BENCH_REPEATS (default 5).
"""

import time

_t_import0 = time.perf_counter()
import numpy as np  # noqa: E402
_t_import1 = time.perf_counter()

import csv  # noqa: E402
import math  # noqa: E402
import os  # noqa: E402
import statistics  # noqa: E402
import sys  # noqa: E402
from pathlib import Path  # noqa: E402

# the exact SI constants and the table reader are the curve baseline's
sys.dont_write_bytecode = True
sys.path.insert(0, str(Path(__file__).resolve().parent))
from sweep_numpy import C, H, KB, Q, load_table  # noqa: E402

REPEATS = int(os.environ.get("GLOWGAP_BENCH_REPEATS", "5"))
ROOT = Path(__file__).resolve().parents[1]
G173 = ROOT / "src" / "physics" / "data" / "astm_g173_03.csv"
TPV_FIXTURE = ROOT / "tests" / "fixtures" / "tpv_reference.csv"
ABSORBER_FIXTURE = ROOT / "tests" / "fixtures" / "absorber_best_reference.csv"

PI4_15 = math.pi ** 4 / 15.0                     # int_0^inf t^3/(e^t-1) dt
PF = 2.0 * math.pi / (H ** 3 * C ** 2)           # phi prefactor [J^-3 m^-2 s^-1]

# ---- TPV workload parameters
TPV_GAPS = (0.4, 1.6, 1000)
EMITTER_T = 2000.0
CELL_T = 300.0
EMISSIVITY = 1.0
SUBGAP_REFLECTANCE = 0.95

# ---- absorber workload parameters
CONC = 100.0
AMBIENT_T = 300.0
SUN_F = (6.957e8 / 149597870700.0) ** 2
CUTOFFS = (0.2, 50.0, 240)                       # um, log-spaced
T_GRID = 128
T_MAX = 8000.0
X_SPLIT = 2.0


# ======================================================================== TPV sweep
def bose_tpv(x0, d):
    """Bose series at x0 with d = x0 - m (arrays), m-derivatives included.

    Returns s0 = int_x0 t^2/(e^(t-m)-1), s1 = ds0/dm, s2 = d2s0/dm2 and
    e0 = int_x0 t^3/(e^(t-m)-1).
    """
    kmax = int(math.ceil(37.0 / max(float(np.min(d)), 1e-3))) + 1
    a2 = x0 * x0
    a3 = a2 * x0
    e1 = np.exp(-d)
    ek = e1
    t = ek * (a2 + 2.0 * x0 + 2.0)                # k * (k-th term of s0), k = 1
    s0, s1, s2 = t.copy(), t.copy(), t.copy()
    e0 = ek * (a3 + 3.0 * a2 + 6.0 * x0 + 6.0)
    for k in range(2, kmax + 1):
        ek = ek * e1
        ik = 1.0 / k
        t = ek * (a2 + 2.0 * x0 * ik + 2.0 * ik * ik)
        s0 += t * ik
        s1 += t
        s2 += t * k
        e0 += ek * ik * (a3 + ik * (3.0 * a2 + ik * (6.0 * x0 + 6.0 * ik)))
    return s0, s1, s2, e0


def tpv_sweep(gaps_ev, te=EMITTER_T, tc=CELL_T, eps=EMISSIVITY, rsub=SUBGAP_REFLECTANCE):
    """Maximum power point of every gap: dict of arrays (SI units, W/m^2, V)."""
    a_sub = 1.0 - rsub
    tau_a = eps                                               # a = 1 above the gap
    tau_b = eps * a_sub / (1.0 - (1.0 - eps) * (1.0 - a_sub))
    kte, ktc = KB * te, KB * tc
    eg = gaps_ev * Q
    xe = eg / kte
    xc = eg / ktc
    fe2, _, _, fe3 = bose_tpv(xe, xe)                         # emitter, above the gap
    c00, _, _, c30 = bose_tpv(xc, xc)                         # cell at mu = 0
    # photon exchange above the gap in units of (kTc)^3 PF: j = tau_a (ee - s0(m))
    ee = (te / tc) ** 3 * fe2
    p3 = xc * xc + 2.0 * xc + 2.0
    m_hi = xc + np.log(ee / p3)                               # Boltzmann Voc >= exact Voc
    m = m_hi - np.log1p(m_hi)
    lo = np.zeros_like(m)
    hi = m_hi.copy()
    for _ in range(100):
        s0, s1, s2, _ = bose_tpv(xc, xc - m)
        g = ee - s0 - m * s1                                  # (dP/dm) / tau_a
        gp = -(2.0 * s1 + m * s2)
        lo = np.where(g > 0.0, m, lo)
        hi = np.where(g < 0.0, m, hi)
        newton = m - g / gp
        m_new = np.where((newton > lo) & (newton < hi), newton, 0.5 * (lo + hi))
        step = float(np.max(np.abs(m_new - m) / np.maximum(m, 1.0)))
        m = m_new
        if step < 1e-13:
            break
    s0, _, _, s3 = bose_tpv(xc, xc - m)
    vt = ktc / Q
    vmp = m * vt
    jmp = Q * PF * ktc ** 3 * tau_a * (ee - s0)               # A/m^2
    pmax = vmp * jmp
    heat_above = tau_a * PF * (kte ** 4 * fe3 - ktc ** 4 * s3)
    heat_below = tau_b * PF * (kte ** 4 * (PI4_15 - fe3) - ktc ** 4 * (PI4_15 - c30))
    heat = heat_above + heat_below
    return {"vmp": vmp, "jmp": jmp, "pmax": pmax, "heat_in": heat,
            "subgap_heat": heat_below, "eff": pmax / heat}


# ==================================================================== absorber best
def _bernoulli_coeffs(n=20):
    """c_j = (-1)^(j+1) 2 zeta(2j) / (2 pi)^(2j) / (2j+3), j = 1..n."""
    ks = np.arange(1, 2001, dtype=float)
    out = []
    for j in range(1, n + 1):
        if j == 1:
            z = math.pi ** 2 / 6.0
        elif j == 2:
            z = math.pi ** 4 / 90.0
        else:
            z = float(np.sum(ks[::-1] ** (-2.0 * j)))
        out.append((-1.0) ** (j + 1) * 2.0 * z / (2.0 * math.pi) ** (2 * j) / (2 * j + 3))
    return out


BERN = _bernoulli_coeffs()


def planck_tail(x):
    """F(x) = int_x^inf t^3/(e^t-1) dt for an array x > 0 (exact to rounding)."""
    xs = np.maximum(x, X_SPLIT)                    # series branch, 20 terms
    e1 = np.exp(-xs)
    ek = e1
    a2 = xs * xs
    a3 = a2 * xs
    big = ek * (a3 + 3.0 * a2 + 6.0 * xs + 6.0)
    for k in range(2, 21):
        ek = ek * e1
        ik = 1.0 / k
        big += ek * ik * (a3 + ik * (3.0 * a2 + ik * (6.0 * xs + 6.0 * ik)))
    xl = np.minimum(x, X_SPLIT)                    # small-x branch, Horner in x^2
    y = xl * xl
    poly = BERN[-1]
    for c in BERN[-2::-1]:
        poly = c + y * poly
    low = xl ** 3 * (1.0 / 3.0 - xl / 8.0 + y * poly)
    return np.where(x >= X_SPLIT, big, PI4_15 - low)


A_BAND = 2.0 * math.pi * KB ** 4 / (H ** 3 * C ** 2)   # band flux = A_BAND T^4 F(x) [W/m^2]
HC_K = H * C / KB                                      # m K


def band(lc_nm, t):
    """int_{l<lc} pi B(l, T) dl [W/m^2]."""
    x = HC_K / (lc_nm * 1e-9 * t)
    return A_BAND * t ** 4 * planck_tail(x)


def solar_tables(lam, irr):
    cum = np.empty_like(irr)
    cum[0] = 0.0
    np.cumsum(0.5 * (irr[1:] + irr[:-1]) * np.diff(lam), out=cum[1:])
    return cum


def solar_band(lam, irr, cum, lc_nm):
    """int_{l<lc} I dl [W/m^2] (linear I between points, zero outside the table)."""
    n = lam.size
    idx = np.searchsorted(lam, lc_nm, side="right")
    i0 = np.clip(idx - 1, 0, n - 2)
    l0 = lam[i0]
    i_c = irr[i0] + (irr[i0 + 1] - irr[i0]) * (lc_nm - l0) / (lam[i0 + 1] - l0)
    part = cum[i0] + 0.5 * (irr[i0] + i_c) * (lc_nm - l0)
    return np.where(idx >= n, cum[-1], np.where(idx == 0, 0.0, part))


def spectral_pi_b(lc_nm, t):
    """pi B_lambda [W m^-2 nm^-1]."""
    lm = lc_nm * 1e-9
    return 2.0 * math.pi * H * C * C / lm ** 5 / np.expm1(HC_K / (lm * t)) * 1e-9


def best_temperature(lam, irr, cum, lc_nm, tgrid, conc=CONC, ta=AMBIENT_T):
    """T* and W* = max_T work efficiency for every cutoff (arrays)."""
    norm = conc * cum[-1]
    absorbed = conc * solar_band(lam, irr, cum, lc_nm) + (1.0 - conc * SUN_F) * band(lc_nm, ta)
    valid = absorbed > band(lc_nm, ta)             # else W < 0 for every T > Ta
    t_best = np.full(lc_nm.shape, ta)
    w_best = np.zeros(lc_nm.shape)
    if not np.any(valid):
        return t_best, w_best
    lc = lc_nm[valid]
    ab = absorbed[valid]
    w = (ab[:, None] - band(lc[:, None], tgrid[None, :])) * (1.0 - ta / tgrid[None, :])
    j = np.argmax(w, axis=1)
    nt = tgrid.size
    lo = tgrid[np.maximum(j - 1, 0)]
    hi = tgrid[np.minimum(j + 1, nt - 1)]
    t = tgrid[j]
    cx = HC_K / (lc * 1e-9)
    for _ in range(100):
        x = cx / t
        f = planck_tail(x)
        em1 = np.expm1(x)
        x4 = x ** 4 / em1
        g0 = A_BAND * t ** 4 * f
        g1 = A_BAND * t ** 3 * (4.0 * f + x4)
        g2 = A_BAND * t ** 2 * (12.0 * f + 3.0 * x4 + x * x4 / (-np.expm1(-x)))
        carnot = 1.0 - ta / t
        net = ab - g0
        dw = -g1 * carnot + net * ta / (t * t)
        d2w = -g2 * carnot - 2.0 * g1 * ta / (t * t) - 2.0 * net * ta / (t * t * t)
        lo = np.where(dw > 0.0, t, lo)
        hi = np.where(dw < 0.0, t, hi)
        newton = t - dw / d2w
        t_new = np.where((d2w < 0.0) & (newton > lo) & (newton < hi), newton, 0.5 * (lo + hi))
        step = float(np.max(np.abs(t_new - t) / t))
        t = t_new
        if step < 1e-13:
            break
    t_best[valid] = t
    w_best[valid] = (ab - band(lc, t)) * (1.0 - ta / t) / norm
    return t_best, w_best


def envelope_slope(lam, irr, lc_nm, t_star, conc=CONC, ta=AMBIENT_T):
    """h(lc) = C I(lc) + (1 - C f) pi B(lc, Ta) - pi B(lc, T*), sign of dW*/dlc."""
    i_c = np.interp(lc_nm, lam, irr, left=0.0, right=0.0)
    return (conc * i_c + (1.0 - conc * SUN_F) * spectral_pi_b(lc_nm, ta)
            - spectral_pi_b(lc_nm, t_star))


def absorber_best(lam, irr, conc=CONC, ta=AMBIENT_T):
    """(best cutoff [um], best T [K], best work efficiency)."""
    cum = solar_tables(lam, irr)
    tgrid = ta * (T_MAX / ta) ** (np.arange(T_GRID) / (T_GRID - 1))
    lo_um, hi_um, n = CUTOFFS
    grid = 1e3 * lo_um * (hi_um / lo_um) ** (np.arange(n) / (n - 1))     # nm
    t_g, w_g = best_temperature(lam, irr, cum, grid, tgrid, conc, ta)
    i = int(np.argmax(w_g))
    a, b = grid[max(i - 1, 0)], grid[min(i + 1, n - 1)]
    # candidates: the grid neighbours and every table point between them
    inner = lam[(lam > a) & (lam < b)]
    cand = np.unique(np.concatenate(([a, grid[i], b], inner)))
    t_c, w_c = best_temperature(lam, irr, cum, cand, tgrid, conc, ta)
    j = int(np.argmax(w_c))
    h_j = float(envelope_slope(lam, irr, cand[j:j + 1], t_c[j:j + 1], conc, ta)[0])
    best = (cand[j], t_c[j], w_c[j])
    if h_j != 0.0:
        if h_j > 0.0 and j + 1 < cand.size:
            p, q = cand[j], cand[j + 1]
        elif h_j < 0.0 and j > 0:
            p, q = cand[j - 1], cand[j]
        else:
            p = q = cand[j]
        frac = np.arange(1, 33) / 33.0
        for _ in range(20):
            if q - p <= 1e-11:
                break
            pts = p + (q - p) * frac
            t_p, _ = best_temperature(lam, irr, cum, pts, tgrid, conc, ta)
            h = envelope_slope(lam, irr, pts, t_p, conc, ta)
            neg = np.nonzero(h <= 0.0)[0]
            k = int(neg[0]) if neg.size else pts.size
            p, q = (pts[k - 1] if k > 0 else p), (pts[k] if k < pts.size else q)
        lc = np.array([0.5 * (p + q)])
        t_r, w_r = best_temperature(lam, irr, cum, lc, tgrid, conc, ta)
        if w_r[0] >= best[2]:
            best = (lc[0], t_r[0], w_r[0])
    return best[0] * 1e-3, float(best[1]), float(best[2])


# ========================================================================== driver
def read_fixture(path, case):
    with open(path, "r", encoding="utf-8") as fh:
        rows = csv.DictReader(l for l in fh if not l.startswith("#"))
        for r in rows:
            if r["case"] == case:
                return r
    return None


def timed(fn):
    fn()                                                       # warm-up
    times = []
    res = None
    for _ in range(max(REPEATS, 1)):
        ta = time.perf_counter()
        res = fn()
        times.append(time.perf_counter() - ta)
    return statistics.median(times), res


def main():
    t0 = time.perf_counter()
    table = load_table(G173)
    t1 = time.perf_counter()
    lam, direct = table["wavelength"], table["direct"]
    print(f"numpy_import_seconds={_t_import1 - _t_import0:.6f}")
    print(f"numpy_load_seconds={t1 - t0:.6f}")

    gaps = np.linspace(*TPV_GAPS)
    sec, res = timed(lambda: tpv_sweep(gaps))
    ie = int(np.argmax(res["eff"]))
    ip = int(np.argmax(res["pmax"]))
    print(f"numpy_tpv_sweep_seconds={sec:.6f} gaps={gaps.size} "
          f"best_eff_gap_ev={gaps[ie]:.6f} best_efficiency={res['eff'][ie]:.12f} "
          f"best_power_gap_ev={gaps[ip]:.6f} best_pmax_w_cm2={res['pmax'][ip] * 1e-4:.10f}")
    r = read_fixture(TPV_FIXTURE, "t1") if TPV_FIXTURE.exists() else None
    if r is None:
        print("selfcheck skipped: tests/fixtures/tpv_reference.csv row t1 not found")
    else:
        one = tpv_sweep(np.array([float(r["gaps_ev"])]), float(r["emitter_temp_k"]),
                        float(r["cell_temp_k"]), 1.0, float(r["subgap_reflectance"]))
        ref = float(r["efficiency"])
        print(f"selfcheck_t1_rel_diff={abs(float(one['eff'][0]) - ref) / ref:.3e}")

    sec, (lc_um, t_best, w_best) = timed(lambda: absorber_best(lam, direct))
    print(f"numpy_absorber_best_seconds={sec:.6f} best_cutoff_um={lc_um:.10f} "
          f"best_temp_k={t_best:.8f} best_work_efficiency={w_best:.12f}")
    r = read_fixture(ABSORBER_FIXTURE, "b2") if ABSORBER_FIXTURE.exists() else None
    if r is None:
        print("selfcheck skipped: tests/fixtures/absorber_best_reference.csv row b2 not found")
    else:
        ref = float(r["best_work_efficiency"])
        print(f"selfcheck_b2_rel_diff={abs(w_best - ref) / ref:.3e}")


if __name__ == "__main__":
    main()
