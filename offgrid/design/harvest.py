"""Daily energy from the array through a PWM or an MPPT controller, month by month.

The mean day of each month is split into time steps across the daylight
hours.  Horizontal global irradiance follows the Collares-Pereira and Rabl
(1979) ratio r_t and its diffuse part the Liu and Jordan (1960) ratio r_d
(Duffie & Beckman, 4th ed., eqs. 1.13.1 and 1.13.2b), with the monthly diffuse
fraction of Erbs et al. (1982); the isotropic-sky transposition (D&B eq.
2.15.1) turns them into plane-of-array irradiance, scaled so that the day
adds up to the monthly plane-of-array insolation of the worst-month core.
At every step the module's I-V curve at that irradiance and cell
temperature gives:

* MPPT: the maximum power, less the cable losses, times the controller
  efficiency;
* PWM: the current at the battery's charging voltage plus the cable drop
  (the array is switched straight onto the battery), times that voltage.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.climate.poa import ground_reflected_isotropic, sky_diffuse_isotropic
from offgrid.design.pv import DiodeParams, cell_temperature_ross, module_current, module_mpp
from offgrid.memo import memoised

PROFILE_STEPS = 48


@memoised
def daily_poa_profile(
    horizontal_kwh_m2_day,
    poa_kwh_m2_day,
    latitude_deg: float,
    tilt_deg: float,
    azimuth_deg: float,
    albedo=None,
    steps: int = PROFILE_STEPS,
):
    """Plane-of-array irradiance over the mean day of each month.

    Returns ``(irradiance_w_m2, step_h)``: a (12, steps) array at the midpoints
    of equal hour-angle steps from sunrise to sunset, and the step length of
    each month [h].  Each row integrates to the month's ``poa_kwh_m2_day``.
    """
    h = np.asarray(horizontal_kwh_m2_day, dtype=float)
    target = np.asarray(poa_kwh_m2_day, dtype=float)
    dec = sky.declination_cooper69(sky.KLEIN_MEAN_DAY)
    ws_deg = sky.sunset_hour_angle(latitude_deg, dec)
    ws = np.radians(ws_deg)[:, None]
    frac = (np.arange(steps) + 0.5) / steps
    w = ws * (2.0 * frac[None, :] - 1.0)  # hour angle, rad, 12 x steps
    step_h = 2.0 * np.degrees(ws[:, 0]) / 15.0 / steps

    # Collares-Pereira & Rabl r_t and Liu & Jordan r_d (per hour, D&B eqs. 1.13.1-2).
    cos_ws = np.cos(ws)
    denom = np.sin(ws) - ws * cos_ws
    safe = np.where(denom > 1e-9, denom, 1.0)
    a = 0.409 + 0.5016 * np.sin(ws - np.radians(60.0))
    b = 0.6609 - 0.4767 * np.sin(ws - np.radians(60.0))
    shape = np.maximum(np.cos(w) - cos_ws, 0.0)
    rd = np.pi / 24.0 * shape / safe
    rt = rd * (a + b * np.cos(w))
    kt = sky.clearness_index(h, latitude_deg)
    fd = sky.erbs_monthly_diffuse_fraction(kt, ws_deg)[:, None]
    glob = rt * h[:, None] * 1000.0  # W/m2
    diff = np.minimum(rd * fd * h[:, None] * 1000.0, glob)
    beam = glob - diff

    phi = np.radians(latitude_deg)
    beta = np.radians(tilt_deg)
    gamma = np.radians(azimuth_deg - 180.0)  # D&B convention: 0 = equator-facing in the north
    d = np.radians(dec)[:, None]
    cos_z = np.sin(phi) * np.sin(d) + np.cos(phi) * np.cos(d) * np.cos(w)
    cos_t = (
        np.sin(d) * np.sin(phi) * np.cos(beta)
        - np.sin(d) * np.cos(phi) * np.sin(beta) * np.cos(gamma)
        + np.cos(d) * np.cos(phi) * np.cos(beta) * np.cos(w)
        + np.cos(d) * np.sin(phi) * np.sin(beta) * np.cos(gamma) * np.cos(w)
        + np.cos(d) * np.sin(beta) * np.sin(gamma) * np.sin(w)
    )
    rb = np.where(cos_z > 1e-6, np.maximum(cos_t, 0.0) / np.where(cos_z > 1e-6, cos_z, 1.0), 0.0)
    rho = sky.monthly_albedo(albedo)[:, None]  # one value or twelve; None: 0.2
    g = (
        beam * rb
        + sky_diffuse_isotropic(tilt_deg, diff)
        + ground_reflected_isotropic(tilt_deg, glob, rho)
    )
    total = (g * step_h[:, None]).sum(axis=1) / 1000.0
    scale = np.divide(target, total, out=np.zeros_like(target), where=total > 1e-9)
    return g * scale[:, None], step_h


@dataclass(frozen=True)
class HarvestInputs:
    series: int
    strings_per_controller: int
    controllers: int
    battery_v: float  # battery voltage while charging
    controller_efficiency: float
    soiling: float  # fraction of irradiance kept
    mismatch: float  # fraction of current kept
    string_loop_ohm: float  # both conductors of one string run
    array_loop_ohm: float  # both conductors of one array-to-controller run
    charge_loop_ohm: float  # both conductors of one controller-to-battery run


@memoised
def harvest_wh_day(
    params: DiodeParams, irradiance_w_m2, step_h, ambient_c, noct_c: float, h: HarvestInputs
) -> tuple[np.ndarray, np.ndarray]:
    """Daily energy into the battery each month through MPPT and through PWM [Wh/day].

    ``irradiance_w_m2`` is (12, steps), ``step_h`` and ``ambient_c`` have 12 values.
    """
    g = np.asarray(irradiance_w_m2, dtype=float) * h.soiling
    tc = cell_temperature_ross(np.asarray(ambient_c, dtype=float)[:, None], g, noct_c)
    dt = np.asarray(step_h, dtype=float)[:, None]
    n = h.strings_per_controller

    # MPPT: maximum power of the sub-array, less I^2 R in the string and array runs.  A buck
    # converter cannot raise the voltage: when the MPP lies below the battery voltage the
    # array works at the battery voltage instead.
    vmp, imp, pmp = module_mpp(params, g, tc)
    v_floor = h.battery_v / h.series
    low = vmp < v_floor
    if np.any(low):
        i_floor = module_current(params, v_floor, g, tc)
        imp = np.where(low, i_floor, imp)
        pmp = np.where(low, i_floor * v_floor, pmp)
    i_str = imp * h.mismatch
    p_in = (
        h.series * n * pmp * h.mismatch
        - n * i_str**2 * h.string_loop_ohm
        - (n * i_str) ** 2 * h.array_loop_ohm
    )
    p_out = np.maximum(p_in, 0.0) * h.controller_efficiency
    p_mppt = np.maximum(p_out - (p_out / h.battery_v) ** 2 * h.charge_loop_ohm, 0.0)

    # PWM: module held at (battery voltage + cable drop) / series; the cables appear as extra
    # series resistance per module: (R_string + n R_array + n R_charge) / series.
    extra = (h.string_loop_ohm + n * (h.array_loop_ohm + h.charge_loop_ohm)) / h.series
    i_mod = module_current(params, h.battery_v / h.series, g, tc, extra_series_ohm=extra)
    p_pwm = h.battery_v * n * i_mod * h.mismatch * h.controller_efficiency

    k = h.controllers
    return (k * (p_mppt * dt).sum(axis=1), k * (p_pwm * dt).sum(axis=1))
