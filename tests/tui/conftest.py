"""Fixtures for the text-UI tests."""

from __future__ import annotations

from pathlib import Path

import pytest


@pytest.fixture(autouse=True)
def state(tmp_path, monkeypatch) -> Path:
    """Recent files and recovery files go to a folder of the test's own."""
    folder = tmp_path / "state"
    monkeypatch.setenv("OFFGRID_STATE_DIR", str(folder))
    monkeypatch.chdir(tmp_path)
    return folder
