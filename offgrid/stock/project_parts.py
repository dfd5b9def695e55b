"""The project's own copy of the catalogue parts it uses, and its stock settings.

Taking parts into a project (:func:`take_parts`) writes their datasheets into the
project's part tables (``[module]``, ``[battery]``, ``[controller]``, ``[inverter]``),
keeps the whole catalogue row of each in ``[stock.<part>]`` (the inverter's ratings, the
controller's battery voltages, price, currency, supplier: what the part tables have no
field for), and prices them in the project's ``[[prices]]`` in the project's currency.
So a project file still stands alone and reopens on a machine without the catalogue.

The project inputs this adds are the catalogue's ``stock.`` rows
(:mod:`offgrid.catalogue.stock`: label, unit, range, allowed words, hint); they live in the
``[stock]`` table, which the store keeps verbatim (``Project.extra``).
"""

from __future__ import annotations

import math

from offgrid.catalogue import input_entry
from offgrid.economics.prices import merge_prices
from offgrid.project.model import PriceItem, Project
from offgrid.stock.catalogue import StockPart
from offgrid.stock.choose import price_in
from offgrid.stock.money import Rates

STOCK_TABLE = "stock"
DEFAULT_MOUNTING = "ground"
#: Extra length of cable bought over the measured runs, % (common practice, no source:
#: offcuts, bends and terminations; 10 % is a usual allowance).
DEFAULT_CABLE_ALLOWANCE_PCT = 10.0


def stock_table(project: Project) -> dict:
    t = project.extra.get(STOCK_TABLE, {})
    return t if isinstance(t, dict) else {}


def stock_problems(project: Project) -> list[str]:
    """The ``[stock]`` table's values against the catalogue's ``stock.`` rows, with the fix:
    ``"stock.mounting: 'roof' is not one of: ground"``."""
    return [f"{path}: {message}" for path, message in stock_field_problems(project)]


def stock_field_problems(project: Project) -> list[tuple[str, str]]:
    """(dotted path, message with the fix) for each bad value of ``[stock]``; what
    :func:`offgrid.project.validate.validate_project` reports (so the store gives the line)."""
    from offgrid.stock.money import project_rates

    if STOCK_TABLE in project.extra and not isinstance(project.extra[STOCK_TABLE], dict):
        return [("stock", "must be a table ([stock])")]
    t = stock_table(project)
    out: list[tuple[str, str]] = []
    m = t.get("mounting", DEFAULT_MOUNTING)
    values = input_entry("stock.mounting").values
    if m not in values:
        out.append(("stock.mounting", f"'{m}' is not one of: {', '.join(values)}"))
    inv = t.get("inverter")
    if inv is not None and stock_inverter(project) is None:
        out.append(
            (
                "stock.inverter",
                "needs name, continuous_w, surge_w and dc_voltage_v as numbers; take the "
                "inverter again from the catalogue (`offgrid parts best --take`)",
            )
        )
    a = t.get("cable_allowance_pct", DEFAULT_CABLE_ALLOWANCE_PCT)
    spec = input_entry("stock.cable_allowance_pct")
    if isinstance(a, bool) or not isinstance(a, int | float) or not spec.low <= a <= spec.high:
        out.append(
            (
                "stock.cable_allowance_pct",
                f"give a number from {spec.low:g} to {spec.high:g} (got {a!r}): {spec.hint}",
            )
        )
    rates = t.get("rates")
    if rates is not None and not isinstance(rates, dict):
        out.append(
            ("stock.rates", f"must be a table ([stock.rates]): {input_entry('stock.rates').hint}")
        )
    elif rates:
        for problem in project_rates(rates, project.economics.currency)[1]:
            path, message = problem.split(": ", 1)
            out.append((path, message))
    return out


def mounting(project: Project) -> str:
    m = stock_table(project).get("mounting", DEFAULT_MOUNTING)
    return m if m in input_entry("stock.mounting").values else DEFAULT_MOUNTING


def cable_allowance_pct(project: Project) -> float:
    a = stock_table(project).get("cable_allowance_pct", DEFAULT_CABLE_ALLOWANCE_PCT)
    spec = input_entry("stock.cable_allowance_pct")
    ok = isinstance(a, int | float) and not isinstance(a, bool) and spec.low <= a <= spec.high
    return float(a) if ok else DEFAULT_CABLE_ALLOWANCE_PCT


def stock_inverter(project: Project) -> dict | None:
    """The catalogue inverter the project took, when its record is whole."""
    inv = stock_table(project).get("inverter")
    if not isinstance(inv, dict) or not isinstance(inv.get("name"), str):
        return None
    for key in ("continuous_w", "surge_w", "dc_voltage_v"):
        v = inv.get(key)
        if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v):
            return None
    return inv


def _plain(record: dict) -> dict:
    return {k: list(v) if isinstance(v, tuple) else v for k, v in record.items()}


#: catalogue kind -> the project's part table (and ``[stock]`` key)
ROLE = {"modules": "module", "batteries": "battery", "controllers": "controller"}
ROLE["inverters"] = "inverter"


def part_key(part: StockPart) -> str:
    """The bill-of-materials key the project's design gives this catalogue part.

    A catalogue controller sets ``controller.max_current_a``, so the design's rating is
    that figure (``controller:MPPT 60 A``); the inverter is named by its own record
    (:func:`offgrid.economics.bom.bill_of_materials`)."""
    if part.kind == "controllers":
        s = part.spec
        return f"controller:{s['type'].upper()} {float(s['max_current_a']):g} A"
    return f"{ROLE[part.kind]}:{part.name}"


def put_part(project: Project, part: StockPart, rate_sets: tuple[Rates, ...]) -> str:
    """Put one catalogue module, battery unit, controller or inverter into ``project`` in
    place: its datasheet into the part table, its whole row into ``[stock.<part>]``, its
    price (in the project's currency) into ``[[prices]]``.  Returns why no price was
    taken ('' when one was)."""
    from dataclasses import replace

    from offgrid.stock.catalogue import battery_spec, controller_spec, module_spec

    role = ROLE[part.kind]
    if role == "module":
        project.module = module_spec(part)
    elif role == "battery":
        project.battery = battery_spec(part)
    elif role == "controller":
        project.controller = controller_spec(part)
    else:
        project.inverter = replace(
            project.inverter,
            efficiency=float(part.spec["efficiency"]),
            self_consumption_w=float(part.spec["self_consumption_w"]),
        )
    table = dict(stock_table(project))
    table[role] = _plain(part.record())
    project.extra = {**project.extra, STOCK_TABLE: table}
    cur = project.economics.currency
    value, why = price_in(part, cur, *rate_sets)
    if value is None:
        return why
    note = f"catalogue: {part.name}"
    if part.currency.upper() != cur.upper():
        note += f", {part.price:g} {part.currency} converted"
    if part.supplier:
        note += f"; {part.supplier}"
    project.prices = merge_prices(
        project.prices, [PriceItem(part_key(part), round(value, 2), note)]
    )
    return ""


def take_parts(
    project: Project,
    module: StockPart,
    battery: StockPart,
    controller: StockPart,
    inverter: StockPart | None,
    rate_sets: tuple[Rates, ...],
    system_voltage_v: int | None = None,
) -> tuple[Project, list[str]]:
    """A copy of ``project`` with the parts taken in (:func:`put_part` for each; without an
    inverter any earlier ``[stock.inverter]`` is dropped) and, when given, the system
    voltage the combination was found at fixed in ``choices.system_voltage``.  Returns the
    project and the parts left unpriced (with why)."""
    import copy
    from dataclasses import replace

    p = copy.deepcopy(project)
    if system_voltage_v is not None:
        p.choices = replace(p.choices, system_voltage=int(system_voltage_v))
    missing = []
    for part in (module, battery, controller, inverter):
        if part is not None:
            why = put_part(p, part, rate_sets)
            if why:
                missing.append(why)
    if inverter is None and "inverter" in stock_table(p):
        p.extra = {
            **p.extra,
            STOCK_TABLE: {k: v for k, v in stock_table(p).items() if k != "inverter"},
        }
    return p, missing
