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
