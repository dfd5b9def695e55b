"""The search with the design steps shared across parts (offgrid/stock/reuse.py) against
the same search with every combination designed by ``sizing.design``.

The parts are invented for the test and chosen to reach each branch of the shared steps:
modules whose strings do not fit a controller (string-window), a battery unit that cannot
make the system voltage (battery-voltage), a controller too small for the array's current
(controller-current), PWM controllers (whose I-V harvest falls short, so the array is
raised), inverters of several efficiencies and idle draws (each its own demand), too
small (inverter-continuous, inverter-surge), at another DC voltage and without a price.
The reference is the engine's own pipeline, so the two searches must agree exactly:
every figure, every refusal's code and message, in the same order.
"""

from __future__ import annotations

import pytest

from offgrid.design.sizing import design
from offgrid.stock.choose import search, with_parts
from offgrid.stock.reuse import StepReuse
from tests.conftest import hand_project
from tests.test_stock_choose import catalogue

MODULES = """
Inv mod 300,300,32.5,9.23,39.8,9.75,0.05,-0.30,-0.40,60,1.63,45,100,USD,,yes
Inv mod 150,150,18.2,8.24,22.1,8.8,0.05,-0.31,-0.41,36,0.98,45,48,USD,,yes
Inv mod 400 high V,400,68.0,5.9,81.0,6.2,0.05,-0.29,-0.37,120,2.0,44,140,USD,,yes
Inv mod 100 low V,100,17.0,5.88,21.0,6.2,0.05,-0.32,-0.42,36,0.7,46,,,,yes
"""
BATTERIES = """
Inv agm 12V 200Ah,agm,12,200,0.5,0.85,280,USD,,yes
Inv agm 12V 100Ah,agm,12,100,0.5,0.85,150,USD,,yes
Inv gel 2V 800Ah,gel,2,800,0.5,0.85,240,USD,,yes
Inv lfp 51V,lifepo4,51.2,100,0.8,0.95,1650,USD,,yes
Inv flooded 6V 400Ah,flooded,6,400,0.5,0.8,190,USD,,yes
"""
CONTROLLERS = """
Inv mppt 150V 60A,mppt,150,0.97,60,12 24 48,320,USD,,yes
Inv mppt 100V 15A,mppt,100,0.97,15,12 24,110,USD,,yes
Inv pwm 30A,pwm,50,0.98,30,12 24,60,USD,,yes
Inv pwm 60A,pwm,50,0.97,60,12 24 48,90,USD,,yes
Inv mppt 48V only,mppt,250,0.98,100,48,500,USD,,yes
"""
INVERTERS = """
Inv inv 300W,300,600,24,0.9,10,,260,USD,,yes
Inv inv 200W,200,400,24,0.88,8,,150,USD,,yes
Inv inv 400W low surge,400,500,24,0.92,12,,200,USD,,yes
Inv inv 800W,800,1600,24,0.94,6,,330,USD,,yes
Inv inv 1000W 48V,1000,2000,48,0.92,12,,380,USD,,yes
Inv inv no price,600,1200,24,0.9,10,,,,,yes
"""


def varied():
    return catalogue(
        modules=MODULES, batteries=BATTERIES, controllers=CONTROLLERS, inverters=INVERTERS
    )


def assert_same(fast, full) -> None:
    assert fast.tried == full.tried and fast.designs_run == full.designs_run
    assert fast.reasons == full.reasons
    assert fast.rejected == full.rejected  # codes and messages, in the same order
    assert fast.by_capital == full.by_capital  # every figure of every combination
    assert fast.by_lcc == full.by_lcc
    assert fast.unpriced == full.unpriced
    assert fast.notes == full.notes


@pytest.mark.slow
def test_shared_steps_give_the_full_design_search_at_a_fixed_voltage():
    project = hand_project()
    project.economics.installation_pct = 10.0
    cat = varied()
    fast = search(project, cat, reuse=True)
    full = search(project, cat, reuse=False)
    assert_same(fast, full)
    # the catalogue reaches the refusals of the steps the search shares ...
    for code in (
        "string-window",
        "battery-voltage",
        "controller-current",
        "controller-battery-voltage",
        "inverter-dc-voltage",
        "inverter-continuous",
        "inverter-surge",
    ):
        assert code in full.reasons, code
    assert fast.by_capital and fast.unpriced


@pytest.mark.slow
def test_shared_steps_follow_the_harvest_check_when_it_raises_the_array(monkeypatch):
    """As tests/test_electrical.py does: controllers that deliver only 60 % of the
    curves' energy, so the harvest check adds modules (rounds of the array step with a
    least module count, then the electrical steps again)."""
    import offgrid.design.electrical.harvest_compare as hc

    real = hc.harvest_wh_day

    def weak(*args, **kw):
        m, p = real(*args, **kw)
        return 0.6 * m, 0.6 * p

    monkeypatch.setattr(hc, "harvest_wh_day", weak)
    project = hand_project()
    lines = {
        "modules": MODULES.strip().splitlines()[:2],
        "batteries": BATTERIES.strip().splitlines()[:3],
        "controllers": CONTROLLERS.strip().splitlines()[:4],
        "inverters": INVERTERS.strip().splitlines()[:4],
    }
    cat = catalogue(**{k: "\n".join(v) for k, v in lines.items()})
    fast = search(project, cat, reuse=True)
    full = search(project, cat, reuse=False)
    assert_same(fast, full)
    assert fast.by_capital
    raised = 0
    for x in fast.by_capital[:12]:
        d = design(with_parts(project, x.module, x.battery, x.controller, x.inverter))
        assert d.array.module_count == x.module_count
        raised += "array-raised-for-harvest" in {n.code for n in d.warnings}
    assert raised


@pytest.mark.slow
def test_shared_steps_give_the_full_design_search_at_auto_voltage():
    project = hand_project()
    project.choices.system_voltage = "auto"
    lines = {
        "modules": MODULES.strip().splitlines()[:3],
        "batteries": BATTERIES.strip().splitlines()[::2],
        "controllers": CONTROLLERS.strip().splitlines()[::2],
        "inverters": INVERTERS.strip().splitlines()[2:5],
    }
    cat = catalogue(**{k: "\n".join(v) for k, v in lines.items()})
    fast = search(project, cat, reuse=True)
    full = search(project, cat, reuse=False)
    assert_same(fast, full)
    assert {x.system_voltage_v for x in fast.by_capital} >= {24, 48}


def test_a_refusal_is_kept_and_raised_again_for_the_next_combination():
    """A step's DesignError is computed once and raised again, with its code and message,
    for every combination that reaches the same step with the same inputs."""
    from offgrid.design.result import DesignError
    from offgrid.stock.choose import _group_key, replace_choices

    project = replace_choices(hand_project(), 24)
    cat = varied()
    module = cat.of("modules")[2]  # 400 W of 5.9 A at 68 V on a 15 A, 100 V controller
    ctrl = cat.of("controllers")[1]
    inv = cat.of("inverters")[0]
    reuse = StepReuse()
    codes = []
    for b in cat.of("batteries")[:2]:
        made = []

        def make(b=b, made=made):
            made.append(b.name)
            return with_parts(project, module, b, ctrl, inv)

        bat_key = (b.spec["efficiency"], b.spec["chemistry"], b.spec["nominal_voltage_v"])
        with pytest.raises(DesignError) as exc:
            reuse.design(make, (module.name, b.name, ctrl.name), _group_key(inv, 24), bat_key)
        codes.append((exc.value.code, str(exc.value), len(made)))
        with pytest.raises(DesignError) as ref:
            design(with_parts(project, module, b, ctrl, inv))
        assert (ref.value.code, str(ref.value)) == codes[-1][:2]
    assert codes[0][:2] == codes[1][:2]
    # the two AGM units share the array step's inputs: the second never builds its project
    assert [n for *_, n in codes] == [1, 0]
