"""Benchmarks of adsorb (not tests): run with ``python -m bench``."""
