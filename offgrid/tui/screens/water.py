"""The project's water supplies in a dialog: the sized figures and the limiting month's flow
through the day drawn against the sunshine (text characters; ASCII on plain terminals)."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.widgets import Static

from offgrid.tui.screens.curves import plain_terminal
from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.text import printable


def day_plot(sun, flow, width: int = 60, height: int = 10, plain: bool = False) -> list[str]:
    """Flow (f) and sunshine (s) over the day, each scaled to its own peak, as text rows."""
    n = len(sun)
    cols = max(2, min(width, n))
    s_max = max(max(sun), 1e-9)
    q_max = max(max(flow), 1e-9)
    grid = [[" "] * cols for _ in range(height)]
    sun_mark, flow_mark = (".", "*") if plain else ("\u00b7", "\u2022")
    for c in range(cols):
        k = min(n - 1, round(c * (n - 1) / (cols - 1)))
        for value, peak, mark in ((sun[k], s_max, sun_mark), (flow[k], q_max, flow_mark)):
            if value > 0:
                row = height - 1 - min(height - 1, round(value / peak * (height - 1)))
                grid[row][c] = mark
    return ["|" + "".join(r) for r in grid] + ["+" + "-" * cols]


class WaterDialog(Dialog):
    """Each water supply's design (or why it cannot be met); Enter or Esc closes."""

    BINDINGS = [
        Binding("enter", "close", "Close", id="water.close"),
        Binding("e", "edit", "Add, edit or remove water supplies", id="water.edit"),
    ]

    def __init__(self, blocks: list[tuple[str, list[str], tuple | None]]) -> None:
        """``blocks``: (title, text lines, (sun, flow, start W/m2) or None) per supply."""
        super().__init__()
        self.blocks = blocks
        self.plain = plain_terminal()

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="water"):
            yield Static(Text("Water pumping", style="bold"), classes="dialog-title")
            with VerticalScroll(id="water-body"):
                for title, lines, day in self.blocks:
                    yield Static(Text(printable(title), style="bold"))
                    if day is not None:
                        sun, flow, start = day
                        g, d = ("*", ".") if self.plain else ("\u2022", "\u00b7")
                        yield Static(
                            Text(
                                f"Limiting month's day: flow ({g}) against sunshine ({d}); "
                                f"the pump starts at {start:.0f} W/m2"
                            )
                        )
                        yield Static(Text("\n".join(day_plot(sun, flow, 70, 8, self.plain))))
                    yield Static(Text("\n".join(printable(ln) for ln in lines)))
            yield Static(Text("up/down: scroll   e: edit   Enter or Esc: close", style="dim"))

    def action_edit(self) -> None:
        """Close the figures and open the form (offgrid.tui.screens.forms)."""
        from offgrid.tui.screens.forms import WaterForm

        self.dismiss(None)
        self.app.push_screen(WaterForm())


def water_blocks(project, base=None) -> list[tuple[str, list[str], tuple | None]]:
    """What the dialog shows for each supply of ``project`` (engine calls, no Textual)."""
    from offgrid.design.result import DesignError
    from offgrid.water.design import water_design
    from offgrid.water.text import water_lines

    out = []
    for i, supply in enumerate(project.water):
        try:
            w = water_design(project, i, base)
        except DesignError as exc:
            where = f"{exc.field}: " if exc.field else ""
            out.append((supply.name, [f"No design: {where}{exc}"], None))
            continue
        day = (w.day_irradiance_w_m2, w.day_flow_m3_h, w.start_irradiance_w_m2)
        # the summary's 80 columns less its two-space indent fit the 78-column dialog
        lines = [ln.removeprefix("  ") for ln in water_lines(w, supply)[1:]]
        out.append((w.name, lines, day))
    return out
