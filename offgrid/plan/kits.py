"""Standard kits: choose K kit sizes that serve a community at the least cost or oversize.

The problem and how it is made one-dimensional
----------------------------------------------
Every designed row needs, in whole parts, a number of module strings ``S``, a number
of battery strings ``P`` and an inverter of ``W`` watts (0: none).  A kit serves a row
when it meets or exceeds all three, and only rows of one *family* (same system
voltage, controller type, module, battery unit and string layout) can share a kit,
since their DC appliances run at that voltage and a kit is one bill of parts.

A kit made for a group of rows is the part-by-part maximum of their needs, so it can
be oversized in one dimension for some of them: this is the two-dimensional nature
of the problem (array and battery, with the inverter as a third).  Within a family
the rows are put in one order by their **dominant requirement**: each need is divided
by the family's count-weighted median need of that kind (array W, battery Wh,
inverter W) and a row's key is the largest of these ratios, ties broken by
(S, P, W).  The same is solved for the orders array-first (S, P, W) and battery-first
(P, S, W), and for each K the best of the three is kept.  The kit choice is then
solved **exactly** over all partitions of each order into consecutive groups, by
dynamic programming (the classical optimal
one-dimensional grouping recursion, as in Bellman's segmentation or Jenks' natural
breaks, with an arbitrary group cost)::

    F[k][i] = min( F[k-1][i],  min_j  F[k-1][j] + G(j, i) )

where ``G(j, i)`` is the cost of one kit for rows ``j .. i-1`` (computed for all ``j``
at once with running maxima).  When every row's needs grow together (a proportional
community) consecutive groups lose nothing and the result is the exact optimum over
every possible assignment; when they do not, it is exact over consecutive groups of
those orders and the tests measure the gap to a full search.

Any row may instead get its **own system** (a facility design) at its own parts cost
plus a one-off overhead per system (design and separate purchase), whenever that is
cheaper than its group's kit; rows after the last kit all take their own.  The group
cost then sums, row by row, the cheaper of the two (O(n^3) over the distinct part
needs of a family, which are few since rows merge by whole parts).  Families share the
K kit types through a min-plus combination.

Objectives: ``cost`` = parts cost of all kits (price list); ``oversize`` = the sum over
systems of the mean relative oversize of array power and battery energy against the
row's own requirement.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from offgrid.design.sizing import INVERTER_SURGE_MULTIPLE
from offgrid.plan.prices import PriceList
from offgrid.plan.rows import Cable, Protection, RowDesign

Objective = str  # "cost" or "oversize"
METHOD = (
    "exact dynamic programme over consecutive groups of rows ordered by their "
    "dominant requirement (largest of array W, battery Wh and inverter W, each over "
    "the family's median), and again ordered array-first and battery-first, keeping "
    "the best; kit = part-by-part maximum of its rows; a row takes its own system where "
    "that is cheaper than its group's kit"
)


class PlanError(ValueError):
    """The standardisation cannot be done as asked; the message says what to change."""


# --------------------------------------------------------------------- the exact recursion


@dataclass(frozen=True)
class IntervalSolution:
    best: np.ndarray  # best[k]: least total with at most k groups (inf: impossible)
    table: np.ndarray  # F, shape (k_max + 1, n + 1)
    arg: np.ndarray  # start of the last group, or -1 when F[k][i] = F[k-1][i]
    suffix: np.ndarray  # suffix[i]: cost of serving rows i..n-1 by their own systems

    def groups(self, k: int) -> tuple[list[tuple[int, int]], int]:
        """Groups ``(start, stop)`` of the best solution with at most ``k`` groups, and the
        index where the own-system suffix starts (``n``: none)."""
        n = self.table.shape[1] - 1
        totals = self.table[k] + self.suffix
        i = int(np.argmin(totals))
        cut = i
        out: list[tuple[int, int]] = []
        while i > 0:
            if k <= 0:
                raise AssertionError("back-track ran out of groups")
            j = int(self.arg[k, i])
            if j < 0:
                k -= 1
                continue
            out.append((j, i))
            i, k = j, k - 1
        out.reverse()
        return out, cut if cut <= n else n


def interval_partition(
    n: int,
    k_max: int,
    group_cost: Callable[[int], np.ndarray],
    suffix_cost: np.ndarray | None = None,
) -> IntervalSolution:
    """Exact least-cost partition of items ``0..n-1`` (in this order) into at most ``k``
    consecutive groups, for every ``k <= k_max``.

    Parameters
    ----------
    n : int
        Number of items, already in their order.
    k_max : int
        Largest number of groups.
    group_cost : callable
        ``group_cost(i)`` returns an array ``g`` of length ``i + 1`` with ``g[j]`` the cost
        of one group holding items ``j..i`` (inclusive).
    suffix_cost : array of n, optional
        Cost of serving item ``r`` outside any group (``inf``: not allowed); only a suffix
        of the order may be served so.  Default: not allowed.

    Returns
    -------
    IntervalSolution
        ``best[k]`` for ``k = 0..k_max`` and the tables to recover the groups.

    Notes
    -----
    O(k_max n^2) operations, vectorised over the group start.  The recursion is the
    standard optimal-segmentation dynamic programme (Bellman, "On the approximation of
    curves by line segments using dynamic programming", Comm. ACM 4 (1961) 284).
    """
    if n < 0 or k_max < 0:
        raise ValueError("n and k_max must be 0 or more")
    fac = np.full(n, np.inf) if suffix_cost is None else np.asarray(suffix_cost, dtype=float)
    suffix = np.zeros(n + 1)
    if n:
        suffix[:n] = np.cumsum(fac[::-1])[::-1]
    table = np.full((k_max + 1, n + 1), np.inf)
    table[:, 0] = 0.0
    arg = np.full((k_max + 1, n + 1), -1, dtype=np.int64)
    for i in range(1, n + 1):
        g = np.asarray(group_cost(i - 1), dtype=float)
        for k in range(1, k_max + 1):
            cand = table[k - 1, :i] + g
            j = int(np.argmin(cand))
            if cand[j] < table[k - 1, i]:
                table[k, i] = cand[j]
                arg[k, i] = j
            else:
                table[k, i] = table[k - 1, i]
    best = np.min(table + suffix[None, :], axis=1)
    return IntervalSolution(best, table, arg, suffix)


# --------------------------------------------------------------------- kits and families


@dataclass(frozen=True)
class KitParts:
    """One bill of parts: a standard kit or a system with its own design."""

    family_label: str
    system_voltage_v: int
    controller_type: str
    module_name: str
    module_pmax_w: float
    modules_series: int
    strings: int
    battery_name: str
    battery_chemistry: str
    battery_unit_v: float
    battery_unit_ah: float
    units_series: int
    units_parallel: int
    controller_current_a: float
    controller_count: int
    inverter_w: float
    inverter_surge_w: float
    # the kit's own circuits (no DC load circuits, which belong to each home)
    cables: tuple[Cable, ...] = ()
    devices: tuple[Protection, ...] = ()
    circuits_from_one_row: bool = True  # False: largest of each circuit over its rows

    @property
    def module_count(self) -> int:
        return self.modules_series * self.strings

    @property
    def array_power_w(self) -> float:
        return self.module_count * self.module_pmax_w

    @property
    def unit_count(self) -> int:
        return self.units_series * self.units_parallel

    @property
    def nominal_wh(self) -> float:
        return self.unit_count * self.battery_unit_v * self.battery_unit_ah


def parts_of(d: RowDesign) -> KitParts:
    """The bill of parts of a row's own design."""
    return KitParts(
        d.family_label,
        d.system_voltage_v,
        d.controller_type,
        d.module_name,
        d.module_pmax_w,
        d.modules_series,
        d.modules_parallel,
        d.battery_name,
        d.battery_chemistry,
        d.battery_unit_v,
        d.battery_unit_ah,
        d.units_series,
        d.units_parallel,
        d.controller_current_a,
        d.controller_count,
        d.inverter_w,
        d.inverter_surge_w,
        tuple(c for c in d.cables if not c.house),
        tuple(v for v in d.devices if not v.house),
    )


def parts_cost(prices: PriceList, parts: KitParts) -> float:
    """Capital cost of one bill of parts, including the per-system fixed price."""
    return float(
        _cost_arrays(
            prices,
            parts.controller_type,
            parts.battery_chemistry,
            parts.module_pmax_w,
            parts.modules_series,
            parts.battery_unit_v * parts.battery_unit_ah,
            parts.units_series,
            np.array([parts.strings]),
            np.array([parts.units_parallel]),
            np.array([parts.controller_current_a]),
            np.array([parts.controller_count]),
            np.array([parts.inverter_w]),
            parts.module_name,
            parts.battery_name,
        )[0]
    )


def _cost_arrays(
    prices: PriceList,
    ctype: str,
    chemistry: str,
    pmod: float,
    ns: int,
    unit_wh: float,
    us: int,
    strings,
    parallel,
    ctrl_a,
    ctrl_n,
    inv_w,
    module_name: str = "",
    battery_name: str = "",
) -> np.ndarray:
    tag = ctype.upper()
    cost = prices.price("module", pmod, strings * ns, key=f"module:{module_name}")
    cost = cost + prices.price(
        prices.battery_item(chemistry),
        unit_wh / 1000.0,
        parallel * us,
        key=f"battery:{battery_name}",
    )
    cost = cost + prices.price(
        f"controller_{ctype}", ctrl_a, ctrl_n, key=lambda a: f"controller:{tag} {a:g} A"
    )
    inv_w = np.asarray(inv_w, dtype=float)
    if np.any(inv_w > 0):
        inv_cost = np.zeros_like(inv_w)
        on = inv_w > 0
        inv_cost[on] = prices.price("inverter", inv_w[on], key=lambda w: f"inverter:{w:g} W")
        cost = cost + inv_cost
    return cost + prices.optional("system_fixed")


@dataclass(frozen=True)
class Candidate:
    """A designed row offered to the standardisation."""

    index: int  # caller's row index
    design: RowDesign
    count: int = 1
    kit: str = "auto"  # auto, yes (must be a kit), no (own system)


@dataclass(frozen=True)
class KitChoice:
    name: str
    parts: KitParts
    unit_cost: float | None
    members: tuple[int, ...]  # candidate indices
    systems: int


@dataclass(frozen=True)
class Assignment:
    index: int
    kit: str | None  # kit name, or None for an own system
    own_system: bool
    reason: str
    oversize_array_pct: float
    oversize_battery_pct: float
    unit_cost: float | None  # cost of one system as assigned


@dataclass(frozen=True)
class Standardisation:
    objective: Objective
    method: str
    k_limit: int | None  # --kits K, or None when chosen by cost per kit type
    kit_type_cost: float
    kits: tuple[KitChoice, ...]
    assignments: tuple[Assignment, ...]  # in the candidates' order
    objective_value: float  # least cost (parts + kit types) or total oversize
    parts_cost: float | None
    curve: tuple[tuple[int, float], ...]  # (k, best objective with at most k kit types)
    families: int


def _weighted_median(values: np.ndarray, weights: np.ndarray) -> float:
    keep = values > 0
    if not keep.any():
        return 0.0
    v, w = values[keep], weights[keep]
    order = np.argsort(v)
    cw = np.cumsum(w[order])
    return float(v[order][np.searchsorted(cw, cw[-1] / 2.0)])


@dataclass
class _Family:
    key: tuple
    template: RowDesign
    members: list[list[int]]  # per point: candidate positions
    S: np.ndarray
    P: np.ndarray
    W: np.ndarray
    cnt: np.ndarray
    inv_a: np.ndarray  # sum of count / required array W (for the oversize objective)
    inv_b: np.ndarray  # sum of count / required battery Wh
    fac: np.ndarray  # own-system cost of each point (inf: not allowed)
    free: np.ndarray  # systems that may take their own design instead of a kit
    forced: np.ndarray  # systems that must get a kit (kit = yes)
    unit_own: np.ndarray  # cost of one own system, one-off overhead included (inf: none)
    ctrl_a: np.ndarray  # controller rating by strings (index S)
    ctrl_n: np.ndarray

    @property
    def n(self) -> int:
        return len(self.S)


def _families(
    cands: list[Candidate],
    pos: list[int],
    prices: PriceList | None,
    objective: Objective,
    own_cost: dict[int, float],
) -> list[list[_Family]]:
    """Each family as its points in the dominant-requirement order, then the same points
    ordered array-first and battery-first (each order is solved; the best is kept)."""
    by_key: dict[tuple, list[int]] = {}
    for p in pos:
        by_key.setdefault(cands[p].design.family, []).append(p)
    fams = []
    one_off = prices.optional("one_off") if prices and prices.has("one_off") else math.inf
    for key, members in sorted(by_key.items(), key=lambda kv: kv[0]):
        t = cands[members[0]].design
        points: dict[tuple, list[int]] = {}
        for p in members:
            d = cands[p].design
            points.setdefault((d.modules_parallel, d.units_parallel, d.inverter_w), []).append(p)
        keys = list(points)
        S = np.array([k[0] for k in keys], dtype=np.int64)
        P = np.array([k[1] for k in keys], dtype=np.int64)
        W = np.array([k[2] for k in keys], dtype=float)
        cnt = np.array([sum(cands[p].count for p in points[k]) for k in keys], dtype=float)
        arr_w = S * t.modules_series * t.module_pmax_w
        bat_wh = P * t.string_wh
        med = [
            _weighted_median(arr_w, cnt),
            _weighted_median(bat_wh, cnt),
            _weighted_median(W, cnt),
        ]
        scaled = np.stack(
            [
                arr_w / med[0] if med[0] else np.zeros_like(arr_w),
                bat_wh / med[1] if med[1] else np.zeros_like(bat_wh),
                W / med[2] if med[2] else np.zeros_like(W),
            ]
        )
        dominant = scaled.max(axis=0)
        order = np.lexsort((W, P, S, dominant))
        keys = [keys[i] for i in order]
        S, P, W, cnt = S[order], P[order], W[order], cnt[order]
        mem = [points[k] for k in keys]
        inv_a = np.array(
            [sum(cands[p].count / cands[p].design.required_power_w for p in m) for m in mem]
        )
        inv_b = np.array(
            [sum(cands[p].count / cands[p].design.required_wh for p in m) for m in mem]
        )
        free = np.array(
            [sum(cands[p].count for p in m if cands[p].kit == "auto") for m in mem], dtype=float
        )
        forced = cnt - free
        unit_own = np.full(len(keys), np.inf)
        if objective == "cost" and math.isfinite(one_off):
            # rows of one point have the same parts, so the same own-system cost
            unit_own = np.array([own_cost[m[0]] + one_off for m in mem])
        with np.errstate(invalid="ignore"):
            fac = np.where(forced > 0, np.inf, free * unit_own)
        top = int(S.max())
        ctrl_a = np.zeros(top + 1)
        ctrl_n = np.zeros(top + 1, dtype=np.int64)
        for p in members:
            d = cands[p].design
            ctrl_a[d.modules_parallel] = max(ctrl_a[d.modules_parallel], d.controller_current_a)
            ctrl_n[d.modules_parallel] = max(ctrl_n[d.modules_parallel], d.controller_count)
        base = _Family(
            key, t, mem, S, P, W, cnt, inv_a, inv_b, fac, free, forced, unit_own, ctrl_a, ctrl_n
        )
        variants = [base]
        seen = {tuple(range(len(keys)))}
        for perm in (np.lexsort((W, P, S)), np.lexsort((W, S, P))):  # array-, battery-first
            if tuple(perm) not in seen:
                seen.add(tuple(perm))
                variants.append(_reorder(base, perm))
        fams.append(variants)
    return fams


def _reorder(f: _Family, perm: np.ndarray) -> _Family:
    return _Family(
        f.key,
        f.template,
        [f.members[i] for i in perm],
        f.S[perm],
        f.P[perm],
        f.W[perm],
        f.cnt[perm],
        f.inv_a[perm],
        f.inv_b[perm],
        f.fac[perm],
        f.free[perm],
        f.forced[perm],
        f.unit_own[perm],
        f.ctrl_a,
        f.ctrl_n,
    )


def _group_cost_fn(f: _Family, prices: PriceList | None, objective: Objective):
    t = f.template
    ns, pmod, us, string_wh = t.modules_series, t.module_pmax_w, t.units_series, t.string_wh

    def group_cost(i: int) -> np.ndarray:
        s = np.maximum.accumulate(f.S[i::-1])
        p = np.maximum.accumulate(f.P[i::-1])
        w = np.maximum.accumulate(f.W[i::-1])
        if objective == "cost":
            assert prices is not None
            each = _cost_arrays(
                prices,
                t.controller_type,
                t.battery_chemistry,
                pmod,
                ns,
                t.battery_unit_v * t.battery_unit_ah,
                us,
                s,
                p,
                f.ctrl_a[s],
                f.ctrl_n[s],
                w,
                t.module_name,
                t.battery_name,
            )
            if np.isfinite(f.unit_own[: i + 1]).any():
                # each row of the group takes the kit or its own system, whichever is
                # cheaper: cost[j] = sum over r >= j of forced_r c_j + free_r min(c_j, own_r)
                c = each[::-1][:, None]
                m = f.forced[None, : i + 1] * c + f.free[None, : i + 1] * np.minimum(
                    c, f.unit_own[None, : i + 1]
                )
                return np.triu(m).sum(axis=1)
            value = each * np.cumsum(f.cnt[i::-1])
        else:
            a = s * ns * pmod
            b = p * string_wh
            value = (
                a * np.cumsum(f.inv_a[i::-1]) + b * np.cumsum(f.inv_b[i::-1])
            ) / 2.0 - np.cumsum(f.cnt[i::-1])
        return value[::-1]

    return group_cost


def _kit_parts(t: RowDesign, f: _Family, rows: list[RowDesign]) -> KitParts:
    """The kit for a group: the part-by-part maximum of its rows' needs.

    Its cables and protective devices are those of the row that needs the whole kit
    (most strings, battery strings and inverter at once) when there is one; otherwise the
    largest of each circuit over the rows, marked for a check on the kit's own design.
    """
    s = max(d.modules_parallel for d in rows)
    p = max(d.units_parallel for d in rows)
    w = max(d.inverter_w for d in rows)
    top = next(
        (d for d in rows if (d.modules_parallel, d.units_parallel, d.inverter_w) == (s, p, w)), None
    )
    if top is not None:
        cables = tuple(c for c in top.cables if not c.house)
        devices = tuple(v for v in top.devices if not v.house)
    else:
        best_c: dict[str, Cable] = {}
        best_v: dict[str, Protection] = {}
        for d in rows:
            for c in d.cables:
                if not c.house and (
                    c.key not in best_c
                    or (c.area_mm2, c.metres) > (best_c[c.key].area_mm2, best_c[c.key].metres)
                ):
                    best_c[c.key] = c
            for v in d.devices:
                old = best_v.get(v.location)
                if not v.house and (
                    old is None or (v.count, v.rating_a or 0.0) > (old.count, old.rating_a or 0.0)
                ):
                    best_v[v.location] = v
        cables, devices = tuple(best_c.values()), tuple(best_v.values())
    return KitParts(
        t.family_label,
        t.system_voltage_v,
        t.controller_type,
        t.module_name,
        t.module_pmax_w,
        t.modules_series,
        s,
        t.battery_name,
        t.battery_chemistry,
        t.battery_unit_v,
        t.battery_unit_ah,
        t.units_series,
        p,
        float(f.ctrl_a[s]),
        int(f.ctrl_n[s]),
        w,
        w * INVERTER_SURGE_MULTIPLE,
        cables,
        devices,
        top is not None,
    )


def _kit_name(n: int) -> str:
    letters = ""
    n += 1
    while n:
        n, r = divmod(n - 1, 26)
        letters = chr(65 + r) + letters
    return letters


def standardise(
    candidates: list[Candidate],
    k: int | None = None,
    kit_type_cost: float | None = None,
    prices: PriceList | None = None,
    objective: Objective = "cost",
    k_max: int = 12,
    curve_to: int = 0,
) -> Standardisation:
    """Choose the standard kits (see the module docstring for the method).

    Parameters
    ----------
    candidates : list of Candidate
        Designed rows with their counts (count 0 rows are ignored).
    k : int, optional
        Use at most this many kit types (default ``k_max``).
    kit_type_cost : float, optional
        Cost of each kit type [currency]; the number of kit types (at most ``k``) is chosen
        to minimise parts cost + kit_type_cost x kit types.  Give ``k``, this, or both.
    prices : PriceList, optional
        Needed for the cost objective and for own systems.
    objective : {"cost", "oversize"}
    k_max : int
        Largest number of kit types tried when ``k`` is not given.
    curve_to : int
        Also compute the best objective for up to this many kit types (the trade-off
        curve shown to the planner); the choice itself still keeps to ``k``.
    """
    if objective not in ("cost", "oversize"):
        raise ValueError(f"objective '{objective}' must be cost or oversize")
    if objective == "cost" and prices is None:
        raise PlanError(
            "the cost objective needs a price list: give --prices FILE (or a "
            "'prices' setting), or choose --objective oversize"
        )
    if k is None and kit_type_cost is None:
        raise PlanError(
            "give the number of kit types (--kits K) or a cost per kit type (--kit-cost C)"
        )
    if k is not None and k < 0:
        raise PlanError(f"--kits {k}: the number of kit types must be 0 or more")
    if kit_type_cost is not None and (kit_type_cost < 0 or not math.isfinite(kit_type_cost)):
        raise PlanError("the cost per kit type must be 0 or more")
    if kit_type_cost is not None and objective != "cost":
        raise PlanError("a cost per kit type needs the cost objective")
    lam = float(kit_type_cost or 0.0)
    cands = list(candidates)
    own_cost: dict[int, float] = {}
    if prices is not None:
        by_parts: dict[KitParts, float] = {}
        for p, c in enumerate(cands):
            if c.count > 0:
                own = parts_of(c.design)
                if own not in by_parts:
                    by_parts[own] = parts_cost(prices, own)
                own_cost[p] = by_parts[own]
    forced_own = [p for p, c in enumerate(cands) if c.count > 0 and c.kit == "no"]
    pos = [p for p, c in enumerate(cands) if c.count > 0 and c.kit != "no"]
    fams = _families(cands, pos, prices, objective, own_cost)
    limit = k if k is not None else k_max
    cap = max(limit, curve_to, 0)
    sols = []  # per family: (best over the orders, order index per k, solutions)
    for variants in fams:
        n = variants[0].n
        per_order = [
            interval_partition(n, min(cap, n), _group_cost_fn(f, prices, objective), f.fac)
            for f in variants
        ]
        stack = np.vstack([sol.best for sol in per_order])
        pick = np.argmin(stack, axis=0)  # first order wins ties
        sols.append((stack[pick, np.arange(stack.shape[1])], pick, per_order))
    # min-plus combination of the families over the number of kit types
    comb = np.zeros(cap + 1)
    choice: list[np.ndarray] = []
    for best_f, _, _ in sols:
        kk = len(best_f) - 1
        new = np.full(cap + 1, np.inf)
        pick = np.zeros(cap + 1, dtype=np.int64)
        for total in range(cap + 1):
            for kf in range(min(kk, total) + 1):
                v = comb[total - kf] + best_f[kf]
                if math.isfinite(v) and v < new[total] - 1e-9 * max(1.0, abs(v)):
                    new[total], pick[total] = v, kf
        comb = new
        choice.append(pick)
    one_off = prices.optional("one_off") if prices else 0.0
    own_allowed = objective == "cost" and prices is not None and prices.has("one_off")
    fixed_own = (
        sum((own_cost.get(p, 0.0) + one_off) * cands[p].count for p in forced_own)
        if objective == "cost"
        else 0.0
    )
    curve_vals = comb + fixed_own
    totals = (curve_vals + lam * np.arange(cap + 1))[: limit + 1]
    finite = np.isfinite(totals)
    if not finite.any():
        need = sum(1 for v in fams if not np.isfinite(v[0].fac).all())
        raise PlanError(
            f"{limit} kit type(s) cannot serve the survey: its rows fall in "
            f"{len(fams)} families (system voltage, controller, module, battery "
            f"unit), {need} of which need a kit; allow {max(need, 1)} or more kit "
            "types, or price own systems (a 'one_off' price) so rows may take "
            "their own design"
        )
    target = float(np.min(totals[finite]))
    k_used = int(np.flatnonzero(totals <= target + 1e-9 * max(1.0, abs(target)))[0])
    value = float(totals[k_used])
    # back-track the per-family kit counts
    per_family = [0] * len(fams)
    rest = k_used
    for fi in range(len(fams) - 1, -1, -1):
        per_family[fi] = int(choice[fi][rest])
        rest -= per_family[fi]
    kits: list[KitChoice] = []
    assign: dict[int, Assignment] = {}
    for variants, (_, pick, per_order), kf in zip(fams, sols, per_family, strict=True):
        f = variants[int(pick[kf])]
        groups, cut = per_order[int(pick[kf])].groups(kf)
        t = f.template
        for j, i in groups:
            members = [q for m in f.members[j:i] for q in m]
            parts = _kit_parts(t, f, [cands[q].design for q in members])
            unit = parts_cost(prices, parts) if prices is not None else None
            opt_out = []
            if own_allowed and unit is not None:
                opt_out = [
                    q
                    for q in members
                    if cands[q].kit == "auto" and own_cost[q] + one_off < unit - 1e-9
                ]
            out_set = set(opt_out)
            kept = [q for q in members if q not in out_set]
            name = _kit_name(len(kits))
            if kept:
                if opt_out:  # the kit need only serve the rows that keep it
                    parts = _kit_parts(t, f, [cands[q].design for q in kept])
                    unit = parts_cost(prices, parts) if prices is not None else None
                kits.append(
                    KitChoice(name, parts, unit, tuple(kept), sum(cands[q].count for q in kept))
                )
                for q in kept:
                    assign[q] = _assignment(cands[q], name, parts, unit, "standard kit")
            for q in opt_out:
                assign[q] = _assignment(
                    cands[q],
                    None,
                    parts_of(cands[q].design),
                    own_cost.get(q),
                    "cheaper as its own system than in a standard kit, one-off overhead included",
                )
        for m in f.members[cut:]:
            for q in m:
                assign[q] = _assignment(
                    cands[q],
                    None,
                    parts_of(cands[q].design),
                    own_cost.get(q),
                    "cheaper as its own system than in any standard kit, one-off overhead included",
                )
    for q in forced_own:
        assign[q] = _assignment(
            cands[q],
            None,
            parts_of(cands[q].design),
            own_cost.get(q),
            "its own system, as the survey asks (kit = no)",
        )
    out = []
    for q, c in enumerate(cands):
        if q in assign:
            out.append(assign[q])
        else:  # count 0
            out.append(Assignment(c.index, None, False, "count 0: not planned", 0.0, 0.0, None))
    parts_total = None
    if prices is not None:
        parts_total = float(
            sum(a.unit_cost * cands[q].count for q, a in enumerate(out) if a.unit_cost is not None)
        )
    if objective == "cost":
        actual = (
            (parts_total or 0.0)
            + one_off * sum(cands[q].count for q, a in enumerate(out) if a.own_system)
            + lam * len(kits)
        )
    else:
        actual = sum(
            cands[q].count * (a.oversize_array_pct + a.oversize_battery_pct) / 200.0
            for q, a in enumerate(out)
            if not a.own_system and a.kit is not None
        )
    # trimming kits to the rows that keep them can only lower the recursion's figure
    assert actual <= value + 1e-6 * max(1.0, abs(value)), (actual, value)
    value = float(actual)
    curve = tuple(
        (kk, value if kk == k_used else float(v) + lam * kk)
        for kk, v in enumerate(curve_vals)
        if np.isfinite(v)
    )
    return Standardisation(
        objective, METHOD, k, lam, tuple(kits), tuple(out), value, parts_total, curve, len(fams)
    )


def _assignment(
    c: Candidate, kit: str | None, parts: KitParts, unit: float | None, reason: str
) -> Assignment:
    d = c.design
    over_a = (parts.array_power_w / d.required_power_w - 1.0) * 100.0
    over_b = (parts.nominal_wh / d.required_wh - 1.0) * 100.0
    return Assignment(c.index, kit, kit is None, reason, float(over_a), float(over_b), unit)
