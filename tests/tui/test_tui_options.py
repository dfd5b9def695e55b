"""Pilot tests at 80x24 for section 8, Options: variants side by side and the price list.

The figures compared come from the engine (offgrid.economics.variants.compare_variants);
these tests check that the screen shows them, marks the differences where the engine
says they differ, and that every edit is validated and can be undone.
"""

from __future__ import annotations

import pytest
from tui_helpers import SIZE, demo_app, screen_text, type_into, wait_for

from offgrid.economics.variants import compare_variants, flatten_overrides
from offgrid.tui.screens.dialogs import ChoiceDialog, MessageDialog, PathDialog
from offgrid.tui.screens.help import HelpDialog
from offgrid.tui.screens.why import WhyDialog
from offgrid.tui.sections.options import COMMON, OptionsSection
from offgrid.tui.widgets.editbar import EditBar

pytestmark = pytest.mark.asyncio(loop_scope="module")


async def to_options(pilot) -> OptionsSection:
    await pilot.pause()
    await pilot.press("8")
    await settle(pilot)
    section = pilot.app.work.current
    assert isinstance(section, OptionsSection)
    return section


async def settle(pilot) -> None:
    await pilot.pause()
    await pilot.app.workers.wait_for_complete()
    await pilot.pause()


def cursor_on(section: OptionsSection, label: str, column: int) -> None:
    """Put the comparison cursor on the row labelled ``label``, compared column ``column``."""
    for i, row in enumerate(section._rows):
        name = row[0] if isinstance(row, tuple) else row.label
        if name == label:
            section.table.move_cursor(row=i, column=column + 1, animate=False)
            return
    raise AssertionError(label)


def price_cursor_on(section: OptionsSection, what: str, value, column: int = 1) -> None:
    for i, row in enumerate(section._price_rows):
        if row == (what, value):
            section.prices.move_cursor(row=i, column=column, animate=False)
            return
    raise AssertionError((what, value))


async def pick(pilot, value) -> None:
    dialog = pilot.app.screen
    assert isinstance(dialog, ChoiceDialog)
    index = next(i for i, (v, _label) in enumerate(dialog.options) if v == value)
    dialog.query_one("#choices").highlighted = index
    await pilot.press("enter")
    await pilot.pause()


# ----------------------------------------------------------------------------- variants


async def test_options_show_variants_side_by_side_with_differences_marked(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    text = screen_text(app)
    for words in (
        "8 Options",
        "Base design",
        "PWM controller",
        "Lithium bank",
        "* differs from the base",
    ):
        assert words in text, words
    # the marks follow the engine's own comparison of the same project
    expected = compare_variants(app.session.project, app.session.base_dir)
    shown = section.result.comparison
    assert [r.differs for r in shown.rows] == [r.differs for r in expected.rows]
    modules = expected.row("Modules")
    assert modules.differs == (False, True, False)
    assert f"* {modules.texts[1]}" in text  # the PWM column's module layout, marked
    assert "* pwm" in text
    assert "* mppt" not in text  # the base value is never marked


async def test_options_add_a_variant_from_a_choice_then_undo(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("a")
    await pilot.pause()
    assert isinstance(app.screen, ChoiceDialog)
    assert [c.key for c in COMMON][:3] == ["controller", "chemistry", "voltage"]
    await pick(pilot, "voltage")
    await pick(pilot, 24)
    await settle(pilot)
    variants = app.session.project.variants
    assert len(variants) == 3
    assert flatten_overrides(variants[-1].overrides) == [("choices.system_voltage", 24)]
    row = section.result.comparison.row("System voltage")
    assert row.texts[-1] == "24" and row.differs[-1]
    assert "* 24 V" in screen_text(app)
    await pilot.press("u")
    await settle(pilot)
    assert len(app.session.project.variants) == 2
    assert len(section.result.comparison.columns) == 3


async def test_options_chemistry_preset_variant_designs(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("a")
    await pilot.pause()
    await pick(pilot, "chemistry")
    await pick(pilot, "lifepo4")
    await settle(pilot)
    over = dict(flatten_overrides(app.session.project.variants[-1].overrides))
    # 2 V gel cells become single 3.2 V LFP cells (nominal cell voltage, common
    # practice, no source); depth of discharge from the engine's chemistry preset
    assert over["battery.chemistry"] == "lifepo4"
    assert over["battery.nominal_voltage_v"] == 3.2
    assert over["battery.max_dod"] == 0.8
    col = section.result.comparison.columns[-1]
    assert col.error is None and col.design is not None


async def test_options_number_override_is_validated_and_edited_in_place(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("a")
    await pilot.pause()
    await pick(pilot, "autonomy")
    bar = app.screen.query_one("#options-edit", EditBar)
    assert bar.is_open
    await type_into(pilot, "many")
    assert "'many' is not a number" in screen_text(app)
    await type_into(pilot, "-2")
    assert bar.is_open and len(app.session.project.variants) == 2
    assert "autonomy" in screen_text(app).lower()
    await type_into(pilot, "5")
    await settle(pilot)
    assert not bar.is_open
    assert dict(flatten_overrides(app.session.project.variants[-1].overrides)) == {
        "choices.autonomy_days": 5.0
    }
    base_ah = section.result.comparison.row("Battery capacity installed").values[0]
    assert section.result.comparison.row("Battery capacity installed").values[-1] > base_ah
    # edit the override of that column in place
    cursor_on(section, "choices.autonomy_days", 3)
    await pilot.press("enter")
    await pilot.pause()
    assert bar.is_open
    await type_into(pilot, "4")
    await settle(pilot)
    assert dict(flatten_overrides(app.session.project.variants[-1].overrides)) == {
        "choices.autonomy_days": 4.0
    }


async def test_options_rename_and_delete(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    cursor_on(section, "name", 1)
    await pilot.press("enter")
    await pilot.pause()
    await type_into(pilot, "Lithium bank")  # already used by the other option
    assert "used twice" in screen_text(app)
    assert app.session.project.variants[0].name == "PWM controller"
    await type_into(pilot, "Cheap controller")
    await settle(pilot)
    assert app.session.project.variants[0].name == "Cheap controller"
    cursor_on(section, "name", 0)
    await pilot.press("x")  # the base cannot be deleted
    await pilot.pause()
    assert len(app.session.project.variants) == 2
    cursor_on(section, "name", 2)
    await pilot.press("x")
    await settle(pilot)
    assert [v.name for v in app.session.project.variants] == ["Cheap controller"]
    assert "Lithium bank" not in screen_text(app)


async def test_options_why_on_a_variant_cost_shows_the_formula(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    cursor_on(section, "Lifecycle cost", 2)
    await pilot.press("w")
    await pilot.pause()
    assert isinstance(app.screen, WhyDialog)
    text = screen_text(app)
    # Duffie & Beckman 4th ed. ch. 11: LCC = capital + PW replacements + PW upkeep
    assert "capital + present worth of replacements" in text
    assert "Lithium bank" in text


# ----------------------------------------------------------------------------- prices


async def test_prices_edit_in_place_with_validation(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("p")
    await pilot.pause()
    text = screen_text(app)
    assert "Price list: 13 line(s)" in text and "controller:MPPT" in text
    assert "USD" in text
    price_cursor_on(section, "price", 3)  # controller:MPPT
    await pilot.press("enter")
    await pilot.pause()
    bar = app.screen.query_one("#options-edit", EditBar)
    assert bar.is_open
    await type_into(pilot, "")
    assert "type the price of one unit of 'controller:MPPT'" in screen_text(app)
    await type_into(pilot, "0")
    assert "a price must be above zero" in screen_text(app)
    await type_into(pilot, "-40")
    assert "a price must be above zero" in screen_text(app)
    assert app.session.project.prices[3].unit_price == 320.0
    capital = section._cost.capital
    await type_into(pilot, "350")
    assert not bar.is_open
    assert app.session.project.prices[3].unit_price == 350.0
    # one MPPT controller in the demo design: capital rises by the difference,
    # plus installation as a share of the parts (common practice, no source)
    share = 1 + app.session.project.economics.installation_pct / 100
    assert abs(section._cost.capital - capital - 30 * share) < 1e-6
    await pilot.press("u")
    await pilot.pause()
    assert app.session.project.prices[3].unit_price == 320.0


async def test_prices_missing_part_gets_a_price(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("p")
    await pilot.pause()
    price_cursor_on(section, "price", 5)  # inverter
    await pilot.press("x")
    await pilot.pause()
    assert all(p.part != "inverter" for p in app.session.project.prices)
    missing = section._cost.missing
    assert missing and missing[0].startswith("inverter")
    assert "1 part(s) without a price" in screen_text(app)
    assert "no price" in screen_text(app)  # the costs cannot be summed
    price_cursor_on(section, "missing", missing[0])
    await pilot.press("enter")
    await pilot.pause()
    await type_into(pilot, "400")
    assert app.session.project.prices[-1].part == missing[0]
    assert app.session.project.prices[-1].unit_price == 400.0
    assert section._cost.complete


async def test_prices_add_line_and_currency(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("p")
    await pilot.pause()
    await pilot.press("a")
    await pilot.pause()
    await type_into(pilot, "fuse")
    assert "already has a price" in screen_text(app)
    await type_into(pilot, "mounting-frame")
    await pilot.pause()
    await type_into(pilot, "abc")
    assert "'abc' is not a number" in screen_text(app)
    await type_into(pilot, "75")
    assert app.session.project.prices[-1].part == "mounting-frame"
    assert app.session.project.prices[-1].unit_price == 75.0
    price_cursor_on(section, "price", 0, column=2)
    await pilot.press("enter")
    await pilot.pause()
    await type_into(pilot, "12")
    assert "currency code" in screen_text(app)
    await type_into(pilot, "kes")
    assert app.session.project.economics.currency == "KES"
    assert "KES" in screen_text(app)


async def test_prices_import_csv(state, tmp_path):
    good = tmp_path / "quote.csv"
    good.write_text("part,unit_price,note\ncontroller:MPPT,299,new quote\nbracket,12.5,\n")
    bad = tmp_path / "bad.csv"
    bad.write_text("part,unit_price\nfuse,-3\n")
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await to_options(pilot)
        await pilot.press("p")
        await pilot.pause()
        await pilot.press("i")
        await pilot.pause()
        assert isinstance(app.screen, PathDialog)
        await type_into(pilot, str(bad))
        assert isinstance(app.screen, MessageDialog)
        assert "row 2" in screen_text(app) and "above zero" in screen_text(app)
        await pilot.press("escape")
        await pilot.pause()
        assert next(p for p in app.session.project.prices if p.part == "fuse").unit_price == 18
        await pilot.press("i")
        await pilot.pause()
        await type_into(pilot, str(good))
        prices = {p.part: p.unit_price for p in app.session.project.prices}
        assert prices["controller:MPPT"] == 299.0 and prices["bracket"] == 12.5
        assert len(prices) == 14


async def test_prices_why_shows_the_cost_formula(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    await pilot.press("p")
    await pilot.pause()
    price_cursor_on(section, "cost", "costs.capital")
    await pilot.press("w")
    await pilot.pause()
    assert isinstance(app.screen, WhyDialog)
    text = screen_text(app)
    assert "sum of quantity x unit price" in text
    await pilot.press("escape")
    await pilot.pause()
    price_cursor_on(section, "cost", "costs.cost_per_kwh")
    await pilot.press("w")
    await pilot.pause()
    assert "PWF(N, 0, d)" in screen_text(app)  # Duffie & Beckman 4th ed. ch. 11


async def test_options_keys_are_in_help_and_footer(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await to_options(pilot)
    footer = screen_text(app).splitlines()[-1]
    # ? and q first; the section's own keys after them (w, s and the rest are in ?)
    for words in (
        "? Help",
        "q Quit",
        "a Add",
        "x Delete",
        "c Add change",
        "p Prices",
        "g Risk",
    ):
        assert words in footer, words
    await pilot.press("question_mark")
    await pilot.pause()
    assert isinstance(app.screen, HelpDialog)
    groups = dict(app.help_groups())
    words = {b.description for b in groups["8 Options"]}
    assert {"Add", "Delete", "Add change", "Prices", "Risk"} <= words
    assert {b.description for b in groups["8 Options, prices (p)"]} >= {
        "Add",
        "Delete",
        "Import",
    }
    assert "8 Options" in screen_text(app)


async def test_options_with_the_risk_check(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    assert section.result.comparison.row("Loss-of-load probability") is None
    await pilot.press("g")
    await settle(pilot)
    cmp = section.result.comparison
    assert section.result.with_risk
    lolp = cmp.row("Loss-of-load probability")
    # each column simulated: a probability in per cent, 0-100
    assert all(v is not None and 0 <= v <= 100 for v in lolp.values)
    assert all(c.reliability is not None for c in cmp.columns)
    cursor_on(section, "Loss-of-load probability", 1)
    await pilot.press("w")
    await pilot.pause()
    assert isinstance(app.screen, WhyDialog)
    assert "synthetic weather years" in screen_text(app)
    await pilot.press("escape")
    await pilot.press("g")
    await settle(pilot)
    assert section.result.comparison.row("Loss-of-load probability") is None


# ----------------------------------------------------------------------------- horizon


async def test_place_horizon_profile_is_typed_and_validated(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await wait_for(pilot, lambda: "z Horizon" in screen_text(app).splitlines()[-1])
    # every key of the Place footer whole at 80 columns, the last one too
    assert "w Why" in screen_text(app).splitlines()[-1]
    array_w = app.session.design.array.power_w
    await pilot.press("z")
    await pilot.pause()
    bar = app.screen.query_one("#place-edit", EditBar)
    assert bar.is_open
    await type_into(pilot, "90:10, 400:5")
    assert "outside 0-360" in screen_text(app)
    await type_into(pilot, "90:95")
    assert "outside 0-90" in screen_text(app)
    await type_into(pilot, "90 10")
    assert "azimuth:elevation" in screen_text(app)
    assert app.session.project.site.horizon_deg == []
    # hills of 50 deg all round hide the beam for most of the day: the array grows
    # (beam removed below the profile, climate/horizon.py; common practice, no source)
    await type_into(pilot, "0:50, 90:50, 180:50, 270:50")
    assert not bar.is_open
    assert app.session.project.site.horizon_deg == [
        (0.0, 50.0),
        (90.0, 50.0),
        (180.0, 50.0),
        (270.0, 50.0),
    ]
    assert app.session.design.array.power_w > array_w
    await pilot.press("z")
    await pilot.pause()
    assert app.screen.query_one("#place-edit", EditBar).input.value.startswith("0:50, 90:50")
    await type_into(pilot, "")
    assert app.session.project.site.horizon_deg == []
    await pilot.press("u")
    await pilot.pause()
    assert len(app.session.project.site.horizon_deg) == 4


async def test_command_list_reaches_the_price_list_and_horizon(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    await pilot.pause()
    await settle(pilot)
    commands = {c.title: c for c in app.get_system_commands(app.screen)}
    commands["Prices (8 Options)"].callback()
    await settle(pilot)
    section = app.work.current
    assert isinstance(section, OptionsSection) and section.showing_prices
    assert "Price list: 13 line(s)" in screen_text(app)
    commands["Horizon (1 Place)"].callback()
    await pilot.pause()
    assert app.work.section == "place"
    assert app.screen.query_one("#place-edit", EditBar).is_open


async def test_options_add_a_second_change_to_an_option(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    section = await to_options(pilot)
    cursor_on(section, "name", 0)
    await pilot.press("c")  # the base takes no changes
    await pilot.pause()
    assert not isinstance(app.screen, ChoiceDialog)
    cursor_on(section, "name", 1)  # PWM controller
    await pilot.press("c")
    await pilot.pause()
    await pick(pilot, "voltage")
    await pick(pilot, 24)
    await settle(pilot)
    v = app.session.project.variants[0]
    assert dict(flatten_overrides(v.overrides)) == {
        "controller.type": "pwm",
        "choices.system_voltage": 24,
    }
    assert len(app.session.project.variants) == 2
    row = section.result.comparison.row("System voltage")
    assert row.texts[1] == "24" and row.differs[1]
