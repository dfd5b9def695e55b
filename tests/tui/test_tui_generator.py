"""The text UI on the invented hybrid lodge: the generator's cautions are shown (issue 16).

The generator's own figures and simulation are in a dialog from the command list
(tests/tui/test_tui_generator_dialog.py).
"""

from __future__ import annotations

from tui_helpers import SIZE, screen_text

from offgrid.generator.study import hybrid_demo_path
from offgrid.tui.app import make_app


async def test_cautions_section_lists_the_generator_cautions(state):
    app = make_app(hybrid_demo_path(), state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        assert app.session.project.generator is not None
        await pilot.press("6")
        await pilot.pause()
        section = app.work.current
        messages = [m for _p, _n, m in section._targets]
        assert any("carbon monoxide" in m for m in messages)
        assert any("feed back into another supply" in m for m in messages)
        await pilot.press("end")
        await pilot.pause()
        assert "qualified electrician" in screen_text(app)
