"""The community plan end to end: demo, same engine as one project, command line, views,
parallel designs, and a 10,000-row survey (invented data throughout)."""

from __future__ import annotations

import json
import subprocess
import sys

import numpy as np
import pytest

from offgrid.cli import main
from offgrid.design.sizing import DEFERS_TO_CODE, design
from offgrid.paths import load_profiles_dir
from offgrid.plan import rows as rows_mod
from offgrid.plan.community import demo_survey_path, plan_community, plan_file
from offgrid.plan.rows import (
    RowDesign,
    community_tilt,
    design_rows,
    prepare,
    row_project,
    summarise,
)
from offgrid.plan.survey import load_survey, read_survey
from offgrid.plan.text import markdown_report, rows_csv, summary_text


@pytest.fixture(scope="module")
def demo():
    return plan_file(demo_survey_path(), jobs=1)


def test_demo_community_plans_every_row(demo):
    assert demo.demo and not demo.bad_rows and not demo.unmet
    assert 180 <= demo.systems <= 220  # about 200 households and facilities
    assert {r.status for r in demo.rows} <= {"kit", "own system"}
    clinic = next(r for r in demo.rows if r.id == "CLINIC")
    assert clinic.status == "own system" and "kit = no" in clinic.reason
    assert 1 <= len(demo.standard.kits) <= 12
    assert sum(demo.tier_counts.values()) == demo.systems
    assert DEFERS_TO_CODE in demo.cautions


def test_each_row_is_the_single_project_design(demo):
    """Same engine: a row's record equals summarise(design(row_project(row)))."""
    inputs = prepare(load_survey(demo_survey_path()))
    tilt = community_tilt(inputs)
    assert tilt == demo.tilt_deg and 10.0 <= tilt <= 30.0
    by_id = {r.id: r for r in demo.rows}
    for row in inputs.survey.rows:
        project = row_project(inputs, row)
        assert summarise(project, design(project, inputs.base_dir)) == by_id[row.id].design


def test_one_tilt_for_the_community_unless_a_row_sets_its_own():
    """Kits share a mounting: the tilt is the engine's search for the total demand."""
    from offgrid.design.loads import appliance_energy_wh
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import site_geometry

    text = (
        "climate,kisanga-ridge-demo\nproject,kisanga-ridge-home-parts\n"
        "id,count,load_list,site.tilt_deg\nA,10,primary-school,\nB,3,household-basic,"
        "\nC,1,household-basic,35\n"
    )
    inputs = prepare(read_survey(text, base_dir=load_profiles_dir()))
    lists = inputs.load_lists
    designed = design_rows(inputs, jobs=1)
    total = sum(
        appliance_energy_wh(lists[name]).sum(axis=0) * n
        for name, n in (("primary-school", 10), ("household-basic", 4))
    )
    probe = prepare(read_survey(text, base_dir=load_profiles_dir())).base
    expect, _, _ = site_geometry(probe, probe.climate.inline, ReasonBook(), demand_wh_day=total)
    assert inputs.base.site.tilt_deg == expect
    row_c = next(i for i, r in enumerate(designed.rows) if r.id == "C")
    project_c = row_project(inputs, designed.rows[row_c])
    assert project_c.site.tilt_deg == 35.0


def test_parallel_designs_equal_serial(monkeypatch):
    text = demo_survey_path().read_text()
    lines = text.splitlines()
    head = [ln for ln in lines if not ln.startswith("KAT-1")]
    extra = [f"X-{i},extra home,household,1,,,{60 + 7 * i},{20 + i}" + ",,,,," for i in range(60)]
    s = read_survey("\n".join(head + extra) + "\n", base_dir=load_profiles_dir())
    inputs = prepare(s)
    serial = design_rows(inputs, jobs=1)
    monkeypatch.setattr(rows_mod, "PARALLEL_MIN_DESIGNS", 10)
    parallel = design_rows(inputs, jobs=2)
    assert serial.designs == parallel.designs
    assert serial.distinct == parallel.distinct > 60


def test_json_is_plain_and_finite(demo):
    data = json.loads(json.dumps(demo.to_dict(), allow_nan=False))
    assert data["format"] == "offgrid-community-plan" and data["demo"] is True
    assert len(data["rows"]) == len(demo.rows)
    # schema 2: each distinct design listed once, rows name it
    assert data["schema"] == 2 and len(data["designs"]) == demo.distinct_designs
    ids = {r["design_id"] for r in data["rows"]}
    assert ids == set(range(len(data["designs"])))
    assert all(isinstance(d["family"], int) for d in data["designs"])
    assert data["tiers"]["edition"].startswith("ESMAP")
    assert "plan.kits" in data["reasons"] and "plan.tilt" in data["reasons"]


def test_text_views_fit_80_columns(demo):
    text = summary_text(demo, show_rows=True)
    assert max(len(line) for line in text.splitlines()) <= 80
    assert "demonstration data" in text and "Capital cost" in text
    md = markdown_report(demo)
    assert md.startswith("# ") and "## Procurement totals" in md
    assert "Demonstration data" in md
    csv_text = rows_csv(demo)
    assert csv_text.count("\n") == len(demo.rows) + 1


def test_cli_demo_and_reports(tmp_path, capsys):
    assert main(["plan", "--demo", "--kits", "3", "--jobs", "1"]) == 0
    out = capsys.readouterr().out
    assert "Standard kits" in out and "Procurement totals" in out
    for suffix in (".md", ".csv", ".json"):
        target = tmp_path / f"plan{suffix}"
        assert main(["plan", "--demo", "--jobs", "1", "--report", str(target)]) == 0
        assert target.stat().st_size > 500
    capsys.readouterr()
    assert (
        main(["plan", "--demo", "--json", "--objective", "oversize", "--kits", "6", "--jobs", "1"])
        == 0
    )
    data = json.loads(capsys.readouterr().out)
    assert data["standardisation"]["objective"] == "oversize"


def test_cli_bad_rows_exit_1_and_bad_survey_exit_2(tmp_path, capsys):
    survey = tmp_path / "village.csv"
    survey.write_text(
        "climate,kisanga-ridge-demo\nid,count,load_list\n"
        "A,2,household-basic\nB,-1,household-basic\n"
    )
    assert main(["plan", str(survey), "--kits", "1", "--jobs", "1"]) == 1
    captured = capsys.readouterr()
    assert "line 4 (id B), count" in captured.out
    with pytest.raises(SystemExit) as err:
        main(["plan", str(tmp_path / "missing.csv")])
    assert err.value.code == 2
    with pytest.raises(SystemExit):
        main(["plan", "--demo", "--report", str(tmp_path / "plan.docx")])


def test_ten_thousand_rows_plan():
    """A 10,000-row survey runs (its speed is measured in benchmarks/bench_plan.py)."""
    rng = np.random.default_rng(1)
    lists = ["household-basic", "household-medium", "household-kit", "village-shop"]
    lines = [
        "community,Ten thousand homes (invented)",
        "climate,kisanga-ridge-demo",
        "project,kisanga-ridge-home-parts",
        "prices,kisanga-ridge-prices",
        "id,count,load_list,daily_energy_wh,peak_power_w,ac_dc",
    ]
    for i in range(10_000):
        if i % 3:
            lines.append(f"H{i},1,{lists[i % 4]},,,")
        else:
            e = int(rng.integers(5, 150)) * 10
            lines.append(f"H{i},1,,{e},{max(10, e // 6)},{'ac' if i % 7 == 0 else 'dc'}")
    s = read_survey("\n".join(lines) + "\n", base_dir=load_profiles_dir())
    plan = plan_community(s, kits=4)
    assert plan.rows_read == 10_000 and not plan.bad_rows
    assert plan.systems + len(plan.unmet) == 10_000
    assert len(plan.standard.kits) <= 4
    assert all(isinstance(r.design, RowDesign) for r in plan.rows if r.status == "kit")


def test_planning_imports_no_ui():
    code = (
        "import sys\nfrom offgrid.plan.community import plan_file, demo_survey_path\n"
        "from offgrid.plan.text import summary_text\n"
        "summary_text(plan_file(demo_survey_path(), jobs=1))\n"
        "bad = [m for m in ('textual', 'rich') if m in sys.modules]\n"
        "assert not bad, bad\n"
    )
    subprocess.run([sys.executable, "-c", code], check=True)


def test_tables_for_the_text_ui(demo):
    from offgrid.plan.text import kit_table, row_table, totals_table

    head, rows = kit_table(demo)
    assert len(rows) == len(demo.standard.kits) and all(len(r) == len(head) for r in rows)
    head, rows = row_table(demo)
    assert len(rows) == len(demo.rows) + len(demo.bad_rows)
    head, rows = totals_table(demo)
    assert len(rows) == len(demo.totals.lines)
    assert all(isinstance(c, str) for r in rows for c in r)


def test_energy_step_rounds_up_within_the_step():
    from offgrid.plan.rows import step_up

    rng = np.random.default_rng(0)
    for v in rng.uniform(1, 20000, 500):
        up = step_up(float(v), 1.0)
        assert v <= up <= v * 1.01 * (1 + 1e-12)
        assert step_up(up, 1.0) == pytest.approx(up, rel=1e-12)  # grid points stay
    assert step_up(123.4, 0.0) == 123.4


def test_near_equal_surveys_share_a_design_unless_the_step_is_zero():
    text = (
        "climate,kisanga-ridge-demo\nproject,kisanga-ridge-home-parts\n"
        "id,count,daily_energy_wh,peak_power_w\nA,1,200,40\nB,1,200.5,40.1\nC,1,260,40\n"
    )
    s = read_survey(text, base_dir=load_profiles_dir())
    assert design_rows(prepare(s), jobs=1).distinct == 2
    assert design_rows(prepare(s, energy_step_pct=0.0), jobs=1).distinct == 3
    plan = plan_community(s, kits=1, jobs=1)
    for r in plan.rows:
        surveyed = next(x for x in s.rows if x.id == r.id).daily_energy_wh
        growth = 1.1  # the parts project's load growth
        assert r.design.appliance_energy_wh >= surveyed * growth * (1 - 1e-9)
        assert r.design.appliance_energy_wh <= surveyed * growth * 1.01 * (1 + 1e-9)
