"""The report's generator section (issue 16): rendering only, from the generator study.

Without a study (the report run without simulation) the section shows what needs no
weather: derating, the fuel line and its fit, the generator check, its parts and the
cautions.  With :class:`~offgrid.generator.study.GeneratorStudy` it adds the hourly
simulation, the present-worth costs and the trade-off of sun, battery and fuel.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from offgrid.catalogue import figure_entry, table_entry
from offgrid.catalogue.outcomes import (
    GENERATOR_COST_FIGURES,
    HYBRID_FIGURES,
    outcome_key,
    outcome_value,
)
from offgrid.design.result import SystemDesign
from offgrid.economics.costs import money
from offgrid.generator.cautions import generator_cautions
from offgrid.project.model import Project
from offgrid.report.document import Block, Bullets, Cell, Chart, Paragraph, Section, Table

if TYPE_CHECKING:
    from offgrid.generator.hybrid import GeneratorSetup
    from offgrid.generator.study import GeneratorStudy

KEY = "generator"
TITLE = "Generator beside the sun"


def _c(text: str, value: float | None = None) -> Cell:
    """A cell without a design path: the generator's figures are in its own JSON section."""
    return Cell(text, value)


def _entries(shown):
    """(catalogue figure row, value) for (path, value) pairs."""
    return ((figure_entry(path), value) for path, value in shown)


def _figures(setup: GeneratorSetup) -> list[Block]:
    d, f, k = setup.derating, setup.fuel, setup.check
    shown = (
        ("generator.derating.derated_kw", d.derated_kw),
        ("generator.fuel_curve.no_load_l_h", f.no_load_l_h),
        ("generator.fuel_curve.b_l_per_kwh", f.b_l_per_kwh),
        ("generator.check.starting_need_w", k.starting_need_w),
        ("generator.check.min_load_w", k.min_load_w),
    )
    # label, value in the catalogue's unit (scaled: W shown in kW), the stored value
    rows = tuple((e.label, e.text(v), v) for e, v in _entries(shown))
    how = (
        f"{figure_entry('generator.derating.derated_kw').label}: {d.rated_kw:g} kW x "
        f"{d.factor:.3f} at {d.altitude_m:.0f} m and "
        f"{d.temp_c:.1f} C ({d.reason.source}).",
        f"Fuel line: fuel = {f.a_l_h_per_kw:.4f} x rating + {f.b_l_per_kwh:.4f} x output "
        f"L/h, R^2 {f.r_squared:.4f} ({f.reason.source}).",
        f"{figure_entry('generator.check.starting_need_w').label}: the largest start with "
        "the loads beside it + the charger's input "
        f"{k.charger_input_w / 1000:.2f} kW, within the derated output: "
        + ("yes" if k.ok else "no")
        + f" ({k.reason.source}).",
        f"{figure_entry('generator.check.min_load_w').label}: "
        f"{setup.spec.min_load_fraction:.0%} of the derated output, against "
        "wet stacking; below it a dump load takes the rest (common practice, no source).",
    )
    return [
        Table(
            "generator-figures",
            ("Figure", "Value"),
            tuple((_c(a), _c(b, v)) for a, b, v in rows),
            ("l", "r"),
        ),
        Bullets(how),
    ]


def _fit(setup: GeneratorSetup) -> Table:
    f = setup.fuel
    rows = tuple(
        (
            _c(f"{x:.2f}", x),
            _c(f"{y:.3f}", y),
            _c(f"{z:.3f}", z),
            _c(f"{y - z:+.3f}", y - z),
        )
        for x, y, z in zip(f.points_kw, f.points_l_h, f.fitted_l_h, strict=True)
    )
    return Table(
        "generator-fuel-fit",
        ("Load kW", "Datasheet L/h", "Line L/h", "Difference"),
        rows,
        ("r", "r", "r", "r"),
        "The fuel line fitted by least squares to the datasheet points.",
    )


def _run(study: GeneratorStudy) -> Table:
    r = study.run
    rows = []
    for row in HYBRID_FIGURES:  # the catalogue's rows (offgrid/catalogue/outcomes.py)
        path = row.path
        e = figure_entry(path)
        v = outcome_value(r, path)
        if v is not None:
            rows.append((e.label, e.text(float(v)), float(v)))
    return Table(
        "generator-run",
        ("Hybrid simulated", "Value"),
        tuple((_c(a), _c(b, v)) for a, b, v in rows),
        ("l", "r"),
        f"{study.chosen}; {study.years} years of hourly synthetic weather, "
        f"{r.rule.replace('_', ' ')}.",
    )


def _costs(study: GeneratorStudy) -> Table:
    c = study.cost
    cur = c.currency
    rows = tuple(  # the catalogue's rows (offgrid/catalogue/outcomes.py)
        (e.label, "-" if v is None else e.text(float(v), currency=cur), v)
        for e, v in (
            (figure_entry(row.path), outcome_value(c, row.path)) for row in GENERATOR_COST_FIGURES
        )
    )
    return Table(
        "generator-costs",
        ("Cost", "Amount"),
        tuple((_c(a), _c(text, v)) for a, text, v in rows),
        ("l", "r"),
        c.reasons[outcome_key("generator_costs.fuel_pw")].source,
    )


def _chart(study: GeneratorStudy, with_charts: bool) -> Chart:
    m = study.mix
    assert m is not None
    by_bank: dict[float, list] = {}
    for p in m.points:
        by_bank.setdefault(round(p.battery_kwh, 2), []).append(p)
    curves = [
        (
            f"battery {kwh:.1f} kWh",
            [p.array_w / 1000 for p in sorted(pts, key=lambda q: q.array_w)],
            [p.lcc / 1000 for p in sorted(pts, key=lambda q: q.array_w)],
        )
        for kwh, pts in sorted(by_bank.items())
    ]
    ch = m.cheapest
    svg = ""
    if with_charts:
        from offgrid.report import charts

        svg = charts.tradeoff_svg(
            curves,
            None if ch is None else (ch.array_w / 1000, ch.lcc / 1000),
            "array power (kW)",
            f"lifecycle cost (thousand {m.currency})",
            title="Lifecycle cost of sun, battery and fuel",
        )
    text = tuple(
        f"{label}: "
        + ", ".join(f"{x:.1f} kW/{y:.1f}k" for x, y in list(zip(xs, ys, strict=True))[:5])
        + (" ..." if len(xs) > 5 else "")
        for label, xs, ys in curves
    )
    so = m.solar_only
    return Chart(
        "generator-tradeoff-chart",
        "Lifecycle cost across array sizes",
        svg,
        text,
        f"One line per battery size, with the generator; the star is the cheapest mix. "
        f"Solar only: {so.array_w / 1000:.1f} kW, {so.battery_kwh:.1f} kWh, "
        f"LCC {so.lcc / 1000:.1f}k {m.currency}, unmet {so.unmet_fraction:.2%}.",
    )


def _tradeoff(study: GeneratorStudy, with_charts: bool = False) -> list[Block]:
    m = study.mix
    if m is None:
        return []
    cur = m.currency
    pts = sorted(m.points, key=lambda p: (p.battery_kwh, p.array_w))
    table = table_entry("generator-tradeoff")  # the catalogue's columns
    entries = [figure_entry(path) for path in table.figures]
    rows = []
    for p in (*pts, m.solar_only):
        label = "solar only" if not p.generator else ("cheapest" if p is m.cheapest else "")
        cells = []
        for e in entries:
            v = getattr(p, e.path.rsplit(".", 1)[1])  # a field named in the table
            cells.append(_c(f"{e.shown(v):,.{e.digits or 0}f}", v))
        rows.append((*cells, _c(label)))
    return [
        Table(
            table.id,
            (*table.columns(figure_entry, cur), table.title),
            tuple(rows),
            ("r", "r", "r", "r", "r", "l"),
            table.note,
        ),
        _chart(study, with_charts),
        Bullets(m.notes),
    ]


def generator_section(
    project: Project,
    design: SystemDesign,
    study: GeneratorStudy | None = None,
    base: Path | None = None,
    with_charts: bool = False,
) -> Section | None:
    """The section, or None when the project has no generator."""
    if project.generator is None:
        return None
    from offgrid.design.result import DesignError
    from offgrid.generator.hybrid import generator_setup

    if study is not None:
        setup = study.setup
    else:
        try:
            setup = generator_setup(project, design, base)
        except DesignError as exc:
            return Section(
                KEY,
                TITLE,
                (
                    Bullets((str(exc),), "warning"),
                    Bullets(generator_cautions(project.generator), "caution"),
                ),
            )
    g = setup.spec
    blocks: list[Block] = [
        Paragraph(
            f"{g.name}: {g.fuel}, {g.rated_kw:g} kW rated; charger {g.charger_kw:g} kW at "
            f"{g.charger_efficiency:.0%}; dispatch {g.dispatch.replace('_', ' ')}"
            + (
                f" (start at {g.start_soc:.0%}, stop at {g.stop_soc:.0%} charge)"
                if g.dispatch == "cycle_charging"
                else ""
            )
            + (
                f"; quiet from {g.quiet_from_h:02d} to {g.quiet_to_h:02d} h solar time"
                if g.quiet_from_h is not None and g.quiet_to_h is not None
                else ""
            )
            + "."
        ),
        *_figures(setup),
        _fit(setup),
    ]
    if setup.notices:
        blocks.append(Bullets(tuple(n.message for n in setup.notices), "warning"))
    if study is not None:
        blocks += [_run(study), _costs(study), *_tradeoff(study, with_charts)]
    else:
        blocks.append(
            Paragraph(
                "Run hours, fuel a year and the trade-off of sun and fuel need the "
                "simulation: make the report with --simulate, or run offgrid generator."
            )
        )
    parts = [
        f"Generator set: {g.name}"
        + ("" if g.price is None else f", {money(g.price, project.economics.currency)}"),
        "Changeover switch or interlock (or the inverter-charger's transfer relay)",
        f"Battery charger {g.charger_kw:g} kW (or the inverter-charger's charger)",
        "Fuel store: approved containers or a bunded tank, spill kit, extinguisher",
        "Earthing of the generator frame; one neutral-earth bond",
    ]
    blocks.append(Paragraph("Generator parts to add to the bill of materials:"))
    blocks.append(Bullets(tuple(parts)))
    blocks.append(Bullets(generator_cautions(g), "caution"))
    return Section(KEY, TITLE, tuple(blocks))
