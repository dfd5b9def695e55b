"""Showing user text literally: no markup, no terminal control codes.

Names typed by people (appliances, projects, files) may contain markup-like
text (``[bold]``) or escape sequences.  They are saved unchanged; for display
they go through :func:`printable` (control characters become visible symbols)
and are wrapped in :class:`rich.text.Text`, which never parses markup.
"""

from __future__ import annotations

import os

from rich.text import Text

from offgrid.safetext import printable  # one helper for every output


def from_printable(shown: str, original: str) -> str:
    """The value to store after the user edited ``printable(original)`` into ``shown``.

    Unchanged text keeps the original exactly (control codes and all); control
    pictures typed or kept in an edited value go back to the characters they stand for.
    """
    if shown == printable(original):
        return original
    out = []
    for ch in shown:
        code = ord(ch)
        if 0x2400 <= code < 0x2420:
            out.append(chr(code - 0x2400))
        elif code == 0x2421:
            out.append("\x7f")
        else:
            out.append(ch)
    return "".join(out)


def literal(text: str, style: str = "", lines: bool = False) -> Text:
    """A :class:`Text` that shows ``text`` exactly as typed, safe for any widget.

    ``lines``: line breaks stay line breaks (a message of several lines); any other
    control character is still shown as its picture.
    """
    if lines:
        text = "\n".join(printable(line) for line in text.split("\n"))
        return Text(text, style=style, no_wrap=False)
    return Text(printable(text), style=style, no_wrap=False)


def clip(text: str, width: int) -> str:
    """Shorten to ``width`` characters with an ellipsis."""
    if width <= 0:
        return ""
    return text if len(text) <= width else text[: max(0, width - 1)] + "…"


def clip_words(text: str, width: int) -> str:
    """Shorten to ``width`` characters at a word boundary, with an ellipsis (never mid-word).

    A first word longer than ``width`` is cut (nothing better fits).
    """
    if len(text) <= width:
        return text
    if width <= 1:
        return "\u2026"[:width]
    room = text[: width - 1]
    at_word_end = text[width - 1] == " "  # the room ends at a word's end: keep that word
    cut = room if at_word_end or " " not in room else room.rsplit(" ", 1)[0]
    return cut.rstrip(" ,;:(") + "\u2026"


def plain_terminal() -> bool:
    """ASCII only, no colour: NO_COLOR set, or a vt100-class or dumb terminal."""
    term = os.environ.get("TERM", "")
    return bool(os.environ.get("NO_COLOR")) or term in ("vt100", "vt102", "vt220", "dumb")
