"""Benchmark 3: the exact quantum solvers.

1D: a CO-sized translator (28 amu, 2.77 Å, W = 0.1 eV; invented example) and
a methyl-like ring rotor, 200 temperatures 10-2000 K, basis converged
automatically. Baseline: a naive dense finite-difference Hamiltonian on a
400-point grid diagonalised with numpy.linalg.eigh (one k-point), the
textbook approach. Target: the 1D solve under 50 ms.

2D: the lateral surface of an adsorbate on an invented (111) surface
(top/bridge/fcc/hcp site energies), quantum partition function with
converged plane-wave basis and Bloch sampling. Baseline: the classical
phase-space integral on the same surface. Target: under 5 s on one core.
Also reported: S at 300 K against the convergence tolerance (basis size).
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.partition import periodic
from bench.harness import Result, median_time

TEMPS = np.linspace(10.0, 2000.0, 200)


def _dense_fd(n=400):
    # naive reference: -hbar^2/2m d2/dx2 + V on a periodic grid of one cell (k = 0 only)
    m, b, w = 28.0 * C.amu, 2.77e-10, 0.1 * C.eV
    x = np.linspace(0.0, b, n, endpoint=False)
    dx = x[1] - x[0]
    kin = C.hbar**2 / (2 * m * dx**2)
    h = np.diag(2 * kin + 0.5 * w * (1 - np.cos(2 * np.pi * x / b)))
    off = -kin * np.ones(n - 1)
    h += np.diag(off, 1) + np.diag(off, -1)
    h[0, -1] = h[-1, 0] = -kin
    return np.linalg.eigvalsh(h)


def run_1d(quick=False, repeats=5):
    terms = periodic.cosine_terms(0.1)
    f_ours = lambda: periodic.lattice_translator(TEMPS, 28.0, 2.77, terms)  # noqa: E731
    t_ours = median_time(f_ours, repeats)
    t_base = median_time(_dense_fd, repeats)
    res = Result(name="exact 1D translator, 200 T (converged basis and Bloch grid)", ours_s=t_ours,
                 baseline_s=t_base, baseline="dense finite-difference eigh, 400 points, one k-point",
                 target="< 0.050 s", target_met=t_ours < 0.05)
    conv = []
    for rtol in (1e-2, 1e-4, 1e-6, 1e-8, 1e-10):
        lv = periodic.lattice_levels(np.array([300.0, 2000.0]), 28.0, 2.77, terms, rtol=rtol)
        s = periodic.levels_contribution(np.array([300.0]), lv.energies, lv.weights).entropy[0]
        conv.append({"rtol": rtol, "plane_waves": lv.n_plane_waves, "k_points": lv.n_kpoints,
                     "S_300K_over_k": s / C.kB_eV})
    res.extra["convergence"] = conv
    ring = lambda: periodic.ring_rotor(TEMPS, 3.2, periodic.cosine_terms(0.05, 3), symmetry_number=3)  # noqa: E731
    res.extra["ring_rotor_200T_s"] = median_time(ring, repeats)
    return res


def run_2d(quick=False, repeats=3):
    from adsorb.partition import surface_pes

    # invented site energies (eV) of an O-like atom on a (111) surface, a = 2.77 Å
    pes = surface_pes.pes_from_sites("111", 2.77, {"top": 0.55, "bridge": 0.22, "fcc": 0.0, "hcp": 0.06})
    temps = np.linspace(100.0, 1000.0, 50)
    f_ours = lambda: surface_pes.lateral_quantum(temps, pes, 16.0)  # noqa: E731
    f_base = lambda: surface_pes.lateral_classical(temps, pes, 16.0)  # noqa: E731
    t_ours = median_time(f_ours, repeats)
    t_base = median_time(f_base, repeats)
    res = Result(name="exact 2D lateral surface (111), 50 T, converged basis and k-mesh", ours_s=t_ours,
                 baseline_s=t_base, baseline="classical phase-space integral, same surface",
                 target="< 5 s on one core", target_met=t_ours < 5.0)
    conv = []
    for rtol in (1e-2, 1e-3, 1e-4, 1e-6):
        s = surface_pes.lateral_quantum(np.array([300.0, 1000.0]), pes, 16.0, rtol=rtol).entropy[0]
        conv.append({"rtol": rtol, "S_300K_over_k": s / C.kB_eV})
    res.extra["convergence"] = conv
    return res


def scaling(sizes=(25, 50, 100, 200, 400)):
    terms = periodic.cosine_terms(0.1)
    return [(n, median_time(lambda: periodic.lattice_translator(np.linspace(10.0, 2000.0, n), 28.0, 2.77, terms), 3))
            for n in sizes]
