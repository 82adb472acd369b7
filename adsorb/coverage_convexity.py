"""Convexity of the mean-field grand potential: local minima, convexified Newton steps, uniqueness.

The Hessian S + ε/kT of Ω/kT in the coverages decides whether a solution of
:func:`adsorb.coverage.site_coverages` is a stable state, whether the Newton step of
:mod:`adsorb.coverage_mean_field` needs the shift H + μS, and whether the solution is
certified unique (docs/methods-coverages.md §3, steps 2 and 3). Definiteness is counted
from the inertia of a bordered matrix (inertia additivity of the Schur complement:
E. V. Haynsworth, Linear Algebra Appl. 1968, 1, 73, from memory).
"""

from __future__ import annotations

import numpy as np

from adsorb.coverage_langmuir import _ideal_ln_empty

# trial shifts mu / mu_max of the modified Newton step (smallest that convexifies wins)
_MU_FRACTIONS = tuple(4.0 ** -k for k in range(12, -1, -1))


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
