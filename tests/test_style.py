"""ruff is part of the suite, so a style slip fails CI like any other defect."""

from __future__ import annotations

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


def test_ruff_clean():
    ruff = shutil.which("ruff") or str(Path(sys.executable).with_name("ruff"))
    if not Path(ruff).exists():
        pytest.skip("ruff is not installed (pip install -e '.[test]')")
    proc = subprocess.run([ruff, "check", str(ROOT)], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stdout + proc.stderr


def test_ruff_format_kept():
    # `ruff format` was applied once to the whole tree; it stays applied (issue 14)
    ruff = shutil.which("ruff") or str(Path(sys.executable).with_name("ruff"))
    if not Path(ruff).exists():
        pytest.skip("ruff is not installed (pip install -e '.[test]')")
    proc = subprocess.run([ruff, "format", "--check", str(ROOT)], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stdout + proc.stderr
