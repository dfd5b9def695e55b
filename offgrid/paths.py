"""Where the bundled data folders are: ``climates/`` and ``load_profiles/`` at the checkout root.

``OFFGRID_DATA`` (a folder holding both) overrides the location.
"""

from __future__ import annotations

import os
from pathlib import Path

_ROOT = Path(__file__).resolve().parents[1]


def data_root() -> Path:
    env = os.environ.get("OFFGRID_DATA")
    return Path(env) if env else _ROOT


def climates_dir() -> Path:
    return data_root() / "climates"


def load_profiles_dir() -> Path:
    return data_root() / "load_profiles"


def demo_project_path() -> Path:
    """The bundled demonstration project (invented scenario)."""
    return Path(__file__).resolve().parent / "data" / "demo-project.toml"
