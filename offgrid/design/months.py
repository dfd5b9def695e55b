"""Month names and the twelve-month tuples the result records hold."""

from __future__ import annotations

import numpy as np

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def as_tuple(values) -> tuple[float, ...]:
    """Plain floats of a month array, for a frozen result record."""
    return tuple(float(x) for x in np.asarray(values, dtype=float))
