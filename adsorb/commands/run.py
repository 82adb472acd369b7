"""``adsorb run CASE.toml --out DIR``: compute a study and write its results folder.

DIR receives results.json, CSV tables, PNG + SVG plots and report.html
(docs/report.md). Everything is written into a temporary folder next to DIR
and renamed at the end, so a failed or interrupted run leaves nothing behind
(no DIR when it did not exist). A non-empty DIR is refused unless ``--force``
(then it is replaced as a whole). Bad input: exit 2 with one line per problem.
"""

from __future__ import annotations

import argparse
import os
import secrets
import shutil
import sys
import tempfile
from pathlib import Path


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """Options of ``adsorb run`` (nothing heavy imported here)."""
    parser.add_argument("case", help="TOML case file (see docs/case-file.md)")
    parser.add_argument("--out", required=True, metavar="DIR", help="results folder to create")
    parser.add_argument("--force", action="store_true", help="replace DIR when it exists and is not empty")


def _readable(folder: Path) -> None:
    """Give the written files the permissions the user's umask allows (temporary files are private)."""
    umask = os.umask(0)
    os.umask(umask)
    for path in [folder, *folder.iterdir()]:
        os.chmod(path, (0o777 if path.is_dir() else 0o666) & ~umask)


def _remove_stale_partials(parent: Path, name: str) -> None:
    """Remove ``.NAME.partial-PID-*`` folders of earlier runs whose process no longer exists.

    A run killed outright (SIGKILL, power loss) cannot clean up; its hidden temporary
    folder is removed by the next run into the same DIR. Folders of live processes stay.
    """
    prefix = f".{name}.partial-"
    for folder in parent.glob(f"{prefix}*"):
        pid = folder.name[len(prefix):].split("-", 1)[0]
        if not pid.isdigit() or int(pid) == os.getpid():
            continue
        try:
            os.kill(int(pid), 0)
        except ProcessLookupError:
            shutil.rmtree(folder, ignore_errors=True)
        except PermissionError:       # alive, another user's
            pass


def run(args) -> int:
    from adsorb.errors import InputError

    out = Path(args.out)
    if out.exists() and not out.is_dir():
        raise InputError(f"--out {out}: exists and is not a folder; expected a folder name")
    if out.is_dir() and any(out.iterdir()) and not args.force:
        raise InputError(f"--out {out}: the folder is not empty; use --force to replace it")

    from adsorb.case import CaseError, load_case

    try:
        case = load_case(args.case)
    except CaseError as exc:
        for line in exc.problems:
            print(f"adsorb run: error: {line}", file=sys.stderr)
        return 2
    from adsorb.report import write_results
    from adsorb.study import run_study

    parent = out.resolve().parent
    created = [p for p in [parent, *parent.parents] if not p.exists()]
    parent.mkdir(parents=True, exist_ok=True)
    _remove_stale_partials(parent, out.name)
    # the name is known before the folder exists, so an interrupt at any point after this line
    # finds it in the clean-up below (tempfile.mkdtemp leaves a window between mkdir and return)
    tmp = parent / f".{out.name}.partial-{os.getpid()}-{secrets.token_hex(4)}"
    try:
        tmp.mkdir(mode=0o700)
        doc = write_results(run_study(case), tmp)
        _readable(tmp)
        if out.exists():
            old = Path(tempfile.mkdtemp(prefix=f".{out.name}.old-", dir=parent))
            os.replace(out, old / "x")
            os.replace(tmp, out)
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.replace(tmp, out)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        for p in created:            # innermost first: folders this run made for DIR
            try:
                p.rmdir()
            except OSError:
                break
        raise
    print(f"wrote {out}/report.html, results.json, {len(doc['files']['tables'])} tables, "
          f"{len(doc['files']['plots'])} plots")
    for w in doc["warnings"]:
        print(f"warning: {w}", file=sys.stderr)
    return 0
