"""Benchmark 2: coverage maps with lateral interactions.

500 x 500 (T, p) grid, 4 competing species, one of them dissociative, with a
mean-field interaction matrix (invented numbers). Baseline:
scipy.optimize.root called point by point on a 20 x 20 sub-grid, scaled per
point. Target: at least 100x faster per point, same answers to 1e-10.
"""

from __future__ import annotations

import time

import numpy as np
from scipy.optimize import root

from adsorb import constants as C
from adsorb.coverage import site_coverages
from bench.harness import Result, median_time, peak_memory_mb

# invented adsorption enthalpies (eV) and entropies (eV/K) per gas molecule, and mole fractions
DH = np.array([-1.10, -0.85, -0.60, -0.75])
DS = np.array([-1.9e-3, -1.4e-3, -1.7e-3, -1.5e-3])
Y = np.array([0.2, 0.5, 0.1, 0.2])
DISSOCIATIVE = [False, True, False, False]
EPS = np.array([[0.20, 0.05, 0.08, 0.06],      # invented, repulsive (eV), symmetric
                [0.05, 0.10, 0.04, 0.05],
                [0.08, 0.04, 0.15, 0.07],
                [0.06, 0.05, 0.07, 0.12]])


def grid(n):
    t = np.linspace(400.0, 900.0, n)
    p = np.logspace(2, 6, n)
    K = np.exp(-(DH[:, None] - t[None, :] * DS[:, None]) / (C.kB_eV * t[None, :])) / C.P_STANDARD
    return t, p, K


def ours(n):
    t, p, K = grid(n)
    return site_coverages(K[:, :, None], Y[:, None, None] * p[None, None, :], dissociative=DISSOCIATIVE,
                          interactions=EPS, temperature=t[:, None])


def _point(Kc, pc, T):
    kt = C.kB_eV * T
    c = np.where(DISSOCIATIVE, np.sqrt(Kc * pc), Kc * pc)

    def f(theta):
        empty = 1.0 - theta.sum()
        return theta - c * empty * np.exp(-EPS @ theta / kt)

    guess = c / (1.0 + c.sum())
    sol = root(f, guess, method="hybr", options={"xtol": 1e-14})
    return sol.x


def baseline(n_sub, n_full):
    t, p, K = grid(n_full)
    it = np.linspace(0, n_full - 1, n_sub).astype(int)
    ip = np.linspace(0, n_full - 1, n_sub).astype(int)
    out = np.empty((4, n_sub, n_sub))
    for a, i in enumerate(it):
        for b, j in enumerate(ip):
            out[:, a, b] = _point(K[:, i], Y * p[j], t[i])
    return it, ip, out


def run(quick=False, repeats=3):
    n = 200 if quick else 500
    n_sub = 20
    sol = ours(n)
    it, ip, ref = baseline(n_sub, n)
    max_diff = float(np.max(np.abs(sol.coverage[:, it][:, :, ip] - ref)))
    t_ours = median_time(lambda: ours(n), repeats) / (n * n)
    start = time.perf_counter()
    baseline(n_sub, n)
    t_base = (time.perf_counter() - start) / (n_sub * n_sub)
    res = Result(name=f"coverage map per point ({n}x{n}, 4 species, 1 dissociative, interactions)",
                 ours_s=t_ours, baseline_s=t_base, baseline="scipy.optimize.root point by point (20x20 sub-grid)",
                 target="speed-up >= 100x, answers within 1e-10",
                 target_met=(t_base / t_ours >= 100.0) and max_diff <= 1e-10)
    res.extra.update(speedup=t_base / t_ours, max_abs_difference=max_diff, total_map_s=t_ours * n * n,
                     peak_memory_MB=peak_memory_mb(lambda: ours(n)), grid_array_MB=n * n * 8 / 1e6)
    return res


def scaling(sizes=(50, 100, 200, 400)):
    return [(n * n, median_time(lambda: ours(n), 2)) for n in sizes]
