"""The Parts section's catalogue picker (key c) at 80x24."""

from __future__ import annotations

from tui_helpers import SIZE, demo_app, wait_for

from offgrid.tui.screens.dialogs import ChoiceDialog


async def test_pick_a_battery_from_the_catalogue_and_undo_it(state):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
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


async def test_the_picker_needs_a_part_field(state):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.work.action_goto("parts")
        await pilot.pause()
        assert app.work.current.reveal("choices.autonomy_days")
        await pilot.press("c")
        await pilot.pause()
        assert not isinstance(app.screen, ChoiceDialog)
        assert "stock" not in app.session.project.extra
