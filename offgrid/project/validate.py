"""Range and consistency checks on a :class:`~offgrid.project.model.Project`.

Each problem names the field by its dotted path (as in the saved file) and
says how to fix it.  The store reports them with line numbers; the text UI
shows them beside the field.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.climate.albedo import albedo_problems
from offgrid.numbers import MAX_PRICE, PRICE_RANGE, is_finite_number
from offgrid.project.loads_csv import check_load
from offgrid.project.model import Project
from offgrid.safetext import printable


@dataclass(frozen=True)
class Problem:
    path: str
    message: str
    line: int | None = None

    def __str__(self) -> str:
        where = f"line {self.line}: " if self.line else ""
        return f"{where}{self.path}: {self.message}"


#: (path, low, high, hint) for plain numeric fields; bounds inclusive.
RANGES: tuple[tuple[str, float, float, str], ...] = (
    ("site.latitude_deg", -90, 90, "degrees, north positive, -90 to 90"),
    ("site.longitude_deg", -180, 180, "degrees, east positive, -180 to 180"),
    ("site.elevation_m", -430, 9000, "metres above sea level, -430 (Dead Sea shore) to 9000"),
    ("site.tilt_deg", 0, 90, "degrees from horizontal, 0-90, or leave it out for automatic"),
    ("site.azimuth_deg", 0, 360, "degrees clockwise from north (180 = south), or leave it out"),
    ("site.battery_temp_c", -40, 60, "the battery room's mean temperature in C"),
    (
        "site.battery_warm_temp_c",
        -40,
        60,
        "the battery room's mean temperature in the warm season in C (for ageing), or leave it out",
    ),
    ("module.pmax_w", 1, 1000, "STC maximum power of one module, W"),
    ("module.vmp_v", 0.5, 200, "STC maximum-power voltage, V"),
    ("module.imp_a", 0.01, 30, "STC maximum-power current, A"),
    ("module.voc_v", 0.5, 250, "STC open-circuit voltage, V"),
    ("module.isc_a", 0.01, 30, "STC short-circuit current, A"),
    (
        "module.alpha_isc_pct_per_c",
        0,
        0.2,
        "Isc temperature coefficient, %/C, positive (about +0.05)",
    ),
    ("module.beta_voc_pct_per_c", -1, 0, "Voc temperature coefficient, %/C, negative (about -0.3)"),
    (
        "module.gamma_pmax_pct_per_c",
        -1,
        0,
        "Pmax temperature coefficient, %/C, negative (about -0.4)",
    ),
    ("module.cells_in_series", 1, 400, "number of cells in series in the module"),
    ("module.area_m2", 0.01, 5, "module area, m2"),
    ("module.noct_c", 30, 70, "nominal operating cell temperature, C (about 45)"),
    ("battery.nominal_voltage_v", 1, 60, "nominal voltage of one battery unit, V (2, 6, 12...)"),
    ("battery.capacity_ah", 1, 10000, "capacity of one unit, Ah (20-hour rate for lead-acid)"),
    ("battery.max_dod", 0.05, 1, "maximum depth of discharge, a fraction (0.5 = 50 %)"),
    ("battery.efficiency", 0.5, 1, "round-trip energy efficiency, a fraction (0.85)"),
    ("controller.max_pv_voltage_v", 10, 1500, "the controller's maximum PV input voltage, V"),
    ("controller.efficiency", 0.5, 1, "conversion efficiency, a fraction (0.97)"),
    ("controller.max_current_a", 1, 1000, "rated charge current, A, or leave it out"),
    ("inverter.efficiency", 0.5, 1, "efficiency at typical load, a fraction (0.9)"),
    ("inverter.self_consumption_w", 0, 500, "idle consumption when on with no load, W"),
    ("inverter.hours_on_per_day", 0, 24, "hours per day the inverter is switched on"),
    ("choices.autonomy_days", 0.5, 30, "days the battery carries the load without sun (0.5-30)"),
    ("choices.max_dod", 0.05, 1, "maximum depth of discharge, a fraction, or leave it out"),
    ("choices.load_growth_pct", 0, 200, "margin added to the surveyed energy, % (0-200)"),
    ("choices.coincidence_factor", 0.05, 1, "share of connected AC power on at once (0.05-1)"),
    ("choices.ageing_factor", 0.5, 1, "battery capacity left at end of life, a fraction (0.8)"),
    ("choices.min_tilt_deg", 0, 45, "lowest tilt that still self-cleans in rain, degrees"),
    ("choices.derates.soiling", 0.5, 1, "fraction kept after soiling (0.95)"),
    ("choices.derates.soiling_rate_pct_per_day", 0, 5, "daily soiling loss, %/day"),
    ("choices.derates.cleaning_interval_days", 1, 365, "days between cleanings"),
    ("choices.derates.mismatch", 0.8, 1, "fraction kept after module mismatch (0.98)"),
    ("choices.derates.wiring", 0.8, 1, "fraction kept after DC wiring losses (0.97)"),
    ("choices.drop_limit_array_pct", 0.1, 10, "allowed voltage drop, %"),
    ("choices.drop_limit_battery_pct", 0.1, 10, "allowed voltage drop, %"),
    ("choices.drop_limit_load_pct", 0.1, 10, "allowed voltage drop, %"),
    ("economics.life_years", 1, 100, "years the lifecycle cost covers (1-100, often 20)"),
    ("economics.discount_rate_pct", 0, 50, "yearly discount rate, % (0-50, often 5-12)"),
    ("economics.inflation_pct", -10, 50, "yearly price rise of replacements and upkeep, %"),
    ("economics.om_pct_of_capital", 0, 50, "yearly upkeep as % of the capital cost (0-50)"),
    ("economics.installation_pct", 0, 200, "labour and sundries as % of the parts (0-200)"),
    (
        "economics.battery_life_years",
        0.5,
        50,
        "battery service life, years, or leave it out for the simulation or the chemistry preset",
    ),
    ("economics.module_life_years", 1, 60, "module service life, years (about 25)"),
    ("economics.controller_life_years", 1, 60, "charge-controller service life, years"),
    ("economics.inverter_life_years", 1, 60, "inverter service life, years"),
    ("wiring.conductor_temp_c", -40, 120, "conductor temperature for resistance, C (75)"),
    ("wiring.ambient_temp_c", -50, 75, "ambient around the cables, C, or leave it out"),
    ("wiring.string_run_m", 0.1, 1000, "one-way length of each string run, m (0.1-1000)"),
    ("wiring.array_run_m", 0.1, 1000, "one-way length from array to controller, m (0.1-1000)"),
    ("wiring.controller_battery_m", 0.1, 1000, "one-way length controller to battery, m"),
    ("wiring.battery_inverter_m", 0.1, 1000, "one-way length battery to inverter, m"),
    ("wiring.dc_load_run_m", 0.1, 1000, "one-way length of a DC load circuit, m"),
    (
        "wiring.battery_short_circuit_a",
        1,
        200000,
        "one battery unit's short-circuit current from its datasheet, A, or leave it out",
    ),
    ("wiring.module_max_fuse_a", 1, 100, "module's maximum series fuse rating, A, or leave it out"),
)


def _get(project: Project, path: str):
    obj = project
    for part in path.split("."):
        obj = getattr(obj, part)
    return obj


def validate_project(project: Project) -> list[Problem]:
    """Every problem with the project's values, empty when it is valid."""
    problems: list[Problem] = []
    for path, lo, hi, hint in RANGES:
        value = _get(project, path)
        if value is None:
            continue
        if not is_finite_number(value):
            problems.append(Problem(path, f"'{value}' is not a finite number; {hint}"))
        elif not lo <= value <= hi:
            problems.append(Problem(path, f"{value:g} is out of range; {hint}"))
    for path, message in albedo_problems(project.site.albedo, "site.albedo"):
        problems.append(Problem(path, message))
    m = project.module
    if m.vmp_v >= m.voc_v:
        problems.append(
            Problem(
                "module.vmp_v",
                f"Vmp {m.vmp_v:g} V must be below Voc {m.voc_v:g} V; check the datasheet columns",
            )
        )
    if m.imp_a >= m.isc_a:
        problems.append(
            Problem(
                "module.imp_a",
                f"Imp {m.imp_a:g} A must be below Isc {m.isc_a:g} A; check the datasheet columns",
            )
        )
    if m.vmp_v * m.imp_a > 0 and abs(m.vmp_v * m.imp_a - m.pmax_w) > 0.05 * m.pmax_w:
        problems.append(
            Problem(
                "module.pmax_w",
                f"Pmax {m.pmax_w:g} W differs from Vmp x Imp = "
                f"{m.vmp_v * m.imp_a:.1f} W by more than 5 %; check the datasheet",
            )
        )
    sv = project.choices.system_voltage
    if sv not in ("auto", 12, 24, 48):
        problems.append(Problem("choices.system_voltage", f"'{sv}' must be auto, 12, 24 or 48"))
    if project.controller.type not in ("pwm", "mppt"):
        problems.append(
            Problem("controller.type", f"'{project.controller.type}' must be pwm or mppt")
        )
    if project.battery.chemistry not in ("flooded", "agm", "gel", "lifepo4"):
        problems.append(
            Problem(
                "battery.chemistry",
                f"'{project.battery.chemistry}' must be one of flooded, agm, gel, lifepo4",
            )
        )
    w = project.wiring
    if w.units not in ("awg", "mm2"):
        problems.append(Problem("wiring.units", f"'{w.units}' must be awg or mm2"))
    if w.material not in ("copper", "aluminium"):
        problems.append(Problem("wiring.material", f"'{w.material}' must be copper or aluminium"))
    if w.insulation_temp_c not in (60, 75, 90):
        problems.append(
            Problem("wiring.insulation_temp_c", f"'{w.insulation_temp_c}' must be 60, 75 or 90 (C)")
        )
    c = project.climate
    if c.ref is None and c.inline is None:
        problems.append(
            Problem(
                "climate",
                "no climate: give `ref` (a bundled climate name or "
                "file) or an inline [climate.monthly] table",
            )
        )
    if c.inline is not None:
        from offgrid.climate.files import monthly_climate_problems

        problems.extend(Problem(path, msg) for path, msg in monthly_climate_problems(c.inline))
    if project.site.horizon_deg:
        from offgrid.climate.horizon import validate_horizon

        try:
            validate_horizon(project.site.horizon_deg)
        except ValueError as exc:
            problems.append(Problem("site.horizon_deg", str(exc).removeprefix("site.horizon_deg ")))
    for i, load in enumerate(project.loads):
        for fld, msg in check_load(load):
            who = f"load '{printable(load.name)}'" if load.name.strip() else f"appliance {i + 1}"
            problems.append(Problem(f"loads[{i + 1}].{fld}", f"{msg} ({who})"))
    problems.extend(_price_and_variant_problems(project))
    return problems


def _price_and_variant_problems(project: Project) -> list[Problem]:
    """Price list: a part key and a positive price each, no part twice; variants: unique names."""
    problems: list[Problem] = []
    seen: dict[str, int] = {}
    for i, item in enumerate(project.prices, start=1):
        path = f"prices[{i}]"
        part = item.part.strip()
        if not part:
            problems.append(
                Problem(
                    f"{path}.part",
                    "the part key is empty; use a key from the "
                    "bill of materials (offgrid bom), e.g. module or battery",
                )
            )
        elif part in seen:
            problems.append(
                Problem(
                    f"{path}.part",
                    f"'{part}' is priced twice (also prices[{seen[part]}]); keep one line",
                )
            )
        else:
            seen[part] = i
        price = item.unit_price
        if not is_finite_number(price):
            problems.append(
                Problem(
                    f"{path}.unit_price",
                    f"'{price}' is not a number; give the "
                    f"price of one unit of '{part}'; {PRICE_RANGE}",
                )
            )
        elif price <= 0:
            problems.append(
                Problem(
                    f"{path}.unit_price",
                    f"{price:g} for '{part}': a price must "
                    "be above zero; remove the line if the part is not bought",
                )
            )
        elif price > MAX_PRICE:
            problems.append(
                Problem(
                    f"{path}.unit_price", f"{price:g} for '{part}' is out of range; {PRICE_RANGE}"
                )
            )
    names: dict[str, int] = {}
    for i, variant in enumerate(project.variants, start=1):
        name = variant.name.strip()
        if not name:
            problems.append(Problem(f"variants[{i}].name", "give the variant a short name"))
        elif name in names:
            problems.append(
                Problem(
                    f"variants[{i}].name",
                    f"'{name}' is used twice (also variants[{names[name]}]); names must differ",
                )
            )
        else:
            names[name] = i
    return problems
