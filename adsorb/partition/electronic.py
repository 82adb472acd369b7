"""Electronic partition function: ground-level degeneracy and excited levels.

q = g_0 + Σ_i g_i exp(-ε_i/kT), energies ε_i measured from the ground level.

Source: D. A. McQuarrie, *Statistical Mechanics* (Harper & Row, 1976),
sec. 5-4 (electronic partition function; two-level example of NO).
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition.checks import positive_array as _positive
from adsorb.partition.contribution import Contribution

__all__ = ["electronic"]



def _levels_array(degeneracy, levels):
    """(degeneracies, energies in K) including the ground level, validated."""
    try:
        g0 = float(degeneracy)
    except (TypeError, ValueError):
        g0 = float("nan")
    if not (np.isfinite(g0) and g0 > 0):
        raise InputError(f"degeneracy must be a positive number; got {degeneracy!r}")
    rows = [] if levels is None else list(levels)
    g = [g0]
    eps = [0.0]
    for i, row in enumerate(rows):
        try:
            gi, ei = row
            gi, ei = float(gi), float(ei)
        except (TypeError, ValueError):
            raise InputError(
                f"levels[{i}] must be a pair (degeneracy, energy_cm); got {row!r}") from None
        if not (np.isfinite(gi) and gi > 0):
            raise InputError(f"levels[{i}] degeneracy must be > 0; got {gi!r}")
        if not (np.isfinite(ei) and ei >= 0):
            raise InputError(
                f"levels[{i}] energy must be >= 0 cm^-1 above the ground level; got {ei!r}")
        g.append(gi)
        eps.append(ei * C.invcm_K)
    return np.array(g), np.array(eps)


def electronic(temperature, degeneracy=1, levels=None) -> Contribution:
    """Electronic levels: ground degeneracy plus optional excited levels.

    q = g_0 + Σ g_i exp(-ε_i/kT); U = <ε>; S = k ln q + U/T;
    Cv = (<ε^2> - <ε>^2)/(kT^2) (two-pass variance, no cancellation).
    Energies are counted from the ground level (the electronic energy of the
    species is the ground level's), so ``zpe`` = 0.

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), sec. 5-4.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    degeneracy : float, optional
        Degeneracy g_0 of the ground level (e.g. the spin multiplicity 2S+1
        for a Σ state).
    levels : sequence of (degeneracy, energy_cm), optional
        Excited levels: degeneracy and energy above the ground level in cm^-1.
        Example (from memory): NO, ground ²Π1/2 with g = 2 and ²Π3/2 with
        g = 2 at 121 cm^-1: ``electronic(T, 2, [(2, 121.0)])``.

    Returns
    -------
    Contribution

    Raises
    ------
    InputError
        Non-positive temperature or degeneracy, a malformed level, or a level
        below the ground level.
    """
    t = _positive("temperature", temperature, "K")
    g, eps = _levels_array(degeneracy, levels)
    if g.size == 1:
        ln_q = np.full(t.shape, np.log(g[0]))
        z = np.zeros(t.shape)
        return Contribution(ln_q, z, C.kB_eV * ln_q, z.copy(), 0.0)
    a = eps / t[..., None]                           # ε_i / kT, >= 0
    w = g * np.exp(-a)
    rest = w[..., 1:].sum(axis=-1)                   # excited levels
    q = g[0] + rest
    mean = (w * a).sum(axis=-1) / q
    dev = a - mean[..., None]
    var = (w * dev * dev).sum(axis=-1) / q
    ln_q = np.log(g[0]) + np.log1p(rest / g[0])      # accurate when q -> g_0
    energy = C.kB_eV * t * mean
    entropy = C.kB_eV * (ln_q + mean)
    heat_capacity = C.kB_eV * var
    return Contribution(ln_q, energy, entropy, heat_capacity, 0.0)
