"""Checks of the ``[[water]]`` inputs: ranges and hints from the catalogue's ``water[].``
rows (:mod:`offgrid.catalogue.water`) and the pump table's shape; each problem names the
field (``water[1].pump.flow_m3_h``) and the fix."""

from __future__ import annotations

import math
from itertools import pairwise

from offgrid.catalogue import inputs_under

ROW = "water[]."

MAX_SUPPLIES = 20


def _get(obj, dotted: str):
    for part in dotted.split("."):
        obj = getattr(obj, part)
    return obj


def _finite(x) -> bool:
    return isinstance(x, int | float) and not isinstance(x, bool) and math.isfinite(x)


def supply_problems(supply, where: str) -> list[tuple[str, str]]:
    out: list[tuple[str, str]] = []
    for f in inputs_under(ROW):
        if f.low is None or f.high is None:
            continue  # text, choices (the loader) and the pump table (below)
        field = f.path.removeprefix(ROW)
        value = _get(supply, field)
        path = f"{where}.{field}"
        values = value if isinstance(value, list) else [value]
        if field == "need_m3_day" and len(values) != 12:
            out.append((path, f"needs 12 monthly values, has {len(values)}; {f.hint}"))
            continue
        for v in values:
            if not _finite(v):
                out.append((path, f"'{v}' is not a finite number; {f.hint}"))
                break
            if not f.low <= v <= f.high:
                out.append((path, f"{v:g} is out of range; {f.hint}"))
                break
    if isinstance(supply.need_m3_day, list) and not any(
        _finite(v) and v > 0 for v in supply.need_m3_day
    ):
        out.append((f"{where}.need_m3_day", "every month is 0: type the daily water need"))
    p = supply.pump
    pw = f"{where}.pump"
    if p.min_input_v >= p.max_input_v:
        out.append((f"{pw}.min_input_v", "must be below max_input_v; check the datasheet"))
    heads, powers, table = p.head_points_m, p.power_points_w, p.flow_m3_h
    for name, pts in (("head_points_m", heads), ("power_points_w", powers)):
        if len(pts) < 2 or any(not _finite(v) or v < 0 for v in pts):
            out.append((f"{pw}.{name}", "needs at least two numbers 0 or more from the datasheet"))
        elif any(b <= a for a, b in pairwise(pts)):
            out.append((f"{pw}.{name}", "must rise from one point to the next"))
    shape_msg = (
        f"needs one row per head ({len(heads)}) with one flow per power ({len(powers)}), "
        "in m3/h from the datasheet"
    )
    if len(table) != len(heads) or any(len(row) != len(powers) for row in table):
        out.append((f"{pw}.flow_m3_h", shape_msg))
    elif any(not _finite(v) or v < 0 or v > 1000 for row in table for v in row):
        out.append((f"{pw}.flow_m3_h", "flows must be numbers 0-1000 m3/h"))
    if p.drive == "direct":
        vt = p.voltage_v
        if len(vt) != len(heads) or any(len(row) != len(powers) for row in vt):
            out.append(
                (
                    f"{pw}.voltage_v",
                    "a direct-drive pump "
                    + shape_msg.replace("flow", "voltage").replace("in m3/h", "in V"),
                )
            )
        elif any(not _finite(v) or v <= 0 or v > 1500 for row in vt for v in row):
            out.append((f"{pw}.voltage_v", "voltages must be numbers above 0 and up to 1500 V"))
    return out


def water_problems(project) -> list[tuple[str, str]]:
    """(path, message) of every problem of the project's water supplies."""
    out: list[tuple[str, str]] = []
    if len(project.water) > MAX_SUPPLIES:
        out.append(("water", f"more than {MAX_SUPPLIES} water supplies in one project"))
        return out
    for i, s in enumerate(project.water):
        out.extend(supply_problems(s, f"water[{i + 1}]"))
    return out
