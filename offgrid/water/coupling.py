"""The pump on the array: operating points over the steps of each month's mean day.

* Direct drive: the intersection of the array's I-V curve (the single-diode model of
  :mod:`offgrid.design.pv`, in Bishop's diode-voltage form) with the motor's current-voltage
  line, found by bisection on the diode voltage for every step at once: along the curve the
  array current falls and the terminal voltage rises, so array current minus load current
  falls through one zero.
* Controller drive: the controller holds the array at its maximum power point while that
  lies inside its input window; below the window it holds the lowest input voltage.

Both take the irradiance and cell temperature as arrays of any shape (months x steps).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design.pv import (
    DiodeParams,
    bishop88,
    calcparams_desoto,
    module_current,
    module_mpp,
    open_circuit_voltage,
)

BISECTION_STEPS = 44  # 2^-44 of Voc: below 1e-11 V


@dataclass(frozen=True)
class ArrayLayout:
    series: int
    parallel: int

    @property
    def modules(self) -> int:
        return self.series * self.parallel


def load_current_a(voltage_v, line_v: np.ndarray, line_i: np.ndarray):
    """Current of a piecewise-linear load line through (line_v, line_i) from (0, 0), extended
    past its last point along its last segment [A]."""
    v = np.maximum(np.asarray(voltage_v, dtype=float), 0.0)
    i = np.interp(v, line_v, line_i)
    slope = (line_i[-1] - line_i[-2]) / (line_v[-1] - line_v[-2])
    return np.where(v > line_v[-1], line_i[-1] + slope * (v - line_v[-1]), i)


def direct_operating_point(
    params: DiodeParams,
    irradiance_w_m2,
    cell_temp_c,
    layout: ArrayLayout,
    line_v: np.ndarray,
    line_i: np.ndarray,
):
    """Array voltage [V] and current [A] where the array meets the load line; 0 in the dark."""
    g = np.asarray(irradiance_w_m2, dtype=float)
    il, i0, rs, rsh, a = calcparams_desoto(params, g, cell_temp_c)
    lo = np.zeros_like(il)
    hi = open_circuit_voltage(il, i0, rsh, a)
    for _ in range(BISECTION_STEPS):
        mid = 0.5 * (lo + hi)
        i, v, _ = bishop88(mid, il, i0, rs, rsh, a)
        f = layout.parallel * i - load_current_a(layout.series * v, line_v, line_i)
        lo = np.where(f > 0, mid, lo)
        hi = np.where(f > 0, hi, mid)
    i, v, _ = bishop88(0.5 * (lo + hi), il, i0, rs, rsh, a)
    lit = g > 0.5
    return (
        np.where(lit, layout.series * np.maximum(v, 0.0), 0.0),
        np.where(lit, layout.parallel * np.maximum(i, 0.0), 0.0),
    )


def controller_input_power_w(
    params: DiodeParams, irradiance_w_m2, cell_temp_c, layout: ArrayLayout, min_input_v: float
):
    """Array power into a controller [W]: MPP inside the window, else at its lowest voltage."""
    vmp, _imp, pmp = module_mpp(params, irradiance_w_m2, cell_temp_c)
    v_floor = min_input_v / layout.series
    low = vmp < v_floor
    p_mod = pmp
    if np.any(low):
        i_floor = module_current(params, v_floor, irradiance_w_m2, cell_temp_c)
        p_mod = np.where(low, i_floor * v_floor, pmp)
    return layout.modules * p_mod
