"""The invented hybrid lodge: generator setup from the project, the hybrid run (issue 16)."""

from __future__ import annotations

import dataclasses

import pytest

from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.generator.hybrid import gen_wh_per_bus_wh, generator_setup, hybrid_run
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.simulate.adapter import inputs_from_design
from offgrid.simulate.balance import build_steps
from offgrid.simulate.weather import synthetic_daily_insolation

LODGE = demo_project_path().parent / "demo-hybrid-lodge.toml"


@pytest.fixture(scope="module")
def lodge():
    p = load_project(LODGE)
    d = design(p)
    inp = inputs_from_design(p, d)
    w = synthetic_daily_insolation(inp.insolation_kwh_m2_day, inp.latitude_deg, 4, seed=3)
    return p, d, inp, w, build_steps(inp, w, "hourly")


def test_demo_is_labelled_invented(lodge):
    p = lodge[0]
    assert p.info.demo and "invented" in p.info.notes.lower()
    assert p.generator is not None and "invented" in p.generator.name


def test_setup_from_the_project(lodge):
    p, d = lodge[0], lodge[1]
    s = generator_setup(p, d)
    # 450 m and an 18.2 C hottest monthly maximum: below both derate thresholds
    assert s.derating.derated_kw == pytest.approx(6.0)
    assert s.check.ok and s.check.starting_need_w <= 6000
    # all loads AC: per bus Wh the generator gives (AC x growth) / bus = inverter share
    ratio = gen_wh_per_bus_wh(p, d)
    assert all(0.5 < r < 1.0 for r in ratio)


def test_generator_smaller_than_its_start_is_refused(lodge):
    p, d = lodge[0], lodge[1]
    small = dataclasses.replace(p, generator=dataclasses.replace(p.generator, rated_kw=2.0))
    with pytest.raises(DesignError) as err:
        generator_setup(small, d)
    assert err.value.field == "generator.rated_kw"
    assert "Water pump" in str(err.value) or "kW" in str(err.value)


def test_hybrid_run_trends(lodge):
    p, d, inp, w, steps = lodge
    s = generator_setup(p, d)
    full = hybrid_run(inp, w, s.inputs, steps=steps)
    third = hybrid_run(inp, w, s.inputs, inp.array_w / 3, inp.capacity_wh / 2, steps=steps)
    # a smaller array and bank: more generator, less sun, still (nearly) no unmet energy
    assert third.fuel_l_per_year > full.fuel_l_per_year
    assert third.run_hours_per_year > full.run_hours_per_year
    assert third.solar_fraction < full.solar_fraction <= 1
    assert third.unmet_fraction < 0.01 < third.solar_only_unmet_fraction
    # fuel per run hour lies between the no-load use and the full-load use of the curve
    per_h = third.fuel_l_per_year / third.run_hours_per_year
    assert s.fuel.fuel_l_h(0) <= per_h <= s.fuel.fuel_l_h(6.0)
    assert third.wear is not None and third.wear.expected_life_years > 0
    assert set(third.reasons) >= {"fuel_l_per_year", "solar_fraction", "run_hours_per_year"}


def test_mix_tradeoff_small_grid(lodge):
    from offgrid.economics.hybrid_mix import mix_tradeoff

    p, d, inp, w, steps = lodge
    s = generator_setup(p, d)
    prices = {"array_per_w": 0.4, "battery_per_kwh": 300.0}
    m = mix_tradeoff(
        p,
        d,
        inp,
        w,
        s,
        prices,
        array_factors=(0.2, 0.6, 1.0),
        battery_factors=(0.5,),
        steps=steps,
    )
    assert len(m.points) == 3
    fuel = [q.fuel_l_per_year for q in m.points]
    assert fuel[0] > fuel[1] > fuel[2] > 0  # less sun, more fuel
    assert m.cheapest is not None and m.cheapest.unmet_fraction <= m.unmet_limit
    assert m.cheapest.lcc == min(q.lcc for q in m.points if q.unmet_fraction <= m.unmet_limit)
    # the solar-only point: the design's own array and bank, no fuel, costed the same way
    so = m.solar_only
    assert not so.generator and so.fuel_l_per_year == 0 and so.array_w == inp.array_w
    # capital by hand: (array W x 0.4 + kWh x 300) x (1 + 15 % installation)
    assert so.capital == pytest.approx((so.array_w * 0.4 + so.battery_kwh * 300) * 1.15)


def test_mix_with_a_chosen_solar_share(lodge):
    from offgrid.economics.hybrid_mix import mix_tradeoff

    p, d, inp, w, steps = lodge
    s = generator_setup(p, d)
    prices = {"array_per_w": 0.4, "battery_per_kwh": 300.0}
    kw = {"array_factors": (0.2, 0.6, 1.0), "battery_factors": (0.5,), "steps": steps}
    free = mix_tradeoff(p, d, inp, w, s, prices, **kw)
    share = max(q.solar_fraction for q in free.points) - 1e-9
    m = mix_tradeoff(p, d, inp, w, s, prices, min_solar_fraction=share, **kw)
    assert m.cheapest is not None and m.cheapest.solar_fraction >= share
    with pytest.raises(ValueError, match="solar-share"):
        mix_tradeoff(p, d, inp, w, s, prices, min_solar_fraction=1.5, **kw)


def test_iso3046_method_from_the_project(lodge):
    # the same lodge moved to 2000 m with a 40 C hottest day and the ISO 3046-1 method:
    # alpha = 0.7253 (hand-worked in test_generator_engine.py): 6 kW x 0.7253 = 4.35 kW is
    # below the 5.08 kW starting need (refused); 8 kW x 0.7253 = 5.80 kW serves
    p, d = lodge[0], lodge[1]
    g = dataclasses.replace(
        p.generator, derate_method="iso3046", altitude_m=2000.0, hottest_temp_c=40.0
    )
    with pytest.raises(DesignError, match=r"4\.35 kW"):
        generator_setup(dataclasses.replace(p, generator=g), d)
    g = dataclasses.replace(g, rated_kw=8.0)
    s = generator_setup(dataclasses.replace(p, generator=g), d)
    assert s.derating.derated_kw == pytest.approx(8 * 0.7253, abs=2e-3)
    assert "ISO 3046-1" in s.derating.reason.source


def test_study_without_prices_skips_the_mix_and_says_so():
    from offgrid.generator.study import generator_study

    p = load_project(LODGE)
    p.prices = []
    st = generator_study(p, years=1, seed=2)
    assert st.mix is None
    assert any("no trade-off" in n for n in st.notes)
    assert st.chosen.startswith("the solar-only")
    assert st.run.array_w == st.solar_only_array_w
