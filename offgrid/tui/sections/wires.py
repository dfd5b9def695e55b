"""Section 5, Wires: the cable runs with their size, voltage drop and protection.

The runs come from the electrical design (``SystemDesign.electrical``).  The
one-way length of each run is edited in place (Enter on its length), at the project path
the run carries (``WireChoice.length_path``: ``wiring.array_run_m``, a DC load's own
``loads[N].run_m``); the cable
settings (sizes in mm2 or AWG, material, insulation...) are in the table below.
Without an electrical design the section shows the main DC figures of the sizing.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable, Static

from offgrid.catalogue import find_figure, input_entry
from offgrid.design.result import SystemDesign
from offgrid.design.wiring import WireChoice
from offgrid.tui.fields import Field, parse_number
from offgrid.tui.keys import focus_now
from offgrid.tui.messages import WhyAsked, send
from offgrid.tui.screens.dialogs import ChoiceDialog
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import EditRejected, Session, get_path
from offgrid.tui.text import clip, printable
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.fieldtable import FieldTable
from offgrid.tui.widgets.steady import SteadyTable

WIRING_FIELDS: tuple[Field | str, ...] = (
    "Cable settings",
    Field("wiring.units", (("mm2", "mm2 (IEC 60228)"), ("awg", "AWG / kcmil (NEC)"))),
    Field("wiring.material", (("copper", "copper"), ("aluminium", "aluminium"))),
    Field("wiring.insulation_temp_c", ((60, "60 C"), (75, "75 C"), (90, "90 C"))),
    Field("wiring.conductor_temp_c"),
    Field("wiring.ambient_temp_c", auto_text="site's hottest month"),
    Field("wiring.dc_load_run_m"),
    Field("wiring.battery_short_circuit_a", auto_text="estimated"),
    Field("wiring.module_max_fuse_a", auto_text="not given"),
)

COLUMNS = (  # key, label, width
    ("run", "Run", 26),
    ("count", "n", 3),
    ("current_a", "Max A", 7),
    ("length_m", "Length", 8),
    ("size", "Size", 10),
    ("operating_current_a", "Drop A", 7),
    ("drop_pct", "Drop %", 7),
    ("drop_limit_pct", "Limit", 6),
    ("fuse_a", "Fuse A", 7),
)
#: A column's name in the design's JSON where it differs (the catalogue's row ``wires[].NAME``).
JSON_NAME = {"operating_current_a": "drop_current_a"}
#: Max A: the maximum continuous current (ampacity and fuse); Drop A: the operating current
#: the voltage drop is computed with.
REASON_OF_COLUMN = {
    "run": "size",
    "count": "size",
    "current_a": "current_a",
    "size": "size",
    "operating_current_a": "drop_current_a",
    "drop_pct": "drop_pct",
    "drop_limit_pct": "drop_pct",
    "fuse_a": "fuse_a",
}


def runs_of(design: SystemDesign | None) -> list[WireChoice]:
    """The cable runs of the design's electrical result (none without one)."""
    if design is None or design.electrical is None:
        return []
    return list(design.electrical.wires)


def basic_rows(d: SystemDesign) -> list[tuple[str, str, str]]:
    """What the sizing alone says about the circuits (labels from the catalogue)."""
    from offgrid.tui.sections.sizes import figure_row

    a, c, inv, b = d.array, d.controller, d.inverter, d.battery
    rows = [
        figure_row("array.string_voc_cold_v", number=a.string_voc_cold_v),
        figure_row("controller.max_pv_voltage_v", f"{c.max_pv_voltage_v:g} V"),
        figure_row("controller.required_current_a", number=c.required_current_a),
        figure_row("controller.current_a", f"{c.current_a:.0f} A"),
        figure_row("battery.system_voltage_v", f"{b.system_voltage_v} V"),
    ]
    if inv.needed:
        rows.append(figure_row("inverter.dc_input_current_a", number=inv.dc_input_current_a))
    return rows


def _num(value, digits: int = 1) -> str:
    if value is None:
        return "-"
    if isinstance(value, float):
        return f"{value:.{digits}f}"
    return str(value)


class RunsTable(SteadyTable):
    BINDINGS = [Binding("enter", "select_cursor", "Edit length", id="wires.edit")]

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="cell", cell_padding=0, zebra_stripes=True, **kwargs)


class WiresSection(Section):
    section_id = "wires"
    KEY_WIDGETS = (RunsTable,)
    help_text = (
        "The cable runs: each with its maximum continuous current (Max A, for ampacity "
        "and the fuse), one-way length, the size that meets both ampacity and the "
        "run's voltage-drop limit, the operating current the drop is computed with "
        "(Drop A), and its fuse or breaker. Enter on a length changes it; Tab goes "
        "to the cable settings."
    )

    BINDINGS = [
        Binding(
            "p",
            "devices",
            "Protection",
            id="wires.devices",
            tooltip="The protection devices of each circuit",
        )
    ]

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self._runs: list[WireChoice] = []
        self._basic: list[tuple[str, str, str]] = []

    def compose(self) -> ComposeResult:
        yield Static(id="wires-note", classes="table-title")
        yield RunsTable(id="wires-table")
        yield FieldTable(WIRING_FIELDS, id="wiring-fields")
        yield EditBar(id="wires-edit")

    @property
    def table(self) -> RunsTable:
        return self.query_one(RunsTable)

    @property
    def fields(self) -> FieldTable:
        return self.query_one(FieldTable)

    @property
    def editor(self) -> EditBar:
        return self.query_one(EditBar)

    def first_focus(self):
        return self.table

    def reveal(self, path: str) -> bool:
        if self.fields.select_path(path):
            focus_now(self.fields)
            return True
        return False

    # ------------------------------------------------------------------ drawing
    def show(self, session: Session) -> None:
        d = session.design
        table = self.table
        keep = table.cursor_coordinate
        table.clear(columns=True)
        note = self.query_one("#wires-note", Static)
        self._runs = runs_of(d)
        self._basic = []
        self.fields.fill(session.project, d, {})
        if d is None:
            note.update(
                Text("No design yet, so no wiring: see the headline above.", style="italic")
            )
            return
        if self._runs:
            width = self.size.width or 80
            run_w = max(14, width - sum(w for _k, _l, w in COLUMNS[1:]) - 2)
            for key, label, w in COLUMNS:
                w = run_w if key == "run" else w
                text = label.ljust(w) if key in ("run", "size") else label.rjust(w - 1) + " "
                table.add_column(Text(text, style="bold"), width=w, key=key)
            for i, r in enumerate(self._runs):
                cells = []
                for key, _label, w in COLUMNS:
                    w = run_w if key == "run" else w
                    value = getattr(r, key)  # dynamic: a WireChoice field named in COLUMNS
                    if key == "run":
                        cells.append(Text(clip(printable(str(value)), w - 1).ljust(w)))
                    elif key == "size":
                        cells.append(Text(clip(str(value), w - 1).ljust(w), style="bold"))
                    elif key == "drop_pct":
                        over = value is not None and value > r.drop_limit_pct + 1e-9
                        cells.append(Text(f"{_num(value, 2)}{'!' if over else ' '}".rjust(w)))
                    elif key == "fuse_a":
                        cells.append(Text(f"{_num(value, 0)} ".rjust(w), style="bold"))
                    elif key == "count":
                        cells.append(Text(f"{value}\u00d7 ".rjust(w)))
                    else:
                        cells.append(Text(f"{_num(value)} ".rjust(w)))
                table.add_row(*cells, key=str(i))
            n_dev = len(d.electrical.protection.devices) if d.electrical is not None else 0
            note.update(
                Text(
                    f"{len(self._runs)} cable runs \u00b7 Enter on a length edits it "
                    f"\u00b7 p: the {n_dev} fuses and switches",
                    style="bold",
                )
            )
        else:
            table.add_column("Circuit", key="c", width=44)
            table.add_column("Figure", key="v")
            self._basic = basic_rows(d)
            for label, value, _path in self._basic:
                table.add_row(Text(label), Text(value, style="bold"))
            note.update(
                Text(
                    "Main DC circuits from the sizing (cable sizes need the electrical design).",
                    style="bold",
                )
            )
        if table.row_count:
            table.move_cursor(
                row=min(keep.row, table.row_count - 1),
                column=min(keep.column, len(table.columns) - 1),
                animate=False,
            )

    # ------------------------------------------------------------------ editing
    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        if event.data_table is not self.table:
            return
        event.stop()
        if not self._runs:
            send(self, WhyAsked())
            return
        run = self._runs[min(event.coordinate.row, len(self._runs) - 1)]
        column = COLUMNS[event.coordinate.column][0]
        if column != "length_m":
            send(self, WhyAsked())
            return
        label, target = run.run, run.length_path
        if not target:
            self.app.notify("This run's length cannot be set here.", timeout=3)
            return

        def apply(typed: str) -> str | None:
            try:
                entry = input_entry(target)  # the run's own row: its range and hint
                value = parse_number(typed, "m", entry.hint)
                lo, hi = entry.low, entry.high
                if lo is not None and hi is not None and not lo <= value <= hi:
                    return f"{value:g} m is out of range; {entry.hint}"
                self.session.set_value(target, value)
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited("Length set")
            return None

        self.editor.start(
            f"One-way length of {clip(printable(label), 40)} (m)",
            f"{run.length_m:g}",
            apply,
            "from one end of the run to the other, in metres",
            back=self.table,
        )

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        if event.data_table is not self.fields:
            return
        event.stop()
        field = self.fields.current_field()
        if field is None:
            return
        current = get_path(self.session.project, field.path)
        if field.base_kind == "choice":

            def chosen(value) -> None:
                if value is None or value == current:
                    return
                try:
                    self.session.set_value(field.path, value)
                except EditRejected as exc:
                    self.app.notify(self.problems_text(exc), severity="error", markup=False)
                    return
                self.edited(f"{field.label}: {field.show(value)}")

            self.app.push_screen(
                ChoiceDialog(field.label, list(field.choices), current, note=field.help()), chosen
            )
            return

        def apply(typed: str) -> str | None:
            try:
                self.session.set_value(field.path, field.parse(typed))
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited(f"{field.label} set")
            return None

        self.editor.start(
            field.label, field.edit_text(current), apply, field.help(), back=self.fields
        )

    # ------------------------------------------------------------------ protection
    def action_devices(self) -> None:
        from offgrid.tui.screens.dialogs import MessageDialog

        d = self.session.design
        er = d.electrical if d is not None else None
        devices = er.protection.devices if er is not None else ()
        if not devices:
            self.app.notify(
                "No protective devices: the electrical design is not available.", timeout=3
            )
            return
        text = Text()
        for i, dev in enumerate(devices):
            if i:
                text.append("\n\n")
            rating = f"{dev.rating_a:g} A " if dev.rating_a else ""
            text.append(f"{dev.count}\u00d7 {rating}{dev.kind}", style="bold")
            text.append(f", at least {dev.voltage_v:.0f} V DC")
            if dev.interrupt_rating_a:
                text.append(f", interrupting rating at least {dev.interrupt_rating_a:,.0f} A")
            text.append("\n  " + printable(dev.location))
            if dev.note:
                text.append("\n  " + printable(dev.note), style="italic")
            if dev.source:
                text.append(f"\n  source: {printable(dev.source)}", style="dim")
        self.app.push_screen(MessageDialog("Fuses, breakers and disconnects", text))

    # ------------------------------------------------------------------ why
    def figure(self) -> Figure | None:
        if self.fields.has_focus:
            field = self.fields.current_field()
            if field is None:
                return None
            value = field.show(get_path(self.session.project, field.path), self.session.design)
            return Figure(
                field.label,
                value,
                field.reason,
                extra="" if field.reason else "A cable setting you chose.",
            )
        row = self.table.cursor_row
        if self._runs:
            run = self._runs[min(row, len(self._runs) - 1)]
            column = COLUMNS[self.table.cursor_column][0]
            if column == "length_m":
                return Figure(
                    f"Length of {run.run}",
                    f"{run.length_m:g} m",
                    None,
                    extra="A one-way length you typed (or the default); Enter "
                    f"changes it (project field {run.length_path}).",
                )
            what = REASON_OF_COLUMN.get(column, "size")
            value = getattr(run, column)  # dynamic: a WireChoice field named in COLUMNS
            shown = f"{value:.2f}" if isinstance(value, float) else str(value)
            entry = find_figure(f"wires[].{JSON_NAME.get(column, column)}")
            label = entry.label.lower() if entry else column.replace("_", " ")
            return Figure(f"{run.run}: {label}", shown, f"wires.{run.key}.{what}")
        if self._basic:
            label, value, path = self._basic[min(row, len(self._basic) - 1)]
            return Figure(label, value, path)
        return None
