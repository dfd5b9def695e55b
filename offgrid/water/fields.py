"""Metadata of the water-supply inputs, in one tuple (to move into the field catalogue).

Each entry: (path under ``water[N].``, label, unit, low, high, hint).  The ranges are
physical or common-practice bounds (common practice, no source); :func:`water_problems`
checks a project's supplies against them and the consistency rules.
"""

from __future__ import annotations

from typing import NamedTuple


class WaterField(NamedTuple):
    path: str
    label: str
    unit: str
    low: float
    high: float
    hint: str


WATER_FIELDS: tuple[WaterField, ...] = (
    WaterField("need_m3_day", "Water need by month", "m3/day", 0.0, 2000.0,
               "twelve daily volumes, January first, 0-2000 m3/day"),
    WaterField("static_level_m", "Static water level", "m", 0.0, 500.0,
               "depth of the water at rest below ground, 0-500 m"),
    WaterField("drawdown_m", "Drawdown at test rate", "m", 0.0, 200.0,
               "extra drop of the level while pumping at the test rate, 0-200 m"),
    WaterField("drawdown_test_m3_h", "Drawdown test rate", "m3/h", 0.01, 500.0,
               "pumping rate of the drawdown test, 0.01-500 m3/h"),
    WaterField("safe_yield_m3_h", "Borehole safe yield", "m3/h", 0.01, 500.0,
               "the borehole's safe yield from its pumping test, 0.01-500 m3/h"),
    WaterField("tank_height_m", "Tank inlet height", "m", 0.0, 100.0,
               "height of the tank inlet above ground, 0-100 m"),
    WaterField("pipe_length_m", "Pipe length", "m", 1.0, 20000.0,
               "riser plus delivery pipe, 1-20000 m"),
    WaterField("pipe_diameter_mm", "Pipe inner diameter", "mm", 10.0, 500.0,
               "inner diameter of the pipe, 10-500 mm"),
    WaterField("minor_loss_k", "Fittings loss K", "", 0.0, 200.0,
               "sum of the loss coefficients of valves and bends, 0-200"),
    WaterField("autonomy_days", "Days of water stored", "days", 0.0, 30.0,
               "days of need the tank holds, 0-30"),
    WaterField("drop_cable_m", "Drop cable length", "m", 1.0, 1000.0,
               "cable from the pump to the well head, 1-1000 m"),
    WaterField("pump.min_input_v", "Pump lowest input V", "V", 0.0, 1500.0,
               "lowest input voltage of the pump controller or motor, 0-1500 V"),
    WaterField("pump.max_input_v", "Pump highest input V", "V", 1.0, 1500.0,
               "highest input voltage of the pump controller or motor, 1-1500 V"),
    WaterField("pump.controller_efficiency", "Pump controller eff.", "", 0.5, 1.0,
               "pump controller efficiency as a fraction, 0.5-1"),
)  # fmt: skip
