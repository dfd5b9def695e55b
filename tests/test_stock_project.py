"""The project's own copy of catalogue parts and its ``[stock]`` inputs."""

from __future__ import annotations

import copy

import pytest

from offgrid.catalogue import input_entry, inputs_under
from offgrid.design.sizing import design
from offgrid.economics.bom import bill_of_materials
from offgrid.project.store import dumps_project, loads_project
from offgrid.stock.catalogue import bundled_catalogue_dir, load_catalogue
from offgrid.stock.project_parts import (
    DEFAULT_CABLE_ALLOWANCE_PCT,
    DEFAULT_MOUNTING,
    cable_allowance_pct,
    mounting,
    stock_problems,
    take_parts,
)
from tests.conftest import hand_project


def test_stock_inputs_are_declared_once_and_checked():
    paths = [i.path for i in inputs_under("stock.")]
    assert len(paths) == len(set(paths)) == 7
    p = hand_project()
    assert stock_problems(p) == []
    assert mounting(p) == DEFAULT_MOUNTING in input_entry("stock.mounting").values
    allowance = input_entry("stock.cable_allowance_pct")
    assert cable_allowance_pct(p) == DEFAULT_CABLE_ALLOWANCE_PCT
    assert allowance.low <= DEFAULT_CABLE_ALLOWANCE_PCT <= allowance.high
    p.extra["stock"] = {"mounting": "pole", "cable_allowance_pct": 150}
    said = stock_problems(p)
    assert said[0].startswith("stock.mounting") and said[1].startswith("stock.cable_allowance")
    assert allowance.hint in said[1] and "from 0 to 100" in said[1]
    p.extra["stock"] = {"cable_allowance_pct": True}
    assert stock_problems(p)[0].startswith("stock.cable_allowance_pct")


def test_taken_parts_round_trip_through_the_project_file_and_price_converted():
    cat = load_catalogue(bundled_catalogue_dir())
    m = cat.find("modules", "Invented 120-half-cell 380 W module (demo)")  # 132 EUR
    b = cat.find("batteries", "Invented 12 V 200 Ah AGM block (demo)")
    c = cat.find("controllers", "Invented MPPT 150 V 60 A (demo)")
    i = cat.find("inverters", "Invented 600 W 24 V inverter (demo)")
    project = hand_project()
    before = copy.deepcopy(project)
    taken, missing = take_parts(project, m, b, c, i, ({}, cat.rates))
    assert missing == [] and project == before  # the original is untouched
    again = loads_project(dumps_project(taken), source="test")
    assert again.extra["stock"]["inverter"]["surge_w"] == 1200.0
    assert again.extra["stock"]["controller"]["battery_voltages_v"] == [12, 24, 48]
    assert again.module.name == m.name and again.module.isc_a == 11.6
    prices = {p.part: p.unit_price for p in again.prices}
    assert prices[f"module:{m.name}"] == pytest.approx(142.56)  # 132 EUR x 1.08 (rates.csv)
    assert prices["controller:MPPT 60 A"] == 320.0
    # the BOM names the catalogue inverter and checks it against the design
    d = design(again)
    inv = next(ln for ln in bill_of_materials(again, d) if ln.kind == "inverter")
    assert inv.key == f"inverter:{i.name}" and "covers the required" in inv.follows
    again.extra["stock"]["inverter"]["surge_w"] = 500.0  # below the 600 W surge need
    inv = next(ln for ln in bill_of_materials(again, d) if ln.kind == "inverter")
    assert "DOES NOT cover" in inv.follows


def test_without_a_rate_the_price_is_left_out_and_said():
    cat = load_catalogue(bundled_catalogue_dir())
    m = cat.find("modules", "Invented 120-half-cell 380 W module (demo)")
    b, c = cat.of("batteries")[0], cat.of("controllers")[1]
    taken, missing = take_parts(hand_project(), m, b, c, None, ({},))
    assert len(missing) == 1 and "no exchange rate to USD" in missing[0]
    assert not any(p.part == f"module:{m.name}" for p in taken.prices)
    assert "inverter" not in taken.extra["stock"]


def test_a_hand_edited_inverter_record_is_refused_not_crashed_on():
    p = hand_project()
    p.extra["stock"] = {"inverter": {"name": "x", "continuous_w": "lots", "surge_w": 1}}
    assert stock_problems(p)[0].startswith("stock.inverter: needs")
    d = design(p)
    inv = next(ln for ln in bill_of_materials(p, d) if ln.kind == "inverter")
    assert inv.key == f"inverter:{d.inverter.continuous_w:g} W"  # the design's own line
