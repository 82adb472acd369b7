"""``adsorb gas``: thermochemistry table of a gas molecule from a structure and its frequencies.

Example::

    adsorb gas co.xyz --frequencies "2143.3" --t-min 300 --t-max 1000 --t-step 100
    adsorb gas h2o.traj --frequency-file h2o_freqs.txt --temperatures "298.15 500" --json

The structure is read with :func:`adsorb.io.read_structure` (any format
``ase.io`` reads); its energy is used when the file carries one, unless
``--energy-ev`` is given. Frequencies come from ``--frequencies`` or
``--frequency-file`` (:func:`adsorb.io.read_frequencies`: plain text numbers
separated by whitespace or commas, ``#`` comments, ``120i`` or a minus sign for
imaginary modes; also ASE vibration JSON and VASP OUTCAR).

``--torsion`` (repeatable) replaces one harmonic mode by a hindered internal
rotor (:class:`adsorb.gas.Torsion`, docs/methods-gas.md §7), described by
``KEY=VALUE`` words separated by spaces::

    adsorb gas ethane.xyz --frequency-file ethane.txt --torsion "top=0,2,3,4 v3=1024 sigma=3 mode=3"

Keys: ``top`` (atom indices of the rotating group, with its atom on the axis),
``v1``, ``v2``, ... (barrier terms V_n in cm^-1, at least one), ``sigma``
(internal symmetry number, default 1), ``mode`` (0-based index into the
frequencies, or ``lowest``, the default) or ``mode-cm`` (the mode's wavenumber
in cm^-1), ``axis`` (two atom indices), ``inertia`` (reduced moment in amu Å^2,
instead of ``top``), ``moment`` (``two-top`` or ``coupled``) and ``solver``
(``exact`` or ``closed-form``).
"""

from __future__ import annotations

import argparse
import json
import re

_DEFAULT_RANGE = (100.0, 1000.0, 100.0)


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """Options of ``adsorb gas`` (nothing heavy imported here)."""
    parser.add_argument("structure", help="structure file (any format ase.io reads)")
    parser.add_argument("--format", default=None, help="ase.io format name, for renamed files")
    parser.add_argument("--index", type=int, default=-1, help="image of a multi-image file (default -1, the last)")
    freq = parser.add_mutually_exclusive_group()
    freq.add_argument("--frequencies", default=None, metavar='"NU1 NU2 ..."',
                      help="vibrational wavenumbers in cm^-1, whitespace or comma separated ('120i' = imaginary)")
    freq.add_argument("--frequency-file", default=None, metavar="FILE",
                      help="file of wavenumbers in cm^-1 (text, ASE vibration JSON or OUTCAR)")
    parser.add_argument("--energy-ev", type=float, default=None,
                        help="electronic energy in eV (overrides the structure file's energy; default: the file's, else 0)")
    parser.add_argument("--multiplicity", type=int, default=1, help="spin multiplicity 2S+1 (default 1)")
    parser.add_argument("--symmetry-number", type=int, default=None,
                        help="external rotational symmetry number (default: detected from the geometry)")
    parser.add_argument("--rotational-constants", default=None, metavar='"B" | "A B C"',
                        help="rotational constants in cm^-1 overriding the geometry")
    parser.add_argument("--electronic-level", nargs=2, action="append", type=float, default=None,
                        metavar=("DEGENERACY", "ENERGY_CM"), help="excited electronic level (repeatable)")
    parser.add_argument("--rotor", choices=("auto", "classical", "levels"), default="auto",
                        help="linear-rotor treatment (default auto: level sum when B > 5 cm^-1)")
    parser.add_argument("--centrifugal-cm", type=float, default=0.0,
                        help="centrifugal distortion constant D in cm^-1 for the level sum (default 0)")
    parser.add_argument("--imaginary-modes", choices=("raise", "drop", "invert"), default="raise",
                        help="policy for imaginary modes (default raise)")
    parser.add_argument("--near-zero-cm", type=float, default=50.0,
                        help="|nu| below which surplus rigid-body modes are dropped (default 50 cm^-1)")
    parser.add_argument("--torsion", action="append", default=None, metavar='"top=I,J,.. vN=V_CM sigma=S ..."',
                        help="treat a torsion as a hindered rotor (repeatable); keys: top, v1 v2 ... (barrier "
                             "terms in cm^-1), sigma, mode (index or 'lowest') or mode-cm, axis, inertia "
                             "(amu Å^2), moment (two-top|coupled), solver (exact|closed-form)")
    parser.add_argument("--t-min", type=float, default=None, help=f"lowest temperature in K (default {_DEFAULT_RANGE[0]:g})")
    parser.add_argument("--t-max", type=float, default=None, help=f"highest temperature in K (default {_DEFAULT_RANGE[1]:g})")
    parser.add_argument("--t-step", type=float, default=None, help=f"temperature step in K (default {_DEFAULT_RANGE[2]:g})")
    parser.add_argument("--temperatures", default=None, metavar='"T1 T2 ..."',
                        help="explicit temperatures in K (instead of the range options)")
    parser.add_argument("--pressure-bar", type=float, default=1.0, help="pressure in bar (default 1)")
    parser.add_argument("--name", default=None, help="label of the species (default: chemical formula)")
    parser.add_argument("--json", action="store_true", help="print machine-readable JSON instead of a table")


def _numbers(option: str, text: str) -> list[float]:
    from adsorb.errors import InputError

    tokens = [t for t in re.split(r"[\s,]+", text.strip()) if t]
    try:
        values = [float(t) for t in tokens]
    except ValueError:
        raise InputError(f"{option}: expected numbers separated by spaces or commas, got {text!r}") from None
    if not values:
        raise InputError(f"{option}: expected at least one number, got {text!r}")
    return values


def _one_number(option: str, text: str) -> float:
    from adsorb.errors import InputError

    values = _numbers(option, text)
    if len(values) != 1:
        raise InputError(f"{option}: expected one number, got {text!r}")
    return values[0]


def _temperatures(args):
    import numpy as np

    from adsorb.errors import InputError

    if args.temperatures is not None:
        if any(v is not None for v in (args.t_min, args.t_max, args.t_step)):
            raise InputError("--temperatures: give either --temperatures or the --t-min/--t-max/--t-step range, not both")
        t = np.array(_numbers("--temperatures", args.temperatures))
    else:
        t_min = _DEFAULT_RANGE[0] if args.t_min is None else args.t_min
        t_max = _DEFAULT_RANGE[1] if args.t_max is None else args.t_max
        t_step = _DEFAULT_RANGE[2] if args.t_step is None else args.t_step
        if not (np.isfinite(t_step) and t_step > 0):
            raise InputError(f"--t-step: expected a step > 0 K, got {t_step!r}")
        if not (np.isfinite(t_min) and np.isfinite(t_max) and t_max >= t_min):
            raise InputError(f"--t-max: expected --t-max >= --t-min, got t-min={t_min!r}, t-max={t_max!r}")
        n = int(np.floor((t_max - t_min) / t_step + 1e-9)) + 1
        if n > 100_000:
            raise InputError(f"--t-step: {n} temperatures requested, expected at most 100000")
        t = t_min + t_step * np.arange(n)
    if not np.all(np.isfinite(t) & (t > 0)):
        bad = t[~(np.isfinite(t) & (t > 0))][0]
        raise InputError(f"temperatures: expected values > 0 K, got {bad!r}")
    return t


def _frequencies(args):
    from adsorb.errors import InputError
    from adsorb.io import read_frequencies

    if args.frequency_file is not None:
        return read_frequencies(args.frequency_file)
    if args.frequencies is None:
        return []
    tokens = [t for t in re.split(r"[\s,]+", args.frequencies.strip()) if t]
    try:
        return read_frequencies(tokens)
    except InputError as exc:
        raise InputError(f"--frequencies: {exc}") from None


# --torsion keys -> adsorb.gas.Torsion fields
_FIELDS = {"top": "top", "axis": "axis", "sigma": "symmetry_number", "mode": "mode", "mode-cm": "mode",
           "inertia": "inertia_amu_A2", "moment": "reduced_moment", "solver": "solver"}
_TORSION_KEYS = ("top", "v1, v2, ...", "sigma", "mode", "mode-cm", "axis", "inertia", "moment", "solver")


def _torsion(spec: str):
    """An adsorb.gas.Torsion from one ``--torsion`` value of KEY=VALUE words."""
    from adsorb.errors import InputError
    from adsorb.gas import Torsion

    label = f"--torsion {spec!r}"
    fields, barriers = {}, {}
    for word in spec.split():
        key, sep, value = word.partition("=")
        key = key.lower()
        if not sep or not value:
            raise InputError(f"{label}: expected KEY=VALUE words, got {word!r}")
        if key in fields or key in barriers:
            raise InputError(f"{label}: key {key!r} given twice")
        if key[:1] == "v" and key[1:].isdigit() and int(key[1:]) >= 1:
            barriers[key] = _one_number(f"{label} {key}", value)
        elif key in ("top", "axis"):
            try:
                fields[key] = [int(t) for t in value.split(",") if t]
            except ValueError:
                raise InputError(f"{label} {key}: expected comma-separated atom indices, got {value!r}") from None
        elif key in ("sigma", "mode"):
            if key == "mode" and value == "lowest":
                fields[key] = value
            elif value.isdigit():
                fields[key] = int(value)
            else:
                need = "an index >= 0 or 'lowest'" if key == "mode" else "a positive integer"
                raise InputError(f"{label} {key}: expected {need}, got {value!r}")
        elif key in ("mode-cm", "inertia"):
            fields[key] = _one_number(f"{label} {key}", value)
        elif key in ("moment", "solver"):
            fields[key] = value
        else:
            raise InputError(f"{label}: unknown key {key!r}; expected {', '.join(_TORSION_KEYS)}")
    if not barriers:
        raise InputError(f"{label}: expected at least one barrier term vN=V_CM (e.g. v3=1024), got none")
    if "mode" in fields and "mode-cm" in fields:
        raise InputError(f"{label}: give mode or mode-cm, not both")
    kwargs = {_FIELDS.get(k, k): v for k, v in fields.items()}
    try:
        return Torsion(barriers_cm={int(k[1:]): v for k, v in barriers.items()}, **kwargs)
    except InputError as exc:
        raise InputError(_torsion_message(spec, str(exc), "Torsion ")) from None


def _torsion_message(spec: str, message: str, prefix: str) -> str:
    """``message`` (after ``prefix``) restated with the --torsion value and its key names."""
    text = message[len(prefix):] if message.startswith(prefix) else message
    field, sep, rest = text.partition(": ")
    if sep and field and " " not in field.replace(" / ", "/"):
        keys = {name: key for key, name in _FIELDS.items() if key != "mode-cm"}
        keys.update(barriers_cm="vN")
        field = " / ".join(keys.get(f, f) for f in field.split(" / "))
        return f"--torsion {spec!r} {field}: {rest}"
    return f"--torsion {spec!r}: {text}"


def _table_text(molecule, table, energy_source) -> str:
    import numpy as np

    ch = table.choices
    lines = [
        f"# {table.name}: {ch['geometry']}, symmetry number {ch['symmetry_number']} ({ch['symmetry_number_source']}), "
        f"rotor {ch['rotor']}, harmonic modes: {len(ch['vibrational_modes_cm'])}, multiplicity {ch['multiplicity']}",
        f"# electronic energy {table.energy:.6f} eV ({energy_source}); ZPE {float(np.ravel(table.zpe)[0]):.6f} eV; "
        f"pressure {float(np.ravel(table.pressure)[0]) / 1e5:g} bar; G and H include the electronic energy and ZPE",
    ]
    for k, t in enumerate(ch["torsions"]):
        barrier = ", ".join(f"{n} = {v:g}" for n, v in t["barrier_terms_cm"].items()) or "free rotor"
        lines.append(
            f"# torsion[{k}]: hindered rotor ({t['solver']}) replacing the mode at {t['replaced_mode_cm']:g} cm^-1 "
            f"(index {t['replaced_mode_index']}); {barrier} cm^-1, sigma_int {t['symmetry_number']}, "
            f"I_red {t['reduced_moment_amu_A2']:.4f} amu Å^2 ({t['reduced_moment_source'].split(':')[0]})")
    if ch["dropped_near_zero_modes_cm"]:
        lines.append("# dropped near-zero modes (cm^-1): " + ", ".join(f"{v:g}" for v in ch["dropped_near_zero_modes_cm"]))
    for w in table.warnings:
        lines.append(f"# warning: {w}")
    header = ("T (K)", "G (kJ/mol)", "H (kJ/mol)", "H-H(0) (kJ/mol)", "S (J/mol/K)", "Cp (J/mol/K)")
    rows = zip(np.ravel(table.temperature), np.ravel(table.gibbs_kj_mol), np.ravel(table.enthalpy_kj_mol),
               np.ravel(table.thermal_enthalpy_kj_mol), np.ravel(table.entropy_j_mol_k),
               np.ravel(table.heat_capacity_j_mol_k))
    body = [(f"{t:.2f}", f"{g:.3f}", f"{h:.3f}", f"{dh:.3f}", f"{s:.3f}", f"{cp:.3f}") for t, g, h, dh, s, cp in rows]
    widths = [max(len(header[i]), *(len(r[i]) for r in body)) for i in range(len(header))]
    lines.append("  ".join(h.rjust(w) for h, w in zip(header, widths)))
    lines.extend("  ".join(c.rjust(w) for c, w in zip(r, widths)) for r in body)
    return "\n".join(lines)


def run(args) -> int:
    """Build the molecule, evaluate it and print the table (or JSON); return the exit code."""
    import numpy as np

    from adsorb import constants as C
    from adsorb.errors import InputError
    from adsorb.gas import GasMolecule
    from adsorb.io import read_structure

    temperatures = _temperatures(args)
    if not (np.isfinite(args.pressure_bar) and args.pressure_bar > 0):
        raise InputError(f"--pressure-bar: expected a pressure > 0 bar, got {args.pressure_bar!r}")
    atoms, file_energy = read_structure(args.structure, index=args.index, format=args.format)
    if args.energy_ev is not None:
        energy, source = args.energy_ev, "--energy-ev"
    elif file_energy is not None:
        energy, source = file_energy, f"from {args.structure}"
    else:
        energy, source = 0.0, "none in the file; 0 used"
    rot = None
    if args.rotational_constants is not None:
        rot = _numbers("--rotational-constants", args.rotational_constants)
    levels = [tuple(level) for level in args.electronic_level] if args.electronic_level else None
    specs = args.torsion or []
    torsions = [_torsion(spec) for spec in specs]
    try:
        molecule = GasMolecule(
            atoms, _frequencies(args), energy=energy, multiplicity=args.multiplicity,
            symmetry_number=args.symmetry_number, electronic_levels=levels, rotational_constants=rot,
            rotor=args.rotor, centrifugal_cm=args.centrifugal_cm, imaginary_modes=args.imaginary_modes,
            near_zero_cm=args.near_zero_cm, name=args.name, torsions=torsions)
    except InputError as exc:
        # name the option behind a torsion error: "GasMolecule torsions[k] ..." is the k-th --torsion
        found = re.match(r"GasMolecule torsions\[(\d+)\]", str(exc))
        if found is None:
            raise
        k = int(found.group(1))
        raise InputError(_torsion_message(specs[k], str(exc), f"GasMolecule torsions[{k}] ")) from None
    table = molecule.thermo(temperatures, args.pressure_bar * C.bar)
    if args.json:
        data = table.to_dict()
        data["electronic_energy_source"] = source
        for row, dh in zip(data["rows"], np.ravel(table.thermal_enthalpy_kj_mol)):
            row["enthalpy_minus_h0_kJ_mol"] = float(dh)
        print(json.dumps(data, indent=2, allow_nan=False))
    else:
        print(_table_text(molecule, table, source))
    return 0
