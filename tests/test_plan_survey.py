"""Community survey CSV: settings, columns, and bad rows that name their line.

Surveys here are invented test data for the invented village of Kisanga Ridge.
"""

from __future__ import annotations

import pytest

from offgrid.paths import load_profiles_dir
from offgrid.plan.community import plan_community
from offgrid.plan.survey import SurveyError, convert_value, field_type, read_survey

HEAD = (
    "community,Test hamlet (invented)\n"
    "climate,kisanga-ridge-demo\n"
    "project,kisanga-ridge-home-parts\n"
    "prices,kisanga-ridge-prices\n"
)


def survey(body: str, head: str = HEAD):
    return read_survey(head + body, source="test.csv", base_dir=load_profiles_dir())


def test_settings_rows_then_header_then_rows():
    s = survey(
        "choices.autonomy_days,2.5\n"
        "# a comment line\n"
        "\n"
        "id,name,count,load_list,choices.load_growth_pct\n"
        "A1,First home,3,household-basic,\n"
        "A2,Second home,1,household-medium,20\n"
    )
    assert s.name == "Test hamlet (invented)"
    assert s.climate == "kisanga-ridge-demo" and s.prices == "kisanga-ridge-prices"
    assert dict(s.settings) == {"choices.autonomy_days": 2.5}
    assert [r.id for r in s.rows] == ["A1", "A2"]
    assert s.rows[0].line == 9 and s.rows[1].line == 10
    assert s.rows[0].overrides == ()  # a blank override cell keeps the shared value
    assert s.rows[1].overrides == (("choices.load_growth_pct", 20.0),)
    assert s.rows[0].kind == "household" and s.rows[0].kit == "auto"


def test_bad_rows_name_their_line_and_the_rest_still_plans():
    body = (
        "id,name,kind,count,load_list,daily_energy_wh,peak_power_w\n"  # line 5
        "A1,,household,5,household-basic,,\n"  # 6 fine
        "A2,,household,-3,household-basic,,\n"  # 7 negative count
        "A3,,household,,household-basic,,\n"  # 8 blank count
        "A1,,household,2,household-medium,,\n"  # 9 duplicate id
        "A5,,household,1,no-such-list,,\n"  # 10 unknown load list
        "A6,,household,1,,150,\n"  # 11 blank peak
        ",,household,1,household-basic,,\n"  # 12 blank id
        "A8,,household,2,,120,30\n"  # 13 fine
        "A9,,household,1,,,\n"  # 14 no demand at all
        "A10,,household,2.5,household-basic,,\n"
    )  # 15 fractional count
    plan = plan_community(survey(body), kits=2, jobs=1)
    planned = [r.id for r in plan.rows if r.status in ("kit", "own system")]
    assert planned == ["A1", "A8"]
    by_line = {p.line: p for p in plan.bad_rows}
    assert sorted(by_line) == [7, 8, 9, 10, 11, 12, 14, 15]
    assert by_line[7].field == "count" and "negative" in by_line[7].message
    assert by_line[8].field == "count" and "blank" in by_line[8].message
    assert by_line[9].field == "id" and "line 6" in by_line[9].message
    assert by_line[10].field == "load_list" and "no-such-list" in by_line[10].message
    assert "household-basic" in by_line[10].message  # names the bundled lists
    assert by_line[11].field == "peak_power_w"
    assert by_line[12].field == "id" and "blank" in by_line[12].message
    assert by_line[14].field == "demand"
    assert "whole number" in by_line[15].message
    assert str(by_line[7]).startswith("line 7 (id A2), count:")
    assert any(n.code == "bad-rows" for n in plan.notices)


def test_unknown_load_list_rows_share_one_message():
    body = "id,count,load_list\nB1,1,nowhere\nB2,4,nowhere\nB3,1,household-basic\n"
    plan = plan_community(survey(body), kits=1, jobs=1)
    assert [p.line for p in plan.bad_rows] == [6, 7]
    assert [r.id for r in plan.rows] == ["B3"]


def test_rows_the_engine_cannot_meet_are_flagged_not_dropped():
    body = (
        "id,count,load_list,controller.type,controller.max_pv_voltage_v\n"
        "C1,3,household-basic,,\n"
        "C2,1,household-basic,mppt,15\n"
    )  # no series count fits a 15 V input
    plan = plan_community(survey(body), kits=1, kit_type_cost=0, jobs=1)
    status = {r.id: r.status for r in plan.rows}
    assert status == {"C1": "kit", "C2": "cannot be met"}
    c2 = plan.unmet[0]
    assert c2.failure is not None and c2.failure.code == "string-window"
    assert c2.line == 7
    assert any(n.code == "rows-cannot-be-met" for n in plan.notices)


def test_override_values_are_checked_with_the_line():
    body = (
        "id,count,load_list,choices.autonomy_days,battery.chemistry\n"
        "D1,1,household-basic,two,\n"
        "D2,1,household-basic,,lead\n"
        "D3,1,household-basic,99,\n"  # out of range: found by validate_project
        "D4,1,household-basic,2,\n"
    )
    plan = plan_community(survey(body), kits=1, jobs=1)
    lines = {p.line: p for p in plan.bad_rows}
    assert set(lines) == {6, 7, 8}
    assert "not a number" in lines[6].message
    assert "flooded" in lines[7].message
    assert lines[8].field == "choices.autonomy_days" and "0.5-30" in lines[8].message
    assert [r.id for r in plan.rows] == ["D4"]


def test_quoted_cells_spanning_lines_keep_line_numbers():
    body = (
        "id,name,count,load_list\n"
        'E1,"A name\nover two lines",1,household-basic\n'  # lines 6-7
        "E2,,-1,household-basic\n"
    )  # line 8
    s = survey(body)
    assert s.rows[0].line == 6
    assert s.problems[0].line == 8


@pytest.mark.parametrize(
    ("text", "field", "needle"),
    [
        ("id,count,power\nA,1,3\n", "power", "not a known column"),
        ("id,name\nA,x\n", "count", "required column"),
        ("id,count\nA,1\n", "header", "no demand column"),
        ("id,count,daily_energy_wh\nA,1,100\n", "header", "go together"),
        (
            "id,count,load_list,site.latitude_deg\nA,1,household-basic,3\n",
            "site.latitude_deg",
            "shared",
        ),
        ("id,count,load_list,choices.nothing\nA,1,x\n", "choices.nothing", "not a field"),
    ],
)
def test_unusable_header_stops_with_the_line(text, field, needle):
    with pytest.raises(SurveyError) as err:
        survey(text)
    problem = next(p for p in err.value.problems if p.field == field)
    assert needle in problem.message
    assert problem.line == 5


@pytest.mark.parametrize(
    ("head", "needle"),
    [
        ("colour,blue\n", "settings keys"),
        ("climate,a\nclimate,b\n", "set twice"),
        ("demo,perhaps\n", "yes or no"),
        ("choices.autonomy_days,\n", "no value"),
    ],
)
def test_bad_settings_stop_with_the_line(head, needle):
    with pytest.raises(SurveyError, match=needle):
        read_survey(head + "id,count,load_list\nA,1,household-basic\n")


def test_missing_header_or_rows():
    with pytest.raises(SurveyError, match="header"):
        read_survey("climate,kisanga-ridge-demo\n")
    with pytest.raises(SurveyError, match="no rows"):
        read_survey("id,count,load_list\n")


def test_unknown_climate_and_project_are_fatal():
    text = "climate,nowhere-at-all\nid,count,load_list\nA,1,household-basic\n"
    with pytest.raises(SurveyError, match="nowhere-at-all"):
        plan_community(read_survey(text, base_dir=load_profiles_dir()), kits=1, jobs=1)
    text = "climate,kisanga-ridge-demo\nproject,no-parts\nid,count,load_list\nA,1,household-basic\n"
    with pytest.raises(SurveyError, match="no-parts"):
        plan_community(read_survey(text, base_dir=load_profiles_dir()), kits=1, jobs=1)


def test_field_conversion_follows_the_model_types():
    assert convert_value(field_type("choices.system_voltage"), "auto") == "auto"
    assert convert_value(field_type("choices.system_voltage"), "24") == 24
    assert convert_value(field_type("choices.max_dod"), "0.6") == 0.6
    assert convert_value(field_type("choices.max_dod"), "auto") is None
    assert convert_value(field_type("controller.type"), "MPPT") == "mppt"
    assert convert_value(field_type("choices.derates.soiling"), "0,93") == 0.93
    with pytest.raises(ValueError, match="whole number"):
        convert_value(field_type("module.cells_in_series"), "36.5")
    with pytest.raises(ValueError, match="number or one of"):
        convert_value(field_type("choices.system_voltage"), "high")


def test_count_zero_rows_are_listed_but_not_planned():
    body = "id,count,load_list\nZ1,0,household-basic\nZ2,2,household-basic\n"
    plan = plan_community(survey(body), kits=1, kit_type_cost=0, jobs=1)
    status = {r.id: r.status for r in plan.rows}
    assert status == {"Z1": "not planned", "Z2": "kit"}
    assert plan.systems == 2
