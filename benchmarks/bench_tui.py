"""Text UI figures: launch to interactive, edit to updated results, resident memory.

Run:  PYTHONPATH=. python benchmarks/bench_tui.py

* launch: the real program in an 80x24 tmux window (when tmux is installed), from
  process start to the demo's headline being on screen; also the in-process time
  from importing the UI to the first screen drawn (headless).
* edit: Enter on an edited value until the design is recomputed and the screen
  redrawn (pilot, headless), median and worst of many edits; and the recompute
  plus redraw alone, as the work screen times it.
* memory: resident set size of the real program with the demo open (tmux), and of
  the headless process.

Targets (issue 5): launch < 1.5 s, edit < 100 ms, memory < 200 MB.
"""

from __future__ import annotations

import asyncio
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def rss_mb(pid: int | str = "self") -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def tmux_launch(runs: int = 5) -> tuple[list[float], list[float], float] | None:
    tmux = shutil.which("tmux")
    if tmux is None:
        return None
    times: list[float] = []
    first_paint: list[float] = []
    memory = float("nan")
    state = tempfile.mkdtemp()
    for i in range(runs):
        sock = f"offgrid-bench-{os.getpid()}-{i}"

        def t(*args, sock=sock):
            return subprocess.run(
                [tmux, "-L", sock, "-f", "/dev/null", *args], capture_output=True, text=True
            )

        cmd = (
            f"cd '{ROOT}' && exec env OFFGRID_STATE_DIR='{state}' PYTHONPATH='{ROOT}' "
            f"TERM=xterm-256color '{sys.executable}' -m offgrid --demo"
        )
        t0 = time.perf_counter()
        t("new-session", "-d", "-x", "80", "-y", "24", "-s", "b", cmd)
        painted = None
        while time.perf_counter() - t0 < 20:
            shown = t("capture-pane", "-t", "b", "-p").stdout
            if painted is None and "1 Place" in shown:
                painted = time.perf_counter() - t0
            if "Array 1,800 W" in shown:
                break
            time.sleep(0.01)
        times.append(time.perf_counter() - t0)
        first_paint.append(painted or times[-1])
        if i == runs - 1:
            time.sleep(1.0)
            pid = t("display", "-p", "-t", "b", "#{pane_pid}").stdout.strip()
            memory = rss_mb(pid)
        t("kill-server")
    return times, first_paint, memory


def tmux_edit(edits: int = 12) -> list[float] | None:
    """Real terminal: Enter on a new days-of-autonomy value until the headline shows it."""
    tmux = shutil.which("tmux")
    if tmux is None:
        return None
    sys.path.insert(0, str(ROOT))
    from offgrid.design.sizing import design
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    sock = f"offgrid-bench-edit-{os.getpid()}"

    def t(*args):
        return subprocess.run(
            [tmux, "-L", sock, "-f", "/dev/null", *args], capture_output=True, text=True
        )

    def screen() -> str:
        return t("capture-pane", "-t", "e", "-p").stdout

    state = tempfile.mkdtemp()
    cmd = (
        f"cd '{ROOT}' && exec env OFFGRID_STATE_DIR='{state}' PYTHONPATH='{ROOT}' "
        f"TERM=xterm-256color '{sys.executable}' -m offgrid --demo"
    )
    t("new-session", "-d", "-x", "80", "-y", "24", "-s", "e", cmd)
    end = time.perf_counter() + 20
    while "Array 1,800 W" not in screen() and time.perf_counter() < end:
        time.sleep(0.02)
    project = load_project(demo_project_path())
    t("send-keys", "-t", "e", "3")
    time.sleep(0.3)
    t("send-keys", "-t", "e", "Down")
    times = []
    for i in range(edits):
        days = 3.5 + (i % 6) * 0.5
        project.choices.autonomy_days = days
        kwh = design(project, demo_project_path().parent).battery.nominal_kwh
        want = f"Battery {kwh:.1f} kWh"
        time.sleep(0.3)
        t("send-keys", "-t", "e", "Enter")
        time.sleep(0.3)
        t("send-keys", "-t", "e", "C-u")
        t("send-keys", "-t", "e", "-l", f"{days:g}")
        time.sleep(0.3)
        t0 = time.perf_counter()
        t("send-keys", "-t", "e", "Enter")
        while want not in screen() and time.perf_counter() - t0 < 5:
            time.sleep(0.002)
        times.append(time.perf_counter() - t0)
    t("kill-server")
    return times


async def headless() -> dict[str, float | list[float]]:
    t0 = time.perf_counter()
    from offgrid.tui.app import make_app

    app = make_app(demo=True, state=Path(tempfile.mkdtemp()), check_recovery=False)
    out: dict[str, float | list[float]] = {}
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.pause()
        out["first_screen_s"] = time.perf_counter() - t0
        work = app.work
        work.action_goto("parts")
        await pilot.pause()
        work.current.reveal("choices.autonomy_days")
        pressed, inner = [], []
        for i in range(40):
            await pilot.press("enter")
            await pilot.pause()
            app.focused.value = f"{2 + (i % 5) * 0.5:g}"
            t1 = time.perf_counter()
            await pilot.press("enter")
            await pilot.pause()
            pressed.append(time.perf_counter() - t1)
            inner.append(work.last_change_s)
        out["edit_s"] = pressed
        out["recompute_redraw_s"] = inner
        work.action_goto("loads")
        await pilot.pause()
        loads = []
        table = work.current.table
        for i in range(20):
            table.move_cursor(row=0, column=2)
            await pilot.press("enter")
            await pilot.pause()
            app.focused.value = f"{60 + i}"
            t1 = time.perf_counter()
            await pilot.press("enter")
            await pilot.pause()
            loads.append(time.perf_counter() - t1)
        out["edit_loads_s"] = loads
        out["rss_mb"] = rss_mb()
    return out


def main() -> None:
    print("offgrid text UI benchmark (targets: launch < 1.5 s, edit < 100 ms, RSS < 200 MB)")
    launched = tmux_launch()
    if launched is None:
        print("  tmux not installed: real-terminal launch and memory skipped")
    else:
        times, painted, memory = launched
        print(
            f"  launch to first paint (sections on screen, keys answered), real terminal "
            f"(tmux 80x24, demo): median {statistics.median(painted):.2f} s, worst "
            f"{max(painted):.2f} s"
        )
        print(
            f"  launch to the design's headline on screen: median "
            f"{statistics.median(times):.2f} s, worst {max(times):.2f} s over {len(times)} runs"
        )
        print(f"  resident memory, real program with the demo open: {memory:.0f} MB")
    edits = tmux_edit()
    if edits:
        v = [x * 1000 for x in edits]
        print(
            f"  edit to updated headline, real terminal (Enter sent -> new battery kWh on "
            f"screen): median {statistics.median(v):.0f} ms, worst {max(v):.0f} ms "
            f"({len(v)} edits; includes tmux send-keys and capture polling)"
        )
    h = asyncio.run(headless())
    print(f"  headless, import of the UI to first screen: {h['first_screen_s']:.2f} s")
    for key, what in (
        ("edit_s", "pilot: edit (Parts) to redrawn results, with pilot waits"),
        ("edit_loads_s", "pilot: edit (Loads) to redrawn results, with pilot waits"),
        ("recompute_redraw_s", "recompute + redraw alone"),
    ):
        v = [x * 1000 for x in h[key]]  # type: ignore[union-attr]
        print(
            f"  {what}: median {statistics.median(v):.1f} ms, worst {max(v):.1f} ms "
            f"({len(v)} edits)"
        )
    print(f"  resident memory, headless process with the demo open: {h['rss_mb']:.0f} MB")


if __name__ == "__main__":
    main()
