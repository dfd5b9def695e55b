"""The inputs of a water supply (``[[water]]`` tables, :mod:`offgrid.project.water_model`)
and the figures of its design (:class:`offgrid.water.design.WaterDesign`).

One row per field, ``water[].`` in front as for ``loads[]`` (``water[2].pump.max_input_v``
is the row ``water[].pump.max_input_v``).  A number row with a range is checked by
:func:`offgrid.water.checks.supply_problems` (a ``floats`` row: each value); the pump
table's shape and the consistency rules are checked there too.  The ranges are physical
or common-practice bounds (common practice, no source).  docs/water-format.md lists these
rows (a test keeps it in step).
"""

from __future__ import annotations

from offgrid.catalogue.entries import FigureEntry as Fig
from offgrid.catalogue.entries import InputEntry as In

WATER_INPUTS: tuple[In, ...] = (
    In("water[].name", "Name of the supply", kind="text", hint="what the water point is called"),
    In("water[].need_m3_day", "Water need by month", "m3/day", 0.0, 2000.0,
       "twelve daily volumes, January first, 0-2000 m3/day", "floats"),
    In("water[].static_level_m", "Static water level", "m", 0.0, 500.0,
       "depth of the water at rest below ground, 0-500 m"),
    In("water[].drawdown_m", "Drawdown at test rate", "m", 0.0, 200.0,
       "extra drop of the level while pumping at the test rate, 0-200 m"),
    In("water[].drawdown_test_m3_h", "Drawdown test rate", "m3/h", 0.01, 500.0,
       "pumping rate of the drawdown test, 0.01-500 m3/h"),
    In("water[].safe_yield_m3_h", "Borehole safe yield", "m3/h", 0.01, 500.0,
       "the borehole's safe yield from its pumping test, 0.01-500 m3/h"),
    In("water[].tank_height_m", "Tank inlet height", "m", 0.0, 100.0,
       "height of the tank inlet above ground, 0-100 m"),
    In("water[].pipe_length_m", "Pipe length", "m", 1.0, 20000.0,
       "riser plus delivery pipe, 1-20000 m"),
    In("water[].pipe_diameter_mm", "Pipe inner diameter", "mm", 10.0, 500.0,
       "inner diameter of the pipe, 10-500 mm"),
    In("water[].pipe_material", "Pipe material", kind="choice",
       hint="sets the roughness (Darcy-Weisbach) or C (Hazen-Williams)",
       values=("pvc", "hdpe", "steel", "galvanised")),
    In("water[].friction_method", "Friction method", kind="choice",
       hint="Darcy-Weisbach uses the Swamee & Jain (1976) friction factor",
       values=("darcy_weisbach", "hazen_williams")),
    In("water[].minor_loss_k", "Fittings loss K", "", 0.0, 200.0,
       "sum of the loss coefficients of valves and bends, 0-200"),
    In("water[].autonomy_days", "Days of water stored", "days", 0.0, 30.0,
       "days of need the tank holds, 0-30"),
    In("water[].drop_cable_m", "Drop cable length", "m", 1.0, 1000.0,
       "cable from the pump to the well head, 1-1000 m"),
    # ---------------------------------------------------------------- the pump set
    In("water[].pump.name", "Pump name", kind="text", hint="make and model, or a description"),
    In("water[].pump.kind", "Pump kind", kind="choice",
       hint="a helical rotor (positive displacement) adds a caution on closed valves",
       values=("centrifugal", "helical_rotor")),
    In("water[].pump.drive", "Pump drive", kind="choice",
       hint="`controller`: a pump controller or inverter tracks the array's maximum power "
       "inside its window; `direct`: a DC motor straight on the array",
       values=("controller", "direct")),
    In("water[].pump.head_points_m", "Datasheet heads", "m", kind="table",
       hint="the datasheet's heads, rising, at least two"),
    In("water[].pump.power_points_w", "Datasheet input powers", "W", kind="table",
       hint="the datasheet's input powers, rising, at least two"),
    In("water[].pump.flow_m3_h", "Datasheet flows", "m3/h", kind="table",
       hint="one row per head, one flow per power, in m3/h from the datasheet"),
    In("water[].pump.voltage_v", "Direct motor voltages", "V", kind="table",
       hint="direct drive: the motor's terminal voltage at each point, the shape of "
       "flow_m3_h"),
    In("water[].pump.min_input_v", "Pump lowest input V", "V", 0.0, 1500.0,
       "lowest input voltage of the pump controller or motor, 0-1500 V"),
    In("water[].pump.max_input_v", "Pump highest input V", "V", 1.0, 1500.0,
       "highest input voltage of the pump controller or motor, 1-1500 V"),
    In("water[].pump.controller_efficiency", "Pump controller eff.", "", 0.5, 1.0,
       "pump controller efficiency as a fraction, 0.5-1"),
)  # fmt: skip

#: The figures of a water supply's design (``WaterDesign``, one per ``[[water]]`` table) a
#: view shows with their reasons: ``water[].`` in front, explained by the reason
#: ``water.<figure>`` of ``WaterDesign.reasons``.
WATER_FIGURES: tuple[Fig, ...] = tuple(
    Fig(f"water[].{name}", label, unit, digits, reason=f"water.{name}")
    for name, label, unit, digits in (
        ("total_dynamic_head_m", "Total dynamic head", "m", 1),
        ("friction_m", "Pipe friction head", "m", 2),
        ("minor_loss_m", "Fittings head", "m", 2),
        ("velocity_m_s", "Pipe velocity at peak flow", "m/s", 2),
        ("hydraulic_energy_kwh_day", "Hydraulic energy, limiting month", "kWh/day", 2),
        ("pump_set_efficiency", "Pump set efficiency at noon", "", 2),
        ("start_irradiance_w_m2", "Start-up irradiance", "W/m2", 0),
        ("module_count", "Modules for the pump", "", 0),
        ("pipe_suggested_mm", "Suggested pipe bore", "mm", 0),
        ("tank_size_m3", "Tank size (each)", "m3", 0),
    )
)
