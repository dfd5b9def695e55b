"""What every section of the work screen shares."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, ClassVar, cast

from textual.containers import Vertical
from textual.widget import Widget

from offgrid.design.result import Reason
from offgrid.tui.fields import Field
from offgrid.tui.messages import Edited, send
from offgrid.tui.session import EditRejected, Session, get_path
from offgrid.tui.text import from_printable, printable
from offgrid.tui.widgets.editbar import EditBar

if TYPE_CHECKING:
    from offgrid.tui.screens.work import WorkScreen


@dataclass(frozen=True)
class Figure:
    """What the why key explains: a label, the value shown, and the engine figure behind it."""

    label: str
    value: str
    path: str | None
    reason: Reason | None = None  # a reason made here (e.g. one load's own energy)
    extra: str = ""


class Section(Vertical):
    """One part of the work; sub-classes set ``section_id`` and fill :meth:`show`."""

    section_id = ""
    help_text = ""
    #: Widgets inside whose own keys belong to this section (help, palette).
    KEY_WIDGETS: ClassVar[tuple[type[Widget], ...]] = ()

    @property
    def work(self) -> WorkScreen:
        """The work screen this section is on (read its session; tell it by messages)."""
        return cast("WorkScreen", self.screen)

    @property
    def session(self) -> Session:
        return self.work.session

    def edited(self, note: str | None = None, tell: bool = False) -> None:
        """Tell the work screen that an edit was applied (:class:`~offgrid.tui.messages.Edited`)."""
        send(self, Edited(note, tell))

    def show(self, session: Session) -> None:
        """Redraw from the session (called after every change while visible)."""

    def figure(self) -> Figure | None:
        """The figure under the cursor, for the why key."""
        return None

    def first_focus(self) -> Widget | None:
        return None

    def reveal(self, path: str) -> bool:
        """Put the cursor on the field at ``path`` if this section has it."""
        return False

    def problems_text(self, exc: EditRejected) -> str:
        return "; ".join(p.message for p in exc.problems)

    def edit_field(self, field: Field, editor: EditBar, back: Widget) -> None:
        """Open ``editor`` on one plain field; a refused value keeps the last good one."""
        original = get_path(self.session.project, field.path)
        text = printable(original) if field.base_kind == "text" else field.edit_text(original)

        def apply(typed: str) -> str | None:
            try:
                value = field.parse(typed)
                if field.base_kind == "text":
                    value = from_printable(value, original)
                self.session.set_value(field.path, value)
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited(f"{field.label} set")
            return None

        editor.start(field.label, text, apply, field.help(), back=back)
