"""One module per subcommand of the ``adsorb`` command line (see :mod:`adsorb.cli`)."""
