"""Climate files of our own format (TOML): bundled in the top-level ``climates/`` folder, and
the user's own in ``offgrid.paths.user_climates_dir()`` (written by ``offgrid climate import``).

Format (schema 1)::

    format = "offgrid-climate"
    schema = 1
    name = "Short name"
    source = "Where the numbers came from"
    demo = false                # true: invented demonstration data
    latitude_deg = 12.5
    longitude_deg = -1.5
    elevation_m = 300
    record_low_c = 8.0          # lowest temperature expected (cold open-circuit voltage)

    [monthly]                   # twelve values each, January first
    insolation_kwh_m2_day = [...]   # mean daily global horizontal
    temp_mean_c = [...]
    temp_max_c = [...]          # mean daily maximum
    temp_min_c = [...]          # mean daily minimum
    albedo = 0.2                # optional ground reflectance: one value or twelve (snow)

    [daily]                     # optional: one value per day of a 365-day year
    insolation_kwh_m2_day = [...]   # daily global horizontal, 1 January first
    temp_mean_c = [...]
    temp_max_c = [...]
    temp_min_c = [...]

The full description is in docs/climate-format.md.
"""

from __future__ import annotations

import copy
import math
import os
import threading
import time
import tomllib
from dataclasses import dataclass
from pathlib import Path

from offgrid.climate.model import DailyClimate, MonthlyClimate
from offgrid.numbers import is_finite_number
from offgrid.paths import climates_dir, user_climates_dir

CLIMATE_FORMAT = "offgrid-climate"
CLIMATE_SCHEMA = 1
SUFFIX = ".toml"
DAYS_IN_YEAR = 365
DAILY_KEYS = ("insolation_kwh_m2_day", "temp_mean_c", "temp_max_c", "temp_min_c")
#: Plausible bounds of the daily values (a clear high-altitude summer day reaches about 10).
DAILY_BOUNDS = {
    "insolation_kwh_m2_day": (0.0, 15.0),
    "temp_mean_c": (-90.0, 60.0),
    "temp_max_c": (-90.0, 65.0),
    "temp_min_c": (-95.0, 60.0),
}


#: Largest climate file read (one with its 365-day series is about 50 kB).
MAX_CLIMATE_BYTES = 1_000_000


class ClimateFileError(ValueError):
    """A climate file is missing or malformed; the message names the field."""


def bundled_climates() -> dict[str, Path]:
    """Names and paths of the climates shipped in ``climates/``."""
    folder = climates_dir()
    if not folder.is_dir():
        return {}
    return {p.stem: p for p in sorted(folder.glob(f"*{SUFFIX}"))}


def user_climates() -> dict[str, Path]:
    """Names and paths of the user's own climates (a bundled name is never shadowed)."""
    folder = user_climates_dir()
    if not folder.is_dir():
        return {}
    bundled = bundled_climates()
    return {
        p.stem: p
        for p in sorted(folder.glob(f"*{SUFFIX}"))
        if p.is_file() and p.stem not in bundled
    }


#: Mean radius of the Earth, km (IUGG, Moritz 2000, Geodetic Reference System 1980).
EARTH_RADIUS_KM = 6371.0


def distance_km(lat1_deg: float, lon1_deg: float, lat2_deg: float, lon2_deg: float) -> float:
    """Great-circle distance on a sphere [km] (haversine formula)."""
    p1, p2 = math.radians(lat1_deg), math.radians(lat2_deg)
    dp, dl = p2 - p1, math.radians(lon2_deg - lon1_deg)
    a = math.sin(dp / 2) ** 2 + math.cos(p1) * math.cos(p2) * math.sin(dl / 2) ** 2
    return 2.0 * EARTH_RADIUS_KM * math.asin(min(1.0, math.sqrt(a)))


@dataclass(frozen=True)
class ClimateEntry:
    """One climate of the library, for listings and pickers (read from the file's header)."""

    name: str  # what a project's ``[climate] ref`` says: the file name without .toml
    path: Path
    origin: str  # "bundled" or "yours"
    title: str  # the display name in the file (``name = ...``), else ``name``
    source: str = ""
    demo: bool = False
    latitude_deg: float | None = None
    longitude_deg: float | None = None
    elevation_m: float | None = None
    daily: bool = False
    error: str = ""  # why the file cannot be read ("" when it can)
    distance_km: float | None = None  # from the site given to climate_library(near=...)


def _entry(name: str, path: Path, origin: str, near: tuple[float, float] | None) -> ClimateEntry:
    h = climate_header(path)
    lat, lon = h.get("latitude_deg"), h.get("longitude_deg")
    number = (int, float)
    ok = isinstance(lat, number) and isinstance(lon, number) and not isinstance(lat, bool)
    dist = distance_km(near[0], near[1], float(lat), float(lon)) if near and ok else None
    return ClimateEntry(
        name=name,
        path=path,
        origin=origin,
        title=str(h.get("name") or name),
        source=str(h.get("source", "")),
        demo=bool(h.get("demo", False)),
        latitude_deg=float(lat) if ok else None,
        longitude_deg=float(lon) if ok else None,
        elevation_m=h.get("elevation_m") if isinstance(h.get("elevation_m"), number) else None,
        daily=bool(h.get("daily", False)),
        error=str(h.get("error", "")),
        distance_km=dist,
    )


def climate_library(near: tuple[float, float] | None = None) -> list[ClimateEntry]:
    """Every climate known by name: the bundled ones, then the user's.

    ``near`` (latitude, longitude in degrees) fills ``distance_km`` and sorts the entries by
    distance from that point (climates without coordinates last, by name).
    """
    entries = [_entry(n, p, "bundled", near) for n, p in bundled_climates().items()]
    entries += [_entry(n, p, "yours", near) for n, p in user_climates().items()]
    if near is not None:
        entries.sort(key=lambda e: (e.distance_km is None, e.distance_km or 0.0, e.name))
    return entries


def find_climate(name: str) -> Path | None:
    """A climate by library name (``kisanga-ridge-demo``, with or without ``.toml``): the
    bundled one, else the user's; None when there is none. File paths are not searched (use
    :func:`resolve_climate` for what a user or a project typed)."""
    stem = name.removesuffix(SUFFIX)
    if not stem or "/" in stem or "\\" in stem:
        return None
    return bundled_climates().get(stem) or user_climates().get(stem)


def find_climate_entry(name: str) -> ClimateEntry | None:
    """:func:`find_climate` with the header read (display name, source, origin)."""
    path = find_climate(name)
    if path is None:
        return None
    origin = "bundled" if path.parent == climates_dir() else "yours"
    return _entry(path.stem, path, origin, None)


def known_climate_names() -> str:
    """The names a project can use, for messages: bundled, then the user's marked so."""
    names = list(bundled_climates())
    names += [f"{n} (yours)" for n in user_climates()]
    return ", ".join(names) or "none"


def resolve_climate(ref: str, base: Path | None = None) -> Path:
    """Find a climate by path (relative to ``base``, the project folder, then the current
    folder), else by library name (bundled, then the user's)."""
    candidates = []
    p = Path(ref).expanduser()
    if p.is_absolute():
        candidates.append(p)
    else:
        if base is not None:
            candidates.append(base / p)
        candidates.append(Path.cwd() / p)
    for c in candidates:
        if c.is_file():
            return c
    found = find_climate(ref)
    if found is not None:
        return found
    for c in candidates:
        if c.is_dir():
            raise ClimateFileError(
                f"climate '{ref}' is a folder, not a climate file: give the "
                "file itself or a climate name"
            )
        if c.exists():  # a FIFO, a device or a socket: never opened
            raise ClimateFileError(
                f"climate '{ref}' is not a regular file: give a saved "
                "climate file or a climate name"
            )
    raise ClimateFileError(
        f"climate '{ref}' not found: give a file path or one of the climates "
        f"({known_climate_names()}); see `offgrid climate list`"
    )


def _twelve(table: dict, key: str, where: str, required: bool = True) -> list[float] | None:
    if key not in table:
        if required:
            raise ClimateFileError(f"{where}.{key}: missing; give twelve monthly values")
        return None
    values = table[key]
    if not isinstance(values, list) or len(values) != 12:
        raise ClimateFileError(f"{where}.{key}: needs exactly 12 monthly values, January first")
    out = []
    for i, v in enumerate(values, start=1):
        if isinstance(v, bool) or not isinstance(v, int | float):
            raise ClimateFileError(f"{where}.{key}[{i}]: '{v}' is not a number")
        if not is_finite_number(v):
            raise ClimateFileError(
                f"{where}.{key}[{i}]: '{v}' is not a finite number: give the month's value"
            )
        out.append(float(v))
    return out


def _albedo(table: dict, where: str) -> float | list[float] | None:
    """The optional ground reflectance: one number or twelve (checked with the others)."""
    if "albedo" not in table:
        return None
    value = table["albedo"]
    if isinstance(value, list):
        return [
            v if isinstance(v, bool) or not isinstance(v, int | float) else float(v) for v in value
        ]
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ClimateFileError(
            f"{where}.albedo: '{value}' is not a number; give one ground "
            "reflectance (0-1) or twelve, January first"
        )
    return float(value)


def climate_from_dict(data: dict, where: str = "climate") -> MonthlyClimate:
    """Build a :class:`MonthlyClimate` from a parsed table (file body or inline project table)."""
    monthly = data.get("monthly", data)
    if not isinstance(monthly, dict):
        raise ClimateFileError(f"{where}.monthly: must be a table of twelve-value lists")
    sub = f"{where}.monthly" if "monthly" in data else where
    climate = MonthlyClimate(
        insolation_kwh_m2_day=_twelve(monthly, "insolation_kwh_m2_day", sub) or [],
        temp_mean_c=_twelve(monthly, "temp_mean_c", sub) or [],
        temp_max_c=_twelve(monthly, "temp_max_c", sub, required=False),
        temp_min_c=_twelve(monthly, "temp_min_c", sub, required=False),
        record_low_c=_number(data, "record_low_c", where),
        source=_text(data, "source", where),
        latitude_deg=_number(data, "latitude_deg", where),
        longitude_deg=_number(data, "longitude_deg", where),
        elevation_m=_number(data, "elevation_m", where),
        demo=_flag(data, "demo", where),
        albedo=_albedo(monthly, sub),
    )
    _text(data, "name", where)
    climate.months_to_type = _months_to_type(data, where)
    problems = monthly_climate_problems(climate, where, sub)
    if problems:
        path, message = problems[0]
        raise ClimateFileError(f"{path}: {message}")
    if "daily" in data:
        climate.daily = daily_from_dict(data["daily"], f"{where}.daily")
    return climate


def _months_to_type(data: dict, where: str) -> dict[str, tuple[int, ...]]:
    """The optional ``months_to_type`` table: row -> month numbers still to type."""
    table = data.get("months_to_type")
    if table is None:
        return {}
    if not isinstance(table, dict):
        raise ClimateFileError(
            f"{where}.months_to_type: must be a table of month-number lists "
            "(e.g. temp_mean_c = [1, 2]); remove it once every month is typed"
        )
    out: dict[str, tuple[int, ...]] = {}
    for key, months in table.items():
        if not isinstance(months, list) or not all(
            isinstance(m, int) and not isinstance(m, bool) for m in months
        ):
            raise ClimateFileError(f"{where}.months_to_type.{key}: {_MONTHS_TO_TYPE_FIX}")
        out[key] = tuple(months)
    return out


_MONTHS_TO_TYPE_FIX = (
    "give a list of month numbers 1-12 (January 1) still to type, e.g. [1, 2]; "
    "remove the row once its months are typed"
)


def months_to_type_problems(
    climate: MonthlyClimate, where: str = "climate"
) -> list[tuple[str, str]]:
    """Problems with :attr:`MonthlyClimate.months_to_type`: (dotted path, message with the fix)."""
    from offgrid.climate.model import ROWS_TO_TYPE

    out: list[tuple[str, str]] = []
    for key, months in climate.months_to_type.items():
        path = f"{where}.months_to_type.{key}"
        if key not in ROWS_TO_TYPE:
            rows = " or ".join(f"{k} ({word})" for k, word in ROWS_TO_TYPE.items())
            out.append((path, f"not a row whose months can wait to be typed: give {rows}"))
        elif any(isinstance(m, bool) or not isinstance(m, int) or not 1 <= m <= 12 for m in months):
            out.append((path, _MONTHS_TO_TYPE_FIX))
    return out


#: Plausible ranges of a climate's values: key -> (low, high, unit, hint when out of range).
MONTHLY_BOUNDS = {
    "insolation_kwh_m2_day": (
        0.0,
        12.0,
        "kWh/m2/day",
        "; check the unit (MJ/m2/day divided by 3.6 gives kWh/m2/day)",
    ),
    "temp_mean_c": (-70.0, 55.0, "C", " for a monthly mean"),
    "temp_max_c": (-70.0, 65.0, "C", " for a monthly mean daily maximum"),
    "temp_min_c": (-90.0, 55.0, "C", " for a monthly mean daily minimum"),
}
SITE_BOUNDS = {
    "latitude_deg": (-90.0, 90.0, "degrees", ", north positive"),
    "longitude_deg": (-180.0, 180.0, "degrees", ", east positive"),
    "elevation_m": (-430.0, 9000.0, "m", " above sea level"),
    "record_low_c": (-90.0, 40.0, "C", " for the lowest temperature on record"),
}


def _span(lo: float, hi: float) -> str:
    return f"{lo:g}-{hi:g}" if lo >= 0 else f"{lo:g} to {hi:g}"


def monthly_climate_problems(
    climate: MonthlyClimate, where: str = "climate", sub: str | None = None
) -> list[tuple[str, str]]:
    """Every problem with a climate table as (dotted path, message with the fix)."""
    import math

    from offgrid.climate.sky import albedo_problems

    sub = sub or f"{where}.monthly"
    out: list[tuple[str, str]] = []
    for key, (lo, hi, unit, hint) in MONTHLY_BOUNDS.items():
        values = getattr(climate, key)
        if values is None:
            continue
        if len(values) != 12:
            out.append(
                (
                    f"{sub}.{key}",
                    f"needs exactly 12 monthly values, January first (has {len(values)})",
                )
            )
            continue
        for i, v in enumerate(values, start=1):
            if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v):
                out.append(
                    (
                        f"{sub}.{key}[{i}]",
                        f"'{v}' is not a number: give the month's value in {unit}",
                    )
                )
            elif not lo <= v <= hi:
                out.append((f"{sub}.{key}[{i}]", f"{v:g} is outside {_span(lo, hi)} {unit}{hint}"))
    out.extend(albedo_problems(getattr(climate, "albedo", None), f"{sub}.albedo"))
    out.extend(months_to_type_problems(climate, where))
    if out:
        return out
    mean = climate.temp_mean_c
    for key, sign, word in (("temp_max_c", 1, "below"), ("temp_min_c", -1, "above")):
        values = getattr(climate, key)
        for i, (v, m) in enumerate(zip(values or (), mean, strict=False), start=1):
            if sign * (v - m) < -0.05:
                out.append(
                    (
                        f"{sub}.{key}[{i}]",
                        f"{v:g} C is {word} the month's mean {m:g} C: "
                        "check the columns are not swapped",
                    )
                )
    for key, (lo, hi, unit, hint) in SITE_BOUNDS.items():
        v = getattr(climate, key)
        if v is None:
            continue
        if not math.isfinite(v):
            out.append((f"{where}.{key}", f"'{v}' is not a number: give it in {unit}{hint}"))
        elif not lo <= v <= hi:
            out.append((f"{where}.{key}", f"{v:g} is outside {_span(lo, hi)} {unit}{hint}"))
    low = climate.record_low_c
    if low is not None and math.isfinite(low) and mean and low > min(mean) + 0.05:
        out.append(
            (
                f"{where}.record_low_c",
                f"{low:g} C is above the coldest monthly mean "
                f"({min(mean):g} C): give the lowest temperature "
                "on record",
            )
        )
    return out


def daily_from_dict(table: object, where: str = "daily") -> DailyClimate:
    """The optional 365-day series (imported weather years keep it for the simulation)."""
    if not isinstance(table, dict):
        raise ClimateFileError(f"{where}: must be a table of 365-value lists")
    values: dict[str, list[float]] = {}
    for key in DAILY_KEYS:
        series = table.get(key)
        if not isinstance(series, list) or len(series) != DAYS_IN_YEAR:
            got = len(series) if isinstance(series, list) else "none"
            raise ClimateFileError(
                f"{where}.{key}: needs {DAYS_IN_YEAR} daily values, 1 January "
                f"first, 29 February left out (got {got})"
            )
        lo, hi = DAILY_BOUNDS[key]
        out = []
        for i, v in enumerate(series, start=1):
            if isinstance(v, bool) or not isinstance(v, int | float) or not lo <= v <= hi:
                raise ClimateFileError(
                    f"{where}.{key}[{i}]: '{v}' is not a number in {lo:g} to {hi:g}"
                )
            out.append(float(v))
        values[key] = out
    return DailyClimate(**values)


def _number(data: dict, key: str, where: str) -> float | None:
    if key not in data:
        return None
    v = data[key]
    if isinstance(v, bool) or not isinstance(v, int | float):
        raise ClimateFileError(f"{where}.{key}: '{v}' is not a number")
    if not is_finite_number(v):
        raise ClimateFileError(f"{where}.{key}: '{v}' is not a finite number")
    return float(v)


def _text(data: dict, key: str, where: str) -> str:
    v = data.get(key, "")
    if not isinstance(v, str):
        raise ClimateFileError(f'{where}.{key}: must be text in quotes, e.g. {key} = "..."')
    return v


def _flag(data: dict, key: str, where: str) -> bool:
    v = data.get(key, False)
    if not isinstance(v, bool):
        raise ClimateFileError(f"{where}.{key}: '{v}' must be true or false")
    return v


#: What :func:`load_climate` read, by the file's identity on disk (see ``_file_key``).
_READ_CACHE: dict[tuple, MonthlyClimate] = {}
_READ_CACHE_LIMIT = 32
_READ_CACHE_LOCK = threading.Lock()  # designs run on worker threads too


def clear_climate_cache() -> None:
    """Forget every climate file read (the next read of each goes to the disk)."""
    with _READ_CACHE_LOCK:
        _READ_CACHE.clear()


#: A file changed less than this long ago is read every time: two writes within one tick
#: of the file system's clock can leave the same times and size (as git's "racy" files).
_SETTLED_NS = 2_000_000_000


def _file_key(path: Path) -> tuple | None:
    """The file as it is on disk now: resolved path, inode, modification and change times
    in ns, size (any write, or a file put in its place, changes one of them); None when
    it cannot be looked at or changed too recently to tell (``_SETTLED_NS``)."""
    try:
        st = os.stat(path)
    except OSError:
        return None
    if time.time_ns() - st.st_mtime_ns < _SETTLED_NS:
        return None
    return (str(path.resolve()), st.st_ino, st.st_mtime_ns, st.st_ctime_ns, st.st_size)


def load_climate(ref: str | os.PathLike, base: Path | None = None) -> MonthlyClimate:
    """Read a climate file by bundled name or path.

    A file unchanged on disk since it was last read is not read and parsed again (the
    text UI designs after every edit); each call returns a copy of its own, so a caller
    may change it. A file that could not be read is never kept.
    """
    path = resolve_climate(str(ref), base)
    key = _file_key(path)
    with _READ_CACHE_LOCK:
        kept = _READ_CACHE.get(key) if key is not None else None
    if kept is not None:
        return copy.deepcopy(kept)
    climate = _read_climate(path)
    if key is not None:
        with _READ_CACHE_LOCK:
            if len(_READ_CACHE) >= _READ_CACHE_LIMIT:
                _READ_CACHE.pop(next(iter(_READ_CACHE)))  # the oldest read
            _READ_CACHE[key] = copy.deepcopy(climate)
    return climate


def _read_climate(path: Path) -> MonthlyClimate:
    """Read and check one climate file (no cache)."""
    from offgrid import textfile
    from offgrid.textfile import TextFileError

    try:
        data = tomllib.loads(textfile.read_text(path, MAX_CLIMATE_BYTES).removeprefix("\ufeff"))
    except TextFileError as exc:
        raise ClimateFileError(f"{path}: {exc}") from None
    except RecursionError:
        raise ClimateFileError(
            f"{path}: tables or lists nested far too deep: not a climate file"
        ) from None
    except tomllib.TOMLDecodeError as exc:
        raise ClimateFileError(f"{path}: not valid TOML ({exc}); fix the syntax there") from exc
    if data.get("format") != CLIMATE_FORMAT:
        raise ClimateFileError(
            f"{path}: not an offgrid climate file: it must start with the line "
            f'format = "{CLIMATE_FORMAT}" (import weather files with '
            "`offgrid climate import`)"
        )
    schema = data.get("schema", 1)
    if not isinstance(schema, int) or schema > CLIMATE_SCHEMA:
        raise ClimateFileError(
            f"{path}: schema {schema} is newer than this offgrid reads ({CLIMATE_SCHEMA}); "
            "update offgrid"
        )
    return climate_from_dict(data, where=path.name)


def climate_to_dict(climate: MonthlyClimate, name: str = "", include_daily: bool = True) -> dict:
    """The file body for :func:`save_climate` (also used to embed a climate in a project)."""
    body: dict = {"format": CLIMATE_FORMAT, "schema": CLIMATE_SCHEMA}
    if name:
        body["name"] = name
    body["source"] = climate.source
    body["demo"] = climate.demo
    for key in ("latitude_deg", "longitude_deg", "elevation_m", "record_low_c"):
        value = getattr(climate, key)
        if value is not None:
            body[key] = value
    monthly = {
        "insolation_kwh_m2_day": list(climate.insolation_kwh_m2_day),
        "temp_mean_c": list(climate.temp_mean_c),
    }
    for key in ("temp_max_c", "temp_min_c"):
        value = getattr(climate, key)
        if value is not None:
            monthly[key] = list(value)
    if climate.albedo is not None:
        monthly["albedo"] = (
            list(climate.albedo) if isinstance(climate.albedo, list | tuple) else climate.albedo
        )
    body["monthly"] = monthly
    left = climate.still_to_type()
    if left:
        body["months_to_type"] = {key: list(months) for key, months in left.items()}
    if include_daily and climate.daily is not None:
        body["daily"] = {key: list(getattr(climate.daily, key)) for key in DAILY_KEYS}
    return body


_MONTH_LABELS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
_MONTH_DAYS = (31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31)


def _daily_text(daily: DailyClimate) -> str:
    """The [daily] table, one line per month, so that a person can read it."""
    lines = [
        "",
        "[daily]",
        "# One value per day, 1 January first, 365 days (29 February left out).",
    ]
    for key in DAILY_KEYS:
        series = getattr(daily, key)
        lines.append(f"{key} = [")
        start = 0
        for label, n in zip(_MONTH_LABELS, _MONTH_DAYS, strict=True):
            for first in (0, 16):  # two lines a month: days 1-16 and 17-end
                last = min(n, first + 16)
                chunk = ", ".join(f"{v:g}" for v in series[start + first : start + last])
                lines.append(f"    {chunk}, # {label} {first + 1}-{last}")
            start += n
        lines.append("]")
    return "\n".join(lines) + "\n"


def dumps_climate(climate: MonthlyClimate, name: str = "") -> str:
    """Climate file text: a header comment, the monthly table, the daily series if any."""
    from offgrid.project.toml_out import dumps

    head = (
        "# DEMONSTRATION DATA: invented values for examples and tests only.\n"
        if climate.demo
        else ""
    )
    head += "# offgrid climate file; the format is described in docs/climate-format.md\n"
    body = climate_to_dict(climate, name, include_daily=False)
    monthly = body.pop("monthly")
    text = dumps(body) + "\n[monthly]\n"
    for key, values in monthly.items():
        if not isinstance(values, list):
            text += f"{key} = {values:g}\n"
            continue
        text += f"{key} = [{', '.join(f'{v:g}' for v in values)}]\n"
    if climate.daily is not None:
        text += _daily_text(climate.daily)
    return head + text


def save_climate(climate: MonthlyClimate, path: Path, name: str = "", backup: bool = True) -> Path:
    """Write a climate file atomically (the previous one kept as ``.bak`` if ``backup``)."""
    from offgrid.project.atomic import atomic_write_text

    atomic_write_text(path, dumps_climate(climate, name), backup=backup)
    return path


def climate_header(path: Path) -> dict:
    """Name, source, demo flag and coordinates of a climate file, for listings."""
    from offgrid.textfile import TextFileError, read_text

    try:
        data = tomllib.loads(read_text(path, MAX_CLIMATE_BYTES).removeprefix("\ufeff"))
    except (TextFileError, tomllib.TOMLDecodeError) as exc:
        return {"name": path.stem, "error": str(exc)}
    except RecursionError:
        return {"name": path.stem, "error": "tables or lists nested far too deep"}
    name, source = data.get("name", path.stem), data.get("source", "")
    return {
        "name": name if isinstance(name, str) else path.stem,
        "source": source if isinstance(source, str) else "",
        "demo": bool(data.get("demo", False)),
        "latitude_deg": data.get("latitude_deg"),
        "longitude_deg": data.get("longitude_deg"),
        "elevation_m": data.get("elevation_m"),
        "daily": "daily" in data,
    }
