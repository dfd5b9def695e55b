"""The water supplies as report sections (the document model of :mod:`offgrid.report`),
and a stand-alone report for a pumping project with no power system."""

from __future__ import annotations

from pathlib import Path

from offgrid.catalogue import FIGURES, figure_entry
from offgrid.report.document import (
    Bullets,
    Cell,
    Chart,
    FigureItem,
    Figures,
    Paragraph,
    Report,
    Section,
    Table,
)
from offgrid.water.design import MONTHS, WaterDesign, water_design
from offgrid.water.text import water_bom

#: The figures shown with their reasons: the catalogue's ``water[].`` figure rows (label,
#: unit, digits), in catalogue order.
FIGURE_PATHS = tuple(e.path for e in FIGURES if e.path.startswith("water[]."))


def _cell(value: float, unit: str, digits: int, path: str) -> Cell:
    return Cell(f"{value:.{digits}f} {unit}".strip(), float(value), path)


def _day_chart(w: WaterDesign, charts: bool = True) -> Chart:
    """Flow through the limiting month's mean day against the sunshine: an SVG (when charts
    are on) and the same in text columns."""
    g, q = w.day_irradiance_w_m2, w.day_flow_m3_h
    n = len(g)
    hours = [12.0 - n * w.day_step_h / 2 + (k + 0.5) * w.day_step_h for k in range(n)]
    title = f"{MONTHS[w.limiting_month - 1]} mean day: flow against sunshine"
    svg = ""
    if charts:
        from offgrid.report.charts import day_flow_svg

        svg = day_flow_svg(hours, g, q, w.start_irradiance_w_m2, title)
    step = max(1, len(g) // 12)
    rows = ["  solar time  sun W/m2  flow m3/h"]
    g_max = max(max(g), 1.0)
    for i in range(0, n, step):
        bar = "#" * round(20 * g[i] / g_max)
        rows.append(f"  {hours[i]:8.2f} h  {g[i]:8.0f}  {q[i]:9.2f}  {bar}")
    return Chart(
        f"water-day-{w.limiting_month}",
        title,
        svg,
        tuple(rows),
        f"bars: irradiance on the array; the pump starts at {w.start_irradiance_w_m2:.0f} W/m2",
    )


def water_section(w: WaterDesign, supply, key: str, charts: bool = True) -> Section:
    figs = []
    for e in map(figure_entry, FIGURE_PATHS):
        name = e.path.removeprefix("water[].")
        path = e.explained_by  # water.<figure>: its key in WaterDesign.reasons
        r = w.reasons.get(path)
        figs.append(
            FigureItem(
                path,
                e.label,
                _cell(getattr(w, name), e.unit, e.digits, path),  # getattr: the name is data
                r.formula if r else "",
                r.inputs if r else (),
                r.source if r else "",
            )
        )
    months = Table(
        f"{key}-months",
        ("", *MONTHS),
        (
            (Cell("pumped m3/day"), *(Cell(f"{v:.1f}", v) for v in w.water_m3_day)),
            (Cell("need m3/day"), *(Cell(f"{v:.1f}", v) for v in w.need_m3_day)),
        ),
        ("l",) + ("r",) * 12,
        "water per day of each month's mean day, pump direct from the array",
    )
    bom = Table(
        f"{key}-bom",
        ("Part", "Quantity", "Unit", "Note"),
        tuple(
            (Cell(d), Cell(f"{q:g}", q), Cell(u), Cell(n))
            for _k, d, q, u, n in water_bom(w, supply)
        ),
        ("l", "r", "l", "l"),
        "pumping parts",
        (0, 3),
    )
    blocks = [
        Paragraph(
            f"Array of {w.module_count} modules ({w.series} in series x {w.parallel} in "
            f"parallel) for the pump; peak flow {w.peak_flow_m3_h:.2f} m3/h against the "
            f"borehole's safe yield of {supply.safe_yield_m3_h:g} m3/h; the limiting month is "
            f"{MONTHS[w.limiting_month - 1]}."
        ),
        Figures(tuple(figs), "Pumping figures and their reasons"),
        months,
        _day_chart(w, charts),
        bom,
    ]
    if w.notices:
        blocks.append(Bullets(tuple(n.message for n in w.notices), "warning"))
    blocks.append(Bullets(w.cautions, "caution"))
    return Section(key, f"Water supply: {w.name}", tuple(blocks))


def water_sections(project, base: Path | None = None, charts: bool = True) -> list[Section]:
    """One section per ``[[water]]`` supply (none without)."""
    return [
        water_section(water_design(project, i, base), s, f"water-{i + 1}", charts)
        for i, s in enumerate(project.water)
    ]


def water_report(project, base: Path | None = None, charts: bool = True) -> Report:
    """A report of the water supplies alone (a pumping project with no battery system)."""
    from offgrid.wording import for_client

    info = project.info
    return Report(
        title=info.name,
        subtitle=f"Solar water pumping design for {project.site.name or info.name}",
        sections=for_client(tuple(water_sections(project, base, charts))),
        demo=info.demo,
        meta=tuple((k, v) for k, v in (("Client", info.client), ("Designer", info.designer)) if v),
    )
