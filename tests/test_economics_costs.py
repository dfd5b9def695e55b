"""Lifecycle cost by the present-worth method, against cases worked by hand.

Method: Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th ed. (2013), ch. 11:
single-payment present worth ((1+i)/(1+d))^n (sec. 11.4) and the series factor
PWF(N, i, d) = 1/(d-i) [1 - ((1+i)/(1+d))^N], N/(1+i) when i = d (eq. 11.5.1, equation
number from memory).  The expected numbers below were worked by hand from those formulas
(four-figure tables of 1.08^-n), not taken from the code.
"""

from __future__ import annotations

import dataclasses

import pytest

from offgrid.design.sizing import design
from offgrid.economics.bom import BomLine
from offgrid.economics.costs import (
    BATTERY_LIFE_PRESET_YEARS,
    battery_life,
    delivered_energy_kwh_year,
    lifecycle_cost,
    present_worth_factor,
    present_worth_single,
    replacement_years,
)
from offgrid.project.model import Economics, PriceItem
from offgrid.project.store import ProjectFileError, loads_project
from offgrid.simulate.life import BatteryWear
from offgrid.simulate.reliability import Reliability
from tests.conftest import hand_project


def test_present_worth_factor_hand_worked():
    # 1.08^-20 = 0.21455 -> (1 - 0.21455)/0.08 = 9.8181 (worked by hand, D&B eq. 11.5.1)
    assert present_worth_factor(20, 0.0, 0.08) == pytest.approx(9.8181, rel=1e-4)
    # (1.03/1.08)^10 = 0.62249 -> (1 - 0.62249)/0.05 = 7.5501
    assert present_worth_factor(10, 0.03, 0.08) == pytest.approx(7.5501, rel=1e-4)
    # i = d: N/(1+i) = 10/1.05 = 9.5238
    assert present_worth_factor(10, 0.05, 0.05) == pytest.approx(9.5238, rel=1e-4)
    # d = 0, i = 0: N payments of 1 are worth N
    assert present_worth_factor(7, 0.0, 0.0) == pytest.approx(7.0)


def test_single_payment_present_worth():
    # 1.08^-5 = 0.68058, 1.08^-10 = 0.46319 (by hand, D&B sec. 11.4)
    assert present_worth_single([5, 10], 0.08) == pytest.approx([0.68058, 0.46319], rel=1e-4)
    assert float(present_worth_single(3, 0.05, 0.05)) == pytest.approx(1.0)


def test_replacement_years():
    assert replacement_years(5, 20) == (5.0, 10.0, 15.0)  # not at year 20: the life ends
    assert replacement_years(25, 20) == ()
    assert replacement_years(8, 20) == (8.0, 16.0)
    assert replacement_years(6.5, 20) == (6.5, 13.0, 19.5)
    with pytest.raises(ValueError):
        replacement_years(0, 20)


def _hand_case():
    project = hand_project()
    project.economics = Economics(
        currency="EUR",
        life_years=20,
        discount_rate_pct=8.0,
        inflation_pct=0.0,
        om_pct_of_capital=1.0,
        installation_pct=10.0,
        battery_life_years=5.0,
        module_life_years=25.0,
        controller_life_years=12.0,
        inverter_life_years=10.0,
    )
    project.prices = [
        PriceItem("module", 100.0),
        PriceItem("battery", 150.0),
        PriceItem("controller", 200.0),
        PriceItem("inverter", 250.0),
    ]
    bom = (
        BomLine("module:test", "", 4, "each", ""),
        BomLine("battery:test", "", 2, "each", ""),
        BomLine("controller:MPPT 30 A", "", 1, "each", ""),
        BomLine("inverter:500 W", "", 1, "each", ""),
    )
    return project, bom


def test_lifecycle_cost_hand_worked():
    """A case worked by hand with the present-worth formulas (Duffie & Beckman ch. 11).

    Parts 4 x 100 + 2 x 150 + 200 + 250 = 1150; installation 10 % = 115; capital 1265.
    Battery (5 years) replaced in years 5, 10, 15: 300 x (0.68058 + 0.46319 + 0.31524)
    = 437.71; controller (12 years) in year 12: 200 x 0.39711 = 79.42; inverter (10 years)
    in year 10: 250 x 0.46319 = 115.80; modules (25 years) never.  Replacements 632.93.
    Upkeep 1 % of 1265 = 12.65 a year x PWF(20, 0, 0.08) 9.8181 = 124.20.
    LCC = 1265 + 632.93 + 124.20 = 2022.13.
    Energy: 100 W x 10 h DC + 200 W x 5 h AC = 2000 Wh/day at the appliances = 730 kWh/year;
    discounted 730 x 9.8181 = 7167.2 kWh; cost per kWh = 2022.13 / 7167.2 = 0.28213.
    """
    project, bom = _hand_case()
    d = design(project)
    c = lifecycle_cost(project, d, bom)
    assert c.complete and not c.missing
    assert c.parts == pytest.approx(1150.0)
    assert c.capital == pytest.approx(1265.0)
    assert c.replacements_pw == pytest.approx(632.93, abs=0.01)
    assert c.upkeep_pw == pytest.approx(124.20, abs=0.01)
    assert c.lcc == pytest.approx(2022.13, abs=0.02)
    assert c.energy_kwh_year == pytest.approx(730.0)
    assert c.cost_per_kwh == pytest.approx(0.28213, rel=1e-4)
    lines = {ln.key: ln for ln in c.lines}
    assert lines["battery:test"].replaced_at == (5.0, 10.0, 15.0)
    assert lines["module:test"].replaced_at == ()


def test_lifecycle_cost_with_inflation_hand_worked():
    """Same parts, prices rising 3 % a year.

    Battery: 300 x sum((1.03/1.08)^n, n = 5, 10, 15) = 300 x (0.78898 + 0.62249 + 0.49114)
    = 570.78; controller 200 x (1.03/1.08)^12 = 200 x 0.56619 = 113.24; inverter 250 x
    0.62249 = 155.62; replacements 839.64.  Upkeep 12.65 x PWF(20, 0.03, 0.08) = 12.65 x
    12.2500 = 154.96.  LCC = 1265 + 839.64 + 154.96 = 2259.60 (worked by hand).
    """
    project, bom = _hand_case()
    project.economics = dataclasses.replace(project.economics, inflation_pct=3.0)
    c = lifecycle_cost(project, design(project), bom)
    assert c.pwf_upkeep == pytest.approx(12.2500, rel=1e-4)
    assert c.replacements_pw == pytest.approx(839.64, abs=0.02)
    assert c.lcc == pytest.approx(2259.60, abs=0.03)


def test_missing_price_names_the_part_and_leaves_totals_out():
    project, bom = _hand_case()
    project.prices = [p for p in project.prices if p.part != "battery"]
    c = lifecycle_cost(project, design(project), bom)
    assert not c.complete
    assert c.missing == ("battery:test",)
    assert c.lcc is None and c.capital is None and c.cost_per_kwh is None
    assert "battery:test" in c.message() and "--import" in c.message()


def test_battery_life_sources():
    project = hand_project()
    life, src = battery_life(project)
    assert life == BATTERY_LIFE_PRESET_YEARS["agm"] and "preset" in src

    sim = _reliability_record(expected_life_years=6.3)
    assert battery_life(project, sim) == (6.3, "reliability simulation (battery wear)")
    project.economics.battery_life_years = 9.0
    assert battery_life(project, sim)[0] == 9.0  # the user's figure wins


def _reliability_record(expected_life_years: float) -> Reliability:
    """A reliability record with every figure 0 but the battery's expected life."""

    def zeros(cls, **given):
        values = {f.name: 0 for f in dataclasses.fields(cls) if f.name != "reasons"}
        return cls(**{**values, **given})

    return zeros(
        Reliability,
        months=(),
        worst_year_soc_min=(),
        notes=(),
        wear=zeros(BatteryWear, cycle_hist=(), expected_life_years=expected_life_years),
    )


def test_delivered_energy_counts_served_share():
    project = hand_project()
    d = design(project)
    assert delivered_energy_kwh_year(d) == pytest.approx(730.0)
    assert delivered_energy_kwh_year(d, 0.95) == pytest.approx(693.5)


def _project_text(extra: str) -> str:
    from offgrid.paths import demo_project_path

    return demo_project_path().read_text(encoding="utf-8") + extra


@pytest.mark.parametrize(("price", "fragment"), [("0.0", "above zero"), ("-12.0", "above zero")])
def test_project_file_with_bad_price_is_refused_with_line(price, fragment):
    text = _project_text(f'\n[[prices]]\npart = "fuse:10 A"\nunit_price = {price}\n')
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text, "p.toml")
    problem = next(p for p in exc.value.problems if p.path.endswith(".unit_price"))
    assert fragment in problem.message
    assert problem.line == text.splitlines().index(f"unit_price = {price}") + 1


def test_project_file_with_bad_economics_is_refused():
    text = _project_text("").replace("discount_rate_pct = 8.0", "discount_rate_pct = -3.0")
    with pytest.raises(ProjectFileError, match=r"economics\.discount_rate_pct"):
        loads_project(text, "p.toml")
