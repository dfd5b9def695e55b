"""Electrical design after the worst-month core: strings, harvest, cables, protection, cautions.

``electrical_design(project, core)`` takes the project and the
:class:`~offgrid.design.result.SystemDesign` of the worst-month sizing and returns an
:class:`ElectricalResult`: every figure carries its reason.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from offgrid.design import cautions as cau
from offgrid.design import protection as prot
from offgrid.design import strings as st
from offgrid.design import wiring as wr
from offgrid.design.electrical.string_layout import (  # noqa: F401  (re-exported)
    HOT_IRRADIANCE_W_M2,
    StringLimits,
    string_limits,
)
from offgrid.design.harvest import HarvestInputs, daily_poa_profile, harvest_wh_day
from offgrid.design.pv import (
    DiodeParams,
    IVCurve,
    OperatingPoint,
    cell_temperature_ross,
    fit_module,
    iv_curve,
    module_current,
    validate_module,
)
from offgrid.design.result import DesignError, Notice, Reason, ReasonBook, fmt

NEC = "NFPA 70 (NEC) 2023"
#: What each kind of run's maximum current is, for its reason.
WIRE_CURRENT_RULE = {
    "string": "1.25 x Isc of one string",
    "array": "1.25 x Isc x strings per controller",
    "charge": "the controller's rated output current (or its operating current if larger)",
    "inverter": "inverter continuous rating / (efficiency x low-voltage cut-off)",
    "load": "quantity x power / system voltage",
}
#: What each kind of run's operating (voltage-drop) current is, for its reason.
WIRE_DROP_CURRENT_RULE = {
    "string": "Imp of one string (MPPT) or the module current at the charging voltage (PWM), "
    "at STC",
    "array": "strings per controller x the string's operating current",
    "charge": "the array's charge current at full sun, at most the controller's rating",
    "inverter": "the same as its maximum current (the inverter at its continuous rating at "
    "the low-voltage cut-off)",
    "load": "the same as its maximum current (quantity x power / system voltage)",
}
MONTH_NAMES = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
LARGE_CONDUCTOR_MM2 = 50.0  # ~1/0 AWG: above this on 12/24 V, suggest a higher voltage


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


def with_electrical(core, er: ElectricalResult):
    """The core SystemDesign with the electrical figures, notices, cautions and reasons added.

    The electrical cautions replace the core's short list (they cover the same
    ground, with figures and sources).
    """
    from dataclasses import replace

    sd = er.strings
    array = replace(
        core.array,
        voc_cold_v=sd.voc_cold_v,
        vmp_hot_v=sd.vmp_hot_v,
        string_voc_cold_v=sd.string_voc_cold_v,
        string_vmp_hot_v=sd.string_vmp_hot_v,
        harvest_pwm_wh_day=er.harvest.pwm_wh_day,
        harvest_mppt_wh_day=er.harvest.mppt_wh_day,
    )
    codes = {n.code for n in er.notices}
    kept = tuple(
        n
        for n in core.warnings  # the curves' PWM figure replaces the core's estimate
        if not (n.code == "pwm-voltage-waste" and "pwm-mismatch" in codes)
    )
    return replace(
        core,
        array=array,
        warnings=kept + er.notices,
        cautions=tuple(c.line() for c in er.cautions),
        reasons={**core.reasons, **er.reasons},
        electrical=er,
    )


def pwm_charging_voltage_v(system_voltage_v: float, absorption_v: float) -> float:
    """Battery voltage a PWM array works against: mean of full-rest and absorption voltage.

    Full rest taken as 1.05 x nominal (2.1 V per lead-acid cell); common practice, no source.
    """
    return 0.5 * (1.05 * system_voltage_v + absorption_v)


def _battery_min_temp_c(project, core) -> float:
    if project.site.battery_temp_c is not None:
        return float(project.site.battery_temp_c)
    return float(core.site.record_low_c)


def _wire_ambient_c(project, core) -> float:
    if project.wiring.ambient_temp_c is not None:
        return float(project.wiring.ambient_temp_c)
    return float(max(core.site.temp_day_c))


def _derate(core, project, name: str) -> float:
    value = core.array.derates.get(name) if core.array.derates else None
    if value is None:
        value = getattr(project.choices.derates, name)
    return float(value)


def _other_layout(
    ctype: str,
    layout: st.Layout,
    project,
    voc_cold: float,
    vmp_hot: float,
    v_abs: float,
    pwm_drop: float,
) -> st.Layout:
    """Layout of the same modules for the controller type not chosen, for the comparison."""
    n, k = layout.module_count, layout.controllers
    if ctype == "mppt":  # PWM: fewest modules in series that suit the battery (STC Vmp)
        s = max(1, math.ceil((v_abs + pwm_drop) / project.module.vmp_v - 1e-9))
        per = math.ceil(math.ceil(n / s) / k)
        return st.Layout(s, per * k, k, per, s * per * k)
    try:
        win = st.string_window(
            "mppt", float(project.controller.max_pv_voltage_v), voc_cold, vmp_hot, v_abs
        )
    except DesignError:
        return layout
    return st.choose_layout(win, n, k)


def _device_kind(rating: float | None, kind: str) -> str:
    return "fuse" if rating in prot.FUSE_ONLY_RATINGS_A else kind


def electrical_design(project, core, params: DiodeParams | None = None) -> ElectricalResult:
    """Electrical design of the stand-alone system sized by the worst-month core.

    ``params``: the module's fit when the caller has it already (else it is fitted here).
    """
    rb = ReasonBook()
    notices: list[Notice] = []
    module = project.module
    wiring = project.wiring
    for text in validate_module(module):
        notices.append(Notice("module-cells", text, "warning", "module.cells_in_series"))
    if params is None:
        params = fit_module(module)
    rb.add(
        "module.fit",
        "single-diode model fitted to the datasheet; reproduces Vmp, Imp, Voc, "
        "Isc at STC within 0.5 %",
        params.method,
        vmp_error=fmt(params.stc_error_pct[0], "%"),
        imp_error=fmt(params.stc_error_pct[1], "%"),
        voc_error=fmt(params.stc_error_pct[2], "%"),
        isc_error=fmt(params.stc_error_pct[3], "%"),
    )

    site = core.site
    m = int(site.design_month) - 1
    profile, step_h = daily_poa_profile(
        site.horizontal_kwh_m2_day,
        site.poa_kwh_m2_day,
        site.latitude_deg,
        site.tilt_deg,
        site.azimuth_deg,
        site.albedo or project.site.albedo,
    )
    temp_day = np.asarray(site.temp_day_c, dtype=float)

    # Design-month operating point at solar noon (the middle of the profile).
    g_noon = float(profile[m].max())
    if not g_noon > 0:
        raise DesignError(
            "no-sun",
            "The design month has no sunshine on the array: check the "
            "climate data and the array tilt.",
            field="climate",
        )
    tc_noon = float(cell_temperature_ross(temp_day[m], g_noon, module.noct_c))
    curve = iv_curve(params, g_noon, tc_noon, module.area_m2)
    mpp = curve.point
    src_noon = (
        "De Soto (2006) model at the design month's solar-noon irradiance "
        "(Collares-Pereira & Rabl profile of the monthly insolation) and NOCT cell "
        "temperature"
    )
    rb.add("mpp.month", "the design month", "worst-month method", month=str(m + 1))
    rb.add(
        "mpp.irradiance_w_m2",
        "plane-of-array irradiance at solar noon of the design month's mean day",
        src_noon,
        insolation=fmt(float(site.poa_kwh_m2_day[m]), "kWh/m2/day"),
    )
    rb.add(
        "mpp.cell_temp_c",
        "daytime air temperature + (NOCT - 20 C) x irradiance / 800 W/m2",
        "Duffie & Beckman 4th ed. eq. 23.3.3 (NOCT method)",
        ambient=fmt(temp_day[m], "C"),
        irradiance=fmt(g_noon, "W/m2"),
        noct=fmt(module.noct_c, "C"),
    )
    for key in ("voltage_v", "current_a", "power_w", "irradiance_w_m2", "cell_temp_c"):
        rb.add(
            f"iv_curve.{key}",
            "one module's I-V and P-V curve: current and power at evenly "
            "spaced voltages from 0 V to Voc, at the design month's solar-noon irradiance "
            "and cell temperature",
            src_noon,
            irradiance=fmt(g_noon, "W/m2"),
            cell_temp=fmt(tc_noon, "C"),
        )
    for key, val, unit in (
        ("vmp_v", mpp.vmp_v, "V"),
        ("imp_a", mpp.imp_a, "A"),
        ("pmp_w", mpp.pmp_w, "W"),
        ("fill_factor", mpp.fill_factor, ""),
        ("efficiency", mpp.efficiency, ""),
        ("voc_v", mpp.voc_v, "V"),
        ("isc_a", mpp.isc_a, "A"),
    ):
        rb.add(
            f"mpp.{key}",
            "maximum power point, open-circuit voltage and short-circuit "
            "current of one module on its I-V curve; fill factor = Pmp / (Voc Isc); "
            "efficiency = Pmp / (G x area)",
            src_noon,
            irradiance=fmt(g_noon, "W/m2"),
            cell_temp=fmt(tc_noon, "C"),
            value=fmt(val, unit),
            area=fmt(module.area_m2, "m2"),
        )

    # String window.
    ctype = project.controller.type
    vsys = float(core.battery.system_voltage_v)
    v_abs = float(core.battery.absorption_voltage_v)
    lim = string_limits(
        module,
        project.controller,
        project.choices.drop_limit_array_pct,
        temp_day,
        float(site.record_low_c),
        v_abs,
        params,
    )
    window, voc_cold, voc_rule = lim.window, lim.voc_cold_v, lim.voc_rule
    vmp_hot, hot_tc, record_low, pwm_drop = (
        lim.vmp_hot_v,
        lim.hot_cell_temp_c,
        lim.record_low_c,
        lim.pwm_drop_v,
    )
    controllers = max(1, int(core.controller.count))
    core_series = int(core.array.modules_series)
    if st.layout_fits(window, core_series) and core.array.modules_parallel >= 1:
        per = math.ceil(core.array.modules_parallel / controllers)
        layout = st.Layout(
            core_series,
            int(core.array.modules_parallel),
            controllers,
            per,
            core_series * int(core.array.modules_parallel),
        )
        changed = False
    else:
        layout = st.choose_layout(window, int(core.array.module_count), controllers)
        changed = True
        notices.append(
            Notice(
                "layout-changed",
                f"The array is laid out {layout.series} in series x "
                f"{layout.parallel} in parallel to fit the controller's string window "
                f"({window.min_series}-{window.max_series} in series).",
                "warning",
                "strings.series",
            )
        )
    strings = StringDesign(
        window,
        layout,
        voc_cold,
        voc_rule,
        vmp_hot,
        hot_tc,
        record_low,
        layout.series * voc_cold,
        layout.series * vmp_hot,
        changed,
    )
    rb.add(
        "array.voc_cold_v",
        "module Voc at the record low ambient: Voc x (1 + beta (Tlow - "
        "25 C)), or x the Table 690.7(A) factor without a coefficient",
        f"{NEC} 690.7(A)",
        voc_stc=fmt(module.voc_v, "V"),
        record_low=fmt(record_low, "C"),
        rule=voc_rule,
    )
    rb.add(
        "array.vmp_hot_v",
        "module Vmp at 1000 W/m2 and the hottest month's NOCT cell "
        "temperature, from the fitted single-diode model",
        params.method,
        cell_temp=fmt(hot_tc, "C"),
        ambient=fmt(float(temp_day.max()), "C"),
        noct=fmt(module.noct_c, "C"),
    )
    rb.add(
        "controller.max_pv_voltage_v",
        "the controller's maximum PV input voltage (user "
        "input); the string's cold Voc must stay below it",
        f"{NEC} 690.7",
        string_voc_cold=fmt(strings.string_voc_cold_v, "V"),
    )
    for key, ref in (("voc_cold_v", "array.voc_cold_v"), ("vmp_hot_v", "array.vmp_hot_v")):
        r = rb.freeze()[ref]
        rb.add(f"strings.{key}", r.formula, r.source, **dict(r.inputs))
    rb.add(
        "strings.hot_cell_temp_c",
        "hottest month's daytime air temperature + (NOCT - 20 C) x 1000 W/m2 / 800 W/m2",
        "Duffie & Beckman 4th ed. eq. 23.3.3 (NOCT method)",
        ambient=fmt(float(temp_day.max()), "C"),
        noct=fmt(module.noct_c, "C"),
    )
    rb.add(
        "strings.record_low_c",
        "the site's record low (as site.record_low_c)",
        "climate file or estimate, see site.record_low_c",
        value=fmt(record_low, "C"),
    )
    rb.add(
        "strings.string_voc_cold_v",
        "modules in series x module cold Voc; must stay at or "
        "below the controller's maximum PV voltage",
        f"{NEC} 690.7(A)",
        series=str(layout.series),
        voc_cold=fmt(voc_cold, "V"),
    )
    rb.add(
        "strings.string_vmp_hot_v",
        "modules in series x module hot Vmp",
        "common practice, no source",
        series=str(layout.series),
        vmp_hot=fmt(vmp_hot, "V"),
    )
    rb.add(
        "strings.required_string_vmp_v",
        "MPPT: absorption voltage + the controller's "
        f"{st.MPPT_MARGIN_V:g} V margin; PWM: absorption voltage + the array wiring drop",
        "common practice, no source (check the controller's manual)",
        absorption=fmt(v_abs, "V"),
    )
    rb.add(
        "strings.series",
        "modules in series (see array.modules_series)",
        "common practice, no source",
        window=f"{window.min_series}-{window.max_series}",
    )
    rb.add(
        "strings.parallel",
        "strings in parallel (see array.modules_parallel)",
        "common practice, no source",
    )
    rb.add(
        "strings.controllers",
        "charge controllers sharing the strings (see controller.count)",
        "common practice, no source",
    )
    rb.add(
        "strings.strings_per_controller",
        "strings in parallel / controllers (equal shares)",
        "common practice, no source",
        parallel=str(layout.parallel),
        controllers=str(layout.controllers),
    )
    rb.add(
        "strings.max_series",
        "floor(controller max PV voltage / module cold Voc)",
        f"{NEC} 690.7(A)",
        max_pv=fmt(window.max_pv_voltage_v, "V"),
        voc_cold=fmt(voc_cold, "V"),
    )
    if ctype == "mppt":
        rb.add(
            "strings.min_series",
            "ceil((absorption + MPPT margin) / module hot Vmp)",
            "common practice, no source",
            required=fmt(window.required_vmp_v, "V"),
            vmp_hot=fmt(vmp_hot, "V"),
        )
    else:
        rb.add(
            "strings.min_series",
            "ceil((absorption + wiring drop) / module Vmp at STC): the "
            "module's suitability for PWM at this battery voltage",
            "common practice, no source",
            required=fmt(window.required_vmp_v, "V"),
            vmp_stc=fmt(module.vmp_v, "V"),
        )
    if window.hot_vmp_short and ctype == "pwm":
        notices.append(
            Notice(
                "pwm-hot-vmp",
                f"In the hottest month the string's Vmp falls to "
                f"{layout.series * vmp_hot:.1f} V, below the {window.required_vmp_v:.1f} V the "
                "battery needs at absorption: charging slows in the midday heat (the PWM harvest "
                "includes it). An MPPT controller with one more module in series avoids it.",
                "info",
                "array.vmp_hot_v",
            )
        )

    # Runs and their currents.
    isc, imp = module.isc_a, module.imp_a
    n_c = layout.strings_per_controller
    v_chg = pwm_charging_voltage_v(vsys, v_abs)
    if ctype == "pwm":
        i_pwm_stc = float(module_current(params, v_chg / layout.series, 1000.0, 25.0))
        v_array, i_op_str = v_chg, i_pwm_stc
    else:
        v_array, i_op_str = layout.series * module.vmp_v, imp
    fuses_needed = prot.string_fuses_needed(n_c, isc, wiring.module_max_fuse_a)
    string_fuse = (
        prot.string_fuse_rating_a(isc, wiring.module_max_fuse_a) if (fuses_needed) else None
    )
    eff = float(project.controller.efficiency)
    p_sub_stc = layout.series * n_c * module.pmax_w
    i_charge_op = min(
        p_sub_stc * (eff if ctype == "mppt" else 1.0) / vsys, float(core.controller.current_a)
    )
    if ctype == "pwm":
        i_charge_op = min(n_c * i_pwm_stc, float(core.controller.current_a))
    i_charge_max = max(float(core.controller.current_a), i_charge_op)
    limits = project.choices
    runs: list[wr.RunSpec] = []
    if n_c >= 2:
        runs.append(
            wr.RunSpec(
                "string",
                "modules to combiner",
                prot.pv_max_current_a(isc, 1),
                i_op_str,
                v_array,
                wiring.string_run_m,
                limits.drop_limit_array_pct,
                string_fuse,
                layout.parallel,
                "wiring.string_run_m",
            )
        )
    array_fuse = prot.standard_rating_a(
        prot.pv_fuse_min_a(isc, n_c),
        fuse=False,
        what="PV circuit of each controller",
        field="controller.max_current_a",
    )
    runs.append(
        wr.RunSpec(
            "array",
            "array to controller",
            prot.pv_max_current_a(isc, n_c),
            n_c * i_op_str,
            v_array,
            wiring.array_run_m,
            limits.drop_limit_array_pct,
            array_fuse,
            controllers,
            "wiring.array_run_m",
        )
    )
    charge_fuse = prot.standard_rating_a(
        1.25 * i_charge_max,
        fuse=False,
        what="controller-to-battery circuit",
        field="controller.max_current_a",
    )
    runs.append(
        wr.RunSpec(
            "charge",
            "controller to battery",
            i_charge_max,
            i_charge_op,
            vsys,
            wiring.controller_battery_m,
            limits.drop_limit_battery_pct,
            charge_fuse,
            controllers,
            "wiring.controller_battery_m",
        )
    )
    inv = core.inverter
    battery_fuse = None
    if inv.needed:
        i_inv = float(inv.dc_input_current_a)
        if not i_inv > 0:
            i_inv = float(inv.continuous_w) / (float(inv.efficiency) * vsys)
        battery_fuse = prot.standard_rating_a(1.25 * i_inv, what="inverter circuit", field="loads")
        runs.append(
            wr.RunSpec(
                "inverter",
                "battery to inverter",
                i_inv,
                i_inv,
                vsys,
                wiring.battery_inverter_m,
                limits.drop_limit_battery_pct,
                battery_fuse,
                1,
                "wiring.battery_inverter_m",
            )
        )
    for n_load, load in enumerate(project.loads, start=1):
        if load.ac_dc != "dc" or not load.quantity * load.power_w > 0:
            continue
        i_load = load.quantity * load.power_w / vsys
        own = f"loads[{n_load}].run_m"
        length = wiring.dc_load_run_m if load.run_m is None else load.run_m
        field = "wiring.dc_load_run_m" if load.run_m is None else own
        runs.append(
            wr.RunSpec(
                f"load{n_load}",
                f"DC load '{load.name}'",
                i_load,
                i_load,
                vsys,
                length,
                limits.drop_limit_load_pct,
                prot.standard_rating_a(
                    1.25 * i_load,
                    what=f"DC load '{load.name}' circuit",
                    field=f"loads[{n_load}].power_w",
                ),
                1,
                field,
                own,
            )
        )

    ambient = _wire_ambient_c(project, core)
    cable = (
        wiring.units,
        wiring.material,
        wiring.conductor_temp_c,
        ambient,
        wiring.insulation_temp_c,
    )
    pv_runs = [r for r in runs if r.key in ("string", "array")]
    other = [r for r in runs if r.key not in ("string", "array")]
    wires = tuple(
        wr.size_runs_in_series(pv_runs, limits.drop_limit_array_pct, *cable)
        + [wr.size_conductor(r, *cable) for r in other]
    )
    table = "NEC Chapter 9 Table 8" if wiring.units == "awg" else "IEC 60228"
    amp_table = (
        "NEC Table 310.16 with Table 310.15(B)(1)(1), 110.14(C)"
        if wiring.units == "awg"
        else "IEC 60364-5-52 Tables B.52.4/B.52.5, B.52.14"
    )
    big = []
    for w in wires:
        base = f"wires.{w.key}"
        kind = w.key if w.key in WIRE_CURRENT_RULE else "load"
        rb.add(
            f"{base}.size",
            "smallest listed size whose ampacity >= max(1.25 x max current, "
            "fuse) and whose voltage drop is within the run's limit",
            f"{NEC} 690.8(B), 215.2; {amp_table}",
            max_current=fmt(w.current_a, "A"),
            required_ampacity=fmt(w.required_ampacity_a, "A"),
            length=fmt(w.length_m, "m"),
            ambient=fmt(ambient, "C"),
            material=w.material,
        )
        rb.add(
            f"{base}.drop_pct",
            "100 x 2 x one-way length x drop current (drop_current_a, "
            "the operating current) x resistance / circuit voltage",
            f"{table}, corrected to conductor temperature",
            length=fmt(w.length_m, "m"),
            drop_current=fmt(w.operating_current_a, "A"),
            resistance=fmt(w.resistance_ohm_km, "ohm/km"),
            circuit_voltage=fmt(w.voltage_v, "V"),
            conductor_temp=fmt(wiring.conductor_temp_c, "C"),
            limit=fmt(w.drop_limit_pct, "%"),
        )
        rb.add(
            f"{base}.drop_current_a",
            "the operating current the voltage drop is computed "
            "with, by the rule of its kind of run",
            "common practice, no source",
            rule=WIRE_DROP_CURRENT_RULE[kind],
            value=fmt(w.operating_current_a, "A"),
        )
        rb.add(
            f"{base}.voltage_v",
            "circuit voltage the drop is a percentage of: the string's "
            "operating voltage on the PV side, the system voltage on the battery side",
            "common practice, no source",
            value=fmt(w.voltage_v, "V"),
        )
        rb.add(
            f"{base}.resistance_ohm_km",
            "conductor resistance at the conductor temperature",
            f"{table}, corrected to conductor temperature",
            conductor_temp=fmt(wiring.conductor_temp_c, "C"),
            size=w.size,
        )
        rb.add(
            f"{base}.ampacity_a",
            "table ampacity x ambient correction, within the terminal rating",
            amp_table,
            ambient=fmt(ambient, "C"),
            insulation=fmt(wiring.insulation_temp_c, "C"),
        )
        rb.add(
            f"{base}.current_a",
            "the circuit's maximum continuous current (for ampacity and "
            "protection), by the rule of its kind of run",
            f"{NEC} 690.8(A)(1) for PV circuits; the rest common practice, no source",
            rule=WIRE_CURRENT_RULE[kind],
            value=fmt(w.current_a, "A"),
        )
        spec = next(r for r in runs if r.key == w.key)
        rb.add(
            f"{base}.length_m",
            "one-way length of the run as set in the project (typed, or the default)",
            "project file",
            field=spec.length_field or "wiring",
            value=fmt(w.length_m, "m"),
        )
        rb.add(
            f"{base}.count",
            "identical runs: one per string (string runs) or per "
            "controller (array and charge runs), else one",
            "common practice, no source",
            count=str(w.count),
        )
        if w.fuse_a is not None:
            rb.add(
                f"{base}.fuse_a",
                "smallest standard rating >= 1.25 x the circuit current, not "
                "above the conductor's ampacity",
                f"{NEC} 240.6(A), 690.9(B), 240.4",
                current=fmt(w.current_a, "A"),
                ampacity=fmt(w.ampacity_a, "A"),
            )
        if w.area_mm2 >= LARGE_CONDUCTOR_MM2 and vsys <= 24:
            big.append(w)
    if big:
        names = ", ".join(f"{w.run} ({w.size})" for w in big)
        notices.append(
            Notice(
                "raise-system-voltage",
                f"At {vsys:.0f} V these runs need very large cables: {names}. "
                f"A {2 * vsys:.0f} V system halves the current, and for the same voltage drop the "
                "cable needs about a quarter of the cross-section.",
                "warning",
                "battery.system_voltage_v",
            )
        )

    # The derate chain's wiring factor against the cables as sized (drop % ~ power lost %).
    cable_loss = sum(w.drop_pct for w in wires if w.key in ("string", "array", "charge")) / 100
    chain_loss = 1.0 - float(project.choices.derates.wiring)
    if abs(chain_loss - cable_loss) > 0.03:
        notices.append(
            Notice(
                "wiring-derate-vs-cables",
                f"The wiring derate ({1 - chain_loss:.2f}) allows "
                f"{chain_loss:.0%} for cable losses, but the PV and charge cables as sized lose "
                f"about {cable_loss:.1%} at full sun: set choices.derates.wiring to about "
                f"{1 - cable_loss:.2f} so the derate chain and the harvest agree"
                + (
                    " (the array is now larger than the cables need)."
                    if chain_loss > cable_loss
                    else " (the harvest from the I-V curves already counts the real loss)."
                ),
                "info",
                "array.derates.wiring",
            )
        )

    # Harvest both ways with the chosen cables; the other controller type on its own layout.
    loop = {w.key: 2.0 * w.length_m * w.resistance_ohm_km / 1000.0 for w in wires}
    soiling, mismatch = _derate(core, project, "soiling"), _derate(core, project, "mismatch")
    alt = _other_layout(ctype, layout, project, voc_cold, vmp_hot, v_abs, pwm_drop)
    mppt_layout, pwm_layout = (layout, alt) if ctype == "mppt" else (alt, layout)

    def run_harvest(lay: st.Layout) -> tuple[np.ndarray, np.ndarray]:
        # controllers with n strings each; when the strings do not share out equally, some
        # controllers have one string fewer.  The other controller type's layout gets PV
        # cables sized for the same fractional loss as the chosen layout's (string run: the
        # same current at s_alt/s volts; array run: n_alt strings at s_alt/s volts), so the
        # comparison is of the controllers, not of cables sized for the other one.
        r_str, r_arr = loop.get("string", 0.0), loop["array"]
        if lay is not layout:
            r_str *= lay.series / layout.series
            r_arr *= (
                layout.strings_per_controller
                * lay.series
                / (max(1, lay.strings_per_controller) * layout.series)
            )
        k = lay.controllers
        groups = {lay.parallel // k + 1: lay.parallel % k, lay.parallel // k: k - lay.parallel % k}
        total = [np.zeros(12), np.zeros(12)]
        for n_str, n_ctrl in groups.items():
            if n_str < 1 or n_ctrl < 1:
                continue
            hin = HarvestInputs(
                lay.series,
                n_str,
                n_ctrl,
                v_chg,
                eff,
                soiling,
                mismatch,
                r_str,
                r_arr,
                loop["charge"],
            )
            got = harvest_wh_day(params, profile, step_h, temp_day, module.noct_c, hin)
            total = [total[0] + got[0], total[1] + got[1]]
        return total[0], total[1]

    mppt = run_harvest(mppt_layout)[0]
    pwm = run_harvest(pwm_layout)[1]
    chosen = pwm if ctype == "pwm" else mppt
    demand_m = np.asarray(core.loads.daily_energy_wh, dtype=float)
    eta_batt = float(project.battery.efficiency)
    # The worst month of the harvest after the round trip against its demand (every month
    # must be covered, not only the design month of the derate chain).
    used = demand_m > 1e-6
    got = np.divide(chosen * eta_batt, demand_m, out=np.ones(12), where=used)
    short_m = np.where(used, 100.0 * (1.0 - got), 0.0)
    ms = int(np.argmax(short_m))
    shortfall = max(0.0, float(short_m[ms]))
    demand = float(demand_m[ms])
    # Per module: each controller type on its own best layout of these modules, which may
    # hold a different number of them (whole strings); compared per module installed.
    n_pwm, n_mppt = pwm_layout.module_count, mppt_layout.module_count
    per_pwm, per_mppt = pwm[m] / n_pwm, mppt[m] / n_mppt
    pwm_vs = float(100.0 * (per_pwm / per_mppt - 1.0)) if per_mppt > 0 else 0.0
    harvest = HarvestResult(
        ctype,
        tuple(pwm.tolist()),
        tuple(mppt.tolist()),
        tuple(chosen.tolist()),
        v_chg,
        m + 1,
        pwm_vs,
        shortfall,
        (pwm_layout.series, pwm_layout.parallel),
        (mppt_layout.series, mppt_layout.parallel),
    )
    hsrc = (
        "De Soto (2006) I-V curve at each step of the month's mean day (Collares-Pereira & "
        "Rabl 1979 / Liu & Jordan profile, isotropic sky, scaled to the monthly POA)"
    )
    rb.add(
        "harvest.charging_voltage_v",
        "battery voltage a PWM array works against: mean of "
        "full rest (1.05 x nominal) and absorption voltage",
        "common practice, no source",
        nominal=fmt(vsys, "V"),
        absorption=fmt(v_abs, "V"),
    )
    rb.add(
        "harvest.pwm_vs_mppt_pct",
        "per module: (PWM harvest / PWM modules) / (MPPT "
        "harvest / MPPT modules) - 1 in the design month, each controller type on its own "
        "best series x parallel layout of the same module (the layouts may hold different "
        "numbers of modules), PV cables of both sized for the same fractional loss",
        hsrc,
        pwm=f"{pwm[m]:.0f} Wh/day from {n_pwm} modules ({per_pwm:.1f} per module)",
        mppt=f"{mppt[m]:.0f} Wh/day from {n_mppt} modules ({per_mppt:.1f} per module)",
    )
    rb.add(
        "harvest.shortfall_pct",
        "1 - harvest through the chosen controller x battery "
        "round trip / demand, in the month where it is largest, when positive",
        hsrc,
        month=MONTH_NAMES[ms],
        harvest=fmt(float(chosen[ms]), "Wh/day"),
        round_trip=fmt(eta_batt),
        demand=fmt(demand, "Wh/day"),
    )
    rb.add(
        "harvest.pwm_layout",
        "series x parallel the PWM figures assume: the fewest modules "
        "in series whose STC Vmp suits the battery",
        "common practice, no source",
    )
    rb.add(
        "harvest.mppt_layout",
        "series x parallel the MPPT figures assume: a layout in the MPPT string window",
        "common practice, no source",
    )
    rb.add(
        "array.harvest_mppt_wh_day",
        "sum over the day of the array's maximum power less cable I^2 R, x controller efficiency",
        hsrc,
        series=str(mppt_layout.series),
        parallel=str(mppt_layout.parallel),
        efficiency=fmt(eff),
        soiling=fmt(soiling),
        mismatch=fmt(mismatch),
    )
    rb.add(
        "array.harvest_pwm_wh_day",
        "sum over the day of battery voltage x array current at (battery voltage + cable drop)",
        hsrc,
        charging_voltage=fmt(v_chg, "V"),
        series=str(pwm_layout.series),
        parallel=str(pwm_layout.parallel),
    )
    if shortfall > 0.5:
        notices.append(
            Notice(
                "harvest-shortfall",
                f"Through the {ctype.upper()} controller the array delivers "
                f"{chosen[ms]:.0f} Wh/day in {MONTH_NAMES[ms]}; after the battery's round trip "
                f"({eta_batt:.0%}) that is {shortfall:.0f} % below the {demand:.0f} Wh/day the "
                "loads need: add modules"
                + (" or use an MPPT controller" if ctype == "pwm" else "")
                + ".",
                "warning",
                "array.harvest_pwm_wh_day" if ctype == "pwm" else "array.harvest_mppt_wh_day",
            )
        )
    if ctype == "pwm" and pwm_vs < -20.0:
        notices.append(
            Notice(
                "pwm-mismatch",
                f"This module suits a PWM controller badly at {vsys:.0f} V: PWM "
                f"harvests {-pwm_vs:.0f} % less per module than MPPT would in the design month. "
                "Use an MPPT "
                "controller or modules whose Vmp is nearer the battery voltage.",
                "warning",
                "array.harvest_pwm_wh_day",
            )
        )

    # Protection.
    bat = core.battery
    unit_sc, estimated = prot.unit_short_circuit_a(
        bat.chemistry, project.battery.capacity_ah, wiring.battery_short_circuit_a
    )
    fault = prot.bank_fault_current_a(unit_sc, int(bat.units_parallel))
    bank_v = v_abs * 1.1
    devices: list[prot.Device] = []
    if fuses_needed:
        devices.append(
            prot.Device(
                "each PV string, in the combiner (both poles if ungrounded)",
                "fuse",
                string_fuse,
                strings.string_voc_cold_v,
                layout.parallel,
                note="gPV fuses, IEC 60269-6",
                source=f"{NEC} 690.9(A),(B)",
            )
        )
    devices.append(
        prot.Device(
            "PV disconnect and breaker at each controller's input",
            "fuse or breaker",
            array_fuse,
            strings.string_voc_cold_v,
            controllers,
            source=f"{NEC} 690.9(B), 690.13, 690.15",
        )
    )
    devices.append(
        prot.Device(
            "each controller's battery output, at the battery end",
            "fuse or breaker",
            charge_fuse,
            bank_v,
            controllers,
            interrupt_rating_a=fault,
            source=f"{NEC} 240.21, 690.9",
        )
    )
    if battery_fuse is not None:
        devices.append(
            prot.Device(
                "battery fuse at the battery terminal, inverter circuit",
                "fuse",
                battery_fuse,
                bank_v,
                1,
                interrupt_rating_a=fault,
                source=f"{NEC} 706.31, 240.6(A)",
            )
        )
    n_bat = int(bat.units_parallel)
    bat_string_fuse = None
    # the largest current through the battery terminals: all discharge circuits, or all charge
    total = (1.25 * float(inv.dc_input_current_a) if inv.needed else 0.0) + sum(
        1.25 * w.current_a for w in wires if w.key.startswith("load")
    )
    total = max(total, 1.25 * i_charge_max * controllers)
    if n_bat >= 2:
        bat_string_fuse = prot.standard_rating_a(
            total / n_bat, what="battery string fuse", field="battery.capacity_ah"
        )
        devices.append(
            prot.Device(
                "each parallel battery string, at its positive terminal",
                "fuse",
                bat_string_fuse,
                bank_v,
                n_bat,
                interrupt_rating_a=fault,
                note="a fault in one string is fed by all the others",
                source="common practice, no source",
            )
        )
    disconnect_a = prot.standard_rating_a(
        total, fuse=False, what="battery disconnect", field="loads"
    )
    devices.append(
        prot.Device(
            "battery disconnect, readily accessible, at the battery",
            "disconnect",
            disconnect_a,
            bank_v,
            1,
            note="rated for the largest current through the terminals",
            source=f"{NEC} 706.15",
        )
    )
    for w in wires:
        if w.key.startswith("load"):
            load = project.loads[int(w.key[4:]) - 1]
            note = ""
            if load.surge_w > load.power_w > 0:
                note = (
                    f"starts at about {load.quantity * load.surge_w / vsys:.0f} A: a "
                    "time-delay fuse or a breaker with a motor-start curve"
                )
            devices.append(
                prot.Device(
                    f"{w.run} circuit, at the DC distribution board",
                    _device_kind(w.fuse_a, "fuse or breaker"),
                    w.fuse_a,
                    bank_v,
                    1,
                    note=note,
                    source=f"{NEC} 240.4, 240.6(A)",
                )
            )
    protection = ProtectionResult(
        tuple(devices),
        fuses_needed,
        string_fuse,
        battery_fuse,
        unit_sc,
        estimated,
        fault,
        n_bat if n_bat >= 2 else 0,
        bat_string_fuse,
    )
    rb.add(
        "protection.bank_fault_current_a",
        "sum over parallel strings of one unit's short-circuit current",
        "datasheet" if not estimated else "estimate per Ah of capacity, from memory, no source",
        unit=fmt(unit_sc, "A"),
        strings=str(n_bat),
    )
    if battery_fuse is not None:
        rb.add(
            "protection.battery_fuse_a",
            "smallest standard rating >= 1.25 x inverter DC "
            "current; its DC interrupting rating must exceed the bank fault current",
            f"{NEC} 240.6(A), 706.31",
            inverter_current=fmt(float(inv.dc_input_current_a), "A"),
            fault=fmt(fault, "A"),
        )
    rb.add(
        "protection.unit_short_circuit_a",
        "one battery unit's prospective short-circuit "
        "current: the datasheet value, or an estimate per Ah of capacity",
        "datasheet"
        if not estimated
        else "estimate per Ah of capacity, from memory, no source: take it from the datasheet",
        capacity=fmt(project.battery.capacity_ah, "Ah"),
    )
    rb.add(
        "protection.battery_string_fuses",
        "one fuse per parallel battery string from two "
        "strings up (a fault in one string is fed by all the others)",
        "common practice, no source",
        strings=str(n_bat),
    )
    if bat_string_fuse is not None:
        rb.add(
            "protection.battery_string_fuse_a",
            "smallest standard rating >= (1.25 x the "
            "largest current the bank delivers or takes) / parallel strings",
            f"{NEC} 240.6(A); sharing common practice, no source",
            strings=str(n_bat),
        )
    if string_fuse is not None:
        rb.add(
            "protection.string_fuse_a",
            "smallest standard rating >= 1.56 x Isc, not above the module's maximum series fuse",
            f"{NEC} 690.9(B), 240.6(A)",
            isc=fmt(isc, "A"),
        )
    for key, formula in (
        ("rating_a", "each device's rating as its cable's fuse (the source beside each)"),
        (
            "voltage_v",
            "minimum DC voltage rating: the string cold Voc on the PV side, 1.1 x "
            "the absorption voltage on the battery side",
        ),
        ("count", "one device per string, per controller or per battery string as listed"),
        (
            "interrupt_rating_a",
            "minimum DC interrupting rating: the bank's prospective fault current",
        ),
    ):
        rb.add(
            f"protection.devices.{key}",
            formula,
            f"{NEC} 240.6(A), 690.9, 706.15",
            bank_voltage=fmt(bank_v, "V"),
            string_voc_cold=fmt(strings.string_voc_cold_v, "V"),
            fault=fmt(fault, "A"),
        )
    rb.add(
        "protection.string_fuses",
        "string fuses from three strings in parallel per "
        "controller (or when the back-feed exceeds the module's series fuse rating)",
        f"{NEC} 690.9(A); IEC 62548:2016 7.3.3",
        strings_per_controller=str(n_c),
    )

    # Cautions.
    cells = round(vsys / (3.0 if bat.chemistry == "lifepo4" else 2.0))  # as sizing.py
    cautions = cau.design_cautions(
        cau.CautionInputs(
            max_dc_voltage_v=strings.string_voc_cold_v,
            system_voltage_v=vsys,
            chemistry=bat.chemistry,
            cells_in_series=cells,
            bank_capacity_ah=float(bat.capacity_ah),
            max_dod=float(bat.max_dod),
            battery_min_temp_c=_battery_min_temp_c(project, core),
            bank_fault_current_a=fault,
            battery_min_source=(
                "the battery room, site.battery_temp_c"
                if project.site.battery_temp_c is not None
                else "the site's record low, outdoors"
            ),
            fault_current_estimated=estimated,
            ambient_for_wires_c=ambient,
            array_run_m=float(wiring.array_run_m),
            strings=layout.parallel,
        )
    )

    return ElectricalResult(
        params,
        mpp,
        curve,
        strings,
        harvest,
        wires,
        protection,
        cautions,
        tuple(notices),
        rb.freeze(),
    )
