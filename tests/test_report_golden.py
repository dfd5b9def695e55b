"""The text report of the demo project, line for line, against a reviewed copy.

``tests/data/demo-report.txt`` was produced by ``offgrid report --demo`` and read through
(demonstration data, invented).  When the engine changes on purpose, regenerate it with
``OFFGRID_REGEN_GOLDEN=1 pytest tests/test_report_golden.py`` and review the diff.
"""

from __future__ import annotations

import difflib
import os
from pathlib import Path

from offgrid.report import make_report
from tests.report_helpers import demo

GOLDEN = Path(__file__).parent / "data" / "demo-report.txt"


def test_demo_text_report_matches_golden():
    project, base = demo()
    text = make_report(project, base, "txt")
    if os.environ.get("OFFGRID_REGEN_GOLDEN"):
        GOLDEN.write_text(text, encoding="utf-8")
    expected = GOLDEN.read_text(encoding="utf-8")
    if text != expected:
        diff = "".join(
            difflib.unified_diff(
                expected.splitlines(True), text.splitlines(True), "golden", "now", n=1
            )
        )
        raise AssertionError(f"text report differs from {GOLDEN.name}:\n{diff[:4000]}")


def test_demo_text_report_fits_80_columns():
    project, base = demo()
    for fmt in ("txt",):
        lines = make_report(project, base, fmt).splitlines()
        too_long = [(n, line) for n, line in enumerate(lines, 1) if len(line) > 80]
        assert not too_long, too_long[:3]
