"""Focus moves restyle the field table and the edit box from a memo (issue 19, speed).

An applied edit moves the focus from the edit box back to the table; Textual applied
the whole stylesheet to both each time (the table and a dozen component classes,
3-4 ms a move). The styles put back from the memo must be exactly what the stylesheet
gives, also after a theme change. Common practice, no source: a cache must give what
working it out afresh gives.
"""

from __future__ import annotations

import pytest
from tui_helpers import edit_autonomy, wait_for

from offgrid.tui.widgets.editbar import EditBar

pytestmark = pytest.mark.asyncio(loop_scope="module")


def looks(widget) -> tuple:
    """The widget's own rules and the rules of each of its component classes."""
    return (
        dict(widget.styles.base._rules),
        {name: dict(s.base._rules) for name, s in sorted(widget._component_styles.items())},
    )


def fresh_looks(app, widget) -> tuple:
    """What the stylesheet gives the widget now (the memo bypassed)."""
    app.stylesheet.update_nodes([widget], animate=False)
    return looks(widget)


async def test_an_edit_does_not_apply_the_stylesheet_to_the_table_or_the_box(
    demo_pilot, monkeypatch
):
    app = demo_pilot.app
    await edit_autonomy(demo_pilot, "5")  # every state of both seen (the table's
    table = await edit_autonomy(demo_pilot, "4")  # place among its siblings moves too)
    box = app.work.current.query_one(EditBar).input
    applied: list[str] = []
    original = app.stylesheet.update_nodes

    def spy(nodes, *args, **kwargs):
        nodes = list(nodes)
        applied.extend(type(n).__name__ for n in nodes if n is table or n is box)
        return original(nodes, *args, **kwargs)

    monkeypatch.setattr(app.stylesheet, "update_nodes", spy)
    await edit_autonomy(demo_pilot, "6")
    assert app.session.project.choices.autonomy_days == 6.0
    assert applied == []


async def test_the_styles_put_back_are_the_stylesheets(demo_pilot):
    app = demo_pilot.app
    table = await edit_autonomy(demo_pilot, "5")
    table = await edit_autonomy(demo_pilot, "4")  # restyled from the memo
    box = app.work.current.query_one(EditBar).input
    assert app.focused is table
    assert looks(table) == fresh_looks(app, table)
    assert looks(box) == fresh_looks(app, box)
    # focused table rows and the box's own look while editing
    await demo_pilot.press("enter")
    await wait_for(demo_pilot, lambda: app.focused is box)
    assert looks(box) == fresh_looks(app, box)
    assert looks(table) == fresh_looks(app, table)
    await demo_pilot.press("escape")
    await wait_for(demo_pilot, lambda: app.focused is table)


async def test_a_theme_change_is_not_undone_by_the_memo(demo_pilot):
    app = demo_pilot.app
    table = await edit_autonomy(demo_pilot, "5")
    before = looks(table)
    app.action_toggle_theme()
    await demo_pilot.pause()
    try:
        table = await edit_autonomy(demo_pilot, "6")  # focus moves after the change
        assert looks(table) == fresh_looks(app, table)
        assert looks(table) != before  # (the two themes do differ for the table)
    finally:
        app.action_toggle_theme()
        await demo_pilot.pause()


async def test_an_edit_changes_the_footer_keys_in_place(demo_pilot, monkeypatch):
    """The edit box's keys and the table's take the same places on the footer: changed in
    place, not rebuilt (10-30 ms of mounting twice an edit), and what is shown is what a
    rebuild shows."""
    from tui_helpers import screen_text

    from offgrid.tui.widgets.footer import KeyFooter

    app = demo_pilot.app
    await edit_autonomy(demo_pilot, "5")
    footer = app.work.query_one(KeyFooter)
    rebuilt: list[int] = []
    original = KeyFooter.recompose

    async def spy(self):
        rebuilt.append(1)
        return await original(self)

    monkeypatch.setattr(KeyFooter, "recompose", spy)
    await demo_pilot.press("enter")
    box = app.work.current.query_one(EditBar).input
    await wait_for(demo_pilot, lambda: app.focused is box)
    await demo_pilot.pause()
    editing = screen_text(app).splitlines()[-1]
    assert "Cancel edit" in editing
    box.value = "6"
    await demo_pilot.press("enter")
    await wait_for(demo_pilot, lambda: app.focused is not box)
    await demo_pilot.pause()
    await demo_pilot.pause()
    after = screen_text(app).splitlines()[-1]
    assert "Cancel edit" not in after and "Edit" in after
    assert rebuilt == []
    monkeypatch.setattr(KeyFooter, "recompose", original)
    footer.refresh(recompose=True)  # a rebuild from the same keys shows the same line
    for _ in range(4):
        await demo_pilot.pause()
    assert screen_text(app).splitlines()[-1] == after
