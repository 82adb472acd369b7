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

The code is split by model: the surface object and its symmetry in
:mod:`~adsorb.partition.surface_pes_fourier`, the classical integral in
:mod:`~adsorb.partition.surface_pes_classical`, the Bloch Hamiltonian in
:mod:`~adsorb.partition.surface_pes_bloch` and the converged quantum levels in
:mod:`~adsorb.partition.surface_pes_quantum`. This module builds surfaces,
plots them and re-exports every public name, so import from here.
"""

from __future__ import annotations

import itertools

import numpy as np

from adsorb.errors import InputError
from adsorb.partition.surface_pes_classical import lateral_classical
from adsorb.partition.surface_pes_fourier import KINETIC_EV, SurfacePES, _cell, _make_pes, _positive_scalar
from adsorb.partition.surface_pes_quantum import LateralSpectrum, lateral_quantum, lateral_spectrum

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
    "KINETIC_EV",
]


#: Fractional positions of the high-symmetry sites (ASE's convention for
#: ``ase.build.fcc100`` / ``fcc111``: a1 = a(1, 0), a2 = a(0, 1) for (100) and
#: a2 = a(1/2, √3/2) for (111)).
SITE_POSITIONS = {
    "100": {"top": (0.0, 0.0), "bridge": (0.5, 0.0), "hollow": (0.5, 0.5)},
    "111": {"top": (0.0, 0.0), "bridge": (0.5, 0.0), "fcc": (1.0 / 3.0, 1.0 / 3.0),
            "hcp": (2.0 / 3.0, 2.0 / 3.0)},
}
_SITE_ALIASES = {"ontop": "top", "atop": "top", "4fold": "hollow", "fourfold": "hollow"}


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
