"""Clear-sky and extraterrestrial monthly insolation, for checking typed values.

References
----------
.. [1] Ineichen, P. and Perez, R., "A new airmass independent formulation for
   the Linke turbidity coefficient", Solar Energy 73 (2002) 151-157.
.. [2] Remund, J. et al., "Worldwide Linke turbidity information", ISES Solar
   World Congress 2003 (the monthly table shipped with pvlib).
.. [3] Duffie, J. A. and Beckman, W. A., Solar Engineering of Thermal Processes,
   4th ed., 2013, eq. 1.10.3.
.. [4] Ineichen, P., "Conversion function between the Linke turbidity and the
   atmospheric water vapor and aerosol content", Solar Energy 82 (2008) 1095-1097
   (fitted for aerosol optical depth 0-0.6 at 550 nm, water vapour 0.2-10 cm,
   0-7000 m).
.. [5] Kasten, F. and Young, A. T., "Revised optical air mass tables and
   approximation formula", Applied Optics 28 (1989) 4735-4738.
.. [6] CIE S 017 / IEC 60050-845 (845-09-87), total turbidity factor (Linke):
   the optical thickness of the real atmosphere over that of the clean dry
   (Rayleigh) atmosphere, so never below 1.

The clearest plausible sky
--------------------------
A month's mean cannot exceed what cloudless days in the cleanest air the site
can have would give.  The climatological Linke turbidity (Remund's table) is a
monthly *mean*: a month's clear days can be much clearer, so a ceiling built on
it flags ordinary values (a Sahel January of 5.6 kWh/m2/day against 5.09).  The
ceiling here uses Ineichen's (2008) conversion [4]_ at the edge of its fitted
range: no aerosol and 0.2 cm of precipitable water (very dry polar air), at the
site's pressure.  That is a Linke turbidity of about 1.6 at sea level, above the
pure dry atmosphere's 1 [6]_.  It is used for the plausibility check of typed
values and to cap the plane-of-array insolation of months with a very low sun.
"""

from __future__ import annotations

import functools

import numpy as np

from offgrid.climate import sky
from offgrid.climate.poa import ground_reflected_isotropic, sky_diffuse_isotropic

_MONTH_START = np.concatenate([[0], np.cumsum(sky.DAYS_IN_MONTH)])  # day-of-year offsets
#: Three sample days per month (the 5th, 15th and 25th), day of year.
SAMPLE_DAYS = (_MONTH_START[:12, None] + np.array([5, 15, 25])[None, :]).ravel()


#: The ceiling's own accuracy: within 1 % of pvlib's SPA-based Ineichen sky at mid
#: latitudes, 4-7 % low near polar night (tests/test_climate_poa.py); our choice.
CEILING_MODEL_MARGIN = 0.05
#: Clearest plausible atmosphere for the ceiling [4]_: no aerosol, 0.2 cm of water vapour.
CLEAREST_AOD550 = 0.0
CLEAREST_WATER_CM = 0.2
_CEILING_STEPS = 48  # equal hour-angle steps from sunrise to sunset of each day
_DAYS = np.arange(1, 366)
_MONTH_OF_DAY = np.repeat(np.arange(12), sky.DAYS_IN_MONTH)


def pressure_ratio(elevation_m) -> np.ndarray:
    """Site pressure over sea-level pressure, p/p0 = exp(-h / 8434.5) as in Ineichen (2008) [4]_."""
    return np.exp(-np.asarray(elevation_m, dtype=float) / 8434.5)


def linke_turbidity_ineichen2008(aod550, water_cm, elevation_m=0.0):
    """Linke turbidity from aerosol optical depth and water vapour, Ineichen (2008) [4]_.

    TL = 3.91 exp(0.689 p0/p) aod + 0.376 ln w + (2 + 0.54 p0/p - 0.5 (p0/p)^2 + 0.16 (p0/p)^3)
    with w the precipitable water [cm] and p0/p = exp(h / 8434.5).
    """
    pc = 1.0 / pressure_ratio(elevation_m)
    return (
        3.91 * np.exp(0.689 * pc) * np.asarray(aod550, dtype=float)
        + 0.376 * np.log(np.asarray(water_cm, dtype=float))
        + (2.0 + 0.54 * pc - 0.5 * pc**2 + 0.16 * pc**3)
    )


def clearest_linke_turbidity(elevation_m=0.0) -> float:
    """The clearest plausible Linke turbidity at the site [-] (about 1.6 at sea level), never
    below the clean dry atmosphere's 1 [6]_."""
    tl = linke_turbidity_ineichen2008(CLEAREST_AOD550, CLEAREST_WATER_CM, elevation_m)
    return float(max(tl, 1.0))


def pressure_standard_atmosphere_pa(elevation_m) -> np.ndarray:
    """Air pressure [Pa] of the standard atmosphere at ``elevation_m`` (the formula of
    ``pvlib.atmosphere.alt2pres``: 100 ((44331.514 - h) / 11880.516) ^ (1 / 0.1902632))."""
    h = np.asarray(elevation_m, dtype=float)
    return 100.0 * ((44331.514 - h) / 11880.516) ** (1.0 / 0.1902632)


def airmass_kasten_young(zenith_deg):
    """Relative optical air mass, Kasten & Young (1989) [5]_; finite at the horizon."""
    z = np.asarray(zenith_deg, dtype=float)
    z = np.minimum(z, 90.0)
    return 1.0 / (np.cos(np.radians(z)) + 0.50572 * (96.07995 - z) ** -1.6364)


def ineichen_perez(
    cos_zenith, airmass_absolute, linke, elevation_m=0.0, dni_extra_w_m2=sky.SOLAR_CONSTANT_W_M2
):
    """Clear-sky GHI, DNI, DHI [W/m2], Ineichen & Perez (2002) [1]_ (numpy).

    The same formulas as ``pvlib.clearsky.ineichen`` without the Perez
    enhancement (tests check one against the other).  Night points give 0.
    """
    cz = np.asarray(cos_zenith, dtype=float)
    am = np.asarray(airmass_absolute, dtype=float)
    tl = np.asarray(linke, dtype=float)
    h = float(elevation_m)
    fh1, fh2 = np.exp(-h / 8000.0), np.exp(-h / 1250.0)
    cg1, cg2 = 5.09e-5 * h + 0.868, 3.92e-5 * h + 0.0387
    up = cz > 0
    czp = np.where(up, cz, 1.0)
    ghi = cg1 * dni_extra_w_m2 * czp * np.exp(-cg2 * am * (fh1 + fh2 * (tl - 1.0)))
    bnci = (0.664 + 0.163 / fh1) * np.exp(-0.09 * am * (tl - 1.0)) * dni_extra_w_m2
    bnci_2 = ghi * np.clip((1 - (0.1 - 0.2 * np.exp(-tl)) / (0.1 + 0.882 / fh1)) / czp, 0, 1e20)
    dni = np.minimum(bnci, bnci_2)
    dhi = ghi - dni * czp
    zero = np.zeros_like(ghi)
    return np.where(up, ghi, zero), np.where(up, dni, zero), np.where(up, dhi, zero)


def clearest_sky_days(
    latitude_deg: float, elevation_m: float = 0.0, days=None, steps: int = _CEILING_STEPS
) -> dict:
    """Cloudless days in the clearest plausible air, numpy only.

    Sun geometry of each day (Spencer declination, hour angle at the midpoints of
    equal steps from sunrise to sunset, refraction included) and the
    Ineichen-Perez irradiances at the clearest plausible turbidity.  Arrays
    (days, steps); ``step_h`` (days,).
    ``days``: day-of-year numbers (default every day of a 365-day year).  Cached
    per site.
    """
    year = _clearest_year(float(latitude_deg), float(elevation_m), int(steps))
    if days is None:
        return year
    pick = np.asarray(days, dtype=int) - 1
    return {k: (v[pick] if isinstance(v, np.ndarray) else v) for k, v in year.items()}


def declination_spencer71(day_of_year):
    """Solar declination [deg], Spencer (1971), Duffie & Beckman 4th ed. eq. 1.6.1b
    (within about 0.035 deg; Cooper's eq. 1.6.1a can be off by a degree, which matters when
    the noon sun is a degree or two above the horizon)."""
    b = np.radians((np.asarray(day_of_year, dtype=float) - 1.0) * 360.0 / 365.0)
    return np.degrees(
        0.006918
        - 0.399912 * np.cos(b)
        + 0.070257 * np.sin(b)
        - 0.006758 * np.cos(2 * b)
        + 0.000907 * np.sin(2 * b)
        - 0.002697 * np.cos(3 * b)
        + 0.00148 * np.sin(3 * b)
    )


def refraction_saemundsson_deg(elevation_deg):
    """Atmospheric refraction [deg] at true elevation h [deg]: 1.02 / tan(h + 10.3 / (h + 5.11))
    arcminutes (Saemundsson 1986, standard pressure and 10 C, from memory); 0 below -1 deg."""
    e = np.asarray(elevation_deg, dtype=float)
    safe = np.maximum(e, -1.0)
    r = 1.02 / np.tan(np.radians(safe + 10.3 / (safe + 5.11))) / 60.0
    return np.where(e > -1.0, r, 0.0)


@functools.lru_cache(maxsize=16)
def _clearest_year(latitude_deg: float, elevation_m: float, steps: int) -> dict:
    n = _DAYS.astype(float)
    phi = np.radians(latitude_deg)
    dec = np.radians(declination_spencer71(n))[:, None]
    # the day runs while the sun's upper edge is above the horizon, refraction included
    # (true centre at -0.833 deg, the usual almanac sunrise)
    x = (np.sin(np.radians(-0.833)) - np.sin(phi) * np.sin(dec[:, 0])) / np.maximum(
        np.cos(phi) * np.cos(dec[:, 0]), 1e-12
    )
    ws = np.arccos(np.clip(x, -1.0, 1.0))[:, None]
    w = ws * (2.0 * (np.arange(steps) + 0.5)[None, :] / steps - 1.0)
    cos_true = np.sin(phi) * np.sin(dec) + np.cos(phi) * np.cos(dec) * np.cos(w)
    elev_true = np.degrees(np.arcsin(np.clip(cos_true, -1.0, 1.0)))
    elev_app = elev_true + refraction_saemundsson_deg(elev_true)
    cos_z = np.sin(np.radians(elev_app))  # apparent sun: what the beam and air mass see
    sin_true = np.sqrt(np.maximum(1.0 - cos_true**2, 0.0))
    sin_ratio = np.divide(
        np.cos(np.radians(elev_app)), sin_true, out=np.ones_like(sin_true), where=sin_true > 1e-9
    )
    am = (
        airmass_kasten_young(90.0 - elev_app)
        * pressure_standard_atmosphere_pa(elevation_m)
        / 101325.0
    )
    b = np.radians((n - 1.0) * 360.0 / 365.0)
    e0 = (
        1.000110
        + 0.034221 * np.cos(b)
        + 0.001280 * np.sin(b)
        + 0.000719 * np.cos(2 * b)
        + 0.000077 * np.sin(2 * b)
    )  # Spencer (1971), Duffie & Beckman eq. 1.4.1b
    i0 = sky.SOLAR_CONSTANT_W_M2 * e0[:, None]
    ghi, dni, dhi = ineichen_perez(
        cos_z, am, clearest_linke_turbidity(elevation_m), elevation_m, i0
    )
    out = {
        "days": n.astype(int),
        "declination_rad": dec,
        "hour_angle_rad": w,
        "cos_zenith": cos_z,
        "sin_zenith_ratio": sin_ratio,
        "ghi": ghi,
        "dni": dni,
        "dhi": dhi,
        "step_h": 2.0 * np.degrees(ws[:, 0]) / 15.0 / steps,
        "linke": clearest_linke_turbidity(elevation_m),
    }
    for value in out.values():
        if isinstance(value, np.ndarray):
            value.setflags(write=False)  # shared by the cache
    return out


def _monthly_mean(daily: np.ndarray, days: np.ndarray) -> np.ndarray:
    """Mean over the given days of each month (last axis: days) [same unit]."""
    month = _MONTH_OF_DAY[np.asarray(days) - 1]
    count = np.bincount(month, minlength=12).astype(float)
    flat = daily.reshape(-1, daily.shape[-1])
    sums = np.stack([np.bincount(month, weights=row, minlength=12) for row in flat])
    out = np.divide(sums, count, out=np.zeros_like(sums), where=count > 0)
    return out.reshape((*daily.shape[:-1], 12))


def clearest_sky_horizontal_kwh_m2(latitude_deg: float, elevation_m: float = 0.0) -> np.ndarray:
    """Monthly mean of daily global horizontal insolation on cloudless days in the clearest
    plausible air [kWh/m2/day], every day of the month (numpy only, a few ms)."""
    s = clearest_sky_days(latitude_deg, elevation_m)
    daily = s["ghi"].sum(axis=1) * s["step_h"] / 1000.0
    return _monthly_mean(daily, s["days"])


def clearest_sky_any_plane_bound_kwh_m2(
    latitude_deg: float, elevation_m: float = 0.0
) -> np.ndarray:
    """A bound of :func:`clearest_sky_plane_kwh_m2` for every tilt, azimuth and albedo
    [kWh/m2/day]: beam normal + sky diffuse + global (cos incidence, the view factors and
    the reflectance all at most 1).  Cheap; months below it need no exact ceiling."""
    s = clearest_sky_days(latitude_deg, elevation_m)
    daily = (s["dni"] + s["dhi"] + s["ghi"]).sum(axis=1) * s["step_h"] / 1000.0
    return _monthly_mean(daily, s["days"])


def clearest_sky_plane_kwh_m2(
    latitude_deg: float,
    tilt_deg,
    azimuth_deg: float,
    albedo,
    elevation_m: float = 0.0,
    months=None,
    every_other_day: bool = False,
) -> np.ndarray:
    """Monthly mean daily insolation on a tilted plane under the clearest plausible sky
    [kWh/m2/day]: beam DNI cos(incidence), isotropic sky diffuse DHI (1 + cos b)/2 and
    ground-reflected GHI rho (1 - cos b)/2, summed over every day of the month.

    ``tilt_deg`` scalar gives (12,), shape (T,) gives (T, 12).  ``months``: a
    boolean mask of the months to compute (others are +inf), to save time.
    An upper bound for any month's mean on that plane: no month is clearer than
    all of its days cloudless in the cleanest air.  ``every_other_day`` halves
    the work (the monthly means change by well under 1 %).
    """
    rho = sky.monthly_albedo(albedo)
    mask = np.ones(12, bool) if months is None else np.asarray(months, bool)
    tilt = np.asarray(tilt_deg, dtype=float)
    out = np.full((*tilt.shape, 12), np.inf)
    if not mask.any():
        return out
    days = _DAYS[mask[_MONTH_OF_DAY] & ((_DAYS % 2 == 1) | (not every_other_day))]
    s = clearest_sky_days(latitude_deg, elevation_m, days)
    phi = np.radians(latitude_deg)
    gamma = np.radians(float(azimuth_deg) - 180.0)  # D&B: 0 = south, west positive
    dec, w = s["declination_rad"], s["hour_angle_rad"]
    b_term = (
        -np.sin(dec) * np.cos(phi) * np.cos(gamma)
        + np.cos(dec) * np.sin(phi) * np.cos(gamma) * np.cos(w)
        + np.cos(dec) * np.sin(gamma) * np.sin(w)
    )  # D&B eq. 1.6.2: cos t = cz cb + B sb
    b_term = b_term * s["sin_zenith_ratio"]  # the refracted sun's horizontal component
    b = np.radians(np.atleast_1d(tilt))[:, None, None]
    cos_t = np.maximum(s["cos_zenith"][None] * np.cos(b) + b_term[None] * np.sin(b), 0.0)
    month = _MONTH_OF_DAY[days - 1]
    rho_day = rho[month][None, :, None]
    t = np.atleast_1d(tilt)[:, None, None]
    g = (
        s["dni"][None] * cos_t
        + sky_diffuse_isotropic(t, s["dhi"][None])
        + ground_reflected_isotropic(t, s["ghi"][None], rho_day)
    )
    daily = g.sum(axis=2) * s["step_h"][None] / 1000.0  # (T, days)
    means = _monthly_mean(daily, days)
    res = np.where(mask[None], means, np.inf)
    return res[0] if tilt.ndim == 0 else res


def extraterrestrial_monthly_mean_kwh_m2(latitude_deg: float) -> np.ndarray:
    """Mean over every day of each month of the daily extraterrestrial insolation [kWh/m2/day].

    Duffie & Beckman eq. 1.10.3 [3]_ day by day; unlike the single mean day it
    stays right in the months around polar night.
    """
    days = np.arange(1, 366)
    h0 = sky.extraterrestrial_daily_kwh_m2(latitude_deg, days)
    month = np.repeat(np.arange(12), sky.DAYS_IN_MONTH)
    return np.bincount(month, weights=h0, minlength=12) / sky.DAYS_IN_MONTH


def clear_sky_daily_ineichen(
    latitude_deg: float, longitude_deg: float, elevation_m: float = 0.0, step_min: float = 10.0
) -> np.ndarray:
    """Clear-sky global horizontal insolation, monthly mean of daily totals [kWh/m2/day].

    Ineichen-Perez model [1]_ with the monthly Linke turbidity from pvlib's
    shipped climatology [2]_ (offline), sun positions from pvlib's SPA,
    pressure from the elevation; integrated in ``step_min`` steps over the
    5th, 15th and 25th of each month and averaged.
    """
    import pandas as pd
    from pvlib import atmosphere, clearsky  # late import: pvlib is slow to import

    from offgrid.climate.sunpos import REFERENCE_YEAR, mean_day_sun_paths

    sun = mean_day_sun_paths(
        latitude_deg, longitude_deg, elevation_m, step_min=step_min, days_of_year=SAMPLE_DAYS
    )
    zen = sun["zenith_deg"]
    steps = zen.shape[1]
    noon = pd.Timestamp(f"{REFERENCE_YEAR}-01-01 12:00", tz="UTC")
    days = pd.DatetimeIndex([noon + pd.Timedelta(days=int(d) - 1) for d in SAMPLE_DAYS])
    linke = clearsky.lookup_linke_turbidity(days, latitude_deg, longitude_deg).to_numpy()
    am_rel = atmosphere.get_relative_airmass(np.where(zen < 90, zen, np.nan))
    am_abs = atmosphere.get_absolute_airmass(am_rel, atmosphere.alt2pres(elevation_m))
    with np.errstate(divide="ignore", invalid="ignore"):  # night rows: NaN airmass, set to 0
        cs = clearsky.ineichen(
            zen.ravel(), np.asarray(am_abs).ravel(), np.repeat(linke, steps), altitude=elevation_m
        )
    ghi = np.nan_to_num(np.asarray(cs["ghi"], dtype=float).reshape(zen.shape), nan=0.0)
    ghi = np.where(zen < 90, np.maximum(ghi, 0.0), 0.0)
    daily = ghi.sum(axis=1) * sun["step_h"] / 1000.0
    return daily.reshape(12, 3).mean(axis=1)
