"""Offered at start when an earlier run ended without saving (dropped connection, crash)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import OptionList, Static
from textual.widgets.option_list import Option

from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.state import Recovery
from offgrid.tui.text import printable


class RecoverDialog(Dialog):
    """Returns ("recover" | "discard", Recovery), or None to decide later."""

    BINDINGS = [
        Binding("r,enter", "recover", "Recover", id="recover.yes"),
        Binding("x", "discard", "Discard", id="recover.discard"),
        Binding("escape,l", "later", "Later", id="recover.later"),
    ]

    def __init__(self, items: list[Recovery]) -> None:
        super().__init__()
        self.items = items

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="recover"):
            yield Static(Text("Unsaved work was found", style="bold"), classes="dialog-title")
            yield Static(
                Text(
                    "An earlier session ended before its changes were saved (a "
                    "dropped connection or a crash). Bring them back?"
                ),
                classes="dialog-body",
            )
            options = []
            for item in self.items:
                where = item.project_path or "never saved"
                options.append(
                    Option(
                        Text.assemble(
                            (printable(item.title or "Untitled"), "bold"),
                            f"\n  {printable(where)}\n  last change {item.age_text}",
                        )
                    )
                )
            yield OptionList(*options, id="recover-list")
            yield Static(
                Text(
                    "r or Enter: recover \u00b7 x: discard it \u00b7 Esc: decide "
                    "later (it is kept)",
                    style="dim",
                )
            )

    def on_mount(self) -> None:
        ol = self.query_one(OptionList)
        ol.highlighted = 0
        ol.focus()

    def _chosen(self) -> Recovery:
        i = self.query_one(OptionList).highlighted or 0
        return self.items[i]

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.action_recover()

    def action_recover(self) -> None:
        self.dismiss(("recover", self._chosen()))

    def action_discard(self) -> None:
        self.dismiss(("discard", self._chosen()))

    def action_later(self) -> None:
        self.dismiss(None)
