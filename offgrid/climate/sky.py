"""Sun geometry on the mean day of each month, clearness and the monthly diffuse fraction.

All functions are vectorised over months (arrays of 12).  Angles in degrees at
the interface, radians inside.

References
----------
.. [1] Duffie, J. A. and Beckman, W. A., Solar Engineering of Thermal Processes,
   4th ed., Wiley, 2013: eq. 1.6.1a (Cooper declination), 1.10.3 (monthly mean
   daily extraterrestrial radiation), table 1.6.1 (Klein's mean days),
   sec. 2.19 (the monthly transposition and Klein's Rb are in
   :mod:`offgrid.climate.poa`: ``poa_monthly_liu_jordan``, ``beam_ratio_rb_klein``).
.. [2] Klein, S. A., "Calculation of monthly average insolation on tilted
   surfaces", Solar Energy 19 (1977) 325-329.
.. [3] Erbs, D. G., Klein, S. A. and Duffie, J. A., "Estimation of the diffuse
   radiation fraction for hourly, daily and monthly-average global
   radiation", Solar Energy 28 (1982) 293-302.
.. [4] Allen, R. G. et al., Crop evapotranspiration, FAO Irrigation and
   Drainage Paper 56, 1998: eqs. 21, 23-25, 34.
"""

from __future__ import annotations

import numpy as np

from offgrid.climate.albedo import ALBEDO_HINT, DEFAULT_ALBEDO, albedo_problems

__all__ = ["ALBEDO_HINT", "DEFAULT_ALBEDO", "albedo_problems"]  # kept where callers look

SOLAR_CONSTANT_W_M2 = 1367.0  # Duffie & Beckman [1] sec. 1.2
#: Klein (1977) recommended average day of each month, day of year [2].
KLEIN_MEAN_DAY = np.array([17, 47, 75, 105, 135, 162, 198, 228, 258, 288, 318, 344])
DAYS_IN_MONTH = np.array([31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31])


def monthly_albedo(albedo=None, path: str = "site.albedo") -> np.ndarray:
    """Ground reflectance of each month, shape (12,) [-].

    ``albedo``: ``None`` (the default 0.2), one number, or twelve values
    January first (snow months).  ValueError naming ``path`` when out of range.
    """
    if albedo is None:
        return np.full(12, DEFAULT_ALBEDO)
    if isinstance(albedo, np.ndarray):
        albedo = albedo.tolist()
    problems = albedo_problems(albedo, path)
    if problems:
        where, message = problems[0]
        raise ValueError(f"{where}: {message}")
    return np.broadcast_to(np.asarray(albedo, dtype=float), (12,)).copy()


def describe_albedo(albedo) -> str:
    """Short text of a reflectance: ``0.2``, or ``0.7 Jan-Feb, 0.4 Mar, 0.2 Apr-Nov, 0.4 Dec``."""
    values = monthly_albedo(albedo)
    if np.all(values == values[0]):
        return f"{values[0]:g}"
    names = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
    runs, start = [], 0
    for m in range(1, 13):
        if m == 12 or values[m] != values[start]:
            span = names[start] if m - 1 == start else f"{names[start]}-{names[m - 1]}"
            runs.append(f"{values[start]:g} {span}")
            start = m
    return ", ".join(runs)


def declination_cooper69(day_of_year):
    """Solar declination [deg], Cooper (1969) via Duffie & Beckman eq. 1.6.1a."""
    n = np.asarray(day_of_year, dtype=float)
    return 23.45 * np.sin(np.radians(360.0 * (284.0 + n) / 365.0))


def sunset_hour_angle(latitude_deg, declination_deg):
    """Sunset hour angle [deg] on a horizontal surface, 0 in polar night, 180 in midnight sun."""
    x = -np.tan(np.radians(latitude_deg)) * np.tan(np.radians(declination_deg))
    return np.degrees(np.arccos(np.clip(x, -1.0, 1.0)))


def extraterrestrial_daily_kwh_m2(latitude_deg, day_of_year):
    """Daily extraterrestrial radiation on a horizontal surface [kWh/m2/day].

    Duffie & Beckman eq. 1.10.3 with the Spencer-free eccentricity 1 + 0.033 cos(360 n / 365).
    """
    n = np.asarray(day_of_year, dtype=float)
    phi = np.radians(latitude_deg)
    dec = np.radians(declination_cooper69(n))
    ws = np.radians(sunset_hour_angle(latitude_deg, np.degrees(dec)))
    e0 = 1.0 + 0.033 * np.cos(2.0 * np.pi * n / 365.0)
    h0_j = (
        (24 * 3600 / np.pi)
        * SOLAR_CONSTANT_W_M2
        * e0
        * (np.cos(phi) * np.cos(dec) * np.sin(ws) + ws * np.sin(phi) * np.sin(dec))
    )
    return np.maximum(h0_j, 0.0) / 3.6e6


def fao56_ra_mj_m2_day(latitude_deg, day_of_year):
    """Extraterrestrial radiation Ra [MJ/m2/day] exactly as FAO-56 eqs. 21, 23-25 [4]."""
    j = np.asarray(day_of_year, dtype=float)
    phi = np.radians(latitude_deg)
    dr = 1 + 0.033 * np.cos(2 * np.pi * j / 365)
    dec = 0.409 * np.sin(2 * np.pi * j / 365 - 1.39)
    ws = np.arccos(np.clip(-np.tan(phi) * np.tan(dec), -1, 1))
    gsc = 0.0820
    return (
        (24 * 60 / np.pi)
        * gsc
        * dr
        * (ws * np.sin(phi) * np.sin(dec) + np.cos(phi) * np.cos(dec) * np.sin(ws))
    )


def fao56_daylight_hours(latitude_deg, day_of_year):
    """Daylight hours N [h], FAO-56 eq. 34 (with the eq. 24-25 declination and ws)."""
    j = np.asarray(day_of_year, dtype=float)
    dec = 0.409 * np.sin(2 * np.pi * j / 365 - 1.39)
    ws = np.arccos(np.clip(-np.tan(np.radians(latitude_deg)) * np.tan(dec), -1, 1))
    return 24 / np.pi * ws


def clearness_index(insolation_kwh_m2_day, latitude_deg):
    """Monthly mean clearness index KT = H / H0 on Klein's mean days (0 where H0 = 0)."""
    h = np.asarray(insolation_kwh_m2_day, dtype=float)
    h0 = extraterrestrial_daily_kwh_m2(latitude_deg, KLEIN_MEAN_DAY)
    return np.divide(h, h0, out=np.zeros_like(h), where=h0 > 1e-9)


def erbs_monthly_diffuse_fraction(kt, sunset_hour_angle_deg):
    """Monthly mean diffuse fraction Hd/H, Erbs, Klein & Duffie (1982) [3].

    Valid for 0.3 <= KT <= 0.8; KT is clipped to that range.
    """
    kt = np.clip(np.asarray(kt, dtype=float), 0.3, 0.8)
    ws = np.asarray(sunset_hour_angle_deg, dtype=float)
    low = 1.391 - 3.560 * kt + 4.189 * kt**2 - 2.137 * kt**3
    high = 1.311 - 3.022 * kt + 3.427 * kt**2 - 1.821 * kt**3
    return np.where(ws <= 81.4, low, high)


def daylight_hours(latitude_deg, day_of_year=KLEIN_MEAN_DAY):
    """Day length [h] from the sunset hour angle (Duffie & Beckman eq. 1.6.11)."""
    return 2.0 * sunset_hour_angle(latitude_deg, declination_cooper69(day_of_year)) / 15.0


def equator_facing_azimuth(latitude_deg: float) -> float:
    """180 (south) in the northern hemisphere and on the equator, 0 (north) in the southern."""
    return 180.0 if latitude_deg >= 0 else 0.0
