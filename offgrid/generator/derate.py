"""Generator output at site altitude and temperature.

Two methods, both reduce the rating given at the standard reference conditions:

``common_practice``
    A straight-line derate: ``alt_pct`` per 300 m above ``alt_above_m`` and ``temp_pct``
    per 5 C above ``temp_above_c``.  This is the form makers print on datasheets; the
    default figures (3 % per 300 m above 1000 m, 2 % per 5 C above 25 C) are common
    practice, from memory, and should be replaced by the datasheet's own.
``iso3046``
    The power adjustment of ISO 3046-1 (reciprocating internal combustion engines,
    same method in ISO 8528-1 for generating sets), from memory::

        k     = (p_x / p_r) ** m  x  (T_r / T_x) ** n
        alpha = k - 0.7 (1 - k) (1 / eta_m - 1)

    with the reference conditions p_r = 100 kPa, T_r = 298 K (25 C), 30 % relative
    humidity (humidity not modelled here), mechanical efficiency eta_m = 0.8 where the
    maker gives none, and the exponents of a naturally aspirated diesel engine m = 1,
    n = 0.75 (from memory; other engine types have other exponents: pass them).

The site pressure is the ISO 2533 standard atmosphere (troposphere)::

    p = 101.325 kPa x (1 - 2.25577e-5 x h) ** 5.25588        h in m

References
----------
ISO 3046-1:2002, Reciprocating internal combustion engines - Performance - Part 1
(sec. 10, power adjustment; formula and exponents from memory).
ISO 8528-1:2018, Reciprocating internal combustion engine driven alternating current
generating sets - Part 1 (site conditions, by reference to ISO 3046-1).
ISO 2533:1975, Standard Atmosphere.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design.result import Reason, fmt

ISO_P_REF_KPA = 100.0
ISO_T_REF_C = 25.0
ISO_ETA_M = 0.8  # mechanical efficiency where the maker gives none (from memory)
ISO_NA_DIESEL_M = 1.0  # pressure exponent, naturally aspirated diesel (from memory)
ISO_NA_DIESEL_N = 0.75  # temperature exponent, naturally aspirated diesel (from memory)
SOURCE_ISO = (
    "ISO 3046-1:2002 sec. 10 power adjustment (as used by ISO 8528-1), exponents m = 1, "
    "n = 0.75 for a naturally aspirated diesel and eta_m = 0.8 from memory; pressure "
    "from the ISO 2533 standard atmosphere"
)
SOURCE_COMMON = (
    "common practice, from memory: straight-line derate per 300 m and per 5 C "
    "(take the datasheet's figures)"
)
MIN_DERATE_FACTOR = 0.4  # below this the site is beyond any datasheet's derating table


def standard_pressure_kpa(altitude_m):
    """Pressure of the ISO 2533 standard atmosphere at ``altitude_m`` [m] -> [kPa].

    Valid in the troposphere (below 11 km).
    """
    h = np.asarray(altitude_m, dtype=float)
    return 101.325 * (1.0 - 2.25577e-5 * h) ** 5.25588


def derate_iso3046(
    altitude_m,
    temp_c,
    *,
    m: float = ISO_NA_DIESEL_M,
    n: float = ISO_NA_DIESEL_N,
    eta_m: float = ISO_ETA_M,
    p_ref_kpa: float = ISO_P_REF_KPA,
    t_ref_c: float = ISO_T_REF_C,
):
    """ISO 3046-1 power adjustment factor alpha [-] at a site (1 at the reference conditions).

    No credit is taken above 1 (a site colder or lower than the reference keeps the rating).
    """
    p = standard_pressure_kpa(altitude_m)
    t = np.asarray(temp_c, dtype=float) + 273.15
    k = (p / p_ref_kpa) ** m * ((t_ref_c + 273.15) / t) ** n
    alpha = k - 0.7 * (1.0 - k) * (1.0 / eta_m - 1.0)
    return np.minimum(alpha, 1.0)


def derate_common_practice(
    altitude_m,
    temp_c,
    *,
    alt_pct_per_300m: float = 3.0,
    alt_above_m: float = 1000.0,
    temp_pct_per_5c: float = 2.0,
    temp_above_c: float = 25.0,
):
    """Straight-line derate factor [-]: 1 - alt share - temperature share (from memory)."""
    h = np.asarray(altitude_m, dtype=float)
    t = np.asarray(temp_c, dtype=float)
    alt = alt_pct_per_300m / 100.0 * np.maximum(h - alt_above_m, 0.0) / 300.0
    hot = temp_pct_per_5c / 100.0 * np.maximum(t - temp_above_c, 0.0) / 5.0
    return 1.0 - alt - hot


@dataclass(frozen=True)
class Derating:
    method: str
    altitude_m: float
    temp_c: float
    pressure_kpa: float
    factor: float
    rated_kw: float
    derated_kw: float
    reason: Reason


def derated_output(
    rated_kw: float,
    altitude_m: float,
    temp_c: float,
    method: str = "common_practice",
    **coefficients: float,
) -> Derating:
    """The generator's continuous output at the site [kW], with its reason.

    Raises ValueError (naming the field) when the method is unknown or the derate leaves
    less than 40 % of the rating.
    """
    p = float(standard_pressure_kpa(altitude_m))
    if method == "iso3046":
        f = float(derate_iso3046(altitude_m, temp_c))
        formula = (
            "rating x alpha; alpha = k - 0.7 (1 - k)(1/eta_m - 1), k = (p/100 kPa)^m (298 K / T)^n"
        )
        source = SOURCE_ISO
    elif method == "common_practice":
        f = float(derate_common_practice(altitude_m, temp_c, **coefficients))
        formula = "rating x (1 - % per 300 m above the threshold - % per 5 C above the threshold)"
        source = SOURCE_COMMON
    else:
        raise ValueError(f"generator.derate_method: '{method}' must be common_practice or iso3046")
    if not f >= MIN_DERATE_FACTOR:
        raise ValueError(
            f"generator.altitude_m: the derate leaves {f:.0%} of the rating at "
            f"{altitude_m:g} m and {temp_c:g} C; check the altitude, the hottest temperature "
            "and the derate figures against the datasheet"
        )
    inputs = (
        ("rating", fmt(rated_kw, "kW")),
        ("altitude", fmt(altitude_m, "m")),
        ("hottest temperature", fmt(temp_c, "C")),
        ("pressure", fmt(p, "kPa")),
        ("factor", fmt(f)),
        *((k, fmt(v)) for k, v in coefficients.items()),
    )
    return Derating(
        method,
        float(altitude_m),
        float(temp_c),
        p,
        f,
        rated_kw,
        rated_kw * f,
        Reason(formula, inputs, source),
    )
