"""``offgrid climate``: list, show, check, import, tilt (run in-process, as a user would)."""

from __future__ import annotations

import subprocess
import sys

import pytest

try:
    from climate_support import TMY3_GREENSBORO, pvlib_data
except ImportError:  # run as a package
    from tests.climate_support import TMY3_GREENSBORO, pvlib_data

from offgrid.cli import main
from offgrid.climate.files import load_climate


def run(capsys, *args):
    try:
        code = main(list(args))
    except SystemExit as exc:
        code = exc.code
    out = capsys.readouterr()
    return code, out.out, out.err


def _fits(text: str) -> bool:
    return max((len(line) for line in text.splitlines()), default=0) <= 80


def test_list_names_every_bundled_climate_and_marks_demos(capsys):
    code, out, _ = run(capsys, "climate", "list")
    assert code == 0
    for name in (
        "greensboro-nc-tmy3",
        "sand-point-ak-tmy3",
        "miami-fl-tmy2",
        "dalli-wells-demo",
        "pampa-alta-demo",
        "tarn-station-demo",
        "myrvik-cabin-demo",
    ):
        assert name in out
    assert "demo" in out and "hourly year" in out and _fits(out)


def test_list_does_not_import_pvlib():
    # `offgrid climate list` must stay quick: pvlib costs ~0.7 s to import (LIBRARY-NOTES).
    code = (
        "import sys; from offgrid.cli import main; main(['climate', 'list']); "
        "assert 'pvlib' not in sys.modules, 'pvlib imported'"
    )
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert proc.returncode == 0, proc.stderr


def test_show_prints_the_table_checks_and_tilt(capsys):
    code, out, _ = run(capsys, "climate", "show", "greensboro-nc-tmy3")
    assert code == 0
    assert "GHI" in out and "POA" in out and "KT" in out and "T min" in out
    assert "best annual tilt" in out and "Checks" in out and "pvlib" in out
    assert _fits(out)


def test_show_demo_says_demonstration_data(capsys):
    code, out, _ = run(
        capsys, "climate", "show", "dalli-wells-demo", "--tilt", "20", "--horizon", "90:10 270:8"
    )
    assert code == 0
    assert "demonstration data" in out and "lost" in out and _fits(out)


def test_show_unknown_climate(capsys):
    code, _, err = run(capsys, "climate", "show", "atlantis")
    assert code == 2 and "not found" in err and "greensboro-nc-tmy3" in err


def test_show_bad_horizon_names_the_point(capsys):
    code, _, err = run(capsys, "climate", "show", "dalli-wells-demo", "--horizon", "90:120")
    assert code == 2 and "point 1: elevation 120 deg" in err


def test_check_values_in_mj_suggests_the_fix(capsys):
    mj = "8.7 11.0 15.3 19.5 20.3 22.5 21.9 20.2 15.9 12.9 8.8 8.1"
    code, out, _ = run(
        capsys, "climate", "check", "--values", mj, "--lat", "36.1", "--lon", "-79.95"
    )
    assert code == 1
    assert "unit-slip" in out and "divide by 3.6" in out and _fits(out)
    code, out, _ = run(
        capsys,
        "climate",
        "check",
        "--values",
        mj,
        "--unit",
        "MJ/m2/day",
        "--lat",
        "36.1",
        "--lon",
        "-79.95",
    )
    assert code == 0 and "nothing to report" in out


def test_check_needs_latitude(capsys):
    code, _, err = run(capsys, "climate", "check", "--values", "5 " * 12)
    assert code == 2 and "--lat" in err


def test_import_tmy3_writes_a_climate_file(capsys, tmp_path):
    out_path = tmp_path / "gso.toml"
    code, out, _ = run(
        capsys,
        "climate",
        "import",
        str(pvlib_data() / TMY3_GREENSBORO),
        "--name",
        "Greensboro test",
        "--out",
        str(out_path),
    )
    assert code == 0 and f"wrote {out_path}" in out
    climate = load_climate(str(out_path))
    assert climate.daily is not None and climate.latitude_deg == 36.1
    assert "TMY3 file 723170TYA.CSV" in climate.source
    # no overwrite without --force
    code, _, err = run(
        capsys, "climate", "import", str(pvlib_data() / TMY3_GREENSBORO), "--out", str(out_path)
    )
    assert code == 2 and "--force" in err


def test_import_monthly_csv_with_unit_slip_needs_fix(capsys, tmp_path):
    src = tmp_path / "typed.csv"
    mj = [8.7, 11.0, 15.3, 19.5, 20.3, 22.5, 21.9, 20.2, 15.9, 12.9, 8.8, 8.1]
    src.write_text(
        "# latitude_deg = 36.1\n# longitude_deg = -79.95\n# elevation_m = 273\n"
        "month,insolation_kwh_m2_day,temp_mean_c\n"
        + "".join(f"{m},{v},12\n" for m, v in enumerate(mj, start=1))
    )
    out_path = tmp_path / "typed.toml"
    code, _, err = run(capsys, "climate", "import", str(src), "--out", str(out_path))
    assert code == 1 and "--fix" in err and not out_path.exists()
    code, out, _ = run(capsys, "climate", "import", str(src), "--out", str(out_path), "--fix")
    assert code == 0 and "applied: MJ/m2/day" in out
    climate = load_climate(str(out_path))
    assert climate.insolation_kwh_m2_day[0] == pytest.approx(8.7 / 3.6, abs=1e-3)
    assert "unit corrected on import" in climate.source


def test_import_bad_file_names_the_line(capsys, tmp_path):
    lines = (pvlib_data() / TMY3_GREENSBORO).read_text().splitlines()
    parts = lines[20].split(",")
    parts[4] = "abc"
    lines[20] = ",".join(parts)
    bad = tmp_path / "bad.csv"
    bad.write_text("\n".join(lines) + "\n")
    code, _, err = run(capsys, "climate", "import", str(bad))
    assert code == 2 and "line 21: GHI 'abc' is not a number" in err


def test_tilt_with_demand(capsys):
    demand = "900 900 900 900 900 900 900 900 900 900 900 900"
    code, out, _ = run(
        capsys, "climate", "tilt", "tarn-station-demo", "--demand", demand, "--min-tilt", "15"
    )
    assert code == 0 and "azimuth 0" in out and _fits(out)
    assert "least sun on the array for its demand" in " ".join(out.split())
    code, _, err = run(capsys, "climate", "tilt", "tarn-station-demo", "--demand", "1 2 3")
    assert code == 2 and "give 12 values" in err


def test_check_flags_the_low_sun_month_and_not_a_sahel_january(capsys):
    # 64 N, December 0.1 kWh/m2/day on a 60-degree plane: multiplied about sixteen-fold
    # by the monthly method (tests/test_sky_albedo.py).
    code, out, _ = run(
        capsys,
        "climate",
        "check",
        "--values",
        "0.3 1.0 2.4 4.0 5.0 5.5 5.0 3.8 2.2 1.0 0.3 0.1",
        "--lat",
        "64",
        "--tilt",
        "60",
    )
    assert "[low-sun-transposition] sunshine on the horizontal in Dec" in out and _fits(out)
    # a dry-season January of 5.6 at 12 N is ordinary (once flagged against 5.09)
    code, out, _ = run(
        capsys,
        "climate",
        "check",
        "--values",
        "5.6 6.2 6.6 6.6 6.4 6.0 5.5 5.3 5.7 6.0 5.9 5.5",
        "--lat",
        "12.4",
        "--lon",
        "-1.5",
        "--elevation",
        "300",
    )
    assert code == 0 and "nothing to report" in out


def test_show_takes_twelve_reflectances_and_refuses_eleven(capsys):
    snow = "0.7 0.7 0.4 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.2 0.4"
    code, out, _ = run(
        capsys, "climate", "show", "greensboro-nc-tmy3", "--tilt", "60", "--albedo", snow
    )
    assert code == 0 and "POA" in out
    code, _, err = run(
        capsys, "climate", "show", "greensboro-nc-tmy3", "--albedo", " ".join(["0.2"] * 11)
    )
    assert code == 2 and "--albedo" in err and "twelve" in err
