"""Quantum partition function of the two in-plane translations on a periodic PES, from converged Bloch levels.

:func:`lateral_spectrum` converges the energy window, the plane-wave cut-off
and the k-mesh of the Bloch solver (:mod:`adsorb.partition.surface_pes_bloch`)
at the requested temperatures and returns a :class:`LateralSpectrum`, whose
level moments give ln q, U, S, Cv and the zero-point energy;
:func:`lateral_quantum` does both in one call. For a separable cosine surface
this is the exact counterpart of the hindered translator of L. H. Sprowl,
C. T. Campbell and L. Árnadóttir, J. Phys. Chem. C 2016, 120, 9719–9731; the
idea of sampling the complete surface is that of M. Jørgensen and
H. Grönbeck, J. Phys. Chem. C 2017, 121, 7199–7207.

Import the public names from :mod:`adsorb.partition.surface_pes`.
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np
from scipy.special import erfc

from adsorb import constants as C
from adsorb.errors import ConvergenceError, InputError
from adsorb.partition.contribution import Contribution
from adsorb.partition.surface_pes_bloch import _kmesh, _levels_at_k, _reciprocal_ops
from adsorb.partition.surface_pes_fourier import (
    KINETIC_EV,
    SurfacePES,
    _centred,
    _positive_scalar,
    _temperatures,
)


# Number of thermal energies kT above the ground level kept in level sums:
# a level at that height weighs exp(-_THERMAL_SPAN) ~ 5e-12.
_THERMAL_SPAN = 26.0


# Half-width of the smooth switch (in units of its width w) between exact levels
# and the smoothed density of states: 0.5 erfc(5) = 7.7e-13.
_SWITCH_HALF = 5.0


@dataclass(frozen=True)
class LateralSpectrum:
    """Bloch levels of the 2D Schrödinger equation on a periodic PES, ready for thermochemistry.

    The level sum is split smoothly at the energy ``switch_centre_eV``:
    levels below it are used exactly, weighted by s(E) = erfc((E - E_c)/w)/2;
    the rest, 1 - s(E), is integrated with the k-averaged density of states
    per cell, which above V_max is the constant ρ0 = A m / (2π ħ²) to all
    orders in ħ in two dimensions (every Wigner–Kirkwood correction term is a
    derivative of δ(E - V), which vanishes for E > V_max). With E_c - 5w >= V_max
    the split is exact up to the 7.7e-13 tail of the switch; without a switch
    (``switch_width_eV`` = 0) the levels are summed up to ``levels_max_eV``.

    Attributes
    ----------
    levels_eV : ndarray
        Bloch levels (absolute energies, same zero as the PES), eV.
    weights : ndarray
        k-point weight of each level (Σ over one k-point's levels of weight = that
        k-point's share; weights sum to the number of levels per cell).
    ground_eV : float
        Lowest level; zpe = ground_eV - v_min_eV.
    v_min_eV : float
    n_sites : int
    dos_per_eV : float
        ρ0 per cell, levels per eV.
    switch_centre_eV, switch_width_eV : float
        E_c and w of the split (w = 0: no split, levels summed up to levels_max_eV).
    levels_max_eV : float
        Highest energy at which levels are trusted.
    temperature_max_K : float
        Highest temperature the spectrum was converged for.
    info : dict
        Convergence record: cut-off, basis size, k-mesh, timing.
    """

    levels_eV: np.ndarray
    weights: np.ndarray
    ground_eV: float
    v_min_eV: float
    n_sites: int
    dos_per_eV: float
    switch_centre_eV: float
    switch_width_eV: float
    levels_max_eV: float
    temperature_max_K: float
    info: dict = field(default_factory=dict)

    @property
    def zpe_eV(self) -> float:
        """Ground level above the PES minimum, eV."""
        return self.ground_eV - self.v_min_eV

    def _moments(self, kt):
        """Σ w, <E - E0>, var(E) per kT (1D array); the tail by Gauss–Legendre + closed form."""
        x = self.levels_eV - self.ground_eV
        if self.switch_width_eV > 0:
            s = 0.5 * erfc((self.levels_eV - self.switch_centre_eV) / self.switch_width_eV)
            wts = self.weights * s
            lo = self.switch_centre_eV - _SWITCH_HALF * self.switch_width_eV - self.ground_eV
            hi = self.switch_centre_eV + 7.0 * self.switch_width_eV - self.ground_eV
            nodes, gw = np.polynomial.legendre.leggauss(160)
            xe = 0.5 * (hi - lo) * nodes + 0.5 * (hi + lo)
            ge = 0.5 * (hi - lo) * gw * 0.5 * erfc(-(xe + self.ground_eV - self.switch_centre_eV)
                                                   / self.switch_width_eV)
        else:
            wts = self.weights
        out = np.empty((kt.size, 3))
        for i, kti in enumerate(kt):
            b = np.exp(-x / kti) * wts
            z0 = b.sum()
            z1 = np.dot(b, x)
            z2 = np.dot(b, x * x)
            if self.switch_width_eV > 0:
                bt = self.dos_per_eV * ge * np.exp(-xe / kti)
                z0 += bt.sum()
                z1 += np.dot(bt, xe)
                z2 += np.dot(bt, xe * xe)
                e3 = np.exp(-hi / kti) * self.dos_per_eV  # (1 - s) = 1 above hi to 1e-21
                z0 += e3 * kti
                z1 += e3 * (hi * kti + kti**2)
                z2 += e3 * (hi**2 * kti + 2 * hi * kti**2 + 2 * kti**3)
            mean = z1 / z0
            out[i] = (z0, mean, max(z2 / z0 - mean**2, 0.0))
        return out

    def contribution(self, temperature) -> Contribution:
        """Thermochemistry of the lateral motion from the levels, per site (exact level moments).

        ln q = ln[Σ_k,n w_k exp(-(E_nk - E0)/kT) / n_sites] (+ smoothed tail),
        U = <E - E0>, Cv = var(E)/(k T^2), S = k ln q + U/T, zpe = E0 - V_min.

        Raises
        ------
        InputError
            A temperature above ``temperature_max_K`` (the spectrum is not converged there).
        """
        t = _temperatures(temperature)
        if np.any(t > self.temperature_max_K * (1 + 1e-9)):
            raise InputError(f"temperature {np.max(t):g} K is above the {self.temperature_max_K:g} K this "
                             "spectrum was converged for; solve again with the higher temperature")
        kt = C.kB_eV * t.ravel()
        mom = self._moments(kt)
        ln_q = np.log(mom[:, 0]) - np.log(self.n_sites)
        energy = mom[:, 1]
        cv = mom[:, 2] / (C.kB_eV * t.ravel() ** 2)
        entropy = C.kB_eV * ln_q + energy / t.ravel()
        shape = t.shape
        return Contribution(ln_q=ln_q.reshape(shape), energy=energy.reshape(shape),
                            entropy=entropy.reshape(shape), heat_capacity=cv.reshape(shape),
                            zpe=float(self.zpe_eV))


def lateral_spectrum(pes: SurfacePES, mass_amu, temperature, *, rtol=1e-6,
                     max_basis=20000, max_kmesh=64) -> LateralSpectrum:
    """Converged Bloch levels of an adsorbate on a periodic PES for the given temperatures.

    Solves H = -ħ²/(2m)∇² + V(r) in a plane-wave basis |k + G| with Bloch
    sampling of the 2D Brillouin zone (Γ-centred n x n mesh reduced by the
    point group of V and time reversal). At every k the Hermitian matrix is
    made real where an antiunitary symmetry allows it and split into blocks by
    the little group, then diagonalised with ``scipy.linalg.eigvalsh``.

    Convergence (all automatic, checked at the requested temperatures):

    * energy window: levels up to V_min + 30 kT_max; if that is above V_max,
      the level sum is split smoothly at E_c = V_max + 5w and the rest
      integrated with the exact smoothed density of states (see
      :class:`LateralSpectrum`), so the basis does not grow with T;
    * plane-wave cut-off: doubled until the Γ-point partition functions change
      by less than ``rtol`` and the ground level by less than rtol·kT_min
      (at least 1e-9 eV);
    * k-mesh: n = 2, 4, 8, ... (nested meshes) until q and U/kT change by less
      than ``rtol``.

    Parameters
    ----------
    pes : SurfacePES
    mass_amu : float
        Adsorbate mass, amu.
    temperature : array_like
        Temperatures (K) at which convergence is checked; the highest sets the window.
    rtol : float, optional
        Relative convergence target for q (and for U in units of kT). Default 1e-6.
    max_basis : int, optional
        Largest number of plane waves allowed per k-point (default 20000).
    max_kmesh : int, optional
        Largest n of the n x n k-mesh (default 64).

    Returns
    -------
    LateralSpectrum

    Raises
    ------
    ConvergenceError
        Basis or k-mesh limit reached before convergence (the message names the temperature).
    """
    if not isinstance(pes, SurfacePES):
        raise InputError(f"pes must be a SurfacePES (from pes_from_sites or pes_from_grid); got {type(pes).__name__}")
    m = _positive_scalar("mass_amu", mass_amu, "amu")
    tol = _positive_scalar("rtol", rtol, "")
    t = np.unique(_temperatures(temperature).ravel())
    if t.size > 12:
        t = np.unique(np.concatenate([t[[0, -1]], np.geomspace(t[0], t[-1], 10)]))
    kt = C.kB_eV * t
    tmax = float(t[-1])
    start = time.perf_counter()
    vmin, vmax = pes.v_min_eV, pes.v_max_eV
    dv = vmax - vmin
    a_min = float(np.min(np.linalg.norm(pes.cell_A, axis=1)))
    eps_s = KINETIC_EV / (m * a_min**2)  # kinetic energy of |K| = 1/a
    w = max(0.1 * dv, (4 / np.pi) * np.sqrt((2 * dv + eps_s) * eps_s))
    rho0 = pes.cell_area_A2 * np.pi * m / KINETIC_EV
    pes = _centred(pes)  # translate V so that its point group acts about r = 0 (levels unchanged)
    ops = _reciprocal_ops(pes)
    rng = np.random.default_rng(20170313)
    span = _THERMAL_SPAN * kt[-1]
    try:  # first guess of the ground level: harmonic zero-point energy of the deepest well
        zpe_guess = 0.5 * float(np.sum(pes.harmonic_frequencies_cm(m))) * C.invcm_eV
    except InputError:
        zpe_guess = 0.0

    def window(zpe):
        """(switch width, switch centre, highest level kept) for a ground level zpe above V_min."""
        need = vmin + zpe + span
        if need <= vmax + 2 * _SWITCH_HALF * w:
            return 0.0, np.inf, need
        return w, vmax + _SWITCH_HALF * w, vmax + 2 * _SWITCH_HALF * w

    def summary(levels, weights):
        spec = LateralSpectrum(levels_eV=levels, weights=weights, ground_eV=float(levels.min()),
                               v_min_eV=vmin, n_sites=pes.n_sites, dos_per_eV=rho0,
                               switch_centre_eV=centre, switch_width_eV=width, levels_max_eV=emax,
                               temperature_max_K=tmax)
        return spec._moments(kt)

    def close(a, b):
        return (np.all(np.abs(a[:, 0] - b[:, 0]) <= tol * a[:, 0])
                and np.all(np.abs(a[:, 1] - b[:, 1]) <= tol * kt))

    # --- plane-wave cut-off, converged at Γ: accept a cut-off when half its margin
    # above the highest kept level already gives the same Γ-point moments; the window is
    # widened when the ground level turns out higher than guessed ----------------------------
    gamma = np.zeros(2)

    def gamma_levels(margin):
        ecut_try = emax - vmin + margin
        lev, dim, _ = _levels_at_k(pes, m, gamma, ecut_try, emax, ops, rng)
        if dim > max_basis:
            raise ConvergenceError(f"lateral quantum solve at T = {tmax:g} K needs more than {max_basis} plane "
                                   f"waves (cut-off {ecut_try:.3g} eV); use lateral_classical or raise max_basis")
        return lev, dim

    for _attempt in range(8):
        width, centre, emax = window(zpe_guess)
        margin = 0.25 * min(dv, emax - vmin) + 8 * eps_s
        lev, _ = gamma_levels(0.5 * margin)
        if lev.size == 0:
            zpe_guess = 2.0 * zpe_guess + span
            continue
        prev = summary(lev, np.ones_like(lev))
        prev_e0 = float(lev.min())
        while True:
            lev, dim = gamma_levels(margin)
            cur = summary(lev, np.ones_like(lev))
            e0 = float(lev.min())
            # q and U are counted from the ground level, so its own convergence is checked too
            if close(cur, prev) and abs(e0 - prev_e0) <= max(tol * kt[0], 1e-9):
                break
            prev, prev_e0 = cur, e0
            margin *= 2.0
        zpe_found = float(lev.min()) - vmin
        if width > 0 or vmin + zpe_found + span <= emax * (1 + 1e-12) + 1e-12:
            break
        zpe_guess = zpe_found
    else:
        raise ConvergenceError(f"lateral quantum solve: could not place the level window at T = {tmax:g} K")
    ecut = emax - vmin + margin
    # --- k-mesh -------------------------------------------------------------------
    cache = {}

    def mesh_levels(n):
        levels, weights = [], []
        for k, wk in _kmesh(n, ops):
            key = (round(k[0] % 1.0, 12), round(k[1] % 1.0, 12))
            if key not in cache:
                cache[key] = _levels_at_k(pes, m, k, ecut, emax, ops, rng)[0]
            levels.append(cache[key])
            weights.append(np.full(cache[key].size, wk))
        return np.concatenate(levels), np.concatenate(weights)

    n = 2
    lev, wts = mesh_levels(1)
    prev = summary(lev, wts)
    while True:
        lev, wts = mesh_levels(n)
        cur = summary(lev, wts)
        if close(cur, prev):
            break
        if 2 * n > max_kmesh:
            diff = np.abs(cur[:, 0] - prev[:, 0]) / cur[:, 0]
            raise ConvergenceError(f"lateral quantum k-mesh not converged at T = {t[np.argmax(diff)]:g} K "
                                   f"with a {n}x{n} mesh (relative change {diff.max():.2g})")
        prev = cur
        n *= 2
    info = {"plane_wave_cutoff_eV": float(ecut), "basis_size_gamma": int(dim), "kmesh": int(n),
            "irreducible_kpoints": len(_kmesh(n, ops)), "switch_width_eV": float(width),
            "levels_max_eV": float(emax), "point_group_order": len(ops),
            "seconds": time.perf_counter() - start}
    return LateralSpectrum(levels_eV=lev, weights=wts, ground_eV=float(lev.min()), v_min_eV=vmin,
                           n_sites=pes.n_sites, dos_per_eV=rho0, switch_centre_eV=centre,
                           switch_width_eV=width, levels_max_eV=emax, temperature_max_K=tmax, info=info)


def lateral_quantum(temperature, pes: SurfacePES, mass_amu, *, rtol=1e-6) -> Contribution:
    """Quantum partition function of the two in-plane translations on a PES, per site.

    q = (1/n_sites) Σ_k w_k Σ_n exp(-(E_nk - E0)/kT) from the Bloch levels of
    H = -ħ²/(2m)∇² + V(x, y) (see :func:`lateral_spectrum` for the basis,
    k-mesh and convergence rules); U, S and Cv from the level moments;
    zpe = E0 - V_min. For a separable cosine surface this is the exact
    counterpart of the hindered translator of Sprowl, Campbell and Árnadóttir
    (J. Phys. Chem. C 2016, 120, 9719), and it tends to :func:`lateral_classical`
    at high T and to two harmonic oscillators for deep wells at low T.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    pes : SurfacePES
    mass_amu : float
        Adsorbate mass in amu.
    rtol : float, optional
        Relative convergence target (default 1e-6).

    Returns
    -------
    Contribution
    """
    t = _temperatures(temperature)
    spec = lateral_spectrum(pes, mass_amu, t, rtol=rtol)
    return spec.contribution(t)
