"""Files in the text UI: save, save as, open, revert, quit, recovery, and the whole job."""

from __future__ import annotations

import json
import pathlib

from tui_helpers import SIZE, demo_app, edit_field, screen_text, type_into, wait_for

from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import dumps_project, load_project
from offgrid.tui.app import make_app
from offgrid.tui.screens.dialogs import ConfirmDialog, MessageDialog, PathDialog
from offgrid.tui.screens.recover import RecoverDialog
from offgrid.tui.screens.work import WorkScreen
from offgrid.tui.state import RecoveryStore


def copy_demo(tmp_path, name="site.toml"):
    target = tmp_path / name
    target.write_text(demo_project_path().read_text())
    return target


async def test_unsaved_marker_save_and_backup(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert "unsaved" not in screen_text(app)
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        assert "\u25cf unsaved" in screen_text(app)
        await pilot.press("s")
        await pilot.pause()
        assert "unsaved" not in screen_text(app)
        assert load_project(target).choices.autonomy_days == 4.0
        assert (tmp_path / "site.toml.bak").exists()  # the previous version is kept


async def test_save_as_for_a_new_project_and_ctrl_s(state, tmp_path):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "place", "info.name", "Clinic copy")
        await pilot.press("ctrl+s")  # no file yet: asks for a name
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        assert app.screen.query_one("#path").value == "clinic-copy.toml"
        await type_into(pilot, str(tmp_path / "copy"))
        assert (tmp_path / "copy.toml").exists()
        assert app.session.path == (tmp_path / "copy.toml").resolve()
        assert "copy.toml" in screen_text(app)
        # save as over an existing file asks first
        other = copy_demo(tmp_path, "other.toml")
        await pilot.press("S")
        await pilot.pause()
        await type_into(pilot, str(other))
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("n")
        await pilot.pause()
        assert load_project(other).info.name == "Kisanga Ridge health post"


async def test_open_a_bad_file_opens_nothing_and_leaves_it_alone(state, tmp_path):
    bad = tmp_path / "broken.toml"
    text = demo_project_path().read_text().replace("latitude_deg = -3.4", "latitude_deg = 123")
    bad.write_text(text)
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("o")
        await pilot.pause()
        await type_into(pilot, str(bad))
        assert isinstance(app.screen, MessageDialog)
        shown = screen_text(app)
        assert "site.latitude_deg" in shown and "line" in shown
        await pilot.press("escape")
        await pilot.pause()
        assert app.session.project.site.latitude_deg == -3.4  # the demo is still open
    assert bad.read_text() == text


async def test_open_asks_about_unsaved_changes(state, tmp_path):
    target = copy_demo(tmp_path)
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        app.open_path(target)
        await pilot.pause()
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("d")  # discard
        await pilot.pause()
        assert app.session.path == target.resolve()
        assert app.session.project.choices.autonomy_days == 3.0


async def test_revert_goes_back_to_the_file(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "6")
        await pilot.press("r")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("y")
        await pilot.pause()
        assert app.session.project.choices.autonomy_days == 3.0
        assert not app.session.dirty


async def test_quit_with_unsaved_changes_asks(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        await pilot.press("q")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("escape")  # keep working
        await pilot.pause()
        assert isinstance(app.screen, WorkScreen)
        await pilot.press("q")
        await pilot.pause()
        await pilot.press("s")  # save and quit
        await pilot.pause()
    assert load_project(target).choices.autonomy_days == 4.0
    assert app.return_code == 0


async def test_quit_without_saving_leaves_no_recovery(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state, autosave_seconds=0.05)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        await wait_for(pilot, lambda: list(state.glob("recovery-*.json")))  # the autosave
        await pilot.press("q", "d")
        await pilot.pause()
    assert not list(state.glob("recovery-*.json"))
    assert not app.write_recovery_now()
    assert load_project(target).choices.autonomy_days == 3.0


async def test_autosave_and_recovery_restore_exactly_what_was_on_screen(state, tmp_path):
    target = copy_demo(tmp_path)
    app = make_app(target, state=state, autosave_seconds=0.05)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "4.5")
        await pilot.press("2")
        await pilot.press("a")
        await pilot.pause()
        await type_into(pilot, "Night [light] \x1b")
        on_screen = app.session.text()

        def saved() -> list:
            files = list(state.glob("recovery-*.json"))
            return files if files and json.loads(files[0].read_text())["text"] == on_screen else []

        await wait_for(pilot, saved)  # the autosave has caught up with the last edit
        files = list(state.glob("recovery-*.json"))
        assert len(files) == 1
        assert json.loads(files[0].read_text())["text"] == on_screen
    # the session "dies" without a deliberate quit; pretend its process has ended
    files[0].rename(state / "recovery-999999999.json")
    body = json.loads((state / "recovery-999999999.json").read_text())
    body["pid"] = 999999999
    (state / "recovery-999999999.json").write_text(json.dumps(body))
    app2 = make_app(state=state)
    async with app2.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert isinstance(app2.screen, RecoverDialog)
        assert "site.toml" in screen_text(app2)
        await pilot.press("r")
        await pilot.pause()
        assert isinstance(app2.screen, WorkScreen)
        assert app2.session.text() == on_screen
        assert app2.session.path == target.resolve()
        assert app2.session.dirty  # not in the file yet
        assert not (state / "recovery-999999999.json").exists()
        await pilot.press("s")
        await pilot.pause()
    assert dumps_project(load_project(target)) == on_screen


async def test_recovery_can_be_discarded_or_kept(state, tmp_path):
    store = RecoveryStore(state, pid=999999998)
    project = load_project(demo_project_path())
    store.write(dumps_project(project), None, "Kept for later", "")
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("escape")  # later
        await pilot.pause()
    assert store.file.exists()
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("x")  # discard
        await pilot.pause()
    assert not store.file.exists()


async def test_crash_path_writes_recovery(state, tmp_path):
    """What launch.run does after the app ends for any reason other than a deliberate quit."""
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "parts", "choices.autonomy_days", "2")
        shown = app.session.text()
    assert app.write_recovery_now()
    body = json.loads(app.recovery.file.read_text())
    assert body["text"] == shown and body["project_path"] is None


async def test_the_whole_job(state, tmp_path):
    """New project, loads, site, parts, results, save, quit, reopen: the same design."""
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("b")  # blank project
        await pilot.pause()
        work = app.work
        assert app.session.design is None
        # site: name, climate, tilt
        await edit_field(pilot, "place", "info.name", "Mwanga school")
        await edit_field(pilot, "place", "site.name", "Mwanga (demo)")
        await pilot.press("c")
        await pilot.pause()
        await pilot.press("enter")
        await pilot.pause()
        await edit_field(pilot, "place", "site.tilt_deg", "15")
        # loads: two appliances
        await pilot.press("2", "a")
        await pilot.pause()
        await type_into(pilot, "Classroom lights")
        table = work.current.table
        for col, value in ((1, "6"), (2, "12"), (3, "5")):
            table.move_cursor(row=0, column=col)
            await pilot.press("enter")
            await type_into(pilot, value)
        await pilot.press("a")
        await pilot.pause()
        await type_into(pilot, "Laptop")
        table.move_cursor(row=1, column=2)
        await pilot.press("enter")
        await type_into(pilot, "50")
        table.move_cursor(row=1, column=4)
        await pilot.press("enter")
        await pilot.pause()
        await pilot.press("up", "enter")  # AC
        await pilot.pause()
        # parts and choices
        await edit_field(pilot, "parts", "choices.autonomy_days", "2")
        await edit_field(pilot, "parts", "battery.capacity_ah", "100")
        # results
        await pilot.press("4")
        await pilot.pause()
        d = app.session.design
        assert d is not None and d.array.power_w > 0 and d.inverter.needed
        text = screen_text(app)
        assert f"Array {d.array.power_w:,.0f} W" in text and "\u25c0 design" in text
        # save under a new name and quit
        await pilot.press("s")
        await pilot.pause()
        await type_into(pilot, str(tmp_path / "school"))
        await pilot.press("q")
        await pilot.pause()
        on_screen = d.to_dict()
    assert app.return_code == 0
    saved = tmp_path / "school.toml"
    reopened = load_project(saved)
    assert design(reopened, saved.parent).to_dict() == on_screen
    app = make_app(saved, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert app.session.design.to_dict() == on_screen
        assert not app.session.dirty


async def wait_until(pilot, condition, seconds: float = 30.0) -> None:
    import time

    end = time.monotonic() + seconds
    while not condition() and time.monotonic() < end:
        await pilot.pause(0.1)
    assert condition()


async def test_export_report_and_bill_of_materials(state, tmp_path):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("E")
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        report = tmp_path / "clinic-report.md"
        await type_into(pilot, str(report))
        await wait_until(pilot, report.exists)
        assert "Kisanga Ridge" in report.read_text()
        await pilot.press("B")
        await pilot.pause()
        bom = tmp_path / "clinic-bom.csv"
        await type_into(pilot, str(bom))
        await wait_until(pilot, bom.exists)
        assert bom.read_text().count("\n") > 3
        assert "earth" in bom.read_text()  # the whole kit, not only the main parts
        # an existing file is replaced only after asking
        await pilot.press("B")
        await pilot.pause()
        await type_into(pilot, str(bom))
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("n")


async def test_community_plan_from_the_start_screen(state):
    from offgrid.tui.screens.plan import PlanScreen
    from offgrid.tui.screens.start import StartScreen

    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("p")
        await pilot.pause()
        assert isinstance(app.screen, PlanScreen)
        await wait_until(pilot, lambda: app.screen.plan is not None)
        assert "systems" in screen_text(app)
        await pilot.press("escape")
        await pilot.pause()
        assert isinstance(app.screen, StartScreen)


async def test_a_file_that_does_not_exist_yet_is_a_new_project(state, tmp_path):
    target = tmp_path / "new-site.toml"
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert not target.exists()
        assert "new-site.toml (new file)" in screen_text(app)
        assert app.session.project.info.name == "new site"
        await pilot.press("c")
        await pilot.pause()
        await pilot.press("enter")
        await pilot.pause()
        await pilot.press("s")  # saves where it was asked for, no dialog
        await pilot.pause()
    assert load_project(target).climate.ref


def test_launch_refuses_bad_arguments_and_unreadable_files(tmp_path, capsys):
    from offgrid.tui.launch import run

    assert run(["--demo", "x.toml"]) == 2
    assert "usage: offgrid" in capsys.readouterr().err
    bad = tmp_path / "bad.toml"
    bad.write_text("format = 'offgrid-project'\nschema = 1\n[site]\nlatitude_deg = 'north'\n")
    before = bad.read_text()
    assert run([str(bad)]) == 2
    err = capsys.readouterr().err
    assert "site.latitude_deg" in err and "line 4" in err and "not changed" in err
    assert bad.read_text() == before


def test_ui_start_imports_neither_pvlib_nor_pandas():
    """LIBRARY-NOTES: pvlib costs ~0.7 s and pandas ~0.35 s to import; the UI starts without."""
    import subprocess
    import sys

    code = (
        "import asyncio, sys, tempfile, pathlib\n"
        "from offgrid.tui.app import make_app\n"
        "app = make_app(demo=True, state=pathlib.Path(tempfile.mkdtemp()))\n"
        "async def go():\n"
        "    async with app.run_test(size=(80, 24)) as pilot:\n"
        "        await pilot.pause()\n"
        "        assert app.session.design is not None\n"
        "asyncio.run(go())\n"
        "print(sorted(m for m in ('pvlib', 'pandas') if m in sys.modules))\n"
    )
    import os
    from pathlib import Path

    root = Path(__file__).resolve().parents[2]
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(root), *filter(None, [os.environ.get("PYTHONPATH")])]),
    }
    out = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, timeout=120, cwd=root, env=env
    )
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip().splitlines()[-1] == "[]"


async def test_opening_a_schema_1_file_tells_its_orphaned_cable_length(state, tmp_path):
    # Issue 14: a schema-1 [wiring.dc_load_runs_m] entry naming no load is told on opening.
    from offgrid.project.store import project_to_dict
    from offgrid.project.toml_out import dumps

    body = project_to_dict(load_project(demo_project_path()))
    body["schema"] = 1
    body["wiring"]["dc_load_runs_m"] = {body["loads"][0]["name"]: 30.0, "Old radio": 25.0}
    path = tmp_path / "old.toml"
    path.write_text(dumps(body))
    app = make_app(path=path, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert app.session.project.loads[0].run_m == 30.0
        told = [n.message for n in app._notifications]
        assert any("Old radio" in m and "dropped" in m for m in told), told


async def test_a_name_typed_in_save_as_replaces_the_suggested_name(state, tmp_path, monkeypatch):
    # Typed key by key, as a person does: the suggested "clinic-copy.toml" is selected,
    # so "site.toml" replaces it (it gave "clinic-copy.tomlsite.toml"); its folder stays.
    monkeypatch.chdir(tmp_path)
    (tmp_path / "jobs").mkdir()
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await edit_field(pilot, "place", "info.name", "Clinic copy")
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        await pilot.press(*"site.toml", "enter")
        await pilot.pause()
        assert (tmp_path / "site.toml").exists()
        # a suggestion with a folder: the folder is kept, the name replaced
        chosen: list = []
        app.push_screen(PathDialog("Save as", "jobs/site.toml", must_exist=False), chosen.append)
        await pilot.pause()
        await pilot.press(*"well.toml", "enter")
        await pilot.pause()
        assert chosen == [pathlib.Path("jobs/well.toml")]
        # a folder alone is a start to type after
        app.push_screen(PathDialog("Open", "jobs/"), chosen.append)
        await pilot.pause()
        await pilot.press(*"well.toml", "enter")
        await pilot.pause()
        assert chosen[-1] == pathlib.Path("jobs/well.toml")
