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
        first = [
            w
            for w in widgets
            if isinstance(w, FooterKey)
            and w.action in FIRST
            and "-command-palette" not in w.classes
        ]
        first.sort(key=lambda w: FIRST.index(w.action))
        yield from first
        yield from (w for w in widgets if w not in first)
        self.call_after_refresh(self._fit)

    def on_resize(self) -> None:
        self.call_after_refresh(self._fit)

    def _fit(self) -> None:
        """Hide the keys that would be cut at the right edge: a key is shown whole or not
        at all (the hidden ones are in the ``?`` list)."""
        keys = [w for w in self.children if "-command-palette" not in w.classes]
        palette = sum(
            w.outer_size.width + w.styles.margin.width
            for w in self.children
            if "-command-palette" in w.classes
        )
        room = self.size.width - palette
        if room <= 0:
            return
        for w in keys:
            w.display = True
        if any(w.outer_size.width == 0 for w in keys):  # not laid out yet: look again soon
            self._tries = getattr(self, "_tries", 0) + 1
            if self._tries < 40:
                self.set_timer(0.05, self._fit)
            return
        self._tries = 0
        used = 0
        for w in keys:
            used += w.outer_size.width + w.styles.margin.width
            if used > room and (not isinstance(w, FooterKey) or w.action not in FIRST):
                w.display = False
