"""Month names and the twelve-month tuples the result records hold."""

from __future__ import annotations

import numpy as np

from offgrid.climate.model import MONTH_NAMES as MONTHS  # noqa: F401  (re-exported)


def as_tuple(values) -> tuple[float, ...]:
    """Plain floats of a month array, for a frozen result record."""
    return tuple(float(x) for x in np.asarray(values, dtype=float))
