"""A table of named fields (label, value, what to type): the forms of the UI."""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding

from offgrid.design.result import SystemDesign
from offgrid.tui.fields import Field
from offgrid.tui.session import get_path
from offgrid.tui.text import clip_words, literal
from offgrid.tui.widgets.steady import SteadyTable


class FieldTable(SteadyTable):
    """Rows of fields grouped under headings; the cursor skips the headings."""

    BINDINGS = [
        Binding("enter", "select_cursor", "Edit", id="field.edit"),
    ]

    DEFAULT_CSS = """
    FieldTable { height: 1fr; }
    """

    def __init__(self, fields: tuple[Field | str, ...], **kwargs) -> None:
        super().__init__(cursor_type="row", zebra_stripes=False, show_cursor=True, **kwargs)
        self.fields = fields
        self._rows: list[Field | str] = list(fields)
        self._last_fill: tuple | None = None

    def on_mount(self) -> None:
        self._columns(self.size.width or 80)

    def _columns(self, width: int) -> None:
        value_w = max(20, min(40, (width - 26 - 8) // 2 + 4))
        help_w = max(10, width - 26 - value_w - 7)
        self._help_w = help_w
        self._layout = width
        self.clear(columns=True)
        self._shown = None
        self.add_column("Field", width=24, key="label")
        self.add_column("Value", width=value_w, key="value")
        self.add_column("What to type", width=help_w, key="help")

    def on_resize(self, event) -> None:
        if event.size.width != getattr(self, "_layout", 0) and self._last_fill is not None:
            self._columns(event.size.width)
            self.fill(*self._last_fill)
        # (then SteadyTable._on_resize scrolls the cursor into view)

    def current_field(self) -> Field | None:
        if not self._rows or self.cursor_row is None:
            return None
        row = self._rows[min(self.cursor_row, len(self._rows) - 1)]
        return row if isinstance(row, Field) else None

    def fill(
        self,
        project,
        design: SystemDesign | None,
        problems: dict[str, str],
        special: dict[str, str] | None = None,
    ) -> None:
        """Show the project's values; ``special`` gives the text of non-plain rows.

        When the rows are already there only the cells whose text changed are
        updated: a full refill made the table redraw every row after each edit.
        """
        special = special or {}
        self._last_fill = (project, design, problems, special)
        if not self.columns:  # filled before mount (a busy machine): columns first
            self._columns(self.size.width or 80)
        cells = []
        for row in self._rows:
            if isinstance(row, str):
                cells.append(None)
                continue
            if row.path in special:
                shown = special[row.path]
            else:
                try:  # a project path (a string) through a part that may be unset
                    typed = get_path(project, row.path)
                except (AttributeError, IndexError):
                    shown = "-"
                else:
                    shown = row.show(typed, design)
            if getattr(self.app, "plain", False):  # ASCII for a plain terminal
                shown = shown.replace("\u2192", "->")
            value = literal(shown)
            if row.path in problems:
                value = Text.assemble(("\u2717 ", "bold"), value)
            cells.append(value)
        shown_before = getattr(self, "_shown", None)
        if (
            shown_before is not None
            and len(shown_before) == len(cells)
            and self.row_count == len(cells)
        ):
            for i, (row, value) in enumerate(zip(self._rows, cells, strict=True)):
                if value is not None and value != shown_before[i]:
                    self.set_cell_text(row.path, "value", value)
            self._shown = cells
            return
        keep = self.cursor_row or 0
        self.clear()
        for i, (row, value) in enumerate(zip(self._rows, cells, strict=True)):
            if isinstance(row, str):
                self.add_row(Text(row, style="bold underline"), Text(""), Text(""), key=f"group{i}")
                continue
            hint = clip_words(row.help(), getattr(self, "_help_w", 40))
            self.add_row(Text("  " + row.label), value, Text(hint, style="dim"), key=row.path)
        self._shown = cells
        self.move_cursor(row=self._first_field(keep), animate=False)

    def is_heading(self, row: int) -> bool:
        return 0 <= row < len(self._rows) and isinstance(self._rows[row], str)

    def _first_field(self, start: int, step: int = 1) -> int:
        n = len(self._rows)
        i = max(0, min(start, n - 1))
        while 0 <= i < n and isinstance(self._rows[i], str):
            i += step
        if not 0 <= i < n:
            return self._first_field(start, -step) if step > 0 else 0
        return i

    def select_path(self, path: str) -> bool:
        for i, row in enumerate(self._rows):
            if isinstance(row, Field) and row.path == path:
                self.move_cursor(row=i, animate=False)
                return True
        return False

    def action_cursor_down(self) -> None:
        target = self.cursor_row + 1
        while target < len(self._rows) and isinstance(self._rows[target], str):
            target += 1
        if target < len(self._rows):
            self.move_cursor(row=target)

    def action_cursor_up(self) -> None:
        target = self.cursor_row - 1
        while target >= 0 and isinstance(self._rows[target], str):
            target -= 1
        if target >= 0:
            self.move_cursor(row=target)
        else:
            self.scroll_home(animate=False)
