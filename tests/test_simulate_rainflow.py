"""Rainflow counting (ASTM E1049-85 sec. 5.4.4), cycle life and Miner's rule."""

import numpy as np
import pytest
import rainflow  # general-purpose reference library (PyPI `rainflow`), in the test extra

from offgrid.simulate.balance import plain_inputs, simulate_inputs
from offgrid.simulate.life import (
    CYCLE_LIFE,
    battery_wear,
    cycles_to_failure,
    miner_damage,
)
from offgrid.simulate.rainflow import cycle_histogram, rainflow_astm_e1049, reversals
from offgrid.simulate.reliability import soc_series
from offgrid.simulate.weather import synthetic_daily_insolation


def reference_histogram(series) -> dict[float, float]:
    return {round(r, 9): c for r, c in rainflow.count_cycles(list(series), ndigits=9)}


def test_astm_e1049_example():
    # ASTM E1049-85 Fig. 6 / Table 4 (rainflow counting example), as recalled (from memory):
    # load history -2 1 -3 5 -1 3 -4 4 -2 gives ranges 3 (0.5), 4 (1.5), 6 (0.5), 8 (1), 9 (0.5)
    x = [-2, 1, -3, 5, -1, 3, -4, 4, -2]
    assert cycle_histogram(rainflow_astm_e1049(x)) == {
        3.0: 0.5,
        4.0: 1.5,
        6.0: 0.5,
        8.0: 1.0,
        9.0: 0.5,
    }
    assert cycle_histogram(rainflow_astm_e1049(x)) == reference_histogram(x)


@pytest.mark.parametrize("seed", range(6))
def test_agrees_with_rainflow_package_on_random_series(seed):
    rng = np.random.default_rng(seed)
    x = np.round(rng.normal(size=int(rng.integers(5, 2000))).cumsum(), 2)  # with plateaus
    assert cycle_histogram(rainflow_astm_e1049(x)) == reference_histogram(x)


@pytest.mark.parametrize("mode", ["daily", "hourly"])
def test_agrees_with_rainflow_package_on_simulated_state_of_charge(mode):
    h = [6.1, 6.3, 5.8, 4.9, 4.6, 4.5, 4.4, 4.9, 5.8, 6.0, 5.4, 5.7]
    inp = plain_inputs(h, -3.4, 500.0, 5000.0, 1400.0, 0.5, load_time_of_day="evening")
    w = synthetic_daily_insolation(h, -3.4, years=2, seed=4)
    soc, _ = soc_series(simulate_inputs(inp, w, mode=mode, record=True), 1.0)
    ours = rainflow_astm_e1049(soc)
    assert cycle_histogram(ours) == reference_histogram(soc)
    assert ours.total > 300  # two years of daily cycling


def test_reversals():
    assert reversals([1, 1, 2, 2, 3, 1, 1, 4]).tolist() == [1, 3, 1, 4]
    assert reversals([]).size == 0
    with pytest.raises(ValueError, match="not finite"):
        reversals([1, np.nan, 2])


def test_cycle_life_curve_and_miner():
    for chem, table in CYCLE_LIFE.items():
        n = cycles_to_failure(chem, [0.1, 0.2, 0.3, 0.5, 0.8, 1.0])
        np.testing.assert_allclose(n, table)
        assert np.all(np.diff(cycles_to_failure(chem, np.linspace(0.01, 1, 50))) < 0)
    # Miner (1945): 300 full cycles 1.0 -> 0.5 on a curve with N(0.5) = 600 gives D = 0.5
    soc = np.tile([1.0, 0.5], 300)
    soc = np.append(soc, 1.0)
    cyc = rainflow_astm_e1049(soc)
    assert cyc.total == pytest.approx(300.0)
    assert miner_damage(cyc, "agm") == pytest.approx(300 / CYCLE_LIFE["agm"][3])
    with pytest.raises(ValueError, match="chemistry"):
        cycles_to_failure("nickel-iron", 0.5)


def test_battery_wear_figures():
    soc = np.append(np.tile([1.0, 0.5], 365), 1.0)  # one cycle of 50 % a day for a year
    wear = battery_wear(soc, 1.0, "agm", discharge_wh=365 * 500.0, capacity_wh=1000.0)
    assert wear.equivalent_full_cycles_per_year == pytest.approx(182.5)
    assert wear.throughput_kwh_per_year == pytest.approx(182.5)
    assert wear.cycle_life_years == pytest.approx(600 / 365)
    assert wear.expected_life_years == pytest.approx(600 / 365)  # below calendar life
    assert wear.deepest_cycle == pytest.approx(0.5)
    with pytest.raises(ValueError, match="longer than zero"):
        battery_wear(soc, 0, "agm", 1.0, 1.0)
