"""Plain-text design summary (80 columns), shared by ``offgrid size`` and others."""

from __future__ import annotations

from offgrid.catalogue import figure_entry, find_figure
from offgrid.design.result import SystemDesign
from offgrid.project.model import Project
from offgrid.safetext import printable

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
WIDTH = 80


LABEL_WIDTH = 30  # the catalogue's figure labels are at most 29 characters
DETAIL_AT = 48


def _row(label: str, value: str, detail: str = "") -> list[str]:
    """One figure: label, value and a detail beside it, or below it when it does not fit."""
    text = f"  {label:<{LABEL_WIDTH - 1}} {value}"
    if not detail:
        return [text[:WIDTH]]
    joined = f"{text:<{DETAIL_AT - 1}} {detail}"
    if len(joined) <= WIDTH:
        return [joined]
    return [text[:WIDTH], (" " * (LABEL_WIDTH + 2) + detail)[:WIDTH]]


def _fig(path: str, value: str, detail: str = "") -> list[str]:
    """A row labelled as the catalogue labels the figure at ``path``."""
    return _row(figure_entry(path).label, value, detail)


def _months_table(title: str, values, digits: int = 0, unit: str = "") -> list[str]:
    head = "  " + " ".join(f"{m:>5}" for m in MONTHS)
    vals = "  " + " ".join(f"{v:>5.{digits}f}" for v in values)
    return [f"{title} {unit}".rstrip(), head, vals]


def _label(path: str) -> str:
    return figure_entry(path).label


def summary_text(project: Project, d: SystemDesign) -> str:
    a, b, c, inv, ld, s = d.array, d.battery, d.controller, d.inverter, d.loads, d.site
    lines: list[str] = []
    title = printable(project.info.name)
    if project.info.demo:
        title += "  (demonstration data)"
    lines += [title[:WIDTH], "=" * min(WIDTH, len(title))]
    lines.append(f"Site: {project.site.name or '-'}")
    lines.append(
        f"      latitude {project.site.latitude_deg:.2f}, longitude "
        f"{project.site.longitude_deg:.2f}; array tilt {s.tilt_deg:.0f} deg, azimuth "
        f"{s.azimuth_deg:.0f} deg"
    )
    dm = s.design_month - 1
    lines.append(
        f"Design month: {MONTHS[dm]}  ({ld.design_daily_energy_wh:.0f} Wh/day on "
        f"{s.poa_kwh_m2_day[dm]:.2f} kWh/m2/day in the array plane)"
    )
    lines.append("")
    lines.append("Design")
    lines += _fig(
        "array.power_w",
        f"{a.power_w:.0f} W",
        f"{a.modules_series} series x {a.modules_parallel} parallel x {a.module_power_w:.0f} W",
    )
    lines += _fig(
        "array.required_power_w",
        f"{a.required_power_w:.0f} W",
        f"derates together {a.derate_total:.2f}",
    )
    bank = (
        f" ({b.bank_voltage_v:g} V nominal)"
        if b.bank_voltage_v and abs(b.bank_voltage_v - b.system_voltage_v) > 1e-9
        else ""
    )
    lines += _fig(
        "battery.capacity_ah",
        f"{b.capacity_ah:.0f} Ah at {b.system_voltage_v} V{bank}",
        f"{b.units_series} series x {b.units_parallel} parallel units",
    )
    lines += _fig(
        "battery.nominal_kwh",
        f"{b.nominal_kwh:.2f} kWh",
        f"{b.usable_kwh:.2f} kWh usable at {b.max_dod:.0%} DoD",
    )
    lines += _fig(
        "battery.capacity_temp_c",
        f"{b.capacity_temp_c:.0f} C",
        f"ageing up to {b.ageing_temp_c:.0f} C: life {b.calendar_life_years:.1f} yr",
    )
    lines += _fig("battery.autonomy_days", f"{b.autonomy_days:g} days", f"{b.chemistry}")
    ctrl_count = f"{c.count} x " if c.count > 1 else ""
    needs = (
        f"needs {c.required_current_a / c.count:.1f} A each"
        if c.count > 1
        else f"needs {c.required_current_a:.1f} A"
    )
    lines += _fig(
        "controller.current_a", f"{ctrl_count}{c.current_a:.0f} A {c.type.upper()}", needs
    )
    if inv.needed:
        lines += _fig(
            "inverter.continuous_w",
            f"{inv.continuous_w:.0f} W continuous",
            f"surge {inv.surge_w:.0f} W (needs {inv.required_surge_w:.0f} W)",
        )
    else:
        lines += _fig("inverter.continuous_w", "none (no AC loads)")
    lines.append("")
    lines.append("Derates in the design month (fraction kept)")
    for name, value in a.derates.items():
        entry = find_figure(f"array.derates.{name}")
        lines += _row(entry.label if entry else f"Derate: {name}", f"{value:.3f}")
    lines.append("")
    label = _label
    lines += _months_table(label("loads.daily_energy_wh"), ld.daily_energy_wh, 0, "(Wh/day)")
    lines += _months_table(label("site.poa_kwh_m2_day"), s.poa_kwh_m2_day, 2, "(kWh/m2/day)")
    lines += _months_table(
        label("array.supply_wh_day") + ", derate chain incl. battery round trip",
        a.supply_wh_day,
        0,
        "(Wh/day)",
    )
    lines.append("")
    lines.append(
        f"Loads: AC connected {ld.connected_ac_w:.0f} W, peak at once "
        f"{ld.peak_ac_w:.0f} W (coincidence {ld.coincidence_factor:g}); DC "
        f"{ld.connected_dc_w:.0f} W"
    )
    on = [MONTHS[i] for i, v in enumerate(ld.inverter_idle_by_month_wh) if v > 0]
    when = "" if len(on) in (0, 12) else f" in {', '.join(on)} only (AC use)"
    lines += _wrap(
        f"inverter idle {ld.inverter_idle_wh:.0f} Wh/day{when}; growth margin {ld.growth_pct:g} %",
        "       ",
    )
    if ld.largest_surge_load:
        lines.append(
            f"       largest surge {ld.largest_surge_w:.0f} W "
            f"({ld.largest_surge_load}, {ld.largest_surge_ac_dc.upper()})"
        )
    else:
        lines.append("       largest surge: no appliance has a starting power given")
    for extra in _extra_sections(d):
        lines.append("")
        lines += extra
    for title, group in (
        ("Warnings", [n for n in d.warnings if n.severity != "info"]),
        ("Notes", [n for n in d.warnings if n.severity == "info"]),
    ):
        if group:
            lines.append("")
            lines.append(f"{title} ({len(group)})")
            for n in group:
                lines += _wrap(f"[{n.code}] {n.message}", "  - ")
    lines.append("")
    lines.append("Safety cautions")
    for text in d.cautions:
        lines += _wrap(text, "  ! ")
    # names typed by people reach the terminal with control characters made visible
    return "\n".join(printable(line) for line in lines)


def _extra_sections(d: SystemDesign) -> list[list[str]]:
    """Sections added by later features (electrical, reliability) when present."""
    out: list[list[str]] = []
    if d.electrical is not None:
        out += _electrical_sections(d)
    return out


def _electrical_sections(d: SystemDesign) -> list[list[str]]:
    e = d.electrical
    mp, sd, h, pr = e.mpp, e.strings, e.harvest, e.protection
    month = MONTHS[h.design_month - 1]
    module = [
        f"Module at design conditions ({month} solar noon, {mp.irradiance_w_m2:.0f} W/m2, "
        f"cell {mp.cell_temp_c:.0f} C)",
        *_fig("mpp.pmp_w", f"{mp.pmp_w:.0f} W", f"Vmp {mp.vmp_v:.1f} V x Imp {mp.imp_a:.2f} A"),
        *_fig("mpp.voc_v", f"{mp.voc_v:.1f} V", f"Isc {mp.isc_a:.2f} A"),
        *_fig("mpp.fill_factor", f"{mp.fill_factor:.3f}", f"efficiency {mp.efficiency:.1%}"),
    ]
    err = max(abs(x) for x in e.fit.stc_error_pct)
    module += _wrap(
        f"model: {e.fit.method}; reproduces the datasheet at STC within {max(err, 0.001):.3f} %",
        "  ",
    )
    lay = sd.layout
    ctrl = f"{lay.controllers} controllers; " if lay.controllers > 1 else ""
    strings = [
        "Strings",
        *_fig(
            "electrical.strings.max_series",
            f"{sd.window.max_series} (fewest {sd.window.min_series})",
            f"chosen {lay.series} x {lay.parallel} parallel",
        ),
        *_fig(
            "electrical.strings.voc_cold_v",
            f"{sd.voc_cold_v:.1f} V",
            f"string {sd.string_voc_cold_v:.0f} V at {sd.record_low_c:.0f} C",
        ),
        *_fig(
            "controller.max_pv_voltage_v",
            f"{sd.window.max_pv_voltage_v:.0f} V",
            "cold Voc by " + sd.voc_cold_rule.split(",")[0].replace("datasheet ", ""),
        ),
        *_fig(
            "electrical.strings.vmp_hot_v",
            f"{sd.vmp_hot_v:.1f} V",
            f"string {sd.string_vmp_hot_v:.0f} V, needs {sd.window.required_vmp_v:.1f}",
        ),
        *_fig(
            "electrical.strings.strings_per_controller",
            f"{lay.strings_per_controller}",
            ctrl + ("string fuses" if pr.string_fuses else "no string fuses needed"),
        ),
    ]
    # the rows of the design's harvest figures, by their short words (the catalogue's)
    mppt, pwm = figure_entry("array.harvest_mppt_wh_day"), figure_entry("array.harvest_pwm_wh_day")
    harvest = [
        f"Harvest into the battery, from the I-V curves, before its round trip ({mppt.unit})",
        "     " + " ".join(f"{m:>5}" for m in MONTHS),
        f"{mppt.short:<5}" + " ".join(f"{v:>5.{mppt.digits}f}" for v in h.mppt_wh_day),
        f"{pwm.short:<5}" + " ".join(f"{v:>5.{pwm.digits}f}" for v in h.pwm_wh_day),
    ]
    pct = h.pwm_vs_mppt_pct
    compare = (
        f"{abs(pct):.0f} % less than"
        if pct < -0.5
        else f"{pct:.0f} % more than"
        if pct > 0.5
        else "about the same as"
    )
    harvest += _wrap(
        f"In {month} PWM harvests {compare} MPPT per module, each on its own "
        f"best string layout of the same modules (PWM at "
        f"{h.charging_voltage_v:.1f} V, {h.pwm_layout[0]} x {h.pwm_layout[1]}; MPPT "
        f"{h.mppt_layout[0]} x {h.mppt_layout[1]}); the design uses "
        f"{h.controller_type.upper()}",
        "  ",
    )
    material = e.wires[0].material if e.wires else ""
    cables = [
        f"Cables ({material}; max A for ampacity and fuse, drop A for the voltage drop)",
        f"  {'run':<23}{'n':>2} {'size':>10}{'max A':>7}{'drop A':>7}{'m':>6}{'drop%':>6}"
        f"{'amp':>6}{'fuse':>6}",
    ]
    for w in e.wires:
        fuse = f"{w.fuse_a:g}" if w.fuse_a is not None else "-"
        cables.append(
            f"  {w.run[:22]:<23}{w.count:>2} {w.size:>10}{w.current_a:>7.1f}"
            f"{w.operating_current_a:>7.1f}{w.length_m:>6.1f}{w.drop_pct:>6.2f}"
            f"{w.ampacity_a:>6.0f}{fuse:>6}"[:WIDTH]
        )
    est = " (estimated)" if pr.short_circuit_estimated else ""
    prot = ["Protection and disconnects"]
    prot += _wrap(
        f"battery bank prospective fault current {pr.bank_fault_current_a / 1000:.1f} "
        f"kA{est}: every device at the battery needs a DC interrupting rating above it",
        "  ",
    )
    for dev in pr.devices:
        if dev.location.startswith("DC load"):
            continue
        rating = f"{dev.rating_a:g} A " if dev.rating_a is not None else ""
        count = f"{dev.count} x " if dev.count > 1 else ""
        text = (
            f"{dev.location}: {count}{dev.kind} {rating}(>= {dev.voltage_v:.0f} V DC"
            + (f", >= {dev.interrupt_rating_a / 1000:.1f} kA" if dev.interrupt_rating_a else "")
            + f") [{dev.source}]"
        )
        prot += _wrap(text, "  - ")
    if any(w.key.startswith("load") for w in e.wires):
        prot += _wrap(
            "each DC load circuit: the fuse or breaker of the cable table, at the DC "
            "distribution board [NFPA 70 (NEC) 2023 240.4, 240.6(A)]",
            "  - ",
        )
        for dev in pr.devices:
            if dev.location.startswith("DC load") and dev.note:
                name = dev.location.removesuffix(" circuit, at the DC distribution board")
                prot += _wrap(f"{name}: {dev.note}", "    ")
    return [module, strings, harvest, cables, prot]


def _wrap(text: str, lead: str) -> list[str]:
    import textwrap

    return textwrap.wrap(text, WIDTH, initial_indent=lead, subsequent_indent=" " * len(lead))
