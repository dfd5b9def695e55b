"""Generator money: present worth of fuel, upkeep, overhauls, replacements; the mix (issue 16)."""

from __future__ import annotations

import dataclasses

import pytest

from offgrid.economics.costs import present_worth_factor
from offgrid.economics.generator_costs import (
    generator_cost,
    generator_life_years,
    overhaul_years,
)
from offgrid.project.model import Economics, GeneratorSpec


def test_uniform_series_present_worth_factor_from_tables():
    # Uniform-series present worth factor (P/A, 8 %, 20) = [(1.08)^20 - 1] / [0.08 (1.08)^20]
    # = 9.8181, as in the compound interest tables of any engineering economics text
    # (e.g. Newnan, Engineering Economic Analysis, 8 % table; value from memory). With no
    # escalation Duffie & Beckman's PWF(N, 0, d) is the same factor.
    assert present_worth_factor(20, 0.0, 0.08) == pytest.approx(9.8181, abs=1e-4)


def test_geometric_gradient_present_worth_by_hand():
    # Geometric-gradient series (P/A1, g = 3 %, i = 8 %, N = 20) = [1 - (1.03/1.08)^20]/(0.08-0.03)
    # by hand: 1.03/1.08 = 0.953704, ln = -0.047402, x 20 = -0.948032, exp = 0.387498
    # (1 - 0.387498) / 0.05 = 12.2500 (the engineering economics texts' geometric
    # gradient factor; Duffie & Beckman's PWF(N, i, d) with i = the escalation)
    assert present_worth_factor(20, 0.03, 0.08) == pytest.approx(12.2500, abs=1e-3)


SPEC = GeneratorSpec(
    rated_kw=6.0,
    fuel_l_h=[0.9, 1.3, 1.75, 2.2],
    price=4000.0,
    fuel_price_per_l=2.0,
    fuel_escalation_pct=3.0,
    maintenance_per_run_h=0.6,
    overhaul_interval_h=2000.0,
    overhaul_cost=1000.0,
    life_run_h=20000.0,
    life_years=15.0,
)
ECON = Economics(life_years=20, discount_rate_pct=8.0, inflation_pct=0.0)


def test_generator_cost_by_hand():
    # 250 run hours and 500 L a year, 20 years at 8 %:
    # fuel: 500 x 2.0 = 1000 first year x 12.2500 (above)         = 12,250.0
    # upkeep: 250 x 0.6 = 150 a year x 9.8181                       =  1,472.7
    # life: min(20000 / 250 = 80, 15) = 15 years: replaced at year 15
    # overhauls every 2000 / 250 = 8 years of each engine: year 8 (16 is past the first
    #   engine's 15 years; the second engine's first, 23, is past the horizon)
    #   1000 / 1.08^8 = 1000 x 0.540269                             =    540.27
    # replacement: 4000 / 1.08^15 = 4000 x 0.315242                 =  1,260.97
    c = generator_cost(SPEC, ECON, 250.0, 500.0)
    assert c.fuel_pw == pytest.approx(12250.0, abs=0.1)
    assert c.maintenance_pw == pytest.approx(1472.7, abs=0.1)
    assert c.life_years == 15.0 and c.replaced_at == (15.0,)
    assert c.overhaul_years == (8.0,)
    assert c.overhaul_pw == pytest.approx(540.27, abs=0.01)
    assert c.replacement_pw == pytest.approx(1260.97, abs=0.01)
    assert c.total_pw == pytest.approx(4000 + 12250.0 + 1472.7 + 540.27 + 1260.97, abs=2)
    assert "Duffie & Beckman" in c.reasons["fuel_pw"].source


def test_life_and_overhauls_follow_run_hours():
    # 2500 h a year: life 20000/2500 = 8 years -> replaced at 8 and 16; overhauls every
    # 2000/2500 = 0.8 years within each engine's 8 years (9 per engine: 0.8 ... 7.2),
    # the third engine from 16 to 20: 16.8, ..., 19.2 (4)
    assert generator_life_years(SPEC, 2500.0) == 8.0
    ov = overhaul_years(2000.0, 2500.0, 8.0, 20.0)
    assert len(ov) == 9 + 9 + 4
    assert ov[0] == pytest.approx(0.8) and ov[-1] == pytest.approx(19.2)
    assert not any(abs(t - 8.0) < 1e-6 or abs(t - 16.0) < 1e-6 for t in ov)
    # never runs: calendar life, no overhaul
    assert generator_life_years(SPEC, 0.0) == 15.0 and overhaul_years(2000, 0, 15, 20) == ()


def test_no_price_leaves_total_open():
    c = generator_cost(dataclasses.replace(SPEC, price=None), ECON, 250.0, 500.0)
    assert c.total_pw is None and c.running_pw > 0
