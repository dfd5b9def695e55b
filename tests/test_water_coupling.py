"""The pump on the array: operating points against hand-solved intersections."""

from __future__ import annotations

import math

import numpy as np
import pytest

from offgrid.design.pv import calcparams_desoto, fit_module, module_mpp
from offgrid.design.result import DesignError
from offgrid.project.model import ModuleSpec
from offgrid.project.water_model import PumpSpec
from offgrid.water.coupling import ArrayLayout, controller_input_power_w, direct_operating_point
from offgrid.water.pump import flow_at_power_m3_h, pump_at_head


def _resistive_point_by_bisection(il, i0, rs, rsh, a, r_module_ohm):
    """Independent hand method: with V = I R, the single-diode equation
    I = IL - I0 (exp((V + I Rs)/a) - 1) - (V + I Rs)/Rsh becomes one equation in I,
    f(I) = IL - I0 (exp(I (R + Rs)/a) - 1) - I (R + Rs)/Rsh - I, falling in I from
    f(0) = IL > 0; bisection on [0, IL] in plain floats."""
    lo, hi = 0.0, il
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        x = mid * (r_module_ohm + rs)
        f = il - i0 * math.expm1(x / a) - x / rsh - mid
        lo, hi = (mid, hi) if f > 0 else (lo, mid)
    i = 0.5 * (lo + hi)
    return i * r_module_ohm, i


@pytest.mark.parametrize(("g", "tc"), [(1000.0, 25.0), (400.0, 40.0)])
@pytest.mark.parametrize("r_ohm", [4.0, 12.0])
def test_direct_point_matches_a_resistive_load_solved_by_hand(g, tc, r_ohm):
    # A resistor R across a 2-series x 1-parallel array: each module sees R/2.  Our
    # bisection on the diode voltage against the load line V = I R must land on the same
    # point as the hand bisection on the current (two irradiances, two loads: either side
    # of the maximum power point).
    params = fit_module(ModuleSpec())
    il, i0, rs, rsh, a = (float(x) for x in calcparams_desoto(params, g, tc))
    v_mod, i_ref = _resistive_point_by_bisection(il, i0, rs, rsh, a, r_ohm / 2)
    line_v = np.array([0.0, 100.0])
    line_i = line_v / r_ohm
    v, i = direct_operating_point(params, g, tc, ArrayLayout(2, 1), line_v, line_i)
    assert float(i) == pytest.approx(i_ref, abs=1e-6)
    assert float(v) == pytest.approx(2 * v_mod, abs=1e-5)
    assert float(v) == pytest.approx(float(i) * r_ohm, abs=1e-5)


def test_direct_point_is_vectorised_and_dark_is_zero():
    params = fit_module(ModuleSpec())
    g = np.array([[0.0, 200.0, 800.0]])
    v, i = direct_operating_point(
        params, g, np.full_like(g, 30.0), ArrayLayout(1, 2), np.array([0, 50.0]), np.array([0, 5.0])
    )
    assert v.shape == (1, 3) and v[0, 0] == 0 and i[0, 0] == 0
    assert i[0, 2] > i[0, 1] > 0


def test_controller_power_is_the_array_mpp_inside_the_window():
    params = fit_module(ModuleSpec())
    g, tc = np.array([300.0, 900.0]), np.array([30.0, 45.0])
    _, _, pmp = module_mpp(params, g, tc)
    p = controller_input_power_w(params, g, tc, ArrayLayout(3, 2), min_input_v=30.0)
    assert np.allclose(p, 6 * pmp)
    # a window floor above the MPP holds the array at the floor: less than the MPP
    p_low = controller_input_power_w(params, g, tc, ArrayLayout(1, 1), min_input_v=35.0)
    assert np.all(p_low < pmp) and np.all(p_low > 0)


def test_pump_table_at_a_head_and_its_start_power():
    pump = PumpSpec()  # heads 20/40/60 m; powers 150/300/500/700 W
    at = pump_at_head(pump, 30.0)
    # halfway between the 20 m and 40 m rows: (0.9+0.3)/2, (1.9+1.0)/2, ...
    assert np.allclose(at.flow_m3_h, [0.6, 1.45, 2.5, 3.5])
    # first segment extended to zero flow: 150 - 0.6 x (300-150)/(1.45-0.6)
    assert at.start_power_w == pytest.approx(150 - 0.6 * 150 / 0.85)
    q = flow_at_power_m3_h(at, [0.0, at.start_power_w - 1, 400.0, 2000.0])
    assert q[0] == 0 and q[1] == 0
    assert q[2] == pytest.approx((1.45 + 2.5) / 2)
    assert q[3] == pytest.approx(3.5)  # held at the top point
    # at 60 m the row starts at zero flow: the start power is where the row turns positive
    at60 = pump_at_head(pump, 60.0)
    assert at60.start_power_w == pytest.approx(150.0)


def test_pump_above_its_highest_head_is_refused_naming_the_field():
    with pytest.raises(DesignError) as e:
        pump_at_head(PumpSpec(), 75.0)
    assert e.value.code == "pump-head" and e.value.field.endswith("head_points_m")


def test_direct_point_on_a_motor_line_lies_on_the_array_curve():
    # Against the existing Newton solve of the single-diode current at a voltage
    # (offgrid.design.pv.current_at_voltage, a different method from our bisection on the
    # diode voltage): at the returned voltage the array gives the returned current, and the
    # motor line takes it.
    from offgrid.design.pv import current_at_voltage
    from offgrid.water.coupling import load_current_a
    from offgrid.water.pump import motor_line

    pump = PumpSpec(
        drive="direct",
        voltage_v=[[45.0, 60.0, 75.0, 90.0], [50.0, 65.0, 80.0, 95.0], [55.0, 70.0, 85.0, 100.0]],
    )
    line_v, line_i = motor_line(pump_at_head(pump, 35.0))
    params = fit_module(ModuleSpec())
    g = np.array([150.0, 450.0, 900.0])
    tc = np.array([22.0, 35.0, 50.0])
    lay = ArrayLayout(2, 2)
    v, i = direct_operating_point(params, g, tc, lay, line_v, line_i)
    il, i0, rs, rsh, a = calcparams_desoto(params, g, tc)
    i_curve = lay.parallel * current_at_voltage(v / lay.series, il, i0, rs, rsh, a)
    assert np.allclose(i, i_curve, atol=1e-6)
    assert np.allclose(i, load_current_a(v, line_v, line_i), atol=1e-6)


def test_start_irradiance_is_the_threshold():
    import copy

    from offgrid.design.pv import cell_temperature_ross
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import resolve_climate
    from offgrid.paths import demo_water_path
    from offgrid.project.store import load_project
    from offgrid.water.design import day_conditions, input_power_w, water_design

    p = load_project(demo_water_path())
    w = water_design(p, 0)
    s = p.water[0]
    cond = day_conditions(p, resolve_climate(p), s, ReasonBook())
    pump = pump_at_head(s.pump, w.total_dynamic_head_m)
    lay = ArrayLayout(w.series, w.parallel)
    m = w.limiting_month - 1
    g = np.array([w.start_irradiance_w_m2 - 2.5, w.start_irradiance_w_m2])
    tc = cell_temperature_ross(cond.temp_day_c[m], g, cond.noct_c)
    p_in = input_power_w(fit_module(p.module), copy.deepcopy(s), g, tc, lay, pump, cond.mismatch)
    assert p_in[0] <= pump.start_power_w < p_in[1]
