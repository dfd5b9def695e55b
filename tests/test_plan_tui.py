"""The planning screen of the text UI at 80x24 (demo community, invented data)."""

from __future__ import annotations

from textual.app import App
from textual.widgets import DataTable, Static

from offgrid.tui.screens.plan import PlanScreen


class PlanApp(App):
    def __init__(self, **kw) -> None:
        super().__init__()
        self.kw = kw

    def on_mount(self) -> None:
        self.push_screen(PlanScreen(**self.kw))


async def _planned(app, pilot):
    await app.workers.wait_for_complete()
    await pilot.pause()
    return app.screen


async def test_demo_plans_and_shows_kits_rows_totals(tmp_path):
    app = PlanApp(kits=3, report_path=tmp_path / "plan.md")
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _planned(app, pilot)
        assert screen.plan is not None and screen.plan.demo
        kits = screen.query_one("#kits", DataTable)
        assert kits.row_count == len(screen.plan.standard.kits) <= 3
        status = str(screen.query_one("#plan-status", Static).content)
        assert "systems" in status and "kit type" in status
        await pilot.press("2")
        assert screen.query_one("#rows", DataTable).row_count == len(screen.plan.rows)
        await pilot.press("3")
        assert screen.query_one("#totals", DataTable).row_count > 5
        await pilot.press("plus")
        screen = await _planned(app, pilot)
        assert screen.request.kits == 4 and len(screen.plan.standard.kits) <= 4
        await pilot.press("e")
        await pilot.pause()
        assert (tmp_path / "plan.md").read_text().startswith("# ")


async def test_a_bad_survey_says_why(tmp_path):
    bad = tmp_path / "bad.csv"
    bad.write_text("climate,kisanga-ridge-demo\nid,count,power\nA,1,3\n")
    app = PlanApp(path=bad)
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _planned(app, pilot)
        assert screen.plan is None
        assert "Cannot plan" in str(screen.query_one("#plan-status", Static).content)
        await pilot.press("escape")  # leaves the notes view, the screen stays


async def test_the_planning_screen_opens_a_programme(tmp_path):
    """The invented three-village demo programme at 80x24: kits, villages, totals, report."""
    from offgrid.plan.programme import demo_programme_path

    app = PlanApp(path=demo_programme_path(), kits=4, report_path=tmp_path / "prog.md")
    async with app.run_test(size=(80, 24)) as pilot:
        screen = await _planned(app, pilot)
        assert screen.is_programme and screen.plan.demo
        assert screen.query_one("#kits", DataTable).row_count == len(screen.plan.kits) <= 4
        status = str(screen.query_one("#plan-status", Static).content)
        assert "3 villages" in status and "systems" in status
        await pilot.press("2")
        assert screen.query_one("#rows", DataTable).row_count == 3
        await pilot.press("3")
        assert screen.query_one("#totals", DataTable).row_count > 5
        await pilot.press("minus")
        screen = await _planned(app, pilot)
        assert screen.request.kits == 3 and len(screen.plan.kits) <= 3
        await pilot.press("e")
        await pilot.pause()
        assert "## Villages" in (tmp_path / "prog.md").read_text()
