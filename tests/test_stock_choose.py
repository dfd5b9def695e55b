"""The cheapest combination: the search against a brute-force search, prices by hand.

The catalogue here is invented for the tests; the project is the hand-worked one of
tests/test_sizing.py (24 V, 4 modules of 300 W as 2 x 2, 10 units of 12 V 200 Ah as
2 x 5, one controller; AC peak 200 W -> 250 W required continuous, 600 W surge).
"""

from __future__ import annotations

import copy
import itertools
from dataclasses import replace

import pytest

from offgrid.catalogue import figure_entry
from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.project.model import BatterySpec, ControllerSpec, ModuleSpec
from offgrid.stock.best_text import search_text
from offgrid.stock.catalogue import Catalogue, read_kind_csv, template_csv
from offgrid.stock.choose import cost_of, search, with_parts
from tests.conftest import hand_project

MODULES = """
Inv mod 300,300,32.5,9.23,39.8,9.75,0.05,-0.30,-0.40,60,1.63,45,100,USD,,yes
Inv mod 150,150,18.2,8.24,22.1,8.8,0.05,-0.31,-0.41,36,0.98,45,48,USD,,yes
Inv mod 400 EUR,400,41.2,9.71,49.6,10.3,0.05,-0.29,-0.37,72,2.0,44,140,EUR,,yes
"""
BATTERIES = """
Inv agm 12V 200Ah,agm,12,200,0.5,0.85,280,USD,,yes
Inv gel 2V 800Ah,gel,2,800,0.5,0.85,240,USD,,yes
Inv lfp 51V,lifepo4,51.2,100,0.8,0.95,1650,USD,,yes
"""
CONTROLLERS = """
Inv mppt 150V 60A,mppt,150,0.97,60,12 24 48,320,USD,,yes
Inv mppt 100V 30A,mppt,100,0.97,30,12 24,170,USD,,yes
Inv pwm 30A,pwm,50,0.98,30,12 24,60,USD,,yes
Inv mppt 48V only,mppt,250,0.98,100,48,500,USD,,yes
"""
INVERTERS = """
Inv inv 300W,300,600,24,0.9,10,,260,USD,,yes
Inv inv 500W,500,1000,24,0.9,10,,300,USD,,yes
Inv inv 200W,200,400,24,0.88,8,,150,USD,,yes
Inv inv 400W low surge,400,500,24,0.92,12,,200,USD,,yes
Inv inv 1000W 48V,1000,2000,48,0.92,12,,380,USD,,yes
Inv inv no price,600,1200,24,0.9,10,,,,,yes
"""
RATES = {("EUR", "USD"): 1.08}


def catalogue(**override) -> Catalogue:
    texts = {
        "modules": MODULES,
        "batteries": BATTERIES,
        "controllers": CONTROLLERS,
        "inverters": INVERTERS,
    } | override
    parts = {}
    for kind, body in texts.items():
        got, problems = read_kind_csv(kind, template_csv(kind) + body.strip() + "\n", kind)
        assert problems == []
        parts[kind] = tuple(got)
    return Catalogue("test", parts, (), dict(RATES))


def price_usd(part) -> float | None:
    if part.price is None:
        return None
    return part.price * (RATES[("EUR", "USD")] if part.currency == "EUR" else 1.0)


def brute_force(project, cat):
    """Every combination designed on its own, checked and priced here, independently;
    an "auto" system voltage tried at 12, 24 and 48 V."""
    install = 1 + project.economics.installation_pct / 100.0
    ok, rejected = [], {}
    fixed = project.choices.system_voltage
    volts = (12, 24, 48) if fixed == "auto" else (fixed,)
    for v, m, b, c, i in itertools.product(volts, *(cat.of(k) for k in cat.parts)):
        p = copy.deepcopy(project)
        p.choices.system_voltage = v
        p.module = ModuleSpec(name=m.name, **m.spec)
        p.battery = BatterySpec(name=b.name, **b.spec)
        s = c.spec
        p.controller = ControllerSpec(
            s["type"], s["max_pv_voltage_v"], s["efficiency"], s["max_current_a"]
        )
        p.inverter = replace(
            p.inverter,
            efficiency=i.spec["efficiency"],
            self_consumption_w=i.spec["self_consumption_w"],
        )
        code = (  # at a fixed voltage the voltage checks need no design: they come first
            "controller-battery-voltage"
            if v not in s["battery_voltages_v"]
            else "inverter-dc-voltage"
            if i.spec["dc_voltage_v"] != v
            else ""
        )
        if code:
            rejected[code] = rejected.get(code, 0) + 1
            continue
        try:
            d = design(p)
        except DesignError as exc:
            rejected[exc.code] = rejected.get(exc.code, 0) + 1
            continue
        assert d.battery.system_voltage_v == v
        code = (
            "controller-battery-voltage"
            if v not in s["battery_voltages_v"]
            else "inverter-dc-voltage"
            if i.spec["dc_voltage_v"] != v
            else "inverter-continuous"
            if i.spec["continuous_w"] < d.inverter.required_continuous_w
            else "inverter-surge"
            if i.spec["surge_w"] < d.inverter.required_surge_w
            else ""
        )
        if code:
            rejected[code] = rejected.get(code, 0) + 1
            continue
        prices = [price_usd(x) for x in (m, b, c, i)]
        if None in prices:
            ok.append(((m.name, b.name, c.name, i.name, v), None))
            continue
        qty = (d.array.module_count, d.battery.unit_count, d.controller.count, 1)
        capital = sum(q * pr for q, pr in zip(qty, prices, strict=True)) * install
        ok.append(((m.name, b.name, c.name, i.name, v), capital))
    return ok, rejected


@pytest.mark.slow
def test_search_equals_brute_force():
    project = hand_project()
    project.economics.installation_pct = 10.0
    cat = catalogue()
    result = search(project, cat)
    ok, rejected = brute_force(project, cat)
    assert result.tried == 3 * 3 * 4 * 6
    # inverters of equal efficiency and idle draw share one design (3 groups of the 6);
    # at the fixed 24 V the 48 V-only controller and the 48 V inverter need no design
    # (the 48 V inverter is alone in its group with the 400 W one: that group still runs)
    assert result.designs_run == 3 * 3 * 3 * 3
    assert result.reasons == rejected
    priced = sorted((c for c in ok if c[1] is not None), key=lambda c: (c[1], c[0]))
    assert [(*x.names(), x.system_voltage_v) for x in result.by_capital] == [n for n, _ in priced]
    assert [x.capital for x in result.by_capital] == pytest.approx([c for _, c in priced])
    assert {(*x.names(), x.system_voltage_v) for x in result.unpriced} == {
        n for n, c in ok if c is None
    }
    assert len(result.by_capital) + len(result.unpriced) + sum(rejected.values()) == result.tried
    # the summed lifecycle cost equals offgrid.economics.costs.lifecycle_cost called directly
    for x in result.by_capital[:: max(1, len(result.by_capital) // 8)]:
        p = with_parts(project, x.module, x.battery, x.controller, x.inverter)
        d = design(p)
        parts = (x.module, x.battery, x.controller, x.inverter)
        direct = cost_of(p, d, parts, ({}, cat.rates))
        assert (x.capital, x.lcc) == pytest.approx(direct[:2], rel=1e-12)
    lccs = [x.lcc for x in result.by_lcc]
    assert lccs == sorted(lccs) and {x.names() for x in result.by_lcc} == {
        x.names() for x in result.by_capital
    }
    # each kind of failure the search reports is one the design meets here
    for code in ("controller-battery-voltage", "inverter-dc-voltage", "inverter-continuous"):
        assert code in result.reasons
    assert "inverter-surge" in result.reasons


def test_capital_worked_by_hand_for_a_small_kit():
    """One module, battery, controller and inverter each: the hand project's quantities
    (4 modules, 10 units; tests/test_sizing.py) and, since its 80 A of charge current is
    more than one 60 A controller, 2 controllers; 1 inverter."""
    project = hand_project()
    project.economics.installation_pct = 10.0
    cat = catalogue(
        modules=MODULES.strip().splitlines()[0],
        batteries=BATTERIES.strip().splitlines()[0],
        controllers=CONTROLLERS.strip().splitlines()[0],
        inverters=INVERTERS.strip().splitlines()[0],
    )
    result = search(project, cat)
    best = result.best
    assert (best.module_count, best.battery_units, best.controller_count) == (4, 10, 2)
    # 4 x 100 + 10 x 280 + 2 x 320 + 1 x 260 = 4100 USD; + 10 % installation = 4510 USD
    assert best.capital == pytest.approx(4510.0)
    assert f"{figure_entry('costs.capital').label} 4,510.00 USD" in search_text(result)


def test_a_price_in_another_currency_is_converted_or_left_unpriced():
    project = hand_project()
    eur = MODULES.strip().splitlines()[2]
    one = {
        "modules": eur,
        "batteries": BATTERIES.strip().splitlines()[0],
        "controllers": CONTROLLERS.strip().splitlines()[0],
        "inverters": INVERTERS.strip().splitlines()[0],
    }
    result = search(project, catalogue(**one))
    best = result.best
    # 140 EUR x 1.08 = 151.20 USD a module; + 10 x 280 + 2 x 320 + 260 (no installation)
    assert best.controller_count == 2 and best.battery_units == 10
    assert best.capital == pytest.approx(best.module_count * 151.2 + 2800 + 640 + 260)
    no_rate = replace(catalogue(**one), rates={})
    result = search(project, no_rate)
    assert result.by_capital == () and len(result.unpriced) == 1
    assert "no exchange rate to USD" in result.unpriced[0].missing[0]
    # the project's own rate wins over the catalogue's
    project.extra["stock"] = {"rates": {"EUR": 1.5}}
    result = search(project, catalogue(**one))
    assert result.best.capital == pytest.approx(best.module_count * 210.0 + 3700)


def test_a_part_without_price_is_listed_never_free():
    project = hand_project()
    cat = catalogue(
        modules=MODULES.strip().splitlines()[0],
        batteries=BATTERIES.strip().splitlines()[0],
        controllers=CONTROLLERS.strip().splitlines()[0],
        inverters=INVERTERS.strip().splitlines()[-1],
    )
    result = search(project, cat)
    assert result.by_capital == ()
    assert result.unpriced[0].capital is None
    assert "Inv inv no price: no price in the catalogue" in result.unpriced[0].missing
    assert "cannot be priced (1)" in search_text(result)


def test_dc_only_project_needs_no_inverter():
    project = hand_project()
    project.loads = [ld for ld in project.loads if ld.ac_dc == "dc"]
    cat = catalogue(
        modules=MODULES.strip().splitlines()[0],
        batteries=BATTERIES.strip().splitlines()[0],
        controllers=CONTROLLERS.strip().splitlines()[0],
    )
    result = search(project, cat)
    assert result.tried == 1 and result.best.inverter is None
    b = result.best  # no inverter line: modules, units and controllers only
    assert b.capital == pytest.approx(
        b.module_count * 100 + b.battery_units * 280 + b.controller_count * 320
    )


@pytest.mark.slow
def test_search_at_auto_voltage_equals_brute_force_over_the_three_voltages():
    project = hand_project()
    project.choices.system_voltage = "auto"
    lines = {
        "modules": MODULES.strip().splitlines()[:2],
        "batteries": [BATTERIES.strip().splitlines()[0], BATTERIES.strip().splitlines()[2]],
        "controllers": CONTROLLERS.strip().splitlines()[:2],
        "inverters": [INVERTERS.strip().splitlines()[k] for k in (0, 4)],
    }
    cat = catalogue(**{k: "\n".join(v) for k, v in lines.items()})
    result = search(project, cat)
    ok, rejected = brute_force(project, cat)
    assert result.tried == 3 * 2 * 2 * 2 * 2
    assert result.reasons == rejected
    priced = sorted((c for c in ok if c[1] is not None), key=lambda c: (c[1], c[0]))
    assert [(*x.names(), x.system_voltage_v) for x in result.by_capital] == [n for n, _ in priced]
    # both a 24 V and a 48 V kit are found (the engine's own "auto" picks one voltage)
    assert {x.system_voltage_v for x in result.by_capital} >= {24, 48}


@pytest.mark.slow
def test_worker_processes_give_the_same_result():
    from offgrid.stock.choose import _pool_context

    assert _pool_context() is not None  # fork is there: jobs=2 really uses two workers
    project = hand_project()
    cat = catalogue()
    one = search(project, cat, jobs=1)
    two = search(project, cat, jobs=2)
    assert two.tried == one.tried and two.designs_run == one.designs_run
    assert two.reasons == one.reasons and two.rejected == one.rejected
    assert two.by_capital == one.by_capital and two.by_lcc == one.by_lcc
    assert two.unpriced == one.unpriced
