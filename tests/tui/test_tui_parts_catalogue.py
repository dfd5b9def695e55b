"""The Parts section's catalogue picker (key c) at 80x24."""

from __future__ import annotations

import pytest
from tui_helpers import wait_for

from offgrid.tui.screens.dialogs import ChoiceDialog

# the tests start from the demo on Place and change only its session: one app for the module
pytestmark = pytest.mark.asyncio(loop_scope="module")


async def test_pick_a_battery_from_the_catalogue_and_undo_it(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    work = app.work
    work.action_goto("parts")
    await pilot.pause()
    before = app.session.project.battery.name
    assert work.current.reveal("battery.capacity_ah")
    await pilot.press("c")
    await wait_for(pilot, lambda: isinstance(app.screen, ChoiceDialog))
    names = [v for v, _ in app.screen.options]
    assert names[1] == "Invented 12 V 200 Ah AGM block (demo)"
    await pilot.press("down", "enter")  # the second battery of the list
    await wait_for(pilot, lambda: app.session.project.battery.name == names[1])
    p = app.session.project
    assert p.battery.capacity_ah == 200.0 and p.battery.chemistry == "agm"
    assert p.extra["stock"]["battery"]["price"] == 280.0
    assert any(x.part == f"battery:{names[1]}" and x.unit_price == 280.0 for x in p.prices)
    assert app.session.design.battery.unit_count == 16  # 4 x 12 V in series, 4 strings
    await pilot.press("u")
    await wait_for(pilot, lambda: app.session.project.battery.name == before)
    assert "stock" not in app.session.project.extra


async def test_the_picker_needs_a_part_field(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("parts")
    await pilot.pause()
    assert app.work.current.reveal("choices.autonomy_days")
    await pilot.press("c")
    await pilot.pause()
    assert not isinstance(app.screen, ChoiceDialog)
    assert "stock" not in app.session.project.extra


async def test_cheapest_combination_offered_and_taken(demo_pilot):
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project
    from offgrid.stock.catalogue import bundled_catalogue_dir, load_catalogue
    from offgrid.stock.choose import search

    expected = search(
        load_project(demo_project_path()),
        load_catalogue(bundled_catalogue_dir()),
        demo_project_path().parent,
    ).best
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("parts")
    await pilot.pause()
    await pilot.press("b")
    await wait_for(pilot, lambda: isinstance(app.screen, ChoiceDialog), timeout_s=60)
    assert "tried" in app.screen.note and "meet the design" in app.screen.note
    await pilot.press("enter")  # the cheapest
    await wait_for(pilot, lambda: "stock" in app.session.project.extra)
    p = app.session.project
    assert p.module.name == expected.module.name
    assert p.extra["stock"]["inverter"]["name"] == expected.inverter.name
    assert app.session.design.array.module_count == expected.module_count
