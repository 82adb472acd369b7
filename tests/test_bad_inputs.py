"""The broken-input corpus through the command line: exact one-line errors, exit 2, nothing written.

Every row of tests/bad_inputs/expected.tsv names a command line (a broken case file of
tests/bad_cases, or a broken frequency, structure or database file of tests/bad_inputs, given to
``adsorb run``, ``gas`` or ``batch``) and the exact line it must print on stderr. Each row runs through
:func:`adsorb.cli.main` in-process; three rows (one per kind of auxiliary file) also run in a real
``python -m adsorb`` process. The checks: exit status 2, stderr is exactly the expected line, nothing
on stdout, no traceback, no output folder or file, nothing new in the temporary folder, and every
file of the corpus byte-for-byte unchanged (SHA-256).
"""

import hashlib
import shlex
import subprocess
import sys
from pathlib import Path

import pytest

from adsorb.cli import main

HERE = Path(__file__).resolve().parent
CASES = HERE / "bad_cases"
INPUTS = HERE / "bad_inputs"
TABLE = INPUTS / "expected.tsv"
KINDS = ("case", "frequency", "structure", "database")


def _read_table():
    rows = []
    for line in TABLE.read_text(encoding="utf-8").splitlines():
        if not line.strip() or line.startswith("#"):
            continue
        fields = line.split("\t")
        assert len(fields) == 4, f"{TABLE}: expected 4 tab-separated fields, got {line!r}"
        if fields[0] != "name":          # the header
            rows.append(tuple(fields))
    return rows


ROWS = _read_table()


def _fill(text, out):
    return text.replace("{cases}", str(CASES)).replace("{inputs}", str(INPUTS)).replace("{out}", str(out))


def _corpus_hashes():
    """SHA-256 of every file of both corpus folders, by path relative to tests/."""
    return {str(p.relative_to(HERE)): hashlib.sha256(p.read_bytes()).hexdigest()
            for folder in (CASES, INPUTS) for p in sorted(folder.rglob("*")) if p.is_file()}


def _argv(command, out):
    return [_fill(word, out) for word in shlex.split(command)]


def test_table_covers_the_corpus():
    """At least 45 rows, every kind present (at least 6 rows per kind of auxiliary file), unique names and
    commands, a row for every bad case file, and every file of tests/bad_inputs used by some row."""
    names = [r[0] for r in ROWS]
    commands = [r[2] for r in ROWS]
    assert len(ROWS) >= 45
    assert len(set(names)) == len(names) and len(set(commands)) == len(commands)
    kinds = [r[1] for r in ROWS]
    assert set(kinds) == set(KINDS)
    assert all(kinds.count(k) >= 6 for k in KINDS[1:]), {k: kinds.count(k) for k in KINDS}
    case_rows = {Path(shlex.split(r[2])[1]).name for r in ROWS if r[1] == "case"}
    assert case_rows == {p.name for p in CASES.glob("bad_*.toml")}
    used = " ".join(commands) + " ".join(p.read_text() for p in INPUTS.glob("case_*.toml"))
    unused = [p.name for p in INPUTS.iterdir() if p != TABLE and p.name not in used]
    assert unused == []


@pytest.mark.parametrize("name, kind, command, expected", ROWS, ids=[r[0] for r in ROWS])
def test_row_exact_line_exit_two_nothing_written(name, kind, command, expected, tmp_path, monkeypatch, capsys):
    """Exit 2; stderr is exactly the expected line; no traceback; no output; corpus unchanged."""
    before = _corpus_hashes()
    monkeypatch.chdir(tmp_path)           # a stray relative write would land here and be seen below
    out = tmp_path / "out"
    code = main(_argv(command, out))
    captured = capsys.readouterr()
    assert "Traceback" not in captured.err
    assert captured.err.splitlines() == [_fill(expected, out)]
    assert code == 2
    assert captured.out == ""
    assert not out.exists()
    assert list(tmp_path.iterdir()) == []
    assert _corpus_hashes() == before


# one row per kind of auxiliary file, each through another subcommand (run, gas, batch)
PROCESS_ROWS = ("outcar_truncated", "struct_nan_position", "db_nan_frequency")


@pytest.mark.parametrize("row", PROCESS_ROWS)
def test_row_in_a_real_process(row, tmp_path):
    """``python -m adsorb`` in a subprocess: exit 2, the one expected line, no traceback, nothing written."""
    name, kind, command, expected = next(r for r in ROWS if r[0] == row)
    before = _corpus_hashes()
    out = tmp_path / "out"
    proc = subprocess.run([sys.executable, "-m", "adsorb", *_argv(command, out)], cwd=tmp_path,
                          capture_output=True, text=True, encoding="utf-8", timeout=120)
    assert "Traceback" not in proc.stderr
    assert proc.stderr.splitlines() == [_fill(expected, out)]
    assert proc.returncode == 2 and proc.stdout == ""
    assert list(tmp_path.iterdir()) == []
    assert _corpus_hashes() == before
