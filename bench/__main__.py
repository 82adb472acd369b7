"""Entry point: ``python -m bench [--quick] [--only NAME ...] [--out DIR]``.

Runs every benchmark a few times, prints a table (median of repeats, the
baseline measured in the same run, their ratio, the target and whether it
holds) and writes the same as JSON, plus a log-log scaling plot. Benchmarks
never fail on speed: the exit code is 0 unless a benchmark crashes.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
NAMES = ("thermo", "coverage", "periodic1d", "periodic2d", "batch", "startup")


def _machine() -> dict:
    import numpy
    import scipy

    return {"python": sys.version.split()[0], "platform": platform.platform(), "processor": platform.machine(),
            "cpus": os.cpu_count(), "numpy": numpy.__version__, "scipy": scipy.__version__}


def _run(name, quick):
    if name == "thermo":
        from bench import thermo_throughput as m

        return [m.run(quick=quick)], ("species", m.scaling())
    if name == "coverage":
        from bench import coverage_map as m

        return [m.run(quick=quick)], ("grid points", m.scaling())
    if name == "periodic1d":
        from bench import periodic_solvers as m

        return [m.run_1d(quick=quick)], ("temperatures", m.scaling())
    if name == "periodic2d":
        from bench import periodic_solvers as m

        return [m.run_2d(quick=quick)], None
    if name == "batch":
        from bench import batch_db as m

        return [m.run(quick=quick)], ("rows", m.scaling())
    if name == "startup":
        from bench import startup as m

        demo = ROOT / "cases" / "ammonia_mx0001.toml"     # the README demo
        return m.run(quick=quick, demo_case=demo), None
    raise ValueError(name)


def _plot(scalings, path):
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, ax = plt.subplots(figsize=(6, 4.5))
    for label, (unit, pts) in scalings.items():
        x, y = zip(*pts)
        ax.loglog(x, y, "o-", label=f"{label} (vs {unit})")
    ax.set_xlabel("problem size (see legend)")
    ax.set_ylabel("median wall time / s")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize=8)
    fig.tight_layout()
    fig.savefig(path.with_suffix(".png"), dpi=120)
    fig.savefig(path.with_suffix(".svg"))
    plt.close(fig)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m bench", description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="smaller problem sizes (a quick look, not the targets)")
    parser.add_argument("--only", nargs="+", choices=NAMES, help="run only these benchmarks")
    parser.add_argument("--out", default=str(ROOT / "bench" / "results"), help="folder for JSON and plot")
    args = parser.parse_args(argv)
    sys.path.insert(0, str(ROOT))
    results, scalings = [], {}
    for name in args.only or NAMES:
        print(f"running {name} ...", file=sys.stderr, flush=True)
        rs, scale = _run(name, args.quick)
        results.extend(rs)
        if scale is not None:
            scalings[name] = scale
    width = max(len(r.name) for r in results)
    print(f"{'benchmark':<{width}}  {'ours/s':>10}  {'baseline/s':>10}  {'ratio':>8}  target -> met")
    for r in results:
        print(f"{r.name:<{width}}  {r.ours_s:10.4g}  {r.baseline_s:10.4g}  {r.ratio:8.3g}  "
              f"{r.target} -> {'yes' if r.target_met else 'NO'}")
        for k, v in r.extra.items():
            if not isinstance(v, (list, dict)):
                print(f"{'':<{width}}    {k} = {v:.4g}" if isinstance(v, float) else f"    {k} = {v}")
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    data = {"machine": _machine(), "quick": args.quick, "results": [r.as_dict() for r in results],
            "scaling": {k: {"unit": u, "points": p} for k, (u, p) in scalings.items()}}
    (out / "bench.json").write_text(json.dumps(data, indent=2, default=float) + "\n")
    if scalings:
        _plot(scalings, out / "scaling")
    print(f"wrote {out / 'bench.json'}", file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
