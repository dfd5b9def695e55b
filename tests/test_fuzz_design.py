"""Property-based fuzz of the whole pipeline over the validated input space.

Every project that :func:`offgrid.project.validate.validate_project` accepts must either be
refused with a :class:`DesignError` that says why, or give a design that keeps the
invariants of ``tests/design_invariants.py`` (finite figures, supply covers demand in the
design month, ratings at or above what is required, every cable within its drop limit and
its fuse between the circuit current and the ampacity).  Deterministic: ``derandomize``.
The projects drawn are invented test data.
"""

from __future__ import annotations

import functools
import math
import types
import typing

from hypothesis import HealthCheck, assume, event, given, settings
from hypothesis import strategies as st

from offgrid.design.result import DesignError
from offgrid.design.sizing import design
from offgrid.project.model import (
    ClimateChoice,
    Load,
    MonthlyClimate,
    Project,
    ProjectInfo,
)
from offgrid.project.validate import ranged_inputs, validate_project

try:
    from design_invariants import design_problems
except ImportError:  # run as a package
    from tests.design_invariants import design_problems

FUZZ = settings(
    derandomize=True,
    max_examples=150,
    deadline=None,
    database=None,
    suppress_health_check=[
        HealthCheck.too_slow,
        HealthCheck.filter_too_much,
        HealthCheck.data_too_large,
    ],
)


def _owner(project: Project, path: str):
    obj = project
    parts = path.split(".")
    for part in parts[:-1]:
        obj = getattr(obj, part)
    return obj, parts[-1]


def _hint(obj, name: str):
    return _type_hints(type(obj))[name]


@functools.cache
def _type_hints(cls) -> dict:
    """A dataclass's field types, evaluated once (``get_type_hints`` compiles each string
    annotation anew: a fifth of the test's time when called per input per example)."""
    return typing.get_type_hints(cls)


def _optional(tp) -> bool:
    return typing.get_origin(tp) in (typing.Union, types.UnionType) and type(
        None
    ) in typing.get_args(tp)


def _is_int(tp) -> bool:
    return tp is int or (
        _optional(tp) and int in typing.get_args(tp) and float not in typing.get_args(tp)
    )


finite = {"allow_nan": False, "allow_infinity": False}


@st.composite
def modules(draw, project: Project) -> None:
    """A crystalline module datasheet that hangs together (most draws), or raw ranges."""
    m = project.module
    if draw(st.integers(0, 9)) == 0:
        return  # keep the raw catalogue ranges: validate_module may refuse them
    cells = draw(st.sampled_from((32, 36, 40, 54, 60, 66, 72, 96, 120, 132, 144)))
    in_series = cells // 2 if cells >= 120 else cells  # half-cut modules
    voc = in_series * draw(st.floats(0.58, 0.72, **finite))
    vmp = voc * draw(st.floats(0.76, 0.86, **finite))
    isc = draw(st.floats(0.3, 18.0, **finite))
    imp = isc * draw(st.floats(0.88, 0.95, **finite))
    pmax = vmp * imp * draw(st.floats(0.99, 1.01, **finite))
    assume(1 <= pmax <= 1000 and vmp <= 200 and voc <= 250 and isc <= 30)
    m.cells_in_series, m.voc_v, m.vmp_v, m.isc_a, m.imp_a, m.pmax_w = (
        in_series,
        voc,
        vmp,
        isc,
        imp,
        pmax,
    )
    eff = draw(st.floats(0.12, 0.23, **finite))
    m.area_m2 = min(5.0, max(0.01, pmax / (1000.0 * eff)))
    m.alpha_isc_pct_per_c = draw(st.floats(0.02, 0.08, **finite))
    m.beta_voc_pct_per_c = draw(st.one_of(st.none(), st.floats(-0.45, -0.2, **finite)))
    m.gamma_pmax_pct_per_c = draw(st.floats(-0.5, -0.25, **finite))


@st.composite
def climates(draw, latitude: float) -> MonthlyClimate:
    """Twelve months: mostly a smooth year of plausible values, sometimes anything in range."""
    if draw(st.integers(0, 7)):  # a smooth year around a mean, the common shape
        mean = draw(st.floats(0.8, 8.0, **finite))
        swing = draw(st.floats(0.0, 0.8, **finite)) * mean
        phase = 0 if latitude >= 0 else 6
        ins = [
            max(0.0, mean + swing * math.cos(2 * math.pi * (i - 5 - phase) / 12)) for i in range(12)
        ]
        t0 = draw(st.floats(-25.0, 38.0, **finite))
        t_swing = draw(st.floats(0.0, 15.0, **finite))
        t_mean = [
            min(55.0, max(-70.0, t0 + t_swing * math.cos(2 * math.pi * (i - 6 - phase) / 12)))
            for i in range(12)
        ]
    else:
        ins = draw(st.lists(st.floats(0.0, 12.0, **finite), min_size=12, max_size=12))
        t_mean = draw(st.lists(st.floats(-70.0, 55.0, **finite), min_size=12, max_size=12))
    t_max = draw(st.one_of(st.none(), st.just([t + 6.0 for t in t_mean])))
    t_min = draw(st.one_of(st.none(), st.just([t - 6.0 for t in t_mean])))
    low = draw(st.one_of(st.none(), st.floats(min(t_mean) - 30.0, min(t_mean), **finite)))
    return MonthlyClimate(
        insolation_kwh_m2_day=ins,
        temp_mean_c=t_mean,
        temp_max_c=t_max,
        temp_min_c=t_min,
        record_low_c=low,
        source="fuzz (invented)",
        demo=True,
    )


def _mostly(common, rare, odds: int = 6):
    """``common``, but about once in ``odds`` draws ``rare`` (anywhere in the valid range)."""
    return st.integers(0, odds).flatmap(lambda k: rare if k == odds // 2 else common)


@st.composite
def loads(draw) -> list[Load]:
    out = []
    for i in range(draw(st.integers(1, 4))):
        power = draw(
            _mostly(st.floats(1.0, 500.0, **finite), st.floats(0.0, 1_000_000.0, **finite), odds=16)
        )
        surge = draw(
            st.one_of(
                st.just(0.0),
                st.floats(power, max(power, 1.0) * 6, **finite),
                st.floats(power, 10_000_000.0, **finite),
            )
        )
        first = draw(st.integers(1, 12))
        months = tuple(sorted({first, *draw(st.lists(st.integers(1, 12), max_size=11))}))
        out.append(
            Load(
                name=f"load {i + 1}",
                quantity=draw(_mostly(st.integers(1, 5), st.integers(0, 100000), odds=16)),
                power_w=power,
                hours_per_day=draw(
                    _mostly(st.floats(0.5, 12.0, **finite), st.floats(0.0, 24.0, **finite))
                ),
                ac_dc=draw(st.sampled_from(("ac", "dc"))),
                duty_cycle=draw(
                    _mostly(st.floats(0.2, 1.0, **finite), st.floats(0.0, 1.0, **finite))
                ),
                surge_w=min(surge, 10_000_000.0),
                months=months,
                critical=draw(st.booleans()),
                time_of_day=draw(st.sampled_from(("any", "day", "morning", "evening", "night"))),
            )
        )
    return out


@functools.cache
def _ranged_strategies() -> tuple[tuple[str, st.SearchStrategy], ...]:
    """(path, strategy) of every ranged input: its default, or about once in 17 draws
    anywhere in its range. Built once: the same strategies every example (drawing from new
    strategy objects per example cost as much as the designs)."""
    p = Project(info=ProjectInfo(name="fuzz", demo=True))
    out = []
    for path, lo, hi, _ in ranged_inputs():
        obj, name = _owner(p, path)
        tp = _hint(obj, name)
        default = getattr(obj, name)
        if _is_int(tp):
            anywhere = st.integers(math.ceil(lo), math.floor(hi))
        else:
            anywhere = st.floats(lo, hi, **finite)
        if _optional(tp):
            anywhere = st.one_of(st.none(), anywhere)
        out.append((path, _mostly(st.just(default), anywhere, odds=16)))
    return tuple(out)


@st.composite
def projects(draw) -> Project:
    p = Project(info=ProjectInfo(name="fuzz", demo=True))
    for path, strategy in _ranged_strategies():
        obj, name = _owner(p, path)
        setattr(obj, name, draw(strategy))
    if draw(st.integers(0, 3)):  # mostly where people live
        p.site.latitude_deg = draw(st.floats(-60.0, 65.0, **finite))
    draw(modules(p))
    p.battery.chemistry = draw(st.sampled_from(("flooded", "agm", "gel", "lifepo4")))
    p.battery.nominal_voltage_v = draw(
        _mostly(
            st.sampled_from((2.0, 6.0, 12.0) if p.battery.chemistry != "lifepo4" else (12.8,)),
            st.one_of(st.sampled_from((24.0, 25.6, 48.0, 51.2)), st.floats(1.0, 60.0, **finite)),
        )
    )
    p.choices.system_voltage = draw(st.sampled_from(("auto", 12, 24, 48)))
    p.controller.type = draw(st.sampled_from(("pwm", "mppt")))
    p.wiring.units = draw(st.sampled_from(("awg", "mm2")))
    p.wiring.material = draw(st.sampled_from(("copper", "aluminium")))
    p.wiring.insulation_temp_c = draw(st.sampled_from((60, 75, 90)))
    reflectance = st.one_of(
        st.none(),
        st.floats(0.0, 1.0, **finite),
        st.lists(st.floats(0.0, 1.0, **finite), min_size=12, max_size=12),
    )
    p.site.albedo = draw(reflectance)  # one value, twelve (snow months) or automatic
    p.climate = ClimateChoice(inline=draw(climates(p.site.latitude_deg)))
    p.climate.inline.albedo = draw(reflectance)
    p.loads = draw(loads())
    if draw(st.booleans()):
        p.loads[0].run_m = draw(st.floats(0.1, 1000.0, **finite))
    p.site.horizon_deg = draw(
        _mostly(
            st.just([]),
            st.lists(
                st.tuples(st.floats(0.0, 359.0, **finite), st.floats(0.0, 90.0, **finite)),
                min_size=1,
                max_size=6,
                unique_by=lambda pt: round(pt[0], 6),
            ),
            odds=16,
        )
    )
    assume(not validate_project(p))
    return p


@FUZZ
@given(projects())
def test_design_is_refused_clearly_or_sound(project):
    try:
        d = design(project)
    except DesignError as exc:
        event(f"refused: {exc.code}")
        text = str(exc)
        assert len(text) > 20 and exc.code, (exc.code, text)
        assert "nan" not in text.lower().split() and "inf" not in text.lower().split(), text
        return
    event("designed")
    problems = design_problems(d)
    assert not problems, problems
