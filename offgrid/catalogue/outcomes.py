"""The figures of the energy-balance simulation and of the lifecycle cost.

Reliability rows sit at their paths of ``offgrid simulate --json`` (``reliability.lolp``;
:meth:`offgrid.simulate.reliability.Reliability.to_dict`), explained by the record's own
reason at the path less ``reliability.`` (:func:`outcome_key`); the hybrid run's rows
(``hybrid.``) alike; cost rows at the fields of
:class:`offgrid.economics.costs.LifecycleCost` (``costs.capital``), whose reasons are keyed
by that path.  A fraction is stored 0-1 and shown in % (``scale=100``); ``{currency}`` in
a unit is the project's ``economics.currency``.  The 7 Risk section, the report's
reliability figures and costs table, the variants table and the Options section read these
rows; their labels fit the Risk section's figure column (:data:`OUTCOME_LABEL_ROOM`).
"""

from __future__ import annotations

from offgrid.catalogue.entries import FigureEntry as Fig

#: Longest label of these rows: the 7 Risk section's figure column (34) less its margin.
OUTCOME_LABEL_ROOM = 33

RELIABILITY_FIGURES: tuple[Fig, ...] = (
    Fig("reliability.lolp", "Loss-of-load probability", "%", 3, scale=100.0),
    Fig("reliability.unmet_fraction", "Unmet energy", "%", 3, scale=100.0),
    Fig("reliability.lolp_critical", "LOLP, critical loads", "%", 3, scale=100.0),
    Fig("reliability.unmet_fraction_critical", "Unmet energy, critical loads", "%", 3,
        scale=100.0),
    Fig("reliability.shed_days", "Days with shedding", "days", 0),
    Fig("reliability.longest_shed_run_days", "Longest run of shedding days", "days", 0),
    Fig("reliability.days_below_soc", "Days below the charge threshold", "days", 0),
    Fig("reliability.lolp_end_of_life", "LOLP at end of battery life", "%", 3, "lolp",
        scale=100.0),
    Fig("reliability.lolp_measured", "LOLP, measured years alone", "%", 3, "lolp",
        scale=100.0),
    Fig("reliability.wear.equivalent_full_cycles_per_year", "Equivalent full cycles per year",
        "", 0),
    Fig("reliability.wear.cycle_life_years", "Battery cycle life", "years", 1),
    Fig("reliability.wear.calendar_life_years", "Battery calendar life", "years", 1),
    Fig("reliability.wear.expected_life_years", "Battery expected life", "years", 1),
    Fig("reliability.pv_kwh_per_year", "PV energy to the battery bus", "kWh/year", 0),
    Fig("reliability.spilled_fraction", "Solar not used: battery was full", "%", 1,
        scale=100.0),
    Fig("reliability.battery_loss_kwh_per_year", "Battery losses", "kWh/year", 0),
    Fig("reliability.demand_kwh_per_year", "Yearly demand at the battery", "kWh/year", 0),
)  # fmt: skip

#: The hourly simulation with the generator (``offgrid generator --json``, its
#: ``simulation`` section: :meth:`offgrid.generator.hybrid.HybridRun.to_dict`), explained
#: by the run's reason at the path less ``hybrid.``.
HYBRID_FIGURES: tuple[Fig, ...] = (
    Fig("hybrid.array_w", "Array", "W", 0),
    Fig("hybrid.capacity_wh", "Battery at its temperature", "kWh", 2, scale=1e-3),
    Fig("hybrid.run_hours_per_year", "Generator run hours", "h/yr", 0),
    Fig("hybrid.starts_per_year", "Generator starts", "/yr", 0),
    Fig("hybrid.fuel_l_per_year", "Generator fuel", "L/yr", 0),
    Fig("hybrid.below_min_hours_per_year", "Hours below minimum loading", "h/yr", 0),
    Fig("hybrid.solar_fraction", "Solar fraction", "%", 1, scale=100.0),
    Fig("hybrid.unmet_fraction", "Unmet energy, hourly", "%", 3, scale=100.0),
    Fig("hybrid.wear.expected_life_years", "Battery expected life", "years", 1),
)

#: The monthly figures of the simulation (``offgrid simulate --json``: ``months[k].lolp``),
#: one row each of the table ``reliability-months`` (:mod:`offgrid.catalogue.composites`),
#: explained by the record's reason ``months.lolp``.  Their heading (label and unit) fits
#: the 7 Risk section's month strip (:data:`MONTH_LABEL_ROOM`).
MONTH_FIGURES: tuple[Fig, ...] = (
    Fig("reliability.months[].lolp", "LOLP", "%", 1, "reliability.months.lolp", scale=100.0),
    Fig("reliability.months[].soc_min_p5", "SoC p5", "%", 0, "reliability.months.soc_min",
        scale=100.0),
    Fig("reliability.months[].soc_min_p50", "SoC p50", "%", 0, "reliability.months.soc_min",
        scale=100.0),
    Fig("reliability.months[].soc_min_p95", "SoC p95", "%", 0, "reliability.months.soc_min",
        scale=100.0),
)  # fmt: skip

#: Each target LOLP of the array-battery trade-off (``SimulationReport.tradeoff``:
#: :class:`offgrid.simulate.tradeoff.TargetResult`), one row per target of the table
#: ``tradeoff`` (report) and of the 7 Risk section, explained by
#: :data:`offgrid.simulate.tradeoff.TRADEOFF_REASONS` at the path less ``tradeoff.``.
TRADEOFF_FIGURES: tuple[Fig, ...] = (
    Fig("tradeoff.targets[].target", "Target LOLP", "%", 3, "tradeoff.targets.target",
        scale=100.0),
    Fig("tradeoff.targets[].design_meets", "Met by this design", "", None,
        "tradeoff.targets.design_meets", short="Met"),
    Fig("tradeoff.targets[].design_capacity_needed_wh", "Battery needed at this array",
        "kWh", 1, "tradeoff.targets.design_capacity_needed_wh", scale=1e-3,
        short="Battery needed"),
    Fig("tradeoff.targets[].cheapest", "Cheapest point", "", None, "tradeoff.targets.cheapest"),
    Fig("tradeoff.points[].array_w", "Array on the curve", "W", 0, "tradeoff.targets.cheapest"),
    Fig("tradeoff.points[].capacity_wh", "Battery on the curve", "kWh", 1,
        "tradeoff.targets.cheapest", scale=1e-3),
)  # fmt: skip

#: Longest heading (label and unit) of a monthly row: the month strip's label column.
MONTH_LABEL_ROOM = 11

#: Each mix of sun, battery and fuel of the generator's trade-off (``offgrid generator
#: --json``, ``tradeoff.points[k]``: :class:`offgrid.economics.hybrid_mix.MixPoint`), the
#: columns of the report's table ``generator-tradeoff`` and the mix rows of a comparison
#: of variants.  Explained by the trade-off's reasons (``MixTradeoff.reasons``, path less
#: ``mix.``) or, for what the hourly run computes alike, by the run's (``hybrid.``).
MIX_FIGURES: tuple[Fig, ...] = (
    Fig("mix.points[].array_w", "Mix: array", "W", 0, "mix.points.array_w", short="Array"),
    Fig("mix.points[].battery_kwh", "Mix: battery, nominal", "kWh", 2,
        "mix.points.battery_kwh", short="Battery"),
    Fig("mix.points[].fuel_l_per_year", "Mix: generator fuel", "L/yr", 0,
        "hybrid.fuel_l_per_year", short="Fuel"),
    Fig("mix.points[].run_hours_per_year", "Mix: generator run hours", "h/yr", 0,
        "hybrid.run_hours_per_year", short="Run"),
    Fig("mix.points[].solar_fraction", "Mix: solar fraction", "%", 1, "hybrid.solar_fraction",
        scale=100.0, short="Solar"),
    Fig("mix.points[].unmet_fraction", "Mix: unmet energy, hourly", "%", 3,
        "hybrid.unmet_fraction", scale=100.0, short="Unmet"),
    Fig("mix.points[].lcc", "Mix: lifecycle cost", "{currency}", 0, "mix.lcc", short="LCC"),
)  # fmt: skip

COST_FIGURES: tuple[Fig, ...] = (
    Fig("costs.parts", "Parts", "{currency}", 2),
    Fig("costs.installation", "Installation", "{currency}", 2),
    Fig("costs.capital", "Capital cost", "{currency}", 2),
    Fig("costs.replacements_pw", "Replacements, present worth", "{currency}", 2),
    Fig("costs.lcc", "Lifecycle cost", "{currency}", 2),
    Fig("costs.energy_kwh_year", "Energy delivered per year", "kWh", 0),
    Fig("costs.cost_per_kwh", "Cost per kWh delivered", "{currency}/kWh", 3),
    Fig("costs.battery_life_years", "Battery life", "years", 1),
    Fig("costs.upkeep_yearly", "Upkeep per year", "{currency}/year", 2),
    Fig("costs.upkeep_pw", "Upkeep, present worth", "{currency}", 2),
    Fig("costs.pwf_upkeep", "Present worth factor, upkeep", "", 3),
    Fig("costs.pwf_energy", "Present worth factor, energy", "", 3),
    Fig("costs.energy_pw_kwh", "Discounted energy over the life", "kWh", 0),
)


#: The generator's own present-worth costs (``offgrid generator --json``, its ``costs``
#: section: :class:`offgrid.economics.generator_costs.GeneratorCost`), explained by the
#: record's reason at the path less ``generator_costs.``.
GENERATOR_COST_FIGURES: tuple[Fig, ...] = (
    Fig("generator_costs.capital", "Generator price", "{currency}", 2),
    Fig("generator_costs.fuel_pw", "Fuel (present worth)", "{currency}", 2),
    Fig("generator_costs.maintenance_pw", "Maintenance (present worth)", "{currency}", 2),
    Fig("generator_costs.overhaul_pw", "Overhauls (present worth)", "{currency}", 2),
    Fig("generator_costs.replacement_pw", "Replacements (present worth)", "{currency}", 2),
    Fig("generator_costs.total_pw", "Generator total (present worth)", "{currency}", 2),
)


def outcome_key(path: str) -> str:
    """The key of a row's reason in its own record: ``reliability.wear.expected_life_years``
    -> ``wear.expected_life_years`` (``Reliability.reasons``; ``hybrid.``: ``HybridRun``); a
    cost row keeps its path (``LifecycleCost.reasons``)."""
    head, _, rest = path.partition(".")
    return rest if head in {"reliability", "hybrid", "generator_costs", "tradeoff", "mix"} else path


def outcome_value(record: object, path: str) -> object:
    """The raw value at a row's path of its record (``Reliability`` or ``LifecycleCost``),
    the first part of the path left out; None where the record leaves it out.  No default:
    a renamed field raises AttributeError."""
    obj = record
    for part in path.split(".")[1:]:
        obj = getattr(obj, part)
        if obj is None:
            return None
    return obj
