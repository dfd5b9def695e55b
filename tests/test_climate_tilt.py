"""The tilt search: worst month against demand, best annual, self-cleaning minimum."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.climate import sky
from offgrid.climate.files import load_climate
from offgrid.climate.poa import poa_monthly
from offgrid.climate.tilt import best_tilt, describe_tilt

GREENSBORO = load_climate("greensboro-nc-tmy3")  # NREL TMY3 sample, pvlib data folder
H = np.asarray(GREENSBORO.insolation_kwh_m2_day)


def _brute(h, lat, az, demand, lo, step=0.01):
    """Independent search: every tilt on a fine grid, one at a time."""
    best_w = best_a = None
    score_w = score_a = -np.inf
    for t in np.arange(lo, 90.0 + 1e-9, step):
        poa = poa_monthly(h, lat, min(float(t), 90.0), az).poa_kwh_m2_day
        used = demand > 0
        w = np.min(poa[used] / demand[used])
        a = np.sum(poa * sky.DAYS_IN_MONTH)
        if w > score_w:
            score_w, best_w = w, t
        if a > score_a:
            score_a, best_a = a, t
    return best_w, best_a, score_w


def test_search_finds_the_optimum_of_a_fine_brute_force_grid():
    demand = np.full(12, 1000.0)
    c = best_tilt(H, 36.1, 180.0, demand, min_tilt_deg=10.0)
    tw, ta, sw = _brute(H, 36.1, 180.0, demand, 10.0, step=0.05)
    assert c.tilt_deg == pytest.approx(tw, abs=0.15)
    assert c.annual_tilt_deg == pytest.approx(ta, abs=0.15)
    # the worst-month supply/demand reached is within 0.05 % of the brute-force best
    worst = min(np.asarray(c.poa_kwh_m2_day) / demand)
    assert worst == pytest.approx(sw, rel=5e-4)


def test_winter_limited_site_tilts_steeper_than_the_annual_optimum():
    # Mid-latitude, constant demand: December limits, so the worst-month tilt is steeper than
    # the annual one (latitude + 10-25 deg vs about latitude - 5: common practice, no source).
    c = best_tilt(H, 36.1, 180.0)
    assert c.tilt_deg > c.annual_tilt_deg + 10.0
    assert c.difference_deg == pytest.approx(c.tilt_deg - c.annual_tilt_deg)
    assert 25.0 < c.annual_tilt_deg < 36.1
    assert c.worst_month_gain_pct > 0 and c.annual_loss_pct > 0
    assert c.annual_kwh_m2 < c.annual_best_kwh_m2
    assert "least sun on the array for its demand" in describe_tilt(c)


def test_summer_only_demand_tilts_flatter():
    # A load used in June-August only (say, an irrigation pump) is best served flatter.
    demand = np.array([0, 0, 0, 0, 0, 1, 1, 1, 0, 0, 0, 0], dtype=float) * 800.0
    c = best_tilt(H, 36.1, 180.0, demand)
    assert c.tilt_deg < c.annual_tilt_deg
    assert c.design_month in (6, 7, 8)


def test_southern_hemisphere_faces_north_and_mirrors():
    # The same climate moved to 36.1 S with the months shifted by six faces north
    # (azimuth 0) and finds nearly the same tilts (Cooper declination is nearly symmetric).
    north = best_tilt(H, 36.1)
    south = best_tilt(np.roll(H, 6), -36.1)
    assert south.azimuth_deg == 0.0 and north.azimuth_deg == 180.0
    assert south.tilt_deg == pytest.approx(north.tilt_deg, abs=3.0)
    assert south.annual_tilt_deg == pytest.approx(north.annual_tilt_deg, abs=3.0)
    assert south.design_month == (north.design_month + 5) % 12 + 1


def test_never_below_the_self_cleaning_minimum():
    # Near the equator the annual optimum is nearly flat; the search stops at the minimum.
    h = [5.5, 6.0, 6.2, 5.8, 5.2, 4.9, 4.8, 5.0, 5.6, 5.9, 5.7, 5.4]
    c = best_tilt(h, 2.0, min_tilt_deg=10.0)
    assert c.tilt_deg >= 10.0 and c.annual_tilt_deg >= 10.0
    c15 = best_tilt(h, 2.0, min_tilt_deg=15.0)
    assert c15.tilt_deg == 15.0 and c15.at_minimum


def test_high_latitude_steep_tilt():
    # Sand Point, Alaska, 55.3 N (NREL TMY3 sample): the dark winter months limit.
    sp = load_climate("sand-point-ak-tmy3")
    c = best_tilt(sp.insolation_kwh_m2_day, sp.latitude_deg)
    assert c.tilt_deg > 60.0
    assert c.design_month in (11, 12, 1)


def test_zero_demand_everywhere_falls_back_to_equal_months():
    c0 = best_tilt(H, 36.1, 180.0, np.zeros(12))
    c1 = best_tilt(H, 36.1, 180.0, None)
    assert c0.tilt_deg == c1.tilt_deg


def test_bad_inputs_name_the_field():
    with pytest.raises(ValueError, match=r"choices\.min_tilt_deg"):
        best_tilt(H, 36.1, min_tilt_deg=95.0)
    with pytest.raises(ValueError, match="monthly demand"):
        best_tilt(H, 36.1, demand_wh_day=[-1.0] * 12)
    with pytest.raises(ValueError, match=r"site\.latitude_deg"):
        best_tilt(H, 91.0)
