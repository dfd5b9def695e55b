"""Battery chemistry presets, temperature correction of capacity, and bank layout."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class Chemistry:
    key: str
    label: str
    cell_voltage_v: float  # nominal, per cell
    absorption_v_per_cell: float  # charging (absorption) voltage at 25 C
    lead_acid: bool
    default_max_dod: float
    temp_c: tuple[float, ...]  # capacity-correction table: temperature
    temp_factor: tuple[float, ...]  # capacity needed / rated (>= 1 when cold)
    temp_source: str


#: IEEE 485 / IEEE 450 type capacity-correction factors for vented lead-acid, 25 C base
#: (as transcribed; divide rated capacity by the factor).  No credit above 25 C.
_LEAD_T = (-20.0, -10.0, 0.0, 4.4, 10.0, 15.6, 20.0, 25.0, 60.0)
_LEAD_F = (1.92, 1.65, 1.39, 1.30, 1.19, 1.11, 1.056, 1.00, 1.00)
_LEAD_SRC = (
    "IEEE Std 485 Table 1 type factors (4.4-25 C, as transcribed); below 4.4 C "
    "extended linearly, from memory"
)
#: Lithium iron phosphate: usable capacity in the cold, from memory (no standard table).
_LFP_T = (-20.0, -10.0, 0.0, 10.0, 25.0, 60.0)
_LFP_F = (1.43, 1.25, 1.11, 1.04, 1.00, 1.00)

CHEMISTRIES: dict[str, Chemistry] = {
    "flooded": Chemistry(
        "flooded", "flooded (vented) lead-acid", 2.0, 2.45, True, 0.5, _LEAD_T, _LEAD_F, _LEAD_SRC
    ),
    "agm": Chemistry(
        "agm", "valve-regulated lead-acid, AGM", 2.0, 2.40, True, 0.5, _LEAD_T, _LEAD_F, _LEAD_SRC
    ),
    "gel": Chemistry(
        "gel", "valve-regulated lead-acid, gel", 2.0, 2.35, True, 0.5, _LEAD_T, _LEAD_F, _LEAD_SRC
    ),
    "lifepo4": Chemistry(
        "lifepo4",
        "lithium iron phosphate",
        3.2,
        3.55,
        False,
        0.8,
        _LFP_T,
        _LFP_F,
        "from memory (cold capacity of LFP cells)",
    ),
}


#: Largest charge current as a fraction of capacity per hour (from memory: typical makers'
#: limits for deep-cycle batteries; lead-acid C/5 to C/4, LiFePO4 C/2).
MAX_CHARGE_C_RATE: dict[str, float] = {"flooded": 0.2, "agm": 0.25, "gel": 0.2, "lifepo4": 0.5}
#: Below this charge rate a lead-acid bank seldom reaches full charge (common practice, no
#: source: C/50, well below the C/10-C/20 usually advised).
MIN_LEAD_ACID_CHARGE_C_RATE = 0.02


def capacity_temperature_factor(chemistry: str, temp_c: float) -> float:
    """Capacity needed per unit of rated capacity at ``temp_c`` (1.0 at 25 C, > 1 when cold)."""
    chem = CHEMISTRIES[chemistry]
    return float(np.interp(temp_c, chem.temp_c, chem.temp_factor))


def cells_per_unit(chemistry: str, unit_voltage_v: float) -> int:
    return max(1, round(unit_voltage_v / CHEMISTRIES[chemistry].cell_voltage_v))


def cells_in_series(chemistry: str, system_voltage_v: float) -> float:
    """Cells in series of a bank at a nominal system voltage: 2 V a lead-acid cell, 3 V a
    lithium iron phosphate cell (its 12 V class); the one count behind the absorption
    voltage and the ventilation caution (common practice, no source)."""
    return system_voltage_v / (2.0 if CHEMISTRIES[chemistry].lead_acid else 3.0)


def absorption_voltage_v(chemistry: str, system_voltage_v: float) -> float:
    """The bank's absorption (charging) voltage at 25 C [V]: the chemistry's per-cell value x
    :func:`cells_in_series` (common practice, no source; check the battery's manual)."""
    return CHEMISTRIES[chemistry].absorption_v_per_cell * cells_in_series(
        chemistry, system_voltage_v
    )


def units_in_series(system_voltage_v: float, unit_voltage_v: float) -> int | None:
    """Whole number of units that make the system voltage, or None if they cannot.

    A 12.8 V lithium unit counts as a 12 V-class unit (nominal 12, 24, 48 V systems).
    """
    nominal_class = unit_voltage_v
    if math.isclose(unit_voltage_v % 3.2, 0, abs_tol=1e-6) or math.isclose(
        unit_voltage_v % 3.2, 3.2, abs_tol=1e-6
    ):
        nominal_class = unit_voltage_v / 3.2 * 3.0  # 4 cells of 3.2 V = 12 V class
    n = system_voltage_v / nominal_class
    if n < 1 - 1e-9 or not math.isclose(n, round(n), abs_tol=1e-6):
        return None
    return round(n)
