"""The 80-column summary shows the same figures as the JSON of the same design."""

from __future__ import annotations

import re

import pytest

from offgrid.design.sizing import MONTHS, design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.report.summary import summary_text
from tests.conftest import hand_project


def _cases():
    pwm = hand_project()
    pwm.controller.type = "pwm"
    # several controllers: 4 x the lights (3 now fit one 100 A controller, 6 modules, since
    # the PWM derate chain takes the I-V current at the operating voltage, not Imp)
    pwm.loads[0].quantity = 4
    assert design(pwm).controller.count > 1
    return {"demo": load_project(demo_project_path()), "hand": hand_project(), "pwm": pwm}


@pytest.mark.parametrize("name", list(_cases()))
def test_summary_figures_equal_the_json(name):
    project = _cases()[name]
    d = design(project)
    j = d.to_dict()
    text = summary_text(project, d)
    a, b, c, inv = j["array"], j["battery"], j["controller"], j["inverter"]
    assert f"Design month: {MONTHS[j['site']['design_month'] - 1]}" in text
    assert re.search(
        rf"Array power installed\s+{a['power_w']:.0f} W\s+{a['modules_series']} series x "
        rf"{a['modules_parallel']} parallel",
        text,
    )
    assert re.search(
        rf"Battery capacity installed\s+{b['capacity_ah']:.0f} Ah at {b['system_voltage_v']} V\s+"
        rf"{b['units_series']} series x {b['units_parallel']} parallel",
        text,
    )
    count = f"{c['count']} x " if c["count"] > 1 else ""
    assert re.search(
        rf"Controller rating\s+{count}{c['current_a']:.0f} A {c['type'].upper()}", text
    )
    per = c["required_current_a"] / c["count"]
    assert f"needs {per:.1f} A" in text
    if inv["needed"]:
        assert re.search(
            rf"Inverter continuous rating\s+{inv['continuous_w']:.0f} W continuous", text
        )
    strings = j["electrical"]["strings"]
    assert f"chosen {strings['series']} x {strings['parallel']} parallel" in text
    for w in j["wires"]:
        row = [line for line in text.splitlines() if line.strip().startswith(w["run"][:22])]
        assert row, w["run"]
        assert w["size"] in row[0] and f"{w['drop_pct']:.2f}" in row[0], (w, row[0])
        assert f"{w['current_a']:.1f}" in row[0] and f"{w['drop_current_a']:.1f}" in row[0]
    dm = j["site"]["design_month"] - 1
    supply = text.split("Array supply")[1].splitlines()[2].split()
    assert float(supply[dm]) == pytest.approx(a["supply_wh_day"][dm], abs=0.5)
    for notice in j["warnings"]:
        assert f"[{notice['code']}]" in text
    flat = " ".join(text.split())
    assert flat.endswith(" ".join(j["cautions"][-1].split()))  # the defers-to-code line
