"""A job done at the installer's pace in a real terminal, every typed value checked.

    python benchmarks/tmux_whole_job.py [--runs 3] [--gap 0.15]

Each run opens a copy of the demo project in a fresh 80x24 tmux window and, one key
every ``--gap`` seconds (0.15 s: a quick typist), renames the project and the site,
types the latitude and longitude in the forms people write (12°24' N, 1 W), adds six
loads of a grain-mill workshop (invented, for demonstration) with their power and
hours, sets days of autonomy and the depth of discharge as "60 %", saves and quits;
then reads the saved file and compares every value with what was typed, reopens the
project and checks the loads are on screen. Fields are reached through the command
palette by their labels, as a person who knows the words would. Prints one line per
run and the count of runs where every value came out exactly as typed.
"""

from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
import tempfile
import time
import uuid
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
TMUX = shutil.which("tmux")

# (label in the palette, text typed, where the value is kept, the value expected)
FIELDS = [
    ("Project name (1 Place)", "Grain mill workshop (demo)", "info.name", None),
    ("Site name (1 Place)", "Kiboko ridge (invented)", "site.name", None),
    ("Latitude (1 Place)", "12\u00b024' N", "site.latitude_deg", 12.4),
    ("Longitude (1 Place)", "1 W", "site.longitude_deg", -1.0),
    ("Elevation (1 Place)", "350", "site.elevation_m", 350.0),
    ("Days of autonomy (3 Parts)", "4.5", "choices.autonomy_days", 4.5),
    ("Max depth of discharge (3 Parts)", "60 %", "choices.max_dod", 0.6),
]
# name, watts, hours per day (a workshop of our own: invented, for demonstration)
LOADS = [
    ("Grain mill motor", "2200", "3"),
    ("Welder", "1500", "0.5"),
    ("Drill", "650", "1.25"),
    ("DC lights", "40", "5"),
    ("Fridge", "90", "24"),
    ("Phone charging", "10", "4"),
]


class Term:
    def __init__(self, gap: float) -> None:
        self.socket = f"job-{uuid.uuid4().hex[:8]}"
        self.gap = gap

    def tmux(self, *args: str) -> str:
        return subprocess.run(
            [TMUX, "-L", self.socket, "-f", "/dev/null", *args], capture_output=True, text=True
        ).stdout

    def start(self, command: str) -> None:
        self.tmux("new-session", "-d", "-x", "80", "-y", "24", "-s", "t", command)

    def screen(self) -> str:
        return self.tmux("capture-pane", "-t", "t", "-p")

    def wait(self, text: str, timeout: float = 20.0) -> None:
        end = time.monotonic() + timeout
        while time.monotonic() < end:
            if text in self.screen():
                return
            time.sleep(0.05)
        raise TimeoutError(f"never saw {text!r}:\n{self.screen()}")

    def key(self, *keys: str) -> None:
        for k in keys:
            self.tmux("send-keys", "-t", "t", k)
            time.sleep(0.5 if k == "Escape" else self.gap)

    def type(self, text: str) -> None:
        for ch in text:  # one key at a time, as a person types
            self.tmux("send-keys", "-t", "t", "-l", ch)
            time.sleep(self.gap)

    def alive(self) -> bool:
        return (
            subprocess.run(
                [TMUX, "-L", self.socket, "has-session", "-t", "t"], capture_output=True
            ).returncode
            == 0
        )

    def close(self) -> None:
        self.tmux("kill-server")


def command(state: Path, project: Path) -> str:
    return (
        f"env OFFGRID_STATE_DIR='{state}' TEXTUAL_ANIMATIONS=none TERM=xterm-256color "
        f"ESCDELAY=25 PYTHONPATH='{ROOT}' '{sys.executable}' -m offgrid '{project}'"
    )


def get(obj, dotted: str):
    for part in dotted.split("."):
        obj = getattr(obj, part)
    return obj


def one_run(tmp: Path, gap: float) -> list[str]:
    """The job once; returns what came out different from what was typed (empty: all)."""
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    project = tmp / "workshop.toml"
    project.write_text(demo_project_path().read_text())
    loads_before = len(load_project(project).loads)
    t = Term(gap)
    try:
        t.start(command(tmp / "state", project))
        t.wait("Array 1,800 W")
        for label, typed, _path, _value in FIELDS:
            t.key("C-p")
            t.wait("Search for commands")
            t.type(label)
            time.sleep(0.3)  # the palette's search runs after typing stops
            t.key("Enter")
            time.sleep(0.3)
            t.key("Enter")  # edit the field the palette went to
            t.wait("Enter applies")
            t.type(typed)  # the old value is selected: typing replaces it
            t.key("Enter")
        t.key("2")
        t.wait("Appliance")
        for name, watts, hours in LOADS:
            t.key("a")
            t.wait("Enter applies")
            t.type(name)
            t.key("Enter", "Right", "Right", "Enter")
            t.wait("Enter applies")
            t.type(watts)
            t.key("Enter", "Right", "Enter")
            t.wait("Enter applies")
            t.type(hours)
            t.key("Enter", "Left", "Left", "Left")
        t.key("s")
        t.wait("Saved")
        t.key("q")
        end = time.monotonic() + 10
        while t.alive() and time.monotonic() < end:
            time.sleep(0.1)
    finally:
        t.close()
    wrong = []
    saved = load_project(project)
    for _label, typed, path, value in FIELDS:
        want = typed if value is None else value
        got = get(saved, path)
        if got != want:
            wrong.append(f"{path}: typed {typed!r}, kept {got!r}")
    names = {n for n, _w, _h in LOADS}
    added = [ld for ld in saved.loads if ld.name in names]  # (a adds below the cursor)
    if len(saved.loads) != loads_before + len(LOADS):
        wrong.append(f"{len(saved.loads) - loads_before} loads added, not {len(LOADS)}")
    if [ld.name for ld in added] != [n for n, _w, _h in LOADS]:
        wrong.append(f"load names: {[ld.name for ld in added]}")
    for ld, (name, watts, hours) in zip(added, LOADS, strict=False):
        if (ld.power_w, ld.hours_per_day) != (float(watts), float(hours)):
            wrong.append(
                f"{name}: typed {watts} W {hours} h, kept {ld.power_w} W {ld.hours_per_day} h"
            )
    # reopened: the loads are on screen
    t = Term(gap)
    try:
        t.start(command(tmp / "state", project))
        t.wait("Grain mill workshop (demo)")
        t.key("2")
        t.wait("Phone charging")
    except TimeoutError as exc:
        wrong.append(f"reopen: {exc}"[:200])
    finally:
        t.close()
    return wrong


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--gap", type=float, default=0.15, help="seconds between keys")
    args = ap.parse_args()
    if TMUX is None:
        sys.exit("tmux is not installed")
    exact = 0
    for n in range(1, args.runs + 1):
        t0 = time.monotonic()
        with tempfile.TemporaryDirectory(ignore_cleanup_errors=True) as d:
            try:
                wrong = one_run(Path(d), args.gap)
            except TimeoutError as exc:
                wrong = [f"stopped: {exc}"]
        exact += not wrong
        took = time.monotonic() - t0
        print(
            f"run {n}: {'every value as typed' if not wrong else '; '.join(wrong)} ({took:.0f} s)"
        )
    print(f"{exact} of {args.runs} runs kept every typed value exactly")
    sys.exit(0 if exact == args.runs else 1)


if __name__ == "__main__":
    main()
