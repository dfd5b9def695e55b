"""Load analysis: daily energy by month, AC/DC split, inverter losses, peaks and surge.

Energy of one appliance line [Wh/day] = quantity x power_w x hours_per_day x duty_cycle,
in the months it is used.  AC energy reaches the battery through the inverter
(divided by its efficiency) plus the inverter's idle draw (self-consumption x
hours on), which is often a large share on small systems; the idle draw is counted
only in the months with AC use, unless the project keeps the inverter on all year.
The surveyed total is then raised by the explicit load-growth margin.  (Common practice, no source;
the same chain is laid out in Sandia's *Stand-Alone Photovoltaic Systems: A
Handbook of Recommended Design Practices*, SAND87-7023, worksheet 1, from memory.)
"""

from __future__ import annotations

import numpy as np

from offgrid.design.result import LoadResult, ReasonBook, fmt
from offgrid.project.model import InverterSpec, Load


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
    per_day = np.array(
        [ld.quantity * ld.power_w * ld.hours_per_day * ld.duty_cycle for ld in loads]
    )
    return per_day[:, None] * month_mask(loads)


MONTH_NAMES = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")

#: How the AC power on at once and the inverter's starting need are worked out (stated in
#: the reasons; common practice, no source).
PEAK_FORMULA = (
    "largest over the months of max(coincidence factor x connected AC power of "
    "the month, the largest single AC load line = quantity x power): the factor "
    "never makes it smaller than one appliance and does not apply to one alone"
)
SURGE_FORMULA = (
    "largest over AC appliances and months of [its start + the other AC loads "
    "used that month at the coincidence factor, never less than the largest of "
    "them]; start = one unit's starting power (its running power if none given) + "
    "(quantity - 1) x power; at least the peak AC power"
)


def _month_list(months: np.ndarray) -> str:
    return ", ".join(MONTH_NAMES[i] for i in np.flatnonzero(months)) or "none"


def ac_peak_w(unit_w: np.ndarray, mask: np.ndarray, coincidence_factor: float) -> float:
    """AC power on at once [W]: the busiest month of max(CF x connected, largest line).

    ``unit_w`` (n,): quantity x power of each AC line [W]; ``mask`` (n, 12): used that month.
    A line's units are taken as running together; the coincidence factor never brings the
    figure below one line, so it has no effect on a single appliance (common practice, no
    source).
    """
    if unit_w.size == 0:
        return 0.0
    on = unit_w[:, None] * mask
    return float(np.maximum(coincidence_factor * on.sum(axis=0), on.max(axis=0)).max())


def ac_surge_need_w(
    unit_w: np.ndarray, start_w: np.ndarray, mask: np.ndarray, coincidence_factor: float
) -> tuple[float, int]:
    """Starting need on the inverter [W] and the line (index) that sets it.

    need = max over lines i and months m used by i of
    start_i + max(CF x sum of the other lines used in m, the largest of them);
    ``start_w`` (n,) is one unit's start + (quantity - 1) x power [W].  The same peak rule as
    :func:`ac_peak_w`, applied to what runs beside the starting appliance.
    """
    if unit_w.size == 0:
        return 0.0, -1
    on = unit_w[:, None] * mask  # (n, 12)
    total = on.sum(axis=0)  # (12,)
    others_sum = total[None, :] - on  # (n, 12)
    # largest other line each month, line i itself left out: (n, n, 12) -> (n, 12)
    others_max = np.where(np.eye(len(on), dtype=bool)[:, :, None], 0.0, on[None, :, :]).max(axis=1)
    beside = np.maximum(coincidence_factor * others_sum, others_max)
    need = np.where(mask, start_w[:, None] + beside, 0.0)
    i, m = np.unravel_index(int(np.argmax(need)), need.shape)
    return float(need[i, m]), int(i)


def analyse_loads(
    loads: list[Load],
    inverter: InverterSpec,
    growth_pct: float,
    coincidence_factor: float,
    book: ReasonBook | None = None,
) -> LoadResult:
    """Daily energy by month at the battery and the power figures the inverter needs."""
    book = book or ReasonBook()
    e = appliance_energy_wh(loads)
    is_ac = np.array([ld.ac_dc == "ac" for ld in loads], dtype=bool)
    is_crit = np.array([ld.critical for ld in loads], dtype=bool)
    ac = e[is_ac].sum(axis=0) if len(loads) else np.zeros(12)
    dc = e[~is_ac].sum(axis=0) if len(loads) else np.zeros(12)
    has_ac = bool(is_ac.any())
    eta = inverter.efficiency
    mask = month_mask(loads) if loads else np.zeros((0, 12), dtype=bool)
    ac_months = mask[is_ac].any(axis=0) if has_ac else np.zeros(12, dtype=bool)
    on_all_year = bool(getattr(inverter, "on_all_year", False))
    idle = inverter.self_consumption_w * inverter.hours_on_per_day if has_ac else 0.0
    idle_on = np.ones(12, dtype=bool) if (has_ac and on_all_year) else ac_months
    idle_m = np.where(idle_on, idle, 0.0)
    loss = ac / eta - ac
    growth = 1.0 + growth_pct / 100.0
    at_battery = (dc + ac / eta + idle_m) * growth
    # A critical AC load keeps the inverter on in its months: that idle draw is critical too.
    crit_ac_months = (
        mask[is_crit & is_ac].any(axis=0) if (is_crit & is_ac).any() else np.zeros(12, dtype=bool)
    )
    crit_ac = bool(crit_ac_months.any())
    crit_e = (
        e[is_crit & is_ac].sum(axis=0) / eta
        + e[is_crit & ~is_ac].sum(axis=0)
        + np.where(crit_ac_months, idle_m, 0.0)
    )
    crit = crit_e * growth

    # connected power of the busiest month (a load listed twice for two seasons counts once)
    unit_w = np.array([ld.quantity * ld.power_w for ld in loads], dtype=float)
    connected_ac = float((unit_w[is_ac, None] * mask[is_ac]).sum(axis=0).max()) if has_ac else 0.0
    connected_dc = (
        float((unit_w[~is_ac, None] * mask[~is_ac]).sum(axis=0).max()) if (~is_ac).any() else 0.0
    )
    peak_ac = ac_peak_w(unit_w[is_ac], mask[is_ac], coincidence_factor) if has_ac else 0.0
    # largest start of any one appliance, AC or DC (a DC pump or compressor starts hard too)
    surge_name, surge_w, surge_kind = "", 0.0, ""
    for ld in loads:
        if ld.quantity > 0 and ld.surge_w > surge_w:
            surge_name, surge_w, surge_kind = ld.name, ld.surge_w, ld.ac_dc
    # the inverter's starting need: one AC appliance starts beside the others
    ac_loads = [ld for ld in loads if ld.ac_dc == "ac"]
    start_w = np.array(
        [
            max(ld.surge_w, ld.power_w) + (ld.quantity - 1) * ld.power_w if ld.quantity > 0 else 0.0
            for ld in ac_loads
        ],
        dtype=float,
    )
    need_w, need_i = (
        ac_surge_need_w(unit_w[is_ac], start_w, mask[is_ac], coincidence_factor)
        if has_ac
        else (0.0, -1)
    )
    need_w = max(need_w, peak_ac)
    need_name = ac_loads[need_i].name if need_i >= 0 else ""
    largest_line = float((unit_w[is_ac, None] * mask[is_ac]).max()) if has_ac else 0.0

    counted = (
        "every month (the project keeps the inverter on all year: inverter.on_all_year)"
        if on_all_year and has_ac
        else "every month (an AC load is used in every month)"
        if ac_months.all()
        else f"only in the months with AC use ({_month_list(ac_months)}); the inverter is "
        "switched off in the others (inverter.on_all_year = false)"
        if has_ac
        else "no AC loads: no inverter"
    )
    book.add(
        "loads.daily_energy_wh",
        "(DC appliance energy + AC appliance energy / inverter efficiency + inverter idle "
        "draw x hours on, in the months it is counted) x (1 + load-growth margin), each "
        "month",
        "common practice, no source",
        dc_jan=fmt(float(dc[0]), "Wh/day"),
        ac_jan=fmt(float(ac[0]), "Wh/day"),
        inverter_efficiency=fmt(eta),
        idle=fmt(idle, "Wh/day"),
        idle_counted=counted,
        growth=fmt(growth_pct, "%"),
    )
    book.add(
        "loads.inverter_idle_wh",
        "inverter self-consumption x hours on per day, on a day the inverter is on",
        "common practice, no source",
        self_consumption=fmt(inverter.self_consumption_w, "W"),
        hours_on=fmt(inverter.hours_on_per_day, "h"),
        counted=counted,
    )
    book.add(
        "loads.inverter_idle_by_month_wh",
        "the idle draw in each month where it is counted, 0 in the others",
        "common practice, no source",
        counted=counted,
    )
    book.add(
        "loads.peak_ac_w",
        PEAK_FORMULA,
        "common practice, no source",
        connected=fmt(connected_ac, "W"),
        largest_line=fmt(largest_line, "W"),
        coincidence_factor=fmt(coincidence_factor),
    )
    book.add(
        "loads.largest_surge_w",
        "largest starting power of one appliance, AC or DC",
        "common practice, no source",
        appliance=f"{surge_name} ({surge_kind.upper()})" if surge_name else "none given",
    )
    book.add(
        "loads.surge_need_w",
        SURGE_FORMULA,
        "common practice, no source",
        appliance=need_name or "none",
        coincidence_factor=fmt(coincidence_factor),
        value=fmt(need_w, "W"),
    )
    book.add(
        "loads.per_load_wh",
        "quantity x power x hours per day x duty cycle of each load "
        "line, in the months it is used (at the appliance)",
        "common practice, no source",
    )
    book.add(
        "loads.ac_energy_wh",
        "sum of the AC load lines used that month, at the appliances",
        "common practice, no source",
        jan=fmt(float(ac[0]), "Wh/day"),
    )
    book.add(
        "loads.dc_energy_wh",
        "sum of the DC load lines used that month, at the appliances",
        "common practice, no source",
        jan=fmt(float(dc[0]), "Wh/day"),
    )
    book.add(
        "loads.inverter_loss_wh",
        "AC energy / inverter efficiency - AC energy",
        "common practice, no source",
        inverter_efficiency=fmt(eta),
    )
    book.add(
        "loads.critical_energy_wh",
        "(critical DC energy + critical AC energy / inverter "
        "efficiency + the inverter's idle draw in the months a critical AC load is used) "
        "x (1 + load-growth margin)",
        "common practice, no source",
        growth=fmt(growth_pct, "%"),
        idle_counted=_month_list(crit_ac_months) if crit_ac else "no",
    )
    book.add(
        "loads.max_daily_energy_wh",
        "largest of the twelve monthly daily energies at the battery (it sizes the battery)",
        "common practice, no source",
        value=fmt(float(at_battery.max()) if len(at_battery) else 0.0, "Wh/day"),
    )
    book.given("loads.growth_pct", "choices.load_growth_pct", fmt(growth_pct, "%"))
    book.given("loads.coincidence_factor", "choices.coincidence_factor", fmt(coincidence_factor))
    book.add(
        "loads.connected_ac_w",
        "sum of quantity x power of the AC loads used in the busiest month",
        "common practice, no source",
        value=fmt(connected_ac, "W"),
    )
    book.add(
        "loads.connected_dc_w",
        "sum of quantity x power of the DC loads used in the busiest month",
        "common practice, no source",
        value=fmt(connected_dc, "W"),
    )
    book.add(
        "loads.peak_dc_w",
        "connected DC power (every DC load taken as on at once)",
        "common practice, no source",
        value=fmt(connected_dc, "W"),
    )
    return LoadResult(
        daily_energy_wh=tuple(float(x) for x in at_battery),
        ac_energy_wh=tuple(float(x) for x in ac),
        dc_energy_wh=tuple(float(x) for x in dc),
        inverter_loss_wh=tuple(float(x) for x in loss),
        inverter_idle_wh=float(idle),
        inverter_idle_by_month_wh=tuple(float(x) for x in idle_m),
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
        largest_surge_ac_dc=surge_kind,
        surge_need_w=float(need_w),
        surge_need_load=need_name,
        per_load_wh=tuple(tuple(float(x) for x in row) for row in e),
    )
