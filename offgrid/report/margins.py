"""The month with the smallest margin, and why it need not be the design month.

The design month is the month whose supply, with that month's derates, covers its
demand by the smallest share (supply / demand): the array is sized on it. The
smallest margin is the fewest watt-hours a day to spare (supply - demand). With a
demand that changes from month to month the two can fall in different months: a
month of less demand can have fewer watt-hours to spare while being covered by a
larger share (worst-month method, common practice, no source).
"""

from __future__ import annotations

from collections.abc import Sequence

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def smallest_margin_month(supply_wh_day: Sequence[float], demand_wh_day: Sequence[float]) -> int:
    """0-based month of the smallest supply - demand [Wh/day] (the first one on a tie)."""
    margins = [s - d for s, d in zip(supply_wh_day, demand_wh_day, strict=True)]
    return margins.index(min(margins))


def _month(m: int, supply: Sequence[float], demand: Sequence[float]) -> str:
    spare = supply[m] - demand[m]
    share = f"{supply[m] / demand[m] - 1:+.0%}" if demand[m] > 0 else "no demand"
    return (
        f"{MONTHS[m]}: supply {supply[m]:,.0f} Wh/day for {demand[m]:,.0f} Wh/day of demand "
        f"({share}, {spare:+,.0f} Wh/day)"
    )


def margin_sentences(
    design_month: int, supply_wh_day: Sequence[float], demand_wh_day: Sequence[float]
) -> str:
    """The smallest-margin sentence; when it is not the design month (0-based), why not."""
    low = smallest_margin_month(supply_wh_day, demand_wh_day)
    s, d = supply_wh_day, demand_wh_day
    head = f"Smallest margin: {_month(low, s, d)}."
    if low == design_month:
        return head + " It is the design month, the month the array is sized on."
    which = "less" if d[low] < d[design_month] else "more"
    return (
        f"{head} It is not the design month ({_month(design_month, s, d)}) because the two "
        "measure different things: the design month is the month whose supply, with that "
        "month's derates, covers its demand by the smallest share, and the array is sized on "
        "it; the smallest margin is the fewest watt-hours a day to spare. "
        f"{MONTHS[low]} has {which} demand than {MONTHS[design_month]}, so it can have fewer "
        "watt-hours to spare while its supply covers a larger share of its demand."
    )
