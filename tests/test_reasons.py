"""Every figure of the JSON has its reason (formula, inputs, source).

Rule of the project: every figure the engine produces carries its reason.  Each numeric
leaf of the JSON's main sections must resolve through :meth:`SystemDesign.why` (by its
JSON path, see :func:`offgrid.design.result.reason_key`), or be listed below as what it is.
"""

from __future__ import annotations

import pytest

from offgrid.design.result import reason_key
from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from tests.conftest import hand_project

SECTIONS = (
    "loads",
    "site",
    "array",
    "battery",
    "controller",
    "inverter",
    "mpp",
    "wires",
    "electrical",
)


def _numeric_leaves(value, path):
    if isinstance(value, dict):
        for k, v in value.items():
            yield from _numeric_leaves(v, f"{path}.{k}")
    elif isinstance(value, list):
        for i, v in enumerate(value):
            yield from _numeric_leaves(v, f"{path}[{i}]")
    elif isinstance(value, int | float) and not isinstance(value, bool):
        yield path


def _projects():
    demo = load_project(demo_project_path())
    pwm = hand_project()
    pwm.controller.type = "pwm"
    dc_only = hand_project()
    dc_only.loads = [ld for ld in dc_only.loads if ld.ac_dc == "dc"]
    many = hand_project()
    many.battery.capacity_ah = 100.0  # parallel battery strings: string fuses
    many.controller.type = "pwm"
    many.loads[0].quantity = 2  # several PV strings per controller: string fuses
    assert design(many).electrical.protection.string_fuses
    return {"demo": demo, "pwm": pwm, "dc-only": dc_only, "many-strings": many}


@pytest.mark.parametrize("name", list(_projects()))
def test_every_json_figure_has_a_reason(name):
    project = _projects()[name]
    d = design(project)
    data = d.to_dict()
    missing = []
    for section in SECTIONS:
        for path in _numeric_leaves(data[section], section):
            r = d.why(path)
            if r is None or not r.formula or not r.source:
                missing.append(reason_key(path, data))
    assert not missing, "no reason for: " + ", ".join(sorted(set(missing)))


def test_reason_key_maps_json_paths():
    data = {"wires": [{"key": "string"}, {"key": "array"}]}
    assert reason_key("wires[1].drop_pct", data) == "wires.array.drop_pct"
    assert reason_key("site.poa_kwh_m2_day[3]") == "site.poa_kwh_m2_day"
    assert reason_key("electrical.strings.min_series") == "strings.min_series"
    assert reason_key("electrical.module_fit.stc_error_pct.vmp") == "module.fit"
    assert reason_key("loads.per_load_wh[2][5]") == "loads.per_load_wh"


def test_wires_json_carries_the_reason_key():
    d = design(hand_project())
    keys = [w["key"] for w in d.to_dict()["wires"]]
    assert keys[:2] == ["array", "charge"] or keys[0] == "string"
    assert all(f"wires.{k}.size" in d.reasons for k in keys)
