"""A DataTable whose scroll position does not depend on when it was first laid out."""

from __future__ import annotations

from textual.widgets import DataTable

from offgrid.tui.keys import deliver_now


class SteadyTable(DataTable):
    """Scrolls the cursor into view only once it has a size, keeping headings above in view.

    A table filled while its section is hidden has no height yet; scrolling then
    would leave it one row down at random (measured: snapshots differed run to run).
    Sub-classes say which rows are headings with :meth:`is_heading`.
    """

    def is_heading(self, row: int) -> bool:
        return False

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

    def on_resize(self, event) -> None:
        self._scroll_cursor_into_view()
