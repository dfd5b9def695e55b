"""Snapshots of the main screens at 80x24 and at 120x40 (Textual is pinned: they change
between releases; review a diff with `pytest --snapshot-report` before updating)."""

from __future__ import annotations

import pytest

from offgrid.tui.app import make_app

SMALL = (80, 24)
LARGE = (120, 40)


def demo(state):
    return make_app(demo=True, state=state, check_recovery=False)


@pytest.mark.parametrize(
    "keys",
    [[], ["2"], ["3"], ["4"], ["5"], ["6"], ["7"]],
    ids=["place", "loads", "parts", "sizes", "wires", "cautions", "risk"],
)
def test_sections_80x24(snap_compare, state, keys):
    assert snap_compare(demo(state), press=keys, terminal_size=SMALL)


@pytest.mark.parametrize("keys", [["2"], ["4"]], ids=["loads", "sizes"])
def test_sections_120x40(snap_compare, state, keys):
    assert snap_compare(demo(state), press=keys, terminal_size=LARGE)


def test_start_screen(snap_compare, state):
    assert snap_compare(make_app(state=state, check_recovery=False), terminal_size=SMALL)


def test_why_dialog(snap_compare, state):
    assert snap_compare(demo(state), press=["4", "down", "w"], terminal_size=SMALL)


def test_help(snap_compare, state):
    assert snap_compare(demo(state), press=["question_mark"], terminal_size=SMALL)


def test_sunlight_theme(snap_compare, state):
    assert snap_compare(demo(state), press=["t", "4"], terminal_size=SMALL)


def test_editing_with_a_refused_value(snap_compare, state):
    async def run_before(pilot):
        await pilot.pause()
        work = pilot.app.work
        work.current.reveal("site.latitude_deg")
        await pilot.press("enter")
        await pilot.pause()
        box = pilot.app.focused
        box.cursor_blink = False
        box.value = "95"
        await pilot.press("enter")
        await pilot.pause()

    assert snap_compare(demo(state), run_before=run_before, terminal_size=SMALL)
