"""The string window: cold Voc, hot Vmp and the series counts the controller takes."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design import strings as st
from offgrid.design.pv import DiodeParams, cell_temperature_ross, fit_module, module_mpp
from offgrid.project.model import ControllerSpec, ModuleSpec

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
    voc_cold, rule = st.voc_cold_v(module.voc_v, module.beta_voc_pct_per_c, record_low_c)
    t_max = float(np.max(np.asarray(temp_day_c, dtype=float)))
    hot_tc = float(cell_temperature_ross(t_max, HOT_IRRADIANCE_W_M2, module.noct_c))
    vmp_hot = float(module_mpp(params, HOT_IRRADIANCE_W_M2, hot_tc)[0])
    pwm_drop = drop_limit_array_pct / 100.0 * absorption_v
    window = st.string_window(
        controller.type,
        float(controller.max_pv_voltage_v),
        voc_cold,
        vmp_hot,
        absorption_v,
        pwm_drop,
        module.vmp_v,
    )
    return StringLimits(window, voc_cold, rule, vmp_hot, hot_tc, record_low_c, pwm_drop)
