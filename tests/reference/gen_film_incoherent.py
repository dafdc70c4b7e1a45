"""Generate tests/fixtures/film_tmm_incoherent.csv.

Regenerate with:

    pip install tmm numpy
    python3 tests/reference/gen_film_incoherent.py

(Numbers in the committed fixture: tmm 0.2.0, numpy 2.4.6, CPython 3.11; the
versions actually used are written into the CSV header.)

Quantity
--------
Reflectance R and transmittance T of a planar stack that mixes thin coherent
films with thick incoherent layers (sheets of glass, wafers), between a
lossless semi-infinite incident medium (real index n0) and a semi-infinite
substrate, for a plane wave of vacuum wavelength lambda arriving at angle
theta0 (measured in the incident medium), s or p polarised.

Conventions (shared with the Rust side):

* complex refractive index N = n + i k, k >= 0 meaning absorption;
* layers listed from the side the light comes from; each layer is flagged
  coherent ('c': amplitudes add, thin-film interference) or incoherent
  ('i': intensities add, all phase information is discarded);
* a run of consecutive coherent layers is one coherent stack, characterised
  by its power reflectances and transmittances from both sides (the usual
  coherent transfer-matrix R and T); plain interfaces between two incoherent
  media use the Fresnel power coefficients;
* single-pass power transmission of an incoherent layer of thickness d:
  P = exp(-4 pi d Im(q) / lambda), q = N cos(theta) = sqrt(N^2 - s^2),
  s = n0 sin(theta0), Im q >= 0.  q is the complex normal wave number over
  k_vac, so P is the decay of the normal Poynting flux of the (in general
  inhomogeneous) wave over the thickness d -- NOT exp(-alpha d / cos theta_r)
  with a real refraction angle, though the two agree to first order in k;
* power coefficients at an interface, or of a coherent stack, from medium a
  into medium b: R = |r|^2, T = |t|^2 Re(q_b) / Re(q_a) (s) and
  T = |t|^2 Re(N_b conj(cos theta_b)) / Re(N_a conj(cos theta_a)) (p), i.e.
  the normal flux of the single transmitted wave over that of the single
  incident wave.  When medium a is absorbing, R + T of a lossless interface
  is not exactly 1 (the forward/backward interference term in a lossy
  medium is dropped); the excess is O(k^2) (~1e-11 for the k used here);
* T = power entering the substrate (for an absorbing substrate that power is
  then absorbed there, still reported as T; the substrate is never given a
  thickness).  A = 1 - R - T is what the layers absorb.

Physics and method
------------------
Primary values: tmm.inc_tmm(pol, [n0, N_1, ..., N_sub], [inf, d_1, ...,
inf], ['i', c_1, ..., 'i'], theta0, lambda) from the general-purpose package
tmm (S. J. Byrnes, "Multilayer optical calculations", arXiv:1603.02720),
lengths in nm.  tmm requires n0 sin(theta0) to be real (true here: n0 real).

Independent cross-check (written here, sharing no code with tmm): the
net-radiation / series-addition method for incoherent multilayers (e.g.
R. Siegel and J. R. Howell, Thermal Radiation Heat Transfer, multiple
reflections in a partially transmitting layer).  Each element between two
incoherent media (plain interface or coherent stack) is described by
(Rf, Tf, Rb, Tb); coherent stacks are evaluated with the characteristic
(admittance) matrix, lossy ambient media included,

    r = (eta_a B - C) / (eta_a B + C),
    T = 4 |eta_a|^2 Re(eta_b) / (Re(eta_a) |eta_a B + C|^2),

(eta = q for s, N^2 / q for p).  Two elements separated by an incoherent
layer with single-pass transmission P combine as

    D  = 1 - Rb1 Rf2 P^2,
    Tf = Tf1 P Tf2 / D,          Rf = Rf1 + Tf1 Tb1 Rf2 P^2 / D,
    Tb = Tb2 P Tb1 / D,          Rb = Rb2 + Tb2 Tf2 Rb1 P^2 / D.

Closed form (every lossless single incoherent sheet of index n in air at
normal incidence, i.e. case i1 at 0 deg): with R1 = ((n-1)/(n+1))^2 and the
single-pass transmission P (= 1 when lossless),

    R = R1 + (1 - R1)^2 R1 P^2 / (1 - R1^2 P^2)  (= 2 R1 / (1 + R1) at P = 1),
    T = (1 - R1)^2 P / (1 - R1^2 P^2)            (= (1 - R1) / (1 + R1)).

Also checked: the lossless sheet (i1) does not depend on wavelength or
thickness; at normal incidence s = p; lossless stacks have A = 0.

Accuracy
--------
IEEE double throughout.  tmm vs the independent series addition: max |dR|,
|dT| printed and written to the header (~1e-15 expected); closed form vs
tmm: asserted < 1e-12 (printed).

CSV format
----------
Lines starting with '#' are comments.  Numbers are shortest round-trip
decimal text of IEEE doubles (Python repr; small k is written like 1e-05).

film_tmm_incoherent.csv, header:
    case,n0,layers,substrate,angle_deg,polarization,wavelength_nm,R,T
  layers: entries "n+ki:thickness_nm:f" joined by ';' in the order the light
  meets them, f = c (coherent) or i (incoherent), e.g.
  "2.0+0.0i:80.0:c;1.5+0.0i:500000.0:i;2.0+0.0i:80.0:c".  substrate: "n+ki".
  polarization: s or p.
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
TOL_CLOSED = 1e-12

K_GLASS = 1e-5  # single pass through 1 mm: P = exp(-4 pi k d / lambda) ~ 0.88 at 1000 nm

# (name, n0, [(N, d_nm, 'c' | 'i'), ...], N_sub, angles_deg, pols, wavelengths_nm)
CASES = [
    # 1 mm lossless glass sheet in air
    ("i1", 1.0, [(1.5 + 0j, 1.0e6, "i")], 1.0 + 0j,
     [0.0, 30.0, 60.0], ["s", "p"], [500.0, 1200.0]),
    # the same sheet, weakly absorbing
    ("i2", 1.0, [(1.5 + K_GLASS * 1j, 1.0e6, "i")], 1.0 + 0j,
     [0.0, 30.0, 60.0], ["s", "p"], [500.0, 1000.0, 9000.0]),
    # thin coherent coating on both faces of a 0.5 mm incoherent sheet
    ("i3", 1.0, [(2.0 + 0j, 80.0, "c"), (1.5 + 0j, 5.0e5, "i"), (2.0 + 0j, 80.0, "c")],
     1.0 + 0j, [0.0, 30.0, 60.0], ["s", "p"], [500.0, 1200.0]),
    # two incoherent sheets bonded by a coherent layer
    ("i4", 1.0, [(1.5 + 0j, 1.0e6, "i"), (1.38 + 0j, 100.0, "c"),
                 (1.6 + 2.0e-6j, 2.0e6, "i")],
     1.0 + 0j, [0.0, 60.0], ["s", "p"], [500.0, 1200.0]),
    # coherent metal-like film on a thick weakly absorbing incoherent layer
    ("i5", 1.0, [(0.1 + 3.0j, 20.0, "c"), (1.5 + K_GLASS * 1j, 1.0e6, "i")],
     1.7 + 0j, [0.0, 30.0, 60.0], ["s", "p"], [1200.0]),
    # from glass: coherent film, thick lossy incoherent layer, absorbing substrate
    ("i6", 1.5, [(2.0 + 0j, 100.0, "c"), (1.46 + 2.0e-5j, 2.0e5, "i")],
     3.5 + 0.01j, [0.0, 30.0, 60.0], ["s", "p"], [1200.0]),
]


# ---------------------------------------------------------- formatting
def fmt_n(n):
    n = complex(n)
    assert n.imag >= 0.0
    return f"{sq.fmt(n.real)}+{sq.fmt(n.imag)}i"


def fmt_layers(layers):
    return ";".join(f"{fmt_n(n)}:{sq.fmt(d)}:{c}" for n, d, c in layers)


# ------------------------------------------------------- tmm evaluation
def tmm_rt(pol, n0, layers, n_sub, angle_deg, lam):
    n_list = [complex(n0)] + [complex(n) for n, _, _ in layers] + [complex(n_sub)]
    d_list = [INF] + [float(d) for _, d, _ in layers] + [INF]
    c_list = ["i"] + [c for _, _, c in layers] + ["i"]
    data = tmm.inc_tmm(pol, n_list, d_list, c_list, math.radians(angle_deg), lam)
    return float(data["R"]), float(data["T"])


# ------------------------------------------- independent series addition
_q = sq.forward_q
_eta = sq.tilted_admittance


def _coherent_one_way(pol, n_a, films, n_b, s, lam):
    """(R, T) of films [(N, d)] from medium a into medium b (admittance matrix)."""
    eta_a = _eta(pol, n_a, _q(n_a, s))
    eta_b = _eta(pol, n_b, _q(n_b, s))
    m = np.eye(2, dtype=complex)
    for n, d in films:
        q = _q(n, s)
        eta = _eta(pol, n, q)
        delta = 2.0 * math.pi * q * d / lam
        c, sn = np.cos(delta), np.sin(delta)
        m = m @ np.array([[c, -1j * sn / eta], [-1j * eta * sn, c]])
    b, c = m @ np.array([1.0, eta_b])
    den = eta_a * b + c
    r = (eta_a * b - c) / den
    t_pow = 4.0 * abs(eta_a) ** 2 * eta_b.real / (eta_a.real * abs(den) ** 2)
    return abs(r) ** 2, t_pow


def _element(pol, n_a, films, n_b, s, lam):
    rf, tf = _coherent_one_way(pol, n_a, films, n_b, s, lam)
    rb, tb = _coherent_one_way(pol, n_b, films[::-1], n_a, s, lam)
    return rf, tf, rb, tb


def _combine(e1, p, e2):
    rf1, tf1, rb1, tb1 = e1
    rf2, tf2, rb2, tb2 = e2
    den = 1.0 - rb1 * rf2 * p * p
    return (rf1 + tf1 * tb1 * rf2 * p * p / den,
            tf1 * p * tf2 / den,
            rb2 + tb2 * tf2 * rb1 * p * p / den,
            tb2 * p * tb1 / den)


def series_rt(pol, n0, layers, n_sub, angle_deg, lam):
    s = n0 * math.sin(math.radians(angle_deg))
    # split into incoherent media with the coherent films between them
    inc = [(complex(n0), INF)]
    between = [[]]
    for n, d, c in layers:
        if c == "c":
            between[-1].append((complex(n), d))
        else:
            inc.append((complex(n), d))
            between.append([])
    inc.append((complex(n_sub), INF))
    total = _element(pol, inc[0][0], between[0], inc[1][0], s, lam)
    for j in range(1, len(inc) - 1):
        n, d = inc[j]
        p = math.exp(-4.0 * math.pi * d * _q(n, s).imag / lam)
        nxt = _element(pol, n, between[j], inc[j + 1][0], s, lam)
        total = _combine(total, p, nxt)
    return total[0], total[1]


# ------------------------------------------------------- closed form
def single_sheet_closed(n, p):
    r1 = ((n - 1.0) / (n + 1.0)) ** 2
    den = 1.0 - r1 * r1 * p * p
    return r1 + (1.0 - r1) ** 2 * r1 * p * p / den, (1.0 - r1) ** 2 * p / den


# --------------------------------------------------------------- main
def main():
    t_start = time.perf_counter()
    rows = []
    worst_cross = 0.0
    worst_lossless_a = 0.0
    worst_normal_sp = 0.0
    closed = []           # (case, lambda, |dR|, |dT|)
    i1_spread = 0.0       # lossless sheet: spread over wavelengths

    i1_by_angle = {}
    for name, n0, layers, n_sub, angles, pols, lams in CASES:
        lossless = all(complex(n).imag == 0.0 for n, _, _ in layers) and n_sub.imag == 0.0
        for lam in lams:
            for ang in angles:
                vals = {}
                for pol in pols:
                    r, t = tmm_rt(pol, n0, layers, n_sub, ang, lam)
                    r_ref, t_ref = series_rt(pol, n0, layers, n_sub, ang, lam)
                    worst_cross = max(worst_cross, abs(r - r_ref), abs(t - t_ref))
                    if lossless:
                        worst_lossless_a = max(worst_lossless_a, abs(1.0 - r - t))
                    vals[pol] = (r, t)
                    rows.append((name, n0, fmt_layers(layers), fmt_n(n_sub),
                                 ang, pol, lam, r, t))
                    if name == "i1":
                        prev = i1_by_angle.setdefault((ang, pol), (r, t))
                        i1_spread = max(i1_spread, abs(prev[0] - r), abs(prev[1] - t))
                if ang == 0.0:
                    worst_normal_sp = max(worst_normal_sp,
                                          abs(vals["s"][0] - vals["p"][0]),
                                          abs(vals["s"][1] - vals["p"][1]))
                    if name == "i1":
                        n = layers[0][0].real
                        r_cf, t_cf = single_sheet_closed(n, 1.0)
                        assert abs(r_cf - 2.0 * ((n - 1) / (n + 1)) ** 2
                                   / (1.0 + ((n - 1) / (n + 1)) ** 2)) < 1e-15
                        closed.append((name, lam, abs(vals["s"][0] - r_cf),
                                       abs(vals["s"][1] - t_cf)))

    # informational: absorbing sheet (i2) at normal incidence vs the same
    # closed form with R1 = |(N-1)/(N+1)|^2 and P = exp(-4 pi k d / lambda);
    # differs at O(k^2) because tmm's inside-interface T is not 1 - R1
    i2_info = []
    for name, n0, layers, n_sub, angles, pols, lams in CASES:
        if name != "i2":
            continue
        big_n, d, _ = layers[0]
        for lam in lams:
            r, t = next((row[7], row[8]) for row in rows
                        if row[0] == "i2" and row[6] == lam and row[4] == 0.0)
            r1 = abs((big_n - 1.0) / (big_n + 1.0)) ** 2
            p = math.exp(-4.0 * math.pi * big_n.imag * d / lam)
            den = 1.0 - r1 * r1 * p * p
            r_cf = r1 + (1.0 - r1) ** 2 * r1 * p * p / den
            t_cf = (1.0 - r1) ** 2 * p / den
            i2_info.append((lam, p, r - r_cf, t - t_cf))

    # how much tmm's P differs from exp(-alpha d / cos theta_r) at 60 deg (i2)
    big_n, d, _ = CASES[1][2][0]
    s60 = math.sin(math.radians(60.0))
    p_tmm = math.exp(-4.0 * math.pi * d * _q(big_n, s60).imag / 1000.0)
    cos_r = math.sqrt(1.0 - (s60 / big_n.real) ** 2)
    p_naive = math.exp(-4.0 * math.pi * big_n.imag * d / (1000.0 * cos_r))

    worst_closed = max(max(c[2], c[3]) for c in closed)
    assert worst_cross < TOL_CROSS, worst_cross
    assert worst_closed < TOL_CLOSED, closed
    assert worst_lossless_a < 1e-12, worst_lossless_a
    assert worst_normal_sp < 1e-14, worst_normal_sp
    assert i1_spread < 1e-14, i1_spread

    versions = (f"tmm {tmm_version()}, numpy {np.__version__}, "
                f"Python {platform.python_version()}")
    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    out = sq.FIXTURE_DIR / "film_tmm_incoherent.csv"
    with open(out, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# R, T of mixed coherent/incoherent stacks (tmm.inc_tmm, "
                 "Byrnes arXiv:1603.02720)\n")
        fh.write(f"# produced with {versions}\n")
        fh.write("# N = n + i k (k >= 0 absorbs); layers from the incident side, "
                 "n+ki:thickness_nm:c|i (c coherent, i incoherent); "
                 "wavelength in nm; angle in the incident medium, degrees\n")
        fh.write("# incoherent single pass P = exp(-4 pi d Im(N cos theta) / lambda); "
                 "T = power entering the substrate; A = 1 - R - T\n")
        fh.write("# generated by: python3 tests/reference/gen_film_incoherent.py\n")
        fh.write(f"# series-addition cross-check max |dR|,|dT|: {worst_cross:.3e}; "
                 f"lossless stacks max |A|: {worst_lossless_a:.3e}\n")
        fh.write(f"# i1 closed form R = 2 R1 / (1 + R1), T = (1 - R1) / (1 + R1): "
                 f"max |diff| {worst_closed:.3e}\n")
        fh.write("case,n0,layers,substrate,angle_deg,polarization,wavelength_nm,R,T\n")
        for name, n0, lay, sub, ang, pol, lam, r, t in rows:
            fh.write(f"{name},{sq.fmt(n0)},{lay},{sub},{sq.fmt(ang)},{pol},"
                     f"{sq.fmt(lam)},{sq.fmt(r)},{sq.fmt(t)}\n")

    print(f"wrote {out} ({len(rows)} rows) with {versions}")
    print(f"series-addition cross-check max |dR|,|dT|: {worst_cross:.3e}")
    print(f"lossless stacks (i1, i3) max |A|: {worst_lossless_a:.3e}")
    print(f"normal incidence max |s - p|: {worst_normal_sp:.3e}")
    print(f"i1 lossless sheet, spread over wavelength: {i1_spread:.3e}")
    print("i1 closed form R1 = ((n-1)/(n+1))^2, R = 2 R1/(1+R1), "
          "T = (1-R1)^2 P/(1-R1^2 P^2), P = 1:")
    for name, lam, dr, dt in closed:
        print(f"  {name} lambda {lam}: |dR| = {dr:.3e}, |dT| = {dt:.3e}")
    print("i2 absorbing sheet, normal incidence, tmm - closed form with "
          "R1 = |(N-1)/(N+1)|^2 (O(k^2) expected):")
    for lam, p, dr, dt in i2_info:
        print(f"  lambda {lam}: P = {p!r}, dR = {dr:.3e}, dT = {dt:.3e}")
    print(f"i2 at 60 deg, 1000 nm: P(tmm, Im q) = {p_tmm!r}, "
          f"exp(-alpha d / cos theta_r) = {p_naive!r}, diff = {p_tmm - p_naive:.3e}")
    print(f"elapsed {time.perf_counter() - t_start:.2f} s")


def tmm_version():
    try:
        from importlib.metadata import version
        return version("tmm")
    except Exception:  # pragma: no cover
        return "unknown"


if __name__ == "__main__":
    main()
