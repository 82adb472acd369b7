"""Benchmark 5: start-up of the command line.

``adsorb --help`` and ``adsorb check`` on a demo case, against ``python -c
pass``. Target: under 0.3 s above the baseline (heavy modules such as
matplotlib are imported lazily).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

from bench.harness import Result, median_time

ROOT = Path(__file__).resolve().parents[1]


def _cmd(args):
    return lambda: subprocess.run([sys.executable, *args], check=False, capture_output=True, cwd=ROOT)


def run(quick=False, repeats=5, demo_case=None):
    base = median_time(_cmd(["-c", "pass"]), repeats)
    results = []
    t_help = median_time(_cmd(["-m", "adsorb", "--help"]), repeats)
    results.append(Result(name="start-up: adsorb --help", ours_s=t_help, baseline_s=base,
                          baseline="python -c pass", target="< 0.3 s above baseline",
                          target_met=t_help - base < 0.3))
    results[-1].extra["seconds_above_baseline"] = t_help - base
    if demo_case is not None:
        if not Path(demo_case).is_file():
            raise FileNotFoundError(f"bench startup: demo case {demo_case} not found")
        t_check = median_time(_cmd(["-m", "adsorb", "check", str(demo_case)]), repeats)
        results.append(Result(name=f"start-up: adsorb check {Path(demo_case).relative_to(ROOT)}", ours_s=t_check,
                              baseline_s=base, baseline="python -c pass", target="< 0.3 s above baseline",
                              target_met=t_check - base < 0.3))
        results[-1].extra["seconds_above_baseline"] = t_check - base
    return results
