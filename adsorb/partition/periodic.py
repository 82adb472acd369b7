"""Numerically exact quantum levels of a particle on a 1D periodic potential.

The potential is a Fourier series in the reduced coordinate theta = 2 pi s / L
(s the position along a lattice of period L, or the rotation angle itself on a
ring, where L = 2 pi)::

    V(theta) = sum_{n>=1} [ a_n cos(n theta) + b_n sin(n theta) ]

``cos_eV[n-1]`` is a_n and ``sin_eV[n-1]`` is b_n, in eV. A constant term is
irrelevant: energies are measured from the potential minimum, located
numerically. The Hamiltonian H = -hbar^2/(2 m) d^2/ds^2 + V is diagonalised in
a plane-wave (Bloch) basis exp(i (k + G_j) s), G_j = 2 pi j / L,
j = -J..J [standard solid-state practice; e.g. N. W. Ashcroft, N. D. Mermin,
*Solid State Physics*, 1976, ch. 9]. In that basis H is Hermitian and banded::

    H_jj  = E_1 (kappa + j)^2,       E_1 = hbar^2 (2 pi / L)^2 / (2 m),  kappa = k L / (2 pi)
    H_jj' = V_(j - j'),              V_n = (a_n - i b_n)/2,  V_-n = conj(V_n)

with bandwidth equal to the number of Fourier terms, so the eigenvalues come
from :func:`scipy.linalg.eig_banded` (real symmetric when every b_n is 0,
complex Hermitian otherwise).

Two problems are solved:

* **lattice** (:func:`lattice_levels`, :func:`lattice_translator`): a
  translation of mass m on a lattice of period L. The partition function per
  site is q_site = (1/N_k) sum_k sum_bands exp(-E_b(k)/kT) over a uniform grid
  of N_k Bloch vectors in the first Brillouin zone (E(k) = E(-k) for a real
  potential, so only half the zone is diagonalised).
* **ring** (:func:`ring_levels`, :func:`ring_rotor`): a rotation of moment I
  about a fixed axis, V(phi) with phi the angle (L = 2 pi), whose
  eigenfunctions must be 2 pi periodic: exactly the k = 0 problem of the full
  turn. A potential with n equivalent minima per turn is written with terms
  cos(n phi), cos(2 n phi), ...; when every order present is a multiple of g,
  the ring splits exactly into g blocks (plane waves j mod g), each the Bloch
  problem of one period 2 pi/g at kappa = s/g, which is how it is solved. A
  symmetry number sigma divides q (see :func:`ring_levels` for what that
  means for a symmetric top).

Automatic convergence (the rule; see docs/methods-adsorbates.md):

1. Levels are kept up to E_keep = [max V - min V] + 32 kT_max above the
   potential minimum: a dropped level weighs < e^-32 (1.3e-14) relative to
   the ground level at every requested temperature, and the whole
   free-particle tail beyond E_keep less than 1e-15 of q.
2. The plane-wave cut-off starts at a kinetic energy E_keep plus 2N + 4 extra
   plane waves on each side (N = number of Fourier terms). ln q of the kept
   levels at the zone centre and boundary is compared with that of a basis
   25 % larger (plus N + 2 plane waves); the basis is accepted once the two
   agree to ``rtol`` (default 1e-10) -- or to the rounding level of the
   eigenvalues, 64 eps E_max/kT, if that is larger -- at every checked
   temperature, otherwise it is enlarged and the comparison repeated. The
   difference is the error estimate of the accepted basis (the error falls
   off exponentially with the cut-off).
3. With that basis the uniform Bloch grid starts at N_k = 2 and doubles until
   ln q_site changes by less than the same tolerance (lattice only). The trace
   sum_b exp(-E_b(k)/kT) is an entire periodic function of k, so the uniform
   grid converges exponentially; the final, finer grid is used.

The checks use every requested temperature when there are at most 64 distinct
values, otherwise 64 log-spaced values spanning them (the lowest and the
highest always included). Non-convergence raises
:class:`adsorb.errors.ConvergenceError`.

:func:`levels_contribution` turns any list of levels and weights into a
:class:`Contribution` exactly (ln q, U, S and Cv from the moments of the
Boltzmann distribution).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.linalg import eig_banded
from scipy.optimize import minimize_scalar

from adsorb import constants as C
from adsorb.errors import ConvergenceError, InputError
from adsorb.partition.checks import positive_array as _positive
from adsorb.partition.contribution import Contribution

__all__ = [
    "LevelSet",
    "cosine_terms",
    "levels_contribution",
    "lattice_levels",
    "lattice_translator",
    "ring_levels",
    "ring_rotor",
]

_KEEP_KT = 32.0          # levels kept up to spread + 32 kT_max
_MAX_BASIS_STEPS = 30
_MAX_NK = 2**14
_N_CHECK_T = 64
_NOISE_FACTOR = 64.0


@dataclass(frozen=True)
class LevelSet:
    """Quantum levels of a periodic problem, ready for :func:`levels_contribution`.

    Attributes
    ----------
    energies : ndarray, shape (n,)
        Level energies in eV above the potential minimum.
    weights : ndarray, shape (n,)
        Weight of each level in q (1/N_k times the time-reversal fold for a
        lattice, per site; 1/sigma for a ring).
    n_plane_waves : int
        Size 2J + 1 of the converged plane-wave basis per Bloch vector.
    n_kpoints : int
        Bloch vectors in the full zone. For a ring: the number g of decoupled
        blocks (the greatest common divisor of the Fourier orders present),
        each solved as one Bloch vector s/g of the period 2 pi/g.
    """

    energies: np.ndarray
    weights: np.ndarray
    n_plane_waves: int
    n_kpoints: int


# ---------------------------------------------------------------------------
# input checks
# ---------------------------------------------------------------------------



def _positive_scalar(name, value):
    arr = _positive(name, value)
    if arr.ndim != 0:
        msg = f"{name} must be a single number, got an array of shape {arr.shape}"
        raise InputError(msg)
    return float(arr)


def _coefficients(name, value):
    if value is None:
        return np.zeros(0)
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        msg = f"{name} must be a sequence of real Fourier coefficients in eV, got {value!r}"
        raise InputError(msg) from None
    arr = np.atleast_1d(arr)
    if arr.ndim != 1:
        msg = f"{name} must be one-dimensional (coefficient n at index n-1), got shape {arr.shape}"
        raise InputError(msg)
    if not np.all(np.isfinite(arr)):
        msg = f"{name} must contain finite numbers, got {value!r}"
        raise InputError(msg)
    return arr


def _fourier(cos_eV, sin_eV):
    a = _coefficients("cos_eV", cos_eV)
    b = _coefficients("sin_eV", sin_eV)
    n = max(a.size, b.size)
    a = np.pad(a, (0, n - a.size))
    b = np.pad(b, (0, n - b.size))
    # drop trailing zero terms (they would only widen the band)
    nz = np.nonzero((a != 0.0) | (b != 0.0))[0]
    n_eff = int(nz[-1]) + 1 if nz.size else 0
    return a[:n_eff], b[:n_eff]


def cosine_terms(barrier_eV, n_minima=1):
    """Fourier coefficients of the cosine well (W/2)[1 - cos(n theta)].

    The potential of the hindered translator (n = 1 per period) and of the
    hindered rotor (n minima per turn) of Sprowl, Campbell, Árnadóttir,
    J. Phys. Chem. C 2016, 120, 9719, in the form expected by ``cos_eV``
    (the constant W/2 is dropped; energies are measured from the minimum).

    Parameters
    ----------
    barrier_eV : float
        Barrier W in eV (>= 0).
    n_minima : int, optional
        Number of minima per period (default 1).

    Returns
    -------
    ndarray, shape (n_minima,)
        a_n for n = 1..n_minima: zeros except a_{n_minima} = -W/2.

    Raises
    ------
    InputError
        If the barrier is negative or not finite, or n_minima is not a positive integer.
    """
    w = float(_positive("barrier_eV", barrier_eV, allow_zero=True))
    n = _positive_scalar("n_minima", n_minima)
    if n != round(n):
        msg = f"n_minima must be a positive integer, got {n_minima!r}"
        raise InputError(msg)
    coeffs = np.zeros(int(n))
    coeffs[-1] = -0.5 * w
    return coeffs


# ---------------------------------------------------------------------------
# potential and band energies
# ---------------------------------------------------------------------------


def _potential(theta, a, b):
    n = np.arange(1, a.size + 1)
    nt = np.multiply.outer(np.asarray(theta, dtype=float), n)
    return np.cos(nt) @ a + np.sin(nt) @ b


def _extrema(a, b):
    """Return (min V, max V) over a period, located by a grid plus Brent refinement."""
    if a.size == 0:
        return 0.0, 0.0
    m = max(512, 64 * a.size)
    grid = 2.0 * C.pi * np.arange(m) / m
    v = _potential(grid, a, b)
    step = 2.0 * C.pi / m
    out = []
    for sign, idx in ((1.0, int(np.argmin(v))), (-1.0, int(np.argmax(v)))):
        centre = grid[idx]
        res = minimize_scalar(lambda th: sign * float(_potential(th, a, b)),
                              bounds=(centre - step, centre + step), method="bounded",
                              options={"xatol": 1e-13})
        out.append(min(sign * v[idx], float(res.fun)) * sign)
    return out[0], out[1]


def _bands(unit_ev, kappa, vcoef, n_half, vmin):
    """Eigenvalues (eV, above vmin) for one reduced Bloch vector kappa."""
    j = np.arange(-n_half, n_half + 1, dtype=float)
    size = j.size
    nb = vcoef.size
    diag = unit_ev * (kappa + j) ** 2
    if nb == 0:
        return np.sort(diag) - vmin
    dtype = complex if np.iscomplexobj(vcoef) else float
    ab = np.zeros((nb + 1, size), dtype=dtype)
    ab[0] = diag
    for d in range(1, nb + 1):
        ab[d, : size - d] = vcoef[d - 1]
    return eig_banded(ab, lower=True, eigvals_only=True, check_finite=False) - vmin


def _check_temperatures(t):
    u = np.unique(t.ravel())
    if u.size > _N_CHECK_T:
        u = np.unique(np.concatenate([
            np.geomspace(u[0], u[-1], _N_CHECK_T), u[[0, -1]]]))
    return u


def _kept(levels, e_keep):
    return levels[levels <= e_keep]


def _boltzmann(kt, eps):
    """exp(-eps/kT) as a (n_T, n_levels) array, eps >= 0.

    Exponents are clipped at -700 (a weight of 1e-304 instead of less): that is
    far below the rounding of any sum containing the ground level (weight 1),
    and it keeps numpy's exp off its slow underflow path (about 8x faster).
    """
    x = np.multiply.outer(-1.0 / kt, eps)
    np.maximum(x, -700.0, out=x)
    return np.exp(x, out=x)


def _ln_q(levels, weights, kt):
    """ln sum_i w_i exp(-levels_i / kT) for every kT (levels in eV, any offset).

    A log-sum-exp shifted by the lowest level, so nothing overflows or underflows to log(0).
    """
    e0 = float(np.min(levels))
    boltz = _boltzmann(kt, levels - e0)
    q = boltz.sum(axis=1) if weights is None else boltz @ weights
    return np.log(q) - e0 / kt


def _tolerance(rtol, e_max, kt):
    return rtol + _NOISE_FACTOR * np.finfo(float).eps * e_max / kt


def _solve(temperature, unit_ev, a, b, *, n_k_fixed, rtol, label):
    """Converged levels of the periodic problem; returns (energies, weights, n_pw, n_k).

    ``n_k_fixed`` None: a lattice, per-site weights, Bloch grid converged.
    An integer g: a ring reduced to g decoupled blocks (Bloch vectors s/g),
    weights summing over all blocks.
    """
    t = _positive("temperature", temperature)
    rtol = _positive_scalar("rtol", rtol)
    t_check = _check_temperatures(t)
    kt = C.kB_eV * t_check
    kt_max = kt[-1]

    vmin, vmax = _extrema(a, b)
    vcoef = 0.5 * (a - 1j * b) if np.any(b != 0.0) else 0.5 * a
    nf = a.size
    e_keep = (vmax - vmin) + _KEEP_KT * kt_max
    n_half = int(np.ceil(np.sqrt(e_keep / unit_ev))) + 2 * nf + 4

    # 1. plane-wave cut-off: compare J with a 25 % larger basis at the zone
    #    centre (and boundary); accept J once the two agree.
    lattice = n_k_fixed is None
    kappas = (0.0, 0.5) if lattice else tuple(sorted({0.0, (n_k_fixed // 2) / n_k_fixed}))
    cache = {}
    for _ in range(_MAX_BASIS_STEPS):
        bigger = int(np.ceil(1.25 * n_half)) + nf + 2
        if not cache:
            cache = {kap: _kept(_bands(unit_ev, kap, vcoef, n_half, vmin), e_keep) for kap in kappas}
        big = {kap: _kept(_bands(unit_ev, kap, vcoef, bigger, vmin), e_keep) for kap in kappas}
        lnq_small = _ln_q(np.concatenate(list(cache.values())), None, kt)
        lnq_big = _ln_q(np.concatenate(list(big.values())), None, kt)
        e_max = unit_ev * (bigger + 1) ** 2 + np.sum(np.abs(vcoef))
        tol = _tolerance(rtol, e_max, kt)
        if np.all(np.abs(lnq_small - lnq_big) <= tol):
            break
        n_half, cache = bigger, big
    else:
        msg = (f"{label}: plane-wave basis did not converge to rtol={rtol:g} "
               f"at T = {t_check[0]:g}-{t_check[-1]:g} K with {2 * n_half + 1} plane waves")
        raise ConvergenceError(msg)

    # 2. Bloch sampling: uniform grid kappa_i = i/N_k, folded by E(k) = E(-k)
    def grid(nk):
        levels, weights = [], []
        for i in range(nk // 2 + 1):
            key = i / nk
            if key not in cache:
                cache[key] = _kept(_bands(unit_ev, key, vcoef, n_half, vmin), e_keep)
            fold = 1.0 if (i == 0 or 2 * i == nk) else 2.0
            levels.append(cache[key])
            weights.append(np.full(cache[key].size, fold / nk))
        return np.concatenate(levels), np.concatenate(weights)

    if not lattice:
        lev, wts = grid(n_k_fixed)
        return lev, wts * n_k_fixed, 2 * n_half + 1, n_k_fixed

    nk = 2
    lev, wts = grid(nk)
    prev = _ln_q(lev, wts, kt)
    while True:
        nk *= 2
        if nk > _MAX_NK:
            msg = (f"{label}: Bloch sampling did not converge to rtol={rtol:g} "
                   f"at T = {t_check[0]:g} K with {nk // 2} k-points")
            raise ConvergenceError(msg)
        lev, wts = grid(nk)
        lnq = _ln_q(lev, wts, kt)
        if np.all(np.abs(lnq - prev) <= tol):
            break
        prev = lnq
    return lev, wts, 2 * n_half + 1, nk


# ---------------------------------------------------------------------------
# public functions
# ---------------------------------------------------------------------------


def lattice_levels(temperature, mass_amu, period_A, cos_eV, sin_eV=None, *, rtol=1e-10):
    """Bloch levels of a particle of mass m on a lattice of period L.

    Plane-wave solution of -hbar^2/(2m) d^2/ds^2 + V(2 pi s/L) (module
    docstring), with the basis and the Bloch grid converged automatically for
    every temperature in ``temperature``.

    Parameters
    ----------
    temperature : float or ndarray
        Temperatures in K at which the levels must be converged (only the
        range matters; the levels serve any temperature up to the highest).
    mass_amu : float
        Mass in amu.
    period_A : float
        Lattice period L in Å (distance between equivalent sites).
    cos_eV : sequence of float
        a_n (eV) multiplying cos(n 2 pi s/L), n = 1, 2, ...
    sin_eV : sequence of float, optional
        b_n (eV) multiplying sin(n 2 pi s/L).
    rtol : float, optional
        Convergence tolerance on ln q (default 1e-10).

    Returns
    -------
    LevelSet
        Energies in eV above the potential minimum and per-site weights
        (sum of weights = number of bands kept).

    Raises
    ------
    InputError
        On non-positive temperature, mass or period, or bad coefficients.
    ConvergenceError
        If the basis or the Bloch grid does not converge.
    """
    m = _positive_scalar("mass_amu", mass_amu) * C.amu
    length = _positive_scalar("period_A", period_A) * C.angstrom
    a, b = _fourier(cos_eV, sin_eV)
    unit_ev = (C.hbar * 2.0 * C.pi / length) ** 2 / (2.0 * m) / C.eV
    lev, wts, npw, nk = _solve(temperature, unit_ev, a, b, n_k_fixed=None, rtol=rtol,
                               label=f"lattice (mass {mass_amu} amu, period {period_A} Å)")
    return LevelSet(lev, wts, npw, nk)


def ring_levels(temperature, inertia_amu_A2, cos_eV, sin_eV=None, *, symmetry_number=1,
                rtol=1e-10):
    """Levels of a rotor of moment I on a ring, V(phi) = sum a_n cos(n phi) + b_n sin(n phi).

    The eigenfunctions are 2 pi periodic (the k = 0 problem of the full turn);
    every level is given the weight 1/sigma.

    Symmetric tops: a rotor with sigma indistinguishable orientations per turn
    (e.g. a methyl group, sigma = 3) is treated the conventional way, by
    summing over all ring levels and dividing by sigma. This is what the
    symmetry number means classically and it is the high-temperature limit of
    the correct nuclear-spin-weighted sum; nuclear-spin statistics (which
    assign different weights to the symmetry species, j mod sigma) are not
    applied, so at temperatures comparable with the tunnelling splittings the
    result is the conventional (spin-free) one. The potential itself must then
    have sigma-fold symmetry (Fourier terms only at multiples of sigma); this
    is not enforced.

    Parameters
    ----------
    temperature : float or ndarray
        Temperatures in K at which the levels must be converged.
    inertia_amu_A2 : float
        Moment of inertia about the axis in amu Å^2.
    cos_eV, sin_eV : sequence of float
        Fourier coefficients in eV of cos(n phi) and sin(n phi), n = 1, 2, ...
    symmetry_number : int, optional
        sigma, dividing q (default 1).
    rtol : float, optional
        Convergence tolerance on ln q (default 1e-10).

    Returns
    -------
    LevelSet
        Energies in eV above the potential minimum, weights 1/sigma.

    Raises
    ------
    InputError
        On bad input.
    ConvergenceError
        If the basis does not converge.
    """
    inertia = _positive_scalar("inertia_amu_A2", inertia_amu_A2) * C.amu_A2
    sigma = _positive_scalar("symmetry_number", symmetry_number)
    if sigma != round(sigma):
        msg = f"symmetry_number must be a positive integer, got {symmetry_number!r}"
        raise InputError(msg)
    a, b = _fourier(cos_eV, sin_eV)
    # terms only at multiples of g: the ring splits into g blocks (j mod g), each
    # the Bloch problem of one period 2 pi/g at kappa = s/g
    orders = np.nonzero((a != 0.0) | (b != 0.0))[0] + 1
    g = int(np.gcd.reduce(orders)) if orders.size else 1
    a, b = a[g - 1::g], b[g - 1::g]
    unit_ev = g**2 * C.hbar**2 / (2.0 * inertia) / C.eV
    lev, wts, npw, nk = _solve(temperature, unit_ev, a, b, n_k_fixed=g, rtol=rtol,
                               label=f"ring (inertia {inertia_amu_A2} amu Å^2)")
    return LevelSet(lev, wts / sigma, npw, nk)


def levels_contribution(temperature, levels, weights=None):
    """Exact thermodynamic functions of a set of levels.

    q = sum_i w_i exp(-(E_i - E_0)/kT), U = <E - E_0>, Cv = (<E^2> - <E>^2)/(k T^2),
    S = k ln q + U/T (standard statistical mechanics), evaluated in a stable way
    (the largest exponent is exactly 0, the variance in two passes).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K (> 0), any shape.
    levels : sequence of float
        Level energies in eV.
    weights : sequence of float, optional
        Positive weight (degeneracy) of each level; default 1.

    Returns
    -------
    Contribution
        ln_q counted from the lowest level, U above it, S, Cv, and
        zpe = the lowest level (eV).

    Raises
    ------
    InputError
        On non-positive temperature, empty or non-finite levels, or bad weights.
    """
    t = _positive("temperature", temperature)
    e = np.atleast_1d(np.asarray(levels, dtype=float)).ravel()
    if e.size == 0 or not np.all(np.isfinite(e)):
        msg = f"levels must be a non-empty sequence of finite energies in eV, got {levels!r}"
        raise InputError(msg)
    if weights is None:
        w = np.ones_like(e)
    else:
        w = np.atleast_1d(np.asarray(weights, dtype=float)).ravel()
        if w.shape != e.shape:
            msg = f"weights must have the same length as levels ({e.size}), got {w.size}"
            raise InputError(msg)
        if not np.all(np.isfinite(w) & (w > 0.0)):
            msg = "weights must be finite and > 0"
            raise InputError(msg)
    e0 = float(np.min(e))
    eps = e - e0
    # levels that underflow at every temperature change nothing
    keep = eps <= 700.0 * C.kB_eV * float(np.max(t))
    eps, w = eps[keep], w[keep]

    flat = t.ravel()
    ln_q = np.empty(flat.size)
    energy = np.empty(flat.size)
    var = np.empty(flat.size)
    chunk = max(1, 2_000_000 // eps.size)
    for start in range(0, flat.size, chunk):
        kt = C.kB_eV * flat[start:start + chunk]
        boltz = _boltzmann(kt, eps)
        q = boltz @ w
        u = (boltz @ (w * eps)) / q
        dev = np.subtract(eps[None, :], u[:, None])   # two-pass variance: stable
        np.multiply(dev, dev, out=dev)
        np.multiply(dev, boltz, out=dev)
        var[start:start + chunk] = (dev @ w) / q
        ln_q[start:start + chunk] = np.log(q)
        energy[start:start + chunk] = u
    ln_q = ln_q.reshape(t.shape)
    energy = energy.reshape(t.shape)
    var = var.reshape(t.shape)
    entropy = C.kB_eV * ln_q + energy / t
    heat_capacity = var / (C.kB_eV * t**2)
    return Contribution(ln_q=ln_q, energy=energy, entropy=entropy,
                        heat_capacity=heat_capacity, zpe=e0)


def lattice_translator(temperature, mass_amu, period_A, cos_eV, sin_eV=None, *, rtol=1e-10):
    """Exact quantum translator along one direction, per site.

    :func:`lattice_levels` followed by :func:`levels_contribution`.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K.
    mass_amu, period_A, cos_eV, sin_eV, rtol
        As in :func:`lattice_levels`.

    Returns
    -------
    Contribution
        Per site; zpe = lowest Bloch level above the potential minimum (eV).

    Raises
    ------
    InputError, ConvergenceError
        As in :func:`lattice_levels`.
    """
    lv = lattice_levels(temperature, mass_amu, period_A, cos_eV, sin_eV, rtol=rtol)
    return levels_contribution(temperature, lv.energies, lv.weights)


def ring_rotor(temperature, inertia_amu_A2, cos_eV, sin_eV=None, *, symmetry_number=1,
               rtol=1e-10):
    """Exact quantum rotor on a ring (e.g. a torsion with V3 and V6 terms).

    :func:`ring_levels` followed by :func:`levels_contribution`.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K.
    inertia_amu_A2, cos_eV, sin_eV, symmetry_number, rtol
        As in :func:`ring_levels`.

    Returns
    -------
    Contribution
        zpe = lowest level above the potential minimum (eV).

    Raises
    ------
    InputError, ConvergenceError
        As in :func:`ring_levels`.
    """
    lv = ring_levels(temperature, inertia_amu_A2, cos_eV, sin_eV,
                     symmetry_number=symmetry_number, rtol=rtol)
    return levels_contribution(temperature, lv.energies, lv.weights)
