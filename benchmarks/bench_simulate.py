"""Speed of the reliability simulation (prints figures; not a test).

Run: PYTHONPATH=. python benchmarks/bench_simulate.py
Targets (issue 6): 30 years daily for one design < 0.2 s; a 30 x 30 trade-off sweep < 3 s on
one core.  Best of 3 runs each.
"""

from __future__ import annotations

import time

import numpy as np

from offgrid.simulate.balance import build_steps, plain_inputs, run_balance
from offgrid.simulate.reliability import reliability
from offgrid.simulate.tradeoff import tradeoff
from offgrid.simulate.weather import synthetic_daily_insolation

H = [6.1, 6.3, 5.8, 4.9, 4.6, 4.5, 4.4, 4.9, 5.8, 6.0, 5.4, 5.7]  # invented demo climate
LAT = -3.4


def best(fn, repeat: int = 3) -> float:
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def main() -> None:
    inp = plain_inputs(
        H,
        LAT,
        1800.0,
        37000.0,
        4500.0,
        0.7,
        load_time_of_day="evening",
        controller_w_per_w=1.4,
        charge_c_rate=0.2,
    )
    kw = dict(max_dod=inp.max_dod, eta_charge=inp.eta_charge, eta_discharge=inp.eta_discharge)
    t_w = best(lambda: synthetic_daily_insolation(H, LAT, 30, seed=1))
    w30 = synthetic_daily_insolation(H, LAT, 30, seed=1)
    print(f"weather: 30 years synthetic               {t_w * 1000:8.1f} ms")
    t_s = best(lambda: build_steps(inp, w30, "daily"))
    print(f"steps: 30 years daily (sun shape, clip)   {t_s * 1000:8.1f} ms")

    def one_design():
        w = synthetic_daily_insolation(H, LAT, 30, seed=1)
        run_balance(build_steps(inp, w, "daily"), 1800.0, 37000.0, **kw)

    t1 = best(one_design)
    print(f"one design, 30 years daily, end to end    {t1 * 1000:8.1f} ms   (target < 200 ms)")
    steps30 = build_steps(inp, w30, "daily")
    t1b = best(lambda: run_balance(steps30, 1800.0, 37000.0, **kw))
    print(
        f"  balance loop alone                      {t1b * 1000:8.1f} ms   "
        f"{w30.days / t1b:,.0f} design-days/s"
    )
    t_rel = best(lambda: reliability(inp, w30, end_of_life_scale=0.8))
    print(f"full reliability figures (record, rainflow, end-of-life run) {t_rel * 1000:6.1f} ms")
    t_h = best(lambda: run_balance(build_steps(inp, w30, "hourly"), 1800.0, 37000.0, **kw), 1)
    print(f"one design, 30 years hourly               {t_h * 1000:8.1f} ms")

    t_sw = best(
        lambda: tradeoff(
            inp, w30, n_array=30, n_battery=30, prices={"array_per_w": 0.6, "battery_per_kwh": 180}
        )
    )
    print(
        f"trade-off 30 x 30 (+ design), 30 years    {t_sw * 1000:8.1f} ms   (target < 3000 ms)"
        f"   {901 * w30.days / t_sw:,.0f} design-days/s"
    )

    print("\nscaling with designs (30 years daily, balance loop):")
    for n in (1, 4, 8, 10, 100, 400, 900, 2500):
        aw = np.full(n, 1800.0)
        cap = np.linspace(5000, 60000, n)
        t = best(lambda aw=aw, cap=cap: run_balance(steps30, aw, cap, **kw))
        print(f"  {n:5d} designs  {t * 1000:8.1f} ms   {n * w30.days / t:14,.0f} design-days/s")
    print("\nscaling with years (900 designs, daily, balance loop):")
    aw = np.repeat(np.linspace(900, 5400, 30), 30)
    cap = np.tile(np.geomspace(7000, 180000, 30), 30)
    for years in (1, 10, 30, 100):
        w = synthetic_daily_insolation(H, LAT, years, seed=1)
        st = build_steps(inp, w, "daily")
        t = best(lambda st=st: run_balance(st, aw, cap, **kw))
        print(f"  {years:4d} years   {t * 1000:8.1f} ms   {900 * w.days / t:14,.0f} design-days/s")


if __name__ == "__main__":
    main()
