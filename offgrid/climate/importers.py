"""Weather-file import: EPW, TMY2 and TMY3 through pvlib.iotools, and a plain monthly CSV.

An hourly file is checked row by row (a clear message names the line),
placed on a calendar grid of days x 24 hours from its own month, day and
hour columns (so that time-zone stamps and the hour-ending conventions of
the formats cannot shift a day), reduced to the monthly table, and its
daily totals are kept for the reliability simulation.

Conventions handled (measured, see the project's library notes):

* TMY3 and TMY2 stamp hour *ending* (01:00 is the hour 00:00-01:00, 24:00
  the last hour of the day); EPW's hour field 1-24 is hour ending too, and
  pvlib turns it into hour-beginning stamps.  We use the raw fields.
* pvlib's TMY3 reader moves a 29 February to 1 March; we read the raw date.
* ``read_tmy2`` leaves the dry-bulb temperature in tenths of a degree.
* ``read_epw`` needs all 8 header lines: with 7 it silently drops the first
  data row, so the header is checked before pvlib reads the file.
* missing-value markers (9999 and -9900 for radiation, 99.9 and -9900 for
  temperature) are treated as gaps; gaps of up to three hours are filled by
  linear interpolation and listed in the notes, longer gaps are refused.
* a leap year (29 February present) is used for the monthly means; the daily
  series always has 365 days, 29 February left out (noted).
"""

from __future__ import annotations

import csv
import io
import re
import warnings
from dataclasses import dataclass, field
from datetime import datetime
from pathlib import Path

import numpy as np

from offgrid.climate import sky
from offgrid.climate.checks import (
    MONTHS,
    Finding,
    check_climate,
    convert_insolation,
    validate_location,
)
from offgrid.climate.model import DailyClimate, MonthlyClimate

MAX_FILLED_GAP_H = 3  # longest run of missing hours filled by interpolation (our choice)
MAX_HOURLY_GHI_W_M2 = 1500.0  # above the solar constant plus cloud enhancement
GHI_MISSING = (9999.0, 99999.0, -9900.0, -9999.0, -999.0)  # EPW, TMY2 and TMY3 markers
TEMP_MISSING = (99.9, 999.9, 9999.0, -9900.0, -9999.0, -999.0)
EPW_HEADER_KEYS = (
    "LOCATION",
    "DESIGN CONDITIONS",
    "TYPICAL/EXTREME PERIODS",
    "GROUND TEMPERATURES",
    "HOLIDAYS/DAYLIGHT SAVINGS",
    "COMMENTS 1",
    "COMMENTS 2",
    "DATA PERIODS",
)
KINDS = ("epw", "tmy3", "tmy2", "monthly-csv")
_KIND_LABEL = {"epw": "EPW", "tmy3": "TMY3", "tmy2": "TMY2", "monthly-csv": "monthly CSV"}


class WeatherFileError(ValueError):
    """A weather file cannot be imported; the message names the file, line or field."""


@dataclass(frozen=True)
class HourlyRows:
    """The rows of an hourly weather file, as read (before the calendar check)."""

    month: np.ndarray  # 1-12
    day: np.ndarray  # 1-31
    hour: np.ndarray  # 1-24, hour ending
    ghi_w_m2: np.ndarray  # hourly mean global horizontal irradiance (= Wh/m2 in the hour)
    temp_air_c: np.ndarray
    line: np.ndarray  # line number of each row in the file
    latitude_deg: float
    longitude_deg: float
    elevation_m: float
    station: str
    kind: str


@dataclass(frozen=True)
class ImportResult:
    climate: MonthlyClimate
    kind: str  # one of KINDS
    name: str  # suggested file name (from the station)
    notes: tuple[str, ...] = ()
    findings: tuple[Finding, ...] = field(default_factory=tuple)


# ----------------------------------------------------------------------------- detection


def detect_kind(path: Path) -> str:
    """Guess the file format from the suffix and the first lines."""
    suffix = path.suffix.lower()
    if suffix == ".epw":
        return "epw"
    if suffix in (".tm2", ".tmy2"):
        return "tmy2"
    try:
        with path.open(encoding="utf-8", errors="replace") as fh:
            first = fh.readline()
            second = fh.readline()
    except OSError as exc:
        raise WeatherFileError(f"{path}: cannot be read ({exc.strerror})") from exc
    if first.startswith("LOCATION,"):
        return "epw"
    if second.startswith("Date (MM/DD/YYYY)"):
        return "tmy3"
    if re.match(r"^\s*\d{5}\s+.+\s[NS]\s+\d+\s+\d+\s+[EW]\s+\d+\s+\d+", first):
        return "tmy2"
    with path.open(encoding="utf-8", errors="replace") as fh:
        for _, text in zip(range(40), fh, strict=False):
            stripped = text.strip().lower()
            if stripped and not stripped.startswith("#"):
                if stripped.split(",")[0].strip() == "month":
                    return "monthly-csv"
                break
    raise WeatherFileError(
        f"{path.name}: format not recognised; offgrid imports EPW (.epw), TMY3 (.csv), "
        "TMY2 (.tm2) and a monthly CSV whose header starts with 'month'"
    )


# ----------------------------------------------------------------------------- readers


def _numeric(values, what: str, lines: np.ndarray, path: Path) -> np.ndarray:
    import pandas as pd

    raw = pd.Series(values)
    num = pd.to_numeric(raw, errors="coerce").to_numpy(dtype=float)
    bad = np.flatnonzero(~np.isfinite(num) & raw.notna().to_numpy())
    if bad.size:
        i = int(bad[0])
        raise WeatherFileError(
            f"{path.name} line {int(lines[i])}: {what} '{raw.iloc[i]}' is not a number"
            + (f" (and {bad.size - 1} more rows)" if bad.size > 1 else "")
        )
    return num


def _scan_csv_rows(path: Path, skip: int, min_fields: int, label: str) -> None:
    """Find the first row with too few fields (pvlib's error names no line)."""
    with path.open(encoding="utf-8", errors="replace", newline="") as fh:
        for n, row in enumerate(csv.reader(fh), start=1):
            if n <= skip:
                continue
            if not row or all(not c.strip() for c in row):
                raise WeatherFileError(f"{path.name} line {n}: empty row in the {label} data")
            if len(row) < min_fields:
                raise WeatherFileError(
                    f"{path.name} line {n}: {len(row)} fields, a {label} row needs "
                    f"{min_fields}; the row is cut short or garbled"
                )


def _read_tmy3(path: Path) -> HourlyRows:
    from pvlib import iotools  # late import: pvlib is slow to import

    _scan_csv_rows(path, skip=2, min_fields=34, label="TMY3")
    try:
        with warnings.catch_warnings():  # a garbled column gives a dtype warning; we name it
            warnings.simplefilter("ignore")
            data, meta = iotools.read_tmy3(str(path), coerce_year=1990, map_variables=True)
    except (ValueError, KeyError, IndexError, TypeError) as exc:
        raise WeatherFileError(_locate_tmy3_error(path, exc)) from exc
    lines = np.arange(len(data)) + 3
    dates = data["Date (MM/DD/YYYY)"].astype(str).str.split("/", expand=True)
    times = data["Time (HH:MM)"].astype(str).str.split(":", expand=True)
    return HourlyRows(
        month=_numeric(dates[0], "month", lines, path).astype(int),
        day=_numeric(dates[1], "day", lines, path).astype(int),
        hour=_numeric(times[0], "hour", lines, path).astype(int),
        ghi_w_m2=_numeric(data["ghi"], "GHI", lines, path),
        temp_air_c=_numeric(data["temp_air"], "dry-bulb temperature", lines, path),
        line=lines,
        latitude_deg=float(meta["latitude"]),
        longitude_deg=float(meta["longitude"]),
        elevation_m=float(meta["altitude"]),
        station=_station_name(meta),
        kind="tmy3",
    )


def _locate_tmy3_error(path: Path, exc: Exception) -> str:
    with path.open(encoding="utf-8", errors="replace", newline="") as fh:
        for n, row in enumerate(csv.reader(fh), start=1):
            if n == 1:
                if len(row) < 7:
                    return f"{path.name} line 1: the TMY3 station header needs 7 fields"
                continue
            if n == 2:
                continue
            try:
                datetime.strptime(row[0].strip(), "%m/%d/%Y")
            except ValueError:
                return f"{path.name} line {n}: date '{row[0]}' is not a date MM/DD/YYYY"
            if not re.fullmatch(r"\d{1,2}:\d{2}", row[1].strip()):
                return f"{path.name} line {n}: time '{row[1]}' is not HH:MM"
    return f"{path.name}: the TMY3 reader failed ({exc})"


def _tmy2_lines(path: Path) -> list[str]:
    """The TMY2 data rows, each checked for its fixed layout; the message names the line."""
    lines = path.read_text(encoding="utf-8", errors="replace").splitlines()
    for n, text in enumerate(lines[1:], start=2):
        if not text.strip():
            raise WeatherFileError(f"{path.name} line {n}: empty row in the TMY2 data")
        if len(text) < 120 or not text[1:9].isdigit():
            raise WeatherFileError(
                f"{path.name} line {n}: not a TMY2 data row (fixed columns: year, month, "
                "day, hour in characters 2-9, then the radiation and weather fields)"
            )
    return lines


def _read_tmy2(path: Path, use_pvlib: bool = False) -> HourlyRows:
    """TMY2 rows.

    By default the few columns we need are cut from the fixed layout of the NREL TMY2
    user's manual (1995), table 2-2: month 4-5, day 6-7, hour 8-9, global horizontal
    18-21 (Wh/m2), dry bulb 68-71 (tenths of a degree C); pvlib's ``read_tmy2`` parses
    every field with a regular expression and takes about a second a year.
    ``use_pvlib=True`` reads through ``pvlib.iotools.read_tmy2`` instead (same result,
    checked by the tests).
    """
    lines = _tmy2_lines(path)
    if use_pvlib:
        return _read_tmy2_pvlib(path)
    body = lines[1:]
    line_no = np.arange(len(body)) + 2

    def column(a: int, b: int, what: str) -> np.ndarray:
        out = np.empty(len(body))
        for i, text in enumerate(body):
            try:
                out[i] = float(text[a - 1 : b])
            except ValueError:
                raise WeatherFileError(
                    f"{path.name} line {i + 2}: {what} '{text[a - 1 : b]}' (characters {a}-{b}) "
                    "is not a number"
                ) from None
        return out

    meta = _tmy2_meta(path, lines[0])
    dry = column(68, 71, "dry-bulb temperature")
    return HourlyRows(
        month=column(4, 5, "month").astype(int),
        day=column(6, 7, "day").astype(int),
        hour=column(8, 9, "hour").astype(int),
        ghi_w_m2=column(18, 21, "GHI"),
        temp_air_c=np.where(dry == 9999.0, np.nan, dry / 10.0),  # tenths of a degree C
        line=line_no,
        **meta,
    )


def _tmy2_meta(path: Path, header: str) -> dict:
    """Station header: WBAN, city, state, time zone, N/S deg min, E/W deg min, elevation."""
    tokens = header.split()
    try:
        elev = float(tokens[-1])
        lon = float(tokens[-3]) + float(tokens[-2]) / 60.0
        lat = float(tokens[-6]) + float(tokens[-5]) / 60.0
        ew, ns = tokens[-4].upper(), tokens[-7].upper()
        if ew not in ("E", "W") or ns not in ("N", "S"):
            raise ValueError
    except (ValueError, IndexError):
        raise WeatherFileError(
            f"{path.name} line 1: not a TMY2 station header (WBAN, city, state, time zone, "
            "N/S degrees minutes, E/W degrees minutes, elevation)"
        ) from None
    city = " ".join(tokens[1:-9])
    return {
        "latitude_deg": lat if ns == "N" else -lat,
        "longitude_deg": -lon if ew == "W" else lon,
        "elevation_m": elev,
        "station": f"{city}, {tokens[-9]}".strip(", "),
        "kind": "tmy2",
    }


def _read_tmy2_pvlib(path: Path) -> HourlyRows:
    from pvlib import iotools  # late import: pvlib is slow to import

    try:
        data, meta = iotools.read_tmy2(str(path))
    except (ValueError, KeyError, IndexError, TypeError) as exc:
        raise WeatherFileError(f"{path.name}: the TMY2 reader failed ({exc})") from exc
    lines = np.arange(len(data)) + 2
    dry = _numeric(data["DryBulb"], "dry-bulb temperature", lines, path)
    dry = np.where(np.isin(dry, (9999.0,)), np.nan, dry / 10.0)  # raw tenths of a degree C
    return HourlyRows(
        month=_numeric(data["month"], "month", lines, path).astype(int),
        day=_numeric(data["day"], "day", lines, path).astype(int),
        hour=_numeric(data["hour"], "hour", lines, path).astype(int),
        ghi_w_m2=_numeric(data["GHI"], "GHI", lines, path),
        temp_air_c=dry,
        line=lines,
        latitude_deg=float(meta["latitude"]),
        longitude_deg=float(meta["longitude"]),
        elevation_m=float(meta["altitude"]),
        station=f"{str(meta.get('City', '')).strip()}, {meta.get('State', '')}".strip(", "),
        kind="tmy2",
    )


def _check_epw_header(path: Path) -> None:
    with path.open(encoding="utf-8", errors="replace") as fh:
        head = [fh.readline() for _ in range(9)]
    for i, key in enumerate(EPW_HEADER_KEYS):
        if not head[i].upper().startswith(key):
            found = head[i].split(",")[0].strip()[:30] or "(empty)"
            raise WeatherFileError(
                f"{path.name} line {i + 1}: EPW header line '{key}' expected, found '{found}'; "
                "an EPW file has 8 header lines (LOCATION ... DATA PERIODS) before the data"
            )
    first = head[8].split(",")
    if len(first) < 15 or not first[0].strip().lstrip("-").isdigit():
        raise WeatherFileError(f"{path.name} line 9: the first EPW data row is missing or garbled")


def _read_epw(path: Path) -> HourlyRows:
    from pvlib import iotools  # late import: pvlib is slow to import

    _check_epw_header(path)
    _scan_csv_rows(path, skip=8, min_fields=22, label="EPW")
    try:
        with warnings.catch_warnings():  # a garbled column gives a dtype warning; we name it
            warnings.simplefilter("ignore")
            data, meta = iotools.read_epw(str(path))
    except (ValueError, KeyError, IndexError, TypeError) as exc:
        raise WeatherFileError(_locate_epw_error(path, exc)) from exc
    lines = np.arange(len(data)) + 9
    return HourlyRows(
        month=_numeric(data["month"], "month", lines, path).astype(int),
        day=_numeric(data["day"], "day", lines, path).astype(int),
        hour=_numeric(data["hour"], "hour", lines, path).astype(int),
        ghi_w_m2=_numeric(data["ghi"], "GHI", lines, path),
        temp_air_c=_numeric(data["temp_air"], "dry-bulb temperature", lines, path),
        line=lines,
        latitude_deg=float(meta["latitude"]),
        longitude_deg=float(meta["longitude"]),
        elevation_m=float(meta["altitude"]),
        station=", ".join(
            str(meta.get(k, "")).strip()
            for k in ("city", "country")
            if str(meta.get(k, "")).strip() not in ("", "-")
        ),
        kind="epw",
    )


def _locate_epw_error(path: Path, exc: Exception) -> str:
    with path.open(encoding="utf-8", errors="replace", newline="") as fh:
        for n, row in enumerate(csv.reader(fh), start=1):
            if n <= 8:
                continue
            for col, what in ((0, "year"), (1, "month"), (2, "day"), (3, "hour")):
                if not row[col].strip().lstrip("-").isdigit():
                    return f"{path.name} line {n}: {what} '{row[col]}' is not a whole number"
    return f"{path.name}: the EPW reader failed ({exc})"


_READERS = {"epw": _read_epw, "tmy3": _read_tmy3, "tmy2": _read_tmy2}


def read_hourly(path: str | Path, kind: str | None = None) -> HourlyRows:
    """Read an EPW, TMY3 or TMY2 file into :class:`HourlyRows`.

    EPW and TMY3 through pvlib.iotools; TMY2 from its fixed columns (see :func:`_read_tmy2`).
    """
    path = Path(path)
    _need_file(path)
    kind = kind or detect_kind(path)
    if kind not in _READERS:
        raise WeatherFileError(
            f"{path.name}: '{kind}' is not an hourly format ({', '.join(_READERS)})"
        )
    rows = _READERS[kind](path)
    if len(rows.month) == 0:
        raise WeatherFileError(f"{path.name}: no data rows")
    try:
        validate_location(
            rows.latitude_deg, rows.longitude_deg, rows.elevation_m, where=f"{path.name} header"
        )
    except ValueError as exc:
        raise WeatherFileError(str(exc)) from None
    return rows


# ----------------------------------------------------------------------------- reduction


def _month_starts(leap: bool) -> np.ndarray:
    days = sky.DAYS_IN_MONTH.copy()
    if leap:
        days[1] = 29
    return np.concatenate([[0], np.cumsum(days)])


def _fill_gaps(grid: np.ndarray, what: str, place, notes: list[str]) -> np.ndarray:
    """Fill runs of at most MAX_FILLED_GAP_H missing hours by linear interpolation."""
    flat = grid.ravel().copy()
    missing = ~np.isfinite(flat)
    if not missing.any():
        return grid
    idx = np.flatnonzero(missing)
    runs = np.split(idx, np.flatnonzero(np.diff(idx) > 1) + 1)
    for run in runs:
        if run.size > MAX_FILLED_GAP_H or run[0] == 0 or run[-1] == flat.size - 1:
            raise WeatherFileError(
                f"{place(run[0])}: {what} missing for {run.size} hour(s) up to "
                f"{place(run[-1]).split(': ', 1)[-1]}; offgrid fills gaps of at most "
                f"{MAX_FILLED_GAP_H} hours inside the year: complete the file"
            )
    known = np.flatnonzero(~missing)
    flat[missing] = np.interp(idx, known, flat[known])
    notes.append(
        f"{what}: {idx.size} missing hour(s) in {len(runs)} gap(s) filled by linear "
        f"interpolation, first at {place(idx[0]).split(': ', 1)[-1]}"
    )
    return flat.reshape(grid.shape)


def reduce_hourly(rows: HourlyRows, source: str = "", name: str = "") -> ImportResult:
    """Monthly table and 365-day daily series from hourly rows, with notes on what was done."""
    fname = name or rows.kind
    notes: list[str] = []
    month, day, hour = rows.month, rows.day, rows.hour
    for arr, lo, hi, what in ((month, 1, 12, "month"), (day, 1, 31, "day"), (hour, 0, 24, "hour")):
        bad = np.flatnonzero((arr < lo) | (arr > hi))
        if bad.size:
            i = int(bad[0])
            raise WeatherFileError(
                f"{fname} line {int(rows.line[i])}: {what} {int(arr[i])} is outside {lo}-{hi}"
            )
    if np.any(hour == 0):
        if np.any(hour == 24):
            i = int(np.flatnonzero(hour == 0)[0])
            raise WeatherFileError(
                f"{fname} line {int(rows.line[i])}: hours 0 and 24 both "
                "appear; the hour field must run 1-24 (or 0-23)"
            )
        hour = hour + 1  # hour-beginning 0-23 -> hour-ending 1-24
    leap = bool(np.any((month == 2) & (day == 29)))
    starts = _month_starts(leap)
    dim = np.diff(starts)
    over = np.flatnonzero(day > dim[month - 1])
    if over.size:
        i = int(over[0])
        raise WeatherFileError(
            f"{fname} line {int(rows.line[i])}: day {int(day[i])} does not "
            f"exist in {MONTHS[month[i] - 1]}"
        )
    n_days = int(starts[-1])
    doy0 = starts[month - 1] + day - 1  # 0-based day of year
    slot = doy0 * 24 + (hour - 1)
    order = np.argsort(slot, kind="stable")
    dup = np.flatnonzero(np.diff(slot[order]) == 0)
    if dup.size:
        a, b = order[dup[0]], order[dup[0] + 1]
        raise WeatherFileError(
            f"{fname} lines {int(rows.line[a])} and {int(rows.line[b])}: the same hour "
            f"({MONTHS[month[a] - 1]} {int(day[a])}, hour {int(hour[a])}) appears twice; "
            "offgrid imports hourly files only"
        )

    slot_line = np.zeros(n_days * 24, dtype=int)
    slot_line[slot] = rows.line

    def place(flat_index: int) -> str:
        """'FILE line N: Mon D hour H' (no line when the row itself is missing)."""
        d, h = divmod(int(flat_index), 24)
        m = int(np.searchsorted(starts, d, side="right")) - 1
        line = int(slot_line[int(flat_index)])
        where = f"{fname} line {line}" if line else fname
        return f"{where}: {MONTHS[m]} {d - starts[m] + 1} hour {h + 1}"

    ghi_vals = rows.ghi_w_m2.astype(float).copy()
    temp_vals = rows.temp_air_c.astype(float).copy()
    ghi_vals[np.isin(ghi_vals, GHI_MISSING)] = np.nan
    temp_vals[np.isin(temp_vals, TEMP_MISSING)] = np.nan
    bad = np.flatnonzero(
        np.isfinite(ghi_vals) & ((ghi_vals < 0) | (ghi_vals > MAX_HOURLY_GHI_W_M2))
    )
    if bad.size:
        i = int(bad[0])
        raise WeatherFileError(
            f"{fname} line {int(rows.line[i])}: GHI {ghi_vals[i]:g} is outside 0-"
            f"{MAX_HOURLY_GHI_W_M2:g} W/m2; the column is in another unit or garbled"
        )
    bad = np.flatnonzero(np.isfinite(temp_vals) & ((temp_vals < -90) | (temp_vals > 60)))
    if bad.size:
        i = int(bad[0])
        raise WeatherFileError(
            f"{fname} line {int(rows.line[i])}: dry-bulb temperature {temp_vals[i]:g} is outside "
            "-90 to 60 C; the column is in another unit (tenths of a degree? Fahrenheit?)"
        )
    ghi = np.full(n_days * 24, np.nan)
    temp = np.full(n_days * 24, np.nan)
    ghi[slot] = ghi_vals
    temp[slot] = temp_vals
    absent = np.flatnonzero(np.isnan(ghi) & np.isnan(temp))
    absent = absent[~np.isin(absent, slot)]
    if absent.size:
        runs = np.split(absent, np.flatnonzero(np.diff(absent) > 1) + 1)
        longest = max(runs, key=len)
        if len(rows.month) < 0.5 * n_days * 24 or longest.size > MAX_FILLED_GAP_H:
            before = np.flatnonzero(slot == longest[0] - 1)
            after_line = f" (after line {int(rows.line[before[0]])})" if before.size else ""
            raise WeatherFileError(
                f"{place(longest[0])}{after_line}: {longest.size} hourly row(s) missing up to "
                f"{place(longest[-1]).split(': ', 1)[-1]} ({absent.size} missing in all, "
                f"{len(rows.month)} rows of {n_days * 24}); a full year of hourly rows is needed"
            )
    if np.nanmax(ghi) < 200.0:
        raise WeatherFileError(
            f"{fname}: GHI never exceeds {np.nanmax(ghi):g}; expected W/m2 (hourly Wh/m2), "
            "the column looks like kW/m2 or MJ/m2"
        )
    if np.nanmean(temp) > 40.0:
        raise WeatherFileError(
            f"{fname}: the year's mean dry-bulb temperature is {np.nanmean(temp):.1f}; expected "
            "degrees Celsius (Fahrenheit or tenths of a degree?)"
        )
    ghi = _fill_gaps(ghi.reshape(n_days, 24), "GHI", place, notes)
    temp = _fill_gaps(temp.reshape(n_days, 24), "dry-bulb temperature", place, notes)

    daily_h = ghi.sum(axis=1) / 1000.0
    daily_t = temp.mean(axis=1)
    daily_tmax = temp.max(axis=1)
    daily_tmin = temp.min(axis=1)
    month_of_day = np.repeat(np.arange(12), dim)

    def monthly(v):
        return np.bincount(month_of_day, weights=v, minlength=12) / dim

    keep = np.ones(n_days, bool)
    if leap:
        keep[starts[1] + 28] = False
        notes.append(
            "leap year: 29 February is in the monthly means, left out of the daily "
            "series (365 days)"
        )
    climate = MonthlyClimate(
        insolation_kwh_m2_day=[round(float(x), 3) for x in monthly(daily_h)],
        temp_mean_c=[round(float(x), 2) for x in monthly(daily_t)],
        temp_max_c=[round(float(x), 2) for x in monthly(daily_tmax)],
        temp_min_c=[round(float(x), 2) for x in monthly(daily_tmin)],
        record_low_c=round(float(temp.min()), 1),
        source=source,
        latitude_deg=rows.latitude_deg,
        longitude_deg=rows.longitude_deg,
        elevation_m=rows.elevation_m,
        demo=False,
        daily=DailyClimate(
            insolation_kwh_m2_day=[round(float(x), 3) for x in daily_h[keep]],
            temp_mean_c=[round(float(x), 1) for x in daily_t[keep]],
            temp_max_c=[round(float(x), 1) for x in daily_tmax[keep]],
            temp_min_c=[round(float(x), 1) for x in daily_tmin[keep]],
        ),
    )
    notes.append(
        f"record_low_c {climate.record_low_c:g} C is the coldest hour of this one year; the "
        "coldest temperature on record at the site is usually lower: set it from local records"
    )
    return ImportResult(
        climate=climate, kind=rows.kind, name=_slug(rows.station or fname), notes=tuple(notes)
    )


def _slug(text: str) -> str:
    s = re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-")
    return s or "imported"


# ----------------------------------------------------------------------------- monthly CSV

_MONTH_WORDS = {m.lower(): i for i, m in enumerate(MONTHS, start=1)}
#: Accepted insolation column names and the unit each means.
INSOLATION_COLUMNS = {
    "insolation_kwh_m2_day": "kWh/m2/day",
    "insolation_mj_m2_day": "MJ/m2/day",
    "insolation_kwh_m2_month": "kWh/m2/month",
    "insolation_mj_m2_month": "MJ/m2/month",
    "insolation_w_m2": "W/m2",
    "insolation_wh_m2_day": "Wh/m2/day",
}
_META_KEYS = ("latitude_deg", "longitude_deg", "elevation_m", "record_low_c")


def read_monthly_csv(path: str | Path, unit: str | None = None) -> tuple[MonthlyClimate, str]:
    """Read a monthly CSV: ``# key = value`` lines, a header, twelve rows.

    Header: ``month`` and one insolation column (see :data:`INSOLATION_COLUMNS`),
    ``temp_mean_c``, optional ``temp_max_c`` and ``temp_min_c``.  ``month`` is
    1-12 or Jan..Dec.  Before the header, ``# latitude_deg = 12.3`` lines (also
    longitude_deg, elevation_m, record_low_c, source, name) give the metadata.
    ``unit`` overrides the unit that the column name says.

    Returns the climate and the name given in the file (or "").
    """
    path = Path(path)
    _need_file(path)
    text = path.read_text(encoding="utf-8-sig", errors="replace")
    meta: dict[str, str] = {}
    body: list[tuple[int, str]] = []
    for n, line in enumerate(text.splitlines(), start=1):
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            key, sep, value = stripped.lstrip("#").partition("=")
            if not sep:
                key, sep, value = stripped.lstrip("#").partition(":")
            if sep and key.strip().lower() in (*_META_KEYS, "source", "name"):
                meta[key.strip().lower()] = value.strip()
            continue
        body.append((n, line))
    if not body:
        raise WeatherFileError(f"{path.name}: no header row (month, insolation_kwh_m2_day, ...)")
    reader = csv.reader(io.StringIO("\n".join(line for _, line in body)))
    rows = list(reader)
    header = [h.strip().lower() for h in rows[0]]
    head_line = body[0][0]
    if "month" not in header:
        raise WeatherFileError(f"{path.name} line {head_line}: the header needs a 'month' column")
    ins_cols = [h for h in header if h in INSOLATION_COLUMNS]
    if len(ins_cols) != 1:
        raise WeatherFileError(
            f"{path.name} line {head_line}: the header needs exactly one insolation column, "
            f"one of {', '.join(INSOLATION_COLUMNS)}"
        )
    if "temp_mean_c" not in header:
        raise WeatherFileError(f"{path.name} line {head_line}: the header needs 'temp_mean_c'")
    cols = {h: i for i, h in enumerate(header)}
    values: dict[str, list[float | None]] = {
        k: [None] * 12 for k in (ins_cols[0], "temp_mean_c", "temp_max_c", "temp_min_c")
    }
    seen: dict[int, int] = {}
    for (n, _), row in zip(body[1:], rows[1:], strict=True):
        if len(row) < len(header):
            raise WeatherFileError(
                f"{path.name} line {n}: {len(row)} fields, the header has {len(header)}"
            )
        mtext = row[cols["month"]].strip().lower()
        month = _MONTH_WORDS.get(mtext[:3]) if not mtext.isdigit() else int(mtext)
        if month is None or not 1 <= month <= 12:
            raise WeatherFileError(
                f"{path.name} line {n}: month '{row[cols['month']]}' is not 1-12 or Jan-Dec"
            )
        if month in seen:
            raise WeatherFileError(
                f"{path.name} line {n}: {MONTHS[month - 1]} repeats line {seen[month]}"
            )
        seen[month] = n
        for key in values:
            if key not in cols:
                continue
            cell = row[cols[key]].strip()
            try:
                v = float(cell.replace(",", "."))
            except ValueError:
                raise WeatherFileError(
                    f"{path.name} line {n}: {key} '{cell}' is not a number"
                ) from None
            if not np.isfinite(v):
                raise WeatherFileError(f"{path.name} line {n}: {key} '{cell}' is not finite")
            values[key][month - 1] = v
    missing = [MONTHS[m] for m in range(12) if m + 1 not in seen]
    if missing:
        raise WeatherFileError(
            f"{path.name}: months missing: {', '.join(missing)}; twelve rows are needed"
        )
    meta_num: dict[str, float | None] = {}
    for key in _META_KEYS:
        if key in meta:
            try:
                meta_num[key] = float(meta[key])
            except ValueError:
                raise WeatherFileError(
                    f"{path.name}: {key} '{meta[key]}' is not a number"
                ) from None
        else:
            meta_num[key] = None
    if meta_num["latitude_deg"] is not None:
        try:
            validate_location(
                meta_num["latitude_deg"],
                meta_num["longitude_deg"],
                meta_num["elevation_m"],
                where=path.name,
            )
        except ValueError as exc:
            raise WeatherFileError(str(exc)) from None
    ins_unit = unit or INSOLATION_COLUMNS[ins_cols[0]]
    try:
        insolation = convert_insolation(values[ins_cols[0]], ins_unit)  # type: ignore[arg-type]
    except ValueError as exc:
        raise WeatherFileError(f"{path.name}: {exc}") from None
    climate = MonthlyClimate(
        insolation_kwh_m2_day=[round(v, 3) for v in insolation],
        temp_mean_c=[float(v) for v in values["temp_mean_c"]],  # type: ignore[arg-type]
        temp_max_c=None if "temp_max_c" not in cols else [float(v) for v in values["temp_max_c"]],  # type: ignore[arg-type]
        temp_min_c=None if "temp_min_c" not in cols else [float(v) for v in values["temp_min_c"]],  # type: ignore[arg-type]
        record_low_c=meta_num["record_low_c"],
        source=meta.get("source", f"monthly CSV {path.name}"),
        latitude_deg=meta_num["latitude_deg"],
        longitude_deg=meta_num["longitude_deg"],
        elevation_m=meta_num["elevation_m"],
    )
    return climate, meta.get("name", "")


# ----------------------------------------------------------------------------- entry point


def _need_file(path: Path) -> None:
    if path.is_dir():
        raise WeatherFileError(f"{path}: is a folder, not a weather file; give the file itself")
    if path.exists() and not path.is_file():
        raise WeatherFileError(
            f"{path}: is not a regular file (a pipe or a device); give a saved weather file"
        )
    if not path.is_file():
        raise WeatherFileError(f"{path}: no such file; check the folder and the file name")


def import_weather_file(
    path: str | Path, kind: str | None = None, unit: str | None = None, clear_sky: bool = True
) -> ImportResult:
    """Import any supported file; the result carries the plausibility findings.

    ``unit`` applies to a monthly CSV's insolation column only.
    """
    try:
        return _import_weather_file(Path(path), kind, unit, clear_sky)
    except OSError as exc:
        raise WeatherFileError(
            f"{path}: cannot be read: {exc.strerror or exc}; check the file's permissions"
        ) from None


def _import_weather_file(
    path: Path, kind: str | None, unit: str | None, clear_sky: bool
) -> ImportResult:
    _need_file(path)
    kind = kind or detect_kind(path)
    if kind == "monthly-csv":
        climate, name = read_monthly_csv(path, unit=unit)
        result = ImportResult(climate=climate, kind=kind, name=_slug(name or path.stem))
    else:
        rows = read_hourly(path, kind)
        label = _KIND_LABEL[kind]
        station = f" ({rows.station})" if rows.station else ""
        source = f"{label} file {path.name}{station}, reduced by offgrid climate import"
        result = reduce_hourly(rows, source=source, name=path.name)
    findings = tuple(check_climate(result.climate, clear_sky=clear_sky))
    return ImportResult(
        climate=result.climate,
        kind=result.kind,
        name=result.name,
        notes=result.notes,
        findings=findings,
    )


def _station_name(meta: dict) -> str:
    """TMY3 station as 'NAME, STATE' (quotes and stray separators removed)."""
    name = str(meta.get("Name", "")).strip(chr(34)).strip()
    return f"{name}, {meta.get('State', '')}".strip(", ")
