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
    # the trade-off's cheapest point (report table, 7 Risk)
    CompositeEntry(
        "tradeoff.point",
        "{array}, {battery}",
        (("array", "tradeoff.points[].array_w"), ("battery", "tradeoff.points[].capacity_wh")),
    ),
    # the variants table and the Options section: the battery life and its method
    CompositeEntry(
        "costs.battery_life_method",
        "{label}, {method}",
        (),
        "costs.battery_life_years",
        words=("method",),
    ),
    # the one-page client summary (offgrid/report/client.py), one sentence each
    CompositeEntry(
        "client.array",
        "{power.label} {power}: {count} x {module} ({series.label} {series}, "
        "{parallel.label} {parallel}), {tilt.label} {tilt}",
        (
            ("power", "array.power_w"),
            ("count", "array.module_count"),
            ("series", "array.modules_series"),
            ("parallel", "array.modules_parallel"),
            ("tilt", "site.tilt_deg"),
        ),
        words=("module",),
    ),
    CompositeEntry(
        "client.battery",
        "{nominal.label} {nominal} at {voltage} ({usable.label} {usable}): {units} x {battery}",
        (
            ("nominal", "battery.nominal_kwh"),
            ("voltage", "battery.system_voltage_v"),
            ("usable", "battery.usable_kwh"),
            ("units", "battery.unit_count"),
        ),
        words=("battery",),
    ),
    CompositeEntry(
        "client.controller",
        "{count.label}: {count} x {rating} {kind}",
        (("count", "controller.count"), ("rating", "controller.current_a")),
        words=("kind",),
    ),
    CompositeEntry(
        "client.inverter",
        "{continuous.label} {continuous}, {surge.label} {surge}",
        (("continuous", "inverter.continuous_w"), ("surge", "inverter.surge_w")),
    ),
    CompositeEntry(
        "client.serves",
        "{lines}: {energy.label} {energy} at the battery ({month}, the design month; "
        "{growth.label} {growth} included).",
        (("energy", "loads.design_daily_energy_wh"), ("growth", "loads.growth_pct")),
        words=("lines", "month"),
    ),
    CompositeEntry(
        "client.autonomy",
        "Days without sun: the battery carries the loads for {days.label} {days}, "
        "down to its {dod.label} {dod}.",
        (("days", "battery.autonomy_days"), ("dod", "battery.max_dod")),
    ),
    CompositeEntry(
        "client.cost",
        "{capital.label} {capital} (parts and installation); {lcc.label} over {years} "
        "{lcc}; {per_kwh.label} {per_kwh}.",
        (("capital", "costs.capital"), ("lcc", "costs.lcc"), ("per_kwh", "costs.cost_per_kwh")),
        words=("years",),
    ),
    # the parts search's text (offgrid parts best): one combination a line
    CompositeEntry(
        "parts.combination",
        "{capital.label} {capital}, {lcc.label} {lcc}: {parts} ({voltage.label} {voltage}, "
        "{power.label} {power}, {bank.label} {bank})",
        (
            ("capital", "costs.capital"),
            ("lcc", "costs.lcc"),
            ("voltage", "battery.system_voltage_v"),
            ("power", "array.power_w"),
            ("bank", "battery.nominal_kwh"),
        ),
        words=("parts",),
    ),
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

#: The heading of a cable figure's reason in the report (one reason per column of the
#: cable schedule, every run's inputs under it): the figure's own label in ``{label}``.
EACH_RUN_LABEL = "{label} of each run"

TABLES: tuple[TableEntry, ...] = (
    # the report's tables of the design (offgrid/report/build.py); the climate table's
    # own Max and Min columns are the climate file's, not figures of the design
    TableEntry(
        "climate",
        "Month",
        (
            "site.horizontal_kwh_m2_day",
            "site.poa_kwh_m2_day",
            "site.temp_mean_c",
            "site.temp_day_c",
        ),
        "Insolation in kWh/m2/day (mean daily, horizontal and in the array plane); "
        "temperatures in C (day = mean of the daily mean and maximum, used for the cell "
        "temperature).",
        units_in_note=True,
    ),
    TableEntry(
        "energy-by-month",
        "Wh/day",
        (
            "loads.per_load_wh",
            "loads.ac_energy_wh",
            "loads.dc_energy_wh",
            "loads.inverter_loss_wh",
            "loads.inverter_idle_by_month_wh",
            "loads.daily_energy_wh",
        ),
        "Daily energy by month, Wh/day: each appliance line at the appliance, "
        "then the totals up to the battery.",
    ),
    TableEntry(
        "supply-demand",
        "",
        (
            "loads.daily_energy_wh",
            "array.supply_wh_day",
            "array.harvest_mppt_wh_day",
            "array.harvest_pwm_wh_day",
            "site.demand_to_sun",
        ),
        "Demand and array supply at the battery (supply: the worst-month "
        "derate chain; harvest: from the I-V curves through the day, where "
        "computed); demand/sun in Wh per kWh/m2 of array-plane insolation.",
    ),
    TableEntry(
        "mpp",
        "One module, design month",
        (
            "mpp.irradiance_w_m2",
            "mpp.cell_temp_c",
            "mpp.vmp_v",
            "mpp.imp_a",
            "mpp.pmp_w",
            "mpp.fill_factor",
            "electrical.harvest.pwm_vs_mppt_pct",
        ),
    ),
    # columns: one row per cable run
    TableEntry(
        "wiring",
        "Run",
        (
            "wires[].count",
            "wires[].current_a",
            "wires[].drop_current_a",
            "wires[].length_m",
            "wires[].size",
            "wires[].drop_pct",
            "wires[].ampacity_a",
            "wires[].fuse_a",
        ),
        "max A: the circuit's maximum continuous current, for ampacity and the "
        "fuse (NEC 690.8 for PV circuits); drop A: the operating current; length "
        "one-way; drop = 2 x length x drop A x resistance per metre at conductor "
        "temperature / circuit voltage; ampacity after the temperature and grouping "
        "corrections.",
    ),
    TableEntry(
        "derates",
        "Derate (fraction kept)",
        (
            "array.derates.temperature",
            "array.derates.operating point",
            "array.derates.soiling",
            "array.derates.mismatch",
            "array.derates.wiring",
            "array.derates.controller",
            "array.derates.battery round trip",
            "array.derate_total",
        ),
    ),
    # the generator's trade-off (report): one row per mix
    TableEntry(
        "generator-tradeoff",
        "",
        (
            "mix.points[].array_w",
            "mix.points[].battery_kwh",
            "mix.points[].fuel_l_per_year",
            "mix.points[].unmet_fraction",
            "mix.points[].lcc",
        ),
        "Sun, battery and fuel: lifecycle cost of the parts that change with the mix.",
    ),
    # the same mixes in the text of offgrid generator, with run hours and solar share
    TableEntry(
        "generator-mixes",
        "",
        (
            "mix.points[].array_w",
            "mix.points[].battery_kwh",
            "mix.points[].fuel_l_per_year",
            "mix.points[].run_hours_per_year",
            "mix.points[].unmet_fraction",
            "mix.points[].solar_fraction",
            "mix.points[].lcc",
        ),
    ),
    # the simulation's (the report, 7 Risk, offgrid simulate)
    TableEntry(
        "tradeoff",
        "Reliability targets",
        (
            "tradeoff.targets[].target",
            "tradeoff.targets[].design_meets",
            "tradeoff.targets[].design_capacity_needed_wh",
            "tradeoff.targets[].cheapest",
        ),
        "Met: this design meets the target. Battery needed: on the curve at this "
        "design's array size. Cheapest point: array and battery alone, priced "
        "per W of module and per kWh of battery unit from the price list.",
    ),
    TableEntry(
        "reliability-months",
        "",
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
    "harvest": "Harvest, PWM and MPPT",
    "iv_curve": "I-V curve, design month",
    "wires": "Cables",
    "protection": "Protection",
}

#: Headings of the groups of rows of a comparison of variants (the Options section).
ROW_GROUPS: dict[str, str] = {
    "choices": "Changed values",
    "figures": "Sized system",
    "cost": "Cost",
    "reliability": "Reliability",
}

COMPOSITES_BY_ID: dict[str, CompositeEntry] = {c.id: c for c in COMPOSITES}
TABLES_BY_ID: dict[str, TableEntry] = {t.id: t for t in TABLES}
