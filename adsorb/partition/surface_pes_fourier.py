"""The periodic lateral potential-energy surface V(x, y) as a Fourier series: :class:`SurfacePES`.

The data object shared by the construction (:mod:`adsorb.partition.surface_pes`),
the classical integral (:mod:`adsorb.partition.surface_pes_classical`) and the
quantum levels (:mod:`adsorb.partition.surface_pes_quantum`): V as Fourier
coefficients over the reciprocal lattice of the surface cell, its evaluation,
Hessian and harmonic frequencies, its global extrema (grid search and local
polish) and the point group it is invariant under, detected from the
coefficients. Method: complete potential energy sampling, M. Jørgensen and
H. Grönbeck, J. Phys. Chem. C 2017, 121, 7199–7207.

Energies are in eV, lengths in Å, masses in amu. Import the public names
from :mod:`adsorb.partition.surface_pes`.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass, field, replace

import numpy as np
import scipy.optimize

from adsorb import constants as C
from adsorb.errors import InputError


#: h^2 / (2 amu) in eV amu Å^2: kinetic energy of a plane wave with |K| = 1/Å
#: (K without the 2π) for a mass of 1 amu is KINETIC_EV / m.
KINETIC_EV = C.h**2 / (2.0 * C.amu * C.eV) / C.angstrom**2


# ---------------------------------------------------------------------------
# the surface object
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class SurfacePES:
    """A periodic lateral potential-energy surface V(x, y) as a Fourier series.

    V(r) = Σ_G c_G exp(2πi G·r), with G = m b1 + n b2 running over the integer
    pairs in ``g_indices`` (b_i reciprocal to the cell vectors, a_i·b_j = δ_ij)
    and complex coefficients with c_-G = conj(c_G), so V is real.

    Attributes
    ----------
    cell_A : ndarray, shape (2, 2)
        Rows a1, a2: the in-plane cell vectors in Å (Cartesian x, y).
    g_indices : ndarray of int, shape (K, 2)
        Integer indices (m, n) of the Fourier terms.
    coefficients_eV : ndarray of complex, shape (K,)
        Fourier coefficients c_G in eV.
    n_sites : int
        Number of adsorption sites in the cell; partition functions are per site.
    sites : dict
        Named positions in fractional coordinates (for reports and plots).
    lattice : str
        '100', '111' or 'grid'.
    v_min_eV, v_max_eV : float
        Global minimum and maximum of V, eV.
    min_fractional : tuple
        Fractional coordinates of the global minimum.
    point_group : tuple of ndarray
        The integer 2x2 matrices M (acting on fractional coordinates about
        ``symmetry_origin``) with V(o + M r) = V(o + r), detected from the coefficients.
    source : str
        How the surface was built.
    symmetry_origin : tuple
        Fractional position o about which ``point_group`` holds (the cell origin,
        or the minimum or maximum of V when that gives a larger group).
    """

    cell_A: np.ndarray
    g_indices: np.ndarray
    coefficients_eV: np.ndarray
    n_sites: int
    sites: dict
    lattice: str
    v_min_eV: float
    v_max_eV: float
    min_fractional: tuple
    point_group: tuple = field(repr=False)
    source: str = ""
    symmetry_origin: tuple = (0.0, 0.0)

    # ---- geometry ------------------------------------------------------
    @property
    def reciprocal_A(self) -> np.ndarray:
        """Rows b1, b2 with a_i·b_j = δ_ij, in 1/Å (no 2π)."""
        return np.linalg.inv(self.cell_A).T

    @property
    def cell_area_A2(self) -> float:
        """Area of the cell, Å^2."""
        return float(abs(np.linalg.det(self.cell_A)))

    @property
    def corrugation_eV(self) -> float:
        """V_max - V_min, eV."""
        return self.v_max_eV - self.v_min_eV

    @property
    def centrosymmetric(self) -> bool:
        """True when V(-r) = V(r) (all coefficients real)."""
        scale = max(np.max(np.abs(self.coefficients_eV)), 1e-300)
        return bool(np.all(np.abs(self.coefficients_eV.imag) <= 1e-12 * scale))

    def fractional(self, x_A, y_A):
        """Fractional coordinates (u, v) of Cartesian points (x, y) in Å."""
        x = np.asarray(x_A, dtype=float)
        y = np.asarray(y_A, dtype=float)
        inv = np.linalg.inv(self.cell_A)
        return x * inv[0, 0] + y * inv[1, 0], x * inv[0, 1] + y * inv[1, 1]

    # ---- evaluation ----------------------------------------------------
    def energy_fractional(self, u, v):
        """V at fractional coordinates (u, v) (broadcast arrays), eV."""
        u = np.asarray(u, dtype=float)
        v = np.asarray(v, dtype=float)
        shape = np.broadcast_shapes(u.shape, v.shape)
        uf = np.broadcast_to(u, shape).ravel()
        vf = np.broadcast_to(v, shape).ravel()
        out = np.empty(uf.size)
        m = self.g_indices[:, 0].astype(float)
        n = self.g_indices[:, 1].astype(float)
        step = 4096
        for start in range(0, uf.size, step):
            ph = 2.0 * np.pi * (np.outer(uf[start:start + step], m) + np.outer(vf[start:start + step], n))
            out[start:start + step] = (np.cos(ph) @ self.coefficients_eV.real
                                       - np.sin(ph) @ self.coefficients_eV.imag)
        return out.reshape(shape)

    def energy(self, x_A, y_A):
        """V at Cartesian lateral positions (x, y) in Å (broadcast arrays), eV."""
        u, v = self.fractional(x_A, y_A)
        return self.energy_fractional(u, v)

    def energy_grid(self, n1, n2=None):
        """V on the regular n1 x n2 grid u = i/n1, v = j/n2 (exact, by inverse FFT), eV."""
        n2 = n1 if n2 is None else n2
        return _grid_values(self.g_indices, self.coefficients_eV, int(n1), int(n2))

    def hessian_fractional(self, u, v):
        """Hessian of V with respect to the fractional coordinates at one point, eV."""
        m = self.g_indices[:, 0].astype(float)
        n = self.g_indices[:, 1].astype(float)
        ph = np.exp(2j * np.pi * (m * u + n * v)) * self.coefficients_eV
        f = -(2 * np.pi) ** 2
        return np.array([[f * np.sum(m * m * ph).real, f * np.sum(m * n * ph).real],
                         [f * np.sum(m * n * ph).real, f * np.sum(n * n * ph).real]])

    def hessian_at_minimum(self) -> np.ndarray:
        """Cartesian Hessian of V at the global minimum, eV/Å^2 (2x2)."""
        hf = self.hessian_fractional(*self.min_fractional)
        inv = np.linalg.inv(self.cell_A)  # d(u,v)/d(x,y): u = r·b1 -> du/dx_i = inv[i, 0]
        return inv @ hf @ inv.T

    def harmonic_frequencies_cm(self, mass_amu) -> np.ndarray:
        """Frequencies of the two lateral modes at the global minimum, cm^-1 (ascending).

        From the Cartesian Hessian: ν = sqrt(λ/m)/(2π c). A negative curvature
        (not possible at a true minimum) raises InputError.
        """
        m = _positive_scalar("mass_amu", mass_amu, "amu")
        lam = np.linalg.eigvalsh(self.hessian_at_minimum())
        if np.any(lam <= 0):
            raise InputError(f"Hessian at the PES minimum is not positive definite: eigenvalues {lam} eV/Å^2")
        omega = np.sqrt(lam * C.eV / C.angstrom**2 / (m * C.amu))
        return omega / (2.0 * np.pi * C.c * 100.0)

    def site_energies(self) -> dict:
        """V at every named site, eV."""
        return {name: float(self.energy_fractional(*pos)) for name, pos in self.sites.items()}


# ---------------------------------------------------------------------------
# small helpers
# ---------------------------------------------------------------------------
def _positive_scalar(name, value, unit):
    try:
        val = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a positive number in {unit}; got {value!r}") from None
    if not (np.isfinite(val) and val > 0):
        raise InputError(f"{name} must be finite and > 0 {unit}; got {value!r}")
    return val


def _temperatures(temperature):
    t = np.asarray(temperature, dtype=float)
    bad = ~(np.isfinite(t) & (t > 0))
    if np.any(bad):
        first = t[bad].flat[0] if t.ndim else float(t)
        raise InputError(f"temperature must be finite and > 0 K; got {first!r}")
    return t


def _cell(cell_A):
    try:
        cell = np.array(cell_A, dtype=float)
    except (TypeError, ValueError):
        raise InputError(f"cell_A must be a 2x2 array of in-plane cell vectors in Å; got {cell_A!r}") from None
    if cell.shape == (3, 3):
        cell = cell[:2, :2]
    if cell.shape != (2, 2) or not np.all(np.isfinite(cell)):
        raise InputError(f"cell_A must be a 2x2 array (rows a1, a2) in Å; got shape {cell.shape}")
    if abs(np.linalg.det(cell)) < 1e-8:
        raise InputError(f"cell_A vectors are parallel or zero (area {abs(np.linalg.det(cell)):.3g} Å^2)")
    return cell


def _grid_values(g, coef, n1, n2):
    arr = np.zeros((n1, n2), dtype=complex)
    np.add.at(arr, (g[:, 0] % n1, g[:, 1] % n2), coef)
    return (np.fft.ifft2(arr) * (n1 * n2)).real


# ---------------------------------------------------------------------------
# extrema and symmetry of a Fourier series
# ---------------------------------------------------------------------------
def _holohedry(cell):
    """Integer matrices (entries -1..1) on fractional coordinates that are isometries of the lattice."""
    metric = cell @ cell.T
    ops = []
    for entries in itertools.product((-1, 0, 1), repeat=4):
        m = np.array(entries, dtype=int).reshape(2, 2)
        if round(abs(np.linalg.det(m))) != 1:
            continue
        if np.allclose(m.T @ metric @ m, metric, rtol=1e-9, atol=1e-9 * np.max(np.abs(metric))):
            ops.append(m)
    return ops


def _invariance_group(cell, g, coef):
    """Point operations M (fractional, about the origin) with V(M r) = V(r), i.e. c_{M^T G} = c_G."""
    scale = max(np.max(np.abs(coef)), 1e-300)
    table = {tuple(gi): ci for gi, ci in zip(g.tolist(), coef)}
    keep = []
    for m in _holohedry(cell):
        ok = True
        for gi, ci in zip(g.tolist(), coef):
            gt = tuple((m.T @ np.array(gi)).tolist())
            if abs(table.get(gt, 0.0) - ci) > 1e-9 * scale:
                ok = False
                break
        if ok:
            keep.append(m)
    return tuple(keep)


def _extremum(g, coef, sign):
    """Global minimum (sign=+1) or maximum (sign=-1) of the Fourier series: grid search + local polish."""
    gmax = int(np.max(np.abs(g))) if g.size else 0
    n = max(64, 8 * gmax + 8)
    vals = sign * _grid_values(g, coef, n, n)
    flat = np.argsort(vals, axis=None)[:8]
    mf = g[:, 0].astype(float)
    nf = g[:, 1].astype(float)

    def fun(p):
        ph = np.exp(2j * np.pi * (mf * p[0] + nf * p[1])) * coef
        val = sign * np.sum(ph).real
        grad = sign * np.array([np.sum(2j * np.pi * mf * ph).real, np.sum(2j * np.pi * nf * ph).real])
        return val, grad

    best = None
    for idx in flat:
        i, j = np.unravel_index(idx, vals.shape)
        start = np.array([i / n, j / n])
        res = scipy.optimize.minimize(fun, start, jac=True, method="BFGS",
                                      options={"gtol": 1e-13, "maxiter": 200})
        val = min(res.fun, vals[i, j])
        pos = res.x if res.fun <= vals[i, j] else start
        if best is None or val < best[0]:
            best = (val, pos)
    return sign * best[0], tuple(float(x) % 1.0 for x in best[1])


def _snap(pos, max_denominator=12, tol=1e-6):
    """Fractional coordinates rounded to a nearby fraction p/q (q <= 12) when within tol."""
    out = []
    for x in pos:
        x = float(x) % 1.0
        best = x
        for q in range(1, max_denominator + 1):
            cand = round(x * q) / q
            if abs(cand - x) < tol:
                best = cand % 1.0
                break
        out.append(best)
    return tuple(out)


def _centred(pes):
    """Coefficients of V(o + r), o = pes.symmetry_origin (same levels; point_group holds about r = 0)."""
    o = np.asarray(pes.symmetry_origin, dtype=float)
    if not np.any(o):
        return pes
    coef = pes.coefficients_eV * np.exp(2j * np.pi * (pes.g_indices @ o))
    pmin = tuple(float(x) for x in (np.asarray(pes.min_fractional) - o) % 1.0)
    return replace(pes, coefficients_eV=coef, symmetry_origin=(0.0, 0.0), min_fractional=pmin)


def _make_pes(cell, g, coef, *, n_sites, sites, lattice, source):
    g = np.asarray(g, dtype=int).reshape(-1, 2)
    coef = np.asarray(coef, dtype=complex).reshape(-1)
    scale = max(np.max(np.abs(coef)), 1e-300)
    keep = (np.abs(coef) > 1e-15 * scale) | np.all(g == 0, axis=1)
    g, coef = g[keep], coef[keep]
    if not np.any(np.all(g == 0, axis=1)):
        g = np.vstack([g, [0, 0]])
        coef = np.append(coef, 0.0)
    if isinstance(n_sites, bool) or not isinstance(n_sites, (int, np.integer)) or n_sites < 1:
        raise InputError(f"n_sites must be a positive integer (sites per cell); got {n_sites!r}")
    vmin, pmin = _extremum(g, coef, +1.0)
    vmax, vmax_pos = _extremum(g, coef, -1.0)
    group, origin = _invariance_group(cell, g, coef), (0.0, 0.0)
    for cand in (_snap(pmin), _snap(vmax_pos)):
        shifted = coef * np.exp(2j * np.pi * (g @ np.array(cand)))
        trial = _invariance_group(cell, g, shifted)
        if len(trial) > len(group):
            group, origin = trial, cand
    return SurfacePES(cell_A=cell, g_indices=g, coefficients_eV=coef, n_sites=int(n_sites),
                      sites=dict(sites), lattice=lattice, v_min_eV=float(vmin), v_max_eV=float(vmax),
                      min_fractional=pmin, point_group=group, source=source,
                      symmetry_origin=tuple(float(x) for x in origin))
