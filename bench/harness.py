"""Timing and memory helpers shared by the benchmarks.

Every figure is a median over repeats, and every benchmark measures its own
baseline in the same run, so that results are reported as ratios (the
machines are shared and noisy).
"""

from __future__ import annotations

import statistics
import time
import tracemalloc
from dataclasses import asdict, dataclass, field


def median_time(func, repeats: int) -> float:
    """Median wall time in seconds of ``func()`` over ``repeats`` calls (after one warm-up)."""
    func()
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        func()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def peak_memory_mb(func) -> float:
    """Peak Python/numpy heap allocation in MB during one call of ``func()`` (tracemalloc)."""
    tracemalloc.start()
    try:
        func()
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    return peak / 1e6


@dataclass
class Result:
    """One benchmark line: ours vs the baseline measured in the same run."""

    name: str
    ours_s: float
    baseline_s: float
    baseline: str
    target: str
    target_met: bool
    ratio: float = field(init=False)
    extra: dict = field(default_factory=dict)

    def __post_init__(self):
        self.ratio = self.ours_s / self.baseline_s if self.baseline_s > 0 else float("inf")

    def as_dict(self) -> dict:
        return asdict(self)
