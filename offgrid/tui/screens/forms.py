"""Add, edit and remove the water supplies (issue 15) and the generator (issue 16).

A form is a dialog with one row per input of the catalogue (``water[].`` or
``generator.``: label, value and unit from :mod:`offgrid.catalogue`), the design's
figures below it, and an edit box.  Every edit goes through the session
(:meth:`~offgrid.tui.session.Session.change`: validated, undoable), then the work screen
recomputes and arms the autosave.  A refused value keeps the box open with what was
typed and says which field and what to type; a box left with Esc keeps its text as a
draft for the next time that field is opened.
"""

from __future__ import annotations

from typing import Any

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import DataTable, Input, Static

from offgrid.catalogue import inputs_under
from offgrid.tui.fields import Field, parse_number, parse_one_or_twelve
from offgrid.tui.screens.dialogs import ChoiceDialog, Dialog
from offgrid.tui.session import EditRejected, get_path
from offgrid.tui.text import printable

#: The pump's datasheet as one row of typed points "head flow power; ..." (the heads and
#: powers tables follow from the points); the direct motor's voltages stay in the file.
POINTS = "pump.flow_m3_h"

#: Actions of one letter: with the edit box focused the letter types into it instead.
FORM_LETTERS = {"add", "remove", "undo", "next_item"}


def form_fields(prefix: str) -> list[Field]:
    """The editable fields under ``prefix`` (``water[2].`` or ``generator.``), catalogue
    order; the pump's datasheet tables (kind ``table``) are left to the project file."""
    row_prefix = "water[]." if prefix.startswith("water[") else prefix
    out = []
    for e in inputs_under(row_prefix):
        if e.kind == "table" and not e.path.endswith(POINTS):
            continue
        path = prefix + e.path.removeprefix(row_prefix)
        choices = tuple((v, str(v).replace("_", " ")) for v in e.values)
        out.append(Field(path, choices))
    return out


def pump_points(project, f: Field) -> list[tuple[float, float, float]]:
    """The pump's datasheet as (head m, flow m3/h, power W) points, head by head."""
    pump = get_path(project, f.path.removesuffix(".flow_m3_h"))
    return [
        (h, q, w)
        for h, row in zip(pump.head_points_m, pump.flow_m3_h, strict=False)
        for w, q in zip(pump.power_points_w, row, strict=False)
    ]


def points_text(points) -> str:
    return "; ".join(f"{h:g} {q:g} {w:g}" for h, q, w in points)


def parse_points(text: str, hint: str = "") -> tuple[list, list, list]:
    """Typed points "head flow power; ..." (m, m3/h, W) as the heads, the powers and the
    flow table; ValueError naming a point that is missing or cannot be read."""
    heads: list[float] = []
    powers: list[float] = []
    flow: dict[tuple[float, float], float] = {}
    for n, chunk in enumerate((c for c in text.split(";") if c.strip()), start=1):
        parts = chunk.split()
        if len(parts) != 3:
            raise ValueError(
                f"point {n} '{chunk.strip()}': type head (m), flow (m3/h) and power (W), "
                "points separated by ;"
            )
        h, q, w = (parse_number(x, "", hint) for x in parts)
        flow[(h, w)] = q
        heads += [h] if h not in heads else []
        powers += [w] if w not in powers else []
    heads.sort()
    powers.sort()
    missing = [(h, w) for h in heads for w in powers if (h, w) not in flow]
    if missing:
        h, w = missing[0]
        raise ValueError(
            f"no flow at {h:g} m and {w:g} W: every head needs a flow at every power "
            f"({len(missing)} missing)"
        )
    return heads, powers, [[flow[(h, w)] for w in powers] for h in heads]


def show_value(f: Field, value: Any) -> str:
    """The value as the form's row shows it, with its unit."""
    if f.path.endswith(POINTS):
        rows = len(value)
        cols = len(value[0]) if value else 0
        return f"{rows} heads x {cols} powers (Enter: head flow power; ...)"
    if isinstance(value, list):
        if len(value) == 12 and len(set(value)) == 1:
            return f"{value[0]:g} {f.unit} every month".strip()
        return (" ".join(f"{v:g}" for v in value) + f" {f.unit}").strip()
    return f.show(value)


def edit_text(f: Field, value: Any) -> str:
    if isinstance(value, list) and len(value) == 12 and len(set(value)) == 1:
        return f"{value[0]:g}"
    return f.edit_text(value)


def parse_value(f: Field, text: str) -> Any:
    """What was typed, read as ``f``'s kind; ValueError saying what to type."""
    if f.path.endswith(POINTS):
        return parse_points(text, f.hint)
    if f.base_kind != "floats":
        return f.parse(text)
    if f.path.endswith("need_m3_day"):
        value = parse_one_or_twelve(text, f.hint)
        return [value] * 12 if isinstance(value, float) else value
    parts = text.replace(";", " ").replace(",", " ").split()
    if not parts:
        raise ValueError(f"type the numbers separated by spaces; {f.hint}")
    return [parse_number(p, f.unit, f.hint) for p in parts]


def refusal(f: Field, exc: Exception) -> str:
    """The message of a refused value: the field (label and path), then what is wrong."""
    if isinstance(exc, EditRejected):
        why = "; ".join(
            p.message if p.path == f.path else f"{p.path}: {p.message}" for p in exc.problems
        )
    else:
        why = f"{exc}"
    return f"{f.label} ({f.path}) not changed: {why}"


#: A new generator's fuel table at 25/50/75/100 % load, L/h per kW rated: the linear
#: curve F = 0.08145 x rating + 0.246 x output (L/h, kW), from memory (Skarstein &
#: Uhlen 1989, small diesel sets); a starting point the user replaces by the datasheet.
NEW_FUEL_A, NEW_FUEL_B = 0.08145, 0.246


def new_generator(rated_kw: float = 5.0):
    from offgrid.project.model import GeneratorSpec

    loads = [25.0, 50.0, 75.0, 100.0]
    fuel = [round(NEW_FUEL_A * rated_kw + NEW_FUEL_B * rated_kw * x / 100, 3) for x in loads]
    return GeneratorSpec(
        name="New generator", rated_kw=rated_kw, fuel_load_pct=loads, fuel_l_h=fuel
    )


class FormDialog(Dialog):
    """The rows of one item, its figures, and the edit box; the keys below."""

    BINDINGS = [
        Binding("enter", "edit", "Edit the value under the cursor", id="form.edit"),
        Binding("a", "add", "Add", id="form.add"),
        Binding("x", "remove", "Remove", id="form.remove"),
        Binding("u", "undo", "Undo the last change", id="form.undo"),
    ]
    DEFAULT_CSS = """
    FormDialog #form-fields { height: 8; }
    FormDialog #form-message { height: auto; max-height: 3; }
    FormDialog #form-figures { height: auto; max-height: 6; }
    """
    heading = ""
    what = "item"

    def __init__(self) -> None:
        super().__init__()
        self.editing: Field | None = None
        self.drafts: dict[str, str] = {}
        self.fields: list[Field] = []
        self.hinted_row = -1

    # ------------------------------------------------------------------ to fill in
    @property
    def session(self):
        return self.app.work.session

    def prefix(self) -> str | None:
        """The item's path prefix, or None when there is no item."""
        raise NotImplementedError

    def figure_lines(self) -> list[str]:
        raise NotImplementedError

    def empty_text(self) -> str:
        return f"No {self.what} yet: press a to add one."

    def keys_text(self) -> str:
        return "Enter edit  a add  x remove  u undo  Esc close"

    # ------------------------------------------------------------------ layout
    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide form"):
            yield Static(Text(self.heading, style="bold"), id="form-title")
            yield DataTable(id="form-fields", cursor_type="row", zebra_stripes=False)
            yield Static("", id="form-message")
            yield Input(id="form-input")
            with VerticalScroll(id="form-figures"):
                yield Static("", id="form-figure-text")
            yield Static(Text(self.keys_text(), style="dim"))

    def on_mount(self) -> None:
        table = self.query_one(DataTable)
        table.add_columns("Input", "Value")
        self.query_one(Input).display = False
        self.reload()
        table.focus()

    def reload(self, keep_row: bool = True) -> None:
        """Rows and figures from the session's project as it is now."""
        from textual.coordinate import Coordinate

        table = self.query_one(DataTable)
        row = table.cursor_row if keep_row else 0
        prefix = self.prefix()
        fields = form_fields(prefix) if prefix else []
        project = self.session.project
        cells = [(f.label, printable(show_value(f, get_path(project, f.path)))) for f in fields]
        if len(fields) == len(self.fields) == table.row_count:  # same rows: cells in place
            for i, (label, value) in enumerate(cells):
                table.update_cell_at(Coordinate(i, 0), label)
                table.update_cell_at(Coordinate(i, 1), value)
        else:
            table.clear()
            for label, value in cells:
                table.add_row(label, value)
        self.fields = fields
        if fields and (not keep_row or table.cursor_row != row):
            table.move_cursor(row=min(row, len(fields) - 1))
        title = self.heading + (f": {self.item_name()}" if prefix else "")
        self.query_one("#form-title", Static).update(Text(printable(title), style="bold"))
        lines = self.figure_lines() if prefix else [self.empty_text()]
        self.query_one("#form-figure-text", Static).update(
            Text("\n".join(printable(ln) for ln in lines))
        )
        self.show_hint()
        self.hinted_row = self.query_one(DataTable).cursor_row

    def item_name(self) -> str:
        return str(get_path(self.session.project, self.prefix() + "name"))

    def current_field(self) -> Field | None:
        table = self.query_one(DataTable)
        if not self.fields:
            return None
        return self.fields[min(table.cursor_row, len(self.fields) - 1)]

    def say(self, text: str, error: bool = False) -> None:
        self.query_one("#form-message", Static).update(
            Text(printable(text), style="bold red" if error else "dim")
        )

    def show_hint(self) -> None:
        f = self.current_field()
        if f is not None and self.editing is None:
            allowed = f" ({', '.join(v for v, _ in f.choices)})" if f.choices else ""
            self.say(f"{f.label}{allowed}: {f.hint}")

    def on_data_table_row_highlighted(self, event) -> None:
        if event.cursor_row != self.hinted_row:  # not the row redrawn after an edit:
            self.hinted_row = event.cursor_row  # its note stays until the cursor moves
            self.show_hint()

    def on_data_table_row_selected(self, event) -> None:
        event.stop()
        self.action_edit()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action in FORM_LETTERS and isinstance(self.focused, Input):
            return None  # the letter types into the box
        return True

    # ------------------------------------------------------------------ editing
    def action_edit(self) -> None:
        f = self.current_field()
        if f is None:
            self.say(self.empty_text())
            return
        value = get_path(self.session.project, f.path)
        if f.choices:
            options = [(v, label) for v, label in f.choices]
            self.app.push_screen(
                ChoiceDialog(f"{f.label}: {f.hint}", options, current=value),
                lambda v, f=f: None if v is None else self.apply(f, v),
            )
            return
        self.editing = f
        box = self.query_one(Input)
        start = (
            points_text(pump_points(self.session.project, f)) if f.path.endswith(POINTS) else None
        )
        box.value = self.drafts.pop(f.path, start or edit_text(f, value))
        box.display = True
        box.focus()
        self.call_after_refresh(self.keep_cursor_in_view)
        what = f"{f.label} ({f.unit or 'no unit'}): {f.hint}"
        if f.path.endswith(POINTS):
            what = "Datasheet points: head m, flow m3/h, power W; ; between points"
        self.say(f"{what}. Enter keeps it, Esc leaves it")

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        f = self.editing
        if f is None:
            return
        try:
            value = parse_value(f, event.value)
        except ValueError as exc:
            self.say(refusal(f, exc), error=True)  # the box stays open with the text
            return
        if self.apply(f, value):
            self.close_box()

    def apply(self, f: Field, value: Any) -> bool:
        """Set ``f`` through the session; a refusal is shown and nothing is changed."""
        try:
            if f.path.endswith(POINTS):
                pump = f.path.removesuffix(".flow_m3_h")
                heads, powers, flow = value

                def put(p) -> None:
                    target = get_path(p, pump)
                    target.head_points_m, target.power_points_w = heads, powers
                    target.flow_m3_h = flow

                self.session.change(put, focus=f.path)
            else:
                self.session.set_value(f.path, value)
        except EditRejected as exc:
            self.say(refusal(f, exc), error=True)
            return False
        self.after_change(f"{f.label} set")
        return True

    def close_box(self) -> None:
        self.editing = None
        box = self.query_one(Input)
        box.display = False
        self.query_one(DataTable).focus()
        self.show_hint()
        self.call_after_refresh(self.keep_cursor_in_view)

    def keep_cursor_in_view(self) -> None:
        """The table's height changes with the box: keep the cursor's row on screen."""
        table = self.query_one(DataTable)
        if table.row_count:
            table.move_cursor(row=table.cursor_row, animate=False, scroll=True)

    def action_close(self) -> None:
        if self.editing is not None:  # Esc in the box: back to the rows, the text kept
            self.drafts[self.editing.path] = self.query_one(Input).value
            self.close_box()
            return
        super().action_close()

    def after_change(self, note: str) -> None:
        self.app.work.changed()  # recompute, redraw, autosave
        self.reload()
        self.say(note)

    def change(self, mutate, note: str) -> bool:
        try:
            self.session.change(mutate)
        except EditRejected as exc:
            self.say(f"Not changed: {exc}", error=True)
            return False
        self.after_change(note)
        return True

    def action_undo(self) -> None:
        if self.session.undo():
            self.app.work.changed()
            self.clamp()
            self.reload()
            self.say("Undone")
        else:
            self.say("Nothing to undo")

    def clamp(self) -> None:
        """After an undo the item may be gone."""


class WaterForm(FormDialog):
    """The project's water supplies, one at a time (``n`` the next)."""

    BINDINGS = [
        Binding("a", "add", "Add a water supply", id="water_form.add"),
        Binding("x", "remove", "Remove this water supply", id="water_form.remove"),
        Binding("n", "next_item", "Next water supply", id="water_form.next"),
    ]
    heading = "Water supply"
    what = "water supply"

    def __init__(self, index: int = 0) -> None:
        super().__init__()
        self.index = index

    def keys_text(self) -> str:
        return "Enter edit  a add  x remove  n next supply  u undo  Esc close"

    def prefix(self) -> str | None:
        water = self.session.project.water
        if not water:
            return None
        self.index = min(self.index, len(water) - 1)
        return f"water[{self.index + 1}]."

    def item_name(self) -> str:
        n = len(self.session.project.water)
        return f"{super().item_name()} ({self.index + 1} of {n})"

    def figure_lines(self) -> list[str]:
        from offgrid.tui.screens.water import water_blocks

        s = self.session
        blocks = water_blocks(s.project, s.base_dir)
        _title, lines, _day = blocks[self.index]
        return lines

    def action_add(self) -> None:
        from offgrid.project.water_model import WaterSupply

        n = len(self.session.project.water) + 1
        new = WaterSupply(name=f"Water point {n} (new)")
        if self.change(lambda p: p.water.append(new), "Water supply added"):
            self.index = n - 1
            self.reload(keep_row=False)

    def action_remove(self) -> None:
        if self.prefix() is None:
            self.say(self.empty_text())
            return
        i, name = self.index, self.session.project.water[self.index].name
        if self.change(lambda p: p.water.pop(i), f"Removed {name} (u undoes)"):
            self.clamp()
            self.reload()

    def action_next_item(self) -> None:
        n = len(self.session.project.water)
        if n:
            self.index = (self.index + 1) % n
            self.reload(keep_row=False)

    def clamp(self) -> None:
        self.index = max(0, min(self.index, len(self.session.project.water) - 1))


class GeneratorForm(FormDialog):
    """The generator beside the sun (one per project)."""

    BINDINGS = [
        Binding("a", "add", "Add a generator", id="generator_form.add"),
        Binding("x", "remove", "Remove the generator", id="generator_form.remove"),
    ]
    heading = "Generator"
    what = "generator"

    def prefix(self) -> str | None:
        return None if self.session.project.generator is None else "generator."

    def figure_lines(self) -> list[str]:
        from offgrid.design.result import DesignError
        from offgrid.generator.hybrid import generator_setup
        from offgrid.tui.screens.generator import setup_lines

        s = self.session
        if s.design is None:
            return [f"No design to check the generator against: {s.outcome.error}"]
        try:
            return setup_lines(generator_setup(s.project, s.design, s.base_dir))
        except DesignError as exc:
            where = f"{exc.field}: " if exc.field else ""
            return [f"The generator cannot serve: {where}{exc}"]

    def action_add(self) -> None:
        if self.session.project.generator is not None:
            self.say("This project has its generator already (one per project).")
            return
        new = new_generator()
        self.change(
            lambda p: setattr(p, "generator", new),
            "Generator added: its fuel table is a starting point, type the datasheet's",
        )

    def action_remove(self) -> None:
        if self.session.project.generator is None:
            self.say(self.empty_text())
            return
        self.change(lambda p: setattr(p, "generator", None), "Generator removed (u undoes)")
