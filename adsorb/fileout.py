"""Atomic writing of output files: write to a temporary sibling, then rename.

An interrupted or failed write therefore never leaves a partial file behind.
"""

from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path


def _default_mode() -> int:
    """File mode an ordinary ``open`` would give (0o666 minus the umask); mkstemp files are private."""
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_text_atomic(path, text: str) -> Path:
    """Write ``text`` to ``path`` atomically and return the path."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as handle:
            handle.write(text)
        os.chmod(tmp, _default_mode())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return path


def write_json_atomic(path, data) -> Path:
    """Serialise ``data`` (plain Python values) as indented JSON, atomically."""
    return write_text_atomic(path, json.dumps(data, indent=2, allow_nan=False) + "\n")
