"""The design records are typed: the electrical result is a declared part of SystemDesign.

Structural checks of this code base (no published source applies): a view reads a field by
its declared name, so a renamed field fails here or in the render test below instead of
showing a blank or a 0.
"""

from __future__ import annotations

import dataclasses
import typing

import pytest

from offgrid.design import electrical as el
from offgrid.design.protection import Device
from offgrid.design.pv import IVCurve, OperatingPoint
from offgrid.design.result import SystemDesign
from offgrid.design.sizing import design
from offgrid.design.wiring import WireChoice
from tests.report_helpers import demo


def _names(cls) -> set[str]:
    return {f.name for f in dataclasses.fields(cls)}


def test_system_design_declares_the_electrical_result():
    hints = typing.get_type_hints(SystemDesign, localns={"ElectricalResult": el.ElectricalResult})
    assert hints["electrical"] == el.ElectricalResult | None


def test_the_demo_design_carries_a_typed_electrical_result():
    project, base = demo()
    d = design(project, base)
    er = d.electrical
    assert isinstance(er, el.ElectricalResult)
    assert isinstance(er.strings, el.StringDesign)
    assert isinstance(er.harvest, el.HarvestResult)
    assert isinstance(er.protection, el.ProtectionResult)
    assert isinstance(er.curve, IVCurve) and isinstance(er.mpp, OperatingPoint)
    assert er.wires and all(isinstance(w, WireChoice) for w in er.wires)
    assert er.protection.devices and all(isinstance(x, Device) for x in er.protection.devices)


@pytest.mark.parametrize(
    ("cls", "used"),
    [
        # the fields the views (report, summary, text UI, bill of materials) read by name
        (
            WireChoice,
            {
                "key",
                "run",
                "count",
                "current_a",
                "operating_current_a",
                "length_m",
                "material",
                "size",
                "drop_pct",
                "ampacity_a",
                "fuse_a",
                "length_path",
            },
        ),
        (
            Device,
            {
                "location",
                "kind",
                "rating_a",
                "voltage_v",
                "count",
                "interrupt_rating_a",
                "note",
                "source",
            },
        ),
        (
            el.ElectricalResult,
            {
                "fit",
                "mpp",
                "curve",
                "strings",
                "harvest",
                "wires",
                "protection",
                "cautions",
                "notices",
                "reasons",
            },
        ),
        (el.HarvestResult, {"pwm_layout", "charging_voltage_v", "pwm_vs_mppt_pct"}),
        (IVCurve, {"voltage_v", "current_a", "power_w"}),
    ],
)
def test_records_have_the_fields_the_views_read(cls, used):
    assert used <= _names(cls), used - _names(cls)
