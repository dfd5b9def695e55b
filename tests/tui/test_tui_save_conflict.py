"""Saving in the text UI when another program or window changed the file, and exports
that would overwrite a project (pilot tests at 80x24)."""

from __future__ import annotations

import os

from tui_helpers import SIZE, demo_app, edit_field, screen_text, type_into

from offgrid.paths import demo_project_path
from offgrid.project.store import load_project, save_project
from offgrid.tui.app import make_app
from offgrid.tui.screens.dialogs import ConfirmDialog, PathDialog


def copy_demo(tmp_path, name="site.toml"):
    target = tmp_path / name
    target.write_text(demo_project_path().read_text())
    return target


def their_save(target, name="Saved in the other window"):
    theirs = load_project(target)
    theirs.info.name = name
    save_project(theirs, target)


async def _edit_then_they_save(pilot, target):
    await pilot.pause()
    await edit_field(pilot, "parts", "choices.autonomy_days", "4")
    their_save(target)
    await pilot.press("s")
    await pilot.pause()


async def test_a_file_changed_elsewhere_is_not_overwritten_without_asking(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await _edit_then_they_save(pilot, target)
        assert isinstance(app.screen, ConfirmDialog)
        text = screen_text(app)
        assert "Changed on disk" in text and "changed by another program or window" in text
        for label in ("c Save mine as a copy", "r Reload theirs", "o Overwrite theirs"):
            assert label in text, text  # all three answers visible at 80x24
        assert load_project(target).info.name == "Saved in the other window"
        await pilot.press("escape")
        await pilot.pause()
        assert load_project(target).info.name == "Saved in the other window"
        assert "unsaved" in screen_text(app)
        # asked again on the next save; overwrite: mine is saved, theirs is the .bak
        await pilot.press("s")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("o")
        await pilot.pause()
        assert load_project(target).choices.autonomy_days == 4.0
        bak = tmp_path / "site.toml.bak"
        assert load_project(bak).info.name == "Saved in the other window"
        # now the session knows the file again: the next save does not ask
        await edit_field(pilot, "parts", "choices.autonomy_days", "5")
        await pilot.press("s")
        await pilot.pause()
        assert not isinstance(app.screen, ConfirmDialog)
        assert load_project(target).choices.autonomy_days == 5.0


async def test_save_mine_as_a_copy_keeps_both(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await _edit_then_they_save(pilot, target)
        await pilot.press("c")
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        assert app.screen.query_one("#path").value == str(tmp_path / "site-mine.toml")
        await type_into(pilot, str(tmp_path / "site-mine.toml"))
        assert load_project(tmp_path / "site-mine.toml").choices.autonomy_days == 4.0
        assert load_project(target).info.name == "Saved in the other window"
        assert app.session.path == (tmp_path / "site-mine.toml").resolve()


async def test_reload_theirs_and_undo_brings_mine_back(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await _edit_then_they_save(pilot, target)
        await pilot.press("r")
        await pilot.pause()
        assert app.session.project.info.name == "Saved in the other window"
        assert not app.session.dirty
        await pilot.press("s")  # nothing changed since reloading: saves without asking
        await pilot.pause()
        assert not isinstance(app.screen, ConfirmDialog)
        await pilot.press("u")
        await pilot.pause()
        assert app.session.project.choices.autonomy_days == 4.0


async def test_a_file_only_touched_elsewhere_saves_without_asking(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        os.utime(target, (1e9, 1e9))  # same bytes, another time
        await pilot.press("s")
        await pilot.pause()
        assert not isinstance(app.screen, ConfirmDialog)
        assert load_project(target).choices.autonomy_days == 4.0


async def test_opening_removes_stray_temp_files_of_that_project(state, tmp_path):
    target = copy_demo(tmp_path)
    stray = tmp_path / ".site.toml.999999999.0123456789ab.offgrid-tmp"  # no such process
    stray.write_text("half a save")
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert not stray.exists()


async def test_export_keys_refuse_to_write_over_a_project(state, tmp_path):
    target = copy_demo(tmp_path)
    other = copy_demo(tmp_path, "other.toml")
    before = {f: f.read_bytes() for f in (target, other)}
    app = make_app(target, state=state)
    said: list[str] = []
    notify = app.notify

    def record(message, **kwargs):
        said.append(str(message))
        return notify(message, **kwargs)

    app.notify = record
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        for key, path in (("E", target), ("B", target), ("E", other)):
            await pilot.press(key)
            await pilot.pause()
            assert isinstance(app.screen, PathDialog)
            await type_into(pilot, str(path))
            assert not isinstance(app.screen, ConfirmDialog)  # refused, not asked
            assert said[-1].startswith("Not written:") and "written over a project" in said[-1]
    assert {f: f.read_bytes() for f in (target, other)} == before


async def test_the_load_list_export_refuses_to_write_over_the_project(state, tmp_path):
    target = copy_demo(tmp_path)
    before = target.read_bytes()
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("2")
        await pilot.pause()
        await pilot.press("e")
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        await type_into(pilot, str(target))
        assert not isinstance(app.screen, ConfirmDialog)  # refused, not asked
    assert target.read_bytes() == before


async def test_the_demo_still_saves_as_a_new_file(state, tmp_path):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("ctrl+s")
        await pilot.pause()
        await type_into(pilot, str(tmp_path / "fresh"))
        assert (tmp_path / "fresh.toml").exists()
