"""Why a figure has its value: the formula in words, the inputs with units, the source."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import Static

from offgrid.design.result import Reason
from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.text import literal


def find_reason(reasons: dict[str, Reason], path: str | None) -> tuple[str | None, Reason | None]:
    """The reason for ``path``, or for the nearest figure it belongs to."""
    if not path:
        return None, None
    probe = path
    while probe:
        if probe in reasons:
            return probe, reasons[probe]
        if "." not in probe:
            break
        probe = probe.rsplit(".", 1)[0]
    return None, None


def reason_text(
    label: str, value: str, reason: Reason | None, path: str | None, extra: str = ""
) -> Table:
    grid = Table.grid(padding=(0, 1), expand=True)
    grid.add_column(style="bold", no_wrap=True, width=9)
    grid.add_column(ratio=1)
    grid.add_row("Figure", Text.assemble(literal(label), "  ", literal(value, "bold")))
    if reason is None:
        grid.add_row("", literal(extra or "The engine recorded no reason for this figure."))
        return grid
    grid.add_row("Formula", literal(reason.formula))
    if reason.inputs:
        inputs = Table.grid(padding=(0, 2))
        inputs.add_column(no_wrap=True)
        inputs.add_column(style="bold")
        for name, val in reason.inputs:
            inputs.add_row(literal(name.replace("_", " ")), literal(val))
        grid.add_row("Inputs", inputs)
    grid.add_row("Source", literal(reason.source))
    if extra:
        grid.add_row("Note", literal(extra))
    if path:
        grid.add_row("Path", Text(path, style="dim"))
    return grid


class WhyDialog(Dialog):
    """Shows one reason; w, Enter or Esc closes."""

    BINDINGS = [
        Binding("enter,w", "close", "Close", id="why.close"),
    ]

    def __init__(
        self, label: str, value: str, reason: Reason | None, path: str | None, extra: str = ""
    ) -> None:
        super().__init__()
        self.label, self.value, self.reason, self.path, self.extra = (
            label,
            value,
            reason,
            path,
            extra,
        )

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="why"):
            yield Static(Text("Why this value", style="bold"), classes="dialog-title")
            with VerticalScroll(classes="dialog-scroll"):
                yield Static(
                    reason_text(self.label, self.value, self.reason, self.path, self.extra)
                )
            yield Static(Text("Enter, w or Esc: close", style="dim"))

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).focus()
