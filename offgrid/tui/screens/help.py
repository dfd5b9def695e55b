"""Every key, grouped by where it works; built from the bindings (offgrid.tui.commands)."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import Static

from offgrid.tui.commands import KeyGroup
from offgrid.tui.screens.dialogs import Dialog

GENERAL = """\
offgrid sizes a stand-alone solar system. Work through the sections in order:
1 Place (site and climate), 2 Loads (the appliances), 3 Parts (module, battery,
controller, inverter, choices). 4 Sizes shows the result, 5 Wires the circuits,
6 Cautions the warnings, 7 Risk a test against synthetic weather years, 8 Options
the variants side by side with the price list. The line under the sections always
shows the headline figures; every edit recomputes them at once.

Editing: move with the arrow keys, Enter edits the field or cell under the cursor,
Enter again applies, Esc cancels. A value that does not fit is refused with a
message under the box; the last good value stays. Letter keys work whenever no
text box is open. Ctrl+P (or :) opens the command list, which reaches every action.

Your work is saved to a recovery file a few seconds after each change; if the
connection drops, the next start offers to bring it back.

Designs from offgrid defer to local electrical codes and licensed practice."""


def help_table(groups: list[KeyGroup], first: str | None) -> Table:
    """The groups as a two-column table, the group titled ``first`` at the top."""
    ordered = sorted(groups, key=lambda g: g.title != first)
    table = Table.grid(padding=(0, 2))
    table.add_column(no_wrap=True, style="bold", min_width=14)
    table.add_column()
    for title, rows in ordered:
        if not rows:
            continue
        table.add_row(Text(title, style="bold underline"), "")
        for row in rows:
            what = Text(row.description)
            if row.tooltip:
                what.append(f" \u00b7 {row.tooltip}", style="dim")
            table.add_row(row.keys, what)
        table.add_row("", "")
    return table


class HelpDialog(Dialog):
    """The keys of the place you are in first, then all the others."""

    BINDINGS = [Binding("question_mark,f1,h", "close", "Close", id="help.close")]

    def __init__(self, groups: list[KeyGroup], first: str | None = None, about: str = "") -> None:
        super().__init__()
        self.groups = groups
        self.first = first
        self.about = about

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog full", id="help"):
            yield Static(Text("Keys and help", style="bold"), classes="dialog-title")
            with VerticalScroll(classes="dialog-scroll"):
                if self.about:
                    yield Static(Text(self.about, style="italic"))
                    yield Static("")
                yield Static(help_table(self.groups, self.first))
                yield Static(Text(GENERAL))
            yield Static(
                Text("\u2191\u2193 PgUp PgDn scroll \u00b7 Esc, ? or h: close", style="dim")
            )

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).focus()
