"""Standard ratings the steps round up to, and the code's continuous-current factor."""

from __future__ import annotations

#: Common charge-controller current ratings, A (common practice, no source).
CONTROLLER_RATINGS_A = (10, 15, 20, 30, 40, 50, 60, 80, 100)
#: Common inverter continuous ratings, W (common practice, no source).
INVERTER_RATINGS_W = (
    150,
    300,
    500,
    800,
    1000,
    1500,
    2000,
    3000,
    4000,
    5000,
    6000,
    8000,
    10000,
    12000,
    15000,
)
NEC_CONTINUOUS = 1.25  # NEC 690.8(A)(1) and 690.8(B)(1), NFPA 70-2023


def next_rating(value: float, ratings: tuple[float, ...]) -> float | None:
    """The smallest of ``ratings`` at or above ``value`` (None above the largest)."""
    for r in ratings:
        if r >= value - 1e-9:
            return r
    return None
