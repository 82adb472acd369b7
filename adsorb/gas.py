"""Ideal-gas molecules: translation, rotation, vibration and electronic levels.

:class:`GasMolecule` assembles the motions of a gas-phase molecule from what a
practitioner has (a structure, the frequencies of a calculation, an electronic
energy) in the rigid-rotor–harmonic-oscillator (RRHO) model, and answers
"thermochemistry at these temperatures and pressures" with an
:class:`adsorb.thermo.ThermoTable`. Every modelling choice (rotor treatment,
symmetry number, dropped modes, ...) is recorded in the table's ``choices``.

Conventions: energies in eV per molecule, entropy and heat capacity in eV/K
per molecule, T in K, p in Pa, wavenumbers and rotational constants in cm^-1.
Enthalpy at 0 K is ``energy + zpe``; the entropy is the conventional one
(nuclear-spin entropy omitted), as in the NIST-JANAF tables (Chase 1998).
Equations and sources: docs/methods-gas.md.
"""

from __future__ import annotations

import warnings

import numpy as np

from adsorb import constants as C
from adsorb import geometry
from adsorb._gas_checks import _fmt, _number, _positive_int
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.checks import unit_suspicion
from adsorb.partition.contribution import Contribution
from adsorb.partition.electronic import electronic
from adsorb.partition.rotation import linear_rotor, linear_rotor_levels, nonlinear_rotor
from adsorb.partition.translation import translation_3d
from adsorb.partition.vibration import harmonic
from adsorb.thermo import ThermoTable, assemble
from adsorb.torsion import (
    MODE_MATCH_CM,
    REDUCED_MOMENTS,
    TORSION_SOLVERS,
    Torsion,
    fit_torsions,
    remove_replaced_modes,
    torsion_contribution,
)

# Torsion and its option tuples live in adsorb.torsion and are re-exported here
__all__ = ["GasMolecule", "Torsion", "ROTORS", "IMAGINARY_POLICIES", "TORSION_SOLVERS",
           "REDUCED_MOMENTS", "MODE_MATCH_CM"]

ROTORS = ("auto", "classical", "levels")
IMAGINARY_POLICIES = ("raise", "drop", "invert")

# Nuclear spin I of the light isotopes for which the automatic level sum
# (B > 5 cm^-1) meets homonuclear diatomics: 1H2, 2H2 (D2), 3H2 (T2).
# Keyed by (element, mass number nearest to the atom's mass). Common practice;
# values as in the nuclear-data tables (e.g. N. J. Stone, At. Data Nucl. Data
# Tables 90, 75 (2005)), quoted from memory.
_NUCLEAR_SPIN = {("H", 1): 0.5, ("H", 2): 1.0, ("H", 3): 0.5}


def _signed_wavenumbers(frequencies):
    """Frequencies as a 1-D float array; imaginary modes negative.

    Complex values follow ASE's convention (an imaginary mode is ``0 + x j``):
    a value whose imaginary part exceeds its real part in magnitude becomes
    ``-|imag|``, any other value its real part.
    """
    if frequencies is None:
        return np.zeros(0)
    try:
        raw = np.atleast_1d(np.asarray(frequencies))
        if np.iscomplexobj(raw):
            nu = np.where(np.abs(raw.imag) > np.abs(raw.real), -np.abs(raw.imag), raw.real)
        else:
            nu = raw.astype(float)
    except (TypeError, ValueError):
        raise InputError(
            f"GasMolecule frequencies: expected a sequence of numbers in cm^-1, got {frequencies!r}") from None
    nu = nu.astype(float).ravel()
    if not np.all(np.isfinite(nu)):
        raise InputError(f"GasMolecule frequencies: expected finite numbers in cm^-1, got {nu.tolist()!r}")
    return nu


class GasMolecule:
    """An ideal-gas molecule in the rigid-rotor–harmonic-oscillator model.

    The thermochemistry is the sum of independent motions (a plain list of
    :class:`~adsorb.partition.contribution.Contribution`, see :meth:`motions`):
    3D translation at pressure p, rotation (none for an atom; classical or an
    explicit level sum for a linear molecule; classical for a non-linear one),
    harmonic vibrations counted from the zero-point level, and electronic
    levels.

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule. Gives the mass, the shape ('monatomic', 'linear',
        'nonlinear'), the rotational symmetry number and, unless
        ``rotational_constants`` is given, the moments of inertia
        (via :mod:`adsorb.geometry`). It is not modified.
    frequencies : sequence of float (or complex)
        Vibrational wavenumbers in cm^-1: the 3N-5 (linear) or 3N-6
        (non-linear) real modes; none for an atom. Imaginary modes are negative
        numbers (or ASE's complex ``0 + x j``). A longer list from a
        calculation (up to 3N) is accepted when the surplus modes are near-zero
        rigid-body modes: the surplus modes of smallest |ν| are dropped and
        must all have |ν| < ``near_zero_cm`` (imaginary ones included); they are
        recorded in ``choices``.
    energy : float, optional
        Electronic energy in eV (the potential minimum); default 0.
    multiplicity : int, optional
        Spin multiplicity 2S+1, the degeneracy of the ground electronic level
        (3 for O2). Default 1.
    symmetry_number : int, optional
        External rotational symmetry number σ; detected from the geometry
        (:func:`adsorb.geometry.rotational_symmetry_number`) when None.
    electronic_levels : sequence of (degeneracy, energy_cm), optional
        Excited electronic levels above the ground level, in cm^-1.
    rotational_constants : float or sequence of float, optional
        Rotational constants in cm^-1 overriding the geometry's moments: B
        for a linear molecule, (A, B, C) for a non-linear one.

    Other Parameters
    ----------------
    rotor : {'auto', 'classical', 'levels'}, keyword-only
        Linear-rotor treatment. 'auto' (default) sums the rotational levels
        explicitly when B > ``level_sum_above_cm`` or ``centrifugal_cm`` > 0,
        and uses the classical rotor otherwise. 'levels' is only for linear
        molecules.
    level_sum_above_cm : float, keyword-only
        Threshold on B (cm^-1) for the 'auto' rule; default 5 cm^-1
        (θ_rot = 7.2 K; the classical rotor's H(T)-H(0) error k θ_rot/3 is
        then below 0.02 kJ/mol). H2, D2, HD, OH, HF, HCl get the level sum.
    centrifugal_cm : float, keyword-only
        Centrifugal-distortion constant D in cm^-1 for the level sum
        (e.g. D0 = 0.0471 for H2); default 0.
    nuclear_spin : float, keyword-only
        Nuclear spin I of the two identical nuclei of a homonuclear diatomic,
        for the ortho/para weights of the level sum. By default taken from a
        small table for 1H, 2H and 3H (I = 1/2, 1, 1/2); for other homonuclear
        diatomics the level sum is divided by σ instead (recorded).
    even_j_symmetric : bool, keyword-only
        Exchange symmetry of even-J levels for the nuclear-spin weights: True
        (default) for Σg⁺ electronic states, False for Σg⁻ (ground-state O2).
    imaginary_modes : {'raise', 'drop', 'invert'}, keyword-only
        What to do with imaginary (or zero) modes left after the near-zero
        surplus has been dropped: raise InputError (default), drop them, or
        take their absolute value. Recorded in ``choices`` and ``warnings``.
    near_zero_cm : float, keyword-only
        |ν| below which surplus modes count as rigid-body modes; default
        50 cm^-1.
    shape_tolerance : float, keyword-only
        Passed to :func:`adsorb.geometry.molecular_shape` (I_min/I_max below
        which a molecule is linear); default 1e-3.
    symmetry_tolerance : float, keyword-only
        Distance tolerance in Å for the symmetry-number search; default 0.05.
    name : str, keyword-only
        Label of the results; default the chemical formula.
    torsions : sequence of Torsion (or of dicts of its fields), keyword-only
        Internal rotations treated as one-dimensional hindered rotors, each
        replacing one harmonic mode (:class:`Torsion`; docs/methods-gas.md
        §7). Default none. The replaced mode is chosen after the near-zero
        surplus has been dropped and before the imaginary-mode policy, so a
        torsion chosen by index or value may replace an imaginary mode. The
        external ``symmetry_number`` is unchanged; σ_int divides the rotor's
        own q. Non-linear molecules only.

    Attributes
    ----------
    geometry : str
        'monatomic', 'linear' or 'nonlinear'.
    symmetry_number : int
        σ used (given or detected).
    mass_amu : float
        Molecular mass in amu.
    rotational_constants_cm : ndarray
        B (shape (1,)) or (A, B, C) in cm^-1; empty for an atom.
    frequencies : ndarray
        The harmonic modes used, cm^-1 (without those replaced by torsions).
    torsions : tuple of Torsion
        The hindered internal rotors.
    rotor : str
        'none', 'classical' or 'levels'.
    choices : dict
        The modelling choices recorded with every result.

    Raises
    ------
    InputError
        Wrong number of frequencies or rotational constants, non-negligible
        surplus modes, imaginary modes without a policy, a bad multiplicity,
        symmetry number, option value or structure, or a torsion that does not
        fit the molecule (message names ``torsions[k]`` and the field).

    Examples
    --------
    >>> from adsorb.io import named_molecule
    >>> co = GasMolecule(named_molecule("CO"), [2143.27], rotational_constants=1.92253)
    >>> round(float(co.thermo(298.15).entropy_j_mol_k), 2)
    197.65
    """

    def __init__(self, atoms, frequencies, energy=0.0, multiplicity=1, symmetry_number=None,
                 electronic_levels=None, rotational_constants=None, *, rotor="auto",
                 level_sum_above_cm=5.0, centrifugal_cm=0.0, nuclear_spin=None,
                 even_j_symmetric=True, imaginary_modes="raise", near_zero_cm=50.0,
                 shape_tolerance=1e-3, symmetry_tolerance=0.05, name=None, torsions=()):
        masses = geometry.masses_amu(atoms)          # validates atoms
        self.atoms = atoms
        self.n_atoms = len(atoms)
        self.mass_amu = float(masses.sum())
        self.name = str(name) if name is not None else str(atoms.get_chemical_formula())
        self.energy = _number("energy", energy, positive=False)
        self.multiplicity = _positive_int("multiplicity", multiplicity)
        if rotor not in ROTORS:
            raise InputError(f"GasMolecule rotor: expected one of {ROTORS}, got {rotor!r}")
        if imaginary_modes not in IMAGINARY_POLICIES:
            raise InputError(
                f"GasMolecule imaginary_modes: expected one of {IMAGINARY_POLICIES}, got {imaginary_modes!r}")
        self.near_zero_cm = _number("near_zero_cm", near_zero_cm)
        self.level_sum_above_cm = _number("level_sum_above_cm", level_sum_above_cm)
        self.centrifugal_cm = _number("centrifugal_cm", centrifugal_cm, allow_zero=True)
        self.geometry = geometry.molecular_shape(atoms, tolerance=shape_tolerance)
        self._warnings: list[str] = []

        # symmetry number
        if symmetry_number is None:
            self.symmetry_number = 1 if self.geometry == "monatomic" else int(
                geometry.rotational_symmetry_number(atoms, tolerance=symmetry_tolerance,
                                                    shape_tolerance=shape_tolerance))
            self._symmetry_source = "detected from geometry"
        else:
            self.symmetry_number = _positive_int("symmetry_number", symmetry_number)
            self._symmetry_source = "given"

        self.rotational_constants_cm, self._rotation_source = self._rotational_constants(rotational_constants)
        self._setup_rotor(rotor, nuclear_spin, even_j_symmetric)
        self.torsions, self._torsion_info = fit_torsions(torsions, atoms, shape=self.geometry, name=self.name,
                                                         symmetry_tolerance=symmetry_tolerance,
                                                         notes=self._warnings)
        self.frequencies = self._vibrational_modes(frequencies, imaginary_modes)
        self.imaginary_modes = imaginary_modes
        # validates the levels once (degeneracy and energies)
        electronic(1.0, self.multiplicity, electronic_levels)
        self.electronic_levels = [] if electronic_levels is None else [
            (float(g), float(e)) for g, e in electronic_levels]

    # ------------------------------------------------------------------ set-up
    def _rotational_constants(self, given):
        """(constants in cm^-1, source) for the molecule's shape."""
        if self.geometry == "monatomic":
            if given is not None:
                raise InputError(
                    f"GasMolecule rotational_constants: a single atom has none, got {given!r}")
            return np.zeros(0), "none (atom)"
        need = 1 if self.geometry == "linear" else 3
        if given is None:
            moments, _ = geometry.principal_moments(self.atoms)
            consts = np.asarray(geometry.rotational_constants_cm(moments), dtype=float)
            # moments ascending -> constants descending; a linear molecule uses its largest moment
            values = consts[2:] if need == 1 else consts
            return np.array(values, dtype=float), "principal moments of the geometry"
        try:
            values = np.atleast_1d(np.asarray(given, dtype=float)).ravel()
        except (TypeError, ValueError):
            raise InputError(
                f"GasMolecule rotational_constants: expected numbers in cm^-1, got {given!r}") from None
        if values.size != need:
            what = "one value B" if need == 1 else "three values (A, B, C)"
            raise InputError(
                f"GasMolecule rotational_constants: a {self.geometry} molecule needs {what} in cm^-1, "
                f"got {values.size} ({_fmt(values)})")
        if not np.all(np.isfinite(values) & (values > 0)):
            raise InputError(
                f"GasMolecule rotational_constants: expected finite values > 0 cm^-1, got {_fmt(values)}")
        return np.sort(values)[::-1].copy(), "given"

    def _homonuclear_diatomic(self):
        if self.n_atoms != 2:
            return False
        symbols = self.atoms.get_chemical_symbols()
        m = geometry.masses_amu(self.atoms)
        return symbols[0] == symbols[1] and abs(m[0] - m[1]) < 1e-6

    def _setup_rotor(self, rotor, nuclear_spin, even_j_symmetric):
        self.nuclear_spin = None
        self.even_j_symmetric = bool(even_j_symmetric)
        self._spin_source = "not used"
        if self.geometry != "linear":
            if rotor == "levels":
                raise InputError(
                    f"GasMolecule rotor='levels' is for linear molecules; {self.name} is {self.geometry}")
            if self.centrifugal_cm > 0:
                raise InputError(
                    f"GasMolecule centrifugal_cm applies to the level sum of a linear molecule; "
                    f"{self.name} is {self.geometry}")
            if nuclear_spin is not None:
                raise InputError(
                    f"GasMolecule nuclear_spin applies to homonuclear diatomics; {self.name} is {self.geometry}")
            self.rotor = "none" if self.geometry == "monatomic" else "classical"
            self._rotor_rule = "atom" if self.geometry == "monatomic" else "classical rigid rotor (non-linear)"
            return
        b = float(self.rotational_constants_cm[0])
        if rotor == "auto":
            if b > self.level_sum_above_cm or self.centrifugal_cm > 0:
                self.rotor = "levels"
                self._rotor_rule = (f"auto: B = {b:.6g} cm^-1 > {self.level_sum_above_cm:g} cm^-1"
                                    if b > self.level_sum_above_cm else "auto: centrifugal_cm > 0 needs the level sum")
            else:
                self.rotor = "classical"
                self._rotor_rule = f"auto: B = {b:.6g} cm^-1 <= {self.level_sum_above_cm:g} cm^-1"
        else:
            self.rotor = rotor
            self._rotor_rule = "given"
        if self.rotor == "classical" and self.centrifugal_cm > 0:
            raise InputError("GasMolecule centrifugal_cm > 0 needs rotor='levels' (or 'auto'), got rotor='classical'")
        homonuclear = self._homonuclear_diatomic()
        if nuclear_spin is not None:
            if not homonuclear:
                raise InputError(
                    f"GasMolecule nuclear_spin applies to homonuclear diatomics; {self.name} is not one")
            if self.rotor != "levels":
                raise InputError("GasMolecule nuclear_spin needs the level sum (rotor='levels' or 'auto')")
            self.nuclear_spin = _number("nuclear_spin", nuclear_spin, allow_zero=True)
            self._spin_source = "given"
        elif self.rotor == "levels" and homonuclear and self.symmetry_number == 2:
            symbol = self.atoms.get_chemical_symbols()[0]
            mass_number = int(round(float(geometry.masses_amu(self.atoms)[0])))
            spin = _NUCLEAR_SPIN.get((symbol, mass_number))
            if spin is not None and self.multiplicity == 1:
                self.nuclear_spin = spin
                self._spin_source = f"table ({symbol}-{mass_number}, I = {spin:g}; Sigma_g+ ground state assumed)"
            else:
                self._spin_source = ("no nuclear-spin statistics (spin not tabulated or not a singlet); "
                                     "level sum divided by the symmetry number")
        if self.nuclear_spin is not None and self.symmetry_number != 2:
            raise InputError(
                f"GasMolecule nuclear_spin needs symmetry_number=2 for a homonuclear diatomic, "
                f"got {self.symmetry_number}")

    def _vibrational_modes(self, frequencies, policy):
        """The harmonic modes from the caller's list, with the near-zero surplus and imaginary modes handled."""
        nu = _signed_wavenumbers(frequencies)
        suspicion = unit_suspicion(nu, has_hydrogen="H" in self.atoms.get_chemical_symbols())
        if suspicion:
            raise InputError(f"GasMolecule frequencies of {self.name}: expected cm^-1, but {suspicion}")
        n_given = nu.size
        origin = np.arange(n_given)
        n_expected = {"monatomic": 0, "linear": 3 * self.n_atoms - 5,
                      "nonlinear": 3 * self.n_atoms - 6}[self.geometry]
        rule = {"monatomic": "0", "linear": "3N-5", "nonlinear": "3N-6"}[self.geometry]
        self.dropped_modes = []
        if nu.size < n_expected:
            raise InputError(
                f"GasMolecule frequencies: a {self.geometry} molecule of {self.n_atoms} atoms ({self.name}) "
                f"has {rule} = {n_expected} vibrational modes, got {nu.size}")
        if nu.size > 3 * self.n_atoms:
            raise InputError(
                f"GasMolecule frequencies: got {nu.size} modes, more than 3N = {3 * self.n_atoms} "
                f"for {self.n_atoms} atoms ({self.name})")
        if nu.size > n_expected:
            n_extra = nu.size - n_expected
            order = np.argsort(np.abs(nu), kind="stable")
            extra, keep = order[:n_extra], np.sort(order[n_extra:])
            too_big = np.abs(nu[extra]) >= self.near_zero_cm
            if np.any(too_big):
                raise InputError(
                    f"GasMolecule frequencies: {nu.size} modes given, {rule} = {n_expected} expected for "
                    f"{self.name}; the {n_extra} surplus modes must be near-zero rigid-body modes "
                    f"(|nu| < {self.near_zero_cm:g} cm^-1), but the smallest {n_extra} are {_fmt(nu[extra])} cm^-1")
            self.dropped_modes = [float(v) for v in nu[np.sort(extra)]]
            nu, origin = nu[keep], origin[keep]
        nu = remove_replaced_modes(self.torsions, self._torsion_info, nu, origin, n_given)
        self.imaginary_handled = []
        bad = nu <= 0
        if np.any(bad):
            values = nu[bad]
            if policy == "raise":
                raise InputError(
                    f"GasMolecule frequencies: {int(bad.sum())} imaginary or zero mode(s) ({_fmt(values)} cm^-1) "
                    f"among the {rule} modes of {self.name}; a minimum has only real modes. "
                    "Pass imaginary_modes='drop' or 'invert' to choose a policy")
            self.imaginary_handled = [float(v) for v in values]
            self._warnings.append(
                f"imaginary/zero modes {_fmt(values)} cm^-1 handled by policy imaginary_modes={policy!r}")
            if policy == "drop":
                nu = nu[~bad]
            else:
                if np.any(values == 0):
                    raise InputError("GasMolecule frequencies: a zero frequency cannot be inverted; "
                                     "use imaginary_modes='drop'")
                nu = np.abs(nu)
        return nu

    # ------------------------------------------------------------------ results
    @property
    def choices(self) -> dict:
        """Modelling choices (plain JSON-ready values), recorded in every result."""
        model = "ideal gas, rigid rotor, harmonic oscillator (RRHO)"
        if self.torsions:
            model += f" with {len(self.torsions)} hindered internal rotor(s) replacing harmonic modes"
        return {
            "model": model,
            "geometry": self.geometry,
            "mass_amu": self.mass_amu,
            "symmetry_number": self.symmetry_number,
            "symmetry_number_source": self._symmetry_source,
            "rotor": self.rotor,
            "rotor_rule": self._rotor_rule,
            "rotational_constants_cm": [float(v) for v in self.rotational_constants_cm],
            "rotational_constants_source": self._rotation_source,
            "centrifugal_cm": self.centrifugal_cm if self.rotor == "levels" else None,
            "nuclear_spin": self.nuclear_spin,
            "nuclear_spin_source": self._spin_source,
            "even_j_symmetric": self.even_j_symmetric if self.nuclear_spin is not None else None,
            "multiplicity": self.multiplicity,
            "electronic_levels_cm": [[g, e] for g, e in self.electronic_levels],
            "vibrational_modes_cm": [float(v) for v in self.frequencies],
            "dropped_near_zero_modes_cm": list(self.dropped_modes),
            "near_zero_threshold_cm": self.near_zero_cm,
            "imaginary_modes": self.imaginary_modes,
            "imaginary_modes_handled_cm": list(self.imaginary_handled),
            "torsions": [dict(entry) for entry in self._torsion_info],
            "entropy_convention": "conventional (nuclear-spin entropy omitted)",
            "energy_zero": "electronic energy at the potential minimum; H(0 K) = energy + zpe",
        }

    @property
    def zpe(self) -> float:
        """Zero-point energy in eV: Σ hcν/2 of the harmonic modes (plus the lowest allowed rotational level)."""
        return float(sum(c.zpe for _, c in self.motions(C.T_STANDARD)))

    def _rotation(self, t):
        if self.rotor == "none":
            return None
        if self.geometry == "nonlinear":
            return nonlinear_rotor(t, self.rotational_constants_cm, self.symmetry_number)
        b = float(self.rotational_constants_cm[0])
        if self.rotor == "classical":
            return linear_rotor(t, b, self.symmetry_number)
        return linear_rotor_levels(t, b, d_cm=self.centrifugal_cm, symmetry_number=self.symmetry_number,
                                   nuclear_spin=self.nuclear_spin, even_j_symmetric=self.even_j_symmetric)

    def motions(self, temperature, pressure=C.P_STANDARD) -> list[tuple[str, Contribution]]:
        """The independent motions as a list of (label, Contribution), in the order summed.

        Labels: 'translation', 'rotation' (not for an atom), 'vibration' (when
        there are harmonic modes), 'torsion[k]' for each hindered internal
        rotor (its replaced mode removed from :attr:`frequencies`),
        'electronic'.

        Parameters
        ----------
        temperature : array_like
            Temperature in K (> 0).
        pressure : array_like, optional
            Pressure in Pa (> 0), broadcast against ``temperature``. Default 1 bar.

        Returns
        -------
        list of (str, Contribution)
        """
        t = np.asarray(temperature, dtype=float)
        out = [("translation", translation_3d(t, self.mass_amu, pressure))]
        rotation = self._rotation(t)
        if rotation is not None:
            out.append(("rotation", rotation))
        if self.frequencies.size:
            out.append(("vibration", harmonic(t, self.frequencies)))
        for k in range(len(self.torsions)):
            out.append((f"torsion[{k}]", torsion_contribution(self.torsions[k], self._torsion_info[k], t,
                                                              label=f"{self.name} torsions[{k}]")))
        out.append(("electronic", electronic(t, self.multiplicity, self.electronic_levels)))
        return out

    def thermo(self, temperature, pressure=C.P_STANDARD) -> ThermoTable:
        """Thermochemistry at the given temperatures and pressures.

        G = H - TS with H = energy + ZPE + U_thermal + kT and S the sum of the
        motions' entropies (Sackur–Tetrode translation at p); Cp = Cv + k. All
        in eV and eV/K per molecule (molar views on the table).

        Parameters
        ----------
        temperature : array_like
            Temperature in K (> 0), any shape.
        pressure : array_like, optional
            Pressure in Pa (> 0), broadcast against ``temperature``. Default
            1 bar (1e5 Pa), the standard pressure.

        Returns
        -------
        ThermoTable
            Arrays of the broadcast shape of temperature and pressure, with
            ``choices`` and ``warnings``.

        Raises
        ------
        InputError
            Non-positive or non-finite temperature or pressure, or shapes that
            do not broadcast.
        """
        t = np.asarray(temperature, dtype=float)
        p = np.asarray(pressure, dtype=float)
        for label, arr, unit in (("temperature", t, "K"), ("pressure", p, "Pa")):
            if arr.size == 0 or not np.all(np.isfinite(arr) & (arr > 0)):
                raise InputError(
                    f"GasMolecule.thermo {label}: expected finite values > 0 {unit}, got {np.ravel(arr)[:5].tolist()!r}")
        try:
            np.broadcast_shapes(t.shape, p.shape)
        except ValueError:
            raise InputError(
                f"GasMolecule.thermo: temperature of shape {t.shape} and pressure of shape {p.shape} do not broadcast"
            ) from None
        notes = list(self._warnings)
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            total = sum(c for _, c in self.motions(t, p))
            self._classical_rotor_check(t)
            self._ideality_check(t, p)
        for w in caught:            # keep them visible to the caller and record them with the result
            notes.append(str(w.message))
            warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
        return assemble(t, total, energy=self.energy, pressure=p, gas=True, name=self.name,
                        choices=self.choices, warnings=notes)

    def _classical_rotor_check(self, t):
        """ModelWarning where the classical rotor is used below the largest rotational temperature.

        The classical partition function is the high-temperature limit of the level sum;
        its entropy error grows from 0.025 k at T = θ_rot to -0.23 k at 0.3 θ_rot (linear rotor,
        measured against the level sum) and turns negative further down.
        """
        if self.rotor != "classical":
            return
        theta = float(np.max(self.rotational_constants_cm)) * C.invcm_K
        if float(np.min(t)) < theta:
            remedy = "use rotor='levels'" if self.geometry == "linear" else "no level sum exists for a non-linear rotor here"
            warnings.warn(f"{self.name}: the classical rotor is used below its rotational temperature "
                          f"{theta:.4g} K (down to {float(np.min(t)):.4g} K), where its entropy is off by more "
                          f"than 0.025 k and becomes negative; {remedy}", ModelWarning, stacklevel=3)

    #: above this pressure (Pa) a gas without tabulated critical constants is flagged as unchecked
    UNCHECKED_IDEALITY_PA = 1.0e6

    def _ideality_check(self, t, p):
        """ModelWarning where this ideal gas is used above p° but |Z - 1| > 1 % (Peng–Robinson).

        The standard state (p <= p°) is the hypothetical ideal gas by definition and is never
        flagged. Gases are matched to :data:`adsorb.eos.CRITICAL_CONSTANTS` by composition;
        one without an entry is flagged as unchecked above ``UNCHECKED_IDEALITY_PA``.
        """
        if float(np.max(p)) <= C.P_STANDARD:
            return
        from adsorb import eos

        counts = {}
        for symbol in self.atoms.get_chemical_symbols():
            counts[symbol] = counts.get(symbol, 0) + 1
        entry = eos.constants_for_composition(counts)
        if entry is not None:
            tt, pp = np.broadcast_arrays(t, p)
            high = pp > C.P_STANDARD
            eos.ideality_warnings(entry, tt[high], pp[high])
        elif float(np.max(p)) > self.UNCHECKED_IDEALITY_PA:
            warnings.warn(f"{self.name}: ideal gas used up to {float(np.max(p)):.4g} Pa, but no critical "
                          "constants are tabulated for it, so |Z - 1| is not checked; see adsorb.eos",
                          ModelWarning, stacklevel=3)

    def __repr__(self):
        return (f"GasMolecule({self.name!r}, geometry={self.geometry!r}, symmetry_number={self.symmetry_number}, "
                f"rotor={self.rotor!r}, modes={self.frequencies.size}, multiplicity={self.multiplicity})")
