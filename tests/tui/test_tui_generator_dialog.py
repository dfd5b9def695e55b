"""The generator dialog of the text UI at 80x24 (issue 16): opened from the command list,
the setup figures at once, the hybrid study from its worker thread, read-only."""

from __future__ import annotations

import asyncio
import copy

from tui_helpers import SIZE, demo_app, screen_text, short_generator_study

from offgrid.design.sizing import design
from offgrid.generator.hybrid import generator_setup
from offgrid.generator.study import hybrid_demo_path
from offgrid.project.store import load_project
from offgrid.tui.app import make_app
from offgrid.tui.screens.generator import (
    GeneratorDialog,
    caution_lines,
    open_generator,
    setup_lines,
    study_lines,
)


async def _wait_done(pilot, dialog, seconds: float = 60.0) -> None:
    for _ in range(int(seconds / 0.1)):
        if dialog.done:
            break
        await asyncio.sleep(0.1)
        await pilot.pause()
    assert dialog.done, "the study did not finish"


async def test_palette_opens_the_dialog_and_the_study_fills_in(state, monkeypatch):
    import threading

    release = threading.Event()  # the study ends once the test has seen it running
    short_generator_study(monkeypatch, release)
    app = make_app(hybrid_demo_path(), state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        before = app.session.text()
        await pilot.press("ctrl+p")
        await pilot.pause()
        await pilot.press(*"Generator", "space", *"beside")
        await pilot.pause(0.5)
        await pilot.press("enter")
        await pilot.pause()
        dialog = app.screen
        assert isinstance(dialog, GeneratorDialog)
        text = screen_text(app)
        assert "Generator beside the sun" in text
        assert "Derated output" in text and "Fuel line" in text and "Check:" in text
        assert "Simulating" in text  # the study is still running in its worker
        release.set()
        await _wait_done(pilot, dialog)
        study = str(dialog.query_one("#generator-study").content)
        assert "run hours" in study and "L/yr" in study and "Cheapest mix" in study
        dialog.query_one("#generator-body").scroll_to_widget(
            dialog.query_one("#generator-study"), animate=False, top=True
        )
        await pilot.pause()
        text = screen_text(app)
        assert "run hours" in text and "solar fraction" in text and "Cheapest mix" in text
        dialog.query_one("#generator-body").scroll_end(animate=False)
        await pilot.pause()
        assert "qualified electrician" in screen_text(app)  # the cautions end the dialog
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, GeneratorDialog)
        assert app.session.text() == before  # read-only: nothing edited


async def test_no_generator_is_a_notice(state):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        open_generator(app.work)
        await pilot.pause()
        assert not isinstance(app.screen, GeneratorDialog)


def test_lines_carry_the_engine_figures_and_fit_the_dialog():
    """The text is the setup's and the study's own figures (not typed in), 72 columns."""
    from offgrid.generator.study import generator_study

    p = load_project(hybrid_demo_path())
    base = hybrid_demo_path().parent
    s = generator_setup(p, design(p, base), base)
    lines = setup_lines(s)
    assert f"Derated output {s.derating.derated_kw:.2f} kW" in "\n".join(lines)
    assert f"{s.fuel.b_l_per_kwh:.4f} L/kWh" in "\n".join(lines)
    st = generator_study(copy.deepcopy(p), base, years=3)
    more = study_lines(st)
    joined = "\n".join(more)
    assert f"fuel {st.run.fuel_l_per_year:.0f} L/yr" in joined
    assert f"solar fraction {st.run.solar_fraction:.1%}" in joined
    assert f"Cheapest mix: {st.mix.cheapest.array_w:.0f} W" in joined
    tail = caution_lines(s)
    assert any("carbon monoxide" in ln for ln in tail)
    assert all(len(ln) <= 72 for ln in lines + more + tail), max(lines + more, key=len)


async def test_closing_before_the_study_ends_is_harmless(state, monkeypatch):
    import threading

    release = threading.Event()  # the study ends only after the dialog is closed
    short_generator_study(monkeypatch, release)
    app = make_app(hybrid_demo_path(), state=state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        open_generator(app.work)
        await pilot.pause()
        dialog = app.screen
        assert isinstance(dialog, GeneratorDialog)
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, GeneratorDialog)
        assert not dialog.done  # closed before the study ended
        release.set()
        await app.workers.wait_for_complete()
        await pilot.pause()
        assert app.is_running and not isinstance(app.screen, GeneratorDialog)
