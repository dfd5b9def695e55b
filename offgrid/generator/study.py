"""The whole generator study of a project: setup, mix trade-off, the chosen hybrid, its costs.

:func:`generator_study` sizes the project for its worst month (the solar-only design),
sets up the generator, sweeps the mix of array and battery below that design (when the
array and battery are priced), then simulates the chosen hybrid (the cheapest point, or
the array and battery given) with its costs.  :meth:`GeneratorStudy.to_dict` is the JSON
``generator`` section; :func:`summary_text` the 80-column text.
"""

from __future__ import annotations

import textwrap
from dataclasses import asdict, dataclass
from pathlib import Path
from typing import Any

from offgrid.catalogue.outcomes import GENERATOR_COST_FIGURES, HYBRID_FIGURES
from offgrid.design.result import Notice
from offgrid.economics.generator_costs import GeneratorCost, generator_cost
from offgrid.economics.hybrid_mix import MixTradeoff, mix_tradeoff
from offgrid.generator.cautions import generator_cautions
from offgrid.generator.hybrid import GeneratorSetup, HybridRun, generator_setup, hybrid_run
from offgrid.project.model import Project

DEFAULT_YEARS = 20


#: how the text names a derating method (the file's words are ``generator.derate_method``)
_METHOD_WORDS = {
    "common_practice": "straight-line derate (common practice)",
    "iso3046": "ISO 3046-1 power adjustment",
}


def hybrid_demo_path() -> Path:
    """The bundled invented hybrid lodge (a demonstration scenario of our own)."""
    from offgrid.paths import demo_project_path

    return demo_project_path().parent / "demo-hybrid-lodge.toml"


@dataclass(frozen=True)
class GeneratorStudy:
    title: str
    demo: bool
    years: int
    seed: int | None
    setup: GeneratorSetup
    solar_only_array_w: float
    solar_only_battery_kwh: float
    chosen: str  # how the simulated hybrid was chosen
    run: HybridRun
    cost: GeneratorCost
    mix: MixTradeoff | None
    notes: tuple[str, ...]
    cautions: tuple[str, ...]
    chosen_battery_kwh: float | None = None  # nominal kWh of the simulated hybrid

    @property
    def notices(self) -> tuple[Notice, ...]:
        return self.setup.notices

    def to_dict(self) -> dict[str, Any]:
        return {
            "title": self.title,
            "demo": self.demo,
            "years": self.years,
            "seed": self.seed,
            **setup_dict(self.setup),
            "solar_only": {
                "array_w": self.solar_only_array_w,
                "battery_kwh": self.solar_only_battery_kwh,
            },
            "chosen": self.chosen,
            "simulation": _finite(self.run.to_dict()),
            "costs": self.cost.to_dict(),
            "tradeoff": None if self.mix is None else self.mix.to_dict(),
            "notes": list(self.notes),
            "cautions": list(self.cautions),
        }


def setup_dict(s: GeneratorSetup) -> dict[str, Any]:
    """The generator's figures that need no weather: spec, derating, fuel line, check."""
    fuel = s.fuel
    return {
        "generator": {
            "name": s.spec.name,
            "fuel": s.spec.fuel,
            "rated_kw": s.spec.rated_kw,
            "dispatch": s.spec.dispatch,
            "start_soc": s.spec.start_soc,
            "stop_soc": s.spec.stop_soc,
            "quiet_from_h": s.spec.quiet_from_h,
            "quiet_to_h": s.spec.quiet_to_h,
        },
        "derating": {
            "method": s.derating.method,
            "altitude_m": s.derating.altitude_m,
            "temp_c": s.derating.temp_c,
            "pressure_kpa": round(s.derating.pressure_kpa, 3),
            "factor": round(s.derating.factor, 4),
            "derated_kw": round(s.derating.derated_kw, 4),
            "reason": s.derating.reason.as_dict(),
        },
        "fuel_curve": {
            "a_l_h_per_kw": round(fuel.a_l_h_per_kw, 6),
            "b_l_per_kwh": round(fuel.b_l_per_kwh, 6),
            "no_load_l_h": round(fuel.no_load_l_h, 6),
            "r_squared": round(fuel.r_squared, 6),
            "residual_max_l_h": round(fuel.residual_max_l_h, 6),
            "fit": fuel.table(),
            "reason": fuel.reason.as_dict(),
        },
        "check": {
            "derated_w": s.check.derated_w,
            "ac_peak_w": s.check.ac_peak_w,
            "surge_need_w": s.check.surge_need_w,
            "charger_input_w": round(s.check.charger_input_w, 3),
            "running_need_w": round(s.check.running_need_w, 3),
            "starting_need_w": round(s.check.starting_need_w, 3),
            "min_load_w": round(s.check.min_load_w, 3),
            "ok": s.check.ok,
            "reason": s.check.reason.as_dict(),
        },
        "notices": [asdict(n) for n in s.notices],
    }


def _finite(d: dict[str, Any]) -> dict[str, Any]:
    """NaN (a figure not computed) becomes None in the JSON."""
    out = {}
    for k, v in d.items():
        out[k] = None if isinstance(v, float) and v != v else v
    return out


def generator_study(
    project: Project,
    base: Path | None = None,
    *,
    years: int = DEFAULT_YEARS,
    seed: int | None = 1,
    array_w: float | None = None,
    battery_kwh: float | None = None,
    prices: dict[str, float] | None = None,
    with_mix: bool = True,
    min_solar_fraction: float | None = None,
    use_measured: bool = True,
) -> GeneratorStudy:
    """Raises DesignError or ValueError with the field and the fix."""
    from offgrid.design.sizing import design
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import tradeoff_prices
    from offgrid.simulate.adapter import inputs_from_design, measured_daily
    from offgrid.simulate.balance import build_steps
    from offgrid.simulate.weather import check_seed, check_years, synthetic_daily_insolation

    years = check_years(years)
    seed = check_seed(seed)
    if (array_w is not None and not array_w >= 0) or (
        battery_kwh is not None and not battery_kwh > 0
    ):
        raise ValueError("--array-w must be 0 or more and --battery-kwh above 0")
    result = design(project, base)
    setup = generator_setup(project, result, base)
    inp = inputs_from_design(project, result)
    measured = measured_daily(project, base) if use_measured else None
    weather = synthetic_daily_insolation(
        inp.insolation_kwh_m2_day, inp.latitude_deg, years, seed=seed, measured_kwh_m2_day=measured
    )
    steps = build_steps(inp, weather, "hourly")
    notes: list[str] = []
    if prices is None:
        prices = tradeoff_prices(project, bill_of_materials(project, result))
    mix = None
    if with_mix and prices is not None:
        mix = mix_tradeoff(
            project,
            result,
            inp,
            weather,
            setup,
            prices,
            min_solar_fraction=min_solar_fraction,
            steps=steps,
        )
    elif with_mix:
        notes.append(
            "no trade-off: price the module and the battery in [[prices]] (or give "
            "--array-price and --battery-price)"
        )
    nominal = float(result.battery.nominal_kwh)
    scale = inp.capacity_wh / (nominal * 1000.0) if nominal > 0 else 1.0
    if array_w is not None or battery_kwh is not None:
        aw = inp.array_w if array_w is None else float(array_w)
        kwh = nominal if battery_kwh is None else float(battery_kwh)
        chosen = "the array and battery given"
    elif mix is not None and mix.cheapest is not None:
        aw, kwh = mix.cheapest.array_w, mix.cheapest.battery_kwh
        chosen = "the cheapest point of the trade-off"
    else:
        aw, kwh = inp.array_w, nominal
        chosen = "the solar-only (worst-month) design with the generator beside it"
    run = hybrid_run(inp, weather, setup.inputs, aw, kwh * 1000.0 * scale, steps=steps)
    cost = generator_cost(
        setup.spec, project.economics, run.run_hours_per_year, run.fuel_l_per_year
    )
    notes.append(
        "hourly balance in solar time; the generator serves the AC loads through the "
        "changeover directly and the DC loads and the battery through the charger"
    )
    return GeneratorStudy(
        title=project.info.name,
        demo=bool(project.info.demo),
        years=years,
        seed=seed,
        setup=setup,
        solar_only_array_w=float(inp.array_w),
        solar_only_battery_kwh=nominal,
        chosen=chosen,
        run=run,
        cost=cost,
        mix=mix,
        notes=tuple(notes),
        cautions=generator_cautions(setup.spec),
        chosen_battery_kwh=float(kwh),
    )


def _wrap(text: str, indent: str = "  ") -> list[str]:
    return textwrap.wrap(text, 80, subsequent_indent=indent) or [""]


def figure_lines(record: Any, rows: tuple, currency: str = "") -> list[str]:
    """One line per catalogue row (offgrid/catalogue/outcomes.py) of a record of the
    study: its label and its value with the row's digits, scale and unit; rows the record
    leaves out are not shown."""
    from offgrid.catalogue import figure_entry
    from offgrid.catalogue.outcomes import outcome_value

    out = []
    for row in rows:
        e = figure_entry(row.path)  # read as it is now
        v = outcome_value(record, e.path)
        if v is not None:
            out.append(f"  {e.label:<34} {e.text(float(v), currency=currency):>16}")
    return out


def mix_lines(m: MixTradeoff, currency: str) -> list[str]:
    """The mixes of the trade-off as a text table: the catalogue's table
    ``generator-mixes`` (columns headed by their short word and unit, each figure with
    its digits and scale), the cheapest marked '<'."""
    from offgrid.catalogue import figure_entry, table_entry

    table = table_entry("generator-mixes")
    entries = [figure_entry(p) for p in table.figures]
    heads = table.columns(figure_entry, currency)
    rows = []
    for p in sorted(m.points, key=lambda q: (q.battery_kwh, q.array_w)):
        cells = [
            f"{e.shown(getattr(p, e.path.rsplit('.', 1)[1])):,.{e.digits or 0}f}"  # a field
            for e in entries  # named in the table
        ]
        rows.append((cells, " <" if p is m.cheapest else ""))
    widths = [max(len(h), *(len(c[k]) for c, _ in rows)) for k, h in enumerate(heads)]
    out = ["  " + "  ".join(f"{h:>{w}}" for h, w in zip(heads, widths, strict=True))]
    for cells, mark in rows:
        out.append("  " + "  ".join(f"{c:>{w}}" for c, w in zip(cells, widths, strict=True)) + mark)
    return out


def summary_text(st: GeneratorStudy) -> str:
    """80-column summary of the generator study."""
    s, r, c = st.setup, st.run, st.cost
    cur = c.currency
    head = st.title + ("  (demonstration data)" if st.demo else "")
    out = [head, "=" * min(80, len(head))]
    out += _wrap(f"Generator: {s.spec.name}, {s.spec.fuel}, {s.spec.rated_kw:g} kW rated")
    from offgrid.catalogue import figure_entry

    derated = figure_entry("generator.derating.derated_kw")
    need = figure_entry("generator.check.starting_need_w")
    least = figure_entry("generator.check.min_load_w")
    d = s.derating
    out += _wrap(
        f"  {derated.label} {derated.text(d.derated_kw)} (x {d.factor:.3f}) at "
        f"{d.altitude_m:.0f} m, "
        f"{d.temp_c:.1f} C; {_METHOD_WORDS.get(d.method, d.method)}",
        "    ",
    )
    out += _wrap("  " + d.reason.source, "    ")
    f = s.fuel
    out.append(
        f"  fuel = {f.a_l_h_per_kw:.4f} x rating + {f.b_l_per_kwh:.4f} x output  L/h  "
        f"(R^2 {f.r_squared:.4f})"
    )
    out.append("    load kW  " + " ".join(f"{x:7.2f}" for x in f.points_kw))
    out.append("    sheet L/h" + " ".join(f"{x:7.3f}" for x in f.points_l_h))
    out.append("    line L/h " + " ".join(f"{x:7.3f}" for x in f.fitted_l_h))
    k = s.check
    out.append(
        f"  check: {need.label} {need.text(k.starting_need_w)} (charger input "
        f"{k.charger_input_w / 1000:.2f} kW) within {k.derated_w / 1000:.2f} kW: "
        + ("yes" if k.ok else "NO")
    )
    out.append(f"  {least.label} {least.text(k.min_load_w)}")
    out.append("")
    out += _wrap(
        f"Hybrid simulated ({st.chosen}): {r.rule.replace('_', ' ')}; {st.years} years hourly"
    )
    out += figure_lines(r, HYBRID_FIGURES)  # the catalogue's rows, as the report's table
    out.append(f"  (without the generator: unmet energy {r.solar_only_unmet_fraction:.2%})")
    out.append("")
    out.append("Generator costs over the system's life (present worth)")
    out += figure_lines(c, GENERATOR_COST_FIGURES, cur)
    out.append(
        f"  (fuel {c.fuel_first_year:,.0f} {cur} in year 1; {len(c.overhaul_years)} "
        f"overhaul(s); life {c.life_years:.1f} years)"
    )
    if st.mix is not None:
        m = st.mix
        out.append("")
        out.append(f"Trade-off: sun, battery and fuel ({len(m.points)} mixes, {m.years} years)")
        out += mix_lines(m, cur)
        so = m.solar_only
        out.append(
            f"  solar only: {so.array_w:.0f} W, {so.battery_kwh:.2f} kWh, unmet "
            f"{so.unmet_fraction:.2%}, LCC {so.lcc:,.0f} {cur}"
        )
        if m.cheapest is not None:
            ch = m.cheapest
            out.append(
                f"  cheapest hybrid (<): {ch.array_w:.0f} W, {ch.battery_kwh:.2f} kWh, "
                f"{ch.fuel_l_per_year:.0f} L/yr, LCC {ch.lcc:,.0f} {cur}"
            )
        for n in m.notes:
            out += _wrap("  Note: " + n, "    ")
    out.append("")
    for n in st.notices:
        out += _wrap(f"{n.severity}: {n.message}")
    for n in st.notes:
        out += _wrap("Note: " + n)
    out.append("")
    for ctn in st.cautions:
        out += _wrap("! " + ctn)
    return "\n".join(out)


def size_section(project: Project, design, base: Path | None = None) -> dict[str, Any]:
    """The ``generator`` section of ``offgrid size --json``: the figures that need no
    weather, or the refusal (code, message, field) when the generator cannot serve."""
    from offgrid.design.result import DesignError
    from offgrid.generator.hybrid import generator_setup

    try:
        setup = generator_setup(project, design, base)
    except DesignError as exc:
        return {"refused": {"code": exc.code, "message": str(exc), "field": exc.field}}
    return {**setup_dict(setup), "cautions": list(generator_cautions(setup.spec))}


def size_lines(project: Project, design, base: Path | None = None) -> list[str]:
    """A few lines for ``offgrid size``: the generator beside the solar design."""
    sec = size_section(project, design, base)
    g = project.generator
    assert g is not None
    out = ["", f"Generator: {g.name}, {g.fuel}, {g.rated_kw:g} kW rated"]
    if "refused" in sec:
        return out + _wrap("  cannot serve: " + sec["refused"]["message"], "    ")
    d, f, k = sec["derating"], sec["fuel_curve"], sec["check"]
    out.append(
        f"  derated {d['derated_kw']:.2f} kW; fuel = {f['a_l_h_per_kw']:.4f} x rating + "
        f"{f['b_l_per_kwh']:.4f} x output L/h"
    )
    out.append(
        f"  starting need {k['starting_need_w'] / 1000:.2f} kW within the derated output; "
        f"minimum loading {k['min_load_w'] / 1000:.2f} kW"
    )
    out += _wrap(
        "  run hours, litres a year and the cheapest mix of sun and fuel: offgrid generator",
        "    ",
    )
    out += _wrap("! " + sec["cautions"][0])
    return out
