"""The climate of a site as plain data: twelve monthly means and an optional daily year.

These are the shapes a climate file (:mod:`offgrid.climate.files`) and a project's
inline climate (:class:`offgrid.project.model.ClimateChoice`) hold; they sit here,
below both the climate files and the project store, so that neither imports the other.
Units are in the field names.
"""

from __future__ import annotations

from dataclasses import dataclass, field

#: The rows a design needs whose months an own climate may still hold as placeholders
#: (see :attr:`MonthlyClimate.months_to_type`), with the word the user is told.
ROWS_TO_TYPE = {"insolation_kwh_m2_day": "sun", "temp_mean_c": "mean temperature"}
MONTH_NAMES = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def month_spans(months: tuple[int, ...]) -> str:
    """``(1, 2, 3, 5)`` -> ``"Jan-Mar, May"``."""
    spans: list[list[int]] = []
    for m in sorted(months):
        if spans and m == spans[-1][-1] + 1:
            spans[-1].append(m)
        else:
            spans.append([m])
    return ", ".join(
        MONTH_NAMES[s[0] - 1] + (f"-{MONTH_NAMES[s[-1] - 1]}" if len(s) > 1 else "") for s in spans
    )


def to_type_text(rows: dict[str, tuple[int, ...]]) -> str:
    """Months still to type, by row, in the user's words: ``"sun Feb-Dec; mean
    temperature Jan-Dec"`` (empty: nothing to type)."""
    return "; ".join(f"{ROWS_TO_TYPE.get(k, k)} {month_spans(m)}" for k, m in rows.items())


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
    # Months (1-12) of a row (a key of ROWS_TO_TYPE) that still hold placeholders, not
    # data: an own climate started from nothing, until the user types them.  Empty: none.
    months_to_type: dict[str, tuple[int, ...]] = field(default_factory=dict)

    def still_to_type(self) -> dict[str, tuple[int, ...]]:
        """The rows with months still to type, months sorted (empty: every month is data)."""
        return {k: tuple(sorted(set(m))) for k, m in self.months_to_type.items() if m}

    def to_type_text(self) -> str:
        """``"sun Feb-Dec; mean temperature Jan-Dec"`` (empty: nothing to type)."""
        return to_type_text(self.still_to_type())


@dataclass
class DailyClimate:
    """One value per day of a 365-day year, 1 January first (29 February left out)."""

    insolation_kwh_m2_day: list[float]
    temp_mean_c: list[float]
    temp_max_c: list[float]
    temp_min_c: list[float]
