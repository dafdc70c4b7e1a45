"""Generate tests/fixtures/film_tmm.csv and tests/fixtures/film_hemispherical.csv.

Regenerate with:

    pip install tmm numpy scipy
    python3 tests/reference/gen_film.py

Quantity
--------
Reflectance R, transmittance T and absorptance A = 1 - R - T of a planar
stack of homogeneous, isotropic, coherent thin films between a lossless
semi-infinite incident medium (real index n0) and a semi-infinite substrate,
for a plane wave of vacuum wavelength lambda arriving at angle theta0
(measured in the incident medium) with s, p or mean polarisation.

Conventions (shared with the Rust side):

* complex refractive index N = n + i k, k >= 0 meaning absorption;
* layers listed from the side the light comes from;
* R = |r|^2;
* T = time-averaged normal component of the Poynting vector just inside the
  substrate, at its front interface, divided by that of the incident wave;
  i.e. the power that ENTERS the substrate.  For an absorbing substrate that
  power is then absorbed in the substrate; it is still reported as T;
* A = 1 - R - T is the power absorbed in the films;
* polarisation 'mean' is (s + p) / 2 for R and for T (unpolarised light),
  and A = 1 - R - T from those means.

T for an absorbing substrate (case c4).  tmm.coh_tmm computes
T = |t|^2 Re(N_sub cos th_sub) / Re(n0 cos th0) for s and
T = |t|^2 Re(N_sub conj(cos th_sub)) / Re(n0 conj(cos th0)) for p, with
th_sub the complex (forward-branch) angle in the substrate.  This is exactly
the normal Poynting flux of the single forward wave in the substrate
evaluated at the interface (z = 0 in that medium), i.e. the power entering
the substrate, so tmm's 'T' is used unchanged for c4.  The script checks
this two ways: (i) against tmm.position_resolved's Poynting vector at the
back face of the last film, computed from the film's forward and backward
amplitudes (flux continuity across the interface), and (ii) against the
independent characteristic-matrix T below (4 eta_0 Re(eta_sub) / |...|^2,
the flux entering the substrate).

Physics and method
------------------
Primary values: the coherent transfer-matrix method with complex angles for
absorbing media and evanescent waves, as implemented in the general-purpose
package tmm (S. J. Byrnes, "Multilayer optical calculations",
arXiv:1603.02720), via tmm.coh_tmm(pol, [n0, N_1, ..., N_sub],
[inf, d_1, ..., inf], theta0, lambda) with lengths in nm.

Independent cross-check (written here, sharing no code with tmm): the
characteristic-matrix / optical-admittance formulation (M. Born and E. Wolf,
Principles of Optics, 7th ed., sec. 1.6; H. A. Macleod, Thin-Film Optical
Filters, ch. 2).  With s = n0 sin(theta0) and q_j = sqrt(N_j^2 - s^2) on the
branch Im q >= 0 (Re q > 0 if real), tilted admittances eta_j = q_j (s) or
N_j^2 / q_j (p), phase delta_j = 2 pi q_j d_j / lambda and

    [B, C]^T = prod_j [[cos delta_j, -i sin delta_j / eta_j],
                       [-i eta_j sin delta_j, cos delta_j]] [1, eta_sub]^T,

    r = (eta_0 B - C) / (eta_0 B + C),  R = |r|^2,
    T = 4 eta_0 Re(eta_sub) / |eta_0 B + C|^2.

(The -i signs are Macleod's matrix for the N = n - i k convention, complex
conjugated for N = n + i k; R and T are unchanged by the conjugation.)

Quarter-wave mirrors (cases c6, c7) at the design wavelength, normal
incidence, n0 = 1 (Macleod, Thin-Film Optical Filters, quarter-wave stacks):
the admittance of a quarter-wave layer of index n on admittance Y is n^2/Y,
hence

    (HL)^N H on ns:  Y = (nH/nL)^(2N) nH^2/ns,
        R = ((1 - (nH/nL)^(2N) nH^2/ns) / (1 + (nH/nL)^(2N) nH^2/ns))^2,
    (HL)^N   on ns:  Y = (nH/nL)^(2N) ns,
        R = ((1 - (nH/nL)^(2N) ns) / (1 + (nH/nL)^(2N) ns))^2.

Hemispherical emissivity of a smooth opaque dielectric (case c8, second
file): by Kirchhoff's law the directional emissivity of an opaque half-space
is 1 - R_mean(theta), with R_mean the unpolarised Fresnel reflectance from
vacuum (Born & Wolf sec. 1.5), and

    eps_h = 2 int_0^{pi/2} (1 - R_mean(theta)) cos(theta) sin(theta) dtheta.

Closed form of this integral for a real index n > 1 (R. V. Dunkle, 1963;
R. Siegel and J. R. Howell, Thermal Radiation Heat Transfer, the
hemispherical emissivity of a dielectric from Fresnel's equations):

    eps_h = 1/2 - (3n+1)(n-1) / (6 (n+1)^2)
            - n^2 (n^2-1)^2 / (n^2+1)^3 * ln((n-1)/(n+1))
            + 2 n^3 (n^2+2n-1) / ((n^2+1)(n^4-1))
            - 8 n^4 (n^4+1) / ((n^2+1)(n^4-1)^2) * ln(n).

Accuracy
--------
IEEE double throughout.  Every film row is compared with the independent
characteristic-matrix result (max |dR|, |dT| printed and written to the CSV
header; ~1e-15 expected).  Lossless stacks give A = 0 within 1e-12; total
internal reflection gives R = 1 within 1e-14 (tmm's T there is a rounding
residue of order 1e-16, not exactly 0, so compare T and A with an absolute
tolerance); the quarter-wave closed forms
agree to ~1e-15.  eps_h: scipy.integrate.quad of tmm's R_mean, epsabs=0,
epsrel=1e-12, limit=200, IntegrationWarning treated as error; difference from
the closed form printed and written to the header (~1e-16 expected).

CSV format
----------
Lines starting with '#' are comments.  Numbers are shortest round-trip
decimal text of IEEE doubles (Python repr).

film_tmm.csv, header:
    case,n0,layers,substrate,angle_deg,polarization,wavelength_nm,R,T,A
  layers: entries "n+ki:thickness_nm" joined by ';' in the order the light
  meets them (e.g. "2.0+0.1i:120.0;1.46+0.0i:200.0"); empty when there are
  no films.  substrate: "n+ki".  polarization: s, p or mean ('mean' rows are
  written for every case that lists both s and p).

film_hemispherical.csv, header:
    n,emissivity_hemispherical
"""

import math
import sys
import time
import warnings
from pathlib import Path

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))

import numpy as np  # noqa: E402
from scipy import integrate  # noqa: E402
import tmm  # noqa: E402

import sq_common as sq  # noqa: E402  (fmt, FIXTURE_DIR)

INF = float("inf")
QUAD_EPSREL = 1e-12
QUAD_LIMIT = 200


# ------------------------------------------------------------------ cases
def quarter(n, lam):
    return lam / (4.0 * n)


def qw_mirror(nh, nl, pairs, lam, cap_h):
    layers = []
    for _ in range(pairs):
        layers.append((complex(nh, 0.0), quarter(nh, lam)))
        layers.append((complex(nl, 0.0), quarter(nl, lam)))
    if cap_h:
        layers.append((complex(nh, 0.0), quarter(nh, lam)))
    return layers


NH, NL, NS_MIRROR, N_PAIRS, LAM_MIRROR = 2.3, 1.38, 1.52, 5, 600.0

# (name, n0, [(N, d_nm), ...], N_sub, angles_deg, pols, wavelengths_nm)
CASES = [
    ("c1", 1.0, [(1.38 + 0j, 550.0 / (4.0 * 1.38))], 1.52 + 0j,
     [0.0], ["s", "p"], [400.0, 550.0, 700.0]),
    ("c2", 1.0, [(2.0 + 0.1j, 120.0), (1.46 + 0j, 200.0), (3.5 + 0.5j, 30.0)],
     1.5 + 0j, [0.0, 30.0, 60.0, 85.0], ["s", "p"], [500.0, 1000.0, 3000.0]),
    ("c3", 1.0, [(0.05 + 3.0j, 20.0)], 1.5 + 0j,
     [45.0], ["s", "p"], [450.0, 800.0]),
    ("c4", 1.0, [(1.9 + 0j, 300.0)], 3.4 + 0.2j,
     [0.0, 70.0], ["s", "p"], [1200.0]),
    ("c5", 1.5, [], 1.0 + 0j,
     [30.0, 41.0, 42.0, 60.0], ["s", "p"], [600.0]),
    ("c6", 1.0, qw_mirror(NH, NL, N_PAIRS, LAM_MIRROR, False), NS_MIRROR + 0j,
     [0.0], ["s"], [LAM_MIRROR]),
    ("c7", 1.0, qw_mirror(NH, NL, N_PAIRS, LAM_MIRROR, True), NS_MIRROR + 0j,
     [0.0], ["s"], [LAM_MIRROR]),
]

HEMI_INDICES = [1.5, 2.0, 3.4]


# ---------------------------------------------------------- formatting
def fmt_n(n):
    n = complex(n)
    assert n.imag >= 0.0
    return f"{sq.fmt(n.real)}+{sq.fmt(n.imag)}i"


def fmt_layers(layers):
    return ";".join(f"{fmt_n(n)}:{sq.fmt(d)}" for n, d in layers)


# ------------------------------------------------------- tmm evaluation
def tmm_lists(n0, layers, n_sub):
    n_list = [complex(n0)] + [complex(n) for n, _ in layers] + [complex(n_sub)]
    d_list = [INF] + [float(d) for _, d in layers] + [INF]
    return n_list, d_list


def tmm_rt(pol, n0, layers, n_sub, angle_deg, lam):
    n_list, d_list = tmm_lists(n0, layers, n_sub)
    data = tmm.coh_tmm(pol, n_list, d_list, math.radians(angle_deg), lam)
    return float(data["R"]), float(data["T"]), data


# ----------------------------------- independent characteristic matrix
_q = sq.forward_q
_eta = sq.tilted_admittance


def admittance_rt(pol, n0, layers, n_sub, angle_deg, lam):
    s = n0 * math.sin(math.radians(angle_deg))
    eta0 = _eta(pol, n0, _q(n0, s))
    q_sub = _q(n_sub, s)
    eta_sub = _eta(pol, n_sub, q_sub)
    m = np.eye(2, dtype=complex)
    for n, d in layers:
        q = _q(n, s)
        eta = _eta(pol, n, q)
        delta = 2.0 * math.pi * q * d / lam
        c, sn = np.cos(delta), np.sin(delta)
        m = m @ np.array([[c, -1j * sn / eta], [-1j * eta * sn, c]])
    b, c = m @ np.array([1.0, eta_sub])
    den = eta0 * b + c
    r = (eta0 * b - c) / den
    t_pow = 4.0 * eta0.real * eta_sub.real / abs(den) ** 2
    return abs(r) ** 2, t_pow


# ------------------------------------------------------- closed forms
def qw_mirror_r(nh, nl, ns, pairs, cap_h, n0=1.0):
    g = (nh / nl) ** (2 * pairs)
    y = g * nh * nh / ns if cap_h else g * ns
    return ((n0 - y) / (n0 + y)) ** 2


def hemispherical_closed_form(n):
    n2, n4 = n * n, n ** 4
    return (0.5
            - (3 * n + 1) * (n - 1) / (6 * (n + 1) ** 2)
            - n2 * (n2 - 1) ** 2 / (n2 + 1) ** 3 * math.log((n - 1) / (n + 1))
            + 2 * n ** 3 * (n2 + 2 * n - 1) / ((n2 + 1) * (n4 - 1))
            - 8 * n4 * (n4 + 1) / ((n2 + 1) * (n4 - 1) ** 2) * math.log(n))


def hemispherical_quad(n):
    def integrand(theta):
        rs, _, _ = tmm_rt("s", 1.0, [], complex(n, 0.0), math.degrees(theta), 1000.0)
        rp, _, _ = tmm_rt("p", 1.0, [], complex(n, 0.0), math.degrees(theta), 1000.0)
        return (1.0 - 0.5 * (rs + rp)) * math.cos(theta) * math.sin(theta)

    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        val, _ = integrate.quad(integrand, 0.0, 0.5 * math.pi, epsabs=0.0,
                                epsrel=QUAD_EPSREL, limit=QUAD_LIMIT)
    return 2.0 * val


# --------------------------------------------------------------- main
def main():
    t_start = time.perf_counter()
    rows = []
    worst_cross = 0.0        # max |dR|, |dT| vs characteristic matrix
    worst_sum = 0.0          # max |R + T + A - 1|
    worst_lossless_a = 0.0   # max |A| for lossless stacks
    worst_tir = 0.0          # max |R - 1| beyond the critical angle
    worst_normal_sp = 0.0    # max |R_s - R_p|, |T_s - T_p| at normal incidence
    c4_checks = []           # |T - Poynting at the back face of the last film|

    for name, n0, layers, n_sub, angles, pols, lams in CASES:
        lossless = all(complex(n).imag == 0.0 for n, _ in layers) and n_sub.imag == 0.0
        for lam in lams:
            for ang in angles:
                vals = {}
                for pol in pols:
                    r, t, data = tmm_rt(pol, n0, layers, n_sub, ang, lam)
                    r_ref, t_ref = admittance_rt(pol, n0, layers, n_sub, ang, lam)
                    worst_cross = max(worst_cross, abs(r - r_ref), abs(t - t_ref))
                    vals[pol] = (r, t)
                    if name == "c4":
                        last = len(layers)
                        poyn = tmm.position_resolved(last, layers[-1][1], data)["poyn"]
                        c4_checks.append(abs(t - poyn))
                if "s" in vals and "p" in vals:
                    vals["mean"] = (0.5 * (vals["s"][0] + vals["p"][0]),
                                    0.5 * (vals["s"][1] + vals["p"][1]))
                    if ang == 0.0:
                        worst_normal_sp = max(worst_normal_sp,
                                              abs(vals["s"][0] - vals["p"][0]),
                                              abs(vals["s"][1] - vals["p"][1]))
                for pol, (r, t) in vals.items():
                    a = 1.0 - r - t
                    worst_sum = max(worst_sum, abs(r + t + a - 1.0))
                    if lossless:
                        worst_lossless_a = max(worst_lossless_a, abs(a))
                    if name == "c5":
                        crit = math.degrees(math.asin(n_sub.real / n0))
                        if ang > crit:
                            worst_tir = max(worst_tir, abs(r - 1.0))
                        else:
                            assert t > 0.0
                    rows.append((name, n0, fmt_layers(layers), fmt_n(n_sub),
                                 ang, pol, lam, r, t, a))

    # quarter-wave mirrors against Macleod's closed forms
    mirror = {}
    for name, cap_h in (("c6", False), ("c7", True)):
        r_tmm = next(row[7] for row in rows if row[0] == name)
        r_cf = qw_mirror_r(NH, NL, NS_MIRROR, N_PAIRS, cap_h)
        mirror[name] = (r_tmm, r_cf, r_tmm - r_cf)

    # hemispherical emissivity
    hemi = []
    for n in HEMI_INDICES:
        e_q = hemispherical_quad(n)
        e_cf = hemispherical_closed_form(n)
        hemi.append((n, e_q, e_cf, e_q - e_cf))
    worst_hemi = max(abs(h[3]) for h in hemi)

    assert worst_cross < 1e-12, worst_cross
    assert worst_lossless_a < 1e-12, worst_lossless_a
    assert worst_tir < 1e-14, worst_tir
    assert all(abs(m[2]) < 1e-13 for m in mirror.values()), mirror
    assert max(c4_checks) < 1e-12, c4_checks
    assert worst_hemi < 1e-12, worst_hemi

    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    out = sq.FIXTURE_DIR / "film_tmm.csv"
    with open(out, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# thin-film R, T, A by the coherent transfer-matrix method (tmm.coh_tmm, "
                 "Byrnes arXiv:1603.02720)\n")
        fh.write("# N = n + i k (k >= 0 absorbs); layers from the incident side; "
                 "thickness and wavelength in nm; angle in the incident medium, degrees\n")
        fh.write("# T = normal Poynting flux entering the substrate; A = 1 - R - T; "
                 "mean = (s + p) / 2\n")
        fh.write("# generated by: python3 tests/reference/gen_film.py\n")
        fh.write(f"# characteristic-matrix cross-check max |dR|,|dT|: {worst_cross:.3e}\n")
        fh.write(f"# lossless stacks max |A|: {worst_lossless_a:.3e}; "
                 f"TIR max |R - 1|: {worst_tir:.3e}\n")
        for name, (r_tmm, r_cf, diff) in mirror.items():
            fh.write(f"# {name} quarter-wave closed form R = {sq.fmt(r_cf)}, "
                     f"tmm - closed form = {diff:.3e}\n")
        fh.write("case,n0,layers,substrate,angle_deg,polarization,wavelength_nm,R,T,A\n")
        for name, n0, lay, sub, ang, pol, lam, r, t, a in rows:
            fh.write(f"{name},{sq.fmt(n0)},{lay},{sub},{sq.fmt(ang)},{pol},"
                     f"{sq.fmt(lam)},{sq.fmt(r)},{sq.fmt(t)},{sq.fmt(a)}\n")

    out_h = sq.FIXTURE_DIR / "film_hemispherical.csv"
    with open(out_h, "w", encoding="utf-8", newline="\n") as fh:
        fh.write("# hemispherical emissivity of a smooth opaque dielectric in vacuum: "
                 "eps_h = 2 int_0^{pi/2} (1 - R_mean) cos sin dtheta\n")
        fh.write("# generated by: python3 tests/reference/gen_film.py\n")
        fh.write(f"# accuracy: scipy.integrate.quad epsabs=0 epsrel={QUAD_EPSREL:g} "
                 f"limit={QUAD_LIMIT}; IntegrationWarning treated as error\n")
        fh.write(f"# closed-form (Dunkle; Siegel & Howell) max |diff|: {worst_hemi:.3e}\n")
        fh.write("n,emissivity_hemispherical\n")
        for n, e_q, _, _ in hemi:
            fh.write(f"{sq.fmt(n)},{sq.fmt(e_q)}\n")

    print(f"wrote {out} ({len(rows)} rows)")
    print(f"wrote {out_h} ({len(hemi)} rows)")
    print(f"max |R + T + A - 1|: {worst_sum:.3e}")
    print(f"lossless stacks (c1, c5, c6, c7) max |A|: {worst_lossless_a:.3e}")
    print(f"characteristic-matrix cross-check max |dR|,|dT|: {worst_cross:.3e}")
    print(f"normal incidence max |s - p|: {worst_normal_sp:.3e}")
    print(f"c5 beyond critical angle "
          f"{math.degrees(math.asin(1.0 / 1.5)):.4f} deg: max |R - 1| = {worst_tir:.3e}")
    print("c4 absorbing substrate: max |T - Poynting at film back face| = "
          f"{max(c4_checks):.3e} (T = power entering the substrate)")
    print("quarter-wave mirrors (Macleod), n0 = 1, normal incidence:")
    print("  (HL)^N H: R = ((1 - (nH/nL)^(2N) nH^2/ns) / (1 + (nH/nL)^(2N) nH^2/ns))^2")
    print("  (HL)^N  : R = ((1 - (nH/nL)^(2N) ns) / (1 + (nH/nL)^(2N) ns))^2")
    for name, (r_tmm, r_cf, diff) in mirror.items():
        print(f"  {name}: tmm R = {r_tmm!r}, closed form R = {r_cf!r}, diff = {diff:.3e}")
    print("hemispherical emissivity (quad of tmm vs closed form):")
    for n, e_q, e_cf, diff in hemi:
        print(f"  n = {n}: quad {e_q!r}, closed form {e_cf!r}, diff = {diff:.3e}")
    print(f"elapsed {time.perf_counter() - t_start:.2f} s")


if __name__ == "__main__":
    main()
