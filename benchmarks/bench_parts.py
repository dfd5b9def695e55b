"""Benchmark: the cheapest-combination search over an invented catalogue.

Target (issue #17): 20 modules x 20 battery units x 10 controllers x 10 inverters ranked
under 5 s.  Run: python benchmarks/bench_parts.py [MODULES BATTERIES CONTROLLERS INVERTERS [JOBS]]
(default 20 20 10 10, one process; the CPU time printed is this process's only, so with
JOBS > 1 read the wall time).  Every part is invented, scaled from generic datasheet values.
"""

from __future__ import annotations

import sys
import time


def catalogue(n_mod: int, n_bat: int, n_ctrl: int, n_inv: int):
    from offgrid.stock.catalogue import Catalogue, read_kind_csv, template_csv

    rows = {"modules": [], "batteries": [], "controllers": [], "inverters": []}
    for i in range(n_mod):
        k = 0.5 + i / max(1, n_mod - 1)  # 0.5 to 1.5 x a 60-cell 300 W module's current
        rows["modules"].append(
            f"Bench module {i},{300 * k:.1f},32.5,{9.23 * k:.3f},39.8,{9.75 * k:.3f},0.05,"
            f"-0.30,-0.40,60,{1.63 * k:.3f},45,{110 * k + i:.2f},USD,,yes"
        )
    kinds = [
        ("agm", 12, 100, 0.5, 0.85),
        ("gel", 2, 400, 0.5, 0.85),
        ("lifepo4", 12.8, 100, 0.8, 0.95),
    ]
    for i in range(n_bat):
        chem, v, ah, dod, eff = kinds[i % 3]
        ah = ah * (1 + i // 3)
        rows["batteries"].append(
            f"Bench battery {i},{chem},{v},{ah},{dod},{eff},{v * ah * 0.15 + i:.2f},USD,,yes"
        )
    for i in range(n_ctrl):
        amps = (20, 30, 40, 50, 60, 80, 100)[i % 7]
        volts = (100, 150, 250)[i % 3]
        rows["controllers"].append(
            f"Bench controller {i},mppt,{volts},0.97,{amps},12 24 48,{100 + 4 * amps + i},USD,,yes"
        )
    for i in range(n_inv):
        w = 300 * (1 + i)
        rows["inverters"].append(
            f"Bench inverter {i},{w},{2 * w},48,{0.88 + 0.005 * i:.3f},{8 + i},,"
            f"{0.3 * w + 100},USD,,yes"
        )
    parts = {}
    for kind, body in rows.items():
        got, problems = read_kind_csv(kind, template_csv(kind) + "\n".join(body) + "\n", kind)
        assert not problems, problems[:3]
        parts[kind] = tuple(got)
    return Catalogue("bench", parts, (), {})


def main() -> None:
    sizes = [int(a) for a in sys.argv[1:5]] or [20, 20, 10, 10]
    jobs = int(sys.argv[5]) if len(sys.argv) > 5 else 1
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project
    from offgrid.stock.choose import search

    project = load_project(demo_project_path())
    cat = catalogue(*sizes)
    t, cpu = time.perf_counter(), time.process_time()
    result = search(project, cat, demo_project_path().parent, jobs=jobs)
    dt, dcpu = time.perf_counter() - t, time.process_time() - cpu
    print(
        f"{' x '.join(map(str, sizes))}: {result.tried} combinations, "
        f"{result.designs_run} designs, {len(result.by_capital)} ranked, {dt:.2f} s "
        f"({dcpu:.2f} s CPU, {dcpu / max(1, result.designs_run) * 1000:.1f} ms CPU a design; "
        "wall time on a shared machine can be several times the CPU time)"
    )


if __name__ == "__main__":
    main()
