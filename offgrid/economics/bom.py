"""Bill of materials: the quantity of every part, as it follows from the design.

Each line names the design figure it follows from, so a test (or a reader) can
check it: modules = modules in series x strings in parallel, battery units =
units in series x strings in parallel, controllers = the controller count,
one inverter when there are AC loads, cable by material and size from the
wiring schedule (two conductors per run, go and return, one-way length x 2,
rounded up to the whole metre), and the protective devices of the schedule.

Part keys are what the price list refers to: ``kind:detail``, the detail naming the
part (``module:<module name>``, ``battery:<battery name>``, ``controller:MPPT 50 A``,
``inverter:500 W``, ``cable:copper 6 mm2``, ``fuse:63 A``).  A price for the kind
alone (``cable``) covers every part of that kind without a price of its own.
"""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Iterable
from dataclasses import dataclass
from typing import Any

from offgrid.design.protection import Device
from offgrid.design.result import SystemDesign
from offgrid.design.wiring import WireChoice
from offgrid.project.model import Project
from offgrid.safetext import csv_row

#: Conductors per cable run: go and return of a two-wire DC or single-phase AC circuit.
CONDUCTORS_PER_RUN = 2


@dataclass(frozen=True)
class BomLine:
    key: str  # part key used by the price list
    description: str
    quantity: float
    unit: str  # "each" or "m"
    follows: str  # how the quantity follows from the design (formula in words)
    figure: str = ""  # dotted path of the design figure equal to the quantity, if one is

    @property
    def kind(self) -> str:
        return self.key.split(":", 1)[0]


def wires_of(design: SystemDesign) -> tuple[WireChoice, ...]:
    """The cable runs of a design's wiring schedule (none before the electrical step)."""
    return design.electrical.wires if design.electrical is not None else ()


def devices_of(design: SystemDesign) -> tuple[Device, ...]:
    """The protective devices of a design's schedule (none before the electrical step)."""
    return design.electrical.protection.devices if design.electrical is not None else ()


def kind_key(kind: str) -> str:
    """A device kind as a part-key word: ``'fuse or breaker' -> 'fuse-or-breaker'``."""
    return "-".join(str(kind).lower().split())


def _num(value: Any) -> str:
    return f"{value:g}" if isinstance(value, int | float) else str(value)


def bill_of_materials(project: Project, design: SystemDesign) -> tuple[BomLine, ...]:
    """Every part to buy, in the order of the energy path (array to loads)."""
    a, b, c, inv = design.array, design.battery, design.controller, design.inverter
    m = project.module
    lines = [
        BomLine(
            f"module:{m.name}",
            f"PV module {m.name}, {m.pmax_w:g} W STC, Vmp {m.vmp_v:g} V, "
            f"Voc {m.voc_v:g} V, Isc {m.isc_a:g} A",
            float(a.module_count),
            "each",
            f"{a.modules_series} in series x {a.modules_parallel} string(s) in parallel",
            "array.module_count",
        ),
    ]
    lines.append(
        BomLine(
            f"controller:{c.type.upper()} {c.current_a:g} A",
            f"{c.type.upper()} charge "
            f"controller, {c.current_a:g} A, PV input up to {c.max_pv_voltage_v:g} V, "
            f"{b.system_voltage_v} V battery",
            float(c.count),
            "each",
            "charge controllers needed for the array current",
            "controller.count",
        )
    )
    bs = project.battery
    lines.append(
        BomLine(
            f"battery:{bs.name}",
            f"Battery unit {bs.name}, {bs.nominal_voltage_v:g} V "
            f"{bs.capacity_ah:g} Ah {b.chemistry}",
            float(b.unit_count),
            "each",
            f"{b.units_series} in series x {b.units_parallel} string(s) in parallel",
            "battery.unit_count",
        )
    )
    stock_inv = _stock_inverter(project) if inv.needed else None
    if stock_inv is not None:
        lines.append(_stock_inverter_line(stock_inv, design))
    elif inv.needed:
        lines.append(
            BomLine(
                f"inverter:{inv.continuous_w:g} W",
                f"Inverter, {inv.continuous_w:g} W continuous, "
                f"{inv.surge_w:g} W surge, {b.system_voltage_v} V DC input",
                1.0,
                "each",
                "one inverter for the AC loads",
            )
        )
    lines += _protection_lines(design)
    lines += _cable_lines(wires_of(design))
    if project.generator is not None:  # the set, charger, changeover, fuel, exhaust, CO
        from offgrid.economics.generator_bom import generator_bom_lines

        lines += generator_bom_lines(project, design)
    if project.water:  # [[water]] supplies: pump, controller, drop cable, pipe, tank ...
        from offgrid.water.text import water_bom_lines

        lines += water_bom_lines(project)
    return tuple(lines)


def _stock_inverter(project: Project) -> dict | None:
    from offgrid.stock.project_parts import stock_inverter

    return stock_inverter(project)


def _stock_inverter_line(rec: dict, design: SystemDesign) -> BomLine:
    """The catalogue inverter the project took (``[stock.inverter]``), checked against the
    design's required continuous and surge power."""
    inv, v = design.inverter, design.battery.system_voltage_v
    ok = (
        rec["continuous_w"] + 1e-9 >= inv.required_continuous_w
        and rec["surge_w"] + 1e-9 >= inv.required_surge_w
        and int(rec["dc_voltage_v"]) == v
    )
    verdict = "covers" if ok else "DOES NOT cover (choose another inverter)"
    return BomLine(
        f"inverter:{rec['name']}",
        f"Inverter {rec['name']}, {rec['continuous_w']:g} W continuous, "
        f"{rec['surge_w']:g} W surge, {rec['dc_voltage_v']} V DC input",
        1.0,
        "each",
        f"catalogue inverter; {verdict} the required {inv.required_continuous_w:.0f} W "
        f"continuous and {inv.required_surge_w:.0f} W surge at {v} V",
        "inverter.required_continuous_w",
    )


def complete_bill_of_materials(project: Project, design: SystemDesign) -> tuple[BomLine, ...]:
    """Everything the crew packs: the main parts and the protection schedule of
    :func:`bill_of_materials`, the accessories of :mod:`offgrid.economics.accessories`
    and the cable with the project's allowance (``[stock] cable_allowance_pct``).
    Each line names its design figure or caution (``figure``)."""
    from dataclasses import replace

    from offgrid.economics.accessories import accessory_lines
    from offgrid.stock.project_parts import cable_allowance_pct, mounting

    allowance = cable_allowance_pct(project)
    figures = {"inverter": "inverter.continuous_w"}
    main = []
    for ln in bill_of_materials(project, design):
        if ln.kind == "cable":
            continue
        if not ln.figure:
            ln = replace(ln, figure=figures.get(ln.kind, "protection.devices.rating_a"))
        main.append(ln)
    extra = accessory_lines(project, design, mounting(project), allowance)
    cables = _cable_lines(wires_of(design), allowance)
    return (*main, *extra, *cables)


def _cable_lines(wires: Iterable[WireChoice], allowance_pct: float | None = None) -> list[BomLine]:
    """Cable by material and size: sum over runs of 2 x one-way length x number of runs.

    ``allowance_pct``: the complete kit's cutting allowance (common practice, no source),
    added and stated in each line, which then names its first run's length figure."""
    totals: dict[tuple[str, str], float] = {}
    runs: dict[tuple[str, str], list[str]] = {}
    first: dict[tuple[str, str], str] = {}
    for w in wires:
        key = (w.material, w.size)
        totals[key] = totals.get(key, 0.0) + w.length_m * CONDUCTORS_PER_RUN * w.count
        runs.setdefault(key, []).append(w.run)
        first.setdefault(key, f"wires.{w.key}.length_m")
    out = []
    for (material, size), metres in totals.items():
        if allowance_pct is None:
            qty = float(math.ceil(metres - 1e-9))
            how, figure = " (rounded up to the metre)", ""
        else:
            qty = float(math.ceil(metres * (1 + allowance_pct / 100.0) - 1e-9))
            how = (
                f" = {metres:g} m, + {allowance_pct:g} % allowance (common practice, no "
                "source), rounded up to the metre"
            )
            figure = first[(material, size)]
        out.append(
            BomLine(
                f"cable:{material} {size}",
                f"Cable, {material}, {size}",
                qty,
                "m",
                f"{CONDUCTORS_PER_RUN} conductors x one-way length of: "
                + ", ".join(runs[(material, size)])
                + how,
                figure,
            )
        )
    return out


def _protection_lines(design: SystemDesign) -> list[BomLine]:
    """Fuses, breakers and disconnects of the protection schedule, grouped by kind and rating."""
    devices = devices_of(design)
    grouped: dict[str, list[Device]] = {}
    order: list[str] = []
    for d in devices:
        kind = kind_key(d.kind)
        rating = d.rating_a
        volt = d.voltage_v
        detail = f"{_num(rating)} A" if rating is not None else ""
        if volt:
            detail += f" {math.ceil(float(volt) - 1e-9)} V"
        key = f"{kind}:{detail.strip()}" if detail.strip() else kind
        if key not in grouped:
            order.append(key)
        grouped.setdefault(key, []).append(d)
    out = []
    for key in order:
        items = grouped[key]
        qty = float(sum(d.count for d in items))
        where = ", ".join(d.location for d in items)
        kind, _, detail = key.partition(":")
        desc = f"{kind.replace('-', ' ').capitalize()} {detail}".strip()
        if detail.endswith(" V"):
            amps, _, volts = detail.rpartition(" ")[0].rpartition(" ")
            desc = (
                f"{kind.replace('-', ' ').capitalize()} {amps}".strip() + f", at least {volts} V DC"
            )
        out.append(BomLine(key, desc, qty, "each", f"protection schedule: {where}"))
    return out


def bom_csv(
    lines: Iterable[BomLine], prices: dict[str, float] | None = None, currency: str = ""
) -> str:
    """The bill of materials as CSV (comma separated, header row, one part a row)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    head = ["part", "description", "quantity", "unit", "follows from"]
    if prices is not None:
        head += [
            f"unit price ({currency})".replace(" ()", ""),
            f"total ({currency})".replace(" ()", ""),
        ]
    w.writerow(csv_row(head))
    for ln in lines:
        row = csv_row([ln.key, ln.description, f"{ln.quantity:g}", ln.unit, ln.follows])
        if prices is not None:
            p = prices.get(ln.key)
            row += ["", ""] if p is None else [f"{p:.2f}", f"{p * ln.quantity:.2f}"]
        w.writerow(row)
    return buf.getvalue()
