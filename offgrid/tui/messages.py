"""What the parts of the text UI tell each other: Textual messages, handled up the tree.

A section or widget does not call the work screen or the app: it sends one of these
and the work screen (edits, why, reveal) or the app (files, new, plan) handles it in
an ``on_...`` method. :func:`send` delivers a message at once, up the sender's
ancestors to the app, as Textual's bubbling would, but before the next key is read:
the key that opens a dialog must have opened it when the following keys arrive
(``offgrid.tui.keys`` says why).
"""

from __future__ import annotations

from pathlib import Path

from textual.message import Message
from textual.message_pump import MessagePump

from offgrid.tui.keys import deliver_now


def send(sender: MessagePump, message: Message) -> None:
    """Run ``message``'s handlers on ``sender``, then its parents up to the app, now
    (:func:`offgrid.tui.keys.deliver_now` up to the app). Delivery stops where a handler
    calls ``message.stop()``."""
    deliver_now(sender, message, to_app=True)


# ---------------------------------------------------------------- sections -> work screen
class Edited(Message):
    """An edit was applied to the session: recompute, redraw, keep a recovery copy.

    ``note`` says what changed; it is shown only with ``tell`` (the headline already
    shows the effect of an ordinary edit).
    """

    def __init__(self, note: str | None = None, tell: bool = False) -> None:
        super().__init__()
        self.note = note
        self.tell = tell


class WhyAsked(Message):
    """Explain the figure under the cursor of the current section."""


class RevealAsked(Message):
    """Go to the section and field (or figure) that ``path`` names."""

    def __init__(self, path: str) -> None:
        super().__init__()
        self.path = path


# ---------------------------------------------------------------- work screen -> app
class ProjectChanged(Message):
    """The project on screen changed: the app hands a recovery copy to its writer.

    ``text`` is the project as it would be saved, when the sender has made it already
    (one serialisation an edit, shared with the file bar); None: the app makes it.
    """

    def __init__(self, text: str | None = None) -> None:
        super().__init__()
        self.text = text


class SaveAsked(Message):
    """Save the project (``ask``: ask for a file name first, 'save as')."""

    def __init__(self, ask: bool = False) -> None:
        super().__init__()
        self.ask = ask


class OpenAsked(Message):
    """Ask for a project file and open it."""


class RevertAsked(Message):
    """Throw away the unsaved changes (after asking)."""


class ExportAsked(Message):
    """Ask for a file and write the design report (``what='report'``) or the parts list."""

    def __init__(self, what: str) -> None:
        super().__init__()
        self.what = what


class StartAsked(Message):
    """Back to the start screen (after asking about unsaved changes)."""


# ---------------------------------------------------------------- start screen -> app
class OpenPathAsked(Message):
    """Open the project file at ``path``."""

    def __init__(self, path: Path) -> None:
        super().__init__()
        self.path = path


class ScenarioAsked(Message):
    """A new unsaved project from the demonstration load list at ``path`` (CSV)."""

    def __init__(self, path: Path) -> None:
        super().__init__()
        self.path = path


class BlankAsked(Message):
    """A new blank project."""


class DemoAsked(Message):
    """A new copy of the demonstration project."""


class PlanAsked(Message):
    """The community planning screen."""
