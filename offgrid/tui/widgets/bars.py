"""The three lines at the top of the work screen: file, sections, headline figures."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from offgrid.tui.session import Session
from offgrid.tui.text import clip, printable

SECTIONS: tuple[tuple[str, str, str], ...] = (
    # (id, title, what you do there)
    ("place", "Place", "project, site and climate"),
    ("loads", "Loads", "the appliances and their use"),
    ("parts", "Parts", "module, battery, controller, inverter, choices"),
    ("sizes", "Sizes", "the sized system and the month-by-month balance"),
    ("wires", "Wires", "cable runs, currents and protection"),
    ("cautions", "Cautions", "warnings and safety notes"),
    ("risk", "Risk", "how often the battery runs out, over synthetic weather years"),
    ("options", "Options", "variants side by side with the base, and the price list"),
)


def put_line(bar: Static, text: Text, layout: bool = False) -> None:
    """Show ``text`` on a one-line bar: nothing when it is already shown, and no layout
    pass (the bar's height is fixed): Textual's default re-lays out the whole screen on
    every update, which three bars did after each edit."""
    if not layout and getattr(bar, "_line", None) == text:
        return
    bar._line = text  # type: ignore[attr-defined]
    bar.update(text, layout=layout)


class FileBar(Static):
    """Project name, file and the unsaved marker."""

    DEFAULT_CSS = """
    FileBar { height: 1; background: $primary; color: $text; padding: 0 1; }
    """

    _session: Session | None = None
    _text: str | None = None  # the project's text at the last show

    def on_resize(self) -> None:
        if self._session is not None:  # a new width, the same project: its text again
            self.show(self._session, self._text)

    def show(self, session: Session, text: str | None = None) -> None:
        """``text``: the project as saved, if the caller has it (else it is made here)."""
        self._session = session
        width = max(20, self.size.width or 80) - 2
        if text is None:
            text = session.text()  # (a few ms, so once, or the caller's)
        self._text = text
        dirty = text != session.baseline
        marker = "  \u25cf unsaved" if dirty else ""
        if session.path is not None:
            where = str(session.path.name) + (" (new file)" if not session.path.exists() else "")
        elif session.origin == "demo":
            where = "demo, not saved yet"
        else:
            where = "not saved yet"
        demo = " (demonstration data)" if session.project.info.demo else ""
        sep = "|" if getattr(self.app, "plain", False) else "\u2502"
        left = f"offgrid {sep} {printable(session.title)}{demo}"
        right = f"{where}{marker}"
        room = width - len(right) - 2
        text = Text(no_wrap=True, overflow="crop")
        text.append(clip(left, max(10, room)), style="bold")
        text.append(" " * max(2, width - min(len(left), max(10, room)) - len(right)))
        text.append(right, style="bold reverse" if dirty else "")
        put_line(self, text)


class SectionBar(Static):
    """The sections with their keys; the current one stands out (also without colour)."""

    DEFAULT_CSS = """
    SectionBar { height: 1; background: $panel; }
    """

    def show(self, current: str) -> None:
        text = Text(no_wrap=True, overflow="crop")
        for n, (sid, title, _what) in enumerate(SECTIONS, start=1):
            if sid == current:
                mark = ("[", "]") if getattr(self.app, "plain", False) else ("\u25b8", "\u25c2")
                text.append(f"{mark[0]}{n} {title}{mark[1]}", style="bold reverse")
            else:
                text.append(f" {n} {title} ")
        put_line(self, text)


class Headline(Static):
    """Array W, battery kWh and Ah, controller A and the number of warnings, always in view."""

    DEFAULT_CSS = """
    Headline { height: 1; padding: 0 1; background: $boost; }
    Headline.-error { background: $error 30%; height: auto; max-height: 3; }
    """

    _session: Session | None = None

    def on_resize(self) -> None:
        if self._session is not None:
            self.show(self._session)

    def pending(self) -> None:
        """The design is being worked out (a worker thread): no figures until it is in."""
        self._session = None
        self.remove_class("-error")
        self._line = None
        self.update(Text("Working out the design\u2026", style="italic"))

    def show(self, session: Session) -> None:
        self._session = session
        out = session.outcome
        d = out.design
        text = Text(no_wrap=True, overflow="ellipsis")
        if d is None:
            self.add_class("-error")
            text = Text(no_wrap=False, overflow="ellipsis")
            text.append("\u2717 No design: ", style="bold")
            text.append(printable(out.error or "not computed yet"))
            if session.project.water and not session.project.loads:
                text.append(" \u00b7 the water supplies are designed under Water pumping (^p)")
            self._line = None
            self.update(text)
            return
        was_error = self.has_class("-error")
        self.remove_class("-error")
        b, c = d.battery, d.controller
        width = max(20, (self.size.width or 80) - 2)
        ctrl = (f"{c.count}\u00d7" if c.count > 1 else "") + f"{c.current_a:.0f} A"
        n = sum(1 for w in d.warnings if w.severity != "info")
        notes = len(d.warnings) - n
        count = f"{n} warning{'s' if n != 1 else ''}"
        more = f" +{notes} note{'s' if notes != 1 else ''}" if notes else ""
        bank = f"{b.nominal_kwh:.1f} kWh {b.capacity_ah:,.0f} Ah {b.system_voltage_v} V"
        # Shorter forms until the line fits: the warning count is never cut.
        forms = [
            (
                ("Array ", f"{d.array.power_w:,.0f} W"),
                ("Battery ", bank),
                ("Controller ", ctrl),
                count + more,
            ),
            (
                ("Array ", f"{d.array.power_w:,.0f} W"),
                ("Battery ", bank),
                ("Controller ", ctrl),
                count,
            ),
            (("PV ", f"{d.array.power_w:,.0f} W"), ("Batt. ", bank), ("Ctrl ", ctrl), count),
            (
                ("PV ", f"{d.array.power_w:,.0f} W"),
                ("Batt. ", f"{b.capacity_ah:,.0f} Ah {b.system_voltage_v} V"),
                ("Ctrl ", ctrl),
                f"{n} warn.",
            ),
        ]
        for *parts, tail in forms:
            if sum(len(lb) + len(v) + 3 for lb, v in parts) + len(tail) <= width:
                break
        bar = " | " if getattr(self.app, "plain", False) else " \u2502 "
        for i, (label, value) in enumerate(parts):
            if i:
                text.append(bar)
            text.append(label)
            text.append(value, style="bold")
        text.append(bar)
        text.append(tail, style="bold" if n else "")
        put_line(self, text, layout=was_error)
