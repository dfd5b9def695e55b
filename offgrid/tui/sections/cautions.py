"""Section 6, Cautions: why no design could be made, the engine's warnings, safety notes."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.widgets import OptionList
from textual.widgets.option_list import Option

from offgrid.result import Notice
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import Session
from offgrid.tui.text import printable

MARK = {"error": "\u2717 ERROR", "warning": "! WARNING", "info": "i NOTE"}


class CautionsSection(Section):
    section_id = "cautions"
    help_text = ("Warnings about this design (Enter goes to the figure concerned, w explains "
                 "it) and the safety cautions that apply to every installation like it.")

    def compose(self) -> ComposeResult:
        yield OptionList(id="cautions-list")

    @property
    def items(self) -> OptionList:
        return self.query_one(OptionList)

    def first_focus(self):
        return self.items

    def show(self, session: Session) -> None:
        ol = self.items
        keep = ol.highlighted or 0
        ol.clear_options()
        self._targets: list[tuple[str | None, Notice | None, str]] = []
        out = session.outcome
        options: list[Option | None] = []
        if out.design is None:
            text = Text.assemble(("\u2717 NO DESIGN  ", "bold"), printable(out.error or ""))
            if out.error_field:
                text.append(f"\n  Enter: go to {out.error_field}", style="dim")
            options.append(Option(text))
            self._targets.append((out.error_field, None, out.error or ""))
        d = out.design
        if d is not None:
            if not d.warnings:
                options.append(Option(Text("No warnings for this design.", style="italic")))
                self._targets.append((None, None, ""))
            for n in d.warnings:
                tag = MARK.get(n.severity, n.severity.upper())
                text = Text.assemble((f"{tag}  ", "bold"), printable(n.message))
                text.append(f"  [{n.code}]", style="dim")
                options.append(Option(text))
                self._targets.append((n.figure, n, n.message))
            options.append(None)  # a separator line
            options.append(Option(Text("Safety", style="bold underline"), disabled=True))
            self._targets.append((None, None, ""))
            for caution in d.cautions:
                options.append(Option(Text.assemble(("\u26a0 ", "bold"), printable(caution))))
                self._targets.append((None, None, caution))
        ol.add_options(options)
        if ol.option_count:
            ol.highlighted = min(keep, ol.option_count - 1)

    def _target(self):
        i = self.items.highlighted
        targets = getattr(self, "_targets", [])
        if i is None or not 0 <= i < len(targets):
            return None
        return targets[i]

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        target = self._target()
        if target and target[0]:
            self.work.reveal(target[0])

    def figure(self) -> Figure | None:
        target = self._target()
        if target is None:
            return None
        path, notice, message = target
        if notice is None and path is None:
            return Figure("Caution", "", None, extra=message or "Nothing to explain here.")
        return Figure(notice.code if notice else "No design", message[:60], path,
                      extra=message)
