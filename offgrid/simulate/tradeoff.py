"""Array size against battery capacity at a target LOLP, from one vectorised sweep.

All designs of the grid (array sizes x battery capacities) run in one call of
the balance, sharing the weather.  The controller is resized with the array
(its limit per W of array is kept), as the sizing engine would do.  For each
array size the LOLP falls monotonically with capacity (a larger store never
holds less usable energy, starting full), so the capacity that just meets a
target is found between two grid points by linear interpolation of LOLP.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from offgrid.design.result import Reason
from offgrid.simulate.balance import SystemInputs, build_steps, run_balance
from offgrid.simulate.weather import WeatherSeries

#: The reasons of each target's figures (the same for every study: formula and method),
#: keyed as the catalogue's rows ``tradeoff.targets[].target`` less ``tradeoff.``
#: (offgrid/catalogue/outcomes.py).
TRADEOFF_REASONS: dict[str, Reason] = {
    "targets.target": Reason(
        "the loss-of-load probability asked for: days with shedding / days simulated",
        (),
        "the project's or the command's target (choices)",
    ),
    "targets.design_meets": Reason(
        "the design's own simulated LOLP <= the target",
        (),
        "offgrid.simulate.balance (step energy balance, module notes)",
    ),
    "targets.design_capacity_needed_wh": Reason(
        "at the design's array size, the smallest battery capacity whose LOLP meets the "
        "target, interpolated linearly in LOLP between the two grid capacities around it",
        (),
        "common practice, no source",
    ),
    "targets.cheapest": Reason(
        "of the array and battery pairs on the target's curve, the one of least price: "
        "array W x price per W + battery kWh x price per kWh (the price list)",
        (),
        "common practice, no source",
    ),
}

DEFAULT_TARGETS = (0.01, 0.001)
ARRAY_FACTORS = (0.5, 3.0)  # sweep range, times the reference array
BATTERY_FACTORS = (0.2, 5.0)  # sweep range, times the reference battery
MAX_GRID = 200
PRICE_KEYS = ("array_per_w", "battery_per_kwh")


def check_target(target) -> float:
    """A target LOLP must be a fraction strictly between 0 and 1 ("1%" is read as 0.01)."""
    try:
        text = str(target).strip()
        t = float(text[:-1]) / 100.0 if text.endswith("%") else float(target)
    except (TypeError, ValueError):
        raise ValueError(
            f"target LOLP: {target!r} is not a number; give e.g. 0.01 for 1 %"
        ) from None
    if not np.isfinite(t) or t >= 1:
        raise ValueError(f"target LOLP: {target!r} must be below 1 (a fraction: 0.01 = 1 %)")
    if t <= 0:
        raise ValueError(
            "target LOLP: 0 cannot be promised by an array and battery of "
            "finite size in a random climate; give a positive fraction such "
            "as 0.001 (0.1 %)"
        )
    return t


def check_prices(prices: Mapping[str, Any] | None) -> dict[str, float]:
    """Unit costs: ``{"array_per_w": ..., "battery_per_kwh": ...}`` (any one currency)."""
    if not prices:
        raise ValueError(
            "costs missing: give the array price per W and the battery price "
            "per kWh (prices={'array_per_w': 0.5, 'battery_per_kwh': 200}, or "
            "--array-price and --battery-price)"
        )
    out: dict[str, float] = {}
    for key in PRICE_KEYS:
        if key not in prices or prices[key] is None:
            raise ValueError(f"costs missing: {key} is not given (need {', '.join(PRICE_KEYS)})")
        try:
            v = float(prices[key])
        except (TypeError, ValueError):
            raise ValueError(f"costs: {key} = {prices[key]!r} is not a number") from None
        if not np.isfinite(v) or v < 0:
            raise ValueError(f"costs: {key} = {v} must be a number 0 or more")
        out[key] = v
    if out["array_per_w"] == 0 and out["battery_per_kwh"] == 0:
        raise ValueError("costs: both prices are 0; the cheapest point is undefined")
    return out


@dataclass(frozen=True)
class Sweep:
    array_w: np.ndarray  # (na,)
    capacity_wh: np.ndarray  # (nb,)
    lolp: np.ndarray  # (na, nb)
    lolp_critical: np.ndarray
    unmet_fraction: np.ndarray
    days: int


def sweep(
    inp: SystemInputs,
    weather: WeatherSeries,
    array_w,
    capacity_wh,
    *,
    mode: str = "daily",
    extra=None,
    progress=None,
    cancelled=None,
    steps=None,
) -> tuple[Sweep, Any]:
    """Run every (array, battery) pair of the grid in one vectorised balance.

    ``extra`` is an optional (array_w, capacity_wh) pair run in the same call
    (the worst-month design); its Balance index is returned second.
    """
    aw = np.asarray(array_w, dtype=float).ravel()
    cap = np.asarray(capacity_wh, dtype=float).ravel()
    if aw.size == 0 or cap.size == 0 or aw.size * cap.size > MAX_GRID**2:
        raise ValueError(f"sweep: need 1 to {MAX_GRID} values on each axis")
    if (
        np.any(aw <= 0)
        or np.any(cap < 0)
        or not (np.all(np.isfinite(aw)) and np.all(np.isfinite(cap)))
    ):
        raise ValueError("sweep: array sizes must be positive and battery sizes 0 or more")
    a2, c2 = np.meshgrid(aw, cap, indexing="ij")
    a_all, c_all = a2.ravel(), c2.ravel()
    if extra is not None:
        a_all = np.append(a_all, float(extra[0]))
        c_all = np.append(c_all, float(extra[1]))
    steps = steps if steps is not None else build_steps(inp, weather, mode)
    bal = run_balance(
        steps,
        a_all,
        c_all,
        max_dod=inp.max_dod,
        eta_charge=inp.eta_charge,
        eta_discharge=inp.eta_discharge,
        initial_soc=inp.initial_soc,
        progress=progress,
        cancelled=cancelled,
    )
    n = aw.size * cap.size
    shape = (aw.size, cap.size)
    sw = Sweep(
        aw,
        cap,
        bal.lolp[:n].reshape(shape),
        bal.lolp_critical[:n].reshape(shape),
        bal.unmet_fraction[:n].reshape(shape),
        bal.days,
    )
    extra_out = None
    if extra is not None:
        extra_out = {
            "lolp": float(bal.lolp[n]),
            "lolp_critical": float(bal.lolp_critical[n]),
            "unmet_fraction": float(bal.unmet_fraction[n]),
        }
    return sw, extra_out


@dataclass(frozen=True)
class CurvePoint:
    array_w: float
    capacity_wh: float
    at_grid_edge: bool  # True: the smallest battery of the sweep already meets the target


def curve(sw: Sweep, target: float) -> list[CurvePoint]:
    """Smallest battery meeting ``target`` at each array size (array sizes never reached are
    left out)."""
    t = check_target(target)
    pts = []
    for i, a in enumerate(sw.array_w):
        row = sw.lolp[i]
        ok = np.nonzero(row <= t + 1e-12)[0]
        if ok.size == 0:
            continue
        j = int(ok[0])
        if j == 0:
            pts.append(CurvePoint(float(a), float(sw.capacity_wh[0]), True))
            continue
        l0, l1 = row[j - 1], row[j]
        c0, c1 = sw.capacity_wh[j - 1], sw.capacity_wh[j]
        f = (l0 - t) / (l0 - l1) if l0 > l1 else 1.0
        pts.append(CurvePoint(float(a), float(c0 + f * (c1 - c0)), False))
    return pts


def point_cost(array_w: float, capacity_wh: float, prices: Mapping[str, Any]) -> float:
    p = check_prices(prices)
    return p["array_per_w"] * array_w + p["battery_per_kwh"] * capacity_wh / 1000.0


def cheapest_point(
    points: list[CurvePoint], prices: Mapping[str, Any] | None
) -> tuple[CurvePoint, float] | None:
    """Cheapest point of a curve under unit costs; None when the curve is empty."""
    p = check_prices(prices)
    if not points:
        return None
    costs = [point_cost(q.array_w, q.capacity_wh, p) for q in points]
    i = int(np.argmin(costs))
    return points[i], float(costs[i])


def capacity_needed(points: list[CurvePoint], array_w: float) -> float | None:
    """Battery the curve needs at ``array_w`` (interpolated), None outside the reached range."""
    if not points:
        return None
    a = np.array([q.array_w for q in points])
    c = np.array([q.capacity_wh for q in points])
    if array_w < a[0] - 1e-9 or array_w > a[-1] + 1e-9:
        return None
    return float(np.interp(array_w, a, c))


@dataclass(frozen=True)
class TargetResult:
    target: float
    points: tuple[CurvePoint, ...]
    cheapest: CurvePoint | None
    cheapest_cost: float | None
    design_meets: bool
    design_capacity_needed_wh: float | None  # on the curve at the design's array size
    design_cost: float | None
    message: str


@dataclass(frozen=True)
class TradeOff:
    sweep: Sweep
    design_array_w: float
    design_capacity_wh: float
    design_lolp: float
    targets: tuple[TargetResult, ...]
    prices: dict[str, float] | None
    notes: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        return {
            "array_w": self.sweep.array_w.round(3).tolist(),
            "capacity_wh": self.sweep.capacity_wh.round(3).tolist(),
            "lolp": self.sweep.lolp.round(6).tolist(),
            "days": self.sweep.days,
            "design": {
                "array_w": self.design_array_w,
                "capacity_wh": self.design_capacity_wh,
                "lolp": self.design_lolp,
            },
            "prices": self.prices,
            "targets": [
                {
                    "target_lolp": t.target,
                    "curve": [
                        {
                            "array_w": round(p.array_w, 3),
                            "capacity_wh": round(p.capacity_wh, 3),
                            "at_grid_edge": p.at_grid_edge,
                        }
                        for p in t.points
                    ],
                    "cheapest": None
                    if t.cheapest is None
                    else {
                        "array_w": round(t.cheapest.array_w, 3),
                        "capacity_wh": round(t.cheapest.capacity_wh, 3),
                        "cost": round(t.cheapest_cost, 2),
                    },
                    "design_meets": t.design_meets,
                    "design_capacity_needed_wh": t.design_capacity_needed_wh,
                    "design_cost": t.design_cost,
                    "message": t.message,
                }
                for t in self.targets
            ],
            "notes": list(self.notes),
        }


def default_grid(reference: float, factors: tuple[float, float], n: int) -> np.ndarray:
    if not isinstance(n, int) or not 2 <= n <= MAX_GRID:
        raise ValueError(f"sweep: grid size {n!r} must be a whole number 2-{MAX_GRID}")
    if not reference > 0:
        raise ValueError("sweep: the reference design needs a positive array and battery")
    return reference * np.geomspace(factors[0], factors[1], n)


def tradeoff(
    inp: SystemInputs,
    weather: WeatherSeries,
    *,
    targets=DEFAULT_TARGETS,
    prices: Mapping[str, Any] | None = None,
    n_array: int = 30,
    n_battery: int = 30,
    array_w=None,
    capacity_wh=None,
    mode: str = "daily",
    progress=None,
    cancelled=None,
) -> TradeOff:
    """The target-LOLP curves, their cheapest points and where the reference design sits."""
    tgs = tuple(check_target(t) for t in targets)
    if not tgs:
        raise ValueError("target LOLP: give at least one target, e.g. 0.01")
    pr = check_prices(prices) if prices is not None else None
    aw = (
        default_grid(inp.array_w, ARRAY_FACTORS, n_array)
        if array_w is None
        else np.asarray(array_w, dtype=float)
    )
    cw = (
        default_grid(inp.capacity_wh, BATTERY_FACTORS, n_battery)
        if capacity_wh is None
        else np.asarray(capacity_wh, dtype=float)
    )
    sw, design = sweep(
        inp,
        weather,
        aw,
        cw,
        mode=mode,
        extra=(inp.array_w, inp.capacity_wh),
        progress=progress,
        cancelled=cancelled,
    )
    d_lolp = design["lolp"]
    out = []
    for t in tgs:
        pts = curve(sw, t)
        cheap = cheapest_point(pts, pr) if pr is not None else None
        need = capacity_needed(pts, inp.array_w)
        meets = d_lolp <= t + 1e-12
        d_cost = point_cost(inp.array_w, inp.capacity_wh, pr) if pr is not None else None
        if not pts:
            msg = (
                f"no design of the sweep reaches LOLP {t:.2%}; the best has "
                f"{float(sw.lolp.min()):.2%}: widen the sweep or lower the load"
            )
        else:
            msg = (
                f"the worst-month design ({inp.array_w:.0f} W, {inp.capacity_wh / 1000:.2f} "
                f"kWh) has LOLP {d_lolp:.2%}: it {'meets' if meets else 'misses'} "
                f"{t:.2%}"
            )
            if need is not None:
                msg += f"; with this array the battery needed for it is {need / 1000:.2f} kWh"
            if cheap is not None:
                c, cost = cheap
                msg += (
                    f"; cheapest point {c.array_w:.0f} W with {c.capacity_wh / 1000:.2f} kWh "
                    f"costs {cost:,.0f} (the design {d_cost:,.0f})"
                )
            elif pr is None:
                msg += "; give prices to find the cheapest point"
        if weather.days * t < 10:
            msg += (
                f" (only {weather.days * t:.1f} shedding days allowed in {weather.days} "
                "days: simulate more years for a firmer answer)"
            )
        out.append(
            TargetResult(
                t,
                tuple(pts),
                None if cheap is None else cheap[0],
                None if cheap is None else cheap[1],
                meets,
                need,
                d_cost,
                msg,
            )
        )
    notes = (
        "one vectorised run over all designs of the grid, sharing the weather",
        "the controller is resized with the array (limit per W of array kept)",
        "capacity meeting the target interpolated linearly in LOLP between grid points",
    )
    return TradeOff(sw, inp.array_w, inp.capacity_wh, d_lolp, tuple(out), pr, notes)


def point_text(point) -> str:
    """A point of a trade-off curve (a ``CurvePoint``, or None: '-'), as the catalogue's
    composite ``tradeoff.point`` says: ``1,234 W, 12.3 kWh``."""
    from offgrid.catalogue import composite, figure_entry

    if point is None:
        return "-"
    return composite("tradeoff.point").fill(
        lambda path: getattr(point, path.rsplit(".", 1)[1]),  # a field named in the entry
        figure_entry,
    )


def target_texts(target) -> tuple[str, str, str]:
    """The texts of one target's figures (a ``TargetResult``), as the columns of the
    catalogue's table ``tradeoff``: the target and the battery needed without their unit
    (the column heading has it), met as yes/no."""
    from offgrid.catalogue import figure_entry

    t = figure_entry("tradeoff.targets[].target")
    need = figure_entry("tradeoff.targets[].design_capacity_needed_wh")
    wh = target.design_capacity_needed_wh
    return (
        f"{t.shown(target.target):,.{t.digits or 0}f}",
        "yes" if target.design_meets else "no",
        "-" if wh is None else f"{need.shown(wh):,.{need.digits or 0}f}",
    )
