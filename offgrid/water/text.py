"""Views of a water design: the text summary, the bill-of-materials lines, the JSON section,
the report section (plain lines a renderer places).  Rendering only: no figures are made
here that the engine did not make."""

from __future__ import annotations

from typing import Any

from offgrid.catalogue import figure_entry
from offgrid.water.design import MONTHS, WaterDesign


def water_bom(w: WaterDesign, supply) -> list[tuple[str, str, float, str, str]]:
    """(part key, description, quantity, unit, note) of the pumping parts."""
    sp = supply.pump
    ctrl = (
        ("water.controller", f"Pump controller, input {sp.min_input_v:g}-{sp.max_input_v:g} V",
         1.0, "each", "MPPT input window as the pump datasheet")
        if sp.drive == "controller"
        else ("water.disconnect", "DC disconnect for the direct-drive pump", 1.0, "each",
              f"rated for {w.string_voc_cold_v:.0f} V DC")
    )  # fmt: skip
    return [
        ("water.pump", sp.name, 1.0, "each", f"{sp.kind.replace('_', ' ')}, {sp.drive} drive"),
        ctrl,
        ("water.modules", "PV modules for the pump array", float(w.module_count), "each",
         f"{w.series} in series x {w.parallel} in parallel"),
        ("water.drop_cable", f"Submersible drop cable, {w.drop_cable_size}",
         float(supply.drop_cable_m), "m", "drinking-water rated"),
        ("water.riser_pipe", f"Riser and delivery pipe, {supply.pipe_diameter_mm:g} mm bore, "
         f"{supply.pipe_material}", float(supply.pipe_length_m), "m", ""),
        ("water.tank", f"Water tank {w.tank_size_m3:g} m3", float(w.tank_count), "each",
         f"{w.tank_required_m3:.1f} m3 needed"),
        ("water.float_switch", "Tank float switch with signal cable", 1.0, "each", ""),
        ("water.probe", "Low-water (dry-run) probe", 1.0, "each", ""),
        ("water.check_valve", "Non-return valve at the well head", 1.0, "each", ""),
        ("water.surge", "Surge protection, array input and pump cable", 1.0, "set", ""),
    ]  # fmt: skip


def water_section(w: WaterDesign, supply, reliability: dict | None = None) -> dict[str, Any]:
    """The ``water`` entry of the JSON output for one supply."""
    d = w.to_dict()
    d["bom"] = [
        {"part": k, "description": t, "quantity": q, "unit": u, "note": n}
        for k, t, q, u, n in water_bom(w, supply)
    ]
    if reliability is not None:
        d["reliability"] = reliability
    return d


def water_lines(w: WaterDesign, supply, reliability: dict | None = None) -> list[str]:
    """The text summary of one supply (80 columns)."""
    lim = w.limiting_month - 1
    tdh = figure_entry("water[].total_dynamic_head_m")
    out = [
        f"Water supply: {w.name}",
        f"  {tdh.label:<20}{w.total_dynamic_head_m:6.{tdh.digits}f} {tdh.unit}",
        f"    static {w.static_level_m:g} + drawdown {w.drawdown_m:.1f} + tank "
        f"{w.tank_height_m:g} + friction {w.friction_m:.1f} + fittings {w.minor_loss_m:.1f} m",
        f"  Peak flow           {w.peak_flow_m3_h:6.2f} m3/h (safe yield "
        f"{supply.safe_yield_m3_h:g} m3/h), {w.velocity_m_s:.2f} m/s in the pipe",
        f"  Pipe                {supply.pipe_diameter_mm:g} mm bore; suggested "
        f"{w.pipe_suggested_mm:g} mm (velocity, friction)",
        f"  Drop cable          {w.drop_cable_size} for {w.drop_cable_current_a:.1f} A over "
        f"{supply.drop_cable_m:g} m ({w.drop_cable_drop_pct:.1f} % drop)",
        f"  Array               {w.module_count} modules ({w.series} in series x {w.parallel}), "
        f"{w.array_power_w:.0f} W; cold Voc {w.string_voc_cold_v:.0f} V",
        f"  Pump starts at      {w.start_irradiance_w_m2:6.0f} W/m2 on the array "
        f"({w.start_power_w:.0f} W in)",
        f"  Limiting month      {MONTHS[lim]}: {w.water_m3_day[lim]:.1f} m3/day pumped for "
        f"{w.need_m3_day[lim]:.1f} m3/day needed",
        f"  Hydraulic energy    {w.hydraulic_energy_kwh_day:6.2f} kWh/day ({MONTHS[lim]}); "
        f"pump set {100 * w.pump_set_efficiency:.0f} % at noon",
        f"  Tank                {w.tank_count} x {w.tank_size_m3:g} m3 "
        f"({supply.autonomy_days:g} days of the largest need: {w.tank_required_m3:.1f} m3)",
        "  Water by month (m3/day):",
        "  " + " " * 6 + "".join(f"{m:>5s}" for m in MONTHS),
        "  pumped" + "".join(_cell(v) for v in w.water_m3_day),
        "  need  " + "".join(_cell(v) for v in w.need_m3_day),
    ]
    if reliability is not None:
        r = reliability
        out.extend(
            _wrap(
                f"{r['years']} years of synthetic weather: short of water on "
                f"{r['days_short']} days ({r['days_short_pct']:.1f} %), "
                f"{r['water_short_pct']:.2f} % of the need unmet; tank full on "
                f"{r['days_tank_full']} days",
                "  ",
            )
        )
    for n in w.notices:
        out.extend(_wrap(n.message, "  ! "))
    out.append("  Cautions:")
    for c in w.cautions:
        out.extend(_wrap(c, "   - "))
    return out


def _cell(value: float) -> str:
    """A month's volume in five columns."""
    return f"{value:5.1f}" if value < 99.95 else f" {value:4.0f}"


def _wrap(text: str, first: str) -> list[str]:
    import textwrap

    return textwrap.wrap(text, width=76, initial_indent=first, subsequent_indent=" " * len(first))


def water_bom_lines(project, base=None) -> list:
    """The pumping parts of every supply as :class:`~offgrid.economics.bom.BomLine` records."""
    from offgrid.economics.bom import BomLine
    from offgrid.water.design import water_design

    out = []
    for i, supply in enumerate(project.water):
        w = water_design(project, i, base)
        for key, desc, qty, unit, note in water_bom(w, supply):
            out.append(BomLine(f"{key}:{desc}", desc, qty, unit, note or f"water[{i + 1}]"))
    return out
