"""One model per quantity: the PWM operating voltage and the peak charge current (issue 14,
item 5).

The derate chain, the I-V harvest comparison and the cable runs used to compute the voltage
a PWM array is pulled down to in two ways (1.1 x nominal against the mean of full rest and
absorption), and the battery step and the charge run the peak charge current in two ways
(strings x Imp against the I-V current; the system voltage against the bank's own). Now
``offgrid.design.charging`` holds one function for each, and every user calls it:

- battery side: charging voltage V_b = (full rest + absorption) / 2, full rest 1.05 x the
  bank's nominal voltage (cells x the chemistry's nominal cell voltage), absorption the
  chemistry's per-cell value x cells (common practice, no source);
- array side (derate chain, cable runs, peak charge current): V_a = V_b x (2 - wiring
  derate), the wiring derate's loss as the array wiring drop; the I-V harvest uses V_b
  with the sized cables' resistance as the drop instead (the same battery voltage);
- peak charge current: MPPT, STC power x controller efficiency / bank voltage; PWM,
  strings x the I-V model's module current at V_a / series at STC; at most the
  controllers' ratings. The charge run carries one controller's share: with n_c strings
  per controller, run = min(n_c x string current, rating) and peak = min(strings x string
  current, controllers x rating); strings shared equally: peak = controllers x run.
"""

from __future__ import annotations

import re
from dataclasses import replace
from pathlib import Path

import pytest

from offgrid.design.pv import fit_module
from offgrid.design.sizing import design
from tests.conftest import hand_project
from tests.test_pwm_mppt import _pwm_project

ROOT = Path(__file__).resolve().parents[1]


def _pvlib_current_stc(params, module_v):
    """Reference: pvlib.pvsystem.i_from_v with the same five De Soto parameters at STC (at
    1000 W/m2 and 25 C the De Soto parameters are their reference values)."""
    from pvlib.pvsystem import i_from_v

    return float(
        i_from_v(
            module_v,
            params.photocurrent_a,
            params.saturation_current_a,
            params.series_resistance_ohm,
            params.shunt_resistance_ohm,
            params.modified_ideality_v,
        )
    )


def _agm_12v_pwm():
    """Invented: the 36-cell 100 W module on a 12 V AGM bank through PWM."""
    return _pwm_project("pwm", 100.0)


def _lifepo4_24v_pwm():
    """Invented: the 36-cell 100 W module, two in series, on a 24 V LiFePO4 bank (two
    12.8 V units in series) through PWM."""
    p = _pwm_project("pwm", 100.0)
    p.battery = replace(
        p.battery, chemistry="lifepo4", nominal_voltage_v=12.8, max_dod=0.8, efficiency=0.95
    )
    p.choices.system_voltage = 24
    return p


# Hand-worked voltages (common practice, no source):
# 12 V AGM: 6 cells. Full rest 1.05 x 6 x 2.0 V = 12.6 V; absorption 6 x 2.40 V = 14.4 V;
#   V_b = (12.6 + 14.4) / 2 = 13.5 V; wiring derate 0.97: V_a = 13.5 x 1.03 = 13.905 V.
#   (The derate chain had 12 x 1.1 x 1.03 = 13.596 V: a second model.)
# 24 V LiFePO4: 8 cells. Full rest 1.05 x 8 x 3.2 V = 26.88 V; absorption 8 x 3.55 V =
#   28.4 V; V_b = (26.88 + 28.4) / 2 = 27.64 V; V_a = 27.64 x 1.03 = 28.4692 V.
#   (The harvest had (1.05 x 24 + 28.4) / 2 = 26.8 V, the derate chain 24 x 1.1 x 1.03 =
#   27.192 V.)
CASES = {
    "agm-12v": (_agm_12v_pwm, 12.6, 14.4, 13.5, 13.905),
    "lifepo4-24v": (_lifepo4_24v_pwm, 26.88, 28.4, 27.64, 28.4692),
}


@pytest.mark.parametrize("name", sorted(CASES))
def test_one_pwm_operating_voltage_for_every_user(name):
    from offgrid.design.charging import pwm_operating_voltage

    make, full_rest, absorption, battery_v, array_v = CASES[name]
    p = make()
    d = design(p)
    assert d.controller.type == "pwm"
    op = pwm_operating_voltage(d.battery.chemistry, d.battery.system_voltage_v, 0.97)
    assert op.full_rest_v == pytest.approx(full_rest, abs=1e-9)
    assert op.absorption_v == pytest.approx(absorption, abs=1e-9)
    assert op.battery_v == pytest.approx(battery_v, abs=1e-9)
    assert op.array_v == pytest.approx(array_v, abs=1e-9)
    assert d.battery.absorption_voltage_v == pytest.approx(absorption, abs=1e-9)

    params = fit_module(p.module)
    ns, strings = d.array.modules_series, d.array.modules_parallel
    # The I-V current at the operating voltage, by pvlib (reference library).
    i_mod = _pvlib_current_stc(params, array_v / ns)

    # 1. Derate chain: operating-point factor = (V_a / ns) x I(V_a / ns) / Pmax.
    assert d.array.derates["operating point"] == pytest.approx(
        min(1.0, array_v / ns * i_mod / p.module.pmax_w), rel=1e-6
    )
    assert dict(d.why("array.derates.operating point").inputs)["operating_voltage"] == (
        f"{array_v:.1f} V"
    )
    # 2. Harvest comparison: the battery-side voltage (its drop from the sized cables).
    assert d.electrical.harvest.charging_voltage_v == pytest.approx(battery_v, abs=1e-9)
    # 3. Cable runs: the PV runs at V_a, each string carrying I(V_a / ns).
    wires = {w.key: w for w in d.electrical.wires}
    n_c = d.electrical.strings.layout.strings_per_controller
    assert wires["array"].voltage_v == pytest.approx(array_v, abs=1e-9)
    assert wires["array"].operating_current_a == pytest.approx(n_c * i_mod, rel=1e-6)

    # 4. Peak charge current = strings x I(V_a / ns), at most the controllers' ratings; the
    # charge run one controller's share of it.
    rating = d.controller.current_a
    assert d.battery.peak_charge_current_a == pytest.approx(
        min(strings * i_mod, d.controller.count * rating), rel=1e-6
    )
    assert wires["charge"].operating_current_a == pytest.approx(min(n_c * i_mod, rating), rel=1e-6)
    if strings == n_c * d.controller.count:
        assert d.battery.peak_charge_current_a == pytest.approx(
            d.controller.count * wires["charge"].operating_current_a, rel=1e-9
        )
    formula = d.why("battery.peak_charge_current_a").formula
    assert "I-V" in formula and "bank voltage" in formula


def test_agm_12v_worked_numbers():
    # The 12 V AGM case by hand, against pvlib's current: one 36-cell module per string
    # (its STC Vmp 18 V sits above V_a = 13.905 V), I(13.905 V) at STC from i_from_v.
    from offgrid.design.charging import pwm_module_current_a

    p = _agm_12v_pwm()
    d = design(p)
    assert d.array.modules_series == 1
    params = fit_module(p.module)
    i_ref = _pvlib_current_stc(params, 13.905)
    assert pwm_module_current_a(params, 13.905, 1) == pytest.approx(i_ref, rel=1e-6)
    # Well below Vmp the module gives a little more than Imp (5.56 A) and less than Isc
    # (5.9 A): the datasheet's own bounds.
    assert p.module.imp_a < i_ref < p.module.isc_a
    # pvlib 0.16.1's i_from_v gives I(13.905 V) = 5.849 A at STC.
    assert i_ref == pytest.approx(5.849, abs=5e-4)
    # operating-point factor 13.905 V x 5.849 A / 100 W = 0.8133 (the old chain had
    # 13.596 V x Imp 5.56 A / 100 W = 0.756).
    assert d.array.derates["operating point"] == pytest.approx(13.905 * i_ref / 100.0, rel=1e-6)
    assert d.array.derates["operating point"] == pytest.approx(0.8133, abs=5e-4)
    # 12 strings on two 60 A controllers, 6 strings each: peak = 12 x 5.849 = 70.19 A
    # (under 2 x 60 A); the charge run 6 x 5.849 = 35.10 A; 70.19 = 2 x 35.10.
    assert (d.array.modules_parallel, d.controller.count) == (12, 2)
    assert d.controller.current_a == 60.0
    wires = {w.key: w for w in d.electrical.wires}
    assert d.battery.peak_charge_current_a == pytest.approx(70.19, abs=0.01)
    assert wires["charge"].operating_current_a == pytest.approx(35.10, abs=0.01)


@pytest.mark.parametrize("series", [1, 2, 3])
def test_module_current_agrees_with_pvlib(series):
    # pvlib.pvsystem.i_from_v as the reference for the Newton solution in design/pv.py, at
    # the PWM operating voltages of 12, 24 and 36 V lead-acid banks (13.905 V a module).
    from offgrid.design.charging import pwm_module_current_a

    p = hand_project()
    params = fit_module(p.module)
    v = 13.905 * series * 2  # the 60-cell module: about two 12 V steps each
    assert pwm_module_current_a(params, v, series * 2) == pytest.approx(
        _pvlib_current_stc(params, v / (series * 2)), rel=1e-6
    )


def test_mppt_peak_current_at_the_bank_voltage():
    # 48 V LiFePO4 bank of four 12.8 V units: its own nominal voltage is 4 x 12.8 = 51.2 V
    # (16 cells x 3.2 V), not 48 V. Peak = STC power x efficiency / 51.2 V, and the charge
    # run one controller's share of the STC power / 51.2 V (common practice, no source).
    p = hand_project()
    p.battery = replace(p.battery, chemistry="lifepo4", nominal_voltage_v=12.8, max_dod=0.8)
    p.choices.system_voltage = 48
    p.loads = [replace(ld, quantity=ld.quantity * 4) for ld in p.loads]
    d = design(p)
    assert d.battery.bank_voltage_v == pytest.approx(51.2)
    eff = d.controller.efficiency
    assert d.battery.peak_charge_current_a == pytest.approx(
        min(d.array.power_w * eff / 51.2, d.controller.count * d.controller.current_a)
    )
    lay = d.electrical.strings.layout
    sub_w = lay.series * lay.strings_per_controller * p.module.pmax_w
    wires = {w.key: w for w in d.electrical.wires}
    assert wires["charge"].operating_current_a == pytest.approx(
        min(sub_w * eff / 51.2, d.controller.current_a)
    )
    inputs = dict(d.why("battery.peak_charge_current_a").inputs)
    assert inputs["bank_voltage"] == "51.2 V"


# A copy of either model outside offgrid/design/charging.py: 1.1 (or 1.05) times a
# nominal/system voltage, or the wiring derate turned into a drop by (2 - derate).
_COPIES = (
    re.compile(r"(system_v\w*|vsys|nominal\w*|v_nom\w*)\s*\*\s*1\.1\b"),
    re.compile(r"\b1\.1\s*\*\s*(system_v\w*|vsys|nominal\w*|v_nom\w*)"),
    re.compile(r"\b1\.05\s*\*\s*(system_v\w*|vsys|nominal\w*|v_nom\w*|bank\w*)"),
    re.compile(r"\(\s*2(\.0)?\s*-\s*\w*wiring"),
)


def test_no_other_module_computes_the_pwm_voltage():
    found = []
    for path in sorted((ROOT / "offgrid").rglob("*.py")):
        if path.relative_to(ROOT).as_posix() == "offgrid/design/charging.py":
            continue
        for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if any(rx.search(line) for rx in _COPIES):
                found.append(f"{path.relative_to(ROOT)}:{n}: {line.strip()}")
    assert found == []


def test_the_users_call_the_one_functions():
    # Each user of the two quantities imports them from offgrid.design.charging.
    users = {
        "offgrid/design/array_step.py": ("pwm_operating_voltage", "pwm_module_current_a"),
        "offgrid/design/battery_step.py": ("peak_charge_current",),
        "offgrid/design/electrical/cable_runs.py": ("peak_charge_current",),
        "offgrid/design/electrical/__init__.py": ("pwm_operating_voltage",),
        "offgrid/stock/reuse.py": ("pwm_operating_voltage",),
    }
    for rel, names in users.items():
        text = (ROOT / rel).read_text(encoding="utf-8")
        assert "from offgrid.design.charging import" in text, rel
        for name in names:
            assert f"{name}(" in text, (rel, name)
