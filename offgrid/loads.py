"""Load analysis: daily energy by month, AC/DC split, inverter losses, peaks and surge.

Energy of one appliance line [Wh/day] = quantity x power_w x hours_per_day x duty_cycle,
in the months it is used.  AC energy reaches the battery through the inverter
(divided by its efficiency) plus the inverter's idle draw (self-consumption x
hours on), which is often a large share on small systems.  The surveyed total
is then raised by the explicit load-growth margin.  (Common practice, no source;
the same chain is laid out in Sandia's *Stand-Alone Photovoltaic Systems: A
Handbook of Recommended Design Practices*, SAND87-7023, worksheet 1, from memory.)
"""

from __future__ import annotations

import numpy as np

from offgrid.project.model import InverterSpec, Load
from offgrid.result import LoadResult, ReasonBook, fmt


def month_mask(loads: list[Load]) -> np.ndarray:
    """Boolean array (n_loads, 12): True where the load is used in that month."""
    mask = np.zeros((len(loads), 12), dtype=bool)
    for i, ld in enumerate(loads):
        mask[i, [m - 1 for m in ld.months]] = True
    return mask


def appliance_energy_wh(loads: list[Load]) -> np.ndarray:
    """Daily energy of each load line in each month at the appliance [Wh/day], shape (n, 12)."""
    if not loads:
        return np.zeros((0, 12))
    per_day = np.array([ld.quantity * ld.power_w * ld.hours_per_day * ld.duty_cycle
                        for ld in loads])
    return per_day[:, None] * month_mask(loads)


def analyse_loads(loads: list[Load], inverter: InverterSpec, growth_pct: float,
                  coincidence_factor: float, book: ReasonBook | None = None) -> LoadResult:
    """Daily energy by month at the battery and the power figures the inverter needs."""
    book = book or ReasonBook()
    e = appliance_energy_wh(loads)
    is_ac = np.array([ld.ac_dc == "ac" for ld in loads], dtype=bool)
    is_crit = np.array([ld.critical for ld in loads], dtype=bool)
    ac = e[is_ac].sum(axis=0) if len(loads) else np.zeros(12)
    dc = e[~is_ac].sum(axis=0) if len(loads) else np.zeros(12)
    has_ac = bool(is_ac.any())
    eta = inverter.efficiency
    idle = inverter.self_consumption_w * inverter.hours_on_per_day if has_ac else 0.0
    loss = ac / eta - ac
    growth = 1.0 + growth_pct / 100.0
    at_battery = (dc + ac / eta + idle) * growth
    crit_e = e[is_crit & is_ac].sum(axis=0) / eta + e[is_crit & ~is_ac].sum(axis=0)
    crit = crit_e * growth

    # connected power of the busiest month (a load listed twice for two seasons counts once)
    mask = month_mask(loads) if loads else np.zeros((0, 12), dtype=bool)
    unit_w = np.array([ld.quantity * ld.power_w for ld in loads], dtype=float)
    connected_ac = float((unit_w[is_ac, None] * mask[is_ac]).sum(axis=0).max()) if has_ac else 0.0
    connected_dc = (float((unit_w[~is_ac, None] * mask[~is_ac]).sum(axis=0).max())
                    if (~is_ac).any() else 0.0)
    peak_ac = connected_ac * coincidence_factor
    surge_name, surge_w = "", 0.0
    for ld in loads:
        if ld.ac_dc == "ac" and ld.quantity > 0 and ld.surge_w > surge_w:
            surge_name, surge_w = ld.name, ld.surge_w

    book.add("loads.daily_energy_wh",
             "(DC appliance energy + AC appliance energy / inverter efficiency + inverter idle "
             "draw x hours on) x (1 + load-growth margin), each month",
             "common practice, no source",
             dc_jan=fmt(float(dc[0]), "Wh/day"), ac_jan=fmt(float(ac[0]), "Wh/day"),
             inverter_efficiency=fmt(eta), idle=fmt(idle, "Wh/day"),
             growth=fmt(growth_pct, "%"))
    book.add("loads.inverter_idle_wh", "inverter self-consumption x hours on per day",
             "common practice, no source",
             self_consumption=fmt(inverter.self_consumption_w, "W"),
             hours_on=fmt(inverter.hours_on_per_day, "h"))
    book.add("loads.peak_ac_w", "connected AC power of the busiest month x coincidence factor "
             "(share on at once)",
             "common practice, no source", connected=fmt(connected_ac, "W"),
             coincidence_factor=fmt(coincidence_factor))
    book.add("loads.largest_surge_w", "largest starting power of one AC appliance",
             "common practice, no source", appliance=surge_name or "none")
    return LoadResult(
        daily_energy_wh=tuple(float(x) for x in at_battery),
        ac_energy_wh=tuple(float(x) for x in ac),
        dc_energy_wh=tuple(float(x) for x in dc),
        inverter_loss_wh=tuple(float(x) for x in loss),
        inverter_idle_wh=float(idle),
        critical_energy_wh=tuple(float(x) for x in crit),
        design_daily_energy_wh=0.0,  # set by sizing once the design month is known
        max_daily_energy_wh=float(at_battery.max()) if len(at_battery) else 0.0,
        growth_pct=float(growth_pct),
        coincidence_factor=float(coincidence_factor),
        connected_ac_w=float(connected_ac),
        connected_dc_w=float(connected_dc),
        peak_ac_w=float(peak_ac),
        peak_dc_w=float(connected_dc),
        largest_surge_w=float(surge_w),
        largest_surge_load=surge_name,
        per_load_wh=tuple(tuple(float(x) for x in row) for row in e),
    )
