"""The start screen: recent projects, a new project (demo scenario or blank), open a file."""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import Screen
from textual.widgets import Footer, OptionList, Static
from textual.widgets.option_list import Option

from offgrid.tui.messages import (
    BlankAsked,
    DemoAsked,
    OpenAsked,
    OpenPathAsked,
    PlanAsked,
    ScenarioAsked,
    send,
)
from offgrid.tui.text import printable

SCENARIOS = {
    "household-kit": "a household: lights, phones, TV, fan, fridge",
    "rural-clinic": "a health post with a vaccine refrigerator",
    "primary-school": "a primary school, closed in August",
    "water-pump": "a borehole pump, more in the dry season",
    "radio-repeater": "a hill-top radio repeater",
    "household-basic": "a home: three lights, phone charging, radio",
    "household-medium": "a home: lights, phones, radio, DC TV, fan",
    "village-shop": "a shop: drinks refrigerator, phone charging",
}


def scenario_files() -> list[Path]:
    from offgrid.paths import load_profiles_dir

    folder = load_profiles_dir()
    return sorted(folder.glob("*.csv")) if folder.is_dir() else []


class StartScreen(Screen):
    """Choose what to work on."""

    BINDINGS = [
        Binding("o", "open", "Open a file", id="start.open"),
        Binding("b", "blank", "Blank project", id="start.blank"),
        Binding("d", "demo", "Demo project", id="start.demo"),
        Binding("p", "plan", "Plan a community", id="start.plan"),
        Binding("q", "app.quit", "Quit", id="start.quit"),
    ]

    def __init__(self, recent: list[Path]) -> None:
        super().__init__()
        self.recent = recent
        self.choices: list[tuple[str, object]] = []

    def compose(self) -> ComposeResult:
        with Vertical(id="start"):
            yield Static(
                Text.assemble(("offgrid", "bold"), "  sizing stand-alone solar systems"),
                id="start-title",
            )
            yield Static(
                Text("Choose with \u2191\u2193 and Enter, or press a key shown below.", style="dim")
            )
            yield OptionList(*self._options(), id="start-list")
            yield Static(
                Text("Designs defer to local electrical codes and licensed practice.", style="dim"),
                id="start-note",
            )
        yield Footer(compact=True)

    def _options(self) -> list[Option | None]:
        items: list[Option | None] = []
        self.choices = []

        def add(label: Text, kind: str, value: object = None) -> None:
            items.append(Option(label))
            self.choices.append((kind, value))

        def heading(title: str) -> None:
            items.append(Option(Text(title, style="bold underline"), disabled=True))
            self.choices.append(("none", None))

        if self.recent:
            heading("Recent projects")
            for p in self.recent[:6]:
                add(
                    Text.assemble(
                        "  ", (printable(p.name), "bold"), "  ", (printable(str(p.parent)), "dim")
                    ),
                    "file",
                    p,
                )
        heading("New project")
        add(
            Text.assemble(
                "  ", ("Demo: Kisanga Ridge health post", "bold"), "  complete example (d)"
            ),
            "demo",
        )
        for f in scenario_files():
            about = SCENARIOS.get(f.stem, "demo load list")
            add(Text.assemble("  Demo loads: ", (f.stem, "bold"), f"  {about}"), "scenario", f)
        add(Text.assemble("  ", ("Blank project", "bold"), "  start from nothing (b)"), "blank")
        add(
            Text.assemble(
                "  ", ("Plan a community", "bold"), "  many households, standard kits (p)"
            ),
            "plan",
        )
        heading("Files")
        add(Text.assemble("  ", ("Open a project file...", "bold"), "  (o)"), "open")
        add(Text.assemble("  ", ("Quit", "bold"), "  (q)"), "quit")
        return items

    def on_mount(self) -> None:
        ol = self.query_one(OptionList)
        ol.focus()
        for i, (kind, _v) in enumerate(self.choices):
            if kind != "none":
                ol.highlighted = i
                break

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        kind, value = self.choices[event.option_index]
        if kind == "file":
            send(self, OpenPathAsked(value))
        elif kind == "demo":
            self.action_demo()
        elif kind == "scenario":
            send(self, ScenarioAsked(value))
        elif kind == "blank":
            self.action_blank()
        elif kind == "open":
            self.action_open()
        elif kind == "plan":
            self.action_plan()
        elif kind == "quit":
            self.app.exit(0)

    def action_open(self) -> None:
        send(self, OpenAsked())

    def action_blank(self) -> None:
        send(self, BlankAsked())

    def action_plan(self) -> None:
        send(self, PlanAsked())

    def action_demo(self) -> None:
        send(self, DemoAsked())
