"""Reliability of one design over a simulated weather series: every figure with its reason."""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any

import numpy as np

from offgrid.design.result import Reason, ReasonBook, fmt
from offgrid.simulate.balance import Balance, SystemInputs, build_steps, simulate_inputs
from offgrid.simulate.life import CYCLE_LIFE_SOURCE, BatteryWear, battery_wear
from offgrid.simulate.profiles import LOAD_WINDOWS_H
from offgrid.simulate.weather import DAYS_PER_YEAR, MONTH_OF_DAY, WeatherSeries

MONTH_NAMES = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
_SRC_BAL = "offgrid.simulate.balance (step energy balance, module notes)"


@dataclass(frozen=True)
class MonthStats:
    month: int  # 1-12
    lolp: float  # shedding days / days in this month
    soc_min_p5: float  # daily minimum state of charge, 5th percentile [0-1]
    soc_min_p50: float
    soc_min_p95: float
    days_below: int  # days whose minimum SoC went below the threshold


@dataclass(frozen=True)
class Reliability:
    mode: str
    years: int
    measured_years: int
    seed: int | None
    days: int
    weather_source: str
    array_w: float
    capacity_wh: float
    usable_wh: float
    lolp: float
    unmet_fraction: float
    lolp_critical: float
    unmet_fraction_critical: float
    shed_days: int
    longest_shed_run_days: int
    longest_shed_run_days_critical: int
    soc_threshold: float
    days_below_soc: int
    months: tuple[MonthStats, ...]
    wear: BatteryWear
    pv_kwh_per_year: float
    spilled_fraction: float  # of the controller output
    clipped_kwh_per_year: float
    battery_loss_kwh_per_year: float
    demand_kwh_per_year: float
    worst_year: int  # 0-based year of the series with the most shedding days (chart)
    worst_year_soc_min: tuple[float, ...]  # its 365 daily minimum states of charge [0-1]
    lolp_measured: float | None  # the real weather years alone, if any
    lolp_end_of_life: float | None  # with the capacity at end of life, if asked
    notes: tuple[str, ...]
    reasons: dict[str, Reason] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        out = asdict(self)
        out["reasons"] = {k: r.as_dict() for k, r in sorted(self.reasons.items())}
        out["months"] = [asdict(m) for m in self.months]
        return _finite(out)


def _finite(value: Any) -> Any:
    if isinstance(value, dict):
        return {k: _finite(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_finite(v) for v in value]
    if isinstance(value, float):
        if not np.isfinite(value):
            raise ValueError("a reliability figure is not finite")
        return round(value, 6)
    return value


def soc_series(balance: Balance, initial_soc: float) -> tuple[np.ndarray, np.ndarray]:
    """(state of charge at every step, flattened, starting point first; daily minimum).

    Needs a recorded balance of one design.
    """
    if balance.record is None or balance.array_w.size != 1:
        raise ValueError("state of charge: run the balance of one design with record=True")
    cap = float(balance.capacity_wh[0])
    stored = balance.record["stored_wh"][:, :, 0]  # (days, k)
    soc = stored / cap if cap > 0 and np.isfinite(cap) else np.zeros_like(stored)
    start = np.concatenate(([initial_soc], soc[:-1, -1]))
    daily_min = np.minimum(start, soc.min(axis=1))
    return np.concatenate(([initial_soc], soc.ravel())), daily_min


def reliability(
    inp: SystemInputs,
    weather: WeatherSeries,
    *,
    mode: str = "daily",
    soc_threshold: float | None = None,
    end_of_life_scale: float | None = None,
    progress=None,
    cancelled=None,
) -> Reliability:
    """Simulate the reference design of ``inp`` and collect every reliability figure.

    ``soc_threshold`` (default: halfway between full and the DoD floor) sets the
    "days below" count; ``end_of_life_scale`` (e.g. the ageing factor) adds the
    LOLP with the capacity reduced to that fraction.
    """
    floor = 1.0 - inp.max_dod
    thr = (1.0 + floor) / 2.0 if soc_threshold is None else float(soc_threshold)
    if not 0 <= thr <= 1:
        raise ValueError(f"state-of-charge threshold: {thr} must be 0-1")
    steps = build_steps(inp, weather, mode)
    bal = simulate_inputs(
        inp, weather, steps=steps, record=True, progress=progress, cancelled=cancelled
    )
    years = weather.years
    soc_all, daily_min = soc_series(bal, inp.initial_soc)
    shed = bal.record["shed_wh"][:, :, 0].sum(axis=1) > 1e-6
    month = np.tile(MONTH_OF_DAY, years)
    months = []
    for m in range(12):
        sel = month == m
        dm = daily_min[sel]
        months.append(
            MonthStats(
                month=m + 1,
                lolp=float(shed[sel].mean()),
                soc_min_p5=float(np.percentile(dm, 5)),
                soc_min_p50=float(np.percentile(dm, 50)),
                soc_min_p95=float(np.percentile(dm, 95)),
                days_below=int((dm < thr).sum()),
            )
        )
    wear = battery_wear(
        soc_all,
        years,
        inp.chemistry,
        float(bal.discharge_wh[0]),
        inp.capacity_wh,
        inp.calendar_life_years,
    )
    per_year_shed = shed.reshape(years, DAYS_PER_YEAR).sum(axis=1)
    per_year_low = daily_min.reshape(years, DAYS_PER_YEAR).min(axis=1)
    worst = int(np.lexsort((per_year_low, -per_year_shed))[0])
    lolp_measured = None
    if weather.measured_years:
        lolp_measured = float(shed[: weather.measured_years * DAYS_PER_YEAR].mean())
    lolp_eol = None
    if end_of_life_scale is not None:
        eol = simulate_inputs(inp, weather, steps=steps, capacity_scale=end_of_life_scale)
        lolp_eol = float(eol.lolp[0])
    pv = float(bal.pv_wh[0])
    notes = (
        f"{mode} balance: "
        + (
            "two steps a day (hours with sun, then hours without), so "
            "loads after dark draw on the battery"
            if mode == "daily"
            else "24 steps a day, hourly sun shape of Collares-Pereira & Rabl (1979)"
        ),
        "load windows, solar time (common practice, no source): "
        + ", ".join(
            f"{k} {a:02d}-{(b - 1) % 24 + 1:02d} h" for k, (a, b) in LOAD_WINDOWS_H.items()
        ),
        "the battery starts full; charge and discharge efficiency are constant",
        "cycle life: " + CYCLE_LIFE_SOURCE,
        *inp.notes,
    )
    res = Reliability(
        mode=mode,
        years=years,
        measured_years=weather.measured_years,
        seed=weather.seed,
        days=bal.days,
        weather_source=weather.source,
        array_w=inp.array_w,
        capacity_wh=inp.capacity_wh,
        usable_wh=inp.capacity_wh * inp.max_dod,
        lolp=float(bal.lolp[0]),
        unmet_fraction=float(bal.unmet_fraction[0]),
        lolp_critical=float(bal.lolp_critical[0]),
        unmet_fraction_critical=float(bal.unmet_fraction_critical[0]),
        shed_days=int(bal.shed_days[0]),
        longest_shed_run_days=int(bal.longest_shed_run_days[0]),
        longest_shed_run_days_critical=int(bal.longest_shed_run_days_critical[0]),
        soc_threshold=thr,
        days_below_soc=int((daily_min < thr).sum()),
        months=tuple(months),
        wear=wear,
        pv_kwh_per_year=pv / 1000 / years,
        spilled_fraction=float(bal.spilled_wh[0]) / pv if pv > 0 else 0.0,
        clipped_kwh_per_year=float(bal.clipped_wh[0]) / 1000 / years,
        battery_loss_kwh_per_year=float(bal.losses_wh[0]) / 1000 / years,
        demand_kwh_per_year=bal.demand_wh / 1000 / years,
        worst_year=worst,
        worst_year_soc_min=tuple(
            float(v) for v in daily_min.reshape(years, DAYS_PER_YEAR)[worst].round(4)
        ),
        lolp_measured=lolp_measured,
        lolp_end_of_life=lolp_eol,
        notes=notes,
        reasons=_reasons(inp, weather, bal, thr, mode, wear),
    )
    return res


def _reasons(
    inp: SystemInputs,
    weather: WeatherSeries,
    bal: Balance,
    thr: float,
    mode: str,
    wear: BatteryWear,
) -> dict[str, Reason]:
    book = ReasonBook()
    days = fmt(bal.days, "days")
    common = {
        "weather": weather.source,
        "years": fmt(weather.years),
        "mode": mode,
        "array": fmt(inp.array_w, "W"),
        "battery": fmt(inp.capacity_wh / 1000, "kWh"),
        "max DoD": fmt(inp.max_dod),
    }
    book.add(
        "lolp",
        "days with any load shed / days simulated",
        _SRC_BAL,
        shed_days=fmt(int(bal.shed_days[0]), "days"),
        days=days,
        **common,
    )
    book.add(
        "unmet_fraction",
        "energy shed / energy demanded at the battery bus",
        _SRC_BAL,
        shed=fmt(float(bal.unmet_wh[0]) / 1000, "kWh"),
        demand=fmt(bal.demand_wh / 1000, "kWh"),
    )
    book.add(
        "lolp_critical",
        "days with any critical load shed / days simulated; critical "
        "loads are served first and shed last",
        _SRC_BAL,
        shed_days=fmt(int(bal.shed_days_critical[0]), "days"),
        days=days,
    )
    book.add(
        "unmet_fraction_critical",
        "critical energy shed / critical energy demanded",
        _SRC_BAL,
        shed=fmt(float(bal.unmet_critical_wh[0]) / 1000, "kWh"),
        demand=fmt(bal.demand_critical_wh / 1000, "kWh"),
    )
    book.add(
        "longest_shed_run_days",
        "longest run of consecutive days with shedding",
        _SRC_BAL,
        days=days,
    )
    book.add(
        "days_below_soc",
        "days whose lowest state of charge fell below the threshold",
        _SRC_BAL,
        threshold=fmt(thr),
    )
    years = weather.years
    book.add(
        "shed_days",
        "days with any load shed, counted over the days simulated",
        _SRC_BAL,
        days=days,
    )
    book.add(
        "pv_kwh_per_year",
        "energy from the array through the controller to the battery bus / years",
        _SRC_BAL,
        pv=fmt(float(bal.pv_wh[0]) / 1000, "kWh"),
        years=fmt(years),
    )
    book.add(
        "spilled_fraction",
        "controller output the full battery could not take / controller output",
        _SRC_BAL,
        spilled=fmt(float(bal.spilled_wh[0]) / 1000, "kWh"),
        pv=fmt(float(bal.pv_wh[0]) / 1000, "kWh"),
    )
    book.add(
        "battery_loss_kwh_per_year",
        "charge and discharge losses of the battery / years",
        _SRC_BAL,
        losses=fmt(float(bal.losses_wh[0]) / 1000, "kWh"),
        years=fmt(years),
    )
    book.add(
        "demand_kwh_per_year",
        "demand at the battery bus over the days simulated / years",
        _SRC_BAL,
        demand=fmt(bal.demand_wh / 1000, "kWh"),
        years=fmt(years),
    )
    book.add(
        "wear.cycle_life_years",
        "years / Miner damage of the rainflow cycles (none when no damage is counted)",
        "ASTM E1049-85 sec. 5.4.4 (rainflow); Miner (1945); cycle life " + CYCLE_LIFE_SOURCE,
        damage_per_year=fmt(wear.damage_per_year),
    )
    book.add(
        "wear.calendar_life_years",
        "the chemistry's float life at the battery's temperatures"
        if inp.calendar_life_years is not None
        else "the chemistry's float life, preset at 25 C",
        "offgrid.simulate.life (calendar life, module notes)",
        chemistry=inp.chemistry,
    )
    # the monthly table (catalogue table ``reliability-months``)
    book.add(
        "months.lolp",
        "days of the month with any load shed / days of that month simulated",
        _SRC_BAL,
        days=days,
    )
    book.add(
        "months.soc_min",
        "5th, 50th and 95th percentiles of the day's lowest state of charge over the "
        "days of the month (numpy.percentile, linear)",
        _SRC_BAL,
        days=days,
    )
    book.add(
        "wear.equivalent_full_cycles_per_year",
        "energy delivered by the battery / nominal capacity / years",
        _SRC_BAL,
        throughput=fmt(wear.throughput_kwh_per_year, "kWh/yr"),
        capacity=fmt(inp.capacity_wh / 1000, "kWh"),
    )
    book.add(
        "wear.expected_life_years",
        "min(calendar life, years / Miner damage); damage = sum of rainflow cycles / "
        "cycles to failure at their depth",
        "ASTM E1049-85 sec. 5.4.4 (rainflow); Miner (1945); cycle life " + CYCLE_LIFE_SOURCE,
        chemistry=inp.chemistry,
        damage_per_year=fmt(wear.damage_per_year),
        calendar_life=fmt(wear.calendar_life_years, "yr"),
        calendar_basis="at the battery's warm-season temperatures (design "
        "battery.calendar_life_years)"
        if inp.calendar_life_years is not None
        else "preset at 25 C",
    )
    return book.freeze()
