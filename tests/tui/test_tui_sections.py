"""Pilot tests at 80x24, one group per section of the work screen."""

from __future__ import annotations

from pathlib import Path

import pytest
from tui_helpers import SIZE, demo_app, edit_field, screen_text, type_into

from offgrid.design.sizing import design
from offgrid.project.model import Load
from offgrid.project.store import load_project
from offgrid.tui.app import make_app
from offgrid.tui.screens.dialogs import ChoiceDialog, ConfirmDialog, PathDialog
from offgrid.tui.screens.sheet import SheetDialog
from offgrid.tui.screens.start import StartScreen
from offgrid.tui.screens.why import WhyDialog
from offgrid.tui.screens.work import WorkScreen
from offgrid.tui.widgets.editbar import EditBar

# ----------------------------------------------------------------------------- start

pytestmark = pytest.mark.asyncio(loop_scope="module")


async def test_start_screen_offers_recent_new_and_open(state, tmp_path):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert isinstance(app.screen, StartScreen)
        text = screen_text(app)
        for words in (
            "New project",
            "Demo: Kisanga Ridge health post",
            "Blank project",
            "Open a project file",
            "household-kit",
        ):
            assert words in text, words
        await pilot.press("d")
        await pilot.pause()
        assert isinstance(app.screen, WorkScreen)
        assert app.session.project.info.demo
        assert "Array 1,800 W" in screen_text(app)


async def test_start_screen_scenario_and_blank(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen = app.screen
        index = next(
            i
            for i, (k, v) in enumerate(screen.choices)
            if k == "scenario" and v.stem == "household-kit"
        )
        screen.query_one("#start-list").highlighted = index
        await pilot.press("enter")
        await pilot.pause()
        s = app.session
        assert s.project.loads[0].name == "LED ceiling light"
        assert s.design is not None and s.path is None
        assert "(demonstration data)" in screen_text(app)
        await pilot.press("n")  # back to the start screen: nothing unsaved, no question
        await pilot.pause()
        assert isinstance(app.screen, StartScreen)
        await pilot.press("b")
        await pilot.pause()
        assert app.session.project.loads == []
        assert "No design" in screen_text(app)


async def test_recent_projects_are_listed(state, tmp_path):
    from offgrid.paths import demo_project_path

    target = tmp_path / "mine.toml"
    target.write_text(demo_project_path().read_text())
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert "Recent projects" in screen_text(app)
        assert "mine.toml" in screen_text(app)


# ----------------------------------------------------------------------------- place


async def test_place_edit_number_and_bad_input_keeps_last_value(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await edit_field(pilot, "place", "site.elevation_m", "1500")
    assert app.session.project.site.elevation_m == 1500.0
    # not a number: message in place, editor stays open, value kept
    await edit_field(pilot, "place", "site.latitude_deg", "north")
    bar = app.screen.query_one("#place-edit", EditBar)
    assert bar.is_open
    assert "'north' is not a latitude: type decimal degrees" in screen_text(app)
    assert app.session.project.site.latitude_deg == -3.4
    # out of range: the limit is shown
    await type_into(pilot, "95")
    assert "a latitude is at most 90 degrees" in screen_text(app)
    assert app.session.project.site.latitude_deg == -3.4
    await pilot.press("escape")
    await pilot.pause()
    assert not bar.is_open
    assert app.session.project.site.latitude_deg == -3.4


async def test_place_tilt_auto_and_value(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    tilt = app.session.design.site.tilt_deg
    assert f"automatic \u2192 {tilt:.0f} deg" in screen_text(app)
    await edit_field(pilot, "place", "site.tilt_deg", "15")
    assert app.session.project.site.tilt_deg == 15.0
    assert app.session.design.site.tilt_deg == 15.0
    await edit_field(pilot, "place", "site.tilt_deg", "auto")
    assert app.session.project.site.tilt_deg is None


async def test_place_albedo_one_value_or_twelve(demo_pilot):
    # snow-month reflectance as in Duffie & Beckman 4th ed. Example 2.19.1
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    snow = "0.7 0.7 0.4 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.4"
    await edit_field(pilot, "place", "site.albedo", snow)
    assert app.session.project.site.albedo == [float(v) for v in snow.split()]
    assert "0.7 Jan-Feb" in screen_text(app)
    await edit_field(pilot, "place", "site.albedo", "0.3")
    assert app.session.project.site.albedo == 0.3
    # eleven values or one out of range: refused with the fix, the last value kept
    await edit_field(pilot, "place", "site.albedo", " ".join(["0.2"] * 11))
    assert "twelve" in screen_text(app)
    await type_into(pilot, "0.7 0.7 1.4 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.4")
    assert "outside 0-1" in screen_text(app)
    assert app.session.project.site.albedo == 0.3
    await pilot.press("escape")
    await edit_field(pilot, "place", "site.albedo", "auto")
    assert app.session.project.site.albedo is None


async def test_place_pick_climate_and_type_months(state):
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.new_blank()
        await pilot.pause()
        work = app.work
        work.action_goto("place")
        await pilot.press("c")
        await pilot.pause()
        dialog = app.screen
        assert isinstance(dialog, ChoiceDialog)
        index = [v for v, _label in dialog.options].index(("ref", "kisanga-ridge-demo"))
        dialog.query_one("#choices").highlighted = index
        await pilot.press("enter")
        await pilot.pause()
        project = app.session.project
        assert project.climate.ref == "kisanga-ridge-demo"
        assert project.site.latitude_deg == -3.4  # taken from the climate
        # own months: a copy, then one month and then all twelve typed at once
        await pilot.press("m")
        await pilot.pause()
        inline = app.session.project.climate.inline
        assert inline is not None and inline.insolation_kwh_m2_day[0] == 6.1
        table = work.current.months
        assert table.has_focus
        table.move_cursor(row=0, column=3)  # March sun
        await pilot.press("enter")
        await type_into(pilot, "5.5")
        assert app.session.project.climate.inline.insolation_kwh_m2_day[2] == 5.5
        table.move_cursor(row=1, column=1)
        await pilot.press("enter")
        await type_into(pilot, "20 20 20 20 20 20 18 18 20 20 20 20")
        assert app.session.project.climate.inline.temp_mean_c[6] == 18.0
        # impossible sun: refused with the unit hint, kept
        table.move_cursor(row=0, column=1)
        await pilot.press("enter")
        await type_into(pilot, "25")
        assert "outside 0-12 kWh/m2/day" in screen_text(app)
        assert app.session.project.climate.inline.insolation_kwh_m2_day[0] == 6.1


# ----------------------------------------------------------------------------- loads


async def test_loads_add_edit_duplicate_move_delete(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("2")
    await pilot.pause()
    loads = lambda: app.session.project.loads  # noqa: E731
    n = len(loads())
    before = app.session.design.loads.daily_energy_wh[0]
    table = app.work.current.table
    table.move_cursor(row=n - 1, column=0)
    await pilot.press("a")  # add after the last: the name editor opens at once
    await pilot.pause()
    assert len(loads()) == n + 1
    await type_into(pilot, "Water filter pump")
    assert loads()[n].name == "Water filter pump"
    table.move_cursor(row=n, column=2)
    await pilot.press("enter")
    await type_into(pilot, "40")
    assert loads()[n].power_w == 40.0
    after = app.session.design.loads.daily_energy_wh[0]
    assert after > before  # the design followed the edit
    # bad cell: message, value kept
    table.move_cursor(row=n, column=3)
    await pilot.press("enter")
    await type_into(pilot, "30")
    assert "outside 0-24 hours" in screen_text(app)
    assert loads()[n].hours_per_day == 1.0
    await pilot.press("escape")
    await pilot.press("d")
    await pilot.pause()
    assert len(loads()) == n + 2 and loads()[n + 1].name == "Water filter pump"
    await pilot.press("K")
    await pilot.pause()
    assert loads()[n].name == "Water filter pump" and table.cursor_row == n
    await pilot.press("x")
    await pilot.pause()
    assert len(loads()) == n + 1
    await pilot.press("u")
    await pilot.pause()
    assert len(loads()) == n + 2


async def test_loads_choice_and_months_cells(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("2")
    table = app.work.current.table
    table.move_cursor(row=0, column=4)  # AC/DC
    await pilot.press("enter")
    await pilot.pause()
    assert isinstance(app.screen, ChoiceDialog)
    await pilot.press("up", "enter")  # AC
    await pilot.pause()
    assert app.session.project.loads[0].ac_dc == "ac"
    table.move_cursor(row=0, column=7)  # months
    await pilot.press("enter")
    await type_into(pilot, "11-2")
    assert app.session.project.loads[0].months == (1, 2, 11, 12)
    table.move_cursor(row=0, column=7)
    await pilot.press("enter")
    await type_into(pilot, "13")
    assert "outside 1-12" in screen_text(app)


async def test_loads_names_with_markup_and_escapes_are_literal(demo_pilot, tmp_path):
    tricky = "[bold]Pump[/] [link=http://x]x[/link] \x1b[31mred\x1b[0m"
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("2")
    table = app.work.current.table
    table.move_cursor(row=0, column=0)
    await pilot.press("enter")
    await type_into(pilot, tricky)
    assert app.session.project.loads[0].name == tricky
    app.work.current.table.move_cursor(row=0, column=0)
    await pilot.pause()
    text = screen_text(app)
    assert "[bold]Pump" in text  # markup shown, not applied
    assert "\x1b" not in text
    await pilot.press("w")  # the why dialog shows the whole name
    await pilot.pause()
    text = screen_text(app)
    assert "\x1b" not in text and "\u241b[31mred" in text  # ESC as a visible symbol
    await pilot.press("escape")
    # editing something else keeps the name byte for byte
    table.move_cursor(row=0, column=1)
    await pilot.press("enter")
    await type_into(pilot, "2")
    target = tmp_path / "tricky.toml"
    app.session.save(target)
    assert load_project(target).loads[0].name == tricky


async def test_loads_import_and_export_csv(demo_pilot, tmp_path):
    csv = tmp_path / "kit.csv"
    csv.write_text("name,quantity,power_w,hours_per_day,ac_dc\nRadio,1,10,4,dc\nTV,1,60,3,ac\n")
    bad = tmp_path / "bad.csv"
    bad.write_text("name,quantity,power_w,hours_per_day\nLamp,1,ten,4\n")
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("2", "i")
    await pilot.pause()
    assert isinstance(app.screen, PathDialog)
    await type_into(pilot, str(bad))
    assert "'ten' is not a number" in screen_text(app)  # problems listed, nothing imported
    await pilot.press("escape")
    n = len(app.session.project.loads)
    await pilot.press("i")
    await pilot.pause()
    await type_into(pilot, str(csv))
    assert isinstance(app.screen, ConfirmDialog)
    await pilot.press("a")  # add to the list
    await pilot.pause()
    assert len(app.session.project.loads) == n + 2
    await pilot.press("e")
    await pilot.pause()
    out = tmp_path / "out.csv"
    await type_into(pilot, str(out))
    assert out.read_text().splitlines()[0].startswith("name,quantity,power_w")
    assert "TV,1,60,3,ac" in out.read_text()


# ----------------------------------------------------------------------------- parts


async def test_parts_autonomy_changes_battery_and_why(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    ah = app.session.design.battery.capacity_ah
    await edit_field(pilot, "parts", "choices.autonomy_days", "5")
    assert app.session.project.choices.autonomy_days == 5.0
    assert app.session.design.battery.capacity_ah > ah
    assert f"{app.session.design.battery.capacity_ah:,.0f} Ah" in screen_text(app)
    await pilot.press("w")
    await pilot.pause()
    assert isinstance(app.screen, WhyDialog)
    text = " ".join(screen_text(app).replace("\u2588", " ").split())
    assert "days of autonomy" in text and "IEEE" in text


async def test_parts_choice_dialog_for_system_voltage(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await edit_field_choice(pilot, "choices.system_voltage")
    assert isinstance(app.screen, ChoiceDialog)
    await pilot.press("up", "enter")  # from 48 V to 24 V
    await pilot.pause()
    assert app.session.project.choices.system_voltage == 24
    assert app.session.design.battery.system_voltage_v == 24


async def edit_field_choice(pilot, path):
    work = pilot.app.work
    work.action_goto("parts")
    await pilot.pause()
    work.current.reveal(path)
    await pilot.press("enter")
    await pilot.pause()


async def test_parts_module_datasheet_edited_as_a_whole(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await edit_field_choice(pilot, "module.pmax_w")
    assert isinstance(app.screen, SheetDialog)
    sheet = app.screen
    values = {
        "module.pmax_w": "400",
        "module.vmp_v": "41",
        "module.imp_a": "9.76",
        "module.voc_v": "49.5",
        "module.isc_a": "10.3",
    }
    for i, f in enumerate(sheet.fields):
        if f.path in values:
            sheet.query_one(f"#in{i}").value = values[f.path]
    # a single inconsistent value is refused with the reason, nothing changes
    imp = next(i for i, f in enumerate(sheet.fields) if f.path == "module.imp_a")
    sheet.query_one(f"#in{imp}").value = "12"
    await pilot.press("enter")
    await pilot.pause()
    assert isinstance(app.screen, SheetDialog)
    assert "must be below Isc" in screen_text(app)
    assert app.session.project.module.pmax_w == 300.0
    sheet.query_one(f"#in{imp}").value = "9.76"
    await pilot.press("enter")
    await pilot.pause()
    assert not isinstance(app.screen, SheetDialog)
    assert app.session.project.module.pmax_w == 400.0
    assert app.session.design.array.module_power_w == 400.0


# ----------------------------------------------------------------------------- sizes


async def test_sizes_figures_chart_and_reason(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("4")
    await pilot.pause()
    text = screen_text(app)
    assert "Supply to battery" in text and "\u25c0 design" in text
    # the design month is the least-covered month: November on the demo (supply/use
    # 1.35 against July's 1.37), with every month's derates
    assert "Nov" in text.split("\u25c0 design")[0].splitlines()[-1]
    table = app.work.current.table
    table.move_cursor(row=1)
    await pilot.press("w")
    await pilot.pause()
    text = screen_text(app)
    assert "Array power" in text and "modules in series x strings in parallel" in text
    assert "Source" in text
    await pilot.press("escape")
    await pilot.pause()
    assert isinstance(app.screen, WorkScreen)


async def test_sizes_chart_marks_the_least_covered_month(demo_pilot):
    from offgrid.tui.widgets.monthchart import MonthChart

    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("4")
    await pilot.pause()
    chart = app.work.current.query_one(MonthChart)
    rows = chart.render().plain.splitlines()[1:13]
    ratios = [float(r.split("\u25c0")[0].split()[-1]) for r in rows]
    marked = [i for i, r in enumerate(rows) if "\u25c0 design" in r]
    assert marked == [ratios.index(min(ratios))]
    assert min(ratios) >= 1.0  # every month covered


async def test_every_figure_row_has_a_reason(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    from offgrid.tui.screens.why import find_reason
    from offgrid.tui.sections.sizes import figure_rows

    d = app.session.design
    for row in figure_rows(d):
        if isinstance(row, str):
            continue
        _path, reason = find_reason(d.reasons, row[2])
        assert reason is not None, row


# ----------------------------------------------------------------------------- wires


async def test_wires_without_electrical_design_shows_main_circuits(demo_pilot):
    import dataclasses

    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    d = dataclasses.replace(app.session.design, electrical=None)
    app.session.outcome.design = d
    app.work.action_goto("wires")
    await pilot.pause()
    text = screen_text(app)
    from offgrid.catalogue import figure_entry

    assert figure_entry("array.string_voc_cold_v").label in text
    assert f"{d.array.string_voc_cold_v:.1f} V" in text


async def test_wires_runs_and_length_edit(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("5")
    await pilot.pause()
    runs = app.session.design.electrical.wires
    text = screen_text(app)
    assert "array to controller" in text and runs[1].size in text
    table = app.work.current.table
    table.move_cursor(row=1, column=3)  # the array run's length
    await pilot.press("enter")
    await type_into(pilot, "60")
    assert app.session.project.wiring.array_run_m == 60.0
    longer = app.session.design.electrical.wires[1]
    assert longer.length_m == 60.0 and longer.area_mm2 >= runs[1].area_mm2
    table.move_cursor(row=1, column=3)
    await pilot.press("enter")
    await type_into(pilot, "5000")
    assert "out of range" in screen_text(app)
    assert app.session.project.wiring.array_run_m == 60.0
    await pilot.press("escape")
    table.move_cursor(row=1, column=4)  # its size: why
    await pilot.press("w")
    await pilot.pause()
    assert "NEC" in screen_text(app) and "ampacity" in screen_text(app)
    await pilot.press("escape", "p")
    await pilot.pause()
    assert "Fuses, breakers and disconnects" in screen_text(app)


async def test_parts_inverter_on_all_year_choice(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    work = app.work
    work.action_goto("parts")
    await pilot.pause()
    assert work.current.reveal("inverter.on_all_year")
    await pilot.pause()
    assert app.session.project.inverter.on_all_year is False
    await pilot.press("enter")
    await pilot.pause()
    assert isinstance(app.screen, ChoiceDialog)
    await pilot.press("down", "enter")  # yes, all year
    await pilot.pause()
    assert app.session.project.inverter.on_all_year is True


async def test_wires_show_both_currents(demo_pilot):
    # Max A: maximum continuous current (ampacity, fuse); Drop A: the operating current of
    # the voltage drop (issue 11).  The demo's array run: 24.4 A max, 18.5 A operating.
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("5")
    await pilot.pause()
    w = app.session.design.electrical.wires[1]
    text = screen_text(app)
    assert "Max A" in text and "Drop A" in text
    row = next(ln for ln in text.splitlines() if "array to controller" in ln)
    assert f"{w.current_a:.1f}" in row and f"{w.operating_current_a:.1f}" in row
    app.work.current.table.move_cursor(row=1, column=5)  # its Drop A: why
    await pilot.press("w")
    await pilot.pause()
    assert "operating current" in screen_text(app)


async def test_wires_dc_load_length_stays_with_the_load_when_it_is_renamed(demo_pilot):
    # Loads own their cables (issue 14): Wires edits the run's own project path
    # (WireChoice.length_path, loads[N].run_m); renaming the load on Loads keeps it.
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("5")
    await pilot.pause()
    runs = app.session.design.electrical.wires
    row = next(i for i, r in enumerate(runs) if r.key == "load1")
    assert runs[row].length_path == "loads[1].run_m"
    table = app.work.current.table
    table.move_cursor(row=row, column=3)
    await pilot.press("enter")
    await type_into(pilot, "25")
    assert app.session.project.loads[0].run_m == 25.0
    await pilot.press("2")
    await pilot.pause()
    app.work.current.table.move_cursor(row=0, column=0)
    await pilot.press("enter")
    await type_into(pilot, "Renamed lights")
    assert app.session.project.loads[0].name == "Renamed lights"
    assert app.session.project.loads[0].run_m == 25.0
    await pilot.press("5")
    await pilot.pause()
    wire = next(r for r in app.session.design.electrical.wires if r.key == "load1")
    assert wire.length_m == 25.0 and "Renamed lights" in wire.run
    row_text = next(ln for ln in screen_text(app).splitlines() if "Renamed ligh" in ln)
    assert " 25.0 " in row_text  # the name is clipped to the column at 80 columns
    app.work.current.table.move_cursor(row=row, column=3)
    await pilot.pause()
    assert "loads[1].run_m" in app.work.current.figure().extra  # why: the field it sets


# ----------------------------------------------------------------------------- cautions


async def test_cautions_lists_warnings_and_safety(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    # many lead-acid strings in parallel: the engine warns
    await edit_field(pilot, "parts", "battery.capacity_ah", "100")
    n = sum(1 for w in app.session.design.warnings if w.severity != "info")
    assert n >= 1
    assert f"{n} warning" in screen_text(app)
    await pilot.press("6")
    await pilot.pause()
    text = screen_text(app)
    assert "WARNING" in text and "parallel" in text
    await pilot.press("end")
    await pilot.pause()
    assert "defers to local electrical codes" in screen_text(app)
    section = app.work.current
    index = next(
        i
        for i, (_p, n, _m) in enumerate(section._targets)
        if n is not None and n.code == "lead-acid-parallel"
    )
    section.items.highlighted = index
    await pilot.press("enter")  # to the input the warning is about
    await pilot.pause()
    assert app.work.section == "parts"
    assert app.work.current.fields.current_field().path == "battery.capacity_ah"


async def test_no_design_is_explained_and_leads_to_the_field(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await edit_field(pilot, "parts", "controller.max_pv_voltage_v", "40")
    assert app.session.design is None
    assert "No design" in screen_text(app)
    await pilot.press("6")
    await pilot.pause()
    assert "NO DESIGN" in screen_text(app)
    await pilot.press("enter")
    await pilot.pause()
    assert app.work.section == "parts"


# ----------------------------------------------------------------------------- keys


async def test_help_lists_every_binding_with_a_description(state):
    app = demo_app(state)
    async with app.run_test(size=(100, 150)) as pilot:
        await pilot.pause()
        await pilot.press("question_mark")
        await pilot.pause()
        text = screen_text(app)
        from offgrid.tui.sections.loads import LoadsSection
        from offgrid.tui.sections.place import PlaceSection

        for cls in (WorkScreen, LoadsSection, PlaceSection):
            for b in cls.BINDINGS:
                if b.id and b.id.startswith("go.") and b.key.isdigit():
                    continue
                assert b.description in text, b.description


async def test_command_palette_reaches_the_actions(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    titles = [c.title for c in app.get_system_commands(app.work)]
    for needed in (
        "Save",
        "Save as",
        "Open",
        "Revert",
        "Undo",
        "Redo",
        "Why?",
        "Add (2 Loads)",
        "Copy (2 Loads)",
        "Delete (2 Loads)",
        "Import (2 Loads)",
        "Export (2 Loads)",
        "Climate (1 Place)",
        "Months (1 Place)",
        "Go to Sizes",
        "Sunlight colours",
        "Help",
        "Quit",
        "Start screen",
    ):
        assert needed in titles, needed
    await pilot.press("ctrl+p")
    await pilot.pause()
    from textual.command import CommandPalette

    assert isinstance(app.screen, CommandPalette)
    await pilot.press(*"add (2 loads")
    await pilot.pause(0.5)
    await pilot.press("enter")
    await pilot.pause()
    await pilot.pause()
    assert app.work.section == "loads"
    assert len(app.session.project.loads) == 10


async def test_sunlight_theme_toggles(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("t")
    assert app.theme == "offgrid-sunlight"
    await pilot.press("t")
    assert app.theme == "offgrid-night"


async def test_letter_keys_type_into_the_editor(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    work = app.work
    work.current.reveal("site.name")
    await pilot.press("enter")
    await pilot.pause()
    app.focused.value = ""
    await pilot.press(*"sq2w", "enter")  # keys that are actions elsewhere
    await pilot.pause()
    assert app.session.project.site.name == "sq2w"
    assert work.section == "place" and app.is_running


async def test_demo_design_matches_engine(state):
    from offgrid.paths import demo_project_path

    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        expected = design(load_project(demo_project_path()))
        assert app.session.design.to_dict() == expected.to_dict()
        assert isinstance(app.session.project.loads[0], Load)


async def wait_until(pilot, condition, seconds: float = 20.0) -> None:
    """Let worker threads finish: pause until ``condition()`` holds."""
    import time

    end = time.monotonic() + seconds
    while not condition() and time.monotonic() < end:
        await pilot.pause(0.1)
    assert condition()


async def test_place_imports_a_weather_file_in_the_background(state, tmp_path):
    # NREL TMY3 sample for Greensboro NC shipped with pvlib (an open dataset)
    import pvlib

    from offgrid.tui.screens.dialogs import MessageDialog

    tmy3 = Path(pvlib.__file__).resolve().parent / "data" / "723170TYA.CSV"
    app = make_app(state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.new_blank()
        await pilot.pause()
        app.work.action_goto("place")
        await pilot.press("c")
        await pilot.pause()
        dialog = app.screen
        index = [v for v, _label in dialog.options].index(("file", ""))
        dialog.query_one("#choices").highlighted = index
        await pilot.press("enter")
        await pilot.pause()
        await type_into(pilot, str(tmy3))
        await wait_until(pilot, lambda: isinstance(app.screen, MessageDialog))
        assert "Climate imported" in screen_text(app)
        climate = app.session.project.climate.inline
        assert climate is not None and len(climate.insolation_kwh_m2_day) == 12
        assert abs(app.session.project.site.latitude_deg - 36.1) < 0.1  # from the file
        await pilot.press("escape")


async def test_place_climate_check_offers_a_fix(demo_pilot):
    from offgrid.tui.screens.dialogs import ChoiceDialog

    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    # insolation typed in MJ/m2/day by mistake (x 3.6): above 12 is refused outright,
    # so use values that fit 0-12 but exceed the site's clear-sky limit
    await pilot.press("m")
    await pilot.pause()
    table = app.work.current.months
    table.move_cursor(row=0, column=1)
    await pilot.press("enter")
    await type_into(pilot, " ".join(["11.5"] * 12))
    await pilot.press("k")
    await wait_until(pilot, lambda: isinstance(app.screen, ChoiceDialog))
    dialog = app.screen
    assert any(v is not None for v, _label in dialog.options), "no fix offered"
    index = next(i for i, (v, _l) in enumerate(dialog.options) if v is not None)
    dialog.query_one("#choices").highlighted = index
    await pilot.press("enter")
    await pilot.pause()
    assert max(app.session.project.climate.inline.insolation_kwh_m2_day) < 11.5


def slow_simulation(monkeypatch, release):
    """The real study of the demo, handed out slowly until ``release`` is set."""
    import time

    import offgrid.simulate.run as run
    from offgrid.paths import demo_project_path
    from offgrid.simulate.balance import SimulationCancelled

    real = run.simulate_project(
        load_project(demo_project_path()), demo_project_path().parent, years=5, with_tradeoff=False
    )

    def fake(project, base=None, *, progress=None, cancelled=None, **kw):
        for i in range(1000):
            if cancelled and cancelled():
                raise SimulationCancelled()
            if progress:
                progress(min(1.0, i / 100))
            if release.is_set():
                return real
            time.sleep(0.01)
        return real

    monkeypatch.setattr(run, "simulate_project", fake)


async def test_risk_check_runs_in_the_background_while_editing(state, monkeypatch):
    import threading

    release = threading.Event()
    slow_simulation(monkeypatch, release)
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("7", "g")
        await pilot.pause()
        risk = app.work.current
        assert risk.running
        assert "Simulating" in screen_text(app)
        # the UI keeps working: edit a value while the simulation runs
        await edit_field(pilot, "parts", "choices.autonomy_days", "4")
        assert app.session.project.choices.autonomy_days == 4.0
        assert risk.running
        release.set()
        await wait_until(pilot, lambda: not risk.running, 30)
        assert risk.result is not None
        app.work.action_goto("risk")
        await pilot.pause()
        text = screen_text(app)
        assert "Out of date" in text and "Loss-of-load probability" in text
        await pilot.press("w")
        await pilot.pause()
        assert "Source" in screen_text(app)


async def test_risk_check_can_be_stopped(state, monkeypatch):
    import threading

    slow_simulation(monkeypatch, threading.Event())
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("7", "g")
        await pilot.pause()
        risk = app.work.current
        assert risk.running
        await pilot.press("x")
        await wait_until(pilot, lambda: not risk.running, 5)  # stops within moments
        assert not risk.running and risk.result is None
        assert "Press g" in screen_text(app)


async def test_risk_check_real_run(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await pilot.press("7", "g")
    risk = app.work.current
    await wait_until(pilot, lambda: risk.result is not None, 60)
    text = screen_text(app)
    assert "Result for the design as it is now" in text
    # the trade-off's rows: the catalogue's table title and figure labels
    from offgrid.catalogue import figure_entry, table_entry

    assert table_entry("tradeoff").title in text
    assert figure_entry("tradeoff.targets[].design_capacity_needed_wh").label in text
