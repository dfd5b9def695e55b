"""A project's generator beside its solar design: derating, fuel curve, check, simulation.

:func:`generator_setup` turns the project's ``[generator]`` table and its worst-month
design into the plain inputs of :mod:`offgrid.simulate.dispatch`;
:func:`simulate_hybrid` runs the hourly balance with the generator over synthetic
weather for one design (array [W], battery [Wh]) and collects the yearly figures.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from offgrid.design.result import DesignError, Notice, Reason, ReasonBook, SystemDesign, fmt
from offgrid.generator.check import GeneratorCheck, generator_check
from offgrid.generator.derate import Derating, derated_output
from offgrid.generator.fields import quiet_mask
from offgrid.generator.fuel import FuelCurve, fit_fuel_curve
from offgrid.project.model import GeneratorSpec, Project
from offgrid.simulate.balance import SystemInputs, build_steps, run_balance
from offgrid.simulate.dispatch import GeneratorInputs, HybridBalance, run_hybrid
from offgrid.simulate.life import CYCLE_LIFE_SOURCE, BatteryWear, battery_wear
from offgrid.simulate.weather import WeatherSeries

_SRC_DISPATCH = "offgrid.simulate.dispatch (hourly balance with the generator, module notes)"


@dataclass(frozen=True)
class GeneratorSetup:
    spec: GeneratorSpec
    derating: Derating
    fuel: FuelCurve
    check: GeneratorCheck
    inputs: GeneratorInputs
    notices: tuple[Notice, ...]


def require_generator(project: Project) -> GeneratorSpec:
    if project.generator is None:
        raise DesignError(
            "no-generator",
            "the project has no [generator] table: add one with at least rated_kw and the "
            "datasheet's fuel_l_h at fuel_load_pct (see offgrid generator --help)",
            "generator",
        )
    return project.generator


def hottest_air_c(project: Project, design: SystemDesign, base: Path | None = None) -> float:
    """The generator's intake air: typed, else the climate's hottest monthly mean maximum."""
    g = require_generator(project)
    if g.hottest_temp_c is not None:
        return float(g.hottest_temp_c)
    from offgrid.design.sizing import resolve_climate

    tmax = resolve_climate(project, base).temp_max_c
    if tmax:
        return float(max(tmax))
    return float(max(design.site.temp_day_c))


def gen_wh_per_bus_wh(project: Project, design: SystemDesign) -> tuple[float, ...]:
    """Generator energy per Wh of battery-bus load it carries, per month.

    AC loads go through the changeover directly (no inverter loss, no idle draw), DC loads
    through the charger: (AC + DC / charger efficiency) x growth / bus load.
    """
    g = require_generator(project)
    lr = design.loads
    grow = 1.0 + lr.growth_pct / 100.0
    out = []
    for ac, dc, bus in zip(lr.ac_energy_wh, lr.dc_energy_wh, lr.daily_energy_wh, strict=True):
        out.append((ac + dc / g.charger_efficiency) * grow / bus if bus > 0 else 1.0)
    return tuple(out)


def generator_setup(
    project: Project, design: SystemDesign, base: Path | None = None
) -> GeneratorSetup:
    """Derate, fit, check; DesignError naming the field when the generator cannot serve."""
    g = require_generator(project)
    altitude = project.site.elevation_m if g.altitude_m is None else g.altitude_m
    hot = hottest_air_c(project, design, base)
    coeffs = (
        {
            "alt_pct_per_300m": g.derate_alt_pct_per_300m,
            "alt_above_m": g.derate_alt_above_m,
            "temp_pct_per_5c": g.derate_temp_pct_per_5c,
            "temp_above_c": g.derate_temp_above_c,
        }
        if g.derate_method == "common_practice"
        else {}
    )
    try:
        der = derated_output(g.rated_kw, altitude, hot, g.derate_method, **coeffs)
        fuel = fit_fuel_curve(g.rated_kw, g.fuel_load_pct, g.fuel_l_h)
    except ValueError as exc:
        field_name = str(exc).split(":", 1)[0]
        raise DesignError("generator-input", str(exc), field_name) from None
    derated_w = der.derated_kw * 1000.0
    chk = generator_check(
        derated_w,
        design.loads.peak_ac_w,
        design.loads.surge_need_w,
        g.charger_kw * 1000.0,
        g.charger_efficiency,
        g.min_load_fraction,
        design.loads.surge_need_load,
    )
    if not chk.ok:
        raise DesignError("generator-too-small", chk.notices[0].message, "generator.rated_kw")
    inputs = GeneratorInputs(
        derated_w=derated_w,
        min_load_w=chk.min_load_w,
        no_load_l_h=fuel.no_load_l_h,
        b_l_per_kwh=fuel.b_l_per_kwh,
        charger_w=g.charger_kw * 1000.0,
        charger_efficiency=g.charger_efficiency,
        rule=g.dispatch,
        start_soc=g.start_soc,
        stop_soc=g.stop_soc,
        quiet=quiet_mask(g.quiet_from_h, g.quiet_to_h),
        gen_wh_per_bus_wh=gen_wh_per_bus_wh(project, design),
    )
    notices = list(chk.notices)
    floor = 1.0 - design.battery.max_dod
    if g.dispatch == "cycle_charging" and g.start_soc <= floor:
        notices.append(
            Notice(
                "generator-start-below-floor",
                f"generator.start_soc {g.start_soc:g} is at or below the battery's floor "
                f"{floor:g} (1 - depth of discharge): the generator starts only when the "
                "battery can no longer carry the load",
                "info",
                "generator.start_soc",
            )
        )
    if fuel.a_l_h_per_kw < 0:
        notices.append(
            Notice(
                "generator-fuel-fit",
                "the fuel line has a negative no-load use: check the datasheet's fuel table "
                "(generator.fuel_l_h)",
                "warning",
                "generator.fuel.a_l_h_per_kw",
            )
        )
    return GeneratorSetup(g, der, fuel, chk, inputs, tuple(notices))


@dataclass(frozen=True)
class HybridRun:
    """Yearly figures of one design with the generator over the synthetic weather."""

    years: int
    array_w: float
    capacity_wh: float
    rule: str
    run_hours_per_year: float
    starts_per_year: float
    fuel_l_per_year: float
    below_min_hours_per_year: float
    dump_kwh_per_year: float
    generator_kwh_per_year: float
    pv_kwh_per_year: float
    spilled_fraction: float
    unmet_fraction: float
    lolp: float
    solar_fraction: float
    solar_only_lolp: float
    solar_only_unmet_fraction: float
    wear: BatteryWear | None
    reasons: dict[str, Reason] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        from dataclasses import asdict

        out = asdict(self)
        out["reasons"] = {k: r.as_dict() for k, r in sorted(self.reasons.items())}
        return out


def hybrid_balance(
    inp: SystemInputs,
    steps,
    gen: GeneratorInputs,
    array_w: float,
    capacity_wh: float,
    *,
    record: bool = False,
) -> HybridBalance:
    return run_hybrid(
        steps,
        array_w,
        capacity_wh,
        gen,
        max_dod=inp.max_dod,
        eta_charge=inp.eta_charge,
        eta_discharge=inp.eta_discharge,
        initial_soc=inp.initial_soc,
        record=record,
    )


def hybrid_run(
    inp: SystemInputs,
    weather: WeatherSeries,
    gen: GeneratorInputs,
    array_w: float | None = None,
    capacity_wh: float | None = None,
    *,
    steps=None,
    with_wear: bool = True,
    solar_only: bool = True,
) -> HybridRun:
    """Simulate one design with the generator and (``solar_only``) on the same weather
    without it; without that run the solar-only figures are NaN."""
    aw = inp.array_w if array_w is None else float(array_w)
    cap = inp.capacity_wh if capacity_wh is None else float(capacity_wh)
    steps = steps if steps is not None else build_steps(inp, weather, "hourly")
    b = hybrid_balance(inp, steps, gen, aw, cap, record=with_wear)
    solo_lolp = solo_unmet = float("nan")
    if solar_only:
        solo = run_balance(
            steps,
            aw,
            cap,
            max_dod=inp.max_dod,
            eta_charge=inp.eta_charge,
            eta_discharge=inp.eta_discharge,
            initial_soc=inp.initial_soc,
        )
        solo_lolp, solo_unmet = float(solo.lolp[0]), float(solo.unmet_fraction[0])
    years = weather.years
    wear = None
    if with_wear and b.stored_wh is not None:
        soc = np.concatenate(([inp.initial_soc], b.stored_wh / cap))
        wear = battery_wear(soc, years, inp.chemistry, b.discharge_wh, cap, inp.calendar_life_years)
    book = ReasonBook()
    common = {
        "rule": gen.rule,
        "years": fmt(years),
        "array": fmt(aw, "W"),
        "battery": fmt(cap / 1000, "kWh"),
        "derated output": fmt(gen.derated_w, "W"),
    }
    book.add(
        "array_w",
        "the array this hourly run simulates (the design's, or a mix of the trade-off)",
        _SRC_DISPATCH,
        array=fmt(aw, "W"),
    )
    book.add(
        "capacity_wh",
        "the battery capacity this run simulates, at the battery's temperature",
        _SRC_DISPATCH,
        battery=fmt(cap / 1000, "kWh"),
    )
    book.add("run_hours_per_year", "hours the generator runs / years", _SRC_DISPATCH, **common)
    book.add("starts_per_year", "off-to-on changes / years", _SRC_DISPATCH, **common)
    book.add(
        "fuel_l_per_year",
        "sum over running hours of (a x rating + b x output) / years",
        _SRC_DISPATCH,
        no_load=fmt(gen.no_load_l_h, "L/h"),
        b=fmt(gen.b_l_per_kwh, "L/kWh"),
    )
    book.add(
        "below_min_hours_per_year",
        "running hours whose load and charging fell below the minimum loading (made up by "
        "a dump load) / years",
        "common practice, no source (minimum loading against wet stacking)",
        minimum=fmt(gen.min_load_w, "W"),
    )
    book.add(
        "solar_fraction",
        "PV energy used / (PV energy used + generator energy to the loads and the battery), "
        "at the battery bus",
        _SRC_DISPATCH,
    )
    book.add(
        "unmet_fraction",
        "energy shed / energy demanded at the battery bus (should be near zero)",
        _SRC_DISPATCH,
    )
    if wear is not None:
        book.add(
            "wear.expected_life_years",
            "min(calendar life, years / Miner damage) of the hourly state of charge",
            "ASTM E1049-85 sec. 5.4.4 (rainflow); Miner (1945); cycle life " + CYCLE_LIFE_SOURCE,
        )
    pv = b.pv_wh
    return HybridRun(
        years=years,
        array_w=aw,
        capacity_wh=cap,
        rule=gen.rule,
        run_hours_per_year=b.run_h / years,
        starts_per_year=b.starts / years,
        fuel_l_per_year=b.fuel_l / years,
        below_min_hours_per_year=b.below_min_h / years,
        dump_kwh_per_year=b.dump_wh / 1000 / years,
        generator_kwh_per_year=b.gen_output_wh / 1000 / years,
        pv_kwh_per_year=pv / 1000 / years,
        spilled_fraction=b.spilled_wh / pv if pv > 0 else 0.0,
        unmet_fraction=b.unmet_fraction,
        lolp=b.shed_days / b.days,
        solar_fraction=b.solar_fraction,
        solar_only_lolp=solo_lolp,
        solar_only_unmet_fraction=solo_unmet,
        wear=wear,
        reasons=book.freeze(),
    )
