"""Monthly plane-of-array insolation for any tilt and azimuth, many tilts at once.

The method is the Liu and Jordan isotropic transposition of monthly means with
Klein's beam ratio Rb and the Erbs et al. monthly diffuse fraction
(:func:`poa_monthly_liu_jordan`, the one implementation of it), vectorised over
candidate tilts (for the tilt search) and split into its beam, sky-diffuse and
ground-reflected parts.  :func:`poa_monthly` adds the site's checks, an optional
horizon profile (:mod:`offgrid.climate.horizon`) and the clearest-sky ceiling.

The ground reflectance may differ by month (snow).  In months of a very low sun
the monthly method can multiply a tiny horizontal value many times over (Klein's
Rb grows without bound as the noon sun nears the horizon, while the Erbs diffuse
fraction knows nothing of the air mass): the result is then held at the
insolation that cloudless days in the clearest plausible air would bring to the
same plane (:func:`offgrid.climate.clearsky.clearest_sky_plane_kwh_m2`).  The
extraterrestrial insolation on the plane would not do: it has no atmosphere, so
at a sun two degrees high it still allows the whole beam, many times what
reaches the ground through 20 air masses.

References
----------
.. [1] Duffie, J. A. and Beckman, W. A., Solar Engineering of Thermal Processes,
   4th ed., Wiley, 2013, sec. 2.19 (eq. 2.19.1) and sec. 1.8 (eq. 1.6.2,
   angle of incidence).
.. [2] Klein, S. A., "Calculation of monthly average insolation on tilted
   surfaces", Solar Energy 19 (1977) 325-329.
.. [3] Erbs, D. G., Klein, S. A. and Duffie, J. A., Solar Energy 28 (1982) 293-302.
.. [4] Liu, B. Y. H. and Jordan, R. C., "Daily insolation on surfaces tilted
   towards the equator", ASHRAE Journal 3(10) (1962) 53-59.
.. [5] Liu, B. Y. H. and Jordan, R. C., "The interrelationship and characteristic
   distribution of direct, diffuse and total solar radiation", Solar Energy 4(3)
   (1960) 1-19.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.memo import memoised

_DAY_STEPS = 721  # hour-angle steps across one day for the numerical Rb


def check_site_angles(latitude_deg: float, tilt_deg=None, azimuth_deg=None) -> None:
    """ValueError naming the field when latitude, tilt or azimuth is out of range."""
    if not np.isfinite(latitude_deg) or abs(latitude_deg) > 90.0:
        raise ValueError(
            f"site.latitude_deg: {latitude_deg} is outside -90 to 90 (degrees, north positive)"
        )
    if tilt_deg is not None:
        t = np.asarray(tilt_deg, dtype=float)
        if not np.all(np.isfinite(t)) or np.any(t < 0) or np.any(t > 90):
            raise ValueError("site.tilt_deg: must lie between 0 (flat) and 90 (vertical) degrees")
    if azimuth_deg is not None:
        a = np.asarray(azimuth_deg, dtype=float)
        if not np.all(np.isfinite(a)) or np.any(a < 0) or np.any(a > 360):
            raise ValueError(
                "site.azimuth_deg: must lie between 0 and 360 degrees "
                "(clockwise from north: 180 faces south, 0 faces north)"
            )


def _sun_terms(latitude_deg: float, azimuth_deg: float):
    """cos(zenith) and the tilt-dependent term of cos(incidence) on Klein's mean days.

    cos(theta) = cos(z) cos(b) + B sin(b), with B from Duffie & Beckman eq. 1.6.2
    (azimuth measured from south there; ours from north).  Shapes (12, steps).
    """
    phi = np.radians(latitude_deg)
    gamma = np.radians(azimuth_deg - 180.0)
    dec = np.radians(sky.declination_cooper69(sky.KLEIN_MEAN_DAY))[:, None]
    w = np.linspace(-np.pi, np.pi, _DAY_STEPS)[None, :]
    cos_z = np.sin(phi) * np.sin(dec) + np.cos(phi) * np.cos(dec) * np.cos(w)
    b_term = (
        -np.sin(dec) * np.cos(phi) * np.cos(gamma)
        + np.cos(dec) * np.sin(phi) * np.cos(gamma) * np.cos(w)
        + np.cos(dec) * np.sin(gamma) * np.sin(w)
    )
    return cos_z, b_term


def beam_ratio_rb_klein(latitude_deg: float, tilt_deg, azimuth_deg: float):
    """Klein's (1977) monthly beam ratio Rb for one or many tilts [-].

    Klein defines Rb on the mean day as the ratio of the day's integrals of
    cos(incidence) (clipped at zero, sun above the horizon) to cos(zenith).  We
    integrate numerically over the hour angle, which handles any azimuth and both
    hemispheres; for an equator-facing plane it equals Klein's closed form
    (Duffie & Beckman eq. 2.19.3).
    ``tilt_deg`` of shape (T,) gives (T, 12); a scalar gives (12,).
    """
    tilt = np.asarray(tilt_deg, dtype=float)
    cos_z, b_term = _sun_terms(latitude_deg, float(azimuth_deg))
    up = cos_z > 0
    den = np.where(up, cos_z, 0.0).sum(axis=1)
    b = np.radians(np.atleast_1d(tilt))[:, None, None]
    cos_t = cos_z[None] * np.cos(b)  # in place from here: the same values, less memory traffic
    cos_t += b_term[None] * np.sin(b)
    np.maximum(cos_t, 0.0, out=cos_t)
    cos_t *= up[None]
    num = cos_t.sum(axis=2)
    rb = np.divide(num, den[None], out=np.zeros_like(num), where=den[None] > 1e-9)
    return rb[0] if tilt.ndim == 0 else rb


_CEILING_NODES_DEG = np.arange(0.0, 90.0 + 1e-9, 5.0)


@functools.lru_cache(maxsize=32)
def _ceiling_table(
    latitude_deg: float, azimuth_deg: float, rho: tuple[float, ...], elevation_m: float
) -> np.ndarray:
    from offgrid.climate.clearsky import CEILING_MODEL_MARGIN, clearest_sky_plane_kwh_m2

    table = clearest_sky_plane_kwh_m2(
        latitude_deg,
        _CEILING_NODES_DEG,
        azimuth_deg,
        np.asarray(rho),
        elevation_m,
        every_other_day=True,
    )
    table = table * (1.0 + CEILING_MODEL_MARGIN)
    table.setflags(write=False)
    return table  # (nodes, 12)


def clearest_sky_ceiling(
    latitude_deg: float, tilt_deg, azimuth_deg: float, albedo=None, elevation_m: float = 0.0
) -> np.ndarray:
    """The plane-of-array ceiling [kWh/m2/day]: cloudless days in the clearest plausible air
    on the plane (:func:`offgrid.climate.clearsky.clearest_sky_plane_kwh_m2`) plus the
    model margin, computed every 5 degrees of tilt once per site and interpolated.
    Shape (12,) for a scalar tilt, (T, 12) for T tilts."""
    rho = tuple(float(x) for x in sky.monthly_albedo(albedo))
    table = _ceiling_table(float(latitude_deg), float(azimuth_deg), rho, float(elevation_m))
    tilt = np.asarray(tilt_deg, dtype=float)
    t = np.atleast_1d(tilt)
    idx = np.clip(
        np.searchsorted(_CEILING_NODES_DEG, t, side="right") - 1, 0, _CEILING_NODES_DEG.size - 2
    )
    frac = ((t - _CEILING_NODES_DEG[idx]) / 5.0)[:, None]
    out = table[idx] * (1.0 - frac) + table[idx + 1] * frac
    return out[0] if tilt.ndim == 0 else out


@dataclass(frozen=True)
class MonthlyPoa:
    """Monthly mean daily insolation on the plane [kWh/m2/day] and its parts.

    Arrays are (12,) for one tilt or (T, 12) for T tilts.
    """

    poa_kwh_m2_day: np.ndarray
    beam_kwh_m2_day: np.ndarray
    diffuse_kwh_m2_day: np.ndarray
    reflected_kwh_m2_day: np.ndarray
    beam_lost_kwh_m2_day: np.ndarray  # beam removed by the horizon profile
    rb: np.ndarray
    horizon_factor: np.ndarray
    kt: np.ndarray  # (12,)
    diffuse_fraction: np.ndarray  # (12,)
    #: the clearest-sky ceiling of each month (inf where it cannot bind), where it bound,
    #: the plane's insolation before the cap, and the ground reflectance of each month
    ceiling_kwh_m2_day: np.ndarray | None = None
    capped: np.ndarray | None = None
    uncapped_kwh_m2_day: np.ndarray | None = None
    albedo: np.ndarray | None = None


def sky_diffuse_isotropic(tilt_deg, dhi):
    """Sky diffuse on a tilted plane under an isotropic sky [4]_ [5]_: DHI (1 + cos b) / 2.

    Parameters
    ----------
    tilt_deg : float or array
        Plane tilt b from horizontal [deg].
    dhi : float or array
        Diffuse horizontal irradiance [W/m2] or insolation [kWh/m2/day]; broadcast
        against ``tilt_deg``.

    Returns
    -------
    numpy.ndarray
        Sky diffuse on the plane, in the unit of ``dhi``.  Same as
        ``pvlib.irradiance.isotropic``.
    """
    return dhi * (1 + np.cos(np.radians(tilt_deg))) / 2


def ground_reflected_isotropic(tilt_deg, ghi, albedo):
    """Ground-reflected light on a tilted plane, isotropic ground [1]_: GHI rho (1 - cos b) / 2.

    Parameters
    ----------
    tilt_deg : float or array
        Plane tilt b from horizontal [deg].
    ghi : float or array
        Global horizontal irradiance [W/m2] or insolation [kWh/m2/day].
    albedo : float or array
        Ground reflectance rho [-]; broadcast against ``ghi`` and ``tilt_deg``.

    Returns
    -------
    numpy.ndarray
        Reflected light on the plane, in the unit of ``ghi``.  Same as
        ``pvlib.irradiance.get_ground_diffuse``.
    """
    return ghi * albedo * (1 - np.cos(np.radians(tilt_deg))) / 2


def poa_monthly_liu_jordan(
    insolation_kwh_m2_day,
    latitude_deg: float,
    tilt_deg,
    azimuth_deg: float,
    albedo=sky.DEFAULT_ALBEDO,
) -> dict:
    """Liu and Jordan isotropic transposition of monthly means [1]_ [2]_ [3]_ [4]_.

    HT = H (1 - Hd/H) Rb + Hd (1 + cos b) / 2 + H rho (1 - cos b) / 2

    with Klein's (1977) monthly beam ratio Rb on the mean days and the Erbs et
    al. (1982) monthly diffuse fraction Hd/H from the clearness index; no
    horizon profile and no ceiling (see :func:`poa_monthly`).  Inputs are not
    checked here.

    Parameters
    ----------
    insolation_kwh_m2_day : array of 12
        Monthly mean daily global horizontal insolation H [kWh/m2/day].
    latitude_deg : float
        Site latitude [deg], north positive.
    tilt_deg : float or array of T
        Plane tilt b from horizontal [deg].
    azimuth_deg : float
        Direction the plane faces [deg], clockwise from north (180 = south).
    albedo : float or 12 floats, optional
        Ground reflectance rho [-], one value or twelve January first; None: 0.2.

    Returns
    -------
    dict
        ``poa``, ``beam``, ``diffuse``, ``reflected``: insolation on the plane and
        its three parts [kWh/m2/day]; ``rb`` [-]; these are (12,) for a scalar
        tilt and (T, 12) for T tilts.  ``kt`` (clearness index) and
        ``diffuse_fraction`` [-] are (12,).
    """
    h = np.asarray(insolation_kwh_m2_day, dtype=float)
    rho = sky.monthly_albedo(albedo)
    ws = sky.sunset_hour_angle(latitude_deg, sky.declination_cooper69(sky.KLEIN_MEAN_DAY))
    kt = sky.clearness_index(h, latitude_deg)
    fd = sky.erbs_monthly_diffuse_fraction(kt, ws)
    rb = beam_ratio_rb_klein(latitude_deg, tilt_deg, azimuth_deg)
    tilt = np.asarray(tilt_deg, dtype=float)
    t = tilt[..., None] if tilt.ndim else tilt  # (T, 1) against the months
    beam = h * (1 - fd) * rb
    diffuse = sky_diffuse_isotropic(t, h * fd) + 0 * rb
    reflected = ground_reflected_isotropic(t, h, rho) + 0 * rb
    return {
        "poa": beam + diffuse + reflected,
        "beam": beam,
        "diffuse": diffuse,
        "reflected": reflected,
        "rb": rb,
        "kt": kt,
        "diffuse_fraction": fd,
    }


@memoised
def poa_monthly(
    insolation_kwh_m2_day,
    latitude_deg: float,
    tilt_deg,
    azimuth_deg: float,
    albedo=sky.DEFAULT_ALBEDO,
    horizon=None,
    longitude_deg: float = 0.0,
    elevation_m: float = 0.0,
    sun=None,
    cap: bool = True,
) -> MonthlyPoa:
    """Monthly plane-of-array insolation, Liu-Jordan with Klein's Rb [1]_ [2]_ [3]_.

    HT = Hb Rb f_h + Hd (1 + cos b)/2 + H rho (1 - cos b)/2, where Hd = H x
    (Erbs monthly diffuse fraction), Hb = H - Hd and f_h the share of the
    plane's beam that the horizon profile leaves (1 without a profile).
    With ``cap``, HT is held at the clearest-sky insolation on the same plane
    (module docstring); the three parts are scaled alike.

    Parameters
    ----------
    insolation_kwh_m2_day : array of 12
        Monthly mean daily global horizontal insolation [kWh/m2/day].
    latitude_deg : float
        Site latitude [deg], north positive.
    tilt_deg : float or array of T
        Plane tilt from horizontal [deg].
    azimuth_deg : float
        Direction the plane faces [deg], clockwise from north.
    albedo : float or 12 floats, optional
        Ground reflectance [-], one value or twelve January first (snow months);
        None: 0.2.
    horizon : list of (azimuth_deg, elevation_deg), optional
        Horizon profile; needs ``longitude_deg`` and ``elevation_m`` for the sun positions.
    sun : dict, optional
        Precomputed :func:`offgrid.climate.sunpos.mean_day_sun_paths` (saves time).
    """
    h = np.asarray(insolation_kwh_m2_day, dtype=float)
    if h.shape != (12,):
        raise ValueError("climate.insolation_kwh_m2_day: needs exactly 12 monthly values")
    if not np.all(np.isfinite(h)) or np.any(h < 0):
        raise ValueError("climate.insolation_kwh_m2_day: values must be finite and not negative")
    check_site_angles(latitude_deg, tilt_deg, azimuth_deg)
    lj = poa_monthly_liu_jordan(h, latitude_deg, tilt_deg, azimuth_deg, albedo)
    rho = sky.monthly_albedo(albedo)
    rb, kt, fd = lj["rb"], lj["kt"], lj["diffuse_fraction"]
    if horizon:
        from offgrid.climate.horizon import monthly_beam_factor

        factor = monthly_beam_factor(
            horizon, latitude_deg, longitude_deg, elevation_m, tilt_deg, azimuth_deg, sun=sun
        )
    else:
        factor = np.ones_like(rb)
    beam_open = lj["beam"]
    beam = beam_open * factor
    diffuse, reflected = lj["diffuse"], lj["reflected"]
    total = beam + diffuse + reflected
    lost = beam_open - beam
    ceiling = np.full_like(total, np.inf)
    if cap:
        ceiling = clearest_sky_ceiling(latitude_deg, tilt_deg, azimuth_deg, rho, elevation_m)
    capped = total > ceiling
    scale = np.divide(ceiling, total, out=np.ones_like(total), where=capped)
    return MonthlyPoa(
        poa_kwh_m2_day=total * scale,
        beam_kwh_m2_day=beam * scale,
        diffuse_kwh_m2_day=diffuse * scale,
        reflected_kwh_m2_day=reflected * scale,
        beam_lost_kwh_m2_day=lost * scale,
        rb=rb,
        horizon_factor=factor,
        kt=kt,
        diffuse_fraction=fd,
        ceiling_kwh_m2_day=ceiling,
        capped=capped,
        uncapped_kwh_m2_day=total,
        albedo=rho,
    )
