"""Sun positions through pvlib's implementation of the NREL solar position algorithm.

pvlib is imported inside the functions: it costs about 0.7 s to import and the
monthly sizing path does not need it.

References
----------
.. [1] Reda, I. and Andreas, A., "Solar position algorithm for solar radiation
   applications", Solar Energy 76 (2004) 577-589.
"""

from __future__ import annotations

import numpy as np

from offgrid.climate.sky import KLEIN_MEAN_DAY

#: Year used to place the mean days on a calendar (not a leap year).
REFERENCE_YEAR = 2023


def solar_position_spa(
    times,
    latitude_deg: float,
    longitude_deg: float,
    elevation_m: float = 0.0,
    pressure_hpa: float | None = None,
    temp_air_c: float = 12.0,
    delta_t_s: float = 67.0,
):
    """Apparent (refracted) zenith and azimuth of the sun [deg], Reda and Andreas (2004) [1].

    Parameters
    ----------
    times : pandas.DatetimeIndex
        Time-zone aware instants.
    latitude_deg, longitude_deg : float
        Site, degrees north and east.
    elevation_m : float
        Site elevation [m].
    pressure_hpa : float, optional
        Air pressure [hPa]; default from the elevation (pvlib ``alt2pres``).
    temp_air_c : float
        Air temperature for the refraction correction [C].
    delta_t_s : float
        Difference TT - UT [s].

    Returns
    -------
    dict of numpy arrays: ``zenith_deg`` (apparent, topocentric), ``azimuth_deg``
    (clockwise from north).
    """
    from pvlib import atmosphere, solarposition  # late import: pvlib is slow to import

    if pressure_hpa is None:
        pressure_pa = float(atmosphere.alt2pres(elevation_m))
    else:
        pressure_pa = pressure_hpa * 100.0
    sp = solarposition.spa_python(
        times,
        latitude_deg,
        longitude_deg,
        altitude=elevation_m,
        pressure=pressure_pa,
        temperature=temp_air_c,
        delta_t=delta_t_s,
    )
    return {"zenith_deg": sp["apparent_zenith"].to_numpy(), "azimuth_deg": sp["azimuth"].to_numpy()}


def mean_day_sun_paths(
    latitude_deg: float,
    longitude_deg: float,
    elevation_m: float = 0.0,
    step_min: float = 5.0,
    days_of_year=KLEIN_MEAN_DAY,
):
    """Sun positions across the mean day of each month (Klein 1977), local solar day.

    ``days_of_year`` may name other days (D of them).

    Returns
    -------
    dict with ``zenith_deg`` and ``azimuth_deg`` of shape (D, steps), D = 12 by
    default, and ``step_h``.
    """
    days = np.asarray(days_of_year, dtype=int)
    import pandas as pd

    steps = round(24 * 60 / step_min)
    minutes = (np.arange(steps) + 0.5) * step_min  # interval midpoints, local solar time
    offset_min = -longitude_deg * 4.0  # local mean solar midnight, minutes after 00:00 UTC
    day_start = np.datetime64(f"{REFERENCE_YEAR}-01-01T00:00") + (days - 1).astype("timedelta64[D]")
    grid_min = (minutes[None, :] + offset_min) * 60.0  # seconds after 00:00 UTC of the day
    stamps = day_start[:, None] + np.round(grid_min).astype("timedelta64[s]")
    times = pd.DatetimeIndex(stamps.ravel()).tz_localize("UTC")
    sp = solar_position_spa(times, latitude_deg, longitude_deg, elevation_m)
    return {
        "zenith_deg": sp["zenith_deg"].reshape(days.size, steps),
        "azimuth_deg": sp["azimuth_deg"].reshape(days.size, steps),
        "step_h": step_min / 60.0,
    }
