"""The text interface of offgrid (Textual).

Only this package imports Textual; the engine never does.  Start with
:func:`offgrid.tui.launch.run` (the ``offgrid`` command) or
:func:`offgrid.tui.app.make_app` (tests, benchmarks).
"""
