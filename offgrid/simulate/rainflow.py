"""Rainflow cycle counting, ASTM E1049-85 (reapproved 2017), section 5.4.4.

References
----------
.. [1] ASTM E1049-85, Standard Practices for Cycle Counting in Fatigue
   Analysis, section 5.4.4 (rainflow counting) and Fig. 6.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

import numpy as np


def reversals(series) -> np.ndarray:
    """Peaks and valleys of a series, first and last points included.

    Repeated neighbouring values are merged first (a plateau is one point), then a
    point is kept where the slope changes sign (ASTM E1049 5.4.4: the load history
    reduced to its reversals).
    """
    x = np.asarray(series, dtype=float).ravel()
    if x.size == 0:
        return x
    if not np.all(np.isfinite(x)):
        raise ValueError("rainflow: the series has values that are not finite")
    keep = np.ones(x.size, dtype=bool)
    keep[1:] = x[1:] != x[:-1]
    y = x[keep]
    if y.size < 3:
        return y
    d = np.diff(y)
    turn = np.nonzero(d[:-1] * d[1:] < 0)[0] + 1
    return y[np.concatenate(([0], turn, [y.size - 1]))]


@dataclass(frozen=True)
class Cycles:
    """Counted cycles: range, mean and count (1 full, 0.5 half) of each."""

    range: np.ndarray
    mean: np.ndarray
    count: np.ndarray

    @property
    def total(self) -> float:
        return float(self.count.sum())


def rainflow_astm_e1049(series) -> Cycles:
    """Count cycles by the rainflow method of ASTM E1049-85 section 5.4.4 [1].

    Rules, with X the range under consideration (two most recent points) and Y
    the previous range adjacent to X:

    (a) read the next reversal; if none is left, go to (e);
    (b) if fewer than three points are held, go to (a); form X and Y;
    (c) if X < Y, go to (a);
    (d) if Y contains the starting point S, count Y as one-half cycle, discard
        the first point of Y, set S to the second point, go to (b); otherwise
        count Y as one cycle, discard both points of Y, go to (b);
    (e) count each range left as one-half cycle.
    """
    rev = reversals(series).tolist()
    rng: list[float] = []
    mean: list[float] = []
    cnt: list[float] = []
    held: list[float] = []
    for point in rev:
        held.append(point)
        while len(held) >= 3:
            x = abs(held[-1] - held[-2])
            y = abs(held[-2] - held[-3])
            if x < y:
                break
            a, b = held[-3], held[-2]
            rng.append(y)
            mean.append(0.5 * (a + b))
            if len(held) == 3:  # Y holds the starting point
                cnt.append(0.5)
                del held[0]
            else:
                cnt.append(1.0)
                del held[-3:-1]
    for a, b in itertools.pairwise(held):
        rng.append(abs(b - a))
        mean.append(0.5 * (a + b))
        cnt.append(0.5)
    return Cycles(np.array(rng), np.array(mean), np.array(cnt))


def cycle_histogram(cycles: Cycles, ndigits: int = 9) -> dict[float, float]:
    """Counts summed per range rounded to ``ndigits`` (for comparing counts)."""
    out: dict[float, float] = {}
    for r, c in zip(np.round(cycles.range, ndigits).tolist(), cycles.count.tolist(), strict=True):
        out[r] = out.get(r, 0.0) + c
    return dict(sorted(out.items()))
