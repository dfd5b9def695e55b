"""A pump set from its datasheet points: flow against input power at a head, start-up power,
and (direct drive) the motor's current-voltage line.

The datasheet table is interpolated linearly in head between its head points and in power
between its power points (common practice, no source).  Below the lowest power point the
first segment is extended down to zero flow: that crossing is the start-up power.  Above the
highest point the pump set is held at its highest point (the controller limits the power).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design.result import DesignError


@dataclass(frozen=True)
class PumpAtHead:
    """The pump's characteristic at one total dynamic head."""

    head_m: float
    power_w: np.ndarray  # datasheet power points [W]
    flow_m3_h: np.ndarray  # flow at each power point at this head [m3/h]
    start_power_w: float  # input power at which water starts to flow
    voltage_v: np.ndarray | None  # direct drive: motor voltage at each power point [V]

    @property
    def max_flow_m3_h(self) -> float:
        return float(self.flow_m3_h[-1])

    @property
    def max_power_w(self) -> float:
        return float(self.power_w[-1])


def _along_head(table, heads, head_m: float) -> np.ndarray:
    """Each power column of ``table`` [head][power] interpolated at ``head_m``."""
    t = np.asarray(table, dtype=float)
    return np.array([np.interp(head_m, heads, t[:, j]) for j in range(t.shape[1])])


def pump_at_head(pump, head_m: float, field: str = "water[1].pump") -> PumpAtHead:
    """Interpolate the datasheet at ``head_m``; DesignError if it cannot lift that head."""
    heads = np.asarray(pump.head_points_m, dtype=float)
    powers = np.asarray(pump.power_points_w, dtype=float)
    if head_m > heads[-1] + 1e-9:
        raise DesignError(
            "pump-head",
            f"the total dynamic head {head_m:.1f} m is above the pump's highest datasheet head "
            f"{heads[-1]:g} m: the pump cannot lift it at any sunshine; choose a pump for a "
            "higher head or lower the tank",
            f"{field}.head_points_m",
        )
    q = np.maximum(_along_head(pump.flow_m3_h, heads, head_m), 0.0)
    if not np.any(q > 0):
        raise DesignError(
            "pump-head",
            f"the pump's datasheet gives no flow at {head_m:.1f} m of head at any power up to "
            f"{powers[-1]:g} W: it cannot lift this head; choose a pump for a higher head",
            f"{field}.flow_m3_h",
        )
    j = int(np.argmax(q > 0))
    if j == 0:
        dq = q[1] - q[0] if len(q) > 1 else 0.0
        slope = dq / (powers[1] - powers[0]) if dq > 0 else 0.0
        start = powers[0] - q[0] / slope if slope > 0 else powers[0]
        start = max(start, 0.0)
    else:
        start = powers[j - 1] + (powers[j] - powers[j - 1]) * (0 - q[j - 1]) / (q[j] - q[j - 1])
    volts = None
    if pump.drive == "direct":
        volts = _along_head(pump.voltage_v, heads, head_m)
    return PumpAtHead(float(head_m), powers, q, float(start), volts)


def flow_at_power_m3_h(p: PumpAtHead, power_w):
    """Flow [m3/h] at the input powers: zero below start-up, held at the top point above."""
    pw = np.asarray(power_w, dtype=float)
    xs = np.concatenate(([p.start_power_w], p.power_w[p.power_w > p.start_power_w]))
    ys = np.concatenate(([0.0], p.flow_m3_h[p.power_w > p.start_power_w]))
    return np.where(pw > p.start_power_w, np.interp(pw, xs, ys), 0.0)


def motor_line(p: PumpAtHead) -> tuple[np.ndarray, np.ndarray]:
    """Direct drive: the motor's (voltage [V], current [A]) points from 0 V, increasing.

    Current at each datasheet point is its power over its voltage; below the first point
    the stalled motor is taken as a resistance through it (common practice, no source).
    """
    assert p.voltage_v is not None
    v = np.concatenate(([0.0], p.voltage_v))
    i = np.concatenate(([0.0], p.power_w / p.voltage_v))
    return v, i
