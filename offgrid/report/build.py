"""Build the report model (:class:`~offgrid.report.document.Report`) from a project and its design.

Every number is taken from the :class:`~offgrid.design.result.SystemDesign` (through its
``to_dict()``, the same JSON that ``offgrid size --json`` prints), formatted once
here and tagged with its dotted path, so each format shows the same figure and a
test can check it against the JSON.  Sections that later parts of the engine
provide (wiring schedule, protection, I-V curves, reliability) are filled when
the design carries them and left out otherwise.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from offgrid.catalogue import (
    EACH_RUN_LABEL,
    FIGURE_GROUPS,
    composite,
    figure_entry,
    fill,
    find_figure,
    find_input,
    key_figures,
    table_entry,
)
from offgrid.catalogue.outcomes import RELIABILITY_FIGURES, outcome_key, outcome_value
from offgrid.climate.model import MonthlyClimate
from offgrid.design.cautions import DEFERS_TO_CODE
from offgrid.design.result import Reason, SystemDesign
from offgrid.economics.bom import (
    BomLine,
    bill_of_materials,
    devices_of,
    wires_of,
)
from offgrid.economics.costs import LifecycleCost, lifecycle_cost, money
from offgrid.project.loads_csv import format_months
from offgrid.project.model import Project
from offgrid.report import charts
from offgrid.report.document import (
    Block,
    Bullets,
    Cell,
    Chart,
    FigureItem,
    Figures,
    Paragraph,
    Report,
    Section,
    Table,
)
from offgrid.report.generator_section import generator_section

if TYPE_CHECKING:
    from offgrid.economics.variants import VariantComparison
    from offgrid.generator.study import GeneratorStudy
    from offgrid.simulate.run import SimulationReport
    from offgrid.simulate.tradeoff import TradeOff

MONTHS = charts.MONTHS

#: Section keys in report order; tests check that each is present.
SECTION_KEYS = (
    "job",
    "climate",
    "loads",
    "design-month",
    "figures",
    "strings",
    "wiring",
    "bom",
    "costs",
    "reliability",
    "variants",
    "cautions",
    "assumptions",
)

#: Figures that have no reason of their own in the engine: the reason the report states.
DERIVED: dict[str, Reason] = {
    "array.module_count": Reason("modules in series x strings in parallel"),
    "array.derate_total": Reason(
        "product of the derates of the design month (see the assumptions)"
    ),
    "array.string_voc_cold_v": Reason(
        "modules in series x module Voc at the lowest temperature (Voc x (1 + beta_Voc x "
        "(T - 25 C)))",
        (),
        "NEC 690.7(A)(1) method with the module's coefficient, NFPA 70-2023",
    ),
    "array.string_vmp_hot_v": Reason(
        "modules in series x module Vmp at the hottest cell temperature"
    ),
    "battery.unit_count": Reason("units in series x strings in parallel"),
    "battery.nominal_kwh": Reason("installed Ah x system voltage / 1000"),
    "controller.count": Reason(
        "controllers needed so that none carries more than the largest standard rating"
    ),
    "loads.max_daily_energy_wh": Reason(
        "largest of the twelve monthly daily energies at the battery"
    ),
}

GROUP_ORDER = (
    "site",
    "loads",
    "module",
    "mpp",
    "array",
    "strings",
    "battery",
    "controller",
    "inverter",
    "wires",
    "protection",
)
#: The headings of the figure groups: the catalogue's (offgrid/catalogue/composites.py).
GROUP_TITLES = FIGURE_GROUPS

# ----------------------------------------------------------------------------- formatting


def unit_of(path: str) -> str:
    """Unit from the naming convention of the design's fields (``power_w`` -> W)."""
    name = path.rsplit(".", 1)[-1]
    table = (
        ("_kwh_m2_day", "kWh/m2/day"),
        ("_wh_day", "Wh/day"),
        ("_kwh", "kWh"),
        ("_wh", "Wh/day" if path.startswith("loads.") else "Wh"),
        ("_ah", "Ah"),
        ("_w", "W"),
        ("_v", "V"),
        ("_a", "A"),
        ("_c", "C"),
        ("_deg", "deg"),
        ("_pct", "%"),
        ("_m", "m"),
        ("_days", "days"),
        ("_years", "years"),
        ("_kw", "kW"),
        ("_ohm", "ohm"),
    )
    for suffix, unit in table:
        if name.endswith(suffix):
            return unit
    return ""


def digits_for(value: float, unit: str) -> int:
    """Decimals shown for a figure of this size and unit."""
    if unit in ("W", "Wh", "Wh/day", "Ah", "deg"):
        return 0 if abs(value) >= 10 or float(value).is_integer() else 1
    if unit == "%":
        return 2 if abs(value) < 10 else 1
    if unit in ("V", "A", "C", "m", "days", "years"):
        return 1 if abs(value) < 1000 else 0
    if unit in ("kWh", "kWh/m2/day", "kW"):
        return 2
    if unit == "":
        return 3 if abs(value) < 10 else 1
    return 2


def number_text(value: float, digits: int) -> str:
    return f"{value:,.{digits}f}"


def figure_cell(value: Any, path: str, unit: str | None = None) -> Cell:
    """A design figure formatted with its unit, keeping the number and the path; unit and
    digits are the catalogue's (:mod:`offgrid.catalogue`) when it lists the figure."""
    entry = find_figure(path)
    if unit is None:
        unit = entry.unit if entry is not None else unit_of(path)
    if path.endswith("design_month") and isinstance(value, int):
        return Cell(MONTHS[value - 1], float(value), path)
    if isinstance(value, bool):
        return Cell("yes" if value else "no", None, path)
    if isinstance(value, int):
        return Cell(f"{value:,d} {unit}".strip(), float(value), path)
    if isinstance(value, float):
        digits = entry.digits if entry is not None and entry.digits is not None else None
        shown = entry.shown(value) if entry is not None else value  # the row's scale
        text = number_text(shown, digits_for(shown, unit) if digits is None else digits)
        return Cell(f"{text} {unit}".strip(), value, path)
    return Cell(str(value), None, path)


def lookup(tree: dict[str, Any], path: str) -> Any:
    """Value at a dotted path of the design's JSON, or None."""
    node: Any = tree
    for part in path.split("."):
        if isinstance(node, dict) and part in node:
            node = node[part]
        elif isinstance(node, list) and part.isdigit() and int(part) < len(node):
            node = node[int(part)]
        else:
            return None
    return node


def resolve(tree: dict[str, Any], design: SystemDesign, path: str) -> tuple[Any, str]:
    """A reason's figure and its path in the design's JSON.

    Most reasons are keyed by their JSON path; the electrical design's string-window and
    protection figures sit under ``electrical.``, and cable runs are keyed by run name
    (``wires.array.size``) while the JSON lists them (``wires.1.size``).
    """
    value = lookup(tree, path)
    if value is not None:
        return value, path
    head, _, rest = path.partition(".")
    if head == "wires" and "." in rest:
        key, _, name = rest.partition(".")
        for k, w in enumerate(wires_of(design)):
            if w.key == key:
                where = f"wires.{k}.{name}"
                return lookup(tree, where), where
    where = f"electrical.{path}"
    value = lookup(tree, where)
    if value is not None:
        return value, where
    return None, path


def figure_label(design: SystemDesign, path: str) -> str:
    """The label of a reason's figure; cable runs are named by their run."""
    head, _, rest = path.partition(".")
    if head == "wires" and "." in rest:
        key, _, name = rest.partition(".")
        for w in wires_of(design):
            if w.key == key:
                run = w.run
                return f"{run[:1].upper()}{run[1:]}: {_wire_field(name).lower()}"
    return label_of(path)


def _with_unit(path: str) -> str:
    """A monthly row's label: the catalogue's label and unit (``Array supply ... (Wh/day)``)."""
    return figure_entry(path).heading()


def _wire_field(name: str) -> str:
    """The catalogue's label of a cable's figure (``size`` -> Conductor size)."""
    entry = find_figure(f"wires[].{name}")
    return entry.label if entry is not None else name.replace("_", " ")


def label_of(path: str) -> str:
    """The catalogue's label of a figure; for one it does not list, words from the path."""
    entry = find_figure(path)
    if entry is not None:
        return entry.label
    head, _, name = path.rpartition(".")
    words = name
    for suffix in (
        "_kwh_m2_day",
        "_wh_day",
        "_kwh",
        "_wh",
        "_ah",
        "_w",
        "_v",
        "_a",
        "_c",
        "_deg",
        "_pct",
        "_m",
        "_a",
    ):
        if words.endswith(suffix):
            words = words[: -len(suffix)]
            break
    words = words.replace("_", " ")
    if head.startswith("array.derates"):
        return f"Derate: {words}"
    return words[:1].upper() + words[1:]


def _fig_row(value: Any, path: str) -> tuple[Cell, Cell]:
    """A table row of one figure: the catalogue's label and the formatted value."""
    return _c(figure_entry(path).label), figure_cell(value, path)


def _c(text: str, value: float | None = None, path: str | None = None) -> Cell:
    return Cell(text, value, path)


def _num(value: float, digits: int, path: str | None = None) -> Cell:
    return Cell(number_text(value, digits), float(value), path)


def _month_row(label: str, values, path: str | None, digits: int = 0) -> tuple[Cell, ...]:
    """A label and twelve monthly numbers; ``path.k`` is the JSON path of month k (0-11)."""
    return (
        _c(label),
        *(_num(v, digits, f"{path}.{k}" if path else None) for k, v in enumerate(values)),
    )


# ----------------------------------------------------------------------------- inputs


@dataclass(frozen=True)
class ReportInputs:
    """Everything a report is built from; optional parts are None when not computed."""

    project: Project
    design: SystemDesign
    climate: MonthlyClimate | None = None
    reliability: SimulationReport | None = None
    comparison: VariantComparison | None = None
    charts: bool = True


def build_report(
    project: Project,
    design: SystemDesign,
    *,
    base: Path | None = None,
    climate: MonthlyClimate | None = None,
    reliability: SimulationReport | None = None,
    comparison: VariantComparison | None = None,
    with_charts: bool = True,
    with_variants: bool = True,
    generator: GeneratorStudy | None = None,
) -> Report:
    """The report model of a designed project.

    ``reliability`` is the simulation's record when it ran; ``comparison`` a
    :class:`~offgrid.economics.variants.VariantComparison` (computed here when the project
    has variants and ``with_variants`` is true).
    """
    if climate is None:
        from offgrid.design.sizing import resolve_climate

        try:
            climate = resolve_climate(project, base)
        except ValueError:
            climate = None
    if comparison is None and with_variants and project.variants:
        from offgrid.economics.variants import compare_variants

        if generator is None:
            comparison = compare_variants(project, base)
        else:  # simulated with a generator: the variants' hybrid rows too (issue 16)
            from offgrid.economics.hybrid_variants import study_like

            study = study_like(project, generator)
            comparison = compare_variants(project, base, with_generator=True, study=study)
    tree = design.to_dict()
    bom = bill_of_materials(project, design)
    cost = lifecycle_cost(project, design, bom, reliability)
    ri = ReportInputs(project, design, climate, reliability, comparison, with_charts)
    sections = [
        _job(ri, tree),
        _climate(ri, tree),
        _loads(ri, tree),
        _design_month(ri, tree),
        _figures(ri, tree),
        _strings(ri, tree),
        _wiring(ri, tree),
        _bom(ri, bom, cost),
        _costs(ri, cost),
        _reliability(ri),
        generator_section(project, design, generator, base, with_charts),  # None: no generator
        *_water_sections(project, base, with_charts),
        _variants(ri),
        _cautions(ri),
        _assumptions(ri, tree),
    ]
    info = project.info
    subtitle = f"Stand-alone solar power design for {project.site.name or info.name}"
    meta = tuple((k, v) for k, v in (("Client", info.client), ("Designer", info.designer)) if v)
    from offgrid.wording import for_client

    # Client words: a recalled value ('from memory' in the engine) says what to confirm.
    return Report(
        title=info.name,
        subtitle=subtitle,
        sections=for_client(tuple(s for s in sections if s is not None)),
        demo=info.demo,
        meta=meta,
    )


# ----------------------------------------------------------------------------- sections


def _water_sections(project: Project, base: Path | None, charts: bool) -> list[Section]:
    """The [[water]] supplies (offgrid.water), none without."""
    if not project.water:
        return []
    from offgrid.water.report import water_sections

    return water_sections(project, base, charts)


def _job(ri: ReportInputs, tree: dict) -> Section:
    p, d = ri.project, ri.design
    s = p.site
    rows = [
        ("Project", p.info.name),
        ("Client", p.info.client or "-"),
        ("Designer", p.info.designer or "-"),
        ("Site", s.name or "-"),
        ("Latitude, longitude", f"{s.latitude_deg:.4f}, {s.longitude_deg:.4f} deg"),
        ("Elevation", f"{s.elevation_m:,.0f} m"),
    ]
    table_rows = [(_c(k), _c(v)) for k, v in rows]
    table_rows.append(
        (
            _c("Array tilt, azimuth"),
            _c(f"{d.site.tilt_deg:.0f} deg, {d.site.azimuth_deg:.0f} deg (clockwise from north)"),
        )
    )
    blocks: list[Block] = []
    if p.info.demo:
        blocks.append(
            Paragraph(
                "Demonstration data: the project, the site, the people and the "
                "climate in this report are invented."
            )
        )
    blocks.append(Table("job", ("Item", "Value"), tuple(table_rows), wrap=(1,)))
    if p.info.notes:
        blocks.append(Paragraph(p.info.notes))
    a, b, c, inv = d.array, d.battery, d.controller, d.inverter
    inv_text = (
        f"a {inv.continuous_w:,.0f} W inverter" if inv.needed else "no inverter (DC loads only)"
    )
    blocks.append(
        Paragraph(
            f"The system: {a.module_count} PV modules ({a.power_w:,.0f} W), a {b.system_voltage_v} "
            "V "
            f"battery bank of {b.unit_count} units ({b.capacity_ah:,.0f} Ah, "
            f"{b.usable_kwh:,.2f} kWh usable), {c.count} x {c.current_a:g} A {c.type.upper()} "
            "charge "
            f"controller{'s' if c.count > 1 else ''} and {inv_text}, sized for "
            f"{MONTHS[d.site.design_month - 1]}, the month whose supply covers its demand least."
        )
    )
    return Section("job", "The job and the site", tuple(blocks))


def _climate(ri: ReportInputs, tree: dict) -> Section:
    d = ri.design
    s = d.site
    c = ri.climate
    table = table_entry("climate")  # the figure columns are the catalogue's
    cols = [table.title, *table.columns(figure_entry)]
    have_max = c is not None and c.temp_max_c is not None
    have_min = c is not None and c.temp_min_c is not None
    if have_max:
        cols.append("Max")
    if have_min:
        cols.append("Min")
    rows = []
    for k in range(12):
        row = [
            _c(MONTHS[k]),
            _num(s.horizontal_kwh_m2_day[k], 2, f"site.horizontal_kwh_m2_day.{k}"),
            _num(s.poa_kwh_m2_day[k], 2, f"site.poa_kwh_m2_day.{k}"),
            _num(s.temp_mean_c[k], 1, f"site.temp_mean_c.{k}"),
            _num(s.temp_day_c[k], 1, f"site.temp_day_c.{k}"),
        ]
        if have_max:
            row.append(_num(c.temp_max_c[k], 1))
        if have_min:
            row.append(_num(c.temp_min_c[k], 1))
        rows.append(tuple(row))
    blocks: list[Block] = [
        Table(
            table.id,
            tuple(cols),
            tuple(rows),
            ("l",) + ("r",) * (len(cols) - 1),
            table.note,
        )
    ]
    src = s.climate_source or (c.source if c else "") or "not given"
    blocks.append(Paragraph(f"Source of the climate: {src}"))
    if c is not None and c.demo:
        blocks.append(Paragraph("This climate is demonstration data, not a measurement."))
    reason = d.reasons.get("site.poa_kwh_m2_day")
    if reason:
        blocks.append(
            Paragraph(f"Array-plane insolation: {reason.formula}. Source: {reason.source}.")
        )
    blocks.append(
        Paragraph(
            f"Lowest temperature used for the string voltage: "
            f"{s.record_low_c:.1f} C ({_reason_source(d, 'site.record_low_c')})."
        )
    )
    return Section("climate", "Climate", tuple(blocks))


def _reason_source(d: SystemDesign, path: str) -> str:
    r = d.reasons.get(path)
    return r.source if r else "not stated"


def _loads(ri: ReportInputs, tree: dict) -> Section:
    p, d = ri.project, ri.design
    lr = d.loads
    dm = d.site.design_month - 1
    rows = []
    for i, ld in enumerate(p.loads):
        e = lr.per_load_wh[i][dm] if i < len(lr.per_load_wh) else 0.0
        rows.append(
            (
                _c(str(i + 1)),
                _c(ld.name),
                _c(str(ld.quantity)),
                _num(ld.power_w, 0 if ld.power_w >= 10 else 1),
                _num(ld.hours_per_day, 1),
                _num(ld.duty_cycle, 2),
                _c(ld.ac_dc.upper()),
                _c("yes" if ld.critical else "no"),
                _c(format_months(ld.months)),
                _num(e, 0, f"loads.per_load_wh.{i}.{dm}"),
            )
        )
    blocks: list[Block] = [
        Table(
            "loads",
            ("#", "Appliance", "Qty", "W", "h/day", "Duty", "Type", "Crit.", "Months", "Wh/day"),
            tuple(rows),
            ("r", "l", "r", "r", "r", "r", "l", "l", "l", "r"),
            f"Energy per day at the appliance in the design month ({MONTHS[dm]}) = quantity x "
            "power x hours per day x duty cycle.",
            wrap=(1,),
        )
    ]

    # energy by month
    mrows = []
    for i, ld in enumerate(p.loads):
        mrows.append(_month_row(f"{i + 1} {ld.name}", lr.per_load_wh[i], f"loads.per_load_wh.{i}"))
    idle = list(lr.inverter_idle_by_month_wh)
    growth = [
        b - (a + dc_ + l_ + i_)
        for b, a, dc_, l_, i_ in zip(
            lr.daily_energy_wh,
            lr.ac_energy_wh,
            lr.dc_energy_wh,
            lr.inverter_loss_wh,
            idle,
            strict=True,
        )
    ]
    for label, vals, path in (
        (None, lr.ac_energy_wh, "loads.ac_energy_wh"),
        (None, lr.dc_energy_wh, "loads.dc_energy_wh"),
        (None, lr.inverter_loss_wh, "loads.inverter_loss_wh"),
        (None, idle, "loads.inverter_idle_by_month_wh"),
        (fill("loads.growth_row", lr), growth, None),
        (None, lr.daily_energy_wh, "loads.daily_energy_wh"),
    ):
        mrows.append(_month_row(label or figure_entry(path).label, vals, path))
    table = table_entry("energy-by-month")
    blocks.append(
        Table(table.id, (table.title, *MONTHS), tuple(mrows), ("l",) + ("r",) * 12, table.note)
    )
    reason = d.reasons.get("loads.daily_energy_wh")
    if reason:
        blocks.append(Paragraph(f"Energy at the battery = {reason.formula}."))
    blocks.append(
        Paragraph(
            f"Connected AC power {lr.connected_ac_w:,.0f} W, at once {lr.peak_ac_w:,.0f} W "
            f"(coincidence factor {lr.coincidence_factor:g}); connected DC power "
            f"{lr.connected_dc_w:,.0f} W; "
            + (
                f"largest starting power {lr.largest_surge_w:,.0f} W ({lr.largest_surge_load}, "
                f"{lr.largest_surge_ac_dc.upper()})"
                if lr.largest_surge_load
                else "no appliance has a starting power given"
            )
            + (
                f"; inverter starting need {lr.surge_need_w:,.0f} W ({lr.surge_need_load} starting "
                "beside the other AC loads)"
                if lr.surge_need_load
                else ""
            )
            + ". Critical loads use "
            f"{lr.critical_energy_wh[dm]:,.0f} Wh/day at the battery in {MONTHS[dm]}."
        )
    )
    return Section("loads", "Loads", tuple(blocks))


def _design_month(ri: ReportInputs, tree: dict) -> Section:
    d = ri.design
    s, lr, a = d.site, d.loads, d.array
    dm = s.design_month - 1
    blocks: list[Block] = [
        Paragraph(
            f"Design month: {MONTHS[dm]}. Its supply, with that month's own derates (cell "
            "temperature, PWM operating point ...), covers its demand least: "
            f"{lr.design_daily_energy_wh:,.0f} Wh/day at the battery on "
            f"{s.poa_kwh_m2_day[dm]:.2f} kWh/m2/day in the array plane. The array is sized for "
            "this "
            "month, so every other month's supply covers its demand with more to spare."
        )
    ]
    rows = [
        _month_row(
            _with_unit("loads.daily_energy_wh"), lr.daily_energy_wh, "loads.daily_energy_wh"
        ),
        _month_row(_with_unit("array.supply_wh_day"), a.supply_wh_day, "array.supply_wh_day"),
    ]
    harvests = []
    for attr, values in (
        ("harvest_mppt_wh_day", a.harvest_mppt_wh_day),
        ("harvest_pwm_wh_day", a.harvest_pwm_wh_day),
    ):
        if len(values) == 12:
            rows.append(_month_row(_with_unit(f"array.{attr}"), values, f"array.{attr}"))
            harvests.append((figure_entry(f"array.{attr}").label, values))
    rows.append(_month_row(_with_unit("site.demand_to_sun"), s.demand_to_sun, "site.demand_to_sun"))
    table = table_entry("supply-demand")
    blocks.append(
        Table(table.id, (table.title, *MONTHS), tuple(rows), ("l",) + ("r",) * 12, table.note)
    )
    svg = (
        charts.supply_demand_svg(
            lr.daily_energy_wh, a.supply_wh_day, s.design_month, others=harvests
        )
        if ri.charts
        else ""
    )
    text = charts.text_bars(
        MONTHS,
        (("demand", "#", lr.daily_energy_wh), ("supply", "=", a.supply_wh_day)),
        78,
        "Wh/day",
    )
    blocks.append(
        Chart(
            "supply-demand",
            "Supply and demand by month",
            svg,
            tuple(text),
            f"Daily demand at the battery (bars) and array supply (line); "
            f"{MONTHS[dm]} is the design month.",
        )
    )
    from offgrid.report.margins import margin_sentences

    blocks.append(Paragraph(margin_sentences(dm, a.supply_wh_day, lr.daily_energy_wh)))
    blocks += _iv_blocks(ri)
    return Section("design-month", "Design month", tuple(blocks))


def _iv_blocks(ri: ReportInputs) -> list[Block]:
    """The design-month I-V and P-V curves with the MPP and the PWM point (electrical design)."""
    d = ri.design
    er = d.electrical
    if er is None:
        return []
    curve, mpp, harvest = er.curve, er.mpp, er.harvest
    v = np.asarray(curve.voltage_v, dtype=float)
    i = np.asarray(curve.current_a, dtype=float)
    if len(v) < 2 or len(v) != len(i):
        return []
    vm, im = float(mpp.vmp_v), float(mpp.imp_a)
    series = er.strings.layout.series or d.array.modules_series
    if harvest.pwm_layout:  # the layout the PWM figures assume (may differ from an MPPT's)
        series = int(harvest.pwm_layout[0])
    operating = None
    v_chg = harvest.charging_voltage_v
    if v_chg:
        vo = float(v_chg) / series
        if vo <= v[-1]:
            operating = (vo, float(np.interp(vo, v, i)))
    label = "PWM operating point" if d.controller.type == "pwm" else "PWM point (comparison)"
    svg = charts.iv_pv_svg(v, i, (vm, im), operating, label) if ri.charts else ""
    text = [f"Maximum power point: {vm:.1f} V, {im:.2f} A, {vm * im:,.0f} W (one module)"]
    if operating:
        text.append(
            f"{label}: {operating[0]:.1f} V, {operating[1]:.2f} A, "
            f"{operating[0] * operating[1]:,.0f} W (one module of {series} in series "
            f"at {float(v_chg):.1f} V)"
        )
    month = MONTHS[d.site.design_month - 1]
    blocks: list[Block] = [
        Chart(
            "iv-curve",
            f"I-V and P-V curves of one module, {month} at noon",
            svg,
            tuple(text),
            f"One module at {mpp.irradiance_w_m2:,.0f} W/m2 and {mpp.cell_temp_c:.1f} C cell "
            "temperature (the design month's mean day at solar noon). A PWM controller holds the "
            "array at battery voltage: the square marks that point.",
        )
    ]
    rows = [
        _fig_row(float(mpp.irradiance_w_m2), "mpp.irradiance_w_m2"),
        _fig_row(float(mpp.cell_temp_c), "mpp.cell_temp_c"),
        _fig_row(vm, "mpp.vmp_v"),
        _fig_row(im, "mpp.imp_a"),
        _fig_row(float(mpp.pmp_w), "mpp.pmp_w"),
        _fig_row(float(mpp.fill_factor), "mpp.fill_factor"),
    ]
    if operating:
        rows.append(
            (
                _c(f"{label}, power"),
                _c(
                    f"{operating[0] * operating[1]:,.1f} W "
                    f"({operating[0] * operating[1] / mpp.pmp_w:.0%} "
                    "of Pmp)"
                ),
            )
        )
    pwm_vs_mppt = figure_entry("electrical.harvest.pwm_vs_mppt_pct")
    rows.append(
        (
            _c(pwm_vs_mppt.label),
            Cell(
                f"{harvest.pwm_vs_mppt_pct:+.1f} %",
                float(harvest.pwm_vs_mppt_pct),
                "electrical.harvest.pwm_vs_mppt_pct",
            ),
        )
    )
    table = table_entry("mpp")
    blocks.append(Table(table.id, (table.title, "Value"), tuple(rows), ("l", "r"), table.note))
    return blocks


def _figures(ri: ReportInputs, tree: dict) -> Section:
    d = ri.design
    paths = list(key_figures())
    for path in d.reasons:
        if path not in paths:
            paths.append(path)
    groups: dict[str, list[str]] = {}
    for path in paths:
        groups.setdefault(path.split(".", 1)[0], []).append(path)
    order = [g for g in GROUP_ORDER if g in groups] + sorted(
        g for g in groups if g not in GROUP_ORDER
    )
    blocks: list[Block] = [
        Paragraph("Each figure with the formula it comes from, the inputs it used and its source.")
    ]
    for g in order:
        if g == "wires":
            items = _wire_reason_items(d, groups[g])
            if items:
                blocks.append(Figures(tuple(items), GROUP_TITLES["wires"]))
            continue
        items = []
        for path in groups[g]:
            value, where = resolve(tree, d, path)
            reason = d.reasons.get(path) or DERIVED.get(path)
            if value is None and reason is None:
                continue
            if isinstance(value, list):
                cell = Cell("by month, see the tables")
            elif value is None:
                cell = Cell("see the formula")
            else:
                cell = figure_cell(value, where)
                if where != path and unit_of(where) != unit_of(path):
                    cell = figure_cell(value, where, unit_of(path) or unit_of(where))
            if reason is None:
                reason = Reason("")
            items.append(
                FigureItem(
                    path,
                    figure_label(d, path),
                    cell,
                    reason.formula,
                    reason.inputs,
                    reason.source if reason.formula else "",
                )
            )
        if items:
            blocks.append(Figures(tuple(items), GROUP_TITLES.get(g, g.capitalize())))
    return Section("figures", "Sized figures and their reasons", tuple(blocks))


def _wire_reason_items(d: SystemDesign, paths: list[str]) -> list[FigureItem]:
    """Cable reasons, one item per column of the schedule: its formula and source once,
    the inputs of every run after it (the figures themselves are in the schedule)."""
    runs = {w.key: w.run for w in wires_of(d)}
    grouped: dict[tuple[str, str, str], list[tuple[str, Reason]]] = {}
    for path in paths:
        reason = d.reasons.get(path)
        parts = path.split(".")
        if reason is None or len(parts) != 3:
            continue
        key, name = parts[1], parts[2]
        grouped.setdefault((name, reason.formula, reason.source), []).append(
            (runs.get(key, key), reason)
        )
    items = []
    for (name, formula, source), entries in grouped.items():
        inputs = tuple(
            (run, ", ".join(f"{k.replace('_', ' ')} {v}" for k, v in r.inputs))
            for run, r in entries
        )
        items.append(
            FigureItem(
                f"wires.*.{name}",
                EACH_RUN_LABEL.format(label=_wire_field(name)),
                Cell("see the schedule"),
                formula,
                inputs,
                source,
                listed=True,
            )
        )
    return items


def _strings(ri: ReportInputs, tree: dict) -> Section:
    p, d = ri.project, ri.design
    a, c, b = d.array, d.controller, d.battery
    m = p.module
    rows = [
        _fig_row(a.modules_series, "array.modules_series"),
        _fig_row(a.modules_parallel, "array.modules_parallel"),
        (_c("Module Voc / Vmp at STC"), _c(f"{m.voc_v:g} V / {m.vmp_v:g} V")),
        _fig_row(a.voc_cold_v, "array.voc_cold_v"),
        _fig_row(a.string_voc_cold_v, "array.string_voc_cold_v"),
        _fig_row(c.max_pv_voltage_v, "controller.max_pv_voltage_v"),
        _fig_row(a.vmp_hot_v, "array.vmp_hot_v"),
        _fig_row(a.string_vmp_hot_v, "array.string_vmp_hot_v"),
        _fig_row(b.absorption_voltage_v, "battery.absorption_voltage_v"),
    ]
    blocks: list[Block] = [Table("strings", ("String", "Value"), tuple(rows), ("l", "r"))]
    ok_cold = a.string_voc_cold_v < c.max_pv_voltage_v
    blocks.append(
        Paragraph(
            f"The cold string open-circuit voltage ({a.string_voc_cold_v:.1f} V) is "
            f"{'below' if ok_cold else 'ABOVE'} the controller's maximum "
            f"({c.max_pv_voltage_v:g} V); the hot string maximum-power voltage "
            f"({a.string_vmp_hot_v:.1f} V) is {'above' if a.string_vmp_hot_v > b.absorption_voltage_v else 'BELOW'} "  # noqa: E501
            f"the battery's absorption voltage ({b.absorption_voltage_v:.1f} V)."
        )
    )
    reason = d.reasons.get("array.modules_series")
    if reason:
        blocks.append(Paragraph(f"Series count: {reason.formula}. Source: {reason.source}."))
    layout = []
    shown = min(a.modules_parallel, 4)
    chain = " - ".join(f"[M{k + 1}]" for k in range(min(a.modules_series, 8)))
    if a.modules_series > 8:
        chain += f" - ... ({a.modules_series} modules)"
    for s in range(shown):
        layout.append(f"String {s + 1}: (+) {chain} (-)")
    if a.modules_parallel > shown:
        layout.append(f"... {a.modules_parallel} strings in parallel in all")
    per_ctrl = math.ceil(a.modules_parallel / c.count)
    layout.append(
        f"{a.modules_parallel} string(s) into {c.count} controller(s), up to "
        f"{per_ctrl} per controller"
    )
    blocks.append(Chart("string-layout", "String layout", "", tuple(layout)))
    return Section("strings", "String layout", tuple(blocks))


def _wiring(ri: ReportInputs, tree: dict) -> Section:
    d, p = ri.design, ri.project
    wires = wires_of(d)
    devices = devices_of(d)
    blocks: list[Block] = []
    if wires:
        materials = {w.material for w in wires}
        rows = []
        for k, w in enumerate(wires):
            fuse = w.fuse_a
            rows.append(
                (
                    _c(w.run),
                    Cell(str(w.count), float(w.count), f"wires.{k}.count"),
                    _num(float(w.current_a), 1, f"wires.{k}.current_a"),
                    _num(float(w.operating_current_a), 1, f"wires.{k}.drop_current_a"),
                    _num(float(w.length_m), 1, f"wires.{k}.length_m"),
                    _c(w.size + ("" if len(materials) == 1 else f" {w.material}")),
                    _num(float(w.drop_pct), 2, f"wires.{k}.drop_pct"),
                    _num(float(w.ampacity_a), 0, f"wires.{k}.ampacity_a"),
                    _c("-")
                    if fuse is None
                    else Cell(f"{float(fuse):g}", float(fuse), f"wires.{k}.fuse_a"),
                )
            )
        material = f"{materials.pop()} conductors; " if len(materials) == 1 else ""
        table = table_entry("wiring")
        blocks.append(
            Table(
                table.id,
                (table.title, *table.columns(figure_entry)),
                tuple(rows),
                ("l", "r", "r", "r", "r", "l", "r", "r", "r"),
                f"{material}{table.note}",
                wrap=(0,),
            )
        )
    else:
        blocks.append(
            Paragraph(
                "The wiring schedule is not computed for this design: size each conductor for "
                "ampacity (1.25 x 1.25 x Isc on PV circuits, NEC 690.8) and for the voltage-drop "
                f"limits ({p.choices.drop_limit_array_pct:g} % array, "
                f"{p.choices.drop_limit_battery_pct:g} % battery, "
                f"{p.choices.drop_limit_load_pct:g} %"
                " loads) before building."
            )
        )
    if devices:
        items = []
        for dev in devices:
            rating, volt, aic = dev.rating_a, dev.voltage_v, dev.interrupt_rating_a
            count = dev.count
            what = dev.kind
            if rating is not None:
                what = f"{float(rating):g} A {what}"
            if volt:
                what += f", at least {math.ceil(float(volt) - 1e-9)} V DC"
            if aic:
                what += f", interrupting at least {float(aic):,.0f} A"
            text = f"{dev.location}: {count} x {what}"
            note = dev.note
            if note:
                text += f"; {note}"
            src = dev.source
            if src:
                text += f" ({src})"
            items.append(text)
        blocks.append(Paragraph("Protective devices and disconnects:"))
        blocks.append(Bullets(tuple(items)))
    return Section("wiring", "Wiring and protection schedule", tuple(blocks))


def _bom(ri: ReportInputs, bom: tuple[BomLine, ...], cost: LifecycleCost) -> Section:
    cur = cost.currency
    rows = []
    for n, (ln, cl) in enumerate(zip(bom, cost.lines, strict=True), start=1):
        rows.append(
            (
                _c(str(n)),
                _c(ln.description),
                Cell(f"{ln.quantity:g}", ln.quantity, ln.figure or None),
                _c(ln.unit),
                _c(money(cl.unit_price)),
                _c(money(cl.total)),
            )
        )
    blocks: list[Block] = [
        Table(
            "bom",
            ("#", "Part", "Qty", "Unit", f"Price {cur}", f"Total {cur}"),
            tuple(rows),
            ("r", "l", "r", "l", "r", "r"),
            "Quantities follow from the design; prices from the project's price list.",
            wrap=(1,),
        )
    ]
    blocks.append(
        Paragraph(
            "Part keys (what the price list refers to) and how each quantity "
            "follows from the design:"
        )
    )
    blocks.append(
        Bullets(tuple(f"[{n}] {ln.key}: {ln.follows}" for n, ln in enumerate(bom, start=1)))
    )
    apart = [str(n) for n, cl in enumerate(cost.lines, start=1) if cl.apart]
    if apart:  # the generator's lines (issue 16)
        blocks.append(
            Paragraph(
                f"Parts {', '.join(apart)} are the generator and what its cautions ask for: "
                "priced here, but costed over the life (run-hour life, fuel, overhauls) in "
                "the generator section, not in the capital below."
            )
        )
        open_keys = [cl.key for cl in cost.lines if cl.apart and cl.unit_price is None]
        if open_keys:
            blocks.append(
                Bullets(
                    (
                        f"{len(open_keys)} of the generator's lines have no price: "
                        + ", ".join(open_keys)
                        + ". Add them to the project's [[prices]] list.",
                    ),
                    "warning",
                )
            )
    if cost.missing:
        blocks.append(Bullets((cost.message(),), "warning"))
    elif cost.capital is not None:
        blocks.append(
            Paragraph(
                f"Parts {money(cost.parts, cur)}; installation "
                f"{money(cost.installation, cur)}; capital cost "
                f"{money(cost.capital, cur)}."
            )
        )
    return Section("bom", "Bill of materials", tuple(blocks))


def _costs(ri: ReportInputs, cost: LifecycleCost) -> Section:
    e = cost.economics
    cur = cost.currency
    blocks: list[Block] = []
    blocks.append(
        Paragraph(
            f"Present-worth method over {e.life_years} years at a discount rate of "
            f"{e.discount_rate_pct:g} % and price inflation of {e.inflation_pct:g} % a year "
            "(Duffie & Beckman, Solar Engineering of Thermal Processes, 4th ed., ch. 11)."
        )
    )
    blocks.append(
        Bullets(
            (
                "PW(n) = ((1 + i) / (1 + d))^n: present worth of a payment n years ahead at "
                "today's "
                "price",
                "PWF(N, i, d) = 1/(d - i) x [1 - ((1 + i)/(1 + d))^N] (N/(1 + i) when i = d): "
                "present "
                "worth of N yearly payments (eq. 11.5.1)",
                "Lifecycle cost = capital + sum of replacements x PW(n) + yearly upkeep x PWF(N, "
                "i, d)",
                "Cost per kWh delivered = lifecycle cost / (energy delivered per year x PWF(N, 0, "
                "d))",
            )
        )
    )
    rows = []
    lasting = []
    for n, cl in enumerate(cost.lines, start=1):
        if cl.apart:  # a generator line: its life and replacements are the generator's
            continue
        if not cl.replaced_at:
            lasting.append(f"{n}")
            continue
        when = ", ".join(f"{y:g}" for y in cl.replaced_at)
        rows.append(
            (_c(str(n)), _c(cl.key), _num(cl.life_years, 1), _c(when), _c(money(cl.replacement_pw)))
        )
    if rows:
        blocks.append(
            Table(
                "replacements",
                ("#", "Part", "Life, years", "Replaced in year", f"Present worth {cur}"),
                tuple(rows),
                ("r", "l", "r", "l", "r"),
                "Parts numbered as in the bill of materials.",
                wrap=(1, 3),
            )
        )
    if lasting:
        blocks.append(
            Paragraph(
                f"Not replaced within the {e.life_years} years (service life at least that long): "
                f"parts {', '.join(lasting)} of the bill of materials."
            )
        )
    blocks.append(
        Paragraph(f"Battery life {cost.battery_life_years:g} years: {cost.battery_life_source}.")
    )
    served = (
        ""
        if cost.served_fraction >= 1
        else (f" x {cost.served_fraction:.3f} share of demand served (simulation)")
    )
    energy_row = (
        _c(figure_entry("costs.energy_kwh_year").label),
        _c(figure_entry("costs.energy_kwh_year").text(cost.energy_kwh_year)),
    )
    if cost.missing:
        blocks.append(Table("lifecycle", ("Item", "Value"), (energy_row,), ("l", "r")))
        blocks.append(Bullets((cost.message(),), "warning"))
        return Section("costs", "Costs over the project life", tuple(blocks))
    rows2 = [
        _cost_row(cost, "costs.capital"),
        _cost_row(cost, "costs.replacements_pw"),
        _composite_row(cost, "costs.upkeep_row"),
        _cost_row(cost, "costs.lcc"),
        energy_row,
        _composite_row(cost, "costs.discounted_energy_row"),
        _cost_row(cost, "costs.cost_per_kwh"),
    ]
    blocks.append(Table("lifecycle", ("Item", "Value"), tuple(rows2), ("l", "r"), wrap=(0,)))
    blocks.append(
        Paragraph(
            "Energy delivered = daily AC and DC energy at the appliances by month x days in the "
            f"month{served}. Replacements are priced at today's part price raised by inflation, "
            "without labour; no salvage value is credited."
        )
    )
    return Section("costs", "Costs over the project life", tuple(blocks))


def _cost_row(cost: LifecycleCost, path: str) -> tuple[Cell, Cell]:
    """One row of the lifecycle table: the catalogue's label, unit and digits for the value
    at ``path`` of the cost; '-' where it is not known."""
    e = figure_entry(path)
    v = outcome_value(cost, path)
    text = "-" if v is None else e.text(float(v), currency=cost.currency)
    return _c(e.label), Cell(text, v, path)


def _composite_row(cost: LifecycleCost, entry_id: str) -> tuple[Cell, Cell]:
    """A lifecycle row whose label carries figures: the catalogue's template filled, and
    the value of the figure it names (offgrid/catalogue/composites.py)."""
    row = composite(entry_id)
    label = fill(entry_id, cost, cost.currency)
    _, value = _cost_row(cost, row.value)
    return _c(label), value


def _month_table_rows(months, table_id: str) -> tuple[tuple[Cell, ...], ...]:
    """The rows of a catalogue table of monthly figures (``reliability-months``): each
    row's heading and digits its figure's, each month's value scaled as the figure says."""
    rows = []
    for path in table_entry(table_id).figures:
        e = figure_entry(path)
        name = path.rsplit(".", 1)[1]
        values = [e.shown(getattr(m, name)) for m in months]  # a field named in the table
        rows.append(_month_row(e.heading(), values, None, e.digits or 0))
    return tuple(rows)


def _reliability(ri: ReportInputs) -> Section | None:
    study = ri.reliability
    if study is None:
        return None
    rel = study.reliability
    blocks: list[Block] = []
    weather = study.weather or {}
    seed = rel.seed
    blocks.append(
        Paragraph(
            f"Energy balance of this design, {rel.mode} steps, over "
            f"{rel.years} years of weather ({rel.measured_years} measured, the rest "
            f"synthetic; seed {'random' if seed is None else seed}). Weather: "
            f"{weather.get('source') or rel.weather_source}."
        )
    )
    reasons = rel.reasons
    items = []
    for row in RELIABILITY_FIGURES:  # the catalogue's rows, read as they are now
        e = figure_entry(row.path)
        v = outcome_value(rel, e.path)
        if not isinstance(v, int | float) or isinstance(v, bool) or not math.isfinite(v):
            continue
        if e.path == "reliability.shed_days" and rel.days:
            text = f"{int(v):,d} of {int(rel.days):,d} {e.unit}"
        else:
            text = e.text(float(v))
        r = reasons.get(outcome_key(e.explained_by))
        items.append(
            FigureItem(
                e.path,
                e.label,
                Cell(text, float(e.shown(v)), e.path),
                r.formula if r else "",
                r.inputs if r else (),
                r.source if r else "",
            )
        )
    if items:
        blocks.append(Figures(tuple(items), "Reliability figures"))
    months = rel.months
    if len(months) == 12:
        table = table_entry("reliability-months")
        blocks.append(
            Table(
                table.id,
                (table.title, *MONTHS),
                _month_table_rows(months, table.id),
                ("l",) + ("r",) * 12,
                table.note,
            )
        )
        worst = rel.worst_year_soc_min
        svg = (
            charts.soc_by_month_svg(
                [m.soc_min_p5 for m in months],
                [m.soc_min_p50 for m in months],
                [m.soc_min_p95 for m in months],
                worst,
                ri.design.battery.max_dod,
            )
            if ri.charts
            else ""
        )
        text = charts.text_bars(
            MONTHS, (("p5", "#", [100 * m.soc_min_p5 for m in months]),), 78, "% lowest SoC"
        )
        blocks.append(
            Chart(
                "soc",
                "State of charge through the year",
                svg,
                tuple(text),
                "Lowest state of charge of the day: 5th to 95th percentile by month "
                "(band), median (line) and the year with the most shedding (thin).",
            )
        )
    tr = study.tradeoff
    if tr is not None:
        blocks += _tradeoff_blocks(ri, tr)
    notes = rel.notes + (tr.notes if tr is not None else ())
    if notes:
        blocks.append(Bullets(notes))
    return Section("reliability", "Reliability", tuple(blocks))


def _tradeoff_blocks(ri: ReportInputs, tr: TradeOff) -> list[Block]:
    from offgrid.simulate.tradeoff import point_text, target_texts

    blocks: list[Block] = []
    curves = []
    rows = []
    messages: list[str] = []
    for t in tr.targets:
        pts = [p for p in t.points]
        if pts:
            curves.append(
                (
                    f"LOLP {t.target:.2%}".replace(".00%", "%"),
                    [p.capacity_wh / 1000 for p in pts],
                    [p.array_w / 1000 for p in pts],
                )
            )
        cheapest = point_text(t.cheapest)
        if t.cheapest is not None and t.cheapest_cost is not None:
            cheapest += f" ({t.cheapest_cost:,.0f} {ri.project.economics.currency})"
        rows.append((*(_c(x) for x in target_texts(t)), _c(cheapest)))
        if t.message:
            messages.append(f"LOLP {t.target:.3%}: {t.message}")
    svg = ""
    if ri.charts and curves:
        svg = charts.tradeoff_svg(
            curves,
            (tr.design_capacity_wh / 1000, tr.design_array_w / 1000),
            "battery capacity (kWh)",
            "array power (kW)",
        )
    blocks.append(
        Chart(
            "tradeoff",
            "Array and battery for a target LOLP",
            svg,
            tuple(
                f"{c[0]}: "
                + ", ".join(
                    f"{x:.1f} kWh/{y:.2f} kW" for x, y in list(zip(c[1], c[2], strict=True))[:4]
                )
                + (" ..." if len(c[1]) > 4 else "")
                for c in curves
            ),
            "Each line joins the array and battery sizes that just meet a target "
            "loss-of-load probability; the star is this design "
            f"(LOLP {tr.design_lolp:.3%}).",
        )
    )
    table = table_entry("tradeoff")
    blocks.append(
        Table(
            table.id,
            table.columns(figure_entry),
            tuple(rows),
            ("r", "l", "r", "l"),
            table.note,
            wrap=(3,),
        )
    )
    if messages:
        blocks.append(Bullets(tuple(messages)))
    return blocks


def _variants(ri: ReportInputs) -> Section | None:
    cmp = ri.comparison
    if cmp is None or len(cmp.columns) < 2:
        return None
    names = tuple(c.name for c in cmp.columns)
    rows = []
    for r in cmp.rows:
        entry = find_input(r.label) if r.group == "choices" else None  # a changed input
        name = entry.label if entry is not None else r.label
        label = f"{name} ({r.unit})" if r.unit else name  # as FigureEntry.heading
        cells = [
            Cell(t + (" *" if dif else ""), v if isinstance(v, int | float) else None, None, dif)
            for t, v, dif in zip(r.texts, r.values, r.differs, strict=True)
        ]
        rows.append((_c(label), *cells))
    blocks: list[Block] = [
        Table(
            "variants",
            ("", *names),
            tuple(rows),
            ("l",) + ("r",) * len(names),
            "* differs from the base design.",
            wrap=tuple(range(len(names) + 1)),
        )
    ]
    notes = []
    for col in cmp.columns[1:]:
        changes = "; ".join(f"{p} = {v}" for p, v in col.overrides) or "no change"
        line = f"{col.name}: {changes}"
        if col.note:
            line += f" ({col.note})"
        if col.error:
            line += f". Not designed: {col.error}"
        notes.append(line)
    blocks.append(Bullets(tuple(notes)))
    return Section("variants", "Variants side by side", tuple(blocks))


def _cautions(ri: ReportInputs) -> Section:
    d = ri.design
    blocks: list[Block] = []
    if d.warnings:
        blocks.append(Bullets(tuple(f"{n.message} [{n.code}]" for n in d.warnings), "warning"))
    cautions = list(d.cautions)
    for extra in ri.reliability.cautions if ri.reliability is not None else ():
        if extra not in cautions:
            cautions.append(extra)
    if ri.project.generator is not None:  # issue 16: a generator's own cautions
        from offgrid.generator.cautions import generator_cautions

        cautions.extend(c for c in generator_cautions(ri.project.generator) if c not in cautions)
    if not any("defers to local electrical code" in c for c in cautions):
        cautions.append(DEFERS_TO_CODE)
    blocks.append(Bullets(tuple(cautions), "caution"))
    return Section("cautions", "Warnings and safety cautions", tuple(blocks))


def _assumptions(ri: ReportInputs, tree: dict) -> Section:
    p, d = ri.project, ri.design
    a = d.array
    dm = d.site.design_month - 1
    table = table_entry("derates")
    rows = [
        (_c(label_of(f"array.derates.{name}")), _num(v, 3, f"array.derates.{name}"))
        for name, v in a.derates.items()
    ]
    rows.append((_c(label_of("array.derate_total")), _num(a.derate_total, 3, "array.derate_total")))
    blocks: list[Block] = [
        Table(
            table.id,
            (table.title, MONTHS[dm]),
            tuple(rows),
            ("l", "r"),
            f"In the design month ({MONTHS[dm]}).",
        )
    ]
    ch = p.choices
    b, m, cs, inv = p.battery, p.module, p.controller, p.inverter
    items = [
        ("Days of autonomy", f"{ch.autonomy_days:g}"),
        (label_of("battery.max_dod"), f"{d.battery.max_dod:.0%}"),
        ("Load growth margin", f"{ch.load_growth_pct:g} %"),
        ("Coincidence factor (AC)", f"{ch.coincidence_factor:g}"),
        ("Battery end-of-life capacity", f"{ch.ageing_factor:.0%}"),
        (label_of("battery.temp_factor"), f"{d.battery.temp_factor:.3f}"),
        ("System voltage", f"{ch.system_voltage}"),
        ("Minimum tilt", f"{ch.min_tilt_deg:g} deg"),
        (
            "Voltage-drop limits",
            f"array {ch.drop_limit_array_pct:g} %, battery "
            f"{ch.drop_limit_battery_pct:g} %, loads "
            f"{ch.drop_limit_load_pct:g} %",
        ),
        (
            "PV module",
            f"{m.name}: {m.pmax_w:g} W, Vmp {m.vmp_v:g} V, Imp {m.imp_a:g} A, Voc "
            f"{m.voc_v:g} V, Isc {m.isc_a:g} A, gamma {m.gamma_pmax_pct_per_c:g} %/C, "
            f"beta {m.beta_voc_pct_per_c:g} %/C, NOCT {m.noct_c:g} C",
        ),
        (
            "Battery unit",
            f"{b.name}: {b.chemistry}, {b.nominal_voltage_v:g} V, "
            f"{b.capacity_ah:g} Ah, round trip {b.efficiency:.0%}",
        ),
        (
            "Charge controller",
            f"{cs.type.upper()}, up to {cs.max_pv_voltage_v:g} V PV, "
            f"efficiency {cs.efficiency:.0%}",
        ),
        (
            "Inverter",
            f"efficiency {inv.efficiency:.0%}, idle {inv.self_consumption_w:g} W for "
            f"{inv.hours_on_per_day:g} h/day",
        ),
        ("Albedo", _albedo_text(p.site.albedo)),
    ]
    w = p.wiring
    ambient = (
        "the site's hottest monthly mean" if w.ambient_temp_c is None else f"{w.ambient_temp_c:g} C"
    )
    items.append(
        (
            "Cables",
            f"{w.material}, {'AWG' if w.units == 'awg' else 'mm2'} sizes, "
            f"{w.insulation_temp_c} C insulation, resistance at "
            f"{w.conductor_temp_c:g} C, ampacity at {ambient}",
        )
    )
    items.append(
        (
            "Cable runs, one-way",
            f"string {w.string_run_m:g} m, array "
            f"{w.array_run_m:g} m, controller to battery "
            f"{w.controller_battery_m:g} m, battery to "
            f"inverter {w.battery_inverter_m:g} m, DC loads "
            f"{w.dc_load_run_m:g} m unless set per load",
        )
    )
    blocks.append(
        Table(
            "assumptions",
            ("Assumption", "Value"),
            tuple((_c(k), _c(v)) for k, v in items),
            ("l", "l"),
            wrap=(1,),
        )
    )
    blocks.append(
        Paragraph(
            "Figures marked 'common practice, no source' follow the usual rule "
            "of the trade; 'confirm against ...' marks a value not yet checked "
            "against its published source: check it there before relying on "
            "it."
        )
    )
    return Section("assumptions", "Assumptions and derates", tuple(blocks))


def _albedo_text(albedo) -> str:
    """The site's ground reflectance as typed: one value, by month, or automatic."""
    from offgrid.climate.sky import describe_albedo

    if albedo is None:
        return "automatic (the climate file's own, else 0.2)"
    return describe_albedo(albedo)
