"""The help screen and the command palette are built from the bindings.

A key shown in the help or the palette is the key that works: every binding of every
section (and of the tables inside it) shows the same keys and description in both,
its action exists where the binding lives, and a binding taken away is gone from both.
These tests share one running app (``demo_pilot``, see conftest.py).
"""

from __future__ import annotations

import pytest

from offgrid.tui.commands import own_bindings
from offgrid.tui.screens.work import WorkScreen, section_class
from offgrid.tui.widgets.bars import SECTIONS

pytestmark = pytest.mark.asyncio(loop_scope="module")


def section_bindings():
    """(group title, owner class, binding) for every described binding of every section."""
    for n, (sid, title, _what) in enumerate(SECTIONS, start=1):
        cls = section_class(sid)
        for owner in (cls, *cls.KEY_WIDGETS):
            part = getattr(owner, "KEY_GROUP", "")
            group = f"{n} {title}, {part}" if part else f"{n} {title}"
            for b in own_bindings(owner):
                if b.description:
                    yield group, owner, b


def shown_keys(app, binding) -> str:
    # what the footer shows for each key, computed here from Textual directly
    from textual.binding import Binding

    return ", ".join(
        app.get_key_display(Binding(k.strip(), binding.action)) for k in binding.key.split(",")
    )


async def test_every_section_has_its_keys_listed():
    found = list(section_bindings())
    owners = {owner.__name__ for _g, owner, _b in found}
    # the sections with keys of their own, and the tables that carry keys
    assert {"PlaceSection", "LoadsSection", "RiskSection", "OptionsSection"} <= owners
    assert {"LoadsTable", "VariantTable", "PriceTable", "RunsTable", "ClimateTable"} <= owners
    for _g, owner, b in found:
        action = b.action.split("(")[0]
        assert hasattr(owner, f"action_{action}"), (owner.__name__, b.action)


async def test_help_and_palette_show_the_same_key_and_description(demo_pilot):
    app = demo_pilot.app
    groups = dict(app.help_groups())
    commands = {c.title: c.help for c in app.get_system_commands(app.screen)}
    for group, _owner, b in section_bindings():
        keys = shown_keys(app, b)
        rows = [r for r in groups[group] if r.description == b.description]
        assert rows, (group, b.description)
        assert keys in [r.keys for r in rows], (group, b.description, keys)
        title = f"{b.description} ({group})"
        assert title in commands, title
        assert commands[title].startswith(f"key {keys}"), (title, commands[title])
    # the work screen's and the app's keys too
    for cls in (WorkScreen, type(app)):
        for b in own_bindings(cls):
            if b.description and b.action != "command_palette":
                assert b.description in commands, b.description
                assert shown_keys(app, b) in commands[b.description]


async def test_the_help_screen_shows_what_the_bindings_say(demo_pilot):
    from tui_helpers import screen_text

    from offgrid.tui.screens.help import HelpDialog

    app = demo_pilot.app
    await demo_pilot.press("2")
    await demo_pilot.press("question_mark")
    await demo_pilot.pause()
    assert isinstance(app.screen, HelpDialog)
    text = screen_text(app)
    assert "You are in 2 Loads" in text
    from offgrid.tui.sections.loads import LoadsSection

    for b in own_bindings(LoadsSection):
        line = next((ln for ln in text.splitlines() if f" {b.description} " in f" {ln} "), None)
        assert line is not None, b.description
        assert line.strip("\u2588 ").startswith(shown_keys(app, b)), line


async def test_a_binding_taken_away_is_gone_from_help_and_palette(demo_pilot, monkeypatch):
    from offgrid.tui.sections.loads import LoadsSection

    app = demo_pilot.app

    def listed() -> tuple[set[str], set[str]]:
        groups = dict(app.help_groups())
        help_rows = {f"{r.keys} {r.description}" for r in groups["2 Loads"]}
        titles = {c.title for c in app.get_system_commands(app.screen)}
        return help_rows, titles

    help_rows, titles = listed()
    assert "d Copy" in help_rows and "Copy (2 Loads)" in titles
    kept = [b for b in LoadsSection.BINDINGS if b.id != "loads.duplicate"]
    monkeypatch.setattr(LoadsSection, "BINDINGS", kept)
    help_rows, titles = listed()
    assert "d Copy" not in help_rows and "Copy (2 Loads)" not in titles
    assert "a Add" in help_rows and "Add (2 Loads)" in titles  # the others stay


async def test_a_palette_command_runs_its_binding_in_its_section(demo_pilot):
    app = demo_pilot.app
    commands = {c.title: c for c in app.get_system_commands(app.screen)}
    before = len(app.session.project.loads)
    commands["Copy (2 Loads)"].callback()
    await demo_pilot.pause()
    await demo_pilot.pause()
    assert app.work.section == "loads"
    assert len(app.session.project.loads) == before + 1
    commands["Undo"].callback()
    await demo_pilot.pause()
    assert len(app.session.project.loads) == before


async def test_the_shared_app_is_reset_between_tests(demo_pilot):
    # the test before copied an appliance and left section Loads
    app = demo_pilot.app
    assert app.work.section == "place"
    assert not app.session.dirty
    assert len(app.session.project.loads) == 9
