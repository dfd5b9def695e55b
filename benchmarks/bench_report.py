"""Benchmark: the HTML report of the demo project, charts included.

Target (issue 7): under 2 s for the whole command.  Prints the in-process time (warm and
cold: the first call pays for importing matplotlib) and the whole ``offgrid report`` process.
Run: python benchmarks/bench_report.py
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path


def main() -> None:
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project
    from offgrid.report import make_report

    path = demo_project_path()
    project = load_project(path)
    t = time.perf_counter()
    html = make_report(project, path.parent, "html")
    cold = time.perf_counter() - t
    runs = []
    for _ in range(5):
        t = time.perf_counter()
        make_report(project, path.parent, "html")
        runs.append(time.perf_counter() - t)
    t = time.perf_counter()
    make_report(project, path.parent, "txt")
    txt = time.perf_counter() - t
    print(
        f"make_report html: first {cold:.3f} s (imports matplotlib), then median "
        f"{statistics.median(runs):.3f} s; {len(html.encode()):,} bytes"
    )
    print(f"make_report txt: {txt:.3f} s")
    whole = []
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "r.html"
        for _ in range(3):
            t = time.perf_counter()
            subprocess.run(
                [sys.executable, "-m", "offgrid", "report", "--demo", "-o", str(out), "--force"],
                check=True,
                capture_output=True,
            )
            whole.append(time.perf_counter() - t)
        print(
            f"offgrid report --demo -o r.html: best {min(whole):.2f} s, median "
            f"{statistics.median(whole):.2f} s (target < 2 s)"
        )
        t = time.perf_counter()
        subprocess.run(
            [
                sys.executable,
                "-m",
                "offgrid",
                "report",
                "--demo",
                "--simulate",
                "-o",
                str(out),
                "--force",
            ],
            check=True,
            capture_output=True,
        )
        print(
            f"offgrid report --demo --simulate (30 years, trade-off, every variant "
            f"simulated): {time.perf_counter() - t:.2f} s (no target)"
        )


if __name__ == "__main__":
    main()
