"""Price list CSV for community planning: capacity-based unit prices.

Columns ``item, basis, unit_price, currency`` and an optional ``note``::

    item,basis,unit_price,currency,note
    module,per_w,0.40,USD,PV module per watt-peak
    battery,per_kwh,260,USD,battery unit per kWh nominal
    controller_pwm,per_a,1.20,USD,
    controller_mppt,per_a,5.50,USD,
    inverter,per_w,0.30,USD,
    system_fixed,each,45,USD,"mounting, cable, fuses and installation of one system"
    one_off,each,350,USD,"design and separate purchase of a system with its own design"
    kit_type,each,900,USD,"adding one more standard kit type (tender, stock, training)"

Prices are per unit of capacity (W, kWh, A) so one list prices kits of any size.
``battery_<chemistry>`` (flooded, agm, gel, lifepo4) prices one chemistry apart from
the general ``battery`` row.  Optional: ``cable_copper`` / ``cable_aluminium`` per metre
per mm2 of conductor (``per_mm2_m``) or per metre of any size (``per_m``), and ``fuse``,
``breaker`` (for a "fuse or breaker" location; ``fuse`` when absent) and ``disconnect``
each.
Every row names one currency.  Unknown items and bases are errors with the line.

The parts' price list (:mod:`offgrid.economics.prices`; columns ``part, unit_price``; keys such as
``module:<name>``, ``battery:<name>``, ``controller:MPPT 50 A``, ``inverter:800 W``,
``cable:copper 6 mm2``, ``fuse:10 A``) is read too, and a shared project's
``[[prices]]`` are used when the survey names no price list.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from offgrid.economics.prices import (
    PriceListError,
    price_for,
    read_price_csv,
    read_price_table,
)
from offgrid.numbers import MAX_PRICE, NumberError, read_number

#: item -> allowed bases
ITEMS: dict[str, tuple[str, ...]] = {
    "module": ("per_w", "each"),
    "battery": ("per_kwh", "each"),
    "battery_flooded": ("per_kwh", "each"),
    "battery_agm": ("per_kwh", "each"),
    "battery_gel": ("per_kwh", "each"),
    "battery_lifepo4": ("per_kwh", "each"),
    "controller_pwm": ("per_a", "each"),
    "controller_mppt": ("per_a", "each"),
    "inverter": ("per_w", "each"),
    "system_fixed": ("each",),
    "one_off": ("each",),
    "kit_type": ("each",),
    "cable_copper": ("per_mm2_m", "per_m"),
    "cable_aluminium": ("per_mm2_m", "per_m"),
    "fuse": ("each",),
    "breaker": ("each",),
    "disconnect": ("each",),
}
OPTIONAL_ITEMS = (
    "system_fixed",
    "one_off",
    "kit_type",
    "cable_copper",
    "cable_aluminium",
    "fuse",
    "breaker",
    "disconnect",
)


@dataclass(frozen=True)
class PriceList:
    entries: dict[str, tuple[str, float]]  # item -> (basis, unit price)
    currency: str
    source: str = ""
    demo: bool = False
    notes: dict[str, str] = field(default_factory=dict)
    #: per-part prices in the report's format (``module:<name>``, ``controller:MPPT 50 A``,
    #: ``cable:copper 6 mm2``, ``fuse:10 A``...), looked up first; see offgrid.economics.prices
    parts: tuple = ()

    def has(self, item: str) -> bool:
        return item in self.entries

    def part_price(self, key: str) -> float | None:
        """Unit price of a part by its bill-of-materials key, or None."""
        if not self.parts:
            return None
        return price_for(key, list(self.parts))

    def price(self, item: str, capacity, count=1, key=None):
        """Price of ``count`` parts of the given capacity (W, kWh or A by the item's basis).

        ``key`` (a part key, or a function of the capacity giving one) is looked up in the
        per-part prices first.  Vectorised over ``capacity`` and ``count``.  Raises
        PriceListError if the part has no price.
        """
        cap = np.asarray(capacity, dtype=float)
        if key is not None and self.parts:
            flat = np.atleast_1d(cap)
            found = {}
            for v in np.unique(flat):
                found[float(v)] = self.part_price(key(float(v)) if callable(key) else key)
            if all(p is not None for p in found.values()):
                each = np.array([found[float(v)] for v in flat]).reshape(cap.shape)
                return each * np.asarray(count, dtype=float)
            if item not in self.entries:
                missing = next(
                    key(v) if callable(key) else key for v, p in found.items() if p is None
                )
                raise PriceListError(
                    f"{self.source or 'price list'}: no price for "
                    f"'{missing}'; add it (or a '{missing.split(':')[0]}' row)"
                )
        if item not in self.entries:
            raise PriceListError(
                f"{self.source or 'price list'}: no price for '{item}'; add a "
                f"row '{item},{ITEMS[item][0]},PRICE,{self.currency}'"
            )
        basis, unit = self.entries[item]
        each = np.full_like(cap, unit) if basis in ("each", "per_m") else cap * unit
        return each * np.asarray(count, dtype=float)

    def battery_item(self, chemistry: str) -> str:
        """``battery_<chemistry>`` when the list prices that chemistry, else ``battery``."""
        item = f"battery_{chemistry}"
        return item if item in self.entries else "battery"

    def optional(self, item: str) -> float:
        """Price of an optional per-system or per-type item; 0 when the list has none."""
        return self.entries[item][1] if item in self.entries else 0.0

    def basis_text(self, item: str) -> str:
        basis, unit = self.entries[item]
        per = {
            "per_w": "per W",
            "per_kwh": "per kWh",
            "per_a": "per A",
            "each": "each",
            "per_m": "per m",
            "per_mm2_m": "per mm2 per m",
        }[basis]
        return f"{unit:g} {self.currency} {per}"


def price_list_data(prices: PriceList | None) -> dict | None:
    """A price list as plain JSON data (read back by :func:`price_list_from_data`)."""
    if prices is None:
        return None
    return {
        "entries": {k: list(v) for k, v in prices.entries.items()},
        "currency": prices.currency,
        "source": prices.source,
        "demo": prices.demo,
        "notes": dict(prices.notes),
        "parts": [[p.part, p.unit_price, p.note] for p in prices.parts],
    }


def price_list_from_data(data: dict | None) -> PriceList | None:
    """The price list of :func:`price_list_data`'s data (a plan JSON's ``price_list``)."""
    from offgrid.project.model import PriceItem

    if data is None:
        return None
    return PriceList(
        {k: (v[0], v[1]) for k, v in data["entries"].items()},
        data["currency"],
        data["source"],
        data["demo"],
        dict(data["notes"]),
        tuple(PriceItem(*p) for p in data["parts"]),
    )


def from_part_prices(items, currency: str, source: str) -> PriceList:
    """A price list of per-part prices only (the report's ``part, unit_price`` format)."""
    return PriceList({}, currency, source, "demo" in source.lower(), {}, tuple(items))


def read_prices_csv(text: str, source: str = "price list", currency: str = "USD") -> PriceList:
    """Parse a price list; raises :class:`PriceListError` listing every problem with its line.

    The plan's column map over :func:`offgrid.economics.prices.read_price_table`.  A CSV
    with a ``part`` column is read as the parts' price list
    (:func:`offgrid.economics.prices.read_price_csv`), in ``currency``.
    """
    table = read_price_table(text)
    header = [h.strip().lower() for h in table.names]
    if "part" in header and "item" not in header:
        return from_part_prices(read_price_csv(text, source), currency, source)
    problems: list[str] = []
    need = ("item", "basis", "unit_price", "currency")
    missing = [c for c in need if c not in header]
    if missing:
        raise PriceListError(
            f"{source}: line 1: missing column(s) {', '.join(missing)}; the "
            f"header is {','.join(need)},note"
        )
    entries: dict[str, tuple[str, float]] = {}
    notes: dict[str, str] = {}
    currencies: set[str] = set()
    for line, cells in table.records:
        if not any(cells.values()) or cells.get("item", "").startswith("#"):
            continue
        item, basis = cells.get("item", "").lower(), cells.get("basis", "").lower()
        if item not in ITEMS:
            problems.append(f"line {line}: unknown item '{item}'; items are {', '.join(ITEMS)}")
            continue
        if basis not in ITEMS[item]:
            problems.append(
                f"line {line}: {item} is priced {' or '.join(ITEMS[item])}, not '{basis}'"
            )
            continue
        raw = cells.get("unit_price", "")
        try:
            price = read_number(raw)
        except NumberError as exc:
            problems.append(f"line {line}: unit_price {exc}")
            continue
        if price < 0:
            problems.append(f"line {line}: unit_price {raw} must be 0 or more")
            continue
        if price > MAX_PRICE:
            problems.append(
                f"line {line}: unit_price {raw} is out of range; a price must be 0 "
                f"or more and at most {MAX_PRICE:,.0f}"
            )
            continue
        if item in entries:
            problems.append(f"line {line}: {item} is priced twice; keep one row")
            continue
        cur = cells.get("currency", "")
        if not cur:
            problems.append(f"line {line}: currency is blank")
            continue
        currencies.add(cur)
        entries[item] = (basis, price)
        notes[item] = cells.get("note", "")
    if len(currencies) > 1:
        problems.append(
            f"more than one currency ({', '.join(sorted(currencies))}): convert the prices to one"
        )
    if problems:
        raise PriceListError(f"{source}: {len(problems)} problem(s)\n  " + "\n  ".join(problems))
    if not entries:
        raise PriceListError(f"{source}: no prices; add rows such as 'module,per_w,0.4,USD'")
    demo = "demo" in source.lower() or any("demonstration" in n.lower() for n in notes.values())
    return PriceList(entries, currencies.pop(), source, demo, notes)


def load_prices(path: str | Path, currency: str = "USD") -> PriceList:
    from offgrid.textfile import TextFileError, read_text

    p = Path(path)
    try:
        text = read_text(p)
    except TextFileError as exc:
        raise PriceListError(f"price list {p}: {exc}") from None
    return read_prices_csv(text, str(p), currency)
