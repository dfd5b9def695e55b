"""Subcommands of the ``offgrid`` command line, one module each."""
