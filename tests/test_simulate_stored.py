"""A risk study kept as JSON reads back to the same records, and a bad file is refused.

Checked against the study itself (every field compared after the round trip) and
against the JSON standard as Python's own reader parses it (RFC 8259: no NaN or
Infinity literals, so a file written here is readable by any JSON reader).
"""

from __future__ import annotations

import dataclasses
import json

import numpy as np
import pytest

from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.simulate.run import simulate_project
from offgrid.simulate.stored import StoredStudy, StoredStudyError, study_from_json, study_to_json


@pytest.fixture(scope="module")
def study() -> StoredStudy:
    path = demo_project_path()
    report = simulate_project(load_project(path), path.parent, years=3, seed=7)
    assert report.tradeoff is not None  # the round trip covers the sweep arrays too
    return StoredStudy(report, path.read_text(), 1.25, str(path))


def same(a, b, where="report") -> None:
    """Field by field, types included (a float read back as an int would fail)."""
    assert type(a) is type(b), where
    if dataclasses.is_dataclass(a):
        for f in dataclasses.fields(a):
            same(getattr(a, f.name), getattr(b, f.name), f"{where}.{f.name}")
    elif isinstance(a, np.ndarray):
        assert a.dtype == b.dtype and np.array_equal(a, b), where
    elif isinstance(a, list | tuple):
        assert len(a) == len(b), where
        for i, (x, y) in enumerate(zip(a, b, strict=True)):
            same(x, y, f"{where}[{i}]")
    elif isinstance(a, dict):
        assert a.keys() == b.keys(), where
        for k in a:
            same(a[k], b[k], f"{where}.{k}")
    else:
        assert a == b, where


def test_round_trip_keeps_every_field(study):
    text = study_to_json(study)
    json.loads(text, parse_constant=lambda c: pytest.fail(f"non-standard JSON {c}"))
    back = study_from_json(text)
    same(study, back, "study")
    assert back.report.to_dict() == study.report.to_dict()


def test_infinite_figures_survive(study):
    wear = dataclasses.replace(study.report.reliability.wear, cycle_life_years=float("inf"))
    rel = dataclasses.replace(study.report.reliability, wear=wear)
    odd = dataclasses.replace(study, report=dataclasses.replace(study.report, reliability=rel))
    back = study_from_json(study_to_json(odd))
    assert back.report.reliability.wear.cycle_life_years == float("inf")


@pytest.mark.parametrize(
    "damage, words",
    [
        (lambda b: b.update(format="something else"), "not a kept risk study"),
        (lambda b: b.update(version=99), "version 99"),
        (lambda b: b["report"]["reliability"].update(lolp="low"), "report.reliability.lolp"),
        (lambda b: b["report"]["reliability"].pop("shed_days"), "report.reliability"),
        (lambda b: b["report"]["reliability"].update(days=3.5), "report.reliability.days"),
        (lambda b: b.update(project_text=None), "project text"),
    ],
)
def test_damaged_file_is_refused_naming_the_field(study, damage, words):
    body = json.loads(study_to_json(study))
    damage(body)
    with pytest.raises(StoredStudyError, match=words.replace(".", r"\.")):
        study_from_json(json.dumps(body))


def test_not_json_is_refused():
    with pytest.raises(StoredStudyError, match="not JSON"):
        study_from_json("\x80\x04\x95 not json")
