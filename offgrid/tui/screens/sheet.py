"""Edit a group of values that must agree with each other (a datasheet) in one go."""

from __future__ import annotations

from collections.abc import Callable

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.widgets import Input, Label, Static

from offgrid.tui.fields import Field
from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.session import get_path
from offgrid.tui.text import from_printable, literal, printable

ApplyAll = Callable[[dict[str, object]], dict[str, str]]


class SheetDialog(Dialog):
    """One input per field; Enter applies them all together, or says what is wrong."""

    BINDINGS = [
        Binding("down", "focus_next", "Next", show=False, id="sheet.next"),
        Binding("up", "focus_previous", "Previous", show=False, id="sheet.previous"),
    ]

    def __init__(
        self,
        title: str,
        fields: tuple[Field, ...],
        project,
        apply: ApplyAll,
        focus: str | None = None,
    ) -> None:
        super().__init__()
        self.title_text = title
        self.fields = fields
        self.project = project
        self.apply = apply
        self.focus_path = focus
        self.originals = {f.path: get_path(project, f.path) for f in fields}

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="sheet"):
            yield Static(Text(self.title_text, style="bold"), classes="dialog-title")
            with VerticalScroll(id="sheet-rows"):
                for i, f in enumerate(self.fields):
                    value = self.originals[f.path]
                    text = printable(value) if f.base_kind == "text" else f.edit_text(value)
                    with Horizontal(classes="sheet-row"):
                        yield Label(f.label, classes="sheet-label")
                        yield Input(text, id=f"in{i}", classes="sheet-input", select_on_focus=False)
                        yield Label(f.unit, classes="sheet-unit")
            yield Static(id="sheet-problem", classes="bad")
            yield Static(
                Text("\u2191\u2193 move \u00b7 Enter applies all \u00b7 Esc cancels", style="dim")
            )

    def on_mount(self) -> None:
        for i, f in enumerate(self.fields):
            if f.path == self.focus_path:
                self.query_one(f"#in{i}", Input).focus()
                return
        self.query(Input).first().focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        values: dict[str, object] = {}
        problems: dict[str, str] = {}
        for i, f in enumerate(self.fields):
            typed = self.query_one(f"#in{i}", Input).value
            try:
                value = f.parse(typed)
                if f.base_kind == "text":
                    value = from_printable(value, self.originals[f.path])
                values[f.path] = value
            except ValueError as exc:
                problems[f.path] = str(exc)
        if not problems:
            problems = self.apply(values)
            if not problems:
                self.dismiss(True)
                return
        self._show(problems)

    def _show(self, problems: dict[str, str]) -> None:
        lines = []
        first = None
        for i, f in enumerate(self.fields):
            box = self.query_one(f"#in{i}", Input)
            bad = f.path in problems
            box.set_class(bad, "-invalid")
            if bad:
                lines.append(f"\u2717 {f.label}: {problems[f.path]}")
                first = first or box
        for path, message in problems.items():
            if not any(f.path == path for f in self.fields):
                lines.append(f"\u2717 {path}: {message}")
        self.query_one("#sheet-problem", Static).update(literal("\n".join(lines), style="bold"))
        self.app.bell()
        if first is not None:
            first.focus()
