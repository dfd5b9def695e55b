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

from offgrid.plan import programme as prog_mod
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
