"""Household electricity access tiers of the ESMAP Multi-Tier Framework (MTF).

Only the *capacity* attribute is placed here, by its two published indicators:
the peak power the supply can deliver and the daily energy it can supply.  A
design sits in the highest tier whose minimum both indicators reach; below the
Tier 1 minimum it is Tier 0.

The thresholds are those of the 2015 edition as recalled (values from memory,
not checked against the document: see the tests).  The 2014 edition's capacity
tiers differ, so the edition is part of every name here.

References
----------
.. [1] Bhatia, M. and Angelou, N., *Beyond Connections: Energy Access Redefined*,
   ESMAP Technical Report 008/15, World Bank, Washington DC, 2015, table of the
   capacity attribute for household electricity supply.
"""

from __future__ import annotations

import numpy as np

MTF_EDITION = "ESMAP Multi-Tier Framework, Beyond Connections (Bhatia & Angelou 2015)"
#: Minimum peak capacity [W] of Tiers 1-5, 2015 edition [1] (from memory).
MTF2015_MIN_CAPACITY_W = (3.0, 50.0, 200.0, 800.0, 2000.0)
#: Minimum daily energy [Wh/day] of Tiers 1-5, 2015 edition [1] (from memory).
MTF2015_MIN_DAILY_ENERGY_WH = (12.0, 200.0, 1000.0, 3400.0, 8200.0)
TIER_NAMES = ("Tier 0", "Tier 1", "Tier 2", "Tier 3", "Tier 4", "Tier 5")


def _tier(values, minima) -> np.ndarray:
    v = np.asarray(values, dtype=float)
    if np.any(~np.isfinite(v)) or np.any(v < 0):
        raise ValueError("access tiers need finite, non-negative power and energy values")
    return np.searchsorted(np.asarray(minima, dtype=float), v, side="right").astype(int)


def mtf2015_capacity_tier(peak_capacity_w):
    """Tier 0-5 reached by peak capacity alone [W] (MTF 2015 [1]); same shape as the input."""
    return _tier(peak_capacity_w, MTF2015_MIN_CAPACITY_W)


def mtf2015_energy_tier(daily_energy_wh):
    """Tier 0-5 reached by daily energy alone [Wh/day] (MTF 2015 [1])."""
    return _tier(daily_energy_wh, MTF2015_MIN_DAILY_ENERGY_WH)


def mtf2015_tier(peak_capacity_w, daily_energy_wh):
    """Tier 0-5 of the capacity attribute: the lower of the power and the energy tier.

    Parameters
    ----------
    peak_capacity_w : float or array
        Peak power the system can deliver [W].
    daily_energy_wh : float or array
        Daily energy it can supply to the appliances [Wh/day].

    Returns
    -------
    int array of tiers (0 = below Tier 1), broadcast shape of the inputs.

    References
    ----------
    .. [1] Bhatia & Angelou (2015), see the module docstring.
    """
    return np.minimum(mtf2015_capacity_tier(peak_capacity_w), mtf2015_energy_tier(daily_energy_wh))


def tier_reason() -> tuple[str, str]:
    """Formula in words and source text for the reason book."""
    mins = ", ".join(
        f"Tier {i + 1} {p:g} W / {e:g} Wh"
        for i, (p, e) in enumerate(
            zip(MTF2015_MIN_CAPACITY_W, MTF2015_MIN_DAILY_ENERGY_WH, strict=True)
        )
    )
    return (
        f"the highest tier whose minimum peak capacity and minimum daily energy are both "
        f"met ({mins}); peak capacity = inverter continuous rating + connected DC power; "
        "daily energy = design-month appliance energy with the growth margin",
        f"{MTF_EDITION}, capacity attribute (thresholds from memory)",
    )
