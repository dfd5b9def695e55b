"""The complete bill of materials priced from the project's price list, in its currency,
and, for what that list does not price, from a catalogue's cables and protective devices.

Catalogue matches: a cable of the same material and size; a fuse or breaker of exactly
the schedule's rating (a larger one would not protect the conductor) and at least its
DC voltage; a disconnect of at least the rating and voltage; a surge protector of at
least the voltage.  The cheapest match wins; its price is converted to the project's
currency (:mod:`offgrid.stock.money`) or the line stays unpriced.

A line without a price keeps blank price cells and is counted and listed; the total
then says it is incomplete and how many lines it leaves out (never a silent zero).
"""

from __future__ import annotations

import csv
import io
import re

from offgrid.design.result import SystemDesign
from offgrid.economics.bom import complete_bill_of_materials
from offgrid.economics.prices import price_for
from offgrid.project.model import Project
from offgrid.safetext import csv_row

#: bill-of-materials kind -> catalogue device kinds that may serve it
DEVICE_KINDS = {
    "fuse": ("fuse",),
    "fuse-or-breaker": ("breaker", "fuse"),
    "disconnect": ("disconnect", "breaker"),
    "surge-protector": ("surge protector",),
}
_AMPS = re.compile(r"(\d+(?:\.\d+)?) A\b")
_VOLTS = re.compile(r"(\d+(?:\.\d+)?) V\b")


def _fits(kind: str, key: str, part) -> bool:
    detail = key.partition(":")[2]
    amps = _AMPS.search(detail)
    volts = _VOLTS.search(detail)
    s = part.spec
    if volts and s["voltage_v"] + 1e-9 < float(volts.group(1)):
        return False
    if kind == "surge-protector":
        return True
    if amps is None or s["rating_a"] is None:
        return False
    need = float(amps.group(1))
    if kind == "disconnect" and s["kind"] == "disconnect":
        return s["rating_a"] + 1e-9 >= need
    return abs(s["rating_a"] - need) < 1e-9


def catalogue_prices(lines, catalogue, currency: str, rate_sets) -> dict[str, tuple[float, str]]:
    """Unit prices from the catalogue's cables and devices, key -> (price, catalogue name)."""
    from offgrid.stock.choose import price_in

    out: dict[str, tuple[float, str]] = {}
    for ln in lines:
        if ln.kind == "cable":
            material, _, size = ln.key.partition(":")[2].partition(" ")
            cands = [
                p
                for p in catalogue.of("cables")
                if p.spec["material"] == material and p.spec["size"].lower() == size.lower()
            ]
        elif ln.kind in DEVICE_KINDS:
            cands = [
                p
                for p in catalogue.of("devices")
                if p.spec["kind"] in DEVICE_KINDS[ln.kind] and _fits(ln.kind, ln.key, p)
            ]
        else:
            continue
        priced = [(v, p.name) for p in cands if (v := price_in(p, currency, *rate_sets)[0])]
        if priced:
            out[ln.key] = min(priced)
    return out


def priced_bom_csv(project: Project, design: SystemDesign, catalogue=None) -> tuple[str, list[str]]:
    """(CSV of the complete bill of materials with prices and a total row, unpriced keys).

    ``catalogue``: a :class:`~offgrid.stock.catalogue.Catalogue` whose cables and devices
    price the lines the project's price list leaves open."""
    cur = project.economics.currency
    lines = complete_bill_of_materials(project, design)
    stock: dict[str, tuple[float, str]] = {}
    if catalogue is not None:
        from offgrid.stock.choose import rate_sets_for

        rates, _ = rate_sets_for(project, catalogue)
        stock = catalogue_prices(lines, catalogue, cur, rates)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(
        csv_row(
            [
                "part",
                "description",
                "quantity",
                "unit",
                "why (design figure or caution)",
                "figure",
                f"unit price ({cur})",
                f"total ({cur})",
                "price from",
            ]
        )
    )
    from offgrid.economics.generator_bom import bom_prices

    table = bom_prices(project)
    total = 0.0
    missing: list[str] = []
    for ln in lines:
        p = price_for(ln.key, table)
        source = "project price list"
        if p is not None and price_for(ln.key, project.prices) is None:
            source = "generator.price"
        if p is None and ln.key in stock:
            p, name = stock[ln.key]
            source = f"catalogue: {name}"
        cells = [ln.key, ln.description, f"{ln.quantity:g}", ln.unit, ln.follows, ln.figure]
        if p is None:
            missing.append(ln.key)
            cells += ["", "", "no price"]
        else:
            total += p * ln.quantity
            cells += [f"{p:.2f}", f"{p * ln.quantity:.2f}", source]
        w.writerow(csv_row(cells))
    label = (
        "total of the priced lines"
        if not missing
        else f"INCOMPLETE total: {len(missing)} line(s) without a price left out"
    )
    w.writerow(csv_row(["total", label, "", "", "", "", "", f"{total:.2f}", ""]))
    return buf.getvalue(), missing
