"""One catalogue of the project's inputs and the design's figures (engine, no UI).

For any input (``choices.autonomy_days``) or figure (``battery.capacity_ah``) this is the
one place that holds its label, unit, range, hint and the reason that explains it;
validation, the text UI's field tables and figure rows, the report and the text summary
read it by path.  A new input or figure is added in one place: a row in
:mod:`offgrid.catalogue.inputs` (the core tables), :mod:`~offgrid.catalogue.water`
(``[[water]]``), :mod:`~offgrid.catalogue.generator` (``[generator]``),
:mod:`~offgrid.catalogue.stock` (``[stock]``), :mod:`offgrid.catalogue.figures` (the
design) or :mod:`~offgrid.catalogue.outcomes` (simulation and lifecycle cost).

Rows whose label carries figures (``Upkeep {upkeep} x PWF {pwf}``), tables of figures
(the monthly reliability table) and the headings of figure groups are entries of
:mod:`~offgrid.catalogue.composites`: :func:`composite`, :func:`table_entry`,
``FIGURE_GROUPS``.

API: :class:`InputEntry`, :class:`FigureEntry`, :class:`CompositeEntry`,
:class:`TableEntry`; :func:`input_entry` and
:func:`figure_entry` (by path, ``KeyError`` naming the path when it is not catalogued),
:func:`find_input` and :func:`find_figure` (``None`` instead); :func:`inputs_under` (the
rows of one table); ``INPUTS``, ``FIGURES`` (with ``RELIABILITY_FIGURES`` and
``COST_FIGURES``), :func:`key_figures`, ``RUN_LENGTH_M``.
"""

from __future__ import annotations

import re

from offgrid.catalogue.composites import (
    COMPOSITES,
    COMPOSITES_BY_ID,
    EACH_RUN_LABEL,
    FIGURE_GROUPS,
    ROW_GROUPS,
    TABLES,
    TABLES_BY_ID,
)
from offgrid.catalogue.entries import (
    FIGURE_LABEL_ROOM,
    INPUT_LABEL_ROOM,
    CompositeEntry,
    FigureEntry,
    InputEntry,
    TableEntry,
)
from offgrid.catalogue.figures import FIGURES as DESIGN_FIGURES
from offgrid.catalogue.generator import GENERATOR_FIGURES, GENERATOR_INPUTS
from offgrid.catalogue.inputs import INPUTS as PROJECT_INPUTS
from offgrid.catalogue.inputs import RUN_LENGTH_M
from offgrid.catalogue.outcomes import (
    COST_FIGURES,
    GENERATOR_COST_FIGURES,
    HYBRID_FIGURES,
    MIX_FIGURES,
    MONTH_FIGURES,
    RELIABILITY_FIGURES,
    TRADEOFF_FIGURES,
)
from offgrid.catalogue.stock import STOCK_INPUTS
from offgrid.catalogue.water import WATER_FIGURES, WATER_INPUTS

__all__ = [
    "COMPOSITES",
    "COST_FIGURES",
    "EACH_RUN_LABEL",
    "FIGURES",
    "FIGURE_GROUPS",
    "FIGURE_LABEL_ROOM",
    "GENERATOR_COST_FIGURES",
    "HYBRID_FIGURES",
    "INPUTS",
    "INPUT_LABEL_ROOM",
    "OWN_CHECKS",
    "RELIABILITY_FIGURES",
    "ROW_GROUPS",
    "RUN_LENGTH_M",
    "TABLES",
    "CompositeEntry",
    "FigureEntry",
    "InputEntry",
    "TableEntry",
    "composite",
    "figure_entry",
    "fill",
    "find_figure",
    "find_input",
    "input_entry",
    "inputs_under",
    "key_figures",
    "table_entry",
]

_INDEX = re.compile(r"\[\d+\]")

#: Every input: the core tables, then ``[[water]]``, ``[generator]`` and ``[stock]``.
INPUTS: tuple[InputEntry, ...] = (
    *PROJECT_INPUTS,
    *WATER_INPUTS,
    *GENERATOR_INPUTS,
    *STOCK_INPUTS,
)
#: Every figure: the design's, each water supply's (``water[].``), the generator's, the
#: simulation's (``reliability.``), the hourly run with the generator's (``hybrid.``) and
#: the lifecycle cost's (``costs.``) and the generator's own costs (``generator_costs.``).
FIGURES: tuple[FigureEntry, ...] = (
    *DESIGN_FIGURES,
    *WATER_FIGURES,
    *GENERATOR_FIGURES,
    *RELIABILITY_FIGURES,
    *MONTH_FIGURES,
    *TRADEOFF_FIGURES,
    *HYBRID_FIGURES,
    *MIX_FIGURES,
    *COST_FIGURES,
    *GENERATOR_COST_FIGURES,
)
#: Tables whose rows their own checks read (a table a project may leave out, or one row
#: per item): ``validate_project``'s loop over the core inputs leaves them to those.
OWN_CHECKS: tuple[str, ...] = ("loads[].", "water[].", "generator.", "stock.")

#: Lookup tables (views read entries through the functions below, at the time they
#: render, so a test can swap an entry here and see it in every view).
INPUTS_BY_PATH: dict[str, InputEntry] = {e.path: e for e in INPUTS}
FIGURES_BY_PATH: dict[str, FigureEntry] = {}
for _e in FIGURES:
    FIGURES_BY_PATH[_e.path] = _e
for _e in FIGURES:  # also by reason key (strings.max_series), never over a JSON path
    FIGURES_BY_PATH.setdefault(_e.reason_key, _e)
del _e


def find_input(path: str) -> InputEntry | None:
    """The input at ``path`` (``loads[3].run_m`` is the row ``loads[].run_m``), or None."""
    return INPUTS_BY_PATH.get(path) or INPUTS_BY_PATH.get(_INDEX.sub("[]", path))


def inputs_under(prefix: str) -> tuple[InputEntry, ...]:
    """The rows whose path starts with ``prefix`` (``"water[]."``), in catalogue order, as
    they are now (read at each call, so a swapped entry is seen)."""
    return tuple(e for e in INPUTS_BY_PATH.values() if e.path.startswith(prefix))


def input_entry(path: str) -> InputEntry:
    entry = find_input(path)
    if entry is None:
        raise KeyError(f"{path}: not an input of the catalogue (offgrid/catalogue/)")
    return entry


_WIRE = re.compile(r"^wires(?:\[\d*\]|\.[^.]+)\.([a-z_]+)$")


def find_figure(path: str) -> FigureEntry | None:
    """The figure at a JSON path or a reason key, or None; a cable's figure by its index
    (``wires[2].size``) or its run's key (``wires.charge.size``) is the row ``wires[].size``,
    a water supply's (``water[1].friction_m``) the row ``water[].friction_m``."""
    entry = FIGURES_BY_PATH.get(path) or FIGURES_BY_PATH.get(_INDEX.sub("[]", path))
    if entry is None and (m := _WIRE.match(path)):
        entry = FIGURES_BY_PATH.get(f"wires[].{m.group(1)}")
    return entry


def figure_entry(path: str) -> FigureEntry:
    entry = find_figure(path)
    if entry is None:
        raise KeyError(f"{path}: not a figure of the catalogue (offgrid/catalogue/figures.py)")
    return entry


def key_figures() -> tuple[str, ...]:
    """The report's key figures by reason key, in catalogue order."""
    return tuple(e.reason_key for e in FIGURES if e.key)


def composite(entry_id: str) -> CompositeEntry:
    """The composite row ``entry_id`` (``costs.upkeep_row``), read as it is now."""
    try:
        return COMPOSITES_BY_ID[entry_id]
    except KeyError:
        where = "offgrid/catalogue/composites.py"
        raise KeyError(f"{entry_id}: not a composite row of {where}") from None


def table_entry(entry_id: str) -> TableEntry:
    """The table ``entry_id`` (``reliability-months``), read as it is now."""
    try:
        return TABLES_BY_ID[entry_id]
    except KeyError:
        raise KeyError(f"{entry_id}: not a table of offgrid/catalogue/composites.py") from None


def fill(entry_id: str, record: object, currency: str = "", **words: str) -> str:
    """The composite row ``entry_id`` filled from ``record`` (a ``LifecycleCost``, a
    ``Reliability``): each placeholder's figure read at its path of the record, the word
    placeholders from ``words``."""
    from offgrid.catalogue.outcomes import outcome_value

    def value_of(path: str):
        return outcome_value(record, path)

    return composite(entry_id).fill(value_of, figure_entry, currency, **words)
