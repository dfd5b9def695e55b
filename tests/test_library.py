"""The user's own library (climates and load lists in the XDG data folder), ``--version``,
``-`` for standard input/output, and one worked example in each subcommand's ``--help``.

Every test here runs with XDG_DATA_HOME pointed at its own temporary folder (the autouse
fixture in tests/conftest.py), so nothing is written into the real home.
"""

from __future__ import annotations

import io
import json
import shlex
import sys
from importlib.metadata import version
from pathlib import Path

import pytest

from offgrid import paths
from offgrid.cli import COMMANDS, build_parser, main
from offgrid.climate import files

# Twelve invented monthly values (kWh/m2/day, C) for a made-up site; demonstration data.
MONTHLY = [5.1, 5.6, 5.9, 5.7, 5.2, 4.9, 4.8, 5.0, 5.4, 5.5, 5.0, 4.9]


def run(capsys, *args, stdin: str | None = None, monkeypatch=None):
    if stdin is not None:
        assert monkeypatch is not None
        monkeypatch.setattr(sys, "stdin", io.StringIO(stdin))
    try:
        code = main(list(args))
    except SystemExit as exc:
        code = exc.code
    out = capsys.readouterr()
    return code, out.out, out.err


def _monthly_csv(folder: Path, lat: float = -3.2, lon: float = 36.5) -> Path:
    src = folder / "typed-site.csv"
    src.write_text(
        f"# latitude_deg = {lat}\n# longitude_deg = {lon}\n# elevation_m = 1200\n"
        "month,insolation_kwh_m2_day,temp_mean_c\n"
        + "".join(f"{m},{v},21\n" for m, v in enumerate(MONTHLY, start=1))
    )
    return src


# ----------------------------------------------------------------------------- where


def test_user_data_dir_follows_xdg_with_an_override(monkeypatch, tmp_path):
    monkeypatch.delenv("OFFGRID_HOME", raising=False)
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "xdg"))
    assert paths.user_data_dir() == tmp_path / "xdg" / "offgrid"
    assert paths.user_climates_dir() == tmp_path / "xdg" / "offgrid" / "climates"
    assert paths.user_load_profiles_dir() == tmp_path / "xdg" / "offgrid" / "load_profiles"
    # XDG Base Directory Specification 0.8: an empty or relative value is ignored
    for value in ("", "relative/dir"):
        monkeypatch.setenv("XDG_DATA_HOME", value)
        monkeypatch.setenv("HOME", str(tmp_path / "home"))
        assert paths.user_data_dir() == tmp_path / "home" / ".local" / "share" / "offgrid"
    monkeypatch.setenv("OFFGRID_HOME", str(tmp_path / "mine"))
    assert paths.user_data_dir() == tmp_path / "mine"


def test_tests_never_write_into_the_real_home():
    # the autouse fixture in conftest.py points the user's library at a temporary folder
    home = Path.home().resolve()
    assert home not in paths.user_data_dir().resolve().parents


def test_installed_package_data_comes_before_the_checkout(monkeypatch, tmp_path):
    monkeypatch.delenv("OFFGRID_DATA", raising=False)
    assert paths.climates_dir() == paths.CHECKOUT_ROOT / "climates"  # editable checkout
    inside = tmp_path / "bundled"
    (inside / "climates").mkdir(parents=True)
    (inside / "load_profiles").mkdir()
    monkeypatch.setattr(paths, "PACKAGE_DATA", inside)
    assert paths.climates_dir() == inside / "climates"
    assert paths.load_profiles_dir() == inside / "load_profiles"
    monkeypatch.setenv("OFFGRID_DATA", str(tmp_path / "elsewhere"))
    assert paths.climates_dir() == tmp_path / "elsewhere" / "climates"


# ----------------------------------------------------------------------------- version


def test_version_comes_from_the_package_metadata(capsys):
    code, out, _ = run(capsys, "--version")
    assert code == 0
    assert out.strip() == f"offgrid {version('offgrid')}"


# ----------------------------------------------------------------------------- climates


def test_import_writes_into_the_user_library_and_list_marks_it_yours(capsys, tmp_path):
    src = _monthly_csv(tmp_path)
    code, out, err = run(capsys, "climate", "import", str(src), "--name", "Typed Hill")
    assert code == 0, err
    written = paths.user_climates_dir() / "typed-hill.toml"
    assert written.is_file() and f"wrote {written}" in out
    assert not (Path.cwd() / "typed-hill.toml").exists()
    code, out, _ = run(capsys, "climate", "list")
    assert code == 0
    line = next(ln for ln in out.splitlines() if ln.startswith("typed-hill "))
    assert line.rstrip().endswith("yours")
    bundled = next(ln for ln in out.splitlines() if ln.startswith("kisanga-ridge-demo "))
    assert bundled.rstrip().endswith("bundled")
    assert "Typed Hill" in out  # the display name beside the file name
    # the folder is named (a long temporary path may wrap at 80 columns)
    assert str(paths.user_climates_dir()) in "".join(out.split())
    assert max(len(ln) for ln in out.splitlines()) <= 80


def test_a_project_names_a_user_climate(capsys, tmp_path):
    from offgrid.design.sizing import design
    from offgrid.project.store import load_project

    src = _monthly_csv(tmp_path)
    assert run(capsys, "climate", "import", str(src), "--name", "Typed Hill")[0] == 0
    text = (
        paths.demo_project_path()
        .read_text()
        .replace('ref = "kisanga-ridge-demo"', 'ref = "typed-hill"')
    )
    assert 'ref = "typed-hill"' in text
    project_file = tmp_path / "elsewhere" / "p.toml"
    project_file.parent.mkdir()
    project_file.write_text(text)
    result = design(load_project(project_file), project_file.parent)
    assert result.site.poa_kwh_m2_day  # designed from the user's climate
    code, out, err = run(capsys, "size", str(project_file), "--json")
    assert code == 0, err and json.loads(out)
    assert files.resolve_climate("typed-hill") == paths.user_climates_dir() / "typed-hill.toml"


def test_find_climate_by_name_bundled_then_yours(capsys, tmp_path):
    assert (
        files.find_climate("kisanga-ridge-demo") == paths.climates_dir() / "kisanga-ridge-demo.toml"
    )
    assert files.find_climate("typed-hill") is None
    run(capsys, "climate", "import", str(_monthly_csv(tmp_path)), "--name", "Typed Hill")
    entry = files.find_climate_entry("typed-hill")
    assert entry is not None and entry.origin == "yours" and entry.title == "Typed Hill"
    assert files.find_climate("typed-hill.toml") == entry.path
    names = [e.name for e in files.climate_library()]
    assert "typed-hill" in names and "kisanga-ridge-demo" in names
    with pytest.raises(files.ClimateFileError, match="typed-hill"):
        files.resolve_climate("atlantis")  # the message lists the user's climates too


def test_import_refuses_a_bundled_name_in_the_library(capsys, tmp_path):
    code, _, err = run(
        capsys, "climate", "import", str(_monthly_csv(tmp_path)), "--name", "kisanga-ridge-demo"
    )
    assert code == 2 and "bundled" in err and "--name" in err
    assert not (paths.user_climates_dir() / "kisanga-ridge-demo.toml").exists()


def test_import_to_standard_output(capsys, tmp_path):
    code, out, _ = run(
        capsys,
        "climate",
        "import",
        str(_monthly_csv(tmp_path)),
        "--name",
        "Typed Hill",
        "--out",
        "-",
    )
    assert code == 0
    body = out[out.index("# offgrid climate file") :]
    import tomllib

    data = tomllib.loads(body)
    assert (
        data["format"] == "offgrid-climate" and data["monthly"]["insolation_kwh_m2_day"] == MONTHLY
    )
    assert not paths.user_climates_dir().exists()


def test_climate_entries_sorted_by_distance():
    # great-circle distance, spherical Earth of mean radius 6371.0 km (IUGG mean radius, as
    # in Moritz 2000, Geodetic Reference System 1980): a quarter meridian is 10 007.5 km
    assert files.distance_km(0.0, 0.0, 90.0, 0.0) == pytest.approx(10007.5, abs=0.1)
    assert files.distance_km(0.0, 0.0, 0.0, 180.0) == pytest.approx(20015.1, abs=0.1)
    entries = files.climate_library(near=(-3.4, 36.9))  # the demo site
    assert entries[0].name == "kisanga-ridge-demo" and entries[0].distance_km < 1.0
    known = [e.distance_km for e in entries if e.distance_km is not None]
    assert known == sorted(known)


# ----------------------------------------------------------------------------- load lists


def test_user_load_list_added_listed_and_named(capsys, tmp_path, monkeypatch):
    src = tmp_path / "my-shop.csv"
    src.write_text("name,quantity,power_w,hours_per_day,ac_dc\nLight,4,9,5,dc\nFridge,1,60,24,ac\n")
    code, out, err = run(capsys, "loads", "add", str(src))
    assert code == 0, err
    assert (paths.user_load_profiles_dir() / "my-shop.csv").is_file()
    code, out, _ = run(capsys, "loads", "list")
    mine = next(ln for ln in out.splitlines() if ln.startswith("my-shop "))
    assert mine.rstrip().endswith("yours")
    assert any(
        ln.startswith("household-kit ") and ln.rstrip().endswith("bundled")
        for ln in out.splitlines()
    )
    monkeypatch.chdir(tmp_path / "..")  # somewhere the file is not
    code, out, err = run(
        capsys, "size", "--loads", "my-shop", "--climate", "kisanga-ridge-demo", "--json"
    )
    assert code == 0, err
    assert paths.find_load_list("household-kit") == paths.load_profiles_dir() / "household-kit.csv"
    assert paths.find_load_list("my-shop.csv") == paths.user_load_profiles_dir() / "my-shop.csv"


def test_bad_load_list_is_not_added(capsys, tmp_path):
    src = tmp_path / "bad.csv"
    src.write_text("name,power_w,hours_per_day\nLight,abc,5\n")
    code, _, err = run(capsys, "loads", "add", str(src))
    assert code == 2 and "line 2" in err
    assert not (paths.user_load_profiles_dir() / "bad.csv").exists()


# ----------------------------------------------------------------------------- "-"


def test_loads_from_standard_input(capsys, monkeypatch):
    csv_text = (paths.load_profiles_dir() / "household-kit.csv").read_text()
    code, out, err = run(
        capsys,
        "size",
        "--loads",
        "-",
        "--climate",
        "kisanga-ridge-demo",
        "--json",
        stdin=csv_text,
        monkeypatch=monkeypatch,
    )
    assert code == 0, err
    direct = run(
        capsys,
        "size",
        "--loads",
        str(paths.load_profiles_dir() / "household-kit.csv"),
        "--climate",
        "kisanga-ridge-demo",
        "--json",
    )[1]
    assert json.loads(out)["array"] == json.loads(direct)["array"]


def test_project_from_standard_input(capsys, monkeypatch):
    text = paths.demo_project_path().read_text()
    code, out, err = run(capsys, "size", "-", "--json", stdin=text, monkeypatch=monkeypatch)
    assert code == 0, err
    assert json.loads(out) == json.loads(run(capsys, "size", "--demo", "--json")[1])


def test_bom_and_report_to_standard_output(capsys, tmp_path):
    code, out, _ = run(capsys, "bom", "--demo", "-o", "-")
    assert code == 0 and out.splitlines()[0].count(",") >= 2
    assert not Path("-").exists()
    code, out, _ = run(capsys, "report", "--demo", "-o", "-", "--format", "md", "--no-charts")
    assert code == 0 and out.lstrip().startswith("#")
    code, _, err = run(capsys, "report", "--demo", "-o", "-", "--bom", "-")
    assert code == 2 and "standard output" in err


def test_price_template_out_and_back_in_through_pipes(capsys, tmp_path, monkeypatch):
    project = tmp_path / "p.toml"
    project.write_text(paths.demo_project_path().read_text())
    code, template, _ = run(capsys, "prices", str(project), "--template", "-o", "-")
    assert code == 0 and template.startswith("part")
    lines = template.splitlines()
    header = lines[0].split(",")
    first = lines[1].split(",")
    first[header.index("unit_price")] = "123.5"
    filled = "\n".join([lines[0], ",".join(first)]) + "\n"
    code, _, err = run(
        capsys, "prices", str(project), "--import", "-", stdin=filled, monkeypatch=monkeypatch
    )
    assert code == 0, err
    assert "123.5" in project.read_text()


# ----------------------------------------------------------------------------- --help


def _subparsers(parser):
    import argparse

    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            yield from action.choices.items()


def _all_commands():
    for name, sub in _subparsers(build_parser()):
        children = list(_subparsers(sub))
        if children:
            for child_name, child in children:
                yield f"{name} {child_name}", child
        else:
            yield name, sub


@pytest.mark.parametrize("name", [n for n, _ in _all_commands()])
def test_each_subcommand_help_shows_a_worked_example_that_parses(name):
    parser = dict(_all_commands())[name]
    text = parser.format_help()
    assert "Example:" in text, name
    example = text[text.index("Example:") :].splitlines()[1].strip()
    argv = shlex.split(example.split("  #")[0])
    assert argv[0] == "offgrid" and " ".join(argv[1:]).startswith(name), example
    args = build_parser().parse_args(argv[1:])  # the example is valid syntax
    assert getattr(args, "func", None) is not None
    assert max(len(ln) for ln in text.splitlines()) <= 100


def test_every_listed_command_is_covered():
    covered = {n.split()[0] for n, _ in _all_commands()}
    assert covered == set(COMMANDS)


def test_climate_import_from_standard_input(capsys, tmp_path, monkeypatch):
    text = _monthly_csv(tmp_path).read_text()
    code, _, err = run(
        capsys, "climate", "import", "-", "--name", "Piped", stdin=text, monkeypatch=monkeypatch
    )
    assert code == 2 and "--kind" in err
    code, _, err = run(
        capsys,
        "climate",
        "import",
        "-",
        "--kind",
        "monthly-csv",
        "--name",
        "Piped",
        stdin=text,
        monkeypatch=monkeypatch,
    )
    assert code == 0, err
    climate = files.load_climate("piped")
    assert climate.insolation_kwh_m2_day == MONTHLY
    assert "standard input" in climate.source and "standard-input.csv" not in climate.source
