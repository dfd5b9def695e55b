"""Step 8: the inverter's continuous and surge rating from the AC loads."""

from __future__ import annotations

import math
from dataclasses import dataclass

from offgrid.design.ratings import INVERTER_RATINGS_W, NEC_CONTINUOUS, next_rating
from offgrid.design.result import InverterResult, LoadResult, Notice, Reason, ReasonBook, fmt
from offgrid.project.model import InverterSpec

#: Surge an inverter carries for a few seconds, as a multiple of its continuous rating.
INVERTER_SURGE_MULTIPLE = 2.0
#: Low-voltage cut-off per nominal volt: 10.5 V per 12 V (common practice, no source).
LOW_VOLTAGE_CUTOFF_PER_V = 0.875


@dataclass(frozen=True)
class InverterStep:
    inverter: InverterResult
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def inverter_dc_current_a(continuous_w: float, efficiency: float, system_v: float) -> float:
    """DC input current at the low-voltage cut-off [A]: rating / (efficiency x cut-off)."""
    return continuous_w / (efficiency * (system_v * LOW_VOLTAGE_CUTOFF_PER_V))


def size_inverter(spec: InverterSpec, loads: LoadResult, system_v: int) -> InverterStep:
    """Continuous rating: next standard at or above 1.25 x the AC power on at once, raised
    until its surge covers the loads' starting need; DC input current at the cut-off."""
    book = ReasonBook()
    notices: list[Notice] = []
    if not loads.connected_ac_w > 0:
        for key in (
            "continuous_w",
            "required_continuous_w",
            "surge_w",
            "required_surge_w",
            "dc_input_current_a",
            "self_consumption_w",
        ):
            book.add(f"inverter.{key}", "no AC loads: no inverter", "common practice")
        book.given("inverter.efficiency", "inverter.efficiency", fmt(spec.efficiency))
        none = InverterResult(False, 0.0, 0.0, 0.0, 0.0, spec.efficiency, 0.0, 0.0)
        return InverterStep(none, book.freeze(), ())
    from offgrid.design.loads import SURGE_FORMULA

    req_cont = loads.peak_ac_w * NEC_CONTINUOUS
    req_surge = loads.surge_need_w
    cont_std = next_rating(req_cont, INVERTER_RATINGS_W)
    surge_std = next_rating(req_surge / INVERTER_SURGE_MULTIPLE, INVERTER_RATINGS_W)
    cont = max(cont_std or req_cont, surge_std or req_surge / INVERTER_SURGE_MULTIPLE)
    if cont_std is None or surge_std is None:
        top = INVERTER_RATINGS_W[-1]
        notices.append(
            Notice(
                "inverter-above-ratings",
                f"No single inverter of the common ratings (up to "
                f"{top / 1000:g} kW) gives {cont:.0f} W continuous and {req_surge:.0f} W surge: "
                "use "
                f"{math.ceil(cont / top - 1e-9)} or more inverters made to share the load in "
                "parallel, or split the AC loads; the figures shown are what they must add up to.",
                "warning",
                "inverter.continuous_w",
            )
        )
    surge = cont * INVERTER_SURGE_MULTIPLE
    low_v = system_v * LOW_VOLTAGE_CUTOFF_PER_V
    dc_current = inverter_dc_current_a(cont, spec.efficiency, system_v)
    book.add(
        "inverter.required_continuous_w",
        "1.25 x the AC power on at once (peak AC "
        "power: the coincidence factor never below the largest single AC appliance)",
        "common practice, no source",
        peak=fmt(loads.peak_ac_w, "W"),
    )
    book.add(
        "inverter.continuous_w",
        "next standard rating at or above 1.25 x peak AC power, raised until its "
        f"surge ({INVERTER_SURGE_MULTIPLE:g} x continuous) covers the required surge",
        "common practice, no source",
        peak=fmt(loads.peak_ac_w, "W"),
        required=fmt(req_cont, "W"),
        required_surge=fmt(req_surge, "W"),
    )
    book.add(
        "inverter.required_surge_w",
        "surge need = " + SURGE_FORMULA,
        "common practice, no source",
        appliance=loads.surge_need_load or "none",
        coincidence_factor=fmt(loads.coincidence_factor),
        peak=fmt(loads.peak_ac_w, "W"),
        value=fmt(req_surge, "W"),
    )
    book.add(
        "inverter.surge_w",
        f"{INVERTER_SURGE_MULTIPLE:g} x the chosen continuous rating "
        "(a few seconds); it must cover the required surge, which is the " + SURGE_FORMULA,
        "common practice, no source",
        continuous=fmt(cont, "W"),
        required=fmt(req_surge, "W"),
        appliance=loads.surge_need_load or "none",
    )
    book.add(
        "inverter.dc_input_current_a",
        "continuous rating / (efficiency x low-voltage cut-off)",
        "common practice, no source",
        cutoff=fmt(low_v, "V"),
    )
    book.given("inverter.efficiency", "inverter.efficiency", fmt(spec.efficiency))
    book.given(
        "inverter.self_consumption_w",
        "inverter.self_consumption_w",
        fmt(spec.self_consumption_w, "W"),
    )
    result = InverterResult(
        True,
        float(req_cont),
        float(cont),
        float(req_surge),
        float(surge),
        spec.efficiency,
        spec.self_consumption_w,
        float(dc_current),
    )
    return InverterStep(result, book.freeze(), tuple(notices))
