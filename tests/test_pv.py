"""Module model: the single-diode fit and the I-V curves, checked against pvlib.

Datasheets below are invented generic modules (no brand, no product file): the
check is that the fit reproduces the values it was given, and that our own
curve computation agrees with pvlib's independent Lambert-W solution.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from offgrid.design import pv
from offgrid.design.result import DesignError
from offgrid.project.model import ModuleSpec

# Invented datasheets spanning 36-cell to 72-cell (half-cut) modules.
DATASHEETS = {
    "60-cell": ModuleSpec(),
    "72-cell": ModuleSpec(
        pmax_w=330,
        vmp_v=37.6,
        imp_a=8.78,
        voc_v=45.9,
        isc_a=9.34,
        beta_voc_pct_per_c=-0.31,
        cells_in_series=72,
        area_m2=1.94,
    ),
    "36-cell": ModuleSpec(
        pmax_w=100,
        vmp_v=18.0,
        imp_a=5.56,
        voc_v=22.1,
        isc_a=5.95,
        alpha_isc_pct_per_c=0.06,
        beta_voc_pct_per_c=-0.33,
        cells_in_series=36,
        area_m2=0.67,
    ),
    "144-half-cut": ModuleSpec(
        pmax_w=550,
        vmp_v=41.5,
        imp_a=13.25,
        voc_v=49.5,
        isc_a=13.9,
        alpha_isc_pct_per_c=0.048,
        beta_voc_pct_per_c=-0.27,
        cells_in_series=72,
        area_m2=2.58,
    ),
}


def _pvlib_desoto(module):
    from pvlib.ivtools.sdm import fit_desoto

    p, _ = fit_desoto(
        module.vmp_v,
        module.imp_a,
        module.voc_v,
        module.isc_a,
        module.alpha_isc_pct_per_c / 100 * module.isc_a,
        module.beta_voc_pct_per_c / 100 * module.voc_v,
        module.cells_in_series,
        root_kwargs={"method": "lm"},
    )
    return p


def _pvlib_params(params: pv.DiodeParams, g, t):
    from pvlib.pvsystem import calcparams_desoto

    return calcparams_desoto(
        g,
        t,
        params.alpha_isc_a_per_c,
        params.modified_ideality_v,
        params.photocurrent_a,
        params.saturation_current_a,
        params.shunt_resistance_ohm,
        params.series_resistance_ohm,
    )


@pytest.mark.parametrize("name", DATASHEETS)
def test_fit_reproduces_datasheet_at_stc_within_half_percent(name):
    # Issue 4 acceptance: Vmp, Imp, Voc, Isc at STC within 0.5 % (De Soto et al. 2006, the
    # five equations at STC); our own I-V solver evaluates the fitted model.
    m = DATASHEETS[name]
    p = pv.fit_module(m)
    op = pv.operating_point(p, 1000.0, 25.0, m.area_m2)
    for got, want in (
        (op.vmp_v, m.vmp_v),
        (op.imp_a, m.imp_a),
        (op.voc_v, m.voc_v),
        (op.isc_a, m.isc_a),
    ):
        assert got == pytest.approx(want, rel=0.005)
    assert max(abs(e) for e in p.stc_error_pct) <= 0.5
    assert p.method.startswith("De Soto")


@pytest.mark.parametrize("name", DATASHEETS)
def test_fit_matches_pvlib_fit_desoto(name):
    # Reference: pvlib.ivtools.sdm.fit_desoto (De Soto et al. 2006) with the Levenberg-
    # Marquardt solver; we solve the same five equations by our own Newton iteration.
    m = DATASHEETS[name]
    ours = pv.fit_module(m)
    ref = _pvlib_desoto(m)
    assert ours.photocurrent_a == pytest.approx(ref["I_L_ref"], rel=1e-6)
    assert ours.saturation_current_a == pytest.approx(ref["I_o_ref"], rel=1e-4)
    assert ours.series_resistance_ohm == pytest.approx(ref["R_s"], rel=1e-5)
    assert ours.shunt_resistance_ohm == pytest.approx(ref["R_sh_ref"], rel=1e-5)
    assert ours.modified_ideality_v == pytest.approx(ref["a_ref"], rel=1e-6)


def test_batzelis_start_matches_pvlib():
    # Reference: pvlib.ivtools.sdm.fit_desoto_batzelis (Batzelis 2017, eqs. 9-15).
    from pvlib.ivtools.sdm import fit_desoto_batzelis

    m = DATASHEETS["72-cell"]
    a, b = m.alpha_isc_pct_per_c / 100 * m.isc_a, m.beta_voc_pct_per_c / 100 * m.voc_v
    ours = pv.fit_batzelis2017(m.vmp_v, m.imp_a, m.voc_v, m.isc_a, a, b)
    ref = fit_desoto_batzelis(m.vmp_v, m.imp_a, m.voc_v, m.isc_a, a, b)
    for k, rk in (
        ("IL", "I_L_ref"),
        ("I0", "I_o_ref"),
        ("Rs", "R_s"),
        ("Rsh", "R_sh_ref"),
        ("a", "a_ref"),
    ):
        assert ours[k] == pytest.approx(float(ref[rk]), rel=1e-9)


def test_lambert_w_identity():
    # Definition of Lambert's W: W(x e^x) = x, i.e. W(exp(x + ln x)) = x.
    for x in (1.5, 3.0, 25.0, 40.0):
        assert pv._lambertw_of_exp(x + math.log(x)) == pytest.approx(x, rel=1e-12)


G = np.array([50.0, 200.0, 500.0, 800.0, 1000.0, 1100.0])
T = np.array([-10.0, 5.0, 25.0, 45.0, 60.0, 75.0])


def test_translation_to_conditions_matches_pvlib_calcparams_desoto():
    # Reference: pvlib.pvsystem.calcparams_desoto (De Soto et al. 2006 eqs. 8-12, M = 1).
    p = pv.fit_module(ModuleSpec())
    ours = pv.calcparams_desoto(p, G, T)
    ref = _pvlib_params(p, G, T)
    for o, r in zip(ours, ref, strict=True):
        np.testing.assert_allclose(o, r, rtol=1e-9)


def test_key_points_match_pvlib_singlediode():
    # Reference: pvlib.pvsystem.singlediode, Lambert-W method (Jain & Kapoor 2004); ours is
    # Bishop's (1988) diode-voltage form with our own Newton iterations.
    from pvlib.pvsystem import singlediode

    p = pv.fit_module(ModuleSpec())
    ref = singlediode(*_pvlib_params(p, G, T), method="lambertw")
    il, i0, rs, rsh, a = pv.calcparams_desoto(p, G, T)
    vmp, imp, pmp = pv.max_power_point(il, i0, rs, rsh, a)
    np.testing.assert_allclose(pmp, ref["p_mp"], rtol=1e-8)
    np.testing.assert_allclose(vmp, ref["v_mp"], rtol=1e-6)
    np.testing.assert_allclose(imp, ref["i_mp"], rtol=1e-6)
    np.testing.assert_allclose(pv.open_circuit_voltage(il, i0, rsh, a), ref["v_oc"], rtol=1e-9)
    np.testing.assert_allclose(
        pv.current_at_voltage(0.0, il, i0, rs, rsh, a), ref["i_sc"], rtol=1e-9
    )


def test_curve_points_match_pvlib_i_from_v():
    # Reference: pvlib.pvsystem.i_from_v (Lambert W) at the same voltages as our curve.
    from pvlib.pvsystem import i_from_v

    p = pv.fit_module(DATASHEETS["72-cell"])
    curve = pv.iv_curve(p, 650.0, 38.0, 1.94, points=41)
    il, i0, rs, rsh, a = _pvlib_params(p, 650.0, 38.0)
    ref = i_from_v(np.array(curve.voltage_v), il, i0, rs, rsh, a)
    np.testing.assert_allclose(curve.current_a[:-1], ref[:-1], rtol=1e-8, atol=1e-9)
    assert curve.current_a[-1] == 0.0  # Voc
    assert max(curve.power_w) <= curve.point.pmp_w + 1e-9
    assert np.all(np.diff(curve.current_a) <= 0)


def test_fill_factor_and_efficiency_at_stc():
    # Definitions: FF = Pmp / (Voc Isc); efficiency = Pmp / (G x area).  At STC the model
    # returns the datasheet, so FF = 32.5 x 9.23 / (39.8 x 9.75) = 0.7730 and efficiency
    # = 299.975 / (1000 x 1.63) = 0.1840 (worked by hand).
    m = ModuleSpec()
    op = pv.operating_point(pv.fit_module(m), 1000.0, 25.0, m.area_m2)
    assert op.fill_factor == pytest.approx(0.7730, abs=2e-4)
    assert op.efficiency == pytest.approx(0.1840, abs=2e-4)


def test_ross_cell_temperature_at_noct_conditions():
    # NOCT definition (IEC 61215: 800 W/m2, 20 C air): the cell is at NOCT.
    assert float(pv.cell_temperature_ross(20.0, 800.0, 45.0)) == pytest.approx(45.0)
    # Duffie & Beckman eq. 23.3.3 without the efficiency term: 30 + 25 x 1000/800 = 61.25 C.
    assert float(pv.cell_temperature_ross(30.0, 1000.0, 45.0)) == pytest.approx(61.25)


def test_ross_cell_temperature_matches_pvlib_ross_with_noct_k():
    # Reference library: pvlib.temperature.ross (pvlib 0.16), Ross (1976) with the NOCT-derived
    # k = (NOCT - 20) / 800 K m2/W; pvlib computes it from ``noct`` itself.
    pvlib_temperature = pytest.importorskip("pvlib.temperature")
    ambient = np.array([-10.0, 0.0, 25.0, 42.0])
    g = np.array([[0.0], [200.0], [800.0], [1100.0]])
    for noct in (41.0, 45.0, 49.5):
        ours = pv.cell_temperature_ross(ambient, g, noct)
        theirs = pvlib_temperature.ross(g, ambient, noct=noct)
        np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-12)
        k = (noct - 20.0) / 800.0
        np.testing.assert_allclose(ours, pvlib_temperature.ross(g, ambient, k=k), atol=1e-12)


def test_one_ross_function_behind_sizing_harvest_and_electrical():
    # The former second copies are gone: the design steps use the one function.
    from offgrid.design import electrical, harvest, sizing

    assert not hasattr(pv, "cell_temperature_noct")
    assert sizing.cell_temperature_ross is pv.cell_temperature_ross
    assert harvest.cell_temperature_ross is pv.cell_temperature_ross
    assert electrical.cell_temperature_ross is pv.cell_temperature_ross


def test_the_sizing_figure_is_the_one_ross_function():
    # The design's monthly cell temperature (array.cell_temp_c) is exactly the one function
    # at the day's air temperature and the energy-weighted irradiance of the month.
    from offgrid.climate import sky
    from offgrid.design.sizing import design, energy_weighted_irradiance
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    project = load_project(demo_project_path())
    d = design(project, demo_project_path().parent)
    g = energy_weighted_irradiance(
        np.asarray(d.site.poa_kwh_m2_day), sky.daylight_hours(d.site.latitude_deg)
    )
    expect = pv.cell_temperature_ross(d.site.temp_day_c, g, project.module.noct_c)
    np.testing.assert_array_equal(np.asarray(d.array.cell_temp_c), expect)


def test_dark_gives_zero_power_and_current():
    p = pv.fit_module(ModuleSpec())
    v, i, pw = pv.module_mpp(p, np.array([0.0, 0.0]), np.array([10.0, 30.0]))
    assert np.all(v == 0) and np.all(i == 0) and np.all(pw == 0)
    assert np.all(pv.module_current(p, 12.0, np.array([0.0]), np.array([20.0])) == 0)


def test_current_above_voc_is_clipped_for_harvest():
    # LIBRARY-NOTES: i_from_v goes negative above Voc; a battery cannot push current back.
    p = pv.fit_module(ModuleSpec())
    assert float(pv.module_current(p, 45.0, 1000.0, 25.0)) == 0.0


@pytest.mark.parametrize(
    "change, field, words",
    [
        ({"vmp_v": 41.0}, "module.vmp_v", "below Voc"),
        ({"imp_a": 10.0, "pmax_w": 325.0}, "module.imp_a", "below Isc"),
        ({"beta_voc_pct_per_c": 0.3}, "module.beta_voc_pct_per_c", "must be negative"),
        ({"alpha_isc_pct_per_c": -0.05}, "module.alpha_isc_pct_per_c", "positive"),
        ({"gamma_pmax_pct_per_c": 0.4}, "module.gamma_pmax_pct_per_c", "must be negative"),
        ({"pmax_w": 350.0}, "module.pmax_w", "Vmp x Imp"),
        ({"area_m2": 16300.0}, "module.area_m2", "m2, not cm2"),
        ({"isc_a": 0.0}, "module.isc_a", "positive"),
    ],
)
def test_bad_datasheet_is_refused_with_the_field_and_fix(change, field, words):
    m = ModuleSpec(**change)
    with pytest.raises(DesignError) as err:
        pv.fit_module(m)
    assert err.value.field == field
    assert words in str(err.value)


def test_cells_in_series_that_look_wrong_give_a_warning():
    m = DATASHEETS["144-half-cut"]
    m = ModuleSpec(**{**m.__dict__, "cells_in_series": 144})
    assert any("half-cut" in w for w in pv.validate_module(m))


def test_fit_falls_back_to_pvlib_then_refuses(monkeypatch):
    m = ModuleSpec()
    monkeypatch.setattr(pv, "fit_desoto2006", lambda *a, **k: None)
    assert "pvlib" in pv.fit_module(m).method
    monkeypatch.setattr(pv, "_fit_desoto_pvlib", lambda *a, **k: None)
    # The Batzelis explicit values alone miss Vmp by 0.58 % on this datasheet (pvlib's
    # fit_desoto_batzelis gives the same), beyond the 0.5 % tolerance: refuse clearly.
    with pytest.raises(DesignError, match=r"within 0\.5 %") as err:
        pv.fit_module(m)
    assert err.value.code == "module-fit"


def test_fit_without_voc_coefficient_still_works():
    m = ModuleSpec(beta_voc_pct_per_c=None)
    p = pv.fit_module(m)
    assert max(abs(e) for e in p.stc_error_pct) < 0.5
