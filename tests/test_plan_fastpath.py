"""Planning's quick path against the plain per-row engine path.

Planning designs a survey's distinct rows once each, inside the demand-independent memo
(offgrid.memo: module fit, I-V harvest, wire-size candidates ...), with plain reason
tuples and, when there are many, in forked worker processes.  The reference here is the
slow path kept as it was: every row built as its own full project
(:func:`offgrid.plan.rows.row_project`, nothing shared) and designed by
:func:`offgrid.design.sizing.design` with no memo and full reasons.  Both must give the
same per-row designs, kits, counts and totals (exact equality, no tolerance).

The survey is invented for this test: a few hundred households, workshops and facilities
with varied demand, AC/DC, surge, load lists, a facility parts project and per-row
overrides, on the bundled invented Kisanga Ridge demo climate.
"""

from __future__ import annotations

import contextlib

import numpy as np
import pytest

from offgrid.design.result import DesignError, PlainReason, Reason, ReasonBook, plain_reasons
from offgrid.design.sizing import design
from offgrid.memo import memo_active
from offgrid.numbers import NumberError, read_number
from offgrid.paths import load_profiles_dir
from offgrid.plan import programme as prog_mod
from offgrid.plan.community import CURVE_KITS, assemble, plan_community, resolve_prices
from offgrid.plan.programme import demo_programme_path, load_programme, plan_programme
from offgrid.plan.rows import (
    DesignedRows,
    RowDesign,
    RowFailure,
    RowRejected,
    community_tilt,
    design_rows,
    prepare,
    row_project,
    summarise,
)
from offgrid.plan.survey import SurveyProblem, read_survey

HEAD = (
    "community,Quick-path check (invented)\ndemo,yes\nclimate,kisanga-ridge-demo\n"
    "project,kisanga-ridge-home-parts\nprices,kisanga-ridge-prices\n"
    "choices.load_growth_pct,10\n"
    "id,name,kind,count,load_list,project,daily_energy_wh,peak_power_w,ac_dc,surge_w,"
    "choices.autonomy_days,site.battery_temp_c\n"
)
LISTS = ("household-basic", "household-medium", "household-kit", "village-shop", "rural-clinic")


def _survey_text(n: int, seed: int = 11) -> str:
    rng = np.random.default_rng(seed)
    out = []
    for i in range(n):
        count = int(rng.integers(0, 6))
        kind = i % 7
        if kind == 0:
            out.append(f"L{i},list {i},household,{count},{LISTS[i % len(LISTS)]},,,,,,,")
        elif kind == 1:  # a facility on its own parts, some with a longer autonomy
            days = "3" if i % 2 else ""
            out.append(
                f"F{i},facility {i},facility,1,{LISTS[4 - i % 2]},"
                f"kisanga-ridge-facility-parts,,,,,{days},"
            )
        else:
            energy = float(rng.uniform(40, 1600))
            peak = max(8.0, energy / float(rng.uniform(2.5, 9.0)))
            ac = "ac" if i % 3 == 0 else "dc"
            surge = f"{3 * peak:.0f}" if (ac == "ac" and i % 4 == 0) else ""
            days = "2" if i % 11 == 0 else ""
            temp = "12" if i % 13 == 0 else ""
            # repeats: some rows copy an earlier figure so rows share one design
            if i % 9 == 0 and i > 20:
                energy, peak = 250.0, 50.0
            out.append(
                f"E{i},home {i},household,{count},,,{energy:.1f},{peak:.1f},{ac},{surge},"
                f"{days},{temp}"
            )
    return HEAD + "\n".join(out) + "\n"


def _inputs(n: int = 320):
    inputs = prepare(read_survey(_survey_text(n), base_dir=load_profiles_dir()))
    community_tilt(inputs)
    return inputs


def _reference_design(inputs, row) -> RowDesign | RowFailure | RowRejected:
    """The slow path: the row's own full project, the plain engine, no memo, full reasons."""
    assert not memo_active()
    try:
        project = row_project(inputs, row)
    except ValueError as exc:
        field, _, message = str(exc).partition(": ")
        return RowRejected(field, message) if message else RowRejected("row", str(exc))
    try:
        d = design(project, inputs.base_dir)
    except DesignError as exc:
        return RowFailure(exc.code, str(exc))
    assert all(isinstance(r, Reason) for r in d.reasons.values())
    return summarise(project, d)


def _reference_rows(inputs) -> DesignedRows:
    """Every row designed on its own."""
    kept, designs, problems = [], [], []
    for row in inputs.survey.rows:
        r = _reference_design(inputs, row)
        if isinstance(r, RowRejected):
            problems.append(SurveyProblem(row.line, row.id, r.field, r.message))
        else:
            kept.append(row)
            designs.append(r)
    return DesignedRows(tuple(kept), tuple(designs), tuple(problems), len(designs))


def _drop_distinct(value):
    """The plan's data without its counts of designs computed and a programme's kit
    inputs (the reference designs every row, so it offers the kit search one candidate
    per row where planning offers one per distinct design: the same kits, counts and
    totals, other candidate lists)."""
    if isinstance(value, dict):
        return {
            k: _drop_distinct(v)
            for k, v in value.items()
            if k not in ("distinct_designs", "candidates", "design_table")
        }
    if isinstance(value, list | tuple):
        return [_drop_distinct(v) for v in value]
    return value


def _plan_dict(plan) -> dict:
    """The plan's JSON data with each row holding its own design (the JSON lists a design
    once per design record and rows name it by ``design_id``: which rows share a record
    is how the designs were computed, not what they are)."""
    data = _drop_distinct(plan.to_dict())
    designs = data.pop("designs", None)
    if designs is not None:
        for row in data["rows"]:
            did = row.pop("design_id")
            row["design"] = None if did is None else dict(designs[did], design_id=None)
    return data


@pytest.fixture(scope="module")
def reference():
    inputs = _inputs()
    return inputs, _reference_rows(inputs)


@pytest.mark.parametrize("jobs", [1, 2])
def test_quick_path_gives_the_reference_designs_per_row(reference, jobs):
    inputs, ref = reference
    got = design_rows(inputs, jobs=jobs)
    assert [r.id for r in got.rows] == [r.id for r in ref.rows]
    assert got.problems == ref.problems
    assert got.designs == ref.designs  # every figure of every row, exactly
    kinds = {type(d) for d in got.designs}
    assert RowDesign in kinds  # the check covers real designs
    assert got.distinct < len(got.rows)  # ... and rows that shared one
    # varied settings really gave varied designs: voltages, controllers, battery layouts
    ok = [d for d in got.designs if isinstance(d, RowDesign)]
    assert len({d.family for d in ok}) >= 2
    assert len({(d.module_count, d.unit_count) for d in ok}) >= 10


def test_quick_path_gives_the_reference_kits_counts_and_totals(reference):
    inputs, ref = reference
    prices = resolve_prices(inputs.survey, None, inputs)
    assert prices is not None
    kit_type = prices.optional("kit_type") if prices.has("kit_type") else None
    slow = assemble(inputs, ref, prices, "cost", 3, kit_type, 12, CURVE_KITS)
    plan = plan_community(inputs.survey, kits=3, objective="cost", prices=prices, jobs=2)
    assert _plan_dict(plan) == _plan_dict(slow)
    assert plan.standard is not None and plan.standard.kits


def test_programme_quick_path_equals_the_per_row_engine(monkeypatch):
    prog = load_programme(demo_programme_path())
    fast = plan_programme(prog, kits=3, jobs=2)
    # the slow reference: the engine per row, each row its own design, no memo
    monkeypatch.setattr(prog_mod, "design_memo", contextlib.nullcontext)
    monkeypatch.setattr(prog_mod, "_build_and_design", _reference_design)

    def each_row(inputs):
        rows = list(inputs.survey.rows)
        return rows, list(range(len(rows)))

    monkeypatch.setattr(prog_mod, "distinct_rows", each_row)
    slow = plan_programme(load_programme(demo_programme_path()), kits=3, jobs=1)
    assert _plan_dict(fast) == _plan_dict(slow)
    assert len(fast.villages) >= 3 and fast.kits


def test_plain_reasons_read_like_reasons_and_stay_scoped():
    book = ReasonBook()
    with plain_reasons():
        quick = ReasonBook()
        quick.add("a.b", "x + y", "a source", x="1 V")
    book.add("a.b", "x + y", "a source", x="1 V")
    r, p = book.freeze()["a.b"], quick.freeze()["a.b"]
    assert isinstance(r, Reason) and isinstance(p, PlainReason)
    assert (p.formula, p.inputs, p.source) == (r.formula, r.inputs, r.source)
    assert p.as_dict() == r.as_dict()
    assert isinstance(ReasonBook()._make("f"), Reason)  # outside the block: full records


@pytest.mark.parametrize(
    "text, value",
    [("0", 0.0), ("007", 7.0), ("1500", 1500.0), (" 42 ", 42.0), ("12.5", 12.5), ("0,5", 0.5)],
)
def test_number_reader_quick_digits_read_as_the_rules_say(text, value):
    # offgrid.numbers module rules (common practice, no source): plain digits as usual
    assert read_number(text) == value


@pytest.mark.parametrize("text", ["1,500", "", "9" * 400, "\u00b2", "nan", "1e400"])
def test_number_reader_still_refuses_what_the_rules_refuse(text):
    with pytest.raises(NumberError):
        read_number(text)
