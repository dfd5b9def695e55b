"""Typing your own twelve months on a blank project (issue 19, found by trying it).

``m`` on a project with no climate starts the months with placeholders (the saved
climate needs twelve numbers): they must read as "not yet typed", and no design may
run on them as if they were data; the user is told which months are still to type.
A notice must not hide the edit box's hint at 80x24.
"""

from __future__ import annotations

import json

import pytest
from tui_helpers import SIZE, screen_text, type_into, wait_for

from offgrid.project.model import Load
from offgrid.tui.app import make_app
from offgrid.tui.screens.recover import RecoverDialog
from offgrid.tui.session import Session, blank_project


def blank_with_a_load() -> Session:
    project = blank_project()
    project.loads.append(Load(name="Lamp", quantity=2, power_w=10.0, hours_per_day=5.0))
    return Session.unsaved(project, origin="blank")


async def start_blank(pilot, session: Session | None = None):
    app = pilot.app
    app.new_blank()
    await pilot.pause()
    if session is not None:
        app.work.replace_session(session)
        await pilot.pause()
    work = app.work
    work.action_goto("place")
    await pilot.pause()
    await pilot.press("m")
    await wait_for(pilot, lambda: work.current.months.has_focus)
    await pilot.pause()
    return work


def climate_rows(app) -> list[str]:
    lines = screen_text(app).splitlines()
    return [line for line in lines if line.startswith(("Sun kWh", "Mean temp"))]


async def test_placeholders_read_as_not_typed_and_no_design_runs_on_them(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        work = await start_blank(pilot, blank_with_a_load())
        rows = climate_rows(app)
        assert len(rows) == 2
        for row in rows:  # no placeholder shown as a value
            assert "0.00" not in row and "20.0" not in row, row
            assert row.count("?") == 12, row
        assert app.session.design is None
        shown = screen_text(app)
        assert "still to type" in shown
        assert "sun Jan-Dec" in shown and "mean temperature Jan-Dec" in shown
        # one month typed: the others are still to type, still no design
        table = work.current.months
        table.move_cursor(row=0, column=1)
        await pilot.press("enter")
        await wait_for(pilot, lambda: work.current.editor.is_open)
        assert work.current.editor.input.value == ""  # not the placeholder
        await type_into(pilot, "5.5")
        await pilot.pause()
        assert app.session.project.climate.inline.insolation_kwh_m2_day[0] == 5.5
        assert app.session.design is None
        assert "sun Feb-Dec" in screen_text(app)
        # the rest of the sun, then the mean temperatures (twenty is a real value here)
        table.move_cursor(row=0, column=2)
        await pilot.press("enter")
        await type_into(pilot, "5.5 5.6 5.7 5.8 5.9 6 6 6 6 6 6 6")
        table.move_cursor(row=1, column=1)
        await pilot.press("enter")
        await type_into(pilot, "20 20 20 20 20 20 20 20 20 20 20 20")
        await pilot.pause()
        assert "still to type" not in screen_text(app)
        assert app.session.design is not None
        rows = climate_rows(app)
        assert "?" not in "".join(rows) and "20.0" in rows[1]


async def test_undo_brings_the_marks_back(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        work = await start_blank(pilot, blank_with_a_load())
        table = work.current.months
        table.move_cursor(row=1, column=3)
        await pilot.press("enter")
        await type_into(pilot, "21")
        await pilot.pause()
        assert climate_rows(app)[1].count("?") == 11
        work.action_undo()
        await pilot.pause()
        assert climate_rows(app)[1].count("?") == 12
        assert app.session.design is None
        work.action_redo()
        await pilot.pause()
        assert climate_rows(app)[1].count("?") == 11


async def test_a_chosen_climate_ends_the_marks(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        work = await start_blank(pilot, blank_with_a_load())
        place = work.current
        place._use_ref("kisanga-ridge-demo")
        await pilot.pause()
        assert app.session.project.climate.ref == "kisanga-ridge-demo"
        assert "still to type" not in screen_text(app)
        assert "?" not in "".join(climate_rows(app))


async def test_a_notice_does_not_hide_the_edit_boxs_hint(state):
    from textual.widgets._toast import Toast

    app = make_app(state=state)
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        await pilot.pause()
        work = await start_blank(pilot)
        await wait_for(pilot, lambda: bool(list(app.screen.query(Toast))))
        await pilot.press("enter")  # January's sun, while the notice is still up
        editor = work.current.editor
        await wait_for(pilot, lambda: editor.is_open)
        for _ in range(3):
            await pilot.pause()
        toasts = list(app.screen.query(Toast))
        assert toasts, "(the notice is still up)"
        for toast in toasts:
            for line in editor.query("#edit-label, #edit-input, #edit-message"):
                assert not toast.region.overlaps(line.region), (toast.region, line.region)
        # and back where notices are once the edit is done
        await pilot.press("escape")
        await wait_for(pilot, lambda: not editor.is_open)
        for _ in range(3):
            await pilot.pause()
        footer_y = app.screen.size.height - 1
        for toast in app.screen.query(Toast):
            assert toast.region.bottom == footer_y, toast.region  # just above the footer


async def test_saving_with_months_still_to_type_says_so(state, tmp_path):
    app = make_app(state=state)
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        await pilot.pause()
        await start_blank(pilot, blank_with_a_load())
        app.session.path = tmp_path / "half-typed.toml"
        app.save_project()
        await pilot.pause()
        said = [n.message for n in app._notifications]
        assert any("still to type" in m and "sun Jan-Dec" in m for m in said), said


async def test_m_on_months_already_your_own_says_so(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        await pilot.pause()
        work = await start_blank(pilot)
        app.clear_notifications()
        await pilot.press("m")  # the months are the project's own already
        await pilot.pause()
        said = [n.message for n in app._notifications]
        assert said and "already" in said[-1], said
        assert work.current.months.has_focus


# ------------------------------------------------ the marks are the project's (issue 19 follow-up)


async def type_january_sun(pilot, work) -> None:
    table = work.current.months
    table.move_cursor(row=0, column=1)
    await pilot.press("enter")
    await wait_for(pilot, lambda: work.current.editor.is_open)
    await type_into(pilot, "5.5")
    await pilot.pause()


def assert_still_to_type(app) -> None:
    rows = climate_rows(app)
    assert rows[0].count("?") == 11 and "5.50" in rows[0], rows
    assert rows[1].count("?") == 12, rows
    assert app.session.design is None
    shown = screen_text(app)
    assert "sun Feb-Dec" in shown and "mean temperature Jan-Dec" in shown, shown


async def test_months_still_to_type_survive_save_and_reopen(state, tmp_path):
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design
    from offgrid.project.store import load_project

    target = tmp_path / "half-typed.toml"
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        work = await start_blank(pilot, blank_with_a_load())
        await type_january_sun(pilot, work)
        assert_still_to_type(app)
        app.session.path = target
        app.save_project()
        await pilot.pause()
    assert "[climate.months_to_type]" in target.read_text(encoding="utf-8")
    with pytest.raises(DesignError):  # the command line's design refuses it too
        design(load_project(target), tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.work.action_goto("place")
        await pilot.pause()
        assert_still_to_type(app)
        assert not app.session.dirty


async def test_months_still_to_type_survive_recovery(state):
    app = make_app(state=state, autosave_seconds=0.05)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        work = await start_blank(pilot, blank_with_a_load())
        await type_january_sun(pilot, work)
        on_screen = app.session.text()
        assert "months_to_type" in on_screen

        def saved() -> list:
            files = list(state.glob("recovery-*.json"))
            return files if files and json.loads(files[0].read_text())["text"] == on_screen else []

        await wait_for(pilot, saved)
        files = saved()
    # the session ends without a deliberate quit; pretend its process has ended
    body = json.loads(files[0].read_text())
    files[0].unlink()
    body["pid"] = 999999997
    (state / "recovery-999999997.json").write_text(json.dumps(body))
    app2 = make_app(state=state)
    async with app2.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert isinstance(app2.screen, RecoverDialog)
        await pilot.press("r")
        await pilot.pause()
        assert app2.session.text() == on_screen
        app2.work.action_goto("place")
        await pilot.pause()
        assert_still_to_type(app2)


async def test_the_record_low_set_on_a_bundled_climate_makes_an_own_copy(state):
    # The record low is edited on Place too; it makes the project's own copy of the
    # climate (every month data, none to type). It raised AttributeError after the
    # months' marks moved into the project (a call left to a helper that went with them).
    from tui_helpers import demo_app, edit_field

    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "place", "climate.record_low_c", "-4")
        await pilot.pause()
        inline = app.session.project.climate.inline
        assert inline is not None and inline.record_low_c == -4.0
        assert inline.still_to_type() == {}
        assert app.session.outcome.design is not None
        assert app.session.project.climate.ref in (None, "")  # the copy replaced the choice
