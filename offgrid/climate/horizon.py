"""Horizon profile: obstructions (hills, trees, buildings) that hide the sun.

A profile is a short list of ``(azimuth_deg, elevation_deg)`` points, azimuth
clockwise from north (90 = east, 180 = south), elevation of the obstruction
top above the level horizon.  Between points the elevation is interpolated
linearly around the circle; with a single point the horizon is level at that
elevation.  An empty profile is an open horizon.

The beam (direct) part of the plane-of-array insolation is removed while the
sun's apparent elevation is below the profile, evaluated with pvlib's solar
positions (Reda and Andreas 2004) in 5-minute steps over Klein's mean day of
each month.  Diffuse and reflected light are left unchanged: a conservative
simplification only for the beam (common practice, no source).
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence

import numpy as np

from offgrid.numbers import read_number


def parse_horizon(text: str) -> list[tuple[float, float]]:
    """Read a profile typed as ``"90:15, 135:8, 180:5"`` (azimuth:elevation pairs, degrees).

    Commas, semicolons or spaces separate the pairs; ``=`` or ``/`` may replace the colon.
    """
    pairs: list[tuple[float, float]] = []
    cleaned = text.replace(";", " ").replace(",", " ").strip()
    if not cleaned:
        return pairs
    for n, item in enumerate(cleaned.split(), start=1):
        for sep in (":", "=", "/"):
            if sep in item:
                az_text, _, el_text = item.partition(sep)
                break
        else:
            raise ValueError(
                f"horizon point {n} '{item}': write azimuth:elevation in degrees, e.g. 135:10"
            )
        try:
            pairs.append((read_number(az_text), read_number(el_text)))
        except ValueError:
            raise ValueError(
                f"horizon point {n} '{item}': both azimuth and elevation must be numbers"
            ) from None
    return validate_horizon(pairs)


def validate_horizon(points: Iterable[Sequence[float]]) -> list[tuple[float, float]]:
    """Check a profile and return it sorted by azimuth; ValueError names the bad point."""
    out: list[tuple[float, float]] = []
    seen: dict[float, int] = {}
    for n, point in enumerate(points, start=1):
        if len(point) != 2:
            raise ValueError(f"site.horizon_deg point {n}: give [azimuth_deg, elevation_deg]")
        az, el = float(point[0]), float(point[1])
        if not (np.isfinite(az) and np.isfinite(el)):
            raise ValueError(f"site.horizon_deg point {n}: azimuth and elevation must be finite")
        if not 0.0 <= az <= 360.0:
            raise ValueError(
                f"site.horizon_deg point {n}: azimuth {az:g} deg is outside 0-360 "
                "(clockwise from north, 90 = east)"
            )
        if el < 0.0 or el > 90.0:
            raise ValueError(
                f"site.horizon_deg point {n}: elevation {el:g} deg is outside 0-90 "
                "(angle of the obstruction top above the level horizon)"
            )
        az = az % 360.0
        if az in seen:
            raise ValueError(
                f"site.horizon_deg point {n}: azimuth {az:g} deg repeats point {seen[az]}"
            )
        seen[az] = n
        out.append((az, el))
    out.sort()
    return out


def horizon_elevation_deg(points: Sequence[tuple[float, float]], azimuth_deg):
    """Obstruction elevation [deg] at the given azimuths, linear around the circle."""
    az = np.asarray(azimuth_deg, dtype=float) % 360.0
    if not points:
        return np.zeros_like(az)
    xs = np.array([p[0] for p in points])
    ys = np.array([p[1] for p in points])
    if len(xs) == 1:
        return np.full_like(az, ys[0])
    return np.interp(az, xs, ys, period=360.0)


def beam_visible(points: Sequence[tuple[float, float]], zenith_deg, azimuth_deg):
    """1 where the sun is above both the level horizon and the profile, else 0."""
    zen = np.asarray(zenith_deg, dtype=float)
    elevation = 90.0 - zen
    limit = horizon_elevation_deg(points, azimuth_deg)
    return ((elevation > 0.0) & (elevation > limit)).astype(float)


def monthly_beam_factor(
    points,
    latitude_deg: float,
    longitude_deg: float,
    elevation_m: float,
    tilt_deg,
    azimuth_deg,
    sun=None,
):
    """Fraction of the plane's daily beam kept by the horizon on each month's mean day [-].

    factor = sum(max(cos theta, 0) * visible) / sum(max(cos theta, 0)) over the
    day, theta the angle of incidence on the plane.  Vectorised over tilts:
    ``tilt_deg`` of shape (T,) gives (T, 12); a scalar gives (12,).

    ``sun`` may pass precomputed :func:`offgrid.climate.sunpos.mean_day_sun_paths`.
    """
    tilt = np.asarray(tilt_deg, dtype=float)
    scalar = tilt.ndim == 0
    tilt = np.atleast_1d(tilt)
    if not points:
        out = np.ones((tilt.size, 12))
        return out[0] if scalar else out
    if sun is None:
        from offgrid.climate.sunpos import mean_day_sun_paths

        sun = mean_day_sun_paths(latitude_deg, longitude_deg, elevation_m)
    zen = np.radians(sun["zenith_deg"])  # (12, S)
    saz = np.radians(sun["azimuth_deg"])
    up = sun["zenith_deg"] < 90.0
    vis = beam_visible(points, sun["zenith_deg"], sun["azimuth_deg"])
    b = np.radians(tilt)[:, None, None]
    paz = np.radians(np.broadcast_to(np.asarray(azimuth_deg, dtype=float), tilt.shape))
    paz = paz[:, None, None]
    cos_t = np.cos(zen) * np.cos(b) + np.sin(zen) * np.sin(b) * np.cos(saz - paz)
    weight = np.where(up, np.maximum(cos_t, 0.0), 0.0)  # (T, 12, S)
    total = weight.sum(axis=2)
    kept = (weight * vis).sum(axis=2)
    out = np.divide(kept, total, out=np.ones_like(total), where=total > 1e-12)
    return out[0] if scalar else out


def sky_share_blocked(points: Sequence[tuple[float, float]]) -> float:
    """Share of an isotropic sky's diffuse light on a level surface that the profile hides [-].

    For a level surface the part of an isotropic sky below elevation e carries
    sin^2(e) of its diffuse irradiance (integral of cos(zenith) over the band),
    averaged around the horizon; common derivation, no source.
    """
    if not points:
        return 0.0
    az = np.arange(0.0, 360.0, 1.0)
    e = np.radians(np.clip(horizon_elevation_deg(points, az), 0.0, 90.0))
    return float(np.mean(np.sin(e) ** 2))
