"""What every returned design must satisfy, whatever the (valid) input.

Shared by the property-based fuzz test and the sweep over the bundled load lists and
climates.  Each check is a fact of the method or of the code, not a recomputation.
"""

from __future__ import annotations

import math

from offgrid.design.result import SystemDesign

#: The chosen controller's harvest may fall this far short before modules are added
#: (offgrid.design.sizing.HARVEST_SHORTFALL_TOLERANCE_PCT), plus rounding.
HARVEST_TOL = 0.006


def _walk(value, path=""):
    if isinstance(value, dict):
        for k, v in value.items():
            yield from _walk(v, f"{path}.{k}" if path else str(k))
    elif isinstance(value, list):
        for i, v in enumerate(value):
            yield from _walk(v, f"{path}[{i}]")
    else:
        yield path, value


def design_problems(d: SystemDesign) -> list[str]:
    """Every broken invariant of a design, as text (empty when it is sound)."""
    out: list[str] = []
    data = d.to_dict()
    for path, v in _walk(data):
        if isinstance(v, float) and not math.isfinite(v):
            out.append(f"{path} is not finite")
    a, b, c, inv, ld, s = d.array, d.battery, d.controller, d.inverter, d.loads, d.site
    m = s.design_month - 1
    for name, v in (
        ("array.power_w", a.power_w),
        ("array.module_count", a.module_count),
        ("battery.capacity_ah", b.capacity_ah),
        ("battery.nominal_kwh", b.nominal_kwh),
        ("battery.usable_kwh", b.usable_kwh),
        ("battery.unit_count", b.unit_count),
        ("controller.current_a", c.current_a),
        ("controller.count", c.count),
    ):
        if not v > 0:
            out.append(f"{name} = {v} is not positive")
    if a.module_count != a.modules_series * a.modules_parallel:
        out.append("array.module_count is not series x parallel")
    if not math.isclose(a.power_w, a.module_count * a.module_power_w, rel_tol=1e-9):
        out.append("array.power_w is not module count x module power")
    if a.power_w < a.required_power_w * (1 - 1e-9):
        out.append(f"array.power_w {a.power_w} below required {a.required_power_w}")
    if b.capacity_ah < b.required_ah * (1 - 1e-9):
        out.append(f"battery.capacity_ah {b.capacity_ah} below required {b.required_ah}")
    cover = [
        sup / dem if dem > 0 else math.inf
        for sup, dem in zip(a.supply_wh_day, ld.daily_energy_wh, strict=True)
    ]
    for i, c_i in enumerate(cover):
        if c_i < 1 - 1e-9:
            out.append(
                f"supply {a.supply_wh_day[i]:.1f} < demand {ld.daily_energy_wh[i]:.1f} "
                f"Wh/day in month {i + 1}"
            )
    if cover[m] > min(cover) * (1 + 1e-9):
        out.append(
            f"design month {m + 1} is not the least-covered month ({cover.index(min(cover)) + 1})"
        )
    if d.electrical is not None:
        h = d.electrical.harvest
        eta = a.derates["battery round trip"]
        for chosen, dem in zip(h.chosen_wh_day, ld.daily_energy_wh, strict=True):
            if chosen * eta < dem * (1 - HARVEST_TOL) and not any(
                n.code == "harvest-shortfall" for n in d.warnings
            ):
                out.append(f"harvest {chosen:.1f} x {eta:.2f} < demand {dem:.1f} with no warning")
    if c.current_a * (1 + 1e-9) < c.required_current_a / c.count:
        out.append(
            f"controller {c.current_a} A < required {c.required_current_a:.2f} A / {c.count}"
        )
    if inv.needed:
        if inv.surge_w < inv.required_surge_w * (1 - 1e-9):
            out.append(f"inverter surge {inv.surge_w} < required {inv.required_surge_w}")
        if inv.continuous_w < inv.required_continuous_w * (1 - 1e-9):
            out.append(f"inverter {inv.continuous_w} < required {inv.required_continuous_w}")
        if not inv.dc_input_current_a > 0:
            out.append("inverter.dc_input_current_a not positive")
        if inv.continuous_w < ld.peak_ac_w * (1 - 1e-9):
            out.append(
                f"inverter {inv.continuous_w} W below the AC power on at once {ld.peak_ac_w} W"
            )
        if inv.required_surge_w < ld.peak_ac_w * (1 - 1e-9):
            out.append("inverter surge need below the AC power on at once")
    if d.electrical is not None:
        for w in data.get("wires", []):  # the drop recomputes from the shown figures
            drop = 200 * w["length_m"] * w["drop_current_a"] * w["resistance_ohm_km"] / 1000
            if not math.isclose(
                drop / w["voltage_v"], w["drop_pct"], rel_tol=1e-5, abs_tol=1e-4
            ):  # JSON rounds to 6 decimals
                out.append(f"wire {w['run']}: drop does not recompute from drop_current_a")
        for w in d.electrical.wires:
            if w.drop_pct > w.drop_limit_pct + 1e-9:
                out.append(
                    f"wire {w.run}: drop {w.drop_pct:.2f} % over its limit {w.drop_limit_pct} %"
                )
            if w.ampacity_a < 1.25 * w.current_a - 1e-9:
                out.append(f"wire {w.run}: ampacity {w.ampacity_a} < 1.25 x {w.current_a}")
            if w.fuse_a is not None and not w.current_a <= w.fuse_a <= w.ampacity_a + 1e-9:
                out.append(
                    f"wire {w.run}: fuse {w.fuse_a} A not between current "
                    f"{w.current_a:.2f} A and ampacity {w.ampacity_a:.1f} A"
                )
        sd = d.electrical.strings
        if sd.string_voc_cold_v > c.max_pv_voltage_v + 1e-9:
            out.append(
                f"string cold Voc {sd.string_voc_cold_v:.1f} V over the controller's "
                f"{c.max_pv_voltage_v} V"
            )
        if (sd.layout.series, sd.layout.parallel) != (a.modules_series, a.modules_parallel):
            out.append("electrical layout differs from the array's")
        if sd.layout.parallel % sd.layout.controllers:
            out.append("strings do not share out equally between the controllers")
    if not d.cautions or "defers to local electrical codes" not in d.cautions[-1]:
        out.append("the last caution does not defer to local codes")
    for n in d.warnings:
        if not n.message or n.severity not in ("info", "warning", "error"):
            out.append(f"notice {n.code} malformed")
    return out
