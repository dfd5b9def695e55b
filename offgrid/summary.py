"""Plain-text design summary (80 columns), shared by ``offgrid size`` and others."""

from __future__ import annotations

from offgrid.project.model import Project
from offgrid.result import SystemDesign

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
WIDTH = 80


def _row(label: str, value: str, reason: str = "") -> str:
    text = f"  {label:<20}{value}"
    if reason:
        text = f"{text:<44}{reason}"
    return text[:WIDTH]


def _months_table(title: str, values, digits: int = 0, unit: str = "") -> list[str]:
    head = "  " + " ".join(f"{m:>5}" for m in MONTHS)
    vals = "  " + " ".join(f"{v:>5.{digits}f}" for v in values)
    return [f"{title} {unit}".rstrip(), head, vals]


def summary_text(project: Project, d: SystemDesign) -> str:
    a, b, c, inv, ld, s = d.array, d.battery, d.controller, d.inverter, d.loads, d.site
    lines: list[str] = []
    title = project.info.name
    if project.info.demo:
        title += "  (demonstration data)"
    lines += [title[:WIDTH], "=" * min(WIDTH, len(title))]
    lines.append(f"Site: {project.site.name or '-'}")
    lines.append(f"      latitude {project.site.latitude_deg:.2f}, longitude "
                 f"{project.site.longitude_deg:.2f}; array tilt {s.tilt_deg:.0f} deg, azimuth "
                 f"{s.azimuth_deg:.0f} deg")
    dm = s.design_month - 1
    lines.append(f"Design month: {MONTHS[dm]}  ({ld.design_daily_energy_wh:.0f} Wh/day on "
                 f"{s.poa_kwh_m2_day[dm]:.2f} kWh/m2/day in the array plane)")
    lines.append("")
    lines.append("Design")
    lines.append(_row("Array", f"{a.power_w:.0f} W", f"{a.modules_series} series x "
                      f"{a.modules_parallel} parallel x {a.module_power_w:.0f} W"))
    lines.append(_row("  required", f"{a.required_power_w:.0f} W",
                      f"derates together {a.derate_total:.2f}"))
    lines.append(_row("Battery bank", f"{b.capacity_ah:.0f} Ah at {b.system_voltage_v} V",
                      f"{b.units_series} series x {b.units_parallel} parallel units"))
    lines.append(_row("  energy", f"{b.nominal_kwh:.2f} kWh nominal",
                      f"{b.usable_kwh:.2f} kWh usable at {b.max_dod:.0%} DoD"))
    lines.append(_row("  autonomy", f"{b.autonomy_days:g} days", f"{b.chemistry}"))
    ctrl_count = f"{c.count} x " if c.count > 1 else ""
    lines.append(_row("Charge controller", f"{ctrl_count}{c.current_a:.0f} A {c.type.upper()}",
                      f"needs {c.required_current_a:.1f} A"))
    if inv.needed:
        lines.append(_row("Inverter", f"{inv.continuous_w:.0f} W continuous",
                          f"surge {inv.surge_w:.0f} W (needs {inv.required_surge_w:.0f} W)"))
    else:
        lines.append(_row("Inverter", "none (no AC loads)"))
    lines.append("")
    lines.append("Derates in the design month (fraction kept)")
    for name, value in a.derates.items():
        lines.append(_row(name, f"{value:.3f}"))
    lines.append("")
    lines += _months_table("Demand at the battery", ld.daily_energy_wh, 0, "(Wh/day)")
    lines += _months_table("Array-plane insolation", s.poa_kwh_m2_day, 2, "(kWh/m2/day)")
    lines += _months_table("Array supply", a.supply_wh_day, 0, "(Wh/day)")
    lines.append("")
    lines.append(f"Loads: AC connected {ld.connected_ac_w:.0f} W, peak at once "
                 f"{ld.peak_ac_w:.0f} W (coincidence {ld.coincidence_factor:g}); DC "
                 f"{ld.connected_dc_w:.0f} W")
    lines.append(f"       inverter idle {ld.inverter_idle_wh:.0f} Wh/day; growth margin "
                 f"{ld.growth_pct:g} %")
    lines.append(f"       largest surge {ld.largest_surge_w:.0f} W "
                 f"({ld.largest_surge_load or 'none'})")
    for extra in _extra_sections(d):
        lines.append("")
        lines += extra
    if d.warnings:
        lines.append("")
        lines.append(f"Warnings ({len(d.warnings)})")
        for n in d.warnings:
            lines += _wrap(f"[{n.code}] {n.message}", "  - ")
    lines.append("")
    lines.append("Safety cautions")
    for text in d.cautions:
        lines += _wrap(text, "  ! ")
    return "\n".join(lines)


def _extra_sections(d: SystemDesign) -> list[list[str]]:
    """Sections added by later features (electrical, reliability) when present."""
    return []


def _wrap(text: str, lead: str) -> list[str]:
    import textwrap

    return textwrap.wrap(text, WIDTH, initial_indent=lead, subsequent_indent=" " * len(lead))
