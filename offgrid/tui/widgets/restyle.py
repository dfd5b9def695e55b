"""Focus moves that restyle a widget from a memo of its styles in that state.

An applied edit moves the focus twice (the table to the edit box and back), and
Textual applies the whole stylesheet to each widget whose focus changed: the widget
and a virtual node for each of its component classes (a DataTable has a dozen),
about 3-4 ms a move on the 2-core machine. The styles a widget gets depend only on
the stylesheet and on the type, id, classes and pseudo-classes of the widget and its
ancestors, so they are kept per state and put back when that state comes again.
This leans on Textual internals (``Stylesheet.replace_rules``, ``_component_styles``);
Textual is pinned exactly.
"""

from __future__ import annotations

from textual.css.stylesheet import Stylesheet
from textual.dom import DOMNode, NoActiveAppError
from textual.widget import Widget


def _state(widget: Widget) -> tuple:
    """What the stylesheet's choice of rules for ``widget`` can depend on: its type, id,
    classes and pseudo-classes, and those of its ancestors (for the ancestors, hover,
    focus and disabled only: no rule of ours or of these widgets' selects an ancestor by
    its place among its siblings; the app's own pseudo-classes, dark or light, all)."""
    key: list[tuple] = [
        (
            type(widget),
            widget._id,
            frozenset(widget._classes),
            frozenset(widget.get_pseudo_classes()),
        )
    ]
    for n in widget.ancestors:
        app = n is widget.app
        state = frozenset(n.get_pseudo_classes()) if app else n._pseudo_classes_cache_key
        key.append((type(n), n._id, frozenset(n._classes), state))
    return tuple(key)


class RestyleMemo:
    """Mixin (before the widget class) for a widget with no children: a restyle in a state
    seen before is replayed from the memo; any other goes through the stylesheet."""

    def update_node_styles(self: Widget, animate: bool = True) -> None:  # type: ignore[misc]
        try:
            sheet: Stylesheet = self.app.stylesheet
        except NoActiveAppError:
            return
        if self._nodes or not self.is_attached:  # children: the general path
            super().update_node_styles(animate=animate)  # type: ignore[misc]
            return
        key = _state(self)
        memo: dict = self.__dict__.setdefault("_restyle_memo", {})
        hit = memo.get(key)
        if hit is not None and hit[0] is sheet.rules:
            _rules, node_rules, components = hit
            base = self.styles.base
            now = base._rules
            changed = [k for k in now.keys() | node_rules.keys() if now.get(k) != node_rules.get(k)]
            for name in changed:  # (what replace_rules sets: the others are equal already)
                setattr(base, name, node_rules.get(name))
            self._restyle_replayed = True  # the look of this state is the one seen before
            try:
                self.notify_style_update()
            finally:
                self._restyle_replayed = False
            if self._component_styles != components:
                self._component_styles = dict(components)
                self.refresh()
            RestyleMemo._restyle_scrollbars(self, sheet)
            return
        super().update_node_styles(animate=animate)  # type: ignore[misc]
        if len(memo) > 16:  # states seen are few; a theme change starts again
            memo.clear()
        memo[key] = (
            sheet.rules,
            dict(self.styles.base._rules),
            dict(self._component_styles),
        )

    def _restyle_scrollbars(self: Widget, sheet: Stylesheet) -> None:  # type: ignore[misc]
        """What ``Stylesheet.update_nodes`` does after the node itself."""
        if not self.is_scrollable:
            return
        vertical = self.show_vertical_scrollbar and self.scrollbar_size_vertical
        horizontal = self.show_horizontal_scrollbar and self.scrollbar_size_horizontal
        bars: list[DOMNode] = []
        if vertical:
            bars.append(self.vertical_scrollbar)
        if horizontal:
            bars.append(self.horizontal_scrollbar)
        if vertical and horizontal:
            bars.append(self.scrollbar_corner)
        for bar in bars:
            sheet.apply(bar)
