"""The inputs of the generator beside the sun (``[generator]``, ``GeneratorSpec``) and the
figures of its setup the report shows.

A number row's range is inclusive (a ``floats`` row: each value of the list, checked with
the fuel table's shape by :func:`offgrid.generator.fuel.check_fuel_points`); a choice
row's ``values`` are the words the file allows.  :func:`offgrid.generator.fields.
generator_problems` checks a project against these rows.  Ranges are physical or
common-practice bounds (common practice, no source).
"""

from __future__ import annotations

from offgrid.catalogue.entries import FigureEntry as Fig
from offgrid.catalogue.entries import InputEntry as In

GENERATOR_INPUTS: tuple[In, ...] = (
    In("generator.name", "Generator name", kind="text",
       hint="a short name for the generator set (text)"),
    In("generator.fuel", "Generator fuel", kind="choice", hint="the fuel it burns",
       values=("diesel", "petrol", "lpg")),
    In("generator.rated_kw", "Generator rating", "kW", 0.1, 2000,
       "continuous output at the reference conditions, kW (the datasheet's prime rating)"),
    In("generator.dispatch", "Dispatch rule", kind="choice",
       hint="cycle_charging: start at start_soc, charge to stop_soc; load_following: run only "
       "for what the sun and battery cannot cover",
       values=("cycle_charging", "load_following")),
    In("generator.derate_method", "Derate method", kind="choice",
       hint="common_practice: the straight line of the derate_* figures; iso3046: the ISO "
       "3046-1 power adjustment of a naturally aspirated diesel",
       values=("common_practice", "iso3046")),
    In("generator.fuel_load_pct", "Fuel table loads", "%", 0.0, 110.0,
       "the datasheet's loads, % of the rating, rising (25, 50, 75, 100)", "floats"),
    In("generator.fuel_l_h", "Fuel table use", "L/h", 0.0, 1000.0,
       "the datasheet's fuel use at each of those loads, L/h, rising with load (LPG: litres "
       "of liquid)", "floats"),
    In("generator.min_load_fraction", "Minimum loading", "", 0, 1,
       "share of the derated output below which it must not run long, 0-1 (about 0.3 for "
       "diesel against wet stacking)"),
    In("generator.altitude_m", "Generator altitude", "m", -430, 6000,
       "metres above sea level, or leave it out for site.elevation_m", "auto_float"),
    In("generator.hottest_temp_c", "Hottest air temp.", "C", -40, 60,
       "hottest air at the intake, C, or leave it out for the climate's hottest monthly mean "
       "maximum", "auto_float"),
    In("generator.derate_alt_pct_per_300m", "Derate per 300 m", "%", 0, 20,
       "output lost per 300 m above the threshold, % (datasheet; about 3)"),
    In("generator.derate_alt_above_m", "Derate from altitude", "m", 0, 6000,
       "altitude where the derate starts, m (datasheet; about 1000)"),
    In("generator.derate_temp_pct_per_5c", "Derate per 5 C", "%", 0, 20,
       "output lost per 5 C above the threshold, % (datasheet; about 2)"),
    In("generator.derate_temp_above_c", "Derate from temp.", "C", -20, 60,
       "temperature where the derate starts, C (datasheet; 25 to 40)"),
    In("generator.charger_kw", "Charger output", "kW", 0.05, 500,
       "battery charger's DC output at full rate, kW (the inverter-charger's charge rating)"),
    In("generator.charger_efficiency", "Charger efficiency", "", 0.5, 1,
       "charger AC to DC efficiency, a fraction (about 0.9)"),
    In("generator.start_soc", "Start at charge", "", 0, 1,
       "state of charge at which the generator starts, 0-1 (cycle charging)"),
    In("generator.stop_soc", "Stop at charge", "", 0, 1,
       "state of charge at which it stops, 0-1, above start_soc (cycle charging)"),
    In("generator.quiet_from_h", "Quiet from hour", "h", 0, 23,
       "solar hour 0-23 from which the generator may not run, or leave it out", "auto_int"),
    In("generator.quiet_to_h", "Quiet until hour", "h", 0, 23,
       "solar hour 0-23 at which quiet hours end, or leave it out", "auto_int"),
    In("generator.price", "Generator price", "money", 0, 1e9,
       "purchase and installation, in economics.currency, or leave it out", "auto_float"),
    In("generator.fuel_price_per_l", "Fuel price", "money/L", 0, 1000,
       "fuel price today per litre delivered to site, in economics.currency"),
    In("generator.fuel_escalation_pct", "Fuel price rise", "%/yr", -10, 50,
       "yearly rise of the fuel price, %"),
    In("generator.maintenance_per_run_h", "Upkeep per run hour", "money/h", 0, 10000.0,
       "oil, filters and service per run hour, in economics.currency"),
    In("generator.overhaul_interval_h", "Overhaul every", "h", 100, 200000,
       "run hours between overhauls (datasheet; about 10000 for a slow diesel)"),
    In("generator.overhaul_cost", "Overhaul cost", "money", 0, 1e9,
       "cost of one overhaul, in economics.currency"),
    In("generator.life_run_h", "Life in run hours", "h", 100, 500000,
       "run hours until replacement (about 20000 for a slow diesel, 3000 for a small petrol "
       "set)"),
    In("generator.life_years", "Life in years", "yr", 1, 60,
       "years until replacement however little it runs"),
)  # fmt: skip

#: The generator's figures that need no weather, at their paths of ``offgrid size --json``
#: (``generator`` section, :func:`offgrid.generator.study.setup_dict`); each carries its
#: reason beside it in that section (``generator.derating.reason``).  The check's powers
#: are held in W and shown in kW (``scale``).
GENERATOR_FIGURES: tuple[Fig, ...] = (
    Fig("generator.derating.derated_kw", "Derated output", "kW", 2),
    Fig("generator.fuel_curve.no_load_l_h", "No-load fuel", "L/h", 3),
    Fig("generator.fuel_curve.b_l_per_kwh", "Marginal fuel", "L/kWh", 4),
    Fig("generator.check.starting_need_w", "Starting need", "kW", 2, scale=1e-3),
    Fig("generator.check.min_load_w", "Minimum loading", "kW", 2, scale=1e-3),
)
