"""Generator engine: derating, fuel curve fit, the generator check (issue 16).

Sources beside each check; values recalled are marked 'from memory'.
"""

from __future__ import annotations

import re

import numpy as np
import pytest

from offgrid.generator.check import generator_check
from offgrid.generator.derate import (
    derate_common_practice,
    derate_iso3046,
    derated_output,
    standard_pressure_kpa,
)
from offgrid.generator.fuel import check_fuel_points, fit_fuel_curve


def test_standard_atmosphere_pressure():
    # ISO 2533 / US Standard Atmosphere 1976 table values (from memory): 1000 m 89.87 kPa,
    # 2000 m 79.50 kPa, 3000 m 70.11 kPa; sea level 101.325 kPa (the definition).
    p = standard_pressure_kpa([0, 1000, 2000, 3000])
    assert p == pytest.approx([101.325, 89.87, 79.50, 70.11], abs=0.02)


def test_iso3046_hand_worked():
    # ISO 3046-1 power adjustment (formula and exponents from memory), worked by hand:
    # 2000 m, 40 C: p = 79.495 kPa; k = (79.495/100)^1 x (298.15/313.15)^0.75
    #   298.15/313.15 = 0.952100, ln = -0.049086, x 0.75 = -0.036815, exp = 0.963855
    #   k = 0.79495 x 0.963855 = 0.766217
    # alpha = k - 0.7 (1 - k)(1/0.8 - 1) = 0.766217 - 0.175 x 0.233783 = 0.725305
    assert float(derate_iso3046(2000, 40)) == pytest.approx(0.7253, abs=2e-4)
    # at the reference conditions (100 kPa is about 110 m in the standard atmosphere, 25 C)
    assert float(derate_iso3046(110.9, 25)) == pytest.approx(1.0, abs=1e-3)
    # never above 1: a cold sea-level site keeps the rating
    assert float(derate_iso3046(0, -20)) == 1.0


def test_common_practice_hand_worked():
    # 3 % per 300 m above 1000 m and 2 % per 5 C above 25 C (common practice, from memory):
    # 2000 m: 3 x 1000/300 = 10 %; 35 C: 2 x 10/5 = 4 %; factor 0.86
    assert float(derate_common_practice(2000, 35)) == pytest.approx(0.86)
    assert float(derate_common_practice(900, 20)) == 1.0
    d = derated_output(6.0, 2000, 35)
    assert d.derated_kw == pytest.approx(5.16)
    assert "from memory" in d.reason.source


def test_derate_refusals_name_the_field():
    with pytest.raises(ValueError, match=r"generator\.derate_method"):
        derated_output(5, 0, 25, method="guess")
    with pytest.raises(ValueError, match=r"generator\.altitude_m"):
        derated_output(5, 8000, 50)


def test_fuel_fit_hand_worked_least_squares():
    # Invented datasheet of a 6 kW diesel: 25/50/75/100 % -> 0.9, 1.3, 1.75, 2.2 L/h.
    # Least squares by hand: x = 1.5, 3, 4.5, 6 kW, xm = 3.75; ym = 6.15/4 = 1.5375
    #   dx = -2.25, -0.75, 0.75, 2.25; dy = -0.6375, -0.2375, 0.2125, 0.6625
    #   sum dx dy = 1.434375 + 0.178125 + 0.159375 + 1.490625 = 3.2625; sum dx^2 = 11.25
    #   b = 3.2625 / 11.25 = 0.29 L/kWh; a x 6 = 1.5375 - 0.29 x 3.75 = 0.45 -> a = 0.075
    c = fit_fuel_curve(6.0, [25, 50, 75, 100], [0.9, 1.3, 1.75, 2.2])
    assert c.b_l_per_kwh == pytest.approx(0.29, abs=1e-12)
    assert c.a_l_h_per_kw == pytest.approx(0.075, abs=1e-12)
    # fitted values at the points: 0.45 + 0.29 x: 0.885, 1.32, 1.755, 2.19
    assert c.fitted_l_h == pytest.approx((0.885, 1.32, 1.755, 2.19))
    assert c.residual_max_l_h == pytest.approx(0.02)
    # numpy's polyfit as a reference library for the same least squares
    slope, icpt = np.polyfit(c.points_kw, c.points_l_h, 1)
    assert (slope, icpt) == pytest.approx((c.b_l_per_kwh, c.no_load_l_h))
    # the typical diesel figures a ~ 0.08 L/h per kW, b ~ 0.25 L/kWh (Skarstein & Uhlen
    # form, from memory) are the right order for this invented datasheet
    assert 0.03 < c.a_l_h_per_kw < 0.15 and 0.2 < c.b_l_per_kwh < 0.35


def test_fuel_fit_two_points_is_exact():
    # two points: the line passes through both (0.5 x 4 kW -> 1.0 L/h, 4 kW -> 1.6 L/h)
    c = fit_fuel_curve(4.0, [50, 100], [1.0, 1.6])
    assert c.b_l_per_kwh == pytest.approx(0.3)
    assert c.fuel_l_h(2.0) == pytest.approx(1.0)
    assert c.fuel_l_h(4.0) == pytest.approx(1.6)


@pytest.mark.parametrize(
    ("loads", "fuel", "field"),
    [
        ([25, 50, 75, 100], [0.9, 1.3, 1.2, 2.2], "generator.fuel_l_h"),
        ([50, 25], [1.0, 1.5], "generator.fuel_load_pct"),
        ([25, 50, 75], [0.9, 1.3], "generator.fuel_l_h"),
        ([100], [2.0], "generator.fuel_l_h"),
        ([25, 150], [0.9, 3], "generator.fuel_load_pct"),
    ],
)
def test_fuel_table_refused(loads, fuel, field):
    problems = check_fuel_points(loads, fuel)
    assert problems and problems[0][0] == field
    with pytest.raises(ValueError, match=re.escape(field)):
        fit_fuel_curve(5.0, loads, fuel)


def test_generator_check():
    # 5 kW derated; AC peak 1.8 kW; a 2.5 kW start beside the rest; charger 2 kW DC at 0.9
    # -> input 2.222 kW; starting need 2.5 + 2.222 = 4.722 kW <= 5 kW: fits
    c = generator_check(5000, 1800, 2500, 2000, 0.9, 0.3, "well pump")
    assert c.charger_input_w == pytest.approx(2222.2, abs=0.1)
    assert c.starting_need_w == pytest.approx(4722.2, abs=0.1)
    assert c.ok and not [n for n in c.notices if n.severity == "error"]
    small = generator_check(4000, 1800, 2500, 2000, 0.9, 0.3, "well pump")
    assert not small.ok
    assert "generator.rated_kw" in small.notices[0].message
    # a large generator with a small charger: charging runs fall below the minimum loading
    light = generator_check(20000, 1800, 2500, 1000, 0.9, 0.3)
    assert any(n.code == "generator-light-charging" for n in light.notices)
