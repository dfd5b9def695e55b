"""offgrid: stand-alone solar power systems sized from a load list and a site climate.

The packages follow the pipeline: ``project`` (the saved document) and ``catalogue``
(every input and figure: label, unit, range) -> ``climate`` -> ``design`` (the sizing
steps) -> ``simulate`` (synthetic weather, reliability) -> ``water`` and ``generator``
(engines beside the design) -> ``plan`` (communities, programmes) -> ``economics`` and
``stock`` (bill of materials, costs, the parts catalogue) -> ``report`` -> the views
(``cli``/``commands``, ``tui``).  Nothing before the views imports Textual or Rich.
"""
