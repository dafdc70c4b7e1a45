"""Generate tests/fixtures/radiator_*.csv: independent reference values for the radiator
balance.

Regenerate with:

    python3 tests/reference/gen_radiator.py

Quantities
----------
* radiator_balance.csv: the terms of the balance of Raman et al., Nature 515, 540 (2014),
  eq. 1, for emitters whose emissivity is constant on wavelength bands, under the box sky
  (a blackbody at ambient outside 8-13 um, transparent inside) or under space, with a 3 K
  background seen through every transparent part:
      P_rad  = sum_k eps_h,k E(l_k, l_k+1; T)
      P_sky  = sum_k eps_h,k [s_k E(l_k, l_k+1; Ta) + (1 - s_k) E(l_k, l_k+1; 3 K)]
      net    = P_rad - P_sky - h_c (Ta - T)
  with E(l1, l2; T) = int_{l1}^{l2} pi B_lambda(T) dlambda (Planck, Ann. Phys. 4, 553,
  1901), computed as 2 pi (kT)^4 / (h^3 c^2) G_3(hc/(l2 k T), hc/(l1 k T)) by scipy quad
  (sq_common.bose_integral), and the hemispherical emissivity eps_h = 2 int eps(mu) mu dmu
  by scipy quad over mu. The steady temperature (net = 0) comes from scipy brentq.
* radiator_profiles.csv: emitted power int eps(lambda) pi B_lambda(T) dlambda of smooth
  profiles (logistic window edges; control points linear on a log wavelength axis), by
  scipy quad over wavelength split at every corner, plus exact tails.
* radiator_sky_angles.csv: the hemispherical emissivity of a sky layer of zenith optical
  depth tau with eps(theta) = 1 - t^(1/cos theta) (Granqvist & Hjortsberg, J. Appl. Phys.
  52, 4205, 1981): 2 int_0^1 (1 - e^(-tau/mu)) mu dmu = 1 - 2 E_3(tau), from
  scipy.special.expn, cross-checked by scipy quad.
* radiator_cutoff_share.csv: the share of that sky absorbed by an emitter with an angular
  cut-off (normal emissivity eps up to the cut-off angle theta_c, `beyond` from there to
  grazing): 2 int_0^1 eps(mu) (1 - e^(-tau/mu)) mu dmu by scipy quad split at
  mu_c = cos theta_c.
* radiator_solar.csv: AM1.5G power absorbed by profiles, int eps(lambda) I(lambda)
  dlambda over ASTM G173-03 (global tilt column), with I interpolated linearly between the
  table's points, by scipy quad on every table interval.

Method and accuracy
-------------------
scipy.integrate.quad with epsabs=1e-12, epsrel=1e-12 (epsabs=0, epsrel=1e-13 in
sq_common's Bose integrals);
an IntegrationWarning is an error. brentq xtol=1e-12.

CSV format
----------
Lines starting with '#' are comments; the header names the columns with their units.
Numbers are shortest round-trip decimal text of IEEE doubles.
"""

import math
import sys
import warnings
from pathlib import Path

import numpy as np
from scipy import integrate, optimize, special

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))
import sq_common as sq  # noqa: E402

H, C, K = sq.H_PLANCK, sq.C_LIGHT, sq.K_BOLTZ
T_SPACE = 3.0
WINDOW = (8e-6, 13e-6)
EPSREL = 1e-12
EPSABS = 1e-12  # W m^-2 per interval (or per unit for the mu integrals)


def quad(f, a, b):
    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        return integrate.quad(f, a, b, epsabs=EPSABS, epsrel=EPSREL, limit=400)[0]


def band(l1, l2, t):
    """int_{l1}^{l2} pi B_lambda(T) dlambda [W m^-2]; l1 may be 0, l2 may be inf."""
    if t <= 0 or l2 <= l1:
        return 0.0
    kt = K * t
    x_lo = H * C / (l2 * kt) if math.isfinite(l2) else 0.0
    x_hi = H * C / (l1 * kt) if l1 > 0 else math.inf
    return 2.0 * math.pi * kt ** 4 / (H ** 3 * C ** 2) * sq.bose_integral(3, x_lo, x_hi)


def e_b(lam, t):
    """pi B_lambda(T) [W m^-2 m^-1]."""
    x = H * C / (lam * K * t)
    if x > 700:
        return 0.0
    return 2.0 * math.pi * H * C ** 2 / lam ** 5 / math.expm1(x)


def hemispherical(eps, cut_deg=None, beyond=0.0):
    """2 int_0^1 eps(mu) mu dmu, eps(mu) = eps for theta <= cut, beyond past it."""
    if cut_deg is None:
        return eps
    mu_c = math.cos(math.radians(cut_deg))
    return quad(lambda mu: 2 * beyond * mu, 0.0, mu_c) + quad(lambda mu: 2 * eps * mu, mu_c, 1.0)


# ------------------------------------------------------------ balance cases
# (case, pieces [(from_m, to_m, eps)], sky, ambient K, surface K, h_c, cut-off deg, beyond)
INF = math.inf
CASES = [
    ("blackbody_box_300", [(0, INF, 1.0)], "box", 300.0, 300.0, 0.0, None, 0.0),
    ("blackbody_box_280_surface_300", [(0, INF, 1.0)], "box", 280.0, 300.0, 0.0, None, 0.0),
    ("window_8_13_box_300", [(0, 8e-6, 0.0), (8e-6, 13e-6, 1.0), (13e-6, INF, 0.0)], "box", 300.0, 300.0, 0.0, None, 0.0),
    ("window_8_13_space_300", [(0, 8e-6, 0.0), (8e-6, 13e-6, 1.0), (13e-6, INF, 0.0)], "space", 300.0, 300.0, 0.0, None, 0.0),
    ("grey_0.9_space_300", [(0, INF, 0.9)], "space", 300.0, 300.0, 0.0, None, 0.0),
    ("window_0.9_0.2_box_290_surface_280_hc_5", [(0, 8e-6, 0.2), (8e-6, 13e-6, 0.9), (13e-6, INF, 0.2)], "box", 290.0, 280.0, 5.0, None, 0.0),
    ("window_7_14_box_300_surface_310", [(0, 7e-6, 0.0), (7e-6, 14e-6, 1.0), (14e-6, INF, 0.0)], "box", 300.0, 310.0, 0.0, None, 0.0),
    ("solar_band_0.05_below_4um_grey_0.95_box_300", [(0, 4e-6, 0.05), (4e-6, INF, 0.95)], "box", 300.0, 300.0, 0.0, None, 0.0),
    ("blackbody_cutoff_60_box_300", [(0, INF, 1.0)], "box", 300.0, 300.0, 0.0, 60.0, 0.0),
    ("grey_0.8_cutoff_45_beyond_0.1_space_250_hc_2", [(0, INF, 0.8)], "space", 250.0, 250.0, 2.0, 45.0, 0.1),
]


def sky_pieces(sky):
    if sky == "box":
        return [(0, WINDOW[0], 1.0), (WINDOW[0], WINDOW[1], 0.0), (WINDOW[1], INF, 1.0)]
    return [(0, INF, 0.0)]


def merged(a, b):
    edges = sorted({x for p in a + b for x in p[:2]})
    out = []
    for lo, hi in zip(edges[:-1], edges[1:]):
        mid = 0.5 * lo if lo == 0 else (2 * lo if math.isinf(hi) else 0.5 * (lo + hi))
        va = next(p[2] for p in a if p[0] <= mid < p[1])
        vb = next(p[2] for p in b if p[0] <= mid < p[1])
        out.append((lo, hi, va, vb))
    return out


def balance(case):
    _, pieces, sky, ta, _, hc, cut, beyond = case
    parts = [(lo, hi, hemispherical(e, cut, beyond), s) for lo, hi, e, s in merged(pieces, sky_pieces(sky))]

    def emitted(t):
        return sum(eh * band(lo, hi, t) for lo, hi, eh, _ in parts)

    sky_abs = sum(eh * (s * band(lo, hi, ta) + (1 - s) * band(lo, hi, T_SPACE)) for lo, hi, eh, s in parts)

    def net(t):
        return emitted(t) - sky_abs - hc * (ta - t)

    return emitted, sky_abs, net


def write_fixture(filename, comments, header, rows):
    """Write rows (a name, then numbers) under '#' comments and a header line."""
    out = sq.FIXTURE_DIR / filename
    with open(out, "w", encoding="utf-8", newline="\n") as fh:
        for c in comments + ["generated by: python3 tests/reference/gen_radiator.py"]:
            fh.write(f"# {c}\n")
        fh.write(header + "\n")
        for r in rows:
            fh.write(",".join([r[0]] + [sq.fmt(v) for v in r[1:]]) + "\n")
    print(f"wrote {out} ({len(rows)} rows)")


def write_balance():
    rows = []
    for case in CASES:
        name, _, sky, ta, ts, hc, _, _ = case
        emitted, sky_abs, net = balance(case)
        steady = optimize.brentq(net, 1.0, 3000.0, xtol=1e-12, rtol=1e-14)
        rows.append((name, ta, ts, hc, emitted(ts), sky_abs, net(ts), steady))
        print(f"  {name}: emitted {emitted(ts):.6f} net {net(ts):.6f} steady {steady:.6f}")
    write_fixture(
        "radiator_balance.csv",
        ["Raman et al. 2014 balance for piecewise-constant emitters under the box sky (open 8-13 um)",
         "or space; 3 K background through transparent parts; band integrals by scipy quad"],
        "case,ambient_k,surface_k,h_c_w_m2k,emitted_w_m2,sky_absorbed_w_m2,net_w_m2,steady_temp_k",
        rows,
    )


# ------------------------------------------------------------ smooth profiles
GRID_LO, GRID_HI = 0.1e-6, 1e-3


def logistic(x):
    return 0.5 * (1 + math.tanh(0.5 * x))


def smooth_window(l1, l2, inside, outside, edge):
    s = edge / (2 * math.log(9))
    return lambda lam: outside + (inside - outside) * logistic((lam - l1) / s) * logistic((l2 - lam) / s)


def log_points(points):
    xs = [math.log(p[0]) for p in points]
    ys = [p[1] for p in points]
    return lambda lam: float(np.interp(math.log(lam), xs, ys))


PROFILES = [
    # (case, eps(lambda), corners [m], temperature K)
    ("logistic_8_13_edge_0.5um_300", smooth_window(8e-6, 13e-6, 0.95, 0.05, 0.5e-6), [8e-6, 13e-6], 300.0),
    ("logistic_8_13_edge_2um_300", smooth_window(8e-6, 13e-6, 1.0, 0.0, 2e-6), [8e-6, 13e-6], 300.0),
    ("points_5um_0.2_20um_0.9_300", log_points([(5e-6, 0.2), (20e-6, 0.9)]), [5e-6, 20e-6], 300.0),
    ("points_five_350", log_points([(0.3e-6, 0.05), (4e-6, 0.05), (8e-6, 0.95), (13e-6, 0.95), (14e-6, 0.2)]),
     [0.3e-6, 4e-6, 8e-6, 13e-6, 14e-6], 350.0),
]


def emitted_smooth(eps, corners, t):
    pts = sorted({GRID_LO, GRID_HI, *[c for c in corners if GRID_LO < c < GRID_HI]})
    # extra split points so quad sees the logistic edges and the Planck peak
    extra = np.geomspace(GRID_LO, GRID_HI, 200)
    pts = sorted(set(pts) | set(extra.tolist()) | {c + d for c in corners for d in (-2e-6, -1e-6, 1e-6, 2e-6) if c + d > GRID_LO})
    total = sum(quad(lambda lam: eps(lam) * e_b(lam, t), a, b) for a, b in zip(pts[:-1], pts[1:]))
    total += eps(GRID_LO) * band(0.0, GRID_LO, t) + eps(GRID_HI) * band(GRID_HI, INF, t)
    return total


def write_profiles():
    rows = [(name, t, emitted_smooth(eps, corners, t)) for name, eps, corners, t in PROFILES]
    write_fixture(
        "radiator_profiles.csv",
        ["emitted power int eps(lambda) pi B_lambda(T) dlambda, scipy quad split at corners"],
        "case,temp_k,emitted_w_m2",
        rows,
    )


# ------------------------------------------------------------ sky angles
def write_sky_angles():
    rows = []
    worst = 0.0
    for tau in np.geomspace(1e-4, 30.0, 37):
        closed = 1.0 - 2.0 * float(special.expn(3, tau))
        check = quad(lambda mu: 2 * (-math.expm1(-tau / mu)) * mu, 0.0, 1.0)
        worst = max(worst, abs(closed - check))
        rows.append((sq.fmt(tau), closed))
    write_fixture(
        "radiator_sky_angles.csv",
        ["hemispherical emissivity of a layer: 2 int_0^1 (1 - exp(-tau/mu)) mu dmu = 1 - 2 E_3(tau)",
         f"scipy.special.expn; scipy quad cross-check max abs diff {worst:.2e}"],
        "tau,hemispherical_emissivity",
        rows,
    )


def write_cutoff_share():
    rows = []
    for tau in (1e-3, 0.05, 0.7, 3.0, 20.0):
        for angle_deg, eps, beyond in ((30.0, 0.9, 0.0), (60.0, 0.95, 0.2), (80.0, 0.5, 1.0), (89.0, 1.0, 0.05)):
            mu_c = math.cos(math.radians(angle_deg))
            layer = lambda mu: 2 * (-math.expm1(-tau / mu)) * mu  # noqa: E731
            share = beyond * quad(layer, 0.0, mu_c) + eps * quad(layer, mu_c, 1.0)
            rows.append((sq.fmt(tau), sq.fmt(angle_deg), sq.fmt(eps), sq.fmt(beyond), share))
    write_fixture(
        "radiator_cutoff_share.csv",
        ["share of a sky layer absorbed by a cut-off emitter: 2 int_0^1 eps(mu) (1 - exp(-tau/mu)) mu dmu,",
         "eps(mu) = eps for mu >= cos(angle), beyond below; scipy quad split at cos(angle)"],
        "tau,cutoff_deg,eps,beyond,share",
        rows,
    )


# ------------------------------------------------------------ sunlight
SOLAR = [
    # (case, eps(lambda), corners [m])
    ("visible_window_0.4_0.7um", lambda lam: 1.0 if 0.4e-6 <= lam <= 0.7e-6 else 0.0, [0.4e-6, 0.7e-6]),
    ("points_0.3um_0.1_2um_0.9", log_points([(0.3e-6, 0.1), (2e-6, 0.9)]), [0.3e-6, 2e-6]),
    ("grey_0.03", lambda lam: 0.03, []),
]


def write_solar():
    lam_nm, irr = sq.load_g173()["global"]
    lam = lam_nm * 1e-9
    dens = irr * 1e9  # W m^-2 m^-1
    total = float(np.trapezoid(dens, lam))
    rows = []
    for name, eps, corners in SOLAR:
        s = 0.0
        for i in range(len(lam) - 1):
            a, b = lam[i], lam[i + 1]
            ya, yb = dens[i], dens[i + 1]
            inside = [a] + [c for c in corners if a < c < b] + [b]
            for lo, hi in zip(inside[:-1], inside[1:]):
                s += quad(lambda x: eps(x) * (ya + (yb - ya) * (x - a) / (b - a)), lo, hi)
        rows.append((name, s, total))
    write_fixture(
        "radiator_solar.csv",
        ["AM1.5G (ASTM G173-03 global tilt) power absorbed, int eps(lambda) I(lambda) dlambda, I linear",
         "between table points; scipy quad per table interval, split at the profile's corners"],
        "case,absorbed_w_m2,total_w_m2",
        rows,
    )


def main():
    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    write_balance()
    write_profiles()
    write_sky_angles()
    write_cutoff_share()
    write_solar()


if __name__ == "__main__":
    main()
