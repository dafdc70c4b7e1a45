"""Vectorized numpy baseline: silicon cell efficiency against thickness.

Run with:

    python3 benches/silicon_numpy.py

100 thicknesses from 1 to 1000 um, evenly on a log scale; undoped silicon with Lambertian
light trapping, AM1.5G (ASTM G173-03 global column), one sun, cell at 300 K.

Model
-----
* Absorption: M. A. Green, Sol. Energy Mater. Sol. Cells 92, 1305 (2008), the table in
  src/physics/data/materials/si_green2008.csv, alpha = 4 pi k / lambda; ln alpha and n
  linear in photon energy between table points.
* Lambertian absorptance a = alpha / (alpha + 1/(4 n^2 W)) (Tiedje et al., IEEE Trans.
  Electron Devices 31, 711 (1984)).
* Jsc = q int a Phi dE, J0 = q (2 pi/h^3 c^2) int a E^2/(e^(E/kT) - 1) dE (reciprocity,
  U. Rau, Phys. Rev. B 76, 085303 (2007)), front emission only.
* Auger: Richter et al., Phys. Rev. B 86, 165202 (2012), Auger part; n_i = 9.65e9 cm^-3
  at 300 K (recalled).

Method (vectorized over the thicknesses)
------
* Energy grid: 32 points per table interval (3841 points); a(W, E) is one 100 x 3841
  array; both integrals are matrix-vector products with trapezoid weights (the spectrum's
  photon density interpolated onto the grid; the grid is fine enough that the trapezoid
  rule agrees with the program to about 1e-4 relative, enough for a timing comparison).
* Voc: 60 bisection steps on all cells at once; the maximum power point: 60 golden-section
  steps on V J(V), all cells at once.

Output (machine-readable lines):
    numpy_import_seconds=<s>
    numpy_silicon_sweep_seconds=<median s over REPEATS> points=100 best_thickness_um=<..> best_efficiency=<..>
"""

import time

_t_import0 = time.perf_counter()
import numpy as np  # noqa: E402
_t_import1 = time.perf_counter()

import os  # noqa: E402
import statistics  # noqa: E402
from pathlib import Path  # noqa: E402

ROOT = Path(__file__).resolve().parents[1]
REPEATS = int(os.environ.get("GLOWGAP_BENCH_REPEATS", "20"))
H, C, K, Q = 6.62607015e-34, 299792458.0, 1.380649e-23, 1.602176634e-19
HC = H * C
REFINE = 32


def load():
    rows = [line.split(",") for line in (ROOT / "src/physics/data/materials/si_green2008.csv").read_text().splitlines()
            if line and not line.startswith("#") and not line.startswith("wavelength")]
    lam = np.array([float(r[0]) for r in rows]) * 1e-6
    n = np.array([float(r[1]) for r in rows])
    k = np.array([float(r[2]) for r in rows])
    e = HC / lam
    o = np.argsort(e)
    g173 = np.loadtxt(ROOT / "src/physics/data/astm_g173_03.csv", delimiter=",", skiprows=2)
    return e[o], (4 * np.pi * k / lam)[o], n[o], g173[:, 0], g173[:, 2]


def prepare(e, alpha, n, lam_nm, irr, temp_k):
    t = np.arange(REFINE) / REFINE
    a0, a1 = alpha[:-1, None], alpha[1:, None]
    al = np.where((a0 > 0) & (a1 > 0), a0 * (np.maximum(a1, 1e-300) / np.maximum(a0, 1e-300)) ** t, a0 + t * (a1 - a0))
    grid = np.append((e[:-1, None] + t * (e[1:, None] - e[:-1, None])).ravel(), e[-1])
    al = np.append(al.ravel(), alpha[-1])
    nn = np.append((n[:-1, None] + t * (n[1:, None] - n[:-1, None])).ravel(), n[-1])
    # photon density per J at the grid: per nm density times |d lambda / dE|
    photons_nm = irr * lam_nm * 1e-9 / HC
    lam_g = HC / grid * 1e9
    dens = np.interp(lam_g, lam_nm, photons_nm, left=0.0, right=0.0) * lam_g / grid
    w = np.zeros_like(grid)
    d = np.diff(grid)
    w[:-1] += 0.5 * d
    w[1:] += 0.5 * d
    kt = K * temp_k
    bb = grid ** 2 * np.exp(-(grid - grid[0]) / kt) / -np.expm1(-grid / kt)
    return al, nn, Q * w * dens, Q * 2 * np.pi / (H ** 3 * C ** 2) * w * bb, grid[0] / kt, kt


def sweep(thick_m, al, nn, w_sun, w_bb, e_ref_kt, kt, temp_k, input_w):
    a = al / (al + 1.0 / (4.0 * nn ** 2 * thick_m[:, None]))
    jsc = a @ w_sun
    ln_j0 = np.log(a @ w_bb) - e_ref_kt
    eg = 1.12 * Q
    ni = 9.65e9 * (temp_k / 300) ** 1.5 * np.exp(-eg / (2 * kt) + eg / (2 * K * 300))
    w_cm = thick_m * 100.0
    g_eeh = 1 + 13 * (1 - np.tanh((ni / 3.3e17) ** 0.66))
    g_ehh = 1 + 7.5 * (1 - np.tanh((ni / 7e17) ** 0.63))

    def current(v):
        x = Q * v / kt
        rad = np.exp(ln_j0 + x) - np.exp(ln_j0)
        c = ni * ni * np.expm1(x)
        s = 2 * ni
        dn = 2 * c / (s + np.sqrt(s * s + 4 * c))
        # undoped: n0 = p0 = ni, n p - ni^2 = (ni + dn)^2 - ni^2
        r = (2 * ni * dn + dn * dn) * (2.5e-31 * g_eeh * ni + 8.5e-32 * g_ehh * ni + 3.0e-29 * dn ** 0.92)
        return jsc - rad - Q * w_cm * r * 1e4

    lo, hi = np.zeros_like(jsc), np.full_like(jsc, 1.2)
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        pos = current(mid) > 0
        lo, hi = np.where(pos, mid, lo), np.where(pos, hi, mid)
    voc = 0.5 * (lo + hi)
    g = 0.6180339887498949
    a_, b_ = np.zeros_like(voc), voc.copy()
    c_, d_ = b_ - g * (b_ - a_), a_ + g * (b_ - a_)
    fc, fd = c_ * current(c_), d_ * current(d_)
    for _ in range(60):
        left = fc > fd
        b_ = np.where(left, d_, b_)
        a_ = np.where(left, a_, c_)
        c_, d_ = b_ - g * (b_ - a_), a_ + g * (b_ - a_)
        fc, fd = c_ * current(c_), d_ * current(d_)
    vmp = 0.5 * (a_ + b_)
    return vmp * current(vmp) / input_w


def main():
    e, alpha, n, lam_nm, irr = load()
    temp_k = 300.0
    input_w = float(np.trapezoid(irr, lam_nm))
    thick = np.geomspace(1e-6, 1e-3, 100)
    times = []
    eff = None
    for _ in range(REPEATS):
        t0 = time.perf_counter()
        parts = prepare(e, alpha, n, lam_nm, irr, temp_k)
        eff = sweep(thick, *parts, temp_k, input_w)
        times.append(time.perf_counter() - t0)
    i = int(np.argmax(eff))
    print(f"numpy_import_seconds={_t_import1 - _t_import0:.6f}")
    print(f"numpy_silicon_sweep_seconds={statistics.median(times):.6f} points={thick.size} "
          f"best_thickness_um={thick[i] * 1e6:.3f} best_efficiency={eff[i]:.6f}")


if __name__ == "__main__":
    main()
