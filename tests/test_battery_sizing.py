"""Battery bank: worst month of demand x temperature factor, the bank's own voltage, deep
discharge of lead-acid, and ageing in the warm months."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.design.sizing import design
from offgrid.project.model import Load
from offgrid.simulate.adapter import inputs_from_design
from offgrid.simulate.life import battery_wear, calendar_life_years
from tests.conftest import hand_project


def _seasonal():
    """The hand project with a summer-only DC fan and a cold winter, battery outdoors."""
    p = hand_project()
    p.site.battery_temp_c = None
    c = p.climate.inline
    winter = (0, 1, 11)
    c.record_low_c = -5.0
    for m in winter:
        c.temp_mean_c[m] = c.temp_max_c[m] = 4.4
        c.temp_min_c[m] = 0.0
    p.loads.append(Load("DC fan", 1, 300.0, 4.0, "dc", months=(5, 6, 7, 8, 9)))
    return p


def test_bank_is_sized_on_the_worst_month_hand_worked():
    """Hand-worked (calculator), loads as in test_sizing step 1:
    winter (Dec-Feb, 4.4 C): 2351.1 x 1.1 = 2586.2 Wh/day; summer (May-Sep, 25 C), with the
    fan 300 W x 4 h: 3551.1 x 1.1 = 3906.2 Wh/day.  Temperature factor 1.30 at 4.4 C
    (IEEE Std 485 Table 1 type factor at 40 F, as transcribed in offgrid.design.battery), 1.00 at
    25 C.  Worst month: max(2586.2 x 1.30 = 3362.1, 3906.2 x 1.00) = 3906.2 (summer).
    3906.2 x 3 / (0.5 x sqrt(0.85) x 0.8) / 24 V = 1324.0 Ah -> 7 strings of 200 Ah.
    The old rule, largest demand x coldest factor, 3906.2 x 1.30: 1721.2 Ah -> 9 strings.
    """
    d = design(_seasonal())
    assert d.battery.required_ah == pytest.approx(1324.0, abs=0.3)
    assert d.battery.units_parallel == 7
    assert d.battery.temp_factor == pytest.approx(1.0)
    reason = dict(d.why("battery.required_ah").inputs)
    assert "1324 Ah (used)" in reason["worst_month"]
    assert "1721 Ah (conservative option)" in reason["largest_x_coldest"]


def test_largest_and_coldest_is_an_explicit_conservative_option():
    p = _seasonal()
    p.choices.battery_largest_coldest = True
    d = design(p)
    assert d.battery.required_ah == pytest.approx(1721.2, abs=0.4)  # hand-worked above
    assert d.battery.units_parallel == 9
    assert d.battery.temp_factor == pytest.approx(1.30)
    reason = d.why("battery.required_ah")
    assert "conservative" in reason.formula
    assert "(used)" in dict(reason.inputs)["largest_x_coldest"]


def test_option_is_saved_and_read_back(tmp_path):
    from offgrid.project.store import load_project, save_project

    p = _seasonal()
    p.choices.battery_largest_coldest = True
    p.site.battery_warm_temp_c = 31.0
    save_project(p, tmp_path / "p.toml")
    q = load_project(tmp_path / "p.toml")
    assert q.choices.battery_largest_coldest is True
    assert q.site.battery_warm_temp_c == 31.0


def test_lithium_51_2_v_pack_counts_at_its_own_voltage():
    """Hand-worked: one 51.2 V (16 cells x 3.2 V) 100 Ah LiFePO4 unit per string on a 48 V
    class system.  Need 2586.2 x 3 / (0.8 x sqrt(0.95) x 0.8) = 12437.9 Wh at 25 C;
    / 51.2 V = 242.9 Ah -> 3 strings; nominal 3 x 100 Ah x 51.2 V = 15.36 kWh (at 48 V it
    was counted as 14.40 kWh)."""
    p = hand_project()
    p.battery.chemistry = "lifepo4"
    p.battery.nominal_voltage_v = 51.2
    p.battery.capacity_ah = 100.0
    p.battery.max_dod = 0.8
    p.battery.efficiency = 0.95
    p.choices.system_voltage = 48
    d = design(p)
    b = d.battery
    assert b.units_series == 1 and b.bank_voltage_v == pytest.approx(51.2)
    assert b.required_ah == pytest.approx(242.93, abs=0.05)
    assert b.units_parallel == 3
    assert b.nominal_kwh == pytest.approx(15.36)
    assert b.usable_kwh == pytest.approx(15.36 * 0.8)
    # the simulation's bank: nominal energy / temperature factor (1.0 at 25 C)
    assert inputs_from_design(p, d).capacity_wh == pytest.approx(15360.0)


@pytest.mark.parametrize(
    "chemistry,cycles_deep,cycles_half",
    [("agm", 250, 600), ("gel", 450, 1000), ("flooded", 600, 1500)],
)
def test_full_discharge_of_lead_acid_warns_with_its_cycle_life(chemistry, cycles_deep, cycles_half):
    # check values: the project's own cycle-life curve (offgrid.simulate.life.CYCLE_LIFE,
    # from memory) at DoD 1.0 and 0.5
    p = hand_project()
    p.battery.chemistry = chemistry
    p.battery.max_dod = 1.0
    d = design(p)
    notes = [n for n in d.warnings if n.code == "lead-acid-deep-dod"]
    assert len(notes) == 1 and notes[0].severity == "warning"
    assert f"about {cycles_deep} cycles" in notes[0].message
    assert f"against {cycles_half} at 50 %" in notes[0].message
    assert notes[0].figure == "battery.max_dod"


def test_no_deep_discharge_warning_at_half_or_on_lithium():
    assert not any(n.code == "lead-acid-deep-dod" for n in design(hand_project()).warnings)
    p = hand_project()
    p.battery.chemistry = "lifepo4"
    p.battery.nominal_voltage_v = 12.8
    p.battery.max_dod = 1.0
    assert not any(n.code == "lead-acid-deep-dod" for n in design(p).warnings)


def test_calendar_life_halves_per_10_c_hand_worked():
    # common practice, no source: lead-acid float life halves per ~10 C above 25 C.
    # gel 10 years at 25 C (preset, from memory): at 35 C all year 10 / 2 = 5.0 years;
    # 35 C in Apr-Sep (183 days), 25 C otherwise: rate (183 x 2 + 182 x 1) / 365 = 1.5014
    # -> 10 / 1.5014 = 6.661 years; below 25 C no credit.
    assert calendar_life_years("gel", 35.0) == pytest.approx(5.0)
    hot_summer = [25.0] * 3 + [35.0] * 6 + [25.0] * 3
    assert calendar_life_years("gel", hot_summer) == pytest.approx(6.661, abs=1e-3)
    assert calendar_life_years("gel", 15.0) == pytest.approx(10.0)
    assert calendar_life_years("lifepo4", 35.0) == pytest.approx(15.0)  # not corrected


def test_warm_room_shortens_the_life_and_both_temperatures_are_shown():
    p = hand_project()  # AGM, 7 years at 25 C (preset, from memory)
    p.site.battery_temp_c = 20.0
    p.site.battery_warm_temp_c = 35.0
    d = design(p)
    b = d.battery
    assert b.capacity_temp_c == pytest.approx(20.0)
    assert b.ageing_temp_c == pytest.approx(35.0)
    assert b.calendar_life_years == pytest.approx(3.5)  # 7 / 2
    assert d.why("battery.calendar_life_years") is not None
    # the simulation's battery life uses it
    inp = inputs_from_design(p, d)
    assert inp.calendar_life_years == pytest.approx(3.5)
    wear = battery_wear(
        np.full(365 * 2, 1.0), 2.0, inp.chemistry, 0.0, inp.capacity_wh, inp.calendar_life_years
    )
    assert wear.calendar_life_years == pytest.approx(3.5)
    assert wear.expected_life_years == pytest.approx(3.5)


def test_ageing_follows_the_warm_months_without_a_room_temperature():
    p = hand_project()
    p.site.battery_temp_c = None
    c = p.climate.inline
    for m in range(3, 9):  # Apr-Sep at 35 C mean
        c.temp_mean_c[m] = c.temp_max_c[m] = 35.0
    d = design(p)
    assert d.battery.ageing_temp_c == pytest.approx(35.0)
    assert d.battery.capacity_temp_c == pytest.approx(25.0)  # the sizing month
    assert d.battery.calendar_life_years == pytest.approx(7.0 / 1.50137, abs=2e-3)
