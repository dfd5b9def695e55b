"""Shapes within the day: the sun's hourly share and the load windows.

Hours are solar time, hour h covers h:00-h+1:00 (time-zone offset ignored).

References
----------
.. [1] Collares-Pereira, M. and Rabl, A., "The average distribution of solar
   radiation - correlations between diffuse and hemispherical and between
   daily and hourly insolation values", Solar Energy 22 (1979) 155-164;
   as given in Duffie & Beckman, 4th ed., eq. 2.13.2.
"""

from __future__ import annotations

import numpy as np

from offgrid.climate.sky import KLEIN_MEAN_DAY, declination_cooper69, sunset_hour_angle

HOURS = 24
#: Hour windows of each time-of-day choice, solar time [start, end) (common practice,
#: no source: our own convention, stated in the output).
LOAD_WINDOWS_H: dict[str, tuple[int, int]] = {
    "any": (0, 24),
    "morning": (5, 8),
    "day": (8, 17),
    "evening": (17, 22),
    "night": (22, 29),  # 22:00 to 05:00 next morning
}


def collares_pereira_rabl_rt(latitude_deg: float, day_of_year=KLEIN_MEAN_DAY) -> np.ndarray:
    """Share of the daily global horizontal insolation in each hour [-].

    Collares-Pereira & Rabl (1979) [1]:
    r_t = (pi/24) (a + b cos w) (cos w - cos ws) / (sin ws - (pi ws / 180) cos ws),
    a = 0.409 + 0.5016 sin(ws - 60), b = 0.6609 - 0.4767 sin(ws - 60), evaluated at
    each hour's mid-point and normalised so the 24 shares of a day sum to 1.

    Returns
    -------
    numpy.ndarray, shape (len(day_of_year), 24)
    """
    ws_deg = sunset_hour_angle(latitude_deg, declination_cooper69(day_of_year))
    ws = np.radians(np.atleast_1d(ws_deg))[:, None]
    w = np.radians(15.0 * (np.arange(HOURS) + 0.5 - 12.0))[None, :]
    a = 0.409 + 0.5016 * np.sin(ws - np.radians(60.0))
    b = 0.6609 - 0.4767 * np.sin(ws - np.radians(60.0))
    den = np.sin(ws) - ws * np.cos(ws)
    with np.errstate(divide="ignore", invalid="ignore"):
        rt = (np.pi / 24.0) * (a + b * np.cos(w)) * (np.cos(w) - np.cos(ws)) / den
    rt = np.where((den > 1e-9) & np.isfinite(rt), np.maximum(rt, 0.0), 0.0)
    total = rt.sum(axis=1, keepdims=True)
    return np.divide(rt, total, out=np.zeros_like(rt), where=total > 0)


def window_profile(time_of_day: str) -> np.ndarray:
    """Share of a load's daily energy in each hour: even over its window [-], shape (24,)."""
    if time_of_day not in LOAD_WINDOWS_H:
        raise ValueError(f"time of day: {time_of_day!r} is not one of {', '.join(LOAD_WINDOWS_H)}")
    start, end = LOAD_WINDOWS_H[time_of_day]
    prof = np.zeros(HOURS)
    prof[np.arange(start, end) % HOURS] = 1.0
    return prof / prof.sum()


def clipped_daily_fraction(sun_rt: np.ndarray, hours_at_limit) -> np.ndarray:
    """Daily energy passed by a power limit, per unit of the limit [h].

    With the day's energy E spread as ``sun_rt`` (24 shares) and a limit L, the
    energy passed is sum_h min(E r_h, L) = L G(E/L); this returns G(y) for
    ``hours_at_limit`` y = E/L [h].
    """
    y = np.asarray(hours_at_limit, dtype=float)
    return np.minimum(y[..., None] * sun_rt, 1.0).sum(axis=-1)
