"""The water supply and generator forms of the text UI at 80x24 (issues 15 and 16): add,
edit and remove through the session (validated, undoable), figures recomputed in place.

The figures the forms show are checked against the engine's own results for the same
project (``water_design``, ``generator_setup``); the engine's figures are checked against
published sources in tests/test_water_*.py and tests/test_generator_*.py.
"""

from __future__ import annotations

import re

import pytest
from textual.widgets import DataTable, Input
from tui_helpers import screen_text, short_generator_study, type_into, wait_for

from offgrid.project.store import load_project
from offgrid.tui.commands import key_groups, key_text
from offgrid.tui.screens.forms import GeneratorForm, WaterForm, form_fields, parse_value
from offgrid.tui.screens.generator import open_generator

pytestmark = pytest.mark.asyncio(loop_scope="module")


async def _edit(pilot, path: str, text: str) -> None:
    """Put the form's cursor on ``path``, Enter, type ``text`` and Enter."""
    form = pilot.app.screen
    row = [f.path for f in form.fields].index(path)
    form.query_one(DataTable).move_cursor(row=row)
    await pilot.pause()
    await pilot.press("enter")
    await type_into(pilot, text)


async def _open_water_form(pilot) -> WaterForm:
    pilot.app.work.action_water()  # the demo has no supply: the form opens empty
    await wait_for(pilot, lambda: isinstance(pilot.app.screen, WaterForm))
    await wait_for(pilot, lambda: "No water supply yet: press a" in screen_text(pilot.app))
    await pilot.press("a")
    await pilot.pause()
    return pilot.app.screen


async def test_add_a_supply_type_need_and_head_see_the_figures(demo_pilot):
    from offgrid.water.design import water_design

    app = demo_pilot.app
    writes = app.recovery.writes
    await _open_water_form(demo_pilot)
    assert len(app.session.project.water) == 1
    await _edit(demo_pilot, "water[1].need_m3_day", "12")
    await _edit(demo_pilot, "water[1].static_level_m", "35 m")
    w = app.session.project.water[0]
    assert w.need_m3_day == [12.0] * 12 and w.static_level_m == 35.0
    expect = water_design(app.session.project, 0, app.session.base_dir)
    text = screen_text(app)
    assert "Water supply: Water point 1 (new) (1 of 1)" in text
    assert "12 m3/day every month" in text and "35 m" in text
    assert f"Total dynamic head    {expect.total_dynamic_head_m:.1f} m" in text
    assert "static 35 + drawdown" in text  # the head as typed, in the figures
    assert app.session.dirty
    assert app.recovery.flush() and app.recovery.writes > writes  # the autosave wrote it


async def test_a_refused_value_names_the_field_and_keeps_the_text(demo_pilot):
    app = demo_pilot.app
    await _open_water_form(demo_pilot)
    await _edit(demo_pilot, "water[1].static_level_m", "-3")
    text = screen_text(app)
    assert "Static water level (water[1].static_level_m) not changed" in text
    assert "0-500 m" in text  # the fix: the catalogue's range
    box = app.screen.query_one(Input)
    assert box.display and box.value == "-3" and app.focused is box  # nothing typed lost
    assert app.session.project.water[0].static_level_m == 20.0
    await _edit_box(demo_pilot, "not a number")
    assert "Static water level (water[1].static_level_m) not changed" in screen_text(app)
    # Esc leaves the box; its text comes back when the field is opened again
    await demo_pilot.press("escape")
    await demo_pilot.pause()
    assert isinstance(app.screen, WaterForm) and not box.display
    await demo_pilot.press("enter")
    await demo_pilot.pause()
    assert box.value == "not a number"


async def _edit_box(pilot, text: str) -> None:
    await type_into(pilot, text)


async def test_undo_in_the_form_and_remove(demo_pilot):
    app = demo_pilot.app
    form = await _open_water_form(demo_pilot)
    await _edit(demo_pilot, "water[1].tank_height_m", "12")
    assert "static 20 + drawdown 5.7 + tank 12 +" in screen_text(app)
    await demo_pilot.press("u")
    await demo_pilot.pause()
    assert app.session.project.water[0].tank_height_m == 5.0
    await wait_for(demo_pilot, lambda: "drawdown 4.8 + tank 5 +" in screen_text(app))
    assert "Undone" in screen_text(app)
    await demo_pilot.press("a")  # a second supply; n goes round them
    await demo_pilot.pause()
    assert "(2 of 2)" in screen_text(app)
    await demo_pilot.press("n")
    await demo_pilot.pause()
    assert "(1 of 2)" in screen_text(app)
    await demo_pilot.press("x")
    await demo_pilot.pause()
    assert [w.name for w in app.session.project.water] == ["Water point 2 (new)"]
    await demo_pilot.press("u")
    await demo_pilot.pause()
    assert len(app.session.project.water) == 2 and form.index <= 1


async def test_a_choice_is_picked_from_the_catalogue_values(demo_pilot):
    from offgrid.tui.screens.dialogs import ChoiceDialog

    app = demo_pilot.app
    form = await _open_water_form(demo_pilot)
    row = [f.path for f in form.fields].index("water[1].pipe_material")
    form.query_one(DataTable).move_cursor(row=row)
    await demo_pilot.pause()
    assert "pvc, hdpe, steel, galvanised" in screen_text(app)  # the allowed values
    await demo_pilot.press("enter")
    await wait_for(demo_pilot, lambda: isinstance(app.screen, ChoiceDialog))
    await demo_pilot.press("up")  # hdpe -> pvc
    await demo_pilot.press("enter")
    await wait_for(demo_pilot, lambda: isinstance(app.screen, WaterForm))
    assert app.session.project.water[0].pipe_material == "pvc"


async def test_generator_added_rating_edited_check_shown_and_saved(demo_pilot, tmp_path):
    from offgrid.generator.hybrid import generator_setup

    app = demo_pilot.app
    open_generator(app.work)  # none in the demo: the form opens empty
    await wait_for(demo_pilot, lambda: isinstance(app.screen, GeneratorForm))
    await demo_pilot.press("a")
    await demo_pilot.pause()
    assert app.session.project.generator is not None
    await _edit(demo_pilot, "generator.rated_kw", "8")
    s = app.session
    assert s.project.generator.rated_kw == 8.0
    setup = generator_setup(s.project, s.design, s.base_dir)
    text = screen_text(app)
    assert re.search(r"Generator rating +8 kW", text)
    form = app.screen
    form.query_one("#form-figures").scroll_end(animate=False)
    await demo_pilot.pause()
    body = str(form.query_one("#form-figure-text").content)
    assert f"Derated output {setup.derating.derated_kw:.2f} kW" in body
    assert f"within {setup.check.derated_w / 1000:.2f} kW" in body
    await _edit(demo_pilot, "generator.rated_kw", "0")
    assert "Generator rating (generator.rated_kw) not changed" in screen_text(app)
    assert s.project.generator.rated_kw == 8.0
    # and a water supply beside it: the saved file reloads with both
    await demo_pilot.press("escape")  # leave the box
    await demo_pilot.press("escape")  # close the form
    await demo_pilot.pause()
    await _open_water_form(demo_pilot)
    await _edit(demo_pilot, "water[1].need_m3_day", "4 4 5 6 8 9 9 8 6 5 4 4")
    path = s.save(tmp_path / "forms.toml")
    back = load_project(path)
    assert back.generator.rated_kw == 8.0
    assert back.water[0].need_m3_day == [4, 4, 5, 6, 8, 9, 9, 8, 6, 5, 4, 4]


async def test_the_dialogs_open_the_forms_and_help_lists_the_keys(demo_pilot):
    from offgrid.tui.screens.water import WaterDialog

    app = demo_pilot.app
    await _open_water_form(demo_pilot)
    await demo_pilot.press("escape")
    await demo_pilot.pause()
    app.work.action_water()  # now there is a supply: the figures first, e edits
    await wait_for(demo_pilot, lambda: isinstance(app.screen, WaterDialog))
    await demo_pilot.press("e")
    await wait_for(demo_pilot, lambda: isinstance(app.screen, WaterForm))
    groups = {g.title: {r.description: r.keys for r in g.rows} for g in key_groups(app, None)}
    water = groups["Water supply form"]
    assert water["Add a water supply"] == "a" and water["Remove this water supply"] == "x"
    assert water["Edit the value under the cursor"] == key_text(app, "enter")
    assert groups["Generator form"]["Add a generator"] == "a"


async def test_rows_come_from_the_catalogue_and_lists_read_as_typed():
    from offgrid.catalogue import find_input

    rows = form_fields("water[2].")
    assert rows[0].path == "water[2].name"
    tables = [f.path for f in rows if find_input(f.path).kind == "table"]
    assert tables == ["water[2].pump.flow_m3_h"]  # the datasheet, typed as points
    need = next(f for f in rows if f.path.endswith("need_m3_day"))
    assert parse_value(need, "3") == [3.0] * 12
    with pytest.raises(ValueError, match="twelve"):
        parse_value(need, "1 2 3")
    gen = {f.path: f for f in form_fields("generator.")}
    assert parse_value(gen["generator.fuel_l_h"], "0.7; 1.0; 1.3; 1.6") == [0.7, 1.0, 1.3, 1.6]
    assert parse_value(gen["generator.fuel"], "LPG") == "lpg"
    assert parse_value(gen["generator.quiet_from_h"], "auto") is None


async def test_pump_datasheet_typed_as_points(demo_pilot):
    from offgrid.water.design import water_design

    app = demo_pilot.app
    await _open_water_form(demo_pilot)
    path = "water[1].pump.flow_m3_h"
    await _edit(demo_pilot, path, "20 1.2 200; 20 2.5 400; 40 0.5 200")
    said = str(app.screen.query_one("#form-message").content)
    assert "Datasheet flows (water[1].pump.flow_m3_h) not changed" in said
    assert "no flow at 40 m and 400 W" in said
    await type_into(demo_pilot, "20 1.2 200; 40 0.5 200; 20 2.5 400; 40 1.4 400")
    pump = app.session.project.water[0].pump
    assert pump.head_points_m == [20, 40] and pump.power_points_w == [200, 400]
    assert pump.flow_m3_h == [[1.2, 2.5], [0.5, 1.4]]
    await wait_for(demo_pilot, lambda: "2 heads x 2 powers" in screen_text(app))
    w = water_design(app.session.project, 0, app.session.base_dir)
    body = str(app.screen.query_one("#form-figure-text").content)
    assert f"Total dynamic head    {w.total_dynamic_head_m:.1f} m" in body
    await demo_pilot.press("u")
    await demo_pilot.pause()
    assert app.session.project.water[0].pump.head_points_m == [20.0, 40.0, 60.0]


async def test_e_in_the_generator_dialog_opens_its_form(demo_pilot, monkeypatch):
    from offgrid.tui.screens.generator import GeneratorDialog

    short_generator_study(monkeypatch)  # the dialog starts its study; this test leaves it
    app = demo_pilot.app
    open_generator(app.work)
    await wait_for(demo_pilot, lambda: isinstance(app.screen, GeneratorForm))
    await demo_pilot.press("a")
    await demo_pilot.press("escape")
    await demo_pilot.pause()
    open_generator(app.work)  # now there is one: the read-only figures first
    await wait_for(demo_pilot, lambda: isinstance(app.screen, GeneratorDialog))
    await demo_pilot.press("e")
    await wait_for(demo_pilot, lambda: isinstance(app.screen, GeneratorForm))
    await demo_pilot.press("x")
    await demo_pilot.pause()
    assert app.session.project.generator is None
    await wait_for(demo_pilot, lambda: "No generator yet: press a" in screen_text(app))
