"""Every figure in the report equals the same figure of ``offgrid size --json`` (parsed).

The JSON is parsed and each figure the report shows is parsed back from its text and
compared within the rounding of the decimals shown.  Check values are the engine's
own JSON (the report must not compute its own figures), so there is no external source.
"""

from __future__ import annotations

import re
from html.parser import HTMLParser

import pytest

from offgrid.catalogue import figure_entry, find_figure, key_figures
from offgrid.design.sizing import design
from offgrid.report.build import build_report
from offgrid.report.document import Figures, Table
from offgrid.report.html import render_html
from offgrid.report.markdown import render_markdown
from offgrid.report.text import render_text
from offgrid.wording import confirm_words
from tests.report_helpers import assert_shown_equals, at_path, demo, size_json

KEY_FIGURES = key_figures()


@pytest.fixture(scope="module")
def demo_report():
    project, base = demo()
    d = design(project, base)
    return build_report(project, d, base=base, with_charts=False)


def _paths_in(report):
    for sec in report.sections:
        for block in sec.blocks:
            if isinstance(block, Table):
                for row in block.rows:
                    for cell in row:
                        if (
                            cell.path
                            and cell.value is not None
                            and not cell.path.startswith(("costs.", "reliability."))
                        ):
                            yield cell.path, cell.value, cell.text
            elif isinstance(block, Figures):
                for item in block.items:
                    if item.cell.value is not None and item.cell.path:
                        yield item.cell.path, item.cell.value, item.cell.text


def test_model_figures_are_the_json_figures(demo_report):
    data = size_json()
    checked = 0
    for path, value, text in _paths_in(demo_report):
        expected = at_path(data, path)
        assert value == pytest.approx(expected, rel=1e-6, abs=1e-6), path
        assert_shown_equals(text, _as_shown(path, expected), path)
        checked += 1
    assert checked > 150  # the climate, loads, monthly and sized figures all carry paths


def _as_shown(path: str, value: float) -> float:
    """A design figure as the report shows it: times its catalogue row's scale (a
    fraction shown in %)."""
    entry = find_figure(path)
    return entry.shown(float(value)) if entry is not None else value


class _PathCells(HTMLParser):
    """Collect the text of every element that has a data-path attribute."""

    def __init__(self) -> None:
        super().__init__()
        self.found: list[tuple[str, str]] = []
        self._open: list[tuple[str, str, list[str]]] = []

    def handle_starttag(self, tag, attrs):
        path = dict(attrs).get("data-path")
        if path:
            self._open.append((tag, path, []))

    def handle_data(self, data):
        for _, _, parts in self._open:
            parts.append(data)

    def handle_endtag(self, tag):
        if self._open and self._open[-1][0] == tag:
            _, path, parts = self._open.pop()
            self.found.append((path, "".join(parts)))


def test_html_figures_equal_size_json(demo_report):
    data = size_json()
    parser = _PathCells()
    parser.feed(render_html(demo_report))
    checked = set()
    for path, text in parser.found:
        if path.startswith(("costs.", "reliability.")) or text.startswith("by month"):
            continue
        expected = at_path(data, path)
        if isinstance(expected, bool):
            assert text == ("yes" if expected else "no"), path
        elif isinstance(expected, str):
            assert text == expected, path
        else:
            assert_shown_equals(text, _as_shown(path, expected), f"html {path}")
        checked.add(path)
    for path in KEY_FIGURES:
        assert path in checked, f"{path} is not shown in the HTML report"


def _label_values(text: str, pattern: str) -> dict[str, str]:
    return {m.group(1).strip(): m.group(2).strip() for m in re.finditer(pattern, text, re.M)}


def test_text_figures_equal_size_json(demo_report):
    data = size_json()
    shown = _label_values(render_text(demo_report), r"^(\S.*?) \.{2,} (.+)$")
    for path in KEY_FIGURES:
        label = figure_entry(path).label
        assert label in shown, f"text report lacks '{label}'"
        assert_shown_equals(shown[label], _as_shown(path, at_path(data, path)), f"txt {path}")


def test_markdown_figures_equal_size_json(demo_report):
    data = size_json()
    shown = _label_values(render_markdown(demo_report), r"^- \*\*(.+?): (.+?)\*\*\\?$")
    for path in KEY_FIGURES:
        label = figure_entry(path).label.replace("_", "\\_")
        assert label in shown, f"markdown report lacks '{label}'"
        assert_shown_equals(shown[label], _as_shown(path, at_path(data, path)), f"md {path}")


def test_every_reason_of_the_design_is_in_the_report(demo_report):
    project, base = demo()
    d = design(project, base)
    shown = {
        item.path: item
        for sec in demo_report.sections
        for block in sec.blocks
        if isinstance(block, Figures)
        for item in block.items
    }
    for path, reason in d.reasons.items():
        parts = path.split(".")
        if parts[0] == "wires" and len(parts) == 3:  # one item per schedule column
            item = shown[f"wires.*.{parts[2]}"]
            run = next(w.run for w in d.electrical.wires if w.key == parts[1])
            assert run in dict(item.inputs), path
        else:
            assert path in shown, path
            item = shown[path]
        assert item.formula == reason.formula
        # the report words a recalled value for the client (offgrid.wording)
        assert item.source == confirm_words(reason.source)


def test_reliability_figures_equal_simulate_json():
    """With --simulate, the reliability figures are those of ``offgrid simulate --json``."""
    import io
    import json
    from contextlib import redirect_stdout

    from offgrid.catalogue import RELIABILITY_FIGURES
    from offgrid.cli import main
    from offgrid.report import simulate_for_report

    buf = io.StringIO()
    with redirect_stdout(buf):
        assert main(["simulate", "--demo", "--json", "--years", "8", "--no-sweep"]) == 0
    data = json.loads(buf.getvalue())
    project, base = demo()
    study = simulate_for_report(project, base, years=8, seed=1, with_tradeoff=False)
    report = build_report(
        project,
        design(project, base),
        base=base,
        reliability=study,
        with_charts=False,
        with_variants=False,
    )
    scale = {e.path: e.scale for e in RELIABILITY_FIGURES}
    checked = 0
    for sec in report.sections:
        for block in sec.blocks:
            if isinstance(block, Figures):
                for item in block.items:
                    if item.path in scale and item.path != "reliability.shed_days":
                        expected = at_path(data, item.path) * scale[item.path]
                        assert_shown_equals(item.cell.text, expected, item.path)
                        checked += 1
    assert checked >= 10
    # the lifecycle cost uses the simulated battery life and served share
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost

    d = design(project, base)
    cost = lifecycle_cost(project, d, bill_of_materials(project, d), study)
    assert cost.battery_life_years == data["reliability"]["wear"]["expected_life_years"]
    assert cost.served_fraction == pytest.approx(
        1 - data["reliability"]["unmet_fraction"], abs=1e-6
    )  # the JSON rounds to 6 places
