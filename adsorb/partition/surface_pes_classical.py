"""Classical phase-space integral of the two in-plane translations on a periodic PES.

q_cl = (2π m k T / h^2) ∫∫_cell exp(-[V(x, y) - V_min]/kT) dx dy / n_sites
(M. Jørgensen and H. Grönbeck, J. Phys. Chem. C 2017, 121, 7199–7207), by the
trapezoidal rule on a regular grid, which converges exponentially for the
smooth periodic integrand. For a separable cosine potential this is the
product of two classical hindered-translator factors (L. H. Sprowl,
C. T. Campbell and L. Árnadóttir, J. Phys. Chem. C 2016, 120, 9719–9731).

Import :func:`lateral_classical` from :mod:`adsorb.partition.surface_pes`.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.errors import ConvergenceError, InputError
from adsorb.partition.contribution import Contribution
from adsorb.partition.surface_pes_fourier import KINETIC_EV, SurfacePES, _positive_scalar, _temperatures


def _curvature_bound(pes):
    recip = pes.reciprocal_A
    kc = pes.g_indices @ recip
    return float(np.sum(np.abs(pes.coefficients_eV) * (2 * np.pi) ** 2 * np.sum(kc**2, axis=1)))


def _good_size(n):
    """Smallest number >= n of the form 2^a 3^b (fast FFT sizes)."""
    best = 1 << int(np.ceil(np.log2(max(n, 1))))
    p3 = 1
    while p3 < best:
        p2 = p3
        while p2 < n:
            p2 *= 2
        best = min(best, p2)
        p3 *= 3
    return best


_MAX_GRID = 2048


def _classical_moments(pes, kt, n):
    """mean of w = exp(-(V - Vmin)/kT), <ΔV>_w and var_w(ΔV) on an n x n grid, for each kT in the array."""
    dv = pes.energy_grid(n, n) - pes.v_min_eV
    dv = np.maximum(dv, 0.0).ravel()
    out = np.empty((kt.size, 3))
    for i, kti in enumerate(kt):
        w = np.exp(-dv / kti)
        z = w.mean()
        mean = np.dot(w, dv) / (z * dv.size)
        var = np.dot(w, (dv - mean) ** 2) / (z * dv.size)
        out[i] = (z, mean, var)
    return out


def lateral_classical(temperature, pes: SurfacePES, mass_amu) -> Contribution:
    """Classical partition function of the two in-plane translations on a PES, per site.

    q_cl = (2π m k T / h^2) ∫∫_cell exp(-[V - V_min]/kT) dA / n_sites
    (Jørgensen and Grönbeck, J. Phys. Chem. C 2017, 121, 7199), with

    U = kT + <V - V_min>,  Cv = k + var(V)/(k T^2),  S = k ln q + U/T,

    the Boltzmann averages taken over the cell. The integrand is smooth and
    periodic, so the trapezoidal rule on a regular grid converges
    exponentially; the grid is chosen from the curvature bound
    Σ|c_G|(2π|G|)^2 so that the narrowest possible well (width sqrt(kT/κ)) is
    resolved, and checked against a grid of 3/4 the size (relative agreement
    1e-9 in q and in U/kT).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    pes : SurfacePES
        The surface.
    mass_amu : float
        Adsorbate mass in amu.

    Returns
    -------
    Contribution
        Measured from V_min; zpe = 0. No configurational term.

    Raises
    ------
    ConvergenceError
        The well is too narrow for a 2048 x 2048 grid at some temperature
        (very stiff surface at very low T; use a harmonic treatment there).

    Notes
    -----
    For V = (W/2)[2 - cos(2πx/b) - cos(2πy/b)] on a square cell of side b this
    equals the product of two classical hindered-translator factors
    (2π m k T)^(1/2) b/h · e^(-z) I0(z), z = W/(2kT) (Sprowl, Campbell and
    Árnadóttir, J. Phys. Chem. C 2016, 120, 9719).
    """
    if not isinstance(pes, SurfacePES):
        raise InputError(f"pes must be a SurfacePES (from pes_from_sites or pes_from_grid); got {type(pes).__name__}")
    t = _temperatures(temperature)
    m = _positive_scalar("mass_amu", mass_amu, "amu")
    kt = C.kB_eV * t.ravel()
    z = np.empty(kt.size)
    mean = np.empty(kt.size)
    var = np.empty(kt.size)
    kappa = max(_curvature_bound(pes), 1e-300)
    bmin = float(np.min(np.linalg.norm(pes.reciprocal_A, axis=1)))
    gmax = int(np.max(np.abs(pes.g_indices)))
    nmin = max(32, 4 * gmax + 4)
    sigma = np.sqrt(kt / kappa)
    need = np.maximum(nmin, np.ceil(1.3 / (sigma * bmin))).astype(int)
    sizes = np.array([_good_size(n) for n in need])
    for n in np.unique(sizes):
        sel = np.nonzero(sizes == n)[0]
        size = int(n)
        while True:
            if size > _MAX_GRID:
                tbad = t.ravel()[sel[0]]
                raise ConvergenceError(
                    f"classical lateral integral at T = {tbad:g} K needs more than a {_MAX_GRID}^2 grid "
                    f"(well width {np.sqrt(kt[sel[0]] / kappa):.3g} Å); use a harmonic model at this temperature")
            fine = _classical_moments(pes, kt[sel], size)
            coarse = _classical_moments(pes, kt[sel], max(8, (3 * size) // 4))
            dz = np.abs(fine[:, 0] - coarse[:, 0]) / fine[:, 0]
            du = np.abs(fine[:, 1] - coarse[:, 1]) / kt[sel]
            if np.all(dz < 1e-9) and np.all(du < 1e-9):
                break
            size = _good_size(int(size * 1.5) + 1)
        z[sel], mean[sel], var[sel] = fine[:, 0], fine[:, 1], fine[:, 2]
    lam2 = KINETIC_EV / (np.pi * m * kt)  # Λ^2 in Å^2 (2π m kT/h^2 = π m kT / KINETIC_EV)
    ln_q = np.log(pes.cell_area_A2 / lam2) + np.log(z) - np.log(pes.n_sites)
    energy = kt + mean
    cv = C.kB_eV + var / (C.kB_eV * t.ravel() ** 2)
    entropy = C.kB_eV * ln_q + energy / t.ravel()
    shape = t.shape
    return Contribution(ln_q=ln_q.reshape(shape), energy=energy.reshape(shape),
                        entropy=entropy.reshape(shape), heat_capacity=cv.reshape(shape), zpe=0.0)
