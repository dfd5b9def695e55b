"""Every figure label a view shows is the catalogue's (issue 14: one label per figure).

The bundled demonstration projects (``offgrid/data/*.toml``, invented scenarios) are
rendered through the report (with a short simulation, its trade-off and, where the
project has one, the generator study) and through the row builders of the text UI's
Sizes, 7 Risk and Options sections; every label of a figure row, every heading of a
table of figures and every composite row is checked against the catalogue
(``offgrid/catalogue/``), and every catalogue entry a view uses against the reason
that explains it (``SystemDesign.reasons``, the simulation's, the cost's, the
trade-off's ``TRADEOFF_REASONS``).

Internal consistency checks: the program's own names, no outside reference applies.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

import offgrid
from offgrid import catalogue
from offgrid.catalogue import (
    COMPOSITES,
    EACH_RUN_LABEL,
    FIGURE_GROUPS,
    FIGURES,
    INPUTS,
    TABLES,
    composite,
    figure_entry,
    find_figure,
    table_entry,
)
from offgrid.catalogue.outcomes import outcome_key
from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.project.store import load_project
from offgrid.report.document import Figures, Table

DEMOS = sorted((Path(offgrid.__file__).parent / "data").glob("*.toml"))

#: Report tables whose rows are figures (first cell: the figure's label or heading).
ROW_TABLES = {
    "lifecycle",
    "reliability-months",
    "supply-demand",
    "energy-by-month",
    "mpp",
    "strings",
    "derates",
    "variants",
    "generator-figures",
    "generator-run",
    "generator-costs",
}
#: Report tables whose columns are figures (one row per cable run, per target).
COLUMN_TABLES = {"climate", "wiring", "tradeoff", "generator-tradeoff"}
#: Catalogue tables of the command-line texts, not of the report.
TEXT_TABLES = {"generator-mixes"}
#: Rows of those tables that are not one figure, and why.
NOT_FIGURES = {
    # two typed inputs of the module's datasheet side by side
    "Module Voc / Vmp at STC",
    # the power at the chart's PWM point, read off the drawn curve by the report
    "PWM operating point, power",
    "PWM point (comparison), power",
    # counts of the design's notices (the variants table): not figures of a reason
    "Warnings",
    "Notes",
}


def _labels(currency: str) -> set[str]:
    """Every way the catalogue heads a figure: its label, a row's heading (label and
    unit), a column's (short word and unit); inputs' labels (a variant's changed value)."""
    out = {e.label for e in INPUTS}
    for e in FIGURES:
        out |= {e.label, e.heading(currency), e.column(currency), e.column(unit=False)}
    return out


def _templates() -> list[re.Pattern]:
    """The composite rows as patterns: a figure's placeholder matches its shown text, a
    cable reason's ``{label}`` one of the cable figures' labels."""
    pats = []
    for c in COMPOSITES:
        body = re.escape(c.label)
        for name in c.names:
            if name == "label" and c.value:
                shown = re.escape(figure_entry(c.value).label)
            elif name in c.words:
                shown = ".+?"
            else:  # a figure's text: its number and unit, '-' when not known
                shown = r"(?:-?[\d,.]+(?: \S+)?|-)"
            body = body.replace(re.escape("{" + name + "}"), shown)
            if name in dict(c.parts):  # {name.label}: that figure's label
                label = re.escape(figure_entry(dict(c.parts)[name]).label)
                body = body.replace(re.escape("{" + name + ".label}"), label)
        pats.append(re.compile(f"{body}$"))
    cables = "|".join(re.escape(e.label) for e in FIGURES if e.path.startswith("wires[]."))
    pats.append(re.compile(re.escape(EACH_RUN_LABEL).replace(r"\{label\}", f"(?:{cables})") + "$"))
    return pats


def _is_catalogue_label(label: str, currency: str) -> bool:
    return label in _labels(currency) or any(p.match(label) for p in _templates())


@pytest.fixture(scope="module", params=DEMOS, ids=[p.stem for p in DEMOS])
def rendered(request):
    """(project, design or None, simulation, report, generator study or None) of one
    demonstration project."""
    from offgrid.report import simulate_for_report
    from offgrid.report.build import build_report

    path = request.param
    project = load_project(path)
    base = path.parent
    try:
        d = design(project, base)
    except DesignError:  # a water supply alone: its own report (offgrid water)
        from offgrid.water.report import water_report

        return project, None, None, water_report(project, base, charts=False), None
    sim = simulate_for_report(project, base, years=2, seed=1, with_tradeoff=True)
    generator = None
    if project.generator is not None:
        from offgrid.generator.study import generator_study

        generator = generator_study(project, base, years=1, seed=1)
    report = build_report(
        project, d, base=base, reliability=sim, with_charts=False, generator=generator
    )
    return project, d, sim, report, generator


def _blocks(report):
    for section in report.sections:
        for block in section.blocks:
            yield section.key, block


def test_every_figure_label_of_the_report_is_a_catalogue_label(rendered):
    project, _d, _sim, report, _gen = rendered
    cur = project.economics.currency
    wrong = []
    for key, block in _blocks(report):
        if isinstance(block, Figures):
            wrong += [(key, i.label) for i in block.items if not _is_catalogue_label(i.label, cur)]
            if block.title:
                assert block.title in FIGURE_GROUPS.values() or key.startswith(
                    ("water", "generator", "reliability")
                ), (key, block.title)
        elif isinstance(block, Table) and block.key in ROW_TABLES:
            loads = {f"{i + 1} {ld.name}" for i, ld in enumerate(project.loads)}
            for row in block.rows:
                label = row[0].text
                if label in NOT_FIGURES or (block.key == "energy-by-month" and label in loads):
                    continue  # a load line: loads.per_load_wh of that line
                if not _is_catalogue_label(label, cur):
                    wrong.append((block.key, label))
        elif isinstance(block, Table) and block.key in COLUMN_TABLES:
            heads = table_entry(block.key).columns(figure_entry, cur)
            cols, n = block.columns, len(heads)
            assert any(cols[k : k + n] == heads for k in range(len(cols))), (block.key, cols)
    assert not wrong, wrong


def test_each_catalogue_table_is_the_reports(rendered):
    """A table of the catalogue the report shows keeps its title, its caption and the
    headings of its figures in their order."""
    project, d, _sim, report, _gen = rendered
    if d is None:
        pytest.skip("a water supply alone has no design tables")
    cur = project.economics.currency
    shown = {b.key: b for _, b in _blocks(report) if isinstance(b, Table)}
    for t in TABLES:
        if t.id == "mpp" and d.electrical is None:
            continue
        if t.id == "generator-tradeoff" and project.generator is None:
            continue
        if t.id in TEXT_TABLES:
            continue  # not in the report (below)
        assert t.id in shown, t.id
        block = shown[t.id]
        assert block.caption.endswith(t.note), t.id
        if t.id in COLUMN_TABLES:
            continue  # columns: checked above
        assert block.columns[0] == t.title, t.id
        heads = [row[0].text for row in block.rows]
        for path in t.figures:
            e = figure_entry(path)
            if path == "loads.per_load_wh":
                continue  # one row per load line
            if path.startswith("array.derates.") and path.split(".", 2)[2] not in d.array.derates:
                continue
            if path.startswith("array.harvest_") and not getattr(d.array, path.split(".")[1]):
                continue  # a field named in the table: no harvest computed
            assert e.heading(cur) in heads or e.label in heads, (t.id, path, heads)


def test_every_figure_entry_the_report_uses_resolves_to_its_reason(rendered):
    """Each figure item's catalogue entry names a reason the design (or the simulation,
    the cost, the trade-off) holds."""
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.report.build import DERIVED
    from offgrid.simulate.tradeoff import TRADEOFF_REASONS

    project, d, sim, report, generator = rendered
    if d is None:
        pytest.skip("a water supply alone: its figures are checked in test_catalogue.py")
    cost = lifecycle_cost(project, d, bill_of_materials(project, d), sim)
    rel = sim.reliability
    missing = []
    for key, block in _blocks(report):
        if not isinstance(block, Figures) or key != "figures":
            continue
        for item in block.items:
            path = item.path.replace("wires.*.", "wires[].")
            e = find_figure(path)
            assert e is not None, f"{item.path}: no catalogue entry"
            if item.path.startswith("wires.*."):
                continue  # one reason per run (wires.charge.size), checked in test_catalogue
            if e.explained_by not in d.reasons and item.path not in DERIVED:
                missing.append(item.path)
    assert not missing, missing
    for e in FIGURES:
        head = e.explained_by.split(".", 1)[0]  # the record whose reasons explain it
        key = outcome_key(e.explained_by)
        if head == "reliability":
            assert key in rel.reasons, e.path
        elif head == "tradeoff":
            assert key in TRADEOFF_REASONS, e.path
        elif head == "hybrid" and generator is not None:
            assert key in generator.run.reasons, e.path
        elif head == "costs":
            assert key in cost.reasons, e.path
        elif head == "mix" and generator is not None:
            assert key in generator.mix.reasons, e.path
    for c in COMPOSITES:
        for _, path in c.parts:
            assert find_figure(path) is not None, (c.id, path)
        if c.value:
            assert find_figure(c.value) is not None, (c.id, c.value)
    for t in TABLES:
        for path in t.figures:
            assert find_figure(path) is not None, (t.id, path)


def test_the_ui_sections_rows_are_catalogue_labels(rendered):
    """The row builders of 4 Sizes, 7 Risk (figures, trade-off, month strip) and Options
    (the price view's cost rows and its note) give the catalogue's labels and reasons."""
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.tui.sections.options import BASE_COST_ROWS, OptionsSection
    from offgrid.tui.sections.risk import RISK_ROWS, month_strip_rows, risk_row, tradeoff_rows
    from offgrid.tui.sections.sizes import figure_rows

    project, d, sim, _report, _gen = rendered
    if d is None:
        pytest.skip("a water supply alone: no battery system")
    cur = project.economics.currency
    for row in figure_rows(d):
        if isinstance(row, str):
            assert row in FIGURE_GROUPS.values(), row
        else:
            assert _is_catalogue_label(row[0].strip(), cur), row
    rel = sim.reliability
    for path, extra in RISK_ROWS:
        label, _text, reason, _ = risk_row(rel, path, extra)
        assert label == figure_entry(path).label and reason is not None, path
    assert sim.tradeoff is not None and sim.tradeoff.targets
    for t in sim.tradeoff.targets:
        rows = tradeoff_rows(t)
        assert rows[0][0].startswith(figure_entry("tradeoff.targets[].target").label)
        assert rows[0][1].startswith(figure_entry("tradeoff.targets[].design_meets").label)
        for label, _value, reason, _ in rows[1:]:
            assert _is_catalogue_label(label.strip(), cur) and reason is not None, label
    heads = [h for h, _ in month_strip_rows(rel.months)]
    assert heads == [
        figure_entry(p).heading() for p in table_entry("reliability-months").figures[:2]
    ]
    assert all(len(h) <= catalogue.outcomes.MONTH_LABEL_ROOM for h in heads)
    cost = lifecycle_cost(project, d, bill_of_materials(project, d), sim)
    for path in BASE_COST_ROWS:
        assert find_figure(path) is not None, path
    note = OptionsSection._cost_extra(cost)
    if not cost.missing:
        assert catalogue.fill("costs.sums_note", cost, cur) in note


def test_a_composite_row_is_filled_from_its_figures_in_every_view(monkeypatch):
    """Swap a figure's digits and a template's words: the report's lifecycle table and
    the Options section's note both follow (the label and the numbers in it)."""
    import dataclasses

    from offgrid.catalogue import composites
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.paths import demo_project_path
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text
    from offgrid.tui.sections.options import OptionsSection

    project = load_project(demo_project_path())
    d = design(project, demo_project_path().parent)
    cost = lifecycle_cost(project, d, bill_of_materials(project, d))
    for key, entry in list(catalogue.FIGURES_BY_PATH.items()):
        if entry.path == "costs.pwf_energy":
            monkeypatch.setitem(
                catalogue.FIGURES_BY_PATH, key, dataclasses.replace(entry, digits=5)
            )
    row = composite("costs.discounted_energy_row")
    monkeypatch.setitem(
        composites.COMPOSITES_BY_ID,
        row.id,
        dataclasses.replace(row, label="Zq energy over the life, PWF {pwf}"),
    )
    text = render_text(build_report(project, d, with_charts=False, with_variants=False))
    assert f"Zq energy over the life, PWF {cost.pwf_energy:.5f}" in text
    assert f"x PWF {cost.pwf_energy:.5f}" in OptionsSection._cost_extra(cost)


def test_each_table_and_template_is_well_formed():
    """One label per figure within a table (no two rows or columns headed alike), every
    placeholder of a template a figure of the catalogue, a word the view gives, or the
    value figure's label; composite and table ids unique."""
    for t in TABLES:
        heads = [figure_entry(p).heading() for p in t.figures]
        assert len(set(heads)) == len(heads), t.id
        cols = t.columns(figure_entry)
        assert len(set(cols)) == len(cols), t.id
    for c in COMPOSITES:
        parts = dict(c.parts)
        for name in c.names:
            assert name in parts or name in c.words or (name == "label" and c.value), (c.id, name)
        assert not set(parts) & set(c.words), c.id
        assert set(parts) <= set(c.names), (c.id, "a figure the template does not show")
    assert len({c.id for c in COMPOSITES}) == len(COMPOSITES)
    assert len({t.id for t in TABLES}) == len(TABLES)


def test_the_generator_text_takes_its_figures_from_the_catalogue():
    """offgrid generator: the hourly run, the costs and the mixes of the trade-off are
    the catalogue's rows and table (label or column heading, digits, unit)."""
    from offgrid.catalogue import GENERATOR_COST_FIGURES, HYBRID_FIGURES
    from offgrid.generator.study import generator_study, hybrid_demo_path, summary_text

    st = generator_study(load_project(hybrid_demo_path()), years=1, seed=1)
    text = summary_text(st)
    for e in HYBRID_FIGURES:
        v = catalogue.outcomes.outcome_value(st.run, e.path)
        assert f"{e.label}" in text and e.text(float(v)) in text, e.path
    for e in GENERATOR_COST_FIGURES:
        v = catalogue.outcomes.outcome_value(st.cost, e.path)
        if v is not None:
            assert e.label in text and e.text(float(v), currency=st.cost.currency) in text
    heads = table_entry("generator-mixes").columns(figure_entry, st.cost.currency)
    assert re.search(r"\s+".join(re.escape(h) for h in heads), text), heads
