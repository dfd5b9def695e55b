"""Month-by-month bars of supply against demand, the design month marked.

One row per month: the supply bar, its value, the demand bar, its value and
the supply/demand ratio.  Both bars share one scale (eighth-block resolution);
the design month is marked in words as well as in bold, so the chart reads the
same without colour.
"""

from __future__ import annotations

from rich.text import Text
from textual.widget import Widget

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
EIGHTHS = " \u258f\u258e\u258d\u258c\u258b\u258a\u2589\u2588"


def bar(value: float, full: float, width: int) -> str:
    """A bar ``width`` cells long at ``full``; eighth-block steps."""
    if full <= 0 or width <= 0 or value <= 0:
        return ""
    eighths = round(min(value / full, 1.0) * width * 8)
    whole, part = divmod(eighths, 8)
    return "\u2588" * whole + (EIGHTHS[part] if part else "")


def short_number(value: float) -> str:
    """At most five characters: 950, 12345 -> 12.3k."""
    if abs(value) >= 99_950:
        return f"{value / 1000:.0f}k"
    if abs(value) >= 9_999.5:
        return f"{value / 1000:.1f}k"
    return f"{value:.0f}"


class MonthChart(Widget):
    """Paired monthly bars; set :attr:`data` with :meth:`show`."""

    DEFAULT_CSS = """
    MonthChart { height: 14; }
    """

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.supply: tuple[float, ...] = ()
        self.demand: tuple[float, ...] = ()
        self.design_month: int | None = None
        self.note = ""

    def show(self, supply, demand, design_month: int | None, note: str = "") -> None:
        self.supply = tuple(supply)
        self.demand = tuple(demand)
        self.design_month = design_month
        self.note = note
        self.refresh()

    def render(self) -> Text:
        width = max(40, self.size.width)
        out = Text(no_wrap=True, overflow="crop")
        if len(self.supply) != 12 or len(self.demand) != 12:
            out.append(
                self.note or "No design yet: the chart appears once the design can be made.",
                style="italic",
            )
            return out
        # month 4 | supply bar | value 6 | demand bar | value 6 | ratio 6 | mark 9
        fixed = 4 + 6 + 6 + 7 + 10
        bar_w = max(6, (width - fixed) // 2)
        full = max(max(self.supply), max(self.demand), 1.0)
        head = (
            f"{'':4}{'Supply to battery, Wh/day':<{bar_w + 6}}"
            f"{'Demand, Wh/day':<{bar_w + 6}} {'sun/use':>6}"
        )
        out.append(head + "\n", style="bold")
        for i in range(12):
            s, d = self.supply[i], self.demand[i]
            is_design = self.design_month == i + 1
            ratio = s / d if d > 0 else 0.0
            style = "bold reverse" if is_design else ""
            out.append(f"{MONTHS[i]:<4}", style=style)
            out.append(
                f"{bar(s, full, bar_w):<{bar_w}}", style="green" if not is_design else "bold green"
            )
            out.append(f"{short_number(s):>5} ", style=style)
            out.append(
                f"{bar(d, full, bar_w):<{bar_w}}",
                style="yellow" if not is_design else "bold yellow",
            )
            out.append(f"{short_number(d):>5} ", style=style)
            shown = f"{ratio:.2f}" if ratio < 99.995 else f"{ratio:.0f}"
            out.append(f"{shown:>6}" if d > 0 else f"{'-':>6}", style=style)
            out.append(" \u25c0 design" if is_design else "", style="bold")
            if i < 11:
                out.append("\n")
        if self.note:
            out.append("\n" + self.note, style="dim")
        return out
