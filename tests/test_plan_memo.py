"""The demand-independent memo used by planning (offgrid.memo): exact, scoped, read-only.

The reference is the engine itself run without the memo (same inputs, same figures)."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.design.pv import fit_module, module_mpp
from offgrid.design.sizing import design
from offgrid.memo import design_memo, memo_active
from offgrid.paths import load_profiles_dir
from offgrid.plan.rows import community_tilt, prepare, row_project, summarise
from offgrid.plan.survey import read_survey

HEAD = (
    "community,Memo check (invented)\nclimate,kisanga-ridge-demo\n"
    "project,kisanga-ridge-home-parts\nid,count,daily_energy_wh,peak_power_w,ac_dc\n"
)


def _inputs(n: int):
    rows = "".join(
        f"R{i},1,{40 + 37.3 * i:.1f},{12 + 5.1 * i:.1f},{'ac' if i % 3 else 'dc'}\n"
        for i in range(n)
    )
    inputs = prepare(read_survey(HEAD + rows, base_dir=load_profiles_dir()))
    community_tilt(inputs)
    return inputs


def test_memo_designs_equal_plain_designs():
    inputs = _inputs(24)
    projects = [row_project(inputs, r) for r in inputs.survey.rows]
    plain = [summarise(p, design(p)) for p in projects]
    with design_memo():
        memo = [summarise(p, design(p)) for p in projects]
        again = [summarise(p, design(p)) for p in projects]
    assert memo == plain == again


def test_memo_is_scoped_and_shares_the_module_fit():
    inputs = _inputs(1)
    module = inputs.base.module
    assert not memo_active()
    assert fit_module(module) is not fit_module(module)  # no memo outside the block
    with design_memo():
        assert memo_active()
        first = fit_module(module)
        assert fit_module(module) is first
    assert not memo_active() and fit_module.cache == {}


def test_memo_arrays_are_read_only():
    inputs = _inputs(1)
    params = fit_module(inputs.base.module)
    g = np.linspace(0.0, 1000.0, 12)
    with design_memo():
        vmp, _, _ = module_mpp(params, g, np.full(12, 30.0))
        with pytest.raises(ValueError):
            vmp[0] = 1.0
