"""Benchmark: weather-file import and the best-tilt search.

Targets (issue 3): importing a year of hourly data and reducing it < 1 s; the best-tilt
search < 100 ms.  Run: PYTHONPATH=. python benchmarks/bench_climate.py
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
import warnings
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "tests"))


def _best(fn, n: int) -> tuple[float, float]:
    runs = []
    for _ in range(n):
        t = time.perf_counter()
        fn()
        runs.append(time.perf_counter() - t)
    return min(runs), statistics.median(runs)


def main() -> None:
    warnings.filterwarnings("ignore")
    # a cold process: Python start, pvlib import, read, reduce, checks
    sample = "import pvlib, pathlib; print(pathlib.Path(pvlib.__file__).parent / 'data')"
    data = Path(
        subprocess.run(
            [sys.executable, "-c", sample], capture_output=True, text=True, check=True
        ).stdout.strip()
    )
    tmy3 = data / "723170TYA.CSV"
    cold = []
    for _ in range(3):
        t = time.perf_counter()
        subprocess.run(
            [
                sys.executable,
                "-W",
                "ignore",
                "-c",
                f"from offgrid.climate.importers import import_weather_file as f; f({str(tmy3)!r})",
            ],
            check=True,
            cwd=ROOT,
            capture_output=True,
        )
        cold.append(time.perf_counter() - t)
    print(f"TMY3 import, whole cold process (pvlib import included): best {min(cold):.2f} s")

    t = time.perf_counter()
    import pvlib  # noqa: F401

    print(f"  of which importing pvlib: {time.perf_counter() - t:.2f} s")

    from climate_support import raw_tmy3, write_epw

    from offgrid.climate.importers import import_weather_file, read_hourly, reduce_hourly

    with tempfile.TemporaryDirectory() as tmp:
        epw = write_epw(Path(tmp) / "year.epw", raw_tmy3(tmy3))
        for label, path in (("TMY3", tmy3), ("EPW", epw), ("TMY2", data / "12839.tm2")):
            read_hourly(path)  # warm
            b, m = _best(lambda p=path: read_hourly(p), 5)
            rows = read_hourly(path)
            rb, _ = _best(lambda r=rows: reduce_hourly(r), 20)
            ib, _ = _best(lambda p=path: import_weather_file(p), 3)
            print(
                f"{label}: read {b * 1000:.0f} ms (median {m * 1000:.0f}), reduce "
                f"{rb * 1000:.1f} ms, import with checks {ib * 1000:.0f} ms (pvlib loaded)"
            )

    import numpy as np

    from offgrid.climate.files import load_climate
    from offgrid.climate.tilt import best_tilt

    c = load_climate("greensboro-nc-tmy3")
    demand = np.full(12, 1500.0)
    best_tilt(c.insolation_kwh_m2_day, c.latitude_deg, None, demand)
    b, m = _best(lambda: best_tilt(c.insolation_kwh_m2_day, c.latitude_deg, None, demand), 50)
    print(f"best-tilt search: best {b * 1000:.1f} ms, median {m * 1000:.1f} ms")
    horizon = [(90.0, 10.0), (180.0, 15.0), (270.0, 8.0)]
    kw = dict(horizon=horizon, longitude_deg=c.longitude_deg, elevation_m=c.elevation_m)
    best_tilt(c.insolation_kwh_m2_day, c.latitude_deg, None, demand, **kw)
    b, m = _best(lambda: best_tilt(c.insolation_kwh_m2_day, c.latitude_deg, None, demand, **kw), 10)
    print(
        f"best-tilt search with a horizon profile: best {b * 1000:.1f} ms, "
        f"median {m * 1000:.1f} ms (pvlib loaded)"
    )


if __name__ == "__main__":
    main()
