"""Generate tests/fixtures/film_tmm_layers.csv.

Regenerate with:

    pip install tmm numpy
    python3 tests/reference/gen_film_layers.py

(Numbers in the committed fixture: tmm 0.2.0, numpy 2.4.6, CPython 3.11; the
versions actually used are written into the CSV header.)

Quantity
--------
The fraction of the incident power absorbed in each film of a planar stack
of homogeneous, isotropic, coherent thin films between a lossless
semi-infinite incident medium (real index n0) and a semi-infinite substrate,
for unpolarised light of vacuum wavelength lambda at angle theta0 (measured
in the incident medium).

Conventions (shared with the Rust side and with film_tmm.csv):

* complex refractive index N = n + i k, k >= 0 meaning absorption;
* layers listed from the side the light comes from;
* absorbed fraction of film j = (normal Poynting flux entering film j at its
  front face) - (normal Poynting flux leaving it at its back face), divided
  by the normal flux of the incident wave;
* only the films are listed: not the incident medium (which "absorbs" R)
  nor the substrate (which receives T, the flux entering it); hence
  R + sum(absorbed) + T = 1;
* unpolarised = (s + p) / 2 for every film.

Physics and method
------------------
Primary values: tmm.absorp_in_each_layer(tmm.coh_tmm(pol, [n0, N_1, ...,
N_sub], [inf, d_1, ..., inf], theta0, lambda)) from the general-purpose
package tmm (S. J. Byrnes, "Multilayer optical calculations",
arXiv:1603.02720), lengths in nm; its first and last entries (the two
semi-infinite media, = R and T) are dropped.

Independent cross-check (written here, sharing no code with tmm): the
characteristic-matrix / optical-admittance formulation (M. Born and E. Wolf,
Principles of Optics, 7th ed., sec. 1.6; H. A. Macleod, Thin-Film Optical
Filters, ch. 2).  With s = n0 sin(theta0), q_j = sqrt(N_j^2 - s^2) (Im q >= 0),
eta_j = q_j (s) or N_j^2 / q_j (p) and delta_j = 2 pi q_j d_j / lambda, the
tangential fields (E, H) are carried from the substrate, where they are
(1, eta_sub), to the front of every film by

    [E, H]_front = [[cos delta_j, -i sin delta_j / eta_j],
                    [-i eta_j sin delta_j, cos delta_j]] [E, H]_back,

the normal flux at each interface is Re(E conj(H)), and the incident flux is
eta_0 |(eta_0 E_0 + H_0) / (2 eta_0)|^2.  Film j absorbs the flux difference
between its two faces.

Accuracy
--------
IEEE double throughout.  tmm vs the admittance flux: max difference printed
and written to the header (~1e-16 expected); |R + sum + T - 1| and the
absorption of lossless films (rounding residues, ~1e-16, may be slightly
negative) also printed.

CSV format
----------
Lines starting with '#' are comments.  Numbers are shortest round-trip
decimal text of IEEE doubles (Python repr).

film_tmm_layers.csv, header:
    case,n0,layers,substrate,angle_deg,wavelength_nm,absorbed
  layers: entries "n+ki:thickness_nm" joined by ';' (as in film_tmm.csv).
  substrate: "n+ki".  absorbed: one number per film, in the same order as
  layers, joined by ';' (unpolarised).
"""

import math
import platform
import sys
import time
from pathlib import Path

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))

import numpy as np  # noqa: E402
import tmm  # noqa: E402

import sq_common as sq  # noqa: E402  (fmt, FIXTURE_DIR)

INF = float("inf")
TOL_CROSS = 1e-12

# (name, n0, [(N, d_nm), ...], N_sub, angles_deg, wavelengths_nm)
CASES = [
    # absorbing / lossless / strongly absorbing films on glass
    ("a1", 1.0, [(2.0 + 0.1j, 120.0), (1.46 + 0j, 200.0), (3.5 + 0.5j, 30.0)], 1.5 + 0j,
     [0.0, 45.0, 70.0], [500.0, 1000.0]),
    # thin metal between two dielectric films (low-emissivity-coating-like)
    ("a2", 1.0, [(2.0 + 0j, 40.0), (0.05 + 3.5j, 15.0), (2.0 + 0j, 40.0)], 1.52 + 0j,
     [0.0, 45.0, 70.0], [550.0, 1000.0]),
    # absorbing film between glass and air; 45 and 70 deg are beyond the
    # critical angle (frustrated total internal reflection, T = 0)
    ("a3", 1.5, [(3.5 + 0.5j, 30.0)], 1.0 + 0j,
     [0.0, 45.0, 70.0], [600.0]),
]


# ---------------------------------------------------------- formatting
def fmt_n(n):
    n = complex(n)
    assert n.imag >= 0.0
    return f"{sq.fmt(n.real)}+{sq.fmt(n.imag)}i"


def fmt_layers(layers):
    return ";".join(f"{fmt_n(n)}:{sq.fmt(d)}" for n, d in layers)


# ------------------------------------------------------- tmm evaluation
def tmm_absorbed(pol, n0, layers, n_sub, angle_deg, lam):
    n_list = [complex(n0)] + [complex(n) for n, _ in layers] + [complex(n_sub)]
    d_list = [INF] + [float(d) for _, d in layers] + [INF]
    data = tmm.coh_tmm(pol, n_list, d_list, math.radians(angle_deg), lam)
    a = tmm.absorp_in_each_layer(data)
    assert abs(a[0] - data["R"]) < 1e-15 and abs(a[-1] - data["T"]) < 1e-15
    return [float(x) for x in a[1:-1]], float(data["R"]), float(data["T"])


# ----------------------------------- independent characteristic matrix
_q = sq.forward_q
_eta = sq.tilted_admittance


def admittance_absorbed(pol, n0, layers, n_sub, angle_deg, lam):
    s = n0 * math.sin(math.radians(angle_deg))
    eta0 = _eta(pol, n0, _q(n0, s))
    eta_sub = _eta(pol, n_sub, _q(n_sub, s))
    field = np.array([1.0 + 0j, eta_sub])
    flux = [(field[0] * np.conj(field[1])).real]  # flux at the back of each film
    for n, d in reversed(layers):
        q = _q(n, s)
        eta = _eta(pol, n, q)
        delta = 2.0 * math.pi * q * d / lam
        c, sn = np.cos(delta), np.sin(delta)
        field = np.array([[c, -1j * sn / eta], [-1j * eta * sn, c]]) @ field
        flux.append((field[0] * np.conj(field[1])).real)
    flux = flux[::-1]  # flux[j] = at the front of film j; flux[-1] = into substrate
    inc = eta0.real * abs((eta0 * field[0] + field[1]) / (2.0 * eta0)) ** 2
    return [(flux[j] - flux[j + 1]) / inc for j in range(len(layers))], flux[-1] / inc


# --------------------------------------------------------------- main
def main():
    t_start = time.perf_counter()
    rows = []
    worst_cross = 0.0
    worst_sum = 0.0
    worst_lossless = 0.0
    worst_normal_sp = 0.0
    worst_ftir_t = 0.0

    for name, n0, layers, n_sub, angles, lams in CASES:
        for lam in lams:
            for ang in angles:
                per_pol = {}
                for pol in ("s", "p"):
                    a, r, t = tmm_absorbed(pol, n0, layers, n_sub, ang, lam)
                    a_ref, t_ref = admittance_absorbed(pol, n0, layers, n_sub, ang, lam)
                    worst_cross = max([worst_cross, abs(t - t_ref)]
                                      + [abs(x - y) for x, y in zip(a, a_ref)])
                    worst_sum = max(worst_sum, abs(r + sum(a) + t - 1.0))
                    if name == "a3" and n0 * math.sin(math.radians(ang)) > n_sub.real:
                        worst_ftir_t = max(worst_ftir_t, abs(t))
                    per_pol[pol] = a
                mean = [0.5 * (x + y) for x, y in zip(per_pol["s"], per_pol["p"])]
                if ang == 0.0:
                    worst_normal_sp = max([worst_normal_sp] + [
                        abs(x - y) for x, y in zip(per_pol["s"], per_pol["p"])])
                for (n, _), x in zip(layers, mean):
                    if complex(n).imag == 0.0:
                        worst_lossless = max(worst_lossless, abs(x))
                rows.append((name, n0, fmt_layers(layers), fmt_n(n_sub), ang, lam,
                             ";".join(sq.fmt(x) for x in mean)))

    assert worst_cross < TOL_CROSS, worst_cross
    assert worst_sum < 1e-12, worst_sum
    assert worst_lossless < 1e-12, worst_lossless
    assert worst_normal_sp < 1e-14, worst_normal_sp
    assert worst_ftir_t < 1e-14, worst_ftir_t

    versions = (f"tmm {tmm_version()}, numpy {np.__version__}, "
                f"Python {platform.python_version()}")
    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    out = sq.FIXTURE_DIR / "film_tmm_layers.csv"
    with open(out, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# absorbed fraction per film, unpolarised (s + p) / 2 "
                 "(tmm.coh_tmm + tmm.absorp_in_each_layer, Byrnes arXiv:1603.02720)\n")
        fh.write(f"# produced with {versions}\n")
        fh.write("# N = n + i k (k >= 0 absorbs); layers from the incident side; "
                 "thickness and wavelength in nm; angle in the incident medium, degrees\n")
        fh.write("# absorbed: flux in - flux out of each film, films only "
                 "(no incident medium, no substrate), ';'-separated in layer order; "
                 "R + sum + T = 1\n")
        fh.write("# generated by: python3 tests/reference/gen_film_layers.py\n")
        fh.write(f"# admittance-flux cross-check max |diff|: {worst_cross:.3e}; "
                 f"max |R + sum + T - 1|: {worst_sum:.3e}; "
                 f"lossless films max |absorbed|: {worst_lossless:.3e}\n")
        fh.write("case,n0,layers,substrate,angle_deg,wavelength_nm,absorbed\n")
        for name, n0, lay, sub, ang, lam, absorbed in rows:
            fh.write(f"{name},{sq.fmt(n0)},{lay},{sub},{sq.fmt(ang)},"
                     f"{sq.fmt(lam)},{absorbed}\n")

    print(f"wrote {out} ({len(rows)} rows) with {versions}")
    print(f"admittance-flux cross-check max |diff|: {worst_cross:.3e}")
    print(f"max |R + sum(absorbed) + T - 1|: {worst_sum:.3e}")
    print(f"lossless films max |absorbed| (unpolarised): {worst_lossless:.3e}")
    print(f"normal incidence max |s - p|: {worst_normal_sp:.3e}")
    print(f"a3 beyond the critical angle max |T|: {worst_ftir_t:.3e}")
    print(f"elapsed {time.perf_counter() - t_start:.2f} s")


def tmm_version():
    try:
        from importlib.metadata import version
        return version("tmm")
    except Exception:  # pragma: no cover
        return "unknown"


if __name__ == "__main__":
    main()
