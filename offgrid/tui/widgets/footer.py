"""The key line at the bottom: help and quit first, so 80 columns never cut them off."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.screen import Screen
from textual.widgets import Footer
from textual.widgets._footer import FooterKey

FIRST = ("help", "quit")


class KeyFooter(Footer):
    """Textual's footer with ``?`` (every key of the section and more) and ``q`` leading.

    The section's own keys follow; any that do not fit are in the ``?`` list.
    """

    _shown: tuple | None = None  # the keys as last composed (see bindings_changed)

    @staticmethod
    def _keys(screen: Screen) -> tuple:
        return tuple(
            (b.key, b.description, b.action, enabled, tooltip)
            for (_node, b, enabled, tooltip) in screen.active_bindings.values()
            if b.show
        )

    def bindings_changed(self, screen: Screen) -> None:
        """Rebuild only when the keys shown change: Textual rebuilds the footer on every
        focus move and binding refresh (three times an edit, each a few ms of mounting and
        styling before the next frame). When only keys' availability changes (an edit box
        takes the focus: letter keys type into it), they are greyed or lit in place."""
        if self._shown is not None and screen is self.screen and self.is_attached:
            keys = self._keys(screen)
            if keys == self._shown:
                return
            if [k[:3] for k in keys] == [k[:3] for k in self._shown]:
                enabled: dict[tuple[str, str], bool] = {}
                for key, _label, action, on, _tip in keys:
                    enabled.setdefault((key, action), on)
                for w in self.query(FooterKey):
                    on = enabled.get((w.key, w.action))
                    if on is not None and w._disabled == on:
                        w._disabled = not on
                        w.set_class(not on, "-disabled")
                        w.refresh()
                self._shown = keys
                return
            self._shown = keys  # (a rebuild is on its way: the same keys again need none)
        super().bindings_changed(screen)

    def compose(self) -> ComposeResult:
        if self._bindings_ready:
            self._shown = self._keys(self.screen)
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
