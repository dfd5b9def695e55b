"""The generator's lines of the bill of materials (issue 16): each traces to a generator
input or a generator caution, quantities worked by hand from the demo lodge, prices from
the price list, lines without a price counted; the solar lifecycle cost leaves them out."""

from __future__ import annotations

import copy
import csv
import io

import numpy as np
import pytest

from offgrid.design.sizing import design
from offgrid.economics.bom import bill_of_materials, complete_bill_of_materials
from offgrid.economics.costs import lifecycle_cost
from offgrid.economics.generator_bom import (
    GENERATOR_KINDS,
    bom_prices,
    fuel_store_litres,
    unpriced_keys,
)
from offgrid.generator.cautions import CAUTION_CODES, CAUTIONS
from offgrid.generator.study import hybrid_demo_path
from offgrid.project.store import load_project
from offgrid.report.export import bom_text
from offgrid.stock.kit import priced_bom_csv

COMMON = "common practice, no source"


@pytest.fixture(scope="module")
def lodge():
    p = load_project(hybrid_demo_path())
    return p, design(p, hybrid_demo_path().parent)


def gen_lines(lines):
    return [ln for ln in lines if ln.kind in GENERATOR_KINDS]


def test_caution_codes_match_the_cautions_one_to_one():
    assert len(CAUTION_CODES) == len(CAUTIONS) == len(set(CAUTION_CODES))


def test_each_line_traces_to_a_generator_input_or_its_caution(lodge):
    p, d = lodge
    lines = gen_lines(bill_of_materials(p, d))
    assert {ln.kind for ln in lines} == set(GENERATOR_KINDS)
    words = {  # the caution's own words name the part it asks for
        "changeover": "changeover switch",
        "fuel-store": "approved, labelled containers",
        "spill-kit": "spill absorbent",
        "extinguisher": "extinguisher",
        "exhaust": "pipe the exhaust",
        "co-alarm": "carbon monoxide alarms",
    }
    for ln in lines:
        assert ln.follows, ln.key
        if ln.figure.startswith("caution:"):
            text = CAUTIONS[CAUTION_CODES.index(ln.figure.removeprefix("caution:"))]
            assert words[ln.kind] in text.lower(), ln.key
        else:  # a generator input: the path names a field of [generator]
            assert ln.figure.startswith("generator.")
            assert hasattr(p.generator, ln.figure.removeprefix("generator.")), ln.figure


def test_quantities_worked_by_hand_from_the_lodge(lodge):
    """Lodge: 6 kW diesel, fuel table 0.9/1.3/1.75/2.2 L/h at 25/50/75/100 %, charger
    2.5 kW at 0.9 into the design's bus.  Least squares by hand on x = 1.5, 3, 4.5, 6 kW:
    mean x 3.75, mean y 1.5375; Sxy = (-2.25)(-0.6375) + (-0.75)(-0.2375) + (0.75)(0.2125)
    + (2.25)(0.6625) = 3.2625, Sxx = 11.25, slope 0.29 L/kWh; at 6 kW the line gives
    1.5375 + 0.29 x 2.25 = 2.19 L/h.  A day at full load: 24 x 2.19 = 52.56 L -> 55 L in
    5 L steps (common practice, no source).  Charger input 2.5 / 0.9 = 2.78 kW."""
    p, d = lodge
    x = np.array([1.5, 3.0, 4.5, 6.0])
    y = np.array([0.9, 1.3, 1.75, 2.2])
    slope, icpt = np.polyfit(x, y, 1)  # numpy as the reference for the fit
    assert slope == pytest.approx(0.29, abs=1e-9)
    litres, full = fuel_store_litres(p) or (None, None)
    assert full == pytest.approx(icpt + slope * 6.0) == pytest.approx(2.19)
    assert litres == 55.0
    q = {ln.kind: ln for ln in gen_lines(bill_of_materials(p, d))}
    assert q["fuel-store"].key == "fuel-store:55 L diesel"
    assert q["generator"].quantity == q["charger"].quantity == q["changeover"].quantity == 1
    assert q["charger"].key == f"charger:2.5 kW {d.battery.system_voltage_v} V"
    assert "2.78 kW AC input" in q["charger"].description  # 2.5 / 0.9
    assert "inverter-charger" in q["charger"].description
    assert q["changeover"].key == "changeover:6 kW"
    assert q["co-alarm"].quantity == 2 and COMMON in q["co-alarm"].follows
    assert COMMON in q["fuel-store"].follows


def test_lpg_has_no_liquid_fuel_lines(lodge):
    p, d = lodge
    lpg = copy.deepcopy(p)
    lpg.generator.fuel = "lpg"
    kinds = {ln.kind for ln in bill_of_materials(lpg, d)}
    assert "spill-kit" not in kinds and "extinguisher" not in kinds
    assert "fuel-store" in kinds and "co-alarm" in kinds


def test_an_unfitted_fuel_table_still_lists_the_store_unsized(lodge):
    p, d = lodge
    bad = copy.deepcopy(p)
    bad.generator.fuel_l_h = [2.2]  # one value for four loads: validate refuses it too
    store = next(ln for ln in bill_of_materials(bad, d) if ln.kind == "fuel-store")
    assert store.key == "fuel-store:diesel" and "generator.fuel_l_h" in store.follows


def test_solar_only_project_has_none(lodge):
    p, d = lodge
    solo = copy.deepcopy(p)
    solo.generator = None
    assert not gen_lines(bill_of_materials(solo, d))


def test_priced_from_the_price_list_and_generator_price(lodge):
    """The lodge's list prices the parts; the set takes generator.price (4500)."""
    p, d = lodge
    rows = list(csv.DictReader(io.StringIO(bom_text(p, d))))
    got = {r["part"]: r for r in rows}
    g = got["generator:Generic 6 kW diesel set (invented datasheet)"]
    assert float(g["unit price (EUR)"]) == p.generator.price == 4500.0
    co = got["co-alarm"]
    assert float(co["total (EUR)"]) == pytest.approx(2 * 35.0)
    assert unpriced_keys(p, d) == []
    kit, missing = priced_bom_csv(p, d)  # the complete BOM says where the set's price is from
    row = next(r for r in csv.reader(io.StringIO(kit)) if r[0].startswith("generator:"))
    assert row[-1] == "generator.price" and float(row[-2]) == 4500.0
    assert not [k for k in missing if k.split(":")[0] in GENERATOR_KINDS]
    # a price of the set in the list wins over generator.price
    listed = copy.deepcopy(p)
    from offgrid.project.model import PriceItem

    listed.prices.append(PriceItem("generator", 3999.0))
    table = bom_prices(listed)
    assert not any(it.note == "generator.price" for it in table)


def test_missing_prices_are_counted(lodge):
    p, d = lodge
    bare = copy.deepcopy(p)
    bare.prices = [it for it in bare.prices if it.part not in ("co-alarm", "exhaust")]
    bare.generator.price = None
    keys = unpriced_keys(bare, d)
    assert set(keys) == {
        "co-alarm",
        "exhaust:6 kW",
        "generator:Generic 6 kW diesel set (invented datasheet)",
    }
    text, missing = priced_bom_csv(bare, d)  # the complete BOM: accessories unpriced too
    assert set(keys) <= set(missing)
    assert f"INCOMPLETE total: {len(missing)} line(s) without a price" in text


def test_complete_bom_carries_them_and_the_solar_lcc_leaves_them_out(lodge):
    p, d = lodge
    assert len(gen_lines(complete_bill_of_materials(p, d))) == len(GENERATOR_KINDS)
    solo = copy.deepcopy(p)
    solo.generator = None
    with_gen = lifecycle_cost(p, d, bill_of_materials(p, d))
    without = lifecycle_cost(solo, d, bill_of_materials(solo, d))
    assert with_gen.capital == pytest.approx(without.capital)
    assert with_gen.lcc == pytest.approx(without.lcc)


def test_cli_bom_notes_unpriced_lines(capsys, tmp_path):
    from offgrid.cli import main

    src = hybrid_demo_path().read_text(encoding="utf-8")
    src = src.replace('part = "co-alarm"', 'part = "smoke-alarm"')
    proj = tmp_path / "lodge.toml"
    proj.write_text(src, encoding="utf-8")
    assert main(["bom", str(proj)]) == 0
    out, err = capsys.readouterr()
    assert "co-alarm," in out
    assert "1 line(s) of the bill of materials without a price: co-alarm" in err


def test_report_lists_them_and_says_where_they_are_costed(lodge):
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text

    p, d = lodge
    text = render_text(build_report(p, d, with_charts=False, with_variants=False))
    lines = bill_of_materials(p, d)
    first = next(n for n, ln in enumerate(lines, start=1) if ln.kind in GENERATOR_KINDS)
    assert f"Parts {first}, {first + 1}," in text
    assert "costed over the life" in text
    assert "Carbon monoxide alarm" in text
    assert "of the generator's lines have no price" not in text  # the lodge prices them all
    bare = copy.deepcopy(p)
    bare.prices = [it for it in bare.prices if it.part != "co-alarm"]
    text = render_text(build_report(bare, d, with_charts=False, with_variants=False))
    assert "1 of the generator's lines have no price: co-alarm" in text
