"""The worst-month sizing pipeline: ``design(project) -> SystemDesign``.

Pure: no UI, no files written.  Every figure is recorded with its reason.

Chain, in order (each step its own function below):

1. climate and monthly plane-of-array insolation (Liu-Jordan / Klein, :mod:`offgrid.climate.sky`);
2. loads at the battery by month (:mod:`offgrid.design.loads`);
3. design month = largest ratio of daily demand to plane-of-array insolation;
4. array power = design-month demand / (peak sun hours x temperature x soiling x mismatch x
   wiring x controller x battery round trip), each derate shown on its own;
5. system voltage, modules in series x parallel;
6. battery bank for the days of autonomy at the maximum depth of discharge, corrected for
   temperature, ageing and discharge efficiency;
7. charge-controller current with the code's continuous factors, next standard rating;
8. inverter continuous and surge rating.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np

from offgrid.climate.files import ClimateFileError, load_climate
from offgrid.climate.model import MonthlyClimate
from offgrid.design.array_step import (  # noqa: F401  (re-exported: names imported from here)
    AUTO_VOLTAGE_MAX_CURRENT_A,
    ArrayStep,
    energy_weighted_irradiance,
    size_array,
)
from offgrid.design.battery_step import charge_rate, size_battery
from offgrid.design.cautions import DEFERS_TO_CODE  # noqa: F401  (re-exported)
from offgrid.design.controller_step import MAX_CONTROLLERS  # noqa: F401  (re-exported)
from offgrid.design.inverter_step import (
    INVERTER_SURGE_MULTIPLE,  # noqa: F401  (re-exported)
    size_inverter,
)
from offgrid.design.loads import analyse_loads
from offgrid.design.months import MONTHS  # noqa: F401  (re-exported)
from offgrid.design.pv import cell_temperature_ross  # noqa: F401  (the one Ross model)
from offgrid.design.ratings import (  # noqa: F401  (re-exported)
    CONTROLLER_RATINGS_A,
    INVERTER_RATINGS_W,
    NEC_CONTINUOUS,
    next_rating,
)
from offgrid.design.result import (
    DesignError,
    LoadResult,
    Notice,
    ReasonBook,
    SystemDesign,
    reason_kind,
)
from offgrid.design.site_step import (
    LOW_SUN_KWH_M2_DAY,  # noqa: F401  (re-exported)
    confirm_design_month,
    position_notices,
    site_record,
    sun_on_plane,
)
from offgrid.memo import memoised
from offgrid.project.model import Project

#: The chosen controller's harvest may fall this far below the demand before modules are
#: added (the derate chain and the I-V curves are both estimates; common practice, no source).
HARVEST_SHORTFALL_TOLERANCE_PCT = 0.5


def resolve_climate(project: Project, base: Path | None = None) -> MonthlyClimate:
    """The project's climate table, inline or from a climate file."""
    if project.climate.inline is not None:
        return project.climate.inline
    if project.climate.ref:
        try:
            return load_climate(project.climate.ref, base)
        except ClimateFileError as exc:
            raise DesignError("climate-missing", str(exc), "climate.ref") from exc
    raise DesignError(
        "climate-missing",
        "the project has no climate: pick a bundled climate or type twelve monthly values",
        "climate",
    )


@memoised  # planning: every row of a village checks the one climate
def _climate_problems(c: MonthlyClimate) -> tuple:
    from offgrid.climate.files import monthly_climate_problems

    return tuple(monthly_climate_problems(c))


def _check_climate(c: MonthlyClimate) -> None:
    """DesignError naming the field when the climate table is incomplete or implausible."""
    for key in ("insolation_kwh_m2_day", "temp_mean_c"):
        values = getattr(c, key)
        if values is None or len(values) != 12:
            raise DesignError(
                "climate-months",
                f"climate.{key}: needs 12 monthly values, has "
                f"{0 if values is None else len(values)}",
                f"climate.{key}",
            )
    problems = _climate_problems(c)
    if problems:
        path, message = problems[0]
        raise DesignError("climate-months", f"{path}: {message}", path)
    check_months_typed(c)


def check_months_typed(c: MonthlyClimate) -> None:
    """DesignError while an own climate has months still to type (placeholders, not data:
    a design on them would be a wrong design)."""
    left = c.to_type_text()
    if left:
        raise DesignError(
            "climate-months-untyped",
            f"months still to type: {left}. They hold placeholders, not data: type them "
            "in the Place section (text UI), or in the project file's [climate.monthly] "
            "table and then remove them from [climate.months_to_type]",
            "climate.months_to_type",
        )


def site_geometry(
    project: Project,
    climate: MonthlyClimate,
    book: ReasonBook,
    demand_wh_day=None,
    notices: list[Notice] | None = None,
):
    """Tilt, azimuth and monthly plane-of-array insolation, for callers outside the pipeline
    (the community's one tilt): :func:`offgrid.design.site_step.sun_on_plane` with its
    reasons put in ``book`` and its notices in ``notices``."""
    step = sun_on_plane(project.site, project.choices.min_tilt_deg, climate, demand_wh_day)
    book.extend(step.reasons)
    if notices is not None:
        notices.extend(step.notices)
    return step.tilt_deg, step.azimuth_deg, step.sun


# The steps below are memoised while planning (``with design_memo():``): a village's
# distinct rows repeat a daily energy with different peak powers, and these steps read
# the energy, not the peak.  Each is keyed by every argument it takes (and by the kind of
# reason record being built, offgrid.design.result.reason_kind), so a memoised call
# returns what the step itself returns for those arguments.


@memoised  # planning: the villages of a programme survey the same demands
def _load_step(loads, inverter, growth_pct, coincidence_factor, kind: type):
    """Step 2, :func:`analyse_loads`, with its reasons (``kind``: the reason record in
    force, part of the memo's key only)."""
    book = ReasonBook()
    return analyse_loads(loads, inverter, growth_pct, coincidence_factor, book), book.freeze()


@memoised  # planning: villages of one design month share it for one demand
def _inverter_step(spec, loads: LoadResult, system_v: int, kind: type):
    """Step 8, :func:`size_inverter` (``kind``: the reason record in force, part of the
    memo's key only)."""
    return size_inverter(spec, loads, system_v)


@memoised
def _site_steps(site, min_tilt_deg: float, climate, demand: tuple, kind: type):
    """Steps 1 and 3: :func:`sun_on_plane` and :func:`site_record` (``kind``: the reason
    record in force, part of the memo's key only)."""
    demand_wh_day = np.asarray(demand, dtype=float)
    sun = sun_on_plane(site, min_tilt_deg, climate, demand_wh_day)
    return sun, site_record(site, climate, sun, demand_wh_day)


@memoised
def _design_month_step(site, supply: tuple, demand: tuple, dm: int, kind: type):
    return confirm_design_month(site, supply, np.asarray(demand, dtype=float), dm)


@memoised
def _battery_step(
    spec, choices, daily_energy_wh: tuple, system_v, abs_v, t_mean: tuple, room_c, warm_c, kind
):
    return size_battery(
        spec, choices, daily_energy_wh, system_v, abs_v, np.asarray(t_mean), room_c, warm_c
    )


def _check_loads(project: Project) -> None:
    if not project.loads or all(
        ld.quantity * ld.power_w * ld.hours_per_day * ld.duty_cycle == 0 for ld in project.loads
    ):
        raise DesignError(
            "no-loads",
            "the load list is empty (or every load uses 0 Wh): add the "
            "appliances with their power and hours per day",
            "loads",
        )


def design(project: Project, base: Path | None = None) -> SystemDesign:
    """Size the system for the worst month.  Raises :class:`DesignError` if it cannot be met.

    Each step takes the quantities it needs and returns its record with its own reasons and
    notices; this pipeline combines them, in the order of the steps.
    """
    from offgrid.design.electrical import electrical_design, with_electrical
    from offgrid.design.pv import fit_module

    book = ReasonBook()
    climate = resolve_climate(project, base)
    _check_climate(climate)
    _check_loads(project)
    choices = project.choices
    # 2. loads (first: the tilt search weighs the months by their demand)
    kind = reason_kind()
    lr, load_reasons = _load_step(
        project.loads, project.inverter, choices.load_growth_pct, choices.coincidence_factor, kind
    )
    book.extend(load_reasons)
    demand = np.asarray(lr.daily_energy_wh)
    # 1. sun, 3. a first design month and the temperatures
    sun, site_step = _site_steps(
        project.site, choices.min_tilt_deg, climate, tuple(lr.daily_energy_wh), kind
    )
    for step in (sun, site_step):
        book.extend(step.reasons)
    site_notices = [*position_notices(project.site, climate), *sun.notices, *site_step.notices]
    site = site_step.site
    t_low = site.record_low_c
    # 4-5, 7. array, system voltage, strings and controllers (on the least-covered month)
    params = fit_module(project.module)  # once per design: the window and the curves share it

    def array_for(min_modules: int = 0) -> ArrayStep:
        step = size_array(
            project.module,
            project.controller,
            project.battery,
            choices,
            site,
            lr,
            t_low,
            params,
            min_modules=min_modules,
        )
        book.extend(step.reasons)
        return step

    arr = array_for()
    dm = arr.design_month
    site = replace(site, design_month=dm + 1)
    lr = replace(lr, design_daily_energy_wh=float(demand[dm]))
    month = _design_month_step(
        site, tuple(arr.array.supply_wh_day), tuple(lr.daily_energy_wh), dm, kind
    )
    book.extend(month.reasons)
    # 6. battery, 8. inverter
    bat = _battery_step(
        project.battery,
        choices,
        lr.daily_energy_wh,
        arr.system_voltage_v,
        arr.absorption_voltage_v,
        tuple(site.temp_mean_c),
        project.site.battery_temp_c,
        project.site.battery_warm_temp_c,
        kind,
    )
    inv = _inverter_step(project.inverter, lr, arr.system_voltage_v, kind)
    for step in (bat, inv):
        book.extend(step.reasons)
    later = [*bat.notices, *inv.notices, *_idle_notices(lr)]
    before = [*site_notices, *month.notices]

    def assemble(array, ctrl, battery, arr_notices) -> SystemDesign:
        return SystemDesign(
            loads=lr,
            site=site,
            array=array,
            battery=battery,
            controller=ctrl,
            inverter=inv.inverter,
            warnings=tuple(before + list(arr_notices) + later),
            cautions=(),
            reasons=book.freeze(),
        )

    # 9. electrical design: strings, harvest both ways from the I-V curves, cables,
    # protection, cautions.  If the chosen controller's harvest falls short of the demand
    # in any month, add modules and size again (at most a few rounds).
    first = arr.array.module_count
    core = assemble(arr.array, arr.controller, bat.battery, arr.notices)
    er = electrical_design(project, core, params)
    for _ in range(4):
        short = er.harvest.shortfall_pct
        if short <= HARVEST_SHORTFALL_TOLERANCE_PCT:
            break
        n = core.array.module_count
        arr = array_for(max(n + 1, math.ceil(n / (1.0 - short / 100.0) - 1e-9)))
        core = assemble(arr.array, arr.controller, bat.battery, arr.notices)
        er = electrical_design(project, core, params)
    arr_notices = list(arr.notices)
    if core.array.module_count != first:
        note, why = _raised_for_harvest(first, core.array.module_count, arr.controller.type)
        arr_notices.append(note)
        book.extend(why)
    rate = charge_rate(arr.array, arr.controller, bat.battery, params, arr.pwm_voltage)
    book.extend(rate.reasons)
    battery = replace(
        bat.battery,
        peak_charge_current_a=rate.peak_charge_current_a,
        charge_c_rate=rate.charge_c_rate,
    )
    arr_notices.extend(rate.notices)
    core = assemble(arr.array, arr.controller, battery, arr_notices)
    return with_electrical(core, er)


def _idle_notices(lr: LoadResult) -> list[Notice]:
    if lr.inverter_idle_wh > 0.2 * max(lr.daily_energy_wh):
        return [
            Notice(
                "inverter-idle-large",
                f"The inverter's idle draw "
                f"({lr.inverter_idle_wh:.0f} Wh/day) is over 20 % of the daily "
                "demand: a smaller inverter, a search (sleep) mode or DC "
                "appliances would shrink the system.",
                "info",
                "loads.inverter_idle_wh",
            )
        ]
    return []


def _raised_for_harvest(first: int, now: int, ctype: str) -> tuple[Notice, dict]:
    """The note and the reason of an array raised until the I-V harvest covers the demand."""
    book = ReasonBook()
    note = Notice(
        "array-raised-for-harvest",
        f"The array was raised from {first} to "
        f"{now} modules: through the "
        f"{ctype.upper()} controller the I-V curves deliver less than the "
        "derate chain assumed in at least one month.",
        "info",
        "array.power_w",
    )
    book.add(
        "array.modules_parallel",
        "raised until the daily harvest through the chosen "
        "controller, after the battery round trip, covers every month's demand",
        "De Soto (2006) I-V curves over the month's mean day (offgrid.design.harvest)",
        first=str(first),
        now=str(now),
    )
    return note, book.freeze()
