"""Hindered internal rotation (torsions) of gas molecules.

:class:`Torsion` describes one torsion of a :class:`adsorb.gas.GasMolecule`: its
cosine-series barrier (Pitzer and Gwinn, J. Chem. Phys. 10, 428 (1942), from memory),
internal symmetry number, rotating group or reduced moment, the harmonic mode it
replaces and the solver. The functions below are the glue used by
:class:`~adsorb.gas.GasMolecule`: :func:`fit_torsions` checks the specs against the
molecule and records the geometry (:mod:`adsorb.geometry`) and the shape of the
potential, :func:`remove_replaced_modes` takes the replaced modes out of the harmonic
list, and :func:`torsion_contribution` solves the rotor (exact levels on the ring,
:func:`adsorb.partition.periodic.ring_rotor`, or the closed form of Sprowl, Campbell and
Árnadóttir, J. Phys. Chem. C 2016, 120, 9719). ``adsorb.gas.Torsion`` is the same class.
Equations and sources: docs/methods-gas.md §7.
"""

from __future__ import annotations

import warnings
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from adsorb import constants as C
from adsorb import geometry
from adsorb._gas_checks import _fmt, _number, _positive_int
from adsorb.errors import InputError, ModelWarning
from adsorb.partition import hindered, periodic
from adsorb.partition.contribution import Contribution

__all__ = ["Torsion", "TORSION_SOLVERS", "REDUCED_MOMENTS", "MODE_MATCH_CM",
           "fit_torsions", "remove_replaced_modes", "torsion_contribution"]

TORSION_SOLVERS = ("exact", "closed-form")
REDUCED_MOMENTS = ("two-top", "coupled")

#: a mode chosen by its wavenumber must lie this close to the value given (cm^-1)
MODE_MATCH_CM = 1.0


def _is_integer(value):
    return isinstance(value, (int, np.integer)) and not isinstance(value, (bool, np.bool_))


def _barrier_order(key):
    """The order n of a barrier key: an int, or a string '3' / 'V3' (TOML keys, recorded choices); else None."""
    if _is_integer(key):
        return int(key)
    if isinstance(key, str):
        text = key[1:] if key[:1] in ("V", "v") else key
        if text.isdigit():
            return int(text)
    return None


def _barrier_terms(label, value):
    """V_n as a tuple (V_1, ..., V_N) from a mapping {n: V_n} or a sequence; InputError otherwise."""
    if isinstance(value, Mapping):
        if not value:
            raise InputError(f"{label}: expected at least one barrier term {{n: V_n}}, got {{}}")
        orders = [_barrier_order(n) for n in value]
        if not all(n is not None and n >= 1 for n in orders):
            raise InputError(f"{label}: the keys are the orders n of V_n (positive integers, or 'V3'-style "
                             f"strings); got {list(value)!r}")
        terms = np.zeros(max(orders))
        for n, (key, v) in zip(orders, value.items()):
            terms[n - 1] = _number(f"{label}[{key!r}]", v, positive=False, owner="")
        return tuple(float(v) for v in terms)
    if isinstance(value, (str, bytes)):
        raise InputError(f"{label}: expected {{n: V_n}} or a sequence (V_1, V_2, ...), got {value!r}")
    try:
        terms = np.atleast_1d(np.asarray(value, dtype=float))
    except (TypeError, ValueError):
        raise InputError(f"{label}: expected {{n: V_n}} or a sequence (V_1, V_2, ...) of numbers, "
                         f"got {value!r}") from None
    if terms.ndim != 1 or terms.size == 0 or not np.all(np.isfinite(terms)):
        raise InputError(f"{label}: expected a non-empty sequence of finite numbers (V_1, V_2, ...), got {value!r}")
    return tuple(float(v) for v in terms)


@dataclass(frozen=True, kw_only=True)
class Torsion:
    """A torsion of a gas molecule treated as a one-dimensional hindered rotor.

    The torsional potential is the cosine series of Pitzer and Gwinn
    (J. Chem. Phys. 10, 428 (1942), from memory)::

        V(phi) = sum_n (V_n / 2) [1 - cos(n phi)],   V(0) = 0,

    so a single term V_n is the barrier height with n equivalent minima per
    turn (ethane: ``barriers_cm={3: 1024.0}``, Gurvich via NIST CCCBDB). The
    rotor replaces one harmonic mode of :class:`GasMolecule` (see ``mode``).
    All fields are keyword-only; see docs/methods-gas.md §7.

    Parameters
    ----------
    barriers_cm : mapping {n: V_n} or sequence (V_1, V_2, ...), optional
        Barrier terms V_n in cm^-1 (any sign; the energy zero is then the
        lowest point of V, found numerically). Keys are the orders n as
        ints or as strings '3' / 'V3'. Stored as the tuple (V_1, ..., V_N).
    barriers_eV : mapping or sequence, optional
        The same in eV. Exactly one of ``barriers_cm`` / ``barriers_eV``.
        All terms zero is the free internal rotor.
    symmetry_number : int, optional
        Internal symmetry number σ_int: indistinguishable orientations of the
        top per turn (3 for CH3 or CF3, 1 for OH). Divides q. The potential
        must have σ_int-fold symmetry (terms only at multiples of σ_int), and
        the off-axis atoms of a given top must come in sets of σ_int
        equivalent atoms (a top that does not map onto itself within
        ``symmetry_tolerance`` after a turn of 2π/σ_int is noted in the
        results' warnings). Default 1. The external σ of the molecule is not changed.
    top : sequence of int, optional
        Atom indices of the rotating group, *including* its atom on the axis
        (CH3 of ethane: the C and its three H). Needed unless
        ``inertia_amu_A2`` is given.
    axis : (int, int), optional
        The two atoms defining the rotation axis, one in the top and one in
        the rest. Default: the single bond joining the top to the rest
        (:func:`adsorb.geometry.torsion_axis`; bonds from
        :func:`adsorb.geometry.bond_matrix`).
    inertia_amu_A2 : float, optional
        Reduced moment of inertia in amu Å^2, used instead of the geometry.
    reduced_moment : {'two-top', 'coupled'}, optional
        Formula for the reduced moment from the geometry. 'two-top'
        (default): I_red = I_top I_rest / (I_top + I_rest), the moments of
        the two groups about the axis. 'coupled': the internal-rotation
        moment with the overall rotation and translation eliminated,
        I_red = I_top - |P|^2/M - L·I^-1·L (Pitzer 1946 type; see
        :func:`adsorb.geometry.torsion_moments`).
    mode : int, float or 'lowest', optional
        The harmonic mode replaced: an int is an index into the
        ``frequencies`` list as given to :class:`GasMolecule` (0-based); a
        float is a wavenumber in cm^-1 (the nearest mode, which must lie
        within ``MODE_MATCH_CM`` = 1 cm^-1); 'lowest' (default) is the lowest
        real mode not replaced by another torsion.
    solver : {'exact', 'closed-form'}, optional
        'exact' (default): levels of the rotor on the ring,
        :func:`adsorb.partition.periodic.ring_rotor`. 'closed-form': the
        Sprowl–Campbell–Árnadóttir hindered rotor
        (:func:`adsorb.partition.hindered.hindered_rotor`, J. Phys. Chem. C
        2016, 120, 9719), for a single cosine term V_n >= 0 only; a
        :class:`~adsorb.errors.ModelWarning` is raised where it is outside its
        measured accuracy.

    Raises
    ------
    InputError
        A missing or doubly given barrier, bad terms, a symmetry number that
        the potential does not have, neither ``top`` nor ``inertia_amu_A2``,
        or a bad option value. The message names the field.
    """

    barriers_cm: object = None
    barriers_eV: object = None
    symmetry_number: int = 1
    top: tuple | None = None
    axis: tuple | None = None
    inertia_amu_A2: float | None = None
    reduced_moment: str = "two-top"
    mode: object = "lowest"
    solver: str = "exact"

    def __post_init__(self):
        put = lambda name, value: object.__setattr__(self, name, value)  # noqa: E731
        if (self.barriers_cm is None) == (self.barriers_eV is None):
            got = "neither" if self.barriers_cm is None else "both"
            raise InputError("Torsion barriers_cm / barriers_eV: expected exactly one "
                             f"(e.g. barriers_cm={{3: 1024.0}}), got {got}")
        if self.barriers_cm is not None:
            put("barriers_cm", _barrier_terms("Torsion barriers_cm", self.barriers_cm))
        else:
            put("barriers_eV", _barrier_terms("Torsion barriers_eV", self.barriers_eV))
        put("symmetry_number", _positive_int("Torsion symmetry_number", self.symmetry_number, owner=""))
        if self.top is not None:
            put("top", geometry.atom_indices(self.top, name="Torsion top"))
        if self.axis is not None:
            put("axis", geometry.atom_indices(self.axis, length=2, name="Torsion axis"))
        if self.inertia_amu_A2 is not None:
            put("inertia_amu_A2", _number("Torsion inertia_amu_A2", self.inertia_amu_A2, owner=""))
        if self.top is None and self.inertia_amu_A2 is None:
            raise InputError("Torsion top / inertia_amu_A2: expected the atom indices of the rotating group "
                             "or a reduced moment in amu Å^2, got neither")
        if self.reduced_moment not in REDUCED_MOMENTS:
            raise InputError(f"Torsion reduced_moment: expected one of {REDUCED_MOMENTS}, got {self.reduced_moment!r}")
        if self.solver not in TORSION_SOLVERS:
            raise InputError(f"Torsion solver: expected one of {TORSION_SOLVERS}, got {self.solver!r}")
        mode = self.mode
        if isinstance(mode, str):
            if mode != "lowest":
                raise InputError(f"Torsion mode: expected an index (int), a wavenumber in cm^-1 (float) or "
                                 f"'lowest', got {mode!r}")
        elif _is_integer(mode):
            if int(mode) < 0:
                raise InputError(f"Torsion mode: an index into the frequency list must be >= 0, got {mode!r}")
            put("mode", int(mode))
        elif isinstance(mode, (float, np.floating)) and np.isfinite(mode):
            put("mode", float(mode))
        else:
            raise InputError(f"Torsion mode: expected an index (int), a wavenumber in cm^-1 (float) or 'lowest', "
                             f"got {mode!r}")
        terms = np.asarray(self.terms_eV)
        orders = np.flatnonzero(terms) + 1
        sigma = self.symmetry_number
        if np.any(orders % sigma):
            raise InputError(f"Torsion symmetry_number: sigma_int = {sigma} needs a potential with {sigma}-fold "
                             f"symmetry (terms V_n only at multiples of {sigma}), got terms at n = "
                             f"{', '.join(str(int(n)) for n in orders)}")
        if self.solver == "closed-form" and (orders.size > 1 or np.any(terms < 0)):
            raise InputError(f"Torsion solver='closed-form' takes a single cosine term V_n >= 0, got "
                             f"{self._terms_text()}; use solver='exact'")

    @property
    def terms_eV(self) -> tuple:
        """(V_1, ..., V_N) in eV."""
        if self.barriers_eV is not None:
            return self.barriers_eV
        return tuple(v * C.invcm_eV for v in self.barriers_cm)

    def _terms_text(self):
        unit, terms = ("cm^-1", self.barriers_cm) if self.barriers_cm is not None else ("eV", self.barriers_eV)
        parts = [f"V{n} = {v:g}" for n, v in enumerate(terms, start=1) if v != 0]
        return (", ".join(parts) or "all V_n = 0") + f" {unit}"


def _potential_shape(terms_eV, inertia_amu_A2):
    """(barrier height eV, local minima per turn, harmonic wavenumber at the global minimum cm^-1)."""
    v = np.asarray(terms_eV, dtype=float)
    if not np.any(v):
        return 0.0, 0, 0.0
    n = np.arange(1, v.size + 1)
    grid = 2.0 * C.pi * np.arange(720 * v.size) / (720 * v.size)
    pot = (np.cos(np.outer(grid, n)) @ -v + v.sum()) / 2.0
    deeper = (pot < np.roll(pot, 1)) & (pot <= np.roll(pot, -1))
    phi = grid[int(np.argmin(pot))]
    for _ in range(30):          # Newton on V'(phi) = sum (V_n/2) n sin(n phi)
        slope = float(np.sum(0.5 * v * n * np.sin(n * phi)))
        curve = float(np.sum(0.5 * v * n * n * np.cos(n * phi)))
        if curve <= 0:
            break
        step = slope / curve
        phi -= step
        if abs(step) < 1e-14:
            break
    curve = max(float(np.sum(0.5 * v * n * n * np.cos(n * phi))), 0.0)
    omega = np.sqrt(curve * C.eV / (inertia_amu_A2 * C.amu_A2))
    nu_cm = C.hbar * omega / C.invcm
    return float(pot.max() - pot.min()), int(deeper.sum()), float(nu_cm)


def fit_torsions(torsions, atoms, *, shape, name, symmetry_tolerance, notes):
    """Validated Torsion specs of a molecule and, for each, the recorded geometry and potential.

    Used by :class:`adsorb.gas.GasMolecule`: ``atoms`` is its structure, ``shape`` its
    geometry ('monatomic', 'linear', 'nonlinear'), ``name`` its label; notes for the
    results' warnings are appended to the list ``notes``. Returns (tuple of Torsion,
    list of dicts recorded in the choices).
    """
    if torsions is None:
        torsions = ()
    if isinstance(torsions, (Torsion, Mapping)):
        torsions = (torsions,)
    try:
        items = list(torsions)
    except TypeError:
        raise InputError(f"GasMolecule torsions: expected a sequence of Torsion, got {torsions!r}") from None
    if items and shape != "nonlinear":
        raise InputError(f"GasMolecule torsions: a {shape} molecule ({name}) has no torsion; "
                         "torsions need a non-linear molecule")
    specs, info = [], []
    for k, item in enumerate(items):
        label = f"GasMolecule torsions[{k}]"
        if isinstance(item, Mapping):
            try:
                item = Torsion(**item)
            except TypeError as exc:
                raise InputError(f"{label}: {exc}; the fields are those of adsorb.gas.Torsion") from None
            except InputError as exc:
                raise InputError(f"{label}: {exc}") from None
        elif not isinstance(item, Torsion):
            raise InputError(f"{label}: expected an adsorb.gas.Torsion (or a dict of its fields), "
                             f"got {type(item).__name__}")
        entry = {"symmetry_number": item.symmetry_number, "solver": item.solver}
        if item.top is not None:
            moments = geometry.torsion_moments(atoms, item.top, item.axis,
                                               symmetry_number=item.symmetry_number,
                                               symmetry_tolerance=symmetry_tolerance, label=label)
            entry.update(top_atoms=moments["top"], axis_atoms=moments["axis_atoms"],
                         inertia_top_amu_A2=moments["inertia_top_amu_A2"],
                         inertia_rest_amu_A2=moments["inertia_rest_amu_A2"],
                         symmetry_deviation_A=moments["symmetry_deviation_A"])
            if moments["symmetry_deviation_A"] > symmetry_tolerance:
                notes.append(
                    f"torsions[{k}]: the top {moments['top']} is not exactly {item.symmetry_number}-fold "
                    f"symmetric about its axis {moments['axis_atoms']} (an atom moves "
                    f"{moments['symmetry_deviation_A']:.3g} Å after a turn of 360/{item.symmetry_number} "
                    f"degrees); sigma_int = {item.symmetry_number} applied as given")
        if item.inertia_amu_A2 is not None:
            inertia, source = item.inertia_amu_A2, "given"
        elif item.reduced_moment == "two-top":
            inertia, source = moments["two_top_amu_A2"], "two-top: I_top I_rest / (I_top + I_rest)"
        else:
            inertia, source = moments["coupled_amu_A2"], "coupled: I_top - |P|^2/M - L.I^-1.L"
            if not inertia > geometry.ON_AXIS_MOMENT_AMU_A2:
                raise InputError(f"{label} reduced_moment: the coupled reduced moment is {inertia:.3g} amu Å^2; "
                                 "expected > 0")
        height, n_min, nu_min = _potential_shape(item.terms_eV, inertia)
        entry.update(
            reduced_moment_amu_A2=float(inertia), reduced_moment_source=source,
            barrier_terms_cm={f"V{n}": v / C.invcm_eV for n, v in enumerate(item.terms_eV, start=1) if v != 0},
            barrier_terms_eV={f"V{n}": v for n, v in enumerate(item.terms_eV, start=1) if v != 0},
            barrier_height_eV=height, minima_per_turn=n_min, harmonic_frequency_at_minimum_cm=nu_min,
            potential="V(phi) = sum_n (V_n/2) [1 - cos(n phi)]")
        specs.append(item)
        info.append(entry)
    return tuple(specs), info


def remove_replaced_modes(torsions, info, nu, origin, n_given):
    """Remove the modes the torsions replace (recorded in their info); returns the remaining modes.

    ``nu`` are the harmonic modes left after the near-zero surplus was dropped, ``origin``
    their indices in the caller's list of ``n_given`` frequencies; ``info`` are the
    entries of :func:`fit_torsions`, updated in place with the replaced mode.
    """
    taken = np.zeros(nu.size, dtype=bool)
    for k, (spec, entry) in enumerate(zip(torsions, info)):
        label = f"GasMolecule torsions[{k}] mode"
        free = ~taken
        if spec.mode == "lowest":
            real = free & (nu > 0)
            if not np.any(real):
                raise InputError(f"{label}: 'lowest' found no real harmonic mode left to replace among "
                                 f"{_fmt(nu)} cm^-1")
            pos = int(np.flatnonzero(real)[np.argmin(nu[real])])
            how = "lowest real mode"
        elif isinstance(spec.mode, int):
            if spec.mode >= n_given:
                raise InputError(f"{label}: index {spec.mode} out of range for {n_given} frequencies "
                                 f"(0..{n_given - 1})")
            hit = np.flatnonzero(origin == spec.mode)
            if hit.size == 0:
                raise InputError(f"{label}: frequency {spec.mode} was dropped as a near-zero rigid-body mode; "
                                 "it cannot be a torsion")
            pos = int(hit[0])
            if taken[pos]:
                raise InputError(f"{label}: frequency {spec.mode} is already replaced by another torsion")
            how = f"index {spec.mode} of the frequencies given"
        else:
            if not np.any(free):
                raise InputError(f"{label}: no harmonic mode left to replace")
            cand = np.flatnonzero(free)
            pos = int(cand[np.argmin(np.abs(nu[cand] - spec.mode))])
            if abs(nu[pos] - spec.mode) > MODE_MATCH_CM:
                raise InputError(f"{label}: no free mode within {MODE_MATCH_CM:g} cm^-1 of {spec.mode:g} cm^-1 "
                                 f"(nearest {nu[pos]:g} cm^-1)")
            how = f"nearest mode to {spec.mode:g} cm^-1"
        taken[pos] = True
        entry.update(replaced_mode_cm=float(nu[pos]), replaced_mode_index=int(origin[pos]),
                     replaced_mode_selected_by=how)
    return nu[~taken]


def torsion_contribution(spec, entry, t, *, label):
    """Contribution of one torsion at temperatures t (solved once per distinct temperature).

    ``entry`` is its record from :func:`fit_torsions`; ``label`` names it in warnings.
    """
    unique, inverse = np.unique(t.ravel(), return_inverse=True)
    inertia, sigma = entry["reduced_moment_amu_A2"], spec.symmetry_number
    terms = np.asarray(spec.terms_eV, dtype=float)
    if spec.solver == "exact":
        part = periodic.ring_rotor(unique, inertia, -0.5 * terms, symmetry_number=sigma)
    else:
        orders = np.flatnonzero(terms)
        n = int(orders[0]) + 1 if orders.size else 1
        barrier = float(terms[orders[0]]) if orders.size else 0.0
        part = hindered.hindered_rotor(unique, inertia, barrier, n, sigma)
        ok = hindered.rotor_closed_form_reliable(unique, inertia, barrier, n)
        if not np.all(ok):
            warnings.warn(
                f"{label}: the closed-form hindered rotor is outside its measured accuracy "
                f"(1 % in q, 0.02 k in S) at T = {_fmt(unique[~ok][:3])} K...; use solver='exact'",
                ModelWarning, stacklevel=3)
    shape = t.shape
    pick = lambda a: np.broadcast_to(a, unique.shape)[inverse].reshape(shape)  # noqa: E731
    return Contribution(ln_q=pick(part.ln_q), energy=pick(part.energy), entropy=pick(part.entropy),
                        heat_capacity=pick(part.heat_capacity), zpe=float(np.ravel(part.zpe)[0]))
