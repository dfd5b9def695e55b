"""Bill of materials: every quantity follows from the design (common practice, no source)."""

from __future__ import annotations

import csv
import io
import math

import pytest

from offgrid.design.sizing import design
from offgrid.design.wiring import WireChoice
from offgrid.economics.bom import CONDUCTORS_PER_RUN, _cable_lines, bill_of_materials, bom_csv
from offgrid.project.model import Load
from tests.conftest import hand_project
from tests.report_helpers import demo


def _by_kind(lines):
    out = {}
    for ln in lines:
        out.setdefault(ln.kind, []).append(ln)
    return out


@pytest.mark.parametrize("controller", ["mppt", "pwm"])
def test_quantities_follow_from_the_design(controller):
    project = hand_project()
    project.controller.type = controller
    d = design(project)
    kinds = _by_kind(bill_of_materials(project, d))
    (mod,) = kinds["module"]
    assert mod.quantity == d.array.modules_series * d.array.modules_parallel
    assert mod.quantity == d.array.module_count
    (bat,) = kinds["battery"]
    assert bat.quantity == d.battery.units_series * d.battery.units_parallel
    (ctl,) = kinds["controller"]
    assert ctl.quantity == d.controller.count
    assert ctl.key == f"controller:{controller.upper()} {d.controller.current_a:g} A"
    (inv,) = kinds["inverter"]
    assert inv.quantity == 1 and f"{d.inverter.continuous_w:g} W" in inv.key


def test_demo_bom_quantities():
    project, base = demo()
    d = design(project, base)
    lines = bill_of_materials(project, d)
    kinds = _by_kind(lines)
    assert kinds["module"][0].quantity == 6  # 3 in series x 2 strings
    assert kinds["battery"][0].quantity == 24  # 24 x 2 V cells make 48 V, one string
    assert kinds["module"][0].key == f"module:{project.module.name}"
    assert kinds["battery"][0].key == f"battery:{project.battery.name}"


def test_dc_only_project_has_no_inverter():
    project = hand_project()
    project.loads = [Load("DC lights", 4, 10.0, 5.0, "dc")]
    d = design(project)
    assert not d.inverter.needed
    assert "inverter" not in _by_kind(bill_of_materials(project, d))


def test_cable_by_size_two_conductors_per_run_rounded_up():
    def run(name, current_a, length_m, size):
        return WireChoice(
            key=name,
            run=name,
            count=1,
            current_a=current_a,
            operating_current_a=current_a,
            length_m=length_m,
            material="copper",
            size=size,
            area_mm2=0.0,
            resistance_ohm_km=0.0,
            drop_v=0.0,
            drop_pct=0.0,
            drop_limit_pct=0.0,
            ampacity_a=0.0,
            required_ampacity_a=0.0,
            fuse_a=None,
        )

    wires = [
        run("array to controller", 20.0, 10.0, "6 mm2"),
        run("controller to battery", 40.0, 2.2, "6 mm2"),
        run("battery to inverter", 60.0, 1.5, "16 mm2"),
    ]
    lines = {ln.key: ln for ln in _cable_lines(wires)}
    assert CONDUCTORS_PER_RUN == 2
    assert lines["cable:copper 6 mm2"].quantity == 25  # 2 x (10 + 2.2) = 24.4 -> 25 m
    assert lines["cable:copper 16 mm2"].quantity == 3  # 2 x 1.5 = 3 m exactly
    assert lines["cable:copper 6 mm2"].unit == "m"
    assert "array to controller" in lines["cable:copper 6 mm2"].follows


def test_bom_csv_round_trip_with_prices():
    project, base = demo()
    d = design(project, base)
    lines = bill_of_materials(project, d)
    prices = {lines[0].key: 115.0}
    text = bom_csv(lines, prices, "USD")
    rows = list(csv.DictReader(io.StringIO(text)))
    assert [r["part"] for r in rows] == [ln.key for ln in lines]
    assert [float(r["quantity"]) for r in rows] == [ln.quantity for ln in lines]
    assert rows[0]["unit price (USD)"] == "115.00"
    assert float(rows[0]["total (USD)"]) == pytest.approx(115.0 * lines[0].quantity)
    assert rows[1]["unit price (USD)"] == ""  # not priced: left blank, never 0


def test_demo_cable_and_devices_follow_from_the_electrical_design():
    project, base = demo()
    d = design(project, base)
    er = d.electrical
    assert er is not None and er.wires and er.protection.devices
    kinds = _by_kind(bill_of_materials(project, d))
    expected: dict[str, float] = {}
    for w in er.wires:
        key = f"cable:{w.material} {w.size}"
        expected[key] = expected.get(key, 0.0) + 2 * w.length_m * w.count
    got = {ln.key: ln.quantity for ln in kinds["cable"]}
    assert got == {k: float(math.ceil(v - 1e-9)) for k, v in expected.items()}
    device_lines = [
        ln
        for ln in bill_of_materials(project, d)
        if ln.kind in ("fuse", "fuse-or-breaker", "disconnect", "breaker")
    ]
    assert sum(ln.quantity for ln in device_lines) == sum(
        dev.count for dev in er.protection.devices
    )
    for ln in device_lines:
        matching = [
            dev
            for dev in er.protection.devices
            if ln.key.startswith("-".join(dev.kind.split()) + ":")
            and (dev.rating_a is None or f":{dev.rating_a:g} A" in ln.key)
        ]
        assert sum(dev.count for dev in matching) >= ln.quantity
