"""Overcurrent protection and disconnects of the DC side.

Ratings follow NFPA 70 (NEC) 2023: Table 240.6(A) standard ampere ratings
(10 A is a standard rating for breakers and fuses in the 2023 edition; 1, 3,
6 and 601 A are fuse-only), 690.8 and 690.9 for PV circuits, 706.15 for the
energy-storage disconnect.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from offgrid.design.result import DesignError

#: NEC 2023 Table 240.6(A) standard ratings [A] (as transcribed, V).
STANDARD_RATINGS_A = (
    10,
    15,
    20,
    25,
    30,
    35,
    40,
    45,
    50,
    60,
    70,
    80,
    90,
    100,
    110,
    125,
    150,
    175,
    200,
    225,
    250,
    300,
    350,
    400,
    450,
    500,
    600,
    700,
    800,
    1000,
    1200,
    1600,
    2000,
    2500,
    3000,
    4000,
    5000,
    6000,
)
#: NEC 2023 240.6(A): additional standard ratings for fuses only [A].
FUSE_ONLY_RATINGS_A = (1, 3, 6, 601)

#: Prospective short-circuit current of one battery unit per ampere-hour of capacity, used
#: only when the datasheet value is not given (from memory, no source: use the datasheet).
SHORT_CIRCUIT_A_PER_AH = {"flooded": 10.0, "agm": 20.0, "gel": 12.0, "lifepo4": 40.0}


def standard_rating_a(
    current_a: float, fuse: bool = True, what: str = "", field: str | None = None
) -> int:
    """Smallest NEC 240.6(A) standard rating at or above ``current_a`` [A].

    ``what`` names the circuit and ``field`` the project value behind it, for the message
    when no standard rating is large enough.
    """
    ratings = sorted(STANDARD_RATINGS_A + (FUSE_ONLY_RATINGS_A if fuse else ()))
    for r in ratings:
        if r >= current_a - 1e-9:
            return r
    circuit = f"The {what} needs" if what else "The circuit needs"
    raise DesignError(
        "no-standard-rating",
        f"{circuit} an overcurrent device of at least "
        f"{current_a:.0f} A, above the largest standard rating ({ratings[-1]} A, "
        "NEC 240.6(A)): raise the system voltage or split the circuit"
        + (f" (check {field})" if field else "")
        + ".",
        field=field,
    )


def pv_max_current_a(isc_a: float, strings: int) -> float:
    """NEC 690.8(A)(1): maximum PV circuit current = 1.25 x sum of parallel Isc [A]."""
    return 1.25 * isc_a * strings


def pv_fuse_min_a(isc_a: float, strings: int) -> float:
    """NEC 690.9(B): device rating >= 1.25 x the 690.8(A) current = 1.5625 x Isc sum [A]."""
    return 1.25 * pv_max_current_a(isc_a, strings)


def string_fuses_needed(
    strings_in_parallel: int, isc_a: float, module_max_fuse_a: float | None
) -> bool:
    """Whether each PV string needs its own fuse.

    NEC 690.9(A) (2020/2023): a PV source circuit needs overcurrent protection
    unless no fault current from parallel circuits can exceed its conductor or
    module rating; one or two strings cannot back-feed more than one string's
    current, so fuses are needed from three strings in parallel (common reading
    of the rule).  With the module's maximum series fuse rating known, fuses
    are needed when the back-feed (Np - 1) x 1.25 Isc exceeds it (IEC 62548:2016
    clause 7.3.3 criterion, from memory).
    """
    if strings_in_parallel < 3:
        return False
    if module_max_fuse_a is None:
        return True
    return (strings_in_parallel - 1) * 1.25 * isc_a > module_max_fuse_a


def string_fuse_rating_a(isc_a: float, module_max_fuse_a: float | None) -> int:
    """String fuse: the standard rating at or above 1.5625 Isc, not above the module's limit."""
    rating = standard_rating_a(pv_fuse_min_a(isc_a, 1), what="PV string fuse", field="module.isc_a")
    if module_max_fuse_a is not None and rating > module_max_fuse_a:
        raise DesignError(
            "string-fuse",
            f"The string fuse must be at least {pv_fuse_min_a(isc_a, 1):.1f} A "
            f"(1.56 x Isc, NEC 690.9(B)) and the nearest standard rating is {rating} A, above "
            f"the module's maximum series fuse of {module_max_fuse_a:.4g} A: check that rating on "
            "the datasheet, or keep to two strings per controller.",
            field="wiring.module_max_fuse_a",
        )
    return rating


def unit_short_circuit_a(
    chemistry: str, capacity_ah: float, datasheet_a: float | None
) -> tuple[float, bool]:
    """Prospective short-circuit current of one battery unit [A], and whether estimated."""
    if datasheet_a is not None:
        if not (datasheet_a > 0 and math.isfinite(datasheet_a)):
            raise DesignError(
                "battery-short-circuit",
                "The battery unit's short-circuit current must be a positive number of amperes.",
                field="wiring.battery_short_circuit_a",
            )
        return float(datasheet_a), False
    return SHORT_CIRCUIT_A_PER_AH.get(chemistry, 20.0) * capacity_ah, True


def bank_fault_current_a(unit_short_circuit: float, strings_in_parallel: int) -> float:
    """Bank prospective fault current: the sum over its parallel strings [A].

    Units in series add voltage and internal resistance alike, so a string
    delivers about one unit's short-circuit current (common practice, no source).
    """
    return unit_short_circuit * strings_in_parallel


@dataclass(frozen=True)
class Device:
    """One overcurrent device or disconnect."""

    location: str
    kind: str  # "fuse", "fuse or breaker", "disconnect"
    rating_a: float | None
    voltage_v: float  # minimum DC voltage rating
    count: int = 1
    interrupt_rating_a: float | None = None  # minimum DC interrupting rating
    note: str = ""
    source: str = ""
