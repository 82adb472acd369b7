"""Fuzzing the case-file loader and the frequency readers with hypothesis.

Property (issue: "the case-file loader and the frequency readers never raise anything but the
module's own errors on random text and random TOML"): every call of :func:`adsorb.case.load_case`,
:func:`adsorb.io.read_frequencies`, :func:`adsorb.io.read_vibrations` and
:func:`adsorb.io.parse_outcar_modes` either returns a valid result (a :class:`adsorb.case.Case`;
finite float arrays without NaN) or raises an :class:`adsorb.errors.AdsorbError` whose message is one
line (a :class:`adsorb.case.CaseError` holds one line per problem). Any other exception fails the
test, and so does any warning other than :class:`adsorb.errors.ModelWarning`.

Inputs: random text and bytes (invalid UTF-8 too) as case files and as frequency files of each
format; TOML documents generated from the case schema's vocabulary and written by the small TOML
writer below, so that they pass the TOML parser and reach the validation; mutations of the valid
demo cases; mutations of a valid plain-text list, ASE vibration JSON and VASP OUTCAR fragment.

Each target runs twice: a quick slice in the default suite (``QUICK`` examples per target) and a
long run behind the ``fuzz`` marker (``python -m pytest -q -m fuzz``; the counts in ``LONG`` add up
to at least 10,000 inputs). All numbers here are invented test inputs.
"""

from __future__ import annotations

import copy
import functools
import datetime as dt
import json
import math
import re
import resource
import shutil
import tomllib
import warnings
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from adsorb import case_schema
from adsorb import io as aio
from adsorb.case import CASE_MODELS, Case, CaseError, load_case
from adsorb.errors import AdsorbError, ModelWarning
from adsorb.standard_states import STANDARD_STATES

ROOT = Path(__file__).resolve().parents[1]

#: examples per target in the default suite (the whole file stays within a few seconds)
QUICK = 6
#: examples per target in the long run (pytest -m fuzz); the total is asserted below
LONG = {
    "case_bytes": 1500,
    "case_toml_generated": 2500,
    "case_toml_mutated": 2500,
    "frequency_bytes": 1000,
    "frequency_text_mutated": 800,
    "outcar_mutated": 1200,
    "vibration_json_mutated": 1000,
}
assert sum(LONG.values()) >= 10_000


# --------------------------------------------------------------------------- the property


def _assert_one_line_error(exc):
    """An AdsorbError with a one-line message (a CaseError: one line per problem, joined by newlines)."""
    if isinstance(exc, CaseError):
        assert exc.problems, "CaseError without problems"
        for problem in exc.problems:
            assert isinstance(problem, str) and problem.strip(), f"empty problem in {exc.problems!r}"
            assert len(problem.splitlines()) == 1, f"problem is not one line: {problem!r}"
        assert str(exc) == "\n".join(exc.problems)
    else:
        message = str(exc)
        assert message.strip(), f"{type(exc).__name__} without a message"
        assert len(message.splitlines()) == 1, f"{type(exc).__name__} message is not one line: {message!r}"


def _outcome(function, *args, **kwargs):
    """Call; return the result or the AdsorbError raised. Other exceptions propagate; stray warnings fail."""
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            result = function(*args, **kwargs)
        except AdsorbError as exc:
            result = exc
    stray = [f"{w.category.__name__}: {w.message}" for w in caught if not issubclass(w.category, ModelWarning)]
    assert not stray, f"{function.__name__} warned: {stray}"
    if isinstance(result, AdsorbError):
        _assert_one_line_error(result)
    return result


def _assert_wavenumbers(values):
    assert isinstance(values, np.ndarray) and values.dtype == float and values.ndim == 1 and values.size > 0
    assert np.all(np.isfinite(values)), values


def _check_frequency_readers(path):
    """Every reader, with the format guessed and forced, on one file."""
    for fmt in (None,) + aio.FREQUENCY_FORMATS:
        result = _outcome(aio.read_frequencies, path, format=fmt)
        if not isinstance(result, AdsorbError):
            _assert_wavenumbers(result)
    for fmt in (None, "ase-json", "outcar"):
        result = _outcome(aio.read_vibrations, path, format=fmt)
        if not isinstance(result, AdsorbError):
            _assert_wavenumbers(result.frequencies_cm)
            n_vib = result.indices.shape[0]
            assert result.modes.shape == (result.n_modes, n_vib, 3)
            assert np.all(np.isfinite(result.modes))
            assert np.all(np.isfinite(result.masses_amu)) and np.all(result.masses_amu > 0)
    result = _outcome(aio.parse_outcar_modes, path)
    if not isinstance(result, AdsorbError):
        _assert_wavenumbers(result.frequencies_cm)
        assert np.all(np.isfinite(result.eigenvectors)) and np.all(np.isfinite(result.positions))
        assert result.masses_amu is None or np.all(np.isfinite(result.masses_amu))


def _check_case(path):
    result = _outcome(load_case, path)
    if isinstance(result, AdsorbError):
        return
    assert isinstance(result, Case)
    temps = np.asarray(result.conditions.temperatures_K, dtype=float)
    assert temps.size and np.all(np.isfinite(temps)) and np.all(temps > 0)
    for spec in list(result.gases.values()) + list(result.adsorbates.values()):
        assert np.all(np.isfinite(np.asarray(spec.frequencies_cm, dtype=float)))
        if getattr(spec, "anchor", None) is None:
            assert math.isfinite(spec.energy_eV), spec
    assert all(math.isfinite(p) and p > 0 for p in result.conditions.pressures_Pa.values())


# --------------------------------------------------------------------------- a tiny TOML writer


def _toml_string(text):
    out = ['"']
    for ch in text:
        if ch == '"':
            out.append('\\"')
        elif ch == "\\":
            out.append("\\\\")
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04x}")
        else:
            out.append(ch)
    out.append('"')
    return "".join(out)


def _toml_value(v):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return _toml_string(v)
    if isinstance(v, (dt.datetime, dt.date, dt.time)):
        return v.isoformat()
    if isinstance(v, list):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_toml_string(k)} = {_toml_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(f"no TOML form for {type(v).__name__}")


def _is_table_array(v):
    return isinstance(v, list) and v and all(isinstance(x, dict) for x in v)


def _toml_body(table, prefix, lines):
    for k, v in table.items():
        if not isinstance(v, dict) and not _is_table_array(v):
            lines.append(f"{_toml_string(k)} = {_toml_value(v)}")
    for k, v in table.items():
        path = prefix + [_toml_string(k)]
        if isinstance(v, dict):
            lines.append(f"[{'.'.join(path)}]")
            _toml_body(v, path, lines)
        elif _is_table_array(v):
            for item in v:
                lines.append(f"[[{'.'.join(path)}]]")
                _toml_body(item, path, lines)


def to_toml(document):
    """A TOML document with header tables, arrays of tables and inline values; keys always quoted."""
    lines = []
    _toml_body(document, [], lines)
    return "\n".join(lines) + "\n"


def _same(a, b):
    """Equality with NaN equal to NaN."""
    if isinstance(a, float) and isinstance(b, float) and math.isnan(a) and math.isnan(b):
        return True
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b))
    return type(a) is type(b) and a == b


# --------------------------------------------------------------------------- schema vocabulary


def _expand_units(keys):
    out = []
    for k in keys:
        for marker in ("<p>", "<unit>"):
            if marker in k:
                out += [k.replace(marker, u) for u in case_schema.PRESSURE_UNITS]
                break
        else:
            out.append(k)
    return out


def _documented_keys():
    """Key names in backticks in docs/case-file.md (the reference of the schema)."""
    text = (ROOT / "docs" / "case-file.md").read_text(encoding="utf-8")
    return [k for k in re.findall(r"`([a-z][A-Za-z0-9_<>]*)`", text)]


KEYS = sorted(set(_expand_units(
    list(case_schema.CASE_KEYS) + list(case_schema.GAS_KEYS) + list(case_schema.SURFACE_KEYS)
    + list(case_schema.ADSORBATE_KEYS) + _documented_keys()
    + ["start", "stop", "step", "count", "spacing", "reactants", "products", "label", "species", "offset_eV"])))
SPECIES = ("CO", "CO*", "S", "H2", "N2", "NH3", "H*", "N*", "NH3*", "Mx(0001)", "*", "(H+ + e-)", "O2", "H2O")
CHOICES = sorted(set(
    [c for (_, _, kind) in case_schema.MODEL_PARAMETERS.values() if isinstance(kind, tuple) for c in kind]
    + list(CASE_MODELS) + ["surface-pes"] + list(case_schema.FUGACITIES) + list(STANDARD_STATES)
    + ["thermal", "electrochemical", "RHE", "SHE", "auto", "classical", "levels", "linear", "log",
       "on", "off", "both", "least_squares", "minimax", "text", "ase-json", "outcar",
       "xyz", "extxyz", "vasp", "traj", "CO", "NH3", "O2H", "Xx2", "co", ""]))
#: files a generated case may name (relative to the case file in the work folder)
FILES = ("structures/h2_gas.xyz", "structures/nh3_mx.xyz", "structures/mx0001_slab.xyz", "structures/n2_gas.xyz",
         "structures/nh3_mx_frequencies.txt", "structures/freq.txt", "structures/vib.json", "structures/OUTCAR",
         "structures", "missing.xyz", "../bad_cases/base_valid.toml")

_floats = st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.floats(0.01, 5000.0),
                    st.sampled_from([0.0, -0.0, 1.0, -1.0, 1e-300, 1e300, 5e-324]))
_ints = st.one_of(st.integers(-3, 100), st.integers(-(2**63), 2**63 - 1), st.integers(-(10**400), 10**400))
_strings = st.one_of(st.sampled_from(CHOICES), st.sampled_from(SPECIES), st.sampled_from(FILES), st.text(max_size=12))
_moments = st.one_of(st.datetimes(), st.datetimes(timezones=st.just(dt.timezone.utc)), st.dates(), st.times())
LEAF = st.one_of(st.booleans(), _ints, _floats, _strings, _moments)
_key = st.one_of(st.sampled_from(KEYS), st.sampled_from(SPECIES), st.text(max_size=6))
VALUE = st.recursive(LEAF, lambda inner: st.one_of(st.lists(inner, max_size=4),
                                                    st.dictionaries(_key, inner, max_size=4)), max_leaves=10)
_entry = st.dictionaries(st.one_of(st.sampled_from(KEYS), st.text(max_size=6)), VALUE, max_size=8)
_named = st.dictionaries(st.one_of(st.sampled_from(SPECIES), st.text(max_size=6)), _entry, max_size=3)
_NAMED_SECTIONS = ("gases", "surfaces", "adsorbates", "pathways")
_sections = {k: (_named if k in _NAMED_SECTIONS else _entry) for k in case_schema.CASE_KEYS}
GENERATED_CASE = st.builds(lambda sections, extra: {**sections, **extra}, st.fixed_dictionaries({}, optional=_sections),
                           st.dictionaries(st.text(max_size=6), VALUE, max_size=2))


# --------------------------------------------------------------------------- mutations of valid inputs


def _paths(node, prefix=()):
    """Every key path in a tree of dicts and lists (TOML or JSON), depth first."""
    out = []
    items = node.items() if isinstance(node, dict) else enumerate(node) if isinstance(node, list) else ()
    for k, v in items:
        out.append(prefix + (k,))
        out += _paths(v, prefix + (k,))
    return out


def _at(node, path):
    for k in path:
        node = node[k]
    return node


def _retyped(v):
    """The same content in another TOML type."""
    if isinstance(v, bool):
        return int(v)
    if isinstance(v, int):
        return float(v) if abs(v) < 2**53 else str(v)
    if isinstance(v, float):
        return str(v)
    if isinstance(v, str):
        return [v]
    if isinstance(v, list):
        return v[0] if v else {}
    if isinstance(v, dict):
        return list(v.values())
    return str(v)


def _is_number(v):
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _extreme(v, selector):
    """An edge value of the same numeric type as ``v``: zero, sign flip, overflow, underflow, NaN, ..."""
    if isinstance(v, int):
        return (0, -1, -v, 2**62, -(2**63), 10**6, 10**400)[selector % 7]
    return (0.0, -v, v * 1e300, v * 1e-300, math.nan, math.inf, -math.inf, 5e-324)[selector % 8]


def _mutate(document, ops):
    doc = copy.deepcopy(document)
    for op, selector, value, key in ops:
        paths = _paths(doc)
        if op == "extreme":  # among the numbers only
            paths = [p for p in paths if _is_number(_at(doc, p))]
        if not paths:
            doc[key] = value
            continue
        path = paths[selector % len(paths)]
        parent = doc
        for k in path[:-1]:
            parent = parent[k]
        last = path[-1]
        if op == "drop":
            del parent[last]
        elif op == "replace":
            parent[last] = value
        elif op == "extreme":
            parent[last] = _extreme(parent[last], selector // 13)
        elif op == "retype":
            parent[last] = _retyped(parent[last])
        elif op == "add":
            target = parent[last] if isinstance(parent[last], dict) else parent
            if isinstance(target, dict):
                target[key] = value
            else:
                target.append(value)
        else:  # "duplicate": a list item or table entry twice (under a new key)
            if isinstance(parent, list):
                parent.insert(last, copy.deepcopy(parent[last]))
            else:
                parent[key] = copy.deepcopy(parent[last])
    return doc


MUTATIONS = st.lists(st.tuples(st.sampled_from(("drop", "replace", "extreme", "retype", "add", "duplicate")),
                               st.integers(0, 10**6), VALUE, _key), min_size=1, max_size=4)
BASE_CASES = ("tests/bad_cases/base_valid.toml", "cases/ammonia_mx0001.toml", "cases/orr_fictitious_sites.toml")


def _line_edits(lines, edits):
    """Delete, duplicate, swap or replace lines, or replace one whitespace token of a line."""
    lines = list(lines)
    for op, selector, token in edits:
        if not lines:
            lines.append(token)
            continue
        i = selector % len(lines)
        if op == "delete":
            del lines[i]
        elif op == "duplicate":
            lines.insert(i, lines[i])
        elif op == "swap":
            j = (selector // 7) % len(lines)
            lines[i], lines[j] = lines[j], lines[i]
        elif op == "line":
            lines[i] = token
        else:  # "token"
            parts = re.split(r"(\s+)", lines[i])
            words = [k for k, p in enumerate(parts) if p and not p.isspace()]
            if words:
                parts[words[(selector // 3) % len(words)]] = token
                lines[i] = "".join(parts)
            else:
                lines[i] += token
    return lines


NUMBER_TOKENS = st.one_of(
    st.sampled_from(["nan", "NaN", "inf", "-inf", "1e400", "-1e400", "1e-400", "120i", "120 i", "i", "-", "+", ".", "e5",
                     "1e", "0x10", "1_000", "1,5", "**********", "1.0D+02", "1.0d-3", "١٢", "\ufeff12", "\x00", "#", "",
                     "f/i=", "f  =", "THz", "2PiTHz", "cm-1", "meV", "0", "-0", "1", "2", "-1", "3", "0.00", "-12.01"]),
    st.floats().map(repr), st.integers(-10, 10**6).map(str), st.text(max_size=6))
LINE_EDIT = st.tuples(st.sampled_from(("delete", "duplicate", "swap", "line", "token")), st.integers(0, 10**6),
                      NUMBER_TOKENS)
LINE_EDITS = st.lists(LINE_EDIT, min_size=1, max_size=6)


# valid plain-text list (invented wavenumbers)
VALID_TEXT = ["# invented wavenumbers in cm^-1", "2050.3, 420.1  350.2", "350.0 60.5", "55.1i   # imaginary", "-20.0"]


@functools.lru_cache(maxsize=1)
def _outcar_lines():
    """A VASP OUTCAR fragment: POMASS/ions-per-type lines and a two-atom frequency block (invented modes).

    Column conversions from CODATA via adsorb.constants: THz = c * 100 * cm^-1 / 1e12 (as the parser checks).
    """
    from adsorb import constants

    cm = [2105.0, 410.0, 352.0, 61.0, 28.0, 14.0]
    imag = [False, False, False, False, True, True]
    q, _ = np.linalg.qr(np.random.default_rng(3).normal(size=(6, 6)))
    pos = [[0.0, 0.0, 5.0], [0.0, 0.0, 6.143]]
    out = [" vasp.6.x (fragment written by the test)", "   ions per type =               1   1",
           "  Mass of Ions in am", "   POMASS =  12.01 16.00", "",
           " Eigenvectors and eigenvalues of the dynamical matrix", " " + "-" * 52, ""]
    for k in range(6):
        thz = cm[k] * constants.c * 100.0 / 1e12
        tag = "f/i=" if imag[k] else "f  ="
        out.append(f"{k + 1:4d} {tag}{thz:12.6f} THz {2 * math.pi * thz:12.6f} 2PiTHz{cm[k]:12.6f} cm-1 {4.136 * thz:12.6f} meV")
        out.append("             X         Y         Z           dx          dy          dz")
        for p, d in zip(pos, q[:, k].reshape(2, 3)):
            out.append(f"{p[0]:10.6f}{p[1]:10.6f}{p[2]:10.6f}  {d[0]:12.6f}{d[1]:12.6f}{d[2]:12.6f}")
        out.append("")
    out += [" Eigenvectors after division by SQRT(mass)", "", " ELASTIC MODULI CONTR FROM IONIC RELAXATION (kBar)"]
    return tuple(out)


@functools.lru_cache(maxsize=1)
def _vibration_json_text():
    """ASE VibrationsData JSON of CO with an invented positive-definite Hessian (eV/Å^2), as ASE writes it."""
    from ase import Atoms
    from ase.io.jsonio import encode
    from ase.vibrations import VibrationsData

    atoms = Atoms("CO", positions=[[0.0, 0.0, 0.0], [0.0, 0.0, 1.128]])
    hessian = np.diag([30.0, 25.0, 20.0, 35.0, 22.0, 40.0]) + 1.0
    return encode(VibrationsData.from_2d(atoms, hessian))


def _vibration_json():
    return json.loads(_vibration_json_text())


JSON_VALUE = st.recursive(
    st.one_of(st.none(), st.booleans(), st.integers(-5, 10), st.integers(), st.floats(), st.text(max_size=8),
              st.sampled_from(["float64", "int64", "bool", "complex128", "atoms", "vibrationsdata", "__ndarray__"])),
    lambda inner: st.one_of(st.lists(inner, max_size=4), st.dictionaries(st.text(max_size=8), inner, max_size=3)),
    max_leaves=8)
JSON_EDITS = st.lists(st.tuples(st.sampled_from(("drop", "replace", "scale")), st.integers(0, 10**6), JSON_VALUE,
                                st.sampled_from([0.0, -1.0, 1e300, 1e-300, float("nan"), float("inf"), 2.0])),
                      min_size=1, max_size=4)


def _edit_json(document, edits):
    doc = copy.deepcopy(document)
    for op, selector, value, factor in edits:
        paths = _paths(doc)
        if not paths:
            return value
        path = paths[selector % len(paths)]
        parent = doc
        for k in path[:-1]:
            parent = parent[k]
        last = path[-1]
        if op == "drop":
            del parent[last]
        elif op == "replace":
            parent[last] = value
        else:  # "scale" a number (bools and strings are left alone)
            v = parent[last]
            if isinstance(v, (int, float)) and not isinstance(v, bool):
                parent[last] = v * factor
    return doc


# --------------------------------------------------------------------------- the work folder


@pytest.fixture(scope="module")
def workdir(tmp_path_factory):
    """cases/ (demo cases and structures) and tests/bad_cases/base_valid.toml copied, with valid frequency files."""
    root = tmp_path_factory.mktemp("fuzz")
    shutil.copytree(ROOT / "cases", root / "cases", ignore=shutil.ignore_patterns("*.py"))
    (root / "bad_cases").mkdir()
    shutil.copy(ROOT / "tests" / "bad_cases" / "base_valid.toml", root / "bad_cases" / "base_valid.toml")
    structures = root / "cases" / "structures"
    (structures / "freq.txt").write_text("\n".join(VALID_TEXT) + "\n")
    (structures / "OUTCAR").write_text("\n".join(_outcar_lines()) + "\n")
    (structures / "vib.json").write_text(_vibration_json_text())
    return root


@pytest.fixture(scope="module", autouse=True)
def _memory_guard():
    """A runaway allocation becomes a MemoryError (a failure) rather than swapping the shared machine."""
    soft, hard = resource.getrlimit(resource.RLIMIT_AS)
    with open("/proc/self/statm") as handle:
        used = int(handle.read().split()[0]) * resource.getpagesize()
    limit = used + 6 * 2**30
    if hard != resource.RLIM_INFINITY:
        limit = min(limit, hard)
    resource.setrlimit(resource.RLIMIT_AS, (limit, hard))
    yield
    resource.setrlimit(resource.RLIMIT_AS, (soft, hard))


def test_valid_inputs_are_read(workdir):
    """The seeds of the mutations are valid: the fuzz starts from inputs that read without error."""
    structures = workdir / "cases" / "structures"
    # invented numbers of VALID_TEXT; 'i' suffix and minus sign both mark imaginary modes (docs/input-files.md)
    np.testing.assert_array_equal(aio.read_frequencies(structures / "freq.txt"),
                                  [2050.3, 420.1, 350.2, 350.0, 60.5, -55.1, -20.0])
    # the OUTCAR fragment prints f/i= for its last two modes: they come back negative (io module docstring)
    np.testing.assert_allclose(aio.read_frequencies(structures / "OUTCAR"), [2105.0, 410.0, 352.0, 61.0, -28.0, -14.0])
    assert aio.read_vibrations(structures / "OUTCAR").modes.shape == (6, 2, 3)
    assert aio.read_vibrations(structures / "vib.json").n_modes == 6
    for name in BASE_CASES:
        folder = workdir / ("bad_cases" if "bad_cases" in name else "cases")
        assert isinstance(load_case(folder / Path(name).name), Case)


@settings(max_examples=40)
@given(GENERATED_CASE)
def test_toml_writer_round_trips(document):
    """The writer's output parses back to the same document, so generated cases reach the validation."""
    assert _same(tomllib.loads(to_toml(document)), document)


# --------------------------------------------------------------------------- the targets, quick and long
# Each target is written twice, a quick slice (default suite) and the long run (marker 'fuzz'), as two
# functions of their own so that hypothesis keeps their databases apart.

_SUPPRESS = [HealthCheck.too_slow, HealthCheck.data_too_large]


def _run(count, strategy, examples, marks=()):
    def decorate(test):
        for value in examples:
            test = example(value=value)(test)
        test = settings(max_examples=count, deadline=None, suppress_health_check=_SUPPRESS)(given(value=strategy)(test))
        for mark in marks:
            test = mark(test)
        return test

    return decorate


def quick(strategy, examples=()):
    return _run(QUICK, strategy, examples)


def long_run(name, strategy, examples=()):
    return _run(LONG[name], strategy, examples, (pytest.mark.fuzz,))


def _write(path, content):
    if isinstance(content, bytes):
        path.write_bytes(content)
    else:
        path.write_text(content, encoding="utf-8")
    return path


def _case_path(workdir):
    return workdir / "cases" / "fuzz_case.toml"


TOML_SOUP = st.lists(st.sampled_from(list('[]{}="\'.,#\n =abc_01.5e-+*') + KEYS + list(SPECIES)),
                    max_size=60).map("".join)
CASE_BYTES = st.one_of(st.binary(max_size=300), st.text(max_size=300), TOML_SOUP)
CASE_BYTES_EXAMPLES = (
    "a = " + "9" * 5000,  # tomllib raised a plain ValueError (int of > 4300 digits), not a CaseError (adsorb/case.py)
)


def _check_case_bytes(workdir, content):
    _check_case(_write(_case_path(workdir), content))


@quick(CASE_BYTES, CASE_BYTES_EXAMPLES)
def test_case_bytes(workdir, value):
    _check_case_bytes(workdir, value)


@long_run("case_bytes", CASE_BYTES, CASE_BYTES_EXAMPLES)
def test_case_bytes_fuzz(workdir, value):
    _check_case_bytes(workdir, value)


GENERATED_EXAMPLES = (
    {"gases": {"CO": {"acentric_factor": 10**400}}},  # math.isfinite(10**400) raised OverflowError (case_schema._num)
    {"gases": {"CO": {"symbols": ["C"], "positions_A": [[10**400, 0, 0]]}}},  # the same in Reader.vectors
    {"study": {"title": "t", "\r": []}},  # a quoted key with a line break made a two-line problem (case_schema.Reader.problem)
)


def _check_case_document(workdir, document):
    _check_case(_write(_case_path(workdir), to_toml(document)))


@quick(GENERATED_CASE, GENERATED_EXAMPLES)
def test_case_toml_generated(workdir, value):
    _check_case_document(workdir, value)


@long_run("case_toml_generated", GENERATED_CASE, GENERATED_EXAMPLES)
def test_case_toml_generated_fuzz(workdir, value):
    _check_case_document(workdir, value)


MUTATED_CASE = st.tuples(st.sampled_from(BASE_CASES), MUTATIONS)
MUTATED_EXAMPLES = (
    # H2O position -0.7632 * 1e300 Å: numpy's eigh raised LinAlgError in the moments of inertia (geometry._check_atoms)
    ("cases/orr_fictitious_sites.toml", [("extreme", 865, [], "")]),
    # formula = "C<400 nines>O": the atom balance raised OverflowError (case_schema.formula_counts)
    ("tests/bad_cases/base_valid.toml", [("replace", 37, "C" + "9" * 400 + "O", "")]),
    # nasa temperature_range_K.stop = 2**62 K: numpy could not allocate the grid (case_schema.read_grid)
    ("cases/ammonia_mx0001.toml", [("extreme", 29979, [], "acentric_factor")]),
    # proton_electron_pairs = 10**400 overflowed the atom balance (case_links._check_balance): Reader.integer is 64-bit
    ("cases/orr_fictitious_sites.toml", [("replace", 24271, 10**400, "acentric_factor")]),
)


def _check_case_mutation(workdir, value):
    base, ops = value
    folder = workdir / ("bad_cases" if "bad_cases" in base else "cases")
    document = tomllib.loads((folder / Path(base).name).read_text(encoding="utf-8"))
    _check_case_document(workdir, _mutate(document, ops))


@quick(MUTATED_CASE, MUTATED_EXAMPLES)
def test_case_toml_mutated(workdir, value):
    _check_case_mutation(workdir, value)


@long_run("case_toml_mutated", MUTATED_CASE, MUTATED_EXAMPLES)
def test_case_toml_mutated_fuzz(workdir, value):
    _check_case_mutation(workdir, value)


FILE_NAMES = st.sampled_from(["freq.txt", "vib.json", "OUTCAR", "run.outcar", "x"])
_FREQUENCY_SOUP = st.lists(st.one_of(NUMBER_TOKENS, st.sampled_from([" ", ",", "\n", "\t", "{", "}", '"', ":"])),
                           max_size=40).map("".join)
FREQUENCY_BYTES = st.tuples(FILE_NAMES, st.one_of(st.binary(max_size=300), st.text(max_size=300), _FREQUENCY_SOUP))
FREQUENCY_BYTES_EXAMPLES = ()


def _check_frequency_bytes(workdir, value):
    name, content = value
    folder = workdir / "freq_fuzz"
    folder.mkdir(exist_ok=True)
    path = _write(folder / name, content)
    try:
        _check_frequency_readers(path)
    finally:
        path.unlink()


@quick(FREQUENCY_BYTES, FREQUENCY_BYTES_EXAMPLES)
def test_frequency_bytes(workdir, value):
    _check_frequency_bytes(workdir, value)


@long_run("frequency_bytes", FREQUENCY_BYTES, FREQUENCY_BYTES_EXAMPLES)
def test_frequency_bytes_fuzz(workdir, value):
    _check_frequency_bytes(workdir, value)


TEXT_EXAMPLES = ()


def _check_text_mutation(workdir, edits):
    _check_frequency_bytes(workdir, ("freq.txt", "\n".join(_line_edits(VALID_TEXT, edits)) + "\n"))


@quick(LINE_EDITS, TEXT_EXAMPLES)
def test_frequency_text_mutated(workdir, value):
    _check_text_mutation(workdir, value)


@long_run("frequency_text_mutated", LINE_EDITS, TEXT_EXAMPLES)
def test_frequency_text_mutated_fuzz(workdir, value):
    _check_text_mutation(workdir, value)


#: the 'ions per type' and POMASS lines rewritten (counts and masses per type), or kept (None)
OUTCAR_HEADER = st.none() | st.tuples(st.lists(st.integers(-2, 4), max_size=3),
                                      st.lists(st.sampled_from([0.0, 0.01, 1.0, 12.01, 16.0, 999.99]), max_size=3))
OUTCAR_MUTATION = st.tuples(OUTCAR_HEADER, st.lists(LINE_EDIT, max_size=6))
OUTCAR_EXAMPLES = (
    (None, [("token", 243018, "nan")]),  # a NaN position (X column) came back in OutcarModes.positions (adsorb/io.py)
    (([-1, 3], [12.01, 16.0]), []),  # np.repeat raised ValueError on a negative 'ions per type' (io._outcar_masses)
    (([1, 1], [0.0, 16.0]), []),  # a 0.00 POMASS mass: division by zero warning, infinite modes (io._outcar_vibrations)
)


def _check_outcar_mutation(workdir, value):
    header, edits = value
    lines = list(_outcar_lines())
    if header is not None:
        counts, masses = header
        lines[1] = "   ions per type =  " + "   ".join(str(n) for n in counts)
        lines[3] = "   POMASS = " + "".join(f"{m:6.2f}" for m in masses)  # F6.2 fields, as VASP prints them
    _check_frequency_bytes(workdir, ("OUTCAR", "\n".join(_line_edits(lines, edits)) + "\n"))


@quick(OUTCAR_MUTATION, OUTCAR_EXAMPLES)
def test_outcar_mutated(workdir, value):
    _check_outcar_mutation(workdir, value)


@long_run("outcar_mutated", OUTCAR_MUTATION, OUTCAR_EXAMPLES)
def test_outcar_mutated_fuzz(workdir, value):
    _check_outcar_mutation(workdir, value)


JSON_EXAMPLES = ()


def _check_json_mutation(workdir, edits):
    _check_frequency_bytes(workdir, ("vib.json", json.dumps(_edit_json(_vibration_json(), edits))))


@quick(JSON_EDITS, JSON_EXAMPLES)
def test_vibration_json_mutated(workdir, value):
    _check_json_mutation(workdir, value)


@long_run("vibration_json_mutated", JSON_EDITS, JSON_EXAMPLES)
def test_vibration_json_mutated_fuzz(workdir, value):
    _check_json_mutation(workdir, value)
