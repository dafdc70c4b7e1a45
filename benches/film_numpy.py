"""Vectorized numpy baseline: the hemispherical emissivity of a 10-layer stack.

Run with:

    python3 benches/film_numpy.py

Workload (the same as `films` in benches/core.rs): ten layers alternating N = 2.1 + 0.002i
(150 nm) and N = 1.45 + 0.01i (250 nm), first layer facing the light, on an opaque metal-like
substrate N = 0.1 + 60i, in air; 3000 wavelengths evenly spaced in ln(lambda) from 0.25 to
50 um; directions at the 12 Gauss-Legendre nodes in mu = cos(theta) on [0, 1] plus the
normal; both polarizations. The emissivity toward each direction is 1 - R (absorbing
substrate; Kirchhoff), unpolarized (the mean of s and p), and the hemispherical emissivity
is sum_j 2 mu_j w_j eps_j.

Method: the characteristic-matrix form of the transfer-matrix method (H. A. Macleod,
Thin-Film Optical Filters, ch. 2): with kz = sqrt(N^2 - sin^2 theta0) on the decaying
branch, tilted admittances eta_s = kz and eta_p = N^2 / kz, phase delta = 2 pi kz d /
lambda, [B; C] = prod_j [[cos delta, -i sin delta / eta], [-i eta sin delta, cos delta]]
[1; eta_sub] and R = |(eta0 B - C)/(eta0 B + C)|^2 -- vectorized over all wavelengths and
directions at once, with a Python loop over the ten layers only.

Prints numpy_film_seconds=<median of GLOWGAP_BENCH_REPEATS (default 5) runs after a
warm-up, compute only> and mean_hemispherical=<mean over the wavelengths>, for the check
that both sides computed the same thing.
"""

import os
import time

import numpy as np


def layers():
    out = []
    for i in range(10):
        out.append((2.1 + 0.002j, 150e-9) if i % 2 == 0 else (1.45 + 0.01j, 250e-9))
    return out


def hemispherical(lam, mu, w):
    s2 = 1.0 - mu**2  # sin^2 theta0 in air
    lam = lam[:, None]
    sub = 0.1 + 60j

    def kz(n):
        k = np.sqrt(n * n - s2 + 0j)
        return np.where((k.imag < 0) | ((k.imag == 0) & (k.real < 0)), -k, k)

    k_sub = kz(sub) * np.ones_like(lam)
    r_mean = 0.0
    for pol in ("s", "p"):
        eta_sub = k_sub if pol == "s" else sub * sub / k_sub
        b = np.ones_like(eta_sub)
        c = eta_sub
        for n, d in reversed(layers()):
            k = kz(n) * np.ones_like(lam)
            eta = k if pol == "s" else n * n / k
            delta = 2 * np.pi * k * d / lam
            cos, misin = np.cos(delta), -1j * np.sin(delta)
            b, c = cos * b + misin / eta * c, misin * eta * b + cos * c
        eta0 = kz(1.0 + 0j) * np.ones_like(lam)
        if pol == "p":
            eta0 = 1.0 / eta0
        r = np.abs((eta0 * b - c) / (eta0 * b + c)) ** 2
        r_mean = r_mean + 0.5 * r
    eps = 1.0 - r_mean
    return (eps[:, :-1] * (2.0 * mu[:-1] * w)).sum(axis=1)


def main():
    repeats = int(os.environ.get("GLOWGAP_BENCH_REPEATS", "5"))
    lam = np.exp(np.linspace(np.log(0.25e-6), np.log(50e-6), 3000))
    x, wx = np.polynomial.legendre.leggauss(12)
    mu_nodes, w = 0.5 * (x + 1.0), 0.5 * wx
    mu = np.concatenate([mu_nodes, [1.0]])
    hemispherical(lam, mu, w)
    times = []
    for _ in range(repeats):
        t = time.perf_counter()
        h = hemispherical(lam, mu, w)
        times.append(time.perf_counter() - t)
    print(f"numpy_film_seconds={sorted(times)[len(times) // 2]!r}")
    print(f"mean_hemispherical={h.mean()!r}")


if __name__ == "__main__":
    main()
