"""The exception family of adsorb.

The library raises; only the command line formats messages and chooses exit
codes. Every message names the offending file, key or value and says what was
expected, in one line.
"""

from __future__ import annotations


class AdsorbError(Exception):
    """Base class of every error raised on purpose by adsorb."""


class InputError(AdsorbError, ValueError):
    """A value, file or key supplied by the user is invalid."""


class ConvergenceError(AdsorbError, RuntimeError):
    """A numerical solve did not converge; the message names the point."""


class ModelWarning(UserWarning):
    """A model is used outside the range where it is known to be accurate."""
