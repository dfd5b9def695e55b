"""The built package carries its data: sdist -> wheel -> a fresh virtual environment, run from a
folder outside the checkout, as a user who installed offgrid would run it.

The build goes through setuptools' PEP 517 hooks (what ``python -m build`` and ``pip install .``
call), offline: ``--no-build-isolation`` in effect, with the setuptools of the test
environment. The fresh environment sees the test environment's dependencies through a .pth
line (numpy, pvlib, Textual: nothing downloaded), but offgrid itself only from the wheel.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import sysconfig
import tarfile
import zipfile
from pathlib import Path

import pytest

CHECKOUT = Path(__file__).resolve().parents[1]
#: What a build never needs (and a copy should not carry).
JUNK = shutil.ignore_patterns(
    ".git",
    ".venv*",
    "build",
    "dist",
    "*.egg-info",
    "__pycache__",
    ".pytest_cache",
    ".ruff_cache",
    "snapshot_report.html",
    "*.bak",
)

pytestmark = pytest.mark.slow


def _backend(hook: str, src: Path, out: Path) -> Path:
    """Call setuptools' PEP 517 ``hook`` in ``src``; the file it made in ``out``."""
    out.mkdir(exist_ok=True)
    code = f"from setuptools import build_meta as b; print(b.{hook}({str(out)!r}))"
    proc = subprocess.run(
        [sys.executable, "-c", code], cwd=src, capture_output=True, text=True, timeout=300
    )
    assert proc.returncode == 0, proc.stderr[-3000:]
    return out / proc.stdout.strip().splitlines()[-1]


@pytest.fixture(scope="module")
def installed(tmp_path_factory) -> dict:
    tmp = tmp_path_factory.mktemp("wheel")
    src = tmp / "src"
    shutil.copytree(CHECKOUT, src, ignore=JUNK)
    shutil.rmtree(src / "tests")  # a build must not need the tests
    sdist = _backend("build_sdist", src, tmp / "dist")
    with tarfile.open(sdist) as tar:
        try:
            tar.extractall(tmp / "unpacked", filter="data")
        except TypeError:  # Python before 3.11.4: no extraction filters (our own archive)
            tar.extractall(tmp / "unpacked")
    (unpacked,) = (tmp / "unpacked").iterdir()
    wheel = _backend("build_wheel", unpacked, tmp / "dist")

    venv = tmp / "venv"
    subprocess.run(
        [sys.executable, "-m", "venv", "--without-pip", str(venv)], check=True, timeout=120
    )
    bindir = venv / ("Scripts" if os.name == "nt" else "bin")
    python = bindir / ("python.exe" if os.name == "nt" else "python")
    site = subprocess.run(
        [str(python), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
        capture_output=True,
        text=True,
        check=True,
    ).stdout.strip()
    ours = {sysconfig.get_paths()["purelib"], sysconfig.get_paths()["platlib"]}
    Path(site, "test-env-dependencies.pth").write_text("\n".join(sorted(ours)) + "\n")
    proc = subprocess.run(
        [
            sys.executable,
            "-m",
            "pip",
            "--python",
            str(python),
            "install",
            "--no-deps",
            "--no-index",
            "--no-cache-dir",
            "-q",
            str(wheel),
        ],
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert proc.returncode == 0, proc.stderr[-3000:]

    away = tmp / "somewhere-else"
    away.mkdir()
    env = {
        k: v
        for k, v in os.environ.items()
        if k not in ("PYTHONPATH", "OFFGRID_DATA", "OFFGRID_HOME", "VIRTUAL_ENV")
    }
    env["XDG_DATA_HOME"] = str(tmp / "xdg-data")
    env["PYTHONNOUSERSITE"] = "1"
    return {
        "sdist": sdist,
        "wheel": wheel,
        "venv": venv,
        "python": python,
        "offgrid": bindir / "offgrid",
        "cwd": away,
        "env": env,
    }


def _run(installed: dict, *args: str, timeout: float = 180) -> subprocess.CompletedProcess:
    return subprocess.run(
        [str(installed["offgrid"]), *args],
        cwd=installed["cwd"],
        env=installed["env"],
        capture_output=True,
        text=True,
        timeout=timeout,
    )


def test_the_sdist_and_the_wheel_carry_the_data(installed):
    with tarfile.open(installed["sdist"]) as tar:
        names = {n.split("/", 1)[1] for n in tar.getnames() if "/" in n}
    for name in (
        "climates/kisanga-ridge-demo.toml",
        "load_profiles/household-kit.csv",
        "load_profiles/communities/kisanga-ridge-community.csv",
        "setup.py",
    ):
        assert name in names, name
    with zipfile.ZipFile(installed["wheel"]) as whl:
        names = set(whl.namelist())
    for name in (
        "offgrid/_bundled/climates/kisanga-ridge-demo.toml",
        "offgrid/_bundled/climates/greensboro-nc-tmy3.toml",
        "offgrid/_bundled/load_profiles/household-kit.csv",
        "offgrid/_bundled/load_profiles/communities/kisanga-ridge-community.csv",
        "offgrid/data/demo-project.toml",
        "offgrid/data/demo-water.toml",
        "offgrid/tui/app.tcss",
    ):
        assert name in names, name
    assert not any(n.startswith(("tests/", "climates/", "load_profiles/")) for n in names)


def test_offgrid_comes_from_the_wheel_not_the_checkout(installed):
    code = (
        "import offgrid, offgrid.paths as p; print(offgrid.__file__); "
        "print(p.climates_dir()); print(p.load_profiles_dir())"
    )
    proc = subprocess.run(
        [str(installed["python"]), "-c", code],
        cwd=installed["cwd"],
        env=installed["env"],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert proc.returncode == 0, proc.stderr
    module, climates, profiles = (Path(line) for line in proc.stdout.split("\n")[:3])
    venv = installed["venv"].resolve()
    for path in (module, climates, profiles):
        assert venv in path.resolve().parents, path
        assert CHECKOUT not in path.resolve().parents, path


def test_the_installed_program_runs_the_demo_from_anywhere(installed):
    from importlib.metadata import version

    proc = _run(installed, "--version")
    assert proc.returncode == 0 and proc.stdout.strip() == f"offgrid {version('offgrid')}"

    proc = _run(installed, "size", "--demo", "--json")
    assert proc.returncode == 0, proc.stderr
    design = json.loads(proc.stdout)
    assert design["array"]["power_w"] > 0

    proc = _run(installed, "climate", "list")
    assert proc.returncode == 0, proc.stderr
    for name in ("kisanga-ridge-demo", "greensboro-nc-tmy3", "miami-fl-tmy2"):
        assert name in proc.stdout

    proc = _run(installed, "plan", "--demo", "--json", "--jobs", "1")
    assert proc.returncode in (0, 1), proc.stderr  # 1: some rows cannot be met (reported)
    plan = json.loads(proc.stdout)
    assert plan["rows"] and plan["demo"] is True

    proc = _run(installed, "loads", "list")
    assert proc.returncode == 0 and "household-kit" in proc.stdout


def test_an_imported_climate_is_named_by_a_project_in_the_installed_program(installed, tmp_path):
    src = tmp_path / "typed.csv"
    values = [5.1, 5.6, 5.9, 5.7, 5.2, 4.9, 4.8, 5.0, 5.4, 5.5, 5.0, 4.9]  # invented
    src.write_text(
        "# latitude_deg = -3.2\n# longitude_deg = 36.5\n# elevation_m = 1200\n"
        "month,insolation_kwh_m2_day,temp_mean_c\n"
        + "".join(f"{m},{v},21\n" for m, v in enumerate(values, start=1))
    )
    proc = _run(installed, "climate", "import", str(src), "--name", "Wheel Hill", "--force")
    assert proc.returncode == 0, proc.stderr
    mine = Path(installed["env"]["XDG_DATA_HOME"]) / "offgrid" / "climates" / "wheel-hill.toml"
    assert mine.is_file()
    proc = _run(installed, "climate", "list")
    assert any(
        ln.startswith("wheel-hill ") and ln.rstrip().endswith("yours")
        for ln in proc.stdout.splitlines()
    ), proc.stdout
    proc = _run(installed, "size", "--loads", "household-kit", "--climate", "wheel-hill", "--json")
    assert proc.returncode == 0, proc.stderr
