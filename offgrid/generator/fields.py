"""The project checks on the generator's inputs.

The inputs' labels, units, ranges, allowed words and hints are the catalogue's
``generator.`` rows (:mod:`offgrid.catalogue.generator`); :func:`generator_problems` checks
a project against them and the consistency rules.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from offgrid.catalogue import inputs_under
from offgrid.numbers import is_finite_number

if TYPE_CHECKING:
    from offgrid.project.model import Project

#: Lists checked together by :func:`offgrid.generator.fuel.check_fuel_points`.
LIST_PATHS = ("generator.fuel_load_pct", "generator.fuel_l_h")


def generator_problems(project: Project) -> list[tuple[str, str]]:
    """(path, message) for every problem of ``project.generator``; empty when none or valid."""
    from offgrid.generator.fuel import check_fuel_points

    g = project.generator
    if g is None:
        return []
    out: list[tuple[str, str]] = []
    for e in inputs_under("generator."):
        path = e.path
        if path in LIST_PATHS:
            continue
        value = getattr(g, path.removeprefix("generator."))  # the path names the field
        if e.values:
            if value not in e.values:
                out.append((path, f"'{value}' must be one of {', '.join(e.values)}"))
            continue
        if e.low is None or e.high is None or value is None:
            continue
        if not is_finite_number(value):
            out.append((path, f"'{value}' is not a finite number; {e.hint}"))
        elif not e.low <= value <= e.high:
            out.append((path, f"{value:g} is out of range; {e.hint}"))
    out.extend(check_fuel_points(g.fuel_load_pct, g.fuel_l_h))
    if g.dispatch == "cycle_charging" and g.start_soc >= g.stop_soc:
        out.append(
            (
                "generator.start_soc",
                f"{g.start_soc:g} is not below stop_soc {g.stop_soc:g}: the generator starts "
                "at the lower state of charge and stops at the higher; swap them",
            )
        )
    if (g.quiet_from_h is None) != (g.quiet_to_h is None):
        out.append(
            (
                "generator.quiet_to_h",
                "give both quiet_from_h and quiet_to_h, or leave both out",
            )
        )
    elif g.quiet_from_h is not None and g.quiet_from_h == g.quiet_to_h:
        out.append(
            (
                "generator.quiet_to_h",
                "quiet hours that start and end at the same hour are "
                "empty; leave both out or give an end hour",
            )
        )
    return out


def quiet_mask(quiet_from_h: int | None, quiet_to_h: int | None) -> tuple[bool, ...]:
    """24 flags, True in the solar hours when the generator may not run."""
    if quiet_from_h is None or quiet_to_h is None:
        return (False,) * 24
    a, b = int(quiet_from_h), int(quiet_to_h)
    return tuple((a <= h < b) if a < b else (h >= a or h < b) for h in range(24))
