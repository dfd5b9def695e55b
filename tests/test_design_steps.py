"""The design steps take the quantities they need and return values (issue 14 item 5).

Structural checks, not physics (the physics is checked against its sources in
test_sizing.py, test_electrical.py and the others): no step function of the design
pipeline takes the whole project or a shared accumulator (a ReasonBook or a list of
notices to append to), every step returns a record with its own reasons, and the pipeline
combines the steps' reasons into what ``design()`` returns.
"""

from __future__ import annotations

import importlib
import inspect

import pytest

STEP_MODULES = (
    "offgrid.design.site_step",
    "offgrid.design.array_step",
    "offgrid.design.controller_step",
    "offgrid.design.battery_step",
    "offgrid.design.inverter_step",
    "offgrid.design.electrical.operating_point",
    "offgrid.design.electrical.string_layout",
    "offgrid.design.electrical.cable_runs",
    "offgrid.design.electrical.harvest_compare",
    "offgrid.design.electrical.protection_schedule",
)
SHARED = {"project", "book", "rb", "notices", "core"}


def _functions(name: str):
    mod = importlib.import_module(name)
    for fname, fn in vars(mod).items():
        if inspect.isfunction(fn) and fn.__module__ == name:
            yield fname, fn


@pytest.mark.parametrize("name", STEP_MODULES)
def test_no_step_takes_the_project_or_a_shared_accumulator(name):
    wide = {
        f"{fname}({p})"
        for fname, fn in _functions(name)
        for p in inspect.signature(fn).parameters
        if p in SHARED
    }
    assert wide == set()


@pytest.mark.parametrize("name", STEP_MODULES)
def test_each_public_step_returns_a_record_with_its_reasons(name):
    steps = [
        (fname, fn)
        for fname, fn in _functions(name)
        if not fname.startswith("_")
        and str(inspect.signature(fn).return_annotation).endswith("Step")
    ]
    assert steps, f"{name} has no step function"
    mod = importlib.import_module(name)
    for fname, fn in steps:
        record = getattr(mod, inspect.signature(fn).return_annotation)
        assert "reasons" in record.__dataclass_fields__, fname


def test_the_pipeline_combines_every_steps_reasons(project):
    # The design's reasons are the union of the steps' own: the battery step's, run alone on
    # the design's own inputs, are all in the design, with the same formulas.
    import numpy as np

    from offgrid.design.battery_step import size_battery
    from offgrid.design.sizing import design

    d = design(project)
    step = size_battery(
        project.battery,
        project.choices,
        d.loads.daily_energy_wh,
        d.battery.system_voltage_v,
        d.battery.absorption_voltage_v,
        np.asarray(d.site.temp_mean_c),
        project.site.battery_temp_c,
        project.site.battery_warm_temp_c,
    )
    assert step.battery.capacity_ah == d.battery.capacity_ah
    for key, reason in step.reasons.items():
        assert d.reasons[key] == reason, key
    assert {n.code for n in step.notices} <= {n.code for n in d.warnings}
