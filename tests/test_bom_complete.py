"""The complete bill of materials: every line traces to a design figure or a caution,
counts of the trade's habit are marked so, prices and totals worked by hand."""

from __future__ import annotations

import csv
import io

import pytest

from offgrid.design.sizing import design
from offgrid.economics.bom import bill_of_materials, complete_bill_of_materials
from offgrid.paths import demo_project_path
from offgrid.project.model import PriceItem
from offgrid.project.store import load_project
from offgrid.stock.kit import priced_bom_csv
from tests.conftest import hand_project

COMMON = "common practice, no source"


@pytest.fixture(scope="module")
def demo():
    p = load_project(demo_project_path())
    return p, design(p, demo_project_path().parent)


def by_kind(lines, kind):
    return [ln for ln in lines if ln.kind == kind]


def test_every_line_traces_to_a_design_figure_or_caution(demo):
    p, d = demo
    codes = {c.code for c in d.electrical.cautions}
    lines = complete_bill_of_materials(p, d)
    assert len(lines) > len(bill_of_materials(p, d))
    for ln in lines:
        assert ln.figure, ln.key
        assert ln.follows, ln.key
        if ln.figure.startswith("caution:"):
            assert ln.figure.removeprefix("caution:") in codes, ln.key
        else:
            assert d.why(ln.figure) is not None, (ln.key, ln.figure)


def test_quantities_follow_the_demo_design(demo):
    """Demo: 3 x 2 modules, 24 x 1 cells of 2 V, one controller, array cable 15 m."""
    p, d = demo
    lines = complete_bill_of_materials(p, d)
    q = {ln.key: ln.quantity for ln in lines}
    assert q["mounting:ground"] == d.array.module_count == 6
    assert q["pv-connector:pair"] == 2 * d.array.modules_parallel == 4
    assert q["combiner:2 strings"] == 1
    # the surge caution: at the controller input, and at the array end of a run > 10 m
    assert by_kind(lines, "surge-protector")[0].quantity == 2
    # 24 cells in one string: 23 links; lugs 2 per link + 2 x 2 per charge/inverter run
    assert q["battery-link:70 A"] == 23
    assert q["lug:70 A"] == 2 * 23 + 4 + 4
    # earthing along array 15 m + charge 2 m + inverter 1.5 m = 18.5 m, + 10 % -> 21 m
    assert q["earthing-conductor:green-yellow"] == 21
    # 1.5 mm2: 2 strings x 5 m + 5 DC loads x 10 m = 60 m one-way, x 2 = 120 m, + 10 %
    assert q["cable:copper 1.5 mm2"] == 132
    # one fuse holder per fuse: 30 A battery fuse; 3 A x 2 and 1 A x 3 on the DC loads
    assert (q["fuse-holder:30 A"], q["fuse-holder:3 A"], q["fuse-holder:1 A"]) == (1, 2, 3)
    assert q["dc-board:5 ways"] == 1
    assert {ln.key for ln in by_kind(lines, "label")} == {
        "label:battery-short-circuit",
        "label:dc-above-elv",
        "label:lead-acid-ventilation",
        "label:pv-live-in-daylight",
    }


def test_counts_of_the_trades_habit_are_marked_so(demo):
    p, d = demo
    for ln in complete_bill_of_materials(p, d):
        if ln.kind in ("mounting", "pv-connector", "lug", "label", "cable", "earthing-conductor"):
            assert COMMON in ln.follows, ln.key
    earthing = next(ln for ln in complete_bill_of_materials(p, d) if ln.kind == "earth-electrode")
    assert "grounding caution" in earthing.follows


def test_one_string_no_combiner_and_allowance_from_the_project():
    p = hand_project()
    p.loads = [p.loads[0]]  # DC lights only: a smaller array
    p.extra["stock"] = {"cable_allowance_pct": 0, "mounting": "roof"}
    d = design(p)
    lines = complete_bill_of_materials(p, d)
    keys = {ln.key for ln in lines}
    assert d.array.modules_parallel == 1  # one string of 2: nothing to combine
    assert not any(k.startswith("combiner") for k in keys)
    assert {ln.key: ln.quantity for ln in lines}["pv-connector:pair"] == 2
    assert "mounting:roof" in keys
    bare = {ln.key: ln.quantity for ln in bill_of_materials(p, d) if ln.kind == "cable"}
    full = {ln.key: ln.quantity for ln in lines if ln.kind == "cable"}
    assert bare == full  # 0 % allowance: the bare lengths, rounded up as before


def test_prices_and_totals_worked_by_hand():
    """The hand project (tests/test_sizing.py): 4 modules, 10 units, 1 controller, an
    inverter; a price list of five lines; every other line unpriced, counted, left out."""
    p = hand_project()
    p.prices = [
        PriceItem("module", 100.0),
        PriceItem("battery", 250.0),
        PriceItem("controller", 300.0),
        PriceItem("inverter", 200.0),
        PriceItem("mounting", 20.0),
    ]
    d = design(p)
    assert (d.array.module_count, d.battery.unit_count, d.controller.count) == (4, 10, 1)
    text, missing = priced_bom_csv(p, d)
    rows = list(csv.reader(io.StringIO(text)))
    total_row = rows[-1]
    # 4 x 100 + 10 x 250 + 1 x 300 + 1 x 200 + 4 mounting sets x 20 = 3480
    assert float(total_row[-2]) == pytest.approx(3480.0)
    assert total_row[1].startswith(f"INCOMPLETE total: {len(missing)} line(s)")
    lines = complete_bill_of_materials(p, d)
    priced = {"module", "battery", "controller", "inverter", "mounting"}
    assert sorted(missing) == sorted(ln.key for ln in lines if ln.kind not in priced)
    for row in rows[1:-1]:
        if row[0].split(":")[0] not in priced:
            assert row[-3:] == ["", "", "no price"]  # blank, never 0.00


def test_catalogue_prices_cables_and_devices_by_rating_and_voltage(demo):
    """Demo schedule: 35 A and 70 A fuse-or-breakers, fuses of 30, 3 and 1 A at 63 V,
    a 70 A disconnect, a DC surge protector for 127 V; cable 1.5, 4 and 10 mm2."""
    from dataclasses import replace

    from offgrid.stock.catalogue import Catalogue, read_kind_csv, template_csv

    p, d = demo
    q = replace(p, prices=[])
    devices = """
Fuse 30 A 80 V,fuse,30,80,4,USD,,yes
Fuse 30 A 48 V (too low a voltage),fuse,30,48,1,USD,,yes
Fuse 40 A 80 V (not the rating),fuse,40,80,1,USD,,yes
Breaker 35 A 150 V,breaker,35,150,30,USD,,yes
Disconnect 100 A 80 V,disconnect,100,80,50,EUR,,yes
SPD 150 V,surge protector,,150,40,USD,,yes
SPD 100 V (too low),surge protector,,100,10,USD,,yes
"""
    cables = "Cable 10 mm2,copper,10 mm2,5,USD,,yes\nCable 6 mm2,copper,6 mm2,3,USD,,yes\n"
    parts = {}
    for kind, body in (("devices", devices), ("cables", cables)):
        got, problems = read_kind_csv(kind, template_csv(kind) + body.strip() + "\n", kind)
        assert problems == []
        parts[kind] = tuple(got)
    cat = Catalogue("test", parts, (), {("EUR", "USD"): 1.2})
    text, missing = priced_bom_csv(q, d, cat)
    rows = {r[0]: r for r in csv.reader(io.StringIO(text))}
    assert rows["fuse:30 A 63 V"][-3:] == ["4.00", "4.00", "catalogue: Fuse 30 A 80 V"]
    assert rows["fuse-or-breaker:35 A 127 V"][-1] == "catalogue: Breaker 35 A 150 V"
    assert rows["disconnect:70 A 63 V"][-3] == "60.00"  # 50 EUR x 1.2
    assert rows["surge-protector:DC 127 V"][-3:-1] == ["40.00", "80.00"]  # 2 of them
    assert rows["cable:copper 10 mm2"][-3] == "5.00"
    # no 70 A breaker, no 3 A or 1 A fuse, no 1.5 or 4 mm2 cable in the catalogue
    for key in ("fuse-or-breaker:70 A 63 V", "fuse:3 A 63 V", "cable:copper 1.5 mm2"):
        assert key in missing and rows[key][-1] == "no price"
    priced = sum(float(r[-2]) for k, r in rows.items() if k not in ("part", "total") and r[-2])
    assert float(rows["total"][-2]) == pytest.approx(priced)
