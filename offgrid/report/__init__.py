"""Design report (text, Markdown, HTML): it only renders.

Entry points for the command line and the text UI:

* :func:`make_report` -- design a project and render its report as a string;
* :func:`render` -- render an already built :class:`~offgrid.report.document.Report`.

The bill of materials, price lists, lifecycle cost and variants it shows are computed
in :mod:`offgrid.economics`.

Nothing here imports a UI library; matplotlib is imported only when a chart is drawn.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from offgrid.project.model import Project

FORMATS = ("html", "md", "txt")
SUFFIXES = {".html": "html", ".htm": "html", ".md": "md", ".markdown": "md", ".txt": "txt"}


def render(report, fmt: str) -> str:
    """Render a report model in ``fmt`` (html, md or txt); no raw control character in it
    (the model's text is one-line already; :func:`offgrid.safetext.visible` guards the rest,
    such as chart labels)."""
    from offgrid.safetext import visible

    if fmt == "html":
        from offgrid.report.html import render_html

        return visible(render_html(report))
    if fmt == "md":
        from offgrid.report.markdown import render_markdown

        return visible(render_markdown(report))
    if fmt == "txt":
        from offgrid.report.text import render_text

        return visible(render_text(report))
    raise ValueError(f"unknown report format '{fmt}'; use one of {', '.join(FORMATS)}")


def simulate_for_report(
    project: Project,
    base: Path | None = None,
    *,
    years: int = 30,
    seed: int | None = 1,
    with_tradeoff: bool = True,
):
    """The reliability study of a project for its report (the simulation's own runner).

    The trade-off's cheapest point is priced from the project's price list when the module
    and the battery unit have prices.
    """
    from offgrid.design.sizing import design as run_design
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import tradeoff_prices
    from offgrid.simulate.run import simulate_project

    prices = tradeoff_prices(project, bill_of_materials(project, run_design(project, base)))
    return simulate_project(
        project, base, years=years, seed=seed, prices=prices, with_tradeoff=with_tradeoff
    )


def make_report(
    project: Project,
    base: Path | None = None,
    fmt: str = "html",
    *,
    reliability: Any = None,
    with_charts: bool | None = None,
    with_variants: bool = True,
    design=None,
    simulate: bool = False,
    years: int = 30,
    seed: int | None = 1,
) -> str:
    """Design ``project`` (unless ``design`` is given) and render its report.

    ``simulate`` runs the reliability study (and simulates each variant) unless a study is
    given as ``reliability``.  Raises :class:`~offgrid.design.result.DesignError` when the project
    does not design, ValueError for bad simulation settings.  Charts are drawn for HTML only
    unless ``with_charts`` says otherwise.
    """
    from offgrid.design.sizing import design as run_design
    from offgrid.report.build import build_report

    if fmt == "client":  # the one-page client summary (text)
        from offgrid.report.client import client_summary_text
        from offgrid.safetext import visible

        d = design if design is not None else run_design(project, base)
        return visible(client_summary_text(project, d))
    if fmt not in FORMATS:
        raise ValueError(f"unknown report format '{fmt}'; use one of {', '.join(FORMATS)}")
    d = design if design is not None else run_design(project, base)
    charts = (fmt == "html") if with_charts is None else with_charts
    comparison = None
    if simulate:
        if reliability is None:
            reliability = simulate_for_report(project, base, years=years, seed=seed)
        if with_variants and project.variants:
            from offgrid.economics.variants import compare_variants

            def one(proj, _design):
                return simulate_for_report(
                    proj, base, years=years, seed=seed, with_tradeoff=False
                ).reliability

            comparison = compare_variants(project, base, simulate=one)
    generator = None
    if simulate and project.generator is not None:  # issue 16: the generator study
        from offgrid.generator.study import generator_study

        generator = generator_study(project, base, years=min(years, 20), seed=seed)
    report = build_report(
        project,
        d,
        base=base,
        reliability=reliability,
        with_charts=charts,
        with_variants=with_variants,
        comparison=comparison,
        generator=generator,
    )
    return render(report, fmt)
