"""Section 2, Loads: the appliance table, edited cell by cell, and the energy by month."""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable, Static

from offgrid.design.result import Reason, fmt
from offgrid.project.loads_csv import format_months, parse_months
from offgrid.tui.fields import LOAD_COLUMNS, Column, parse_number
from offgrid.tui.keys import focus_now
from offgrid.tui.messages import WhyAsked, send
from offgrid.tui.screens.dialogs import ChoiceDialog, ConfirmDialog, MessageDialog, PathDialog
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import EditRejected, Session
from offgrid.tui.text import clip, from_printable, printable
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.monthchart import MONTHS
from offgrid.tui.widgets.steady import SteadyTable

FIXED_WIDTH = sum(c.width for c in LOAD_COLUMNS if c.key != "name") + 1


def short4(value: float) -> str:
    """Four characters at most: 950, 2310, 12k."""
    return f"{value:.0f}" if value < 9999.5 else f"{value / 1000:.0f}k"


class LoadsTable(SteadyTable):
    """One row per appliance line; the cursor moves cell by cell."""

    BINDINGS = [Binding("enter", "select_cursor", "Edit", id="loads.edit")]

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="cell", cell_padding=0, zebra_stripes=True, **kwargs)
        self.name_width = 20

    def columns_for(self, width: int) -> None:
        self.name_width = max(12, width - FIXED_WIDTH - 2)
        self.clear(columns=True)
        for c in LOAD_COLUMNS:
            w = self.name_width if c.key == "name" else c.width
            label = (
                c.header.ljust(w) if c.kind in ("text", "months") else c.header.rjust(w - 1) + " "
            )
            self.add_column(Text(label, style="bold"), width=w, key=c.key)

    def cell(self, column: Column, value) -> Text:
        w = self.name_width if column.key == "name" else column.width
        if column.kind == "text":
            return Text(clip(printable(str(value)), w - 1).ljust(w))
        if column.kind == "months":
            shown = format_months(value)
            if len(shown) > w - 1:  # the count says it all; Enter shows the months
                shown = f"{len(value)} mo"
            return Text(shown.ljust(w))
        if column.kind == "choice":
            for v, label in column.choices:
                if v == value:
                    label = (column.short or {}).get(v, label)
                    return Text(label[: w - 1].rjust(w - 1) + " ")
        text = f"{value:g}" if isinstance(value, float) else str(value)
        return Text(clip(text, w - 1).rjust(w - 1) + " ")


class LoadsSection(Section):
    section_id = "loads"
    KEY_WIDGETS = (LoadsTable,)
    help_text = (
        "The appliances: Enter edits the cell under the cursor. The strip below shows "
        "the energy month by month, for all loads at the battery and for the "
        "appliance under the cursor."
    )

    BINDINGS = [
        Binding("a", "add", "Add", id="loads.add", tooltip="A new appliance line in the load list"),
        Binding(
            "d",
            "duplicate",
            "Copy",
            id="loads.duplicate",
            tooltip="Copy the appliance under the cursor",
        ),
        Binding(
            "x,delete",
            "delete",
            "Delete",
            id="loads.delete",
            tooltip="Remove the appliance under the cursor",
        ),
        Binding(
            "K,shift+up",
            "move(-1)",
            "Move up",
            id="loads.up",
            tooltip="Move the appliance up the list",
            show=False,
        ),
        Binding(
            "J,shift+down",
            "move(1)",
            "Move down",
            id="loads.down",
            tooltip="Move the appliance down the list",
            show=False,
        ),
        Binding(
            "i",
            "import_csv",
            "Import",
            id="loads.import",
            tooltip="Read appliances from a load list CSV file",
        ),
        Binding(
            "e",
            "export_csv",
            "Export",
            id="loads.export",
            tooltip="Write the appliances to a load list CSV file",
            show=False,
        ),
    ]

    def compose(self) -> ComposeResult:
        yield LoadsTable(id="loads-table")
        yield Static(id="loads-empty", classes="empty-note")
        yield Static(id="loads-months", classes="months-strip")
        yield EditBar(id="loads-edit")

    @property
    def table(self) -> LoadsTable:
        return self.query_one(LoadsTable)

    @property
    def editor(self) -> EditBar:
        return self.query_one(EditBar)

    def first_focus(self):
        return self.table

    def on_resize(self) -> None:
        if self.is_attached and self.work.session is not None:
            self.show(self.session, rebuild=True)

    # ------------------------------------------------------------------ drawing
    def show(self, session: Session, rebuild: bool = False) -> None:
        table = self.table
        width = self.size.width or 80
        if rebuild or not table.columns or table.name_width != max(12, width - FIXED_WIDTH - 2):
            keep = table.cursor_coordinate
            table.columns_for(width)
        else:
            keep = table.cursor_coordinate
            table.clear()
        design = session.design
        dm = design.site.design_month if design else None
        for i, load in enumerate(session.project.loads):
            cells = []
            for c in LOAD_COLUMNS:
                if c.kind == "figure":
                    if design is not None and i < len(design.loads.per_load_wh):
                        row = design.loads.per_load_wh[i]
                        value = row[dm - 1] if dm else max(row)
                    else:
                        value = (
                            load.quantity * load.power_w * load.hours_per_day * load.duty_cycle
                            if load.months
                            else 0.0
                        )
                    cells.append(Text(f"{value:,.0f}".rjust(c.width - 1) + " ", style="bold"))
                else:
                    cells.append(table.cell(c, getattr(load, c.key)))
            table.add_row(*cells, key=str(i))
        n = table.row_count
        if n:
            table.move_cursor(row=min(keep.row, n - 1), column=keep.column, animate=False)
        empty = self.query_one("#loads-empty", Static)
        empty.display = n == 0
        table.styles.height = "auto" if n == 0 else "1fr"
        empty.update(
            Text(
                "No appliances yet: press a to add one, or i to import a CSV list "
                "(bundled examples are in load_profiles/).",
                style="italic",
            )
        )
        self._months(session)

    def _months(self, session: Session) -> None:
        d = session.design
        strip = Text(no_wrap=True, overflow="crop")
        dm = d.site.design_month if d else None
        strip.append(f"{'Wh/day':<12}", style="bold")
        for i, m in enumerate(MONTHS, start=1):
            strip.append(f"{m:>5}", style="bold reverse" if i == dm else "bold")
        rows = []
        if d is not None:
            rows.append(("All, at batt.", d.loads.daily_energy_wh))
            r = self.table.cursor_row
            if session.project.loads and 0 <= r < len(d.loads.per_load_wh):
                rows.append(
                    (clip(printable(session.project.loads[r].name), 12), d.loads.per_load_wh[r])
                )
        else:
            strip.append(
                "\n(no design yet: " + printable(session.outcome.error or "") + ")", style="dim"
            )
        for label, values in rows:
            strip.append(f"\n{label:<12}")
            for i, v in enumerate(values, start=1):
                strip.append(f"{short4(v):>5}", style="reverse" if i == dm else "")
        self.query_one("#loads-months", Static).update(strip)

    def on_data_table_cell_highlighted(self, event: DataTable.CellHighlighted) -> None:
        if self.work.session is not None:
            self._months(self.session)

    # ------------------------------------------------------------------ editing
    def _row(self) -> int | None:
        if not self.session.project.loads:
            return None
        return min(self.table.cursor_row, len(self.session.project.loads) - 1)

    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        event.stop()
        row = self._row()
        if row is None:
            return
        column = LOAD_COLUMNS[event.coordinate.column]
        load = self.session.project.loads[row]
        path = f"loads[{row + 1}].{column.key}"
        if column.kind == "figure":
            send(self, WhyAsked())
            return
        if column.kind == "choice":
            options = [(v, label) for v, label in column.choices]

            def chosen(value) -> None:
                if value is None:
                    return
                self._set(path, value, column.label)

            self.app.push_screen(
                ChoiceDialog(
                    f"{column.label} for '{printable(load.name)}'",
                    options,
                    getattr(load, column.key),
                    note=column.hint,
                ),
                chosen,
            )
            return
        original = getattr(load, column.key)
        if column.kind == "months":
            start = format_months(original)
        elif column.kind == "text":
            start = printable(original)
        else:
            start = f"{original:g}" if isinstance(original, float) else str(original)

        def apply(typed: str) -> str | None:
            try:
                value = self._parse(column, typed, original)
                self.session.set_value(path, value)
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited(f"{column.label} set")
            return None

        label = f"{column.label} of '{clip(printable(load.name), 30)}'"
        self.editor.start(label, start, apply, column.hint, back=self.table)

    def _parse(self, column: Column, typed: str, original):
        if column.kind == "text":
            return from_printable(typed, original)
        if column.kind == "months":
            return parse_months(typed)
        value = parse_number(typed, column.unit, column.hint, fraction=column.key == "duty_cycle")
        if column.kind == "int":
            if value != int(value):
                raise ValueError(f"'{typed}' must be a whole number")
            return int(value)
        return value

    def _set(self, path: str, value, label: str) -> None:
        try:
            self.session.set_value(path, value)
        except EditRejected as exc:
            self.app.notify(self.problems_text(exc), severity="error", markup=False)
            return
        self.edited(f"{label} set")

    def _go(self, row: int, column: int | None = None) -> None:
        self.show(self.session)
        col = self.table.cursor_column if column is None else column
        self.table.move_cursor(row=row, column=col, animate=False)
        focus_now(self.table)

    def action_add(self) -> None:
        row = self._row()
        at = self.session.add_load(row)
        self.edited("Appliance added: type its name")
        self._go(at, 0)
        self.table.action_select_cursor()

    def action_duplicate(self) -> None:
        row = self._row()
        if row is None:
            return
        at = self.session.duplicate_load(row)
        self.edited("Appliance copied", tell=True)
        self._go(at)

    def action_delete(self) -> None:
        row = self._row()
        if row is None:
            return
        name = self.session.project.loads[row].name
        self.session.delete_load(row)
        self.edited(f"Deleted '{printable(name)}' (u undoes)", tell=True)
        self._go(max(0, min(row, len(self.session.project.loads) - 1)))

    def action_move(self, step: int) -> None:
        row = self._row()
        if row is None:
            return
        to = self.session.move_load(row, step)
        if to != row:
            self.edited("Appliance moved")
            self._go(to)

    # ------------------------------------------------------------------ CSV
    def action_import_csv(self) -> None:
        self.app.push_screen(
            PathDialog(
                "Import a load list (CSV)",
                suffixes=(".csv",),
                verb="imports",
                note="Columns: name, quantity, power_w, hours_per_day, "
                "ac_dc, duty_cycle, surge_w, months, critical",
            ),
            self._import_path,
        )

    def _import_path(self, path: Path | None) -> None:
        if path is None:
            return
        from offgrid.project.loads_csv import LoadListError, load_loads_csv

        try:
            loads = load_loads_csv(path)
        except LoadListError as exc:
            self.app.push_screen(
                MessageDialog("The load list has problems; nothing was imported", str(exc))
            )
            return
        if not self.session.project.loads:
            self._import(loads, append=False, name=path.name)
            return

        def answer(result: str | None) -> None:
            if result in ("add", "replace"):
                self._import(loads, append=result == "add", name=path.name)

        self.app.push_screen(
            ConfirmDialog(
                "Import load list",
                f"{len(loads)} appliance line(s) read from {path.name}.",
                [("a", "Add to the list", "add"), ("r", "Replace the list", "replace")],
            ),
            answer,
        )

    def _import(self, loads, append: bool, name: str) -> None:
        try:
            self.session.replace_loads(loads, append)
        except EditRejected as exc:
            self.app.push_screen(MessageDialog("Not imported", self.problems_text(exc)))
            return
        self.edited(f"{len(loads)} appliance line(s) imported from {printable(name)}", tell=True)
        self._go(0, 0)

    def action_export_csv(self) -> None:
        stem = (self.session.path.stem if self.session.path else "loads") + "-loads.csv"
        self.app.push_screen(
            PathDialog(
                "Export the load list (CSV)",
                stem,
                suffixes=(".csv",),
                must_exist=False,
                verb="exports",
            ),
            self._export_path,
        )

    def _export_path(self, path: Path | None) -> None:
        if path is None:
            return
        if path.suffix == "":
            path = path.with_suffix(".csv")
        from offgrid.report.export import overwrite_refusal

        refusal = overwrite_refusal(path, self.session.path)
        if refusal:
            self.app.notify(
                f"Not exported: {printable(refusal)}", severity="error", markup=False, timeout=8
            )
            return

        def write(answer: str | None = "yes") -> None:
            if answer != "yes":
                return
            from offgrid.project.atomic import atomic_write_text
            from offgrid.project.loads_csv import loads_to_csv

            try:
                atomic_write_text(path, loads_to_csv(self.session.project.loads))
            except OSError as exc:
                self.app.notify(f"Not exported: {exc.strerror}", severity="error", markup=False)
                return
            self.app.notify(
                f"Exported {len(self.session.project.loads)} line(s) to {printable(str(path))}",
                markup=False,
            )

        if path.exists():
            self.app.push_screen(
                ConfirmDialog(
                    "Replace file?",
                    f"{path} exists.",
                    [("y", "Replace it", "yes"), ("n", "Keep it", "no")],
                ),
                write,
            )
        else:
            write()

    # ------------------------------------------------------------------ why
    def figure(self) -> Figure | None:
        row = self._row()
        d = self.session.design
        if row is None:
            return None
        load = self.session.project.loads[row]
        column = LOAD_COLUMNS[self.table.cursor_column]
        if column.kind == "figure" or d is None:
            dm = d.site.design_month if d else None
            per = d.loads.per_load_wh[row] if d and row < len(d.loads.per_load_wh) else None
            value = per[dm - 1] if per and dm else 0.0
            month = MONTHS[dm - 1] if dm else "-"
            reason = Reason(
                "quantity x power x hours per day x duty cycle, in the months the appliance is "
                "used (at the appliance; AC loads are divided by the inverter efficiency on the "
                "way to the battery)",
                (
                    ("quantity", str(load.quantity)),
                    ("power", fmt(load.power_w, "W")),
                    ("hours per day", fmt(load.hours_per_day, "h")),
                    ("duty cycle", fmt(load.duty_cycle)),
                    ("months", format_months(load.months)),
                    ("month shown", month),
                ),
                "common practice, no source",
            )
            return Figure(f"Energy of '{load.name}'", f"{value:,.0f} Wh/day", None, reason)
        value = getattr(load, column.key)
        shown = format_months(value) if column.kind == "months" else str(value)
        return Figure(
            f"{column.label} of '{load.name}'",
            shown,
            "loads.daily_energy_wh",
            extra="A value from the survey; it feeds the daily energy shown here.",
        )
