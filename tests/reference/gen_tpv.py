"""Generate tests/fixtures/tpv_reference.csv: thermophotovoltaic emitter-cell pairs.

Regenerate with:

    python3 tests/reference/gen_tpv.py

Physics and the publications the formulas come from
---------------------------------------------------
* Photon flux per unit photon energy into a hemisphere, generalized Planck law
  (M. Planck, Ann. Phys. 4, 553 (1901); P. Wurfel, J. Phys. C 15, 3967 (1982)):
      phi(E, T, mu) = 2 pi / (h^3 c^2) * E^2 / (exp((E - mu)/kT) - 1)   [m^-2 s^-1 J^-1]
* Exchange between an emitter (1, temperature Te, emissivity eps(E)), a cell (2, Tc,
  absorptance a(E)) and black surroundings (3, Tc): net-radiation (radiosity) method for
  an enclosure of opaque diffuse surfaces (R. Siegel and J. R. Howell, Thermal Radiation
  Heat Transfer, net-radiation method), applied per photon energy, with Kirchhoff's law
  (emissivity = absorptance, reflectance = 1 - absorptance).  Two parallel plates of equal
  area with view factor F to each other and 1 - F to the surroundings:
      J1 = eps e1 + r1 (F J2 + (1-F) e3),   J2 = a e2 + r2 (F J1 + (1-F) e3)
      e1 = phi(E,Te,0), e2 = phi(E,Tc,mu), e3 = phi(E,Tc,0), r1 = 1-eps, r2 = 1-a
      G1 = F J2 + (1-F) e3,  G2 = F J1 + (1-F) e3
      q1 = eps (e1 - G1)   (net flux leaving the emitter)
      q2 = a (G2 - e2)     (net flux absorbed by the cell)
  The 2x2 system is solved per energy by Cramer's rule (checked against
  numpy.linalg.solve).  The system is linear in the sources (e1, e2, e3); a difference
  q2(mu=0) - q2(mu) and the derivatives d q/d mu are obtained by solving the same system
  with the source vector (0, delta e2, 0) (superposition; checked against two direct
  solves), which avoids cancelling the emitter's large contribution.
* Emissivity profiles, read at lambda = h c / E (micrometres):
    blackbody: 1;  grey:X: X;  window:L1-L2,in=A,out=B: A for L1 <= lambda <= L2, B else;
    points:L1=E1,L2=E2,...: linear in (ln lambda, eps) between the points, constant
    outside them.
  Cell: a = 1 for E >= smallest gap, 1 - R below (R = sub-gap reflectance).
* Cells (detailed balance with a non-radiative share; subcell i absorbs on
  [g_i, g_(i-1)), g_0 = inf, and emits one hemisphere from its own gap up):
      Jgen_i  = q int_{g_i}^{g_(i-1)} q2(E; 0) dE
      Jdark_i = (q/ERE) int_{g_i}^{inf} [q2(E; 0) - q2(E; q V_i)] dE
      J_i     = Jgen_i - Jdark_i
      heat_in = int_0^inf E q1(E; mu(E)) dE, mu = q V_i on [g_i, g_(i-1)), 0 below the
                bottom gap;  subgap_heat = int_0^{g_bottom} E q1(E; 0) dE
  A single junction is the one-gap case: J(V) = Jrad(0) - (Jrad(0) - Jrad(V))/ERE.
  single/independent: each subcell at its maximum power point (brentq on
  dP_i/dV = J_i + V dJ_i/dV = 0); series: common current J, V_i(J) by brentq on
  J_i(V_i) = J, maximum of J sum V_i(J) by brentq on dP/dJ = sum V_i + J sum 1/J_i'(V_i).
  efficiency = P / heat_in at the maximum power point.
  max_efficiency: series: brentq on d(P/heat_in)/dJ = 0; single and independent:
  Dinkelbach iteration (heat_in is a sum of per-band terms H_i(V_i), so each step is one
  brentq per subcell on dP_i/dV - lambda dH_i/dV = 0), to |delta lambda| < 1e-15 lambda.
* Exact SI constants (BIPM SI Brochure, 9th ed., 2019).

Numerics and accuracy
---------------------
* Integration variable: photon energy in eV.  scipy.integrate.quad with epsrel=1e-12,
  epsabs = 1e-17 x the natural scale (q x emitter photon exitance for currents, sigma Te^4
  for powers), limit=400, IntegrationWarning raised as an error.  Every integral is split
  at each gap, at each emissivity edge or knot, at g_i + n kTc and at n kTe for
  n = 0.5, 1, 2, 4, 8, 16, 32.
* Upper limits: emitter terms (Jgen, heat) stop at E_top = max(60 kTe, g_1 + 60 kTc);
  the neglected tail is below e^-60 60^3 / (pi^4/15) ~ 3e-22 of the emitter's exitance.
  Dark-current terms stop at g_i + 60 kTc; the neglected part is below ~1e-24 relative.
* brentq xtol 1e-15 (V) or 1e-13 relative (A/m^2), rtol 4 eps.  Cross-checks (printed and
  written to the CSV header): bounded minimize_scalar (xatol 1e-12) on -P and -P/heat_in,
  Nelder-Mead (xatol 1e-10) on -P/heat_in for independent stacks; the F = 1 closed form
  q1 = q2 = tau (e1 - e2), tau = eps a / (1 - (1-eps)(1-a)); energy conservation
  q1 - q2 = (1-F)(J1 - e3) + (1-F)(J2 - e3) (the surroundings absorb the rest); Jgen and
  subgap heat of blackbody F = 1 cases against Bose integrals (sq_common).

CSV format
----------
Lines starting with '#' are comments.  Header:
case,emitter,emitter_temp_k,gaps_ev,connection,view_factor,subgap_reflectance,
cell_temp_k,ere,efficiency,pmax_w_cm2,heat_in_w_cm2,subgap_heat_w_cm2,jsc_a_cm2,voc_v,
vmp_v,max_efficiency
The emitter field is double-quoted when it holds commas (RFC 4180, csv module).
gaps_ev lists the gaps top first, separated by ';'.  Efficiencies are fractions; W/cm^2
and A/cm^2 are SI values / 1e4; vmp_v is empty for independent stacks.  Numbers are
shortest round-trip decimal text of IEEE doubles.
"""

import csv
import math
import sys
import time
import warnings
from pathlib import Path

import numpy as np
from scipy import integrate, optimize

sys.dont_write_bytecode = True  # keep the source tree free of __pycache__
sys.path.insert(0, str(Path(__file__).resolve().parent))
import sq_common as sq  # noqa: E402

H, C, K, Q = sq.H_PLANCK, sq.C_LIGHT, sq.K_BOLTZ, sq.Q_ELEM
PREF = 2.0 * math.pi / (H ** 3 * C ** 2)   # phi = PREF E^2 n(E)
HC_EV_UM = H * C / Q * 1e6                  # lambda[um] = HC_EV_UM / E[eV]
EPSREL = 1e-12
EPSABS_REL = 1e-17
TAIL_KT = 60.0
SPLIT_N = (0.5, 1.0, 2.0, 4.0, 8.0, 16.0, 32.0)
XTOL_V = 1e-15
RTOL = 4.0 * np.finfo(float).eps

CASES = [
    # case, emitter, Te, gaps (top first), connection, F, R, Tc, ERE
    ("t1", "blackbody", 2000.0, [0.74], "single", 1.0, 0.95, 300.0, 1.0),
    ("t2", "grey:0.8", 1500.0, [0.6], "single", 0.8, 0.9, 320.0, 0.1),
    ("t3", "window:1-2.2,in=0.9,out=0.15", 2400.0, [0.9], "single", 0.95, 0.98, 300.0, 1.0),
    ("t4", "points:0.5=0.9,3=0.3", 1800.0, [0.7], "single", 1.0, 0.97, 300.0, 0.5),
    ("t5", "blackbody", 2673.15, [1.4, 1.2], "series", 1.0, 0.93, 300.0, 1.0),
    ("t6", "blackbody", 2673.15, [1.4, 1.2], "independent", 1.0, 0.93, 300.0, 1.0),
    ("t7", "grey:0.9", 2123.15, [1.2, 0.9, 0.7], "series", 0.9, 0.95, 310.0, 0.3),
]


# ------------------------------------------------------------------ spectra
def phi(e, t, mu):
    """Generalized Planck photon flux per unit energy (Wurfel 1982), e and mu in J."""
    x = (e - mu) / (K * t)
    if x > 700.0:
        return 0.0
    return PREF * e * e / math.expm1(x)


def dphi_dmu(e, t, mu):
    """d phi / d mu = PREF E^2 e^x / (e^x - 1)^2 / kT, written with e^-x."""
    x = (e - mu) / (K * t)
    if x > 700.0:
        return 0.0
    em = math.exp(-x)
    return PREF * e * e / (K * t) * em / (-math.expm1(-x)) ** 2


def phi_drop(e, t, mu):
    """phi(E,T,0) - phi(E,T,mu) without cancellation:
    1/(e^a-1) - 1/(e^b-1) = -expm1(mu/kT) e^-a / ((1-e^-a)(1-e^-b)), a = E/kT, b = a - mu/kT."""
    kt = K * t
    a = e / kt
    b = (e - mu) / kt
    if b > 700.0:
        return 0.0
    return -PREF * e * e * math.expm1(mu / kt) * math.exp(-a) / (
        (-math.expm1(-a)) * (-math.expm1(-b)))


def parse_emitter(spec):
    """Return (eps(lambda_um), list of corner wavelengths in um)."""
    if spec == "blackbody":
        return (lambda lam: 1.0), []
    kind, _, arg = spec.partition(":")
    if kind == "grey":
        v = float(arg)
        return (lambda lam: v), []
    if kind == "window":
        parts = arg.split(",")
        l1, l2 = (float(s) for s in parts[0].split("-"))
        opts = dict(p.split("=") for p in parts[1:])
        vin, vout = float(opts["in"]), float(opts["out"])
        return (lambda lam: vin if l1 <= lam <= l2 else vout), [l1, l2]
    if kind == "points":
        pts = sorted((float(a), float(b)) for a, b in (p.split("=") for p in arg.split(",")))
        xs = [math.log(p[0]) for p in pts]
        ys = [p[1] for p in pts]

        def eps(lam):
            # linear in (ln lambda, eps), constant outside (numpy.interp clamps)
            return float(np.interp(math.log(lam), xs, ys))
        return eps, [p[0] for p in pts]
    raise ValueError(spec)


# --------------------------------------------------------- radiosity solve
def exchange(eps, a, f, e1, e2, e3):
    """Net-radiation method (Siegel & Howell) for emitter, cell and black surroundings.

    Solves  J1 - r1 F J2 = eps e1 + r1 (1-F) e3
           -r2 F J1 + J2 = a e2   + r2 (1-F) e3      by Cramer's rule.
    Returns (q1, q2, J1, J2): net flux leaving the emitter, net flux absorbed by the cell.
    """
    r1 = 1.0 - eps
    r2 = 1.0 - a
    b1 = eps * e1 + r1 * (1.0 - f) * e3
    b2 = a * e2 + r2 * (1.0 - f) * e3
    det = 1.0 - r1 * r2 * f * f
    j1 = (b1 + r1 * f * b2) / det
    j2 = (b2 + r2 * f * b1) / det
    g1 = f * j2 + (1.0 - f) * e3
    g2 = f * j1 + (1.0 - f) * e3
    return eps * (e1 - g1), a * (g2 - e2), j1, j2


def exchange_numpy(eps, a, f, e1, e2, e3):
    """The same system by numpy.linalg.solve (check only)."""
    r1, r2 = 1.0 - eps, 1.0 - a
    m = np.array([[1.0, -r1 * f], [-r2 * f, 1.0]])
    b = np.array([eps * e1 + r1 * (1.0 - f) * e3, a * e2 + r2 * (1.0 - f) * e3])
    j1, j2 = np.linalg.solve(m, b)
    g1 = f * j2 + (1.0 - f) * e3
    g2 = f * j1 + (1.0 - f) * e3
    return eps * (e1 - g1), a * (g2 - e2), j1, j2


def quad(func, a, b, points, epsabs):
    pts = [a] + sorted(p for p in set(points) if a < p < b) + [b]
    total = 0.0
    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        for lo, hi in zip(pts[:-1], pts[1:]):
            total += integrate.quad(func, lo, hi, epsabs=epsabs, epsrel=EPSREL, limit=400)[0]
    return total


# --------------------------------------------------------------- the model
class Tpv:
    def __init__(self, case):
        (self.name, self.emitter, self.te, gaps, self.connection, self.f, self.refl,
         self.tc, self.ere) = case
        self.gaps = list(gaps)                    # eV, top first
        self.n = len(self.gaps)
        self.gbot = self.gaps[-1]
        self.eps_lam, corners = parse_emitter(self.emitter)
        self.kte = K * self.te / Q               # eV
        self.ktc = K * self.tc / Q
        self.e_top = max(TAIL_KT * self.kte, self.gaps[0] + TAIL_KT * self.ktc)
        pts = set(self.gaps) | {HC_EV_UM / lam for lam in corners}
        pts |= {g + n * self.ktc for g in self.gaps for n in SPLIT_N}
        pts |= {n * self.kte for n in SPLIT_N}
        self.points = sorted(pts)
        # natural scales for the absolute tolerance
        phot = PREF * (K * self.te) ** 3 * 2.4041138063191885    # m^-2 s^-1
        self.abs_j = EPSABS_REL * phot / Q        # photon integrals over u [eV]
        self.abs_h = EPSABS_REL * sq.SIGMA_SB * self.te ** 4 / Q
        self.h_below = self._h_band(0.0, self.gbot, 0.0)
        self.jgen = [self._jgen(i) for i in range(self.n)]

    # optical data at photon energy u [eV]
    def eps(self, u):
        return self.eps_lam(HC_EV_UM / u)

    def absorptance(self, u):
        return 1.0 if u >= self.gbot else 1.0 - self.refl

    def upper(self, i):
        return self.e_top if i == 0 else self.gaps[i - 1]

    def fluxes(self, u, v):
        """(q1, q2, J1, J2) at photon energy u [eV] with mu = qV (v in V)."""
        e = u * Q
        return exchange(self.eps(u), self.absorptance(u), self.f,
                        phi(e, self.te, 0.0), phi(e, self.tc, v * Q), phi(e, self.tc, 0.0))

    # band integrals (du in eV, dE = Q du)
    def _jgen(self, i):
        def f(u):
            return self.fluxes(u, 0.0)[1]
        return Q * Q * quad(f, self.gaps[i], self.upper(i), self.points, self.abs_j)

    def _h_band(self, lo, hi, v):
        def f(u):
            return u * Q * self.fluxes(u, v)[0]
        return Q * quad(f, lo, hi, self.points, self.abs_h)

    def h_band(self, i, v):
        return self._h_band(self.gaps[i], self.upper(i), v)

    def dh_band(self, i, v):
        """d H_i / dV: the system solved with the source (0, d e2/dV, 0)."""
        def f(u):
            e = u * Q
            de2 = dphi_dmu(e, self.tc, v * Q) * Q
            return e * exchange(self.eps(u), 1.0, self.f, 0.0, de2, 0.0)[0]
        return Q * quad(f, self.gaps[i], self.upper(i), self.points, self.abs_h)

    def jdark(self, i, v):
        """(q/ERE) int_{g_i} [q2(E;0) - q2(E;qV)] dE via the source (0, e2(0)-e2(qV), 0)."""
        if v == 0.0:
            return 0.0

        def f(u):
            e = u * Q
            drop = phi_drop(e, self.tc, v * Q)
            return exchange(self.eps(u), 1.0, self.f, 0.0, drop, 0.0)[1]
        g = self.gaps[i]
        return Q * Q / self.ere * quad(f, g, g + TAIL_KT * self.ktc, self.points, self.abs_j)

    def djdark(self, i, v):
        def f(u):
            e = u * Q
            de2 = dphi_dmu(e, self.tc, v * Q)
            return -exchange(self.eps(u), 1.0, self.f, 0.0, de2, 0.0)[1]
        g = self.gaps[i]
        return Q * Q * Q / self.ere * quad(f, g, g + TAIL_KT * self.ktc, self.points, self.abs_j / (K * self.tc))

    def current(self, i, v):
        return self.jgen[i] - self.jdark(i, v)

    def heat(self, vs):
        return self.h_below + sum(self.h_band(i, v) for i, v in enumerate(vs))

    # ------------------------------------------------------------ solvers
    def voc(self, i):
        g = self.gaps[i]
        d = 1.0
        while True:
            v_hi = g - d * self.ktc
            if v_hi > 0.0 and self.current(i, v_hi) < 0.0:
                break
            d /= 10.0
            if d < 1e-12:
                raise RuntimeError("no Voc bracket")
        return optimize.brentq(lambda v: self.current(i, v), 0.0, v_hi,
                               xtol=XTOL_V, rtol=RTOL, maxiter=200)

    def dpdv(self, i, v):
        return self.current(i, v) - v * self.djdark(i, v)

    def mpp(self, i, voc):
        return optimize.brentq(lambda v: self.dpdv(i, v), 0.0, voc,
                               xtol=XTOL_V, rtol=RTOL, maxiter=200)

    def v_of_j(self, i, j, voc):
        if j >= self.jgen[i]:
            return 0.0
        return optimize.brentq(lambda v: self.current(i, v) - j, 0.0, voc,
                               xtol=XTOL_V, rtol=RTOL, maxiter=200)

    def solve(self):
        vocs = [self.voc(i) for i in range(self.n)]
        out = {"voc": sum(vocs), "checks": {}}
        if self.connection in ("single", "independent"):
            vmps = [self.mpp(i, vocs[i]) for i in range(self.n)]
            p = sum(v * self.current(i, v) for i, v in enumerate(vmps))
            heat = self.heat(vmps)
            out.update(p=p, heat=heat, jsc=sum(self.jgen), vs=vmps,
                       vmp=vmps[0] if self.connection == "single" else None)
            # cross-check: bounded minimisation of -P_i
            p_chk = 0.0
            for i in range(self.n):
                r = optimize.minimize_scalar(lambda v: -v * self.current(i, v), bounds=(0.0, vocs[i]),
                                             method="bounded", options={"xatol": 1e-12})
                p_chk += -r.fun
            out["checks"]["pmax bounded vs brentq (rel)"] = abs(p_chk - p) / p
            out["max_eff"] = self.max_eff_independent(vmps, vocs, out)
        else:
            jmin = min(self.jgen)
            j_hi = jmin * (1.0 - 1e-9)

            def volts(j):
                return [self.v_of_j(i, j, vocs[i]) for i in range(self.n)]

            def dvdj(vs):
                return [-1.0 / self.djdark(i, v) for i, v in enumerate(vs)]

            def dpdj(j):
                vs = volts(j)
                return sum(vs) + j * sum(dvdj(vs))
            jmp = optimize.brentq(dpdj, 1e-6 * jmin, j_hi, xtol=1e-13 * jmin, rtol=RTOL, maxiter=200)
            vs = volts(jmp)
            p = jmp * sum(vs)
            heat = self.heat(vs)
            out.update(p=p, heat=heat, jsc=jmin, vmp=sum(vs), vs=vs)
            r = optimize.minimize_scalar(lambda j: -j * sum(volts(j)), bounds=(1e-6 * jmin, j_hi),
                                         method="bounded", options={"xatol": 1e-12 * jmin})
            out["checks"]["pmax bounded vs brentq (rel)"] = abs(-r.fun - p) / p

            def dratio(j):
                vs = volts(j)
                dv = dvdj(vs)
                pj = j * sum(vs)
                dp = sum(vs) + j * sum(dv)
                dh = sum(self.dh_band(i, v) * dv[i] for i, v in enumerate(vs))
                return dp * self.heat(vs) - pj * dh
            jme = optimize.brentq(dratio, 1e-6 * jmin, j_hi, xtol=1e-13 * jmin, rtol=RTOL, maxiter=200)
            vs = volts(jme)
            out["max_eff"] = jme * sum(vs) / self.heat(vs)
            r = optimize.minimize_scalar(lambda j: -j * sum(volts(j)) / self.heat(volts(j)),
                                         bounds=(1e-6 * jmin, j_hi), method="bounded",
                                         options={"xatol": 1e-12 * jmin})
            out["checks"]["max_eff bounded vs brentq (rel)"] = abs(-r.fun - out["max_eff"]) / out["max_eff"]
        out["eff"] = out["p"] / out["heat"]
        return out

    def max_eff_independent(self, vmps, vocs, out):
        """Dinkelbach: lambda <- P(V)/heat(V), V = argmax P - lambda heat (separable per band)."""
        lam = sum(v * self.current(i, v) for i, v in enumerate(vmps)) / self.heat(vmps)
        vs = list(vmps)
        for _ in range(60):
            vs = []
            for i in range(self.n):
                def g(v, i=i):
                    return self.dpdv(i, v) - lam * self.dh_band(i, v)
                vs.append(optimize.brentq(g, 0.0, vocs[i], xtol=XTOL_V, rtol=RTOL, maxiter=200))
            new = sum(v * self.current(i, v) for i, v in enumerate(vs)) / self.heat(vs)
            done = abs(new - lam) <= 1e-15 * new
            lam = new
            if done:
                break
        # cross-checks: 1-D bounded search (single) or Nelder-Mead on the voltage vector
        def ratio(x):
            x = list(x)
            if any(not (0.0 < v < vocs[i]) for i, v in enumerate(x)):
                return 0.0
            return -sum(v * self.current(i, v) for i, v in enumerate(x)) / self.heat(x)
        if self.n == 1:
            r = optimize.minimize_scalar(lambda v: ratio([v]), bounds=(0.0, vocs[0]),
                                         method="bounded", options={"xatol": 1e-12})
            chk = -r.fun
        else:
            r = optimize.minimize(ratio, np.array(vmps), method="Nelder-Mead",
                                  options={"xatol": 1e-10, "fatol": 1e-16, "maxiter": 4000})
            chk = -r.fun
        name = "max_eff bounded vs Dinkelbach (rel)" if self.n == 1 else "max_eff Nelder-Mead vs Dinkelbach (rel)"
        out["checks"][name] = abs(chk - lam) / lam
        return lam


# ------------------------------------------------------------ self checks
def pointwise_checks():
    """Radiosity solution against the F = 1 closed form, numpy.linalg.solve, superposition
    and energy conservation, at a few energies, emissivities and chemical potentials."""
    worst = {"F=1 tau form (rel)": 0.0, "Cramer vs numpy.linalg.solve (rel)": 0.0,
             "energy conservation (rel)": 0.0, "superposition vs two solves (rel)": 0.0}
    te, tc = 2000.0, 300.0
    for u in (0.3, 0.55, 0.74, 0.9, 1.3, 2.5):
        e = u * Q
        for eps in (1.0, 0.8, 0.15, 0.03):
            for a in (1.0, 0.05, 0.5):
                for mu_ev in (0.0, 0.2, 0.5):
                    if mu_ev >= u:
                        continue
                    e1, e2, e3 = phi(e, te, 0.0), phi(e, tc, mu_ev * Q), phi(e, tc, 0.0)
                    q1, q2, _, _ = exchange(eps, a, 1.0, e1, e2, e3)
                    tau = eps * a / (1.0 - (1.0 - eps) * (1.0 - a))
                    ref = tau * (e1 - e2)
                    worst["F=1 tau form (rel)"] = max(worst["F=1 tau form (rel)"],
                                                      abs(q1 - ref) / abs(ref), abs(q2 - ref) / abs(ref))
                    for f in (1.0, 0.9, 0.5, 0.0):
                        q1, q2, j1, j2 = exchange(eps, a, f, e1, e2, e3)
                        n1, n2, _, _ = exchange_numpy(eps, a, f, e1, e2, e3)
                        worst["Cramer vs numpy.linalg.solve (rel)"] = max(
                            worst["Cramer vs numpy.linalg.solve (rel)"],
                            max(abs(q1 - n1), abs(q2 - n2)) / max(abs(q1), abs(q2)))
                        rest = (1.0 - f) * (j1 - e3) + (1.0 - f) * (j2 - e3)
                        worst["energy conservation (rel)"] = max(
                            worst["energy conservation (rel)"],
                            abs(q1 - q2 - rest) / max(abs(q1), abs(q2), abs(rest)))
                        if mu_ev > 0.0:
                            d_direct = exchange(eps, a, f, e1, e3, e3)[1] - q2
                            d_super = exchange(eps, a, f, 0.0, phi_drop(e, tc, mu_ev * Q), 0.0)[1]
                            # relative to the larger of the two solves being subtracted
                            scale = max(abs(q2), abs(d_direct + q2))
                            worst["superposition vs two solves (rel)"] = max(
                                worst["superposition vs two solves (rel)"],
                                abs(d_direct - d_super) / scale)
    return worst


def blackbody_checks(model):
    """F = 1 blackbody emitter: q2 = e1 - e3 above the bottom gap and
    q1 = (1-R)(e1 - e3) below it, so Jgen and the sub-gap heat are Bose integrals."""
    ckt, hkt = K * model.tc, K * model.te
    worst = 0.0
    edges = [math.inf] + model.gaps
    for i in range(model.n):
        def g2(x_lo_e, x_hi_e, kt):
            return PREF * kt ** 3 * sq.bose_integral(2, x_lo_e / kt, x_hi_e / kt)
        lo, hi = edges[i + 1] * Q, edges[i] * Q
        ref = Q * (g2(lo, hi, hkt) - g2(lo, hi, ckt))
        worst = max(worst, abs(model.jgen[i] - ref) / ref)
    gb = model.gbot * Q
    ref = (1.0 - model.refl) * PREF * (hkt ** 4 * sq.bose_integral(3, 0.0, gb / hkt)
                                       - ckt ** 4 * sq.bose_integral(3, 0.0, gb / ckt))
    worst = max(worst, abs(model.h_below - ref) / ref)
    return worst


def log_variable_check(model, vs):
    """Jgen_i, the sub-gap heat and heat_in recomputed by quad over s = ln(E/eV) (dE = E ds),
    a different node placement from the energy-variable integrals."""
    pts = [math.log(p) for p in model.points if p > 0.0]
    s_lo = math.log(1e-8)   # the sub-gap heat below 1e-8 eV is ~(1e-8 eV / kTe)^3 / 20 < 1e-23 relative

    def sq_int(func, lo, hi, absscale):
        return quad(lambda s: func(math.exp(s)) * math.exp(s), math.log(lo) if lo > 0 else s_lo,
                    math.log(hi), pts, absscale)
    worst = 0.0
    for i in range(model.n):
        j = Q * Q * sq_int(lambda u: model.fluxes(u, 0.0)[1], model.gaps[i], model.upper(i), model.abs_j)
        worst = max(worst, abs(j - model.jgen[i]) / model.jgen[i])
    hb = Q * sq_int(lambda u: u * Q * model.fluxes(u, 0.0)[0], 0.0, model.gbot, model.abs_h)
    worst = max(worst, abs(hb - model.h_below) / model.h_below)
    ht = hb + sum(Q * sq_int(lambda u, v=v: u * Q * model.fluxes(u, v)[0], model.gaps[i], model.upper(i),
                             model.abs_h) for i, v in enumerate(vs))
    ref = model.heat(vs)
    return max(worst, abs(ht - ref) / ref)


def main():
    t0 = time.time()
    checks = pointwise_checks()
    for k, v in checks.items():
        print(f"  {k}: {v:.2e}")
    rows = []
    for case in CASES:
        t1 = time.time()
        m = Tpv(case)
        res = m.solve()
        res["checks"]["Jgen, heat by quad over ln E (rel)"] = log_variable_check(m, res["vs"])
        if m.emitter == "blackbody" and m.f == 1.0:
            d = blackbody_checks(m)
            res["checks"]["Jgen, subgap heat vs Bose integrals (rel)"] = d
        for k, v in res["checks"].items():
            checks[k] = max(checks.get(k, 0.0), v)
        name, emitter, te, gaps, conn, f, refl, tc, ere = case
        rows.append([name, emitter, sq.fmt(te), ";".join(sq.fmt(g) for g in gaps), conn, sq.fmt(f),
                     sq.fmt(refl), sq.fmt(tc), sq.fmt(ere), sq.fmt(res["eff"]), sq.fmt(res["p"] / 1e4),
                     sq.fmt(res["heat"] / 1e4), sq.fmt(m.h_below / 1e4), sq.fmt(res["jsc"] / 1e4),
                     sq.fmt(res["voc"]), "" if res["vmp"] is None else sq.fmt(res["vmp"]),
                     sq.fmt(res["max_eff"])])
        print(f"  {name}: eff {res['eff']:.10f} P {res['p'] / 1e4:.8f} W/cm2 heat {res['heat'] / 1e4:.8f} "
              f"Voc {res['voc']:.9f} max_eff {res['max_eff']:.10f}  "
              + " ".join(f"[{k} {v:.1e}]" for k, v in res["checks"].items())
              + f" ({time.time() - t1:.1f} s)")

    sq.FIXTURE_DIR.mkdir(parents=True, exist_ok=True)
    out = sq.FIXTURE_DIR / "tpv_reference.csv"
    with open(out, "w", encoding="utf-8", newline="") as fh:
        fh.write("# thermophotovoltaic emitter-cell pairs: generalized Planck law, net-radiation method per\n")
        fh.write("# photon energy (emitter, cell, black surroundings at the cell temperature), detailed balance\n")
        fh.write("# generated by: python3 tests/reference/gen_tpv.py\n")
        fh.write(f"# accuracy: scipy quad epsrel={EPSREL:g} split at gaps, edges, g+n kTc, n kTe; "
                 f"emitter terms to max(60 kTe, g1+60 kTc), dark terms to g+60 kTc; brentq xtol 1e-15 V\n")
        for k, v in checks.items():
            fh.write(f"# check: {k} {v:.2e}\n")
        fh.write("# units: efficiencies fractions; W/cm^2, A/cm^2 (SI / 1e4); V; gaps top first, ';'-separated\n")
        fh.write("case,emitter,emitter_temp_k,gaps_ev,connection,view_factor,subgap_reflectance,cell_temp_k,"
                 "ere,efficiency,pmax_w_cm2,heat_in_w_cm2,subgap_heat_w_cm2,jsc_a_cm2,voc_v,vmp_v,"
                 "max_efficiency\n")
        csv.writer(fh, lineterminator="\n", quoting=csv.QUOTE_MINIMAL).writerows(rows)
    print(f"wrote {out} ({len(rows)} rows) in {time.time() - t0:.1f} s")
    print(f"largest self-consistency difference: {max(checks.values()):.2e} "
          f"({max(checks, key=checks.get)})")


if __name__ == "__main__":
    main()
