"""String window: how many modules in series a charge controller accepts, and the layout.

The largest series count keeps the cold open-circuit voltage at the site's
record low within the controller's maximum PV input voltage (NEC 690.7(A):
with the module's Voc coefficient, or the factors of Table 690.7(A) when the
datasheet has none).  The smallest keeps the hot maximum-power voltage above
what the battery needs: for an MPPT controller its absorption voltage plus
the controller's start-up margin, for a PWM controller the absorption
voltage plus the wiring drop at STC (the module's suitability; the array is
switched straight onto the battery, and the harvest from the I-V curves shows
what the heat takes).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from offgrid.design.result import DesignError

#: NEC Table 690.7(A) (as transcribed, V): (lowest expected ambient, lower end of the row C,
#: factor), for crystalline and multicrystalline silicon modules.
NEC_690_7_ROWS = (
    (20, 1.02),
    (15, 1.04),
    (10, 1.06),
    (5, 1.08),
    (0, 1.10),
    (-5, 1.12),
    (-10, 1.14),
    (-15, 1.16),
    (-20, 1.18),
    (-25, 1.20),
    (-30, 1.21),
    (-35, 1.23),
    (-40, 1.25),
)
#: An MPPT (buck) controller needs its PV input above the battery voltage: battery absorption
#: voltage + this margin [V] (common practice, no source; check the controller's manual).
MPPT_MARGIN_V = 5.0


def nec_690_7_factor(record_low_c: float) -> float:
    """Voc correction factor of NEC Table 690.7(A) for the lowest expected ambient [C].

    Rows run 24 to 20 C, 19 to 15 C, ...; a temperature between two rows takes
    the colder row (the larger factor).  25 C and above: 1.00.
    """
    if record_low_c >= 25:
        return 1.0
    for lower, factor in NEC_690_7_ROWS:
        if record_low_c >= lower:
            return factor
    raise DesignError(
        "record-low",
        f"The record low {record_low_c:.1f} C is below the -40 C end of NEC Table "
        "690.7(A): enter the module's Voc temperature coefficient.",
        field="module.beta_voc_pct_per_c",
    )


def voc_cold_v(
    voc_stc_v: float, beta_voc_pct_per_c: float | None, record_low_c: float
) -> tuple[float, str]:
    """Module Voc at the record low [V] and the rule used.

    With a coefficient (NEC 690.7(A)(1)): Voc [1 + beta/100 (Tlow - 25)], no
    reduction above 25 C.  Without: Voc x the Table 690.7(A) factor.
    """
    if beta_voc_pct_per_c is None:
        f = nec_690_7_factor(record_low_c)
        return voc_stc_v * f, f"NEC Table 690.7(A) factor {f:.2f}"
    dt = min(record_low_c - 25.0, 0.0)
    return voc_stc_v * (1.0 + beta_voc_pct_per_c / 100.0 * dt), (
        f"datasheet coefficient {beta_voc_pct_per_c:g} %/C, NEC 690.7(A)(1)"
    )


@dataclass(frozen=True)
class StringWindow:
    controller_type: str
    max_pv_voltage_v: float
    voc_cold_v: float  # one module
    vmp_hot_v: float  # one module
    required_vmp_v: float  # string Vmp the battery side needs
    min_series: int
    max_series: int
    hot_vmp_short: bool = False  # PWM: the smallest string's hot Vmp is below the need


@dataclass(frozen=True)
class Layout:
    series: int
    parallel: int  # strings in the whole array
    controllers: int
    strings_per_controller: int  # the largest share (all equal when it divides)
    module_count: int


def string_window(
    controller_type: str,
    max_pv_voltage_v: float,
    voc_cold_module_v: float,
    vmp_hot_module_v: float,
    absorption_v: float,
    pwm_drop_v: float = 0.0,
    vmp_stc_module_v: float | None = None,
) -> StringWindow:
    """Smallest and largest series count; DesignError when none fits.

    MPPT: the hot string Vmp must reach absorption + margin.  PWM: the module's
    suitability for the battery, i.e. the string Vmp at STC must reach absorption
    + wiring drop (with ``vmp_stc_module_v``; otherwise the hot Vmp is used);
    ``hot_vmp_short`` then says whether the string falls below it in the heat.
    """
    if not max_pv_voltage_v > 0:
        raise DesignError(
            "controller-voltage",
            "The controller's maximum PV input voltage must be positive.",
            field="controller.max_pv_voltage_v",
        )
    if controller_type == "mppt":
        need = absorption_v + MPPT_MARGIN_V
        need_text = f"absorption {absorption_v:.1f} V + {MPPT_MARGIN_V:g} V MPPT margin"
    elif controller_type == "pwm":
        need = absorption_v + pwm_drop_v
        need_text = f"absorption {absorption_v:.1f} V + {pwm_drop_v:.1f} V wiring drop"
    else:
        raise DesignError(
            "controller-type",
            f"Controller type must be 'pwm' or 'mppt' (got {controller_type!r}).",
            field="controller.type",
        )
    max_s = math.floor(max_pv_voltage_v / voc_cold_module_v + 1e-9)
    basis = vmp_hot_module_v
    if controller_type == "pwm" and vmp_stc_module_v is not None:
        basis = vmp_stc_module_v
    min_s = max(1, math.ceil(need / basis - 1e-9))
    if max_s < 1:
        raise DesignError(
            "string-window",
            "The controller's string window is empty, no series count fits: "
            f"one module's cold Voc ({voc_cold_module_v:.1f} V at the record low) is above the "
            f"controller's {max_pv_voltage_v:g} V maximum PV input. To fix: choose a controller "
            "rated for a higher PV voltage.",
            field="controller.max_pv_voltage_v",
        )
    if min_s > max_s:
        fixes = [
            f"choose a controller with a maximum PV input of at least "
            f"{math.ceil(min_s * voc_cold_module_v)} V",
            "a lower system voltage",
        ]
        if controller_type == "pwm":
            fixes.append("an MPPT controller")
        fix = ", ".join(fixes[:-1]) + ", or " + fixes[-1]
        raise DesignError(
            "string-window",
            "The controller's string window is empty, no series count fits: the battery "
            f"needs a string Vmp of {need:.1f} V ({need_text}) when hot, so at least "
            f"{min_s} modules of {basis:.1f} V; but at the record low each "
            f"module's Voc is {voc_cold_module_v:.1f} V, so at most {max_s} fit under "
            f"{max_pv_voltage_v:g} V. To fix: {fix}.",
            field="controller.max_pv_voltage_v",
        )
    return StringWindow(
        controller_type,
        max_pv_voltage_v,
        voc_cold_module_v,
        vmp_hot_module_v,
        need,
        min_s,
        max_s,
        min_s * vmp_hot_module_v < need - 1e-9,
    )


def choose_layout(window: StringWindow, modules_required: int, controllers: int) -> Layout:
    """Series x parallel layout with at least ``modules_required`` modules.

    PWM: the smallest series count (more only wastes the extra voltage).  MPPT:
    of the series counts in the window, the fewest modules in total, then the
    fewest strings per controller (no string fuses up to two, NEC 690.9(A)), then
    the higher voltage.  Strings are shared equally between the controllers.
    """
    if modules_required < 1:
        raise DesignError("array-empty", "The array needs at least one module.")
    controllers = max(1, int(controllers))
    options = (
        [window.min_series]
        if window.controller_type == "pwm"
        else range(window.min_series, window.max_series + 1)
    )
    best = None
    for s in options:
        per_ctrl = math.ceil(math.ceil(modules_required / s) / controllers)
        p = per_ctrl * controllers
        key = (s * p, per_ctrl >= 3, per_ctrl, -s)
        if best is None or key < best[0]:
            best = (key, Layout(s, p, controllers, per_ctrl, s * p))
    return best[1]


def layout_fits(window: StringWindow, series: int) -> bool:
    return window.min_series <= series <= window.max_series
