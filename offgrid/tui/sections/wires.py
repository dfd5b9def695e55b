"""Section 5, Wires: the cable runs with their size, voltage drop and protection.

The runs come from the electrical design (``SystemDesign.wires``) when the engine
provides it; until then the section shows the main DC currents the sizing gives.
Records are read field by field, so new fields show up without changes here.
"""

from __future__ import annotations

import dataclasses

from rich.text import Text
from textual.app import ComposeResult
from textual.widgets import DataTable, Static

from offgrid.result import SystemDesign
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.sections.sizes import _show_value
from offgrid.tui.session import Session
from offgrid.tui.widgets.steady import SteadyTable

PREFERRED = ("name", "label", "run", "from_", "to", "current_a", "length_m", "material",
             "size", "size_mm2", "size_awg", "drop_v", "drop_pct", "limit_pct", "ampacity_a",
             "fuse_a", "protection_a", "protection")


def _columns(record) -> list[str]:
    names = [f.name for f in dataclasses.fields(record)
             if _show_value(getattr(record, f.name)) is not None]
    return sorted(names, key=lambda n: (PREFERRED.index(n) if n in PREFERRED else 99))


def basic_rows(d: SystemDesign) -> list[tuple[str, str, str]]:
    """What the sizing alone says about the circuits."""
    a, c, inv, b = d.array, d.controller, d.inverter, d.battery
    rows = [
        ("Array string, cold open-circuit voltage", f"{a.string_voc_cold_v:.1f} V",
         "array.modules_series"),
        ("Controller maximum PV voltage", f"{c.max_pv_voltage_v:g} V", "array.modules_series"),
        ("Array to controller, current needed", f"{c.required_current_a:.1f} A",
         "controller.required_current_a"),
        ("Controller to battery, rating", f"{c.current_a:.0f} A", "controller.current_a"),
        ("Battery voltage", f"{b.system_voltage_v} V", "battery.system_voltage_v"),
    ]
    if inv.needed:
        rows.append(("Battery to inverter, current at cut-off", f"{inv.dc_input_current_a:.1f} A",
                     "inverter.dc_input_current_a"))
    return rows


class WiresSection(Section):
    section_id = "wires"
    help_text = ("The wiring: each run with its current, length, size, voltage drop and fuse "
                 "or breaker. Put the cursor on a figure and press w for its reason.")

    def compose(self) -> ComposeResult:
        yield Static(id="wires-note", classes="table-title")
        yield SteadyTable(id="wires-table", cursor_type="row", zebra_stripes=True)

    @property
    def table(self) -> DataTable:
        return self.query_one("#wires-table", DataTable)

    def first_focus(self):
        return self.table

    def show(self, session: Session) -> None:
        d = session.design
        table = self.table
        keep = table.cursor_row or 0
        table.clear(columns=True)
        note = self.query_one("#wires-note", Static)
        self._paths: list[tuple[str, str, str | None]] = []
        if d is None:
            note.update(Text("No design yet, so no wiring: see the headline above.",
                             style="italic"))
            return
        runs = getattr(d, "wires", None)
        if runs:
            records = list(runs.values()) if isinstance(runs, dict) else list(runs)
            records = [r for r in records if dataclasses.is_dataclass(r)]
        else:
            records = []
        if records:
            cols = _columns(records[0])
            for name in cols:
                table.add_column(name.replace("_", " ").strip(), key=name)
            for i, r in enumerate(records):
                table.add_row(*[Text(_show_value(getattr(r, n)) or "") for n in cols],
                              key=str(i))
                label = str(getattr(r, cols[0], f"run {i + 1}"))
                self._paths.append((label, "", f"wires[{i + 1}]"))
            note.update(Text(f"{len(records)} cable run(s). Sizes meet both the ampacity and "
                             "the voltage-drop limit of each run.", style="bold"))
        else:
            table.add_column("Circuit", key="c", width=42)
            table.add_column("Figure", key="v")
            for label, value, path in basic_rows(d):
                table.add_row(Text(label), Text(value, style="bold"))
                self._paths.append((label, value, path))
            note.update(Text("Main DC circuits from the sizing. Cable sizes, voltage drop and "
                             "fuses per run appear here with the electrical design.",
                             style="bold"))
        if table.row_count:
            table.move_cursor(row=min(keep, table.row_count - 1), animate=False)

    def figure(self) -> Figure | None:
        paths = getattr(self, "_paths", [])
        if not paths:
            return None
        label, value, path = paths[min(self.table.cursor_row, len(paths) - 1)]
        return Figure(label, value, path)
