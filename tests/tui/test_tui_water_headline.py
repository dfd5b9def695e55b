"""A project that only pumps water: the headline says where its design is."""

from __future__ import annotations

import shutil

from tui_helpers import screen_text

from offgrid.paths import demo_water_path
from offgrid.tui.app import make_app


async def test_water_only_project_headline_points_to_the_water_design(state, tmp_path):
    path = tmp_path / "water.toml"
    shutil.copy(demo_water_path(), path)
    app = make_app(path, state=state)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        text = screen_text(app)
        assert "No design" in text and "Water pumping" in text
