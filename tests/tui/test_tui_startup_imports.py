"""What the text UI imports before its first paint (issue 19, launch speed).

The first paint waits for every module imported before it: the scientific stack
(pvlib ~0.7 s, pandas ~0.35 s, scipy ~0.5 s, numpy ~0.1 s; LIBRARY-NOTES.md) and
the engine are imported on the design's worker thread after it. These run in a
fresh interpreter, so what the other tests imported does not count.
"""

from __future__ import annotations

import json
import subprocess
import sys

HEAVY = ("pvlib", "pandas", "scipy", "numpy", "matplotlib")
ENGINE = (
    "offgrid.design.sizing",
    "offgrid.report",
    "offgrid.economics",
    "offgrid.plan",
    "offgrid.simulate",
)


def fresh(code: str, tmp_path) -> dict:
    out = subprocess.run(
        [sys.executable, "-c", code],
        capture_output=True,
        text=True,
        timeout=120,
        check=True,
        env={"OFFGRID_STATE_DIR": str(tmp_path / "state"), "PATH": "/usr/bin:/bin"},
        cwd=tmp_path,
    )
    return json.loads(out.stdout.strip().splitlines()[-1])


def loaded(names: list[str], wanted: tuple[str, ...]) -> list[str]:
    return sorted(w for w in wanted if any(n == w or n.startswith(w + ".") for n in names))


def test_importing_the_app_loads_no_scientific_library_nor_the_engine(tmp_path):
    got = fresh(
        "import json, sys\n"
        "import offgrid.cli, offgrid.tui.launch, offgrid.tui.app\n"
        "print(json.dumps({'modules': sorted(sys.modules)}))\n",
        tmp_path,
    )
    assert loaded(got["modules"], HEAVY) == []
    assert loaded(got["modules"], ENGINE) == []


def test_the_first_paint_comes_before_the_scientific_libraries(tmp_path):
    """What is loaded when the work screen has painted once and asks for the design
    (``request_design`` runs after the first refresh)."""
    got = fresh(
        "import asyncio, json, sys\n"
        "from offgrid.tui.app import make_app\n"
        "from offgrid.tui.screens.work import WorkScreen\n"
        "seen = {}\n"
        "original = WorkScreen.request_design\n"
        "def spy(self, then=None):\n"
        "    seen.setdefault('modules', sorted(sys.modules))\n"
        "    return original(self, then)\n"
        "WorkScreen.request_design = spy\n"
        "async def main():\n"
        "    app = make_app(demo=True)\n"
        "    async with app.run_test(size=(80, 24)):\n"
        "        pass\n"
        "asyncio.run(main())\n"
        "print(json.dumps(seen))\n",
        tmp_path,
    )
    assert "modules" in got, "the work screen never asked for its design"
    assert loaded(got["modules"], HEAVY) == []
    assert loaded(got["modules"], ENGINE) == []
