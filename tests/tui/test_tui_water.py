"""The water supplies in the text UI: the dialog opened from the command list."""

from __future__ import annotations

import shutil

from tui_helpers import SIZE, demo_app, screen_text

from offgrid.paths import demo_water_path
from offgrid.tui.app import make_app
from offgrid.tui.screens.water import WaterDialog, day_plot, water_blocks


def test_day_plot_marks_flow_and_sun_and_plain_is_ascii():
    sun = [0.0, 200.0, 600.0, 800.0, 600.0, 200.0, 0.0]
    flow = [0.0, 0.0, 1.0, 1.5, 1.0, 0.0, 0.0]
    rows = day_plot(sun, flow, 7, 5, plain=True)
    text = "\n".join(rows)
    assert text.isascii() and "*" in text and "." in text
    # the flow's peak is on the top row, in the middle column (step 4 of 7)
    assert rows[0][1 + 3] == "*"
    # no flow where the sun is too low to start the pump
    assert all(r[1 + 1] != "*" for r in rows[:-1])


async def test_water_dialog_shows_the_demo_water_point(state, tmp_path):
    path = tmp_path / "water.toml"
    shutil.copy(demo_water_path(), path)
    app = make_app(path, state=state)
    async with app.run_test(size=(100, 40)) as pilot:
        await pilot.pause()
        app.work.action_water()
        await pilot.pause()
        assert isinstance(app.screen, WaterDialog)
        text = screen_text(app)
        assert "Water pumping" in text and "Total dynamic head" in text
        assert "flow" in text and "sunshine" in text
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, WaterDialog)


async def test_no_water_supply_is_a_notice(state):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.work.action_water()
        await pilot.pause()
        assert not isinstance(app.screen, WaterDialog)


def test_blocks_say_why_a_supply_cannot_be_met():
    from offgrid.project.store import load_project

    p = load_project(demo_water_path())
    p.water[0].static_level_m = 90.0
    ((_title, lines, day),) = water_blocks(p)
    assert day is None and "cannot lift" in lines[0] and "water[1].pump" in lines[0]
