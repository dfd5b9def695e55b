"""The design engine's whole result, pinned: ``SystemDesign.to_dict()`` of many projects.

Guards refactorings of the design steps (issue 14 item 5): the JSON of the demo, of every
bundled load list with every bundled climate (MPPT and PWM), of the bundled community's
rows and of the test projects (with variants that reach the other branches: PWM, flooded
and lithium banks, AWG aluminium cables, a horizon, soiling by rate, several controllers,
the conservative battery rule, refusals) must stay the same.  The demo is stored whole
(`tests/data/design-golden-demo.json`), all of them together compressed
(`tests/data/design-golden.json.xz`).  This is a regression pin, not a check against an
outside source; the outside checks are in test_sizing.py, test_electrical.py and the others.

The comparison allows float noise and nothing more: numbers within 1e-6 relative (or
1e-6 absolute: the JSON rounds to 6 decimals), and a number printed in a reason's text
within one unit of its last printed digit ("7.38 A" against "7.37 A" for 7.375 A, which
an ulp decides).  Processors differ in the last bits of ``exp`` and ``log`` (numpy picks
its SIMD routines by processor), so an exact hash failed on another machine of the same
kind.  Every key, count, choice and word must match exactly.

After a deliberate change of the engine:
``OFFGRID_REGEN_GOLDEN=1 pytest -n0 tests/test_design_golden.py`` and read the demo's diff.
"""

from __future__ import annotations

import json
import lzma
import math
import os
import re
from collections.abc import Iterator
from dataclasses import replace
from pathlib import Path

import pytest

from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.project.model import Load
from tests.conftest import hand_project
from tests.test_pwm_mppt import _pwm_project
from tests.test_worst_month import LOAD_LISTS, _bundled

DATA = Path(__file__).parent / "data"
GOLDEN = DATA / "design-golden.json.xz"
DEMO = DATA / "design-golden-demo.json"
REGEN = os.environ.get("OFFGRID_REGEN_GOLDEN") == "1"


def _outcome(project, base=None) -> dict:
    try:
        return design(project, base).to_dict()
    except DesignError as exc:
        return {"error": {"code": exc.code, "message": str(exc), "field": exc.field}}


def _canon(data: dict) -> str:
    return json.dumps(data, sort_keys=True, indent=1)


def _demo():
    from offgrid.paths import demo_project_path
    from offgrid.project.store import load_project

    return load_project(demo_project_path())


def _test_projects():
    """Named variants of the hand project and the demo (invented data)."""
    out = {}
    out["hand"] = hand_project()
    p = _pwm_project("pwm", 100.0)  # the 36-cell module on 12 V
    out["hand-pwm-36cell-12v"] = p
    p = hand_project()
    p.controller.type = "pwm"
    out["hand-pwm-60cell"] = p
    p = hand_project()
    p.climate.inline.insolation_kwh_m2_day[5] = 4.2
    p.climate.inline.temp_mean_c[5] = p.climate.inline.temp_max_c[5] = 45.0
    out["hand-hot-june"] = p
    p = hand_project()
    p.wiring.units = "awg"
    p.wiring.material = "aluminium"
    out["hand-awg-aluminium"] = p
    p = hand_project()
    p.choices.system_voltage = 12
    p.loads[0].power_w = 900.0
    p.loads[0].run_m = 40.0
    out["hand-12v-big-dc"] = p
    p = hand_project()
    p.battery = replace(p.battery, chemistry="flooded", nominal_voltage_v=2.0, capacity_ah=100.0)
    p.choices.max_dod = 0.9
    out["hand-flooded-deep"] = p
    p = hand_project()
    p.battery = replace(p.battery, chemistry="lifepo4", nominal_voltage_v=12.8, max_dod=0.9)
    p.choices.system_voltage = "auto"
    out["hand-lifepo4-auto"] = p
    p = hand_project()
    p.site.tilt_deg = None
    p.site.azimuth_deg = None
    p.site.battery_temp_c = None
    p.choices.battery_largest_coldest = True
    p.choices.derates.soiling_rate_pct_per_day = 0.2
    p.climate.inline.record_low_c = None
    out["hand-searched-tilt-coldest"] = p
    p = hand_project()
    p.site.horizon_deg = [(90.0, 25.0), (180.0, 30.0), (270.0, 25.0)]
    p.site.tilt_deg = 20.0
    out["hand-horizon"] = p
    p = hand_project()
    p.loads = [replace(ld, quantity=ld.quantity * 12) for ld in p.loads]
    p.controller.max_current_a = 60.0
    out["hand-several-controllers"] = p
    p = hand_project()
    p.choices.derates.wiring = 0.85
    p.loads.append(Load("AC workshop", 1, 16000.0, 0.5, "ac", surge_w=30000.0))
    p.choices.system_voltage = 48
    out["hand-big-inverter-wiring-derate"] = p
    p = hand_project()
    p.battery = replace(p.battery, capacity_ah=100.0)
    p.choices.autonomy_days = 0.3
    out["hand-small-bank"] = p
    p = hand_project()
    p.loads = [ld for ld in p.loads if ld.ac_dc == "dc"]
    out["hand-dc-only"] = p
    p = hand_project()
    p.loads = [replace(ld, quantity=ld.quantity * 60) for ld in p.loads]
    p.choices.system_voltage = 12
    p.controller.max_current_a = 20.0
    out["hand-refused-controllers"] = p
    p = hand_project()
    p.wiring.battery_short_circuit_a = 4000.0
    p.wiring.module_max_fuse_a = 15.0
    p.wiring.ambient_temp_c = 45.0
    p.site.battery_warm_temp_c = 35.0
    p.site.battery_temp_c = 0.0
    out["hand-fuses-cold-room"] = p
    out["demo"] = _demo()
    p = _demo()
    p.controller.type = "pwm"
    p.choices.system_voltage = 24
    p.battery.nominal_voltage_v = 2.0
    out["demo-pwm-2v"] = p
    p = _demo()
    p.choices.system_voltage = 12
    out["demo-12v"] = p
    return out


def _cases() -> dict[str, dict]:
    from offgrid.climate.files import bundled_climates
    from offgrid.paths import demo_project_path
    from offgrid.plan.rows import communities_dir, prepare, row_project
    from offgrid.plan.survey import load_survey

    cases = {}
    for name, p in _test_projects().items():
        base = demo_project_path().parent if name.startswith("demo") else None
        cases[name] = _outcome(p, base)
    for loads_csv in LOAD_LISTS:
        for climate in sorted(bundled_climates()):
            for ctype in ("mppt", "pwm"):
                p = _bundled(loads_csv, climate)
                p.controller.type = ctype
                cases[f"{loads_csv}|{climate}|{ctype}"] = _outcome(p)
    survey = load_survey(communities_dir() / "kisanga-ridge-community.csv")
    inputs = prepare(survey)
    for i, row in enumerate(survey.rows):
        try:
            p = row_project(inputs, row)
        except ValueError:
            continue
        cases[f"community-row-{i}"] = _outcome(p)
    return cases


@pytest.fixture(scope="module")
def cases() -> dict[str, dict]:
    return _cases()


_NUMBER = re.compile(r"-?\d+(?:\.(\d+))?(?:[eE][-+]?\d+)?")


def _close(a: float, b: float) -> bool:
    return math.isclose(a, b, rel_tol=1e-6, abs_tol=1e-6)


def _same_text(a: str, b: str) -> bool:
    """Equal, or equal but for numbers each within one unit of its last printed digit."""
    if a == b:
        return True
    if _NUMBER.sub("#", a) != _NUMBER.sub("#", b):
        return False
    for ma, mb in zip(_NUMBER.finditer(a), _NUMBER.finditer(b), strict=True):
        x, y = float(ma.group()), float(mb.group())
        places = max(len(ma.group(1) or ""), len(mb.group(1) or ""))
        if not (_close(x, y) or abs(x - y) <= 1.0001 * 10.0**-places):
            return False
    return True


def differences(want, got, path: str = "") -> Iterator[str]:
    """Paths where ``got`` differs from ``want`` by more than float noise."""
    if isinstance(want, dict) and isinstance(got, dict):
        for key in sorted(set(want) | set(got)):
            if key not in want or key not in got:
                yield f"{path}/{key} (only in {'golden' if key in want else 'now'})"
            else:
                yield from differences(want[key], got[key], f"{path}/{key}")
    elif isinstance(want, list) and isinstance(got, list):
        if len(want) != len(got):
            yield f"{path} (length {len(want)} -> {len(got)})"
        else:
            for i, (w, g) in enumerate(zip(want, got, strict=True)):
                yield from differences(w, g, f"{path}[{i}]")
    elif isinstance(want, bool) or isinstance(got, bool) or type(want) is not type(got):
        if want != got or type(want) is not type(got):
            yield f"{path}: {want!r} -> {got!r}"
    elif isinstance(want, float):
        if not _close(want, got):
            yield f"{path}: {want!r} -> {got!r}"
    elif isinstance(want, str):
        if not _same_text(want, got):
            yield f"{path}: {want!r} -> {got!r}"
    elif want != got:
        yield f"{path}: {want!r} -> {got!r}"


def test_noise_passes_and_a_change_fails():
    assert not list(differences({"i": 7.375, "t": "7.38 A"}, {"i": 7.375000001, "t": "7.37 A"}))
    assert not list(differences({"t": "100 W"}, {"t": "100.0 W"}))
    assert list(differences({"t": "7.38 A"}, {"t": "7.36 A"}))
    assert list(differences({"n": 3}, {"n": 4}))
    assert list(differences({"n": 3}, {"n": 3.0}))
    assert list(differences({"v": 1.0}, {"v": 1.00001}))
    assert list(differences({"t": "3 strings"}, {"t": "3 string"}))
    assert list(differences({"a": [1, 2]}, {"a": [1]}))
    assert list(differences({"a": 1}, {"b": 1}))


def test_design_json_is_unchanged(cases):
    if REGEN:
        GOLDEN.write_bytes(lzma.compress((_canon(cases) + "\n").encode(), preset=9))
        DEMO.write_text(_canon(cases["demo"]) + "\n")
    golden = json.loads(lzma.decompress(GOLDEN.read_bytes()))
    assert sorted(golden) == sorted(cases)
    # The demo first, whole, so that a change shows as a readable diff.
    assert not list(differences(json.loads(DEMO.read_text()), cases["demo"]))
    changed = {k: list(differences(golden[k], cases[k])) for k in cases}
    changed = {k: v for k, v in changed.items() if v}
    shown = [f"{k}{v[0]}" for k, v in sorted(changed.items())[:10]]
    assert not changed, f"{len(changed)} of {len(cases)} designs changed: {shown}"


def test_the_golden_reaches_the_branches(cases):
    # The variants must reach what they are there for, or the pin guards less than it says.
    codes = {n["code"] for v in cases.values() if "warnings" in v for n in v["warnings"]}
    for code in (
        "pwm-mismatch",
        "wiring-derate-vs-cables",
        "inverter-above-ratings",
        "charge-rate-high",
        "tilt-searched",
        "record-low-estimated",
        "lead-acid-deep-dod",
        "several-controllers",
        "battery-cold",
        "raise-system-voltage",
    ):
        assert code in codes, code
    errors = {v["error"]["code"] for v in cases.values() if "error" in v}
    assert errors, "no refusal pinned"
    assert any(
        v.get("electrical", {}).get("harvest", {}).get("controller_type") == "pwm"
        for v in cases.values()
    )
