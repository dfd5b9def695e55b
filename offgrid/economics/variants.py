"""Design variants: a few overrides of the project, designed and compared side by side.

A :class:`~offgrid.project.model.Variant` holds ``overrides``: dotted paths of the
saved project (``controller.type``, ``battery.chemistry``, ``choices.system_voltage``,
``loads[2].hours_per_day``; list items counted from 1 as in the file) mapped to
values.  Nested tables (TOML ``[variants.overrides.battery]``) mean the same as
dotted keys.  :func:`apply_variant` returns a new project; :func:`compare_variants`
designs the base project and every variant and lines their figures up, marking
each figure that differs from the base.
"""

from __future__ import annotations

import copy
import math
import re
from collections.abc import Callable
from dataclasses import dataclass, is_dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any, get_type_hints

from offgrid.catalogue import figure_entry
from offgrid.catalogue.outcomes import outcome_value
from offgrid.design.result import DesignError, SystemDesign
from offgrid.project.model import Project, Variant

if TYPE_CHECKING:
    from offgrid.economics.costs import LifecycleCost
    from offgrid.simulate.reliability import Reliability

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
_INDEX = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)\[(\d+)\]$")


def flatten_overrides(overrides: dict[str, Any], prefix: str = "") -> list[tuple[str, Any]]:
    """``{"battery": {"chemistry": "lifepo4"}}`` -> ``[("battery.chemistry", "lifepo4")]``."""
    out: list[tuple[str, Any]] = []
    for key, value in overrides.items():
        path = f"{prefix}.{key}" if prefix else str(key)
        if isinstance(value, dict):
            out += flatten_overrides(value, path)
        else:
            out.append((path, value))
    return out


def _step(obj: Any, part: str, where: str) -> Any:
    m = _INDEX.match(part)
    name, index = (m.group(1), int(m.group(2))) if m else (part, None)
    if not is_dataclass(obj) or not hasattr(obj, name):
        raise ValueError(f"{where}: '{name}' is not a field here")
    value = getattr(obj, name)
    if index is None:
        return value
    if not isinstance(value, list) or not 1 <= index <= len(value):
        size = len(value) if isinstance(value, list) else 0
        raise ValueError(
            f"{where}: {name}[{index}] does not exist ({name} has {size} item(s), counted from 1)"
        )
    return value[index - 1]


def set_path(project: Project, path: str, value: Any, where: str = "") -> None:
    """Set the field at a dotted ``path`` of ``project`` in place, converting and checking type."""
    from offgrid.project.store import _Reader  # the store's own type conversion

    where = where or path
    parts = path.split(".")
    obj: Any = project
    for part in parts[:-1]:
        obj = _step(obj, part, where)
    last = parts[-1]
    if _INDEX.match(last) or not is_dataclass(obj) or not hasattr(obj, last):
        raise ValueError(f"{where}: '{last}' is not a field that a variant can set")
    if last in ("extra", "variants"):
        raise ValueError(f"{where}: a variant cannot change '{last}'")
    hint = get_type_hints(type(obj))[last]
    reader = _Reader()
    converted = reader.convert(hint, value, path)
    if reader.problems:
        raise ValueError(f"{where}: {reader.problems[0].message}")
    setattr(obj, last, converted)


def apply_variant(project: Project, variant: Variant) -> Project:
    """A new project: ``project`` with the variant's overrides applied and checked.

    Raises ValueError naming the variant and the path when an override does not fit.
    """
    from offgrid.project.validate import validate_project

    out = copy.deepcopy(project)
    out.variants = []
    for path, value in flatten_overrides(variant.overrides):
        where = f"variant '{variant.name}': {path}"
        if path == "generator":  # generator = on/off (economics/hybrid_variants.py)
            from offgrid.economics.hybrid_variants import switch_generator

            out.generator = switch_generator(out, value, where)
            continue
        set_path(out, path, value, where=where)
    problems = validate_project(out)
    if problems:
        raise ValueError(f"variant '{variant.name}': " + "; ".join(str(p) for p in problems))
    return out


# ----------------------------------------------------------------------------- comparison


@dataclass(frozen=True)
class VariantColumn:
    name: str
    note: str
    overrides: tuple[tuple[str, str], ...]
    project: Project | None
    design: SystemDesign | None
    error: str | None  # why the variant could not be designed (or applied)
    cost: LifecycleCost | None = None
    reliability: Reliability | None = None  # the simulation's record, when it ran
    hybrid: Any = None  # the generator study (GeneratorStudy) of a column with a generator
    hybrid_error: str | None = None  # why that study could not run


@dataclass(frozen=True)
class ComparisonRow:
    label: str
    unit: str
    values: tuple[float | str | None, ...]  # one per column; None: not available
    texts: tuple[str, ...]
    differs: tuple[bool, ...]  # True where the value differs from the first column
    group: str = "figures"  # "choices", "figures", "cost" or "reliability"
    path: str | None = None


@dataclass(frozen=True)
class VariantComparison:
    columns: tuple[VariantColumn, ...]
    rows: tuple[ComparisonRow, ...]

    def row(self, label: str) -> ComparisonRow | None:
        return next((r for r in self.rows if r.label == label), None)


def _get_path(obj: Any, path: str) -> Any:
    for part in path.split("."):
        obj = _step(obj, part, path)
    return obj


def _same(a: Any, b: Any) -> bool:
    if isinstance(a, int | float) and isinstance(b, int | float):
        return math.isclose(float(a), float(b), rel_tol=1e-9, abs_tol=1e-9)
    return a == b


def _show(value: Any, digits: int | None) -> str:
    """Text of a compared value; ``digits=None`` shows numbers as typed (choices)."""
    if value is None:
        return "-"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return f"{value:g}" if digits is None else f"{value:,.{digits}f}"
    return str(value)


#: Figures compared, by catalogue path (label, unit and digits are the catalogue's
#: figure rows, :mod:`offgrid.catalogue.figures`), with the getter from (design, cost,
#: reliability).
FIGURE_ROWS: tuple[tuple[str, Callable[..., Any]], ...] = (
    ("site.design_month", lambda d, c, r: MONTHS[d.site.design_month - 1]),
    ("battery.system_voltage_v", lambda d, c, r: d.battery.system_voltage_v),
    ("array.power_w", lambda d, c, r: d.array.power_w),
    (
        "array.module_count",
        lambda d, c, r: f"{d.array.modules_series} x {d.array.modules_parallel}",
    ),
    ("array.derate_total", lambda d, c, r: d.array.derate_total),
    ("battery.capacity_ah", lambda d, c, r: d.battery.capacity_ah),
    ("battery.usable_kwh", lambda d, c, r: d.battery.usable_kwh),
    ("battery.unit_count", lambda d, c, r: d.battery.unit_count),
    (
        "controller.current_a",
        lambda d, c, r: (
            f"{d.controller.count} x {d.controller.current_a:g} {d.controller.type.upper()}"
        ),
    ),
    (
        "inverter.continuous_w",
        lambda d, c, r: d.inverter.continuous_w if d.inverter.needed else "none",
    ),
)
#: Counts of the design's warnings, no catalogue figure: label and getter, as the headline
#: counts them (warnings, and notes of severity 'info' apart); shown under ``warnings``.
COUNT_ROWS: tuple[tuple[str, Callable[..., Any]], ...] = (
    ("Warnings", lambda d, c, r: sum(1 for w in d.warnings if w.severity != "info")),
    ("Notes", lambda d, c, r: sum(1 for w in d.warnings if w.severity == "info")),
)
#: The lifecycle cost's rows, by their catalogue paths (label, unit, digits there).
COST_ROWS: tuple[str, ...] = (
    "costs.capital",
    "costs.lcc",
    "costs.cost_per_kwh",
    "costs.battery_life_years",
)


def battery_life_label(sources: list[str]) -> str:
    """'Battery life' with the method behind the figures (the same words as 7 Risk)."""
    kinds = {
        "simulated"
        if s.startswith("reliability simulation")
        else "typed"
        if s.startswith("project file")
        else "preset"
        for s in sources
    }
    if not kinds:
        return figure_entry("costs.battery_life_years").label
    from offgrid.catalogue import fill

    return fill("costs.battery_life_method", None, method=" or ".join(sorted(kinds)))


#: The simulation's rows, by their catalogue paths.
RELIABILITY_ROWS: tuple[str, ...] = ("reliability.lolp", "reliability.unmet_fraction")


def _row(
    label: str,
    unit: str,
    digits: int | None,
    values: list[Any],
    group: str,
    path: str | None = None,
) -> ComparisonRow:
    base = values[0]
    differs = tuple(i > 0 and v is not None and not _same(v, base) for i, v in enumerate(values))
    return ComparisonRow(
        label, unit, tuple(values), tuple(_show(v, digits) for v in values), differs, group, path
    )


def compare_variants(
    project: Project,
    base: Path | None = None,
    simulate: Callable[[Project, SystemDesign], Any] | None = None,
    with_costs: bool = True,
    with_generator: bool = False,
    study: Callable[[Project, Path | None], Any] | None = None,
) -> VariantComparison:
    """Design the project and each of its variants; line up choices, figures, cost, reliability.

    ``simulate(project, design)``, when given, returns a reliability record (with ``lolp``
    and ``unmet_fraction`` as fractions) for each column.  A variant that cannot be applied
    or designed keeps its column with the reason in ``error``.  ``with_generator``: each
    column with a generator runs its hybrid study (``study(project, base)``, by default
    :func:`offgrid.economics.hybrid_variants.run_study`) and the "hybrid" rows set it
    beside the solar-only columns (:mod:`offgrid.economics.hybrid_variants`).
    """
    from offgrid.design.sizing import design as run_design
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.economics.hybrid_variants import switch_text

    columns: list[VariantColumn] = []
    entries = [Variant(name="Base design", overrides={}, note="the project as saved")]
    entries += list(project.variants)
    for k, v in enumerate(entries):
        shown = tuple(
            (p, _show(val, None) if p != "generator" else switch_text(val))
            for p, val in flatten_overrides(v.overrides)
        )
        try:
            proj = project if k == 0 else apply_variant(project, v)
        except ValueError as exc:
            columns.append(VariantColumn(v.name, v.note, shown, None, None, str(exc)))
            continue
        try:
            des = run_design(proj, base)
        except DesignError as exc:
            columns.append(
                VariantColumn(v.name, v.note, shown, proj, None, f"cannot design: {exc}")
            )
            continue
        rel = simulate(proj, des) if simulate is not None else None
        cost = lifecycle_cost(proj, des, bill_of_materials(proj, des), rel) if with_costs else None
        hyb, hyb_err, note = None, None, v.note
        if with_generator and proj.generator is not None:
            from offgrid.economics.hybrid_variants import run_study

            try:
                hyb = (study or run_study)(proj, base)
            except (DesignError, ValueError) as exc:
                hyb_err = str(exc)
                note = f"{note}; no hybrid study: {exc}".lstrip("; ")
        columns.append(VariantColumn(v.name, note, shown, proj, des, None, cost, rel, hyb, hyb_err))

    rows: list[ComparisonRow] = []
    paths: list[str] = []
    for v in project.variants:
        for p, _ in flatten_overrides(v.overrides):
            if p not in paths:
                paths.append(p)
    for p in paths:
        vals = []
        for col in columns:
            if p == "generator":  # the on/off switch, not the whole table
                from offgrid.economics.hybrid_variants import shown_switch

                vals.append(shown_switch(col.project))
                continue
            try:
                vals.append(_get_path(col.project, p) if col.project is not None else None)
            except ValueError:
                vals.append(None)
        rows.append(_row(p, "", None, vals, "choices", p))

    def figure_values(get: Callable[..., Any]) -> list[Any]:
        return [
            get(c.design, c.cost, c.reliability) if c.design is not None else None for c in columns
        ]

    for path, get in FIGURE_ROWS:
        e = figure_entry(path)
        rows.append(_row(e.label, e.unit, e.digits, figure_values(get), "figures", path))
    for label, get in COUNT_ROWS:
        rows.append(_row(label, "", 0, figure_values(get), "figures", "warnings"))
    if with_costs:
        currency = project.economics.currency
        for path in COST_ROWS:
            e = figure_entry(path)
            vals = [outcome_value(c.cost, path) if c.cost is not None else None for c in columns]
            label = e.label
            if path == "costs.battery_life_years":  # say which method: preset or simulated
                label = battery_life_label(
                    [c.cost.battery_life_source for c in columns if c.cost is not None]
                )
            rows.append(_row(label, e.unit_in(currency), e.digits, vals, "cost", path))
    if with_generator and any(c.project is not None and c.project.generator for c in columns):
        from offgrid.economics.hybrid_variants import HYBRID_ROWS, hybrid_row, hybrid_values

        for name, unit, digits, get in HYBRID_ROWS:
            label, unit, digits, vals = hybrid_row(
                name, unit, digits, hybrid_values(columns, get), project.economics.currency
            )
            rows.append(_row(label, unit, digits, vals, "hybrid"))
    if simulate is not None:
        for path in RELIABILITY_ROWS:
            e = figure_entry(path)
            vals = []
            for c in columns:
                v = outcome_value(c.reliability, path) if c.reliability is not None else None
                vals.append(e.shown(float(v)) if isinstance(v, int | float) else None)
            rows.append(_row(e.label, e.unit, e.digits, vals, "reliability", path))
    return VariantComparison(tuple(columns), tuple(rows))
