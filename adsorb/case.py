"""TOML case files: a study described in a few tables, validated before any computing.

:func:`load_case` reads a case file (stdlib :mod:`tomllib`), checks every key,
type, unit, file reference and cross-reference, and returns a frozen
:class:`Case`. All problems are collected first and raised together as one
:class:`CaseError`, one line per problem, each naming the file, the key path
(``adsorbates.N.model``) and what was expected. Unknown keys are refused with
the closest valid key suggested (:func:`difflib.get_close_matches`).

The schema is documented key by key in ``docs/case-file.md``. Files named in
the case are resolved relative to the case file and read here (structures and
energies through :mod:`adsorb.io`), so that nothing downstream re-reads them;
the SHA-256 of every input file is recorded in :attr:`Case.input_files`.
"""

from __future__ import annotations

import hashlib
import math
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType

from adsorb.case_links import PathwaySpec, StepSpec, coverage_pressures, cross_checks, read_pathways, try_objects
from adsorb.case_schema import (ADSORBATE_KEYS, CASE_KEYS, GAS_KEYS, SURFACE_KEYS, ComparisonSpec, Conditions,
                                CurveSpec, OutputSpec, Reader, formula_counts, parse_parameters, read_conditions,
                                read_outputs)
from adsorb.case_outputs import IsostericSpec, NasaSpec, TPDSpec
from adsorb.errors import InputError

__all__ = ["CaseError", "Case", "GasSpec", "SurfaceSpec", "AdsorbateSpec", "Conditions", "PathwaySpec", "StepSpec",
           "CurveSpec", "ComparisonSpec", "OutputSpec", "IsostericSpec", "TPDSpec", "NasaSpec", "load_case"]


class CaseError(InputError):
    """A case file has problems; ``problems`` holds one line per problem."""

    def __init__(self, problems):
        self.problems = tuple(problems)
        super().__init__("\n".join(self.problems))


@dataclass(frozen=True)
class Anchor:
    """G(gas) := sum of coefficient x G(other gas) + offset_eV (e.g. O2 from 2 H2O - 2 H2 + 4.92 eV)."""

    species: tuple
    offset_eV: float
    source: str = ""


@dataclass(frozen=True)
class GasSpec:
    """A gas reference: structure, electronic energy (eV), frequencies (cm^-1) and rotor data."""

    name: str
    energy_eV: float
    frequencies_cm: tuple
    composition: tuple
    multiplicity: int = 1
    symmetry_number: int | None = None
    rotational_constants_cm: tuple | None = None
    electronic_levels: tuple | None = None
    critical: tuple | None = None        # (Tc in K, Pc in Pa, acentric factor, source)
    anchor: Anchor | None = None
    options: tuple = ()                  # extra GasMolecule keywords: rotor, centrifugal_cm, imaginary_modes
    source: str = ""
    atoms: object = field(default=None, repr=False, compare=False)


@dataclass(frozen=True)
class SurfaceSpec:
    """A clean surface: electronic energy of the slab (eV) and area per site (Å^2)."""

    name: str
    energy_eV: float
    site_area_A2: float | None
    composition: tuple | None
    source: str = ""


@dataclass(frozen=True)
class AdsorbateSpec:
    """An adsorbate on a named surface, its model and the keyword arguments of :class:`adsorb.adsorbate.Adsorbate`."""

    name: str
    surface: str
    energy_eV: float
    frequencies_cm: tuple
    model: str
    parameters: tuple                    # (name, value) pairs for Adsorbate(**parameters)
    gas: str | None = None
    dissociative: bool = False
    sites: int = 1
    interactions_eV: tuple = ()          # (other adsorbate, epsilon in eV)
    standard_state: str | None = None
    in_coverages: bool = False
    composition: tuple | None = None
    source: str = ""
    atoms: object = field(default=None, repr=False, compare=False)
    mode_vectors: object = field(default=None, repr=False, compare=False)
    mode_indices: object = field(default=None, repr=False, compare=False)


@dataclass(frozen=True)
class Case:
    """A validated study: conditions, species, pathways and what to produce (read-only)."""

    path: Path
    title: str
    description: str
    notes: tuple
    conditions: object
    gases: MappingProxyType
    surfaces: MappingProxyType
    adsorbates: MappingProxyType
    pathways: MappingProxyType
    outputs: object
    input_files: tuple                   # (path, sha256) pairs, the case file first

    def species_names(self):
        """Every name a pathway may use (gases, adsorbates and '*')."""
        return set(self.gases) | set(self.adsorbates) | {"*"}


def _sha256(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


class _Loader:
    """Reads the referenced files once, remembering hashes; problems go to the reader."""

    def __init__(self, reader: Reader):
        self.r = reader
        self.hashes = {}

    def path(self, t, key):
        value = t.string(key)
        if value is None:
            return None
        p = (self.r.base / value).resolve() if not Path(value).is_absolute() else Path(value)
        if not p.is_file():
            t.problem(key, f"file '{value}' not found (resolved to {p})", "an existing file, relative to the case file")
            return None
        self.hashes.setdefault(str(p), _sha256(p))
        return p

    def structure(self, t):
        p = self.path(t, "structure")
        if p is None:
            return None, None
        from adsorb.io import read_structure

        try:
            return read_structure(p, index=t.integer("structure_index", default=-1),
                                  format=t.string("structure_format"))
        except InputError as exc:
            t.problem("structure", str(exc), "a structure file ase.io can read")
            return None, None

    def energy(self, t, file_energy, needed=True):
        e = t.number("energy_eV", finite=True)
        # a structure file that could not be read is already a problem: its missing energy is not another one
        unread = t.has("structure") and any(p.startswith(f"{t.file}: {t.where('structure')}: ") for p in t.problems)
        if e is None and file_energy is None and needed and not t.has("energy_eV") and not unread:
            t.problem("energy_eV", "no electronic energy (the structure file has none either)",
                      "a number in eV, or a structure file that carries its energy")
        return e if e is not None else file_energy

    def frequencies(self, t, *, modes=False):
        keys = [k for k in ("frequencies_cm", "frequencies_file", "vibrations_file") if t.has(k)]
        if len(keys) != 1:
            t.problem(keys[1] if keys else "frequencies_cm",
                      "give exactly one of frequencies_cm, frequencies_file, vibrations_file" if keys
                      else "no frequencies given", "a list of wavenumbers in cm^-1 or a frequency file")
            return None, None
        key = keys[0]
        if key != "frequencies_file" and t.has("frequencies_format"):
            t.problem("frequencies_format", f"not used with {key}", "frequencies_format only beside frequencies_file")
            return None, None
        if key == "frequencies_cm":
            nu = t.numbers(key, finite=True)
            if nu is not None and not nu:
                t.problem(key, "empty list", "at least one wavenumber in cm^-1")
                return None, None
            return (tuple(nu) if nu is not None else None), None
        p = self.path(t, key)
        if p is None:
            return None, None
        from adsorb import io

        try:
            if key == "frequencies_file":
                fmt = t.string("frequencies_format", choices=io.FREQUENCY_FORMATS)
                return tuple(float(x) for x in io.read_frequencies(p, format=fmt)), None
            vib = io.read_vibrations(p)
            return tuple(float(x) for x in vib.frequencies_cm), (vib if modes else None)
        except InputError as exc:
            t.problem(key, str(exc), "a readable frequency file")
            return None, None


def _composition(atoms):
    counts = {}
    for s in atoms.get_chemical_symbols():
        counts[s] = counts.get(s, 0) + 1
    return counts


def _frozen(d):
    return tuple(sorted((k, v) for k, v in d.items() if v)) if d is not None else None


def _read_gas(name, t, ld):
    t.allow(GAS_KEYS)
    atoms, file_e = ld.structure(t) if t.has("structure") else (None, None)
    if t.has("structure") and t.has("symbols"):
        t.problem("symbols", "both a structure file and inline symbols", "one of structure or symbols + positions_A")
    if t.has("symbols"):
        symbols = t.strings("symbols")
        pos = t.vectors("positions_A", required=True)
        if symbols is not None and pos is not None:
            if len(pos) != len(symbols):
                t.problem("positions_A", f"{len(pos)} positions for {len(symbols)} symbols", "one [x, y, z] in Å per symbol")
            else:
                from adsorb.study import inline_atoms

                atoms = inline_atoms(symbols, pos, t.where("symbols"))
                if isinstance(atoms, str):
                    t.problem("symbols", atoms, "chemical element symbols")
                    atoms = None
    anchored = t.has("gibbs_anchor")
    if anchored:
        for key in ("structure", "symbols", "energy_eV", "frequencies_cm", "frequencies_file", "vibrations_file"):
            if t.has(key):
                t.problem(key, "not used: the gibbs_anchor fixes this gas's Gibbs energy", "only formula and gibbs_anchor")
    elif not t.has("structure") and not t.has("symbols"):
        t.problem("structure", "no geometry", "a structure file, or inline symbols + positions_A (Å)")
    energy = ld.energy(t, file_e, needed=not anchored)
    nu = None
    if not anchored and (atoms is None or len(atoms) > 1 or any(t.has(k) for k in ("frequencies_cm", "frequencies_file"))):
        nu, _ = ld.frequencies(t)
    if nu is not None and atoms is not None and len(atoms) == 1:
        t.problem("frequencies_cm", "an atom has no vibrations", "no frequencies for a single atom")
    if nu is not None and any(v <= 0 for v in nu) and not t.has("imaginary_modes"):
        t.problem("frequencies_cm" if t.has("frequencies_cm") else "frequencies_file",
                  f"imaginary or zero mode(s) {[v for v in nu if v <= 0]}", "real positive wavenumbers for a gas minimum")
    if anchored and not t.has("formula"):
        t.problem("formula", "missing", "the formula of the anchored gas (e.g. 'O2'), for balance checks")
    crit = [t.number("critical_temperature_K", positive=True),
            t.unit_value("critical_pressure"), t.number("acentric_factor")]
    given = [c is not None for c in crit]
    if any(given) and not all(given):
        t.problem("critical_temperature_K", "incomplete critical constants",
                  "all of critical_temperature_K, critical_pressure_<unit>, acentric_factor")
    anchor = None
    at = t.table("gibbs_anchor")
    if at is not None:
        at.allow({"species": "", "offset_eV": "", "source": ""})
        sp = at.number_map("species", required=True)
        off = at.number("offset_eV", required=True, finite=True)
        if sp is not None and off is not None:
            anchor = Anchor(tuple(sp.items()), off, at.string("source") or "")
    if all(given):
        crit.append("given in the case file")
    else:
        from adsorb.eos import CRITICAL_CONSTANTS

        if name in CRITICAL_CONSTANTS:
            c = CRITICAL_CONSTANTS[name]
            crit = [c.critical_temperature, c.critical_pressure, c.acentric_factor, f"adsorb.eos table: {c.source}"]
            given = [True] * 3
    options = {"rotor": t.string("rotor", choices=("auto", "classical", "levels")),
               "centrifugal_cm": t.number("centrifugal_cm", minimum=0.0),
               "imaginary_modes": t.string("imaginary_modes", choices=("raise", "drop", "invert"))}
    levels = t.vectors("electronic_levels", width=2)
    comp = _composition(atoms) if atoms is not None else None
    if t.has("formula"):
        comp = formula_counts(t.string("formula"), t, "formula")
    return GasSpec(
        name=name, energy_eV=float(energy) if energy is not None else math.nan,
        frequencies_cm=nu or (), composition=_frozen(comp),
        multiplicity=t.integer("multiplicity", default=1, minimum=1),
        symmetry_number=t.integer("symmetry_number", minimum=1),
        rotational_constants_cm=(tuple(v) if (v := t.numbers("rotational_constants_cm", positive=True)) else None),
        electronic_levels=tuple(map(tuple, levels)) if levels else None,
        critical=tuple(crit) if all(given) else None, anchor=anchor, source=t.string("source") or "", atoms=atoms,
        options=tuple((k, v) for k, v in options.items() if v is not None))


def _read_surface(name, t, ld):
    t.allow(SURFACE_KEYS)
    atoms, file_e = ld.structure(t) if t.has("structure") else (None, None)
    energy = ld.energy(t, file_e)
    return SurfaceSpec(name=name, energy_eV=float(energy) if energy is not None else math.nan,
                       site_area_A2=t.number("site_area_A2", positive=True),
                       composition=_frozen(_composition(atoms)) if atoms is not None else None,
                       source=t.string("source") or "")


CASE_MODELS = ("harmonic", "lattice-gas", "hindered", "2d-gas")


def _model_parameters(t, model):
    """Adsorbate keyword arguments of table ``t`` for ``model``; None for an unknown model."""
    if model not in CASE_MODELS:
        extra = " (the surface-pes model needs a potential-energy object: use the Python API)" \
            if model == "surface-pes" else t.suggest(model, CASE_MODELS)
        t.problem("model", f"unknown model {model!r}{extra}", f"one of {', '.join(CASE_MODELS)}")
        return None
    return parse_parameters(t, model)


def _require_model_keys(t, model, params, *, n_modes, has_atoms, where=""):
    """Problems for parameters a model needs and the inputs do not supply."""
    missing = []
    if model in ("hindered", "2d-gas") and "mass" not in params and not has_atoms:
        missing.append("mass_amu (or a structure)")
    if model == "hindered":
        if "translation_barrier" not in params:
            missing.append("translation_barrier_eV")
        if n_modes != 3:  # a single atom (3 modes) has no rotation about the normal
            missing += [k for k, a in (("rotation_barrier_eV", "rotation_barrier"), ("rotation_minima", "rotation_minima"))
                        if a not in params]
            if "inertia" not in params and not has_atoms:
                missing.append("inertia_amu_A2 (or a structure)")
    for m in missing:
        t.problem(where + m.split(" ")[0], f"model {model!r} needs {m}", "a value for this model parameter")
    return not missing


def _read_adsorbate(name, t, ld, case):
    t.allow(ADSORBATE_KEYS)
    atoms, file_e = ld.structure(t) if t.has("structure") else (None, None)
    energy = ld.energy(t, file_e)
    nu, vib = ld.frequencies(t, modes=True)
    model = t.string("model", default="harmonic")
    params = _model_parameters(t, model)
    if params is not None and nu is not None:
        _require_model_keys(t, model, params, n_modes=len(nu), has_atoms=atoms is not None)
    if nu is not None and any(v <= 0 for v in nu) and "imaginary_modes" not in (params or {}):
        bad = ", ".join(f"{v:g}" for v in nu if v <= 0)
        t.problem("imaginary_modes", f"imaginary/zero mode(s) {bad} cm^-1 and no policy",
                  "imaginary_modes = 'drop' or 'invert' (or only real frequencies)")
    surface = t.string("surface", required=True)
    if surface is not None and surface not in case["surfaces"]:
        t.problem("surface", f"unknown surface {surface!r}{t.suggest(surface, case['surfaces'])}",
                  f"one of the [surfaces] names ({', '.join(case['surfaces']) or 'none defined'})")
    gas = t.string("gas")
    if gas is not None and gas not in case["gases"]:
        t.problem("gas", f"unknown gas reference {gas!r}{t.suggest(gas, case['gases'])}",
                  f"one of the [gases] names ({', '.join(case['gases']) or 'none defined'})")
    inter = t.number_map("interactions_eV") or {}
    for other in inter:
        if other not in case["adsorbates"]:
            t.problem(f"interactions_eV.{other}", f"unknown adsorbate {other!r}{t.suggest(other, case['adsorbates'])}",
                      "the name of another adsorbate")
    std = t.string("standard_state")
    if std is not None:
        _check_state(t, "standard_state", std)
    comp = None
    if t.has("formula"):
        comp = formula_counts(t.string("formula"), t, "formula")
    elif atoms is not None and surface in case["surface_atoms"]:
        slab = case["surface_atoms"][surface]
        diff = {k: v - slab.get(k, 0) for k, v in _composition(atoms).items()}
        if any(v < 0 for v in diff.values()) or any(k not in diff for k in slab):
            t.problem("structure", "the structure does not contain the clean slab of its surface",
                      "slab + adsorbate atoms (or give formula)")
        else:
            comp = diff
    use_modes = vib is not None and atoms is not None and vib.atoms is not None and len(vib.atoms) == len(atoms)
    return AdsorbateSpec(
        name=name, surface=surface or "", energy_eV=float(energy) if energy is not None else math.nan,
        frequencies_cm=nu or (), model=model if params is not None else "harmonic",
        parameters=tuple(sorted((params or {}).items())),
        gas=gas, dissociative=t.boolean("dissociative", default=False), sites=t.integer("sites", default=1, minimum=1),
        interactions_eV=tuple(sorted(inter.items())), standard_state=std,
        in_coverages=t.boolean("in_coverages", default=gas is not None), composition=_frozen(comp),
        source=t.string("source") or "", atoms=atoms, mode_vectors=vib.modes if use_modes else None,
        mode_indices=vib.indices if use_modes else None)


def _check_state(t, key, state):
    from adsorb.standard_states import STANDARD_STATES

    if state not in STANDARD_STATES:
        t.problem(key, f"unknown standard state {state!r}{t.suggest(state, STANDARD_STATES)}",
                  f"one of {', '.join(STANDARD_STATES)}")


def load_case(path) -> Case:
    """Read and validate a case file; return a :class:`Case` or raise :class:`CaseError` listing every problem.

    Parameters
    ----------
    path : str or pathlib.Path
        The TOML case file. Relative file names inside it are resolved against
        its folder.

    Raises
    ------
    CaseError
        One line per problem: ``FILE: KEY.PATH: what is wrong; expected ...``.
    """
    path = Path(path)
    if not path.is_file():
        raise CaseError([f"{path}: case file not found; expected an existing TOML file"])
    raw = path.read_bytes()
    try:
        data = tomllib.loads(raw.decode("utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError, ValueError) as exc:  # ValueError: an integer of > 4300 digits
        raise CaseError([f"{path}: not valid TOML ({exc}); expected a TOML case file"]) from None
    root = Reader(path, data)
    ld = _Loader(root)
    root.allow(CASE_KEYS)
    study = root.table("study", required=True)
    title = description = ""
    notes = ()
    if study is not None:
        study.allow({"title": "", "description": "", "notes": ""})
        title = study.string("title", required=True) or ""
        description = study.string("description") or ""
        notes = tuple(study.strings("notes") or ())
    sections = {k: root.tables(k) for k in ("gases", "surfaces", "adsorbates")}
    names = {k: dict(v) for k, v in sections.items()}
    for a, b in (("gases", "surfaces"), ("gases", "adsorbates"), ("surfaces", "adsorbates")):
        for dup in set(names[a]) & set(names[b]):
            root.problem(f"{b}.{dup}", f"name {dup!r} is also used in [{a}]", "names unique across gases, surfaces and adsorbates")
    for sec in names.values():
        if "*" in sec:
            root.problem(f"{[k for k, v in names.items() if v is sec][0]}.*", "'*' is reserved for the empty site", "another name")
    gases = {n: _read_gas(n, t, ld) for n, t in sections["gases"]}
    surfaces = {n: _read_surface(n, t, ld) for n, t in sections["surfaces"]}
    surface_atoms = {n: dict(s.composition) for n, s in surfaces.items() if s.composition is not None}
    ctx = {"gases": gases, "surfaces": surfaces, "adsorbates": names["adsorbates"], "surface_atoms": surface_atoms}
    adsorbates = {n: _read_adsorbate(n, t, ld, ctx) for n, t in sections["adsorbates"]}
    cross_checks(root, gases, adsorbates, surfaces)
    try_objects(root, gases, adsorbates, surfaces)
    ctx["adsorbates"] = adsorbates
    conditions = read_conditions(root, gases)
    if conditions is not None and conditions.standard_state:
        _check_state(root.sub("conditions"), "standard_state", conditions.standard_state)
    pathways = read_pathways(root, ctx)
    outputs = read_outputs(root, ctx, conditions)
    if conditions is not None and not any(": conditions" in p for p in root.problems):
        coverage_pressures(root, conditions, gases, adsorbates, outputs)
    if root.problems:
        raise CaseError(root.problems)
    files = ((str(path.resolve()), hashlib.sha256(raw).hexdigest()),) + tuple(ld.hashes.items())
    return Case(path=path, title=title, description=description, notes=notes, conditions=conditions,
                gases=MappingProxyType(gases), surfaces=MappingProxyType(surfaces),
                adsorbates=MappingProxyType(adsorbates), pathways=MappingProxyType(pathways),
                outputs=outputs, input_files=files)
