"""Shared test configuration: Agg backend, figures closed after each test, hypothesis profile."""

import os

import pytest

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
