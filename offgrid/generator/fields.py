"""The generator's inputs: one table of metadata and the project checks on them.

``FIELDS`` is one tuple written so it can move into the field catalogue in one step:
``(path, label, unit, range, hint)`` for every input of the ``[generator]`` table.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from offgrid.numbers import is_finite_number

if TYPE_CHECKING:
    from offgrid.project.model import Project

#: Every generator input: (path, label, unit, range, hint). ``range`` is (low, high) for a
#: number (bounds inclusive; each value of a list), the allowed words of a choice, or None
#: for free text.  Labels at most 22 characters.
FIELDS: tuple[tuple[str, str, str, tuple | None, str], ...] = (
    ("generator.name", "Generator name", "", None, "a short name for the generator set (text)"),
    ("generator.fuel", "Generator fuel", "", ("diesel", "petrol", "lpg"), "the fuel it burns"),
    (
        "generator.rated_kw",
        "Generator rating",
        "kW",
        (0.1, 2000),
        "continuous output at the reference conditions, kW (the datasheet's prime rating)",
    ),
    (
        "generator.dispatch",
        "Dispatch rule",
        "",
        ("cycle_charging", "load_following"),
        "cycle_charging: start at start_soc, charge to stop_soc; load_following: run only for "
        "what the sun and battery cannot cover",
    ),
    (
        "generator.derate_method",
        "Derate method",
        "",
        ("common_practice", "iso3046"),
        "common_practice: the straight line of the derate_* figures; iso3046: the ISO 3046-1 power "
        "adjustment of a naturally aspirated diesel",
    ),
    (
        "generator.fuel_load_pct",
        "Fuel table loads",
        "%",
        (0.0, 110.0),
        "the datasheet's loads, % of the rating, rising (25, 50, 75, 100)",
    ),
    (
        "generator.fuel_l_h",
        "Fuel table use",
        "L/h",
        (0.0, 1000.0),
        "the datasheet's fuel use at each of those loads, L/h, rising with load (LPG: litres "
        "of liquid)",
    ),
    (
        "generator.min_load_fraction",
        "Minimum loading",
        "",
        (0, 1),
        "share of the derated output below which it must not run long, 0-1 (about 0.3 for "
        "diesel against wet stacking)",
    ),
    (
        "generator.altitude_m",
        "Generator altitude",
        "m",
        (-430, 6000),
        "metres above sea level, or leave it out for site.elevation_m",
    ),
    (
        "generator.hottest_temp_c",
        "Hottest air temp.",
        "C",
        (-40, 60),
        "hottest air at the intake, C, or leave it out for the climate's hottest monthly mean "
        "maximum",
    ),
    (
        "generator.derate_alt_pct_per_300m",
        "Derate per 300 m",
        "%",
        (0, 20),
        "output lost per 300 m above the threshold, % (datasheet; about 3)",
    ),
    (
        "generator.derate_alt_above_m",
        "Derate from altitude",
        "m",
        (0, 6000),
        "altitude where the derate starts, m (datasheet; about 1000)",
    ),
    (
        "generator.derate_temp_pct_per_5c",
        "Derate per 5 C",
        "%",
        (0, 20),
        "output lost per 5 C above the threshold, % (datasheet; about 2)",
    ),
    (
        "generator.derate_temp_above_c",
        "Derate from temp.",
        "C",
        (-20, 60),
        "temperature where the derate starts, C (datasheet; 25 to 40)",
    ),
    (
        "generator.charger_kw",
        "Charger output",
        "kW",
        (0.05, 500),
        "battery charger's DC output at full rate, kW (the inverter-charger's charge rating)",
    ),
    (
        "generator.charger_efficiency",
        "Charger efficiency",
        "",
        (0.5, 1),
        "charger AC to DC efficiency, a fraction (about 0.9)",
    ),
    (
        "generator.start_soc",
        "Start at charge",
        "",
        (0, 1),
        "state of charge at which the generator starts, 0-1 (cycle charging)",
    ),
    (
        "generator.stop_soc",
        "Stop at charge",
        "",
        (0, 1),
        "state of charge at which it stops, 0-1, above start_soc (cycle charging)",
    ),
    (
        "generator.quiet_from_h",
        "Quiet from hour",
        "h",
        (0, 23),
        "solar hour 0-23 from which the generator may not run, or leave it out",
    ),
    (
        "generator.quiet_to_h",
        "Quiet until hour",
        "h",
        (0, 23),
        "solar hour 0-23 at which quiet hours end, or leave it out",
    ),
    (
        "generator.price",
        "Generator price",
        "money",
        (0, 1000000000.0),
        "purchase and installation, in economics.currency, or leave it out",
    ),
    (
        "generator.fuel_price_per_l",
        "Fuel price",
        "money/L",
        (0, 1000),
        "fuel price today per litre delivered to site, in economics.currency",
    ),
    (
        "generator.fuel_escalation_pct",
        "Fuel price rise",
        "%/yr",
        (-10, 50),
        "yearly rise of the fuel price, %",
    ),
    (
        "generator.maintenance_per_run_h",
        "Upkeep per run hour",
        "money/h",
        (0, 10000.0),
        "oil, filters and service per run hour, in economics.currency",
    ),
    (
        "generator.overhaul_interval_h",
        "Overhaul every",
        "h",
        (100, 200000),
        "run hours between overhauls (datasheet; about 10000 for a slow diesel)",
    ),
    (
        "generator.overhaul_cost",
        "Overhaul cost",
        "money",
        (0, 1000000000.0),
        "cost of one overhaul, in economics.currency",
    ),
    (
        "generator.life_run_h",
        "Life in run hours",
        "h",
        (100, 500000),
        "run hours until replacement (about 20000 for a slow diesel, 3000 for a small petrol set)",
    ),
    (
        "generator.life_years",
        "Life in years",
        "yr",
        (1, 60),
        "years until replacement however little it runs",
    ),
)
#: Lists checked together by :func:`offgrid.generator.fuel.check_fuel_points`.
LIST_PATHS = ("generator.fuel_load_pct", "generator.fuel_l_h")


def generator_problems(project: Project) -> list[tuple[str, str]]:
    """(path, message) for every problem of ``project.generator``; empty when none or valid."""
    from offgrid.generator.fuel import check_fuel_points

    g = project.generator
    if g is None:
        return []
    out: list[tuple[str, str]] = []
    for path, _label, _unit, span, hint in FIELDS:
        if span is None or path in LIST_PATHS:
            continue
        value = getattr(g, path.removeprefix("generator."))  # the path names the field
        if isinstance(span[0], str):
            if value not in span:
                out.append((path, f"'{value}' must be one of {', '.join(span)}"))
            continue
        if value is None:
            continue
        lo, hi = span
        if not is_finite_number(value):
            out.append((path, f"'{value}' is not a finite number; {hint}"))
        elif not lo <= value <= hi:
            out.append((path, f"{value:g} is out of range; {hint}"))
    out.extend(check_fuel_points(g.fuel_load_pct, g.fuel_l_h))
    if g.dispatch == "cycle_charging" and g.start_soc >= g.stop_soc:
        out.append(
            (
                "generator.start_soc",
                f"{g.start_soc:g} is not below stop_soc {g.stop_soc:g}: the generator starts "
                "at the lower state of charge and stops at the higher; swap them",
            )
        )
    if (g.quiet_from_h is None) != (g.quiet_to_h is None):
        out.append(
            (
                "generator.quiet_to_h",
                "give both quiet_from_h and quiet_to_h, or leave both out",
            )
        )
    elif g.quiet_from_h is not None and g.quiet_from_h == g.quiet_to_h:
        out.append(
            (
                "generator.quiet_to_h",
                "quiet hours that start and end at the same hour are "
                "empty; leave both out or give an end hour",
            )
        )
    return out


def quiet_mask(quiet_from_h: int | None, quiet_to_h: int | None) -> tuple[bool, ...]:
    """24 flags, True in the solar hours when the generator may not run."""
    if quiet_from_h is None or quiet_to_h is None:
        return (False,) * 24
    a, b = int(quiet_from_h), int(quiet_to_h)
    return tuple((a <= h < b) if a < b else (h >= a or h < b) for h in range(24))
