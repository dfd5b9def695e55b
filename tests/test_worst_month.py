"""The design month is the least-covered month, and the array covers every month.

The design month is the month whose supply, with every derate of that month (cell
temperature, PWM operating point, ...), covers its demand least; the array is sized on it, so
no month's supply falls below its demand.  Checked on a case worked by hand, and on every
bundled project, every load list of load_profiles/ with every bundled climate, and the
test projects.
"""

from __future__ import annotations

import json
from dataclasses import replace

import numpy as np
import pytest

from offgrid.design.result import DesignError, SystemDesign
from offgrid.design.sizing import design
from tests.cli_support import run_cli
from tests.conftest import hand_project
from tests.design_invariants import HARVEST_TOL

LOAD_LISTS = (
    "household-basic.csv",
    "household-kit.csv",
    "household-medium.csv",
    "primary-school.csv",
    "radio-repeater.csv",
    "rural-clinic.csv",
    "village-shop.csv",
    "water-pump.csv",
)


def _climates() -> list[str]:
    from offgrid.climate.files import bundled_climates

    return sorted(bundled_climates())


def coverage_problems(supply, demand, design_month: int) -> list[str]:
    """Months whose supply is below demand, and a design month that is not the least covered."""
    s, d = np.asarray(supply, dtype=float), np.asarray(demand, dtype=float)
    used = d > 0
    out = [
        f"month {i + 1}: supply {s[i]:.1f} < demand {d[i]:.1f} Wh/day"
        for i in np.flatnonzero(used & (s < d * (1 - 1e-9)))
    ]
    cover = np.where(used, s / np.where(used, d, 1.0), np.inf)
    least = float(cover.min())
    if cover[design_month - 1] > least * (1 + 1e-9):
        out.append(
            f"design month {design_month} covers {cover[design_month - 1]:.4f}, month "
            f"{int(np.argmin(cover)) + 1} only {least:.4f}"
        )
    return out


def design_coverage_problems(d: SystemDesign) -> list[str]:
    out = coverage_problems(d.array.supply_wh_day, d.loads.daily_energy_wh, d.site.design_month)
    if d.electrical is not None:  # the I-V harvest after the battery round trip, every month
        eta = d.array.derates["battery round trip"]
        chosen = np.asarray(d.electrical.harvest.chosen_wh_day) * eta
        demand = np.asarray(d.loads.daily_energy_wh)
        short = np.flatnonzero(chosen < demand * (1 - HARVEST_TOL))
        if short.size and not any(n.code == "harvest-shortfall" for n in d.warnings):
            out.append(f"I-V harvest short of demand in months {list(short + 1)} unwarned")
    return out


def test_hot_month_is_the_design_month_hand_worked():
    """Hand-worked (calculator): the hand project of test_sizing, June made hot and dimmer.

    June: H = 4.2 kWh/m2/day, air 45 C (mean = max), tilt 0 so POA = H.  Klein's mean day
    162: declination (Cooper) 23.45 sin(360 x 446/365) = 23.09 deg; sunset hour angle
    arccos(-tan 10 tan 23.09) = 94.31 deg -> N = 12.575 h; energy-weighted irradiance
    pi^2 x 4200 / (8 x 12.575) = 412.1 W/m2; Tc = 45 + 25/800 x 412.1 = 57.88 C; temperature
    factor 1 - 0.004 x 32.88 = 0.8685.  December (from test_sizing): 4.0 x 0.9460.
    Derated sun: June 4.2 x 0.8685 = 3.648 < December 4.0 x 0.9460 = 3.784 kWh/m2/day, while
    demand / POA alone picks December (2586 / 4.0 > 2586 / 4.2).
    Array: 2586.2 / (4.2 x 0.8685 x 0.95 x 0.98 x 0.97 x 0.97 x 0.85) = 952.2 W.
    """
    p = hand_project()
    c = p.climate.inline
    c.insolation_kwh_m2_day[5] = 4.2
    c.temp_mean_c[5] = c.temp_max_c[5] = 45.0
    d = design(p)
    assert d.site.design_month == 6
    assert d.array.derates["temperature"] == pytest.approx(0.8685, abs=2e-4)
    assert d.array.required_power_w == pytest.approx(952.2, abs=0.6)
    assert design_coverage_problems(d) == []


def _bundled(loads_csv: str, climate: str):
    from offgrid.climate.files import load_climate
    from offgrid.paths import load_profiles_dir
    from offgrid.project.loads_csv import load_loads_csv
    from offgrid.project.model import ClimateChoice, Project, Site

    clim = load_climate(climate)
    return Project(
        site=Site(latitude_deg=clim.latitude_deg, longitude_deg=clim.longitude_deg),
        climate=ClimateChoice(ref=climate),
        loads=load_loads_csv(load_profiles_dir() / loads_csv),
    )


def _design_or_refusal(p) -> SystemDesign | None:
    try:
        return design(p)
    except DesignError as exc:  # a refusal names its field; not a coverage failure
        assert exc.field and str(exc)
        return None


@pytest.mark.parametrize("loads_csv", LOAD_LISTS)
def test_every_load_list_with_every_bundled_climate_is_covered(loads_csv):
    designed = 0
    for climate in _climates():
        for ctype in ("mppt", "pwm"):
            p = _bundled(loads_csv, climate)
            p.controller.type = ctype
            d = _design_or_refusal(p)
            if d is None:
                continue
            designed += 1
            assert design_coverage_problems(d) == [], (climate, ctype)
    assert designed >= len(_climates())  # most combinations must design


def test_test_projects_are_covered():
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    projects = [hand_project(), load_project(demo_project_path())]
    pwm = hand_project()
    pwm.controller.type = "pwm"
    pwm.module = replace(
        pwm.module,
        name="36-cell",
        pmax_w=100.0,
        vmp_v=18.0,
        imp_a=5.56,
        voc_v=22.0,
        isc_a=5.9,
        cells_in_series=36,
        area_m2=0.67,
    )
    pwm.choices.system_voltage = 12
    projects.append(pwm)
    demo_pwm = load_project(demo_project_path())
    demo_pwm.controller.type = "pwm"
    demo_pwm.choices.system_voltage = 24
    demo_pwm.battery.nominal_voltage_v = 2.0
    projects.append(demo_pwm)
    for p in projects:
        d = _design_or_refusal(p)
        assert d is not None, p.info.name
        assert design_coverage_problems(d) == [], p.info.name


def test_size_json_of_the_demo_marks_the_least_covered_month():
    out = run_cli("size", "--demo", "--json")  # main() in this process
    assert out.returncode in (0, 1), out.stderr
    data = json.loads(out.stdout)
    assert (
        coverage_problems(
            data["array"]["supply_wh_day"],
            data["loads"]["daily_energy_wh"],
            data["site"]["design_month"],
        )
        == []
    )


def test_bundled_community_rows_are_covered():
    """Every row project of the bundled community survey (invented village), as `offgrid plan`
    builds it, with the parts files of load_profiles/communities/."""
    from offgrid.plan.rows import communities_dir, prepare, row_project
    from offgrid.plan.survey import load_survey

    survey = load_survey(communities_dir() / "kisanga-ridge-community.csv")
    inputs = prepare(survey)
    designed = 0
    for row in survey.rows:
        try:
            p = row_project(inputs, row)
        except ValueError:
            continue
        d = _design_or_refusal(p)
        if d is None:
            continue
        designed += 1
        assert design_coverage_problems(d) == [], row.name
    assert designed >= len(survey.rows) // 2
