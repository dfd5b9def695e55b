"""Place section: the climate picker shows display names, nearest first, with each source;
the user's own climates (XDG_DATA_HOME, a temporary folder here) are offered beside them."""

from __future__ import annotations

from tui_helpers import SIZE, demo_app, screen_text

from offgrid.cli import main
from offgrid.climate.files import climate_library
from offgrid.tui.screens.dialogs import ChoiceDialog
from offgrid.tui.sections.place import climate_picker_entries


def _import_user_climate(tmp_path) -> None:
    # invented monthly values for a made-up site next to the demo site (-3.4, 36.9)
    src = tmp_path / "near.csv"
    src.write_text(
        "# latitude_deg = -3.3\n# longitude_deg = 36.8\n"
        "month,insolation_kwh_m2_day,temp_mean_c\n" + "".join(f"{m},5.5,20\n" for m in range(1, 13))
    )
    assert main(["climate", "import", str(src), "--name", "Ridge Top Survey"]) == 0


def test_entries_are_sorted_by_distance_from_the_site(tmp_path):
    _import_user_climate(tmp_path)
    entries, sorted_by = climate_picker_entries(-3.4, 36.9)
    assert sorted_by == "distance"
    assert [e.name for e in entries[:2]] == ["kisanga-ridge-demo", "ridge-top-survey"]
    assert entries[1].origin == "yours"
    far = [e.distance_km for e in entries]
    assert far == sorted(far)
    # a site still at 0, 0 (not set yet): by name, since distance from there means nothing
    entries, sorted_by = climate_picker_entries(0.0, 0.0)
    assert sorted_by == "name"
    assert [e.title for e in entries] == sorted(e.title for e in climate_library())


async def test_picker_shows_display_names_distance_and_source(state, tmp_path):
    _import_user_climate(tmp_path)
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        app.work.action_goto("place")
        await pilot.pause()
        await pilot.press("c")
        await pilot.pause()
        dialog = app.screen
        assert isinstance(dialog, ChoiceDialog)
        values = [v for v, _label in dialog.options]
        assert values[0] == ("ref", "kisanga-ridge-demo")  # the site's own climate first
        assert values[1] == ("ref", "ridge-top-survey")
        text = screen_text(app)
        assert "Kisanga Ridge (demo)" in text and "Ridge Top Survey" in text
        assert "kisanga-ridge-demo" not in text  # display names, not file names
        assert "yours" in text and "bundled" in text and " km" in text
        assert "Invented demonstration climate" in text  # the source under the name
        assert "nearest first" in text
        assert max(len(line.rstrip()) for line in text.splitlines()) <= 80
        # choosing the user's climate names it in the project
        dialog.query_one("#choices").highlighted = 1
        await pilot.press("enter")
        await pilot.pause()
        assert app.session.project.climate.ref == "ridge-top-survey"
        assert app.session.design is not None
