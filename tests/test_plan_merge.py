"""Programme plans split by village: the same plan whatever the number of worker
processes (each village's tilt is searched in the workers), and plans made on different
machines merged into one (offgrid.plan.merge).  Invented villages and households.

Checks: a programme planned with 1 and with 2 workers gives the same JSON (the tilt search
moved into the workers runs the same search on the same demand); two halves planned
apart and merged equal the whole programme planned at once (kits per village, and kits
fixed the same on both machines); a village in two files and differing kits are refused
with the fix (common practice, no source: a merge must not count a village twice).
"""

from __future__ import annotations

import json

import pytest

from offgrid.cli import main
from offgrid.design.cautions import DEFERS_TO_CODE
from offgrid.plan import programme as prog_mod
from offgrid.plan.merge import MergeError, merge_plans
from offgrid.plan.programme import demo_programme_path, plan_programme_file


def _json(plan) -> str:
    return json.dumps(plan.to_dict(), sort_keys=True)


def test_one_and_two_workers_give_the_same_json(monkeypatch):
    serial = plan_programme_file(demo_programme_path(), jobs=1)
    monkeypatch.setattr(prog_mod, "PARALLEL_MIN_DESIGNS", 5)
    searched: list[int] = []
    real = prog_mod.set_community_tilt
    monkeypatch.setattr(
        prog_mod, "set_community_tilt", lambda i, d: searched.append(1) or real(i, d)
    )
    parallel = plan_programme_file(demo_programme_path(), jobs=2)
    assert not searched  # every village's tilt was searched in a worker, not here
    assert all(v.tilt_deg is not None for v in parallel.villages)
    assert _json(parallel) == _json(serial)


# ----------------------------------------------------------------- merging plans


def _split(tmp_path, name: str, keep: set[str]):
    """A part of the bundled demo programme planned on its own: the other villages'
    lines become comments (each village keeps its line number) and the combined survey
    keeps only this part's rows, as a programme splits by village."""
    prog = demo_programme_path()
    lines = []
    for raw in prog.read_text(encoding="utf-8").splitlines():
        vid = raw.split(",", 1)[0]
        if raw and not raw.startswith(("#", "id,")) and vid not in SETTINGS and vid not in keep:
            raw = f"# village {vid} is planned in another part"
        lines.append(raw.replace("demo-programme-survey.csv", f"{name}-survey.csv"))
    (tmp_path / f"{name}.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    survey = prog.with_name("demo-programme-survey.csv").read_text(encoding="utf-8")
    out, col = [], None
    for raw in survey.splitlines():
        cells = raw.split(",")
        if col is None and cells[0] == "id":
            col = cells.index("village")
        elif col is not None and len(cells) > col and cells[col] not in keep:
            continue
        out.append(raw)
    (tmp_path / f"{name}-survey.csv").write_text("\n".join(out) + "\n", encoding="utf-8")
    return tmp_path / f"{name}.csv"


SETTINGS = {"programme", "demo", "project", "prices", "survey"}


def _plan_json(path, scope: str) -> dict:
    return json.loads(json.dumps(plan_programme_file(path, jobs=1, kit_scope=scope).to_dict()))


def _assert_same(merged: dict, whole: dict) -> None:
    assert merged["kit_scope"] == whole["kit_scope"]
    for key in ("rows_read", "distinct_designs", "systems", "kit_counts", "tiers", "currency"):
        assert merged[key] == whole[key], key
    by_id = {v["id"]: v for v in whole["villages"]}
    assert {v["id"]: v for v in merged["villages"]} == by_id
    kits = {(k["scope"], k["name"]): k for k in whole["kits"]}
    assert {(k["scope"], k["name"]): k for k in merged["kits"]} == kits
    mt, wt = merged["totals"], whole["totals"]
    lines = {(ln["category"], ln["description"]): ln for ln in wt["lines"]}
    got = {(ln["category"], ln["description"]): ln for ln in mt["lines"]}
    assert got.keys() == lines.keys()
    for key, ln in lines.items():
        assert got[key]["quantity"] == pytest.approx(ln["quantity"], abs=1e-5), key
        assert got[key]["cost"] == pytest.approx(ln["cost"], abs=1e-4), key
    assert mt["total_cost"] == pytest.approx(wt["total_cost"], abs=1e-3)
    assert mt["systems"] == wt["systems"]
    assert set(merged["cautions"]) == set(whole["cautions"])
    assert merged["left_out"] == whole["left_out"] == []


@pytest.mark.parametrize(
    ("scope", "parts"),
    [("village", ({"KR", "DW"}, {"PA"})), ("zone", ({"KR", "PA"}, {"DW"}))],
)
def test_two_halves_merged_equal_the_whole(tmp_path, scope, parts):
    whole = _plan_json(demo_programme_path(), scope)
    a = _plan_json(_split(tmp_path, "a", parts[0]), scope)
    b = _plan_json(_split(tmp_path, "b", parts[1]), scope)
    assert len(a["villages"]) + len(b["villages"]) == 3
    merged = merge_plans([("a.json", a), ("b.json", b)])
    _assert_same(merged, whole)
    assert "Merged from 2 plans (a.json, b.json)" in merged["notices"][-1]


def test_a_village_in_two_plans_is_refused_naming_both(tmp_path):
    a = _plan_json(_split(tmp_path, "a", {"KR", "DW"}), "village")
    b = _plan_json(_split(tmp_path, "b", {"DW", "PA"}), "village")
    with pytest.raises(MergeError, match=r"village 'DW' is in both a.json and b.json"):
        merge_plans([("a.json", a), ("b.json", b)])


def _schema_1(doc: dict) -> dict:
    """A plan as an older offgrid wrote it: counts and totals, no distinct designs."""
    old = {k: v for k, v in doc.items() if k not in ("planning", "price_list", "design_table")}
    old["villages"] = [{k: x for k, x in v.items() if k != "candidates"} for v in doc["villages"]]
    return old | {"schema": 1}


def _without_merge_notes(doc: dict) -> dict:
    out = {k: v for k, v in doc.items() if k not in ("merged_from", "notices", "source")}
    out["notices"] = [n for n in doc["notices"] if not n.startswith("Merged from ")]
    out["villages"] = [{k: x for k, x in v.items() if k != "own_rows"} for v in doc["villages"]]
    return out


@pytest.mark.parametrize(
    ("scope", "parts"),
    [
        ("programme", ({"KR", "DW"}, {"PA"})),
        ("programme", ({"PA"}, {"DW", "KR"})),  # files in another order than the villages
        ("zone", ({"KR", "PA"}, {"DW"})),
        ("village", ({"DW"}, {"KR", "PA"})),
    ],
)
def test_halves_with_their_designs_choose_the_kits_of_the_whole(tmp_path, scope, parts):
    # One programme's kits over villages planned on two machines: the parts' JSON carry
    # each village's distinct designs with their counts, and the merge chooses the kits
    # again over all of them, by the programme's own code.  Expected: the whole programme
    # planned at once, exactly (kits, parts, counts, tiers, totals, every village figure).
    whole = _plan_json(demo_programme_path(), scope)
    a = _plan_json(_split(tmp_path, "a", parts[0]), scope)
    b = _plan_json(_split(tmp_path, "b", parts[1]), scope)
    if scope == "programme":  # the case a merge of counts alone refused: the kits differ
        assert a["kits"] != whole["kits"] or b["kits"] != whole["kits"]
    merged = merge_plans([("a.json", a), ("b.json", b)])
    assert _without_merge_notes(merged) == _without_merge_notes(whole)
    assert merged["merged_from"] == ["a.json", "b.json"]
    assert "chosen again" in merged["notices"][-1]
    for v, w in zip(merged["villages"], whole["villages"], strict=True):
        assert set(v["own_rows"]) <= set(w["own_rows"])  # one row of each own design
        assert bool(v["own_rows"]) == bool(w["own_rows"])
    # a merged plan merges again: the same plan
    again = merge_plans([("m.json", merged), ("e.json", _empty_part(merged))])
    assert _without_merge_notes(again) == _without_merge_notes(whole)


def _empty_part(doc: dict) -> dict:
    c = json.loads(json.dumps(doc))
    c["villages"], c["left_out"] = [], []
    c["kit_counts"], c["systems"], c["rows_read"], c["distinct_designs"] = {}, 0, 0, 0
    c["design_table"] = {
        "fields": doc["design_table"]["fields"],
        "shared": doc["design_table"]["shared"],
        "rows": [],
    }
    return c


def test_a_merge_with_kits_given_chooses_them_across_the_parts(tmp_path):
    whole = plan_programme_file(demo_programme_path(), jobs=1, kits=2)
    a = _plan_json(_split(tmp_path, "a", {"KR", "DW"}), "programme")
    b = _plan_json(_split(tmp_path, "b", {"PA"}), "programme")
    merged = merge_plans([("a.json", a), ("b.json", b)], kits=2, kit_type_cost=None)
    want = json.loads(json.dumps(whole.to_dict()))
    assert merged["kits"] == want["kits"] and len(merged["kits"]) <= 2
    assert merged["totals"] == want["totals"]
    assert merged["kit_counts"] == want["kit_counts"]


def test_parts_planned_with_other_options_are_refused(tmp_path):
    a = _plan_json(_split(tmp_path, "a", {"KR", "DW"}), "programme")
    b = _plan_json(_split(tmp_path, "b", {"PA"}), "programme")
    # the same price list read from another folder (another machine) is the same prices
    b["price_list"] = dict(b["price_list"], source="/elsewhere/kisanga-ridge-prices.csv")
    assert merge_plans([("a.json", a), ("b.json", b)])["kits"]
    b["price_list"] = dict(b["price_list"], currency="EUR")
    with pytest.raises(MergeError, match=r"price list differs between a.json and b.json"):
        merge_plans([("a.json", a), ("b.json", b)])
    b["price_list"] = a["price_list"]
    b["planning"] = dict(b["planning"], k_max=5)
    with pytest.raises(MergeError, match=r"planning differs between a.json and b.json"):
        merge_plans([("a.json", a), ("b.json", b)])


def test_older_plans_without_designs_merge_counts_and_say_kits_are_not_chosen(tmp_path):
    whole = _plan_json(demo_programme_path(), "village")
    a = _schema_1(_plan_json(_split(tmp_path, "a", {"KR", "DW"}), "village"))
    b = _plan_json(_split(tmp_path, "b", {"PA"}), "village")
    merged = merge_plans([("a.json", a), ("b.json", b)])  # one old file: the old merge
    assert merged["schema"] == 1 and "the kits were not chosen again" in merged["notices"][-1]
    assert merged["kit_counts"] == whole["kit_counts"]
    with pytest.raises(MergeError, match=r"a.json carries no distinct designs"):
        merge_plans([("a.json", a), ("b.json", b)], kits=3)


def test_kits_chosen_apart_are_refused_with_the_fix(tmp_path):
    a = _schema_1(_plan_json(_split(tmp_path, "a", {"KR", "DW"}), "programme"))
    b = _schema_1(_plan_json(_split(tmp_path, "b", {"PA"}), "programme"))
    with pytest.raises(MergeError, match=r"differs between a.json and b.json.*--kit-scope village"):
        merge_plans([("a.json", a), ("b.json", b)])
    # the same kits on both parts merge: a part's kits against themselves
    c = json.loads(json.dumps(b))
    c["villages"] = []
    c["kit_counts"], c["systems"], c["rows_read"], c["distinct_designs"] = {}, 0, 0, 0
    assert merge_plans([("b.json", b), ("c.json", c)])["kit_counts"] == b["kit_counts"]


def test_cli_merges_plan_files(tmp_path, capsys):
    for name, keep in (("a", {"KR", "DW"}), ("b", {"PA"})):
        (tmp_path / f"{name}.json").write_text(
            json.dumps(_plan_json(_split(tmp_path, name, keep), "village"))
        )
    files = [str(tmp_path / "a.json"), str(tmp_path / "b.json")]
    capsys.readouterr()
    assert main(["plan", "--merge", *files, "--json", "--report", str(tmp_path / "m.md")]) == 0
    doc = json.loads(capsys.readouterr().out)
    _assert_same(doc, _plan_json(demo_programme_path(), "village"))
    text = (tmp_path / "m.md").read_text()
    assert "| KR Kisanga Ridge |" in text and DEFERS_TO_CODE in text
    capsys.readouterr()
    assert main(["plan", "--merge", *files, "--json", "--kits", "2"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["planning"]["kits"] == 2 and doc["kit_counts"]
    old = tmp_path / "old.json"
    old.write_text(json.dumps(_schema_1(json.loads((tmp_path / "a.json").read_text()))))
    with pytest.raises(SystemExit) as exit_:
        main(["plan", "--merge", str(old), files[1], "--kits", "3"])
    assert exit_.value.code == 2
    assert "kits cannot be chosen again" in capsys.readouterr().err


def test_the_design_table_reads_back_every_design_exactly():
    from offgrid.plan.rows import DesignTable, designs_from_data

    plan = plan_programme_file(demo_programme_path(), jobs=1)
    table = DesignTable()
    index = [table.add(c.design) for c in plan.candidates]
    back = designs_from_data(json.loads(json.dumps(table.data())))
    assert [back[i] for i in index] == [c.design for c in plan.candidates]
    # field for field, types too (an int written as 30 stays 30, a float 30.0 stays 30.0)
    for i, c in zip(index, plan.candidates, strict=True):
        for name in DesignTable.fields:
            assert type(getattr(back[i], name)) is type(getattr(c.design, name)), name
    assert len(table.rows) == len({c.design for c in plan.candidates})  # equal ones once
