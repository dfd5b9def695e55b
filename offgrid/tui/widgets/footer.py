"""The key line at the bottom: help and quit first, so 80 columns never cut them off."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.widgets import Footer
from textual.widgets._footer import FooterKey

FIRST = ("help", "quit")


class KeyFooter(Footer):
    """Textual's footer with ``?`` (every key of the section and more) and ``q`` leading.

    The section's own keys follow; any that do not fit are in the ``?`` list.
    """

    def compose(self) -> ComposeResult:
        widgets = list(super().compose())
        first = [w for w in widgets if isinstance(w, FooterKey) and w.action in FIRST
                 and "-command-palette" not in w.classes]
        first.sort(key=lambda w: FIRST.index(w.action))
        yield from first
        yield from (w for w in widgets if w not in first)
