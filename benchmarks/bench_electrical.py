"""Benchmark: the whole electrical design of the demo project, curves included.

Target (issue 4): electrical_design() < 100 ms.  Also times the module fit and the harvest
alone, and `offgrid size --demo --json` as a whole process (target < 1.5 s).
Run: python benchmarks/bench_electrical.py
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time


def _median_ms(fn, runs: int = 50) -> tuple[float, float]:
    fn()  # warm
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times) * 1000, max(times) * 1000


def main() -> None:
    t0 = time.perf_counter()
    from offgrid.design.electrical import electrical_design
    from offgrid.design.pv import fit_module
    from offgrid.design.sizing import design
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    t_import = time.perf_counter() - t0
    project = load_project(demo_project_path())
    core = design(project, demo_project_path().parent)
    print(f"imports: {t_import * 1000:.0f} ms ('pvlib' imported: {'pvlib' in sys.modules})")
    med, worst = _median_ms(lambda: fit_module(project.module))
    print(f"module fit: median {med:.2f} ms, max {worst:.2f} ms")
    med, worst = _median_ms(lambda: electrical_design(project, core))
    print(
        f"electrical_design() (fit, curves, window, harvest x2, cables, protection, "
        f"cautions): median {med:.2f} ms, max {worst:.2f} ms (target < 100 ms)"
    )
    med, worst = _median_ms(lambda: design(project, demo_project_path().parent))
    print(f"design() with the electrical step: median {med:.2f} ms, max {worst:.2f} ms")
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
        f"{statistics.median(whole):.2f} s (target < 1.5 s)"
    )


if __name__ == "__main__":
    main()
