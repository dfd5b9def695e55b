"""Properties of the generator dispatch over random days (hypothesis, derandomized).

Energy balance (every Wh accounted for), the battery between its floor and full, fuel at
least the no-load use of each running hour, starts never more than run hours, quiet hours
never run (issue 16; checks of the method's own bookkeeping, no outside source).
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from offgrid.simulate.balance import Steps
from offgrid.simulate.dispatch import GeneratorInputs, run_hybrid

CAP = 8000.0


@settings(max_examples=60, deadline=None, derandomize=True)
@given(
    seed=st.integers(0, 10_000),
    rule=st.sampled_from(["cycle_charging", "load_following"]),
    derated=st.floats(500, 8000),
    min_frac=st.floats(0, 0.6),
    charger=st.floats(50, 4000),
    eta=st.floats(0.6, 1.0),
    soc0=st.floats(0.3, 1.0),
    start=st.floats(0.2, 0.7),
    gap=st.floats(0.05, 0.3),
    quiet_from=st.integers(0, 23),
    quiet_len=st.integers(0, 10),
    c_rate=st.none() | st.floats(0.05, 1.0),
)
def test_dispatch_bookkeeping(
    seed, rule, derated, min_frac, charger, eta, soc0, start, gap, quiet_from, quiet_len, c_rate
):
    rng = np.random.default_rng(seed)
    days = 6
    load = rng.uniform(0, 900, (days, 24))
    crit = load * rng.uniform(0, 1, (days, 24))
    pv = np.clip(rng.normal(0.3, 0.3, (days, 24)), 0, None)
    cc = None if c_rate is None else np.full((days, 24), c_rate)
    steps = Steps(pv, np.zeros_like(pv), crit, load - crit, cc, np.arange(days) % 12, 24, "hourly")
    quiet = tuple(((h - quiet_from) % 24) < quiet_len for h in range(24))
    g = GeneratorInputs(
        derated,
        min_frac * derated,
        0.4,
        0.28,
        charger,
        eta,
        rule,
        start,
        min(start + gap, 1.0),
        quiet,
        tuple(rng.uniform(0.7, 1.2, 12)),
    )
    b = run_hybrid(
        steps,
        1200.0,
        CAP,
        g,
        max_dod=0.6,
        eta_charge=0.95,
        eta_discharge=0.95,
        initial_soc=soc0,
        record=True,
    )
    served = b.demand_wh - b.unmet_wh
    losses = b.charge_wh * 0.05 + b.discharge_wh * (1 / 0.95 - 1)
    sources = b.pv_wh + b.gen_to_load_wh + b.gen_to_battery_wh
    sinks = served + b.spilled_wh + losses + (b.stored_end_wh - b.stored_start_wh)
    assert sources == pytest.approx(sinks, rel=1e-9, abs=1e-6)
    floor = CAP * 0.4
    assert b.stored_wh.max() <= CAP + 1e-6
    assert b.stored_wh.min() >= min(floor, CAP * soc0) - 1e-6
    assert b.fuel_l >= 0.4 * b.run_h - 1e-9
    assert b.starts <= b.run_h <= days * 24
    hours = np.tile(np.arange(24), days)
    running = b.gen_w > 0
    assert not np.any(running & np.asarray(quiet)[hours])
    assert np.all(b.gen_w[running] >= g.min_load_w - 1e-6)
    assert np.all(b.gen_w <= derated + 1e-6)
    assert 0 <= b.unmet_critical_wh <= b.unmet_wh + 1e-9
