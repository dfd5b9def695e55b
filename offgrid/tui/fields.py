"""The editable fields of the project, as the forms show them.

A :class:`Field` names a dotted path in the :class:`~offgrid.project.model.Project`,
how to show its value, how to read what the user typed (with a message naming
the fix when it cannot), and which engine figure explains its automatic value.
No Textual here.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from offgrid.design.result import SystemDesign
from offgrid.numbers import NumberError, read_number
from offgrid.project.validate import RANGES

HINTS = {path: hint for path, _lo, _hi, hint in RANGES}
#: Fields whose value is a fraction 0-1: a plain number above 1 (up to 100) is a percentage.
FRACTIONS = frozenset(path for path, lo, hi, _hint in RANGES if hi == 1 and lo >= 0)
AUTO_WORDS = ("", "auto", "automatic", "-", "none", "default")


@dataclass(frozen=True)
class Field:
    path: str
    label: str
    kind: str = "float"  # text, float, int, choice, months; auto_* allow None (automatic)
    unit: str = ""
    hint: str = ""
    choices: tuple[tuple[Any, str], ...] = ()
    reason: str | None = None  # engine figure explaining the (automatic) value
    auto: Callable[[SystemDesign], str] | None = None  # what "automatic" came to
    auto_text: str = "automatic"
    group_form: str | None = None  # edit together with the other fields of this group

    @property
    def allows_auto(self) -> bool:
        return self.kind.startswith("auto_")

    @property
    def base_kind(self) -> str:
        return self.kind.removeprefix("auto_")

    def help(self) -> str:
        return self.hint or HINTS.get(self.path, "")

    # ------------------------------------------------------------------ showing
    def show(self, value: Any, design: SystemDesign | None = None) -> str:
        if value is None:
            text = self.auto_text
            if self.auto is not None and design is not None:
                text += f" \u2192 {self.auto(design)}"
            return text
        if self.base_kind == "choice":
            for v, label in self.choices:
                if v == value:
                    return label
            return str(value)
        if self.base_kind == "text":
            return str(value)
        if self.base_kind == "months" and isinstance(value, list | tuple):
            from offgrid.climate.sky import describe_albedo

            return describe_albedo(list(value))
        text = f"{value:g}" if isinstance(value, float) else str(value)
        return f"{text} {self.unit}".strip()

    def edit_text(self, value: Any) -> str:
        """What the editor starts with."""
        if value is None:
            return "auto"
        if self.base_kind == "text":
            return str(value)
        if isinstance(value, list | tuple):
            return " ".join(f"{v:g}" for v in value)
        if isinstance(value, float):
            return f"{value:g}"
        return str(value)

    # ------------------------------------------------------------------ reading
    def parse(self, text: str) -> Any:
        """The value typed, or ValueError with a message that says what to type."""
        raw = text.strip()
        if self.base_kind == "text":
            return text
        if self.allows_auto and raw.lower() in AUTO_WORDS:
            return None
        if self.base_kind == "choice":
            for v, label in self.choices:
                if raw.lower() in (str(v).lower(), label.lower()):
                    return v
            names = ", ".join(str(v) for v, _ in self.choices)
            raise ValueError(f"'{raw}' is not one of: {names}")
        if self.base_kind == "months":
            return parse_one_or_twelve(raw, self.help())
        if self.path in ANGLE_AXES:
            return parse_angle(raw, ANGLE_AXES[self.path])
        number = parse_number(raw, self.unit, self.help(), fraction=self.path in FRACTIONS)
        if self.base_kind == "int":
            if number != int(number):
                raise ValueError(f"'{raw}' must be a whole number")
            return int(number)
        return number


def parse_number(raw: str, unit: str = "", hint: str = "", fraction: bool = False) -> float:
    """A number typed by a person: ``12``, ``0,5`` (decimal comma), ``300 W``, ``50 %``.

    The number itself is read by :func:`offgrid.numbers.read_number`, the reader of every
    input.  A percentage given for a fraction field (unit '') is divided by 100; for a
    ``fraction`` field (0-1) a plain number above 1 and at most 100 is read as a
    percentage too ("60" -> 0.6), since no fraction can be above 1.
    """
    text = raw.strip().replace("\u2212", "-")
    percent = text.endswith("%")
    if percent:
        text = text[:-1].strip()
    if unit and text.lower().endswith(unit.lower()):
        text = text[: -len(unit)].strip()
    try:
        value = read_number(text)
    except NumberError as exc:
        tail = f"; {hint}" if hint else ""
        raise ValueError(f"{exc}{tail}") from None
    if (percent and unit in ("", "fraction")) or (fraction and 1 < value <= 100):
        value /= 100.0
    return value


def parse_one_or_twelve(raw: str, hint: str = "") -> float | list[float]:
    """One number for the year, or twelve January first, separated by spaces or ``;``
    (``0.7 0.7 0.4 ...``); commas separate too when there are twelve of them."""
    parts = raw.replace(";", " ").split()
    if len(parts) == 1 and parts[0].count(",") == 11:
        parts = parts[0].split(",")
    if len(parts) == 1:
        return parse_number(parts[0], "", hint)
    if len(parts) != 12:
        raise ValueError(
            f"{len(parts)} values: give one for the year or twelve, January "
            "first, separated by spaces"
        )
    return [parse_number(p.rstrip(","), "", hint) for p in parts]


ANGLE_AXES = {"site.latitude_deg": "latitude", "site.longitude_deg": "longitude"}
_HEMISPHERES = {"latitude": {"n": 1, "s": -1}, "longitude": {"e": 1, "w": -1, "o": -1}}
_ANGLE = re.compile(
    r"^\s*(?P<sign>[-+])?\s*(?P<deg>\d+(?:[.,]\d+)?)\s*(?:\u00b0|deg|d|\s)?\s*"
    r"(?:(?P<min>\d+(?:[.,]\d+)?)\s*(?:'|\u2032|m|\s)?\s*)?"
    r"(?:(?P<sec>\d+(?:[.,]\d+)?)\s*(?:\"|\u2033|''|s)?\s*)?"
    r"(?P<hemi>[A-Za-z])?\s*$"
)


def parse_angle(raw: str, axis: str) -> float:
    """Latitude or longitude typed by a person, in decimal degrees (north and east positive).

    Reads ``-12.4``, ``12.4 S``, ``12 24 S``, ``12\u00b024' S``, ``12\u00b024'36" S``;
    longitude takes E or W. Anything else: ValueError with the forms to type.
    """
    limit = 90.0 if axis == "latitude" else 180.0
    letters = "N or S" if axis == "latitude" else "E or W"
    example = "12.4 S or 12\u00b024' S" if axis == "latitude" else "1.5 W or 1\u00b030' W"
    bad = ValueError(
        f"'{raw.strip()}' is not a {axis}: type decimal degrees (-12.4) or "
        f"degrees, minutes and {letters} ({example})"
    )
    m = _ANGLE.match(raw.replace("\u2212", "-").replace("\u00ba", "\u00b0"))
    if not m:
        raise bad
    hemi = (m["hemi"] or "").lower()
    if hemi and hemi not in _HEMISPHERES[axis]:
        raise bad
    if hemi and m["sign"] == "-":
        raise ValueError(f"'{raw.strip()}': give either a minus sign or {letters}, not both")

    def num(x: str | None) -> float:
        return float(x.replace(",", ".")) if x else 0.0

    deg, minutes, seconds = num(m["deg"]), num(m["min"]), num(m["sec"])
    if minutes >= 60 or seconds >= 60 or ((m["min"] or m["sec"]) and deg != int(deg)):
        raise bad
    value = deg + minutes / 60.0 + seconds / 3600.0
    if value > limit:
        raise ValueError(f"'{raw.strip()}': a {axis} is at most {limit:g} degrees")
    sign = -1.0 if m["sign"] == "-" else float(_HEMISPHERES[axis].get(hemi, 1))
    return round(sign * value, 6)


def _fmt(value: float, unit: str, digits: int = 0) -> str:
    return f"{value:.{digits}f} {unit}".strip()


# ----------------------------------------------------------------------------- the forms

PROJECT_FIELDS: tuple[Field | str, ...] = (
    "Project",
    Field("info.name", "Project name", "text", hint="what the file is about"),
    Field("info.client", "Client", "text", hint="who the system is for"),
    Field("info.designer", "Designer", "text", hint="who sized it"),
    Field("info.notes", "Notes", "text", hint="anything worth keeping with the design"),
    "Site",
    Field("site.name", "Site name", "text", hint="village, building or plot"),
    Field(
        "site.latitude_deg",
        "Latitude",
        unit="deg",
        hint="12.4 S, 12\u00b024' S or -12.4 (north positive)",
    ),
    Field(
        "site.longitude_deg",
        "Longitude",
        unit="deg",
        hint="1.5 W, 1\u00b030' W or -1.5 (east positive)",
    ),
    Field("site.elevation_m", "Elevation", unit="m"),
    Field(
        "site.tilt_deg",
        "Array tilt",
        "auto_float",
        unit="deg",
        reason="site.tilt_deg",
        auto=lambda d: _fmt(d.site.tilt_deg, "deg"),
        hint="degrees from horizontal; 'auto' = |latitude|, at least the minimum tilt",
    ),
    Field(
        "site.azimuth_deg",
        "Array azimuth",
        "auto_float",
        unit="deg",
        reason="site.azimuth_deg",
        auto=lambda d: _fmt(d.site.azimuth_deg, "deg"),
        hint="degrees clockwise from north (180 = south); 'auto' faces the equator",
    ),
    Field(
        "site.albedo",
        "Ground albedo",
        "auto_months",
        auto_text="climate's, else 0.2",
        reason="site.poa_kwh_m2_day",
        hint="ground reflectance 0-1: one value, or twelve January first for snow months "
        "(0.2 grass or soil, fresh snow about 0.7-0.8); 'auto' = the climate's, else 0.2",
    ),
    Field(
        "site.battery_temp_c",
        "Battery room temp.",
        "auto_float",
        unit="C",
        auto_text="coldest monthly mean",
        hint="mean temperature where the battery stands; 'auto' = coldest monthly mean",
    ),
    Field(
        "site.battery_warm_temp_c",
        "Battery room, warm",
        "auto_float",
        unit="C",
        reason="battery.ageing_temp_c",
        auto_text="monthly means",
        hint="mean temperature of the battery room in the warm months, for ageing; 'auto' = "
        "each month's mean air temperature",
    ),
)

CONTROLLER_TYPES = (
    ("mppt", "MPPT (tracks the maximum power point)"),
    ("pwm", "PWM (array pulled to battery voltage)"),
)
CHEMISTRY_CHOICES = (
    ("flooded", "flooded lead-acid"),
    ("agm", "AGM lead-acid"),
    ("gel", "gel lead-acid"),
    ("lifepo4", "lithium iron phosphate"),
)
VOLTAGE_CHOICES = (("auto", "automatic"), (12, "12 V"), (24, "24 V"), (48, "48 V"))

PARTS_FIELDS: tuple[Field | str, ...] = (
    "Design choices",
    Field(
        "choices.system_voltage",
        "System voltage",
        "choice",
        choices=VOLTAGE_CHOICES,
        reason="battery.system_voltage_v",
        hint="battery bank voltage; automatic keeps DC current at or below 100 A",
    ),
    Field("choices.autonomy_days", "Days of autonomy", unit="days", reason="battery.required_ah"),
    Field(
        "choices.max_dod",
        "Max depth of discharge",
        "auto_float",
        reason="battery.required_ah",
        auto_text="battery's own",
        hint="60 %, 60 or 0.6; 'auto' = the battery unit's value",
    ),
    Field(
        "choices.load_growth_pct", "Load growth margin", unit="%", reason="loads.daily_energy_wh"
    ),
    Field("choices.coincidence_factor", "AC coincidence factor", reason="loads.peak_ac_w"),
    Field("choices.ageing_factor", "End-of-life capacity", reason="battery.required_ah"),
    Field(
        "choices.battery_largest_coldest",
        "Bank: peak x coldest",
        "choice",
        choices=((False, "no: worst single month"), (True, "yes: conservative")),
        reason="battery.required_ah",
        hint="yes: size the bank on the largest daily demand x the coldest month's "
        "temperature factor, even if they never meet in one month",
    ),
    Field("choices.min_tilt_deg", "Minimum tilt", unit="deg", reason="site.tilt_deg"),
    "Module (datasheet, STC)",
    *(
        Field(f"module.{name}", label, kind, unit=unit, group_form="module")
        for name, label, kind, unit in (
            ("name", "Module name", "text", ""),
            ("pmax_w", "Pmax", "float", "W"),
            ("vmp_v", "Vmp", "float", "V"),
            ("imp_a", "Imp", "float", "A"),
            ("voc_v", "Voc", "float", "V"),
            ("isc_a", "Isc", "float", "A"),
            ("alpha_isc_pct_per_c", "Isc temp. coefficient", "float", "%/C"),
            ("beta_voc_pct_per_c", "Voc temp. coefficient", "auto_float", "%/C"),
            ("gamma_pmax_pct_per_c", "Pmax temp. coefficient", "float", "%/C"),
            ("cells_in_series", "Cells in series", "int", ""),
            ("area_m2", "Area", "float", "m2"),
            ("noct_c", "NOCT", "float", "C"),
        )
    ),
    "Battery unit",
    Field("battery.name", "Battery name", "text", hint="make and model, or a description"),
    Field(
        "battery.chemistry",
        "Chemistry",
        "choice",
        choices=CHEMISTRY_CHOICES,
        hint="sets charging voltage, temperature correction and cautions",
    ),
    Field("battery.nominal_voltage_v", "Unit voltage", unit="V"),
    Field("battery.capacity_ah", "Unit capacity", unit="Ah"),
    Field("battery.max_dod", "Unit max. DoD"),
    Field("battery.efficiency", "Round-trip efficiency"),
    "Charge controller",
    Field(
        "controller.type",
        "Controller type",
        "choice",
        choices=CONTROLLER_TYPES,
        hint="MPPT converts the array's voltage; PWM connects it straight to the battery",
    ),
    Field(
        "controller.max_pv_voltage_v",
        "Max PV input voltage",
        unit="V",
        reason="array.modules_series",
    ),
    Field("controller.efficiency", "Controller efficiency"),
    Field(
        "controller.max_current_a",
        "Rated current",
        "auto_float",
        unit="A",
        reason="controller.current_a",
        auto=lambda d: _fmt(d.controller.current_a, "A"),
        auto_text="pick standard",
        hint="the controller's charge current, A; 'auto' picks the next standard rating",
    ),
    "Inverter",
    Field("inverter.efficiency", "Inverter efficiency", reason="loads.daily_energy_wh"),
    Field("inverter.self_consumption_w", "Idle draw", unit="W", reason="loads.inverter_idle_wh"),
    Field(
        "inverter.hours_on_per_day", "Hours switched on", unit="h", reason="loads.inverter_idle_wh"
    ),
    Field(
        "inverter.on_all_year",
        "Inverter on all year",
        "choice",
        choices=((False, "no, switched off"), (True, "yes, all year")),
        reason="loads.inverter_idle_wh",
        hint="yes: its idle draw counts in months when no AC load is used",
    ),
    "Losses (fraction kept)",
    Field("choices.derates.soiling", "Soiling", reason="array.derates.soiling"),
    Field(
        "choices.derates.soiling_rate_pct_per_day",
        "Soiling rate",
        "auto_float",
        unit="%/day",
        auto_text="off (fixed factor above)",
        reason="array.derates.soiling",
        hint="daily soiling loss, %/day; 'auto' uses the fixed soiling factor",
    ),
    Field(
        "choices.derates.cleaning_interval_days",
        "Cleaning interval",
        unit="days",
        reason="array.derates.soiling",
    ),
    Field("choices.derates.mismatch", "Module mismatch", reason="array.required_power_w"),
    Field("choices.derates.wiring", "DC wiring", reason="array.required_power_w"),
    "Voltage-drop limits",
    Field("choices.drop_limit_array_pct", "Array to controller", unit="%"),
    Field("choices.drop_limit_battery_pct", "Battery runs", unit="%"),
    Field("choices.drop_limit_load_pct", "Load runs", unit="%"),
)

MODULE_FIELDS = tuple(f for f in PARTS_FIELDS if isinstance(f, Field) and f.group_form == "module")

# ----------------------------------------------------------------------------- loads table


@dataclass(frozen=True)
class Column:
    key: str
    label: str
    width: int
    kind: str = "float"  # text, int, float, choice, months, figure (not editable)
    unit: str = ""
    choices: tuple[tuple[Any, str], ...] = ()
    hint: str = ""
    short: dict | None = None  # shorter cell text for some choices


TIME_CHOICES = (
    ("any", "any time"),
    ("day", "day"),
    ("morning", "morning"),
    ("evening", "evening"),
    ("night", "night"),
)
LOAD_COLUMNS: tuple[Column, ...] = (
    Column("name", "Appliance", 20, "text", hint="what it is; any text"),
    Column("quantity", "Qty", 4, "int", hint="how many of them, a whole number"),
    Column("power_w", "Watts", 6, unit="W", hint="running power of one unit, W"),
    Column("hours_per_day", "h/day", 6, unit="h", hint="hours on per day, 0-24"),
    Column(
        "ac_dc",
        "AC/DC",
        6,
        "choice",
        choices=(("ac", "AC"), ("dc", "DC")),
        hint="AC runs through the inverter; DC straight from the battery",
    ),
    Column(
        "duty_cycle",
        "Duty",
        5,
        hint="share of the on-time it really draws power (a fridge "
        "compressor 0.3-0.5), 0-1 or 40 %",
    ),
    Column(
        "surge_w", "Start", 6, unit="W", hint="starting power of one unit (motors), W; 0 if none"
    ),
    Column("months", "Months", 7, "months", hint="months of use: 1-12, 5,6,7 or 11-2"),
    Column(
        "critical",
        "Must",
        5,
        "choice",
        choices=((True, "yes"), (False, "no")),
        hint="yes: must never be switched off to save energy",
    ),
    Column(
        "time_of_day",
        "When",
        6,
        "choice",
        choices=TIME_CHOICES,
        hint="when it mostly runs (used by the hour-by-hour checks)",
        short={"any": "any", "morning": "morn", "evening": "eve"},
    ),
    Column("energy", "Wh/day", 7, "figure", hint="energy at the appliance in the design month"),
)
