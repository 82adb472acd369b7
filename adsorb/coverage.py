"""Equilibrium site coverages: Langmuir-type site balances with mean-field interactions.

The low-level solver :func:`site_coverages` is a stable contract: its signature
``site_coverages(K, pressures, dissociative=None, interactions=None, temperature=None)``
and the meaning of its arguments do not change.

Model (every species i adsorbs on sites of one kind k(i); coverages are per site
of that kind, in monolayers, ML)
-------------------------------------------------------------------------------
* molecular species, A(g) + n* ⇌ A(n*):        θ_i = K_i p_i θ_*^n_i g_i
* dissociative species, A2(g) + 2n* ⇌ 2A(n*):  θ_i = (K_i p_i)^(1/2) θ_*^n_i g_i
  (θ_i counts adsorbed *atoms* A per site; K_i belongs to the whole reaction)
* site balance of each kind k:                 θ_*,k + Σ_{i in k} n_i θ_i = 1
* mean-field (Fowler–Guggenheim / Frumkin, Bragg–Williams) lateral interactions:
  the adsorption energy of one i (one atom, for a dissociative species) is
  E_i(θ) = E_i(0) + Σ_j ε_ij θ_j, so that g_i = exp(-Σ_j ε_ij θ_j / kT).
  ε_ij > 0 is repulsive (it weakens binding), ε_ij < 0 attractive.  The matrix
  must be symmetric: only then do the equations derive from one free energy.
  For a dissociative species the interaction enters the per-atom energy, so the
  equilibrium constant of the whole reaction A2 + 2* ⇌ 2A* is multiplied by
  exp(-2 Σ_j ε_Aj θ_j / kT).

Sources: I. Langmuir, J. Am. Chem. Soc. 1918, 40, 1361 (site balance);
R. H. Fowler, E. A. Guggenheim, *Statistical Thermodynamics*, Cambridge, 1939 and
A. N. Frumkin, Z. Phys. Chem. 1925, 116, 466 (mean-field interacting isotherm).

Grand potential (mean field, per site, eV) whose stationary points are exactly
the equations above (c_i = K_i p_i, or (K_i p_i)^(1/2) for dissociative species)::

    Ω = Σ_i θ_i (-kT ln c_i) + ½ Σ_ij ε_ij θ_i θ_j
        + kT [Σ_i θ_i ln θ_i + Σ_k θ_*,k ln θ_*,k + Σ_i (n_i - 1) θ_i]

With one single-site species it reduces to
Ω(θ) = kT[θ ln θ + (1-θ) ln(1-θ)] - θ kT ln(Kp) + εθ²/2.  ∂Ω/∂θ_i = 0 (with
∂θ_*,k/∂θ_i = -n_i) gives kT ln θ_i - n_i kT ln θ_* - kT ln c_i + Σ_j ε_ij θ_j = 0,
the equilibrium equation.  Where several self-consistent solutions exist the
returned one has the lowest Ω (the stable phase); see :func:`site_coverages`.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np
from scipy.special import xlogy

from adsorb import constants
from adsorb.errors import ConvergenceError, InputError, ModelWarning

__all__ = [
    "CoverageSolution",
    "site_coverages",
    "pressures_for_coverage",
    "mean_field_grand_potential",
]

# ln c used for species that cannot adsorb (K = 0 or p = 0): exp() of it is exactly 0.
_LN_C_ABSENT = -1.0e4
# largest Newton step in the log variables (keeps exp() in range, limits excursions)
_MAX_STEP = 20.0
_MAX_ITER = 200
_CHUNK = 8192
_DISTINCT = 1.0e-7      # two solutions whose coverages differ by more are distinct
_SITE_BALANCE_TOL = 1.0e-12
# trial shifts mu / mu_max of the modified Newton step (smallest that convexifies wins)
_MU_FRACTIONS = tuple(4.0 ** -k for k in range(12, -1, -1))


@dataclass(frozen=True)
class CoverageSolution:
    """Result of :func:`site_coverages`.

    Attributes
    ----------
    coverage : ndarray of shape (n_species, *grid)
        Equilibrium coverage of each species in ML (molecules, or atoms for a
        dissociative species, per site of its kind).
    empty : ndarray
        Fraction of empty sites θ_*: shape ``grid`` with one site kind,
        ``(n_kinds, *grid)`` with several (same as ``empty_by_kind``).
    empty_by_kind : ndarray of shape (n_kinds, *grid)
        θ_* of every site kind, in the order of ``site_kinds``.
    residual : ndarray of shape grid
        Largest site-balance residual over the kinds,
        |1 - θ_*,k - Σ_i n_i c_i θ_*,k^n_i exp(-Σ_j ε_ij θ_j/kT)|, evaluated with the
        returned coverages (dimensionless).
    multiple_solutions : ndarray of bool, shape grid
        True where more than one locally stable self-consistent solution was
        found (attractive interactions: 2D condensation / hysteresis region).
        The returned coverage is the one with the lowest mean-field grand potential.
    iterations : int
        Largest number of Newton iterations used at any point (0 for a closed form).
    site_kinds : tuple
        Labels of the site kinds, in order of first appearance.
    """

    coverage: np.ndarray
    empty: np.ndarray
    empty_by_kind: np.ndarray
    residual: np.ndarray
    multiple_solutions: np.ndarray
    iterations: int
    site_kinds: tuple

    @property
    def phase_separation(self) -> bool:
        """True if any point has several stable mean-field solutions."""
        return bool(np.any(self.multiple_solutions))


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


# --------------------------------------------------------------------------- interacting solve

class _Problem:
    """Arrays shared by the Newton iterations on one chunk (species-major layout (n, m))."""

    def __init__(self, spec, ln_c, kT):
        self.spec = spec
        self.n = spec.n_species
        self.ln_c = ln_c                     # (n, m)
        self.inv_kT = 1.0 / kT               # (m,)
        # rounding floor of R from the size of the terms that make it up:
        # |W| <= |ln c| + |h| + ..., |h_i| <= Σ_j |ε_ij| / (n_j kT)
        h_bound = (np.abs(spec.eps) / spec.sites[None, :]).sum(axis=1)[:, None] * self.inv_kT
        self.rnd = 4.0 * np.finfo(float).eps * (np.abs(ln_c) + 2.0 * h_bound + 1.0)
        self.eps = spec.eps
        self.bound = _entropy_curvature_bound(spec)
        lam_min = float(np.linalg.eigvalsh(spec.eps)[0])
        # H + mu S is positive definite for every mu >= mu_max (S: entropic Hessian)
        self.mu_max = np.maximum(0.0, -lam_min * self.inv_kT / self.bound - 1.0) * 1.001 + 1e-9
        self.maybe_nonconvex = lam_min * self.inv_kT < -self.bound
        self.sites = spec.sites[:, None]
        self.nm1 = self.sites - 1.0
        self.ln_n = np.log(self.sites)
        self.same = spec.kind_of[:, None] == spec.kind_of[None, :]
        self.multi_site = bool(np.any(spec.sites != 1.0))
        self.one_kind = len(spec.members) == 1

    def take(self, sel):
        sub = object.__new__(_Problem)
        sub.__dict__.update(self.__dict__)
        sub.ln_c = self.ln_c[:, sel]
        sub.rnd = self.rnd[:, sel]
        sub.inv_kT = self.inv_kT[sel]
        sub.mu_max = self.mu_max[sel]
        sub.maybe_nonconvex = self.maybe_nonconvex[sel]
        return sub

    def state(self, W):
        """(ln Z per kind (n_kinds, m), ln Z of each species (n, m), θ (n, m))."""
        if self.one_kind:
            mx = np.maximum(W.max(axis=0), 0.0)
            lz = mx + np.log(np.exp(-mx) + np.exp(W - mx).sum(axis=0))
            lnZ_k = lz[None]
            lnZ_of = lnZ_k
        else:
            lnZ_k = np.empty((len(self.spec.members), W.shape[1]))
            for k, idx in enumerate(self.spec.members):
                wk = W[idx]
                mx = np.maximum(wk.max(axis=0), 0.0)
                lnZ_k[k] = mx + np.log(np.exp(-mx) + np.exp(wk - mx).sum(axis=0))
            lnZ_of = lnZ_k[self.spec.kind_of]
        theta = np.exp(W - lnZ_of - self.ln_n)
        return lnZ_k, lnZ_of, theta

    def residual(self, W, lnZ_of, theta):
        """R_i = ln θ_i - n_i ln θ_* - ln c_i + Σ_j ε_ij θ_j / kT, and Σ_j ε_ij θ_j."""
        e_theta = self.eps @ theta
        R = W - self.ln_n - self.ln_c + e_theta * self.inv_kT
        if self.multi_site:
            R += self.nm1 * lnZ_of
        return R, e_theta

    def omega(self, W, lnZ_k, lnZ_of, theta, e_theta):
        """Ω/kT, the mean-field grand potential per site over kT."""
        ln_theta = W - lnZ_of - self.ln_n
        val = (theta * (ln_theta - self.ln_c + self.nm1 + 0.5 * e_theta * self.inv_kT)).sum(axis=0)
        return val - (np.exp(-lnZ_k) * lnZ_k).sum(axis=0)

    def _kind_sums(self, X):
        """Σ_{l in kind(j)} X[..., l, :] broadcast back to every j, X (..., n, m)."""
        if self.one_kind:
            return np.broadcast_to(X.sum(axis=-2, keepdims=True), X.shape)
        out = np.empty_like(X)
        for idx in self.spec.members:
            out[..., idx, :] = X[..., idx, :].sum(axis=-2, keepdims=True)
        return out

    def entropic_jacobian(self, theta):
        """J_S = S P, the part of ∂R/∂W from the ideal terms, shape (n, n, m)."""
        eye = np.broadcast_to(np.eye(self.n)[:, :, None], (self.n, self.n, theta.shape[1]))
        if not self.multi_site:
            return eye
        s = theta * self.sites
        return eye + (self.nm1 * self.same)[:, :, None] * s[None]

    def jacobian(self, theta, e_theta):
        """J = ∂R/∂W = (S + ε/kT) P, shape (n, n, m)."""
        s = theta * self.sites
        t_k = theta * self.inv_kT
        if self.one_kind and not self.multi_site:
            # s = θ: J_ij = δ_ij + (ε_ij - Σ_l ε_il θ_l) θ_j / kT
            J = self.eps[:, :, None] - e_theta[:, None, :]
            J *= t_k[None]
        elif self.one_kind:
            g_k = e_theta * self.inv_kT                      # Σ_l ε_il θ_l / kT
            J = self.eps[:, :, None] * t_k[None]
            J -= g_k[:, None, :] * s[None]
        else:
            G = np.empty((self.n, self.n, theta.shape[1]))  # Σ_{l in kind(j)} ε_il θ_l / kT
            for idx in self.spec.members:
                G[:, idx, :] = (self.eps[:, idx] @ t_k[idx])[:, None, :]
            J = self.eps[:, :, None] * t_k[None]
            J -= s[None] * G
        J[np.arange(self.n), np.arange(self.n)] += 1.0
        if self.multi_site:
            J += (self.nm1 * self.same)[:, :, None] * s[None]
        return J

    def apply_projector(self, theta, X):
        """P X with P = ∂θ/∂W; X of shape (n, ...) with trailing point axis."""
        s = theta * self.sites
        return theta * (X - self._kind_sums(s * X))

    def directional(self, R, theta, dW):
        """(∂(Ω/kT)/∂W) · dW = R · (P dW)."""
        return (R * self.apply_projector(theta, dW)).sum(axis=0)


def _solve_small(A, b):
    """Solve A x = b for stacks A (n, n, m), b (n, m) by Gaussian elimination.

    No row exchanges, for speed; points where a pivot is small compared with the
    entries below it are re-solved by LAPACK with partial pivoting
    (numpy.linalg.solve), so the result is as stable as a pivoted LU.
    """
    n = A.shape[0]
    U = A.copy()
    x = b.copy()
    weak = np.zeros(b.shape[1], dtype=bool)
    for k in range(n):
        piv = U[k, k]
        if k < n - 1:
            below = np.abs(U[k + 1:, k]).max(axis=0)
            weak |= ~(np.abs(piv) >= 1e-3 * below) | (piv == 0)
        else:
            weak |= ~(np.abs(piv) > 0)
        piv = np.where(weak, 1.0, piv)
        U[k, k] = piv
        if k < n - 1:
            f = U[k + 1:, k] / piv
            U[k + 1:, k + 1:] -= f[:, None] * U[k, k + 1:][None]
            x[k + 1:] -= f * x[k]
    for k in range(n - 1, -1, -1):
        if k < n - 1:
            x[k] -= (U[k, k + 1:] * x[k + 1:]).sum(axis=0)
        x[k] /= U[k, k]
    if np.any(weak):
        sel = np.flatnonzero(weak)
        Aw = np.moveaxis(A[:, :, sel], 2, 0)
        try:
            x[:, sel] = np.linalg.solve(Aw, b[:, sel].T[:, :, None])[:, :, 0].T
        except np.linalg.LinAlgError:
            for q, m in enumerate(sel):
                x[:, m] = np.linalg.lstsq(Aw[q], b[:, m], rcond=None)[0]
    return x


def _bordered_positive_definite(spec, inv_kT, theta, empty, scale=1.0):
    """True where the Hessian (scale·S + ε/kT) of Ω/kT in θ is positive definite.

    With D = diag(θ), D^½ (scale·S + ε/kT) D^½ = scale·I + Ẽ + scale Σ_k v_k v_k^T/θ_*,k,
    Ẽ = D^½ ε D^½/kT, v_k = D^½ n restricted to kind k. By the Haynsworth inertia
    formula it is positive definite exactly when the bordered matrix
    [[scale·I + Ẽ, V], [V^T, -diag(θ_*)/scale]] has exactly one negative eigenvalue
    per site kind. The inertia is counted from the pivots of an LDLᵀ factorisation;
    the bordered form never divides by θ_* and stays well scaled near saturation.
    Points with a (near-)zero pivot are reported as not positive definite.
    """
    n = spec.n_species
    nk = len(spec.members)
    m = theta.shape[1]
    size = n + nk
    r = np.sqrt(theta)
    M = np.zeros((size, size, m))
    M[:n, :n] = spec.eps[:, :, None] * (r[:, None, :] * r[None, :, :]) * inv_kT
    M[np.arange(n), np.arange(n)] += scale
    for k, idx in enumerate(spec.members):
        v = r[idx] * spec.sites[idx][:, None]
        M[idx, n + k] = v
        M[n + k, idx] = v
        M[n + k, n + k] = -empty[k] / scale
    d = np.empty((size, m))
    L = np.zeros((size, size, m))
    small = np.zeros(m, dtype=bool)
    for k in range(size):
        dk = M[k, k] - (L[k, :k] ** 2 * d[:k]).sum(axis=0)
        if k < n:
            small |= np.abs(dk) < 1e-11 * (1.0 + np.abs(M[k, k]))
        else:
            small |= dk == 0
        d[k] = np.where(dk == 0, 1.0, dk)
        for i in range(k + 1, size):
            L[i, k] = (M[i, k] - (L[i, :k] * L[k, :k] * d[:k]).sum(axis=0)) / d[k]
    return ((d < 0).sum(axis=0) == nk) & ~small


def _convexified(prob, theta, lnZ_k, J):
    """Replace J = H P by (H + μS) P where H is not positive definite (μ per point)."""
    sel = np.flatnonzero(prob.maybe_nonconvex)
    sub = prob.take(sel)
    th = theta[:, sel]
    empty = np.exp(-lnZ_k[:, sel])
    need = ~_bordered_positive_definite(sub.spec, sub.inv_kT, th, empty)
    if not np.any(need):
        return J
    J = J.copy()
    todo = np.flatnonzero(need)
    Jsel = J[:, :, sel]
    Js = sub.entropic_jacobian(th)
    for frac in _MU_FRACTIONS:
        st = sub.take(todo)
        mu = frac * st.mu_max
        if frac < 1.0:
            good = _bordered_positive_definite(st.spec, st.inv_kT, th[:, todo], empty[:, todo],
                                               1.0 + mu)
        else:
            good = np.ones(todo.size, dtype=bool)
        J[:, :, sel[todo[good]]] = Jsel[:, :, todo[good]] + mu[good] * Js[:, :, todo[good]]
        todo = todo[~good]
        if todo.size == 0:
            break
    return J


def _converged(aR, theta, rnd, prev_err):
    """Per point: converged, and the coverage-weighted error max_i θ_i |R_i|.

    Converged when the weighted error is below 1e-14 (allowing for the rounding
    floor ``rnd`` of R) with every non-negligible |R_i| below 1e-10, or when the
    weighted error is already below 1e-12 and the last Newton step no longer
    reduced it (the rounding floor of the equations has been reached).
    """
    err = (theta * aR).max(axis=0)
    rel = np.all((aR <= 1e-10 + rnd) | (theta < 1e-250), axis=0)
    tight = np.all(theta * (aR - rnd) <= 1e-14, axis=0)
    stalled = (err <= 1e-12) & (err >= 0.25 * prev_err)
    return (tight | stalled) & rel, err


def _newton(prob, W):
    """Damped Newton on R(W) = 0 with an Armijo line search on Ω; W (n, m) start.

    Returns W, ok (bool per point), iterations used.  The Newton direction is a
    descent direction of Ω wherever the Hessian H of Ω is positive definite; where it
    is not (possible only where ``prob.maybe_nonconvex``), H is replaced by H + μS
    (S the entropic Hessian, μ the smallest of a geometric ladder of trial values
    that makes it positive definite), so every step is a descent direction and every
    accepted step lowers Ω.
    """
    m = W.shape[1]
    W = W.copy()
    ok = np.zeros(m, dtype=bool)
    active = np.arange(m)
    sub = prob
    Wa = W
    lnZ_k, lnZ_of, th = sub.state(Wa)
    R, eth = sub.residual(Wa, lnZ_of, th)
    phi = sub.omega(Wa, lnZ_k, lnZ_of, th, eth)
    prev_err = np.full(m, np.inf)
    it = 0
    for it in range(1, _MAX_ITER + 1):
        aR = np.abs(R)
        done, prev_err = _converged(aR, th, sub.rnd, prev_err)
        if np.any(done):
            W[:, active[done]] = Wa[:, done]
            ok[active[done]] = True
            keep = ~done
            active = active[keep]
            if active.size == 0:
                break
            sub = sub.take(keep)
            Wa, lnZ_k, lnZ_of, th, R, eth, phi, aR, prev_err = (
                Wa[:, keep], lnZ_k[:, keep], lnZ_of[:, keep], th[:, keep], R[:, keep],
                eth[:, keep], phi[keep], aR[:, keep], prev_err[keep])
        J = sub.jacobian(th, eth)
        if np.any(sub.maybe_nonconvex):
            J = _convexified(sub, th, lnZ_k, J)
        dW = -_solve_small(J, R)
        slope = sub.directional(R, th, dW)
        big = np.max(np.abs(dW), axis=0)
        scale = np.minimum(1.0, _MAX_STEP / np.maximum(big, 1e-300))
        dW *= scale
        slope *= scale
        near = aR.max(axis=0) < 1e-8
        alpha = np.ones(active.size)
        tol = 1e-13 * (np.abs(phi) + 1.0)
        # first trial: the full (capped) step for every point; where every point is
        # already in the quadratic regime the step is taken without evaluating Ω
        Wt = Wa + dW
        lz_k, lz_of, tht = sub.state(Wt)
        Rt, etht = sub.residual(Wt, lz_of, tht)
        if np.all(near):
            Wa, lnZ_k, lnZ_of, th, R, eth = Wt, lz_k, lz_of, tht, Rt, etht
            continue
        phit = sub.omega(Wt, lz_k, lz_of, tht, etht)
        accept = near | (phit <= phi + 1e-4 * slope + tol)
        if np.all(accept):
            Wa, lnZ_k, lnZ_of, th, R, eth, phi = Wt, lz_k, lz_of, tht, Rt, etht, phit
            continue
        acc = accept
        Wa[:, acc] = Wt[:, acc]
        lnZ_k[:, acc] = lz_k[:, acc]
        if not sub.one_kind:
            lnZ_of[:, acc] = lz_of[:, acc]
        th[:, acc] = tht[:, acc]
        R[:, acc] = Rt[:, acc]
        eth[:, acc] = etht[:, acc]
        phi[acc] = phit[acc]
        pending = np.flatnonzero(~accept)
        for trial in range(1, 60):
            alpha[pending] *= 0.5
            sp = sub.take(pending)
            Wt = Wa[:, pending] + alpha[pending] * dW[:, pending]
            lz_k, lz_of, tht = sp.state(Wt)
            Rt, etht = sp.residual(Wt, lz_of, tht)
            phit = sp.omega(Wt, lz_k, lz_of, tht, etht)
            accept = phit <= phi[pending] + 1e-4 * alpha[pending] * slope[pending] + tol[pending]
            if trial == 59:
                accept[:] = True    # keep the smallest trial step
            acc = pending[accept]
            Wa[:, acc] = Wt[:, accept]
            lnZ_k[:, acc] = lz_k[:, accept]
            if not sub.one_kind:
                lnZ_of[:, acc] = lz_of[:, accept]
            th[:, acc] = tht[:, accept]
            R[:, acc] = Rt[:, accept]
            eth[:, acc] = etht[:, accept]
            phi[acc] = phit[accept]
            pending = pending[~accept]
            if pending.size == 0:
                break
        if sub.one_kind:
            lnZ_of = lnZ_k
    else:
        done, _ = _converged(np.abs(R), th, sub.rnd, prev_err)
        ok[active[done]] = True
        W[:, active] = Wa
        return W, ok, it
    return W, ok, it


def _start_from_ideal(prob, ln_c_shifted):
    """Log site-fraction ratios W of the non-interacting solution with given ln c."""
    ln_empty, _ = _ideal_ln_empty(ln_c_shifted, prob.spec)      # (n_kinds, m)
    # W_i = ln(n_i θ_i / θ_*) = ln n_i + ln c_i + (n_i - 1) ln θ_*
    W = ln_c_shifted + prob.ln_n
    if prob.multi_site:
        W = W + prob.nm1 * ln_empty[prob.spec.kind_of]
    return W


def _is_local_minimum(prob, theta, lnZ_k):
    """True where the Hessian of Ω (in θ) is positive definite: a locally stable state."""
    return _bordered_positive_definite(prob.spec, prob.inv_kT, theta, np.exp(-lnZ_k))


def _entropy_curvature_bound(spec):
    """Lower bound b on the eigenvalues of the entropic Hessian S of Ω/kT (in θ).

    One species per kind: 1/θ + n²/θ_* >= n(1 + √n)² >= 4.  Several single-site
    species in a kind: >= 2.  Otherwise >= 1 (see docs/methods-coverages.md).
    """
    sizes = [len(idx) for idx in spec.members]
    if max(sizes) == 1:
        return 4.0
    if np.all(spec.sites == 1.0):
        return 2.0
    return 1.0


def _unique_by_box(prob):
    """Points where Ω is certified strictly convex on a box containing every solution.

    Every solution has fields h_i = Σ_j ε_ij θ_j/kT between the sums of the negative
    and of the positive ε_ij/n_j; the ideal solutions at the extreme fields bound each
    θ_i from above and θ_* from above (competition only lowers a coverage).  On the
    box the Hessian S + ε/kT >= diag(1/θ_i^max) + Σ_k n_k n_k^T/θ_*,k^max + ε/kT in the
    Loewner order; if that matrix is positive definite, Ω is strictly convex on the
    (convex) box and the solution is unique.
    """
    spec = prob.spec
    ik = prob.inv_kT
    e_over_n = spec.eps / spec.sites[None, :]
    h_lo = np.minimum(e_over_n, 0.0).sum(axis=1)[:, None] * ik      # (n, m)
    h_hi = np.maximum(e_over_n, 0.0).sum(axis=1)[:, None] * ik
    lc_hi = prob.ln_c - h_lo
    lc_lo = prob.ln_c - h_hi
    n = prob.n
    theta_max = np.empty_like(prob.ln_c)
    for i in range(n):
        lc = lc_lo.copy()
        lc[i] = lc_hi[i]
        ln_e, _ = _ideal_ln_empty(lc, spec)
        theta_max[i] = np.exp(lc[i] + spec.sites[i] * ln_e[spec.kind_of[i]])
    ln_e_max, _ = _ideal_ln_empty(lc_lo, spec)
    return _bordered_positive_definite(spec, ik, theta_max, np.exp(ln_e_max))


def _solve_interacting(spec, ln_c, kT):
    """Coverages with interactions; ln_c (n, M), kT (M,). Returns theta, ln_empty, multi, it, ok."""
    n, M = ln_c.shape
    theta_out = np.empty((n, M))
    ln_emp_out = np.empty((len(spec.members), M))
    multi = np.zeros(M, dtype=bool)
    ok_all = np.ones(M, dtype=bool)
    it_max = 0
    for lo in range(0, M, _CHUNK):
        sl = slice(lo, min(M, lo + _CHUNK))
        prob = _Problem(spec, np.ascontiguousarray(ln_c[:, sl]), kT[sl])
        W, ok, it = _newton(prob, _start_from_ideal(prob, prob.ln_c))
        it_max = max(it_max, it)
        cand = np.flatnonzero(prob.maybe_nonconvex)
        if cand.size:
            cand = cand[~_unique_by_box(prob.take(cand))]
        if cand.size:
            sub = prob.take(cand)
            sols = [W[:, cand]]
            oks = [ok[cand]]
            for j in range(n):
                shift = -(spec.eps[:, j] / spec.sites[j])[:, None] * sub.inv_kT
                Wj, okj, itj = _newton(sub, _start_from_ideal(sub, sub.ln_c + shift))
                it_max = max(it_max, itj)
                sols.append(Wj)
                oks.append(okj)
            thetas, phis, minima, errs = [], [], [], []
            for Ws in sols:
                lz_k, lz_of, tht = sub.state(Ws)
                Rs, etht = sub.residual(Ws, lz_of, tht)
                thetas.append(tht)
                phis.append(sub.omega(Ws, lz_k, lz_of, tht, etht))
                minima.append(_is_local_minimum(sub, tht, lz_k))
                errs.append((tht * np.abs(Rs)).max(axis=0))
            phis = np.array(phis)
            minima = np.array(minima)
            thetas = np.array(thetas)                      # (starts, n, m)
            errs = np.array(errs)
            cols = np.arange(cand.size)
            ranked = np.where(minima, phis, np.inf)
            pick = np.where(np.isfinite(ranked.min(axis=0)), np.argmin(ranked, axis=0),
                            np.argmin(phis, axis=0))
            chosen = thetas[pick, :, cols].T               # (n, m)
            far = np.max(np.abs(thetas - chosen[None]), axis=1) > _DISTINCT
            multi[lo + cand] = np.any(far & minima, axis=0) & minima[pick, cols]
            # among the starts that reached the chosen state, keep the most accurate
            same = ~far & (minima | ~minima[pick, cols][None])
            pick = np.argmin(np.where(same, errs, np.inf), axis=0)
            W[:, cand] = np.array(sols)[pick, :, cols].T
            ok[cand] = np.all(np.array(oks), axis=0)
        lnZ_k, _, th = prob.state(W)
        theta_out[:, sl] = th
        ln_emp_out[:, sl] = -lnZ_k
        ok_all[sl] = ok
    return theta_out, ln_emp_out, multi, it_max, ok_all


# --------------------------------------------------------------------------- public

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


def site_coverages(K, pressures, dissociative=None, interactions=None, temperature=None, *,
                   sites_per_species=None, site_kind=None, warn_multiple=True):
    """Equilibrium coverages of competing adsorbates from a Langmuir-type site balance.

    Parameters
    ----------
    K : array_like of shape (n_species, ...)
        Equilibrium constants in Pa^-1 (species on axis 0): θ_i = K_i p_i θ_*
        (molecular) or θ_i = (K_i p_i)^(1/2) θ_* (dissociative, K of A2 + 2* ⇌ 2A*).
        Values >= 0; K = 0 means the species does not adsorb.
    pressures : array_like of shape (n_species, ...)
        Gas partial pressures (or fugacities) in Pa, >= 0. Axis 0 is the species axis;
        the remaining axes of K, pressures and temperature broadcast by numpy's rules.
    dissociative : sequence of bool, optional
        True for a species whose gas precursor A2 gives two adsorbed A; its coverage
        counts atoms per site. Default: all molecular.
    interactions : array_like of shape (n_species, n_species), optional
        Symmetric mean-field interaction matrix ε_ij in eV: the adsorption energy of
        one i (per atom for a dissociative species) is E_i(0) + Σ_j ε_ij θ_j, so
        K_i,eff = K_i exp(-Σ_j ε_ij θ_j / kT) (squared for a dissociative species).
        ε > 0 repulsive. Fowler & Guggenheim 1939; Frumkin, Z. Phys. Chem. 1925, 116, 466.
    temperature : array_like, optional
        Temperature in K, broadcasting against the grid axes. Required with interactions.
    sites_per_species : sequence of int, optional (keyword-only)
        Number of sites n_i one adsorbed molecule (atom) occupies; θ_i = c_i θ_*^n_i and
        the site balance is θ_* + Σ n_i θ_i = 1. Default 1 for every species.
    site_kind : sequence of hashable, optional (keyword-only)
        Label of the site kind each species adsorbs on; species compete only within
        their kind and each kind has its own balance. Default: one kind.
    warn_multiple : bool, optional (keyword-only)
        Emit a :class:`~adsorb.errors.ModelWarning` (once per call) when several stable
        solutions are found. Default True.

    Returns
    -------
    CoverageSolution
        ``.coverage`` (n_species, *grid) in ML, ``.empty``, ``.empty_by_kind``,
        ``.residual``, ``.multiple_solutions``, ``.iterations``, ``.site_kinds``.

    Raises
    ------
    InputError
        Bad shapes or values, interactions without temperature, a non-symmetric ε.
    ConvergenceError
        The interacting solve did not reach a site-balance residual of 1e-12; the
        message names the grid index, temperature and pressures.

    Notes
    -----
    Without interactions the solution is closed-form (θ_* = 1/(1 + Σ c_i) with
    single-site species) or, with multi-site species, a monotone Newton iteration on
    ln θ_* that cannot overshoot. With interactions, a damped Newton iteration on the
    equilibrium equations in the log site-fraction ratios w_i = ln(n_i θ_i/θ_*),
    started from the non-interacting solution, with an Armijo line search on the
    mean-field grand potential Ω (module docstring). Where Ω is provably convex
    (λ_min(ε) >= -b kT, b the curvature bound of the entropy term) the solution is
    unique. Elsewhere the solve is repeated from the non-interacting solution in the
    field of a layer saturated by each species in turn; distinct local minima of Ω
    set ``multiple_solutions`` and the lowest Ω is returned.

    Precision: the target residual 1e-12 is met while max|ε|/kT stays below about 100;
    beyond that the rounding of the equations themselves (terms of size |ε|/kT) can
    exceed it and ConvergenceError is raised. See docs/methods-coverages.md.
    """
    spec, ln_c, kT, grid, (Kb, pb) = _prepare(
        K, pressures, temperature,
        (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=interactions is not None)
    n = spec.n_species
    M = int(np.prod(grid, dtype=int))
    ln_c2 = ln_c.reshape(n, M)
    kT2 = None if kT is None else kT.reshape(M)
    multi = np.zeros(M, dtype=bool)
    if spec.eps is None or not np.any(spec.eps):
        ln_empty, it = _ideal_ln_empty(ln_c2, spec)
        theta = np.exp(ln_c2 + spec.sites[:, None] * ln_empty[spec.kind_of])
        ok = np.ones(M, dtype=bool)
        spec_res = spec if spec.eps is None else _Spec(**{**spec.__dict__, "eps": None})
        residual = _site_balance_residual(theta, ln_empty, ln_c2, spec_res, kT2)
    else:
        theta, ln_empty, multi, it, ok = _solve_interacting(spec, ln_c2, kT2)
        residual = _site_balance_residual(theta, ln_empty, ln_c2, spec, kT2)
    bad = ~ok | ~(residual <= _SITE_BALANCE_TOL)
    if np.any(bad):
        m = int(np.flatnonzero(bad)[0])
        idx = np.unravel_index(m, grid) if grid else ()
        t_txt = "" if kT2 is None else f"temperature = {kT2[m] / constants.kB_eV:.6g} K, "
        p_txt = np.array2string(pb.reshape(n, M)[:, m], precision=6)
        k_txt = np.array2string(Kb.reshape(n, M)[:, m], precision=6)
        msg = (f"site_coverages did not converge at grid index {tuple(int(i) for i in idx)}: "
               f"{t_txt}pressures = {p_txt} Pa, K = {k_txt} Pa^-1; site-balance residual "
               f"{residual[m]:.3g} after {it} iterations")
        raise ConvergenceError(msg)
    if warn_multiple and np.any(multi):
        msg = (f"site_coverages: {int(multi.sum())} of {M} points have several stable "
               "mean-field solutions (2D condensation / hysteresis); the one with the lowest "
               "grand potential is returned, see .multiple_solutions")
        warnings.warn(msg, ModelWarning, stacklevel=2)
    empty_by_kind = np.exp(ln_empty).reshape((len(spec.kinds),) + grid)
    return CoverageSolution(
        coverage=theta.reshape((n,) + grid),
        empty=empty_by_kind[0] if len(spec.kinds) == 1 else empty_by_kind,
        empty_by_kind=empty_by_kind,
        residual=residual.reshape(grid),
        multiple_solutions=multi.reshape(grid),
        iterations=int(it),
        site_kinds=spec.kinds,
    )


def _coverage_setup(K, coverage, dissociative, interactions, temperature,
                    sites_per_species, site_kind):
    theta = _as_float_array(coverage, "coverage")
    Kc = _as_float_array(K, "K")
    if theta.ndim == 0 or Kc.ndim == 0:
        msg = f"K and coverage: expected the species on axis 0, got shapes {Kc.shape} and {theta.shape}"
        raise InputError(msg)
    spec, _, kT, grid, _ = _prepare(
        Kc, np.ones_like(theta), temperature,
        (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=interactions is not None)
    n = spec.n_species
    theta = np.broadcast_to(_species_first(theta, len(grid)), (n,) + grid)
    Kb = np.broadcast_to(_species_first(Kc, len(grid)), (n,) + grid)
    if not np.all(np.isfinite(theta)) or np.any(theta < 0):
        msg = f"coverage: expected finite values >= 0 in ML, got {coverage!r}"
        raise InputError(msg)
    empty = []
    for idx in spec.members:
        e = 1.0 - (spec.sites[idx].reshape((-1,) + (1,) * len(grid)) * theta[idx]).sum(axis=0)
        empty.append(e)
    empty = np.array(empty)
    if np.any(empty < -1e-12):
        msg = "coverage: occupied site fraction Σ n_i θ_i exceeds 1 on some site kind"
        raise InputError(msg)
    return spec, theta, Kb, kT, grid, np.clip(empty, 0.0, None)


def pressures_for_coverage(K, coverage, dissociative=None, interactions=None, temperature=None,
                           *, sites_per_species=None, site_kind=None):
    """Partial pressures (Pa) at which the given coverages are in equilibrium.

    The explicit inverse of the equations solved by :func:`site_coverages`:
    ln p_i = m_i [ln θ_i - n_i ln θ_* + Σ_j ε_ij θ_j / kT] - ln K_i, with m_i = 1
    (molecular) or 2 (dissociative). Same conventions and arguments as
    :func:`site_coverages`, with ``coverage`` (n_species, ...) in ML in place of the
    pressures.

    Returns
    -------
    ndarray of shape (n_species, *grid)
        Pressures (or fugacities) in Pa.

    Raises
    ------
    InputError
        A coverage <= 0, a full site kind (θ_* = 0), K <= 0, or the arguments of
        :func:`site_coverages` are invalid.
    """
    spec, theta, Kb, kT, grid, empty = _coverage_setup(
        K, coverage, dissociative, interactions, temperature, sites_per_species, site_kind)
    if np.any(theta <= 0) or np.any(empty[spec.kind_of] <= 0) or np.any(Kb <= 0):
        msg = ("pressures_for_coverage: expected every coverage > 0, an empty-site fraction "
               "> 0 on every kind and K > 0")
        raise InputError(msg)
    nd = len(grid)
    col = (-1,) + (1,) * nd
    ln_rhs = np.log(theta) - spec.sites.reshape(col) * np.log(empty[spec.kind_of])
    if spec.eps is not None:
        ln_rhs = ln_rhs + np.tensordot(spec.eps, theta, axes=(1, 0)) / kT
    mult = np.where(spec.dissociative, 2.0, 1.0).reshape(col)
    return np.exp(mult * ln_rhs - np.log(Kb))


def mean_field_grand_potential(coverage, K, pressures, temperature, dissociative=None,
                               interactions=None, *, sites_per_species=None, site_kind=None):
    """Mean-field grand potential per site Ω (eV) at given coverages.

    Ω = Σ_i θ_i(-kT ln c_i) + ½ Σ_ij ε_ij θ_i θ_j + kT[Σ_i θ_i ln θ_i
    + Σ_k θ_*,k ln θ_*,k + Σ_i (n_i - 1) θ_i], with c_i = K_i p_i (molecular) or
    (K_i p_i)^(1/2) (dissociative) and θ_*,k = 1 - Σ_{i in k} n_i θ_i. Its stationary
    points are the solutions of :func:`site_coverages`; the stable one minimises it.
    At an ideal single-site solution Ω = kT Σ_k ln θ_*,k.

    Parameters
    ----------
    coverage : array_like of shape (n_species, ...)
        Coverages in ML.
    K, pressures, temperature, dissociative, interactions, sites_per_species, site_kind
        As in :func:`site_coverages`; temperature (K) is required.

    Returns
    -------
    ndarray of shape grid
        Ω in eV per site.
    """
    if temperature is None:
        msg = "temperature: required (in K) for the grand potential, got None"
        raise InputError(msg)
    spec, theta, Kb, kT, grid, empty = _coverage_setup(
        K, coverage, dissociative, interactions, temperature, sites_per_species, site_kind)
    _, ln_c, _, grid2, _ = _prepare(
        K, pressures, temperature, (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=False)
    grid = np.broadcast_shapes(grid, grid2)
    nd = len(grid)
    theta = np.broadcast_to(_species_first(theta, nd), (spec.n_species,) + grid)
    ln_c = np.broadcast_to(_species_first(ln_c, nd), theta.shape)
    kT = np.broadcast_to(kT, grid)
    empty = np.broadcast_to(_species_first(empty, nd), (len(spec.kinds),) + grid)
    col = (-1,) + (1,) * nd
    val = (xlogy(theta, theta) - theta * ln_c + (spec.sites - 1.0).reshape(col) * theta).sum(axis=0)
    val = val + xlogy(empty, empty).sum(axis=0)
    out = kT * val
    if spec.eps is not None:
        out = out + 0.5 * np.einsum("i...,ij,j...->...", theta, spec.eps, theta)
    return out
