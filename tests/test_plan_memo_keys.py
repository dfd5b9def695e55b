"""A memoised step's key holds every input it reads: one changed input, a different result.

Planning designs a village's rows inside one ``design_memo()`` block, and the text UI
keeps one open for its whole run, so a memoised step (the electrical sub-steps keyed on
the few figures they read, the demand-free steps of ``design()``) must never hand one
project's result to another that differs in an input the step reads.  Here one project is
designed inside a memo, then, in the same memo, each of its copies that differ from it in
one input only (every number and choice of the module, battery, controller, inverter,
wiring, design choices, derates and site tables, and the loads); each design must equal
the same copy designed alone by ``design()`` with no memo, figure by figure (the whole
``SystemDesign.to_dict()``, reasons and warnings included).  A key that missed the input
would return the first project's figures.

Invented projects: the invented demo home parts (LiFePO4, PWM) and an MPPT variant with a
lead-acid bank and a DC load, on an invented demo climate.
"""

from __future__ import annotations

import dataclasses
from contextlib import nullcontext
from dataclasses import replace

import pytest

import offgrid.design.sizing as sizing
from offgrid.climate.files import load_climate
from offgrid.design.result import DesignError, plain_reasons
from offgrid.memo import design_memo, memo_active
from offgrid.plan.rows import communities_dir
from offgrid.project.model import ClimateChoice, Load, Project
from offgrid.project.store import load_project

#: Another value for the text and yes/no fields.
CHOICES = {
    ("controller", "type"): {"pwm": "mppt", "mppt": "pwm"},
    ("wiring", "units"): {"mm2": "awg", "awg": "mm2"},
    ("wiring", "material"): {"copper": "aluminium", "aluminium": "copper"},
    ("battery", "chemistry"): {"lifepo4": "agm", "agm": "flooded", "flooded": "lifepo4"},
    ("choices", "system_voltage"): {"auto": 24, 12: 24, 24: 12, 48: 24},
}
#: Typed ``None`` fields get this value in their copy.
WHEN_NONE = {
    ("controller", "max_current_a"): 40.0,
    ("wiring", "ambient_temp_c"): 41.0,
    ("wiring", "battery_short_circuit_a"): 900.0,
    ("wiring", "module_max_fuse_a"): 15.0,
    ("site", "battery_temp_c"): 12.0,
    ("site", "battery_warm_temp_c"): 34.0,
    ("site", "albedo"): 0.3,
    ("module", "beta_voc_pct_per_c"): -0.31,
    ("choices", "max_dod"): 0.55,
}
SKIPPED = {"name", "notes", "horizon_deg", "months"}  # text only, or lists tested elsewhere


def _base(mppt: bool) -> Project:
    p = load_project(communities_dir() / "kisanga-ridge-home-parts.toml")
    c = load_climate("kisanga-ridge-demo")
    p.climate = ClimateChoice(inline=c)
    p.site.latitude_deg, p.site.longitude_deg = c.latitude_deg, c.longitude_deg or 0.0
    p.site.tilt_deg = 15.0
    p.loads = [
        Load(name="lights", quantity=4, power_w=7.0, hours_per_day=5.0, ac_dc="dc"),
        Load(name="radio", quantity=1, power_w=20.0, hours_per_day=4.0, ac_dc="ac"),
    ]
    if mppt:
        p.controller = replace(p.controller, type="mppt", max_pv_voltage_v=150.0)
        p.battery = replace(p.battery, chemistry="agm", nominal_voltage_v=12.0, capacity_ah=100)
        p.loads.append(Load(name="pump", quantity=1, power_w=60.0, hours_per_day=2.0, ac_dc="dc"))
    return p


def _changed(value, table: str, name: str):
    """Another plausible value of one field (None: leave the field out)."""
    if (table, name) in CHOICES:
        return CHOICES[(table, name)].get(value)
    if value is None:
        return WHEN_NONE.get((table, name))
    if isinstance(value, bool):
        return not value
    if isinstance(value, int):
        return value + 1 if name != "insulation_temp_c" else {90: 75, 75: 90, 60: 75}[value]
    if isinstance(value, float):
        if 0.0 < value <= 1.0:  # fractions: stay below 1
            return round(value * 0.97, 6)
        if table == "module":  # a datasheet stays consistent (the fit checks it)
            return value * 1.015
        return value * 1.07 + (0.5 if value == 0 else 0.0)
    return None


def _copies(base: Project) -> list[tuple[str, Project]]:
    """Copies of ``base`` that differ from it in one input each."""
    out = []
    for table in ("module", "battery", "controller", "inverter", "wiring", "choices", "site"):
        record = getattr(base, table)
        for f in dataclasses.fields(record):
            if f.name in SKIPPED:
                continue
            new = _changed(getattr(record, f.name), table, f.name)
            if new is None:
                continue
            p = _copy_of(base)
            setattr(p, table, replace(record, **{f.name: new}))
            out.append((f"{table}.{f.name}", p))
    derates = base.choices.derates
    for f in dataclasses.fields(derates):
        new = _changed(getattr(derates, f.name), "derates", f.name)
        if new is not None:
            p = _copy_of(base)
            p.choices = replace(base.choices, derates=replace(derates, **{f.name: new}))
            out.append((f"choices.derates.{f.name}", p))
    for i, load in enumerate(base.loads):
        for name, new in (
            ("power_w", load.power_w * 1.5),
            ("quantity", load.quantity + 1),
            ("ac_dc", "ac" if load.ac_dc == "dc" else "dc"),
            ("run_m", 3.0),
            ("surge_w", 3.0 * load.power_w),
        ):
            p = _copy_of(base)
            p.loads[i] = replace(load, **{name: new})
            out.append((f"loads[{i + 1}].{name}", p))
    return out


def _copy_of(base: Project) -> Project:
    p = Project(info=replace(base.info), site=replace(base.site), climate=base.climate)
    for name in ("module", "battery", "controller", "inverter", "wiring"):
        setattr(p, name, replace(getattr(base, name)))
    p.choices = replace(base.choices, derates=replace(base.choices.derates))
    p.loads = [replace(ld) for ld in base.loads]
    return p


def _outcome(p: Project):
    try:
        return sizing.design(p).to_dict()
    except DesignError as exc:
        return ("refused", exc.code, str(exc))


@pytest.mark.parametrize("mppt", [False, True], ids=["pwm-lifepo4", "mppt-agm"])
def test_one_changed_input_is_never_served_another_projects_result(mppt):
    base = _base(mppt)
    copies = _copies(base)
    assert len(copies) > 60  # every table's inputs are covered
    alone = {name: _outcome(p) for name, p in copies}
    alone_base = _outcome(base)
    assert not memo_active()
    assert isinstance(alone_base, dict)  # the base is designed, not refused
    assert sum(1 for a in alone.values() if a != alone_base) > 40  # most inputs matter
    for reasons in (plain_reasons, nullcontext):  # planning's plain reasons, then full
        with design_memo(), reasons():
            for name, p in [("base", base), *copies, ("base again", base)]:
                want = alone_base if name.startswith("base") else alone[name]
                assert _outcome(p) == want, name


def test_a_memo_key_keeps_a_values_type_and_sign():
    """1, 1.0 and True print apart in a reason (``fmt``), so they are three keys; a value
    keyed on its own (beside an argument that is not hashable) keeps -0.0 apart too."""
    from offgrid.memo import freeze_key, memoised

    @memoised
    def shown(value, table=None) -> str:
        return repr(value)

    with design_memo():
        assert [shown(1), shown(1.0), shown(True), shown(1)] == ["1", "1.0", "True", "1"]
        assert [shown(1, [1]), shown(1.0, [1]), shown(True, [1])] == ["1", "1.0", "True"]
        assert [shown(-0.0, [1]), shown(0.0, [1])] == ["-0.0", "0.0"]
    assert freeze_key(-0.0) != freeze_key(0.0)
    assert len({freeze_key(1), freeze_key(1.0), freeze_key(True)}) == 3


def test_a_full_memo_drops_its_oldest_entries_not_the_newest():
    # A worker plans village after village: the memo is bounded, and when full it must
    # keep the entries of the village being planned (the newest), not start again empty.
    from offgrid import memo

    calls: list[int] = []

    @memo.memoised
    def square(x: int) -> int:
        calls.append(x)
        return x * x

    with memo.design_memo():
        for x in range(memo.MAX_ENTRIES + 10):
            square(x)
        assert len(square.cache) <= memo.MAX_ENTRIES
        calls.clear()
        newest = range(memo.MAX_ENTRIES - 100, memo.MAX_ENTRIES + 10)  # across the limit
        assert [square(x) for x in newest] == [x * x for x in newest]
        assert calls == []  # served from the memo
        square(0)
        assert calls == [0]  # the oldest was dropped
    # by identity: list.remove compares by equality, and every cleared table equals {}
    memo._caches[:] = [c for c in memo._caches if c is not square.cache]
