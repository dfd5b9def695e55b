"""The generator's lines of the bill of materials (issue 16): the set and what it needs.

:func:`generator_bom_lines` adds, when the project has a ``[generator]``, with quantities
from the project's generator and the design, each line naming the figure or the caution
(``figure = "caution:<code>"``, codes in :data:`offgrid.generator.cautions.CAUTION_CODES`)
that asks for it:

* the generator set itself (``generator.rated_kw``);
* the battery charger at ``generator.charger_kw`` DC output into the design's system
  voltage, or the inverter-charger's own charge stage (the line says so);
* a changeover switch or interlock, break-before-make, for the generator's full rated
  output (the changeover caution);
* a fuel store holding a day of running at full rated load, from the fitted fuel line
  (fuel = a x rating + b x output, :mod:`offgrid.generator.fuel`), rounded up to 5 L;
  for liquid fuels a spill kit and an extinguisher (the fuel caution);
* an exhaust run to outdoors and carbon monoxide alarms (the exhaust caution).

Counts that are the trade's habit (a day of fuel, two alarms) say ``common practice, no
source``.  Prices come from the price list like every other part; the generator itself,
when the list has no price of its own, takes ``generator.price`` (:func:`bom_prices`).
The lifecycle cost of the solar parts leaves these lines out: the generator study costs
them with their run-hour life and the fuel (:mod:`offgrid.economics.generator_costs`).
"""

from __future__ import annotations

import math

from offgrid.design.result import SystemDesign
from offgrid.economics.bom import BomLine
from offgrid.project.model import PriceItem, Project

COMMON = "common practice, no source"
#: Part kinds of the generator's lines (the solar lifecycle cost leaves them out).
GENERATOR_KINDS = frozenset(
    {"generator", "charger", "changeover", "fuel-store", "spill-kit", "extinguisher"}
    | {"exhaust", "co-alarm"}
)
FUEL_STORE_HOURS = 24.0  # a day of running at full rated load (common practice, no source)
FUEL_STORE_STEP_L = 5.0  # containers and tanks come in 5 L steps (common practice, no source)
CO_ALARMS = 2  # the room beside the generator and the nearest sleeping room (common practice)
LIQUID_FUELS = ("diesel", "petrol")


def fuel_store_litres(project: Project) -> tuple[float, float] | None:
    """(store litres, full-load use L/h): a day at the rating from the fitted fuel line;
    None when the fuel table cannot be fitted (validate names the field)."""
    from offgrid.generator.fuel import check_fuel_points, fit_fuel_curve

    g = project.generator
    assert g is not None
    if check_fuel_points(g.fuel_load_pct, g.fuel_l_h):
        return None
    f = fit_fuel_curve(g.rated_kw, g.fuel_load_pct, g.fuel_l_h)
    full = float(f.fuel_l_h(g.rated_kw))
    litres = math.ceil(full * FUEL_STORE_HOURS / FUEL_STORE_STEP_L - 1e-9) * FUEL_STORE_STEP_L
    return float(max(litres, FUEL_STORE_STEP_L)), full


def _fuel_store_line(g, store: tuple[float, float] | None) -> BomLine:
    kind = " (bunded tank or containers)" if g.fuel in LIQUID_FUELS else " (cylinders)"
    if store is None:
        return BomLine(
            f"fuel-store:{g.fuel}",
            f"Fuel store for {g.fuel}, approved and labelled{kind}",
            1.0,
            "each",
            "fuel caution; no size: the fuel table (generator.fuel_l_h) cannot be fitted",
            "caution:generator-fuel",
        )
    litres, full_l_h = store
    return BomLine(
        f"fuel-store:{litres:g} L {g.fuel}",
        f"Fuel store for {g.fuel}, {litres:g} L, approved and labelled{kind}",
        1.0,
        "each",
        f"fuel caution: {FUEL_STORE_HOURS:g} h at full rating x {full_l_h:.2f} L/h "
        f"(the fitted fuel line at {g.rated_kw:g} kW) rounded up to "
        f"{FUEL_STORE_STEP_L:g} L; {COMMON}; size it to the delivery interval from "
        "the litres a year of offgrid generator",
        "caution:generator-fuel",
    )


def generator_bom_lines(project: Project, design: SystemDesign) -> list[BomLine]:
    """The generator's lines (see the module docstring); empty without a generator."""
    g = project.generator
    if g is None:
        return []
    v = design.battery.system_voltage_v
    charger_in_kw = g.charger_kw / g.charger_efficiency
    store = fuel_store_litres(project)
    out = [
        BomLine(
            f"generator:{g.name}",
            f"Generator set {g.name}, {g.fuel}, {g.rated_kw:g} kW continuous (prime) rating",
            1.0,
            "each",
            f"the project's generator (generator.rated_kw {g.rated_kw:g} kW); its derated "
            "output carries the AC loads and the charger (offgrid generator: the check)",
            "generator.rated_kw",
        ),
        BomLine(
            f"charger:{g.charger_kw:g} kW {v} V",
            f"Battery charger, {g.charger_kw:g} kW DC output into the {v} V bank, about "
            f"{charger_in_kw:.2f} kW AC input at {g.charger_efficiency:.0%} efficiency "
            "(or the inverter-charger's own charge stage: then buy the inverter as an "
            "inverter-charger of this charge rating and leave this line out)",
            1.0,
            "each",
            f"generator.charger_kw {g.charger_kw:g} kW: the charger the dispatch charges with",
            "generator.charger_kw",
        ),
        BomLine(
            f"changeover:{g.rated_kw:g} kW",
            f"Changeover switch or interlock, break-before-make, rated for the generator's "
            f"full {g.rated_kw:g} kW at the site's AC voltage (or the inverter-charger's "
            "transfer relay of that rating)",
            1.0,
            "each",
            "changeover caution: the generator must never feed back into another supply "
            "or the inverter's output",
            "caution:generator-changeover",
        ),
        _fuel_store_line(g, store),
    ]
    if g.fuel in LIQUID_FUELS:
        out += [
            BomLine(
                f"spill-kit:{g.fuel}",
                f"Spill kit (absorbent) for {g.fuel}, kept by the fuel store",
                1.0,
                "each",
                f"fuel caution: spill absorbent at hand; one at the fuel store; {COMMON}",
                "caution:generator-fuel",
            ),
            BomLine(
                "extinguisher:liquid fuel",
                "Fire extinguisher for liquid-fuel fires, by the generator",
                1.0,
                "each",
                f"fuel caution: an extinguisher for liquid fuels at hand; {COMMON}",
                "caution:generator-fuel",
            ),
        ]
    out += [
        BomLine(
            f"exhaust:{g.rated_kw:g} kW",
            "Exhaust pipe, outlet and fixings for the generator, run outdoors away from "
            "doors, windows and air intakes",
            1.0,
            "each",
            "exhaust caution: pipe the exhaust away from the building; one run per generator",
            "caution:generator-exhaust-co",
        ),
        BomLine(
            "co-alarm",
            "Carbon monoxide alarm (to the local standard for CO alarms)",
            float(CO_ALARMS),
            "each",
            f"exhaust caution: CO alarms in the rooms beside the generator; {CO_ALARMS} "
            f"(the room beside it and the nearest sleeping room); {COMMON}: one for each "
            "further room beside it",
            "caution:generator-exhaust-co",
        ),
    ]
    return out


def bom_prices(project: Project) -> list[PriceItem]:
    """The price list for the bill of materials: the project's, and for the generator
    set without a price of its own there, ``generator.price`` (its purchase)."""
    from offgrid.economics.prices import price_for

    g = project.generator
    if g is None or g.price is None or price_for(f"generator:{g.name}", project.prices) is not None:
        return list(project.prices)
    return [
        *project.prices,
        PriceItem(part=f"generator:{g.name}", unit_price=float(g.price), note="generator.price"),
    ]


def unpriced_keys(project: Project, design: SystemDesign) -> list[str]:
    """Part keys of the bill of materials that the price list does not price."""
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.prices import price_for

    table = bom_prices(project)
    return [ln.key for ln in bill_of_materials(project, design) if price_for(ln.key, table) is None]


def unpriced_note(project: Project, design: SystemDesign) -> str:
    """'N line(s) without a price: ...' or '' when every line is priced."""
    keys = unpriced_keys(project, design)
    if not keys:
        return ""
    return (
        f"{len(keys)} line(s) of the bill of materials without a price: "
        + ", ".join(keys)
        + "; add them to [[prices]] (offgrid prices PROJECT --template)"
    )
