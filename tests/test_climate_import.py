"""Weather-file import: monthly means against a direct computation from the raw files,
and clear messages for bad files.

The raw files are NREL's TMY3 and TMY2 samples shipped in pvlib's data folder (an open
dataset); the direct computation parses them with the standard library only
(tests/climate_support.py), independently of pvlib and of the importer.
"""

from __future__ import annotations

import shutil

import numpy as np
import pytest

try:
    from climate_support import (
        TMY2_MIAMI,
        TMY3_GREENSBORO,
        TMY3_SAND_POINT,
        monthly_from_raw,
        pvlib_data,
        raw_tmy2,
        raw_tmy3,
        write_epw,
    )
except ImportError:  # run as a package
    from tests.climate_support import (
        TMY2_MIAMI,
        TMY3_GREENSBORO,
        TMY3_SAND_POINT,
        monthly_from_raw,
        pvlib_data,
        raw_tmy2,
        raw_tmy3,
        write_epw,
    )

from offgrid.climate.importers import (
    WeatherFileError,
    detect_kind,
    import_weather_file,
    read_monthly_csv,
)


def _compare(climate, direct):
    # rounding in the climate table: 3 decimals for insolation, 2 for temperatures
    np.testing.assert_allclose(climate.insolation_kwh_m2_day, direct["insolation"], atol=6e-4)
    np.testing.assert_allclose(climate.temp_mean_c, direct["mean"], atol=6e-3)
    np.testing.assert_allclose(climate.temp_max_c, direct["max"], atol=6e-3)
    np.testing.assert_allclose(climate.temp_min_c, direct["min"], atol=6e-3)


@pytest.mark.parametrize("name", [TMY3_GREENSBORO, TMY3_SAND_POINT])
def test_tmy3_monthly_means_match_direct_computation(name):
    path = pvlib_data() / name
    raw = raw_tmy3(path)
    result = import_weather_file(path, clear_sky=False)
    assert result.kind == "tmy3"
    _compare(result.climate, monthly_from_raw(raw))
    assert result.climate.record_low_c == pytest.approx(raw["temp"].min(), abs=0.05)
    # daily totals kept: 365 days adding up to the year's horizontal insolation
    daily = result.climate.daily
    assert len(daily.insolation_kwh_m2_day) == 365
    assert sum(daily.insolation_kwh_m2_day) == pytest.approx(raw["ghi"].sum() / 1000, rel=1e-4)
    # 1 January is the first 24 rows (TMY3 stamps hour ending: 01:00 ... 24:00)
    assert daily.insolation_kwh_m2_day[0] == pytest.approx(raw["ghi"][:24].sum() / 1000, abs=6e-4)


def test_tmy2_monthly_means_match_direct_computation_tenths_handled():
    # TMY2 stores the dry bulb in tenths of a degree C (NREL TMY2 user's manual); pvlib's
    # reader leaves them raw, the importer must divide by 10.
    path = pvlib_data() / TMY2_MIAMI
    result = import_weather_file(path, clear_sky=False)
    assert result.kind == "tmy2"
    _compare(result.climate, monthly_from_raw(raw_tmy2(path)))
    assert 15 < min(result.climate.temp_mean_c) < 30  # Miami, in degrees not tenths


def test_epw_import_matches_the_same_hours_from_tmy3(tmp_path):
    raw = raw_tmy3(pvlib_data() / TMY3_GREENSBORO)
    epw = write_epw(tmp_path / "greensboro.epw", raw)
    assert detect_kind(epw) == "epw"
    result = import_weather_file(epw, clear_sky=False)
    assert result.kind == "epw"
    _compare(result.climate, monthly_from_raw(raw))
    assert result.climate.latitude_deg == 36.1
    assert result.climate.daily.insolation_kwh_m2_day[0] == pytest.approx(
        raw["ghi"][:24].sum() / 1000, abs=6e-4
    )


def test_epw_with_seven_header_lines_is_refused(tmp_path):
    # pvlib's read_epw silently drops the first data row when a header line is missing
    # (measured, LIBRARY-NOTES): the importer must refuse instead.
    raw = raw_tmy3(pvlib_data() / TMY3_GREENSBORO)
    epw = write_epw(tmp_path / "short.epw", raw, header_lines=7)
    with pytest.raises(WeatherFileError, match=r"line 7: EPW header line 'COMMENTS 2'"):
        import_weather_file(epw)


def _tmy3_copy(tmp_path, edit=None):
    src = pvlib_data() / TMY3_GREENSBORO
    dst = tmp_path / "site.csv"
    lines = src.read_text().splitlines()
    if edit:
        lines = edit(lines)
    dst.write_text("\n".join(lines) + "\n")
    return dst


def _set_field(line: str, index: int, value: str) -> str:
    parts = line.split(",")
    parts[index] = value
    return ",".join(parts)


def test_garbled_value_names_the_line(tmp_path):
    def edit(lines):
        lines[100] = _set_field(lines[100], 4, "12x")  # GHI of file line 101
        return lines

    with pytest.raises(WeatherFileError, match=r"line 101: GHI '12x' is not a number"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_cut_short_row_names_the_line(tmp_path):
    def edit(lines):
        lines[500] = ",".join(lines[500].split(",")[:10])
        return lines

    with pytest.raises(WeatherFileError, match=r"line 501: 10 fields"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_garbled_date_names_the_line(tmp_path):
    def edit(lines):
        lines[40] = _set_field(lines[40], 0, "13/45/1988")
        return lines

    with pytest.raises(WeatherFileError, match=r"line 41"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_short_gap_is_filled_and_noted(tmp_path):
    def edit(lines):
        for i in (3000, 3001):  # two missing GHI values (-9900 is TMY3's missing marker)
            lines[i] = _set_field(lines[i], 4, "-9900")
        return lines

    result = import_weather_file(_tmy3_copy(tmp_path, edit), clear_sky=False)
    assert any("2 missing hour(s)" in n and "interpolation" in n for n in result.notes)


def test_long_gap_is_refused_naming_where(tmp_path):
    def edit(lines):
        del lines[1000:1010]  # ten hours of rows gone (file lines 1001-1010)
        return lines

    with pytest.raises(WeatherFileError, match=r"10 hourly row\(s\) missing") as err:
        import_weather_file(_tmy3_copy(tmp_path, edit))
    # file line 1001 holds data row 998 (0-based, two header lines): 998 = 41 days x 24 + 14,
    # so 11 February, the 15th hour (hour ending 15:00); the last row kept is line 1000
    assert "Feb 11 hour 15 (after line 1000)" in str(err.value)


def test_truncated_file_is_refused(tmp_path):
    with pytest.raises(WeatherFileError, match="a full year of hourly rows is needed"):
        import_weather_file(_tmy3_copy(tmp_path, lambda lines: lines[:5000]))


def test_duplicated_hour_names_both_lines(tmp_path):
    def edit(lines):
        lines[10] = lines[9]
        return lines

    with pytest.raises(WeatherFileError, match=r"lines 10 and 11: the same hour"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_wrong_ghi_unit_is_refused_naming_the_line(tmp_path):
    def edit(lines):
        for i in range(2, len(lines)):  # GHI written in kJ/m2 per hour (x 3.6)
            g = float(lines[i].split(",")[4])
            lines[i] = _set_field(lines[i], 4, f"{g * 3.6:.0f}")
        return lines

    with pytest.raises(WeatherFileError, match=r"line \d+: GHI \d+ is outside 0-1500 W/m2"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_fahrenheit_temperatures_are_refused(tmp_path):
    def edit(lines):
        for i in range(2, len(lines)):
            t = float(lines[i].split(",")[31])
            lines[i] = _set_field(lines[i], 31, f"{t * 1.8 + 32:.1f}")
        return lines

    with pytest.raises(WeatherFileError, match="Fahrenheit"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


def test_latitude_beyond_90_in_the_header(tmp_path):
    def edit(lines):
        lines[0] = _set_field(lines[0], 4, "95.0")
        return lines

    with pytest.raises(WeatherFileError, match=r"header\.latitude_deg: 95.0 is outside -90"):
        import_weather_file(_tmy3_copy(tmp_path, edit))


@pytest.mark.parametrize(("elevation", "ok"), [(-400.0, True), (-500.0, False)])
def test_elevation_below_sea_level(tmp_path, elevation, ok):
    # Dead Sea shore, about -430 m (from memory): lower than that is refused.
    def edit(lines):
        lines[0] = _set_field(lines[0], 6, str(elevation))
        return lines

    path = _tmy3_copy(tmp_path, edit)
    if ok:
        assert import_weather_file(path, clear_sky=False).climate.elevation_m == elevation
    else:
        with pytest.raises(WeatherFileError, match=r"elevation_m: -500.0 m is below"):
            import_weather_file(path)


def test_leap_year_uses_29_february_in_the_means_not_in_the_daily_series(tmp_path):
    raw = raw_tmy3(pvlib_data() / TMY3_GREENSBORO)
    # build a leap year: insert 29 February as a copy of 28 February
    feb28 = np.flatnonzero((raw["month"] == 2) & (raw["day"] == 28))
    at = feb28[-1] + 1
    leap = {k: np.insert(v, at, v[feb28]) for k, v in raw.items()}
    leap["day"][at : at + 24] = 29
    epw = write_epw(tmp_path / "leap.epw", leap, year=1992)
    result = import_weather_file(epw, clear_sky=False)
    feb = (raw["ghi"][raw["month"] == 2].sum() + raw["ghi"][feb28].sum()) / 1000 / 29
    assert result.climate.insolation_kwh_m2_day[1] == pytest.approx(feb, abs=6e-4)
    assert len(result.climate.daily.insolation_kwh_m2_day) == 365
    assert any("leap year" in n for n in result.notes)


def test_monthly_csv_with_units_in_the_header(tmp_path):
    path = tmp_path / "typed.csv"
    path.write_text(
        "# latitude_deg = 12.5\n# longitude_deg = -1.5\n# elevation_m = 300\n"
        "# source = invented for a test\n"
        "month,insolation_mj_m2_day,temp_mean_c\n"
        + "".join(f"{m},{18 + m % 3},{25 + m % 4}\n" for m in range(1, 13))
    )
    climate, _ = read_monthly_csv(path)
    assert climate.insolation_kwh_m2_day[0] == pytest.approx(19 / 3.6, abs=1e-3)
    assert climate.latitude_deg == 12.5 and climate.source == "invented for a test"


def test_monthly_csv_in_wrong_units_is_flagged_with_a_fix(tmp_path):
    path = tmp_path / "typed.csv"
    mj = [17.3, 19.8, 21.6, 22.5, 22.3, 21.2, 19.8, 19.4, 20.5, 20.9, 19.4, 17.6]
    path.write_text(
        "# latitude_deg = 12.5\n# longitude_deg = -1.5\n"
        "month,insolation_kwh_m2_day,temp_mean_c\n"
        + "".join(f"{m},{v},27\n" for m, v in enumerate(mj, start=1))
    )
    result = import_weather_file(path, clear_sky=False)
    slip = [f for f in result.findings if f.code == "unit-slip"]
    assert slip and slip[0].fix.unit == "MJ/m2/day"
    assert slip[0].fix.values[0] == pytest.approx(17.3 / 3.6, abs=1e-3)


@pytest.mark.parametrize(
    ("body", "message"),
    [
        (
            "month,insolation_kwh_m2_day,temp_mean_c\n"
            + "".join(f"{m},5,20\n" for m in range(1, 12)),
            "months missing: Dec",
        ),
        (
            "month,insolation_kwh_m2_day,temp_mean_c\n1,5,20\n1,5,20\n",
            r"line 3: Jan repeats line 2",
        ),
        (
            "month,insolation_kwh_m2_day,temp_mean_c\nJan,five,20\n",
            r"line 2: insolation_kwh_m2_day "
            "'five' is not a number",
        ),
        ("month,temp_mean_c\n1,20\n", "exactly one insolation column"),
        (
            "# latitude_deg = 91\nmonth,insolation_kwh_m2_day,temp_mean_c\n"
            + "".join(f"{m},5,20\n" for m in range(1, 13)),
            r"latitude_deg: 91.0 is outside",
        ),
    ],
)
def test_monthly_csv_bad_input(tmp_path, body, message):
    path = tmp_path / "bad.csv"
    path.write_text(body)
    with pytest.raises(WeatherFileError, match=message):
        read_monthly_csv(path)


def test_unknown_file_format_is_named(tmp_path):
    path = tmp_path / "notes.txt"
    path.write_text("hello\n")
    with pytest.raises(WeatherFileError, match="format not recognised"):
        import_weather_file(path)


def test_tmy2_garbled_row(tmp_path):
    src = pvlib_data() / TMY2_MIAMI
    dst = tmp_path / "miami.tm2"
    shutil.copy(src, dst)
    lines = dst.read_text().splitlines()
    lines[200] = lines[200][:50]
    dst.write_text("\n".join(lines) + "\n")
    with pytest.raises(WeatherFileError, match="line 201: not a TMY2 data row"):
        import_weather_file(dst)


def test_tmy2_fixed_column_reader_equals_pvlib_read_tmy2():
    # pvlib.iotools.read_tmy2 as the reference for our faster fixed-column reader
    from offgrid.climate.importers import _read_tmy2

    path = pvlib_data() / TMY2_MIAMI
    ours, theirs = _read_tmy2(path), _read_tmy2(path, use_pvlib=True)
    for key in ("month", "day", "hour", "ghi_w_m2", "temp_air_c", "line"):
        np.testing.assert_array_equal(getattr(ours, key), getattr(theirs, key), err_msg=key)
    assert (ours.latitude_deg, ours.longitude_deg, ours.elevation_m, ours.station) == (
        theirs.latitude_deg,
        theirs.longitude_deg,
        theirs.elevation_m,
        theirs.station,
    )


def test_tmy2_garbled_number_names_line_and_columns(tmp_path):
    dst = tmp_path / "miami.tm2"
    lines = (pvlib_data() / TMY2_MIAMI).read_text().splitlines()
    lines[300] = lines[300][:17] + "x9z9" + lines[300][21:]
    dst.write_text("\n".join(lines) + "\n")
    with pytest.raises(WeatherFileError, match=r"line 301: GHI 'x9z9' \(characters 18-21\)"):
        import_weather_file(dst)


def test_long_run_of_missing_values_names_the_line(tmp_path):
    def edit(lines):
        for i in range(4000, 4006):  # six hours of TMY3's missing marker -9900 in the GHI
            lines[i] = _set_field(lines[i], 4, "-9900")
        return lines

    with pytest.raises(WeatherFileError, match=r"line 4001: .* GHI missing for 6 hour\(s\)"):
        import_weather_file(_tmy3_copy(tmp_path, edit))
