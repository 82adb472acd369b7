"""The ``adsorb`` command line: a thin layer over library calls.

Each subcommand lives in its own module under :mod:`adsorb.commands` and
provides ``add_arguments(parser)`` and ``run(args) -> int``. Modules are
imported only when their subcommand runs... except for ``add_arguments``,
which must therefore import nothing heavy at module level.

Errors from the library (:class:`adsorb.errors.AdsorbError`) become one line on
stderr and exit status 2; a traceback is shown only with ``--debug``.
"""

from __future__ import annotations

import argparse
import importlib
import sys
from collections.abc import Sequence

# subcommand name -> (module, one-line help)
SUBCOMMANDS = {
    "gas": ("adsorb.commands.gas", "thermochemistry table of a gas molecule from a structure and frequencies"),
    "compare-models": ("adsorb.commands.compare", "one adsorbate under every applicable model, with a recommendation"),
    "check": ("adsorb.commands.check", "validate a TOML case file and show what would be computed"),
    "run": ("adsorb.commands.run", "compute a case and write results.json, tables, plots and report.html"),
    "batch": ("adsorb.commands.batch", "adsorption free energies (and coverages) for many ase.db rows"),
}


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``adsorb`` command."""
    from adsorb import __version__

    parser = argparse.ArgumentParser(
        prog="adsorb",
        description="Surface adsorption and catalysis thermochemistry.",
    )
    parser.add_argument("--version", action="version", version=f"adsorb {__version__}")
    parser.add_argument("--debug", action="store_true", help="show a full traceback on errors")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name, (module, help_text) in SUBCOMMANDS.items():
        p = sub.add_parser(name, help=help_text, description=help_text)
        p.add_argument("--debug", action="store_true", default=argparse.SUPPRESS,
                       help="show a full traceback on errors")
        importlib.import_module(module).add_arguments(p)
        p.set_defaults(_module=module)
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line with ``argv`` (default: ``sys.argv[1:]``); return the exit code."""
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "command", None):
        parser.print_help()
        return 0
    from adsorb.errors import AdsorbError

    try:
        return int(importlib.import_module(args._module).run(args) or 0)
    except AdsorbError as exc:
        if args.debug:
            raise
        print(f"adsorb {args.command}: error: {exc}", file=sys.stderr)
        return 2


class Terminated(BaseException):
    """Raised in the main thread when the process receives SIGTERM or SIGHUP.

    A BaseException (like KeyboardInterrupt for SIGINT), so that the clean-up of
    temporary files and folders runs on the way out and no partial output is left.
    """


def _raise_terminated(signum, frame):
    raise Terminated(signum)


def entrypoint() -> None:
    """Console-script entry point: SIGTERM/SIGHUP/SIGINT unwind cleanly, exit 128 + signal number."""
    import signal

    for name in ("SIGTERM", "SIGHUP"):
        if hasattr(signal, name):
            signal.signal(getattr(signal, name), _raise_terminated)
    try:
        code = main()
    except Terminated as exc:
        print("adsorb: terminated by a signal; no output was written", file=sys.stderr)
        code = 128 + int(exc.args[0])
    except KeyboardInterrupt:
        print("adsorb: interrupted; no output was written", file=sys.stderr)
        code = 128 + int(signal.SIGINT)
    sys.exit(code)
