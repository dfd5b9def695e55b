"""The work screen: the sections, the headline strip and the file actions."""

from __future__ import annotations

import asyncio
import contextlib
import copy
import importlib
import time
from collections.abc import Callable

from textual.app import ComposeResult
from textual.binding import Binding
from textual.reactive import Reactive
from textual.screen import Screen
from textual.widget import Widget
from textual.widgets import ContentSwitcher, Input

from offgrid.tui.keys import focus_now
from offgrid.tui.messages import (
    Edited,
    ExportAsked,
    OpenAsked,
    ProjectChanged,
    RevealAsked,
    RevertAsked,
    SaveAsked,
    StartAsked,
    WhyAsked,
    send,
)
from offgrid.tui.screens.why import WhyDialog, find_reason
from offgrid.tui.sections.base import Section
from offgrid.tui.session import Outcome, Session, compute_outcome
from offgrid.tui.widgets.bars import SECTIONS, FileBar, Headline, SectionBar
from offgrid.tui.widgets.footer import KeyFooter

#: Where each section's class is: imported when first needed, so the first paint waits
#: only for the section shown (the others are imported on the design's worker thread).
SECTION_MODULES: dict[str, tuple[str, str]] = {
    "place": ("offgrid.tui.sections.place", "PlaceSection"),
    "loads": ("offgrid.tui.sections.loads", "LoadsSection"),
    "parts": ("offgrid.tui.sections.parts", "PartsSection"),
    "sizes": ("offgrid.tui.sections.sizes", "SizesSection"),
    "wires": ("offgrid.tui.sections.wires", "WiresSection"),
    "cautions": ("offgrid.tui.sections.cautions", "CautionsSection"),
    "risk": ("offgrid.tui.sections.risk", "RiskSection"),
    "options": ("offgrid.tui.sections.options", "OptionsSection"),
}


def section_class(sid: str) -> type[Section]:
    module, name = SECTION_MODULES[sid]
    return getattr(importlib.import_module(module), name)


#: Section-changing and other one-letter keys work while no text box has focus.
LETTER_ACTIONS = {
    "curves",
    "go",
    "goto",
    "next_section",
    "why",
    "save_as",
    "open",
    "revert",
    "undo",
    "redo",
    "start",
    "help",
    "toggle_theme",
    "quit",
    "commands",
    "export",
}


class WorkScreen(Screen):
    """Where the whole job is done."""

    #: Textual's own, but without repainting the whole screen when the focus moves (the
    #: widgets that gain and lose it repaint themselves): an applied edit moves it twice,
    #: and each time every line of the screen was rendered again before the frame.
    focused: Reactive[Widget | None] = Reactive(None, repaint=False)

    BINDINGS = [
        *(
            Binding(str(n), f"go('{sid}')", f"Go to {title}", show=False, id=f"go.{sid}")
            for n, (sid, title, _what) in enumerate(SECTIONS, start=1)
        ),
        Binding(
            "right_square_bracket,greater_than_sign",
            "next_section(1)",
            "Next section",
            show=False,
            id="go.next",
        ),
        Binding(
            "left_square_bracket,less_than_sign",
            "next_section(-1)",
            "Previous section",
            show=False,
            id="go.previous",
        ),
        Binding("w", "why", "Why?", id="why", tooltip="The reason for the figure under the cursor"),
        Binding(
            "v",
            "curves",
            "I-V curves",
            show=False,
            id="curves",
            tooltip="The array's I-V and P-V curves: design month, record low, hottest month",
        ),
        Binding("s", "save", "Save", id="file.save"),
        Binding("ctrl+s", "save", "Save", show=False, id="file.save_ctrl", priority=True),
        Binding(
            "S",
            "save_as",
            "Save as",
            show=False,
            id="file.save_as",
            tooltip="Save under a new name",
        ),
        Binding("o", "open", "Open", show=False, id="file.open", tooltip="Open a project file"),
        Binding(
            "r", "revert", "Revert", show=False, id="file.revert", tooltip="Back to the saved file"
        ),
        Binding("u", "undo", "Undo", show=False, id="edit.undo", tooltip="Undo the last change"),
        Binding("U,ctrl+y", "redo", "Redo", show=False, id="edit.redo"),
        Binding(
            "n",
            "start",
            "Start screen",
            show=False,
            id="file.start",
            tooltip="Recent projects, new, open",
        ),
        Binding(
            "E",
            "export('report')",
            "Export report",
            show=False,
            id="file.report",
            tooltip="Write the design report: HTML, Markdown or text",
        ),
        Binding(
            "B",
            "export('bom')",
            "Export parts list",
            show=False,
            id="file.bom",
            tooltip="Write the parts list as CSV",
        ),
    ]

    def __init__(self, session: Session, section: str = "place") -> None:
        super().__init__()
        self.session = session
        self.section = section
        self.stale: set[str] = set()
        self.last_change_s = 0.0
        self.design_seq = 0  # number of the newest design request (request_design)
        self.design_pending = False  # a design is being worked out on a worker thread
        self.designs_dropped = 0  # results that came after a newer request
        self._text_due = False  # an edit's text is still to be made (_after_change)
        self._all_mounted = asyncio.Event()

    def compose(self) -> ComposeResult:
        yield FileBar(id="filebar")
        yield SectionBar(id="sectionbar")
        yield Headline(id="headline")
        with ContentSwitcher(initial=self.section, id="sections"):
            yield section_class(self.section)(id=self.section)
        yield KeyFooter(compact=True)

    def on_mount(self) -> None:
        # First paint at once (the headline says the design is coming); the design is
        # worked out on a worker thread, then the other sections are built.
        self.query_one(FileBar).show(self.session)
        self.query_one(SectionBar).show(self.section)
        self.design_pending = True
        self.query_one(Headline).pending()
        self.call_after_refresh(self.request_design, self._first_design)

    def request_design(self, then: Callable[[], object] | None = None) -> int:
        """Work out the session's design on a worker thread; returns the request's number.

        The headline says "working out" until the result is in. Every request (and every
        recompute on the UI thread, :meth:`recompute_now`) takes the next number; a
        result whose number is not the newest, or that was asked for another session, is
        dropped, so a superseded design is never shown as current.
        """
        self.design_seq += 1
        seq, session = self.design_seq, self.session
        project, base = copy.deepcopy(session.project), session.base_dir
        self.design_pending = True
        self.query_one(Headline).pending()
        waiting = session.untyped_outcome()  # months still to type: no design on them

        def work() -> None:
            out = waiting or compute_outcome(project, base)
            with contextlib.suppress(RuntimeError):  # the app has ended meanwhile
                self.app.call_from_thread(self._design_done, seq, session, out, then)

        self.run_worker(work, name=f"design-{seq}", group="design", thread=True)
        return seq

    def _design_done(
        self, seq: int, session: Session, out: Outcome, then: Callable[[], object] | None
    ) -> None:
        if seq != self.design_seq or session is not self.session:
            self.designs_dropped += 1  # superseded: an edit or another project came since
            return
        session.outcome = out
        self.design_pending = False
        self.refresh_all()
        if then is not None:
            then()

    def recompute_now(self) -> None:
        """Recompute on the UI thread (an applied edit: a few ms with the engine's memo,
        less than a thread hop); supersedes any design still being worked out."""
        self.design_seq += 1
        self.session.recompute()
        self.design_pending = False

    def _first_design(self) -> None:
        self.action_goto(self.section)
        self.call_after_refresh(self._import_rest)  # once the headline is on screen

    def _import_rest(self) -> None:
        """Import the other sections on a worker thread, then build them here."""

        def work() -> None:
            for module, _name in SECTION_MODULES.values():
                importlib.import_module(module)
            with contextlib.suppress(RuntimeError):  # the app has ended meanwhile
                self.app.call_from_thread(self._mount_rest)

        self.run_worker(work, name="sections", group="sections", thread=True)

    async def _mount_rest(self) -> None:
        switcher = self.query_one(ContentSwitcher)
        missing = [section_class(sid)(id=sid) for sid in SECTION_MODULES if not self._has(sid)]
        for widget in missing:
            widget.display = widget.id == switcher.current
        if missing:
            await switcher.mount_all(missing)
        self._all_mounted.set()

    def _has(self, sid: str) -> bool:
        return bool(self.query_one(ContentSwitcher).query_children(f"#{sid}"))

    # ------------------------------------------------------------------ state
    @property
    def current(self) -> Section:
        return self.query_one(f"#{self.section}", Section)

    def refresh_all(self, text: str | None = None, file_bar: bool = True) -> None:
        """Redraw the bars and the visible section; mark the others to redraw when shown.

        ``text``: the project as saved, when the caller has made it (see :meth:`changed`);
        ``file_bar=False`` leaves the file bar to the caller.
        """
        if file_bar:
            self.query_one(FileBar).show(self.session, text)
        headline = self.query_one(Headline)
        if self.design_pending:
            headline.pending()  # never the figures of a design that is being replaced
        else:
            headline.show(self.session)
        self.query_one(SectionBar).show(self.section)
        self.current.show(self.session)
        self.stale = {sid for sid, _t, _w in SECTIONS if sid != self.section}
        self.refresh_bindings()

    def changed(self, note: str | None = None, tell: bool = False) -> None:
        """After an accepted edit: recompute, redraw, and arm the recovery autosave.

        ``note`` says what changed; it is shown only with ``tell`` (the headline
        already shows the effect of an ordinary edit). The project's text (a few ms),
        which the file bar's unsaved mark and the recovery copy share, is made once the
        new figures are on screen (:meth:`_after_change`).
        """
        t0 = time.perf_counter()
        self.recompute_now()
        self.refresh_all(file_bar=False)
        self.last_change_s = time.perf_counter() - t0
        if not self._text_due:
            self._text_due = True
            self.call_after_refresh(self._after_change)
        if note and tell:
            self.app.notify(note, markup=False, timeout=4)

    def _after_change(self) -> None:
        """The project as text once for the edits since the last frame: the file bar's
        unsaved mark and the recovery copy (exactly what is on screen)."""
        if not self._text_due:
            return
        self._text_due = False
        text = self.session.text()
        self.query_one(FileBar).show(self.session, text)
        send(self, ProjectChanged(text))

    def on_edited(self, message: Edited) -> None:
        message.stop()
        self.changed(message.note, message.tell)

    def on_why_asked(self, message: WhyAsked) -> None:
        message.stop()
        self.action_why()

    def on_reveal_asked(self, message: RevealAsked) -> None:
        message.stop()
        self.reveal(message.path)

    def replace_session(self, session: Session) -> None:
        self._after_change()  # an edit's text still due belongs to the project before
        self.session = session
        self.refresh_all()  # the new project's names at once; its design a moment later
        self.request_design(self._focus_first)

    def _focus_first(self) -> None:
        focus = self.current.first_focus()
        if focus is not None:
            focus_now(focus)

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action in LETTER_ACTIONS and isinstance(self.focused, Input):
            return None  # shown greyed; the key types into the box instead
        if action == "export" and self.session.design is None:
            return None  # nothing to export until there is a design
        return True

    # ------------------------------------------------------------------ navigation
    async def action_go(self, section: str) -> None:
        """A section key: just after start the other sections are still being built, so
        wait for them here; the keys typed after this one then reach the section."""
        if section != self.section and not self._all_mounted.is_set():
            with contextlib.suppress(TimeoutError):
                await asyncio.wait_for(self._all_mounted.wait(), 10.0)
        self.action_goto(section)

    def action_goto(self, section: str) -> None:
        if not self._has(section):  # still being built just after start: a moment later
            self.call_after_refresh(self.action_goto, section)
            return
        self.set_focus(None)  # (a focused input can snap the switch back otherwise)
        self.refresh()  # the whole screen again (a focus move alone does not: see focused)
        self.section = section
        self.query_one(ContentSwitcher).current = section
        if section in self.stale:
            self.stale.discard(section)
        self.current.show(self.session)
        self.query_one(SectionBar).show(section)
        focus = self.current.first_focus()
        if focus is not None:
            focus_now(focus)

    async def action_next_section(self, step: int) -> None:
        ids = [sid for sid, _t, _w in SECTIONS]
        await self.action_go(ids[(ids.index(self.section) + step) % len(ids)])

    def reveal(self, path: str) -> None:
        """Go to the section and field (or figure) that ``path`` names."""
        order = {
            "site": "place",
            "climate": "place",
            "info": "place",
            "loads": "loads",
            "module": "parts",
            "battery": "parts",
            "controller": "parts",
            "inverter": "parts",
            "choices": "parts",
            "prices": "options",
            "variants": "options",
            "economics": "options",
            "wiring": "wires",
        }
        head = path.split(".")[0].split("[")[0]
        target = order.get(head, "sizes")
        self.action_goto(target)
        if not self.current.reveal(path) and target != "sizes":
            self.action_goto("sizes")
            self.current.reveal(path)

    # ------------------------------------------------------------------ why
    def action_why(self) -> None:
        fig = self.current.figure()
        if fig is None:
            self.app.notify("Put the cursor on a figure first.", timeout=3)
            return
        reason = fig.reason
        path = fig.path
        if reason is None and self.session.design is not None:
            path, reason = find_reason(self.session.design.reasons, fig.path)
        self.app.push_screen(WhyDialog(fig.label, fig.value, reason, path, fig.extra))

    def action_curves(self) -> None:
        """The array's I-V and P-V curves at design, cold and hot conditions."""
        from offgrid.tui.screens.curves import CurvesDialog, array_curves

        d = self.session.design
        curves = array_curves(self.session.project, d) if d is not None else []
        if not curves:
            self.app.notify(
                "No curves: the design has no electrical part yet (see Cautions).", timeout=4
            )
            return
        self.app.push_screen(CurvesDialog(curves))

    def action_water(self) -> None:
        """The project's water supplies ([[water]] tables): figures and the day's flow."""
        from offgrid.tui.screens.water import WaterDialog, water_blocks

        if not self.session.project.water:
            from offgrid.tui.screens.forms import WaterForm

            self.app.notify("No water supply in this project yet: press a to add one.", timeout=5)
            self.app.push_screen(WaterForm())
            return
        self.app.push_screen(WaterDialog(water_blocks(self.session.project, self.session.base_dir)))

    # ------------------------------------------------------------------ edits and files
    def action_undo(self) -> None:
        if self.session.undo():
            self.changed()
            self.app.notify("Undone", timeout=2)
        else:
            self.app.notify("Nothing to undo", timeout=2)

    def action_redo(self) -> None:
        if self.session.redo():
            self.changed()
            self.app.notify("Redone", timeout=2)
        else:
            self.app.notify("Nothing to redo", timeout=2)

    def action_save(self) -> None:
        send(self, SaveAsked())

    def action_save_as(self) -> None:
        send(self, SaveAsked(ask=True))

    def action_open(self) -> None:
        send(self, OpenAsked())

    def action_revert(self) -> None:
        send(self, RevertAsked())

    def action_export(self, what: str) -> None:
        send(self, ExportAsked(what))

    def action_start(self) -> None:
        send(self, StartAsked())
