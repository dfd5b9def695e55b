"""The array's I-V and P-V curves on screen, and ASCII under vt100 or NO_COLOR."""

from __future__ import annotations

import numpy as np
from tui_helpers import SIZE, demo_app, screen_text

from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.tui.screens.curves import CurvesDialog, array_curves
from offgrid.tui.widgets.ivplot import draw


def demo_curves():
    project = load_project(demo_project_path())
    d = design(project, demo_project_path().parent)
    return project, d, array_curves(project, d)


def test_curves_agree_with_the_design():
    _project, d, curves = demo_curves()
    er = d.electrical
    series = er.strings.layout.series
    design_month, cold, hot = curves
    # The design condition is the engine's own MPP, times the modules in series.
    assert design_month.mpp[0] == er.mpp.vmp_v * series
    assert design_month.mpp[1] == er.mpp.imp_a
    # Cold open circuit against NEC 690.7(A) (temperature-coefficient method, the
    # design's string_voc_cold_v): the single-diode model at full sun agrees within 3 %.
    assert abs(cold.voltage_v[-1] / er.strings.string_voc_cold_v - 1) < 0.03
    # Hot: the MPP voltage is the design's hot Vmp (same model, same condition).
    assert abs(hot.mpp[0] / er.strings.string_vmp_hot_v - 1) < 1e-6
    # Colder means higher voltage, hotter lower (common practice, no source).
    assert cold.voltage_v[-1] > design_month.voltage_v[-1] > hot.voltage_v[-1]
    # The PWM point sits at the battery's charging voltage on the curve.
    vo, io = design_month.pwm
    assert vo == er.harvest.charging_voltage_v
    assert abs(io - np.interp(vo, design_month.voltage_v, design_month.current_a)) < 1e-9


def test_drawing_marks_mpp_pwm_and_window_and_plain_is_ascii():
    _p, _d, curves = demo_curves()
    fancy = "\n".join(draw(curves[0], 72, 14))
    assert "M" in fancy and "P" in fancy and "\u2502" in fancy
    plain = "\n".join(draw(curves[0], 72, 14, plain=True))
    assert plain.isascii() and "M" in plain and "P" in plain and "|" in plain
    assert max(len(line) for line in plain.splitlines()) <= 72


async def test_v_opens_the_curves_and_2_shows_the_cold_one(state):
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("v")
        await pilot.pause()
        assert isinstance(app.screen, CurvesDialog)
        text = screen_text(app)
        assert "design month" in text and "maximum power" in text
        assert "controller window" in text
        await pilot.press("2")
        await pilot.pause()
        assert "cold: record low" in screen_text(app)
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, CurvesDialog)


async def test_no_color_draws_ascii_bars(state, monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    app = demo_app(state)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        lines = screen_text(app).splitlines()
        assert "[1 Place]" in lines[1]
        assert "\u2502" not in lines[0] + lines[2]
        await pilot.press("v")
        await pilot.pause()
        assert "\u2022" not in screen_text(app)
