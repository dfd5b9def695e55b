"""The daily harvest through both controller types from the I-V curves, with the cables
as sized, and the shortfall of the chosen one against each month's demand."""

from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from offgrid.design import strings as st
from offgrid.design import wiring as wr
from offgrid.design.charging import PWM_BATTERY_SIDE_FORMULA, PWM_VOLTAGE_SOURCE, PwmVoltage
from offgrid.design.electrical.records import HarvestResult
from offgrid.design.harvest import HarvestInputs, harvest_wh_day
from offgrid.design.months import MONTHS as MONTH_NAMES
from offgrid.design.pv import DiodeParams
from offgrid.design.result import Notice, Reason, ReasonBook, fmt, reason_kind
from offgrid.memo import memoised
from offgrid.project.model import ModuleSpec

#: The source of the harvest figures' reasons.
HARVEST_SOURCE = (
    "De Soto (2006) I-V curve at each step of the month's mean day (Collares-Pereira & "
    "Rabl 1979 / Liu & Jordan profile, isotropic sky, scaled to the monthly POA)"
)


@dataclass(frozen=True)
class HarvestStep:
    harvest: HarvestResult
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def compare_harvests(
    params: DiodeParams,
    module: ModuleSpec,
    ctype: str,
    layout: st.Layout,
    wires: tuple[wr.WireChoice, ...],
    noon,
    design_month: int,
    *,
    max_pv_voltage_v: float,
    voc_cold: float,
    vmp_hot: float,
    vsys: float,
    v_abs: float,
    pwm_drop: float,
    pwm_voltage: PwmVoltage,
    eff: float,
    soiling: float,
    mismatch: float,
    daily_energy_wh,
    battery_efficiency: float,
) -> HarvestStep:
    """Harvest through the chosen controller on its layout and through the other type on
    its own best layout of the same modules (``noon``: the mean-day profile of
    :func:`offgrid.design.electrical.operating_point.noon_operating_point`;
    ``design_month``: 0-based).  ``pwm_voltage``: the one PWM operating voltage
    (:func:`offgrid.design.charging.pwm_operating_voltage`); the curves take its battery
    side and the sized cables' resistance as the drop."""
    both = _both_harvests(
        params,
        module.noct_c,
        module.vmp_v,
        ctype,
        layout,
        tuple((w.key, 2.0 * w.length_m * w.resistance_ohm_km / 1000.0) for w in wires),
        noon.profile,
        noon.step_h,
        noon.temp_day_c,
        design_month,
        max_pv_voltage_v,
        voc_cold,
        vmp_hot,
        vsys,
        v_abs,
        pwm_drop,
        pwm_voltage,
        eff,
        soiling,
        mismatch,
        reason_kind(),
    )
    pwm, mppt = both.pwm, both.mppt
    chosen = pwm if ctype == "pwm" else mppt
    demand_m = np.asarray(daily_energy_wh, dtype=float)
    eta_batt = float(battery_efficiency)
    # The worst month of the harvest after the round trip against its demand (every month
    # must be covered, not only the design month of the derate chain).
    used = demand_m > 1e-6
    got = np.divide(chosen * eta_batt, demand_m, out=np.ones(12), where=used)
    short_m = np.where(used, 100.0 * (1.0 - got), 0.0)
    ms = int(np.argmax(short_m))
    shortfall = max(0.0, float(short_m[ms]))
    demand = float(demand_m[ms])
    harvest = HarvestResult(
        ctype,
        both.pwm_wh_day,
        both.mppt_wh_day,
        both.pwm_wh_day if ctype == "pwm" else both.mppt_wh_day,
        pwm_voltage.battery_v,
        design_month + 1,
        both.pwm_vs_mppt_pct,
        shortfall,
        (both.pwm_layout.series, both.pwm_layout.parallel),
        (both.mppt_layout.series, both.mppt_layout.parallel),
    )
    rb = ReasonBook()
    rb.extend(both.reasons_before)
    rb.add(
        "harvest.shortfall_pct",
        "1 - harvest through the chosen controller x battery "
        "round trip / demand, in the month where it is largest, when positive",
        HARVEST_SOURCE,
        month=MONTH_NAMES[ms],
        harvest=fmt(float(chosen[ms]), "Wh/day"),
        round_trip=fmt(eta_batt),
        demand=fmt(demand, "Wh/day"),
    )
    rb.extend(both.reasons_after)
    notices: list[Notice] = []
    if shortfall > 0.5:
        notices.append(
            Notice(
                "harvest-shortfall",
                f"Through the {ctype.upper()} controller the array delivers "
                f"{chosen[ms]:.0f} Wh/day in {MONTH_NAMES[ms]}; after the battery's round trip "
                f"({eta_batt:.0%}) that is {shortfall:.0f} % below the {demand:.0f} Wh/day the "
                "loads need: add modules"
                + (" or use an MPPT controller" if ctype == "pwm" else "")
                + ".",
                "warning",
                "array.harvest_pwm_wh_day" if ctype == "pwm" else "array.harvest_mppt_wh_day",
            )
        )
    notices.extend(both.notices)
    return HarvestStep(harvest, rb.freeze(), tuple(notices))


class MeanDay(NamedTuple):
    """What the harvest reads of the noon step: the mean-day profile and temperatures."""

    profile: np.ndarray
    step_h: np.ndarray
    temp_day_c: np.ndarray


@dataclass(frozen=True)
class BothHarvests:
    """The part of the comparison that does not read the demand (:func:`_both_harvests`)."""

    pwm: np.ndarray  # Wh/day, 12 months (read-only)
    mppt: np.ndarray
    pwm_wh_day: tuple[float, ...]
    mppt_wh_day: tuple[float, ...]
    pwm_layout: st.Layout
    mppt_layout: st.Layout
    pwm_vs_mppt_pct: float
    reasons_before: dict[str, Reason]  # the reasons before the shortfall's, in order
    reasons_after: dict[str, Reason]  # and after it
    notices: tuple[Notice, ...]


@memoised  # planning: a village's designs share a few layouts, cables and design months
def _both_harvests(
    params: DiodeParams,
    noct_c: float,
    module_vmp_v: float,
    ctype: str,
    layout: st.Layout,
    loop_items: tuple[tuple[str, float], ...],
    profile: np.ndarray,
    step_h: np.ndarray,
    temp_day_c: np.ndarray,
    design_month: int,
    max_pv_voltage_v: float,
    voc_cold: float,
    vmp_hot: float,
    vsys: float,
    v_abs: float,
    pwm_drop: float,
    pwm_voltage: PwmVoltage,
    eff: float,
    soiling: float,
    mismatch: float,
    kind: type,
) -> BothHarvests:
    """Harvest through the chosen controller on its layout and through the other type on
    its own best layout of the same modules, with their reasons and the PWM mismatch
    warning: what :func:`compare_harvests` computes before the demand (``kind``: the
    reason record in force, part of the memo's key only)."""
    from offgrid.design.electrical.string_layout import other_layout

    v_chg = pwm_voltage.battery_v
    m = design_month
    # Harvest both ways with the chosen cables; the other controller type on its own layout.
    loop = dict(loop_items)
    alt = other_layout(
        ctype, layout, module_vmp_v, max_pv_voltage_v, voc_cold, vmp_hot, v_abs, pwm_drop
    )
    mppt_layout, pwm_layout = (layout, alt) if ctype == "mppt" else (alt, layout)
    day = MeanDay(profile, step_h, temp_day_c)
    common = (params, noct_c, day, layout, loop, v_chg, eff, soiling, mismatch)
    mppt = layout_harvest_wh_day(mppt_layout, *common)[0]
    pwm = layout_harvest_wh_day(pwm_layout, *common)[1]
    # Per module: each controller type on its own best layout of these modules, which may
    # hold a different number of them (whole strings); compared per module installed.
    n_pwm, n_mppt = pwm_layout.module_count, mppt_layout.module_count
    per_pwm, per_mppt = pwm[m] / n_pwm, mppt[m] / n_mppt
    pwm_vs = float(100.0 * (per_pwm / per_mppt - 1.0)) if per_mppt > 0 else 0.0
    reasons = _harvest_reasons(
        HarvestFigures(
            vsys=vsys,
            v_abs=v_abs,
            pwm=pwm,
            m=m,
            n_pwm=n_pwm,
            per_pwm=per_pwm,
            mppt=mppt,
            n_mppt=n_mppt,
            per_mppt=per_mppt,
            mppt_layout=mppt_layout,
            eff=eff,
            soiling=soiling,
            mismatch=mismatch,
            v_chg=v_chg,
            pwm_layout=pwm_layout,
            pwm_voltage=pwm_voltage,
        )
    )
    keys = list(reasons)
    cut = keys.index("harvest.pwm_vs_mppt_pct") + 1
    notices: list[Notice] = []
    if ctype == "pwm" and pwm_vs < -20.0:
        notices.append(
            Notice(
                "pwm-mismatch",
                f"This module suits a PWM controller badly at {vsys:.0f} V: PWM "
                f"harvests {-pwm_vs:.0f} % less per module than MPPT would in the design month. "
                "Use an MPPT "
                "controller or modules whose Vmp is nearer the battery voltage.",
                "warning",
                "array.harvest_pwm_wh_day",
            )
        )
    for arr in (pwm, mppt):
        arr.flags.writeable = False
    return BothHarvests(
        pwm,
        mppt,
        tuple(pwm.tolist()),
        tuple(mppt.tolist()),
        pwm_layout,
        mppt_layout,
        pwm_vs,
        {k: reasons[k] for k in keys[:cut]},
        {k: reasons[k] for k in keys[cut:]},
        tuple(notices),
    )


def layout_harvest_wh_day(
    lay: st.Layout,
    params: DiodeParams,
    noct_c: float,
    noon,
    layout: st.Layout,
    loop: dict[str, float],
    v_chg: float,
    eff: float,
    soiling: float,
    mismatch: float,
) -> tuple[np.ndarray, np.ndarray]:
    """Daily harvest (MPPT, PWM) [Wh/day, 12 months] of the modules laid out as ``lay``.

    ``layout``: the chosen controller's layout, whose cables (``loop``: each run's loop
    resistance [ohm]) were sized; ``noon``: the mean-day profile and temperatures.
    """
    profile, step_h, temp_day = noon.profile, noon.step_h, noon.temp_day_c
    # controllers with n strings each; when the strings do not share out equally, some
    # controllers have one string fewer.  The other controller type's layout gets PV
    # cables sized for the same fractional loss as the chosen layout's (string run: the
    # same current at s_alt/s volts; array run: n_alt strings at s_alt/s volts), so the
    # comparison is of the controllers, not of cables sized for the other one.
    r_str, r_arr = loop.get("string", 0.0), loop["array"]
    if lay is not layout:
        r_str *= lay.series / layout.series
        r_arr *= (
            layout.strings_per_controller
            * lay.series
            / (max(1, lay.strings_per_controller) * layout.series)
        )
    k = lay.controllers
    groups = {lay.parallel // k + 1: lay.parallel % k, lay.parallel // k: k - lay.parallel % k}
    total = [np.zeros(12), np.zeros(12)]
    for n_str, n_ctrl in groups.items():
        if n_str < 1 or n_ctrl < 1:
            continue
        hin = HarvestInputs(
            lay.series,
            n_str,
            n_ctrl,
            v_chg,
            eff,
            soiling,
            mismatch,
            r_str,
            r_arr,
            loop["charge"],
        )
        got = harvest_wh_day(params, profile, step_h, temp_day, noct_c, hin)
        total = [total[0] + got[0], total[1] + got[1]]
    return total[0], total[1]


@dataclass(frozen=True)
class HarvestFigures:
    """The figures of the harvest comparison that its reasons quote."""

    vsys: float
    v_abs: float
    pwm: np.ndarray
    m: int
    n_pwm: int
    per_pwm: float
    mppt: np.ndarray
    n_mppt: int
    per_mppt: float
    mppt_layout: st.Layout
    eff: float
    soiling: float
    mismatch: float
    v_chg: float
    pwm_layout: st.Layout
    pwm_voltage: PwmVoltage


def _harvest_reasons(k: HarvestFigures) -> dict[str, Reason]:
    """Reasons of the charging voltage, both harvests and their layouts (the shortfall's
    is :func:`compare_harvests`'s: it reads the demand)."""
    vsys = k.vsys
    pwm = k.pwm
    m = k.m
    n_pwm = k.n_pwm
    per_pwm = k.per_pwm
    mppt = k.mppt
    n_mppt = k.n_mppt
    per_mppt = k.per_mppt
    mppt_layout = k.mppt_layout
    eff = k.eff
    soiling = k.soiling
    mismatch = k.mismatch
    v_chg = k.v_chg
    pwm_layout = k.pwm_layout
    rb = ReasonBook()
    hsrc = HARVEST_SOURCE
    rb.add(
        "harvest.charging_voltage_v",
        "battery voltage a PWM array works against (the battery side of the PWM operating "
        f"voltage): {PWM_BATTERY_SIDE_FORMULA}; the I-V curves add the sized cables' drop",
        PWM_VOLTAGE_SOURCE,
        nominal=fmt(vsys, "V"),
        full_rest=fmt(k.pwm_voltage.full_rest_v, "V"),
        absorption=fmt(k.pwm_voltage.absorption_v, "V"),
    )
    rb.add(
        "harvest.pwm_vs_mppt_pct",
        "per module: (PWM harvest / PWM modules) / (MPPT "
        "harvest / MPPT modules) - 1 in the design month, each controller type on its own "
        "best series x parallel layout of the same module (the layouts may hold different "
        "numbers of modules), PV cables of both sized for the same fractional loss",
        hsrc,
        pwm=f"{pwm[m]:.0f} Wh/day from {n_pwm} modules ({per_pwm:.1f} per module)",
        mppt=f"{mppt[m]:.0f} Wh/day from {n_mppt} modules ({per_mppt:.1f} per module)",
    )
    rb.add(
        "harvest.pwm_layout",
        "series x parallel the PWM figures assume: the fewest modules "
        "in series whose STC Vmp suits the battery",
        "common practice, no source",
    )
    rb.add(
        "harvest.mppt_layout",
        "series x parallel the MPPT figures assume: a layout in the MPPT string window",
        "common practice, no source",
    )
    rb.add(
        "array.harvest_mppt_wh_day",
        "sum over the day of the array's maximum power less cable I^2 R, x controller efficiency",
        hsrc,
        series=str(mppt_layout.series),
        parallel=str(mppt_layout.parallel),
        efficiency=fmt(eff),
        soiling=fmt(soiling),
        mismatch=fmt(mismatch),
    )
    rb.add(
        "array.harvest_pwm_wh_day",
        "sum over the day of battery voltage x array current at (battery voltage + cable drop)",
        hsrc,
        charging_voltage=fmt(v_chg, "V"),
        series=str(pwm_layout.series),
        parallel=str(pwm_layout.parallel),
    )
    return rb.freeze()
