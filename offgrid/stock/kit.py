"""The complete bill of materials priced from the project's price list, in its currency.

A line without a price keeps blank price cells and is counted and listed; the total
then says it is incomplete and how many lines it leaves out (never a silent zero).
"""

from __future__ import annotations

import csv
import io

from offgrid.design.result import SystemDesign
from offgrid.economics.bom import complete_bill_of_materials
from offgrid.economics.prices import price_for
from offgrid.project.model import Project
from offgrid.safetext import csv_row


def priced_bom_csv(project: Project, design: SystemDesign) -> tuple[str, list[str]]:
    """(CSV of the complete bill of materials with prices and a total row, unpriced keys)."""
    cur = project.economics.currency
    lines = complete_bill_of_materials(project, design)
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
            ]
        )
    )
    total = 0.0
    missing: list[str] = []
    for ln in lines:
        p = price_for(ln.key, project.prices)
        cells = [ln.key, ln.description, f"{ln.quantity:g}", ln.unit, ln.follows, ln.figure]
        if p is None:
            missing.append(ln.key)
            cells += ["", ""]
        else:
            total += p * ln.quantity
            cells += [f"{p:.2f}", f"{p * ln.quantity:.2f}"]
        w.writerow(csv_row(cells))
    label = (
        "total of the priced lines"
        if not missing
        else f"INCOMPLETE total: {len(missing)} line(s) without a price left out"
    )
    w.writerow(csv_row(["total", label, "", "", "", "", "", f"{total:.2f}"]))
    return buf.getvalue(), missing
