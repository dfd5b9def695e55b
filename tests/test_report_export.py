"""The export functions the text UI calls: whole file or none, never a silent overwrite."""

from __future__ import annotations

import csv

import pytest

from offgrid.project.model import Load
from offgrid.report.export import ExportError, export_bom, export_report, format_for
from tests.conftest import hand_project
from tests.report_helpers import demo


def test_export_report_by_suffix_and_refuses_to_overwrite(tmp_path):
    project, base = demo()
    out = export_report(project, tmp_path / "clinic.md", base)
    assert out.read_text(encoding="utf-8").startswith("# Kisanga Ridge health post")
    with pytest.raises(ExportError) as exc:
        export_report(project, out, base)
    assert exc.value.exists and "exists" in str(exc.value)
    export_report(project, out, base, fmt="txt", force=True)
    assert out.read_text(encoding="utf-8").startswith("KISANGA RIDGE HEALTH POST")
    assert [p.name for p in tmp_path.iterdir()] == ["clinic.md"]


def test_export_report_bad_folder_and_bad_format(tmp_path):
    project, base = demo()
    with pytest.raises(ExportError, match="does not exist") as exc:
        export_report(project, tmp_path / "nope" / "r.html", base)
    assert not exc.value.exists
    with pytest.raises(ExportError, match="unknown report format"):
        export_report(project, tmp_path / "r.html", base, fmt="pdf")
    with pytest.raises(ExportError, match="is a folder"):
        export_report(project, tmp_path, base)
    assert list(tmp_path.iterdir()) == []
    assert format_for(tmp_path / "r.HTM") == "html"
    assert format_for(tmp_path / "r.report") == "html"


def test_export_of_a_project_that_does_not_design_writes_nothing(tmp_path):
    project = hand_project()
    project.loads = [Load("Nothing", 1, 0.0, 0.0, "dc")]
    with pytest.raises(ExportError, match="cannot design"):
        export_report(project, tmp_path / "r.html")
    with pytest.raises(ExportError, match="cannot design"):
        export_bom(project, tmp_path / "b.csv")
    assert list(tmp_path.iterdir()) == []


def test_export_bom(tmp_path):
    project, base = demo()
    out = export_bom(project, tmp_path / "parts.csv", base)
    rows = list(csv.DictReader(out.open(encoding="utf-8")))
    assert rows[0]["part"].startswith("module:") and rows[0]["quantity"] == "6"


def test_export_bom_complete_is_the_whole_kit(tmp_path):
    # the text UI writes the complete kit (issue 17): the main parts plus what the crew
    # must also carry, each line with its reason; the short list stays for `offgrid bom`
    project, base = demo()
    short = export_bom(project, tmp_path / "short.csv", base).read_text(encoding="utf-8")
    whole = export_bom(project, tmp_path / "kit.csv", base, complete=True)
    rows = list(csv.DictReader(whole.open(encoding="utf-8")))
    parts = [r["part"] for r in rows]
    assert parts[0].startswith("module:")
    assert any("mount" in p for p in parts) and any("earth" in p for p in parts)
    assert len(rows) > len(short.splitlines())
