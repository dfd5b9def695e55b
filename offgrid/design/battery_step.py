"""Step 6: the battery bank for the days of autonomy, and the array's charge rate into it."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from offgrid.design.battery import (
    CHEMISTRIES,
    Chemistry,
    capacity_temperature_factor,
    units_in_series,
)
from offgrid.design.charging import (
    PEAK_CHARGE_FORMULA,
    PEAK_CHARGE_SOURCE,
    PwmVoltage,
    peak_charge_current,
)
from offgrid.design.months import MONTHS, as_tuple
from offgrid.design.pv import DiodeParams
from offgrid.design.result import (
    ArrayResult,
    BatteryResult,
    ControllerResult,
    DesignError,
    Notice,
    Reason,
    ReasonBook,
    fmt,
)
from offgrid.project.model import BatterySpec, DesignChoices


@dataclass(frozen=True)
class BatteryStep:
    battery: BatteryResult
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


@dataclass(frozen=True)
class ChargeRateStep:
    peak_charge_current_a: float
    charge_c_rate: float
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def size_battery(
    spec: BatterySpec,
    choices: DesignChoices,
    daily_energy_wh,
    system_v: int,
    batt_abs_v: float,
    t_mean: np.ndarray,
    room_temp_c: float | None,
    warm_temp_c: float | None,
) -> BatteryStep:
    """Battery bank for the days of autonomy, on the worst month of demand x cold factor.

    Each month's need: demand x days / (DoD x discharge efficiency x end of life) x that
    month's capacity-temperature factor; the bank is sized on the largest (or, with
    ``choices.battery_largest_coldest``, on the largest demand x the coldest month's factor).
    Ampere-hours at the bank's own nominal voltage (units in series x unit voltage).
    ``room_temp_c``/``warm_temp_c``: the battery room's cold- and warm-season temperatures
    (``site.battery_temp_c``, ``site.battery_warm_temp_c``), None for the outdoor air.
    """
    from offgrid.simulate.life import (
        calendar_life_years,
    )

    book = ReasonBook()
    b = spec
    chem = CHEMISTRIES[b.chemistry]
    dod = choices.max_dod if choices.max_dod is not None else b.max_dod
    series = units_in_series(system_v, b.nominal_voltage_v)
    if series is None:
        raise DesignError(
            "battery-voltage",
            f"{b.nominal_voltage_v:.4g} V battery units cannot "
            f"make a {system_v} V system: choose units whose voltage divides "
            f"{system_v} V, or another system voltage",
            "battery.nominal_voltage_v",
        )
    bank_v = series * b.nominal_voltage_v
    room = room_temp_c
    t_cap = np.full(12, float(room)) if room is not None else np.asarray(t_mean, dtype=float)
    f_m = np.array([capacity_temperature_factor(b.chemistry, t) for t in t_cap])
    demand = np.asarray(daily_energy_wh, dtype=float)
    eta_dis = math.sqrt(b.efficiency)
    per_wh = choices.autonomy_days / (dod * eta_dis * choices.ageing_factor)
    worst = int(np.argmax(demand * f_m))
    worst_wh = float(demand[worst] * f_m[worst]) * per_wh
    big, cold = int(np.argmax(demand)), int(np.argmax(f_m))
    conservative_wh = float(demand[big] * f_m[cold]) * per_wh
    if choices.battery_largest_coldest:
        energy, f_t, t_batt, need_wh = (
            float(demand[big]),
            float(f_m[cold]),
            float(t_cap[cold]),
            conservative_wh,
        )
        rule = (
            "largest daily demand x the coldest month's temperature factor (conservative, "
            "chosen in choices.battery_largest_coldest)"
        )
    else:
        energy, f_t, t_batt, need_wh = (
            float(demand[worst]),
            float(f_m[worst]),
            float(t_cap[worst]),
            worst_wh,
        )
        rule = "the month of the largest demand x temperature factor"
    need_ah = need_wh / bank_v
    parallel = max(1, math.ceil(need_ah / b.capacity_ah - 1e-9))
    cap_ah = parallel * b.capacity_ah
    nominal_kwh = cap_ah * bank_v / 1000.0
    usable_kwh = nominal_kwh * dod
    # Ageing: the warm months (the room's warm-season temperature, else each month's mean air
    # temperature, at least the cold-season room temperature when set).
    warm = warm_temp_c
    if warm is not None:
        t_age = np.full(12, float(warm))
        age_from = "site.battery_warm_temp_c"
    else:
        t_age = np.asarray(t_mean, dtype=float)
        age_from = "each month's mean air temperature"
        if room is not None:
            t_age = np.maximum(t_age, float(room))
            age_from += f", at least the room's {room:g} C"
    cal_years = calendar_life_years(b.chemistry, t_age)
    k = BankFigures(
        chem,
        dod,
        series,
        bank_v,
        t_cap,
        f_m,
        demand,
        eta_dis,
        worst,
        worst_wh,
        big,
        cold,
        conservative_wh,
        energy,
        f_t,
        t_batt,
        need_ah,
        parallel,
        cap_ah,
        rule,
        t_age,
        age_from,
    )
    book.extend(_capacity_reasons(k, spec, choices, system_v))
    book.extend(_temperature_reasons(k, spec, choices, room_temp_c, cal_years))
    notices = _battery_notices(k, spec, room_temp_c)
    result = BatteryResult(
        chemistry=b.chemistry,
        system_voltage_v=system_v,
        capacity_ah=float(cap_ah),
        required_ah=float(need_ah),
        nominal_kwh=float(nominal_kwh),
        usable_kwh=float(usable_kwh),
        max_dod=float(dod),
        autonomy_days=float(choices.autonomy_days),
        units_series=series,
        units_parallel=parallel,
        unit_count=series * parallel,
        temp_factor=float(f_t),
        ageing_factor=float(choices.ageing_factor),
        discharge_efficiency=float(eta_dis),
        absorption_voltage_v=float(batt_abs_v),
        bank_voltage_v=float(bank_v),
        capacity_temp_c=float(t_batt),
        ageing_temp_c=float(t_age.max()),
        calendar_life_years=float(cal_years),
        ageing_temps_c=as_tuple(t_age),
    )
    return BatteryStep(result, book.freeze(), tuple(notices))


@dataclass(frozen=True)
class BankFigures:
    """The bank sizing's intermediate figures, for its reasons and warnings."""

    chem: Chemistry
    dod: float
    series: int
    bank_v: float
    t_cap: np.ndarray  # battery temperature for capacity, each month [C]
    f_m: np.ndarray  # capacity-temperature factor, each month
    demand: np.ndarray
    eta_dis: float
    worst: int  # month of the largest demand x factor (0-based)
    worst_wh: float
    big: int  # month of the largest demand
    cold: int  # month of the largest factor
    conservative_wh: float
    energy: float
    f_t: float
    t_batt: float
    need_ah: float  # required capacity [Ah]
    parallel: int
    cap_ah: float  # installed capacity [Ah]
    rule: str  # the sizing rule in words
    t_age: np.ndarray  # battery temperature for ageing, each month [C]
    age_from: str


def _capacity_reasons(
    k: BankFigures, spec: BatterySpec, choices: DesignChoices, system_v: int
) -> dict[str, Reason]:
    """Reasons of the bank's capacity, voltage and unit counts."""
    rule = k.rule
    worst = k.worst
    demand = k.demand
    f_m = k.f_m
    worst_wh = k.worst_wh
    bank_v = k.bank_v
    big = k.big
    cold = k.cold
    conservative_wh = k.conservative_wh
    b = spec
    book = ReasonBook()
    book.add(
        "battery.required_ah",
        f"{rule}: its daily energy x days of autonomy x temperature factor / (max depth "
        "of discharge x discharge efficiency x end-of-life capacity) / bank voltage",
        "common practice (autonomy method); temperature factor: " + k.chem.temp_source,
        energy=fmt(k.energy, "Wh/day"),
        autonomy=fmt(choices.autonomy_days, "days"),
        temperature_factor=fmt(k.f_t),
        battery_temperature=fmt(k.t_batt, "C"),
        max_dod=fmt(k.dod),
        discharge_efficiency=fmt(k.eta_dis),
        ageing=fmt(choices.ageing_factor),
        bank_voltage=fmt(k.bank_v, "V"),
        worst_month=f"{MONTHS[worst]}: {demand[worst]:.0f} Wh/day x {f_m[worst]:.3f} -> "
        f"{worst_wh / bank_v:.0f} Ah" + ("" if choices.battery_largest_coldest else " (used)"),
        largest_x_coldest=f"{demand[big]:.0f} Wh/day ({MONTHS[big]}) x {f_m[cold]:.3f} "
        f"({MONTHS[cold]}) -> {conservative_wh / bank_v:.0f} Ah"
        + (" (used)" if choices.battery_largest_coldest else " (conservative option)"),
    )
    book.add(
        "battery.capacity_ah",
        "strings in parallel x unit capacity",
        "common practice, no source",
        parallel=str(k.parallel),
        unit=fmt(b.capacity_ah, "Ah"),
    )
    book.add(
        "battery.units_series",
        "system voltage / unit voltage",
        "common practice",
        system=fmt(system_v, "V"),
        unit=fmt(b.nominal_voltage_v, "V"),
    )
    book.add(
        "battery.units_parallel",
        "ceil(required Ah / unit Ah)",
        "common practice",
        required=fmt(k.need_ah, "Ah"),
        unit=fmt(b.capacity_ah, "Ah"),
    )
    book.add(
        "battery.usable_kwh",
        "installed Ah x bank voltage x max depth of discharge",
        "common practice",
        capacity=fmt(k.cap_ah, "Ah"),
        max_dod=fmt(k.dod),
        bank_voltage=fmt(k.bank_v, "V"),
    )
    book.add(
        "battery.nominal_kwh",
        "installed Ah x bank nominal voltage (units in series x unit voltage) / 1000",
        "common practice, no source",
        capacity=fmt(k.cap_ah, "Ah"),
        bank_voltage=fmt(k.bank_v, "V"),
    )
    book.add(
        "battery.bank_voltage_v",
        "units in series x the unit's own nominal voltage",
        "common practice, no source",
        series=str(k.series),
        unit=fmt(b.nominal_voltage_v, "V"),
    )
    book.add(
        "battery.capacity_temp_c",
        "battery temperature for capacity in the month the "
        "bank is sized on: the room's (site.battery_temp_c) or that month's mean air "
        "temperature",
        k.chem.temp_source,
        month=MONTHS[k.worst if not choices.battery_largest_coldest else k.cold],
    )
    book.add(
        "battery.ageing_temp_c",
        "warmest monthly battery temperature for ageing: " + k.age_from,
        "common practice, no source",
        months=" ".join(f"{t:.0f}" for t in k.t_age),
    )
    return book.freeze()


def _temperature_reasons(
    k: BankFigures, spec: BatterySpec, choices: DesignChoices, room_temp_c, cal_years
):
    """Reasons of the temperatures, ageing, life and efficiencies."""
    from offgrid.simulate.life import CALENDAR_TEMPERATURE_SOURCE, calendar_life_years

    b = spec
    book = ReasonBook()
    book.add(
        "battery.ageing_temps_c",
        "battery temperature for ageing, each month: " + k.age_from,
        "common practice, no source",
    )
    book.add(
        "battery.calendar_life_years",
        "float (calendar) life at 25 C / the day-weighted "
        "mean over the months of 2^((T - 25 C) / 10 C), T the month's battery temperature "
        "for ageing, no credit below 25 C"
        if k.chem.lead_acid
        else "float (calendar) life of the preset, not corrected for temperature (no source "
        "for lithium iron phosphate)",
        CALENDAR_TEMPERATURE_SOURCE + "; life at 25 C from memory",
        at_25c=fmt(calendar_life_years(b.chemistry), "yr"),
        warmest=fmt(float(k.t_age.max()), "C"),
    )
    if choices.max_dod is not None:
        book.given("battery.max_dod", "choices.max_dod", fmt(k.dod))
    else:
        book.given("battery.max_dod", "battery.max_dod", fmt(k.dod))
    book.given("battery.autonomy_days", "choices.autonomy_days", fmt(choices.autonomy_days, "days"))
    book.add(
        "battery.unit_count",
        "units in series x strings in parallel",
        "common practice, no source",
        series=str(k.series),
        parallel=str(k.parallel),
    )
    book.add(
        "battery.temp_factor",
        "capacity needed per rated capacity at the battery's "
        "temperature (1 at 25 C, more in the cold)",
        k.chem.temp_source,
        battery_temperature=fmt(k.t_batt, "C"),
        temperature_from="site.battery_temp_c"
        if room_temp_c is not None
        else "the sizing month's mean air temperature",
    )
    book.given("battery.ageing_factor", "choices.ageing_factor", fmt(choices.ageing_factor))
    book.add(
        "battery.discharge_efficiency",
        "square root of the round-trip efficiency (the "
        "loss shared equally between charge and discharge)",
        "common practice, no source",
        round_trip=fmt(b.efficiency),
    )
    book.add(
        "battery.absorption_voltage_v",
        "absorption (charging) voltage per cell at 25 C x cells in series",
        "common practice, no source (check the battery's manual)",
        per_cell=fmt(k.chem.absorption_v_per_cell, "V"),
        chemistry=k.chem.label,
    )
    return book.freeze()


def _battery_notices(
    k: BankFigures, spec: BatterySpec, room_temp_c: float | None
) -> tuple[Notice, ...]:
    """Warnings: too many lead-acid strings, an oversized unit, a cold bank, deep cycling."""
    parallel = k.parallel
    cap_ah = k.cap_ah
    need_ah = k.need_ah
    cold = k.cold
    t_cap = k.t_cap
    f_m = k.f_m
    dod = k.dod
    chem = k.chem
    from offgrid.simulate.life import CYCLE_LIFE_SOURCE, cycles_to_failure

    b = spec
    notices: list[Notice] = []
    if k.chem.lead_acid and k.parallel > 3:
        notices.append(
            Notice(
                "lead-acid-parallel",
                f"{parallel} parallel strings of lead-acid "
                "batteries: strings share current unevenly above three; choose "
                "larger units (or 2 V cells) to keep three or fewer.",
                "warning",
                "battery.units_parallel",
            )
        )
    if k.parallel == 1 and k.cap_ah > 2.0 * k.need_ah:
        notices.append(
            Notice(
                "battery-oversized",
                f"One string of these {b.capacity_ah:g} Ah "
                f"units is {cap_ah / need_ah:.1f} times the {need_ah:.0f} Ah the "
                "design needs: smaller units would cost less and charge more "
                "fully.",
                "info",
                "battery.capacity_ah",
            )
        )
    if k.t_cap[k.cold] < 5:
        where = (
            "the battery room's temperature (site.battery_temp_c)"
            if room_temp_c is not None
            else f"the mean air temperature of {MONTHS[cold]}; set site.battery_temp_c for a room"
        )
        notices.append(
            Notice(
                "battery-cold",
                f"The battery works at about {t_cap[cold]:.0f} C "
                f"({where}): it then needs {f_m[cold]:.2f} times its rated "
                "capacity for the same energy (counted in that month's need); "
                "insulate it or move it indoors.",
                "warning",
                "battery.required_ah",
            )
        )
    if k.chem.lead_acid and k.dod > 0.8 + 1e-9:
        n_dod = float(cycles_to_failure(b.chemistry, k.dod))
        n_half = float(cycles_to_failure(b.chemistry, 0.5))
        notices.append(
            Notice(
                "lead-acid-deep-dod",
                f"A maximum depth of discharge of {dod:.0%} on {chem.label} "
                f"batteries: the cycle-life curve used here gives about {n_dod:.0f} cycles to end "
                f"of life at that depth against {n_half:.0f} at 50 % ({CYCLE_LIFE_SOURCE}), so "
                f"a bank run that deep on many days wears out in about {n_dod / 365:.1f} years of "
                "daily cycling. Lead-acid is usually designed for 50 % or less (common practice); "
                "check the battery's datasheet for its cycle life.",
                "warning",
                "battery.max_dod",
            )
        )
    return tuple(notices)


def charge_rate(
    array: ArrayResult,
    ctrl: ControllerResult,
    battery: BatteryResult,
    params: DiodeParams,
    pwm: PwmVoltage,
) -> ChargeRateStep:
    """The array's peak charge current against what the bank takes (and, for lead-acid, needs).

    Peak current (:func:`offgrid.design.charging.peak_charge_current`, the one model, also
    the charge run's): MPPT, array STC power x controller efficiency / the bank's voltage;
    PWM, strings x the I-V model's module current at the PWM operating voltage
    (``pwm.array_v``) at STC; at most the controllers' ratings together.
    """
    from offgrid.design.battery import MAX_CHARGE_C_RATE, MIN_LEAD_ACID_CHARGE_C_RATE

    book = ReasonBook()

    peak = peak_charge_current(
        ctrl.type,
        series=array.modules_series,
        strings=array.modules_parallel,
        module_pmax_w=array.module_power_w,
        controller_efficiency=ctrl.efficiency,
        bank_voltage_v=battery.bank_voltage_v,
        system_voltage_v=battery.system_voltage_v,
        rating_a=ctrl.current_a * ctrl.count,
        params=params,
        pwm_array_v=pwm.array_v,
    )
    i_peak = peak.current_a
    rate = i_peak / battery.capacity_ah
    top = MAX_CHARGE_C_RATE.get(battery.chemistry)
    if ctrl.type == "mppt":
        how = {
            "array": fmt(array.power_w, "W"),
            "controller_efficiency": fmt(ctrl.efficiency),
            "bank_voltage": fmt(peak.voltage_v, "V"),
        }
    else:
        how = {
            "strings": str(array.modules_parallel),
            "operating_voltage": fmt(peak.voltage_v, "V"),
            "series": str(array.modules_series),
            "module_current": fmt(peak.string_current_a, "A"),
        }
    book.add(
        "battery.peak_charge_current_a",
        PEAK_CHARGE_FORMULA,
        PEAK_CHARGE_SOURCE,
        **how,
        array_current=fmt(peak.array_current_a, "A"),
        controllers=f"{ctrl.count} x {ctrl.current_a:g} A",
    )
    book.add(
        "battery.charge_c_rate",
        "peak charge current / installed capacity (per hour)",
        "common practice, no source; limits from memory (typical makers' figures)",
        peak_current=fmt(i_peak, "A"),
        capacity=fmt(battery.capacity_ah, "Ah"),
        limit=f"C/{1 / top:.0f}" if top else "-",
        low_limit=(
            f"C/{1 / MIN_LEAD_ACID_CHARGE_C_RATE:.0f} (lead-acid; common practice, no source)"
            if CHEMISTRIES[battery.chemistry].lead_acid
            else "-"
        ),
    )
    out = []
    if top and rate > top:
        out.append(
            Notice(
                "charge-rate-high",
                f"At full sun the array can push about {i_peak:.0f} A into the "
                f"{battery.capacity_ah:.0f} Ah bank, C/{1 / rate:.1f}, more than the "
                f"C/{1 / top:.0f} "
                f"a {battery.chemistry} battery usually accepts: set the controller's "
                "charge-current "
                "limit to at most "
                f"{top * battery.capacity_ah:.0f} A, or choose a larger bank (check the battery's "
                "datasheet).",
                "warning",
                "battery.charge_c_rate",
            )
        )
    if CHEMISTRIES[battery.chemistry].lead_acid and rate < MIN_LEAD_ACID_CHARGE_C_RATE:
        out.append(
            Notice(
                "charge-rate-low",
                f"At full sun the array charges the {battery.capacity_ah:.0f} Ah "
                f"bank at only about {i_peak:.0f} A (C/{1 / rate:.0f}): lead-acid charged this "
                "gently "
                "seldom reaches full charge and sulphates. A larger array, fewer days of autonomy "
                "or "
                "a periodic full charge from another source helps.",
                "info",
                "battery.charge_c_rate",
            )
        )
    return ChargeRateStep(float(i_peak), float(rate), book.freeze(), tuple(out))
