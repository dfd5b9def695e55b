"""Whole reliability study of one project: weather, balance, wear, trade-off.

Never changes the project; a cancelled run raises
:class:`~offgrid.simulate.balance.SimulationCancelled` and leaves nothing behind.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from offgrid.simulate.balance import SystemInputs
from offgrid.simulate.reliability import MONTH_NAMES, Reliability, reliability
from offgrid.simulate.tradeoff import (
    DEFAULT_TARGETS,
    TradeOff,
    check_prices,
    check_target,
    tradeoff,
)
from offgrid.simulate.weather import (
    MONTH_OF_DAY,
    WeatherSeries,
    check_seed,
    check_years,
    synthetic_daily_insolation,
)

DEFAULT_YEARS = 30
CAUTIONS = (
    "Reliability figures come from synthetic weather: they describe the climate's "
    "statistics, not a promise for any particular year.",
    "This design defers to local electrical codes and licensed practice: have it checked, "
    "installed and inspected by a qualified electrician.",
)


@dataclass(frozen=True)
class SimulationReport:
    title: str
    demo: bool
    weather: dict[str, Any]
    reliability: Reliability
    tradeoff: TradeOff | None
    end_of_life_scale: float | None
    cautions: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        return {
            "title": self.title,
            "demo": self.demo,
            "weather": self.weather,
            "reliability": self.reliability.to_dict(),
            "tradeoff": None if self.tradeoff is None else self.tradeoff.to_dict(),
            "end_of_life_capacity_scale": self.end_of_life_scale,
            "cautions": list(self.cautions),
        }


def weather_summary(w: WeatherSeries) -> dict[str, Any]:
    syn = w.insolation_kwh_m2_day[w.measured_years :]
    achieved = [float(syn[:, m == MONTH_OF_DAY].mean()) for m in range(12)]
    return {
        "source": w.source,
        "years": w.years,
        "measured_years": w.measured_years,
        "seed": w.seed,
        "target_kwh_m2_day": [round(float(v), 4) for v in w.target_kwh_m2_day],
        "synthetic_mean_kwh_m2_day": [round(v, 4) for v in achieved],
        "rescale_factor": [round(float(v), 4) for v in w.scale_factor],
        "rescaling": "one factor per calendar month over all synthetic years, so the long-run "
        "mean equals the monthly mean; daily KT capped at 0.90",
    }


def _phase(progress: Callable[[float], None] | None, lo: float, hi: float):
    if progress is None:
        return None
    return lambda f: progress(lo + (hi - lo) * f)


def study(
    inp: SystemInputs,
    weather: WeatherSeries,
    *,
    title: str = "",
    demo: bool = False,
    mode: str = "daily",
    targets=DEFAULT_TARGETS,
    prices: Mapping[str, Any] | None = None,
    sweep_size: int = 30,
    end_of_life_scale: float | None = None,
    with_tradeoff: bool = True,
    progress=None,
    cancelled=None,
) -> SimulationReport:
    """Reliability of the reference design and, optionally, the trade-off sweep."""
    for t in targets:
        check_target(t)
    if prices is not None:
        check_prices(prices)
    rel = reliability(
        inp,
        weather,
        mode=mode,
        end_of_life_scale=end_of_life_scale,
        progress=_phase(progress, 0.0, 0.2),
        cancelled=cancelled,
    )
    tr = None
    if with_tradeoff:
        tr = tradeoff(
            inp,
            weather,
            targets=targets,
            prices=prices,
            n_array=sweep_size,
            n_battery=sweep_size,
            mode="daily",
            progress=_phase(progress, 0.2, 1.0),
            cancelled=cancelled,
        )
    return SimulationReport(
        title=title,
        demo=demo,
        weather=weather_summary(weather),
        reliability=rel,
        tradeoff=tr,
        end_of_life_scale=end_of_life_scale,
        cautions=CAUTIONS,
    )


def simulate_project(
    project,
    base: Path | None = None,
    *,
    years=DEFAULT_YEARS,
    seed=1,
    mode: str = "daily",
    targets=DEFAULT_TARGETS,
    prices: Mapping[str, Any] | None = None,
    sweep_size: int = 30,
    with_tradeoff: bool = True,
    use_measured: bool = True,
    progress=None,
    cancelled=None,
) -> SimulationReport:
    """Size the project for its worst month, then simulate that design.

    Raises ValueError (or DesignError) with a message naming the field and the fix.
    """
    from offgrid.design.sizing import design
    from offgrid.simulate.adapter import inputs_from_design, measured_daily

    years = check_years(years)
    seed = check_seed(seed)
    for t in targets:
        check_target(t)
    if prices is not None:
        check_prices(prices)
    result = design(project, base)
    inp = inputs_from_design(project, result)
    measured = measured_daily(project, base) if use_measured else None
    weather = synthetic_daily_insolation(
        inp.insolation_kwh_m2_day, inp.latitude_deg, years, seed=seed, measured_kwh_m2_day=measured
    )
    return study(
        inp,
        weather,
        title=project.info.name,
        demo=bool(project.info.demo),
        mode=mode,
        targets=targets,
        prices=prices,
        sweep_size=sweep_size,
        end_of_life_scale=float(result.battery.ageing_factor),
        with_tradeoff=with_tradeoff,
        progress=progress,
        cancelled=cancelled,
    )


def prices_from_args(array_price, battery_price) -> dict[str, float] | None:
    """Prices from two optional values; both or neither must be given."""
    if array_price is None and battery_price is None:
        return None
    if array_price is None or battery_price is None:
        raise ValueError(
            "costs missing: give both the array price per W (--array-price) and "
            "the battery price per kWh (--battery-price)"
        )
    return check_prices({"array_per_w": array_price, "battery_per_kwh": battery_price})


def pct(x: float) -> str:
    """A probability as a percentage with sensible digits."""
    v = 100 * x
    if v == 0:
        return "0 %"
    if v < 0.1:
        return f"{v:.3f} %"
    if v < 10:
        return f"{v:.2f} %"
    return f"{v:.1f} %"


def summary_text(rep: SimulationReport) -> str:
    """Readable summary, 80 columns."""
    r = rep.reliability
    w = rep.weather
    lines = []
    head = rep.title + ("  (demonstration data)" if rep.demo else "")
    lines += [head, "=" * min(80, len(head))]
    seed = "random" if w["seed"] is None else str(w["seed"])
    lines.append(f"Weather: {w['years']} years ({w['measured_years']} measured), seed {seed}")
    lines.append("  Aguiar, Collares-Pereira & Conde (1988) Markov matrices, rescaled per month")
    lines += _wrap(
        f"Design: array {r.array_w:.0f} W, battery {r.capacity_wh / 1000:.2f} kWh "
        f"at its temperature ({r.usable_wh / 1000:.2f} kWh usable); {r.mode} "
        "balance",
        80,
        "  ",
    )
    lines.append("")
    lines.append("Reliability")
    lines.append(
        f"  loss-of-load probability  {pct(r.lolp):>9}   ({r.shed_days} of {r.days} "
        "days with shedding)"
    )
    lines.append(f"  unmet energy              {pct(r.unmet_fraction):>9}")
    lines.append(
        f"  critical loads: LOLP      {pct(r.lolp_critical):>9}   unmet "
        f"{pct(r.unmet_fraction_critical)}"
    )
    lines.append(
        f"  longest shedding run      {r.longest_shed_run_days:>6} days  "
        f"(critical {r.longest_shed_run_days_critical} days)"
    )
    lines.append(
        f"  days below {r.soc_threshold:.0%} charge     {r.days_below_soc:>6} "
        f"({pct(r.days_below_soc / r.days)})"
    )
    if r.lolp_end_of_life is not None:
        lines.append(
            f"  LOLP at end of battery life ({rep.end_of_life_scale:.0%} capacity) "
            f"{pct(r.lolp_end_of_life)}"
        )
    if r.lolp_measured is not None:
        lines.append(f"  LOLP in the measured year(s) alone {pct(r.lolp_measured)}")
    lines.append("")
    lines.append(f"{'month':<11}" + "".join(f"{m:>5}" for m in MONTH_NAMES))
    from offgrid.catalogue import figure_entry, table_entry

    for path in table_entry("reliability-months").figures[:3]:  # LOLP, SoC p5 and p50
        e = figure_entry(path)
        name = path.rsplit(".", 1)[1]  # a field named in the catalogue's table
        lines.append(
            f"{e.heading():<11}"
            + "".join(f"{e.shown(getattr(m, name)):5.{e.digits or 0}f}" for m in r.months)
        )
    lines.append("  (SoC: lowest state of charge of the day, %, 5th and 50th percentile)")
    lines.append("")
    wr = r.wear
    cyc = "none counted" if wr.cycle_life_years is None else f"{wr.cycle_life_years:.1f} years"
    lines.append("Battery")
    lines.append(
        f"  throughput {wr.throughput_kwh_per_year:.0f} kWh/year = "
        f"{wr.equivalent_full_cycles_per_year:.0f} equivalent full cycles/year"
    )
    lines.append(
        f"  rainflow (ASTM E1049) + Miner: cycle life {cyc}; calendar "
        f"{wr.calendar_life_years:.0f} years"
    )
    lines.append(
        f"  expected life {wr.expected_life_years:.1f} years (cycle-life curve from memory)"
    )
    lines.append(
        f"  energy: PV {r.pv_kwh_per_year:.0f} kWh/yr, spilled "
        f"{pct(r.spilled_fraction)}, battery losses "
        f"{r.battery_loss_kwh_per_year:.0f} kWh/yr"
    )
    if rep.tradeoff is not None:
        tr = rep.tradeoff
        lines.append("")
        lines.append(
            f"Trade-off ({tr.sweep.array_w.size} x {tr.sweep.capacity_wh.size} designs, one sweep)"
        )
        for t in tr.targets:
            lines.append(
                f"  reliability target: loads met on {pct(1 - t.target)} of days "
                f"(LOLP {pct(t.target)}):"
            )
            pts = list(t.points)
            if pts:
                step = max(1, len(pts) // 6)
                shown = pts[::step]
                if shown[-1] is not pts[-1]:
                    shown.append(pts[-1])
                lines.append("    array W     " + " ".join(f"{p.array_w:7.0f}" for p in shown))
                lines.append(
                    "    battery kWh "
                    + " ".join(
                        format(
                            ("<=" if p.at_grid_edge else "") + f"{p.capacity_wh / 1000:.2f}", ">7"
                        )
                        for p in shown
                    )
                )
            lines += _wrap("    " + t.message, 80, "    ")
    lines.append("")
    for n in r.notes:
        lines += _wrap(f"Note: {n}", 80, "  ")
    lines.append("")
    for c in rep.cautions:
        lines += _wrap("! " + c, 80, "  ")
    return "\n".join(lines)


def _wrap(text: str, width: int, indent: str) -> list[str]:
    import textwrap

    return textwrap.wrap(text, width=width, subsequent_indent=indent) or [""]
