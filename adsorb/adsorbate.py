"""Adsorbed species: one input (the 3N frequencies of a calculation), several models.

:class:`Adsorbate` holds what a practitioner has for an adsorbate — its
electronic energy (slab included), the full list of 3N vibrational
frequencies, optionally the structure and normal-mode vectors — and a chosen
model of its soft modes:

``"harmonic"``
    every mode a harmonic oscillator (localized adsorbate);
``"lattice-gas"``
    the same partition function as ``"harmonic"``, flagged as a localized 2D
    lattice gas for standard states and equilibria (Langmuir adsorption);
``"hindered"``
    the two frustrated translations become hindered translators and the
    rotation about the surface normal a hindered rotor (Sprowl, Campbell and
    Árnadóttir, J. Phys. Chem. C 2016, 120, 9719); the other modes harmonic;
``"2d-gas"``
    the two frustrated translations become a 2D ideal-gas translation over the
    area of one site; the other modes harmonic (Campbell, Sprowl and
    Árnadóttir, J. Phys. Chem. C 2016, 120, 10283);
``"surface-pes"``
    the two frustrated translations become the motion on a periodic lateral
    potential-energy surface (see :mod:`adsorb.partition.surface_pes`).

The model decides which modes it replaces: by projecting normal-mode vectors
onto rigid in-plane translations and the rotation about the normal when they
are given, otherwise the lowest frequencies. The choice, and the frequency
that the closed form implies for each replaced mode, are recorded in
:attr:`Adsorbate.replaced_modes` and in every result's ``choices``.

The entropy returned by :meth:`Adsorbate.thermo` contains no configurational
or standard-state term: mobile models use the partition function per site.
Use :func:`adsorb.standard_states.standard_thermo` for a named standard state.
"""

from __future__ import annotations

import difflib
import warnings

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.partition import hindered as _hindered
from adsorb.partition.checks import unit_suspicion
from adsorb.partition.contribution import Contribution
from adsorb.partition.translation import translation_2d
from adsorb.partition.vibration import harmonic
from adsorb.thermo import ThermoTable, assemble

__all__ = ["Adsorbate", "MODELS", "MOBILE_MODELS"]

#: model name -> (number of frustrated translations replaced, rotations replaced)
MODELS = {
    "harmonic": (0, 0),
    "lattice-gas": (0, 0),
    "hindered": (2, 1),
    "2d-gas": (2, 0),
    "surface-pes": (2, 0),
}
#: models whose in-plane motion is delocalised (chemical potential mu = G + kT ln theta)
MOBILE_MODELS = frozenset({"hindered", "2d-gas", "surface-pes"})

_PARAMETERS = {
    "indices": "indices of the adsorbate atoms in `atoms` (default: atoms not frozen by FixAtoms)",
    "mass": "adsorbate mass in amu (default: from `atoms`)",
    "translation_barrier": "diffusion barrier in eV (hindered; harmonic, lattice-gas: domain check only)",
    "site_spacing": "distance between neighbouring sites in Å (hindered, 2d-gas)",
    "site_area": "area per site in Å^2 (hindered, 2d-gas; alternative to site_spacing)",
    "rotation_barrier": "barrier to rotation about the surface normal in eV (hindered)",
    "rotation_minima": "number of equivalent minima per full turn (hindered)",
    "symmetry_number": "rotational symmetry number about the normal (hindered; default 1)",
    "inertia": "moment of inertia about the surface normal in amu Å^2 (default: from `atoms`)",
    "mode_vectors": "normal-mode displacement vectors, shape (n_modes, n_adsorbate_atoms, 3)",
    "soft_modes": "indices of the modes to replace: the translations first, then the rotation",
    "imaginary_modes": "'raise' (default), 'drop' or 'invert' for negative (imaginary) frequencies",
    "low_frequency": "'none' (default), 'floor' or 'qrrho' for the modes that stay harmonic",
    "frequency_floor": "floor in cm^-1 for low_frequency='floor' and cut-off for 'qrrho' (default 100)",
    "solver": "'closed-form' (default) or 'exact' for the hindered translator/rotor",
    "pes": "lateral potential-energy surface object (surface-pes)",
    "name": "label used in results",
}


def _suggest(key: str, options) -> str:
    close = difflib.get_close_matches(key, list(options), n=1, cutoff=0.6)
    return f" (did you mean {close[0]!r}?)" if close else ""


#: smallest physically meaningful values, far below any real case (an electron is 5.5e-4 amu, the
#: H2 bond 0.74 Å); smaller positive numbers only underflow once converted to SI units
_SMALLEST = {"mass": (1e-3, "amu"), "site_spacing": (1e-2, "Å"), "site_area": (1e-4, "Å^2"),
             "inertia": (1e-4, "amu Å^2"), "frequency_floor": (1e-3, "cm^-1")}


def _positive_number(key: str, value, *, allow_zero=False) -> float:
    """A finite parameter value > 0 (>= 0 with ``allow_zero``), and not below its ``_SMALLEST``."""
    try:
        v = float(value)
    except (TypeError, ValueError):
        msg = f"Adsorbate parameter {key!r}: expected a number, got {value!r}"
        raise InputError(msg) from None
    if not np.isfinite(v) or v < 0 or (v == 0 and not allow_zero):
        msg = f"Adsorbate parameter {key!r}: expected a finite number {'>=' if allow_zero else '>'} 0, got {value!r}"
        raise InputError(msg)
    smallest, unit = _SMALLEST.get(key, (0.0, ""))
    if v < smallest:
        msg = f"Adsorbate parameter {key!r}: expected at least {smallest:g} {unit}, got {value!r}"
        raise InputError(msg)
    return v


def _count(key: str, value) -> int:
    if isinstance(value, bool) or not float(value).is_integer() or int(value) < 1:
        msg = f"Adsorbate parameter {key!r}: expected a positive integer, got {value!r}"
        raise InputError(msg)
    return int(value)


class Adsorbate:
    """An adsorbed species and the model of its soft modes.

    Parameters
    ----------
    frequencies : sequence of float
        The 3N vibrational wavenumbers of the adsorbate from the calculation,
        in cm^-1 (slab atoms frozen). Imaginary modes given as negative numbers
        are refused unless ``imaginary_modes`` says otherwise.
    energy : float, optional
        Electronic energy in eV, slab included, as held by the practitioner.
    model : str, optional
        One of ``"harmonic"``, ``"hindered"``, ``"2d-gas"``,
        ``"lattice-gas"``, ``"surface-pes"``.
    atoms : ase.Atoms, optional
        Structure (slab + adsorbate, or the adsorbate alone). Gives the mass,
        the moment of inertia about the surface normal and, with
        ``mode_vectors``, the mode assignment.
    **model_parameters
        See the table below; units are eV, Å, Å^2, amu and amu Å^2.

        ======================  ===============================================
        ``indices``             adsorbate atom indices in ``atoms``
        ``mass``                adsorbate mass, amu (default from ``atoms``)
        ``translation_barrier`` diffusion barrier W_x, eV (hindered; with
                                harmonic or lattice-gas, a warning where kT > W_x)
        ``site_spacing``        site spacing b, Å (hindered, 2d-gas)
        ``site_area``           area per site, Å^2 (alternative to b; b = sqrt)
        ``rotation_barrier``    rotational barrier W_r, eV (hindered)
        ``rotation_minima``     minima per turn n (hindered)
        ``symmetry_number``     symmetry number about the normal (default 1)
        ``inertia``             moment about the normal, amu Å^2
        ``mode_vectors``        normal modes, (n_modes, n_adsorbate_atoms, 3)
        ``soft_modes``          explicit indices of the replaced modes
                                (translations first, then the rotation)
        ``imaginary_modes``     'raise' | 'drop' | 'invert'
        ``low_frequency``       'none' | 'floor' | 'qrrho' (harmonic modes)
        ``frequency_floor``     cm^-1 (default 100)
        ``solver``              'closed-form' | 'exact' (hindered)
        ``pes``                 lateral PES object (surface-pes)
        ``name``                label used in results
        ======================  ===============================================

    Raises
    ------
    InputError
        Unknown model or parameter (with the closest valid name), a missing
        required parameter (all missing ones are named), or bad frequencies.
    """

    def __init__(self, frequencies, energy=0.0, model="harmonic", atoms=None, **model_parameters):
        if model not in MODELS:
            msg = f"Adsorbate model {model!r} is unknown{_suggest(str(model), MODELS)}; expected one of {', '.join(MODELS)}"
            raise InputError(msg)
        for key in model_parameters:
            if key not in _PARAMETERS:
                msg = (f"Adsorbate parameter {key!r} is unknown{_suggest(key, _PARAMETERS)}; "
                       f"expected one of {', '.join(_PARAMETERS)}")
                raise InputError(msg)
        p = dict(model_parameters)
        self.model = model
        self.name = str(p.get("name", "adsorbate"))
        try:
            self.energy = float(energy)
        except (TypeError, ValueError):
            msg = f"Adsorbate energy: expected a number in eV, got {energy!r}"
            raise InputError(msg) from None
        if not np.isfinite(self.energy):
            msg = f"Adsorbate energy: expected a finite number in eV, got {energy!r}"
            raise InputError(msg)
        self.atoms = atoms
        self._warnings: list[str] = []
        self.indices = self._adsorbate_indices(p.get("indices"))
        nu = self._frequencies(frequencies, p.get("imaginary_modes", "raise"))
        self._n_input_modes = nu.size
        self.mass = self._mass(p.get("mass"))
        self.low_frequency = p.get("low_frequency", "none")
        if self.low_frequency not in ("none", "floor", "qrrho"):
            msg = f"Adsorbate parameter 'low_frequency': expected 'none', 'floor' or 'qrrho', got {self.low_frequency!r}"
            raise InputError(msg)
        self.frequency_floor = _positive_number("frequency_floor", p.get("frequency_floor", 100.0))
        self.solver = p.get("solver", "closed-form")
        if self.solver not in ("closed-form", "exact"):
            msg = f"Adsorbate parameter 'solver': expected 'closed-form' or 'exact', got {self.solver!r}"
            raise InputError(msg)
        self._setup_model(p)
        self.frequencies = nu
        self.replaced_modes = self._assign_modes(nu, p.get("mode_vectors"), p.get("soft_modes"))
        replaced = {m["index"] for m in self.replaced_modes}
        self.harmonic_frequencies = np.array([f for i, f in enumerate(nu) if i not in replaced])

    # ------------------------------------------------------------------ setup
    def _adsorbate_indices(self, indices):
        if self.atoms is None:
            if indices is not None:
                msg = "Adsorbate parameter 'indices' needs `atoms` to refer to"
                raise InputError(msg)
            return None
        from adsorb.geometry import adsorbate_indices

        return np.asarray(adsorbate_indices(self.atoms, indices=indices), dtype=int)

    @property
    def n_atoms(self):
        """Number of adsorbate atoms (None without a structure)."""
        return None if self.indices is None else len(self.indices)

    def _frequencies(self, frequencies, policy):
        try:
            nu = np.atleast_1d(np.asarray(frequencies, dtype=float)).ravel()
        except (TypeError, ValueError):
            msg = f"Adsorbate frequencies: expected a sequence of numbers in cm^-1, got {frequencies!r}"
            raise InputError(msg) from None
        if nu.size == 0 or not np.all(np.isfinite(nu)):
            msg = "Adsorbate frequencies: expected a non-empty list of finite numbers in cm^-1"
            raise InputError(msg)
        symbols = [] if self.atoms is None else [self.atoms[i].symbol for i in self.indices]
        suspicion = unit_suspicion(nu, has_hydrogen="H" in symbols, hydrogen_stretch_cm=400.0)
        if suspicion and suspicion.startswith("every"):
            msg = f"Adsorbate frequencies of {self.name}: expected cm^-1, but {suspicion}"
            raise InputError(msg)
        if suspicion:
            text = f"{self.name}: frequencies may not be in cm^-1: {suspicion}"
            warnings.warn(text, ModelWarning, stacklevel=3)
            self._warnings.append(text)
        if self.n_atoms is not None and nu.size != 3 * self.n_atoms:
            msg = (f"Adsorbate frequencies: expected 3N = {3 * self.n_atoms} modes for the "
                   f"{self.n_atoms} adsorbate atoms, got {nu.size}")
            raise InputError(msg)
        if policy not in ("raise", "drop", "invert"):
            msg = f"Adsorbate parameter 'imaginary_modes': expected 'raise', 'drop' or 'invert', got {policy!r}"
            raise InputError(msg)
        bad = nu <= 0
        if np.any(bad):
            if policy == "raise":
                msg = (f"Adsorbate frequencies: {int(bad.sum())} imaginary or zero mode(s) "
                       f"({', '.join(f'{v:g}' for v in nu[bad])} cm^-1); a minimum has only real modes. "
                       "Pass imaginary_modes='drop' or 'invert' to choose a policy")
                raise InputError(msg)
            self._warnings.append(
                f"imaginary/zero modes {', '.join(f'{v:g}' for v in nu[bad])} cm^-1 handled by policy {policy!r}")
            self._imaginary = (policy, nu[bad].tolist())
            if policy == "drop":
                nu = nu[~bad]
                if nu.size == 0:
                    msg = "Adsorbate frequencies: no real modes left after dropping imaginary ones"
                    raise InputError(msg)
            else:
                nu = np.abs(nu)
                if np.any(nu == 0):
                    msg = "Adsorbate frequencies: a zero frequency cannot be inverted; drop it"
                    raise InputError(msg)
        else:
            self._imaginary = (policy, [])
        return nu

    def _mass(self, mass):
        if mass is not None:
            return _positive_number("mass", mass)
        if self.atoms is not None:
            return float(self.atoms.get_masses()[self.indices].sum())
        return None

    def _setup_model(self, p):
        n_trans, n_rot = MODELS[self.model]
        missing = []
        if n_trans and self.mass is None:
            missing.append("mass (or atoms)")
        if n_trans and self.model != "surface-pes":
            if "site_spacing" in p and "site_area" in p:
                msg = "Adsorbate parameters 'site_spacing' and 'site_area': give one, not both"
                raise InputError(msg)
            if "site_spacing" in p:
                self.site_spacing = _positive_number("site_spacing", p["site_spacing"])
            elif "site_area" in p:
                self.site_spacing = float(np.sqrt(_positive_number("site_area", p["site_area"])))
            else:
                missing.append("site_spacing or site_area")
        if self.model == "hindered":
            if "translation_barrier" not in p:
                missing.append("translation_barrier")
            # a single adsorbed atom has no rotation about the normal
            self._has_rotor = not (self.n_atoms == 1 or (self.n_atoms is None and self._n_input_modes == 3))
            if self._has_rotor:
                for key in ("rotation_barrier", "rotation_minima"):
                    if key not in p:
                        missing.append(key)
                if "inertia" not in p and self.atoms is None:
                    missing.append("inertia (or atoms)")
        if self.model == "surface-pes" and "pes" not in p:
            missing.append("pes")
        if missing:
            msg = f"Adsorbate model {self.model!r} needs parameter(s): {', '.join(missing)}"
            raise InputError(msg)
        if self.model == "hindered":
            self.translation_barrier = float(p["translation_barrier"])
            if not np.isfinite(self.translation_barrier) or self.translation_barrier < 0:
                msg = f"Adsorbate parameter 'translation_barrier': expected a number >= 0 in eV, got {p['translation_barrier']!r}"
                raise InputError(msg)
            if self._has_rotor:
                self.rotation_barrier = float(p["rotation_barrier"])
                if not np.isfinite(self.rotation_barrier) or self.rotation_barrier < 0:
                    msg = f"Adsorbate parameter 'rotation_barrier': expected a number >= 0 in eV, got {p['rotation_barrier']!r}"
                    raise InputError(msg)
                self.rotation_minima = _count("rotation_minima", p["rotation_minima"])
                self.symmetry_number = _count("symmetry_number", p.get("symmetry_number", 1))
                if "inertia" in p:
                    self.inertia = _positive_number("inertia", p["inertia"])
                else:
                    from adsorb.geometry import inertia_about_normal

                    self._require_surface_normal("the moment of inertia about the normal (or give 'inertia')")
                    self.inertia = float(inertia_about_normal(self.atoms, self.indices))
                    if self.inertia <= 0:
                        msg = "Adsorbate inertia about the surface normal is zero (atoms on the axis); give 'inertia'"
                        raise InputError(msg)
        if self.model == "surface-pes":
            self.pes = p["pes"]
        if self.model in ("harmonic", "lattice-gas"):
            # optional here: it only serves the domain check of Adsorbate.thermo
            self.translation_barrier = None
            if "translation_barrier" in p:
                self.translation_barrier = _positive_number("translation_barrier", p["translation_barrier"], allow_zero=True)

    def _require_surface_normal(self, purpose):
        """InputError unless ``atoms`` has a cell from which the surface normal follows."""
        cell = np.asarray(self.atoms.cell[:], dtype=float)
        if not np.any(np.linalg.norm(cell, axis=1) > 0.0):
            msg = (f"Adsorbate {self.name}: atoms has no cell, so the surface normal is unknown; model "
                   f"{self.model!r} needs it for {purpose}: give the slab with its cell (vacuum along a3)")
            raise InputError(msg)

    # ------------------------------------------------------- mode assignment
    def implied_frequencies(self):
        """Frequencies (cm^-1) the closed forms imply for the replaced modes, by role."""
        if self.model == "hindered":
            out = {"translation": float(_hindered.translator_frequency_cm(
                self.mass, self.translation_barrier, self.site_spacing))}
            if self._has_rotor:
                out["rotation"] = float(_hindered.rotor_frequency_cm(
                    self.inertia, self.rotation_barrier, self.rotation_minima))
            return out
        if self.model in ("2d-gas", "surface-pes"):
            return {"translation": 0.0 if self.model == "2d-gas" else None}
        return {}

    def _assign_modes(self, nu, mode_vectors, soft_modes=None):
        n_trans, n_rot = MODELS[self.model]
        if self.model == "hindered" and not self._has_rotor:
            n_rot = 0
        n_replace = n_trans + n_rot
        if n_replace == 0:
            return []
        if nu.size < n_replace:
            msg = (f"Adsorbate model {self.model!r} replaces {n_replace} modes but only "
                   f"{nu.size} frequencies were given")
            raise InputError(msg)
        from adsorb import geometry

        if soft_modes is not None:
            if mode_vectors is not None:
                msg = "Adsorbate parameters 'soft_modes' and 'mode_vectors': give one, not both"
                raise InputError(msg)
            try:
                given = [int(i) for i in soft_modes]
            except (TypeError, ValueError):
                msg = f"Adsorbate parameter 'soft_modes': expected {n_replace} mode indices, got {soft_modes!r}"
                raise InputError(msg) from None
            if (len(given) != n_replace or len(set(given)) != n_replace
                    or any(i < 0 or i >= nu.size for i in given)):
                msg = (f"Adsorbate parameter 'soft_modes': expected {n_replace} distinct indices in 0..{nu.size - 1} "
                       f"(translations first, then the rotation), got {list(soft_modes)!r}")
                raise InputError(msg)
            translations, rotations = given[:n_trans], given[n_trans:]
            how = "given by the user"
        elif mode_vectors is not None:
            if self.atoms is None:
                msg = "Adsorbate parameter 'mode_vectors' needs `atoms` (to know masses and the surface normal)"
                raise InputError(msg)
            self._require_surface_normal("the projection of 'mode_vectors' on surface translations and rotation")
            vectors = np.asarray(mode_vectors, dtype=float)
            if vectors.shape != (nu.size, self.n_atoms, 3):
                msg = (f"Adsorbate parameter 'mode_vectors': expected shape ({nu.size}, {self.n_atoms}, 3), "
                       f"got {vectors.shape}")
                raise InputError(msg)
            overlaps = geometry.rigid_motion_overlaps(self.atoms, self.indices, vectors)
            chosen = geometry.assign_soft_modes(overlaps, nu, n_translations=n_trans, n_rotations=n_rot)
            translations = list(chosen["translations"])
            rotations = list(chosen["rotations"])
            how = "normal-mode projection"
        else:
            lowest = list(geometry.lowest_modes(nu, n_replace))
            translations, rotations = lowest[:n_trans], lowest[n_trans:]
            how = "lowest frequencies"
        implied = self.implied_frequencies()
        role_model = {"hindered": ("hindered translator", "hindered rotor"),
                      "2d-gas": ("2D ideal-gas translation", None),
                      "surface-pes": ("lateral potential-energy surface", None)}[self.model]
        out = []
        for i in translations:
            out.append({"index": int(i), "frequency_cm": float(nu[i]), "role": "frustrated translation",
                        "replaced_by": role_model[0], "implied_frequency_cm": implied.get("translation"),
                        "assigned_by": how})
        for i in rotations:
            out.append({"index": int(i), "frequency_cm": float(nu[i]), "role": "rotation about the normal",
                        "replaced_by": role_model[1], "implied_frequency_cm": implied.get("rotation"),
                        "assigned_by": how})
        return out

    # ------------------------------------------------------------ thermo
    def _harmonic_part(self, t):
        nu = self.harmonic_frequencies
        if nu.size == 0:
            return Contribution.zero(t)
        if self.low_frequency == "none":
            return harmonic(t, nu)
        from adsorb.partition import lowfreq

        if self.low_frequency == "floor":
            return lowfreq.harmonic_with_floor(t, nu, floor_cm=self.frequency_floor)
        return lowfreq.quasi_rrho(t, nu, cutoff_cm=self.frequency_floor)

    def _check_closed_form(self, t):
        ok = _hindered.closed_form_reliable(t, mass_amu=self.mass, barrier_eV=self.translation_barrier, spacing_A=self.site_spacing,
                     **({"inertia_amu_A2": self.inertia, "rotation_barrier_eV": self.rotation_barrier,
                         "n_minima": self.rotation_minima} if self._has_rotor else {}))
        if not np.all(ok):
            text = (f"{self.name}: the hindered closed form is outside its validated accuracy at some "
                    f"temperatures (light or many-minima rotor, low T); use solver='exact'")
            warnings.warn(text, ModelWarning, stacklevel=3)
            return text
        return None

    #: the softest raw harmonic mode is doubtful where kT exceeds this many h c nu (our rule)
    SOFT_MODE_RATIO = 5.0

    def _domain_warnings(self, t):
        """ModelWarnings (also returned as notes) where the harmonic picture leaves its domain.

        * harmonic or lattice-gas model with a known diffusion barrier W_x: kT > W_x, where
          the adsorbate hops freely and frustrated translations are no longer vibrations
          (Sprowl, Campbell and Árnadóttir, J. Phys. Chem. C 120, 9719 (2016));
        * harmonic or lattice-gas model whose modes are not floored or interpolated
          (``low_frequency='none'``): kT above ``SOFT_MODE_RATIO`` h c ν_min. There the mode's
          entropy is the classical k[1 + ln(kT/hcν)], set by a frequency that calculations of
          weakly bound adsorbates do not give to better than a factor of two.
        """
        kt_max = C.kB_eV * float(np.max(t))
        out = []
        if self.model not in ("harmonic", "lattice-gas"):
            return out
        barrier = self.translation_barrier
        if barrier is not None and kt_max > barrier:
            out.append(f"{self.name}: kT exceeds the diffusion barrier W_x = {barrier:g} eV above "
                       f"{barrier / C.kB_eV:.4g} K, where the {self.model} model treats a mobile adsorbate as "
                       "bound; consider model 'hindered' or '2d-gas'")
        nu = self.harmonic_frequencies
        if self.low_frequency == "none" and nu.size:
            soft = float(nu.min())
            t_soft = self.SOFT_MODE_RATIO * soft * C.invcm_K
            if float(np.max(t)) > t_soft:
                out.append(f"{self.name}: the softest harmonic mode ({soft:g} cm^-1) is below kT/"
                           f"{self.SOFT_MODE_RATIO:g} above {t_soft:.4g} K, where its harmonic entropy is "
                           "unreliable for a weakly bound adsorbate; consider low_frequency='qrrho' or a mobile model")
        for text in out:
            warnings.warn(text, ModelWarning, stacklevel=3)
        return out

    def _soft_part(self, t):
        if self.model in ("harmonic", "lattice-gas"):
            return Contribution.zero(t), []
        notes = []
        if self.model == "2d-gas":
            return translation_2d(t, self.mass, self.site_spacing**2), notes
        if self.model == "surface-pes":
            from adsorb.partition import surface_pes

            return surface_pes.lateral_quantum(t, self.pes, self.mass), notes
        # hindered
        if self.solver == "exact":
            from adsorb.partition import periodic

            one = periodic.lattice_translator(t, self.mass, self.site_spacing,
                                              periodic.cosine_terms(self.translation_barrier))
            part = [one, one]
            if self._has_rotor:
                part.append(periodic.ring_rotor(
                    t, self.inertia, periodic.cosine_terms(self.rotation_barrier, self.rotation_minima),
                    symmetry_number=self.symmetry_number))
        else:
            note = self._check_closed_form(t)
            if note:
                notes.append(note)
            one = _hindered.hindered_translator(t, self.mass, self.translation_barrier, self.site_spacing)
            part = [one, one]
            if self._has_rotor:
                part.append(_hindered.hindered_rotor(t, self.inertia, self.rotation_barrier,
                                                     self.rotation_minima, self.symmetry_number))
        return sum(part), notes

    def choices(self) -> dict:
        """The modelling choices recorded with every result."""
        out = {
            "model": self.model,
            "mobile": self.model in MOBILE_MODELS,
            "replaced_modes": self.replaced_modes,
            "harmonic_modes_cm": self.harmonic_frequencies.tolist(),
            "low_frequency_treatment": (self.low_frequency if self.low_frequency == "none"
                                        else f"{self.low_frequency} at {self.frequency_floor:g} cm^-1"),
            "imaginary_mode_policy": {"policy": self._imaginary[0], "modes_cm": self._imaginary[1]},
            "entropy_convention": "per site, no configurational or standard-state term",
        }
        if self.mass is not None:
            out["mass_amu"] = self.mass
        if self.model in ("harmonic", "lattice-gas") and self.translation_barrier is not None:
            out["translation_barrier_eV"] = self.translation_barrier
        if self.model == "hindered":
            out.update(solver=self.solver, translation_barrier_eV=self.translation_barrier,
                       site_spacing_A=self.site_spacing)
            if self._has_rotor:
                out.update(rotation_barrier_eV=self.rotation_barrier, rotation_minima=self.rotation_minima,
                           symmetry_number=self.symmetry_number, inertia_amu_A2=self.inertia)
        if self.model == "2d-gas":
            out["site_area_A2"] = self.site_spacing**2
        if self.model == "surface-pes":
            cell = np.asarray(self.pes.cell_A, dtype=float)
            out.update(lateral_surface={"lattice": self.pes.lattice, "source": self.pes.source,
                                        "sites_per_cell": int(self.pes.n_sites),
                                        "corrugation_eV": float(self.pes.v_max_eV - self.pes.v_min_eV)},
                       site_area_A2=float(abs(np.linalg.det(cell))) / int(self.pes.n_sites))
        return out

    def thermo(self, temperature) -> ThermoTable:
        """Thermochemistry at temperatures ``temperature`` (K, any shape).

        Returns the same :class:`~adsorb.thermo.ThermoTable` as
        :meth:`adsorb.gas.GasMolecule.thermo` (``pressure`` is None; Cp = Cv).
        Energies in eV, entropies in eV/K per adsorbate.
        """
        t = np.asarray(temperature, dtype=float)
        if t.size == 0 or not np.all(np.isfinite(t)) or np.any(t <= 0):
            msg = f"Adsorbate.thermo temperature: expected finite values > 0 K, got {temperature!r}"
            raise InputError(msg)
        soft, notes = self._soft_part(t)
        notes = list(notes) + self._domain_warnings(t)
        total = self._harmonic_part(t) + soft
        return assemble(t, total, energy=self.energy, gas=False, name=self.name,
                        choices=self.choices(), warnings=tuple(self._warnings) + tuple(notes))

    def __repr__(self):
        return f"Adsorbate(name={self.name!r}, model={self.model!r}, n_modes={self.frequencies.size})"
