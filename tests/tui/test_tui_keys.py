"""Keys typed right after the key that opens an editor all reach the editor, in order.

A terminal delivers keys as fast as they are typed; the pilot's ``press`` waits for
the app to settle between keys and so hides a race. These tests post a whole burst
of key events at once, as the terminal driver does.
"""

from __future__ import annotations

import pytest
from textual import events
from tui_helpers import SIZE, demo_app

from offgrid.tui.fields import parse_number

KEYS = {" ": "space", "-": "minus", ".": "full_stop", ",": "comma", "%": "percent_sign"}

#: the tests on the module's shared app (demo_pilot) run on its event loop
SHARED = pytest.mark.asyncio(loop_scope="module")


def burst(app, keys: list[str | tuple[str, str | None]]) -> None:
    """Post every key at once (a name like 'enter', or one printable character)."""
    for k in keys:
        if isinstance(k, tuple):
            app.post_message(events.Key(*k))
        elif len(k) == 1:
            app.post_message(events.Key(KEYS.get(k, k), k))
        else:
            app.post_message(events.Key(k, None))


def chars(text: str) -> list[str]:
    return list(text)


@SHARED
async def test_loads_add_and_type_at_once_many_times(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("loads")
    await pilot.pause()
    await pilot.pause()
    names = ["Welder", "Drill", "Kx01", "Grain mill", "Fridge", "Lamp e-3"]
    for rep in range(3):
        for name in names:
            burst(app, ["a", *chars(f"{name}{rep}"), "enter"])
            await pilot.pause()
            row = app.work.current._row()
            assert app.session.project.loads[row].name == f"{name}{rep}"


@SHARED
async def test_loads_edit_replaces_the_old_value_at_once(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("loads")
    await pilot.pause()
    await pilot.pause()
    for hours in ("4", "7.5", "12", "0.5"):
        # Column 3 is hours per day; Enter opens the editor with the value selected.
        app.work.current.table.move_cursor(row=0, column=3)
        await pilot.pause()
        burst(app, ["enter", *chars(hours), "enter", "right", "left"])
        await pilot.pause()
        assert app.session.project.loads[0].hours_per_day == float(hours)
        assert app.focused is app.work.current.table


@SHARED
async def test_ctrl_u_then_digits_in_order(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("loads")
    await pilot.pause()
    await pilot.pause()
    for _ in range(5):
        app.work.current.table.move_cursor(row=1, column=2)
        await pilot.pause()
        burst(app, ["enter", "end", "ctrl+u", *chars("60"), "enter"])
        await pilot.pause()
        assert app.session.project.loads[1].power_w == 60.0


@SHARED
async def test_parts_field_typed_over_at_once(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("parts")
    await pilot.pause()
    await pilot.pause()
    for days in ("2", "3.5", "5"):
        assert app.work.current.reveal("choices.autonomy_days")
        await pilot.pause()
        burst(app, ["enter", *chars(days), "enter"])
        await pilot.pause()
        assert app.session.project.choices.autonomy_days == parse_number(days)


@SHARED
async def test_arrow_keeps_the_old_value_for_editing(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    app.work.action_goto("parts")
    await pilot.pause()
    await pilot.pause()
    before = app.session.project.choices.autonomy_days
    assert app.work.current.reveal("choices.autonomy_days")
    await pilot.pause()
    burst(app, ["enter", "end", "0", "enter"])
    await pilot.pause()
    assert app.session.project.choices.autonomy_days == float(f"{before:g}0")


async def test_percent_and_hemisphere_forms_typed_at_once(state):
    app = demo_app(state, section="parts")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        for typed, want in (("60", 0.6), ("60 %", 0.6), ("0.55", 0.55)):
            assert app.work.current.reveal("choices.max_dod")
            burst(app, ["enter", *chars(typed), "enter"])
            await pilot.pause()
            assert app.session.project.choices.max_dod == want, typed
        app.work.action_goto("place")
        await pilot.pause()
        for path, typed, want in (
            ("site.latitude_deg", "12 N", 12.0),
            ("site.latitude_deg", "12\u00b024' N", 12.4),
            ("site.latitude_deg", "8 30 S", -8.5),
            ("site.longitude_deg", "1 W", -1.0),
            ("site.longitude_deg", "36.8 E", 36.8),
        ):
            assert app.work.current.reveal(path)
            burst(app, ["enter", *chars(typed), "enter"])
            await pilot.pause()
            site = app.session.project.site
            assert getattr(site, path.split(".")[1]) == want, typed
        # A form that cannot be read is refused with the forms to type.
        assert app.work.current.reveal("site.latitude_deg")
        burst(app, ["enter", *chars("12 W"), "enter"])
        await pilot.pause()
        message = str(app.work.current.query_one("#edit-message").content)
        assert "12.4 S or 12\u00b024' S" in message
        assert app.session.project.site.latitude_deg == -8.5  # the last good value


def test_angle_and_fraction_readings():
    from offgrid.tui.fields import parse_angle

    # 12 deg 24 min 36 s = 12 + 24/60 + 36/3600 = 12.41 (sexagesimal, by definition).
    assert parse_angle("12\u00b024'36\" S", "latitude") == -12.41
    assert parse_angle("-1.5", "longitude") == -1.5
    for bad in ("95 N", "12 E", "-12 S", "12 61 N", "north"):
        try:
            parse_angle(bad, "latitude")
        except ValueError:
            continue
        raise AssertionError(bad)
    assert parse_number("60", fraction=True) == 0.6
    assert parse_number("0.6", fraction=True) == 0.6
    assert parse_number("60") == 60.0  # not a fraction field: as typed


def test_new_load_default_matches_load_lists(tmp_path):
    from offgrid.project.loads_csv import load_loads_csv
    from offgrid.tui.session import Session, blank_project

    csv = tmp_path / "l.csv"
    csv.write_text("name,quantity,power_w,hours_per_day\nLamp,1,10,1\n")
    session = Session.unsaved(blank_project(), origin="blank")
    at = session.add_load()
    assert session.project.loads[at].ac_dc == load_loads_csv(csv)[0].ac_dc


async def test_every_applied_edit_reaches_the_recovery_file(state):
    import json

    app = demo_app(state, section="parts")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        for days in ("2", "4", "5.5"):
            assert app.work.current.reveal("choices.autonomy_days")
            burst(app, ["enter", *chars(days), "enter"])
            await pilot.pause()
            # No pause for typing to stop: the copy is there as soon as the writer ran.
            assert app.recovery.flush(2.0)
            body = json.loads(app.recovery.file.read_text())
            assert body["text"] == app.session.text()
            assert f"autonomy_days = {float(days)}" in body["text"]
