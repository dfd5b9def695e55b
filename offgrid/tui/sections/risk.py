"""Section 7, Risk: how often the battery would run out, over many synthetic weather years.

The study (:func:`offgrid.simulate.run.simulate_project`) takes a few seconds, so
it runs in a worker thread on a copy of the project, with a progress bar; the
rest of the UI stays usable and ``x`` stops it.  Results are marked out of date
as soon as the project changes.
"""

from __future__ import annotations

import copy
import hashlib
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable, ProgressBar, Static

from offgrid.catalogue import figure_entry, table_entry
from offgrid.catalogue.outcomes import outcome_key, outcome_value
from offgrid.design.result import Reason
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import Session
from offgrid.tui.text import printable
from offgrid.tui.widgets.monthchart import MONTHS
from offgrid.tui.widgets.steady import SteadyTable

YEARS = 30


@dataclass
class RiskRun:
    report: object  # offgrid.simulate.run.SimulationReport
    project_text: str  # the project (TOML) it was run on: out of date when the text differs
    seconds: float


#: Largest kept study read back [bytes] (a 30-year study with its trade-off: ~60 kB).
MAX_KEPT_BYTES = 4_000_000


def kept_run_file(state: Path, project_path: Path) -> Path:
    """Where the last risk run of a project file is kept (the user's own state folder)."""
    key = hashlib.sha1(str(Path(project_path).resolve()).encode()).hexdigest()[:16]
    return Path(state) / f"risk-{key}.json"


def keep_run(state: Path, project_path: Path, run: RiskRun) -> None:
    """Keep ``run`` as JSON with the project text it was run on (its inputs), atomically."""
    from offgrid.project.atomic import write_atomic
    from offgrid.simulate.stored import StoredStudy, study_to_json

    target = kept_run_file(state, project_path)
    target.parent.mkdir(parents=True, exist_ok=True)
    where = str(Path(project_path).resolve())
    body = study_to_json(StoredStudy(run.report, run.project_text, run.seconds, where))
    write_atomic(target, body, backup=False)


def kept_run(state: Path, project_path: Path) -> RiskRun | None:
    """The last run kept for this project file, or None (missing, unreadable, another file).

    A bounded read (:func:`offgrid.textfile.read_text`) of plain JSON: nothing in the
    file is run, and a damaged or planted file is only ignored."""
    from offgrid.simulate.stored import study_from_json
    from offgrid.textfile import read_text

    try:
        kept = study_from_json(read_text(kept_run_file(state, project_path), MAX_KEPT_BYTES))
    except (OSError, ValueError):  # ValueError: StoredStudyError, TextFileError, bad UTF-8
        return None
    if kept.project_path != str(Path(project_path).resolve()):
        return None
    return RiskRun(kept.report, kept.project_text, kept.seconds)


def pct(x: float | None) -> str:
    if x is None:
        return "-"
    v = 100 * x
    if v == 0:
        return "0 %"
    return f"{v:.3f} %" if v < 0.1 else f"{v:.2f} %" if v < 10 else f"{v:.1f} %"


#: The figures this section lists, by catalogue path, with a note for the why screen.
RISK_ROWS: tuple[tuple[str, str], ...] = (
    ("reliability.lolp", ""),
    ("reliability.unmet_fraction", ""),
    ("reliability.lolp_critical", ""),
    ("reliability.longest_shed_run_days", ""),
    ("reliability.days_below_soc", ""),
    (
        "reliability.lolp_end_of_life",
        "The same simulation with the battery capacity at its end-of-life fraction.",
    ),
    ("reliability.wear.expected_life_years", ""),
    ("reliability.wear.equivalent_full_cycles_per_year", ""),
    (
        "reliability.spilled_fraction",
        "Share of the controller output that the full battery could not take.",
    ),
)


def risk_row(rel: Any, path: str, extra: str = "") -> tuple[str, str, Any, str]:
    """Label, shown value, reason and note of one figure of the simulation's record, label,
    unit, digits and scale from the catalogue (offgrid/catalogue/outcomes.py)."""
    e = figure_entry(path)
    v = outcome_value(rel, path)
    text = "-" if v is None else e.text(float(v))
    if path == "reliability.lolp":
        text += f"  ({rel.shed_days} of {rel.days} days)"
    elif path == "reliability.days_below_soc":
        text += f" (below {rel.soc_threshold:.0%} charge)"
    return e.label, text, rel.reasons.get(outcome_key(e.explained_by)), extra


def tradeoff_rows(t: Any) -> list[tuple[str, str, Any, str]]:
    """Rows of one target of the trade-off (a ``TargetResult``): the catalogue table
    ``tradeoff``'s figures, each its label and unit, its reason, the target's message."""
    from offgrid.simulate.tradeoff import TRADEOFF_REASONS, point_text, target_texts

    target, met, need, cheapest = (figure_entry(p) for p in table_entry("tradeoff").figures)
    t_text, _met, need_text = target_texts(t)

    def why(e):
        return TRADEOFF_REASONS.get(outcome_key(e.explained_by))

    rows = [
        (
            f"{target.label} {t_text} {target.unit}",
            f"{met.label}: " + ("yes" if t.design_meets else "NO"),
            why(met),
            t.message,
        ),
        (
            f"    {need.label}",
            need_text if t.design_capacity_needed_wh is None else f"{need_text} {need.unit}",
            why(need),
            t.message,
        ),
    ]
    if t.cheapest is not None:
        rows.append((f"    {cheapest.label}", point_text(t.cheapest), why(cheapest), ""))
    return rows


#: The monthly rows of the strip under the figures: the catalogue table's first two.
STRIP_ROWS = 2


def month_strip_rows(months) -> list[tuple[str, list[str]]]:
    """(heading, twelve texts) of each row of the month strip: the catalogue table
    ``reliability-months`` (offgrid/catalogue/composites.py), its figures' headings and
    digits, the lowest state of charge's 5th percentile after the LOLP."""
    rows = []
    for path in table_entry("reliability-months").figures[:STRIP_ROWS]:
        e = figure_entry(path)
        name = path.rsplit(".", 1)[1]
        values = [e.shown(getattr(m, name)) for m in months]  # a field named in the table
        rows.append((e.heading(), [f"{v:.{e.digits or 0}f}" for v in values]))
    return rows


def month_strip(months) -> Text:
    text = Text(no_wrap=True, overflow="crop")
    text.append(f"{'':<12}", style="bold")
    for m in MONTHS:
        text.append(f"{m:>5}", style="bold")
    for heading, values in month_strip_rows(months):
        text.append(f"\n{heading:<12}")
        for v in values:
            text.append(f"{v:>5}")
    return text


class RiskSection(Section):
    section_id = "risk"
    help_text = (
        f"Runs {YEARS} years of synthetic daily weather through the design (a few "
        "seconds, in the background) and reports how often loads would be shed, "
        "how deep the battery cycles, and the array/battery trade-off."
    )

    BINDINGS = [
        Binding(
            "g",
            "run",
            "Run check",
            id="risk.run",
            tooltip="Simulate synthetic weather years in the background",
        ),
        Binding("x", "stop", "Stop", id="risk.stop", tooltip="Stop the running risk check"),
    ]

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.result: RiskRun | None = None
        self.running = False
        self._rows: list[tuple[str, str, Reason | None, str]] = []

    def compose(self) -> ComposeResult:
        yield Static(id="risk-status", classes="table-title")
        yield ProgressBar(total=100, show_eta=False, id="risk-progress")
        yield SteadyTable(id="risk-table", cursor_type="row", zebra_stripes=False)
        yield Static(id="risk-months", classes="months-strip")

    @property
    def table(self) -> DataTable:
        return self.query_one("#risk-table", DataTable)

    def first_focus(self):
        return self.table

    # ------------------------------------------------------------------ drawing
    def show(self, session: Session) -> None:
        status = self.query_one("#risk-status", Static)
        bar = self.query_one(ProgressBar)
        bar.display = self.running
        if self.running:
            status.update(
                Text(
                    f"Simulating {YEARS} years of weather... (x stops; you can keep working)",
                    style="bold",
                )
            )
        elif self.result is None:
            status.update(
                Text(
                    f"Press g to test this design against {YEARS} years of synthetic "
                    "weather (a few seconds, in the background).",
                    style="bold",
                )
            )
        elif self.result.project_text != session.text():
            status.update(
                Text(
                    "\u26a0 Out of date: the project changed since this run. Press g to run again.",
                    style="bold reverse",
                )
            )
        else:
            status.update(
                Text(
                    f"Result for the design as it is now ({self.result.seconds:.1f} "
                    "s). w explains a figure.",
                    style="bold",
                )
            )
        self._fill()

    def _fill(self) -> None:
        table = self.table
        keep = table.cursor_row or 0
        table.clear(columns=not table.columns)
        if not table.columns:
            table.add_column("Figure", width=34, key="label")
            table.add_column("Value", key="value")
        self._rows = []
        strip = self.query_one("#risk-months", Static)
        if self.result is None:
            strip.update("")
            return
        rep = self.result.report
        r = rep.reliability
        rows = [risk_row(r, path, extra) for path, extra in RISK_ROWS]
        tr = rep.tradeoff
        if tr is not None:
            rows.append((table_entry("tradeoff").title, "", None, ""))  # a heading
            for t in tr.targets:
                rows += tradeoff_rows(t)
        for label, value, reason, extra in rows:
            if not value and reason is None and not extra:
                table.add_row(Text(label, style="bold underline"), Text(""))
            else:
                table.add_row(Text("  " + label), Text(value, style="bold"))
            self._rows.append((label, value, reason, extra))
        if table.row_count:
            table.move_cursor(row=min(keep, table.row_count - 1), animate=False)
        strip.update(month_strip(r.months))

    # ------------------------------------------------------------------ running
    def action_run(self) -> None:
        if self.running:
            self.app.notify("Already running (x stops it).", timeout=2)
            return
        if self.session.design is None:
            self.app.notify(
                "No design to test yet: see the headline.", severity="warning", timeout=3
            )
            return
        self.running = True
        self.query_one(ProgressBar).update(progress=0)
        self.show(self.session)
        self._simulate(
            copy.deepcopy(self.session.project), self.session.base_dir, self.session.text()
        )

    def action_stop(self) -> None:
        if self.running:
            self.workers.cancel_group(self, "risk")
            self.running = False
            self.app.notify("Stopped.", timeout=2)
            self.show(self.session)

    @work(thread=True, exclusive=True, group="risk")
    def _simulate(self, project, base, text: str) -> None:
        from textual.worker import get_current_worker

        worker = get_current_worker()
        t0 = time.perf_counter()
        try:
            from offgrid.simulate.balance import SimulationCancelled
            from offgrid.simulate.run import simulate_project
        except ImportError as exc:
            self.app.call_from_thread(self._failed, f"the simulation is not installed ({exc})")
            return
        try:
            report = simulate_project(
                project,
                base,
                years=YEARS,
                progress=lambda f: self.app.call_from_thread(self._progress, f),
                cancelled=lambda: worker.is_cancelled,
            )
        except SimulationCancelled:
            return
        except Exception as exc:  # a message for the user, not a crash
            if not worker.is_cancelled:
                self.app.call_from_thread(self._failed, str(exc))
            return
        if not worker.is_cancelled:
            run = RiskRun(report, text, time.perf_counter() - t0)
            self.app.call_from_thread(self._done, run)

    def _keep(self, run: RiskRun) -> None:
        """Keep the run with the project file, so it is there on reopen (marked out of
        date when the project has changed since)."""
        path = self.session.path
        if path is None:
            return
        try:
            keep_run(self.app.state, path, run)  # type: ignore[attr-defined]
        except (OSError, TypeError, ValueError) as exc:
            self.app.notify(
                f"The risk result is not kept for next time: {exc}",
                severity="warning",
                markup=False,
                timeout=4,
            )

    def on_mount(self) -> None:
        path = self.work.session.path if self.work.session is not None else None
        if self.result is None and path is not None:
            self.result = kept_run(self.app.state, path)  # type: ignore[attr-defined]

    def current_report(self, session: Session):
        """The last run's report if it was run on the project as it is now, else None."""
        if (
            self.result is not None
            and not self.running
            and self.result.project_text == session.text()
        ):
            return self.result.report
        return None

    def _progress(self, fraction: float) -> None:
        self.query_one(ProgressBar).update(progress=100 * fraction)

    def _done(self, run: RiskRun) -> None:
        self.running = False
        self.result = run
        self._keep(run)
        if self.is_attached and self.work.session is not None:
            self.show(self.session)
        self.app.notify(f"Risk check done: LOLP {pct(run.report.reliability.lolp)}", timeout=4)

    def _failed(self, message: str) -> None:
        self.running = False
        self.app.notify(f"Risk check failed: {message}", severity="error", markup=False, timeout=6)
        if self.is_attached:
            self.show(self.session)

    # ------------------------------------------------------------------ why
    def figure(self) -> Figure | None:
        if not self._rows:
            return None
        label, value, reason, extra = self._rows[min(self.table.cursor_row, len(self._rows) - 1)]
        return Figure(label, value, None, reason, extra=printable(extra))
