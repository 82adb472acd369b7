"""Shared test configuration: Agg backend, figures closed after each test, hypothesis profile."""

import os
import sys

# One BLAS thread per process: the shared 2-core CI machines oversubscribe otherwise (a plane-wave
# test file took 86 s with default threads against 8 s with one). Must be set before numpy loads.
if "numpy" not in sys.modules:
    for _var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
        os.environ.setdefault(_var, "1")

import pytest  # noqa: E402

os.environ.setdefault("MPLBACKEND", "Agg")

try:
    from hypothesis import settings

    # shared, noisy CI machines: no per-example deadline, a moderate example count
    settings.register_profile("adsorb", deadline=None, max_examples=60)
    settings.load_profile("adsorb")
except ImportError:  # pragma: no cover - hypothesis is a test dependency
    pass


@pytest.fixture(autouse=True)
def _close_figures():
    yield
    import sys

    if "matplotlib.pyplot" in sys.modules:
        sys.modules["matplotlib.pyplot"].close("all")
