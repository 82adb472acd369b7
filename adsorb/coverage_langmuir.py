"""Site-balance inputs and the ideal (non-interacting) Langmuir solution.

The validation and broadcasting of the arguments of :func:`adsorb.coverage.site_coverages`
(and of its inverse functions), the closed form / monotone Newton iteration for
ln θ_* without interactions, and the site-balance residual reported with every
solution. Equations and sources: the module docstring of :mod:`adsorb.coverage` and
docs/methods-coverages.md §3. Import the public names from :mod:`adsorb.coverage`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from adsorb import constants
from adsorb.errors import ConvergenceError, InputError

# ln c used for species that cannot adsorb (K = 0 or p = 0): exp() of it is exactly 0.
_LN_C_ABSENT = -1.0e4
_CHUNK = 8192


@dataclass(frozen=True)
class _Spec:
    """Validated description of the species (internal)."""

    n_species: int
    dissociative: np.ndarray      # bool (n,)
    sites: np.ndarray             # float (n,)
    kind_of: np.ndarray           # int (n,)
    members: tuple                # per kind: int index arrays
    kinds: tuple                  # kind labels
    eps: np.ndarray | None        # (n, n) eV or None


# --------------------------------------------------------------------------- input

def _as_float_array(value, name):
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        msg = f"{name}: expected an array of real numbers, got {value!r}"
        raise InputError(msg) from None
    return arr


def _check_finite_nonneg(arr, name, unit):
    if not np.all(np.isfinite(arr)):
        bad = arr[~np.isfinite(arr)].flat[0]
        msg = f"{name}: expected finite values in {unit}, got {bad!r}"
        raise InputError(msg)
    if np.any(arr < 0):
        bad = arr[arr < 0].flat[0]
        msg = f"{name}: expected values >= 0 in {unit}, got {bad!r}"
        raise InputError(msg)


def _species_first(arr, n_grid_dims):
    """Insert unit axes after axis 0 so that the grid axes align on the right."""
    missing = n_grid_dims - (arr.ndim - 1)
    return arr.reshape(arr.shape[:1] + (1,) * missing + arr.shape[1:])


def _build_spec(n, dissociative, interactions, sites_per_species, site_kind):
    if dissociative is None:
        diss = np.zeros(n, dtype=bool)
    else:
        try:
            diss_list = [bool(x) if isinstance(x, (bool, np.bool_))
                         or (isinstance(x, (int, np.integer)) and x in (0, 1)) else None
                         for x in dissociative]
        except TypeError:
            msg = f"dissociative: expected a sequence of {n} booleans, got {dissociative!r}"
            raise InputError(msg) from None
        if len(diss_list) != n or any(x is None for x in diss_list):
            msg = f"dissociative: expected a sequence of {n} booleans (one per species), got {dissociative!r}"
            raise InputError(msg)
        diss = np.array(diss_list, dtype=bool)

    if sites_per_species is None:
        sites = np.ones(n)
    else:
        sites_arr = np.asarray(sites_per_species)
        if (sites_arr.shape != (n,) or not np.issubdtype(sites_arr.dtype, np.integer)
                or np.any(sites_arr < 1)):
            msg = (f"sites_per_species: expected {n} integers >= 1 (one per species), "
                   f"got {sites_per_species!r}")
            raise InputError(msg)
        sites = sites_arr.astype(float)

    if site_kind is None:
        labels = [0] * n
    else:
        try:
            labels = list(site_kind)
        except TypeError:
            msg = f"site_kind: expected a sequence of {n} labels (one per species), got {site_kind!r}"
            raise InputError(msg) from None
        if len(labels) != n:
            msg = f"site_kind: expected {n} labels (one per species), got {len(labels)}: {site_kind!r}"
            raise InputError(msg)
        try:
            [hash(x) for x in labels]
        except TypeError:
            msg = f"site_kind: labels must be hashable (str or int), got {site_kind!r}"
            raise InputError(msg) from None
    kinds = tuple(dict.fromkeys(labels))
    kind_of = np.array([kinds.index(lab) for lab in labels], dtype=int)
    members = tuple(np.flatnonzero(kind_of == k) for k in range(len(kinds)))

    eps = None
    if interactions is not None:
        eps = _as_float_array(interactions, "interactions")
        if eps.shape != (n, n):
            msg = f"interactions: expected an ({n}, {n}) matrix in eV, got shape {eps.shape}"
            raise InputError(msg)
        if not np.all(np.isfinite(eps)):
            msg = f"interactions: expected finite values in eV, got {interactions!r}"
            raise InputError(msg)
        scale = max(1.0, float(np.max(np.abs(eps))))
        if np.max(np.abs(eps - eps.T)) > 1e-12 * scale:
            msg = ("interactions: expected a symmetric matrix eps_ij = eps_ji in eV "
                   "(a mean-field energy exists only then), got " + repr(eps.tolist()))
            raise InputError(msg)
        eps = 0.5 * (eps + eps.T)
    return _Spec(n, diss, sites, kind_of, members, kinds, eps)


def _prepare(K, pressures, temperature, spec_args, need_temperature):
    """Validate and broadcast; return ln c (n, *grid), kT (grid) or None, grid shape."""
    K = _as_float_array(K, "K")
    p = _as_float_array(pressures, "pressures")
    if K.ndim == 0 or p.ndim == 0:
        msg = (f"K and pressures: expected arrays with the species on axis 0, got shapes "
               f"{K.shape} and {p.shape}")
        raise InputError(msg)
    if K.shape[0] == 0 or p.shape[0] == 0:
        msg = (f"K and pressures: expected at least one species on axis 0, got shapes "
               f"{K.shape} and {p.shape}")
        raise InputError(msg)
    _check_finite_nonneg(K, "K", "Pa^-1")
    _check_finite_nonneg(p, "pressures", "Pa")
    n = K.shape[0] if K.shape[0] != 1 else p.shape[0]
    if K.shape[0] not in (1, n) or p.shape[0] not in (1, n):
        msg = (f"K and pressures: species axes (axis 0) differ: K has {K.shape[0]}, "
               f"pressures has {p.shape[0]}")
        raise InputError(msg)
    spec = _build_spec(n, *spec_args)

    T = None
    if temperature is not None:
        T = _as_float_array(temperature, "temperature")
        if not np.all(np.isfinite(T)) or np.any(T <= 0):
            bad = T[~(np.isfinite(T) & (T > 0))].flat[0]
            msg = f"temperature: expected finite values > 0 in K, got {bad!r}"
            raise InputError(msg)
    elif need_temperature:
        msg = "temperature: required (in K) when interactions are given, got None"
        raise InputError(msg)

    try:
        grid = np.broadcast_shapes(K.shape[1:], p.shape[1:], () if T is None else T.shape)
    except ValueError:
        msg = (f"K, pressures, temperature: grid axes do not broadcast: K {K.shape[1:]}, "
               f"pressures {p.shape[1:]}, temperature {None if T is None else T.shape}")
        raise InputError(msg) from None
    nd = len(grid)
    K = np.broadcast_to(_species_first(K, nd), (n,) + grid)
    p = np.broadcast_to(_species_first(p, nd), (n,) + grid)
    with np.errstate(divide="ignore"):
        ln_kp = np.log(K) + np.log(p)          # -inf where K = 0 or p = 0 (no warning)
    ln_c = np.where(spec.dissociative.reshape((n,) + (1,) * nd), 0.5 * ln_kp, ln_kp)
    ln_c = np.where(np.isfinite(ln_c), ln_c, _LN_C_ABSENT)
    kT = None if T is None else constants.kB_eV * np.broadcast_to(T, grid)
    return spec, ln_c, kT, grid, (K, p)


# --------------------------------------------------------------------------- ideal solve

def _ideal_ln_empty(ln_c, spec):
    """ln θ_* per kind for non-interacting species; ln_c has shape (n, M).

    Per kind solves f(v) = ln(e^v + Σ n_i c_i e^(n_i v)) = 0 for v = ln θ_*.  f is
    increasing and convex, so Newton's method started where f >= 0 decreases
    monotonically to the root (no overshoot); with single-site species f is
    v + ln(1 + Σ c_i) and one step is exact.
    """
    M = ln_c.shape[1]
    out = np.empty((len(spec.members), M))
    it_max = 0
    for k, idx in enumerate(spec.members):
        n_i = spec.sites[idx][:, None]
        a = np.log(n_i) + ln_c[idx]                     # ln(n_i c_i)
        if np.all(n_i == 1.0):
            m = np.maximum(0.0, a.max(axis=0))
            out[k] = -(m + np.log(np.exp(-m) + np.exp(a - m).sum(axis=0)))
            continue
        v = np.minimum(0.0, np.min(-a / n_i, axis=0))   # f(v) >= 0 here
        for it in range(1, 200):
            t = np.concatenate([v[None], a + n_i * v], axis=0)
            m = t.max(axis=0)
            wts = np.exp(t - m)
            z = wts.sum(axis=0)
            f = m + np.log(z)
            slope = (wts[0] + (n_i[:, 0][:, None] * wts[1:]).sum(axis=0)) / z
            step = f / slope
            v = v - step
            if np.all(np.abs(step) <= 1e-15 * np.maximum(1.0, np.abs(v))):
                break
        else:  # pragma: no cover - monotone Newton on a convex function always terminates
            msg = "site_coverages: multi-site site balance did not converge"
            raise ConvergenceError(msg)
        it_max = max(it_max, it)
        out[k] = v
    return out, it_max


# --------------------------------------------------------------------------- site-balance residual

def _site_balance_residual(theta, ln_empty, ln_c, spec, kT):
    """max_k |1 - θ_*,k - Σ_i n_i c_i θ_*^n_i exp(-h_i)|; arrays (n, M)/(n_kinds, M)."""
    M = theta.shape[1]
    res = np.zeros(M)
    sites = spec.sites[:, None]
    for lo in range(0, M, _CHUNK):
        sl = slice(lo, min(M, lo + _CHUNK))
        ln_eq = ln_c[:, sl] + sites * ln_empty[spec.kind_of, sl]
        if spec.eps is not None:
            ln_eq -= (spec.eps @ theta[:, sl]) / kT[sl]
        occupied = sites * np.exp(np.minimum(ln_eq, 700.0))
        for k, idx in enumerate(spec.members):
            r = np.abs(1.0 - np.exp(ln_empty[k, sl]) - occupied[idx].sum(axis=0))
            np.maximum(res[sl], r, out=res[sl])
    return res
