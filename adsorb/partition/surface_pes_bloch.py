"""Plane-wave Bloch Hamiltonian of an adsorbate on a periodic PES, and its levels at one k-point.

H(k)_{GG'} = (ħ²/2m)|k + G|² δ_{GG'} + c_{G-G'} in the basis of plane waves
k + G below a kinetic-energy cut-off, with c_G the Fourier coefficients of
the surface (:class:`~adsorb.partition.surface_pes_fourier.SurfacePES`).
The irreducible k-points of a Γ-centred mesh come from the point group of V
and time reversal; at each k the matrix is made real where an antiunitary
symmetry allows it and split into blocks by the little group of k before it
is diagonalised with ``scipy.linalg.eigvalsh``.

Used by :func:`adsorb.partition.surface_pes.lateral_spectrum`, which
converges the cut-off and the k-mesh.
"""

from __future__ import annotations

import numpy as np
import scipy.linalg
import scipy.sparse

from adsorb.errors import ConvergenceError
from adsorb.partition.surface_pes_fourier import KINETIC_EV


def _reciprocal_ops(pes):
    """Actions R = M^T of the point group on fractional reciprocal vectors (H commutes with e_K -> e_RK)."""
    return [np.asarray(m).T.copy() for m in pes.point_group]


def _kmesh(n, ops):
    """Irreducible points of the Γ-centred n x n mesh under the point group and time reversal: (k, weight)."""
    allops = []
    for r in ops:
        for sgn in (1, -1):
            op = sgn * r
            if not any(np.array_equal(op, q) for q in allops):
                allops.append(op)
    seen = set()
    out = []
    for i in range(n):
        for j in range(n):
            if (i, j) in seen:
                continue
            orbit = set()
            for op in allops:
                p = op @ np.array([i, j])
                orbit.add((int(p[0]) % n, int(p[1]) % n))
            seen |= orbit
            out.append((np.array([i / n, j / n]), len(orbit) / n**2))
    return out


class _Basis:
    """Plane waves k + G with kinetic energy below a cut-off, and a lookup table G -> index."""

    def __init__(self, k, recip, mass, ecut):
        kmax = np.sqrt(ecut * mass / KINETIC_EV)  # |k + G| in 1/Å
        span = int(np.ceil(kmax / np.min(np.linalg.svd(recip, compute_uv=False)))) + 2
        m, n = np.meshgrid(np.arange(-span, span + 1), np.arange(-span, span + 1), indexing="ij")
        g = np.stack([m.ravel(), n.ravel()], axis=1)
        kc = (g + k) @ recip
        kin = KINETIC_EV / mass * np.sum(kc**2, axis=1)
        # rounded so that symmetry-equivalent plane waves fall on the same side of the cut
        sel = np.round(kin / ecut, 9) <= 1.0
        self.g = g[sel]
        self.kinetic = kin[sel]
        self.span = span
        self.table = -np.ones((2 * span + 1, 2 * span + 1), dtype=np.int64)
        self.table[self.g[:, 0] + span, self.g[:, 1] + span] = np.arange(len(self.g))

    def index(self, g):
        """Indices of integer vectors g (n, 2); -1 where not in the basis."""
        inside = np.all(np.abs(g) <= self.span, axis=1)
        out = -np.ones(len(g), dtype=np.int64)
        gi = g[inside]
        out[inside] = self.table[gi[:, 0] + self.span, gi[:, 1] + self.span]
        return out


def _hamiltonian(basis, pes):
    """Sparse H(k)_{GG'} = kinetic δ + c_{G-G'} (CSR, complex)."""
    rows = [np.arange(len(basis.g))]
    cols = [np.arange(len(basis.g))]
    vals = [basis.kinetic.astype(complex)]
    for dg, c in zip(pes.g_indices, pes.coefficients_eV):
        j = basis.index(basis.g - dg)
        ok = j >= 0
        rows.append(np.nonzero(ok)[0])
        cols.append(j[ok])
        vals.append(np.full(int(ok.sum()), c))
    d = len(basis.g)
    return scipy.sparse.csr_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))),
                                   shape=(d, d))


def _permutation(basis, k, r):
    """Index map i -> j of e_{k+G_i} -> e_{R(k+G_i)} = e_{k+G_j} for R in the little group of k."""
    shift = np.rint(r @ k - k).astype(int)
    j = basis.index(basis.g @ r.T + shift)
    if np.any(j < 0):
        raise ConvergenceError("plane-wave basis is not closed under the point group (internal error)")
    return j


def _blocks(basis, k, ops, rng):
    """Transformations T (sparse D x d) to invariant subspaces of H(k), and whether T^† H T is real.

    * Real basis: if some point operation R with R k ≡ -k and R^2 = 1 exists, the
      antiunitary Θ = K·O_R (time reversal times R) commutes with H; in the basis
      (e_G + e_θG)/√2, -i(e_G - e_θG)/√2 (θ the partner map) H is real.
    * Blocks: H commutes with every O_g of the little group, hence with a random
      Hermitian Q = Σ r_g (O_g + O_g^T). Q is block-diagonal over the orbits of the
      plane waves; its eigenspaces (found orbit by orbit) are invariant under H.
    """
    d = len(basis.g)
    little = [r for r in ops if np.allclose(r @ k - k, np.rint(r @ k - k), atol=1e-9)]
    anti = [r for r in ops if np.allclose(r @ k + k, np.rint(r @ k + k), atol=1e-9)
            and np.array_equal(r @ r, np.eye(2, dtype=int))]
    perms = [_permutation(basis, k, r) for r in little]
    # --- real (Θ-adapted) basis --------------------------------------------------
    if anti:
        # prefer Θ = K (k ≡ -k) or K·O_C2: both commute with every point operation
        central = [r for r in anti if np.array_equal(r, np.eye(2, dtype=int))] + \
                  [r for r in anti if np.array_equal(r, -np.eye(2, dtype=int))]
        r = central[0] if central else anti[0]
        shift = np.rint(-(r @ k) - k).astype(int)  # -(R(k+G)) = k + partner
        partner = basis.index(-(basis.g @ r.T) + shift)
        if np.any(partner < 0):
            raise ConvergenceError("plane-wave basis is not closed under time reversal (internal error)")
        idx = np.arange(d)
        if np.any(partner[partner] != idx):
            raise ConvergenceError("time-reversal partner map is not an involution (internal error)")
        fixed = idx[partner == idx]          # real plane waves (k + G = 0 up to R)
        pair = idx[idx < partner]            # one representative per pair {G, θG}
        s = 1 / np.sqrt(2)
        nf, npair = fixed.size, pair.size
        cos_col = nf + 2 * np.arange(npair)
        rows = np.concatenate([fixed, pair, partner[pair], pair, partner[pair]])
        cols = np.concatenate([np.arange(nf), cos_col, cos_col, cos_col + 1, cos_col + 1])
        vals = np.concatenate([np.ones(nf, dtype=complex), np.full(npair, s, dtype=complex),
                               np.full(npair, s, dtype=complex), np.full(npair, -1j * s),
                               np.full(npair, 1j * s)])
        u = scipy.sparse.csc_matrix((vals, (rows, cols)), shape=(d, d))
        real = True
    else:
        u = scipy.sparse.identity(d, dtype=complex, format="csc")
        real = False
    # --- the symmetry operators in that basis, and Q ---------------------------------
    q = scipy.sparse.csr_matrix((d, d), dtype=complex)
    for perm in perms:
        p = scipy.sparse.csr_matrix((np.ones(d), (perm, np.arange(d))), shape=(d, d))
        pu = (u.conj().T @ p @ u).tocsr()
        if real and np.max(np.abs(pu.data.imag), initial=0.0) > 1e-12:
            continue  # this operation does not commute with Θ; leave it out of Q
        coeff = rng.uniform(0.5, 1.5)
        q = q + coeff * (pu + pu.conj().T)
    q = q.tocsr()
    if real:
        q = scipy.sparse.csr_matrix(q.real)
    # orbits = connected components of Q's sparsity pattern; Q is diagonalised orbit by orbit,
    # batched over orbits of equal size
    qc = q.tocoo()
    pattern = scipy.sparse.coo_matrix((np.ones(qc.nnz), (qc.row, qc.col)), shape=(d, d)) \
        + scipy.sparse.identity(d, format="coo")
    ncomp, label = scipy.sparse.csgraph.connected_components(pattern.tocsr(), directed=False)
    order = np.argsort(label, kind="stable")
    counts = np.bincount(label, minlength=ncomp)
    first_of = np.concatenate([[0], np.cumsum(counts)[:-1]])
    local = np.empty(d, dtype=np.int64)
    local[order] = np.arange(d) - first_of[label[order]]
    vec_rows, vec_cols, vec_vals, eig_list = [], [], [], []
    col = 0
    for size in np.unique(counts):
        comps = np.nonzero(counts == size)[0]
        slot = -np.ones(ncomp, dtype=np.int64)
        slot[comps] = np.arange(comps.size)
        mats = np.zeros((comps.size, size, size), dtype=q.dtype)
        sel = slot[label[qc.row]] >= 0
        np.add.at(mats, (slot[label[qc.row[sel]]], local[qc.row[sel]], local[qc.col[sel]]), qc.data[sel])
        mats = 0.5 * (mats + np.conj(np.swapaxes(mats, 1, 2)))
        lam, vec = np.linalg.eigh(mats)
        members = order[(first_of[comps][:, None] + np.arange(size)[None, :])]  # (ncomp_s, size)
        # vec[c, i, a]: component c, member i, eigenvector a -> column cols[c, a], row members[c, i]
        ncol = comps.size * size
        cols = col + np.arange(ncol).reshape(comps.size, size)
        vec_rows.append(np.broadcast_to(members[:, :, None], (comps.size, size, size)).reshape(-1))
        vec_cols.append(np.broadcast_to(cols[:, None, :], (comps.size, size, size)).reshape(-1))
        vec_vals.append(vec.reshape(-1))
        eig_list.append(lam.reshape(-1))
        col += ncol
    vec_rows = np.concatenate(vec_rows)
    vec_cols = np.concatenate(vec_cols)
    vec_vals = np.concatenate(vec_vals)
    eig_of_col = np.concatenate(eig_list)
    w = scipy.sparse.csc_matrix((vec_vals, (vec_rows, vec_cols)), shape=(d, d))
    eig = eig_of_col
    srt = np.argsort(eig)
    gaps = np.nonzero(np.diff(eig[srt]) > 1e-6)[0]
    groups = np.split(srt, gaps + 1)
    out = []
    for grp in groups:
        t = (u @ w[:, grp]).tocsc()
        out.append(t)
    return out, real


def _levels_at_k(pes, mass, k, ecut, emax, ops, rng):
    """Levels below emax at one k-point, block by block."""
    basis = _Basis(k, pes.reciprocal_A, mass, ecut)
    h = _hamiltonian(basis, pes)
    blocks, real = _blocks(basis, k, ops, rng)
    levels = []
    for t in blocks:
        hb = (t.conj().T @ h @ t).toarray()
        if real:
            hb = hb.real
        hb = 0.5 * (hb + hb.conj().T)
        ev = scipy.linalg.eigvalsh(hb, driver="evd") if hb.shape[0] > 1 else np.linalg.eigvalsh(hb)
        levels.append(ev[ev <= emax])
    lev = np.sort(np.concatenate(levels)) if levels else np.zeros(0)
    return lev, len(basis.g), max(b.shape[1] for b in blocks)
