"""Procurement totals add up: parts per kit x systems = totals; line costs = capital cost.

Uses the bundled demonstration community (invented village, invented prices).
"""

from __future__ import annotations

import math

import pytest

from offgrid.plan.community import demo_survey_path, plan_file
from offgrid.plan.kits import parts_of
from offgrid.plan.prices import PriceListError, read_prices_csv


@pytest.fixture(scope="module", params=[None, 2])
def plan(request):
    return plan_file(demo_survey_path(), kits=request.param, jobs=1)


def test_line_quantities_are_sums_over_kits_and_own_systems(plan):
    t = plan.totals
    expect: dict[tuple[str, str], int] = {}
    for src in t.sources:
        for cat, desc, n in src.per_system:
            expect[(cat, desc)] = expect.get((cat, desc), 0) + n * src.systems
    got = {
        (line.category, line.description): line.quantity
        for line in t.lines
        if line.category not in ("Design", "Kit types")
    }
    assert got.keys() == expect.keys()
    for key, q in got.items():
        if key[0] == "Cable":  # whole metres to buy
            assert q == math.ceil(expect[key] - 1e-9)
        else:
            assert q == expect[key]
    modules = sum(line.quantity for line in t.lines if line.category == "PV module")
    by_rows = 0
    kits = {k.name: k.parts for k in plan.standard.kits}
    for r in plan.rows:
        if r.status == "kit":
            by_rows += kits[r.kit].module_count * r.count
        elif r.status == "own system":
            by_rows += parts_of(r.design).module_count * r.count
    assert modules == by_rows


def test_costs_add_up(plan):
    t = plan.totals
    assert not t.unpriced
    for line in t.lines:
        assert line.cost == pytest.approx(line.quantity * line.unit_price)
    assert t.total_cost == pytest.approx(sum(line.cost for line in t.lines))
    # the same figure from the other side: every system's main parts, overheads, kit types
    # (the objective the kits minimise), plus cables and protection
    s = plan.standard
    systems = sum(r.unit_cost * r.count for r in plan.rows if r.unit_cost is not None)
    own = sum(r.count for r in plan.rows if r.status == "own system")
    one_off = 400.0  # kisanga-ridge-prices.csv
    circuits = sum(line.cost for line in t.lines if line.category in ("Cable", "Protection"))
    assert circuits > 0
    assert s.objective_value == pytest.approx(
        systems + one_off * own + s.kit_type_cost * len(s.kits)
    )
    assert t.total_cost == pytest.approx(s.objective_value + circuits)
    assert (
        t.systems
        == plan.systems
        == sum(r.count for r in plan.rows if r.status in ("kit", "own system"))
    )


def test_kit_unit_cost_is_the_sum_of_its_parts(plan):
    t = plan.totals
    unit = {(line.category, line.description): line.unit_price for line in t.lines}
    for src in t.sources:
        if src.unit_cost is None:  # the homes' own load circuits
            continue
        total = sum(
            unit[(cat, desc)] * n
            for cat, desc, n in src.per_system
            if cat not in ("Cable", "Protection")
        )
        assert total == pytest.approx(src.unit_cost)


def test_cables_and_protection_come_from_the_electrical_design(plan):
    """Cable metres = 2 conductors x one-way length x runs of each design's wires."""
    from offgrid.design.sizing import design
    from offgrid.plan.rows import prepare, row_project
    from offgrid.plan.survey import load_survey

    inputs = prepare(load_survey(demo_survey_path()))
    inputs.base.site.tilt_deg = plan.tilt_deg
    clinic_row = next(r for r in inputs.survey.rows if r.id == "CLINIC")
    d = design(row_project(inputs, clinic_row), inputs.base_dir)
    src = next(s for s in plan.totals.sources if s.name == "CLINIC")
    cable = {desc: n for cat, desc, n in src.per_system if cat == "Cable"}
    expect: dict[str, float] = {}
    for w in d.electrical.wires:
        if not w.key.startswith("load"):
            k = f"{w.material} {w.size}"
            expect[k] = expect.get(k, 0.0) + 2 * w.length_m * w.count
    assert cable == pytest.approx(expect)
    fuses = sum(n for cat, _, n in src.per_system if cat == "Protection")
    assert fuses == sum(
        v.count for v in d.electrical.protection.devices if not v.location.startswith("DC load")
    )


def test_price_list_errors_name_the_line():
    with pytest.raises(PriceListError, match="line 2: unknown item 'panel'"):
        read_prices_csv("item,basis,unit_price,currency\npanel,per_w,1,USD\n")
    with pytest.raises(PriceListError, match="line 3: module is priced per_w or each"):
        read_prices_csv(
            "item,basis,unit_price,currency\nbattery,per_kwh,1,USD\nmodule,per_kwh,1,USD\n"
        )
    with pytest.raises(PriceListError, match="more than one currency"):
        read_prices_csv(
            "item,basis,unit_price,currency\nmodule,per_w,1,USD\nbattery,per_kwh,1,EUR\n"
        )
    with pytest.raises(PriceListError, match="0 or more"):
        read_prices_csv("item,basis,unit_price,currency\nmodule,per_w,-1,USD\n")
    with pytest.raises(PriceListError, match="missing column"):
        read_prices_csv("item,price\nmodule,1\n")


def test_the_reports_per_part_price_list_is_read_too(tmp_path):
    """A 'part, unit_price' CSV (offgrid.report's format) prices the plan by part keys."""
    from offgrid.paths import load_profiles_dir
    from offgrid.plan.community import plan_community
    from offgrid.plan.survey import read_survey

    prices = tmp_path / "parts.csv"
    prices.write_text(
        "part,unit_price,note\n"
        "module:Generic 36-cell 50 W (demo datasheet),30,invented test price\n"
        "battery,250,\ncontroller:PWM,20,\ncontroller,60,\ninverter,90,\n"
        "cable,0.5,\nfuse,3,\nfuse-or-breaker,9,\ndisconnect,12,\n"
    )
    text = (
        "climate,kisanga-ridge-demo\nproject,kisanga-ridge-home-parts\n"
        f"prices,{prices}\nid,count,load_list\nA,20,household-basic\nB,5,household-kit\n"
    )
    plan = plan_community(read_survey(text, base_dir=load_profiles_dir()), kits=2, jobs=1)
    t = plan.totals
    assert not t.unpriced
    price = {
        "PV module": 30.0,
        "Battery unit": 250.0,
        "Charge controller": 20.0,
        "Inverter": 90.0,
        "Cable": 0.5,
    }
    for line in t.lines:
        if line.category in price:
            assert line.unit_price == price[line.category]
        elif line.category == "Protection":
            assert (
                line.unit_price
                == {"fuse": 3.0, "fuse or breaker": 9.0, "DC disconnect": 12.0}[
                    line.label.rsplit(" ", 2)[0] if "A" in line.label else line.label
                ]
            )
    assert t.total_cost == pytest.approx(sum(line.quantity * line.unit_price for line in t.lines))
