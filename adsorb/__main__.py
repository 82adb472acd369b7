"""``python -m adsorb`` runs the command line."""

from adsorb.cli import entrypoint

entrypoint()
