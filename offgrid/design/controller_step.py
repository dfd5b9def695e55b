"""Step 7: charge controllers, their count and current rating, and the layout they share.

The strings share out equally between the controllers; each controller's share of whole
strings may not ask more than its rating (NEC 690.8 continuous factors).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from offgrid.design.protection import pv_fuse_min_a
from offgrid.design.ratings import CONTROLLER_RATINGS_A, NEC_CONTINUOUS, next_rating
from offgrid.design.result import ControllerResult, DesignError, Reason, ReasonBook, fmt
from offgrid.design.strings import Layout, StringWindow, choose_layout
from offgrid.project.model import ControllerSpec, ModuleSpec

#: More charge controllers than this on one battery bus is refused (common practice, no
#: source: a system that large wants a higher voltage or splitting).
MAX_CONTROLLERS = 20


@dataclass(frozen=True)
class ControllerStep:
    controller: ControllerResult
    reasons: dict[str, Reason]


def controller_ratings(spec: ControllerSpec) -> tuple[float, ...]:
    """The user's one rating (``controller.max_current_a``), else the common ratings."""
    if spec.max_current_a:
        return (float(spec.max_current_a),)
    return CONTROLLER_RATINGS_A


def controller_input_current_a(
    ctype: str, isc_a: float, strings: int, power_w: float, system_v: float
) -> float:
    """Current ``strings`` strings of ``power_w`` together ask of one controller [A].

    PWM: 1.25 x 1.25 x Isc x strings (NEC 690.8(A)(1) and (B)(1)); MPPT: 1.25 x power /
    battery voltage (the converter's output current with the continuous factor).
    """
    if ctype == "pwm":  # the same product as the PV circuit's device minimum
        return pv_fuse_min_a(isc_a, strings)
    return NEC_CONTINUOUS * power_w / system_v


def string_current_a(spec: ControllerSpec, module: ModuleSpec, series: int, system_v: int) -> float:
    """Current one string of ``series`` modules asks of its controller [A]."""
    return controller_input_current_a(spec.type, module.isc_a, 1, series * module.pmax_w, system_v)


def layout_with_controllers(
    spec: ControllerSpec, module: ModuleSpec, window: StringWindow, n_need: int, system_v: int
) -> Layout:
    """Series x parallel layout and the number of controllers sharing it equally.

    The controller count rises until each controller's share of whole strings is within
    the largest rating; DesignError when one string alone is too much for a controller or
    when more than MAX_CONTROLLERS would be needed.
    """
    m = module
    top = max(controller_ratings(spec))
    fix = (
        "raise the system voltage, set a larger controller rating in "
        "controller.max_current_a, or split the loads into several systems"
    )
    if spec.type == "mppt":
        s_fit = math.floor(top * system_v / (NEC_CONTINUOUS * m.pmax_w) + 1e-9)
        if s_fit < window.min_series:
            s = window.min_series
            raise DesignError(
                "controller-current",
                f"One string of {s} module{'s' if s > 1 else ''} "
                f"({s * m.pmax_w:.0f} W, the "
                f"fewest in series the battery voltage allows) needs "
                f"{string_current_a(spec, m, s, system_v):.0f} A from its MPPT controller "
                f"(1.25 x power / {system_v} V), more than the {top:.4g} A rating: {fix}.",
                "controller.max_current_a",
            )
        window = replace(window, max_series=min(window.max_series, s_fit))
    elif string_current_a(spec, m, 1, system_v) > top + 1e-9:
        raise DesignError(
            "controller-current",
            f"One string (Isc {m.isc_a:g} A) needs "
            f"{string_current_a(spec, m, 1, system_v):.1f} A from its PWM controller (1.25 x "
            f"1.25 x Isc, NEC 690.8), more than the {top:.4g} A rating: set a larger controller "
            "rating in controller.max_current_a, or choose an MPPT controller.",
            "controller.max_current_a",
        )
    n_ctrl = 1
    while True:
        layout = choose_layout(window, n_need, n_ctrl)
        i_str = string_current_a(spec, m, layout.series, system_v)
        if layout.strings_per_controller * i_str <= top + 1e-9:
            return layout
        n_ctrl = max(n_ctrl + 1, math.ceil(layout.parallel * i_str / top - 1e-9))
        if n_ctrl > MAX_CONTROLLERS:
            raise DesignError(
                "controller-count",
                f"The array of about {n_need} modules of {m.pmax_w:.0f} W "
                f"needs more than {MAX_CONTROLLERS} charge controllers of {top:.4g} A at "
                f"{system_v} V, more than one battery bus should carry: {fix}.",
                "controller.max_current_a",
            )


def size_controller(
    spec: ControllerSpec,
    module: ModuleSpec,
    n_par: int,
    power_w: float,
    system_v: int,
    count: int = 1,
) -> ControllerStep:
    """Current with the code's factors, the next standard rating, ``count`` controllers.

    The strings share out equally between the ``count`` controllers, so each carries
    ``required / count``.
    """
    book = ReasonBook()
    req = controller_input_current_a(spec.type, module.isc_a, n_par, power_w, system_v)
    if spec.type == "pwm":
        book.add(
            "controller.required_current_a",
            "1.25 x 1.25 x Isc x strings in parallel",
            "NEC 690.8(A)(1) maximum circuit current and 690.8(B)(1) continuous factor, "
            "NFPA 70-2023",
            isc=fmt(module.isc_a, "A"),
            parallel=str(n_par),
        )
    else:
        book.add(
            "controller.required_current_a",
            "1.25 x array power / battery voltage",
            "output current of an MPPT converter; 1.25 continuous factor as NEC 690.8(B)(1)",
            array=fmt(power_w, "W"),
            battery=fmt(system_v, "V"),
        )
    ratings = controller_ratings(spec)
    count = max(1, int(count))
    per = req / count
    rating = next_rating(per, ratings) or max(ratings)
    book.add(
        "controller.current_a",
        "next standard rating at or above the required current "
        "per controller (the strings share out equally between the controllers)",
        "common practice, no source",
        required=fmt(req, "A"),
        controllers=str(count),
        per_controller=fmt(per, "A"),
    )
    book.add(
        "controller.count",
        "fewest controllers whose equal share of whole strings each "
        "stays within the largest rating",
        "common practice, no source",
        strings=str(n_par),
        largest_rating=fmt(max(ratings), "A"),
    )
    book.given("controller.efficiency", "controller.efficiency", fmt(spec.efficiency))
    result = ControllerResult(
        type=spec.type,
        required_current_a=float(req),
        current_a=float(rating),
        count=count,
        max_pv_voltage_v=spec.max_pv_voltage_v,
        efficiency=spec.efficiency,
    )
    return ControllerStep(result, book.freeze())
