"""Electrical design after the worst-month core: strings, harvest, cables, protection, cautions.

``electrical_design(project, core)`` takes the project and the
:class:`~offgrid.design.result.SystemDesign` of the worst-month sizing and returns an
:class:`ElectricalResult`: every figure carries its reason.  Each sub-step is its own module
and returns its record with its own reasons and notices:

- :mod:`.operating_point`: the module's fit, the design month's noon I-V curve;
- :mod:`.string_layout`: the string window and the layout in it;
- :mod:`.cable_runs`: each circuit's currents, fuse and conductor;
- :mod:`.harvest_compare`: the harvest through PWM and MPPT from the I-V curves;
- :mod:`.protection_schedule`: the protective devices and the bank's fault current;
- :mod:`.records`: the result records.
"""

from __future__ import annotations

from offgrid.design import cautions as cau
from offgrid.design.battery import cells_in_series
from offgrid.design.charging import pwm_operating_voltage
from offgrid.design.electrical.cable_runs import (  # noqa: F401  (re-exported)
    LARGE_CONDUCTOR_MM2,
    NEC,
    WIRE_CURRENT_RULE,
    WIRE_DROP_CURRENT_RULE,
    plan_runs,
    size_cables,
    wire_ambient_c,
)
from offgrid.design.electrical.harvest_compare import (
    HarvestStep,
    compare_harvests,
)
from offgrid.design.electrical.operating_point import module_fit_step, noon_operating_point
from offgrid.design.electrical.protection_schedule import protection_schedule
from offgrid.design.electrical.records import (  # noqa: F401  (re-exported)
    ElectricalResult,
    HarvestResult,
    ProtectionResult,
    StringDesign,
)
from offgrid.design.electrical.string_layout import (  # noqa: F401  (re-exported)
    HOT_IRRADIANCE_W_M2,
    StringLimits,
    lay_out_strings,
    string_limits,
)
from offgrid.design.pv import DiodeParams, cell_temperature_ross, fit_module  # noqa: F401
from offgrid.design.result import Notice, ReasonBook


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


def _derate(core, project, name: str) -> float:
    value = core.array.derates.get(name) if core.array.derates else None
    if value is None:
        value = getattr(project.choices.derates, name)  # a name that is data: the derate's
    return float(value)


def harvest_check(project, core, params, layout, cables, noon, lim) -> HarvestStep:
    """The layout's daily harvest through its controller and cables against the design
    month's demand (:func:`~offgrid.design.electrical.harvest_compare.compare_harvests`),
    as :func:`electrical_design` runs it; the parts search (``stock/reuse.py``) calls it too.
    """
    return compare_harvests(
        params,
        project.module,
        project.controller.type,
        layout,
        cables.wires,
        noon,
        int(core.site.design_month) - 1,
        max_pv_voltage_v=float(project.controller.max_pv_voltage_v),
        voc_cold=lim.voc_cold_v,
        vmp_hot=lim.vmp_hot_v,
        vsys=float(core.battery.system_voltage_v),
        v_abs=float(core.battery.absorption_voltage_v),
        pwm_drop=lim.pwm_drop_v,
        pwm_voltage=cables.plan.pwm_voltage,
        eff=float(project.controller.efficiency),
        soiling=_derate(core, project, "soiling"),
        mismatch=_derate(core, project, "mismatch"),
        daily_energy_wh=core.loads.daily_energy_wh,
        battery_efficiency=float(project.battery.efficiency),
    )


def electrical_design(project, core, params: DiodeParams | None = None) -> ElectricalResult:
    """Electrical design of the stand-alone system sized by the worst-month core.

    ``params``: the module's fit when the caller has it already (else it is fitted here).
    The sub-steps run in order and their reasons and notices are combined in that order.
    """
    module, wiring, site = project.module, project.wiring, core.site
    if params is None:
        params = fit_module(module)
    fit = module_fit_step(module, params)
    noon = noon_operating_point(module, params, site, site.albedo or project.site.albedo)
    ctype = project.controller.type
    vsys = float(core.battery.system_voltage_v)
    v_abs = float(core.battery.absorption_voltage_v)
    lim = string_limits(
        module,
        project.controller,
        project.choices.drop_limit_array_pct,
        site.temp_day_c,  # noon.temp_day_c's months as a tuple: a cheap memo key
        float(site.record_low_c),
        v_abs,
        params,
    )
    controllers = max(1, int(core.controller.count))
    lay = lay_out_strings(
        module, params, ctype, lim, site.temp_day_c, v_abs, core.array, controllers
    )
    strings, layout = lay.strings, lay.strings.layout
    plan = plan_runs(
        module,
        params,
        ctype,
        float(project.controller.efficiency),
        float(core.controller.current_a),
        controllers,
        vsys,
        pwm_operating_voltage(core.battery.chemistry, vsys, _derate(core, project, "wiring")),
        float(core.battery.bank_voltage_v),
        layout,
        core.inverter,
        project.loads,
        wiring,
        project.choices,
    )
    ambient_c = wire_ambient_c(wiring, site.temp_day_c)
    cables = size_cables(plan, wiring, project.choices, vsys, ambient_c)
    crop = harvest_check(project, core, params, layout, cables, noon, lim)
    prot = protection_schedule(
        cables,
        strings,
        core.battery,
        core.inverter,
        project.loads,
        unit_capacity_ah=project.battery.capacity_ah,
        battery_short_circuit_a=wiring.battery_short_circuit_a,
        isc_a=module.isc_a,
        controllers=controllers,
        vsys=vsys,
        v_abs=v_abs,
    )
    rb = ReasonBook()
    for step in (fit, noon, lay, cables, crop, prot):
        rb.extend(step.reasons)
    notices: list[Notice] = [*fit.notices, *lay.notices, *cables.notices, *crop.notices]
    cautions = _cautions(project, core, strings, prot.protection, cables.ambient_c)
    return ElectricalResult(
        params,
        noon.mpp,
        noon.curve,
        strings,
        crop.harvest,
        cables.wires,
        prot.protection,
        cautions,
        tuple(notices),
        rb.freeze(),
    )


def _cautions(project, core, strings: StringDesign, protection, ambient_c: float):
    """The safety cautions the design fires (:func:`offgrid.design.cautions.design_cautions`)."""
    bat = core.battery
    vsys = float(bat.system_voltage_v)
    room = project.site.battery_temp_c
    return cau.design_cautions(
        cau.CautionInputs(
            max_dc_voltage_v=strings.string_voc_cold_v,
            system_voltage_v=vsys,
            chemistry=bat.chemistry,
            cells_in_series=round(cells_in_series(bat.chemistry, vsys)),
            bank_capacity_ah=float(bat.capacity_ah),
            max_dod=float(bat.max_dod),
            battery_min_temp_c=float(room) if room is not None else float(core.site.record_low_c),
            bank_fault_current_a=protection.bank_fault_current_a,
            battery_min_source=(
                "the battery room, site.battery_temp_c"
                if room is not None
                else "the site's record low, outdoors"
            ),
            fault_current_estimated=protection.short_circuit_estimated,
            ambient_for_wires_c=ambient_c,
            array_run_m=float(project.wiring.array_run_m),
            strings=strings.layout.parallel,
        )
    )
