"""Regenerate the figures and tables of docs/entropy-benchmarks.md.

Usage (from anywhere)::

    /work/venv/bin/python docs/make_entropy_figures.py            # figures + tables on stdout
    /work/venv/bin/python docs/make_entropy_figures.py --tables out.md

Writes docs/figures/entropy_vs_campbell_sellers.{png,svg} and
docs/figures/alkane_prefactors.{png,svg}, and prints (or writes) the Markdown
tables that the page pastes. Every number comes from adsorb.entropy_benchmarks
with its default arguments; tests/test_entropy_benchmarks.py checks that the
tables in the page are the current ones.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from adsorb import entropy_benchmarks as eb
from adsorb.fileout import write_text_atomic

FIGURES = Path(__file__).resolve().parent / "figures"


def tables_text(correlation_rows, alkane_rows) -> str:
    """All tables of the page, each under a heading naming it."""
    parts = [
        ("A1. Invented sites (and the barrier-implied frequencies)", eb.markdown_site_table()),
        ("A2. S° per model at θ° = 1/2 (deviation in SD of the correlation)",
         eb.markdown_correlation_table(correlation_rows)),
        ("A3. 2d-gas S° at 300 K under each named standard state",
         eb.markdown_standard_state_table(eb.standard_state_sensitivity())),
        ("B1. n-alkanes on MgO(100): geometry, symmetry, invented barriers", eb.markdown_alkane_site_table(alkane_rows)),
        ("B2. log10 of the Arrhenius prefactor A(Tp) / s^-1", eb.markdown_alkane_table(alkane_rows)),
        ("B3. Peak temperature, TST prefactor and gamma", eb.markdown_peak_table(alkane_rows)),
        ("B4. Sensitivity of log10 A to the invented inputs",
         eb.markdown_sensitivity_table(eb.alkane_sensitivity())),
    ]
    return "\n\n".join(f"### {title}\n\n{table}" for title, table in parts) + "\n"


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--tables", type=Path, default=None, help="write the Markdown tables to this file")
    args = parser.parse_args(argv)
    correlation_rows = eb.correlation_benchmark()
    alkane_rows = eb.alkane_benchmark()
    eb.plot_correlation_benchmark(correlation_rows, FIGURES / "entropy_vs_campbell_sellers")
    eb.plot_alkane_prefactors(alkane_rows, FIGURES / "alkane_prefactors")
    text = tables_text(correlation_rows, alkane_rows)
    if args.tables is not None:
        write_text_atomic(args.tables, text)
    else:
        sys.stdout.write(text)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
