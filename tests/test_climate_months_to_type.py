"""Own months still to type travel with the project (issue 19 follow-up).

An own climate started from nothing holds placeholders (the saved table needs twelve
numbers) until the user types each month.  Which months are still to type is part of
the project: the file keeps it, validation checks it, and no design runs on it (the
command line included), so a saved or recovered project cannot be designed on
placeholders as if they were data.
"""

from __future__ import annotations

import dataclasses
import json

import pytest

from offgrid.cli import main
from offgrid.design.result import INPUT_ERROR_CODES, DesignError
from offgrid.design.sizing import design
from offgrid.project.store import dumps_project, loads_project, save_project
from offgrid.project.validate import validate_project
from tests.conftest import hand_project


def with_months_to_type(months: dict[str, tuple[int, ...]]):
    p = hand_project()
    p.climate.inline.months_to_type = dict(months)
    return p


def test_no_marks_write_nothing_new():
    text = dumps_project(hand_project())
    assert "months_to_type" not in text
    assert loads_project(text).climate.inline.months_to_type == {}


def test_marks_survive_saving_and_reading():
    p = with_months_to_type({"insolation_kwh_m2_day": (2, 3, 12), "temp_mean_c": (1,)})
    text = dumps_project(p)
    assert "[climate.months_to_type]" in text
    back = loads_project(text).climate.inline
    assert back.months_to_type == {"insolation_kwh_m2_day": (2, 3, 12), "temp_mean_c": (1,)}
    assert dumps_project(loads_project(text)) == text


@pytest.mark.parametrize(
    "table, expected",
    [
        ("insolation_kwh_m2_day = [0, 3]", "climate.months_to_type.insolation_kwh_m2_day"),
        ("insolation_kwh_m2_day = [13]", "month numbers 1-12"),
        ('temp_mean_c = ["May"]', "climate.months_to_type.temp_mean_c"),
        ("temp_mean_c = 3", "climate.months_to_type.temp_mean_c"),
        ("wind_m_s = [1]", "climate.months_to_type.wind_m_s"),
    ],
)
def test_bad_marks_are_refused_naming_the_field_and_the_fix(table, expected):
    text = dumps_project(hand_project())
    marks = f"[climate.months_to_type]\n{table}\n\n[climate.monthly]"
    text = text.replace("[climate.monthly]", marks)
    with pytest.raises(ValueError) as exc:
        loads_project(text)
    message = str(exc.value)
    assert expected in message, message
    assert "1-12" in message or "sun" in message, message


def test_validation_names_a_bad_mark():
    p = with_months_to_type({"temp_mean_c": (0,)})
    paths = [pr.path for pr in validate_project(p)]
    assert "climate.months_to_type.temp_mean_c" in paths


def test_the_engine_refuses_months_still_to_type():
    p = with_months_to_type({"insolation_kwh_m2_day": (2, 3, 4, 6), "temp_mean_c": (1,)})
    assert validate_project(p) == []  # a valid project: only the design waits
    with pytest.raises(DesignError) as exc:
        design(p)
    err = exc.value
    assert err.code == "climate-months-untyped"
    assert err.code in INPUT_ERROR_CODES
    assert err.field == "climate.months_to_type"
    message = str(err)
    assert "sun Feb-Apr, Jun" in message and "mean temperature Jan" in message
    assert "Place" in message and "[climate.monthly]" in message


def test_size_on_a_file_with_months_to_type_is_refused(tmp_path, capsys):
    path = tmp_path / "own.toml"
    save_project(with_months_to_type({"temp_mean_c": (7, 8)}), path)
    try:
        code = main(["size", str(path)])
    except SystemExit as exc:
        code = exc.code
    captured = capsys.readouterr()
    assert code == 2
    assert "mean temperature Jul-Aug" in captured.err
    assert "Traceback" not in captured.err
    try:
        code = main(["size", str(path), "--json"])
    except SystemExit as exc:
        code = exc.code
    out = json.loads(capsys.readouterr().out)["error"]
    assert code == 2 and out["exit_code"] == 2
    assert out["code"] == "climate-months-untyped"
    assert out["field"] == "climate.months_to_type"


def test_a_plan_on_a_project_with_months_to_type_is_refused(tmp_path):
    from offgrid.paths import load_profiles_dir
    from offgrid.plan.community import plan_community
    from offgrid.plan.survey import SurveyError, read_survey

    p = with_months_to_type({"insolation_kwh_m2_day": (5,)})
    p.climate.inline.latitude_deg = -3.0
    save_project(p, tmp_path / "own.toml")
    kit = load_profiles_dir() / "household-basic.csv"
    (tmp_path / "household-basic.csv").write_text(kit.read_text(encoding="utf-8"), encoding="utf-8")
    text = "project,own\nid,count,load_list\nA,1,household-basic\n"
    with pytest.raises(SurveyError) as exc:
        plan_community(read_survey(text, base_dir=tmp_path), kits=1, jobs=1)
    message = str(exc.value)
    assert "climate.months_to_type" in message and "sun May" in message, message


def test_a_water_supply_is_not_sized_on_months_to_type():
    from offgrid.design.sizing import resolve_climate
    from offgrid.paths import demo_water_path
    from offgrid.project.model import ClimateChoice
    from offgrid.project.store import load_project
    from offgrid.water.design import water_design

    p = load_project(demo_water_path())
    read = resolve_climate(p, demo_water_path().parent)
    own = dataclasses.replace(read, months_to_type={"temp_mean_c": (3,)})  # not the cached one
    p.climate = ClimateChoice(inline=own)
    with pytest.raises(DesignError) as exc:
        water_design(p, 0, demo_water_path().parent)
    assert exc.value.code == "climate-months-untyped"
    assert "mean temperature Mar" in str(exc.value)
