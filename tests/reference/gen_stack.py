"""Generate the stack, measured-cell and mismatch fixtures (tests/fixtures/stack_*.csv).

Regenerate with:

    python3 tests/reference/gen_stack.py

It writes
  tests/fixtures/stack_eqe_table.csv      a synthetic EQE (percent) on a wavelength axis
  tests/fixtures/stack_eqe_reference.csv  a synthetic reference device as a spectral
                                          response in A/W
  tests/fixtures/stack_series.csv         stacks solved with scipy: independent and series
  tests/fixtures/stack_optimum.csv        two-junction optima found with scipy
  tests/fixtures/stack_reciprocity.csv    EQE and Urbach-tail cells by reciprocity
  tests/fixtures/stack_mismatch.csv       spectral mismatch factors

Physics and the publications the formulas come from
---------------------------------------------------
* Stacks (De Vos, J. Phys. D 13, 839 (1980); Henry, J. Appl. Phys. 51, 4494 (1980)):
  subcell i absorbs between its gap and the gap above,
    Jsc_i = q X int_{Eg_i}^{Eg_(i-1)} Phi_src(E) dE,
  and emits as a black body above its own gap (generalized Planck law, P. Wurfel,
  J. Phys. C 15, 3967 (1982)); no luminescent coupling.  The single-cell J-V, its
  radiative current and its derivative come from gen_detailed_balance.CellModel
  (scipy quad), with the photocurrent replaced by the band between the two gaps.
  - independent: sum of each subcell's maximum power (brentq on dP/dV = 0).
  - series: V_i(J) by brentq on J_i(V) = J; the maximum of P(J) = J sum V_i(J) by
    brentq on dP/dJ = sum V_i + J sum dV_i/dJ, dV_i/dJ = -1/(dJrad_i/dV); cross-checked
    with scipy.optimize.minimize_scalar(method='bounded') on -P(J).
* Two-junction optima: scipy.optimize.minimize (Nelder-Mead, xatol 1e-7 eV, fatol
  1e-13) on -efficiency, started from the commonly cited optima; the radiative current
  there comes from its Bose series (term-by-term integration of 1/(e^y - 1) =
  sum_k e^(-k y)), checked against the quadrature at the starting point to 1e-12.
* Reciprocity (U. Rau, Phys. Rev. B 76, 085303 (2007)):
    Jsc   = q X int a(E) Phi_src(E) dE
    J0    = q int a(E) 2 pi E^2 / (h^3 c^2 (exp(E/kTc) - 1)) dE
    J(V)  = Jsc - J0 (exp(qV/kTc) - 1),  Voc = (kTc/q) ln(1 + Jsc/J0),
  maximum power by brentq on dP/dV = 0.  a(E) is either the EQE table (linear in
  wavelength between its points, zero outside; a spectral response in A/W is first
  turned into an EQE point by point, EQE = h c SR / (q lambda)) or an Urbach edge
  a = 1 above Eg and exp((E - Eg)/Eu) below (F. Urbach, Phys. Rev. 92, 1324 (1953)).
* Spectral mismatch (IEC 60904-7; ASTM E973):
    M = [int E_test SR_dut dl * int E_ref SR_ref dl] / [int E_ref SR_dut dl * int E_test SR_ref dl]
  computed here in the power-and-responsivity form, E(lambda) [W m^-2 nm^-1] times
  SR(lambda) = q lambda EQE(lambda) / (h c) [A/W], an independent route from the
  photon-flux-and-EQE form used by Glowgap.

Numerics and accuracy
---------------------
* quad: as sq_common (epsrel 1e-13), split at every table point.
* Tables are linear between their points: the EQE in wavelength and, as in every photon
  integral of the G173 table, the photon density in wavelength (so the irradiance between
  points is hc/lambda times it).  Products on the union of two tables' points (photon
  density times EQE; irradiance times SR) are integrated with 3 Gauss-Legendre nodes per
  interval, exact for these polynomials in lambda.
* brentq xtol 1e-15 V (voltages) or 1e-13 relative (currents), rtol 4 eps.
"""

import math
import sys
import warnings
from pathlib import Path

import numpy as np
from scipy import integrate, optimize

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))
import sq_common as sq  # noqa: E402
import gen_detailed_balance as db  # noqa: E402

RTOL = 4.0 * np.finfo(float).eps
HC = sq.H_PLANCK * sq.C_LIGHT
GL3_X, GL3_W = np.polynomial.legendre.leggauss(3)


def quad(f, a, b, points=None):
    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        if points is not None and len(points) > 0:
            pts = [a] + sorted(p for p in points if a < p < b) + [b]
            return sum(integrate.quad(f, lo, hi, epsabs=0.0, epsrel=1e-13, limit=200)[0]
                       for lo, hi in zip(pts[:-1], pts[1:]))
        return integrate.quad(f, a, b, epsabs=0.0, epsrel=1e-13, limit=200)[0]


# ------------------------------------------------------------------ stacks
class Subcell(db.CellModel):
    """A step subcell absorbing between gap_ev and upper_ev (inf for the top)."""

    def __init__(self, source, gap_ev, upper_ev, tc_k, conc):
        super().__init__(source, gap_ev, tc_k, conc, 1.0)
        if math.isfinite(upper_ev):
            above = source.photon_flux_above(upper_ev * sq.Q_ELEM)
            self.jsc = sq.Q_ELEM * conc * (source.photon_flux_above(self.gap_j) - above)

    def voltage_at(self, j):
        """V with J(V) = j, 0 <= j <= Jsc."""
        if j >= self.jsc:
            return 0.0
        d = 1.0
        while True:
            v_hi = (self.xg - d) * self.vt
            if v_hi > 0.0 and self.current(v_hi) < j:
                break
            d /= 10.0
        return optimize.brentq(lambda v: self.current(v) - j, 0.0, v_hi,
                               xtol=1e-15, rtol=RTOL, maxiter=200)


class SeriesSubcell(Subcell):
    """The same subcell with the radiative current from the term-by-term integrated Bose
    series, int_{x0}^inf x^2 / (e^(x - m) - 1) dx = sum_k e^(-k d) (x0^2/k + 2 x0/k^2 + 2/k^3),
    d = x0 - m (expand 1/(e^y - 1) = sum_k e^(-k y)); fast enough for the optimum search,
    and checked against the quadrature version at the start of every search."""

    def j_rad(self, v):
        d = self.xg - v / self.vt
        x0 = self.xg
        total, k = 0.0, 1
        while True:
            t = math.exp(-k * d) * (x0 * x0 / k + 2.0 * x0 / k ** 2 + 2.0 / k ** 3)
            total += t
            if t < 1e-17 * total:
                return self.rad_scale * total
            k += 1

    def dj_rad_dv(self, v):
        d = self.xg - v / self.vt
        x0 = self.xg
        total, k = 0.0, 1
        while True:
            t = math.exp(-k * d) * (x0 * x0 + 2.0 * x0 / k + 2.0 / k ** 2)
            total += t
            if t < 1e-17 * total:
                return self.rad_scale * total / self.vt
            k += 1


def solve_stack(source, gaps, tc, conc, connection, cell_type=None):
    uppers = [math.inf] + list(gaps[:-1])
    cell_type = cell_type or Subcell
    cells = [cell_type(source, g, u, tc, conc) for g, u in zip(gaps, uppers)]
    singles = [c.solve() for c in cells]
    pin = conc * source.total_power
    out = {"jsc": [c.jsc for c in cells], "voc": [s["voc"] for s in singles], "pin": pin}
    if connection == "independent":
        out["pmax"] = sum(s["pmax"] for s in singles)
        out["j_op"] = [s["jmp"] for s in singles]
        out["v_op"] = [s["vmp"] for s in singles]
        out["check"] = 0.0
    else:
        jmin = min(c.jsc for c in cells)

        def power(j):
            return j * sum(c.voltage_at(j) for c in cells)

        def dpower(j):
            vs = [c.voltage_at(j) for c in cells]
            dv = [-1.0 / c.dj_rad_dv(v) for c, v in zip(cells, vs)]
            return sum(vs) + j * sum(dv)

        j_mp = optimize.brentq(dpower, 1e-6 * jmin, jmin * (1.0 - 1e-12),
                               xtol=1e-13 * jmin, rtol=RTOL, maxiter=200)
        res = optimize.minimize_scalar(lambda j: -power(j), bounds=(0.5 * jmin, jmin),
                                       method="bounded", options={"xatol": 1e-10 * jmin})
        out["pmax"] = power(j_mp)
        out["check"] = abs(-res.fun - out["pmax"]) / out["pmax"]
        out["j_op"] = [j_mp] * len(cells)
        out["v_op"] = [c.voltage_at(j_mp) for c in cells]
    out["eff"] = out["pmax"] / pin
    return out


STACK_CASES = [
    # source, connection, gaps (eV, top first), Tc, concentration text
    ("blackbody:6000", "independent", (1.9, 1.0), 300.0, "1"),
    ("blackbody:6000", "series", (1.9, 1.0), 300.0, "1"),
    ("blackbody:6000", "series", (1.7, 1.0), 300.0, "1"),
    ("blackbody:6000", "independent", (1.7, 0.78), 300.0, "MAX"),
    ("blackbody:6000", "series", (1.55, 0.77), 300.0, "MAX"),
    ("am1.5g", "independent", (1.63, 0.96), 300.0, "1"),
    ("am1.5g", "series", (1.63, 0.96), 300.0, "1"),
    ("am1.5g", "series", (1.73, 1.12), 300.0, "1"),
    ("am1.5g", "series", (1.9, 1.37, 0.93), 300.0, "1"),
    ("am1.5g", "series", (1.63, 0.96), 350.0, "1"),
    ("am1.5d", "series", (1.6, 0.95), 300.0, "1000"),
    ("am1.5d", "independent", (2.2, 1.6, 1.2, 0.9), 300.0, "1000"),
]

OPTIMUM_CASES = [
    # source, connection, start (eV)
    ("blackbody:6000", "independent", (1.87, 0.98)),
    ("blackbody:6000", "series", (1.70, 0.97)),
    ("am1.5g", "series", (1.63, 0.96)),
]


def optimum(source, connection, start):
    slow = solve_stack(source, start, 300.0, 1.0, connection)["eff"]
    fast = solve_stack(source, start, 300.0, 1.0, connection, SeriesSubcell)["eff"]
    assert abs(fast - slow) < 1e-12 * slow, (fast, slow)

    def neg(x):
        top, bottom = float(x[0]), float(x[1])
        if not top > bottom > 0.05:
            return 0.0
        return -solve_stack(source, (top, bottom), 300.0, 1.0, connection, SeriesSubcell)["eff"]

    res = optimize.minimize(neg, np.array(start), method="Nelder-Mead",
                            options={"xatol": 1e-7, "fatol": 1e-13, "maxiter": 400,
                                     "initial_simplex": np.array([start, (start[0] + 0.02, start[1]),
                                                                  (start[0], start[1] + 0.02)])})
    return float(res.x[0]), float(res.x[1]), -float(res.fun)


# -------------------------------------------------------------- EQE tables
EQE_PATH = sq.FIXTURE_DIR / "stack_eqe_table.csv"
REF_PATH = sq.FIXTURE_DIR / "stack_eqe_reference.csv"


def write_table(path, note, header, lam, values, fmt):
    with open(path, "w", encoding="utf-8", newline="\n") as fh:
        fh.write(f"# {note}, for tests only\n# generated by: python3 tests/reference/gen_stack.py\n{header}\n")
        fh.writelines(fmt.format(l, v) for l, v in zip(lam, values))


def write_tables():
    lam = np.arange(300.0, 901.0, 10.0)
    eqe = 92.0 / (1.0 + np.exp((lam - 780.0) / 12.0)) * (1.0 - 0.3 * np.exp(-(lam - 300.0) / 40.0))
    write_table(EQE_PATH, "synthetic EQE of a ~1.6 eV cell (a smooth edge near 780 nm)",
                "wavelength_nm,eqe_percent", lam, eqe, "{:.0f},{:.6f}\n")
    lam = np.arange(300.0, 1201.0, 10.0)
    q = 0.95 * (1.0 - np.exp(-(lam - 280.0) / 60.0)) / (1.0 + np.exp((lam - 1110.0) / 25.0))
    write_table(REF_PATH, "synthetic spectral response of a silicon-like reference cell",
                "Wavelength (nm), SR (A/W)", lam, sq.Q_ELEM * lam * 1e-9 * q / HC, "{:.0f}, {:.7f}\n")


def read_table(path, per_watt):
    """(wavelength nm, EQE fraction) as the files hold them, SR turned into EQE point by point."""
    data = np.loadtxt(path, delimiter=",", comments="#", skiprows=3)
    lam, v = data[:, 0], data[:, 1]
    if per_watt:
        eqe = v * HC / (sq.Q_ELEM * lam * 1e-9)
    else:
        eqe = v / 100.0
    return lam, eqe


def eqe_at_energy(lam, eqe, e_j):
    """EQE linear in wavelength between points, zero outside."""
    l = HC / e_j * 1e9
    if l < lam[0] or l > lam[-1]:
        return 0.0
    return float(np.interp(l, lam, eqe))


def gl3_on_union(f, grid_a, grid_b):
    """int f(lambda) d lambda over the overlap of two grids, 3 Gauss nodes per interval."""
    lo, hi = max(grid_a[0], grid_b[0]), min(grid_a[-1], grid_b[-1])
    cuts = np.unique(np.concatenate([grid_a, grid_b]))
    cuts = cuts[(cuts >= lo) & (cuts <= hi)]
    total = 0.0
    for a, b in zip(cuts[:-1], cuts[1:]):
        mid, half = 0.5 * (a + b), 0.5 * (b - a)
        total += half * sum(w * f(mid + half * x) for x, w in zip(GL3_X, GL3_W))
    return total


def table_jsc(table, lam, eqe):
    """q int EQE Phi: G173 photon density (linear in lambda) times EQE, exact."""
    lam_s, phot = table.lam, table.photons   # photons m^-2 s^-1 nm^-1
    return sq.Q_ELEM * gl3_on_union(
        lambda l: np.interp(l, lam_s, phot) * np.interp(l, lam, eqe), lam_s, lam)


def blackbody_jsc(ts, lam, eqe):
    bb = sq.BlackbodySun(ts)
    kt = sq.K_BOLTZ * ts
    pref = sq.SUN_DILUTION * 2.0 * math.pi / (sq.H_PLANCK ** 3 * sq.C_LIGHT ** 2)
    e_lo, e_hi = HC / (lam[-1] * 1e-9), HC / (lam[0] * 1e-9)
    pts = [HC / (l * 1e-9) for l in lam]
    del bb
    return sq.Q_ELEM * quad(lambda e: pref * e * e / math.expm1(e / kt) * eqe_at_energy(lam, eqe, e),
                            e_lo, e_hi, pts)


def ln_j0_table(lam, eqe, tc):
    """ln of q int EQE phi_bb(Tc) dE, with exp(-E/kT) factored out at the lowest energy."""
    kt = sq.K_BOLTZ * tc
    e_lo, e_hi = HC / (lam[-1] * 1e-9), HC / (lam[0] * 1e-9)
    pts = [HC / (l * 1e-9) for l in lam]
    pref = sq.Q_ELEM * 2.0 * math.pi / (sq.H_PLANCK ** 3 * sq.C_LIGHT ** 2)
    s = quad(lambda e: e * e * math.exp(-(e - e_lo) / kt) / -math.expm1(-e / kt) * eqe_at_energy(lam, eqe, e),
             e_lo, e_hi, pts)
    return math.log(pref) - e_lo / kt + math.log(s)


def ln_j0_urbach(gap_ev, eu_mev, tc):
    kt = sq.K_BOLTZ * tc
    eg, eu = gap_ev * sq.Q_ELEM, eu_mev * 1e-3 * sq.Q_ELEM
    pref = sq.Q_ELEM * 2.0 * math.pi / (sq.H_PLANCK ** 3 * sq.C_LIGHT ** 2)
    # scaled by exp(-Eg/kT): above the gap and the tail below it
    above = quad(lambda e: e * e * math.exp(-(e - eg) / kt) / -math.expm1(-e / kt), eg, eg + 80 * kt)
    tail = quad(lambda e: e * e * math.exp((e - eg) / eu - (e - eg) / kt) / -math.expm1(-e / kt),
                1e-6 * eg, eg, [eg - k * eu for k in (1, 5, 20, 60)] + [eg - k * kt for k in (1, 5, 20, 60)])
    return math.log(pref) - eg / kt + math.log(above + tail)


def urbach_jsc(source_name, table_or_bb, gap_ev, eu_mev):
    eg, eu = gap_ev * sq.Q_ELEM, eu_mev * 1e-3 * sq.Q_ELEM
    above = table_or_bb.photon_flux_above(eg)
    if source_name.startswith("blackbody:"):
        ts = float(source_name.split(":")[1])
        kt = sq.K_BOLTZ * ts
        pref = sq.SUN_DILUTION * 2.0 * math.pi / (sq.H_PLANCK ** 3 * sq.C_LIGHT ** 2)
        tail = quad(lambda e: pref * e * e / math.expm1(e / kt) * math.exp((e - eg) / eu),
                    max(eg - 60 * eu, 1e-6 * eg), eg)
    else:
        lam_s, phot = table_or_bb.lam, table_or_bb.photons
        lam_g = HC / eg * 1e9
        lam_end = min(lam_s[-1], HC / max(eg - 60 * eu, 1e-6 * eg) * 1e9)
        grid = np.concatenate([[lam_g], lam_s[(lam_s > lam_g) & (lam_s < lam_end)], [lam_end]])
        tail = 0.0
        for a, b in zip(grid[:-1], grid[1:]):
            tail += quad(lambda l: np.interp(l, lam_s, phot) * math.exp((HC / (l * 1e-9) - eg) / eu), a, b)
    return sq.Q_ELEM * (above + tail)


def reciprocity_cell(jsc, ln_j0, tc, pin):
    vt = sq.K_BOLTZ * tc / sq.Q_ELEM
    j0 = math.exp(ln_j0)

    def current(v):
        return jsc - j0 * math.expm1(v / vt)

    voc = vt * math.log1p(jsc / j0)
    vmp = optimize.brentq(lambda v: current(v) - v * j0 * math.exp(v / vt) / vt, 0.0, voc,
                          xtol=1e-15, rtol=RTOL, maxiter=200)
    pmax = vmp * current(vmp)
    return {"jsc": jsc, "ln_j0": ln_j0, "voc": voc, "vmp": vmp, "pmax": pmax, "eff": pmax / pin}


def band_power_lambda(ts, l_nm):
    """Blackbody sun spectral irradiance per nm at wavelength l_nm."""
    l = l_nm * 1e-9
    return sq.SUN_DILUTION * math.pi * 2.0 * HC * sq.C_LIGHT / l ** 5 / math.expm1(HC / (l * sq.K_BOLTZ * ts)) * 1e-9


def sr_current(spec_name, g173, lam, eqe):
    """int E(lambda) SR(lambda) dlambda [A m^-2], SR = q lambda EQE / (h c)."""
    def sr(l):
        return sq.Q_ELEM * l * 1e-9 * np.interp(l, lam, eqe) / HC
    if spec_name.startswith("blackbody:"):
        ts = float(spec_name.split(":")[1])
        return quad(lambda l: band_power_lambda(ts, l) * sr(l), lam[0], lam[-1], list(lam))
    col = {"am1.5g": "global", "am1.5d": "direct", "am0": "extraterrestrial"}[spec_name]
    table = sq.TabulatedSpectrum(*g173[col])
    lam_s, phot = table.lam, table.photons

    # the table model of photon integrals: photon density linear in wavelength between
    # points, so the irradiance between points is (hc/lambda) times that density
    def irradiance(l):
        return HC / (l * 1e-9) * np.interp(l, lam_s, phot)
    return gl3_on_union(lambda l: irradiance(l) * sr(l), lam_s, lam)


def main():
    g173 = sq.load_g173()
    xmax_text, xmax = db.max_concentration_10_digits()
    sources = {}

    def source(name):
        if name not in sources:
            sources[name] = db.make_source(name, g173)
        return sources[name]

    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    header = [
        "# generated by: python3 tests/reference/gen_stack.py",
        f"# accuracy: {sq.QUAD_SETTINGS_TEXT}",
        "# accuracy: brentq xtol 1e-15 V / 1e-13 relative in J, rtol 4 eps",
        f"# concentration MAX = 1/f rounded down to 10 digits = {xmax_text}",
    ]

    # stacks
    rows, worst = [], 0.0
    for name, conn, gaps, tc, conc_text in STACK_CASES:
        conc = xmax if conc_text == "MAX" else float(conc_text)
        r = solve_stack(source(name), gaps, tc, conc, conn)
        worst = max(worst, r["check"])
        rows.append((name, conn, gaps, tc, conc, r))
        print(f"{name:15s} {conn:11s} {gaps} X={conc:g}: {r['eff'] * 100:.5f}%")
    assert worst < 1e-9, worst
    with open(sq.FIXTURE_DIR / "stack_series.csv", "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# stacks of step subcells, each absorbing between its gap and the gap above, no luminescent coupling\n")
        fh.write("\n".join(header) + "\n")
        fh.write(f"# series cross-check (brentq dP/dJ vs bounded minimize) max rel Pmax diff {worst:.2e}\n")
        fh.write("# lists within a field are separated by ';' (top subcell first); currents mA/cm^2, voltages V, power W/m^2\n")
        fh.write("source,connection,gaps_ev,cell_temp_k,concentration,efficiency,pmax_w_m2,input_w_m2,jsc_ma_cm2,voc_v,j_op_ma_cm2,v_op_v\n")
        for name, conn, gaps, tc, conc, r in rows:
            lst = lambda xs, s=1.0: ";".join(sq.fmt(x / s) for x in xs)  # noqa: E731
            fh.write(",".join([name, conn, lst(gaps), sq.fmt(tc), sq.fmt(conc), sq.fmt(r["eff"]), sq.fmt(r["pmax"]),
                               sq.fmt(r["pin"]), lst(r["jsc"], 10.0), lst(r["voc"]), lst(r["j_op"], 10.0),
                               lst(r["v_op"])]) + "\n")

    # optima
    with open(sq.FIXTURE_DIR / "stack_optimum.csv", "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# two-junction optima at one sun, 300 K: scipy Nelder-Mead (xatol 1e-7 eV, fatol 1e-13) on the stack model above\n")
        fh.write("\n".join(header) + "\n")
        fh.write("source,connection,top_ev,bottom_ev,efficiency\n")
        for name, conn, start in OPTIMUM_CASES:
            top, bottom, eff = optimum(source(name), conn, start)
            print(f"optimum {name} {conn}: {top:.5f} / {bottom:.5f} eV, {eff * 100:.6f}%")
            fh.write(",".join([name, conn, sq.fmt(top), sq.fmt(bottom), sq.fmt(eff)]) + "\n")

    # reciprocity: the EQE table and Urbach edges
    write_tables()
    lam, eqe = read_table(EQE_PATH, per_watt=False)
    rec = []
    for name in ("am1.5g", "blackbody:6000"):
        src = source(name)
        jsc = table_jsc(src, lam, eqe) if name == "am1.5g" else blackbody_jsc(6000.0, lam, eqe)
        for tc in (300.0, 330.0):
            rec.append(("eqe_table", name, 0.0, 0.0, tc, reciprocity_cell(jsc, ln_j0_table(lam, eqe, tc), tc, src.total_power)))
    for name in ("am1.5g", "blackbody:6000"):
        src = source(name)
        for gap, eu in ((1.4, 5.0), (1.4, 15.0), (1.1, 20.0)):
            jsc = urbach_jsc(name, src, gap, eu)
            rec.append(("urbach", name, gap, eu, 300.0, reciprocity_cell(jsc, ln_j0_urbach(gap, eu, 300.0), 300.0, src.total_power)))
    with open(sq.FIXTURE_DIR / "stack_reciprocity.csv", "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# cells by reciprocity: J = Jsc - J0 (exp(qV/kT) - 1), J0 = q int a phi_bb; front emission; one sun\n")
        fh.write("\n".join(header) + "\n")
        fh.write("# eqe_table rows use tests/fixtures/stack_eqe_table.csv; urbach rows a = exp((E-Eg)/Eu) below Eg\n")
        fh.write("absorber,source,gap_ev,urbach_mev,cell_temp_k,jsc_ma_cm2,ln_j0_a_m2,voc_v,vmp_v,pmax_w_m2,efficiency\n")
        for kind, name, gap, eu, tc, r in rec:
            print(f"{kind} {name} {gap} {eu} {tc}: Jsc {r['jsc'] / 10:.5f} Voc {r['voc']:.6f} eff {r['eff'] * 100:.5f}%")
            fh.write(",".join([kind, name, sq.fmt(gap), sq.fmt(eu), sq.fmt(tc), sq.fmt(r["jsc"] / 10.0), sq.fmt(r["ln_j0"]),
                               sq.fmt(r["voc"]), sq.fmt(r["vmp"]), sq.fmt(r["pmax"]), sq.fmt(r["eff"])]) + "\n")

    # mismatch
    ref_lam, ref_eqe = read_table(REF_PATH, per_watt=True)
    with open(sq.FIXTURE_DIR / "stack_mismatch.csv", "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# spectral mismatch factor, device under test stack_eqe_table.csv, reference device stack_eqe_reference.csv\n")
        fh.write("\n".join(header) + "\n")
        fh.write("# integrals int E(lambda) SR(lambda) dlambda in mA/cm^2\n")
        fh.write("test_spectrum,reference_spectrum,mismatch_factor,dut_test_ma_cm2,dut_ref_ma_cm2,refdev_test_ma_cm2,refdev_ref_ma_cm2\n")
        for test_name, ref_name in (("blackbody:3200", "am1.5g"), ("blackbody:5772", "am1.5g"), ("am1.5d", "am1.5g"),
                                    ("am1.5g", "am1.5g")):
            tt = sr_current(test_name, g173, lam, eqe)
            tr = sr_current(ref_name, g173, lam, eqe)
            rt = sr_current(test_name, g173, ref_lam, ref_eqe)
            rr = sr_current(ref_name, g173, ref_lam, ref_eqe)
            m = (tt * rr) / (tr * rt)
            print(f"mismatch {test_name} vs {ref_name}: M = {m:.9f}")
            fh.write(",".join([test_name, ref_name, sq.fmt(m)] + [sq.fmt(v / 10.0) for v in (tt, tr, rt, rr)]) + "\n")


if __name__ == "__main__":
    main()
