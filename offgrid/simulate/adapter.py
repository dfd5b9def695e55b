"""From a project and its worst-month design to the plain simulation inputs.

What is taken from the design (so the simulation and the worst-month method
agree on every derate):

* per-month yield = energy into the battery / (array power x plane-of-array
  insolation): the derate chain's supply with the battery round-trip derate taken
  back out (the simulation models charge and discharge losses itself), or the
  harvest through the chosen controller from the I-V curves when that is lower;
* plane-of-array / horizontal ratio per month from the site result;
* controller output limit = rated current x controllers x system voltage,
  kept per W of array when the sweep resizes the array;
* battery: nominal energy (at the bank's own nominal voltage, units in series x unit
  voltage) divided by the design's temperature factor (the capacity available at the
  battery's temperature), its calendar life at the warm-season temperatures, its
  depth-of-discharge
  limit and discharge efficiency; the charge efficiency is the round-trip
  efficiency / the discharge efficiency;
* loads at the battery bus per month (critical part separately), spread over
  the day by each load's time of day; the inverter's idle draw is spread
  evenly over the day (and is critical when a critical load is AC).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from offgrid.design.battery import MAX_CHARGE_C_RATE
from offgrid.design.result import SystemDesign
from offgrid.project.model import Project
from offgrid.simulate.balance import SystemInputs, check_inputs
from offgrid.simulate.profiles import HOURS, window_profile

__all__ = ["MAX_CHARGE_C_RATE", "inputs_from_design", "measured_daily"]
ROUND_TRIP_DERATE = "battery round trip"


def _profiles(project: Project, design: SystemDesign) -> tuple[np.ndarray, np.ndarray]:
    """(total, critical) hourly shares of the battery-bus load, 12 x 24 each."""
    lr = design.loads
    inv_eff = project.inverter.efficiency if project.inverter.efficiency > 0 else 1.0
    total = np.zeros((12, HOURS))
    crit = np.zeros((12, HOURS))
    per_load = lr.per_load_wh
    if len(per_load) != len(project.loads):
        raise ValueError(
            "design: the load results do not match the project's loads; size the project again"
        )
    for load, wh in zip(project.loads, per_load, strict=True):
        at_bus = np.asarray(wh, dtype=float) / (inv_eff if load.ac_dc == "ac" else 1.0)
        shape = window_profile(load.time_of_day)
        total += at_bus[:, None] * shape
        if load.critical:
            crit += at_bus[:, None] * shape
    idle = np.asarray(lr.inverter_idle_by_month_wh, dtype=float)  # 0 where switched off
    if idle.any():
        total += idle[:, None] * window_profile("any")[None, :]
        crit_ac = [ld for ld in project.loads if ld.critical and ld.ac_dc == "ac"]
        if crit_ac:  # as loads.py: in the months a critical AC load is used
            crit_m = np.zeros(12, dtype=bool)
            for ld in crit_ac:
                crit_m[[m - 1 for m in ld.months]] = True
            crit += np.where(crit_m, idle, 0.0)[:, None] * window_profile("any")[None, :]

    def norm(a):
        s = a.sum(axis=1, keepdims=True)
        flat = np.tile(window_profile("any"), (12, 1))
        return np.divide(a, s, out=flat, where=s > 0)

    return norm(total), norm(crit)


def inputs_from_design(
    project: Project, design: SystemDesign, *, initial_soc: float = 1.0
) -> SystemInputs:
    """:class:`SystemInputs` for the design's own array and battery."""
    site, arr, bat, ctl = design.site, design.array, design.battery, design.controller
    h = np.asarray(site.horizontal_kwh_m2_day, dtype=float)
    poa = np.asarray(site.poa_kwh_m2_day, dtype=float)
    ratio = np.divide(poa, h, out=np.ones(12), where=h > 0)
    rt = float(arr.derates.get(ROUND_TRIP_DERATE, 1.0)) or 1.0
    into_battery = np.asarray(arr.supply_wh_day, dtype=float) / rt  # derate chain
    harvest = arr.harvest_pwm_wh_day if ctl.type == "pwm" else arr.harvest_mppt_wh_day
    if len(harvest) == 12:  # the I-V curves' harvest, when lower, is the one to trust
        into_battery = np.minimum(into_battery, np.asarray(harvest, dtype=float))
    denom = arr.power_w * poa
    fallback = arr.derate_total / rt
    yf = np.divide(into_battery, denom, out=np.full(12, fallback), where=denom > 0)
    if not np.all(np.isfinite(yf)) or np.any(yf < 0) or np.any(yf > 1.5):
        raise ValueError(
            "design: the array supply per month does not match its power and "
            "insolation; size the project again"
        )
    total_p, crit_p = _profiles(project, design)
    ed = float(bat.discharge_efficiency)
    rte = float(project.battery.efficiency)
    if not 0 < ed <= 1 or not 0 < rte <= 1:
        raise ValueError("battery.efficiency: must be a fraction in (0, 1]")
    ec = min(1.0, rte / ed)
    temp_factor = bat.temp_factor if bat.temp_factor > 0 else 1.0
    capacity_wh = bat.nominal_kwh * 1000.0 / temp_factor
    bank_v = bat.bank_voltage_v or float(bat.system_voltage_v)
    ctrl_w = ctl.current_a * ctl.count * bank_v
    calendar = bat.calendar_life_years if bat.calendar_life_years > 0 else None
    notes = (
        "from the worst-month design: monthly derates or the I-V harvest where lower "
        "(battery round trip left to the simulation), plane-of-array ratio, controller rating "
        f"{ctl.count} x {ctl.current_a:g} A at {bank_v:g} V",
        f"battery: {bat.nominal_kwh:.2f} kWh nominal / temperature factor {temp_factor:.3f}; "
        f"charge {ec:.3f}, discharge {ed:.3f}; max charge rate "
        f"C/{1 / MAX_CHARGE_C_RATE.get(bat.chemistry, 0.2):.0f} (from memory)",
        f"battery temperatures: {bat.capacity_temp_c:.0f} C for capacity, up to "
        f"{bat.ageing_temp_c:.0f} C for ageing; calendar life "
        + (f"{calendar:.1f} years" if calendar else "preset at 25 C"),
    )
    load = np.asarray(design.loads.daily_energy_wh, dtype=float)
    crit = np.minimum(np.asarray(design.loads.critical_energy_wh, dtype=float), load)
    return check_inputs(
        SystemInputs(
            insolation_kwh_m2_day=h,
            latitude_deg=float(site.latitude_deg),
            poa_ratio=ratio,
            yield_factor=yf,
            load_wh=load,
            critical_wh=crit,
            load_profile=total_p,
            critical_profile=crit_p,
            array_w=float(arr.power_w),
            capacity_wh=float(capacity_wh),
            max_dod=float(bat.max_dod),
            eta_charge=ec,
            eta_discharge=ed,
            controller_w_per_w=(ctrl_w / arr.power_w) if arr.power_w > 0 and ctrl_w > 0 else None,
            charge_c_rate=MAX_CHARGE_C_RATE.get(bat.chemistry),
            initial_soc=initial_soc,
            chemistry=bat.chemistry,
            notes=notes,
            calendar_life_years=calendar,
        )
    )


def measured_daily(project: Project, base: Path | None = None) -> np.ndarray | None:
    """Real daily insolation of an imported weather year, when the climate carries one."""
    from offgrid.design.sizing import resolve_climate

    climate = resolve_climate(project, base)
    daily = getattr(climate, "daily", None)
    if daily is None:
        return None
    values = getattr(daily, "insolation_kwh_m2_day", None)
    if not values:
        return None
    return np.asarray(values, dtype=float)
