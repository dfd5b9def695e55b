"""Variants with the generator switched off and on: "solar only" beside "hybrid" (issue 16).

A variant's override ``generator = false`` (or ``"off"``) takes the project's
``[generator]`` away (the solar-only, worst-month design); ``generator = true`` (``"on"``)
keeps it and asks for the project to have one.  :func:`hybrid_rows` lines up, for every
column, the figures of the mix of sun, battery and fuel:

* a column with a generator: the hybrid study's own figures
  (:func:`offgrid.generator.study.generator_study`: the simulated array and battery, the
  cheapest point of the trade-off when the array and battery are priced, litres and run
  hours a year, solar fraction, unmet energy, and the lifecycle cost of the parts that
  change with the mix, :mod:`offgrid.economics.hybrid_mix`);
* a solar-only column: its worst-month array and battery, no fuel, a solar fraction of 1,
  and the same lifecycle cost formula (array and battery, no generator) with the battery
  life of its own lifecycle cost, so both columns count the same parts.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import Any

from offgrid.project.model import Project

SWITCH = "generator"  # the override path that switches the generator off or on
_ON = {True: True, False: False, "on": True, "off": False, "true": True, "false": False}


def switch_generator(project: Project, value: Any, where: str):
    """The project's generator after a ``generator = on/off`` override (None: off)."""
    key = value.strip().lower() if isinstance(value, str) else value
    if not isinstance(key, bool | str) or key not in _ON:
        raise ValueError(
            f'{where}: \'{value}\' must be true or false ("on" or "off"): switches the '
            "project's [generator] on or off"
        )
    if not _ON[key]:
        return None
    if project.generator is None:
        raise ValueError(
            f"{where}: the project has no [generator] table to switch on; add one to the "
            "project (see offgrid generator --help)"
        )
    return project.generator


def switch_text(value: Any) -> str:
    """How an override of the switch reads: 'on', 'off', or the value as typed."""
    key = value.strip().lower() if isinstance(value, str) else value
    if isinstance(key, bool | str) and key in _ON:
        return "on" if _ON[key] else "off"
    return str(value)


def shown_switch(project: Project | None) -> str | None:
    """The choices row of the switch: 'on' or 'off'."""
    if project is None:
        return None
    return "on" if project.generator is not None else "off"


def run_study(project: Project, base: Path | None):
    """The hybrid study of a column (the CLI's defaults: 20 years, seed 1)."""
    from offgrid.generator.study import generator_study

    return generator_study(project, base)


def study_like(project: Project, done) -> Callable[[Project, Path | None], Any]:
    """A study function for :func:`compare_variants` that reuses ``done`` (the study of
    ``project`` itself, e.g. the report's) and runs the others with its years and seed."""
    from offgrid.generator.study import generator_study

    def study(proj: Project, base: Path | None):
        if proj is project:
            return done
        return generator_study(proj, base, years=done.years, seed=done.seed)

    return study


def _solar_mix_lcc(col) -> float | None:
    """Lifecycle cost of the solar-only column's array and battery, the mix's formula."""
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import tradeoff_prices
    from offgrid.economics.hybrid_mix import _solar_costs

    proj, d = col.project, col.design
    prices = tradeoff_prices(proj, bill_of_materials(proj, d))
    if prices is None or col.cost is None:
        return None
    life = col.cost.battery_life_years
    return _solar_costs(proj, d.array.power_w, d.battery.nominal_kwh, life, prices)[1]


def _lcc(col, st) -> float | None:
    if st is None:
        return _solar_mix_lcc(col)
    if st.mix is None:
        return None
    if st.mix.cheapest is not None and st.chosen.startswith("the cheapest"):
        return st.mix.cheapest.lcc
    return None


#: Hybrid rows: label, unit, digits, getter from (column, study); study None: solar only.
#: A row named by a catalogue path (``hybrid.fuel_l_per_year``) takes its label, unit,
#: digits and scale from there (:func:`hybrid_row`); its getter gives the stored value.
#: "Mix: lifecycle cost" counts the parts that change with the mix (array, battery,
#: generator with its fuel), the trade-off's own formula, for every column.
HYBRID_ROWS: tuple[tuple[str, str, int, Callable[[Any, Any], Any]], ...] = (
    (
        "mix.points[].array_w",
        "",
        0,
        lambda c, s: c.design.array.power_w if s is None else s.run.array_w,
    ),
    (
        "mix.points[].battery_kwh",
        "",
        2,
        lambda c, s: c.design.battery.nominal_kwh if s is None else s.chosen_battery_kwh,
    ),
    ("hybrid.fuel_l_per_year", "", 0, lambda c, s: 0.0 if s is None else s.run.fuel_l_per_year),
    (
        "hybrid.run_hours_per_year",
        "",
        0,
        lambda c, s: 0.0 if s is None else s.run.run_hours_per_year,
    ),
    ("hybrid.starts_per_year", "", 0, lambda c, s: 0.0 if s is None else s.run.starts_per_year),
    (
        "mix.points[].solar_fraction",
        "",
        1,
        lambda c, s: 1.0 if s is None else s.run.solar_fraction,
    ),
    (
        "mix.points[].unmet_fraction",
        "",
        3,
        lambda c, s: None if s is None else s.run.unmet_fraction,
    ),
    ("mix.points[].lcc", "", 0, _lcc),
)


def hybrid_row(name: str, unit: str, digits: int, values: list[Any], currency: str = "") -> tuple:
    """(label, unit, digits, values) of one hybrid row: a catalogue path's row
    (``hybrid.`` the hourly run's, ``mix.`` the mix's) with its values scaled and its
    unit in ``currency``, else as given."""
    if not name.startswith(("hybrid.", "mix.")):
        return name, unit, digits, values
    from offgrid.catalogue import figure_entry

    e = figure_entry(name)
    shown = [None if v is None else e.shown(float(v)) for v in values]
    return e.label, e.unit_in(currency), e.digits, shown


def hybrid_values(columns, label_getter) -> list[Any]:
    return [
        None if c.design is None or c.hybrid_error else label_getter(c, c.hybrid) for c in columns
    ]
