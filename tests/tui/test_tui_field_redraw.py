"""An applied edit redraws only the field rows whose text changed (issue 19, speed).

The field table keeps DataTable's rendered rows across the edit box opening and
closing (only the table's height changes) and drops just the edited row; these tests
check that what is drawn is still exactly what a full redraw draws, and that the
other rows were not rendered again. Common practice, no source: a rendering cache
must give what rendering afresh gives.
"""

from __future__ import annotations

import pytest
from textual.widgets import Input
from tui_helpers import edit_autonomy, wait_for

from offgrid.tui.widgets.fieldtable import FieldTable

pytestmark = pytest.mark.asyncio(loop_scope="module")


def drawn(table: FieldTable) -> list[tuple]:
    """Every line of the table as drawn: text and style of each segment."""
    return [
        tuple((seg.text, str(seg.style)) for seg in table.render_line(y))
        for y in range(table.size.height)
    ]


async def test_an_edit_draws_what_a_full_redraw_draws(demo_pilot):
    table = await edit_autonomy(demo_pilot, "5")
    cached = drawn(table)
    assert any("5 days" in "".join(t for t, _s in line) for line in cached)
    table._clear_caches()  # everything rendered afresh
    table._update_count += 1
    assert drawn(table) == cached
    # and back: the row that changed twice shows its newest text
    table = await edit_autonomy(demo_pilot, "3")
    text = ["".join(t for t, _s in line) for line in drawn(table)]
    assert any("3 days" in line for line in text) and not any("5 days" in t for t in text)


async def test_an_edit_renders_only_the_changed_rows_again(demo_pilot):
    table = await edit_autonomy(demo_pilot, "4")  # rows rendered focused
    # ... and blurred: open the edit box and draw the table while it has no focus (a
    # busy machine may paint no frame between opening the box and typing into it, and
    # rows never drawn blurred would render the first time in the edit counted below).
    await demo_pilot.press("enter")
    await wait_for(demo_pilot, lambda: isinstance(demo_pilot.app.focused, Input))
    drawn(table)
    await demo_pilot.press("escape")
    await wait_for(demo_pilot, lambda: demo_pilot.app.focused is table)
    drawn(table)
    rendered: list[int] = []
    original = table._render_cell

    def spy(row_index, *args, **kwargs):
        rendered.append(row_index)
        return original(row_index, *args, **kwargs)

    table._render_cell = spy
    try:
        await edit_autonomy(demo_pilot, "6")
        await demo_pilot.pause()
    finally:
        del table._render_cell
    row = next(
        i for i, r in enumerate(table._rows) if getattr(r, "path", "") == "choices.autonomy_days"
    )
    assert rendered, "the edited row was not drawn again"
    assert set(rendered) <= {row}, sorted(set(rendered))
