"""Section 6, Cautions: why no design could be made, the engine's warnings, safety notes."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.widgets import OptionList
from textual.widgets.option_list import Option

from offgrid.design.result import Notice
from offgrid.tui.messages import RevealAsked, send
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import Session
from offgrid.tui.text import printable
from offgrid.wording import confirm_words

MARK = {"error": "\u2717 ERROR", "warning": "! WARNING", "info": "i NOTE"}

#: The input a warning asks the user to look at (where it is edited), by notice code.
INPUT_FOR_NOTICE = {
    "record-low-estimated": "climate.record_low_c",
    "tilt-searched": "site.tilt_deg",
    "low-sun-month": "site.tilt_deg",
    "pwm-hot-vmp": "controller.type",
    "pwm-mismatch": "controller.type",
    "pwm-voltage-waste": "controller.type",
    "layout-changed": "controller.max_pv_voltage_v",
    "raise-system-voltage": "choices.system_voltage",
    "wiring-derate-vs-cables": "choices.derates.wiring",
    "harvest-shortfall": "controller.type",
    "charge-rate-high": "controller.max_current_a",
    "several-controllers": "controller.max_current_a",
    "charge-rate-low": "battery.capacity_ah",
    "lead-acid-parallel": "battery.capacity_ah",
    "battery-oversized": "battery.capacity_ah",
    "battery-cold": "site.battery_temp_c",
    "inverter-idle-large": "inverter.self_consumption_w",
    "module-cells": "module.cells_in_series",
}
#: Safety cautions that depend on one input: words in the caution -> the input.
INPUT_FOR_CAUTION = (
    ("at the record low", "climate.record_low_c"),
    ("short circuit", "wiring.battery_short_circuit_a"),
    ("hydrogen", "battery.chemistry"),
)


class CautionsSection(Section):
    section_id = "cautions"
    help_text = (
        "Warnings about this design (Enter goes to the figure concerned, w explains "
        "it) and the safety cautions that apply to every installation like it."
    )

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
                text = Text.assemble((f"{tag}  ", "bold"), printable(confirm_words(n.message)))
                text.append(f"  [{n.code}]", style="dim")
                where = INPUT_FOR_NOTICE.get(n.code, n.figure)
                if where:
                    text.append(f"\n  Enter: go to {self._label(where)}", style="dim")
                options.append(Option(text))
                self._targets.append((where, n, n.message))
            options.append(None)  # a separator line
            options.append(Option(Text("Safety", style="bold underline"), disabled=True))
            self._targets.append((None, None, ""))
            for caution in d.cautions:
                caution = confirm_words(caution)
                text = Text.assemble(("\u26a0 ", "bold"), printable(caution))
                where = next((p for words, p in INPUT_FOR_CAUTION if words in caution), None)
                if where:
                    text.append(f"\n  Enter: go to {self._label(where)}", style="dim")
                options.append(Option(text))
                self._targets.append((where, None, caution))
            if session.project.generator is not None:  # issue 16: the generator's cautions
                from offgrid.generator.cautions import generator_cautions

                for caution in generator_cautions(session.project.generator):
                    text = Text.assemble(("\u26a0 ", "bold"), printable(confirm_words(caution)))
                    options.append(Option(text))
                    self._targets.append((None, None, caution))
        ol.add_options(options)
        if ol.option_count:
            ol.highlighted = min(keep, ol.option_count - 1)

    @staticmethod
    def _label(path: str) -> str:
        """The name of the input (or figure) at ``path``, as the catalogue labels it."""
        from offgrid.catalogue import find_figure, find_input

        entry = find_input(path) or find_figure(path)
        if entry is None:
            return path
        return entry.label.lower() if entry.label[1:2].islower() else entry.label

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
            send(self, RevealAsked(target[0]))

    def figure(self) -> Figure | None:
        target = self._target()
        if target is None:
            return None
        path, notice, message = target
        if notice is None and path is None:
            return Figure("Caution", "", None, extra=message or "Nothing to explain here.")
        return Figure(notice.code if notice else "No design", message[:60], path, extra=message)
