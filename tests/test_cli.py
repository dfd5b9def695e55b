"""The headless command line: the program started as a user would (subprocess) for one
run of each exit code (0, 2, 3), the other checks of the commands' output in this process
(tests/cli_support.py: the same ``main``, without 0.3-0.9 s of CPU to start each one)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from offgrid.paths import load_profiles_dir
from offgrid.project.store import save_project
from tests.cli_support import run_cli
from tests.conftest import hand_project

REQUIRED_KEYS = (
    "loads.daily_energy_wh",
    "loads.design_daily_energy_wh",
    "site.design_month",
    "site.tilt_deg",
    "site.poa_kwh_m2_day",
    "array.power_w",
    "array.module_power_w",
    "array.modules_series",
    "array.modules_parallel",
    "battery.system_voltage_v",
    "battery.capacity_ah",
    "battery.usable_kwh",
    "battery.units_series",
    "battery.units_parallel",
    "controller.type",
    "controller.current_a",
    "inverter.continuous_w",
    "inverter.surge_w",
)


def offgrid(*args: str, check: bool = True) -> subprocess.CompletedProcess:
    proc = subprocess.run(
        [sys.executable, "-m", "offgrid", *args], capture_output=True, text=True, timeout=120
    )
    if check:
        assert proc.returncode == 0, proc.stderr
    return proc


def cli(*args: str, check: bool = True) -> subprocess.CompletedProcess:
    """``offgrid ARGS`` in this process (:func:`tests.cli_support.run_cli`)."""
    proc = run_cli(*args)
    if check:
        assert proc.returncode == 0, proc.stderr
    return proc


def dig(data: dict, dotted: str):
    for part in dotted.split("."):
        data = data[part]
    return data


def test_size_demo_json_has_documented_keys():
    data = json.loads(offgrid("size", "--demo", "--json").stdout)
    for key in REQUIRED_KEYS:
        dig(data, key)
    assert len(data["loads"]["daily_energy_wh"]) == 12
    assert len(data["site"]["poa_kwh_m2_day"]) == 12
    assert 1 <= data["site"]["design_month"] <= 12
    assert all({"code", "message"} <= set(w) for w in data["warnings"])
    assert any("local electrical codes" in c for c in data["cautions"])
    assert data["reasons"]["array.power_w"]["source"]


def test_size_summary_is_readable_and_fits_80_columns():
    out = cli("size", "--demo").stdout
    assert (
        "Design month" in out
        and "Battery capacity installed" in out
        and "demonstration data" in out
    )
    assert max(len(line) for line in out.splitlines()) <= 80


def test_size_project_file(tmp_path):
    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    data = json.loads(cli("size", str(path), "--json").stdout)
    assert data["array"]["power_w"] == 1200


@pytest.mark.parametrize(
    "name", ["household-kit", "rural-clinic", "primary-school", "water-pump", "radio-repeater"]
)
def test_quick_design_for_every_demo_load_list(name):
    csv = str(Path(load_profiles_dir()) / f"{name}.csv")
    data = json.loads(
        cli(
            "size",
            "--loads",
            csv,
            "--climate",
            "kisanga-ridge-demo",
            "--autonomy-days",
            "2",
            "--max-dod",
            "0.6",
            "--controller",
            "mppt",
            "--json",
        ).stdout
    )
    assert data["array"]["power_w"] > 0 and data["battery"]["capacity_ah"] > 0
    assert data["battery"]["autonomy_days"] == 2 and data["battery"]["max_dod"] == 0.6


def test_bad_project_file_exits_2_with_line(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text("format = 'offgrid-project'\nschema = 1\n[site]\nlatitude_deg = 123\n")
    proc = offgrid("size", str(path), check=False)
    assert proc.returncode == 2
    assert "line 4" in proc.stderr and "site.latitude_deg" in proc.stderr


def test_design_that_cannot_be_met_exits_3(tmp_path):
    p = hand_project()
    p.battery.nominal_voltage_v = 10.0
    path = tmp_path / "p.toml"
    save_project(p, path)
    proc = offgrid("size", str(path), check=False)
    assert proc.returncode == 3 and "cannot make" in proc.stderr


def test_quick_design_needs_both_parts():
    proc = cli("size", "--loads", "x.csv", check=False)
    assert proc.returncode == 2 and "--climate" in proc.stderr


def test_bad_override_names_the_field():
    proc = cli("size", "--demo", "--max-dod", "1.7", check=False)
    assert proc.returncode == 2 and "choices.max_dod" in proc.stderr


def test_unknown_climate_lists_bundled_names():
    csv = str(Path(load_profiles_dir()) / "household-kit.csv")
    proc = cli("size", "--loads", csv, "--climate", "atlantis", check=False)
    assert proc.returncode == 2 and "kisanga-ridge-demo" in proc.stderr
