"""Lateral motion of an adsorbate on a periodic potential-energy surface.

The energy of an adsorbate as a function of its lateral position, V(x, y), is
periodic over the surface cell. This module builds V as a Fourier series over
the reciprocal lattice of the cell and computes the partition function of the
two in-plane translations on it, classically (phase-space integral) and
quantum mechanically (Bloch bands of the 2D Schrödinger equation).

Two ways to build V:

* :func:`pes_from_grid` – energies on a regular grid over the fractional
  coordinates of the cell, fitted exactly by a 2D FFT (the trigonometric
  interpolant through every grid value).
* :func:`pes_from_sites` – energies of the high-symmetry sites of a square
  (100) or hexagonal (111) surface, interpolated exactly by a
  symmetry-adapted Fourier series. The basis functions are star functions of
  the reciprocal lattice, sum over the orbit of G under the point group of the
  surface (p4m for (100), p3m1 for (111)) of cos(2π G·r) and sin(2π G·r),
  taken shell by shell until the site energies are reproduced exactly.

The in-plane partition function per site follows the complete potential
energy sampling idea of M. Jørgensen and H. Grönbeck, "Adsorbate Entropies
with Complete Potential Energy Sampling in Microkinetic Modeling",
J. Phys. Chem. C 2017, 121, 7199–7207:

    q_cl = (2π m k T / h^2) ∫∫_cell exp(-[V(x, y) - V_min]/kT) dx dy / n_sites

and, for the quantum version, from the exact levels of
H = -ħ²/(2m) ∇² + V(x, y) on the periodic surface (plane waves k + G, Bloch
sampling of the 2D Brillouin zone). For a separable cosine potential both
reduce to the hindered translator of L. H. Sprowl, C. T. Campbell and
L. Árnadóttir, J. Phys. Chem. C 2016, 120, 9719–9731 (one factor per
direction).

Energies are in eV, lengths in Å, masses in amu. Partition functions are per
site (the cell integral or level sum divided by ``n_sites``), distinguishable
(no configurational or indistinguishability term), and counted from the
lowest level (classically from V_min; quantum from the ground Bloch level,
whose height above V_min is the zero-point energy).
"""

from __future__ import annotations

import itertools
import time
from dataclasses import dataclass, field, replace

import numpy as np
import scipy.linalg
import scipy.optimize
import scipy.sparse
from scipy.special import erfc

from adsorb import constants as C
from adsorb.errors import ConvergenceError, InputError
from adsorb.partition.contribution import Contribution

__all__ = [
    "SurfacePES",
    "LateralSpectrum",
    "pes_from_sites",
    "pes_from_grid",
    "lateral_classical",
    "lateral_quantum",
    "lateral_spectrum",
    "plot_surface",
    "star_functions",
    "SITE_POSITIONS",
]

#: h^2 / (2 amu) in eV amu Å^2: kinetic energy of a plane wave with |K| = 1/Å
#: (K without the 2π) for a mass of 1 amu is KINETIC_EV / m.
KINETIC_EV = C.h**2 / (2.0 * C.amu * C.eV) / C.angstrom**2

#: Fractional positions of the high-symmetry sites (ASE's convention for
#: ``ase.build.fcc100`` / ``fcc111``: a1 = a(1, 0), a2 = a(0, 1) for (100) and
#: a2 = a(1/2, √3/2) for (111)).
SITE_POSITIONS = {
    "100": {"top": (0.0, 0.0), "bridge": (0.5, 0.0), "hollow": (0.5, 0.5)},
    "111": {"top": (0.0, 0.0), "bridge": (0.5, 0.0), "fcc": (1.0 / 3.0, 1.0 / 3.0),
            "hcp": (2.0 / 3.0, 2.0 / 3.0)},
}
_SITE_ALIASES = {"ontop": "top", "atop": "top", "4fold": "hollow", "fourfold": "hollow"}

# Number of thermal energies kT above the ground level kept in level sums:
# a level at that height weighs exp(-_THERMAL_SPAN) ~ 5e-12.
_THERMAL_SPAN = 26.0
# Half-width of the smooth switch (in units of its width w) between exact levels
# and the smoothed density of states: 0.5 erfc(5) = 7.7e-13.
_SWITCH_HALF = 5.0


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


# ---------------------------------------------------------------------------
# construction
# ---------------------------------------------------------------------------
def _lattice_cell(lattice, a):
    if lattice == "100":
        return np.array([[a, 0.0], [0.0, a]])
    return np.array([[a, 0.0], [0.5 * a, 0.5 * np.sqrt(3.0) * a]])


def _lattice_group(lattice):
    """Generators of the point group of the surface about a top site, on fractional coordinates."""
    if lattice == "100":  # p4m: C4 and a mirror y -> -y
        gens = [np.array([[0, -1], [1, 0]]), np.array([[1, 0], [0, -1]])]
    else:  # p3m1: C3 about a top site and the mirror a1 <-> a2 (through top, fcc, hcp)
        gens = [np.array([[-1, -1], [1, 0]]), np.array([[0, 1], [1, 0]])]
    group = [np.eye(2, dtype=int)]
    changed = True
    while changed:
        changed = False
        for a in list(group):
            for b in gens:
                p = a @ b
                if not any(np.array_equal(p, q) for q in group):
                    group.append(p)
                    changed = True
    return group


def star_functions(cell_A, group, max_index=4):
    """Real symmetry-adapted Fourier basis: star functions of the reciprocal lattice.

    For every orbit O = {M^T G} of reciprocal-lattice vectors under the point
    group, f_cos = Σ_{G∈O} cos(2π G·r) and (when -O ≠ O) f_sin = Σ_{G∈O}
    sin(2π G·r). Orbits are listed by increasing |G|; of a pair O, -O only one
    is kept (their functions are equal or opposite).

    Returns
    -------
    list of (kind, orbit, norm2)
        kind 'cos' or 'sin', orbit an int array (n, 2), norm2 = |G|^2 in Å^-2.
    """
    recip = np.linalg.inv(np.asarray(cell_A, float)).T
    seen = set()
    out = []
    candidates = [(m, n) for m in range(-max_index, max_index + 1) for n in range(-max_index, max_index + 1)]
    candidates.sort(key=lambda gv: (round(float(np.sum((np.array(gv) @ recip) ** 2)), 9), gv))
    for gv in candidates:
        if gv in seen:
            continue
        orbit = {tuple((m.T @ np.array(gv)).tolist()) for m in group}
        neg = {(-a, -b) for a, b in orbit}
        seen |= orbit | neg
        orb = np.array(sorted(orbit), dtype=int)
        norm2 = float(np.sum((np.array(gv) @ recip) ** 2))
        out.append(("cos", orb, norm2))
        if neg != orbit:
            out.append(("sin", orb, norm2))
    return out


def _star_value(kind, orbit, u, v):
    ph = 2.0 * np.pi * (orbit[:, 0] * u + orbit[:, 1] * v)
    return float(np.sum(np.cos(ph) if kind == "cos" else np.sin(ph)))


def pes_from_sites(lattice, lattice_constant_A, energies_eV, *, n_sites=1) -> SurfacePES:
    """Periodic PES through the energies of the high-symmetry sites of a (100) or (111) surface.

    The basis is the symmetry-adapted Fourier series of the surface's point
    group about a top site (p4m for '100', p3m1 for '111'), built from star
    functions of the reciprocal lattice (:func:`star_functions`) in order of
    increasing |G|; a function is kept when it makes the site-value matrix
    gain rank, until there are as many functions as sites. For '100' (top,
    bridge, hollow) that is the constant and the cosine stars of the first two
    shells; for '111' (top, bridge, fcc, hcp) the constant, the cosine and the
    sine star of the first shell (the sine term distinguishes fcc from hcp) and
    the cosine star of the second shell. The coefficients solve the square
    linear system, so the site energies are reproduced exactly.

    Parameters
    ----------
    lattice : {'100', '111'}
        Square (fcc/bcc (100)-like) or hexagonal (fcc(111)/hcp(0001)-like) surface.
    lattice_constant_A : float
        Length of the surface cell vectors = nearest-neighbour distance between
        surface atoms, Å (for fcc(111) and fcc(100): a_bulk/√2).
    energies_eV : dict
        Site energies in eV: keys 'top' ('ontop'), 'bridge', 'hollow' for '100';
        'top', 'bridge', 'fcc', 'hcp' for '111'. Any common offset (e.g. the
        DFT total energy) is allowed.
    n_sites : int, optional
        Number of adsorption sites per surface cell (default 1: one site per
        surface atom, the usual monolayer unit).

    Returns
    -------
    SurfacePES

    Raises
    ------
    InputError
        Unknown lattice, missing/extra/non-finite site energies, bad lattice constant.

    Notes
    -----
    Site positions follow ASE's ``fcc111``/``fcc100`` convention (fcc hollow at
    fractional (1/3, 1/3), hcp at (2/3, 2/3)). Method: complete potential energy
    sampling, Jørgensen and Grönbeck, J. Phys. Chem. C 2017, 121, 7199.
    """
    lat = str(lattice).strip()
    if lat not in SITE_POSITIONS:
        raise InputError(f"lattice must be '100' or '111'; got {lattice!r}")
    a = _positive_scalar("lattice_constant_A", lattice_constant_A, "Å")
    if not isinstance(energies_eV, dict):
        raise InputError(f"energies_eV must be a dict of site name -> energy in eV; got {type(energies_eV).__name__}")
    given = {}
    for key, val in energies_eV.items():
        name = _SITE_ALIASES.get(str(key).lower(), str(key).lower())
        if name in given:
            raise InputError(f"energies_eV names the site {name!r} twice (key {key!r})")
        try:
            given[name] = float(val)
        except (TypeError, ValueError):
            raise InputError(f"energies_eV[{key!r}] must be a number in eV; got {val!r}") from None
        if not np.isfinite(given[name]):
            raise InputError(f"energies_eV[{key!r}] must be finite; got {val!r}")
    wanted = list(SITE_POSITIONS[lat])
    if set(given) != set(wanted):
        raise InputError(f"energies_eV for lattice {lat!r} needs exactly the sites {wanted}; got {sorted(given)}")
    cell = _lattice_cell(lat, a)
    group = _lattice_group(lat)
    positions = SITE_POSITIONS[lat]
    chosen = []
    rows = np.zeros((len(wanted), 0))
    for kind, orbit, _norm in star_functions(cell, group):
        col = np.array([[_star_value(kind, orbit, *positions[s])] for s in wanted])
        trial = np.hstack([rows, col])
        if np.linalg.matrix_rank(trial, tol=1e-9) > rows.shape[1]:
            rows = trial
            chosen.append((kind, orbit))
        if len(chosen) == len(wanted):
            break
    values = np.array([given[s] for s in wanted])
    alpha = np.linalg.solve(rows, values)
    coef = {}
    for (kind, orbit), al in zip(chosen, alpha):
        orbit_set = {tuple(x) for x in orbit.tolist()}
        selfconj = orbit_set == {(-p, -q) for p, q in orbit_set}
        for gi in orbit_set:
            neg = (-gi[0], -gi[1])
            if kind == "cos":
                if selfconj:
                    coef[gi] = coef.get(gi, 0.0) + al
                else:
                    coef[gi] = coef.get(gi, 0.0) + al / 2
                    coef[neg] = coef.get(neg, 0.0) + al / 2
            else:  # al sin(θ) = Re[-i al e^{iθ}]
                coef[gi] = coef.get(gi, 0.0) - 0.5j * al
                coef[neg] = coef.get(neg, 0.0) + 0.5j * al
    g = np.array(list(coef), dtype=int)
    c = np.array([coef[tuple(x)] for x in g.tolist()], dtype=complex)
    src = f"pes_from_sites(lattice={lat!r}, a={a} Å, " + ", ".join(f"{s}={given[s]:.6g}" for s in wanted) + " eV)"
    return _make_pes(cell, g, c, n_sites=n_sites, sites=positions, lattice=lat, source=src)


def pes_from_grid(cell_A, energies_eV, *, n_sites=1, sites=None) -> SurfacePES:
    """Periodic PES from energies on a regular grid over the cell (exact 2D FFT interpolation).

    The grid point (i, j) of an (N1, N2) array is the fractional position
    (i/N1, j/N2), i.e. r = (i/N1) a1 + (j/N2) a2; the end points u = 1, v = 1
    are not included (they repeat u = 0, v = 0). The Fourier coefficients are
    c_mn = FFT(E)_mn/(N1 N2) with |m| <= N1/2, |n| <= N2/2; an even-N Nyquist
    term is split equally between ±N/2 so the series is real. The series
    passes through every grid value exactly.

    Parameters
    ----------
    cell_A : array_like, shape (2, 2) (or a 3x3 ASE cell, of which the in-plane block is used)
        Rows a1, a2 in Å.
    energies_eV : array_like, shape (N1, N2)
        Energies in eV on the grid (N1, N2 >= 2). Any offset is allowed.
    n_sites : int, optional
        Adsorption sites in the cell (partition functions are per site). Default 1.
    sites : dict, optional
        Named fractional positions to mark in plots and reports.

    Returns
    -------
    SurfacePES

    Raises
    ------
    InputError
        Bad cell, grid not 2D, fewer than 2 points per direction, non-finite energies.

    Notes
    -----
    The point group of the surface is detected about the cell origin and about the
    minimum and maximum of V (snapped to nearby simple fractions), so a grid whose
    origin is off every symmetry point still lets the quantum solve use the symmetry.
    A surface without any symmetry costs about ten times more to solve.
    """
    cell = _cell(cell_A)
    try:
        e = np.array(energies_eV, dtype=float)
    except (TypeError, ValueError):
        raise InputError("energies_eV must be a 2D array of numbers in eV") from None
    if e.ndim != 2 or min(e.shape) < 2:
        raise InputError(f"energies_eV must be a 2D grid with at least 2 points per direction; got shape {e.shape}")
    if not np.all(np.isfinite(e)):
        bad = np.argwhere(~np.isfinite(e))[0]
        raise InputError(f"energies_eV[{bad[0]}, {bad[1]}] is not finite")
    n1, n2 = e.shape
    f = np.fft.fft2(e) / (n1 * n2)

    def options(k, n):
        if n % 2 == 0 and k == n // 2:
            return [(n // 2, 0.5), (-n // 2, 0.5)]
        return [(k if k <= n // 2 else k - n, 1.0)]

    g, c = [], []
    for i in range(n1):
        for j in range(n2):
            for (mi, wi), (nj, wj) in itertools.product(options(i, n1), options(j, n2)):
                g.append((mi, nj))
                c.append(f[i, j] * wi * wj)
    site_dict = {}
    for name, pos in (sites or {}).items():
        try:
            u, v = (float(x) for x in pos)
        except (TypeError, ValueError):
            raise InputError(f"sites[{name!r}] must be a pair of fractional coordinates; got {pos!r}") from None
        site_dict[str(name)] = (u, v)
    return _make_pes(cell, g, c, n_sites=n_sites, sites=site_dict, lattice="grid",
                     source=f"pes_from_grid({n1}x{n2} grid)")


# ---------------------------------------------------------------------------
# classical phase-space integral
# ---------------------------------------------------------------------------
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


# ---------------------------------------------------------------------------
# quantum levels: plane waves with Bloch sampling
# ---------------------------------------------------------------------------
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


# ---------------------------------------------------------------------------
# plot
# ---------------------------------------------------------------------------
def _save_figure(fig, path):
    """Write PNG and SVG next to ``path`` (suffix replaced), each atomically; return the two paths."""
    from adsorb.fileout import write_figure

    return list(write_figure(fig, path, tight=True))


def plot_surface(pes: SurfacePES, path, *, n_cells=3, resolution=60, title=None):
    """Contour plot of the PES over n_cells x n_cells cells, with the named sites marked.

    Axes in Å, colour bar in eV relative to V_min. Writes ``path`` with suffix
    .png and .svg (atomically) and returns the matplotlib Figure.

    Parameters
    ----------
    pes : SurfacePES
    path : str or Path
        Output path; its suffix is replaced by .png and .svg.
    n_cells : int, optional
        Cells shown along each cell vector (default 3).
    resolution : int, optional
        Grid points per cell vector (default 60).
    title : str, optional
    """
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    if not isinstance(pes, SurfacePES):
        raise InputError(f"pes must be a SurfacePES; got {type(pes).__name__}")
    if not isinstance(n_cells, (int, np.integer)) or n_cells < 1:
        raise InputError(f"n_cells must be a positive integer; got {n_cells!r}")
    n = int(resolution) * int(n_cells)
    s = np.linspace(0.0, float(n_cells), n + 1)
    uu, vv = np.meshgrid(s, s, indexing="ij")
    e = pes.energy_grid(int(resolution))
    e = np.tile(e, (n_cells, n_cells))
    e = np.pad(e, ((0, 1), (0, 1)), mode="wrap") - pes.v_min_eV
    a = pes.cell_A
    x = uu * a[0, 0] + vv * a[1, 0]
    y = uu * a[0, 1] + vv * a[1, 1]
    fig, ax = plt.subplots(figsize=(6.4, 5.2))
    cs = ax.contourf(x, y, e, levels=30, cmap="viridis")
    ax.contour(x, y, e, levels=12, colors="k", linewidths=0.3)
    cbar = fig.colorbar(cs, ax=ax)
    cbar.set_label("V - V_min (eV)")
    markers = "os^vD*"
    for idx, (name, (u0, v0)) in enumerate(pes.sites.items()):
        o = np.asarray(pes.symmetry_origin, dtype=float)
        equiv = {(round(float(p[0]) % 1.0, 9) % 1.0, round(float(p[1]) % 1.0, 9) % 1.0)
                 for p in (o + op @ (np.array([u0, v0]) - o) for op in pes.point_group)}
        pts = [(eu + i, ev + j) for eu, ev in sorted(equiv) for i in range(n_cells) for j in range(n_cells)]
        px = [p[0] * a[0, 0] + p[1] * a[1, 0] for p in pts]
        py = [p[0] * a[0, 1] + p[1] * a[1, 1] for p in pts]
        ax.plot(px, py, markers[idx % len(markers)], color="w", mec="k", ms=6, label=name, linestyle="none")
    if pes.sites:
        ax.legend(loc="upper left", fontsize=8, framealpha=0.8)
    ax.set_xlabel("x (Å)")
    ax.set_ylabel("y (Å)")
    ax.set_aspect("equal")
    ax.set_title(title or f"Lateral PES ({pes.lattice})")
    _save_figure(fig, path)
    return fig
