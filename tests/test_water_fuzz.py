"""Every water supply the checks accept either sizes to finite figures or is refused with a
DesignError naming a field: never a crash, a NaN or an infinity."""

from __future__ import annotations

import copy
import math

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from offgrid.catalogue import inputs_under
from offgrid.design.result import DesignError
from offgrid.paths import demo_water_path
from offgrid.project.store import load_project
from offgrid.water.checks import water_problems
from offgrid.water.design import water_design

BASE = load_project(demo_water_path())
#: the supply's own number inputs with a range (not the monthly need, not the pump's)
SCALAR = [
    f
    for f in inputs_under("water[].")
    if f.low is not None and f.kind == "float" and not f.path.startswith("water[].pump.")
]


def _value(f):
    # mostly near the demo's own value, sometimes anywhere in the accepted range
    return st.one_of(st.floats(f.low, f.high), st.sampled_from([f.low, f.high]))


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    values=st.fixed_dictionaries({f.path.removeprefix("water[]."): _value(f) for f in SCALAR}),
    need=st.floats(0.1, 60.0),
    direct=st.booleans(),
)
def test_accepted_supplies_size_or_are_refused(values, need, direct):
    p = copy.deepcopy(BASE)
    s = p.water[0]
    for k, v in values.items():
        setattr(s, k, v)
    s.need_m3_day = [need] * 12
    if direct:
        s.pump.drive = "direct"
        s.pump.voltage_v = [[45.0, 60.0, 75.0, 90.0], [50.0, 65.0, 80.0, 95.0],
                            [55.0, 70.0, 85.0, 100.0]]  # fmt: skip
        s.pump.max_input_v = 120.0
    if water_problems(p):
        return
    try:
        w = water_design(p, 0)
    except DesignError as exc:
        assert exc.field and exc.code
        return
    d = w.to_dict()
    for k, v in d.items():
        if isinstance(v, float):
            assert math.isfinite(v), k
    assert all(math.isfinite(x) for x in d["water_m3_day"])
    assert w.peak_flow_m3_h <= s.safe_yield_m3_h + 1e-9
