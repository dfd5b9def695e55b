"""Result records of the engine: every figure with its reason.

A :class:`SystemDesign` is a tree of frozen records holding plain numbers
(units in the names).  ``SystemDesign.reasons`` maps the dotted path of a
figure (``"array.power_w"``) to a :class:`Reason`: the formula in words, the
inputs with their units, and the source.  The text UI's *why* view, the CLI,
the JSON and the report all read these same records.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import asdict, dataclass, field, fields, is_dataclass
from typing import TYPE_CHECKING, Any, Literal, NamedTuple

if TYPE_CHECKING:  # typing only: offgrid.design.electrical imports this module
    from offgrid.design.electrical import ElectricalResult

Severity = Literal["info", "warning", "error"]


@dataclass(frozen=True)
class Reason:
    formula: str
    inputs: tuple[tuple[str, str], ...] = ()
    source: str = "common practice, no source"

    def as_dict(self) -> dict[str, Any]:
        return {"formula": self.formula, "inputs": dict(self.inputs), "source": self.source}


@dataclass(frozen=True)
class Notice:
    """A warning produced by the engine; ``figure`` is the dotted path it concerns."""

    code: str
    message: str
    severity: Severity = "warning"
    figure: str | None = None


@functools.lru_cache(maxsize=1 << 16, typed=True)
def fmt(value: float | int | str, unit: str = "", digits: int = 3) -> str:
    """Format an input value for a reason: ``fmt(12.345, 'V') -> '12.3 V'``.

    Memoised (a pure function called hundreds of times per design; ``typed`` keeps
    ``True`` and ``1`` apart)."""
    if isinstance(value, str):
        text = value
    elif isinstance(value, bool):
        text = "yes" if value else "no"
    elif isinstance(value, int):
        text = str(value)
    else:
        v = float(value)
        if v == 0 or not math.isfinite(v):
            text = f"{v:g}"
        else:
            # Round to the significant digits first: a hair under a power of ten (or
            # rounding up across one) must not print one digit more ("100.0").
            # Whole numbers keep all their digits ("1234 W").
            r = float(f"{v:.{digits}g}")
            mag = math.floor(math.log10(abs(r)))
            dec = max(0, digits - 1 - mag)
            text = f"{v:.0f}" if dec == 0 else f"{r:.{dec}f}"
    return f"{text} {unit}".strip()


class PlainReason(NamedTuple):
    """A reason's three fields as a plain tuple, for designs whose reasons nobody reads
    (planning keeps a compact record of each of thousands of designs): built about three
    times quicker than the frozen :class:`Reason`, read by the same field names."""

    formula: str
    inputs: tuple[tuple[str, str], ...] = ()
    source: str = "common practice, no source"

    def as_dict(self) -> dict[str, Any]:
        return {"formula": self.formula, "inputs": dict(self.inputs), "source": self.source}


_make_reason: Any = Reason


@contextmanager
def plain_reasons() -> Iterator[None]:
    """Books opened inside the block record :class:`PlainReason` tuples."""
    global _make_reason
    before, _make_reason = _make_reason, PlainReason
    try:
        yield
    finally:
        _make_reason = before


def reason_kind() -> type:
    """The reason record books opened now build (:class:`Reason`, or :class:`PlainReason`
    inside :func:`plain_reasons`): part of the key of a memoised step that returns reasons."""
    return _make_reason


class ReasonBook:
    """Collects reasons while the engine computes."""

    def __init__(self) -> None:
        self._items: dict[str, Reason] = {}
        self._make = _make_reason

    def add(
        self, path: str, formula: str, source: str = "common practice, no source", **inputs: str
    ) -> None:
        self._items[path] = self._make(formula, tuple(inputs.items()), source)

    def given(self, path: str, field: str, value: str) -> None:
        """A figure that repeats a project value (typed, or its default): ``field`` names it."""
        self._items[path] = self._make(
            f"as set in {field} (typed, or the default)", (("value", value),), "project file"
        )

    def extend(self, reasons: dict[str, Reason]) -> None:
        """Take in a step's own reasons; a later reason of the same figure replaces the earlier."""
        self._items.update(reasons)

    def freeze(self) -> dict[str, Reason]:
        return dict(self._items)


def reason_key(path: str, data: dict | None = None) -> str:
    """The key in ``SystemDesign.reasons`` for a dotted path of ``SystemDesign.to_dict()``.

    List indices are dropped (months, load lines, curve points, a catalogue row's ``[]``:
    ``electrical.protection.devices[].count``); a cable's index becomes its
    key (``wires[2].size`` -> ``wires.charge.size``, needs ``data``); the electrical
    section's figures are keyed without ``electrical.`` (``electrical.strings.min_series``
    -> ``strings.min_series``) and the module fit's parameters share ``module.fit``.
    """
    import re

    m = re.match(r"wires\[(\d+)\]\.(.+)$", path)
    if m and data is not None:
        wires = data.get("wires") or []
        i = int(m.group(1))
        if i < len(wires) and isinstance(wires[i], dict) and "key" in wires[i]:
            return f"wires.{wires[i]['key']}.{m.group(2)}"
    key = re.sub(r"\[\d*\]", "", path)  # a catalogue row's "[]" too
    if key.startswith("electrical.module_fit"):
        return "module.fit"
    return key.removeprefix("electrical.")


@dataclass(frozen=True)
class LoadResult:
    daily_energy_wh: tuple[float, ...]  # 12 months, at the battery, growth margin included
    ac_energy_wh: tuple[float, ...]  # 12 months, at the appliances
    dc_energy_wh: tuple[float, ...]
    inverter_loss_wh: tuple[float, ...]
    inverter_idle_wh: float  # on a day the inverter is on
    critical_energy_wh: tuple[float, ...]  # at the battery, growth included
    design_daily_energy_wh: float  # the design month's daily energy
    max_daily_energy_wh: float
    growth_pct: float
    coincidence_factor: float
    connected_ac_w: float
    connected_dc_w: float
    peak_ac_w: float  # max(connected AC x coincidence factor, largest AC line)
    peak_dc_w: float
    largest_surge_w: float
    largest_surge_load: str
    per_load_wh: tuple[tuple[float, ...], ...]  # per load, 12 months, at the appliance
    #: 12 months: idle draw counted (0 where no AC load is used, unless kept on all year)
    inverter_idle_by_month_wh: tuple[float, ...] = (0.0,) * 12
    largest_surge_ac_dc: str = ""  # "ac" or "dc": the kind of the largest-surge appliance
    surge_need_w: float = 0.0  # one AC start + what runs beside it, W (sizes the surge)
    surge_need_load: str = ""  # the appliance whose start sets it


@dataclass(frozen=True)
class SiteResult:
    design_month: int  # 1-12
    tilt_deg: float
    azimuth_deg: float
    latitude_deg: float
    horizontal_kwh_m2_day: tuple[float, ...]
    poa_kwh_m2_day: tuple[float, ...]
    demand_to_sun: tuple[float, ...]  # Wh/day per kWh/m2/day, the design-month criterion
    temp_mean_c: tuple[float, ...]
    temp_day_c: tuple[float, ...]
    record_low_c: float
    climate_source: str
    albedo: tuple[float, ...] = ()  # reflectance of each month in force


@dataclass(frozen=True)
class ArrayResult:
    power_w: float
    required_power_w: float
    module_power_w: float
    modules_series: int
    modules_parallel: int
    module_count: int
    derates: dict[str, float]  # name -> fraction kept, in chain order
    derate_total: float
    cell_temp_c: tuple[float, ...]
    supply_wh_day: tuple[float, ...]  # 12 months, delivered to the battery
    voc_cold_v: float
    vmp_hot_v: float
    string_voc_cold_v: float
    string_vmp_hot_v: float
    # Daily energy into the battery each month from the I-V curves (offgrid.design.electrical):
    harvest_pwm_wh_day: tuple[float, ...] = ()
    harvest_mppt_wh_day: tuple[float, ...] = ()


@dataclass(frozen=True)
class BatteryResult:
    chemistry: str
    system_voltage_v: int
    capacity_ah: float  # installed bank capacity at system voltage
    required_ah: float
    nominal_kwh: float
    usable_kwh: float
    max_dod: float
    autonomy_days: float
    units_series: int
    units_parallel: int
    unit_count: int
    temp_factor: float
    ageing_factor: float
    discharge_efficiency: float
    absorption_voltage_v: float
    peak_charge_current_a: float = 0.0  # the array's charge current at full sun
    charge_c_rate: float = 0.0  # peak charge current / installed Ah [1/h]
    bank_voltage_v: float = 0.0  # nominal: units in series x unit voltage (51.2 V for LFP)
    capacity_temp_c: float = 25.0  # battery temperature for capacity, in the sizing month
    ageing_temp_c: float = 25.0  # warmest monthly battery temperature for ageing
    calendar_life_years: float = 0.0  # float life at the ageing temperatures
    ageing_temps_c: tuple[float, ...] = ()  # the 12 monthly temperatures for ageing


@dataclass(frozen=True)
class ControllerResult:
    type: str
    required_current_a: float
    current_a: float  # standard rating chosen, per controller
    count: int
    max_pv_voltage_v: float
    efficiency: float


@dataclass(frozen=True)
class InverterResult:
    needed: bool
    required_continuous_w: float
    continuous_w: float
    required_surge_w: float
    surge_w: float
    efficiency: float
    self_consumption_w: float
    dc_input_current_a: float


@dataclass(frozen=True)
class SystemDesign:
    loads: LoadResult
    site: SiteResult
    array: ArrayResult
    battery: BatteryResult
    controller: ControllerResult
    inverter: InverterResult
    warnings: tuple[Notice, ...]
    cautions: tuple[str, ...]
    reasons: dict[str, Reason] = field(default_factory=dict)
    #: The electrical design (strings, harvest, cables, protection); None only on the
    #: worst-month core before :func:`offgrid.design.electrical.with_electrical` adds it.
    electrical: ElectricalResult | None = None

    def why(self, path: str) -> Reason | None:
        """The reason for a figure: by its reason key, or by its path in :meth:`to_dict`
        (see :func:`reason_key`), falling back to the figure it belongs to."""
        if path in self.reasons:
            return self.reasons[path]
        probe = reason_key(path, self.to_dict() if path.startswith("wires[") else None)
        while probe:
            if probe in self.reasons:
                return self.reasons[probe]
            if "." not in probe:
                return None
            probe = probe.rsplit(".", 1)[0]
        return None

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready dictionary (documented in README)."""
        out: dict[str, Any] = {}
        for f in fields(self):
            value = getattr(self, f.name)
            if f.name == "electrical":
                if value is not None:
                    out.update(_plain(value.to_json()))
            elif f.name == "reasons":
                out["reasons"] = {k: r.as_dict() for k, r in sorted(value.items())}
            elif f.name == "warnings":
                out["warnings"] = [asdict(n) for n in value]
            elif f.name == "cautions":
                out["cautions"] = list(value)
            elif is_dataclass(value):
                out[f.name] = _plain(asdict(value))
            else:
                out[f.name] = _plain(value)
        return out


def _plain(value: Any) -> Any:
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_plain(v) for v in value]
    if isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError("a design figure is not finite")
        return round(value, 6)
    if hasattr(value, "item"):  # numpy scalar
        return _plain(value.item())
    return value


#: DesignError codes that mean the input itself is unusable (exit code 2 on the command line,
#: like any bad input) rather than a design that cannot be met (exit code 3).
INPUT_ERROR_CODES = frozenset({"climate-missing", "climate-months", "climate-months-untyped"})


class DesignError(ValueError):
    """The design cannot be met; the message says why and what to change."""

    def __init__(self, code: str, message: str, field: str | None = None) -> None:
        super().__init__(message)
        self.code = code
        self.field = field
