"""The climate of a site as plain data: twelve monthly means and an optional daily year.

These are the shapes a climate file (:mod:`offgrid.climate.files`) and a project's
inline climate (:class:`offgrid.project.model.ClimateChoice`) hold; they sit here,
below both the climate files and the project store, so that neither imports the other.
Units are in the field names.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass
class MonthlyClimate:
    """Twelve monthly means for one site."""

    insolation_kwh_m2_day: list[float]
    temp_mean_c: list[float]
    temp_max_c: list[float] | None = None
    temp_min_c: list[float] | None = None
    record_low_c: float | None = None
    source: str = ""
    latitude_deg: float | None = None
    longitude_deg: float | None = None
    elevation_m: float | None = None
    demo: bool = False
    daily: DailyClimate | None = None  # the daily series of an imported weather year, if any
    albedo: float | list[float] | None = None  # ground reflectance: one value or twelve


@dataclass
class DailyClimate:
    """One value per day of a 365-day year, 1 January first (29 February left out)."""

    insolation_kwh_m2_day: list[float]
    temp_mean_c: list[float]
    temp_max_c: list[float]
    temp_min_c: list[float]
