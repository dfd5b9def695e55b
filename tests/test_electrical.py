"""The electrical design inside the pipeline: harvest against pvlib, layout, JSON, bad input."""

from __future__ import annotations

import json

import numpy as np
import pytest

from offgrid.climate import sky
from offgrid.climate.poa import poa_monthly_liu_jordan
from offgrid.design import pv
from offgrid.design.harvest import HarvestInputs, daily_poa_profile, harvest_wh_day
from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.model import ModuleSpec
from offgrid.project.store import dumps_project, load_project, loads_project
from tests.conftest import hand_project


def _36_cell() -> ModuleSpec:
    return ModuleSpec(
        name="Generic 36-cell 100 W (invented)",
        pmax_w=100,
        vmp_v=18.0,
        imp_a=5.56,
        voc_v=22.1,
        isc_a=5.95,
        alpha_isc_pct_per_c=0.06,
        beta_voc_pct_per_c=-0.33,
        cells_in_series=36,
        area_m2=0.67,
    )


def test_profile_integrates_to_the_monthly_poa():
    h = [5.6, 5.7, 5.5, 5.3, 5.0, 4.7, 4.9, 5.5, 6.2, 6.5, 6.0, 5.6]
    poa = poa_monthly_liu_jordan(h, -12.0, 15.0, 0.0)["poa"]
    g, dt = daily_poa_profile(h, poa, -12.0, 15.0, 0.0)
    np.testing.assert_allclose((g * dt[:, None]).sum(axis=1) / 1000.0, poa, rtol=1e-12)
    assert np.all(g >= 0)
    # Equator-facing: the day is symmetric about solar noon and peaks there.
    np.testing.assert_allclose(g, g[:, ::-1], rtol=1e-9, atol=1e-9)
    assert np.all(np.argmax(g, axis=1) >= g.shape[1] // 2 - 1)
    # Day length: 2 ws / 15 h (D&B eq. 1.6.11) = steps x step.
    np.testing.assert_allclose(dt * g.shape[1], sky.daylight_hours(-12.0), rtol=1e-12)


def _reference_harvest(params, g, dt, ambient, noct, h: HarvestInputs):
    """MPPT and PWM daily energy with pvlib's singlediode and i_from_v (no cable losses)."""
    from pvlib.pvsystem import calcparams_desoto, i_from_v, singlediode

    gs = g * h.soiling
    tc = ambient[:, None] + (noct - 20.0) / 800.0 * gs
    lit = gs > 0.5
    args = calcparams_desoto(
        np.where(lit, gs, 1.0).ravel(),
        tc.ravel(),
        params.alpha_isc_a_per_c,
        params.modified_ideality_v,
        params.photocurrent_a,
        params.saturation_current_a,
        params.shunt_resistance_ohm,
        params.series_resistance_ohm,
    )
    sd = singlediode(*args, method="lambertw")  # 1-D: pvlib returns a DataFrame for 1-D
    pmp = np.where(lit, np.asarray(sd["p_mp"]).reshape(g.shape), 0.0)
    n = h.strings_per_controller * h.controllers
    mppt = (h.series * n * pmp * h.mismatch * h.controller_efficiency * dt[:, None]).sum(axis=1)
    i_ref = np.asarray(i_from_v(h.battery_v / h.series, *args)).reshape(g.shape)
    i = np.where(lit, np.maximum(i_ref, 0.0), 0.0)
    pwm = (h.battery_v * n * i * h.mismatch * h.controller_efficiency * dt[:, None]).sum(axis=1)
    return mppt, pwm


def test_harvest_both_ways_matches_pvlib_without_cable_losses():
    # Reference: pvlib.pvsystem.singlediode (MPP) and i_from_v (PWM at battery voltage),
    # Lambert-W; ours: Bishop (1988) form, own Newton.  Same profile, same cell temperature.
    h = [5.6, 5.7, 5.5, 5.3, 5.0, 4.7, 4.9, 5.5, 6.2, 6.5, 6.0, 5.6]
    poa = poa_monthly_liu_jordan(h, -12.0, 15.0, 0.0)["poa"]
    g, dt = daily_poa_profile(h, poa, -12.0, 15.0, 0.0)
    amb = np.array([25.0, 25, 25, 24, 22, 20, 20, 22, 26, 28, 27, 25])
    params = pv.fit_module(ModuleSpec())
    hin = HarvestInputs(
        series=1,
        strings_per_controller=3,
        controllers=2,
        battery_v=27.0,
        controller_efficiency=0.97,
        soiling=0.95,
        mismatch=0.98,
        string_loop_ohm=0.0,
        array_loop_ohm=0.0,
        charge_loop_ohm=0.0,
    )
    mppt, pwm = harvest_wh_day(params, g, dt, amb, 45.0, hin)
    ref_mppt, ref_pwm = _reference_harvest(params, g, dt, amb, 45.0, hin)
    np.testing.assert_allclose(mppt, ref_mppt, rtol=1e-7)
    np.testing.assert_allclose(pwm, ref_pwm, rtol=1e-7)
    assert np.all(pwm < mppt)


def test_cable_resistance_lowers_harvest():
    h = [5.0] * 12
    g, dt = daily_poa_profile(h, h, 10.0, 0.0, 180.0)
    params = pv.fit_module(ModuleSpec())
    amb = np.full(12, 25.0)
    base = HarvestInputs(2, 2, 1, 27.0, 0.97, 1.0, 1.0, 0.0, 0.0, 0.0)
    lossy = HarvestInputs(2, 2, 1, 27.0, 0.97, 1.0, 1.0, 0.05, 0.1, 0.01)
    m0, p0 = harvest_wh_day(params, g, dt, amb, 45.0, base)
    m1, p1 = harvest_wh_day(params, g, dt, amb, 45.0, lossy)
    assert np.all(m1 < m0) and np.all(p1 <= p0)


def test_demo_json_has_the_electrical_keys():
    d = design(load_project(demo_project_path()), demo_project_path().parent)
    data = json.loads(json.dumps(d.to_dict()))
    a = data["array"]
    assert a["voc_cold_v"] > 39.8 and a["vmp_hot_v"] < 32.5
    assert data["controller"]["max_pv_voltage_v"] == 150
    assert len(a["harvest_pwm_wh_day"]) == 12 and len(a["harvest_mppt_wh_day"]) == 12
    assert all(
        p < m for p, m in zip(a["harvest_pwm_wh_day"], a["harvest_mppt_wh_day"], strict=True)
    )
    assert {"vmp_v", "imp_a", "pmp_w", "fill_factor"} <= set(data["mpp"])
    assert 0.6 < data["mpp"]["fill_factor"] < 0.85
    runs = {w["run"] for w in data["wires"]}
    assert {"array to controller", "controller to battery", "battery to inverter"} <= runs
    for w in data["wires"]:
        assert {
            "run",
            "current_a",
            "length_m",
            "material",
            "size",
            "drop_pct",
            "ampacity_a",
            "fuse_a",
        } <= set(w)
        assert w["ampacity_a"] >= 1.25 * w["current_a"] - 1e-6
        if w["fuse_a"] is not None:
            assert w["current_a"] * 1.25 <= w["fuse_a"] + 1e-6 <= w["ampacity_a"] + 1e-6
    # the string's cold Voc stays under the controller's maximum
    assert data["electrical"]["strings"]["string_voc_cold_v"] <= 150
    for key in (
        "array.voc_cold_v",
        "array.vmp_hot_v",
        "array.harvest_pwm_wh_day",
        "array.harvest_mppt_wh_day",
        "mpp.pmp_w",
        "wires.array.size",
        "wires.charge.drop_pct",
        "protection.bank_fault_current_a",
    ):
        assert data["reasons"][key]["source"], key
    assert data["cautions"][-1].startswith("This design defers to local electrical codes")


def test_hand_project_layout_and_harvest_cover_the_demand(project):
    d = design(project)
    e = d.electrical
    assert (e.strings.layout.series, e.strings.layout.parallel) == (
        d.array.modules_series,
        d.array.modules_parallel,
    )
    assert not e.strings.layout_changed
    dm = d.site.design_month - 1
    assert e.harvest.mppt_wh_day[dm] * project.battery.efficiency >= (
        d.loads.design_daily_energy_wh
    )
    assert e.harvest.shortfall_pct == 0.0


def test_pwm_with_a_36_cell_module_on_12_v():
    p = hand_project()
    p.choices.system_voltage = 12
    p.module = _36_cell()
    p.controller.type = "pwm"
    d = design(p)
    e = d.electrical
    assert e.strings.layout.series == 1
    # A "12 V" module suits PWM on 12 V: within 25 % of MPPT (common practice, no source),
    # unlike the 60-cell module on 24 V below.
    assert -25.0 < e.harvest.pwm_vs_mppt_pct < 0.0
    assert d.controller.count >= 2
    arr = next(w for w in e.wires if w.key == "array")
    assert arr.count == d.controller.count
    assert e.protection.string_fuses  # more than two strings per controller
    codes = {n.code for n in d.warnings}
    assert "raise-system-voltage" in codes  # 12 V array cable needs a very large size


def test_pwm_with_a_60_cell_module_on_12_v_warns(project):
    project.controller.type = "pwm"
    project.choices.system_voltage = 12
    d = design(project)
    assert d.electrical.harvest.pwm_vs_mppt_pct < -40
    codes = [n.code for n in d.warnings]
    assert "pwm-mismatch" in codes and "pwm-voltage-waste" not in codes


def test_pwm_60_cell_on_24_v_is_suitable_but_short_in_the_heat(project):
    # Module suitability for PWM: STC Vmp 32.5 V >= absorption 28.8 V + 3 % drop = 29.66 V,
    # so one in series; hot Vmp (56.25 C) 28.64 V < 29.66 V -> an info notice.
    project.controller.type = "pwm"
    d = design(project)
    assert d.array.modules_series == 1
    assert d.electrical.strings.window.required_vmp_v == pytest.approx(28.8 * 1.03)
    assert "pwm-hot-vmp" in {n.code for n in d.warnings}
    assert -25 < d.electrical.harvest.pwm_vs_mppt_pct < 0


def test_array_is_raised_when_the_chosen_harvest_falls_short(project, monkeypatch):
    import offgrid.design.electrical.harvest_compare as el

    real = el.harvest_wh_day

    def weak(*args, **kw):  # a controller that delivers only 60 % of the curves' energy
        m, p = real(*args, **kw)
        return 0.6 * m, 0.6 * p

    first = design(project).array.module_count
    monkeypatch.setattr(el, "harvest_wh_day", weak)
    d = design(project)
    assert d.array.module_count > first
    assert d.electrical.harvest.shortfall_pct <= 0.5
    assert "array-raised-for-harvest" in {n.code for n in d.warnings}
    assert d.controller.current_a >= d.controller.required_current_a / d.controller.count


def test_awg_and_aluminium(project):
    project.wiring.units = "awg"
    project.wiring.material = "aluminium"
    e = design(project).electrical
    assert all(w.size.endswith(("AWG", "kcmil")) for w in e.wires)
    assert all(w.material == "aluminium" for w in e.wires)
    assert all(w.size != "14 AWG" for w in e.wires)  # not listed in aluminium


def test_datasheet_short_circuit_and_battery_string_fuses(project):
    project.wiring.battery_short_circuit_a = 4000.0
    d = design(project)
    pr = d.electrical.protection
    n = d.battery.units_parallel
    assert pr.bank_fault_current_a == pytest.approx(4000.0 * n)
    assert not pr.short_circuit_estimated
    assert pr.battery_string_fuses == n and n >= 2
    assert any(dev.location.startswith("each parallel battery string") for dev in pr.devices)


@pytest.mark.parametrize("length", [0.0, 10000.0])
def test_bad_run_length_in_a_project(project, length):
    project.wiring.array_run_m = length
    with pytest.raises(DesignError) as err:
        design(project)
    assert err.value.field == "wiring.array_run_m"


def test_no_series_count_fits_in_a_project(project):
    project.controller.max_pv_voltage_v = 60.0  # 1 x 42.2 V fits, 2 needed at 24 V
    with pytest.raises(DesignError, match="no series count fits") as err:
        design(project)
    assert "at least 85 V" in str(err.value)  # ceil(2 x 42.19)


def test_bad_module_in_a_project(project):
    project.module.imp_a = 9.9  # above Isc 9.75
    project.module.pmax_w = 321.75
    with pytest.raises(DesignError) as err:
        design(project)
    assert err.value.field == "module.imp_a"


def test_missing_voc_coefficient_uses_nec_table_and_survives_a_save(project):
    project.module.beta_voc_pct_per_c = None
    d = design(project)
    # record low 5 C: NEC Table 690.7(A) row 9 to 5 C -> 1.08; 39.8 x 1.08 = 42.984 V.
    assert d.array.voc_cold_v == pytest.approx(42.984)
    assert "690.7(A) factor" in d.electrical.strings.voc_cold_rule
    again = loads_project(dumps_project(project))
    assert again.module.beta_voc_pct_per_c is None


def test_wiring_section_round_trips(project):
    project.loads[0].run_m = 22.5  # "DC lights"
    project.wiring.units = "awg"
    project.wiring.battery_short_circuit_a = 3500.0
    again = loads_project(dumps_project(project))
    assert again.wiring == project.wiring and again.loads == project.loads
    load = next(w for w in design(again).electrical.wires if w.run == "DC load 'DC lights'")
    assert load.key == "load1"  # first line of the load list
    assert load.length_m == 22.5


def test_wiring_derate_far_from_the_sized_cables_is_noted():
    # Drop % at the operating current ~ share of power lost in the cable (common practice).
    from offgrid.design.sizing import design
    from tests.conftest import hand_project

    p = hand_project()
    assert "wiring-derate-vs-cables" not in {n.code for n in design(p).warnings}
    p.choices.derates.wiring = 0.8
    d = design(p)
    note = next(n for n in d.warnings if n.code == "wiring-derate-vs-cables")
    loss = sum(w.drop_pct for w in d.electrical.wires if w.key in ("string", "array", "charge"))
    assert f"{loss / 100:.1%}" in note.message and "choices.derates.wiring" in note.message
