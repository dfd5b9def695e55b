"""Procurement totals: parts per kit and per own system, counts in all, and capital cost.

Quantity of a part = sum over kits (and own systems) of parts per system x systems.
Cost of a line = quantity x unit price from the price list (capacity-priced parts:
unit price = capacity x price per W, kWh, A or mm2 per metre).  The one-off overhead
counts once per system with its own design; kit types once per kit type.

Cables are metres of two-conductor cable (2 x one-way length x runs) by material and
size, and protective devices are counted by kind and rating, from each design's
electrical result.  A kit's own circuits come with the kit; the DC load circuits of each
home (its own appliances) are counted row by row, since homes sharing a kit differ.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from offgrid.plan.kits import Candidate, KitParts, Standardisation, parts_of
from offgrid.plan.prices import PriceList
from offgrid.plan.rows import Cable, Protection, RowDesign

CATEGORY_ORDER = (
    "PV module",
    "Battery unit",
    "Charge controller",
    "Inverter",
    "Cable",
    "Protection",
    "Installation",
)


@dataclass(frozen=True)
class PartLine:
    category: str
    description: str
    label: str  # short form for 80-column tables
    quantity: float  # whole parts, or metres of cable
    unit: str  # "each" or "m"
    unit_price: float | None
    cost: float | None


@dataclass(frozen=True)
class SourceParts:
    """The parts of one kit type, one own-system row, or the homes' own load circuits."""

    name: str  # "Kit A", the row id, or "DC load circuits"
    systems: int
    per_system: tuple[tuple[str, str, float], ...]  # (category, description, quantity)
    unit_cost: float | None


@dataclass(frozen=True)
class Totals:
    lines: tuple[PartLine, ...]
    sources: tuple[SourceParts, ...]
    total_cost: float | None
    currency: str
    systems: int
    unpriced: tuple[str, ...]  # labels of lines the price list has no price for


# (category, description, quantity, short label, unit,
#  (price item, capacity, part key) or None, sort key within the category)
_Entry = tuple[str, str, float, str, str, tuple[str, float, str | None] | None, tuple]


def _cable_entries(cables, prices: PriceList | None) -> list[_Entry]:
    merged: dict[tuple[str, str], list] = {}
    for c in cables:
        key = (c.material, c.size)
        if key not in merged:
            merged[key] = [0.0, c.area_mm2]
        merged[key][0] += c.metres
    out = []
    for (material, size), (metres, area) in merged.items():
        item = f"cable_{'aluminium' if material.startswith('alu') else 'copper'}"
        out.append(
            (
                "Cable",
                f"{material} {size}",
                metres,
                f"Cable {material} {size}",
                "m",
                (item, area, f"cable:{material} {size}"),
                (material, area),
            )
        )
    return out


def _device_entries(devices, prices: PriceList | None) -> list[_Entry]:
    merged: dict[tuple[str, float | None], int] = {}
    for v in devices:
        merged[(v.kind, v.rating_a)] = merged.get((v.kind, v.rating_a), 0) + v.count
    out = []
    for (kind, rating), n in sorted(merged.items(), key=lambda kv: (kv[0][0], kv[0][1] or 0.0)):
        if kind == "disconnect":
            item = "disconnect"
            desc = "DC disconnect"
        else:
            item = (
                "breaker"
                if (kind == "fuse or breaker" and prices is not None and prices.has("breaker"))
                else "fuse"
            )
            desc = f"{kind} {rating:g} A" if rating is not None else kind
        key = (
            "disconnect"
            if kind == "disconnect"
            else f"{'-'.join(kind.split())}:{rating:g} A"
            if rating is not None
            else kind
        )
        out.append(
            (
                "Protection",
                desc,
                float(n),
                desc[:40],
                "each",
                (item, 1.0, key),
                (kind, rating or 0.0),
            )
        )
    return out


def entries(parts: KitParts, prices: PriceList | None = None) -> list[_Entry]:
    """Everything one system of these parts needs, with how each is priced."""
    out: list[_Entry] = [
        (
            "PV module",
            f"{parts.module_name}, {parts.module_pmax_w:g} W",
            float(parts.module_count),
            f"PV module {parts.module_pmax_w:g} W",
            "each",
            ("module", parts.module_pmax_w, f"module:{parts.module_name}"),
            (parts.module_pmax_w,),
        ),
        (
            "Battery unit",
            f"{parts.battery_name}, {parts.battery_unit_v:g} V {parts.battery_unit_ah:g} Ah",
            float(parts.unit_count),
            f"Battery {parts.battery_unit_v:g} V {parts.battery_unit_ah:g} Ah "
            f"{parts.battery_chemistry}",
            "each",
            (
                prices.battery_item(parts.battery_chemistry) if prices else "battery",
                parts.battery_unit_v * parts.battery_unit_ah / 1000.0,
                f"battery:{parts.battery_name}",
            ),
            (parts.battery_unit_v * parts.battery_unit_ah,),
        ),
        (
            "Charge controller",
            f"{parts.controller_type.upper()} {parts.controller_current_a:g} A",
            float(parts.controller_count),
            f"Controller {parts.controller_type.upper()} {parts.controller_current_a:g} A",
            "each",
            (
                f"controller_{parts.controller_type}",
                parts.controller_current_a,
                f"controller:{parts.controller_type.upper()} {parts.controller_current_a:g} A",
            ),
            (parts.controller_type, parts.controller_current_a),
        ),
    ]
    if parts.inverter_w > 0:
        out.append(
            (
                "Inverter",
                f"{parts.inverter_w:g} W continuous, {parts.inverter_surge_w:g} W surge",
                1.0,
                f"Inverter {parts.inverter_w:g} W",
                "each",
                ("inverter", parts.inverter_w, f"inverter:{parts.inverter_w:g} W"),
                (parts.inverter_w,),
            )
        )
    out += _cable_entries(parts.cables, prices)
    out += _device_entries(parts.devices, prices)
    if prices is not None and prices.has("system_fixed"):
        out.append(
            (
                "Installation",
                "mounting, cable, protection and installation of one system",
                1.0,
                "Installation of one system",
                "each",
                ("system_fixed", 1.0, None),
                (),
            )
        )
    return out


def part_list(parts: KitParts, prices: PriceList | None = None) -> list[tuple[str, str, float]]:
    """(category, description, quantity per system) of one bill of parts."""
    return [(e[0], e[1], e[2]) for e in entries(parts, prices)]


def _price(prices: PriceList | None, how: tuple[str, float, str | None] | None) -> float | None:
    if prices is None or how is None:
        return None
    item, capacity, key = how
    if key is not None:
        found = prices.part_price(key)
        if found is not None:
            return found
    if not prices.has(item):
        return None
    return float(prices.price(item, capacity))


def procurement_totals(
    standard: Standardisation,
    candidates: list[Candidate],
    prices: PriceList | None,
    labels: dict[int, str] | None = None,
) -> Totals:
    """Totals by part over every kit and own system of a standardisation.

    ``labels`` maps a candidate's ``index`` to the name shown for its own system (its id).
    """
    by_index = {c.index: c for c in candidates}
    sources: list[SourceParts] = []
    qty: dict[tuple[str, str], float] = {}
    meta: dict[tuple[str, str], tuple[str, str, float | None, tuple]] = {}

    def add(name: str, items: list[_Entry], systems: int, unit_cost: float | None) -> None:
        sources.append(
            SourceParts(name, systems, tuple((e[0], e[1], e[2]) for e in items), unit_cost)
        )
        for cat, desc, n, label, unit, how, sort in items:
            key = (cat, desc)
            if key not in qty:
                qty[key] = 0.0
                meta[key] = (label, unit, _price(prices, how), sort)
            qty[key] += n * systems

    for kit in standard.kits:
        add(f"Kit {kit.name}", entries(kit.parts, prices), kit.systems, kit.unit_cost)
    own_systems = 0
    house_c: list[Cable] = []
    house_v: list[Protection] = []
    for a in standard.assignments:
        c = by_index[a.index]
        if c.count <= 0 or (a.kit is None and not a.own_system):
            continue
        if a.own_system:
            own_systems += c.count
            add(
                (labels or {}).get(a.index, str(a.index)),
                entries(parts_of(c.design), prices),
                c.count,
                a.unit_cost,
            )
        house_c += _times([x for x in c.design.cables if x.house], c.count)
        house_v += [
            Protection(v.location, v.kind, v.rating_a, v.count * c.count, True)
            for v in c.design.devices
            if v.house
        ]
    if house_c or house_v:
        add(
            "DC load circuits of each home",
            _cable_entries(house_c, prices) + _device_entries(house_v, prices),
            1,
            None,
        )
    extra: list[tuple[str, str, str, float, float | None]] = []
    if prices is not None and own_systems and prices.has("one_off"):
        extra.append(
            (
                "Design",
                "one-off design and separate purchase of a system of its own",
                "Own-system overhead",
                float(own_systems),
                prices.optional("one_off"),
            )
        )
    n_kits = len(standard.kits)
    if n_kits and standard.kit_type_cost > 0:
        extra.append(
            (
                "Kit types",
                "setting up one standard kit type (tender, stock, training)",
                "Kit type set-up",
                float(n_kits),
                standard.kit_type_cost,
            )
        )
    rank = {c: i for i, c in enumerate(CATEGORY_ORDER)}
    order = sorted(qty, key=lambda k: (rank.get(k[0], 99), meta[k][3], k[1]))
    lines = []
    for key in order:
        label, unit, price, _ = meta[key]
        q = qty[key]
        if unit == "m":
            q = float(math.ceil(q - 1e-9))  # whole metres to buy
        lines.append(
            PartLine(key[0], key[1], label, q, unit, price, None if price is None else price * q)
        )
    for cat, desc, label, n, price in extra:
        lines.append(
            PartLine(cat, desc, label, n, "each", price, None if price is None else price * n)
        )
    total = None
    if prices is not None:
        total = float(sum(line.cost for line in lines if line.cost is not None))
    unpriced = tuple(line.label for line in lines if prices is not None and line.cost is None)
    systems = sum(s.systems for s in sources if s.name != "DC load circuits of each home")
    return Totals(
        tuple(lines), tuple(sources), total, prices.currency if prices else "", systems, unpriced
    )


def _times(cables: list[Cable], n: int) -> list[Cable]:
    return [
        Cable(c.key, c.run, c.material, c.size, c.area_mm2, c.metres * n, c.house) for c in cables
    ]


__all__ = [
    "PartLine",
    "RowDesign",
    "SourceParts",
    "Totals",
    "entries",
    "part_list",
    "procurement_totals",
]
