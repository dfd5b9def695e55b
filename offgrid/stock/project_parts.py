"""The project's own copy of the catalogue parts it uses, and its stock settings.

Taking parts into a project (:func:`take_parts`) writes their datasheets into the
project's part tables (``[module]``, ``[battery]``, ``[controller]``, ``[inverter]``),
keeps the whole catalogue row of each in ``[stock.<part>]`` (the inverter's ratings, the
controller's battery voltages, price, currency, supplier: what the part tables have no
field for), and prices them in the project's ``[[prices]]`` in the project's currency.
So a project file still stands alone and reopens on a machine without the catalogue.

The project inputs this adds are declared once, in :data:`STOCK_INPUTS`; they live in the
``[stock]`` table, which the store keeps verbatim (``Project.extra``).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from offgrid.economics.prices import merge_prices
from offgrid.project.model import PriceItem, Project
from offgrid.stock.catalogue import StockPart
from offgrid.stock.choose import price_in, with_parts
from offgrid.stock.money import Rates

STOCK_TABLE = "stock"
MOUNTINGS = ("ground", "roof")
#: Extra length of cable bought over the measured runs, % (common practice, no source:
#: offcuts, bends and terminations; 10 % is a usual allowance).
DEFAULT_CABLE_ALLOWANCE_PCT = 10.0


@dataclass(frozen=True)
class StockInput:
    """Metadata of one project input of the ``[stock]`` table."""

    path: str
    label: str
    unit: str
    kind: str  # "text", "number", "choice", "table"
    default: Any
    help: str
    low: float | None = None
    high: float | None = None
    choices: tuple[str, ...] = ()


#: Every project input of the parts catalogue feature, in one place.
STOCK_INPUTS: tuple[StockInput, ...] = (
    StockInput(
        "stock.mounting",
        "Module mounting",
        "",
        "choice",
        "ground",
        "where the modules are mounted: ground frame or roof rails (sets the mounting "
        "line of the bill of materials)",
        choices=MOUNTINGS,
    ),
    StockInput(
        "stock.cable_allowance_pct",
        "Cable allowance",
        "%",
        "number",
        DEFAULT_CABLE_ALLOWANCE_PCT,
        "cable bought over the measured runs for offcuts and terminations (common "
        "practice, no source)",
        0.0,
        100.0,
    ),
    StockInput(
        "stock.rates",
        "Exchange rates",
        "project currency per unit",
        "table",
        {},
        "one unit of a price list's currency in the project's currency (EUR = 1.08); "
        "wins over the catalogue's rates.csv",
        0.0,
        1e7,
    ),
    StockInput(
        "stock.module",
        "Catalogue module",
        "",
        "table",
        None,
        "the whole catalogue row of the module taken (name, datasheet, price, currency, "
        "supplier); written by `offgrid parts best --take`",
    ),
    StockInput(
        "stock.battery",
        "Catalogue battery unit",
        "",
        "table",
        None,
        "the whole catalogue row of the battery unit taken",
    ),
    StockInput(
        "stock.controller",
        "Catalogue controller",
        "",
        "table",
        None,
        "the whole catalogue row of the charge controller taken (with its battery voltages)",
    ),
    StockInput(
        "stock.inverter",
        "Catalogue inverter",
        "",
        "table",
        None,
        "the whole catalogue row of the inverter taken (continuous, surge, DC voltage, "
        "charger current)",
    ),
)
INPUT_OF = {i.path: i for i in STOCK_INPUTS}


def stock_table(project: Project) -> dict:
    t = project.extra.get(STOCK_TABLE, {})
    return t if isinstance(t, dict) else {}


def stock_problems(project: Project) -> list[str]:
    """The ``[stock]`` table's values against :data:`STOCK_INPUTS`, with the fix."""
    t = stock_table(project)
    out = []
    if STOCK_TABLE in project.extra and not isinstance(project.extra[STOCK_TABLE], dict):
        return ["stock: must be a table ([stock])"]
    m = t.get("mounting", "ground")
    if m not in MOUNTINGS:
        out.append(f"stock.mounting: '{m}' is not one of: {', '.join(MOUNTINGS)}")
    a = t.get("cable_allowance_pct", DEFAULT_CABLE_ALLOWANCE_PCT)
    spec = INPUT_OF["stock.cable_allowance_pct"]
    if isinstance(a, bool) or not isinstance(a, int | float) or not spec.low <= a <= spec.high:
        out.append(f"stock.cable_allowance_pct: give a number from 0 to 100 (got {a!r})")
    return out


def mounting(project: Project) -> str:
    m = stock_table(project).get("mounting", "ground")
    return m if m in MOUNTINGS else "ground"


def cable_allowance_pct(project: Project) -> float:
    a = stock_table(project).get("cable_allowance_pct", DEFAULT_CABLE_ALLOWANCE_PCT)
    ok = isinstance(a, int | float) and not isinstance(a, bool) and 0 <= a <= 100
    return float(a) if ok else DEFAULT_CABLE_ALLOWANCE_PCT


def stock_inverter(project: Project) -> dict | None:
    """The catalogue inverter the project took, when its record is whole."""
    inv = stock_table(project).get("inverter")
    need = ("name", "continuous_w", "surge_w", "dc_voltage_v")
    if isinstance(inv, dict) and all(k in inv for k in need):
        return inv
    return None


def _plain(record: dict) -> dict:
    return {k: list(v) if isinstance(v, tuple) else v for k, v in record.items()}


def take_parts(
    project: Project,
    module: StockPart,
    battery: StockPart,
    controller: StockPart,
    inverter: StockPart | None,
    controller_key: str,
    rate_sets: tuple[Rates, ...],
) -> tuple[Project, list[str]]:
    """A copy of ``project`` with the parts taken in (datasheets, records, prices).

    ``controller_key`` is the bill-of-materials key of the controller as the design
    names it (``controller:MPPT 60 A``).  Returns the project and the parts left
    unpriced (with why).
    """
    p = with_parts(project, module, battery, controller, inverter)
    p.extra = dict(p.extra)  # the copy's own (with_parts shares the other tables)
    table = dict(stock_table(p))
    chosen = {"module": module, "battery": battery, "controller": controller}
    if inverter is not None:
        chosen["inverter"] = inverter
    else:
        table.pop("inverter", None)
    keys = {
        "module": f"module:{module.name}",
        "battery": f"battery:{battery.name}",
        "controller": controller_key,
        "inverter": f"inverter:{inverter.name}" if inverter else "",
    }
    new: list[PriceItem] = []
    missing: list[str] = []
    cur = p.economics.currency
    for role, part in chosen.items():
        table[role] = _plain(part.record())
        value, why = price_in(part, cur, *rate_sets)
        if value is None:
            missing.append(why)
            continue
        note = f"catalogue: {part.name}"
        if part.currency.upper() != cur.upper():
            note += f", {part.price:g} {part.currency} converted"
        if part.supplier:
            note += f"; {part.supplier}"
        new.append(PriceItem(keys[role], round(value, 2), note))
    p.extra[STOCK_TABLE] = table
    p.prices = merge_prices(p.prices, new)
    return p, missing
