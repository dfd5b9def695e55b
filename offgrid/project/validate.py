"""Range and consistency checks on a :class:`~offgrid.project.model.Project`.

Each problem names the field by its dotted path (as in the saved file) and
says how to fix it.  The store reports them with line numbers; the text UI
shows them beside the field.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid import catalogue
from offgrid.climate.albedo import albedo_problems
from offgrid.numbers import MAX_PRICE, PRICE_RANGE, is_finite_number
from offgrid.project.loads_csv import check_load
from offgrid.project.model import Project
from offgrid.safetext import printable


@dataclass(frozen=True)
class Problem:
    path: str
    message: str
    line: int | None = None

    def __str__(self) -> str:
        where = f"line {self.line}: " if self.line else ""
        return f"{where}{self.path}: {self.message}"


def ranged_inputs() -> list[tuple[str, float, float, str]]:
    """(path, low, high, hint) of every number input with a range, from the catalogue
    (:mod:`offgrid.catalogue`); per-load rows (``loads[].*``) are checked by ``check_load``,
    the water, generator and stock rows by their own checks (``catalogue.OWN_CHECKS``)."""
    return [
        (e.path, e.low, e.high, e.hint)
        for e in catalogue.INPUTS_BY_PATH.values()
        if e.low is not None and e.high is not None and not _own_check(e.path)
    ]


def _own_check(path: str) -> bool:
    return "[]" in path or path.startswith(catalogue.OWN_CHECKS)


def _choice_problems(project: Project) -> list[Problem]:
    """A value outside the catalogue's ``values`` of a choice (yes/no and per-load rows
    are checked where they are read)."""
    problems = []
    for e in catalogue.INPUTS_BY_PATH.values():
        if not e.values or _own_check(e.path) or all(isinstance(v, bool) for v in e.values):
            continue
        value = _get(project, e.path)
        if value not in e.values:
            names = [str(v) for v in e.values]
            allowed = " or ".join([", ".join(names[:-1]), names[-1]] if len(names) > 1 else names)
            unit = f" ({e.unit})" if e.unit else ""
            problems.append(Problem(e.path, f"'{value}' must be {allowed}{unit}"))
    return problems


def _get(project: Project, path: str):
    obj = project
    for part in path.split("."):
        obj = getattr(obj, part)
    return obj


def validate_project(project: Project) -> list[Problem]:
    """Every problem with the project's values, empty when it is valid."""
    problems: list[Problem] = []
    for path, lo, hi, hint in ranged_inputs():
        value = _get(project, path)
        if value is None:
            continue
        if not is_finite_number(value):
            problems.append(Problem(path, f"'{value}' is not a finite number; {hint}"))
        elif not lo <= value <= hi:
            problems.append(Problem(path, f"{value:g} is out of range; {hint}"))
    for path, message in albedo_problems(project.site.albedo, "site.albedo"):
        problems.append(Problem(path, message))
    from offgrid.water.checks import water_problems  # [[water]] supplies

    problems.extend(Problem(path, message) for path, message in water_problems(project))
    m = project.module
    if m.vmp_v >= m.voc_v:
        problems.append(
            Problem(
                "module.vmp_v",
                f"Vmp {m.vmp_v:g} V must be below Voc {m.voc_v:g} V; check the datasheet columns",
            )
        )
    if m.imp_a >= m.isc_a:
        problems.append(
            Problem(
                "module.imp_a",
                f"Imp {m.imp_a:g} A must be below Isc {m.isc_a:g} A; check the datasheet columns",
            )
        )
    if m.vmp_v * m.imp_a > 0 and abs(m.vmp_v * m.imp_a - m.pmax_w) > 0.05 * m.pmax_w:
        problems.append(
            Problem(
                "module.pmax_w",
                f"Pmax {m.pmax_w:g} W differs from Vmp x Imp = "
                f"{m.vmp_v * m.imp_a:.1f} W by more than 5 %; check the datasheet",
            )
        )
    problems.extend(_choice_problems(project))
    c = project.climate
    if c.ref is None and c.inline is None:
        problems.append(
            Problem(
                "climate",
                "no climate: give `ref` (a bundled climate name or "
                "file) or an inline [climate.monthly] table",
            )
        )
    if c.inline is not None:
        from offgrid.climate.files import monthly_climate_problems

        problems.extend(Problem(path, msg) for path, msg in monthly_climate_problems(c.inline))
    if project.site.horizon_deg:
        from offgrid.climate.horizon import validate_horizon

        try:
            validate_horizon(project.site.horizon_deg)
        except ValueError as exc:
            problems.append(Problem("site.horizon_deg", str(exc).removeprefix("site.horizon_deg ")))
    for i, load in enumerate(project.loads):
        for fld, msg in check_load(load):
            who = f"load '{printable(load.name)}'" if load.name.strip() else f"appliance {i + 1}"
            problems.append(Problem(f"loads[{i + 1}].{fld}", f"{msg} ({who})"))
    problems.extend(_price_and_variant_problems(project))
    if project.generator is not None:  # issue 16: the generator's own checks
        from offgrid.generator.fields import generator_problems

        problems.extend(Problem(path, msg) for path, msg in generator_problems(project))
    if "stock" in project.extra:  # issue 17: the [stock] table, kept verbatim in extra
        from offgrid.stock.project_parts import stock_field_problems

        problems.extend(Problem(path, msg) for path, msg in stock_field_problems(project))
    return problems


def _price_and_variant_problems(project: Project) -> list[Problem]:
    """Price list: a part key and a positive price each, no part twice; variants: unique names."""
    problems: list[Problem] = []
    seen: dict[str, int] = {}
    for i, item in enumerate(project.prices, start=1):
        path = f"prices[{i}]"
        part = item.part.strip()
        if not part:
            problems.append(
                Problem(
                    f"{path}.part",
                    "the part key is empty; use a key from the "
                    "bill of materials (offgrid bom), e.g. module or battery",
                )
            )
        elif part in seen:
            problems.append(
                Problem(
                    f"{path}.part",
                    f"'{part}' is priced twice (also prices[{seen[part]}]); keep one line",
                )
            )
        else:
            seen[part] = i
        price = item.unit_price
        if not is_finite_number(price):
            problems.append(
                Problem(
                    f"{path}.unit_price",
                    f"'{price}' is not a number; give the "
                    f"price of one unit of '{part}'; {PRICE_RANGE}",
                )
            )
        elif price <= 0:
            problems.append(
                Problem(
                    f"{path}.unit_price",
                    f"{price:g} for '{part}': a price must "
                    "be above zero; remove the line if the part is not bought",
                )
            )
        elif price > MAX_PRICE:
            problems.append(
                Problem(
                    f"{path}.unit_price", f"{price:g} for '{part}' is out of range; {PRICE_RANGE}"
                )
            )
    names: dict[str, int] = {}
    for i, variant in enumerate(project.variants, start=1):
        name = variant.name.strip()
        if not name:
            problems.append(Problem(f"variants[{i}].name", "give the variant a short name"))
        elif name in names:
            problems.append(
                Problem(
                    f"variants[{i}].name",
                    f"'{name}' is used twice (also variants[{names[name]}]); names must differ",
                )
            )
        else:
            names[name] = i
    return problems
