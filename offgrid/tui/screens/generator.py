"""The generator beside the sun in a read-only dialog (issue 16), opened from the command list.

At once: the derated output, the fitted fuel line against the datasheet, and the check of
what it must carry.  The hybrid study (20 years of hourly synthetic weather, the trade-off
of array and battery against fuel) runs in a worker thread; when it is done the dialog adds
run hours, starts, litres, the solar fraction and the cheapest mix.  Nothing is edited here:
``e`` opens the form (:mod:`offgrid.tui.screens.forms`).
"""

from __future__ import annotations

import copy
import textwrap
from pathlib import Path

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.message import Message
from textual.widgets import Static

from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.text import printable

WIDTH = 72  # the wide dialog's 78 columns less its border and padding


def _wrap(text: str, indent: str = "  ") -> list[str]:
    return textwrap.wrap(text, WIDTH, subsequent_indent=indent) or [""]


def _fit(lines: list[str]) -> list[str]:
    """Every line within WIDTH (a long one wrapped, its indent kept and deepened)."""
    out = []
    for ln in lines:
        lead = ln[: len(ln) - len(ln.lstrip())]
        out += [ln] if len(ln) <= WIDTH else _wrap(ln, lead + "  ")
    return out


def setup_lines(setup) -> list[str]:
    """Derating, fuel line and check (no weather): engine figures as text, no Textual."""
    g, d, f, k = setup.spec, setup.derating, setup.fuel, setup.check
    out = _wrap(f"{g.name}: {g.fuel}, {g.rated_kw:g} kW rated, {g.dispatch.replace('_', ' ')}")
    out.append(
        f"Derated output {d.derated_kw:.2f} kW (x {d.factor:.3f}) at {d.altitude_m:.0f} m, "
        f"{d.temp_c:.1f} C"
    )
    out += _wrap(f"  method {d.method}: {d.reason.source}", "    ")
    out.append(
        f"Fuel line: {f.a_l_h_per_kw:.4f} L/h per kW rated + {f.b_l_per_kwh:.4f} L/kWh "
        f"(R^2 {f.r_squared:.4f})"
    )
    out.append("  load kW   " + " ".join(f"{x:6.2f}" for x in f.points_kw))
    out.append("  sheet L/h " + " ".join(f"{x:6.3f}" for x in f.points_l_h))
    out.append("  line L/h  " + " ".join(f"{x:6.3f}" for x in f.fitted_l_h))
    out.append(
        f"Check: starting need {k.starting_need_w / 1000:.2f} kW within "
        f"{k.derated_w / 1000:.2f} kW: " + ("yes" if k.ok else "NO")
    )
    out.append(
        f"  AC peak {k.ac_peak_w / 1000:.2f} kW, charger input "
        f"{k.charger_input_w / 1000:.2f} kW, minimum loading {k.min_load_w / 1000:.2f} kW"
    )
    for n in setup.notices:
        out += _wrap(f"{n.severity}: {n.message}")
    return _fit(out)


def caution_lines(setup) -> list[str]:
    """The generator's cautions (CO, fuel, changeover, earthing, noise, local codes)."""
    from offgrid.generator.cautions import generator_cautions
    from offgrid.wording import confirm_words

    out = ["", "Cautions"]
    for c in generator_cautions(setup.spec):
        out += _wrap("! " + confirm_words(c))
    return out


def study_lines(st) -> list[str]:
    """The simulated hybrid and the cheapest mix: engine figures as text, no Textual."""
    r, c = st.run, st.cost
    cur = c.currency
    out = _wrap(
        f"Simulated ({st.chosen}): array {r.array_w:.0f} W, battery "
        f"{(st.chosen_battery_kwh or 0):.2f} kWh; {st.years} years hourly"
    )
    out.append(f"  run hours {r.run_hours_per_year:.0f} /yr, starts {r.starts_per_year:.0f} /yr")
    out.append(
        f"  fuel {r.fuel_l_per_year:.0f} L/yr; below minimum loading "
        f"{r.below_min_hours_per_year:.0f} h/yr"
    )
    out.append(
        f"  solar fraction {r.solar_fraction:.1%}, unmet energy {r.unmet_fraction:.3%} "
        f"(without the generator {r.solar_only_unmet_fraction:.2%})"
    )
    tot = "-" if c.total_pw is None else f"{c.total_pw:,.0f} {cur}"
    out.append(f"  generator over the life (present worth): {tot}")
    m = st.mix
    if m is None:
        out += _wrap("No trade-off: " + "; ".join(st.notes[:1]))
        return _fit(out)
    so = m.solar_only
    out.append(
        f"Solar only: {so.array_w:.0f} W, {so.battery_kwh:.2f} kWh, unmet "
        f"{so.unmet_fraction:.2%}, LCC {so.lcc:,.0f} {cur}"
    )
    if m.cheapest is None:
        out += _wrap("No mix kept unmet energy within the limit.")
    else:
        ch = m.cheapest
        out += _wrap(
            f"Cheapest mix: {ch.array_w:.0f} W, {ch.battery_kwh:.2f} kWh, "
            f"{ch.fuel_l_per_year:.0f} L/yr, solar {ch.solar_fraction:.0%}, "
            f"LCC {ch.lcc:,.0f} {cur} ({len(m.points)} mixes tried)"
        )
    for n in m.notes:
        if n.startswith("the solar-only design costs less"):
            out += _wrap("Note: " + n)
    return _fit(out)


class GeneratorDialog(Dialog):
    """The generator's figures; the study fills in when its worker ends. Enter or Esc closes."""

    BINDINGS = [
        Binding("enter", "close", "Close", id="generator.close"),
        Binding("e", "edit", "Add, edit or remove the generator", id="generator.edit"),
    ]

    class Studied(Message):
        def __init__(self, lines: list[str]) -> None:
            super().__init__()
            self.lines = lines

    def __init__(
        self, project, base: Path | None, lines: list[str], tail: list[str] | None = None
    ) -> None:
        """``lines``: the setup's text; ``tail``: shown below the study (the cautions).
        The study runs on a copy of ``project``."""
        super().__init__()
        self.project = copy.deepcopy(project)
        self.base = base
        self.lines = lines
        self.tail = tail or []
        self.done = False

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="generator"):
            yield Static(Text("Generator beside the sun", style="bold"), classes="dialog-title")
            with VerticalScroll(id="generator-body"):
                yield Static(Text("\n".join(printable(ln) for ln in self.lines)))
                yield Static(
                    Text("Simulating 20 years hour by hour ...", style="italic"),
                    id="generator-study",
                )
                if self.tail:
                    yield Static(Text("\n".join(printable(ln) for ln in self.tail)))
            yield Static(Text("up/down: scroll   e: edit   Enter or Esc: close", style="dim"))

    def action_edit(self) -> None:
        """Close the figures and open the form (offgrid.tui.screens.forms)."""
        from offgrid.tui.screens.forms import GeneratorForm

        self.dismiss(None)
        self.app.push_screen(GeneratorForm())

    def on_mount(self) -> None:
        self.run_study()

    @work(thread=True, exclusive=True)
    def run_study(self) -> None:
        from offgrid.design.result import DesignError
        from offgrid.generator.study import generator_study

        try:
            lines = study_lines(generator_study(self.project, self.base))
        except (DesignError, ValueError) as exc:
            lines = _wrap(f"No simulation: {exc}")
        self.post_message(self.Studied(lines))

    def on_generator_dialog_studied(self, message: Studied) -> None:
        self.done = True
        self.query_one("#generator-study", Static).update(
            Text("\n".join(printable(ln) for ln in message.lines))
        )


def open_generator(screen) -> None:
    """Open the dialog for the work screen's project, or say why there is none."""
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design as run_design
    from offgrid.generator.hybrid import generator_setup

    session = screen.session
    project = session.project
    if project.generator is None:
        from offgrid.tui.screens.forms import GeneratorForm

        screen.app.notify("No generator in this project yet: press a to add one.", timeout=5)
        screen.app.push_screen(GeneratorForm())
        return
    try:
        d = session.design if session.design is not None else run_design(project, session.base_dir)
        setup = generator_setup(project, d, session.base_dir)
        lines = setup_lines(setup)
        tail = caution_lines(setup)
    except DesignError as exc:
        where = f"{exc.field}: " if exc.field else ""
        screen.app.notify(f"The generator cannot serve: {where}{exc}", severity="error")
        return
    screen.app.push_screen(GeneratorDialog(project, session.base_dir, lines, tail))
