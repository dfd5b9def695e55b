"""The tank's daily water balance: a short series worked by hand, and the 30-year run."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.paths import demo_water_path
from offgrid.project.store import load_project
from offgrid.water.balance import simulate_tank, tank_balance


def test_balance_worked_by_hand():
    # Tank of 10 m3 holding 5 m3, need 6 m3 every day, pumped 8, 0, 0, 20, 3 m3 (worked by
    # hand from the balance in offgrid/water/balance.py):
    # day 1: 5 + 8 = 13 available, 6 delivered, 7 left          (level 7)
    # day 2: 7 + 0 = 7, 6 delivered, 1 left                      (level 1)
    # day 3: 1 + 0 = 1, 1 delivered, 5 short                     (level 0)
    # day 4: 0 + 20 = 20, 6 delivered, 14 left > 10: 4 not pumped (level 10, float switch)
    # day 5: 10 + 3 = 13, 6 delivered, 7 left                    (level 7)
    b = tank_balance([8, 0, 0, 20, 3], [6] * 5, capacity_m3=10.0, start_m3=5.0)
    assert b.level_m3.tolist() == [7, 1, 0, 10, 7]
    assert b.delivered_m3.tolist() == [6, 6, 1, 6, 6]
    assert b.short_m3.tolist() == [0, 0, 5, 0, 0]
    assert b.not_pumped_m3.tolist() == [0, 0, 0, 4, 0]
    assert b.days_short == 1 and b.days_full == 1


def test_balance_conserves_water():
    rng = np.random.default_rng(3)
    pumped = rng.uniform(0, 12, 400)
    need = rng.uniform(4, 8, 400)
    b = tank_balance(pumped, need, 15.0, 15.0)
    # start + pumped = delivered + not pumped + end level
    lhs = 15.0 + pumped.sum()
    rhs = b.delivered_m3.sum() + b.not_pumped_m3.sum() + b.level_m3[-1]
    assert lhs == pytest.approx(rhs)
    assert np.all((b.level_m3 >= 0) & (b.level_m3 <= 15.0))


def test_thirty_years_of_the_demo():
    p = load_project(demo_water_path())
    b, s = simulate_tank(p, years=30, seed=7)
    assert b.level_m3.shape == (30 * 365,)
    assert s["years"] == 30 and 0 <= s["days_short_pct"] < 20
    # same seed, same answer; a smaller tank runs short more often
    b2, _ = simulate_tank(p, years=30, seed=7)
    assert np.array_equal(b.level_m3, b2.level_m3)
    p.water[0].autonomy_days = 0.3
    _, small = simulate_tank(p, years=30, seed=7)
    assert small["tank_m3"] < s["tank_m3"]
    assert small["days_short"] > s["days_short"]
