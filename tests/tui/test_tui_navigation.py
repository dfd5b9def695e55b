"""Getting to the right place: cautions lead to their input, the palette finds fields."""

from __future__ import annotations

import pytest
from tui_helpers import SIZE, demo_app, screen_text

# the palette, footer and small-defects tests share one demo app (demo_pilot), so the
# async tests run on the module's event loop
ON_THE_MODULE_LOOP = pytest.mark.asyncio(loop_scope="module")


@ON_THE_MODULE_LOOP
async def test_caution_about_the_record_low_goes_to_that_input(state):
    app = demo_app(state, section="cautions")
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        section = app.work.current
        targets = section._targets
        i = next(k for k, (_p, _n, text) in enumerate(targets) if "at the record low" in text)
        section.items.highlighted = i
        await pilot.pause()
        assert "Enter: go to record low temperature" in screen_text(app)
        await pilot.press("enter")
        await pilot.pause()
        assert app.work.section == "place"
        field = app.work.current.fields.current_field()
        assert field is not None and field.path == "climate.record_low_c"
        assert app.focused is app.work.current.fields


@ON_THE_MODULE_LOOP
async def test_every_warning_code_leads_to_an_editable_input():
    from offgrid.tui.fields import PARTS_FIELDS, PROJECT_FIELDS
    from offgrid.tui.sections.cautions import INPUT_FOR_CAUTION, INPUT_FOR_NOTICE
    from offgrid.tui.sections.place import CLIMATE_FIELDS
    from offgrid.tui.sections.wires import WIRING_FIELDS

    editable = {
        f.path
        for f in (*PROJECT_FIELDS, *CLIMATE_FIELDS, *PARTS_FIELDS, *WIRING_FIELDS)
        if not isinstance(f, str)
    }
    for code, path in [*INPUT_FOR_NOTICE.items(), *INPUT_FOR_CAUTION]:
        assert path in editable, (code, path)


@ON_THE_MODULE_LOOP
async def test_command_palette_finds_fields_and_figures_by_their_words(demo_pilot):
    from textual.command import CommandPalette

    pilot = demo_pilot
    app = pilot.app
    for words, section, path in (
        ("record low", "place", "climate.record_low_c"),
        ("days of autonomy", "parts", "choices.autonomy_days"),
        ("battery room temp", "place", "site.battery_temp_c"),
    ):
        await pilot.press("ctrl+p")
        await pilot.pause()
        assert isinstance(app.screen, CommandPalette)
        await pilot.press(*words)
        await pilot.pause(0.6)
        await pilot.press("enter")
        await pilot.pause()
        await pilot.pause()
        assert app.work.section == section, words
        assert app.work.current.fields.current_field().path == path, words
    titles = [c.title for c in app.get_system_commands(app.work)]
    assert any(t.endswith("(4 Sizes)") for t in titles)


@ON_THE_MODULE_LOOP
async def test_footer_keeps_help_and_quit_and_hints_end_at_a_word(demo_pilot):
    pilot = demo_pilot
    app = pilot.app
    for key in "12345678":
        await pilot.press(key)
        await pilot.pause()
        last = screen_text(app).splitlines()[-1]
        assert "? Help" in last and "q Quit" in last, (key, last)
    await pilot.press("1")
    await pilot.pause()
    text = screen_text(app)
    assert "what the file is abo\n" not in text.replace(" \n", "\n")
    for line in text.splitlines()[4:-3]:
        hint = line[57:].rstrip()
        # a hint either fits or ends with an ellipsis after a whole word
        if hint.endswith("\u2026"):
            assert hint[-2] != " "


@ON_THE_MODULE_LOOP
async def test_headline_never_cuts_the_warning_count(state):
    from offgrid.tui.widgets.bars import Headline

    app = demo_app(state)
    async with app.run_test(size=(60, 24)) as pilot:
        await pilot.pause()
        line = str(app.work.query_one(Headline).content)
        assert line.rstrip().endswith(("warnings", "warning", "warn.")), line
        assert len(line) <= 58


def test_months_column_shows_the_count_when_the_list_is_long():
    from offgrid.tui.fields import LOAD_COLUMNS
    from offgrid.tui.sections.loads import LoadsTable

    table = LoadsTable()
    months = next(c for c in LOAD_COLUMNS if c.key == "months")
    assert str(table.cell(months, (1, 2, 3, 4, 10, 11, 12))).strip() == "7 mo"
    assert str(table.cell(months, tuple(range(1, 13)))).strip() == "1-12"


def test_clip_words_keeps_a_word_that_ends_at_the_edge():
    from offgrid.tui.text import clip_words

    assert clip_words("lowest temperature expected, C", 20) == "lowest temperature\u2026"
    assert clip_words("what the file is about", 20) == "what the file is\u2026"
    assert clip_words("short", 20) == "short"


@ON_THE_MODULE_LOOP
async def test_small_defects_line_breaks_and_blank_name(demo_pilot, tmp_path):
    from offgrid.tui.screens.dialogs import MessageDialog
    from offgrid.tui.session import EditRejected

    bad = tmp_path / "notes.toml"
    bad.write_text("this is = = not toml\n[[[\n")
    pilot = demo_pilot
    app = pilot.app
    app.open_path(bad)
    await pilot.pause()
    assert isinstance(app.screen, MessageDialog)
    assert "\u240a" not in screen_text(app)  # line breaks, not their pictures
    await pilot.press("escape")
    await pilot.pause()
    try:
        app.session.set_value("loads[2].name", "")
    except EditRejected as exc:
        message = exc.problems[0].message
    assert message == "the name is blank; give the appliance a name (appliance 2)"
