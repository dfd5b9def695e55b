"""Section 4, Sizes: every figure of the design, and supply against demand by month."""

from __future__ import annotations

import dataclasses
import math

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable

from offgrid.catalogue import FIGURE_GROUPS, figure_entry, find_figure
from offgrid.design.result import SystemDesign
from offgrid.tui.keys import focus_now
from offgrid.tui.messages import WhyAsked, send
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import Session
from offgrid.tui.text import printable
from offgrid.tui.widgets.monthchart import MONTHS, MonthChart
from offgrid.tui.widgets.steady import SteadyTable

KNOWN = {
    "loads",
    "site",
    "array",
    "battery",
    "controller",
    "inverter",
    "warnings",
    "cautions",
    "reasons",
    "electrical",
    "wires",
}
Row = str | tuple[str, str, str | None]


def figure_row(
    path: str, value: str | None = None, number: float | None = None
) -> tuple[str, str, str]:
    """(label, value, reason path) of the catalogue's figure at ``path``: its label, the
    value given (else ``number`` with the figure's digits and unit) and its reason."""
    e = figure_entry(path)
    return (e.label, value if value is not None else e.text(float(number or 0)), e.explained_by)


def figure_rows(d: SystemDesign) -> list[Row]:
    """Headings and (label, value, reason path) rows for every figure of the design."""
    a, b, c, inv, ld, s = d.array, d.battery, d.controller, d.inverter, d.loads, d.site
    dm = s.design_month - 1
    rows: list[Row] = [
        FIGURE_GROUPS["array"],
        figure_row("array.power_w", number=a.power_w),
        figure_row(
            "array.module_count",
            f"{a.modules_series} in series \u00d7 {a.modules_parallel} strings = "
            f"{a.module_count} \u00d7 {a.module_power_w:g} W",
        ),
        figure_row("array.modules_parallel", f"{a.modules_parallel}"),
        figure_row("array.required_power_w", number=a.required_power_w),
        figure_row("array.derate_total", number=a.derate_total),
        *[
            (
                f"  {_derate_label(d, name)}",
                f"{value:.3f}",
                f"array.derates.{name}"
                if f"array.derates.{name}" in d.reasons
                else "array.required_power_w",
            )
            for name, value in a.derates.items()
        ],
        figure_row("array.string_voc_cold_v", number=a.string_voc_cold_v),
        figure_row("array.string_vmp_hot_v", number=a.string_vmp_hot_v),
        FIGURE_GROUPS["battery"],
        figure_row("battery.system_voltage_v", f"{b.system_voltage_v} V"),
        figure_row("battery.capacity_ah", number=b.capacity_ah),
        figure_row("battery.required_ah", number=b.required_ah),
        figure_row("battery.nominal_kwh", f"{b.nominal_kwh:.2f} kWh at {b.bank_voltage_v:g} V"),
        figure_row("battery.usable_kwh", f"{b.usable_kwh:.2f} kWh at {b.max_dod:.0%} DoD"),
        figure_row(
            "battery.unit_count",
            f"{b.units_series} in series \u00d7 {b.units_parallel} strings = {b.unit_count}",
        ),
        figure_row("battery.autonomy_days", f"{b.autonomy_days:g} days"),
        figure_row("battery.temp_factor", number=b.temp_factor),
        figure_row("battery.capacity_temp_c", number=b.capacity_temp_c),
        figure_row("battery.ageing_temp_c", f"up to {b.ageing_temp_c:.1f} C"),
        figure_row("battery.calendar_life_years", number=b.calendar_life_years),
        FIGURE_GROUPS["controller"],
        figure_row(
            "controller.current_a",
            (f"{c.count} \u00d7 " if c.count > 1 else "") + f"{c.current_a:.0f} A {c.type.upper()}",
        ),
        figure_row("controller.required_current_a", number=c.required_current_a),
        FIGURE_GROUPS["inverter"],
        *(
            (
                figure_row("inverter.continuous_w", number=inv.continuous_w),
                figure_row(
                    "inverter.surge_w",
                    f"{inv.surge_w:,.0f} W (needs {inv.required_surge_w:,.0f} W)",
                ),
                figure_row("inverter.dc_input_current_a", number=inv.dc_input_current_a),
            )
            if inv.needed
            else (figure_row("inverter.continuous_w", "none: no AC loads"),)
        ),
        FIGURE_GROUPS["loads_site"],
        figure_row("site.design_month", MONTHS[dm]),
        figure_row("loads.design_daily_energy_wh", number=ld.design_daily_energy_wh),
        figure_row("loads.max_daily_energy_wh", number=ld.max_daily_energy_wh),
        figure_row("loads.peak_ac_w", number=ld.peak_ac_w),
        figure_row(
            "loads.largest_surge_w",
            (
                f"{ld.largest_surge_w:,.0f} W ({printable(ld.largest_surge_load)}, "
                f"{ld.largest_surge_ac_dc.upper()})"
                if ld.largest_surge_load
                else "none given"
            ),
        ),
        figure_row("loads.inverter_idle_wh", number=ld.inverter_idle_wh),
        figure_row("site.poa_kwh_m2_day", f"{s.poa_kwh_m2_day[dm]:.2f} kWh/m2/day in {MONTHS[dm]}"),
        figure_row("site.tilt_deg", number=s.tilt_deg),
        figure_row("site.azimuth_deg", number=s.azimuth_deg),
        figure_row("site.record_low_c", number=s.record_low_c),
    ]
    rows += electrical_rows(d)
    rows += extra_rows(d)
    return rows


def _derate_label(d: SystemDesign, name: str) -> str:
    entry = find_figure(f"array.derates.{name}")
    return entry.label if entry is not None else f"Derate: {name}"


def electrical_rows(d: SystemDesign) -> list[Row]:
    """Strings, module operating point and harvest from the electrical design, if present."""
    er = d.electrical
    if er is None:
        return []
    rows: list[Row] = [FIGURE_GROUPS["strings_module"]]
    w, lay, h, mp = er.strings.window, er.strings.layout, er.harvest, er.mpp
    rows += [
        figure_row("electrical.strings.max_series", f"{w.max_series} (fewest {w.min_series})"),
        figure_row(
            "electrical.strings.series",
            f"{lay.series} in series \u00d7 {lay.parallel} strings"
            + (f" on {lay.controllers} controllers" if lay.controllers > 1 else ""),
        ),
        figure_row(
            "mpp.pmp_w",
            f"{mp.pmp_w:.0f} W at {mp.vmp_v:.1f} V, {mp.imp_a:.2f} A ({mp.cell_temp_c:.0f} C cell)",
        ),
        figure_row(
            "electrical.harvest.pwm_vs_mppt_pct", f"{h.pwm_vs_mppt_pct:+.1f} % in the design month"
        ),
    ]
    if h.shortfall_pct > 0:
        rows.append(figure_row("electrical.harvest.shortfall_pct", number=h.shortfall_pct))
    rows.append(
        figure_row(
            "electrical.protection.bank_fault_current_a", number=er.protection.bank_fault_current_a
        )
    )
    return rows


def _show_value(value) -> str | None:
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        return (
            f"{value:,.3g}"
            if abs(value) < 100
            else f"{value:,.0f}"
            if math.isfinite(value)
            else "-"
        )
    if isinstance(value, str):
        return printable(value)
    return None


def extra_rows(d: SystemDesign) -> list[Row]:
    """Figures of results that later parts of the engine add (shown as they arrive)."""
    rows: list[Row] = []
    for f in dataclasses.fields(d):
        if f.name in KNOWN or f.name == "wires":
            continue
        value = getattr(d, f.name)  # dynamic: every declared field of the design record
        if not dataclasses.is_dataclass(value):
            continue
        rows.append(f.name.replace("_", " ").capitalize())
        for g in dataclasses.fields(value):
            shown = _show_value(getattr(value, g.name))
            if shown is not None:
                path = f"{f.name}.{g.name}"
                entry = find_figure(path)  # a catalogued figure keeps its one label
                label = entry.label if entry else g.name.replace("_", " ")
                rows.append((label, shown, entry.explained_by if entry else path))
    return rows


class FigureTable(SteadyTable):
    BINDINGS = [Binding("enter", "select_cursor", "Why", id="sizes.why", show=False)]

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="row", zebra_stripes=False, **kwargs)
        self.rows_shown: list[Row] = []

    def fill(self, d: SystemDesign | None, error: str | None) -> None:
        keep = self.cursor_row or 1
        self.clear(columns=not self.columns)
        if not self.columns:
            self.add_column("Figure", width=31, key="label")
            self.add_column("Value", key="value")
        self.rows_shown = figure_rows(d) if d is not None else []
        if d is None:
            self.add_row(Text("No design", style="bold"), Text(printable(error or "")))
            return
        for i, row in enumerate(self.rows_shown):
            if isinstance(row, str):
                self.add_row(Text(row, style="bold underline"), Text(""), key=f"g{i}")
            else:
                label, value, _path = row
                self.add_row(Text("  " + label), Text(value, style="bold"), key=f"r{i}")
        self.move_cursor(row=min(keep, self.row_count - 1), animate=False)

    def is_heading(self, row: int) -> bool:
        return 0 <= row < len(self.rows_shown) and isinstance(self.rows_shown[row], str)

    def current(self) -> tuple[str, str, str | None] | None:
        if not self.rows_shown:
            return None
        row = self.rows_shown[min(self.cursor_row, len(self.rows_shown) - 1)]
        return None if isinstance(row, str) else row


class SizesSection(Section):
    section_id = "sizes"
    KEY_WIDGETS = (FigureTable,)
    help_text = (
        "The sized system. Every figure has its reason: put the cursor on it and press "
        "w. The chart compares what the array delivers to the battery with the demand, "
        "month by month; the design month is the one with the least to spare."
    )

    def compose(self) -> ComposeResult:
        yield FigureTable(id="figures")
        yield MonthChart(id="balance")

    @property
    def table(self) -> FigureTable:
        return self.query_one(FigureTable)

    def first_focus(self):
        return self.table

    def show(self, session: Session) -> None:
        d = session.design
        self.table.fill(d, session.outcome.error)
        chart = self.query_one(MonthChart)
        if d is None:
            chart.show((), (), None, "No design yet: " + printable(session.outcome.error or ""))
        else:
            chart.show(d.array.supply_wh_day, d.loads.daily_energy_wh, d.site.design_month)

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        send(self, WhyAsked())

    def figure(self) -> Figure | None:
        row = self.table.current()
        if row is None:
            return None
        label, value, path = row
        return Figure(label, value, path)

    def reveal(self, path: str) -> bool:
        for i, row in enumerate(self.table.rows_shown):
            if not isinstance(row, str) and row[2] == path:
                self.table.move_cursor(row=i, animate=False)
                focus_now(self.table)
                return True
        return False
