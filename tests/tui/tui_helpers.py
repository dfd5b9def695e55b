"""Helpers for the text-UI tests: reading the screen, typing into fields."""

from __future__ import annotations

from pathlib import Path

from offgrid.tui.app import OffgridApp, make_app

SIZE = (80, 24)


def screen_text(app: OffgridApp) -> str:
    """The characters on screen, line by line (what a person would read)."""
    update = app.screen._compositor.render_full_update(simplify=True)
    return "\n".join("".join(strip.text for strip in line) for line in update.strips)


def demo_app(state: Path, **kwargs) -> OffgridApp:
    return make_app(demo=True, state=state, **kwargs)


async def type_into(pilot, text: str) -> None:
    """Replace the focused box's text with ``text`` and press Enter.

    Waits for an edit box to have the focus first: on a busy machine the box that the
    last key opened can take a moment to be focused.
    """
    from textual.widgets import Input

    await wait_for(pilot, lambda: isinstance(pilot.app.focused, Input))
    box = pilot.app.focused
    box.value = text
    await pilot.press("enter")
    await pilot.pause()


async def edit_field(pilot, section: str, path: str, text: str) -> None:
    """Go to ``section``, put the cursor on field ``path``, edit it to ``text``."""
    work = pilot.app.work
    work.action_goto(section)
    await pilot.pause()
    assert work.current.reveal(path), path
    await pilot.pause()
    await pilot.press("enter")
    await pilot.pause()
    await type_into(pilot, text)


async def edit_autonomy(pilot, days: str):
    """Edit the days of autonomy in Parts to ``days`` and wait until the field table has
    the focus again (the edit applied); returns that table."""
    from offgrid.tui.widgets.fieldtable import FieldTable

    work = pilot.app.work
    work.action_goto("parts")
    await pilot.pause()
    assert work.current.reveal("choices.autonomy_days")
    await pilot.pause()
    await pilot.press("enter")
    await type_into(pilot, days)
    table = work.current.query_one(FieldTable)
    await wait_for(pilot, lambda: pilot.app.focused is table)
    await pilot.pause()
    return table


async def wait_for(pilot, condition, timeout_s: float = 10.0) -> None:
    """Pause until ``condition()`` holds (a busy machine paints late); fail after the timeout."""
    import time

    end = time.monotonic() + timeout_s
    while not condition():
        if time.monotonic() > end:
            raise AssertionError(f"not reached within {timeout_s} s: {condition}")
        await pilot.pause(0.05)


async def reset_demo(pilot) -> None:
    """Put a shared app back to a fresh demo project on section Place.

    Closes dialogs and open editors, stops the workers (risk check, imports), and
    shows a new demo session, as a newly started app would.
    """
    from offgrid.tui.screens.work import WorkScreen
    from offgrid.tui.session import demo_session
    from offgrid.tui.widgets.editbar import EditBar

    app = pilot.app
    while not isinstance(app.screen, WorkScreen):
        app.pop_screen()
        await pilot.pause()
    work = app.screen
    app.workers.cancel_all()
    for bar in work.query(EditBar):
        if bar.is_open:
            bar.close()
    app.clear_notifications()
    from offgrid.tui.sections.options import OptionsSection

    for options in work.query(OptionsSection):
        if options.showing_prices:
            options.action_toggle_prices()
    work.replace_session(demo_session())
    work.action_goto("place")
    app.recovery.clear()
    await pilot.pause()


def short_generator_study(monkeypatch, release=None, years: int = 3) -> None:
    """The generator dialog's hybrid study run by the real engine over ``years`` instead of
    the dialog's 20 (0.5 s of CPU instead of 4: the tests that take it are about the dialog,
    the study's figures are checked in tests/test_generator_*.py), and held back until
    ``release`` (a ``threading.Event``) is set when one is given, so that a test knows the
    study is still running while it acts."""
    import offgrid.generator.study as study

    real = study.generator_study

    def short(project, base=None, **kwargs):
        if release is not None and not release.wait(60):
            raise AssertionError("the held study was never released")
        return real(project, base, **{"years": years, **kwargs})

    monkeypatch.setattr(study, "generator_study", short)
