"""Plausibility checks on typed monthly values: physics, clear sky, unit slips."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.climate import sky
from offgrid.climate.checks import (
    apply_fix,
    check_climate,
    check_insolation,
    check_location,
    check_temperatures,
    check_transposition,
    convert_insolation,
)
from offgrid.climate.clearsky import (
    CEILING_MODEL_MARGIN,
    clear_sky_daily_ineichen,
    clearest_sky_horizontal_kwh_m2,
    extraterrestrial_monthly_mean_kwh_m2,
)
from offgrid.climate.files import load_climate
from offgrid.climate.model import MonthlyClimate

# The monthly means of NREL's Greensboro TMY3 sample (pvlib data folder), as bundled.
GREENSBORO = load_climate("greensboro-nc-tmy3")
H = np.asarray(GREENSBORO.insolation_kwh_m2_day)
LAT, LON, ELEV = 36.1, -79.95, 273.0


def _codes(findings):
    return [f.code for f in findings]


def test_measured_table_passes_clean():
    found = check_insolation(H, LAT, LON, ELEV)
    assert [f for f in found if f.severity != "info"] == []


@pytest.mark.parametrize(
    ("typed", "unit"),
    [
        (H * 3.6, "MJ/m2/day"),  # 1 kWh = 3.6 MJ (SI definition)
        (H * sky.DAYS_IN_MONTH, "kWh/m2/month"),
        (H / 0.024, "W/m2"),  # 24-hour mean irradiance: kWh/m2/day = W/m2 x 24 h / 1000
        (H * 1000.0, "Wh/m2/day"),
        (H * 3.6 * sky.DAYS_IN_MONTH, "MJ/m2/month"),
    ],
)
def test_unit_slips_detected_with_the_right_fix_first(typed, unit):
    found = check_insolation(typed, LAT, LON, ELEV)
    slip = [f for f in found if f.code == "unit-slip"]
    assert slip, _codes(found)
    assert slip[0].severity == "error"
    assert slip[0].fix.unit == unit
    np.testing.assert_allclose(slip[0].fix.values, H, atol=2e-3)


def test_ambiguous_slip_offers_every_plausible_unit():
    # Monthly totals in kWh/m2 and 24-hour W/m2 overlap (100-250): both are offered, the
    # typical clearness index ranks them.
    found = check_insolation(H * sky.DAYS_IN_MONTH, LAT, LON, ELEV)
    units = [fix.unit for fix in found[0].fixes]
    assert units[0] == "kWh/m2/month" and "W/m2" in units


def test_convert_insolation_units():
    assert convert_insolation([36.0] * 12, "MJ/m2/day")[0] == pytest.approx(10.0)
    assert convert_insolation([310.0] * 12, "kWh/m2/month")[0] == pytest.approx(10.0)
    assert convert_insolation([250.0] * 12, "W/m2")[0] == pytest.approx(6.0)
    with pytest.raises(ValueError, match="not known"):
        convert_insolation([1.0] * 12, "furlongs")


def test_above_extraterrestrial_is_an_error_naming_the_month():
    # A value above the top-of-atmosphere insolation (Duffie & Beckman eq. 1.10.3) is
    # physically impossible (clearness index above 1).
    h0 = extraterrestrial_monthly_mean_kwh_m2(LAT)
    typed = H.copy()
    typed[11] = h0[11] * 1.1
    found = check_insolation(typed, LAT, LON, ELEV)
    bad = [f for f in found if f.code == "above-extraterrestrial"]
    assert len(bad) == 1 and bad[0].month == 12 and "Dec" in bad[0].message


def test_above_clear_sky_is_flagged():
    # June at 36 N: above cloudless days in the clearest plausible air, though below the
    # extraterrestrial insolation.
    cs = clearest_sky_horizontal_kwh_m2(LAT, ELEV) * (1 + CEILING_MODEL_MARGIN)
    typed = H.copy()
    typed[5] = cs[5] + 0.3
    found = check_insolation(typed, LAT, LON, ELEV)
    bad = [f for f in found if f.code == "above-clear-sky"]
    assert [f.month for f in bad] == [6]
    assert bad[0].message.startswith("sunshine on the horizontal in Jun")
    assert "insolation_kwh_m2_day" not in bad[0].message


def test_dry_season_sahel_january_is_not_flagged():
    # About 12 N, a dry-season January of 5.6 kWh/m2/day (clearness index about 0.65 with
    # Duffie & Beckman eq. 1.10.3) was flagged against the Ineichen sky with the mean
    # (climatological) Linke turbidity, 5.09. The ceiling is now the clearest plausible sky.
    typed = [5.6, 6.2, 6.6, 6.6, 6.4, 6.0, 5.5, 5.3, 5.7, 6.0, 5.9, 5.5]
    found = check_insolation(typed, 12.4, -1.5, 300.0)
    assert [f for f in found if f.severity != "info"] == [], [f.message for f in found]
    assert clear_sky_daily_ineichen(12.4, -1.5, 300.0)[0] < 5.6  # the old, mean-turbidity sky


def test_clearest_sky_against_pvlib_horizontal():
    # pvlib's Ineichen sky at the same turbidity on SPA sun positions as the reference for
    # our numpy day integration (Spencer declination, refraction): within 1.5 % at 36 N.
    import warnings

    import pandas as pd
    from pvlib import atmosphere, irradiance, solarposition
    from pvlib import clearsky as pvcs

    from offgrid.climate.clearsky import clearest_linke_turbidity

    times = pd.date_range("2026-01-01", "2027-01-01", freq="10min", tz="UTC", inclusive="left")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        sp = solarposition.get_solarposition(times, LAT, LON, altitude=ELEV, method="nrel_numpy")
        zen = sp["apparent_zenith"].to_numpy()
        zz = np.where(zen < 90, zen, 89.0)
        am = atmosphere.get_absolute_airmass(
            atmosphere.get_relative_airmass(zz), atmosphere.alt2pres(ELEV)
        )
        extra = irradiance.get_extra_radiation(
            times, solar_constant=1367.0, method="spencer"
        ).to_numpy()
        ghi = pvcs.ineichen(zz, am, clearest_linke_turbidity(ELEV), ELEV, extra)["ghi"]
    ghi = np.where(zen < 90, np.asarray(ghi), 0.0)
    month = times.month.to_numpy() - 1
    ref = np.bincount(month, weights=ghi, minlength=12) * (10 / 60) / 1000 / sky.DAYS_IN_MONTH
    np.testing.assert_allclose(clearest_sky_horizontal_kwh_m2(LAT, ELEV), ref, rtol=0.015)


def test_clear_sky_is_below_extraterrestrial_and_physical():
    # Ineichen clear sky with the Linke table: a clear day passes 60-80 % of the
    # extraterrestrial insolation at mid latitudes (common practice, no source).
    cs = clear_sky_daily_ineichen(LAT, LON, ELEV)
    kt_cs = cs / extraterrestrial_monthly_mean_kwh_m2(LAT)
    assert np.all((kt_cs > 0.55) & (kt_cs < 0.82))
    clearest = clearest_sky_horizontal_kwh_m2(LAT, ELEV)
    assert np.all(clearest >= cs) and np.all(clearest < extraterrestrial_monthly_mean_kwh_m2(LAT))


def test_very_low_clearness_warned():
    typed = H.copy()
    typed[6] = 0.5  # July at 36 N: clearness index below 0.05
    found = check_insolation(typed, LAT, LON, ELEV)
    assert [f.month for f in found if f.code == "kt-very-low"] == [7]


def test_other_hemisphere_seasons_flagged():
    found = check_insolation(H, -LAT, LON, ELEV)
    assert found[0].code == "hemisphere"


def test_polar_night_with_sun_is_an_error():
    # At 75 N the sun does not rise in November and December (Duffie & Beckman eq. 1.6.10
    # with the Cooper declination): any insolation then is impossible.
    typed = [0.0, 0.3, 1.5, 3.5, 5.0, 5.5, 5.0, 3.8, 2.0, 0.6, 0.0, 0.2]
    found = check_insolation(typed, 75.0, 20.0, 0.0, clear_sky=False)
    assert [f.month for f in found if f.code == "polar-night"] == [12]


def test_clear_sky_check_needs_no_longitude():
    typed = H.copy()
    typed[5] = 9.9  # June at 36 N, above any plausible clear sky
    found = check_insolation(typed, LAT, None)
    assert "above-clear-sky" in _codes(found)


def test_low_sun_transposition_flagged():
    # 64 N, December 0.1 kWh/m2/day: the monthly method gives about sixteen times that on a
    # 60-degree plane, above what cloudless days could bring (tests/test_sky_albedo.py).
    typed = [0.3, 1.0, 2.4, 4.0, 5.0, 5.5, 5.0, 3.8, 2.2, 1.0, 0.3, 0.1]
    found = check_transposition(typed, 64.0, 60.0)
    dec = [f for f in found if f.month == 12]
    assert dec and dec[0].code == "low-sun-transposition" and "held" in dec[0].message
    assert dec[0].message.startswith("sunshine on the horizontal in Dec")
    # an ordinary mid-latitude table is not flagged
    assert check_transposition(H, LAT, 36.0) == []


@pytest.mark.parametrize(
    ("lat", "lon", "elev", "code"),
    [
        (91.0, 0.0, 0.0, "latitude"),
        (-90.5, 0.0, 0.0, "latitude"),
        (10.0, 200.0, 0.0, "longitude"),
        (10.0, 0.0, -431.0, "elevation"),  # below the Dead Sea shore, about -430 m (from memory)
        (10.0, 0.0, 9500.0, "elevation"),
    ],
)
def test_impossible_coordinates(lat, lon, elev, code):
    assert [f.code for f in check_location(lat, lon, elev)] == [code]
    assert check_insolation(H, lat, lon, elev)[0].code == code


def test_dead_sea_elevation_allowed():
    assert check_location(31.5, 35.5, -430.0) == []


def test_bad_values_named():
    assert _codes(check_insolation([5.0] * 11, LAT)) == ["count"]
    assert _codes(check_insolation([5.0] * 11 + ["x"], LAT)) == ["not-number"]
    found = check_insolation([5.0] * 11 + [float("nan")], LAT)
    assert found[0].code == "not-finite" and found[0].month == 12
    found = check_insolation([5.0] * 11 + [-1.0], LAT)
    assert found[0].code == "negative" and found[0].month == 12


def test_temperatures():
    mean = [0.3, 5.0, 11.4, 14.7, 19.0, 23.6, 25.4, 24.8, 20.1, 13.1, 10.8, 4.2]
    assert check_temperatures(mean, [t + 5 for t in mean], [t - 5 for t in mean], -17) == []
    fahrenheit = [t * 1.8 + 32 for t in mean]  # F = C x 1.8 + 32
    found = check_temperatures(fahrenheit)
    assert found[0].code == "fahrenheit"
    np.testing.assert_allclose(found[0].fix.values, mean, atol=0.06)
    found = check_temperatures(mean, [t - 1 for t in mean])
    assert found[0].code == "max-below-mean" and found[0].month == 1
    found = check_temperatures(mean, None, [t - 5 for t in mean], record_low_c=0.0)
    assert _codes(found) == ["record-low"]


def test_apply_fix_returns_a_corrected_copy():
    typed = MonthlyClimate(
        insolation_kwh_m2_day=list(H * 3.6),
        temp_mean_c=[10.0] * 12,
        latitude_deg=LAT,
        longitude_deg=LON,
        elevation_m=ELEV,
    )
    found = check_climate(typed)
    fixed = apply_fix(typed, found[0])
    np.testing.assert_allclose(fixed.insolation_kwh_m2_day, H, atol=2e-3)
    assert typed.insolation_kwh_m2_day[0] == pytest.approx(H[0] * 3.6)  # original untouched
    assert [f for f in check_climate(fixed) if f.severity != "info"] == []


@pytest.mark.parametrize(
    "name",
    [
        "greensboro-nc-tmy3",
        "sand-point-ak-tmy3",
        "miami-fl-tmy2",
        "dalli-wells-demo",
        "pampa-alta-demo",
        "tarn-station-demo",
        "myrvik-cabin-demo",
        "kisanga-ridge-demo",
    ],
)
def test_bundled_climates_pass_the_checks(name):
    found = check_climate(load_climate(name))
    assert [f for f in found if f.severity != "info"] == [], [f.message for f in found]
