"""The electrical step's result records (typed parts of ``SystemDesign.electrical``)."""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.design import cautions as cau
from offgrid.design import protection as prot
from offgrid.design import strings as st
from offgrid.design import wiring as wr
from offgrid.design.pv import DiodeParams, IVCurve, OperatingPoint
from offgrid.design.result import Notice, Reason


@dataclass(frozen=True)
class StringDesign:
    window: st.StringWindow
    layout: st.Layout
    voc_cold_v: float  # one module at the record low
    voc_cold_rule: str
    vmp_hot_v: float  # one module at the hottest cell temperature
    hot_cell_temp_c: float
    record_low_c: float
    string_voc_cold_v: float
    string_vmp_hot_v: float
    layout_changed: bool  # True when the core's layout did not fit the window


@dataclass(frozen=True)
class HarvestResult:
    controller_type: str
    pwm_wh_day: tuple[float, ...]
    mppt_wh_day: tuple[float, ...]
    chosen_wh_day: tuple[float, ...]
    charging_voltage_v: float
    design_month: int
    pwm_vs_mppt_pct: float  # per module: PWM / MPPT harvest - 1 in the design month, %
    shortfall_pct: float  # chosen harvest below the design-month demand, % (0: none)
    pwm_layout: tuple[int, int]  # series, parallel the PWM figures assume
    mppt_layout: tuple[int, int]


@dataclass(frozen=True)
class ProtectionResult:
    devices: tuple[prot.Device, ...]
    string_fuses: bool
    string_fuse_a: float | None
    battery_fuse_a: float | None
    unit_short_circuit_a: float
    short_circuit_estimated: bool
    bank_fault_current_a: float
    battery_string_fuses: int
    battery_string_fuse_a: float | None


@dataclass(frozen=True)
class ElectricalResult:
    fit: DiodeParams
    mpp: OperatingPoint  # design month, solar noon
    curve: IVCurve
    strings: StringDesign
    harvest: HarvestResult
    wires: tuple[wr.WireChoice, ...]
    protection: ProtectionResult
    cautions: tuple[cau.Caution, ...]
    notices: tuple[Notice, ...]
    reasons: dict[str, Reason]

    def wires_json(self) -> list[dict]:
        return [
            {
                "key": w.key,
                "run": w.run,
                "count": w.count,
                "current_a": w.current_a,
                "drop_current_a": w.operating_current_a,
                "voltage_v": w.voltage_v,
                "length_m": w.length_m,
                "material": w.material,
                "size": w.size,
                "resistance_ohm_km": w.resistance_ohm_km,
                "drop_pct": w.drop_pct,
                "ampacity_a": w.ampacity_a,
                "fuse_a": w.fuse_a,
                "length_path": w.length_path,
            }
            for w in self.wires
        ]

    def to_json(self) -> dict:
        """Top-level JSON keys ``mpp``, ``wires`` and ``electrical`` (documented in README)."""
        mp, f, sd, h, pr = self.mpp, self.fit, self.strings, self.harvest, self.protection
        return {
            "mpp": {
                "month": h.design_month,
                "irradiance_w_m2": mp.irradiance_w_m2,
                "cell_temp_c": mp.cell_temp_c,
                "vmp_v": mp.vmp_v,
                "imp_a": mp.imp_a,
                "pmp_w": mp.pmp_w,
                "fill_factor": mp.fill_factor,
                "voc_v": mp.voc_v,
                "isc_a": mp.isc_a,
                "efficiency": mp.efficiency,
            },
            "wires": self.wires_json(),
            "electrical": {
                "module_fit": {
                    "method": f.method,
                    "photocurrent_a": f.photocurrent_a,
                    "saturation_current_a": f.saturation_current_a,
                    "series_resistance_ohm": f.series_resistance_ohm,
                    "shunt_resistance_ohm": f.shunt_resistance_ohm,
                    "modified_ideality_v": f.modified_ideality_v,
                    "stc_error_pct": dict(
                        zip(("vmp", "imp", "voc", "isc"), f.stc_error_pct, strict=True)
                    ),
                },
                "strings": {
                    "min_series": sd.window.min_series,
                    "max_series": sd.window.max_series,
                    "series": sd.layout.series,
                    "parallel": sd.layout.parallel,
                    "controllers": sd.layout.controllers,
                    "strings_per_controller": sd.layout.strings_per_controller,
                    "voc_cold_v": sd.voc_cold_v,
                    "voc_cold_rule": sd.voc_cold_rule,
                    "vmp_hot_v": sd.vmp_hot_v,
                    "hot_cell_temp_c": sd.hot_cell_temp_c,
                    "record_low_c": sd.record_low_c,
                    "string_voc_cold_v": sd.string_voc_cold_v,
                    "string_vmp_hot_v": sd.string_vmp_hot_v,
                    "required_string_vmp_v": sd.window.required_vmp_v,
                },
                "harvest": {
                    "controller_type": h.controller_type,
                    "charging_voltage_v": h.charging_voltage_v,
                    "pwm_vs_mppt_pct": h.pwm_vs_mppt_pct,
                    "shortfall_pct": h.shortfall_pct,
                    "pwm_layout": list(h.pwm_layout),
                    "mppt_layout": list(h.mppt_layout),
                },
                "protection": {
                    "string_fuses": pr.string_fuses,
                    "string_fuse_a": pr.string_fuse_a,
                    "battery_fuse_a": pr.battery_fuse_a,
                    "bank_fault_current_a": pr.bank_fault_current_a,
                    "unit_short_circuit_a": pr.unit_short_circuit_a,
                    "short_circuit_estimated": pr.short_circuit_estimated,
                    "battery_string_fuses": pr.battery_string_fuses,
                    "battery_string_fuse_a": pr.battery_string_fuse_a,
                    "devices": [
                        {
                            "location": d.location,
                            "kind": d.kind,
                            "rating_a": d.rating_a,
                            "voltage_v": d.voltage_v,
                            "count": d.count,
                            "interrupt_rating_a": d.interrupt_rating_a,
                            "note": d.note,
                            "source": d.source,
                        }
                        for d in pr.devices
                    ],
                },
                "iv_curve": {
                    "irradiance_w_m2": mp.irradiance_w_m2,
                    "cell_temp_c": mp.cell_temp_c,
                    "voltage_v": list(self.curve.voltage_v),
                    "current_a": list(self.curve.current_a),
                    "power_w": list(self.curve.power_w),
                },
                "cautions": [
                    {"code": c.code, "text": c.text, "source": c.source} for c in self.cautions
                ],
            },
        }
