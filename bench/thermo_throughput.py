"""Benchmark 1: harmonic thermochemistry throughput.

10,000 species x 1,000 temperatures x 30 harmonic modes: S, H, Cp and G of
every species at every temperature. Baseline: the same vibrational sums as one
direct numpy expression per block of species (the full problem at once would
need ~2.4 GB per temporary array; both sides process the same species blocks).
Target: ours within 1.5x of that floor.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.partition.vibration import harmonic
from bench.harness import Result, median_time, peak_memory_mb

BLOCK = 500  # species per block, same for ours and the baseline


def _problem(n_species, n_t, n_modes, seed=0):
    rng = np.random.default_rng(seed)
    freqs = rng.uniform(30.0, 3500.0, size=(n_species, n_modes))
    temps = np.linspace(100.0, 2000.0, n_t)
    return freqs, temps


def ours(freqs, temps, energies):
    t = temps[:, None]
    out = []
    for i in range(0, freqs.shape[0], BLOCK):
        c = harmonic(t, freqs[i:i + BLOCK])
        e = energies[i:i + BLOCK]
        h = e + c.zpe + c.energy
        s = c.entropy
        out.append((s, h, c.heat_capacity, h - t * s))
    return out


def baseline(freqs, temps, energies):
    t = temps[:, None, None]
    k = C.kB_eV
    out = []
    for i in range(0, freqs.shape[0], BLOCK):
        nu = freqs[i:i + BLOCK][None, :, :]
        x = nu * C.invcm_K / t
        e = np.exp(-x)
        om = 1.0 - e
        r = e / om
        s = k * np.sum(x * r - np.log(om), axis=-1)
        h = energies[i:i + BLOCK] + 0.5 * C.invcm_eV * nu.sum(axis=-1) + k * temps[:, None] * np.sum(x * r, axis=-1)
        cp = k * np.sum(x * x * r / om, axis=-1)
        out.append((s, h, cp, h - temps[:, None] * s))
    return out


def run(quick=False, repeats=3):
    n_species = 1000 if quick else 10_000
    freqs, temps = _problem(n_species, 1000, 30)
    energies = np.zeros(n_species)
    # same answers (checked on the first block)
    a, b = ours(freqs[:BLOCK], temps, energies[:BLOCK])[0], baseline(freqs[:BLOCK], temps, energies[:BLOCK])[0]
    for x, y in zip(a, b):
        np.testing.assert_allclose(x, y, rtol=1e-9, atol=1e-14)
    t_ours = median_time(lambda: ours(freqs, temps, energies), repeats)
    t_base = median_time(lambda: baseline(freqs, temps, energies), repeats)
    res = Result(name=f"thermo throughput ({n_species} species x 1000 T x 30 modes)", ours_s=t_ours,
                 baseline_s=t_base, baseline="direct numpy expression, same blocks",
                 target="ratio <= 1.5", target_met=t_ours <= 1.5 * t_base)
    res.extra["peak_memory_MB_ours_1000_species"] = peak_memory_mb(lambda: ours(freqs[:1000], temps, energies[:1000]))
    res.extra["peak_memory_MB_baseline_1000_species"] = peak_memory_mb(
        lambda: baseline(freqs[:1000], temps, energies[:1000]))
    return res


def scaling(sizes=(100, 300, 1000, 3000)):
    """Time of ours vs number of species (1000 T, 30 modes)."""
    out = []
    for n in sizes:
        freqs, temps = _problem(n, 1000, 30)
        energies = np.zeros(n)
        out.append((n, median_time(lambda: ours(freqs, temps, energies), 2)))
    return out
