"""Bad input on the command line: one message naming the file, field or line and the fix,
the documented exit code, never a Python traceback (README, "Use")."""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from offgrid.cli import main
from offgrid.paths import climates_dir, load_profiles_dir
from offgrid.project.store import save_project
from tests.conftest import hand_project

KIT = str(load_profiles_dir() / "household-kit.csv")
CLIMATE = "kisanga-ridge-demo"


def run(capsys, *argv) -> tuple[int, str]:
    """Exit code and stderr of ``offgrid ARGV`` run in this process (any exception fails)."""
    try:
        code = main(list(argv))
    except SystemExit as exc:
        code = exc.code
    return code, capsys.readouterr().err


def write(tmp_path: Path, name: str, data: bytes | str) -> str:
    path = tmp_path / name
    path.write_bytes(data.encode() if isinstance(data, str) else data)
    return str(path)


PROJECT_HEAD = 'format = "offgrid-project"\nschema = 1\n'


@pytest.mark.parametrize("body, expected", [
    (PROJECT_HEAD + "[site\nlatitude_deg = 1\n", ["line 3", "not valid TOML"]),
    (PROJECT_HEAD + '[site]\nlatitude_deg = "north"\n[[loads]]\nname = 5\nquantity = 1.5\n',
     ["line 4: site.latitude_deg", "not a number", "loads[1].name", "line 7",
      "whole number"]),
    (PROJECT_HEAD + "[site]\nlatitude_deg = 1e400\n[choices]\nautonomy_days = 1e308\n",
     ["site.latitude_deg: inf is out of range", "-90 to 90", "choices.autonomy_days"]),
    (PROJECT_HEAD + "site = 5\n", ["line 3: site: must be a table"]),
    ("", ["no format line", 'format = "offgrid-project"']),
    ('format = "offgrid-project"\nschema = 99\n', ["schema 99", "newer offgrid"]),
])
def test_bad_project_file_names_line_field_and_fix(tmp_path, capsys, body, expected):
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2
    for text in expected:
        assert text in err, (text, err)


@pytest.mark.parametrize("data, expected", [
    (b"\xff\xfe\x00\x00garbage", "UTF-16"),
    (PROJECT_HEAD.encode() + b"[info]\nname = \"caf\xe9\"\n",
     "not UTF-8 text (byte 0xe9 on line 4)"),
    (bytes(range(256)) * 4, "binary file"),
])
def test_project_file_in_the_wrong_encoding(tmp_path, capsys, data, expected):
    code, err = run(capsys, "size", write(tmp_path, "p.toml", data))
    assert code == 2 and expected in err, err


def test_missing_folder_and_unreadable_project(tmp_path, capsys, monkeypatch):
    code, err = run(capsys, "size", str(tmp_path / "nope.toml"))
    assert code == 2 and "does not exist" in err
    (tmp_path / "dir.toml").mkdir()
    code, err = run(capsys, "simulate", str(tmp_path / "dir.toml"))
    assert code == 2 and "is a folder, not a file" in err
    path = write(tmp_path, "p.toml", PROJECT_HEAD)

    def denied(self):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(Path, "read_bytes", denied)
    code, err = run(capsys, "size", path)
    assert code == 2 and "permission denied" in err


@pytest.mark.parametrize("data, expected", [
    ("name,power_w,hours_per_day\nlamp,x,1\n", "line 2, power_w: 'x' is not a number"),
    ("name,power_w,hours_per_day\nlamp,,1\n", "line 2, power_w: is empty; type the running"),
    ('name,power_w,hours_per_day\n"lamp,5,1\nfan,20,2\n', "line 2, row: a quotation mark"),
    ("name,power_w,hours_per_day\nlamp,1e309,1\n", "line 2, power_w: inf W is outside"),
    ("name,watts,hours_per_day\nlamp,5,1\n", "line 1, watts: unknown column (use watts"),
    (b"name,power_w,hours_per_day\n\xe9clair,5,1\n", "not UTF-8 text (byte 0xe9 on line 2)"),
    ("name,power_w,hours_per_day\n".encode("utf-16"), "UTF-16"),
    ("", "the file is empty"),
])
def test_bad_load_list_names_the_line_and_the_fix(tmp_path, capsys, data, expected):
    code, err = run(capsys, "size", "--loads", write(tmp_path, "l.csv", data), "--climate",
                    CLIMATE)
    assert code == 2 and expected in err, err


def test_load_list_that_is_a_folder_or_missing(tmp_path, capsys):
    code, err = run(capsys, "size", "--loads", str(tmp_path), "--climate", CLIMATE)
    assert code == 2 and "is a folder" in err and "line 0" not in err
    code, err = run(capsys, "size", "--loads", str(tmp_path / "x.csv"), "--climate", CLIMATE)
    assert code == 2 and "does not exist" in err


def test_bad_climate_file_is_bad_input(tmp_path, capsys):
    bad = write(tmp_path, "c.toml", b'format = "offgrid-climate"\nname = "caf\xe9"\n')
    code, err = run(capsys, "size", "--loads", KIT, "--climate", bad)
    assert code == 2 and "not UTF-8" in err
    code, err = run(capsys, "climate", "show", bad)
    assert code == 2 and "not UTF-8" in err
    p = hand_project()
    p.climate.inline = None
    p.climate.ref = bad
    save_project(p, tmp_path / "p.toml")
    code, err = run(capsys, "size", str(tmp_path / "p.toml"))
    assert code == 2 and "climate.ref" in err and "not UTF-8" in err
    code, err = run(capsys, "size", "--loads", KIT, "--climate", str(tmp_path))
    assert code == 2 and "is a folder" in err
    weather = write(tmp_path, "w.toml", b'format = "something-else"\n')
    code, err = run(capsys, "climate", "show", weather)
    assert code == 2 and "offgrid climate import" in err


def test_numbers_out_of_range_on_the_command_line(capsys):
    for flag, value, field in (("--autonomy-days", "nan", "choices.autonomy_days"),
                               ("--autonomy-days", "1e999", "choices.autonomy_days"),
                               ("--max-dod", "-1", "choices.max_dod")):
        code, err = run(capsys, "size", "--loads", KIT, "--climate", CLIMATE, flag, value)
        assert code == 2 and field in err, err
    code, err = run(capsys, "climate", "show", CLIMATE, "--tilt", "nan")
    assert code == 2 and "--tilt" in err and "site.tilt_deg" not in err
    code, err = run(capsys, "climate", "tilt", CLIMATE, "--min-tilt", "500")
    assert code == 2 and "--min-tilt" in err


def test_climate_import_refuses_folders_as_input_and_output(tmp_path, capsys):
    code, err = run(capsys, "climate", "import", str(tmp_path))
    assert code == 2 and "is a folder" in err
    src = climates_dir().parent / "tests" / "data"
    sample = next((p for p in src.glob("*.csv") if p.stat().st_size > 1000), None) \
        if src.is_dir() else None
    monthly = write(tmp_path, "m.csv", "month,insolation_kwh_m2_day,temp_mean_c\n" + "".join(
        f"{m},{4 + m / 10},{20 + m / 10}\n" for m in range(1, 13)) if sample is None else
        sample.read_bytes())
    out = tmp_path / "out.toml"
    out.mkdir()
    code, err = run(capsys, "climate", "import", monthly, "--kind", "monthly-csv", "--out",
                    str(out), "--force")
    assert code == 2 and "is a folder" in err and out.is_dir()
    assert not (tmp_path / "out.toml.bak").exists()  # the folder was not moved aside
    code, err = run(capsys, "climate", "import", monthly, "--kind", "monthly-csv", "--out",
                    str(tmp_path / "no" / "c.toml"))
    assert code == 2 and "does not exist" in err


def test_no_traceback_from_a_subprocess_on_garbage(tmp_path):
    # As a user runs it: a binary file given as the project, the load list and the climate.
    junk = write(tmp_path, "junk.toml", bytes(range(256)) * 8)
    shutil.copy(junk, tmp_path / "junk.csv")
    for argv in (["size", junk], ["simulate", junk, "--no-sweep"],
                 ["size", "--loads", str(tmp_path / "junk.csv"), "--climate", junk],
                 ["climate", "show", junk], ["climate", "import", junk]):
        proc = subprocess.run([sys.executable, "-m", "offgrid", *argv], capture_output=True,
                              text=True, timeout=120)
        assert proc.returncode == 2, (argv, proc.stderr)
        assert "Traceback" not in proc.stderr and proc.stderr.startswith("offgrid: "), argv


def test_json_of_a_quick_design_is_plain_numbers(capsys):
    code = main(["size", "--loads", KIT, "--climate", CLIMATE, "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    assert data["array"]["power_w"] > 0


def test_simulate_takes_a_quick_design(capsys):
    code = main(["simulate", "--loads", KIT, "--climate", CLIMATE, "--years", "2", "--no-sweep",
                 "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    assert data["reliability"]["lolp"] >= 0
    code, err = run(capsys, "simulate", "--demo", "--loads", KIT, "--climate", CLIMATE)
    assert code == 2 and "not both" in err


@pytest.mark.parametrize("line, expected", [
    ("temp_max_c = [nan,20,20,20,20,20,20,20,20,20,20,20]",
     "climate.monthly.temp_max_c[1]: 'nan' is not a number"),
    ("insolation_kwh_m2_day = [5,5,5,5,5,5,5,5,5,5,5,inf]",
     "climate.monthly.insolation_kwh_m2_day[12]: 'inf' is not a number"),
    ("temp_min_c = [25,20,20,20,20,20,20,20,20,20,20,20]",
     "climate.monthly.temp_min_c[1]: 25 C is above the month's mean"),
])
def test_inline_climate_values_are_checked_on_load(tmp_path, capsys, line, expected):
    monthly = {"insolation_kwh_m2_day": "[5,5,5,5,5,5,5,5,5,5,5,5]",
               "temp_mean_c": "[20,20,20,20,20,20,20,20,20,20,20,20]"}
    key = line.split(" = ")[0]
    monthly[key] = line.split(" = ")[1]
    body = (PROJECT_HEAD + "[climate.monthly]\n"
            + "".join(f"{k} = {v}\n" for k, v in monthly.items())
            + '[[loads]]\nname = "lamp"\npower_w = 10\nhours_per_day = 4\n')
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2 and expected in err and "line " in err, err


def test_whole_numbers_that_are_not_finite(tmp_path, capsys):
    body = PROJECT_HEAD + "[module]\ncells_in_series = inf\n[wiring]\ninsulation_temp_c = nan\n"
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2 and "module.cells_in_series: 'inf' must be a whole number" in err
    assert "wiring.insulation_temp_c" in err


def test_design_refuses_a_climate_that_is_not_finite():
    # The engine checks the climate it is given too (the text UI edits it in place).
    from offgrid.project.validate import validate_project
    from offgrid.result import DesignError
    from offgrid.sizing import design

    p = hand_project()
    p.climate.inline.record_low_c = float("nan")
    assert any(pr.path == "climate.record_low_c" for pr in validate_project(p))
    with pytest.raises(DesignError) as exc:
        design(p)
    assert exc.value.field == "climate.record_low_c"
