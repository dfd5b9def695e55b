"""Bad input on the command line: one message naming the file, field or line and the fix,
the documented exit code, never a Python traceback (README, "Use")."""

from __future__ import annotations

import json
import os
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


@pytest.mark.parametrize(
    "body, expected",
    [
        (PROJECT_HEAD + "[site\nlatitude_deg = 1\n", ["line 3", "not valid TOML"]),
        (
            PROJECT_HEAD + '[site]\nlatitude_deg = "north"\n[[loads]]\nname = 5\nquantity = 1.5\n',
            [
                "line 4: site.latitude_deg",
                "not a number",
                "loads[1].name",
                "line 7",
                "whole number",
            ],
        ),
        (
            PROJECT_HEAD + "[site]\nlatitude_deg = 1e400\n[choices]\nautonomy_days = 1e308\n",
            ["site.latitude_deg: 'inf' is not a finite number", "-90 to 90"],
        ),
        (PROJECT_HEAD + "[choices]\nautonomy_days = 1e308\n", ["choices.autonomy_days", "0.5-30"]),
        (PROJECT_HEAD + "site = 5\n", ["line 3: site: must be a table"]),
        ("", ["no format line", 'format = "offgrid-project"']),
        ('format = "offgrid-project"\nschema = 99\n', ["schema 99", "newer offgrid"]),
    ],
)
def test_bad_project_file_names_line_field_and_fix(tmp_path, capsys, body, expected):
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2
    for text in expected:
        assert text in err, (text, err)


@pytest.mark.parametrize(
    "data, expected",
    [
        (b"\xff\xfe\x00\x00garbage", "UTF-16"),
        (
            PROJECT_HEAD.encode() + b'[info]\nname = "caf\xe9"\n',
            "not UTF-8 text (byte 0xe9 on line 4)",
        ),
        (bytes(range(256)) * 4, "binary file"),
    ],
)
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

    real_open = os.open

    def denied(name, *args, **kwargs):
        if str(name) == path:
            raise PermissionError(13, "Permission denied")
        return real_open(name, *args, **kwargs)

    monkeypatch.setattr(os, "open", denied)
    code, err = run(capsys, "size", path)
    assert code == 2 and "permission denied" in err


@pytest.mark.parametrize(
    "data, expected",
    [
        ("name,power_w,hours_per_day\nlamp,x,1\n", "line 2, power_w: 'x' is not a number"),
        ("name,power_w,hours_per_day\nlamp,,1\n", "line 2, power_w: is empty; type the running"),
        ('name,power_w,hours_per_day\n"lamp,5,1\nfan,20,2\n', "line 2, row: a quotation mark"),
        ("name,power_w,hours_per_day\nlamp,1e309,1\n", "line 2, power_w: '1e309' is not a finite"),
        ("name,watts,hours_per_day\nlamp,5,1\n", "line 1, watts: unknown column (use watts"),
        (b"name,power_w,hours_per_day\n\xe9clair,5,1\n", "not UTF-8 text (byte 0xe9 on line 2)"),
        ("name,power_w,hours_per_day\n".encode("utf-16"), "UTF-16"),
        ("", "the file is empty"),
    ],
)
def test_bad_load_list_names_the_line_and_the_fix(tmp_path, capsys, data, expected):
    code, err = run(capsys, "size", "--loads", write(tmp_path, "l.csv", data), "--climate", CLIMATE)
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
    for flag, value, field in (
        ("--autonomy-days", "nan", "--autonomy-days: 'nan' is not a finite number"),
        ("--autonomy-days", "1e999", "--autonomy-days: '1e999'"),
        ("--autonomy-days", "40", "choices.autonomy_days"),
        ("--max-dod", "-1", "choices.max_dod"),
    ):
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
    sample = (
        next((p for p in src.glob("*.csv") if p.stat().st_size > 1000), None)
        if src.is_dir()
        else None
    )
    monthly = write(
        tmp_path,
        "m.csv",
        "month,insolation_kwh_m2_day,temp_mean_c\n"
        + "".join(f"{m},{4 + m / 10},{20 + m / 10}\n" for m in range(1, 13))
        if sample is None
        else sample.read_bytes(),
    )
    out = tmp_path / "out.toml"
    out.mkdir()
    code, err = run(
        capsys, "climate", "import", monthly, "--kind", "monthly-csv", "--out", str(out), "--force"
    )
    assert code == 2 and "is a folder" in err and out.is_dir()
    assert not (tmp_path / "out.toml.bak").exists()  # the folder was not moved aside
    code, err = run(
        capsys,
        "climate",
        "import",
        monthly,
        "--kind",
        "monthly-csv",
        "--out",
        str(tmp_path / "no" / "c.toml"),
    )
    assert code == 2 and "does not exist" in err


def test_no_traceback_from_a_subprocess_on_garbage(tmp_path):
    # As a user runs it: a binary file given as the project, the load list and the climate.
    junk = write(tmp_path, "junk.toml", bytes(range(256)) * 8)
    shutil.copy(junk, tmp_path / "junk.csv")
    for argv in (
        ["size", junk],
        ["simulate", junk, "--no-sweep"],
        ["size", "--loads", str(tmp_path / "junk.csv"), "--climate", junk],
        ["climate", "show", junk],
        ["climate", "import", junk],
    ):
        proc = subprocess.run(
            [sys.executable, "-m", "offgrid", *argv], capture_output=True, text=True, timeout=120
        )
        assert proc.returncode == 2, (argv, proc.stderr)
        assert "Traceback" not in proc.stderr and proc.stderr.startswith("offgrid: "), argv


def test_json_of_a_quick_design_is_plain_numbers(capsys):
    code = main(["size", "--loads", KIT, "--climate", CLIMATE, "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    assert data["array"]["power_w"] > 0


def test_simulate_takes_a_quick_design(capsys):
    code = main(
        ["simulate", "--loads", KIT, "--climate", CLIMATE, "--years", "2", "--no-sweep", "--json"]
    )
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    assert data["reliability"]["lolp"] >= 0
    code, err = run(capsys, "simulate", "--demo", "--loads", KIT, "--climate", CLIMATE)
    assert code == 2 and "not both" in err


@pytest.mark.parametrize(
    "line, expected",
    [
        (
            "temp_max_c = [nan,20,20,20,20,20,20,20,20,20,20,20]",
            "climate.monthly.temp_max_c[1]: 'nan' is not a finite number",
        ),
        (
            "insolation_kwh_m2_day = [5,5,5,5,5,5,5,5,5,5,5,inf]",
            "climate.monthly.insolation_kwh_m2_day[12]: 'inf' is not a finite number",
        ),
        (
            "temp_min_c = [25,20,20,20,20,20,20,20,20,20,20,20]",
            "climate.monthly.temp_min_c[1]: 25 C is above the month's mean",
        ),
    ],
)
def test_inline_climate_values_are_checked_on_load(tmp_path, capsys, line, expected):
    monthly = {
        "insolation_kwh_m2_day": "[5,5,5,5,5,5,5,5,5,5,5,5]",
        "temp_mean_c": "[20,20,20,20,20,20,20,20,20,20,20,20]",
    }
    key = line.split(" = ")[0]
    monthly[key] = line.split(" = ")[1]
    body = (
        PROJECT_HEAD
        + "[climate.monthly]\n"
        + "".join(f"{k} = {v}\n" for k, v in monthly.items())
        + '[[loads]]\nname = "lamp"\npower_w = 10\nhours_per_day = 4\n'
    )
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2 and expected in err and "line " in err, err


def test_whole_numbers_that_are_not_finite(tmp_path, capsys):
    body = PROJECT_HEAD + "[module]\ncells_in_series = inf\n[wiring]\ninsulation_temp_c = nan\n"
    code, err = run(capsys, "size", write(tmp_path, "p.toml", body))
    assert code == 2 and "module.cells_in_series: 'inf' must be a whole number" in err
    assert "wiring.insulation_temp_c" in err


def test_design_refuses_a_climate_that_is_not_finite():
    # The engine checks the climate it is given too (the text UI edits it in place).
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design
    from offgrid.project.validate import validate_project

    p = hand_project()
    p.climate.inline.record_low_c = float("nan")
    assert any(pr.path == "climate.record_low_c" for pr in validate_project(p))
    with pytest.raises(DesignError) as exc:
        design(p)
    assert exc.value.field == "climate.record_low_c"


# ----------------------------------------------------------------- hostile input (issue 12)


def _demo_text() -> str:
    from offgrid.paths import demo_project_path

    return demo_project_path().read_text(encoding="utf-8")


@pytest.mark.parametrize(
    "old, new, expected",
    [
        ("surge_w = 0.0", "surge_w = nan", ["loads[1].surge_w", "line 79", "not a finite number"]),
        ("surge_w = 0.0", "surge_w = inf", ["loads[1].surge_w", "not a finite number"]),
        ('months = "1-12"', "months = 6", ["loads[1].months", "line 80", "1-12"]),
        ('months = "1-12"', "months = true", ["loads[1].months", "line 80", "1-12"]),
        ('months = "1-12"', "months = [1, true, 3.5]", ["loads[1].months", "1-12"]),
        ("quantity = 1\n", "quantity = 1e400\n", ["loads[1].quantity", "whole number"]),
        ("quantity = 1\n", f"quantity = {10**400}\n", ["loads[1].quantity"]),
        ("surge_w = 0.0", f"surge_w = {10**400}", ["loads[1].surge_w", "not a finite number"]),
    ],
)
def test_project_values_that_used_to_slip_through(tmp_path, capsys, old, new, expected):
    """NaN, infinity and wrong types in a project: exit 2 with field, line and fix."""
    text = _demo_text()
    assert old in text
    code, err = run(capsys, "size", write(tmp_path, "p.toml", text.replace(old, new, 1)))
    assert code == 2, err
    assert "Traceback" not in err
    for part in expected:
        assert part in err, (part, err)


def test_toml_nested_a_thousand_deep_is_a_clear_error(tmp_path, capsys):
    for body in (
        PROJECT_HEAD + "x = " + "[" * 1000 + "]" * 1000 + "\n",
        PROJECT_HEAD + "x = " + "{a = " * 1000 + "1" + "}" * 1000 + "\n",
        PROJECT_HEAD + "[" + ".".join(["a"] * 1000) + "]\nb = 1\n",
    ):
        code, err = run(capsys, "size", write(tmp_path, "deep.toml", body))
        assert code == 2, err
        assert "nested" in err and "Traceback" not in err, err


@pytest.mark.parametrize(
    "cell, expected",
    [
        ("nan", "not a finite number"),
        ("inf", "not a finite number"),
        ("1e400", "not a finite number"),
        ("-Infinity", "not a finite number"),
    ],
)
def test_load_csv_quantity_and_surge_not_finite(tmp_path, capsys, cell, expected):
    for column in ("quantity", "surge_w", "power_w"):
        cells = {"quantity": "1", "surge_w": "0", "power_w": "60"} | {column: cell}
        csv_text = (
            "name,quantity,power_w,hours_per_day,surge_w\n"
            f"Pump,{cells['quantity']},{cells['power_w']},2,{cells['surge_w']}\n"
        )
        code, err = run(
            capsys, "size", "--loads", write(tmp_path, "l.csv", csv_text), "--climate", CLIMATE
        )
        assert code == 2, err
        assert f"line 2, {column}" in err and expected in err, err


@pytest.mark.parametrize("cell", ["1,500", "1.500,5", "2,000,000", "1.5,0"])
def test_load_csv_comma_that_cannot_be_read_without_doubt(tmp_path, capsys, cell):
    csv_text = f'name,quantity,power_w,hours_per_day\nLamp,1,"{cell}",2\n'
    code, err = run(
        capsys, "size", "--loads", write(tmp_path, "l.csv", csv_text), "--climate", CLIMATE
    )
    assert code == 2, err
    assert "line 2, power_w" in err and "write 1500 or 1.5" in err, err


def test_the_same_number_reader_everywhere():
    """'1,500' is refused by every reader of numbers; '0,5' is a decimal comma in all."""
    from offgrid.economics.prices import PriceListError, read_price_csv
    from offgrid.plan.prices import read_prices_csv
    from offgrid.plan.survey import convert_value
    from offgrid.project.loads_csv import LoadListError, read_loads_csv
    from offgrid.tui.fields import parse_number

    for reader in (parse_number, lambda t: convert_value(float, t)):
        assert reader("0,5") == 0.5
        with pytest.raises(ValueError, match=r"write 1500 or 1\.5"):
            reader("1,500")
    assert read_loads_csv('name,power_w,hours_per_day\nA,"0,5",1\n')[0].power_w == 0.5
    with pytest.raises(LoadListError, match=r"write 1500 or 1\.5"):
        read_loads_csv('name,power_w,hours_per_day\nA,"1,500",1\n')
    assert read_price_csv('part,unit_price\nmodule,"0,5"\n')[0].unit_price == 0.5
    with pytest.raises(PriceListError, match=r"write 1500 or 1\.5"):
        read_price_csv('part,unit_price\nmodule,"1,500"\n')
    plan_head = "item,basis,unit_price,currency\n"
    assert read_prices_csv(plan_head + 'module,per_w,"0,5",USD\n').entries["module"][1] == 0.5
    with pytest.raises(PriceListError, match=r"write 1500 or 1\.5"):
        read_prices_csv(plan_head + 'module,per_w,"1,500",USD\n')


@pytest.mark.parametrize("price", ["1e308", "nan", "inf", "1e400"])
def test_price_too_large_or_not_finite_is_refused_with_its_range(tmp_path, capsys, price):
    text = _demo_text() + f'\n[[prices]]\npart = "module"\nunit_price = {price}\n'
    code, err = run(capsys, "variants", write(tmp_path, "p.toml", text), "--json")
    assert code == 2, err
    assert "].unit_price" in err and "Traceback" not in err, err
    from offgrid.economics.prices import PriceListError, read_price_csv
    from offgrid.plan.prices import read_prices_csv

    with pytest.raises(PriceListError, match=r"1,000,000,000|not a finite"):
        read_price_csv(f"part,unit_price\nmodule,{price}\n")
    with pytest.raises(PriceListError, match=r"1,000,000,000|not a finite"):
        read_prices_csv(f"item,basis,unit_price,currency\nmodule,per_w,{price},USD\n")


def test_variants_json_is_strict_json(capsys):
    code = main(["variants", "--demo", "--json"])
    out = capsys.readouterr().out
    assert code == 0
    json.loads(out, parse_constant=lambda c: pytest.fail(f"non-finite {c} in JSON"))


@pytest.mark.parametrize("flag", ["--autonomy-days", "--max-dod"])
@pytest.mark.parametrize("value", ["nan", "inf"])
def test_command_line_numbers_not_finite(capsys, flag, value):
    code, err = run(capsys, "size", "--loads", KIT, "--climate", CLIMATE, flag, value)
    assert code == 2 and "finite" in err, err


# ----------------------------------------------------------------- files that are not files


@pytest.mark.parametrize("kind", ["fifo", "dev-zero"])
def test_fifo_or_device_is_refused_not_read(tmp_path, kind):
    """A FIFO or /dev/zero given as a file: exit 2 at once, never a hang."""
    if kind == "fifo":
        path = tmp_path / "p.toml"
        os.mkfifo(path)
    else:
        path = Path("/dev/zero")
    for argv in (
        ["size", str(path)],
        ["size", "--loads", str(path), "--climate", CLIMATE],
        ["plan", str(path)],
        ["climate", "show", str(path)],
    ):
        proc = subprocess.run(
            [sys.executable, "-m", "offgrid", *argv], capture_output=True, text=True, timeout=20
        )
        assert proc.returncode == 2, (argv, proc.stderr)
        assert "not a regular file" in proc.stderr and "Traceback" not in proc.stderr


def test_reader_never_blocks_on_a_fifo(tmp_path):
    from offgrid.textfile import TextFileError, read_text

    os.mkfifo(tmp_path / "f")
    with pytest.raises(TextFileError, match="not a regular file"):
        read_text(tmp_path / "f")
    with pytest.raises(TextFileError, match="not a regular file"):
        read_text("/dev/zero")


def test_load_list_longer_than_the_limit_is_refused_while_reading(tmp_path, capsys):
    import time

    from offgrid.project.loads_csv import MAX_LOADS

    rows = "".join(f"L{i},1,10,1\n" for i in range(200_000))
    path = write(tmp_path, "big.csv", "name,quantity,power_w,hours_per_day\n" + rows)
    start = time.perf_counter()
    code, err = run(capsys, "size", "--loads", path, "--climate", CLIMATE)
    took = time.perf_counter() - start
    assert code == 2 and f"more than {MAX_LOADS:,} loads" in err, err
    assert f"line {MAX_LOADS + 2}" in err
    assert took < 3, took  # common practice, no source: refused at once, not after parsing
    project = _demo_text() + "".join(
        f'\n[[loads]]\nname = "L{i}"\npower_w = 1.0\nhours_per_day = 1.0\n'
        for i in range(MAX_LOADS + 1)
    )
    code, err = run(capsys, "size", write(tmp_path, "many.toml", project))
    assert code == 2 and f"more than {MAX_LOADS:,} loads" in err, err


def test_text_ui_open_and_csv_import_refuse_instead_of_crashing(tmp_path):
    """The UI opens projects with Session.open and imports load lists with load_loads_csv:
    a wrong type or a non-finite quantity is a message, not a crash."""
    from offgrid.project.loads_csv import LoadListError, load_loads_csv
    from offgrid.project.store import ProjectFileError
    from offgrid.tui.fields import parse_number
    from offgrid.tui.session import Session

    for bad in ("months = 6", "months = true"):
        path = write(tmp_path, "p.toml", _demo_text().replace('months = "1-12"', bad, 1))
        with pytest.raises(ProjectFileError, match=r"loads\[1\]\.months"):
            Session.open(path)
    for cell in ("nan", "inf", "1e400"):
        path = write(tmp_path, "l.csv", f"name,quantity,power_w,hours_per_day\nA,{cell},5,1\n")
        with pytest.raises(LoadListError, match="line 2, quantity"):
            load_loads_csv(path)
        with pytest.raises(ValueError, match="finite"):
            parse_number(cell, "W")


def test_project_file_too_large_to_parse_quickly_is_refused(tmp_path, capsys):
    """A 3 MB array in a project took tomllib ~6 s (and 18 MB ~50 s, 780 MB) before the
    design even started: project files are read up to MAX_PROJECT_BYTES."""
    from offgrid.project.store import MAX_PROJECT_BYTES

    body = PROJECT_HEAD + "x = [" + "1," * (MAX_PROJECT_BYTES // 2) + "]\n"
    code, err = run(capsys, "size", write(tmp_path, "big.toml", body))
    assert code == 2 and "far larger than this kind of file" in err, err


def test_survey_longer_than_the_limit_is_refused_while_reading(tmp_path, capsys):
    """200,000 rows took 15 s and 330 MB to plan: refused at MAX_ROWS instead."""
    import time

    from offgrid.plan.survey import MAX_ROWS

    head = (
        "community,x\nclimate,kisanga-ridge-demo\nid,name,kind,count,daily_energy_wh,peak_power_w\n"
    )
    rows = "".join(f"H{i},h,household,1,150,35\n" for i in range(50_000))
    start = time.perf_counter()
    code, err = run(capsys, "plan", write(tmp_path, "s.csv", head + rows), "--jobs", "1")
    assert code == 2 and f"more than {MAX_ROWS:,} rows" in err, err
    assert time.perf_counter() - start < 5  # common practice, no source


def test_standard_input_is_read_with_a_bound(tmp_path):
    # `offgrid size - < /dev/zero` must stop at the size bound, not read forever (issue 12).
    import subprocess
    import sys

    with open("/dev/zero", "rb") as zero:
        done = subprocess.run(
            [sys.executable, "-m", "offgrid", "size", "-"],
            stdin=zero,
            capture_output=True,
            text=True,
            timeout=60,
        )
    assert done.returncode == 2
    assert "standard input is longer than" in done.stderr
