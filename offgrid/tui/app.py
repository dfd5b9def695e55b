"""The offgrid text UI: one app, made by :func:`make_app` for the CLI and the tests alike."""

from __future__ import annotations

import contextlib
import re
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import TYPE_CHECKING

from textual import events
from textual.app import App, SystemCommand
from textual.binding import Binding
from textual.screen import Screen
from textual.theme import Theme

from offgrid.tui import messages
from offgrid.tui.screens.dialogs import ConfirmDialog, MessageDialog, PathDialog
from offgrid.tui.screens.work import WorkScreen
from offgrid.tui.session import EditRejected, Session
from offgrid.tui.state import (
    Recovery,
    RecoveryStore,
    discard_recovery,
    recent_projects,
    remember_project,
    state_dir,
)
from offgrid.tui.text import plain_terminal, printable
from offgrid.tui.widgets.bars import SECTIONS

if TYPE_CHECKING:
    from offgrid.tui.commands import KeyGroup

# The start screen, the recovery, help and generator dialogs and the key lists are
# imported where they are first shown: opening a project paints without them.

AUTOSAVE_SECONDS = 0.0  # kept for callers; the recovery copy is written after every edit

THEMES = (
    Theme(
        name="offgrid-night",
        primary="#2a6f97",
        secondary="#468faf",
        accent="#f4a259",
        foreground="#e8e8e8",
        background="#14181c",
        surface="#1d2329",
        panel="#27303a",
        success="#7bc96f",
        warning="#f2c14e",
        error="#ef6461",
        dark=True,
    ),
    # High contrast for a screen in the sun: black on white, strong pure colours.
    Theme(
        name="offgrid-sunlight",
        primary="#000000",
        secondary="#003a8c",
        accent="#003a8c",
        foreground="#000000",
        background="#ffffff",
        surface="#ffffff",
        panel="#d8d8d8",
        boost="#ececec",
        success="#005a00",
        warning="#7a3e00",
        error="#b00000",
        dark=False,
        luminosity_spread=0.05,
        text_alpha=1.0,
    ),
)
DEFAULT_THEME = "offgrid-night"
SUN_THEME = "offgrid-sunlight"


#: Borders drawn with ASCII under TERM=vt100 or NO_COLOR (see ``plain_terminal``).
PLAIN_CSS = """
.dialog { border: ascii $accent; }
.months-strip, #balance, #wiring-fields { border-top: ascii $panel; }
EditBar { border-top: ascii $accent; }
"""


#: Set (a positive number of seconds) to make every notice last that long instead of its own
#: time: tests that wait for notices to go set it; unset, each notice keeps its time.
NOTICE_SECONDS_ENV = "OFFGRID_NOTICE_SECONDS"


def notice_seconds(asked: float | None, env=None) -> float | None:
    """How long a notice stays [s]: ``$OFFGRID_NOTICE_SECONDS`` if it is a positive finite
    number, else ``asked`` (``None``: Textual's default)."""
    import math
    import os

    text = (os.environ if env is None else env).get(NOTICE_SECONDS_ENV, "")
    try:
        seconds = float(text)
    except ValueError:
        return asked
    return seconds if math.isfinite(seconds) and seconds > 0 else asked


def suggested_name(title: str) -> str:
    slug = re.sub(r"[^A-Za-z0-9]+", "-", title).strip("-").lower()
    return (slug or "project")[:48] + ".toml"


class OffgridApp(App):
    """Size stand-alone solar systems at the keyboard."""

    CSS_PATH = "app.tcss"
    TITLE = "offgrid"
    ENABLE_COMMAND_PALETTE = True

    BINDINGS = [
        Binding(
            "question_mark,f1,h",
            "help",
            "Help",
            id="app.help",
            tooltip="Every key, the section's first",
        ),
        Binding(
            "q",
            "quit",
            "Quit",
            id="app.quit",
            tooltip="Leave offgrid, asking about unsaved changes",
        ),
        Binding("ctrl+q", "quit", "Quit", show=False, priority=True, id="app.quit_ctrl"),
        Binding(
            "t",
            "toggle_theme",
            "Sunlight colours",
            show=False,
            id="app.theme",
            tooltip="Switch to high contrast and back",
        ),
        Binding(
            "P",
            "plan",
            "Plan a community",
            show=False,
            id="app.plan",
            tooltip="Many households from one survey: standard kits and totals",
        ),
        Binding(
            "ctrl+p", "command_palette", "Commands", show=False, priority=True, id="app.commands"
        ),
        Binding("colon", "command_palette", "Commands", show=False, id="app.commands_colon"),
    ]

    def __init__(
        self,
        session: Session | None = None,
        *,
        state: Path | None = None,
        orphans: list[Recovery] | None = None,
        section: str = "place",
        autosave_seconds: float = AUTOSAVE_SECONDS,
        theme: str | None = None,
    ) -> None:
        super().__init__()
        self.initial_session = session
        self.state = state or state_dir()
        from offgrid.tui.autosave import RecoveryWriter

        self.recovery = RecoveryWriter(RecoveryStore(self.state), self._recovery_failed)
        self.orphans = list(orphans or [])
        self.initial_section = section
        self.autosave_seconds = autosave_seconds
        self.discarded = False
        self.autosaves = 0
        self._last_session: Session | None = session
        self.plain = plain_terminal()
        if self.plain:  # a serial console or screen reader: ASCII lines, no colour
            self.CSS = PLAIN_CSS
        for t in THEMES:
            self.register_theme(t)
        self.theme = theme or DEFAULT_THEME

    # ------------------------------------------------------------------ pilots
    # A pilot (tests, snapshots) starts once the first design is on screen, as a person
    # would see it: the design is worked out on a worker thread after the first paint.
    pilots_wait_for_design = True  # False: a test that looks at the state before it

    async def design_settled(self, pilot, timeout_s: float = 20.0) -> None:
        """Pause ``pilot`` until no design is being worked out on the work screen."""
        import time

        if not self.pilots_wait_for_design:
            return

        end = time.monotonic() + timeout_s
        await pilot.pause()
        while (work := self.work) is not None and work.design_pending:
            if time.monotonic() > end:
                raise TimeoutError(f"no design within {timeout_s} s")
            await pilot.pause(0.01)
        await pilot.pause()

    @contextlib.asynccontextmanager
    async def run_test(self, *args, **kwargs):
        from offgrid.tui.session import release_engine_memo

        try:
            async with super().run_test(*args, **kwargs) as pilot:
                await self.design_settled(pilot)
                yield pilot
        finally:
            release_engine_memo()

    async def run_async(self, *args, auto_pilot=None, **kwargs):
        if auto_pilot is not None:
            inner = auto_pilot

            async def auto_pilot(pilot) -> None:
                await self.design_settled(pilot)
                await inner(pilot)

        from offgrid.tui.session import release_engine_memo

        try:
            return await super().run_async(*args, auto_pilot=auto_pilot, **kwargs)
        finally:
            release_engine_memo()  # the engine's memo lives as long as the app

    def notify(
        self,
        message: str,
        *,
        title: str = "",
        severity="information",
        timeout: float | None = None,
        markup: bool = True,
    ) -> None:
        super().notify(
            message,
            title=title,
            severity=severity,
            timeout=notice_seconds(timeout),
            markup=markup,
        )

    async def on_event(self, event: events.Event) -> None:
        # On the work screen each key is handled to the end before the next one
        # (offgrid.tui.keys says why): no key typed after the one that opens an
        # editor is lost or reordered.
        if (
            isinstance(event, events.Key)
            and not event.is_forwarded
            and isinstance(self.screen, WorkScreen)
        ):
            from offgrid.tui.keys import handle_key_now

            await handle_key_now(self, event)
            return
        await super().on_event(event)

    # ------------------------------------------------------------------ screens
    @property
    def session(self) -> Session | None:
        """The project on the work screen (after the app has ended: the last one shown)."""
        work = self.work
        if work is not None:
            self._last_session = work.session
            return work.session
        return self._last_session

    @property
    def work(self) -> WorkScreen | None:
        for screen in reversed(self.screen_stack):
            if isinstance(screen, WorkScreen):
                return screen
        return None

    #: Called once the first screen is painted (``launch.run`` turns the garbage
    #: collector back on there); None: nothing.
    on_first_paint: Callable[[], object] | None = None

    def on_mount(self) -> None:
        if self.orphans:
            from offgrid.tui.screens.recover import RecoverDialog

            self._first_screen()
            self.push_screen(RecoverDialog(self.orphans), self._recovery_answer)
        else:
            self._first_screen()
        if self.on_first_paint is not None:
            self.call_after_refresh(self.on_first_paint)

    def _first_screen(self) -> None:
        session = self.initial_session
        if session is not None:
            self.push_screen(WorkScreen(session, self.initial_section))
            if session.origin == "new-file":
                self.notify(
                    f"{printable(session.path.name)} does not exist yet: this is a new "
                    "project; s saves it there.",
                    markup=False,
                    timeout=6,
                )
            elif session.path is not None:
                # After the first paint: the recent list is written with an fsync.
                self.call_after_refresh(remember_project, session.path, self.state)
            self._tell_notes(session)
        else:
            from offgrid.tui.screens.start import StartScreen

            self.push_screen(StartScreen(recent_projects(self.state)))

    def _tell_notes(self, session: Session) -> None:
        """What migrating an older project file could not carry over (Session.notes)."""
        for note in session.notes:
            self.notify(
                note, title="Older project file", severity="warning", markup=False, timeout=12
            )

    def _recovery_answer(self, answer) -> None:
        if not answer:
            self.notify("The recovery file is kept; it is offered again next time.", timeout=4)
            return
        what, item = answer
        if what == "discard":
            discard_recovery(item)
            self.notify("Recovery file discarded.", timeout=3)
            return
        from offgrid.tui.session import recovered_session

        try:
            session = recovered_session(item.text, item.project_path, item.baseline)
        except ValueError as exc:
            self.push_screen(MessageDialog("The recovery file cannot be read", str(exc)))
            return
        self._use_session(session, check=False)
        discard_recovery(item)
        self.recovery.write(session.text(), session.path, session.title, session.baseline)
        self.notify(
            "Recovered: these changes are not saved to the project file yet (s saves).", timeout=6
        )

    def _use_session(self, session: Session, check: bool = True) -> None:
        """Show ``session`` on the work screen (after asking about unsaved changes)."""

        def go(answer: str | None = "discard") -> None:
            if answer == "save":
                self.save_project(then=lambda: go("discard"))
                return
            if answer != "discard":
                return
            work = self.work
            if work is not None and self.screen is work:
                work.replace_session(session)
            else:
                while len(self.screen_stack) > 2:
                    self.pop_screen()
                self.switch_screen(WorkScreen(session, self.initial_section))
            self.recovery.clear()
            if session.path is not None:
                remember_project(session.path, self.state)
            self._tell_notes(session)

        if check and self.session is not None and self.session.dirty:
            self.push_screen(self._unsaved_dialog("before opening another project"), go)
        else:
            go()

    def _unsaved_dialog(self, when: str) -> ConfirmDialog:
        name = printable(self.session.title if self.session else "")
        return ConfirmDialog(
            "Unsaved changes",
            f"'{name}' has changes that are not saved ({when}).",
            [("s", "Save them", "save"), ("d", "Discard them", "discard")],
        )

    # ------------------------------------------------------------------ messages
    def on_project_changed(self, message: messages.ProjectChanged) -> None:
        self.project_changed(message.text)

    def on_save_asked(self, message: messages.SaveAsked) -> None:
        self.save_project(ask=message.ask)

    def on_open_asked(self, message: messages.OpenAsked) -> None:
        self.open_dialog()

    def on_revert_asked(self, message: messages.RevertAsked) -> None:
        self.revert_project()

    def on_export_asked(self, message: messages.ExportAsked) -> None:
        self.export_dialog(message.what)

    def on_start_asked(self, message: messages.StartAsked) -> None:
        self.to_start()

    def on_open_path_asked(self, message: messages.OpenPathAsked) -> None:
        self.open_path(message.path)

    def on_scenario_asked(self, message: messages.ScenarioAsked) -> None:
        self.new_scenario(message.path)

    def on_blank_asked(self, message: messages.BlankAsked) -> None:
        self.new_blank()

    def on_demo_asked(self, message: messages.DemoAsked) -> None:
        self.new_demo()

    def on_plan_asked(self, message: messages.PlanAsked) -> None:
        self.open_plan()

    # ------------------------------------------------------------------ new / open
    def open_path(self, path: Path) -> None:
        from offgrid.project.store import ProjectFileError

        try:
            session = Session.open(path)
        except ProjectFileError as exc:
            body = "\n".join(str(p) for p in exc.problems)
            self.push_screen(
                MessageDialog(
                    f"{printable(str(path))} cannot be opened",
                    body + "\n\nNothing was opened and the file was not changed.",
                )
            )
            return
        self._use_session(session)

    def open_dialog(self) -> None:
        def chosen(path: Path | None) -> None:
            if path is not None:
                self.open_path(path)

        self.push_screen(PathDialog("Open a project", suffixes=(".toml",)), chosen)

    def new_demo(self) -> None:
        from offgrid.tui.session import demo_session

        self._use_session(demo_session())

    def new_scenario(self, csv_path: Path) -> None:
        from offgrid.project.loads_csv import LoadListError
        from offgrid.tui.session import scenario_session

        try:
            session = scenario_session(csv_path)
        except (LoadListError, ValueError) as exc:
            self.push_screen(MessageDialog("That demo list cannot be used", str(exc)))
            return
        self._use_session(session)

    def new_blank(self) -> None:
        from offgrid.tui.session import blank_project

        session = Session.unsaved(blank_project(), origin="blank")
        session.baseline = session.text()
        self._use_session(session)

    def to_start(self) -> None:
        def go(answer: str | None = "discard") -> None:
            if answer == "save":
                self.save_project(then=lambda: go("discard"))
                return
            if answer == "discard":
                from offgrid.tui.screens.start import StartScreen

                self.recovery.clear()
                self._last_session = None
                self.switch_screen(StartScreen(recent_projects(self.state)))

        if self.session is not None and self.session.dirty:
            self.push_screen(self._unsaved_dialog("before leaving it"), go)
        else:
            go()

    # ------------------------------------------------------------------ save / revert
    def save_project(
        self, ask: bool = False, then=None, start: str | None = None, title: str = "Save as"
    ) -> None:
        session = self.session
        if session is None:
            return
        if session.path is None or ask:
            if start is None:
                start = str(session.path) if session.path else suggested_name(session.title)

            def chosen(path: Path | None) -> None:
                if path is None:
                    return
                if path.suffix == "":
                    path = path.with_suffix(".toml")
                if path.exists() and (session.path is None or path.resolve() != session.path):
                    from offgrid.project.atomic import real_target

                    self.push_screen(
                        ConfirmDialog(
                            "Replace file?",
                            f"{path} exists. Replace it? (the old one is kept as "
                            f"{real_target(path).name}.bak)",
                            [("y", "Replace it", "yes"), ("n", "Keep it", "no")],
                        ),
                        lambda a: self._save_to(path, then) if a == "yes" else None,
                    )
                else:
                    self._save_to(path, then)

            self.push_screen(PathDialog(title, start, must_exist=False), chosen)
        else:
            self._save_to(session.path, then)

    def _save_to(self, path: Path, then=None, overwrite: bool = False) -> None:
        from offgrid.project.atomic import ChangedOnDisk

        session = self.session
        if session is None:
            return
        try:
            saved = session.save(path, overwrite=overwrite)
        except ChangedOnDisk:
            self.push_screen(
                ConfirmDialog(
                    "Changed on disk",
                    f"{path.name} was changed by another program or window "
                    "since you opened or last saved it, so your changes are not saved yet. "
                    f"Overwriting keeps the other version as {path.name}.bak.",
                    [
                        ("c", "Save mine as a copy", "copy"),
                        ("r", "Reload theirs", "reload"),
                        ("o", "Overwrite theirs", "overwrite"),
                    ],
                    wide=True,
                ),
                lambda answer: self._changed_on_disk(answer, path, then),
            )
            return
        except EditRejected as exc:
            body = "\n".join(f"{p.path}: {p.message}" for p in exc.problems)
            self.push_screen(MessageDialog("Not saved yet", body))
            return
        except OSError as exc:
            self.notify(
                f"Not saved: {exc.strerror or exc} ({path})",
                severity="error",
                markup=False,
                timeout=6,
            )
            return
        self.recovery.clear()
        remember_project(saved, self.state)
        self.notify(f"Saved {printable(str(saved))}", markup=False, timeout=3)
        left = self.session.untyped_outcome() if self.session is not None else None
        if left is not None:  # placeholders there (the climate needs twelve), marked as such
            self.notify(
                f"Saved with {left.error.split('. ')[0]}: the file marks them as still to "
                "type, and no design runs on it until you type them.",
                severity="warning",
                markup=False,
                timeout=8,
            )
        if self.work is not None:
            self.work.refresh_all()
        if then is not None:
            then()

    def _changed_on_disk(self, answer: str | None, path: Path, then=None) -> None:
        """What to do when the project's file changed under us (the user's answer)."""
        session = self.session
        if session is None:
            return
        if answer == "overwrite":
            self._save_to(path, then, overwrite=True)
        elif answer == "copy":
            self.save_project(
                ask=True, then=then, start=str(free_copy_name(path)), title="Save mine as a copy"
            )
        elif answer == "reload":
            from offgrid.project.store import ProjectFileError

            try:
                session.revert()
            except ProjectFileError as exc:
                self.push_screen(MessageDialog("Their version cannot be read", str(exc)))
                return
            self.recovery.clear()
            if self.work is not None:
                self.work.changed()
            self.notify("Reloaded the version on disk; u brings yours back (unsaved).", timeout=5)
        else:
            self.notify("Not saved: the file on disk is left as it is.", timeout=4)

    def revert_project(self) -> None:
        session = self.session
        if session is None:
            return

        def go(answer: str | None) -> None:
            if answer != "yes":
                return
            from offgrid.project.store import ProjectFileError

            try:
                session.revert()
            except ProjectFileError as exc:
                self.push_screen(MessageDialog("Cannot revert", str(exc)))
                return
            if self.work is not None:
                self.work.changed()
            self.notify("Reverted to the saved version (u undoes).", timeout=3)

        if not session.dirty:
            self.notify("No unsaved changes.", timeout=2)
            return
        where = session.path.name if session.path else "the starting state"
        self.push_screen(
            ConfirmDialog(
                "Revert?",
                f"Throw away the unsaved changes and go back to {where}?",
                [("y", "Revert", "yes"), ("n", "Keep working", "no")],
            ),
            go,
        )

    # ------------------------------------------------------------------ report, BOM, plan
    def export_dialog(self, what: str) -> None:
        """Ask for a file and write the report (``what='report'``) or the bill of materials."""
        session = self.session
        if session is None:
            return
        if session.design is None:
            self.notify(
                "No design yet, so nothing to export: see the headline.",
                severity="warning",
                timeout=4,
            )
            return
        stem = suggested_name(session.title).removesuffix(".toml")
        if what == "report":
            start, suffixes, title = (
                f"{stem}-report.html",
                (".html", ".md", ".txt"),
                "Export the design report (.html, .md or .txt)",
            )
        else:
            start, suffixes, title = (
                f"{stem}-bom.csv",
                (".csv",),
                "Export the bill of materials: all the crew packs (CSV)",
            )

        def chosen(path: Path | None) -> None:
            if path is None:
                return
            from offgrid.report.export import overwrite_refusal

            refusal = overwrite_refusal(path, session.path)
            if refusal:
                self.notify(
                    f"Not written: {printable(refusal)}", severity="error", markup=False, timeout=8
                )
                return
            if path.exists():
                self.push_screen(
                    ConfirmDialog(
                        "Replace file?",
                        f"{path} exists.",
                        [("y", "Replace it", "yes"), ("n", "Keep it", "no")],
                    ),
                    lambda a: self._export(what, path, True) if a == "yes" else None,
                )
            else:
                self._export(what, path, False)

        self.push_screen(
            PathDialog(title, start, suffixes=suffixes, must_exist=False, verb="writes it"), chosen
        )

    def _export(self, what: str, path: Path, force: bool) -> None:
        import copy

        session = self.session
        project = copy.deepcopy(session.project)
        design, base, reading = session.design, session.base_dir, session.path
        reliability = None  # the Risk section's last run, when it was run on this design
        work = self.work
        if work is not None and what == "report":
            from offgrid.tui.sections.risk import RiskSection

            for risk in work.query(RiskSection):
                reliability = risk.current_report(session)
        self.notify(f"Writing {printable(path.name)}...", markup=False, timeout=2)

        def run() -> None:
            try:
                from offgrid.report.export import ExportError, export_bom, export_report
            except ImportError as exc:
                self.call_from_thread(
                    self.notify, f"Export is not available: {exc}", severity="error", markup=False
                )
                return
            try:
                if what == "report":
                    written = export_report(
                        project,
                        path,
                        base,
                        force=force,
                        design=design,
                        reading=reading,
                        reliability=reliability,
                    )
                else:
                    written = export_bom(  # the whole kit: what the crew packs
                        project,
                        path,
                        base,
                        force=force,
                        design=design,
                        reading=reading,
                        complete=True,
                    )
            except ExportError as exc:
                self.call_from_thread(
                    self.notify, f"Not written: {exc}", severity="error", markup=False, timeout=8
                )
                return
            self.call_from_thread(
                self.notify, f"Written: {printable(str(written))}", markup=False, timeout=5
            )

        self.run_worker(run, thread=True, group="export", exclusive=True)

    def open_plan(self) -> None:
        """The community planning screen (many households, standard kits)."""
        try:
            from offgrid.tui.screens.plan import PlanScreen
        except ImportError as exc:
            self.notify(
                f"Community planning is not available: {exc}", severity="error", markup=False
            )
            return
        self.push_screen(PlanScreen())

    # ------------------------------------------------------------------ recovery
    def project_changed(self, text: str | None = None) -> None:
        """Called after every applied edit: the recovery copy is handed to its writer thread.

        The text is taken here, or given by the work screen that made it for this edit
        (so it is exactly what is on screen); the writing is done off the UI thread, and
        edits that come faster than writes are coalesced.
        """
        self.autosave(text)

    def autosave(self, text: str | None = None) -> None:
        session = self.session
        if session is None:
            return
        if text is None:
            text = session.text()
        if text != session.baseline:
            self.recovery.submit(text, session.path, session.title, session.baseline)
            self.autosaves += 1
        else:
            self.recovery.clear()

    def _recovery_failed(self, exc: OSError) -> None:
        """On the writer thread: say so on the UI thread."""
        with contextlib.suppress(RuntimeError):  # RuntimeError: the app has ended
            self.call_from_thread(
                self.notify, f"Recovery file not written: {exc}", severity="warning", markup=False
            )

    def write_recovery_now(self) -> bool:
        """Write the recovery file at once (hang-up, crash); True if there was work to keep."""
        session = self.session
        if session is None or self.discarded or not session.dirty:
            return False
        self.recovery.write(session.text(), session.path, session.title, session.baseline)
        return True

    # ------------------------------------------------------------------ quit
    async def action_quit(self) -> None:
        session = self.session
        if session is None or not session.dirty:
            self.recovery.clear()
            self.exit(0)
            return

        def answer(result: str | None) -> None:
            if result == "save":
                self.save_project(then=lambda: self.exit(0))
            elif result == "discard":
                self.discarded = True
                self.recovery.clear()
                self.exit(0)

        self.push_screen(
            ConfirmDialog(
                "Quit offgrid?",
                f"'{printable(session.title)}' has unsaved changes.",
                [("s", "Save and quit", "save"), ("d", "Quit without saving", "discard")],
            ),
            answer,
        )

    def action_plan(self) -> None:
        self.open_plan()

    # ------------------------------------------------------------------ help, theme, commands
    def action_toggle_theme(self) -> None:
        self.theme = DEFAULT_THEME if self.theme == SUN_THEME else SUN_THEME
        sun = self.theme == SUN_THEME
        self.notify(f"Colours: {'sunlight (high contrast)' if sun else 'night'}", timeout=2)

    def help_groups(self) -> list[KeyGroup]:
        """Every key, from the bindings (offgrid.tui.commands); the palette reads the same."""
        from offgrid.tui.commands import key_groups

        return key_groups(self, self.screen if self.is_running else None)

    def action_help(self) -> None:
        from offgrid.tui.screens.help import HelpDialog

        work = self.work
        first = None
        about = ""
        groups = self.help_groups()
        if work is not None and self.screen is work:
            sid = work.section
            n = [s for s, _t, _w in SECTIONS].index(sid) + 1
            first = next((g.title for g in groups if g.title.startswith(f"{n} ")), None)
            about = (
                f"You are in {n} {work.current.__class__.__name__[:-7]}: {work.current.help_text}"
            )
        self.push_screen(HelpDialog(groups, first, about))

    def _field_commands(self, work: WorkScreen) -> Iterable[SystemCommand]:
        """Every input and every figure of Sizes by its words: the palette goes there."""
        from offgrid.tui.fields import PARTS_FIELDS, PROJECT_FIELDS
        from offgrid.tui.sections.place import CLIMATE_FIELDS
        from offgrid.tui.sections.sizes import figure_rows
        from offgrid.tui.sections.wires import WIRING_FIELDS

        for where, fields in (
            ("1 Place", (*PROJECT_FIELDS, *CLIMATE_FIELDS)),
            ("3 Parts", PARTS_FIELDS),
            ("5 Wires", WIRING_FIELDS),
        ):
            for f in fields:
                if isinstance(f, str):
                    continue
                yield SystemCommand(
                    f"{f.label} ({where})",
                    f"Edit: {f.help() or f.path}",
                    lambda p=f.path: work.reveal(p),
                )
        design = work.session.design
        if design is not None:
            for row in figure_rows(design):
                if isinstance(row, str) or not row[2]:
                    continue
                label, value, path = row
                yield SystemCommand(
                    f"{label.strip()} (4 Sizes)", f"Figure: {value}", lambda p=path: work.reveal(p)
                )

    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        """Every key of the app and of ``screen`` (its sections too), from the bindings;
        then the fields and figures by their words, and the few commands with no key."""
        from offgrid.tui.commands import binding_commands
        from offgrid.tui.screens.generator import open_generator

        if isinstance(screen, WorkScreen):
            yield from self._field_commands(screen)
        yield from binding_commands(self, screen)
        if isinstance(screen, WorkScreen):
            yield SystemCommand("Recalculate", "Run the design again", screen.changed)
            yield SystemCommand(
                "Water pumping",
                "The project's water supplies: head, array, tank, the day's flow",
                screen.action_water,
            )
            yield SystemCommand(
                "Generator beside the sun",
                "Derated output, fuel line, check; run hours, litres and the cheapest mix",
                lambda: open_generator(screen),
            )
            yield SystemCommand(
                "Edit water supplies",
                "Add, edit or remove a [[water]] supply: need, levels, pipe, pump",
                lambda: screen.app.push_screen(water_form()),
            )
            yield SystemCommand(
                "Edit the generator",
                "Add, edit or remove the generator: rating, fuel table, dispatch, costs",
                lambda: screen.app.push_screen(generator_form()),
            )
        yield SystemCommand("New blank project", "Start from nothing", self.new_blank)
        yield SystemCommand(
            "New demo project", "The Kisanga Ridge health post (invented)", self.new_demo
        )
        for cmd in super().get_system_commands(screen):
            if cmd.title not in ("Quit", "Theme", "Keys"):
                yield cmd
        yield SystemCommand("Theme", "Pick any colour theme", self.action_change_theme)


def free_copy_name(path: Path) -> Path:
    """``NAME-mine.toml`` beside ``path`` (``NAME-mine-2.toml``... if taken)."""
    for n in range(1, 1000):
        tail = "-mine" if n == 1 else f"-mine-{n}"
        candidate = path.with_name(f"{path.stem}{tail}{path.suffix or '.toml'}")
        if not candidate.exists():
            return candidate
    return path.with_name(f"{path.stem}-mine{path.suffix}")


def new_file_session(target: Path) -> Session:
    """A blank project that will be saved as ``target`` (which does not exist yet)."""
    from offgrid.tui.session import blank_project

    project = blank_project()
    project.info.name = target.stem.replace("-", " ").replace("_", " ").strip() or "New project"
    session = Session.unsaved(project, origin="new-file")
    session.baseline = session.text()
    session.path = target.resolve()
    return session


def make_app(
    path: str | Path | None = None,
    *,
    demo: bool = False,
    session: Session | None = None,
    state: Path | None = None,
    check_recovery: bool = True,
    **kwargs,
) -> OffgridApp:
    """The app for a file, the demo, or the start screen (neither).

    Raises :class:`~offgrid.project.store.ProjectFileError` if ``path`` cannot be opened.
    """
    from offgrid.tui.session import demo_session

    if session is None:
        if demo:
            session = demo_session()
        elif path is not None:
            target = Path(path).expanduser()
            if (
                not target.exists()
                and target.suffix.lower() == ".toml"
                and target.resolve().parent.is_dir()
            ):
                session = new_file_session(target)  # nothing is written until saved
            else:
                session = Session.open(target)
    orphans = RecoveryStore(state or state_dir()).orphans() if check_recovery else []
    return OffgridApp(session, state=state, orphans=orphans, **kwargs)


def water_form():
    from offgrid.tui.screens.forms import WaterForm

    return WaterForm()


def generator_form():
    from offgrid.tui.screens.forms import GeneratorForm

    return GeneratorForm()
