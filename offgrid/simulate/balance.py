"""Battery energy balance, step by step, for many designs at once.

A *design* here is a pair (array size [W], battery capacity [Wh]); every other
figure (derates, efficiencies, loads, controller rating per W of array) is
shared.  The loop runs over time steps; each step is vectorised across the
designs (numpy arrays), or runs on plain floats for a single design, which is
faster there.  The same step code serves both.

One step, in this order (a DC-coupled stand-alone system, all PV power passing
through the charge controller onto the battery bus):

1. PV energy at the controller output ``P`` (already clipped at the controller's
   current limit) serves the loads directly, critical loads first.
2. What PV cannot cover comes from the battery down to its depth-of-discharge
   floor, through the discharge efficiency; what still cannot be served is
   shed, the non-critical loads before the critical ones.
3. PV left over charges the battery up to full, limited by the battery's
   maximum charge rate, through the charge efficiency; the rest is spilled
   (the controller throttles the array).

Energy is conserved at every step:
``P = served + spilled + charge loss + discharge loss + change of stored energy``.

Daily mode has two steps a day: the *sun* step (the day's PV and the loads in
hours with sun) and the *dark* step (loads in the hours without sun, from the
battery alone), so night loads always draw on the battery.  Hourly mode has 24
steps a day using the Collares-Pereira & Rabl hourly shape of the day's sun.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field, fields, replace

import numpy as np

from offgrid.climate.sky import KLEIN_MEAN_DAY
from offgrid.simulate.profiles import (
    HOURS,
    clipped_daily_fraction,
    collares_pereira_rabl_rt,
    window_profile,
)
from offgrid.simulate.weather import WeatherSeries, check_monthly

SHED_TOLERANCE_WH = 1e-6  # a step counts as shedding above this unmet energy
MAX_DESIGN_DAYS = 400_000_000  # refuse runs that would take minutes
UNLIMITED_WH = 1e15  # stands for an infinite battery capacity
SMALL_N = 8  # up to this many designs run one by one on plain floats


class SimulationCancelled(Exception):
    """The caller's cancel check returned True; nothing was changed."""


@dataclass(frozen=True)
class SystemInputs:
    """Plain inputs of the simulation (no dependence on the sizing engine).

    Monthly arrays have 12 values, January first.  Loads are daily energy at the
    battery bus [Wh] (inverter losses included); profiles give each hour's
    share of the day's energy (12 x 24, rows sum to 1).
    """

    insolation_kwh_m2_day: np.ndarray  # horizontal monthly means
    latitude_deg: float
    poa_ratio: np.ndarray  # plane-of-array / horizontal, per month
    yield_factor: np.ndarray  # Wh at the controller output per W of array per kWh/m2 POA
    load_wh: np.ndarray  # daily load at the battery bus, per month
    critical_wh: np.ndarray  # the critical part of it
    load_profile: np.ndarray  # (12, 24) hourly shares of the total load
    critical_profile: np.ndarray  # (12, 24) hourly shares of the critical load
    array_w: float  # the reference design
    capacity_wh: float  # the reference design, nominal
    max_dod: float
    eta_charge: float
    eta_discharge: float
    controller_w_per_w: float | None = None  # controller output limit per W of array
    charge_c_rate: float | None = None  # max charge power / nominal capacity [1/h]
    initial_soc: float = 1.0
    chemistry: str = "agm"
    notes: tuple[str, ...] = field(default_factory=tuple)
    calendar_life_years: float | None = None  # at the battery's temperatures; None: at 25 C


def profile_from_windows(windows: list[tuple[str, float]]) -> np.ndarray:
    """Hourly shares (24,) of loads given as (time_of_day, daily Wh) pairs."""
    total = sum(wh for _, wh in windows)
    prof = np.zeros(HOURS)
    for tod, wh in windows:
        prof += wh * window_profile(tod)
    if total <= 0:
        return window_profile("any")
    return prof / total


def plain_inputs(
    insolation_kwh_m2_day,
    latitude_deg: float,
    array_w: float,
    capacity_wh: float,
    load_wh,
    critical_share=0.0,
    *,
    poa_ratio=1.0,
    yield_factor=0.75,
    max_dod=0.5,
    round_trip_efficiency=0.85,
    eta_discharge=None,
    load_time_of_day: str = "any",
    critical_time_of_day: str | None = None,
    controller_w_per_w=None,
    charge_c_rate=None,
    initial_soc=1.0,
    chemistry="agm",
) -> SystemInputs:
    """Build :class:`SystemInputs` from plain numbers (scalars broadcast to 12 months).

    ``critical_share`` is the critical fraction of the daily load [0-1].  The
    round-trip efficiency is split evenly (sqrt each way) unless ``eta_discharge``
    is given.
    """

    def months(v, name):
        return check_monthly(np.broadcast_to(np.asarray(v, dtype=float), (12,)).copy(), name)

    h = months(insolation_kwh_m2_day, "monthly insolation")
    load = months(load_wh, "daily load")
    share = months(critical_share, "critical share")
    if np.any(share > 1):
        raise ValueError("critical share: must be between 0 and 1")
    rte = float(round_trip_efficiency)
    if not 0 < rte <= 1:
        raise ValueError("battery efficiency: round-trip efficiency must be in (0, 1]")
    ed = float(np.sqrt(rte)) if eta_discharge is None else float(eta_discharge)
    if not 0 < ed <= 1 or rte / ed > 1 + 1e-9:
        raise ValueError("battery efficiency: discharge efficiency must be in [round-trip, 1]")
    crit_tod = critical_time_of_day or load_time_of_day
    lp = window_profile(load_time_of_day)
    cp = window_profile(crit_tod)
    crit = load * share
    total_prof = crit[:, None] * cp + (load - crit)[:, None] * lp
    tp = np.divide(total_prof, load[:, None], out=np.tile(lp, (12, 1)), where=load[:, None] > 0)
    return check_inputs(
        SystemInputs(
            insolation_kwh_m2_day=h,
            latitude_deg=float(latitude_deg),
            poa_ratio=months(poa_ratio, "plane-of-array ratio"),
            yield_factor=months(yield_factor, "array yield factor"),
            load_wh=load,
            critical_wh=crit,
            load_profile=tp,
            critical_profile=np.tile(cp, (12, 1)),
            array_w=float(array_w),
            capacity_wh=float(capacity_wh),
            max_dod=float(max_dod),
            eta_charge=min(1.0, rte / ed),
            eta_discharge=ed,
            controller_w_per_w=controller_w_per_w,
            charge_c_rate=charge_c_rate,
            initial_soc=float(initial_soc),
            chemistry=chemistry,
        )
    )


def check_inputs(inp: SystemInputs) -> SystemInputs:
    """Validate; every message names the field and the fix."""
    if not 0 < inp.max_dod <= 1:
        raise ValueError(f"depth of discharge: {inp.max_dod} must be in (0, 1]")
    if not 0 < inp.eta_charge <= 1 or not 0 < inp.eta_discharge <= 1:
        raise ValueError("battery efficiency: charge and discharge efficiency must be in (0, 1]")
    if not 0 <= inp.initial_soc <= 1:
        raise ValueError(f"initial state of charge: {inp.initial_soc} must be 0-1")
    if np.any(inp.critical_wh > inp.load_wh + 1e-9):
        raise ValueError("critical load: larger than the whole load in some month")
    for name in ("controller_w_per_w", "charge_c_rate"):
        v = getattr(inp, name)
        if v is not None and not (np.isfinite(v) and v > 0):
            raise ValueError(f"{name.replace('_', ' ')}: {v} must be a positive number or none")
    if inp.array_w < 0 or inp.capacity_wh < 0:
        raise ValueError("design: array size and battery capacity must be 0 or more")
    for name in ("load_profile", "critical_profile"):
        p = getattr(inp, name)
        if p.shape != (12, HOURS) or np.any(p < 0):
            raise ValueError(f"{name.replace('_', ' ')}: need 12 x 24 shares 0 or more")
    return inp


@dataclass(frozen=True)
class Steps:
    """Per-step inputs shared by all designs.  Shapes (days, k)."""

    pv_wh_per_w: np.ndarray  # at the controller output, after its limit
    clipped_wh_per_w: np.ndarray  # lost to the controller limit
    critical_wh: np.ndarray
    other_wh: np.ndarray
    charge_cap_per_wh: np.ndarray | None  # max bus energy into the battery per Wh capacity
    month: np.ndarray  # (days,) 0-11
    steps_per_day: int
    mode: str


def build_steps(inp: SystemInputs, weather: WeatherSeries, mode: str = "daily") -> Steps:
    """Turn daily insolation into per-step PV and load energies."""
    if mode not in ("daily", "hourly"):
        raise ValueError(f"mode: {mode!r} must be 'daily' or 'hourly'")
    month = weather.month_of_day
    h = weather.flat()
    e = h * (inp.poa_ratio * inp.yield_factor)[month]  # Wh per W of array per day
    rt = collares_pereira_rabl_rt(inp.latitude_deg, KLEIN_MEAN_DAY)  # (12, 24)
    sun = rt > 0
    lim = inp.controller_w_per_w
    crit_h = inp.critical_wh[:, None] * inp.critical_profile  # (12, 24)
    other_h = np.maximum(inp.load_wh[:, None] * inp.load_profile - crit_h, 0.0)
    if mode == "hourly":
        raw = e[:, None] * rt[month]
        pv = raw if lim is None else np.minimum(raw, lim)
        cc = None if inp.charge_c_rate is None else np.full(pv.shape, inp.charge_c_rate)
        return Steps(pv, raw - pv, crit_h[month], other_h[month], cc, month, HOURS, mode)
    if lim is None:
        pv_day = e
    else:
        pv_day = np.empty_like(e)
        for m in range(12):
            sel = month == m
            pv_day[sel] = lim * clipped_daily_fraction(rt[m], e[sel] / lim)
    pv = np.stack([pv_day, np.zeros_like(pv_day)], axis=1)
    clipped = np.stack([e - pv_day, np.zeros_like(pv_day)], axis=1)
    crit2 = np.stack([(crit_h * sun).sum(1), (crit_h * ~sun).sum(1)], axis=1)  # (12, 2)
    other2 = np.stack([(other_h * sun).sum(1), (other_h * ~sun).sum(1)], axis=1)
    cc = None
    if inp.charge_c_rate is not None:
        sun_hours = sun.sum(axis=1).astype(float)
        cc = np.stack([inp.charge_c_rate * sun_hours[month], np.zeros(month.size)], axis=1)
    return Steps(pv, clipped, crit2[month], other2[month], cc, month, 2, mode)


@dataclass
class Balance:
    """Totals per design (arrays of n) and, when recorded, the state per step."""

    array_w: np.ndarray
    capacity_wh: np.ndarray
    days: int
    shed_days: np.ndarray
    shed_days_critical: np.ndarray
    longest_shed_run_days: np.ndarray
    longest_shed_run_days_critical: np.ndarray
    demand_wh: float
    demand_critical_wh: float
    unmet_wh: np.ndarray
    unmet_critical_wh: np.ndarray
    pv_wh: np.ndarray  # controller output
    clipped_wh: np.ndarray  # lost to the controller's current limit
    discharge_wh: np.ndarray  # battery output at its terminals
    charge_wh: np.ndarray  # battery input at its terminals
    spilled_wh: np.ndarray
    stored_start_wh: np.ndarray
    stored_end_wh: np.ndarray
    eta_charge: float
    eta_discharge: float
    record: dict[str, np.ndarray] | None = None  # per step: (days, k, n)

    @property
    def lolp(self) -> np.ndarray:
        return self.shed_days / self.days

    @property
    def lolp_critical(self) -> np.ndarray:
        return self.shed_days_critical / self.days

    @property
    def unmet_fraction(self) -> np.ndarray:
        return (
            self.unmet_wh / self.demand_wh if self.demand_wh > 0 else np.zeros_like(self.unmet_wh)
        )

    @property
    def unmet_fraction_critical(self) -> np.ndarray:
        if self.demand_critical_wh <= 0:
            return np.zeros_like(self.unmet_critical_wh)
        return self.unmet_critical_wh / self.demand_critical_wh

    @property
    def losses_wh(self) -> np.ndarray:
        """Charge and discharge losses of the battery [Wh]."""
        return self.charge_wh * (1 - self.eta_charge) + self.discharge_wh * (
            1 / self.eta_discharge - 1
        )


def run_balance(
    steps: Steps,
    array_w,
    capacity_wh,
    *,
    max_dod: float,
    eta_charge: float,
    eta_discharge: float,
    initial_soc: float = 1.0,
    record: bool = False,
    progress: Callable[[float], None] | None = None,
    cancelled: Callable[[], bool] | None = None,
) -> Balance:
    """Run the energy balance for designs (array_w[i], capacity_wh[i]).

    Parameters
    ----------
    steps : Steps
        From :func:`build_steps`.
    array_w, capacity_wh : float or array of n
        Array size [W] and nominal battery capacity [Wh] of each design.
    max_dod : float
        Depth-of-discharge limit [0-1]; the battery is never drawn below 1 - max_dod.
    eta_charge, eta_discharge : float
        Battery charge and discharge energy efficiencies [0-1].
    initial_soc : float
        State of charge at the start [0-1].
    record : bool
        Keep the per-step state (stored energy and flows) for charts, rainflow and checks.
    progress, cancelled : callables, optional
        Called once per simulated year; ``cancelled() -> True`` stops the run.
    """
    aw = np.atleast_1d(np.asarray(array_w, dtype=float))
    cap = np.atleast_1d(np.asarray(capacity_wh, dtype=float))
    aw, cap = np.broadcast_arrays(aw, cap)
    n = aw.size
    days, k = steps.pv_wh_per_w.shape
    if n * days > MAX_DESIGN_DAYS:
        raise ValueError(
            f"simulation too large: {n} designs x {days} days; use fewer years or a coarser sweep"
        )
    if np.any(aw < 0) or np.any(cap < 0) or not np.all(np.isfinite(aw)):
        raise ValueError("design: array size and battery capacity must be 0 or more")
    unlimited = np.isinf(cap)
    cap = np.where(unlimited, UNLIMITED_WH, cap)  # an unlimited battery: a huge store
    if 1 < n <= SMALL_N and not record:
        # a few designs: one plain-float run each is faster than small numpy arrays
        parts = []
        for i in range(n):
            sub = None if progress is None else (lambda f, i=i: progress((i + f) / n))
            parts.append(
                run_balance(
                    steps,
                    aw[i],
                    cap[i],
                    max_dod=max_dod,
                    eta_charge=eta_charge,
                    eta_discharge=eta_discharge,
                    initial_soc=initial_soc,
                    progress=sub,
                    cancelled=cancelled,
                )
            )
        return _concat(parts, unlimited)
    scalar = n == 1
    if scalar:
        mn, mx = min, max
        aw_v, cap_v = float(aw[0]), float(cap[0])
    else:
        mn, mx = np.minimum, np.maximum
        aw_v, cap_v = aw.astype(float), cap.astype(float)
    floor = cap_v * (1.0 - max_dod)
    ec, ed = float(eta_charge), float(eta_discharge)
    iec, ied = 1.0 / ec, 1.0 / ed
    e = cap_v * float(initial_soc)
    e_start = e
    zero = 0.0 if scalar else np.zeros(n)
    tot_pv = tot_draw = tot_cin = tot_spill = zero
    unmet = unmet_c = zero
    shed_days = shed_days_c = zero
    run = run_c = longest = longest_c = zero
    pv_l = steps.pv_wh_per_w.tolist()
    lc_l = steps.critical_wh.tolist()
    lo_l = steps.other_wh.tolist()
    cc_l = None if steps.charge_cap_per_wh is None else steps.charge_cap_per_wh.tolist()
    rec: dict[str, list] | None = (
        {
            "stored_wh": [],
            "pv_wh": [],
            "served_wh": [],
            "discharge_wh": [],
            "charge_wh": [],
            "spilled_wh": [],
            "shed_wh": [],
            "shed_critical_wh": [],
        }
        if record
        else None
    )
    tol = SHED_TOLERANCE_WH
    for d in range(days):
        if (progress is not None or cancelled is not None) and d % 365 == 0:
            if cancelled is not None and cancelled():
                raise SimulationCancelled("simulation cancelled")
            if progress is not None:
                progress(d / days)
        day_shed = day_shed_c = 0.0
        pv_d, lc_d, lo_d = pv_l[d], lc_l[d], lo_l[d]
        for s in range(k):
            q, lc, lo = pv_d[s], lc_d[s], lo_d[s]
            if q > 0.0:
                p = aw_v * q
                b = mx((e - floor) * ed, 0.0)
                avail = p + b
                sc = mn(lc, avail)
                so = mn(lo, avail - sc)
                served = sc + so
                draw = mx(served - p, 0.0)
                e = e - draw * ied
                surplus = p + draw - served
                cin = mn(surplus, (cap_v - e) * iec)
                if cc_l is not None:
                    cin = mn(cin, cc_l[d][s] * cap_v)
                cin = mx(cin, 0.0)
                e = e + cin * ec
                tot_pv = tot_pv + p
                tot_cin = tot_cin + cin
                spill = surplus - cin
                tot_spill = tot_spill + spill
            elif lc > 0.0 or lo > 0.0:
                p = cin = spill = 0.0
                b = mx((e - floor) * ed, 0.0)
                sc = mn(lc, b)
                so = mn(lo, b - sc)
                served = draw = sc + so
                e = e - draw * ied
            else:
                p = cin = spill = served = draw = 0.0
                sc = so = 0.0
            tot_draw = tot_draw + draw
            shed_c = lc - sc
            day_shed_c = day_shed_c + shed_c
            day_shed = day_shed + (lo - so) + shed_c
            if rec is not None:
                rec["stored_wh"].append(e)
                rec["pv_wh"].append(p)
                rec["served_wh"].append(served)
                rec["discharge_wh"].append(draw)
                rec["charge_wh"].append(cin)
                rec["spilled_wh"].append(spill)
                rec["shed_wh"].append((lo - so) + shed_c)
                rec["shed_critical_wh"].append(shed_c)
        unmet = unmet + day_shed
        unmet_c = unmet_c + day_shed_c
        flag = day_shed > tol
        flag_c = day_shed_c > tol
        shed_days = shed_days + flag
        shed_days_c = shed_days_c + flag_c
        run = (run + 1) * flag
        run_c = (run_c + 1) * flag_c
        longest = mx(longest, run)
        longest_c = mx(longest_c, run_c)
    if progress is not None:
        progress(1.0)

    def arr(v):
        return np.broadcast_to(np.asarray(v, dtype=float), (n,)).copy()

    demand = float(steps.critical_wh.sum() + steps.other_wh.sum())
    out = Balance(
        array_w=aw.copy(),
        capacity_wh=np.where(unlimited, np.inf, cap),
        days=days,
        shed_days=arr(shed_days),
        shed_days_critical=arr(shed_days_c),
        longest_shed_run_days=arr(longest),
        longest_shed_run_days_critical=arr(longest_c),
        demand_wh=demand,
        demand_critical_wh=float(steps.critical_wh.sum()),
        unmet_wh=arr(unmet),
        unmet_critical_wh=arr(unmet_c),
        pv_wh=arr(tot_pv),
        clipped_wh=aw * float(steps.clipped_wh_per_w.sum()),
        discharge_wh=arr(tot_draw),
        charge_wh=arr(tot_cin),
        spilled_wh=arr(tot_spill),
        stored_start_wh=arr(e_start),
        stored_end_wh=arr(e),
        eta_charge=ec,
        eta_discharge=ed,
    )
    if rec is not None:
        out.record = {key: _stack(v, n).reshape(days, k, n) for key, v in rec.items()}
    return out


def _concat(parts: list[Balance], unlimited: np.ndarray) -> Balance:
    first = parts[0]
    kw = {}
    for f in fields(Balance):
        v = getattr(first, f.name)
        if isinstance(v, np.ndarray):
            kw[f.name] = np.concatenate([getattr(p, f.name) for p in parts])
        else:
            kw[f.name] = v
    kw["capacity_wh"] = np.where(unlimited, np.inf, kw["capacity_wh"])
    return Balance(**kw)


def _stack(values: list, n: int) -> np.ndarray:
    if n == 1:
        return np.asarray(values, dtype=float)
    return np.vstack([np.broadcast_to(np.asarray(v, dtype=float), (n,)) for v in values])


def simulate_inputs(
    inp: SystemInputs,
    weather: WeatherSeries,
    array_w=None,
    capacity_wh=None,
    *,
    mode: str = "daily",
    record: bool = False,
    capacity_scale: float = 1.0,
    progress=None,
    cancelled=None,
    steps: Steps | None = None,
) -> Balance:
    """Run :func:`run_balance` on :class:`SystemInputs` (defaults: the reference design).

    ``capacity_scale`` multiplies the nominal capacity (e.g. the end-of-life ageing factor).
    """
    steps = steps if steps is not None else build_steps(inp, weather, mode)
    aw = inp.array_w if array_w is None else array_w
    cap = inp.capacity_wh if capacity_wh is None else capacity_wh
    return run_balance(
        steps,
        aw,
        np.asarray(cap, dtype=float) * capacity_scale,
        max_dod=inp.max_dod,
        eta_charge=inp.eta_charge,
        eta_discharge=inp.eta_discharge,
        initial_soc=inp.initial_soc,
        record=record,
        progress=progress,
        cancelled=cancelled,
    )


def with_design(inp: SystemInputs, array_w: float, capacity_wh: float) -> SystemInputs:
    """The same system with another reference design."""
    return check_inputs(replace(inp, array_w=float(array_w), capacity_wh=float(capacity_wh)))
