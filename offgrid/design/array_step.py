"""Steps 4-5: array power on the least-covered month, system voltage and the string layout.

Array power = design-month demand / (peak sun hours x temperature x operating point x
soiling x mismatch x wiring x controller x battery round trip), each derate shown on its
own; the design month is the month whose derated supply covers its demand least.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.design.battery import absorption_voltage_v, units_in_series
from offgrid.design.charging import (
    PWM_ARRAY_SIDE_FORMULA,
    PWM_BATTERY_SIDE_FORMULA,
    PwmVoltage,
    pwm_module_current_a,
    pwm_operating_voltage,
)
from offgrid.design.controller_step import layout_with_controllers, size_controller
from offgrid.design.electrical.string_layout import string_limits
from offgrid.design.months import as_tuple
from offgrid.design.pv import DiodeParams, cell_temperature_ross
from offgrid.design.ratings import NEC_CONTINUOUS
from offgrid.design.result import (
    ArrayResult,
    ControllerResult,
    LoadResult,
    Notice,
    Reason,
    ReasonBook,
    SiteResult,
    fmt,
)
from offgrid.memo import memoised
from offgrid.project.model import BatterySpec, ControllerSpec, Derates, DesignChoices, ModuleSpec

#: Auto system-voltage rule: the lowest of 12/24/48 V that keeps the larger of array and
#: inverter power at or below this current (common practice, no source).
AUTO_VOLTAGE_MAX_CURRENT_A = 100.0


@dataclass(frozen=True)
class ArrayStep:
    array: ArrayResult
    controller: ControllerResult
    system_voltage_v: int
    absorption_voltage_v: float  # the bank's absorption voltage at the system voltage
    pwm_voltage: PwmVoltage  # what a PWM controller pulls the array down to
    design_month: int  # 0-based index of the least-covered month
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def energy_weighted_irradiance(poa_kwh_m2_day, daylight_h):
    """Energy-weighted mean irradiance [W/m2] of a half-sine day: pi^2 H / (8 N).

    For G(t) = Gpk sin(pi t/N), H = 2 Gpk N/pi and the energy-weighted mean
    integral(G^2)/integral(G) = pi Gpk/4 (common practice derivation, no source).
    """
    n = np.clip(np.asarray(daylight_h, dtype=float), 1.0, 24.0)
    return np.pi**2 * np.asarray(poa_kwh_m2_day, dtype=float) * 1000.0 / (8.0 * n)


def choose_system_voltage(
    chosen: int | str, unit_v: float, power_w: float
) -> tuple[int, dict[str, Reason]]:
    """The user's system voltage, or the auto rule (lowest that keeps DC current <= 100 A),
    with its reason."""
    book = ReasonBook()
    if chosen != "auto":
        book.add(
            "battery.system_voltage_v",
            "set by the user",
            "project file",
            system_voltage=fmt(int(chosen), "V"),
        )
        return int(chosen), book.freeze()
    for v in (12, 24, 48):
        if power_w / v <= AUTO_VOLTAGE_MAX_CURRENT_A and units_in_series(v, unit_v):
            break
    else:
        v = 48
    book.add(
        "battery.system_voltage_v",
        "lowest of 12, 24, 48 V at which the larger of array and inverter power draws at most "
        f"{AUTO_VOLTAGE_MAX_CURRENT_A:.0f} A and the battery units make the voltage",
        "common practice, no source",
        power=fmt(power_w, "W"),
        unit_voltage=fmt(unit_v, "V"),
    )
    return v, book.freeze()


def soiling_factor(d: Derates) -> tuple[float, str]:
    """Fraction kept after soiling: fixed, or the mean of a linear build-up between cleanings."""
    if d.soiling_rate_pct_per_day is not None:
        mean_loss = d.soiling_rate_pct_per_day / 100.0 * d.cleaning_interval_days / 2.0
        return max(0.5, 1.0 - mean_loss), (
            f"1 - daily rate {d.soiling_rate_pct_per_day:g} %/day x cleaning interval "
            f"{d.cleaning_interval_days:g} d / 2 (mean of a linear build-up)"
        )
    return d.soiling, "fixed soiling factor"


def temperature_factor(coefficient_pct_per_c: float, t_cell_c):
    """1 + coefficient x (cell temperature - 25 C): the module's power (gamma_Pmax) or
    current (alpha_Isc) at the cell temperature relative to STC (datasheet coefficients)."""
    return 1.0 + coefficient_pct_per_c / 100.0 * (t_cell_c - 25.0)


def temperature_and_operating_point(
    ctype: str,
    m: ModuleSpec,
    params: DiodeParams,
    t_cell,
    system_v: int,
    pwm: PwmVoltage,
    ns: int,
) -> tuple[np.ndarray, str, np.ndarray, list[Notice]]:
    """Each month's temperature derate and operating-point factor, and the PWM warning.

    MPPT: 1 + gamma_Pmax (Tc - 25 C), operating point 1.  PWM: the array is held at the
    PWM operating voltage (``pwm.array_v``, :func:`offgrid.design.charging.pwm_operating_voltage`),
    where the single-diode model gives the module current I at STC
    (:func:`offgrid.design.charging.pwm_module_current_a`), so the operating-point factor
    is (array voltage / series) x I / Pmax, at most 1, and the current follows the cell
    temperature as 1 + alpha_Isc (Tc - 25 C).
    """
    notices: list[Notice] = []
    if ctype == "mppt":
        f_temp = temperature_factor(m.gamma_pmax_pct_per_c, t_cell)
        temp_text = "1 + gamma_Pmax x (cell temperature - 25 C)"
        f_op = np.ones(12)
    else:
        # PWM: the array works at the battery's voltage, its current I(V) (1 + alpha dT).
        f_temp = temperature_factor(m.alpha_isc_pct_per_c, t_cell)
        temp_text = "1 + alpha_Isc x (cell temperature - 25 C) (PWM: current-limited)"
        v_op_module = pwm.array_v / ns
        i_op = pwm_module_current_a(params, pwm.array_v, ns)
        f_op_scalar = min(1.0, v_op_module * i_op / m.pmax_w)
        f_op = np.full(12, f_op_scalar)
        if ns * m.vmp_v > 1.6 * system_v:
            notices.append(
                Notice(
                    "pwm-voltage-waste",
                    f"With PWM the {ns}-module string (Vmp {ns * m.vmp_v:.0f} V)"
                    f" is pulled down to about {pwm.array_v:.1f} V, so only {f_op_scalar:.0%} "
                    "of "
                    "its power is used: choose an MPPT controller or modules made for a "
                    f"{system_v} V battery.",
                    "warning",
                    "array.power_w",
                )
            )
    return f_temp, temp_text, f_op, notices


@memoised  # planning: every design of a village has the same site and module
def _cells_on_site(
    poa_kwh_m2_day, latitude_deg: float, temp_day_c, noct_c: float, gamma_pmax_pct_per_c: float
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The site's plane-of-array insolation as an array, the energy-weighted irradiance
    over the day length, the cell temperature (Ross/NOCT) and the module's power
    temperature factor at it, 12 months each: what :func:`size_array` reads of the site
    before the demand."""
    poa = np.array(poa_kwh_m2_day)  # a copy: the memo makes its results read-only
    g_w = energy_weighted_irradiance(poa, sky.daylight_hours(latitude_deg))
    t_cell = cell_temperature_ross(temp_day_c, g_w, noct_c)
    return poa, g_w, t_cell, temperature_factor(gamma_pmax_pct_per_c, t_cell)


def size_array(
    module: ModuleSpec,
    ctrl_spec: ControllerSpec,
    battery: BatterySpec,
    choices: DesignChoices,
    site: SiteResult,
    loads: LoadResult,
    t_low: float,
    params: DiodeParams,
    min_modules: int = 0,
) -> ArrayStep:
    """Steps 4-5 (and 7): array power on the least-covered month, system voltage, string
    window, modules in series x parallel and the controllers that share them.

    ``min_modules``: at least this many modules (the pipeline raises it when the I-V
    harvest falls short).
    """
    book = ReasonBook()
    notices: list[Notice] = []
    m = module
    demand = np.asarray(loads.daily_energy_wh)
    poa, g_w, t_cell, f_temp_mppt = _cells_on_site(
        site.poa_kwh_m2_day, site.latitude_deg, site.temp_day_c, m.noct_c, m.gamma_pmax_pct_per_c
    )
    d = choices.derates
    soiling, soil_text = soiling_factor(d)
    batt_rt = battery.efficiency

    # A first estimate of power (MPPT chain) fixes the system voltage: f_temp_mppt.
    chain = soiling * d.mismatch * d.wiring * ctrl_spec.efficiency * batt_rt
    rough = float(
        np.max(np.divide(demand, poa * f_temp_mppt * chain, out=np.zeros(12), where=poa > 0))
    )
    system_v, voltage_reasons = choose_system_voltage(
        choices.system_voltage,
        battery.nominal_voltage_v,
        max(rough, loads.peak_ac_w * NEC_CONTINUOUS),
    )
    book.extend(voltage_reasons)
    batt_abs_v = absorption_voltage_v(battery.chemistry, system_v)
    pwm = pwm_operating_voltage(battery.chemistry, system_v, d.wiring)
    # String window (offgrid.design.electrical): cold Voc at the record low, hot Vmp from the fitted
    # single-diode model; DesignError when no series count fits the controller.
    lim = string_limits(
        m, ctrl_spec, choices.drop_limit_array_pct, site.temp_day_c, t_low, batt_abs_v, params
    )
    window, vmp_hot, voc_cold = lim.window, lim.vmp_hot_v, lim.voc_cold_v
    book.add(
        "array.modules_series",
        "MPPT: of the series counts in the string window, the layout with the fewest "
        "modules, then the fewest strings, then the higher voltage; PWM: the smallest "
        "count whose hot Vmp exceeds absorption + wiring drop",
        "NEC 690.7(A) for the cold Voc limit; the rest common practice, no source",
        absorption=fmt(batt_abs_v, "V"),
        vmp_hot=fmt(vmp_hot, "V"),
        voc_cold=fmt(voc_cold, "V"),
        controller_max=fmt(ctrl_spec.max_pv_voltage_v, "V"),
        window=f"{window.min_series}-{window.max_series}",
    )
    ns = window.min_series
    f_temp, temp_text, f_op, pwm_notices = temperature_and_operating_point(
        ctrl_spec.type, m, params, t_cell, system_v, pwm, ns
    )
    notices.extend(pwm_notices)

    # The design month: the month whose derated supply covers its demand least.
    monthly_total = f_temp * f_op * chain
    need_w = np.divide(
        demand, poa * monthly_total, out=np.zeros(12), where=(poa * monthly_total) > 0
    )
    dm = int(np.argmax(need_w))
    derates = {
        "temperature": float(f_temp[dm]),
        "operating point": float(f_op[dm]),
        "soiling": soiling,
        "mismatch": d.mismatch,
        "wiring": d.wiring,
        "controller": ctrl_spec.efficiency,
        "battery round trip": batt_rt,
    }
    total = float(np.prod(list(derates.values())))
    required = float(demand[dm] / (poa[dm] * total))
    # Lay out the modules and count the controllers together: each controller takes an equal
    # share of whole strings, and its share may not ask more than its rating.
    n_need = max(1, math.ceil(required / m.pmax_w - 1e-9), min_modules)
    layout = layout_with_controllers(ctrl_spec, m, window, n_need, system_v)
    ns, n_par = layout.series, layout.parallel
    string_w = ns * m.pmax_w
    power = n_par * string_w
    ctrl_step = size_controller(ctrl_spec, m, n_par, power, system_v, layout.controllers)
    ctrl = ctrl_step.controller
    book.extend(ctrl_step.reasons)
    supply = power * poa * monthly_total
    book.extend(
        _array_reasons(
            ArrayFigures(
                demand=demand,
                dm=dm,
                poa=poa,
                total=total,
                temp_text=temp_text,
                t_cell=t_cell,
                g_w=g_w,
                site=site,
                m=m,
                soil_text=soil_text,
                required=required,
                ns=ns,
                n_par=n_par,
                string_w=string_w,
                system_v=system_v,
                d=d,
                ctrl_spec=ctrl_spec,
                batt_rt=batt_rt,
                derates=derates,
                voc_cold=voc_cold,
                vmp_hot=vmp_hot,
                pwm=pwm,
                params=params,
            )
        )
    )
    array = ArrayResult(
        power_w=float(power),
        required_power_w=required,
        module_power_w=m.pmax_w,
        modules_series=ns,
        modules_parallel=n_par,
        module_count=ns * n_par,
        derates=derates,
        derate_total=total,
        cell_temp_c=as_tuple(t_cell),
        supply_wh_day=as_tuple(supply),
        voc_cold_v=float(voc_cold),
        vmp_hot_v=float(vmp_hot),
        string_voc_cold_v=float(ns * voc_cold),
        string_vmp_hot_v=float(ns * vmp_hot),
    )

    if ctrl.count > 1:
        notices.append(
            Notice(
                "several-controllers",
                f"{ctrl.count} charge controllers of "
                f"{ctrl.current_a:g} A are needed; give each its own group of "
                f"{n_par // ctrl.count} strings.",
                "info",
                "controller.current_a",
            )
        )
    return ArrayStep(array, ctrl, system_v, batt_abs_v, pwm, dm, book.freeze(), tuple(notices))


@dataclass(frozen=True)
class ArrayFigures:
    """The figures of the array sizing that its reasons quote (inputs and results)."""

    demand: np.ndarray
    dm: int
    poa: np.ndarray
    total: float
    temp_text: str
    t_cell: np.ndarray
    g_w: np.ndarray
    site: SiteResult
    m: ModuleSpec
    soil_text: str
    required: float
    ns: int
    n_par: int
    string_w: float
    system_v: int
    d: Derates
    ctrl_spec: ControllerSpec
    batt_rt: float
    derates: dict[str, float]
    voc_cold: float
    vmp_hot: float
    pwm: PwmVoltage
    params: DiodeParams


def _array_reasons(k: ArrayFigures) -> dict[str, Reason]:
    """Reasons of the array's power, derates, cell temperature and string voltages."""
    demand = k.demand
    dm = k.dm
    poa = k.poa
    total = k.total
    temp_text = k.temp_text
    t_cell = k.t_cell
    g_w = k.g_w
    site = k.site
    m = k.m
    soil_text = k.soil_text
    required = k.required
    ns = k.ns
    n_par = k.n_par
    string_w = k.string_w
    d = k.d
    ctrl_spec = k.ctrl_spec
    batt_rt = k.batt_rt
    derates = k.derates
    voc_cold = k.voc_cold
    vmp_hot = k.vmp_hot
    book = ReasonBook()
    book.add(
        "array.required_power_w",
        "design-month demand / (peak sun hours x product of derates), the largest of "
        "the twelve months",
        "worst-month method; derate chain common practice",
        demand=fmt(float(demand[dm]), "Wh/day"),
        peak_sun_hours=fmt(float(poa[dm]), "h"),
        derates=fmt(total),
    )
    book.add(
        "array.derates.temperature",
        temp_text,
        "cell temperature: Ross (1976) NOCT model, Duffie & Beckman eq. 23.3.3",
        cell_temperature=fmt(float(t_cell[dm]), "C"),
        irradiance=fmt(float(g_w[dm]), "W/m2"),
        ambient_day=fmt(site.temp_day_c[dm], "C"),
        noct=fmt(m.noct_c, "C"),
    )
    book.add("array.derates.soiling", soil_text, "common practice, no source")
    book.add(
        "array.power_w",
        "modules in series x strings in parallel x module Pmax, strings "
        "rounded up to meet the required power",
        "common practice, no source",
        required=fmt(required, "W"),
        series=str(ns),
        parallel=str(n_par),
        module=fmt(m.pmax_w, "W"),
    )
    book.add(
        "array.modules_parallel",
        "ceil(required power / (series x module Pmax))",
        "common practice, no source",
        required=fmt(required, "W"),
        string_power=fmt(string_w, "W"),
    )
    book.add(
        "array.supply_wh_day",
        "array power x plane-of-array insolation x the month's derates",
        "worst-month method",
    )
    book.given("array.module_power_w", "module.pmax_w", fmt(m.pmax_w, "W"))
    book.add(
        "array.module_count",
        "modules in series x strings in parallel",
        "common practice, no source",
        series=str(ns),
        parallel=str(n_par),
    )
    if k.ctrl_spec.type == "mppt":
        book.add(
            "array.derates.operating point",
            "MPPT: 1 (the controller holds the array at its maximum power point)",
            "common practice, no source",
        )
    else:
        pwm = k.pwm
        book.add(
            "array.derates.operating point",
            "PWM: (operating voltage / modules in series) x the module current there at STC "
            f"/ Pmax, at most 1; operating voltage: {PWM_ARRAY_SIDE_FORMULA}; battery side: "
            f"{PWM_BATTERY_SIDE_FORMULA}",
            "common practice, no source; module current: De Soto (2006) single-diode model",
            operating_voltage=fmt(pwm.array_v, "V"),
            battery_side=fmt(pwm.battery_v, "V"),
            full_rest=fmt(pwm.full_rest_v, "V"),
            absorption=fmt(pwm.absorption_v, "V"),
            wiring_derate=fmt(d.wiring),
            series=str(ns),
            module_current=fmt(pwm_module_current_a(k.params, pwm.array_v, ns), "A"),
            module_pmax=fmt(m.pmax_w, "W"),
        )
    book.given("array.derates.mismatch", "choices.derates.mismatch", fmt(d.mismatch))
    book.given("array.derates.wiring", "choices.derates.wiring", fmt(d.wiring))
    book.given("array.derates.controller", "controller.efficiency", fmt(ctrl_spec.efficiency))
    book.given("array.derates.battery round trip", "battery.efficiency", fmt(batt_rt))
    book.add(
        "array.derate_total",
        "product of the design month's derates",
        "common practice, no source",
        derates=" x ".join(fmt(v) for v in derates.values()),
    )
    book.add(
        "array.cell_temp_c",
        "daytime air temperature + (NOCT - 20 C) / 800 W/m2 x the "
        "month's energy-weighted irradiance (pi^2 H / (8 daylight hours))",
        "Ross (1976) NOCT model, Duffie & Beckman eq. 23.3.3; half-sine day, common practice",
        noct=fmt(m.noct_c, "C"),
    )
    book.add(
        "array.string_voc_cold_v",
        "modules in series x module Voc at the record low",
        "NFPA 70 (NEC) 2023 690.7(A)",
        series=str(ns),
        voc_cold=fmt(voc_cold, "V"),
    )
    book.add(
        "array.string_vmp_hot_v",
        "modules in series x module Vmp in the hottest month",
        "common practice, no source",
        series=str(ns),
        vmp_hot=fmt(vmp_hot, "V"),
    )
    return book.freeze()
