"""The work an applied edit does on the UI thread (issue 19, edit speed).

Each applied edit turns the project into its saved text once: the file bar's
unsaved mark and the recovery copy share that text (it was made two or three times
an edit, a few milliseconds each). The recovery copy must still be exactly what is
on screen. Common practice, no source: work shared must give what the work done
twice gives.
"""

from __future__ import annotations

import pytest
from tui_helpers import edit_autonomy

from offgrid.project import store
from offgrid.tui import session as session_module
from offgrid.tui.state import read_recovery

pytestmark = pytest.mark.asyncio(loop_scope="module")


@pytest.fixture
def serialisations(monkeypatch) -> list[int]:
    """Counts every project-to-text of the UI (the session's ``text`` reads this name)."""
    calls: list[int] = []
    original = store.dumps_project

    def counting(project, *args, **kwargs):
        calls.append(1)
        return original(project, *args, **kwargs)

    monkeypatch.setattr(session_module, "dumps_project", counting)
    return calls


async def test_an_edit_makes_the_project_text_once(demo_pilot, serialisations):
    app = demo_pilot.app
    await edit_autonomy(demo_pilot, "5")  # Parts shown, the rows drawn once
    serialisations.clear()
    await edit_autonomy(demo_pilot, "6")
    assert app.session.project.choices.autonomy_days == 6.0
    assert len(serialisations) == 1, f"{len(serialisations)} serialisations for one edit"


async def test_the_shared_text_is_what_is_on_screen(demo_pilot):
    app = demo_pilot.app
    await edit_autonomy(demo_pilot, "7")
    assert app.recovery.flush()
    item = read_recovery(app.recovery.store.file)
    assert item is not None and item.text == store.dumps_project(app.session.project)
    assert "unsaved" in str(app.work.query_one("#filebar").content)
    await edit_autonomy(demo_pilot, "3")  # back to the demo's own value: not unsaved
    assert app.session.text() == app.session.baseline
    assert "unsaved" not in str(app.work.query_one("#filebar").content)


async def test_the_edit_box_opens_and_closes_without_restyling_it(demo_pilot, monkeypatch):
    """Its own display style shows and hides it; a class made Textual apply the whole
    stylesheet to the box and its children at each open and close (~3 ms each)."""
    from offgrid.tui.widgets.editbar import EditBar

    app = demo_pilot.app
    await edit_autonomy(demo_pilot, "5")
    bar = app.work.current.query_one(EditBar)
    restyled: list[str] = []
    original = app.stylesheet.update_nodes

    def spy(nodes, *args, **kwargs):
        nodes = list(nodes)
        if bar in nodes:
            restyled.append("edit box")
        return original(nodes, *args, **kwargs)

    monkeypatch.setattr(app.stylesheet, "update_nodes", spy)
    await edit_autonomy(demo_pilot, "6")
    assert not bar.is_open and bar.styles.display == "none"
    assert app.session.project.choices.autonomy_days == 6.0
    assert restyled == []
