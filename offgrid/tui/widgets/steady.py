"""A DataTable whose scroll position does not depend on when it was first laid out."""

from __future__ import annotations

from textual.widgets import DataTable


class SteadyTable(DataTable):
    """Scrolls the cursor into view only once it has a size, keeping headings above in view.

    A table filled while its section is hidden has no height yet; scrolling then
    would leave it one row down at random (measured: snapshots differed run to run).
    Sub-classes say which rows are headings with :meth:`is_heading`.
    """

    def is_heading(self, row: int) -> bool:
        return False

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
