"""Benchmark: what the Options section (8) of the text UI computes, on the demo project.

The comparison designs the base and every variant (run in a worker thread in the UI);
with the risk check on, every column is also simulated over 30 synthetic weather years
(without the trade-off sweep).  The price view computes the base design's cost on the
UI thread after every price edit, so that must stay well under a keystroke's worth.
Run: python benchmarks/bench_options.py
"""

from __future__ import annotations

import statistics
import time


def median_s(fn, runs: int = 5) -> float:
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def main() -> None:
    from offgrid.design.sizing import design
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.economics.variants import compare_variants
    from offgrid.paths import demo_project_path
    from offgrid.project.model import Variant
    from offgrid.project.store import load_project
    from offgrid.simulate.run import simulate_project

    path = demo_project_path()
    project = load_project(path)
    base = path.parent
    compare_variants(project, base)  # warm the imports
    n = len(project.variants) + 1
    t = median_s(lambda: compare_variants(project, base))
    print(f"compare_variants, {n} columns: {t:.3f} s ({t / n:.3f} s per column)")

    def sim(p, _d):
        return simulate_project(p, base, years=30, with_tradeoff=False).reliability

    t = median_s(lambda: compare_variants(project, base, simulate=sim), runs=3)
    print(f"compare_variants with 30-year risk check, {n} columns: {t:.3f} s")

    more = load_project(path)
    more.variants += [
        Variant(name=f"Autonomy {d}", overrides={"choices.autonomy_days": d}) for d in (2, 4, 5, 6)
    ]
    m = len(more.variants) + 1
    t = median_s(lambda: compare_variants(more, base), runs=3)
    print(f"compare_variants, {m} columns: {t:.3f} s ({t / m:.3f} s per column)")

    d = design(project, base)
    t = median_s(lambda: lifecycle_cost(project, d, bill_of_materials(project, d)), runs=20)
    print(f"base cost for the price view (BOM + lifecycle cost): {1000 * t:.1f} ms")


if __name__ == "__main__":
    main()
