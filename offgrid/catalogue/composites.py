"""Rows whose labels carry figures, tables of figures and the titles of figure groups.

A :class:`~offgrid.catalogue.entries.CompositeEntry` is a label template whose
placeholders are named figures of the catalogue (``Upkeep {upkeep} x PWF {pwf}``); a
view fills it with :meth:`~offgrid.catalogue.entries.CompositeEntry.fill` and holds no
wording or digits of its own.  A :class:`~offgrid.catalogue.entries.TableEntry` is a table
whose rows are figures (the monthly reliability table of the report, the 7 Risk section
and ``offgrid simulate``).  ``FIGURE_GROUPS`` are the headings under which the report
and the 4 Sizes section group their figures.  A new composite row or table is one entry
here, and each of its figures one row of :mod:`offgrid.catalogue.outcomes` or
:mod:`offgrid.catalogue.figures`.
"""

from __future__ import annotations

from offgrid.catalogue.entries import CompositeEntry, TableEntry

COMPOSITES: tuple[CompositeEntry, ...] = (
    # the report's lifecycle table and the Options section's price view
    CompositeEntry(
        "costs.upkeep_row",
        "Upkeep {upkeep} x PWF {pwf}",
        (("upkeep", "costs.upkeep_yearly"), ("pwf", "costs.pwf_upkeep")),
        "costs.upkeep_pw",
    ),
    CompositeEntry(
        "costs.discounted_energy_row",
        "Discounted energy (x PWF {pwf})",
        (("pwf", "costs.pwf_energy"),),
        "costs.energy_pw_kwh",
    ),
    # the report's energy-by-month table: the growth margin's row
    CompositeEntry("loads.growth_row", "Growth {growth}", (("growth", "loads.growth_pct"),)),
    # one line of prose: the Options section's note on a priced option
    CompositeEntry(
        "costs.sums_note",
        "parts {parts} + installation {installation} = capital {capital}; + replacements "
        "{replacements} + upkeep {upkeep} = lifecycle {lcc}; energy {energy} a year x PWF "
        "{pwf}; battery life {battery_life}",
        (
            ("parts", "costs.parts"),
            ("installation", "costs.installation"),
            ("capital", "costs.capital"),
            ("replacements", "costs.replacements_pw"),
            ("upkeep", "costs.upkeep_pw"),
            ("lcc", "costs.lcc"),
            ("energy", "costs.energy_kwh_year"),
            ("pwf", "costs.pwf_energy"),
            ("battery_life", "costs.battery_life_years"),
        ),
    ),
)

TABLES: tuple[TableEntry, ...] = (
    TableEntry(
        "reliability-months",
        "Reliability by month",
        (
            "reliability.months[].lolp",
            "reliability.months[].soc_min_p5",
            "reliability.months[].soc_min_p50",
            "reliability.months[].soc_min_p95",
        ),
        "By month: share of days with shedding, and the 5th, 50th and 95th "
        "percentiles of the day's lowest state of charge.",
    ),
)

#: Headings of the groups of design figures (the first part of a figure's path), in
#: the report's "Sized figures" and the 4 Sizes section.
FIGURE_GROUPS: dict[str, str] = {
    "site": "Site and sun",
    "loads": "Loads",
    "loads_site": "Loads and site",
    "array": "Array",
    "battery": "Battery bank",
    "strings_module": "Strings and module",
    "controller": "Charge controller",
    "inverter": "Inverter",
    "module": "Module model",
    "mpp": "Maximum power point, design month",
    "strings": "String window",
    "wires": "Cables",
    "protection": "Protection",
}

COMPOSITES_BY_ID: dict[str, CompositeEntry] = {c.id: c for c in COMPOSITES}
TABLES_BY_ID: dict[str, TableEntry] = {t.id: t for t in TABLES}
