"""Clear-sky and extraterrestrial monthly insolation, for checking typed values.

References
----------
.. [1] Ineichen, P. and Perez, R., "A new airmass independent formulation for
   the Linke turbidity coefficient", Solar Energy 73 (2002) 151-157.
.. [2] Remund, J. et al., "Worldwide Linke turbidity information", ISES Solar
   World Congress 2003 (the monthly table shipped with pvlib).
.. [3] Duffie, J. A. and Beckman, W. A., Solar Engineering of Thermal Processes,
   4th ed., 2013, eq. 1.10.3.
"""

from __future__ import annotations

import numpy as np

from offgrid.climate import sky

_MONTH_START = np.concatenate([[0], np.cumsum(sky.DAYS_IN_MONTH)])  # day-of-year offsets
#: Three sample days per month (the 5th, 15th and 25th), day of year.
SAMPLE_DAYS = (_MONTH_START[:12, None] + np.array([5, 15, 25])[None, :]).ravel()


def extraterrestrial_monthly_mean_kwh_m2(latitude_deg: float) -> np.ndarray:
    """Mean over every day of each month of the daily extraterrestrial insolation [kWh/m2/day].

    Duffie & Beckman eq. 1.10.3 [3]_ day by day; unlike the single mean day it
    stays right in the months around polar night.
    """
    days = np.arange(1, 366)
    h0 = sky.extraterrestrial_daily_kwh_m2(latitude_deg, days)
    month = np.repeat(np.arange(12), sky.DAYS_IN_MONTH)
    return np.bincount(month, weights=h0, minlength=12) / sky.DAYS_IN_MONTH


def clear_sky_daily_ineichen(latitude_deg: float, longitude_deg: float, elevation_m: float = 0.0,
                             step_min: float = 10.0) -> np.ndarray:
    """Clear-sky global horizontal insolation, monthly mean of daily totals [kWh/m2/day].

    Ineichen-Perez model [1]_ with the monthly Linke turbidity from pvlib's
    shipped climatology [2]_ (offline), sun positions from pvlib's SPA,
    pressure from the elevation; integrated in ``step_min`` steps over the
    5th, 15th and 25th of each month and averaged.
    """
    import pandas as pd
    from pvlib import atmosphere, clearsky  # late import: pvlib is slow to import

    from offgrid.climate.sunpos import REFERENCE_YEAR, mean_day_sun_paths

    sun = mean_day_sun_paths(latitude_deg, longitude_deg, elevation_m, step_min=step_min,
                             days_of_year=SAMPLE_DAYS)
    zen = sun["zenith_deg"]
    steps = zen.shape[1]
    noon = pd.Timestamp(f"{REFERENCE_YEAR}-01-01 12:00", tz="UTC")
    days = pd.DatetimeIndex([noon + pd.Timedelta(days=int(d) - 1) for d in SAMPLE_DAYS])
    linke = clearsky.lookup_linke_turbidity(days, latitude_deg, longitude_deg).to_numpy()
    am_rel = atmosphere.get_relative_airmass(np.where(zen < 90, zen, np.nan))
    am_abs = atmosphere.get_absolute_airmass(am_rel, atmosphere.alt2pres(elevation_m))
    with np.errstate(divide="ignore", invalid="ignore"):  # night rows: NaN airmass, set to 0
        cs = clearsky.ineichen(zen.ravel(), np.asarray(am_abs).ravel(),
                               np.repeat(linke, steps), altitude=elevation_m)
    ghi = np.nan_to_num(np.asarray(cs["ghi"], dtype=float).reshape(zen.shape), nan=0.0)
    ghi = np.where(zen < 90, np.maximum(ghi, 0.0), 0.0)
    daily = ghi.sum(axis=1) * sun["step_h"] / 1000.0
    return daily.reshape(12, 3).mean(axis=1)
