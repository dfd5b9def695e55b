"""The design steps: loads, sun on the array, battery, strings, cables and protection.

``sizing.design`` runs them in order on a :class:`~offgrid.project.model.Project` and
returns a :class:`~offgrid.design.result.SystemDesign`; nothing here imports a view.
"""
