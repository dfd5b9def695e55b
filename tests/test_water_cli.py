"""`offgrid water`: the demo water point from the command line, its JSON section, refusals."""

from __future__ import annotations

import json

import pytest

from offgrid.cli import main
from offgrid.paths import demo_project_path, demo_water_path


def test_demo_water_text(capsys):
    assert main(["water", "--demo", "--years", "3"]) == 0
    out = capsys.readouterr().out
    assert "Total dynamic head" in out and "Limiting month" in out
    assert "3 years of synthetic weather" in out
    assert "local electrical code" in out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_demo_water_json_section(capsys):
    assert main(["water", "--demo", "--json", "--years", "2"]) == 0
    data = json.loads(capsys.readouterr().out)
    (w,) = data["water"]
    assert len(w["water_m3_day"]) == 12 and 1 <= w["limiting_month"] <= 12
    assert w["reliability"]["years"] == 2
    parts = {b["part"] for b in w["bom"]}
    assert {"water.pump", "water.tank", "water.float_switch", "water.drop_cable"} <= parts
    assert "water.total_dynamic_head_m" in w["reasons"]


def test_project_without_water_is_refused_naming_the_field(capsys):
    with pytest.raises(SystemExit) as e:
        main(["water", "--json", str(demo_project_path())])
    assert e.value.code == 2
    err = json.loads(capsys.readouterr().out)["error"]
    assert err["field"] == "water"


def test_infeasible_head_is_refused_with_the_reason(capsys, tmp_path):
    text = demo_water_path().read_text().replace("static_level_m = 24.0", "static_level_m = 90.0")
    path = tmp_path / "deep.toml"
    path.write_text(text)
    with pytest.raises(SystemExit) as e:
        main(["water", "--json", "--years", "0", str(path)])
    assert e.value.code == 3
    err = json.loads(capsys.readouterr().out)["error"]
    assert err["code"] == "pump-head" and "cannot lift" in err["message"]


def test_water_report_file(capsys, tmp_path):
    out = tmp_path / "water.md"
    assert main(["water", "--demo", "--years", "0", "--report", str(out)]) == 0
    text = out.read_text()
    assert "Water supply:" in text and "Total dynamic head" in text
    assert "Float switch" in text or "float switch" in text
    assert "invented" in text


def test_water_lines_in_the_project_bom_and_report():
    # A project with a power system and a water supply: the pumping parts join the bill of
    # materials and the report gains a water section.
    import copy

    from offgrid.design.sizing import design
    from offgrid.economics.bom import bill_of_materials
    from offgrid.project.store import load_project
    from offgrid.report.build import build_report

    power = load_project(demo_project_path())
    water = load_project(demo_water_path())
    both = copy.deepcopy(power)
    both.water = water.water
    d = design(both)
    kinds = {line.kind for line in bill_of_materials(both, d)}
    assert {"water.pump", "water.tank", "water.float_switch"} <= kinds
    report = build_report(both, d, with_charts=False)
    assert report.section("water-1") is not None
    assert build_report(power, design(power), with_charts=False).section("water-1") is None


def test_size_json_has_a_water_section_when_the_project_has_water(capsys, tmp_path):
    power = demo_project_path().read_text()
    water = demo_water_path().read_text()
    tables = water[water.index("[[water]]") :]
    path = tmp_path / "both.toml"
    path.write_text(power + "\n" + tables)
    assert main(["size", "--json", str(path)]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["water"][0]["name"].endswith("(invented)")
    assert "array" in data  # the power design is still there
    assert main(["size", str(path)]) == 0
    assert "Water supply:" in capsys.readouterr().out
    assert main(["size", "--json", str(demo_project_path())]) == 0
    assert "water" not in json.loads(capsys.readouterr().out)


def test_water_report_html_has_the_day_chart(tmp_path):
    out = tmp_path / "water.txt"
    assert main(["water", "--demo", "--years", "0", "--report", str(out)]) == 0
    assert "solar time" in out.read_text()  # the chart's text form
    from offgrid.project.store import load_project
    from offgrid.report.html import render_html
    from offgrid.water.report import water_report

    html = render_html(water_report(load_project(demo_water_path())))
    assert html.count("<svg") == 1 and "flow (m3/h)" in html


def test_size_of_a_water_only_project_shows_the_supply_not_a_refusal(capsys):
    # the bundled demo water point has no loads: `offgrid size` says there is no battery
    # system and shows the supply (it refused with "the load list is empty" before)
    assert main(["size", str(demo_water_path())]) == 0
    out = capsys.readouterr().out
    assert "no battery system designed" in out and "Total dynamic head" in out
    assert main(["size", str(demo_water_path()), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["power"] is None and "load list is empty" in data["power_note"]
    assert data["water"][0]["total_dynamic_head_m"] > 0


def test_size_without_loads_or_water_still_refuses(capsys, tmp_path):
    from offgrid.project.store import load_project, save_project

    project = load_project(demo_project_path())
    project.loads = []
    path = tmp_path / "empty.toml"
    save_project(project, path)
    with pytest.raises(SystemExit) as exc:
        main(["size", str(path)])
    assert exc.value.code == 3 and "load list is empty" in capsys.readouterr().err
