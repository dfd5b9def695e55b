"""`offgrid simulate` on the demonstration project, and the adapter from the design."""

import copy
import json

import numpy as np
import pytest

from offgrid.cli import main
from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.simulate.adapter import inputs_from_design
from offgrid.simulate.balance import build_steps
from offgrid.simulate.run import simulate_project
from offgrid.simulate.weather import MONTH_OF_DAY, WeatherSeries


def test_text_summary(capsys):
    assert main(["simulate", "--demo", "--years", "3", "--sweep", "6"]) == 0
    out = capsys.readouterr().out
    assert "demonstration data" in out
    assert "loss-of-load probability" in out
    assert "reliability target: loads met on 99.0 % of days (LOLP 1.00 %)" in out
    assert "local electrical codes" in out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_json_output(capsys):
    assert (
        main(
            [
                "simulate",
                "--demo",
                "--years",
                "2",
                "--seed",
                "4",
                "--json",
                "--sweep",
                "5",
                "--array-price",
                "0.5",
                "--battery-price",
                "150",
            ]
        )
        == 0
    )
    data = json.loads(capsys.readouterr().out)
    rel = data["reliability"]
    assert 0 <= rel["lolp"] <= 1 and rel["days"] == 730
    assert len(rel["months"]) == 12
    assert data["weather"]["seed"] == 4
    assert data["tradeoff"]["targets"][0]["target_lolp"] == 0.01
    assert "lolp" in rel["reasons"]


@pytest.mark.parametrize(
    "argv,match",
    [
        (["--years", "0"], "years"),
        (["--years", "-2"], "years"),
        (["--years", "x"], "years"),
        (["--seed", "abc"], "seed"),
        (["--target", "0"], "cannot be promised"),
        (["--array-price", "0.5"], "costs missing"),
        (["--sweep", "1"], "sweep"),
    ],
)
def test_bad_input_is_a_clear_message(argv, match, capsys):
    with pytest.raises(SystemExit) as exc:
        main(["simulate", "--demo", "--years", "1", "--sweep", "4", *argv])
    assert exc.value.code == 2
    assert match in capsys.readouterr().err


def test_project_left_untouched():
    project = load_project(demo_project_path())
    before = copy.deepcopy(project)
    simulate_project(project, demo_project_path().parent, years=1, with_tradeoff=False)
    assert project == before


def test_adapter_reproduces_the_design_supply():
    project = load_project(demo_project_path())
    result = design(project, demo_project_path().parent)
    inp = inputs_from_design(project, result)
    # On days at each month's mean insolation and with no controller clipping, the daily PV
    # equals the design's monthly array supply with the battery round trip put back in (the
    # demo's I-V harvest is above the derate chain in every month).
    assert all(
        h * result.array.derates["battery round trip"] >= s
        for h, s in zip(result.array.harvest_mppt_wh_day, result.array.supply_wh_day, strict=True)
    )
    h = np.asarray(result.site.horizontal_kwh_m2_day)
    w = WeatherSeries(h[MONTH_OF_DAY][None, :], 0, h, np.ones(12), None, "monthly means")
    steps = build_steps(inp, w, "daily")
    pv = steps.pv_wh_per_w[:, 0] + steps.clipped_wh_per_w[:, 0]  # before the controller limit
    rt = result.array.derates["battery round trip"]
    for m in range(12):
        got = pv[m == MONTH_OF_DAY][0] * result.array.power_w * rt
        assert got == pytest.approx(result.array.supply_wh_day[m], rel=1e-9)
    np.testing.assert_allclose(inp.load_wh, result.loads.daily_energy_wh)
    np.testing.assert_allclose(inp.load_profile.sum(axis=1), 1.0)
    assert inp.capacity_wh == pytest.approx(
        result.battery.nominal_kwh * 1000 / result.battery.temp_factor
    )
    assert inp.eta_charge * inp.eta_discharge == pytest.approx(project.battery.efficiency)


def test_worst_year_series_for_the_chart():
    project = load_project(demo_project_path())
    rep = simulate_project(
        project, demo_project_path().parent, years=4, seed=2, with_tradeoff=False
    )
    r = rep.reliability
    assert len(r.worst_year_soc_min) == 365 and 0 <= r.worst_year < 4
    floor = 1 - result_dod(project)
    assert min(r.worst_year_soc_min) >= floor - 1e-9


def result_dod(project) -> float:
    return design(project, demo_project_path().parent).battery.max_dod


def test_hand_project_simulates(project):
    # the invented hand-worked project of tests/conftest.py, inline climate
    rep = simulate_project(project, None, years=2, seed=1, sweep_size=5)
    assert 0 <= rep.reliability.lolp <= 1
    assert rep.tradeoff is not None and len(rep.tradeoff.targets) == 2


def test_measured_days_from_the_climate_are_used(monkeypatch):
    from dataclasses import replace
    from types import SimpleNamespace

    import offgrid.design.sizing

    real = offgrid.design.sizing.resolve_climate

    def with_daily(project, base=None):
        c = real(project, base)
        return replace(c, daily=SimpleNamespace(insolation_kwh_m2_day=[5.0] * 365))

    monkeypatch.setattr(offgrid.design.sizing, "resolve_climate", with_daily)
    project = load_project(demo_project_path())
    rep = simulate_project(project, demo_project_path().parent, years=2, with_tradeoff=False)
    assert rep.weather["measured_years"] == 1 and rep.weather["years"] == 3
    assert rep.reliability.lolp_measured is not None


def test_engine_imports_no_ui():
    import subprocess
    import sys

    code = (
        "import sys\nimport offgrid.simulate.run, offgrid.commands.simulate\n"
        "bad = [m for m in ('textual', 'rich') if m in sys.modules]\nassert not bad, bad\n"
    )
    subprocess.run([sys.executable, "-c", code], check=True)


def test_adapter_takes_the_lower_harvest():
    # When the I-V curves give less than the derate chain, the simulation must not assume
    # the chain's (higher) energy.
    from dataclasses import replace

    project = load_project(demo_project_path())
    result = design(project, demo_project_path().parent)
    low = tuple(0.5 * v for v in result.array.harvest_mppt_wh_day)
    weak = replace(result, array=replace(result.array, harvest_mppt_wh_day=low))
    inp = inputs_from_design(project, weak)
    poa = np.asarray(result.site.poa_kwh_m2_day)
    np.testing.assert_allclose(inp.yield_factor, np.asarray(low) / (result.array.power_w * poa))
