"""Capital cost, replacements and lifecycle cost per kWh delivered (present-worth method).

Money at year ``n`` is brought to today by the single-payment present-worth
factor, with prices rising at the inflation rate ``i`` and money discounted at
the rate ``d``::

    PW(n) = ((1 + i) / (1 + d)) ** n

A yearly amount paid at the end of years 1..N, rising with ``i`` from a first
payment A, is worth ``A x PWF(N, i, d)`` today::

    PWF(N, i, d) = 1/(d - i) x [1 - ((1 + i)/(1 + d)) ** N]     (i != d)
                 = N / (1 + i)                                  (i == d)

Lifecycle cost LCC = capital + sum of replacements x PW(year) + yearly upkeep
x PWF(N, i, d).  Cost per kWh delivered = LCC / (E x PWF(N, 0, d)): the
lifecycle cost spread over the discounted energy delivered to the appliances.

References
----------
Duffie, J. A. & Beckman, W. A., *Solar Engineering of Thermal Processes*, 4th ed.,
Wiley 2013, ch. 11 (sec. 11.4 discounting and inflation, sec. 11.5 the present
worth factor PWF, eq. 11.5.1; equation number from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from offgrid.design.result import Reason, SystemDesign, fmt
from offgrid.economics.bom import BomLine
from offgrid.economics.prices import price_for
from offgrid.project.model import Economics, Project
from offgrid.simulate.reliability import Reliability

if TYPE_CHECKING:
    from offgrid.simulate.run import SimulationReport

DAYS_IN_MONTH = np.array([31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31], dtype=float)

#: Battery service life when neither the project nor a simulation gives one, years, at
#: about one cycle a day to the design depth of discharge (from memory, typical figures).
BATTERY_LIFE_PRESET_YEARS: dict[str, float] = {
    "flooded": 7.0,
    "agm": 5.0,
    "gel": 8.0,
    "lifepo4": 12.0,
}
BATTERY_LIFE_SOURCE = "chemistry preset, typical service life at daily cycling (from memory)"


# ----------------------------------------------------------------------------- factors


def present_worth_single(years, discount_rate: float, inflation: float = 0.0):
    """Present worth of 1 (today's price) paid after ``years`` [-]: ((1+i)/(1+d))^n.

    Duffie & Beckman 4th ed. sec. 11.4.  ``years`` may be an array.
    """
    n = np.asarray(years, dtype=float)
    return ((1.0 + inflation) / (1.0 + discount_rate)) ** n


def present_worth_factor(years: float, inflation: float, discount_rate: float) -> float:
    """PWF(N, i, d) [-]: present worth of N yearly payments, the first 1, rising at ``i``.

    Duffie & Beckman 4th ed. eq. 11.5.1 (from memory): 1/(d-i) [1 - ((1+i)/(1+d))^N] for
    i != d, else N/(1+i).
    """
    if years < 0:
        raise ValueError("years must not be negative")
    if math.isclose(inflation, discount_rate, abs_tol=1e-12):
        return years / (1.0 + inflation)
    return (1.0 - ((1.0 + inflation) / (1.0 + discount_rate)) ** years) / (
        discount_rate - inflation
    )


def replacement_years(life_years: float, horizon_years: float) -> tuple[float, ...]:
    """Years at which a part of ``life_years`` is replaced before the horizon ends."""
    if life_years <= 0:
        raise ValueError("a service life must be above zero years")
    k = np.arange(1, int(horizon_years / life_years) + 2)
    t = k * life_years
    return tuple(float(x) for x in t[t < horizon_years - 1e-9])


# ----------------------------------------------------------------------------- lifecycle


@dataclass(frozen=True)
class CostLine:
    key: str
    description: str
    quantity: float
    unit: str
    unit_price: float | None
    total: float | None
    life_years: float
    replaced_at: tuple[float, ...]  # years
    replacement_pw: float | None  # present worth of its replacements
    apart: bool = False  # a generator line: priced here, costed by the generator study


@dataclass(frozen=True)
class LifecycleCost:
    currency: str
    lines: tuple[CostLine, ...]
    missing: tuple[str, ...]  # part keys without a price
    parts: float | None
    installation: float | None
    capital: float | None
    upkeep_yearly: float | None
    upkeep_pw: float | None
    replacements_pw: float | None
    lcc: float | None
    energy_kwh_year: float
    energy_pw_kwh: float  # discounted energy over the life, kWh
    cost_per_kwh: float | None
    pwf_upkeep: float
    pwf_energy: float
    economics: Economics
    battery_life_years: float
    battery_life_source: str
    served_fraction: float
    reasons: dict[str, Reason] = field(default_factory=dict)

    @property
    def complete(self) -> bool:
        return not self.missing

    def message(self) -> str:
        if not self.missing:
            return ""
        return (
            "no price for: " + ", ".join(self.missing) + ". Add them to the project's "
            "[[prices]] list, or fill in `offgrid prices PROJECT --template` and load it with "
            "`offgrid prices PROJECT --import FILE.csv`."
        )


def _record(reliability: SimulationReport | Reliability | None) -> Reliability | None:
    """The reliability record of a whole study (the report's input) or the record itself."""
    if reliability is None or isinstance(reliability, Reliability):
        return reliability
    return reliability.reliability


def battery_life(
    project: Project,
    reliability: SimulationReport | Reliability | None = None,
) -> tuple[float, str]:
    """Battery service life [years] and where it came from: project, simulation or preset."""
    e = project.economics
    if e.battery_life_years is not None:
        return float(e.battery_life_years), "project file (economics.battery_life_years)"
    rel = _record(reliability)
    sim_life = rel.wear.expected_life_years if rel is not None else None
    if sim_life is not None and math.isfinite(sim_life) and sim_life > 0:
        return float(sim_life), "reliability simulation (battery wear)"
    return BATTERY_LIFE_PRESET_YEARS[project.battery.chemistry], BATTERY_LIFE_SOURCE


def delivered_energy_kwh_year(design: SystemDesign, served_fraction: float = 1.0) -> float:
    """Energy delivered to the appliances in a year [kWh]: daily AC + DC by month x days.

    At the appliances (no growth margin, no inverter or battery losses), times the share
    of demand served (1 without a simulation).
    """
    daily = np.asarray(design.loads.ac_energy_wh) + np.asarray(design.loads.dc_energy_wh)
    return float((daily * DAYS_IN_MONTH).sum() / 1000.0 * served_fraction)


def _served_fraction(reliability: SimulationReport | Reliability | None) -> float:
    rel = _record(reliability)
    if rel is None:
        return 1.0
    v = rel.unmet_fraction
    return 1.0 - float(v) if math.isfinite(v) and 0 <= v <= 1 else 1.0


def lifecycle_cost(
    project: Project,
    design: SystemDesign,
    bom: tuple[BomLine, ...],
    reliability: SimulationReport | Reliability | None = None,
) -> LifecycleCost:
    """Capital, replacements, upkeep and the lifecycle cost per kWh delivered.

    The generator's lines (``generator_bom.GENERATOR_KINDS``) keep their line and price
    but are left out of the sums and of ``missing``: the generator study costs them with
    their run-hour life and the fuel."""
    e = project.economics
    d = e.discount_rate_pct / 100.0
    i = e.inflation_pct / 100.0
    n = float(e.life_years)
    life_b, life_src = battery_life(project, reliability)
    lives = {
        "module": e.module_life_years,
        "battery": life_b,
        "controller": e.controller_life_years,
        "inverter": e.inverter_life_years,
    }
    lines: list[CostLine] = []
    missing: list[str] = []
    from offgrid.economics.generator_bom import GENERATOR_KINDS, bom_prices

    apart: set[str] = set()  # the generator's lines: costed by the generator study
    for ln in bom:
        if ln.kind in GENERATOR_KINDS:
            price = price_for(ln.key, bom_prices(project))
            total = None if price is None else price * ln.quantity
            lines.append(
                CostLine(
                    ln.key, ln.description, ln.quantity, ln.unit, price, total, 0.0, (), None, True
                )
            )
            apart.add(ln.key)
            continue
        price = price_for(ln.key, project.prices)
        life = float(lives.get(ln.kind, e.module_life_years))
        years = replacement_years(life, n)
        total = None if price is None else price * ln.quantity
        rep = None if total is None else float(total * np.sum(present_worth_single(years, d, i)))
        if price is None:
            missing.append(ln.key)
        lines.append(
            CostLine(ln.key, ln.description, ln.quantity, ln.unit, price, total, life, years, rep)
        )
    pwf_up = present_worth_factor(n, i, d)
    pwf_e = present_worth_factor(n, 0.0, d)
    served = _served_fraction(reliability)
    energy = delivered_energy_kwh_year(design, served)
    reasons = {
        "costs.capital": Reason(
            "sum of quantity x unit price over the bill of materials, plus "
            "installation as a share of the parts",
            (("installation", fmt(e.installation_pct, "%")),),
            "common practice, no source",
        ),
        "costs.replacements_pw": Reason(
            "sum over parts and replacement years n < N of part cost x ((1 + i)/(1 + d))^n",
            (
                ("discount_rate", fmt(e.discount_rate_pct, "%")),
                ("inflation", fmt(e.inflation_pct, "%")),
                ("life", fmt(n, "years")),
                ("battery_life", fmt(life_b, "years")),
            ),
            "Duffie & Beckman 4th ed. sec. 11.4 (single-payment present worth)",
        ),
        "costs.upkeep_pw": Reason(
            "yearly upkeep x PWF(N, i, d) = upkeep x 1/(d - i) [1 - ((1 + i)/(1 + d))^N]",
            (("upkeep", fmt(e.om_pct_of_capital, "% of capital per year")), ("PWF", fmt(pwf_up))),
            "Duffie & Beckman 4th ed. eq. 11.5.1",
        ),
        "costs.lcc": Reason(
            "capital + present worth of replacements + present worth of upkeep",
            (),
            "Duffie & Beckman 4th ed. ch. 11 (life-cycle cost)",
        ),
        "costs.cost_per_kwh": Reason(
            "lifecycle cost / (energy delivered per year x PWF(N, 0, d))",
            (("energy", fmt(energy, "kWh/year")), ("PWF(N, 0, d)", fmt(pwf_e))),
            "Duffie & Beckman 4th ed. ch. 11 (levelised over the discounted energy)",
        ),
        # the figures the composite rows carry (offgrid/catalogue/composites.py)
        "costs.parts": Reason(
            "sum of quantity x unit price over the bill of materials",
            (),
            "common practice, no source",
        ),
        "costs.installation": Reason(
            "parts x installation share",
            (("installation", fmt(e.installation_pct, "%")),),
            "common practice, no source",
        ),
        "costs.upkeep_yearly": Reason(
            "capital x yearly upkeep share",
            (("upkeep", fmt(e.om_pct_of_capital, "% of capital per year")),),
            "common practice, no source",
        ),
        "costs.pwf_upkeep": Reason(
            "PWF(N, i, d) = 1/(d - i) [1 - ((1 + i)/(1 + d))^N] (N/(1 + i) when i = d)",
            (
                ("N", fmt(n, "years")),
                ("i", fmt(e.inflation_pct, "%")),
                ("d", fmt(e.discount_rate_pct, "%")),
            ),
            "Duffie & Beckman 4th ed. eq. 11.5.1 (from memory)",
        ),
        "costs.pwf_energy": Reason(
            "PWF(N, 0, d) = 1/d [1 - (1/(1 + d))^N]: the energy is not inflated",
            (("N", fmt(n, "years")), ("d", fmt(e.discount_rate_pct, "%"))),
            "Duffie & Beckman 4th ed. eq. 11.5.1 (from memory)",
        ),
        "costs.energy_kwh_year": Reason(
            "daily AC and DC energy at the appliances by month x days in the month x "
            "share of demand served",
            (("served", fmt(served)),),
            "common practice, no source",
        ),
        "costs.energy_pw_kwh": Reason(
            "energy delivered per year x PWF(N, 0, d)",
            (("energy", fmt(energy, "kWh/year")), ("PWF(N, 0, d)", fmt(pwf_e))),
            "Duffie & Beckman 4th ed. ch. 11 (levelised over the discounted energy)",
        ),
        "costs.battery_life_years": Reason(
            "the battery's service life", (), life_src or "common practice, no source"
        ),
    }
    if missing:
        return LifecycleCost(
            e.currency,
            tuple(lines),
            tuple(missing),
            None,
            None,
            None,
            None,
            None,
            None,
            None,
            energy,
            energy * pwf_e,
            None,
            pwf_up,
            pwf_e,
            e,
            life_b,
            life_src,
            served,
            reasons,
        )
    parts = float(sum(ln.total or 0.0 for ln in lines if ln.key not in apart))
    install = parts * e.installation_pct / 100.0
    capital = parts + install
    upkeep = capital * e.om_pct_of_capital / 100.0
    upkeep_pw = upkeep * pwf_up
    rep_pw = float(sum(ln.replacement_pw or 0.0 for ln in lines))
    lcc = capital + rep_pw + upkeep_pw
    per_kwh = lcc / (energy * pwf_e) if energy > 0 and pwf_e > 0 else None
    return LifecycleCost(
        e.currency,
        tuple(lines),
        (),
        parts,
        install,
        capital,
        upkeep,
        upkeep_pw,
        rep_pw,
        lcc,
        energy,
        energy * pwf_e,
        per_kwh,
        pwf_up,
        pwf_e,
        e,
        life_b,
        life_src,
        served,
        reasons,
    )


def tradeoff_prices(project: Project, bom: tuple[BomLine, ...]) -> dict[str, float] | None:
    """Array price per W and battery price per kWh from the price list, for the trade-off.

    None unless both the module and the battery unit are priced.
    """
    m, b = project.module, project.battery
    mod = next((ln for ln in bom if ln.kind == "module"), None)
    bat = next((ln for ln in bom if ln.kind == "battery"), None)
    pm = price_for(mod.key, project.prices) if mod else None
    pb = price_for(bat.key, project.prices) if bat else None
    if pm is None or pb is None:
        return None
    return {
        "array_per_w": pm / m.pmax_w,
        "battery_per_kwh": pb / (b.nominal_voltage_v * b.capacity_ah / 1000.0),
    }


def money(value: float | None, currency: str = "") -> str:
    """``1234.5 -> '1,234.50 USD'``; '-' for None."""
    if value is None:
        return "-"
    return f"{value:,.2f} {currency}".strip()
