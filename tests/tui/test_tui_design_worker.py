"""The design is worked out on a worker thread after the first paint; a result that a
newer request has superseded is never shown (issue 19, speed)."""

from __future__ import annotations

import threading

from tui_helpers import SIZE, screen_text, wait_for

from offgrid.tui.app import make_app
from offgrid.tui.screens import work as work_module
from offgrid.tui.session import compute_outcome, demo_session


def held_engine(monkeypatch):
    """The worker's engine call waits for ``release``; the UI thread's does not."""
    release = threading.Event()

    def slow(project, base):
        if threading.current_thread() is not threading.main_thread():
            assert release.wait(30)
        return compute_outcome(project, base)

    monkeypatch.setattr(work_module, "compute_outcome", slow)
    return release


async def test_frame_first_then_the_design(state, monkeypatch):
    release = held_engine(monkeypatch)
    app = make_app(demo=True, state=state, check_recovery=False)
    app.pilots_wait_for_design = False
    async with app.run_test(size=SIZE) as pilot:
        await wait_for(pilot, lambda: app.work is not None and app.work.design_seq == 1)
        await pilot.pause()
        text = screen_text(app)
        assert "Working out the design" in text and "1 Place" in text
        assert "Array" not in text  # no figure before the design is in
        assert app.session.design is None
        release.set()
        await wait_for(pilot, lambda: not app.work.design_pending)
        await pilot.pause()
        assert "Array 1,800 W" in screen_text(app)


async def test_a_superseded_result_is_dropped(state, monkeypatch):
    release = held_engine(monkeypatch)
    app = make_app(demo=True, state=state, check_recovery=False)
    app.pilots_wait_for_design = False
    async with app.run_test(size=SIZE) as pilot:
        await wait_for(pilot, lambda: app.work is not None and app.work.design_seq == 1)
        work = app.work
        # an edit while the first design is still being worked out: computed at once
        work.session.set_value("choices.autonomy_days", 5.0)
        work.changed()
        mine = work.session.design
        assert mine is not None and work.design_seq == 2
        release.set()  # the first request's result (4 days) arrives late
        await wait_for(pilot, lambda: work.designs_dropped == 1)
        await pilot.pause()
        assert work.session.design is mine
        fresh = compute_outcome(work.session.project, work.session.base_dir).design
        assert mine.battery.capacity_ah == fresh.battery.capacity_ah
        assert f"{mine.battery.capacity_ah:,.0f} Ah" in screen_text(app)


async def test_opening_another_project_drops_the_old_ones_design(state, monkeypatch):
    release = held_engine(monkeypatch)
    app = make_app(demo=True, state=state, check_recovery=False)
    app.pilots_wait_for_design = False
    async with app.run_test(size=SIZE) as pilot:
        await wait_for(pilot, lambda: app.work is not None and app.work.design_seq == 1)
        work = app.work
        other = demo_session()
        other.project.info.name = "Second project"
        work.replace_session(other)  # request 2, for the other session
        release.set()
        await wait_for(pilot, lambda: not work.design_pending)
        await pilot.pause()
        assert work.designs_dropped == 1  # request 1 was for the first session
        assert work.session is other and other.design is not None
        assert "Second project" in screen_text(app)


async def test_the_engine_memo_lives_as_long_as_the_app(state):
    """Held open for the app's edits, ended with it: later designs in the process (the
    CLI, planning's own scoped memo) see no entries of it."""
    from offgrid.design.pv import fit_module
    from offgrid.memo import memo_active

    app = make_app(demo=True, state=state, check_recovery=False)
    async with app.run_test(size=SIZE):
        assert memo_active() and fit_module.cache
    assert not memo_active() and fit_module.cache == {}
