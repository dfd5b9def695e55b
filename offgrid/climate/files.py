"""Climate files of our own format (TOML), bundled in the top-level ``climates/`` folder.

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
"""

from __future__ import annotations

import os
import tomllib
from pathlib import Path

from offgrid.paths import climates_dir
from offgrid.project.model import MonthlyClimate

CLIMATE_FORMAT = "offgrid-climate"
CLIMATE_SCHEMA = 1
SUFFIX = ".toml"


class ClimateFileError(ValueError):
    """A climate file is missing or malformed; the message names the field."""


def bundled_climates() -> dict[str, Path]:
    """Names and paths of the climates shipped in ``climates/``."""
    folder = climates_dir()
    if not folder.is_dir():
        return {}
    return {p.stem: p for p in sorted(folder.glob(f"*{SUFFIX}"))}


def resolve_climate(ref: str, base: Path | None = None) -> Path:
    """Find a climate by bundled name, or by path (relative to ``base``, the project folder)."""
    candidates = []
    p = Path(ref).expanduser()
    if p.is_absolute():
        candidates.append(p)
    else:
        if base is not None:
            candidates.append(base / p)
        candidates.append(Path.cwd() / p)
    candidates.append(climates_dir() / (ref if ref.endswith(SUFFIX) else ref + SUFFIX))
    for c in candidates:
        if c.is_file():
            return c
    names = ", ".join(bundled_climates()) or "none"
    raise ClimateFileError(
        f"climate '{ref}' not found: give a file path or one of the bundled climates ({names})"
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
        out.append(float(v))
    return out


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
        source=str(data.get("source", "")),
        latitude_deg=_number(data, "latitude_deg", where),
        longitude_deg=_number(data, "longitude_deg", where),
        elevation_m=_number(data, "elevation_m", where),
        demo=bool(data.get("demo", False)),
    )
    for i, h in enumerate(climate.insolation_kwh_m2_day, start=1):
        if h < 0 or h > 12:
            raise ClimateFileError(
                f"{sub}.insolation_kwh_m2_day[{i}]: {h} is outside 0-12 kWh/m2/day; "
                "check the unit (MJ/m2/day divided by 3.6 gives kWh/m2/day)"
            )
    for i, t in enumerate(climate.temp_mean_c, start=1):
        if t < -70 or t > 55:
            raise ClimateFileError(f"{sub}.temp_mean_c[{i}]: {t} C is not a plausible monthly mean")
    return climate


def _number(data: dict, key: str, where: str) -> float | None:
    if key not in data:
        return None
    v = data[key]
    if isinstance(v, bool) or not isinstance(v, int | float):
        raise ClimateFileError(f"{where}.{key}: '{v}' is not a number")
    return float(v)


def load_climate(ref: str | os.PathLike, base: Path | None = None) -> MonthlyClimate:
    """Read a climate file by bundled name or path."""
    path = resolve_climate(str(ref), base)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        raise ClimateFileError(f"{path}: not valid TOML ({exc})") from exc
    if data.get("format") != CLIMATE_FORMAT:
        raise ClimateFileError(f"{path}: format must be '{CLIMATE_FORMAT}'")
    schema = data.get("schema", 1)
    if not isinstance(schema, int) or schema > CLIMATE_SCHEMA:
        raise ClimateFileError(
            f"{path}: schema {schema} is newer than this offgrid reads ({CLIMATE_SCHEMA}); "
            "update offgrid"
        )
    return climate_from_dict(data, where=path.name)


def climate_to_dict(climate: MonthlyClimate, name: str = "") -> dict:
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
    body["monthly"] = monthly
    return body


def save_climate(climate: MonthlyClimate, path: Path, name: str = "") -> Path:
    """Write a climate file atomically."""
    import tomli_w

    from offgrid.project.store import atomic_write_text

    atomic_write_text(path, tomli_w.dumps(climate_to_dict(climate, name)))
    return path
