"""The daily harvest through both controller types from the I-V curves, with the cables
as sized, and the shortfall of the chosen one against each month's demand."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design import strings as st
from offgrid.design import wiring as wr
from offgrid.design.charging import PWM_BATTERY_SIDE_FORMULA, PWM_VOLTAGE_SOURCE, PwmVoltage
from offgrid.design.electrical.records import HarvestResult
from offgrid.design.harvest import HarvestInputs, harvest_wh_day
from offgrid.design.months import MONTHS as MONTH_NAMES
from offgrid.design.pv import DiodeParams
from offgrid.design.result import Notice, Reason, ReasonBook, fmt
from offgrid.project.model import ModuleSpec


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
    from offgrid.design.electrical.string_layout import other_layout

    rb = ReasonBook()
    v_chg = pwm_voltage.battery_v
    notices: list[Notice] = []
    m = design_month
    # Harvest both ways with the chosen cables; the other controller type on its own layout.
    loop = {w.key: 2.0 * w.length_m * w.resistance_ohm_km / 1000.0 for w in wires}
    alt = other_layout(
        ctype, layout, module.vmp_v, max_pv_voltage_v, voc_cold, vmp_hot, v_abs, pwm_drop
    )
    mppt_layout, pwm_layout = (layout, alt) if ctype == "mppt" else (alt, layout)

    common = (params, module.noct_c, noon, layout, loop, v_chg, eff, soiling, mismatch)
    mppt = layout_harvest_wh_day(mppt_layout, *common)[0]
    pwm = layout_harvest_wh_day(pwm_layout, *common)[1]
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
    # Per module: each controller type on its own best layout of these modules, which may
    # hold a different number of them (whole strings); compared per module installed.
    n_pwm, n_mppt = pwm_layout.module_count, mppt_layout.module_count
    per_pwm, per_mppt = pwm[m] / n_pwm, mppt[m] / n_mppt
    pwm_vs = float(100.0 * (per_pwm / per_mppt - 1.0)) if per_mppt > 0 else 0.0
    harvest = HarvestResult(
        ctype,
        tuple(pwm.tolist()),
        tuple(mppt.tolist()),
        tuple(chosen.tolist()),
        v_chg,
        m + 1,
        pwm_vs,
        shortfall,
        (pwm_layout.series, pwm_layout.parallel),
        (mppt_layout.series, mppt_layout.parallel),
    )
    rb.extend(
        _harvest_reasons(
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
                ms=ms,
                chosen=chosen,
                eta_batt=eta_batt,
                demand=demand,
                mppt_layout=mppt_layout,
                eff=eff,
                soiling=soiling,
                mismatch=mismatch,
                v_chg=v_chg,
                pwm_layout=pwm_layout,
                pwm_voltage=pwm_voltage,
            )
        )
    )
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
    return HarvestStep(harvest, rb.freeze(), tuple(notices))


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
    ms: int
    chosen: np.ndarray
    eta_batt: float
    demand: float
    mppt_layout: st.Layout
    eff: float
    soiling: float
    mismatch: float
    v_chg: float
    pwm_layout: st.Layout
    pwm_voltage: PwmVoltage


def _harvest_reasons(k: HarvestFigures) -> dict[str, Reason]:
    """Reasons of the charging voltage, both harvests, their layouts and the shortfall."""
    vsys = k.vsys
    pwm = k.pwm
    m = k.m
    n_pwm = k.n_pwm
    per_pwm = k.per_pwm
    mppt = k.mppt
    n_mppt = k.n_mppt
    per_mppt = k.per_mppt
    ms = k.ms
    chosen = k.chosen
    eta_batt = k.eta_batt
    demand = k.demand
    mppt_layout = k.mppt_layout
    eff = k.eff
    soiling = k.soiling
    mismatch = k.mismatch
    v_chg = k.v_chg
    pwm_layout = k.pwm_layout
    rb = ReasonBook()
    hsrc = (
        "De Soto (2006) I-V curve at each step of the month's mean day (Collares-Pereira & "
        "Rabl 1979 / Liu & Jordan profile, isotropic sky, scaled to the monthly POA)"
    )
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
        "harvest.shortfall_pct",
        "1 - harvest through the chosen controller x battery "
        "round trip / demand, in the month where it is largest, when positive",
        hsrc,
        month=MONTH_NAMES[ms],
        harvest=fmt(float(chosen[ms]), "Wh/day"),
        round_trip=fmt(eta_batt),
        demand=fmt(demand, "Wh/day"),
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
