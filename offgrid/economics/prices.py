"""Price lists: one reader, one error, the part-key rules.

Two layouts of CSV price list are read by one core reader (:func:`read_price_table`,
line numbers and cells) with a column map each:

* the parts' list, ``part, unit_price[, note]``, one price per bill-of-materials key
  (``module:<name>``, ``controller:MPPT 50 A``, ``cable:copper 6 mm2``...), looked up
  most specific key first (:func:`price_keys`): :func:`read_price_csv`;
* the plan's list, ``item, basis, unit_price, currency[, note]``, prices per unit of
  capacity for many kits: :func:`offgrid.plan.prices.read_prices_csv` (which hands a
  parts' list to :func:`read_price_csv`).

Both raise :class:`PriceListError` with the line and the fix.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from offgrid.numbers import MAX_PRICE, PRICE_RANGE, NumberError, read_number
from offgrid.project.model import PriceItem
from offgrid.safetext import csv_cell, csv_uncell, printable

if TYPE_CHECKING:
    from offgrid.economics.bom import BomLine


class PriceListError(ValueError):
    """A price list (CSV) cannot be read; the message names the line and the fix."""


@dataclass(frozen=True)
class PriceTable:
    """A price list's CSV as read: the header as written and the records with their lines."""

    names: list[str]
    #: (line the record starts on, lower-case column name -> stripped cell)
    records: list[tuple[int, dict[str, str]]]


def price_keys(key: str) -> list[str]:
    """Keys tried for a part, most specific first: ``controller:MPPT 50 A``,
    ``controller:MPPT 50``, ``controller:MPPT``, ``controller``."""
    kind, _, detail = key.partition(":")
    words = detail.split()
    keys = [f"{kind}:{' '.join(words[:n])}" for n in range(len(words), 0, -1)]
    if detail and detail.strip() != " ".join(words):
        keys.insert(0, key)
    return [*keys, kind]


def price_for(key: str, prices: list[PriceItem]) -> float | None:
    """Unit price of a part: the most specific price-list key that matches (see price_keys)."""
    table = {p.part.strip(): float(p.unit_price) for p in prices}
    for k in price_keys(key):
        if k in table:
            return table[k]
    return None


def read_price_table(text: str) -> PriceTable:
    """The one CSV reader under every price list: header and records with their lines.

    A leading byte-order mark is dropped and spaces after a comma are skipped (so
    ``a, "b, c"`` is two cells).  Each record keeps the line of the file it starts
    on (the header is line 1; blank lines and line breaks inside quoted cells
    count); completely blank lines are left out.  Cells are stripped and keyed by
    the lower-case column name; a short record reads the missing cells as blank and
    cells beyond the header are dropped.
    """
    reader = csv.reader(io.StringIO(text.lstrip("\ufeff")), skipinitialspace=True)
    names = next(reader, [])
    keys = [n.strip().lower() for n in names]
    records: list[tuple[int, dict[str, str]]] = []
    for row in reader:
        if not row:
            continue
        start = reader.line_num - sum(cell.count("\n") for cell in row)
        cells = [c.strip() for c in row] + [""] * max(0, len(keys) - len(row))
        records.append((start, dict(zip(keys, cells, strict=False))))
    return PriceTable(names, records)


#: names accepted for the parts' list's price column
PART_PRICE_COLUMNS = ("unit_price", "unit price", "price")


def read_price_csv(text: str, source: str = "price list") -> list[PriceItem]:
    """The parts' price list: columns ``part`` and ``unit_price`` (``note`` optional).

    A column map over :func:`read_price_table`.  Blank prices are skipped (a template
    not yet filled in); a price that is not a number, zero or negative is refused with
    the row (the file's line) and column named.
    """
    table = read_price_table(text)
    cols = {n.strip().lower() for n in table.names}
    price_col = next((c for c in PART_PRICE_COLUMNS if c in cols), None)
    if "part" not in cols or price_col is None:
        raise PriceListError(
            f"{source}: needs the columns 'part' and 'unit_price' (found: "
            f"{', '.join(table.names) or 'none'})"
        )
    items: list[PriceItem] = []
    seen: dict[str, int] = {}
    for n, cells in table.records:
        part = csv_uncell(cells.get("part", ""))
        raw = cells.get(price_col, "")
        if not part and not raw:
            continue
        if not part:
            raise PriceListError(f"{source}: row {n}: the part column is empty")
        if not raw:
            continue
        try:
            price = read_number(raw)
        except NumberError as exc:
            raise PriceListError(
                f"{source}: row {n}, unit_price: {exc} (part '{printable(part)}')"
            ) from None
        if price <= 0:
            raise PriceListError(
                f"{source}: row {n}, unit_price: {raw} for '{printable(part)}': "
                "a price must be above zero; leave it blank if the part is not "
                "bought"
            )
        if price > MAX_PRICE:
            raise PriceListError(
                f"{source}: row {n}, unit_price: {raw} for '{printable(part)}' "
                f"is out of range; {PRICE_RANGE}"
            )
        if part in seen:
            raise PriceListError(
                f"{source}: row {n}: '{part}' is priced twice (also row {seen[part]})"
            )
        seen[part] = n
        items.append(PriceItem(part=part, unit_price=price, note=csv_uncell(cells.get("note", ""))))
    return items


def load_price_csv(path: str | Path) -> list[PriceItem]:
    """A price list file read with :func:`offgrid.textfile.read_text` (regular files only)."""
    from offgrid.textfile import TextFileError, read_text

    try:
        text = read_text(path)
    except TextFileError as exc:
        raise PriceListError(f"{path}: {exc}") from None
    return read_price_csv(text, str(path))


def merge_prices(old: list[PriceItem], new: list[PriceItem]) -> list[PriceItem]:
    """The old price list with the new lines replacing those of the same part."""
    by_part = {p.part: p for p in old}
    for p in new:
        by_part[p.part] = p
    return list(by_part.values())


def price_template_csv(bom: tuple[BomLine, ...], prices: list[PriceItem]) -> str:
    """A CSV of every BOM part with its current price (blank where none), to fill in."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["part", "unit_price", "unit", "description", "note"])
    listed = set()
    notes = {p.part: p.note for p in prices}
    for ln in bom:
        p = price_for(ln.key, prices)
        w.writerow(
            [
                csv_cell(ln.key),
                "" if p is None else f"{p:g}",
                ln.unit,
                csv_cell(printable(ln.description)),
                csv_cell(notes.get(ln.key, "")),
            ]
        )
        listed.add(ln.key)
    for p in prices:  # kind-wide prices and prices of parts not in this design
        if p.part not in listed:
            w.writerow([csv_cell(p.part), f"{p.unit_price:g}", "", "", csv_cell(p.note)])
    return buf.getvalue()
