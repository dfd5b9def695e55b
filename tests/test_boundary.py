"""The engine never imports the UI libraries (DESIGN.md: one pure engine, many views)."""

from __future__ import annotations

import subprocess
import sys


def test_engine_imports_no_ui():
    code = (
        "import sys\n"
        "import offgrid.design.sizing, offgrid.project.store, offgrid.report.summary\n"
        "import offgrid.economics.bom, offgrid.economics.costs, offgrid.economics.prices\n"
        "import offgrid.economics.variants, offgrid.catalogue\n"
        "from offgrid.paths import demo_project_path\n"
        "from offgrid.project.store import load_project\n"
        "offgrid.design.sizing.design(load_project(demo_project_path()))\n"
        "bad = [m for m in ('textual', 'rich') if m in sys.modules]\n"
        "assert not bad, bad\n"
    )
    subprocess.run([sys.executable, "-c", code], check=True)
