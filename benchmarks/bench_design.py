"""Benchmark: design() on the demo project, and `offgrid size --json` as a whole process.

Targets (issue: backbone): design() < 50 ms after imports; the whole command < 1.5 s.
Run: python benchmarks/bench_design.py

Measured 2026-12-02, after the one PWM operating voltage and peak charge current
(offgrid/design/charging.py), at a load average of 5.4-5.7 on the shared 2-core machine:
design() median 49.8 ms (wall), `offgrid size --demo --json` best 0.95 s; CPU time of
design() against the commit before, median of 40, load ~5: demo 32.5-33.4 ms (was
33.7-33.8), its PWM variant 31.6-34.5 ms (33.3-33.5), 36-cell 12 V PWM 15.2-17.7 ms
(16.3-17.7): no change beyond the noise.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time


def main() -> None:
    t0 = time.perf_counter()
    from offgrid.design.sizing import design
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    t_import = time.perf_counter() - t0
    project = load_project(demo_project_path())
    design(project)  # warm
    runs = []
    for _ in range(50):
        t = time.perf_counter()
        design(project)
        runs.append(time.perf_counter() - t)
    print(f"imports: {t_import * 1000:.0f} ms")
    print(
        f"design(): median {statistics.median(runs) * 1000:.2f} ms, "
        f"max {max(runs) * 1000:.2f} ms over {len(runs)} runs"
    )
    whole = []
    for _ in range(5):
        t = time.perf_counter()
        subprocess.run(
            [sys.executable, "-m", "offgrid", "size", "--demo", "--json"],
            check=True,
            capture_output=True,
        )
        whole.append(time.perf_counter() - t)
    print(
        f"offgrid size --demo --json: best {min(whole):.2f} s, median "
        f"{statistics.median(whole):.2f} s"
    )


if __name__ == "__main__":
    main()
