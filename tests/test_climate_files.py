"""Climate files: the daily table, round trips, and the bundled climates' provenance."""

from __future__ import annotations

import importlib.util
import tomllib
from pathlib import Path

import pytest

from offgrid.climate.files import (
    ClimateFileError,
    bundled_climates,
    climate_from_dict,
    dumps_climate,
    load_climate,
    save_climate,
)
from offgrid.climate.model import DailyClimate, MonthlyClimate

ROOT = Path(__file__).resolve().parents[1]


def _climate(daily: bool = True) -> MonthlyClimate:
    return MonthlyClimate(
        insolation_kwh_m2_day=[4.0 + m / 10 for m in range(12)],
        temp_mean_c=[20.0] * 12,
        temp_max_c=[26.0] * 12,
        temp_min_c=[14.0] * 12,
        record_low_c=5.0,
        source="invented for a test",
        latitude_deg=-12.0,
        longitude_deg=30.0,
        elevation_m=900.0,
        demo=True,
        daily=DailyClimate([4.5] * 365, [20.0] * 365, [26.0] * 365, [14.0] * 365)
        if daily
        else None,
    )


def test_round_trip_with_daily_series(tmp_path):
    c = _climate()
    path = save_climate(c, tmp_path / "c.toml", name="Test")
    assert load_climate(str(path)) == c
    text = path.read_text()
    assert text.startswith("# DEMONSTRATION DATA")
    assert "# Feb 17-28" in text  # the daily table reads month by month
    assert max(len(line) for line in text.splitlines()) < 140


def test_round_trip_without_daily(tmp_path):
    c = _climate(daily=False)
    path = save_climate(c, tmp_path / "c.toml")
    assert load_climate(str(path)) == c
    assert "[daily]" not in path.read_text()


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda d: d["daily"].update(temp_mean_c=[20.0] * 364), r"daily\.temp_mean_c: needs 365"),
        (lambda d: d["daily"].pop("temp_min_c"), r"daily\.temp_min_c: needs 365"),
        (
            lambda d: d["daily"]["insolation_kwh_m2_day"].__setitem__(40, 30.0),
            r"daily\.insolation_kwh_m2_day\[41\]: '30.0' is not a number in 0 to 15",
        ),
        (lambda d: d["daily"]["temp_max_c"].__setitem__(0, "hot"), r"temp_max_c\[1\]"),
    ],
)
def test_bad_daily_table_names_the_field(edit, message):
    data = tomllib.loads(dumps_climate(_climate()))
    edit(data)
    with pytest.raises(ClimateFileError, match=message):
        climate_from_dict(data, where="c.toml")


def test_every_bundled_climate_loads_with_source_and_coordinates():
    names = bundled_climates()
    assert len(names) >= 8
    for stem, path in names.items():
        c = load_climate(stem)
        data = tomllib.loads(path.read_text())
        assert data["name"] and c.source, stem
        assert c.latitude_deg is not None and c.longitude_deg is not None, stem
        assert c.record_low_c is not None, stem
        if c.demo:
            assert "demonstration" in c.source.lower() and stem.endswith("-demo"), stem
            assert path.read_text().startswith("# DEMONSTRATION DATA"), stem
        else:
            assert "pvlib" in c.source and c.daily is not None, stem


def test_bundled_climates_are_what_the_script_makes():
    # climates/ must be reproducible from pvlib's sample files by scripts/make_climates.py
    spec = importlib.util.spec_from_file_location(
        "make_climates", ROOT / "scripts" / "make_climates.py"
    )
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    for stem, text in module.build_all().items():
        path = ROOT / "climates" / f"{stem}.toml"
        assert path.read_text(encoding="utf-8") == text, (
            f"{stem}: run `PYTHONPATH=. python scripts/make_climates.py`"
        )


SNOW = [0.7, 0.7, 0.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4]  # D&B Example 2.19.1


@pytest.mark.parametrize("albedo", [0.25, SNOW])
def test_albedo_in_a_climate_file_round_trips(tmp_path, albedo):
    from dataclasses import replace

    c = replace(_climate(daily=False), albedo=albedo)
    path = save_climate(c, tmp_path / "c.toml", name="Test")
    assert load_climate(str(path)).albedo == albedo
    assert "albedo = " in path.read_text()


@pytest.mark.parametrize(
    ("albedo", "where"),
    [
        ([0.2] * 5, "climate.monthly.albedo"),
        ([*SNOW[:11], 1.2], r"climate.monthly.albedo\[12\]"),
        ("snow", "climate.monthly.albedo"),
    ],
)
def test_bad_albedo_in_a_climate_file_names_the_field(albedo, where):
    from offgrid.climate.files import climate_to_dict

    body = climate_to_dict(_climate(daily=False))
    body["monthly"]["albedo"] = albedo
    with pytest.raises(ClimateFileError, match=where):
        climate_from_dict(body)
