"""How long a notice stays: each notice its own time, or ``OFFGRID_NOTICE_SECONDS`` for all.

The tests that wait for notices to go (tests/tui/test_tmux.py) set the variable so that
they wait a fraction of a second per notice instead of two to eight; without it every
notice keeps the time its caller asked for.
"""

from __future__ import annotations

import time

import pytest
from tui_helpers import SIZE, demo_app, screen_text, wait_for

from offgrid.tui.app import notice_seconds


@pytest.mark.parametrize(
    "setting,asked,expected",
    [
        (None, 2.0, 2.0),  # no setting: the caller's time
        (None, None, None),  # no setting, no time asked: Textual's default
        ("0.4", 2.0, 0.4),
        ("0.4", None, 0.4),
        ("0,4", 8.0, 8.0),  # not a number: ignored
        ("", 2.0, 2.0),
        ("-1", 2.0, 2.0),  # not positive: ignored
        ("0", 2.0, 2.0),
        ("nan", 2.0, 2.0),
        ("inf", 2.0, 2.0),
    ],
)
def test_notice_seconds_reads_the_setting_or_keeps_the_asked_time(setting, asked, expected):
    env = {} if setting is None else {"OFFGRID_NOTICE_SECONDS": setting}
    assert notice_seconds(asked, env) == expected


async def test_a_notice_goes_after_the_set_time(state, monkeypatch):
    monkeypatch.setenv("OFFGRID_NOTICE_SECONDS", "0.3")
    app = demo_app(state)
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        app.notify("Nothing to undo", timeout=5)
        await wait_for(pilot, lambda: "Nothing to undo" in screen_text(app))
        shown_at = time.monotonic()
        await wait_for(pilot, lambda: "Nothing to undo" not in screen_text(app), timeout_s=4.0)
        assert time.monotonic() - shown_at < 4.0  # not the asked 5 s


async def test_without_the_setting_a_notice_keeps_its_time(state, monkeypatch):
    monkeypatch.delenv("OFFGRID_NOTICE_SECONDS", raising=False)
    app = demo_app(state)
    async with app.run_test(size=SIZE, notifications=True) as pilot:
        app.notify("Nothing to undo", timeout=30)
        await wait_for(pilot, lambda: "Nothing to undo" in screen_text(app))
        await pilot.pause(0.6)  # twice the 0.3 s above: a 30 s notice is still there
        assert "Nothing to undo" in screen_text(app)
