"""Programme planning (offgrid.plan.programme): many villages, each on its own site and
climate, kits across them all.  Invented villages and households throughout.

Checks: a programme with kits per village equals its villages planned one by one
(offgrid.plan.community, the single-survey planner); the programme-wide kit choice equals
exhaustive search on a small case (set partitions, as tests/test_plan_kits.py); totals add
up by hand; bad input is reported with file, line and fix while the rest plans.
"""

from __future__ import annotations

import json
import shutil
import sys
from pathlib import Path

import pytest

from offgrid.cli import main
from offgrid.design.sizing import DEFERS_TO_CODE
from offgrid.paths import load_profiles_dir
from offgrid.plan.community import plan_community
from offgrid.plan.programme import (
    ProgrammeError,
    demo_programme_path,
    is_programme_file,
    load_programme,
    plan_programme_file,
)
from offgrid.plan.programme_text import markdown_report, rows_csv, summary_text
from offgrid.plan.survey import load_survey

sys.path.insert(0, str(Path(__file__).parent))
from test_plan_kits import brute_cost

COMMUNITIES = load_profiles_dir() / "communities"
PRICES_NO_OWN = (
    "item,basis,unit_price,currency,note\nmodule,per_w,0.42,USD,invented\n"
    "battery_lifepo4,per_kwh,330,USD,\nbattery,per_kwh,210,USD,\n"
    "controller_pwm,per_a,1.6,USD,\ncontroller_mppt,per_a,6.5,USD,\n"
    "inverter,per_w,0.35,USD,\nsystem_fixed,each,45,USD,\n"
)


@pytest.fixture(scope="module")
def demo():
    return plan_programme_file(demo_programme_path(), jobs=1)


def test_demo_programme_plans_every_village(demo):
    assert demo.demo and not demo.left_out
    assert [v.id for v in demo.villages] == ["KR", "DW", "PA"]
    # each village on its own site and climate, at its own tilt
    assert len({v.climate for v in demo.villages}) == 3
    assert len({v.tilt_deg for v in demo.villages}) == 3
    for v in demo.villages:
        assert sum(v.kit_counts.values()) + v.own_systems == v.systems
        assert sum(v.tier_counts.values()) == v.systems
    assert sum(demo.kit_counts.values()) == sum(k.systems for k in demo.kits)
    assert DEFERS_TO_CODE in demo.cautions
    assert "PA-102" in next(v for v in demo.villages if v.id == "PA").own_rows  # kit = no


def test_a_kit_serves_its_worst_household_in_any_village(demo):
    kits = {k.name: k.parts for k in demo.kits}
    by_index = {a.index: a for _, s in demo.standards for a in s.assignments}
    villages_of_kit: dict[str, set[str]] = {}
    for c, vid in zip(demo.candidates, demo.candidate_village, strict=True):
        a = by_index[c.index]
        if a.kit is None:
            continue
        p, d = kits[a.kit], c.design
        assert p.strings >= d.modules_parallel and p.units_parallel >= d.units_parallel
        assert p.inverter_w >= d.inverter_w and p.family_label == d.family_label
        villages_of_kit.setdefault(a.kit, set()).add(vid)
    assert any(len(v) > 1 for v in villages_of_kit.values())  # kits are shared


def _write_alone(
    tmp: Path, vid: str, src: Path, lat: float, lon: float, elev: float, climate: str
) -> Path:
    """The village's survey planned on its own: the programme's site as settings rows."""
    lines = src.read_text(encoding="utf-8").splitlines()
    out, done = [], False
    for line in lines:
        if not done and line.lower().startswith("id,"):
            out += [
                f"site.latitude_deg,{lat}",
                f"site.longitude_deg,{lon}",
                f"site.elevation_m,{elev}",
            ]
            done = True
        if line.lower().startswith("climate,"):
            line = f"climate,{climate}"
        out.append(line)
    p = tmp / f"alone-{vid}.csv"
    p.write_text("\n".join(out) + "\n", encoding="utf-8")
    return p


def test_kits_per_village_equal_the_villages_planned_one_by_one(tmp_path):
    for name in ("kisanga-ridge-community.csv",):
        shutil.copy(COMMUNITIES / name, tmp_path / name)
    sites = {
        "V1": (-3.4, 36.9, 1450, "kisanga-ridge-demo"),
        "V2": (14.2, 1.6, 280, "dalli-wells-demo"),
    }
    rows = [
        "programme,two villages (invented)",
        "prices,kisanga-ridge-prices",
        "id,name,latitude_deg,longitude_deg,elevation_m,climate,survey",
    ]
    for vid, (lat, lon, elev, clim) in sites.items():
        rows.append(f"{vid},{vid},{lat},{lon},{elev},{clim},kisanga-ridge-community.csv")
    (tmp_path / "prog.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")
    prog = plan_programme_file(tmp_path / "prog.csv", jobs=1, kit_scope="village")
    assert not prog.left_out
    for v in prog.villages:
        lat, lon, elev, clim = sites[v.id]
        alone = plan_community(
            load_survey(
                _write_alone(
                    tmp_path, v.id, tmp_path / "kisanga-ridge-community.csv", lat, lon, elev, clim
                )
            ),
            jobs=1,
        )
        assert alone.tilt_deg == pytest.approx(v.tilt_deg)
        kits_alone = sorted(((k.parts, k.systems) for k in alone.standard.kits), key=repr)
        kits_prog = sorted(
            (
                (k.parts, v.kit_counts[k.name])
                for _, s in prog.standards
                for k in s.kits
                if k.name.startswith(f"{v.id}-")
            ),
            key=repr,
        )
        assert kits_prog == kits_alone
        own_alone = {r.id for r in alone.rows if r.status == "own system"}
        assert set(v.own_rows) == own_alone
        assert v.totals.total_cost + 1200.0 * len(kits_alone) == pytest.approx(
            alone.totals.total_cost, rel=1e-9
        )
    # and the two climates really differ: not the same kits
    a, b = (
        sorted(
            (k.parts for _, s in prog.standards for k in s.kits if k.name.startswith(f"{vid}-")),
            key=repr,
        )
        for vid in sites
    )
    assert a != b


def _small(tmp_path: Path, kits_line: str = "") -> Path:
    (tmp_path / "prices.csv").write_text(PRICES_NO_OWN, encoding="utf-8")
    survey = [
        "community,small (invented)",
        "project,kisanga-ridge-home-parts",
        "id,village,count,daily_energy_wh,peak_power_w",
    ]
    for vid, energies in (("A", (60, 150, 260)), ("B", (90, 200, 330))):
        for i, e in enumerate(energies):
            survey.append(f"{vid}{i},{vid},{2 + i},{e},{e / 5:g}")
    (tmp_path / "survey.csv").write_text("\n".join(survey) + "\n", encoding="utf-8")
    prog = [
        "programme,small (invented)",
        "prices,prices.csv",
        "survey,survey.csv",
        "id,latitude_deg,longitude_deg,elevation_m,climate",
        "A,-3.4,36.9,1450,kisanga-ridge-demo",
        "B,-16.2,-68.6,3850,pampa-alta-demo",
        kits_line,
    ]
    (tmp_path / "prog.csv").write_text("\n".join(prog) + "\n", encoding="utf-8")
    return tmp_path / "prog.csv"


@pytest.mark.parametrize("k", [1, 2, 3])
def test_programme_kit_choice_equals_brute_force(tmp_path, k):
    plan = plan_programme_file(_small(tmp_path), jobs=1, kits=k)
    cands = list(plan.candidates)
    assert len(cands) == 6 and {d.design.family for d in cands} == {cands[0].design.family}
    ((_, st),) = plan.standards
    assert st.objective_value == pytest.approx(
        brute_cost(cands, k, None, plan_prices(plan)), rel=1e-9
    )


def plan_prices(plan):
    from offgrid.plan.prices import read_prices_csv

    return read_prices_csv(PRICES_NO_OWN, "test")


def test_totals_add_up_by_hand(tmp_path):
    plan = plan_programme_file(_small(tmp_path), jobs=1, kits=2)
    kits = {k.name: k.parts for k in plan.kits}
    for v in plan.villages:
        # modules: each kit's modules x its count in the village (no own systems here)
        assert v.own_systems == 0
        assert v.modules == sum(n * kits[name].module_count for name, n in v.kit_counts.items())
        assert v.systems == {"A": 2 + 3 + 4, "B": 2 + 3 + 4}[v.id]
    total_modules = sum(
        ln.quantity
        for ln in plan.totals.lines
        if ln.category == "PV modules" or ln.label.startswith("PV module")
    )
    assert total_modules == sum(v.modules for v in plan.villages)
    assert plan.totals.total_cost == pytest.approx(sum(v.totals.total_cost for v in plan.villages))
    assert plan.totals.total_cost == pytest.approx(
        sum(ln.cost for ln in plan.totals.lines if ln.cost is not None)
    )
    assert sum(plan.kit_counts.values()) == 18 == plan.systems


def test_bad_input_named_with_file_line_and_fix(tmp_path):
    (tmp_path / "hot.toml").write_text(
        'format = "offgrid-climate"\nschema = 1\nname = "impossible sun (invented)"\n'
        "demo = true\nlatitude_deg = 10.0\nlongitude_deg = 0.0\n[monthly]\n"
        "insolation_kwh_m2_day = [15.0, 15, 15, 15, 15, 15, 15, 15, 15, 15, 15, 15]\n"
        "temp_mean_c = [25.0, 25, 25, 25, 25, 25, 25, 25, 25, 25, 25, 25]\n",
        encoding="utf-8",
    )
    survey = [
        "community,bad (invented)",
        "project,kisanga-ridge-home-parts",
        "id,village,count,load_list",
        "H1,OK,3,household-basic",
        "H2,NOPE,2,household-basic",
        "H3,NOCLIM,1,household-basic",
        "H4,HOT,1,household-basic",
    ]
    (tmp_path / "survey.csv").write_text("\n".join(survey) + "\n", encoding="utf-8")
    prog = [
        "programme,bad (invented)",
        "survey,survey.csv",
        "id,latitude_deg,longitude_deg,climate",
        "OK,-3.4,36.9,kisanga-ridge-demo",  # line 4
        "NOCOORD,,36.9,kisanga-ridge-demo",  # line 5
        "NOCLIM,-3.4,36.9,",  # line 6
        "OK,-3.0,36.0,kisanga-ridge-demo",  # line 7: duplicate id
        "HOT,10.0,0.0,hot.toml",
    ]  # line 8: climate fails its checks
    (tmp_path / "prog.csv").write_text("\n".join(prog) + "\n", encoding="utf-8")
    plan = plan_programme_file(tmp_path / "prog.csv", jobs=1)
    assert [v.id for v in plan.villages] == ["OK"] and plan.villages[0].systems == 3
    text = [str(p) for p in plan.left_out]
    src = str(tmp_path / "prog.csv")

    def has(*parts):
        return any(all(x in t for x in parts) for t in text)

    assert has(src, "line 5", "NOCOORD", "latitude_deg", "coordinates")
    assert has(src, "line 6", "NOCLIM", "climate", "bundled climate")
    assert has(src, "line 7", "duplicate village id 'OK'", "its own id")
    assert has(src, "line 8", "HOT", "climate", "insolation", "outside 0-12", "check the unit")
    assert has(str(tmp_path / "survey.csv"), "line 6", "NOCLIM", "left out with their village")
    assert has(str(tmp_path / "survey.csv"), "line 5", "NOPE", "does not list")
    md = markdown_report(plan)
    assert "## Left out" in md and "NOCOORD" in md


def test_unusable_programme_stops_with_every_problem(tmp_path):
    (tmp_path / "p.csv").write_text("programme,x\nid,latitude_deg,colour\n", encoding="utf-8")
    with pytest.raises(ProgrammeError) as err:
        load_programme(tmp_path / "p.csv")
    msg = str(err.value)
    assert "colour" in msg and "longitude_deg" in msg and "climate" in msg


def test_cli_plans_a_programme_with_json_and_report(tmp_path, capsys):
    assert is_programme_file(demo_programme_path())
    assert not is_programme_file(COMMUNITIES / "kisanga-ridge-community.csv")
    report = tmp_path / "prog.md"
    assert main(["plan", str(demo_programme_path()), "--kits", "4", "--report", str(report)]) == 0
    out = capsys.readouterr().out
    assert "Villages" in out and "Procurement totals" in out
    # every line fits 80 columns but one naming a file path (a temporary folder can be long)
    assert max(len(x) for x in out.splitlines() if str(tmp_path) not in x) <= 80
    md = report.read_text(encoding="utf-8")
    assert "## Villages" in md and "## Programme summary" in md and "Invented" in md
    assert main(["plan", "--demo-programme", "--json", "--kit-scope", "zone"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["format"] == "offgrid-programme-plan" and data["kit_scope"] == "zone"
    assert {k["scope"] for k in data["kits"]} == {"highland", "lowland"}
    assert (
        sum(data["kit_counts"].values()) + sum(v["own_systems"] for v in data["villages"])
        == data["systems"]
    )
    csv_path = tmp_path / "rows.csv"
    assert main(["plan", "--demo-programme", "--report", str(csv_path)]) == 0
    assert csv_path.read_text(encoding="utf-8").count("\n") == 1 + 35


def test_summary_fits_80_columns(demo):
    assert max(len(x) for x in summary_text(demo).splitlines()) <= 80
    assert rows_csv(demo).startswith("village,id,line,count,status,kit")


def test_one_worker_pool_for_all_villages_gives_the_same_plan(demo, monkeypatch):
    from offgrid.plan import programme as prog_mod

    monkeypatch.setattr(prog_mod, "PARALLEL_MIN_DESIGNS", 5)
    parallel = plan_programme_file(demo_programme_path(), jobs=2)
    assert [v.kit_counts for v in parallel.villages] == [v.kit_counts for v in demo.villages]
    assert parallel.candidates == demo.candidates
    assert parallel.totals == demo.totals


def test_zone_kits_are_compared_and_the_plan_says_which(demo):
    """The demo has two zones: the programme plan says whether zone kits would be cheaper,
    and the zone plan's kits each stay within one zone."""
    note = next(n for n in demo.notices if "climate zones" in n)
    assert "highland" in note and "lowland" in note and ("cheaper" in note)
    zoned = plan_programme_file(demo_programme_path(), jobs=1, kit_scope="zone")
    zone_of = {v.id: v.zone for v in load_programme(demo_programme_path()).villages}
    for v in zoned.villages:
        assert all(name.startswith(zone_of[v.id] + "-") for name in v.kit_counts)


def test_programme_report_never_overwrites_a_project(tmp_path, capsys):
    # issue 12: no output over an offgrid project, even with --force; the programme path too
    from offgrid.paths import demo_project_path

    target = tmp_path / "site.md"
    target.write_text(demo_project_path().read_text())
    before = target.read_text()
    with pytest.raises(SystemExit) as exit_:
        main(["plan", "--demo-programme", "--report", str(target)])
    assert exit_.value.code == 2
    assert "project" in capsys.readouterr().err
    assert target.read_text() == before
