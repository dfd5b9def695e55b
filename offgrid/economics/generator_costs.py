"""The generator's money over the life of the system, and the cheapest mix of sun and fuel.

Present worth as in :mod:`offgrid.economics.costs` (Duffie & Beckman 4th ed. ch. 11):

* fuel: first-year litres x today's price, rising at the fuel escalation ``e``:
  ``fuel x PWF(N, e, d)``;
* maintenance: run hours x cost per run hour, rising with inflation ``i``:
  ``x PWF(N, i, d)``;
* overhauls: one every ``overhaul_interval_h`` run hours of each engine, at the year that
  falls in, x ``((1 + i)/(1 + d))^n``;
* replacement: after ``life_run_h`` run hours or ``life_years`` years, whichever first,
  x ``((1 + i)/(1 + d))^n`` for each replacement before the horizon.

:func:`mix_tradeoff` simulates the hybrid over a grid of array and battery sizes below the
solar-only design and sets each point's lifecycle cost (the parts that change with the
mix: array, battery, generator) beside the solar-only design's.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any

import numpy as np

from offgrid.design.result import Reason, fmt
from offgrid.economics.costs import present_worth_factor, present_worth_single, replacement_years
from offgrid.project.model import Economics, GeneratorSpec

SOURCE_PW = "Duffie & Beckman 4th ed. ch. 11 (sec. 11.4 present worth, eq. 11.5.1 PWF)"


@dataclass(frozen=True)
class GeneratorCost:
    currency: str
    capital: float | None  # the generator's price; None: not given
    fuel_first_year: float
    fuel_pw: float
    maintenance_yearly: float
    maintenance_pw: float
    overhaul_years: tuple[float, ...]
    overhaul_pw: float
    life_years: float
    replaced_at: tuple[float, ...]
    replacement_pw: float | None
    running_pw: float  # fuel + maintenance + overhauls
    total_pw: float | None  # capital + running + replacements
    pwf_fuel: float
    pwf_upkeep: float
    reasons: dict[str, Reason] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        out = asdict(self)
        out["reasons"] = {k: r.as_dict() for k, r in sorted(self.reasons.items())}
        return out


def generator_life_years(spec: GeneratorSpec, run_h_per_year: float) -> float:
    """Years until replacement: run-hour life / run hours a year, at most the calendar life."""
    if run_h_per_year <= 0:
        return float(spec.life_years)
    return float(min(spec.life_run_h / run_h_per_year, spec.life_years))


def overhaul_years(
    interval_h: float, run_h_per_year: float, life_years: float, horizon_years: float
) -> tuple[float, ...]:
    """Years of the overhauls: every ``interval_h`` run hours of each engine, none at a
    replacement (the new engine starts its own count)."""
    if run_h_per_year <= 0 or interval_h <= 0:
        return ()
    step = interval_h / run_h_per_year
    out: list[float] = []
    starts = (0.0, *replacement_years(life_years, horizon_years))
    for s in starts:
        end = min(s + life_years, horizon_years)
        t = s + step
        while t < end - 1e-9:
            out.append(t)
            t += step
    return tuple(out)


def generator_cost(
    spec: GeneratorSpec,
    economics: Economics,
    run_h_per_year: float,
    fuel_l_per_year: float,
) -> GeneratorCost:
    """Present worth of the generator's capital, fuel, upkeep, overhauls and replacements."""
    d = economics.discount_rate_pct / 100.0
    i = economics.inflation_pct / 100.0
    esc = spec.fuel_escalation_pct / 100.0
    n = float(economics.life_years)
    pwf_fuel = present_worth_factor(n, esc, d)
    pwf_up = present_worth_factor(n, i, d)
    fuel1 = fuel_l_per_year * spec.fuel_price_per_l
    maint = run_h_per_year * spec.maintenance_per_run_h
    life = generator_life_years(spec, run_h_per_year)
    ov = overhaul_years(spec.overhaul_interval_h, run_h_per_year, life, n)
    ov_pw = float(spec.overhaul_cost * np.sum(present_worth_single(ov, d, i))) if ov else 0.0
    rep = replacement_years(life, n)
    rep_pw = (
        None if spec.price is None else float(spec.price * np.sum(present_worth_single(rep, d, i)))
    )
    running = fuel1 * pwf_fuel + maint * pwf_up + ov_pw
    total = None if spec.price is None or rep_pw is None else spec.price + running + rep_pw
    cur = economics.currency
    reasons = {
        "fuel_pw": Reason(
            "litres a year x fuel price x PWF(N, e, d) = x 1/(d - e) [1 - ((1 + e)/(1 + d))^N]",
            (
                ("fuel", fmt(fuel_l_per_year, "L/yr")),
                ("price", fmt(spec.fuel_price_per_l, f"{cur}/L")),
                ("escalation e", fmt(spec.fuel_escalation_pct, "%")),
                ("discount d", fmt(economics.discount_rate_pct, "%")),
                ("N", fmt(n, "years")),
                ("PWF", fmt(pwf_fuel)),
            ),
            SOURCE_PW,
        ),
        "maintenance_pw": Reason(
            "run hours a year x cost per run hour x PWF(N, i, d)",
            (
                ("run hours", fmt(run_h_per_year, "h/yr")),
                ("per run hour", fmt(spec.maintenance_per_run_h, cur)),
                ("PWF", fmt(pwf_up)),
            ),
            SOURCE_PW,
        ),
        "overhaul_pw": Reason(
            "sum over overhaul years n of overhaul cost x ((1 + i)/(1 + d))^n",
            (
                ("every", fmt(spec.overhaul_interval_h, "run hours")),
                ("years", ", ".join(f"{t:.1f}" for t in ov) or "none"),
            ),
            SOURCE_PW,
        ),
        "life_years": Reason(
            "min(life in run hours / run hours a year, life in years)",
            (
                ("life in run hours", fmt(spec.life_run_h, "h")),
                ("life in years", fmt(spec.life_years, "years")),
            ),
            "common practice, no source",
        ),
        "replacement_pw": Reason(
            "sum over replacement years n < N of price x ((1 + i)/(1 + d))^n",
            (("years", ", ".join(f"{t:.1f}" for t in rep) or "none"),),
            SOURCE_PW,
        ),
    }
    return GeneratorCost(
        cur,
        spec.price,
        fuel1,
        fuel1 * pwf_fuel,
        maint,
        maint * pwf_up,
        ov,
        ov_pw,
        life,
        rep,
        rep_pw,
        running,
        total,
        pwf_fuel,
        pwf_up,
        reasons,
    )
