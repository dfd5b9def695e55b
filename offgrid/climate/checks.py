"""Plausibility checks for a monthly climate table typed or pasted by hand.

Pure functions returning :class:`Finding` records (code, month, message,
suggested fix) that the CLI and the text UI show.  Nothing here raises on
implausible numbers: the person decides.  Checks:

* physical range of the monthly clearness index KT = H / H0 (H0 the
  extraterrestrial insolation averaged over every day of the month, Duffie &
  Beckman eq. 1.10.3):
  KT > 1 is impossible; above 0.8 is clearer than monthly means observed
  (from memory: the Erbs et al. (1982) monthly correlation was fitted on
  0.3 <= KT <= 0.8); below 0.3 the diffuse-fraction correlation extrapolates;
* above the clearest plausible sky: cloudless days every day of the month in
  the cleanest air the site can have (Ineichen-Perez clear sky at the Linke
  turbidity of Ineichen's (2008) conversion with no aerosol and 0.2 cm of
  water vapour, about 1.6; :mod:`offgrid.climate.clearsky`).  The
  climatological turbidity table is a monthly mean and flagged ordinary months
  (a Sahel January of 5.6 kWh/m2/day); this ceiling flags only values no sky
  can give;
* months of a very low sun where the monthly transposition multiplies a tiny
  horizontal value many times over (:func:`check_transposition`);
* unit slips: MJ/m2, kJ/m2, Wh/m2, J/cm2 or langleys instead of kWh/m2; monthly
  totals instead of daily means; 24-hour mean irradiance in W/m2.  A slip is
  reported with every conversion that makes the table physical, best first;
* a table that follows the other hemisphere's seasons;
* temperatures: mean inside min..max, Fahrenheit entered as Celsius, a record
  low above the coldest monthly minimum.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.climate.clearsky import extraterrestrial_monthly_mean_kwh_m2

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
KT_MAX_PHYSICAL = 1.0
KT_HIGH = 0.80  # Erbs et al. (1982) fitted range upper end
KT_LOW = 0.30  # Erbs et al. (1982) fitted range lower end
KT_IMPLAUSIBLY_LOW = 0.10  # common practice, no source: a monthly mean this dull is a slip
TYPICAL_KT = (0.3, 0.75)  # a converted table must look ordinary: common practice, no source
CLEAR_SKY_MARGIN_KWH = 0.05  # rounding of typed values, kWh/m2/day (our choice)
#: The quantity in words, for messages (the file key is in ``Finding.field``).
SUN_WORDS = "sunshine on the horizontal"
TINY_HORIZONTAL_KWH = 0.5  # a "tiny" monthly mean, kWh/m2/day (our choice)
HUGE_TRANSPOSITION = 10.0  # plane over horizontal beyond which a month is flagged (our choice)
LOWEST_LAND_M = -430.0  # Dead Sea shore, about 430 m below sea level (from memory)
HIGHEST_LAND_M = 8850.0  # Everest summit, about 8849 m (from memory)


@dataclass(frozen=True)
class Fix:
    """A suggested correction: apply by replacing the field's values with ``values``."""

    label: str  # e.g. "MJ/m2/day -> kWh/m2/day: divide by 3.6"
    unit: str  # the unit the values were most likely typed in
    values: tuple[float, ...]


@dataclass(frozen=True)
class Finding:
    code: str
    message: str
    severity: str = "warning"  # "info", "warning" or "error"
    field: str = "insolation_kwh_m2_day"
    month: int | None = None  # 1-12, or None for the whole table
    fixes: tuple[Fix, ...] = ()

    @property
    def fix(self) -> Fix | None:
        """The best suggested fix, if any."""
        return self.fixes[0] if self.fixes else None


@dataclass(frozen=True)
class UnitSlip:
    unit: str
    label: str
    convert: Callable[[np.ndarray], np.ndarray]


_DAYS = sky.DAYS_IN_MONTH.astype(float)

#: Units people paste insolation in, with the conversion to kWh/m2/day.
UNIT_SLIPS: tuple[UnitSlip, ...] = (
    UnitSlip("MJ/m2/day", "MJ/m2/day -> kWh/m2/day: divide by 3.6", lambda v: v / 3.6),
    UnitSlip(
        "kWh/m2/month",
        "monthly totals -> daily means: divide by the days in each month",
        lambda v: v / _DAYS,
    ),
    UnitSlip(
        "W/m2", "24-hour mean irradiance W/m2 -> kWh/m2/day: multiply by 0.024", lambda v: v * 0.024
    ),
    UnitSlip(
        "MJ/m2/month",
        "MJ/m2 monthly totals -> kWh/m2/day: divide by 3.6 and by the days",
        lambda v: v / 3.6 / _DAYS,
    ),
    UnitSlip("Wh/m2/day", "Wh/m2/day -> kWh/m2/day: divide by 1000", lambda v: v / 1000.0),
    UnitSlip("kJ/m2/day", "kJ/m2/day -> kWh/m2/day: divide by 3600", lambda v: v / 3600.0),
    UnitSlip("J/cm2/day", "J/cm2/day -> kWh/m2/day: divide by 360", lambda v: v / 360.0),
    UnitSlip(
        "langley/day",
        "cal/cm2/day (langley) -> kWh/m2/day: multiply by 0.01163",
        lambda v: v * 0.01163,
    ),
)


def convert_insolation(values: Sequence[float], unit: str) -> list[float]:
    """Convert twelve monthly values typed in ``unit`` (a name of :data:`UNIT_SLIPS`)."""
    if unit in ("kWh/m2/day", "kwh"):
        return [float(v) for v in values]
    for slip in UNIT_SLIPS:
        if slip.unit.lower() == unit.lower():
            return [float(x) for x in slip.convert(np.asarray(values, dtype=float))]
    names = ", ".join(["kWh/m2/day"] + [s.unit for s in UNIT_SLIPS])
    raise ValueError(f"unit '{unit}' is not known; use one of: {names}")


def _fits(kt: np.ndarray, h0: np.ndarray, ceiling: np.ndarray | None) -> bool:
    lit = h0 > 0.5  # months with some sun
    if not np.any(lit):
        return False
    k = kt[lit]
    if np.any(k > KT_HIGH + 0.05) or np.any(k < KT_IMPLAUSIBLY_LOW):
        return False
    return not (ceiling is not None and np.any(kt[lit] * h0[lit] > ceiling[lit] * 1.05))


def _twelve(values: Sequence[float], field: str) -> tuple[np.ndarray | None, list[Finding]]:
    try:
        arr = np.asarray([float(v) for v in values], dtype=float)
    except (TypeError, ValueError):
        return None, [
            Finding("not-number", f"{field}: every value must be a number", "error", field)
        ]
    if arr.shape != (12,):
        return None, [
            Finding(
                "count",
                f"{field}: needs exactly 12 monthly values, January first (got {arr.size})",
                "error",
                field,
            )
        ]
    found = []
    for m in range(12):
        if not np.isfinite(arr[m]):
            found.append(
                Finding(
                    "not-finite", f"{field} {MONTHS[m]}: not a finite number", "error", field, m + 1
                )
            )
    return (None if found else arr), found


def check_location(
    latitude_deg: float, longitude_deg: float | None = None, elevation_m: float | None = None
) -> list[Finding]:
    """Findings for coordinates outside the Earth's range."""
    out = []
    if not np.isfinite(latitude_deg) or abs(latitude_deg) > 90:
        out.append(
            Finding(
                "latitude",
                f"latitude_deg: {latitude_deg} is outside -90 to 90",
                "error",
                "latitude_deg",
            )
        )
    if longitude_deg is not None and (not np.isfinite(longitude_deg) or abs(longitude_deg) > 180):
        out.append(
            Finding(
                "longitude",
                f"longitude_deg: {longitude_deg} is outside -180 to 180 (east positive)",
                "error",
                "longitude_deg",
            )
        )
    if elevation_m is not None:
        if not np.isfinite(elevation_m) or elevation_m < LOWEST_LAND_M:
            out.append(
                Finding(
                    "elevation",
                    f"elevation_m: {elevation_m} m is below the lowest "
                    f"dry land (about {LOWEST_LAND_M:.0f} m, Dead Sea shore); check "
                    "the sign and the unit (metres)",
                    "error",
                    "elevation_m",
                )
            )
        elif elevation_m > HIGHEST_LAND_M:
            out.append(
                Finding(
                    "elevation",
                    f"elevation_m: {elevation_m} m is above the highest "
                    "summit; check the unit (metres, not feet)",
                    "error",
                    "elevation_m",
                )
            )
    return out


def validate_location(
    latitude_deg: float,
    longitude_deg: float | None = None,
    elevation_m: float | None = None,
    where: str = "site",
) -> None:
    """Raise ValueError naming the field when coordinates are impossible."""
    for f in check_location(latitude_deg, longitude_deg, elevation_m):
        raise ValueError(f"{where}.{f.message}")


def check_insolation(
    values: Sequence[float],
    latitude_deg: float,
    longitude_deg: float | None = None,
    elevation_m: float = 0.0,
    clear_sky: bool = True,
) -> list[Finding]:
    """Check twelve monthly mean daily horizontal insolation values [kWh/m2/day].

    ``clear_sky`` compares with the clearest plausible sky (numpy, a few ms;
    the longitude is not needed and kept for the callers).
    """
    field = "insolation_kwh_m2_day"
    loc = check_location(latitude_deg, longitude_deg, elevation_m)
    if loc:
        return loc
    h, found = _twelve(values, field)
    if h is None:
        return found
    h0 = extraterrestrial_monthly_mean_kwh_m2(latitude_deg)
    kt = np.divide(h, h0, out=np.full(12, np.inf), where=h0 > 1e-6)
    kt = np.where((h0 <= 1e-6) & (h <= 1e-9), 0.0, kt)
    ceiling = None
    if clear_sky:
        from offgrid.climate.clearsky import (
            CEILING_MODEL_MARGIN,
            clearest_linke_turbidity,
            clearest_sky_horizontal_kwh_m2,
        )

        clearest = clearest_sky_horizontal_kwh_m2(latitude_deg, elevation_m)
        ceiling = clearest * (1.0 + CEILING_MODEL_MARGIN)
        linke = clearest_linke_turbidity(elevation_m)
    negative = [m for m in range(12) if h[m] < 0]
    for m in negative:
        found.append(
            Finding(
                "negative",
                f"{SUN_WORDS} in {MONTHS[m]}: {h[m]:g} is negative",
                "error",
                field,
                m + 1,
            )
        )
    if negative:
        return found
    # Unit slips: the table as typed is not physical but a conversion makes it so.
    if not _fits(kt, h0, ceiling):
        fixes = []
        for slip in UNIT_SLIPS:
            cand = slip.convert(h)
            cand_kt = np.divide(cand, h0, out=np.full(12, np.inf), where=h0 > 1e-6)
            cand_kt = np.where((h0 <= 1e-6) & (cand <= 1e-9), 0.0, cand_kt)
            median = float(np.median(cand_kt[h0 > 0.5])) if np.any(h0 > 0.5) else 0.0
            if _fits(cand_kt, h0, ceiling) and TYPICAL_KT[0] <= median <= TYPICAL_KT[1]:
                typical = abs(median - 0.5)
                fixes.append(
                    (typical, Fix(slip.label, slip.unit, tuple(round(float(x), 3) for x in cand)))
                )
        fixes.sort(key=lambda f: f[0])
        if fixes:
            units = " or ".join(f.unit for _, f in fixes)
            found.append(
                Finding(
                    "unit-slip",
                    f"{SUN_WORDS}: these values look like {units}, not kWh/m2/day "
                    f"({fixes[0][1].label})",
                    "error",
                    field,
                    None,
                    tuple(f for _, f in fixes),
                )
            )
            return found
    found.extend(_hemisphere(h, h0, latitude_deg))
    for m in range(12):
        name = MONTHS[m]
        if h0[m] <= 1e-6:
            if h[m] > 1e-9:
                found.append(
                    Finding(
                        "polar-night",
                        f"{SUN_WORDS} in {name}: {h[m]:g} kWh/m2/day "
                        "but the sun does not rise in this month at this latitude",
                        "error",
                        field,
                        m + 1,
                    )
                )
            continue
        if kt[m] > KT_MAX_PHYSICAL:
            found.append(
                Finding(
                    "above-extraterrestrial",
                    f"{SUN_WORDS} in {name}: {h[m]:.2f} kWh/m2/day is more than reaches the top of "
                    "the "
                    f"atmosphere ({h0[m]:.2f}); clearness index {kt[m]:.2f}",
                    "error",
                    field,
                    m + 1,
                )
            )
        elif round(kt[m], 2) > KT_HIGH:
            found.append(
                Finding(
                    "kt-high",
                    f"{SUN_WORDS} in {name}: clearness index {kt[m]:.2f} is above "
                    f"{KT_HIGH}, clearer than monthly means are observed; check the value",
                    "warning",
                    field,
                    m + 1,
                )
            )
        elif round(kt[m], 2) < KT_IMPLAUSIBLY_LOW and h0[m] > 0.5:
            found.append(
                Finding(
                    "kt-very-low",
                    f"{SUN_WORDS} in {name}: clearness index {kt[m]:.2f} is below "
                    f"{KT_IMPLAUSIBLY_LOW}; check the value and the unit",
                    "warning",
                    field,
                    m + 1,
                )
            )
        elif round(kt[m], 2) < KT_LOW and h0[m] > 0.5:
            found.append(
                Finding(
                    "kt-low",
                    f"{SUN_WORDS} in {name}: clearness index {kt[m]:.2f} is below {KT_LOW}, "
                    "outside the fitted range of the monthly diffuse correlation (Erbs et al. "
                    "1982); the plane-of-array estimate is less certain",
                    "info",
                    field,
                    m + 1,
                )
            )
        if (
            ceiling is not None
            and kt[m] <= KT_MAX_PHYSICAL
            and h[m] > ceiling[m] + CLEAR_SKY_MARGIN_KWH
        ):
            found.append(
                Finding(
                    "above-clear-sky",
                    f"{SUN_WORDS} in {name}: {h[m]:.2f} kWh/m2/day is more than a cloudless sky "
                    f"on every day of the month in the clearest plausible air would give "
                    f"({clearest[m]:.2f}; Ineichen-Perez clear sky, Linke turbidity {linke:.1f}); "
                    "check the value",
                    "warning",
                    field,
                    m + 1,
                )
            )
    return found


def check_transposition(
    values: Sequence[float],
    latitude_deg: float,
    tilt_deg: float,
    azimuth_deg: float | None = None,
    albedo=None,
    elevation_m: float = 0.0,
) -> list[Finding]:
    """Months of a very low sun where the monthly method multiplies a tiny horizontal value.

    Flags a month whose horizontal mean is below :data:`TINY_HORIZONTAL_KWH` while
    the Liu-Jordan plane-of-array value is more than :data:`HUGE_TRANSPOSITION`
    times it, or where the plane value had to be held at the clearest-sky
    ceiling on the plane (:mod:`offgrid.climate.poa`).  ``tilt_deg`` is the
    plane's tilt [deg]; the azimuth defaults to equator-facing.
    """
    from offgrid.climate.poa import poa_monthly

    h, found = _twelve(values, "insolation_kwh_m2_day")
    if h is None or np.any(h < 0):
        return found
    az = sky.equator_facing_azimuth(latitude_deg) if azimuth_deg is None else azimuth_deg
    res = poa_monthly(h, latitude_deg, tilt_deg, az, albedo, elevation_m=elevation_m)
    raw = res.uncapped_kwh_m2_day
    factor = np.divide(raw, h, out=np.zeros(12), where=h > 1e-9)
    for m in range(12):
        tiny = 1e-9 < h[m] < TINY_HORIZONTAL_KWH and factor[m] > HUGE_TRANSPOSITION
        if not (tiny or res.capped[m]):
            continue
        held = (
            f"; no sky can bring more than {res.ceiling_kwh_m2_day[m]:.2f} to that plane "
            "(cloudless days in the clearest plausible air), so the array value is held "
            "there"
            if res.capped[m]
            else ""
        )
        found.append(
            Finding(
                "low-sun-transposition",
                f"{SUN_WORDS} in {MONTHS[m]}: {h[m]:.2f} kWh/m2/day becomes {raw[m]:.2f} on a "
                f"plane tilted {float(tilt_deg):g} deg (x{factor[m]:.1f}) by the monthly "
                f"transposition, the noon sun low over the horizon{held}; treat this "
                "month's array figure as uncertain and check it against measured or hourly "
                "data",
                "warning",
                "insolation_kwh_m2_day",
                m + 1,
            )
        )
    return found


def _hemisphere(h: np.ndarray, h0: np.ndarray, latitude_deg: float) -> list[Finding]:
    if abs(latitude_deg) < 20 or np.ptp(h) < 1e-6:
        return []
    mirrored = extraterrestrial_monthly_mean_kwh_m2(-latitude_deg)
    r_same = float(np.corrcoef(h, h0)[0, 1])
    r_other = float(np.corrcoef(h, mirrored)[0, 1])
    if r_same < -0.5 and r_other > 0.8:
        side = "southern" if latitude_deg > 0 else "northern"
        return [
            Finding(
                "hemisphere",
                f"insolation_kwh_m2_day: the values peak in the {side} hemisphere's summer; check "
                f"the sign of the latitude ({latitude_deg:g}) or the month order",
                "warning",
                "insolation_kwh_m2_day",
            )
        ]
    return []


def check_temperatures(
    temp_mean_c: Sequence[float],
    temp_max_c: Sequence[float] | None = None,
    temp_min_c: Sequence[float] | None = None,
    record_low_c: float | None = None,
) -> list[Finding]:
    """Consistency of the monthly temperatures [C]."""
    found: list[Finding] = []
    mean, f = _twelve(temp_mean_c, "temp_mean_c")
    found += f
    tmax = tmin = None
    if temp_max_c is not None:
        tmax, f = _twelve(temp_max_c, "temp_max_c")
        found += f
    if temp_min_c is not None:
        tmin, f = _twelve(temp_min_c, "temp_min_c")
        found += f
    if mean is None:
        return found
    if np.max(mean) > 45 and np.min(mean) > -10:
        fixed = tuple(round((t - 32) / 1.8, 1) for t in mean)
        found.append(
            Finding(
                "fahrenheit",
                "temp_mean_c: monthly means above 45 C look like degrees Fahrenheit",
                "error",
                "temp_mean_c",
                None,
                (Fix("Fahrenheit -> Celsius: (F - 32) / 1.8", "F", fixed),),
            )
        )
        return found
    for m in range(12):
        if tmax is not None and tmax[m] < mean[m]:
            found.append(
                Finding(
                    "max-below-mean",
                    f"temp_max_c {MONTHS[m]}: {tmax[m]:g} C is below the mean {mean[m]:g} C",
                    "error",
                    "temp_max_c",
                    m + 1,
                )
            )
        if tmin is not None and tmin[m] > mean[m]:
            found.append(
                Finding(
                    "min-above-mean",
                    f"temp_min_c {MONTHS[m]}: {tmin[m]:g} C is above the mean {mean[m]:g} C",
                    "error",
                    "temp_min_c",
                    m + 1,
                )
            )
    if record_low_c is not None:
        coldest = float(np.min(tmin if tmin is not None else mean))
        if record_low_c > coldest:
            found.append(
                Finding(
                    "record-low",
                    f"record_low_c: {record_low_c:g} C is above the coldest monthly "
                    f"{'minimum' if tmin is not None else 'mean'} ({coldest:g} C); the cold "
                    "open-circuit voltage would be underestimated",
                    "error",
                    "record_low_c",
                )
            )
    return found


def check_climate(
    climate,
    latitude_deg: float | None = None,
    longitude_deg: float | None = None,
    elevation_m: float | None = None,
    clear_sky: bool = True,
    tilt_deg: float | None = None,
    azimuth_deg: float | None = None,
    albedo=None,
) -> list[Finding]:
    """All checks for a :class:`offgrid.climate.model.MonthlyClimate`.

    The site's coordinates are used where given, else the climate's own.  The
    low-sun transposition check uses ``tilt_deg`` (default: the latitude, at
    least 10 degrees) and ``albedo`` (default: the climate's own, else 0.2).
    """
    lat = climate.latitude_deg if latitude_deg is None else latitude_deg
    lon = climate.longitude_deg if longitude_deg is None else longitude_deg
    elev = climate.elevation_m if elevation_m is None else elevation_m
    found: list[Finding] = []
    if lat is None:
        found.append(
            Finding(
                "no-latitude",
                "latitude_deg: not given, so the insolation cannot "
                "be checked against the sun's geometry",
                "warning",
                "latitude_deg",
            )
        )
    else:
        sun = check_insolation(
            climate.insolation_kwh_m2_day,
            lat,
            lon,
            0.0 if elev is None else elev,
            clear_sky=clear_sky,
        )
        found += sun
        if worst_severity(sun) != "error":
            tilt = max(abs(lat), 10.0) if tilt_deg is None else tilt_deg
            rho = getattr(climate, "albedo", None) if albedo is None else albedo
            found += check_transposition(
                climate.insolation_kwh_m2_day,
                lat,
                tilt,
                azimuth_deg,
                rho,
                0.0 if elev is None else elev,
            )
    found += check_temperatures(
        climate.temp_mean_c, climate.temp_max_c, climate.temp_min_c, climate.record_low_c
    )
    return found


def apply_fix(climate, finding: Finding, choice: int = 0):
    """A copy of the climate with one finding's suggested fix applied."""
    from dataclasses import replace

    if not finding.fixes:
        raise ValueError(f"finding '{finding.code}' has no suggested fix")
    fix = finding.fixes[choice]
    return replace(climate, **{finding.field: list(fix.values)})


def worst_severity(findings: Sequence[Finding]) -> str | None:
    order = {"info": 0, "warning": 1, "error": 2}
    if not findings:
        return None
    return max(findings, key=lambda f: order.get(f.severity, 0)).severity
