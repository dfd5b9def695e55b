"""``offgrid generator``: the invented hybrid lodge from the command line (issue 16)."""

from __future__ import annotations

import json

import pytest

from offgrid.cli import main
from offgrid.generator.study import hybrid_demo_path


def test_demo_json_generator_section(capsys):
    assert main(["generator", "--demo", "--years", "2", "--json"]) == 0
    g = json.loads(capsys.readouterr().out)["generator"]
    assert g["demo"] is True
    assert g["fuel_curve"]["fit"][0]["datasheet_l_h"] == 0.9
    assert g["check"]["ok"] is True
    sim = g["simulation"]
    assert sim["fuel_l_per_year"] > 0 and sim["run_hours_per_year"] > 0
    assert sim["unmet_fraction"] < 0.01
    assert g["tradeoff"]["cheapest"] is not None
    assert len(g["tradeoff"]["points"]) == 20
    assert g["costs"]["fuel_pw"] > 0
    assert any("carbon monoxide" in c for c in g["cautions"])
    assert any("local electrical codes" in c for c in g["cautions"])


def test_text_summary(capsys):
    assert main(["generator", "--demo", "--years", "2", "--no-mix"]) == 0
    out = capsys.readouterr().out
    assert "demonstration data" in out and "fuel = 0.0750 x rating + 0.2900 x output" in out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_project_without_generator_refused(capsys):
    from offgrid.paths import demo_project_path

    with pytest.raises(SystemExit) as err:
        main(["generator", str(demo_project_path()), "--years", "2", "--no-mix"])
    assert err.value.code != 0
    assert "[generator]" in capsys.readouterr().err


def test_small_generator_refused_with_field(tmp_path, capsys):
    text = (
        hybrid_demo_path().read_text(encoding="utf-8").replace("rated_kw = 6.0", "rated_kw = 2.0")
    )
    p = tmp_path / "small.toml"
    p.write_text(text, encoding="utf-8")
    with pytest.raises(SystemExit):
        main(["generator", str(p), "--years", "2", "--no-mix", "--json"])
    out = json.loads(capsys.readouterr().out)
    assert out["error"]["field"] == "generator.rated_kw"


def test_size_json_has_the_generator_section(capsys, tmp_path):
    assert main(["size", str(hybrid_demo_path()), "--json"]) == 0
    g = json.loads(capsys.readouterr().out)["generator"]
    assert g["derating"]["derated_kw"] == 6.0 and g["check"]["ok"] is True
    assert g["fuel_curve"]["b_l_per_kwh"] == pytest.approx(0.29)
    text = (
        hybrid_demo_path().read_text(encoding="utf-8").replace("rated_kw = 6.0", "rated_kw = 2.0")
    )
    p = tmp_path / "small.toml"
    p.write_text(text, encoding="utf-8")
    assert main(["size", str(p), "--json"]) == 0  # the solar design still stands
    g = json.loads(capsys.readouterr().out)["generator"]
    assert g["refused"]["field"] == "generator.rated_kw"


def test_years_and_seed_are_read_as_offgrid_simulate_reads_them(capsys):
    # one reader for both commands (simulate.weather.check_years / check_seed)
    for argv in (["--years", "many"], ["--seed", "x"]):
        with pytest.raises(SystemExit) as exc:
            main(["generator", "--demo", "--no-mix", *argv])
        assert exc.value.code == 2
        err = capsys.readouterr().err
        with pytest.raises(SystemExit):
            main(["simulate", "--demo", "--no-sweep", *argv])
        assert capsys.readouterr().err == err
