"""What the text UI does before its first paint (issue 19, launch speed).

The first paint waits for every module imported before it: the scientific stack
(pvlib ~0.7 s, pandas ~0.35 s, scipy ~0.5 s, numpy ~0.1 s; LIBRARY-NOTES.md) and
the engine are imported on the design's worker thread after it, and the screens a
project file does not show at once (start, recovery, help, generator) when first
shown. The recent list (written with an fsync) is written after it. These run in a
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


#: Screens and lists a project file does not show at its first paint.
NOT_SHOWN = (
    "offgrid.tui.screens.start",
    "offgrid.tui.screens.recover",
    "offgrid.tui.screens.help",
    "offgrid.tui.screens.generator",
    "offgrid.tui.commands",
)


def at_first_paint(tmp_path, open_what: str) -> dict:
    """Modules loaded, and whether the recent list exists, when the work screen has
    painted once and asks for its design (``request_design`` runs after the first
    refresh); then the recent list after the run."""
    return fresh(
        "import asyncio, json, sys\n"
        "from pathlib import Path\n"
        "from offgrid.tui.app import make_app\n"
        "from offgrid.tui import session\n"
        "from offgrid.tui.screens.work import WorkScreen\n"
        "seen = {}\n"
        "texts = []\n"
        "dumps = session.dumps_project\n"
        "session.dumps_project = lambda p: texts.append(1) or dumps(p)\n"
        "recent = Path('state') / 'recent.json'\n"
        "original = WorkScreen.request_design\n"
        "def spy(self, then=None):\n"
        "    seen.setdefault('modules', sorted(sys.modules))\n"
        "    seen.setdefault('recent_before', recent.exists())\n"
        "    seen.setdefault('texts', len(texts))\n"
        "    return original(self, then)\n"
        "WorkScreen.request_design = spy\n"
        "async def main():\n"
        f"    app = {open_what}\n"
        "    async with app.run_test(size=(80, 24)):\n"
        "        pass\n"
        "asyncio.run(main())\n"
        "seen['recent_after'] = recent.read_text() if recent.exists() else None\n"
        "print(json.dumps(seen))\n",
        tmp_path,
    )


def test_the_first_paint_comes_before_the_scientific_libraries(tmp_path):
    got = at_first_paint(tmp_path, "make_app(demo=True)")
    assert "modules" in got, "the work screen never asked for its design"
    assert loaded(got["modules"], HEAVY) == []
    assert loaded(got["modules"], ENGINE) == []


def test_a_project_file_paints_before_the_screens_it_does_not_show(tmp_path):
    from offgrid.paths import demo_project_path

    (tmp_path / "clinic.toml").write_text(demo_project_path().read_text(), encoding="utf-8")
    got = at_first_paint(tmp_path, "make_app('clinic.toml')")
    assert loaded(got["modules"], NOT_SHOWN) == []
    assert got["recent_before"] is False, "the recent list was written before the first paint"
    # the project as text: the saved state (Session.open) and the file bar's unsaved
    # mark; a resize of the bar reuses its text (it was made again)
    assert got["texts"] == 2
    assert str((tmp_path / "clinic.toml").resolve()) in json.loads(got["recent_after"])


def test_the_collector_is_off_until_the_first_paint(monkeypatch):
    """``offgrid`` (launch.run) starts with the garbage collector off and turns it on
    once the first screen is painted (``OffgridApp.on_first_paint``)."""
    import gc

    from offgrid.tui import launch
    from offgrid.tui.app import OffgridApp

    seen = {}

    def run(app) -> None:  # instead of a terminal: the app's first paint, at once
        seen["before"] = gc.isenabled()
        frozen = gc.get_freeze_count()
        app.on_first_paint()
        seen["after"] = gc.isenabled()
        # start-up's objects are left out of the collector's passes from then on
        seen["frozen"] = gc.get_freeze_count() > frozen

    monkeypatch.setattr(OffgridApp, "run", run)
    assert gc.isenabled()
    try:
        assert launch.run(["--demo"]) == 0
    finally:
        gc.unfreeze()  # (this test process goes on as before)
    assert seen == {"before": False, "after": True, "frozen": True}
    assert gc.isenabled()
