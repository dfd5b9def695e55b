"""The test suite's own cost: wall time, CPU seconds, and where the CPU goes, per test.

    python benchmarks/bench_suite.py [--top N] [PYTEST ARGS ...]

runs ``python -m pytest -q -p no:cacheprovider PYTEST ARGS`` (the whole suite on its xdist
workers when no paths are given) with a small plugin loaded in every worker that records
each test phase's CPU (the worker's own plus its finished subprocesses'). It prints the
wall time, the CPU of the whole run (``RUSAGE_CHILDREN``), each worker's collection CPU and
busy span, and the N tests with the most CPU. CPU seconds are the figure to compare on a
shared machine: another engineer's load lengthens the wall time far more than the CPU.
(Apps started by the tmux tests run under the tmux server, not under pytest: their CPU is
not counted.) The whole suite is heavy: run it on a quiet machine, not beside others.

Figures (3 Dec 2026, the 2-core machine, busy: other engineers' load throughout):

- before: the lead's quiet run of main (0a82eb1) from a fresh clone, load 1.2: 195.6 s
  wall, 361 s CPU (345.5 user + 15.6 system), tests' own CPU 314 s, collection ~7 s of
  CPU in each of the 4 workers. The same code here, a warm tree, ``-n 2``, load 3.4:
  345.9 s wall, 385.4 s CPU, tests' CPU 364 s (contention inflates CPU too).
- after: branch suite at 4986853, a cold tree (every ``__pycache__`` of the checkout
  removed), the plain ``-n auto`` (4 workers), load 4.8 at the start and 8.5 at the end:
  228.2 s wall, 258.3 s CPU (246.3 user + 12.0 system), 1449 passed, 5 skipped, 1 failed
  (tests/test_design_golden.py on hand-pwm-36cell-12v only: last-digit float noise, on
  main too); tests' CPU 229.5 s; collection 2.6-2.7 s of CPU per worker, cold.
- where it came from (``-n0``, CPU seconds): the collector's passes (tests/conftest.py,
  youngest generation at 10,000): the UI files test_tui_files + test_tui_options spent
  9.7-10.9 s of ~45 s in it, 3.5 s after; the plan, climate and simulate files 5.2 -> 0.6
  s. The test modules' rewritten caches written once by the controller: collecting with
  4 workers in a fresh tree 29.3 -> ~20 s. The CLI in this process where its output is
  the subject (tests/cli_support.py): test_cli + test_cli_json_errors 10.2 -> 2.6 s,
  test_report_cli 10.4 -> 3.0 s. test_hybrid_variants 8.1 -> 4.2 s (the CLI's study over
  5 years). test_tui_sections 38.7 -> 31.7 s (six more tests on the shared demo app, and
  the collector).

Figures (2 Dec 2026, the 2-core machine, never quiet: a load average of 4-5 from the
other engineers' work during every whole run, so wall times were 2-3 times the quiet
ones, and CPU seconds too are inflated by the contention: the same fixed work, the 169
designs of tests/test_design_golden.py's fixture, took 4.83, 4.74 and 5.94 s of CPU in
the three runs below that logged it):

- before: main at 7a704cd, a tree without bytecode caches, load 4.6-5.0: 388 s wall,
  347 s CPU (335 user + 12 system), 1361 passed and one failure, the tmux notices test
  (its fixed 0.5 s pause caught the Options section mid-redraw).
- main's code with offgrid's caches left by an earlier run, load 2.2-5.7: 304 s wall,
  291 s CPU; collection 5.2-5.4 s of CPU in each of the 3 workers.
- after: branch suite at 521901a (before the palette test's short study, which saves
  5 s of CPU more), a tree without caches, load 1.9 at the start and 5.0 at the end:
  347 s wall, 323 s CPU (312 user + 11 system), 1372 passed, 2 failed (ruff on this
  file, being written during the run; fixed); collection 4.9-5.3 s of CPU
  per worker (cold caches written as they went); golden fixture 5.94 s (+25 % against
  the runs before: the load). The three workers ended within 1.2 s of each other (no
  tail to steal: ``--dist worksteal`` has nothing to win here).
- single files, -n0, load about 4.5: test_fuzz_design 9.8 -> 5.4 s CPU (the same 150
  examples); the generator dialog tests 4.6 -> 1.2 s (closing), 4.9 -> 1.2 s (the form's
  e key), 6.9 -> 1.9 s (palette, after the whole run above); the deference-to-code test
  1.7 -> 0.55 s (in this process); test_tui_parts_catalogue 3.0 -> 2.2 s and
  test_tui_navigation 6.4 -> 5.8 s (demo_pilot); the tmux notices test 26.7 s (quiet) -> 12.8-15.4 s
  wall at a load of 3-5; collecting the suite 8.9 -> 3.1 s CPU per process with the
  test modules' caches; the CLI and report test files 33.0 -> 24.0 s CPU with
  offgrid's caches.

The lead's quiet-machine figures for main: 191.8 s wall, 313 s user + 14 s system.
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from collections import Counter, defaultdict
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

PLUGIN = """
import json, os, resource, time
import pytest

OUT = os.environ["OFFGRID_BENCH_SUITE_LOG"]
_file = None


def _cpu():
    c = resource.getrusage(resource.RUSAGE_CHILDREN)
    return time.process_time(), c.ru_utime + c.ru_stime


def _write(record):
    global _file
    if _file is None:
        worker = os.environ.get("PYTEST_XDIST_WORKER", "main")
        _file = open(os.path.join(OUT, worker + ".jsonl"), "a")
    _file.write(json.dumps(record) + "\\n")
    _file.flush()


def pytest_collection_finish(session):
    own, children = _cpu()
    _write({"id": "<collection>", "own": own, "children": children, "t1": time.time()})


def _phase(name):
    @pytest.hookimpl(hookwrapper=True)
    def hook(item, *args, **kwargs):
        own0, children0 = _cpu()
        t0 = time.time()
        yield
        own1, children1 = _cpu()
        _write({"id": item.nodeid, "phase": name, "own": own1 - own0,
                "children": children1 - children0, "t0": t0, "t1": time.time()})
    return hook


pytest_runtest_setup = _phase("setup")
pytest_runtest_call = _phase("call")
pytest_runtest_teardown = _phase("teardown")
"""


def run(pytest_args: list[str], top: int) -> int:
    with tempfile.TemporaryDirectory(prefix="bench-suite-") as tmp:
        plugin_dir = Path(tmp, "plugin")
        plugin_dir.mkdir()
        (plugin_dir / "bench_suite_cpu.py").write_text(PLUGIN)
        logs = Path(tmp, "logs")
        logs.mkdir()
        env = dict(os.environ, OFFGRID_BENCH_SUITE_LOG=str(logs))
        env["PYTHONPATH"] = os.pathsep.join(filter(None, [str(plugin_dir), env.get("PYTHONPATH")]))
        argv = [sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider"]
        argv += ["-p", "bench_suite_cpu", *pytest_args]
        load = os.getloadavg()
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        start = time.perf_counter()
        proc = subprocess.run(argv, cwd=ROOT, env=env, capture_output=True, text=True)
        wall = time.perf_counter() - start
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        user, system = after.ru_utime - before.ru_utime, after.ru_stime - before.ru_stime
        summary = proc.stdout.strip().splitlines()[-1:] or ["(no output)"]
        print(
            f"load average at the start {load[0]:.2f} {load[1]:.2f} {load[2]:.2f}, "
            f"at the end {' '.join(f'{x:.2f}' for x in os.getloadavg())}"
        )
        print(f"pytest: {summary[0]}")
        for line in proc.stdout.splitlines():  # the short summary: which tests failed
            if line.startswith(("FAILED ", "ERROR ")):
                print(f"  {line}")
        print(
            f"wall {wall:.1f} s, CPU {user + system:.1f} s ({user:.1f} user + {system:.1f} system)"
        )
        report(logs, top)
        return proc.returncode


def report(logs: Path, top: int) -> None:
    per_test: Counter[str] = Counter()
    by_worker: dict[str, list[dict]] = defaultdict(list)
    for path in sorted(logs.glob("*.jsonl")):
        for line in path.read_text().splitlines():
            by_worker[path.stem].append(json.loads(line))
    starts = [r["t1"] for rs in by_worker.values() for r in rs if r["id"] == "<collection>"]
    first = min(starts) if starts else 0.0
    for worker, records in sorted(by_worker.items()):
        tests = [r for r in records if r["id"] != "<collection>"]
        collection = next((r for r in records if r["id"] == "<collection>"), None)
        cpu = sum(r["own"] + r["children"] for r in tests)
        end = max((r["t1"] for r in tests), default=first)
        print(
            f"{worker}: collection {collection['own'] if collection else 0:.1f} s CPU, "
            f"{len({r['id'] for r in tests})} tests, {cpu:.1f} s CPU, "
            f"last test ends {end - first:.1f} s after the first collection ended"
        )
        for r in tests:
            per_test[r["id"]] += r["own"] + r["children"]
    print(f"tests' CPU in all: {sum(per_test.values()):.1f} s; the {top} with the most:")
    for test_id, cpu in per_test.most_common(top):
        print(f"  {cpu:6.2f} s  {test_id}")


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--top", type=int, default=15, help="how many tests to list")
    known, rest = parser.parse_known_args()
    return run(rest, known.top)


if __name__ == "__main__":
    raise SystemExit(main())
