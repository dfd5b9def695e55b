"""Trade-off sweep: curves meeting target LOLPs, cheapest point, bad input."""

import itertools

import numpy as np
import pytest

from offgrid.simulate.balance import plain_inputs, simulate_inputs
from offgrid.simulate.tradeoff import (
    cheapest_point,
    check_prices,
    check_target,
    curve,
    sweep,
    tradeoff,
)
from offgrid.simulate.weather import synthetic_daily_insolation

DEMO_H = [6.1, 6.3, 5.8, 4.9, 4.6, 4.5, 4.4, 4.9, 5.8, 6.0, 5.4, 5.7]  # invented demo climate
PRICES = {"array_per_w": 0.6, "battery_per_kwh": 180.0}  # invented unit costs


@pytest.fixture(scope="module")
def case():
    inp = plain_inputs(
        DEMO_H,
        -3.4,
        600.0,
        6000.0,
        1500.0,
        0.4,
        load_time_of_day="evening",
        controller_w_per_w=1.0,
        charge_c_rate=0.2,
    )
    w = synthetic_daily_insolation(DEMO_H, -3.4, years=10, seed=9)
    return inp, w


def test_curve_points_bracket_the_target(case):
    inp, w = case
    sw, _ = sweep(inp, w, np.linspace(300, 1500, 8), np.geomspace(1000, 30000, 12))
    for target in (0.01, 0.001):
        pts = curve(sw, target)
        assert pts
        for p in pts:
            i = int(np.argmin(np.abs(sw.array_w - p.array_w)))
            j = int(np.searchsorted(sw.capacity_wh, p.capacity_wh - 1e-9))
            assert sw.lolp[i, j] <= target  # the grid battery at or above the point meets it
            if j > 0 and not p.at_grid_edge:
                assert sw.lolp[i, j - 1] > target  # the next smaller one does not
        caps = [p.capacity_wh for p in pts]
        assert all(b <= a + 1e-9 for a, b in itertools.pairwise(caps))  # more PV,
        # less battery


def test_sweep_matches_single_runs(case):
    inp, w = case
    aw, cw = np.array([400.0, 900.0]), np.array([2000.0, 8000.0])
    sw, _ = sweep(inp, w, aw, cw)
    for i, a in enumerate(aw):
        for j, c in enumerate(cw):
            assert simulate_inputs(inp, w, a, c).lolp[0] == sw.lolp[i, j]


def test_cheapest_point_and_design_position(case):
    inp, w = case
    tr = tradeoff(inp, w, prices=PRICES, n_array=10, n_battery=10)
    for t in tr.targets:
        assert t.cheapest is not None
        costs = [
            PRICES["array_per_w"] * p.array_w + PRICES["battery_per_kwh"] * p.capacity_wh / 1000
            for p in t.points
        ]
        assert t.cheapest_cost == pytest.approx(min(costs))
        assert "worst-month design" in t.message
        assert t.design_meets == (tr.design_lolp <= t.target)
    d = tr.to_dict()
    assert len(d["lolp"]) == 10 and len(d["targets"]) == 2


def test_without_prices_the_curve_still_comes(case):
    inp, w = case
    tr = tradeoff(inp, w, n_array=5, n_battery=5)
    assert tr.targets[0].cheapest is None
    assert "give prices" in tr.targets[0].message
    with pytest.raises(ValueError, match="costs missing"):
        cheapest_point(list(tr.targets[0].points), None)


def test_unreachable_target_says_so(case):
    inp, w = case
    tr = tradeoff(inp, w, array_w=[50.0, 80.0], capacity_wh=[100.0, 500.0])
    assert tr.targets[0].points == ()
    assert "no design of the sweep reaches" in tr.targets[0].message


def test_target_as_percent():
    assert check_target("1%") == pytest.approx(0.01)
    assert check_target("0.1 %") == pytest.approx(0.001)


@pytest.mark.parametrize(
    "target,match",
    [
        (0, "cannot be promised"),
        (0.0, "cannot be promised"),
        (-0.01, "cannot be promised"),
        (1.0, "below 1"),
        ("abc", "not a number"),
        ("0%", "cannot be promised"),
    ],
)
def test_bad_targets(target, match):
    with pytest.raises(ValueError, match=match):
        check_target(target)


@pytest.mark.parametrize(
    "prices,match",
    [
        (None, "costs missing"),
        ({}, "costs missing"),
        ({"array_per_w": 1.0}, "battery_per_kwh"),
        ({"array_per_w": "x", "battery_per_kwh": 1}, "number"),
        ({"array_per_w": -1, "battery_per_kwh": 1}, "0 or more"),
    ],
)
def test_bad_prices(prices, match):
    with pytest.raises(ValueError, match=match):
        check_prices(prices)


def test_bad_sweep(case):
    inp, w = case
    with pytest.raises(ValueError, match="sweep"):
        sweep(inp, w, [], [1000.0])
    with pytest.raises(ValueError, match="sweep"):
        tradeoff(inp, w, n_array=1)
