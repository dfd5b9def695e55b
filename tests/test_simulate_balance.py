"""Energy balance: conservation, a hand-worked case, limiting cases, monotonicity."""

import numpy as np
import pytest

from offgrid.simulate.balance import (
    SMALL_N,
    SimulationCancelled,
    Steps,
    build_steps,
    plain_inputs,
    run_balance,
    simulate_inputs,
)
from offgrid.simulate.profiles import clipped_daily_fraction, collares_pereira_rabl_rt
from offgrid.simulate.weather import synthetic_daily_insolation

DEMO_H = [6.1, 6.3, 5.8, 4.9, 4.6, 4.5, 4.4, 4.9, 5.8, 6.0, 5.4, 5.7]  # invented demo climate


def system(**kw):
    base = dict(
        insolation_kwh_m2_day=DEMO_H,
        latitude_deg=-3.4,
        array_w=600.0,
        capacity_wh=4000.0,
        load_wh=1500.0,
        critical_share=0.4,
        poa_ratio=1.02,
        yield_factor=0.8,
        max_dod=0.5,
        round_trip_efficiency=0.85,
        load_time_of_day="evening",
        controller_w_per_w=0.9,
        charge_c_rate=0.2,
    )
    base.update(kw)
    return plain_inputs(**base)


def weather(years=3, seed=2):
    return synthetic_daily_insolation(DEMO_H, -3.4, years=years, seed=seed)


def check_conservation(bal, ec, ed):
    r = bal.record
    stored = r["stored_wh"]  # (days, k, n)
    flat = stored.reshape(-1, stored.shape[-1])
    prev = np.vstack([bal.stored_start_wh[None, :], flat[:-1]])
    d_stored = flat - prev
    loss = (r["charge_wh"] * (1 - ec) + r["discharge_wh"] * (1 / ed - 1)).reshape(flat.shape)
    lhs = r["pv_wh"].reshape(flat.shape)
    rhs = (r["served_wh"] + r["spilled_wh"]).reshape(flat.shape) + loss + d_stored
    # in = out + losses + change of stored energy, at every step (float rounding only)
    np.testing.assert_allclose(lhs, rhs, atol=1e-6)
    assert np.all(flat >= bal.capacity_wh * 0.5 - 1e-6)  # never below the DoD floor
    assert np.all(flat <= bal.capacity_wh + 1e-6)
    assert np.all(r["spilled_wh"] >= -1e-9) and np.all(r["charge_wh"] >= -1e-9)


@pytest.mark.parametrize("mode", ["daily", "hourly"])
def test_energy_conserved_every_step(mode):
    inp = system()
    w = weather()
    designs = run_balance(
        build_steps(inp, w, mode),
        [300, 600, 1200],
        [1000, 4000, 9000],
        max_dod=0.5,
        eta_charge=inp.eta_charge,
        eta_discharge=inp.eta_discharge,
        record=True,
    )
    check_conservation(designs, inp.eta_charge, inp.eta_discharge)
    one = simulate_inputs(inp, w, mode=mode, record=True)
    check_conservation(one, inp.eta_charge, inp.eta_discharge)
    # served + shed = demand, in total
    served = one.record["served_wh"].sum()
    assert served + one.unmet_wh[0] == pytest.approx(one.demand_wh, rel=1e-12)


def hand_steps():
    # Three days, daily mode: (sun step, dark step).  PV per W of array per day and the
    # loads (critical, other) in Wh.
    pv = np.array([[3.0, 0.0], [0.3, 0.0], [10.0, 0.0]])
    crit = np.array([[100.0, 200.0]] * 3)
    other = np.array([[100.0, 100.0]] * 3)
    return Steps(pv, np.zeros_like(pv), crit, other, None, np.zeros(3, dtype=int), 2, "daily")


@pytest.mark.parametrize("designs", [1, 2])
def test_short_case_worked_by_hand(designs):
    # Worked by hand (common practice, no source: the step rules of offgrid.simulate.balance):
    # 100 W array, 1000 Wh battery, DoD 0.5 (floor 500 Wh), charge and discharge 0.9, full.
    # Day 1 sun: P = 300, loads 200 served direct, surplus 100 spilled (battery full).
    #        dark: 300 Wh from the battery -> stored 1000 - 300/0.9 = 666.67.
    # Day 2 sun: P = 30; battery can give (666.67 - 500) x 0.9 = 150; of the 200 Wh of
    #        loads the 100 critical are served first, 80 of the 100 other, 20 shed;
    #        stored 500.  dark: nothing available: 200 critical + 100 other shed.
    # Day 3 sun: P = 1000, 200 served, charge min(800, 500 / 0.9) = 555.56 -> full, 244.44
    #        spilled.  dark: 300 from the battery -> 666.67.
    aw = [100.0] * designs
    b = run_balance(
        hand_steps(),
        aw,
        [1000.0] * designs,
        max_dod=0.5,
        eta_charge=0.9,
        eta_discharge=0.9,
        record=True,
    )
    assert b.shed_days.tolist() == [1] * designs
    assert b.shed_days_critical.tolist() == [1] * designs
    assert b.lolp[0] == pytest.approx(1 / 3)
    assert b.unmet_wh[0] == pytest.approx(320.0)
    assert b.unmet_critical_wh[0] == pytest.approx(200.0)
    assert b.unmet_fraction[0] == pytest.approx(320 / 1500)
    shed_sun = b.record["shed_wh"][1, 0, 0], b.record["shed_critical_wh"][1, 0, 0]
    assert shed_sun == pytest.approx((20.0, 0.0))
    assert b.discharge_wh[0] == pytest.approx(300 + 150 + 300)
    assert b.charge_wh[0] == pytest.approx(500 / 0.9)
    assert b.spilled_wh[0] == pytest.approx(100 + 800 - 500 / 0.9)
    stored = b.record["stored_wh"][:, :, 0]
    np.testing.assert_allclose(
        stored, [[1000, 1000 - 300 / 0.9], [500, 500], [1000, 1000 - 300 / 0.9]]
    )
    assert b.longest_shed_run_days[0] == 1


@pytest.mark.parametrize("mode", ["daily", "hourly"])
def test_unlimited_battery_never_sheds(mode):
    inp = system(array_w=900.0, load_time_of_day="night")
    b = simulate_inputs(inp, weather(2), capacity_wh=np.inf, mode=mode)
    assert b.shed_days[0] == 0 and b.unmet_wh[0] == 0


@pytest.mark.parametrize("mode", ["daily", "hourly"])
def test_no_battery_sheds_night_loads_every_night(mode):
    inp = system(array_w=5000.0, load_time_of_day="night", critical_share=1.0)
    b = simulate_inputs(inp, weather(2), capacity_wh=0.0, mode=mode)
    assert b.shed_days[0] == b.days
    assert b.lolp_critical[0] == 1.0
    assert b.unmet_fraction[0] == pytest.approx(1.0)
    # the same array with day-time loads and no battery: night loads only are the problem
    day = simulate_inputs(
        system(array_w=5000.0, load_time_of_day="day", controller_w_per_w=None),
        weather(2),
        capacity_wh=0.0,
        mode=mode,
    )
    assert day.unmet_fraction[0] < 0.5


@pytest.mark.parametrize("tod", ["evening", "any"])
def test_critical_loads_served_first(tod):
    inp = system(critical_share=0.3, array_w=350.0, load_time_of_day=tod)
    b = simulate_inputs(inp, weather(5), mode="hourly")
    assert b.shed_days[0] > 0
    assert b.unmet_fraction_critical[0] < b.unmet_fraction[0]
    assert b.lolp_critical[0] <= b.lolp[0]


@pytest.mark.parametrize("seed,mode", [(1, "daily"), (2, "daily"), (3, "daily"), (4, "hourly")])
def test_doubling_array_and_battery_never_raises_lolp(seed, mode):
    rng = np.random.default_rng(seed)
    aw = rng.uniform(100, 1500, 25)
    cap = rng.uniform(0, 10000, 25)
    inp = system()
    steps = build_steps(inp, weather(3 if mode == "daily" else 1, seed), mode)
    kw = dict(max_dod=0.5, eta_charge=inp.eta_charge, eta_discharge=inp.eta_discharge)
    base = run_balance(steps, aw, cap, **kw)
    double = run_balance(steps, 2 * aw, 2 * cap, **kw)
    more_array = run_balance(steps, 2 * aw, cap, **kw)
    more_battery = run_balance(steps, aw, 2 * cap, **kw)
    for other in (double, more_array, more_battery):
        assert np.all(other.lolp <= base.lolp + 1e-12)
        assert np.all(other.unmet_wh <= base.unmet_wh + 1e-6)


def test_vectorised_equals_one_by_one():
    inp = system()
    w = weather(2)
    steps = build_steps(inp, w, "daily")
    # more designs than SMALL_N, so the numpy path runs, against plain-float runs one by one
    aw = np.linspace(200.0, 1300.0, SMALL_N + 2)
    cap = np.geomspace(500.0, 12000.0, SMALL_N + 2)
    many = simulate_inputs(inp, w, aw, cap, steps=steps)
    few = simulate_inputs(inp, w, aw[:3], cap[:3], steps=steps)  # the one-by-one path
    np.testing.assert_array_equal(few.shed_days, many.shed_days[:3])
    for i in range(aw.size):
        one = simulate_inputs(inp, w, aw[i], cap[i], steps=steps)
        assert one.shed_days[0] == many.shed_days[i]
        assert one.unmet_wh[0] == pytest.approx(many.unmet_wh[i])
        assert one.discharge_wh[0] == pytest.approx(many.discharge_wh[i])


def test_charge_and_controller_limits_hold():
    inp = system(controller_w_per_w=0.5, charge_c_rate=0.1, array_w=1500.0)
    w = weather(1)
    b = simulate_inputs(inp, w, mode="hourly", record=True)
    assert np.all(b.record["pv_wh"] <= 0.5 * 1500 + 1e-9)  # controller output, Wh per hour
    assert np.all(b.record["charge_wh"] <= 0.1 * inp.capacity_wh + 1e-9)
    assert b.clipped_wh[0] > 0
    # daily mode clips by the same hourly shape: same controller output per day
    daily = build_steps(inp, w, "daily")
    hourly = build_steps(inp, w, "hourly")
    np.testing.assert_allclose(daily.pv_wh_per_w[:, 0], hourly.pv_wh_per_w.sum(axis=1))


def test_hourly_sun_shape():
    # Collares-Pereira & Rabl (1979) via Duffie & Beckman eq. 2.13.2: shares sum to 1, zero
    # at night, symmetric about solar noon, peak share near 1/(day length) x pi/2 region.
    rt = collares_pereira_rabl_rt(-3.4)
    np.testing.assert_allclose(rt.sum(axis=1), 1.0)
    np.testing.assert_allclose(rt, rt[:, ::-1], atol=1e-12)
    assert np.all(rt[:, :5] == 0) and np.all(rt[:, 19:] == 0)
    # a limit at or above the peak hour passes everything: G(y) = y
    assert clipped_daily_fraction(rt[0], 1.0 / rt[0].max()) == pytest.approx(1 / rt[0].max())


def test_cancel_and_progress():
    inp = system()
    seen = []
    simulate_inputs(inp, weather(2), progress=seen.append)
    assert seen[0] == 0.0 and seen[-1] == 1.0
    with pytest.raises(SimulationCancelled):
        simulate_inputs(inp, weather(2), cancelled=lambda: True)


def test_bad_input_messages():
    with pytest.raises(ValueError, match="depth of discharge"):
        system(max_dod=0.0)
    with pytest.raises(ValueError, match="critical share"):
        system(critical_share=1.5)
    with pytest.raises(ValueError, match="time of day"):
        system(load_time_of_day="noon")
    with pytest.raises(ValueError, match="design"):
        simulate_inputs(system(), weather(1), array_w=-5.0)
    with pytest.raises(ValueError, match="mode"):
        build_steps(system(), weather(1), "weekly")
