"""Sizing a water supply: the bundled demo, the limits, the project file and its checks."""

from __future__ import annotations

import copy
import dataclasses

import numpy as np
import pytest

from offgrid.catalogue import input_entry, inputs_under
from offgrid.design.result import DesignError
from offgrid.paths import demo_water_path
from offgrid.project.store import dumps_project, load_project, loads_project
from offgrid.water import hydraulics as hy
from offgrid.water.design import TANK_SIZES_M3, standard_tank, water_design

#: The water supply's inputs: the catalogue's ``water[].`` rows
WATER_FIELDS = inputs_under("water[].")


@pytest.fixture(scope="module")
def demo():
    return load_project(demo_water_path())


@pytest.fixture(scope="module")
def demo_design(demo):
    return water_design(demo, 0)


def test_demo_is_labelled_invented(demo):
    assert demo.info.demo and "invented" in demo.info.notes
    assert "invented" in demo.water[0].name


def test_demo_meets_its_need_every_month_within_the_yield(demo, demo_design):
    w, s = demo_design, demo.water[0]
    assert np.all(np.array(w.water_m3_day) >= np.array(w.need_m3_day) - 1e-9)
    assert w.peak_flow_m3_h <= s.safe_yield_m3_h
    # the limiting month is the one with the least cover
    cover = np.array(w.water_m3_day) / np.array(w.need_m3_day)
    assert w.limiting_month == int(np.argmin(cover)) + 1
    # one module fewer (one string less, or a shorter string) would fail some month: the
    # layout is the fewest modules
    assert w.module_count == w.series * w.parallel
    # the head is the sum of its parts at the peak flow
    assert w.total_dynamic_head_m == pytest.approx(
        w.static_level_m + w.drawdown_m + w.tank_height_m + w.friction_m + w.minor_loss_m,
        rel=1e-3,
    )
    assert w.hydraulic_energy_kwh_day == pytest.approx(
        2.725e-3 * w.water_m3_day[w.limiting_month - 1] * w.total_dynamic_head_m
    )
    assert 0.1 < w.pump_set_efficiency < 0.8
    assert 0 < w.start_irradiance_w_m2 < 400
    # the day's water is the sum of the flow steps
    assert sum(w.day_flow_m3_h) * w.day_step_h == pytest.approx(
        w.water_m3_day[w.limiting_month - 1]
    )
    assert w.string_voc_cold_v <= s.pump.max_input_v


def test_every_figure_has_a_reason(demo_design):
    for key in (
        "total_dynamic_head_m",
        "friction_m",
        "minor_loss_m",
        "velocity_m_s",
        "hydraulic_energy_kwh_day",
        "pump_set_efficiency",
        "water_m3_day",
        "limiting_month",
        "start_irradiance_w_m2",
        "module_count",
        "tank_size_m3",
    ):
        assert f"water.{key}" in demo_design.reasons, key
    from offgrid.water.design import WaterDesign

    skip = {"name", "reasons", "notices", "cautions", "day_irradiance_w_m2", "day_flow_m3_h",
            "day_step_h"}  # fmt: skip
    for f in dataclasses.fields(WaterDesign):
        if f.name not in skip:
            assert f"water.{f.name}" in demo_design.reasons, f.name
    d = demo_design.to_dict()
    assert d["reasons"]["water.friction_m"]["source"].startswith("Darcy-Weisbach")
    assert any("local" in c for c in d["cautions"])


def test_fewer_modules_fall_short(demo, demo_design):
    # Removing a string (or a module from the string) leaves some month short.
    from offgrid.design.pv import fit_module
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import resolve_climate
    from offgrid.water.coupling import ArrayLayout
    from offgrid.water.design import daily_flows, day_conditions

    s = demo.water[0]
    cond = day_conditions(demo, resolve_climate(demo), s, ReasonBook())
    params = fit_module(demo.module)
    w = demo_design
    smaller = []
    if w.parallel > 1:
        smaller.append(ArrayLayout(w.series, w.parallel - 1))
    if w.series > 1:
        smaller.append(ArrayLayout(w.series - 1, w.parallel))
    for lay in smaller:
        fl = daily_flows(params, s, cond, lay)
        short = np.any(fl.volume_m3_day < np.array(s.need_m3_day)) or (
            fl.flow_m3_h.max() > s.safe_yield_m3_h
        )
        # a shorter string may also fall below the controller window: then it is out anyway
        if lay.series * 27 >= s.pump.min_input_v:
            assert short, lay


def test_borehole_yield_is_a_hard_limit(demo):
    p = copy.deepcopy(demo)
    p.water[0].need_m3_day = [15.0] * 12
    p.water[0].safe_yield_m3_h = 1.5
    with pytest.raises(DesignError) as e:
        water_design(p, 0)
    assert e.value.code == "borehole-yield"
    assert e.value.field == "water[1].safe_yield_m3_h"


def test_head_beyond_the_pump_is_infeasible_with_the_reason(demo):
    p = copy.deepcopy(demo)
    p.water[0].static_level_m = 80.0
    with pytest.raises(DesignError) as e:
        water_design(p, 0)
    assert e.value.code == "pump-head" and "cannot lift" in str(e.value)
    assert e.value.field == "water[1].pump.head_points_m"


def test_direct_drive_pump_sizes(demo):
    p = copy.deepcopy(demo)
    pump = p.water[0].pump
    pump.drive = "direct"
    pump.voltage_v = [[45.0, 60.0, 75.0, 90.0], [50.0, 65.0, 80.0, 95.0], [55.0, 70.0, 85.0, 100.0]]
    pump.max_input_v = 120.0
    w = water_design(p, 0)
    assert np.all(np.array(w.water_m3_day) >= np.array(w.need_m3_day) - 1e-9)
    assert "I-V curve meets" in w.reasons["water.water_m3_day"].formula


def test_standard_tank_sizes():
    assert standard_tank(18.0) == (20.0, 1)
    assert standard_tank(20.0) == (20.0, 1)
    assert standard_tank(0.4) == (TANK_SIZES_M3[0], 1)
    assert standard_tank(250.0) == (100.0, 3)


def test_velocity_notice_for_a_wide_pipe(demo):
    p = copy.deepcopy(demo)
    p.water[0].pipe_diameter_mm = 90.0
    w = water_design(p, 0)
    assert w.velocity_m_s < hy.VELOCITY_LOW_M_S
    assert any(n.code == "pipe-velocity" for n in w.notices)


def test_water_tables_round_trip_through_the_file(demo):
    text = dumps_project(demo)
    assert "[[water]]" in text and "[water.pump]" in text
    again = loads_project(text)
    assert again.water == demo.water


def test_a_project_without_water_saves_as_before(demo):
    p = copy.deepcopy(demo)
    p.water = []
    text = dumps_project(p)
    assert "[[water]]" not in text and "water =" not in text


@pytest.mark.parametrize(
    ("field", "value", "path"),
    [
        ("static_level_m", -3.0, "water[1].static_level_m"),
        ("pipe_diameter_mm", 2000.0, "water[1].pipe_diameter_mm"),
        ("safe_yield_m3_h", 0.0, "water[1].safe_yield_m3_h"),
        ("need_m3_day", [5.0] * 11, "water[1].need_m3_day"),
    ],
)
def test_bad_input_names_the_field_and_the_fix(demo, field, value, path):
    p = copy.deepcopy(demo)
    setattr(p.water[0], field, value)
    with pytest.raises(Exception) as e:
        loads_project(dumps_project(p))
    text = str(e.value)
    assert path in text
    assert input_entry(f"water[].{field}").hint in text


def test_pump_table_shape_is_checked(demo):
    p = copy.deepcopy(demo)
    p.water[0].pump.flow_m3_h = [[1.0, 2.0]]
    with pytest.raises(Exception) as e:
        loads_project(dumps_project(p))
    assert "water[1].pump.flow_m3_h" in str(e.value) and "one row per head" in str(e.value)


def test_field_metadata_paths_exist():
    from offgrid.project.water_model import WaterSupply

    s = WaterSupply()
    for f in WATER_FIELDS:
        obj = s
        for part in f.path.removeprefix("water[].").split("."):
            obj = getattr(obj, part)
        assert f.label and f.hint
        if f.low is not None:
            assert f.low < f.high
    assert len({f.path for f in WATER_FIELDS}) == len(WATER_FIELDS)
    assert dataclasses.is_dataclass(s)


def test_pipe_suggestion_and_drop_cable(demo):
    from offgrid.water.design import suggested_pipe_mm

    s = demo.water[0]
    # at 2 m3/h, 20 mm is 1.77 m/s but its friction over 250 m is far above 10 % of 28 m
    # of lift; the suggestion meets both limits and the next smaller bore fails one
    bore = suggested_pipe_mm(s, 2.0)
    trial = dataclasses.replace(s, pipe_diameter_mm=bore)
    assert float(hy.velocity_m_s(2.0, bore / 1000)) <= 2.0
    assert float(hy.friction_head_m(trial, 2.0)) <= 0.1 * (s.static_level_m + s.tank_height_m)
    from offgrid.water.design import PIPE_BORES_MM

    smaller = PIPE_BORES_MM[PIPE_BORES_MM.index(bore) - 1]
    small = dataclasses.replace(s, pipe_diameter_mm=smaller)
    assert (
        float(hy.friction_head_m(small, 2.0)) > 0.1 * (s.static_level_m + s.tank_height_m)
        or float(hy.velocity_m_s(2.0, smaller / 1000)) > 2.0
    )
    w = water_design(demo, 0)
    assert w.drop_cable_drop_pct <= 3.0 and w.drop_cable_size


def test_format_document_lists_every_input():
    from pathlib import Path

    text = (Path(__file__).resolve().parents[1] / "docs" / "water-format.md").read_text()
    rows = {}
    for line in text.splitlines():
        if line.startswith("| `"):
            cells = [c.strip() for c in line.strip("|").split("|")]
            rows.setdefault(cells[0].strip("`"), []).append(cells)
    for f in WATER_FIELDS:  # each row: the field, its catalogue label and hint
        name = f.path.removeprefix("water[].").removeprefix("pump.")
        assert name in rows, f.path
        assert any(r[1] == f.label and r[4] == f.hint for r in rows[name]), f.path
