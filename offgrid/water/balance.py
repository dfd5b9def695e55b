"""Daily water balance of the tank over years of synthetic weather.

Each day's pumped volume comes from the month's mean-day operating points with the day's
irradiance scaled by the day's insolation over the monthly mean (the shape of the day kept;
common practice, no source: cloudy days flatten the shape, so this is an estimate).  The
weather is :func:`offgrid.simulate.weather.synthetic_daily_insolation` (Aguiar et al. 1988).

Balance of each day (the pump stops when the float switch says the tank is full):

    available  = level + pumped
    delivered  = min(need, available)
    level'     = min(capacity, available - delivered)
    not pumped = available - delivered - level'   (tank full)
    short      = need - delivered
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design.result import DesignError
from offgrid.water.coupling import ArrayLayout
from offgrid.water.design import (
    DayConditions,
    input_power_w,
)
from offgrid.water.pump import flow_at_power_m3_h, pump_at_head

SCALE_GRID = np.linspace(0.0, 2.5, 26)


@dataclass(frozen=True)
class TankBalance:
    level_m3: np.ndarray  # end of each day
    delivered_m3: np.ndarray
    short_m3: np.ndarray
    not_pumped_m3: np.ndarray

    @property
    def days_short(self) -> int:
        return int(np.count_nonzero(self.short_m3 > 1e-9))

    @property
    def days_full(self) -> int:
        return int(np.count_nonzero(self.not_pumped_m3 > 1e-9))


def tank_balance(pumped_m3, need_m3, capacity_m3: float, start_m3: float) -> TankBalance:
    """Day-by-day tank balance (see the module notes) [m3]."""
    pumped = np.asarray(pumped_m3, dtype=float).tolist()
    need = np.asarray(need_m3, dtype=float).tolist()
    if len(pumped) != len(need):
        raise ValueError("pumped and need must have one value per day each")
    n = len(pumped)
    level = np.empty(n)
    delivered = np.empty(n)
    short = np.empty(n)
    spill = np.empty(n)
    s = float(min(start_m3, capacity_m3))
    cap = float(capacity_m3)
    for t in range(n):
        avail = s + pumped[t]
        d = need[t] if need[t] < avail else avail
        rest = avail - d
        s = rest if rest < cap else cap
        level[t] = s
        delivered[t] = d
        short[t] = need[t] - d
        spill[t] = rest - s
    return TankBalance(level, delivered, short, spill)


def pumped_volume_table(
    params, supply, cond: DayConditions, layout: ArrayLayout, head_m, field: str = "water[1].pump"
):
    """Volume per day [m3] of each month at each day-scaling factor of ``SCALE_GRID``."""
    pump = pump_at_head(supply.pump, head_m, field)
    g = cond.irradiance_w_m2[:, None, :] * SCALE_GRID[None, :, None]
    tc = cond.cell_temp_c(g)
    p = input_power_w(params, supply, g, tc, layout, pump, cond.mismatch)
    # the borehole's safe yield caps the rate on days brighter than the mean (the design keeps
    # the mean day's peak within it; a flow-limited controller is assumed)
    q = np.minimum(flow_at_power_m3_h(pump, p), supply.safe_yield_m3_h)
    return (q * cond.step_h[:, None, None]).sum(axis=-1)


def daily_pumped_m3(table, weather) -> np.ndarray:
    """Each day's pumped volume [m3] from the table and the weather's daily insolation."""
    h = weather.flat()
    month = weather.month_of_day
    mean = np.asarray(weather.target_kwh_m2_day, dtype=float)
    k = np.divide(h, mean[month], out=np.zeros_like(h), where=mean[month] > 0)
    out = np.empty_like(h)
    for m in range(12):
        sel = month == m
        out[sel] = np.interp(k[sel], SCALE_GRID, table[m])
    return out


def simulate_tank(project, index: int = 0, years: int = 30, seed: int = 1, base=None):
    """The designed supply's tank over ``years`` of synthetic weather.

    Returns (TankBalance, summary dict of plain numbers)."""
    from offgrid.design.pv import fit_module
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import resolve_climate
    from offgrid.simulate.weather import MONTH_OF_DAY, synthetic_daily_insolation
    from offgrid.water.design import day_conditions, water_design

    w = water_design(project, index, base)
    supply = project.water[index]
    climate = resolve_climate(project, base)
    cond = day_conditions(project, climate, supply, ReasonBook())
    params = fit_module(project.module)
    layout = ArrayLayout(w.series, w.parallel)
    table = pumped_volume_table(
        params, supply, cond, layout, w.total_dynamic_head_m, f"water[{index + 1}].pump"
    )
    try:
        weather = synthetic_daily_insolation(
            climate.insolation_kwh_m2_day, project.site.latitude_deg, years=years, seed=seed
        )
    except ValueError as exc:
        raise DesignError("water-weather", str(exc), "climate") from exc
    pumped = daily_pumped_m3(table, weather)
    need = np.tile(np.asarray(supply.need_m3_day, dtype=float)[MONTH_OF_DAY], weather.years)
    cap = w.tank_size_m3 * w.tank_count
    bal = tank_balance(pumped, need, cap, cap)
    summary = {
        "years": weather.years,
        "seed": seed,
        "tank_m3": cap,
        "days_short": bal.days_short,
        "days_short_pct": 100.0 * bal.days_short / weather.days,
        "water_short_m3": float(bal.short_m3.sum()),
        "water_short_pct": 100.0 * float(bal.short_m3.sum()) / float(need.sum()),
        "days_tank_full": bal.days_full,
        "lowest_level_m3": float(bal.level_m3.min()),
        "method": "daily tank balance over Aguiar et al. (1988) synthetic days; pumped volume "
        "of each day from the month's mean-day operating points scaled by the day's insolation",
    }
    return bal, summary
