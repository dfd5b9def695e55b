"""Project files: round trip, atomic save with backup, validation with lines and hints."""

from __future__ import annotations

import os

import pytest

from offgrid.paths import demo_project_path
from offgrid.project.store import (
    ProjectFileError,
    dumps_project,
    load_project,
    loads_project,
    save_project,
)
from tests.conftest import hand_project


def test_round_trip_is_exact(tmp_path):
    p = hand_project()
    path = tmp_path / "p.toml"
    save_project(p, path)
    assert load_project(path) == p


def test_demo_project_loads_and_round_trips(tmp_path):
    p = load_project(demo_project_path())
    assert p.info.demo is True
    save_project(p, tmp_path / "d.toml")
    assert load_project(tmp_path / "d.toml") == p


def test_save_keeps_a_backup_and_leaves_no_temp_files(tmp_path):
    path = tmp_path / "p.toml"
    p = hand_project()
    save_project(p, path)
    first = path.read_text()
    p.info.name = "Second"
    save_project(p, path)
    assert (tmp_path / "p.toml.bak").read_text() == first
    assert load_project(path).info.name == "Second"
    assert sorted(os.listdir(tmp_path)) == ["p.toml", "p.toml.bak"]


def test_unknown_tables_are_kept():
    text = dumps_project(hand_project()) + "\n[future_section]\nanswer = 42\n"
    p = loads_project(text)
    assert p.extra == {"future_section": {"answer": 42}}
    assert "[future_section]" in dumps_project(p)


def test_newer_schema_is_refused_clearly():
    text = dumps_project(hand_project()).replace("schema = 2", "schema = 99")
    with pytest.raises(ProjectFileError, match="newer than this offgrid reads"):
        loads_project(text)


def test_wrong_format_name():
    with pytest.raises(ProjectFileError, match="not an offgrid project"):
        loads_project('format = "something-else"\nschema = 1\n')


def test_syntax_error_names_the_line():
    text = dumps_project(hand_project()).replace("latitude_deg = 10.0", "latitude_deg = = 10")
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text)
    line = exc.value.problems[0].line
    assert line is not None and "latitude_deg" in text.splitlines()[line - 1]


def test_out_of_range_value_names_path_line_and_hint():
    text = dumps_project(hand_project()).replace("latitude_deg = 10.0", "latitude_deg = 95.0")
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text)
    (prob,) = exc.value.problems
    assert prob.path == "site.latitude_deg"
    assert "-90 to 90" in prob.message
    assert "latitude_deg = 95.0" in text.splitlines()[prob.line - 1]


def test_every_problem_is_reported_with_its_load_line():
    text = dumps_project(hand_project())
    text = text.replace("hours_per_day = 10.0", "hours_per_day = 30.0")
    text = text.replace("duty_cycle = 1.0", "duty_cycle = 2.0", 1)
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text)
    paths = {p.path for p in exc.value.problems}
    assert {"loads[1].hours_per_day", "loads[1].duty_cycle"} <= paths
    for p in exc.value.problems:
        assert p.line is not None


def test_wrong_type_and_unknown_field():
    project = hand_project()
    project.site.albedo = 0.2
    text = dumps_project(project).replace("albedo = 0.2", 'albedo = "high"\ncolour = 3')
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text)
    paths = {p.path for p in exc.value.problems}
    assert {"site.albedo", "site.colour"} <= paths


def test_module_datasheet_consistency():
    text = dumps_project(hand_project()).replace("vmp_v = 32.5", "vmp_v = 45.0")
    with pytest.raises(ProjectFileError, match="must be below Voc"):
        loads_project(text)


def test_a_file_that_fails_to_load_is_left_untouched(tmp_path):
    path = tmp_path / "bad.toml"
    original = "format = 'offgrid-project'\nschema = 1\n[site]\nlatitude_deg = 'north'\n"
    path.write_text(original)
    with pytest.raises(ProjectFileError):
        load_project(path)
    assert path.read_text() == original
    assert os.listdir(tmp_path) == ["bad.toml"]


def test_missing_file_message():
    with pytest.raises(ProjectFileError, match="does not exist"):
        load_project("/nonexistent/nowhere.toml")


def test_names_with_markup_and_escape_sequences_are_saved_unchanged(tmp_path):
    p = hand_project()
    tricky = 'Fridge [bold]x[/] [link=http://x]y[/link] \x1b[31mred\x1b[0m "q" \\ tab\there'
    p.loads[0].name = tricky
    p.info.name = "[/]\x07bell"
    save_project(p, tmp_path / "t.toml")
    q = load_project(tmp_path / "t.toml")
    assert q.loads[0].name == tricky and q.info.name == "[/]\x07bell"


def test_saved_file_keeps_short_arrays_on_one_line():
    text = dumps_project(hand_project())
    assert "insolation_kwh_m2_day = [5.0, 5.0," in text


@pytest.mark.parametrize(
    ("typed", "value"),
    [
        ("albedo = 0.3", 0.3),
        (
            "albedo = [0.7, 0.7, 0.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4]",
            [0.7, 0.7, 0.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4],
        ),
    ],
)
def test_albedo_one_value_or_twelve_round_trips(typed, value):
    project = hand_project()
    project.site.albedo = 0.2
    text = dumps_project(project).replace("albedo = 0.2", typed)
    loaded = loads_project(text)
    assert loaded.site.albedo == value
    assert loads_project(dumps_project(loaded)).site.albedo == value


@pytest.mark.parametrize(
    ("typed", "path"),
    [
        ("albedo = [0.2, 0.2, 0.2]", "site.albedo"),
        ("albedo = [0.7, 0.7, 1.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4]", "site.albedo[3]"),
        ("albedo = -0.1", "site.albedo"),
    ],
)
def test_bad_albedo_names_the_field(typed, path):
    project = hand_project()
    project.site.albedo = 0.2
    text = dumps_project(project).replace("albedo = 0.2", typed)
    with pytest.raises(ProjectFileError) as exc:
        loads_project(text)
    problem = next(p for p in exc.value.problems if p.path == path)
    assert "ground reflectance" in problem.message and problem.line is not None
