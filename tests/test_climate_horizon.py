"""Horizon profiles: parsing, validation, and the beam they remove."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from offgrid.climate.files import load_climate
from offgrid.climate.horizon import (
    beam_visible,
    horizon_elevation_deg,
    monthly_beam_factor,
    parse_horizon,
    validate_horizon,
)
from offgrid.climate.poa import poa_monthly
from offgrid.climate.sunpos import mean_day_sun_paths
from offgrid.climate.tilt import best_tilt

GREENSBORO = load_climate("greensboro-nc-tmy3")  # NREL TMY3 sample, pvlib data folder
H = GREENSBORO.insolation_kwh_m2_day
LAT, LON, ELEV = 36.1, -79.95, 273.0


def test_parse_and_sort():
    assert parse_horizon("180:10, 90:20; 270/5 0=2") == [
        (0.0, 2.0),
        (90.0, 20.0),
        (180.0, 10.0),
        (270.0, 5.0),
    ]
    assert parse_horizon("  ") == []


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("90:95", r"point 1: elevation 95 deg is outside 0-90"),
        ("90:10 180:-3", r"point 2: elevation -3 deg is outside 0-90"),
        ("400:10", r"point 1: azimuth 400 deg is outside 0-360"),
        ("90:10 90:12", r"point 2: azimuth 90 deg repeats point 1"),
        ("0:5 360:6", r"repeats point 1"),
        ("90-10", r"point 1 '90-10': write azimuth:elevation"),
        ("90:x", r"point 1 '90:x': both azimuth and elevation must be numbers"),
    ],
)
def test_bad_profiles_name_the_point(text, message):
    with pytest.raises(ValueError, match=message):
        parse_horizon(text)


def test_validate_rejects_wrong_shape():
    with pytest.raises(ValueError, match=r"site\.horizon_deg point 1"):
        validate_horizon([(90.0,)])


def test_interpolation_wraps_around_north():
    pts = [(10.0, 10.0), (350.0, 20.0)]
    # halfway between 350 and 10 (through north) is 0: the mean of 20 and 10
    assert horizon_elevation_deg(pts, 0.0) == pytest.approx(15.0)
    assert horizon_elevation_deg(pts, 180.0) == pytest.approx(15.0)
    assert horizon_elevation_deg([(90.0, 7.0)], [0.0, 200.0]).tolist() == [7.0, 7.0]


def test_open_horizon_changes_nothing():
    open_ = poa_monthly(H, LAT, 30.0, 180.0)
    flat = poa_monthly(H, LAT, 30.0, 180.0, horizon=[], longitude_deg=LON, elevation_m=ELEV)
    np.testing.assert_allclose(open_.poa_kwh_m2_day, flat.poa_kwh_m2_day)


def test_wall_all_round_leaves_diffuse_and_reflected_only():
    wall = [(0.0, 90.0)]
    res = poa_monthly(H, LAT, 30.0, 180.0, horizon=wall, longitude_deg=LON, elevation_m=ELEV)
    np.testing.assert_allclose(res.beam_kwh_m2_day, 0.0, atol=1e-12)
    np.testing.assert_allclose(
        res.poa_kwh_m2_day, res.diffuse_kwh_m2_day + res.reflected_kwh_m2_day
    )


def test_horizon_factor_against_an_hourly_count_with_pvlib():
    # Independent check: pvlib's get_solarposition at 1-minute steps on the 17 January
    # mean day (Klein 1977), counting the beam on the plane only while the sun is above a
    # 20-degree hill spanning the south-east (120-180 deg).
    from pvlib import solarposition

    pts = [(119.0, 0.0), (120.0, 20.0), (180.0, 20.0), (181.0, 0.0)]
    times = pd.date_range("2023-01-17 00:00", periods=1440, freq="1min", tz="UTC") + pd.Timedelta(
        minutes=-LON * 4
    )
    sp = solarposition.get_solarposition(times, LAT, LON, altitude=ELEV)
    zen, az = np.radians(sp["apparent_zenith"]), np.radians(sp["azimuth"])
    b, paz = np.radians(30.0), np.radians(180.0)
    cos_t = np.cos(zen) * np.cos(b) + np.sin(zen) * np.sin(b) * np.cos(az - paz)
    w = np.where(sp["apparent_zenith"] < 90, np.maximum(cos_t, 0), 0)
    vis = beam_visible(pts, sp["apparent_zenith"].to_numpy(), sp["azimuth"].to_numpy())
    expected = (w * vis).sum() / w.sum()
    factor = monthly_beam_factor(pts, LAT, LON, ELEV, 30.0, 180.0)
    assert factor[0] == pytest.approx(expected, abs=0.01)
    assert 0.3 < factor[0] < 0.9  # the hill hides the morning but not the afternoon


def test_east_hill_hurts_an_east_facing_plane_more():
    east_hill = [(60.0, 0.0), (70.0, 25.0), (130.0, 25.0), (140.0, 0.0)]
    sun = mean_day_sun_paths(LAT, LON, ELEV)
    f_east = monthly_beam_factor(east_hill, LAT, LON, ELEV, 30.0, 100.0, sun=sun)
    f_west = monthly_beam_factor(east_hill, LAT, LON, ELEV, 30.0, 260.0, sun=sun)
    assert np.all(f_east < f_west)


def test_low_winter_sun_behind_a_southern_ridge_moves_the_best_tilt():
    # A 25-degree ridge to the south hides the December noon sun at 36 N (noon elevation
    # about 90 - 36.1 - 23.4 = 30.5 deg, barely above it) for much of the day: the
    # worst-month tilt drops because diffuse light then matters more.
    ridge = [(120.0, 0.0), (130.0, 25.0), (230.0, 25.0), (240.0, 0.0)]
    open_ = best_tilt(H, LAT, 180.0)
    shaded = best_tilt(H, LAT, 180.0, horizon=ridge, longitude_deg=LON, elevation_m=ELEV)
    assert shaded.worst_month_poa_kwh_m2_day < open_.worst_month_poa_kwh_m2_day
    assert shaded.tilt_deg < open_.tilt_deg


def test_sky_share_hidden_by_a_horizon_and_its_warning():
    # common derivation, no source: a level surface sees sin^2(e) of an isotropic sky's
    # diffuse light below elevation e (integral of cos(zenith) over that band).
    import math

    from offgrid.climate.horizon import sky_share_blocked
    from offgrid.design.sizing import design
    from tests.conftest import hand_project

    assert sky_share_blocked([(0.0, 30.0)]) == pytest.approx(math.sin(math.radians(30)) ** 2)
    assert sky_share_blocked([]) == 0.0
    p = hand_project()
    p.site.horizon_deg = [(0.0, 30.0)]
    assert "horizon-diffuse" in {n.code for n in design(p).warnings}
    p.site.horizon_deg = [(90.0, 10.0), (270.0, 10.0)]
    assert "horizon-diffuse" not in {n.code for n in design(p).warnings}
