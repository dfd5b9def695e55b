"""The cheapest mix of sun, battery and generator: a trade-off across array and battery sizes.

Each point is a smaller array and bank than the solar-only (worst-month) design, run hour
by hour over the same synthetic weather with the generator
(:mod:`offgrid.simulate.dispatch`); its lifecycle cost counts the parts that change with
the mix (common practice, no source: controller, inverter, cables and protection are left
out, the same for every point):

    LCC = (array W x price per W + battery kWh x price per kWh) x (1 + installation)
          + upkeep (% of that capital) x PWF(N, i, d)
          + battery and module replacements x ((1 + i)/(1 + d))^n
          + generator: price + fuel + maintenance + overhauls + replacements (present worth)

The battery's life at each point is its own rainflow-and-Miner life from the hourly state
of charge (or economics.battery_life_years when set).  The cheapest point is the lowest
LCC among the points whose unmet energy stays within ``unmet_limit``; the solar-only design
is costed the same way without the generator.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any

import numpy as np

from offgrid.design.result import Reason, SystemDesign, fmt
from offgrid.economics.costs import present_worth_factor, present_worth_single, replacement_years
from offgrid.economics.generator_costs import SOURCE_PW, generator_cost
from offgrid.generator.hybrid import GeneratorSetup, hybrid_run
from offgrid.project.model import Project
from offgrid.simulate.balance import SystemInputs, build_steps, run_balance
from offgrid.simulate.life import battery_wear
from offgrid.simulate.weather import WeatherSeries

DEFAULT_ARRAY_FACTORS = tuple(float(x) for x in np.round(np.linspace(0.1, 1.0, 10), 3))
DEFAULT_BATTERY_FACTORS = (0.5, 1.0)
DEFAULT_UNMET_LIMIT = 0.001  # 0.1 % of the energy demanded


@dataclass(frozen=True)
class MixPoint:
    array_w: float
    battery_kwh: float  # nominal
    generator: bool
    fuel_l_per_year: float
    run_hours_per_year: float
    starts_per_year: float
    unmet_fraction: float
    solar_fraction: float
    battery_life_years: float
    capital: float
    lcc: float


@dataclass(frozen=True)
class MixTradeoff:
    currency: str
    years: int
    unmet_limit: float
    prices: dict[str, float]
    points: tuple[MixPoint, ...]
    solar_only: MixPoint
    cheapest: MixPoint | None
    notes: tuple[str, ...]
    reasons: dict[str, Reason] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        out = asdict(self)
        out["reasons"] = {k: r.as_dict() for k, r in sorted(self.reasons.items())}
        return out


def _solar_costs(
    project: Project, array_w: float, battery_kwh: float, battery_life: float, prices
) -> tuple[float, float]:
    """(capital, lifecycle cost) of the array and battery alone."""
    e = project.economics
    d, i, n = e.discount_rate_pct / 100.0, e.inflation_pct / 100.0, float(e.life_years)
    arr = array_w * prices["array_per_w"]
    bat = battery_kwh * prices["battery_per_kwh"]
    capital = (arr + bat) * (1.0 + e.installation_pct / 100.0)
    upkeep = capital * e.om_pct_of_capital / 100.0 * present_worth_factor(n, i, d)
    reps = bat * float(np.sum(present_worth_single(replacement_years(battery_life, n), d, i)))
    reps += arr * float(
        np.sum(present_worth_single(replacement_years(e.module_life_years, n), d, i))
    )
    return capital, capital + upkeep + reps


def _life(project: Project, wear) -> float:
    if project.economics.battery_life_years is not None:
        return float(project.economics.battery_life_years)
    from offgrid.economics.costs import BATTERY_LIFE_PRESET_YEARS

    if wear is not None and np.isfinite(wear.expected_life_years) and wear.expected_life_years > 0:
        return float(wear.expected_life_years)
    return BATTERY_LIFE_PRESET_YEARS[project.battery.chemistry]


def mix_tradeoff(
    project: Project,
    design: SystemDesign,
    inp: SystemInputs,
    weather: WeatherSeries,
    setup: GeneratorSetup,
    prices: dict[str, float],
    *,
    array_factors=DEFAULT_ARRAY_FACTORS,
    battery_factors=DEFAULT_BATTERY_FACTORS,
    unmet_limit: float = DEFAULT_UNMET_LIMIT,
    min_solar_fraction: float | None = None,
    steps=None,
) -> MixTradeoff:
    """Lifecycle cost of each (array, battery) with the generator, and of the solar-only design.

    ``min_solar_fraction``: the cheapest point is chosen among those whose solar fraction
    is at least this share (a chosen share of demand from the sun).
    """
    if min_solar_fraction is not None and not 0 <= min_solar_fraction <= 1:
        raise ValueError(
            f"--solar-share: {min_solar_fraction:g} must be a fraction 0-1 (0.8 = 80 % sun)"
        )
    steps = steps if steps is not None else build_steps(inp, weather, "hourly")
    nominal_kwh = float(design.battery.nominal_kwh)
    spec = setup.spec
    points: list[MixPoint] = []
    for fb in battery_factors:
        for fa in array_factors:
            aw, cap = inp.array_w * fa, inp.capacity_wh * fb
            run = hybrid_run(inp, weather, setup.inputs, aw, cap, steps=steps, solar_only=False)
            life = _life(project, run.wear)
            capital, lcc = _solar_costs(project, aw, nominal_kwh * fb, life, prices)
            gc = generator_cost(
                spec, project.economics, run.run_hours_per_year, run.fuel_l_per_year
            )
            gen_pw = gc.total_pw if gc.total_pw is not None else gc.running_pw
            points.append(
                MixPoint(
                    aw,
                    nominal_kwh * fb,
                    True,
                    run.fuel_l_per_year,
                    run.run_hours_per_year,
                    run.starts_per_year,
                    run.unmet_fraction,
                    run.solar_fraction,
                    life,
                    capital + (spec.price or 0.0),
                    lcc + gen_pw,
                )
            )
    solo = run_balance(
        steps,
        inp.array_w,
        inp.capacity_wh,
        max_dod=inp.max_dod,
        eta_charge=inp.eta_charge,
        eta_discharge=inp.eta_discharge,
        initial_soc=inp.initial_soc,
        record=True,
    )
    stored = solo.record["stored_wh"].reshape(-1)
    wear = battery_wear(
        np.concatenate(([inp.initial_soc], stored / inp.capacity_wh)),
        weather.years,
        inp.chemistry,
        float(solo.discharge_wh[0]),
        inp.capacity_wh,
        inp.calendar_life_years,
    )
    life = _life(project, wear)
    capital, lcc = _solar_costs(project, inp.array_w, nominal_kwh, life, prices)
    solar_only = MixPoint(
        inp.array_w,
        nominal_kwh,
        False,
        0.0,
        0.0,
        0.0,
        float(solo.unmet_fraction[0]),
        1.0,
        life,
        capital,
        lcc,
    )
    share = 0.0 if min_solar_fraction is None else min_solar_fraction
    ok = [p for p in points if p.unmet_fraction <= unmet_limit and p.solar_fraction >= share]
    cheapest = min(ok, key=lambda p: p.lcc) if ok else None
    notes = [
        "costs of the parts that change with the mix only (array, battery, generator); "
        "controller, inverter, cables and protection are the same for every point",
        f"{weather.years} years of hourly synthetic weather; cheapest point among those with "
        f"unmet energy at most {unmet_limit:.1%}",
    ]
    if min_solar_fraction is not None:
        notes.append(f"only mixes with a solar fraction of at least {share:.0%}")
    if spec.price is None:
        notes.append("generator.price not given: the generator's purchase is left out")
    if cheapest is None:
        notes.append(
            "no mix kept unmet energy within the limit: a larger generator or charger, or "
            "fewer quiet hours"
        )
    if cheapest is not None and solar_only.lcc < cheapest.lcc:
        notes.append(
            f"the solar-only design costs less over the life but leaves "
            f"{solar_only.unmet_fraction:.2%} of the energy unmet (the limit is "
            f"{unmet_limit:.1%}): the generator buys the reliability"
        )
    e = project.economics
    reasons = {
        "points.array_w": Reason(
            "the array sizes of the grid: the design's array times the factors swept",
            (),
            "common practice, no source",
        ),
        "points.battery_kwh": Reason(
            "the nominal battery sizes of the grid: the design's bank times the factors swept",
            (),
            "common practice, no source",
        ),
        "lcc": Reason(
            "(array x price per W + battery x price per kWh) x (1 + installation) + upkeep x "
            "PWF(N, i, d) + replacements x ((1 + i)/(1 + d))^n + generator present worth "
            "(price, fuel, maintenance, overhauls, replacements)",
            (
                ("array price", fmt(prices["array_per_w"], f"{e.currency}/W")),
                ("battery price", fmt(prices["battery_per_kwh"], f"{e.currency}/kWh")),
                ("N", fmt(float(e.life_years), "years")),
                ("d", fmt(e.discount_rate_pct, "%")),
                ("i", fmt(e.inflation_pct, "%")),
            ),
            SOURCE_PW,
        ),
    }
    return MixTradeoff(
        e.currency,
        weather.years,
        unmet_limit,
        dict(prices),
        tuple(points),
        solar_only,
        cheapest,
        tuple(notes),
        reasons,
    )
