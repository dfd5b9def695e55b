"""The in-place editor: one line to type a value, the problem shown right under it.

A section opens it for the field or cell under the cursor with
:meth:`EditBar.start`, which shows the old value selected: typing replaces it, an
arrow key (or Home/End) keeps it for editing. It is opened, focused and closed at
once, while the key that opens it is handled (see :mod:`offgrid.tui.keys`), passing
a function that applies the text and returns
``None`` (accepted) or a message (rejected: the editor stays open with the
typed text, and the project keeps its last valid value).
"""

from __future__ import annotations

from collections.abc import Callable

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widget import Widget
from textual.widgets import Input, Static
from textual.widgets._input import Selection

from offgrid.tui.keys import focus_now
from offgrid.tui.text import literal
from offgrid.tui.widgets.restyle import RestyleMemo

Apply = Callable[[str], str | None]


class EditInput(RestyleMemo, Input):
    """The edit box's line: focused at every open and blurred at every close, restyled
    from the memo of its two states (see :mod:`offgrid.tui.widgets.restyle`)."""


class EditBar(Vertical):
    """Label, input and message; hidden until a field is being edited."""

    DEFAULT_CSS = """
    EditBar {
        height: auto;
        display: none;
        border-top: solid $accent;
        padding: 0 1;
    }
    EditBar #edit-label { height: 1; text-style: bold; }
    EditBar Input { height: 1; border: none; padding: 0 1; background: $boost; }
    EditBar Input:focus { border: none; background: $boost; }
    EditBar #edit-message { height: auto; max-height: 3; color: $text-muted; }
    EditBar #edit-message.-bad { color: $error; text-style: bold; }
    """

    BINDINGS = [
        Binding("escape", "cancel", "Cancel edit", id="edit.cancel"),
        # Applied while the key is handled, before the next key, so a key typed
        # right after Enter goes to the table, not into the closing box.
        Binding(
            "enter",
            "apply",
            "Apply the typed value (in the edit box)",
            show=False,
            priority=True,
            id="edit.apply",
        ),
    ]

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self._apply: Apply | None = None
        self._back: Widget | None = None
        # Shown or hidden by its own style alone: a class (``-open``) made Textual apply
        # the whole stylesheet to the bar and its three children at every open and close.
        self._open = False

    def compose(self) -> ComposeResult:
        yield Static(id="edit-label")
        yield EditInput(id="edit-input", select_on_focus=False)
        yield Static(id="edit-message")

    @property
    def is_open(self) -> bool:
        return self._open

    @property
    def input(self) -> Input:
        return self.query_one("#edit-input", Input)

    def start(
        self, label: str, text: str, apply: Apply, hint: str = "", back: Widget | None = None
    ) -> None:
        """Open the editor on ``text``; ``apply`` is called with what the user enters."""
        self._apply = apply
        self._back = back
        self.query_one("#edit-label", Static).update(
            Text.assemble(
                literal(label),
                ("   Enter applies, Esc cancels; typing replaces, \u2190 \u2192 keep it", "dim"),
            )
        )
        self._say(hint, bad=False)
        self._open = True
        self.styles.display = "block"
        self._lift_notices(True)
        box = self.input
        box.value = text
        box.selection = Selection(0, len(text))
        focus_now(box, scroll_visible=False)

    def _say(self, message: str, bad: bool) -> None:
        msg = self.query_one("#edit-message", Static)
        msg.set_class(bad, "-bad")
        msg.update(literal(("\u2717 " if bad else "") + message))

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self._submit(event.value)

    def action_apply(self) -> None:
        self._submit(self.input.value)

    def _submit(self, value: str) -> None:
        if self._apply is None:
            return
        problem = self._apply(value)
        if problem:
            self._say(problem, bad=True)
            self.app.bell()
        else:
            self.close()

    def action_cancel(self) -> None:
        self.close()

    def on_resize(self) -> None:
        if self._open:
            self._lift_notices(True)

    def _lift_notices(self, up: bool) -> None:
        """Notices (toasts, bottom right above the key line) go above the open edit box, so
        none covers what is being typed or its hint; back down when it closes."""
        from textual.widgets._toast import ToastRack

        if self.app._disable_notifications:
            return
        # the box's lines (the border, label, input, hint) until it is laid out
        height = self.outer_size.height or 4 + self._message_lines
        # (the screen's own child: a query would walk every section's widgets)
        for rack in self.screen.query_children(ToastRack):
            if up:
                rack.styles.margin = (0, 0, 1 + height, 0)  # (1: the key line)
            else:
                rack.styles.clear_rule("margin")

    @property
    def _message_lines(self) -> int:
        msg = self.query_one("#edit-message", Static)
        room = max(10, (self.size.width or self.screen.size.width) - 2)
        return min(3, max(1, -(-len(str(msg.content)) // room)))

    def close(self) -> None:
        self._open = False
        self.styles.display = "none"
        self._lift_notices(False)
        self._apply = None
        back, self._back = self._back, None
        if back is not None and back.is_attached:
            focus_now(back)
