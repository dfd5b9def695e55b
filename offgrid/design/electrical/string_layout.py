"""The string window: cold Voc, hot Vmp and the series counts the controller takes."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from offgrid.design import strings as st
from offgrid.design.electrical.records import StringDesign
from offgrid.design.pv import DiodeParams, cell_temperature_ross, fit_module, module_mpp
from offgrid.design.result import (
    ArrayResult,
    DesignError,
    Notice,
    Reason,
    ReasonBook,
    fmt,
    reason_kind,
)
from offgrid.memo import memoised
from offgrid.project.model import ControllerSpec, ModuleSpec

NEC = "NFPA 70 (NEC) 2023"
HOT_IRRADIANCE_W_M2 = 1000.0


@dataclass(frozen=True)
class StringLimits:
    window: st.StringWindow
    voc_cold_v: float
    voc_rule: str
    vmp_hot_v: float
    hot_cell_temp_c: float
    record_low_c: float
    pwm_drop_v: float


def string_limits(
    module: ModuleSpec,
    controller: ControllerSpec,
    drop_limit_array_pct: float,
    temp_day_c,
    record_low_c: float,
    absorption_v: float,
    params: DiodeParams | None = None,
) -> StringLimits:
    """Cold Voc, hot Vmp and the series-count window of a module and controller.

    Hot Vmp: the fitted single-diode model at 1000 W/m2 and the NOCT cell
    temperature of the hottest month's daytime mean.  Raises DesignError when no
    series count fits.
    """
    if params is None:
        params = fit_module(module)
    return _limits(
        module.voc_v,
        module.beta_voc_pct_per_c,
        module.noct_c,
        module.vmp_v,
        controller.type,
        controller.max_pv_voltage_v,
        drop_limit_array_pct,
        temp_day_c,
        record_low_c,
        absorption_v,
        params,
    )


@memoised  # planning: a village's designs share a few windows
def _limits(
    voc_v: float,
    beta_voc_pct_per_c: float | None,
    noct_c: float,
    vmp_v: float,
    ctype: str,
    max_pv_voltage_v: float,
    drop_limit_array_pct: float,
    temp_day_c,
    record_low_c: float,
    absorption_v: float,
    params: DiodeParams,
) -> StringLimits:
    """:func:`string_limits` on the figures it reads of the module and controller."""
    voc_cold, rule = st.voc_cold_v(voc_v, beta_voc_pct_per_c, record_low_c)
    t_max = float(np.max(np.asarray(temp_day_c, dtype=float)))
    hot_tc = float(cell_temperature_ross(t_max, HOT_IRRADIANCE_W_M2, noct_c))
    vmp_hot = float(module_mpp(params, HOT_IRRADIANCE_W_M2, hot_tc)[0])
    pwm_drop = drop_limit_array_pct / 100.0 * absorption_v
    window = st.string_window(
        ctype,
        float(max_pv_voltage_v),
        voc_cold,
        vmp_hot,
        absorption_v,
        pwm_drop,
        vmp_v,
    )
    return StringLimits(window, voc_cold, rule, vmp_hot, hot_tc, record_low_c, pwm_drop)


@dataclass(frozen=True)
class StringStep:
    strings: StringDesign
    limits: StringLimits
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def lay_out_strings(
    module: ModuleSpec,
    params: DiodeParams,
    ctype: str,
    lim: StringLimits,
    temp_day,
    v_abs: float,
    array: ArrayResult,
    controller_count: int,
) -> StringStep:
    """The worst-month array's layout checked against the string window (laid out again
    when it does not fit), with the window's figures and their reasons.  What it reads of
    the module and the array is passed on to :func:`_lay_out` (memoised while planning:
    a village's designs share a few layouts)."""
    return _lay_out(
        module.voc_v,
        module.noct_c,
        module.vmp_v,
        params,
        ctype,
        lim,
        temp_day,
        v_abs,
        array.modules_series,
        array.modules_parallel,
        array.module_count,
        controller_count,
        reason_kind(),
    )


@memoised
def _lay_out(
    voc_v: float,
    noct_c: float,
    vmp_v: float,
    params: DiodeParams,
    ctype: str,
    lim: StringLimits,
    temp_day,
    v_abs: float,
    modules_series: int,
    modules_parallel: int,
    module_count: int,
    controller_count: int,
    kind: type,
) -> StringStep:
    """:func:`lay_out_strings` on the figures it reads (``kind``: the reason record in
    force, part of the memo's key only)."""
    rb = ReasonBook()
    notices: list[Notice] = []
    temp_day = np.asarray(temp_day, dtype=float)
    window, voc_cold, voc_rule = lim.window, lim.voc_cold_v, lim.voc_rule
    vmp_hot, hot_tc, record_low = lim.vmp_hot_v, lim.hot_cell_temp_c, lim.record_low_c
    controllers = max(1, int(controller_count))
    core_series = int(modules_series)
    if st.layout_fits(window, core_series) and modules_parallel >= 1:
        per = math.ceil(modules_parallel / controllers)
        layout = st.Layout(
            core_series,
            int(modules_parallel),
            controllers,
            per,
            core_series * int(modules_parallel),
        )
        changed = False
    else:
        layout = st.choose_layout(window, int(module_count), controllers)
        changed = True
        notices.append(
            Notice(
                "layout-changed",
                f"The array is laid out {layout.series} in series x "
                f"{layout.parallel} in parallel to fit the controller's string window "
                f"({window.min_series}-{window.max_series} in series).",
                "warning",
                "strings.series",
            )
        )
    strings = StringDesign(
        window,
        layout,
        voc_cold,
        voc_rule,
        vmp_hot,
        hot_tc,
        record_low,
        layout.series * voc_cold,
        layout.series * vmp_hot,
        changed,
    )
    rb.extend(_string_reasons(voc_v, noct_c, vmp_v, params, ctype, strings, temp_day, v_abs))
    if window.hot_vmp_short and ctype == "pwm":
        notices.append(
            Notice(
                "pwm-hot-vmp",
                f"In the hottest month the string's Vmp falls to "
                f"{layout.series * vmp_hot:.1f} V, below the {window.required_vmp_v:.1f} V the "
                "battery needs at absorption: charging slows in the midday heat (the PWM harvest "
                "includes it). An MPPT controller with one more module in series avoids it.",
                "info",
                "array.vmp_hot_v",
            )
        )
    return StringStep(strings, lim, rb.freeze(), tuple(notices))


def other_layout(
    ctype: str,
    layout: st.Layout,
    module_vmp_v: float,
    max_pv_voltage_v: float,
    voc_cold: float,
    vmp_hot: float,
    v_abs: float,
    pwm_drop: float,
) -> st.Layout:
    """Layout of the same modules for the controller type not chosen, for the comparison."""
    n, k = layout.module_count, layout.controllers
    if ctype == "mppt":  # PWM: fewest modules in series that suit the battery (STC Vmp)
        s = max(1, math.ceil((v_abs + pwm_drop) / module_vmp_v - 1e-9))
        per = math.ceil(math.ceil(n / s) / k)
        return st.Layout(s, per * k, k, per, s * per * k)
    try:
        win = st.string_window("mppt", float(max_pv_voltage_v), voc_cold, vmp_hot, v_abs)
    except DesignError:
        return layout
    return st.choose_layout(win, n, k)


def _string_reasons(
    voc_v: float,
    noct_c: float,
    vmp_v: float,
    params: DiodeParams,
    ctype: str,
    strings: StringDesign,
    temp_day: np.ndarray,
    v_abs: float,
) -> dict[str, Reason]:
    """Reasons of the string window and the layout's voltages."""
    window, layout = strings.window, strings.layout
    voc_cold, voc_rule, vmp_hot = strings.voc_cold_v, strings.voc_cold_rule, strings.vmp_hot_v
    hot_tc, record_low = strings.hot_cell_temp_c, strings.record_low_c
    rb = ReasonBook()
    rb.add(
        "array.voc_cold_v",
        "module Voc at the record low ambient: Voc x (1 + beta (Tlow - "
        "25 C)), or x the Table 690.7(A) factor without a coefficient",
        f"{NEC} 690.7(A)",
        voc_stc=fmt(voc_v, "V"),
        record_low=fmt(record_low, "C"),
        rule=voc_rule,
    )
    rb.add(
        "array.vmp_hot_v",
        "module Vmp at 1000 W/m2 and the hottest month's NOCT cell "
        "temperature, from the fitted single-diode model",
        params.method,
        cell_temp=fmt(hot_tc, "C"),
        ambient=fmt(float(temp_day.max()), "C"),
        noct=fmt(noct_c, "C"),
    )
    rb.add(
        "controller.max_pv_voltage_v",
        "the controller's maximum PV input voltage (user "
        "input); the string's cold Voc must stay below it",
        f"{NEC} 690.7",
        string_voc_cold=fmt(strings.string_voc_cold_v, "V"),
    )
    for key, ref in (("voc_cold_v", "array.voc_cold_v"), ("vmp_hot_v", "array.vmp_hot_v")):
        r = rb.freeze()[ref]
        rb.add(f"strings.{key}", r.formula, r.source, **dict(r.inputs))
    rb.add(
        "strings.hot_cell_temp_c",
        "hottest month's daytime air temperature + (NOCT - 20 C) x 1000 W/m2 / 800 W/m2",
        "Duffie & Beckman 4th ed. eq. 23.3.3 (NOCT method)",
        ambient=fmt(float(temp_day.max()), "C"),
        noct=fmt(noct_c, "C"),
    )
    rb.add(
        "strings.record_low_c",
        "the site's record low (as site.record_low_c)",
        "climate file or estimate, see site.record_low_c",
        value=fmt(record_low, "C"),
    )
    rb.add(
        "strings.string_voc_cold_v",
        "modules in series x module cold Voc; must stay at or "
        "below the controller's maximum PV voltage",
        f"{NEC} 690.7(A)",
        series=str(layout.series),
        voc_cold=fmt(voc_cold, "V"),
    )
    rb.add(
        "strings.string_vmp_hot_v",
        "modules in series x module hot Vmp",
        "common practice, no source",
        series=str(layout.series),
        vmp_hot=fmt(vmp_hot, "V"),
    )
    rb.add(
        "strings.required_string_vmp_v",
        "MPPT: absorption voltage + the controller's "
        f"{st.MPPT_MARGIN_V:g} V margin; PWM: absorption voltage + the array wiring drop",
        "common practice, no source (check the controller's manual)",
        absorption=fmt(v_abs, "V"),
    )
    rb.add(
        "strings.series",
        "modules in series (see array.modules_series)",
        "common practice, no source",
        window=f"{window.min_series}-{window.max_series}",
    )
    rb.add(
        "strings.parallel",
        "strings in parallel (see array.modules_parallel)",
        "common practice, no source",
    )
    rb.add(
        "strings.controllers",
        "charge controllers sharing the strings (see controller.count)",
        "common practice, no source",
    )
    rb.add(
        "strings.strings_per_controller",
        "strings in parallel / controllers (equal shares)",
        "common practice, no source",
        parallel=str(layout.parallel),
        controllers=str(layout.controllers),
    )
    rb.add(
        "strings.max_series",
        "floor(controller max PV voltage / module cold Voc)",
        f"{NEC} 690.7(A)",
        max_pv=fmt(window.max_pv_voltage_v, "V"),
        voc_cold=fmt(voc_cold, "V"),
    )
    if ctype == "mppt":
        rb.add(
            "strings.min_series",
            "ceil((absorption + MPPT margin) / module hot Vmp)",
            "common practice, no source",
            required=fmt(window.required_vmp_v, "V"),
            vmp_hot=fmt(vmp_hot, "V"),
        )
    else:
        rb.add(
            "strings.min_series",
            "ceil((absorption + wiring drop) / module Vmp at STC): the "
            "module's suitability for PWM at this battery voltage",
            "common practice, no source",
            required=fmt(window.required_vmp_v, "V"),
            vmp_stc=fmt(vmp_v, "V"),
        )
    return rb.freeze()
