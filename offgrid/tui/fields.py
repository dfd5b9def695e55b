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

from offgrid.catalogue import InputEntry, input_entry
from offgrid.design.result import SystemDesign
from offgrid.numbers import NumberError, read_number

AUTO_WORDS = ("", "auto", "automatic", "-", "none", "default")


@dataclass(frozen=True)
class Field:
    """An editable input: its label, unit, hint, kind, range and explaining figure are the
    catalogue's (:mod:`offgrid.catalogue`, read by ``path`` each time); what is here is how
    the form shows and reads it."""

    path: str
    choices: tuple[tuple[Any, str], ...] = ()
    auto: Callable[[SystemDesign], str] | None = None  # what "automatic" came to
    auto_text: str = "automatic"
    group_form: str | None = None  # edit together with the other fields of this group

    def __post_init__(self) -> None:
        if isinstance(self.choices, str):  # the old Field(path, label, kind, unit=...) form
            raise TypeError(
                f"Field({self.path!r}, {self.choices!r}): label, unit, hint, kind and reason "
                "are the catalogue's; add a row to offgrid/catalogue/inputs.py"
            )
        input_entry(self.path)  # KeyError naming the path when it is not catalogued

    @property
    def entry(self) -> InputEntry:
        return input_entry(self.path)

    @property
    def label(self) -> str:
        return self.entry.label

    @property
    def kind(self) -> str:
        return self.entry.kind

    @property
    def unit(self) -> str:
        return self.entry.unit

    @property
    def hint(self) -> str:
        return self.entry.hint

    @property
    def reason(self) -> str | None:
        """The engine figure explaining the (automatic) value."""
        return self.entry.reason

    @property
    def allows_auto(self) -> bool:
        return self.kind.startswith("auto_")

    @property
    def base_kind(self) -> str:
        return self.kind.removeprefix("auto_")

    def help(self) -> str:
        return self.hint

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
        number = parse_number(raw, self.unit, self.help(), fraction=self.entry.is_fraction)
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
    Field("info.name"),
    Field("info.client"),
    Field("info.designer"),
    Field("info.notes"),
    "Site",
    Field("site.name"),
    Field("site.latitude_deg"),
    Field("site.longitude_deg"),
    Field("site.elevation_m"),
    Field("site.tilt_deg", auto=lambda d: _fmt(d.site.tilt_deg, "deg")),
    Field("site.azimuth_deg", auto=lambda d: _fmt(d.site.azimuth_deg, "deg")),
    Field("site.albedo", auto_text="climate's, else 0.2"),
    Field("site.battery_temp_c", auto_text="coldest monthly mean"),
    Field("site.battery_warm_temp_c", auto_text="monthly means"),
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
    Field("choices.system_voltage", VOLTAGE_CHOICES),
    Field("choices.autonomy_days"),
    Field("choices.max_dod", auto_text="battery's own"),
    Field("choices.load_growth_pct"),
    Field("choices.coincidence_factor"),
    Field("choices.ageing_factor"),
    Field(
        "choices.battery_largest_coldest",
        ((False, "no: worst single month"), (True, "yes: conservative")),
    ),
    Field("choices.min_tilt_deg"),
    "Module (datasheet, STC)",
    *(
        Field(f"module.{name}", group_form="module")
        for name in (
            "name",
            "pmax_w",
            "vmp_v",
            "imp_a",
            "voc_v",
            "isc_a",
            "alpha_isc_pct_per_c",
            "beta_voc_pct_per_c",
            "gamma_pmax_pct_per_c",
            "cells_in_series",
            "area_m2",
            "noct_c",
        )
    ),
    "Battery unit",
    Field("battery.name"),
    Field("battery.chemistry", CHEMISTRY_CHOICES),
    Field("battery.nominal_voltage_v"),
    Field("battery.capacity_ah"),
    Field("battery.max_dod"),
    Field("battery.efficiency"),
    "Charge controller",
    Field("controller.type", CONTROLLER_TYPES),
    Field("controller.max_pv_voltage_v"),
    Field("controller.efficiency"),
    Field(
        "controller.max_current_a",
        auto=lambda d: _fmt(d.controller.current_a, "A"),
        auto_text="pick standard",
    ),
    "Inverter",
    Field("inverter.efficiency"),
    Field("inverter.self_consumption_w"),
    Field("inverter.hours_on_per_day"),
    Field("inverter.on_all_year", ((False, "no, switched off"), (True, "yes, all year"))),
    "Losses (fraction kept)",
    Field("choices.derates.soiling"),
    Field("choices.derates.soiling_rate_pct_per_day", auto_text="off (fixed factor above)"),
    Field("choices.derates.cleaning_interval_days"),
    Field("choices.derates.mismatch"),
    Field("choices.derates.wiring"),
    "Voltage-drop limits",
    Field("choices.drop_limit_array_pct"),
    Field("choices.drop_limit_battery_pct"),
    Field("choices.drop_limit_load_pct"),
)

MODULE_FIELDS = tuple(f for f in PARTS_FIELDS if isinstance(f, Field) and f.group_form == "module")

# ----------------------------------------------------------------------------- loads table


@dataclass(frozen=True)
class Column:
    """A column of the loads table: ``header`` and ``width`` are the table's own; the
    input's label, unit, hint and kind are the catalogue's row ``loads[].KEY``."""

    key: str
    header: str
    width: int
    choices: tuple[tuple[Any, str], ...] = ()
    short: dict | None = None  # shorter cell text for some choices
    figure_hint: str = ""  # a computed column (not an input): what it shows

    @property
    def entry(self) -> InputEntry | None:
        return None if self.figure_hint else input_entry(f"loads[].{self.key}")

    @property
    def label(self) -> str:
        """The input's name in prompts and messages (the header is shorter)."""
        return self.entry.label if self.entry else self.header

    @property
    def kind(self) -> str:
        """text, int, float, choice, months; figure: computed, not editable."""
        return self.entry.kind.removeprefix("auto_") if self.entry else "figure"

    @property
    def unit(self) -> str:
        return self.entry.unit if self.entry else ""

    @property
    def hint(self) -> str:
        return self.entry.hint if self.entry else self.figure_hint


TIME_CHOICES = (
    ("any", "any time"),
    ("day", "day"),
    ("morning", "morning"),
    ("evening", "evening"),
    ("night", "night"),
)
LOAD_COLUMNS: tuple[Column, ...] = (
    Column("name", "Appliance", 20),
    Column("quantity", "Qty", 4),
    Column("power_w", "Watts", 6),
    Column("hours_per_day", "h/day", 6),
    Column("ac_dc", "AC/DC", 6, (("ac", "AC"), ("dc", "DC"))),
    Column("duty_cycle", "Duty", 5),
    Column("surge_w", "Start", 6),
    Column("months", "Months", 7),
    Column("critical", "Must", 5, ((True, "yes"), (False, "no"))),
    Column(
        "time_of_day",
        "When",
        6,
        TIME_CHOICES,
        short={"any": "any", "morning": "morn", "evening": "eve"},
    ),
    Column("energy", "Wh/day", 7, figure_hint="energy at the appliance in the design month"),
)
