"""Atomic writing of output files: write to a temporary sibling, then rename.

An interrupted or failed write therefore never leaves a partial file behind.
Text, JSON, bytes and matplotlib figures (PNG + SVG) all go through here.
"""

from __future__ import annotations

import io
import json
import os
import secrets
from pathlib import Path


def _default_mode() -> int:
    """File mode an ordinary ``open`` would give (0o666 minus the umask); mkstemp files are private."""
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_bytes_atomic(path, data: bytes) -> Path:
    """Write ``data`` to ``path`` atomically and return the path."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    # named before it exists, so an interrupt anywhere after this line finds it in the clean-up
    tmp = str(path.parent / f".{path.name}.{secrets.token_hex(6)}")
    try:
        fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
        os.chmod(tmp, _default_mode())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    return path


def write_text_atomic(path, text: str) -> Path:
    """Write ``text`` (UTF-8) to ``path`` atomically and return the path."""
    return write_bytes_atomic(path, text.encode("utf-8"))


def write_json_atomic(path, data) -> Path:
    """Serialise ``data`` (plain Python values) as indented JSON, atomically."""
    return write_text_atomic(path, json.dumps(data, indent=2, allow_nan=False) + "\n")


def write_figure(figure, path, *, dpi: int = 150, tight: bool = False) -> tuple:
    """Write a matplotlib ``figure`` as ``<stem>.png`` and ``<stem>.svg``, each atomically.

    Parameters
    ----------
    figure : matplotlib.figure.Figure
    path : str or Path
        File stem; a ``.png`` or ``.svg`` suffix is replaced.
    dpi : int, optional
        Resolution of the PNG.
    tight : bool, optional
        Crop to the drawn content (matplotlib's ``bbox_inches="tight"``).

    Returns
    -------
    tuple of Path
        (png path, svg path).
    """
    stem = Path(path)
    if stem.suffix.lower() in (".png", ".svg"):
        stem = stem.with_suffix("")
    png, svg = stem.parent / (stem.name + ".png"), stem.parent / (stem.name + ".svg")
    extra = {"bbox_inches": "tight"} if tight else {}
    buffer = io.BytesIO()
    figure.savefig(buffer, format="png", dpi=dpi, **extra)
    write_bytes_atomic(png, buffer.getvalue())
    text = io.StringIO()
    figure.savefig(text, format="svg", **extra)
    write_text_atomic(svg, text.getvalue())
    return png, svg
