"""Reading a project looks up each table's field types once per run (issue 19, speed).

Common practice, no source: a lookup kept must give what looking up afresh gives.
"""

from __future__ import annotations

from offgrid.paths import demo_project_path
from offgrid.project.store import load_project


def test_reading_a_project_evaluates_each_tables_annotations_once(monkeypatch):
    """The project reader looks up each dataclass's field types (``get_type_hints``
    evaluates the annotations: ~40% of reading the demo); a class's fields do not change
    while the program runs, so they are looked up once (the text UI opens, reverts and
    recovers projects; the planner reads one per household)."""
    from offgrid.project import store

    calls: list[object] = []
    original = store.get_type_hints

    def counting(cls, *args, **kwargs):
        calls.append(cls)
        return original(cls, *args, **kwargs)

    monkeypatch.setattr(store, "get_type_hints", counting)
    store.type_hints.cache_clear()
    first = load_project(demo_project_path())
    looked_up = len(calls)
    assert looked_up == len(set(calls)), "a class looked up twice in one read"
    second = load_project(demo_project_path())
    assert len(calls) == looked_up, "the second read looked the classes up again"
    assert first == second
