"""The planning screen: a community survey or a programme of villages, its standard kits,
rows (or villages) and totals.

The screen only shows: the engine (:func:`offgrid.plan.community.plan_file`, or
:func:`offgrid.plan.programme.plan_programme_file` for a programme file) runs in a
worker thread and the views come from :mod:`offgrid.plan.text` and
:mod:`offgrid.plan.programme_text`.  Keys:

* ``1`` kits, ``2`` rows (a programme: villages), ``3`` totals, ``4`` notes (left out,
  notices, cautions);
* ``+`` / ``-`` allow one kit type more or less, ``a`` lets the kit-type price choose;
* ``o`` type another survey path, ``r`` plan again, ``e`` write the Markdown report
  next to the survey, ``Esc`` back.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import ClassVar

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding, BindingType
from textual.containers import VerticalScroll
from textual.message import Message
from textual.screen import Screen
from textual.widgets import ContentSwitcher, DataTable, Footer, Input, Static

VIEWS = (("kits", "Kits"), ("rows", "Rows"), ("totals", "Totals"), ("notes", "Notes"))
MAX_KITS = 12


@dataclass
class PlanRequest:
    path: Path
    kits: int | None  # None: chosen by the kit-type price (or the default number)


class PlanScreen(Screen):
    """Plan a community survey at the keyboard."""

    DEFAULT_CSS = """
    PlanScreen #plan-path { height: 1; border: none; padding: 0 1; }
    PlanScreen #plan-views { height: 1fr; }
    PlanScreen DataTable { height: 1fr; }
    """

    BINDINGS: ClassVar[list[BindingType]] = [
        *(
            Binding(str(n), f"view('{vid}')", title, id=f"plan.view.{vid}")
            for n, (vid, title) in enumerate(VIEWS, start=1)
        ),
        Binding("plus,equals_sign", "kits(1)", "More kits", id="plan.kits_more"),
        Binding("minus", "kits(-1)", "Fewer", id="plan.kits_fewer"),
        Binding("a", "kits_auto", "Kits by price", show=False, id="plan.kits_auto"),
        Binding("o", "path", "Survey", id="plan.open"),
        Binding("r", "replan", "Plan again", show=False, id="plan.again"),
        Binding("e", "export", "Report", id="plan.export"),
        Binding("escape", "back", "Back", id="plan.back"),
    ]

    class Planned(Message):
        def __init__(self, plan, error: str | None) -> None:
            super().__init__()
            self.plan = plan
            self.error = error

    def __init__(
        self,
        path: Path | str | None = None,
        kits: int | None = None,
        report_path: Path | None = None,
    ) -> None:
        super().__init__()
        from offgrid.plan.community import demo_survey_path

        self.request = PlanRequest(Path(path) if path else demo_survey_path(), kits)
        self.report_path = report_path
        self.plan = None
        self.view = "kits"

    # ------------------------------------------------------------------ layout
    def compose(self) -> ComposeResult:
        yield Static(Text("Community plan", style="bold"), id="plan-title")
        yield Input(
            str(self.request.path),
            id="plan-path",
            placeholder="community survey or programme CSV, Enter to plan",
        )
        yield Static("", id="plan-status")
        with ContentSwitcher(initial="kits", id="plan-views"):
            for vid, _title in VIEWS[:3]:
                yield DataTable(id=vid, zebra_stripes=True, cursor_type="row")
            with VerticalScroll(id="notes"):
                yield Static("", id="plan-notes")
        yield Footer(compact=True)

    def on_mount(self) -> None:
        self.query_one("#kits", DataTable).focus()
        self.start()

    # ------------------------------------------------------------------ planning
    def start(self) -> None:
        k = self.request.kits
        how = f"at most {k} kit type(s)" if k else "kit types chosen by price"
        self.query_one("#plan-status", Static).update(
            Text(f"Planning {self.request.path.name} ({how})...", style="italic")
        )
        self.run_plan(self.request)

    @work(thread=True, exclusive=True)
    def run_plan(self, request: PlanRequest) -> None:
        from offgrid.plan.community import plan_file
        from offgrid.plan.kits import PlanError
        from offgrid.plan.programme import (
            ProgrammeError,
            is_programme_file,
            plan_programme_file,
        )
        from offgrid.plan.survey import SurveyError

        try:
            # one process: worker processes cannot be forked safely from a UI thread
            if is_programme_file(request.path):
                plan = plan_programme_file(request.path, kits=request.kits, jobs=1)
            else:
                plan = plan_file(request.path, kits=request.kits, jobs=1)
        except (SurveyError, PlanError, ProgrammeError, OSError) as exc:
            self.post_message(self.Planned(None, str(exc)))
            return
        self.post_message(self.Planned(plan, None))

    def on_plan_screen_planned(self, message: Planned) -> None:
        if message.error is not None:
            self.query_one("#plan-status", Static).update(
                Text(f"Cannot plan: {message.error.splitlines()[0]}", style="bold red")
            )
            self.query_one("#plan-notes", Static).update(Text(message.error))
            self.action_view("notes")
            return
        self.plan = message.plan
        self.show()

    @property
    def is_programme(self) -> bool:
        from offgrid.plan.programme import ProgrammePlan

        return isinstance(self.plan, ProgrammePlan)

    def show_programme(self) -> None:
        from offgrid.plan.programme_text import kit_table, notes_text, totals_table, village_table

        plan = self.plan
        title = f"Programme: {plan.name}" + ("  (demonstration data)" if plan.demo else "")
        self.query_one("#plan-title", Static).update(Text(title, style="bold"))
        cost = (
            f", capital cost {plan.totals.total_cost:,.0f} {plan.currency}"
            if plan.totals and plan.totals.total_cost is not None
            else ""
        )
        unmet = sum(len(v.unmet) for v in plan.villages)
        status = Text(
            f"{len(plan.villages)} villages, {plan.systems} systems, "
            f"{len(plan.kits)} kit type(s){cost}; "
        )
        status.append(
            f"{len(plan.left_out)} left out, {unmet} cannot be met",
            style="bold red" if plan.left_out or unmet else "",
        )
        self.query_one("#plan-status", Static).update(status)
        for vid, table in (
            ("kits", kit_table(plan)),
            ("rows", village_table(plan)),
            ("totals", totals_table(plan)),
        ):
            dt = self.query_one(f"#{vid}", DataTable)
            dt.clear(columns=True)
            dt.add_columns(*table[0])
            dt.add_rows(table[1])
        self.query_one("#plan-notes", Static).update(Text(notes_text(plan)))

    def show(self) -> None:
        from offgrid.plan.text import kit_table, row_table, totals_table

        if self.is_programme:
            self.show_programme()
            return
        plan = self.plan
        title = plan.name + ("  (demonstration data)" if plan.demo else "")
        self.query_one("#plan-title", Static).update(Text(title, style="bold"))
        s = plan.standard
        kits = len(s.kits) if s else 0
        cost = (
            f", capital cost {plan.totals.total_cost:,.0f} {plan.currency}"
            if plan.totals and plan.totals.total_cost is not None
            else ""
        )
        left = len({p.line for p in plan.bad_rows})
        status = Text(f"{plan.systems} systems, {kits} kit type(s){cost}; ")
        status.append(
            f"{left} row(s) left out, {len(plan.unmet)} cannot be met",
            style="bold red" if left or plan.unmet else "",
        )
        self.query_one("#plan-status", Static).update(status)
        for vid, table in (
            ("kits", kit_table(plan)),
            ("rows", row_table(plan)),
            ("totals", totals_table(plan)),
        ):
            dt = self.query_one(f"#{vid}", DataTable)
            dt.clear(columns=True)
            dt.add_columns(*table[0])
            dt.add_rows(table[1])
        self.query_one("#plan-notes", Static).update(Text(self.notes_text()))

    def notes_text(self) -> str:
        plan = self.plan
        lines: list[str] = []
        if plan.standard is not None:
            lines += [f"Kits: {plan.standard.method}.", ""]
            curve = "  ".join(f"{k}: {v:,.0f}" for k, v in plan.standard.curve)
            lines += [f"Best objective against the number of kit types: {curve}", ""]
        if plan.unmet:
            lines.append("Cannot be met:")
            lines += [f"  line {r.line} (id {r.id}): {r.reason}" for r in plan.unmet]
            lines.append("")
        if plan.bad_rows:
            lines.append("Left out (could not be read):")
            lines += [f"  {p}" for p in plan.bad_rows]
            lines.append("")
        if plan.notices:
            lines.append("Notices:")
            lines += [f"  [{n.code}] {n.message}" for n in plan.notices]
            lines.append("")
        lines.append("Safety cautions:")
        lines += [f"  ! {c}" for c in plan.cautions]
        return "\n".join(lines)

    # ------------------------------------------------------------------ actions
    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if isinstance(self.focused, Input) and action not in ("back",):
            return None  # keys type into the path box
        if action == "export" and self.plan is None:
            return None
        return True

    def action_view(self, view: str) -> None:
        self.view = view
        self.query_one(ContentSwitcher).current = view
        target = self.query_one(f"#{view}")
        target.focus()

    def action_kits(self, step: int) -> None:
        base = self.request.kits
        if base is None and self.is_programme:
            base = max(1, len(self.plan.kits))
        if base is None:
            base = len(self.plan.standard.kits) if self.plan and self.plan.standard else 3
        self.request.kits = max(1, min(MAX_KITS, base + step))
        self.start()

    def action_kits_auto(self) -> None:
        self.request.kits = None
        self.start()

    def action_replan(self) -> None:
        self.start()

    def action_path(self) -> None:
        self.query_one("#plan-path", Input).focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        text = event.value.strip()
        if text:
            self.request.path = Path(text).expanduser()
            self.start()
        self.action_view(self.view)

    def action_export(self) -> None:
        from offgrid.plan.programme_text import markdown_report as programme_report
        from offgrid.plan.text import markdown_report
        from offgrid.project.atomic import atomic_write_text

        target = self.report_path or self.request.path.with_name(
            self.request.path.stem + "-plan.md"
        )
        from offgrid.report.export import overwrite_refusal

        refusal = overwrite_refusal(target)
        if refusal:
            self.app.notify(f"Not written: {refusal}", severity="error", markup=False)
            return
        try:
            atomic_write_text(
                target,
                programme_report(self.plan) if self.is_programme else markdown_report(self.plan),
            )
        except OSError as exc:
            self.app.notify(
                f"Cannot write {target}: {exc.strerror}", severity="error", markup=False
            )
            return
        self.app.notify(f"Report written: {target}", markup=False, timeout=4)

    def action_back(self) -> None:
        if isinstance(self.focused, Input):
            self.action_view(self.view)
            return
        if len(self.app.screen_stack) > 1:
            self.app.pop_screen()
        else:
            self.app.exit()
