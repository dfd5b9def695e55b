"""Benchmark: community planning, time against rows and against the number of kit types.

Target (issue 8): 10,000 rows designed and standardised in under 10 s on 2 cores.
Surveys are generated here (invented homes of the demo village):

* ``realistic``: two rows in three name a bundled load list, the rest give a surveyed
  daily energy rounded to 10 Wh (how survey forms record it);
* ``distinct``: every row a different daily energy, so every row is its own design
  (the worst case for the design cache).

Run: PYTHONPATH=. python benchmarks/bench_plan.py [--quick]
"""

from __future__ import annotations

import sys
import time

import numpy as np

LISTS = ("household-basic", "household-medium", "household-kit", "village-shop")
HEAD = (
    "community,Benchmark village (invented)\nclimate,kisanga-ridge-demo\n"
    "project,kisanga-ridge-home-parts\nprices,kisanga-ridge-prices\n"
    "id,count,load_list,daily_energy_wh,peak_power_w,ac_dc\n"
)


def make_survey(rows: int, kind: str, seed: int = 1) -> str:
    rng = np.random.default_rng(seed)
    out = [HEAD]
    for i in range(rows):
        if kind == "realistic" and i % 3:
            out.append(f"H{i},1,{LISTS[i % 4]},,,\n")
            continue
        if kind == "realistic":
            energy = float(rng.integers(5, 150) * 10)
        else:
            energy = 50.0 + 1450.0 * i / max(rows - 1, 1)
        peak = max(10.0, round(energy / 6.0))
        out.append(f"H{i},1,,{energy:g},{peak:g},{'ac' if i % 7 == 0 else 'dc'}\n")
    return "".join(out)


def run_once(text: str, kits: int | None, jobs: int, kit_cost: float | None = None):
    from offgrid.paths import load_profiles_dir
    from offgrid.plan.community import assemble, resolve_prices
    from offgrid.plan.rows import design_rows, prepare
    from offgrid.plan.survey import read_survey

    t0 = time.perf_counter()
    survey = read_survey(text, base_dir=load_profiles_dir())
    inputs = prepare(survey)
    t1 = time.perf_counter()
    designed = design_rows(inputs, jobs=jobs)
    t2 = time.perf_counter()
    prices = resolve_prices(survey, None)
    plan = assemble(inputs, designed, prices, "cost", kits, kit_cost, 12, 0)
    t3 = time.perf_counter()
    return t1 - t0, t2 - t1, t3 - t2, designed.distinct, plan


def bench_rows(sizes, jobs_list) -> None:
    print("Time against rows (read / design / standardise + totals), K = 4")
    print(
        f"  {'survey':<10} {'rows':>6} {'jobs':>4} {'distinct':>8} {'read s':>7} "
        f"{'design s':>8} {'kits s':>7} {'total s':>8}"
    )
    for kind in ("realistic", "distinct"):
        for n in sizes:
            text = make_survey(n, kind)
            for jobs in jobs_list:
                r, d, k, distinct, _ = run_once(text, 4, jobs)
                print(
                    f"  {kind:<10} {n:>6} {jobs:>4} {distinct:>8} {r:>7.2f} {d:>8.2f} "
                    f"{k:>7.2f} {r + d + k:>8.2f}"
                )


def bench_k(rows: int) -> None:
    print(f"\nTime against K, {rows} realistic rows (designs done once)")
    from offgrid.paths import load_profiles_dir
    from offgrid.plan.community import assemble, resolve_prices
    from offgrid.plan.rows import design_rows, prepare
    from offgrid.plan.survey import read_survey

    survey = read_survey(make_survey(rows, "realistic"), base_dir=load_profiles_dir())
    inputs = prepare(survey)
    designed = design_rows(inputs, jobs=2)
    prices = resolve_prices(survey, None)
    for k in (1, 2, 4, 8, 16):
        t = time.perf_counter()
        plan = assemble(inputs, designed, prices, "cost", k, 0.0, 12, 0)
        dt = time.perf_counter() - t
        print(
            f"  K = {k:>2}: {dt:6.3f} s, {len(plan.standard.kits)} kits used, cost "
            f"{plan.totals.total_cost:,.0f}"
        )
    t = time.perf_counter()
    plan = assemble(inputs, designed, prices, "cost", None, 1200.0, 12, 0)
    print(
        f"  cost per kit type 1200, up to 12: {time.perf_counter() - t:6.3f} s, "
        f"{len(plan.standard.kits)} kits chosen"
    )


def bench_points() -> None:
    """The recursion alone on many distinct part needs in one family (synthetic)."""
    sys.path.insert(0, "tests")
    from test_plan_kits import PRICES, PRICES_NO_OWN, row

    from offgrid.plan.kits import Candidate, standardise

    print(
        "\nThe recursion alone: distinct part needs n in one family (strings, battery "
        "strings random 1-60)"
    )
    rng = np.random.default_rng(4)
    for n in (50, 200, 800):
        pts = set()
        while len(pts) < n:
            pts.add((int(rng.integers(1, 61)), int(rng.integers(1, 61))))
        cands = [
            Candidate(i, row(s, p), int(rng.integers(1, 30)))
            for i, (s, p) in enumerate(sorted(pts))
        ]
        for label, prices in (("no own systems", PRICES_NO_OWN), ("own allowed", PRICES)):
            for k in (4, 12):
                t = time.perf_counter()
                standardise(cands, k=k, prices=prices)
                print(f"  n = {n:>4}, K = {k:>2}, {label:<14}: {time.perf_counter() - t:6.3f} s")


def main() -> None:
    quick = "--quick" in sys.argv
    t = time.perf_counter()
    import offgrid.plan.community  # noqa: F401

    print(f"imports: {(time.perf_counter() - t) * 1000:.0f} ms")
    if quick:
        bench_rows([1000], [1])
        return
    bench_rows([100, 1000, 10_000], [1, 2])
    bench_k(10_000)
    bench_points()


if __name__ == "__main__":
    main()
