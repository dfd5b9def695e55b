"""Loads own their cables: ``[[loads]] run_m``, project schema 2 and the schema-1 migration.

The checks are of the project format itself (no published value is involved): a load's
one-way DC run length stands on the load, so renaming the load keeps it, and a schema-1
file's ``[wiring.dc_load_runs_m]`` table (load name -> length) is moved onto the loads.
"""

from __future__ import annotations

import pytest

from offgrid.design.sizing import design
from offgrid.project.loads_csv import loads_to_csv, read_loads_csv
from offgrid.project.model import SCHEMA_VERSION, Load
from offgrid.project.store import (
    ProjectFileError,
    dumps_project,
    load_project,
    loads_project,
    save_project,
)
from tests.conftest import hand_project


def _schema_1_text(**runs: float) -> str:
    """The hand project written the schema-1 way: the cable of "DC lights" keyed by its
    name, and an entry naming an appliance no longer in the list."""
    from offgrid.project.store import project_to_dict
    from offgrid.project.toml_out import dumps

    body = project_to_dict(hand_project())
    body["schema"] = 1
    body["wiring"]["dc_load_runs_m"] = runs or {"DC lights": 40.0, "Old radio": 25.0}
    return dumps(body)


def _dc_lights(d):
    return next(w for w in d.electrical.wires if w.run.startswith("DC load"))


def test_schema_is_two():
    assert SCHEMA_VERSION == 2


def test_a_renamed_load_keeps_its_cable():
    p = hand_project()
    p.loads[0].run_m = 40.0
    before = _dc_lights(design(p))
    assert before.length_m == 40.0
    p.loads[0].name = "Lights, DC"
    after = _dc_lights(design(p))
    assert after.length_m == 40.0
    assert after.size == before.size


def test_a_load_without_a_length_takes_the_default():
    p = hand_project()
    p.wiring.dc_load_run_m = 12.5
    assert p.loads[0].run_m is None
    assert _dc_lights(design(p)).length_m == 12.5


def test_each_wire_carries_the_project_path_of_its_length():
    p = hand_project()
    p.loads[0].run_m = 30.0
    wires = {w.key: w for w in design(p).electrical.wires}
    assert wires["array"].length_path == "wiring.array_run_m"
    assert wires["charge"].length_path == "wiring.controller_battery_m"
    assert wires["load1"].length_path == "loads[1].run_m"
    for w in wires.values():  # the path leads to the length the wire was sized for
        from offgrid.tui.session import get_path

        assert get_path(p, w.length_path) == w.length_m


def test_run_length_round_trips_and_absent_stays_absent(tmp_path):
    p = hand_project()
    p.loads[0].run_m = 22.5
    text = dumps_project(p)
    assert f"schema = {SCHEMA_VERSION}" in text
    assert "run_m = 22.5" in text
    assert "dc_load_runs_m" not in text
    again = loads_project(text)
    assert again == p
    assert again.loads[1].run_m is None
    save_project(again, tmp_path / "p.toml")
    assert load_project(tmp_path / "p.toml") == p


def test_run_length_out_of_range_names_the_load_field():
    text = dumps_project(hand_project()).replace(
        'name = "DC lights"', 'name = "DC lights"\nrun_m = 5000.0', 1
    )
    with pytest.raises(ProjectFileError) as err:
        loads_project(text)
    assert [p.path for p in err.value.problems] == ["loads[1].run_m"]
    assert "0.1-1000" in err.value.problems[0].message


def test_schema_1_file_is_migrated_with_a_note_for_the_orphan(tmp_path):
    text = _schema_1_text()
    assert "schema = 1" in text and '"Old radio" = 25.0' in text
    path = tmp_path / "old.toml"
    path.write_text(text)
    notes: list[str] = []
    p = load_project(path, notes=notes)
    assert p.loads[0].name == "DC lights" and p.loads[0].run_m == 40.0
    assert p.loads[1].run_m is None
    assert _dc_lights(design(p)).length_m == 40.0
    orphan = [n for n in notes if "Old radio" in n]
    assert len(orphan) == 1 and "25" in orphan[0] and "dropped" in orphan[0]
    assert any("schema 2" in n for n in notes)
    save_project(p, path)
    saved = path.read_text()
    assert f"schema = {SCHEMA_VERSION}" in saved
    assert "dc_load_runs_m" not in saved and "Old radio" not in saved
    again_notes: list[str] = []
    assert load_project(path, notes=again_notes) == p
    assert again_notes == []


def test_schema_1_migration_applies_to_every_load_of_that_name():
    p = hand_project()
    p.loads.append(Load("DC lights", 2, 20.0, 3.0, "dc"))
    from offgrid.project.store import project_to_dict
    from offgrid.project.toml_out import dumps

    body = project_to_dict(p)
    body["schema"] = 1
    body["wiring"]["dc_load_runs_m"] = {"DC lights": 33.0}
    text = dumps(body)
    notes: list[str] = []
    migrated = loads_project(text, notes=notes)
    assert [ld.run_m for ld in migrated.loads] == [33.0, None, 33.0]
    assert not any("dropped" in n for n in notes)


def test_schema_1_bad_length_is_reported_on_the_load():
    text = _schema_1_text(**{"DC lights": -3.0})
    with pytest.raises(ProjectFileError) as err:
        loads_project(text)
    assert [p.path for p in err.value.problems] == ["loads[1].run_m"]


def test_schema_2_file_with_the_old_table_is_refused_with_a_hint():
    text = dumps_project(hand_project()) + '\n[wiring.dc_load_runs_m]\n"DC lights" = 40.0\n'
    with pytest.raises(ProjectFileError) as err:
        loads_project(text)
    problem = err.value.problems[0]
    assert problem.path == "wiring.dc_load_runs_m"
    assert "run_m" in problem.message


def test_newer_schema_is_still_refused():
    text = dumps_project(hand_project()).replace(
        f"schema = {SCHEMA_VERSION}", f"schema = {SCHEMA_VERSION + 1}"
    )
    with pytest.raises(ProjectFileError, match="newer than this offgrid reads"):
        loads_project(text)


def test_load_list_csv_carries_the_run_length():
    loads = [Load("A", 1, 10.0, 2.0, "dc", run_m=18.5), Load("B", 1, 100.0, 1.0, "ac")]
    text = loads_to_csv(loads)
    assert text.splitlines()[0].endswith(",run_m")
    assert read_loads_csv(text) == loads
    assert read_loads_csv("name,power_w,hours_per_day\nX,5,1\n")[0].run_m is None
    with pytest.raises(ValueError, match="run_m"):
        read_loads_csv("name,power_w,hours_per_day,run_m\nX,5,1,0\n")


def test_the_migration_note_reaches_the_text_ui_session_and_the_command_line(tmp_path):
    from offgrid.tui.session import Session
    from tests.cli_support import run_cli

    path = tmp_path / "old.toml"
    path.write_text(_schema_1_text())
    session = Session.open(path)
    assert any("Old radio" in n for n in session.notes)
    assert session.project.loads[0].run_m == 40.0
    proc = run_cli("size", str(path))  # main() in this process
    assert proc.returncode == 0, proc.stderr
    assert "offgrid: note:" in proc.stderr and "Old radio" in proc.stderr
    assert path.read_text() == _schema_1_text()  # reading never rewrites the file


def test_a_bad_schema_1_length_says_where_it_came_from():
    text = _schema_1_text(**{"DC lights": "far"})
    with pytest.raises(ProjectFileError) as err:
        loads_project(text)
    (problem,) = err.value.problems
    assert problem.path == "loads[1].run_m"
    assert "not a number" in problem.message and "wiring.dc_load_runs_m" in problem.message
