"""Standard-kit choice (offgrid.plan.kits) against exhaustive search on small cases.

The rows here are synthetic records built in code (invented numbers); the checks are
mathematical: the dynamic programme must equal a brute-force search over the same
space, and, when every row's needs grow together, over every possible assignment.
"""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest

from offgrid.plan.kits import (
    Candidate,
    KitParts,
    PlanError,
    interval_partition,
    parts_cost,
    standardise,
)
from offgrid.plan.prices import read_prices_csv
from offgrid.plan.rows import RowDesign

PRICES = read_prices_csv(
    "item,basis,unit_price,currency,note\n"
    "module,per_w,0.5,USD,invented test prices\n"
    "battery,per_kwh,200,USD,\n"
    "controller_pwm,per_a,2,USD,\n"
    "controller_mppt,per_a,6,USD,\n"
    "inverter,per_w,0.3,USD,\n"
    "system_fixed,each,40,USD,\n"
    "one_off,each,300,USD,\n",
    "test prices",
)
PRICES_NO_OWN = read_prices_csv(
    "item,basis,unit_price,currency\nmodule,per_w,0.5,USD\nbattery,per_kwh,200,USD\n"
    "controller_pwm,per_a,2,USD\ninverter,per_w,0.3,USD\n",
    "test prices",
)


def row(
    strings: int,
    parallel: int,
    inverter_w: float = 0.0,
    req_w: float | None = None,
    req_wh: float | None = None,
    family: str = "f",
    voltage: int = 12,
) -> RowDesign:
    """A synthetic 12 V PWM row design: ``strings`` x 50 W modules, ``parallel`` x 640 Wh."""
    req_w = strings * 50.0 - 10.0 if req_w is None else req_w
    req_wh = parallel * 640.0 - 100.0 if req_wh is None else req_wh
    return RowDesign(
        family=(family, voltage),
        family_label=f"{voltage} V PWM test family {family}",
        system_voltage_v=voltage,
        controller_type="pwm",
        module_name="test 50 W",
        module_pmax_w=50.0,
        modules_series=1,
        modules_parallel=strings,
        module_count=strings,
        array_power_w=strings * 50.0,
        required_power_w=req_w,
        battery_name="test 12.8 V 50 Ah",
        battery_chemistry="lifepo4",
        battery_unit_v=12.8,
        battery_unit_ah=50.0,
        units_series=1,
        units_parallel=parallel,
        unit_count=parallel,
        required_wh=req_wh,
        nominal_wh=parallel * 640.0,
        controller_current_a=float(10 * math.ceil(strings / 3)),
        controller_count=1,
        inverter_w=inverter_w,
        inverter_surge_w=2 * inverter_w,
        design_energy_wh=100.0 * strings,
        appliance_energy_wh=90.0 * strings,
        peak_capacity_w=inverter_w + 20.0,
        design_month=6,
        warnings=(),
    )


def kit_of(rows: list[RowDesign]) -> KitParts:
    """Part-by-part maximum of a group (the kit the module builds), for brute force."""
    t = rows[0]
    s = max(r.modules_parallel for r in rows)
    p = max(r.units_parallel for r in rows)
    w = max(r.inverter_w for r in rows)
    ctrl = max(r.controller_current_a for r in rows if r.modules_parallel == s)
    return KitParts(
        t.family_label,
        t.system_voltage_v,
        "pwm",
        t.module_name,
        50.0,
        1,
        s,
        t.battery_name,
        "lifepo4",
        12.8,
        50.0,
        1,
        p,
        ctrl,
        1,
        w,
        2 * w,
    )


def set_partitions(items: list[int]):
    """Every partition of ``items`` into non-empty blocks (Bell-number many)."""
    if not items:
        yield []
        return
    first, rest = items[0], items[1:]
    for part in set_partitions(rest):
        yield [[first], *part]
        for i in range(len(part)):
            yield [*part[:i], [first, *part[i]], *part[i + 1 :]]


def brute_cost(cands: list[Candidate], k: int, one_off: float | None, prices=PRICES) -> float:
    """Least cost over every assignment: each row in one of at most k kits (part-by-part
    maxima of their rows) or, when ``one_off`` is given, in its own system."""
    idx = list(range(len(cands)))
    own = {i: parts_cost(prices, kit_of([cands[i].design])) for i in idx}
    best = math.inf
    own_sets = (
        [()]
        if one_off is None
        else [c for r in range(len(idx) + 1) for c in itertools.combinations(idx, r)]
    )
    for own_set in own_sets:
        rest = [i for i in idx if i not in own_set]
        base = sum((own[i] + (one_off or 0.0)) * cands[i].count for i in own_set)
        for part in set_partitions(rest):
            if len(part) > k:
                continue
            total = base + sum(
                parts_cost(prices, kit_of([cands[i].design for i in block]))
                * sum(cands[i].count for i in block)
                for block in part
            )
            best = min(best, total)
    return best


# ----------------------------------------------------------------- the recursion itself


def test_interval_partition_matches_enumeration_of_all_cut_points():
    """Exactness of the recursion: every way of cutting n items into at most k consecutive
    groups, with an optional own-system suffix, enumerated (mathematical check)."""
    rng = np.random.default_rng(7)
    for _ in range(40):
        n = int(rng.integers(1, 8))
        k_max = int(rng.integers(1, 5))
        g = rng.uniform(1, 10, size=(n, n))  # g[j, i]: group j..i
        fac = rng.uniform(0, 25, size=n)
        fac[rng.random(n) < 0.3] = np.inf
        sol = interval_partition(n, k_max, lambda i, g=g: g[: i + 1, i], fac)
        for k in range(k_max + 1):
            best = math.inf
            for cut in range(n + 1):  # rows cut.. go to own systems
                tail = float(np.sum(fac[cut:])) if cut < n else 0.0
                for m in range(0, min(k, cut) + 1):
                    if cut and m == 0:
                        continue
                    for bounds in itertools.combinations(range(1, cut), max(m - 1, 0)):
                        edges = [0, *bounds, cut] if cut else [0]
                        cost = sum(g[a, b - 1] for a, b in itertools.pairwise(edges))
                        best = min(best, cost + tail)
            assert sol.best[k] == pytest.approx(best, rel=1e-12) or (
                math.isinf(best) and math.isinf(sol.best[k])
            )
            if math.isfinite(best):
                groups, cut = sol.groups(k)
                cost = sum(g[a, b - 1] for a, b in groups) + float(np.sum(fac[cut:]))
                assert cost == pytest.approx(best, rel=1e-12)
                assert len(groups) <= k


def test_interval_partition_rejects_negative_sizes():
    with pytest.raises(ValueError):
        interval_partition(-1, 2, lambda i: np.zeros(i + 1))


# ----------------------------------------------------------------- kits vs brute force


def _proportional(rng, n: int) -> list[Candidate]:
    """Rows whose strings, battery strings and inverter all grow with one size figure."""
    sizes = rng.integers(1, 9, size=n)
    out = []
    for i, s in enumerate(sizes):
        w = 150.0 * (s // 3)
        out.append(Candidate(i, row(int(s), int(s), w), int(rng.integers(1, 20))))
    return out


@pytest.mark.parametrize("seed", range(12))
def test_proportional_needs_are_optimal_over_every_assignment(seed):
    """One-dimensional case: consecutive groups lose nothing, so the kit choice equals the
    exhaustive optimum over all set partitions (the classical 1-D grouping property)."""
    rng = np.random.default_rng(seed)
    cands = _proportional(rng, int(rng.integers(2, 7)))
    for k in (1, 2, 3):
        got = standardise(cands, k=k, prices=PRICES_NO_OWN)
        brute = brute_cost(cands, k, None, PRICES_NO_OWN)
        assert got.objective_value == pytest.approx(brute, rel=1e-9)


@pytest.mark.parametrize("seed", range(8))
def test_own_systems_for_the_largest_rows_vs_brute_force(seed):
    """With a one-off price, the largest rows may take their own design.  In the
    proportional case the exhaustive optimum over every assignment (any row own or in any
    kit) is reached by the suffix rule."""
    rng = np.random.default_rng(100 + seed)
    n = int(rng.integers(2, 6))
    sizes = np.sort(rng.integers(1, 12, size=n))
    cands = [
        Candidate(i, row(int(s), int(s)), 1 if s > 8 else int(rng.integers(5, 30)))
        for i, s in enumerate(sizes)
    ]
    for k in (1, 2):
        got = standardise(cands, k=k, prices=PRICES)
        brute = brute_cost(cands, k, 300.0)
        assert got.objective_value == pytest.approx(brute, rel=1e-9)


def test_two_dimensional_needs_bounded_by_exhaustive_search():
    """Array and battery needs that do not grow together: the consecutive-group optimum
    can only be worse than, or equal to, the exhaustive one; measure the gap."""
    rng = np.random.default_rng(3)
    gaps = []
    for _ in range(25):
        n = int(rng.integers(2, 7))
        cands = [
            Candidate(
                i, row(int(rng.integers(1, 7)), int(rng.integers(1, 7))), int(rng.integers(1, 15))
            )
            for i in range(n)
        ]
        for k in (1, 2, 3):
            got = standardise(cands, k=k, prices=PRICES_NO_OWN).objective_value
            brute = brute_cost(cands, k, None, PRICES_NO_OWN)
            assert got >= brute - 1e-6
            gaps.append(got / brute - 1.0)
            if k >= n:
                assert got == pytest.approx(brute)  # every row its own kit type
    # measured on these 75 cases: 1 above the optimum, by 0.26 % (with the dominant order
    # alone: 7 above, largest 9.7 %)
    assert max(gaps) < 0.02


def test_oversize_objective_vs_brute_force():
    """Objective 'oversize': sum over systems of the mean of (kit array / required array - 1)
    and (kit battery / required battery - 1), checked against every set partition."""
    rng = np.random.default_rng(11)
    for _ in range(10):
        n = int(rng.integers(2, 6))
        cands = []
        for i in range(n):
            s = int(rng.integers(1, 8))
            cands.append(
                Candidate(
                    i,
                    row(
                        s,
                        s,
                        req_w=s * 50 * rng.uniform(0.5, 1.0),
                        req_wh=s * 640 * rng.uniform(0.5, 1.0),
                    ),
                    int(rng.integers(1, 10)),
                )
            )

        def over(block, cands=cands):
            kit = kit_of([cands[i].design for i in block])
            return sum(
                cands[i].count
                * (
                    (
                        kit.array_power_w / cands[i].design.required_power_w
                        + kit.nominal_wh / cands[i].design.required_wh
                    )
                    / 2
                    - 1.0
                )
                for i in block
            )

        for k in (1, 2):
            brute = min(
                sum(over(b) for b in part)
                for part in set_partitions(list(range(n)))
                if len(part) <= k
            )
            got = standardise(cands, k=k, objective="oversize")
            assert got.objective_value == pytest.approx(brute, rel=1e-9)
            total = sum(
                cands[a.index].count * (a.oversize_array_pct + a.oversize_battery_pct) / 200.0
                for a in got.assignments
            )
            assert total == pytest.approx(got.objective_value, rel=1e-9)


def test_every_kit_meets_each_assigned_row():
    rng = np.random.default_rng(5)
    cands = [
        Candidate(
            i,
            row(int(rng.integers(1, 9)), int(rng.integers(1, 9)), float(rng.choice([0, 150, 300]))),
            int(rng.integers(1, 9)),
        )
        for i in range(30)
    ]
    got = standardise(cands, k=4, prices=PRICES)
    kits = {k.name: k.parts for k in got.kits}
    assert len(got.kits) <= 4
    for a in got.assignments:
        d = cands[a.index].design
        parts = kits[a.kit] if a.kit else None
        if parts is None:
            assert a.own_system
            continue
        assert parts.strings >= d.modules_parallel
        assert parts.units_parallel >= d.units_parallel
        assert parts.inverter_w >= d.inverter_w
        assert parts.array_power_w >= d.required_power_w
        assert parts.nominal_wh >= d.required_wh
        assert a.oversize_array_pct >= 0 and a.oversize_battery_pct >= 0
    assert sum(k.systems for k in got.kits) + sum(
        cands[a.index].count for a in got.assignments if a.own_system
    ) == sum(c.count for c in cands)


def test_kit_type_cost_picks_the_best_number_of_kits():
    rng = np.random.default_rng(9)
    cands = _proportional(rng, 8)
    curve = standardise(cands, k=8, prices=PRICES_NO_OWN).curve
    for lam in (0.0, 50.0, 500.0, 5000.0):
        got = standardise(cands, kit_type_cost=lam, prices=PRICES_NO_OWN, k_max=8)
        best = min(v + lam * k for k, v in curve)
        assert got.objective_value == pytest.approx(best)
        assert got.objective_value == pytest.approx(got.parts_cost + lam * len(got.kits))


def test_more_kit_types_never_cost_more():
    rng = np.random.default_rng(2)
    cands = [
        Candidate(i, row(int(rng.integers(1, 9)), int(rng.integers(1, 9))), 3) for i in range(12)
    ]
    values = [v for _, v in standardise(cands, k=6, prices=PRICES).curve]
    assert all(b <= a + 1e-9 for a, b in itertools.pairwise(values))


def test_families_do_not_share_kits_and_share_the_k_budget():
    cands = [
        Candidate(0, row(2, 2, family="a")),
        Candidate(1, row(3, 3, family="a")),
        Candidate(2, row(2, 2, family="b", voltage=24)),
    ]
    got = standardise(cands, k=2, prices=PRICES_NO_OWN)
    assert len(got.kits) == 2 and got.families == 2
    for kit in got.kits:
        fams = {cands[m].design.family for m in kit.members}
        assert len(fams) == 1
    with pytest.raises(PlanError, match="families"):
        standardise(cands, k=1, prices=PRICES_NO_OWN)


def test_survey_kit_flags_are_obeyed():
    cands = [
        Candidate(0, row(1, 1), 50),
        Candidate(1, row(2, 2), 40),
        Candidate(2, row(8, 8), 1, kit="no"),
        Candidate(3, row(12, 12), 1, kit="yes"),
    ]
    got = standardise(cands, k=2, prices=PRICES)
    by = {a.index: a for a in got.assignments}
    assert by[2].own_system and "kit = no" in by[2].reason
    assert not by[3].own_system


def test_bad_requests_are_refused():
    cands = [Candidate(0, row(1, 1))]
    with pytest.raises(PlanError, match="price list"):
        standardise(cands, k=1, objective="cost")
    with pytest.raises(PlanError):
        standardise(cands, k=-1, prices=PRICES)
    with pytest.raises(PlanError):
        standardise(cands, kit_type_cost=-5, prices=PRICES)
    with pytest.raises(ValueError):
        standardise(cands, k=1, objective="cheapest")
