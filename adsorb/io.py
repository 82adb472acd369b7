"""Reading a user's calculation files: structures, energies, frequencies, modes, ase.db rows.

Everything goes through ASE's general-purpose readers (``ase.io``, ``ase.db``,
``ase.vibrations.VibrationsData``) except two plain-text formats that are parsed here:
lists of wavenumbers and the frequency block of a VASP ``OUTCAR``. Structures given as
plain data (symbols and positions, or a name of ASE's molecule collection) are built here
too (:func:`atoms_from_symbols`, :func:`named_molecule`), so that ASE is imported only in
this module and in :mod:`adsorb.geometry`.

Units at the boundary: energies in eV (as converted by the ASE reader of each code),
wavenumbers in cm^-1 with imaginary modes returned as **negative** numbers, lengths in Å,
masses in amu.

Every failure to read raises :class:`adsorb.errors.InputError` with a one-line message
that names the file.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from adsorb import constants
from adsorb.errors import InputError

__all__ = [
    "VibrationSet",
    "DbRecord",
    "read_structure",
    "atoms_from_symbols",
    "named_molecule",
    "read_frequencies",
    "read_vibrations",
    "OutcarModes",
    "parse_outcar_modes",
    "select_rows",
]

#: formats accepted by :func:`read_frequencies` and :func:`read_vibrations`
FREQUENCY_FORMATS = ("text", "ase-json", "outcar")


# --------------------------------------------------------------------------- helpers


def _one_line(exc: BaseException, limit: int = 200) -> str:
    """Type and first line of an exception, shortened for a one-line message."""
    text = str(exc).strip().splitlines()
    first = text[0].strip() if text else ""
    if len(first) > limit:
        first = first[: limit - 3] + "..."
    name = type(exc).__name__
    return f"{name}: {first}" if first else name


def _as_path(path, what: str) -> Path:
    if isinstance(path, (bytes, bytearray)):
        path = path.decode()
    if not isinstance(path, (str, Path)):
        raise InputError(f"{what}: expected a file path (str or pathlib.Path), got {type(path).__name__} {path!r}")
    return Path(path)


def _existing_file(path, what: str) -> Path:
    path = _as_path(path, what)
    if not path.exists():
        raise InputError(f"{what} '{path}': no such file")
    if not path.is_file():
        raise InputError(f"{what} '{path}': not a regular file (a directory?)")
    return path


def _energy_from_results(atoms, path: Path, fmt_label: str):
    """The calculator's ``results['energy']`` in eV (float), or None when there is none."""
    calc = getattr(atoms, "calc", None)
    results = getattr(calc, "results", None) or {}
    if "energy" not in results or results["energy"] is None:
        return None
    raw = results["energy"]
    try:
        energy = float(np.asarray(raw, dtype=float).reshape(()))
    except (TypeError, ValueError) as exc:
        raise InputError(
            f"structure file '{path}' ({fmt_label}): energy {raw!r} is not a single number ({_one_line(exc)})"
        ) from None
    if not math.isfinite(energy):
        raise InputError(
            f"structure file '{path}' ({fmt_label}): the energy is {energy} (not finite); "
            "the calculation probably did not converge (an unconverged ORCA run gives NaN)"
        )
    return energy


# --------------------------------------------------------------------------- structures


def read_structure(path, *, index=-1, format=None):
    """Read one structure and its total energy through :func:`ase.io.read`.

    Parameters
    ----------
    path : str or pathlib.Path
        Any file ``ase.io.read`` can read: extxyz, ASE trajectory, ase.db, VASP
        OUTCAR / vasprun.xml / POSCAR / CONTCAR, Quantum ESPRESSO output, Gaussian,
        ORCA, ... The format is guessed from the name unless ``format`` is given.
    index : int, optional
        Which image of a multi-image file to take (default -1, the last one).
        For a VASP finite-difference run (IBRION=5/6) the reference geometry is
        image 0, not the last one.
    format : str, optional
        An ``ase.io`` format name (``"extxyz"``, ``"traj"``, ``"vasp-out"``,
        ``"vasp-xml"``, ``"vasp"``, ``"espresso-out"``, ...). Needed for renamed
        files such as ``slab.outcar`` or ``run.xml``.

    Returns
    -------
    atoms : ase.Atoms
        The structure as read (with the reader's calculator attached, if any).
    energy : float or None
        ``atoms.calc.results['energy']`` in eV — ASE's electronic energy, for VASP the
        sigma -> 0 extrapolation — or None for structure-only formats. ASE's
        ``free_energy`` (the Mermin/smearing free energy) is never used: it is not a
        Gibbs energy.

    Raises
    ------
    InputError
        Missing or empty file, unknown format, any failure inside the ASE reader, a
        non-integer or out-of-range ``index``, or an energy or a position that is NaN or
        infinite.
    """
    path = _existing_file(path, "structure file")
    if isinstance(index, bool) or not isinstance(index, (int, np.integer)):
        raise InputError(
            f"read_structure('{path}'): index must be an integer image number, got {index!r}"
        )
    if format is not None and not isinstance(format, str):
        raise InputError(f"read_structure('{path}'): format must be a string, got {format!r}")
    fmt_label = f"format '{format}'" if format else "format guessed from the file name"

    if path.stat().st_size == 0:
        raise InputError(f"structure file '{path}': the file is empty (expected at least one atom)")

    import ase.io  # ASE is imported only in geometry/io code

    try:
        atoms = ase.io.read(str(path), index=int(index), format=format)
    except Exception as exc:  # every reader failure becomes one clean line
        n_images = _image_count(path, format) if isinstance(exc, (StopIteration, IndexError)) else None
        if n_images is not None and not -n_images <= index < n_images:
            raise InputError(f"structure file '{path}' ({fmt_label}): index {index} is out of range for its "
                             f"{n_images} image(s); expected an image number from {-n_images} to {n_images - 1}") from None
        hint = ""
        if type(exc).__name__ == "UnknownFileTypeError" or (format is None and isinstance(exc, UnicodeDecodeError)):
            hint = "; pass format= with an ase.io format name (e.g. 'vasp-out' for a renamed OUTCAR)"
        elif isinstance(exc, KeyError) and exc.args and isinstance(exc.args[0], str):
            from ase.data import chemical_symbols

            if exc.args[0] not in chemical_symbols:
                hint = f"; {exc.args[0]!r} is not a chemical element symbol (expected symbols such as H, C, O, Pt)"
        raise InputError(f"cannot read structure file '{path}' ({fmt_label}): {_one_line(exc)}{hint}") from exc
    if isinstance(atoms, list):  # defensive: some readers return a list for one index
        if len(atoms) != 1:
            raise InputError(
                f"structure file '{path}' ({fmt_label}): index {index} selected {len(atoms)} images, expected one"
            )
        atoms = atoms[0]
    # the energy first: any later change of the atoms invalidates a SinglePointCalculator
    energy = _energy_from_results(atoms, path, fmt_label)
    bad = np.flatnonzero(~np.all(np.isfinite(atoms.positions), axis=1))
    if bad.size:
        i = int(bad[0])
        raise InputError(f"structure file '{path}' ({fmt_label}): atom {i} ({atoms[i].symbol}) is at "
                         f"{atoms.positions[i].tolist()}; expected finite coordinates in Å")
    return atoms, energy


def _image_count(path: Path, format):
    """Number of images ase.io reads from ``path``, or None when it cannot read them all."""
    import ase.io

    try:
        return len(ase.io.read(str(path), index=":", format=format))
    except Exception:
        return None


# --------------------------------------------------------------------------- building structures


def atoms_from_symbols(symbols, positions_A=None):
    """An ``ase.Atoms`` from chemical symbols and Cartesian positions.

    The one place outside :mod:`adsorb.geometry` where structures are built
    from plain data (inline structures of case files, structures built by
    :mod:`adsorb.entropy_benchmarks`).

    Parameters
    ----------
    symbols : str or sequence of str
        Chemical symbols, one per atom (``["C", "O"]``), or a formula string
        (``"CO"``, ``"C6H14"``) read by ASE's formula parser.
    positions_A : array_like of shape (n_atoms, 3), optional
        Cartesian positions in Å, in the order of the symbols. Default: every
        atom at the origin (enough for a single atom).

    Returns
    -------
    ase.Atoms
        No cell, no periodicity, no calculator.

    Raises
    ------
    InputError
        An unknown symbol, or positions that are not one [x, y, z] in Å per atom.
    """
    from ase import Atoms

    try:
        positions = None if positions_A is None else np.asarray(positions_A, dtype=float)
        return Atoms(symbols=symbols, positions=positions)
    except (KeyError, ValueError) as exc:
        shown = symbols if isinstance(symbols, str) else list(symbols)
        raise InputError(f"cannot build atoms from symbols {shown!r} ({exc})") from None


def named_molecule(name: str):
    """A molecule of ASE's built-in collection (the G2 set and a few extras) by name.

    Parameters
    ----------
    name : str
        A name known to ``ase.build.molecule``: a formula such as ``"CO"`` or
        ``"CH4"``, or a G2 name such as ``"trans-butane"``.

    Returns
    -------
    ase.Atoms
        The geometry of the collection (coordinates in Å), without a cell.

    Raises
    ------
    InputError
        A name the collection does not hold.
    """
    from ase.build import molecule

    try:
        return molecule(name)
    except KeyError:
        raise InputError(f"named_molecule name: {name!r} is not in ASE's molecule collection "
                         "(expected a name known to ase.build.molecule, e.g. 'CO' or 'trans-butane')") from None


# --------------------------------------------------------------------------- frequencies

_IMAG_SUFFIX = ("i", "I")


def _parse_wavenumber(token: str):
    """One wavenumber token -> float (imaginary -> negative). Raises ValueError."""
    text = token.strip()
    imaginary = False
    if text.endswith(_IMAG_SUFFIX):
        imaginary = True
        text = text[:-1].rstrip()
    value = float(text)  # raises ValueError on 'abc'
    if not math.isfinite(value):
        raise ValueError("not finite")
    if imaginary:
        value = -abs(value)
    return value


def _frequencies_from_text(path: Path, text: str) -> np.ndarray:
    if "\x00" in text:
        raise InputError(f"frequency file '{path}': contains NUL bytes (a UTF-16 or binary file?); "
                         "expected plain UTF-8 text of wavenumbers in cm^-1")
    values = []
    for number, line in enumerate(text.splitlines(), start=1):
        content = line.split("#", 1)[0]
        for token in re.split(r"[,\s]+", content.strip()):
            if not token:
                continue
            try:
                values.append(_parse_wavenumber(token))
            except ValueError:
                raise InputError(
                    f"frequency file '{path}', line {number}: {token!r} is not a finite number "
                    "(expected wavenumbers in cm^-1 separated by spaces or commas, "
                    "'i' suffix or minus sign for imaginary modes, '#' for comments)"
                ) from None
    if not values:
        raise InputError(f"frequency file '{path}': contains no numbers (expected wavenumbers in cm^-1)")
    return np.asarray(values, dtype=float)


def _complex_to_signed(values) -> np.ndarray:
    """ASE-style complex wavenumbers (imaginary mode = 0 + x j) -> real, imaginary negative."""
    z = np.asarray(values, dtype=complex)
    return np.where(np.abs(z.imag) > np.abs(z.real), -np.abs(z.imag), z.real).astype(float)


def _frequencies_from_sequence(source) -> np.ndarray:
    items = list(source) if not isinstance(source, np.ndarray) else source
    if isinstance(items, np.ndarray):
        arr = items
        if arr.ndim != 1:
            raise InputError(f"frequencies: expected a 1-D sequence of wavenumbers in cm^-1, got an array of shape {arr.shape}")
        if np.iscomplexobj(arr):
            out = _complex_to_signed(arr)
        else:
            try:
                out = np.asarray(arr, dtype=float)
            except (TypeError, ValueError):
                out = np.asarray([_sequence_item(x, i) for i, x in enumerate(arr.tolist())], dtype=float)
    else:
        out = np.asarray([_sequence_item(x, i) for i, x in enumerate(items)], dtype=float)
    if out.size == 0:
        raise InputError("frequencies: the sequence is empty (expected wavenumbers in cm^-1)")
    bad = np.flatnonzero(~np.isfinite(out))
    if bad.size:
        raise InputError(f"frequencies: item {int(bad[0])} is {out[bad[0]]} (expected finite wavenumbers in cm^-1)")
    return out


def _sequence_item(x, i: int) -> float:
    if isinstance(x, str):
        try:
            return _parse_wavenumber(x)
        except ValueError:
            raise InputError(f"frequencies: item {i} {x!r} is not a number (expected a wavenumber in cm^-1)") from None
    if isinstance(x, bool) or x is None:
        raise InputError(f"frequencies: item {i} {x!r} is not a number (expected a wavenumber in cm^-1)")
    if isinstance(x, complex) or np.iscomplexobj(x):
        return float(_complex_to_signed([x])[0])
    try:
        return float(x)
    except (TypeError, ValueError):
        raise InputError(f"frequencies: item {i} {x!r} is not a number (expected a wavenumber in cm^-1)") from None


def _guess_frequency_format(path: Path, head: str) -> str:
    stripped = head.lstrip()
    if stripped.startswith("{"):
        return "ase-json"
    if "OUTCAR" in path.name.upper() or "2PiTHz" in head:
        return "outcar"
    return "text"


def _read_text(path: Path, what: str) -> str:
    try:
        return path.read_text(encoding="utf-8", errors="replace")
    except OSError as exc:
        raise InputError(f"cannot read {what} '{path}': {_one_line(exc)}") from None


def read_frequencies(source, *, format=None) -> np.ndarray:
    """Vibrational wavenumbers in cm^-1 from numbers or a file; imaginary modes negative.

    Parameters
    ----------
    source : number, sequence of numbers, str or pathlib.Path
        - a sequence (list, tuple, 1-D array) of wavenumbers in cm^-1, or a single
          number for one mode (extxyz returns a scalar for ``freqs="2143.0"``). Complex values
          in ASE's convention (an imaginary mode is ``0 + x j``) become ``-x``; strings
          such as ``"120i"`` are accepted too;
        - a plain text file: numbers separated by whitespace and/or commas, ``#``
          starts a comment, an ``i`` suffix (``"120i"``) or a minus sign marks an
          imaginary mode;
        - an ASE vibration JSON file written by ``VibrationsData.write`` (all 3N modes
          of the vibrated atoms, as ASE computes them from the Hessian);
        - a VASP ``OUTCAR`` with a finite-difference / DFPT frequency block
          (``f =`` and ``f/i=`` lines; parsed by :func:`parse_outcar_modes`).
        A ``str`` is always taken as a path, never as a list of numbers.
    format : {"text", "ase-json", "outcar"}, optional
        File kind. By default a file starting with ``{`` is ASE JSON, a file whose name
        contains ``OUTCAR`` or whose text contains ``2PiTHz`` is an OUTCAR, anything else
        is plain text.

    Returns
    -------
    ndarray of float, shape (n_modes,)
        Wavenumbers in cm^-1 in the order of the source; imaginary modes are negative.

    Raises
    ------
    InputError
        Missing file, empty source, a token that is not a number (the message names the
        file and the line), non-finite values, unreadable JSON or OUTCAR.
    """
    if isinstance(source, (str, Path, bytes)):
        path = _existing_file(source, "frequency file")
        if format is not None and format not in FREQUENCY_FORMATS:
            raise InputError(f"read_frequencies('{path}'): format {format!r} unknown, expected one of {FREQUENCY_FORMATS}")
        text = _read_text(path, "frequency file")
        kind = format or _guess_frequency_format(path, text[:200_000])
        if kind == "text":
            return _frequencies_from_text(path, text)
        if kind == "outcar":
            return _outcar_from_text(path, text).frequencies_cm.copy()
        return _read_ase_vibration_json(path).frequencies_cm.copy()
    if format is not None:
        raise InputError(f"read_frequencies: format={format!r} only applies to files, got a {type(source).__name__}")
    if isinstance(source, (int, float, np.integer, np.floating)) and not isinstance(source, (bool, np.bool_)):
        # one number = one mode (extxyz gives a scalar for a single-valued freqs= entry)
        return _frequencies_from_sequence([source])
    if isinstance(source, np.ndarray) and source.ndim == 0:
        return _frequencies_from_sequence(source.reshape(1))
    if np.isscalar(source) or not hasattr(source, "__iter__"):
        raise InputError(
            f"frequencies: expected a sequence of wavenumbers in cm^-1 or a file path, got {type(source).__name__} {source!r}"
        )
    return _frequencies_from_sequence(source)


# --------------------------------------------------------------------------- vibration sets


@dataclass(frozen=True, eq=False)
class VibrationSet:
    """Normal modes of the vibrated atoms of one structure.

    Attributes
    ----------
    frequencies_cm : ndarray, shape (n_modes,)
        Wavenumbers in cm^-1, imaginary modes negative, in the order of the source
        (for ASE data: by eigenvalue, imaginary first).
    modes : ndarray, shape (n_modes, n_vibrated, 3)
        Cartesian displacement vectors (ASE's convention): the unit eigenvector of the
        mass-weighted Hessian divided by sqrt(mass / amu), so not normalised.
    indices : ndarray of int, shape (n_vibrated,)
        Indices of the vibrated atoms in ``atoms``.
    atoms : ase.Atoms or None
        The equilibrium structure (None when the source has no readable structure).
    masses_amu : ndarray, shape (n_vibrated,)
        Masses of the vibrated atoms used for the modes, in amu.
    source : str
        The file the data came from.
    """

    frequencies_cm: np.ndarray
    modes: np.ndarray
    indices: np.ndarray
    atoms: object = field(repr=False)
    masses_amu: np.ndarray = field(repr=False)
    source: str = ""

    def __post_init__(self):
        for name in ("frequencies_cm", "modes", "indices", "masses_amu"):
            arr = np.array(getattr(self, name))
            arr.setflags(write=False)
            object.__setattr__(self, name, arr)

    @property
    def n_modes(self) -> int:
        """Number of modes."""
        return int(self.frequencies_cm.shape[0])


def _read_ase_vibration_json(path: Path) -> VibrationSet:
    # ase.vibrations imports matplotlib: keep it out of module import time
    from ase.vibrations import VibrationsData

    try:
        data = VibrationsData.read(str(path))
    except AssertionError:
        raise InputError(
            f"vibration file '{path}': the JSON is not an ASE VibrationsData object "
            "(expected a file written by VibrationsData.write)"
        ) from None
    except Exception as exc:
        raise InputError(f"cannot read vibration file '{path}' (format 'ase-json'): {_one_line(exc)}") from exc
    try:
        energies_eV, modes = data.get_energies_and_modes()
        indices = np.asarray(data.get_indices(), dtype=int)
        atoms = data.get_atoms()
    except Exception as exc:
        raise InputError(f"vibration file '{path}': cannot diagonalise the stored Hessian ({_one_line(exc)})") from exc
    # ASE: frequency = energy / ase.units.invcm (ASE's CODATA 2014 set)
    freqs = _complex_to_signed(data.get_frequencies())
    if not np.all(np.isfinite(freqs)):
        raise InputError(f"vibration file '{path}': the Hessian gives non-finite frequencies")
    return VibrationSet(
        frequencies_cm=freqs,
        modes=np.asarray(modes, dtype=float),
        indices=indices,
        atoms=atoms,
        masses_amu=np.asarray(atoms.get_masses()[indices], dtype=float),
        source=str(path),
    )


# --------------------------------------------------------------------------- VASP OUTCAR

_NUM = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[EeDd][-+]?\d+)?"
_FREQ_LINE = re.compile(
    rf"^\s*(\d+)\s+(f/i|f)\s*=\s*({_NUM})\s*THz\s*({_NUM})\s*2PiTHz\s*({_NUM})\s*cm-1\s*({_NUM})\s*meV\s*$"
)
_VEC_HEADER = re.compile(r"^\s*X\s+Y\s+Z\s+dx\s+dy\s+dz\s*$")
_BLOCK_TITLE = "Eigenvectors and eigenvalues of the dynamical matrix"
_SQRT_TITLE = "Eigenvectors after division by SQRT(mass)"


@dataclass(frozen=True, eq=False)
class OutcarModes:
    """The last 'Eigenvectors and eigenvalues of the dynamical matrix' block of an OUTCAR.

    Attributes
    ----------
    frequencies_cm : ndarray, shape (n_modes,)
        Wavenumbers in cm^-1 as printed; ``f/i=`` modes negative.
    eigenvectors : ndarray, shape (n_modes, n_atoms, 3)
        The dx dy dz columns as printed: unit eigenvectors of the mass-weighted
        dynamical matrix (zero rows for atoms that were not displaced).
    positions : ndarray, shape (n_atoms, 3)
        The X Y Z columns (Å) of the first mode.
    masses_amu : ndarray of shape (n_atoms,) or None
        Per-atom masses from the 'Mass of Ions in am' POMASS line and 'ions per type',
        when both are present.
    """

    frequencies_cm: np.ndarray
    eigenvectors: np.ndarray
    positions: np.ndarray
    masses_amu: object = None

    def __post_init__(self):
        for name in ("frequencies_cm", "eigenvectors", "positions", "masses_amu"):
            value = getattr(self, name)
            if value is not None:
                arr = np.array(value, dtype=float)
                arr.setflags(write=False)
                object.__setattr__(self, name, arr)


def _parse_number(token: str) -> float:
    return float(token.replace("D", "E").replace("d", "e"))


def _outcar_masses(lines, n_atoms: int):
    counts = None
    type_masses = None
    for i, line in enumerate(lines):
        if "ions per type" in line and "=" in line:
            try:
                counts = [int(x) for x in line.split("=", 1)[1].split()]
            except ValueError:
                counts = None
        if "Mass of Ions in am" in line and i + 1 < len(lines):
            nxt = lines[i + 1]
            if "POMASS" in nxt and "=" in nxt:
                # F6.2 fields may touch each other ("12.01195.08"): split on the 2 decimals
                type_masses = [float(x) for x in re.findall(r"\d+\.\d\d", nxt.split("=", 1)[1])]
    if (counts is None or type_masses is None or len(counts) != len(type_masses) or sum(counts) != n_atoms
            or min(counts) < 0):
        return None
    return np.repeat(np.asarray(type_masses, dtype=float), counts)


def _outcar_from_text(path: Path, text: str) -> OutcarModes:
    lines = text.splitlines()
    # VASP (NWRITE=3) repeats the title after 'Eigenvectors after division by SQRT(mass)':
    # that second table holds other vectors and must not be taken for the eigenvectors
    starts = [
        i
        for i, line in enumerate(lines)
        if _BLOCK_TITLE in line and not any(_SQRT_TITLE in prev for prev in lines[max(0, i - 4) : i])
    ]
    if not starts:
        # some files (fragments, older versions) have only the frequency lines
        first_freq = next((i for i, line in enumerate(lines) if _FREQ_LINE.match(line)), None)
        if first_freq is None:
            raise InputError(
                f"OUTCAR '{path}': no frequency block (no line like '  1 f  = ... THz ... 2PiTHz ... cm-1 ... meV'); "
                "was it an IBRION=5-8 run?"
            )
    i = starts[-1] + 1 if starts else 0
    freqs, vectors, positions = [], [], None
    n = len(lines)
    while i < n:
        line = lines[i]
        match = _FREQ_LINE.match(line)
        if not match:
            if _SQRT_TITLE in line or _BLOCK_TITLE in line:
                break
            if freqs and line.strip():
                break  # the first other text after the modes ends the block
            i += 1
            continue
        label, kind = match.group(1), match.group(2)
        thz, cm = _parse_number(match.group(3)), _parse_number(match.group(5))
        # cross-check the cm-1 column against the THz column (guards against mis-parsed columns)
        cm_from_thz = thz * 1e12 / (constants.c * 100.0)
        if not math.isclose(cm, cm_from_thz, rel_tol=2e-4, abs_tol=2e-3):
            raise InputError(
                f"OUTCAR '{path}', line {i + 1}: mode {label} says {cm} cm-1 but {thz} THz = {cm_from_thz:.6f} cm-1; "
                "the frequency line is not in the expected VASP layout"
            )
        freqs.append(-abs(cm) if kind == "f/i" else cm)
        i += 1
        while i < n and not lines[i].strip():
            i += 1
        if i >= n or not _VEC_HEADER.match(lines[i]):
            raise InputError(
                f"OUTCAR '{path}', line {i + 1}: expected the 'X Y Z dx dy dz' header after mode {label}"
            )
        i += 1
        rows = []
        while i < n:
            parts = lines[i].split()
            if len(parts) != 6:
                break
            try:
                rows.append([_parse_number(p) for p in parts])
            except ValueError:
                raise InputError(
                    f"OUTCAR '{path}', line {i + 1}: {lines[i].strip()!r} is not six numbers (X Y Z dx dy dz)"
                ) from None
            i += 1
        if not rows:
            raise InputError(f"OUTCAR '{path}', line {i + 1}: mode {label} has no eigenvector rows")
        rows = np.asarray(rows, dtype=float)
        if vectors and rows.shape[0] != vectors[0].shape[0]:
            raise InputError(
                f"OUTCAR '{path}': mode {label} has {rows.shape[0]} atom rows, mode 1 had {vectors[0].shape[0]}"
            )
        if positions is None:
            positions = rows[:, :3]
        vectors.append(rows[:, 3:])
    if not freqs:
        raise InputError(f"OUTCAR '{path}': the dynamical-matrix block holds no frequency lines")
    eig = np.asarray(vectors, dtype=float)
    if not (np.all(np.isfinite(eig)) and np.all(np.isfinite(freqs)) and np.all(np.isfinite(positions))):
        raise InputError(f"OUTCAR '{path}': non-finite numbers in the frequency block")
    return OutcarModes(
        frequencies_cm=np.asarray(freqs, dtype=float),
        eigenvectors=eig,
        positions=np.asarray(positions, dtype=float),
        masses_amu=_outcar_masses(lines, eig.shape[1]),
    )


def parse_outcar_modes(path) -> OutcarModes:
    """Parse the frequency block of a VASP OUTCAR (our own parser; no ASE reader involved).

    The block is the last one headed 'Eigenvectors and eigenvalues of the dynamical
    matrix' (or, in a fragment without that title, the frequency lines themselves); the
    later 'Eigenvectors after division by SQRT(mass)' block is not read. Lines look like::

          1 f  =   63.912048 THz   401.573028 2PiTHz 2131.907006 cm-1   264.323437 meV
                     X         Y         Z           dx          dy          dz
              0.000000  0.000000  5.000000    -0.000000    0.000000   -0.717406

    and imaginary modes are printed ``f/i=``; they come back negative.

    Parameters
    ----------
    path : str or pathlib.Path
        The OUTCAR (any name).

    Returns
    -------
    OutcarModes

    Raises
    ------
    InputError
        Missing file, no frequency block, a broken block (the message names the line),
        or a cm-1 column inconsistent with the THz column.
    """
    path = _existing_file(path, "OUTCAR")
    return _outcar_from_text(path, _read_text(path, "OUTCAR"))


def _outcar_vibrations(path: Path, masses_amu) -> VibrationSet:
    parsed = _outcar_from_text(path, _read_text(path, "OUTCAR"))
    n_atoms = parsed.eigenvectors.shape[1]
    masses = parsed.masses_amu
    if masses_amu is not None:
        try:
            masses = np.asarray(masses_amu, dtype=float).reshape(-1)
        except (TypeError, ValueError):
            masses = np.full(0, np.nan)
        if masses.shape != (n_atoms,) or not np.all(np.isfinite(masses)) or np.any(masses <= 0):
            raise InputError(
                f"read_vibrations('{path}'): masses_amu must be {n_atoms} positive masses in amu, got {masses_amu!r}"
            )
    if masses is None:
        raise InputError(
            f"OUTCAR '{path}': no 'Mass of Ions in am' POMASS line with matching 'ions per type'; "
            "pass masses_amu= (one mass per atom, in amu) to turn the eigenvectors into displacements"
        )
    moving = np.flatnonzero(np.any(parsed.eigenvectors != 0.0, axis=(0, 2)))
    if np.any(masses[moving] <= 0):  # only the POMASS line can give these (masses_amu is checked above)
        raise InputError(f"OUTCAR '{path}': the POMASS line gives a displaced atom the mass {masses[moving].min():g} amu; "
                         "expected positive masses (or pass masses_amu=, one mass per atom in amu)")
    disp = parsed.eigenvectors[:, moving, :] / np.sqrt(masses[moving])[None, :, None]
    atoms = None
    try:
        import ase.io

        atoms = ase.io.read(str(path), index=0, format="vasp-out")
        if len(atoms) != n_atoms:
            atoms = None
    except Exception:  # a fragment or an OUTCAR without a readable header: modes still usable
        atoms = None
    return VibrationSet(
        frequencies_cm=parsed.frequencies_cm,
        modes=disp,
        indices=moving,
        atoms=atoms,
        masses_amu=masses[moving],
        source=str(path),
    )


def read_vibrations(path, *, format=None, masses_amu=None) -> VibrationSet:
    """Normal modes from an ASE vibration JSON file or a VASP OUTCAR.

    Parameters
    ----------
    path : str or pathlib.Path
        A file written by ``ase.vibrations.VibrationsData.write`` (or
        ``ase.io.jsonio.write_json`` of a VibrationsData), or a VASP OUTCAR.
    format : {"ase-json", "outcar"}, optional
        Guessed from the content when omitted (JSON starts with ``{``).
    masses_amu : sequence of float, optional
        OUTCAR only: one mass per atom in amu, overriding the POMASS line, used to
        turn VASP's mass-weighted eigenvectors into Cartesian displacements.

    Returns
    -------
    VibrationSet
        For ASE data: ASE's frequencies (converted with ASE's CODATA 2014 constants),
        modes from ``get_energies_and_modes()``, ``get_indices()`` and the atoms. All
        3N modes of the vibrated atoms are kept; rigid-body modes are not projected out.

    Raises
    ------
    InputError
        Missing or unreadable file, a JSON that is not a VibrationsData, an OUTCAR without
        frequency block or masses.
    """
    path = _existing_file(path, "vibration file")
    if format is not None and format not in ("ase-json", "outcar"):
        raise InputError(f"read_vibrations('{path}'): format {format!r} unknown, expected 'ase-json' or 'outcar'")
    if format is None:
        with open(path, "rb") as handle:
            head = handle.read(4096).decode("utf-8", errors="replace")
        kind = _guess_frequency_format(path, head)
        if kind == "text":
            if "THz" in head or "OUTCAR" in path.name.upper():
                kind = "outcar"
            else:
                raise InputError(
                    f"vibration file '{path}': neither an ASE vibration JSON nor a VASP OUTCAR "
                    "(a plain list of numbers has no modes: use read_frequencies)"
                )
    else:
        kind = format
    if kind == "ase-json":
        if masses_amu is not None:
            raise InputError(f"read_vibrations('{path}'): masses_amu only applies to OUTCAR files")
        return _read_ase_vibration_json(path)
    return _outcar_vibrations(path, masses_amu)


# --------------------------------------------------------------------------- ase.db

_SQLITE_MAGIC = b"SQLite format 3\x00"


class DbRecord:
    """One row of an ase.db database, read lazily.

    ``id``, ``energy`` (eV or None) and ``key_value_pairs`` are read with the row;
    ``data`` is decoded on first use and ``atoms`` (via ``row.toatoms()``, with the
    row's energy on a SinglePointCalculator and its constraints) is built on first use,
    so a batch that needs only energies and ``data`` never builds an ``ase.Atoms``.

    Attributes
    ----------
    id : int
        The row id in the database.
    energy : float or None
        The row's energy in eV, None when the row has none.
    key_value_pairs : dict
        The row's key-value pairs (a copy).
    source : str
        The database file.
    """

    __slots__ = ("id", "energy", "key_value_pairs", "source", "_row", "_data", "_atoms")

    def __init__(self, row, source: str):
        self.id = int(row.id)
        self.source = source
        energy = row.get("energy")
        if energy is not None:
            energy = float(energy)
            if not math.isfinite(energy):
                raise InputError(f"database '{source}', row id={self.id}: energy is {energy} (expected a finite number in eV)")
        self.energy = energy
        self.key_value_pairs = dict(row.key_value_pairs)
        self._row = row
        self._data = None
        self._atoms = None

    @property
    def data(self) -> dict:
        """The row's ``data`` dictionary (numpy arrays come back as arrays)."""
        if self._data is None:
            try:
                self._data = dict(self._row.data)
            except Exception as exc:
                raise InputError(f"database '{self.source}', row id={self.id}: cannot decode data ({_one_line(exc)})") from exc
        return self._data

    @property
    def atoms(self):
        """The row as an ``ase.Atoms`` (built on first use, then kept)."""
        if self._atoms is None:
            try:
                self._atoms = self._row.toatoms()
            except Exception as exc:
                raise InputError(f"database '{self.source}', row id={self.id}: cannot build atoms ({_one_line(exc)})") from exc
        return self._atoms

    def __repr__(self) -> str:
        return f"DbRecord(id={self.id}, energy={self.energy}, key_value_pairs={self.key_value_pairs})"


def _check_selection(path: Path, selection):
    if selection is None:
        return None, {}
    if isinstance(selection, str):
        return selection, {}
    if isinstance(selection, dict):
        for key, value in selection.items():
            if not isinstance(key, str) or not key.isidentifier():
                raise InputError(f"database '{path}': selection key {key!r} is not a valid ase.db key (an identifier)")
            if isinstance(value, (list, tuple, dict, set)) or value is None:
                raise InputError(
                    f"database '{path}': selection {key}={value!r} is not a str, int, float or bool"
                )
        return None, dict(selection)
    raise InputError(
        f"database '{path}': selection must be a dict of key-value pairs or an ase.db query string, got {type(selection).__name__}"
    )


def _check_ase_sqlite(path: Path) -> None:
    """Refuse an SQLite file without ase.db tables (ase.db would add its tables to it)."""
    import sqlite3

    try:
        con = sqlite3.connect(f"{path.resolve().as_uri()}?mode=ro", uri=True)
        try:
            found = con.execute("SELECT name FROM sqlite_master WHERE type='table' AND name='systems'").fetchall()
        finally:
            con.close()
    except sqlite3.Error as exc:
        raise InputError(f"database '{path}': cannot open as SQLite ({_one_line(exc)})") from None
    if not found:
        raise InputError(f"database '{path}': an SQLite file without ase.db tables (expected an ase.db database)")


def select_rows(path, selection=None, *, include_data=True, limit=None) -> list:
    """Rows of an existing ase.db database matching key-value pairs.

    One connection, one ``select`` iteration; nothing is converted to ``ase.Atoms``
    unless a record's ``atoms`` is used.

    Parameters
    ----------
    path : str or pathlib.Path
        An existing SQLite (``.db``) or JSON (``.json``) ase.db file. A missing path is an
        error (``ase.db.connect`` alone would silently create an empty database).
    selection : dict or str, optional
        Key-value pairs that must all match, e.g. ``{"role": "adsorbate", "site": "fcc"}``,
        or an ase.db query string such as ``"role=adsorbate,energy<-80"``. None selects
        every row.
    include_data : bool, optional
        Read the rows' ``data`` (default True). False is faster when only energies and
        key-value pairs are needed.
    limit : int, optional
        At most this many rows.

    Returns
    -------
    list of DbRecord
        In the database's order (by id); never empty.

    Raises
    ------
    InputError
        Missing, empty or non-database file, a bad selection, no matching row, or a row
        whose energy is not finite.
    """
    path = _existing_file(path, "database")
    query, pairs = _check_selection(path, selection)
    suffix = path.suffix.lower()
    if path.stat().st_size == 0:
        raise InputError(f"database '{path}': the file is empty (expected an ase.db database)")
    if suffix == ".db":
        with open(path, "rb") as handle:
            if handle.read(16) != _SQLITE_MAGIC:
                raise InputError(f"database '{path}': not an SQLite file (expected an ase.db database)")
        _check_ase_sqlite(path)
    elif suffix != ".json":
        raise InputError(f"database '{path}': unknown database type {suffix!r} (expected a .db or .json ase.db file)")
    if limit is not None and (isinstance(limit, bool) or not isinstance(limit, (int, np.integer)) or limit < 1):
        raise InputError(f"database '{path}': limit must be a positive integer, got {limit!r}")

    import ase.db

    shown = query if query is not None else (", ".join(f"{k}={v!r}" for k, v in pairs.items()) or "all rows")
    try:
        db = ase.db.connect(str(path), create_indices=False, use_lock_file=False)
        kwargs = {"include_data": bool(include_data)}
        if limit is not None:
            kwargs["limit"] = int(limit)
        with db:  # one SQLite connection for the whole selection (without it ase.db reconnects per row)
            records = [DbRecord(row, str(path)) for row in db.select(query, **kwargs, **pairs)]
    except InputError:
        raise
    except Exception as exc:
        raise InputError(f"cannot select rows ({shown}) from database '{path}': {_one_line(exc)}") from exc
    if not records:
        raise InputError(f"database '{path}': no row matches the selection ({shown})")
    return records
