"""The project document: plain data that the user typed, nothing computed.

Every class is a small mutable dataclass so the text UI can edit it in place;
the engine only reads it.  Units are in the field names.  Validation lives in
:mod:`offgrid.project.validate`; this module only declares shapes and defaults.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

from offgrid.catalogue.inputs import RUN_LENGTH_M
from offgrid.climate.model import MonthlyClimate
from offgrid.project.water_model import WaterSupply

FORMAT_NAME = "offgrid-project"
#: 2: a DC load's cable run length stands on the load (``[[loads]] run_m``); schema 1 kept
#: them in ``[wiring.dc_load_runs_m]`` keyed by the load's name (migrated on loading).
SCHEMA_VERSION = 2

AcDc = Literal["ac", "dc"]
ControllerType = Literal["pwm", "mppt"]
Chemistry = Literal["flooded", "agm", "gel", "lifepo4"]
TimeOfDay = Literal["any", "day", "evening", "night", "morning"]
ALL_MONTHS: tuple[int, ...] = tuple(range(1, 13))
#: One-way length of a cable run that a project may hold, m (inclusive): the catalogue's.
RUN_LENGTH_RANGE_M = RUN_LENGTH_M


@dataclass
class ProjectInfo:
    name: str = "Untitled project"
    client: str = ""
    designer: str = ""
    notes: str = ""
    demo: bool = False  # True marks invented demonstration data


@dataclass
class Site:
    name: str = ""
    latitude_deg: float = 0.0
    longitude_deg: float = 0.0
    elevation_m: float = 0.0
    tilt_deg: float | None = None  # None: equal to |latitude|, at least the self-cleaning minimum
    azimuth_deg: float | None = None  # None: equator-facing (180 north of equator, 0 south)
    # Ground reflectance: one value, twelve (January first: snow months), or None for the
    # climate file's own, else 0.2.
    albedo: float | list[float] | None = None
    battery_temp_c: float | None = None  # battery room temperature; None: site monthly mean
    # Battery room temperature in the warm season, for ageing (calendar life); None: each
    # month's mean air temperature (at least battery_temp_c when that is set).
    battery_warm_temp_c: float | None = None
    # Horizon profile: (azimuth_deg clockwise from north, obstruction elevation_deg) pairs,
    # interpolated linearly around the circle; empty: open horizon.
    horizon_deg: list[tuple[float, float]] = field(default_factory=list)


@dataclass
class ClimateChoice:
    """Either a reference to a climate file (name in climates/ or a path) or an inline table."""

    ref: str | None = None
    inline: MonthlyClimate | None = None


@dataclass
class Load:
    name: str
    quantity: int = 1
    power_w: float = 0.0
    hours_per_day: float = 0.0
    ac_dc: AcDc = "ac"
    duty_cycle: float = 1.0
    surge_w: float = 0.0  # starting power of one unit, W; 0 = no surge
    months: tuple[int, ...] = ALL_MONTHS
    critical: bool = False
    time_of_day: TimeOfDay = "any"
    # One-way length of this DC load's cable run, m; None: ``wiring.dc_load_run_m``.
    run_m: float | None = None


@dataclass
class ModuleSpec:
    """PV module datasheet values at STC (1000 W/m2, 25 C cell, AM1.5)."""

    name: str = "Generic 60-cell 300 W (demo datasheet)"
    pmax_w: float = 300.0
    vmp_v: float = 32.5
    imp_a: float = 9.23
    voc_v: float = 39.8
    isc_a: float = 9.75
    alpha_isc_pct_per_c: float = 0.05
    beta_voc_pct_per_c: float | None = -0.30  # None: not on the datasheet, NEC Table 690.7(A)
    gamma_pmax_pct_per_c: float = -0.40
    cells_in_series: int = 60
    area_m2: float = 1.63
    noct_c: float = 45.0


@dataclass
class BatterySpec:
    name: str = "Generic 12 V 200 Ah AGM block (demo datasheet)"
    chemistry: Chemistry = "agm"
    nominal_voltage_v: float = 12.0
    capacity_ah: float = 200.0  # at the 20-hour rate for lead-acid
    max_dod: float = 0.5
    efficiency: float = 0.85  # round-trip energy efficiency, 0-1


@dataclass
class ControllerSpec:
    type: ControllerType = "mppt"
    max_pv_voltage_v: float = 150.0
    efficiency: float = 0.97
    max_current_a: float | None = None  # None: the engine picks a standard rating


@dataclass
class InverterSpec:
    efficiency: float = 0.90
    self_consumption_w: float = 15.0
    hours_on_per_day: float = 24.0
    # True: the inverter stays on in months with no AC load (its idle draw counted all year);
    # False: switched off then, idle counted only in the months with AC use.
    on_all_year: bool = False


@dataclass
class Derates:
    soiling: float = 0.95  # fraction kept; used when soiling_rate_pct_per_day is None
    soiling_rate_pct_per_day: float | None = None
    cleaning_interval_days: float = 30.0
    mismatch: float = 0.98
    wiring: float = 0.97


@dataclass
class DesignChoices:
    system_voltage: int | Literal["auto"] = "auto"
    autonomy_days: float = 3.0
    max_dod: float | None = None  # None: the battery unit's own max DoD
    load_growth_pct: float = 10.0
    coincidence_factor: float = 0.7
    ageing_factor: float = 0.8  # battery capacity at end of life / rated
    # True: size the bank on the largest daily demand x the coldest month's temperature
    # factor (conservative, the two may never meet); False: on the worst single month.
    battery_largest_coldest: bool = False
    min_tilt_deg: float = 10.0
    derates: Derates = field(default_factory=Derates)
    drop_limit_array_pct: float = 3.0
    drop_limit_battery_pct: float = 1.0
    drop_limit_load_pct: float = 3.0


WireUnits = Literal["awg", "mm2"]
ConductorMaterial = Literal["copper", "aluminium"]


@dataclass
class WiringChoices:
    """DC cable runs as the installer will lay them, and the settings to size them.

    Lengths are one-way (from one end of the run to the other), in metres.
    """

    units: WireUnits = "mm2"  # "awg": NEC sizes (AWG/kcmil); "mm2": IEC 60228 sizes
    material: ConductorMaterial = "copper"
    conductor_temp_c: float = 75.0  # conductor temperature for resistance (NEC Table 8 is at 75 C)
    ambient_temp_c: float | None = None  # for ampacity; None: the site's hottest monthly mean
    insulation_temp_c: int = 90  # insulation rating, 60, 75 or 90 C
    string_run_m: float = 5.0  # modules to combiner (each string)
    array_run_m: float = 15.0  # array or combiner to charge controller
    controller_battery_m: float = 2.0
    battery_inverter_m: float = 1.5
    dc_load_run_m: float = 10.0  # each DC load circuit without its own ``Load.run_m``
    battery_short_circuit_a: float | None = None  # one battery unit, datasheet; None: estimate
    module_max_fuse_a: float | None = None  # module's maximum series fuse, datasheet


@dataclass
class PriceItem:
    """One line of the project's price list, in ``Economics.currency`` per BOM unit.

    ``part`` is a bill-of-materials key, ``kind:detail`` (``module:<module name>``,
    ``battery:<battery name>``, ``controller:MPPT 50 A``, ``cable:copper 6 mm2``...).
    A key of the kind alone (``cable``) prices every part of that kind that has no
    line of its own.
    """

    part: str
    unit_price: float
    note: str = ""


@dataclass
class Economics:
    """Inputs of the lifecycle cost; prices are in ``currency``."""

    currency: str = "USD"
    life_years: int = 20
    discount_rate_pct: float = 8.0  # nominal yearly discount rate
    inflation_pct: float = 0.0  # yearly rise of replacement and upkeep prices
    om_pct_of_capital: float = 1.0  # yearly upkeep as % of the capital cost
    installation_pct: float = 0.0  # labour and sundries as % of the parts
    battery_life_years: float | None = None  # None: simulation, else the chemistry preset
    module_life_years: float = 25.0
    controller_life_years: float = 12.0
    inverter_life_years: float = 10.0


@dataclass
class Variant:
    """A design variant: a few dotted-path overrides of the project (``controller.type``)."""

    name: str
    overrides: dict = field(default_factory=dict)
    note: str = ""


GeneratorFuel = Literal["diesel", "petrol", "lpg"]
DispatchRule = Literal["cycle_charging", "load_following"]
DerateMethod = Literal["common_practice", "iso3046"]


@dataclass
class GeneratorSpec:
    """A generator beside the sun (issue 16); ranges and hints in offgrid/catalogue/generator.py.

    Fuel use from the datasheet at ``fuel_load_pct`` % of the rating, L/h (LPG: litres of
    liquid).  Money in ``Economics.currency``.  Quiet hours are solar time, whole hours,
    from ``quiet_from_h`` up to ``quiet_to_h`` (may wrap past midnight).
    """

    name: str = "Generator"
    fuel: GeneratorFuel = "diesel"
    rated_kw: float = 5.0  # continuous output at the reference conditions, kW
    fuel_load_pct: list[float] = field(default_factory=lambda: [25.0, 50.0, 75.0, 100.0])
    fuel_l_h: list[float] = field(default_factory=list)
    min_load_fraction: float = 0.3  # of the derated output
    altitude_m: float | None = None  # None: site.elevation_m
    hottest_temp_c: float | None = None  # None: the climate's hottest monthly mean maximum
    derate_method: DerateMethod = "common_practice"
    derate_alt_pct_per_300m: float = 3.0
    derate_alt_above_m: float = 1000.0
    derate_temp_pct_per_5c: float = 2.0
    derate_temp_above_c: float = 25.0
    charger_kw: float = 2.0  # battery charger's DC output, kW
    charger_efficiency: float = 0.9
    dispatch: DispatchRule = "cycle_charging"
    start_soc: float = 0.6  # cycle charging: start at or below this state of charge
    stop_soc: float = 0.9  # and run until this one
    quiet_from_h: int | None = None
    quiet_to_h: int | None = None
    price: float | None = None  # purchase and installation
    fuel_price_per_l: float = 1.5
    fuel_escalation_pct: float = 3.0  # yearly rise of the fuel price, %
    maintenance_per_run_h: float = 0.4
    overhaul_interval_h: float = 10000.0
    overhaul_cost: float = 0.0
    life_run_h: float = 20000.0  # replaced after this many run hours
    life_years: float = 15.0  # or after this many years, whichever comes first


@dataclass
class Project:
    info: ProjectInfo = field(default_factory=ProjectInfo)
    site: Site = field(default_factory=Site)
    climate: ClimateChoice = field(default_factory=ClimateChoice)
    loads: list[Load] = field(default_factory=list)
    module: ModuleSpec = field(default_factory=ModuleSpec)
    battery: BatterySpec = field(default_factory=BatterySpec)
    controller: ControllerSpec = field(default_factory=ControllerSpec)
    inverter: InverterSpec = field(default_factory=InverterSpec)
    choices: DesignChoices = field(default_factory=DesignChoices)
    prices: list[PriceItem] = field(default_factory=list)
    economics: Economics = field(default_factory=Economics)
    variants: list[Variant] = field(default_factory=list)
    wiring: WiringChoices = field(default_factory=WiringChoices)
    generator: GeneratorSpec | None = None  # None: solar only
    water: list[WaterSupply] = field(default_factory=list)  # [[water]] supplies (offgrid.water)
    # Sections that later features own (wiring runs, prices, variants) are kept
    # verbatim so that nothing a user saved is ever dropped.
    extra: dict = field(default_factory=dict)
