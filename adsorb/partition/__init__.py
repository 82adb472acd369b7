"""Partition-function building blocks, one module per kind of motion.

Each function is pure, vectorised over temperature and returns a
:class:`~adsorb.partition.contribution.Contribution`. This package imports
only numpy, scipy and :mod:`adsorb.constants`.
"""

from adsorb.partition.contribution import Contribution

__all__ = ["Contribution"]
