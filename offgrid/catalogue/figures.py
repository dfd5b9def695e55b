"""Every design figure a view shows: JSON path, label, unit, digits, explaining reason.

Paths are those of ``SystemDesign.to_dict()`` (``offgrid size --json``); the electrical
design's records sit under ``electrical.`` there and are looked up by their reason key
too (``strings.max_series``).  The Sizes section, the report's figures and key figures,
the text summary and the variant comparison take their labels here.  Rows with
``key=True`` are the report's key figures, in this order.  A new figure is one more row.
"""

from __future__ import annotations

from offgrid.catalogue.entries import FigureEntry as Fig

FIGURES: tuple[Fig, ...] = (
    # ---------------------------------------------------------------- site and sun
    Fig("site.design_month", "Design month", key=True),
    Fig("site.tilt_deg", "Array tilt", "deg", 0, key=True),
    Fig("site.azimuth_deg", "Array azimuth", "deg", 0, key=True),
    Fig("site.record_low_c", "Record low temperature", "C", 1, key=True),
    Fig("site.albedo", "Ground reflectance (albedo)", "", 2),
    Fig("site.poa_kwh_m2_day", "Array-plane insolation", "kWh/m2/day", 2),
    Fig("site.horizontal_kwh_m2_day", "Horizontal insolation", "kWh/m2/day", 2),
    # ---------------------------------------------------------------- loads
    Fig("loads.design_daily_energy_wh", "Energy in design month", "Wh/day", 0, key=True),
    Fig(
        "loads.max_daily_energy_wh",
        "Largest monthly energy",
        "Wh/day",
        0,
        key=True,
    ),
    Fig("loads.inverter_idle_wh", "Inverter idle energy", "Wh/day", 0, key=True),
    Fig("loads.peak_ac_w", "Peak AC power at once", "W", 0, key=True),
    Fig("loads.largest_surge_w", "Largest starting power", "W", 0, key=True),
    Fig("loads.daily_energy_wh", "Demand at the battery", "Wh/day", 0),
    Fig("loads.connected_ac_w", "AC power connected", "W", 0),
    Fig("loads.connected_dc_w", "DC power connected", "W", 0),
    Fig("loads.growth_pct", "Load growth margin", "%", 1),
    Fig("loads.coincidence_factor", "AC coincidence factor", "", 3),
    # ---------------------------------------------------------------- array
    Fig("array.required_power_w", "Array power required", "W", 0, key=True),
    Fig("array.derate_total", "Derates together", "", 3, key=True),
    Fig("array.modules_series", "Modules in series", "", 0, key=True),
    Fig("array.modules_parallel", "Strings in parallel", "", 0, key=True),
    Fig("array.module_count", "Modules", "", 0, key=True),
    Fig("array.power_w", "Array power installed", "W", 0, key=True),
    Fig(
        "array.string_voc_cold_v",
        "String Voc at record low",
        "V",
        1,
        key=True,
    ),
    Fig("array.string_vmp_hot_v", "String Vmp, hot cells", "V", 1, key=True),
    Fig("array.module_power_w", "Module power (STC)", "W", 0),
    Fig("array.supply_wh_day", "Array supply to the battery", "Wh/day", 0),
    Fig("array.voc_cold_v", "Module Voc at record low", "V", 1),
    Fig("array.vmp_hot_v", "Module Vmp, hot cells", "V", 1),
    Fig("array.harvest_mppt_wh_day", "MPPT harvest", "Wh/day", 0),
    Fig("array.harvest_pwm_wh_day", "PWM harvest", "Wh/day", 0),
    Fig("array.derates.temperature", "Derate: temperature", "", 3),
    Fig("array.derates.operating point", "Derate: operating point", "", 3),
    Fig("array.derates.soiling", "Derate: soiling", "", 3),
    Fig("array.derates.mismatch", "Derate: mismatch", "", 3),
    Fig("array.derates.wiring", "Derate: wiring", "", 3),
    Fig("array.derates.controller", "Derate: controller", "", 3),
    Fig("array.derates.battery round trip", "Derate: battery round trip", "", 3),
    # ---------------------------------------------------------------- battery
    Fig("battery.system_voltage_v", "System voltage", "V", 0, key=True),
    Fig("battery.required_ah", "Battery capacity required", "Ah", 0, key=True),
    Fig("battery.units_series", "Battery units in series", "", 0, key=True),
    Fig("battery.units_parallel", "Battery strings in parallel", "", 0, key=True),
    Fig("battery.unit_count", "Battery units", "", 0, key=True),
    Fig("battery.capacity_ah", "Battery capacity installed", "Ah", 0, key=True),
    Fig("battery.nominal_kwh", "Battery energy, nominal", "kWh", 2, key=True),
    Fig("battery.usable_kwh", "Battery energy, usable", "kWh", 2, key=True),
    Fig("battery.absorption_voltage_v", "Battery absorption voltage", "V", 1),
    Fig("battery.bank_voltage_v", "Battery bank nominal voltage", "V", 1),
    Fig("battery.autonomy_days", "Days of autonomy", "days", 1),
    Fig("battery.temp_factor", "Capacity temperature factor", "", 3),
    Fig("battery.capacity_temp_c", "Battery temp. for capacity", "C", 1),
    Fig("battery.ageing_temp_c", "Battery temp. for ageing", "C", 1),
    Fig("battery.ageing_temps_c", "Battery temps. for ageing", "C", 1),
    Fig("battery.calendar_life_years", "Battery float life", "years", 1),
    # ---------------------------------------------------------------- controller and inverter
    Fig("controller.required_current_a", "Controller current required", "A", 1, key=True),
    Fig("controller.current_a", "Controller rating", "A", 0, key=True),
    Fig("controller.count", "Charge controllers", "", 0, key=True),
    Fig("controller.max_pv_voltage_v", "Controller maximum PV voltage", "V", 0),
    Fig("inverter.continuous_w", "Inverter continuous rating", "W", 0, key=True),
    Fig("inverter.surge_w", "Inverter surge rating", "W", 0, key=True),
    Fig("inverter.required_surge_w", "Starting need on inverter", "W", 0, key=True),
    Fig("inverter.dc_input_current_a", "Inverter DC input current", "A", 1, key=True),
    # ---------------------------------------------------------------- module at its operating point
    Fig("electrical.module_fit", "Single-diode module model"),
    Fig("mpp.irradiance_w_m2", "Irradiance on the module", "W/m2", 0),
    Fig("mpp.vmp_v", "Vmp, one module", "V", 2),
    Fig("mpp.imp_a", "Imp, one module", "A", 2),
    Fig("mpp.pmp_w", "Pmp, one module", "W", 1),
    Fig("mpp.voc_v", "Voc, one module", "V", 1),
    Fig("mpp.isc_a", "Isc, one module", "A", 2),
    Fig("mpp.cell_temp_c", "Cell temperature", "C", 1),
    Fig("mpp.fill_factor", "Fill factor", "", 3),
    Fig("mpp.efficiency", "Module efficiency", "", 3),
    # ---------------------------------------------------------------- strings and harvest
    Fig("electrical.strings.max_series", "Most modules in series", "", 0),
    Fig("electrical.strings.min_series", "Fewest modules in series", "", 0),
    Fig("electrical.strings.series", "String layout", "", 0),
    Fig("electrical.strings.strings_per_controller", "Strings per controller", "", 0),
    Fig("electrical.strings.voc_cold_v", "Module Voc at record low", "V", 1),
    Fig("electrical.strings.vmp_hot_v", "Module Vmp, hot cells", "V", 1),
    Fig("electrical.harvest.pwm_vs_mppt_pct", "PWM against MPPT, per module", "%", 1),
    Fig("electrical.harvest.shortfall_pct", "Harvest short of demand", "%", 1),
    # ---------------------------------------------------------------- protection
    Fig("electrical.protection.bank_fault_current_a", "Battery bank fault current", "A", 0),
    Fig("electrical.protection.battery_fuse_a", "Battery fuse", "A", 0),
    Fig("electrical.protection.string_fuses", "String fuses"),
    # ---------------------------------------------------------------- cables, one row per run
    # (``wires[2].size`` in the JSON, ``wires.charge.size`` as a reason key: see find_figure)
    Fig("wires[].count", "Identical runs", "", 0),
    Fig("wires[].size", "Conductor size"),
    Fig("wires[].current_a", "Maximum continuous current", "A", 1),
    Fig("wires[].drop_current_a", "Current for the voltage drop", "A", 1),
    Fig("wires[].length_m", "Length", "m", 1),
    Fig("wires[].voltage_v", "Circuit voltage", "V", 1),
    Fig("wires[].resistance_ohm_km", "Conductor resistance", "ohm/km", 3),
    Fig("wires[].drop_pct", "Voltage drop", "%", 2),
    Fig("wires[].ampacity_a", "Ampacity", "A", 0),
    Fig("wires[].fuse_a", "Fuse", "A", 0),
)
