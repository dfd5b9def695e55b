"""The report of the invented hybrid lodge carries the generator section (issue 16)."""

from __future__ import annotations

from offgrid.design.sizing import design
from offgrid.generator.study import generator_study, hybrid_demo_path
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.report import render
from offgrid.report.build import build_report


def _keys(report):
    return [s.key for s in report.sections]


def test_section_without_simulation():
    p = load_project(hybrid_demo_path())
    rep = build_report(p, design(p), with_charts=False, with_variants=False)
    assert "generator" in _keys(rep)
    text = render(rep, "txt")
    assert "Generator beside the sun" in text and "--simulate" in text
    assert "carbon monoxide" in text and "changeover" in text.lower()
    assert max(len(line) for line in text.splitlines()) <= 80


def test_section_with_the_study():
    p = load_project(hybrid_demo_path())
    d = design(p)
    st = generator_study(p, years=2, seed=1)
    rep = build_report(p, d, with_charts=False, with_variants=False, generator=st)
    md = render(rep, "md")
    assert "Generator fuel" in md and "solar only" in md and "cheapest" in md
    assert "Lifecycle cost across array sizes" in md
    html = render(build_report(p, d, with_charts=True, with_variants=False, generator=st), "html")
    assert "Generator beside the sun" in html and "Lifecycle cost of sun" in html


def test_no_generator_no_section():
    p = load_project(demo_project_path())
    rep = build_report(p, design(p), with_charts=False, with_variants=False)
    assert "generator" not in _keys(rep)
