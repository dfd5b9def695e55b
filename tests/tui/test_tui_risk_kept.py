"""Risk results are kept with the project (with the inputs they ran on) and exported."""

from __future__ import annotations

import json
import time

from tui_helpers import SIZE, edit_field, screen_text

from offgrid.paths import demo_project_path
from offgrid.tui.app import make_app


async def wait_until(pilot, condition, seconds: float = 60.0) -> None:
    end = time.monotonic() + seconds
    while not condition() and time.monotonic() < end:
        await pilot.pause(0.1)
    assert condition()


async def test_risk_result_survives_reopen_goes_stale_and_is_exported(state, tmp_path):
    target = tmp_path / "clinic.toml"
    target.write_text(demo_project_path().read_text())
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("7", "g")
        risk = app.work.current
        await wait_until(pilot, lambda: risk.result is not None)
        lolp = risk.result.report.reliability.lolp
    # kept as JSON (no pickle) with the project text it was run on: its inputs
    kept = sorted(state.glob("risk-*"))
    assert [k.suffix for k in kept] == [".json"]
    body = json.loads(kept[0].read_text())
    assert body["project_text"] == app.session.text()
    assert body["report"]["reliability"]["lolp"] == lolp
    # reopened: the last run is there, for the project as it is
    app = make_app(target, state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("7")
        await pilot.pause()
        risk = app.work.current
        assert risk.result is not None
        assert risk.result.report.reliability.lolp == lolp
        assert "Result for the design as it is now" in screen_text(app)
        # exported from the UI: the report has the reliability section of that run
        out = tmp_path / "report.txt"
        app._export("report", out, False)
        await wait_until(pilot, out.exists, 30)
        text = out.read_text()
        assert "Loss-of-load probability" in text
        # the design changes: the kept run is marked out of date and not exported
        await edit_field(pilot, "parts", "choices.autonomy_days", "5")
        await pilot.press("7")
        await pilot.pause()
        assert "Out of date" in screen_text(app)
        assert risk.current_report(app.session) is None
