"""Shared numerics for the Glowgap Python reference scripts.

This module is imported by the generator scripts in tests/reference/; it is
not run on its own.  It is deliberately independent of the Rust code and
uses only numpy and scipy.

Formula sources
---------------
* Constants: exact SI values of the 2019 SI redefinition (BIPM SI Brochure,
  9th ed., 2019); solar radius: IAU 2015 Resolution B3 nominal value;
  astronomical unit: IAU 2012 Resolution B2.
* Bose integral G_n(x1, x2) = int_{x1}^{x2} x^n / (e^x - 1) dx: the standard
  reduction of Planck's law (M. Planck, Ann. Phys. 4, 553 (1901)).
* Generalized Planck law with a chemical potential mu of the photons:
  P. Wurfel, J. Phys. C 15, 3967 (1982).
* Stefan-Boltzmann constant sigma = 2 pi^5 k^4 / (15 h^3 c^2).
* Tabulated spectra: ASTM G173-03, "Standard Tables for Reference Solar
  Spectral Irradiances: Direct Normal and Hemispherical on 37 deg Tilted
  Surface" (ASTM International, 2003/2012).

Accuracy settings (used by every quad call below)
-------------------------------------------------
scipy.integrate.quad with epsabs=0, epsrel=1e-13, limit=200; an
IntegrationWarning is turned into an exception, so every value that reaches
a fixture met the requested relative tolerance.
"""

import math
import warnings
from pathlib import Path

import numpy as np
from scipy import integrate

# ---------------------------------------------------------------- constants
H_PLANCK = 6.62607015e-34      # J s (exact)
C_LIGHT = 299792458.0          # m / s (exact)
K_BOLTZ = 1.380649e-23         # J / K (exact)
Q_ELEM = 1.602176634e-19       # C (exact)
R_SUN_M = 6.957e8              # m, IAU 2015 nominal solar radius
AU_M = 1.495978707e11          # m, IAU 2012 astronomical unit

SIGMA_SB = 2.0 * math.pi ** 5 * K_BOLTZ ** 4 / (15.0 * H_PLANCK ** 3 * C_LIGHT ** 2)
SUN_DILUTION = (R_SUN_M / AU_M) ** 2          # f = (R_sun / au)^2
MAX_CONCENTRATION = 1.0 / SUN_DILUTION          # 1 / f

QUAD_EPSABS = 0.0
QUAD_EPSREL = 1e-13
QUAD_LIMIT = 200
QUAD_SETTINGS_TEXT = (
    f"scipy.integrate.quad epsabs={QUAD_EPSABS:g} epsrel={QUAD_EPSREL:g} "
    f"limit={QUAD_LIMIT}; range split at t=d*10^j (d<1) and t=0.5,1,2,...,128; "
    "IntegrationWarning treated as error"
)

REPO_ROOT = Path(__file__).resolve().parents[2]
G173_PATH = REPO_ROOT / "src" / "physics" / "data" / "astm_g173_03.csv"
FIXTURE_DIR = REPO_ROOT / "tests" / "fixtures"


def fmt(value):
    """Shortest round-trip decimal text for a float (inf -> 'inf')."""
    value = float(value)
    if math.isinf(value):
        return "inf" if value > 0 else "-inf"
    return repr(value)


def _quad(func, a, b):
    with warnings.catch_warnings():
        warnings.simplefilter("error", integrate.IntegrationWarning)
        val, err = integrate.quad(func, a, b, epsabs=QUAD_EPSABS,
                                  epsrel=QUAD_EPSREL, limit=QUAD_LIMIT)
    return val, err


def _split_points(span, d):
    """Break points in the shifted variable t in [0, span]."""
    pts = [0.0]
    if d < 1.0:
        # near-singular 1/(d + t) behaviour close to t = 0
        step = max(d, 1e-300)
        while step < 0.5:
            if step < span:
                pts.append(step)
            step *= 10.0
    for p in (0.5, 1.0, 2.0, 4.0, 8.0, 16.0, 32.0, 64.0, 128.0):
        if pts[-1] < p < span:
            pts.append(p)
    pts.append(span)
    return pts


def shifted_bose_integral(n, x_lo, span, d, power=1):
    """Return S with  int_{x_lo}^{x_lo+span} x^n e^{-(x-m)} / (1-e^{-(x-m)})^power dx
    = e^{-d} * S,  where d = x_lo - m >= 0 (m = reduced chemical potential).

    power=1 gives the occupation 1/(e^{x-m}-1); power=2 gives
    e^{x-m}/(e^{x-m}-1)^2, the derivative of the occupation with respect to m.
    The common factor e^{-d} is kept outside so that the integrand is O(x^n)
    even for very large x_lo.  span may be math.inf.
    """
    if span <= 0.0:
        return 0.0

    def integrand(t):
        if t > 1.0e4:
            return 0.0              # e^{-t} underflows; avoids inf * 0
        z = d + t
        if z == 0.0:
            # limit of t^n e^{-t} / t^power at t -> 0 with x_lo = d = 0
            return 0.0 if n > power else (1.0 if n == power else math.inf)
        return (x_lo + t) ** n * math.exp(-t) / (-math.expm1(-z)) ** power

    pts = _split_points(span, d)
    total = 0.0
    for a, b in zip(pts[:-1], pts[1:]):
        total += _quad(integrand, a, b)[0]
    return total


def bose_integral(n, x_lo, x_hi):
    """G_n(x_lo, x_hi) = int_{x_lo}^{x_hi} x^n / (e^x - 1) dx, x_hi may be inf."""
    if x_hi <= x_lo:
        return 0.0
    span = math.inf if math.isinf(x_hi) else x_hi - x_lo
    return math.exp(-x_lo) * shifted_bose_integral(n, x_lo, span, x_lo)


def bose_integral_series(n, x_lo):
    """Independent check value of G_n(x_lo, inf) without quadrature.

    x_lo >= 1: G_n(x, inf) = sum_k e^{-kx} n! sum_j x^j / (j! k^{n-j+1}).
    x_lo <  1: G_n(x, inf) = n! zeta(n+1) - sum_k B_k x^{n+k} / (k! (n+k)),
               from the Bernoulli expansion t/(e^t - 1) = sum_k B_k t^k / k!.
    """
    from scipy.special import bernoulli, zeta
    if x_lo < 1.0:
        total = math.factorial(n) * float(zeta(n + 1))
        b = bernoulli(40)
        partial = 0.0
        for k in range(41):
            partial += float(b[k]) * x_lo ** (n + k) / (math.factorial(k) * (n + k))
        return total - partial
    total = 0.0
    k = 1
    while True:
        poly = sum(math.factorial(n) / math.factorial(j) * x_lo ** j / k ** (n - j + 1)
                   for j in range(n + 1))
        term = math.exp(-k * x_lo) * poly
        total += term
        if term < 1e-18 * total:
            break
        k += 1
    return total


# ------------------------------------------------------------ ASTM G173-03
def load_g173():
    """Return dict column -> (wavelength_nm, irradiance W m^-2 nm^-1)."""
    with open(G173_PATH, "r", encoding="utf-8") as fh:
        fh.readline()                      # title line
        header = [h.strip() for h in fh.readline().split(",")]
        data = np.loadtxt(fh, delimiter=",")
    lam = data[:, header.index("wavelength")]
    cols = {}
    for name in ("extraterrestrial", "global", "direct"):
        cols[name] = (lam, data[:, header.index(name)])
    return cols


class TabulatedSpectrum:
    """Trapezoid integration on the table's own wavelength points."""

    def __init__(self, lam_nm, irr):
        self.lam = np.asarray(lam_nm, dtype=float)
        self.irr = np.asarray(irr, dtype=float)
        # photons m^-2 s^-1 nm^-1 : I_lambda * lambda / (h c), lambda in m
        self.photons = self.irr * (self.lam * 1e-9) / (H_PLANCK * C_LIGHT)
        self.total_power = float(np.trapezoid(self.irr, self.lam))

    def photon_flux_above(self, gap_j):
        """Photon flux (m^-2 s^-1) at photon energies >= gap, i.e. lambda <= hc/Eg."""
        lam_g = H_PLANCK * C_LIGHT / gap_j * 1e9
        lam, s = self.lam, self.photons
        idx = int(np.searchsorted(lam, lam_g, side="right"))   # points with lam <= lam_g
        if idx == 0:
            return 0.0
        full = float(np.trapezoid(s[:idx], lam[:idx])) if idx > 1 else 0.0
        if idx == len(lam):
            return full
        l0, l1 = lam[idx - 1], lam[idx]
        s_g = s[idx - 1] + (s[idx] - s[idx - 1]) * (lam_g - l0) / (l1 - l0)
        return full + 0.5 * (s[idx - 1] + s_g) * (lam_g - l0)


class BlackbodySun:
    """Sun as a blackbody disc of temperature ts_k seen from 1 au."""

    def __init__(self, ts_k):
        self.ts = float(ts_k)
        kt = K_BOLTZ * self.ts
        self.flux_scale = (SUN_DILUTION * 2.0 * math.pi * kt ** 3
                           / (H_PLANCK ** 3 * C_LIGHT ** 2))
        self.total_power = SUN_DILUTION * SIGMA_SB * self.ts ** 4

    def photon_flux_above(self, gap_j):
        return self.flux_scale * bose_integral(2, gap_j / (K_BOLTZ * self.ts), math.inf)


# ------------------------------------------------- thin-film helpers
def forward_q(n, s):
    """N cos(theta) on the forward branch: Im q >= 0, and Re q > 0 if real."""
    import numpy as np

    q = np.sqrt(complex(n) ** 2 - complex(s * s, 0.0))
    if q.imag < 0.0 or (q.imag == 0.0 and q.real < 0.0):
        q = -q
    return q


def tilted_admittance(pol, n, q):
    """The tilted admittance: q for s, N^2 / q for p (free-space units)."""
    return q if pol == "s" else complex(n) ** 2 / q
