"""Helpers for the climate tests: paths to pvlib's sample files, an EPW writer, raw readers.

The raw readers parse the files with the standard library only, independently
of pvlib and of offgrid's importer, so the importer can be checked against them.
"""

from __future__ import annotations

import csv
from pathlib import Path

import numpy as np

DAYS = np.array([31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31])


def pvlib_data() -> Path:
    import pvlib

    return Path(pvlib.__file__).resolve().parent / "data"


TMY3_GREENSBORO = "723170TYA.CSV"  # NREL TMY3 sample shipped with pvlib
TMY3_SAND_POINT = "703165TY.csv"  # NREL TMY3 sample shipped with pvlib
TMY2_MIAMI = "12839.tm2"  # NREL TMY2 sample shipped with pvlib


def raw_tmy3(path: Path) -> dict[str, np.ndarray]:
    """Month, day, hour, GHI [Wh/m2] and dry bulb [C] straight from a TMY3 CSV."""
    with path.open(newline="") as fh:
        rows = list(csv.reader(fh))[2:]
    month = np.array([int(r[0][:2]) for r in rows])
    day = np.array([int(r[0][3:5]) for r in rows])
    hour = np.array([int(r[1][:2]) for r in rows])
    header = []
    with path.open(newline="") as fh:
        header = list(csv.reader(fh))[1]
    gi = header.index("GHI (W/m^2)")
    ti = header.index("Dry-bulb (C)")
    return {
        "month": month,
        "day": day,
        "hour": hour,
        "ghi": np.array([float(r[gi]) for r in rows]),
        "temp": np.array([float(r[ti]) for r in rows]),
    }


def raw_tmy2(path: Path) -> dict[str, np.ndarray]:
    """The same from a TMY2 file's fixed columns (NREL TMY2 user's manual, table 2-2).

    Characters (1-based): month 4-5, day 6-7, hour 8-9, global horizontal 18-21 (Wh/m2),
    dry bulb 68-71 (tenths of a degree C).
    """
    lines = path.read_text().splitlines()[1:]
    return {
        "month": np.array([int(s[3:5]) for s in lines]),
        "day": np.array([int(s[5:7]) for s in lines]),
        "hour": np.array([int(s[7:9]) for s in lines]),
        "ghi": np.array([float(s[17:21]) for s in lines]),
        "temp": np.array([float(s[67:71]) / 10.0 for s in lines]),
    }


def monthly_from_raw(raw: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """Monthly mean daily insolation [kWh/m2/day], mean, mean daily max and min [C]."""
    out = {
        "insolation": np.zeros(12),
        "mean": np.zeros(12),
        "max": np.zeros(12),
        "min": np.zeros(12),
    }
    for m in range(1, 13):
        sel = raw["month"] == m
        out["insolation"][m - 1] = raw["ghi"][sel].sum() / 1000.0 / DAYS[m - 1]
        out["mean"][m - 1] = raw["temp"][sel].mean()
        days = raw["day"][sel]
        temps = raw["temp"][sel]
        out["max"][m - 1] = np.mean([temps[days == d].max() for d in np.unique(days)])
        out["min"][m - 1] = np.mean([temps[days == d].min() for d in np.unique(days)])
    return out


EPW_HEADER = [
    "LOCATION,Test Town,XX,ZZZ,invented test file,000000,{lat},{lon},{tz},{elev}",
    "DESIGN CONDITIONS,0",
    "TYPICAL/EXTREME PERIODS,0",
    "GROUND TEMPERATURES,0",
    "HOLIDAYS/DAYLIGHT SAVINGS,No,0,0,0",
    "COMMENTS 1,written by the offgrid test suite from an NREL TMY3 sample",
    "COMMENTS 2,",
    "DATA PERIODS,1,1,Data,Sunday, 1/ 1,12/31",
]


def write_epw(
    path: Path,
    raw: dict[str, np.ndarray],
    lat=36.1,
    lon=-79.95,
    tz=-5.0,
    elev=273.0,
    year=1990,
    header_lines: int = 8,
) -> Path:
    """An EPW file (EnergyPlus weather format, 35 fields a row) holding ``raw``'s hours."""
    head = [h.format(lat=lat, lon=lon, tz=tz, elev=elev) for h in EPW_HEADER[:header_lines]]
    if header_lines < 8:
        head[-1] = EPW_HEADER[-1]
    rows = []
    for mo, dy, hr, g, t in zip(
        raw["month"], raw["day"], raw["hour"], raw["ghi"], raw["temp"], strict=True
    ):
        fields = [
            year,
            mo,
            dy,
            hr,
            60,
            "?9?9?9?9E0?9?9?9?9?9?9?9?9?9?9?9?9?9?9?9*9*9?9?9?9",
            f"{t:.1f}",
            "5.0",
            "70",
            "101300",
            "0",
            "0",
            "300",
            f"{g:.0f}",
            "0",
            "0",
            "0",
            "0",
            "0",
            "0",
            "180",
            "2.0",
            "5",
            "5",
            "777.7",
            "77777",
            "9",
            "999999999",
            "10",
            "0.1",
            "0",
            "88",
            "0.2",
            "0",
            "0",
        ]
        rows.append(",".join(str(f) for f in fields))
    path.write_text("\n".join(head + rows) + "\n")
    return path
