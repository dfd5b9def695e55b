"""Generator dispatch against hand-worked hours (issue 16).

Each case is worked by hand in its comments, hour by hour (no source needed: the rules
of offgrid/simulate/dispatch.py applied with a pencil). Battery efficiencies 1 so the
arithmetic stays exact; floor = 10 kWh x (1 - 0.5) = 5 kWh.
"""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.simulate.balance import Steps
from offgrid.simulate.dispatch import GeneratorInputs, run_hybrid

CAP = 10_000.0


def _steps(load_by_hour, pv_by_hour=None, days=1) -> Steps:
    load = np.tile(np.asarray(load_by_hour, dtype=float), (days, 1))
    pv = np.zeros_like(load) if pv_by_hour is None else np.tile(pv_by_hour, (days, 1))
    zero = np.zeros_like(load)
    return Steps(pv, zero, zero, load, None, np.zeros(days, dtype=int), 24, "hourly")


def _gen(rule="cycle_charging", charger_w=2000.0, quiet=(False,) * 24) -> GeneratorInputs:
    # 3 kW derated, minimum 900 W; fuel 0.45 L/h + 0.29 L/kWh; charger 2 kW DC at 0.8
    return GeneratorInputs(3000.0, 900.0, 0.45, 0.29, charger_w, 0.8, rule, 0.6, 0.8, quiet)


def _run(steps, gen, soc0):
    return run_hybrid(
        steps,
        0.0,
        CAP,
        gen,
        max_dod=0.5,
        eta_charge=1.0,
        eta_discharge=1.0,
        initial_soc=soc0,
        record=True,
    )


EIGHT = [1000.0] * 8 + [0.0] * 16  # 1 kWh an hour for the first eight hours


def test_cycle_charging_by_hand():
    # start 0.65 -> 6500 Wh; start at <= 6000, stop at >= 8000
    # h0: 6500 > 6000, battery covers: off, draw 1000 -> 5500
    # h1: 5500 <= 6000: start 1; serves 1000, left 2000 W x 0.8 = 1600 charge
    #     (charger 2000, room 4500) -> 7100; output 1000 + 1600/0.8 = 3000 W;
    #     fuel 0.45 + 0.29 x 3 = 1.32 L
    # h2: 7100 < 8000: runs on, +1600 -> 8700; 1.32 L
    # h3: 8700 >= 8000: off; draw -> 7700. h4: -> 6700. h5: -> 5700
    # h6: 5700 <= 6000: start 2, +1600 -> 7300; h7: +1600 -> 8900
    # h8: 8900 >= 8000: off; no load to the end of the day
    b = _run(_steps(EIGHT), _gen(), 0.65)
    assert (b.run_h, b.starts) == (4, 2)
    assert b.fuel_l == pytest.approx(4 * 1.32)
    assert b.gen_to_load_wh == pytest.approx(4000)
    assert b.gen_to_battery_wh == pytest.approx(6400)
    assert b.gen_output_wh == pytest.approx(12000)
    assert b.discharge_wh == pytest.approx(4000)
    assert b.stored_end_wh == pytest.approx(8900)
    assert b.stored_wh[:9] == pytest.approx([5500, 7100, 8700, 7700, 6700, 5700, 7300, 8900, 8900])
    assert b.unmet_wh == 0 and b.below_min_h == 0
    assert b.solar_fraction == 0.0  # no array


def test_cycle_charging_quiet_hours_by_hand():
    # quiet from hour 1 to 3: h0 off, draw -> 5500
    # h1 quiet: battery has 500 above the floor: draw 500, shed 500 -> 5000
    # h2 quiet: nothing above the floor: shed 1000
    # h3: 5000 <= 6000: start 1, +1600 -> 6600 (1.32 L); h4: +1600 -> 8200 (1.32 L)
    # h5: >= 8000 off, draw -> 7200; h6: -> 6200; h7: 6200 > 6000, off, -> 5200
    # h8: no load, 5200 <= 6000: start 2; nothing to serve: charge min(3000 x 0.8, 2000)
    #     = 2000 -> 7200, output 2000/0.8 = 2500 W, fuel 0.45 + 0.29 x 2.5 = 1.175 L
    # h9: 7200 < 8000: +2000 -> 9200 (1.175 L); h10: off
    quiet = tuple(h in (1, 2) for h in range(24))
    b = _run(_steps(EIGHT), _gen(quiet=quiet), 0.65)
    assert (b.run_h, b.starts) == (4, 2)
    assert b.unmet_wh == pytest.approx(1500)
    assert b.shed_days == 1
    assert b.fuel_l == pytest.approx(2 * 1.32 + 2 * 1.175)
    assert b.stored_end_wh == pytest.approx(9200)


def test_load_following_by_hand():
    # h0: 6500, 1500 above the floor covers 1000: off -> 5500
    # h1..h7: 500 above the floor < 1000: runs for the load only (1000 W >= 900 W minimum),
    #     0.45 + 0.29 = 0.74 L an hour, battery untouched; h8: no load, off
    b = _run(_steps(EIGHT), _gen("load_following"), 0.65)
    assert (b.run_h, b.starts) == (7, 1)
    assert b.fuel_l == pytest.approx(7 * 0.74)
    assert b.gen_to_load_wh == pytest.approx(7000)
    assert b.gen_to_battery_wh == 0 and b.dump_wh == 0
    assert b.stored_end_wh == pytest.approx(5500)


def test_load_following_minimum_loading_by_hand():
    # 500 W in hours 0-2, start 5200 (200 above the floor): runs each hour
    # 500 W load < 900 W minimum: the 400 W extra would charge 320 W but the charger
    # gives only 100 W: output 500 + 100/0.8 = 625 W, dump 275 W, burnt as 900 W:
    # fuel 0.45 + 0.29 x 0.9 = 0.711 L an hour; the battery gains 100 Wh an hour
    load = [500.0] * 3 + [0.0] * 21
    b = _run(_steps(load), _gen("load_following", charger_w=100.0), 0.52)
    assert (b.run_h, b.starts, b.below_min_h) == (3, 1, 3)
    assert b.dump_wh == pytest.approx(3 * 275)
    assert b.fuel_l == pytest.approx(3 * 0.711)
    assert b.stored_end_wh == pytest.approx(5500)


def test_energy_is_conserved_with_sun():
    # a sunny midday and an evening load over three days: every Wh accounted for
    pv = np.zeros(24)
    pv[9:16] = 0.6  # Wh per W of array
    load = np.zeros(24)
    load[17:23] = 700.0
    b = run_hybrid(
        _steps(load, pv, days=3),
        1500.0,
        CAP,
        _gen(),
        max_dod=0.5,
        eta_charge=0.95,
        eta_discharge=0.95,
        initial_soc=0.6,
    )
    served = b.demand_wh - b.unmet_wh
    losses = b.charge_wh * (1 - 0.95) + b.discharge_wh * (1 / 0.95 - 1)
    sources = b.pv_wh + b.gen_to_load_wh + b.gen_to_battery_wh
    sinks = served + b.spilled_wh + losses + (b.stored_end_wh - b.stored_start_wh)
    assert sources == pytest.approx(sinks, rel=1e-9)
    assert 0 < b.solar_fraction < 1


def test_refusals():
    with pytest.raises(ValueError, match="hourly"):
        s = _steps(EIGHT)
        run_hybrid(
            Steps(
                s.pv_wh_per_w[:, :2],
                s.clipped_wh_per_w[:, :2],
                s.critical_wh[:, :2],
                s.other_wh[:, :2],
                None,
                s.month,
                2,
                "daily",
            ),
            0.0,
            CAP,
            _gen(),
            max_dod=0.5,
            eta_charge=1,
            eta_discharge=1,
        )
    bad = GeneratorInputs(3000.0, 900.0, 0.45, 0.29, 2000.0, 0.8, "cycle_charging", 0.9, 0.6)
    with pytest.raises(ValueError, match="start_soc"):
        _run(_steps(EIGHT), bad, 0.65)
