"""The one catalogue of inputs and figures (offgrid/catalogue/): complete, true to the model
and the design, and the only source of labels, units, hints and ranges for every view.

Internal consistency checks (no outside reference applies: these are the program's own
names); the ranges themselves are the ones validation already used (issue 14).
"""

from __future__ import annotations

import dataclasses
import typing

import pytest

from offgrid import catalogue
from offgrid.catalogue import (
    FIGURE_LABEL_ROOM,
    FIGURES,
    INPUT_LABEL_ROOM,
    INPUTS,
    RUN_LENGTH_M,
    figure_entry,
    input_entry,
    key_figures,
)
from offgrid.catalogue.outcomes import OUTCOME_LABEL_ROOM
from offgrid.climate.model import MonthlyClimate
from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project import model
from offgrid.project.store import load_project
from offgrid.project.validate import validate_project


@pytest.fixture(scope="module")
def demo():
    project = load_project(demo_project_path())
    return project, design(project, demo_project_path().parent)


def _model_type(path: str):
    """The declared type at a catalogue path of ``Project``, or raise naming the part."""
    cls: typing.Any = model.Project
    parts = path.replace("[]", "").split(".")
    for i, part in enumerate(parts):
        if cls is model.ClimateChoice and part not in {f.name for f in dataclasses.fields(cls)}:
            # the UI edits the climate's own values (climate.record_low_c) in its inline copy
            cls = MonthlyClimate
        hints = typing.get_type_hints(cls)
        assert part in hints, f"{path}: {'.'.join(parts[: i + 1])} is not in {cls.__name__}"
        tp = hints[part]
        # a record, a list of records (loads) or an optional record: descend into it
        args = [a for a in typing.get_args(tp) if dataclasses.is_dataclass(a)]
        cls = args[0] if args else tp
    return cls


def test_every_input_path_is_in_the_project_model():
    for entry in INPUTS:
        if entry.path.startswith("stock."):
            continue  # the [stock] table is kept verbatim in Project.extra (test below)
        _model_type(entry.path)
    assert len({e.path for e in INPUTS}) == len(INPUTS), "an input is listed twice"


def _leaves(cls, prefix: str) -> list[tuple[str, typing.Any]]:
    """(path, declared type) of every leaf of a dataclass, into nested records (pump)."""
    out = []
    hints = typing.get_type_hints(cls)
    for f in dataclasses.fields(cls):
        tp = hints[f.name]
        if dataclasses.is_dataclass(tp):
            out += _leaves(tp, f"{prefix}{f.name}.")
        else:
            out.append((f"{prefix}{f.name}", tp))
    return out


def _literal_words(tp) -> set:
    """The words a ``Literal`` (or an optional one) allows; empty for any other type."""
    if typing.get_origin(tp) is typing.Literal:
        return set(typing.get_args(tp))
    return {w for a in typing.get_args(tp) for w in _literal_words(a)}


def test_every_leaf_of_the_water_and_generator_records_is_catalogued():
    """The [[water]] supply (with its pump) and the [generator] table: every field has its
    row, no row is left over, and a choice row allows exactly the words the file does."""
    from offgrid.project.water_model import WaterSupply

    for cls, prefix in ((WaterSupply, "water[]."), (model.GeneratorSpec, "generator.")):
        leaves = _leaves(cls, prefix)
        missing = [p for p, _ in leaves if catalogue.find_input(p) is None]
        assert not missing, missing
        rows = {e.path for e in catalogue.inputs_under(prefix)}
        assert rows == {p for p, _ in leaves}, rows - {p for p, _ in leaves}
        for path, tp in leaves:
            entry = input_entry(path)
            assert entry.hint, path
            if entry.kind == "choice":
                assert set(entry.values) == _literal_words(tp), path
            elif entry.low is not None:
                assert entry.low < entry.high, path
            assert entry.kind.startswith("auto_") == (type(None) in typing.get_args(tp)), path


def test_every_key_of_the_stock_table_is_catalogued():
    """The [stock] table is no dataclass: its keys are the ones the parts code reads
    (mounting, cable allowance, rates) and the whole rows ``--take`` writes."""
    from offgrid.stock.catalogue import bundled_catalogue_dir, load_catalogue
    from offgrid.stock.project_parts import stock_table, take_parts
    from tests.conftest import hand_project

    cat = load_catalogue(bundled_catalogue_dir())
    parts = [cat.of(k)[0] for k in ("modules", "batteries", "controllers", "inverters")]
    project, _ = take_parts(hand_project(), *parts, ({}, cat.rates))
    written = {f"stock.{k}" for k in stock_table(project)}
    assert written == {"stock.module", "stock.battery", "stock.controller", "stock.inverter"}
    read = {"stock.mounting", "stock.cable_allowance_pct", "stock.rates"}
    assert {e.path for e in catalogue.inputs_under("stock.")} == written | read
    assert input_entry("stock.mounting").values == ("ground", "roof")


def test_every_input_of_the_model_is_catalogued():
    # the leaves of every form's dataclass; horizon, prices, variants, demo flags and the
    # climate's references are edited by their own dialogs, not as one field
    not_fields = {
        "info.demo",
        "site.horizon_deg",
        "climate.ref",
        "climate.inline",
        "loads[].name",
    }
    missing = []
    for top in ("info", "site", "module", "battery", "controller", "inverter", "wiring"):
        cls = _model_type(top)
        for f in dataclasses.fields(cls):
            path = f"{top}.{f.name}"
            if path not in not_fields and catalogue.find_input(path) is None:
                missing.append(path)
    assert not missing, missing


def test_every_figure_path_is_in_the_demo_json_and_has_a_reason(demo):
    _, d = demo
    tree = d.to_dict()
    for entry in FIGURES:
        if entry.path.startswith(
            ("water[].", "generator", "reliability.", "hybrid.", "costs.", "tradeoff.", "mix.")
        ):
            continue  # a water supply's, the generator's, the simulation's, the cost's (below)
        if entry.path.startswith("wires[]."):  # one row for every cable run
            name = entry.path.removeprefix("wires[].")
            assert all(name in w for w in tree["wires"]), entry.path
            keys = [f"wires.{w['key']}.{name}" for w in tree["wires"]]
            assert any(k in d.reasons for k in keys), f"{entry.path}: no run has a reason"
            assert all(catalogue.find_figure(k) is entry for k in keys)
            continue
        nodes = [tree]
        for part in entry.path.split("."):
            name = part.removesuffix("[]")
            assert all(isinstance(n, dict) and name in n for n in nodes), (
                f"{entry.path} not in the JSON"
            )
            nodes = [n[name] for n in nodes]
            if part.endswith("[]"):  # one row for every item of a list (protective devices)
                assert all(isinstance(n, list) and n for n in nodes), entry.path
                nodes = [item for n in nodes for item in n]
        assert entry.explained_by in d.reasons, f"{entry.path}: no reason {entry.explained_by}"
        if "[]" in entry.path:
            assert catalogue.find_figure(entry.path.replace("[]", "[1]")) is entry
    assert len({e.path for e in FIGURES}) == len(FIGURES), "a figure is listed twice"


def test_labels_fit_their_columns():
    assert all(len(e.label) <= INPUT_LABEL_ROOM for e in INPUTS), [
        e.label for e in INPUTS if len(e.label) > INPUT_LABEL_ROOM
    ]

    # the Sizes column holds the design's figures; a water supply's figures are shown in
    # the report and the water dialog, whose lines wrap (40: half an 80-column line)
    # the simulation's and the cost's figures fill the 7 Risk section's wider column
    def room(path: str) -> int:
        if path.startswith("water[]."):
            return 40
        if path.startswith(("reliability.", "hybrid.", "costs.", "generator_costs.")):
            return OUTCOME_LABEL_ROOM
        return FIGURE_LABEL_ROOM

    too_long = [e.label for e in FIGURES if len(e.label) > room(e.path)]
    assert not too_long, too_long


def test_lookup_by_json_path_reason_key_and_load_row():
    assert figure_entry("electrical.strings.max_series") is figure_entry("strings.max_series")
    assert input_entry("loads[3].run_m").path == "loads[].run_m"
    with pytest.raises(KeyError, match="not a figure of the catalogue"):
        figure_entry("array.nothing_w")
    with pytest.raises(KeyError, match=r"site\.nowhere"):
        input_entry("site.nowhere")


# ----------------------------------------------------------------------------- one source


def _swap(monkeypatch, table: dict, path: str, **changes) -> None:
    for key, entry in list(table.items()):
        if entry.path == path:  # every key the entry is found by (JSON path, reason key)
            monkeypatch.setitem(table, key, dataclasses.replace(entry, **changes))


def test_every_view_takes_a_figure_label_from_the_catalogue(monkeypatch, demo):
    from offgrid.report.build import build_report
    from offgrid.report.summary import summary_text
    from offgrid.report.text import render_text
    from offgrid.tui.sections.sizes import figure_rows

    project, d = demo
    for path in ("array.power_w", "battery.nominal_kwh", "mpp.pmp_w"):
        _swap(monkeypatch, catalogue.FIGURES_BY_PATH, path, label=f"Zq {path}")
    rows = [r for r in figure_rows(d) if not isinstance(r, str)]
    report = render_text(build_report(project, d, with_charts=False, with_variants=False))
    summary = summary_text(project, d)
    for path in ("array.power_w", "battery.nominal_kwh", "mpp.pmp_w"):
        assert f"Zq {path}" in [r[0] for r in rows], path
        assert f"Zq {path}" in report, path
        assert f"Zq {path}" in summary, path


def test_every_view_takes_an_input_from_the_catalogue(monkeypatch):
    from offgrid.project.store import _hint
    from offgrid.tui.fields import PARTS_FIELDS

    path = "choices.autonomy_days"
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, path, label="Zq days", hint="Zq hint", low=5.0)
    field = next(f for f in PARTS_FIELDS if not isinstance(f, str) and f.path == path)
    assert (field.label, field.help()) == ("Zq days", "Zq hint")
    assert _hint(path) == "Zq hint"
    project = model.Project()  # 3 days of autonomy: now below the swapped range
    project.climate.ref = "x"
    problems = [p for p in validate_project(project) if p.path == path]
    assert problems and "Zq hint" in problems[0].message


def test_ui_field_tables_hold_only_catalogued_inputs():
    from offgrid.tui.fields import PARTS_FIELDS, PROJECT_FIELDS
    from offgrid.tui.sections.place import CLIMATE_FIELDS
    from offgrid.tui.sections.wires import WIRING_FIELDS

    fields = [
        f
        for f in (*PROJECT_FIELDS, *CLIMATE_FIELDS, *PARTS_FIELDS, *WIRING_FIELDS)
        if not isinstance(f, str)
    ]
    assert len(fields) > 50
    for f in fields:
        entry = input_entry(f.path)
        assert (f.label, f.unit, f.help(), f.reason) == (
            entry.label,
            entry.unit,
            entry.hint,
            entry.reason,
        )
        if f.base_kind == "choice":  # the UI offers exactly the values validation allows
            assert {v for v, _ in f.choices} == set(entry.values), f.path


def test_the_report_and_the_ui_give_a_figure_the_same_label(demo):
    """'Array power' in the UI was 'Array power installed' in the report (issue 14)."""
    from offgrid.report.build import label_of
    from offgrid.tui.sections.sizes import figure_rows

    _, d = demo
    labels = {e.label for e in FIGURES}
    for row in figure_rows(d):
        if not isinstance(row, str):
            assert row[0].strip() in labels, f"Sizes row '{row[0]}' is not a catalogue label"
    for path in key_figures():
        assert label_of(path) == figure_entry(path).label
    assert figure_entry("array.power_w").label == "Array power installed"


# ----------------------------------------------------------------------------- drift


def test_each_sizes_row_shows_its_own_reason(demo):
    """The UI's 'Energy, nominal' showed the reason for battery.capacity_ah (issue 14):
    every row names the reason of the figure it is labelled as, its own when it has one."""
    from offgrid.tui.sections.sizes import figure_rows

    _, d = demo
    by_label = {}
    for e in FIGURES:
        by_label.setdefault(e.label, []).append(e)
    for row in figure_rows(d):
        if isinstance(row, str) or row[0].startswith("  "):
            continue  # headings; derate rows carry their own derate's path
        label, _value, reason = row
        assert reason in {e.explained_by for e in by_label[label]}, (label, reason)
        assert reason in d.reasons, (label, reason)
    nominal = next(r for r in figure_rows(d) if r[0] == figure_entry("battery.nominal_kwh").label)
    assert nominal[2] == "battery.nominal_kwh"


def test_cable_length_limits_are_one_copy():
    """Cable-length limits stood in three places (model, validation, wiring) (issue 14)."""
    from offgrid.design import wiring
    from offgrid.project.loads_csv import check_load

    assert model.RUN_LENGTH_RANGE_M is RUN_LENGTH_M
    assert (wiring.RUN_MIN_M, wiring.RUN_MAX_M) == RUN_LENGTH_M
    runs = [e for e in INPUTS if e.path.startswith("wiring.") and e.path.endswith("_m")]
    runs.append(input_entry("loads[].run_m"))
    assert len(runs) == 6
    for e in runs:
        assert (e.low, e.high) == RUN_LENGTH_M, e.path
    lo, hi = RUN_LENGTH_M
    project = model.Project()
    project.climate.ref = "x"
    project.wiring.array_run_m = hi + 0.5
    assert [p.path for p in validate_project(project)] == ["wiring.array_run_m"]
    project.wiring.array_run_m = hi
    assert validate_project(project) == []
    load = model.Load("pump", power_w=50.0, hours_per_day=2.0, ac_dc="dc", run_m=lo / 2)
    assert [fld for fld, _ in check_load(load)] == ["run_m"]


def test_load_columns_read_their_catalogue_rows(monkeypatch):
    from offgrid.tui.fields import LOAD_COLUMNS

    inputs = [c for c in LOAD_COLUMNS if c.kind != "figure"]
    assert len(inputs) == 10
    for c in inputs:
        e = input_entry(f"loads[].{c.key}")
        assert (c.label, c.unit, c.hint) == (e.label, e.unit, e.hint)
        assert c.kind == e.kind.removeprefix("auto_")
        if c.kind == "choice":
            assert {v for v, _ in c.choices} == set(e.values), c.key
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "loads[].power_w", hint="Zq watts")
    assert next(c for c in LOAD_COLUMNS if c.key == "power_w").hint == "Zq watts"


def test_the_variant_comparison_names_figures_as_the_catalogue_does(monkeypatch):
    """The variants table kept its own units and digits beside the catalogue's labels:
    label, unit and digits of every figure row now follow the catalogue's row."""
    from offgrid.economics.variants import COUNT_ROWS, FIGURE_ROWS, compare_variants

    room = 26  # the Options section's label column (28) less its indent
    paths = [path for path, _get in FIGURE_ROWS]
    for path in paths:
        assert len(figure_entry(path).label) <= room, path
    assert all(label and len(label) <= room for label, _ in COUNT_ROWS)
    assert not {label for label, _ in COUNT_ROWS} & {e.label for e in FIGURES}
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "battery.usable_kwh", unit="Zq", digits=4)
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "array.power_w", label="Zq power")
    project = load_project(demo_project_path())
    project.variants = []
    rows = {
        r.path: r for r in compare_variants(project, demo_project_path().parent, None, False).rows
    }
    assert [p for p in rows if p != "warnings"] == paths
    for path in paths:
        e = catalogue.find_figure(path)
        assert (rows[path].label, rows[path].unit) == (e.label, e.unit), path
    assert rows["array.power_w"].label == "Zq power"
    usable = rows["battery.usable_kwh"]
    assert usable.unit == "Zq" and usable.texts[0] == f"{usable.values[0]:,.4f}"


def test_a_load_is_checked_against_its_catalogue_rows(monkeypatch):
    from offgrid.project.loads_csv import check_load

    load = model.Load("lamp", power_w=50.0, hours_per_day=5.0)
    assert check_load(load) == []
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "loads[].hours_per_day", high=4.0)
    assert [(f, "0-4 hours" in m) for f, m in check_load(load)] == [("hours_per_day", True)]


def test_a_choice_outside_the_catalogue_values_is_refused(monkeypatch):
    project = model.Project()
    project.climate.ref = "x"
    assert validate_project(project) == []
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "wiring.units", values=("awg",))
    assert [str(p) for p in validate_project(project)] == ["wiring.units: 'mm2' must be awg"]


def test_a_ui_field_needs_its_catalogue_row():
    from offgrid.tui.fields import Field

    with pytest.raises(TypeError, match=r"add a row to offgrid/catalogue/inputs\.py"):
        Field("site.tilt_deg", "Tilt")  # the old form, label and all
    with pytest.raises(KeyError, match=r"site\.mast_height_m"):
        Field("site.mast_height_m")


def test_water_generator_and_stock_messages_take_hint_and_range_from_the_catalogue(monkeypatch):
    from offgrid.paths import demo_water_path
    from offgrid.stock.money import rate_problem
    from offgrid.stock.project_parts import stock_problems
    from tests.conftest import hand_project

    project = load_project(demo_water_path())
    level = project.water[0].static_level_m
    project.water[0].pump.controller_efficiency = 0.95
    assert validate_project(project) == [] and level > 10
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "water[].static_level_m", high=10.0,
          hint="Zq level")  # fmt: skip
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "water[].pump.controller_efficiency",
          low=0.99, hint="Zq eff")  # fmt: skip
    said = {p.path: p.message for p in validate_project(project)}
    assert said == {
        "water[1].static_level_m": f"{level:g} is out of range; Zq level",
        "water[1].pump.controller_efficiency": "0.95 is out of range; Zq eff",
    }

    project = model.Project(generator=model.GeneratorSpec(fuel_l_h=[1.0, 1.6, 2.2, 2.9]))
    project.climate.ref = "x"
    assert validate_project(project) == []
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "generator.rated_kw", low=6.0, hint="Zq kW")
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "generator.fuel", values=("lpg",))
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "generator.fuel_l_h", high=2.0)
    said = {p.path: p.message for p in validate_project(project)}
    assert said == {
        "generator.rated_kw": "5 is out of range; Zq kW",
        "generator.fuel": "'diesel' must be one of lpg",
        "generator.fuel_l_h": "fuel use is litres per hour, above 0 (up to 2)",
    }

    project = hand_project()
    project.extra["stock"] = {"mounting": "roof", "cable_allowance_pct": 10.0}
    assert stock_problems(project) == [] and rate_problem(1.08) is None
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "stock.cable_allowance_pct", high=5.0,
          hint="Zq offcuts")  # fmt: skip
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "stock.mounting", values=("ground",))
    _swap(monkeypatch, catalogue.INPUTS_BY_PATH, "stock.rates", high=1.0)
    assert stock_problems(project) == [
        "stock.mounting: 'roof' is not one of: ground",
        "stock.cable_allowance_pct: give a number from 0 to 5 (got 10.0): Zq offcuts",
    ]
    assert "at most 1" in rate_problem(1.08)


def test_the_water_figures_are_the_water_designs_and_the_report_reads_them(monkeypatch):
    import dataclasses as dc

    from offgrid.paths import demo_water_path
    from offgrid.water.design import WaterDesign, water_design
    from offgrid.water.report import water_section

    project = load_project(demo_water_path())
    w = water_design(project, 0)
    rows = [e for e in FIGURES if e.path.startswith("water[].")]
    assert len(rows) == 10
    names = {f.name for f in dc.fields(WaterDesign)}
    for e in rows:
        assert e.path.removeprefix("water[].") in names, e.path
        assert e.explained_by in w.reasons, e.path
        assert catalogue.find_figure(e.path.replace("[]", "[2]")) is e
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "water[].friction_m", label="Zq friction",
          unit="Zq", digits=4)  # fmt: skip
    figures = next(b for b in water_section(w, project.water[0], "w").blocks if hasattr(b, "items"))
    shown = {item.path: item for item in figures.items}
    assert [item.label for item in figures.items] == [
        catalogue.find_figure(e.path).label for e in rows
    ]
    friction = shown["water.friction_m"]
    assert friction.label == "Zq friction" and friction.cell.text == f"{w.friction_m:.4f} Zq"


def test_the_generator_figures_are_in_the_size_json_and_the_report_reads_them(monkeypatch):
    from offgrid.generator.study import hybrid_demo_path, size_section
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text

    project = load_project(hybrid_demo_path())
    d = design(project, hybrid_demo_path().parent)
    tree = {"generator": size_section(project, d, hybrid_demo_path().parent)}
    rows = [e for e in FIGURES if e.path.startswith("generator.")]
    assert len(rows) == 5
    for e in rows:
        node = tree
        for part in e.path.split("."):
            node = node[part]
        assert isinstance(node, float), e.path
        section = e.path.split(".")[1]  # its reason sits beside it in the JSON
        assert tree["generator"][section]["reason"]["source"], e.path
    before = render_text(build_report(project, d, with_charts=False, with_variants=False))
    assert "Derated output" in before
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "generator.derating.derated_kw",
          label="Zq derated", unit="Zq", digits=5)  # fmt: skip
    after = render_text(build_report(project, d, with_charts=False, with_variants=False))
    kw = tree["generator"]["derating"]["derated_kw"]
    assert "Zq derated" in after and f"{kw:.5f} Zq" in after and "Derated output" not in after
    # the check's powers are held in W and shown in kW by the row's scale
    need_w = tree["generator"]["check"]["starting_need_w"]
    assert f"{need_w / 1000:,.2f} kW" in before
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "generator.check.starting_need_w",
          label="Zq need", unit="W", digits=0, scale=1.0)  # fmt: skip
    after = render_text(build_report(project, d, with_charts=False, with_variants=False))
    assert "Zq need" in after and f"{need_w:,.0f} W" in after


# ------------------------------------------------------- simulation and lifecycle cost


@pytest.fixture(scope="module")
def simulated(demo):
    from offgrid.report import simulate_for_report

    project, _ = demo
    base = demo_project_path().parent
    return simulate_for_report(project, base, years=4, seed=1, with_tradeoff=False)


def test_every_outcome_path_is_in_the_simulate_json_or_the_cost_record(demo, simulated):
    from offgrid.catalogue import COST_FIGURES, RELIABILITY_FIGURES
    from offgrid.catalogue.outcomes import outcome_key
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import LifecycleCost, lifecycle_cost

    project, d = demo
    tree = simulated.to_dict()  # what `offgrid simulate --json` prints
    rel = simulated.reliability
    for e in RELIABILITY_FIGURES:
        node = tree
        for part in e.path.split("."):
            assert isinstance(node, dict) and part in node, f"{e.path} not in the JSON"
            node = node[part]
        # the measured years' LOLP is left out when the weather has no measured years
        assert isinstance(node, int | float) or e.path == "reliability.lolp_measured", e.path
        if e.reason is not None:  # a composite row names a reason the record has
            assert outcome_key(e.explained_by) in rel.reasons, e.path
    assert all(outcome_key(e.explained_by) in rel.reasons for e in RELIABILITY_FIGURES)
    names = {f.name for f in dataclasses.fields(LifecycleCost)}
    cost = lifecycle_cost(project, d, bill_of_materials(project, d), simulated)
    for e in COST_FIGURES:
        assert e.path.removeprefix("costs.") in names, e.path
    for key in cost.reasons:  # every explained cost figure is a catalogue row
        assert catalogue.find_figure(key) is not None, key
    for e in COST_FIGURES:  # and every cost row is explained
        assert e.path in cost.reasons, e.path


def test_a_scaled_figure_shows_its_scale_and_its_currency():
    e = figure_entry("reliability.lolp")
    assert (e.scale, e.unit, e.text(0.0123)) == (100.0, "%", "1.230 %")
    assert figure_entry("costs.cost_per_kwh").text(0.51234, currency="EUR") == "0.512 EUR/kWh"
    assert figure_entry("costs.lcc").unit_in("USD") == "USD"


def test_every_view_takes_the_reliability_and_cost_rows_from_the_catalogue(
    monkeypatch, demo, simulated
):
    """The report, the 7 Risk rows, the variants table and the Options price view."""
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import lifecycle_cost
    from offgrid.economics.variants import compare_variants
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text
    from offgrid.tui.sections.options import OptionsSection
    from offgrid.tui.sections.risk import risk_row

    project, d = demo
    rel = simulated.reliability
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "reliability.lolp", label="Zq lolp",
          unit="Zq", digits=5, scale=1000.0)  # fmt: skip
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "costs.lcc", label="Zq lcc",
          unit="Zq {currency}", digits=1)  # fmt: skip
    report = render_text(
        build_report(project, d, reliability=simulated, with_charts=False, with_variants=False)
    )
    cost = lifecycle_cost(project, d, bill_of_materials(project, d), simulated)
    cur = project.economics.currency
    assert "Zq lolp" in report and f"{rel.lolp * 1000:,.5f} Zq" in report
    assert "Zq lcc" in report and f"{cost.lcc:,.1f} Zq {cur}" in report
    label, text, reason, _ = risk_row(rel, "reliability.lolp")
    assert (label, text.split("  ")[0]) == ("Zq lolp", f"{rel.lolp * 1000:,.5f} Zq")
    assert reason is rel.reasons["lolp"]
    assert OptionsSection._cost_text(cost, "costs.lcc") == f"{cost.lcc:,.1f} Zq {cur}"
    table = compare_variants(project, demo_project_path().parent, simulate=lambda p, x: rel)
    rows = {r.path: r for r in table.rows if r.group in {"cost", "reliability"}}
    assert (rows["reliability.lolp"].label, rows["reliability.lolp"].unit) == ("Zq lolp", "Zq")
    assert rows["reliability.lolp"].values[0] == pytest.approx(rel.lolp * 1000)
    assert (rows["costs.lcc"].label, rows["costs.lcc"].unit) == ("Zq lcc", f"Zq {cur}")


def test_a_bad_stock_value_in_a_file_is_reported_with_its_line(tmp_path):
    """``[stock]`` is checked by the store like any other table: the catalogue's range
    and words, with the line it stands on (validate_project reads stock_field_problems)."""
    from offgrid.project.store import ProjectFileError

    text = demo_project_path().read_text(encoding="utf-8")
    assert "[stock]" not in text
    text += '\n[stock]\nmounting = "barn"\ncable_allowance_pct = 300\n\n[stock.rates]\nEUR = -1\n'
    path = tmp_path / "p.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(ProjectFileError) as info:
        load_project(path)
    lines = text.splitlines()
    got = {p.path: p for p in info.value.problems}
    assert set(got) == {"stock.mounting", "stock.cable_allowance_pct", "stock.rates.EUR"}
    for p in got.values():
        key = p.path.rsplit(".", 1)[1]
        assert lines[p.line - 1].startswith(f"{key} ="), (p, lines[p.line - 1])
    assert "ground, roof" in got["stock.mounting"].message
    assert input_entry("stock.cable_allowance_pct").hint in got["stock.cable_allowance_pct"].message
    # a good table loads, and validate_project leaves it alone
    good = text.replace('mounting = "barn"', 'mounting = "roof"')
    good = good.replace("pct = 300", "pct = 15").replace("EUR = -1", "EUR = 1.08")
    path.write_text(good, encoding="utf-8")
    project = load_project(path)
    assert not [p for p in validate_project(project) if p.path.startswith("stock")]


def test_the_hybrid_run_rows_are_the_studys_and_the_report_and_variants_read_them(monkeypatch):
    from offgrid.catalogue import GENERATOR_COST_FIGURES, HYBRID_FIGURES
    from offgrid.catalogue.outcomes import outcome_key
    from offgrid.economics.hybrid_variants import HYBRID_ROWS, hybrid_row
    from offgrid.generator.study import generator_study, hybrid_demo_path
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text

    project = load_project(hybrid_demo_path())
    st = generator_study(project, years=2, seed=1)
    tree = st.to_dict()["simulation"]  # `offgrid generator --json`
    for e in HYBRID_FIGURES:
        node = tree
        for part in e.path.split(".")[1:]:
            node = node[part]
        assert isinstance(node, int | float), e.path
    assert sum(outcome_key(e.path) in st.run.reasons for e in HYBRID_FIGURES) >= 4
    costs = st.to_dict()["costs"]  # the generator's own costs, same JSON
    for e in GENERATOR_COST_FIGURES:
        assert e.path.removeprefix("generator_costs.") in costs, e.path
    assert outcome_key("generator_costs.fuel_pw") in st.cost.reasons
    from offgrid.catalogue.outcomes import MIX_FIGURES

    mix = st.to_dict()["tradeoff"]  # each mix of the trade-off, same JSON
    for e in MIX_FIGURES:
        name = e.path.removeprefix("mix.points[].")
        assert all(isinstance(p[name], int | float) for p in mix["points"]), e.path
        key = outcome_key(e.explained_by)
        assert key in (st.mix.reasons if e.explained_by.startswith("mix.") else st.run.reasons)
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "generator_costs.fuel_pw", label="Zq fuel pw",
          unit="Zq {currency}", digits=1)  # fmt: skip
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "hybrid.capacity_wh", label="Zq battery",
          unit="Wh", digits=0, scale=1.0)  # fmt: skip
    _swap(monkeypatch, catalogue.FIGURES_BY_PATH, "hybrid.fuel_l_per_year", label="Zq fuel",
          unit="Zq", digits=2)  # fmt: skip
    d = design(project, hybrid_demo_path().parent)
    text = render_text(build_report(project, d, with_charts=False, with_variants=False,
                                    generator=st))  # fmt: skip
    assert f"{st.run.capacity_wh:,.0f} Wh" in text and "Zq battery" in text
    assert f"{st.run.fuel_l_per_year:,.2f} Zq" in text and "Zq fuel" in text
    assert f"{st.cost.fuel_pw:,.1f} Zq {st.cost.currency}" in text and "Zq fuel pw" in text
    name, unit, digits, _get = next(r for r in HYBRID_ROWS if r[0] == "hybrid.fuel_l_per_year")
    assert hybrid_row(name, unit, digits, [1.5]) == ("Zq fuel", "Zq", 2, [1.5])
    solar = next(r for r in HYBRID_ROWS if r[0] == "mix.points[].solar_fraction")
    assert hybrid_row(*solar[:3], [0.25]) == ("Mix: solar fraction", "%", 1, [25.0])
    lcc = next(r for r in HYBRID_ROWS if r[0] == "mix.points[].lcc")
    assert hybrid_row(*lcc[:3], [1.0], "EUR")[:2] == ("Mix: lifecycle cost", "EUR")
