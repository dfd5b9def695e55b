"""Procurement totals add up: parts per kit x systems = totals; line costs = capital cost.

Uses the bundled demonstration community (invented village, invented prices).
"""

from __future__ import annotations

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
    got = {(line.category, line.description): line.quantity for line in t.lines
           if line.category not in ("Design", "Kit types")}
    assert got == expect
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
    for line in t.lines:
        assert line.cost == pytest.approx(line.quantity * line.unit_price)
    assert t.total_cost == pytest.approx(sum(line.cost for line in t.lines))
    # the same figure from the other side: every system's cost, overheads and kit types
    s = plan.standard
    systems = sum(r.unit_cost * r.count for r in plan.rows if r.unit_cost is not None)
    own = sum(r.count for r in plan.rows if r.status == "own system")
    one_off = 400.0  # kisanga-ridge-prices.csv
    assert t.total_cost == pytest.approx(systems + one_off * own
                                         + s.kit_type_cost * len(s.kits))
    assert t.total_cost == pytest.approx(s.objective_value)
    assert t.systems == plan.systems == sum(r.count for r in plan.rows
                                            if r.status in ("kit", "own system"))


def test_kit_unit_cost_is_the_sum_of_its_parts(plan):
    t = plan.totals
    unit = {(line.category, line.description): line.unit_price for line in t.lines}
    for src in t.sources:
        total = sum(unit[(cat, desc)] * n for cat, desc, n in src.per_system)
        assert total == pytest.approx(src.unit_cost)


def test_price_list_errors_name_the_line():
    with pytest.raises(PriceListError, match="line 2: unknown item 'panel'"):
        read_prices_csv("item,basis,unit_price,currency\npanel,per_w,1,USD\n")
    with pytest.raises(PriceListError, match="line 3: module is priced per_w or each"):
        read_prices_csv("item,basis,unit_price,currency\nbattery,per_kwh,1,USD\n"
                        "module,per_kwh,1,USD\n")
    with pytest.raises(PriceListError, match="more than one currency"):
        read_prices_csv("item,basis,unit_price,currency\nmodule,per_w,1,USD\n"
                        "battery,per_kwh,1,EUR\n")
    with pytest.raises(PriceListError, match="0 or more"):
        read_prices_csv("item,basis,unit_price,currency\nmodule,per_w,-1,USD\n")
    with pytest.raises(PriceListError, match="missing column"):
        read_prices_csv("item,price\nmodule,1\n")
