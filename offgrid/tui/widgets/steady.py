"""A DataTable whose scroll position does not depend on when it was first laid out."""

from __future__ import annotations

from rich.style import Style
from textual.geometry import Region
from textual.strip import Strip
from textual.widget import Widget
from textual.widgets import DataTable
from textual.widgets.data_table import ColumnKey, RowKey

from offgrid.tui.keys import deliver_now
from offgrid.tui.widgets.restyle import RestyleMemo


class SteadyTable(RestyleMemo, DataTable):
    """Scrolls the cursor into view only once it has a size, keeping headings above in view.

    A table filled while its section is hidden has no height yet; scrolling then
    would leave it one row down at random (measured: snapshots differed run to run).
    Sub-classes say which rows are headings with :meth:`is_heading`.
    """

    _pass_style: Style | None = None  # the table's style during one render pass

    def is_heading(self, row: int) -> bool:
        return False

    @property
    def rich_style(self) -> Style:
        """The table's style: worked out once a render pass (DataTable asks for each line,
        and each time walks every ancestor's styles: about half of redrawing a table)."""
        if self._pass_style is not None:
            return self._pass_style
        return DataTable.rich_style.fget(self)  # type: ignore[attr-defined]

    def render_lines(self, crop: Region) -> list[Strip]:
        self._pass_style = None
        self._pass_style = self.rich_style
        try:
            return super().render_lines(crop)
        finally:
            self._pass_style = None

    def action_select_cursor(self) -> None:
        """Enter: the section opens its editor now, before the next key is read."""
        self._set_hover_cursor(False)
        if not self.show_cursor or self.cursor_type == "none" or self.row_count == 0:
            return
        at = self.cursor_coordinate
        key = self.coordinate_to_cell_key(at)
        if self.cursor_type == "cell":
            message = DataTable.CellSelected(
                self, self.get_cell_at(at), coordinate=at, cell_key=key
            )
        elif self.cursor_type == "row":
            message = DataTable.RowSelected(self, at.row, key.row_key)
        else:
            message = DataTable.ColumnSelected(self, at.column, key.column_key)
        deliver_now(self, message)

    def _scroll_cursor_into_view(self, animate: bool = False) -> None:
        if self.size.height <= 1:
            return
        row = self.cursor_row
        if all(self.is_heading(r) for r in range(row)):
            self.scroll_to(y=0, animate=False, immediate=True)
            return
        super()._scroll_cursor_into_view(animate=animate)

    def _on_resize(self, event) -> None:
        """Scroll the cursor into view; keep the rendered rows unless the width changed.

        DataTable drops every rendered row on any resize (its ``_on_resize``); an edit
        box opening or closing below a table changes only its height, which made the
        whole table render again twice an edit. Rows depend on the width alone.
        """
        width = (event.size.width, event.virtual_size.width)
        if width != getattr(self, "_rendered_width", None):
            self._rendered_width = width
            self._update_count += 1  # what DataTable's own handler does on every resize
        event.prevent_default()  # (DataTable's handler is the only other one)
        self._scroll_cursor_into_view()

    def notify_style_update(self) -> None:
        """Keep the rendered rows when only the focus moved (an edit box opened or closed).

        DataTable drops them on every style update; its caches are keyed by the focus
        state already, so rows drawn focused stay right while the component styles of
        that state are the same (a theme change alters them: everything is dropped).
        """
        state = self.get_pseudo_class_state()
        Widget.notify_style_update(self)  # the widget's own style caches
        seen = getattr(self, "_looks", None)
        if getattr(self, "_restyle_replayed", False) and seen and state in seen:
            # styles put back from the memo of a state seen before (restyle.py): its
            # look is the one kept for that state
            self._styles_cache.clear()
            self._get_styles_to_render_cell.cache_clear()
            self.refresh()
            return
        try:
            look = tuple(
                self.get_component_rich_style(name, partial=True)
                for name in sorted(self.COMPONENT_CLASSES)
            )
        except KeyError:  # styles not set up yet (mounting): drop everything
            look = None
        seen = getattr(self, "_looks", None)
        if look is None or seen is None or seen.get(state, look) != look:
            seen = {}
            self._row_render_cache.clear()
            self._cell_render_cache.clear()
            self._row_renderable_cache.clear()
            self._line_cache.clear()
        seen[state] = look
        self._looks = seen
        self._styles_cache.clear()
        self._get_styles_to_render_cell.cache_clear()
        self.refresh()

    def set_cell_text(self, row_key: str, column_key: str, value) -> None:
        """Change one cell and render only its row again (``update_cell`` renders all).

        Leans on DataTable's caches (Textual is pinned exactly): the entries of this
        row are dropped and only its line is marked for repaint.
        """
        rkey = RowKey(row_key)
        index = self._row_locations.get(rkey)
        if index is None or ColumnKey(column_key) not in self.columns:
            self.update_cell(row_key, column_key, value)  # (raises CellDoesNotExist)
            return
        self._data[rkey][ColumnKey(column_key)] = value
        for cache in (self._row_render_cache, self._cell_render_cache):
            for key in [k for k in list(cache.keys()) if k[0] == rkey]:
                cache.discard(key)
        for key in [k for k in list(self._row_renderable_cache.keys()) if k[1] == index]:
            self._row_renderable_cache.discard(key)
        for key in list(self._line_cache.keys()):
            try:
                if self._get_offsets(key[0])[0] == rkey:
                    self._line_cache.discard(key)
            except LookupError:
                self._line_cache.discard(key)
        self.refresh_row(index)
