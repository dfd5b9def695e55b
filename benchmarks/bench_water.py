"""Benchmark: solar water pumping.

Targets (issue 15): direct-coupled daily flows of 12 months < 50 ms; the 30-year daily tank
balance < 0.2 s.  Run: PYTHONPATH=. python benchmarks/bench_water.py
"""

from __future__ import annotations

import copy
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))


def _best(fn, n: int) -> tuple[float, float]:
    runs = []
    for _ in range(n):
        t = time.perf_counter()
        fn()
        runs.append(time.perf_counter() - t)
    return min(runs), statistics.median(runs)


def main() -> None:
    import numpy as np

    from offgrid.design.pv import fit_module
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import resolve_climate
    from offgrid.paths import demo_water_path
    from offgrid.project.store import load_project
    from offgrid.simulate.weather import MONTH_OF_DAY, synthetic_daily_insolation
    from offgrid.water.balance import daily_pumped_m3, pumped_volume_table, tank_balance
    from offgrid.water.coupling import ArrayLayout
    from offgrid.water.design import daily_flows, day_conditions, water_design

    p = load_project(demo_water_path())
    direct = copy.deepcopy(p)
    pump = direct.water[0].pump
    pump.drive = "direct"
    pump.voltage_v = [[45.0, 60.0, 75.0, 90.0], [50.0, 65.0, 80.0, 95.0], [55.0, 70.0, 85.0, 100.0]]
    pump.max_input_v = 120.0
    climate = resolve_climate(p)
    params = fit_module(p.module)
    for label, proj in (("direct", direct), ("controller", p)):
        s = proj.water[0]
        cond = day_conditions(proj, climate, s, ReasonBook())
        lay = ArrayLayout(2, 2)
        best, med = _best(lambda proj=proj, s=s, cond=cond, lay=lay: daily_flows(
            params, s, cond, lay), 20)  # fmt: skip
        print(f"{label:10s} daily flows, 12 months x 48 steps (head iterated): "
              f"best {best * 1e3:.1f} ms, median {med * 1e3:.1f} ms (target < 50 ms)")  # fmt: skip

    w = water_design(p, 0)
    s = p.water[0]
    cond = day_conditions(p, climate, s, ReasonBook())
    weather = synthetic_daily_insolation(climate.insolation_kwh_m2_day, p.site.latitude_deg, 30, 1)
    need = np.tile(np.asarray(s.need_m3_day)[MONTH_OF_DAY], 30)
    lay = ArrayLayout(w.series, w.parallel)

    def balance():
        table = pumped_volume_table(params, s, cond, lay, w.total_dynamic_head_m)
        pumped = daily_pumped_m3(table, weather)
        tank_balance(pumped, need, w.tank_size_m3, w.tank_size_m3)

    best, med = _best(balance, 10)
    print(f"30-year tank balance (volume table + 10950 days): best {best * 1e3:.1f} ms, "
          f"median {med * 1e3:.1f} ms (target < 200 ms)")  # fmt: skip
    best, med = _best(lambda: water_design(p, 0), 5)
    print(f"whole water design of the demo (layout search): best {best * 1e3:.0f} ms, "
          f"median {med * 1e3:.0f} ms")  # fmt: skip


if __name__ == "__main__":
    main()
