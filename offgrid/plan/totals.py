"""Procurement totals: parts per kit and per own system, counts in all, and capital cost.

Quantity of a part = sum over kits (and own systems) of parts per system x systems.
Cost of a line = quantity x unit price from the price list (capacity-priced parts:
unit price = capacity x price per W, kWh or A).  The one-off overhead counts once per
system with its own design; kit types once per kit type.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.plan.kits import Candidate, KitParts, Standardisation, parts_of
from offgrid.plan.prices import PriceList


@dataclass(frozen=True)
class PartLine:
    category: str
    description: str
    label: str  # short form for 80-column tables
    quantity: int
    unit_price: float | None
    cost: float | None


@dataclass(frozen=True)
class SourceParts:
    """The parts of one kit type or one own-system row."""

    name: str  # "Kit A" or the row id
    systems: int
    per_system: tuple[tuple[str, str, int], ...]  # (category, description, quantity)
    unit_cost: float | None


@dataclass(frozen=True)
class Totals:
    lines: tuple[PartLine, ...]
    sources: tuple[SourceParts, ...]
    total_cost: float | None
    currency: str
    systems: int


def _unit_prices(prices: PriceList | None, parts: KitParts) -> dict[tuple[str, str], float]:
    if prices is None:
        return {}
    out = {}
    for cat, desc, _ in part_list(parts, prices):
        if cat == "PV module":
            out[(cat, desc)] = float(prices.price("module", parts.module_pmax_w))
        elif cat == "Battery unit":
            unit_kwh = parts.battery_unit_v * parts.battery_unit_ah / 1000.0
            out[(cat, desc)] = float(prices.price(prices.battery_item(parts.battery_chemistry),
                                                  unit_kwh))
        elif cat == "Charge controller":
            out[(cat, desc)] = float(prices.price(f"controller_{parts.controller_type}",
                                                  parts.controller_current_a))
        elif cat == "Inverter":
            out[(cat, desc)] = float(prices.price("inverter", parts.inverter_w))
        elif cat == "Installation":
            out[(cat, desc)] = prices.optional("system_fixed")
    return out


def part_list(parts: KitParts, prices: PriceList | None = None
              ) -> list[tuple[str, str, int]]:
    """(category, description, quantity per system) of one bill of parts."""
    out = [
        ("PV module", f"{parts.module_name}, {parts.module_pmax_w:g} W", parts.module_count),
        ("Battery unit", f"{parts.battery_name}, {parts.battery_unit_v:g} V "
                         f"{parts.battery_unit_ah:g} Ah", parts.unit_count),
        ("Charge controller", f"{parts.controller_type.upper()} {parts.controller_current_a:g} A",
         parts.controller_count),
    ]
    if parts.inverter_w > 0:
        out.append(("Inverter", f"{parts.inverter_w:g} W continuous, {parts.inverter_surge_w:g} W "
                                "surge", 1))
    if prices is not None and prices.has("system_fixed"):
        out.append(("Installation", "mounting, cable, protection and installation of one "
                                    "system", 1))
    return out


def short_label(category: str, description: str, parts: KitParts | None = None) -> str:
    """A part's name in at most about 40 characters."""
    if parts is not None:
        if category == "PV module":
            return f"PV module {parts.module_pmax_w:g} W"
        if category == "Battery unit":
            return (f"Battery {parts.battery_unit_v:g} V {parts.battery_unit_ah:g} Ah "
                    f"{parts.battery_chemistry}")
        if category == "Charge controller":
            return f"Controller {parts.controller_type.upper()} {parts.controller_current_a:g} A"
        if category == "Inverter":
            return f"Inverter {parts.inverter_w:g} W"
        if category == "Installation":
            return "Installation of one system"
    return {"Design": "Own-system overhead", "Kit types": "Kit type set-up"}.get(category,
                                                                                 category)


def procurement_totals(standard: Standardisation, candidates: list[Candidate],
                       prices: PriceList | None, labels: dict[int, str] | None = None) -> Totals:
    """Totals by part over every kit and own system of a standardisation.

    ``labels`` maps a candidate's ``index`` to the name shown for its own system (its id).
    """
    by_index = {c.index: c for c in candidates}
    sources: list[SourceParts] = []
    qty: dict[tuple[str, str], int] = {}
    unit: dict[tuple[str, str], float] = {}
    order: list[tuple[str, str]] = []
    labels_of: dict[tuple[str, str], str] = {}

    def add(name: str, parts: KitParts, systems: int, unit_cost: float | None) -> None:
        plist = part_list(parts, prices)
        sources.append(SourceParts(name, systems, tuple(plist), unit_cost))
        unit.update(_unit_prices(prices, parts))
        for cat, desc, n in plist:
            key = (cat, desc)
            if key not in qty:
                qty[key] = 0
                order.append(key)
                labels_of[key] = short_label(cat, desc, parts)
            qty[key] += n * systems

    for kit in standard.kits:
        add(f"Kit {kit.name}", kit.parts, kit.systems, kit.unit_cost)
    own_rows = 0
    for a in standard.assignments:
        c = by_index[a.index]
        if a.own_system and c.count > 0:
            own_rows += c.count
            add((labels or {}).get(a.index, str(a.index)), parts_of(c.design), c.count,
                a.unit_cost)
    extra: list[tuple[str, str, int, float | None]] = []
    if prices is not None and own_rows and prices.has("one_off"):
        extra.append(("Design", "one-off design and separate purchase of a system of its own",
                      own_rows, prices.optional("one_off")))
    n_kits = len(standard.kits)
    if n_kits and standard.kit_type_cost > 0:
        extra.append(("Kit types", "setting up one standard kit type (tender, stock, training)",
                      n_kits, standard.kit_type_cost))
    cat_rank = {"PV module": 0, "Battery unit": 1, "Charge controller": 2, "Inverter": 3,
                "Installation": 4}
    order.sort(key=lambda k: (cat_rank.get(k[0], 9), k[1]))
    lines = []
    for key in order:
        price = unit.get(key) if prices is not None else None
        lines.append(PartLine(key[0], key[1], labels_of[key], qty[key], price,
                              None if price is None else price * qty[key]))
    for cat, desc, n, price in extra:
        lines.append(PartLine(cat, desc, short_label(cat, desc), n, price,
                              None if price is None else price * n))
    total = None
    if prices is not None:
        total = float(sum(line.cost for line in lines if line.cost is not None))
    systems = sum(s.systems for s in sources)
    return Totals(tuple(lines), tuple(sources), total, prices.currency if prices else "",
                  systems)
