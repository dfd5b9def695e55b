"""The generator's fuel curve, fitted linearly from datasheet points.

The form (Skarstein & Uhlen 1989, as used widely in hybrid-system studies)::

    fuel [L/h] = a x rated_kw + b x output_kw

``a`` [L/h per kW rated] is the no-load share, ``b`` [L/kWh] the marginal use.
Fitted by ordinary least squares on the datasheet's (load, fuel) points:
``b = sum (x - xm)(y - ym) / sum (x - xm)^2``, ``a x rated = ym - b xm``.

References
----------
Skarstein, O. & Uhlen, K., "Design considerations with respect to long-term diesel
saving in wind/diesel plants", Wind Engineering 13(2), 1989, 72-87 (linear fuel curve
form; citation from memory).
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

import numpy as np

from offgrid.catalogue import input_entry
from offgrid.design.result import Reason, fmt

SOURCE = (
    "linear fuel curve fuel = a x rating + b x output (Skarstein & Uhlen 1989, from memory), "
    "ordinary least squares on the datasheet points"
)


@dataclass(frozen=True)
class FuelCurve:
    rated_kw: float
    a_l_h_per_kw: float  # no-load share per kW rated
    b_l_per_kwh: float  # marginal fuel per kWh delivered
    points_kw: tuple[float, ...]
    points_l_h: tuple[float, ...]
    fitted_l_h: tuple[float, ...]
    residual_max_l_h: float
    r_squared: float
    reason: Reason

    @property
    def no_load_l_h(self) -> float:
        return self.a_l_h_per_kw * self.rated_kw

    def fuel_l_h(self, output_kw):
        """Fuel use [L/h] at ``output_kw`` [kW] while running (array in, array out)."""
        return self.no_load_l_h + self.b_l_per_kwh * np.asarray(output_kw, dtype=float)

    def table(self) -> list[dict[str, float]]:
        """The fit shown: each datasheet point beside the line's value."""
        return [
            {"load_kw": x, "datasheet_l_h": y, "fitted_l_h": f}
            for x, y, f in zip(self.points_kw, self.points_l_h, self.fitted_l_h, strict=True)
        ]


def check_fuel_points(load_pct, fuel_l_h) -> list[tuple[str, str]]:
    """Problems (field, message) with a datasheet fuel table; empty when usable."""
    out: list[tuple[str, str]] = []
    x = list(load_pct)
    y = list(fuel_l_h)
    if len(x) != len(y):
        out.append(
            (
                "generator.fuel_l_h",
                f"{len(y)} fuel values for {len(x)} loads in fuel_load_pct; give one "
                "fuel use for each load",
            )
        )
        return out
    if len(x) < 2:
        out.append(
            (
                "generator.fuel_l_h",
                "give the datasheet's fuel use at two loads at least (25/50/75/100 %)",
            )
        )
        return out
    loads, use = input_entry("generator.fuel_load_pct"), input_entry("generator.fuel_l_h")
    if any(not (loads.low <= v <= loads.high) for v in x):
        out.append(
            ("generator.fuel_load_pct", f"loads are % of the rating, {loads.low:g}-{loads.high:g}")
        )
    if any(not (use.low < v <= use.high) for v in y):
        out.append(
            (
                "generator.fuel_l_h",
                f"fuel use is litres per hour, above {use.low:g} (up to {use.high:g})",
            )
        )
    if out:
        return out
    if any(b <= a for a, b in itertools.pairwise(x)):
        out.append(("generator.fuel_load_pct", "list the loads in increasing order, each once"))
    elif any(b <= a for a, b in itertools.pairwise(y)):
        out.append(
            (
                "generator.fuel_l_h",
                "fuel use must rise with load (" + ", ".join(f"{v:g}" for v in y) + " L/h "
                "does not); check the datasheet columns",
            )
        )
    return out


def fit_fuel_curve(rated_kw: float, load_pct, fuel_l_h) -> FuelCurve:
    """Least-squares line through the datasheet points; ValueError naming the field if bad."""
    problems = check_fuel_points(load_pct, fuel_l_h)
    if problems:
        raise ValueError(f"{problems[0][0]}: {problems[0][1]}")
    x = np.asarray(load_pct, dtype=float) / 100.0 * rated_kw
    y = np.asarray(fuel_l_h, dtype=float)
    xm, ym = x.mean(), y.mean()
    b = float(((x - xm) * (y - ym)).sum() / ((x - xm) ** 2).sum())
    a0 = float(ym - b * xm)
    fitted = a0 + b * x
    ss_res = float(((y - fitted) ** 2).sum())
    ss_tot = float(((y - ym) ** 2).sum())
    r2 = 1.0 - ss_res / ss_tot if ss_tot > 0 else 1.0
    reason = Reason(
        "fuel [L/h] = a x rating + b x output; b = sum (x - xm)(y - ym) / sum (x - xm)^2, "
        "a x rating = ym - b xm",
        (
            ("points", ", ".join(f"{p:g} kW: {q:g} L/h" for p, q in zip(x, y, strict=True))),
            ("a", fmt(a0 / rated_kw, "L/h per kW rated")),
            ("b", fmt(b, "L/kWh")),
            ("R^2", fmt(r2, "", 4)),
        ),
        SOURCE,
    )
    return FuelCurve(
        float(rated_kw),
        a0 / rated_kw,
        b,
        tuple(float(v) for v in x),
        tuple(float(v) for v in y),
        tuple(float(v) for v in fitted),
        float(np.abs(y - fitted).max()),
        r2,
        reason,
    )
