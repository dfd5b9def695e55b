"""Saved dataclasses of a water supply (``[[water]]`` tables): what the user typed.

Plain mutable dataclasses like the rest of :mod:`offgrid.project.model`; the engine that
reads them is :mod:`offgrid.water`.  Units are in the names.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

PumpKind = Literal["centrifugal", "helical_rotor"]
PumpDrive = Literal["controller", "direct"]
PipeMaterial = Literal["pvc", "hdpe", "steel", "galvanised"]
FrictionMethod = Literal["darcy_weisbach", "hazen_williams"]


@dataclass
class PumpSpec:
    """A pump set from its datasheet points.

    ``flow_m3_h[i][j]`` is the flow at head ``head_points_m[i]`` with ``power_points_w[j]``
    into the pump set (motor and pump).  ``drive = "controller"``: a pump controller or
    inverter holds the array at its maximum power point inside ``min_input_v`` ..
    ``max_input_v``.  ``drive = "direct"``: a DC motor straight on the array;
    ``voltage_v[i][j]`` is the motor's terminal voltage at that point and ``max_input_v``
    its highest allowed voltage.
    """

    name: str = "Generic 24-48 V helical rotor pump set (demo datasheet)"
    kind: PumpKind = "helical_rotor"
    drive: PumpDrive = "controller"
    head_points_m: list[float] = field(default_factory=lambda: [20.0, 40.0, 60.0])
    power_points_w: list[float] = field(default_factory=lambda: [150.0, 300.0, 500.0, 700.0])
    flow_m3_h: list[list[float]] = field(
        default_factory=lambda: [
            [0.9, 1.9, 3.2, 4.4],
            [0.3, 1.0, 1.8, 2.6],
            [0.0, 0.5, 1.1, 1.7],
        ]
    )
    voltage_v: list[list[float]] = field(default_factory=list)  # direct drive only
    min_input_v: float = 30.0
    max_input_v: float = 150.0
    controller_efficiency: float = 0.95  # controller drive only; 1 for direct


@dataclass
class WaterSupply:
    """One water point: a borehole, its pump, the riser and delivery pipe, and a tank."""

    name: str = "Water point"
    need_m3_day: list[float] = field(default_factory=lambda: [10.0] * 12)  # by month, Jan first
    static_level_m: float = 20.0  # water level below ground at rest
    drawdown_m: float = 5.0  # extra drop of the level at the test rate
    drawdown_test_m3_h: float = 2.0  # pumping rate of the drawdown test
    safe_yield_m3_h: float = 3.0  # the borehole's safe yield
    tank_height_m: float = 5.0  # tank inlet above ground
    pipe_length_m: float = 150.0  # riser plus delivery main
    pipe_diameter_mm: float = 40.0  # inner diameter
    pipe_material: PipeMaterial = "hdpe"
    friction_method: FrictionMethod = "darcy_weisbach"
    minor_loss_k: float = 5.0  # sum of the fittings' loss coefficients
    autonomy_days: float = 2.0  # days of water the tank holds
    drop_cable_m: float = 40.0  # pump to well head
    pump: PumpSpec = field(default_factory=PumpSpec)
