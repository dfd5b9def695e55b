"""``offgrid report``, ``bom``, ``prices`` and ``variants``: the report to the screen from the
program started as a user would (subprocess), the other checks of the commands' files,
messages and exit codes by ``main`` in this process (tests/cli_support.py; the same code
without 0.3-0.9 s of CPU to start each run)."""

from __future__ import annotations

import csv
import io
import os
import shutil
import subprocess
import sys

import pytest

from offgrid.paths import demo_project_path
from offgrid.project.model import Load
from offgrid.project.store import load_project, save_project
from tests.cli_support import run_cli
from tests.conftest import hand_project


def offgrid(*args: str, cwd=None) -> subprocess.CompletedProcess:
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join(
        filter(None, [str(demo_project_path().parents[2]), env.get("PYTHONPATH")])
    )
    return subprocess.run(
        [sys.executable, "-m", "offgrid", *args],
        capture_output=True,
        text=True,
        timeout=120,
        stdin=subprocess.DEVNULL,
        cwd=cwd,
        env=env,
    )


@pytest.fixture
def demo_copy(tmp_path):
    path = tmp_path / "clinic.toml"
    shutil.copy(demo_project_path(), path)
    return path


def test_report_writes_each_format(tmp_path):
    for name, marker in (
        ("r.html", "<!DOCTYPE html>"),
        ("r.md", "# Kisanga"),
        ("r.txt", "KISANGA RIDGE"),
    ):
        out = tmp_path / name
        proc = run_cli("report", "--demo", "-o", str(out))
        assert proc.returncode == 0, proc.stderr
        assert out.read_text(encoding="utf-8").startswith(marker)
        assert f"wrote {out}" in proc.stderr
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.html", "r.md", "r.txt"]


def test_report_to_stdout_is_80_column_text():
    proc = offgrid("report", "--demo")
    assert proc.returncode == 0, proc.stderr
    lines = proc.stdout.splitlines()
    assert lines[0] == "KISANGA RIDGE HEALTH POST"
    assert max(len(line) for line in lines) <= 80


def test_report_refuses_existing_file_without_force(tmp_path):
    out = tmp_path / "r.html"
    out.write_text("keep me", encoding="utf-8")
    proc = run_cli("report", "--demo", "-o", str(out))
    assert proc.returncode == 2
    assert "exists; add --force" in proc.stderr
    assert out.read_text(encoding="utf-8") == "keep me"
    proc = run_cli("report", "--demo", "-o", str(out), "--force")
    assert proc.returncode == 0, proc.stderr
    assert out.read_text(encoding="utf-8").startswith("<!DOCTYPE html>")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.html"]  # no backup, no temp


def test_report_unwritable_path_says_so(tmp_path):
    out = tmp_path / "no-such-folder" / "r.html"
    proc = run_cli("report", "--demo", "-o", str(out))
    assert proc.returncode == 2
    assert "does not exist" in proc.stderr and str(out.parent) in proc.stderr
    assert not out.parent.exists()


def test_report_path_under_a_file(tmp_path):
    # works as root too, unlike a read-only folder (root may write anywhere)
    blocker = tmp_path / "notes.txt"
    blocker.write_text("not a folder", encoding="utf-8")
    proc = run_cli("report", "--demo", "-o", str(blocker / "r.html"))
    assert proc.returncode == 2 and "is a file, not a folder" in proc.stderr
    assert blocker.read_text(encoding="utf-8") == "not a folder"


@pytest.mark.skipif(
    hasattr(os, "geteuid") and os.geteuid() == 0,
    reason="root may write anywhere; test_report_path_under_a_file covers CI",
)
def test_report_read_only_folder(tmp_path):
    folder = tmp_path / "ro"
    folder.mkdir()
    folder.chmod(0o500)
    try:
        proc = run_cli("report", "--demo", "-o", str(folder / "r.html"))
        assert proc.returncode == 2 and "no permission" in proc.stderr
        assert list(folder.iterdir()) == []
    finally:
        folder.chmod(0o700)


def test_report_of_a_project_that_does_not_design(tmp_path):
    project = hand_project()
    project.loads = [Load("Nothing", 1, 0.0, 0.0, "dc")]
    path = tmp_path / "empty.toml"
    save_project(project, path)
    out = tmp_path / "r.html"
    proc = run_cli("report", str(path), "-o", str(out))
    assert proc.returncode == 3
    assert "cannot design" in proc.stderr and "no report was written" in proc.stderr
    assert not out.exists()
    assert [p.name for p in tmp_path.iterdir()] == ["empty.toml"]


def test_bom_csv_and_report_bom_option(tmp_path):
    proc = run_cli("bom", "--demo")
    assert proc.returncode == 0, proc.stderr
    rows = list(csv.DictReader(io.StringIO(proc.stdout)))
    assert rows[0]["part"].startswith("module:") and rows[0]["quantity"] == "6"
    assert rows[0]["unit price (USD)"] == "115.00"
    out = tmp_path / "parts.csv"
    proc = run_cli("report", "--demo", "-o", str(tmp_path / "r.md"), "--bom", str(out))
    assert proc.returncode == 0, proc.stderr
    assert out.read_text(encoding="utf-8").startswith("part,description,quantity")


def test_prices_template_then_import(demo_copy, tmp_path):
    proc = run_cli("prices", str(demo_copy), "--template")
    assert proc.returncode == 0, proc.stderr
    rows = list(csv.DictReader(io.StringIO(proc.stdout)))
    inverter = next(r for r in rows if r["part"].startswith("inverter:"))
    assert inverter["unit_price"] == "380"  # the kind-wide price of the demo list
    sheet = tmp_path / "quote.csv"
    sheet.write_text(f"part,unit_price\n{inverter['part']},412.5\n", encoding="utf-8")
    proc = run_cli("prices", str(demo_copy), "--import", str(sheet))
    assert proc.returncode == 0, proc.stderr
    saved = load_project(demo_copy)
    assert any(p.part == inverter["part"] and p.unit_price == 412.5 for p in saved.prices)
    assert (tmp_path / "clinic.toml.bak").exists()


def test_prices_import_refuses_bad_price_and_keeps_the_file(demo_copy, tmp_path):
    before = demo_copy.read_bytes()
    sheet = tmp_path / "quote.csv"
    sheet.write_text("part,unit_price\nmodule,-3\n", encoding="utf-8")
    proc = run_cli("prices", str(demo_copy), "--import", str(sheet))
    assert proc.returncode == 2
    assert "row 2, unit_price" in proc.stderr and "above zero" in proc.stderr
    assert demo_copy.read_bytes() == before


def test_prices_lists_missing(tmp_path):
    project = hand_project()
    path = tmp_path / "p.toml"
    save_project(project, path)
    proc = run_cli("prices", str(path))
    assert proc.returncode == 1
    assert "no price for: module:" in proc.stderr


def test_variants_command():
    proc = run_cli("variants", "--demo")
    assert proc.returncode == 0, proc.stderr
    assert "PWM controller" in proc.stdout and "pwm *" in proc.stdout
    assert max(len(line) for line in proc.stdout.splitlines()) <= 80
