"""The interacting (mean-field, Fowler–Guggenheim / Frumkin) site balance: damped Newton on Ω.

Damped Newton iterations on the equilibrium equations in the log site-fraction ratios,
vectorised over chunks of grid points, with an Armijo line search on the mean-field
grand potential Ω and a multi-start search where several stable states may coexist
(docs/methods-coverages.md §3). The equations and sources are in the module docstring of
:mod:`adsorb.coverage`; the convexity tests in :mod:`adsorb.coverage_convexity`.
"""

from __future__ import annotations

import numpy as np

from adsorb.coverage_convexity import (
    _convexified,
    _entropy_curvature_bound,
    _is_local_minimum,
    _unique_by_box,
)
from adsorb.coverage_langmuir import _CHUNK, _ideal_ln_empty

# largest Newton step in the log variables (keeps exp() in range, limits excursions)
_MAX_STEP = 20.0
_MAX_ITER = 200
_DISTINCT = 1.0e-7      # two solutions whose coverages differ by more are distinct


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


def _converged(aR, theta, rnd, prev_err):
    """Per point: converged, and the coverage-weighted error max_i θ_i |R_i|.

    Converged when the weighted error is below 1e-14 (allowing for the rounding
    floor ``rnd`` of R) with every non-negligible |R_i| below 1e-10, or when the
    weighted error is already below 1e-12 and the last Newton step reduced it by
    less than a factor of 4 (the rounding floor of the equations has been
    reached). A step that raised the error is not a floor: the first step from
    the ideal start can move the error from a nearly empty species (θ |R| small
    for a large |R|) to a nearly full one, where Newton is not done yet.
    """
    err = (theta * aR).max(axis=0)
    rel = np.all((aR <= 1e-10 + rnd) | (theta < 1e-250), axis=0)
    tight = np.all(theta * (aR - rnd) <= 1e-14, axis=0)
    stalled = (err <= 1e-12) & (err >= 0.25 * prev_err) & (err <= prev_err)
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
