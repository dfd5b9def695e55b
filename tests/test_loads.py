"""Load lists (CSV) and the load analysis."""

from __future__ import annotations

from pathlib import Path

import pytest

from offgrid.design.loads import analyse_loads, appliance_energy_wh
from offgrid.paths import load_profiles_dir
from offgrid.project.loads_csv import (
    LoadListError,
    format_months,
    load_loads_csv,
    loads_to_csv,
    parse_months,
    read_loads_csv,
)
from offgrid.project.model import InverterSpec, Load

HEADER = "name,quantity,power_w,hours_per_day,ac_dc,duty_cycle,surge_w,months,critical\n"


def test_energy_is_quantity_power_hours_duty():
    # common practice, no source: E = n x P x h x duty
    loads = [Load("fridge", 2, 60.0, 24.0, "ac", duty_cycle=0.4)]
    assert appliance_energy_wh(loads)[0, 0] == pytest.approx(2 * 60 * 24 * 0.4)


def test_months_of_use_and_split_and_idle():
    loads = [Load("fan", 1, 50.0, 4.0, "dc", months=(3, 4, 5)), Load("tv", 1, 90.0, 2.0, "ac")]
    r = analyse_loads(
        loads, InverterSpec(efficiency=0.9, self_consumption_w=8, hours_on_per_day=12), 0.0, 1.0
    )
    assert r.dc_energy_wh[0] == 0 and r.dc_energy_wh[3] == 200
    assert r.ac_energy_wh[0] == 180
    assert r.inverter_idle_wh == 96
    assert r.daily_energy_wh[0] == pytest.approx(180 / 0.9 + 96)
    assert r.daily_energy_wh[3] == pytest.approx(200 + 180 / 0.9 + 96)


def test_growth_margin_is_explicit():
    loads = [Load("light", 1, 10.0, 10.0, "dc")]
    r = analyse_loads(loads, InverterSpec(), 25.0, 1.0)
    assert r.daily_energy_wh[0] == pytest.approx(125.0)
    assert r.growth_pct == 25.0


def test_no_ac_loads_means_no_inverter_idle():
    r = analyse_loads(
        [Load("light", 1, 10.0, 10.0, "dc")], InverterSpec(self_consumption_w=20), 0.0, 1.0
    )
    assert r.inverter_idle_wh == 0.0


def test_peak_coincidence_and_surge():
    loads = [Load("pump", 1, 750.0, 2.0, "ac", surge_w=2250.0), Load("laptop", 2, 50.0, 4.0, "ac")]
    r = analyse_loads(loads, InverterSpec(), 0.0, 0.8)
    # 0.8 x 850 = 680 W is below the pump alone: the peak is the pump's 750 W (the factor
    # never below the largest single appliance); its start 2250 + max(0.8 x 100, 100) W.
    assert r.connected_ac_w == 850 and r.peak_ac_w == pytest.approx(750)
    assert r.largest_surge_w == 2250 and r.largest_surge_load == "pump"
    assert r.surge_need_w == pytest.approx(2350.0) and r.surge_need_load == "pump"


@pytest.mark.parametrize(
    ("text", "months"),
    [
        ("1-12", tuple(range(1, 13))),
        ("5,6,7", (5, 6, 7)),
        ("11-2", (1, 2, 11, 12)),
        ("all", tuple(range(1, 13))),
        ("3", (3,)),
    ],
)
def test_parse_months(text, months):
    assert parse_months(text) == months


def test_format_months_round_trip():
    for ms in [(1, 2, 11, 12), (5, 6, 7), tuple(range(1, 13)), (2, 4, 6)]:
        assert parse_months(format_months(ms)) == ms


def test_csv_round_trip():
    loads = [
        Load("A, with comma", 2, 7.5, 5, "dc", 1, 0, (1, 2, 3), True, "evening"),
        Load("B", 1, 100, 1.5, "ac", 0.5, 300, tuple(range(1, 13)), False),
    ]
    assert read_loads_csv(loads_to_csv(loads)) == loads


DEMO_LISTS = ("household-kit", "rural-clinic", "primary-school", "water-pump", "radio-repeater")


@pytest.mark.parametrize("name", DEMO_LISTS)
def test_demo_load_lists_read(name):
    loads = load_loads_csv(Path(load_profiles_dir()) / f"{name}.csv")
    assert loads and all(ld.power_w > 0 for ld in loads)


@pytest.mark.parametrize(
    ("row", "line_field"),
    [
        ("lamp,1,-5,4,dc,1,0,1-12,no", "power_w"),
        ("lamp,1,5,25,dc,1,0,1-12,no", "hours_per_day"),
        ("lamp,1,5,4,dc,1.5,0,1-12,no", "duty_cycle"),
        ("lamp,1,5,4,xx,1,0,1-12,no", "ac_dc"),
        ("lamp,1,5,4,dc,1,0,13,no", "months"),
        ("lamp,1,5,4,dc,1,0,1-12,maybe", "critical"),
        ("lamp,one,5,4,dc,1,0,1-12,no", "quantity"),
        (",1,5,4,dc,1,0,1-12,no", "name"),
    ],
)
def test_bad_rows_name_line_and_field(row, line_field):
    text = HEADER + "ok,1,5,4,dc,1,0,1-12,no\n" + row + "\n"
    with pytest.raises(LoadListError) as exc:
        read_loads_csv(text)
    problems = exc.value.problems
    assert problems[0].line == 3
    assert problems[0].field == line_field


def test_unknown_column_is_named_with_a_hint():
    with pytest.raises(LoadListError, match=r"unknown column.*power_w") as exc:
        read_loads_csv("name,watts,hours_per_day\nx,1,1\n")
    assert exc.value.problems[0].field == "watts"


def test_missing_required_column():
    with pytest.raises(LoadListError, match="required column"):
        read_loads_csv("name,quantity\nx,1\n")


def test_empty_file():
    with pytest.raises(LoadListError, match="empty"):
        read_loads_csv("")


def test_a_critical_ac_load_makes_the_inverter_idle_critical():
    # common practice, no source: a critical AC load keeps the inverter switched on.
    inv = InverterSpec(efficiency=0.9, self_consumption_w=10.0, hours_on_per_day=24.0)
    ac = [Load("radio", 1, 90.0, 10.0, "ac", critical=True), Load("tv", 1, 60.0, 4.0, "ac")]
    r = analyse_loads(ac, inv, 0.0, 1.0)
    assert r.critical_energy_wh[0] == pytest.approx(900 / 0.9 + 240)
    dc = [Load("light", 1, 10.0, 5.0, "dc", critical=True), Load("tv", 1, 60.0, 4.0, "ac")]
    r = analyse_loads(dc, inv, 0.0, 1.0)
    assert r.critical_energy_wh[0] == pytest.approx(50.0)  # the inverter may be switched off
