"""``adsorb batch DB --out FILE.csv``: adsorption free energies (and coverages) for many ase.db rows.

Example::

    adsorb batch screening.db --select site=fcc --t-min 300 --t-max 800 --t-step 100 --out dG.csv
    adsorb batch screening.db --temperatures "500 600" --pressure-bar 1 --out dG.csv --quiet

Rows and their key-value pairs: see :mod:`adsorb.batch` and docs/user-guide.md
(role=gas / slab / adsorbate, surface=, gas=, dissociative=, data['frequencies']).
A progress bar (tqdm) is shown on stderr when it is a terminal, unless ``--quiet``.
"""

from __future__ import annotations

import argparse
import sys


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """Options of ``adsorb batch`` (nothing heavy imported here)."""
    parser.add_argument("database", help="ase.db file (.db SQLite or .json)")
    parser.add_argument("--out", required=True, metavar="FILE.csv", help="CSV file to write (one line per row)")
    parser.add_argument("--select", action="append", default=[], metavar="KEY=VALUE",
                        help="key-value pair the adsorbate rows must match (repeatable)")
    parser.add_argument("--temperatures", default=None, metavar='"T1 T2 ..."', help="temperatures in K")
    parser.add_argument("--t-min", type=float, default=298.15, help="lowest temperature in K (default 298.15)")
    parser.add_argument("--t-max", type=float, default=None, help="highest temperature in K (default: t-min)")
    parser.add_argument("--t-step", type=float, default=100.0, help="temperature step in K (default 100)")
    parser.add_argument("--pressure-bar", type=float, default=None,
                        help="gas pressure in bar: adds the Langmuir coverage of each adsorbate alone")
    parser.add_argument("--frequencies-key", default="frequencies", help="data key of the wavenumbers (cm^-1)")
    parser.add_argument("--quiet", action="store_true", help="no progress bar")
    parser.add_argument("--force", action="store_true", help="overwrite an existing output file")


def _value(text):
    for kind in (int, float):
        try:
            return kind(text)
        except ValueError:
            pass
    return {"true": True, "false": False}.get(text.lower(), text)


def run(args) -> int:
    from pathlib import Path

    import numpy as np

    from adsorb.errors import InputError

    selection = {}
    for item in args.select:
        key, sep, value = item.partition("=")
        if not sep or not key:
            raise InputError(f"--select {item!r}: expected KEY=VALUE")
        selection[key] = _value(value)
    if args.temperatures is not None:
        try:
            temps = [float(x) for x in args.temperatures.replace(",", " ").split()]
        except ValueError:
            raise InputError(f"--temperatures {args.temperatures!r}: expected numbers in K") from None
    else:
        t_max = args.t_max if args.t_max is not None else args.t_min
        if t_max < args.t_min or args.t_step <= 0:
            raise InputError(f"--t-min/--t-max/--t-step: expected t-min <= t-max and t-step > 0, got "
                             f"{args.t_min}, {t_max}, {args.t_step}")
        temps = np.arange(args.t_min, t_max + 0.5 * args.t_step, args.t_step)
    out = Path(args.out)
    if out.exists() and not args.force:
        raise InputError(f"--out {out}: the file exists; use --force to overwrite it")

    from adsorb.batch import screen_database, write_batch_csv

    bar = None
    if not args.quiet and sys.stderr.isatty():
        from tqdm import tqdm

        bar = tqdm(desc="rows", unit="row", file=sys.stderr)
    try:
        result = screen_database(args.database, selection, temps,
                                 pressure_Pa=None if args.pressure_bar is None else args.pressure_bar * 1e5,
                                 frequencies_key=args.frequencies_key, progress=bar.update if bar else None)
    finally:
        if bar is not None:
            bar.close()
    write_batch_csv(result, out)
    print(f"wrote {out}: {result.row_id.size} rows at {result.temperature_K.size} temperatures")
    return 0
