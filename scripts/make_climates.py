"""Regenerate the bundled climates in climates/.

Two kinds:

* derived from the typical-meteorological-year sample files that pvlib ships
  in its ``data`` folder (NREL TMY3 and TMY2 files), reduced by
  :mod:`offgrid.climate.importers` exactly as ``offgrid climate import`` does;
* demonstration climates for invented sites of our own, built from invented
  monthly clearness indices x the extraterrestrial insolation of each month
  (Duffie & Beckman eq. 1.10.3) and invented temperatures.  They are labelled
  as demonstration data and must pass the plausibility checks.

Usage: ``PYTHONPATH=. python scripts/make_climates.py [--check]``; ``--check``
writes nothing and exits 1 if a bundled file differs from what this script makes.
"""

from __future__ import annotations

import sys
import warnings
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from offgrid.climate.clearsky import extraterrestrial_monthly_mean_kwh_m2  # noqa: E402
from offgrid.climate.files import dumps_climate  # noqa: E402
from offgrid.project.model import MonthlyClimate  # noqa: E402

#: (file in pvlib/data, bundled stem, display name, dataset)
PVLIB_SAMPLES = (
    ("723170TYA.CSV", "greensboro-nc-tmy3", "Greensboro, North Carolina (TMY3)", "TMY3"),
    ("703165TY.csv", "sand-point-ak-tmy3", "Sand Point, Alaska (TMY3)", "TMY3"),
    ("12839.tm2", "miami-fl-tmy2", "Miami, Florida (TMY2)", "TMY2"),
)

#: Invented sites: stem, name, lat, lon, elevation, record low, monthly KT, mean,
#: daily range (max - min), all invented for demonstration.
DEMO_SITES = (
    dict(
        stem="dalli-wells-demo",
        name="Dalli Wells, a Sahel village (demo)",
        story="a Sahel village with a dusty dry season and a short rainy season",
        lat=14.2,
        lon=1.6,
        elevation=280.0,
        record_low=8.0,
        kt=[0.56, 0.57, 0.57, 0.57, 0.57, 0.56, 0.53, 0.50, 0.54, 0.58, 0.58, 0.56],
        mean=[25.0, 27.5, 31.0, 33.5, 34.0, 32.0, 29.0, 27.5, 29.0, 31.0, 28.5, 25.5],
        range_=[15.0, 15.0, 14.0, 13.0, 12.0, 10.0, 8.0, 7.5, 8.5, 12.0, 14.5, 15.0],
    ),
    dict(
        stem="pampa-alta-demo",
        name="Pampa Alta, a high Andean village (demo)",
        story="a tropical highland village at 3850 m with clear dry winters and frosty nights",
        lat=-16.2,
        lon=-68.6,
        elevation=3850.0,
        record_low=-13.0,
        kt=[0.55, 0.56, 0.58, 0.64, 0.70, 0.72, 0.72, 0.70, 0.66, 0.64, 0.62, 0.57],
        mean=[11.5, 11.3, 11.0, 9.8, 7.5, 5.5, 5.2, 6.5, 8.6, 10.3, 11.4, 11.6],
        range_=[12.0, 12.0, 13.0, 15.0, 17.0, 18.0, 18.0, 17.5, 16.0, 15.0, 14.0, 12.5],
    ),
    dict(
        stem="tarn-station-demo",
        name="Tarn Station, a southern sheep station (demo)",
        story="a farm at 43.6 S with cool winters and frost",
        lat=-43.6,
        lon=171.2,
        elevation=620.0,
        record_low=-11.0,
        kt=[0.53, 0.53, 0.51, 0.49, 0.47, 0.45, 0.46, 0.48, 0.50, 0.51, 0.52, 0.52],
        mean=[16.5, 16.4, 14.5, 11.3, 8.0, 5.2, 4.5, 6.0, 8.5, 10.8, 13.0, 15.1],
        range_=[11.0, 11.0, 10.5, 10.0, 9.0, 8.5, 8.5, 9.0, 9.5, 10.0, 10.5, 11.0],
    ),
    dict(
        stem="myrvik-cabin-demo",
        name="Myrvik, a northern mountain cabin (demo)",
        story="a cabin at 63.4 N with a few hours of daylight in December",
        lat=63.4,
        lon=10.5,
        elevation=450.0,
        record_low=-31.0,
        kt=[0.31, 0.36, 0.42, 0.45, 0.46, 0.46, 0.44, 0.42, 0.38, 0.33, 0.30, 0.28],
        mean=[-6.5, -6.0, -2.5, 2.0, 7.5, 11.5, 13.5, 12.5, 8.0, 3.0, -2.0, -5.0],
        range_=[6.0, 7.0, 8.0, 9.0, 10.0, 10.0, 9.5, 9.0, 8.0, 6.5, 5.5, 5.5],
    ),
)


def pvlib_data_dir() -> Path:
    import pvlib

    return Path(pvlib.__file__).resolve().parent / "data"


def from_pvlib_sample(filename: str, dataset: str) -> MonthlyClimate:
    from dataclasses import replace

    from offgrid.climate.importers import read_hourly, reduce_hourly

    rows = read_hourly(pvlib_data_dir() / filename)
    result = reduce_hourly(rows, name=filename)
    source = (
        f"NREL {dataset} sample file {filename} ({rows.station}) as shipped in pvlib's "
        "data folder; hourly year reduced to monthly means and daily totals by "
        "scripts/make_climates.py. record_low_c is the coldest hour of that one typical "
        "year, not the station's record"
    )
    return replace(result.climate, source=source)


def demo_climate(site: dict) -> MonthlyClimate:
    h0 = extraterrestrial_monthly_mean_kwh_m2(site["lat"])
    h = np.asarray(site["kt"]) * h0
    mean = np.asarray(site["mean"])
    half = np.asarray(site["range_"]) / 2.0
    return MonthlyClimate(
        insolation_kwh_m2_day=[round(float(v), 2) for v in h],
        temp_mean_c=[round(float(v), 1) for v in mean],
        temp_max_c=[round(float(v), 1) for v in mean + half],
        temp_min_c=[round(float(v), 1) for v in mean - half],
        record_low_c=site["record_low"],
        source=f"Invented demonstration climate, a scenario of our own: {site['story']}; "
        "not measured data "
        "(monthly clearness index x extraterrestrial insolation, scripts/make_climates.py)",
        latitude_deg=site["lat"],
        longitude_deg=site["lon"],
        elevation_m=site["elevation"],
        demo=True,
    )


def build_all() -> dict[str, str]:
    """Stem -> file text of every climate this script makes."""
    out: dict[str, str] = {}
    for filename, stem, name, dataset in PVLIB_SAMPLES:
        out[stem] = dumps_climate(from_pvlib_sample(filename, dataset), name)
    for site in DEMO_SITES:
        out[site["stem"]] = dumps_climate(demo_climate(site), site["name"])
    return out


def main(argv: list[str]) -> int:
    warnings.filterwarnings("ignore", module="pvlib")
    check = "--check" in argv
    folder = ROOT / "climates"
    differ = []
    for stem, text in build_all().items():
        path = folder / f"{stem}.toml"
        if check:
            if not path.is_file() or path.read_text(encoding="utf-8") != text:
                differ.append(stem)
        else:
            path.write_text(text, encoding="utf-8")
            print(f"wrote {path.relative_to(ROOT)}")
    if differ:
        print("differs from the script's output: " + ", ".join(differ))
        return 1
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
