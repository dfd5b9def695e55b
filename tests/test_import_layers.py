"""The climate package sits below the project store: no import circle between them.

Each check runs in a fresh interpreter, so nothing is imported before the module named.
"""

from __future__ import annotations

import subprocess
import sys
import textwrap

import pytest


def _run(code: str) -> None:
    done = subprocess.run(
        [sys.executable, "-c", textwrap.dedent(code)], capture_output=True, text=True, timeout=120
    )
    assert done.returncode == 0, done.stderr


def test_climate_files_work_without_the_project_store(tmp_path):
    # Reading, writing and saving a climate file never loads offgrid.project.store (nor the
    # project model): the climate dataclasses live in offgrid.climate.model and the file is
    # written by offgrid.project.atomic.
    _run(f"""
        import sys
        from pathlib import Path
        from offgrid.climate.files import climate_from_dict, load_climate, save_climate
        from offgrid.climate.model import MonthlyClimate
        c = MonthlyClimate(insolation_kwh_m2_day=[5.0] * 12, temp_mean_c=[20.0] * 12,
                           source="invented for a test", demo=True)
        path = save_climate(c, Path({str(tmp_path)!r}) / "x.toml", "x")
        assert load_climate(path).insolation_kwh_m2_day == [5.0] * 12
        for name in ("offgrid.project.store", "offgrid.project.model"):
            assert name not in sys.modules, name
    """)


@pytest.mark.parametrize(
    "first",
    [
        "offgrid.climate.files",
        "offgrid.project.store",
        "offgrid.climate.model",
        "offgrid.project.model",
    ],
)
def test_each_module_imports_first_in_a_fresh_interpreter(first):
    _run(f"""
        import importlib
        importlib.import_module({first!r})
        from offgrid.project.model import MonthlyClimate as A
        from offgrid.climate.model import MonthlyClimate as B
        assert A is B
        import offgrid.project.store, offgrid.climate.files
    """)
