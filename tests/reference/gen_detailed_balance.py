"""Generate tests/fixtures/detailed_balance.csv (single-junction limits).

Regenerate with:

    python3 tests/reference/gen_detailed_balance.py

Physics and the publications the formulas come from
---------------------------------------------------
* Detailed-balance limit of a single-junction cell with a step absorptance
  at the band gap Eg: W. Shockley and H. J. Queisser, J. Appl. Phys. 32,
  510 (1961).
    J(V)  = Jsc - (J_rad(V) - J_rad(0)) / ERE
    Jsc   = q X int_{Eg}^inf Phi_src(E) dE
    J_rad = q g int_{Eg}^inf phi(E; Tc, qV) dE,  g = 1 (front face only)
* Emitted photon flux into a hemisphere, generalized Planck law
  (P. Wurfel, J. Phys. C 15, 3967 (1982)):
    phi(E; T, mu) = 2 pi / (h^3 c^2) * E^2 / (exp((E - mu)/kT) - 1)
  With x = E/kT, m = qV/kT, d = x_g - m:
    J_rad = q 2 pi (kT)^3/(h^3 c^2) * e^{-d} int_0^inf (x_g+t)^2 e^{-t} / (1-e^{-(d+t)}) dt
  and dJ_rad/dV uses the same form with the denominator squared.
* Sources:
  - 'am1.5g', 'am1.5d', 'am0': ASTM G173-03 columns global, direct and
    extraterrestrial (src/physics/data/astm_g173_03.csv).  Photon spectral
    flux per nm = I_lambda * lambda / (h c).  Integrals use the trapezoid rule
    on the table's own points; for lambda_g = hc/Eg between two points, the
    per-nm photon integrand is linearly interpolated at lambda_g and the
    partial segment is integrated by the trapezoid rule (exact integral of
    the piecewise-linear interpolant).  Pin = trapezoid of I over the table.
  - 'blackbody:<Ts>': blackbody disc of temperature Ts at 1 au, dilution
    f = (R_sun/au)^2, R_sun = 6.957e8 m (IAU 2015 Resolution B3 nominal),
    au = 1.495978707e11 m (IAU 2012 Resolution B2).
      photon flux above Eg = X f 2 pi (k Ts)^3/(h^3 c^2) G_2(Eg/(k Ts), inf)
      Pin = X f sigma Ts^4, sigma = 2 pi^5 k^4 / (15 h^3 c^2)
    The 'maximum concentration' rows use X = 1/f rounded DOWN to 10
    significant digits; that exact number is written in the CSV and is the
    one used in the computation.
* Exact SI constants (BIPM SI Brochure, 9th ed., 2019).

Numerics and accuracy
---------------------
* All integrals: scipy.integrate.quad epsabs=0, epsrel=1e-13, limit=200,
  IntegrationWarning raised as an error (sq_common.py).
* Voc: scipy.optimize.brentq on J(V) = 0 in (0, Eg/q), xtol=1e-15 V,
  rtol=4*machine eps, maxiter=200.  The upper bracket is moved towards Eg/q
  (d = 1, 0.1, 0.01, ...) until J < 0 there.
* Maximum power point: brentq on dP/dV = J(V) + V dJ/dV = 0 in (0, Voc),
  with dJ/dV from the analytic derivative integral (same tolerances).
  Cross-check: scipy.optimize.minimize_scalar(method='bounded',
  xatol=1e-12) on -P(V); the largest relative Pmax difference is printed
  and written to the CSV header (required < 1e-9).

CSV format
----------
Lines starting with '#' are comments.  Header:
source,gap_ev,cell_temp_k,concentration,ere,jsc_ma_cm2,voc_v,ff,vmp_v,
jmp_ma_cm2,pmax_w_m2,input_w_m2,efficiency
Units: jsc/jmp mA cm^-2 (1 mA cm^-2 = 10 A m^-2), voltages V, pmax and
input W m^-2, ff and efficiency as fractions.  Numbers are shortest
round-trip decimal text of IEEE doubles.
"""

import math
import sys
from pathlib import Path

import numpy as np
from scipy import optimize

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))
import sq_common as sq  # noqa: E402

BRENTQ_XTOL = 1e-15
BRENTQ_RTOL = 4.0 * np.finfo(float).eps
BRENTQ_MAXITER = 200
BOUNDED_XATOL = 1e-12


def max_concentration_10_digits():
    """1/f rounded down to 10 significant digits (so that X <= 1/f)."""
    inv_f = sq.MAX_CONCENTRATION
    exponent = math.floor(math.log10(inv_f))
    scale = 10.0 ** (9 - exponent)
    text = f"{math.floor(inv_f * scale) / scale:.{max(0, 9 - exponent)}f}"
    value = float(text)
    assert value <= inv_f
    return text, value


def make_source(name, g173):
    if name == "am1.5g":
        return sq.TabulatedSpectrum(*g173["global"])
    if name == "am1.5d":
        return sq.TabulatedSpectrum(*g173["direct"])
    if name == "am0":
        return sq.TabulatedSpectrum(*g173["extraterrestrial"])
    if name.startswith("blackbody:"):
        return sq.BlackbodySun(float(name.split(":", 1)[1]))
    raise ValueError(name)


class CellModel:
    """Step-absorptance cell at temperature tc_k under a given source."""

    def __init__(self, source, gap_ev, tc_k, conc, ere):
        self.gap_ev = gap_ev
        self.gap_j = gap_ev * sq.Q_ELEM
        self.tc = tc_k
        self.conc = conc
        self.ere = ere
        self.kt = sq.K_BOLTZ * tc_k
        self.vt = self.kt / sq.Q_ELEM                       # thermal voltage
        self.xg = self.gap_j / self.kt
        self.rad_scale = (sq.Q_ELEM * 2.0 * math.pi * self.kt ** 3
                          / (sq.H_PLANCK ** 3 * sq.C_LIGHT ** 2))   # A m^-2
        self.jsc = sq.Q_ELEM * conc * source.photon_flux_above(self.gap_j)
        self.pin = conc * source.total_power
        self.jrad0 = self.j_rad(0.0)

    def j_rad(self, v):
        d = self.xg - v / self.vt
        return self.rad_scale * math.exp(-d) * sq.shifted_bose_integral(
            2, self.xg, math.inf, d, power=1)

    def dj_rad_dv(self, v):
        d = self.xg - v / self.vt
        return (self.rad_scale / self.vt) * math.exp(-d) * sq.shifted_bose_integral(
            2, self.xg, math.inf, d, power=2)

    def current(self, v):
        return self.jsc - (self.j_rad(v) - self.jrad0) / self.ere

    def dpower_dv(self, v):
        return self.current(v) - v * self.dj_rad_dv(v) / self.ere

    def solve(self):
        # Voc: bracket (0, Eg/q - d*Vt), shrink d until J < 0 at the top
        d = 1.0
        while True:
            v_hi = (self.xg - d) * self.vt
            if v_hi > 0.0 and self.current(v_hi) < 0.0:
                break
            d /= 10.0
            if d < 1e-12:
                raise RuntimeError("no Voc bracket")
        voc = optimize.brentq(self.current, 0.0, v_hi, xtol=BRENTQ_XTOL,
                              rtol=BRENTQ_RTOL, maxiter=BRENTQ_MAXITER)
        vmp = optimize.brentq(self.dpower_dv, 0.0, voc, xtol=BRENTQ_XTOL,
                              rtol=BRENTQ_RTOL, maxiter=BRENTQ_MAXITER)
        jmp = self.current(vmp)
        pmax = vmp * jmp
        # independent maximiser as a cross-check
        res = optimize.minimize_scalar(lambda v: -v * self.current(v),
                                       bounds=(0.0, voc), method="bounded",
                                       options={"xatol": BOUNDED_XATOL})
        p_check = -res.fun
        return {
            "jsc": self.jsc, "voc": voc, "vmp": vmp, "jmp": jmp,
            "pmax": pmax, "pin": self.pin, "ff": pmax / (voc * self.jsc),
            "eff": pmax / self.pin, "pmax_check_rel": abs(p_check - pmax) / pmax,
        }


def case_list(xmax_text):
    """(source, gap_ev, cell_temp_k, concentration_text, ere)."""
    cases = []
    for g in (0.5, 0.7, 0.9, 1.1, 1.15, 1.34, 1.6, 2.0, 2.5, 3.0):
        cases.append(("am1.5g", g, 300.0, "1", 1.0))
    for g in (0.9, 1.1, 1.34, 1.6, 2.0):
        cases.append(("am1.5d", g, 300.0, "1", 1.0))
    for g in (1.1, 1.34):
        cases.append(("am1.5d", g, 300.0, "1000", 1.0))
    for g in (0.9, 1.1, 1.34, 1.6, 2.0):
        cases.append(("am0", g, 300.0, "1", 1.0))
    for g in (0.7, 1.1, 1.34, 1.6, 2.0):
        cases.append(("blackbody:6000", g, 300.0, "1", 1.0))
    for g in (0.7, 0.9, 1.1, 1.34, 1.6):
        cases.append(("blackbody:6000", g, 300.0, xmax_text, 1.0))
    for g in (1.1, 1.34, 1.6):
        cases.append(("blackbody:5772", g, 300.0, "1", 1.0))
    for g in (1.1, 1.34, 1.6):
        cases.append(("am1.5g", g, 350.0, "1", 1.0))
    for g in (1.1, 1.34, 1.6):
        cases.append(("am1.5g", g, 300.0, "1", 0.01))
    for g in (1.34,):
        cases.append(("am1.5g", g, 350.0, "1", 0.01))
        cases.append(("blackbody:6000", g, 350.0, "1", 0.01))
    return cases


def main():
    g173 = sq.load_g173()
    sources = {}
    xmax_text, _ = max_concentration_10_digits()

    print("Incident power of the tabulated spectra (trapezoid on table points):")
    for name in ("am1.5g", "am1.5d", "am0"):
        sources[name] = make_source(name, g173)
        print(f"  Pin[{name}] = {sources[name].total_power:.6f} W/m^2")
    print(f"1/f = {sq.MAX_CONCENTRATION!r}; max-concentration rows use X = {xmax_text}")

    rows = []
    worst_check = 0.0
    for src_name, gap, tc, conc_text, ere in case_list(xmax_text):
        if src_name not in sources:
            sources[src_name] = make_source(src_name, g173)
        res = CellModel(sources[src_name], gap, tc, float(conc_text), ere).solve()
        worst_check = max(worst_check, res["pmax_check_rel"])
        rows.append((src_name, gap, tc, conc_text, ere, res))
    assert worst_check < 1e-9, worst_check

    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    out = sq.FIXTURE_DIR / "detailed_balance.csv"
    with open(out, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# Shockley-Queisser detailed balance, step absorptance, g=1, "
                 "J(V)=Jsc-(Jrad(V)-Jrad(0))/ERE\n")
        fh.write("# generated by: python3 tests/reference/gen_detailed_balance.py\n")
        fh.write(f"# accuracy: {sq.QUAD_SETTINGS_TEXT}\n")
        fh.write(f"# accuracy: brentq xtol={BRENTQ_XTOL:g} rtol={BRENTQ_RTOL:.3g} "
                 f"maxiter={BRENTQ_MAXITER} for Voc (J=0) and Vmp (dP/dV=0); "
                 f"bounded minimize_scalar xatol={BOUNDED_XATOL:g} cross-check "
                 f"max rel Pmax diff {worst_check:.2e}\n")
        fh.write("# tabulated sources: ASTM G173-03 trapezoid on table points, "
                 "band edge by linear interpolation of photon integrand\n")
        fh.write(f"# blackbody: f=(R_sun/au)^2, R_sun=6.957e8 m, au=1.495978707e11 m, "
                 f"1/f={sq.MAX_CONCENTRATION!r}; concentration {xmax_text} = 1/f "
                 "rounded down to 10 significant digits\n")
        fh.write("# units: jsc,jmp mA/cm^2; voc,vmp V; pmax,input W/m^2; ff,efficiency fraction\n")
        fh.write("source,gap_ev,cell_temp_k,concentration,ere,jsc_ma_cm2,voc_v,ff,"
                 "vmp_v,jmp_ma_cm2,pmax_w_m2,input_w_m2,efficiency\n")
        for src_name, gap, tc, conc_text, ere, r in rows:
            fields = [src_name, sq.fmt(gap), sq.fmt(tc), sq.fmt(float(conc_text)), sq.fmt(ere),
                      sq.fmt(r["jsc"] / 10.0), sq.fmt(r["voc"]), sq.fmt(r["ff"]),
                      sq.fmt(r["vmp"]), sq.fmt(r["jmp"] / 10.0), sq.fmt(r["pmax"]),
                      sq.fmt(r["pin"]), sq.fmt(r["eff"])]
            fh.write(",".join(fields) + "\n")

    print(f"wrote {out} ({len(rows)} rows)")
    print(f"Pmax cross-check (brentq dP/dV vs bounded minimize) max rel diff: {worst_check:.2e}")

    # summary scan on AM1.5G, 300 K, 1 sun, ERE 1
    best = (0.0, None)
    src = sources["am1.5g"]
    for g in np.arange(90, 161) / 100.0:
        eff = CellModel(src, float(g), 300.0, 1.0, 1.0).solve()["eff"]
        if eff > best[0]:
            best = (eff, float(g))
    print(f"best am1.5g efficiency over 0.90-1.60 eV (0.01 eV step): "
          f"{best[0] * 100:.4f}% at {best[1]:.2f} eV")
    print("selected rows (source gap Tc X ERE -> Jsc[mA/cm2] Voc[V] FF eff):")
    for src_name, gap, tc, conc_text, ere, r in rows:
        print(f"  {src_name:15s} {gap:4.2f} {tc:5.1f} {conc_text:>12s} {ere:5.2f} -> "
              f"{r['jsc'] / 10:9.4f} {r['voc']:.5f} {r['ff']:.5f} {r['eff'] * 100:8.4f}%")


if __name__ == "__main__":
    main()
