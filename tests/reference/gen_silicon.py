"""Generate tests/fixtures/silicon_reference.csv: silicon cells with Lambertian, single-
and double-pass light trapping and Auger recombination, solved with scipy alone.

Run with:

    python3 tests/reference/gen_silicon.py

Model (each part with its source; independent of the Rust code, which is not read)
-----
* Absorption of silicon at 300 K: M. A. Green, Sol. Energy Mater. Sol. Cells 92, 1305
  (2008), the n, k table shipped in src/physics/data/materials/si_green2008.csv;
  alpha = 4 pi k / lambda.  Between table points ln(alpha) and n are taken linear in
  photon energy E (the program's stated interpolation; an absorption edge is close to
  exponential there).
* Absorptance of a layer of thickness W (T. Tiedje, E. Yablonovitch, G. D. Cody,
  B. G. Brooks, IEEE Trans. Electron Devices 31, 711 (1984); E. Yablonovitch,
  J. Opt. Soc. Am. 72, 899 (1982)):
      Lambertian  a = alpha / (alpha + 1 / (4 n^2 W)),
      single pass a = 1 - exp(-alpha W),  double pass a = 1 - exp(-2 alpha W).
* Photocurrent Jsc = q int a(E) Phi(E) dE under ASTM G173-03 global tilt (photon density
  per nm linear between the table's wavelengths, zero outside), one sun.
* Radiative dark current by reciprocity (U. Rau, Phys. Rev. B 76, 085303 (2007)),
  emission through the front only: J0 = q (2 pi / h^3 c^2) int a(E) E^2 / (e^(E/kT) - 1) dE.
* Auger recombination: A. Richter, S. W. Glunz, F. Werner, J. Schmidt, A. Cuevas,
  Phys. Rev. B 86, 165202 (2012), Auger part of their intrinsic-lifetime fit, cm units:
      R = (n p - ni^2)(2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 dn^0.92),
      g_eeh = 1 + 13 (1 - tanh((n0/3.3e17)^0.66)), g_ehh = 1 + 7.5 (1 - tanh((p0/7e17)^0.63)),
  with ni = 9.65e9 cm^-3 at 300 K (P. P. Altermatt et al., J. Appl. Phys. 93, 1598
  (2003), recalled) scaled as T^1.5 exp(-Eg/2kT + Eg/2k 300 K), Eg = 1.12 eV (recalled).
  Flat quasi-Fermi levels: n p = ni^2 e^(qV/kT), n = n0 + dn, p = p0 + dn.
* J(V) = Jsc - J0 (e^(qV/kT) - 1) - q W R(V).

Method
------
* Jsc: scipy.integrate.quad on every interval between the G173 wavelengths inside the
  Green range (0.25 to 1.45 um), with the Green wavelengths as break points.
* J0: quad on every Green interval in E, the integrand scaled by e^(E_ref/kT) with E_ref
  the lowest table energy (so nothing underflows), then multiplied back.
* Voc: brentq on J(V) = 0 to xtol 1e-14 V.  Maximum power point: minimize_scalar (bounded,
  xatol 1e-13 V) of -V J(V) on (0, Voc).
Every quad call asks for epsrel 1e-12 and turns an IntegrationWarning into an error.

Output columns: thickness_um, trapping, doping_type, doping_cm3, temp_k, jsc_a_m2,
ln_j0_a_m2, voc_v, vmp_v, efficiency.
"""

import math
import warnings

import numpy as np
from scipy import integrate, optimize

from sq_common import (C_LIGHT, FIXTURE_DIR, H_PLANCK, K_BOLTZ, Q_ELEM, REPO_ROOT,
                       TabulatedSpectrum, load_g173)

GREEN = REPO_ROOT / "src" / "physics" / "data" / "materials" / "si_green2008.csv"
HC = H_PLANCK * C_LIGHT
PHOTON_PREFACTOR = 2.0 * math.pi / (H_PLANCK ** 3 * C_LIGHT ** 2)
EPSREL = 1e-12


def quad(f, a, b, points=None):
    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        v, _ = integrate.quad(f, a, b, epsabs=0.0, epsrel=EPSREL, limit=400, points=points)
    return v


def load_green():
    rows = [line.split(",") for line in GREEN.read_text().splitlines()
            if line and not line.startswith("#") and not line.startswith("wavelength")]
    lam_m = np.array([float(r[0]) for r in rows]) * 1e-6
    n = np.array([float(r[1]) for r in rows])
    k = np.array([float(r[2]) for r in rows])
    e = HC / lam_m
    alpha = 4.0 * math.pi * k / lam_m
    order = np.argsort(e)
    return e[order], alpha[order], n[order]


E_TAB, ALPHA_TAB, N_TAB = load_green()


def alpha_n(e):
    """ln alpha and n linear in E between the table's points."""
    i = int(np.clip(np.searchsorted(E_TAB, e) - 1, 0, len(E_TAB) - 2))
    t = (e - E_TAB[i]) / (E_TAB[i + 1] - E_TAB[i])
    a0, a1 = ALPHA_TAB[i], ALPHA_TAB[i + 1]
    alpha = a0 * (a1 / a0) ** t if a0 > 0 and a1 > 0 else a0 + t * (a1 - a0)
    return alpha, N_TAB[i] + t * (N_TAB[i + 1] - N_TAB[i])


def absorptance(e, w, trapping):
    if e < E_TAB[0] or e > E_TAB[-1]:
        return 0.0
    alpha, n = alpha_n(e)
    if trapping == "lambertian":
        return alpha / (alpha + 1.0 / (4.0 * n * n * w)) if alpha > 0 else 0.0
    passes = 1.0 if trapping == "single-pass" else 2.0
    return -math.expm1(-passes * alpha * w)


SUN = TabulatedSpectrum(*load_g173()["global"])


def jsc(w, trapping):
    lam = SUN.lam
    lo, hi = HC / E_TAB[-1] * 1e9, HC / E_TAB[0] * 1e9
    breaks = sorted(HC / E_TAB * 1e9)
    total = 0.0
    for i in range(len(lam) - 1):
        a, b = max(lam[i], lo), min(lam[i + 1], hi)
        if b <= a:
            continue
        s0, s1 = SUN.photons[i], SUN.photons[i + 1]
        dens = lambda x: s0 + (s1 - s0) * (x - lam[i]) / (lam[i + 1] - lam[i])
        inner = [p for p in breaks if a < p < b]
        total += quad(lambda x: absorptance(HC / (x * 1e-9), w, trapping) * dens(x), a, b,
                      points=inner or None)
    return Q_ELEM * total


def ln_j0(w, trapping, temp_k):
    kt = K_BOLTZ * temp_k
    e_ref = E_TAB[0]
    f = lambda e: absorptance(e, w, trapping) * e * e * math.exp(-(e - e_ref) / kt) / -math.expm1(-e / kt)
    total = 0.0
    for i in range(len(E_TAB) - 1):
        total += quad(f, E_TAB[i], E_TAB[i + 1])
    return math.log(Q_ELEM * PHOTON_PREFACTOR * total) - e_ref / kt


def ni_cm3(temp_k):
    eg = 1.12 * Q_ELEM
    return 9.65e9 * (temp_k / 300.0) ** 1.5 * math.exp(-eg / (2 * K_BOLTZ * temp_k) + eg / (2 * K_BOLTZ * 300.0))


def auger_cm3_s(n, p, n0, p0, ni):
    dn = 0.5 * ((n - n0) + (p - p0))
    g_eeh = 1.0 + 13.0 * (1.0 - math.tanh((n0 / 3.3e17) ** 0.66))
    g_ehh = 1.0 + 7.5 * (1.0 - math.tanh((p0 / 7e17) ** 0.63))
    return (n * p - ni * ni) * (2.5e-31 * g_eeh * n0 + 8.5e-32 * g_ehh * p0 + 3.0e-29 * max(dn, 0.0) ** 0.92)


def solve(w_um, trapping, doping_type, doping_cm3, temp_k):
    w = w_um * 1e-6
    kt = K_BOLTZ * temp_k
    ni = ni_cm3(temp_k)
    if doping_cm3 == 0:
        n0 = p0 = ni
    elif doping_type == "n":
        n0, p0 = doping_cm3, ni * ni / doping_cm3
    else:
        n0, p0 = ni * ni / doping_cm3, doping_cm3
    j_sc = jsc(w, trapping)
    lj0 = ln_j0(w, trapping, temp_k)

    def current(v):
        x = Q_ELEM * v / kt
        rad = math.exp(lj0 + x) - math.exp(lj0)
        s = n0 + p0
        c = ni * ni * math.expm1(x)
        dn = 2.0 * c / (s + math.sqrt(s * s + 4.0 * c))
        aug = Q_ELEM * (w * 100.0) * auger_cm3_s(n0 + dn, p0 + dn, n0, p0, ni) * 1e4  # A/cm2 -> A/m2
        return j_sc - rad - aug

    voc = optimize.brentq(current, 0.0, 1.2, xtol=1e-14, rtol=4 * np.finfo(float).eps, maxiter=500)
    res = optimize.minimize_scalar(lambda v: -v * current(v), bounds=(0.0, voc), method="bounded",
                                   options={"xatol": 1e-13, "maxiter": 500})
    vmp = res.x
    eff = vmp * current(vmp) / SUN.total_power
    return j_sc, lj0, voc, vmp, eff


CASES = [
    (110.0, "lambertian", "n", 0.0, 298.15),
    (10.0, "lambertian", "n", 0.0, 300.0),
    (300.0, "lambertian", "n", 0.0, 298.15),
    (1000.0, "lambertian", "n", 0.0, 300.0),
    (110.0, "lambertian", "p", 1e16, 298.15),
    (160.0, "lambertian", "n", 5e15, 300.0),
    (50.0, "single-pass", "n", 0.0, 300.0),
    (200.0, "double-pass", "p", 1e15, 320.0),
]


def main():
    out = FIXTURE_DIR / "silicon_reference.csv"
    lines = [
        "# silicon cells: Green 2008 absorption, Lambertian / single / double pass, reciprocity J0, Richter 2012 Auger",
        "# AM1.5G = ASTM G173-03 global tilt, photon density linear between points; one sun",
        f"# scipy quad epsrel {EPSREL:g} per table interval; brentq xtol 1e-14 V; bounded minimize_scalar xatol 1e-13 V",
        "# generated by: python3 tests/reference/gen_silicon.py",
        "thickness_um,trapping,doping_type,doping_cm3,temp_k,jsc_a_m2,ln_j0_a_m2,voc_v,vmp_v,efficiency",
    ]
    for case in CASES:
        j, lj0, voc, vmp, eff = solve(*case)
        w, trap, dt, dop, t = case
        lines.append(f"{w:g},{trap},{dt},{dop:g},{t:g},{j:.15e},{lj0:.15e},{voc:.15e},{vmp:.15e},{eff:.15e}")
        print(lines[-1])
    out.write_text("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
