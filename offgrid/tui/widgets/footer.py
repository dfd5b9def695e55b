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
        """Rebuild only when more keys are shown than the footer has places for: Textual
        rebuilds it on every focus move and binding refresh (10-30 ms of mounting and
        styling, twice an edit: the edit box's two keys, then the table's five). Keys
        are changed, greyed or lit in place, and places not needed are hidden."""
        if self._shown is not None and screen is self.screen and self.is_attached:
            keys = self._keys(screen)
            if keys == self._shown:
                return
            if self._in_place(screen, keys):
                self._shown = keys
                return
            self._shown = keys  # (a rebuild is on its way: the same keys again need none)
        super().bindings_changed(screen)

    def _in_place(self, screen: Screen, keys: tuple) -> bool:
        """Show ``keys`` on the footer's own key widgets; False if their number differs
        (or keys are grouped), which needs a rebuild."""
        entries: dict[str, tuple] = {}  # one widget per action, as Footer.compose makes
        for _node, b, enabled, tooltip in screen.active_bindings.values():
            if b.show:
                if b.group is not None:
                    return False
                entries.setdefault(b.action, (b, enabled, tooltip))
        shown = [e for e in entries.values() if e[0].action in FIRST]
        shown.sort(key=lambda e: FIRST.index(e[0].action))
        shown += [e for e in entries.values() if e[0].action not in FIRST]
        widgets = [w for w in self.children if "-command-palette" not in w.classes]
        if len(widgets) < len(shown) or not all(isinstance(w, FooterKey) for w in widgets):
            return False
        moved = False
        for w in widgets[len(shown) :]:  # kept, hidden, for when more keys are shown again
            if not getattr(w, "_spare", False):
                w._spare = True  # type: ignore[attr-defined]
                w.display = False
                moved = True
        for w, (b, enabled, tooltip) in zip(widgets, shown, strict=False):
            assert isinstance(w, FooterKey)
            if getattr(w, "_spare", False):
                w._spare = False  # type: ignore[attr-defined]
                moved = True
            look = (b.key, self.app.get_key_display(b), b.description, b.action)
            if look != (w.key, w.key_display, w.description, w.action):
                w.key, w.key_display, w.description, w.action = look
                w.tooltip = tooltip or None
                w.refresh(layout=True)
                moved = True
            if w._disabled == enabled:
                w._disabled = not enabled
                w.set_class(not enabled, "-disabled")
                w.refresh()
        palette = screen.active_bindings.get(self.app.COMMAND_PALETTE_BINDING)
        for w in self.children:  # the command palette's key: lit or greyed only
            if isinstance(w, FooterKey) and "-command-palette" in w.classes:
                on = palette[2] if palette is not None else not w._disabled
                if w._disabled == on:
                    w._disabled = not on
                    w.set_class(not on, "-disabled")
                    w.refresh()
        if moved:
            self.call_after_refresh(self._fit)
        return True

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
        keys = [
            w
            for w in self.children
            if "-command-palette" not in w.classes and not getattr(w, "_spare", False)
        ]
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
        for w in keys:  # (its width from its text: a key changed in place is not laid out
            # again before this runs, so its outer size may still be the old key's)
            width = w.get_content_width(self.size, self.app.size) + w.styles.gutter.width
            used += width + w.styles.margin.width
            if used > room and (not isinstance(w, FooterKey) or w.action not in FIRST):
                w.display = False
